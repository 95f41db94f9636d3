//! What to try next, built from what was asked: after a search that found nothing, and before
//! one that would run for hours. Each hint names a change that could help *this* search in the
//! command's own flags; one that is already in force, or that cannot help (a looser tolerance
//! for a ratio no train of these gears reaches), is not named. The reasons come first when
//! they can be proved from the problem: the target lies beyond every product of the allowed
//! stages, or an exact target has a prime factor no tooth count carries.

use gearsieve::engine::SearchSpace;
use gearsieve::model::pool::{fmt_num, Pool, MAX_STAGES, MAX_TEETH, MIN_TEETH};
use gearsieve::numbers::range::IntRange;
use gearsieve::numbers::rational::Ratio;
use gearsieve::Problem;

use super::run::either;

/// A target beyond every train the allowed stages can make, whatever the stock holds.
#[derive(Debug, Clone, PartialEq)]
pub struct OutOfReach {
    /// True when the target is above every train, false when below.
    pub above: bool,
    /// The ratio nearest the target that any train could make (stock aside), and its stages.
    pub nearest: f64,
    /// The stage count of `nearest`.
    pub stages: u32,
    /// The fewest stages whose products of these stage ratios could reach the target, when
    /// more than are allowed now and no more than a train may have.
    pub stages_needed: Option<u32>,
    /// The most stages that could still reach the target, when fewer than the least allowed
    /// now (every stage steps the wrong way, so each one takes the train further off).
    pub stages_fewer: Option<u32>,
}

/// Relative slack on float products of stage ratios, far above their rounding error: the claim
/// that a target is out of reach must hold exactly, so anything this close counts as reachable.
const SLACK: f64 = 1e-9;

impl OutOfReach {
    /// Whether `problem`'s target lies beyond every product of its allowed stage ratios. The
    /// stages are those the search itself allows (limits and mesh checks applied); stock
    /// quantities are ignored, so the reach is if anything too wide and the claim is safe.
    pub fn of(problem: &Problem) -> Option<OutOfReach> {
        let space = SearchSpace::new(problem, None);
        let (&vmin, &vmax) = (space.values.first()?, space.values.last()?);
        let counts = problem.stage_counts();
        let (lo_n, hi_n) = (*counts.iter().min()? as u32, *counts.iter().max()? as u32);
        let r = problem.target.ratio.to_f64();
        let t = problem.target.tolerance.to_f64();
        let (want_lo, want_hi) = (r * (1.0 - t), r * (1.0 + t));
        // The largest product uses the most stages when a stage can step up, the fewest when
        // every stage steps down; the smallest the other way round.
        let top_n = if vmax >= 1.0 { hi_n } else { lo_n };
        let bottom_n = if vmin <= 1.0 { hi_n } else { lo_n };
        let (top, bottom) = (vmax.powi(top_n as i32), vmin.powi(bottom_n as i32));
        let needed = |v: f64, want: f64| {
            let n = (want.ln() / v.ln() - SLACK).ceil();
            (n.is_finite() && n > hi_n as f64 && n <= MAX_STAGES as f64).then_some(n as u32)
        };
        let fewer = |v: f64, want: f64| {
            let n = (want.ln() / v.ln() + SLACK).floor();
            (n.is_finite() && n >= 1.0 && n < lo_n as f64).then_some(n as u32)
        };
        if want_lo > top * (1.0 + SLACK) {
            let (stages_needed, stages_fewer) =
                if vmax > 1.0 { (needed(vmax, want_lo), None) } else { (None, fewer(vmax, want_lo)) };
            return Some(OutOfReach {
                above: true,
                nearest: top,
                stages: top_n,
                stages_needed,
                stages_fewer,
            });
        }
        if want_hi < bottom * (1.0 - SLACK) {
            let (stages_needed, stages_fewer) =
                if vmin < 1.0 { (needed(vmin, want_hi), None) } else { (None, fewer(vmin, want_hi)) };
            return Some(OutOfReach {
                above: false,
                nearest: bottom,
                stages: bottom_n,
                stages_needed,
                stages_fewer,
            });
        }
        None
    }

    /// The stage-count hint: `--stages up to 3` or `--stages down to 1`, when one applies.
    pub fn stages_hint(&self) -> Option<String> {
        match (self.stages_needed, self.stages_fewer) {
            (Some(n), _) => Some(format!("--stages up to {n}")),
            (None, Some(n)) => Some(format!("--stages down to {n}")),
            (None, None) => None,
        }
    }

    /// The reason in words: `1000 is out of reach: 1 stage of these gears makes at most 1.667.`
    pub fn sentence(&self, target: &str) -> String {
        format!(
            "{target} is out of reach: {} stage{} of these gears make{} at {} {}. ",
            self.stages,
            if self.stages == 1 { "" } else { "s" },
            if self.stages == 1 { "s" } else { "" },
            if self.above { "most" } else { "least" },
            fmt_num(self.nearest)
        )
    }
}

/// An exact target no gear of the pool can make: a factor of its numerator or denominator
/// shares no prime with any tooth count (its primes are all above the largest).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ExactBlocked {
    /// The target ratio, exactly.
    pub ratio: Ratio,
    /// The factor made of primes above the largest tooth count.
    pub factor: u64,
    /// The largest tooth count of the pool.
    pub max_teeth: u32,
}

impl ExactBlocked {
    /// Whether `problem` asks for an exact ratio that its gears cannot make. A train's ratio
    /// p/q (reduced) needs p to divide the product of the driven teeth and q that of the
    /// drivers, so a prime of p or q above every tooth count rules every train out.
    pub fn of(problem: &Problem) -> Option<ExactBlocked> {
        if !problem.target.tolerance.is_zero() {
            return None;
        }
        let max_teeth = problem.pool.gears.iter().map(|g| g.teeth).max()?;
        let r = problem.target.ratio;
        [r.num(), r.den()]
            .into_iter()
            .map(|n| large_part(n, max_teeth))
            .find(|&f| f > 1)
            .map(|factor| ExactBlocked { ratio: r, factor, max_teeth })
    }

    /// The reason in words; a target given by name is followed by its ratio.
    pub fn sentence(&self, target: &str) -> String {
        let ratio = self.ratio.to_string();
        let shown = if target == ratio { ratio } else { format!("{target} ({ratio})") };
        format!(
            "An exact {shown} cannot be made from these gears: {} divides it and shares no factor with \
             any tooth count up to {}. ",
            self.factor, self.max_teeth
        )
    }
}

/// `n` with every prime factor of at most `bound` divided out.
fn large_part(mut n: u64, bound: u32) -> u64 {
    for p in 2..=bound as u64 {
        if p * p > n {
            // What is left is 1 or a prime; a prime within the bound divides out too.
            return if n <= bound as u64 { 1 } else { n };
        }
        while n % p == 0 {
            n /= p;
        }
    }
    n
}

/// "a wider --teeth range" for gears to cut whose range could be wider, "more stock" for gears
/// on hand; `flag` is the command's tooth-range flag.
pub fn more_gears(pool: &Pool, flag: &str) -> Option<String> {
    if pool.from_stock {
        return Some("more stock".into());
    }
    let teeth = pool.gears.iter().map(|g| g.teeth);
    let (lo, hi) = (teeth.clone().min()?, teeth.max()?);
    (lo > MIN_TEETH || hi < MAX_TEETH).then(|| format!("a wider {flag} range"))
}

/// "more --stages" while a train may have more.
pub fn more_stages(stages: IntRange) -> Option<String> {
    ((stages.hi as usize) < MAX_STAGES).then(|| "more --stages".into())
}

/// `no train meets every constraint. {why}Try {hints}.`
pub fn nothing(why: &str, hints: &[String]) -> String {
    if hints.is_empty() {
        format!("no train meets every constraint. {}", why.trim_end())
    } else {
        format!("no train meets every constraint. {why}Try {}.", either(hints))
    }
}

/// What `search` says when nothing met every constraint.
pub fn nothing_from_search(problem: &Problem) -> String {
    let target = &problem.target.text;
    let mut hints = Vec::new();
    let limits = given_limits(problem);
    let widen_limits = (!limits.is_empty()).then(|| format!("wider {} limits", either_or(&limits)));
    if let Some(reach) = OutOfReach::of(problem) {
        hints.extend(reach.stages_hint());
        hints.extend(more_gears(&problem.pool, "--teeth"));
        hints.extend(widen_limits);
        return nothing(&reach.sentence(target), &hints);
    }
    if let Some(blocked) = ExactBlocked::of(problem) {
        hints.push("a --tol above 0".into());
        if !problem.pool.from_stock && blocked.factor <= MAX_TEETH as u64 {
            hints.push(format!("a --teeth range up to {}", blocked.factor));
        } else if problem.pool.from_stock {
            hints.push("more stock".into());
        }
        return nothing(&blocked.sentence(target), &hints);
    }
    hints.push("a looser --tol".into());
    hints.extend(more_stages(problem.stages));
    hints.extend(more_gears(&problem.pool, "--teeth"));
    hints.extend(widen_limits);
    if let Some(rules) = &problem.mesh {
        if rules.centre_distance_mm.is_some() || rules.coaxial {
            hints.push("a wider --shift-sum".into());
        }
        if !rules.limits.allow_undercut {
            hints.push("--allow-undercut".into());
        }
        if rules.limits.min_contact_ratio > 0.0 {
            hints.push("a lower --min-contact-ratio".into());
        }
        if rules.coaxial {
            hints.push("leaving out --coaxial".into());
        }
    }
    if problem.direction.is_some() {
        hints.push("leaving out --direction".into());
    }
    nothing("", &hints)
}

/// How a search that would run for hours could be made smaller, in `search`'s flags.
pub fn narrow_search(problem: &Problem) -> Vec<String> {
    let mut narrow = Vec::new();
    if problem.stages.hi > 1 {
        narrow.push("fewer --stages".to_string());
    }
    if !problem.pool.from_stock && problem.pool.gears.len() > 1 {
        narrow.push("a narrower --teeth range".into());
    }
    let limits = given_limits(problem);
    if limits.is_empty() {
        narrow.push("--driver-teeth or --stage-ratio limits".into());
    } else {
        narrow.push(format!("narrower {} limits", either_or(&limits)));
    }
    if !problem.target.tolerance.is_zero() {
        narrow.push("a tighter --tol".into());
    }
    narrow
}

/// The per-stage limit flags a search was given.
fn given_limits(problem: &Problem) -> Vec<String> {
    let l = &problem.limits;
    [
        (l.driver_teeth.is_some(), "--driver-teeth"),
        (l.driven_teeth.is_some(), "--driven-teeth"),
        (l.stage_ratio.is_some(), "--stage-ratio"),
        (l.centre_distance_mm.is_some(), "--centre-distance"),
    ]
    .into_iter()
    .filter(|(given, _)| *given)
    .map(|(_, flag)| flag.to_string())
    .collect()
}

/// `a`, `a or b`, `a, b or c`, without the comma before the last.
pub fn either_or(items: &[String]) -> String {
    match items {
        [] => String::new(),
        [one] => one.clone(),
        [rest @ .., last] => format!("{} or {last}", rest.join(", ")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use gearsieve::model::rank::DEFAULT_RANK;
    use gearsieve::numbers::target::Target;
    use gearsieve::StageLimits;

    fn problem(ratio: &str, tol: &str, teeth: (u32, u32), stages: (u32, u32)) -> Problem {
        let pool = Pool::to_cut(IntRange { lo: teeth.0, hi: teeth.1 }, 1.0, 20.0, None).unwrap();
        let stages = IntRange { lo: stages.0, hi: stages.1 };
        let target = Target::parse(ratio, tol).unwrap();
        Problem::new(target, pool, stages, StageLimits::default(), None, DEFAULT_RANK.to_vec(), 5).unwrap()
    }

    #[test]
    fn a_target_beyond_every_train_is_out_of_reach() {
        // One stage of 12..20 teeth makes at most 20/12.
        let r = OutOfReach::of(&problem("1000", "0", (12, 20), (1, 1))).unwrap();
        assert!(r.above);
        assert_eq!((r.stages, fmt_num(r.nearest)), (1, "1.6667".to_string()));
        // (5/3)^13 < 1000 < (5/3)^14: more than six stages, so more stages are no hint.
        assert_eq!(r.stages_needed, None);
        // 30 needs three stages of up to 60/12 = 5 (25 < 30 ≤ 125).
        let r = OutOfReach::of(&problem("30", "0", (12, 60), (1, 2))).unwrap();
        assert_eq!(r.stages_needed, Some(3));
        // Below: 1/30 from the same gears.
        let r = OutOfReach::of(&problem("1/30", "0", (12, 60), (1, 2))).unwrap();
        assert!(!r.above);
        assert_eq!(r.stages_needed, Some(3));
        // Within reach, or reachable at the edge of the tolerance.
        // Stages of 60/61 and 61/60 come nowhere near 1/2 within six: no stage count to name.
        let r = OutOfReach::of(&problem("1/2", "0", (60, 61), (2, 3))).unwrap();
        assert_eq!((r.above, r.stages_needed, r.stages_fewer), (false, None, None));
        let r = OutOfReach::of(&problem("2", "0", (30, 100), (3, 3)));
        assert_eq!(r.map(|r| r.stages_fewer), None);
        // Every stage steps up by at least 1.2: three overshoot 1.3 from above, one reaches it.
        let up = Pool::to_cut(IntRange { lo: 20, hi: 30 }, 1.0, 20.0, None).unwrap();
        let limits = StageLimits {
            stage_ratio: Some(
                gearsieve::numbers::range::parse_ratio_range("1.2..", gearsieve::Quantity::StageRatio)
                    .unwrap(),
            ),
            ..StageLimits::default()
        };
        let target = Target::parse("1.3", "0").unwrap();
        let stages = IntRange { lo: 3, hi: 3 };
        let p = Problem::new(target, up, stages, limits, None, DEFAULT_RANK.to_vec(), 5).unwrap();
        let r = OutOfReach::of(&p).unwrap();
        assert_eq!(
            (r.above, r.stages_fewer, r.stages_hint()),
            (false, Some(1), Some("--stages down to 1".into()))
        );
        assert_eq!(OutOfReach::of(&problem("25", "0", (12, 60), (1, 2))), None);
        assert_eq!(OutOfReach::of(&problem("26", "4%", (12, 60), (1, 2))), None);
    }

    #[test]
    fn an_exact_target_with_a_prime_above_every_tooth_count_is_blocked() {
        let b = ExactBlocked::of(&problem("127/120", "0", (12, 100), (1, 3))).unwrap();
        assert_eq!((b.factor, b.max_teeth), (127, 100));
        assert!(b.sentence("127/120").starts_with("An exact 127/120 cannot be made"));
        assert!(b.sentence("1.0583333…").starts_with("An exact 1.0583333… (127/120) cannot"));
        assert_eq!(ExactBlocked::of(&problem("127/120", "0", (12, 127), (1, 3))), None);
        assert_eq!(ExactBlocked::of(&problem("127/120", "1e-4", (12, 100), (1, 3))), None);
        // 101·103 is not a tooth count either way.
        let b = ExactBlocked::of(&problem("10403", "0", (12, 100), (1, 3))).unwrap();
        assert_eq!(b.factor, 10403);
        assert_eq!(large_part(2 * 3 * 97, 100), 1);
        assert_eq!(large_part(97 * 97, 96), 97 * 97);
    }

    #[test]
    fn hints_name_only_what_could_help() {
        let none = nothing_from_search(&problem("1000", "0", (12, 20), (1, 1)));
        assert_eq!(
            none,
            "no train meets every constraint. 1000 is out of reach: 1 stage of these gears makes at most \
             1.6667. Try a wider --teeth range."
        );
        let blocked = nothing_from_search(&problem("127/120", "0", (12, 100), (1, 1)));
        assert!(blocked.ends_with("Try a --tol above 0, or a --teeth range up to 127."), "{blocked}");
        assert!(!blocked.contains("looser"), "{blocked}");
        let narrow = narrow_search(&problem("127/120", "0", (12, 100), (1, 3)));
        assert!(!narrow.iter().any(|h| h.contains("--tol")), "{narrow:?}");
        let narrow = narrow_search(&problem("127/120", "1e-4", (12, 100), (1, 3)));
        assert!(narrow.iter().any(|h| h == "a tighter --tol"), "{narrow:?}");
        let full = problem("7", "0", (3, 1000), (6, 6));
        assert_eq!((more_gears(&full.pool, "--teeth"), more_stages(full.stages)), (None, None));
        let some = problem("7", "0", (12, 100), (1, 3));
        assert_eq!(more_gears(&some.pool, "--wheels").as_deref(), Some("a wider --wheels range"));
    }
}
