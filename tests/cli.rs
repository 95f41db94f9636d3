//! The real binary on fixture catalogues: output shapes, exit codes and error messages.

mod common;
use common::*;

#[test]
fn json_follows_the_contract() {
    let (code, v) = json(&[
        "search", "--ratio", "37.5:1", "--tol", "10ppm", "--teeth", "12..60", "--stages", "2..3", "--limit",
        "5",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["target"]["ratio"], "37.5:1");
    assert_eq!(v["target"]["value"], 37.5);
    assert!((v["target"]["tolerance"].as_f64().unwrap() - 1e-5).abs() < 1e-18);
    assert!(v["count"].as_u64().unwrap() >= 5);
    let trains = v["trains"].as_array().unwrap();
    assert_eq!(trains.len(), 5);
    for t in trains {
        let stages = t["stages"].as_array().unwrap();
        assert_eq!(t["meshes"].as_u64().unwrap() as usize, stages.len());
        let (mut p, mut q) = (1u64, 1u64);
        for s in stages {
            let (a, b) = (s["driver"].as_u64().unwrap(), s["driven"].as_u64().unwrap());
            p *= b;
            q *= a;
            assert_eq!(s["module_mm"], 1.0);
            assert_eq!(s["reference_centre_distance_mm"].as_f64().unwrap(), (a + b) as f64 / 2.0);
        }
        let g = gcd(p, q);
        assert_eq!(t["ratio"], format!("{}/{}", p / g, q / g).replace("/1\"", "\"").trim_end_matches("/1"));
        let dir = if stages.len() % 2 == 0 { "same" } else { "opposite" };
        assert_eq!(t["direction"], dir);
        assert!(t["error"].as_f64().unwrap().abs() <= 1e-5);
    }
}

fn gcd(a: u64, b: u64) -> u64 {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

#[test]
fn table_names_the_target_count_and_convention() {
    let r =
        gearsieve(&["search", "--ratio", "127/120", "--teeth", "20..130", "--stages", "2", "--limit", "3"]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    assert!(r.stdout.contains("Target ratio 127/120"), "{}", r.stdout);
    assert!(r.stdout.contains("trains meet every constraint"));
    assert!(r.stdout.contains("input turns per output turn"));
    assert!(r.stdout.contains("ISO 6336"));
    assert!(r.stdout.lines().any(|l| l.trim_start().starts_with("1  127/120  exact")), "{}", r.stdout);
}

#[test]
fn csv_has_one_row_per_train() {
    let r = gearsieve(&[
        "search", "--ratio", "3", "--teeth", "12..40", "--stages", "1..2", "--limit", "4", "--format", "csv",
    ]);
    assert_eq!(r.code, 0);
    let mut rd = csv::Reader::from_reader(r.stdout.as_bytes());
    let head = rd.headers().unwrap().clone();
    assert_eq!(&head[0], "rank");
    assert!(head.iter().any(|h| h == "stage2_reference_centre_distance_mm"));
    let rows: Vec<_> = rd.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 4);
    assert_eq!(&rows[0][1], "3");
}

#[test]
fn stock_quantities_and_labels_are_respected() {
    let (code, v) = json(&[
        "search",
        "--ratio",
        "4",
        "--stock",
        &fixture("small-box.csv"),
        "--stages",
        "1..3",
        "--limit",
        "50",
    ]);
    assert_eq!(code, 0);
    // 4 = 40/20·60/30 = 60/30·40/20 … with one 20, one 30, two 40s and one 60 on hand.
    for t in v["trains"].as_array().unwrap() {
        let mut used = std::collections::HashMap::new();
        for s in t["stages"].as_array().unwrap() {
            *used.entry(s["driver"].as_u64().unwrap()).or_insert(0) += 1;
            *used.entry(s["driven"].as_u64().unwrap()).or_insert(0) += 1;
        }
        for (z, n) in used {
            let have = if z == 40 { 2 } else { 1 };
            assert!(n <= have, "{z} used {n} times");
        }
    }
    assert!(v["count"].as_u64().unwrap() >= 1);
    let s0 = &v["trains"][0]["stages"][0];
    assert!(s0["driver_labels"].is_array());
}

#[test]
fn modules_never_mix_within_a_stage() {
    let (code, v) =
        json(&["search", "--ratio", "6", "--stock", &fixture("two-modules.csv"), "--stages", "1..2"]);
    assert_eq!(code, 0);
    // Only 40/20 (module 1) · 45/15 (module 2) makes 6.
    assert_eq!(v["count"], 1);
    let st = v["trains"][0]["stages"].as_array().unwrap();
    let mut modules: Vec<f64> = st.iter().map(|s| s["module_mm"].as_f64().unwrap()).collect();
    modules.sort_by(f64::total_cmp);
    assert_eq!(modules, vec![1.0, 2.0]);
}

#[test]
fn direction_is_required_when_asked() {
    let (_, v) =
        json(&["search", "--ratio", "2", "--teeth", "12..40", "--direction", "same", "--limit", "100"]);
    for t in v["trains"].as_array().unwrap() {
        assert_eq!(t["direction"], "same");
        assert_eq!(t["meshes"], 2);
    }
    let r = gearsieve(&["search", "--ratio", "2", "--stages", "1", "--direction", "same"]);
    assert_eq!(r.code, 2);
    assert!(r.stderr.contains("--direction"), "{}", r.stderr);
}

#[test]
fn nothing_found_exits_1_and_still_writes_json() {
    let (code, v) = json(&["search", "--ratio", "1000", "--teeth", "12..20", "--stages", "1"]);
    assert_eq!(code, 1);
    assert_eq!(v["count"], 0);
    assert_eq!(v["trains"].as_array().unwrap().len(), 0);
    let r = gearsieve(&["search", "--ratio", "1000", "--teeth", "12..20", "--stages", "1"]);
    assert_eq!(r.code, 1);
    // A looser tolerance cannot bring 1000 within reach of one stage of 20/12: not named.
    assert_eq!(
        r.stderr,
        "gearsieve: no train meets every constraint. 1000 is out of reach: 1 stage of these gears makes \
         at most 1.6667. Try a wider --teeth range.\n"
    );
    assert!(r.stdout.contains("No train meets every constraint"));
}

#[test]
fn bad_input_gets_one_line_and_exit_2() {
    let cases: &[(&[&str], &str)] = &[
        (&["search", "--ratio", "0"], "--ratio"),
        (&["search", "--ratio", "-3"], "--ratio"),
        (&["search", "--ratio", "abc"], "--ratio"),
        (&["search", "--ratio", "1/0"], "--ratio"),
        (&["search", "--ratio", ""], "--ratio"),
        (&["search", "--ratio", "nan"], "--ratio"),
        (&["search", "--ratio", "inf"], "--ratio"),
        (&["search", "--ratio", "2", "--tol", "-1e-4"], "--tol"),
        (&["search", "--ratio", "2", "--tol", "100%"], "--tol"),
        (&["search", "--ratio", "2", "--tol", "lots"], "--tol"),
        (&["search", "--ratio", "2", "--tol", "nan"], "--tol"),
        (&["search", "--ratio", "2", "--teeth", "50..20"], "--teeth"),
        (&["search", "--ratio", "2", "--teeth", ""], "--teeth"),
        (&["search", "--ratio", "2", "--teeth", "12..1000000000"], "--teeth"),
        (&["search", "--ratio", "2", "--stages", "50"], "--stages"),
        (&["search", "--ratio", "2", "--stages", "3..1"], "--stages"),
        (&["search", "--ratio", "2", "--module", "0"], "--module"),
        (&["search", "--ratio", "2", "--module", "-1"], "--module"),
        (&["search", "--ratio", "2", "--module", "NaN"], "--module"),
        (&["search", "--ratio", "2", "--rank", "colour"], "--rank"),
        (&["search", "--ratio", "2", "--stage-ratio", "6..1"], "--stage-ratio"),
        (&["search", "--ratio", "2", "--centre-distance", "80..40"], "--centre-distance"),
        (&["search", "--ratio", "2", "--driver-teeth", "0..5"], "--driver-teeth"),
        (&["search", "--ratio", "2", "--teeth", "20"], "nothing can mesh"),
        (&["search", "--ratio", "2", "--stock", "no-such-file.csv"], "no-such-file.csv"),
        (&["search", "--ratio", "2", "--stock", "tests"], "is a directory"),
        (&["search", "--ratio", "2", "--threads", "0"], "--threads"),
        (&["search", "--ratio", "2", "--format", "xml"], "--format"),
    ];
    for (args, want) in cases {
        let r = gearsieve(args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert!(r.stderr.contains(want), "{args:?}: {}", r.stderr);
        assert!(!r.stderr.contains("panicked"), "{args:?}: {}", r.stderr);
        assert!(r.stdout.is_empty(), "{args:?} printed {}", r.stdout);
        if !r.stderr.starts_with("error:") {
            assert_flags_named_once(&r.stderr);
        }
    }
    // Each message in full: what was wrong, where (the flag, once), and what is accepted.
    let exact: &[(&[&str], &str)] = &[
        (
            &["search", "--ratio", "1e3x"],
            "--ratio: \"1e3x\" is not a number; wanted a positive number such as 12, 1.0583, 2.5e-1, \
             127/120, 37.5:1 or pi",
        ),
        (
            &["search", "--ratio", "1e31"],
            "--ratio: \"1e31\" has an exponent out of range; wanted a positive number such as 12, 1.0583, \
             2.5e-1, 127/120, 37.5:1 or pi",
        ),
        // The same limits for the module as mesh, thread and clock.
        (
            &["search", "--ratio", "2", "--module", "1e9"],
            "--module: module must be a number of mm from 0.05 to 100, found 1000000000",
        ),
        (
            &["search", "--ratio", "2", "--module", "1e9", "--stock", "catalogs/lathe-change-gears.csv"],
            "--module: module must be a number of mm from 0.05 to 100, found 1000000000",
        ),
        (
            &["search", "--ratio", "2", "--diametral-pitch", "0.001"],
            "--diametral-pitch: diametral pitch must be a number of teeth per inch from 0.254 to 500 \
             (modules of 0.0508 to 100 mm), found 0.001",
        ),
        (
            &["search", "--ratio", "2", "--centre-distance", "3ft"],
            "--centre-distance: \"3ft\" has an unknown unit \"ft\"; wanted LO..HI or one length, in mm such \
             as 40..80 or 75 (or with units: 1.5in..3in), above 0, LO ≤ HI",
        ),
        (
            &["search", "--ratio", "2", "--limit", "0"],
            "--limit: 0 streams every train; give --format csv, or json for JSON lines",
        ),
        // Values clap reads get one line too, saying what is accepted.
        (
            &["search", "--ratio", "2", "--module", "2mm"],
            "--module: \"2mm\" is not a number; wanted a number such as 1.5, 0.25 or 2.5e-1",
        ),
        (
            &["search", "--ratio", "2", "--limit", "x"],
            "--limit: \"x\" is not a whole number; wanted a whole number such as 10",
        ),
        (
            &["search", "--ratio", "2", "--format", "xml"],
            "--format: \"xml\" is not one of table, csv, json, markdown, svg, html",
        ),
        (
            &["search", "--ratio", "2", "--threads", "0"],
            "--threads: \"0\" is not accepted: 0 is not in 1..=1024",
        ),
    ];
    for (args, want) in exact {
        refused(args, want);
    }
}

#[test]
fn ratios_take_the_number_syntax_of_tolerances() {
    let target = |ratio: &str| {
        let (code, v) =
            json(&["search", "--ratio", ratio, "--teeth", "12..120", "--stages", "1..2", "--limit", "3"]);
        assert_eq!(code, 0, "{ratio}");
        (v["target"]["value"].as_f64().unwrap(), v["trains"].clone())
    };
    // 1e2 = 100 = 120/12 · 120/12; 2.5e-1 = 1/4 = 12/48.
    assert_eq!(target("1e2").0, 100.0);
    assert_eq!(target("1e2").1, target("100").1);
    assert_eq!(target("2.5e-1").0, 0.25);
    assert_eq!(target("2.5e-1").1, target("1/4").1);
}

#[test]
fn lengths_take_units_where_a_length_is_meant() {
    let first = |cd: &str| {
        let (code, v) = json(&[
            "search",
            "--ratio",
            "2",
            "--teeth",
            "12..60",
            "--stages",
            "1",
            "--centre-distance",
            cd,
            "--limit",
            "50",
        ]);
        assert_eq!(code, 0, "{cd}");
        v["trains"].clone()
    };
    // 1 in = 25.4 mm exactly.
    assert_eq!(first("1in..2in"), first("25.4..50.8"));
    assert_eq!(first("0.03m..40mm"), first("30..40"));
}

#[test]
fn a_search_out_of_reach_or_too_long_names_only_what_would_help() {
    // Exact and out of reach: a looser tolerance cannot help, a tighter one does not apply.
    let r = gearsieve(&["search", "--ratio", "127/120", "--teeth", "12..100", "--stages", "1..3"]);
    assert_eq!(r.code, 1);
    assert_eq!(
        r.stderr,
        "gearsieve: no train meets every constraint. An exact 127/120 cannot be made from these gears: 127 \
         divides it and shares no factor with any tooth count up to 100. Try a --tol above 0, or a --teeth \
         range up to 127.\n"
    );
    let r = gearsieve(&["search", "--ratio", "30", "--teeth", "12..60", "--stages", "1..2"]);
    assert_eq!(
        r.stderr,
        "gearsieve: no train meets every constraint. 30 is out of reach: 2 stages of these gears make at \
         most 25. Try --stages up to 3, or a wider --teeth range.\n"
    );
    // In reach but not found: the tolerance can be loosened, the limits given widened.
    // 13/10 lies within one stage of 12..20 teeth, but 26/20 is the smallest pair that makes it.
    let r = gearsieve(&[
        "search",
        "--ratio",
        "1.3",
        "--teeth",
        "12..20",
        "--stages",
        "1",
        "--stage-ratio",
        "1..3",
    ]);
    assert_eq!(r.code, 1);
    assert_eq!(
        r.stderr,
        "gearsieve: no train meets every constraint. Try a looser --tol, more --stages, a wider --teeth \
         range, or wider --stage-ratio limits.\n"
    );
    // An exact search that would run for hours is not told to tighten its tolerance.
    let r = gearsieve(&[
        "search", "--ratio", "127/120", "--teeth", "12..200", "--stages", "6", "--engine", "sieve",
    ]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(
        r.stderr.contains(
            "narrow it (fewer --stages, a narrower --teeth range, --driver-teeth or --stage-ratio limits)"
        ),
        "{}",
        r.stderr
    );
    assert!(!r.stderr.contains("--tol"), "{}", r.stderr);
    assert_flags_named_once(&r.stderr);
}

#[test]
fn bad_catalogue_rows_are_named() {
    let cases: &[(&[u8], &str)] = &[
        (b"", "is empty"),
        (b"teeth,module\n", "no gears"),
        (b"module\n1\n", "no teeth column"),
        (b"teeth,module,colour\n20,1,red\n", "unknown column \"colour\""),
        (b"teeth,module\n20,1\ntwelve,1\n", "row 3, column teeth"),
        (b"teeth,module\n0,1\n", "row 2, column teeth"),
        (b"teeth,module\n-20,1\n", "row 2, column teeth"),
        (b"teeth,module\n20.5,1\n", "row 2, column teeth"),
        (b"teeth,module\n123456789012,1\n", "row 2, column teeth"),
        (b"teeth,module\n20,0\n", "row 2, column module"),
        (b"teeth,module\n20,-1\n", "row 2, column module"),
        (b"teeth,module\n20,NaN\n", "row 2, column module"),
        (b"teeth\n20\n30\n", "row 2, column module"),
        (b"teeth,module,diametral_pitch\n20,1,16\n", "row 2, column diametral_pitch"),
        (b"teeth,label\n20,\xff\n", "UTF-8"),
        (b"teeth,module\n20,1\n20,1\n", "nothing can mesh"),
    ];
    for (text, want) in cases {
        let (_dir, path) = temp_catalogue("stock.csv", text);
        let r = gearsieve(&["search", "--ratio", "2", "--stock", &path]);
        assert_eq!(r.code, 2, "{:?}: {}", String::from_utf8_lossy(text), r.stderr);
        assert!(r.stderr.contains(want), "{:?}: {}", String::from_utf8_lossy(text), r.stderr);
        assert!(r.stderr.contains("stock.csv"), "{}", r.stderr);
        assert_eq!(r.stderr.trim().lines().count(), 1, "{}", r.stderr);
    }
}

#[test]
fn awkward_but_valid_catalogues_load() {
    let cases: &[&[u8]] = &[
        b"\xEF\xBB\xBFteeth,module\r\n20,1\r\n40,1\r\n",
        b"\"teeth\",\"module\",\"label\"\n\"20\",\"1\",\"a, b\"\n\"40\",\"1\",\"\"\n",
        b"# comment\nteeth , module\n 20 , 1 \n# another\n40,1\n",
        b"teeth,module,quantity\n20,1,1\n20,1,1\n40,1,1\n",
    ];
    for text in cases {
        let (_dir, path) = temp_catalogue("ok.csv", text);
        let (code, v) = json(&["search", "--ratio", "2", "--stock", &path, "--stages", "1"]);
        assert_eq!(code, 0, "{:?}", String::from_utf8_lossy(text));
        assert_eq!(v["count"], 1);
    }
    // Duplicate rows add up: two single 20s make two 20s, so 40/20 · 40/20 … needs two 40s too.
    let (_d, path) = temp_catalogue("dup.csv", b"teeth,module\n20,1\n20,1\n40,1\n40,1\n");
    let (_, v) = json(&["search", "--ratio", "4", "--stock", &path, "--stages", "2"]);
    assert_eq!(v["count"], 1);
}

#[test]
fn output_file_is_written_whole() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("out.json");
    let p = path.to_string_lossy().into_owned();
    let r = gearsieve(&["search", "--ratio", "5", "--teeth", "12..40", "--format", "json", "--output", &p]);
    assert_eq!(r.code, 0);
    assert!(r.stdout.is_empty());
    let v: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    assert!(v["count"].as_u64().unwrap() > 0);
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1, "no temporary file left behind");
}

#[test]
fn same_output_for_any_thread_count() {
    let args = ["search", "--ratio", "29.530588", "--tol", "50ppm", "--teeth", "12..90", "--format", "json"];
    let one = gearsieve(&[&args[..], &["--threads", "1"]].concat());
    let two = gearsieve(&[&args[..], &["--threads", "2"]].concat());
    let again = gearsieve(&[&args[..], &["--threads", "2"]].concat());
    assert_eq!(one.code, 0);
    assert_eq!(one.stdout, two.stdout);
    assert_eq!(two.stdout, again.stdout);
}

#[test]
fn help_states_the_ratio_convention() {
    let r = gearsieve(&["search", "--help"]);
    assert_eq!(r.code, 0);
    assert!(r.stdout.contains("input turns per output turn"), "{}", r.stdout);
}

#[test]
fn output_into_a_missing_folder_says_which_folder() {
    let r = gearsieve(&["search", "--ratio", "3", "--output", "/no/such/dir/x.csv"]);
    assert_eq!(r.code, 2);
    assert_eq!(
        r.stderr.trim(),
        "gearsieve: --output /no/such/dir/x.csv: there is no folder /no/such/dir; create it first or give another path"
    );
}

/// A lower-bound count walks one side's multisets whatever the window: six stages of 12..300
/// teeth are forecast at many hours from a sample of that walk (12..200: one to three hours, too
/// near the line for a test), and refused without --long.
#[test]
fn a_lower_bound_search_that_would_walk_for_hours_needs_long() {
    let r = gearsieve(&[
        "search",
        "--ratio",
        "29.530588",
        "--tol",
        "0.1ppm",
        "--teeth",
        "12..300",
        "--stages",
        "6",
        "--count",
        "lower-bound",
        "--threads",
        "2",
    ]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(r.stderr.contains("would take") && r.stderr.contains("--long"), "{}", r.stderr);
    assert!(!r.stderr.contains("--count lower-bound"), "already given: {}", r.stderr);
    assert!(r.stdout.is_empty());
}

/// Six stages of 12..80 teeth at 0.1 ppm go to the meet engine, whose forecast of its prefixes
/// of four values runs to days on two threads: the search is refused without --long, as the
/// sieve's long searches are, instead of starting work it would not finish.
#[test]
fn a_six_stage_meet_search_that_would_run_for_hours_needs_long() {
    let r = gearsieve(&[
        "search",
        "--ratio",
        "29.530588",
        "--tol",
        "0.1ppm",
        "--teeth",
        "12..80",
        "--stages",
        "6",
        "--threads",
        "2",
    ]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(r.stderr.contains("--long") && r.stderr.contains("hours"), "{}", r.stderr);
    // What it takes to list the best without counting every train is offered first.
    assert!(
        r.stderr.contains("list the proven best without counting every train with --count lower-bound"),
        "{}",
        r.stderr
    );
    assert!(r.stdout.is_empty());
}
