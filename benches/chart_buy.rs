//! Criterion benchmark of `chart --buy 2` on the shipped demo lathe (the Brackenfold lathe file:
//! 8 TPI leadscrew, three-position gearbox, one-slot banjo) over the ISO metric coarse series:
//! with its own gears, which already cut every thread within 0.1 %, and with the catalogue
//! without the 127-tooth gear held to exact pitches, where the 127 is the one gear to buy. Each
//! measured closure asserts its result.

use std::path::PathBuf;

use criterion::{criterion_group, criterion_main, Criterion};
use gearsieve::model::catalog::{load, CatalogueDefaults};
use gearsieve::model::pool::Pool;
use gearsieve::model::purchase::Purchase;
use gearsieve::numbers::range::IntRange;
use gearsieve::numbers::rational::Ratio;
use gearsieve::trades::thread::chart_buy::buy_chart;
use gearsieve::trades::thread::lathe_file::load_lathe;
use gearsieve::trades::thread::machine::Machine;
use gearsieve::trades::thread::series::built_in;
use gearsieve::trades::thread::{Equipment, Lathe};
use gearsieve::RunOptions;

fn path(parts: &[&str]) -> PathBuf {
    let mut p = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    p.extend(parts);
    p
}

/// The demo lathe as its file describes it, with the gears of `catalogue` when given, at
/// pitch tolerance `tolerance`, stages 1..2 (the command's defaults).
fn demo_lathe(catalogue: Option<&str>, tolerance: Ratio) -> Lathe {
    let file = load_lathe(&path(&["catalogs", "lathe", "brackenfold.lathe"])).unwrap();
    let stock = match catalogue {
        Some(c) => {
            load(&path(&["catalogs", c]), CatalogueDefaults { module_mm: None, pressure_angle_deg: 20.0 })
                .unwrap()
        }
        None => file.stock(None, None).unwrap().unwrap(),
    };
    let pool = Pool::from_stock(&stock, "bench").unwrap();
    let machine = Machine {
        leadscrew: file.leadscrew.clone().unwrap(),
        stud_ratio: file.stud_ratio.unwrap_or(Ratio::integer(1)),
        gearbox: file.gearbox.clone(),
    };
    let equipment = Equipment {
        name: file.name.clone(),
        largest_teeth: file.largest_teeth,
        left_out: Vec::new(),
        tumbler_reverse: file.tumbler_reverse,
        dial: file.dial,
    };
    Lathe::new(machine, pool, file.banjo.clone(), IntRange { lo: 1, hi: 2 }, tolerance, 1)
        .unwrap()
        .equipped(equipment)
        .unwrap()
}

fn bench(c: &mut Criterion) {
    let series = built_in("iso-coarse").unwrap();
    let offer = |lathe: &Lathe| {
        Purchase::new(lathe.pool.clone(), 2, Some(IntRange { lo: 20, hi: 127 }), None).unwrap()
    };
    let mut group = c.benchmark_group("chart_buy");
    group.sample_size(10);

    let own = demo_lathe(None, Ratio::from_parts(1, 1000).unwrap());
    let purchase = offer(&own);
    group.bench_function("buy 2, iso-coarse, demo lathe, 0.1%", |b| {
        b.iter(|| {
            let found = buy_chart(&own, &series, &purchase, 10, &RunOptions::default()).unwrap();
            assert!(found.complete && found.on_hand() == series.len() && found.choices.is_empty());
        })
    });

    let no127 = demo_lathe(Some("lathe-change-gears-no127.csv"), Ratio::integer(0));
    let purchase = offer(&no127);
    group.bench_function("buy 2, iso-coarse, demo lathe without its 127, exact", |b| {
        b.iter(|| {
            let found = buy_chart(&no127, &series, &purchase, 10, &RunOptions::default()).unwrap();
            assert_eq!(found.on_hand(), 0);
            assert_eq!(found.choices[0].basket.teeth(), &[127]);
            assert_eq!(found.choices[0].gains.len(), series.len());
        })
    });
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
