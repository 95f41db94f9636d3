//! Which gears to buy for a chart: the choices of up to N gears which, added to the gears on
//! hand, make the most threads of a series cuttable within the tolerance, each with the threads
//! it gains. Owns the enumeration of the lathe's setups over the gears on hand and the gears
//! that may be bought, and the scoring of every choice; the chart itself is [`super::chart`]'s,
//! the banjo's judgement [`super::banjo`]'s, and what may be bought and how a setup's gears to
//! buy are counted [`crate::model::purchase`]'s (the same as `thread --buy`).
//!
//! A thread is cuttable with a basket `S` of bought gears when some setup within tolerance that
//! the banjo takes uses, beyond the gears on hand, a multiset of gears contained in `S` (the
//! idler of a simple train counts). So each thread gets the smallest baskets that serve it (an
//! antichain), and a choice's gains are the threads one of whose baskets it contains. Setups of
//! one stage (through an idler) and two stages are enumerated here directly, stage pairs sorted
//! by ratio and matched by binary search; floating point only brackets the candidates, the exact
//! pitch test [`super::pitch_error`] decides each one.

use std::collections::{HashMap, HashSet};
use std::sync::atomic::Ordering as AtomicOrdering;

use rayon::prelude::*;

use super::banjo::Banjo;
use super::series::SeriesEntry;
use super::{pitch_error, Lathe, ThreadSpec};
use crate::engine::RunOptions;
use crate::error::{Error, Quantity, Result};
use crate::model::pool::{GearKind, MeshGroup, Pool, MAX_TEETH, MIN_TEETH};
use crate::model::purchase::{bought_beyond, Purchase};
use crate::model::train::{Stage, Train};
use crate::numbers::rational::{Ratio, RelError};

/// Most gears a choice may buy: the choices are enumerated exactly up to this many.
pub const MOST_TO_BUY: usize = 3;

/// Up to [`MOST_TO_BUY`] gears bought, tooth counts ascending (a multiset: a count may repeat).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Default)]
pub struct Basket {
    len: u8,
    teeth: [u32; MOST_TO_BUY],
}

impl Basket {
    /// The tooth counts, ascending.
    pub fn teeth(&self) -> &[u32] {
        &self.teeth[..self.len as usize]
    }

    /// How many gears.
    pub fn len(&self) -> usize {
        self.len as usize
    }

    /// True when nothing is bought.
    pub fn is_empty(&self) -> bool {
        self.len == 0
    }

    /// The basket of `teeth` (any order), or `None` past [`MOST_TO_BUY`] gears.
    pub fn of(teeth: &[u32]) -> Option<Basket> {
        if teeth.len() > MOST_TO_BUY {
            return None;
        }
        let mut b = Basket { len: teeth.len() as u8, teeth: [0; MOST_TO_BUY] };
        b.teeth[..teeth.len()].copy_from_slice(teeth);
        b.teeth[..teeth.len()].sort_unstable();
        Some(b)
    }

    /// Every sub-multiset, the empty one and this one included (at most 8).
    fn subsets(&self) -> Vec<Basket> {
        let n = self.len();
        let mut out: Vec<Basket> = (0u32..1 << n)
            .filter_map(|mask| {
                let t: Vec<u32> = (0..n).filter(|k| mask & (1 << k) != 0).map(|k| self.teeth[k]).collect();
                Basket::of(&t)
            })
            .collect();
        out.sort_unstable();
        out.dedup();
        out
    }

    /// True when every gear of `self` is in `other` (as multisets).
    pub fn within(&self, other: &Basket) -> bool {
        let (mut i, mut j) = (0, 0);
        let (a, b) = (self.teeth(), other.teeth());
        while i < a.len() {
            if j == b.len() {
                return false;
            }
            match a[i].cmp(&b[j]) {
                std::cmp::Ordering::Equal => {
                    i += 1;
                    j += 1;
                }
                std::cmp::Ordering::Greater => j += 1,
                std::cmp::Ordering::Less => return false,
            }
        }
        true
    }
}

/// One thread of the series as buying sees it.
#[derive(Debug, Clone, PartialEq)]
pub struct BuyRow {
    /// The thread's name in the series.
    pub label: String,
    /// The thread (one start).
    pub thread: ThreadSpec,
    /// True when the gears on hand cut it within tolerance already.
    pub on_hand: bool,
    /// The smallest baskets that make it cuttable, fewest gears first, then by teeth; empty
    /// when it is cut from the gears on hand or out of reach of every basket on offer.
    pub baskets: Vec<Basket>,
}

/// One choice of gears to buy.
#[derive(Debug, Clone, PartialEq)]
pub struct BuyChoice {
    /// The gears to buy.
    pub basket: Basket,
    /// The threads it makes cuttable that the gears on hand do not, as indices into
    /// [`BuyChart::rows`], in series order.
    pub gains: Vec<usize>,
}

/// What buying gears does for a chart.
#[derive(Debug, Clone, PartialEq)]
pub struct BuyChart {
    /// The gears on offer (the same model as `thread --buy`'s).
    pub purchase: Purchase,
    /// The series' threads in order (fewer when interrupted).
    pub rows: Vec<BuyRow>,
    /// The best choices: most threads gained, then fewest gears, then smallest teeth. A choice
    /// is listed only when every gear in it adds a thread (a gear that adds nothing is left
    /// out of the basket, which is then another choice).
    pub choices: Vec<BuyChoice>,
    /// How many such choices gain at least one thread (all are counted; `choices` holds the
    /// best of them).
    pub choice_count: usize,
    /// False when interrupted (later rows are missing, and the choices weigh only those done).
    pub complete: bool,
}

impl BuyChart {
    /// Rows cut from the gears on hand.
    pub fn on_hand(&self) -> usize {
        self.rows.iter().filter(|r| r.on_hand).count()
    }

    /// Rows no basket on offer makes cuttable.
    pub fn out_of_reach(&self) -> impl Iterator<Item = &BuyRow> {
        self.rows.iter().filter(|r| !r.on_hand && r.baskets.is_empty())
    }
}

/// One kind of gear the enumeration may use: on hand, on offer, or both.
#[derive(Debug, Clone, Copy)]
struct Kind {
    group: usize,
    teeth: u32,
    on_hand: u32,
    offered: bool,
}

/// One stage: driver and driven kind, and its ratio to bracket with.
#[derive(Debug, Clone, Copy)]
struct Pair {
    driver: usize,
    driven: usize,
    ratio: f64,
}

/// A setup within tolerance before the banjo has judged it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
struct Candidate {
    basket: Basket,
    /// Stages as (driver kind, driven kind); the second is unused for one stage.
    stages: [(usize, usize); 2],
    two: bool,
}

/// The gears a setup may draw on and the lathe's rules for setups.
struct Shop<'a> {
    lathe: &'a Lathe,
    groups: Vec<MeshGroup>,
    kinds: Vec<Kind>,
    pairs: Vec<Pair>,
    offer_group: usize,
    most: usize,
}

impl<'a> Shop<'a> {
    fn new(lathe: &'a Lathe, purchase: &Purchase) -> Shop<'a> {
        let groups = lathe.pool.groups.clone();
        // The purchase was made from the lathe's gears on hand ([`check`]), so its group is one.
        let offer_group = groups.iter().position(|g| g == &purchase.group).unwrap_or(0);
        let mut on_hand: HashMap<(usize, u32), u32> = HashMap::new();
        for g in &lathe.pool.gears {
            // Gears to cut (no quantity) are as many as wanted: never bought.
            let q = g.quantity.unwrap_or(u32::MAX);
            let e = on_hand.entry((g.group, g.teeth)).or_insert(0);
            *e = e.saturating_add(q);
        }
        let mut keys: Vec<(usize, u32)> = on_hand.keys().copied().collect();
        keys.extend((purchase.teeth.lo..=purchase.teeth.hi).map(|z| (offer_group, z)));
        keys.sort_unstable();
        keys.dedup();
        let kinds: Vec<Kind> = keys
            .iter()
            .map(|&(group, teeth)| Kind {
                group,
                teeth,
                on_hand: on_hand.get(&(group, teeth)).copied().unwrap_or(0),
                offered: group == offer_group && purchase.teeth.contains(teeth),
            })
            .collect();
        let most = purchase.most as usize;
        let mut shop = Shop { lathe, groups, kinds, pairs: Vec::new(), offer_group, most };
        let mut pairs = Vec::new();
        for (a, ka) in shop.kinds.iter().enumerate() {
            for (b, kb) in shop.kinds.iter().enumerate() {
                if ka.group == kb.group && shop.basket(&[a, b]).is_some() {
                    pairs.push(Pair { driver: a, driven: b, ratio: kb.teeth as f64 / ka.teeth as f64 });
                }
            }
        }
        pairs.sort_by(|p, q| {
            p.ratio.total_cmp(&q.ratio).then((p.driver, p.driven).cmp(&(q.driver, q.driven)))
        });
        shop.pairs = pairs;
        shop
    }

    /// The gears beyond those on hand that a setup of these kinds needs, or `None` when it
    /// needs a gear not on offer or more than may be bought.
    fn basket(&self, used: &[usize]) -> Option<Basket> {
        let mut used = used.to_vec();
        used.sort_unstable();
        let mut bought = Vec::new();
        let mut k = 0;
        while k < used.len() {
            let run = used[k..].iter().take_while(|&&u| u == used[k]).count() as u32;
            let kind = &self.kinds[used[k]];
            let extra = bought_beyond(run, kind.on_hand);
            if extra > 0 {
                if !kind.offered {
                    return None;
                }
                bought.extend(std::iter::repeat_n(kind.teeth, extra as usize));
            }
            k += run as usize;
        }
        (bought.len() <= self.most).then(|| Basket::of(&bought)).flatten()
    }

    fn stage(&self, (a, b): (usize, usize)) -> Stage {
        let g = &self.groups[self.kinds[a].group];
        Stage::plain(self.kinds[a].teeth, self.kinds[b].teeth, g.module_mm, g.pressure_angle_deg)
    }

    fn ratio(&self, stages: &[(usize, usize)]) -> Option<Ratio> {
        let (mut n, mut d) = (1u128, 1u128);
        for &(a, b) in stages {
            n *= self.kinds[b].teeth as u128;
            d *= self.kinds[a].teeth as u128;
        }
        Ratio::new(n, d)
    }

    /// Every setup of one or two stages within tolerance of `need` that buys at most `most`.
    fn candidates(&self, need: Ratio, out: &mut Vec<Candidate>) {
        let t = self.lathe.tolerance.to_f64();
        // |need / i − 1| ≤ t holds for i in [need/(1 + t), need/(1 − t)]; the bracket is a hair
        // wider and the exact test decides.
        let (lo, hi) = (need.to_f64() / (1.0 + t) * (1.0 - 1e-9), need.to_f64() / (1.0 - t) * (1.0 + 1e-9));
        let within = |stages: &[(usize, usize)]| {
            self.ratio(stages).is_some_and(|r| pitch_error(r, need).within(self.lathe.tolerance))
        };
        let from = |x: f64| self.pairs.partition_point(|p| p.ratio < x);
        let upto = |x: f64| self.pairs.partition_point(|p| p.ratio <= x);
        let stages = self.lathe.stages;
        if stages.contains(1) {
            for p in &self.pairs[from(lo)..upto(hi)] {
                let s = [(p.driver, p.driven), (0, 0)];
                if within(&s[..1]) {
                    if let Some(basket) = self.basket(&[p.driver, p.driven]) {
                        out.push(Candidate { basket, stages: s, two: false });
                    }
                }
            }
        }
        if stages.contains(2) {
            for (i, p) in self.pairs.iter().enumerate() {
                let (a, b) = (from(lo / p.ratio).max(i), upto(hi / p.ratio));
                for q in self.pairs.get(a..b).unwrap_or(&[]) {
                    let s = [(p.driver, p.driven), (q.driver, q.driven)];
                    let Some(basket) = self.basket(&[p.driver, p.driven, q.driver, q.driven]) else {
                        continue;
                    };
                    if within(&s) {
                        out.push(Candidate { basket, stages: s, two: true });
                    }
                }
            }
        }
    }

    fn train(&self, c: &Candidate) -> Option<Train> {
        let used = if c.two { &c.stages[..] } else { &c.stages[..1] };
        let ratio = self.ratio(used)?;
        Some(Train {
            stages: used.iter().map(|&s| self.stage(s)).collect(),
            ratio,
            error: RelError::of(ratio.num(), ratio.den(), ratio),
        })
    }

    /// The baskets with which the banjo takes the candidate: its own when it is set up with
    /// the gears it names (and, for a simple train, an idler on hand), else for a simple train
    /// its own with each idler on offer that serves.
    fn fits(&self, c: &Candidate, banjo: &Banjo, covered: &dyn Fn(&Basket) -> bool) -> Vec<Basket> {
        let Some(train) = self.train(c) else {
            return Vec::new();
        };
        if banjo.fit(&train, &self.lathe.pool).is_ok() {
            return vec![c.basket];
        }
        if c.two {
            return Vec::new();
        }
        let (a, b) = c.stages[0];
        if self.kinds[a].group != self.offer_group {
            return Vec::new();
        }
        let group = self.groups[self.offer_group].clone();
        let mut out = Vec::new();
        for (k, kind) in self.kinds.iter().enumerate() {
            if !kind.offered {
                continue;
            }
            let Some(basket) = self.basket(&[a, b, k]) else {
                continue;
            };
            if basket == c.basket || covered(&basket) {
                continue;
            }
            // The idler alone as the spare gear, so the banjo tries just this one.
            let used = [a, b].iter().filter(|&&u| u == k).count() as u32;
            let idler = Pool {
                groups: vec![group.clone()],
                gears: vec![GearKind {
                    teeth: kind.teeth,
                    group: 0,
                    quantity: Some(used + 1),
                    labels: Vec::new(),
                    made: Some(Default::default()),
                }],
                from_stock: true,
                rings_left_out: 0,
            };
            if banjo.fit(&train, &idler).is_ok() {
                out.push(basket);
            }
        }
        out
    }

    /// The smallest baskets that make `thread` cuttable (`[∅]` when the gears on hand do).
    fn baskets(&self, thread: &ThreadSpec) -> Vec<Basket> {
        let lead = thread.lead_mm();
        let mut candidates = Vec::new();
        for position in self.lathe.machine.positions() {
            let need = self.lathe.machine.train_ratio_for(lead, position).value;
            self.candidates(need, &mut candidates);
        }
        candidates.sort_unstable();
        candidates.dedup();
        let mut found: HashSet<Basket> = HashSet::new();
        for c in &candidates {
            let covered = |b: &Basket| b.subsets().iter().any(|s| found.contains(s));
            if covered(&c.basket) {
                continue;
            }
            let new = match &self.lathe.banjo {
                Some(banjo) => self.fits(c, banjo, &covered),
                None => vec![c.basket],
            };
            found.extend(new);
            if found.contains(&Basket::default()) {
                return vec![Basket::default()];
            }
        }
        // A basket found through a bought idler may hold one found later on its own.
        let mut out: Vec<Basket> = found
            .iter()
            .filter(|b| !b.subsets().iter().any(|s| s != *b && found.contains(s)))
            .copied()
            .collect();
        out.sort_unstable();
        out
    }
}

/// Check `purchase` against the lathe: a count of 1 to [`MOST_TO_BUY`], tooth counts the guard
/// closes over, setups of at most two stages.
fn check(lathe: &Lathe, purchase: &Purchase) -> Result<()> {
    if purchase.on_hand != lathe.pool {
        return Err(Error::problem("gears to buy must be added to the lathe's gears on hand"));
    }
    if purchase.most == 0 || purchase.most as usize > MOST_TO_BUY {
        return Err(Error::problem(format!(
            "the gears to buy: choices of 1 to {MOST_TO_BUY} gears are worked out, not {}",
            purchase.most
        )));
    }
    let t = purchase.teeth;
    if t.lo < MIN_TEETH || t.hi > MAX_TEETH || t.lo > t.hi {
        return Err(Error::problem(format!(
            "the tooth counts to buy: wanted LO..HI with {MIN_TEETH} ≤ LO ≤ HI ≤ {MAX_TEETH}, found {}..{}",
            t.lo, t.hi
        )));
    }
    if let Some(largest) = lathe.equipment.largest_teeth {
        if t.hi > largest {
            return Err(Error::problem(format!(
                "the tooth counts to buy reach {}, but the guard closes over gears of at most {largest} teeth",
                t.hi
            )));
        }
    }
    if lathe.stages.hi > 2 {
        return Err(Error::value(
            Quantity::StageCount,
            "gears to buy are worked out for setups of one and two stages; give 1..2 or less",
        ));
    }
    Ok(())
}

/// The best choices of gears to buy for `series` on `lathe`: every basket of up to
/// `purchase.most` gears on offer, scored by the threads it makes cuttable within tolerance
/// that the gears on hand do not; the best `limit` listed.
pub fn buy_chart(
    lathe: &Lathe,
    series: &[SeriesEntry],
    purchase: &Purchase,
    limit: usize,
    options: &RunOptions,
) -> Result<BuyChart> {
    check(lathe, purchase)?;
    let shop = Shop::new(lathe, purchase);
    let stopped = || options.cancel.is_some_and(|c| c.load(AtomicOrdering::Relaxed));
    let done: Vec<Option<BuyRow>> = series
        .par_iter()
        .map(|e| {
            if stopped() {
                return None;
            }
            let thread = ThreadSpec::thread(e.pitch.clone(), 1);
            let baskets = shop.baskets(&thread);
            let on_hand = baskets.first().is_some_and(Basket::is_empty);
            let baskets = if on_hand { Vec::new() } else { baskets };
            Some(BuyRow { label: e.label.clone(), thread, on_hand, baskets })
        })
        .collect();
    let complete = done.iter().all(Option::is_some);
    let rows: Vec<BuyRow> = done.into_iter().map_while(|r| r).collect();
    let (choices, choice_count) = best_choices(&rows, purchase.most as usize, limit);
    Ok(BuyChart { purchase: purchase.clone(), rows, choices, choice_count, complete })
}

/// Score every basket of up to `most` gears built from the tooth counts that serve some row,
/// keep those whose every gear adds a thread, and list the best `limit`; also count them.
fn best_choices(rows: &[BuyRow], most: usize, limit: usize) -> (Vec<BuyChoice>, usize) {
    let words = rows.len().div_ceil(64);
    let mut serves: HashMap<Basket, Vec<u64>> = HashMap::new();
    for (k, row) in rows.iter().enumerate() {
        for b in &row.baskets {
            serves.entry(*b).or_insert_with(|| vec![0; words])[k / 64] |= 1 << (k % 64);
        }
    }
    let gains = |b: &Basket| {
        let mut bits = vec![0u64; words];
        for s in b.subsets() {
            if let Some(v) = serves.get(&s) {
                bits.iter_mut().zip(v).for_each(|(x, y)| *x |= y);
            }
        }
        bits
    };
    let count = |bits: &[u64]| bits.iter().map(|w| w.count_ones() as usize).sum::<usize>();
    let mut useful: Vec<u32> = serves.keys().flat_map(|b| b.teeth().to_vec()).collect();
    useful.sort_unstable();
    useful.dedup();
    let mut choices = Vec::new();
    let mut basket = Vec::new();
    every_basket(&useful, most, 0, &mut basket, &mut |teeth| {
        let Some(b) = Basket::of(teeth) else {
            return;
        };
        let bits = gains(&b);
        let n = count(&bits);
        if n == 0 {
            return;
        }
        // Every gear adds a thread: without any one of them, fewer are gained.
        let each_adds = (0..teeth.len()).all(|k| {
            let rest: Vec<u32> = teeth.iter().enumerate().filter(|&(j, _)| j != k).map(|(_, &z)| z).collect();
            Basket::of(&rest).is_some_and(|r| count(&gains(&r)) < n)
        });
        if each_adds {
            let gained = (0..rows.len()).filter(|&k| bits[k / 64] & (1 << (k % 64)) != 0).collect();
            choices.push(BuyChoice { basket: b, gains: gained });
        }
    });
    let total = choices.len();
    choices.sort_by(|a, b| {
        b.gains
            .len()
            .cmp(&a.gains.len())
            .then(a.basket.len().cmp(&b.basket.len()))
            .then(a.basket.cmp(&b.basket))
    });
    choices.truncate(limit);
    (choices, total)
}

/// Call `f` with every multiset of 1 to `most` of `teeth` (ascending), each once.
fn every_basket(teeth: &[u32], most: usize, from: usize, basket: &mut Vec<u32>, f: &mut dyn FnMut(&[u32])) {
    for k in from..teeth.len() {
        basket.push(teeth[k]);
        f(basket);
        if basket.len() < most {
            every_basket(teeth, most, k, basket, f);
        }
        basket.pop();
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn baskets_are_multisets() {
        let b = Basket::of(&[40, 20, 40]).unwrap();
        assert_eq!(b.teeth(), &[20, 40, 40]);
        assert!(Basket::of(&[40, 40]).unwrap().within(&b));
        assert!(!Basket::of(&[20, 20]).unwrap().within(&b));
        assert!(Basket::default().within(&b));
        // ∅, 20, 40, 20 40, 40 40, 20 40 40.
        assert_eq!(b.subsets().len(), 6);
        assert!(b.subsets().iter().all(|s| s.within(&b)));
        assert!(Basket::of(&[1, 2, 3, 4]).is_none());
    }

    #[test]
    fn every_basket_is_each_multiset_once() {
        let mut seen = Vec::new();
        every_basket(&[20, 30, 40], 2, 0, &mut Vec::new(), &mut |t| seen.push(t.to_vec()));
        // 3 of one gear, 6 of two (with repeats).
        assert_eq!(seen.len(), 9);
        seen.sort();
        seen.dedup();
        assert_eq!(seen.len(), 9);
    }

    #[test]
    fn a_choice_lists_only_gears_that_add_threads() {
        let row = |baskets: &[&[u32]]| BuyRow {
            label: String::new(),
            thread: ThreadSpec::thread(super::super::pitch::parse_pitch("1mm").unwrap(), 1),
            on_hand: false,
            baskets: baskets.iter().map(|t| Basket::of(t).unwrap()).collect(),
        };
        let rows = vec![row(&[&[127]]), row(&[&[127], &[50, 60]]), row(&[&[50]])];
        let (choices, total) = best_choices(&rows, 2, 10);
        let listed: Vec<(Vec<u32>, Vec<usize>)> =
            choices.iter().map(|c| (c.basket.teeth().to_vec(), c.gains.clone())).collect();
        // {50, 127} gains all three; {127} two; {50, 60} the second and third; {50} the third.
        assert_eq!(
            listed,
            vec![
                (vec![50, 127], vec![0, 1, 2]),
                (vec![127], vec![0, 1]),
                (vec![50, 60], vec![1, 2]),
                (vec![50], vec![2]),
            ]
        );
        assert_eq!(total, 4);
    }
}
