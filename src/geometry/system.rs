//! The tooth system both gears of a mesh are cut to (module, pressure angle, basic rack
//! profile), and the ISO 21771 relations of one gear cut with it: pitch, base, tip and root
//! circles, the undercut limit and the tooth thickness at any diameter.
//!
//! Owns input validation for the tooth system and the per-gear formulas; knows nothing of the
//! mating gear or the centre distance (those are in [`super::pair`]).

use super::defect::MeshDefect;
use super::involute::inv;

/// The basic rack profile as multiples of the module (dimensionless, "starred" quantities).
///
/// The default is the ISO 53 type A profile (from memory): addendum 1.0, dedendum 1.25, root
/// fillet radius 0.38, hence bottom clearance 0.25.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct RackProfile {
    /// Addendum of the basic rack, `ha*`, in modules: the height of the straight flank above the
    /// datum line, which sets the tip of an unshifted gear and the undercut limit.
    pub addendum: f64,
    /// Dedendum of the basic rack, `hf*`, in modules; not less than the addendum.
    pub dedendum: f64,
    /// Root fillet radius of the basic rack, `ρf*`, in modules. Carried for reporting; the
    /// relations here use the straight flank only.
    pub root_radius: f64,
}

impl Default for RackProfile {
    fn default() -> Self {
        RackProfile { addendum: 1.0, dedendum: 1.25, root_radius: 0.38 }
    }
}

impl RackProfile {
    /// Bottom clearance `c* = hf* − ha*`, in modules: the gap left between one gear's tip and the
    /// other's root at the tight-mesh centre distance.
    pub fn bottom_clearance(&self) -> f64 {
        self.dedendum - self.addendum
    }
}

/// Module, pressure angle and basic rack: what both gears of a mesh must share. Valid by
/// construction (see [`ToothSystem::new`]); the trigonometry of the pressure angle is worked out
/// once here, because a search evaluates many pairs of one system.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ToothSystem {
    module_mm: f64,
    pressure_angle_deg: f64,
    rack: RackProfile,
    pub(super) alpha: f64,
    pub(super) cos_alpha: f64,
    pub(super) sin_alpha: f64,
    pub(super) tan_alpha: f64,
    pub(super) inv_alpha: f64,
}

impl ToothSystem {
    /// A tooth system of module `module_mm` (mm, positive) and pressure angle
    /// `pressure_angle_deg` (degrees, strictly between 0 and 90) with basic rack `rack` (addendum
    /// positive, dedendum not less than the addendum, root radius not negative, all finite).
    ///
    /// Only what the geometry itself needs is checked; which modules and pressure angles a search
    /// accepts is decided by its caller.
    pub fn new(
        module_mm: f64,
        pressure_angle_deg: f64,
        rack: RackProfile,
    ) -> Result<ToothSystem, MeshDefect> {
        let invalid = |what, value| Err(MeshDefect::InvalidInput { what, value });
        if !(module_mm.is_finite() && module_mm > 0.0) {
            return invalid("the module must be a positive number of millimetres", module_mm);
        }
        if !(pressure_angle_deg > 0.0 && pressure_angle_deg < 90.0) {
            return invalid("the pressure angle must lie between 0 and 90 degrees", pressure_angle_deg);
        }
        if !(rack.addendum.is_finite() && rack.addendum > 0.0) {
            return invalid("the rack addendum must be a positive number of modules", rack.addendum);
        }
        if !(rack.dedendum.is_finite() && rack.dedendum >= rack.addendum) {
            return invalid(
                "the rack dedendum must be a number of modules no smaller than the addendum",
                rack.dedendum,
            );
        }
        if !(rack.root_radius.is_finite() && rack.root_radius >= 0.0) {
            return invalid(
                "the rack root radius must be a number of modules, zero or more",
                rack.root_radius,
            );
        }
        let alpha = pressure_angle_deg.to_radians();
        Ok(ToothSystem {
            module_mm,
            pressure_angle_deg,
            rack,
            alpha,
            cos_alpha: alpha.cos(),
            sin_alpha: alpha.sin(),
            tan_alpha: alpha.tan(),
            inv_alpha: inv(alpha),
        })
    }

    /// Module, mm.
    pub fn module_mm(&self) -> f64 {
        self.module_mm
    }

    /// Pressure angle of the basic rack, degrees.
    pub fn pressure_angle_deg(&self) -> f64 {
        self.pressure_angle_deg
    }

    /// Pressure angle of the basic rack, radians.
    pub fn pressure_angle_rad(&self) -> f64 {
        self.alpha
    }

    /// The basic rack profile.
    pub fn rack(&self) -> RackProfile {
        self.rack
    }

    /// Pitch (reference) diameter `d = m·z`, mm.
    pub fn pitch_diameter_mm(&self, teeth: u32) -> f64 {
        self.module_mm * f64::from(teeth)
    }

    /// Base circle diameter `db = d·cos α`, mm: the circle the involute flank unwinds from.
    pub fn base_diameter_mm(&self, teeth: u32) -> f64 {
        self.pitch_diameter_mm(teeth) * self.cos_alpha
    }

    /// Tip diameter `da = d + 2m(ha* + x − k)`, mm, for profile shift `shift` (x, in modules,
    /// positive away from the centre) and tip shortening `tip_shortening` (k, in modules, zero
    /// for a full-height tooth).
    pub fn tip_diameter_mm(&self, teeth: u32, shift: f64, tip_shortening: f64) -> f64 {
        self.pitch_diameter_mm(teeth) + 2.0 * self.module_mm * (self.rack.addendum + shift - tip_shortening)
    }

    /// Root diameter `df = d − 2m(hf* − x)`, mm, for profile shift `shift` (x, in modules).
    pub fn root_diameter_mm(&self, teeth: u32, shift: f64) -> f64 {
        self.pitch_diameter_mm(teeth) - 2.0 * self.module_mm * (self.rack.dedendum - shift)
    }

    /// The least profile shift, in modules, that keeps a gear of `teeth` clear of undercut when
    /// generated by the basic rack: `x_min = ha* − z·sin²α / 2` (the exact form, from the rack's
    /// straight flank; the fillet is ignored). Negative for gears that could take a negative shift.
    pub fn min_shift(&self, teeth: u32) -> f64 {
        self.rack.addendum - f64::from(teeth) * self.sin_alpha * self.sin_alpha / 2.0
    }

    /// The fewest teeth, as a real number, that an unshifted gear may have without undercut:
    /// `z_min = 2·ha* / sin²α`. A gear is clear when its tooth count is at least this.
    pub fn min_teeth(&self) -> f64 {
        2.0 * self.rack.addendum / (self.sin_alpha * self.sin_alpha)
    }

    /// Transverse (arc) tooth thickness, mm, on the circle of `diameter_mm` of a gear of `teeth`
    /// with profile shift `shift` (x, in modules):
    /// `s_y = d_y·(π/(2z) + 2x·tan α / z + inv α − inv α_y)` with `cos α_y = db / d_y`.
    ///
    /// Negative when the two flanks have already crossed inside that circle (a pointed tooth).
    /// `None` when the circle is not outside the base circle, where the flank is not an involute,
    /// or when an input is not finite.
    pub fn tooth_thickness_mm(&self, teeth: u32, shift: f64, diameter_mm: f64) -> Option<f64> {
        let cos_y = self.base_diameter_mm(teeth) / diameter_mm;
        if !(cos_y > 0.0 && cos_y < 1.0 && shift.is_finite()) {
            return None;
        }
        let z = f64::from(teeth);
        let half_angle = std::f64::consts::FRAC_PI_2 / z + 2.0 * shift * self.tan_alpha / z;
        Some(diameter_mm * (half_angle + self.inv_alpha - inv(cos_y.acos())))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn system(module_mm: f64, deg: f64) -> ToothSystem {
        ToothSystem::new(module_mm, deg, RackProfile::default()).unwrap()
    }

    #[test]
    fn default_rack_is_iso_53_type_a() {
        // ISO 53 type A basic rack (from memory): ha* 1.00, hf* 1.25, ρf* 0.38, c* 0.25.
        let rack = RackProfile::default();
        assert_eq!((rack.addendum, rack.dedendum, rack.root_radius), (1.0, 1.25, 0.38));
        assert!((rack.bottom_clearance() - 0.25).abs() < 1e-15);
    }

    #[test]
    fn circles_of_an_unshifted_gear() {
        // Common practice: d = m·z, da = m(z + 2), whole depth 2.25 m.
        let s = system(2.0, 20.0);
        assert_eq!(s.pitch_diameter_mm(30), 60.0);
        assert_eq!(s.tip_diameter_mm(30, 0.0, 0.0), 64.0);
        assert_eq!(s.root_diameter_mm(30, 0.0), 55.0);
        let whole_depth = (s.tip_diameter_mm(30, 0.0, 0.0) - s.root_diameter_mm(30, 0.0)) / 2.0;
        assert!((whole_depth - 2.25 * 2.0).abs() < 1e-12);
        assert!((s.base_diameter_mm(30) - 60.0 * 20f64.to_radians().cos()).abs() < 1e-12);
    }

    #[test]
    fn shift_moves_tip_and_root_alike() {
        let s = system(3.0, 20.0);
        let (da0, df0) = (s.tip_diameter_mm(17, 0.0, 0.0), s.root_diameter_mm(17, 0.0));
        let (da, df) = (s.tip_diameter_mm(17, 0.4, 0.0), s.root_diameter_mm(17, 0.4));
        assert!((da - da0 - 2.0 * 3.0 * 0.4).abs() < 1e-12);
        assert!((df - df0 - 2.0 * 3.0 * 0.4).abs() < 1e-12);
        // Tip shortening takes 2km off the tip diameter only.
        assert!((s.tip_diameter_mm(17, 0.4, 0.1) - (da - 0.6)).abs() < 1e-12);
    }

    #[test]
    fn undercut_tooth_counts() {
        // Source: z_min = 2·ha*/sin²α → 17.1 at 20°, 31.9 at 14.5°, 11.2 at 25°
        // (undercut with a standard rack).
        assert!((system(1.0, 20.0).min_teeth() - 17.1).abs() < 0.05);
        assert!((system(1.0, 14.5).min_teeth() - 31.9).abs() < 0.05);
        assert!((system(1.0, 25.0).min_teeth() - 11.2).abs() < 0.05);
        // Common practice takes 17 teeth as the limit at 20°; by the exact form 17 teeth still
        // need a very small shift, 18 need none and 16 clearly some.
        let s = system(1.0, 20.0);
        assert!(s.min_shift(18) < 0.0);
        assert!(s.min_shift(17) > 0.0 && s.min_shift(17) < 0.01);
        assert!(s.min_shift(16) > 0.06);
    }

    #[test]
    fn minimum_shift_exact_form() {
        // Source: x_min = ha* − z·sin²α/2 for z = 12 at 20° = 0.2981. This checks the exact
        // form; the approximation (17 − z)/17 would give 0.2941 and must not be what is used.
        let x = system(1.0, 20.0).min_shift(12);
        assert!((x - 0.2981).abs() < 5e-5, "{x}");
        assert!((x - 0.2941).abs() > 1e-3);
        // At z_min the shift needed is zero.
        let s = system(1.0, 25.0);
        let zmin = s.min_teeth();
        let at_zmin = s.rack().addendum - zmin * s.sin_alpha * s.sin_alpha / 2.0;
        assert!(at_zmin.abs() < 1e-12);
    }

    #[test]
    fn tooth_thickness_on_the_pitch_circle_is_half_the_pitch_plus_the_shift_term() {
        // On the pitch circle α_y = α: s = m(π/2 + 2x·tan α).
        let s = system(2.5, 20.0);
        for &x in &[-0.3, 0.0, 0.5] {
            let got = s.tooth_thickness_mm(24, x, s.pitch_diameter_mm(24)).unwrap();
            let want = 2.5 * (std::f64::consts::FRAC_PI_2 + 2.0 * x * 20f64.to_radians().tan());
            assert!((got - want).abs() < 1e-12, "x {x}: {got} vs {want}");
        }
    }

    #[test]
    fn tooth_thins_towards_the_tip_and_needs_an_involute() {
        let s = system(1.0, 20.0);
        let db = s.base_diameter_mm(12);
        assert_eq!(s.tooth_thickness_mm(12, 0.0, db), None);
        assert_eq!(s.tooth_thickness_mm(12, 0.0, 0.9 * db), None);
        assert_eq!(s.tooth_thickness_mm(12, f64::NAN, 14.0), None);
        let mut last = f64::INFINITY;
        for i in 1..=20 {
            let d = db + f64::from(i) * 0.2;
            let t = s.tooth_thickness_mm(12, 0.0, d).unwrap();
            assert!(t < last, "diameter {d}");
            last = t;
        }
        // Far enough out the flanks cross: negative thickness.
        assert!(last < 0.0);
    }

    #[test]
    fn rejects_unusable_tooth_systems() {
        let rack = RackProfile::default();
        for (m, a) in [(0.0, 20.0), (-1.0, 20.0), (f64::NAN, 20.0), (f64::INFINITY, 20.0)] {
            assert!(matches!(ToothSystem::new(m, a, rack), Err(MeshDefect::InvalidInput { .. })));
        }
        for a in [0.0, 90.0, -5.0, f64::NAN] {
            assert!(ToothSystem::new(1.0, a, rack).is_err(), "{a}");
        }
        let bad = [
            RackProfile { addendum: 0.0, ..rack },
            RackProfile { dedendum: 0.9, ..rack },
            RackProfile { root_radius: -0.1, ..rack },
            RackProfile { dedendum: f64::INFINITY, ..rack },
        ];
        for r in bad {
            assert!(ToothSystem::new(1.0, 20.0, r).is_err(), "{r:?}");
        }
        assert!(ToothSystem::new(1.0, 14.5, rack).is_ok());
    }
}
