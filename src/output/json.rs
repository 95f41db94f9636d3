//! The JSON format, a contract scripts rely on:
//!
//! ```text
//! {"target": {"ratio": "<as given>", "value": f64, "tolerance": f64, "exact": "p/q"},
//!  "count": n, "complete": bool,
//!  "trains": [{"ratio": "p/q", "value": f64, "error": signed i/R − 1, "meshes": n,
//!              "direction": "same"|"opposite", "size": n, "span": mm,
//!              "stages": [{"driver": z, "driven": z, "module": mm, "centre_distance": mm,
//!                          "pressure_angle": deg, …}]}]}
//! ```
//! Field names and meanings are stable; fields may be added.

use std::io::{self, Write};

use serde::Serialize;

use super::{Report, CONVENTION};
use crate::train::{Direction, Train};

#[derive(Serialize)]
struct Doc<'a> {
    target: TargetJson<'a>,
    count: u64,
    complete: bool,
    convention: &'static str,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    rejected: Vec<RejectionJson>,
    trains: Vec<TrainJson>,
}

#[derive(Serialize)]
struct RejectionJson {
    kind: String,
    count: u64,
    example: String,
}

#[derive(Serialize)]
struct TargetJson<'a> {
    ratio: &'a str,
    value: f64,
    tolerance: f64,
    exact: String,
}

/// One train as JSON; shared by every command that lists trains.
#[derive(Serialize, Debug, Clone, PartialEq)]
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
#[derive(Serialize, Debug, Clone, PartialEq)]
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
    #[serde(skip_serializing_if = "Option::is_none")]
    pub diametral_pitch: Option<f64>,
    /// Stock labels of the driver.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub driver_labels: Vec<String>,
    /// Stock labels of the driven gear.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub driven_labels: Vec<String>,
    /// Profile shifts `[x_driver, x_driven]`, in modules (when meshes were worked out).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shift: Option<[f64; 2]>,
    /// Working centre distance actually reached, mm.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub working_centre_distance: Option<f64>,
    /// Working pressure angle, degrees.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub working_pressure_angle: Option<f64>,
    /// Transverse contact ratio.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub contact_ratio: Option<f64>,
    /// Tip diameters `[driver, driven]`, mm.
    #[serde(skip_serializing_if = "Option::is_none")]
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

/// Write the report as one JSON document and a newline.
pub fn write(report: &Report, w: &mut dyn Write) -> io::Result<()> {
    let t = &report.problem.target;
    let doc = Doc {
        target: TargetJson {
            ratio: &t.text,
            value: t.ratio.to_f64(),
            tolerance: t.tolerance.to_f64(),
            exact: t.ratio.to_string(),
        },
        count: report.outcome.count,
        complete: report.outcome.complete,
        convention: CONVENTION,
        rejected: report
            .outcome
            .rejected
            .iter()
            .map(|r| RejectionJson { kind: r.kind.clone(), count: r.count, example: r.example.clone() })
            .collect(),
        trains: report
            .outcome
            .trains
            .iter()
            .map(TrainJson::from_train)
            .collect(),
    };
    serde_json::to_writer_pretty(&mut *w, &doc).map_err(io::Error::other)?;
    writeln!(w)
}
