//! The train model: stages of driver and driven gears, the ratio they make, the direction the
//! output turns, and the per-stage standard centre distance. Pure data with the arithmetic that
//! defines it; the search builds these, the output formats print them.
//!
//! Ratio convention (ISO 1122-1): the transmission ratio `i` is input turns per output turn, the
//! product of the driven gears' teeth over the product of the drivers' teeth; a reducer's ratio is
//! above 1.

use serde::{Deserialize, Serialize};

use crate::numbers::rational::{Ratio, RelError};

/// Which way the output shaft turns relative to the input.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Direction {
    /// Same sense as the input (an even number of external meshes).
    Same,
    /// Opposite sense (an odd number of external meshes).
    Opposite,
}

impl Direction {
    /// The direction after `meshes` external spur meshes (each reverses the rotation).
    pub fn after_meshes(meshes: usize) -> Direction {
        if meshes % 2 == 0 {
            Direction::Same
        } else {
            Direction::Opposite
        }
    }

    /// `same` or `opposite`.
    pub fn as_str(self) -> &'static str {
        match self {
            Direction::Same => "same",
            Direction::Opposite => "opposite",
        }
    }
}

/// One gear in a stage.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Gear {
    /// Tooth count.
    pub teeth: u32,
    /// Catalogue labels of the stock this gear is drawn from (empty for gears to be cut).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub labels: Vec<String>,
    /// How a gear on hand was made (its shift and tip, which are never changed); `None` for a
    /// gear to be cut.
    #[serde(skip)]
    pub made: Option<crate::geometry::AsMade>,
}

/// One stage: a driver meshing with a driven gear of the same module and pressure angle.
#[derive(Debug, Clone, PartialEq)]
pub struct Stage {
    /// The driving gear (on the shaft nearer the input).
    pub driver: Gear,
    /// The driven gear (on the shaft nearer the output).
    pub driven: Gear,
    /// Module, mm.
    pub module_mm: f64,
    /// Pressure angle, degrees.
    pub pressure_angle_deg: f64,
    /// Diametral pitch, when the gears were given in inch terms.
    pub diametral_pitch: Option<f64>,
    /// The worked-out mesh (profile shifts, working centre distance, contact ratio…) when the
    /// search checked geometry; gear 0 is the driver.
    pub mesh: Option<crate::geometry::MeshGeometry>,
    /// What is wrong with this stage's gears on hand as they are made (undercut, pointed tips,
    /// low contact ratio): shown on every listing, whether or not meshes were checked.
    pub on_hand_defects: Vec<crate::geometry::MeshDefect>,
}

impl Stage {
    /// A stage of unlabelled gears, given in metric terms, with no worked-out mesh.
    pub fn plain(driver_teeth: u32, driven_teeth: u32, module_mm: f64, pressure_angle_deg: f64) -> Stage {
        let g = |teeth| Gear { teeth, labels: Vec::new(), made: None };
        Stage {
            driver: g(driver_teeth),
            driven: g(driven_teeth),
            module_mm,
            pressure_angle_deg,
            diametral_pitch: None,
            mesh: None,
            on_hand_defects: Vec::new(),
        }
    }

    /// Standard centre distance `a = m·(z1 + z2)/2`, mm.
    pub fn centre_distance_mm(&self) -> f64 {
        standard_centre_distance_mm(self.module_mm, self.driver.teeth, self.driven.teeth)
    }

    /// The stage's own ratio, driven / driver, reduced.
    pub fn ratio(&self) -> Ratio {
        Ratio::new(self.driven.teeth as u128, self.driver.teeth as u128).expect("teeth are positive")
    }
}

/// Standard centre distance of two external spur gears, `m·(z1 + z2)/2`, mm.
pub fn standard_centre_distance_mm(module_mm: f64, z1: u32, z2: u32) -> f64 {
    module_mm * (z1 + z2) as f64 / 2.0
}

/// A compound train found by a search, with its ratio judged against the target.
#[derive(Debug, Clone, PartialEq)]
pub struct Train {
    /// Stages from input to output, in the canonical order: finer module first, then ascending
    /// stage ratio, driver teeth, driven teeth.
    pub stages: Vec<Stage>,
    /// The train's ratio, reduced.
    pub ratio: Ratio,
    /// Its relative error against the target, exact.
    pub error: RelError,
}

impl Train {
    /// Number of meshes (stages).
    pub fn meshes(&self) -> usize {
        self.stages.len()
    }

    /// Output direction relative to input.
    pub fn direction(&self) -> Direction {
        Direction::after_meshes(self.meshes())
    }

    /// Sum of all tooth counts (a proxy for cost and bulk).
    pub fn size(&self) -> u32 {
        self.stages.iter().map(|s| s.driver.teeth + s.driven.teeth).sum()
    }

    /// Largest pitch diameter in the train, mm.
    pub fn span_mm(&self) -> f64 {
        self.stages
            .iter()
            .map(|s| s.module_mm * s.driver.teeth.max(s.driven.teeth) as f64)
            .fold(0.0, f64::max)
    }

    /// The ratio recomputed from the teeth (product of driven / product of drivers), reduced.
    pub fn ratio_from_teeth(&self) -> Ratio {
        let (mut n, mut d) = (1u128, 1u128);
        for s in &self.stages {
            n *= s.driven.teeth as u128;
            d *= s.driver.teeth as u128;
        }
        Ratio::new(n, d).expect("products of at most 6 counts ≤ 1000 fit")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn stage(a: u32, b: u32) -> Stage {
        Stage::plain(a, b, 1.5, 20.0)
    }

    #[test]
    fn centre_distance_is_standard() {
        // Common practice: a = m (z1 + z2) / 2.
        assert_eq!(stage(20, 40).centre_distance_mm(), 45.0);
    }

    #[test]
    fn ratio_direction_size_span() {
        // "Modern Machine Shop Practice": 66/48 × 36/18 on a 4-per-inch screw cuts 11 per inch:
        // the train's ratio is 11/4.
        let t = Train {
            stages: vec![stage(48, 66), stage(18, 36)],
            ratio: Ratio::new(11, 4).unwrap(),
            error: RelError::of(11, 4, Ratio::new(11, 4).unwrap()),
        };
        assert_eq!(t.ratio_from_teeth(), t.ratio);
        assert_eq!(t.direction(), Direction::Same);
        assert_eq!(t.size(), 48 + 66 + 18 + 36);
        assert_eq!(t.span_mm(), 99.0);
        assert_eq!(Direction::after_meshes(3), Direction::Opposite);
    }
}
