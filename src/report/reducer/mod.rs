//! The reducer trade's results in every format.

pub mod csv;
pub mod document;
pub mod json;
