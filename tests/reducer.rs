//! `gearsieve reducer`: hunting pairs, module per stage, housing centre distances, speeds,
//! ranking, output shapes, errors and exit codes.

mod common;
use common::*;

use serde_json::Value;

fn gcd(a: u64, b: u64) -> u64 {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

fn trains(v: &Value) -> &Vec<Value> {
    v["trains"].as_array().expect("a trains array")
}

fn stages(t: &Value) -> &Vec<Value> {
    t["stages"].as_array().unwrap()
}

#[test]
fn hunting_pairs_really_have_no_common_factor() {
    // Common practice: a hunting-tooth pair has no common factor between its tooth counts.
    let (code, v) =
        json(&["reducer", "--ratio", "12", "--modules", "1", "--hunting", "require", "--limit", "30", "-q"]);
    assert_eq!(code, 0);
    assert!(!trains(&v).is_empty());
    for t in trains(&v) {
        for s in stages(t) {
            let (a, b) = (s["driver"].as_u64().unwrap(), s["driven"].as_u64().unwrap());
            assert_eq!(gcd(a, b), 1, "{a} and {b}");
        }
        assert_eq!(t["non_hunting_pairs"], 0);
    }
    // Preferring them ranks fewer non-hunting pairs first, then better balance in steps of 10 %
    // of spread (trains within one step rank alike, and the ratio error decides among them).
    let (_, v) = json(&["reducer", "--ratio", "12", "--modules", "1", "--limit", "30", "-q"]);
    let step = |balance: f64| (balance.ln() / 1.1f64.ln() - 1e-9).floor().max(0.0) as u64;
    let keys: Vec<(u64, u64)> = trains(&v)
        .iter()
        .map(|t| (t["non_hunting_pairs"].as_u64().unwrap(), step(t["balance"].as_f64().unwrap())))
        .collect();
    assert!(keys.windows(2).all(|w| w[0] <= w[1]), "{keys:?}");
    for t in trains(&v) {
        let flags: Vec<bool> = stages(t)
            .iter()
            .map(|s| gcd(s["driver"].as_u64().unwrap(), s["driven"].as_u64().unwrap()) == 1)
            .collect();
        assert_eq!(
            t["hunting"].as_array().unwrap().iter().map(|b| b.as_bool().unwrap()).collect::<Vec<_>>(),
            flags
        );
    }
}

#[test]
fn one_module_per_stage_coarser_toward_the_output() {
    let (code, v) = json(&[
        "reducer",
        "--ratio",
        "40",
        "--stages",
        "3",
        "--modules",
        "1,1.5,2",
        "--tol",
        "0.5%",
        "--limit",
        "10",
        "-q",
    ]);
    assert_eq!(code, 0);
    for t in trains(&v) {
        let m: Vec<f64> = stages(t).iter().map(|s| s["module_mm"].as_f64().unwrap()).collect();
        assert_eq!(m, [1.0, 1.5, 2.0]);
        assert!((t["value"].as_f64().unwrap() / 40.0 - 1.0).abs() <= 0.005 + 1e-12);
        for s in stages(t) {
            let (a, b) = (s["driver"].as_f64().unwrap(), s["driven"].as_f64().unwrap());
            assert!(b > a && b / a <= 6.0 + 1e-12, "stage ratio {a} → {b}");
            assert!(a >= 17.0 && b <= 100.0);
        }
    }
}

#[test]
fn housing_centre_distances_are_met_by_profile_shift() {
    let (code, v) = json(&[
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
        "10",
        "-q",
    ]);
    assert_eq!(code, 0);
    for t in trains(&v) {
        let s = stages(t);
        for (st, a) in s.iter().zip([60.0, 80.0]) {
            assert!((st["working_centre_distance_mm"].as_f64().unwrap() - a).abs() < 1e-6, "{st}");
            let x = st["shift"].as_array().unwrap();
            let sum = x[0].as_f64().unwrap() + x[1].as_f64().unwrap();
            assert!((-0.5 - 1e-9..=1.0 + 1e-9).contains(&sum), "shift sum {sum}");
        }
        assert!((t["centre_distance_sum_mm"].as_f64().unwrap() - 140.0).abs() < 1e-6);
        let tips: Vec<f64> = s
            .iter()
            .flat_map(|st| {
                st["tip_diameter_mm"]
                    .as_array()
                    .unwrap()
                    .iter()
                    .map(|d| d.as_f64().unwrap())
                    .collect::<Vec<_>>()
            })
            .collect();
        assert_eq!(t["largest_tip_diameter_mm"].as_f64().unwrap(), tips.iter().copied().fold(0.0, f64::max));
        let out = t["output_rpm"].as_f64().unwrap();
        assert!((out * t["value"].as_f64().unwrap() - 1450.0).abs() < 1e-6);
    }
}

#[test]
fn speeds_give_the_ratio_and_the_shelf_is_used() {
    // The invented shop's shelf (catalogs/reducer-stock.csv): 1450 rpm in, 50 rpm out is 29:1.
    let (code, v) = json(&[
        "reducer",
        "--input-rpm",
        "1450",
        "--output-rpm",
        "50",
        "--stages",
        "3",
        "--modules",
        "1,1.5,2",
        "--stock",
        "catalogs/reducer-stock.csv",
        "--tol",
        "2%",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["target"]["exact"], "29");
    for t in trains(&v) {
        assert!((t["output_rpm"].as_f64().unwrap() - 50.0).abs() <= 50.0 * 0.0205);
        assert!(stages(t).iter().all(|s| !s["driver_labels"].as_array().unwrap().is_empty()));
    }
}

#[test]
fn the_caution_is_printed() {
    let r = gearsieve(&["reducer", "--ratio", "9", "--modules", "2", "--limit", "1", "-q"]);
    assert_eq!(r.code, 0);
    assert!(r.stdout.contains("load-capacity rating (e.g. ISO 6336 or AGMA 2001)"), "{}", r.stdout);
    assert!(r.stdout.contains("envelope: largest tip diameter"));
    let r =
        gearsieve(&["reducer", "--ratio", "9", "--modules", "2", "--limit", "1", "--format", "csv", "-q"]);
    assert_eq!(r.stdout.lines().count(), 2);
}

#[test]
fn nothing_found_exits_1_with_output() {
    // Two stages of at most 100/17 (the teeth cap each stage below the 6:1 limit) cannot make
    // 100:1; three can.
    let r = gearsieve(&["reducer", "--ratio", "100", "--modules", "1", "--stages", "2", "--tol", "0", "-q"]);
    assert_eq!(r.code, 1);
    assert!(r.stdout.contains("No train meets every constraint."));
    assert_eq!(
        r.stderr,
        "gearsieve: no train meets every constraint. 100 is out of reach: 2 stages of these gears make at \
         most 34.6021. Try --stages up to 3, or a higher --max-teeth.\n"
    );
}

#[test]
fn bad_input_names_the_flag_and_exits_2() {
    for (args, flag) in [
        (vec!["reducer", "--ratio", "1/2", "--modules", "1"], "--ratio"),
        (vec!["reducer", "--ratio", "20", "--modules", "2,1"], "--modules"),
        (vec!["reducer", "--ratio", "20"], "--modules"),
        (vec!["reducer", "--ratio", "20", "--modules", "1,1.5,2", "--stages", "2"], "--modules"),
        (vec!["reducer", "--ratio", "20", "--modules", "1", "--max-stage-ratio", "1"], "--max-stage-ratio"),
        (
            vec!["reducer", "--ratio", "20", "--modules", "1", "--centre-distances", "-5"],
            "--centre-distances",
        ),
        (
            vec!["reducer", "--ratio", "20", "--modules", "1", "--min-teeth", "50", "--max-teeth", "20"],
            "--min-teeth",
        ),
        (vec!["reducer", "--input-rpm", "1450", "--output-rpm", "0", "--modules", "1"], "--output-rpm"),
    ] {
        let r = gearsieve(&args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert_eq!(r.stderr.lines().count(), 1, "{args:?}: {}", r.stderr);
        assert!(r.stderr.contains(flag), "{args:?}: {}", r.stderr);
    }
}

/// A negligible gain in stage balance never outranks a better ratio: among hunting trains of
/// 37.5:1 within 0.5 %, an exact train (balance 1.046) ranks above one 593 ppm off that is
/// perfectly balanced (1.000), because spreads within one 10 % step rank alike.
#[test]
fn a_better_ratio_outranks_a_negligibly_better_balance() {
    let (code, v) = json(&[
        "reducer",
        "--ratio",
        "37.5:1",
        "--stages",
        "3",
        "--modules",
        "1,1.5,2",
        "--tol",
        "0.5%",
        "--limit",
        "3",
        "-q",
    ]);
    assert_eq!(code, 0);
    let first = &trains(&v)[0];
    assert_eq!(first["ratio"], "75/2", "{first}");
    assert_eq!(first["non_hunting_pairs"], 0);
    assert!(first["balance"].as_f64().unwrap() < 1.1);
}

#[test]
fn each_mistake_gets_its_whole_message() {
    // The example follows the stage count asked for, and following it works.
    refused(
        &["reducer", "--ratio", "20"],
        "--modules: give the module in mm of each stage, input to output, such as 1,1.5 for --stages 2 (or 1 \
         for every stage); or gears on hand with --stock FILE",
    );
    let r = gearsieve(&["reducer", "--ratio", "20", "--modules", "1,1.5", "--limit", "1", "-q"]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    refused(
        &["reducer", "--ratio", "20", "--stages", "3"],
        "--modules: give the module in mm of each stage, input to output, such as 1,1.5,2 for --stages 3 (or \
         1 for every stage); or gears on hand with --stock FILE",
    );
    refused(
        &["reducer", "--ratio", "20", "--stages", "2..3"],
        "--modules: give one module in mm for every stage of --stages 2..3, such as 1; or gears on hand with \
         --stock FILE",
    );
    // A stage count that does not fit a list given per stage is refused, not narrowed.
    refused(
        &["reducer", "--ratio", "20", "--stages", "2..3", "--modules", "1,1.5"],
        "--stages: 2..3 does not fit --modules, which lists 2 modules, one per stage; give 2 stages, or one \
         module for all",
    );
    refused(
        &["reducer", "--ratio", "20", "--stages", "2", "--modules", "1,1.5,2"],
        "--stages: 2 does not fit --modules, which lists 3 modules, one per stage; give 3 stages, or one \
         module for all",
    );
    refused(
        &["reducer", "--ratio", "20", "--modules", "1", "--stages", "3", "--centre-distances", "60,80"],
        "--stages: 3 does not fit --centre-distances, which lists 2 centre distances, one per stage; give 2 \
         stages, or one distance for all",
    );
    refused(
        &["reducer", "--ratio", "20", "--modules", "1,1.5", "--centre-distances", "60,70,80"],
        "--centre-distances: 3 distances given, but --modules lists 2 modules; give as many of each (one per \
         stage), or one for all",
    );
    refused(
        &["reducer", "--ratio", "20", "--modules", "1", "--centre-distances", "60,3ft"],
        "--centre-distances: \"3ft\" has an unknown unit \"ft\"; wanted a length above 0 in mm such as 52.5, \
         or with a unit: 52.5mm, 0.0525m or 2.067in",
    );
    refused(
        &["reducer", "--ratio", "20", "--modules", "1e9"],
        "--modules: module must be a number of mm from 0.05 to 100, found 1000000000",
    );
    refused(
        &["reducer", "--ratio", "20", "--modules", "1e9", "--stock", "catalogs/lathe-change-gears.csv"],
        "--modules: module must be a number of mm from 0.05 to 100, found 1000000000",
    );
}

#[test]
fn the_stage_count_follows_a_list_given_per_stage() {
    // Three modules and no --stages: three stages, as the list says.
    let (code, v) = json(&[
        "reducer",
        "--ratio",
        "10",
        "--modules",
        "1,1.5,2",
        "--max-teeth",
        "40",
        "--tol",
        "2%",
        "--limit",
        "1",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert_eq!(stages(&trains(&v)[0]).len(), 3);
    // Centre distances with units are the same distances in mm.
    let trains_at = |cd: &str| {
        let (code, v) = json(&[
            "reducer",
            "--ratio",
            "20",
            "--modules",
            "1,1.5",
            "--centre-distances",
            cd,
            "--limit",
            "2",
            "-q",
        ]);
        assert_eq!(code, 0, "{cd}");
        v["trains"].clone()
    };
    assert_eq!(trains_at("2in,3in"), trains_at("50.8,76.2"));
    assert_eq!(trains_at("60mm,0.08m"), trains_at("60,80"));
}

#[test]
fn a_reducer_that_would_run_for_days_needs_long() {
    // Four stages of up to 200 teeth: forecast first, refused without --long, even in a pipe.
    let r = gearsieve(&["reducer", "--ratio", "20", "--stages", "4", "--modules", "1", "--max-teeth", "200"]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(r.stdout.is_empty());
    assert_eq!(r.stderr.lines().count(), 1, "{}", r.stderr);
    assert!(r.stderr.starts_with("gearsieve: this search would take "), "{}", r.stderr);
    assert!(
        r.stderr.ends_with(
            "narrow it (fewer --stages, a lower --max-teeth, a lower --max-stage-ratio, a tighter --tol), or \
             give --long to run it anyway\n"
        ),
        "{}",
        r.stderr
    );
    assert_flags_named_once(&r.stderr);
}

#[test]
fn nothing_found_names_only_what_would_help() {
    // --hunting prefer is the default: not suggested; out of reach, so no looser --tol either.
    // The stage ratio limit caps each stage: raising it, or more stages, would help.
    nothing_found(
        &[
            "reducer",
            "--ratio",
            "20",
            "--modules",
            "1",
            "--stages",
            "1",
            "--hunting",
            "prefer",
            "--max-stage-ratio",
            "3",
        ],
        "no train meets every constraint. 20 is out of reach: 1 stage of these gears makes at most 3. Try \
         --stages up to 3, or a higher --max-stage-ratio.",
    );
    // The teeth, not the stage ratio limit, cap each stage here: the hint says so.
    nothing_found(
        &["reducer", "--ratio", "20", "--modules", "1,1.5,2", "--max-teeth", "30"],
        "no train meets every constraint. 20 is out of reach: 3 stages of these gears make at most 5.4956. Try \
         a higher --max-teeth.",
    );
    // Exactly 4:1 in one stage pairs z with 4z, which share z: never hunting. Relaxing the
    // requirement is a hint; the stage ratio limit (6) does not bind, so it is not named.
    nothing_found(
        &["reducer", "--ratio", "4", "--modules", "1", "--stages", "1", "--tol", "0", "--hunting", "require"],
        "no train meets every constraint. Try a looser --tol, a higher --max-teeth, a lower --min-teeth, more \
         --stages, or --hunting prefer.",
    );
}

/// Trains and gear sets of a two-stage 12:1 reducer of hunting pairs, by brute force: every
/// train is an unordered pair of stages a→b, c→d (17..100 teeth at module 1.5, the default
/// least teeth and most for that module; a stage ratio b/a from above 1 up to 6, the default
/// limit; a and b with no common factor) with b·d = 12·a·c; its gear set is the drivers {a, c}
/// and the driven gears {b, d}. Standard gears of 17 teeth or more run unshifted or nearly so,
/// so no mesh check leaves one out.
#[test]
fn reducer_counts_gear_sets_as_a_brute_force_grouping_does() {
    fn gcd(a: u32, b: u32) -> u32 {
        if b == 0 {
            a
        } else {
            gcd(b, a % b)
        }
    }
    let stage_ok = |a: u32, b: u32| b > a && b <= 6 * a && gcd(a, b) == 1;
    let mut trains = 0u64;
    let mut sets = std::collections::BTreeSet::new();
    let range = 17u32..=100;
    for a in range.clone() {
        for b in range.clone().filter(|&b| stage_ok(a, b)) {
            for c in range.clone() {
                for d in range.clone().filter(|&d| stage_ok(c, d)) {
                    // Each unordered pair of stages once.
                    if (a, b) > (c, d) || u64::from(b) * u64::from(d) != 12 * u64::from(a) * u64::from(c) {
                        continue;
                    }
                    trains += 1;
                    sets.insert(([a.min(c), a.max(c)], [b.min(d), b.max(d)]));
                }
            }
        }
    }
    let (code, v) = common::json(&[
        "reducer",
        "--ratio",
        "12",
        "--tol",
        "0",
        "--modules",
        "1.5",
        "--hunting",
        "require",
        "--limit",
        "1",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["count"].as_u64(), Some(trains));
    assert_eq!(v["gear_set_count"].as_u64(), Some(sets.len() as u64));
}

/// Gears on hand cannot be shifted: a 20/60 pair of module 1 stands tight at m(z1 + z2)/2 = 40 mm
/// (the ISO 21771 reference centre distance). A housing bored at 40.05 mm takes them only when
/// `--centre-tol` lets them stand 0.05 mm apart, and then unshifted; the default 0.01 mm refuses
/// them and the hint names the flag.
#[test]
fn gears_on_hand_meet_a_housing_within_the_centre_tolerance_given() {
    let (_dir, stock) = temp_catalogue("pair.csv", b"teeth,module,quantity\n20,1,1\n60,1,1\n");
    let base = [
        "reducer",
        "--ratio",
        "3",
        "--stages",
        "1",
        "--modules",
        "1",
        "--centre-distances",
        "40.05",
        "--stock",
        &stock,
    ];
    let tight = gearsieve(&base);
    assert_ne!(tight.code, 0, "{}", tight.stdout);
    assert!(tight.stderr.contains("--centre-tol"), "{}", tight.stderr);
    let mut loose = base.to_vec();
    loose.extend(["--centre-tol", "0.1"]);
    let (code, v) = json(&loose);
    assert_eq!(code, 0, "{v}");
    let s = &stages(&trains(&v)[0])[0];
    assert_eq!((s["driver"].as_u64(), s["driven"].as_u64()), (Some(20), Some(60)));
    assert_eq!(s["shift"], serde_json::json!([0.0, 0.0]), "{s}");
    assert!((s["working_centre_distance_mm"].as_f64().unwrap() - 40.05).abs() < 1e-9, "{s}");
    // cos α_w = a·cos α / a_w (ISO 21771): the pair pulled apart runs at a larger angle.
    let alpha_w = (40.0 * 20f64.to_radians().cos() / 40.05).acos().to_degrees();
    assert!((s["working_pressure_angle_deg"].as_f64().unwrap() - alpha_w).abs() < 1e-9, "{s}");
}

/// `--arrangements` lists the other arrangements of each gear set: as many as the set has less
/// the listed one, each the same gears (the same multisets of pinions and of gears) paired
/// another way, with the same ratio; in CSV as rows numbered within their set.
#[test]
fn arrangements_lists_the_other_pairings_of_each_gear_set() {
    let args = [
        "reducer",
        "--ratio",
        "12",
        "--stages",
        "2",
        "--modules",
        "1",
        "--max-teeth",
        "80",
        "--tol",
        "0",
        "--limit",
        "4",
        "--arrangements",
    ];
    let (code, v) = json(&args);
    assert_eq!(code, 0, "{v}");
    let sorted = |t: &Value, side: &str| {
        let mut z: Vec<u64> = stages(t).iter().map(|s| s[side].as_u64().unwrap()).collect();
        z.sort();
        z
    };
    let pairs = |t: &Value| {
        let mut p: Vec<(u64, u64)> = stages(t)
            .iter()
            .map(|s| (s["driver"].as_u64().unwrap(), s["driven"].as_u64().unwrap()))
            .collect();
        p.sort();
        p
    };
    let mut several = 0;
    for t in trains(&v) {
        let others = t["other_arrangements"].as_array().cloned().unwrap_or_default();
        assert_eq!(others.len() as u64 + 1, t["arrangements"].as_u64().unwrap(), "{t}");
        several += usize::from(!others.is_empty());
        for o in &others {
            assert_eq!(o["ratio"], t["ratio"]);
            assert_eq!(
                (sorted(o, "driver"), sorted(o, "driven")),
                (sorted(t, "driver"), sorted(t, "driven"))
            );
            assert_ne!(pairs(o), pairs(t), "another pairing, not the same one again");
        }
    }
    assert!(several > 0, "some set has more than one arrangement: {v}");
    let mut csv_args = args.to_vec();
    csv_args.extend(["--format", "csv"]);
    let csv = gearsieve(&csv_args);
    let rows: Vec<Vec<String>> = ::csv::Reader::from_reader(csv.stdout.as_bytes())
        .records()
        .map(|r| r.unwrap().iter().map(String::from).collect())
        .collect();
    let total: u64 = trains(&v).iter().map(|t| t["arrangements"].as_u64().unwrap()).sum();
    assert_eq!(rows.len() as u64, total);
}
