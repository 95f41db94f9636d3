//! Property tests of the lower-bound count (`--count lower-bound`): on small random near
//! targets over four to six stages, the window engine lists exactly the exhaustive engine's best
//! (trains or gear sets, with their arrangements), and counts exactly the trains and gear sets
//! whose error is at most that of the K-th listed (all of them when fewer than K are listed),
//! whatever the thread count.

use std::cmp::Ordering;
use std::collections::HashSet;

use gearsieve::model::pool::Pool;
use gearsieve::model::rank::{RankKey, DEFAULT_RANK};
use gearsieve::model::train::Train;
use gearsieve::numbers::range::{FloatRange, IntRange, RatioRange};
use gearsieve::numbers::rational::{Ratio, RelError};
use gearsieve::numbers::target::Target;
use gearsieve::{search, CountMode, EngineChoice, Outcome, Problem, RunOptions, StageLimits};
use proptest::prelude::*;

fn run(p: &Problem, e: EngineChoice) -> Outcome {
    search(p, e, &RunOptions::default())
}

/// Near targets over four to six stages of a few tooth counts: the target is a train of the
/// pool nudged by up to half the tolerance, above and below 1, so that many trains fall near it;
/// stage limits now and then; listing trains or gear sets, ranked by error first, a limit of 1
/// to 30.
fn near_strategy() -> impl Strategy<Value = Problem> {
    let rank = prop_oneof![
        2 => Just(DEFAULT_RANK.to_vec()),
        1 => Just(vec![RankKey::Error, RankKey::Span]),
        1 => Just(vec![RankKey::Error, RankKey::Size, RankKey::Meshes]),
    ];
    let stages = (4u32..=6)
        .prop_flat_map(|most| (4u32..=most).prop_map(move |least| IntRange { lo: least, hi: most }));
    let limits = (
        proptest::option::weighted(0.2, (6u32..12, 0u32..6).prop_map(|(lo, w)| IntRange { lo, hi: lo + w })),
        proptest::option::weighted(
            0.2,
            (1u64..4, 1u64..4).prop_map(|(a, b)| RatioRange {
                lo: Some(Ratio::new(1, a as u128 + 1).unwrap()),
                hi: Some(Ratio::new(b as u128 + 1, 1).unwrap()),
            }),
        ),
        proptest::option::weighted(
            0.15,
            (6.0f64..12.0, 2.0f64..12.0).prop_map(|(lo, w)| FloatRange { lo, hi: lo + w }),
        ),
    );
    // Pools small enough for the exhaustive engine: up to eight tooth counts over four stages,
    // six over five, four over six.
    let pool = (stages, 6u32..20, 1u32..8).prop_map(|(stages, lo, w)| {
        let w = w.min([7, 5, 3][stages.hi as usize - 4]);
        (stages, lo, w)
    });
    let train = pool.prop_flat_map(|(stages, lo, w)| {
        let teeth = prop::collection::vec((lo..=lo + w, lo..=lo + w), stages.hi as usize);
        (
            Just((stages, lo, w)),
            teeth,
            -0.5f64..0.5,
            prop_oneof![Just(1u128), 1u128..2_000, 2_000u128..50_000],
        )
    });
    (train, rank, prop_oneof![1usize..4, 1usize..30], any::<bool>(), limits).prop_filter_map(
        "a problem",
        |(((stages, lo, w), teeth, nudge, tol), rank, limit, sets, (driver, stage_ratio, cd))| {
            let n: u128 = teeth.iter().map(|&(_, b)| b as u128).product();
            let d: u128 = teeth.iter().map(|&(a, _)| a as u128).product();
            // Nudged by up to half the tolerance, in units of 10⁻⁷.
            let nudge = (nudge * tol as f64) as i64;
            let ratio = Ratio::new(n * (10_000_000 + nudge) as u128, d * 10_000_000)?;
            let target = Target::exact(format!("{n}/{d}"), ratio, Ratio::new(tol, 10_000_000)?);
            let pool = Pool::to_cut(IntRange { lo, hi: lo + w }, 1.0, 20.0, None).ok()?;
            let limits =
                StageLimits { driver_teeth: driver, driven_teeth: None, stage_ratio, centre_distance_mm: cd };
            let mut p = Problem::new(target, pool, stages, limits, None, rank, limit).ok()?;
            p.gear_sets = sets;
            p.with_count(CountMode::LowerBound).ok()
        },
    )
}

/// The gear set of a train: its driver teeth and its driven teeth, each sorted.
fn set_of(t: &Train) -> (Vec<u32>, Vec<u32>) {
    let mut d: Vec<u32> = t.stages.iter().map(|s| s.driver.teeth).collect();
    let mut r: Vec<u32> = t.stages.iter().map(|s| s.driven.teeth).collect();
    d.sort_unstable();
    r.sort_unstable();
    (d, r)
}

/// Every train of `p` (from the exhaustive engine, listed one by one).
fn every_train(p: &Problem) -> Vec<Train> {
    let mut all = p.clone().with_count(CountMode::Exact).unwrap();
    all.gear_sets = false;
    all.limit = 1_000_000;
    let o = run(&all, EngineChoice::Exhaustive);
    assert!(o.count < 1_000_000, "space too large for the test");
    o.trains
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 120, ..ProptestConfig::default() })]

    /// The listing is the exhaustive engine's; the counts are exactly those within the K-th
    /// listed error, and marked as lower bounds only when something was left out.
    #[test]
    fn the_lower_bound_count_lists_the_proven_best(p in near_strategy()) {
        let fast = run(&p, EngineChoice::Auto);
        let exact = run(&p.clone().with_count(CountMode::Exact).unwrap(), EngineChoice::Exhaustive);
        prop_assert_eq!(&fast.trains, &exact.trains);
        prop_assert_eq!(&fast.arrangements, &exact.arrangements);
        prop_assert_eq!(fast.stage_options, exact.stage_options);
        prop_assert!(fast.complete);

        let all = every_train(&p);
        prop_assert_eq!(all.len() as u64, exact.count);
        let bound: Option<RelError> = (fast.trains.len() == p.limit).then(|| fast.trains[p.limit - 1].error);
        let within: Vec<&Train> = all
            .iter()
            .filter(|t| bound.is_none_or(|b| t.error.cmp_abs(&b) != Ordering::Greater))
            .collect();
        prop_assert_eq!(fast.count, within.len() as u64);
        let sets: HashSet<(Vec<u32>, Vec<u32>)> = within.iter().map(|t| set_of(t)).collect();
        prop_assert_eq!(fast.gear_set_count, p.gear_sets.then_some(sets.len() as u64));
        if fast.counted_all {
            prop_assert_eq!(fast.count, exact.count);
            prop_assert_eq!(fast.gear_set_count, exact.gear_set_count);
        }
        prop_assert!(fast.count <= exact.count);
        if std::env::var_os("GEARSIEVE_PROP_STATS").is_some() {
            eprintln!("stats counted_all {} count {} of {} listed {} limit {} stages {} sets {}", fast.counted_all, fast.count, exact.count, fast.trains.len(), p.limit, p.stages, p.gear_sets);
        }
    }
}

/// The counts and the listing are the same on one thread and on four, where the units share
/// their narrowing windows at whatever moment the threads reach them.
#[test]
fn a_lower_bound_count_does_not_depend_on_the_thread_count() {
    let pool = Pool::to_cut(IntRange { lo: 12, hi: 40 }, 1.0, 20.0, None).unwrap();
    let target = Target::parse("29.530588", "10ppm").unwrap();
    let stages = IntRange { lo: 5, hi: 5 };
    let mut p =
        Problem::new(target, pool, stages, StageLimits::default(), None, DEFAULT_RANK.to_vec(), 20).unwrap();
    p.gear_sets = true;
    let p = p.with_count(CountMode::LowerBound).unwrap();
    let on = |threads| {
        let pool = rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap();
        pool.install(|| run(&p, EngineChoice::Auto))
    };
    let (one, four) = (on(1), on(4));
    assert_eq!(one, four);
    assert!(!one.counted_all, "five stages of 12..40 at 10 ppm hold far more than 20 gear sets");
    assert_eq!(one.trains.len(), 20);
    // The exact count of the same search (the meet engine) is larger, and lists the same.
    let exact = run(&p.clone().with_count(CountMode::Exact).unwrap(), EngineChoice::Auto);
    assert_eq!(exact.trains, one.trains);
    assert!(exact.count > one.count, "{} vs {}", exact.count, one.count);
}

/// A lower-bound count needs a ranking led by the error, a limit and no Pareto front; each
/// refusal says why.
#[test]
fn a_lower_bound_count_refuses_what_it_cannot_serve() {
    let make = |rank: Vec<RankKey>, limit: usize, pareto: bool| {
        let pool = Pool::to_cut(IntRange { lo: 12, hi: 40 }, 1.0, 20.0, None).unwrap();
        let target = Target::parse("7.3", "10ppm").unwrap();
        let mut p =
            Problem::new(target, pool, IntRange { lo: 4, hi: 4 }, StageLimits::default(), None, rank, limit)
                .unwrap();
        p.pareto = pareto;
        p.with_count(CountMode::LowerBound).map(|_| ()).map_err(|e| e.to_string())
    };
    assert!(make(DEFAULT_RANK.to_vec(), 20, false).is_ok());
    let size_first = make(vec![RankKey::Size, RankKey::Error], 20, false).unwrap_err();
    assert!(size_first.contains("led by the error"), "{size_first}");
    let pareto = make(DEFAULT_RANK.to_vec(), 20, true).unwrap_err();
    assert!(pareto.contains("Pareto"), "{pareto}");
    let every = make(DEFAULT_RANK.to_vec(), 0, false).unwrap_err();
    assert!(every.contains("every train"), "{every}");
}
