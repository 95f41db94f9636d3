//! The engine choice (`EngineChoice`): which engines a search may use. It owns the choice,
//! not the engines nor how their work is cut.

use super::kinds::StageEngine;
use super::{exhaustive, sieve};

/// Which engines a search may use (`--engine`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EngineChoice {
    /// The default: per stage count, the factor engine where it applies
    /// (exact targets), else the meet engine (gears to be cut, up to four stages), else the
    /// sieve.
    Auto,
    /// Depth-first over ratio-sorted stages with bound pruning, for every stage count.
    Sieve,
    /// Every combination, judged one by one: the reference.
    Exhaustive,
}

impl EngineChoice {
    /// The engine that enumerates unit by unit (the bulk engines' fallback for `Auto`).
    pub(super) fn engine(self) -> &'static dyn StageEngine {
        match self {
            EngineChoice::Auto | EngineChoice::Sieve => &sieve::Sieve,
            EngineChoice::Exhaustive => &exhaustive::Exhaustive,
        }
    }

    /// The engine [`super::search_each`] runs for this choice: streaming visits every train, so the
    /// bulk engines give way to the sieve. Forecast a stream with this one.
    pub fn streaming(self) -> EngineChoice {
        match self {
            EngineChoice::Auto => EngineChoice::Sieve,
            other => other,
        }
    }
}
