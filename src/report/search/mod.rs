//! Search results in every format, and the merge of a split search's parts.

pub mod csv;
pub mod document;
pub mod json;
pub mod merge;
