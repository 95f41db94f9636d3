//! The CSV format for reducers: a header row, then one row per train, best first, one value per
//! cell: the train's own columns, the reducer's figures (balance, hunting pairs, envelope,
//! output speed), then the numbered stage columns with the worked-out meshes and whether each
//! pair is hunting, then the tightest gap between a gear and another shaft and, per stage, the
//! backlash and each gear's data (allowances, span, balls, chordal). It computes nothing about
//! gears.

use std::io::{self, Write};

use crate::model::train::Train;
use crate::report::fields::{decimals, figure, mm, train_cells, StageColumns, TrainJson, TRAIN_HEADER};
use crate::report::gear_data;
use crate::trades::reducer::hunting::{is_hunting, non_hunting, spread};
use crate::trades::reducer::{centre_distance_sum_mm, largest_tip_mm, ReducerPlan};

/// The backlash columns of each stage.
const BACKLASH: [&str; 4] = [
    "normal_backlash_least_mm",
    "normal_backlash_most_mm",
    "circumferential_backlash_least_mm",
    "circumferential_backlash_most_mm",
];

/// Write a reducer search as CSV.
pub fn write(p: &ReducerPlan, w: &mut dyn Write) -> io::Result<()> {
    let n_stages = p.problem.stages.hi as usize;
    let stages = StageColumns { stages: n_stages, mesh: true };
    let mut c = ::csv::Writer::from_writer(w);
    let mut head = vec!["rank".to_string()];
    head.extend(TRAIN_HEADER.iter().map(|s| s.to_string()));
    head.extend(
        [
            "balance",
            "non_hunting_pairs",
            "largest_tip_diameter_mm",
            "centre_distance_sum_mm",
            "output_rpm",
            "arrangements",
            "arrangement",
        ]
        .map(String::from),
    );
    head.extend(stages.header());
    head.extend((1..=n_stages).map(|k| format!("stage{k}_hunting")));
    head.push("tightest_shaft_clearance_mm".to_string());
    for k in 1..=n_stages {
        head.extend(BACKLASH.iter().map(|f| format!("stage{k}_{f}")));
        head.extend(gear_data::csv_header(&format!("stage{k}_driver_")));
        head.extend(gear_data::csv_header(&format!("stage{k}_driven_")));
    }
    c.write_record(&head)?;
    // The columns every arrangement has: rank, the train, the reducer's figures, the stages.
    let train_row = |n: usize, t: &Train, arrangement: usize| {
        let view = TrainJson::from_train(t);
        let mut row = vec![(n + 1).to_string()];
        row.extend(train_cells(&view));
        row.extend([
            figure(spread(t)),
            non_hunting(t).to_string(),
            mm(largest_tip_mm(t)),
            mm(centre_distance_sum_mm(t)),
            p.spec.input_rpm.map_or(String::new(), |rpm| decimals(rpm / t.ratio.to_f64(), 3)),
            p.arrangements.get(n).map_or(String::new(), u64::to_string),
            arrangement.to_string(),
        ]);
        row.extend(stages.cells(&view));
        row.extend(
            (0..n_stages).map(|k| t.stages.get(k).map_or(String::new(), |s| is_hunting(s).to_string())),
        );
        row
    };
    for (n, t) in p.trains.iter().enumerate() {
        let mut row = train_row(n, t, 1);
        let shop = p.shop.get(n);
        row.push(shop.and_then(|s| s.tightest).map_or(String::new(), |c| mm(c.gap_mm)));
        for k in 0..n_stages {
            let pair = shop.and_then(|s| s.stages.get(k)).and_then(Option::as_ref);
            let plan = pair.and_then(|p| p.backlash);
            row.extend(match plan {
                Some(b) => [
                    mm(b.backlash.normal_mm[0]),
                    mm(b.backlash.normal_mm[1]),
                    mm(b.backlash.circumferential_mm[0]),
                    mm(b.backlash.circumferential_mm[1]),
                ],
                None => Default::default(),
            });
            row.extend(gear_data::csv_cells(pair.map(|p| &p.gears[0])));
            row.extend(gear_data::csv_cells(pair.map(|p| &p.gears[1])));
        }
        let width = row.len();
        c.write_record(&row)?;
        // The other arrangements, when asked for: the train's own columns, the shop's left empty
        // (the gear data of the listed arrangement is what the shop cuts).
        for (k, o) in p.others.get(n).into_iter().flatten().enumerate() {
            let mut row = train_row(n, o, k + 2);
            row.resize(width, String::new());
            c.write_record(&row)?;
        }
    }
    c.flush()
}
