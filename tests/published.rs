//! The main job checked against values published outside the project. Each check names its
//! source beside it (see the project's reference sheet of check values).

mod common;
use common::*;

/// Best train's ratio and the full list of (driver, driven) pairs of single-stage trains.
fn best(args: &[&str]) -> (String, serde_json::Value) {
    let (code, v) = json(args);
    assert_eq!(code, 0, "{args:?}");
    (v["trains"][0]["ratio"].as_str().unwrap().to_string(), v)
}

/// Is a train of these stages listed, as a gear set's best arrangement or (with
/// `--arrangements`) as one of its others?
fn has_train(v: &serde_json::Value, stages: &[(u64, u64)]) -> bool {
    let mut want: Vec<(u64, u64)> = stages.to_vec();
    want.sort();
    let listed = v["trains"].as_array().unwrap().iter();
    let others = listed.clone().flat_map(|t| t["other_arrangements"].as_array().into_iter().flatten());
    listed.chain(others).any(|t| {
        let mut got: Vec<(u64, u64)> = t["stages"]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| (s["driver"].as_u64().unwrap(), s["driven"].as_u64().unwrap()))
            .collect();
        got.sort();
        got == want
    })
}

#[test]
fn convergents_of_pi() {
    // OEIS A002485/A002486 (convergents of π: 3, 22/7, 333/106, 355/113, …) and A072398 (best
    // fraction with denominator ≤ 10ⁿ): with one stage of at most 400 teeth the numerator is at
    // most 400, so the best train is 355/113; with at most 100 teeth it is 22/7.
    let (r, _) = best(&[
        "search", "--ratio", "pi", "--tol", "1%", "--stages", "1", "--teeth", "3..400", "--limit", "1",
    ]);
    assert_eq!(r, "355/113");
    let (r, _) = best(&[
        "search", "--ratio", "pi", "--tol", "1%", "--stages", "1", "--teeth", "3..100", "--limit", "1",
    ]);
    assert_eq!(r, "22/7");
}

#[test]
fn the_inch_is_127_fifths_of_a_millimetre() {
    // 1 inch = 25.4 mm exactly (international yard and pound agreement, 1959), so 25.4 = 127/5
    // and, 127 being prime, an exact inch/metric train needs a 127-tooth gear.
    let (r, v) = best(&["search", "--ratio", "25.4", "--stages", "1", "--teeth", "3..130"]);
    assert_eq!(r, "127/5");
    assert_eq!(v["count"], 1);
    assert_eq!(v["target"]["exact"], "127/5");
    let (code, v) = json(&["search", "--ratio", "127/120", "--stages", "1..3", "--teeth", "20..126"]);
    assert_eq!(code, 1, "no exact train without a 127-tooth gear");
    assert_eq!(v["count"], 0);
}

#[test]
fn metric_thread_on_an_inch_leadscrew() {
    // "Turning and Boring": a 3 mm lead on a lead-screw of 6 threads per inch takes
    // 6·3·5 / (25.4·5) = 90/127: 90 teeth on the spindle stud, 127 on the lead-screw. The
    // spindle turns 127/90 times per lead-screw turn, so i = 127/90 with driver 90, driven 127.
    let (r, v) = best(&["search", "--ratio", "127/90", "--stages", "1", "--teeth", "20..127"]);
    assert_eq!(r, "127/90");
    assert_eq!(v["count"], 1);
    assert!(has_train(&v, &[(90, 127)]));
}

#[test]
fn simple_screw_cutting_wheels() {
    // "American Mechanic": 5 threads per inch on a lead screw of 2 per inch: ratio 2.5; a
    // 40-tooth spindle wheel needs 100 teeth on the screw.
    let (_, v) = best(&["search", "--ratio", "5/2", "--stages", "1", "--teeth", "20..100", "--limit", "100"]);
    assert!(has_train(&v, &[(40, 100)]));
    // "Construction Tools": 2-per-inch screw, 4 per inch wanted → 20 on the mandrel, 40 on the
    // screw; 1½ per inch → 20 → 15 or 40 → 30; 7 per inch on a 1-per-inch screw → 20 and 140.
    let (_, v) = best(&["search", "--ratio", "2", "--stages", "1", "--teeth", "15..140", "--limit", "100"]);
    assert!(has_train(&v, &[(20, 40)]));
    let (_, v) =
        best(&["search", "--ratio", "1.5:2", "--stages", "1", "--teeth", "15..140", "--limit", "100"]);
    assert!(has_train(&v, &[(20, 15)]) && has_train(&v, &[(40, 30)]));
    let (_, v) = best(&["search", "--ratio", "7", "--stages", "1", "--teeth", "20..140", "--limit", "100"]);
    assert!(has_train(&v, &[(20, 140)]));
}

#[test]
fn a_compound_train_when_no_simple_one_exists() {
    // "Construction Tools": 2.3 per inch on a 1.8-per-inch screw with a 20 wheel would need
    // 25.555 teeth — not whole — so a compound train is needed.
    let (code, v) = json(&[
        "search",
        "--ratio",
        "2.3:1.8",
        "--teeth",
        "20..120",
        "--driver-teeth",
        "20",
        "--stages",
        "1",
    ]);
    assert_eq!(code, 1);
    assert_eq!(v["count"], 0);
    // A compound train that keeps the 20 as a driver does exist.
    let (code, v) =
        json(&["search", "--ratio", "2.3:1.8", "--teeth", "20..120", "--stages", "2", "--limit", "100000"]);
    assert_eq!(code, 0);
    let with_20 =
        v["trains"].as_array().unwrap().iter().filter(|t| {
            t["error"] == 0.0 && t["stages"].as_array().unwrap().iter().any(|s| s["driver"] == 20)
        });
    assert!(with_20.count() > 0);
}

#[test]
fn compound_train_for_eleven_per_inch() {
    // "Modern Machine Shop Practice": 4 × 66/48 × 36/18 = 11 threads per inch on a lead screw of
    // 4 per inch (compound train of 66, 48, 36, 18).
    let (_, v) = best(&[
        "search",
        "--ratio",
        "11/4",
        "--stages",
        "2",
        "--teeth",
        "18..66",
        "--limit",
        "100000",
        "--arrangements",
    ]);
    assert!(has_train(&v, &[(48, 66), (18, 36)]));
}

#[test]
fn lunar_month_and_sidereal_day() {
    // Wikipedia, "Lunar calendar": convergents of 29.530589 are 29/1, 30/1, 59/2, 443/15, 502/17,
    // 1447/49. Input precision here: 29.530588 (the 1911 encyclopaedia's synodic month), whose
    // convergents agree up to 1447/49. With one stage of at most 500 teeth the best is 443/15.
    let (r, _) = best(&[
        "search",
        "--ratio",
        "29.530588",
        "--tol",
        "1%",
        "--stages",
        "1",
        "--teeth",
        "3..500",
        "--limit",
        "1",
    ]);
    assert_eq!(r, "443/15");
    // Wikipedia, "Sidereal time": the mean solar day is 1.002737909350795 sidereal days;
    // convergents of 1.00273790935 (computed): 366/365, 1465/1461 … With teeth ≤ 1000, one stage:
    // 366/365.
    let (r, _) = best(&[
        "search",
        "--ratio",
        "1.00273790935",
        "--tol",
        "1%",
        "--stages",
        "1",
        "--teeth",
        "3..1000",
        "--limit",
        "1",
    ]);
    assert_eq!(r, "366/365");
}
