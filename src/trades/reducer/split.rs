//! Splitting a reducer's ratio across its stages by a rule of thumb, as a ranking help: how far
//! a train's stage ratios lie from the split the rule suggests.
//!
//! The rule: for a two-stage reducer the low-speed (output) stage takes `u_low = 0.88·√u` and
//! the high-speed (input) stage the rest, `u / u_low`, so the first stage reduces more and the
//! two wheels come out near one size, dipping alike in the oil (Dunaev and Lelikov's design
//! handbook of machine elements, for the unfolded two-stage layout — from memory, check a copy
//! before leaning on the figure). For any other stage count the ratio is split equally,
//! `u^(1/n)` per stage (common practice). A train's stages are compared with the rule's in their
//! order input to output (a reducer puts the finer module at the input), except that stages of
//! one module may be mounted in either order: within a run of equal modules the ratios are
//! matched largest with largest.

use crate::model::train::Train;

use super::hunting::{non_hunting, BALANCE_STEP};

/// The low-speed stage's share of a two-stage ratio: `u_low = LOW_SPEED_FACTOR·√u` (from
/// memory, see the module documentation).
pub const LOW_SPEED_FACTOR: f64 = 0.88;

/// The stage ratios the rule suggests for `ratio` over `stages` stages, input to output.
pub fn rule_split(ratio: f64, stages: usize) -> Vec<f64> {
    match stages {
        0 => Vec::new(),
        2 => {
            let low = LOW_SPEED_FACTOR * ratio.sqrt();
            vec![ratio / low, low]
        }
        n => vec![ratio.powf(1.0 / n as f64); n],
    }
}

/// How far the train's stage ratios lie from the rule's for its own ratio: the largest factor
/// by which one stage differs from its counterpart, as `|ln(actual / rule)|` (0 on the rule).
/// Stages are taken input to output; within a run of stages of one module, largest with
/// largest.
pub fn split_deviation(t: &Train) -> f64 {
    let mut actual: Vec<f64> =
        t.stages.iter().map(|s| f64::from(s.driven.teeth) / f64::from(s.driver.teeth)).collect();
    let mut rule = rule_split(t.ratio.to_f64(), actual.len());
    let mut start = 0;
    while start < actual.len() {
        let module = t.stages[start].module_mm;
        let end = (start..actual.len()).find(|&k| t.stages[k].module_mm != module).unwrap_or(actual.len());
        actual[start..end].sort_by(|a, b| b.total_cmp(a));
        rule[start..end].sort_by(|a, b| b.total_cmp(a));
        start = end;
    }
    actual.iter().zip(&rule).map(|(a, r)| (a / r).ln().abs()).fold(0.0, f64::max)
}

/// The ranking key: non-hunting pairs first when they are to be avoided, then the deviation
/// from the rule in steps of [`BALANCE_STEP`] (a negligible gain never outranks a better ratio),
/// mapped into `[0, 1)`. Smaller is better.
pub fn split_key(t: &Train, prefer_hunting: bool) -> f64 {
    let class = (split_deviation(t) / BALANCE_STEP.ln() - 1e-9).floor().max(0.0);
    let penalty = if prefer_hunting { non_hunting(t) as f64 } else { 0.0 };
    penalty + class / (1.0 + class)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::train::Stage;
    use crate::numbers::rational::{Ratio, RelError};

    fn train(pairs: &[(u32, u32)]) -> Train {
        let stages: Vec<Stage> = pairs.iter().map(|&(a, b)| Stage::plain(a, b, 1.0, 20.0)).collect();
        let p: u64 = pairs.iter().map(|p| u64::from(p.1)).product();
        let q: u64 = pairs.iter().map(|p| u64::from(p.0)).product();
        let ratio = Ratio::new(u128::from(p), u128::from(q)).unwrap();
        Train { stages, ratio, error: RelError::of(p, q, ratio) }
    }

    #[test]
    fn the_rule_for_two_stages() {
        // u = 20: u_low = 0.88·√20 = 3.9355, u_high = 20/3.9355 = 5.0819 (computed from the
        // rule as recalled, see the module documentation).
        let r = rule_split(20.0, 2);
        assert!((r[1] - 3.9355).abs() < 1e-4 && (r[0] - 5.0819).abs() < 1e-4, "{r:?}");
        assert!((r[0] * r[1] - 20.0).abs() < 1e-12);
        // Other stage counts: equal stages (common practice).
        let three = rule_split(27.0, 3);
        assert!(three.iter().all(|s| (s - 3.0).abs() < 1e-12));
    }

    #[test]
    fn trains_near_the_rule_rank_first() {
        // 20 = 5 × 4 lies near the rule (5.08, 3.94); 20 = 4.4444 × 4.5 (balanced) lies further.
        let near = train(&[(17, 85), (19, 76)]);
        let balanced = train(&[(18, 80), (20, 90)]);
        assert!(split_deviation(&near) < split_deviation(&balanced));
        assert!(split_key(&near, false) < split_key(&balanced, false));
        // With one module the order does not matter.
        let swapped = train(&[(19, 76), (17, 85)]);
        assert_eq!(split_deviation(&near), split_deviation(&swapped));
        // With a finer module at the input the order is fixed: 4 then 5 is far from 5.08 then
        // 3.94 (ln(5.0819/4) = 0.239).
        let mut fixed = swapped.clone();
        fixed.stages[1].module_mm = 2.0;
        assert!((split_deviation(&fixed) - (5.0819f64 / 4.0).ln()).abs() < 1e-4);
    }
}
