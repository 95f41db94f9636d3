//! `gearsieve clock`: going train, motion work and astronomical trains against published
//! values, output shapes, errors and exit codes.

mod common;
use common::*;

use serde_json::Value;

fn trains(v: &Value) -> &Vec<Value> {
    v["trains"].as_array().expect("a trains array")
}

/// Every listed train and, when asked for with `--arrangements`, every other arrangement of
/// its gear set.
fn every_arrangement(v: &Value) -> Vec<&Value> {
    trains(v)
        .iter()
        .flat_map(|t| std::iter::once(t).chain(t["other_arrangements"].as_array().into_iter().flatten()))
        .collect()
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
    // the built-in mean synodic month 29.530588853 d (Chapront-Touzé and Chapront, quoted in the
    // Explanatory Supplement to the Astronomical Almanac, 1992 — from memory), which has the
    // same convergents up to 25101/850.
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
    assert_eq!(v["target_period_days"], "29530588853/1000000000");
    let conv: Vec<&str> =
        v["convergents"].as_array().unwrap().iter().map(|c| c["ratio"].as_str().unwrap()).collect();
    assert_eq!(&conv[..8], ["29", "30", "59/2", "443/15", "502/17", "1447/49", "25101/850", "51649/1749"]);
    // The drift of a train is its error seen on the dial, and the days to one day out its
    // inverse (computed).
    let t = &trains(&v)[0];
    let e = t["error"].as_f64().unwrap();
    let drift = t["drift_days_per_year"].as_f64().unwrap();
    // Both are rounded to the significant figures the period's digits support.
    let digits = t["significant_digits"].as_u64().unwrap() as i32;
    assert!(digits >= 3, "{digits}");
    let close = |a: f64, b: f64| (a / b - 1.0).abs() < 10f64.powi(1 - digits);
    assert!(close(drift, -e / (1.0 + e) * 365.2425));
    assert!(close(t["days_to_one_day"].as_f64().unwrap() * drift.abs() / 365.2425, 1.0));
}

#[test]
fn best_two_stage_lunar_train_is_judged_against_every_digit_of_the_month() {
    // Mean synodic month 29.530588853 d (Chapront-Touzé and Chapront's lunar theory, quoted in the
    // Explanatory Supplement to the Astronomical Almanac, 1992 — from memory). The best two-stage
    // train of 8..150 teeth is 43 → 97, 11 → 144 = 13968/473; its error against that value is
    // 13968/473 / 29.530588853 − 1 = +2.2531931e-6 (computed with exact fractions), where the
    // cut value 29.530588 gave +2.282e-6: the constant's own error (2.9e-8) was larger than the
    // difference between good trains.
    let (code, v) = json(&[
        "clock",
        "astro",
        "--period",
        "synodic-month",
        "--stages",
        "2",
        "--tol",
        "10ppm",
        "--limit",
        "1",
        "-q",
    ]);
    assert_eq!(code, 0);
    let t = &trains(&v)[0];
    assert_eq!(t["ratio"], "13968/473");
    assert!((t["error"].as_f64().unwrap() - 2.2531931496e-6).abs() < 1e-15);
    // Drift −e/(1+e) × 365.2425 = −0.00082296 d/yr, days to one day out (1+e)/e = 443815.6
    // (computed): five significant figures stand, since the month's last digit is worth
    // 1.7e-11 of it.
    assert_eq!(t["significant_digits"], 5);
    assert_eq!(t["drift_days_per_year"].as_f64().unwrap(), -0.00082296);
    assert_eq!(t["days_to_one_day"].as_f64().unwrap(), 443820.0);
}

#[test]
fn the_report_gives_the_basis_of_the_period_not_a_credit() {
    for format in ["table", "csv", "json", "markdown"] {
        let r = gearsieve(&[
            "clock",
            "astro",
            "--period",
            "synodic-month",
            "--tol",
            "10ppm",
            "--limit",
            "1",
            "-q",
            "--format",
            format,
        ]);
        assert_eq!(r.code, 0, "{}", r.stderr);
        for credit in ["encyclopaedia", "Wikipedia", "1911"] {
            assert!(!r.stdout.contains(credit), "{format}: {}", r.stdout);
        }
    }
    let r =
        gearsieve(&["clock", "astro", "--period", "synodic-month", "--tol", "10ppm", "--limit", "1", "-q"]);
    assert!(
        r.stdout.starts_with(
            "Astronomical train: synodic-month (mean synodic month 29.530588853 d; mean, J2000)"
        ),
        "{}",
        r.stdout
    );
    let (_, v) =
        json(&["clock", "astro", "--period", "sidereal-year", "--tol", "10ppm", "--limit", "1", "-q"]);
    assert!(v.get("source").is_none());
    assert_eq!(v["basis"], "mean, J2000");
    assert_eq!(v["target_period_days"], "365256363/1000000");
    let (_, v) = json(&["clock", "astro", "--period", "27.3", "--limit", "1", "-q"]);
    assert_eq!(v["basis"], "as given");
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
    // Mean tropical year 365.242190 d at J2000 (Explanatory Supplement to the Astronomical
    // Almanac, 1992 — from memory).
    assert_eq!(day["target"]["exact"], "36524219/100000");
    // 365.24219 d × 24 turns a day = 8765.81256 turns (computed).
    assert_eq!(hour["target"]["exact"], "109572657/12500");
    assert_eq!(hour["input_turns_per_day"], 24);
}

#[test]
fn table_and_csv_show_the_trade_words() {
    let r = gearsieve(&["clock", "going", "--period", "2", "--limit", "2", "-q"]);
    assert_eq!(r.code, 0);
    assert!(
        r.stdout.contains("wheel → pinion") && r.stdout.contains("escape 60/h (1 min, seconds hand)"),
        "{}",
        r.stdout
    );
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
fn each_mistake_gets_its_whole_message() {
    let length = "wanted a length above 0 in m such as 0.994, or with a unit: 994mm, 0.994m or 39.13in";
    refused(
        &["clock", "going", "--pendulum", "3ft"],
        &format!("--pendulum: \"3ft\" has an unknown unit \"ft\"; {length}"),
    );
    refused(
        &["clock", "going", "--pendulum", "200"],
        "--pendulum: wanted a length in m above 0 and at most 100, found 200",
    );
    // A period has its own message, not the ratio's.
    let period = "wanted a period above 0 in s such as 2, or with a unit: 2s, 1.5min, 1h";
    refused(&["clock", "going", "--period", "0"], &format!("--period: \"0\" is zero; {period}"));
    refused(
        &["clock", "going", "--period", "2x"],
        &format!("--period: \"2x\" has an unknown unit \"x\"; {period}"),
    );
    refused(
        &["clock", "going", "--beats-per-hour", "0"],
        "--beats-per-hour: \"0\" is zero; wanted beats per hour above 0 such as 3600",
    );
    // Gravity: non-positive and absurd values are refused with the accepted range.
    for g in ["0", "-9.81", "98.0665"] {
        let r = gearsieve(&["clock", "going", "--period", "2", "--gravity", g]);
        assert_eq!(r.code, 2, "{g}: {}", r.stderr);
        assert_eq!(r.stderr.lines().count(), 1, "{g}: {}", r.stderr);
        assert!(r.stderr.starts_with("gearsieve: --gravity: "), "{g}: {}", r.stderr);
    }
    refused(
        &["clock", "going", "--period", "2", "--gravity", "0"],
        "--gravity: wanted m/s² from 1 to 30 (9.80665 is standard), found 0",
    );
    refused(
        &["clock", "going", "--pendulum", "1", "--gravity", "-9.81"],
        "--gravity: \"-9.81\" is negative; wanted m/s² such as 9.80665",
    );
    let astro = "wanted synodic-month, sidereal-month, draconic-month, anomalistic-month, sidereal-day, \
                 tropical-year, sidereal-year or a period above 0 in d such as 27.321661, or with a unit: \
                 29.53d, 708.7h";
    refused(&["clock", "astro", "--period", "0"], &format!("--period: \"0\" is zero; {astro}"));
    refused(&["clock", "astro", "--period", "eon"], &format!("--period: \"eon\" is not a number; {astro}"));
    refused(
        &["clock", "motion", "--min-contact-ratio", "-1"],
        "--min-contact-ratio: wanted a number of 0 or more such as 1.2, found -1",
    );
    refused(
        &["clock", "going", "--period", "2", "--module", "1e9"],
        "--module: module must be a number of mm from 0.05 to 100, found 1000000000",
    );
}

#[test]
fn lengths_periods_and_gravity_are_read_with_their_units() {
    let going = |beat: &[&str]| {
        let args =
            [&["clock", "going"][..], beat, &["--pinions", "8", "--stages", "2", "--limit", "2"]].concat();
        let r = gearsieve(&args);
        assert_eq!(r.code, 0, "{beat:?}: {}", r.stderr);
        r.stdout
    };
    assert_eq!(going(&["--period", "2s"]), going(&["--period", "2"]));
    assert_eq!(
        going(&["--period", "2"]),
        going(&["--beats-per-hour", "3600"])
            .replace("3600 beats/h → period 2 s", "period 2 s → 3600 beats/h")
    );
    let half_minute = gearsieve(&["clock", "going", "--period", "0.5min", "--stages", "1", "--limit", "1"]);
    assert!(half_minute.stdout.contains("period 30 s"), "{}", half_minute.stderr);
    let rate = |length: &str| {
        let (code, v) =
            json(&["clock", "going", "--pendulum", length, "--rate-tol", "10", "--limit", "1", "-q"]);
        assert_eq!(code, 0, "{length}");
        v["trains"][0]["rate_s_per_day"].clone()
    };
    assert_eq!(rate("994mm"), rate("0.994"));
    assert_eq!(rate("994mm"), rate("0.994m"));
    // The report uses the gravity given: the simple pendulum of a 2 s period is g/π² long.
    let local = going(&["--period", "2", "--gravity", "9.81"]);
    assert!(local.contains("(simple pendulum 0.994 m at g = 9.81 m/s²)"), "{local}");
    let standard = going(&["--period", "2"]);
    assert!(standard.contains("(simple pendulum 0.9936 m at g = 9.80665 m/s²)"), "{standard}");
    let moon = going(&["--period", "2", "--gravity", "1.62"]);
    assert!(moon.contains("(simple pendulum 0.1641 m at g = 1.62 m/s²)"), "{moon}");
    // An astronomical period in days, or with a unit.
    let astro = |period: &str| {
        let (code, v) = json(&["clock", "astro", "--period", period, "--limit", "1", "-q"]);
        assert_eq!(code, 0, "{period}");
        v["target_period_days"].clone()
    };
    assert_eq!(astro("29.53d"), astro("29.53"));
    assert_eq!(astro("708.72h"), astro("29.53"));
}

#[test]
fn nothing_found_names_only_what_would_help() {
    // The rate tolerance given is in force: the hint is a looser one than that, not "above 0".
    nothing_found(
        &[
            "clock",
            "going",
            "--period",
            "2",
            "--wheels",
            "30..40",
            "--pinions",
            "8..9",
            "--stages",
            "2",
            "--rate-tol",
            "5",
        ],
        "no train meets every constraint. 1/60 is out of reach: 2 stages of these gears make at least \
         0.04. Try --stages up to 3, or wider --wheels and --pinions.",
    );
    // 1/60 lies between (7/60)² and (7/50)², but no two wheels of 50..60 make 7·7/(a·b) = 1/60
    // (a·b = 2940 has no such pair) within 5 s/day.
    nothing_found(
        &["clock", "going", "--period", "2", "--wheels", "50..60", "--pinions", "7", "--stages", "2", "--rate-tol", "5"],
        "no train meets every constraint. Try a --rate-tol above 5 s/day, more --stages, or wider --wheels and \
         --pinions.",
    );
    // Every stage speeds up by at least 30/8: two overshoot the 1/4 a 30 s period needs, one
    // (8/32) makes it.
    nothing_found(
        &["clock", "going", "--period", "30s", "--stages", "2", "--pinions", "8"],
        "no train meets every constraint. 1/4 is out of reach: 2 stages of these gears make at most \
         0.0711. Try --stages down to 1, or wider --wheels and --pinions.",
    );
    // A pendulum's length gives no exact ratio: only a rate tolerance can help.
    nothing_found(
        &["clock", "going", "--pendulum", "994mm"],
        "no train meets every constraint. A pendulum given by its length beats at no ratio of whole numbers, \
         so no train is exact. Try a --rate-tol above 0 s/day.",
    );
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

#[test]
fn the_eight_day_going_train_runs_with_cycloidal_teeth() {
    // An eight-day longcase going train (common practice, from memory; see the reference
    // values): centre wheel 64 into an 8-leaf pinion, third wheel 60 into 8, a 30-tooth escape
    // wheel and a seconds pendulum. Cut cycloidal, as clock wheels are (BS 978 part 2, from
    // memory), its 8-leaf pinions pass the mesh checks; as 20° involute gears they undercut.
    let args = ["clock", "going", "--period", "2", "--pinions", "8", "--stages", "2", "--limit", "50", "-q"];
    let with = |extra: &[&str]| {
        let mut a = args.to_vec();
        a.extend_from_slice(extra);
        json(&a)
    };
    let (code, v) = with(&["--check-meshes"]);
    assert_eq!(code, 0);
    assert_eq!(v["tooth_form"], "cycloidal");
    let found = trains(&v).iter().find(|t| {
        let mut p = pairs(t);
        p.sort();
        p == [(60, 8), (64, 8)]
    });
    let t = found.expect("64/8 · 60/8 is listed");
    for c in t["cycloidal"].as_array().unwrap() {
        let eps = c["contact_ratio"].as_f64().unwrap();
        assert!(eps > 1.0, "{c}");
        // The wheel drives: the pinion's addendum is the standard's 0.67 m for 8 leaves.
        assert!((c["addendum_mm"][1].as_f64().unwrap() - 0.67 * 0.5).abs() < 1e-12, "{c}");
    }
    let (code, _) = with(&["--tooth-form", "involute"]);
    assert_eq!(code, 1, "8-tooth 20° involute pinions undercut");
}

#[test]
fn going_trains_with_seven_leaf_pinions_are_offered() {
    // Seven- and eight-leaf pinions in a going train (common practice, from memory): with
    // cycloidal teeth a train such as 56/7 · 60/8 is found exact and every mesh runs (an
    // arrangement of the set listed as 60/7 · 56/8).
    let (code, v) = json(&[
        "clock",
        "going",
        "--period",
        "2",
        "--pinions",
        "7..8",
        "--stages",
        "2",
        "--check-meshes",
        "--limit",
        "50",
        "--arrangements",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert!(trains(&v).iter().any(|t| pairs(t).iter().any(|&(_, z)| z == 7)));
    assert!(every_arrangement(&v).iter().any(|t| {
        let mut p = pairs(t);
        p.sort();
        p == [(56, 7), (60, 8)]
    }));
}

#[test]
fn the_classic_motion_work_takes_a_module_per_pair() {
    // A motion work with an 8-leaf minute pinion (common practice, from memory): cannon pinion
    // 12 into a minute wheel of 36, minute pinion 8 into an hour wheel of 32, 3 × 4 = 12.
    // Cycloidal teeth take no shift, so the pairs are made coaxial by their modules:
    // m·(12 + 36) = m'·(8 + 32), m' = 1.2·m. Its set is listed as 12/32 · 8/36, this one among
    // its arrangements.
    let (code, v) = json(&[
        "clock",
        "motion",
        "--pinions",
        "8..12",
        "--wheels",
        "20..48",
        "--limit",
        "100",
        "--arrangements",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["tooth_form"], "cycloidal");
    let listed = trains(&v).iter().find(|t| pairs(t) == [(12, 32), (8, 36)]).expect("the set 12, 8 / 36, 32");
    assert_eq!(listed["arrangements"], 2);
    let t = every_arrangement(&v)
        .into_iter()
        .find(|t| pairs(t) == [(12, 36), (8, 32)])
        .expect("12/36 · 8/32 is listed");
    let s = t["stages"].as_array().unwrap();
    assert_eq!(s[0]["module_mm"], 0.5);
    assert!((s[1]["module_mm"].as_f64().unwrap() - 0.6).abs() < 1e-12);
    let a: Vec<f64> = s.iter().map(|x| x["reference_centre_distance_mm"].as_f64().unwrap()).collect();
    assert!((a[0] - 12.0).abs() < 1e-12 && (a[1] - 12.0).abs() < 1e-12, "{a:?}");
    // As involute gears no pinion of 6 to 9 leaves passes the coaxial mesh checks.
    let (code, _) = json(&["clock", "motion", "--tooth-form", "involute", "--pinions", "6..9", "-q"]);
    assert_eq!(code, 1);
}

#[test]
fn search_checks_cycloidal_meshes_and_refuses_a_shifted_coaxial_fit() {
    let (code, v) = json(&[
        "search",
        "--ratio",
        "8",
        "--teeth",
        "6..64",
        "--stages",
        "1",
        "--tooth-form",
        "cycloidal",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert!(trains(&v).iter().any(|t| pairs(t) == [(8, 64)]));
    // With a strict least contact ratio the small pinions drop out: 8 → 64 keeps about 1.5
    // leaves in action (computed above in geometry::cycloidal's tests), so it goes.
    let (code, v) = json(&[
        "search",
        "--ratio",
        "8",
        "--teeth",
        "6..96",
        "--stages",
        "1",
        "--tooth-form",
        "cycloidal",
        "--min-contact-ratio",
        "1.55",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert!(!trains(&v).is_empty());
    assert!(trains(&v).iter().all(|t| pairs(t)[0].0 >= 9), "{v}");
    let out =
        gearsieve(&["search", "--ratio", "12", "--stages", "2", "--coaxial", "--tooth-form", "cycloidal"]);
    assert_eq!(out.code, 2);
    assert!(out.stderr.contains("--coaxial: cycloidal teeth take no shift"), "{}", out.stderr);
    let out = gearsieve(&["clock", "motion", "--no-undercut"]);
    assert_eq!(out.code, 2);
    assert!(out.stderr.contains("--no-undercut: belongs to involute teeth"), "{}", out.stderr);
}

#[test]
fn an_eight_day_going_train_from_the_great_wheel() {
    // An eight-day longcase (common practice, from memory): the great wheel turns once in 12
    // hours into a centre pinion of 8 (96/8), so 8 days take 16 turns of the barrel; the centre
    // arbor turns once an hour and carries the minute hand; 64/8 · 60/8 to a 30-tooth escape
    // wheel with a seconds pendulum puts the seconds hand on the escape arbor.
    let (code, v) = json(&[
        "clock",
        "going",
        "--period",
        "2",
        "--run",
        "8d",
        "--barrel-turns",
        "16",
        "--pinions",
        "8",
        "--stages",
        "2",
        "--line-barrel",
        "40",
        "--falls",
        "2",
        "--check-meshes",
        "-q",
    ]);
    assert_eq!(code, 0);
    let run = &v["run"];
    assert_eq!(run["run_hours"], 192.0);
    assert_eq!(run["barrel_turns"], 16.0);
    // Computed here: 16 turns of a 40 mm barrel pay out 16·π·40 mm of line; over one pulley the
    // weight drops half of it.
    let drop = 16.0 * std::f64::consts::PI * 0.040 / 2.0;
    assert!((run["drop_m"].as_f64().unwrap() - drop).abs() < 1e-12);
    let great = &v["great_wheel"];
    assert_eq!(great["ratio_needed"], "1/12");
    let gt = &great["trains"][0];
    assert_eq!(pairs(gt), [(96, 8)]);
    let arbors = gt["arbors"].as_array().unwrap();
    assert_eq!(
        (arbors[0]["arbor"].as_str(), arbors[1]["arbor"].as_str()),
        (Some("great wheel"), Some("centre"))
    );
    assert_eq!(arbors[1]["turns_per_hour"], 1.0);
    let t =
        trains(&v).iter().find(|t| pairs(t) == [(64, 8), (60, 8)] || pairs(t) == [(60, 8), (64, 8)]).unwrap();
    assert_eq!(t["seconds_arbor"], "escape");
    assert_eq!(t["arbors"][0]["arbor"], "centre");
}

#[test]
fn every_going_train_keeps_the_centre_arbor_at_one_turn_an_hour() {
    // Starting from a great wheel turning once in 12 hours, the train passes through the centre
    // arbor, which must turn exactly once an hour to carry the minute hand.
    let (code, v) = json(&[
        "clock",
        "going",
        "--period",
        "2",
        "--from-turns-per-hour",
        "1/12",
        "--pinions",
        "8..12",
        "--stages",
        "3",
        "--limit",
        "20",
        "-q",
    ]);
    assert_eq!(code, 0);
    for t in trains(&v) {
        assert_eq!(t["arbors"][0]["arbor"], "centre");
        assert!((t["arbors"][0]["turns_per_hour"].as_f64().unwrap() - 1.0).abs() < 1e-12, "{t}");
        let names: Vec<&str> =
            t["arbors"].as_array().unwrap().iter().map(|a| a["arbor"].as_str().unwrap()).collect();
        assert_eq!(names, ["centre", "third", "fourth", "escape"]);
    }
    for t in v["great_wheel"]["trains"].as_array().unwrap() {
        let p = pairs(t);
        let (num, den) = p.iter().fold((1u64, 1u64), |(n, d), &(w, z)| (n * w, d * z));
        assert_eq!(num, 12 * den, "{p:?}");
    }
    // --from 12h names the same arbor by its time per turn.
    let (_, w) = json(&[
        "clock",
        "going",
        "--period",
        "2",
        "--from",
        "12h",
        "--pinions",
        "8..12",
        "--stages",
        "3",
        "--limit",
        "20",
        "-q",
    ]);
    assert_eq!(v["great_wheel"], w["great_wheel"]);
    assert_eq!(v["trains"], w["trains"]);
}

#[test]
fn beats_per_minute_are_beats_per_hour_over_60() {
    let (_, a) = json(&["clock", "going", "--beats-per-minute", "60", "--limit", "2", "-q"]);
    let (_, b) = json(&["clock", "going", "--period", "2", "--limit", "2", "-q"]);
    assert_eq!(a["beats_per_hour"], 3600.0);
    assert_eq!(a["beats_per_minute"], 60.0);
    assert_eq!(a["trains"], b["trains"]);
    let out = gearsieve(&["clock", "going", "--beats-per-minute", "0"]);
    assert_eq!(out.code, 2);
    assert!(out.stderr.contains("--beats-per-minute: \"0\" is zero"), "{}", out.stderr);
}

#[test]
fn an_eight_day_count_wheel_strike_is_found() {
    // An eight-day count-wheel striking train (common practice, from memory): 78 blows in 12
    // hours, 8 pins, 16 turns of the barrel: great wheel 78 into a pinion of 8 on the pin
    // wheel's arbor, the count wheel of 78 driven by a pinion of 8 on that arbor.
    let (code, v) = json(&["clock", "strike", "--check-meshes", "--limit", "20", "-q"]);
    assert_eq!(code, 0);
    assert_eq!(v["clock_train"], "strike");
    assert_eq!(v["blows_per_12_hours"], 78);
    // Computed here: 8 days = 16 rounds of 12 hours; 78 · 16 blows over 8 pins.
    assert_eq!(v["blows_in_run"], (78 * 16) as f64);
    assert_eq!(v["pin_wheel_turns"], (78 * 16 / 8) as f64);
    let parts = v["parts"].as_array().unwrap();
    let names: Vec<(&str, &str)> =
        parts.iter().map(|p| (p["from_arbor"].as_str().unwrap(), p["to_arbor"].as_str().unwrap())).collect();
    assert_eq!(
        names,
        [
            ("great wheel", "pin wheel"),
            ("pin wheel", "locking wheel"),
            ("locking wheel", "warning wheel"),
            ("warning wheel", "fly"),
            ("pin wheel", "count wheel")
        ]
    );
    assert!(parts[0]["trains"].as_array().unwrap().iter().any(|t| pairs(t) == [(78, 8)]));
    assert!(parts[4]["trains"].as_array().unwrap().iter().any(|t| pairs(t) == [(8, 78)]));
    // The locking wheel turns once a blow: pin wheel teeth over locking pinion = 8 pins.
    for t in parts[1]["trains"].as_array().unwrap() {
        let (w, p) = pairs(t)[0];
        assert_eq!(w, 8 * p);
    }
}

#[test]
fn half_hour_blows_and_a_thirty_hour_run() {
    // 90 blows in 12 hours with the half hours; over 30 hours 225 blows, 225/8 turns of an
    // 8-pin wheel; 5 turns of the barrel: 45/8 turns of the pin wheel a turn of the great wheel.
    let (code, v) = json(&[
        "clock",
        "strike",
        "--half-hours",
        "--run",
        "30h",
        "--barrel-turns",
        "5",
        "--limit",
        "5",
        "-q",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["blows_per_12_hours"], 90);
    assert_eq!(v["blows_in_run"], 225.0);
    assert_eq!(v["parts"][0]["ratio_needed"], "8/45");
    for t in v["parts"][0]["trains"].as_array().unwrap() {
        let p = pairs(t);
        let (num, den) = p.iter().fold((1u64, 1u64), |(n, d), &(w, z)| (n * w, d * z));
        assert_eq!(8 * num, 45 * den, "{p:?}");
    }
    let out = gearsieve(&["clock", "strike", "--pins", "1"]);
    assert_eq!(out.code, 2);
    assert!(out.stderr.contains("--pins: wanted 2 to 30 pins, found 1"), "{}", out.stderr);
    let out = gearsieve(&["clock", "strike", "--stages", "2"]);
    assert_eq!(out.code, 2);
    assert!(out.stderr.contains("--stages: a striking train's parts are one stage each"), "{}", out.stderr);
}

#[test]
fn an_astronomical_dial_lists_each_gear_set_once() {
    // The same wheels paired differently make the same dial: listed once, with their count.
    let (code, v) = common::json(&["clock", "astro", "--period", "synodic-month", "--limit", "60"]);
    assert_eq!(code, 0);
    let trains = v["trains"].as_array().unwrap();
    let mut seen = std::collections::BTreeSet::new();
    let mut total = 0;
    for t in trains {
        let stages = t["stages"].as_array().unwrap();
        let mut drivers: Vec<u64> = stages.iter().map(|s| s["driver"].as_u64().unwrap()).collect();
        let mut driven: Vec<u64> = stages.iter().map(|s| s["driven"].as_u64().unwrap()).collect();
        drivers.sort_unstable();
        driven.sort_unstable();
        assert!(seen.insert((drivers, driven)), "a gear set listed twice: {t}");
        total += t["arrangements"].as_u64().unwrap();
    }
    // Every listed set accounts for at least one train, and no more trains than were counted.
    assert!(total >= trains.len() as u64 && total <= v["count"].as_u64().unwrap());
    assert!(v["gear_set_count"].as_u64().unwrap() <= v["count"].as_u64().unwrap());
}

/// A lower-bound count of an astronomical train lists the same gear sets, arrangement for
/// arrangement, as the exact count, and labels its counts: on 8..40 teeth over three and four
/// stages at 10 ppm the exact count takes a fraction of a second, so both can be run.
#[test]
fn a_lower_bound_count_of_an_astronomical_train_lists_the_exact_count_s_best() {
    let args = [
        "clock",
        "astro",
        "--period",
        "synodic-month",
        "--tol",
        "10ppm",
        "--teeth",
        "8..40",
        "--stages",
        "3..4",
        "--limit",
        "6",
        "--arrangements",
        "-q",
    ];
    let (code, exact) = json(&[&args[..], &["--count", "exact"]].concat());
    assert_eq!(code, 0);
    let (code, lower) = json(&[&args[..], &["--count", "lower-bound"]].concat());
    assert_eq!(code, 0);
    assert_eq!(exact["count_kind"], "exact");
    assert!(exact.get("counted_within").is_none(), "{exact}");
    assert_eq!(lower["count_kind"], "lower_bound");
    // The same sets, each with the same arrangements (teeth, order, count).
    assert_eq!(trains(&lower).len(), 6);
    assert_eq!(trains(&lower), trains(&exact));
    let count = |v: &Value, key: &str| v[key].as_u64().unwrap();
    assert!(count(&lower, "count") <= count(&exact, "count"));
    assert!(count(&lower, "gear_set_count") <= count(&exact, "gear_set_count"));
    // The reach of the count is the last listed train's |error|.
    let last = trains(&lower).last().unwrap()["error"].as_f64().unwrap().abs();
    assert_eq!(lower["counted_within"].as_f64().unwrap(), last);
    // Every train and gear set within that reach was counted: the exact count's full listing
    // has no more of them. (Here the lower bounds, 50 trains of 15 sets, are above the 36 trains
    // of 9 sets that listing has within the reach; both stay below the exact counts.)
    let (code, all) = json(&[&args[..10], &["--limit", "10000", "-q"]].concat());
    assert_eq!(code, 0);
    assert_eq!(trains(&all).len() as u64, count(&exact, "gear_set_count"), "the whole listing");
    let within: Vec<&Value> =
        trains(&all).iter().filter(|t| t["error"].as_f64().unwrap().abs() <= last).collect();
    assert!(within.len() as u64 <= count(&lower, "gear_set_count"));
    let trains_within: u64 = within.iter().map(|t| t["arrangements"].as_u64().unwrap()).sum();
    assert!(trains_within <= count(&lower, "count"));
    // The table says the counts are lower bounds, and within which error.
    let table = gearsieve(&[&args[..], &["--count", "lower-bound"]].concat());
    assert_eq!(table.code, 0, "{}", table.stderr);
    let expected = format!(
        "At least {} trains, made of at least {} gear sets (every train within ±",
        count(&lower, "count"),
        count(&lower, "gear_set_count")
    );
    assert!(table.stdout.contains(&expected), "{}", table.stdout);
    assert!(table.stdout.contains("farther ones not all: --count lower-bound)"), "{}", table.stdout);
    let exact_table = gearsieve(&args);
    assert!(!exact_table.stdout.contains("At least"), "{}", exact_table.stdout);
}

/// Six stages of 8..80 teeth at 0.1 ppm are forecast at many hours for an exact count (about
/// 14 h on two threads of a release build): the refusal offers a lower-bound count, which the
/// window engine serves, and comes at once instead of starting the search.
#[test]
fn a_long_astronomical_search_is_offered_a_lower_bound_count() {
    let args = [
        "clock",
        "astro",
        "--period",
        "synodic-month",
        "--tol",
        "0.1ppm",
        "--teeth",
        "8..80",
        "--stages",
        "6",
        "--threads",
        "2",
    ];
    let start = std::time::Instant::now();
    let r = gearsieve(&args);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(r.stderr.contains("would take") && r.stderr.contains("--long"), "{}", r.stderr);
    assert!(
        r.stderr.contains("list the proven best without counting every train with --count lower-bound"),
        "{}",
        r.stderr
    );
    assert!(r.stdout.is_empty());
    // Refused from the forecast's short sample, not after searching (the forecast's budget is
    // a second; the bound is loose for a busy machine).
    assert!(start.elapsed() < std::time::Duration::from_secs(60), "{:?}", start.elapsed());
}

#[test]
fn astro_count_refusals_name_the_flag() {
    // A listing of every train is not offered by clock commands; with a lower-bound count the
    // limit is still what is refused.
    let r = gearsieve(&[
        "clock",
        "astro",
        "--period",
        "synodic-month",
        "--stages",
        "4",
        "--count",
        "lower-bound",
        "--limit",
        "0",
    ]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert_eq!(r.stderr.trim(), "gearsieve: --limit: list at least one train");
    let r = gearsieve(&["clock", "astro", "--period", "synodic-month", "--count", "roughly"]);
    assert_eq!(r.code, 2, "{}", r.stderr);
    assert!(r.stderr.contains("--count") && r.stderr.contains("roughly"), "{}", r.stderr);
    assert!(r.stderr.contains("exact") && r.stderr.contains("lower-bound"), "{}", r.stderr);
}

mod gear_sets {
    //! The clock's listed gear sets and their arrangement counts against a brute-force grouping
    //! of every train the exhaustive engine finds for the same problem listing trains: grouped
    //! by the multiset of wheels and the multiset of pinions, each group is one set, its size the
    //! set's arrangements; the listed train is the group's first in stage order (stages in order
    //! of ratio, then teeth).

    use std::collections::BTreeMap;

    use gearsieve::model::pool::Pool;
    use gearsieve::model::train::Train;
    use gearsieve::numbers::range::IntRange;
    use gearsieve::numbers::rational::Ratio;
    use gearsieve::trades::clock::beat::{Beat, Escapement, STANDARD_GRAVITY};
    use gearsieve::trades::clock::going::GoingSpec;
    use gearsieve::trades::clock::motion::MotionSpec;
    use gearsieve::trades::clock::part::{MeshCheck, PartPlan};
    use gearsieve::trades::clock::strike::StrikeSpec;
    use gearsieve::{search, EngineChoice, Problem, RunOptions, ToothForm};

    type Teeth = Vec<(u32, u32)>;
    type SetKey = (Vec<u32>, Vec<u32>);

    const EVERY: usize = 100_000;

    fn teeth(t: &Train) -> Teeth {
        t.stages.iter().map(|s| (s.driver.teeth, s.driven.teeth)).collect()
    }

    fn key(t: &Teeth) -> SetKey {
        let mut a: Vec<u32> = t.iter().map(|p| p.0).collect();
        let mut b: Vec<u32> = t.iter().map(|p| p.1).collect();
        a.sort_unstable();
        b.sort_unstable();
        (a, b)
    }

    /// A stage's place in stage order: its ratio (driven/driver, compared exactly), then its
    /// teeth.
    fn stage_order(a: &(u32, u32), b: &(u32, u32)) -> std::cmp::Ordering {
        (a.1 as u64 * b.0 as u64).cmp(&(b.1 as u64 * a.0 as u64)).then(a.cmp(b))
    }

    fn sorted(mut t: Teeth) -> Teeth {
        t.sort_by(stage_order);
        t
    }

    /// Every train of `p` by the exhaustive engine listing trains, grouped by gear set.
    fn brute(p: &Problem) -> BTreeMap<SetKey, Vec<Teeth>> {
        let mut all = p.clone();
        all.gear_sets = false;
        all.limit = EVERY;
        let o = search(&all, EngineChoice::Exhaustive, &RunOptions::default());
        assert_eq!(o.count as usize, o.trains.len(), "the brute force lists every train");
        let mut groups: BTreeMap<SetKey, Vec<Teeth>> = BTreeMap::new();
        for t in &o.trains {
            let tt = sorted(teeth(t));
            groups.entry(key(&tt)).or_default().push(tt);
        }
        groups
    }

    /// Hold one listing (count, sets, each listed set's trains with the listed one first) to the
    /// brute force of `p`; returns how many sets had more than one arrangement.
    fn check(
        what: &str,
        p: &Problem,
        count: u64,
        sets: Option<u64>,
        listed: Vec<(u64, Vec<Teeth>)>,
    ) -> usize {
        let groups = brute(p);
        let trains: usize = groups.values().map(Vec::len).sum();
        assert_eq!(count as usize, trains, "{what}: trains");
        assert_eq!(sets, Some(groups.len() as u64), "{what}: gear sets");
        assert_eq!(listed.len(), groups.len(), "{what}: every set listed once");
        let mut seen = BTreeMap::new();
        for (n, arranged) in &listed {
            let first = arranged[0].clone();
            assert_eq!(first, sorted(first.clone()), "{what}: stages of {first:?} in stage order");
            let group = groups.get(&key(&first)).unwrap_or_else(|| panic!("{what}: {first:?} is no set"));
            assert!(seen.insert(key(&first), ()).is_none(), "{what}: {first:?} listed twice");
            assert_eq!(*n as usize, group.len(), "{what}: arrangements of {first:?}");
            let mut mine: Vec<Teeth> = arranged.iter().cloned().map(sorted).collect();
            let mut theirs = group.clone();
            mine.sort();
            theirs.sort();
            assert_eq!(mine, theirs, "{what}: the arrangements of {first:?}");
            let least = group.iter().min_by(|a, b| {
                a.iter()
                    .zip(b.iter())
                    .map(|(x, y)| stage_order(x, y))
                    .find(|o| o.is_ne())
                    .unwrap_or(std::cmp::Ordering::Equal)
            });
            assert_eq!(Some(&first), least, "{what}: the listed arrangement is the first in stage order");
        }
        groups.values().filter(|g| g.len() > 1).count()
    }

    fn options() -> RunOptions<'static> {
        RunOptions { list_arrangements: true, ..RunOptions::default() }
    }

    fn pool(lo: u32, hi: u32) -> Pool {
        Pool::to_cut(IntRange { lo, hi }, 0.5, 20.0, None).unwrap()
    }

    fn part(what: &str, g: &PartPlan) -> usize {
        let listed = (0..g.trains.len())
            .map(|k| {
                let mut all = vec![teeth(&g.trains[k])];
                all.extend(g.others_of(k).iter().map(|a| teeth(&a.train)));
                (g.arrangements_of(k), all)
            })
            .collect();
        check(what, &g.problem, g.count, g.gear_set_count, listed)
    }

    #[test]
    fn going_train_sets_equal_a_grouping_of_every_train() {
        let mut several = 0;
        for (stages, meshes, tol) in
            [((2, 3), None, 0), ((2, 2), Some(ToothForm::Cycloidal), 2), ((2, 2), None, 5)]
        {
            let spec = GoingSpec {
                beat: Beat::from_period(Ratio::integer(2), STANDARD_GRAVITY).unwrap(),
                escapement: Escapement { teeth: 30, beats_per_tooth: 2 },
                from_turns_per_hour: Ratio::new(1, 12).unwrap(),
                great_stages: IntRange { lo: 1, hi: 2 },
                run_hours: None,
                line_barrel: None,
                pool: pool(6, 64),
                wheels: IntRange { lo: 30, hi: 64 },
                pinions: IntRange { lo: 6, hi: 9 },
                stages: IntRange { lo: stages.0, hi: stages.1 },
                rate_tolerance_s_per_day: Ratio::integer(tol),
                meshes: meshes.map(|tooth_form| MeshCheck { tooth_form, min_contact_ratio: 1.0 }),
                limit: EVERY,
            };
            let plan = spec.plan(&options()).unwrap();
            let listed = plan
                .trains
                .iter()
                .map(|g| {
                    let mut all = vec![teeth(&g.train)];
                    all.extend(g.others.iter().map(|o| teeth(&o.train)));
                    assert!(g.others.iter().all(|o| o.arrangements == g.arrangements && o.others.is_empty()));
                    (g.arrangements, all)
                })
                .collect();
            let what = format!("going {stages:?} {meshes:?} {tol} s/day");
            several += check(&what, &plan.problem, plan.count, plan.gear_set_count, listed);
            let great = plan.great.as_ref().expect("a great wheel part");
            several += part(&format!("{what}, great wheel"), great);
        }
        assert!(several > 10, "the cases hold sets of several arrangements ({several})");
    }

    #[test]
    fn motion_work_sets_count_only_arrangements_that_stay_coaxial() {
        let mut several = 0;
        for (coaxial, form) in
            [(true, ToothForm::Cycloidal), (true, ToothForm::Involute), (false, ToothForm::Cycloidal)]
        {
            let spec = MotionSpec {
                ratio: Ratio::integer(12),
                ratio_text: "12".into(),
                tolerance: Ratio::integer(0),
                pool: pool(6, 48),
                pinions: IntRange { lo: 6, hi: 14 },
                wheels: IntRange { lo: 20, hi: 48 },
                stages: IntRange { lo: if coaxial { 2 } else { 1 }, hi: 2 },
                coaxial,
                tooth_form: form,
                allow_undercut: true,
                min_contact_ratio: 1.0,
                limit: EVERY,
            };
            let plan = spec.plan(&options()).unwrap();
            let listed = (0..plan.trains.len())
                .map(|k| {
                    let mut all = vec![teeth(&plan.trains[k])];
                    all.extend(plan.others_of(k).iter().map(|a| teeth(&a.train)));
                    (plan.arrangements_of(k), all)
                })
                .collect();
            several += check(
                &format!("motion coaxial {coaxial} {form:?}"),
                &plan.problem,
                plan.count,
                plan.gear_set_count,
                listed,
            );
        }
        assert!(several > 10, "the cases hold sets of several arrangements ({several})");
    }

    #[test]
    fn every_part_of_a_striking_train_lists_its_own_sets() {
        let spec = StrikeSpec {
            pins: 8,
            half_hours: false,
            run_hours: Ratio::integer(192),
            barrel_turns: Ratio::integer(16),
            warning_turns: 8,
            fly_turns: 8,
            pool: pool(6, 80),
            wheels: IntRange { lo: 30, hi: 80 },
            pinions: IntRange { lo: 6, hi: 12 },
            great_stages: IntRange { lo: 1, hi: 2 },
            meshes: Some(MeshCheck { tooth_form: ToothForm::Cycloidal, min_contact_ratio: 1.0 }),
            limit: EVERY,
        };
        let plan = spec.plan(&options()).unwrap();
        let several: usize = plan.parts.iter().map(|g| part(&format!("strike {:?}", g.part.arbors), g)).sum();
        assert!(several >= 2, "the great wheel's part holds sets of several arrangements ({several})");
    }
}
