//! `gearsieve merge`: combine the JSON of the parts of a split search (`search --shard I/N
//! --format json`) into exactly the JSON the unsplit search prints.

use std::path::PathBuf;

use clap::Args;
use gearsieve::report::search::json::{write_doc, Doc};
use gearsieve::Error;

use super::{EXIT_INTERRUPTED, EXIT_NOTHING_FOUND, EXIT_OK};

/// Combine the JSON results of every part of a split search.
#[derive(Args, Debug)]
pub struct MergeArgs {
    /// The JSON files written by `gearsieve search --shard I/N --format json`, one per part.
    #[arg(value_name = "FILES", required = true)]
    pub files: Vec<PathBuf>,
    /// Write the merged JSON to FILE (atomically) instead of standard output.
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
    let mut buf = Vec::new();
    write_doc(&merged, &mut buf)?;
    if !super::output::emit(args.output.as_deref(), &buf)? {
        return Ok(EXIT_OK);
    }
    Ok(if !merged.complete {
        EXIT_INTERRUPTED
    } else if merged.count == 0 {
        EXIT_NOTHING_FOUND
    } else {
        EXIT_OK
    })
}
