//! The JSON format for reducers. Each train is the train object of `search`
//! ([`crate::report::fields::TrainJson`], stages input to output with shifts, working centre
//! distances and tip diameters) plus the reducer's own fields:
//!
//! ```text
//! {"hunting": [bool per stage], "non_hunting_pairs": n, "balance": largest/smallest stage ratio,
//!  "largest_tip_diameter_mm": f64, "centre_distance_sum_mm": f64, "output_rpm": f64|null,
//!  "split_deviation": |ln(stage ratio / the split rule's)| at most, "shafts_mm": [[x, y], …], "tightest_shaft_clearance": {"stage", "driven", "shaft",
//!  "gap_mm"}|null, "stage_data": [{"backlash": {…}|null, "gears": [gear data, gear data]}|null]}
//! ```
//! A document is `{"schema_version", "target", "stage_counts", "modules_mm", "max_stage_ratio",
//! "centre_distances_mm", "hunting_rule", "input_rpm", "min_stage_ratio", "backlash_wanted",
//! "housing_tolerance_mm", "shaft_fold_deg", "shaft_diameter_mm", "shaft_margin_mm", "count", "complete", "convention",
//! "caution", "trains": […]}`; every key is described in `docs/output-fields.md`.

use std::io::Write;

use serde::Serialize;

use crate::geometry::allowance::BacklashChoice;
use crate::geometry::layout::ShaftLayout;
use crate::geometry::measure::PairData;
use crate::report::fields::{TargetJson, TrainJson};
use crate::report::words::CONVENTION;
use crate::report::words::REDUCER_CAUTION;
use crate::report::{write_json, RenderError, SCHEMA_VERSION};
use crate::trades::reducer::hunting::{is_hunting, non_hunting, spread};
use crate::trades::reducer::shop::ShaftClearance;
use crate::trades::reducer::split::split_deviation;
use crate::trades::reducer::{centre_distance_sum_mm, largest_tip_mm, Hunting, ReducerPlan};

#[derive(Serialize)]
struct ReducerTrainJson {
    #[serde(flatten)]
    train: TrainJson,
    hunting: Vec<bool>,
    non_hunting_pairs: usize,
    balance: f64,
    largest_tip_diameter_mm: f64,
    centre_distance_sum_mm: f64,
    output_rpm: Option<f64>,
    split_deviation: f64,
    shafts_mm: Vec<[f64; 2]>,
    tightest_shaft_clearance: Option<ShaftClearance>,
    stage_data: Vec<Option<PairData>>,
}

#[derive(Serialize)]
struct Doc {
    schema_version: u32,
    target: TargetJson,
    stage_counts: Vec<usize>,
    modules_mm: Vec<f64>,
    max_stage_ratio: String,
    centre_distances_mm: Vec<f64>,
    hunting_rule: &'static str,
    input_rpm: Option<f64>,
    min_stage_ratio: Option<String>,
    backlash_wanted: BacklashChoice,
    housing_tolerance_mm: f64,
    shaft_fold_deg: f64,
    shaft_diameter_mm: Option<f64>,
    shaft_margin_mm: f64,
    count: u64,
    gear_set_count: Option<u64>,
    complete: bool,
    convention: &'static str,
    caution: &'static str,
    trains: Vec<ReducerTrainJson>,
}

/// Write a reducer search as one JSON document.
pub fn write(p: &ReducerPlan, w: &mut dyn Write) -> Result<(), RenderError> {
    let s = &p.spec;
    let doc = Doc {
        schema_version: SCHEMA_VERSION,
        target: TargetJson {
            ratio: s.ratio_text.clone(),
            value: s.ratio.to_f64(),
            tolerance: s.tolerance.to_f64(),
            exact: s.ratio.to_string(),
        },
        stage_counts: p.problem.stage_counts(),
        modules_mm: s.modules.clone(),
        max_stage_ratio: s.max_stage_ratio.to_string(),
        centre_distances_mm: s.centre_distances_mm.clone(),
        hunting_rule: match s.hunting {
            Hunting::Prefer => "prefer",
            Hunting::Require => "require",
            Hunting::Ignore => "ignore",
        },
        input_rpm: s.input_rpm,
        min_stage_ratio: s.min_stage_ratio.map(|r| r.to_string()),
        backlash_wanted: s.shop.backlash,
        housing_tolerance_mm: s.shop.housing_tolerance_mm,
        shaft_fold_deg: match s.shop.layout {
            ShaftLayout::Inline => 0.0,
            ShaftLayout::Folded { turn_deg } => turn_deg,
        },
        shaft_diameter_mm: s.shop.shaft_diameter_mm,
        shaft_margin_mm: s.shop.shaft_margin_mm,
        count: p.count,
        gear_set_count: p.gear_set_count,
        complete: p.complete,
        convention: CONVENTION,
        caution: REDUCER_CAUTION,
        trains: p
            .trains
            .iter()
            .zip(&p.shop)
            .enumerate()
            .map(|(n, (t, shop))| ReducerTrainJson {
                train: TrainJson {
                    arrangements: p.arrangements.get(n).copied(),
                    other_arrangements: p
                        .others
                        .get(n)
                        .map_or_else(Vec::new, |o| o.iter().map(TrainJson::from_train).collect()),
                    ..TrainJson::from_train(t)
                },
                hunting: t.stages.iter().map(is_hunting).collect(),
                non_hunting_pairs: non_hunting(t),
                balance: spread(t),
                largest_tip_diameter_mm: largest_tip_mm(t),
                centre_distance_sum_mm: centre_distance_sum_mm(t),
                output_rpm: s.input_rpm.map(|rpm| rpm / t.ratio.to_f64()),
                split_deviation: split_deviation(t),
                shafts_mm: shop.shafts_mm.clone(),
                tightest_shaft_clearance: shop.tightest,
                stage_data: shop.stages.clone(),
            })
            .collect(),
    };
    write_json(&doc, w)
}
