//! Planetary (epicyclic) trains, a trade in the planetary designer's words: a sun, planets on a
//! carrier and a ring gear, one member held, one driving, the third driven. From a target
//! ratio, tooth ranges for sun, planets and ring, a planet count and a module, find every
//! arrangement of tooth counts and planets that meets the conditions a planetary train must
//! meet, count them exactly and list the best.
//!
//! Owns the planetary model and its conditions; the meshes are [`crate::geometry`]'s (external
//! for sun and planet, [`crate::geometry::internal`] for planet and ring) and the exact ratio
//! arithmetic is [`crate::numbers::rational`]'s. It imports no other trade and does not use the
//! compound-train search of [`crate::engine`]: a planetary train is not a chain of stages.
//!
//! - [`willis`]: Willis' equation, the ratio for any held and driving member, exactly;
//! - [`conditions`]: coaxiality, assembly with equally or nearly equally spaced planets,
//!   neighbouring planets' clearance, the meshes, and [`conditions::check_design`], which names
//!   every condition a given design fails;
//! - [`mod@search`]: the exact count and the best designs ([`search()`]).
//!
//! Three arrangements ([`Arrangement`]): the simple train (one planet gear meshing sun and
//! ring), stepped planets (a planet gear of `Zp1` teeth meshing the sun and one of `Zp2`
//! meshing the ring on the same planet shaft), and the two-ring train (no sun; stepped planets
//! meshing a held ring and an output ring, driven by the carrier), which gives very high ratios
//! from few parts.
//!
//! Ratio convention (ISO 1122-1, as everywhere in gearsieve): `i` = input turns per output
//! turn, held exactly as a [`Ratio`] magnitude with the output's [`Direction`] beside it.
//!
//! gearsieve sizes geometry only: see [`CAUTION`].

pub mod conditions;
pub mod search;
pub mod willis;

use crate::error::{Error, Result};
use crate::geometry::{MeshLimits, RackProfile, ToothSystem};
use crate::model::train::Direction;
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;

pub use conditions::{check_design, Carrier, Design, PlanetMesh, Positions, Unmet};
pub use search::{search, PlanetaryOutcome};
pub use willis::{willis_ratio, SpeedRatio};

/// The caution that belongs with every planetary result.
pub const CAUTION: &str = "gearsieve sizes geometry only. A planetary train that carries power needs a \
                           load-capacity rating (e.g. ISO 6336 or AGMA 2001), a check of load sharing \
                           between the planets and of the bearings, by a qualified person.";

/// Fewest teeth any gear of a planetary train may have here.
pub const MIN_TEETH: u32 = 3;

/// Most teeth any gear may have here; keeps every product of four tooth counts within `u64`.
pub const MAX_TEETH: u32 = 1000;

/// Most planets on one carrier.
pub const MAX_PLANETS: u32 = 32;

/// One of the three members of a planetary train with a sun.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Member {
    /// The sun gear, on the central axis, meshing the planets from inside.
    Sun,
    /// The ring gear (internal teeth), on the central axis, meshing the planets from outside.
    Ring,
    /// The carrier (planet carrier, arm), holding the planet shafts.
    Carrier,
}

impl Member {
    /// `sun`, `ring` or `carrier`.
    pub fn name(self) -> &'static str {
        match self {
            Member::Sun => "sun",
            Member::Ring => "ring",
            Member::Carrier => "carrier",
        }
    }
}

/// How the train is built and driven.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Arrangement {
    /// Sun, planets of one gear each, ring. Basic ratio (carrier held, sun to ring)
    /// `i0 = −Zr/Zs`. One member is `fixed`, `input` drives, the third is the output.
    Simple {
        /// The member held still.
        fixed: Member,
        /// The driving member.
        input: Member,
    },
    /// Sun meshing the planets' first gear (`Zp1`), ring meshing their second (`Zp2`), both
    /// gears fast on one planet shaft. Basic ratio `i0 = −(Zr·Zp1)/(Zs·Zp2)`.
    Stepped {
        /// The member held still.
        fixed: Member,
        /// The driving member.
        input: Member,
    },
    /// No sun: stepped planets whose first gear (`Zp1`) meshes a held ring (`Zr1`) and whose
    /// second (`Zp2`) meshes the output ring (`Zr2`); the carrier drives. Basic ratio (carrier
    /// held, held ring to output ring) `i0 = +(Zp1·Zr2)/(Zr1·Zp2)`, so the ratio carrier to
    /// output ring is `Zp1·Zr2 / (Zp1·Zr2 − Zr1·Zp2)`, large when the two products are close.
    TwoRing,
}

/// Tooth counts of one design.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Teeth {
    /// A simple train.
    Simple {
        /// Sun teeth `Zs`.
        sun: u32,
        /// Planet teeth `Zp`.
        planet: u32,
        /// Ring teeth `Zr`.
        ring: u32,
    },
    /// Stepped planets.
    Stepped {
        /// Sun teeth `Zs`.
        sun: u32,
        /// Planet teeth `[Zp1, Zp2]`: meshing the sun, meshing the ring.
        planet: [u32; 2],
        /// Ring teeth `Zr`.
        ring: u32,
    },
    /// The two-ring train.
    TwoRing {
        /// Planet teeth `[Zp1, Zp2]`: meshing the held ring, meshing the output ring.
        planet: [u32; 2],
        /// Ring teeth `[Zr1, Zr2]`: held ring, output ring.
        ring: [u32; 2],
    },
}

/// The two meshes every planet makes, as pairs of tooth counts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MeshTeeth {
    /// An external mesh `[sun, planet]`.
    External([u32; 2]),
    /// An internal mesh `[planet, ring]`.
    Internal([u32; 2]),
}

impl MeshTeeth {
    /// Twice the standard centre distance in modules: `z1 + z2` for an external mesh,
    /// `z2 − z1` for an internal one (negative when the ring is not the larger).
    pub fn doubled_standard_distance(self) -> i64 {
        match self {
            MeshTeeth::External([a, b]) => i64::from(a) + i64::from(b),
            MeshTeeth::Internal([a, b]) => i64::from(b) - i64::from(a),
        }
    }
}

impl Teeth {
    /// The two meshes a planet makes: sun–planet then planet–ring; for the two-ring train the
    /// planet with the held ring, then with the output ring.
    pub fn meshes(&self) -> [MeshTeeth; 2] {
        match *self {
            Teeth::Simple { sun, planet, ring } => {
                [MeshTeeth::External([sun, planet]), MeshTeeth::Internal([planet, ring])]
            }
            Teeth::Stepped { sun, planet, ring } => {
                [MeshTeeth::External([sun, planet[0]]), MeshTeeth::Internal([planet[1], ring])]
            }
            Teeth::TwoRing { planet, ring } => {
                [MeshTeeth::Internal([planet[0], ring[0]]), MeshTeeth::Internal([planet[1], ring[1]])]
            }
        }
    }

    /// The planet's gears `[first, second]`; both the same for a simple train.
    pub fn planet_gears(&self) -> [u32; 2] {
        match *self {
            Teeth::Simple { planet, .. } => [planet, planet],
            Teeth::Stepped { planet, .. } | Teeth::TwoRing { planet, .. } => planet,
        }
    }

    /// The largest ring's teeth: with one module, the size of the train.
    pub fn largest_ring(&self) -> u32 {
        match *self {
            Teeth::Simple { ring, .. } | Teeth::Stepped { ring, .. } => ring,
            Teeth::TwoRing { ring, .. } => ring[0].max(ring[1]),
        }
    }

    /// True when both gears of the planet are one gear (a simple train).
    pub fn single_planet_gear(&self) -> bool {
        matches!(self, Teeth::Simple { .. })
    }
}

/// How the planets are placed round the carrier.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Spacing {
    /// At equal angles, `360°/N` apart; the assembly condition must hold exactly.
    Equal,
    /// At the places where a planet can be fitted that lie nearest to equal spacing (see
    /// [`conditions::Positions`]); the carrier then needs its bores at those angles, and the
    /// planets' forces no longer cancel exactly.
    NearEqual,
}

/// What the planetary designer asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct PlanetarySpec {
    /// Arrangement and drive.
    pub arrangement: Arrangement,
    /// Input turns per output turn, magnitude (positive).
    pub ratio: Ratio,
    /// Relative tolerance on the ratio's magnitude: `|i/R − 1| ≤ T`, `0 ≤ T < 1`.
    pub tolerance: Ratio,
    /// The output's direction, when it matters.
    pub direction: Option<Direction>,
    /// Sun teeth (not used by the two-ring train).
    pub sun_teeth: IntRange,
    /// Teeth of every planet gear.
    pub planet_teeth: IntRange,
    /// Teeth of every ring.
    pub ring_teeth: IntRange,
    /// Planet counts.
    pub planets: IntRange,
    /// How the planets are spaced.
    pub spacing: Spacing,
    /// Module of every gear, mm.
    pub module_mm: f64,
    /// Pressure angle, degrees.
    pub pressure_angle_deg: f64,
    /// Basic rack profile.
    pub rack: RackProfile,
    /// Allowed profile shift per mesh, in modules, `(lo, hi)`: the sum `x_sun + x_planet` of an
    /// external mesh and the difference `x_ring − x_planet` of an internal one. `(0, 0)` allows
    /// only trains that are coaxial unshifted.
    pub shift_sum: (f64, f64),
    /// How far beyond the midway point of the two meshes' standard centre distances the
    /// carrier's centre distance is set, in modules (see [`conditions::carrier`]). Zero shares
    /// a correction equally between the meshes; a positive value gives both meshes positive
    /// shift, which full-depth internal meshes usually need to pass the mesh checks.
    pub carrier_offset_modules: f64,
    /// Least gap wanted between the tip circles of neighbouring planets, mm.
    pub tip_clearance_mm: f64,
    /// Hold each mesh to these limits ([`crate::geometry::check_mesh`] and
    /// [`crate::geometry::internal::check_internal_mesh`]); `None` leaves the meshes unchecked.
    pub mesh_limits: Option<MeshLimits>,
    /// Designs to list.
    pub limit: usize,
}

impl PlanetarySpec {
    /// A simple train, ring held, sun driving, carrier output: the plain reduction. Every
    /// other field at a modest default: tolerance zero, any direction, sun and planet 12..60,
    /// ring 40..200, three to six planets equally spaced, module 1 mm, 20°, ISO 53 type A,
    /// no profile shift, the carrier midway, 1 mm between neighbouring planets, meshes
    /// unchecked, ten listed.
    pub fn reduction(ratio: Ratio) -> PlanetarySpec {
        PlanetarySpec {
            arrangement: Arrangement::Simple { fixed: Member::Ring, input: Member::Sun },
            ratio,
            tolerance: Ratio::integer(0),
            direction: None,
            sun_teeth: IntRange { lo: 12, hi: 60 },
            planet_teeth: IntRange { lo: 12, hi: 60 },
            ring_teeth: IntRange { lo: 40, hi: 200 },
            planets: IntRange { lo: 3, hi: 6 },
            spacing: Spacing::Equal,
            module_mm: 1.0,
            pressure_angle_deg: 20.0,
            rack: RackProfile::default(),
            shift_sum: (0.0, 0.0),
            carrier_offset_modules: 0.0,
            tip_clearance_mm: 1.0,
            mesh_limits: None,
            limit: 10,
        }
    }
}

/// A validated [`PlanetarySpec`] with its tooth system worked out.
#[derive(Debug, Clone, PartialEq)]
pub struct PlanetaryProblem {
    spec: PlanetarySpec,
    system: ToothSystem,
}

impl PlanetaryProblem {
    /// Checks `spec`: tooth ranges within [`MIN_TEETH`]..=[`MAX_TEETH`] and low to high, planet
    /// counts within 2..=[`MAX_PLANETS`], a positive ratio, a tolerance below 1, a usable tooth
    /// system, a shift range from low to high, a clearance of zero or more, and a held member
    /// that is not the driving one.
    pub fn new(spec: PlanetarySpec) -> Result<PlanetaryProblem> {
        let problem = |message: String| Err(Error::problem(message));
        let mut ranges = vec![("planet", spec.planet_teeth), ("ring", spec.ring_teeth)];
        if !matches!(spec.arrangement, Arrangement::TwoRing) {
            ranges.insert(0, ("sun", spec.sun_teeth));
        }
        for (member, range) in ranges {
            if range.lo > range.hi || range.lo < MIN_TEETH || range.hi > MAX_TEETH {
                return problem(format!(
                    "the {member} tooth range must run from low to high within {MIN_TEETH}..{MAX_TEETH}, \
                     found {}..{}",
                    range.lo, range.hi
                ));
            }
        }
        if spec.planets.lo > spec.planets.hi || spec.planets.lo < 2 || spec.planets.hi > MAX_PLANETS {
            return problem(format!(
                "the planet count must run from low to high within 2..{MAX_PLANETS}, found {}..{}",
                spec.planets.lo, spec.planets.hi
            ));
        }
        if spec.ratio.is_zero() {
            return problem("the target ratio must be more than zero".into());
        }
        if spec.tolerance >= Ratio::integer(1) {
            return problem(format!("the ratio tolerance must be below 1 (100%), found {}", spec.tolerance));
        }
        let (lo, hi) = spec.shift_sum;
        if !(lo.is_finite() && hi.is_finite() && lo <= hi) {
            return problem(format!(
                "the allowed profile shift per mesh must run from low to high, found {lo} to {hi}"
            ));
        }
        if !spec.carrier_offset_modules.is_finite() {
            return problem(format!(
                "the carrier's offset from midway must be a number of modules, found {}",
                spec.carrier_offset_modules
            ));
        }
        if !(spec.tip_clearance_mm.is_finite() && spec.tip_clearance_mm >= 0.0) {
            return problem(format!(
                "the clearance between neighbouring planets must be a length of zero or more, found {} mm",
                spec.tip_clearance_mm
            ));
        }
        if let Arrangement::Simple { fixed, input } | Arrangement::Stepped { fixed, input } = spec.arrangement
        {
            if fixed == input {
                return problem(format!(
                    "the held member and the driving member must differ, both are the {}",
                    fixed.name()
                ));
            }
        }
        let system = ToothSystem::new(spec.module_mm, spec.pressure_angle_deg, spec.rack)?;
        Ok(PlanetaryProblem { spec, system })
    }

    /// The spec as validated.
    pub fn spec(&self) -> &PlanetarySpec {
        &self.spec
    }

    /// The tooth system every gear is cut to.
    pub fn system(&self) -> &ToothSystem {
        &self.system
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bad_specs_name_the_quantity() {
        let base = PlanetarySpec::reduction(Ratio::integer(5));
        let message = |spec: PlanetarySpec| match PlanetaryProblem::new(spec) {
            Err(e @ Error::Problem(_)) => e.to_string(),
            other => panic!("{other:?}"),
        };
        let m = message(PlanetarySpec { ring_teeth: IntRange { lo: 90, hi: 80 }, ..base.clone() });
        assert_eq!(m, "the ring tooth range must run from low to high within 3..1000, found 90..80");
        let m = message(PlanetarySpec { sun_teeth: IntRange { lo: 2, hi: 80 }, ..base.clone() });
        assert!(m.starts_with("the sun tooth range"), "{m}");
        let m = message(PlanetarySpec { planets: IntRange { lo: 1, hi: 3 }, ..base.clone() });
        assert!(m.starts_with("the planet count"), "{m}");
        let m = message(PlanetarySpec {
            arrangement: Arrangement::Simple { fixed: Member::Sun, input: Member::Sun },
            ..base.clone()
        });
        assert_eq!(m, "the held member and the driving member must differ, both are the sun");
        let m = message(PlanetarySpec { tolerance: Ratio::integer(1), ..base.clone() });
        assert!(m.starts_with("the ratio tolerance"), "{m}");
        let m = message(PlanetarySpec { shift_sum: (0.5, -0.5), ..base.clone() });
        assert!(m.starts_with("the allowed profile shift"), "{m}");
        let m = message(PlanetarySpec { carrier_offset_modules: f64::NAN, ..base.clone() });
        assert!(m.starts_with("the carrier's offset from midway"), "{m}");
        let m = message(PlanetarySpec { tip_clearance_mm: -1.0, ..base.clone() });
        assert!(m.starts_with("the clearance between neighbouring planets"), "{m}");
        let m = message(PlanetarySpec { module_mm: 0.0, ..base.clone() });
        assert!(m.starts_with("the module must be a positive number"), "{m}");
        // The two-ring train has no sun, so its sun range is not looked at.
        let two = PlanetarySpec {
            arrangement: Arrangement::TwoRing,
            sun_teeth: IntRange { lo: 0, hi: 0 },
            ..base.clone()
        };
        assert!(PlanetaryProblem::new(two).is_ok());
        // Quantities are named, not command-line flags.
        assert!(!message(PlanetarySpec { ring_teeth: IntRange { lo: 9, hi: 2000 }, ..base }).contains("--"));
    }

    #[test]
    fn meshes_and_sizes_of_each_arrangement() {
        let simple = Teeth::Simple { sun: 20, planet: 30, ring: 80 };
        assert_eq!(simple.meshes(), [MeshTeeth::External([20, 30]), MeshTeeth::Internal([30, 80])]);
        // Common practice: unshifted coaxiality is a = m(Zs + Zp)/2 = m(Zr − Zp)/2.
        assert_eq!(simple.meshes().map(MeshTeeth::doubled_standard_distance), [50, 50]);
        assert_eq!(simple.planet_gears(), [30, 30]);
        let stepped = Teeth::Stepped { sun: 20, planet: [40, 20], ring: 80 };
        assert_eq!(stepped.meshes().map(MeshTeeth::doubled_standard_distance), [60, 60]);
        let two = Teeth::TwoRing { planet: [20, 21], ring: [80, 82] };
        assert_eq!(two.meshes().map(MeshTeeth::doubled_standard_distance), [60, 61]);
        assert_eq!(two.largest_ring(), 82);
        assert!(simple.single_planet_gear() && !stepped.single_planet_gear());
    }
}
