//! What an engine that proposes candidates is, as the driver sees it. It owns the trait, not
//! any engine.

use super::space::SearchSpace;

/// An engine enumerates candidate stage sequences of one unit of work.
pub trait StageEngine: Sync {
    /// The engine's name on the command line.
    fn name(&self) -> &'static str;

    /// Call `visit` with every non-decreasing sequence of `n` stage indices starting with
    /// `first` that might satisfy the problem. Visiting extra sequences is allowed (the driver
    /// judges each exactly); missing one that satisfies is a bug.
    fn visit_unit(&self, space: &SearchSpace, n: usize, first: usize, visit: &mut dyn FnMut(&[u32]));
}
