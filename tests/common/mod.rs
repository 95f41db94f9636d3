//! Helpers shared by the integration tests: run the real binary and capture what it prints.
#![allow(dead_code)]

use std::path::PathBuf;
use std::process::Command;

/// What one run of the binary printed and returned.
pub struct Run {
    pub code: i32,
    pub stdout: String,
    pub stderr: String,
}

/// Run `gearsieve` with `args` from the repository root.
pub fn gearsieve(args: &[&str]) -> Run {
    let out = Command::new(env!("CARGO_BIN_EXE_gearsieve"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("the binary runs");
    Run {
        code: out.status.code().unwrap_or(-1),
        stdout: String::from_utf8_lossy(&out.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&out.stderr).into_owned(),
    }
}

/// Run and parse standard output as JSON.
pub fn json(args: &[&str]) -> (i32, serde_json::Value) {
    let mut a = args.to_vec();
    a.extend(["--format", "json"]);
    let r = gearsieve(&a);
    let v = serde_json::from_str(&r.stdout)
        .unwrap_or_else(|e| panic!("not JSON ({e}): {}\n{}", r.stdout, r.stderr));
    (r.code, v)
}

/// Path of a fixture file.
pub fn fixture(name: &str) -> String {
    let p: PathBuf = [env!("CARGO_MANIFEST_DIR"), "tests", "fixtures", name].iter().collect();
    p.to_string_lossy().into_owned()
}

/// Write a temporary catalogue with `text` and return its directory guard and path.
pub fn temp_catalogue(name: &str, bytes: &[u8]) -> (tempfile::TempDir, String) {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join(name);
    std::fs::write(&path, bytes).expect("write");
    let s = path.to_string_lossy().into_owned();
    (dir, s)
}

/// Every option a message names appears in it once: `--gearbox: position 1: …`, never
/// `--gearbox: --gearbox position 1: …`.
pub fn assert_flags_named_once(message: &str) {
    let flags: Vec<&str> = message
        .split(|c: char| !(c.is_ascii_alphanumeric() || c == '-'))
        .filter(|w| w.starts_with("--") && w.len() > 2)
        .collect();
    for f in &flags {
        assert_eq!(flags.iter().filter(|g| *g == f).count(), 1, "{f} named more than once: {message}");
    }
}

/// Run with bad input and check the whole answer: exit 2, nothing on standard output, and
/// exactly `gearsieve: {message}` on one line of standard error, each flag named once.
pub fn refused(args: &[&str], message: &str) {
    let r = gearsieve(args);
    assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
    assert!(r.stdout.is_empty(), "{args:?} printed {}", r.stdout);
    assert_eq!(r.stderr, format!("gearsieve: {message}\n"), "{args:?}");
    assert_flags_named_once(&r.stderr);
}

/// Run a search that finds nothing and check the hint: exit 1 and exactly
/// `gearsieve: {message}` on standard error.
pub fn nothing_found(args: &[&str], message: &str) {
    let r = gearsieve(args);
    assert_eq!(r.code, 1, "{args:?}: {}", r.stderr);
    assert_eq!(r.stderr, format!("gearsieve: {message}\n"), "{args:?}");
    assert_flags_named_once(&r.stderr);
}

/// Render an SVG document to pixels, `scale` pixels per mm (the drawings' user unit: their
/// `viewBox` is in mm, their size says mm too).
pub fn render(svg: &str, scale: f32) -> resvg::tiny_skia::Pixmap {
    let tree = resvg::usvg::Tree::from_str(svg, &resvg::usvg::Options::default()).expect("a valid SVG");
    let view_box_width: f32 = svg
        .split("viewBox=\"")
        .nth(1)
        .and_then(|v| v.split(' ').nth(2))
        .and_then(|w| w.parse().ok())
        .expect("a viewBox");
    // usvg sizes the tree in CSS pixels; one viewBox unit is one mm.
    let k = scale * view_box_width / tree.size().width();
    let size = tree.size().to_int_size().scale_by(k).expect("a size");
    let mut pixmap = resvg::tiny_skia::Pixmap::new(size.width(), size.height()).expect("a pixmap");
    resvg::render(&tree, resvg::tiny_skia::Transform::from_scale(k, k), &mut pixmap.as_mut());
    pixmap
}
