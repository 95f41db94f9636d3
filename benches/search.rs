//! Criterion benchmarks of the search on fixed inputs. Each measured closure asserts its result,
//! so `cargo test --benches` (run by CI) keeps them honest. The README's table of figures comes
//! from `benches/figures.sh`, which times the release binary on the same cases.

use criterion::{criterion_group, criterion_main, Criterion};
use gearsieve::model::pool::Pool;
use gearsieve::model::rank::DEFAULT_RANK;
use gearsieve::numbers::range::{IntRange, RatioRange};
use gearsieve::numbers::rational::Ratio;
use gearsieve::numbers::target::Target;
use gearsieve::{search, CountMode, EngineChoice, Problem, RunOptions, StageLimits};

fn problem(ratio: &str, tol: &str, teeth: (u32, u32), stages: (u32, u32)) -> Problem {
    let pool = Pool::to_cut(IntRange { lo: teeth.0, hi: teeth.1 }, 1.0, 20.0, None).expect("pool");
    let target = Target::parse(ratio, tol).expect("target");
    let stages = IntRange { lo: stages.0, hi: stages.1 };
    Problem::new(target, pool, stages, StageLimits::default(), None, DEFAULT_RANK.to_vec(), 20)
        .expect("problem")
}

fn benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("search");
    g.sample_size(10);

    // Engine against engine on a space the exhaustive engine finishes quickly.
    let small = problem("7.3", "100ppm", (12, 60), (2, 2));
    let reference = search(&small, EngineChoice::Exhaustive, &RunOptions::default());
    assert!(reference.count > 0);
    g.bench_function("exhaustive 2 stages 12..60 ratio 7.3 100ppm", |b| {
        b.iter(|| assert_eq!(search(&small, EngineChoice::Exhaustive, &RunOptions::default()), reference))
    });
    g.bench_function("sieve 2 stages 12..60 ratio 7.3 100ppm", |b| {
        b.iter(|| assert_eq!(search(&small, EngineChoice::Sieve, &RunOptions::default()), reference))
    });

    let two = problem("37.5", "1e-3", (12, 150), (2, 2));
    g.bench_function("sieve 2 stages 12..150 0.1%", |b| {
        b.iter(|| assert!(search(&two, EngineChoice::Sieve, &RunOptions::default()).count > 0))
    });

    let three = problem("37.5", "10ppm", (12, 150), (3, 3));
    g.bench_function("sieve 3 stages 12..150 10ppm", |b| {
        b.iter(|| assert!(search(&three, EngineChoice::Sieve, &RunOptions::default()).count > 1_000_000))
    });

    // Exact targets: the factor engine counts every train without visiting it. Side by side
    // with the sieve on a space the sieve finishes, then alone on one it cannot.
    let exact_small = problem("7/5", "0", (12, 48), (4, 4));
    let by_sieve = search(&exact_small, EngineChoice::Sieve, &RunOptions::default());
    assert!(by_sieve.count > 100_000);
    g.bench_function("sieve 4 stages 12..48 7/5 exact", |b| {
        b.iter(|| assert_eq!(search(&exact_small, EngineChoice::Sieve, &RunOptions::default()), by_sieve))
    });
    g.bench_function("fast (factor) 4 stages 12..48 7/5 exact", |b| {
        b.iter(|| assert_eq!(search(&exact_small, EngineChoice::Auto, &RunOptions::default()), by_sieve))
    });
    let exact = problem("127/120", "0", (12, 200), (4, 4));
    g.bench_function("fast (factor) 4 stages 12..200 127/120 exact", |b| {
        // The same count comes from an independent convolution of value-pair products with
        // Burnside's repeat terms (the ignored test in tests/engines.rs).
        b.iter(|| assert_eq!(search(&exact, EngineChoice::Auto, &RunOptions::default()).count, 4_011_513_973))
    });

    // A near target over four stages: the meet engine's table of last pairs and its slices of
    // first pairs. The count is the one the earlier engine (a table of every pair) printed for
    // the same search, with the same best 20.
    let four = problem("29.530588", "1ppm", (12, 150), (4, 4));
    g.bench_function("fast (meet) 4 stages 12..150 29.530588 1ppm", |b| {
        b.iter(|| {
            let out = search(&four, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.count, 397_803_297);
            assert_eq!(out.trains.len(), 20);
        })
    });
    g.finish();
}

/// Exact targets over five stages: the factor engine's count by classes of k. The count is the
/// one the earlier engine (a term for every k) printed for the same search, with the same best 20.
fn five_stage_benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("search five stages");
    g.sample_size(10);
    let exact = problem("127/120", "0", (12, 160), (5, 5));
    g.bench_function("fast (factor) 5 stages 12..160 127/120 exact", |b| {
        b.iter(|| {
            let out = search(&exact, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.count, 1_297_738_801_453);
            assert_eq!(out.trains.len(), 20);
        })
    });
    // The same search as `search --ratio 127/120 --teeth 12..160 --stages 5`, which lists gear
    // sets: both counts and the best 20 sets are the ones the engine printed before its
    // divisors were read from one list per side (sizes of the 20, and the best set's stages).
    let exact_sets = Problem { gear_sets: true, ..exact.clone() };
    g.bench_function("fast (factor) 5 stages 12..160 127/120 exact, gear sets", |b| {
        b.iter(|| {
            let out = search(&exact_sets, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.count, 1_297_738_801_453);
            assert_eq!(out.gear_set_count, Some(13_526_417_998));
            let sizes: Vec<u32> = out.trains.iter().map(|t| t.size()).collect();
            assert_eq!(
                sizes,
                [
                    271, 272, 272, 273, 273, 273, 274, 274, 274, 274, 275, 275, 275, 275, 276, 276, 276, 276,
                    276, 276
                ]
            );
            let best: Vec<(u32, u32)> =
                out.trains[0].stages.iter().map(|s| (s.driver.teeth, s.driven.teeth)).collect();
            assert_eq!(best, [(24, 12), (20, 12), (18, 12), (18, 12), (16, 127)]);
        })
    });
    g.finish();
}

/// Near targets over five stages on the meet engine: prefixes of three values grown in order,
/// the last pair from its table.
fn deep_benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("deep");
    g.sample_size(10);
    // The count is the one the meet engine printed for `search --ratio 29.530588 --tol 1ppm
    // --teeth 12..60 --stages 5`; smaller spaces of five and six stages are held to the
    // exhaustive engine by `meet_engine_equals_exhaustive_on_five_and_six_stages`.
    let five = problem("29.530588", "1ppm", (12, 60), (5, 5));
    let counted = search(&five, EngineChoice::Auto, &RunOptions::default());
    g.bench_function("fast (meet) 5 stages 12..60 29.530588 1ppm", |b| {
        b.iter(|| {
            let out = search(&five, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.count, 11_252_487);
            assert_eq!(out.trains.len(), 20);
        })
    });
    // The same listing without counting every train (the window engine), side by side.
    let five_best = five.clone().with_count(CountMode::LowerBound).expect("lower bound");
    g.bench_function("fast (window) 5 stages 12..60 29.530588 1ppm, lower-bound count", |b| {
        b.iter(|| {
            let out = search(&five_best, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.trains, counted.trains);
            assert!(!out.counted_all && out.count < counted.count);
        })
    });
    // Five stages of 10..120 near 365.2422, which the meet engine forecasts at half an hour:
    // the best train is the one `search --count lower-bound` printed (checked by hand:
    // 31·31·31·11·11 drivers, 47·58·72·78·86 driven, -3.19e-12).
    let year = problem("365.2422", "1ppm", (10, 120), (5, 5))
        .with_count(CountMode::LowerBound)
        .expect("lower bound");
    g.bench_function("fast (window) 5 stages 10..120 365.2422 1ppm, lower-bound count", |b| {
        b.iter(|| {
            let out = search(&year, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.trains.len(), 20);
            assert_eq!(out.trains[0].ratio.to_string(), "1316592576/3604711");
            assert!(!out.counted_all);
        })
    });
    g.finish();
}

/// Listing gear sets against listing trains, on the same searches.
fn gear_set_benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("gear sets");
    g.sample_size(10);
    let with_sets = |p: &Problem| Problem { gear_sets: true, ..p.clone() };

    // The sieve counts a set by its canonical arrangement, tested on every train it finds.
    let three = problem("37.5", "10ppm", (12, 150), (3, 3));
    let three_sets = with_sets(&three);
    let trains = search(&three, EngineChoice::Sieve, &RunOptions::default()).count;
    g.bench_function("sieve 3 stages 12..150 10ppm, trains", |b| {
        b.iter(|| assert_eq!(search(&three, EngineChoice::Sieve, &RunOptions::default()).count, trains))
    });
    g.bench_function("sieve 3 stages 12..150 10ppm, gear sets", |b| {
        b.iter(|| {
            let out = search(&three_sets, EngineChoice::Sieve, &RunOptions::default());
            assert_eq!(out.count, trains);
            assert!(out.gear_set_count.is_some_and(|s| s > 0 && s < trains));
        })
    });

    // The meet engine's set counter over each side's 16 million multisets of four teeth. The
    // set count is the one this counter printed; the counter is held to brute forces on small
    // spaces (its unit tests and tests/gear_sets.rs).
    let four = with_sets(&problem("29.530588", "1ppm", (12, 150), (4, 4)));
    g.bench_function("fast (meet) 4 stages 12..150 29.530588 1ppm, gear sets", |b| {
        b.iter(|| {
            let out = search(&four, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.count, 397_803_297);
            assert_eq!(out.gear_set_count, Some(18_689_573));
        })
    });

    // The same search with every stage between 1:1 and 6:1: only some pairings are stages, so
    // each pair of multisets within tolerance is tested for a matching into stages. The counts
    // are the ones this counter printed; it is held to brute forces on small spaces (its unit
    // tests and tests/gear_sets.rs).
    let limits = StageLimits {
        stage_ratio: Some(RatioRange { lo: Ratio::new(1, 1), hi: Ratio::new(6, 1) }),
        ..StageLimits::default()
    };
    let pool = Pool::to_cut(IntRange { lo: 12, hi: 150 }, 1.0, 20.0, None).expect("pool");
    let target = Target::parse("29.530588", "1ppm").expect("target");
    let stages = IntRange { lo: 4, hi: 4 };
    let banded =
        Problem::new(target, pool, stages, limits, None, DEFAULT_RANK.to_vec(), 20).expect("problem");
    let banded = with_sets(&banded);
    g.bench_function("fast (meet) 4 stages 12..150 29.530588 1ppm stage ratio 1..6, gear sets", |b| {
        b.iter(|| {
            let out = search(&banded, EngineChoice::Auto, &RunOptions::default());
            assert_eq!(out.count, 129_404_884);
            assert_eq!(out.gear_set_count, Some(14_769_270));
        })
    });
    g.finish();
}

criterion_group!(search_benches, benches, five_stage_benches, deep_benches, gear_set_benches);
criterion_main!(search_benches);
