//! Flags shared by every command that prints results, and the loading of `--stock` files.

use std::path::PathBuf;

use clap::{Args, ValueEnum};
use gearsieve::model::catalog::{self, CatalogueDefaults};
use gearsieve::model::pool::{check_module, Pool};
use gearsieve::numbers::target::parse_number;
use gearsieve::report::Format;
use gearsieve::{Error, Quantity};

/// The output format flag.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum FormatArg {
    /// Aligned text.
    Table,
    /// One row per result.
    Csv,
    /// The documented JSON contract.
    Json,
    /// Markdown with pipe tables.
    Markdown,
    /// A drawing of the best result to scale (mm), as SVG.
    Svg,
    /// A self-contained page to print on A4 (a chart adds a drawing of each setup).
    Html,
}

/// The tooth form flag.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum ToothFormArg {
    /// Involute teeth by a basic rack, shifted where a centre distance needs it.
    Involute,
    /// Cycloidal wheel-and-pinion teeth as clocks are cut: no shift, centre distance
    /// m·(z1 + z2)/2, pinions from 6 leaves.
    Cycloidal,
}

impl From<ToothFormArg> for gearsieve::ToothForm {
    fn from(f: ToothFormArg) -> gearsieve::ToothForm {
        match f {
            ToothFormArg::Involute => gearsieve::ToothForm::Involute,
            ToothFormArg::Cycloidal => gearsieve::ToothForm::Cycloidal,
        }
    }
}

impl From<FormatArg> for Format {
    fn from(f: FormatArg) -> Format {
        match f {
            FormatArg::Table => Format::Table,
            FormatArg::Csv => Format::Csv,
            FormatArg::Json => Format::Json,
            FormatArg::Markdown => Format::Markdown,
            FormatArg::Svg => Format::Svg,
            FormatArg::Html => Format::Html,
        }
    }
}

/// Flags shared by every command that prints results.
#[derive(Args, Debug, Clone)]
pub struct PrintArgs {
    /// Output format.
    #[arg(long, value_enum, default_value = "table")]
    pub format: FormatArg,
    /// Write results to FILE (atomically: complete or not at all) instead of standard output.
    #[arg(long, value_name = "FILE")]
    pub output: Option<PathBuf>,
    /// Worker threads (default: all cores). Results do not depend on it.
    #[arg(long, value_name = "N", value_parser = clap::value_parser!(u16).range(1..=1024))]
    pub threads: Option<u16>,
    /// No progress bar.
    #[arg(long, short)]
    pub quiet: bool,
}

/// A number for a flag read as a float (a module, an angle, a contact ratio), in the syntax
/// every number shares (`1.5`, `2.5e-1`, `3/2`), with a minus sign where the value may be
/// negative. Each flag's own limits are checked where the value is used; this says only what
/// a number looks like, so that text which is none is told so in one line.
pub fn number(text: &str) -> Result<f64, String> {
    let t = text.trim();
    let (sign, body) = match t.strip_prefix('-') {
        Some(rest) => (-1.0, rest),
        None => (1.0, t),
    };
    parse_number(body)
        .map(|v| sign * v.to_f64())
        .map_err(|why| format!("{why}; wanted a number such as 1.5, 0.25 or 2.5e-1"))
}

/// Load every `--stock` file into one pool. A default module given on the command line (as
/// `module_from`) is checked first, so that its error names that flag and not the first row
/// that lacks a module.
pub fn load_stock(
    files: &[PathBuf],
    defaults: CatalogueDefaults,
    module_from: Quantity,
) -> Result<Pool, Error> {
    if let Some(m) = defaults.module_mm {
        check_module(m, &|e| Error::value(module_from, e))?;
    }
    let mut gears = Vec::new();
    for f in files {
        gears.extend(catalog::load(f, defaults)?);
    }
    let names: Vec<String> = files.iter().map(|f| f.display().to_string()).collect();
    Pool::from_stock(&gears, &format!("catalogue {}", names.join(", ")))
}
