//! Compare a browser's screenshot of an SVG gearsieve wrote with resvg's render of the same
//! file: `cargo run --example picture_check -- FILE.svg SHOT.png`. Used by
//! `scripts/browser-check.sh`; exits non-zero, saying why, when the screenshot is blank, the
//! wrong size, or shows something else than the drawing.

use std::process::ExitCode;

use resvg::tiny_skia::{Pixmap, Transform};

/// Ink per cell of an `n`×`n` grid: the share of the cell's pixels that are darker than light
/// grey.
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
            if grey < 200.0 {
                cells[(y * n / h * n + x * n / w) as usize] += 1.0;
            }
        }
    }
    let per_cell = f64::from(w * h) / f64::from(n * n);
    cells.iter().map(|c| c / per_cell).collect()
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
    let shot = Pixmap::load_png(shot_path).map_err(|e| format!("{shot_path}: {e}"))?;
    let tree =
        resvg::usvg::Tree::from_str(&svg, &resvg::usvg::Options::default()).map_err(|e| e.to_string())?;
    // Render at the screenshot's size, so the two can be laid over each other.
    let (sw, sh) = (shot.width(), shot.height());
    let size = tree.size();
    let want = (size.width().round() as u32, size.height().round() as u32);
    if sw.abs_diff(want.0) > 2 || sh.abs_diff(want.1) > 2 {
        return Err(format!("the screenshot is {sw}×{sh} px, the drawing {}×{} px", want.0, want.1));
    }
    let mut ours = Pixmap::new(sw, sh).ok_or("an empty picture")?;
    ours.fill(resvg::tiny_skia::Color::WHITE);
    let k = sw as f32 / size.width();
    resvg::render(&tree, Transform::from_scale(k, k), &mut ours.as_mut());
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

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let [svg, shot] = &args[..] else {
        eprintln!("usage: picture_check FILE.svg SHOT.png");
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
