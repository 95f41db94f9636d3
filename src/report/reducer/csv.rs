//! The CSV format for reducers: a header row, then one row per train, best first. Per-stage
//! values are space-separated, input stage first. A sink.

use std::io::{self, Write};

use crate::trades::reducer::hunting::{non_hunting, spread};
use crate::trades::reducer::{centre_distance_sum_mm, largest_tip_mm, ReducerPlan};

/// Write a reducer search as CSV.
pub fn write(p: &ReducerPlan, w: &mut dyn Write) -> io::Result<()> {
    let mut c = ::csv::Writer::from_writer(w);
    c.write_record([
        "rank",
        "ratio",
        "value",
        "error",
        "modules",
        "pinion>gear",
        "shifts",
        "centre_distances_mm",
        "largest_tip_mm",
        "centre_distance_sum_mm",
        "balance",
        "non_hunting",
        "output_rpm",
    ])?;
    for (n, t) in p.trains.iter().enumerate() {
        let join = |f: &dyn Fn(&crate::model::train::Stage) -> String| {
            t.stages.iter().map(f).collect::<Vec<_>>().join(" ")
        };
        c.write_record([
            (n + 1).to_string(),
            t.ratio.to_string(),
            t.ratio.to_f64().to_string(),
            t.error.to_f64().to_string(),
            join(&|s| s.module_mm.to_string()),
            join(&|s| format!("{}>{}", s.driver.teeth, s.driven.teeth)),
            join(&|s| s.mesh.map_or("0/0".into(), |m| format!("{}/{}", m.shift[0], m.shift[1]))),
            join(&|s| s.mesh.map_or(s.centre_distance_mm(), |m| m.centre_distance_mm).to_string()),
            largest_tip_mm(t).to_string(),
            centre_distance_sum_mm(t).to_string(),
            spread(t).to_string(),
            non_hunting(t).to_string(),
            p.spec.input_rpm.map_or(String::new(), |rpm| (rpm / t.ratio.to_f64()).to_string()),
        ])?;
    }
    c.flush()
}
