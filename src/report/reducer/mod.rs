//! Reducers (`gearsieve reducer`) in every format.

pub mod csv;
pub mod document;
pub mod json;

use std::io::Write;

use super::fields::TrainJson;
use super::words::describe_error;
use super::{pictures, Completion, Document, Drawing, RenderError, Report};
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

    fn drawing(&self) -> Option<Drawing> {
        let best = self.trains.first()?;
        let title = format!("Reducer train 1: i = {} ({})", best.ratio, describe_error(&best.error));
        Some(pictures::train(&TrainJson::from_train(best).stages, &title, ("motor", "output")))
    }
}
