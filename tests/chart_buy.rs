//! `gearsieve chart --buy N`: the choices of gears to buy held to a brute force that re-runs
//! the plain chart on the gears on hand plus every basket of up to N gears on offer, and the
//! command line on the shipped catalogue without its 127-tooth gear.

mod common;
use common::*;

use std::collections::BTreeSet;

use gearsieve::model::pool::{Pool, StockGear};
use gearsieve::model::purchase::Purchase;
use gearsieve::numbers::range::IntRange;
use gearsieve::numbers::rational::Ratio;
use gearsieve::trades::thread::banjo::{load_banjo, Banjo};
use gearsieve::trades::thread::chart::chart;
use gearsieve::trades::thread::chart_buy::{buy_chart, BuyChart};
use gearsieve::trades::thread::machine::{GearboxPosition, Machine};
use gearsieve::trades::thread::pitch::{parse_leadscrew, parse_pitch};
use gearsieve::trades::thread::series::SeriesEntry;
use gearsieve::trades::thread::Lathe;
use gearsieve::RunOptions;
use proptest::prelude::*;

const MODULE: f64 = 1.5;

fn brackenfold_banjo() -> Banjo {
    let path: std::path::PathBuf =
        [env!("CARGO_MANIFEST_DIR"), "catalogs", "lathe", "brackenfold.banjo"].iter().collect();
    load_banjo(&path).unwrap()
}

fn lathe(on_hand: &[(u32, u32)], extra: &[u32], shop: &Shop) -> Lathe {
    let mut stock: Vec<StockGear> =
        on_hand.iter().map(|&(z, q)| StockGear::on_hand(z, MODULE, 20.0, q)).collect();
    stock.extend(extra.iter().map(|&z| StockGear::on_hand(z, MODULE, 20.0, 1)));
    let pool = Pool::from_stock(&stock, "test").unwrap();
    let machine = Machine {
        leadscrew: parse_leadscrew(shop.leadscrew).unwrap(),
        stud_ratio: Ratio::integer(1),
        gearbox: shop
            .gearbox
            .iter()
            .map(|&(name, n, d)| GearboxPosition {
                name: name.into(),
                ratio: Ratio::from_parts(n, d).unwrap(),
            })
            .collect(),
    };
    Lathe::new(machine, pool, shop.banjo.clone(), shop.stages, shop.tolerance, 1).unwrap()
}

/// The lathe and series a scenario runs on.
struct Shop {
    leadscrew: &'static str,
    gearbox: Vec<(&'static str, u64, u64)>,
    banjo: Option<Banjo>,
    stages: IntRange,
    tolerance: Ratio,
    series: Vec<SeriesEntry>,
}

fn series(pitches: &[&str]) -> Vec<SeriesEntry> {
    pitches.iter().map(|p| SeriesEntry { label: p.to_string(), pitch: parse_pitch(p).unwrap() }).collect()
}

/// The rows the plain chart reaches with the gears on hand plus `extra`.
fn reached(on_hand: &[(u32, u32)], extra: &[u32], shop: &Shop) -> BTreeSet<usize> {
    let c = chart(&lathe(on_hand, extra, shop), &shop.series, &RunOptions::default()).unwrap();
    c.rows.iter().enumerate().filter(|(_, r)| r.best.is_some()).map(|(k, _)| k).collect()
}

fn baskets(teeth: IntRange, most: usize) -> Vec<Vec<u32>> {
    fn grow(all: &[u32], most: usize, from: usize, b: &mut Vec<u32>, out: &mut Vec<Vec<u32>>) {
        for k in from..all.len() {
            b.push(all[k]);
            out.push(b.clone());
            if b.len() < most {
                grow(all, most, k, b, out);
            }
            b.pop();
        }
    }
    let all: Vec<u32> = (teeth.lo..=teeth.hi).collect();
    let mut out = Vec::new();
    grow(&all, most, 0, &mut Vec::new(), &mut out);
    out
}

/// A choice: the teeth to buy and the rows it gains.
type Choice = (Vec<u32>, Vec<usize>);

/// Brute force: every basket's gains by the plain chart; a choice is listed when every gear in
/// it adds a thread; ranked by gains, then fewest gears, then teeth.
fn brute_force(
    on_hand: &[(u32, u32)],
    teeth: IntRange,
    most: usize,
    shop: &Shop,
) -> (Vec<usize>, Vec<Choice>) {
    let base = reached(on_hand, &[], shop);
    let gains =
        |b: &[u32]| -> BTreeSet<usize> { reached(on_hand, b, shop).difference(&base).copied().collect() };
    let all = baskets(teeth, most);
    let mut choices = Vec::new();
    for b in &all {
        let g = gains(b);
        if g.is_empty() {
            continue;
        }
        let each_adds = (0..b.len()).all(|k| {
            let mut rest = b.clone();
            rest.remove(k);
            gains(&rest).len() < g.len()
        });
        if each_adds {
            choices.push((b.clone(), g.into_iter().collect::<Vec<_>>()));
        }
    }
    choices.sort_by(|a, b| b.1.len().cmp(&a.1.len()).then(a.0.len().cmp(&b.0.len())).then(a.0.cmp(&b.0)));
    (base.into_iter().collect(), choices)
}

fn fast(on_hand: &[(u32, u32)], teeth: IntRange, most: usize, shop: &Shop) -> BuyChart {
    let lathe = lathe(on_hand, &[], shop);
    let purchase = Purchase::new(lathe.pool.clone(), most as u32, Some(teeth), Some(MODULE)).unwrap();
    buy_chart(&lathe, &shop.series, &purchase, usize::MAX, &RunOptions::default()).unwrap()
}

fn check(on_hand: &[(u32, u32)], teeth: IntRange, most: usize, shop: &Shop) -> BuyChart {
    let (base, expected) = brute_force(on_hand, teeth, most, shop);
    let got = fast(on_hand, teeth, most, shop);
    let on: Vec<usize> = got.rows.iter().enumerate().filter(|(_, r)| r.on_hand).map(|(k, _)| k).collect();
    assert_eq!(on, base, "threads cut from the gears on hand");
    let listed: Vec<Choice> =
        got.choices.iter().map(|c| (c.basket.teeth().to_vec(), c.gains.clone())).collect();
    assert_eq!(listed, expected, "choices and their gains");
    assert_eq!(got.choice_count, expected.len());
    got
}

fn small_shop(tolerance: Ratio, banjo: Option<Banjo>) -> Shop {
    Shop {
        leadscrew: "8tpi",
        gearbox: Vec::new(),
        banjo,
        stages: IntRange { lo: 1, hi: 2 },
        tolerance,
        series: series(&["1mm", "1.25mm", "1.5mm", "0.75mm", "2mm", "12tpi", "19tpi"]),
    }
}

#[test]
fn exact_metric_threads_on_an_inch_leadscrew_need_a_gear_with_127_teeth() {
    // An exact metric pitch from an 8 TPI leadscrew needs the prime 127 (25.4 = 127/5): only a
    // basket holding a 127 gains a metric thread.
    let shop = small_shop(Ratio::integer(0), Some(brackenfold_banjo()));
    let on_hand = [(20, 1), (25, 1), (40, 2), (50, 1), (60, 1), (80, 1), (100, 1)];
    let got = check(&on_hand, IntRange { lo: 118, hi: 127 }, 1, &shop);
    assert_eq!(got.choices[0].basket.teeth(), &[127]);
}

#[test]
fn buying_matches_a_brute_force_over_every_basket_on_a_banjo() {
    let shop = small_shop(Ratio::from_parts(1, 500).unwrap(), Some(brackenfold_banjo()));
    let on_hand = [(20, 1), (30, 1), (45, 1), (60, 1), (90, 1)];
    let got = check(&on_hand, IntRange { lo: 24, hi: 40 }, 2, &shop);
    assert!(!got.choices.is_empty(), "the scenario should have something to buy");
}

#[test]
fn buying_matches_a_brute_force_without_a_banjo_and_through_a_gearbox() {
    let mut shop = small_shop(Ratio::from_parts(1, 1000).unwrap(), None);
    shop.gearbox = vec![("A", 2, 1), ("B", 1, 1)];
    let on_hand = [(20, 1), (35, 1), (50, 1), (75, 1)];
    let got = check(&on_hand, IntRange { lo: 30, hi: 48 }, 2, &shop);
    assert!(!got.choices.is_empty());
}

#[test]
fn buying_three_matches_a_brute_force_on_simple_trains() {
    let mut shop = small_shop(Ratio::from_parts(1, 200).unwrap(), Some(brackenfold_banjo()));
    shop.stages = IntRange { lo: 1, hi: 1 };
    let on_hand = [(30, 1), (40, 1)];
    check(&on_hand, IntRange { lo: 36, hi: 47 }, 3, &shop);
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 6, ..ProptestConfig::default() })]

    #[test]
    fn buying_matches_a_brute_force_on_random_shelves(
        shelf in prop::collection::btree_set(20u32..70, 2..6),
        lo in 20u32..60,
        tol in prop::sample::select(vec![0u64, 200, 1000]),
        banjo in any::<bool>(),
    ) {
        let tolerance = if tol == 0 { Ratio::integer(0) } else { Ratio::from_parts(1, tol).unwrap() };
        let shop = small_shop(tolerance, banjo.then(brackenfold_banjo));
        let on_hand: Vec<(u32, u32)> = shelf.iter().map(|&z| (z, 1)).collect();
        check(&on_hand, IntRange { lo, hi: lo + 9 }, 2, &shop);
    }
}

#[test]
fn chart_buy_1_names_the_127_for_metric_threads_from_an_inch_leadscrew() {
    let args = [
        "chart",
        "--leadscrew",
        "8tpi",
        "--stock",
        "catalogs/lathe-change-gears-no127.csv",
        "--banjo",
        "catalogs/lathe/brackenfold.banjo",
        "--series",
        "iso-coarse",
        "--tol",
        "0",
        "--buy",
        "1",
    ];
    let (code, v) = json(&args);
    assert_eq!(code, 0);
    assert_eq!(v["on_hand"].as_array().unwrap().len(), 0, "no metric thread is exact without the 127");
    assert_eq!(v["choices"][0]["to_buy"], serde_json::json!([127]));
    assert_eq!(v["choices"][0]["gains"], 21);
    let r = gearsieve(&args);
    assert!(r.stdout.contains("\n1  127 "), "{}", r.stdout);
    assert!(r.stdout.contains("CAUTION: Change gears only with the machine stopped"));
}

#[test]
fn chart_buy_refuses_what_it_cannot_do() {
    let base = ["chart", "--lathe", "catalogs/lathe/brackenfold.lathe", "--series", "iso-coarse"];
    for (extra, flag) in [
        (&["--buy", "4"][..], "--buy:"),
        (&["--buy", "1", "--buy-teeth", "20..140"][..], "--buy-teeth:"),
        (&["--buy", "1", "--buy-teeth", "x"][..], "--buy-teeth:"),
        (&["--buy", "1", "--buy-module", "0"][..], "--buy-module:"),
        (&["--buy", "1", "--stages", "1..3"][..], "--buy:"),
        (&["--buy", "1", "--limit", "0"][..], "--limit:"),
    ] {
        let mut a = base.to_vec();
        a.extend(extra);
        let r = gearsieve(&a);
        assert_eq!(r.code, 2, "{a:?}: {}", r.stderr);
        assert!(r.stderr.contains(flag), "{a:?}: {}", r.stderr);
        assert_flags_named_once(&r.stderr);
    }
    let r = gearsieve(&[
        "chart",
        "--lathe",
        "catalogs/lathe/brackenfold.lathe",
        "--series",
        "iso-coarse",
        "--buy-teeth",
        "20..30",
    ]);
    assert_ne!(r.code, 0);
    assert!(r.stderr.contains("--buy"), "{}", r.stderr);
}
