//! Thread setups (`gearsieve thread`) and thread charts (`gearsieve chart`) in every format.

pub mod chart_buy;
pub mod csv;
pub mod document;
pub mod json;
pub mod picture;

use std::io::Write;

use super::{Completion, Document, Drawing, RenderError, Report};
use crate::trades::thread::chart::Chart;
use crate::trades::thread::{Lathe, Rejected, ThreadPlan};

pub use chart_buy::BuyChartReport;

/// A thread search, ready to print.
pub struct ThreadReport<'a> {
    /// The lathe and how it was searched.
    pub lathe: &'a Lathe,
    /// What was found.
    pub plan: &'a ThreadPlan,
    /// Trains the banjo refused, when they were asked for.
    pub rejected: Option<&'a [Rejected]>,
}

/// A chart, ready to print.
pub struct ChartReport<'a> {
    /// The lathe and how it was searched.
    pub lathe: &'a Lathe,
    /// The series' name or file.
    pub series: &'a str,
    /// The rows.
    pub chart: &'a Chart,
}

impl Report for ThreadReport<'_> {
    fn kind(&self) -> &'static str {
        "a thread search"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.plan.complete, found: self.plan.count > 0 }
    }

    fn document(&self) -> Option<Document> {
        Some(document::thread(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write_thread(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json::write_thread(self, w)
    }

    /// The best setup from the stud to the leadscrew, on the banjo when one is described.
    fn drawing(&self) -> Option<Drawing> {
        let best = self.plan.setups.first()?;
        let title = format!(
            "Setup 1 for {}: stud {} … leadscrew {}",
            self.plan.thread.pitch,
            best.stud(),
            best.leadscrew()
        );
        Some(picture::setup(best, self.lathe.banjo.as_ref(), &title))
    }
}

impl Report for ChartReport<'_> {
    fn kind(&self) -> &'static str {
        "a thread chart"
    }

    fn completion(&self) -> Completion {
        Completion { complete: self.chart.complete, found: self.chart.reachable() > 0 }
    }

    fn document(&self) -> Option<Document> {
        Some(document::chart(self))
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        Ok(csv::write_chart(self, w)?)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        json::write_chart(self, w)
    }

    /// Each reachable thread's best setup, in chart order, on the banjo when one is described.
    fn figures(&self) -> Vec<Drawing> {
        self.chart
            .rows
            .iter()
            .filter_map(|row| {
                let best = row.best.as_ref()?;
                let title = format!("{}: stud {} … leadscrew {}", row.label, best.stud(), best.leadscrew());
                Some(picture::setup(best, self.lathe.banjo.as_ref(), &title))
            })
            .collect()
    }
}
