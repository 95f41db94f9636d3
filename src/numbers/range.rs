//! Inclusive ranges typed on the command line: `LO..HI`, a single value `N`, or an open end
//! (`..6`, `12..`). Owns only the syntax and the checks that a range is non-empty and inside the
//! limits the caller allows.

use crate::error::{Error, Quantity, Result};
use crate::numbers::length::{Length, LengthUnit};
use crate::numbers::rational::Ratio;
use crate::numbers::target::parse_ratio;

/// An inclusive range of whole numbers.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct IntRange {
    /// Smallest value, inclusive.
    pub lo: u32,
    /// Largest value, inclusive; `lo ≤ hi`.
    pub hi: u32,
}

impl IntRange {
    /// Does the range hold `v`?
    pub fn contains(&self, v: u32) -> bool {
        self.lo <= v && v <= self.hi
    }
}

impl std::fmt::Display for IntRange {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        if self.lo == self.hi {
            write!(f, "{}", self.lo)
        } else {
            write!(f, "{}..{}", self.lo, self.hi)
        }
    }
}

fn split(text: &str) -> (&str, Option<&str>) {
    match text.split_once("..") {
        Some((a, b)) => (a.trim(), Some(b.trim().trim_start_matches('='))),
        None => (text.trim(), None),
    }
}

/// Parse `LO..HI`, `N`, `..HI` or `LO..` as whole numbers within `[min, max]`; errors name
/// `quantity`, and `what` counts in the words of what is wanted ("teeth", "stages").
pub fn parse_int_range(text: &str, quantity: Quantity, what: &str, min: u32, max: u32) -> Result<IntRange> {
    let wanted = format!("wanted {what} as N or LO..HI with {min} ≤ LO ≤ HI ≤ {max}");
    let bad = |why: String| Error::value(quantity, format!("{why}; {wanted}"));
    let num = |s: &str, default: u32| -> Result<u32> {
        if s.is_empty() {
            return Ok(default);
        }
        let v: u64 = s.parse().map_err(|_| bad(format!("\"{s}\" is not a whole number")))?;
        if v < min as u64 || v > max as u64 {
            return Err(bad(format!("{s} is out of range")));
        }
        Ok(v as u32)
    };
    let (a, b) = split(text);
    if a.is_empty() && b.is_none_or(str::is_empty) {
        return Err(bad("empty range".into()));
    }
    let lo = num(a, min)?;
    let hi = match b {
        Some(b) => num(b, max)?,
        None => lo,
    };
    if lo > hi {
        return Err(bad(format!("\"{}\" is inverted (LO > HI)", text.trim())));
    }
    Ok(IntRange { lo, hi })
}

/// An inclusive range of exact positive ratios (for per-stage ratio limits).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct RatioRange {
    /// Smallest, inclusive; `None` for no lower limit.
    pub lo: Option<Ratio>,
    /// Largest, inclusive; `None` for no upper limit.
    pub hi: Option<Ratio>,
}

impl RatioRange {
    /// Is `num/den` inside?
    pub fn contains(&self, num: u64, den: u64) -> bool {
        let ok_lo = self.lo.is_none_or(|lo| num as u128 * lo.den() as u128 >= lo.num() as u128 * den as u128);
        let ok_hi = self.hi.is_none_or(|hi| num as u128 * hi.den() as u128 <= hi.num() as u128 * den as u128);
        ok_lo && ok_hi
    }
}

/// Parse a range of ratios such as `0.2..6`, `1/6..6` or `..6`; errors name `quantity`.
pub fn parse_ratio_range(text: &str, quantity: Quantity) -> Result<RatioRange> {
    let (a, b) = split(text);
    let one = |s: &str| -> Result<Option<Ratio>> {
        if s.is_empty() {
            Ok(None)
        } else {
            parse_ratio(s, quantity).map(Some)
        }
    };
    let (lo, hi) = match b {
        Some(b) => (one(a)?, one(b)?),
        None => {
            let v = one(a)?;
            (v, v)
        }
    };
    if lo.is_none() && hi.is_none() {
        return Err(Error::value(quantity, "empty range; wanted LO..HI such as 0.2..6 or ..6"));
    }
    if let (Some(l), Some(h)) = (lo, hi) {
        if l > h {
            return Err(Error::value(quantity, format!("\"{}\" is inverted (LO > HI)", text.trim())));
        }
    }
    Ok(RatioRange { lo, hi })
}

/// An inclusive range of lengths in millimetres, in floating point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FloatRange {
    /// Smallest, inclusive.
    pub lo: f64,
    /// Largest, inclusive; `lo ≤ hi`. An open end is `0` below or `+∞` above; given ends are
    /// finite and positive.
    pub hi: f64,
}

impl FloatRange {
    /// Is `v` inside, allowing `slack` either side (for values computed in floating point)?
    pub fn contains(&self, v: f64, slack: f64) -> bool {
        self.lo - slack <= v && v <= self.hi + slack
    }

    /// True for a single value `A` rather than `A..B`.
    pub fn is_single(&self) -> bool {
        self.lo == self.hi
    }
}

/// Parse a range of lengths, `LO..HI`, `A` (a single value), `..HI` or `LO..`, each end a
/// length as [`crate::numbers::length::parse_length`] reads it (a bare number in mm, or `2in`, `0.05m`); the range is
/// in mm. Errors name `quantity`.
pub fn parse_length_range(text: &str, quantity: Quantity) -> Result<FloatRange> {
    let wanted = "wanted LO..HI or one length, in mm such as 40..80 or 75 (or with units: 1.5in..3in), \
                  above 0, LO ≤ HI";
    let bad = |why: String| Error::value(quantity, format!("{why}; {wanted}"));
    let num = |s: &str, default: f64| -> Result<f64> {
        if s.is_empty() {
            return Ok(default);
        }
        let length =
            Length::parse(s, Some(LengthUnit::Millimetre)).map_err(|why| bad(format!("\"{s}\" {why}")))?;
        Ok(length.mm_f64())
    };
    let (a, b) = split(text);
    if a.is_empty() && b.is_none_or(str::is_empty) {
        return Err(bad("empty range".into()));
    }
    let lo = num(a, 0.0)?;
    let hi = match b {
        Some(b) => num(b, f64::INFINITY)?,
        None => lo,
    };
    if lo > hi {
        return Err(bad(format!("\"{}\" is inverted (LO > HI)", text.trim())));
    }
    Ok(FloatRange { lo, hi })
}

/// Parse a signed range `LO..HI` of finite numbers (profile shift sums such as `-0.5..1`);
/// errors name `quantity` and its `unit`.
pub fn parse_signed_range(text: &str, quantity: Quantity, unit: &str) -> Result<(f64, f64)> {
    let bad = |why: String| {
        Error::value(quantity, format!("{why}; wanted LO..HI in {unit} with LO ≤ HI, e.g. -0.5..1"))
    };
    let (a, b) = split(text);
    let b = b.ok_or_else(|| bad(format!("\"{}\" is not a range", text.trim())))?;
    let num = |s: &str| -> Result<f64> {
        s.parse::<f64>()
            .ok()
            .filter(|v| v.is_finite())
            .ok_or_else(|| bad(format!("\"{s}\" is not a finite number")))
    };
    let (lo, hi) = (num(a)?, num(b)?);
    if lo > hi {
        return Err(bad(format!("\"{}\" is inverted (LO > HI)", text.trim())));
    }
    Ok((lo, hi))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn int_ranges() {
        let r = |s| parse_int_range(s, Quantity::ToothRange, "teeth", 3, 1000);
        assert_eq!(r("12..150").unwrap(), IntRange { lo: 12, hi: 150 });
        assert_eq!(r("40").unwrap(), IntRange { lo: 40, hi: 40 });
        assert_eq!(r("..20").unwrap(), IntRange { lo: 3, hi: 20 });
        assert_eq!(r("900..").unwrap(), IntRange { lo: 900, hi: 1000 });
        assert_eq!(r("12..=15").unwrap(), IntRange { lo: 12, hi: 15 });
        for bad in ["", "..", "150..12", "2..10", "12..1000000000", "a..b", "-5..10", "1.5..3"] {
            let e = r(bad).unwrap_err().to_string();
            assert!(e.starts_with("the tooth range: "), "{bad}: {e}");
        }
    }

    #[test]
    fn errors_name_the_quantity_and_the_value() {
        let e = parse_int_range("50..20", Quantity::DriverTeeth, "teeth", 3, 1000).unwrap_err().to_string();
        assert_eq!(e, "the driver teeth: \"50..20\" is inverted (LO > HI); wanted teeth as N or LO..HI with 3 ≤ LO ≤ HI ≤ 1000");
        let e = parse_ratio_range("6..x", Quantity::StageRatio).unwrap_err().to_string();
        assert!(e.starts_with("the stage ratio: \"x\" is not a number"), "{e}");
        let e = parse_length_range("9..3", Quantity::CentreDistance).unwrap_err().to_string();
        assert!(e.starts_with("the centre distance: \"9..3\" is inverted"), "{e}");
        let e = parse_signed_range("a..1", Quantity::ShiftSum, "modules").unwrap_err().to_string();
        assert!(e.starts_with("the profile shift sum: \"a\" is not a finite number"), "{e}");
    }

    #[test]
    fn ratio_ranges() {
        let r = parse_ratio_range("1/6..6", Quantity::StageRatio).unwrap();
        assert!(r.contains(6, 1) && r.contains(1, 6) && !r.contains(13, 2));
        let open = parse_ratio_range("..6", Quantity::StageRatio).unwrap();
        assert!(open.contains(1, 1000) && !open.contains(61, 10));
        assert!(parse_ratio_range("6..1", Quantity::StageRatio).is_err());
        assert!(parse_ratio_range("..", Quantity::StageRatio).is_err());
    }

    #[test]
    fn signed_ranges() {
        assert_eq!(parse_signed_range("-0.5..1", Quantity::ShiftSum, "modules").unwrap(), (-0.5, 1.0));
        for bad in ["", "1", "1..-1", "a..1", "-inf..1", "..1"] {
            assert!(parse_signed_range(bad, Quantity::ShiftSum, "modules").is_err(), "{bad}");
        }
    }

    #[test]
    fn length_ranges() {
        let r = parse_length_range("40..80.5", Quantity::CentreDistance).unwrap();
        assert!(r.contains(80.5, 0.0) && !r.contains(80.6, 0.0));
        assert!(parse_length_range("62.5", Quantity::CentreDistance).unwrap().is_single());
        let inch = parse_length_range("1in..0.1m", Quantity::CentreDistance).unwrap();
        assert_eq!((inch.lo, inch.hi), (25.4, 100.0));
        for bad in ["", "nan", "inf", "-3..4", "0", "9..3", "3ft..4"] {
            assert!(parse_length_range(bad, Quantity::CentreDistance).is_err(), "{bad}");
        }
    }
}
