//! What a gear is measured by on the shop floor: the span (base tangent length) over `k` teeth,
//! the dimension over two balls or pins (between them for an internal gear) with a suggested
//! ball size, and the chordal tooth thickness and height, each nominal and with the
//! tooth-thickness allowances of [`super::allowance`]; gathered per gear into [`GearData`].
//!
//! Owns the measurement relations of one gear; knows nothing of its mate or of how the
//! allowances were chosen. A gear's shift is always an input, so a gear on hand with a known
//! shift is measured as it is.
//!
//! # Relations (ISO 21771 / DIN 3960, from memory)
//!
//! - Span over `k` teeth of an external gear:
//!   `W_k = m·cos α·[(k − 0.5)·π + z·inv α] + 2·x·m·sin α`; an allowance `E` adds `E·cos α`.
//!   The calipers touch the flanks on the circle `d_W = √(d_b² + W_k²)`. The `k` chosen is the
//!   one whose contact circle lies nearest the circle `d + 2·x·m` (for `x = 0` that is the
//!   familiar `k = z·α/180° + 0.5`, rounded, a tie going down).
//! - Balls (pins) of diameter `D` in opposite tooth spaces. External gear:
//!   `inv α_M = inv α + D/(m·z·cos α) − π/(2z) + 2·x·tan α/z`, ball centres on the circle
//!   `d_M = d_b / cos α_M`, dimension over balls `M = d_M + D` for even `z` and
//!   `M = d_M·cos(90°/z) + D` for odd `z`. Internal gear (shift positive outwards, widening
//!   the spaces, as in [`super::internal`]):
//!   `inv α_M = inv α − D/(m·z·cos α) + π/(2z) + 2·x·tan α/z`, dimension between balls
//!   `M = d_M − D` (even `z`) or `d_M·cos(90°/z) − D` (odd). An allowance `E` enters as the
//!   shift `E/(2·m·tan α)` for an external gear and `−E/(2·m·tan α)` for an internal one.
//! - The suggested ball touches the flanks on the circle `d + 2·x·m`: with `α_c` the pressure
//!   angle there, the ball centre lies at `α_M = tan α_c − inv α − 2·x·tan α/z ± π/(2z)`
//!   (+ external, − internal; see [`ToothSystem::ideal_ball_mm`]) and
//!   `D = d_b·|tan α_M − tan α_c|`. For a large unshifted
//!   gear at 20° this tends to `π·m/(2·cos α) = 1.672·m`, the familiar "about 1.68 m" ball
//!   (common practice, from memory). The suggestion is rounded to 0.05 mm.
//! - Chordal tooth thickness on the reference circle `s̄ = d·sin(s/d)`, with
//!   `s = m·(π/2 ± 2·x·tan α) + E` (+ external, − internal); chordal height from the tip
//!   `h̄ = h_a + (d/2)·(1 − cos(s/d))` for an external gear and `h_a − (d/2)·(1 − cos(s/d))`
//!   for an internal one, `h_a` the addendum as cut.

use std::f64::consts::PI;

use super::allowance::{BacklashChoice, BacklashPlan, BacklashSpec, EQUAL_SHARE};
use super::system::ToothSystem;
use super::working::MeshGeometry;

/// Step a suggested ball diameter is rounded to, mm (a choice of ours, not a standard).
pub const BALL_STEP_MM: f64 = 0.05;

/// Whether a gear has its teeth outside (an ordinary gear) or inside (a ring gear).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum GearKind {
    /// Teeth on the outside.
    External,
    /// Teeth on the inside of a ring.
    Internal,
}

/// A measured size nominal and at the two allowances.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Measure {
    /// With nominal tooth thickness, mm.
    pub nominal_mm: f64,
    /// With the upper allowance (thickest accepted tooth), mm; `None` without allowances.
    pub upper_mm: Option<f64>,
    /// With the lower allowance (thinnest accepted tooth), mm; `None` without allowances.
    pub lower_mm: Option<f64>,
}

/// The span over `k` teeth.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Span {
    /// Teeth spanned.
    pub teeth: u32,
    /// The span, mm.
    pub span: Measure,
    /// Diameter of the circle where the calipers touch the flanks (nominal), mm.
    pub contact_diameter_mm: f64,
    /// Whether that circle lies on the involute, between the base circle and the tip circle.
    pub on_involute: bool,
}

/// The dimension over (external) or between (internal) two balls or pins.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct OverBalls {
    /// Ball or pin diameter, mm.
    pub ball_diameter_mm: f64,
    /// The dimension, mm.
    pub dimension: Measure,
    /// Diameter of the circle where the balls touch the flanks (nominal), mm.
    pub contact_diameter_mm: f64,
    /// Whether that circle lies on the involute, between the base circle and the tip circle.
    pub on_involute: bool,
}

/// Chordal tooth thickness and height on the reference circle.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Chordal {
    /// Chordal thickness, mm.
    pub thickness: Measure,
    /// Chordal height from the tip, mm (nominal thickness; the allowances change it by
    /// micrometres at most on ordinary gears).
    pub height_mm: f64,
}

/// The data block a gear is cut and inspected from.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct GearData {
    /// External or internal (`toothing` in JSON).
    #[serde(rename = "toothing")]
    pub kind: GearKind,
    /// Tooth count.
    pub teeth: u32,
    /// Module, mm.
    pub module_mm: f64,
    /// Pressure angle, degrees.
    pub pressure_angle_deg: f64,
    /// Profile shift, modules (for an internal gear positive outwards).
    pub shift: f64,
    /// Reference diameter `m·z`, mm.
    pub reference_diameter_mm: f64,
    /// Base diameter, mm.
    pub base_diameter_mm: f64,
    /// Tip diameter as cut, mm.
    pub tip_diameter_mm: f64,
    /// Root diameter, mm.
    pub root_diameter_mm: f64,
    /// Upper and lower tooth-thickness allowances, mm, when chosen.
    pub thickness_allowance_mm: Option<[f64; 2]>,
    /// Span over `k` teeth (external gears only).
    pub span: Option<Span>,
    /// Dimension over (or between) balls.
    pub over_balls: Option<OverBalls>,
    /// Chordal tooth thickness and height.
    pub chordal: Chordal,
}

/// One gear as cut: what its measurements are worked from. The tip and root diameters may come
/// from a mesh with shortened tips, or from a gear on hand.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CutGear {
    /// External or internal.
    pub kind: GearKind,
    /// Tooth count.
    pub teeth: u32,
    /// Profile shift, modules (for an internal gear positive outwards).
    pub shift: f64,
    /// Tip diameter as cut, mm.
    pub tip_diameter_mm: f64,
    /// Root diameter as cut, mm.
    pub root_diameter_mm: f64,
}

/// The sign an allowance enters a gear's shift with: +1 external, −1 internal.
fn sign(kind: GearKind) -> f64 {
    match kind {
        GearKind::External => 1.0,
        GearKind::Internal => -1.0,
    }
}

impl ToothSystem {
    /// Span over `k` teeth of an external gear, mm:
    /// `W_k = m·cos α·[(k − 0.5)·π + z·inv α] + 2·x·m·sin α + E·cos α`, for shift `shift`
    /// (modules) and tooth-thickness allowance `allowance_mm` (mm, zero for nominal).
    pub fn span_mm(&self, teeth: u32, shift: f64, k: u32, allowance_mm: f64) -> f64 {
        let m = self.module_mm();
        m * self.cos_alpha * ((f64::from(k) - 0.5) * PI + f64::from(teeth) * self.inv_alpha)
            + 2.0 * shift * m * self.sin_alpha
            + allowance_mm * self.cos_alpha
    }

    /// Diameter of the circle where a span `span_mm` touches the flanks, mm: `√(d_b² + W²)`.
    pub fn span_contact_diameter_mm(&self, teeth: u32, span_mm: f64) -> f64 {
        self.base_diameter_mm(teeth).hypot(span_mm)
    }

    /// The number of teeth to span on an external gear of `teeth` with shift `shift`: the `k`
    /// whose contact circle lies nearest the circle `d + 2·x·m`, from
    /// `k = z/π·(tan α_x − 2·x·tan α/z − inv α) + 1/2` with `cos α_x = d_b / (d + 2·x·m)`,
    /// rounded (a tie down), at least 1 and at most `z − 1` (the whole gear cannot be spanned).
    pub fn span_teeth(&self, teeth: u32, shift: f64) -> u32 {
        let z = f64::from(teeth);
        let d_x = self.pitch_diameter_mm(teeth) + 2.0 * shift * self.module_mm();
        let cos_x = (self.base_diameter_mm(teeth) / d_x).min(1.0);
        let tan_x = cos_x.acos().tan();
        // `k = v + 1/2` rounded, a tie going down as the span tables have it (18 teeth at 20°
        // over 2, from memory); the margin keeps rounding error from deciding a tie.
        let v = z / PI * (tan_x - 2.0 * shift * self.tan_alpha / z - self.inv_alpha);
        ((v - 1e-9).ceil().max(1.0) as u32).min(teeth.saturating_sub(1).max(1))
    }

    /// Pressure angle of the circle the ball centres lie on, radians, for a ball of
    /// `ball_mm` in a gear of `teeth` (`kind`) with shift `shift` and allowance `allowance_mm`;
    /// `None` when no such circle exists (the ball is too large for an internal gear's space).
    fn ball_centre_angle(
        &self,
        kind: GearKind,
        teeth: u32,
        shift: f64,
        ball_mm: f64,
        allowance_mm: f64,
    ) -> Option<f64> {
        let z = f64::from(teeth);
        let x = shift + sign(kind) * self.shift_of_allowance(allowance_mm);
        let d_b = self.base_diameter_mm(teeth);
        let inv_m = match kind {
            GearKind::External => {
                self.inv_alpha + ball_mm / d_b - PI / (2.0 * z) + 2.0 * x * self.tan_alpha / z
            }
            GearKind::Internal => {
                self.inv_alpha - ball_mm / d_b + PI / (2.0 * z) + 2.0 * x * self.tan_alpha / z
            }
        };
        (inv_m > 0.0 && inv_m.is_finite()).then(|| super::involute::inv_inverse(inv_m))
    }

    /// Dimension over two balls (external) or between them (internal), mm, for balls of
    /// `ball_mm` in a gear of `teeth` with shift `shift` and tooth-thickness allowance
    /// `allowance_mm`; opposite spaces for an even tooth count, the nearest to opposite for an
    /// odd one. `None` when the ball cannot sit in the space.
    pub fn over_balls_mm(
        &self,
        kind: GearKind,
        teeth: u32,
        shift: f64,
        ball_mm: f64,
        allowance_mm: f64,
    ) -> Option<f64> {
        if !(ball_mm.is_finite() && ball_mm > 0.0) {
            return None;
        }
        let alpha_m = self.ball_centre_angle(kind, teeth, shift, ball_mm, allowance_mm)?;
        let d_m = self.base_diameter_mm(teeth) / alpha_m.cos();
        let across = if teeth % 2 == 0 { d_m } else { d_m * (PI / (2.0 * f64::from(teeth))).cos() };
        Some(across + sign(kind) * ball_mm)
    }

    /// Diameter of the circle where balls of `ball_mm` touch the flanks (nominal thickness),
    /// mm: `d_b / cos α_c` with `tan α_c = tan α_M ∓ D/d_b` (− external, + internal).
    pub fn ball_contact_diameter_mm(
        &self,
        kind: GearKind,
        teeth: u32,
        shift: f64,
        ball_mm: f64,
    ) -> Option<f64> {
        let alpha_m = self.ball_centre_angle(kind, teeth, shift, ball_mm, 0.0)?;
        let d_b = self.base_diameter_mm(teeth);
        let tan_c = alpha_m.tan() - sign(kind) * ball_mm / d_b;
        Some(d_b * (1.0 + tan_c * tan_c).sqrt()).filter(|_| tan_c >= 0.0)
    }

    /// The ball diameter, mm, that touches the flanks of a gear of `teeth` (`kind`, shift
    /// `shift`) on the circle `d + 2·x·m`, unrounded. External: the ball centre lies at
    /// `α_M = tan α_c − inv α + π/(2z) − 2·x·tan α/z`; internal at
    /// `α_M = tan α_c − inv α − π/(2z) − 2·x·tan α/z`; and `D = d_b·|tan α_M − tan α_c|`
    /// (solving the ball relation with the contact condition `tan α_M = tan α_c ± D/d_b`).
    /// `None` when that circle is not outside the base circle.
    pub fn ideal_ball_mm(&self, kind: GearKind, teeth: u32, shift: f64) -> Option<f64> {
        let z = f64::from(teeth);
        let d_c = self.pitch_diameter_mm(teeth) + 2.0 * shift * self.module_mm();
        let d_b = self.base_diameter_mm(teeth);
        let cos_c = d_b / d_c;
        if !(cos_c > 0.0 && cos_c < 1.0) {
            return None;
        }
        let tan_c = cos_c.acos().tan();
        let alpha_m = tan_c - self.inv_alpha - 2.0 * shift * self.tan_alpha / z + sign(kind) * PI / (2.0 * z);
        (alpha_m > 0.0 && alpha_m < PI / 2.0).then(|| d_b * (alpha_m.tan() - tan_c).abs())
    }

    /// The ball to suggest: [`Self::ideal_ball_mm`] rounded to [`BALL_STEP_MM`].
    pub fn suggested_ball_mm(&self, kind: GearKind, teeth: u32, shift: f64) -> Option<f64> {
        let ideal = self.ideal_ball_mm(kind, teeth, shift)?;
        Some(((ideal / BALL_STEP_MM).round() * BALL_STEP_MM).max(BALL_STEP_MM))
    }

    /// Arc tooth thickness on the reference circle, mm: `m·(π/2 ± 2·x·tan α) + E`.
    pub fn reference_thickness_mm(&self, kind: GearKind, shift: f64, allowance_mm: f64) -> f64 {
        self.module_mm() * (PI / 2.0 + sign(kind) * 2.0 * shift * self.tan_alpha) + allowance_mm
    }

    /// Chordal tooth thickness on the reference circle, mm: `d·sin(s/d)`.
    pub fn chordal_thickness_mm(&self, kind: GearKind, teeth: u32, shift: f64, allowance_mm: f64) -> f64 {
        let d = self.pitch_diameter_mm(teeth);
        d * (self.reference_thickness_mm(kind, shift, allowance_mm) / d).sin()
    }

    /// Chordal height, mm, from the tip circle `tip_diameter_mm` to the chord of
    /// [`Self::chordal_thickness_mm`] (nominal thickness).
    pub fn chordal_height_mm(&self, kind: GearKind, teeth: u32, shift: f64, tip_diameter_mm: f64) -> f64 {
        let d = self.pitch_diameter_mm(teeth);
        let sag = d / 2.0 * (1.0 - (self.reference_thickness_mm(kind, shift, 0.0) / d).cos());
        match kind {
            GearKind::External => (tip_diameter_mm - d) / 2.0 + sag,
            GearKind::Internal => (d - tip_diameter_mm) / 2.0 - sag,
        }
    }

    /// The whole data block of the gear `cut`, with `allowance_mm` `[upper, lower]` when
    /// chosen, and the ball to measure with (`None`: the suggested one).
    pub fn gear_data(&self, cut: &CutGear, allowance_mm: Option<[f64; 2]>, ball_mm: Option<f64>) -> GearData {
        let CutGear { kind, teeth, shift, tip_diameter_mm, root_diameter_mm } = *cut;
        let measure = |f: &dyn Fn(f64) -> Option<f64>| -> Option<Measure> {
            Some(Measure {
                nominal_mm: f(0.0)?,
                upper_mm: allowance_mm.and_then(|a| f(a[0])),
                lower_mm: allowance_mm.and_then(|a| f(a[1])),
            })
        };
        let d_b = self.base_diameter_mm(teeth);
        // An external gear's involute runs out from the base circle to its tip circle; a ring's
        // from its tip circle (the inner one) out towards its root circle.
        let on_involute = |d: f64| match kind {
            GearKind::External => d > d_b && d <= tip_diameter_mm,
            GearKind::Internal => d > d_b && d >= tip_diameter_mm && d <= root_diameter_mm,
        };
        let span = (kind == GearKind::External).then(|| {
            let k = self.span_teeth(teeth, shift);
            let span = measure(&|e| Some(self.span_mm(teeth, shift, k, e)));
            span.map(|span| {
                let contact = self.span_contact_diameter_mm(teeth, span.nominal_mm);
                Span { teeth: k, span, contact_diameter_mm: contact, on_involute: on_involute(contact) }
            })
        });
        let ball = ball_mm.or_else(|| self.suggested_ball_mm(kind, teeth, shift));
        let over_balls = ball.and_then(|b| {
            let dimension = measure(&|e| self.over_balls_mm(kind, teeth, shift, b, e))?;
            let contact = self.ball_contact_diameter_mm(kind, teeth, shift, b)?;
            Some(OverBalls {
                ball_diameter_mm: b,
                dimension,
                contact_diameter_mm: contact,
                on_involute: on_involute(contact),
            })
        });
        let chordal = Chordal {
            thickness: Measure {
                nominal_mm: self.chordal_thickness_mm(kind, teeth, shift, 0.0),
                upper_mm: allowance_mm.map(|a| self.chordal_thickness_mm(kind, teeth, shift, a[0])),
                lower_mm: allowance_mm.map(|a| self.chordal_thickness_mm(kind, teeth, shift, a[1])),
            },
            height_mm: self.chordal_height_mm(kind, teeth, shift, tip_diameter_mm),
        };
        GearData {
            kind,
            teeth,
            module_mm: self.module_mm(),
            pressure_angle_deg: self.pressure_angle_deg(),
            shift,
            reference_diameter_mm: self.pitch_diameter_mm(teeth),
            base_diameter_mm: d_b,
            tip_diameter_mm,
            root_diameter_mm,
            thickness_allowance_mm: allowance_mm,
            span: span.flatten(),
            over_balls,
            chordal,
        }
    }
}

/// Both gears of an external mesh, measured, with the backlash plan whose allowances they
/// carry.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct PairData {
    /// The tooth-thickness allowances and the backlash they give; `None` when none could be
    /// found (the reason is in `backlash_problem`).
    pub backlash: Option<BacklashPlan>,
    /// Why no allowances fit, in words, when none do.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub backlash_problem: Option<String>,
    /// Which gears are on hand (not cut again: nominal figures, no allowances of their own).
    #[serde(default)]
    pub on_hand: [bool; 2],
    /// The data block of each gear, in the order of the mesh.
    pub gears: [GearData; 2],
}

/// The data of both gears of `mesh` (cut to `system`), with tooth-thickness allowances for
/// the backlash `choice` over the centre-distance tolerance `centre_tolerance_mm` (± mm), and
/// balls `ball_mm` (`None` for the suggested size). Tip and root diameters are the mesh's (tips
/// as shortened), the shifts the mesh's, so gears on hand with their own shift are measured as
/// they are. When no allowances fit, the gears get nominal figures only and the reason is
/// kept in [`PairData::backlash_problem`]. A gear `on_hand` is not cut again: it gets nominal
/// figures (its teeth taken as cut to them, to be checked by its span or balls) and the gear to
/// cut takes the whole allowance; when both are on hand no allowances are planned.
pub fn pair_data(
    system: &ToothSystem,
    mesh: &MeshGeometry,
    choice: BacklashChoice,
    centre_tolerance_mm: f64,
    ball_mm: [Option<f64>; 2],
    on_hand: [bool; 2],
) -> PairData {
    let spec = BacklashSpec {
        normal_backlash_mm: choice.range_mm(
            mesh.centre_distance_mm,
            mesh.module_mm,
            mesh.working_pressure_angle_deg,
            centre_tolerance_mm,
        ),
        centre_tolerance_mm,
    };
    let share = match on_hand {
        [false, false] => Some(EQUAL_SHARE),
        [true, false] => Some([0.0, 1.0]),
        [false, true] => Some([1.0, 0.0]),
        [true, true] => None,
    };
    let (backlash, problem) = match share {
        None => (
            None,
            Some(
                "both gears are on hand, cut as they are: there are no allowances to choose; measure \
                 the backlash they give"
                    .to_string(),
            ),
        ),
        Some(share) => {
            match system.allowances_for_backlash(
                mesh.teeth,
                mesh.shift_sum(),
                mesh.centre_distance_mm,
                spec,
                share,
            ) {
                Ok(p) => (Some(p), None),
                Err(e) => (None, Some(e.to_string())),
            }
        }
    };
    let gear = |i: usize| {
        let cut = CutGear {
            kind: GearKind::External,
            teeth: mesh.teeth[i],
            shift: mesh.shift[i],
            tip_diameter_mm: mesh.tip_diameter_mm[i],
            root_diameter_mm: mesh.root_diameter_mm[i],
        };
        system.gear_data(
            &cut,
            backlash.filter(|_| !on_hand[i]).map(|p| [p.allowances.upper_mm[i], p.allowances.lower_mm[i]]),
            ball_mm[i],
        )
    };
    PairData { backlash, backlash_problem: problem, on_hand, gears: [gear(0), gear(1)] }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::involute::inv;
    use crate::geometry::outline::gear_outline;
    use crate::geometry::RackProfile;

    fn system(module_mm: f64, deg: f64) -> ToothSystem {
        ToothSystem::new(module_mm, deg, RackProfile::default()).unwrap()
    }

    #[test]
    fn span_by_the_published_relation() {
        // W_k = m·cos α·[(k − 0.5)·π + z·inv α] + 2·x·m·sin α (ISO 21771 / DIN 3960, from
        // memory; written out in check-values.md), with inv 20° = 0.0149044 (computed, agrees
        // with printed involute tables). m = 1, z = 17, k = 2, x = 0:
        // 0.9396926·(1.5·π + 17·0.0149044) = 4.6663 (computed here by hand; span tables for
        // m = 1 list 4.6663 for 17 teeth over 2 — from memory).
        let s = system(1.0, 20.0);
        assert!((s.span_mm(17, 0.0, 2, 0.0) - 4.6663).abs() < 5e-5);
        // m = 3, z = 40, k = 5, x = +0.25 by the same relation with the check-values inv 20°:
        // 3·0.9396926·(4.5·π + 40·0.0149044) + 2·0.25·3·0.3420201 = 41.5839.
        let want = 3.0 * 0.939_692_6 * (4.5 * PI + 40.0 * 0.014_904_4) + 1.5 * 0.342_020_1;
        assert!((system(3.0, 20.0).span_mm(40, 0.25, 5, 0.0) - want).abs() < 5e-4, "{want}");
        // An allowance E changes the span by E·cos α.
        let d = s.span_mm(17, 0.0, 2, -0.1) - s.span_mm(17, 0.0, 2, 0.0);
        assert!((d + 0.1 * 20f64.to_radians().cos()).abs() < 1e-12);
    }

    #[test]
    fn teeth_to_span_follow_the_usual_rule_for_unshifted_gears() {
        // Usual k = round(z·α/180° + 0.5) for x = 0 (check-values.md, from memory), a tie
        // (z·α/180° whole) going down: span tables at 20° give k = 2 for 10 to 18 teeth and
        // k = 3 for 19 to 27 (from memory).
        for deg in [14.5, 20.0, 25.0] {
            let s = system(2.0, deg);
            for z in 8..=200u32 {
                let usual = (f64::from(z) * deg / 180.0 - 1e-9).ceil() as u32;
                assert_eq!(s.span_teeth(z, 0.0), usual, "z {z} at {deg}°");
            }
        }
        let s = system(1.0, 20.0);
        assert!((10..=18).all(|z| s.span_teeth(z, 0.0) == 2));
        assert!((19..=27).all(|z| s.span_teeth(z, 0.0) == 3));
        // A positive shift moves the contact outwards, so more teeth are spanned.
        let s = system(1.0, 20.0);
        assert!(s.span_teeth(30, 1.0) > s.span_teeth(30, 0.0));
    }

    /// The span across `k` teeth measured on the rack-generated outline: the distance between
    /// two parallel lines touching the outer flanks of teeth 0 and k − 1, perpendicular to the
    /// bisector of the k teeth.
    fn span_on_outline(s: &ToothSystem, z: u32, x: f64, k: u32) -> f64 {
        let o = gear_outline(s, z, x, 0.0, 1e-6).unwrap();
        let phi = PI * f64::from(k - 1) / f64::from(z);
        let (sin_p, cos_p) = phi.sin_cos();
        let u = [-sin_p, cos_p];
        // tooth 0's clockwise flank is the traced one (y < 0); tooth k − 1's anticlockwise
        // flank is its mirror image turned by 2π(k − 1)/z.
        let turn = 2.0 * phi;
        let (st, ct) = turn.sin_cos();
        let low = o.flank.involute.iter().map(|p| u[0] * p[0] + u[1] * p[1]).fold(f64::INFINITY, f64::min);
        let high = o
            .flank
            .involute
            .iter()
            .map(|p| {
                let (px, py) = (p[0], -p[1]);
                let q = [ct * px - st * py, st * px + ct * py];
                u[0] * q[0] + u[1] * q[1]
            })
            .fold(f64::NEG_INFINITY, f64::max);
        high - low
    }

    #[test]
    fn span_agrees_with_the_generated_outline() {
        // Independent of the span relation: the involute traced by the rack (outline.rs).
        for &(m, deg, z, x) in
            &[(1.0, 20.0, 17, 0.0), (2.5, 20.0, 31, 0.4), (1.0, 20.0, 40, 0.5), (3.0, 14.5, 45, -0.2)]
        {
            let s = system(m, deg);
            let k = s.span_teeth(z, x);
            let want = span_on_outline(&s, z, x, k);
            let got = s.span_mm(z, x, k, 0.0);
            assert!((got - want).abs() < 1e-5, "m {m} z {z} x {x} k {k}: {got} vs outline {want}");
            let contact = s.span_contact_diameter_mm(z, got);
            assert!(contact > s.base_diameter_mm(z) && contact < s.tip_diameter_mm(z, x, 0.0));
        }
    }

    /// The least distance, mm, from `c` to the flank whose polar angle at radius r is
    /// `half(r) = base_angle − inv α_r` (α_r the pressure angle at r), over roll parameters
    /// `t = tan α_r` up to `t_max`: dense sampling, then a golden-section refinement.
    fn distance_to_flank(r_b: f64, base_angle: f64, c: [f64; 2], t_max: f64) -> f64 {
        let point = |t: f64| {
            let r = r_b * (1.0 + t * t).sqrt();
            let a = base_angle - (t - t.atan());
            [r * a.cos(), r * a.sin()]
        };
        let dist = |t: f64| {
            let p = point(t);
            (p[0] - c[0]).hypot(p[1] - c[1])
        };
        let n = 4000;
        let mut best = 0;
        for i in 0..=n {
            if dist(t_max * f64::from(i) / f64::from(n)) < dist(t_max * f64::from(best) / f64::from(n)) {
                best = i;
            }
        }
        let (mut lo, mut hi) = (
            t_max * f64::from(best.max(1) - 1) / f64::from(n),
            t_max * f64::from((best + 1).min(n)) / f64::from(n),
        );
        for _ in 0..200 {
            let (a, b) = (lo + (hi - lo) * 0.382, lo + (hi - lo) * 0.618);
            if dist(a) < dist(b) {
                hi = b;
            } else {
                lo = a;
            }
        }
        dist(0.5 * (lo + hi))
    }

    /// The radius of the ball centre found by placing the ball on the space's centre line and
    /// moving it until it just touches the flank (bisection), independent of the inv α_M
    /// relation.
    fn ball_centre_radius(s: &ToothSystem, kind: GearKind, z: u32, x: f64, ball: f64) -> f64 {
        let zf = f64::from(z);
        let r_b = s.base_diameter_mm(z) / 2.0;
        let alpha = s.pressure_angle_rad();
        // Half-angle of the external tooth (or of the internal space) at the base circle.
        let base_half = PI / (2.0 * zf) + 2.0 * x * alpha.tan() / zf + inv(alpha);
        // External: the flank of tooth 0 facing the space centred at π/z. Internal: the
        // flank of the space centred at 0.
        let centre_angle = if kind == GearKind::External { PI / zf } else { 0.0 };
        // The flank runs out to the tip (external) or the root (internal); the ball centre
        // lies between the base circle and there.
        let r_end = match kind {
            GearKind::External => s.tip_diameter_mm(z, x, 0.0) / 2.0,
            GearKind::Internal => s.ring_root_diameter_mm(z, x) / 2.0,
        };
        let t_max = ((r_end / r_b).powi(2) - 1.0).sqrt();
        let gap = |r: f64| {
            let c = [r * centre_angle.cos(), r * centre_angle.sin()];
            distance_to_flank(r_b, base_half, c, t_max) - ball / 2.0
        };
        let (mut lo, mut hi) = (r_b * 1.0001, r_end);
        let grows = gap(hi) > gap(lo);
        for _ in 0..100 {
            let mid = 0.5 * (lo + hi);
            if (gap(mid) > 0.0) == grows {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        0.5 * (lo + hi)
    }

    #[test]
    fn balls_sit_where_the_relation_puts_them_external_and_internal() {
        // The relation (check-values.md: inv α_M = inv α + D/(m·z·cos α) − π/(2z) + 2·x·tan α/z
        // for external gears; the internal form from the same derivation) against a ball
        // placed on the flank numerically.
        let cases = [
            (GearKind::External, 2.0, 20.0, 24, 0.0),
            (GearKind::External, 1.5, 20.0, 17, 0.3),
            (GearKind::External, 3.0, 25.0, 40, -0.25),
            (GearKind::Internal, 2.0, 20.0, 60, 0.0),
            (GearKind::Internal, 1.0, 20.0, 71, 0.25),
        ];
        for (kind, m, deg, z, x) in cases {
            let s = system(m, deg);
            let ball = s.suggested_ball_mm(kind, z, x).unwrap();
            let alpha_m = s.ball_centre_angle(kind, z, x, ball, 0.0).unwrap();
            let want = s.base_diameter_mm(z) / alpha_m.cos() / 2.0;
            let found = ball_centre_radius(&s, kind, z, x, ball);
            assert!((found - want).abs() < 1e-6, "{kind:?} z {z} x {x}: {found} vs {want}");
        }
    }

    #[test]
    fn dimension_over_balls_even_and_odd() {
        let s = system(2.0, 20.0);
        // Even: M = d_M + D; odd: d_M·cos(90°/z) + D (check-values.md).
        for z in [24u32, 25] {
            let ball = 3.5;
            let alpha_m = s.ball_centre_angle(GearKind::External, z, 0.0, ball, 0.0).unwrap();
            let d_m = s.base_diameter_mm(z) / alpha_m.cos();
            let across = if z % 2 == 0 { d_m } else { d_m * (PI / 2.0 / f64::from(z)).cos() };
            assert!(
                (s.over_balls_mm(GearKind::External, z, 0.0, ball, 0.0).unwrap() - (across + ball)).abs()
                    < 1e-12
            );
            // The balls stand proud of the tip, so a micrometer reaches them.
            assert!(across + ball > s.tip_diameter_mm(z, 0.0, 0.0));
        }
        // Thinner teeth let the balls sink: M falls with a negative allowance (external), and
        // the balls move outwards in an internal gear's wider spaces: M between balls grows.
        let ext = |e| s.over_balls_mm(GearKind::External, 30, 0.0, 3.5, e).unwrap();
        assert!(ext(-0.1) < ext(0.0));
        let int = |e| s.over_balls_mm(GearKind::Internal, 60, 0.0, 3.25, e).unwrap();
        assert!(int(-0.1) > int(0.0));
        // For small allowances ΔM ≈ E·cos α / sin α_M for even z (E·cos α along the line of
        // action moves each ball radially by that over sin α_M, both sides): common practice.
        let alpha_m = s.ball_centre_angle(GearKind::External, 30, 0.0, 3.5, 0.0).unwrap();
        let linear = -0.01 * 20f64.to_radians().cos() / alpha_m.sin();
        assert!(((ext(-0.01) - ext(0.0)) - linear).abs() < 1e-4);
        assert_eq!(s.over_balls_mm(GearKind::External, 30, 0.0, -1.0, 0.0), None);
    }

    #[test]
    fn suggested_ball_touches_near_the_reference_circle() {
        // For a large unshifted gear at 20° the ideal ball tends to π·m/(2·cos α) = 1.6716·m;
        // "about 1.68 m" is the usual figure for 20° gears (common practice, from memory).
        let s = system(1.0, 20.0);
        let big = s.ideal_ball_mm(GearKind::External, 1000, 0.0).unwrap();
        assert!((big - PI / (2.0 * 20f64.to_radians().cos())).abs() < 2e-3, "{big}");
        assert!((1.65..1.70).contains(&big));
        let ring = s.ideal_ball_mm(GearKind::Internal, 1000, 0.0).unwrap();
        assert!((ring - big).abs() < 5e-3, "{ring}");
        // The ideal ball touches on the circle d + 2xm, external and internal.
        for (kind, z, x) in
            [(GearKind::External, 23, 0.3), (GearKind::Internal, 64, 0.2), (GearKind::External, 50, -0.2)]
        {
            let ball = s.ideal_ball_mm(kind, z, x).unwrap();
            let contact = s.ball_contact_diameter_mm(kind, z, x, ball).unwrap();
            assert!((contact - (f64::from(z) + 2.0 * x)).abs() < 1e-9, "{kind:?} {z} {x}: {contact}");
        }
        // Rounded to 0.05 mm.
        let b = s.suggested_ball_mm(GearKind::External, 30, 0.0).unwrap();
        assert!(((b / BALL_STEP_MM).round() * BALL_STEP_MM - b).abs() < 1e-12);
    }

    #[test]
    fn chordal_thickness_and_height() {
        // s̄ = d·sin(90°/z), h̄ = m + (d/2)(1 − cos(90°/z)) for an unshifted gear of module 1
        // (tables of chordal thickness for 1 diametral pitch list 1.5692 and 1.0308 for 20
        // teeth — from memory; the same figures computed here from the formula).
        let s = system(1.0, 20.0);
        let da = s.tip_diameter_mm(20, 0.0, 0.0);
        assert!((s.chordal_thickness_mm(GearKind::External, 20, 0.0, 0.0) - 1.5692).abs() < 5e-5);
        assert!((s.chordal_height_mm(GearKind::External, 20, 0.0, da) - 1.0308).abs() < 5e-5);
        // Towards a rack: π·m/2 and the addendum.
        assert!((s.chordal_thickness_mm(GearKind::External, 5000, 0.0, 0.0) - PI / 2.0).abs() < 1e-6);
        // A ring's chord bows away from its tip: the height is under the addendum.
        let ring_tip = s.ring_tip_diameter_mm(60, 0.0);
        assert!(s.chordal_height_mm(GearKind::Internal, 60, 0.0, ring_tip) < 1.0);
        // Shift thickens an external tooth and thins a ring's.
        assert!(
            s.chordal_thickness_mm(GearKind::External, 20, 0.3, 0.0)
                > s.chordal_thickness_mm(GearKind::External, 20, 0.0, 0.0)
        );
        assert!(
            s.chordal_thickness_mm(GearKind::Internal, 60, 0.3, 0.0)
                < s.chordal_thickness_mm(GearKind::Internal, 60, 0.0, 0.0)
        );
    }

    #[test]
    fn a_data_block_with_allowances() {
        let s = system(2.0, 20.0);
        let (z, x) = (27, 0.2);
        let cut = |kind, z, x, tip, root| CutGear {
            kind,
            teeth: z,
            shift: x,
            tip_diameter_mm: tip,
            root_diameter_mm: root,
        };
        let external = cut(GearKind::External, z, x, s.tip_diameter_mm(z, x, 0.0), s.root_diameter_mm(z, x));
        let g = s.gear_data(&external, Some([-0.05, -0.12]), None);
        let span = g.span.unwrap();
        assert_eq!(span.teeth, s.span_teeth(z, x));
        assert!(span.on_involute);
        let (up, lo) = (span.span.upper_mm.unwrap(), span.span.lower_mm.unwrap());
        assert!(lo < up && up < span.span.nominal_mm);
        let balls = g.over_balls.unwrap();
        assert!(balls.on_involute);
        assert!(balls.dimension.lower_mm.unwrap() < balls.dimension.upper_mm.unwrap());
        // Without allowances only nominal figures.
        let bare = s.gear_data(&cut(GearKind::External, z, x, 58.8, 50.8), None, Some(3.5));
        assert_eq!(bare.span.unwrap().span.upper_mm, None);
        assert_eq!(bare.over_balls.unwrap().ball_diameter_mm, 3.5);
        // A ring has no span but balls between.
        let ring_cut = cut(
            GearKind::Internal,
            72,
            0.0,
            s.ring_tip_diameter_mm(72, 0.0),
            s.ring_root_diameter_mm(72, 0.0),
        );
        let ring = s.gear_data(&ring_cut, None, None);
        assert!(ring.span.is_none());
        let between = ring.over_balls.unwrap();
        assert!(between.on_involute);
        assert!(between.dimension.nominal_mm < ring.tip_diameter_mm);
    }

    /// A gear on hand is not cut again: the gear to cut takes the whole allowance sum of an
    /// equal split (so the pair's backlash is the same), the gear on hand gets nominal figures.
    #[test]
    fn the_gear_to_cut_takes_the_whole_allowance_when_the_other_is_on_hand() {
        let s = system(2.0, 20.0);
        let mesh = crate::geometry::mesh_geometry(
            &s,
            [20, 50],
            crate::geometry::Mounting::CutGears {
                shift: [0.0, 0.0],
                tip_shortening: 0.0,
                centre_distance_mm: 70.0,
            },
        )
        .unwrap();
        let both = pair_data(&s, &mesh, BacklashChoice::Recommended, 0.02, [None, None], [false, false]);
        let kept = pair_data(&s, &mesh, BacklashChoice::Recommended, 0.02, [None, None], [true, false]);
        let (pb, pk) = (both.backlash.unwrap(), kept.backlash.unwrap());
        assert_eq!(pk.allowances.upper_mm[0], 0.0);
        assert!((pk.allowances.upper_mm[1] - 2.0 * pb.allowances.upper_mm[1]).abs() < 1e-12);
        assert!((pk.allowances.lower_mm[1] - 2.0 * pb.allowances.lower_mm[1]).abs() < 1e-12);
        assert_eq!(pk.backlash.normal_mm, pb.backlash.normal_mm);
        assert_eq!(kept.gears[0].thickness_allowance_mm, None);
        assert!(kept.gears[1].thickness_allowance_mm.is_some());
        let neither = pair_data(&s, &mesh, BacklashChoice::Recommended, 0.02, [None, None], [true, true]);
        assert!(neither.backlash.is_none() && neither.backlash_problem.is_some());
    }
}
