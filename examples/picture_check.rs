//! Compare a browser's screenshot of an SVG gearsieve wrote with resvg's render of the same
//! file: `cargo run --example picture_check -- FILE.svg SHOT.png` (`--size FILE.svg` prints the
//! size in CSS pixels the browser window needs; `--not-blank SHOT.png W H` checks a screenshot
//! of a page, an HTML page for one, taken in a W×H window: its size, and ink on it). Used by
//! `scripts/browser-check.sh`; exits non-zero, saying why, when the screenshot is blank, the
//! wrong size, or shows something else than the drawing.

use std::process::ExitCode;

use resvg::tiny_skia::{Pixmap, Transform};

/// Ink per cell of an `n`×`n` grid: the share of the cell's pixels that are darker than the
/// palest grey of an antialiased line's edge.
fn ink(p: &Pixmap, n: u32) -> Vec<f64> {
    let mut cells = vec![0.0; (n * n) as usize];
    let (w, h) = (p.width(), p.height());
    for y in 0..h {
        for x in 0..w {
            let Some(c) = p.pixel(x, y) else { continue };
            // Premultiplied over white: an empty pixel is white.
            let a = f64::from(c.alpha()) / 255.0;
            let grey =
                (f64::from(c.red()) + f64::from(c.green()) + f64::from(c.blue())) / 3.0 + 255.0 * (1.0 - a);
            if grey < 235.0 {
                cells[(y * n / h * n + x * n / w) as usize] += 1.0;
            }
        }
    }
    let per_cell = f64::from(w * h) / f64::from(n * n);
    cells.iter().map(|c| c / per_cell).collect()
}

/// The boxes `[x0, y0, x1, y1]`, in the drawing's user units, of its labels: resvg is built here
/// without fonts, so labels are compared by where they stand, not by their letters.
fn label_boxes(svg: &str) -> Vec<[f32; 4]> {
    let attr = |tag: &str, name: &str| -> Option<f32> {
        tag.split(&format!(" {name}=\"")).nth(1)?.split('"').next()?.parse().ok()
    };
    svg.split("<text ")
        .skip(1)
        .filter_map(|t| {
            let (tag, rest) = t.split_once('>')?;
            let tag = format!(" {tag}");
            let tag = tag.as_str();
            let words = rest.split("</text>").next()?;
            let (x, y, size) = (attr(tag, "x")?, attr(tag, "y")?, attr(tag, "font-size")?);
            let width = 0.65 * size * words.chars().count() as f32;
            let x0 = if tag.contains("text-anchor=\"middle\"") { x - width / 2.0 } else { x };
            Some([x0 - size, y - 1.2 * size, x0 + width + size, y + 0.5 * size])
        })
        .collect()
}

/// Paint the `boxes` (user units, `k` pixels per unit) white.
fn blank_out(p: &mut Pixmap, boxes: &[[f32; 4]], k: f32) {
    let (w, h) = (p.width() as f32, p.height() as f32);
    for b in boxes {
        let to = |v: f32, most: f32| (v * k).clamp(0.0, most) as u32;
        for y in to(b[1], h)..to(b[3], h) {
            for x in to(b[0], w)..to(b[2], w) {
                let i = (y * p.width() + x) as usize;
                if let Some(px) = p.pixels_mut().get_mut(i) {
                    *px =
                        resvg::tiny_skia::PremultipliedColorU8::from_rgba(255, 255, 255, 255).unwrap_or(*px);
                }
            }
        }
    }
}

/// Pearson correlation of two equally long series.
fn correlation(a: &[f64], b: &[f64]) -> f64 {
    let n = a.len() as f64;
    let (ma, mb) = (a.iter().sum::<f64>() / n, b.iter().sum::<f64>() / n);
    let cov: f64 = a.iter().zip(b).map(|(x, y)| (x - ma) * (y - mb)).sum();
    let va: f64 = a.iter().map(|x| (x - ma).powi(2)).sum();
    let vb: f64 = b.iter().map(|y| (y - mb).powi(2)).sum();
    cov / (va * vb).sqrt()
}

fn check(svg_path: &str, shot_path: &str) -> Result<String, String> {
    let svg = std::fs::read_to_string(svg_path).map_err(|e| format!("{svg_path}: {e}"))?;
    let mut shot = Pixmap::load_png(shot_path).map_err(|e| format!("{shot_path}: {e}"))?;
    let tree =
        resvg::usvg::Tree::from_str(&svg, &resvg::usvg::Options::default()).map_err(|e| e.to_string())?;
    // Render at the screenshot's size, so the two can be laid over each other.
    let (sw, sh) = (shot.width(), shot.height());
    let size = tree.size();
    // The browser may draw at a device scale factor: the screenshot is then that many times the
    // drawing's CSS size.
    let css = (size.width().round() as u32, size.height().round() as u32);
    let factor = (sw as f32 / size.width()).round().max(1.0) as u32;
    let slack = 2 * factor;
    if sw.abs_diff(css.0 * factor) > slack || sh.abs_diff(css.1 * factor) > slack {
        return Err(format!(
            "the screenshot is {sw}×{sh} px, the drawing {}×{} px at scale {factor}",
            css.0, css.1
        ));
    }
    let mut ours = Pixmap::new(sw, sh).ok_or("an empty picture")?;
    ours.fill(resvg::tiny_skia::Color::WHITE);
    let k = sw as f32 / size.width();
    resvg::render(&tree, Transform::from_scale(k, k), &mut ours.as_mut());
    // Labels compared by place only: cleared from both pictures (user units to pixels: the
    // viewBox is in mm, the CSS size in px).
    let view_box_width: f32 = svg
        .split("viewBox=\"")
        .nth(1)
        .and_then(|v| v.split(' ').nth(2))
        .and_then(|w| w.parse().ok())
        .ok_or("the drawing has no viewBox")?;
    let per_unit = sw as f32 / view_box_width;
    let boxes = label_boxes(&svg);
    blank_out(&mut shot, &boxes, per_unit);
    blank_out(&mut ours, &boxes, per_unit);
    let (a, b) = (ink(&shot, 24), ink(&ours, 24));
    let covered = a.iter().filter(|&&c| c > 0.0).count();
    if covered < 20 {
        return Err(format!("the screenshot is nearly blank ({covered} of 576 cells hold ink)"));
    }
    let r = correlation(&a, &b);
    if r < 0.8 {
        return Err(format!("the screenshot and the render differ: correlation of ink {r:.3}"));
    }
    Ok(format!("{sw}×{sh} px, ink in {covered} of 576 cells, correlation with resvg {r:.3}"))
}

/// A screenshot of a page taken in a `w`×`h` window: that size (times the device scale factor)
/// and ink in enough of it to be a page, not a blank or an error screen.
fn not_blank(shot_path: &str, w: &str, h: &str) -> Result<String, String> {
    let shot = Pixmap::load_png(shot_path).map_err(|e| format!("{shot_path}: {e}"))?;
    let (w, h): (u32, u32) = (w.parse().map_err(|_| "W: a number")?, h.parse().map_err(|_| "H: a number")?);
    let (sw, sh) = (shot.width(), shot.height());
    let factor = (sw / w.max(1)).max(1);
    if sw != w * factor || sh != h * factor {
        return Err(format!("the screenshot is {sw}×{sh} px, the window {w}×{h} px at scale {factor}"));
    }
    let covered = ink(&shot, 24).iter().filter(|&&c| c > 0.0).count();
    if covered < 60 {
        return Err(format!("the screenshot is nearly blank ({covered} of 576 cells hold ink)"));
    }
    Ok(format!("{sw}×{sh} px, ink in {covered} of 576 cells"))
}

/// The size in CSS pixels a browser gives the drawing: `W H`.
fn size(svg_path: &str) -> Result<String, String> {
    let svg = std::fs::read_to_string(svg_path).map_err(|e| format!("{svg_path}: {e}"))?;
    let tree =
        resvg::usvg::Tree::from_str(&svg, &resvg::usvg::Options::default()).map_err(|e| e.to_string())?;
    Ok(format!("{} {}", tree.size().width().round(), tree.size().height().round()))
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if let [flag, svg] = &args[..] {
        if flag == "--size" {
            return match size(svg) {
                Ok(s) => {
                    println!("{s}");
                    ExitCode::SUCCESS
                }
                Err(why) => {
                    eprintln!("{why}");
                    ExitCode::FAILURE
                }
            };
        }
    }
    if let [flag, shot, w, h] = &args[..] {
        if flag == "--not-blank" {
            return match not_blank(shot, w, h) {
                Ok(said) => {
                    println!("{shot}: {said}");
                    ExitCode::SUCCESS
                }
                Err(why) => {
                    eprintln!("{shot}: {why}");
                    ExitCode::FAILURE
                }
            };
        }
    }
    let [svg, shot] = &args[..] else {
        eprintln!(
            "usage: picture_check FILE.svg SHOT.png, picture_check --size FILE.svg, or \
             picture_check --not-blank SHOT.png W H"
        );
        return ExitCode::from(2);
    };
    match check(svg, shot) {
        Ok(said) => {
            println!("{svg}: {said}");
            ExitCode::SUCCESS
        }
        Err(why) => {
            eprintln!("{svg}: {why}");
            ExitCode::FAILURE
        }
    }
}
