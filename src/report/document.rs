//! What people read, before it is given a format: a [`Document`] of titles, headings, lines,
//! list items, notes and [`Table`]s. Every result kind builds one; the text and Markdown sinks
//! (and any later format for people) lay it out. It holds finished words and cells only: it
//! computes nothing about gears and knows no format.

/// A result laid out for people, block by block.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Document {
    blocks: Vec<Block>,
}

/// One block of a [`Document`].
#[derive(Debug, Clone, PartialEq)]
pub enum Block {
    /// What the result is about, first in the document (a top-level heading in Markdown).
    Title(String),
    /// The heading of a part of the result.
    Heading(String),
    /// A line of running text.
    Line(String),
    /// A break between parts.
    Blank,
    /// An entry of a list; `depth` 1 is the outermost.
    Item {
        /// Nesting, from 1.
        depth: usize,
        /// Whether the entry is marked with a dash in text (nested reasons are; group lines
        /// are not).
        bullet: bool,
        /// The words.
        text: String,
    },
    /// Rows in columns.
    Table(Table),
    /// A closing remark: the ratio convention, a caution.
    Note(String),
}

/// How the cells of a column line up.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Align {
    /// Flush left (words).
    Left,
    /// Flush right (numbers).
    Right,
}

/// One column of a [`Table`].
#[derive(Debug, Clone, PartialEq)]
pub struct Column {
    /// The column's heading.
    pub head: String,
    /// How its cells line up.
    pub align: Align,
    /// The least width of its cells in text, in characters.
    pub min_width: usize,
    /// Written before every cell in text, where a headless table names its values inline
    /// (`aw 75.000`); formats with headings show the heading instead.
    pub prefix: String,
}

/// Rows of cells under named columns.
#[derive(Debug, Clone, PartialEq)]
pub struct Table {
    /// The columns, left to right.
    pub columns: Vec<Column>,
    /// The rows; each has one cell per column.
    pub rows: Vec<Vec<String>>,
    /// Whether text shows the headings as a first row.
    pub head_in_text: bool,
    /// Spaces between columns in text.
    pub gap: usize,
    /// Spaces before each row in text.
    pub indent: usize,
}

impl Table {
    /// A table with these column headings, the columns numbered in `right` flush right, two
    /// spaces between columns, headings shown.
    pub fn new<H: AsRef<str>>(heads: &[H], right: &[usize]) -> Table {
        let columns = heads
            .iter()
            .enumerate()
            .map(|(i, h)| Column {
                head: h.as_ref().to_string(),
                align: if right.contains(&i) { Align::Right } else { Align::Left },
                min_width: 0,
                prefix: String::new(),
            })
            .collect();
        Table { columns, rows: Vec::new(), head_in_text: true, gap: 2, indent: 0 }
    }

    /// Rows numbered from 1 in their first cell, the rest from `cells`: a listing's rows.
    pub fn numbered<T>(items: &[T], cells: impl Fn(&T) -> Vec<String>) -> Vec<Vec<String>> {
        items
            .iter()
            .enumerate()
            .map(|(n, item)| {
                let mut row = vec![(n + 1).to_string()];
                row.extend(cells(item));
                row
            })
            .collect()
    }

    /// Add a row.
    pub fn row(&mut self, cells: Vec<String>) {
        self.rows.push(cells);
    }

    /// The same table with these rows.
    pub fn with_rows(mut self, rows: Vec<Vec<String>>) -> Table {
        self.rows = rows;
        self
    }

    /// The same table without its headings in text (a run of aligned lines).
    pub fn headless_in_text(mut self) -> Table {
        self.head_in_text = false;
        self
    }

    /// The same table with `gap` spaces between columns and `indent` before each row, in text.
    pub fn spaced(mut self, gap: usize, indent: usize) -> Table {
        self.gap = gap;
        self.indent = indent;
        self
    }

    /// The same table with the least text width of each column (missing ones stay 0).
    pub fn min_widths(mut self, widths: &[usize]) -> Table {
        for (c, w) in self.columns.iter_mut().zip(widths) {
            c.min_width = *w;
        }
        self
    }

    /// The same table with a text prefix before every cell of column `column`.
    pub fn prefix(mut self, column: usize, prefix: &str) -> Table {
        if let Some(c) = self.columns.get_mut(column) {
            c.prefix = prefix.to_string();
        }
        self
    }
}

impl Document {
    /// An empty document.
    pub fn new() -> Document {
        Document::default()
    }

    /// The blocks, in order.
    pub fn blocks(&self) -> &[Block] {
        &self.blocks
    }

    /// Add the title.
    pub fn title(&mut self, text: impl Into<String>) {
        self.blocks.push(Block::Title(text.into()));
    }

    /// Add a heading.
    pub fn heading(&mut self, text: impl Into<String>) {
        self.blocks.push(Block::Heading(text.into()));
    }

    /// Add a line of text.
    pub fn line(&mut self, text: impl Into<String>) {
        self.blocks.push(Block::Line(text.into()));
    }

    /// Add a break between parts.
    pub fn blank(&mut self) {
        self.blocks.push(Block::Blank);
    }

    /// Add a list entry.
    pub fn item(&mut self, depth: usize, bullet: bool, text: impl Into<String>) {
        self.blocks.push(Block::Item { depth, bullet, text: text.into() });
    }

    /// Add a table.
    pub fn table(&mut self, table: Table) {
        self.blocks.push(Block::Table(table));
    }

    /// Add a closing note.
    pub fn note(&mut self, text: impl Into<String>) {
        self.blocks.push(Block::Note(text.into()));
    }
}
