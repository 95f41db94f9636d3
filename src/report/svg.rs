//! The SVG sink: a [`Drawing`] as a standalone SVG file to scale, in millimetres (open it in a
//! browser, print it at 100 %, or hand it to a cutter). The drawing's y axis points up; SVG's
//! points down, so shapes are mirrored into a group, and labels are placed upright.

use std::io::{self, Write};

use super::drawing::{Drawing, Pen, Shape};

/// Margin around the drawing, mm.
const MARGIN_MM: f64 = 8.0;
/// Letter height of the title and notes, mm.
const TEXT_MM: f64 = 3.5;

/// Stroke colour, width (mm) and dash pattern of a pen.
fn style(pen: Pen) -> (&'static str, f64, &'static str) {
    match pen {
        Pen::Outline => ("#1b1b1b", 0.25, ""),
        Pen::BackPlane => ("#7a7a7a", 0.2, "1.2 0.8"),
        Pen::Pitch => ("#2a6fb0", 0.15, "3 1 0.5 1"),
        Pen::Base => ("#3c9a5f", 0.1, ""),
        Pen::Root => ("#999999", 0.1, "1 1"),
        Pen::Centre => ("#b03a2e", 0.12, "4 1 0.5 1"),
        Pen::Dimension => ("#6a3d9a", 0.15, ""),
        Pen::Action => ("#d9822b", 0.2, "2 1"),
        Pen::Machine => ("#555555", 0.3, ""),
    }
}

/// The stroke attributes of `pen`, its widths and dashes times `scale` (1 on a drawing large
/// enough for full-size text, less on a small one).
fn stroke(pen: Pen, scale: f64) -> String {
    let (colour, width, dash) = style(pen);
    let dash = if dash.is_empty() {
        String::new()
    } else {
        let scaled: Vec<String> =
            dash.split(' ').filter_map(|d| d.parse::<f64>().ok()).map(|d| n(d * scale)).collect();
        format!(" stroke-dasharray=\"{}\"", scaled.join(" "))
    };
    format!("fill=\"none\" stroke=\"{colour}\" stroke-width=\"{}\"{dash}", n(width * scale))
}

/// `&`, `<`, `>` and quotes as XML entities.
fn escape(s: &str) -> String {
    s.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// A number for SVG: enough digits for 0.1 µm, none wasted.
fn n(v: f64) -> String {
    super::fields::decimals(v, 4)
}

/// `text` cut into lines of at most `width` characters at spaces.
fn wrap(text: &str, width: usize) -> Vec<String> {
    let mut lines = vec![String::new()];
    for word in text.split_whitespace() {
        let line = lines.last_mut().map_or(0, |l| l.chars().count());
        if line > 0 && line + 1 + word.chars().count() > width {
            lines.push(String::new());
        }
        if let Some(l) = lines.last_mut() {
            if !l.is_empty() {
                l.push(' ');
            }
            l.push_str(word);
        }
    }
    lines
}

/// Write `drawing` as a standalone SVG file.
pub fn write(drawing: &Drawing, w: &mut dyn Write) -> io::Result<()> {
    writeln!(w, r#"<?xml version="1.0" encoding="UTF-8"?>"#)?;
    write_element(drawing, r#" xmlns="http://www.w3.org/2000/svg""#, w)
}

/// Write `drawing` as one `<svg>` element to sit inside an HTML page: no XML declaration, and
/// no namespace, which HTML gives its `<svg>` elements itself.
pub fn write_inline(drawing: &Drawing, w: &mut dyn Write) -> io::Result<()> {
    write_element(drawing, "", w)
}

/// The `<svg>` element, with `namespace` among its attributes.
fn write_element(drawing: &Drawing, namespace: &str, w: &mut dyn Write) -> io::Result<()> {
    let [x0, y0, x1, y1] = drawing.bounds().unwrap_or([0.0, 0.0, 10.0, 10.0]);
    let width = x1 - x0 + 2.0 * MARGIN_MM;
    // Text in proportion to a small drawing, never above TEXT_MM; notes wrapped to the page
    // at about 0.55 of the letter height per character.
    let text_mm = (width / 45.0).clamp(1.2, TEXT_MM);
    let per_line = ((width - 2.0 * MARGIN_MM) / (0.55 * 0.8 * text_mm)).max(20.0) as usize;
    let scale = text_mm / TEXT_MM;
    let notes: Vec<String> = drawing.notes.iter().flat_map(|n| wrap(n, per_line)).collect();
    let text_lines = 1 + notes.len();
    let height = y1 - y0 + 2.0 * MARGIN_MM + 1.6 * text_mm * text_lines as f64;
    // Drawing coordinates (y up) into the page (y down): page = (x − x0 + m, y1 + m + title − y).
    let top = MARGIN_MM + 1.6 * text_mm;
    let (dx, dy) = (MARGIN_MM - x0, top + y1);
    writeln!(
        w,
        r#"<svg{namespace} width="{}mm" height="{}mm" viewBox="0 0 {} {}">"#,
        n(width),
        n(height),
        n(width),
        n(height)
    )?;
    writeln!(w, "<title>{}</title>", escape(&drawing.title))?;
    writeln!(w, r#"<rect width="100%" height="100%" fill="white"/>"#)?;
    writeln!(
        w,
        r#"<text x="{}" y="{}" font-family="sans-serif" font-size="{}">{}</text>"#,
        n(MARGIN_MM),
        n(MARGIN_MM + text_mm * 0.5),
        n(text_mm),
        escape(&drawing.title)
    )?;
    writeln!(w, r#"<g transform="translate({} {}) scale(1 -1)">"#, n(dx), n(dy))?;
    for s in &drawing.shapes {
        match s {
            Shape::Circle { centre, radius_mm, pen } => writeln!(
                w,
                r#"<circle cx="{}" cy="{}" r="{}" {}/>"#,
                n(centre[0]),
                n(centre[1]),
                n(*radius_mm),
                stroke(*pen, scale)
            )?,
            Shape::Path { points, closed, pen } => {
                let mut d = String::with_capacity(points.len() * 16);
                for (i, p) in points.iter().enumerate() {
                    d.push_str(if i == 0 { "M" } else { "L" });
                    d.push_str(&n(p[0]));
                    d.push(' ');
                    d.push_str(&n(p[1]));
                }
                if *closed {
                    d.push('Z');
                }
                writeln!(w, r#"<path d="{d}" {}/>"#, stroke(*pen, scale))?
            }
            Shape::Line { from, to, pen } => writeln!(
                w,
                r#"<line x1="{}" y1="{}" x2="{}" y2="{}" {}/>"#,
                n(from[0]),
                n(from[1]),
                n(to[0]),
                n(to[1]),
                stroke(*pen, scale)
            )?,
            Shape::Text { .. } => {}
        }
    }
    writeln!(w, "</g>")?;
    // Labels upright, in page coordinates.
    for s in &drawing.shapes {
        if let Shape::Text { at, text, size_mm } = s {
            writeln!(
                w,
                r#"<text x="{}" y="{}" font-family="sans-serif" font-size="{}" text-anchor="middle" fill="{}">{}</text>"#,
                n(at[0] + dx),
                n(dy - at[1] + size_mm * 0.35),
                n(*size_mm),
                style(Pen::Dimension).0,
                escape(text)
            )?;
        }
    }
    for (i, note) in notes.iter().enumerate() {
        writeln!(
            w,
            r#"<text x="{}" y="{}" font-family="sans-serif" font-size="{}">{}</text>"#,
            n(MARGIN_MM),
            n(dy - y0 + MARGIN_MM * 0.6 + 1.6 * text_mm * (i as f64 + 0.5)),
            n(text_mm * 0.8),
            escape(note)
        )?;
    }
    writeln!(w, "</svg>")
}
