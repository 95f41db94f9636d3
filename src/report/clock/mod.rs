//! Clock trains (`gearsieve clock going|motion|astro`) in every format.

pub mod csv;
pub mod document;
pub mod json;

use std::io::Write;

use super::fields::TrainJson;
use super::words::describe_error;
use super::{pictures, Completion, Document, Drawing, RenderError, Report};
use crate::geometry::layout::ShaftLayout;
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

    fn drawing(&self) -> Option<Drawing> {
        let best = self.trains.first()?;
        let title = format!("Going train 1: i = {}, wheels driving pinions", best.train.ratio);
        Some(pictures::train(
            &TrainJson::from_train(&best.train).stages,
            &title,
            ("driving arbor", "escape arbor"),
        ))
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

    /// The best train; a coaxial motion work folded back so the hand arbor sits on the input's.
    fn drawing(&self) -> Option<Drawing> {
        let best = self.trains.first()?;
        let title = format!("Motion work 1: i = {} ({})", best.ratio, describe_error(&best.error));
        let layout =
            if self.spec.coaxial { ShaftLayout::Folded { turn_deg: 180.0 } } else { ShaftLayout::Inline };
        Some(pictures::train_laid_out(
            &TrainJson::from_train(best).stages,
            &title,
            ("minute arbor", "hand"),
            layout,
        ))
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

    fn drawing(&self) -> Option<Drawing> {
        let best = self.trains.first()?;
        let title = format!(
            "Astronomical train 1 for {}: i = {} ({})",
            self.spec.period.name,
            best.train.ratio,
            describe_error(&best.train.error)
        );
        Some(pictures::train(&TrainJson::from_train(&best.train).stages, &title, ("input arbor", "dial")))
    }
}
