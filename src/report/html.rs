//! The HTML sink: a [`Document`] as one self-contained page to print on A4 — inline CSS, no
//! scripts, fonts or links to fetch — with any figures the result adds drawn inline by the
//! SVG sink. The title is a level-1 heading, headings level 2, running lines one paragraph per
//! run (kept apart by line breaks), list entries nested lists, tables real tables with numeric
//! columns flush right; figures follow the body, two abreast, and the notes (conventions, cautions) close
//! the page.

use std::io::{self, Write};

use super::document::{Align, Block, Document, Table};
use super::drawing::Drawing;
use super::svg;

/// The page's style: A4 with print margins, tables that read on paper, figures to the page's
/// width and never split across pages.
const STYLE: &str = "@page { size: A4; margin: 15mm; }
body { font-family: sans-serif; font-size: 10pt; color: #1b1b1b; margin: 0 auto; max-width: 180mm; }
h1 { font-size: 14pt; margin: 0 0 0.6em; }
h2 { font-size: 12pt; margin: 1em 0 0.3em; }
p { margin: 0.3em 0; }
table { border-collapse: collapse; margin: 0.5em 0; font-size: 8pt; }
th, td { padding: 1px 4px; border-bottom: 1px solid #ccc; text-align: left; vertical-align: top; }
th { border-bottom: 1.5px solid #1b1b1b; }
.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
ul { margin: 0.2em 0; padding-left: 1.5em; }
.figures { display: grid; grid-template-columns: 1fr 1fr; gap: 4mm; margin: 1em 0; }
figure { margin: 0; break-inside: avoid; page-break-inside: avoid; }
figure svg { width: 100%; height: auto; }
.notes { margin-top: 1em; font-size: 9pt; }";

/// `&`, `<`, `>` and quotes as entities.
fn escape(s: &str) -> String {
    s.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// Write `doc` as an HTML page, `figures` after its body.
pub fn write(doc: &Document, figures: &[Drawing], w: &mut dyn Write) -> io::Result<()> {
    let title = doc
        .blocks()
        .iter()
        .find_map(|b| match b {
            Block::Title(t) => Some(t.as_str()),
            _ => None,
        })
        .unwrap_or("gearsieve");
    writeln!(w, "<!DOCTYPE html>")?;
    writeln!(w, r#"<html lang="en">"#)?;
    writeln!(w, r#"<head><meta charset="utf-8"><title>{}</title>"#, escape(title))?;
    writeln!(w, "<style>\n{STYLE}\n</style>\n</head>\n<body>")?;
    let mut body = Body { w, lines: false, depth: 0 };
    let mut notes = Vec::new();
    for block in doc.blocks() {
        match block {
            Block::Title(s) => body.block(&format!("<h1>{}</h1>", escape(s)))?,
            Block::Heading(s) => body.block(&format!("<h2>{}</h2>", escape(s.trim_end_matches(':'))))?,
            Block::Line(s) => body.line(s)?,
            Block::Blank => body.close()?,
            Block::Item { depth, text, .. } => body.item(*depth, text)?,
            Block::Table(t) => body.block(&table(t))?,
            Block::Note(s) => notes.push(s.as_str()),
        }
    }
    body.close()?;
    if !figures.is_empty() {
        writeln!(w, r#"<div class="figures">"#)?;
        for f in figures {
            writeln!(w, "<figure>")?;
            svg::write_inline(f, w)?;
            writeln!(w, "</figure>")?;
        }
        writeln!(w, "</div>")?;
    }
    if !notes.is_empty() {
        writeln!(w, r#"<div class="notes">"#)?;
        for n in notes {
            writeln!(w, "<p>{}</p>", escape(n))?;
        }
        writeln!(w, "</div>")?;
    }
    writeln!(w, "</body>\n</html>")
}

/// The page body as it is written: whether a paragraph of lines is open, how deep the lists.
struct Body<'a> {
    w: &'a mut dyn Write,
    lines: bool,
    depth: usize,
}

impl Body<'_> {
    /// Close whatever paragraph or lists are open.
    fn close(&mut self) -> io::Result<()> {
        if self.lines {
            writeln!(self.w, "</p>")?;
            self.lines = false;
        }
        self.lists_to(0)
    }

    fn lists_to(&mut self, depth: usize) -> io::Result<()> {
        while self.depth > depth {
            writeln!(self.w, "</li></ul>")?;
            self.depth -= 1;
        }
        Ok(())
    }

    fn block(&mut self, html: &str) -> io::Result<()> {
        self.close()?;
        writeln!(self.w, "{html}")
    }

    fn line(&mut self, text: &str) -> io::Result<()> {
        if self.lines {
            writeln!(self.w, "<br>")?;
        } else {
            self.lists_to(0)?;
            write!(self.w, "<p>")?;
            self.lines = true;
        }
        write!(self.w, "{}", escape(text))
    }

    fn item(&mut self, depth: usize, text: &str) -> io::Result<()> {
        if self.lines {
            writeln!(self.w, "</p>")?;
            self.lines = false;
        }
        let depth = depth.max(1);
        if depth <= self.depth {
            self.lists_to(depth)?;
            writeln!(self.w, "</li>")?;
        }
        // A list entry nested deeper than the next level opens the levels between.
        while self.depth < depth {
            writeln!(self.w, "<ul>")?;
            self.depth += 1;
            if self.depth < depth {
                writeln!(self.w, "<li>")?;
            }
        }
        write!(self.w, "<li>{}", escape(text))
    }
}

fn table(t: &Table) -> String {
    let class = |a: Align| match a {
        Align::Left => "",
        Align::Right => r#" class="num""#,
    };
    let mut out = String::from("<table>\n<thead><tr>");
    for c in &t.columns {
        out.push_str(&format!("<th{}>{}</th>", class(c.align), escape(c.head.trim())));
    }
    out.push_str("</tr></thead>\n<tbody>\n");
    for row in &t.rows {
        out.push_str("<tr>");
        for (i, cell) in row.iter().enumerate() {
            let align = t.columns.get(i).map_or(Align::Left, |c| c.align);
            out.push_str(&format!("<td{}>{}</td>", class(align), escape(cell.trim())));
        }
        out.push_str("</tr>\n");
    }
    out.push_str("</tbody>\n</table>");
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn render(doc: &Document, figures: &[Drawing]) -> String {
        let mut buf = Vec::new();
        write(doc, figures, &mut buf).unwrap();
        String::from_utf8(buf).unwrap()
    }

    #[test]
    fn headings_lines_lists_tables_and_notes() {
        let mut d = Document::new();
        d.title("Ratio <12>");
        d.line("Gears: 12..60");
        d.line("Stages: 2");
        d.blank();
        d.heading("Meshes:");
        d.table(Table::new(&["#", "name"], &[0]).with_rows(vec![vec![" 1".into(), "a & b".into()]]));
        d.item(1, false, "50→127:");
        d.item(2, true, "too close");
        d.item(1, false, "40→100");
        d.note("a caution");
        let html = render(&d, &[]);
        assert!(html.starts_with("<!DOCTYPE html>\n"), "{html}");
        assert!(html.contains("<title>Ratio &lt;12&gt;</title>"), "{html}");
        assert!(
            html.contains("<h1>Ratio &lt;12&gt;</h1>\n<p>Gears: 12..60<br>\nStages: 2</p>\n<h2>Meshes</h2>")
        );
        assert!(html.contains(r#"<tr><th class="num">#</th><th>name</th></tr>"#), "{html}");
        assert!(html.contains(r#"<tr><td class="num">1</td><td>a &amp; b</td></tr>"#), "{html}");
        assert!(
            html.contains("<ul>\n<li>50→127:<ul>\n<li>too close</li></ul>\n</li>\n<li>40→100</li></ul>\n"),
            "{html}"
        );
        assert!(html.contains("<div class=\"notes\">\n<p>a caution</p>\n</div>"), "{html}");
        assert!(html.contains("@page { size: A4"), "{html}");
        assert!(!html.contains("http"), "{html}");
    }

    #[test]
    fn figures_are_inline_svg_without_a_declaration() {
        let mut d = Document::new();
        d.title("t");
        let f = Drawing { title: "a circle".into(), ..Drawing::default() };
        let html = render(&d, &[f.clone(), f]);
        assert_eq!(html.matches("<figure>\n<svg ").count(), 2, "{html}");
        assert!(!html.contains("<?xml") && !html.contains("http"), "{html}");
    }
}
