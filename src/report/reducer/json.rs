//! The JSON format for reducers. Each train is the train object of `search`
//! ([`crate::report::search::json::TrainJson`], stages input to output with shifts, working centre
//! distances and tip diameters) plus the reducer's own fields:
//!
//! ```text
//! {"hunting": [bool per stage], "non_hunting": n, "balance": largest/smallest stage ratio,
//!  "largest_tip_mm": f64, "centre_distance_sum_mm": f64, "output_rpm": f64|null}
//! ```
//! A document is `{"ratio", "exact", "tolerance", "stages", "modules", "max_stage_ratio",
//! "centre_distances_mm", "hunting", "input_rpm", "count", "complete", "convention", "caution",
//! "trains": […]}`.

use std::io::{self, Write};

use serde::Serialize;

use crate::report::search::json::TrainJson;
use crate::report::words::CONVENTION;
use crate::report::words::REDUCER_CAUTION;
use crate::trades::reducer::hunting::{is_hunting, non_hunting, spread};
use crate::trades::reducer::{centre_distance_sum_mm, largest_tip_mm, Hunting, ReducerPlan};

#[derive(Serialize)]
struct ReducerTrainJson {
    #[serde(flatten)]
    train: TrainJson,
    hunting: Vec<bool>,
    non_hunting: usize,
    balance: f64,
    largest_tip_mm: f64,
    centre_distance_sum_mm: f64,
    output_rpm: Option<f64>,
}

#[derive(Serialize)]
struct Doc {
    ratio: String,
    exact: String,
    tolerance: f64,
    stages: String,
    modules: Vec<f64>,
    max_stage_ratio: String,
    centre_distances_mm: Vec<f64>,
    hunting: &'static str,
    input_rpm: Option<f64>,
    count: u64,
    complete: bool,
    convention: &'static str,
    caution: &'static str,
    trains: Vec<ReducerTrainJson>,
}

/// Write a reducer search as one JSON document.
pub fn write(p: &ReducerPlan, w: &mut dyn Write) -> io::Result<()> {
    let s = &p.spec;
    let doc = Doc {
        ratio: s.ratio_text.clone(),
        exact: s.ratio.to_string(),
        tolerance: s.tolerance.to_f64(),
        stages: p.problem.stages.to_string(),
        modules: s.modules.clone(),
        max_stage_ratio: s.max_stage_ratio.to_string(),
        centre_distances_mm: s.centre_distances_mm.clone(),
        hunting: match s.hunting {
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
                non_hunting: non_hunting(t),
                balance: spread(t),
                largest_tip_mm: largest_tip_mm(t),
                centre_distance_sum_mm: centre_distance_sum_mm(t),
                output_rpm: s.input_rpm.map(|rpm| rpm / t.ratio.to_f64()),
            })
            .collect(),
    };
    serde_json::to_writer_pretty(&mut *w, &doc).map_err(io::Error::other)?;
    writeln!(w)
}
