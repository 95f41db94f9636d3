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

/// The format asked for, or else the one `output`'s extension names (`.csv`, `.json`, `.md`,
/// `.svg`, `.html`, `.txt` for a table), or else `default`: `--output part-3.json` writes JSON.
pub fn chosen_format(
    given: Option<FormatArg>,
    output: Option<&std::path::Path>,
    default: FormatArg,
) -> FormatArg {
    let by_extension = || {
        let ext = output?.extension()?.to_str()?.to_ascii_lowercase();
        Some(match ext.as_str() {
            "csv" => FormatArg::Csv,
            "json" => FormatArg::Json,
            "md" | "markdown" => FormatArg::Markdown,
            "svg" => FormatArg::Svg,
            "html" | "htm" => FormatArg::Html,
            "txt" => FormatArg::Table,
            _ => return None,
        })
    };
    given.or_else(by_extension).unwrap_or(default)
}

/// Flags shared by every command that prints results.
#[derive(Args, Debug, Clone)]
pub struct PrintArgs {
    /// Output format [default: table; with --output, the one its extension names: .csv, .json,
    /// .md, .svg, .html].
    #[arg(long, value_enum)]
    pub format: Option<FormatArg>,
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

impl PrintArgs {
    /// The format to print in (see [`chosen_format`]).
    pub fn format(&self) -> FormatArg {
        chosen_format(self.format, self.output.as_deref(), FormatArg::Table)
    }
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

#[cfg(test)]
mod tests {
    use super::*;
    use std::path::Path;

    #[test]
    fn the_output_file_names_the_format_unless_one_is_given() {
        let f = |given, out: Option<&str>| chosen_format(given, out.map(Path::new), FormatArg::Table);
        assert!(matches!(f(None, Some("part-3.json")), FormatArg::Json));
        assert!(matches!(f(None, Some("trains.CSV")), FormatArg::Csv));
        assert!(matches!(f(None, Some("sheet.md")), FormatArg::Markdown));
        assert!(matches!(f(None, Some("train.svg")), FormatArg::Svg));
        assert!(matches!(f(None, Some("page.html")), FormatArg::Html));
        // Given wins; an unknown extension or none keeps the default.
        assert!(matches!(f(Some(FormatArg::Csv), Some("part.json")), FormatArg::Csv));
        assert!(matches!(f(None, Some("notes.dat")), FormatArg::Table));
        assert!(matches!(f(None, None), FormatArg::Table));
        assert!(matches!(chosen_format(None, None, FormatArg::Json), FormatArg::Json));
    }
}
