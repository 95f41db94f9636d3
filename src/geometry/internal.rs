//! Internal spur meshes: an external pinion (a planet) running inside a ring gear. The ISO 21771
//! relations written out for internal gears, the whole [`InternalMeshGeometry`] of a tight mesh,
//! and [`check_internal_mesh`] with the interferences peculiar to internal meshes.
//!
//! Owns the internal-gear formulas and their defects ([`InternalDefect`]); the tooth system,
//! the involute function and the pinion's own circles are [`super::system`]'s, and the pinion's
//! undercut, pointed tip and a low contact ratio are reported with the plain [`MeshDefect`]
//! variants.
//!
//! # Convention
//!
//! Tooth counts are positive, `teeth = [z1, z2]` with the pinion first and `z2 > z1`. The
//! ring's profile shift `x2` is positive when its profile is moved away from the ring's axis
//! (outwards): that widens its tooth spaces, thins its teeth and enlarges both its tip circle
//! (the inner one) and its root circle. With this sign the relations read
//!
//! - reference diameter `d2 = m·z2`, base diameter `db2 = d2·cos α`;
//! - tip diameter `da2 = d2 − 2m(ha* − x2)`, root diameter `df2 = d2 + 2m(hf* + x2)`;
//! - working pressure angle `inv α_w = inv α + 2·tan α·(x2 − x1)/(z2 − z1)`;
//! - working centre distance `a_w = m(z2 − z1)·cos α / (2·cos α_w)`;
//! - transverse contact ratio
//!   `ε_α = (√(ra1² − rb1²) − √(ra2² − rb2²) + a_w·sin α_w) / (π·m·cos α)`.
//!
//! ISO 21771 reaches the same relations by taking `z2`, `d2` and `a` negative for an internal
//! pair; the sign it gives `x2` should be compared with a copy of the standard before values
//! from the two forms are mixed.
//!
//! A tight internal mesh never needs its tips shortened: the centres move apart by
//! `a_w − a ≤ m(x2 − x1)` (the same inequality as for an external pair's shift sum), so both
//! bottom clearances come out at `c*·m + m(x2 − x1) − (a_w − a) ≥ c*·m`. For the same reason
//! the pinion's tips never reach past the circle `ha*` beyond the ring's datum line, so they
//! are not checked against the ring's root fillet. The ring's tips are checked against the
//! pinion's ([`InternalDefect::BelowFormCircle`]): the ring's tip circle curves towards the
//! pinion's centre where a rack's tip line runs straight, so a full-depth ring reaches lower on
//! a rack-cut pinion than the rack that cut it, and unshifted pairs of the ISO 53 type A
//! profile fail this check by a little. A ring shift some tenths of a module larger than the
//! pinion's, a shortened ring addendum or a tool with a longer straight flank cures it.

use std::f64::consts::PI;

// Through the geometry module's own exports, wherever the defect vocabulary lives.
use super::defect::InternalDefect;
use super::involute::{inv, inv_inverse};
use super::system::{RackProfile, ToothSystem};
use super::{GearRef, MeshDefect, MeshLimits};

/// A pinion counts as undercut when its shift is below the undercut limit by more than this
/// (in modules), as for external meshes.
const UNDERCUT_TOLERANCE: f64 = 1e-9;

/// `sqrt(a² − b²)` as `sqrt((a − b)(a + b))`; `None` unless `a > b ≥ 0`.
fn leg(a: f64, b: f64) -> Option<f64> {
    (a > b && b >= 0.0).then(|| ((a - b) * (a + b)).sqrt())
}

/// `z2 − z1` as a float; positive for a valid internal pair.
fn tooth_difference(teeth: [u32; 2]) -> f64 {
    f64::from(teeth[1]) - f64::from(teeth[0])
}

impl ToothSystem {
    /// Tip diameter of a ring gear, mm: `da2 = d2 − 2m(ha* − x2)` for ring shift `shift`
    /// (x2, in modules, positive outwards). The tip circle is the inner one, smaller than the
    /// reference circle unless `x2 > ha*`.
    pub fn ring_tip_diameter_mm(&self, teeth: u32, shift: f64) -> f64 {
        self.pitch_diameter_mm(teeth) - 2.0 * self.module_mm() * (self.rack().addendum - shift)
    }

    /// Root diameter of a ring gear, mm: `df2 = d2 + 2m(hf* + x2)`, the outer circle.
    pub fn ring_root_diameter_mm(&self, teeth: u32, shift: f64) -> f64 {
        self.pitch_diameter_mm(teeth) + 2.0 * self.module_mm() * (self.rack().dedendum + shift)
    }

    /// Transverse tooth thickness of a ring gear, mm, on the circle of `diameter_mm`:
    /// `s_y = d_y·(π/(2z) − 2x·tan α / z − inv α + inv α_y)` with `cos α_y = db / d_y`. A ring
    /// tooth is a tooth space of an external gear turned inside out, so it thickens outwards
    /// and thins with positive shift.
    ///
    /// `None` when the circle is not outside the base circle or an input is not finite.
    pub fn ring_tooth_thickness_mm(&self, teeth: u32, shift: f64, diameter_mm: f64) -> Option<f64> {
        let cos_y = self.base_diameter_mm(teeth) / diameter_mm;
        if !(cos_y > 0.0 && cos_y < 1.0 && shift.is_finite()) {
            return None;
        }
        let z = f64::from(teeth);
        let half_angle = std::f64::consts::FRAC_PI_2 / z - 2.0 * shift * self.tan_alpha / z;
        Some(diameter_mm * (half_angle - self.inv_alpha + inv(cos_y.acos())))
    }

    /// Standard centre distance of an internal pair `[z1, z2]`, mm: `a = m(z2 − z1)/2`.
    pub fn internal_standard_centre_distance_mm(&self, teeth: [u32; 2]) -> f64 {
        self.module_mm() * tooth_difference(teeth) / 2.0
    }

    /// The centre distance, mm, at which the pinion's base circle touches the ring's from
    /// inside, `a·cos α = rb2 − rb1`. Every working centre distance must be larger.
    pub fn internal_base_circle_distance_mm(&self, teeth: [u32; 2]) -> f64 {
        self.internal_standard_centre_distance_mm(teeth) * self.cos_alpha
    }

    /// Working pressure angle, radians, of an internal pair at working centre distance
    /// `centre_distance_mm`: `cos α_w = a·cos α / a_w`. `None` when `a_w` is not beyond
    /// [`Self::internal_base_circle_distance_mm`] or the pair is not internal (`z2 ≤ z1`).
    pub fn internal_working_pressure_angle_at(
        &self,
        teeth: [u32; 2],
        centre_distance_mm: f64,
    ) -> Option<f64> {
        let cos_w = self.internal_base_circle_distance_mm(teeth) / centre_distance_mm;
        (cos_w > 0.0 && cos_w < 1.0).then(|| cos_w.acos())
    }

    /// The shift difference `x2 − x1`, in modules, that makes an internal pair mesh tight at
    /// `centre_distance_mm`: `x2 − x1 = (inv α_w − inv α)(z2 − z1) / (2·tan α)`. `None` where
    /// [`Self::internal_working_pressure_angle_at`] is.
    pub fn internal_shift_difference_for_centre_distance(
        &self,
        teeth: [u32; 2],
        centre_distance_mm: f64,
    ) -> Option<f64> {
        let alpha_w = self.internal_working_pressure_angle_at(teeth, centre_distance_mm)?;
        Some((inv(alpha_w) - self.inv_alpha) * tooth_difference(teeth) / (2.0 * self.tan_alpha))
    }

    /// Working pressure angle, radians, of an internal pair cut with shift difference
    /// `shift_difference` (x2 − x1, in modules) and mounted tight:
    /// `inv α_w = inv α + 2·tan α·(x2 − x1)/(z2 − z1)`. `None` when that leaves no positive
    /// angle, the difference is not finite, or the pair is not internal.
    pub fn internal_working_pressure_angle_for_shift_difference(
        &self,
        teeth: [u32; 2],
        shift_difference: f64,
    ) -> Option<f64> {
        if teeth[1] <= teeth[0] {
            return None;
        }
        let inv_w = self.inv_alpha + 2.0 * self.tan_alpha * shift_difference / tooth_difference(teeth);
        (inv_w > 0.0 && inv_w.is_finite()).then(|| inv_inverse(inv_w))
    }

    /// Working centre distance, mm, of an internal pair cut with shift difference
    /// `shift_difference` (x2 − x1) and mounted tight:
    /// `a_w = m(z2 − z1)·cos α / (2·cos α_w)`. `None` where the angle is, or when `a_w` is not
    /// finite.
    pub fn internal_centre_distance_for_shift_difference(
        &self,
        teeth: [u32; 2],
        shift_difference: f64,
    ) -> Option<f64> {
        let alpha_w = self.internal_working_pressure_angle_for_shift_difference(teeth, shift_difference)?;
        let a_w = self.internal_base_circle_distance_mm(teeth) / alpha_w.cos();
        a_w.is_finite().then_some(a_w)
    }

    /// The least shift difference `x2 − x1`, in modules, that still leaves a working pressure
    /// angle: `−inv α·(z2 − z1)/(2·tan α)`.
    pub fn least_workable_shift_difference(&self, teeth: [u32; 2]) -> f64 {
        -self.inv_alpha * tooth_difference(teeth) / (2.0 * self.tan_alpha)
    }

    /// Transverse contact ratio of an internal pair with tip diameters `tip_diameter_mm`
    /// (`[da1, da2]`, mm; `da2` the ring's inner tip circle) mounted at `centre_distance_mm`:
    /// `ε_α = (√(ra1² − rb1²) − √(ra2² − rb2²) + a_w·sin α_w) / (π·m·cos α)`.
    ///
    /// Along the line of action the ring's base tangent point comes first, then the pinion's
    /// (`a_w·sin α_w` further on), then the pitch point; contact runs from where the ring's tip
    /// circle crosses the line to where the pinion's does. The value assumes the whole path
    /// lies on involute flanks (see [`InternalMeshGeometry::involute_interference`]). `None`
    /// when a tip circle is not outside its base circle or the centre distance cannot be
    /// reached.
    pub fn internal_contact_ratio(
        &self,
        teeth: [u32; 2],
        tip_diameter_mm: [f64; 2],
        centre_distance_mm: f64,
    ) -> Option<f64> {
        let pinion = leg(tip_diameter_mm[0] / 2.0, self.base_diameter_mm(teeth[0]) / 2.0)?;
        let ring = leg(tip_diameter_mm[1] / 2.0, self.base_diameter_mm(teeth[1]) / 2.0)?;
        let line = leg(centre_distance_mm, self.internal_base_circle_distance_mm(teeth))?;
        Some((pinion - ring + line) / (PI * self.module_mm() * self.cos_alpha))
    }

    /// Trochoid interference clearance of an internal pair, radians on the ring: the angle by
    /// which the ring's tooth tip has already passed the point where the pinion's tip, leaving
    /// the mesh, crosses the ring's tip circle. Negative means the pinion's tip strikes the
    /// ring's tooth tip on the way out (trochoid interference).
    ///
    /// With `ra1`, `ra2` the tip radii, `a_w` the working centre distance and
    /// `α_a1`, `α_a2` the pressure angles at the tips (`cos α_a = rb / ra`):
    /// `δ1 = acos((ra2² − ra1² − a_w²) / (2·a_w·ra1))`,
    /// `δ2 = acos((a_w² + ra2² − ra1²) / (2·a_w·ra2))` (the angles of the crossing point of the
    /// two tip circles seen from the pinion and the ring centre), and the clearance is
    /// `(z1/z2)·(δ1 + inv α_a1 − inv α_w) + inv α_w − inv α_a2 − δ2`: the pinion turns
    /// `δ1 + inv α_a1 − inv α_w` from contact at the pitch point until its tip corner reaches the
    /// crossing point, while the ring turns `z1/z2` of that.
    ///
    /// This is the condition as published, judged where the pinion's tip crosses the ring's tip
    /// circle. Along the whole path out of mesh the tip can pass somewhat closer to the ring's
    /// tooth than it is there, so a design with a clearance near zero deserves a closer look.
    ///
    /// `None` when the tip circles do not cross (then the pinion's tips either never reach the
    /// ring's teeth, or overlap them all round), a tip circle is inside its base circle, or the
    /// centre distance cannot be reached.
    pub fn trochoid_clearance_rad(
        &self,
        teeth: [u32; 2],
        tip_diameter_mm: [f64; 2],
        centre_distance_mm: f64,
    ) -> Option<f64> {
        let (ra1, ra2, a_w) = (tip_diameter_mm[0] / 2.0, tip_diameter_mm[1] / 2.0, centre_distance_mm);
        let alpha_w = self.internal_working_pressure_angle_at(teeth, a_w)?;
        let cos_a1 = self.base_diameter_mm(teeth[0]) / tip_diameter_mm[0];
        let cos_a2 = self.base_diameter_mm(teeth[1]) / tip_diameter_mm[1];
        if !(cos_a1 > 0.0 && cos_a1 < 1.0 && cos_a2 > 0.0 && cos_a2 < 1.0) {
            return None;
        }
        let cos_d1 = (ra2 * ra2 - ra1 * ra1 - a_w * a_w) / (2.0 * a_w * ra1);
        let cos_d2 = (a_w * a_w + ra2 * ra2 - ra1 * ra1) / (2.0 * a_w * ra2);
        if !(cos_d1.abs() <= 1.0 && cos_d2.abs() <= 1.0) {
            return None;
        }
        let inv_w = inv(alpha_w);
        let theta1 = cos_d1.acos() + inv(cos_a1.acos()) - inv_w;
        let ratio = f64::from(teeth[0]) / f64::from(teeth[1]);
        Some(theta1 * ratio + inv_w - inv(cos_a2.acos()) - cos_d2.acos())
    }
}

/// How an internal pair is cut and mounted. Both forms mesh tight (no backlash from nominal
/// geometry).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum InternalMounting {
    /// Pinion and ring cut with shifts `[x1, x2]` (in modules); the centre distance follows
    /// from the shift difference.
    Shifted {
        /// Profile shifts `[x1, x2]`, in modules (`x2` positive outwards).
        shift: [f64; 2],
    },
    /// A pinion of shift `pinion_shift` at working centre distance `centre_distance_mm` (mm):
    /// the ring's shift is whatever makes the pair tight there. This is how a planet meets its
    /// ring once the carrier's centre distance is set by the sun.
    PinionShiftAtCentreDistance {
        /// The pinion's profile shift `x1`, in modules.
        pinion_shift: f64,
        /// Tip shortening `k` the pinion was cut with for another mesh it makes (a planet's
        /// with the sun), in modules; zero when none. The internal mesh itself never needs it.
        pinion_tip_shortening: f64,
        /// Working centre distance, mm.
        centre_distance_mm: f64,
    },
}

/// The worked-out geometry of one tight internal spur mesh. Index 0 of every pair of values is
/// the pinion, index 1 the ring. Lengths in mm, angles in degrees, shifts in modules.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct InternalMeshGeometry {
    /// Module, mm.
    pub module_mm: f64,
    /// Pressure angle of the basic rack, degrees.
    pub pressure_angle_deg: f64,
    /// Basic rack profile both gears are cut to.
    pub rack: RackProfile,
    /// Tooth counts `[z1, z2]`, pinion then ring.
    pub teeth: [u32; 2],
    /// Profile shifts `[x1, x2]`, in modules (the ring's positive outwards).
    pub shift: [f64; 2],
    /// Tip shortening `k` of the pinion, in modules, as it was cut for another mesh (zero when
    /// none).
    pub pinion_tip_shortening: f64,
    /// Standard centre distance `a = m(z2 − z1)/2`, mm.
    pub standard_centre_distance_mm: f64,
    /// Working centre distance `a_w`, mm.
    pub centre_distance_mm: f64,
    /// Working pressure angle `α_w`, degrees.
    pub working_pressure_angle_deg: f64,
    /// Reference diameters `d = m·z`, mm.
    pub pitch_diameter_mm: [f64; 2],
    /// Working pitch diameters `d_w = 2a_w·z / (z2 − z1)`, mm: the circles that roll on each
    /// other.
    pub working_pitch_diameter_mm: [f64; 2],
    /// Base circle diameters `db = d·cos α`, mm.
    pub base_diameter_mm: [f64; 2],
    /// Tip diameters, mm: the pinion's `d1 + 2m(ha* + x1 − k)`, the ring's (inner)
    /// `d2 − 2m(ha* − x2)`.
    pub tip_diameter_mm: [f64; 2],
    /// Root diameters, mm: the pinion's `d1 − 2m(hf* − x1)`, the ring's (outer)
    /// `d2 + 2m(hf* + x2)`.
    pub root_diameter_mm: [f64; 2],
    /// Where the pinion's involute begins, mm (root form diameter): the circle through the
    /// point where the generating rack's straight flank ends on the line of generation, never
    /// below the base circle. The flank is taken to end `hf* − ρf*·(1 − sin α)` modules from
    /// the datum line, where the root fillet of the basic rack begins (0.99997 for ISO 53 type
    /// A at 20°). For an undercut pinion the undercut starts the involute higher still; that is
    /// reported as undercut, not here.
    pub pinion_form_diameter_mm: f64,
    /// Where contact begins on the pinion, mm: the distance from the pinion's centre, doubled,
    /// of the point where the ring's tip circle crosses the line of action.
    pub pinion_active_diameter_mm: f64,
    /// Least pinion shift without undercut, `ha* − z1·sin²α/2`, in modules.
    pub pinion_min_shift: f64,
    /// Whether the rack undercuts the pinion (shift below the limit by more than 10⁻⁹).
    pub pinion_undercut: bool,
    /// Transverse tooth thickness on the tip circles, mm; negative when the flanks cross first.
    pub tip_thickness_mm: [f64; 2],
    /// The same as multiples of the module.
    pub tip_thickness_modules: [f64; 2],
    /// Transverse contact ratio `ε_α` (see [`ToothSystem::internal_contact_ratio`]).
    pub contact_ratio: f64,
    /// Involute interference: the ring's tip circle crosses the line of action before the
    /// pinion's base tangent point, `√(ra2² − rb2²) < a_w·sin α_w`, so the ring's tips would
    /// meet the pinion below its base circle.
    pub involute_interference: bool,
    /// Trochoid clearance, radians (see [`ToothSystem::trochoid_clearance_rad`]); `None` when
    /// the tip circles do not cross.
    pub trochoid_clearance_rad: Option<f64>,
    /// `[pinion tip to ring root, ring tip to pinion root]`, mm, on the line of centres:
    /// `rf2 − a_w − ra1` and `ra2 − a_w − rf1`; never below `c*·m` for a tight mesh.
    pub bottom_clearance_mm: [f64; 2],
}

impl InternalMeshGeometry {
    /// Shift difference `x2 − x1`, in modules.
    pub fn shift_difference(&self) -> f64 {
        self.shift[1] - self.shift[0]
    }
}

/// Height of the generating rack's straight flank beyond its datum line, in modules: its
/// dedendum less what the root fillet of radius `ρf*` takes, `hf* − ρf*·(1 − sin α)`.
fn straight_flank_height(system: &ToothSystem) -> f64 {
    let rack = system.rack();
    rack.dedendum - rack.root_radius * (1.0 - system.sin_alpha)
}

fn internal(defect: InternalDefect) -> MeshDefect {
    MeshDefect::Internal(defect)
}

/// Works out the tight internal mesh of a pinion and ring with `teeth` `[z1, z2]` cut to
/// `system`, made and mounted as `mounting` says.
///
/// Errors: [`MeshDefect::InvalidInput`] for a gear without teeth, a shift or centre distance
/// that is not a usable number; [`InternalDefect::NotInternal`] unless `z2 > z1`;
/// [`InternalDefect::ShiftDifferenceTooNegative`]; [`MeshDefect::CentreDistanceUnreachable`]
/// when the centre distance is not beyond where the base circles touch;
/// [`MeshDefect::NoInvoluteAtTip`] for the pinion and [`InternalDefect::RingTipInsideBase`] for
/// the ring when a tip circle falls inside its base circle. Whether the mesh would run is judged
/// by [`check_internal_mesh`].
pub fn internal_mesh_geometry(
    system: &ToothSystem,
    teeth: [u32; 2],
    mounting: InternalMounting,
) -> Result<InternalMeshGeometry, MeshDefect> {
    if teeth[0] == 0 {
        return Err(MeshDefect::InvalidInput { what: "a gear must have at least one tooth", value: 0.0 });
    }
    if teeth[1] <= teeth[0] {
        return Err(internal(InternalDefect::NotInternal { pinion: teeth[0], ring: teeth[1] }));
    }
    let finite_shift = |x: f64| {
        if x.is_finite() {
            Ok(x)
        } else {
            Err(MeshDefect::InvalidInput {
                what: "a profile shift must be a finite number of modules",
                value: x,
            })
        }
    };
    let (shift, k, a_w) = match mounting {
        InternalMounting::Shifted { shift } => {
            let shift = [finite_shift(shift[0])?, finite_shift(shift[1])?];
            let difference = shift[1] - shift[0];
            let a_w = system
                .internal_working_pressure_angle_for_shift_difference(teeth, difference)
                .ok_or_else(|| {
                    internal(InternalDefect::ShiftDifferenceTooNegative {
                        shift_difference: difference,
                        min: system.least_workable_shift_difference(teeth),
                    })
                })
                .map(|alpha_w| system.internal_base_circle_distance_mm(teeth) / alpha_w.cos())?;
            if !a_w.is_finite() {
                return Err(MeshDefect::InvalidInput {
                    what: "the ring's shift exceeds the pinion's by too much for any centre distance",
                    value: difference,
                });
            }
            (shift, 0.0, a_w)
        }
        InternalMounting::PinionShiftAtCentreDistance {
            pinion_shift,
            pinion_tip_shortening,
            centre_distance_mm,
        } => {
            let x1 = finite_shift(pinion_shift)?;
            if !(pinion_tip_shortening.is_finite() && pinion_tip_shortening >= 0.0) {
                return Err(MeshDefect::InvalidInput {
                    what: "the tip shortening must be a number of modules, zero or more",
                    value: pinion_tip_shortening,
                });
            }
            if !(centre_distance_mm.is_finite() && centre_distance_mm > 0.0) {
                return Err(MeshDefect::InvalidInput {
                    what: "the centre distance must be a positive number of millimetres",
                    value: centre_distance_mm,
                });
            }
            let difference = system
                .internal_shift_difference_for_centre_distance(teeth, centre_distance_mm)
                .ok_or(MeshDefect::CentreDistanceUnreachable {
                    centre_distance_mm,
                    min_mm: system.internal_base_circle_distance_mm(teeth),
                })?;
            ([x1, x1 + difference], pinion_tip_shortening, centre_distance_mm)
        }
    };
    assemble(system, teeth, shift, k, a_w)
}

/// Puts together the geometry of a tight internal pair whose shifts, pinion tip shortening and
/// centre distance are settled.
fn assemble(
    system: &ToothSystem,
    teeth: [u32; 2],
    shift: [f64; 2],
    pinion_tip_shortening: f64,
    a_w: f64,
) -> Result<InternalMeshGeometry, MeshDefect> {
    let unreachable = MeshDefect::CentreDistanceUnreachable {
        centre_distance_mm: a_w,
        min_mm: system.internal_base_circle_distance_mm(teeth),
    };
    let alpha_w = system.internal_working_pressure_angle_at(teeth, a_w).ok_or(unreachable)?;
    let m = system.module_mm();
    let tip = [
        system.tip_diameter_mm(teeth[0], shift[0], pinion_tip_shortening),
        system.ring_tip_diameter_mm(teeth[1], shift[1]),
    ];
    let root =
        [system.root_diameter_mm(teeth[0], shift[0]), system.ring_root_diameter_mm(teeth[1], shift[1])];
    let base = [system.base_diameter_mm(teeth[0]), system.base_diameter_mm(teeth[1])];
    let pinion_tip_thickness = system
        .tooth_thickness_mm(teeth[0], shift[0], tip[0])
        .ok_or(MeshDefect::NoInvoluteAtTip { gear: GearRef::of(teeth, 0) })?;
    let ring_reach = leg(tip[1] / 2.0, base[1] / 2.0).ok_or(internal(InternalDefect::RingTipInsideBase {
        ring: teeth[1],
        tip_diameter_mm: tip[1],
        base_diameter_mm: base[1],
    }))?;
    let ring_tip_thickness = system.ring_tooth_thickness_mm(teeth[1], shift[1], tip[1]).ok_or(internal(
        InternalDefect::RingTipInsideBase {
            ring: teeth[1],
            tip_diameter_mm: tip[1],
            base_diameter_mm: base[1],
        },
    ))?;
    let contact_ratio = system.internal_contact_ratio(teeth, tip, a_w).ok_or(unreachable)?;
    // Roll lengths along the line of action from the pinion's base tangent point.
    let line = a_w * alpha_w.sin();
    let contact_start = ring_reach - line;
    let rb1 = base[0] / 2.0;
    let sin_a = system.sin_alpha;
    let form_roll = (system.pitch_diameter_mm(teeth[0]) / 2.0 * sin_a
        - (straight_flank_height(system) - shift[0]) * m / sin_a)
        .max(0.0);
    let min_shift = system.min_shift(teeth[0]);
    let dw_per_tooth = 2.0 * a_w / tooth_difference(teeth);
    Ok(InternalMeshGeometry {
        module_mm: m,
        pressure_angle_deg: system.pressure_angle_deg(),
        rack: system.rack(),
        teeth,
        shift,
        pinion_tip_shortening,
        standard_centre_distance_mm: system.internal_standard_centre_distance_mm(teeth),
        centre_distance_mm: a_w,
        working_pressure_angle_deg: alpha_w.to_degrees(),
        pitch_diameter_mm: [system.pitch_diameter_mm(teeth[0]), system.pitch_diameter_mm(teeth[1])],
        working_pitch_diameter_mm: [dw_per_tooth * f64::from(teeth[0]), dw_per_tooth * f64::from(teeth[1])],
        base_diameter_mm: base,
        tip_diameter_mm: tip,
        root_diameter_mm: root,
        pinion_form_diameter_mm: 2.0 * rb1.hypot(form_roll),
        pinion_active_diameter_mm: 2.0 * rb1.hypot(contact_start),
        pinion_min_shift: min_shift,
        pinion_undercut: shift[0] < min_shift - UNDERCUT_TOLERANCE,
        tip_thickness_mm: [pinion_tip_thickness, ring_tip_thickness],
        tip_thickness_modules: [pinion_tip_thickness / m, ring_tip_thickness / m],
        contact_ratio,
        involute_interference: contact_start < 0.0,
        trochoid_clearance_rad: system.trochoid_clearance_rad(teeth, tip, a_w),
        bottom_clearance_mm: [root[1] / 2.0 - a_w - tip[0] / 2.0, tip[1] / 2.0 - a_w - root[0] / 2.0],
    })
}

/// Every reason the internal mesh `mesh` would not run within `limits`, in a fixed order:
/// pinion undercut and pointed tip, ring pointed tip, involute interference (or contact below
/// the pinion's form circle), trochoid interference (or tip circles overlapping all round),
/// contact ratio. Empty when it runs.
///
/// The ring's tip circle outside its base circle is already required to build the geometry
/// ([`InternalDefect::RingTipInsideBase`] from [`internal_mesh_geometry`]).
pub fn check_internal_mesh(mesh: &InternalMeshGeometry, limits: &MeshLimits) -> Vec<MeshDefect> {
    let mut defects = Vec::new();
    let [pinion, ring] = mesh.teeth;
    let min_tip_mm = limits.min_tip_thickness_modules * mesh.module_mm;
    if mesh.pinion_undercut && !limits.allow_undercut {
        defects.push(MeshDefect::Undercut {
            gear: GearRef::of(mesh.teeth, 0),
            shift: mesh.shift[0],
            min_shift: mesh.pinion_min_shift,
        });
    }
    if mesh.tip_thickness_mm[0] < min_tip_mm {
        defects.push(MeshDefect::PointedTip {
            gear: GearRef::of(mesh.teeth, 0),
            thickness_mm: mesh.tip_thickness_mm[0],
            min_mm: min_tip_mm,
        });
    }
    if mesh.tip_thickness_mm[1] < min_tip_mm {
        defects.push(internal(InternalDefect::RingPointedTip {
            ring,
            thickness_mm: mesh.tip_thickness_mm[1],
            min_mm: min_tip_mm,
        }));
    }
    if mesh.involute_interference {
        defects.push(internal(InternalDefect::InvoluteInterference { pinion, ring }));
    } else if mesh.pinion_active_diameter_mm < mesh.pinion_form_diameter_mm {
        defects.push(internal(InternalDefect::BelowFormCircle {
            pinion,
            active_diameter_mm: mesh.pinion_active_diameter_mm,
            form_diameter_mm: mesh.pinion_form_diameter_mm,
        }));
    }
    match mesh.trochoid_clearance_rad {
        Some(clearance_rad) if clearance_rad < 0.0 => {
            defects.push(internal(InternalDefect::TrochoidInterference { pinion, ring, clearance_rad }));
        }
        Some(_) => {}
        None => {
            // The circles miss each other: either the pinion's tip circle stays inside the
            // ring's (no contact at all, which the contact ratio reports) or it encloses it.
            if mesh.tip_diameter_mm[0] / 2.0 >= mesh.centre_distance_mm + mesh.tip_diameter_mm[1] / 2.0 {
                defects.push(internal(InternalDefect::TipCirclesOverlapAllRound { pinion, ring }));
            }
        }
    }
    defects.extend(super::check::contact_ratio_defect(mesh.contact_ratio, limits));
    defects
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn system(module_mm: f64, deg: f64) -> ToothSystem {
        ToothSystem::new(module_mm, deg, RackProfile::default()).unwrap()
    }

    fn shifted(s: &ToothSystem, teeth: [u32; 2], shift: [f64; 2]) -> InternalMeshGeometry {
        internal_mesh_geometry(s, teeth, InternalMounting::Shifted { shift }).unwrap()
    }

    /// `tan α − α` written out, without the library's series.
    fn plain_inv(a: f64) -> f64 {
        a.tan() - a
    }

    /// The angle with `tan α − α = v`, by bisection on the plain form.
    fn plain_inv_inverse(v: f64) -> f64 {
        let (mut lo, mut hi) = (0.0f64, 1.5f64);
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if plain_inv(mid) < v {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        0.5 * (lo + hi)
    }

    const CASES: [([u32; 2], [f64; 2]); 6] = [
        ([20, 80], [0.0, 0.0]),
        ([18, 57], [0.3, 0.5]),
        ([25, 38], [0.0, 0.2]),
        ([30, 64], [0.2, -0.1]),
        ([13, 61], [0.45, 0.45]),
        ([41, 97], [-0.2, 0.35]),
    ];

    #[test]
    fn ring_circles_follow_the_internal_relations() {
        // ISO 21771 relations for an internal gear written with positive tooth counts:
        // d2 = m·z2, da2 = d2 − 2m(ha* − x2), df2 = d2 + 2m(hf* + x2).
        let s = system(2.5, 20.0);
        for (z, x) in [(80u32, 0.0), (57, 0.5), (64, -0.1)] {
            let d = 2.5 * f64::from(z);
            assert!((s.ring_tip_diameter_mm(z, x) - (d - 2.0 * 2.5 * (1.0 - x))).abs() < 1e-9);
            assert!((s.ring_root_diameter_mm(z, x) - (d + 2.0 * 2.5 * (1.25 + x))).abs() < 1e-9);
            assert!(s.ring_tip_diameter_mm(z, x) < d || x > 1.0);
        }
        // Common practice: an unshifted ring of module 2 and 80 teeth has a 156 mm tip circle
        // and a 165 mm root circle (d = 160 mm, addendum 1 m, dedendum 1.25 m).
        let s = system(2.0, 20.0);
        assert_eq!(s.ring_tip_diameter_mm(80, 0.0), 156.0);
        assert_eq!(s.ring_root_diameter_mm(80, 0.0), 165.0);
        assert_eq!(s.internal_standard_centre_distance_mm([20, 80]), 60.0);
    }

    #[test]
    fn working_pressure_angle_and_centre_distance_match_the_relations() {
        // inv α_w = inv α + 2·tan α·(x2 − x1)/(z2 − z1); a_w = m(z2 − z1)·cos α / (2·cos α_w),
        // recomputed with the plain involute and a bisection.
        for deg in [14.5, 20.0, 25.0] {
            let s = system(3.0, deg);
            let alpha = f64::to_radians(deg);
            for (teeth, x) in CASES {
                let (dz, dx) = (f64::from(teeth[1] - teeth[0]), x[1] - x[0]);
                let want_w = plain_inv_inverse(plain_inv(alpha) + 2.0 * alpha.tan() * dx / dz);
                let want_a = 3.0 * dz * alpha.cos() / (2.0 * want_w.cos());
                let got_w = s.internal_working_pressure_angle_for_shift_difference(teeth, dx).unwrap();
                let got_a = s.internal_centre_distance_for_shift_difference(teeth, dx).unwrap();
                assert!((got_w - want_w).abs() < 1e-9, "{deg} {teeth:?} {x:?}");
                assert!((got_a - want_a).abs() < 1e-9, "{deg} {teeth:?} {x:?}");
                // And back from the centre distance to the shift difference.
                let back = s.internal_shift_difference_for_centre_distance(teeth, want_a).unwrap();
                assert!((back - dx).abs() < 1e-9);
                // The whole mesh where the ring clears its base circle (at 14.5° few do).
                let Ok(g) = internal_mesh_geometry(&s, teeth, InternalMounting::Shifted { shift: x }) else {
                    assert!(deg < 15.0, "{deg} {teeth:?}");
                    continue;
                };
                assert!((g.working_pressure_angle_deg.to_radians() - want_w).abs() < 1e-9);
                assert!((g.centre_distance_mm - want_a).abs() < 1e-9);
                // Working pitch circles: d_w2 − d_w1 = 2a_w, in the ratio of the teeth.
                let dw = g.working_pitch_diameter_mm;
                assert!((dw[1] - dw[0] - 2.0 * want_a).abs() < 1e-9);
                assert!((dw[1] / dw[0] - f64::from(teeth[1]) / f64::from(teeth[0])).abs() < 1e-12);
            }
        }
    }

    #[test]
    fn tight_mesh_fills_the_ring_space_with_the_pinion_tooth() {
        // Independent route to the working pressure angle: on the working pitch circles the
        // pinion's tooth is exactly as thick as the ring's space is wide.
        let s = system(2.0, 20.0);
        for (teeth, x) in CASES {
            let g = shifted(&s, teeth, x);
            let dw = g.working_pitch_diameter_mm;
            let pinion = s.tooth_thickness_mm(teeth[0], x[0], dw[0]).unwrap();
            let ring = s.ring_tooth_thickness_mm(teeth[1], x[1], dw[1]).unwrap();
            let space = std::f64::consts::PI * dw[1] / f64::from(teeth[1]) - ring;
            assert!((pinion - space).abs() < 1e-9, "{teeth:?} {x:?}: {pinion} vs {space}");
        }
    }

    #[test]
    fn ring_tooth_on_the_reference_circle() {
        // With x2 positive outwards the ring tooth on its reference circle is m(π/2 − 2·x2·tan α).
        let s = system(2.0, 20.0);
        for x in [-0.3, 0.0, 0.4] {
            let got = s.ring_tooth_thickness_mm(60, x, 120.0).unwrap();
            let want = 2.0 * (std::f64::consts::FRAC_PI_2 - 2.0 * x * 20f64.to_radians().tan());
            assert!((got - want).abs() < 1e-12);
        }
        assert_eq!(s.ring_tooth_thickness_mm(60, 0.0, 0.9 * s.base_diameter_mm(60)), None);
    }

    /// Where a circle of radius `r` about `centre` crosses the line `p + t·u` (|u| = 1), as the
    /// two values of `t`.
    fn crossings(centre: (f64, f64), r: f64, p: (f64, f64), u: (f64, f64)) -> (f64, f64) {
        let (dx, dy) = (p.0 - centre.0, p.1 - centre.1);
        let b = dx * u.0 + dy * u.1;
        let c = dx * dx + dy * dy - r * r;
        let root = (b * b - c).sqrt();
        (-b - root, -b + root)
    }

    #[test]
    fn contact_ratio_from_coordinates() {
        // Independent route: lay the ring centre at the origin and the pinion's at (a_w, 0),
        // draw the line of action through the pitch point at α_w, cut it with both tip circles
        // and divide the length of contact by the base pitch π·m·cos α.
        let s = system(1.5, 20.0);
        for (teeth, x) in CASES {
            let g = shifted(&s, teeth, x);
            let a_w = g.centre_distance_mm;
            let alpha_w = g.working_pressure_angle_deg.to_radians();
            let pitch_point = (g.working_pitch_diameter_mm[1] / 2.0, 0.0);
            let u = (alpha_w.sin(), alpha_w.cos());
            let ring_tip = crossings((0.0, 0.0), g.tip_diameter_mm[1] / 2.0, pitch_point, u);
            let pinion_tip = crossings((a_w, 0.0), g.tip_diameter_mm[0] / 2.0, pitch_point, u);
            // Both base tangent points lie behind the pitch point (negative t); contact runs
            // from the ring's tip circle to the pinion's, each the crossing further along.
            let length = pinion_tip.1 - ring_tip.1;
            let want = length / (std::f64::consts::PI * 1.5 * 20f64.to_radians().cos());
            assert!((g.contact_ratio - want).abs() < 1e-9, "{teeth:?} {x:?}: {} vs {want}", g.contact_ratio);
        }
    }

    #[test]
    fn involute_interference_matches_the_published_condition() {
        // The condition in the form it is usually printed (from memory): no involute interference when
        // z1/z2 ≥ 1 − tan α_a2 / tan α_w, with cos α_a2 = db2/da2.
        let s = system(1.0, 20.0);
        let mut seen = [false, false];
        for z1 in [12u32, 15, 18, 20, 25, 30] {
            for z2 in (z1 + 3)..(z1 + 60) {
                for x in [[0.0, 0.0], [0.4, 0.4], [0.0, 0.6]] {
                    let Ok(g) = internal_mesh_geometry(&s, [z1, z2], InternalMounting::Shifted { shift: x })
                    else {
                        continue;
                    };
                    let alpha_a2 = (g.base_diameter_mm[1] / g.tip_diameter_mm[1]).acos();
                    let alpha_w = g.working_pressure_angle_deg.to_radians();
                    let published = f64::from(z1) / f64::from(z2) < 1.0 - alpha_a2.tan() / alpha_w.tan();
                    assert_eq!(g.involute_interference, published, "{z1}/{z2} {x:?}");
                    seen[usize::from(published)] = true;
                }
            }
        }
        assert_eq!(seen, [true, true], "both outcomes occur in the sweep");
    }

    #[test]
    fn ring_tip_must_clear_its_base_circle() {
        // Computed from da2 > db2 with ha* = 1 at 20°: an unshifted ring needs
        // z2 > 2/(1 − cos 20°) = 33.16, so 34 teeth; a positive ring shift lowers the limit.
        let s = system(1.0, 20.0);
        assert!((2.0 / (1.0 - 20f64.to_radians().cos()) - 33.16).abs() < 0.005);
        match internal_mesh_geometry(&s, [15, 33], InternalMounting::Shifted { shift: [0.0, 0.0] }) {
            Err(MeshDefect::Internal(InternalDefect::RingTipInsideBase { ring: 33, .. })) => {}
            other => panic!("{other:?}"),
        }
        assert!(internal_mesh_geometry(&s, [15, 34], InternalMounting::Shifted { shift: [0.0, 0.0] }).is_ok());
        assert!(internal_mesh_geometry(&s, [15, 33], InternalMounting::Shifted { shift: [0.0, 0.1] }).is_ok());
    }

    /// Trochoid clearance by following the teeth: place the pinion's leading tooth and the
    /// ring's tooth from their tooth thicknesses so that they touch at the pitch point, turn
    /// both gears at the tooth ratio, find by bisection where the pinion's tip corner leaves the
    /// ring's tip circle, and measure how far the ring's tooth corner is ahead of it there.
    fn simulated_trochoid_clearance(s: &ToothSystem, g: &InternalMeshGeometry) -> f64 {
        let [z1, z2] = g.teeth;
        let (a, ra1, ra2) = (g.centre_distance_mm, g.tip_diameter_mm[0] / 2.0, g.tip_diameter_mm[1] / 2.0);
        let (rw1, rw2) = (g.working_pitch_diameter_mm[0] / 2.0, g.working_pitch_diameter_mm[1] / 2.0);
        let pinion_centre = -s.tooth_thickness_mm(z1, g.shift[0], 2.0 * rw1).unwrap() / (2.0 * rw1);
        let pinion_corner =
            pinion_centre + s.tooth_thickness_mm(z1, g.shift[0], 2.0 * ra1).unwrap() / (2.0 * ra1);
        let ring_centre = s.ring_tooth_thickness_mm(z2, g.shift[1], 2.0 * rw2).unwrap() / (2.0 * rw2);
        let ring_corner =
            ring_centre - s.ring_tooth_thickness_mm(z2, g.shift[1], 2.0 * ra2).unwrap() / (2.0 * ra2);
        // The pinion's tip corner in the ring's frame after the ring turned `phi`.
        let corner = |phi: f64| {
            let turn = pinion_corner + phi * f64::from(z2) / f64::from(z1);
            let (x, y) = (a + ra1 * turn.cos(), ra1 * turn.sin());
            let (c, s) = (phi.cos(), phi.sin());
            (x * c + y * s, -x * s + y * c)
        };
        let radius = |phi: f64| corner(phi).0.hypot(corner(phi).1);
        let step = 1e-4;
        let mut phi = 0.0;
        let mut deep = false;
        loop {
            if radius(phi) > ra2 {
                deep = true;
            } else if deep {
                break;
            }
            phi += step;
            assert!(phi < 4.0, "the tip of {:?} never left the ring", g.teeth);
        }
        let (mut lo, mut hi) = (phi - step, phi);
        for _ in 0..100 {
            let mid = 0.5 * (lo + hi);
            if radius(mid) > ra2 {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        let (x, y) = corner(lo);
        ring_corner - y.atan2(x)
    }

    #[test]
    fn trochoid_clearance_matches_the_tooth_by_tooth_simulation() {
        let s = system(1.0, 20.0);
        let mut signs = [false, false];
        for (teeth, x) in [
            ([30, 39], [0.0, 0.0]),
            ([30, 36], [0.0, 0.0]),
            ([40, 48], [0.0, 0.0]),
            ([20, 40], [0.3, 0.5]),
            ([25, 35], [0.0, 0.2]),
            ([60, 66], [0.0, 0.0]),
            ([50, 58], [0.1, 0.6]),
        ] {
            let g = shifted(&s, teeth, x);
            let formula = g.trochoid_clearance_rad.unwrap();
            let simulated = simulated_trochoid_clearance(&s, &g);
            assert!((formula - simulated).abs() < 1e-9, "{teeth:?} {x:?}: {formula} vs {simulated}");
            signs[usize::from(formula < 0.0)] = true;
        }
        assert_eq!(signs, [true, true], "clear and interfering cases both checked");
    }

    #[test]
    fn least_tooth_difference_comes_out_of_the_trochoid_condition() {
        // No rule on z2 − z1 is coded; scanning the condition for unshifted 20° gears gives the
        // least difference. From memory, common practice asks for about 8 to 12 teeth more on
        // the ring than on the pinion with full-depth 20° teeth and no shift; the condition
        // alone (without the margin practice adds) should land at the low end of that.
        let s = system(1.0, 20.0);
        for z1 in [30u32, 45, 60, 100, 150] {
            let least = (1u32..40)
                .find(|&d| {
                    internal_mesh_geometry(&s, [z1, z1 + d], InternalMounting::Shifted { shift: [0.0, 0.0] })
                        .is_ok_and(|g| g.trochoid_clearance_rad.is_some_and(|c| c >= 0.0))
                })
                .unwrap();
            assert!((8..=10).contains(&least), "z1 {z1}: {least}");
        }
        // A positive ring shift (larger ring tip circle) lets a smaller difference pass.
        let plain = shifted(&s, [60, 66], [0.0, 0.0]);
        let eased = shifted(&s, [60, 66], [0.0, 0.8]);
        assert!(plain.trochoid_clearance_rad.unwrap() < 0.0);
        assert!(eased.trochoid_clearance_rad.unwrap() > plain.trochoid_clearance_rad.unwrap());
    }

    #[test]
    fn checks_name_internal_defects() {
        let s = system(1.0, 20.0);
        let limits = MeshLimits::default();
        // Good: 20 in 80 with the ring shifted half a module more than the pinion.
        let good = shifted(&s, [20, 80], [0.0, 0.5]);
        assert_eq!(check_internal_mesh(&good, &limits), vec![]);
        // Small difference: trochoid interference, named with its shortfall.
        let close = shifted(&s, [60, 66], [0.0, 0.0]);
        let defects = check_internal_mesh(&close, &limits);
        let trochoid = defects
            .iter()
            .find(|d| {
                matches!(
                    d,
                    MeshDefect::Internal(InternalDefect::TrochoidInterference { pinion: 60, ring: 66, .. })
                )
            })
            .unwrap_or_else(|| panic!("{defects:?}"));
        assert!(trochoid.to_string().starts_with(
            "leaving the mesh, the tips of the 60-tooth pinion would strike the tips of the 66-tooth ring"
        ));
        // A small pinion in a ring just past its base-circle limit: the ring's tips meet the
        // pinion below its base circle, and the pinion is undercut.
        let deep = shifted(&s, [12, 36], [0.0, 0.0]);
        assert!(deep.involute_interference);
        let defects = check_internal_mesh(&deep, &limits);
        assert!(defects
            .contains(&MeshDefect::Internal(InternalDefect::InvoluteInterference { pinion: 12, ring: 36 })));
        assert!(matches!(defects[0], MeshDefect::Undercut { .. }));
        assert_eq!(
            MeshDefect::Internal(InternalDefect::InvoluteInterference { pinion: 12, ring: 36 }).to_string(),
            "the tips of the 36-tooth ring would dig into the flanks of the 12-tooth pinion below its base \
             circle (involute interference)"
        );
        // One tooth apart, the pinion's tip circle reaches past the ring's all round.
        let tight = shifted(&s, [40, 41], [0.0, 0.0]);
        assert!(check_internal_mesh(&tight, &limits).contains(&MeshDefect::Internal(
            InternalDefect::TipCirclesOverlapAllRound { pinion: 40, ring: 41 }
        )));
        // A ring tooth is thinnest at its tip when the tip circle is the reference circle
        // (x2 = ha*), where it is m(π/2 − 2·ha*·tan α): 0.84 m for the ISO rack at 20°, but
        // only 0.13 m for a long addendum of 1.25 m at 30°.
        let long = RackProfile { addendum: 1.25, dedendum: 1.5, root_radius: 0.3 };
        let s30 = ToothSystem::new(1.0, 30.0, long).unwrap();
        let thin = shifted(&s30, [20, 80], [0.0, 1.25]);
        let want = std::f64::consts::FRAC_PI_2 - 2.5 * 30f64.to_radians().tan();
        assert!((thin.tip_thickness_mm[1] - want).abs() < 1e-9);
        assert!(check_internal_mesh(&thin, &limits).contains(&MeshDefect::Internal(
            InternalDefect::RingPointedTip { ring: 80, thickness_mm: thin.tip_thickness_mm[1], min_mm: 0.25 }
        )));
        let iso = shifted(&s, [20, 80], [0.0, 1.0]);
        assert!(
            (iso.tip_thickness_modules[1] - (std::f64::consts::FRAC_PI_2 - 2.0 * 20f64.to_radians().tan()))
                .abs()
                < 1e-9
        );
    }

    #[test]
    fn a_full_depth_ring_reaches_below_the_form_circle_of_a_rack_cut_pinion() {
        // Independent route: the rack that cut the pinion has its straight flank end
        // hf* − ρf*(1 − sin α) beyond its datum line, which lies x1·m outside the pinion's
        // reference circle; where that line crosses the line of generation (through the pitch
        // point at α) is where the pinion's involute begins. Where the ring's tip circle crosses
        // the line of action is where contact begins.
        let s = system(1.0, 20.0);
        let alpha = 20f64.to_radians();
        let flank = 1.25 - 0.38 * (1.0 - alpha.sin());
        for (teeth, x) in [
            ([20u32, 80u32], [0.0, 0.0]),
            ([30, 80], [0.0, 0.3]),
            ([20, 80], [0.0, 0.5]),
            ([30, 80], [0.0, 0.5]),
        ] {
            let g = shifted(&s, teeth, x);
            let r1 = f64::from(teeth[0]) / 2.0;
            // Pinion centre at the origin, pitch point of generation at (r1, 0), the flank's end
            // on the line x = r1 − (flank − x1); the line of generation leans by α.
            let depth = flank - x[0];
            let form = (r1 - depth).hypot(depth / alpha.tan());
            assert!((g.pinion_form_diameter_mm / 2.0 - form).abs() < 1e-9, "{teeth:?} {x:?}");
            let a_w = g.centre_distance_mm;
            let alpha_w = g.working_pressure_angle_deg.to_radians();
            let u = (alpha_w.sin(), alpha_w.cos());
            let pitch_point = (g.working_pitch_diameter_mm[1] / 2.0, 0.0);
            let t = crossings((0.0, 0.0), g.tip_diameter_mm[1] / 2.0, pitch_point, u).1;
            let start = (pitch_point.0 + t * u.0 - a_w, t * u.1);
            assert!((g.pinion_active_diameter_mm / 2.0 - start.0.hypot(start.1)).abs() < 1e-9);
            let below = start.0.hypot(start.1) < form;
            let named = check_internal_mesh(&g, &MeshLimits::default())
                .iter()
                .any(|d| matches!(d, MeshDefect::Internal(InternalDefect::BelowFormCircle { .. })));
            assert_eq!(named, below, "{teeth:?} {x:?}");
            // Unshifted or slightly shifted rings reach below; half a module more clears it.
            assert_eq!(below, x[1] < 0.4, "{teeth:?} {x:?}");
        }
    }

    #[test]
    fn bad_inputs_are_refused() {
        let s = system(1.0, 20.0);
        let at = |teeth, shift| internal_mesh_geometry(&s, teeth, InternalMounting::Shifted { shift });
        assert!(matches!(
            at([40, 40], [0.0, 0.0]),
            Err(MeshDefect::Internal(InternalDefect::NotInternal { .. }))
        ));
        assert!(matches!(at([0, 40], [0.0, 0.0]), Err(MeshDefect::InvalidInput { .. })));
        assert!(matches!(at([20, 40], [f64::NAN, 0.0]), Err(MeshDefect::InvalidInput { .. })));
        assert!(matches!(
            at([20, 60], [0.0, -10.0]),
            Err(MeshDefect::Internal(InternalDefect::ShiftDifferenceTooNegative { .. }))
        ));
        let mounted = |a| {
            internal_mesh_geometry(
                &s,
                [20, 60],
                InternalMounting::PinionShiftAtCentreDistance {
                    pinion_shift: 0.1,
                    pinion_tip_shortening: 0.0,
                    centre_distance_mm: a,
                },
            )
        };
        assert!(matches!(mounted(18.0), Err(MeshDefect::CentreDistanceUnreachable { .. })));
        assert!(matches!(mounted(-1.0), Err(MeshDefect::InvalidInput { .. })));
        let g = mounted(20.5).unwrap();
        assert_eq!(g.shift[0], 0.1);
        let back = shifted(&s, [20, 60], g.shift);
        assert!((back.centre_distance_mm - 20.5).abs() < 1e-9);
        // A planet cut with shortened tips for the sun keeps them in the ring.
        let short = internal_mesh_geometry(
            &s,
            [20, 60],
            InternalMounting::PinionShiftAtCentreDistance {
                pinion_shift: 0.1,
                pinion_tip_shortening: 0.05,
                centre_distance_mm: 20.5,
            },
        )
        .unwrap();
        assert!((g.tip_diameter_mm[0] - short.tip_diameter_mm[0] - 0.1).abs() < 1e-12);
        assert!(short.contact_ratio < g.contact_ratio);
        assert!(matches!(
            internal_mesh_geometry(
                &s,
                [20, 60],
                InternalMounting::PinionShiftAtCentreDistance {
                    pinion_shift: 0.1,
                    pinion_tip_shortening: -0.05,
                    centre_distance_mm: 20.5,
                },
            ),
            Err(MeshDefect::InvalidInput { .. })
        ));
    }

    proptest! {
        #[test]
        fn tight_internal_meshes_keep_their_clearance(
            z1 in 8u32..80, extra in 6u32..120, x1 in -0.5f64..1.0, dx in -0.4f64..1.2,
        ) {
            // a_w − a ≤ m(x2 − x1) for every shift difference, so both bottom clearances are
            // at least c*·m without shortening, and the pinion's tips stay inside the circle
            // where the ring's involute ends (ha* beyond its datum line).
            let s = system(2.0, 20.0);
            let teeth = [z1, z1 + extra];
            if let Ok(g) = internal_mesh_geometry(&s, teeth, InternalMounting::Shifted { shift: [x1, x1 + dx] }) {
                let c = 0.25 * 2.0;
                prop_assert!(g.centre_distance_mm - g.standard_centre_distance_mm <= 2.0 * dx + 1e-12);
                prop_assert!(g.bottom_clearance_mm[0] >= c - 1e-9 && g.bottom_clearance_mm[1] >= c - 1e-9);
                let ring_form_radius = g.pitch_diameter_mm[1] / 2.0 + 2.0 * (1.0 + g.shift[1]);
                prop_assert!(g.centre_distance_mm + g.tip_diameter_mm[0] / 2.0 <= ring_form_radius + 1e-9);
            }
        }
    }
}
