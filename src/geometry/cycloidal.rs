//! Cycloidal (horological) wheel-and-pinion teeth, as clock wheels and pinions are cut: the
//! proportions of wheel and pinion by leaf count, the circles of a pair at its centre distance,
//! the arcs of action on either side of the line of centres, and the checks that matter for
//! this form ([`check_cycloidal`]).
//!
//! The form: the wheel's addendum is the epicycloid a circle of half the pinion's pitch radius
//! traces rolling on the wheel's pitch circle; the same circle rolling inside the pinion's pitch
//! circle traces a straight radial line, so the pinion's flanks are radial. Proportions follow
//! the British Standard for cycloidal type gears (BS 978 part 2), all **from memory** (no copy
//! was at hand; check them against the printed tables before cutting):
//!
//! - wheel: tooth thickness and space half the circular pitch (1.57 m each); theoretical
//!   addendum where the epicycloids of the two flanks of a tooth meet; practical addendum
//!   0.95 of it; the tip rounded with a radius 1.4 times the theoretical addendum factor;
//!   dedendum 1.57 m;
//! - pinion, by leaf count: 6–7 leaves addendum 0.855 m, tip radius 1.05 m; 8–9 leaves 0.67 m
//!   and 0.70 m; 10–11 leaves 0.525 m and 0.525 m (a round top); 12 leaves and more 0.625 m and
//!   0.625 m (round top); leaf thickness 1.05 m up to 11 leaves, 1.25 m from 12; dedendum the
//!   wheel's practical addendum plus 0.4 m of clearance.
//!
//! Pairs run at the centre distance m·(z1 + z2)/2 with no shift: cycloidal teeth take none, so
//! a coaxial train is met by a module per pair. A pair may be mounted at another distance (a
//! fixed centre distance); its arcs of action are then estimated along the paths of contact of
//! the standard mounting, measured from the mounted centres, an approximation that is exact at
//! the standard distance.
//!
//! Pure arithmetic: lengths in mm, tooth proportions in modules, arcs in degrees of the pinion's
//! turn. The pinion is the gear with fewer teeth (gear 1 of a pair of equal counts).

use std::f64::consts::PI;

use super::defect::{GearRef, MeshDefect};

/// Fewest pinion leaves the proportions are tabulated for.
pub const MIN_PINION_LEAVES: u32 = 6;

/// Practical wheel addendum as a fraction of the theoretical one (BS 978 part 2, from memory).
pub const PRACTICAL_ADDENDUM: f64 = 0.95;

/// Wheel tip radius over the theoretical addendum factor (BS 978 part 2, from memory).
pub const WHEEL_TIP_RADIUS_FACTOR: f64 = 1.4;

/// Clearance below the wheel's tips at the pinion's root, in modules (BS 978 part 2, from
/// memory).
pub const PINION_ROOT_CLEARANCE: f64 = 0.4;

/// Wheel dedendum, in modules: half the circular pitch (BS 978 part 2, from memory).
pub const WHEEL_DEDENDUM: f64 = PI / 2.0;

/// Wheel tooth thickness at the pitch circle, in modules: half the circular pitch (BS 978
/// part 2, from memory).
pub const WHEEL_TOOTH_THICKNESS: f64 = PI / 2.0;

/// The proportions of a pinion with a given number of leaves, in modules.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PinionProportions {
    /// Addendum above the pitch circle.
    pub addendum: f64,
    /// Radius of the rounded tip.
    pub tip_radius: f64,
    /// Leaf thickness at the pitch circle.
    pub leaf_thickness: f64,
}

impl PinionProportions {
    /// The proportions for `leaves` (BS 978 part 2, from memory); `None` below
    /// [`MIN_PINION_LEAVES`].
    pub fn of(leaves: u32) -> Option<PinionProportions> {
        let (addendum, tip_radius, leaf_thickness) = match leaves {
            0..=5 => return None,
            6 | 7 => (0.855, 1.05, 1.05),
            8 | 9 => (0.67, 0.70, 1.05),
            10 | 11 => (0.525, 0.525, 1.05),
            _ => (0.625, 0.625, 1.25),
        };
        Some(PinionProportions { addendum, tip_radius, leaf_thickness })
    }

    /// True when the tip is a half circle across the leaf (a round top); otherwise it is
    /// ogival, two arcs meeting at the tip.
    pub fn round_top(&self) -> bool {
        (2.0 * self.tip_radius - self.leaf_thickness).abs() < 1e-12
    }
}

/// The theoretical wheel addendum factor (in modules): where the epicycloids of a tooth's two
/// flanks meet on its centre line, for a wheel of `wheel_teeth` driving a pinion of
/// `pinion_leaves`, the tooth half the circular pitch thick.
///
/// With the gear ratio `u = z_w/z_p` and `k = 1 + 2u`, the rolling circle's turn `θ` where the
/// flank's epicycloid reaches the tooth's centre line solves `θ = π/z_p + 2u·β`, `β =
/// atan(sin θ / (k − cos θ))` (a contraction, iterated to a fixed point); the addendum is then
/// `z_p/4 · (1 − k + √(1 + k² − 2k·cos θ))`.
pub fn wheel_addendum_factor(wheel_teeth: u32, pinion_leaves: u32) -> f64 {
    let zp = pinion_leaves as f64;
    let u = wheel_teeth as f64 / zp;
    let k = 1.0 + 2.0 * u;
    let mut theta = 1.0f64;
    for _ in 0..200 {
        let beta = theta.sin().atan2(k - theta.cos());
        // 2·s/(m·z_p): π/z_p for a tooth half the pitch thick.
        let next = 2.0 * WHEEL_TOOTH_THICKNESS / zp + 2.0 * u * beta;
        if (next - theta).abs() < 1e-15 {
            theta = next;
            break;
        }
        theta = next;
    }
    0.25 * zp * (1.0 - k + (1.0 + k * k - 2.0 * k * theta.cos()).sqrt())
}

/// One gear of a cycloidal pair: its proportions in mm.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct CycloidalGear {
    /// Teeth (leaves of a pinion).
    pub teeth: u32,
    /// Wheel or pinion.
    pub is_pinion: bool,
    /// Pitch diameter m·z, mm.
    pub pitch_diameter_mm: f64,
    /// Addendum, mm.
    pub addendum_mm: f64,
    /// Dedendum, mm.
    pub dedendum_mm: f64,
    /// Tip diameter, mm.
    pub tip_diameter_mm: f64,
    /// Root diameter, mm.
    pub root_diameter_mm: f64,
    /// Tooth (leaf) thickness at the pitch circle, mm.
    pub thickness_mm: f64,
    /// Radius the tip is rounded to, mm.
    pub tip_radius_mm: f64,
}

/// A cycloidal wheel and pinion mounted at a centre distance: the gears' proportions and the
/// arcs of action.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct CycloidalMesh {
    /// Module, mm.
    pub module_mm: f64,
    /// Tooth counts, driver first.
    pub teeth: [u32; 2],
    /// Which gear (0 or 1) is the pinion.
    pub pinion: usize,
    /// The two gears, driver first.
    pub gears: [CycloidalGear; 2],
    /// The standard centre distance m·(z1 + z2)/2, mm.
    pub standard_centre_distance_mm: f64,
    /// The centre distance the pair is mounted at, mm.
    pub centre_distance_mm: f64,
    /// The pinion's turn per leaf, 360°/z_p.
    pub pitch_deg: f64,
    /// The pinion's turn while the wheel's tips act on its flanks, on the side of the line of
    /// centres the wheel's addendum works on, degrees.
    pub wheel_tip_arc_deg: f64,
    /// The pinion's turn while its tips act on the wheel's flanks, degrees.
    pub pinion_tip_arc_deg: f64,
    /// Leaves in contact on average: the two arcs over the pitch (a contact ratio; below 1 a
    /// leaf is let go before the next is taken).
    pub contact_ratio: f64,
    /// The part of each leaf's pitch that must be driven before the line of centres (engaging
    /// action, with its friction), as a fraction of the pitch, for this driver.
    pub before_line_fraction: f64,
    /// Radial clearance at the root of each gear (below the mate's tips), mm, driver first.
    pub root_clearance_mm: [f64; 2],
}

/// What a cycloidal mesh must meet beyond the least contact ratio.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct CycloidalLimits {
    /// Largest part of a leaf's pitch driven before the line of centres. Default 0.5 (our own
    /// rule: half; the standard's 6-leaf pinions need about a third when driven by a wheel).
    pub max_before_line_fraction: f64,
    /// Least radial clearance below the mate's tips, in modules. Default 0.1 (our own rule:
    /// a quarter of the 0.4 m the standard leaves at the pinion's root).
    pub min_root_clearance_modules: f64,
}

impl Default for CycloidalLimits {
    fn default() -> Self {
        CycloidalLimits { max_before_line_fraction: 0.5, min_root_clearance_modules: 0.1 }
    }
}

/// The pinion's turn (radians) over which points of a path of contact stay inside a tip
/// circle: the path is the rolling circle through the pitch point and the centre of the gear
/// of pitch radius `own_r` (a point at `own_r·cos φ` from that centre on the radius at angle
/// `φ`), the tip circle of radius `tip_r` is about the mate's centre at `a`, and `turn_per_phi`
/// converts the own gear's angle to the pinion's.
fn arc_inside(own_r: f64, tip_r: f64, a: f64, turn_per_phi: f64) -> f64 {
    // |P − C|² = a² + cos²φ·(own_r² − 2·a·own_r), decreasing in cos²φ.
    let cos2 = (a * a - tip_r * tip_r) / (own_r * (2.0 * a - own_r));
    let phi = if cos2 >= 1.0 {
        0.0
    } else if cos2 <= 0.0 {
        PI / 2.0
    } else {
        cos2.sqrt().acos()
    };
    phi * turn_per_phi
}

/// Work out the cycloidal pair of `teeth` (driver first) at `module_mm`, mounted at
/// `centre_distance_mm` (the standard m·(z1 + z2)/2 when `None`).
pub fn cycloidal_mesh(
    module_mm: f64,
    teeth: [u32; 2],
    centre_distance_mm: Option<f64>,
) -> Result<CycloidalMesh, MeshDefect> {
    if !(module_mm.is_finite() && module_mm > 0.0) {
        return Err(MeshDefect::InvalidInput {
            what: "the module must be a positive length",
            value: module_mm,
        });
    }
    let pinion = if teeth[0] < teeth[1] { 0 } else { 1 };
    let (zp, zw) = (teeth[pinion], teeth[1 - pinion]);
    let Some(prop) = PinionProportions::of(zp) else {
        return Err(MeshDefect::InvalidInput {
            what: "cycloidal pinion proportions start at 6 leaves",
            value: zp as f64,
        });
    };
    let m = module_mm;
    let standard = m * (zp + zw) as f64 / 2.0;
    let a = centre_distance_mm.unwrap_or(standard);
    if !(a.is_finite() && a > 0.0) {
        return Err(MeshDefect::InvalidInput {
            what: "the centre distance must be a positive length",
            value: a,
        });
    }
    let theoretical = wheel_addendum_factor(zw, zp);
    let wheel_addendum = PRACTICAL_ADDENDUM * theoretical * m;
    let (r, big_r) = (m * zp as f64 / 2.0, m * zw as f64 / 2.0);
    let wheel = CycloidalGear {
        teeth: zw,
        is_pinion: false,
        pitch_diameter_mm: 2.0 * big_r,
        addendum_mm: wheel_addendum,
        dedendum_mm: WHEEL_DEDENDUM * m,
        tip_diameter_mm: 2.0 * (big_r + wheel_addendum),
        root_diameter_mm: 2.0 * (big_r - WHEEL_DEDENDUM * m),
        thickness_mm: WHEEL_TOOTH_THICKNESS * m,
        tip_radius_mm: WHEEL_TIP_RADIUS_FACTOR * theoretical * m,
    };
    let pinion_dedendum = wheel_addendum + PINION_ROOT_CLEARANCE * m;
    let pin = CycloidalGear {
        teeth: zp,
        is_pinion: true,
        pitch_diameter_mm: 2.0 * r,
        addendum_mm: prop.addendum * m,
        dedendum_mm: pinion_dedendum,
        tip_diameter_mm: 2.0 * (r + prop.addendum * m),
        root_diameter_mm: 2.0 * (r - pinion_dedendum),
        thickness_mm: prop.leaf_thickness * m,
        tip_radius_mm: prop.tip_radius * m,
    };
    let u = zw as f64 / zp as f64;
    // The wheel's tips on the pinion's radial flanks: along the rolling circle inside the
    // pinion; the pinion's tips on the wheel's radial flanks: along the one inside the wheel.
    let wheel_tip_arc = arc_inside(r, big_r + wheel_addendum, a, 1.0);
    let pinion_tip_arc = arc_inside(big_r, r + prop.addendum * m, a, u);
    let pitch = 2.0 * PI / zp as f64;
    // After the line of centres the driver's tips act on the driven gear's flanks.
    let after_line = if pinion == 0 { pinion_tip_arc } else { wheel_tip_arc };
    let before_line_fraction = ((pitch - after_line) / pitch).max(0.0);
    let gears = if pinion == 0 { [pin, wheel] } else { [wheel, pin] };
    let clearance = |own: &CycloidalGear, mate: &CycloidalGear| {
        a - own.root_diameter_mm / 2.0 - mate.tip_diameter_mm / 2.0
    };
    Ok(CycloidalMesh {
        module_mm: m,
        teeth,
        pinion,
        root_clearance_mm: [clearance(&gears[0], &gears[1]), clearance(&gears[1], &gears[0])],
        gears,
        standard_centre_distance_mm: standard,
        centre_distance_mm: a,
        pitch_deg: pitch.to_degrees(),
        wheel_tip_arc_deg: wheel_tip_arc.to_degrees(),
        pinion_tip_arc_deg: pinion_tip_arc.to_degrees(),
        contact_ratio: (wheel_tip_arc + pinion_tip_arc) / pitch,
        before_line_fraction,
    })
}

/// Every reason a cycloidal `mesh` would not run: too little clearance at either root, too
/// much action before the line of centres, then too low a contact ratio. Empty when it runs.
pub fn check_cycloidal(
    mesh: &CycloidalMesh,
    limits: &CycloidalLimits,
    min_contact_ratio: f64,
) -> Vec<MeshDefect> {
    let mut defects = Vec::new();
    let min_mm = limits.min_root_clearance_modules * mesh.module_mm;
    for i in 0..2 {
        if mesh.root_clearance_mm[i] < min_mm {
            defects.push(MeshDefect::RootClearanceTooSmall {
                tips_of: GearRef::of(mesh.teeth, 1 - i),
                root_of: GearRef::of(mesh.teeth, i),
                clearance_mm: mesh.root_clearance_mm[i],
                min_mm,
            });
        }
    }
    if mesh.before_line_fraction > limits.max_before_line_fraction {
        defects.push(MeshDefect::ActionBeforeLineOfCentres {
            driver: GearRef::of(mesh.teeth, 0),
            fraction: mesh.before_line_fraction,
            max: limits.max_before_line_fraction,
        });
    }
    if mesh.contact_ratio.is_nan() || mesh.contact_ratio < min_contact_ratio {
        defects.push(MeshDefect::ContactRatioTooLow { value: mesh.contact_ratio, min: min_contact_ratio });
    }
    defects
}

/// The epicycloid of a rolling circle of radius `rho` on a base circle of radius `big_r`, at
/// the rolling circle's turn `t`: the point's polar radius and its angle from where it started on
/// the base circle.
fn epicycloid_point(big_r: f64, rho: f64, t: f64) -> (f64, f64) {
    let c = t * rho / big_r;
    let (cx, cy) = ((big_r + rho) * c.cos(), (big_r + rho) * c.sin());
    let a = c + PI + t;
    let (x, y) = (cx + rho * a.cos(), cy + rho * a.sin());
    (x.hypot(y), y.atan2(x))
}

/// One side of a tooth above its pitch circle, from the pitch point up to the tip, as (radius,
/// angle from the tooth's centre line) pairs, the angle falling towards the centre line.
fn addendum_side(mesh: &CycloidalMesh, gear: &CycloidalGear, steps: usize) -> Vec<(f64, f64)> {
    let r = gear.pitch_diameter_mm / 2.0;
    let tip = gear.tip_diameter_mm / 2.0;
    let half = gear.thickness_mm / 2.0 / r;
    if !gear.is_pinion {
        // The wheel: the epicycloid of a circle of half the pinion's pitch radius.
        let rho = mesh.gears[mesh.pinion].pitch_diameter_mm / 4.0;
        let (mut lo, mut hi) = (0.0, PI);
        for _ in 0..100 {
            let mid = 0.5 * (lo + hi);
            if epicycloid_point(r, rho, mid).0 < tip {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return (0..=steps)
            .map(|k| {
                let (rad, ang) = epicycloid_point(r, rho, lo * k as f64 / steps as f64);
                (rad, (half - ang).max(0.0))
            })
            .collect();
    }
    // The pinion: an arc of the tip radius through the flank's pitch point and the top of the
    // leaf on its centre line, bulging outwards (a half circle for a round top).
    let p1 = [r * half.cos(), r * half.sin()];
    let p2 = [tip, 0.0];
    let (dx, dy) = (p2[0] - p1[0], p2[1] - p1[1]);
    let chord = dx.hypot(dy);
    let rho = gear.tip_radius_mm.max(chord / 2.0);
    let mid = [(p1[0] + p2[0]) / 2.0, (p1[1] + p2[1]) / 2.0];
    let off = (rho * rho - chord * chord / 4.0).max(0.0).sqrt();
    // The centre lies inside the leaf, on the side of the chord towards the pinion's centre.
    let n = [dy / chord, -dx / chord];
    let centre = [mid[0] + n[0] * off, mid[1] + n[1] * off];
    let a1 = (p1[1] - centre[1]).atan2(p1[0] - centre[0]);
    let mut a2 = (p2[1] - centre[1]).atan2(p2[0] - centre[0]);
    while a2 > a1 {
        a2 -= 2.0 * PI;
    }
    (0..=steps)
        .map(|k| {
            let a = a1 + (a2 - a1) * k as f64 / steps as f64;
            let (x, y) = (centre[0] + rho * a.cos(), centre[1] + rho * a.sin());
            (x.hypot(y), y.atan2(x).max(0.0))
        })
        .collect()
}

/// The outline of gear `index` (0 or 1) of a cycloidal pair as a closed polygon in its own
/// frame (mm, counter-clockwise), tooth 0 centred on the positive x axis, starting in the middle
/// of the space before it: radial flanks below the pitch circle, the wheel's addendum on its
/// epicycloid up to the practical tip circle, the pinion's rounded tip, root circle between.
/// For pictures; `steps` points per curved part.
pub fn cycloidal_outline(mesh: &CycloidalMesh, index: usize, steps: usize) -> Vec<[f64; 2]> {
    let gear = &mesh.gears[index.min(1)];
    let z = gear.teeth.max(1) as f64;
    let steps = steps.max(2);
    let r = gear.pitch_diameter_mm / 2.0;
    let root = (gear.root_diameter_mm / 2.0).max(0.0);
    let half = gear.thickness_mm / 2.0 / r;
    let side = addendum_side(mesh, gear, steps);
    // One tooth from the space before it to the space after it, as (radius, angle).
    let mut tooth: Vec<(f64, f64)> = Vec::new();
    let space = PI / z;
    for k in 0..=steps / 2 {
        tooth.push((root, -space + (space - half) * k as f64 / (steps / 2) as f64));
    }
    tooth.extend(side.iter().map(|&(rad, a)| (rad, -a)));
    tooth.extend(side.iter().rev().map(|&(rad, a)| (rad, a)));
    for k in 0..=steps / 2 {
        tooth.push((root, half + (space - half) * k as f64 / (steps / 2) as f64));
    }
    let mut points = Vec::with_capacity(tooth.len() * gear.teeth as usize);
    for n in 0..gear.teeth {
        let turn = 2.0 * PI * n as f64 / z;
        // The last point of a tooth is the first of the next.
        for &(rad, a) in &tooth[..tooth.len() - 1] {
            points.push([rad * (a + turn).cos(), rad * (a + turn).sin()]);
        }
    }
    points
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: f64, b: f64, tol: f64) -> bool {
        (a - b).abs() <= tol
    }

    #[test]
    fn pinion_proportions_follow_the_standard_table() {
        // BS 978 part 2, pinion proportions by leaf count (from memory): addendum, tip radius,
        // leaf thickness in modules.
        let table = [
            (6, 0.855, 1.05, 1.05),
            (7, 0.855, 1.05, 1.05),
            (8, 0.67, 0.70, 1.05),
            (9, 0.67, 0.70, 1.05),
            (10, 0.525, 0.525, 1.05),
            (11, 0.525, 0.525, 1.05),
            (12, 0.625, 0.625, 1.25),
            (16, 0.625, 0.625, 1.25),
        ];
        for (z, ha, rho, s) in table {
            let p = PinionProportions::of(z).unwrap();
            assert_eq!((p.addendum, p.tip_radius, p.leaf_thickness), (ha, rho, s), "{z} leaves");
            // Round tops from 10 leaves: the tip radius is half the leaf (same source).
            assert_eq!(p.round_top(), z >= 10, "{z} leaves");
        }
        assert_eq!(PinionProportions::of(5), None);
    }

    /// The epicycloid traced by a point of a circle of radius `rho` rolling on a circle of
    /// radius `big_r`, at rolling angle `t` (the circle's own turn): the point's polar radius
    /// and angle about the base circle's centre, starting from angle 0 on the base circle.
    fn epicycloid(big_r: f64, rho: f64, t: f64) -> (f64, f64) {
        let centre_angle = t * rho / big_r;
        let (cx, cy) = ((big_r + rho) * centre_angle.cos(), (big_r + rho) * centre_angle.sin());
        // The point starts at the contact (angle π from the rolling circle's centre direction)
        // and turns with the circle by t + centre_angle.
        let a = centre_angle + PI + t;
        let (x, y) = (cx + rho * a.cos(), cy + rho * a.sin());
        ((x * x + y * y).sqrt(), y.atan2(x))
    }

    #[test]
    fn the_wheel_addendum_is_where_the_flank_epicycloids_meet() {
        // Independent check by tracing the epicycloid (the definition of the form in BS 978
        // part 2, from memory): the flank's curve, traced from the pitch circle, reaches the
        // tooth's centre line (a quarter of the circular pitch away, as an angle 2π/(4·z_w))
        // at the radius pitch radius + addendum.
        for (zw, zp) in [(96u32, 8u32), (64, 8), (60, 7), (30, 6), (80, 10), (36, 12), (32, 8)] {
            let m = 1.0;
            let (big_r, rho) = (m * zw as f64 / 2.0, m * zp as f64 / 4.0);
            let half_tooth_angle = PI / (2.0 * zw as f64);
            let (mut lo, mut hi) = (0.0, PI);
            for _ in 0..200 {
                let mid = 0.5 * (lo + hi);
                if epicycloid(big_r, rho, mid).1 < half_tooth_angle {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            let traced = epicycloid(big_r, rho, lo).0 - big_r;
            let computed = wheel_addendum_factor(zw, zp) * m;
            assert!(close(traced, computed, 1e-9), "{zw}/{zp}: traced {traced}, computed {computed}");
        }
    }

    #[test]
    fn a_very_large_wheel_has_the_cycloidal_rack_addendum() {
        // Limit of a rack (a wheel of very many teeth): the plain cycloid x = ρ(t − sin t),
        // y = ρ(1 − cos t) with ρ = z_p·m/4 reaches the tooth's centre line at x = π·m/4
        // (computed here by bisection, independently of the wheel formula).
        let zp = 8.0;
        let rho = zp / 4.0;
        let (mut lo, mut hi) = (0.0f64, PI);
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if rho * (mid - mid.sin()) < PI / 4.0 {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        let rack = rho * (1.0 - lo.cos());
        assert!(close(wheel_addendum_factor(8_000_000, 8), rack, 1e-4), "{rack}");
    }

    #[test]
    fn the_recess_arc_follows_the_wheel_tip_along_the_pinion_flank() {
        // Independent kinematic check at the standard distance: turn the pinion by the arc the
        // closed form gives and the wheel by that over u; the wheel tooth's epicycloid point at
        // the wheel's tip radius then lies on the pinion's radial flank.
        let (zw, zp) = (64u32, 8u32);
        let mesh = cycloidal_mesh(1.0, [zw, zp], None).unwrap();
        let (big_r, r) = (zw as f64 / 2.0, zp as f64 / 2.0);
        let a = big_r + r;
        let tip_r = mesh.gears[0].tip_diameter_mm / 2.0;
        let psi = mesh.wheel_tip_arc_deg.to_radians();
        // The epicycloid point at the tip radius, about the wheel centre, from the flank's start.
        let (mut lo, mut hi) = (0.0, PI);
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if epicycloid(big_r, r / 2.0, mid).0 < tip_r {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        let (rad, ang) = epicycloid(big_r, r / 2.0, lo);
        // The wheel centre at the origin, the pinion centre at (a, 0); the driving flank's start
        // was at the pitch point (angle 0) and has turned by −psi/u (the wheel turns opposite
        // to the pinion), the tooth and its epicycloid lying behind it, at larger angles.
        let u = zw as f64 / zp as f64;
        let theta = -psi / u + ang;
        let (x, y) = (rad * theta.cos(), rad * theta.sin());
        // The pinion's flank, which started on the line of centres, now lies at angle psi from
        // the pinion's radius towards the wheel (turned the other way).
        let flank_angle = PI + psi;
        let (dx, dy) = (x - a, y);
        let off_line = dx * flank_angle.sin() - dy * flank_angle.cos();
        assert!(off_line.abs() < 1e-9, "the tip point is {off_line} mm off the flank");
    }

    #[test]
    fn a_textbook_eight_day_train_runs() {
        // An eight-day longcase going train (common practice, from memory): great wheel 96 into
        // a centre pinion of 8, centre wheel 64 into 8, third wheel 60 into 8. Each stage keeps
        // more than one leaf in action and drives a modest part of each leaf before the line
        // of centres, with the standard clearances.
        for (zw, zp) in [(96u32, 8u32), (64, 8), (60, 8)] {
            let mesh = cycloidal_mesh(0.6, [zw, zp], None).unwrap();
            assert!(check_cycloidal(&mesh, &CycloidalLimits::default(), 1.0).is_empty(), "{mesh:?}");
            assert!(mesh.contact_ratio > 1.2 && mesh.contact_ratio < 2.0, "{}", mesh.contact_ratio);
            assert!(mesh.before_line_fraction > 0.0 && mesh.before_line_fraction < 0.25);
            // Clearance at the pinion's root: 0.4 m (the standard's, from memory).
            assert!(close(mesh.root_clearance_mm[1], 0.4 * 0.6, 1e-12));
        }
    }

    #[test]
    fn fewer_leaves_engage_more_before_the_line_of_centres() {
        // Common practice: the fewer the pinion's leaves, the more of each leaf's action comes
        // before the line of centres when a wheel drives it; from about 12 leaves almost none.
        let fraction = |zp: u32| cycloidal_mesh(1.0, [8 * zp, zp], None).unwrap().before_line_fraction;
        let f: Vec<f64> = [6, 7, 8, 10, 12].iter().map(|&z| fraction(z)).collect();
        assert!(f.windows(2).all(|w| w[0] > w[1]), "{f:?}");
        assert!(f[4] < 0.05 && f[0] > 0.25, "{f:?}");
        let strict = CycloidalLimits { max_before_line_fraction: 0.2, ..CycloidalLimits::default() };
        let six = cycloidal_mesh(1.0, [48, 6], None).unwrap();
        assert!(matches!(
            check_cycloidal(&six, &strict, 1.0)[..],
            [MeshDefect::ActionBeforeLineOfCentres { driver: GearRef { teeth: 48, .. }, .. }]
        ));
    }

    #[test]
    fn a_pinion_driving_engages_mostly_before_the_line_of_centres() {
        // Motion work: the pinion drives, so the wheel's long addendum works before the line
        // of centres and only the pinion's short tips after it.
        let driven = cycloidal_mesh(1.0, [32, 8], None).unwrap();
        let driving = cycloidal_mesh(1.0, [8, 32], None).unwrap();
        assert!(driving.before_line_fraction > driven.before_line_fraction);
        assert!(close(driving.contact_ratio, driven.contact_ratio, 1e-12));
        assert_eq!((driving.pinion, driven.pinion), (0, 1));
    }

    #[test]
    fn mounting_too_close_or_too_far_is_caught() {
        let standard = cycloidal_mesh(1.0, [64, 8], None).unwrap();
        assert!(close(standard.centre_distance_mm, 36.0, 1e-12));
        // 0.35 m closer leaves 0.05 m at the pinion's root, below the 0.1 m wanted.
        let deep = cycloidal_mesh(1.0, [64, 8], Some(35.65)).unwrap();
        assert!(matches!(
            check_cycloidal(&deep, &CycloidalLimits::default(), 1.0)[..],
            [MeshDefect::RootClearanceTooSmall { root_of: GearRef { teeth: 8, .. }, .. }]
        ));
        // Far out, the tips barely reach: the leaves are let go before the next is taken.
        let shallow = cycloidal_mesh(1.0, [64, 8], Some(37.2)).unwrap();
        assert!(shallow.contact_ratio < 1.0, "{}", shallow.contact_ratio);
        assert!(check_cycloidal(&shallow, &CycloidalLimits::default(), 1.0)
            .iter()
            .any(|d| matches!(d, MeshDefect::ContactRatioTooLow { .. })));
    }

    #[test]
    fn the_outline_keeps_within_its_circles_and_interleaves() {
        let mesh = cycloidal_mesh(1.0, [64, 8], None).unwrap();
        for i in 0..2 {
            let g = &mesh.gears[i];
            let pts = cycloidal_outline(&mesh, i, 12);
            let radii: Vec<f64> = pts.iter().map(|p| p[0].hypot(p[1])).collect();
            let max = radii.iter().cloned().fold(0.0, f64::max);
            let min = radii.iter().cloned().fold(f64::INFINITY, f64::min);
            assert!(close(max, g.tip_diameter_mm / 2.0, 1e-9), "{i}: {max}");
            assert!(close(min, g.root_diameter_mm / 2.0, 1e-9), "{i}: {min}");
        }
        // Mounted at the centre distance with a wheel tooth on the line of centres and a pinion
        // space facing it, no point of the pinion lies inside the wheel's tip circle where the
        // wheel has a tooth: check the wheel tooth on the line against the two leaves beside it.
        let a = mesh.centre_distance_mm;
        let pinion: Vec<[f64; 2]> = cycloidal_outline(&mesh, 1, 24)
            .iter()
            .map(|p| {
                let t = PI + PI / 8.0;
                [a + p[0] * t.cos() - p[1] * t.sin(), p[0] * t.sin() + p[1] * t.cos()]
            })
            .collect();
        let wheel_tooth_half = mesh.gears[0].thickness_mm / 2.0 / 32.0;
        for p in &pinion {
            let (rad, ang) = (p[0].hypot(p[1]), p[1].atan2(p[0]));
            let inside_wheel_tooth = rad < 32.0 && ang.abs() < wheel_tooth_half * 0.999;
            assert!(!inside_wheel_tooth, "pinion point {p:?} inside the wheel tooth");
        }
    }

    #[test]
    fn bad_input_is_a_defect_not_a_panic() {
        assert!(cycloidal_mesh(1.0, [40, 5], None).is_err());
        assert!(cycloidal_mesh(0.0, [40, 8], None).is_err());
        assert!(cycloidal_mesh(f64::NAN, [40, 8], None).is_err());
        assert!(cycloidal_mesh(1.0, [40, 8], Some(-1.0)).is_err());
    }
}
