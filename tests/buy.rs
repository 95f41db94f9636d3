//! Gears to buy (`--buy N`): on small random catalogues the trains found with up to N gears
//! bought, and the number each needs, equal a brute force that adds every multiset of up to N
//! gears of the buy range to the catalogue, runs the plain exhaustive search on each, and takes
//! for each train the fewest gears added that make it (the sieve, which prunes on the budget, on
//! its own too); a lathe whose shelf has no idler that reaches buys one; the real binary on the
//! shipped catalogue without the 127-tooth gear names the 127; bad input names the flag.

mod common;

use std::collections::BTreeMap;

use common::{gearsieve, json, temp_catalogue};
use gearsieve::model::pool::{Pool, StockGear};
use gearsieve::model::purchase::Purchase;
use gearsieve::model::rank::DEFAULT_RANK;
use gearsieve::model::train::Train;
use gearsieve::numbers::range::IntRange;
use gearsieve::numbers::rational::Ratio;
use gearsieve::numbers::target::Target;
use gearsieve::{search, EngineChoice, Problem, RunOptions, StageLimits};
use proptest::prelude::*;

const NO127: &str = "catalogs/lathe-change-gears-no127.csv";

/// A train by its stages' teeth, sorted: the same train whichever pool it was found in.
fn key(t: &Train) -> Vec<(u32, u32)> {
    let mut k: Vec<(u32, u32)> = t.stages.iter().map(|s| (s.driver.teeth, s.driven.teeth)).collect();
    k.sort_unstable();
    k
}

fn problem(pool: Pool, target: Ratio, tol: Ratio, stages: IntRange, limit: usize) -> Problem {
    let target = Target::exact(target.to_string(), target, tol);
    Problem::new(target, pool, stages, StageLimits::default(), None, DEFAULT_RANK.to_vec(), limit).unwrap()
}

/// Every multiset of at most `most` tooth counts of `range`, as sorted lists.
fn multisets(range: IntRange, most: u32) -> Vec<Vec<u32>> {
    let mut out = vec![Vec::new()];
    let mut last = vec![Vec::new()];
    for _ in 0..most {
        let mut next = Vec::new();
        for m in &last {
            let from = m.last().copied().unwrap_or(range.lo);
            for t in from..=range.hi {
                let mut n = m.clone();
                n.push(t);
                next.push(n);
            }
        }
        out.extend(next.iter().cloned());
        last = next;
    }
    out
}

/// The brute force: for each train some addition makes possible, the fewest gears added.
fn brute(
    shelf: &[StockGear],
    range: IntRange,
    most: u32,
    target: Ratio,
    tol: Ratio,
    stages: IntRange,
) -> BTreeMap<Vec<(u32, u32)>, u32> {
    let mut best: BTreeMap<Vec<(u32, u32)>, u32> = BTreeMap::new();
    for added in multisets(range, most) {
        let mut stock = shelf.to_vec();
        stock.extend(added.iter().map(|&t| StockGear::on_hand(t, 1.0, 20.0, 1)));
        let Ok(pool) = Pool::from_stock(&stock, "brute") else { continue };
        let p = problem(pool, target, tol, stages, 100_000);
        for t in search(&p, EngineChoice::Exhaustive, &RunOptions::default()).trains {
            let n = added.len() as u32;
            best.entry(key(&t)).and_modify(|b| *b = (*b).min(n)).or_insert(n);
        }
    }
    best
}

fn shelf_strategy() -> impl Strategy<Value = Vec<StockGear>> {
    prop::collection::vec((10u32..24, 1u32..3), 2..7)
        .prop_map(|g| g.into_iter().map(|(t, q)| StockGear::on_hand(t, 1.0, 20.0, q)).collect())
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]

    #[test]
    fn buying_equals_every_addition_searched(
        shelf in shelf_strategy(),
        (lo, width) in (10u32..24, 0u32..4),
        most in 1u32..3,
        (a, b, c, d) in (10u64..28, 10u64..28, 10u64..28, 10u64..28),
        tol_ppm in prop_oneof![2 => Just(0u128), 1 => 1u128..20_000],
        hi_stages in 1u32..3,
        limit in 1usize..6,
    ) {
        let Ok(on_hand) = Pool::from_stock(&shelf, "random") else { return Ok(()) };
        let range = IntRange { lo, hi: lo + width };
        let stages = IntRange { lo: 1, hi: hi_stages };
        // A ratio of tooth products, so exact hits are common.
        let Some(target) = Ratio::new((a * b) as u128, (c * d) as u128) else { return Ok(()) };
        let tol = Ratio::new(tol_ppm, 1_000_000).unwrap();
        let purchase = Purchase::new(on_hand.clone(), most, Some(range), None).unwrap();
        let all = problem(on_hand.clone(), target, tol, stages, 100_000).with_purchase(purchase.clone()).unwrap();
        let found = search(&all, EngineChoice::Auto, &RunOptions::default());
        let got: BTreeMap<Vec<(u32, u32)>, u32> =
            found.trains.iter().map(|t| (key(t), purchase.count(t))).collect();
        prop_assert_eq!(got.len(), found.trains.len(), "each train found once");
        let want = brute(&shelf, range, most, target, tol, stages);
        prop_assert_eq!(&got, &want);
        prop_assert_eq!(found.count, want.len() as u64);
        // The sieve alone, which cuts a branch once its gears bought pass the budget, finds the
        // same trains (the default may hand exact targets to a bulk engine).
        let sieved = search(&all, EngineChoice::Sieve, &RunOptions::default());
        let by_sieve: BTreeMap<Vec<(u32, u32)>, u32> =
            sieved.trains.iter().map(|t| (key(t), purchase.count(t))).collect();
        prop_assert_eq!(&by_sieve, &want);
        prop_assert_eq!(sieved.count, want.len() as u64);
        // Listed fewest to buy first, and a short list is the head of the whole one.
        let counts: Vec<u32> = found.trains.iter().map(|t| purchase.count(t)).collect();
        prop_assert!(counts.windows(2).all(|w| w[0] <= w[1]), "{:?}", counts);
        let short = problem(on_hand, target, tol, stages, limit).with_purchase(purchase.clone()).unwrap();
        let head = search(&short, EngineChoice::Auto, &RunOptions::default());
        prop_assert_eq!(head.count, found.count);
        let n = limit.min(found.trains.len());
        prop_assert_eq!(&head.trains[..], &found.trains[..n]);
    }
}

#[test]
fn search_names_the_127_on_the_catalogue_without_it() {
    let plain = gearsieve(&["search", "--ratio", "127/60", "--stock", NO127, "--stages", "1..2"]);
    assert_eq!(plain.code, 1, "no exact 127/60 without a 127: {}", plain.stdout);
    let (code, v) = json(&[
        "search",
        "--ratio",
        "127/60",
        "--stock",
        NO127,
        "--stages",
        "1..2",
        "--buy",
        "1",
        "--buy-teeth",
        "20..127",
    ]);
    assert_eq!(code, 0);
    assert_eq!(v["buy"], "up to 1 gear of 20..127 teeth, module 1.5 mm, 20°, cut standard");
    assert_eq!(v["ranked_by"][0], "to_buy");
    let trains = v["trains"].as_array().unwrap();
    assert!(!trains.is_empty());
    for t in trains {
        // Exact, and every one needs the 127 bought: nothing else makes 127/60.
        assert_eq!(t["ratio"], "127/60");
        assert_eq!(t["to_buy"], serde_json::json!([{"teeth": 127, "module_mm": 1.5, "count": 1}]), "{t}");
    }
    // The best by hand: 60 → 127 is 127/60, the 60 on hand and the 127 bought.
    assert_eq!(trains[0]["stages"][0]["driver"], 60);
    assert_eq!(trains[0]["stages"][0]["driven"], 127);
}

#[test]
fn trains_from_the_shelf_rank_before_those_that_need_gears_bought() {
    let (code, v) = json(&[
        "search",
        "--ratio",
        "127/60",
        "--tol",
        "1e-3",
        "--stock",
        NO127,
        "--stages",
        "1..2",
        "--buy",
        "1",
        "--buy-teeth",
        "20..127",
        "--limit",
        "40",
    ]);
    assert_eq!(code, 0);
    let counts: Vec<u64> = v["trains"]
        .as_array()
        .unwrap()
        .iter()
        .map(|t| t["to_buy"].as_array().unwrap().iter().map(|b| b["count"].as_u64().unwrap()).sum())
        .collect();
    assert!(counts.windows(2).all(|w| w[0] <= w[1]), "{counts:?}");
    assert_eq!(counts.first(), Some(&0), "something on the shelf is within 0.1%");
    assert!(counts.contains(&1), "{counts:?}");
}

#[test]
fn thread_names_the_127_for_a_metric_pitch_on_an_inch_leadscrew() {
    let args = [
        "thread",
        "--pitch",
        "1.5mm",
        "--leadscrew",
        "8tpi",
        "--stock",
        NO127,
        "--banjo",
        "catalogs/lathe/brackenfold.banjo",
        "--tol",
        "0",
    ];
    assert_eq!(gearsieve(&args).code, 1, "no exact 1.5 mm from an 8 tpi leadscrew without a 127");
    let mut with = args.to_vec();
    with.extend(["--buy", "1"]);
    let (code, v) = json(&with);
    assert_eq!(code, 0);
    let setups = v["trains"].as_array().unwrap();
    assert!(!setups.is_empty());
    for s in setups {
        assert_eq!(s["exact_pitch"], true);
        assert_eq!(s["to_buy"], serde_json::json!([{"teeth": 127, "module_mm": 1.5, "count": 1}]), "{s}");
    }
    // 8 tpi is 3.175 mm; 40/20 × 30/127 of it is 3.175 × 1200/2540 = 1.5 mm (worked by hand).
    let table = gearsieve(&with);
    assert!(table.stdout.contains("To buy: up to 1 gear of 20..127 teeth"), "{}", table.stdout);
    assert!(table.stdout.contains("1 × 127"), "{}", table.stdout);
    let csv = gearsieve(&[&with[..], &["--format", "csv"]].concat());
    let head = csv.stdout.lines().next().unwrap();
    assert!(head.contains(",to_buy_count,to_buy,"), "{head}");
}

#[test]
fn thread_buys_the_idler_a_shelf_lacks() {
    // 20 → 40 from an 8 tpi leadscrew cuts 16 tpi (3.175 × 20/40 = 1.5875 mm, worked by hand).
    // The stud and leadscrew gears sit 120 mm apart, so a simple train needs an idler, and the
    // only spare gear on this shelf, a 25, reaches 1.5 × (20 + 25)/2 + 1.5 × (25 + 40)/2 = 82.5 mm,
    // short of 120.
    let (_dir, shelf) = temp_catalogue(
        "shelf.csv",
        b"teeth,module,pressure_angle,quantity\n20,1.5,20,1\n25,1.5,20,1\n40,1.5,20,1\n",
    );
    let args = [
        "thread",
        "--pitch",
        "16tpi",
        "--leadscrew",
        "8tpi",
        "--stock",
        &shelf,
        "--banjo",
        "catalogs/lathe/brackenfold.banjo",
        "--stages",
        "1",
        "--tol",
        "0",
    ];
    assert_eq!(gearsieve(&args).code, 1, "no idler on the shelf reaches");
    let mut with = args.to_vec();
    with.extend(["--buy", "1", "--buy-teeth", "20..127", "--limit", "50"]);
    let (code, v) = json(&with);
    assert_eq!(code, 0);
    let setups = v["trains"].as_array().unwrap();
    let teeth_at = |s: &serde_json::Value, at: &str| {
        s["positions"]
            .as_array()
            .unwrap()
            .iter()
            .find(|p| p["position"] == at)
            .map(|p| p["teeth"].as_u64().unwrap())
    };
    let through_bought: Vec<&serde_json::Value> = setups
        .iter()
        .filter(|s| teeth_at(s, "stud") == Some(20) && teeth_at(s, "leadscrew") == Some(40))
        .collect();
    assert_eq!(through_bought.len(), 1, "{setups:?}");
    let s = through_bought[0];
    let idler = teeth_at(s, "idler").expect("set up through an idler");
    assert!(![20, 25, 40].contains(&idler), "the idler is not one of the shelf's: {s}");
    assert_eq!(s["to_buy"], serde_json::json!([{"teeth": idler, "module_mm": 1.5, "count": 1}]), "{s}");
    // Every setup through an idler the shelf cannot spare names it among the gears to buy,
    // and none needs more than the one gear allowed.
    for s in setups {
        let bought: Vec<u64> =
            s["to_buy"].as_array().unwrap().iter().map(|b| b["teeth"].as_u64().unwrap()).collect();
        let count: u64 = s["to_buy"].as_array().unwrap().iter().map(|b| b["count"].as_u64().unwrap()).sum();
        assert!(count <= 1, "{s}");
        if let Some(z) = teeth_at(s, "idler") {
            let on_shelf_spare = [20, 25, 40].contains(&z)
                && teeth_at(s, "stud") != Some(z)
                && teeth_at(s, "leadscrew") != Some(z);
            assert!(on_shelf_spare || bought.contains(&z), "idler {z} not on hand and not bought: {s}");
        }
    }
}

#[test]
fn thread_lists_setups_on_hand_first() {
    let (code, v) = json(&[
        "thread",
        "--pitch",
        "1.5mm",
        "--leadscrew",
        "8tpi",
        "--stock",
        NO127,
        "--buy",
        "1",
        "--limit",
        "30",
    ]);
    assert_eq!(code, 0);
    let counts: Vec<usize> =
        v["trains"].as_array().unwrap().iter().map(|s| s["to_buy"].as_array().unwrap().len()).collect();
    assert_eq!(counts.first(), Some(&0), "within 0.1% from the shelf");
    assert!(counts.windows(2).all(|w| w[0] <= w[1]), "{counts:?}");
}

#[test]
fn bad_input_names_the_flag() {
    let cases: &[(&[&str], &str)] = &[
        (
            &["search", "--ratio", "2", "--teeth", "20..40", "--buy", "1"],
            "--buy: adds gears to buy to the gears on hand; give them with --stock",
        ),
        (
            &["search", "--ratio", "2", "--stock", NO127, "--buy", "1", "--buy-teeth", "20..x"],
            "--buy-teeth: \"x\" is not a whole number",
        ),
        (
            &["search", "--ratio", "2", "--stock", NO127, "--buy", "1", "--buy-teeth", "2..40"],
            "--buy-teeth: 2 is out of range",
        ),
        (
            &["search", "--ratio", "2", "--stock", NO127, "--buy", "1", "--buy-module", "2"],
            "--buy-module: no gear on hand is of module 2 mm",
        ),
        (
            &[
                "search",
                "--ratio",
                "2",
                "--stock",
                NO127,
                "--stock",
                "catalogs/clock-blanks.csv",
                "--buy",
                "1",
            ],
            "--buy-module: the gears on hand are of modules",
        ),
        (&["search", "--ratio", "2", "--stock", NO127, "--buy", "0"], "--buy: wanted 1 or more gears to buy"),
        (
            &["search", "--ratio", "2", "--stock", NO127, "--buy", "1", "--pareto"],
            "--buy: ranks trains by the gears they need bought first",
        ),
        (
            &["search", "--ratio", "2", "--stock", NO127, "--buy", "1", "--limit", "0", "--format", "csv"],
            "--limit: 0 streams every train",
        ),
        (
            &["thread", "--pitch", "1.5mm", "--leadscrew", "8tpi", "--teeth", "20..60", "--buy", "1"],
            "--buy: adds gears to buy to the gears on hand",
        ),
    ];
    for (args, want) in cases {
        let r = gearsieve(args);
        assert_eq!(r.code, 2, "{args:?}: {}", r.stderr);
        assert!(r.stderr.contains(want), "{args:?}: {}", r.stderr);
    }
    let r = gearsieve(&[
        "thread",
        "--lathe",
        "catalogs/lathe/quillsby.lathe",
        "--pitch",
        "1.5mm",
        "--buy",
        "1",
        "--buy-teeth",
        "20..140",
    ]);
    assert_eq!(r.code, 2);
    assert!(
        r.stderr.contains("--buy-teeth: the guard closes over gears of at most 127 teeth"),
        "{}",
        r.stderr
    );
    let r = gearsieve(&["search", "--ratio", "2", "--stock", NO127, "--buy-teeth", "20..30"]);
    assert_eq!(r.code, 2);
    assert!(r.stderr.contains("--buy <N>"), "{}", r.stderr);
}

#[test]
fn merge_keeps_what_to_buy() {
    let dir = std::env::temp_dir().join(format!("gearsieve-buy-merge-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let base = [
        "search",
        "--ratio",
        "127/60",
        "--tol",
        "1e-3",
        "--stock",
        NO127,
        "--stages",
        "1..2",
        "--buy",
        "1",
        "--buy-teeth",
        "20..127",
        "--limit",
        "8",
        "--format",
        "json",
    ];
    let whole = gearsieve(&base);
    assert_eq!(whole.code, 0);
    let mut files = Vec::new();
    for i in 1..=3 {
        let shard = format!("{i}/3");
        let out = dir.join(format!("part{i}.json"));
        let out_s = out.display().to_string();
        let r = gearsieve(&[&base[..], &["--shard", &shard, "--output", &out_s]].concat());
        assert!(r.code == 0 || r.code == 1, "{}", r.stderr);
        files.push(out_s);
    }
    let mut args = vec!["merge", "--format", "json"];
    args.extend(files.iter().map(String::as_str));
    let merged = gearsieve(&args);
    assert_eq!(merged.code, 0, "{}", merged.stderr);
    let a: serde_json::Value = serde_json::from_str(&whole.stdout).unwrap();
    let b: serde_json::Value = serde_json::from_str(&merged.stdout).unwrap();
    assert_eq!(a, b, "merged parts print what one run prints");
    assert!(b["trains"][0]["to_buy"].is_array());
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn every_arrangement_of_a_gear_set_needs_the_same_gears_bought() {
    let (code, v) = json(&[
        "search",
        "--ratio",
        "127/60",
        "--tol",
        "0",
        "--stock",
        NO127,
        "--stages",
        "2",
        "--buy",
        "1",
        "--buy-teeth",
        "100..127",
        "--limit",
        "15",
        "--arrangements",
    ]);
    assert_eq!(code, 0);
    let mut others = 0;
    for t in v["trains"].as_array().unwrap() {
        for o in t["other_arrangements"].as_array().into_iter().flatten() {
            assert_eq!(o["to_buy"], t["to_buy"], "{t}");
            others += 1;
        }
    }
    assert!(others > 0, "some gear set has several arrangements");
    assert_eq!(v["trains"][0]["to_buy"][0]["teeth"], 127, "exact only with the 127 bought");
}
