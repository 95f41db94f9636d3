//! `gearsieve merge`: combine the JSON of the parts of a split search (`search --shard I/N
//! --format json`) into exactly what the unsplit search prints, in any of its formats.

use std::path::PathBuf;

use clap::Args;
use gearsieve::report::search::json::Doc;
use gearsieve::Error;

use super::args::{chosen_format, FormatArg};
use super::run::{self, Print, Words};

/// Combine the JSON results of every part of a split search.
#[derive(Args, Debug)]
pub struct MergeArgs {
    /// The JSON files written by `gearsieve search --shard I/N --format json`, one per part.
    #[arg(value_name = "FILES", required = true)]
    pub files: Vec<PathBuf>,
    /// Output format: the JSON a whole search prints (for scripts and further merges), or any
    /// other format the search offers [default: json, or the one --output's extension names].
    #[arg(long, value_enum)]
    pub format: Option<FormatArg>,
    /// Write the merged result to FILE (atomically) instead of standard output.
    #[arg(long, value_name = "FILE")]
    pub output: Option<PathBuf>,
}

/// Run `gearsieve merge`.
pub fn run(args: MergeArgs) -> anyhow::Result<i32> {
    let mut docs = Vec::new();
    for f in &args.files {
        let name = f.display().to_string();
        let text =
            std::fs::read_to_string(f).map_err(|e| Error::problem(format!("{name}: cannot read it: {e}")))?;
        let doc: Doc = serde_json::from_str(&text)
            .map_err(|e| Error::problem(format!("{name}: not the JSON of a gearsieve search ({e})")))?;
        docs.push((name, doc));
    }
    let merged = gearsieve::report::search::merge::merge(docs)?;
    let format = chosen_format(args.format, args.output.as_deref(), FormatArg::Json);
    let print = Print { format: format.into(), output: args.output, threads: None, quiet: true };
    // The parts said what they found; a merge adds no words of its own.
    let words = Words { interrupted: None, nothing: None };
    run::present(&merged, &print, &words)
}
