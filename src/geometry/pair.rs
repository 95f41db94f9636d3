//! The ISO 21771 relations between the two gears of an external spur mesh: standard and working
//! centre distance, working pressure angle, the profile shift sum that joins them, tip
//! shortening, the rule that splits a shift sum between the gears, transverse contact ratio and
//! backlash.
//!
//! Everything is a method of [`ToothSystem`] taking the two tooth counts `[z1, z2]`; nothing here
//! builds a whole mesh or judges it (see [`super::working`] and [`super::check`]). Methods that can
//! meet an impossible input (a centre distance at which the base circles overlap, a shift sum so
//! negative that no pressure angle fits) return `None` rather than a NaN.

use super::involute::{inv, inv_inverse};
use super::system::ToothSystem;

/// Sum of the tooth counts as a float.
fn tooth_sum(teeth: [u32; 2]) -> f64 {
    f64::from(teeth[0]) + f64::from(teeth[1])
}

/// `sqrt(a² − b²)` computed as `sqrt((a − b)(a + b))`, which keeps its digits when `a` is close
/// to `b`; `None` unless `a > b ≥ 0`.
fn leg(a: f64, b: f64) -> Option<f64> {
    (a > b && b >= 0.0).then(|| ((a - b) * (a + b)).sqrt())
}

impl ToothSystem {
    /// Standard centre distance `a = m(z1 + z2)/2`, mm: where unshifted gears mesh tight.
    pub fn standard_centre_distance_mm(&self, teeth: [u32; 2]) -> f64 {
        self.module_mm() * tooth_sum(teeth) / 2.0
    }

    /// The centre distance, mm, at which the base circles touch, `a·cos α`. Every working centre
    /// distance must be larger.
    pub fn base_circle_distance_mm(&self, teeth: [u32; 2]) -> f64 {
        self.standard_centre_distance_mm(teeth) * self.cos_alpha
    }

    /// Working pressure angle, radians, at working centre distance `centre_distance_mm`:
    /// `cos α_w = a·cos α / a_w`. Holds for any pair mounted there, shifted or not.
    ///
    /// `None` when `a_w` is not larger than [`Self::base_circle_distance_mm`] (or not finite).
    pub fn working_pressure_angle_at(&self, teeth: [u32; 2], centre_distance_mm: f64) -> Option<f64> {
        let cos_w = self.base_circle_distance_mm(teeth) / centre_distance_mm;
        (cos_w > 0.0 && cos_w < 1.0).then(|| cos_w.acos())
    }

    /// The profile shift sum `x1 + x2`, in modules, that makes the pair mesh tight (no backlash)
    /// at `centre_distance_mm`: `x1 + x2 = (inv α_w − inv α)(z1 + z2) / (2·tan α)`.
    ///
    /// `None` when the centre distance cannot be reached (see [`Self::working_pressure_angle_at`]).
    pub fn shift_sum_for_centre_distance(&self, teeth: [u32; 2], centre_distance_mm: f64) -> Option<f64> {
        let alpha_w = self.working_pressure_angle_at(teeth, centre_distance_mm)?;
        Some(self.shift_sum_for_working_angle(teeth, alpha_w))
    }

    /// `(inv α_w − inv α)(z1 + z2) / (2·tan α)` for a working pressure angle already found, so
    /// the hot path takes one `acos` per pair rather than two.
    pub(super) fn shift_sum_for_working_angle(&self, teeth: [u32; 2], alpha_w: f64) -> f64 {
        (inv(alpha_w) - self.inv_alpha) * tooth_sum(teeth) / (2.0 * self.tan_alpha)
    }

    /// The lowest shift sum, in modules, that still has a working pressure angle: at
    /// `x1 + x2 = −inv α·(z1 + z2)/(2·tan α)` the angle reaches zero and the centre distance
    /// shrinks to [`Self::base_circle_distance_mm`].
    pub fn least_workable_shift_sum(&self, teeth: [u32; 2]) -> f64 {
        -self.inv_alpha * tooth_sum(teeth) / (2.0 * self.tan_alpha)
    }

    /// Working pressure angle, radians, of a pair cut with shift sum `shift_sum` (x1 + x2, in
    /// modules) and mounted tight: `inv α_w = inv α + 2·tan α·(x1 + x2)/(z1 + z2)`.
    ///
    /// `None` when the sum is not above [`Self::least_workable_shift_sum`] (or not finite).
    pub fn working_pressure_angle_for_shift_sum(&self, teeth: [u32; 2], shift_sum: f64) -> Option<f64> {
        let inv_w = self.inv_alpha + 2.0 * self.tan_alpha * shift_sum / tooth_sum(teeth);
        (inv_w > 0.0 && inv_w.is_finite()).then(|| inv_inverse(inv_w))
    }

    /// Working centre distance, mm, of a pair cut with shift sum `shift_sum` and mounted tight:
    /// `a_w = a·cos α / cos α_w`, with α_w from
    /// [`Self::working_pressure_angle_for_shift_sum`]. `None` where that angle is.
    pub fn centre_distance_for_shift_sum(&self, teeth: [u32; 2], shift_sum: f64) -> Option<f64> {
        let alpha_w = self.working_pressure_angle_for_shift_sum(teeth, shift_sum)?;
        let a_w = self.base_circle_distance_mm(teeth) / alpha_w.cos();
        a_w.is_finite().then_some(a_w)
    }

    /// Tip shortening `k`, in modules, that restores the rack's bottom clearance when a pair with
    /// shift sum `shift_sum` is mounted at `centre_distance_mm`:
    /// `k·m = (a + m(x1 + x2)) − a_w`, applied only when positive (zero otherwise).
    ///
    /// Profile shift moves the tips out by `m(x1 + x2)` in all, but a tight mesh moves the
    /// centres by only `a_w − a`, which is less for either sign of the sum (equal only at zero);
    /// without shortening each tip would come closer to the other gear's root than the
    /// clearance `c*·m`. Gears pulled apart beyond their tight distance need none.
    pub fn tip_shortening(&self, teeth: [u32; 2], shift_sum: f64, centre_distance_mm: f64) -> f64 {
        let standard = self.standard_centre_distance_mm(teeth);
        (shift_sum - (centre_distance_mm - standard) / self.module_mm()).max(0.0)
    }

    /// Splits a profile shift sum `shift_sum` (x1 + x2, in modules) into `[x1, x2]` for `teeth`
    /// `[z1, z2]`, favouring the smaller gear (the pinion) against undercut. The parts always add
    /// up to `shift_sum`.
    ///
    /// The rule, with `x_min,i` from [`ToothSystem::min_shift`] and the need
    /// `n_i = max(x_min,i, 0)` (the shift a gear must have to be clear of undercut, zero for one
    /// that needs none):
    /// 1. Each gear first gets its need. A surplus `x1 + x2 − n1 − n2 ≥ 0` is then shared in
    ///    proportion to the tooth counts, `z_i / (z1 + z2)`. That raises `x_i / z_i` equally for
    ///    both gears, so both gain the same angular tooth thickness, and the pinion, whose tips
    ///    thin fastest with shift, is not pushed towards a pointed tooth.
    /// 2. A shortfall (sum below `n1 + n2`) is taken from each gear's headroom `n_i − x_min,i`
    ///    (how far it may go below its need before undercut), in proportion to that headroom.
    ///    While the sum is at least `x_min,1 + x_min,2`, neither gear is undercut.
    /// 3. Below that, undercut cannot be avoided: the gear with fewer teeth keeps exactly its
    ///    `x_min` and the other takes the rest (and is undercut). Equal gears share it evenly.
    ///
    /// The parts are continuous in `shift_sum`, and equal gears always get equal parts.
    pub fn split_shift_sum(&self, teeth: [u32; 2], shift_sum: f64) -> [f64; 2] {
        let floor = [self.min_shift(teeth[0]), self.min_shift(teeth[1])];
        let need = [floor[0].max(0.0), floor[1].max(0.0)];
        let total_need = need[0] + need[1];
        let first = if shift_sum >= total_need {
            need[0] + (shift_sum - total_need) * f64::from(teeth[0]) / tooth_sum(teeth)
        } else if shift_sum >= floor[0] + floor[1] {
            // Here total_need > floor sum, so the headroom sum is positive.
            let headroom = [need[0] - floor[0], need[1] - floor[1]];
            need[0] - (total_need - shift_sum) * headroom[0] / (headroom[0] + headroom[1])
        } else {
            match teeth[0].cmp(&teeth[1]) {
                std::cmp::Ordering::Less => floor[0],
                std::cmp::Ordering::Greater => shift_sum - floor[1],
                std::cmp::Ordering::Equal => shift_sum / 2.0,
            }
        };
        [first, shift_sum - first]
    }

    /// Distances along the line of action, mm, from where it touches each gear's base circle to
    /// where it crosses that gear's tip circle: `√(ra² − rb²)` for each gear. `None` when a tip
    /// circle is not outside its base circle.
    pub fn tip_reach_mm(&self, teeth: [u32; 2], tip_diameter_mm: [f64; 2]) -> Option<[f64; 2]> {
        let reach = |i: usize| leg(tip_diameter_mm[i] / 2.0, self.base_diameter_mm(teeth[i]) / 2.0);
        Some([reach(0)?, reach(1)?])
    }

    /// Length of the line of action between its two base-circle tangent points, mm:
    /// `a_w·sin α_w = √(a_w² − (rb1 + rb2)²)`. `None` when the centre distance cannot be reached.
    pub fn line_of_action_mm(&self, teeth: [u32; 2], centre_distance_mm: f64) -> Option<f64> {
        leg(centre_distance_mm, self.base_circle_distance_mm(teeth))
    }

    /// Transverse contact ratio of the pair with tip diameters `tip_diameter_mm` (mm) mounted at
    /// `centre_distance_mm`:
    /// `ε_α = (√(ra1² − rb1²) + √(ra2² − rb2²) − a_w·sin α_w) / (π·m·cos α)`
    /// (see [`Self::tip_reach_mm`] and [`Self::line_of_action_mm`]).
    ///
    /// It is the length of contact over the base pitch: the mean number of tooth pairs in
    /// contact. It assumes the whole path lies on involute flanks; a pair with tip interference
    /// (see [`Self::tip_interference`]) does less well than this says. Zero or negative means the
    /// tips do not reach each other's flanks at all. `None` when a tip circle is not outside its
    /// base circle or the centre distance cannot be reached.
    pub fn contact_ratio(
        &self,
        teeth: [u32; 2],
        tip_diameter_mm: [f64; 2],
        centre_distance_mm: f64,
    ) -> Option<f64> {
        let reach = self.tip_reach_mm(teeth, tip_diameter_mm)?;
        let line = self.line_of_action_mm(teeth, centre_distance_mm)?;
        let base_pitch = std::f64::consts::PI * self.module_mm() * self.cos_alpha;
        Some((reach[0] + reach[1] - line) / base_pitch)
    }

    /// Tip interference: `[i]` is true when the tips of gear `i` reach along the line of action
    /// past the point where it touches the other gear's base circle, so they would dig into that
    /// gear's flank below its base circle. `None` as for [`Self::contact_ratio`].
    pub fn tip_interference(
        &self,
        teeth: [u32; 2],
        tip_diameter_mm: [f64; 2],
        centre_distance_mm: f64,
    ) -> Option<[bool; 2]> {
        let reach = self.tip_reach_mm(teeth, tip_diameter_mm)?;
        let line = self.line_of_action_mm(teeth, centre_distance_mm)?;
        Some([reach[0] > line, reach[1] > line])
    }

    /// Circumferential backlash, mm, on the working pitch circles of a pair with shift sum
    /// `shift_sum` mounted at `centre_distance_mm`, from the nominal tooth thicknesses alone (no
    /// thickness tolerances): `j = 2a_w·(inv α_w − inv α − 2·tan α·(x1 + x2)/(z1 + z2))`.
    ///
    /// Zero at the tight-mesh distance, positive when the gears are pulled apart, negative when
    /// they would have to overlap (jam). `None` when the centre distance cannot be reached.
    pub fn backlash_mm(&self, teeth: [u32; 2], shift_sum: f64, centre_distance_mm: f64) -> Option<f64> {
        let alpha_w = self.working_pressure_angle_at(teeth, centre_distance_mm)?;
        let tight = self.inv_alpha + 2.0 * self.tan_alpha * shift_sum / tooth_sum(teeth);
        Some(2.0 * centre_distance_mm * (inv(alpha_w) - tight))
    }
}

#[cfg(test)]
mod tests {
    use super::super::system::RackProfile;
    use super::*;

    fn system(module_mm: f64, deg: f64) -> ToothSystem {
        ToothSystem::new(module_mm, deg, RackProfile::default()).unwrap()
    }

    #[test]
    fn standard_centre_distance() {
        // Common practice: a = m(z1 + z2)/2.
        assert_eq!(system(2.0, 20.0).standard_centre_distance_mm([20, 40]), 60.0);
        assert_eq!(system(1.5, 20.0).standard_centre_distance_mm([15, 22]), 27.75);
    }

    #[test]
    fn standard_pair_at_standard_distance_needs_no_shift() {
        let s = system(2.0, 20.0);
        let a = s.standard_centre_distance_mm([20, 40]);
        let alpha_w = s.working_pressure_angle_at([20, 40], a).unwrap();
        assert!((alpha_w - 20f64.to_radians()).abs() < 1e-15);
        assert!(s.shift_sum_for_centre_distance([20, 40], a).unwrap().abs() < 1e-13);
        assert_eq!(s.tip_shortening([20, 40], 0.0, a), 0.0);
        assert!(s.backlash_mm([20, 40], 0.0, a).unwrap().abs() < 1e-13);
    }

    #[test]
    fn centre_distance_and_shift_sum_are_inverse() {
        let s = system(2.0, 20.0);
        let teeth = [13, 29];
        for &sum in &[-0.8, -0.2, 0.0, 0.25, 0.7, 1.5] {
            let a_w = s.centre_distance_for_shift_sum(teeth, sum).unwrap();
            let back = s.shift_sum_for_centre_distance(teeth, a_w).unwrap();
            assert!((back - sum).abs() < 1e-12, "sum {sum}: back {back}");
            // Positive shift pushes the centres apart, negative draws them in.
            let a = s.standard_centre_distance_mm(teeth);
            assert_eq!(a_w > a, sum > 0.0, "sum {sum}");
        }
    }

    #[test]
    fn unreachable_centre_distances_and_unworkable_sums() {
        let s = system(2.0, 20.0);
        let teeth = [20, 40];
        let base = s.base_circle_distance_mm(teeth);
        assert_eq!(s.working_pressure_angle_at(teeth, base), None);
        assert_eq!(s.working_pressure_angle_at(teeth, 0.9 * base), None);
        assert_eq!(s.working_pressure_angle_at(teeth, -60.0), None);
        assert_eq!(s.working_pressure_angle_at(teeth, f64::NAN), None);
        assert!(s.working_pressure_angle_at(teeth, base * (1.0 + 1e-9)).is_some());
        assert_eq!(s.shift_sum_for_centre_distance(teeth, base), None);
        let least = s.least_workable_shift_sum(teeth);
        assert_eq!(s.centre_distance_for_shift_sum(teeth, least), None);
        assert_eq!(s.centre_distance_for_shift_sum(teeth, least - 1.0), None);
        assert_eq!(s.centre_distance_for_shift_sum(teeth, f64::NAN), None);
        let just_above = s.centre_distance_for_shift_sum(teeth, least + 1e-6).unwrap();
        assert!(just_above > base && just_above < base * 1.001);
    }

    #[test]
    fn tip_shortening_restores_the_clearance() {
        let s = system(3.0, 20.0);
        let teeth = [11, 23];
        let c = s.rack().bottom_clearance() * s.module_mm();
        // Either sign of shift sum moves the centres by less than the tips, so either needs
        // shortening; with it, the tip-to-root clearance is exactly c*·m on both sides.
        for x in [[0.6, 0.4], [0.3, -0.8], [-0.2, -0.3]] {
            let sum = x[0] + x[1];
            let a_w = s.centre_distance_for_shift_sum(teeth, sum).unwrap();
            let k = s.tip_shortening(teeth, sum, a_w);
            assert!(k > 0.0, "{x:?}");
            for (i, j) in [(0, 1), (1, 0)] {
                let ra = s.tip_diameter_mm(teeth[i], x[i], k) / 2.0;
                let rf = s.root_diameter_mm(teeth[j], x[j]) / 2.0;
                assert!((a_w - ra - rf - c).abs() < 1e-12, "{x:?}");
            }
        }
        // Gears pulled apart beyond their tight distance need none.
        let a_w = s.centre_distance_for_shift_sum(teeth, 1.0).unwrap();
        assert_eq!(s.tip_shortening(teeth, 1.0, a_w + 3.0), 0.0);
    }

    #[test]
    fn backlash_matches_tooth_thicknesses_on_the_working_pitch_circles() {
        // Independent route: pitch on the working circle minus both tooth thicknesses there.
        let s = system(2.0, 20.0);
        let teeth = [14, 37];
        let x = [0.3, -0.1];
        let a_tight = s.centre_distance_for_shift_sum(teeth, x[0] + x[1]).unwrap();
        for &extra in &[0.0, 0.05, 0.4] {
            let a_w = a_tight + extra;
            let dw = |z: u32| 2.0 * a_w * f64::from(z) / f64::from(teeth[0] + teeth[1]);
            let pitch = std::f64::consts::PI * dw(teeth[0]) / f64::from(teeth[0]);
            let s0 = s.tooth_thickness_mm(teeth[0], x[0], dw(teeth[0])).unwrap();
            let s1 = s.tooth_thickness_mm(teeth[1], x[1], dw(teeth[1])).unwrap();
            let j = s.backlash_mm(teeth, x[0] + x[1], a_w).unwrap();
            assert!((j - (pitch - s0 - s1)).abs() < 1e-12, "extra {extra}");
            assert_eq!(j > 1e-9, extra > 0.0);
        }
    }

    #[test]
    fn line_of_action_is_a_w_sin_alpha_w() {
        let s = system(2.0, 20.0);
        let teeth = [14, 37];
        for a_w in [48.5, 51.0, 55.5] {
            let alpha_w = s.working_pressure_angle_at(teeth, a_w).unwrap();
            let line = s.line_of_action_mm(teeth, a_w).unwrap();
            assert!((line - a_w * alpha_w.sin()).abs() < 1e-12, "{a_w}");
        }
    }

    #[test]
    fn a_near_rack_interferes_below_the_undercut_tooth_count() {
        // A wheel of very many teeth is nearly the basic rack, whose straight tip line reaches
        // past the pinion's tangent point exactly when z < z_min = 2·ha*/sin²α (17.1 at 20°).
        let s = system(1.0, 20.0);
        let wheel = 10_000;
        let meshed = |z: u32| {
            let teeth = [z, wheel];
            let a = s.standard_centre_distance_mm(teeth);
            let tips = [s.tip_diameter_mm(z, 0.0, 0.0), s.tip_diameter_mm(wheel, 0.0, 0.0)];
            s.tip_interference(teeth, tips, a).unwrap()
        };
        assert_eq!(meshed(17), [false, true]);
        assert_eq!(meshed(18), [false, false]);
    }

    #[test]
    fn contact_ratio_needs_tips_outside_base_circles() {
        let s = system(1.0, 20.0);
        let teeth = [20, 40];
        let a = s.standard_centre_distance_mm(teeth);
        let tips = [22.0, 42.0];
        assert!(s.contact_ratio(teeth, tips, a).is_some());
        assert_eq!(s.contact_ratio(teeth, [18.0, 42.0], a), None);
        assert_eq!(s.contact_ratio(teeth, tips, s.base_circle_distance_mm(teeth)), None);
    }

    #[test]
    fn split_gives_the_pinion_its_need_then_shares_by_teeth() {
        let s = system(1.0, 20.0);
        let teeth = [12, 60];
        let need = s.min_shift(12);
        // Rule 1: surplus above the pinion's need shared 12 : 60.
        let x = s.split_shift_sum(teeth, 1.0);
        assert!((x[0] - (need + (1.0 - need) / 6.0)).abs() < 1e-15);
        assert!((x[0] + x[1] - 1.0).abs() < 1e-15);
        // Exactly the need: all of it to the pinion.
        let x = s.split_shift_sum(teeth, need);
        assert_eq!(x[0], need);
        assert!(x[1].abs() < 1e-15);
        // The order of the gears does not matter.
        let y = s.split_shift_sum([60, 12], 1.0);
        let x = s.split_shift_sum(teeth, 1.0);
        assert!((y[0] - x[1]).abs() < 1e-15 && (y[1] - x[0]).abs() < 1e-15);
    }

    #[test]
    fn split_takes_a_shortfall_from_headroom() {
        let s = system(1.0, 20.0);
        let teeth = [12, 60];
        // Rule 2: the pinion has no headroom (it needs positive shift), so the wheel goes
        // negative and the pinion keeps its need.
        let x = s.split_shift_sum(teeth, -0.5);
        assert!((x[0] - s.min_shift(12)).abs() < 1e-15);
        assert!(x[1] >= s.min_shift(60));
        // Two large gears share a negative sum in proportion to headroom, both clear.
        let (a, b) = (30, 90);
        let x = s.split_shift_sum([a, b], -1.0);
        let (ha, hb) = (-s.min_shift(a), -s.min_shift(b));
        assert!((x[0] / x[1] - ha / hb).abs() < 1e-12);
        assert!(x[0] > s.min_shift(a) && x[1] > s.min_shift(b));
    }

    #[test]
    fn split_below_the_undercut_floor_keeps_the_pinion_clear() {
        let s = system(1.0, 20.0);
        let teeth = [12, 20];
        let floors = s.min_shift(12) + s.min_shift(20);
        let x = s.split_shift_sum(teeth, floors - 0.3);
        assert_eq!(x[0], s.min_shift(12));
        assert!(x[1] < s.min_shift(20));
        // Equal gears: even split.
        let x = s.split_shift_sum([10, 10], -1.0);
        assert_eq!(x, [-0.5, -0.5]);
    }

    #[test]
    fn split_is_continuous_at_the_seams() {
        let s = system(1.0, 20.0);
        for teeth in [[12, 60], [30, 90], [9, 13], [40, 40]] {
            let floors = s.min_shift(teeth[0]) + s.min_shift(teeth[1]);
            let needs = s.min_shift(teeth[0]).max(0.0) + s.min_shift(teeth[1]).max(0.0);
            for seam in [floors, needs] {
                let lo = s.split_shift_sum(teeth, seam - 1e-9);
                let hi = s.split_shift_sum(teeth, seam + 1e-9);
                assert!((lo[0] - hi[0]).abs() < 1e-8, "{teeth:?} at {seam}");
            }
        }
    }
}
