//! Criterion benchmarks of gear outlines on fixed gears. Each measured closure checks the outline
//! it makes against one made before timing started, so `cargo test --benches` keeps them honest.

use criterion::{criterion_group, criterion_main, Criterion};
use gearsieve::geometry::outline::{gear_outline, DEFAULT_TOLERANCE_MM};
use gearsieve::geometry::{RackProfile, ToothSystem};

fn benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("outline");
    for (module_mm, teeth, shift) in [(1.0, 100, 0.0), (1.0, 17, 0.0), (5.0, 100, 0.3), (1.0, 12, -0.3)] {
        let system = ToothSystem::new(module_mm, 20.0, RackProfile::default()).expect("tooth system");
        let reference = gear_outline(&system, teeth, shift, 0.0, DEFAULT_TOLERANCE_MM).expect("outline");
        let name = format!("m {module_mm} z {teeth} x {shift} at 1 µm ({} points)", reference.points.len());
        g.bench_function(name, |b| {
            b.iter(|| {
                let o = gear_outline(&system, teeth, shift, 0.0, DEFAULT_TOLERANCE_MM).expect("outline");
                assert_eq!(o.points.len(), reference.points.len());
                assert_eq!(o.points[o.points.len() / 2], reference.points[reference.points.len() / 2]);
                o
            })
        });
    }
    g.finish();
}

criterion_group!(outline, benches);
criterion_main!(outline);
