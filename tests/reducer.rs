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
    // Two stages of at most 6:1 cannot make 100:1.
    let r = gearsieve(&["reducer", "--ratio", "100", "--modules", "1", "--stages", "2", "--tol", "0", "-q"]);
    assert_eq!(r.code, 1);
    assert!(r.stdout.contains("No train meets every constraint."));
    assert!(r.stderr.contains("--max-stage-ratio"));
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
