//! Clock trains (`gearsieve clock going|motion|astro`) in every format.

pub mod csv;
pub mod document;
pub mod json;

use std::io::Write;

use super::{Completion, Document, RenderError, Report};
use crate::trades::clock::astro::AstroPlan;
use crate::trades::clock::going::GoingPlan;
use crate::trades::clock::motion::MotionPlan;

impl Report for GoingPlan {
    fn kind(&self) -> &'static str {
        "a going train"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.complete, found: self.count > 0 }
    }

    fn document(&self) -> Option<Document> {
        Some(document::going(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write_going(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json::write_going(self, w)
    }
}

impl Report for MotionPlan {
    fn kind(&self) -> &'static str {
        "a motion work"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.complete, found: self.count > 0 }
    }

    fn document(&self) -> Option<Document> {
        Some(document::motion(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write_motion(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json::write_motion(self, w)
    }
}

impl Report for AstroPlan {
    fn kind(&self) -> &'static str {
        "an astronomical train"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.complete, found: self.count > 0 }
    }

    fn document(&self) -> Option<Document> {
        Some(document::astro(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write_astro(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json::write_astro(self, w)
    }
}
