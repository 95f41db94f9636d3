//! A thread chart: the best setup on one lathe for every thread of a series, and for threads
//! out of reach the nearest pitch that can be cut. Owns only the walk over the series; each row
//! is one [`super::Lathe::plan`].

use super::series::SeriesEntry;
use super::{Lathe, Setup, ThreadSpec};
use crate::engine::RunOptions;
use crate::error::Result;

/// One line of the chart.
#[derive(Debug, Clone, PartialEq)]
pub struct ChartRow {
    /// The thread's name in the series.
    pub label: String,
    /// The thread (one start).
    pub thread: ThreadSpec,
    /// The best setup within tolerance, if any.
    pub best: Option<Setup>,
    /// How many setups are within tolerance.
    pub count: u64,
    /// When none is: the nearest that can be set up (pitch off by under a third), if any.
    pub nearest: Option<Setup>,
}

/// A finished chart.
#[derive(Debug, Clone, PartialEq)]
pub struct Chart {
    /// Rows in series order.
    pub rows: Vec<ChartRow>,
    /// False when interrupted (later rows are missing).
    pub complete: bool,
}

impl Chart {
    /// Rows with a setup within tolerance.
    pub fn reachable(&self) -> usize {
        self.rows.iter().filter(|r| r.best.is_some()).count()
    }
}

/// Chart every entry of `series` on `lathe`, listing one setup per thread.
pub fn chart(lathe: &Lathe, series: &[SeriesEntry], options: &RunOptions) -> Result<Chart> {
    let one = Lathe { limit: 1, ..lathe.clone() };
    let mut rows = Vec::new();
    let mut complete = true;
    for e in series {
        if options.cancel.is_some_and(|c| c.load(std::sync::atomic::Ordering::Relaxed)) {
            complete = false;
            break;
        }
        let thread = ThreadSpec::thread(e.pitch.clone(), 1);
        let plan = one.plan(&thread, options)?;
        complete &= plan.complete;
        let best = plan.setups.into_iter().next();
        let nearest = if best.is_none() { one.nearest(&thread, options)? } else { None };
        rows.push(ChartRow { label: e.label.clone(), thread, best, count: plan.count, nearest });
    }
    Ok(Chart { rows, complete })
}
