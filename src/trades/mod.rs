//! The trades, side by side: lathe threads, clocks and reducers. Each builds problems for the
//! core in its own words and reads its results back; none imports another.

pub mod clock;
pub mod planetary;
pub mod reducer;
pub mod thread;

use crate::engine::EngineChoice;

/// The engine every trade searches with: the sieve takes the train checks, per-stage limits and
/// stock the trades use. A forecast of a trade's search weighs its problems with this engine.
pub const ENGINE: EngineChoice = EngineChoice::Sieve;
