//! The fuzz targets' invariants, run by `cargo test` on the committed seed corpora. The checks
//! themselves are the fuzz crate's, included here so both run the same code; see
//! `docs/fuzzing.md`. An input a fuzzer fails on goes in `fuzz/regressions/<target>/` and gets a
//! named test here (none so far: the runs recorded in `docs/fuzzing.md` found no failure).

#[path = "../fuzz/src/lib.rs"]
mod invariants;

use std::fs;
use std::path::{Path, PathBuf};

use invariants::{check_catalogue, check_text, CatalogueOutcome, TextOutcome};

/// Every file in `fuzz/<dir>/<target>/`, sorted.
fn inputs(dir: &str, target: &str) -> Vec<(PathBuf, Vec<u8>)> {
    let folder = Path::new(env!("CARGO_MANIFEST_DIR")).join("fuzz").join(dir).join(target);
    let entries = fs::read_dir(&folder).unwrap_or_else(|e| panic!("cannot list {}: {e}", folder.display()));
    let mut files: Vec<PathBuf> =
        entries.map(|e| e.expect("a readable folder entry").path()).filter(|p| p.is_file()).collect();
    files.sort();
    files
        .into_iter()
        .map(|p| {
            let bytes = fs::read(&p).expect("a readable corpus file");
            (p, bytes)
        })
        .collect()
}

fn seeds(target: &str) -> Vec<(PathBuf, Vec<u8>)> {
    let files: Vec<_> = inputs("corpus", target)
        .into_iter()
        .filter(|(p, _)| p.file_name().and_then(|n| n.to_str()).is_some_and(|n| n.starts_with("seed-")))
        .collect();
    assert!(
        files.len() >= 10,
        "expected the committed seeds in fuzz/corpus/{target}/, found {}",
        files.len()
    );
    files
}

#[test]
fn parser_seeds_hold_the_invariants_and_reach_both_outcomes() {
    let outcomes: Vec<TextOutcome> =
        seeds("parsers").iter().map(|(_, bytes)| check_text(&String::from_utf8_lossy(bytes))).collect();
    // A corpus that only ever failed (or only ever parsed) would leave half of each parser
    // unexplored by the fuzzer's starting point.
    let each = |f: fn(&TextOutcome) -> bool, what: &str| {
        assert!(outcomes.iter().any(f), "no parser seed is a valid {what}");
        assert!(!outcomes.iter().all(f), "every parser seed is a valid {what}");
    };
    each(|o| o.ratio, "ratio");
    each(|o| o.tolerance, "tolerance");
    each(|o| o.int_range, "teeth range");
    each(|o| o.ratio_range, "ratio range");
    each(|o| o.float_range, "length range");
}

#[test]
fn catalogue_seeds_hold_the_invariants_and_reach_both_outcomes() {
    let outcomes: Vec<CatalogueOutcome> =
        seeds("catalogue").iter().map(|(_, bytes)| check_catalogue(bytes)).collect();
    assert!(outcomes.iter().any(|o| o.pool), "no seed makes a pool");
    assert!(
        outcomes.iter().any(|o| o.gears_with_default > 0 && !o.pool),
        "no seed loads but fails to make a pool"
    );
    assert!(outcomes.iter().any(|o| o.gears_with_default == 0), "no seed is refused by the loader");
    assert!(
        outcomes.iter().any(|o| o.gears_without_default == 0 && o.gears_with_default > 0),
        "no seed needs the default module"
    );
}

#[test]
fn known_seed_results_are_as_the_format_says() {
    // Spot checks that the seeds mean what their names say, so the invariants above run on the
    // cases they were written for.
    let by_name = |name: &str| {
        let (_, bytes) = seeds("catalogue")
            .into_iter()
            .find(|(p, _)| p.file_name().is_some_and(|n| n == name))
            .unwrap_or_else(|| panic!("seed {name} is missing"));
        check_catalogue(&bytes)
    };
    let bom = by_name("seed-02-bom-crlf.csv");
    assert_eq!((bom.gears_without_default, bom.pool), (2, true));
    let quoted = by_name("seed-06-quoted.csv");
    assert_eq!((quoted.gears_without_default, quoted.pool), (2, true));
    let needs_default = by_name("seed-05-default-module.csv");
    assert_eq!((needs_default.gears_without_default, needs_default.gears_with_default), (0, 2));
    let not_utf8 = by_name("seed-11-not-utf8.csv");
    assert_eq!(not_utf8, CatalogueOutcome::default());
}
