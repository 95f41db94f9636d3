//! Reducers (`gearsieve reducer`) in every format.

pub mod csv;
pub mod document;
pub mod json;

use std::io::Write;

use super::{Completion, Document, RenderError, Report};
use crate::trades::reducer::ReducerPlan;

impl Report for ReducerPlan {
    fn kind(&self) -> &'static str {
        "a reducer search"
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
        json::write(self, w)
    }
}
