//! Search results (`gearsieve search`, and `gearsieve merge` of a split search) in every
//! format: the document people read, CSV rows, and the JSON contract that reads back for a
//! merge.

pub mod csv;
pub mod document;
pub mod json;
pub mod merge;
pub mod stream;
pub mod view;

use std::io::Write;

use super::words::describe_error_f64;
use super::{pictures, Completion, Document, Drawing, RenderError, Report};
use crate::engine::{Outcome, Shard};
use crate::model::problem::Problem;

/// A finished search, ready to print.
pub struct SearchReport<'a> {
    /// What was asked.
    pub problem: &'a Problem,
    /// What was found.
    pub outcome: &'a Outcome,
    /// Say why stage pairings were left out by the mesh checks.
    pub explain: bool,
    /// The part of the search this report covers, when the search is split.
    pub shard: Option<Shard>,
}

impl SearchReport<'_> {
    /// The search's JSON document: the whole result, from which every format is made.
    pub fn doc(&self) -> json::Doc {
        view::doc(self)
    }
}

impl Report for SearchReport<'_> {
    fn kind(&self) -> &'static str {
        "a search"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.outcome.complete, found: self.outcome.count > 0 }
    }

    fn document(&self) -> Option<Document> {
        self.doc().document()
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        self.doc().csv(w)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        self.doc().json(w)
    }

    fn drawing(&self) -> Option<Drawing> {
        self.doc().drawing()
    }
}

/// A search's JSON document, read back or merged from the parts of a split search: the same
/// formats as the search that wrote it.
impl Report for json::Doc {
    fn kind(&self) -> &'static str {
        "a search"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.complete, found: self.count > 0 }
    }

    fn document(&self) -> Option<Document> {
        Some(document::document(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(json::write_doc(self, w)?)
    }

    /// The best train listed.
    fn drawing(&self) -> Option<Drawing> {
        let best = self.trains.first()?;
        let title = format!(
            "Train 1 for ratio {}: i = {} ({})",
            self.target.ratio,
            best.ratio,
            describe_error_f64(best.error)
        );
        Some(pictures::train(&best.stages, &title, ("input", "output")))
    }
}
