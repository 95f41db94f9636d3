//! A reducer train made ready for the shop: where its shafts sit (in line or folded), whether
//! every gear's tip circle clears every shaft it does not sit on, and each stage's
//! tooth-thickness allowances, backlash and measurement data.
//!
//! Owns the housing-fit rule and the gathering of the stage data; the positions come from
//! [`crate::geometry::layout`], the allowances and measurements from
//! [`crate::geometry::allowance`] and [`crate::geometry::measure`].
//!
//! The fit rule: stage `k` runs from shaft `k` (its driver) to shaft `k + 1` (its driven gear),
//! and every shaft is taken to run through every plane of gears, as between the two walls of a
//! housing. A gear clears shaft `j` when the distance from its own shaft's centre to shaft `j`'s,
//! less its tip radius and half the shaft diameter, is at least the margin. Shafts on one axis
//! (a folded train brought back onto the input's axis) are taken as butting end to end, not
//! running through each other's gears, and are not checked against each other.

use crate::geometry::allowance::BacklashChoice;
use crate::geometry::layout::{shaft_centres, ShaftLayout};
use crate::geometry::measure::{pair_data, PairData};
use crate::geometry::{RackProfile, ToothSystem};
use crate::model::train::Train;

/// Shafts closer than this, mm, are taken to be on one axis.
const COAXIAL_MM: f64 = 1e-6;

/// What the shop figures and the housing fit are worked out with.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ShopRules {
    /// The backlash each stage is to have.
    pub backlash: BacklashChoice,
    /// How far the housing may put each pair of centres from the working distance, either
    /// way, mm.
    pub housing_tolerance_mm: f64,
    /// How the shafts are laid out.
    pub layout: ShaftLayout,
    /// Shaft diameter, mm, when the housing fit is checked.
    pub shaft_diameter_mm: Option<f64>,
    /// The least gap between a gear's tip circle and another shaft, mm.
    pub shaft_margin_mm: f64,
    /// The basic rack the gears are cut with.
    pub rack: RackProfile,
}

/// The tightest place between a gear and a shaft it does not sit on.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ShaftClearance {
    /// The stage of the gear, counting from 1 at the input.
    pub stage: usize,
    /// Whether it is the stage's driven gear (else its driver).
    pub driven: bool,
    /// The shaft it comes close to, counting from 0 at the input.
    pub shaft: usize,
    /// The gap between its tip circle and that shaft's surface, mm (less the margin it must
    /// keep, it is what is to spare).
    pub gap_mm: f64,
}

/// A train ready for the shop.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct TrainShop {
    /// Shaft centres `[x, y]`, mm, input shaft at the origin.
    pub shafts_mm: Vec<[f64; 2]>,
    /// The tightest gear-to-shaft gap (with a shaft diameter given, else `None`; also `None`
    /// for a single stage, where no gear passes another shaft).
    pub tightest: Option<ShaftClearance>,
    /// Allowances, backlash and gear data of each stage, input to output; `None` for a stage
    /// without a worked-out mesh.
    pub stages: Vec<Option<PairData>>,
}

/// Working centre distances of the train's stages, mm.
fn centre_distances(t: &Train) -> Vec<f64> {
    t.stages.iter().map(|s| s.mesh.map_or(s.centre_distance_mm(), |m| m.centre_distance_mm)).collect()
}

/// Tip diameters `[driver, driven]` of each stage, mm.
fn tips(t: &Train) -> Vec<[f64; 2]> {
    t.stages
        .iter()
        .map(|s| match s.mesh {
            Some(m) => m.tip_diameter_mm,
            None => {
                [s.module_mm * f64::from(s.driver.teeth + 2), s.module_mm * f64::from(s.driven.teeth + 2)]
            }
        })
        .collect()
}

/// The tightest gap between any gear of `t` and a shaft it does not sit on, for shafts of
/// `shaft_diameter_mm` laid out as `layout`; `None` for a single stage.
pub fn tightest_clearance(t: &Train, layout: ShaftLayout, shaft_diameter_mm: f64) -> Option<ShaftClearance> {
    let centres = shaft_centres(&centre_distances(t), layout);
    let mut tightest: Option<ShaftClearance> = None;
    for (k, tip) in tips(t).iter().enumerate() {
        for (driven, own) in [(false, k), (true, k + 1)] {
            let tip_radius = tip[usize::from(driven)] / 2.0;
            for (j, c) in centres.iter().enumerate() {
                let apart = (c[0] - centres[own][0]).hypot(c[1] - centres[own][1]);
                if j == own || apart < COAXIAL_MM {
                    continue;
                }
                let gap_mm = apart - tip_radius - shaft_diameter_mm / 2.0;
                if tightest.is_none_or(|best| gap_mm < best.gap_mm) {
                    tightest = Some(ShaftClearance { stage: k + 1, driven, shaft: j, gap_mm });
                }
            }
        }
    }
    tightest
}

impl ShopRules {
    /// Whether the train fits its housing: every gear clears every other shaft by the margin
    /// (always true without a shaft diameter).
    pub fn fits(&self, t: &Train) -> bool {
        match self.shaft_diameter_mm {
            None => true,
            Some(d) => tightest_clearance(t, self.layout, d).is_none_or(|c| c.gap_mm >= self.shaft_margin_mm),
        }
    }

    /// The train's shafts, housing fit and stage data.
    pub fn shop(&self, t: &Train) -> TrainShop {
        let stages = t
            .stages
            .iter()
            .map(|s| {
                let mesh = s.mesh?;
                let system = ToothSystem::new(s.module_mm, s.pressure_angle_deg, self.rack).ok()?;
                let on_hand = [s.driver.made.is_some(), s.driven.made.is_some()];
                Some(pair_data(
                    &system,
                    &mesh,
                    self.backlash,
                    self.housing_tolerance_mm,
                    [None, None],
                    on_hand,
                ))
            })
            .collect();
        TrainShop {
            shafts_mm: shaft_centres(&centre_distances(t), self.layout),
            tightest: self.shaft_diameter_mm.and_then(|d| tightest_clearance(t, self.layout, d)),
            stages,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::{mesh_geometry, Mounting};
    use crate::model::train::Stage;
    use crate::numbers::rational::{Ratio, RelError};

    fn train(stages: &[(u32, u32, f64)]) -> Train {
        let stages: Vec<Stage> = stages
            .iter()
            .map(|&(a, b, m)| {
                let mut s = Stage::plain(a, b, m, 20.0);
                let sys = ToothSystem::new(m, 20.0, RackProfile::default()).unwrap();
                s.mesh = Some(mesh_geometry(&sys, [a, b], Mounting::Shifted { shift: [0.0, 0.0] }).unwrap());
                s
            })
            .collect();
        let ratio = Ratio::integer(1);
        Train { stages, ratio, error: RelError::of(1, 1, ratio) }
    }

    #[test]
    fn a_big_first_wheel_can_foul_the_output_shaft() {
        // Worked by hand from a = m(z1 + z2)/2 and da = m(z + 2) (common practice).
        // 18→90 at module 2 (a = 108, wheel tip radius 92) then 18→36 at module 3 (a = 81): in
        // line, the 90-tooth wheel on shaft 1 reaches the output shaft 81 mm away; with 20 mm
        // shafts the gap is 81 − 92 − 10 = −21 mm.
        let t = train(&[(18, 90, 2.0), (18, 36, 3.0)]);
        let c = tightest_clearance(&t, ShaftLayout::Inline, 20.0).unwrap();
        assert_eq!((c.stage, c.driven, c.shaft), (1, true, 2));
        assert!((c.gap_mm + 21.0).abs() < 1e-9, "{c:?}");
        let rules = |margin| ShopRules {
            backlash: BacklashChoice::Recommended,
            housing_tolerance_mm: 0.0,
            layout: ShaftLayout::Inline,
            shaft_diameter_mm: Some(20.0),
            shaft_margin_mm: margin,
            rack: RackProfile::default(),
        };
        assert!(!rules(0.0).fits(&t));
        // With the second stage at module 4 (a = 108) the wheel clears both its neighbours'
        // shafts by 108 − 92 − 10 = 6 mm, the tightest place of the train.
        let t = train(&[(18, 90, 2.0), (18, 36, 4.0)]);
        let c = tightest_clearance(&t, ShaftLayout::Inline, 20.0).unwrap();
        assert_eq!((c.stage, c.driven), (1, true));
        assert!((c.gap_mm - 6.0).abs() < 1e-9, "{c:?}");
        assert!(rules(5.0).fits(&t));
        assert!(!rules(7.0).fits(&t));
        // Without a shaft diameter nothing is checked.
        assert!(ShopRules { shaft_diameter_mm: None, ..rules(7.0) }.fits(&t));
    }

    #[test]
    fn a_reverted_train_does_not_check_coaxial_shafts() {
        // 20→40 and 40→20 at module 1, folded by 180°: the output comes back onto the input's
        // axis (a = 30 mm both).
        let t = train(&[(20, 40, 1.0), (40, 20, 1.0)]);
        let folded = ShaftLayout::Folded { turn_deg: 180.0 };
        let c = tightest_clearance(&t, folded, 10.0).unwrap();
        // Tightest: a 40-tooth gear on the middle shaft (tip radius 21) against the input or
        // output shaft 30 mm away: 30 − 21 − 5 = 4 mm. Were the coaxial input and output
        // shafts checked against each other's gears, the gap would be 0 − 11 − 5 = −16 mm.
        assert!((c.gap_mm - 4.0).abs() < 1e-9, "{c:?}");
        assert_eq!((c.stage, c.driven), (1, true));
    }

    #[test]
    fn shop_data_for_every_stage() {
        let t = train(&[(19, 47, 2.0), (17, 40, 3.0)]);
        let rules = ShopRules {
            backlash: BacklashChoice::Recommended,
            housing_tolerance_mm: 0.02,
            layout: ShaftLayout::Inline,
            shaft_diameter_mm: Some(20.0),
            shaft_margin_mm: 2.0,
            rack: RackProfile::default(),
        };
        let shop = rules.shop(&t);
        assert_eq!(shop.shafts_mm, vec![[0.0, 0.0], [66.0, 0.0], [151.5, 0.0]]);
        assert_eq!(shop.stages.len(), 2);
        for (k, s) in shop.stages.iter().enumerate() {
            let s = s.as_ref().unwrap();
            let plan = s.backlash.unwrap();
            assert!(plan.allowances.upper_mm[0] < 0.0, "stage {k}");
            assert_eq!(s.gears[0].teeth, t.stages[k].driver.teeth);
        }
    }
}
