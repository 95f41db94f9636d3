//! Which engines a search may use, and the order the planner asks them in: the one place an
//! engine is registered. For each stage count of a problem, the planner asks the bulk engines
//! of the chosen lineup in order whether they take it; the first that does gets it, and the
//! lineup's stage engine takes every stage count left. The engines live in their own files;
//! how their work is cut into units is the plan's business.

use super::exhaustive::Exhaustive;
use super::factor::Factor;
use super::kinds::{BulkEngine, StageEngine};
use super::meet::Meet;
use super::sieve::Sieve;
use super::window::Window;
use crate::model::problem::CountMode;

/// The bulk engines [`EngineChoice::Auto`] asks, in order, before the sieve takes the rest.
/// A new bulk engine is registered by one line here.
const AUTO_BULK: &[&dyn BulkEngine] = &[&Factor, &Meet];

/// The bulk engines [`EngineChoice::Auto`] asks when only the listing need be exact
/// ([`CountMode::LowerBound`]): the window engine takes the near targets of four stages and
/// more before the meet engine, which would count every train.
const LOWER_BOUND_BULK: &[&dyn BulkEngine] = &[&Factor, &Window, &Meet];

/// Which engines a search may use.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EngineChoice {
    /// The default: per stage count, the first bulk engine that takes it (the factor engine
    /// for exact targets, then the meet engine for gears to be cut up to four stages), the
    /// sieve for the rest.
    Auto,
    /// Depth-first over ratio-sorted stages with bound pruning, for every stage count.
    Sieve,
    /// Every combination, judged one by one: the reference.
    Exhaustive,
}

/// The engines a search asks: bulk engines in order, then one stage engine for every stage
/// count they leave.
#[derive(Clone, Copy)]
pub(crate) struct Lineup {
    /// Asked in order; each takes what it can of the stage counts still left.
    pub(crate) bulk: &'static [&'static dyn BulkEngine],
    /// Takes every stage count left.
    pub(crate) stage: &'static dyn StageEngine,
}

impl EngineChoice {
    /// The engines this choice lets a search use, in the order they are asked.
    pub(crate) fn lineup(self) -> Lineup {
        match self {
            EngineChoice::Auto => Lineup { bulk: AUTO_BULK, stage: &Sieve },
            EngineChoice::Sieve => Lineup { bulk: &[], stage: &Sieve },
            EngineChoice::Exhaustive => Lineup { bulk: &[], stage: &Exhaustive },
        }
    }

    /// The engines this choice lets a search counted as `count` asks: a lower-bound count lets
    /// the fast engines leave trains uncounted; the sieve and the exhaustive engine count all.
    pub(crate) fn lineup_for(self, count: CountMode) -> Lineup {
        match (self, count) {
            (EngineChoice::Auto, CountMode::LowerBound) => Lineup { bulk: LOWER_BOUND_BULK, stage: &Sieve },
            _ => self.lineup(),
        }
    }

    /// The choice [`super::search_each`] in effect runs: streaming visits every train, so the
    /// bulk engines give way to the lineup's stage engine. Forecast a stream with this one.
    pub fn streaming(self) -> EngineChoice {
        match self {
            EngineChoice::Auto => EngineChoice::Sieve,
            other => other,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_stream_is_forecast_with_the_engine_that_streams() {
        for choice in [EngineChoice::Auto, EngineChoice::Sieve, EngineChoice::Exhaustive] {
            let (all, streamed) = (choice.lineup(), choice.streaming().lineup());
            assert!(streamed.bulk.is_empty(), "{choice:?}");
            assert_eq!(streamed.stage.name(), all.stage.name(), "{choice:?}");
        }
    }

    #[test]
    fn auto_asks_the_factor_engine_then_the_meet_engine_then_the_sieve() {
        let lineup = EngineChoice::Auto.lineup();
        let names: Vec<&str> = lineup.bulk.iter().map(|e| e.name()).collect();
        assert_eq!(names, ["factor", "meet"]);
        let lower: Vec<&str> =
            EngineChoice::Auto.lineup_for(CountMode::LowerBound).bulk.iter().map(|e| e.name()).collect();
        assert_eq!(lower, ["factor", "window", "meet"]);
        let sieve = EngineChoice::Sieve.lineup_for(CountMode::LowerBound);
        assert!(sieve.bulk.is_empty());
        assert_eq!(lineup.stage.name(), "sieve");
        assert!(EngineChoice::Sieve.lineup().bulk.is_empty());
        assert_eq!(EngineChoice::Exhaustive.lineup().stage.name(), "exhaustive");
    }
}
