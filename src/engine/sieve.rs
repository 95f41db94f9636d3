//! The sieve engine: depth-first over the ratio-sorted stage table with bound pruning.
//!
//! A canonical train is a non-decreasing sequence of stage indices, so every stage still to be
//! placed has a ratio at least the current one. With `k` stages left (this one included) and the
//! product so far `P`, the current stage `r` must satisfy `P·r^k ≤ hi` (else no later stage can
//! help: stop the loop, the table is sorted) and `P·r·r_max^(k−1) ≥ lo` (else skip to the first
//! stage that can reach, found by binary search). The last stage is a binary-searched window.
//! Float bounds are widened by the space's margin; the driver decides exactly.

use super::kinds::StageEngine;
use super::space::SearchSpace;
use crate::model::pool::MAX_STAGES;

/// Depth-first search with ratio bounds.
pub struct Sieve;

impl StageEngine for Sieve {
    fn name(&self) -> &'static str {
        "sieve"
    }

    fn visit_unit(&self, space: &SearchSpace, n: usize, first: usize, visit: &mut dyn FnMut(&[u32])) {
        let v = &space.values;
        let Some(&vmax) = v.last() else { return };
        let r = v[first];
        if r.powi(n as i32) > space.hi || r * vmax.powi(n as i32 - 1) < space.lo {
            return;
        }
        let mut walk = Walk { space, vmax, idx: [0; MAX_STAGES], n, visit, stock: Stock::new(space) };
        walk.idx[0] = first as u32;
        if !walk.stock.take(space, first) {
            return;
        }
        walk.descend(1, r);
    }
}

struct Walk<'a, 's> {
    space: &'a SearchSpace<'s>,
    vmax: f64,
    idx: [u32; MAX_STAGES],
    n: usize,
    visit: &'a mut dyn FnMut(&[u32]),
    stock: Stock,
}

impl Walk<'_, '_> {
    /// Place stage `depth` (0-based) given the product of the stages before it.
    fn descend(&mut self, depth: usize, prefix: f64) {
        if depth == self.n {
            (self.visit)(&self.idx[..self.n]);
            return;
        }
        let v = &self.space.values;
        let start = self.idx[depth - 1] as usize;
        let k = (self.n - depth) as i32;
        if k == 1 {
            let (lo, hi) = (self.space.lo / prefix, self.space.hi / prefix);
            let from = start + v[start..].partition_point(|&x| x < lo);
            for (i, &r) in v.iter().enumerate().skip(from) {
                if r > hi {
                    break;
                }
                if self.stock.take(self.space, i) {
                    self.idx[depth] = i as u32;
                    (self.visit)(&self.idx[..self.n]);
                }
                self.stock.give(self.space, i);
            }
            return;
        }
        if self.space.cancelled() {
            return;
        }
        let need = self.space.lo / (prefix * self.vmax.powi(k - 1));
        let from = start + v[start..].partition_point(|&x| x < need);
        for (i, &r) in v.iter().enumerate().skip(from) {
            if prefix * r.powi(k) > self.space.hi {
                break;
            }
            if self.stock.take(self.space, i) {
                self.idx[depth] = i as u32;
                self.descend(depth + 1, prefix * r);
            }
            self.stock.give(self.space, i);
        }
    }
}

/// Gears in use along the current path, for stock pools; a no-op for gears to be cut. With
/// gears to buy it also counts the gears bought so far (per kind, beyond those on hand), so a
/// path that needs more than the budget is cut before it is extended: every later stage only
/// adds gears.
struct Stock {
    used: Vec<u32>,
    active: bool,
    bought: u32,
}

impl Stock {
    fn new(space: &SearchSpace) -> Stock {
        let active = space.problem.pool.from_stock;
        Stock {
            used: if active { vec![0; space.problem.pool.gears.len()] } else { Vec::new() },
            active,
            bought: 0,
        }
    }

    /// Use the gears of stage `i`; false if the stock runs out or the budget of gears to buy is
    /// passed (the use is recorded anyway and must be undone with [`Stock::give`]).
    fn take(&mut self, space: &SearchSpace, i: usize) -> bool {
        if !self.active {
            return true;
        }
        let s = &space.stages[i];
        let gears = &space.problem.pool.gears;
        let mut ok = true;
        for g in [s.driver as usize, s.driven as usize] {
            self.used[g] += 1;
            ok &= gears[g].quantity.is_none_or(|q| self.used[g] <= q);
            if space.budget.as_ref().is_some_and(|b| b.is_bought(g, self.used[g])) {
                self.bought += 1;
            }
        }
        ok && space.budget.as_ref().is_none_or(|b| self.bought <= b.most)
    }

    fn give(&mut self, space: &SearchSpace, i: usize) {
        if self.active {
            let s = &space.stages[i];
            for g in [s.driver as usize, s.driven as usize] {
                if space.budget.as_ref().is_some_and(|b| b.is_bought(g, self.used[g])) {
                    self.bought -= 1;
                }
                self.used[g] -= 1;
            }
        }
    }
}
