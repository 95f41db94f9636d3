//! Criterion benchmarks of the search on fixed inputs. Each measured closure asserts its result,
//! so `cargo test --benches` (run by CI) keeps them honest. The README's table of figures comes
//! from `benches/figures.sh`, which times the release binary on the same cases.

use criterion::{criterion_group, criterion_main, Criterion};
use gearsieve::pool::Pool;
use gearsieve::range::IntRange;
use gearsieve::rank::DEFAULT_RANK;
use gearsieve::target::Target;
use gearsieve::{search, EngineKind, Problem, RunOptions, StageLimits};

fn problem(ratio: &str, tol: &str, teeth: (u32, u32), stages: (u32, u32)) -> Problem {
    let pool = Pool::to_cut(IntRange { lo: teeth.0, hi: teeth.1 }, 1.0, 20.0, None).expect("pool");
    let target = Target::parse(ratio, tol, "--ratio", "--tol").expect("target");
    let stages = IntRange { lo: stages.0, hi: stages.1 };
    Problem::new(target, pool, stages, StageLimits::default(), None, DEFAULT_RANK.to_vec(), 20)
        .expect("problem")
}

fn benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("search");
    g.sample_size(10);

    // Engine against engine on a space the exhaustive engine finishes quickly.
    let small = problem("7.3", "100ppm", (12, 60), (2, 2));
    let reference = search(&small, EngineKind::Exhaustive, &RunOptions::default());
    assert!(reference.count > 0);
    g.bench_function("exhaustive 2 stages 12..60 ratio 7.3 100ppm", |b| {
        b.iter(|| assert_eq!(search(&small, EngineKind::Exhaustive, &RunOptions::default()), reference))
    });
    g.bench_function("sieve 2 stages 12..60 ratio 7.3 100ppm", |b| {
        b.iter(|| assert_eq!(search(&small, EngineKind::Sieve, &RunOptions::default()), reference))
    });

    let two = problem("37.5", "1e-3", (12, 150), (2, 2));
    g.bench_function("sieve 2 stages 12..150 0.1%", |b| {
        b.iter(|| assert!(search(&two, EngineKind::Sieve, &RunOptions::default()).count > 0))
    });

    let three = problem("37.5", "10ppm", (12, 150), (3, 3));
    g.bench_function("sieve 3 stages 12..150 10ppm", |b| {
        b.iter(|| assert!(search(&three, EngineKind::Sieve, &RunOptions::default()).count > 1_000_000))
    });
    g.finish();
}

criterion_group!(search_benches, benches);
criterion_main!(search_benches);
