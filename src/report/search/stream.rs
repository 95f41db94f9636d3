//! A search streamed as it runs (a limit of 0): every train written the moment it is found, as
//! CSV rows or JSON lines, so that no train is held. The CSV rows have the columns of the
//! listing with `order` (the order found) in place of `rank`; the JSON lines are one train each
//! and a closing [`Summary`] line with the count.

use std::io::{self, Write};

use super::csv::Layout;
use super::json::{write_line, Summary};
use super::view::target_json;
use crate::engine::Outcome;
use crate::model::problem::Problem;
use crate::model::train::Train;
use crate::report::fields::TrainJson;
use crate::report::{Format, RenderError, SCHEMA_VERSION};

/// Writes the trains of one search as they are found.
pub enum Stream<'w> {
    /// CSV rows.
    Csv {
        /// The writer (boxed: it holds its buffer).
        out: Box<::csv::Writer<&'w mut dyn Write>>,
        /// The columns.
        layout: Layout,
        /// Trains written so far.
        written: u64,
    },
    /// JSON lines.
    Json {
        /// The writer.
        out: &'w mut dyn Write,
    },
}

impl<'w> Stream<'w> {
    /// Start a stream of `problem`'s trains in `format` (CSV or JSON; the others hold the
    /// trains to lay them out, so they are not offered).
    pub fn start(problem: &Problem, format: Format, w: &'w mut dyn Write) -> Result<Stream<'w>, RenderError> {
        match format {
            Format::Csv => {
                let layout = Layout::of(problem);
                let mut out = Box::new(::csv::Writer::from_writer(w));
                out.write_record(layout.header("order")).map_err(csv_io)?;
                Ok(Stream::Csv { out, layout, written: 0 })
            }
            Format::Json => Ok(Stream::Json { out: w }),
            other => Err(RenderError::NotOffered { format: other, kind: "a streamed search" }),
        }
    }

    /// Write one train.
    pub fn train(&mut self, t: &Train) -> io::Result<()> {
        match self {
            Stream::Csv { out, layout, written } => {
                *written += 1;
                out.write_record(layout.row(*written, &TrainJson::from_train(t))).map_err(csv_io)
            }
            Stream::Json { out } => write_line(&TrainJson::from_train(t), &mut **out),
        }
    }

    /// Close the stream: the summary line of JSON lines, and flush.
    pub fn finish(self, problem: &Problem, outcome: &Outcome) -> io::Result<()> {
        match self {
            Stream::Csv { mut out, .. } => out.flush(),
            Stream::Json { out } => {
                let summary = Summary {
                    schema_version: SCHEMA_VERSION,
                    target: target_json(problem),
                    count: outcome.count,
                    complete: outcome.complete,
                };
                write_line(&summary, out)
            }
        }
    }
}

/// A CSV writer's error as the I/O error underneath, so a closed pipe is still seen as one.
fn csv_io(e: ::csv::Error) -> io::Error {
    match e.into_kind() {
        ::csv::ErrorKind::Io(e) => e,
        other => io::Error::other(format!("{other:?}")),
    }
}
