//! Property tests: on small random problems the sieve engine finds exactly the trains the
//! exhaustive engine finds, with the same count and order; every reported train's ratio,
//! recomputed from its teeth, is what it claims and meets every constraint; stock quantities are
//! never exceeded.

use std::collections::HashMap;

use gearsieve::model::pool::{Pool, StockGear};
use gearsieve::model::rank::{RankKey, DEFAULT_RANK};
use gearsieve::model::train::{Direction, Train};
use gearsieve::numbers::range::{FloatRange, IntRange, RatioRange};
use gearsieve::numbers::rational::{Ratio, RelError};
use gearsieve::numbers::target::Target;
use gearsieve::{search, EngineChoice, Outcome, Problem, RunOptions, StageLimits};
use proptest::prelude::*;

fn run(p: &Problem, e: EngineChoice) -> Outcome {
    search(p, e, &RunOptions::default())
}

/// Check everything a reported train claims, from its teeth alone.
fn check_train(p: &Problem, t: &Train) {
    assert_eq!(t.ratio_from_teeth(), t.ratio, "ratio recomputed from teeth");
    let e = RelError::of(t.ratio.num(), t.ratio.den(), p.target.ratio);
    assert_eq!(e.cmp_abs(&t.error), std::cmp::Ordering::Equal);
    assert!(e.within(p.target.tolerance), "train {} outside tolerance", t.ratio);
    assert!(p.stages.contains(t.meshes() as u32));
    if let Some(d) = p.direction {
        assert_eq!(t.direction(), d);
    }
    for s in &t.stages {
        assert_ne!(s.driver.teeth, s.driven.teeth, "a 1:1 stage is never used");
        let l = &p.limits;
        assert!(l.driver_teeth.is_none_or(|r| r.contains(s.driver.teeth)));
        assert!(l.driven_teeth.is_none_or(|r| r.contains(s.driven.teeth)));
        assert!(l.stage_ratio.is_none_or(|r| r.contains(s.driven.teeth as u64, s.driver.teeth as u64)));
        assert!(l.centre_distance_mm.is_none_or(|r| r.contains(s.centre_distance_mm(), 1e-9)));
        assert!(p.pool.groups.iter().any(|g| g.meshes_with(s.module_mm, s.pressure_angle_deg)));
    }
    if p.pool.from_stock {
        let mut used: HashMap<(u32, u64), u32> = HashMap::new();
        for s in &t.stages {
            for z in [s.driver.teeth, s.driven.teeth] {
                *used.entry((z, s.module_mm.to_bits())).or_default() += 1;
            }
        }
        for ((z, m), n) in used {
            let have: u32 = p
                .pool
                .gears
                .iter()
                .filter(|g| g.teeth == z && p.pool.groups[g.group].module_mm.to_bits() == m)
                .map(|g| g.quantity.unwrap_or(0))
                .sum();
            assert!(n <= have, "{n} of the {z}-tooth gear used, {have} on hand");
        }
    }
}

fn problem_strategy() -> impl Strategy<Value = Problem> {
    // Targets built as ratios of tooth products, so exact and near hits are common.
    let target = ((6u64..40, 6u64..40), (6u64..40, 1u64..40), prop_oneof![1 => Just(0u64), 3 => 1u64..4000])
        .prop_map(|((a, b), (c, e), tol)| (a * b, c * e, tol));
    let pool = prop_oneof![
        (6u32..30, 2u32..10)
            .prop_map(|(lo, w)| Pool::to_cut(IntRange { lo, hi: lo + w }, 1.0, 20.0, None).unwrap()),
        prop::collection::vec((6u32..40, prop_oneof![3 => Just(1.0), 1 => Just(1.5)], 1u32..4), 4..16)
            .prop_filter_map("pool must mesh", |gears| {
                let stock: Vec<StockGear> = gears
                    .into_iter()
                    .map(|(teeth, module_mm, quantity)| StockGear::on_hand(teeth, module_mm, 20.0, quantity))
                    .collect();
                Pool::from_stock(&stock, "random").ok()
            }),
    ];
    let stages = (1u32..=4, 0u32..=2).prop_map(|(lo, extra)| IntRange { lo, hi: (lo + extra).min(4) });
    let limits = (
        proptest::option::weighted(0.3, (6u32..20, 0u32..15).prop_map(|(lo, w)| IntRange { lo, hi: lo + w })),
        proptest::option::weighted(
            0.3,
            (2u64..6, 2u64..8).prop_map(|(a, b)| RatioRange {
                lo: Some(Ratio::new(1, a as u128).unwrap()),
                hi: Some(Ratio::new(b as u128, 1).unwrap()),
            }),
        ),
        proptest::option::weighted(
            0.3,
            (5.0f64..20.0, 0.0f64..20.0).prop_map(|(lo, w)| FloatRange { lo, hi: lo + w }),
        ),
    );
    let direction =
        proptest::option::weighted(0.3, prop_oneof![Just(Direction::Same), Just(Direction::Opposite)]);
    let rank = prop_oneof![
        Just(DEFAULT_RANK.to_vec()),
        Just(vec![RankKey::Size, RankKey::Error]),
        Just(vec![RankKey::Span]),
    ];
    (target, pool, stages, limits, direction, rank, 0usize..8).prop_filter_map(
        "direction must allow a stage count",
        |((n, d, tol_ppm), pool, stages, (driver, ratio, cd), direction, rank, limit)| {
            let target = Target::exact(
                format!("{n}/{d}"),
                Ratio::new(n as u128, d as u128)?,
                Ratio::new(tol_ppm as u128 * 50, 1_000_000)?,
            );
            let limits = StageLimits {
                driver_teeth: driver,
                driven_teeth: None,
                stage_ratio: ratio,
                centre_distance_mm: cd,
            };
            Problem::new(target, pool, stages, limits, direction, rank, limit).ok()
        },
    )
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

    #[test]
    fn sieve_equals_exhaustive(p in problem_strategy()) {
        let fast = run(&p, EngineChoice::Auto);
        let sieve = run(&p, EngineChoice::Sieve);
        let slow = run(&p, EngineChoice::Exhaustive);
        prop_assert_eq!(&sieve, &slow);
        prop_assert_eq!(fast.count, slow.count);
        if std::env::var_os("GEARSIEVE_PROP_STATS").is_some() {
            eprintln!("count {} stages {} target {} tol {} n {} limits {:?} stock {}", fast.count, fast.stage_options, p.target.ratio, p.target.tolerance, p.stages, p.limits, p.pool.from_stock);
        }
        prop_assert_eq!(&fast.trains, &slow.trains);
        prop_assert!(fast.trains.len() <= p.limit);
        for t in &fast.trains {
            check_train(&p, t);
        }
    }

    #[test]
    fn every_listed_train_is_what_it_claims(p in problem_strategy()) {
        let mut p = p;
        p.limit = 1000;
        let out = run(&p, EngineChoice::Auto);
        prop_assert!(out.trains.len() as u64 == out.count.min(1000));
        for t in &out.trains {
            check_train(&p, t);
        }
        // Listed once each: no two trains are the same multiset of stages.
        let mut seen = std::collections::HashSet::new();
        for t in &out.trains {
            let key: Vec<(u32, u32, u64)> = t.stages.iter().map(|s| (s.driver.teeth, s.driven.teeth, s.module_mm.to_bits())).collect();
            prop_assert!(seen.insert(key));
        }
    }
}

#[test]
fn results_do_not_depend_on_thread_count() {
    let pool = Pool::to_cut(IntRange { lo: 12, hi: 80 }, 1.0, 20.0, None).unwrap();
    let target = Target::parse("29.530588", "100ppm").unwrap();
    let p = Problem::new(
        target,
        pool,
        IntRange { lo: 1, hi: 3 },
        StageLimits::default(),
        None,
        DEFAULT_RANK.to_vec(),
        50,
    )
    .unwrap();
    let with = |n| {
        rayon::ThreadPoolBuilder::new()
            .num_threads(n)
            .build()
            .unwrap()
            .install(|| run(&p, EngineChoice::Auto))
    };
    let one = with(1);
    assert!(one.count > 50);
    assert_eq!(one, with(2));
    assert_eq!(one, with(3));
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 60, ..ProptestConfig::default() })]

    /// Every shard split covers the space exactly once, and merging the parts' JSON gives the
    /// unsplit run's JSON, for plain and Pareto listings.
    #[test]
    fn shards_merge_to_the_unsplit_run(p in problem_strategy(), parts in 1u32..5, pareto in any::<bool>()) {
        let mut p = p;
        p.pareto = pareto;
        shards_merge(&p, parts)?;
    }
}

/// Split `p` into `parts`, and check the parts' counts add up and their JSON merges into the
/// unsplit run's.
fn shards_merge(p: &Problem, parts: u32) -> Result<(), TestCaseError> {
    use gearsieve::engine::Shard;
    use gearsieve::report::search::{view, SearchReport};
    let doc_of = |shard: Option<Shard>| {
        let o = search(p, EngineChoice::Auto, &RunOptions { shard, ..RunOptions::default() });
        view::doc(&SearchReport { problem: p, outcome: &o, explain: false, shard })
    };
    let whole = doc_of(None);
    let docs: Vec<(String, gearsieve::report::search::json::Doc)> =
        (1..=parts).map(|i| (format!("part{i}"), doc_of(Some(Shard { index: i, count: parts })))).collect();
    prop_assert_eq!(docs.iter().map(|(_, d)| d.count).sum::<u64>(), whole.count);
    prop_assert_eq!(gearsieve::report::search::merge::merge(docs).unwrap(), whole);
    Ok(())
}

#[test]
fn meet_engine_matches_the_reference_on_four_stages() {
    for (ratio, tol, rank) in [
        ("9.3", "2000ppm", DEFAULT_RANK.to_vec()),
        // Exact targets go to the factor engine; a tolerance of 1 ppm keeps this one here.
        ("7", "1ppm", vec![RankKey::Size, RankKey::Error]),
        ("1.5", "1%", vec![RankKey::Span]),
    ] {
        let pool = Pool::to_cut(IntRange { lo: 12, hi: 24 }, 1.0, 20.0, None).unwrap();
        let target = Target::parse(ratio, tol).unwrap();
        let mut p =
            Problem::new(target, pool, IntRange { lo: 1, hi: 4 }, StageLimits::default(), None, rank, 25)
                .unwrap();
        let slow = run(&p, EngineChoice::Exhaustive);
        assert!(slow.count > 25, "{ratio}: {}", slow.count);
        assert_eq!(run(&p, EngineChoice::Auto), slow, "{ratio}");
        p.pareto = true;
        assert_eq!(run(&p, EngineChoice::Auto), run(&p, EngineChoice::Exhaustive), "{ratio} pareto");
    }
}

/// Near targets over four stages of gears to be cut: the meet engine's problems, where it
/// tables only the last pairs of values, cuts the first pairs into slices of their product,
/// counts sequences surely inside the tolerance without the exact test and passes over those
/// surely worse than one already refused. Targets above and below 1 (so the table's floor √lo
/// and ceiling hi/least² both bind), tolerances from 0.1 ppm to 0.1%, error-first and other
/// rankings, small and large limits, top-K and Pareto, trains and gear sets.
fn four_stage_near_strategy() -> impl Strategy<Value = Problem> {
    let target =
        ((6u64..40, 6u64..40), (6u64..40, 6u64..40), prop_oneof![Just(1u128), Just(10), 1u128..10_000])
            .prop_map(|((a, b), (c, d), tol)| (a * b, c * d, tol));
    let rank = prop_oneof![
        3 => Just(DEFAULT_RANK.to_vec()),
        1 => Just(vec![RankKey::Size, RankKey::Error]),
        1 => Just(vec![RankKey::Error, RankKey::Span]),
    ];
    (target, 6u32..24, 3u32..8, 3..5u32, rank, prop_oneof![Just(1usize), 0usize..40], any::<(bool, bool)>())
        .prop_filter_map("a problem", |((n, d, tol), lo, w, least, rank, limit, (pareto, sets))| {
            let tol = Ratio::new(tol, 10_000_000)?;
            let target = Target::exact(format!("{n}/{d}"), Ratio::new(n as u128, d as u128)?, tol);
            let pool = Pool::to_cut(IntRange { lo, hi: lo + w }, 1.0, 20.0, None).ok()?;
            let stages = IntRange { lo: least, hi: 4 };
            let mut p = Problem::new(target, pool, stages, StageLimits::default(), None, rank, limit).ok()?;
            p.pareto = pareto;
            p.gear_sets = sets;
            Some(p)
        })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 150, ..ProptestConfig::default() })]

    /// The meet engine's four stages give the exhaustive engine's count and listing.
    #[test]
    fn meet_engine_equals_exhaustive_on_four_stages(p in four_stage_near_strategy()) {
        let fast = run(&p, EngineChoice::Auto);
        let slow = run(&p, EngineChoice::Exhaustive);
        prop_assert_eq!(fast, slow);
    }
}

/// Near targets over five and six stages of a few tooth counts: small enough for the exhaustive
/// engine, taken by the meet engine's prefixes and pair table. Targets are products of three
/// ratios of teeth near the range, so that some trains fall inside.
fn five_and_six_stage_near_strategy() -> impl Strategy<Value = Problem> {
    let side = (6u64..30, 6u64..30, 6u64..30).prop_map(|(a, b, c)| a * b * c);
    let target = (side.clone(), side, prop_oneof![Just(1u128), Just(30), 1u128..20_000]);
    let rank = prop_oneof![
        3 => Just(DEFAULT_RANK.to_vec()),
        1 => Just(vec![RankKey::Size, RankKey::Error]),
        1 => Just(vec![RankKey::Error, RankKey::Span]),
    ];
    let stages = (5u32..=6)
        .prop_flat_map(|most| (4u32..=most).prop_map(move |least| IntRange { lo: least, hi: most }));
    (target, 6u32..20, 2u32..5, stages, rank, prop_oneof![Just(1usize), 0usize..30], any::<(bool, bool)>())
        .prop_filter_map("a problem", |((n, d, tol), lo, w, stages, rank, limit, (pareto, sets))| {
            let tol = Ratio::new(tol, 10_000_000)?;
            let target = Target::exact(format!("{n}/{d}"), Ratio::new(n as u128, d as u128)?, tol);
            // Six stages over five tooth counts would be slow for the exhaustive engine.
            let w = if stages.hi == 6 { w.min(3) } else { w };
            let pool = Pool::to_cut(IntRange { lo, hi: lo + w }, 1.0, 20.0, None).ok()?;
            let mut p = Problem::new(target, pool, stages, StageLimits::default(), None, rank, limit).ok()?;
            p.pareto = pareto;
            p.gear_sets = sets;
            Some(p)
        })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 80, ..ProptestConfig::default() })]

    /// The meet engine's five and six stages give the exhaustive engine's count and listing.
    #[test]
    fn meet_engine_equals_exhaustive_on_five_and_six_stages(p in five_and_six_stage_near_strategy()) {
        let fast = run(&p, EngineChoice::Auto);
        let slow = run(&p, EngineChoice::Exhaustive);
        prop_assert_eq!(fast, slow);
    }
}

/// Five stages of 10..120 teeth near 365.2422 at 1 ppm: the meet engine takes them, and its
/// forecast (random descents through its prefixes, timed) sees that they run for many minutes,
/// where it used to take every meet search as quick. Twelve to sixty teeth over five stages, a
/// space about a hundredth the size (its prefixes of three values counted apart: 465 million
/// against billions), is forecast well below it.
#[test]
fn meet_engine_forecasts_its_long_five_stage_searches() {
    let five = |lo, hi, ratio: &str| {
        let pool = Pool::to_cut(IntRange { lo, hi }, 1.0, 20.0, None).unwrap();
        let target = Target::parse(ratio, "1ppm").unwrap();
        Problem::new(
            target,
            pool,
            IntRange { lo: 5, hi: 5 },
            StageLimits::default(),
            None,
            DEFAULT_RANK.to_vec(),
            20,
        )
        .unwrap()
    };
    let budget = std::time::Duration::from_secs(1);
    let long = gearsieve::engine::estimate(&five(10, 120, "365.2422"), EngineChoice::Auto, budget);
    let long_s = long.seconds_one_thread.expect("five meet stages are forecast");
    assert!(long_s > 60.0, "forecast {long_s} s");
    assert!(long.shardable, "its units are first values, which a split search shares out");
    let short = gearsieve::engine::estimate(&five(12, 60, "29.530588"), EngineChoice::Auto, budget);
    let short_s = short.seconds_one_thread.expect("five meet stages are forecast");
    assert!(short_s > 0.0 && short_s * 20.0 < long_s, "forecasts {short_s} s and {long_s} s");
}

/// Exact targets over gears to be cut with only tooth-count limits per stage: the problems the
/// factor engine takes. Targets are ratios of products of tooth counts from the range (so
/// trains hit them), now and then 1, or with a prime no gear carries (so none does).
fn exact_problem_strategy(max_stages: u32, max_width: u32) -> impl Strategy<Value = Problem> {
    let teeth = (3u32..20, 1u32..max_width).prop_map(|(lo, w)| (lo, lo + w));
    // As many driven as driver teeth, so that a train of that many stages can hit it.
    let picks = (1usize..=max_stages as usize)
        .prop_flat_map(|k| (prop::collection::vec(0u32..64, k), prop::collection::vec(0u32..64, k)));
    let target =
        (picks, prop_oneof![8 => Just(1u64), 1 => Just(1009u64)]).prop_map(|((a, b), odd)| (a, b, odd));
    let stages = (1u32..=max_stages, 0u32..3)
        .prop_map(move |(lo, extra)| IntRange { lo, hi: (lo + extra).min(max_stages) });
    let side_limit = proptest::option::weighted(0.25, (0u32..6, 0u32..12));
    let direction =
        proptest::option::weighted(0.2, prop_oneof![Just(Direction::Same), Just(Direction::Opposite)]);
    let rank = prop_oneof![
        Just(DEFAULT_RANK.to_vec()),
        Just(vec![RankKey::Size, RankKey::Error]),
        Just(vec![RankKey::Span]),
        Just(vec![RankKey::Error]),
        Just(vec![RankKey::Meshes, RankKey::Span]),
    ];
    (teeth, target, stages, (side_limit.clone(), side_limit), direction, rank, 0usize..12, any::<bool>())
        .prop_filter_map(
            "direction must allow a stage count",
            |((lo, hi), (num, den, odd), stages, (driver, driven), direction, rank, limit, pareto)| {
                let pick = |v: &[u32]| v.iter().map(|&i| (lo + i % (hi - lo + 1)) as u128).product::<u128>();
                let ratio = Ratio::new(pick(&num) * odd as u128, pick(&den))?;
                let target = Target::exact(ratio.to_string(), ratio, Ratio::integer(0));
                let within = |(a, w): (u32, u32)| IntRange { lo: lo + a, hi: lo + a + w };
                let limits = StageLimits {
                    driver_teeth: driver.map(within),
                    driven_teeth: driven.map(within),
                    ..StageLimits::default()
                };
                let pool = Pool::to_cut(IntRange { lo, hi }, 1.0, 20.0, None).ok()?;
                let mut p = Problem::new(target, pool, stages, limits, direction, rank, limit).ok()?;
                p.pareto = pareto;
                Some(p)
            },
        )
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    /// Split runs of exact searches (the factor engine's units) merge into the unsplit run.
    #[test]
    fn exact_shards_merge_to_the_unsplit_run(p in exact_problem_strategy(4, 9), parts in 1u32..5) {
        shards_merge(&p, parts)?;
    }

    /// The factor engine counts and lists exactly what the exhaustive engine finds.
    #[test]
    fn factor_engine_equals_exhaustive(p in exact_problem_strategy(4, 9)) {
        use gearsieve::engine::{factor::FactorTables, SearchSpace};
        let space = SearchSpace::new(&p, None);
        prop_assert!(space.stages.is_empty() || FactorTables::new(&space).is_some(), "the factor engine takes these");
        let fast = run(&p, EngineChoice::Auto);
        let slow = run(&p, EngineChoice::Exhaustive);
        prop_assert_eq!(&fast, &slow);
        for t in &fast.trains {
            check_train(&p, t);
        }
    }
}

#[test]
fn factor_engine_equals_exhaustive_on_five_and_six_stages() {
    for (ratio, teeth, driver) in
        [("7/5", (5, 9), None), ("1", (6, 9), None), ("64/27", (3, 8), Some((3, 5)))]
    {
        let pool = Pool::to_cut(IntRange { lo: teeth.0, hi: teeth.1 }, 1.0, 20.0, None).unwrap();
        let target = Target::parse(ratio, "0").unwrap();
        let limits = StageLimits {
            driver_teeth: driver.map(|(lo, hi)| IntRange { lo, hi }),
            ..StageLimits::default()
        };
        let p =
            Problem::new(target, pool, IntRange { lo: 5, hi: 6 }, limits, None, DEFAULT_RANK.to_vec(), 30)
                .unwrap();
        let slow = run(&p, EngineChoice::Exhaustive);
        assert!(slow.count > 0, "{ratio}: {}", slow.count);
        assert_eq!(run(&p, EngineChoice::Auto), slow, "{ratio}");
    }
}

/// Five stages over a range where several primes play alike (13, 17, 19 and 23 are each carried
/// only by a gear of their own teeth), so the factor engine's classes of `k` stand for many `k`
/// each, with a prime repeated or several of a class together: held to the sieve, which walks
/// the stages.
#[test]
fn factor_engine_agrees_with_the_sieve_on_five_stages_where_primes_play_alike() {
    for ratio in ["1", "23/19", "26/17"] {
        let pool = Pool::to_cut(IntRange { lo: 10, hi: 24 }, 1.0, 20.0, None).unwrap();
        let target = Target::parse(ratio, "0").unwrap();
        let p = Problem::new(
            target,
            pool,
            IntRange { lo: 5, hi: 5 },
            StageLimits::default(),
            None,
            DEFAULT_RANK.to_vec(),
            20,
        )
        .unwrap();
        let sieve = run(&p, EngineChoice::Sieve);
        assert!(sieve.count > 1000, "{ratio}: {}", sieve.count);
        assert_eq!(run(&p, EngineChoice::Auto), sieve, "{ratio}");
    }
}

/// The factor engine against the sieve, an engine that finds each train by walking stages, on
/// four stages over a range too wide for the exhaustive reference in a test.
#[test]
fn factor_engine_agrees_with_the_sieve_on_four_stages() {
    for (ratio, rank) in
        [("7/5", DEFAULT_RANK.to_vec()), ("37/30", vec![RankKey::Span]), ("1", vec![RankKey::Error])]
    {
        let pool = Pool::to_cut(IntRange { lo: 12, hi: 40 }, 1.0, 20.0, None).unwrap();
        let target = Target::parse(ratio, "0").unwrap();
        let p = Problem::new(target, pool, IntRange { lo: 4, hi: 4 }, StageLimits::default(), None, rank, 20)
            .unwrap();
        let sieve = run(&p, EngineChoice::Sieve);
        assert!(sieve.count > 1000, "{ratio}: {}", sieve.count);
        assert_eq!(run(&p, EngineChoice::Auto), sieve, "{ratio}");
    }
}

/// Four-stage trains of `lo..=hi` teeth hitting `p/q` exactly, counted by a route that shares
/// nothing with the factor engine: stage ratios folded into distinct reduced values with
/// multiplicities, ordered stage 4-tuples from a convolution of value-pair products, and
/// Burnside's lemma (cycle index of S₄) with its repeat terms taken from the value table.
fn four_stage_count_by_value_pairs(lo: u64, hi: u64, p: u64, q: u64) -> u128 {
    use std::collections::HashMap;
    fn gcd(a: u64, b: u64) -> u64 {
        if b == 0 {
            a
        } else {
            gcd(b, a % b)
        }
    }
    let reduce = |n: u64, d: u64| {
        let g = gcd(n, d);
        (n / g, d / g)
    };
    let mut values: HashMap<(u64, u64), u128> = HashMap::new();
    for driver in lo..=hi {
        for driven in (lo..=hi).filter(|&d| d != driver) {
            *values.entry(reduce(driven, driver)).or_default() += 1;
        }
    }
    let mut pairs: HashMap<(u64, u64), u128> = HashMap::new();
    for (&(a, b), &ma) in &values {
        for (&(c, d), &mc) in &values {
            *pairs.entry(reduce(a * c, b * d)).or_default() += ma * mc;
        }
    }
    let get = |map: &HashMap<(u64, u64), u128>, n: u64, d: u64| map.get(&reduce(n, d)).copied().unwrap_or(0);
    let isqrt = |x: u64| (0..=x).find(|r| r * r >= x).filter(|r| r * r == x);
    // Identity: any four stages in order. (x)(y z w)… cycle types: [2,1,1], [2,2], [3,1], [4].
    let f1111: u128 = pairs.iter().map(|(&(n, d), &c)| c * get(&pairs, p * d, q * n)).sum();
    let (mut f211, mut f22, mut f31, mut f4) = (0u128, 0u128, 0u128, 0u128);
    for (&(a, b), &m) in &values {
        f211 += m * get(&pairs, p * b * b, q * a * a);
        f31 += m * get(&values, p * b * b * b, q * a * a * a);
        f4 += m * (a.pow(4) * q == b.pow(4) * p) as u128;
        let (n, d) = reduce(p * b * b, q * a * a);
        if let (Some(rn), Some(rd)) = (isqrt(n), isqrt(d)) {
            f22 += m * get(&values, rn, rd);
        }
    }
    let sum = f1111 + 6 * f211 + 3 * f22 + 8 * f31 + 6 * f4;
    assert_eq!(sum % 24, 0);
    sum / 24
}

fn factor_count(lo: u32, hi: u32, ratio: &str) -> u64 {
    let pool = Pool::to_cut(IntRange { lo, hi }, 1.0, 20.0, None).unwrap();
    let target = Target::parse(ratio, "0").unwrap();
    let p = Problem::new(
        target,
        pool,
        IntRange { lo: 4, hi: 4 },
        StageLimits::default(),
        None,
        DEFAULT_RANK.to_vec(),
        1,
    )
    .unwrap();
    run(&p, EngineChoice::Auto).count
}

#[test]
fn factor_counts_agree_with_a_convolution_of_value_pairs() {
    for (lo, hi, p, q) in
        [(12, 50, 7, 5), (12, 50, 1, 1), (12, 64, 61, 60), (20, 64, 37, 30), (12, 64, 64, 27)]
    {
        let want = four_stage_count_by_value_pairs(lo, hi, p, q);
        assert!(want > 0, "{p}/{q} over {lo}..{hi}");
        assert_eq!(
            factor_count(lo as u32, hi as u32, &format!("{p}/{q}")) as u128,
            want,
            "{p}/{q} over {lo}..{hi}"
        );
    }
}

/// The figure the benchmark asserts. Slow (minutes) and large (a few GiB): run by hand with
/// `cargo test --release --test engines -- --ignored`.
#[test]
#[ignore]
fn factor_count_of_127_over_120_on_four_stages_of_12_to_200() {
    let want = four_stage_count_by_value_pairs(12, 200, 127, 120);
    assert_eq!(want, 4_011_513_973);
    assert_eq!(factor_count(12, 200, "127/120") as u128, want);
}

/// Problems the meet engine cannot count in bulk, where it judges every choice of stages of a
/// sequence one by one: gears on hand with quantities (sometimes in two modules, so two mesh
/// groups), a train check, an extra ranking key, gear sets or trains, over four to six stages of
/// a few kinds (the exhaustive engine's reach); up to three stages they go to the sieve.
fn judged_strategy() -> impl Strategy<Value = Problem> {
    let target = ((6u64..40, 6u64..40), (6u64..40, 1u64..40), prop_oneof![1 => Just(0u64), 3 => 1u64..4000])
        .prop_map(|((a, b), (c, e), tol)| (a * b, c * e, tol));
    let deep = any::<bool>();
    let stock =
        prop::collection::vec((6u32..40, prop_oneof![3 => Just(1.0), 1 => Just(1.5)], 1u32..4), 4..14);
    let cut = (6u32..30, 2u32..8);
    let rank = prop_oneof![
        Just(DEFAULT_RANK.to_vec()),
        Just(vec![RankKey::Size, RankKey::Error]),
        Just(vec![RankKey::Span]),
    ];
    // Which trade-like checks: 0 none, 1 a train check, 2 an extra key, 3 both; with gears to
    // cut at least one, so that the engine judges one by one.
    (target, deep, stock, cut, any::<bool>(), 0u8..4, rank, 1usize..8, any::<(bool, bool)>()).prop_filter_map(
        "a problem the meet engine judges one by one",
        |((n, d, tol_ppm), deep, stock, (lo, w), on_hand, checks, rank, limit, (sets, pareto))| {
            let target = Target::exact(
                format!("{n}/{d}"),
                Ratio::new(n as u128, d as u128)?,
                Ratio::new(tol_ppm as u128 * 50, 1_000_000)?,
            );
            let pool = if on_hand {
                // Four stages over at most seven kinds, five and six over at most six, so the
                // exhaustive engine finishes.
                let take = if deep { 6 } else { 7 };
                let gears: Vec<StockGear> = stock
                    .into_iter()
                    .take(take)
                    .map(|(teeth, module_mm, quantity)| StockGear::on_hand(teeth, module_mm, 20.0, quantity))
                    .collect();
                Pool::from_stock(&gears, "random").ok()?
            } else {
                let w = if deep { w.min(2) } else { w.min(4) };
                Pool::to_cut(IntRange { lo, hi: lo + w }, 1.0, 20.0, None).ok()?
            };
            let checks = if on_hand { checks } else { checks.max(1) };
            let stages = if deep { IntRange { lo: 5, hi: 6 } } else { IntRange { lo: 4, hi: 4 } };
            let mut p = Problem::new(target, pool, stages, StageLimits::default(), None, rank, limit).ok()?;
            if checks & 1 == 1 {
                // No stage's driven gear more than twice the smallest driver of the train.
                p.train_check = Some(gearsieve::model::problem::TrainCheck::new(|t: &Train| {
                    let least = t.stages.iter().map(|s| s.driver.teeth).min().unwrap_or(0);
                    t.stages.iter().all(|s| s.driven.teeth <= 2 * least.max(1) + 10)
                }));
            }
            if checks & 2 == 2 {
                // The teeth of the first stage's driver, ranked after the rest.
                p.extra_key = Some(gearsieve::model::problem::ExtraKey::new("first driver", |t: &Train| {
                    t.stages.first().map_or(0.0, |s| s.driver.teeth as f64)
                }));
                p.rank.push(RankKey::Extra);
            }
            p.gear_sets = sets;
            p.pareto = pareto && checks & 2 == 0;
            Some(p)
        },
    )
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 120, ..ProptestConfig::default() })]

    /// What the meet engine judges one by one (gears on hand, train checks, extra keys, several
    /// mesh groups) it finds, counts and lists exactly as the exhaustive engine does, gear sets
    /// and their arrangements included; and the meet engine, not the sieve, takes it.
    #[test]
    fn meet_engine_judges_one_by_one_as_the_exhaustive_engine(p in judged_strategy()) {
        let space = gearsieve::engine::SearchSpace::new(&p, None);
        prop_assert!(!gearsieve::engine::meet::counts_in_bulk(&space));
        for n in p.stage_counts() {
            prop_assert!(gearsieve::engine::meet::applies(&space, n));
        }
        let options = RunOptions { list_arrangements: true, ..RunOptions::default() };
        let fast = search(&p, EngineChoice::Auto, &options);
        let slow = search(&p, EngineChoice::Exhaustive, &options);
        if std::env::var_os("GEARSIEVE_PROP_STATS").is_some() {
            eprintln!("count {} sets {:?} stages {} stock {} n {}", slow.count, slow.gear_set_count, slow.stage_options, p.pool.from_stock, p.stages);
        }
        prop_assert_eq!(fast, slow);
    }
}
