//! The trades, side by side: lathe threads, clocks and reducers. Each builds problems for the
//! core in its own words and reads its results back; none imports another.

pub mod clock;
pub mod planetary;
pub mod reducer;
pub mod thread;

use crate::engine::EngineChoice;

/// The engines every trade searches with: the bulk engines take what they can (a trade's search
/// over gears to be cut with no train check of its own, such as an astronomical clock train),
/// the sieve the rest (stock, train checks, ranking keys of the trade's own). A forecast of a
/// trade's search weighs its problems with this lineup.
pub const ENGINE: EngineChoice = EngineChoice::Auto;
