//! The exhaustive engine: every non-decreasing sequence of stages, no pruning at all. Slow by
//! design; it is the reference the fast engines are tested against and the baseline of the
//! benchmarks.

use super::kinds::StageEngine;
use super::space::SearchSpace;
use crate::model::pool::MAX_STAGES;

/// Visits every combination.
pub struct Exhaustive;

impl StageEngine for Exhaustive {
    fn name(&self) -> &'static str {
        "exhaustive"
    }

    fn visit_unit(&self, space: &SearchSpace, n: usize, first: usize, visit: &mut dyn FnMut(&[u32])) {
        let mut idx = [0u32; MAX_STAGES];
        idx[0] = first as u32;
        walk(space.stages.len(), n, 1, &mut idx, visit);
    }
}

fn walk(len: usize, n: usize, depth: usize, idx: &mut [u32; MAX_STAGES], visit: &mut dyn FnMut(&[u32])) {
    if depth == n {
        visit(&idx[..n]);
        return;
    }
    for i in idx[depth - 1] as usize..len {
        idx[depth] = i as u32;
        walk(len, n, depth + 1, idx, visit);
    }
}
