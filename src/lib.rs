//! gearsieve finds gear trains: compound trains of external spur stages whose transmission
//! ratio hits a target within a tolerance, drawn from gears to be cut or gears on hand.
//!
//! The library is the domain: parse a [`numbers::target::Target`], build a
//! [`model::pool::Pool`] (from a tooth range or [`model::catalog`] files), wrap them in a
//! validated [`model::problem::Problem`], run [`engine::search`], and render the
//! [`engine::Outcome`] with one of the [`report`] sinks.
//! Nothing here parses arguments, prints or touches the terminal: an [`Error`] names the
//! [`Quantity`] a bad value was meant to be ("the target ratio"), never a flag.
//!
//! ```
//! use gearsieve::model::pool::Pool;
//! use gearsieve::numbers::range::IntRange;
//! use gearsieve::model::rank::DEFAULT_RANK;
//! use gearsieve::numbers::target::Target;
//! use gearsieve::{search, EngineChoice, Problem, RunOptions, StageLimits};
//!
//! // 37.5:1 within 10 ppm from gears of 12..60 teeth, module 1, two or three stages.
//! let target = Target::parse("37.5:1", "10ppm")?;
//! let pool = Pool::to_cut(IntRange { lo: 12, hi: 60 }, 1.0, 20.0, None)?;
//! let stages = IntRange { lo: 2, hi: 3 };
//! let problem = Problem::new(target, pool, stages, StageLimits::default(), None, DEFAULT_RANK.to_vec(), 5)?;
//! let found = search(&problem, EngineChoice::Sieve, &RunOptions::default());
//! let best = &found.trains[0];
//! assert!(best.error.is_exact());
//! assert_eq!(best.ratio_from_teeth().to_string(), "75/2");
//! # Ok::<(), gearsieve::Error>(())
//! ```
//!
//! Ratio convention (ISO 1122-1): `i` = input turns per output turn = product of driven teeth /
//! product of driver teeth.

#![deny(missing_docs)]

pub mod engine;
pub mod error;
pub mod geometry;
pub mod model;
pub mod numbers;
pub mod report;
pub mod trades;

pub use engine::{search, EngineChoice, Outcome, RunOptions};
pub use error::{Error, Message, Quantity, Result};
pub use model::problem::{CountMode, ExtraKey, MeshRules, Problem, StageLimits, ToothForm, TrainCheck};
