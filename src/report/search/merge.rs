//! Combining the JSON documents of the parts (`I/N`) of a split search into exactly the document
//! one unsplit run prints: counts add up, the listed trains are re-ranked with the same total
//! order the search uses (one entry per gear set when the search listed gear sets: a set's
//! arrangements may be found by different parts), and every part must be present once and ask
//! the same question.
//! Owns only the combining; reading files is the command line's job.

use std::cmp::Ordering;

use crate::engine::{Shard, COAXIAL_MISFIT_KIND};
use crate::error::{Error, Message, Quantity, Result};
use crate::model::problem::TO_BUY_KEY;
use crate::model::rank::{compare, dominates, parse_rank, RankKey, Ranked};
use crate::numbers::rational::{Ratio, RelError};
use crate::numbers::target::parse_ratio;
use crate::report::fields::TrainJson;
use crate::report::search::json::{CountKind, Doc};

/// A listed train with the keys the ranking needs, recomputed exactly from its JSON.
struct Listed {
    json: TrainJson,
    error: RelError,
    /// Stages in stage-table order: (driven, driver, module, pressure angle), sorted by ratio
    /// then driver, driven, module, pressure angle.
    stages: Vec<(u32, u32, f64, f64)>,
}

fn stage_order(a: &(u32, u32, f64, f64), b: &(u32, u32, f64, f64)) -> Ordering {
    (a.0 as u64 * b.1 as u64)
        .cmp(&(b.0 as u64 * a.1 as u64))
        .then(a.1.cmp(&b.1))
        .then(a.0.cmp(&b.0))
        .then(a.2.total_cmp(&b.2))
        .then(a.3.total_cmp(&b.3))
}

/// One gear of a set as JSON names it: teeth, module and pressure angle (as bits, to compare).
type GearKey = (u32, u64, u64);

impl Listed {
    /// The train's gear set: its drivers and its driven gears, each sorted.
    fn gear_set(&self) -> (Vec<GearKey>, Vec<GearKey>) {
        let key = |z: u32, s: &crate::report::fields::StageJson| {
            (z, s.module_mm.to_bits(), s.pressure_angle_deg.to_bits())
        };
        let mut drivers: Vec<GearKey> = self.json.stages.iter().map(|s| key(s.driver, s)).collect();
        let mut driven: Vec<GearKey> = self.json.stages.iter().map(|s| key(s.driven, s)).collect();
        drivers.sort_unstable();
        driven.sort_unstable();
        (drivers, driven)
    }
}

impl Ranked for Listed {
    fn rel_error(&self) -> &RelError {
        &self.error
    }
    fn meshes(&self) -> u8 {
        self.stages.len() as u8
    }
    fn size(&self) -> u32 {
        self.json.size
    }
    fn span_mm(&self) -> f64 {
        self.json.span_mm
    }
    /// The gears to buy, the only extra key a search document names (`to_buy`).
    fn extra(&self) -> f64 {
        self.json.to_buy.as_ref().map_or(0.0, |b| f64::from(b.iter().map(|x| x.count).sum::<u32>()))
    }
    fn cmp_stages(&self, other: &Self) -> Ordering {
        for (a, b) in self.stages.iter().zip(&other.stages) {
            let o = stage_order(a, b);
            if o != Ordering::Equal {
                return o;
            }
        }
        self.stages.len().cmp(&other.stages.len())
    }
}

fn listed(t: TrainJson, target: Ratio, name: &str) -> Result<Listed> {
    let bad = |what: &str| Error::problem(format!("{name}: a train's {what} is not what gearsieve writes"));
    let ratio = parse_ratio(&t.ratio, Quantity::TargetRatio).map_err(|_| bad("ratio"))?;
    let mut stages: Vec<(u32, u32, f64, f64)> =
        t.stages.iter().map(|s| (s.driven, s.driver, s.module_mm, s.pressure_angle_deg)).collect();
    if stages.is_empty() || stages.iter().any(|s| s.0 == 0 || s.1 == 0) {
        return Err(bad("stage list"));
    }
    stages.sort_by(stage_order);
    Ok(Listed { error: RelError::of(ratio.num(), ratio.den(), target), json: t, stages })
}

/// A value in a part's document that does not parse, named by the part's file instead of its
/// quantity.
fn in_file(name: &str, e: Error) -> Error {
    match e {
        Error::Value { message, .. } => Error::problem(Message::from(format!("{name}: ")).then(message)),
        other => other,
    }
}

/// Merge the documents of every part of one split search; `docs` pairs each with a name (its
/// file) for errors.
pub fn merge(docs: Vec<(String, Doc)>) -> Result<Doc> {
    let Some((first_name, first)) = docs.first().cloned() else {
        return Err(Error::problem("merge: give the JSON files of every part of the search"));
    };
    let part = |name: &str, d: &Doc| -> Result<Shard> {
        let text = d.shard.as_deref().ok_or_else(|| {
            let said =
                format!("{name}: not part of a split search (it has no \"shard\"); run the parts with ");
            Error::problem(Message::from(said).quantity(Quantity::Shard).text(" I/N"))
        })?;
        Shard::parse(text).map_err(|e| in_file(name, e))
    };
    let n = part(&first_name, &first)?.count;
    let mut seen = vec![false; n as usize];
    for (name, d) in &docs {
        let s = part(name, d)?;
        if s.count != n {
            return Err(Error::problem(format!(
                "{name}: part {s} belongs to a search split {} ways, not {n}",
                s.count
            )));
        }
        if std::mem::replace(&mut seen[s.index as usize - 1], true) {
            return Err(Error::problem(format!("{name}: part {s} is given twice")));
        }
        let same = d.target == first.target
            && d.ranked_by == first.ranked_by
            && d.limit == first.limit
            && d.pareto_size.is_some() == first.pareto_size.is_some()
            && d.convention == first.convention
            && d.buy == first.buy;
        if !same {
            return Err(Error::problem(format!(
                "{name}: asks a different question from {first_name} (target, tolerance, ranking, limit, Pareto mode or gears to buy differ)"
            )));
        }
    }
    if let Some(missing) = seen.iter().position(|s| !s) {
        return Err(Error::problem(format!("merge: part {}/{n} is missing", missing + 1)));
    }
    let target =
        parse_ratio(&first.target.exact, Quantity::TargetRatio).map_err(|e| in_file(&first_name, e))?;
    let names: Vec<String> = first.ranked_by.clone();
    // A search with gears to buy ranks first by them (its extra key); the rest are the user's.
    let buying = first.buy.is_some() && names.first().is_some_and(|k| k == TO_BUY_KEY);
    let user = if buying { &names[1..] } else { &names[..] };
    let mut keys = parse_rank(&user.join(",")).map_err(|e| in_file(&first_name, e))?;
    if buying {
        keys.insert(0, RankKey::Extra);
    }
    let mut rejected = first.rejected.clone();
    for r in rejected.iter_mut().filter(|r| r.kind == COAXIAL_MISFIT_KIND) {
        r.count = docs
            .iter()
            .flat_map(|(_, d)| d.rejected.iter().filter(|x| x.kind == COAXIAL_MISFIT_KIND))
            .map(|x| x.count)
            .sum();
    }
    let (mut count, mut complete, mut count_kind) = (0u64, true, CountKind::Exact);
    // Every train within the narrowest of the parts' bands was counted in every part.
    let mut counted_within: Option<f64> = None;
    let mut gear_set_count = Some(0u64);
    let by_set = docs.iter().any(|(_, d)| d.trains.iter().any(|t| t.arrangements.is_some()));
    let mut all = Vec::new();
    for (name, d) in docs {
        count += d.count;
        gear_set_count = gear_set_count.zip(d.gear_set_count).map(|(a, b)| a + b);
        complete &= d.complete;
        if d.count_kind == CountKind::LowerBound {
            count_kind = CountKind::LowerBound;
            let within = d.counted_within.unwrap_or(0.0);
            counted_within = Some(counted_within.map_or(within, |c| c.min(within)));
        }
        for t in d.trains {
            all.push(listed(t, target, &name)?);
        }
    }
    all.sort_by(|a, b| compare(&keys, a, b));
    if by_set {
        // Each part lists a set by the best arrangement it found; the best of those stays.
        let mut seen = std::collections::HashSet::new();
        all.retain(|l| seen.insert(l.gear_set()));
    }
    let mut pareto_size = None;
    if first.pareto_size.is_some() {
        let front: Vec<bool> = all.iter().map(|c| !all.iter().any(|o| dominates(o, c))).collect();
        let mut keep = front.into_iter();
        all.retain(|_| keep.next().unwrap_or(false));
        pareto_size = Some(all.len());
        if first.limit > 0 {
            all.truncate(first.limit);
        }
    } else {
        all.truncate(first.limit);
    }
    Ok(Doc {
        count,
        gear_set_count,
        count_kind,
        counted_within,
        complete,
        pareto_size,
        shard: None,
        rejected,
        trains: all.into_iter().map(|l| l.json).collect(),
        ..first
    })
}
