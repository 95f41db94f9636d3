//! The CSV format of a search: a header, then one row per train, best first. A row is `rank`,
//! the train's own columns ([`crate::report::fields::TRAIN_HEADER`]) and the stage columns of
//! [`crate::report::fields::StageColumns`], up to the most stages the search allowed, so every
//! row has the same columns; with `--explain` over worked-out meshes each stage's gear data
//! ([`crate::report::gear_data::csv_header`]) follows. [`Layout`] also serves the streaming mode, where the first column
//! is `order`, the order trains were found in.

use std::io::{self, Write};

use super::json::Doc;
use crate::model::problem::Problem;
use crate::report::fields::{train_cells, StageColumns, TrainJson, TRAIN_HEADER};
use crate::report::gear_data;

/// The columns of a search's CSV.
#[derive(Debug, Clone, Copy)]
pub struct Layout {
    /// The stage columns.
    pub stages: StageColumns,
    /// Whether each stage's gear data columns follow (`--explain` over worked-out meshes).
    pub gear_data: bool,
}

impl Layout {
    /// The layout for the trains of `problem`.
    pub fn of(problem: &Problem) -> Layout {
        Layout {
            stages: StageColumns { stages: problem.stages.hi as usize, mesh: problem.mesh.is_some() },
            gear_data: false,
        }
    }

    fn of_doc(doc: &Doc) -> Layout {
        let most = doc.stage_counts.iter().copied().max().unwrap_or(0);
        Layout {
            stages: StageColumns { stages: most, mesh: doc.mesh_checks },
            gear_data: doc.explain && doc.mesh_checks,
        }
    }

    /// The header row; `first` names the first column (`rank` or `order`).
    pub fn header(&self, first: &str) -> Vec<String> {
        let mut head = vec![first.to_string()];
        head.extend(TRAIN_HEADER.iter().map(|s| s.to_string()));
        head.extend(self.stages.header());
        if self.gear_data {
            for k in 1..=self.stages.stages {
                head.extend(gear_data::csv_header(&format!("stage{k}_driver_")));
                head.extend(gear_data::csv_header(&format!("stage{k}_driven_")));
            }
        }
        head
    }

    /// One train's row; `n` is its rank (or its order in a stream), from 1.
    pub fn row(&self, n: u64, t: &TrainJson) -> Vec<String> {
        let mut row = vec![n.to_string()];
        row.extend(train_cells(t));
        row.extend(self.stages.cells(t));
        if self.gear_data {
            for k in 0..self.stages.stages {
                let pair = t.stages.get(k).and_then(|s| s.gear_data.as_ref());
                row.extend(gear_data::csv_cells(pair.map(|p| &p.gears[0])));
                row.extend(gear_data::csv_cells(pair.map(|p| &p.gears[1])));
            }
        }
        row
    }
}

/// Write the search as CSV.
pub fn write(doc: &Doc, w: &mut dyn Write) -> io::Result<()> {
    let layout = Layout::of_doc(doc);
    let mut out = ::csv::Writer::from_writer(w);
    out.write_record(layout.header("rank"))?;
    for (i, t) in doc.trains.iter().enumerate() {
        out.write_record(layout.row(i as u64 + 1, t))?;
    }
    out.flush()?;
    Ok(())
}
