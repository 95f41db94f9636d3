//! `gearsieve thread` and `gearsieve chart`: published worked examples, output shapes, errors,
//! the shipped lathe files, and properties of every reported setup.

mod common;
use common::*;

use gearsieve::model::catalog::{load, CatalogueDefaults};
use gearsieve::model::pool::{Pool, StockGear};
use gearsieve::numbers::range::{FloatRange, IntRange};
use gearsieve::numbers::rational::Ratio;
use gearsieve::trades::thread::banjo::{load_banjo, Banjo};
use gearsieve::trades::thread::lathe_file::load_lathe;
use gearsieve::trades::thread::machine::{load_gearbox, GearboxPosition, Machine};
use gearsieve::trades::thread::pitch::{parse_leadscrew, parse_pitch};
use gearsieve::trades::thread::{Lathe, ThreadSpec};
use gearsieve::RunOptions;
use proptest::prelude::*;
use serde_json::Value;

/// Teeth of the gears by position name in one JSON setup.
fn gear(setup: &Value, position: &str) -> Option<u64> {
    setup["positions"]
        .as_array()?
        .iter()
        .find(|g| g["position"] == position)
        .and_then(|g| g["teeth"].as_u64())
}

fn exact_simple_pairs(v: &Value) -> Vec<(u64, u64)> {
    v["trains"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|t| t["meshes"] == 1 && t["exact_pitch"] == true)
        .map(|t| (gear(t, "stud").unwrap(), gear(t, "leadscrew").unwrap()))
        .collect()
}

#[test]
fn metric_on_an_inch_leadscrew_needs_the_127() {
    // "Turning and Boring": 3 mm on a 6-per-inch lead-screw: 90 on the stud, 127 on the screw.
    let (code, v) = json(&[
        "thread",
        "--leadscrew",
        "6tpi",
        "--pitch",
        "3mm",
        "--teeth",
        "20..127",
        "--stages",
        "1",
        "--tol",
        "0",
        "--limit",
        "50",
    ]);
    assert_eq!(code, 0);
    assert_eq!(exact_simple_pairs(&v), vec![(90, 127)]);
    assert_eq!(v["trains"][0]["lead_cut_mm_exact"], "3");
}

#[test]
fn simple_trains_of_the_published_examples() {
    // "American Mechanic": 5 per inch on a 2-per-inch screw, 40 on the spindle → 100.
    // "Construction Tools": 4 per inch on a 2-per-inch screw → 20 and 40; 7 per inch on a
    // 1-per-inch screw → 20 and 140.
    for (screw, thread, pair) in
        [("2tpi", "5tpi", (40, 100)), ("2tpi", "4tpi", (20, 40)), ("1tpi", "7tpi", (20, 140))]
    {
        let (code, v) = json(&[
            "thread",
            "--leadscrew",
            screw,
            "--pitch",
            thread,
            "--teeth",
            "20..140",
            "--stages",
            "1",
            "--tol",
            "0",
            "--limit",
            "200",
        ]);
        assert_eq!(code, 0, "{thread} on {screw}");
        let pairs = exact_simple_pairs(&v);
        assert!(pairs.contains(&pair), "{thread} on {screw}: {pairs:?}");
        let want = parse_leadscrew(screw).unwrap().mm.value.to_f64()
            / parse_pitch(thread).unwrap().mm.value.to_f64();
        for (a, b) in pairs {
            assert!((b as f64 / a as f64 - want).abs() < 1e-12, "{a}→{b}");
        }
    }
}

#[test]
fn a_fractional_thread_needs_a_compound_train() {
    // "Construction Tools": 2.3 per inch on a 1.8-per-inch screw with a 20 wheel would need
    // 25.555 teeth, so a compound train is needed. Gears of 20..30 teeth hold no simple pair in
    // the ratio 23/18; a compound train of them cuts it exactly.
    let base = ["thread", "--leadscrew", "1.8tpi", "--pitch", "2.3tpi", "--teeth", "20..30", "--tol", "0"];
    let mut simple = base.to_vec();
    simple.extend(["--stages", "1"]);
    let (code, v) = json(&simple);
    assert_eq!(code, 1);
    assert_eq!(v["count"], 0);
    let mut compound = base.to_vec();
    compound.extend(["--stages", "2"]);
    let (code, v) = json(&compound);
    assert_eq!(code, 0);
    let t = &v["trains"][0];
    assert_eq!(t["meshes"], 2);
    assert_eq!(t["exact_pitch"], true);
    assert_eq!(t["ratio"], "23/18");
}

#[test]
fn eleven_per_inch_through_the_published_compound() {
    // "Modern Machine Shop Practice": 4 × 66/48 × 36/18 = 11 per inch on a 4-per-inch screw.
    let (_dir, stock) = temp_catalogue("four.csv", b"teeth,module\n66,1\n48,1\n36,1\n18,1\n");
    let (code, v) = json(&[
        "thread",
        "--leadscrew",
        "4tpi",
        "--pitch",
        "11tpi",
        "--stock",
        &stock,
        "--stages",
        "2",
        "--tol",
        "0",
    ]);
    assert_eq!(code, 0);
    let trains = v["trains"].as_array().unwrap();
    assert!(!trains.is_empty());
    for t in trains {
        let stages = t["stages"].as_array().unwrap();
        let mut drivers: Vec<u64> = stages.iter().map(|s| s["driver"].as_u64().unwrap()).collect();
        let mut driven: Vec<u64> = stages.iter().map(|s| s["driven"].as_u64().unwrap()).collect();
        drivers.sort();
        driven.sort();
        assert_eq!((drivers, driven), (vec![18, 48], vec![36, 66]));
        assert_eq!(t["exact_pitch"], true);
        assert!((t["pitch_cut"].as_f64().unwrap() - 11.0).abs() < 1e-12);
    }
}

#[test]
fn one_inch_is_25_4_mm_exactly() {
    // 1 in = 25.4 mm exactly (Wikipedia, "Inch", "Modern standardisation"): a 25.4 mm pitch on a
    // 1-per-inch leadscrew is cut by any pair of equal ratio, exactly.
    let (code, v) = json(&[
        "thread",
        "--leadscrew",
        "1tpi",
        "--pitch",
        "25.4mm",
        "--teeth",
        "20..40",
        "--stages",
        "2",
        "--tol",
        "0",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["trains"][0]["ratio"], "1");
    assert_eq!(v["trains"][0]["lead_cut_mm_exact"], "127/5");
    assert_eq!(v["thread"]["lead_mm_exact"], "127/5");
}

#[test]
fn table_names_positions_and_carries_the_caution() {
    let r = gearsieve(&[
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
    ]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    for word in ["stud", "idler", "intermediate", "leadscrew", "pitch cut", "lead error", "exact"] {
        assert!(r.stdout.contains(word), "{word}\n{}", r.stdout);
    }
    assert!(r.stdout.contains("machine stopped and isolated from power"));
    assert!(r.stdout.contains("trial cut and a thread gauge"));
}

#[test]
fn gearbox_positions_are_named() {
    let (code, v) = json(&[
        "thread",
        "--leadscrew",
        "8tpi",
        "--pitch",
        "4tpi",
        "--teeth",
        "20..80",
        "--gearbox",
        "catalogs/lathe/brackenfold.gearbox",
        "--stages",
        "1",
        "--tol",
        "0",
        "--limit",
        "200",
    ]);
    assert_eq!(code, 0);
    let names: Vec<&str> =
        v["trains"].as_array().unwrap().iter().map(|t| t["gearbox_position"].as_str().unwrap()).collect();
    // 4 per inch on 8 per inch needs the leadscrew at 1/2 of the spindle speed: a train of
    // 1/4 through A (2), 1/2 through B (1), 1 through C (1/2). Through C the stage is of equal
    // gears, which an idler turns into an ordinary setup (common practice).
    for n in ["A", "B", "C"] {
        assert!(names.contains(&n), "{names:?}");
    }
    for t in v["trains"].as_array().unwrap() {
        let want = match t["gearbox_position"].as_str().unwrap() {
            "A" => "1/4",
            "B" => "1/2",
            _ => "1",
        };
        assert_eq!(t["ratio"], want);
    }
    let r = gearsieve(&[
        "thread",
        "--leadscrew",
        "8tpi",
        "--pitch",
        "4tpi",
        "--teeth",
        "20..60",
        "--gearbox",
        "A=2,B=1",
        "--format",
        "csv",
    ]);
    assert_eq!(r.code, 0);
    assert!(
        r.stdout.starts_with("rank,arrangements,arrangement,gearbox_position,stud,idler,leadscrew"),
        "{}",
        r.stdout
    );
    assert!(r.stdout.lines().skip(1).all(|l| l.split(',').nth(3).is_some_and(|p| p == "A" || p == "B")));
}

#[test]
fn nothing_found_says_so_and_still_writes_json_and_csv() {
    let args = [
        "thread",
        "--leadscrew",
        "8tpi",
        "--pitch",
        "1.25mm",
        "--stock",
        "catalogs/lathe-change-gears-no127.csv",
        "--tol",
        "0",
    ];
    let (code, v) = json(&args);
    assert_eq!(code, 1);
    assert_eq!(v["count"], 0);
    assert!(v["trains"].as_array().unwrap().is_empty());
    let mut csv = args.to_vec();
    csv.extend(["--format", "csv"]);
    let r = gearsieve(&csv);
    assert_eq!(r.code, 1);
    assert_eq!(r.stdout.lines().count(), 1, "header only");
    assert!(r.stderr.contains("no setup cuts 1.25mm"), "{}", r.stderr);
}

#[test]
fn explain_lists_what_the_banjo_refuses() {
    // A banjo too short for any simple train of these gears to close.
    let (code, v) = json(&[
        "thread",
        "--leadscrew",
        "2tpi",
        "--pitch",
        "4tpi",
        "--teeth",
        "20..40",
        "--stages",
        "1",
        "--tol",
        "0",
        "--stud-to-leadscrew",
        "400",
        "--intermediate-range",
        "20..60",
        "--shaft-diameter",
        "10",
        "--explain",
    ]);
    assert_eq!(code, 1);
    let rej = v["rejected"].as_array().unwrap();
    assert!(!rej.is_empty());
    for x in rej {
        assert!(!x["reasons"].as_array().unwrap().is_empty());
    }
}

#[test]
fn bad_input_is_one_line_and_exit_2() {
    let (_d, bad_box) = temp_catalogue("box.gearbox", b"A = 2\nB two\n");
    let (_e, bad_list) = temp_catalogue("mine.txt", b"M8, 1.25mm\nM10, 1.5\n");
    let (_f, bad_banjo) = temp_catalogue("b.banjo", b"stud_to_leadscrew_mm = 120\nshaft = 3\n");
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (vec!["thread", "--leadscrew", "8tpi", "--pitch", "1.25", "--teeth", "20..60"], "--pitch: "),
        (vec!["thread", "--leadscrew", "module:2", "--pitch", "1mm", "--teeth", "20..60"], "--leadscrew: "),
        (vec!["thread", "--leadscrew", "8tpi", "--pitch", "1mm"], "--stock: "),
        (
            vec!["thread", "--leadscrew", "8tpi", "--pitch", "1mm", "--teeth", "20..60", "--tol", "20%"],
            "--tol: ",
        ),
        (
            vec!["thread", "--leadscrew", "8tpi", "--pitch", "1mm", "--teeth", "20..60", "--starts", "0"],
            "--starts: ",
        ),
        (
            vec![
                "thread",
                "--leadscrew",
                "8tpi",
                "--pitch",
                "1mm",
                "--teeth",
                "20..60",
                "--gearbox",
                &bad_box,
            ],
            "line 2",
        ),
        (
            vec![
                "thread",
                "--leadscrew",
                "8tpi",
                "--pitch",
                "1mm",
                "--teeth",
                "20..60",
                "--banjo",
                &bad_banjo,
            ],
            "unknown key \"shaft\"",
        ),
        (vec!["chart", "--leadscrew", "8tpi", "--teeth", "20..60", "--list", &bad_list], "line 2"),
        (vec!["chart", "--leadscrew", "8tpi", "--teeth", "20..60", "--series", "bsx"], "--series: "),
    ];
    for (args, want) in cases {
        let r = gearsieve(&args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert_eq!(r.stderr.trim_end().lines().count(), 1, "{args:?}: {}", r.stderr);
        assert!(r.stderr.contains(want), "{args:?}: {}", r.stderr);
        assert!(!r.stderr.contains("panicked"));
    }
}

#[test]
fn each_mistake_gets_its_whole_message() {
    let lathe = ["thread", "--leadscrew", "8tpi", "--pitch", "1mm", "--teeth", "20..80"];
    fn with<'a>(lathe: &[&'a str], more: &[&'a str]) -> Vec<&'a str> {
        [lathe, more].concat()
    }
    // A gearbox that is neither a file nor a list is not read as a list.
    refused(
        &with(&lathe, &["--gearbox", "nosuchfile"]),
        "--gearbox: there is no file \"nosuchfile\", and it is not a list; wanted a file of NAME = RATIO \
         lines, or a list NAME=RATIO,… such as A=2,B=1,C=1/2",
    );
    refused(
        &with(&lathe, &["--gearbox", "A=x"]),
        "--gearbox: position 1: \"x\" is not a ratio; wanted NAME=RATIO such as A=1/2 (input turns per \
         leadscrew turn)",
    );
    refused(&with(&lathe, &["--gearbox", "A=1,A=2"]), "--gearbox: position 2: position A is named twice");
    refused(
        &with(
            &lathe,
            &["--stud-to-leadscrew", "100", "--intermediate-range", "50..40", "--shaft-diameter", "10"],
        ),
        "--intermediate-range: \"50..40\" is inverted (LO > HI); wanted LO..HI or one length, in mm such \
         as 40..80 or 75 (or with units: 1.5in..3in), above 0, LO ≤ HI",
    );
    refused(
        &with(
            &lathe,
            &["--stud-to-leadscrew", "100", "--intermediate-range", "40..50", "--shaft-diameter", "0"],
        ),
        "--shaft-diameter: \"0\" is zero; wanted a length above 0 in mm such as 52.5, or with a unit: \
         52.5mm, 0.0525m or 2.067in",
    );
    // The banjo file's range error names --banjo once, then the file, line and key.
    let (_d, banjo) = temp_catalogue(
        "b.banjo",
        b"stud_to_leadscrew_mm = 120\nintermediate_from_leadscrew_mm = 90..60\nshaft_diameter_mm = 16\n",
    );
    refused(
        &with(&lathe, &["--banjo", &banjo]),
        &format!(
            "--banjo: banjo file {banjo}, line 2: intermediate_from_leadscrew_mm: \"90..60\" is inverted (LO \
             > HI); wanted LO..HI or one length, in mm such as 40..80 or 75 (or with units: 1.5in..3in), \
             above 0, LO ≤ HI"
        ),
    );
    refused(
        &["thread", "--leadscrew", "8tpi", "--pitch", "3", "--teeth", "20..80"],
        "--pitch: \"3\" has no unit; wanted a pitch such as 1.25mm, 11tpi, 0.05in, module:2 or dp:16",
    );
    refused(
        &["thread", "--leadscrew", "8tpi", "--pitch", "0.003ft", "--teeth", "20..80"],
        "--pitch: \"0.003ft\" has an unknown unit \"ft\"; wanted a pitch such as 1.25mm, 11tpi, 0.05in, \
         module:2 or dp:16",
    );
    refused(
        &["thread", "--leadscrew", "8tpi", "--pitch", "1mm"],
        "--stock: give the change gears on hand as a catalogue FILE, a range to cut with --teeth LO..HI, or \
         a --lathe file that lists them",
    );
    refused(
        &["thread", "--pitch", "1mm", "--teeth", "20..80"],
        "--leadscrew: give the leadscrew's pitch (8tpi, 3mm), or a --lathe file with a leadscrew = line",
    );
    // A lathe file's errors name --lathe once, then the file, the line and the key.
    let (_d, lathe_file) = temp_catalogue("shop.lathe", b"# mine\nleadscrew = 8tpi\nslot_mm = 90..60\n");
    refused(
        &["thread", "--pitch", "1mm", "--lathe", &lathe_file],
        &format!(
            "--lathe: lathe file {lathe_file}, line 3: slot_mm: \"90..60\" is inverted (LO > HI); wanted LO..HI \
             or one length, in mm such as 40..80 or 75 (or with units: 1.5in..3in), above 0, LO ≤ HI"
        ),
    );
    let (_d2, lathe_file) = temp_catalogue("shop.lathe", b"leadscrew = 8tpi\ngears = 20 40 60\n");
    refused(
        &["thread", "--pitch", "1mm", "--lathe", &lathe_file],
        &format!(
            "--lathe: lathe file {lathe_file}: gears are listed without module_mm; add a line such as \
             module_mm = 1.5"
        ),
    );
    let (_d3, lathe_file) = temp_catalogue(
        "shop.lathe",
        b"leadscrew = 8tpi\ngears = 20 40 127\nmodule_mm = 1\nlargest_teeth = 30\n",
    );
    refused(
        &["thread", "--pitch", "1mm", "--lathe", &lathe_file],
        "--lathe: the guard closes over gears of at most 30 teeth, and no two of the gears left can mesh",
    );
    // --limit did nothing on a chart: refused, saying what to use.
    refused(
        &["chart", "--series", "unc", "--leadscrew", "8tpi", "--teeth", "20..80", "--limit", "3"],
        "--limit: a chart lists only the best setup of each thread; gearsieve thread --pitch P lists more \
         setups of one thread",
    );
}

#[test]
fn inch_pitches_and_feeds_are_lengths() {
    // 0.25 in between threads is 4 threads per inch, exactly: the same setups.
    let setups = |pitch: &str| {
        let (code, v) = json(&[
            "thread",
            "--leadscrew",
            "8tpi",
            "--pitch",
            pitch,
            "--stock",
            "catalogs/lathe-change-gears.csv",
        ]);
        assert_eq!(code, 0, "{pitch}");
        v["trains"].as_array().unwrap().iter().map(|t| t["ratio"].clone()).collect::<Vec<_>>()
    };
    assert_eq!(setups("0.25in"), setups("4tpi"));
    let r = gearsieve(&[
        "thread",
        "--leadscrew",
        "8tpi",
        "--pitch",
        "0.05in",
        "--stock",
        "catalogs/lathe-change-gears.csv",
        "--limit",
        "1",
    ]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    assert!(r.stdout.contains("0.05000 in"), "{}", r.stdout);
}

#[test]
fn nothing_found_names_only_what_would_help() {
    let no127 = "catalogs/lathe-change-gears-no127.csv";
    let banjo = "catalogs/lathe/brackenfold.banjo";
    let args = ["thread", "--leadscrew", "8tpi", "--pitch", "1.25mm", "--stock", no127, "--banjo", banjo];
    let tight = [&args[..], &["--tol", "0"]].concat();
    nothing_found(
        &tight,
        "no setup cuts 1.25mm within the tolerance from these gears. Try a looser --tol, more --stages, or \
         more stock; --explain shows what the banjo refused.",
    );
    // With --explain given, it is not suggested again; at the largest tolerance, no looser one.
    nothing_found(
        &[&tight[..], &["--explain"]].concat(),
        "no setup cuts 1.25mm within the tolerance from these gears. Try a looser --tol, more --stages, or \
         more stock.",
    );
    nothing_found(
        &["thread", "--leadscrew", "8tpi", "--pitch", "1mm", "--teeth", "20..21", "--stages", "1", "--tol", "10%"],
        "no setup cuts 1mm within the tolerance from these gears. Try more --stages, or a wider --teeth range.",
    );
}

#[test]
fn chart_covers_the_series_and_marks_what_is_out_of_reach() {
    let (code, v) = json(&[
        "chart",
        "--series",
        "iso-coarse",
        "--leadscrew",
        "8tpi",
        "--stock",
        "catalogs/lathe-change-gears-no127.csv",
        "--banjo",
        "catalogs/lathe/brackenfold.banjo",
        "--tol",
        "0.05%",
    ]);
    assert_eq!(code, 0);
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 21);
    let mut out_of_reach = 0;
    for r in rows {
        if r["reachable"] == true {
            assert!(r["setup"]["error"].as_f64().unwrap().abs() <= 5e-4 + 1e-15);
        } else {
            out_of_reach += 1;
            assert!(r["setup"].is_null());
            let n = &r["nearest"];
            assert!(n["error"].as_f64().unwrap().abs() > 5e-4, "{r}");
        }
    }
    assert!(out_of_reach > 0, "without the 127 some metric pitches are out of 0.05%");
    let t = gearsieve(&[
        "chart",
        "--series",
        "unc",
        "--leadscrew",
        "8tpi",
        "--stock",
        "catalogs/lathe-change-gears.csv",
    ]);
    assert_eq!(t.code, 0);
    assert!(t.stdout.contains("1/4-20 UNC") && t.stdout.contains("2-4 1/2 UNC"));
    assert!(t.stdout.contains("isolated from power"));
    let c = gearsieve(&[
        "chart",
        "--series",
        "iso-fine",
        "--leadscrew",
        "8tpi",
        "--stock",
        "catalogs/lathe-change-gears.csv",
        "--format",
        "csv",
    ]);
    assert_eq!(c.code, 0);
    assert_eq!(c.stdout.lines().count(), 11);
}

#[test]
fn shipped_lathe_files_load() {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("catalogs");
    let b = load_banjo(&root.join("lathe/brackenfold.banjo")).unwrap();
    assert!(b.stud_to_leadscrew_mm > 0.0);
    let g = load_gearbox(&root.join("lathe/brackenfold.gearbox")).unwrap();
    assert_eq!(g.len(), 3);
    let with = load(&root.join("lathe-change-gears.csv"), CatalogueDefaults::default()).unwrap();
    let without = load(&root.join("lathe-change-gears-no127.csv"), CatalogueDefaults::default()).unwrap();
    assert!(with.iter().any(|g| g.teeth == 127));
    assert!(!without.iter().any(|g| g.teeth == 127));
    assert_eq!(with.len(), without.len() + 1);
    // Every shipped lathe file loads whole, describes a leadscrew, gears that load and a banjo,
    // and runs: the binary prints a table for it.
    let mut lathes = 0;
    for entry in std::fs::read_dir(root.join("lathe")).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().and_then(|e| e.to_str()) != Some("lathe") {
            continue;
        }
        lathes += 1;
        let l = load_lathe(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        assert!(l.name.is_some() && l.leadscrew.is_some() && l.banjo.is_some(), "{}", path.display());
        let gears = l.stock(None, None).unwrap().unwrap();
        assert!(gears.len() >= 10, "{}", path.display());
        let file = path.to_string_lossy();
        let r = gearsieve(&["thread", "--lathe", &file, "--pitch", "1mm", "--limit", "1"]);
        assert_eq!(r.code, 0, "{file}: {}", r.stderr);
        assert!(r.stdout.contains(l.name.as_deref().unwrap()), "{}", r.stdout);
    }
    assert!(lathes >= 2, "two demo lathes, found {lathes}");
}

#[test]
fn options_given_override_the_lathe_file() {
    let file = "catalogs/lathe/brackenfold.lathe";
    let json = |more: &[&str]| -> Value {
        let mut a = vec!["thread", "--lathe", file, "--pitch", "1.5mm", "--limit", "1", "--format", "json"];
        a.extend(more);
        let r = gearsieve(&a);
        assert_eq!(r.code, 0, "{}", r.stderr);
        serde_json::from_str(&r.stdout).unwrap()
    };
    let v = json(&[]);
    assert_eq!(v["machine"]["leadscrew"], "8tpi");
    assert_eq!(v["machine"]["gearbox"].as_array().unwrap().len(), 3);
    assert_eq!(v["banjo"]["stud_to_leadscrew_mm"], 120.0);
    assert_eq!(v["machine"]["dial"]["dial_teeth"], 32);
    let v = json(&[
        "--leadscrew",
        "6tpi",
        "--gearbox",
        "X=1",
        "--stud-to-leadscrew",
        "100",
        "--intermediate-range",
        "40..120",
        "--shaft-diameter",
        "16",
        "--teeth",
        "20..60",
    ]);
    assert_eq!(v["machine"]["leadscrew"], "6tpi");
    assert_eq!(v["machine"]["gearbox"][0]["name"], "X");
    assert_eq!(v["banjo"]["stud_to_leadscrew_mm"], 100.0);
    assert!(v["machine"]["gears"].as_str().unwrap().starts_with("any number of gears of 20..60"));
    // What the flags do not say still comes from the file.
    assert_eq!(v["machine"]["tumbler_reverse"], true);
}

// Properties on random lathes, pitches and gear boxes.

fn stock(teeth: &[u32]) -> Pool {
    let g: Vec<StockGear> = teeth.iter().map(|&t| StockGear::on_hand(t, 1.5, 20.0, 1)).collect();
    Pool::from_stock(&g, "random").unwrap()
}

/// The banjo model, restated independently of the library: slot, closure, clearances.
fn violates(b: &Banjo, s: &gearsieve::trades::thread::Setup) -> Option<String> {
    let tip = |m: f64, z: u32| m * (z as f64 + 2.0) / 2.0;
    let c = b.shaft_diameter_mm / 2.0;
    let d = b.stud_to_leadscrew_mm;
    let st = &s.train.stages;
    let eps = 1e-9;
    for g in st {
        for z in [g.driver.teeth, g.driven.teeth] {
            if g.module_mm * (z as f64 - 2.5) / 2.0 <= c {
                return Some(format!("{z} does not fit its shaft"));
            }
        }
    }
    let in_slot = |r: f64| b.slots.iter().any(|s| r >= s.lo - eps && r <= s.hi + eps);
    let closes = |a1: f64, a2: f64| a1 + a2 + eps >= d && (a1 - a2).abs() <= d + eps;
    match st.len() {
        1 => {
            let m = st[0].module_mm;
            let (za, zd) = (st[0].driver.teeth, st[0].driven.teeth);
            if let Some(zi) = s.fit.idler {
                let (a1, a2) = (m * (za + zi) as f64 / 2.0, m * (zi + zd) as f64 / 2.0);
                if !in_slot(a2) || !closes(a1, a2) || tip(m, za) + tip(m, zd) > d + eps {
                    return Some(format!("idler {zi} does not place"));
                }
            } else if (m * (za + zd) as f64 / 2.0 - d).abs() > 1e-6 {
                return Some("direct mesh does not reach".into());
            }
        }
        2 => {
            let (a1, a2) = (st[0].centre_distance_mm(), st[1].centre_distance_mm());
            if !in_slot(a2) || !closes(a1, a2) {
                return Some("triangle does not close in the slot".into());
            }
            let ok = match s.fit.stud_mesh_inner {
                Some(true) => {
                    tip(st[0].module_mm, st[0].driven.teeth) + c <= a2 + eps
                        && tip(st[0].module_mm, st[0].driver.teeth) + c <= d + eps
                }
                Some(false) => {
                    tip(st[1].module_mm, st[1].driver.teeth) + c <= a1 + eps
                        && tip(st[1].module_mm, st[1].driven.teeth) + c <= d + eps
                }
                None => false,
            };
            if !ok {
                return Some("an inner-plane gear fouls a shaft".into());
            }
        }
        _ => return Some("more stages than asked".into()),
    }
    None
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    #[test]
    fn reported_setups_cut_what_they_claim_and_fit_the_banjo(
        tpi_screw in prop::sample::select(vec!["4tpi", "6tpi", "8tpi", "10tpi", "3mm", "6mm"]),
        thread in prop::sample::select(vec![
            "0.5mm", "0.75mm", "1mm", "1.25mm", "1.5mm", "1.75mm", "2mm", "3mm",
            "10tpi", "11tpi", "13tpi", "18tpi", "20tpi", "27tpi", "module:1", "dp:20",
        ]),
        starts in 1u32..3,
        teeth in prop::collection::btree_set(18u32..128, 6..14),
        gearbox in prop::option::of(prop::sample::select(vec![
            vec![(1u64, 2u64), (1, 1), (2, 1)], vec![(3, 2), (1, 1)],
        ])),
        distance in 90.0f64..160.0,
        slot_lo in 30.0f64..70.0,
        shaft in 12.0f64..24.0,
        tol_ppm in prop::sample::select(vec![0u64, 200, 1000, 5000]),
    ) {
        let teeth: Vec<u32> = teeth.into_iter().collect();
        let machine = Machine {
            leadscrew: parse_leadscrew(tpi_screw).unwrap(),
            stud_ratio: Ratio::integer(1),
            gearbox: gearbox.unwrap_or_default().into_iter().enumerate().map(|(i, (n, d))| {
                GearboxPosition { name: format!("P{i}"), ratio: Ratio::new(n as u128, d as u128).unwrap() }
            }).collect(),
        };
        let banjo = Banjo {
            stud_to_leadscrew_mm: distance,
            slots: vec![FloatRange { lo: slot_lo, hi: 160.0 }],
            shaft_diameter_mm: shaft,
        };
        let Ok(pool) = Pool::from_stock(
            &teeth.iter().map(|&t| StockGear::on_hand(t, 1.5, 20.0, 1)).collect::<Vec<_>>(),
            "random") else { return Ok(()); };
        let tol = Ratio::new(tol_ppm as u128, 1_000_000).unwrap();
        let lathe = Lathe::new(machine.clone(), pool, Some(banjo.clone()),
            IntRange { lo: 1, hi: 2 }, tol, 8).unwrap();
        let spec = ThreadSpec::thread(parse_pitch(thread).unwrap(), starts);
        let plan = lathe.plan(&spec, &RunOptions::default()).unwrap();
        prop_assert!(plan.setups.len() as u64 <= plan.count);
        let want_mm = spec.pitch.mm.value.to_f64();
        for s in &plan.setups {
            // Recompute the lead from the gears alone: leadscrew pitch × Π drivers / Π driven
            // / gearbox ratio, exactly.
            let (mut num, mut den) = (
                machine.leadscrew.mm.value.num() as u128,
                machine.leadscrew.mm.value.den() as u128,
            );
            for st in &s.train.stages {
                num *= st.driver.teeth as u128;
                den *= st.driven.teeth as u128;
            }
            if let Some(p) = &s.position {
                num *= p.ratio.den() as u128;
                den *= p.ratio.num() as u128;
            }
            den *= starts as u128;
            let pitch = Ratio::new(num, den).unwrap();
            if spec.pitch.mm.exact {
                prop_assert_eq!(pitch, s.pitch_cut_mm.value);
            }
            prop_assert!((pitch.to_f64() / s.pitch_cut_mm.value.to_f64() - 1.0).abs() < 1e-12);
            let err = pitch.to_f64() / want_mm - 1.0;
            prop_assert!((err - s.pitch_error.to_f64()).abs() < 1e-9, "{} vs {}", err, s.pitch_error.to_f64());
            prop_assert!(err.abs() <= tol.to_f64() + 1e-12);
            prop_assert_eq!(violates(&banjo, s), None);
            let _ = stock(&teeth);
        }
    }
}

#[test]
fn an_idler_is_two_meshes_turning_the_leadscrew_the_same_way() {
    // Common practice: stud → idler → leadscrew is two external meshes, so the leadscrew turns
    // the same way as the stud, and the idler's teeth cancel from the ratio. 16 tpi on an 8 tpi
    // leadscrew needs ratio 2 (1/16 in lead over 1/8 in); the best setup is 20 → 50 → 40, whose
    // meshes sit at m·(z1 + z2)/2 = 1.5·70/2 = 52.5 mm and 1.5·90/2 = 67.5 mm (computed).
    let args = [
        "thread",
        "--pitch",
        "16tpi",
        "--leadscrew",
        "8tpi",
        "--stock",
        "catalogs/lathe-change-gears.csv",
        "--banjo",
        "catalogs/lathe/brackenfold.banjo",
        "--limit",
        "1",
        "-q",
    ];
    let (code, v) = json(&args);
    assert_eq!(code, 0);
    let t = &v["trains"][0];
    assert_eq!(gear(t, "idler"), Some(50));
    assert_eq!(t["ratio"], "2");
    assert_eq!(t["meshes"], 2);
    assert_eq!(t["direction"], "same");
    let stages: Vec<(u64, u64, f64)> = t["stages"]
        .as_array()
        .unwrap()
        .iter()
        .map(|s| {
            (
                s["driver"].as_u64().unwrap(),
                s["driven"].as_u64().unwrap(),
                s["reference_centre_distance_mm"].as_f64().unwrap(),
            )
        })
        .collect();
    assert_eq!(stages, vec![(20, 50, 52.5), (50, 40, 67.5)]);
    assert_eq!(t["idler_stud_from_leadscrew_mm"], 67.5);
    // The CSV says the same, and the table counts both meshes with both centre distances.
    let mut csv_args = args.to_vec();
    csv_args.extend(["--format", "csv"]);
    let r = gearsieve(&csv_args);
    let mut lines = r.stdout.lines();
    let head: Vec<&str> = lines.next().unwrap().split(',').collect();
    let row: Vec<&str> = lines.next().unwrap().split(',').collect();
    let cell = |name: &str| row[head.iter().position(|h| *h == name).unwrap()];
    assert_eq!(cell("meshes"), "2");
    assert_eq!(cell("stage1_driven"), "50");
    assert_eq!(cell("stage1_reference_centre_distance_mm"), "52.5");
    assert_eq!(cell("stage2_driver"), "50");
    assert_eq!(cell("stage2_reference_centre_distance_mm"), "67.5");
    let r = gearsieve(&args);
    assert!(r.stdout.contains("2, same way"), "{}", r.stdout);
    assert!(r.stdout.contains("centres 52.5 and 67.5 mm"), "{}", r.stdout);
}

#[test]
fn equal_gears_through_an_idler_cut_the_leadscrew_pitch() {
    // Common practice: equal gears on the stud and the leadscrew, bridged by an idler, cut the
    // leadscrew's own pitch (ratio 1). The demo stock has two 40s; a one-stage search must find
    // 40 → idler → 40.
    let (code, v) = json(&[
        "thread",
        "--pitch",
        "8tpi",
        "--leadscrew",
        "8tpi",
        "--stages",
        "1",
        "--stock",
        "catalogs/lathe-change-gears.csv",
        "--banjo",
        "catalogs/lathe/brackenfold.banjo",
        "-q",
    ]);
    assert_eq!(code, 0, "{v}");
    let t = &v["trains"][0];
    assert_eq!(t["ratio"], "1");
    assert_eq!(t["exact_pitch"], true);
    assert_eq!((gear(t, "stud"), gear(t, "leadscrew")), (Some(40), Some(40)));
    assert!(gear(t, "idler").is_some());
    assert_eq!(t["meshes"], 2);
    assert_eq!(t["direction"], "same");
}

/// The banjo model for three stages, restated: the studs at the centre distances, each in a
/// slot of its own, neighbouring meshes in neighbouring planes, every gear clear of every shaft
/// that reaches its plane and of every gear of its plane it does not mesh with.
fn chain_violates(b: &Banjo, s: &gearsieve::trades::thread::Setup) -> Option<String> {
    let st = &s.train.stages;
    let Some(chain) = &s.fit.chain else { return Some("no chain placed".into()) };
    let eps = 1e-6;
    let mut axes = vec![[-b.stud_to_leadscrew_mm, 0.0]];
    axes.extend(chain.studs.iter().copied());
    axes.push([0.0, 0.0]);
    let dist = |a: usize, c: usize| (axes[a][0] - axes[c][0]).hypot(axes[a][1] - axes[c][1]);
    for (j, g) in st.iter().enumerate() {
        if (dist(j, j + 1) - g.centre_distance_mm()).abs() > eps {
            return Some(format!("mesh {j} is not at its centre distance"));
        }
    }
    for (k, &slot) in chain.slots.iter().enumerate() {
        let r = dist(k + 1, st.len());
        if !b.slots[slot].contains(r, eps) || chain.slots[..k].contains(&slot) {
            return Some(format!("stud {k} not in a slot of its own"));
        }
    }
    if chain.planes.windows(2).any(|w| w[0].abs_diff(w[1]) != 1) {
        return Some("an intermediate stud's gears are not in neighbouring planes".into());
    }
    let tip = |m: f64, z: u32| m * (z as f64 + 2.0) / 2.0;
    // (axis, plane, tip, stage)
    let mut gears = Vec::new();
    for (j, g) in st.iter().enumerate() {
        gears.push((j, chain.planes[j], tip(g.module_mm, g.driver.teeth), j));
        gears.push((j + 1, chain.planes[j], tip(g.module_mm, g.driven.teeth), j));
    }
    let reach = |a: usize| gears.iter().filter(|g| g.0 == a).map(|g| g.1).max().unwrap();
    let c = b.shaft_diameter_mm / 2.0;
    for g in &gears {
        for a in 0..axes.len() {
            let partner = gears.iter().any(|h| h.0 == a && h.3 == g.3);
            if a != g.0 && !partner && reach(a) >= g.1 && g.2 + c > dist(g.0, a) + eps {
                return Some(format!("a gear on axis {} fouls the shaft of axis {a}", g.0));
            }
        }
        for h in &gears {
            if h.0 != g.0 && h.1 == g.1 && h.3 != g.3 && g.2 + h.2 > dist(g.0, h.0) + eps {
                return Some(format!("gears on axes {} and {} touch", g.0, h.0));
            }
        }
    }
    None
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(16))]

    #[test]
    fn three_stage_setups_sit_on_a_two_slot_banjo(
        thread in prop::sample::select(vec!["0.35mm", "0.4mm", "0.45mm", "27tpi", "32tpi", "40tpi"]),
        teeth in prop::collection::btree_set(18u32..100, 6..10),
        distance in 80.0f64..140.0,
        slot_a in 30.0f64..60.0,
        slot_b in 50.0f64..90.0,
        shaft in 10.0f64..20.0,
    ) {
        let teeth: Vec<u32> = teeth.into_iter().collect();
        let machine = Machine { leadscrew: parse_leadscrew("3mm").unwrap(), stud_ratio: Ratio::integer(1), gearbox: Vec::new() };
        let banjo = Banjo {
            stud_to_leadscrew_mm: distance,
            slots: vec![FloatRange { lo: slot_a, hi: slot_a + 70.0 }, FloatRange { lo: slot_b, hi: slot_b + 90.0 }],
            shaft_diameter_mm: shaft,
        };
        let Ok(pool) = Pool::from_stock(
            &teeth.iter().map(|&t| StockGear::on_hand(t, 1.0, 20.0, 2)).collect::<Vec<_>>(),
            "random") else { return Ok(()); };
        let lathe = Lathe::new(machine, pool, Some(banjo.clone()), IntRange { lo: 3, hi: 3 },
            Ratio::new(2, 100).unwrap(), 6).unwrap();
        let spec = ThreadSpec::thread(parse_pitch(thread).unwrap(), 1);
        let plan = lathe.plan(&spec, &RunOptions::default()).unwrap();
        for s in &plan.setups {
            prop_assert_eq!(chain_violates(&banjo, s), None);
        }
    }
}

#[test]
fn a_feed_is_found_like_a_thread() {
    // 0.1 mm per spindle turn on a 3 mm leadscrew needs the train to turn the stud 30 times per
    // leadscrew turn (lead = leadscrew pitch / ratio, computed); every setup listed must be
    // exactly that, with its error said to be the feed's.
    let r = gearsieve(&[
        "thread",
        "--lathe",
        "catalogs/lathe/quillsby.lathe",
        "--feed",
        "0.1mm",
        "--stages",
        "1..3",
        "--limit",
        "4",
        "--format",
        "json",
    ]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    let v: Value = serde_json::from_str(&r.stdout).unwrap();
    assert_eq!(v["thread"]["feed"], true);
    let trains = v["trains"].as_array().unwrap();
    assert_eq!(trains.len(), 4);
    for t in trains {
        let (mut drivers, mut driven) = (1u64, 1u64);
        for s in t["stages"].as_array().unwrap() {
            drivers *= s["driver"].as_u64().unwrap();
            driven *= s["driven"].as_u64().unwrap();
        }
        assert_eq!(driven, 30 * drivers, "{t}");
        assert_eq!(t["error_of"], "feed");
        assert_eq!(t["lead_cut_mm_exact"], "1/10");
    }
    let text =
        gearsieve(&["thread", "--lathe", "catalogs/lathe/quillsby.lathe", "--feed", "0.1mm", "--limit", "1"]);
    assert!(text.stdout.starts_with("Feed 0.1mm per spindle turn"), "{}", text.stdout);
    assert!(text.stdout.contains("feed cut"), "{}", text.stdout);
    refused(
        &["thread", "--lathe", "catalogs/lathe/quillsby.lathe", "--feed", "11tpi"],
        "--feed: \"11tpi\" is a thread, not a feed; wanted a length per spindle turn such as 0.1mm or 0.004in",
    );
}

#[test]
fn the_error_of_a_tpi_thread_is_the_error_of_its_tpi() {
    // Without the gears for 23 tpi, 11.5 tpi on the Brackenfold lathe is approached. The count
    // error is TPI cut / TPI wanted − 1 and the pitch error its inverse sense: (1 + e)(1 + p) = 1.
    let r = gearsieve(&[
        "thread",
        "--lathe",
        "catalogs/lathe/brackenfold.lathe",
        "--pitch",
        "11.5tpi",
        "--limit",
        "3",
        "--format",
        "json",
    ]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    let v: Value = serde_json::from_str(&r.stdout).unwrap();
    for t in v["trains"].as_array().unwrap() {
        let (e, p) = (t["error_shown"].as_f64().unwrap(), t["pitch_error"].as_f64().unwrap());
        assert_eq!(t["error_of"], "TPI");
        assert!(e != 0.0 && e.signum() == -p.signum(), "{e} {p}");
        assert!(((1.0 + e) * (1.0 + p) - 1.0).abs() < 1e-12);
        let tpi_cut = t["pitch_cut"].as_f64().unwrap();
        assert!((tpi_cut / 11.5 - 1.0 - e).abs() < 1e-9, "{tpi_cut} {e}");
    }
    let text = gearsieve(&[
        "thread",
        "--lathe",
        "catalogs/lathe/brackenfold.lathe",
        "--pitch",
        "11.5tpi",
        "--limit",
        "1",
    ]);
    assert!(text.stdout.contains("ppm TPI"), "{}", text.stdout);
    assert!(
        text.stdout.contains("error: for a thread given in TPI, TPI cut / TPI wanted − 1"),
        "{}",
        text.stdout
    );
}

/// A 12-tooth change gear on hand, cut standard at 20°, is undercut (it needs
/// x ≥ 1 − z·sin²α/2 ≈ 0.298 to clear a full-depth rack: the rack relation, common practice): every format of `thread` says so,
/// and through an idler the machine's two meshes are judged, not the direct pair it lacks.
#[test]
fn gears_on_hand_that_would_not_run_are_named_in_every_format() {
    let (_dir, stock) =
        temp_catalogue("small.csv", b"teeth,module,quantity\n12,1,1\n24,1,1\n30,1,1\n50,1,1\n");
    let base = [
        "thread",
        "--pitch",
        "16tpi",
        "--leadscrew",
        "8tpi",
        "--stock",
        &stock,
        "--stud-to-leadscrew",
        "40",
        "--shaft-diameter",
        "8",
        "--intermediate-range",
        "20..60",
        "--stages",
        "1",
    ];
    let table = gearsieve(&base);
    assert_eq!(table.code, 0, "{}", table.stderr);
    assert!(table.stdout.contains("Gears on hand as they are made"), "{}", table.stdout);
    assert!(
        table.stdout.contains("#1: stage 1 (12→30): the 12-tooth pinion would be undercut"),
        "{}",
        table.stdout
    );

    let mut csv_args = base.to_vec();
    csv_args.extend(["--format", "csv"]);
    let csv = gearsieve(&csv_args);
    let mut rows = ::csv::Reader::from_reader(csv.stdout.as_bytes());
    let head = rows.headers().unwrap().clone();
    let col = head.iter().position(|h| h == "on_hand_defects").expect("an on_hand_defects column");
    let first = rows.records().next().unwrap().unwrap();
    assert!(
        first[col].starts_with("stage 1 (12→30): the 12-tooth pinion would be undercut"),
        "{}",
        &first[col]
    );

    let (code, v) = json(&base);
    assert_eq!(code, 0);
    let stages = v["trains"][0]["stages"].as_array().unwrap();
    assert_eq!(stages.len(), 2, "the idler's two meshes");
    assert_eq!((stages[0]["driver"].as_u64(), stages[0]["driven"].as_u64()), (Some(12), Some(30)));
    assert!(stages[0]["on_hand_defects"][0].as_str().unwrap().contains("12-tooth pinion would be undercut"));
    // 30 → 24 runs: neither gear is undercut nor pointed, and their contact ratio is ample.
    assert!(stages[1].get("on_hand_defects").is_none_or(|d| d.as_array().unwrap().is_empty()), "{stages:?}");
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    /// `thread` lists gear sets: every listed setup is its set's best arrangement, and the set
    /// count and each set's arrangements equal a brute-force grouping of every setup the plain
    /// searches (one train per arrangement, the banjo checked) find, by gearbox position and the
    /// multisets of stud-side (driver) and leadscrew-side (driven) teeth.
    #[test]
    fn thread_listings_are_gear_sets_grouped_as_a_brute_force_groups_them(
        screw in prop::sample::select(vec!["8tpi", "3mm", "6mm"]),
        thread in prop::sample::select(vec!["0.75mm", "1mm", "1.25mm", "1.5mm", "2mm", "11tpi", "13tpi", "20tpi"]),
        // Change-gear tooth counts of the usual kind (common practice), so that most cases cut the
        // thread somehow.
        teeth in prop::collection::btree_set(prop::sample::select(vec![
            20u32, 24, 25, 30, 32, 35, 36, 40, 44, 45, 48, 50, 55, 60, 63, 64, 65, 70, 72, 75, 80, 100, 120, 127,
        ]), 6..12),
        twice in prop::collection::btree_set(prop::sample::select(vec![20u32, 25, 30, 40, 50, 60]), 0..3),
        gearbox in prop::option::of(prop::sample::select(vec![vec![(1u64, 2u64), (1, 1), (2, 1)]])),
        banjo in any::<bool>(),
        tol_ppm in prop::sample::select(vec![0u64, 1000, 5000]),
    ) {
        use std::collections::BTreeMap;
        let machine = Machine {
            leadscrew: parse_leadscrew(screw).unwrap(),
            stud_ratio: Ratio::integer(1),
            gearbox: gearbox.unwrap_or_default().into_iter().enumerate().map(|(i, (n, d))| {
                GearboxPosition { name: format!("P{i}"), ratio: Ratio::new(n as u128, d as u128).unwrap() }
            }).collect(),
        };
        let banjo = banjo.then(|| Banjo {
            stud_to_leadscrew_mm: 120.0,
            slots: vec![FloatRange { lo: 45.0, hi: 160.0 }],
            shaft_diameter_mm: 20.0,
        });
        let stock: Vec<StockGear> =
            teeth.iter().map(|&t| StockGear::on_hand(t, 1.5, 20.0, if twice.contains(&t) { 2 } else { 1 })).collect();
        let Ok(pool) = Pool::from_stock(&stock, "random") else { return Ok(()); };
        let tol = Ratio::new(tol_ppm as u128, 1_000_000).unwrap();
        let lathe = Lathe::new(machine.clone(), pool, banjo, IntRange { lo: 1, hi: 2 }, tol, 100_000).unwrap();
        let spec = ThreadSpec::thread(parse_pitch(thread).unwrap(), 1);
        let plan = lathe.plan(&spec, &RunOptions::default()).unwrap();

        // The brute force: every train of every position's problem, not grouped.
        let key = |position: &Option<String>, t: &gearsieve::model::train::Train| {
            let mut drivers: Vec<u32> = t.stages.iter().map(|s| s.driver.teeth).collect();
            let mut driven: Vec<u32> = t.stages.iter().map(|s| s.driven.teeth).collect();
            drivers.sort();
            driven.sort();
            (position.clone(), drivers, driven)
        };
        // (gearbox position, drivers, driven) → arrangements.
        type SetKey = (Option<String>, Vec<u32>, Vec<u32>);
        let mut groups: BTreeMap<SetKey, u64> = BTreeMap::new();
        let names: Vec<Option<String>> = if machine.gearbox.is_empty() {
            vec![None]
        } else {
            machine.gearbox.iter().map(|p| Some(p.name.clone())).collect()
        };
        let problems = lathe.problems(&spec, false).unwrap();
        prop_assert_eq!(problems.len(), names.len());
        let mut trains = 0u64;
        for (name, problem) in names.iter().zip(&problems) {
            prop_assert!(!problem.gear_sets);
            let found = gearsieve::engine::search(problem, gearsieve::EngineChoice::Exhaustive, &RunOptions::default());
            prop_assert_eq!(found.count as usize, found.trains.len());
            trains += found.count;
            for t in &found.trains {
                *groups.entry(key(name, t)).or_default() += 1;
            }
        }
        prop_assert_eq!(plan.count, trains);
        prop_assert_eq!(plan.gear_set_count, Some(groups.len() as u64));
        prop_assert_eq!(plan.setups.len(), groups.len());
        for s in &plan.setups {
            let name = s.position.as_ref().map(|p| p.name.clone());
            prop_assert_eq!(Some(&s.arrangements), groups.get(&key(&name, &s.train)), "{:?}", s.train);
        }
    }
}
