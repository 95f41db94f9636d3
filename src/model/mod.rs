//! The model of a search: gears on hand or to cut (catalogue, pool), stages and trains, the
//! validated problem, and the ranking of trains.

pub mod catalog;
pub mod pool;
pub mod problem;
pub mod rank;
pub mod train;
