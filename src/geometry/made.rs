//! Pairs in which some gears are already made. A gear on hand cannot be re-cut: its profile
//! shift and its tip are what they are, and only a gear still to be cut may take the shift a
//! centre distance needs. This module works out such a pair's mesh ([`mesh_as_made`]) and the
//! centre distances at which it runs ([`running_window`]), the interval a coaxial train's
//! stages must share.
//!
//! Owns the rule for sharing a shift between a gear on hand and a gear to cut; the relations
//! themselves are [`super::pair`]'s and [`super::working`]'s, the judging [`super::check`]'s.

use std::ops::RangeInclusive;

use super::check::{check_mesh, MeshLimits};
use super::cycloidal::{check_cycloidal, cycloidal_mesh};
use super::defect::MeshDefect;
use super::form::ToothForm;
use super::system::ToothSystem;
use super::working::{assemble_with_tips, mesh_geometry, shift_for_centre_distance, working_angle};
use super::working::{MeshGeometry, Mounting};

/// How a gear already made was cut: a search takes its profile shift and tip as they are.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct AsMade {
    /// Profile shift coefficient `x` the gear was cut with, in modules (0 for a standard gear).
    pub shift: f64,
    /// Tip diameter as measured, mm, when known; otherwise the full tip of its shift,
    /// `d + 2m(ha* + x)`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tip_diameter_mm: Option<f64>,
}

impl AsMade {
    /// The same gear, compared bit for bit (two catalogue rows merge only when they agree
    /// exactly).
    pub fn same_as(&self, other: &AsMade) -> bool {
        self.shift.to_bits() == other.shift.to_bits()
            && self.tip_diameter_mm.map(f64::to_bits) == other.tip_diameter_mm.map(f64::to_bits)
    }

    /// Its tip diameter, mm: as measured, or the full tip of its shift.
    pub fn tip_mm(&self, system: &ToothSystem, teeth: u32) -> f64 {
        self.tip_diameter_mm.unwrap_or_else(|| system.tip_diameter_mm(teeth, self.shift, 0.0))
    }
}

/// How each gear of a pair stands: `Some` for a gear already made, `None` for one to be cut.
pub type Making = [Option<AsMade>; 2];

/// The mesh of a pair some of whose gears may already be made.
///
/// `centre_distance_mm`: `Some(a_w)` to mount the pair there; `None` to mount it as close as it
/// goes. The rules:
/// - both gears to cut: as [`shift_for_centre_distance`] (the sum the distance needs, split by
///   [`ToothSystem::split_shift_sum`], tips shortened as needed), or, at no given distance,
///   the undercut split of a zero sum;
/// - one gear made: it keeps its shift and tip; the gear to cut takes the rest of the sum the
///   distance needs, and only its tip is shortened. At no given distance the gear to cut takes
///   the shift that brings the sum to zero (the reference centre distance), or the least that
///   keeps it clear of undercut if that is more;
/// - both made: they mesh tight at the distance their shifts give; a given distance may exceed
///   it by at most `play_mm` (a centre-distance tolerance: backlash opens up, the working
///   pressure angle rises and the contact ratio falls as they move apart), never fall short.
///
/// `shift_sum` bounds the sum a distance may call for when a gear is to be cut.
///
/// Errors as [`mesh_geometry`], plus [`MeshDefect::WouldJam`] for gears on hand mounted too
/// close and [`MeshDefect::TooMuchPlay`] for gears on hand mounted too far apart.
pub fn mesh_as_made(
    system: &ToothSystem,
    teeth: [u32; 2],
    made: Making,
    centre_distance_mm: Option<f64>,
    shift_sum: &RangeInclusive<f64>,
    play_mm: f64,
) -> Result<MeshGeometry, MeshDefect> {
    match (made, centre_distance_mm) {
        ([None, None], Some(a_w)) => shift_for_centre_distance(system, teeth, a_w, shift_sum),
        ([None, None], None) => {
            mesh_geometry(system, teeth, Mounting::Shifted { shift: system.split_shift_sum(teeth, 0.0) })
        }
        ([Some(p), Some(q)], at) => {
            let shift = [p.shift, q.shift];
            let sum = shift[0] + shift[1];
            let tight =
                system.centre_distance_for_shift_sum(teeth, sum).ok_or(MeshDefect::ShiftSumTooNegative {
                    shift_sum: sum,
                    min: system.least_workable_shift_sum(teeth),
                })?;
            let a_w = at.unwrap_or(tight);
            let slack = 1e-9 * system.module_mm();
            if a_w < tight - slack {
                return Err(MeshDefect::WouldJam { centre_distance_mm: a_w, tight_mm: tight });
            }
            if a_w > tight + play_mm + slack {
                return Err(MeshDefect::TooMuchPlay { centre_distance_mm: a_w, tight_mm: tight, play_mm });
            }
            let alpha_w = working_angle(system, teeth, a_w)?;
            let tip = [p.tip_mm(system, teeth[0]), q.tip_mm(system, teeth[1])];
            assemble_with_tips(system, teeth, shift, tip, 0.0, a_w, alpha_w)
        }
        (made, at) => {
            let i = usize::from(made[0].is_none());
            let (m, o) = (made[i].unwrap_or_default(), 1 - i);
            let (shift_o, a_w, alpha_w) = match at {
                Some(a_w) => {
                    let alpha_w = working_angle(system, teeth, a_w)?;
                    let sum = system.shift_sum_for_working_angle(teeth, alpha_w);
                    if !shift_sum.contains(&sum) {
                        return Err(MeshDefect::ShiftSumOutOfRange {
                            shift_sum: sum,
                            lo: *shift_sum.start(),
                            hi: *shift_sum.end(),
                        });
                    }
                    (sum - m.shift, a_w, alpha_w)
                }
                None => {
                    let x_o = (-m.shift).max(system.min_shift(teeth[o]));
                    let sum = m.shift + x_o;
                    let alpha_w = system.working_pressure_angle_for_shift_sum(teeth, sum).ok_or(
                        MeshDefect::ShiftSumTooNegative {
                            shift_sum: sum,
                            min: system.least_workable_shift_sum(teeth),
                        },
                    )?;
                    (x_o, system.base_circle_distance_mm(teeth) / alpha_w.cos(), alpha_w)
                }
            };
            let mut shift = [0.0; 2];
            shift[i] = m.shift;
            shift[o] = shift_o;
            let k = system.tip_shortening(teeth, shift[0] + shift[1], a_w);
            let mut tip = [0.0; 2];
            tip[i] = m.tip_mm(system, teeth[i]);
            tip[o] = system.tip_diameter_mm(teeth[o], shift_o, k);
            assemble_with_tips(system, teeth, shift, tip, k, a_w, alpha_w)
        }
    }
}

/// [`mesh_as_made`] for a pair placed at a housing's distance `fixed` (or none): gears all to be
/// cut whose reference centre distance lies within `tolerance_mm` of it are cut standard (no
/// shift for a distance they already meet); otherwise the distance is met as
/// [`mesh_as_made`] says, gears on hand standing up to `tolerance_mm` beyond their tight
/// distance.
pub fn mesh_at_place(
    system: &ToothSystem,
    teeth: [u32; 2],
    made: Making,
    fixed: Option<f64>,
    shift_sum: &RangeInclusive<f64>,
    tolerance_mm: f64,
) -> Result<MeshGeometry, MeshDefect> {
    let standard = system.standard_centre_distance_mm(teeth);
    let at = match fixed {
        Some(a_w) if made == [None, None] && (a_w - standard).abs() <= tolerance_mm => None,
        at => at,
    };
    mesh_as_made(system, teeth, made, at, shift_sum, tolerance_mm)
}

/// The centre distances at which a pair runs within `limits`, as disjoint intervals
/// `(lo, hi)` in mm, ascending: over the distances its shift-sum range reaches when a gear is
/// to be cut, or from the tight distance to `play_mm` beyond it when both are made.
///
/// Found by judging the mesh at 64 evenly spaced distances and bisecting each boundary
/// between a running and a failing one to 10⁻⁹ of the module; a window narrower than the
/// spacing may be missed (the spacing is under 1/60 of the range).
pub fn running_window(
    system: &ToothSystem,
    teeth: [u32; 2],
    made: Making,
    shift_sum: &RangeInclusive<f64>,
    play_mm: f64,
    limits: &MeshLimits,
) -> Vec<(f64, f64)> {
    let (lo, hi) = match made {
        [Some(p), Some(q)] => match system.centre_distance_for_shift_sum(teeth, p.shift + q.shift) {
            Some(t) => (t, t + play_mm.max(0.0)),
            None => return Vec::new(),
        },
        _ => match (
            system.centre_distance_for_shift_sum(teeth, *shift_sum.start()),
            system.centre_distance_for_shift_sum(teeth, *shift_sum.end()),
        ) {
            (Some(a), Some(b)) if a <= b => (a, b),
            _ => return Vec::new(),
        },
    };
    // Widen the sum range by a hair so the ends, found by the inverse formula, are not lost to
    // rounding on the way back.
    let range = (shift_sum.start() - 1e-9)..=(shift_sum.end() + 1e-9);
    let runs = |a: f64| {
        mesh_as_made(system, teeth, made, Some(a), &range, play_mm)
            .is_ok_and(|m| check_mesh(&m, limits).is_empty())
    };
    if hi - lo <= 1e-12 * lo.max(1.0) {
        return if runs(lo) { vec![(lo, hi)] } else { Vec::new() };
    }
    const SAMPLES: usize = 64;
    let at = |k: usize| if k == SAMPLES { hi } else { lo + (hi - lo) * k as f64 / SAMPLES as f64 };
    let tol = 1e-9 * system.module_mm();
    // The boundary between a running `good` and a failing `bad` distance.
    let edge = |mut good: f64, mut bad: f64| {
        while (good - bad).abs() > tol {
            let mid = 0.5 * (good + bad);
            if runs(mid) {
                good = mid;
            } else {
                bad = mid;
            }
        }
        good
    };
    let mut windows = Vec::new();
    let mut start: Option<f64> = None;
    let mut prev = (lo, false);
    for k in 0..=SAMPLES {
        let a = at(k);
        let ok = runs(a);
        match (ok, start) {
            (true, None) => start = Some(if k == 0 { a } else { edge(a, prev.0) }),
            (false, Some(s)) => {
                windows.push((s, edge(prev.0, a)));
                start = None;
            }
            _ => {}
        }
        prev = (a, ok);
    }
    if let Some(s) = start {
        windows.push((s, hi));
    }
    windows
}

/// The intervals common to every list of `windows` (each ascending and disjoint), ascending.
pub fn common_windows(windows: &[Vec<(f64, f64)>]) -> Vec<(f64, f64)> {
    let Some((first, rest)) = windows.split_first() else { return Vec::new() };
    rest.iter().fold(first.clone(), |acc, w| {
        let mut out = Vec::new();
        for &(a0, a1) in &acc {
            for &(b0, b1) in w {
                let (lo, hi) = (a0.max(b0), a1.min(b1));
                if lo <= hi {
                    out.push((lo, hi));
                }
            }
        }
        out
    })
}

/// What is wrong with a pair in which some gears are on hand, as they are, mounted tight at the
/// nearest distance they run at, judged by the default limits (undercut and pointed tips of the
/// gears on hand; contact ratio when both are on hand): reported on every listing, whether or
/// not a search checks meshes. A gear still to be cut could be shifted clear, so nothing of its
/// own is held against the pair. `shift_sum` is the shift sum a gear to cut may take, in modules.
/// Cycloidal teeth take no shift and have no undercut: a pair of them on hand is judged at its
/// standard distance by the default cycloidal limits and a least contact ratio of 1.
pub fn on_hand_defects(
    module_mm: f64,
    pressure_angle_deg: f64,
    teeth: [u32; 2],
    made: Making,
    form: ToothForm,
    shift_sum: &RangeInclusive<f64>,
) -> Vec<MeshDefect> {
    if made.iter().all(Option::is_none) {
        return Vec::new();
    }
    if form == ToothForm::Cycloidal {
        if made.iter().any(Option::is_none) {
            return Vec::new();
        }
        return match cycloidal_mesh(module_mm, teeth, None) {
            Ok(m) => check_cycloidal(&m, &Default::default(), 1.0),
            Err(d) => vec![d],
        };
    }
    let Ok(sys) = ToothSystem::new(module_mm, pressure_angle_deg, Default::default()) else {
        return Vec::new();
    };
    match mesh_as_made(&sys, teeth, made, None, shift_sum, 0.0) {
        Ok(m) => check_mesh(&m, &MeshLimits::default())
            .into_iter()
            .filter(|d| match d {
                MeshDefect::Undercut { gear, .. } | MeshDefect::PointedTip { gear, .. } => {
                    made[gear.index].is_some()
                }
                _ => made.iter().all(Option::is_some),
            })
            .collect(),
        Err(d) => vec![d],
    }
}

#[cfg(test)]
mod tests {
    use super::super::system::RackProfile;
    use super::*;

    fn system(module_mm: f64) -> ToothSystem {
        ToothSystem::new(module_mm, 20.0, RackProfile::default()).unwrap()
    }

    const WIDE: RangeInclusive<f64> = -0.5..=1.0;

    #[test]
    fn gears_on_hand_keep_their_shift_and_undercut_shows() {
        // A 14-tooth pinion cut without shift at 20° is undercut: z_min = 2/sin²20° = 17.1
        // (ISO 21771 relation for x_min; common practice: 17 teeth).
        let s = system(2.0);
        let made = [Some(AsMade::default()), Some(AsMade::default())];
        let m = mesh_as_made(&s, [14, 40], made, None, &WIDE, 0.0).unwrap();
        assert_eq!(m.shift, [0.0, 0.0]);
        assert!(m.undercut[0]);
        assert!((m.centre_distance_mm - 54.0).abs() < 1e-12);
        assert!(check_mesh(&m, &MeshLimits::default())
            .iter()
            .any(|d| matches!(d, MeshDefect::Undercut { .. })));
    }

    #[test]
    fn a_gear_to_cut_takes_the_shift_the_distance_needs() {
        let s = system(1.0);
        let made = [Some(AsMade { shift: 0.2, tip_diameter_mm: None }), None];
        // At the distance their sum 0.5 gives, the gear to cut must carry 0.3.
        let a_w = s.centre_distance_for_shift_sum([20, 30], 0.5).unwrap();
        let m = mesh_as_made(&s, [20, 30], made, Some(a_w), &WIDE, 0.0).unwrap();
        assert!((m.shift[0] - 0.2).abs() < 1e-12);
        assert!((m.shift[1] - 0.3).abs() < 1e-9);
        // The tip on hand is the full tip of its shift; only the gear to cut is shortened.
        assert!((m.tip_diameter_mm[0] - (20.0 + 2.0 * 1.2)).abs() < 1e-12);
        let k = s.tip_shortening([20, 30], 0.5, a_w);
        assert!(k > 0.0);
        assert!((m.tip_diameter_mm[1] - s.tip_diameter_mm(30, 0.3, k)).abs() < 1e-9);
    }

    #[test]
    fn with_no_distance_the_gear_to_cut_balances_the_one_on_hand_unless_it_would_undercut() {
        let s = system(1.0);
        // A 40-tooth wheel on hand with x = -0.1: a 30-tooth pinion to cut takes +0.1.
        let m = mesh_as_made(
            &s,
            [30, 40],
            [None, Some(AsMade { shift: -0.1, tip_diameter_mm: None })],
            None,
            &WIDE,
            0.0,
        )
        .unwrap();
        assert!((m.shift[0] - 0.1).abs() < 1e-12);
        assert!((m.centre_distance_mm - 35.0).abs() < 1e-9);
        // A 12-tooth pinion to cut needs x_min = 1 − 12·sin²20°/2 = 0.298 whatever the wheel.
        let m = mesh_as_made(&s, [12, 40], [None, Some(AsMade::default())], None, &WIDE, 0.0).unwrap();
        assert!((m.shift[0] - s.min_shift(12)).abs() < 1e-12);
        assert!(!m.undercut[0]);
    }

    #[test]
    fn gears_on_hand_meet_a_fixed_distance_only_within_the_play() {
        let s = system(1.0);
        let made = [Some(AsMade::default()), Some(AsMade::default())];
        // Standard gears 20 + 30 at module 1 mesh tight at 25 mm.
        assert!(matches!(
            mesh_as_made(&s, [20, 30], made, Some(24.9), &WIDE, 0.2),
            Err(MeshDefect::WouldJam { .. })
        ));
        assert!(matches!(
            mesh_as_made(&s, [20, 30], made, Some(25.3), &WIDE, 0.2),
            Err(MeshDefect::TooMuchPlay { .. })
        ));
        let m = mesh_as_made(&s, [20, 30], made, Some(25.15), &WIDE, 0.2).unwrap();
        // Pulled apart: backlash opens, working pressure angle rises above 20°.
        assert!(m.backlash_mm > 0.0 && m.working_pressure_angle_deg > 20.0);
        assert_eq!(m.tip_diameter_mm, [22.0, 32.0]);
    }

    #[test]
    fn a_measured_tip_is_used_as_it_is() {
        let s = system(1.0);
        let made = [Some(AsMade { shift: 0.0, tip_diameter_mm: Some(21.6) }), Some(AsMade::default())];
        let m = mesh_as_made(&s, [20, 30], made, None, &WIDE, 0.0).unwrap();
        assert_eq!(m.tip_diameter_mm[0], 21.6);
        // A shorter tip shortens the path of contact.
        let full = mesh_as_made(&s, [20, 30], [Some(AsMade::default()); 2], None, &WIDE, 0.0).unwrap();
        assert!(m.contact_ratio < full.contact_ratio);
    }

    #[test]
    fn the_running_window_holds_every_distance_that_runs_and_no_other() {
        let s = system(0.5);
        let limits = MeshLimits::default();
        for teeth in [[12u32, 36], [10, 40], [8, 64], [17, 19]] {
            let w = running_window(&s, teeth, [None, None], &WIDE, 0.0, &limits);
            let lo = s.centre_distance_for_shift_sum(teeth, -0.5).unwrap();
            let hi = s.centre_distance_for_shift_sum(teeth, 1.0).unwrap();
            // Judge a fine grid independently of the window's own sampling.
            for k in 0..=997 {
                let a = lo + (hi - lo) * k as f64 / 997.0;
                let runs = shift_for_centre_distance(&s, teeth, a, &(-0.5 - 1e-9..=1.0 + 1e-9))
                    .is_ok_and(|m| check_mesh(&m, &limits).is_empty());
                let inside = w.iter().any(|&(p, q)| a >= p - 1e-7 && a <= q + 1e-7);
                let near_edge = w.iter().any(|&(p, q)| (a - p).abs() < 1e-7 || (a - q).abs() < 1e-7);
                assert!(
                    runs == inside || near_edge,
                    "{teeth:?} at {a}: runs {runs}, in window {inside} ({w:?})"
                );
            }
        }
    }

    #[test]
    fn common_windows_intersect() {
        let w = common_windows(&[vec![(1.0, 3.0), (5.0, 8.0)], vec![(2.0, 6.0)], vec![(0.0, 10.0)]]);
        assert_eq!(w, vec![(2.0, 3.0), (5.0, 6.0)]);
        assert!(common_windows(&[vec![(1.0, 2.0)], vec![(3.0, 4.0)]]).is_empty());
    }
}
