//! Why a mesh cannot be built or would not run: the [`MeshDefect`] reasons with their messages in
//! plain shop words, the [`MeshLimits`] a mesh is held to, and [`check_mesh`], which compares a
//! worked-out [`MeshGeometry`] with those limits.
//!
//! Owns the judging and the wording; computes no geometry of its own (everything it looks at is
//! already in the [`MeshGeometry`]).

use std::fmt;

use super::working::MeshGeometry;

/// Which gear of a pair a defect concerns, with enough to name it in a message.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub struct GearRef {
    /// Position in the pair, 0 or 1 (the index into the `[_; 2]` fields of [`MeshGeometry`]).
    pub index: usize,
    /// Its tooth count.
    pub teeth: u32,
    /// Pinion or wheel, by tooth count.
    pub role: Role,
}

/// The part a gear plays in its pair, by size.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Role {
    /// The gear with fewer teeth.
    Pinion,
    /// The gear with more teeth.
    Wheel,
    /// Both gears have the same tooth count.
    Twin,
}

impl GearRef {
    /// Gear `index` of a pair with `teeth`; `index` is 0 or 1, and anything larger is taken as 1.
    pub fn of(teeth: [u32; 2], index: usize) -> GearRef {
        let index = index.min(1);
        let (own, other) = (teeth[index], teeth[1 - index]);
        let role = match own.cmp(&other) {
            std::cmp::Ordering::Less => Role::Pinion,
            std::cmp::Ordering::Greater => Role::Wheel,
            std::cmp::Ordering::Equal => Role::Twin,
        };
        GearRef { index, teeth: own, role }
    }
}

impl fmt::Display for GearRef {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.role {
            Role::Pinion => write!(f, "the {}-tooth pinion", self.teeth),
            Role::Wheel => write!(f, "the {}-tooth wheel", self.teeth),
            Role::Twin if self.index == 0 => write!(f, "the first {}-tooth gear", self.teeth),
            Role::Twin => write!(f, "the second {}-tooth gear", self.teeth),
        }
    }
}

/// A reason a mesh cannot be built, or would not run well, with its numbers. Holds no heap data,
/// so returning one costs nothing.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub enum MeshDefect {
    /// An input is outside the range where the geometry means anything.
    InvalidInput {
        /// What was wanted, as a sentence fragment ("the module must be …").
        what: &'static str,
        /// The value found.
        value: f64,
    },
    /// The centre distance is not larger than the sum of the base radii, so there is no working
    /// pressure angle.
    CentreDistanceUnreachable {
        /// The centre distance asked for, mm.
        centre_distance_mm: f64,
        /// It must be larger than this, mm (where the base circles touch).
        min_mm: f64,
    },
    /// Gears already cut would have to overlap at this centre distance.
    WouldJam {
        /// The centre distance asked for, mm.
        centre_distance_mm: f64,
        /// The least centre distance the cut gears fit at (tight mesh), mm.
        tight_mm: f64,
    },
    /// The profile shift sum lies outside the range allowed.
    ShiftSumOutOfRange {
        /// The shift sum x1 + x2 the centre distance needs, in modules.
        shift_sum: f64,
        /// The lowest sum allowed, in modules.
        lo: f64,
        /// The highest sum allowed, in modules.
        hi: f64,
    },
    /// The shifts add up to so little that no working pressure angle exists.
    ShiftSumTooNegative {
        /// The shift sum x1 + x2 given, in modules.
        shift_sum: f64,
        /// It must be larger than this, in modules.
        min: f64,
    },
    /// A tip circle lies inside its base circle, so the tooth has no involute flank to work on.
    NoInvoluteAtTip {
        /// The gear concerned.
        gear: GearRef,
    },
    /// The rack would cut away the foot of the involute.
    Undercut {
        /// The gear concerned.
        gear: GearRef,
        /// Its profile shift, in modules.
        shift: f64,
        /// The least shift that avoids undercut, in modules.
        min_shift: f64,
    },
    /// The tooth is too thin at the tip (or comes to a point below it).
    PointedTip {
        /// The gear concerned.
        gear: GearRef,
        /// Tooth thickness at the tip circle, mm (negative: the flanks cross below the tip).
        thickness_mm: f64,
        /// The least thickness wanted, mm.
        min_mm: f64,
    },
    /// The tips of one gear reach past the point where the line of action meets the mate's base
    /// circle, so they would dig into the mate's flank below its base circle.
    TipInterference {
        /// The gear whose tips interfere.
        tips_of: GearRef,
        /// The gear whose flank they dig into.
        flank_of: GearRef,
    },
    /// Too little overlap between one tooth pair and the next.
    ContactRatioTooLow {
        /// The transverse contact ratio.
        value: f64,
        /// The least contact ratio wanted.
        min: f64,
    },
    /// A defect only an internal mesh (a pinion inside a ring gear) can have.
    Internal(super::internal::InternalDefect),
}

impl fmt::Display for MeshDefect {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            MeshDefect::InvalidInput { what, value } => write!(f, "{what}, found {value}"),
            MeshDefect::CentreDistanceUnreachable { centre_distance_mm, min_mm } => write!(
                f,
                "the gears cannot mesh at a centre distance of {centre_distance_mm:.3} mm: it \
                 must be more than {min_mm:.3} mm, where their base circles touch"
            ),
            MeshDefect::WouldJam { centre_distance_mm, tight_mm } => write!(
                f,
                "the gears as cut would jam at a centre distance of {centre_distance_mm:.3} mm: \
                 they need at least {tight_mm:.3} mm"
            ),
            MeshDefect::ShiftSumOutOfRange { shift_sum, lo, hi } => write!(
                f,
                "the profile shifts would have to add up to {shift_sum:.3}, outside the allowed \
                 {lo:.3} to {hi:.3}"
            ),
            MeshDefect::ShiftSumTooNegative { shift_sum, min } => write!(
                f,
                "profile shifts adding up to {shift_sum:.3} leave no working pressure angle: the \
                 sum must be more than {min:.3}"
            ),
            MeshDefect::NoInvoluteAtTip { gear } => write!(
                f,
                "the tip circle of {gear} would lie inside its base circle, leaving no involute \
                 flank to run on"
            ),
            MeshDefect::Undercut { gear, shift, min_shift } => write!(
                f,
                "{gear} would be undercut: it needs a profile shift of at least {min_shift:.3}, \
                 it has {shift:.3}"
            ),
            MeshDefect::PointedTip { gear, thickness_mm, min_mm } => {
                if thickness_mm <= 0.0 {
                    write!(
                        f,
                        "the teeth of {gear} would come to a point below the tip circle: at \
                         least {min_mm:.3} mm of tip is wanted"
                    )
                } else {
                    write!(
                        f,
                        "the teeth of {gear} would be too thin at the tip: {thickness_mm:.3} mm, \
                         at least {min_mm:.3} mm is wanted"
                    )
                }
            }
            MeshDefect::TipInterference { tips_of, flank_of } => write!(
                f,
                "the tips of {tips_of} would dig into the flanks of {flank_of} below its base \
                 circle (interference)"
            ),
            MeshDefect::ContactRatioTooLow { value, min } => write!(
                f,
                "the contact ratio would be {value:.3}, below the {min:.2} wanted for smooth \
                 running"
            ),
            MeshDefect::Internal(defect) => defect.fmt(f),
        }
    }
}

impl std::error::Error for MeshDefect {}

impl From<MeshDefect> for crate::error::Error {
    fn from(defect: MeshDefect) -> Self {
        crate::error::Error::Problem(defect.to_string())
    }
}

/// What a mesh must meet to count as workable.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct MeshLimits {
    /// Least transverse contact ratio. Default 1.2 (common practice: at least 1.2 for smooth
    /// running).
    pub min_contact_ratio: f64,
    /// Least tooth thickness at the tip, in modules. Default 0.25 (from memory: 0.2–0.25 m after
    /// profile shift).
    pub min_tip_thickness_modules: f64,
    /// Accept undercut gears (for instance small clock pinions, which are often cut so).
    /// Default false.
    pub allow_undercut: bool,
}

impl Default for MeshLimits {
    fn default() -> Self {
        MeshLimits { min_contact_ratio: 1.2, min_tip_thickness_modules: 0.25, allow_undercut: false }
    }
}

/// Every reason `mesh` would not run within `limits`, in a fixed order: per gear undercut then
/// pointed tip, then tip interference of each gear, then contact ratio. Empty when it runs.
///
/// Allocates nothing when the mesh is good (an empty `Vec` owns no memory).
pub fn check_mesh(mesh: &MeshGeometry, limits: &MeshLimits) -> Vec<MeshDefect> {
    let mut defects = Vec::new();
    let min_tip_mm = limits.min_tip_thickness_modules * mesh.module_mm;
    for i in 0..2 {
        let gear = GearRef::of(mesh.teeth, i);
        if mesh.undercut[i] && !limits.allow_undercut {
            defects.push(MeshDefect::Undercut { gear, shift: mesh.shift[i], min_shift: mesh.min_shift[i] });
        }
        if mesh.tip_thickness_mm[i] < min_tip_mm {
            defects.push(MeshDefect::PointedTip {
                gear,
                thickness_mm: mesh.tip_thickness_mm[i],
                min_mm: min_tip_mm,
            });
        }
    }
    for i in 0..2 {
        if mesh.tip_interference[i] {
            defects.push(MeshDefect::TipInterference {
                tips_of: GearRef::of(mesh.teeth, i),
                flank_of: GearRef::of(mesh.teeth, 1 - i),
            });
        }
    }
    if mesh.contact_ratio.is_nan() || mesh.contact_ratio < limits.min_contact_ratio {
        defects.push(MeshDefect::ContactRatioTooLow {
            value: mesh.contact_ratio,
            min: limits.min_contact_ratio,
        });
    }
    defects
}

#[cfg(test)]
mod tests {
    use super::super::system::{RackProfile, ToothSystem};
    use super::super::working::{mesh_geometry, Mounting};
    use super::*;

    fn system(module_mm: f64, deg: f64) -> ToothSystem {
        ToothSystem::new(module_mm, deg, RackProfile::default()).unwrap()
    }

    fn shifted(s: &ToothSystem, teeth: [u32; 2], shift: [f64; 2]) -> MeshGeometry {
        mesh_geometry(s, teeth, Mounting::Shifted { shift }).unwrap()
    }

    #[test]
    fn gears_are_named_by_size() {
        assert_eq!(GearRef::of([12, 40], 0).to_string(), "the 12-tooth pinion");
        assert_eq!(GearRef::of([12, 40], 1).to_string(), "the 40-tooth wheel");
        assert_eq!(GearRef::of([40, 12], 0).to_string(), "the 40-tooth wheel");
        assert_eq!(GearRef::of([30, 30], 0).to_string(), "the first 30-tooth gear");
        assert_eq!(GearRef::of([30, 30], 1).to_string(), "the second 30-tooth gear");
    }

    #[test]
    fn unshifted_small_pinion_is_undercut_and_interferes() {
        let s = system(1.0, 20.0);
        let g = shifted(&s, [12, 40], [0.0, 0.0]);
        let defects = check_mesh(&g, &MeshLimits::default());
        assert_eq!(
            defects[0].to_string(),
            "the 12-tooth pinion would be undercut: it needs a profile shift of at least 0.298, \
             it has 0.000"
        );
        // The wheel's tips reach past the pinion's base-circle tangent point.
        assert!(defects.contains(&MeshDefect::TipInterference {
            tips_of: GearRef::of([12, 40], 1),
            flank_of: GearRef::of([12, 40], 0),
        }));
        assert_eq!(g.tip_interference, [false, true]);
        // Allowing undercut drops that complaint only.
        let lenient = MeshLimits { allow_undercut: true, ..MeshLimits::default() };
        let rest = check_mesh(&g, &lenient);
        assert_eq!(rest.len(), defects.len() - 1);
        assert!(!rest.iter().any(|d| matches!(d, MeshDefect::Undercut { .. })));
    }

    #[test]
    fn shifting_the_pinion_cures_undercut_and_interference() {
        let s = system(1.0, 20.0);
        let x = s.min_shift(12);
        let g = shifted(&s, [12, 40], [x, 0.0]);
        assert_eq!(g.undercut, [false, false]);
        assert_eq!(g.tip_interference, [false, false]);
        assert!(check_mesh(&g, &MeshLimits::default()).is_empty());
    }

    #[test]
    fn heavily_shifted_small_pinion_comes_to_a_point() {
        let s = system(2.0, 20.0);
        let g = shifted(&s, [10, 40], [1.2, 0.0]);
        let pointed: Vec<_> = check_mesh(&g, &MeshLimits::default())
            .into_iter()
            .filter(|d| matches!(d, MeshDefect::PointedTip { .. }))
            .collect();
        assert_eq!(pointed.len(), 1);
        match pointed[0] {
            MeshDefect::PointedTip { gear, thickness_mm, min_mm } => {
                assert_eq!(gear.index, 0);
                assert_eq!(thickness_mm, g.tip_thickness_mm[0]);
                assert_eq!(min_mm, 0.25 * 2.0);
                assert!(thickness_mm < min_mm);
            }
            _ => unreachable!(),
        }
        assert!(pointed[0].to_string().starts_with("the teeth of the 10-tooth pinion would"));
        // A laxer limit below the actual thickness lets it pass (unless it is a true point).
        let thickness_modules = g.tip_thickness_modules[0];
        if thickness_modules > 0.0 {
            let lax =
                MeshLimits { min_tip_thickness_modules: thickness_modules * 0.9, ..MeshLimits::default() };
            assert!(!check_mesh(&g, &lax).iter().any(|d| matches!(d, MeshDefect::PointedTip { .. })));
        }
    }

    #[test]
    fn pulled_too_far_apart_loses_contact_ratio() {
        let s = system(1.0, 20.0);
        let teeth = [30, 45];
        let tight = shifted(&s, teeth, [0.0, 0.0]);
        assert!(check_mesh(&tight, &MeshLimits::default()).is_empty());
        let apart = mesh_geometry(
            &s,
            teeth,
            Mounting::CutGears {
                shift: [0.0, 0.0],
                tip_shortening: 0.0,
                centre_distance_mm: tight.centre_distance_mm + 0.8,
            },
        )
        .unwrap();
        let defects = check_mesh(&apart, &MeshLimits::default());
        assert_eq!(defects, vec![MeshDefect::ContactRatioTooLow { value: apart.contact_ratio, min: 1.2 }]);
        assert!(defects[0].to_string().starts_with("the contact ratio would be "));
        assert!(defects[0].to_string().ends_with("below the 1.20 wanted for smooth running"));
    }

    #[test]
    fn nan_contact_ratio_is_a_defect() {
        let s = system(1.0, 20.0);
        let mut g = shifted(&s, [30, 45], [0.0, 0.0]);
        g.contact_ratio = f64::NAN;
        assert!(matches!(
            check_mesh(&g, &MeshLimits::default())[..],
            [MeshDefect::ContactRatioTooLow { .. }]
        ));
    }

    #[test]
    fn messages_name_the_numbers() {
        let jam = MeshDefect::WouldJam { centre_distance_mm: 35.0, tight_mm: 35.512 };
        assert_eq!(
            jam.to_string(),
            "the gears as cut would jam at a centre distance of 35.000 mm: they need at least \
             35.512 mm"
        );
        let range = MeshDefect::ShiftSumOutOfRange { shift_sum: 1.2345, lo: -0.5, hi: 1.0 };
        assert_eq!(
            range.to_string(),
            "the profile shifts would have to add up to 1.234, outside the allowed -0.500 to 1.000"
        );
        let bad = ToothSystem::new(-2.0, 20.0, RackProfile::default()).unwrap_err();
        assert_eq!(bad.to_string(), "the module must be a positive number of millimetres, found -2");
        // Into the crate's error as a whole-problem message.
        let err: crate::error::Error = bad.into();
        assert_eq!(
            err,
            crate::error::Error::Problem(
                "the module must be a positive number of millimetres, found -2".into()
            )
        );
    }

    #[test]
    fn default_limits() {
        // Common practice: contact ratio at least 1.2; from memory: tip at least 0.2–0.25 m.
        let l = MeshLimits::default();
        assert_eq!(l.min_contact_ratio, 1.2);
        assert_eq!(l.min_tip_thickness_modules, 0.25);
        assert!(!l.allow_undercut);
    }
}
