//! Search engines and the driver that runs them.
//!
//! How a search runs: [`SearchSpace::new`] lists every allowed stage, sorted by ratio, so that a
//! train's canonical form is a non-decreasing sequence of stage indices. The planner asks the
//! bulk engines of the chosen lineup ([`EngineChoice`]) in order which stage counts they take
//! (the factor engine, then the meet engine) and leaves the rest to a stage engine (the sieve,
//! or the exhaustive reference); it cuts every stage count into units of work in one fixed
//! order, and a [`Shard`] keeps every N-th of them. The driver ([`search`]) runs the units on
//! the rayon pool, each worker with its own [`Tally`], merged at the end; the total order of
//! the ranking makes the result independent of the thread count. Engines only propose
//! candidates or count in bulk: [`SearchSpace::judge`] decides every train that is listed,
//! exactly, so an engine's pruning can make it faster but never wrong. [`estimate`] forecasts
//! a search before it runs; [`search_each`] streams every train instead of keeping the best.
//!
//! Files, from the ground up:
//! - `space.rs`: the stage space and the exact judge;
//! - `tally.rs`: the counts and best trains a search keeps;
//! - `sets.rs`: gear sets in a space: a train's set, its arrangements, the one it is counted by;
//! - `kinds.rs`: the two kinds of engine, [`StageEngine`] and [`BulkEngine`] (with
//!   [`BulkPlan`]);
//! - the engines, one file each: [`sieve`], [`exhaustive`], [`meet`], [`factor`]; `setcount.rs`
//!   counts the meet engine's gear sets by meeting in the middle over each side's multisets;
//! - `lineup.rs`: which engines a choice asks, in which order (where an engine is registered);
//! - `plan.rs`: who takes which stage count, units of work, shards;
//! - `options.rs`: how to run a search and what it reports;
//! - `driver.rs`, `forecast.rs`, `stream.rs`: running, forecasting and streaming a search;
//!   `draws.rs`: the random draws the bulk engines' forecasts sample with.

mod draws;
mod driver;
pub mod exhaustive;
pub mod factor;
mod forecast;
mod kinds;
mod lineup;
pub mod meet;
mod options;
mod plan;
mod setcount;
mod sets;
pub mod sieve;
mod space;
mod stream;
mod tally;
pub mod window;

pub use driver::search;
pub use forecast::{estimate, Estimate};
pub use kinds::{BulkEngine, BulkPlan, StageEngine};
pub use lineup::EngineChoice;
pub use options::{Outcome, Progress, RunOptions, SetArrangements};
pub use plan::Shard;
pub use space::{Rejection, SearchSpace, StageDef, COAXIAL_MISFIT_KIND};
pub use stream::search_each;
pub use tally::Tally;
