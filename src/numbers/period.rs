//! Periods of time as typed, with or without a unit: `2`, `2s`, `1.5min`, `1h`, `29.53d`. Each is
//! converted exactly to the unit its owner counts in (a pendulum in seconds, an astronomical
//! period in days). Owns the period syntax and the check that a period is positive.

use crate::error::{Error, Quantity, Result};
use crate::numbers::exact::Exact;
use crate::numbers::length::unknown_unit;
use crate::numbers::rational::Ratio;
use crate::numbers::target::parse_number;

/// A unit a period may be given in.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TimeUnit {
    /// Seconds, `s`.
    Second,
    /// Minutes, `min`.
    Minute,
    /// Hours, `h`.
    Hour,
    /// Mean solar days, `d` (86 400 s).
    Day,
}

impl TimeUnit {
    /// The unit as written after a number.
    pub fn symbol(self) -> &'static str {
        match self {
            TimeUnit::Second => "s",
            TimeUnit::Minute => "min",
            TimeUnit::Hour => "h",
            TimeUnit::Day => "d",
        }
    }

    /// Seconds in one of the unit.
    pub fn seconds(self) -> u64 {
        match self {
            TimeUnit::Second => 1,
            TimeUnit::Minute => 60,
            TimeUnit::Hour => 3600,
            TimeUnit::Day => 86_400,
        }
    }

    /// Examples of a period in this unit, bare and with units, for the "wanted" of a message.
    fn examples(self) -> &'static str {
        match self {
            TimeUnit::Day => "27.321661, or with a unit: 29.53d, 708.7h",
            _ => "2, or with a unit: 2s, 1.5min, 1h",
        }
    }
}

/// Read a positive period and give it counted in `unit`, exactly; a bare number is in `unit`.
/// `Err` says what is wrong, in words that follow the quoted text.
pub fn read_period(text: &str, unit: TimeUnit) -> std::result::Result<Ratio, String> {
    let lower = text.trim().to_ascii_lowercase();
    let (number, given_in) = [TimeUnit::Minute, TimeUnit::Second, TimeUnit::Hour, TimeUnit::Day]
        .into_iter()
        .find_map(|u| lower.strip_suffix(u.symbol()).map(|n| (n, u)))
        .unwrap_or((lower.as_str(), unit));
    let given = parse_number(number).map_err(|why| unknown_unit(text.trim()).unwrap_or(why))?;
    if given.is_zero() {
        return Err("is zero".into());
    }
    let too_many = || "has too many digits to hold exactly".to_string();
    let scale = Ratio::new(given_in.seconds() as u128, unit.seconds() as u128).ok_or_else(too_many)?;
    let v = Exact::of(given).times(Exact::of(scale));
    if v.exact {
        Ok(v.value)
    } else {
        Err(too_many())
    }
}

/// What a period error says is wanted, for a period counted in `unit`.
pub fn period_wanted(unit: TimeUnit) -> String {
    format!("a period above 0 in {} such as {}", unit.symbol(), unit.examples())
}

/// Parse a positive period and give it counted in `unit` (the unit its owner counts in),
/// exactly; a bare number is in `unit`. Errors name `quantity` and say which units are accepted.
pub fn parse_period(text: &str, quantity: Quantity, unit: TimeUnit) -> Result<Ratio> {
    read_period(text, unit).map_err(|why| {
        Error::value(quantity, format!("\"{}\" {why}; wanted {}", text.trim(), period_wanted(unit)))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn seconds(s: &str) -> String {
        parse_period(s, Quantity::PendulumPeriod, TimeUnit::Second).unwrap().to_string()
    }

    #[test]
    fn units_convert_exactly() {
        assert_eq!(seconds("2"), "2");
        assert_eq!(seconds("2s"), "2");
        assert_eq!(seconds("1.5min"), "90");
        assert_eq!(seconds("1/2 h"), "1800");
        assert_eq!(seconds("1e-1s"), "1/10");
        let days = |s| read_period(s, TimeUnit::Day).unwrap().to_string();
        assert_eq!(days("29.530588d"), "7382647/250000");
        assert_eq!(days("29.530588"), "7382647/250000");
        assert_eq!(days("708.7h"), "7087/240");
        assert_eq!(days("86400s"), "1");
    }

    #[test]
    fn bad_periods_say_what_is_wanted() {
        let e = parse_period("0", Quantity::PendulumPeriod, TimeUnit::Second).unwrap_err().to_string();
        assert_eq!(
            e,
            "the pendulum period: \"0\" is zero; wanted a period above 0 in s such as 2, or with a unit: \
             2s, 1.5min, 1h"
        );
        let e = read_period("2 weeks", TimeUnit::Second).unwrap_err();
        assert_eq!(e, "has an unknown unit \"weeks\"");
        assert_eq!(read_period("2ms", TimeUnit::Second).unwrap_err(), "has an unknown unit \"ms\"");
        for bad in ["", "s", "-2s", "2ms", "two", "2 weeks", "1e99s"] {
            let e = parse_period(bad, Quantity::PendulumPeriod, TimeUnit::Second).unwrap_err().to_string();
            assert!(e.starts_with("the pendulum period: "), "{bad}: {e}");
        }
    }
}
