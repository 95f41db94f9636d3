//! The CSV format for clock trains: a header row, then one row per listed gear set's train, best
//! first (and one per other arrangement of each set, when asked for), one value per cell: the
//! train's own columns, how many arrangements its set has and which this is, the clock's figures
//! (rate, arbor speeds, dial period and drift), then the numbered stage columns from the input
//! arbor. It computes nothing about gears.

use std::io::{self, Write};

use super::document::arbor_names;
use super::train_json;
use crate::geometry::CycloidalMesh;
use crate::model::problem::Problem;
use crate::model::train::Train;
use crate::report::fields::{decimals, small, train_cells, StageColumns, TrainJson, TRAIN_HEADER};
use crate::trades::clock::astro::{AstroPlan, AstroTrain};
use crate::trades::clock::going::GoingPlan;
use crate::trades::clock::motion::MotionPlan;
use crate::trades::clock::strike::StrikePlan;

/// Header and rows: `rank`, the train columns, `arrangements` and `arrangement` (1 for the
/// set's listed train, 2… for its others), `extra` columns, then the stage columns. `items`
/// holds each listed set's arrangements, its listed train first.
fn write_rows<T>(
    w: &mut dyn Write,
    problem: &Problem,
    mesh: bool,
    extra: &[String],
    items: &[(u64, Vec<T>)],
    train: impl Fn(&T) -> TrainJson,
    cells: impl Fn(&T) -> Vec<String>,
) -> io::Result<()> {
    let stages = StageColumns { stages: problem.stages.hi as usize, mesh };
    let mut c = ::csv::Writer::from_writer(w);
    let mut head = vec!["rank".to_string()];
    head.extend(TRAIN_HEADER.iter().map(|s| s.to_string()));
    head.extend(SET_HEADER.iter().map(|s| s.to_string()));
    head.extend(extra.iter().cloned());
    head.extend(stages.header());
    c.write_record(&head)?;
    for (n, (count, arranged)) in items.iter().enumerate() {
        for (j, item) in arranged.iter().enumerate() {
            let t = train(item);
            let mut row = vec![(n + 1).to_string()];
            row.extend(train_cells(&t));
            row.extend([count.to_string(), (j + 1).to_string()]);
            row.extend(cells(item));
            row.extend(stages.cells(&t));
            c.write_record(&row)?;
        }
    }
    c.flush()
}

/// One arrangement as a row is made of: its train and its cycloidal pairs.
type Arranged<'a> = (&'a Train, &'a [CycloidalMesh]);

/// The gear-set columns, after the train's own.
const SET_HEADER: [&str; 2] = ["arrangements", "arrangement"];

/// Write a going-train search: the rate error and the speed of every arbor, named by its place.
pub fn write_going(p: &GoingPlan, w: &mut dyn Write) -> io::Result<()> {
    let arbors = p.problem.stages.hi as usize + 1;
    let mut extra = ["rate_s_per_day", "tooth_form", "seconds_arbor"].map(String::from).to_vec();
    for k in 1..=arbors {
        extra.push(format!("arbor{k}_name"));
        extra.push(format!("arbor{k}_turns_per_hour"));
    }
    let form = p.spec.meshes.map_or("", |m| m.tooth_form.as_str());
    write_rows(
        w,
        &p.problem,
        p.spec.meshes.is_some(),
        &extra,
        &p.trains
            .iter()
            .map(|g| (g.arrangements, std::iter::once(g).chain(&g.others).collect()))
            .collect::<Vec<_>>(),
        |g| train_json(&g.train, &g.cycloidal),
        |g| {
            let names = arbor_names(g.train.stages.len(), "centre");
            let seconds = g.seconds_arbor.map_or(String::new(), |k| names[k].clone());
            let mut cells = vec![decimals(g.rate_s_per_day, 3), form.to_string(), seconds];
            for k in 0..arbors {
                match (names.get(k), g.arbor_turns_per_hour.get(k)) {
                    (Some(name), Some(v)) => cells.extend([name.clone(), decimals(*v, 6)]),
                    _ => cells.extend([String::new(), String::new()]),
                }
            }
            cells
        },
    )
}

/// Write a motion-work search, with the worked-out meshes.
pub fn write_motion(p: &MotionPlan, w: &mut dyn Write) -> io::Result<()> {
    let pairs = |k: usize| p.cycloidal.get(k).map_or(&[][..], |v| &v[..]);
    let sets: Vec<(u64, Vec<Arranged>)> = (0..p.trains.len())
        .map(|k| {
            let mut all = vec![(&p.trains[k], pairs(k))];
            all.extend(p.others_of(k).iter().map(|a| (&a.train, &a.cycloidal[..])));
            (p.arrangements_of(k), all)
        })
        .collect();
    let form = p.spec.tooth_form.as_str();
    write_rows(
        w,
        &p.problem,
        true,
        &["tooth_form".to_string()],
        &sets,
        |&(t, pairs)| train_json(t, pairs),
        |_| vec![form.to_string()],
    )
}

/// Write an astronomical-train search: the dial period, the drift and the days to a day out.
pub fn write_astro(p: &AstroPlan, w: &mut dyn Write) -> io::Result<()> {
    let extra = ["period_days", "drift_days_per_year", "days_to_one_day"].map(String::from);
    let sets: Vec<(u64, Vec<(&AstroTrain, &Train)>)> = p
        .trains
        .iter()
        .map(|a| (a.arrangements, std::iter::once(&a.train).chain(&a.others).map(|t| (a, t)).collect()))
        .collect();
    write_rows(
        w,
        &p.problem,
        false,
        &extra,
        &sets,
        |&(_, t)| TrainJson::from_train(t),
        |&(a, _)| {
            vec![
                decimals(a.period_days, 9),
                small(a.drift_days_per_year),
                a.days_to_one_day.map_or(String::new(), |d| decimals(d, 0)),
            ]
        },
    )
}

/// Write a striking-train search: one row per train of each part, the part named by its first
/// and last arbors.
pub fn write_strike(p: &StrikePlan, w: &mut dyn Write) -> io::Result<()> {
    let most = p.parts.iter().map(|g| g.part.stages.hi as usize).max().unwrap_or(1);
    let stages = StageColumns { stages: most, mesh: p.spec.meshes.is_some() };
    let mut c = ::csv::Writer::from_writer(w);
    let mut head = ["part_from", "part_to", "rank"].map(String::from).to_vec();
    head.extend(TRAIN_HEADER.iter().map(|s| s.to_string()));
    head.extend(SET_HEADER.iter().map(|s| s.to_string()));
    head.extend(stages.header());
    c.write_record(&head)?;
    for g in &p.parts {
        for (n, t) in g.trains.iter().enumerate() {
            let others = g.others_of(n).iter().map(|a| (&a.train, &a.cycloidal[..]));
            for (j, (t, pairs)) in std::iter::once((t, g.pairs(n))).chain(others).enumerate() {
                let t = train_json(t, pairs);
                let mut row = vec![g.part.arbors[0].clone(), g.part.arbors[g.part.arbors.len() - 1].clone()];
                row.push((n + 1).to_string());
                row.extend(train_cells(&t));
                row.extend([g.arrangements_of(n).to_string(), (j + 1).to_string()]);
                row.extend(stages.cells(&t));
                c.write_record(&row)?;
            }
        }
    }
    c.flush()
}
