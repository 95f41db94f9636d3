//! The CSV format of a search: a header, then one row per listed train, best first. A row is
//! `rank`, the train's own columns ([`crate::report::fields::TRAIN_HEADER`]), for a listing of
//! gear sets `arrangements` (how many the set has) and `arrangement` (1 for the set's best, 2…
//! for the others under it, when asked for, with the set's rank), with gears to buy
//! `to_buy_count` and `to_buy` (`1 × 127`, or `nothing`), and the stage columns of
//! [`crate::report::fields::StageColumns`], up to the most stages the search allowed, so every
//! row has the same columns; with `--explain` over worked-out meshes each stage's gear data
//! ([`crate::report::gear_data::csv_header`]) follows. [`Layout`] also serves the streaming mode, where the first column
//! is `order`, the order trains were found in.

use std::io::{self, Write};

use super::json::Doc;
use crate::model::problem::Problem;
use crate::model::purchase::describe_to_buy;
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

/// The gear-set columns, after the train's own.
const SET_HEADER: [&str; 2] = ["arrangements", "arrangement"];

/// The columns of a search with gears to buy, after the gear-set columns: how many gears the
/// train needs bought, and which (`1 × 40, 1 × 127`, or `nothing`).
const BUY_HEADER: [&str; 2] = ["to_buy_count", "to_buy"];

/// Write the search as CSV.
pub fn write(doc: &Doc, w: &mut dyn Write) -> io::Result<()> {
    let layout = Layout::of_doc(doc);
    let by_set = doc.trains.iter().any(|t| t.arrangements.is_some());
    let mut out = ::csv::Writer::from_writer(w);
    let mut head = layout.header("rank");
    let at = 1 + TRAIN_HEADER.len();
    if doc.buy.is_some() {
        head.splice(at..at, BUY_HEADER.iter().map(|s| s.to_string()));
    }
    if by_set {
        head.splice(at..at, SET_HEADER.iter().map(|s| s.to_string()));
    }
    out.write_record(head)?;
    for (i, t) in doc.trains.iter().enumerate() {
        let listed = std::iter::once(t).chain(&t.other_arrangements);
        for (j, a) in listed.enumerate() {
            let mut row = layout.row(i as u64 + 1, a);
            let at = 1 + TRAIN_HEADER.len();
            if let Some(b) = &a.to_buy {
                let count: u32 = b.iter().map(|x| x.count).sum();
                row.splice(at..at, [count.to_string(), describe_to_buy(b)]);
            }
            if by_set {
                let set = [t.arrangements.map_or(String::new(), |n| n.to_string()), (j + 1).to_string()];
                row.splice(at..at, set);
            }
            out.write_record(row)?;
        }
    }
    out.flush()?;
    Ok(())
}
