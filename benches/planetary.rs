//! Criterion benchmarks of the planetary search on fixed inputs: rings up to 200 teeth, three to
//! six planets. Each measured closure asserts its result against a run made before timing
//! starts, and every case must find designs, so `cargo test --benches` keeps them honest.

use criterion::{criterion_group, criterion_main, Criterion};
use gearsieve::geometry::MeshLimits;
use gearsieve::numbers::range::IntRange;
use gearsieve::numbers::rational::Ratio;
use gearsieve::trades::planetary::{search, Arrangement, Member, PlanetaryProblem, PlanetarySpec, Spacing};

fn range(lo: u32, hi: u32) -> IntRange {
    IntRange { lo, hi }
}

/// Ring 40..200, three to six planets, module 2, the ratio within `tol`.
fn spec(arrangement: Arrangement, ratio: Ratio, tol: Ratio) -> PlanetarySpec {
    PlanetarySpec {
        arrangement,
        ratio,
        tolerance: tol,
        ring_teeth: range(40, 200),
        planets: range(3, 6),
        module_mm: 2.0,
        limit: 20,
        ..PlanetarySpec::reduction(Ratio::integer(1))
    }
}

/// Profile shift allowed per mesh, the carrier half a module beyond midway, meshes checked.
fn shifted_and_checked(spec: PlanetarySpec) -> PlanetarySpec {
    PlanetarySpec {
        shift_sum: (-0.2, 1.0),
        carrier_offset_modules: 0.5,
        mesh_limits: Some(MeshLimits::default()),
        ..spec
    }
}

/// Cases (ranges in the specs): simple, sun 12..100 and planets 12..90; stepped, sun and
/// planets 12..60, and "wide" 12..100; two-ring, planets 12..60, and "wide" 12..100; every
/// ring 40..200 and 3..6 planets.
fn benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("planetary");
    g.sample_size(10);
    let ring_held = Member::Ring;
    let cases = [
        (
            "simple 7.3 ±0.5% unshifted",
            PlanetarySpec {
                sun_teeth: range(12, 100),
                planet_teeth: range(12, 90),
                ..spec(
                    Arrangement::Simple { fixed: ring_held, input: Member::Sun },
                    Ratio::new(73, 10).unwrap(),
                    Ratio::new(1, 200).unwrap(),
                )
            },
        ),
        (
            "simple 7.3 ±0.5% shifted checked near-equal",
            PlanetarySpec {
                sun_teeth: range(12, 100),
                planet_teeth: range(12, 90),
                spacing: Spacing::NearEqual,
                ..shifted_and_checked(spec(
                    Arrangement::Simple { fixed: ring_held, input: Member::Sun },
                    Ratio::new(73, 10).unwrap(),
                    Ratio::new(1, 200).unwrap(),
                ))
            },
        ),
        (
            "stepped 20 ±0.5% shifted checked",
            PlanetarySpec {
                sun_teeth: range(12, 60),
                planet_teeth: range(12, 60),
                ..shifted_and_checked(spec(
                    Arrangement::Stepped { fixed: ring_held, input: Member::Sun },
                    Ratio::integer(20),
                    Ratio::new(1, 200).unwrap(),
                ))
            },
        ),
        (
            "stepped wide 20 ±1% shifted checked",
            PlanetarySpec {
                sun_teeth: range(12, 100),
                planet_teeth: range(12, 100),
                ..shifted_and_checked(spec(
                    Arrangement::Stepped { fixed: ring_held, input: Member::Sun },
                    Ratio::integer(20),
                    Ratio::new(1, 100).unwrap(),
                ))
            },
        ),
        (
            "two-ring wide 100 ±1% shifted checked",
            PlanetarySpec {
                planet_teeth: range(12, 100),
                ..shifted_and_checked(spec(
                    Arrangement::TwoRing,
                    Ratio::integer(100),
                    Ratio::new(1, 100).unwrap(),
                ))
            },
        ),
        (
            "two-ring 100 ±0.5% shifted checked",
            PlanetarySpec {
                planet_teeth: range(12, 60),
                ..shifted_and_checked(spec(
                    Arrangement::TwoRing,
                    Ratio::integer(100),
                    Ratio::new(1, 200).unwrap(),
                ))
            },
        ),
    ];
    for (name, spec) in cases {
        let problem = PlanetaryProblem::new(spec).expect("valid bench problem");
        let reference = search(&problem);
        assert!(reference.count > 0, "{name}: no designs");
        assert!(!reference.designs.is_empty());
        g.bench_function(name, |b| b.iter(|| assert_eq!(search(&problem), reference)));
    }
    g.finish();
}

criterion_group!(planetary, benches);
criterion_main!(planetary);
