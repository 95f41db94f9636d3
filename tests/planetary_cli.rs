//! `gearsieve planetary`, the real binary: textbook trains by their published relations, every
//! format, bad input named by its flag, nothing found with a hint whose every change is tried
//! here and found to help, and the explanations of what was left out.

mod common;

use common::{gearsieve, json};

/// The textbook simple train: sun 20, planet 30, ring 80.
const TEXTBOOK: &[&str] =
    &["planetary", "--ratio", "5", "--tol", "0", "--sun", "20", "--planet", "30", "--ring", "80"];

fn with(base: &[&str], more: &[&str]) -> Vec<String> {
    base.iter().chain(more).map(|s| s.to_string()).collect()
}

fn run(args: &[String]) -> common::Run {
    gearsieve(&args.iter().map(String::as_str).collect::<Vec<_>>())
}

fn json_of(args: &[String]) -> (i32, serde_json::Value) {
    json(&args.iter().map(String::as_str).collect::<Vec<_>>())
}

#[test]
fn textbook_train_ring_held_sun_driving_is_one_plus_ring_over_sun() {
    // check-values.md, "Gear measurement and internal gears" (published relations, from
    // memory): ring held, sun driving, carrier driven, i = 1 + Zr/Zs = 1 + 80/20 = 5; coaxial
    // unshifted as 80 = 20 + 2·30; N equally spaced planets need (Zs + Zr)/N whole, and
    // neighbours clear when (Zs + Zp)·sin(π/N) > Zp + 2 (in modules). Computed from these:
    // 3 planets fail assembly (100/3), 4 pass (100/4 = 25; 50·sin 45° = 35.36 > 32, a gap of
    // 3.355 mm), 5 assemble but overlap (50·sin 36° = 29.39 < 32).
    let (code, v) = json_of(&with(TEXTBOOK, &["--planets", "3..5"]));
    assert_eq!(code, 0);
    assert_eq!(v["count"], 1);
    let d = &v["designs"][0];
    assert_eq!((d["sun"].as_u64(), d["planet"].as_u64(), d["ring"].as_u64()), (Some(20), Some(30), Some(80)));
    assert_eq!(d["planets"], 4);
    assert_eq!(d["ratio"], "5");
    assert_eq!(d["error"], 0.0);
    assert_eq!(d["direction"], "same");
    assert_eq!(d["places"], 100);
    assert_eq!(d["equally_spaced"], true);
    assert_eq!(d["carrier_centre_distance_mm"], 25.0);
    let gap = d["neighbour_gap_mm"].as_f64().unwrap();
    assert!((gap - (50.0 * std::f64::consts::FRAC_PI_4.sin() - 32.0)).abs() < 1e-9, "{gap}");
    let angles: Vec<f64> =
        d["planet_angles_deg"].as_array().unwrap().iter().map(|a| a.as_f64().unwrap()).collect();
    assert_eq!(angles, [0.0, 90.0, 180.0, 270.0]);
    // The table says the same in words.
    let r = gearsieve(&[TEXTBOOK, &["--planets", "4"][..]].concat());
    assert_eq!(r.code, 0, "{}", r.stderr);
    assert!(r.stdout.contains("ring held, sun driving, carrier driven: i = 1 + Zr/Zs"), "{}", r.stdout);
    let row = r.stdout.lines().find(|l| l.split_whitespace().take(2).eq(["1", "20"])).unwrap();
    let cells: Vec<&str> = row.split_whitespace().collect();
    assert_eq!(&cells[..10], ["1", "20", "30", "80", "4", "5", "5", "exact", "same", "25"], "{row}");
    assert!(row.contains("3.355") && row.contains("equal: 100 places, 25 apart"), "{row}");
}

#[test]
fn other_drives_follow_willis_equation() {
    // Willis' equation solved by hand for Zs = 20, Zr = 80 (i0 = −4), common practice: sun
    // held, ring driving, i = 1 + Zs/Zr = 5/4; carrier held, sun driving, i = −Zr/Zs = −4 (the
    // ring turns against the sun).
    let (code, v) = json_of(&changed(TEXTBOOK, "--ratio 5/4 --fixed sun --planets 4"));
    assert_eq!(code, 0);
    assert_eq!((&v["held"], &v["input"], &v["output"]), (&"sun".into(), &"ring".into(), &"carrier".into()));
    assert_eq!(v["designs"][0]["ratio"], "5/4");
    assert_eq!(v["designs"][0]["direction"], "same");
    let (code, v) = json_of(&changed(TEXTBOOK, "--ratio 4 --fixed carrier --input sun --planets 4"));
    assert_eq!(code, 0);
    assert_eq!(v["output"], "ring");
    assert_eq!(v["designs"][0]["ratio"], "4");
    assert_eq!(v["designs"][0]["direction"], "opposite");
}

#[test]
fn stepped_and_two_ring_trains() {
    // Computed: stepped 20/(40, 20)/80, ring held, sun driving: 1 + (80·40)/(20·20) = 9;
    // coaxial as 20 + 40 = 80 − 20; (20·20 + 80·40)/gcd(40, 20) = 180 places.
    let stepped = [
        "planetary",
        "--stepped",
        "--ratio",
        "9",
        "--tol",
        "0",
        "--sun",
        "20",
        "--planet",
        "40",
        "--planet-ring",
        "20",
        "--ring",
        "80",
    ];
    let (code, v) = json(&stepped);
    assert_eq!(code, 0);
    let d = &v["designs"][0];
    assert_eq!(
        (d["sun"].as_u64(), d["planet_sun"].as_u64(), d["planet_ring"].as_u64()),
        (Some(20), Some(40), Some(20))
    );
    assert_eq!(
        (d["ring"].as_u64(), d["places"].as_u64(), d["ratio"].as_str()),
        (Some(80), Some(180), Some("9"))
    );
    assert!(d.get("planet").is_none(), "{d}");
    // Computed: two-ring 20/21 planets in rings 80 and 82, carrier driving:
    // 20·82 / (20·82 − 80·21) = 1640 / −40 = −41, the output ring against the carrier;
    // |82·20 − 80·21| / gcd(20, 21) = 40 places, so 4 planets assemble.
    let two = [
        "planetary",
        "--two-ring",
        "--ratio",
        "41",
        "--tol",
        "0",
        "--planet",
        "20",
        "--planet-ring2",
        "21",
        "--ring",
        "80",
        "--ring2",
        "82",
        "--shift-sum",
        "-0.5..0.5",
        "--planets",
        "4",
        "--tip-clearance",
        "0.5",
    ];
    let (code, v) = json(&two);
    assert_eq!(code, 0);
    assert_eq!(
        (&v["held"], &v["input"], &v["output"]),
        (&"ring".into(), &"carrier".into(), &"output ring".into())
    );
    let d = &v["designs"][0];
    assert_eq!((d["planet_ring"].as_u64(), d["planet_ring2"].as_u64()), (Some(20), Some(21)));
    assert_eq!((d["ring"].as_u64(), d["ring2"].as_u64()), (Some(80), Some(82)));
    assert_eq!(
        (d["ratio"].as_str(), d["direction"].as_str(), d["places"].as_u64()),
        (Some("41"), Some("opposite"), Some(40))
    );
    assert!(d.get("sun").is_none(), "{d}");
    // One module, one tooth apart: the meshes need shift, one each way, within the range.
    let shifts: Vec<f64> = d["mesh_shift"].as_array().unwrap().iter().map(|x| x.as_f64().unwrap()).collect();
    assert!(shifts[0] > 0.0 && shifts[1] < 0.0 && shifts.iter().all(|x| x.abs() <= 0.5), "{shifts:?}");
}

#[test]
fn every_format_works() {
    let base = with(TEXTBOOK, &["--planets", "4"]);
    let out = |format: &str| {
        run(&with(&base.iter().map(String::as_str).collect::<Vec<_>>(), &["--format", format]))
    };
    let table = out("table");
    assert_eq!(table.code, 0);
    assert!(
        table.stdout.starts_with("Planetary train: i = 5, tolerance 0 (exact only)\n"),
        "{}",
        table.stdout
    );
    assert!(table.stdout.contains("CAUTION: gearsieve sizes geometry only."), "{}", table.stdout);
    assert!(table.stdout.contains("ISO 6336 or AGMA 2001"), "{}", table.stdout);
    let csv = out("csv");
    assert_eq!(csv.code, 0);
    let mut reader = csv::Reader::from_reader(csv.stdout.as_bytes());
    let head: Vec<String> = reader.headers().unwrap().iter().map(String::from).collect();
    let rows: Vec<csv::StringRecord> = reader.records().map(Result::unwrap).collect();
    assert_eq!(rows.len(), 1);
    let cell = |name: &str| {
        rows[0][head.iter().position(|h| h == name).unwrap_or_else(|| panic!("{name}"))].to_string()
    };
    assert_eq!(
        (cell("sun"), cell("planet"), cell("ring"), cell("planets")),
        ("20".into(), "30".into(), "80".into(), "4".into())
    );
    assert_eq!((cell("ratio"), cell("error"), cell("direction")), ("5".into(), "0".into(), "same".into()));
    assert_eq!((cell("carrier_centre_distance_mm"), cell("neighbour_gap_mm")), ("25".into(), "3.355".into()));
    assert_eq!(cell("planet4_angle_deg"), "270");
    let (code, v) = json_of(&base);
    assert_eq!(code, 0);
    assert_eq!(v["schema_version"], gearsieve::report::SCHEMA_VERSION);
    assert_eq!(v["caution"], gearsieve::trades::planetary::CAUTION);
    let md = out("markdown");
    assert_eq!(md.code, 0);
    assert!(md.stdout.starts_with("# Planetary train: i = 5"), "{}", md.stdout);
    assert!(md.stdout.contains("| # | sun | planet | ring |"), "{}", md.stdout);
    let svg = out("svg");
    assert_eq!(svg.code, 0);
    assert!(svg.stdout.starts_with("<?xml") && svg.stdout.contains("</svg>"), "{}", svg.stdout);
    // The carrier circle: radius 25 mm about the sun's centre, dash-dotted.
    assert!(
        svg.stdout.contains(r##"<circle cx="0" cy="0" r="25" fill="none" stroke="#b03a2e""##),
        "{}",
        svg.stdout
    );
    // Four planets, each with pitch, base and root circle (pitch circles of 30 mm) and its
    // teeth drawn as one closed outline, as are the sun's and the ring's: six outlines.
    assert_eq!(svg.stdout.matches(r#" r="15" "#).count(), 4, "{}", svg.stdout);
    assert_eq!(svg.stdout.matches("<path").count(), 6, "{}", svg.stdout);
}

#[test]
fn same_output_whatever_the_thread_count() {
    let args =
        ["planetary", "--stepped", "--ratio", "37/4", "--shift-sum", "-0.5..0.5", "--spacing", "near-equal"];
    let one = gearsieve(&[&args[..], &["--threads", "1", "--format", "json"]].concat());
    let two = gearsieve(&[&args[..], &["--threads", "2", "--format", "json"]].concat());
    assert_eq!(one.code, 0);
    assert_eq!(one.stdout, two.stdout);
}

#[test]
fn bad_input_names_the_flag_once_and_exits_2() {
    let cases: &[(&[&str], &str)] = &[
        (&["--ratio", "5", "--sun", "90..20"], "--sun"),
        (&["--ratio", "5", "--planet", "2..20"], "--planet"),
        (&["--ratio", "5", "--ring", "40..2000"], "--ring"),
        (&["--ratio", "5", "--planets", "1"], "--planets"),
        (&["--ratio", "5", "--planets", "3..40"], "--planets"),
        (&["--ratio", "0"], "--ratio"),
        (&["--ratio", "five"], "--ratio"),
        (&["--ratio", "5", "--tol", "150%"], "--tol"),
        (&["--ratio", "5", "--module", "0"], "--module"),
        (&["--ratio", "5", "--module", "-1"], "--module"),
        (&["--ratio", "5", "--pressure-angle", "95"], "--pressure-angle"),
        (&["--ratio", "5", "--tip-clearance", "-1"], "--tip-clearance"),
        (&["--ratio", "5", "--shift-sum", "1..0"], "--shift-sum"),
        (&["--ratio", "5", "--carrier-offset", "NaN"], "--carrier-offset"),
        (&["--ratio", "5", "--fixed", "sun", "--input", "sun"], "--input"),
        (&["--ratio", "5", "--planet-ring", "20..30"], "--planet-ring"),
        (&["--ratio", "5", "--planet-ring2", "20..30"], "--planet-ring2"),
        (&["--ratio", "5", "--ring2", "80"], "--ring2"),
        (&["--ratio", "5", "--two-ring", "--sun", "20"], "--sun"),
        (&["--ratio", "5", "--two-ring", "--fixed", "sun"], "--fixed"),
        (&["--ratio", "5", "--two-ring", "--stepped"], "--two-ring"),
        (&["--ratio", "5", "--two-ring", "--ring2", "30..2000"], "--ring2"),
    ];
    for (args, flag) in cases {
        let r = gearsieve(&[&["planetary"][..], args].concat());
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert!(r.stdout.is_empty(), "{args:?}: {}", r.stdout);
        assert_eq!(r.stderr.lines().count(), 1, "{args:?}: {}", r.stderr);
        assert!(r.stderr.starts_with(&format!("gearsieve: {flag}: ")), "{args:?}: {}", r.stderr);
        let named =
            r.stderr.matches(&format!("{flag}:")).count() + r.stderr.matches(&format!("{flag} ")).count();
        assert_eq!(named, 1, "{args:?}: {}", r.stderr);
        assert!(!r.stderr.contains("panicked"), "{args:?}: {}", r.stderr);
    }
    // The two members that may not be one are both named in the words of the command line.
    let r = gearsieve(&["planetary", "--ratio", "5", "--fixed", "sun", "--input", "sun"]);
    assert_eq!(
        r.stderr,
        "gearsieve: --input: the sun cannot drive while held by --fixed; wanted another member\n"
    );
}

/// `base` with `change` made: each `--flag value` of it replaces the flag's value in `base` or is
/// added; `without --flag` removes the flag and its value.
fn changed(base: &[&str], change: &str) -> Vec<String> {
    let mut args: Vec<String> = base.iter().map(|s| s.to_string()).collect();
    if let Some(flag) = change.strip_prefix("without ") {
        let at = args.iter().position(|a| a == flag).expect("the flag removed is there");
        args.drain(at..at + 2);
        return args;
    }
    let words: Vec<&str> = change.split_whitespace().collect();
    for pair in words.chunks(2) {
        match args.iter().position(|a| a == pair[0]) {
            Some(at) => args[at + 1] = pair[1].to_string(),
            None => args.extend(pair.iter().map(|s| s.to_string())),
        }
    }
    args
}

/// The changes a nothing-found hint names, each with the count it claims.
fn named_changes(stderr: &str) -> Vec<(String, u64)> {
    let Some((_, list)) = stderr.split_once("would find designs: ") else { return Vec::new() };
    list.trim_end()
        .trim_end_matches('.')
        .split("; ")
        .filter_map(|part| {
            let (change, count) = part.rsplit_once(" (")?;
            let n = count.split_whitespace().next()?.parse().ok()?;
            Some((change.to_string(), n))
        })
        .collect()
}

#[test]
fn nothing_found_exits_1_with_a_hint_naming_only_changes_that_help() {
    let cases: &[&[&str]] = &[
        // 3 planets do not assemble on 20/30/80 (100 places).
        &[
            "planetary",
            "--ratio",
            "5",
            "--tol",
            "0",
            "--sun",
            "20",
            "--planet",
            "30",
            "--ring",
            "80",
            "--planets",
            "3",
        ],
        // Ring held, sun driving, the output turns with the input, never against it.
        &["planetary", "--ratio", "5", "--direction", "opposite", "--sun", "20..30"],
        // Checked meshes: unshifted full-depth ring meshes fail (see geometry::internal).
        &["planetary", "--ratio", "5", "--check-meshes", "--sun", "18..30"],
        // Ratio 15 needs a ring of more than 200 teeth on a sun of 18 or more.
        &["planetary", "--ratio", "15", "--tol", "0.5%"],
    ];
    let mut named_any = 0;
    for base in cases {
        let r = gearsieve(base);
        assert_eq!(r.code, 1, "{base:?}: {}", r.stderr);
        assert!(r.stdout.contains("No design meets every constraint."), "{}", r.stdout);
        assert!(r.stderr.starts_with("gearsieve: no design meets every condition."), "{}", r.stderr);
        let named = named_changes(&r.stderr);
        assert!(!named.is_empty(), "{base:?}: {}", r.stderr);
        for (change, claimed) in named {
            let (code, v) = json_of(&changed(base, &change));
            assert_eq!(code, 0, "{base:?} with {change}");
            assert_eq!(v["count"].as_u64(), Some(claimed), "{base:?} with {change}");
            named_any += 1;
        }
    }
    assert!(named_any >= 6);
    // Changes the hint leaves out do not help: a looser tolerance or no clearance margin for
    // planets that cannot be assembled.
    let r = gearsieve(cases[0]);
    for change in ["--tol 10%", "--tip-clearance 0", "--shift-sum -0.5..1", "--planets 5"] {
        assert!(!r.stderr.contains(change), "{change}: {}", r.stderr);
        assert_eq!(run(&changed(cases[0], change)).code, 1, "{change}");
    }
    // When no single change helps, the hint names none.
    let r = gearsieve(&[
        "planetary",
        "--ratio",
        "1000",
        "--tol",
        "0",
        "--sun",
        "20",
        "--planet",
        "30",
        "--ring",
        "80",
    ]);
    assert_eq!(r.code, 1);
    assert_eq!(r.stderr.lines().count(), 1, "{}", r.stderr);
    assert!(!r.stderr.contains("would find"), "{}", r.stderr);
    assert_eq!(r.stderr.matches("--").count(), 1, "only --explain is named: {}", r.stderr);
    // CSV and JSON are still written, with a count of 0; the drawing says there is nothing.
    let (code, v) = json(cases[0]);
    assert_eq!((code, v["count"].as_u64(), v["designs"].as_array().map(Vec::len)), (1, Some(0), Some(0)));
    let csv = gearsieve(&[cases[0], &["--format", "csv"][..]].concat());
    assert_eq!((csv.code, csv.stdout.lines().count()), (1, 1), "{}", csv.stdout);
    let svg = gearsieve(&[cases[0], &["--format", "svg"][..]].concat());
    assert_eq!(svg.code, 1);
    assert!(svg.stdout.contains("No design meets every condition."), "{}", svg.stdout);
}

#[test]
fn explain_lists_what_a_design_asked_for_fails() {
    // As in the core's every_failing_condition_is_named: 21/30/80 gives 1 + 80/21 = 101/21,
    // 3.8% below 5; 21 + 2·30 ≠ 80 with no shift; 101 places do not split in four.
    let args = [
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
    ];
    let r = gearsieve(&args);
    assert_eq!(r.code, 1);
    assert!(r.stdout.contains("sun 21, planet 30, ring 80, 4 planets fails:"), "{}", r.stdout);
    assert!(
        r.stdout.contains("  - ratio: ratio 101/21 is -3.8095% from the target, outside the tolerance"),
        "{}",
        r.stdout
    );
    assert!(r.stdout.contains("  - coaxiality: not coaxial:"), "{}", r.stdout);
    assert!(
        r.stdout.contains(
            "  - assembly: 4 equally spaced planets cannot be assembled: a planet fits at 101 places"
        ),
        "{}",
        r.stdout
    );
    let (code, v) = json(&args);
    assert_eq!(code, 1);
    let conditions: Vec<&str> =
        v["asked"][0]["unmet"].as_array().unwrap().iter().map(|u| u["condition"].as_str().unwrap()).collect();
    assert_eq!(conditions, ["ratio", "coaxiality", "assembly"]);
}

#[test]
fn explain_counts_the_candidates_left_out() {
    // The textbook train with 3..5 planets: one candidate each; 3 fail assembly, 5 the
    // clearance (see the textbook test), 4 is found.
    let (code, v) = json_of(&with(TEXTBOOK, &["--planets", "3..5", "--explain"]));
    assert_eq!(code, 0);
    let left = &v["left_out"];
    assert_eq!(left["candidates"], 3);
    let by: Vec<(&str, u64)> = left["conditions"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| (c["condition"].as_str().unwrap(), c["count"].as_u64().unwrap()))
        .collect();
    assert_eq!(by, [("assembly", 1), ("neighbour clearance", 1)]);
    // Over the default ranges every candidate is counted once: 43 suns (18..60) × 43 planets
    // × 161 rings (40..200) × 1 planet count, computed.
    let (code, v) = json(&["planetary", "--ratio", "5", "--explain"]);
    assert_eq!(code, 0);
    let left = &v["left_out"];
    assert_eq!(left["candidates"], 43 * 43 * 161);
    let sum: u64 = left["conditions"].as_array().unwrap().iter().map(|c| c["count"].as_u64().unwrap()).sum();
    assert_eq!(sum + v["count"].as_u64().unwrap(), 43 * 43 * 161);
    // The same designs are found with or without the explanation.
    let (_, plain) = json(&["planetary", "--ratio", "5"]);
    assert_eq!(plain["designs"], v["designs"]);
    assert!(plain.get("left_out").is_none());
}

#[test]
fn help_states_the_defaults() {
    let r = gearsieve(&["planetary", "--help"]);
    assert_eq!(r.code, 0);
    // However the help is wrapped.
    let help = r.stdout.split_whitespace().collect::<Vec<_>>().join(" ");
    for default in [
        "[default: 1%]",
        "[default: 18..60",
        "[default: 40..200; with --stock, the rings on hand]",
        "[default: 3]",
        "[default: ring]",
        "[default: sun, or the ring when the sun is held]",
        "[default: 1]",
        "[default: 20]",
        "[default: equal]",
        "[default: 0..0, coaxial unshifted only]",
        "[default: 10]",
        "ring held, the sun driving and the carrier driven: i = 1 + Zr/Zs",
        "ISO 6336 or AGMA 2001",
    ] {
        assert!(help.contains(default), "{default}: {}", r.stdout);
    }
}

#[test]
fn designs_from_stock_use_only_gears_on_hand_in_the_numbers_they_need() {
    // The demo shelf: 5:1 with the ring held is 1 + Zr/Zs, so Zr = 4·Zs; coaxial unshifted
    // needs Zr = Zs + 2·Zp; three planets fit equally when (Zs + Zr)/3 is whole (the assembly
    // condition of the simple train). On the shelf only 18/27/72 qualifies, and only three
    // 27-tooth gears are on hand.
    let (code, v) = common::json(&[
        "planetary",
        "--ratio",
        "5",
        "--tol",
        "0",
        "--stock",
        "catalogs/planetary-stock.csv",
        "--planets",
        "3..4",
    ]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["count"], 1);
    let d = &v["designs"][0];
    assert_eq!(
        (d["sun"].as_u64(), d["planet"].as_u64(), d["ring"].as_u64(), d["planets"].as_u64()),
        (Some(18), Some(27), Some(72), Some(3))
    );
    assert_eq!(v["stock"]["rings"][0], serde_json::json!([60, 1]));
    assert_eq!(v["stock"]["left_out"], 2);
    // Four 27-tooth planets are not on hand: asked for by name, the design says so.
    let r = common::gearsieve(&[
        "planetary",
        "--ratio",
        "5",
        "--tol",
        "0",
        "--stock",
        "catalogs/planetary-stock.csv",
        "--sun",
        "18",
        "--planet",
        "27",
        "--ring",
        "72",
        "--planets",
        "4",
        "--explain",
    ]);
    assert_eq!(r.code, 1, "{}", r.stdout);
    assert!(r.stdout.contains("it needs 4 × 27-tooth gear and 3 are on hand"), "{}", r.stdout);
    // Gears on hand are not re-cut: a shift range is refused with stock.
    let r = common::gearsieve(&[
        "planetary",
        "--ratio",
        "5",
        "--stock",
        "catalogs/planetary-stock.csv",
        "--shift-sum",
        "-0.5..0.5",
    ]);
    assert_eq!(r.code, 2);
    assert!(r.stderr.contains("--shift-sum") && r.stderr.contains("cannot be shifted"), "{}", r.stderr);
}

#[test]
fn a_chain_search_says_it_left_the_rings_out() {
    let r = common::gearsieve(&[
        "search",
        "--ratio",
        "2",
        "--stock",
        "catalogs/planetary-stock.csv",
        "--stages",
        "1",
    ]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    assert!(r.stdout.contains("6 ring gears (internal teeth) not used"), "{}", r.stdout);
    // A ring's own shift or tip is not read yet, so it is refused rather than ignored.
    let dir = std::env::temp_dir().join(format!("gearsieve-rings-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let f = dir.join("rings.csv");
    std::fs::write(&f, "teeth,module,internal,shift\n72,1,yes,0.2\n18,1,no,\n").unwrap();
    let r = common::gearsieve(&["planetary", "--ratio", "5", "--stock", f.to_str().unwrap()]);
    assert_eq!(r.code, 2);
    assert!(r.stderr.contains("row 2, column shift"), "{}", r.stderr);
    std::fs::write(&f, "teeth,module,internal\n72,1,maybe\n").unwrap();
    let r = common::gearsieve(&["planetary", "--ratio", "5", "--stock", f.to_str().unwrap()]);
    assert!(r.stderr.contains("internal must be yes (a ring gear) or no, found \"maybe\""), "{}", r.stderr);
    let _ = std::fs::remove_dir_all(&dir);
}

/// Gears on hand are taken as cut standard and cannot be re-cut: a 12-tooth sun from the demo
/// shelf is listed unshifted (no split of the mesh's zero shift sum onto it), and its undercut is
/// named in every format (a 12-tooth pinion at 20° needs x ≥ 1 − z·sin²α/2 ≈ 0.298 to clear a
/// full-depth rack: the rack relation, common practice); with `--check-meshes` it is refused.
#[test]
fn gears_on_hand_are_listed_as_cut_with_what_is_wrong_with_them() {
    let args = ["planetary", "--ratio", "6", "--tol", "10%", "--stock", "catalogs/planetary-stock.csv"];
    let (code, v) = json(&args);
    assert_eq!(code, 0, "{v}");
    let designs = v["designs"].as_array().unwrap();
    let with_12 = designs.iter().find(|d| d["sun"] == 12).expect("a design with the 12-tooth sun");
    for g in with_12["gear_sizes"].as_array().unwrap() {
        assert_eq!(g["shift"].as_f64(), Some(0.0), "{g}");
    }
    let defects: Vec<&str> =
        with_12["on_hand_defects"].as_array().unwrap().iter().map(|d| d.as_str().unwrap()).collect();
    assert!(defects.iter().any(|d| d.contains("12-tooth pinion would be undercut")), "{defects:?}");

    let table = gearsieve(&args);
    assert!(table.stdout.contains("Gears on hand as they are made"), "{}", table.stdout);
    let mut csv_args = args.to_vec();
    csv_args.extend(["--format", "csv"]);
    let csv = gearsieve(&csv_args);
    let mut rows = ::csv::Reader::from_reader(csv.stdout.as_bytes());
    let head = rows.headers().unwrap().clone();
    let col = head.iter().position(|h| h == "on_hand_defects").expect("an on_hand_defects column");
    let sun = head.iter().position(|h| h == "sun").unwrap();
    let row = rows.records().map(Result::unwrap).find(|r| &r[sun] == "12").unwrap();
    assert!(row[col].contains("12-tooth pinion would be undercut"), "{}", &row[col]);

    let mut checked = args.to_vec();
    checked.push("--check-meshes");
    let (_, v) = json(&checked);
    assert!(v["designs"].as_array().unwrap().iter().all(|d| d["sun"] != 12), "{v}");
}
