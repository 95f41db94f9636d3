//! A search's result as the one document every format is made from ([`Doc`], the JSON
//! contract): what was asked, the counts, and each listed train with its gear set's other
//! arrangements, the gears it needs bought and, when the mesh was worked out and asked for, its
//! gear data. This is where the presentation gathers what it shows; the formats
//! (`json.rs`, `csv.rs`, `document.rs`) only write it.

use super::json::{CountKind, Doc, RejectionJson};
use super::SearchReport;
use crate::geometry::allowance::BacklashChoice;
use crate::geometry::measure::pair_data;
use crate::geometry::ToothSystem;
use crate::report::fields::{TargetJson, TrainJson};
use crate::report::words::CONVENTION;
use crate::report::SCHEMA_VERSION;

/// The target of a problem as JSON.
pub fn target_json(problem: &crate::model::problem::Problem) -> TargetJson {
    let t = &problem.target;
    TargetJson {
        ratio: t.text.clone(),
        value: t.ratio.to_f64(),
        tolerance: t.tolerance.to_f64(),
        exact: t.ratio.to_string(),
    }
}

/// The document for a report.
pub fn doc(report: &SearchReport) -> Doc {
    let p = report.problem;
    Doc {
        schema_version: SCHEMA_VERSION,
        target: target_json(p),
        gears: p.buy.as_ref().map_or_else(|| p.pool.describe(), |b| b.on_hand.describe()),
        stage_counts: p.stage_counts(),
        stage_options: report.outcome.stage_options,
        mesh_checks: p.mesh.is_some(),
        mixed_modules: p.pool.groups.len() > 1,
        count: report.outcome.count,
        gear_set_count: report.outcome.gear_set_count,
        count_kind: match report.outcome.counted_all {
            true => CountKind::Exact,
            false => CountKind::LowerBound,
        },
        // Every train within the error of the last listed was counted.
        counted_within: (!report.outcome.counted_all)
            .then(|| report.outcome.trains.last().map(|t| t.error.to_f64().abs()))
            .flatten(),
        complete: report.outcome.complete,
        convention: CONVENTION.to_string(),
        ranked_by: p
            .rank
            .iter()
            .map(|k| match (k, &p.extra_key) {
                (crate::model::rank::RankKey::Extra, Some(x)) => x.name.to_string(),
                _ => k.name().to_string(),
            })
            .collect(),
        limit: report.problem.limit,
        pareto_size: report.outcome.pareto_size,
        shard: report.shard.map(|s| s.to_string()),
        explain: report.explain,
        rejected: report
            .outcome
            .rejected
            .iter()
            .map(|r| RejectionJson { kind: r.kind.clone(), count: r.count, example: r.example.clone() })
            .collect(),
        buy: p.buy.as_ref().map(|b| b.describe()),
        trains: {
            let mut trains = listed(p, report.outcome);
            if report.explain {
                for (t, view) in report.outcome.trains.iter().zip(trains.iter_mut()) {
                    add_gear_data(p, t, view);
                }
            }
            trains
        },
    }
}

/// Each stage's allowances (for the recommended backlash, exact centres) and gear data, where
/// the search worked the mesh out.
fn add_gear_data(p: &crate::model::problem::Problem, t: &crate::model::train::Train, view: &mut TrainJson) {
    let Some(rules) = &p.mesh else { return };
    for (s, v) in t.stages.iter().zip(view.stages.iter_mut()) {
        let (Some(mesh), Ok(system)) =
            (s.mesh, ToothSystem::new(s.module_mm, s.pressure_angle_deg, rules.rack))
        else {
            continue;
        };
        let on_hand = [s.driver.made.is_some(), s.driven.made.is_some()];
        v.gear_data =
            Some(pair_data(&system, &mesh, BacklashChoice::Recommended, 0.0, [None, None], on_hand));
    }
}

/// The listed trains, each with its gear set's arrangements when the search listed gear sets,
/// and the gears it needs bought when the search may buy gears.
fn listed(p: &crate::model::problem::Problem, outcome: &crate::engine::Outcome) -> Vec<TrainJson> {
    let view = |t: &crate::model::train::Train| TrainJson {
        to_buy: p.buy.as_ref().map(|b| b.to_buy(t)),
        ..TrainJson::from_train(t)
    };
    let mut trains: Vec<TrainJson> = outcome.trains.iter().map(view).collect();
    for (t, a) in trains.iter_mut().zip(&outcome.arrangements) {
        t.arrangements = Some(a.count);
        t.other_arrangements = a.others.iter().map(view).collect();
    }
    trains
}
