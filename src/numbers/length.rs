//! Lengths as typed, with or without a unit: `52.5`, `52.5mm`, `0.994m`, `14.25in`. Every value
//! is held exactly in millimetres (1 in = 25.4 mm = 127/5 mm exactly; international inch,
//! 1959), so a length given in inches loses nothing. Owns the length syntax and the check that a
//! length is positive; the limits of each quantity (a pendulum of at most 100 m) are its
//! owner's.

use crate::error::{Error, Quantity, Result};
use crate::numbers::exact::Exact;
use crate::numbers::rational::Ratio;
use crate::numbers::target::parse_number;

/// A unit a length may be given in.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum LengthUnit {
    /// Millimetres, `mm`.
    Millimetre,
    /// Metres, `m`.
    Metre,
    /// Inches, `in` (25.4 mm exactly).
    Inch,
}

impl LengthUnit {
    /// The unit as written after a number.
    pub fn symbol(self) -> &'static str {
        match self {
            LengthUnit::Millimetre => "mm",
            LengthUnit::Metre => "m",
            LengthUnit::Inch => "in",
        }
    }

    /// Millimetres in one of the unit, exactly.
    pub fn in_mm(self) -> Ratio {
        match self {
            LengthUnit::Millimetre => Ratio::integer(1),
            LengthUnit::Metre => Ratio::integer(1000),
            LengthUnit::Inch => MM_PER_INCH,
        }
    }

    /// Examples of a length in this unit, bare and with units, for the "wanted" of a message.
    fn examples(self) -> &'static str {
        match self {
            LengthUnit::Millimetre => "52.5, or with a unit: 52.5mm, 0.0525m or 2.067in",
            LengthUnit::Metre => "0.994, or with a unit: 994mm, 0.994m or 39.13in",
            LengthUnit::Inch => "2.067, or with a unit: 52.5mm, 0.0525m or 2.067in",
        }
    }
}

/// Millimetres in one inch, exactly (international inch, 1959): 25.4 = 127/5.
pub const MM_PER_INCH: Ratio = match Ratio::from_parts(127, 5) {
    Some(r) => r,
    None => panic!("127/5 is reduced"),
};

/// A positive length.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Length {
    /// The length in millimetres, exactly.
    pub mm: Ratio,
    /// The unit it was given in (the default unit when none was written).
    pub unit: LengthUnit,
    /// The number as given, in `unit`.
    pub given: Ratio,
}

impl Length {
    /// Read a length; `default` is the unit of a bare number, `None` when a unit must be
    /// written. `Err` says what is wrong, in words that follow the quoted text.
    pub fn parse(text: &str, default: Option<LengthUnit>) -> std::result::Result<Length, String> {
        let t = text.trim();
        let lower = t.to_ascii_lowercase();
        let (number, unit) = if let Some(n) = lower.strip_suffix("mm") {
            (n, LengthUnit::Millimetre)
        } else if let Some(n) = lower.strip_suffix("in") {
            (n, LengthUnit::Inch)
        } else if let Some(n) = lower.strip_suffix('m') {
            (n, LengthUnit::Metre)
        } else {
            match default {
                Some(unit) => (lower.as_str(), unit),
                None => return Err(unknown_unit(t).unwrap_or_else(|| "has no unit".into())),
            }
        };
        let given = parse_number(number).map_err(|why| unknown_unit(t).unwrap_or(why))?;
        if given.is_zero() {
            return Err("is zero".into());
        }
        let mm = Exact::of(given).times(Exact::of(unit.in_mm()));
        if !mm.exact {
            return Err("has too many digits to hold exactly".into());
        }
        Ok(Length { mm: mm.value, unit, given })
    }

    /// The length in millimetres as a float, for geometry.
    pub fn mm_f64(&self) -> f64 {
        self.mm.to_f64()
    }
}

/// "has an unknown unit \"ft\"" when `text` is a number followed by letters that are no unit this
/// reader knows (those it knows were stripped before the number was read).
pub(crate) fn unknown_unit(text: &str) -> Option<String> {
    let number = text.trim_end_matches(|c: char| c.is_alphabetic());
    let unit = &text[number.len()..];
    (!unit.is_empty() && parse_number(number).is_ok()).then(|| format!("has an unknown unit \"{unit}\""))
}

/// Parse a positive length; a bare number is in `default` (`None`: a unit must be written).
/// Errors name `quantity` and say which units are accepted.
pub fn parse_length(text: &str, quantity: Quantity, default: Option<LengthUnit>) -> Result<Length> {
    Length::parse(text, default).map_err(|why| {
        let wanted = match default {
            Some(unit) => format!("wanted a length above 0 in {} such as {}", unit.symbol(), unit.examples()),
            None => {
                "wanted a length above 0 with its unit, mm, m or in, such as 1.25mm or 0.05in".to_string()
            }
        };
        Error::value(quantity, format!("\"{}\" {why}; {wanted}", text.trim()))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn mm(s: &str, default: Option<LengthUnit>) -> String {
        Length::parse(s, default).unwrap().mm.to_string()
    }

    #[test]
    fn units_are_exact() {
        // 1 in = 25.4 mm exactly (international yard and pound agreement, 1959).
        assert_eq!(mm("1in", None), "127/5");
        assert_eq!(mm("14.25in", None), "7239/20");
        assert_eq!(mm("994mm", Some(LengthUnit::Metre)), "994");
        assert_eq!(mm("0.994", Some(LengthUnit::Metre)), "994");
        assert_eq!(mm("0.994 m", None), "994");
        assert_eq!(mm("52.5", Some(LengthUnit::Millimetre)), "105/2");
        assert_eq!(mm("1e-3M", None), "1");
        assert_eq!(mm("1/2in", None), "127/10");
        let l = Length::parse("0.003in", None).unwrap();
        assert_eq!((l.unit, l.given.to_string()), (LengthUnit::Inch, "3/1000".to_string()));
    }

    #[test]
    fn floats_match_the_decimal_typed() {
        for (text, want) in [("52.5", 52.5), ("75", 75.0), ("0.1", 0.1), ("123.456", 123.456)] {
            assert_eq!(Length::parse(text, Some(LengthUnit::Millimetre)).unwrap().mm_f64(), want, "{text}");
        }
    }

    #[test]
    fn bad_lengths_say_what_is_wanted() {
        let e = parse_length("3", Quantity::ThreadPitch, None).unwrap_err().to_string();
        assert_eq!(
            e,
            "the thread pitch: \"3\" has no unit; wanted a length above 0 with its unit, mm, m or in, \
             such as 1.25mm or 0.05in"
        );
        let e =
            parse_length("0mm", Quantity::PendulumLength, Some(LengthUnit::Metre)).unwrap_err().to_string();
        assert_eq!(
            e,
            "the pendulum length: \"0mm\" is zero; wanted a length above 0 in m such as 0.994, or with a \
             unit: 994mm, 0.994m or 39.13in"
        );
        let e = parse_length("3ft", Quantity::CentreDistance, Some(LengthUnit::Millimetre)).unwrap_err();
        assert!(
            e.to_string().starts_with("the centre distance: \"3ft\" has an unknown unit \"ft\"; wanted "),
            "{e}"
        );
        assert_eq!(Length::parse("3ft", None).unwrap_err(), "has an unknown unit \"ft\"");
        assert_eq!(Length::parse("1e3", None).unwrap_err(), "has no unit");
        for bad in ["", "mm", "-2mm", "abc", "2min", "1.2.3in", "pi mm", "nan", "3ft"] {
            let e = parse_length(bad, Quantity::CentreDistance, Some(LengthUnit::Millimetre)).unwrap_err();
            assert!(e.to_string().starts_with("the centre distance: "), "{bad}: {e}");
        }
    }
}
