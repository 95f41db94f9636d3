//! Search engines and the driver that runs them.
//!
//! The driver builds the [`SearchSpace`] (every allowed stage, sorted by ratio, so that a train's
//! canonical form is a non-decreasing sequence of stage indices), splits it into units of work
//! (one per stage count and first stage), runs them in parallel with rayon, and keeps the
//! counts and the best trains. Engines only enumerate candidate stage sequences; the driver
//! decides every candidate exactly (ratio within tolerance, stock quantities), so an engine's
//! pruning can make it faster but never make it wrong.

mod driver;
pub mod exhaustive;
pub mod factor;
mod forecast;
mod kinds;
mod lineup;
pub mod meet;
mod options;
mod plan;
pub mod sieve;
mod space;
mod stream;
mod tally;

pub use driver::search;
pub use forecast::{estimate, Estimate};
pub use kinds::StageEngine;
pub use lineup::EngineChoice;
pub use options::{Outcome, Progress, RunOptions};
pub use plan::Shard;
pub use space::{Rejection, SearchSpace, StageDef, COAXIAL_MISFIT_KIND};
pub use stream::search_each;
pub(crate) use tally::Tally;
