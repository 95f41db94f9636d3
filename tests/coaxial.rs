//! Coaxial (reverted) trains take their common centre distance from the whole interval where
//! every stage runs, and gears on hand keep the shift they were cut with.

mod common;

use common::{gearsieve, json};
use gearsieve::geometry::{check_mesh, shift_for_centre_distance, MeshLimits, RackProfile, ToothSystem};

/// Every two-stage 12:1 train of pinions `pinions` and wheels `wheels` (each stage a pinion
/// driving a wheel), judged by brute force: the pair runs when some working centre distance on
/// a 1 µm grid suits both stages within the default shift-sum range (−0.5..1.0) and limits.
fn brute_force_motion_work(
    module_mm: f64,
    pinions: std::ops::RangeInclusive<u32>,
    wheels: std::ops::RangeInclusive<u32>,
    limits: &MeshLimits,
) -> Vec<[u32; 4]> {
    let sys = ToothSystem::new(module_mm, 20.0, RackProfile::default()).unwrap();
    let range = -0.5..=1.0;
    let runs = |t: [u32; 2], a: f64| {
        shift_for_centre_distance(&sys, t, a, &range).is_ok_and(|m| check_mesh(&m, limits).is_empty())
    };
    let mut found = Vec::new();
    for p1 in pinions.clone() {
        for w1 in wheels.clone() {
            for p2 in pinions.clone() {
                for w2 in wheels.clone() {
                    // Canonical order as the search lists a train: stages by ascending ratio.
                    if (w1 * w2) != 12 * p1 * p2 || (w1 * p2, p1) > (w2 * p1, p2) {
                        continue;
                    }
                    let (t1, t2) = ([p1, w1], [p2, w2]);
                    let lo = sys
                        .centre_distance_for_shift_sum(t1, -0.5)
                        .unwrap()
                        .max(sys.centre_distance_for_shift_sum(t2, -0.5).unwrap());
                    let hi = sys
                        .centre_distance_for_shift_sum(t1, 1.0)
                        .unwrap()
                        .min(sys.centre_distance_for_shift_sum(t2, 1.0).unwrap());
                    let steps = ((hi - lo) / 0.001).ceil().max(0.0) as u32;
                    if (0..=steps).any(|k| {
                        let a = lo + (hi - lo) * f64::from(k) / f64::from(steps.max(1));
                        runs(t1, a) && runs(t2, a)
                    }) {
                        found.push([p1, w1, p2, w2]);
                    }
                }
            }
        }
    }
    found
}

#[test]
fn motion_work_uses_the_whole_common_interval() {
    // The motion work as involute gears at module 0.5, pinions of 10 leaves or more, no
    // undercut, least contact ratio 1 (the clock default).
    let limits = MeshLimits { min_contact_ratio: 1.0, allow_undercut: false, ..MeshLimits::default() };
    let expected = brute_force_motion_work(0.5, 10..=20, 20..=96, &limits);
    let (code, v) = json(&[
        "clock",
        "motion",
        "--tooth-form",
        "involute",
        "--pinions",
        "10..20",
        "--no-undercut",
        "--limit",
        "100",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["count"].as_u64().unwrap() as usize, expected.len(), "brute force: {expected:?}");
    let mut listed: Vec<[u32; 4]> = v["trains"]
        .as_array()
        .unwrap()
        .iter()
        .map(|t| {
            let s = t["stages"].as_array().unwrap();
            let n = |i: usize, k: &str| s[i][k].as_u64().unwrap() as u32;
            [n(0, "driver"), n(0, "driven"), n(1, "driver"), n(1, "driven")]
        })
        .collect();
    // Every listed train sits at one distance where both stages run.
    for t in v["trains"].as_array().unwrap() {
        let s = t["stages"].as_array().unwrap();
        let a0 = s[0]["working_centre_distance_mm"].as_f64().unwrap();
        assert!((a0 - s[1]["working_centre_distance_mm"].as_f64().unwrap()).abs() < 1e-9);
        for st in s {
            assert!(st["contact_ratio"].as_f64().unwrap() >= 1.0);
        }
    }
    let canon =
        |t: [u32; 4]| if (t[1] * t[2], t[0]) > (t[3] * t[0], t[2]) { [t[2], t[3], t[0], t[1]] } else { t };
    listed = listed.into_iter().map(canon).collect();
    let mut expected: Vec<[u32; 4]> = expected.into_iter().map(canon).collect();
    listed.sort();
    expected.sort();
    assert_eq!(listed, expected);
    // The pair that motivated the change: 12→36 with 10→40 near 12.4 mm.
    assert!(listed.contains(&[12, 36, 10, 40]) || listed.contains(&[10, 40, 12, 36]));
}

#[test]
fn a_misfit_names_the_stages_windows() {
    // At a tight shift-sum range most 12:1 pairs share no distance; the explanation gives the
    // distances at which each stage runs.
    let r = gearsieve(&[
        "search",
        "--ratio",
        "12",
        "--teeth",
        "10..48",
        "--module",
        "0.5",
        "--stages",
        "2",
        "--driver-teeth",
        "10..16",
        "--coaxial",
        "--shift-sum",
        "0..0.3",
        "--explain",
    ]);
    let all = format!("{}{}", r.stdout, r.stderr);
    assert!(all.contains("share no centre distance"), "{all}");
    assert!(all.contains(" mm"), "{all}");
}

#[test]
fn shelf_gears_are_not_reshifted() {
    // Two stages of standard gears on hand at module 2: a 14-tooth pinion cut without shift
    // undercuts at 20° (z_min = 2/sin²20° ≈ 17.1, ISO 21771 relation; common practice: 17), so
    // with mesh checks no train uses it, and without them the listing says so.
    let dir = std::env::temp_dir().join(format!("gearsieve-shelf-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let csv = dir.join("shelf.csv");
    std::fs::write(&csv, "teeth,module,quantity\n14,2,1\n20,2,1\n42,2,1\n60,2,1\n").unwrap();
    let path = csv.to_str().unwrap();
    let (code, v) = json(&["search", "--ratio", "3", "--stock", path, "--stages", "1"]);
    assert_eq!(code, 0);
    let trains = v["trains"].as_array().unwrap();
    let with_14 = trains.iter().find(|t| t["stages"][0]["driver"] == 14).expect("14→42 listed");
    let defects = with_14["stages"][0]["on_hand_defects"].as_array().expect("defects listed");
    assert!(defects.iter().any(|d| d.as_str().unwrap().contains("undercut")), "{defects:?}");
    let with_20 = trains.iter().find(|t| t["stages"][0]["driver"] == 20).expect("20→60 listed");
    assert!(with_20["stages"][0].get("on_hand_defects").is_none());
    // With mesh checks the 14-tooth pinion is left out, and no shift is given to a shelf gear.
    let (code, v) = json(&["search", "--ratio", "3", "--stock", path, "--stages", "1", "--check-meshes"]);
    assert_eq!(code, 0);
    for t in v["trains"].as_array().unwrap() {
        assert_ne!(t["stages"][0]["driver"], 14);
        assert_eq!(t["stages"][0]["shift"], serde_json::json!([0.0, 0.0]));
    }
    // A shelf gear cut with a shift keeps it: a 14-tooth pinion cut at x = +0.2 is clear.
    std::fs::write(&csv, "teeth,module,quantity,shift\n14,2,1,0.2\n42,2,1,0\n").unwrap();
    let (code, v) = json(&["search", "--ratio", "3", "--stock", path, "--stages", "1", "--check-meshes"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["trains"][0]["stages"][0]["shift"], serde_json::json!([0.2, 0.0]));
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_reducer_shelf_case_shifts_no_gear_on_hand() {
    // The case that showed shelf gears given shifts (15 teeth x +0.123, 14 teeth x +0.181):
    // now every listed gear keeps x = 0, and no undercut 14- or 15-tooth pinion runs.
    let args = [
        "search",
        "--ratio",
        "37.5",
        "--tol",
        "0.5%",
        "--stock",
        "catalogs/reducer-stock.csv",
        "--stages",
        "3",
    ];
    let (code, v) = json(&[&args[..], &["--check-meshes", "--limit", "50"]].concat());
    assert_eq!(code, 0);
    assert!(v["count"].as_u64().unwrap() > 0);
    for t in v["trains"].as_array().unwrap() {
        for s in t["stages"].as_array().unwrap() {
            assert_eq!(s["shift"], serde_json::json!([0.0, 0.0]), "{s}");
            assert!(s["driver"].as_u64().unwrap() >= 17, "{s}");
        }
    }
    // Without mesh checks the trains with those pinions are listed, and say what is wrong.
    let (_, v) = json(&[&args[..], &["--limit", "200"]].concat());
    let flagged = v["trains"]
        .as_array()
        .unwrap()
        .iter()
        .flat_map(|t| t["stages"].as_array().unwrap().iter())
        .filter(|s| s["driver"].as_u64().unwrap() <= 15)
        .inspect(|s| {
            let d = s["on_hand_defects"].as_array().expect("defects of an undercut shelf pinion");
            assert!(d.iter().any(|x| x.as_str().unwrap().contains("undercut")));
        })
        .count();
    assert!(flagged > 0);
}

#[test]
fn gears_on_hand_at_a_fixed_distance_stand_apart_within_the_tolerance_and_say_the_backlash() {
    // Standard 20 and 60 teeth at module 1 mesh tight at 40 mm (a = m(z1 + z2)/2). At 40.2 mm
    // with 0.3 mm allowed they run, unshifted, with backlash; at 40.4 mm they are refused.
    let args = [
        "search",
        "--ratio",
        "3",
        "--stock",
        "catalogs/reducer-stock.csv",
        "--stages",
        "1",
        "--tol",
        "3%",
        "--check-meshes",
        "--centre-tol",
        "0.3",
    ];
    let (code, v) = json(&[&args[..], &["--centre-distance", "40.2"]].concat());
    assert_eq!(code, 0);
    let s = &v["trains"][0]["stages"][0];
    assert_eq!((s["driver"].as_u64(), s["driven"].as_u64()), (Some(20), Some(60)));
    assert_eq!(s["shift"], serde_json::json!([0.0, 0.0]));
    let j = s["backlash_mm"].as_f64().unwrap();
    let alpha_w = s["working_pressure_angle_deg"].as_f64().unwrap().to_radians();
    let inv = |a: f64| a.tan() - a;
    // Circumferential backlash on the working pitch circles of unshifted gears pulled apart:
    // the working pitch p_w less both tooth thicknesses s_w = d_w·(π/(2z) + inv α − inv α_w)
    // (ISO 21771's tooth thickness on a circle) leaves j = 2·a_w·(inv α_w − inv α).
    let expected = 2.0 * 40.2 * (inv(alpha_w) - inv(20f64.to_radians()));
    assert!((j - expected).abs() < 1e-6, "{j} vs {expected}");
    let (code, _) = json(&[&args[..], &["--centre-distance", "40.4"]].concat());
    assert_eq!(code, 1);
}

#[test]
fn a_reducer_housing_takes_gears_on_hand_as_they_are() {
    // A 15-tooth pinion on the shelf cut with x = +0.3 and a standard 45-tooth wheel, module 2,
    // mesh tight at 60.580 mm (ISO 21771: inv α_w = inv α + 2·tan α·Σx/Σz). A housing bored at
    // 60.585 mm takes them as they are; shifting them to fit, as gears to cut would be, is
    // not allowed.
    let dir = std::env::temp_dir().join(format!("gearsieve-housing-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let csv = dir.join("shelf.csv");
    std::fs::write(&csv, "teeth,module,quantity,shift\n15,2,1,0.3\n45,2,1,0\n").unwrap();
    let (code, v) = json(&[
        "reducer",
        "--ratio",
        "3",
        "--stages",
        "1",
        "--modules",
        "2",
        "--stock",
        csv.to_str().unwrap(),
        "--centre-distances",
        "60.585",
        "--tol",
        "1%",
    ]);
    assert_eq!(code, 0, "{v}");
    let s = &v["trains"][0]["stages"][0];
    assert_eq!(s["shift"], serde_json::json!([0.3, 0.0]));
    assert_eq!(s["working_centre_distance_mm"], 60.585);
    // 0.3 mm further out is beyond the centre-distance tolerance for gears on hand.
    let (code, _) = json(&[
        "reducer",
        "--ratio",
        "3",
        "--stages",
        "1",
        "--modules",
        "2",
        "--stock",
        csv.to_str().unwrap(),
        "--centre-distances",
        "60.9",
        "--tol",
        "1%",
    ]);
    assert_eq!(code, 1);
    let _ = std::fs::remove_dir_all(&dir);
}
