//! Astronomical trains: a dial that turns once per synodic month, sidereal day or tropical
//! year, driven from an arbor that turns once a day or once an hour. The error that matters is
//! how fast the dial drifts: reported as days of drift per year and the days until the dial is
//! one day out. Also the continued-fraction convergents of the ratio, the classical best
//! fractions, with whether gear teeth can make them.

use super::clock_problem;
use crate::engine::{search, RunOptions};
use crate::error::{Error, Quantity, Result};
use crate::model::pool::Pool;
use crate::model::problem::{Problem, StageLimits};
use crate::model::train::Train;
use crate::numbers::exact::Exact;
use crate::numbers::period::{period_wanted, read_period, TimeUnit};
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;
use crate::numbers::target::{parse_ratio, Target};

/// Days in the year used for drift per year: the mean Gregorian calendar year, 365.2425 days.
pub const DAYS_PER_YEAR: f64 = 365.2425;

/// A period the dial turns once in.
#[derive(Debug, Clone, PartialEq)]
pub struct Period {
    /// Its name, or the number as given.
    pub name: String,
    /// Length in mean solar days, exactly as held.
    pub days: Ratio,
    /// Where the value comes from.
    pub source: &'static str,
}

/// The named periods.
pub const NAMED: [(&str, &str, &str); 3] = [
    ("synodic-month", "29.530588", "synodic month 29.530588 d (1911 encyclopaedia, \"Calendar\")"),
    (
        "sidereal-day",
        "86164.090530833/86400",
        "sidereal day 86164.090530833 s = 1/1.002737909350795 d (Wikipedia, \"Sidereal time\")",
    ),
    ("tropical-year", "365.24219", "mean tropical year 365.24219 d (from memory)"),
];

impl Period {
    /// Parse a named period (`synodic-month`, `sidereal-day`, `tropical-year`) or a period as
    /// [`read_period`] reads it, in days when no unit is written (`27.321661`, `29.53d`,
    /// `708.7h`). Errors name [`Quantity::AstronomicalPeriod`].
    pub fn parse(text: &str) -> Result<Period> {
        let t = text.trim();
        let quantity = Quantity::AstronomicalPeriod;
        if let Some((name, value, source)) = NAMED.iter().find(|(n, _, _)| *n == t) {
            return Ok(Period { name: name.to_string(), days: parse_ratio(value, quantity)?, source });
        }
        let days = read_period(t, TimeUnit::Day).map_err(|why| {
            let names = NAMED.map(|(n, _, _)| n).join(", ");
            Error::value(
                quantity,
                format!("\"{t}\" {why}; wanted {names} or {}", period_wanted(TimeUnit::Day)),
            )
        })?;
        Ok(Period { name: t.to_string(), days, source: "as given" })
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
    /// Trains to list.
    pub limit: usize,
}

/// One train with its drift.
#[derive(Debug, Clone, PartialEq)]
pub struct AstroTrain {
    /// The train, input arbor to dial.
    pub train: Train,
    /// The dial's period with this train, days.
    pub period_days: f64,
    /// Drift, days per year: positive when the dial runs ahead.
    pub drift_days_per_year: f64,
    /// Days until the dial is one day out (`None` when exact).
    pub days_to_one_day: Option<f64>,
}

/// A convergent of the target ratio and whether gear teeth can make it.
#[derive(Debug, Clone, PartialEq)]
pub struct Convergent {
    /// The fraction, input turns per dial turn.
    pub ratio: Ratio,
    /// Its drift, days per year.
    pub drift_days_per_year: f64,
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
    /// False when interrupted.
    pub complete: bool,
    /// The best trains.
    pub trains: Vec<AstroTrain>,
    /// The convergents of the ratio, up to the first whose parts pass 10⁶.
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
        clock_problem(target, self.pool.clone(), self.stages, StageLimits::default(), self.limit)
    }

    /// Search, and list the convergents.
    pub fn plan(&self, options: &RunOptions) -> Result<AstroPlan> {
        let problem = self.problem()?;
        let found = search(&problem, crate::trades::ENGINE, options);
        let per_turn = 1.0 / self.from.turns_per_day() as f64;
        let trains = found
            .trains
            .into_iter()
            .map(|train| {
                let drift = drift_days_per_day(train.error.to_f64());
                AstroTrain {
                    period_days: train.ratio.to_f64() * per_turn,
                    drift_days_per_year: drift * DAYS_PER_YEAR,
                    days_to_one_day: (drift != 0.0).then(|| 1.0 / drift.abs()),
                    train,
                }
            })
            .collect();
        let r = self.ratio();
        let max_teeth = self.pool.gears.iter().map(|g| g.teeth).max().unwrap_or(0) as u64;
        let convergents = convergents(r, 1_000_000)
            .into_iter()
            .filter(|c| !c.is_zero())
            .map(|c| {
                let e = c.to_f64() / r.to_f64() - 1.0;
                let p = largest_prime_factor(c.num()).max(largest_prime_factor(c.den()));
                Convergent {
                    ratio: c,
                    drift_days_per_year: drift_days_per_day(e) * DAYS_PER_YEAR,
                    blocking_prime: (p > max_teeth).then_some(p),
                }
            })
            .collect();
        Ok(AstroPlan {
            spec: self.clone(),
            problem,
            count: found.count,
            complete: found.complete,
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
        // With 29.530588 (1911 encyclopaedia) the one after 1447/49 is 23654/801 (computed).
        assert_eq!(
            strings("29.530588", 10_000),
            ["29", "30", "59/2", "443/15", "502/17", "1447/49", "23654/801"]
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
    fn periods_parse() {
        assert_eq!(Period::parse("synodic-month").unwrap().days.to_string(), "7382647/250000");
        let s = Period::parse("sidereal-day").unwrap().days.to_f64();
        // The two published forms agree to the 9 decimals of the seconds figure.
        assert!((1.0 / s - 1.002737909350795).abs() < 1e-13);
        assert_eq!(Period::parse("29.53d").unwrap().days.to_string(), "2953/100");
        assert_eq!(Period::parse("29.53d").unwrap().name, "29.53d");
        assert_eq!(Period::parse("708.7h").unwrap().days.to_string(), "7087/240");
        let e = Period::parse("fortnight").unwrap_err().to_string();
        assert_eq!(
            e,
            "the astronomical period: \"fortnight\" is not a number; wanted synodic-month, sidereal-day, \
             tropical-year or a period above 0 in d such as 27.321661, or with a unit: 29.53d, 708.7h"
        );
        let e = Period::parse("0").unwrap_err().to_string();
        assert!(e.starts_with("the astronomical period: \"0\" is zero; wanted "), "{e}");
    }
}
