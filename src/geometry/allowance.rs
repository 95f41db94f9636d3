//! Backlash and tooth-thickness allowances of an external spur pair: how much thinner than
//! nominal each gear's teeth are cut so that the pair has a wanted normal backlash over the whole
//! tolerance of its working centre distance, and what backlash given allowances leave.
//!
//! Owns the relations between tooth-thickness allowances, centre distance and backlash, and the
//! recommended least backlash; the tooth system and the nominal (tight) mesh are
//! [`super::system`]'s and [`super::pair`]'s. Nothing here chooses a centre distance or judges
//! a mesh.
//!
//! # Method
//!
//! A tooth-thickness allowance `E` (mm, on the reference circle, negative for a thinner tooth)
//! thins a tooth exactly as a change of profile shift `E / (2·m·tan α)` would, since the
//! reference-circle thickness is `s = m·(π/2 + 2·x·tan α)`. So a pair with allowances `E1`, `E2`
//! mounted at centre distance `a` has the circumferential backlash, on the working pitch
//! circles of that distance, of the nominal relation ([`ToothSystem::backlash_mm`]) taken with
//! the shift sum `x1 + x2 + (E1 + E2)/(2·m·tan α)`:
//! `j_t = 2a·(inv α_w − inv α − 2·tan α·(x1 + x2)/(z1 + z2)) − (E1 + E2)·cos α / cos α_w`, with
//! `cos α_w = a_0·cos α / a` at that distance. The normal backlash, measured along the line of
//! action (the feeler-gauge figure), is `j_n = j_t·cos α_w` (ISO 21771 relations, from memory;
//! linearised this is the familiar `j_n ≈ −(E1 + E2)·cos α + 2·Δa·sin α_w`, which a test holds
//! it to). Both are exact here, not linearised, and the inverse (the allowance sum that gives a
//! wanted backlash at a given distance) is solved in closed form.
//!
//! The least backlash falls where the housing bores the centres closest and the teeth are cut
//! thickest (upper allowances); the most where the centres are farthest apart and the teeth
//! thinnest (lower allowances). The allowance sums are split equally between the two gears
//! (common practice; a designer may load more of it onto the wheel, which is cheaper to cut),
//! unless one gear is on hand: its teeth are as they were cut, so the gear to cut takes the
//! whole of each sum.
//!
//! The recommended least normal backlash for industrial drives, when none is given, is
//! `j_bn,min = (2/3)·(0.06 + 0.0005·a + 0.03·m)` mm, with `a` the centre distance and `m` the
//! module in mm (ISO/TR 10064-2 and AGMA 2002, from memory).

use std::fmt;

use super::involute::inv;
use super::system::ToothSystem;

/// Each gear takes half of the pair's allowance sums (both gears to cut).
pub const EQUAL_SHARE: [f64; 2] = [0.5, 0.5];

/// The normal backlash a pair should have, mm, and how far its working centre distance may
/// stray as the housing is bored.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct BacklashSpec {
    /// Least and most normal backlash, mm, over the whole centre-distance tolerance.
    pub normal_backlash_mm: [f64; 2],
    /// Centre-distance tolerance, mm, either way (± f_a): the centres lie within
    /// `a_w − f_a ..= a_w + f_a`.
    pub centre_tolerance_mm: f64,
}

/// Tooth-thickness allowances of the two gears of a pair, on the reference circle, mm
/// (negative: thinner than nominal). Index 0 and 1 are the gears in the order of the pair.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct ThicknessAllowances {
    /// Upper allowance of each gear (the thickest tooth accepted), mm.
    pub upper_mm: [f64; 2],
    /// Lower allowance of each gear (the thinnest tooth accepted), mm.
    pub lower_mm: [f64; 2],
}

impl ThicknessAllowances {
    /// The tolerance of each gear's tooth thickness, `upper − lower`, mm.
    pub fn tolerance_mm(&self) -> [f64; 2] {
        [self.upper_mm[0] - self.lower_mm[0], self.upper_mm[1] - self.lower_mm[1]]
    }
}

/// The backlash a pair with allowances has at the ends of its centre-distance tolerance.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct BacklashRange {
    /// Least and most centre distance, mm.
    pub centre_distance_mm: [f64; 2],
    /// Least circumferential backlash (closest centres, thickest teeth) and most (farthest
    /// centres, thinnest teeth), mm, on the working pitch circles of each distance.
    pub circumferential_mm: [f64; 2],
    /// The same as normal backlash along the line of action, mm.
    pub normal_mm: [f64; 2],
}

/// The allowances chosen for a pair and the backlash they give.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct BacklashPlan {
    /// What was asked.
    pub spec: BacklashSpec,
    /// Each gear's allowances.
    pub allowances: ThicknessAllowances,
    /// The backlash that results.
    pub backlash: BacklashRange,
}

/// Why no allowances could be found.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum AllowanceDefect {
    /// A backlash figure or the centre-distance tolerance is not a usable number.
    InvalidInput {
        /// What was wanted, as a sentence fragment.
        what: &'static str,
        /// The value found.
        value: f64,
    },
    /// The backlash range is narrower than the centre-distance tolerance alone opens it, so
    /// no tooth-thickness tolerance is left.
    RangeTooNarrow {
        /// The width of the range asked for, mm.
        width_mm: f64,
        /// The width the centre-distance tolerance takes, mm.
        needed_mm: f64,
    },
    /// The closest centre distance the tolerance allows cannot be reached by the gears (the
    /// base circles would touch).
    CentreDistanceUnreachable {
        /// That centre distance, mm.
        centre_distance_mm: f64,
    },
}

impl fmt::Display for AllowanceDefect {
    fn fmt(&self, f: &mut fmt::Formatter) -> fmt::Result {
        match *self {
            AllowanceDefect::InvalidInput { what, value } => write!(f, "{what}, found {value}"),
            AllowanceDefect::RangeTooNarrow { width_mm, needed_mm } => write!(
                f,
                "the backlash range is {width_mm:.4} mm wide, but the centre-distance tolerance alone \
                 opens it by {needed_mm:.4} mm, which leaves no tooth-thickness tolerance; widen the \
                 range or tighten the tolerance"
            ),
            AllowanceDefect::CentreDistanceUnreachable { centre_distance_mm } => write!(
                f,
                "at the closest centre distance the tolerance allows, {centre_distance_mm:.3} mm, the gears \
                 cannot mesh at all"
            ),
        }
    }
}

/// The recommended least normal backlash for industrial drives, mm:
/// `(2/3)·(0.06 + 0.0005·a + 0.03·m)` for centre distance `centre_distance_mm` and module
/// `module_mm` (ISO/TR 10064-2 and AGMA 2002, from memory).
pub fn recommended_min_backlash_mm(centre_distance_mm: f64, module_mm: f64) -> f64 {
    2.0 / 3.0 * (0.06 + 0.0005 * centre_distance_mm.abs() + 0.03 * module_mm)
}

/// What backlash a pair is to have.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BacklashChoice {
    /// The recommended least normal backlash ([`recommended_min_backlash_mm`]) for the pair's
    /// centre distance and module, and at most twice that plus what the centre-distance
    /// tolerance opens (`4·f_a·sin α_w`, linearised): gearsieve's own default, not a standard.
    Recommended,
    /// Least and most normal backlash, mm.
    Range([f64; 2]),
}

impl BacklashChoice {
    /// The backlash range, mm, this choice gives a pair at `centre_distance_mm` of module
    /// `module_mm` and working pressure angle `working_pressure_angle_deg` whose centres may
    /// stray by `centre_tolerance_mm` either way.
    pub fn range_mm(
        &self,
        centre_distance_mm: f64,
        module_mm: f64,
        working_pressure_angle_deg: f64,
        centre_tolerance_mm: f64,
    ) -> [f64; 2] {
        match *self {
            BacklashChoice::Range(r) => r,
            BacklashChoice::Recommended => {
                let least = recommended_min_backlash_mm(centre_distance_mm, module_mm);
                let opening = 4.0 * centre_tolerance_mm * working_pressure_angle_deg.to_radians().sin();
                [least, 2.0 * least + opening]
            }
        }
    }
}

/// Sum of the tooth counts as a float.
fn tooth_sum(teeth: [u32; 2]) -> f64 {
    f64::from(teeth[0]) + f64::from(teeth[1])
}

impl ToothSystem {
    /// The shift that thins a tooth as much as the allowance `allowance_mm` (mm on the
    /// reference circle) does: `E / (2·m·tan α)`, in modules.
    pub fn shift_of_allowance(&self, allowance_mm: f64) -> f64 {
        allowance_mm / (2.0 * self.module_mm() * self.tan_alpha)
    }

    /// Circumferential and normal backlash, mm, `(j_t, j_n)`, of the pair with `teeth`, shifts
    /// summing to `shift_sum` (modules) and tooth-thickness allowances summing to
    /// `allowance_sum_mm` (mm), mounted at `centre_distance_mm`. `j_t` lies on the working pitch
    /// circles of that distance, `j_n = j_t·cos α_w` along the line of action. Negative means
    /// the teeth would have to overlap. `None` when the gears cannot mesh at that distance.
    pub fn backlash_with_allowances(
        &self,
        teeth: [u32; 2],
        shift_sum: f64,
        allowance_sum_mm: f64,
        centre_distance_mm: f64,
    ) -> Option<(f64, f64)> {
        let alpha_w = self.working_pressure_angle_at(teeth, centre_distance_mm)?;
        let j_t = self.backlash_mm(
            teeth,
            shift_sum + self.shift_of_allowance(allowance_sum_mm),
            centre_distance_mm,
        )?;
        Some((j_t, j_t * alpha_w.cos()))
    }

    /// The allowance sum `E1 + E2`, mm, that gives normal backlash `normal_backlash_mm` to the
    /// pair (shift sum `shift_sum`) at `centre_distance_mm`: the inverse of
    /// [`Self::backlash_with_allowances`], in closed form. `None` when the gears cannot mesh at
    /// that distance.
    pub fn allowance_sum_for_backlash(
        &self,
        teeth: [u32; 2],
        shift_sum: f64,
        normal_backlash_mm: f64,
        centre_distance_mm: f64,
    ) -> Option<f64> {
        let alpha_w = self.working_pressure_angle_at(teeth, centre_distance_mm)?;
        let j_t = normal_backlash_mm / alpha_w.cos();
        let effective_sum = (inv(alpha_w) - self.inv_alpha - j_t / (2.0 * centre_distance_mm))
            * tooth_sum(teeth)
            / (2.0 * self.tan_alpha);
        Some((effective_sum - shift_sum) * 2.0 * self.module_mm() * self.tan_alpha)
    }

    /// Tooth-thickness allowances for the pair with `teeth` and shift sum `shift_sum`, working
    /// at `centre_distance_mm`, that keep its normal backlash within `spec` over the whole
    /// centre-distance tolerance. Upper allowances give the least backlash at the closest
    /// centres, lower ones the most at the farthest; each sum is split between the gears by
    /// `share` (the part of it each gear takes, adding up to 1: [`EQUAL_SHARE`], or all on the
    /// gear to cut when the other is on hand; see the module documentation).
    pub fn allowances_for_backlash(
        &self,
        teeth: [u32; 2],
        shift_sum: f64,
        centre_distance_mm: f64,
        spec: BacklashSpec,
        share: [f64; 2],
    ) -> Result<BacklashPlan, AllowanceDefect> {
        let [j_min, j_max] = spec.normal_backlash_mm;
        let f_a = spec.centre_tolerance_mm;
        let invalid = |what, value| Err(AllowanceDefect::InvalidInput { what, value });
        if !(j_min.is_finite() && j_min >= 0.0) {
            return invalid("the least backlash must be a length in mm, zero or more", j_min);
        }
        if !(j_max.is_finite() && j_max > j_min) {
            return invalid("the most backlash must be a length in mm above the least", j_max);
        }
        if !(f_a.is_finite() && f_a >= 0.0) {
            return invalid("the centre-distance tolerance must be a length in mm, zero or more", f_a);
        }
        if !(centre_distance_mm.is_finite() && centre_distance_mm > f_a) {
            return invalid(
                "the centre distance must be a length in mm above its tolerance",
                centre_distance_mm,
            );
        }
        let (a_lo, a_hi) = (centre_distance_mm - f_a, centre_distance_mm + f_a);
        let unreachable = || AllowanceDefect::CentreDistanceUnreachable { centre_distance_mm: a_lo };
        let upper = self.allowance_sum_for_backlash(teeth, shift_sum, j_min, a_lo).ok_or_else(unreachable)?;
        let lower = self.allowance_sum_for_backlash(teeth, shift_sum, j_max, a_hi).ok_or_else(unreachable)?;
        if upper <= lower {
            // With a zero thickness tolerance the backlash would still spread from j_min at the
            // closest centres to this at the farthest.
            let spread = self
                .backlash_with_allowances(teeth, shift_sum, upper, a_hi)
                .map_or(f64::NAN, |(_, j_n)| j_n - j_min);
            return Err(AllowanceDefect::RangeTooNarrow { width_mm: j_max - j_min, needed_mm: spread });
        }
        let allowances =
            ThicknessAllowances { upper_mm: share.map(|k| upper * k), lower_mm: share.map(|k| lower * k) };
        let backlash = self
            .backlash_of(teeth, shift_sum, centre_distance_mm, f_a, &allowances)
            .ok_or_else(unreachable)?;
        Ok(BacklashPlan { spec, allowances, backlash })
    }

    /// The backlash range of the pair with `teeth`, shift sum `shift_sum` and `allowances`,
    /// working at `centre_distance_mm ± centre_tolerance_mm`. `None` when the gears cannot mesh
    /// at the closest distance.
    pub fn backlash_of(
        &self,
        teeth: [u32; 2],
        shift_sum: f64,
        centre_distance_mm: f64,
        centre_tolerance_mm: f64,
        allowances: &ThicknessAllowances,
    ) -> Option<BacklashRange> {
        let (a_lo, a_hi) =
            (centre_distance_mm - centre_tolerance_mm, centre_distance_mm + centre_tolerance_mm);
        let upper = allowances.upper_mm[0] + allowances.upper_mm[1];
        let lower = allowances.lower_mm[0] + allowances.lower_mm[1];
        let least = self.backlash_with_allowances(teeth, shift_sum, upper, a_lo)?;
        let most = self.backlash_with_allowances(teeth, shift_sum, lower, a_hi)?;
        Some(BacklashRange {
            centre_distance_mm: [a_lo, a_hi],
            circumferential_mm: [least.0, most.0],
            normal_mm: [least.1, most.1],
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::RackProfile;

    fn system(module_mm: f64, deg: f64) -> ToothSystem {
        ToothSystem::new(module_mm, deg, RackProfile::default()).unwrap()
    }

    #[test]
    fn recommended_least_backlash() {
        // ISO/TR 10064-2 / AGMA 2002 (from memory): j_bn,min = (2/3)(0.06 + 0.0005·a + 0.03·m).
        // Worked here for a = 100 mm, m = 2 mm: (2/3)(0.06 + 0.05 + 0.06) = 0.11333 mm.
        assert!((recommended_min_backlash_mm(100.0, 2.0) - 0.113_333).abs() < 1e-6);
        // It grows with centre distance and module.
        assert!(recommended_min_backlash_mm(200.0, 2.0) > recommended_min_backlash_mm(100.0, 2.0));
        assert!(recommended_min_backlash_mm(100.0, 4.0) > recommended_min_backlash_mm(100.0, 2.0));
    }

    #[test]
    fn no_allowance_at_the_tight_distance_means_no_backlash() {
        let s = system(2.0, 20.0);
        let teeth = [19, 47];
        let a = s.centre_distance_for_shift_sum(teeth, 0.35).unwrap();
        let (j_t, j_n) = s.backlash_with_allowances(teeth, 0.35, 0.0, a).unwrap();
        assert!(j_t.abs() < 1e-12 && j_n.abs() < 1e-12, "{j_t} {j_n}");
    }

    #[test]
    fn backlash_agrees_with_the_linear_relation_for_small_changes() {
        // Common textbook relation (ISO 21771 / DIN 3960 form, from memory):
        // j_n ≈ −(E1 + E2)·cos α + 2·Δa·sin α_w for small allowances and centre-distance changes.
        let s = system(3.0, 20.0);
        let teeth = [23, 61];
        let a0 = s.standard_centre_distance_mm(teeth);
        let alpha = 20f64.to_radians();
        for &(e_sum, da) in &[(-0.1, 0.0), (0.0, 0.02), (-0.08, -0.03), (-0.2, 0.05)] {
            let (_, j_n) = s.backlash_with_allowances(teeth, 0.0, e_sum, a0 + da).unwrap();
            let linear = -e_sum * alpha.cos() + 2.0 * da * alpha.sin();
            // Second-order terms are a few parts in 10⁴ of the figures here.
            assert!((j_n - linear).abs() < 1e-4, "E {e_sum} Δa {da}: {j_n} vs {linear}");
        }
    }

    #[test]
    fn normal_and_circumferential_backlash_differ_by_the_working_angle() {
        // j_n = j_t·cos α_w (common practice for spur gears: the normal backlash is measured
        // along the line of action).
        let s = system(2.0, 20.0);
        let teeth = [17, 40];
        let a = 58.2;
        let (j_t, j_n) = s.backlash_with_allowances(teeth, 0.2, -0.12, a).unwrap();
        let alpha_w = s.working_pressure_angle_at(teeth, a).unwrap();
        assert!((j_n - j_t * alpha_w.cos()).abs() < 1e-15);
        assert!(j_t > j_n && j_n > 0.0);
    }

    #[test]
    fn the_inverse_gives_back_the_asked_backlash() {
        let s = system(1.5, 20.0);
        let teeth = [21, 73];
        for &(x_sum, a, j) in &[(0.0, 70.5, 0.1), (0.4, 71.2, 0.05), (-0.2, 70.0, 0.2)] {
            let e = s.allowance_sum_for_backlash(teeth, x_sum, j, a).unwrap();
            let (_, j_n) = s.backlash_with_allowances(teeth, x_sum, e, a).unwrap();
            assert!((j_n - j).abs() < 1e-12, "{j_n} vs {j}");
        }
    }

    #[test]
    fn allowances_hold_the_backlash_over_the_centre_tolerance() {
        let s = system(2.0, 20.0);
        let teeth = [20, 50];
        let a = s.standard_centre_distance_mm(teeth);
        let spec = BacklashSpec { normal_backlash_mm: [0.08, 0.25], centre_tolerance_mm: 0.03 };
        let plan = s.allowances_for_backlash(teeth, 0.0, a, spec, EQUAL_SHARE).unwrap();
        let al = plan.allowances;
        // Split equally, both negative (thinner teeth), upper above lower.
        assert_eq!(al.upper_mm[0], al.upper_mm[1]);
        assert!(al.upper_mm[0] < 0.0 && al.lower_mm[0] < al.upper_mm[0]);
        // The ends of the range are met exactly.
        assert!((plan.backlash.normal_mm[0] - 0.08).abs() < 1e-12);
        assert!((plan.backlash.normal_mm[1] - 0.25).abs() < 1e-12);
        assert_eq!(plan.backlash.centre_distance_mm, [a - 0.03, a + 0.03]);
        // Any thickness within the allowances at any distance within the tolerance stays inside.
        for i in 0..=4 {
            for k in 0..=4 {
                let e = al.lower_mm[0] * 2.0 + (al.upper_mm[0] - al.lower_mm[0]) * 2.0 * f64::from(i) / 4.0;
                let d = -0.03 + 0.06 * f64::from(k) / 4.0;
                let (_, j) = s.backlash_with_allowances(teeth, 0.0, e, a + d).unwrap();
                assert!((0.08 - 1e-12..=0.25 + 1e-12).contains(&j), "E {e} Δa {d}: {j}");
            }
        }
        // Upper allowance sum ≈ −(j_min + 2·f_a·sin α)/cos α (the linear relation).
        let alpha = 20f64.to_radians();
        let linear = -(0.08 + 2.0 * 0.03 * alpha.sin()) / alpha.cos();
        assert!((al.upper_mm[0] * 2.0 - linear).abs() < 2e-4);
    }

    #[test]
    fn a_range_the_housing_alone_uses_up_is_refused() {
        let s = system(2.0, 20.0);
        let teeth = [20, 50];
        let a = s.standard_centre_distance_mm(teeth);
        // ±0.1 mm opens the backlash by about 4·0.1·sin 20° = 0.137 mm.
        let spec = BacklashSpec { normal_backlash_mm: [0.05, 0.15], centre_tolerance_mm: 0.1 };
        match s.allowances_for_backlash(teeth, 0.0, a, spec, EQUAL_SHARE) {
            Err(AllowanceDefect::RangeTooNarrow { width_mm, needed_mm }) => {
                assert!((width_mm - 0.1).abs() < 1e-12);
                assert!((needed_mm - 0.4 * 20f64.to_radians().sin()).abs() < 2e-3, "{needed_mm}");
            }
            other => panic!("{other:?}"),
        }
        let bad = [
            BacklashSpec { normal_backlash_mm: [-0.01, 0.1], centre_tolerance_mm: 0.0 },
            BacklashSpec { normal_backlash_mm: [0.1, 0.1], centre_tolerance_mm: 0.0 },
            BacklashSpec { normal_backlash_mm: [0.1, f64::NAN], centre_tolerance_mm: 0.0 },
            BacklashSpec { normal_backlash_mm: [0.1, 0.2], centre_tolerance_mm: -0.01 },
        ];
        for spec in bad {
            assert!(
                matches!(
                    s.allowances_for_backlash(teeth, 0.0, a, spec, EQUAL_SHARE),
                    Err(AllowanceDefect::InvalidInput { .. })
                ),
                "{spec:?}"
            );
        }
    }
}
