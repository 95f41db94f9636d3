//! The JSON format of a search, a contract scripts rely on (every key is described in
//! `docs/output-fields.md`):
//!
//! ```text
//! {"schema_version": 3,
//!  "target": {"ratio": "<as given>", "value": f64, "tolerance": f64, "exact": "p/q"},
//!  "gears": "<the gears searched>", "stage_counts": [n, …], "stage_options": n,
//!  "mesh_checks": bool, "mixed_modules": bool,
//!  "count": n, "gear_set_count": n|null, "count_kind": "exact"|"lower_bound",
//!  "counted_within": f64 (lower bounds only), "complete": bool, "convention": "…", "ranked_by": ["error", …], "limit": k,
//!  "trains": [{"ratio": "p/q", "value": f64, "error": signed i/R − 1, "meshes": n,
//!              "direction": "same"|"opposite", "size": n, "span_mm": mm, "arrangements": n,
//!              "stages": [{"driver": z, "driven": z, "module_mm": mm,
//!                          "pressure_angle_deg": deg, "reference_centre_distance_mm": mm,
//!                          …}],
//!              "to_buy": [{"teeth": z, "module_mm": mm, "count": n}, …],
//!              "other_arrangements": [<train>, …]}],
//!  "buy": "<the gears that may be bought>"}
//! ```
//! Field names and meanings are stable within a `schema_version`; fields may be added. The
//! trains listed are gear sets, one each (its best arrangement), with the number of its
//! arrangements; `other_arrangements` only when every arrangement was asked for; `buy` and each
//! train's `to_buy` only when gears may be bought. The
//! document is the whole of a search's result: the table, Markdown and CSV formats are made
//! from it, and it reads back into [`Doc`] so that `gearsieve merge` can combine the parts of a
//! split search and print exactly what one run prints, in any format. With a limit of 0 the
//! trains stream as JSON lines instead (one [`TrainJson`] per line, then one [`Summary`] line).
//! This file holds the contract and writes it; `view.rs` makes the document from a result.

use std::io::{self, Write};

use serde::{Deserialize, Serialize};

use crate::report::fields::{TargetJson, TrainJson};

/// Whether a search's counts are exact or lower bounds.
#[derive(Serialize, Deserialize, Debug, Clone, Copy, PartialEq, Eq, Default)]
#[serde(rename_all = "snake_case")]
pub enum CountKind {
    /// Every train meeting the constraints was counted.
    #[default]
    Exact,
    /// Only the trains met on the way to the listed best were counted.
    LowerBound,
}

/// The whole JSON document of a search.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct Doc {
    /// The version of this contract, [`crate::report::SCHEMA_VERSION`].
    pub schema_version: u32,
    /// What was asked.
    pub target: TargetJson,
    /// The gears searched, in words.
    pub gears: String,
    /// The stage counts searched.
    pub stage_counts: Vec<usize>,
    /// Stage pairings allowed by the per-stage limits.
    pub stage_options: usize,
    /// Whether every mesh was worked out and checked (profile shift, contact ratio, …).
    pub mesh_checks: bool,
    /// Whether the gears come in more than one module or pressure angle.
    pub mixed_modules: bool,
    /// Trains meeting every constraint (a lower bound when `complete` is false).
    pub count: u64,
    /// The gear sets those trains are made of (a lower bound when `complete` is false); `null`
    /// when an engine counted trains in bulk without their gear sets.
    #[serde(default)]
    pub gear_set_count: Option<u64>,
    /// `exact` when every train meeting the constraints was counted; `lower_bound` when the
    /// search counted only the trains it met on the way to the listed best (`--count
    /// lower-bound`): `count` and `gear_set_count` are then lower bounds.
    #[serde(default)]
    pub count_kind: CountKind,
    /// With a lower-bound count: the |relative error| within which every train was counted, the
    /// error of the last listed (for a merge of parts, the least of the parts').
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub counted_within: Option<f64>,
    /// False when interrupted.
    pub complete: bool,
    /// The ratio convention in words.
    pub convention: String,
    /// Ranking keys, most important first.
    pub ranked_by: Vec<String>,
    /// How many gear sets were to be listed.
    pub limit: usize,
    /// Size of the Pareto front (of gear sets), for a Pareto search.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub pareto_size: Option<usize>,
    /// `I/N` when this document covers one part of a split search.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shard: Option<String>,
    /// Whether the reasons for leaving stage pairings out were asked for.
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub explain: bool,
    /// What the mesh checks left out.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub rejected: Vec<RejectionJson>,
    /// The gears that may be bought, in words, when trains may use gears not on hand; each
    /// listed train then says which it needs bought (`to_buy`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub buy: Option<String>,
    /// The gear sets listed, best first, each as its best arrangement.
    pub trains: Vec<TrainJson>,
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
    /// The version of this contract, [`crate::report::SCHEMA_VERSION`].
    pub schema_version: u32,
    /// What was asked.
    pub target: TargetJson,
    /// Trains streamed.
    pub count: u64,
    /// False when interrupted.
    pub complete: bool,
}

/// Write a document and a newline.
pub fn write_doc(doc: &Doc, w: &mut dyn Write) -> io::Result<()> {
    serde_json::to_writer_pretty(&mut *w, doc).map_err(io::Error::from)?;
    writeln!(w)
}

/// Write one value as a single JSON line.
pub fn write_line<T: Serialize>(value: &T, w: &mut dyn Write) -> io::Result<()> {
    serde_json::to_writer(&mut *w, value).map_err(io::Error::from)?;
    writeln!(w)
}
