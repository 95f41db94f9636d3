//! The text sink: a [`Document`] as aligned plain text for a terminal or a printout. Tables are
//! laid out in columns as wide as their widest cell; everything else is written as it is.

use std::io::{self, Write};

use super::document::{Align, Block, Document, Table};

/// Write `doc` as plain text.
pub fn write(doc: &Document, w: &mut dyn Write) -> io::Result<()> {
    for block in doc.blocks() {
        match block {
            Block::Title(s) | Block::Heading(s) | Block::Line(s) | Block::Note(s) => writeln!(w, "{s}")?,
            Block::Blank => writeln!(w)?,
            Block::Item { depth, bullet, text } => {
                let dash = if *bullet { "- " } else { "" };
                writeln!(w, "{}{dash}{text}", "  ".repeat(*depth))?
            }
            Block::Table(t) => table(t, w)?,
        }
    }
    Ok(())
}

/// Text width of a cell, in characters.
fn width(s: &str) -> usize {
    s.chars().count()
}

fn table(t: &Table, w: &mut dyn Write) -> io::Result<()> {
    let cells = |row: &[String], c: usize| row.get(c).map_or(0, |s| width(s));
    let widths: Vec<usize> = t
        .columns
        .iter()
        .enumerate()
        .map(|(c, col)| {
            let head = if t.head_in_text { width(&col.head) } else { 0 };
            t.rows.iter().map(|r| cells(r, c)).fold(col.min_width.max(head), usize::max)
        })
        .collect();
    let line = |row: &mut dyn Iterator<Item = &str>, prefixed: bool| {
        let mut s = " ".repeat(t.indent);
        for (c, cell) in row.enumerate() {
            if c > 0 {
                s.push_str(&" ".repeat(t.gap));
            }
            let col = &t.columns[c];
            if prefixed {
                s.push_str(&col.prefix);
            }
            let pad = " ".repeat(widths[c].saturating_sub(width(cell)));
            match col.align {
                Align::Left => {
                    s.push_str(cell);
                    s.push_str(&pad);
                }
                Align::Right => {
                    s.push_str(&pad);
                    s.push_str(cell);
                }
            }
        }
        s.trim_end().to_string()
    };
    if t.head_in_text {
        writeln!(w, "{}", line(&mut t.columns.iter().map(|c| c.head.as_str()), false))?;
    }
    for r in &t.rows {
        writeln!(w, "{}", line(&mut r.iter().map(String::as_str), true))?;
    }
    Ok(())
}
