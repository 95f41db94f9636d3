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
    ("search-nothing", &["search", "--ratio", "1000", "--teeth", "12..20", "--stages", "1"]),
    ("mesh", &["mesh", "--teeth", "17,53", "--module", "2", "--centre-distance", "71"]),
    ("mesh-defects", &["mesh", "--teeth", "12,40", "--diametral-pitch", "8"]),
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
        "chart",
        &[
            "chart",
            "--series",
            "iso-coarse",
            "--leadscrew",
            "8tpi",
            "--stock",
            "catalogs/lathe-change-gears.csv",
            "--limit",
            "3",
        ],
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
    ("clock-motion", &["clock", "motion", "--limit", "3"]),
    ("clock-astro", &["clock", "astro", "--period", "synodic-month", "--tol", "10ppm", "--limit", "3"]),
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
];

const FORMATS: &[(&str, &str)] = &[("table", "txt"), ("csv", "csv"), ("json", "json"), ("markdown", "md")];

fn golden(name: &str) -> PathBuf {
    [env!("CARGO_MANIFEST_DIR"), "tests", "golden", name].iter().collect()
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
            let seen = format!("{}--- stderr\n{}--- exit {}\n", r.stdout, r.stderr, r.code);
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
    let mut a = vec!["merge"];
    a.extend(parts.iter().map(String::as_str));
    let r = gearsieve(&a);
    check("merge.json", &format!("{}--- stderr\n{}--- exit {}\n", r.stdout, r.stderr, r.code), &mut failures);
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
