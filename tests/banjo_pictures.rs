//! A lathe setup drawn on its banjo (`thread --format svg --banjo`) rendered with resvg and read
//! back, and `--format html`: one printable page per result, a chart's page with a drawing of
//! each reachable thread's best setup.

mod common;

use common::{gearsieve, json, render};

const STOCK: &str = "catalogs/lathe-change-gears.csv";
const BANJO: &str = "catalogs/lathe/brackenfold.banjo";

/// Closed paths drawn with the pen of a gear's outline (front plane black, back plane grey):
/// one per gear; the banjo's slot is closed too but drawn with the machine's pen.
fn gear_outlines(svg: &str) -> usize {
    svg.lines()
        .filter(|l| l.starts_with("<path") && l.contains("Z\""))
        .filter(|l| l.contains("stroke=\"#1b1b1b\"") || l.contains("stroke=\"#7a7a7a\""))
        .count()
}

fn thread_svg(pitch: &str, extra: &[&str]) -> String {
    let mut args = vec!["thread", "--leadscrew", "8tpi", "--pitch", pitch, "--stock", STOCK, "--limit", "1"];
    args.extend(extra);
    args.extend(["--format", "svg"]);
    let r = gearsieve(&args);
    assert_eq!(r.code, 0, "{args:?}: {}", r.stderr);
    r.stdout
}

#[test]
fn a_setup_on_its_banjo_shows_every_gear_the_slot_and_the_shafts() {
    // 1.25 mm on an 8tpi leadscrew: stud 40, intermediate 20 and 25, leadscrew 127 (four gears);
    // 0.5 mm through one stage: stud 20, a 25 idler, leadscrew 127 (three gears, the idler once).
    for (pitch, stages, gears, middle) in [("1.25mm", "2", 4, "intermediate"), ("0.5mm", "1", 3, "idler")] {
        let svg = thread_svg(pitch, &["--banjo", BANJO, "--stages", stages]);
        let pixmap = render(&svg, 4.0);
        let drawn = pixmap.pixels().iter().filter(|p| p.red() < 200).count();
        assert!(drawn > 5000, "{pitch}: only {drawn} pixels drawn");
        assert_eq!(gear_outlines(&svg), gears, "{pitch}: {svg}");
        // The slot: one closed band in the machine's pen; the three shafts of 20 mm.
        let machine = svg.lines().filter(|l| l.contains("stroke=\"#555555\""));
        assert_eq!(machine.clone().filter(|l| l.starts_with("<path") && l.contains("Z\"")).count(), 1);
        assert_eq!(machine.filter(|l| l.starts_with("<circle") && l.contains("r=\"10\"")).count(), 3);
        for name in ["stud", middle, "leadscrew", "stud to leadscrew 120"] {
            assert!(svg.contains(&format!(">{name}</text>")), "{pitch}: no label {name}");
        }
        assert!(svg.contains("isolated from power"), "{pitch}: no caution");
    }
}

#[test]
fn without_a_banjo_a_setup_is_drawn_in_a_line() {
    let svg = thread_svg("1.25mm", &["--stages", "2"]);
    assert!(!svg.contains("stud to leadscrew"), "{svg}");
    assert!(!svg.contains("stroke=\"#555555\""), "{svg}");
    // Every shaft centre on one line: the in-line layout puts them at y = 0.
    let centres: Vec<&str> =
        svg.lines().filter(|l| l.starts_with("<circle") && l.contains("#b03a2e")).collect();
    assert_eq!(centres.len(), 3, "{svg}");
    assert!(centres.iter().all(|l| l.contains("cy=\"0\"")), "{centres:?}");
    assert_eq!(gear_outlines(&svg), 4);
}

#[test]
fn a_chart_as_html_is_one_page_with_a_drawing_per_reachable_thread() {
    let args = ["chart", "--series", "iso-coarse", "--leadscrew", "8tpi", "--stock", STOCK, "--banjo", BANJO];
    let (code, v) = json(&args);
    assert_eq!(code, 0);
    let reachable = v["rows"].as_array().unwrap().iter().filter(|r| r["reachable"] == true).count();
    assert!(reachable > 0);
    let mut a = args.to_vec();
    a.extend(["--format", "html"]);
    let r = gearsieve(&a);
    assert_eq!(r.code, 0, "{}", r.stderr);
    let html = &r.stdout;
    assert!(html.starts_with("<!DOCTYPE html>\n"), "{}", &html[..200.min(html.len())]);
    assert_eq!(html.matches("<html").count(), 1);
    assert_eq!(html.matches("</html>").count(), 1);
    assert_eq!(html.matches("<table>").count(), 1);
    assert_eq!(html.matches("<svg ").count(), reachable);
    assert!(html.contains("@page { size: A4"));
    assert!(!html.contains("http"), "a link or namespace to fetch");
    assert!(!html.contains("<?xml"));
    assert!(html.contains("isolated from power"));
    // Each figure renders on its own as an SVG.
    let first = &html[html.find("<svg ").unwrap()..html.find("</svg>").unwrap() + "</svg>".len()];
    let standalone = first.replacen("<svg ", "<svg xmlns=\"http://www.w3.org/2000/svg\" ", 1);
    let pixmap = render(&standalone, 2.0);
    assert!(pixmap.pixels().iter().filter(|p| p.red() < 200).count() > 1000);
}

#[test]
fn every_result_kind_gives_a_page() {
    for args in [
        vec!["search", "--ratio", "6", "--teeth", "12..60", "--stages", "2", "--limit", "3"],
        vec!["mesh", "--teeth", "17,53", "--module", "2", "--centre-distance", "71"],
        vec!["clock", "motion", "--limit", "2"],
        vec!["reducer", "--ratio", "12", "--modules", "1.5", "--limit", "2"],
    ] {
        let mut a = args.clone();
        a.extend(["--format", "html"]);
        let r = gearsieve(&a);
        assert_eq!(r.code, 0, "{args:?}: {}", r.stderr);
        let html = &r.stdout;
        assert!(html.starts_with("<!DOCTYPE html>\n") && html.ends_with("</html>\n"), "{args:?}");
        assert_eq!(html.matches("<h1>").count(), 1, "{args:?}: {html}");
        assert!(html.contains("<table>"), "{args:?}: {html}");
        assert!(html.contains("@page") && !html.contains("http"), "{args:?}");
    }
}

#[test]
fn a_three_stage_setup_is_drawn_where_the_banjo_model_placed_its_studs() {
    // 0.6 mm on the two-slot demo lathe through three stages: six gears, two slot bands, four
    // shafts of 16 mm; each stud drawn at the distance from the leadscrew the table gives.
    let args = [
        "thread",
        "--lathe",
        "catalogs/lathe/quillsby.lathe",
        "--pitch",
        "0.6mm",
        "--stages",
        "3",
        "--limit",
        "1",
    ];
    let r = gearsieve(&[&args[..], &["--format", "svg"]].concat());
    assert_eq!(r.code, 0, "{}", r.stderr);
    let svg = r.stdout;
    assert_eq!(gear_outlines(&svg), 6, "{svg}");
    let machine = svg.lines().filter(|l| l.contains("stroke=\"#555555\""));
    assert_eq!(machine.clone().filter(|l| l.starts_with("<path") && l.contains("Z\"")).count(), 2);
    let shafts: Vec<&str> = machine.filter(|l| l.starts_with("<circle") && l.contains("r=\"8\"")).collect();
    assert_eq!(shafts.len(), 4, "{shafts:?}");
    for name in ["stud", "stud 1", "stud 2", "leadscrew"] {
        assert!(svg.contains(&format!(">{name}</text>")), "no label {name}");
    }
    let (code, v) = json(&args);
    assert_eq!(code, 0);
    let studs = v["trains"][0]["chain"]["studs_from_leadscrew_mm"].as_array().unwrap().clone();
    // The shafts' centres in the SVG are in mm (the leadscrew last); each stud's distance from
    // the leadscrew must be what the JSON says (to its 0.1 mm).
    let centre = |l: &str| -> [f64; 2] {
        let attr = |k: &str| -> f64 {
            let at = l.find(&format!(" {k}=\"")).unwrap() + k.len() + 3;
            l[at..].split('"').next().unwrap().parse().unwrap()
        };
        [attr("cx"), attr("cy")]
    };
    let c: Vec<[f64; 2]> = shafts.iter().map(|l| centre(l)).collect();
    for (k, want) in studs.iter().enumerate() {
        let d = (c[k + 1][0] - c[3][0]).hypot(c[k + 1][1] - c[3][1]);
        assert!((d - want.as_f64().unwrap()).abs() < 0.06, "stud {k}: {d} vs {want}");
    }
    let pixmap = render(&svg, 4.0);
    assert!(pixmap.pixels().iter().filter(|p| p.red() < 200).count() > 5000);
}
