//! Output formats. Each format is a sink in its own file: it takes a finished [`Report`] and a
//! writer and prints; none of them computes anything about gears. Shared wording (how an error
//! or a number is written) lives here so the formats agree.

pub mod clock;
pub mod columns;
pub mod mesh;
pub mod reducer;
pub mod search;
pub mod thread;

use std::io::{self, Write};

use crate::engine::Outcome;
use crate::model::problem::Problem;
use crate::numbers::rational::RelError;

/// The ratio convention, in words, for reports and help.
pub const CONVENTION: &str = "ratio i = input turns per output turn = product of driven teeth / \
                              product of driver teeth (ISO 1122-1); above 1 reduces speed";

/// The caution printed under results.
pub const CAUTION: &str = "gearsieve checks ratios and geometry only. A train that carries real \
                           power needs a load-capacity rating (e.g. ISO 6336 or AGMA 2001) by a \
                           qualified person; follow local codes and licensed practice.";

/// A finished search, ready to print.
pub struct Report<'a> {
    /// What was asked.
    pub problem: &'a Problem,
    /// What was found.
    pub outcome: &'a Outcome,
    /// Say why stage pairings were left out by the mesh checks.
    pub explain: bool,
    /// The part of the search this report covers, when the search is split.
    pub shard: Option<crate::engine::Shard>,
}

/// The output formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    /// Aligned text for people.
    Table,
    /// One row per train.
    Csv,
    /// The documented JSON contract.
    Json,
}

/// Render `report` in `format` to `w`.
pub fn render(format: Format, report: &Report, w: &mut dyn Write) -> io::Result<()> {
    match format {
        Format::Table => search::document::write(report, w),
        Format::Csv => search::csv::write(report, w),
        Format::Json => search::json::write(report, w),
    }
}

/// A relative error for people: `exact`, `+3.21 ppm` or `-0.0123%`.
pub fn describe_error(e: &RelError) -> String {
    if e.is_exact() {
        return "exact".to_string();
    }
    let v = e.to_f64();
    if v.abs() < 1e-3 {
        format!("{:+.3} ppm", v * 1e6)
    } else {
        format!("{:+.4}%", v * 100.0)
    }
}

/// A tolerance for people: `0 (exact)`, `±10 ppm`, `±0.5%`.
pub fn describe_tolerance(t: f64) -> String {
    if t == 0.0 {
        "0 (exact only)".to_string()
    } else if t < 1e-3 {
        format!("±{} ppm", crate::model::pool::fmt_num(t * 1e6))
    } else {
        format!("±{}%", crate::model::pool::fmt_num(t * 100.0))
    }
}
