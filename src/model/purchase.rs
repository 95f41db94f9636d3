//! Gears that may be bought: a search over the gears on hand where a train may also use up to
//! `most` new gears of a range of tooth counts in one mesh group, and, for each train, which
//! gears to buy. Owns the extended pool and the count; the search itself is the engine's, run
//! through the problem's train check and extra key ([`crate::model::problem::Problem::with_purchase`]).
//!
//! A gear bought is a new standard gear (cut with no shift, full tip). A tooth count already on
//! hand, cut standard, in the buy group is one kind: buying more of it raises its quantity, so a
//! train is found once whichever of its gears came from the shelf. For a train, the gears to buy
//! are, per kind, `max(0, used − on hand)`, and their sum is at most `most`. Gears on hand made
//! otherwise (with a shift) are their own kinds and are never bought.

use serde::{Deserialize, Serialize};

use crate::error::{Error, Quantity, Result};
use crate::model::pool::{describe_group, fmt_num, AsMade, GearKind, MeshGroup, Pool};
use crate::model::train::Train;
use crate::numbers::range::IntRange;

/// What may be bought, and the gears on hand it adds to.
#[derive(Debug, Clone, PartialEq)]
pub struct Purchase {
    /// Most gears a train may use that are not on hand.
    pub most: u32,
    /// The tooth counts that may be bought.
    pub teeth: IntRange,
    /// The module and pressure angle of the gears bought (a mesh group of the gears on hand).
    pub group: MeshGroup,
    /// The gears on hand, before anything is bought.
    pub on_hand: Pool,
}

/// One kind of gear a train needs bought.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ToBuy {
    /// Tooth count.
    pub teeth: u32,
    /// Module, mm.
    pub module_mm: f64,
    /// How many to buy.
    pub count: u32,
}

/// The index of `group` among the mesh groups of `on_hand` (it is one of them by construction).
fn group_index(on_hand: &Pool, group: &MeshGroup) -> usize {
    on_hand.groups.iter().position(|g| g == group).unwrap_or(0)
}

/// A gear cut standard: no shift, the full tip of its teeth.
fn standard(made: &Option<AsMade>) -> bool {
    made.is_some_and(|m| m.same_as(&AsMade::default()))
}

impl Purchase {
    /// Up to `most` gears of `teeth` (default: the least to the most teeth on hand in that
    /// module) in the module `module_mm` (default: the one module on hand) added to `on_hand`.
    /// Errors name [`Quantity::BuyCount`] when nothing is on hand to add to or `most` is 0,
    /// [`Quantity::BuyModule`] when the module is not on hand or must be said.
    pub fn new(
        on_hand: Pool,
        most: u32,
        teeth: Option<IntRange>,
        module_mm: Option<f64>,
    ) -> Result<Purchase> {
        if !on_hand.from_stock {
            return Err(Error::value(
                Quantity::BuyCount,
                "gears are bought to add to gears on hand; give the gears on hand",
            ));
        }
        if most == 0 {
            return Err(Error::value(Quantity::BuyCount, "wanted 1 or more gears to buy"));
        }
        let modules = || {
            let mut m: Vec<String> = Vec::new();
            for g in &on_hand.groups {
                let v = fmt_num(g.module_mm);
                if !m.contains(&v) {
                    m.push(v);
                }
            }
            m.join(", ")
        };
        let groups: Vec<&MeshGroup> = match module_mm {
            Some(m) => {
                on_hand.groups.iter().filter(|g| (g.module_mm - m).abs() <= 1e-9 * g.module_mm).collect()
            }
            None => on_hand.groups.iter().collect(),
        };
        let group = match (groups.as_slice(), module_mm) {
            ([g], _) => (*g).clone(),
            ([], Some(m)) => {
                return Err(Error::value(
                    Quantity::BuyModule,
                    format!(
                        "no gear on hand is of module {} mm, so nothing bought could mesh with them; the \
                         gears on hand are of module {} mm",
                        fmt_num(m),
                        modules()
                    ),
                ))
            }
            (many, None)
                if many.iter().any(|g| (g.module_mm - many[0].module_mm).abs() > 1e-9 * g.module_mm) =>
            {
                return Err(Error::value(
                    Quantity::BuyModule,
                    format!(
                        "the gears on hand are of modules {} mm; say which the gears to buy are of",
                        modules()
                    ),
                ))
            }
            (many, _) => {
                let angles: Vec<String> =
                    many.iter().map(|g| format!("{}°", fmt_num(g.pressure_angle_deg))).collect();
                return Err(Error::value(
                    Quantity::BuyModule,
                    format!(
                        "the gears on hand of module {} mm come in pressure angles {}, and gears are \
                         bought in one; keep only the catalogues of one",
                        fmt_num(many[0].module_mm),
                        angles.join(", ")
                    ),
                ));
            }
        };
        let index = group_index(&on_hand, &group);
        let teeth = match teeth {
            Some(t) => t,
            None => {
                let in_group = on_hand.gears.iter().filter(|k| k.group == index).map(|k| k.teeth);
                let lo = in_group.clone().min().unwrap_or(0);
                IntRange { lo, hi: in_group.max().unwrap_or(lo) }
            }
        };
        Ok(Purchase { most, teeth, group, on_hand })
    }

    /// Standard gears of `teeth` on hand in the buy group.
    pub fn on_hand_of(&self, teeth: u32) -> u32 {
        let group = group_index(&self.on_hand, &self.group);
        self.on_hand
            .gears
            .iter()
            .filter(|k| k.group == group && k.teeth == teeth && standard(&k.made))
            .map(|k| k.quantity.unwrap_or(0))
            .sum()
    }

    /// The pool a search draws from: the gears on hand, with `most` more of every tooth count
    /// that may be bought (a kind on hand cut standard grows; any other is a new kind). Errors
    /// name [`Quantity::BuyCount`] when a quantity would pass `u32`.
    pub fn pool(&self) -> Result<Pool> {
        let mut pool = self.on_hand.clone();
        let group = group_index(&self.on_hand, &self.group);
        for teeth in self.teeth.lo..=self.teeth.hi {
            let kind =
                pool.gears.iter_mut().find(|k| k.group == group && k.teeth == teeth && standard(&k.made));
            match kind {
                Some(k) => {
                    let q = k.quantity.unwrap_or(0).checked_add(self.most).ok_or_else(|| {
                        Error::value(
                            Quantity::BuyCount,
                            format!("{} more {teeth}-tooth gears is too many", self.most),
                        )
                    })?;
                    k.quantity = Some(q);
                }
                None => pool.gears.push(GearKind {
                    teeth,
                    group,
                    quantity: Some(self.most),
                    labels: Vec::new(),
                    made: Some(AsMade::default()),
                }),
            }
        }
        pool.sort_kinds();
        Ok(pool)
    }

    /// The gears `train` needs bought, by tooth count: for each tooth count of the buy range
    /// the train uses in the buy group cut standard, how many more than are on hand.
    pub fn to_buy(&self, train: &Train) -> Vec<ToBuy> {
        self.to_buy_with_idler(train, None)
    }

    /// [`Purchase::to_buy`] for `train` set up through an idler of `idler` teeth (a standard gear
    /// of the train's module, as a lathe's banjo takes it), which counts like any gear used: one
    /// spare on hand costs nothing, else it is one more to buy.
    pub fn to_buy_with_idler(&self, train: &Train, idler: Option<u32>) -> Vec<ToBuy> {
        let mut used: Vec<(u32, u32)> = Vec::new();
        let mut add = |teeth: u32| match used.iter_mut().find(|u| u.0 == teeth) {
            Some(u) => u.1 += 1,
            None => used.push((teeth, 1)),
        };
        for s in &train.stages {
            if !self.group.meshes_with(s.module_mm, s.pressure_angle_deg) {
                continue;
            }
            for g in [&s.driver, &s.driven] {
                if self.teeth.contains(g.teeth) && standard(&g.made) {
                    add(g.teeth);
                }
            }
        }
        let in_group =
            train.stages.first().is_some_and(|s| self.group.meshes_with(s.module_mm, s.pressure_angle_deg));
        if let Some(z) = idler.filter(|&z| in_group && self.teeth.contains(z)) {
            add(z);
        }
        used.sort_unstable();
        used.into_iter()
            .filter_map(|(teeth, n)| {
                let count = bought_beyond(n, self.on_hand_of(teeth));
                (count > 0).then_some(ToBuy { teeth, module_mm: self.group.module_mm, count })
            })
            .collect()
    }

    /// How many gears `train` needs bought.
    pub fn count(&self, train: &Train) -> u32 {
        self.to_buy(train).iter().map(|b| b.count).sum()
    }

    /// The budget a depth-first search over `pool` (the pool [`Purchase::pool`] made) can
    /// prune on: for each kind, how many are on hand when gears of that kind may be bought.
    pub fn budget(&self, pool: &Pool) -> Budget {
        let group = pool.groups.iter().position(|g| g == &self.group);
        let on_hand = pool
            .gears
            .iter()
            .map(|k| {
                (Some(k.group) == group && self.teeth.contains(k.teeth) && standard(&k.made))
                    .then(|| self.on_hand_of(k.teeth))
            })
            .collect();
        Budget { most: self.most, on_hand }
    }

    /// One line for reports, e.g. `up to 1 gear of 20..127 teeth, module 1.5 mm, 20°, cut
    /// standard`.
    pub fn describe(&self) -> String {
        format!(
            "up to {} gear{} of {} teeth, {}, cut standard",
            self.most,
            if self.most == 1 { "" } else { "s" },
            self.teeth,
            describe_group(&self.group)
        )
    }
}

/// `2 × 127, 1 × 40` or `nothing`: a train's gears to buy in words.
pub fn describe_to_buy(to_buy: &[ToBuy]) -> String {
    if to_buy.is_empty() {
        return "nothing".into();
    }
    to_buy.iter().map(|b| format!("{} × {}", b.count, b.teeth)).collect::<Vec<_>>().join(", ")
}

/// The gears to buy counted per kind of a search's pool, for pruning a search as it goes.
#[derive(Debug, Clone, PartialEq)]
pub struct Budget {
    /// Most gears a train may need bought.
    pub most: u32,
    /// Per kind of the pool: how many are on hand when that kind may be bought, `None` for a
    /// kind never bought. A train using `n` of a kind with `Some(h)` buys
    /// [`bought_beyond`]`(n, h)` of it, the count [`Purchase::to_buy`] gives.
    pub on_hand: Vec<Option<u32>>,
}

impl Budget {
    /// Is the `nth` gear of kind `kind` in use (counting from 1) one bought? Those on hand are
    /// used first, so the gears bought of a kind are [`bought_beyond`]`(used, on hand)`.
    pub fn is_bought(&self, kind: usize, nth: u32) -> bool {
        self.on_hand[kind].is_some_and(|h| nth > h)
    }
}

/// Gears to buy when `used` of a kind are needed and `on_hand` are on the shelf:
/// `max(0, used − on hand)`. The one to-buy rule of every search with gears to buy.
pub fn bought_beyond(used: u32, on_hand: u32) -> u32 {
    used.saturating_sub(on_hand)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::pool::StockGear;
    use crate::model::train::{Gear, Stage};
    use crate::numbers::rational::{Ratio, RelError};

    fn shelf(gears: &[(u32, u32)]) -> Pool {
        let stock: Vec<StockGear> = gears.iter().map(|&(t, q)| StockGear::on_hand(t, 1.5, 20.0, q)).collect();
        Pool::from_stock(&stock, "t").unwrap()
    }

    fn train(pairs: &[(u32, u32)]) -> Train {
        let standard = |teeth| Gear { teeth, labels: Vec::new(), made: Some(AsMade::default()) };
        let stages: Vec<Stage> = pairs
            .iter()
            .map(|&(a, b)| Stage {
                driver: standard(a),
                driven: standard(b),
                ..Stage::plain(a, b, 1.5, 20.0)
            })
            .collect();
        let r = Ratio::integer(1);
        Train { stages, ratio: r, error: RelError::of(1, 1, r) }
    }

    #[test]
    fn buying_more_of_a_gear_on_hand_raises_its_quantity() {
        let p =
            Purchase::new(shelf(&[(20, 1), (40, 2)]), 2, Some(IntRange { lo: 38, hi: 41 }), None).unwrap();
        let pool = p.pool().unwrap();
        let q = |t: u32| pool.gears.iter().filter(|k| k.teeth == t).map(|k| k.quantity).collect::<Vec<_>>();
        assert_eq!(q(40), vec![Some(4)], "one kind, two on hand and two that may be bought");
        assert_eq!(q(39), vec![Some(2)]);
        assert_eq!(q(20), vec![Some(1)], "outside the buy range, untouched");
        assert_eq!(pool.gears.len(), 5);
        assert!(pool.gears.windows(2).all(|w| w[0].teeth < w[1].teeth), "still sorted");
    }

    #[test]
    fn to_buy_is_what_the_train_uses_beyond_the_shelf() {
        let p =
            Purchase::new(shelf(&[(20, 1), (40, 2)]), 3, Some(IntRange { lo: 20, hi: 127 }), None).unwrap();
        assert_eq!(p.count(&train(&[(20, 40)])), 0);
        // Three 40s used, two on hand; a 127 not on hand at all.
        let b = p.to_buy(&train(&[(40, 127), (40, 40)]));
        assert_eq!(
            b,
            vec![
                ToBuy { teeth: 40, module_mm: 1.5, count: 1 },
                ToBuy { teeth: 127, module_mm: 1.5, count: 1 }
            ]
        );
        assert_eq!(describe_to_buy(&b), "1 × 40, 1 × 127");
        assert_eq!(p.count(&train(&[(20, 127), (20, 127)])), 3);
    }

    #[test]
    fn an_idler_is_bought_only_when_none_is_spare() {
        let p =
            Purchase::new(shelf(&[(20, 1), (40, 2)]), 2, Some(IntRange { lo: 20, hi: 127 }), None).unwrap();
        // A second 40 is spare for 20 → 40; a 50 is not on hand; a third 40 is not either.
        assert_eq!(p.to_buy_with_idler(&train(&[(20, 40)]), Some(40)), vec![]);
        assert_eq!(
            p.to_buy_with_idler(&train(&[(20, 40)]), Some(50)),
            vec![ToBuy { teeth: 50, module_mm: 1.5, count: 1 }]
        );
        assert_eq!(
            p.to_buy_with_idler(&train(&[(40, 40)]), Some(40)),
            vec![ToBuy { teeth: 40, module_mm: 1.5, count: 1 }]
        );
        assert_eq!(p.to_buy_with_idler(&train(&[(20, 40)]), None), p.to_buy(&train(&[(20, 40)])));
    }

    #[test]
    fn the_budget_counts_per_kind_of_the_pool() {
        let p =
            Purchase::new(shelf(&[(20, 1), (40, 2), (90, 1)]), 2, Some(IntRange { lo: 39, hi: 41 }), None)
                .unwrap();
        let pool = p.pool().unwrap();
        let b = p.budget(&pool);
        let by_teeth: Vec<(u32, Option<u32>)> =
            pool.gears.iter().map(|k| k.teeth).zip(b.on_hand.clone()).collect();
        assert_eq!(by_teeth, vec![(20, None), (39, Some(0)), (40, Some(2)), (41, Some(0)), (90, None)]);
        assert_eq!(b.most, 2);
        assert_eq!(bought_beyond(3, 2), 1);
        assert_eq!(bought_beyond(1, 2), 0);
    }

    #[test]
    fn the_module_must_be_on_hand_and_said_when_several_are() {
        let mixed = Pool::from_stock(
            &[
                StockGear::on_hand(20, 1.5, 20.0, 1),
                StockGear::on_hand(40, 1.5, 20.0, 1),
                StockGear::on_hand(20, 2.0, 20.0, 1),
                StockGear::on_hand(30, 2.0, 20.0, 1),
            ],
            "t",
        )
        .unwrap();
        let e = Purchase::new(mixed.clone(), 1, None, None).unwrap_err().to_string();
        assert_eq!(
            e,
            "the module of the gears to buy: the gears on hand are of modules 1.5, 2 mm; say which the \
             gears to buy are of"
        );
        let e = Purchase::new(mixed.clone(), 1, None, Some(1.0)).unwrap_err().to_string();
        assert!(e.contains("no gear on hand is of module 1 mm"), "{e}");
        let p = Purchase::new(mixed, 1, None, Some(2.0)).unwrap();
        assert_eq!(p.teeth, IntRange { lo: 20, hi: 30 }, "defaults to the teeth on hand in that module");
        assert_eq!(p.describe(), "up to 1 gear of 20..30 teeth, module 2 mm, 20°, cut standard");
        let cut = Pool::to_cut(IntRange { lo: 20, hi: 40 }, 1.0, 20.0, None).unwrap();
        assert!(Purchase::new(cut, 1, None, None).is_err());
        assert!(Purchase::new(shelf(&[(20, 1), (40, 1)]), 0, None, None).is_err());
    }
}
