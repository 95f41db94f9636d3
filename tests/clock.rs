//! `gearsieve clock`: going train, motion work and astronomical trains against published
//! values, output shapes, errors and exit codes.

mod common;
use common::*;

use serde_json::Value;

fn trains(v: &Value) -> &Vec<Value> {
    v["trains"].as_array().expect("a trains array")
}

/// Stages of a JSON train as (driver, driven) pairs.
fn pairs(t: &Value) -> Vec<(u64, u64)> {
    t["stages"]
        .as_array()
        .unwrap()
        .iter()
        .map(|s| (s["driver"].as_u64().unwrap(), s["driven"].as_u64().unwrap()))
        .collect()
}

#[test]
fn seconds_pendulum_and_thirty_tooth_escape_wheel_turn_once_a_minute() {
    // Wikipedia, "Seconds pendulum": period 2 s; common practice: a 30-tooth escape wheel with
    // two beats per tooth then turns once a minute, 60 turns an hour, so the train from the
    // centre arbor (once an hour) has i = 1/60.
    let (code, v) = json(&["clock", "going", "--period", "2", "--escape-teeth", "30", "--limit", "3", "-q"]);
    assert_eq!(code, 0);
    assert_eq!(v["escape_turns_per_hour"], 60.0);
    assert_eq!(v["ratio_needed"], "1/60");
    assert_eq!(v["ratio_needed_exact"], true);
    for t in trains(&v) {
        assert_eq!(t["ratio"], "1/60");
        let arbors = t["arbors"].as_array().unwrap();
        assert_eq!(arbors.first().unwrap()["arbor"], "centre");
        assert_eq!(arbors.last().unwrap()["arbor"], "escape");
        assert_eq!(arbors.last().unwrap()["turns_per_hour"], 60.0);
        assert_eq!(t["rate_s_per_day"], 0.0);
    }
    // The same from the length: Wikipedia gives about 0.994 m; computed g/π² = 0.99362 m.
    let (code, v) =
        json(&["clock", "going", "--pendulum", "0.99362", "--limit", "1", "--rate-tol", "2", "-q"]);
    assert_eq!(code, 0);
    assert!((v["period_s"].as_f64().unwrap() - 2.0).abs() < 1e-5, "{}", v["period_s"]);
    assert!((v["escape_turns_per_hour"].as_f64().unwrap() - 60.0).abs() < 3e-4);
}

#[test]
fn the_64_8_60_8_going_train_is_found_exact() {
    // Common practice, from memory: centre wheel 64 into an 8-leaf pinion, third wheel 60 into
    // an 8-leaf pinion, with a seconds pendulum and a 30-tooth escape wheel.
    let (code, v) =
        json(&["clock", "going", "--period", "2", "--pinions", "8", "--stages", "2", "--limit", "50", "-q"]);
    assert_eq!(code, 0);
    let all: Vec<Vec<(u64, u64)>> = trains(&v).iter().map(pairs).collect();
    assert!(all.contains(&vec![(64, 8), (60, 8)]), "{all:?}");
    // Every train listed: wheels drive 8-leaf pinions and the product of wheels is 64·60.
    assert_eq!(v["count"].as_u64().unwrap() as usize, all.len());
    for t in &all {
        assert!(t.iter().all(|&(w, p)| p == 8 && (30..=130).contains(&w)));
        assert_eq!(t.iter().map(|p| p.0).product::<u64>(), 64 * 60);
    }
}

#[test]
fn a_rate_tolerance_admits_near_trains_and_reports_their_rate() {
    // 3.5 beats per second (12600 beats/h) with a 40-tooth escape wheel: 157.5 turns/h. With
    // a 10 s/day tolerance every train's reported rate is within it and matches its error.
    let (code, v) = json(&[
        "clock",
        "going",
        "--beats-per-hour",
        "12600",
        "--escape-teeth",
        "40",
        "--rate-tol",
        "10",
        "--limit",
        "20",
        "-q",
    ]);
    assert_eq!(code, 0);
    for t in trains(&v) {
        let rate = t["rate_s_per_day"].as_f64().unwrap();
        assert!(rate.abs() <= 10.0 + 1e-9, "{rate}");
        assert!((rate - t["error"].as_f64().unwrap() * 86400.0).abs() < 1e-9);
        assert!(pairs(t).iter().all(|&(w, p)| w > p && p >= 6));
    }
}

#[test]
fn twelve_to_one_motion_work_is_found_coaxial() {
    // Wikipedia, "Wheel train": the motion work reduces 12:1 from the cannon pinion to the hour
    // wheel, which is coaxial with it: both stages at one working centre distance.
    let (code, v) = json(&["clock", "motion", "--limit", "20", "-q"]);
    assert_eq!(code, 0);
    assert!(!trains(&v).is_empty());
    for t in trains(&v) {
        assert_eq!(t["ratio"], "12");
        assert_eq!(t["meshes"], 2);
        let a: Vec<f64> = t["stages"]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| s["working_centre_distance_mm"].as_f64().unwrap())
            .collect();
        assert!((a[0] - a[1]).abs() < 1e-9, "{a:?}");
        assert_eq!(t["stage_names"][0]["driver"], "cannon pinion");
        assert_eq!(t["stage_names"][1]["driven"], "hour wheel");
    }
    // Not coaxial: trains whose standard centre distances differ appear too.
    let (code, v) = json(&["clock", "motion", "--not-coaxial", "--stages", "2", "--limit", "200", "-q"]);
    assert_eq!(code, 0);
    assert!(trains(&v).iter().any(|t| {
        let s = t["stages"].as_array().unwrap();
        (s[0]["reference_centre_distance_mm"].as_f64().unwrap()
            - s[1]["reference_centre_distance_mm"].as_f64().unwrap())
        .abs()
            > 0.5
    }));
}

#[test]
fn other_hand_ratios() {
    for (dial, ratio) in [("24h", "24"), ("week", "7")] {
        let (code, v) = json(&["clock", "motion", "--dial", dial, "--not-coaxial", "--limit", "3", "-q"]);
        assert_eq!(code, 0, "{dial}");
        assert!(trains(&v).iter().all(|t| t["ratio"] == ratio && t["error"] == 0.0), "{dial}");
    }
}

#[test]
fn lunar_month_convergent_443_15_is_the_best_single_stage() {
    // Wikipedia, "Lunar calendar": 443/15 is a convergent of the synodic month. With wheels of
    // at most 460 teeth a single stage has at most 15 on its driver, and a convergent is the
    // best fraction of no larger denominator, so the best single stage is 15 → 443. Input
    // 29.530588 d (1911 encyclopaedia), which has the same convergents up to 1447/49.
    let (code, v) = json(&[
        "clock",
        "astro",
        "--period",
        "synodic-month",
        "--teeth",
        "6..460",
        "--stages",
        "1",
        "--limit",
        "1",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert_eq!(pairs(&trains(&v)[0]), vec![(15, 443)]);
    assert_eq!(v["target_period_days"], "7382647/250000");
    let conv: Vec<&str> =
        v["convergents"].as_array().unwrap().iter().map(|c| c["ratio"].as_str().unwrap()).collect();
    assert_eq!(&conv[..7], ["29", "30", "59/2", "443/15", "502/17", "1447/49", "23654/801"]);
    // The drift of a train is its error seen on the dial, and the days to one day out its
    // inverse (computed).
    let t = &trains(&v)[0];
    let e = t["error"].as_f64().unwrap();
    let drift = t["drift_days_per_year"].as_f64().unwrap();
    assert!((drift + e / (1.0 + e) * 365.2425).abs() < 1e-12);
    assert!((t["days_to_one_day"].as_f64().unwrap() * drift.abs() / 365.2425 - 1.0).abs() < 1e-9);
}

#[test]
fn lunar_month_1447_49_cannot_be_cut() {
    // Wikipedia, "Lunar calendar": 1447/49 is the next convergent, but 1447 is prime and gears
    // have at most 1000 teeth, so no train of any stage count can make it: the search finds
    // nothing (exit 1, output still written) and the convergent is marked with its prime.
    let r = gearsieve(&[
        "clock", "astro", "--period", "1447/49", "--tol", "0", "--teeth", "6..1000", "--stages", "1", "-q",
    ]);
    assert_eq!(r.code, 1, "{}", r.stderr);
    assert!(r.stdout.contains("No train meets every constraint."));
    assert!(r.stdout.contains("needs the prime 1447"), "{}", r.stdout);
    assert!(r.stderr.contains("no train meets every constraint"));
    let (code, v) = json(&[
        "clock", "astro", "--period", "1447/49", "--tol", "0", "--teeth", "6..120", "--stages", "2", "-q",
    ]);
    assert_eq!(code, 1);
    assert_eq!(v["count"], 0);
    let last = v["convergents"].as_array().unwrap().last().unwrap().clone();
    assert_eq!(last["ratio"], "1447/49");
    assert_eq!(last["blocking_prime"], 1447);
}

#[test]
fn sidereal_day_366_365() {
    // Wikipedia, "Sidereal time": the sidereal day is 1/1.002737909350795 of the solar day; its
    // first convergent 366/365 (computed) means a dial driven from a daily arbor turns 366 times
    // while the arbor turns 365: i = 365/366, one stage 366 → 365 with teeth up to 400.
    let (code, v) = json(&[
        "clock",
        "astro",
        "--period",
        "sidereal-day",
        "--teeth",
        "20..400",
        "--stages",
        "1",
        "--limit",
        "1",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert_eq!(trains(&v)[0]["ratio"], "365/366");
    assert_eq!(pairs(&trains(&v)[0]), vec![(366, 365)]);
    let conv: Vec<&str> =
        v["convergents"].as_array().unwrap().iter().map(|c| c["ratio"].as_str().unwrap()).collect();
    assert_eq!(&conv[..4], ["1", "365/366", "1461/1465", "10592/10621"]);
}

#[test]
fn hourly_arbor_multiplies_the_ratio_by_24() {
    let (_, day) =
        json(&["clock", "astro", "--period", "tropical-year", "--stages", "2", "--limit", "1", "-q"]);
    let (_, hour) = json(&[
        "clock",
        "astro",
        "--period",
        "tropical-year",
        "--from",
        "hour",
        "--stages",
        "3",
        "--limit",
        "1",
        "-q",
    ]);
    assert_eq!(day["target"]["exact"], "36524219/100000");
    // 365.24219 d × 24 turns a day = 8765.81256 turns (computed).
    assert_eq!(hour["target"]["exact"], "109572657/12500");
    assert_eq!(hour["input_turns_per_day"], 24);
}

#[test]
fn table_and_csv_show_the_trade_words() {
    let r = gearsieve(&["clock", "going", "--period", "2", "--limit", "2", "-q"]);
    assert_eq!(r.code, 0);
    assert!(r.stdout.contains("wheel → pinion") && r.stdout.contains("escape 60/h (1 min)"), "{}", r.stdout);
    assert!(r.stdout.contains("a speed-up, i < 1"));
    let r = gearsieve(&["clock", "motion", "--format", "csv", "--limit", "2", "-q"]);
    assert_eq!(r.code, 0);
    let mut lines = r.stdout.lines();
    // One value per cell: the stages as numbered columns, the worked-out meshes beside them.
    let head: Vec<&str> = lines.next().unwrap().split(',').collect();
    for column in ["rank", "ratio", "error", "size", "stage1_driver", "stage1_driven", "stage2_shift_driver"]
    {
        assert!(head.contains(&column), "{column} missing from {head:?}");
    }
    let rows: Vec<Vec<&str>> = lines.map(|l| l.split(',').collect()).collect();
    assert_eq!(rows.len(), 2);
    let at = |row: &Vec<&str>, name: &str| row[head.iter().position(|h| *h == name).unwrap()].to_string();
    // The hour motion work: 12 = product of wheels / product of pinions.
    let teeth = |r: &Vec<&str>, s: &str| at(r, s).parse::<u64>().unwrap();
    let r0 = &rows[0];
    assert_eq!(
        teeth(r0, "stage1_driven") * teeth(r0, "stage2_driven"),
        12 * teeth(r0, "stage1_driver") * teeth(r0, "stage2_driver")
    );
}

#[test]
fn bad_input_names_the_flag_and_exits_2() {
    for (args, flag) in [
        (vec!["clock", "going", "--period", "0"], "--period"),
        (vec!["clock", "going", "--pendulum", "-1"], "--pendulum"),
        (vec!["clock", "going", "--period", "2", "--escape-teeth", "1"], "--escape-teeth"),
        (vec!["clock", "going", "--period", "2", "--beats-per-tooth", "0"], "--beats-per-tooth"),
        (vec!["clock", "going", "--period", "2", "--pinions", "4..10"], "--pinions"),
        (vec!["clock", "going", "--period", "2", "--rate-tol", "abc"], "--rate-tol"),
        (vec!["clock", "motion", "--dial", "fortnight"], "--dial"),
        (vec!["clock", "motion", "--stages", "3"], "--coaxial"),
        (vec!["clock", "astro", "--period", "eon"], "--period"),
        (vec!["clock", "astro", "--period", "sidereal-day", "--from", "week"], "--from"),
    ] {
        let r = gearsieve(&args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert_eq!(r.stderr.lines().count(), 1, "{args:?}: {}", r.stderr);
        assert!(r.stderr.contains(flag), "{args:?}: {}", r.stderr);
        assert!(!r.stderr.contains("panicked"));
    }
}

#[test]
fn the_demo_bench_stock_gives_a_going_train() {
    // The invented restorer's drawer (catalogs/clock-blanks.csv): each blank used at most once.
    let (code, v) = json(&["clock", "going", "--period", "2", "--stock", "catalogs/clock-blanks.csv", "-q"]);
    assert_eq!(code, 0);
    for t in trains(&v) {
        assert_eq!(t["ratio"], "1/60");
        let mut wheels: Vec<u64> = pairs(t).iter().map(|p| p.0).collect();
        wheels.sort();
        wheels.dedup();
        assert_eq!(wheels.len(), pairs(t).len(), "one blank of each wheel size is enough here");
    }
}
