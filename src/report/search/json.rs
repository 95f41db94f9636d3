//! The JSON format, a contract scripts rely on:
//!
//! ```text
//! {"target": {"ratio": "<as given>", "value": f64, "tolerance": f64, "exact": "p/q"},
//!  "count": n, "complete": bool, "convention": "…", "rank": ["error", …], "limit": k,
//!  "trains": [{"ratio": "p/q", "value": f64, "error": signed i/R − 1, "meshes": n,
//!              "direction": "same"|"opposite", "size": n, "span": mm,
//!              "stages": [{"driver": z, "driven": z, "module": mm, "centre_distance": mm,
//!                          "pressure_angle": deg, …}]}]}
//! ```
//! Field names and meanings are stable; fields may be added. The document reads back into
//! [`Doc`] so that `gearsieve merge` can combine the parts of a split search and print exactly
//! what one run prints. With a limit of 0 the trains stream as JSON lines instead (one
//! [`TrainJson`] per line, then one [`Summary`] line).

use std::io::{self, Write};

use serde::{Deserialize, Serialize};

use crate::model::train::{Direction, Train};
use crate::report::{Report, CONVENTION};

/// The whole JSON document of a search.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct Doc {
    /// What was asked.
    pub target: TargetJson,
    /// Trains meeting every constraint (a lower bound when `complete` is false).
    pub count: u64,
    /// False when interrupted.
    pub complete: bool,
    /// The ratio convention in words.
    pub convention: String,
    /// Ranking keys, most important first.
    pub rank: Vec<String>,
    /// How many trains were to be listed.
    pub limit: usize,
    /// Size of the Pareto front, for a Pareto search.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub pareto_size: Option<usize>,
    /// `I/N` when this document covers one part of a split search.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shard: Option<String>,
    /// What the mesh checks left out.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub rejected: Vec<RejectionJson>,
    /// The trains listed, best first.
    pub trains: Vec<TrainJson>,
}

/// The target as JSON.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct TargetJson {
    /// The ratio as typed.
    pub ratio: String,
    /// Its value.
    pub value: f64,
    /// Relative tolerance.
    pub tolerance: f64,
    /// The ratio exactly, reduced `p/q`.
    pub exact: String,
}

/// One kind of mesh-check rejection.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct RejectionJson {
    /// The kind of defect.
    pub kind: String,
    /// How many were left out.
    pub count: u64,
    /// The first one, in words.
    pub example: String,
}

/// The last line of a JSON-lines stream.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct Summary {
    /// What was asked.
    pub target: TargetJson,
    /// Trains streamed.
    pub count: u64,
    /// False when interrupted.
    pub complete: bool,
}

/// One train as JSON; shared by every command that lists trains.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct TrainJson {
    /// Reduced `p/q`.
    pub ratio: String,
    /// The ratio as a float.
    pub value: f64,
    /// Signed relative error `i/R − 1`.
    pub error: f64,
    /// Number of meshes.
    pub meshes: usize,
    /// Output direction.
    pub direction: Direction,
    /// Sum of teeth.
    pub size: u32,
    /// Largest pitch diameter, mm.
    pub span: f64,
    /// Stages input to output.
    pub stages: Vec<StageJson>,
}

/// One stage as JSON.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct StageJson {
    /// Driver teeth.
    pub driver: u32,
    /// Driven teeth.
    pub driven: u32,
    /// Module, mm.
    pub module: f64,
    /// Standard centre distance, mm.
    pub centre_distance: f64,
    /// Pressure angle, degrees.
    pub pressure_angle: f64,
    /// Diametral pitch when given in inch terms.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub diametral_pitch: Option<f64>,
    /// Stock labels of the driver.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub driver_labels: Vec<String>,
    /// Stock labels of the driven gear.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub driven_labels: Vec<String>,
    /// Profile shifts `[x_driver, x_driven]`, in modules (when meshes were worked out).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shift: Option<[f64; 2]>,
    /// Working centre distance actually reached, mm.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub working_centre_distance: Option<f64>,
    /// Working pressure angle, degrees.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub working_pressure_angle: Option<f64>,
    /// Transverse contact ratio.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub contact_ratio: Option<f64>,
    /// Tip diameters `[driver, driven]`, mm.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tip_diameters: Option<[f64; 2]>,
}

impl TrainJson {
    /// The JSON view of a train.
    pub fn from_train(t: &Train) -> TrainJson {
        TrainJson {
            ratio: t.ratio.to_string(),
            value: t.ratio.to_f64(),
            error: t.error.to_f64(),
            meshes: t.meshes(),
            direction: t.direction(),
            size: t.size(),
            span: t.span_mm(),
            stages: t
                .stages
                .iter()
                .map(|s| StageJson {
                    driver: s.driver.teeth,
                    driven: s.driven.teeth,
                    module: s.module_mm,
                    centre_distance: s.centre_distance_mm(),
                    pressure_angle: s.pressure_angle_deg,
                    diametral_pitch: s.diametral_pitch,
                    driver_labels: s.driver.labels.clone(),
                    driven_labels: s.driven.labels.clone(),
                    shift: s.mesh.map(|m| m.shift),
                    working_centre_distance: s.mesh.map(|m| m.centre_distance_mm),
                    working_pressure_angle: s.mesh.map(|m| m.working_pressure_angle_deg),
                    contact_ratio: s.mesh.map(|m| m.contact_ratio),
                    tip_diameters: s.mesh.map(|m| m.tip_diameter_mm),
                })
                .collect(),
        }
    }
}

/// The target of a problem as JSON.
pub fn target_json(problem: &crate::model::problem::Problem) -> TargetJson {
    let t = &problem.target;
    TargetJson {
        ratio: t.text.clone(),
        value: t.ratio.to_f64(),
        tolerance: t.tolerance.to_f64(),
        exact: t.ratio.to_string(),
    }
}

/// The document for a report.
pub fn doc(report: &Report) -> Doc {
    Doc {
        target: target_json(report.problem),
        count: report.outcome.count,
        complete: report.outcome.complete,
        convention: CONVENTION.to_string(),
        rank: report.problem.rank.iter().map(|k| k.name().to_string()).collect(),
        limit: report.problem.limit,
        pareto_size: report.outcome.pareto_size,
        shard: report.shard.map(|s| s.to_string()),
        rejected: report
            .outcome
            .rejected
            .iter()
            .map(|r| RejectionJson { kind: r.kind.clone(), count: r.count, example: r.example.clone() })
            .collect(),
        trains: report.outcome.trains.iter().map(TrainJson::from_train).collect(),
    }
}

/// Write a document and a newline.
pub fn write_doc(doc: &Doc, w: &mut dyn Write) -> io::Result<()> {
    serde_json::to_writer_pretty(&mut *w, doc).map_err(io::Error::from)?;
    writeln!(w)
}

/// Write the report as one JSON document and a newline.
pub fn write(report: &Report, w: &mut dyn Write) -> io::Result<()> {
    write_doc(&doc(report), w)
}

/// Write one value as a single JSON line.
pub fn write_line<T: Serialize>(value: &T, w: &mut dyn Write) -> io::Result<()> {
    serde_json::to_writer(&mut *w, value).map_err(io::Error::from)?;
    writeln!(w)
}
