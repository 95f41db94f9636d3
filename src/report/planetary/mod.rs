//! Planetary trains (`gearsieve planetary`) in every format: the conditions asked for, the
//! designs found (tooth counts, planets, exact ratio and the output's direction, carrier centre
//! distance, shifts, neighbour clearance, where the planets go), what was left out and why when
//! asked, and a drawing of the best design to scale. It reads finished results and computes
//! nothing about gears.

pub mod csv;
pub mod document;
pub mod json;
pub mod picture;

use std::io::Write;

use super::{Completion, Document, Drawing, RenderError, Report};
use crate::trades::planetary::layout::Gear;
use crate::trades::planetary::{
    Arrangement, Design, Member, PlanetMesh, PlanetaryOutcome, PlanetaryProblem, Teeth, Unmet,
};

/// A planetary search as presented: what was asked, what was found, and why designs asked for
/// by name fail.
#[derive(Debug, Clone, Copy)]
pub struct PlanetaryReport<'a> {
    /// The problem as validated.
    pub problem: &'a PlanetaryProblem,
    /// The target ratio as the user typed it.
    pub ratio_text: &'a str,
    /// What the search found (with what it left out, when explained).
    pub outcome: &'a PlanetaryOutcome,
    /// The designs asked for by name that fail, each with every condition it fails; empty
    /// unless the ranges hold one set of tooth counts and an explanation was asked for.
    pub asked: &'a [Asked],
}

/// A design asked for by name and what it fails.
#[derive(Debug, Clone, PartialEq)]
pub struct Asked {
    /// Its tooth counts.
    pub teeth: Teeth,
    /// Its planet count.
    pub planets: u32,
    /// Every condition it fails, in the order judged.
    pub unmet: Vec<Unmet>,
}

impl Report for PlanetaryReport<'_> {
    fn kind(&self) -> &'static str {
        "a planetary search"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.outcome.complete, found: self.outcome.count > 0 }
    }

    fn document(&self) -> Option<Document> {
        Some(document::document(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json::write(self, w)
    }

    fn drawing(&self) -> Option<Drawing> {
        Some(picture::drawing(self))
    }
}

/// The arrangement's name in the outputs' fields: `simple`, `stepped`, `two-ring`.
pub fn arrangement_key(arrangement: Arrangement) -> &'static str {
    match arrangement {
        Arrangement::Simple { .. } => "simple",
        Arrangement::Stepped { .. } => "stepped",
        Arrangement::TwoRing => "two-ring",
    }
}

/// Held, driving and driven member in words: `("ring", "sun", "carrier")`; for the two-ring
/// train `("ring", "carrier", "output ring")`.
pub fn drive(arrangement: Arrangement) -> (&'static str, &'static str, &'static str) {
    match arrangement {
        Arrangement::Simple { fixed, input } | Arrangement::Stepped { fixed, input } => {
            let output = [Member::Sun, Member::Ring, Member::Carrier]
                .into_iter()
                .find(|&m| m != fixed && m != input)
                .unwrap_or(Member::Carrier);
            (fixed.name(), input.name(), output.name())
        }
        Arrangement::TwoRing => ("ring", "carrier", "output ring"),
    }
}

/// The ratio of the arrangement as a formula in its tooth counts (Willis' equation solved for
/// the drive): `i = 1 + Zr/Zs` for a simple train with the ring held and the sun driving.
pub fn formula(arrangement: Arrangement) -> String {
    let (fixed, input, k) = match arrangement {
        Arrangement::Simple { fixed, input } => (fixed, input, "Zr/Zs"),
        Arrangement::Stepped { fixed, input } => (fixed, input, "(Zr·Zp1)/(Zs·Zp2)"),
        Arrangement::TwoRing => return "i = Zp1·Zr2 / (Zp1·Zr2 − Zr1·Zp2)".to_string(),
    };
    let inverse = |k: &str| match k.split_once('/') {
        Some((a, b)) => format!("{b}/{a}"),
        None => format!("1/{k}"),
    };
    match (fixed, input) {
        (Member::Ring, Member::Sun) => format!("i = 1 + {k}"),
        (Member::Ring, _) => format!("i = 1/(1 + {k})"),
        (Member::Sun, Member::Ring) => format!("i = 1 + {}", inverse(k)),
        (Member::Sun, _) => format!("i = 1/(1 + {})", inverse(k)),
        (Member::Carrier, Member::Sun) => format!("i = −{k}"),
        (Member::Carrier, _) => format!("i = −{}", inverse(k)),
    }
}

/// The teeth columns for people: one per central gear, the planet's gears in one column.
pub fn teeth_heads(arrangement: Arrangement) -> Vec<&'static str> {
    match arrangement {
        Arrangement::TwoRing => TWO_RING_HEADS.to_vec(),
        _ => SUN_HEADS.to_vec(),
    }
}

const SUN_HEADS: [&str; 3] = ["sun", "planet", "ring"];
const TWO_RING_HEADS: [&str; 3] = ["ring", "planet", "ring2"];

/// A design in few words: `sun 20, planet 40/20, ring 80, 3 planets`.
pub fn short_words(teeth: &Teeth, planets: u32) -> String {
    let heads = match teeth {
        Teeth::TwoRing { .. } => TWO_RING_HEADS,
        _ => SUN_HEADS,
    };
    let gears: Vec<String> = heads.iter().zip(teeth_cells(teeth)).map(|(h, c)| format!("{h} {c}")).collect();
    format!("{}, {planets} planets", gears.join(", "))
}

/// The cells under [`teeth_heads`]: a stepped planet as `Zp1/Zp2`.
pub fn teeth_cells(teeth: &Teeth) -> Vec<String> {
    match *teeth {
        Teeth::Simple { sun, planet, ring } => vec![sun.to_string(), planet.to_string(), ring.to_string()],
        Teeth::Stepped { sun, planet, ring } => {
            vec![sun.to_string(), format!("{}/{}", planet[0], planet[1]), ring.to_string()]
        }
        Teeth::TwoRing { planet, ring } => {
            vec![ring[0].to_string(), format!("{}/{}", planet[0], planet[1]), ring[1].to_string()]
        }
    }
}

/// A set of tooth counts with a planet count in words: `sun 20, planet 30, ring 80, 4 planets`.
pub fn candidate_words(teeth: &Teeth, planets: u32) -> String {
    let gears: Vec<String> = teeth.gears().iter().map(|g| format!("{} {}", g.gear.name(), g.teeth)).collect();
    format!("{}, {planets} planets", gears.join(", "))
}

/// The gears of an arrangement, in the order of [`Teeth::gears`].
pub fn gears_of(arrangement: Arrangement) -> Vec<Gear> {
    match arrangement {
        Arrangement::Simple { .. } => vec![Gear::Sun, Gear::Planet, Gear::Ring],
        Arrangement::Stepped { .. } => vec![Gear::Sun, Gear::PlanetSun, Gear::PlanetRing, Gear::Ring],
        Arrangement::TwoRing => vec![Gear::Ring, Gear::PlanetRing, Gear::PlanetRing2, Gear::Ring2],
    }
}

/// What each of a design's two meshes came to: `(working pressure angle in degrees, contact
/// ratio)`, or why it could not be worked out.
pub fn mesh_figures(design: &Design) -> [Result<(f64, f64), String>; 2] {
    design.meshes.each_ref().map(|mesh| match mesh {
        Ok(PlanetMesh::External(g)) => Ok((g.working_pressure_angle_deg, g.contact_ratio)),
        Ok(PlanetMesh::Internal(g)) => Ok((g.working_pressure_angle_deg, g.contact_ratio)),
        Err(defect) => Err(defect.to_string()),
    })
}

/// A mesh by its gears: `sun 20 / planet 30`, `planet 30 / ring 80`.
pub fn mesh_words(teeth: &Teeth, mesh: usize) -> String {
    let gears: Vec<String> = teeth
        .gears()
        .iter()
        .filter(|g| g.mesh.0 == mesh || (mesh == 1 && g.gear == Gear::Planet))
        .map(|g| format!("{} {}", g.gear.name(), g.teeth))
        .collect();
    gears.join(" / ")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn formulas_of_the_six_drives() {
        let simple = |fixed, input| formula(Arrangement::Simple { fixed, input });
        assert_eq!(simple(Member::Ring, Member::Sun), "i = 1 + Zr/Zs");
        assert_eq!(simple(Member::Ring, Member::Carrier), "i = 1/(1 + Zr/Zs)");
        assert_eq!(simple(Member::Sun, Member::Ring), "i = 1 + Zs/Zr");
        assert_eq!(simple(Member::Sun, Member::Carrier), "i = 1/(1 + Zs/Zr)");
        assert_eq!(simple(Member::Carrier, Member::Sun), "i = −Zr/Zs");
        assert_eq!(simple(Member::Carrier, Member::Ring), "i = −Zs/Zr");
        let stepped = formula(Arrangement::Stepped { fixed: Member::Sun, input: Member::Ring });
        assert_eq!(stepped, "i = 1 + (Zs·Zp2)/(Zr·Zp1)");
        assert_eq!(
            drive(Arrangement::Simple { fixed: Member::Sun, input: Member::Ring }),
            ("sun", "ring", "carrier")
        );
        assert_eq!(drive(Arrangement::TwoRing), ("ring", "carrier", "output ring"));
    }

    #[test]
    fn meshes_named_by_their_gears() {
        let simple = Teeth::Simple { sun: 20, planet: 30, ring: 80 };
        assert_eq!(mesh_words(&simple, 0), "sun 20 / planet 30");
        assert_eq!(mesh_words(&simple, 1), "planet 30 / ring 80");
        let two = Teeth::TwoRing { planet: [20, 21], ring: [80, 82] };
        assert_eq!(mesh_words(&two, 0), "ring 80 / planet (ring side) 20");
        assert_eq!(mesh_words(&two, 1), "planet (output ring side) 21 / output ring 82");
        assert_eq!(candidate_words(&simple, 4), "sun 20, planet 30, ring 80, 4 planets");
    }
}
