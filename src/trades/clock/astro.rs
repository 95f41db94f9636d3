//! Astronomical trains: a dial that turns once per synodic month, sidereal day or tropical
//! year, driven from an arbor that turns once a day or once an hour. The error that matters is
//! how fast the dial drifts: reported as days of drift per year and the days until the dial is
//! one day out. Also the continued-fraction convergents of the ratio, the classical best
//! fractions, with whether gear teeth can make them.

use super::clock_problem;
use crate::engine::{search, RunOptions};
use crate::error::{Error, Quantity, Result};
use crate::model::pool::Pool;
use crate::model::problem::{CountMode, Problem, StageLimits};
use crate::model::train::Train;
use crate::numbers::exact::Exact;
use crate::numbers::period::{period_wanted, read_period, TimeUnit};
use crate::numbers::range::IntRange;
use crate::numbers::rational::{Ratio, RelError};
use crate::numbers::target::{parse_ratio, Target};

/// Days in the year used for drift per year: the mean Gregorian calendar year, 365.2425 days.
pub const DAYS_PER_YEAR: f64 = 365.2425;

/// A period the dial turns once in.
#[derive(Debug, Clone, PartialEq)]
pub struct Period {
    /// Its name, or the number as given.
    pub name: String,
    /// What it is, for people: `mean synodic month 29.530588853 d`, or the number as given.
    pub description: String,
    /// Length in mean solar days, exactly as held.
    pub days: Ratio,
    /// The value's basis: `mean, J2000` for the built-in periods, `as given` for a number.
    pub basis: &'static str,
    /// Half a unit in the last digit of a built-in value, days: how far the period it stands
    /// for may lie from it. Zero for a period as given, which is taken as exact.
    pub half_unit_days: Ratio,
}

/// A built-in period: its name, its value in days as published (every digit kept), what it is
/// and its basis.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct NamedPeriod {
    /// The name to ask for it by.
    pub name: &'static str,
    /// The value in mean solar days, as published.
    pub days: &'static str,
    /// What it is.
    pub what: &'static str,
    /// Mean value, and the epoch it holds at.
    pub basis: &'static str,
}

/// The built-in periods, mean values at the epoch J2000.0, to the digits published.
///
/// Sources, all from memory (not checked against a printed copy here): the mean synodic
/// month 29.530588853 d is that of the lunar theory of M. Chapront-Touzé and J. Chapront
/// ("Lunar Tables and Programs from 4000 B.C. to A.D. 8000", 1991), the value quoted in the
/// "Explanatory Supplement to the Astronomical Almanac" (P. K. Seidelmann, ed., 1992; J. Meeus,
/// "Astronomical Algorithms", 2nd ed. 1998, gives 29.530588861 d at J2000); the sidereal,
/// draconic and anomalistic months, the tropical and sidereal years and the sidereal day
/// (86164.0905 s = 0.99726956633 d) are the mean values at J2000 of the same Supplement.
pub const NAMED: [NamedPeriod; 7] = [
    NamedPeriod {
        name: "synodic-month",
        days: "29.530588853",
        what: "mean synodic month",
        basis: "mean, J2000",
    },
    NamedPeriod {
        name: "sidereal-month",
        days: "27.321661",
        what: "mean sidereal month",
        basis: "mean, J2000",
    },
    NamedPeriod {
        name: "draconic-month",
        days: "27.212221",
        what: "mean draconic month",
        basis: "mean, J2000",
    },
    NamedPeriod {
        name: "anomalistic-month",
        days: "27.554550",
        what: "mean anomalistic month",
        basis: "mean, J2000",
    },
    NamedPeriod {
        name: "sidereal-day",
        days: "0.99726956633",
        what: "mean sidereal day",
        basis: "mean, J2000",
    },
    NamedPeriod {
        name: "tropical-year",
        days: "365.242190",
        what: "mean tropical year",
        basis: "mean, J2000",
    },
    NamedPeriod { name: "sidereal-year", days: "365.256363", what: "sidereal year", basis: "mean, J2000" },
];

/// Half a unit in the last digit of a decimal written `text` (`29.530588853` → 5·10⁻¹⁰).
fn half_unit_of_last_digit(text: &str) -> Ratio {
    let places = text.split_once('.').map_or(0, |(_, f)| f.len() as u32);
    Ratio::new(1, 2 * 10u128.pow(places)).unwrap_or(Ratio::integer(0))
}

impl Period {
    /// Parse a named period (see [`NAMED`]) or a period as [`read_period`] reads it, in days
    /// when no unit is written (`27.321661`, `29.53d`, `708.7h`). Errors name
    /// [`Quantity::AstronomicalPeriod`].
    pub fn parse(text: &str) -> Result<Period> {
        let t = text.trim();
        let quantity = Quantity::AstronomicalPeriod;
        if let Some(n) = NAMED.iter().find(|n| n.name == t) {
            return Ok(Period {
                name: n.name.to_string(),
                description: format!("{} {} d", n.what, n.days),
                days: parse_ratio(n.days, quantity)?,
                basis: n.basis,
                half_unit_days: half_unit_of_last_digit(n.days),
            });
        }
        let days = read_period(t, TimeUnit::Day).map_err(|why| {
            let names = NAMED.map(|n| n.name).join(", ");
            Error::value(
                quantity,
                format!("\"{t}\" {why}; wanted {names} or {}", period_wanted(TimeUnit::Day)),
            )
        })?;
        Ok(Period {
            name: t.to_string(),
            description: format!("{} d", days),
            days,
            basis: "as given",
            half_unit_days: Ratio::integer(0),
        })
    }

    /// The period's own relative uncertainty: half a unit in its last digit over its value
    /// (zero for a period as given).
    pub fn relative_uncertainty(&self) -> f64 {
        self.half_unit_days.to_f64() / self.days.to_f64()
    }

    /// How many significant figures a figure derived from a relative error `e` (a drift, the
    /// days until a day out) can carry, given the period's own digits: `None` when the period
    /// is exact, `Some(0)` when `e` lies within the period's own uncertainty.
    pub fn supported_digits(&self, e: f64) -> Option<u32> {
        let u = self.relative_uncertainty();
        if u == 0.0 {
            return None;
        }
        let ratio = e.abs() / u;
        Some(if ratio < 1.0 { 0 } else { (ratio.log10().floor() as u32).clamp(1, 15) })
    }
}

/// `v` rounded to `digits` significant figures (unchanged for `None` or zero).
pub fn round_significant(v: f64, digits: Option<u32>) -> f64 {
    match digits {
        Some(n) if n > 0 && v != 0.0 && v.is_finite() => {
            let scale = 10f64.powi(n as i32 - 1 - v.abs().log10().floor() as i32);
            (v * scale).round() / scale
        }
        _ => v,
    }
}

/// The arbor an astronomical train starts from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum InputArbor {
    /// Turns once a mean solar day (e.g. the 24-hour wheel).
    Daily,
    /// Turns once an hour (the centre arbor).
    Hourly,
}

impl InputArbor {
    /// Input turns per day.
    pub fn turns_per_day(self) -> u64 {
        match self {
            InputArbor::Daily => 1,
            InputArbor::Hourly => 24,
        }
    }
}

/// What is asked.
#[derive(Debug, Clone, PartialEq)]
pub struct AstroSpec {
    /// The dial's period.
    pub period: Period,
    /// The input arbor.
    pub from: InputArbor,
    /// Relative tolerance on the ratio.
    pub tolerance: Ratio,
    /// Gears to be cut or on hand.
    pub pool: Pool,
    /// Stage counts.
    pub stages: IntRange,
    /// Gear sets to list, each by its first arrangement.
    pub limit: usize,
    /// Whether every train must be counted, or only the listing must be the proven best
    /// ([`CountMode::LowerBound`]: four to six stages then list their best without meeting every
    /// train, and the counts are lower bounds).
    pub count_mode: CountMode,
}

/// One train with its drift.
#[derive(Debug, Clone, PartialEq)]
pub struct AstroTrain {
    /// The train, input arbor to dial.
    pub train: Train,
    /// How many arrangements of its wheels and pinions into stages give the dial (this one
    /// among them).
    pub arrangements: u64,
    /// The set's other arrangements, in stage order, when every arrangement was asked for;
    /// else empty. They give the same dial, drift and days to a day out.
    pub others: Vec<Train>,
    /// The dial's period with this train, days.
    pub period_days: f64,
    /// Drift, days per year: positive when the dial runs ahead.
    pub drift_days_per_year: f64,
    /// Days until the dial is one day out (`None` when exact).
    pub days_to_one_day: Option<f64>,
    /// Significant figures the drift and the days to a day out carry (they are rounded to
    /// them), as far as the period's own digits support: `None` when the period is exact,
    /// `Some(0)` when the train's error lies within the period's own uncertainty.
    pub significant_digits: Option<u32>,
}

/// A convergent of the target ratio and whether gear teeth can make it.
#[derive(Debug, Clone, PartialEq)]
pub struct Convergent {
    /// The fraction, input turns per dial turn.
    pub ratio: Ratio,
    /// Its drift, days per year, rounded to [`Convergent::significant_digits`].
    pub drift_days_per_year: f64,
    /// Significant figures its drift carries, as for [`AstroTrain::significant_digits`].
    pub significant_digits: Option<u32>,
    /// A prime factor of its numerator or denominator above the largest tooth count, which no
    /// train of those teeth can make.
    pub blocking_prime: Option<u64>,
}

/// The result.
#[derive(Debug, Clone, PartialEq)]
pub struct AstroPlan {
    /// What was asked.
    pub spec: AstroSpec,
    /// The problem searched.
    pub problem: Problem,
    /// Trains within tolerance.
    pub count: u64,
    /// The gear sets those trains are made of; `None` when they were not counted.
    pub gear_set_count: Option<u64>,
    /// False when interrupted.
    pub complete: bool,
    /// False when the search counted only the trains it met on the way to the listed best
    /// ([`CountMode::LowerBound`]): `count` and `gear_set_count` are then lower bounds, while
    /// the listing is still the proven best.
    pub counted_all: bool,
    /// When not every train was counted: the error of the last listed train. Every train whose
    /// |error| is at most its |error| was counted; farther ones not all.
    pub counted_within: Option<RelError>,
    /// The best gear sets, each by its best arrangement.
    pub trains: Vec<AstroTrain>,
    /// The convergents of the ratio, up to the first whose parts pass 10⁶ or whose error lies
    /// within the period's own uncertainty (the later ones approximate the digits of the
    /// decimal, not the period).
    pub convergents: Vec<Convergent>,
}

/// The continued-fraction convergents of `r`, in order, stopping after the first whose
/// numerator or denominator exceeds `max_part` (or at `r` itself).
pub fn convergents(r: Ratio, max_part: u64) -> Vec<Ratio> {
    let (mut a, mut b) = (r.num() as u128, r.den() as u128);
    let (mut h0, mut k0, mut h1, mut k1) = (0u128, 1u128, 1u128, 0u128);
    let mut out = Vec::new();
    while b != 0 {
        let q = a / b;
        let (h2, k2) = (q * h1 + h0, q * k1 + k0);
        match Ratio::new(h2, k2) {
            Some(c) => out.push(c),
            None => break,
        }
        if h2 > max_part as u128 || k2 > max_part as u128 {
            break;
        }
        (h0, k0, h1, k1) = (h1, k1, h2, k2);
        (a, b) = (b, a % b);
    }
    out
}

/// Drift of a dial whose ratio has relative error `e` (`i/R − 1`), days per day: the dial turns
/// `1/(1 + e)` times as fast as it should, so it gains `1 − 1/(1 + e)` of a turn per turn — in
/// time, `−e/(1 + e)` days per day. A train with too high a ratio turns the dial too slowly.
pub fn drift_days_per_day(e: f64) -> f64 {
    -e / (1.0 + e)
}

fn largest_prime_factor(mut n: u64) -> u64 {
    let mut best = 1;
    let mut p = 2;
    while p * p <= n {
        while n % p == 0 {
            best = p;
            n /= p;
        }
        p += 1;
    }
    if n > 1 {
        n
    } else {
        best
    }
}

impl AstroSpec {
    /// Input turns per dial turn: period in days × input turns per day.
    pub fn ratio(&self) -> Ratio {
        Exact::of(self.period.days).times(Exact::of(Ratio::integer(self.from.turns_per_day()))).value
    }

    /// The search problem.
    pub fn problem(&self) -> Result<Problem> {
        let r = self.ratio();
        let target = Target::exact(self.period.name.clone(), r, self.tolerance);
        // One entry per gear set (as every clock train): the same wheels paired differently make
        // the same dial.
        clock_problem(target, self.pool.clone(), self.stages, StageLimits::default(), self.limit)?
            .with_count(self.count_mode)
    }

    /// Search, and list the convergents.
    pub fn plan(&self, options: &RunOptions) -> Result<AstroPlan> {
        let problem = self.problem()?;
        let found = search(&problem, crate::trades::ENGINE, options);
        let per_turn = 1.0 / self.from.turns_per_day() as f64;
        let mut sets = found.arrangements.into_iter();
        let (gear_set_count, count, complete) = (found.gear_set_count, found.count, found.complete);
        let counted_all = found.counted_all;
        // Every train within the error of the last listed was counted (the window engine's
        // bound is the K-th best kept, the last listed).
        let counted_within = (!counted_all).then(|| found.trains.last().map(|t| t.error)).flatten();
        let trains = found
            .trains
            .into_iter()
            .map(|train| {
                let set = sets.next();
                let e = train.error.to_f64();
                let drift = drift_days_per_day(e);
                let digits = self.period.supported_digits(e);
                AstroTrain {
                    period_days: train.ratio.to_f64() * per_turn,
                    drift_days_per_year: round_significant(drift * DAYS_PER_YEAR, digits),
                    days_to_one_day: (drift != 0.0).then(|| round_significant(1.0 / drift.abs(), digits)),
                    significant_digits: digits,
                    train,
                    arrangements: set.as_ref().map_or(1, |a| a.count),
                    others: set.map_or(Vec::new(), |a| a.others),
                }
            })
            .collect();
        let r = self.ratio();
        let max_teeth = self.pool.gears.iter().map(|g| g.teeth).max().unwrap_or(0) as u64;
        let mut listed = Vec::new();
        for c in convergents(r, 1_000_000).into_iter().filter(|c| !c.is_zero()) {
            let e = c.to_f64() / r.to_f64() - 1.0;
            let p = largest_prime_factor(c.num()).max(largest_prime_factor(c.den()));
            let digits = self.period.supported_digits(e);
            listed.push(Convergent {
                ratio: c,
                drift_days_per_year: round_significant(drift_days_per_day(e) * DAYS_PER_YEAR, digits),
                significant_digits: digits,
                blocking_prime: (p > max_teeth).then_some(p),
            });
            if digits == Some(0) {
                break;
            }
        }
        let convergents = listed;
        Ok(AstroPlan {
            spec: self.clone(),
            problem,
            count,
            gear_set_count,
            complete,
            counted_all,
            counted_within,
            trains,
            convergents,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn strings(r: &str, max: u64) -> Vec<String> {
        convergents(parse_ratio(r, Quantity::AstronomicalPeriod).unwrap(), max)
            .iter()
            .map(|c| c.to_string())
            .collect()
    }

    #[test]
    fn lunar_month_convergents() {
        // Wikipedia, "Lunar calendar" (input 29.530589): 29/1, 30/1, 59/2, 443/15, 502/17,
        // 1447/49, 25101/850.
        assert_eq!(
            strings("29.530589", 10_000),
            ["29", "30", "59/2", "443/15", "502/17", "1447/49", "25101/850"]
        );
        // With the mean synodic month 29.530588853 d (Chapront-Touzé and Chapront, quoted in the
        // Explanatory Supplement to the Astronomical Almanac, 1992 — from memory) the one after
        // 1447/49 is 25101/850 again, then 51649/1749 (computed by hand from that input, and
        // with Python's fractions module).
        assert_eq!(
            strings("29.530588853", 500_000),
            [
                "29",
                "30",
                "59/2",
                "443/15",
                "502/17",
                "1447/49",
                "25101/850",
                "51649/1749",
                "283346/9595",
                "618341/20939"
            ]
        );
    }

    #[test]
    fn sidereal_convergents() {
        // Computed from 1.00273790935 (Wikipedia, "Sidereal time"): 366/365, 1465/1461, 10621/10592.
        assert_eq!(strings("1.00273790935", 10_000), ["1", "366/365", "1465/1461", "10621/10592"]);
    }

    #[test]
    fn drift_has_the_dial_sign() {
        // Ratio 1 % high: the dial turns 1/1.01 as fast, losing 1/101 of a day per day.
        assert!((drift_days_per_day(0.01) + 1.0 / 101.0).abs() < 1e-15);
        assert_eq!(largest_prime_factor(1447), 1447);
        assert_eq!(largest_prime_factor(49), 7);
    }

    #[test]
    fn built_in_periods_hold_every_published_digit() {
        // Mean values at J2000, all from memory: the synodic month of Chapront-Touzé and
        // Chapront's lunar theory as quoted in the Explanatory Supplement to the Astronomical
        // Almanac (1992); the other months, the years and the sidereal day (86164.0905 s) from
        // the same Supplement. Each is held exactly as its decimal.
        let exact = |name: &str| Period::parse(name).unwrap().days.to_string();
        assert_eq!(exact("synodic-month"), "29530588853/1000000000");
        assert_eq!(exact("sidereal-month"), "27321661/1000000");
        assert_eq!(exact("draconic-month"), "27212221/1000000");
        assert_eq!(exact("anomalistic-month"), "551091/20000");
        assert_eq!(exact("tropical-year"), "36524219/100000");
        assert_eq!(exact("sidereal-year"), "365256363/1000000");
        assert_eq!(exact("sidereal-day"), "99726956633/100000000000");
        // Half a unit in the last published digit: 27.554550 keeps its sixth decimal.
        assert_eq!(Period::parse("anomalistic-month").unwrap().half_unit_days.to_string(), "1/2000000");
        assert_eq!(Period::parse("synodic-month").unwrap().half_unit_days.to_string(), "1/2000000000");
        let day = Period::parse("sidereal-day").unwrap();
        // 0.99726956633 d × 86400 = 86164.09053091 s (computed), the 86164.0905 s of the
        // Supplement to its digits; and 1/1.002737909350795 d (Wikipedia, "Sidereal time") to
        // the eleven decimals held.
        assert!((day.days.to_f64() * 86400.0 - 86164.0905).abs() < 5e-5);
        assert!((1.0 / day.days.to_f64() - 1.002737909350795).abs() < 1e-11);
        assert_eq!(day.basis, "mean, J2000");
        assert_eq!(Period::parse("29.53").unwrap().basis, "as given");
        assert!(Period::parse("29.53").unwrap().half_unit_days.is_zero());
    }

    #[test]
    fn derived_figures_keep_the_digits_the_period_supports() {
        let month = Period::parse("synodic-month").unwrap();
        // Relative uncertainty 5e-10 / 29.530588853 = 1.693e-11 (computed); an error of
        // 2.253e-6 is 1.33e5 times that: five significant figures.
        assert_eq!(month.supported_digits(2.2531931e-6), Some(5));
        assert_eq!(month.supported_digits(1e-11), Some(0));
        assert_eq!(Period::parse("29.53").unwrap().supported_digits(1e-11), None);
        assert_eq!(round_significant(443815.5927, Some(5)), 443820.0);
        assert_eq!(round_significant(-0.00082296004, Some(3)), -0.000823);
        assert_eq!(round_significant(1.5, None), 1.5);
    }

    #[test]
    fn periods_parse() {
        assert_eq!(Period::parse("29.53d").unwrap().days.to_string(), "2953/100");
        assert_eq!(Period::parse("29.53d").unwrap().name, "29.53d");
        assert_eq!(Period::parse("708.7h").unwrap().days.to_string(), "7087/240");
        let e = Period::parse("fortnight").unwrap_err().to_string();
        assert_eq!(
            e,
            "the astronomical period: \"fortnight\" is not a number; wanted synodic-month, sidereal-month, \
             draconic-month, anomalistic-month, sidereal-day, tropical-year, sidereal-year or a period above \
             0 in d such as 27.321661, or with a unit: 29.53d, 708.7h"
        );
        let e = Period::parse("0").unwrap_err().to_string();
        assert!(e.starts_with("the astronomical period: \"0\" is zero; wanted "), "{e}");
    }
}
