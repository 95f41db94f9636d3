//! Aligned text columns for the trade tables (clock, reducer, thread): widths from the widest
//! cell, two spaces between columns, chosen columns right-aligned. Layout only; no content.

use std::io::{self, Write};

/// Print `head` and `rows` in aligned columns; columns listed in `right` are right-aligned.
pub fn columns<H: AsRef<str>>(
    w: &mut dyn Write,
    head: &[H],
    rows: &[Vec<String>],
    right: &[usize],
) -> io::Result<()> {
    let mut width: Vec<usize> = head.iter().map(|h| h.as_ref().chars().count()).collect();
    for r in rows {
        for (c, cell) in r.iter().enumerate() {
            width[c] = width[c].max(cell.chars().count());
        }
    }
    let line = |cells: &mut dyn Iterator<Item = &str>| {
        let mut s = String::new();
        for (c, cell) in cells.enumerate() {
            let pad = width[c] - cell.chars().count();
            if c > 0 {
                s.push_str("  ");
            }
            if right.contains(&c) {
                s.push_str(&" ".repeat(pad));
                s.push_str(cell);
            } else {
                s.push_str(cell);
                s.push_str(&" ".repeat(pad));
            }
        }
        s.trim_end().to_string()
    };
    writeln!(w, "{}", line(&mut head.iter().map(AsRef::as_ref)))?;
    for r in rows {
        writeln!(w, "{}", line(&mut r.iter().map(String::as_str)))?;
    }
    Ok(())
}
