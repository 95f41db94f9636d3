//! The search with mesh geometry: fixed centre distances reached by profile shift, coaxial
//! (reverted) trains, the mesh checks and `--explain`, run through the real binary.

mod common;
use common::*;

fn stages(v: &serde_json::Value) -> Vec<&serde_json::Value> {
    v["trains"].as_array().unwrap().iter().flat_map(|t| t["stages"].as_array().unwrap()).collect()
}

#[test]
fn a_fixed_centre_distance_is_reached_by_profile_shift() {
    let (code, v) = json(&[
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
        "50",
    ]);
    assert_eq!(code, 0);
    let all = stages(&v);
    assert!(!all.is_empty());
    for s in all {
        let aw = s["working_centre_distance_mm"].as_f64().unwrap();
        assert!((aw - 75.0).abs() < 1e-9, "{s}");
        let x = s["shift"].as_array().unwrap();
        let sum = x[0].as_f64().unwrap() + x[1].as_f64().unwrap();
        assert!((-0.5 - 1e-12..=1.0 + 1e-12).contains(&sum), "{s}");
        assert!(s["contact_ratio"].as_f64().unwrap() >= 1.2);
        // A stage already at 75 mm (z1 + z2 = 100 at module 1.5) with no undercut needs no shift.
        if s["driver"].as_u64().unwrap() + s["driven"].as_u64().unwrap() == 100
            && s["driver"].as_u64().unwrap() >= 18
        {
            assert_eq!(x[0].as_f64().unwrap(), 0.0);
            assert_eq!(x[1].as_f64().unwrap(), 0.0);
        }
    }
}

#[test]
fn coaxial_trains_share_one_centre_distance() {
    // Motion work of a clock: 12:1 from the minute (cannon) arbor to the hour wheel, coaxial —
    // a reverted train (common practice; Wikipedia, "Wheel train").
    let args = [
        "search",
        "--ratio",
        "12",
        "--teeth",
        "8..80",
        "--module",
        "0.5",
        "--stages",
        "2",
        "--driver-teeth",
        "8..16",
        "--limit",
        "1000",
    ];
    let (code, free) = json(&args);
    assert_eq!(code, 0);
    let (code, v) = json(&[&args[..], &["--coaxial"]].concat());
    assert_eq!(code, 0);
    let n = v["count"].as_u64().unwrap();
    assert!(n > 0 && n < free["count"].as_u64().unwrap());
    for t in v["trains"].as_array().unwrap() {
        let st = t["stages"].as_array().unwrap();
        assert_eq!(st.len(), 2);
        let a0 = st[0]["working_centre_distance_mm"].as_f64().unwrap();
        let a1 = st[1]["working_centre_distance_mm"].as_f64().unwrap();
        assert!((a0 - a1).abs() < 1e-9, "{t}");
        assert_eq!(t["error"], 0.0);
    }
}

#[test]
fn undercut_pinions_are_rejected_and_explained() {
    let r = gearsieve(&[
        "search",
        "--ratio",
        "5",
        "--teeth",
        "8..60",
        "--stages",
        "1",
        "--check-meshes",
        "--shift-sum",
        "0..0",
        "--explain",
    ]);
    assert_eq!(r.code, 0, "{}", r.stderr);
    assert!(r.stdout.contains("Left out by the mesh checks"), "{}", r.stdout);
    let (_, v) = json(&[
        "search",
        "--ratio",
        "5",
        "--teeth",
        "8..60",
        "--stages",
        "1",
        "--check-meshes",
        "--limit",
        "100",
    ]);
    // With a standard rack at 20°, a pinion below 17.1 teeth needs positive shift; at a zero shift
    // sum the wheel gives it up, so small pinions survive only where the wheel can afford it.
    for s in stages(&v) {
        let x = s["shift"].as_array().unwrap();
        assert!((x[0].as_f64().unwrap() + x[1].as_f64().unwrap()).abs() < 1e-12);
    }
    let rejected = v["rejected"].as_array();
    assert!(rejected.is_none_or(|r| r.iter().all(|x| x["count"].as_u64().unwrap() > 0)));
}

#[test]
fn geometry_flags_are_checked() {
    for (args, want) in [
        (vec!["search", "--ratio", "12", "--stages", "1", "--coaxial"], "--coaxial"),
        (vec!["search", "--ratio", "12", "--explain"], "--explain"),
        (vec!["search", "--ratio", "12", "--shift-sum", "1..-1"], "--shift-sum"),
        (vec!["search", "--ratio", "12", "--shift-sum", "x"], "--shift-sum"),
        (vec!["search", "--ratio", "12", "--centre-distance", "-5"], "--centre-distance"),
        (
            vec!["search", "--ratio", "12", "--check-meshes", "--min-contact-ratio", "-1"],
            "--min-contact-ratio",
        ),
    ] {
        let r = gearsieve(&args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert!(r.stderr.contains(want), "{args:?}: {}", r.stderr);
    }
}
