//! The model of a search: gears on hand or to cut (catalogue, pool), stages and trains, the
//! validated problem, the ranking of trains, and the gear sets trains are made of.

pub mod catalog;
pub mod gearset;
pub mod pool;
pub mod problem;
pub mod purchase;
pub mod rank;
pub mod train;
