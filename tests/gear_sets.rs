//! Property tests of gear sets: on small random problems, the gear sets a search lists and
//! counts, and the arrangements of each, equal a brute-force grouping of every train the
//! exhaustive engine finds (grouped by the multiset of driver gears and the multiset of driven
//! gears); the split search keeps both counts.

use std::collections::HashMap;

use gearsieve::engine::Shard;
use gearsieve::model::pool::{Pool, StockGear};
use gearsieve::model::rank::{RankKey, DEFAULT_RANK};
use gearsieve::model::train::Train;
use gearsieve::numbers::range::{IntRange, RatioRange};
use gearsieve::numbers::rational::Ratio;
use gearsieve::numbers::target::Target;
use gearsieve::report::search::{merge::merge, view, SearchReport};
use gearsieve::{search, EngineChoice, Outcome, Problem, RunOptions, StageLimits};
use proptest::prelude::*;

/// A gear as a set names it: teeth, module (bits) and pressure angle (bits).
type Gear = (u32, u64, u64);

/// A train's gear set: its drivers and its driven gears, each sorted.
fn gear_set(t: &Train) -> (Vec<Gear>, Vec<Gear>) {
    let key = |z: u32, s: &gearsieve::model::train::Stage| {
        (z, s.module_mm.to_bits(), s.pressure_angle_deg.to_bits())
    };
    let mut a: Vec<Gear> = t.stages.iter().map(|s| key(s.driver.teeth, s)).collect();
    let mut b: Vec<Gear> = t.stages.iter().map(|s| key(s.driven.teeth, s)).collect();
    a.sort_unstable();
    b.sort_unstable();
    (a, b)
}

/// Every train, best first, by the exhaustive engine listing trains.
fn every_train(p: &Problem) -> Vec<Train> {
    let mut all = p.clone();
    all.gear_sets = false;
    all.pareto = false;
    all.limit = 1_000_000;
    let o = search(&all, EngineChoice::Exhaustive, &RunOptions::default());
    assert_eq!(o.count as usize, o.trains.len(), "the brute force lists every train");
    o.trains
}

/// The brute-force grouping: each set's trains in rank order, sets in the order of their best.
fn grouped(trains: &[Train]) -> Vec<Vec<Train>> {
    let mut order: Vec<(Vec<Gear>, Vec<Gear>)> = Vec::new();
    let mut groups: HashMap<(Vec<Gear>, Vec<Gear>), Vec<Train>> = HashMap::new();
    for t in trains {
        let k = gear_set(t);
        if !groups.contains_key(&k) {
            order.push(k.clone());
        }
        groups.entry(k).or_default().push(t.clone());
    }
    order.into_iter().map(|k| groups.remove(&k).unwrap_or_default()).collect()
}

fn by_sets(p: &Problem, choice: EngineChoice, list_arrangements: bool, shard: Option<Shard>) -> Outcome {
    let mut p = p.clone();
    p.gear_sets = true;
    search(&p, choice, &RunOptions { list_arrangements, shard, ..RunOptions::default() })
}

fn problem_strategy() -> impl Strategy<Value = Problem> {
    let target = ((6u64..30, 6u64..30), (6u64..30, 1u64..30), prop_oneof![1 => Just(0u64), 2 => 1u64..3000])
        .prop_map(|((a, b), (c, e), tol)| (a * b, c * e, tol));
    let pool = prop_oneof![
        (6u32..24, 2u32..9)
            .prop_map(|(lo, w)| Pool::to_cut(IntRange { lo, hi: lo + w }, 1.0, 20.0, None).unwrap()),
        prop::collection::vec((6u32..30, prop_oneof![3 => Just(1.0), 1 => Just(1.5)], 1u32..4), 4..14)
            .prop_filter_map("pool must mesh", |gears| {
                let stock: Vec<StockGear> = gears
                    .into_iter()
                    .map(|(teeth, module_mm, quantity)| StockGear::on_hand(teeth, module_mm, 20.0, quantity))
                    .collect();
                Pool::from_stock(&stock, "random").ok()
            }),
    ];
    let stages = (1u32..=3, 0u32..=1).prop_map(|(lo, extra)| IntRange { lo, hi: (lo + extra).min(4) });
    // A stage-ratio limit leaves some pairings of a set out, so some sets have fewer
    // arrangements than pairings.
    let ratio = proptest::option::weighted(
        0.4,
        (1u64..4, 1u64..4).prop_map(|(a, b)| RatioRange {
            lo: Some(Ratio::new(1, a as u128).unwrap()),
            hi: Some(Ratio::new(b as u128 + 1, 2).unwrap()),
        }),
    );
    let rank = prop_oneof![
        Just(DEFAULT_RANK.to_vec()),
        Just(vec![RankKey::Size, RankKey::Error]),
        Just(vec![RankKey::Span])
    ];
    (target, pool, stages, ratio, rank, 1usize..8, any::<bool>()).prop_filter_map(
        "a valid problem",
        |((n, d, tol_ppm), pool, stages, ratio, rank, limit, pareto)| {
            let target = Target::exact(
                format!("{n}/{d}"),
                Ratio::new(n as u128, d as u128)?,
                Ratio::new(tol_ppm as u128 * 50, 1_000_000)?,
            );
            let limits = StageLimits { stage_ratio: ratio, ..StageLimits::default() };
            let mut p = Problem::new(target, pool, stages, limits, None, rank, limit).ok()?;
            p.pareto = pareto;
            Some(p)
        },
    )
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    /// The listed gear sets, their order, their best arrangement, their arrangement counts and
    /// the count of gear sets equal the brute-force grouping, for every engine.
    #[test]
    fn gear_sets_equal_a_grouping_of_every_train(p in problem_strategy()) {
        let all = every_train(&p);
        let groups = grouped(&all);
        if std::env::var_os("GEARSIEVE_PROP_STATS").is_some() {
            let multi = groups.iter().filter(|g| g.len() > 1).count();
            eprintln!("trains {} sets {} with several arrangements {multi} pareto {}", all.len(), groups.len(), p.pareto);
        }
        // The brute-force listing: the Pareto front is taken over the trains' keys, which every
        // arrangement of a set shares, so the front of sets is the sets of the front of trains.
        let listed: Vec<&Vec<Train>> = if p.pareto {
            let mut trains = p.clone();
            trains.gear_sets = false;
            trains.limit = 1_000_000;
            let front = search(&trains, EngineChoice::Exhaustive, &RunOptions::default());
            let on_front: Vec<_> = front.trains.iter().map(gear_set).collect();
            groups.iter().filter(|g| on_front.contains(&gear_set(&g[0]))).collect()
        } else {
            groups.iter().collect()
        };
        for choice in [EngineChoice::Exhaustive, EngineChoice::Sieve, EngineChoice::Auto] {
            let o = by_sets(&p, choice, true, None);
            prop_assert_eq!(o.count, all.len() as u64, "{:?}", choice);
            // A bulk engine that cannot count gear sets (the meet engine when a stage-ratio
            // limit leaves pairings out) says so rather than guess; every other count is exact.
            let may_not_count = choice == EngineChoice::Auto && p.limits.stage_ratio.is_some() && !p.pool.from_stock;
            if !may_not_count || o.gear_set_count.is_some() {
                prop_assert_eq!(o.gear_set_count, Some(groups.len() as u64), "{:?}", choice);
            }
            if p.pareto {
                prop_assert_eq!(o.pareto_size, Some(listed.len()), "{:?}", choice);
            }
            let want = listed.len().min(p.limit);
            prop_assert_eq!(o.trains.len(), want, "{:?}", choice);
            prop_assert_eq!(o.arrangements.len(), want);
            for ((t, a), g) in o.trains.iter().zip(&o.arrangements).zip(&listed) {
                prop_assert_eq!(t, &g[0], "{:?}: a set is listed by its best arrangement", choice);
                prop_assert_eq!(a.count, g.len() as u64);
                prop_assert_eq!(&a.others[..], &g[1..]);
            }
        }
    }

    /// Shards count every gear set once, and merging the parts lists what one run lists.
    #[test]
    fn shards_keep_both_counts(p in problem_strategy(), parts in 2u32..5) {
        let doc_of = |shard: Option<Shard>| {
            let mut q = p.clone();
            q.gear_sets = true;
            let o = search(&q, EngineChoice::Auto, &RunOptions { shard, ..RunOptions::default() });
            view::doc(&SearchReport { problem: &q, outcome: &o, explain: false, shard })
        };
        let whole = doc_of(None);
        let docs: Vec<(String, gearsieve::report::search::json::Doc)> =
            (1..=parts).map(|i| (format!("part{i}"), doc_of(Some(Shard { index: i, count: parts })))).collect();
        let merged = merge(docs).map_err(|e| TestCaseError::fail(e.to_string()))?;
        prop_assert_eq!(merged, whole);
    }
}

/// Exact targets over gears to be cut with every pairing a stage: the factor engine's field.
fn exact_problem_strategy() -> impl Strategy<Value = Problem> {
    let target = prop_oneof![
        // Ratios of tooth products, so that hits are common; 1 and its 1:1 pairings too.
        3 => ((6u64..24, 6u64..24), (6u64..24, 1u64..24)).prop_map(|((a, b), (c, e))| (a * b, c * e)),
        1 => Just((1, 1)),
    ];
    (target, 4u32..16, 2u32..10, 1u32..=4, 0u32..=2, 1usize..10, 0u32..3).prop_filter_map(
        "a valid problem",
        |((n, d), lo, w, stages_lo, extra, limit, driver)| {
            let target =
                Target::exact(format!("{n}/{d}"), Ratio::new(n as u128, d as u128)?, Ratio::new(0, 1)?);
            let pool = Pool::to_cut(IntRange { lo, hi: lo + w }, 1.0, 20.0, None).ok()?;
            // Sometimes fewer drivers than driven gears, so the two sides differ.
            let limits = StageLimits {
                driver_teeth: (driver > 0).then_some(IntRange { lo, hi: lo + w / (driver + 1) }),
                ..StageLimits::default()
            };
            let stages = IntRange { lo: stages_lo, hi: (stages_lo + extra).min(4) };
            Problem::new(target, pool, stages, limits, None, DEFAULT_RANK.to_vec(), limit).ok()
        },
    )
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 120, ..ProptestConfig::default() })]

    /// The factor engine counts gear sets in bulk, exactly: the brute-force grouping's count,
    /// 1:1 pairings and repeated gears included.
    #[test]
    fn the_factor_engine_counts_gear_sets(p in exact_problem_strategy()) {
        let all = every_train(&p);
        let groups = grouped(&all);
        if std::env::var_os("GEARSIEVE_PROP_STATS").is_some() {
            eprintln!("exact trains {} sets {} target {}", all.len(), groups.len(), p.target.ratio);
        }
        let o = by_sets(&p, EngineChoice::Auto, false, None);
        prop_assert_eq!(o.count, all.len() as u64);
        prop_assert_eq!(o.gear_set_count, Some(groups.len() as u64));
        let want: Vec<&Train> = groups.iter().take(p.limit).map(|g| &g[0]).collect();
        prop_assert_eq!(o.trains.iter().collect::<Vec<_>>(), want);
    }
}

/// Three different drivers and three different driven gears that every pairing turns into a
/// stage: one gear set of 3! = 6 arrangements, all with the same ratio. Worked by hand:
/// 30·40·50 / (20·24·25) = 60000/12000 = 5.
#[test]
fn six_arrangements_of_three_pairs_are_one_set() {
    let pool = Pool::from_stock(
        &[20, 24, 25, 30, 40, 50].map(|teeth| StockGear::on_hand(teeth, 1.0, 20.0, 1)),
        "hand",
    )
    .unwrap();
    let target = Target::parse("5", "0").unwrap();
    let p = Problem::new(
        target,
        pool,
        IntRange { lo: 3, hi: 3 },
        StageLimits::default(),
        None,
        DEFAULT_RANK.to_vec(),
        10,
    )
    .unwrap();
    let all = every_train(&p);
    let sets = by_sets(&p, EngineChoice::Sieve, true, None);
    // Any three of the six may drive; 5 = product ratio only for {20, 24, 25} driving.
    assert_eq!(all.len(), 6);
    assert_eq!(sets.gear_set_count, Some(1));
    assert_eq!(sets.trains.len(), 1);
    assert_eq!(sets.arrangements[0].count, 6);
    assert_eq!(sets.arrangements[0].others.len(), 5);
    assert_eq!(sets.trains[0], all[0]);
}

/// Five and six stages (the factor engine's table of triples), against the brute force.
#[test]
fn the_factor_engine_counts_gear_sets_of_five_and_six_stages() {
    for (ratio, lo, hi) in [("2", 10, 16), ("1", 10, 14), ("5/4", 10, 16)] {
        let target = Target::parse(ratio, "0").unwrap();
        let pool = Pool::to_cut(IntRange { lo, hi }, 1.0, 20.0, None).unwrap();
        let p = Problem::new(
            target,
            pool,
            IntRange { lo: 5, hi: 6 },
            StageLimits::default(),
            None,
            DEFAULT_RANK.to_vec(),
            5,
        )
        .unwrap();
        let groups = grouped(&every_train(&p));
        let o = by_sets(&p, EngineChoice::Auto, false, None);
        assert!(!groups.is_empty(), "{ratio} over {lo}..{hi}");
        assert_eq!(o.gear_set_count, Some(groups.len() as u64), "{ratio} over {lo}..{hi}");
    }
}

/// The meet engine's bulk count of gear sets against the sieve's count by canonical
/// arrangement, four stages: on 12..60 teeth each side's 270,725 multisets are past the
/// counter's plain sort (sorted through buckets); at ratio 1 many pairs of multisets are left
/// out for their 1:1 pairings.
#[test]
fn the_meet_engine_counts_gear_sets_like_the_sieve() {
    for (ratio, tol, hi) in [("29.530588", "20ppm", 60), ("7/5", "20ppm", 36), ("1", "3ppm", 30)] {
        let target = Target::parse(ratio, tol).unwrap();
        let pool = Pool::to_cut(IntRange { lo: 12, hi }, 1.0, 20.0, None).unwrap();
        let p = Problem::new(
            target,
            pool,
            IntRange { lo: 4, hi: 4 },
            StageLimits::default(),
            None,
            DEFAULT_RANK.to_vec(),
            5,
        )
        .unwrap();
        let sieve = by_sets(&p, EngineChoice::Sieve, false, None);
        let fast = by_sets(&p, EngineChoice::Auto, false, None);
        assert_eq!(fast.count, sieve.count, "{ratio} {tol}");
        assert!(sieve.gear_set_count.is_some_and(|s| s > 0), "{ratio} {tol}");
        assert_eq!(fast.gear_set_count, sieve.gear_set_count, "{ratio} {tol}");
    }
}
