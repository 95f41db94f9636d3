//! Where the shafts of a compound train sit: the centres of its axes in the plane, in mm, from
//! the working centre distance of each stage. A compound train's stage `k` runs from shaft `k`
//! to shaft `k + 1`; the driven gear of one stage and the driver of the next share a shaft, in
//! two planes. Owns the positions only; what is drawn at them is the presentation's.

/// How the shafts are laid out.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum ShaftLayout {
    /// Every shaft on one straight line, input on the left: the train at its longest, easiest
    /// to read.
    Inline,
    /// Each stage turned by `turn_deg` from the one before (a folded train; 180° brings every
    /// other shaft back onto the input axis, as a reverted train has it).
    Folded {
        /// Turn between successive lines of centres, degrees, anticlockwise.
        turn_deg: f64,
    },
}

/// The shaft centres `[x, y]` in mm, input shaft at the origin, for stages of working centre
/// distances `centre_distances_mm` (input to output).
pub fn shaft_centres(centre_distances_mm: &[f64], layout: ShaftLayout) -> Vec<[f64; 2]> {
    let turn = match layout {
        ShaftLayout::Inline => 0.0,
        ShaftLayout::Folded { turn_deg } => turn_deg.to_radians(),
    };
    let mut at = [0.0, 0.0];
    let mut heading = 0.0_f64;
    let mut centres = vec![at];
    for (k, a) in centre_distances_mm.iter().enumerate() {
        if k > 0 {
            heading += turn;
        }
        at = [at[0] + a * heading.cos(), at[1] + a * heading.sin()];
        centres.push(at);
    }
    centres
}

#[cfg(test)]
mod tests {
    use super::*;

    fn distance(a: [f64; 2], b: [f64; 2]) -> f64 {
        (a[0] - b[0]).hypot(a[1] - b[1])
    }

    #[test]
    fn inline_shafts_sit_at_the_running_sum() {
        let c = shaft_centres(&[47.5, 66.0], ShaftLayout::Inline);
        assert_eq!(c, vec![[0.0, 0.0], [47.5, 0.0], [113.5, 0.0]]);
    }

    #[test]
    fn neighbouring_shafts_keep_their_centre_distance_however_folded() {
        for turn_deg in [0.0, 60.0, 90.0, 180.0] {
            let a = [40.0, 30.0, 55.0];
            let c = shaft_centres(&a, ShaftLayout::Folded { turn_deg });
            for k in 0..a.len() {
                assert!((distance(c[k], c[k + 1]) - a[k]).abs() < 1e-12);
            }
        }
    }

    #[test]
    fn a_reverted_pair_brings_the_output_back_onto_the_input_axis() {
        let c = shaft_centres(&[13.75, 13.75], ShaftLayout::Folded { turn_deg: 180.0 });
        assert!(distance(c[0], c[2]) < 1e-12);
    }
}
