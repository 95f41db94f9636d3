//! Clock trains, a trade workflow on top of the search, in the clockmaker's words: the going
//! train from a driving arbor to the escape arbor, the motion work behind the hands, and
//! astronomical trains (moon phase, sidereal time, the year). Owns the clock arithmetic and its
//! results; the gear search itself is [`crate::engine`]'s.
//!
//! - [`beat`]: pendulum length, period and beats per hour; the escape wheel;
//! - [`going`]: the going train, its arbor speeds and rate error in seconds per day;
//! - [`motion`]: the motion work (the reverted 12:1 train) and other hand ratios;
//! - [`part`]: a part of a train between two arbors of fixed speeds (great wheel to centre),
//!   searched on its own;
//! - [`strike`]: the count-wheel striking train: blows, pin wheel, locking, warning and fly
//!   arbors, the count wheel;
//! - [`astro`]: named periods, convergents, drift per year;
//! - the output formats are in [`crate::report::clock`].
//!
//! Every command lists gear sets, not trains: the same wheels and pinions paired differently
//! are one set, listed once by its first arrangement in stage order (stages from the first
//! arbor in order of their ratio, so the steps of speed fall from the first arbor on), with how
//! many arrangements it has. Only arrangements that pass the part's own checks count: each
//! part of a train (great wheel to centre, centre to escape, each part of a striking train) is
//! its own search between arbors of fixed speeds, so no arrangement moves a gear from one part
//! to another, and a coaxial motion work counts only the pairings that are coaxial too.
//!
//! Direction of the ratio (ISO 1122-1, as everywhere in gearsieve): `i` = input turns per
//! output turn. A going train is searched from the driving arbor (input) to the escape arbor
//! (output) with the wheels driving the pinions, so it speeds up and `i < 1`; motion work and
//! astronomical trains reduce from their input arbor, so `i > 1`.
//!
//! Teeth are cycloidal by default, as clock wheels and pinions are cut
//! ([`crate::geometry::cycloidal`]); involute teeth may be asked for instead.

pub mod astro;
pub mod beat;
pub mod going;
pub mod motion;
pub mod part;
pub mod strike;

use crate::error::{Error, Quantity, Result};
use crate::model::pool::Pool;
use crate::model::problem::{Problem, StageLimits};
use crate::model::rank::DEFAULT_RANK;
use crate::numbers::exact::fit;
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;
use crate::numbers::target::Target;

/// One arrangement of a listed gear set's gears into stages: its train and, when the meshes
/// were worked out in cycloidal form, the pair of every stage.
#[derive(Debug, Clone, PartialEq)]
pub struct Arrangement {
    /// The train, stages from the first arbor.
    pub train: crate::model::train::Train,
    /// The cycloidal pair of every stage; empty when not checked in that form.
    pub cycloidal: Vec<crate::geometry::CycloidalMesh>,
}

/// Seconds in a mean solar day.
pub const SECONDS_PER_DAY: f64 = 86_400.0;

/// An `f64` as the nearest fraction with 64-bit parts (relative change below 10⁻¹⁴ for the
/// values used here); for targets computed from a pendulum length.
pub fn approx_ratio(x: f64) -> Ratio {
    let scale = (1u128 << 50) as f64;
    fit((x * scale).round().max(1.0) as u128, 1u128 << 50).0
}

/// A search problem for a clock train with the usual ranking (error, meshes, size), listing
/// gear sets.
pub fn clock_problem(
    target: Target,
    pool: Pool,
    stages: IntRange,
    limits: StageLimits,
    limit: usize,
) -> Result<Problem> {
    if limit == 0 {
        return Err(Error::value(Quantity::Limit, "list at least one train"));
    }
    let mut p = Problem::new(target, pool, stages, limits, None, DEFAULT_RANK.to_vec(), limit)?;
    // Clock wheels and pinions are cut cycloidal: gears on hand are judged in that form.
    p.tooth_form = crate::model::problem::ToothForm::Cycloidal;
    // One entry per gear set: every arrangement of a set has the same ratio, so the ranking
    // (error, meshes, size) ties and the first in stage order is the one listed.
    p.gear_sets = true;
    Ok(p)
}

/// The cycloidal pair of every stage of `train`, at each stage's module and standard centre
/// distance.
pub fn cycloidal_pairs(train: &crate::model::train::Train) -> Result<Vec<crate::geometry::CycloidalMesh>> {
    train
        .stages
        .iter()
        .map(|s| Ok(crate::geometry::cycloidal_mesh(s.module_mm, [s.driver.teeth, s.driven.teeth], None)?))
        .collect()
}

/// Rotation speeds of the arbors of a train, turns per hour, from the input arbor turning at
/// `input` through each stage (driver teeth / driven teeth).
pub fn arbor_speeds(train: &crate::model::train::Train, input: f64) -> Vec<f64> {
    let mut v = vec![input];
    for s in &train.stages {
        let last = v[v.len() - 1];
        v.push(last * s.driver.teeth as f64 / s.driven.teeth as f64);
    }
    v
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn approximated_ratios_are_close() {
        for x in [1.0 / 60.0, 29.530588, 0.99726957, 365.24219] {
            assert!((approx_ratio(x).to_f64() / x - 1.0).abs() < 1e-14, "{x}");
        }
    }
}
