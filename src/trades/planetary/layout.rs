//! The gears of a planetary design by name, how large each is cut, and where the planets sit:
//! what the formats list gear by gear and what a drawing places to scale. Owns the naming of the
//! gears ([`Gear`]) and the circles and centres worked out from a [`Design`]'s carrier; the
//! formulas are [`crate::geometry`]'s, and what is drawn at the centres is the presentation's.

use crate::geometry::ToothSystem;

use super::conditions::Design;
use super::Teeth;

/// One gear of a planetary train, by its place in it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Gear {
    /// The sun.
    Sun,
    /// The planet gear of a simple train, meshing sun and ring.
    Planet,
    /// A stepped planet's gear meshing the sun.
    PlanetSun,
    /// A planet's gear meshing the ring: on stepped planets, and on those of a two-ring train
    /// (the held ring).
    PlanetRing,
    /// A two-ring train's planet gear meshing the output ring.
    PlanetRing2,
    /// The ring (the held ring of a two-ring train).
    Ring,
    /// The output ring of a two-ring train.
    Ring2,
}

impl Gear {
    /// The gear's name in the outputs' fields: `sun`, `planet`, `planet_sun`, `planet_ring`,
    /// `planet_ring2`, `ring`, `ring2`.
    pub fn key(self) -> &'static str {
        match self {
            Gear::Sun => "sun",
            Gear::Planet => "planet",
            Gear::PlanetSun => "planet_sun",
            Gear::PlanetRing => "planet_ring",
            Gear::PlanetRing2 => "planet_ring2",
            Gear::Ring => "ring",
            Gear::Ring2 => "ring2",
        }
    }

    /// The gear's name in words: `sun`, `planet`, `planet (sun side)`, ….
    pub fn name(self) -> &'static str {
        match self {
            Gear::Sun => "sun",
            Gear::Planet => "planet",
            Gear::PlanetSun => "planet (sun side)",
            Gear::PlanetRing => "planet (ring side)",
            Gear::PlanetRing2 => "planet (output ring side)",
            Gear::Ring => "ring",
            Gear::Ring2 => "output ring",
        }
    }

    /// True for a ring gear (internal teeth).
    pub fn internal(self) -> bool {
        matches!(self, Gear::Ring | Gear::Ring2)
    }

    /// True for a gear on the planet shafts.
    pub fn on_planet(self) -> bool {
        matches!(self, Gear::Planet | Gear::PlanetSun | Gear::PlanetRing | Gear::PlanetRing2)
    }
}

/// A gear of a design, its place in the meshes and its tooth count.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct GearAt {
    /// Which gear.
    pub gear: Gear,
    /// Its teeth.
    pub teeth: u32,
    /// The mesh it is cut for and its place in it, `[mesh][gear]` as in [`Teeth::meshes`]
    /// (a simple train's planet is named by its mesh with the sun).
    pub mesh: (usize, usize),
}

impl Teeth {
    /// Every gear of the train in the order the motion passes through them: sun, planet gears,
    /// ring; for the two-ring train held ring, planet gears, output ring.
    pub fn gears(&self) -> Vec<GearAt> {
        let at = |gear, teeth, mesh| GearAt { gear, teeth, mesh };
        match *self {
            Teeth::Simple { sun, planet, ring } => {
                vec![
                    at(Gear::Sun, sun, (0, 0)),
                    at(Gear::Planet, planet, (0, 1)),
                    at(Gear::Ring, ring, (1, 1)),
                ]
            }
            Teeth::Stepped { sun, planet, ring } => vec![
                at(Gear::Sun, sun, (0, 0)),
                at(Gear::PlanetSun, planet[0], (0, 1)),
                at(Gear::PlanetRing, planet[1], (1, 0)),
                at(Gear::Ring, ring, (1, 1)),
            ],
            Teeth::TwoRing { planet, ring } => vec![
                at(Gear::Ring, ring[0], (0, 1)),
                at(Gear::PlanetRing, planet[0], (0, 0)),
                at(Gear::PlanetRing2, planet[1], (1, 0)),
                at(Gear::Ring2, ring[1], (1, 1)),
            ],
        }
    }
}

/// One gear of a design as it is cut, mm and modules.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct GearCircles {
    /// Which gear.
    #[serde(rename = "gear", serialize_with = "gear_key")]
    pub gear: Gear,
    /// Its teeth.
    pub teeth: u32,
    /// Profile shift, in modules (a ring's positive outwards, see
    /// [`crate::geometry::internal`]).
    pub shift: f64,
    /// Reference diameter `m·z`, mm.
    pub pitch_diameter_mm: f64,
    /// Base diameter, mm.
    pub base_diameter_mm: f64,
    /// Tip diameter, mm: the inner circle of a ring.
    pub tip_diameter_mm: f64,
    /// Root diameter, mm: the outer circle of a ring.
    pub root_diameter_mm: f64,
}

fn gear_key<S: serde::Serializer>(gear: &Gear, s: S) -> Result<S::Ok, S::Error> {
    s.serialize_str(gear.key())
}

/// The circles of every gear of `design` cut in `system`, in the order of [`Teeth::gears`]:
/// shifts and tip shortenings from the design's carrier, planet tips as the carrier has them.
pub fn gear_circles(system: &ToothSystem, design: &Design) -> Vec<GearCircles> {
    let c = &design.carrier;
    design
        .teeth
        .gears()
        .into_iter()
        .map(|g| {
            let (mesh, place) = g.mesh;
            let shift = c.shift[mesh][place];
            let (tip, root) = if g.gear.internal() {
                (system.ring_tip_diameter_mm(g.teeth, shift), system.ring_root_diameter_mm(g.teeth, shift))
            } else {
                (
                    system.tip_diameter_mm(g.teeth, shift, c.tip_shortening[mesh]),
                    system.root_diameter_mm(g.teeth, shift),
                )
            };
            GearCircles {
                gear: g.gear,
                teeth: g.teeth,
                shift,
                pitch_diameter_mm: system.pitch_diameter_mm(g.teeth),
                base_diameter_mm: system.base_diameter_mm(g.teeth),
                tip_diameter_mm: tip,
                root_diameter_mm: root,
            }
        })
        .collect()
}

/// The planets' centres `[x, y]`, mm, the sun's centre at the origin: on the carrier circle of
/// radius the working centre distance, the first on the x axis, the others anticlockwise at the
/// design's angles.
pub fn planet_centres_mm(design: &Design) -> Vec<[f64; 2]> {
    let r = design.carrier.centre_distance_mm;
    design
        .positions
        .angles_deg()
        .into_iter()
        .map(|deg| {
            let (s, c) = deg.to_radians().sin_cos();
            [r * c, r * s]
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numbers::range::IntRange;
    use crate::numbers::rational::Ratio;
    use crate::trades::planetary::conditions::{check_design, PlanetMesh};
    use crate::trades::planetary::{Arrangement, Member, PlanetaryProblem, PlanetarySpec};

    /// The circles agree with the meshes as the geometry core works them out, gear by gear.
    fn agrees_with_the_meshes(problem: &PlanetaryProblem, design: &Design) {
        let circles = gear_circles(problem.system(), design);
        assert_eq!(circles.len(), design.teeth.gears().len());
        for (g, c) in design.teeth.gears().iter().zip(&circles) {
            let (mesh, place) = g.mesh;
            let (tip, root, teeth) = match design.meshes[mesh].as_ref().unwrap() {
                PlanetMesh::External(m) => {
                    (m.tip_diameter_mm[place], m.root_diameter_mm[place], m.teeth[place])
                }
                PlanetMesh::Internal(m) => {
                    (m.tip_diameter_mm[place], m.root_diameter_mm[place], m.teeth[place])
                }
            };
            assert_eq!(teeth, c.teeth, "{:?}", g.gear);
            assert!((tip - c.tip_diameter_mm).abs() < 1e-9, "{:?}: {tip} vs {}", g.gear, c.tip_diameter_mm);
            assert!(
                (root - c.root_diameter_mm).abs() < 1e-9,
                "{:?}: {root} vs {}",
                g.gear,
                c.root_diameter_mm
            );
        }
        // The planets' own tips are the ones the clearance was judged with.
        let planet_tips: Vec<f64> =
            circles.iter().filter(|c| c.gear.on_planet()).map(|c| c.tip_diameter_mm).collect();
        let want = design.carrier.planet_tip_diameter_mm;
        assert!(planet_tips.iter().all(|t| want.iter().any(|w| (w - t).abs() < 1e-9)), "{planet_tips:?}");
    }

    #[test]
    fn circles_of_each_arrangement_agree_with_the_meshes() {
        let spec = |arrangement| PlanetarySpec {
            arrangement,
            shift_sum: (-0.5, 1.0),
            carrier_offset_modules: 0.3,
            tip_clearance_mm: 0.0,
            ..PlanetarySpec::reduction(Ratio::integer(1))
        };
        let cases = [
            (
                Arrangement::Simple { fixed: Member::Ring, input: Member::Sun },
                Teeth::Simple { sun: 13, planet: 33, ring: 80 },
            ),
            (
                Arrangement::Stepped { fixed: Member::Ring, input: Member::Sun },
                Teeth::Stepped { sun: 20, planet: [40, 20], ring: 81 },
            ),
            (Arrangement::TwoRing, Teeth::TwoRing { planet: [20, 21], ring: [80, 82] }),
        ];
        for (arrangement, teeth) in cases {
            let problem = PlanetaryProblem::new(PlanetarySpec {
                ratio: arrangement.ratio(&teeth).unwrap().magnitude,
                sun_teeth: IntRange { lo: 12, hi: 60 },
                spacing: crate::trades::planetary::Spacing::NearEqual,
                ..spec(arrangement)
            })
            .unwrap();
            let design = check_design(&problem, &teeth, 3).unwrap_or_else(|u| panic!("{teeth:?}: {u:?}"));
            agrees_with_the_meshes(&problem, &design);
            let names: Vec<&str> = teeth.gears().iter().map(|g| g.gear.key()).collect();
            let want: &[&str] = match teeth {
                Teeth::Simple { .. } => &["sun", "planet", "ring"],
                Teeth::Stepped { .. } => &["sun", "planet_sun", "planet_ring", "ring"],
                Teeth::TwoRing { .. } => &["ring", "planet_ring", "planet_ring2", "ring2"],
            };
            assert_eq!(names, want);
        }
    }

    #[test]
    fn planets_sit_on_the_carrier_circle_at_their_angles() {
        // 20/30/80 with four planets: 100 places, every 25th, so 0°, 90°, 180°, 270° on a
        // carrier radius of m(20 + 30)/2 = 25 mm (computed).
        let problem = PlanetaryProblem::new(PlanetarySpec {
            tip_clearance_mm: 0.0,
            ..PlanetarySpec::reduction(Ratio::integer(5))
        })
        .unwrap();
        let design = check_design(&problem, &Teeth::Simple { sun: 20, planet: 30, ring: 80 }, 4).unwrap();
        let centres = planet_centres_mm(&design);
        let want = [[25.0, 0.0], [0.0, 25.0], [-25.0, 0.0], [0.0, -25.0]];
        for (c, w) in centres.iter().zip(want) {
            assert!((c[0] - w[0]).abs() < 1e-12 && (c[1] - w[1]).abs() < 1e-12, "{c:?} vs {w:?}");
        }
        let circles = gear_circles(problem.system(), &design);
        // Unshifted, module 1, ISO 53 type A: the ring's tip circle 80 − 2 = 78 mm, its root
        // circle 80 + 2·1.25 = 82.5 mm; the sun's tip 22 mm (computed).
        let ring = circles.iter().find(|c| c.gear == Gear::Ring).unwrap();
        assert_eq!((ring.tip_diameter_mm, ring.root_diameter_mm), (78.0, 82.5));
        let sun = circles.iter().find(|c| c.gear == Gear::Sun).unwrap();
        assert_eq!(sun.tip_diameter_mm, 22.0);
    }
}
