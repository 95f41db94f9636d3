//! The JSON format for reducers. Each train is the train object of `search`
//! ([`crate::report::fields::TrainJson`], stages input to output with shifts, working centre
//! distances and tip diameters) plus the reducer's own fields:
//!
//! ```text
//! {"hunting": [bool per stage], "non_hunting_pairs": n, "balance": largest/smallest stage ratio,
//!  "largest_tip_diameter_mm": f64, "centre_distance_sum_mm": f64, "output_rpm": f64|null}
//! ```
//! A document is `{"schema_version", "target", "stage_counts", "modules_mm", "max_stage_ratio",
//! "centre_distances_mm", "hunting_rule", "input_rpm", "count", "complete", "convention",
//! "caution", "trains": […]}`; every key is described in `docs/output-fields.md`.

use std::io::Write;

use serde::Serialize;

use crate::report::fields::{TargetJson, TrainJson};
use crate::report::words::CONVENTION;
use crate::report::words::REDUCER_CAUTION;
use crate::report::{write_json, RenderError, SCHEMA_VERSION};
use crate::trades::reducer::hunting::{is_hunting, non_hunting, spread};
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
    count: u64,
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
        count: p.count,
        complete: p.complete,
        convention: CONVENTION,
        caution: REDUCER_CAUTION,
        trains: p
            .trains
            .iter()
            .map(|t| ReducerTrainJson {
                train: TrainJson::from_train(t),
                hunting: t.stages.iter().map(is_hunting).collect(),
                non_hunting_pairs: non_hunting(t),
                balance: spread(t),
                largest_tip_diameter_mm: largest_tip_mm(t),
                centre_distance_sum_mm: centre_distance_sum_mm(t),
                output_rpm: s.input_rpm.map(|rpm| rpm / t.ratio.to_f64()),
            })
            .collect(),
    };
    write_json(&doc, w)
}
