//! Golden files: every command's output in every format on a fixed case, compared byte for byte
//! with a file under `tests/golden/`, so a change of wording or layout is a reviewed diff and not
//! an accident. After an intended change, write the files anew with
//! `GEARSIEVE_BLESS=1 cargo test --test golden` and review the diff.

mod common;

use std::path::PathBuf;

use common::gearsieve;

/// The fixed cases: a file stem and the arguments (without `--format`).
const CASES: &[(&str, &[&str])] = &[
    (
        "search-stock",
        &[
            "search",
            "--ratio",
            "127/60",
            "--stock",
            "catalogs/lathe-change-gears.csv",
            "--stages",
            "1..2",
            "--limit",
            "5",
        ],
    ),
    (
        "search-centre-distance",
        &[
            "search",
            "--ratio",
            "12",
            "--tol",
            "1%",
            "--teeth",
            "14..90",
            "--module",
            "1.5",
            "--stages",
            "2",
            "--centre-distance",
            "75",
            "--limit",
            "3",
            "--explain",
        ],
    ),
    (
        "search-pareto",
        &[
            "search", "--ratio", "pi", "--tol", "1e-3", "--teeth", "12..60", "--stages", "1..2", "--pareto",
            "--limit", "4",
        ],
    ),
    (
        "search-buy",
        &[
            "search",
            "--ratio",
            "127/60",
            "--stock",
            "catalogs/lathe-change-gears-no127.csv",
            "--stages",
            "1..2",
            "--buy",
            "1",
            "--buy-teeth",
            "20..127",
            "--limit",
            "4",
        ],
    ),
    (
        "search-lower-bound",
        &[
            "search",
            "--ratio",
            "29.530588",
            "--tol",
            "10ppm",
            "--teeth",
            "12..40",
            "--stages",
            "5",
            "--count",
            "lower-bound",
            "--limit",
            "3",
        ],
    ),
    ("search-nothing", &["search", "--ratio", "1000", "--teeth", "12..20", "--stages", "1"]),
    ("mesh", &["mesh", "--teeth", "17,53", "--module", "2", "--centre-distance", "71"]),
    ("mesh-defects", &["mesh", "--teeth", "12,40", "--diametral-pitch", "8"]),
    (
        "mesh-shop",
        &[
            "mesh",
            "--teeth",
            "19,47",
            "--module",
            "2",
            "--shift",
            "0.2,-0.1",
            "--backlash",
            "0.08..0.2",
            "--housing-tol",
            "0.02",
            "--balls",
            "3.5,3.5",
        ],
    ),
    ("mesh-cycloidal", &["mesh", "--teeth", "64,8", "--module", "0.5", "--tooth-form", "cycloidal"]),
    ("draw-stages", &["draw", "--stages", "20:40,15:45", "--module", "2"]),
    (
        "thread",
        &[
            "thread",
            "--leadscrew",
            "8tpi",
            "--pitch",
            "1.25mm",
            "--stock",
            "catalogs/lathe-change-gears.csv",
            "--banjo",
            "catalogs/lathe/brackenfold.banjo",
            "--limit",
            "3",
            "--explain",
        ],
    ),
    (
        "thread-buy",
        &[
            "thread",
            "--leadscrew",
            "8tpi",
            "--pitch",
            "1.5mm",
            "--stock",
            "catalogs/lathe-change-gears-no127.csv",
            "--banjo",
            "catalogs/lathe/brackenfold.banjo",
            "--buy",
            "1",
            "--limit",
            "4",
            "--explain",
        ],
    ),
    (
        "thread-arrangements",
        &[
            "thread",
            "--lathe",
            "catalogs/lathe/brackenfold.lathe",
            "--pitch",
            "1.25mm",
            "--limit",
            "3",
            "--arrangements",
        ],
    ),
    (
        "thread-lathe-feed",
        &[
            "thread",
            "--lathe",
            "catalogs/lathe/quillsby.lathe",
            "--feed",
            "0.1mm",
            "--stages",
            "1..3",
            "--limit",
            "3",
        ],
    ),
    (
        "chart",
        &[
            "chart",
            "--series",
            "iso-coarse",
            "--leadscrew",
            "8tpi",
            "--stock",
            "catalogs/lathe-change-gears.csv",
        ],
    ),
    (
        "chart-buy",
        &["chart", "--lathe", "catalogs/lathe/quillsby.lathe", "--series", "unc", "--tol", "0", "--buy", "2"],
    ),
    (
        "clock-going",
        &[
            "clock",
            "going",
            "--period",
            "2",
            "--escape-teeth",
            "30",
            "--pinions",
            "8",
            "--stages",
            "2",
            "--limit",
            "3",
        ],
    ),
    (
        "clock-going-great",
        &[
            "clock",
            "going",
            "--period",
            "2",
            "--run",
            "8d",
            "--barrel-turns",
            "16",
            "--line-barrel",
            "40",
            "--falls",
            "2",
            "--pinions",
            "8",
            "--stages",
            "2",
            "--check-meshes",
            "--limit",
            "2",
        ],
    ),
    ("clock-motion", &["clock", "motion", "--limit", "3"]),
    ("clock-strike", &["clock", "strike", "--check-meshes", "--limit", "2"]),
    ("clock-astro", &["clock", "astro", "--period", "synodic-month", "--tol", "10ppm", "--limit", "3"]),
    (
        "clock-astro-lower-bound",
        &[
            "clock",
            "astro",
            "--period",
            "synodic-month",
            "--tol",
            "10ppm",
            "--teeth",
            "8..40",
            "--stages",
            "4",
            "--count",
            "lower-bound",
            "--limit",
            "3",
        ],
    ),
    (
        "reducer",
        &[
            "reducer",
            "--ratio",
            "20",
            "--modules",
            "1,1.5",
            "--centre-distances",
            "60,80",
            "--input-rpm",
            "1450",
            "--limit",
            "2",
        ],
    ),
    (
        "reducer-housing",
        &[
            "reducer",
            "--ratio",
            "20",
            "--modules",
            "1.5,2",
            "--min-stage-ratio",
            "3",
            "--prefer",
            "split",
            "--shaft-diameter",
            "20",
            "--shaft-margin",
            "3",
            "--fold",
            "60",
            "--housing-tol",
            "0.025",
            "--limit",
            "2",
        ],
    ),
    ("planetary", &["planetary", "--ratio", "5", "--planets", "3..4", "--limit", "4"]),
    (
        "planetary-stepped",
        &[
            "planetary",
            "--stepped",
            "--ratio",
            "9",
            "--tol",
            "0.5%",
            "--sun",
            "18..30",
            "--planet",
            "18..50",
            "--ring",
            "60..120",
            "--shift-sum",
            "-0.5..1",
            "--carrier-offset",
            "0.3",
            "--check-meshes",
            "--spacing",
            "near-equal",
            "--limit",
            "3",
            "--explain",
        ],
    ),
    (
        "planetary-two-ring",
        &["planetary", "--two-ring", "--ratio", "41", "--planets", "3..4", "--limit", "2"],
    ),
    (
        "planetary-nothing",
        &[
            "planetary",
            "--ratio",
            "5",
            "--sun",
            "21",
            "--planet",
            "30",
            "--ring",
            "80",
            "--planets",
            "4",
            "--explain",
        ],
    ),
];

const FORMATS: &[(&str, &str)] = &[
    ("table", "txt"),
    ("csv", "csv"),
    ("json", "json"),
    ("markdown", "md"),
    ("svg", "svg"),
    ("html", "html"),
];

fn golden(name: &str) -> PathBuf {
    [env!("CARGO_MANIFEST_DIR"), "tests", "golden", name].iter().collect()
}

/// An HTML page with the shapes of its inline drawings left out (their words kept): the shapes
/// of a chart's figures run to megabytes, too much to review, and the drawing code is pinned by
/// the SVG golden files; what a page says and how it is laid out stays pinned here.
fn shapes_elided(html: &str) -> String {
    let mut out = String::with_capacity(html.len());
    let (mut inside, mut dropped) = (false, 0usize);
    for line in html.lines() {
        if line.starts_with("<svg ") {
            inside = true;
        }
        let words = ["<svg ", "<title>", "<text ", "</svg>"].iter().any(|t| line.starts_with(t));
        if inside && !words {
            dropped += 1;
            continue;
        }
        if line == "</svg>" {
            out.push_str(&format!("<!-- {dropped} lines of shapes -->\n"));
            (inside, dropped) = (false, 0);
        }
        out.push_str(line);
        out.push('\n');
    }
    out
}

/// Compare `actual` with the golden file `name`, or write it when blessing.
fn check(name: &str, actual: &str, failures: &mut Vec<String>) {
    let path = golden(name);
    if std::env::var_os("GEARSIEVE_BLESS").is_some() {
        std::fs::write(&path, actual).expect("write the golden file");
        return;
    }
    match std::fs::read_to_string(&path) {
        Ok(expected) if expected == actual => {}
        Ok(expected) => {
            let line = expected.lines().zip(actual.lines()).position(|(a, b)| a != b).unwrap_or(0) + 1;
            failures.push(format!("{name}: differs from line {line}"));
        }
        Err(e) => failures.push(format!("{name}: {e}")),
    }
}

#[test]
fn every_command_in_every_format_prints_its_golden_file() {
    let mut failures = Vec::new();
    for (stem, args) in CASES {
        for (format, ext) in FORMATS {
            let mut a = args.to_vec();
            a.extend(["--format", format]);
            let r = gearsieve(&a);
            // What a run printed on both streams and how it ended is what a user sees.
            let stdout = if *format == "html" { shapes_elided(&r.stdout) } else { r.stdout };
            let seen = format!("{stdout}--- stderr\n{}--- exit {}\n", r.stderr, r.code);
            check(&format!("{stem}.{ext}"), &seen, &mut failures);
        }
    }
    assert!(
        failures.is_empty(),
        "golden files differ (bless with GEARSIEVE_BLESS=1 after review):\n{}",
        failures.join("\n")
    );
}

#[test]
fn merge_prints_its_golden_file() {
    let dir = tempfile::tempdir().expect("temp dir");
    let search = [
        "search", "--ratio", "29/7", "--tol", "100ppm", "--teeth", "12..48", "--stages", "1..2", "--limit",
        "4", "--format", "json",
    ];
    let mut parts = Vec::new();
    for i in 1..=2 {
        let path = dir.path().join(format!("part{i}.json"));
        let path = path.to_string_lossy().into_owned();
        let shard = format!("{i}/2");
        let mut a = search.to_vec();
        a.extend(["--shard", &shard, "--output", &path]);
        assert_eq!(gearsieve(&a).code, 0);
        parts.push(path);
    }
    let mut failures = Vec::new();
    for (format, ext) in FORMATS {
        let mut a = vec!["merge", "--format", format];
        a.extend(parts.iter().map(String::as_str));
        let r = gearsieve(&a);
        check(
            &format!("merge.{ext}"),
            &format!("{}--- stderr\n{}--- exit {}\n", r.stdout, r.stderr, r.code),
            &mut failures,
        );
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
    // The merged parts read exactly as the unsplit search, in every format.
    for (format, _) in FORMATS {
        let mut whole = search.to_vec();
        whole.retain(|a| *a != "--format" && *a != "json");
        whole.extend(["--format", format]);
        let mut merge = vec!["merge", "--format", format];
        merge.extend(parts.iter().map(String::as_str));
        assert_eq!(gearsieve(&merge).stdout, gearsieve(&whole).stdout, "merge --format {format}");
    }
}

/// The names `docs/output-fields.md` documents: the backticked names in the first column of
/// its tables, with stage, arbor, planet and mesh numbers written `N`.
fn documented_names() -> std::collections::BTreeSet<String> {
    let path: PathBuf = [env!("CARGO_MANIFEST_DIR"), "docs", "output-fields.md"].iter().collect();
    let text = std::fs::read_to_string(path).expect("docs/output-fields.md");
    let mut names = std::collections::BTreeSet::new();
    for line in text.lines().filter(|l| l.starts_with("| `")) {
        let first = line.split('|').nth(1).unwrap_or("");
        names.extend(first.split('`').skip(1).step_by(2).map(str::to_string));
    }
    names
}

/// `stage2_driver` → `stageN_driver`, `arbor3_name` → `arborN_name`, `planet4_angle_deg` →
/// `planetN_angle_deg`, `mesh1_contact_ratio` → `meshN_contact_ratio`.
fn numbered(name: &str) -> String {
    for prefix in ["stage", "arbor", "planet", "mesh"] {
        if let Some(rest) = name.strip_prefix(prefix) {
            let digits = rest.chars().take_while(char::is_ascii_digit).count();
            if digits > 0 && rest[digits..].starts_with('_') {
                return format!("{prefix}N{}", &rest[digits..]);
            }
        }
    }
    name.to_string()
}

fn json_keys(v: &serde_json::Value, out: &mut std::collections::BTreeSet<String>) {
    match v {
        serde_json::Value::Object(m) => {
            for (k, x) in m {
                out.insert(k.clone());
                json_keys(x, out);
            }
        }
        serde_json::Value::Array(a) => a.iter().for_each(|x| json_keys(x, out)),
        _ => {}
    }
}

#[test]
fn every_output_field_is_documented() {
    let documented = documented_names();
    let mut seen = std::collections::BTreeSet::new();
    for (_, args) in CASES {
        for format in ["csv", "json"] {
            let mut a = args.to_vec();
            a.extend(["--format", format]);
            let r = gearsieve(&a);
            if r.stdout.is_empty() {
                continue;
            }
            if format == "csv" {
                let mut rd = csv::Reader::from_reader(r.stdout.as_bytes());
                seen.extend(rd.headers().expect("a CSV header").iter().map(numbered));
            } else {
                let v: serde_json::Value = serde_json::from_str(&r.stdout).expect("JSON");
                json_keys(&v, &mut seen);
            }
        }
    }
    // The streamed forms: CSV rows in found order, JSON lines.
    let stream = ["search", "--ratio", "3", "--teeth", "12..30", "--stages", "1..2", "--limit", "0"];
    let r = gearsieve(&[&stream[..], &["--format", "csv"]].concat());
    seen.extend(
        csv::Reader::from_reader(r.stdout.as_bytes()).headers().expect("header").iter().map(numbered),
    );
    let r = gearsieve(&[&stream[..], &["--format", "json"]].concat());
    for line in r.stdout.lines() {
        json_keys(&serde_json::from_str(line).expect("a JSON line"), &mut seen);
    }
    let missing: Vec<&String> = seen.iter().filter(|n| !documented.contains(*n)).collect();
    assert!(missing.is_empty(), "not in docs/output-fields.md: {missing:?}");
    assert!(seen.len() > 100, "the outputs name {} fields", seen.len());
}
