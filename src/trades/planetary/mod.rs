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
//! - [`mod@search`]: the exact count and the best designs ([`search()`]), and with
//!   [`search_explained`] the candidates left out, counted by the first condition each fails;
//! - [`layout`]: the gears by name ([`layout::Gear`]), their circles as cut, and where the
//!   planets sit, for the formats and drawings.
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
pub mod layout;
pub mod search;
pub mod willis;

use std::collections::BTreeMap;

use crate::error::{Error, Message, Quantity, Result};
use crate::geometry::{MeshLimits, RackProfile, ToothSystem};
use crate::model::train::Direction;
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;

use layout::Gear;

pub use conditions::{check_design, Carrier, Condition, Design, PlanetMesh, Positions, Unmet};
pub use search::{search, search_explained, search_with, ConditionCount, LeftOut, PlanetaryOutcome};
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
    /// Teeth of every planet gear that has no range of its own below (see
    /// [`PlanetarySpec::range_of`]).
    pub planet_teeth: IntRange,
    /// Teeth of the planet gear meshing the ring: a stepped planet's second gear, a two-ring
    /// planet's gear meshing the held ring; `None`: as [`Self::planet_teeth`].
    pub planet_ring_teeth: Option<IntRange>,
    /// Teeth of a two-ring planet's gear meshing the output ring; `None`: as
    /// [`Self::planet_teeth`].
    pub planet_ring2_teeth: Option<IntRange>,
    /// Teeth of the ring (the held ring of a two-ring train, and its output ring unless
    /// [`Self::output_ring_teeth`] says otherwise).
    pub ring_teeth: IntRange,
    /// Teeth of the output ring of a two-ring train; `None`: as [`Self::ring_teeth`].
    pub output_ring_teeth: Option<IntRange>,
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
    /// The teeth `gear` may have.
    pub fn range_of(&self, gear: Gear) -> IntRange {
        match gear {
            Gear::Sun => self.sun_teeth,
            Gear::Planet | Gear::PlanetSun => self.planet_teeth,
            Gear::PlanetRing => self.planet_ring_teeth.unwrap_or(self.planet_teeth),
            Gear::PlanetRing2 => self.planet_ring2_teeth.unwrap_or(self.planet_teeth),
            Gear::Ring => self.ring_teeth,
            Gear::Ring2 => self.output_ring_teeth.unwrap_or(self.ring_teeth),
        }
    }

    /// The one design the ranges allow when each holds a single tooth count: a design asked
    /// for by name.
    pub fn single_teeth(&self) -> Option<Teeth> {
        let one = |gear| {
            let r = self.range_of(gear);
            (r.lo == r.hi).then_some(r.lo)
        };
        Some(match self.arrangement {
            Arrangement::Simple { .. } => {
                Teeth::Simple { sun: one(Gear::Sun)?, planet: one(Gear::Planet)?, ring: one(Gear::Ring)? }
            }
            Arrangement::Stepped { .. } => Teeth::Stepped {
                sun: one(Gear::Sun)?,
                planet: [one(Gear::PlanetSun)?, one(Gear::PlanetRing)?],
                ring: one(Gear::Ring)?,
            },
            Arrangement::TwoRing => Teeth::TwoRing {
                planet: [one(Gear::PlanetRing)?, one(Gear::PlanetRing2)?],
                ring: [one(Gear::Ring)?, one(Gear::Ring2)?],
            },
        })
    }

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
            planet_ring_teeth: None,
            planet_ring2_teeth: None,
            ring_teeth: IntRange { lo: 40, hi: 200 },
            output_ring_teeth: None,
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

/// Gears on hand for a planetary train, all of the train's module and pressure angle: a
/// design is only made of these, in the numbers it needs (a planet gear once per planet).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PlanetaryStock {
    /// External gears (for sun and planets): teeth → how many.
    pub gears: BTreeMap<u32, u32>,
    /// Ring gears (internal teeth): teeth → how many.
    pub rings: BTreeMap<u32, u32>,
    /// Gears of the catalogues in other modules or pressure angles, which cannot mesh here.
    pub left_out: u64,
}

impl PlanetaryStock {
    /// What the design of `teeth` with `planets` planets needs and the stock lacks, gear by
    /// gear (external gears first, by teeth; then rings). Empty when everything is on hand.
    pub fn shortfalls(&self, teeth: &Teeth, planets: u32) -> Vec<Unmet> {
        let mut need: BTreeMap<(bool, u32), u32> = BTreeMap::new();
        for g in teeth.gears() {
            let n = if g.gear.on_planet() { planets } else { 1 };
            *need.entry((g.gear.internal(), g.teeth)).or_default() += n;
        }
        need.into_iter()
            .filter_map(|((ring, teeth), wanted)| {
                let shelf = if ring { &self.rings } else { &self.gears };
                let on_hand = shelf.get(&teeth).copied().unwrap_or(0);
                (on_hand < wanted).then_some(Unmet::NotOnHand { ring, teeth, wanted, on_hand })
            })
            .collect()
    }

    /// Whether every gear of the design is on hand.
    pub fn holds(&self, teeth: &Teeth, planets: u32) -> bool {
        self.shortfalls(teeth, planets).is_empty()
    }
}

/// A validated [`PlanetarySpec`] with its tooth system worked out.
#[derive(Debug, Clone, PartialEq)]
pub struct PlanetaryProblem {
    spec: PlanetarySpec,
    system: ToothSystem,
    stock: Option<PlanetaryStock>,
}

impl PlanetaryProblem {
    /// Checks `spec`: tooth ranges within [`MIN_TEETH`]..=[`MAX_TEETH`] and low to high (the
    /// second planet gear's and the output ring's only for the arrangements that have them),
    /// planet counts within 2..=[`MAX_PLANETS`], a positive ratio, a tolerance below 1, a
    /// positive module, a pressure angle between 0° and 90°, a shift range from low to high, a
    /// finite carrier offset, a clearance of zero or more, and a held member that is not the
    /// driving one. Each error names the [`Quantity`] at fault.
    pub fn new(spec: PlanetarySpec) -> Result<PlanetaryProblem> {
        let refuse = |quantity: Quantity, message: String| Err(Error::value(quantity, message));
        let (stepped, two_ring) = match spec.arrangement {
            Arrangement::Simple { .. } => (false, false),
            Arrangement::Stepped { .. } => (true, false),
            Arrangement::TwoRing => (false, true),
        };
        let mut ranges = vec![
            (Quantity::PlanetTeeth, Some(spec.planet_teeth)),
            (Quantity::RingTeeth, Some(spec.ring_teeth)),
        ];
        if !two_ring {
            ranges.insert(0, (Quantity::SunTeeth, Some(spec.sun_teeth)));
        }
        ranges.push((Quantity::PlanetRingTeeth, spec.planet_ring_teeth));
        ranges.push((Quantity::PlanetRing2Teeth, spec.planet_ring2_teeth));
        ranges.push((Quantity::OutputRingTeeth, spec.output_ring_teeth));
        for (quantity, range) in ranges {
            let Some(range) = range else { continue };
            if range.lo > range.hi || range.lo < MIN_TEETH || range.hi > MAX_TEETH {
                return refuse(
                    quantity,
                    format!("{range} is not a range from low to high within {MIN_TEETH}..{MAX_TEETH}"),
                );
            }
        }
        if spec.planet_ring_teeth.is_some() && !(stepped || two_ring) {
            return refuse(
                Quantity::PlanetRingTeeth,
                "the planet of a simple train is one gear, meshing sun and ring; wanted stepped planets \
                 or a two-ring train"
                    .into(),
            );
        }
        if spec.planet_ring2_teeth.is_some() && !two_ring {
            return refuse(Quantity::PlanetRing2Teeth, "only the two-ring train has an output ring".into());
        }
        if spec.output_ring_teeth.is_some() && !two_ring {
            return refuse(Quantity::OutputRingTeeth, "only the two-ring train has an output ring".into());
        }
        if spec.planets.lo > spec.planets.hi || spec.planets.lo < 2 || spec.planets.hi > MAX_PLANETS {
            return refuse(
                Quantity::PlanetCount,
                format!("{} is not a range from low to high within 2..{MAX_PLANETS}", spec.planets),
            );
        }
        if spec.ratio.is_zero() {
            return refuse(Quantity::TargetRatio, "zero is no ratio; wanted more than zero".into());
        }
        if spec.tolerance >= Ratio::integer(1) {
            return refuse(Quantity::Tolerance, format!("{} is not below 1 (100%)", spec.tolerance));
        }
        if !(spec.module_mm.is_finite() && spec.module_mm > 0.0) {
            return refuse(
                Quantity::Module,
                format!("{} is not a positive number of millimetres", spec.module_mm),
            );
        }
        if !(spec.pressure_angle_deg > 0.0 && spec.pressure_angle_deg < 90.0) {
            return refuse(
                Quantity::PressureAngle,
                format!("{} does not lie between 0 and 90 degrees", spec.pressure_angle_deg),
            );
        }
        let (lo, hi) = spec.shift_sum;
        if !(lo.is_finite() && hi.is_finite() && lo <= hi) {
            return refuse(
                Quantity::ShiftSum,
                format!("the profile shift allowed per mesh must run from low to high, found {lo} to {hi}"),
            );
        }
        if !spec.carrier_offset_modules.is_finite() {
            return refuse(
                Quantity::CarrierOffset,
                format!("{} is not a number of modules", spec.carrier_offset_modules),
            );
        }
        if !(spec.tip_clearance_mm.is_finite() && spec.tip_clearance_mm >= 0.0) {
            return refuse(
                Quantity::PlanetClearance,
                format!("{} mm is not a length of zero or more", spec.tip_clearance_mm),
            );
        }
        if let Arrangement::Simple { fixed, input } | Arrangement::Stepped { fixed, input } = spec.arrangement
        {
            if fixed == input {
                return Err(Error::value(
                    Quantity::DrivingMember,
                    Message::from(format!("the {} cannot drive while held by ", input.name()))
                        .quantity(Quantity::HeldMember)
                        .text("; wanted another member"),
                ));
            }
        }
        // The checks above leave only the basic rack, which callers do not choose here.
        let system = ToothSystem::new(spec.module_mm, spec.pressure_angle_deg, spec.rack)?;
        Ok(PlanetaryProblem { spec, system, stock: None })
    }

    /// The same problem drawn from gears on hand only. Gears on hand are taken as cut
    /// standard and are never re-cut, so the spec must allow no profile shift (`shift_sum`
    /// `(0, 0)`; refused with [`Quantity::ShiftSum`] otherwise), and a stock without a ring or
    /// without external gears is refused with [`Quantity::Stock`].
    pub fn with_stock(mut self, stock: PlanetaryStock) -> Result<PlanetaryProblem> {
        if self.spec.shift_sum != (0.0, 0.0) {
            return Err(Error::value(
                Quantity::ShiftSum,
                "gears on hand are used as cut (standard) and cannot be shifted; wanted 0..0 with gears \
                 from stock"
                    .to_string(),
            ));
        }
        if stock.rings.is_empty() || stock.gears.is_empty() {
            return Err(Error::value(
                Quantity::Stock,
                format!(
                    "a planetary train needs ring gears (rows with internal = yes) and external gears of \
                     module {} mm, {}°; the catalogues hold {} ring kinds and {} external kinds of it",
                    crate::model::pool::fmt_num(self.spec.module_mm),
                    crate::model::pool::fmt_num(self.spec.pressure_angle_deg),
                    stock.rings.len(),
                    stock.gears.len()
                ),
            ));
        }
        self.stock = Some(stock);
        Ok(self)
    }

    /// The gears on hand, when the problem is drawn from stock.
    pub fn stock(&self) -> Option<&PlanetaryStock> {
        self.stock.as_ref()
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
        let refused = |spec: PlanetarySpec| match PlanetaryProblem::new(spec) {
            Err(e @ Error::Value { quantity, .. }) => (quantity, e.to_string()),
            other => panic!("{other:?}"),
        };
        let (q, m) = refused(PlanetarySpec { ring_teeth: IntRange { lo: 90, hi: 80 }, ..base.clone() });
        assert_eq!(q, Quantity::RingTeeth);
        assert_eq!(m, "the ring teeth: 90..80 is not a range from low to high within 3..1000");
        let cases = [
            (PlanetarySpec { sun_teeth: IntRange { lo: 2, hi: 80 }, ..base.clone() }, Quantity::SunTeeth),
            (
                PlanetarySpec { planet_teeth: IntRange { lo: 20, hi: 1001 }, ..base.clone() },
                Quantity::PlanetTeeth,
            ),
            (PlanetarySpec { planets: IntRange { lo: 1, hi: 3 }, ..base.clone() }, Quantity::PlanetCount),
            (PlanetarySpec { planets: IntRange { lo: 3, hi: 33 }, ..base.clone() }, Quantity::PlanetCount),
            (PlanetarySpec { ratio: Ratio::integer(0), ..base.clone() }, Quantity::TargetRatio),
            (PlanetarySpec { tolerance: Ratio::integer(1), ..base.clone() }, Quantity::Tolerance),
            (PlanetarySpec { module_mm: 0.0, ..base.clone() }, Quantity::Module),
            (PlanetarySpec { module_mm: f64::INFINITY, ..base.clone() }, Quantity::Module),
            (PlanetarySpec { pressure_angle_deg: 90.0, ..base.clone() }, Quantity::PressureAngle),
            (PlanetarySpec { shift_sum: (0.5, -0.5), ..base.clone() }, Quantity::ShiftSum),
            (PlanetarySpec { carrier_offset_modules: f64::NAN, ..base.clone() }, Quantity::CarrierOffset),
            (PlanetarySpec { tip_clearance_mm: -1.0, ..base.clone() }, Quantity::PlanetClearance),
            // A second planet gear or an output ring the arrangement does not have.
            (
                PlanetarySpec { planet_ring_teeth: Some(IntRange { lo: 20, hi: 30 }), ..base.clone() },
                Quantity::PlanetRingTeeth,
            ),
            (
                PlanetarySpec {
                    arrangement: Arrangement::Stepped { fixed: Member::Ring, input: Member::Sun },
                    planet_ring2_teeth: Some(IntRange { lo: 20, hi: 30 }),
                    ..base.clone()
                },
                Quantity::PlanetRing2Teeth,
            ),
            (
                PlanetarySpec { output_ring_teeth: Some(IntRange { lo: 80, hi: 90 }), ..base.clone() },
                Quantity::OutputRingTeeth,
            ),
            (
                PlanetarySpec {
                    arrangement: Arrangement::TwoRing,
                    output_ring_teeth: Some(IntRange { lo: 90, hi: 2000 }),
                    ..base.clone()
                },
                Quantity::OutputRingTeeth,
            ),
        ];
        for (spec, want) in cases {
            let (q, m) = refused(spec);
            assert_eq!(q, want, "{m}");
            assert!(m.starts_with(want.name()), "{m}");
            // Quantities are named, not command-line flags.
            assert!(!m.contains("--"), "{m}");
        }
        let (q, m) = refused(PlanetarySpec {
            arrangement: Arrangement::Simple { fixed: Member::Sun, input: Member::Sun },
            ..base.clone()
        });
        assert_eq!(q, Quantity::DrivingMember);
        assert_eq!(
            m,
            "the driving member: the sun cannot drive while held by the held member; wanted another member"
        );
        // The two-ring train has no sun, so its sun range is not looked at; each gear may have a
        // range of its own, and one tooth count in every range names one design.
        let two = PlanetarySpec {
            arrangement: Arrangement::TwoRing,
            sun_teeth: IntRange { lo: 0, hi: 0 },
            planet_teeth: IntRange { lo: 20, hi: 20 },
            planet_ring2_teeth: Some(IntRange { lo: 21, hi: 21 }),
            ring_teeth: IntRange { lo: 80, hi: 80 },
            output_ring_teeth: Some(IntRange { lo: 82, hi: 82 }),
            ..base.clone()
        };
        let problem = PlanetaryProblem::new(two).unwrap();
        assert_eq!(problem.spec().single_teeth(), Some(Teeth::TwoRing { planet: [20, 21], ring: [80, 82] }));
        let stepped = PlanetarySpec {
            arrangement: Arrangement::Stepped { fixed: Member::Ring, input: Member::Sun },
            planet_ring_teeth: Some(IntRange { lo: 12, hi: 20 }),
            ..base
        };
        let problem = PlanetaryProblem::new(stepped).unwrap();
        let spec = problem.spec();
        assert_eq!(spec.range_of(Gear::PlanetRing), IntRange { lo: 12, hi: 20 });
        assert_eq!(spec.range_of(Gear::PlanetSun), spec.planet_teeth);
        assert_eq!(spec.range_of(Gear::Ring2), spec.ring_teeth);
        assert_eq!(spec.single_teeth(), None);
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
