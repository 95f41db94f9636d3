//! The conditions a planetary design must meet, each named when it fails ([`Unmet`]):
//!
//! - **ratio**: within the tolerance of the target, exactly (cross-multiplication), and in the
//!   direction asked for;
//! - **coaxiality**: sun–planet and planet–ring (or both planet–ring meshes of the two-ring
//!   train) at one working centre distance, the carrier's. Unshifted that needs equal standard
//!   centre distances, `Zs + Zp = Zr − Zp` for the simple train. In general the carrier is set
//!   midway between the two standard centre distances, plus an offset `o` (in modules) the
//!   designer chooses: `a_w = m·((s1 + s2)/4 + o)` where `s` is `z1 + z2` for an external mesh
//!   and `z2 − z1` for an internal one, so the two meshes share the correction; each mesh's
//!   shift (`x_sun + x_planet`, or `x_ring − x_planet`) that makes it tight there must lie in
//!   the allowed range. See [`carrier`];
//! - **assembly**: the planets must fit at the places chosen round the carrier. A planet fits
//!   only where sun and ring teeth stand in the right phase; those places are `360°/L` apart
//!   with `L = (Zs·Zp2 + Zr·Zp1) / gcd(Zp1, Zp2)` (so `L = Zs + Zr` for the simple train), and
//!   `N` equally spaced planets need `L/N` whole. For the two-ring train
//!   `L = |Zr2·Zp1 − Zr1·Zp2| / gcd(Zp1, Zp2)`. Planets must be identical, the two gears of a
//!   stepped planet in the same mutual phase on every planet. See [`positions`];
//! - **neighbouring planets**: the tip circles of two planets side by side must clear by the
//!   margin asked for, `2·a_w·sin(θ/2) > da_planet + margin` with `θ` the smallest angle between
//!   neighbours (`360°/N` when equally spaced) and `da_planet` the larger planet gear's tip;
//! - **meshes** (optional): each mesh held to [`MeshLimits`].
//!
//! Owns the conditions and the [`Design`] that meets them; the ratio is [`super::willis`]'s,
//! the mesh formulas [`crate::geometry`]'s.

use std::fmt;

use crate::geometry::internal::{
    check_internal_mesh, internal_mesh_geometry, InternalMeshGeometry, InternalMounting,
};
use crate::geometry::{
    check_mesh, mesh_geometry, MeshDefect, MeshGeometry, MeshLimits, Mounting, ToothSystem,
};
use crate::model::train::Direction;
use crate::numbers::range::IntRange;
use crate::numbers::rational::{gcd, RelError};

use super::willis::SpeedRatio;
use super::{Arrangement, MeshTeeth, PlanetaryProblem, Spacing, Teeth};

/// A mesh's shift counts as within its range when it is outside by no more than this (in
/// modules), so that rounding in the involute does not reject a shift exactly on the limit.
const SHIFT_TOLERANCE: f64 = 1e-9;

/// Where the carrier holds the planets and how each gear is cut to get there.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Carrier {
    /// Working centre distance of both meshes, mm: the radius of the planets' centres.
    pub centre_distance_mm: f64,
    /// Each mesh's shift, in modules, in the order of [`Teeth::meshes`]: `x_sun + x_planet` for
    /// an external mesh, `x_ring − x_planet` for an internal one. Exactly zero when the train is
    /// coaxial unshifted.
    pub mesh_shift: [f64; 2],
    /// Profile shift of each gear, in modules, `[mesh][gear]` in the order of
    /// [`Teeth::meshes`]. An external mesh's sum is split by
    /// [`ToothSystem::split_shift_sum`]; a planet gear that meshes only a ring gets the least
    /// shift that keeps it clear of undercut (zero if it needs none); a ring gets its planet
    /// gear's shift plus the mesh's difference.
    pub shift: [[f64; 2]; 2],
    /// Tip shortening, in modules, of each mesh's gears (external meshes only; an internal mesh
    /// never needs it, see [`crate::geometry::internal`]). A simple train's planet carries
    /// its shortening from the sun into the ring.
    pub tip_shortening: [f64; 2],
    /// Tip diameters of the planet's two gears, mm (equal for a simple train).
    pub planet_tip_diameter_mm: [f64; 2],
}

/// The places the planets take round the carrier.
#[derive(Debug, Clone, PartialEq, Eq, serde::Serialize)]
pub struct Positions {
    /// How many places round the carrier a planet could be fitted at, `360°/places` apart
    /// (the `L` of the assembly condition).
    pub places: u64,
    /// The places used, planet by planet: planet `k` sits at `360°·at[k]/places` from the
    /// first. Increasing, starting at 0.
    pub at: Vec<u64>,
}

impl Positions {
    /// True when the planets are equally spaced.
    pub fn equally_spaced(&self) -> bool {
        let n = self.at.len() as u64;
        n > 0
            && self.places % n == 0
            && self.at.iter().enumerate().all(|(k, &j)| j == k as u64 * (self.places / n))
    }

    /// The planets' angles from the first, degrees.
    pub fn angles_deg(&self) -> Vec<f64> {
        self.at.iter().map(|&j| 360.0 * j as f64 / self.places as f64).collect()
    }

    /// The fewest places between two neighbouring planets (round the whole carrier).
    pub fn smallest_step(&self) -> u64 {
        let mut smallest = self.places;
        for (k, &j) in self.at.iter().enumerate() {
            let next = self.at.get(k + 1).copied().unwrap_or(self.places + self.at[0]);
            smallest = smallest.min(next - j);
        }
        smallest
    }
}

/// One of a planet's two meshes, worked out.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub enum PlanetMesh {
    /// Sun and planet.
    External(MeshGeometry),
    /// Planet and ring.
    Internal(InternalMeshGeometry),
}

/// A design that meets every condition, with what the conditions worked out.
#[derive(Debug, Clone, PartialEq)]
pub struct Design {
    /// Tooth counts.
    pub teeth: Teeth,
    /// Number of planets.
    pub planets: u32,
    /// Input turns per output turn, exact, with the output's direction.
    pub ratio: SpeedRatio,
    /// Relative error of the ratio's magnitude against the target, exact.
    pub error: RelError,
    /// Carrier centre distance and profile shifts.
    pub carrier: Carrier,
    /// Where the planets sit.
    pub positions: Positions,
    /// Gap between the tip circles of the two closest neighbouring planets, mm.
    pub neighbour_gap_mm: f64,
    /// The two meshes in the order of [`Teeth::meshes`], or why one could not be worked out
    /// (only possible when the meshes are not checked).
    pub meshes: [Result<PlanetMesh, MeshDefect>; 2],
    /// What is wrong with the gears on hand as they were cut, judged by the default mesh
    /// limits: a design from stock whose meshes are not checked is listed with these named
    /// (gears on hand cannot be re-cut); empty otherwise (checked meshes refuse a defect).
    pub on_hand_defects: Vec<Unmet>,
}

impl Design {
    /// Reference diameter of the largest ring, mm: the size designs are ranked by.
    pub fn ring_diameter_mm(&self, module_mm: f64) -> f64 {
        module_mm * f64::from(self.teeth.largest_ring())
    }
}

/// The conditions by name, in the order they are judged: what an [`Unmet`] is a case of, and
/// what the search's count of left-out candidates is kept by
/// ([`super::search::LeftOut`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Condition {
    /// The tooth counts are of the arrangement asked for.
    Arrangement,
    /// Every tooth count and the planet count lie in their ranges.
    Ranges,
    /// Every gear is on hand in the numbers the design needs, when the gears come from stock.
    Stock,
    /// The ratio is within the tolerance (and the output can turn at all).
    Ratio,
    /// The output turns the way asked for.
    Direction,
    /// Every ring has more teeth than the planet gear meshing it.
    RingSize,
    /// Both meshes share the carrier's centre distance within the allowed profile shift.
    Coaxiality,
    /// The planets can be fitted at the places asked for.
    Assembly,
    /// Neighbouring planets' tip circles clear by the margin.
    Clearance,
    /// Both meshes can be worked out and pass the mesh checks.
    Meshes,
}

impl Condition {
    /// The condition's name in words: `ratio`, `coaxiality`, `neighbour clearance`, ….
    pub fn name(self) -> &'static str {
        match self {
            Condition::Arrangement => "arrangement",
            Condition::Ranges => "ranges",
            Condition::Stock => "gears on hand",
            Condition::Ratio => "ratio",
            Condition::Direction => "direction",
            Condition::RingSize => "ring size",
            Condition::Coaxiality => "coaxiality",
            Condition::Assembly => "assembly",
            Condition::Clearance => "neighbour clearance",
            Condition::Meshes => "meshes",
        }
    }
}

impl fmt::Display for Condition {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// A condition a design does not meet, with its numbers.
#[derive(Debug, Clone, PartialEq)]
pub enum Unmet {
    /// The tooth counts are of another arrangement than the one asked for.
    OtherArrangement,
    /// A tooth count lies outside its range.
    TeethOutOfRange {
        /// The gear, in words ([`super::layout::Gear::name`]).
        member: &'static str,
        /// The tooth count.
        teeth: u32,
        /// The range allowed.
        range: IntRange,
    },
    /// The planet count lies outside its range.
    PlanetsOutOfRange {
        /// The count.
        planets: u32,
        /// The range allowed.
        range: IntRange,
    },
    /// Fewer gears of this kind are on hand than the design needs.
    NotOnHand {
        /// An external gear, or a ring gear (internal teeth).
        ring: bool,
        /// Its teeth.
        teeth: u32,
        /// How many the design needs (a planet gear once per planet).
        wanted: u32,
        /// How many are on hand.
        on_hand: u32,
    },
    /// The output cannot turn when driven this way (or the input cannot).
    NoRatio,
    /// The ratio is outside the tolerance.
    Ratio {
        /// The ratio found.
        ratio: SpeedRatio,
        /// Its relative error.
        error: f64,
    },
    /// The output turns the other way.
    Direction {
        /// The direction asked for.
        wanted: Direction,
    },
    /// A ring does not have more teeth than the planet gear meshing it.
    RingNotLarger {
        /// The planet gear's teeth.
        planet: u32,
        /// The ring's teeth.
        ring: u32,
    },
    /// The two meshes cannot share one centre distance within the allowed profile shift.
    Coaxiality {
        /// Each mesh's shift needed at the carrier's centre distance (`None`: no shift reaches
        /// it), in modules.
        needed: [Option<f64>; 2],
        /// The allowed range, in modules.
        allowed: (f64, f64),
    },
    /// Equally spaced planets do not fit.
    Assembly {
        /// Planets asked for.
        planets: u32,
        /// Places a planet fits at round the carrier.
        places: u64,
    },
    /// Fewer places than planets: they cannot be fitted even unequally.
    TooFewPlaces {
        /// Planets asked for.
        planets: u32,
        /// Places a planet fits at round the carrier.
        places: u64,
    },
    /// Neighbouring planets' tip circles come too close (or overlap).
    Clearance {
        /// Gap between their tip circles, mm (negative: overlap).
        gap_mm: f64,
        /// The least gap wanted, mm.
        margin_mm: f64,
    },
    /// A mesh cannot be built or would not run.
    Mesh {
        /// The mesh, as in [`Teeth::meshes`].
        teeth: MeshTeeth,
        /// What is wrong with it.
        defect: MeshDefect,
    },
}

impl Unmet {
    /// The condition this is a case of.
    pub fn condition(&self) -> Condition {
        match self {
            Unmet::OtherArrangement => Condition::Arrangement,
            Unmet::TeethOutOfRange { .. } | Unmet::PlanetsOutOfRange { .. } => Condition::Ranges,
            Unmet::NotOnHand { .. } => Condition::Stock,
            Unmet::NoRatio | Unmet::Ratio { .. } => Condition::Ratio,
            Unmet::Direction { .. } => Condition::Direction,
            Unmet::RingNotLarger { .. } => Condition::RingSize,
            Unmet::Coaxiality { .. } => Condition::Coaxiality,
            Unmet::Assembly { .. } | Unmet::TooFewPlaces { .. } => Condition::Assembly,
            Unmet::Clearance { .. } => Condition::Clearance,
            Unmet::Mesh { .. } => Condition::Meshes,
        }
    }
}

impl fmt::Display for Unmet {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Unmet::OtherArrangement => {
                write!(f, "the tooth counts are of another arrangement than the one asked for")
            }
            Unmet::TeethOutOfRange { member, teeth, range } => {
                write!(f, "{teeth} teeth on the {member} lie outside the range {range}")
            }
            Unmet::NotOnHand { ring, teeth, wanted, on_hand } => write!(
                f,
                "it needs {wanted} {}{teeth}-tooth {} and {on_hand} {} on hand",
                if *wanted == 1 { "" } else { "× " },
                if *ring { "ring gear" } else { "gear" },
                if *on_hand == 1 { "is" } else { "are" }
            ),
            Unmet::PlanetsOutOfRange { planets, range } => {
                write!(f, "{planets} planets lie outside the range {range}")
            }
            Unmet::NoRatio => write!(f, "the train cannot be driven this way: the output would not turn"),
            Unmet::Ratio { ratio, error } => {
                write!(f, "ratio {ratio} is {:+.4}% from the target, outside the tolerance", error * 100.0)
            }
            Unmet::Direction { wanted } => write!(
                f,
                "the output would not turn the {} way as the input",
                match wanted {
                    Direction::Same => "same",
                    Direction::Opposite => "opposite",
                }
            ),
            Unmet::RingNotLarger { planet, ring } => {
                write!(
                    f,
                    "a {ring}-tooth ring cannot hold a {planet}-tooth planet gear: the ring needs more teeth"
                )
            }
            Unmet::Coaxiality { needed, allowed } => {
                let shown = |x: &Option<f64>| x.map_or("unreachable".to_string(), |x| format!("{x:.3}"));
                write!(
                    f,
                    "not coaxial: the meshes would need profile shifts of {} and {} at the carrier's \
                     centre distance, outside the allowed {:.3} to {:.3}",
                    shown(&needed[0]),
                    shown(&needed[1]),
                    allowed.0,
                    allowed.1
                )
            }
            Unmet::Assembly { planets, places } => write!(
                f,
                "{planets} equally spaced planets cannot be assembled: a planet fits at {places} places \
                 round the carrier, not a multiple of {planets}"
            ),
            Unmet::TooFewPlaces { planets, places } => {
                write!(f, "{planets} planets cannot be assembled: a planet fits at only {places} places")
            }
            Unmet::Clearance { gap_mm, margin_mm } => {
                if *gap_mm < 0.0 {
                    write!(f, "neighbouring planets' tip circles would overlap by {:.3} mm", -gap_mm)
                } else {
                    write!(
                        f,
                        "neighbouring planets' tip circles would clear by {gap_mm:.3} mm, less than the \
                         {margin_mm:.3} mm wanted"
                    )
                }
            }
            Unmet::Mesh { teeth, defect } => match teeth {
                MeshTeeth::External([s, p]) => write!(f, "sun {s} with planet {p}: {defect}"),
                MeshTeeth::Internal([p, r]) => write!(f, "planet {p} in ring {r}: {defect}"),
            },
        }
    }
}

/// The carrier of a design: its centre distance `m·((s1 + s2)/4 + offset_modules)` and each
/// gear's shift, or why the two meshes cannot share that centre distance within `allowed`
/// (each mesh's shift, in modules). With `on_hand` every gear is taken as it was cut,
/// standard: no gear is shifted, not even to split a mesh's zero shift sum against undercut
/// (a gear on the shelf cannot be re-cut), so `allowed` must be `(0, 0)`.
pub fn carrier(
    system: &ToothSystem,
    teeth: &Teeth,
    allowed: (f64, f64),
    offset_modules: f64,
    on_hand: bool,
) -> Result<Carrier, Unmet> {
    let meshes = teeth.meshes();
    for mesh in meshes {
        if let MeshTeeth::Internal([planet, ring]) = mesh {
            if ring <= planet {
                return Err(Unmet::RingNotLarger { planet, ring });
            }
        }
    }
    let doubled = meshes.map(MeshTeeth::doubled_standard_distance);
    let m = system.module_mm();
    let a_w = m * ((doubled[0] + doubled[1]) as f64 / 4.0 + offset_modules);
    let mesh_shift = if doubled[0] == doubled[1] && offset_modules == 0.0 {
        // Coaxial unshifted: keep the zero exact rather than round-trip it through acos.
        [Some(0.0), Some(0.0)]
    } else {
        meshes.map(|mesh| match mesh {
            MeshTeeth::External(t) => system.shift_sum_for_centre_distance(t, a_w),
            MeshTeeth::Internal(t) => system.internal_shift_difference_for_centre_distance(t, a_w),
        })
    };
    let within = |x: &Option<f64>| {
        x.is_some_and(|x| x >= allowed.0 - SHIFT_TOLERANCE && x <= allowed.1 + SHIFT_TOLERANCE)
    };
    let [Some(first), Some(second)] = mesh_shift else {
        return Err(Unmet::Coaxiality { needed: mesh_shift, allowed });
    };
    if !mesh_shift.iter().all(within) {
        return Err(Unmet::Coaxiality { needed: mesh_shift, allowed });
    }
    let sums = [first, second];
    let clear_of_undercut = |z: u32| system.min_shift(z).max(0.0);
    let mut shift = [[0.0; 2]; 2];
    let mut tip_shortening = [0.0; 2];
    for (i, mesh) in meshes.iter().enumerate().filter(|_| !on_hand) {
        match *mesh {
            MeshTeeth::External(t) => {
                shift[i] = system.split_shift_sum(t, sums[i]);
                tip_shortening[i] = system.tip_shortening(t, sums[i], a_w);
            }
            MeshTeeth::Internal([planet, _]) => {
                let planet_shift =
                    if teeth.single_planet_gear() { shift[0][1] } else { clear_of_undercut(planet) };
                shift[i] = [planet_shift, planet_shift + sums[i]];
                if teeth.single_planet_gear() {
                    tip_shortening[i] = tip_shortening[0];
                }
            }
        }
    }
    let planet_gears = teeth.planet_gears();
    // The planet is the second gear of an external mesh and the first of an internal one.
    let planet_shift = |i: usize| match meshes[i] {
        MeshTeeth::External(_) => shift[i][1],
        MeshTeeth::Internal(_) => shift[i][0],
    };
    let planet_tip_diameter_mm =
        [0, 1].map(|i| system.tip_diameter_mm(planet_gears[i], planet_shift(i), tip_shortening[i]));
    Ok(Carrier { centre_distance_mm: a_w, mesh_shift: sums, shift, tip_shortening, planet_tip_diameter_mm })
}

/// The number of places round the carrier at which a planet fits, `L` (see the module
/// documentation). For a two-ring train whose output cannot turn (`Zr2·Zp1 = Zr1·Zp2`) a planet
/// fits anywhere; then 0.
pub fn places(teeth: &Teeth) -> u64 {
    let w = u64::from;
    match *teeth {
        Teeth::Simple { sun, ring, .. } => w(sun) + w(ring),
        Teeth::Stepped { sun, planet, ring } => {
            let g = gcd(u128::from(planet[0]), u128::from(planet[1])) as u64;
            (w(sun) * w(planet[1]) + w(ring) * w(planet[0])) / g
        }
        Teeth::TwoRing { planet, ring } => {
            let g = gcd(u128::from(planet[0]), u128::from(planet[1])) as u64;
            (w(ring[1]) * w(planet[0])).abs_diff(w(ring[0]) * w(planet[1])) / g
        }
    }
}

/// Where `planets` planets go round the carrier of `teeth`, spaced as `spacing` says.
///
/// Equally spaced, planet `k` takes place `k·L/N`, which needs `L/N` whole
/// ([`Unmet::Assembly`]). Nearly equal, planet `k` takes the place nearest to `k·L/N`,
/// `round(k·L/N)` with halves rounded up, which needs `L ≥ N` ([`Unmet::TooFewPlaces`]); when
/// `L/N` is whole these are the equal places.
pub fn positions(teeth: &Teeth, planets: u32, spacing: Spacing) -> Result<Positions, Unmet> {
    let n = u64::from(planets);
    let mut l = places(teeth);
    if l == 0 {
        // Any angle fits; equal spacing is one of them.
        l = n;
    }
    match spacing {
        Spacing::Equal if l % n != 0 => Err(Unmet::Assembly { planets, places: l }),
        Spacing::NearEqual if l < n => Err(Unmet::TooFewPlaces { planets, places: l }),
        _ => Ok(Positions { places: l, at: (0..n).map(|k| (2 * k * l + n) / (2 * n)).collect() }),
    }
}

/// The gap between the tip circles of the closest neighbouring planets, mm:
/// `2·a_w·sin(π·step/L) − da`, with `da` the larger planet gear's tip diameter; or
/// [`Unmet::Clearance`] when it is not more than `margin_mm`.
pub fn neighbour_gap(carrier: &Carrier, positions: &Positions, margin_mm: f64) -> Result<f64, Unmet> {
    let angle = std::f64::consts::PI * positions.smallest_step() as f64 / positions.places as f64;
    let tip = carrier.planet_tip_diameter_mm[0].max(carrier.planet_tip_diameter_mm[1]);
    let gap_mm = 2.0 * carrier.centre_distance_mm * angle.sin() - tip;
    if gap_mm > margin_mm {
        Ok(gap_mm)
    } else {
        Err(Unmet::Clearance { gap_mm, margin_mm })
    }
}

/// Both meshes of `teeth` on `carrier`, in the order of [`Teeth::meshes`].
pub fn planet_meshes(
    system: &ToothSystem,
    teeth: &Teeth,
    carrier: &Carrier,
) -> [Result<PlanetMesh, MeshDefect>; 2] {
    let a_w = carrier.centre_distance_mm;
    let meshes = teeth.meshes();
    [0, 1].map(|i| match meshes[i] {
        MeshTeeth::External(t) => mesh_geometry(
            system,
            t,
            Mounting::CutGears {
                shift: carrier.shift[i],
                tip_shortening: carrier.tip_shortening[i],
                centre_distance_mm: a_w,
            },
        )
        .map(PlanetMesh::External),
        MeshTeeth::Internal(t) => internal_mesh_geometry(
            system,
            t,
            InternalMounting::PinionShiftAtCentreDistance {
                pinion_shift: carrier.shift[i][0],
                pinion_tip_shortening: carrier.tip_shortening[i],
                centre_distance_mm: a_w,
            },
        )
        .map(PlanetMesh::Internal),
    })
}

/// Every defect of the worked-out meshes under `limits`, each with its mesh.
pub fn mesh_defects(
    teeth: &Teeth,
    meshes: &[Result<PlanetMesh, MeshDefect>; 2],
    limits: &MeshLimits,
) -> Vec<Unmet> {
    let names = teeth.meshes();
    let mut unmet = Vec::new();
    for (i, mesh) in meshes.iter().enumerate() {
        let defects = match mesh {
            Ok(PlanetMesh::External(g)) => check_mesh(g, limits),
            Ok(PlanetMesh::Internal(g)) => check_internal_mesh(g, limits),
            Err(defect) => vec![*defect],
        };
        unmet.extend(defects.into_iter().map(|defect| Unmet::Mesh { teeth: names[i], defect }));
    }
    unmet
}

/// The ratio of `teeth` and its error when within the problem's tolerance and direction.
pub fn ratio_within(problem: &PlanetaryProblem, teeth: &Teeth) -> Result<(SpeedRatio, RelError), Unmet> {
    let spec = problem.spec();
    let ratio = spec.arrangement.ratio(teeth).ok_or(Unmet::NoRatio)?;
    let error = RelError::of(ratio.magnitude.num(), ratio.magnitude.den(), spec.ratio);
    if !error.within(spec.tolerance) {
        return Err(Unmet::Ratio { ratio, error: error.to_f64() });
    }
    match spec.direction {
        Some(wanted) if wanted != ratio.direction => Err(Unmet::Direction { wanted }),
        _ => Ok((ratio, error)),
    }
}

/// Judges one design, `teeth` with `planets` planets, against every condition of `problem`:
/// the design with what the conditions worked out, or every condition it fails, in the order
/// ranges, ratio and direction, coaxiality, assembly, neighbouring planets, meshes. A condition
/// that needs what a failed one would have worked out (the clearance needs the carrier) is not
/// judged.
pub fn check_design(problem: &PlanetaryProblem, teeth: &Teeth, planets: u32) -> Result<Design, Vec<Unmet>> {
    let spec = problem.spec();
    let same_arrangement = matches!(
        (spec.arrangement, teeth),
        (Arrangement::Simple { .. }, Teeth::Simple { .. })
            | (Arrangement::Stepped { .. }, Teeth::Stepped { .. })
            | (Arrangement::TwoRing, Teeth::TwoRing { .. })
    );
    if !same_arrangement {
        return Err(vec![Unmet::OtherArrangement]);
    }
    let mut unmet = Vec::new();
    for g in teeth.gears() {
        let range = spec.range_of(g.gear);
        if !range.contains(g.teeth) {
            unmet.push(Unmet::TeethOutOfRange { member: g.gear.name(), teeth: g.teeth, range });
        }
    }
    if !spec.planets.contains(planets) {
        unmet.push(Unmet::PlanetsOutOfRange { planets, range: spec.planets });
    }
    if let Some(stock) = problem.stock() {
        unmet.extend(stock.shortfalls(teeth, planets));
    }
    let ratio = ratio_within(problem, teeth).map_err(|u| unmet.push(u)).ok();
    let carrier = carrier(
        problem.system(),
        teeth,
        spec.shift_sum,
        spec.carrier_offset_modules,
        problem.stock().is_some(),
    )
    .map_err(|u| unmet.push(u))
    .ok();
    let positions = positions(teeth, planets, spec.spacing).map_err(|u| unmet.push(u)).ok();
    let gap = match (&carrier, &positions) {
        (Some(c), Some(p)) => neighbour_gap(c, p, spec.tip_clearance_mm).map_err(|u| unmet.push(u)).ok(),
        _ => None,
    };
    let meshes = carrier.as_ref().map(|c| planet_meshes(problem.system(), teeth, c));
    if let (Some(limits), Some(meshes)) = (&spec.mesh_limits, &meshes) {
        unmet.extend(mesh_defects(teeth, meshes, limits));
    }
    match (ratio, carrier, positions, gap, meshes) {
        (Some((ratio, error)), Some(carrier), Some(positions), Some(neighbour_gap_mm), Some(meshes))
            if unmet.is_empty() =>
        {
            let on_hand_defects = match (problem.stock(), &spec.mesh_limits) {
                (Some(_), None) => mesh_defects(teeth, &meshes, &MeshLimits::default()),
                _ => Vec::new(),
            };
            Ok(Design {
                teeth: *teeth,
                planets,
                ratio,
                error,
                carrier,
                positions,
                neighbour_gap_mm,
                meshes,
                on_hand_defects,
            })
        }
        _ => Err(unmet),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::defect::InternalDefect;
    use crate::numbers::rational::Ratio;
    use crate::trades::planetary::{Member, PlanetarySpec};

    fn problem(spec: PlanetarySpec) -> PlanetaryProblem {
        PlanetaryProblem::new(spec).unwrap()
    }

    fn simple(ratio: u64) -> PlanetarySpec {
        PlanetarySpec {
            ring_teeth: crate::numbers::range::IntRange { lo: 30, hi: 200 },
            ..PlanetarySpec::reduction(Ratio::integer(ratio))
        }
    }

    #[test]
    fn sun_20_planet_30_ring_80_takes_four_planets() {
        // Conditions from check-values.md, "Gear measurement and internal gears" (published
        // relations, from memory): coaxial unshifted since 80 = 20 + 2·30; equal spacing needs
        // (20 + 80)/N whole; neighbours clear when (20 + 30)·sin(π/N) > 30 + 2 (in modules).
        // Computed here: N = 3 fails assembly (100/3), N = 4 passes both (35.36 > 32),
        // N = 5 assembles (100/5) but 50·sin 36° = 29.39 < 32, so neighbours overlap.
        let p = problem(PlanetarySpec { tip_clearance_mm: 0.0, ..simple(5) });
        let teeth = Teeth::Simple { sun: 20, planet: 30, ring: 80 };
        assert_eq!(
            check_design(&p, &teeth, 3).unwrap_err(),
            vec![Unmet::Assembly { planets: 3, places: 100 }]
        );
        let four = check_design(&p, &teeth, 4).unwrap();
        assert_eq!(four.carrier.centre_distance_mm, 25.0);
        assert_eq!(four.carrier.mesh_shift, [0.0, 0.0]);
        assert_eq!(four.positions.at, vec![0, 25, 50, 75]);
        assert_eq!(four.positions.angles_deg(), vec![0.0, 90.0, 180.0, 270.0]);
        assert!((four.neighbour_gap_mm - (50.0 * std::f64::consts::FRAC_PI_4.sin() - 32.0)).abs() < 1e-12);
        match &check_design(&p, &teeth, 5).unwrap_err()[..] {
            [Unmet::Clearance { gap_mm, margin_mm }] => {
                assert!((gap_mm - (50.0 * 36f64.to_radians().sin() - 32.0)).abs() < 1e-12);
                assert_eq!(*margin_mm, 0.0);
            }
            other => panic!("{other:?}"),
        }
        assert_eq!(
            Unmet::Assembly { planets: 3, places: 100 }.to_string(),
            "3 equally spaced planets cannot be assembled: a planet fits at 100 places round the carrier, \
             not a multiple of 3"
        );
    }

    #[test]
    fn clearance_margin_is_strict() {
        // With N = 4 the gap is 50·sin 45° − 32 = 3.355 mm: a margin just below passes, the gap
        // itself does not ("clear by more than the margin").
        let teeth = Teeth::Simple { sun: 20, planet: 30, ring: 80 };
        let gap = 50.0 * std::f64::consts::FRAC_PI_4.sin() - 32.0;
        assert!(check_design(
            &problem(PlanetarySpec { tip_clearance_mm: gap - 1e-9, ..simple(5) }),
            &teeth,
            4
        )
        .is_ok());
        let err = check_design(&problem(PlanetarySpec { tip_clearance_mm: gap, ..simple(5) }), &teeth, 4)
            .unwrap_err();
        assert!(matches!(err[..], [Unmet::Clearance { .. }]));
    }

    #[test]
    fn every_failing_condition_is_named() {
        let p = problem(PlanetarySpec { tolerance: Ratio::new(1, 100).unwrap(), ..simple(5) });
        // 21/30/80: ratio 101/21 is 3.8% low, 21 + 2·30 ≠ 80 with no shift allowed, and 101
        // places do not split in four.
        let teeth = Teeth::Simple { sun: 21, planet: 30, ring: 80 };
        let unmet = check_design(&p, &teeth, 4).unwrap_err();
        assert!(matches!(unmet[0], Unmet::Ratio { .. }), "{unmet:?}");
        assert!(matches!(unmet[1], Unmet::Coaxiality { allowed: (0.0, 0.0), .. }), "{unmet:?}");
        assert_eq!(unmet[2], Unmet::Assembly { planets: 4, places: 101 });
        assert_eq!(unmet.len(), 3);
        assert!(unmet[0].to_string().starts_with("ratio 101/21 is -3.8095% from the target"));
        assert!(unmet[1].to_string().starts_with("not coaxial: the meshes would need profile shifts of "));
        // Out of range and the wrong direction.
        let p = problem(PlanetarySpec {
            arrangement: Arrangement::Simple { fixed: Member::Carrier, input: Member::Sun },
            direction: Some(Direction::Same),
            ..simple(4)
        });
        let unmet = check_design(&p, &Teeth::Simple { sun: 20, planet: 30, ring: 80 }, 9).unwrap_err();
        assert_eq!(unmet[0], Unmet::PlanetsOutOfRange { planets: 9, range: p.spec().planets });
        assert_eq!(unmet[1], Unmet::Direction { wanted: Direction::Same });
        assert_eq!(unmet[1].to_string(), "the output would not turn the same way as the input");
        assert_eq!(
            check_design(&p, &Teeth::TwoRing { planet: [20, 21], ring: [80, 82] }, 3).unwrap_err(),
            vec![Unmet::OtherArrangement]
        );
    }

    #[test]
    fn profile_shift_makes_an_odd_ring_coaxial() {
        // 20 + 2·30 = 80, so an 81-tooth ring needs shift: the carrier goes midway, at
        // m(50 + 51)/4 = 25.25 mm, the sun–planet pair pulled apart (positive sum) and the
        // planet–ring pair drawn in (negative difference). Both must then mesh tight there.
        let spec = PlanetarySpec {
            shift_sum: (-1.0, 1.0),
            ratio: Ratio::new(101, 20).unwrap(),
            spacing: Spacing::NearEqual,
            ..simple(5)
        };
        let p = problem(spec);
        let s = p.system();
        let teeth = Teeth::Simple { sun: 20, planet: 30, ring: 81 };
        let c = carrier(s, &teeth, (-1.0, 1.0), 0.0, false).unwrap();
        assert_eq!(c.centre_distance_mm, 25.25);
        assert!(c.mesh_shift[0] > 0.0 && c.mesh_shift[1] < 0.0);
        let a_ext = s.centre_distance_for_shift_sum([20, 30], c.shift[0][0] + c.shift[0][1]).unwrap();
        let a_int =
            s.internal_centre_distance_for_shift_difference([30, 81], c.shift[1][1] - c.shift[1][0]).unwrap();
        assert!((a_ext - 25.25).abs() < 1e-9 && (a_int - 25.25).abs() < 1e-9);
        // One planet gear: the same shift in both meshes, its tip shortened for the sun.
        assert_eq!(c.shift[0][1], c.shift[1][0]);
        assert!(c.tip_shortening[0] > 0.0 && c.tip_shortening[1] == c.tip_shortening[0]);
        let tip = s.tip_diameter_mm(30, c.shift[0][1], c.tip_shortening[0]);
        assert_eq!(c.planet_tip_diameter_mm, [tip, tip]);
        // A narrower allowance refuses it and says what would be needed.
        match carrier(s, &teeth, (-0.1, 0.1), 0.0, false) {
            Err(Unmet::Coaxiality { needed: [Some(a), Some(b)], allowed }) => {
                assert_eq!((a, b), (c.mesh_shift[0], c.mesh_shift[1]));
                assert_eq!(allowed, (-0.1, 0.1));
            }
            other => panic!("{other:?}"),
        }
        // The worked-out meshes sit at the carrier's distance (101 places: nearly equal spacing).
        let design = check_design(&p, &teeth, 3);
        let design = design.unwrap_or_else(|u| panic!("{u:?}"));
        for mesh in &design.meshes {
            let a_w = match mesh {
                Ok(PlanetMesh::External(g)) => g.centre_distance_mm,
                Ok(PlanetMesh::Internal(g)) => g.centre_distance_mm,
                Err(d) => panic!("{d}"),
            };
            assert!((a_w - 25.25).abs() < 1e-12);
        }
    }

    #[test]
    fn ring_must_be_larger_than_its_planet() {
        let p = problem(simple(5));
        let teeth = Teeth::Stepped { sun: 10, planet: [12, 40], ring: 35 };
        assert_eq!(
            carrier(p.system(), &teeth, (0.0, 0.0), 0.0, false).unwrap_err(),
            Unmet::RingNotLarger { planet: 40, ring: 35 }
        );
    }

    #[test]
    fn nearly_equal_places() {
        // L = 20 + 81 = 101 places for 4 planets: round(101·k/4) = 0, 25, 51 (50.5 rounds up), 76.
        let teeth = Teeth::Simple { sun: 20, planet: 30, ring: 81 };
        assert_eq!(
            positions(&teeth, 4, Spacing::Equal).unwrap_err(),
            Unmet::Assembly { planets: 4, places: 101 }
        );
        let near = positions(&teeth, 4, Spacing::NearEqual).unwrap();
        assert_eq!(near.at, vec![0, 25, 51, 76]);
        assert_eq!(near.smallest_step(), 25);
        assert!(!near.equally_spaced());
        // Where equal spacing is possible, nearly equal is equal.
        let even =
            positions(&Teeth::Simple { sun: 20, planet: 30, ring: 80 }, 4, Spacing::NearEqual).unwrap();
        assert!(even.equally_spaced());
        // A two-ring train with only 2 places cannot take 3 planets at all:
        // |82·20 − 81·20| / gcd(20, 20) = 20 / 20 = 1 place.
        let two = Teeth::TwoRing { planet: [20, 20], ring: [81, 82] };
        assert_eq!(places(&two), 1);
        assert_eq!(
            positions(&two, 3, Spacing::NearEqual).unwrap_err(),
            Unmet::TooFewPlaces { planets: 3, places: 1 }
        );
    }

    /// Does a planet fit at carrier place `k` of `n` equal ones? Straight from the phase
    /// equations of the two meshes (sun fixed in place, ring fixed in place): turning the planet
    /// by `t` of a turn from the first planet's orientation, the sun mesh needs
    /// `Zp1·t ≡ (Zs + Zp1)·k/n` and the ring mesh `Zp2·t ≡ −(Zr − Zp2)·k/n` (mod 1). Try every
    /// `t` the first allows.
    fn fits_by_phase(sun: u64, p1: u64, p2: u64, ring: u64, n: u64, k: u64) -> bool {
        // t = ((Zs + Zp1)·k/n + j)/Zp1; the second condition times n·Zp1 must be ≡ 0 mod n·Zp1.
        (0..p1).any(|j| {
            let lhs = p2 * ((sun + p1) * k + j * n) + (ring - p2) * k * p1;
            lhs % (n * p1) == 0
        })
    }

    #[test]
    fn stepped_assembly_condition_matches_the_phase_equations() {
        // The general condition (Zs·Zp2 + Zr·Zp1)/(N·gcd(Zp1, Zp2)) whole (published form for
        // identical stepped planets, from memory) against the phase equations planet by planet.
        let mut both = [false, false];
        for sun in 12u64..20 {
            for p1 in 14u64..24 {
                for p2 in 12u64..18 {
                    let ring = sun + p1 + p2;
                    let teeth =
                        Teeth::Stepped { sun: sun as u32, planet: [p1 as u32, p2 as u32], ring: ring as u32 };
                    for n in 2u64..7 {
                        let by_phase = (1..n).all(|k| fits_by_phase(sun, p1, p2, ring, n, k));
                        let by_condition = positions(&teeth, n as u32, Spacing::Equal).is_ok();
                        assert_eq!(by_phase, by_condition, "{teeth:?} with {n}");
                        both[usize::from(by_condition)] = true;
                    }
                }
            }
        }
        assert_eq!(both, [true, true]);
        // For one-gear planets it is the simple train's (Zs + Zr)/N.
        for (sun, planet, ring) in [(20u64, 30u64, 80u64), (18, 27, 72), (17, 25, 67)] {
            for n in 2u64..7 {
                let by_phase = (1..n).all(|k| fits_by_phase(sun, planet, planet, ring, n, k));
                assert_eq!(by_phase, (sun + ring) % n == 0, "{sun} {planet} {ring} {n}");
            }
        }
    }

    #[test]
    fn two_ring_assembly_condition_matches_the_phase_equations() {
        // Held ring mesh: (Zr1 − Zp1)·k/n + Zp1·t ≡ 0; output ring mesh:
        // (Zr2 − Zp2)·k/n + Zp2·t ≡ 0 (mod 1), for a planet turned `t` of a turn at place k.
        let fits = |p1: u64, p2: u64, r1: u64, r2: u64, n: u64, k: u64| {
            // t = (j − (Zr1 − Zp1)·k/n)/Zp1; the second condition times n·Zp1.
            (0..p1).any(|j| {
                let lhs = (p2 * j * n + (r2 - p2) * k * p1) as i64 - (p2 * (r1 - p1) * k) as i64;
                lhs.rem_euclid((n * p1) as i64) == 0
            })
        };
        let mut both = [false, false];
        for p1 in 14u64..22 {
            for p2 in 14u64..22 {
                for r1 in 60u64..66 {
                    let r2 = r1 - p1 + p2 + 1;
                    let teeth =
                        Teeth::TwoRing { planet: [p1 as u32, p2 as u32], ring: [r1 as u32, r2 as u32] };
                    for n in 2u64..6 {
                        let by_phase = (1..n).all(|k| fits(p1, p2, r1, r2, n, k));
                        let by_condition = positions(&teeth, n as u32, Spacing::Equal).is_ok();
                        assert_eq!(by_phase, by_condition, "{teeth:?} with {n}");
                        both[usize::from(by_condition)] = true;
                    }
                }
            }
        }
        assert_eq!(both, [true, true]);
    }

    #[test]
    fn mesh_checks_name_the_mesh() {
        // Unshifted 20/30/80 at ISO 53 type A: the ring's tips reach below the planet's form
        // circle (see geometry::internal), so with the meshes checked the design is refused and
        // the planet–ring mesh named.
        let p = problem(PlanetarySpec { mesh_limits: Some(MeshLimits::default()), ..simple(5) });
        let unmet = check_design(&p, &Teeth::Simple { sun: 20, planet: 30, ring: 80 }, 4).unwrap_err();
        assert!(
            matches!(
                unmet[..],
                [Unmet::Mesh {
                    teeth: MeshTeeth::Internal([30, 80]),
                    defect: MeshDefect::Internal(InternalDefect::BelowFormCircle { pinion: 30, .. })
                }]
            ),
            "{unmet:?}"
        );
        assert!(unmet[0]
            .to_string()
            .starts_with("planet 30 in ring 80: the ring's tips would meet the 30-tooth pinion"));
    }
}
