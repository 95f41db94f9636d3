//! Ranking: the keys trains are ordered by, the total order they make (ties broken by the
//! canonical stage sequence, so results never depend on thread timing), and the bounded top-K
//! store that keeps the best and only counts the rest. Either store can keep one entry per gear
//! set (the set's best arrangement by the same order), so that rearrangements of the same gears
//! do not crowd a listing.

use std::cmp::Ordering;

use crate::error::{Error, Quantity, Result};
use crate::model::gearset::{GearSet, SetOf};
use crate::model::pool::MAX_STAGES;
use crate::numbers::rational::RelError;

/// One ranking key; smaller is better for each.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RankKey {
    /// Magnitude of the relative ratio error.
    Error,
    /// Number of meshes (stages).
    Meshes,
    /// Sum of all tooth counts.
    Size,
    /// Largest pitch diameter, mm.
    Span,
    /// The problem's own extra key ([`crate::model::problem::ExtraKey`]), set by a trade workflow
    /// (for example a reducer's stage balance); not available on the command line of `search`.
    Extra,
}

impl RankKey {
    /// The key's name on the command line and in reports.
    pub fn name(self) -> &'static str {
        match self {
            RankKey::Error => "error",
            RankKey::Meshes => "meshes",
            RankKey::Size => "size",
            RankKey::Span => "span",
            RankKey::Extra => "extra",
        }
    }
}

/// The default ranking, `error,meshes,size`.
pub const DEFAULT_RANK: [RankKey; 3] = [RankKey::Error, RankKey::Meshes, RankKey::Size];

/// Parse a comma list such as `error,meshes,size`; errors name [`Quantity::RankKeys`].
pub fn parse_rank(text: &str) -> Result<Vec<RankKey>> {
    let mut keys = Vec::new();
    for part in text.split(',').map(str::trim) {
        let key = match part {
            "error" => RankKey::Error,
            "meshes" => RankKey::Meshes,
            "size" => RankKey::Size,
            "span" => RankKey::Span,
            _ => {
                return Err(Error::value(
                    Quantity::RankKeys,
                    format!("unknown key \"{part}\"; wanted a comma list of error, meshes, size, span"),
                ))
            }
        };
        if keys.contains(&key) {
            return Err(Error::value(Quantity::RankKeys, format!("key \"{part}\" is given twice")));
        }
        keys.push(key);
    }
    Ok(keys)
}

/// A train as the search holds it: indices into the stage table plus its ranking keys.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Candidate {
    /// Stage-table indices, non-decreasing; only the first `len` are used.
    pub stages: [u32; MAX_STAGES],
    /// Number of stages.
    pub len: u8,
    /// Exact relative error.
    pub error: RelError,
    /// Sum of teeth.
    pub size: u32,
    /// Largest pitch diameter, mm.
    pub span_mm: f64,
    /// The problem's extra key (0 when it has none); smaller is better.
    pub extra: f64,
}

impl Candidate {
    /// The used stage indices.
    pub fn stage_indices(&self) -> &[u32] {
        &self.stages[..self.len as usize]
    }
}

/// Anything that can be ranked: a candidate in the search, or a train read back from JSON.
pub trait Ranked {
    /// Exact relative error.
    fn rel_error(&self) -> &RelError;
    /// Number of meshes.
    fn meshes(&self) -> u8;
    /// Sum of teeth.
    fn size(&self) -> u32;
    /// Largest pitch diameter, mm.
    fn span_mm(&self) -> f64;
    /// The problem's extra key (0 when it has none).
    fn extra(&self) -> f64 {
        0.0
    }
    /// The canonical stage sequence, compared stage by stage in stage-table order (ratio,
    /// driver teeth, driven teeth, module, pressure angle): the last tie-break.
    fn cmp_stages(&self, other: &Self) -> Ordering;
}

impl Ranked for Candidate {
    fn rel_error(&self) -> &RelError {
        &self.error
    }
    fn meshes(&self) -> u8 {
        self.len
    }
    fn size(&self) -> u32 {
        self.size
    }
    fn span_mm(&self) -> f64 {
        self.span_mm
    }
    fn extra(&self) -> f64 {
        self.extra
    }
    fn cmp_stages(&self, other: &Self) -> Ordering {
        // Index order is the order of the stages' values (the table is sorted by them).
        self.stage_indices().cmp(other.stage_indices())
    }
}

/// Order two trains by `keys`, then by the tie-breaks that are properties of the train: fewer
/// meshes, smaller |error|, negative error before positive, smaller size. Everything
/// [`compare`] looks at but the stage sequence, so a bound on these can be tested before the
/// stages are known.
pub fn compare_ranked<T: Ranked>(keys: &[RankKey], a: &T, b: &T) -> Ordering {
    compare_keys(keys, a, b)
        .then_with(|| a.meshes().cmp(&b.meshes()))
        .then_with(|| a.rel_error().cmp_abs(b.rel_error()))
        .then_with(|| a.rel_error().sign.cmp(&b.rel_error().sign))
        .then_with(|| a.size().cmp(&b.size()))
}

/// Order two trains by [`compare_ranked`], and finally by the stage sequence: a total order.
pub fn compare<T: Ranked>(keys: &[RankKey], a: &T, b: &T) -> Ordering {
    compare_ranked(keys, a, b).then_with(|| a.cmp_stages(b))
}

/// The best `k` candidates seen, in a bounded buffer (at most `2k` held), plus a count of all.
#[derive(Debug, Clone)]
pub struct TopK {
    k: usize,
    keys: Vec<RankKey>,
    held: Vec<Candidate>,
    /// The worst candidate kept at the last shrink: anything ranking after it on the keys
    /// alone can never enter.
    worst: Option<Candidate>,
    /// When set, one candidate per gear set is kept: the set's best.
    sets: Option<SetOf>,
    /// Every candidate offered.
    pub count: u64,
}

/// Order by the ranking keys alone (no tie-break).
pub fn compare_keys<T: Ranked>(keys: &[RankKey], a: &T, b: &T) -> Ordering {
    for k in keys {
        let o = match k {
            RankKey::Error => a.rel_error().cmp_abs(b.rel_error()),
            RankKey::Meshes => a.meshes().cmp(&b.meshes()),
            RankKey::Size => a.size().cmp(&b.size()),
            RankKey::Span => a.span_mm().total_cmp(&b.span_mm()),
            RankKey::Extra => a.extra().total_cmp(&b.extra()),
        };
        if o != Ordering::Equal {
            return o;
        }
    }
    Ordering::Equal
}

impl TopK {
    /// An empty store keeping the best `k` by `keys`.
    pub fn new(k: usize, keys: &[RankKey]) -> TopK {
        TopK { k, keys: keys.to_vec(), held: Vec::new(), worst: None, sets: None, count: 0 }
    }

    /// An empty store keeping the best `k` gear sets by `keys`, each by its best arrangement.
    pub fn by_set(k: usize, keys: &[RankKey], sets: SetOf) -> TopK {
        TopK { sets: Some(sets), ..TopK::new(k, keys) }
    }

    /// Offer one candidate.
    pub fn push(&mut self, c: Candidate) {
        self.count += 1;
        self.push_uncounted(c);
    }

    /// Offer a candidate already counted (with [`TopK::add_count`]).
    pub fn push_uncounted(&mut self, c: Candidate) {
        if self.k == 0 {
            return;
        }
        // Worse than k entries already kept (k different gear sets, when sets are kept), it can
        // never enter: entries only get better.
        if self.worst.as_ref().is_some_and(|w| compare(&self.keys, &c, w) == Ordering::Greater) {
            return;
        }
        self.held.push(c);
        if self.held.len() >= 2 * self.k.max(16) {
            self.shrink();
        }
    }

    fn shrink(&mut self) {
        let keys = &self.keys;
        if let Some(sets) = &self.sets {
            keep_best_of_each_set(&mut self.held, keys, sets);
        }
        // With one entry per set the k-th kept is the k-th best set, and a set's best can only
        // improve, so a bound taken here stays a bound.
        if self.held.len() > self.k {
            self.held.select_nth_unstable_by(self.k, |a, b| compare(keys, a, b));
            self.held.truncate(self.k);
            self.worst = self.held.iter().copied().max_by(|a, b| compare(keys, a, b));
        }
    }

    /// Count `n` candidates at once, without offering them.
    pub fn add_count(&mut self, n: u64) {
        self.count += n;
    }

    /// For a ranking led by the error, once `k` entries are kept (`k` gear sets, when sets are
    /// kept): the |error| of the k-th best, which nothing worse can pass to enter. `None` before
    /// then, or when the error does not lead.
    pub fn error_bound(&mut self) -> Option<RelError> {
        if self.k == 0 || self.keys.first() != Some(&RankKey::Error) || self.held.len() < self.k {
            return None;
        }
        self.shrink();
        if self.held.len() < self.k {
            return None;
        }
        self.held.iter().map(|c| c.error).max_by(|a, b| a.cmp_abs(b))
    }

    /// Could a candidate no better than `best` on every key and tie-break (its stages aside)
    /// enter the best `k`? False only when `best` ranks after the kept worst before the stages
    /// are compared.
    pub fn could_accept(&self, best: &Candidate) -> bool {
        self.k > 0 && self.worst.is_none_or(|w| compare_ranked(&self.keys, best, &w) != Ordering::Greater)
    }

    /// Combine with another store of the same `k` and keys.
    pub fn merge(mut self, other: TopK) -> TopK {
        self.count += other.count;
        self.held.extend(other.held);
        self.shrink();
        self
    }

    /// The best `k`, best first.
    pub fn into_sorted(mut self) -> (u64, Vec<Candidate>) {
        self.shrink();
        let keys = self.keys.clone();
        self.held.sort_by(|a, b| compare(&keys, a, b));
        (self.count, self.held)
    }
}

/// Keep in `held` only the best candidate (by `keys`, then the tie-breaks) of each gear set.
fn keep_best_of_each_set(held: &mut Vec<Candidate>, keys: &[RankKey], sets: &SetOf) {
    let mut tagged: Vec<(GearSet, Candidate)> =
        held.drain(..).map(|c| (sets.of(c.stage_indices()), c)).collect();
    tagged.sort_by(|a, b| a.0.cmp(&b.0).then_with(|| compare(keys, &a.1, &b.1)));
    tagged.dedup_by(|later, first| later.0 == first.0);
    held.extend(tagged.into_iter().map(|(_, c)| c));
}

/// `a` beats `b` on every Pareto key (|error|, meshes, size) at once: no worse on any, better on
/// at least one.
pub fn dominates<T: Ranked>(a: &T, b: &T) -> bool {
    let e = a.rel_error().cmp_abs(b.rel_error());
    let m = a.meshes().cmp(&b.meshes());
    let s = a.size().cmp(&b.size());
    e != Ordering::Greater
        && m != Ordering::Greater
        && s != Ordering::Greater
        && (e == Ordering::Less || m == Ordering::Less || s == Ordering::Less)
}

/// The Pareto front on (|error|, meshes, size): every candidate no other beats on all three at
/// once (equals are all kept), plus a count of all candidates offered. Every arrangement of a
/// gear set has the same Pareto keys, so a front of gear sets keeps each set's best arrangement.
#[derive(Debug, Clone, Default)]
pub struct ParetoFront {
    held: Vec<Candidate>,
    /// When set, one candidate per gear set is kept, the best by these keys.
    sets: Option<(SetOf, Vec<RankKey>)>,
    /// Every candidate offered.
    pub count: u64,
}

impl ParetoFront {
    /// An empty front of gear sets, each by its best arrangement by `keys`.
    pub fn by_set(keys: &[RankKey], sets: SetOf) -> ParetoFront {
        ParetoFront { sets: Some((sets, keys.to_vec())), ..ParetoFront::default() }
    }

    /// Offer one candidate.
    pub fn push(&mut self, c: Candidate) {
        self.count += 1;
        self.insert(c);
    }

    /// Offer a candidate already counted.
    pub fn push_uncounted(&mut self, c: Candidate) {
        self.insert(c);
    }

    /// Count `n` candidates at once, without offering them.
    pub fn add_count(&mut self, n: u64) {
        self.count += n;
    }

    /// Could a candidate no better than `best` on every key be on the front? False only when
    /// a kept one beats `best` (and so everything no better than it).
    pub fn could_accept(&self, best: &Candidate) -> bool {
        !self.held.iter().any(|h| dominates(h, best))
    }

    fn insert(&mut self, c: Candidate) {
        if self.held.iter().any(|h| dominates(h, &c)) {
            return;
        }
        if let Some((sets, keys)) = &self.sets {
            // Arrangements of one set have the same keys: the better one takes the place.
            let set = sets.of(c.stage_indices());
            if let Some(h) = self.held.iter_mut().find(|h| sets.of(h.stage_indices()) == set) {
                if compare(keys, &c, h) == Ordering::Less {
                    *h = c;
                }
                return;
            }
        }
        self.held.retain(|h| !dominates(&c, h));
        self.held.push(c);
    }

    /// Combine with another front.
    pub fn merge(mut self, other: ParetoFront) -> ParetoFront {
        self.count += other.count;
        for c in other.held {
            self.insert(c);
        }
        self
    }

    /// The front sorted by `keys` (then the usual tie-break), and the count of all offered.
    pub fn into_sorted(mut self, keys: &[RankKey]) -> (u64, Vec<Candidate>) {
        self.held.sort_by(|a, b| compare(keys, a, b));
        (self.count, self.held)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numbers::rational::Ratio;

    fn cand(first: u32, len: u8, p: u64, q: u64, size: u32) -> Candidate {
        let mut stages = [0; MAX_STAGES];
        stages[0] = first;
        Candidate {
            stages,
            len,
            error: RelError::of(p, q, Ratio::integer(10)),
            size,
            span_mm: 0.0,
            extra: 0.0,
        }
    }

    #[test]
    fn pareto_front_is_exactly_the_undominated() {
        let all: Vec<Candidate> = (0..300)
            .map(|i| cand(i, 1 + (i % 4) as u8, 990 + (i as u64 * 37) % 21, 100, 40 + (i * 13) % 50))
            .collect();
        let mut a = ParetoFront::default();
        let mut b1 = ParetoFront::default();
        let mut b2 = ParetoFront::default();
        for (i, c) in all.iter().enumerate() {
            a.push(*c);
            if i % 3 == 0 {
                b1.push(*c)
            } else {
                b2.push(*c)
            }
        }
        let (na, fa) = a.into_sorted(&DEFAULT_RANK);
        let (nb, fb) = b1.merge(b2).into_sorted(&DEFAULT_RANK);
        assert_eq!((na, nb), (300, 300));
        assert_eq!(fa, fb);
        let mut plain: Vec<Candidate> =
            all.iter().filter(|c| !all.iter().any(|o| dominates(o, c))).copied().collect();
        plain.sort_by(|x, y| compare(&DEFAULT_RANK, x, y));
        assert_eq!(fa, plain);
        assert!(!fa.is_empty());
    }

    #[test]
    fn parses_keys() {
        assert_eq!(parse_rank("size, error").unwrap(), vec![RankKey::Size, RankKey::Error]);
        assert!(parse_rank("error,colour").is_err());
        assert!(parse_rank("error,error").is_err());
        assert!(parse_rank("").is_err());
        let e = parse_rank("error,colour").unwrap_err().to_string();
        assert!(e.starts_with("the ranking keys: unknown key \"colour\""), "{e}");
    }

    #[test]
    fn topk_keeps_the_best_whatever_the_order() {
        let all: Vec<Candidate> =
            (0..500).map(|i| cand(i, 1 + (i % 3) as u8, 1000 + (i as u64 * 7919) % 97, 100, i)).collect();
        let mut a = TopK::new(10, &DEFAULT_RANK);
        all.iter().for_each(|c| a.push(*c));
        let mut b1 = TopK::new(10, &DEFAULT_RANK);
        let mut b2 = TopK::new(10, &DEFAULT_RANK);
        all.iter().rev().enumerate().for_each(|(i, c)| if i % 2 == 0 { b1.push(*c) } else { b2.push(*c) });
        let (na, va) = a.into_sorted();
        let (nb, vb) = b1.merge(b2).into_sorted();
        assert_eq!((na, nb), (500, 500));
        assert_eq!(va, vb);
        let mut sorted = all.clone();
        sorted.sort_by(|x, y| compare(&DEFAULT_RANK, x, y));
        assert_eq!(va, sorted[..10].to_vec());
    }
}
