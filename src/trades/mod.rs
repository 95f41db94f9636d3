//! The trades, side by side: lathe threads, clocks and reducers. Each builds problems for the
//! core in its own words and reads its results back; none imports another.

pub mod clock;
pub mod planetary;
pub mod reducer;
pub mod thread;
