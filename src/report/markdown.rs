//! The Markdown sink: a [`Document`] as CommonMark with pipe tables, for a wiki, an issue or a
//! shop's notes. The title is a level-1 heading, headings are level 2, running lines form
//! paragraphs (one line each, kept apart by hard breaks), list entries are nested lists, tables
//! are pipe tables with the same columns as the text table, notes close the page as a quote.

use std::io::{self, Write};

use super::document::{Align, Block, Document, Table};

/// The kinds of paragraph Markdown needs kept apart by a blank line.
#[derive(PartialEq, Clone, Copy)]
enum Kind {
    Heading,
    Lines,
    List,
    Table,
    Notes,
}

/// Write `doc` as Markdown.
pub fn write(doc: &Document, w: &mut dyn Write) -> io::Result<()> {
    // Paragraphs of lines; consecutive lines, list entries or notes share one.
    let mut paragraphs: Vec<(Kind, Vec<String>)> = Vec::new();
    let mut open = false;
    let mut add = |kind: Kind, line: String, joins: bool, open: &mut bool| {
        match paragraphs.last_mut() {
            Some((k, lines)) if *open && joins && *k == kind => lines.push(line),
            _ => paragraphs.push((kind, vec![line])),
        }
        *open = joins;
    };
    for block in doc.blocks() {
        match block {
            Block::Title(s) => add(Kind::Heading, format!("# {}", escape(s)), false, &mut open),
            Block::Heading(s) => {
                add(Kind::Heading, format!("## {}", escape(s.trim_end_matches(':'))), false, &mut open)
            }
            Block::Line(s) => add(Kind::Lines, escape(s), true, &mut open),
            Block::Blank => open = false,
            Block::Item { depth, text, .. } => add(
                Kind::List,
                format!("{}- {}", "  ".repeat(depth.saturating_sub(1)), escape(text)),
                true,
                &mut open,
            ),
            Block::Table(t) => add(Kind::Table, table(t), false, &mut open),
            Block::Note(s) => add(Kind::Notes, format!("> {}", escape(s)), true, &mut open),
        }
    }
    for (i, (kind, lines)) in paragraphs.iter().enumerate() {
        if i > 0 {
            writeln!(w)?;
        }
        // A hard break keeps running lines apart as the text format shows them; notes are
        // one quote with a paragraph each.
        let joint = match kind {
            Kind::Lines => "\\\n",
            Kind::Notes => "\n>\n",
            _ => "\n",
        };
        writeln!(w, "{}", lines.join(joint))?;
    }
    Ok(())
}

/// Characters that would start emphasis, links, HTML or a table cell, written as themselves.
fn escape_inline(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        if matches!(c, '\\' | '*' | '_' | '`' | '[' | ']' | '<' | '>' | '|') {
            out.push('\\');
        }
        out.push(c);
    }
    out
}

/// A line of text written as itself: inline markup escaped, and a line that would read as a
/// heading, list or rule kept as text.
fn escape(s: &str) -> String {
    let mut out = escape_inline(s);
    if out.starts_with('#') || out.starts_with("- ") || out.starts_with("+ ") || out.starts_with('=') {
        out.insert(0, '\\');
    }
    // `12. twelve` would start a numbered list: escape its dot.
    if let Some((n, _)) = out.split_once(". ") {
        if !n.is_empty() && n.chars().all(|c| c.is_ascii_digit()) {
            out.insert(n.len(), '\\');
        }
    }
    out
}

fn table(t: &Table) -> String {
    let row = |cells: &mut dyn Iterator<Item = &str>| {
        let cells: Vec<String> = cells.map(|c| escape_inline(c.trim())).collect();
        format!("| {} |", cells.join(" | "))
    };
    let rule: Vec<&str> = t
        .columns
        .iter()
        .map(|c| match c.align {
            Align::Left => "---",
            Align::Right => "---:",
        })
        .collect();
    let mut lines =
        vec![row(&mut t.columns.iter().map(|c| c.head.as_str())), format!("| {} |", rule.join(" | "))];
    lines.extend(t.rows.iter().map(|r| row(&mut r.iter().map(String::as_str))));
    lines.join("\n")
}

#[cfg(test)]
mod tests {
    use super::*;

    fn render(doc: &Document) -> String {
        let mut buf = Vec::new();
        write(doc, &mut buf).unwrap();
        String::from_utf8(buf).unwrap()
    }

    #[test]
    fn headings_lines_tables_and_notes() {
        let mut d = Document::new();
        d.title("Target ratio 12, tolerance ±1%");
        d.line("Gears: 12..60 teeth");
        d.line("Stages: 2");
        d.blank();
        d.heading("Meshes:");
        d.table(Table::new(&["#", "ratio"], &[0]).with_rows(vec![vec!["1".into(), "12".into()]]));
        d.blank();
        d.item(1, false, "50→127, pitch error exact:");
        d.item(2, true, "too close");
        d.note("ratio i = input turns per output turn");
        d.note("a caution");
        assert_eq!(
            render(&d),
            "# Target ratio 12, tolerance ±1%\n\nGears: 12..60 teeth\\\nStages: 2\n\n## Meshes\n\n\
             | # | ratio |\n| ---: | --- |\n| 1 | 12 |\n\n- 50→127, pitch error exact:\n  - too close\n\n\
             > ratio i = input turns per output turn\n>\n> a caution\n"
        );
    }

    #[test]
    fn markup_in_words_is_kept_as_text() {
        assert_eq!(escape("x_min (a|b) *"), "x\\_min (a\\|b) \\*");
        assert_eq!(escape("# 1"), "\\# 1");
        assert_eq!(escape("12. twelve"), "12\\. twelve");
        assert_eq!(escape("- dash"), "\\- dash");
        assert_eq!(escape("37.5:1"), "37.5:1");
    }
}
