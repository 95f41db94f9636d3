//! The presentation layer: every result kind, in every format, behind one trait.
//!
//! A result kind (a search, a mesh check, thread setups, a chart, clock trains, a reducer)
//! implements [`Report`]: it lays itself out for people as a [`Document`] and, where it has
//! them, writes its CSV rows and its JSON contract. The formats for people are sinks of the
//! document — [`text`] and [`markdown`] — so a new format for people is one sink file, one
//! [`Format`] value and one default method here, and every result kind has it at once. A format
//! a kind does not offer says so ([`RenderError::NotOffered`]).
//!
//! Nothing here computes anything about gears: the kinds read finished results and write words
//! and numbers. Shared wording (errors, tolerances, counts, the convention and the cautions)
//! is in [`words`], once.
//!
//! - [`document`]: the format-neutral [`Document`] of titles, lines, lists and tables.
//! - [`text`], [`markdown`], [`html`]: sinks of a document (HTML with the result's figures).
//! - [`drawing`], [`svg`], [`pictures`]: the format-neutral [`Drawing`], its SVG sink, and the
//!   pictures of trains and pairs.
//! - [`search`], [`mesh`], [`thread`], [`clock`], [`reducer`], [`planetary`]: one folder per result family,
//!   with its document, CSV and JSON.

pub mod clock;
pub mod document;
pub mod drawing;
pub mod fields;
pub mod gear_data;
pub mod html;
pub mod markdown;
pub mod mesh;
pub mod pictures;
pub mod planetary;
pub mod profile;
pub mod reducer;
pub mod search;
pub mod svg;
pub mod text;
pub mod thread;
pub mod words;

use std::io::{self, Write};

pub use document::{Align, Block, Column, Document, Table};
pub use drawing::Drawing;

/// The version of the JSON contracts of every result kind (`schema_version` in each
/// document); it changes when a key is renamed or changes meaning.
pub const SCHEMA_VERSION: u32 = 4;

/// The output formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    /// Aligned text for people.
    Table,
    /// One row per result, for spreadsheets.
    Csv,
    /// The documented JSON contract, for scripts.
    Json,
    /// Markdown with pipe tables, for notes, wikis and issues.
    Markdown,
    /// A drawing to scale, for the eye, a printer or a cutter.
    Svg,
    /// One self-contained page to print on A4, with the result's figures drawn inline.
    Html,
}

impl Format {
    /// The format's name as users write it: `table`, `csv`, `json`, `markdown`, `svg`, `html`.
    pub fn name(self) -> &'static str {
        match self {
            Format::Table => "table",
            Format::Csv => "csv",
            Format::Json => "json",
            Format::Markdown => "markdown",
            Format::Svg => "svg",
            Format::Html => "html",
        }
    }
}

/// Why a result could not be rendered.
#[derive(Debug, thiserror::Error)]
pub enum RenderError {
    /// The result kind has no such format (a mesh check has no CSV rows, for example).
    #[error("{kind} is not offered as {}", format.name())]
    NotOffered {
        /// The format asked for.
        format: Format,
        /// The result kind, in words (`a mesh check`).
        kind: &'static str,
    },
    /// Writing failed (a closed pipe, a full disk).
    #[error(transparent)]
    Io(#[from] io::Error),
}

/// How a run ended, as its result tells: for the exit status and the last word on stderr.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Completion {
    /// False when the run was interrupted before it had looked at everything.
    pub complete: bool,
    /// Whether it found what was asked (a train, a setup, a mesh that runs).
    pub found: bool,
}

/// A result kind, presented: one method per format. The formats for people are built from
/// [`Report::document`]; CSV and JSON are the kind's own, and not offered unless it has them.
pub trait Report {
    /// The result kind in words, for messages: `a search`, `a mesh check`.
    fn kind(&self) -> &'static str;

    /// How the run that made this result ended.
    fn completion(&self) -> Completion;

    /// The result laid out for people; `None` when the kind has no layout for people (the
    /// merged JSON of a split search).
    fn document(&self) -> Option<Document>;

    /// Aligned text.
    fn table(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        let doc =
            self.document().ok_or(RenderError::NotOffered { format: Format::Table, kind: self.kind() })?;
        Ok(text::write(&doc, w)?)
    }

    /// Markdown.
    fn markdown(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        let doc =
            self.document().ok_or(RenderError::NotOffered { format: Format::Markdown, kind: self.kind() })?;
        Ok(markdown::write(&doc, w)?)
    }

    /// CSV rows.
    fn csv(&self, _w: &mut dyn Write) -> Result<(), RenderError> {
        Err(RenderError::NotOffered { format: Format::Csv, kind: self.kind() })
    }

    /// The JSON contract.
    fn json(&self, _w: &mut dyn Write) -> Result<(), RenderError> {
        Err(RenderError::NotOffered { format: Format::Json, kind: self.kind() })
    }

    /// The result drawn to scale; `None` when the kind has no picture.
    fn drawing(&self) -> Option<Drawing> {
        None
    }

    /// SVG.
    fn svg(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        let drawing =
            self.drawing().ok_or(RenderError::NotOffered { format: Format::Svg, kind: self.kind() })?;
        Ok(svg::write(&drawing, w)?)
    }

    /// Drawings the HTML page shows after the document (a chart's setups); none by default.
    fn figures(&self) -> Vec<Drawing> {
        Vec::new()
    }

    /// An HTML page: the document and the figures.
    fn html(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        let doc =
            self.document().ok_or(RenderError::NotOffered { format: Format::Html, kind: self.kind() })?;
        Ok(html::write(&doc, &self.figures(), w)?)
    }
}

/// A borrowed result presents as the result itself.
impl<T: Report + ?Sized> Report for &T {
    fn kind(&self) -> &'static str {
        (**self).kind()
    }

    fn completion(&self) -> Completion {
        (**self).completion()
    }

    fn document(&self) -> Option<Document> {
        (**self).document()
    }

    fn table(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        (**self).table(w)
    }

    fn markdown(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        (**self).markdown(w)
    }

    fn csv(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        (**self).csv(w)
    }

    fn json(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        (**self).json(w)
    }

    fn drawing(&self) -> Option<Drawing> {
        (**self).drawing()
    }

    fn svg(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        (**self).svg(w)
    }

    fn figures(&self) -> Vec<Drawing> {
        (**self).figures()
    }

    fn html(&self, w: &mut dyn Write) -> Result<(), RenderError> {
        (**self).html(w)
    }
}

/// Render `report` in `format` to `w`.
pub fn render(report: &dyn Report, format: Format, w: &mut dyn Write) -> Result<(), RenderError> {
    match format {
        Format::Table => report.table(w),
        Format::Csv => report.csv(w),
        Format::Json => report.json(w),
        Format::Markdown => report.markdown(w),
        Format::Svg => report.svg(w),
        Format::Html => report.html(w),
    }
}

/// Write one value as pretty-printed JSON and a newline: the JSON formats of every kind.
pub fn write_json<T: serde::Serialize>(value: &T, w: &mut dyn Write) -> Result<(), RenderError> {
    serde_json::to_writer_pretty(&mut *w, value).map_err(io::Error::from)?;
    writeln!(w)?;
    Ok(())
}
