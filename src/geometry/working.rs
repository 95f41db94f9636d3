//! A whole external spur mesh worked out from a tooth system, two tooth counts and how the pair
//! is cut and mounted: [`mesh_geometry`] and its fast form for a search,
//! [`shift_for_centre_distance`], both giving a [`MeshGeometry`].
//!
//! Owns putting the per-gear and pair relations together and validating the inputs they need;
//! the formulas themselves live in [`super::system`] and [`super::pair`], the judging of the
//! result in [`super::check`].

use std::array::from_fn;
use std::ops::RangeInclusive;

use super::defect::{GearRef, MeshDefect};
use super::system::{RackProfile, ToothSystem};

/// A gear counts as undercut when its shift is below the undercut limit by more than this (in
/// modules), so that a gear placed exactly on the limit by the split rule is not called undercut
/// over a rounding error.
const UNDERCUT_TOLERANCE: f64 = 1e-9;

/// Cut gears are said to jam when their backlash is below minus this many modules, for the same
/// reason: a pair mounted exactly at its tight distance must not be rejected for rounding.
const JAM_TOLERANCE_MODULES: f64 = 1e-9;

/// How the two gears are made and where their centres are.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Mounting {
    /// Gears cut with these profile shifts `[x1, x2]` (in modules), mounted tight: the working
    /// centre distance follows from the shift sum, and the tips are shortened if the bottom
    /// clearance needs it.
    Shifted {
        /// Profile shifts `[x1, x2]`, in modules.
        shift: [f64; 2],
    },
    /// Gears to be cut for this working centre distance (mm): the shift sum follows from it and
    /// is split by [`ToothSystem::split_shift_sum`]; tips shortened if needed.
    AtCentreDistance {
        /// Working centre distance, mm.
        centre_distance_mm: f64,
    },
    /// Gears already cut, with these shifts and this tip shortening, mounted at this centre
    /// distance, which may be larger than their tight distance (for instance standard gears
    /// pulled apart). Tip diameters are those as cut; backlash opens up and the contact ratio
    /// falls as the centres move apart.
    CutGears {
        /// Profile shifts `[x1, x2]` as cut, in modules.
        shift: [f64; 2],
        /// Tip shortening `k` as cut, in modules (zero or more, the same for both gears).
        tip_shortening: f64,
        /// Working centre distance, mm.
        centre_distance_mm: f64,
    },
}

/// The worked-out geometry of one external spur mesh. Index 0 and 1 of every pair of values are
/// the two gears in the order given. Lengths in mm, angles in degrees, shifts and tip shortening
/// in modules.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct MeshGeometry {
    /// Module, mm.
    pub module_mm: f64,
    /// Pressure angle of the basic rack, degrees.
    pub pressure_angle_deg: f64,
    /// Basic rack profile both gears are cut with.
    pub rack: RackProfile,
    /// Tooth counts.
    pub teeth: [u32; 2],
    /// Profile shifts `x`, in modules (positive away from the centre).
    pub shift: [f64; 2],
    /// Tip shortening `k`, in modules, taken off both tips (zero when not needed).
    pub tip_shortening: f64,
    /// Standard centre distance `a = m(z1 + z2)/2`, mm.
    #[serde(rename = "reference_centre_distance_mm")]
    pub standard_centre_distance_mm: f64,
    /// Working centre distance `a_w`, mm.
    #[serde(rename = "working_centre_distance_mm")]
    pub centre_distance_mm: f64,
    /// Working pressure angle `α_w`, degrees.
    pub working_pressure_angle_deg: f64,
    /// Pitch (reference) diameters `d = m·z`, mm.
    pub pitch_diameter_mm: [f64; 2],
    /// Working (operating) pitch diameters `d_w = 2a_w·z / (z1 + z2)`, mm: the circles that roll
    /// on each other at this centre distance.
    pub working_pitch_diameter_mm: [f64; 2],
    /// Base circle diameters `db = d·cos α`, mm.
    pub base_diameter_mm: [f64; 2],
    /// Tip diameters `da = d + 2m(ha* + x − k)`, mm.
    pub tip_diameter_mm: [f64; 2],
    /// Root diameters `df = d − 2m(hf* − x)`, mm.
    pub root_diameter_mm: [f64; 2],
    /// Least profile shift without undercut, `x_min = ha* − z·sin²α/2`, in modules.
    pub min_shift: [f64; 2],
    /// Whether the rack undercuts the gear: its shift is below `min_shift` (by more than
    /// 10⁻⁹, so a gear placed exactly on the limit counts as clear).
    pub undercut: [bool; 2],
    /// Transverse tooth thickness on the tip circle, mm; negative when the flanks cross below it.
    pub tip_thickness_mm: [f64; 2],
    /// The same as a multiple of the module.
    pub tip_thickness_modules: [f64; 2],
    /// Transverse contact ratio `ε_α` (see [`ToothSystem::contact_ratio`]).
    pub contact_ratio: f64,
    /// `tip_interference[i]`: the tips of gear `i` reach past the point where the line of action
    /// touches the other gear's base circle, so they would dig into its flank below that circle
    /// (see [`ToothSystem::tip_interference`]).
    pub tip_interference: [bool; 2],
    /// Circumferential backlash on the working pitch circles from nominal geometry, mm: zero for
    /// a tight mesh, positive for cut gears pulled apart (see [`ToothSystem::backlash_mm`]).
    pub backlash_mm: f64,
    /// `bottom_clearance_mm[i]`: gap between the tip circle of gear `i` and the root circle of the
    /// other, mm. Exactly `c*·m` on both sides for a tight mesh whose tips were shortened as
    /// [`ToothSystem::tip_shortening`] says, and more when the gears are pulled apart.
    pub bottom_clearance_mm: [f64; 2],
}

impl MeshGeometry {
    /// Profile shift sum `x1 + x2`, in modules.
    pub fn shift_sum(&self) -> f64 {
        self.shift[0] + self.shift[1]
    }
}

/// Works out the mesh of gears with `teeth` `[z1, z2]` cut to `system` and made and mounted as
/// `mounting` says.
///
/// Errors: [`MeshDefect::InvalidInput`] for a gear without teeth or a shift, tip shortening or
/// centre distance that is not a usable number; [`MeshDefect::CentreDistanceUnreachable`] when
/// the centre distance is not beyond where the base circles touch;
/// [`MeshDefect::ShiftSumTooNegative`] when given shifts leave no working pressure angle;
/// [`MeshDefect::WouldJam`] when cut gears are mounted closer than their tight distance;
/// [`MeshDefect::NoInvoluteAtTip`] when a tip circle falls inside its base circle. Whether the
/// mesh would run well (undercut, pointed tips, contact ratio) is judged by
/// [`super::check_mesh`], not here.
pub fn mesh_geometry(
    system: &ToothSystem,
    teeth: [u32; 2],
    mounting: Mounting,
) -> Result<MeshGeometry, MeshDefect> {
    check_teeth(teeth)?;
    match mounting {
        Mounting::Shifted { shift } => {
            check_shifts(shift)?;
            let sum = shift[0] + shift[1];
            let alpha_w = system.working_pressure_angle_for_shift_sum(teeth, sum).ok_or_else(|| {
                MeshDefect::ShiftSumTooNegative {
                    shift_sum: sum,
                    min: system.least_workable_shift_sum(teeth),
                }
            })?;
            let a_w = system.base_circle_distance_mm(teeth) / alpha_w.cos();
            if !a_w.is_finite() {
                return Err(MeshDefect::InvalidInput {
                    what: "the profile shifts add up to too much for any centre distance",
                    value: sum,
                });
            }
            let k = system.tip_shortening(teeth, sum, a_w);
            assemble(system, teeth, shift, k, a_w, alpha_w)
        }
        Mounting::AtCentreDistance { centre_distance_mm } => {
            shift_for_centre_distance(system, teeth, centre_distance_mm, &(f64::NEG_INFINITY..=f64::INFINITY))
        }
        Mounting::CutGears { shift, tip_shortening, centre_distance_mm } => {
            check_shifts(shift)?;
            if !(tip_shortening.is_finite() && tip_shortening >= 0.0) {
                return Err(MeshDefect::InvalidInput {
                    what: "the tip shortening must be a number of modules, zero or more",
                    value: tip_shortening,
                });
            }
            let alpha_w = working_angle(system, teeth, centre_distance_mm)?;
            let sum = shift[0] + shift[1];
            let backlash = system
                .backlash_mm(teeth, sum, centre_distance_mm)
                .ok_or_else(|| unreachable(system, teeth, centre_distance_mm))?;
            if backlash < -JAM_TOLERANCE_MODULES * system.module_mm() {
                // Jamming means the tight distance exists and is larger, so the fallback
                // value is never shown.
                let tight_mm = system.centre_distance_for_shift_sum(teeth, sum).unwrap_or(f64::NAN);
                return Err(MeshDefect::WouldJam { centre_distance_mm, tight_mm });
            }
            assemble(system, teeth, shift, tip_shortening, centre_distance_mm, alpha_w)
        }
    }
}

/// The mesh of gears with `teeth` cut to `system` for working centre distance
/// `centre_distance_mm`, provided the shift sum it needs lies in `shift_sum` (x1 + x2, in
/// modules; either end may be infinite). The sum is split by [`ToothSystem::split_shift_sum`] and
/// the tips are shortened if the clearance needs it: the same as [`mesh_geometry`] with
/// [`Mounting::AtCentreDistance`], plus the range check.
///
/// Made to be called once per candidate stage of a search: it rejects an unreachable centre
/// distance or an out-of-range sum after one `acos` and one involute, and never allocates.
/// Errors as [`mesh_geometry`], plus [`MeshDefect::ShiftSumOutOfRange`], and
/// [`MeshDefect::InvalidInput`] for a range that is empty or has a NaN end.
pub fn shift_for_centre_distance(
    system: &ToothSystem,
    teeth: [u32; 2],
    centre_distance_mm: f64,
    shift_sum: &RangeInclusive<f64>,
) -> Result<MeshGeometry, MeshDefect> {
    let (lo, hi) = (*shift_sum.start(), *shift_sum.end());
    if lo.is_nan() || hi.is_nan() || lo > hi {
        return Err(MeshDefect::InvalidInput {
            what: "the allowed profile shift sum range must run from low to high",
            value: if lo.is_nan() { lo } else { hi },
        });
    }
    check_teeth(teeth)?;
    let alpha_w = working_angle(system, teeth, centre_distance_mm)?;
    let sum = system.shift_sum_for_working_angle(teeth, alpha_w);
    if !shift_sum.contains(&sum) {
        return Err(MeshDefect::ShiftSumOutOfRange { shift_sum: sum, lo, hi });
    }
    let shift = system.split_shift_sum(teeth, sum);
    let k = system.tip_shortening(teeth, sum, centre_distance_mm);
    assemble(system, teeth, shift, k, centre_distance_mm, alpha_w)
}

/// Both gears need at least one tooth for any of the formulas to mean something.
fn check_teeth(teeth: [u32; 2]) -> Result<(), MeshDefect> {
    match teeth.iter().find(|&&z| z == 0) {
        Some(&z) => {
            Err(MeshDefect::InvalidInput { what: "a gear must have at least one tooth", value: f64::from(z) })
        }
        None => Ok(()),
    }
}

fn check_shifts(shift: [f64; 2]) -> Result<(), MeshDefect> {
    match shift.iter().find(|x| !x.is_finite()) {
        Some(&x) => Err(MeshDefect::InvalidInput {
            what: "a profile shift must be a finite number of modules",
            value: x,
        }),
        None => Ok(()),
    }
}

fn unreachable(system: &ToothSystem, teeth: [u32; 2], centre_distance_mm: f64) -> MeshDefect {
    MeshDefect::CentreDistanceUnreachable {
        centre_distance_mm,
        min_mm: system.base_circle_distance_mm(teeth),
    }
}

/// The working pressure angle at a centre distance that must be a positive finite length and
/// beyond where the base circles touch.
pub(super) fn working_angle(
    system: &ToothSystem,
    teeth: [u32; 2],
    centre_distance_mm: f64,
) -> Result<f64, MeshDefect> {
    if !(centre_distance_mm.is_finite() && centre_distance_mm > 0.0) {
        return Err(MeshDefect::InvalidInput {
            what: "the centre distance must be a positive number of millimetres",
            value: centre_distance_mm,
        });
    }
    system
        .working_pressure_angle_at(teeth, centre_distance_mm)
        .ok_or_else(|| unreachable(system, teeth, centre_distance_mm))
}

/// Puts together the geometry of a pair whose shifts, tip shortening, centre distance and
/// working pressure angle (radians) are settled.
fn assemble(
    system: &ToothSystem,
    teeth: [u32; 2],
    shift: [f64; 2],
    tip_shortening: f64,
    centre_distance_mm: f64,
    alpha_w: f64,
) -> Result<MeshGeometry, MeshDefect> {
    let tip: [f64; 2] = from_fn(|i| system.tip_diameter_mm(teeth[i], shift[i], tip_shortening));
    assemble_with_tips(system, teeth, shift, tip, tip_shortening, centre_distance_mm, alpha_w)
}

/// [`assemble`] for gears whose tip diameters are known (gears already made, whose tips may
/// differ from the tip their shift gives); `tip_shortening` is what is reported.
pub(super) fn assemble_with_tips(
    system: &ToothSystem,
    teeth: [u32; 2],
    shift: [f64; 2],
    tip: [f64; 2],
    tip_shortening: f64,
    centre_distance_mm: f64,
    alpha_w: f64,
) -> Result<MeshGeometry, MeshDefect> {
    let m = system.module_mm();
    let a_w = centre_distance_mm;
    let root: [f64; 2] = from_fn(|i| system.root_diameter_mm(teeth[i], shift[i]));
    let base: [f64; 2] = from_fn(|i| system.base_diameter_mm(teeth[i]));
    let min_shift: [f64; 2] = from_fn(|i| system.min_shift(teeth[i]));
    let mut tip_thickness = [0.0; 2];
    for i in 0..2 {
        tip_thickness[i] = system
            .tooth_thickness_mm(teeth[i], shift[i], tip[i])
            .ok_or(MeshDefect::NoInvoluteAtTip { gear: GearRef::of(teeth, i) })?;
    }
    let contact_ratio =
        system.contact_ratio(teeth, tip, a_w).ok_or_else(|| unreachable(system, teeth, a_w))?;
    let tip_interference =
        system.tip_interference(teeth, tip, a_w).ok_or_else(|| unreachable(system, teeth, a_w))?;
    let backlash_mm =
        system.backlash_mm(teeth, shift[0] + shift[1], a_w).ok_or_else(|| unreachable(system, teeth, a_w))?;
    let z_sum = f64::from(teeth[0]) + f64::from(teeth[1]);
    Ok(MeshGeometry {
        module_mm: m,
        pressure_angle_deg: system.pressure_angle_deg(),
        rack: system.rack(),
        teeth,
        shift,
        tip_shortening,
        standard_centre_distance_mm: system.standard_centre_distance_mm(teeth),
        centre_distance_mm: a_w,
        working_pressure_angle_deg: alpha_w.to_degrees(),
        pitch_diameter_mm: from_fn(|i| system.pitch_diameter_mm(teeth[i])),
        working_pitch_diameter_mm: from_fn(|i| 2.0 * a_w * f64::from(teeth[i]) / z_sum),
        base_diameter_mm: base,
        tip_diameter_mm: tip,
        root_diameter_mm: root,
        min_shift,
        undercut: [
            shift[0] < min_shift[0] - UNDERCUT_TOLERANCE,
            shift[1] < min_shift[1] - UNDERCUT_TOLERANCE,
        ],
        tip_thickness_mm: tip_thickness,
        tip_thickness_modules: [tip_thickness[0] / m, tip_thickness[1] / m],
        contact_ratio,
        tip_interference,
        backlash_mm,
        bottom_clearance_mm: [a_w - (tip[0] + root[1]) / 2.0, a_w - (tip[1] + root[0]) / 2.0],
    })
}

#[cfg(test)]
mod tests {
    use super::super::check::{check_mesh, MeshLimits};
    use super::super::modules::{module_from_diametral_pitch, MM_PER_INCH};
    use super::*;
    use proptest::prelude::*;

    fn system(module_mm: f64, deg: f64) -> ToothSystem {
        ToothSystem::new(module_mm, deg, RackProfile::default()).unwrap()
    }

    fn shifted(s: &ToothSystem, teeth: [u32; 2], shift: [f64; 2]) -> MeshGeometry {
        mesh_geometry(s, teeth, Mounting::Shifted { shift }).unwrap()
    }

    #[test]
    fn textbook_pair_pulled_apart() {
        // Source: textbook exercise (spur pair from a standard machine-design textbook's gear
        // chapter, answers computed from the formulas): pinion 16 teeth drives a 40-tooth gear,
        // diametral pitch 2 (m = 12.7 mm), 20°, addendum 1/P, dedendum 1.25/P, mounted 1/4 in
        // too far apart. The gears are unshifted standard gears simply pulled apart.
        let m = module_from_diametral_pitch(2.0).unwrap();
        assert_eq!(m, 12.7);
        // Addendum 1/P and dedendum 1.25/P are 1 and 1.25 modules: the default rack.
        let s = system(m, 20.0);
        let teeth = [16, 40];
        let inch = |mm: f64| mm / MM_PER_INCH;
        let standard = shifted(&s, teeth, [0.0, 0.0]);
        // "Standard centre distance C = 14.000 in"
        assert!((inch(standard.centre_distance_mm) - 14.000).abs() < 5e-4);
        // "transverse contact ratio at the standard centre distance ε_α = 1.6061"
        assert!((standard.contact_ratio - 1.6061).abs() < 5e-5);
        let apart = mesh_geometry(
            &s,
            teeth,
            Mounting::CutGears {
                shift: [0.0, 0.0],
                tip_shortening: 0.0,
                centre_distance_mm: standard.centre_distance_mm + 0.25 * MM_PER_INCH,
            },
        )
        .unwrap();
        // "actual C' = 14.25 in"
        assert!((inch(apart.centre_distance_mm) - 14.25).abs() < 5e-5);
        // "working pressure angle α_w = 22.6005°"
        assert!((apart.working_pressure_angle_deg - 22.6005).abs() < 5e-5);
        // "operating pitch radii r1' = 4.0714 in, r2' = 10.1786 in"
        assert!((inch(apart.working_pitch_diameter_mm[0] / 2.0) - 4.0714).abs() < 5e-5);
        assert!((inch(apart.working_pitch_diameter_mm[1] / 2.0) - 10.1786).abs() < 5e-5);
        // The cut gears keep their tips; pulling them apart opens backlash and costs overlap.
        assert_eq!(apart.tip_diameter_mm, standard.tip_diameter_mm);
        assert_eq!(apart.shift, [0.0, 0.0]);
        assert!(apart.backlash_mm > 0.0 && standard.backlash_mm.abs() < 1e-9);
        assert!(apart.contact_ratio < standard.contact_ratio);
    }

    #[test]
    fn cut_gears_closer_than_tight_would_jam() {
        let s = system(2.0, 20.0);
        let teeth = [18, 30];
        let tight = shifted(&s, teeth, [0.4, 0.2]);
        let at = |a_w| Mounting::CutGears {
            shift: [0.4, 0.2],
            tip_shortening: tight.tip_shortening,
            centre_distance_mm: a_w,
        };
        let same = mesh_geometry(&s, teeth, at(tight.centre_distance_mm)).unwrap();
        assert!((same.contact_ratio - tight.contact_ratio).abs() < 1e-12);
        assert_eq!(same.tip_diameter_mm, tight.tip_diameter_mm);
        match mesh_geometry(&s, teeth, at(tight.centre_distance_mm - 0.01)) {
            Err(MeshDefect::WouldJam { tight_mm, .. }) => {
                assert!((tight_mm - tight.centre_distance_mm).abs() < 1e-9)
            }
            other => panic!("{other:?}"),
        }
    }

    #[test]
    fn shifted_pair_geometry() {
        let s = system(2.0, 20.0);
        let teeth = [12, 40];
        let g = shifted(&s, teeth, [0.4, 0.1]);
        // Positive shift sum: centres apart, larger working pressure angle, tips shortened.
        assert!(g.centre_distance_mm > g.standard_centre_distance_mm);
        assert!(g.working_pressure_angle_deg > 20.0);
        assert!(g.tip_shortening > 0.0);
        assert!((g.shift_sum() - 0.5).abs() < 1e-15);
        // The working pitch circles roll on each other: they add up to twice a_w and keep the
        // ratio of the teeth.
        let dw = g.working_pitch_diameter_mm;
        assert!((dw[0] + dw[1] - 2.0 * g.centre_distance_mm).abs() < 1e-12);
        assert!((dw[1] / dw[0] - 40.0 / 12.0).abs() < 1e-12);
        // cos α_w = db / dw on each gear.
        let cos_w = g.working_pressure_angle_deg.to_radians().cos();
        assert!((g.base_diameter_mm[0] / dw[0] - cos_w).abs() < 1e-12);
        // Clearance at least c*·m both sides, exactly on the side the shortening was for.
        let c = 0.25 * 2.0;
        for gap in g.bottom_clearance_mm {
            assert!((gap - c).abs() < 1e-12, "{gap}");
        }
        assert_eq!(g.undercut, [false, false]);
        assert!((g.tip_thickness_modules[0] - g.tip_thickness_mm[0] / 2.0).abs() < 1e-15);
        // More shift on the pinion thins its tip.
        let thicker = shifted(&s, teeth, [0.2, 0.3]);
        assert!(thicker.tip_thickness_mm[0] > g.tip_thickness_mm[0]);
    }

    #[test]
    fn tip_thickness_of_a_large_gear_approaches_the_rack_tooth() {
        // A gear with very many teeth is nearly a rack, whose tooth is π·m/2 − 2·ha*·m·tan α
        // wide at the addendum line, shift or no shift (the rack's tooth just moves).
        let s = system(1.0, 20.0);
        let rack_tip = std::f64::consts::FRAC_PI_2 - 2.0 * 20f64.to_radians().tan();
        for x in [0.0, 0.5] {
            let g = shifted(&s, [100_000, 100_000], [x, x]);
            assert!((g.tip_thickness_mm[0] - rack_tip).abs() < 1e-4, "x {x}");
        }
    }

    #[test]
    fn at_centre_distance_splits_and_shortens() {
        let s = system(1.5, 20.0);
        let teeth = [12, 31];
        let a = s.standard_centre_distance_mm(teeth);
        let g =
            mesh_geometry(&s, teeth, Mounting::AtCentreDistance { centre_distance_mm: a + 0.75 }).unwrap();
        assert_eq!(g.shift, s.split_shift_sum(teeth, g.shift_sum()));
        assert_eq!(g.undercut, [false, false]);
        assert!((g.centre_distance_mm - (a + 0.75)).abs() < 1e-12);
        assert!(g.backlash_mm.abs() < 1e-9);
        // The same pair cut with those shifts meshes tight at the same place.
        let back = shifted(&s, teeth, g.shift);
        assert!((back.centre_distance_mm - g.centre_distance_mm).abs() < 1e-9);
        assert!((back.tip_shortening - g.tip_shortening).abs() < 1e-9);
    }

    #[test]
    fn search_entry_rejects_what_it_cannot_reach() {
        let s = system(1.0, 20.0);
        let teeth = [20, 30];
        let a = s.standard_centre_distance_mm(teeth);
        let range = -0.5..=1.0;
        let ok = shift_for_centre_distance(&s, teeth, a + 0.3, &range).unwrap();
        assert!(range.contains(&ok.shift_sum()));
        match shift_for_centre_distance(&s, teeth, a + 3.0, &range) {
            Err(MeshDefect::ShiftSumOutOfRange { shift_sum, lo, hi }) => {
                assert!(shift_sum > 1.0 && lo == -0.5 && hi == 1.0);
                // The sum reported is the one that centre distance needs.
                let need = s.shift_sum_for_centre_distance(teeth, a + 3.0).unwrap();
                assert_eq!(shift_sum, need);
            }
            other => panic!("{other:?}"),
        }
        assert!(matches!(
            shift_for_centre_distance(&s, teeth, a - 1.0, &range),
            Err(MeshDefect::ShiftSumOutOfRange { .. })
        ));
        match shift_for_centre_distance(&s, teeth, 0.9 * a, &(f64::NEG_INFINITY..=1.0)) {
            Err(MeshDefect::CentreDistanceUnreachable { min_mm, .. }) => {
                assert!((min_mm - a * 20f64.to_radians().cos()).abs() < 1e-12)
            }
            other => panic!("{other:?}"),
        }
        for bad in [1.0..=-1.0, f64::NAN..=1.0, 0.0..=f64::NAN] {
            assert!(matches!(
                shift_for_centre_distance(&s, teeth, a, &bad),
                Err(MeshDefect::InvalidInput { .. })
            ));
        }
    }

    #[test]
    fn rejects_unusable_inputs() {
        let s = system(1.0, 20.0);
        let invalid = |r: Result<MeshGeometry, MeshDefect>| matches!(r, Err(MeshDefect::InvalidInput { .. }));
        let shifts = |shift| Mounting::Shifted { shift };
        assert!(invalid(mesh_geometry(&s, [0, 20], shifts([0.0, 0.0]))));
        assert!(invalid(mesh_geometry(&s, [20, 20], shifts([f64::NAN, 0.0]))));
        assert!(invalid(mesh_geometry(&s, [20, 20], shifts([0.0, f64::INFINITY]))));
        for a_w in [0.0, -5.0, f64::NAN, f64::INFINITY] {
            let m = Mounting::AtCentreDistance { centre_distance_mm: a_w };
            assert!(invalid(mesh_geometry(&s, [20, 20], m)), "{a_w}");
        }
        for k in [-0.1, f64::NAN] {
            let m = Mounting::CutGears { shift: [0.0, 0.0], tip_shortening: k, centre_distance_mm: 20.0 };
            assert!(invalid(mesh_geometry(&s, [20, 20], m)), "{k}");
        }
        assert!(matches!(
            mesh_geometry(&s, [20, 20], shifts([-3.0, -3.0])),
            Err(MeshDefect::ShiftSumTooNegative { .. })
        ));
    }

    #[test]
    fn tip_inside_base_circle_is_reported() {
        // Strong negative shift on a small gear puts its tip below the base circle.
        let s = system(1.0, 25.0);
        let teeth = [30, 200];
        let g = mesh_geometry(&s, teeth, Mounting::Shifted { shift: [-2.5, 2.0] });
        assert!(matches!(g, Err(MeshDefect::NoInvoluteAtTip { gear }) if gear.index == 0), "{g:?}");
    }

    #[test]
    fn serialises_with_unit_names() {
        let g = shifted(&system(1.0, 20.0), [20, 40], [0.0, 0.0]);
        let json = serde_json::to_string(&g).unwrap();
        for key in [
            "\"working_centre_distance_mm\"",
            "\"reference_centre_distance_mm\"",
            "\"working_pressure_angle_deg\"",
            "\"tip_diameter_mm\"",
            "\"tip_thickness_mm\"",
            "\"contact_ratio\"",
            "\"min_shift\"",
        ] {
            assert!(json.contains(key), "{key} missing from {json}");
        }
    }

    #[test]
    fn a_good_mesh_has_no_defects() {
        let s = system(2.0, 20.0);
        let g = shifted(&s, [20, 40], [0.0, 0.0]);
        assert!(check_mesh(&g, &MeshLimits::default()).is_empty());
    }

    /// Tooth counts, module and pressure angle as the property tests draw them.
    fn pair() -> impl Strategy<Value = (ToothSystem, [u32; 2])> {
        (8u32..200, 8u32..200, 0.5f64..10.0, prop_oneof![Just(14.5f64), Just(20.0), Just(25.0)])
            .prop_map(|(z1, z2, m, deg)| (system(m, deg), [z1, z2]))
    }

    /// A centre distance strictly between where the base circles touch and three modules beyond
    /// the standard distance, as a fraction `u` of that interval.
    fn feasible(s: &ToothSystem, teeth: [u32; 2], u: f64) -> f64 {
        let lo = s.base_circle_distance_mm(teeth);
        let hi = s.standard_centre_distance_mm(teeth) + 3.0 * s.module_mm();
        lo + u * (hi - lo)
    }

    proptest! {
        #[test]
        fn shift_sum_reproduces_the_centre_distance((s, teeth) in pair(), u in 0.001f64..1.0) {
            let a_w = feasible(&s, teeth, u);
            let sum = s.shift_sum_for_centre_distance(teeth, a_w).unwrap();
            let back = s.centre_distance_for_shift_sum(teeth, sum).unwrap();
            prop_assert!((back - a_w).abs() <= 1e-9, "a_w {} back {}", a_w, back);
            // Through the whole mesh: the split shifts, cut and mounted tight, land there too.
            // Close to the base-circle distance the sum is so negative that a gear can be left
            // with no involute at its tip; then that must really be so.
            let mounting = Mounting::AtCentreDistance { centre_distance_mm: a_w };
            match mesh_geometry(&s, teeth, mounting) {
                Ok(g) => {
                    let tight = mesh_geometry(&s, teeth, Mounting::Shifted { shift: g.shift })
                        .unwrap();
                    prop_assert!((tight.centre_distance_mm - a_w).abs() <= 1e-9);
                    prop_assert!((g.shift_sum() - sum).abs() <= 1e-12 * sum.abs().max(1.0));
                }
                Err(MeshDefect::NoInvoluteAtTip { gear }) => {
                    let x = s.split_shift_sum(teeth, sum)[gear.index];
                    let k = s.tip_shortening(teeth, sum, a_w);
                    let da = s.tip_diameter_mm(gear.teeth, x, k);
                    prop_assert!(da <= s.base_diameter_mm(gear.teeth));
                }
                Err(other) => prop_assert!(false, "{}", other),
            }
        }

        #[test]
        fn contact_ratio_falls_as_cut_gears_move_apart(
            (s, teeth) in pair(),
            x in (-0.3f64..0.8, -0.3f64..0.8),
            gap in (0.0f64..2.0, 0.001f64..1.0),
        ) {
            // Small pairs at 14.5° have little room below zero shift sum before the working
            // pressure angle vanishes; such pairs cannot be cut, so they are not drawn.
            prop_assume!(x.0 + x.1 > s.least_workable_shift_sum(teeth) + 0.05);
            let cut = mesh_geometry(&s, teeth, Mounting::Shifted { shift: [x.0, x.1] }).unwrap();
            let at = |extra_modules: f64| {
                mesh_geometry(&s, teeth, Mounting::CutGears {
                    shift: cut.shift,
                    tip_shortening: cut.tip_shortening,
                    centre_distance_mm: cut.centre_distance_mm + extra_modules * s.module_mm(),
                })
                .unwrap()
            };
            let near = at(gap.0);
            let far = at(gap.0 + gap.1);
            prop_assert_eq!(near.tip_diameter_mm, cut.tip_diameter_mm);
            prop_assert_eq!(far.tip_diameter_mm, cut.tip_diameter_mm);
            prop_assert!(far.contact_ratio < near.contact_ratio);
            prop_assert!(near.contact_ratio <= cut.contact_ratio + 1e-12);
            prop_assert!(far.backlash_mm > near.backlash_mm);
            prop_assert!(far.working_pressure_angle_deg > near.working_pressure_angle_deg);
        }

        #[test]
        fn zero_shift_gives_the_standard_geometry((s, teeth) in pair()) {
            let g = mesh_geometry(&s, teeth, Mounting::Shifted { shift: [0.0, 0.0] }).unwrap();
            let m = s.module_mm();
            let a = m * f64::from(teeth[0] + teeth[1]) / 2.0;
            prop_assert!((g.centre_distance_mm - a).abs() <= 1e-9);
            prop_assert!((g.working_pressure_angle_deg - s.pressure_angle_deg()).abs() <= 1e-9);
            for (i, &z) in teeth.iter().enumerate() {
                let z = f64::from(z);
                prop_assert!((g.tip_diameter_mm[i] - m * (z + 2.0)).abs() <= 1e-9);
                prop_assert!((g.root_diameter_mm[i] - m * (z - 2.5)).abs() <= 1e-9);
            }
            prop_assert!(g.tip_shortening <= 1e-12);
            prop_assert!(g.backlash_mm.abs() <= 1e-9);
        }

        #[test]
        fn split_adds_up_and_spares_the_pinion((s, teeth) in pair(), sum in -3.0f64..3.0) {
            let x = s.split_shift_sum(teeth, sum);
            prop_assert!((x[0] + x[1] - sum).abs() <= 1e-12);
            let floor = [s.min_shift(teeth[0]), s.min_shift(teeth[1])];
            if sum >= floor[0] + floor[1] {
                prop_assert!(x[0] >= floor[0] - 1e-12 && x[1] >= floor[1] - 1e-12);
            }
            // The gear with fewer teeth is never left undercut while the other is not.
            let (p, w) = if teeth[0] < teeth[1] { (0, 1) } else { (1, 0) };
            if teeth[0] != teeth[1] {
                prop_assert!(x[p] >= floor[p] - 1e-12 || x[w] < floor[w]);
                prop_assert!(x[p] >= floor[p] - 1e-12);
            }
        }
    }
}
