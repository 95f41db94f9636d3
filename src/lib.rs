//! gearsieve finds gear trains: compound trains of external spur stages whose transmission
//! ratio hits a target within a tolerance, drawn from gears to be cut or gears on hand.
//!
//! The library is the domain: parse a [`target::Target`], build a [`pool::Pool`] (from a tooth
//! range or [`catalog`] files), wrap them in a validated [`problem::Problem`], run
//! [`engine::search`], and render the [`engine::Outcome`] with one of the [`output`] sinks.
//! Nothing here parses arguments, prints or touches the terminal.
//!
//! Ratio convention (ISO 1122-1): `i` = input turns per output turn = product of driven teeth /
//! product of driver teeth.

pub mod catalog;
pub mod engine;
pub mod error;
pub mod output;
pub mod pool;
pub mod problem;
pub mod range;
pub mod rank;
pub mod rational;
pub mod target;
pub mod train;

pub use engine::{search, EngineKind, Outcome, RunOptions};
pub use error::{Error, Result};
pub use problem::{Problem, StageLimits};
