//! Whether a worked-out mesh would run: the [`MeshLimits`] a mesh is held to, and
//! [`check_mesh`], which compares a [`MeshGeometry`] with those limits and names each
//! [`MeshDefect`] it finds.
//!
//! Owns the judging; computes no geometry of its own (everything it looks at is already in the
//! [`MeshGeometry`]) and no wording (that is in [`super::defect`]).

use super::defect::{GearRef, MeshDefect};
use super::working::MeshGeometry;

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
    defects.extend(contact_ratio_defect(mesh.contact_ratio, limits));
    defects
}

/// The defect of a contact ratio below the least allowed (or not a number), for external and
/// internal meshes alike.
pub fn contact_ratio_defect(contact_ratio: f64, limits: &MeshLimits) -> Option<MeshDefect> {
    (contact_ratio.is_nan() || contact_ratio < limits.min_contact_ratio)
        .then_some(MeshDefect::ContactRatioTooLow { value: contact_ratio, min: limits.min_contact_ratio })
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
