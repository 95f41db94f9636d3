//! Clock trains (`gearsieve clock going|motion|strike|astro`) in every format.

pub mod csv;
pub mod document;
pub mod json;

use std::io::Write;

use super::fields::TrainJson;
use super::words::describe_error;
use super::{pictures, Completion, Document, Drawing, RenderError, Report};
use crate::geometry::layout::ShaftLayout;
use crate::geometry::CycloidalMesh;
use crate::model::train::Train;
use crate::trades::clock::astro::AstroPlan;
use crate::trades::clock::going::GoingPlan;
use crate::trades::clock::motion::MotionPlan;
use crate::trades::clock::strike::StrikePlan;

/// The JSON view of `train`, with the figures of its cycloidal pairs (when `pairs` has one per
/// stage) in the mesh fields: the centre distance, the contact ratio (leaves in action) and the
/// tip diameters, and the tooth form. No shift and no working pressure angle: cycloidal teeth
/// have neither.
pub fn train_json(train: &Train, pairs: &[CycloidalMesh]) -> TrainJson {
    let mut t = TrainJson::from_train(train);
    if pairs.len() == t.stages.len() {
        for (s, c) in t.stages.iter_mut().zip(pairs) {
            s.working_centre_distance_mm = Some(c.centre_distance_mm);
            s.contact_ratio = Some(c.contact_ratio);
            s.tip_diameter_mm = Some([c.gears[0].tip_diameter_mm, c.gears[1].tip_diameter_mm]);
            s.tooth_form = Some("cycloidal".into());
        }
    }
    t
}

impl Report for GoingPlan {
    fn kind(&self) -> &'static str {
        "a going train"
    }

    /// Found when every part is: the centre-to-escape train and, if asked, the great wheel's.
    fn completion(&self) -> Completion {
        let great = self.great.as_ref().map_or((true, true), |g| (g.complete, g.count > 0));
        Completion { complete: self.complete && great.0, found: self.count > 0 && great.1 }
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
            &train_json(&best.train, &best.cycloidal).stages,
            &title,
            ("centre arbor", "escape arbor"),
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
            &train_json(best, self.cycloidal.first().map_or(&[][..], |v| &v[..])).stages,
            &title,
            ("minute arbor", "hand"),
            layout,
        ))
    }
}

impl Report for StrikePlan {
    fn kind(&self) -> &'static str {
        "a striking train"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.complete(), found: self.found() }
    }

    fn document(&self) -> Option<Document> {
        Some(document::strike(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write_strike(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json::write_strike(self, w)
    }

    /// The best train from the great wheel to the fly, in a line.
    fn drawing(&self) -> Option<Drawing> {
        let stages: Vec<_> = self
            .parts
            .iter()
            .take(4)
            .map(|g| g.trains.first().map(|t| train_json(t, g.pairs(0)).stages))
            .collect::<Option<Vec<_>>>()?
            .concat();
        Some(pictures::train(&stages, "Striking train 1: great wheel to fly", ("great wheel", "fly")))
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
