//! Pictures as a user gets them: `gearsieve draw` and `--format svg`, rendered with a real SVG
//! renderer (resvg) and read back; gear profiles as DXF read back with the DXF library. The
//! numbers the pictures must show come from the ISO 21771 relations (tip diameter
//! da = m(z + 2ha* + 2x), root diameter df = m(z − 2hf* + 2x), ISO 53 type A rack: ha* = 1,
//! hf* = 1.25 — from memory, the same as the geometry tests).

mod common;

use common::{gearsieve, render};

/// Whether the pixel at (x, y) is drawn dark (a line), not the white page.
fn dark(p: &resvg::tiny_skia::Pixmap, x: f64, y: f64) -> bool {
    let (x, y) = (x.round() as u32, y.round() as u32);
    match p.pixel(x, y) {
        Some(c) => u32::from(c.red()) + u32::from(c.green()) + u32::from(c.blue()) < 3 * 128,
        None => false,
    }
}

fn svg_body(stdout: &str) -> &str {
    &stdout[stdout.find("<svg").expect("an svg element")..]
}

#[test]
fn a_gear_profile_rendered_shows_its_tooth_count() {
    let dir = tempfile::tempdir().unwrap();
    for (teeth, shift) in [(17u32, 0.0), (23, 0.3), (40, -0.2)] {
        let path = dir.path().join(format!("g{teeth}.svg"));
        let path_text = path.to_string_lossy().into_owned();
        let r = gearsieve(&[
            "draw",
            "--gear",
            &teeth.to_string(),
            "--module",
            "2",
            "--shift",
            &shift.to_string(),
            "--profile",
            &path_text,
        ]);
        assert_eq!(r.code, 0, "{}", r.stderr);
        let svg = std::fs::read_to_string(&path).unwrap();
        let scale = 20.0;
        let pixmap = render(&svg, scale);
        // The gear's centre in pixels: the centre of the picture's group, from its transform.
        let t = svg.split("translate(").nth(1).and_then(|s| s.split(')').next()).unwrap();
        let mut c = t.split(' ').map(|v| v.parse::<f64>().unwrap() * f64::from(scale));
        let (cx, cy) = (c.next().unwrap(), c.next().unwrap());
        // Around a circle between the pitch and the tip circle every tooth crosses twice.
        let m = 2.0;
        let z = f64::from(teeth);
        let radius = (m * z / 2.0 + (m * z / 2.0 + m * (1.0 + shift))) / 2.0 * f64::from(scale);
        // A line is a run of dark samples; a light gap of a pixel or two inside one (where the
        // antialiased stroke thins) does not split it.
        let samples = 20_000u32;
        let min_gap = (f64::from(samples) / (std::f64::consts::TAU * radius) * 3.0).ceil() as u32;
        let (mut crossings, mut light_run) = (0, min_gap);
        for i in 0..samples {
            let a = std::f64::consts::TAU * f64::from(i) / f64::from(samples);
            if dark(&pixmap, cx + radius * a.cos(), cy - radius * a.sin()) {
                if light_run >= min_gap {
                    crossings += 1;
                }
                light_run = 0;
            } else {
                light_run += 1;
            }
        }
        assert_eq!(crossings, 2 * teeth, "{teeth} teeth with shift {shift}");
        // Not blank, and nothing dark far outside the tip circle.
        assert!(pixmap.pixels().iter().any(|p| p.red() < 128));
        let beyond = radius * 1.5;
        assert!(!dark(&pixmap, cx + beyond, cy) && !dark(&pixmap, cx, cy - beyond));
    }
}

#[test]
fn a_gear_profile_as_dxf_is_one_closed_outline_in_mm() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("gear.dxf");
    let path_text = path.to_string_lossy().into_owned();
    let r = gearsieve(&["draw", "--gear", "20", "--module", "2", "--shift", "0.2", "--profile", &path_text]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    assert!(r.stdout.contains("tip diameter") && r.stdout.contains("44.800"), "{}", r.stdout);
    let drawing = dxf::Drawing::load_file(&path).expect("a DXF file");
    assert_eq!(drawing.header.default_drawing_units, dxf::enums::Units::Millimeters);
    let polylines: Vec<_> = drawing
        .entities()
        .filter_map(|e| match &e.specific {
            dxf::entities::EntityType::LwPolyline(p) => Some(p),
            _ => None,
        })
        .collect();
    assert_eq!(polylines.len(), 1);
    let p = polylines[0];
    assert!(p.is_closed());
    let radii: Vec<f64> = p.vertices.iter().map(|v| v.x.hypot(v.y)).collect();
    let (hi, lo) =
        (radii.iter().copied().fold(0.0, f64::max), radii.iter().copied().fold(f64::MAX, f64::min));
    // da = 2(20 + 2 + 0.4) = 44.8 mm, df = 2(20 − 2.5 + 0.4) = 35.8 mm (ISO 21771, ISO 53 A).
    assert!((2.0 * hi - 44.8).abs() < 1e-6, "{hi}");
    assert!((2.0 * lo - 35.8).abs() < 1e-6, "{lo}");
}

#[test]
fn a_drawn_train_puts_each_gear_on_its_shaft() {
    let r = gearsieve(&["draw", "--stages", "20:40,15:45", "--module", "2"]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    let svg = svg_body(&r.stdout);
    let pixmap = render(svg, 10.0);
    assert!(pixmap.pixels().iter().any(|p| p.red() < 128), "not blank");
    // Centre distances 60 and 60 mm: m(z1 + z2)/2.
    assert!(svg.contains("a1 = 60") && svg.contains("a2 = 60"), "{svg}");
    // Four outlines: one closed path per gear.
    assert_eq!(svg.matches("<path").count(), 4);
}

#[test]
fn every_listing_draws_its_best_result() {
    for args in [
        vec!["search", "--ratio", "6", "--teeth", "12..60", "--stages", "2", "--limit", "1"],
        vec!["mesh", "--teeth", "17,53", "--module", "2", "--centre-distance", "71"],
        vec!["clock", "motion", "--limit", "1"],
        vec!["reducer", "--ratio", "12", "--modules", "1.5", "--limit", "1"],
    ] {
        let mut a = args.clone();
        a.extend(["--format", "svg"]);
        let r = gearsieve(&a);
        assert_eq!(r.code, 0, "{args:?}: {}", r.stderr);
        let pixmap = render(svg_body(&r.stdout), 12.0);
        let drawn = pixmap.pixels().iter().filter(|p| p.red() < 200).count();
        assert!(drawn > 1000, "{args:?} draws {drawn} pixels");
    }
    // A chart is a table of many setups: it has no single picture, and says so.
    let r = gearsieve(&[
        "chart",
        "--series",
        "unc",
        "--leadscrew",
        "8tpi",
        "--teeth",
        "20..80",
        "--format",
        "svg",
    ]);
    assert_eq!(r.code, 2);
    assert!(r.stderr.contains("not offered as svg"), "{}", r.stderr);
}

#[test]
fn draw_refuses_what_it_cannot_draw() {
    for (args, flag) in [
        (vec!["draw", "--stages", "20-40"], "--stages"),
        (vec!["draw", "--stages", "20:1"], "--stages"),
        (vec!["draw", "--gear", "20", "--profile", "gear.png"], "--profile"),
        (vec!["draw", "--gear", "20", "--profile", "gear.svg", "--tolerance", "0"], "--tolerance"),
        (vec!["draw", "--gear", "20", "--profile", "gear.svg", "--module", "0"], "--module"),
        (vec!["draw", "--from", "/no/such/file.json"], "--from"),
        (vec!["draw", "--stages", "20:40,15:45", "--line-of-action", "3"], "--line-of-action"),
    ] {
        let r = gearsieve(&args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stdout);
        let line = r.stderr.trim();
        assert!(line.starts_with(&format!("gearsieve: {flag}: ")), "{args:?}: {line}");
        assert_eq!(line.lines().count(), 1, "{line}");
    }
}

#[test]
fn the_line_of_action_is_drawn_on_request() {
    let r = gearsieve(&["draw", "--stages", "20:40,15:45", "--module", "2", "--line-of-action", "2"]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    // Unshifted at the reference centre distance, the working pressure angle is 20°.
    assert!(r.stdout.contains("αw = 20°"), "{}", r.stdout);
    assert_eq!(r.stdout.matches("stroke=\"#d9822b\"").count(), 1);
    let plain = gearsieve(&["draw", "--stages", "20:40,15:45", "--module", "2"]);
    assert!(!plain.stdout.contains("αw ="));
}
