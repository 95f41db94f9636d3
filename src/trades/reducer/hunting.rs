//! Hunting-tooth pairs and stage balance, the two things a reducer is ranked by beyond its
//! ratio. A pair is hunting when its tooth counts have no common factor, so every tooth of one
//! gear meets every tooth of the other before the pattern repeats (common practice, for even
//! wear). Stages are balanced when their ratios are close to one another.

use crate::model::train::{Stage, Train};
use crate::numbers::rational::gcd;

/// True when the stage's tooth counts share no factor.
pub fn is_hunting(s: &Stage) -> bool {
    gcd(s.driver.teeth as u128, s.driven.teeth as u128) == 1
}

/// Stages of the train that are not hunting pairs.
pub fn non_hunting(t: &Train) -> usize {
    t.stages.iter().filter(|s| !is_hunting(s)).count()
}

/// Largest stage ratio over the smallest (1 for a single stage or equal stages).
pub fn spread(t: &Train) -> f64 {
    let r: Vec<f64> = t.stages.iter().map(|s| s.driven.teeth as f64 / s.driver.teeth as f64).collect();
    let hi = r.iter().copied().fold(f64::MIN, f64::max);
    let lo = r.iter().copied().fold(f64::MAX, f64::min);
    if r.is_empty() {
        1.0
    } else {
        hi / lo
    }
}

/// Stage balance is ranked in steps of this factor of spread: trains whose spreads lie within
/// one step count as equally balanced, so a negligible gain in balance never outranks a better
/// ratio (within a step, the ratio error decides).
pub const BALANCE_STEP: f64 = 1.1;

/// The step of balance a train falls in: 0 for a spread below [`BALANCE_STEP`], 1 below its
/// square, and so on.
pub fn balance_class(t: &Train) -> u32 {
    // A hair of slack so a spread of exactly one step's worth is not split by rounding.
    (spread(t).ln() / BALANCE_STEP.ln() - 1e-9).floor().max(0.0) as u32
}

/// The ranking key: the count of non-hunting pairs when they are to be avoided, plus the
/// balance class mapped into `[0, 1)`, so that fewer non-hunting pairs always rank first and
/// the balance class decides among equals; trains of one class are left to the next key (the
/// ratio error). Smaller is better.
pub fn balance_key(t: &Train, prefer_hunting: bool) -> f64 {
    let class = balance_class(t) as f64;
    let penalty = if prefer_hunting { non_hunting(t) as f64 } else { 0.0 };
    penalty + class / (1.0 + class)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::train::Gear;
    use crate::numbers::rational::{Ratio, RelError};

    fn train(pairs: &[(u32, u32)]) -> Train {
        let g = |t| Gear { teeth: t, labels: vec![], made: None };
        let stages: Vec<Stage> = pairs
            .iter()
            .map(|&(a, b)| Stage {
                driver: g(a),
                driven: g(b),
                module_mm: 1.0,
                pressure_angle_deg: 20.0,
                diametral_pitch: None,
                mesh: None,
                on_hand_defects: Vec::new(),
            })
            .collect();
        let r = Ratio::integer(1);
        Train { stages, ratio: r, error: RelError::of(1, 1, r) }
    }

    #[test]
    fn hunting_means_no_common_factor() {
        let t = train(&[(17, 71), (18, 72), (21, 64)]);
        let h: Vec<bool> = t.stages.iter().map(is_hunting).collect();
        assert_eq!(h, [true, false, true]);
        assert_eq!(non_hunting(&t), 1);
    }

    #[test]
    fn balance_prefers_hunting_then_even_stages() {
        let even = train(&[(20, 80), (20, 80)]);
        let uneven = train(&[(20, 40), (20, 160)]);
        let hunting_uneven = train(&[(21, 40), (19, 160)]);
        assert_eq!(spread(&even), 1.0);
        assert!(balance_key(&even, false) < balance_key(&uneven, false));
        // Hunting counts first: the uneven hunting train beats the even non-hunting one.
        assert!(balance_key(&hunting_uneven, true) < balance_key(&even, true));
        assert!(balance_key(&uneven, true) < 3.0);
    }

    #[test]
    fn spreads_within_one_step_are_equally_balanced() {
        // 1.000 and 1.044 are one class (within 10 %); 1.25 is two steps of 1.1 further.
        let level = train(&[(23, 77), (23, 77), (23, 77)]);
        let near = train(&[(20, 68), (23, 75), (22, 74)]);
        let far = train(&[(20, 60), (20, 75), (20, 80)]);
        assert_eq!(balance_class(&level), 0);
        assert!(spread(&near) > 1.0 && spread(&near) < 1.1, "{}", spread(&near));
        assert_eq!(balance_key(&level, false), balance_key(&near, false));
        assert!(balance_key(&far, false) > balance_key(&near, false));
    }
}
