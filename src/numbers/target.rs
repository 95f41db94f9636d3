//! The target of a search: the ratio the user asked for and the tolerance around it, parsed from
//! text into exact rationals. Owns the ratio and tolerance syntax; knows nothing of gears.
//!
//! One number syntax serves every quantity ([`parse_number`]): a decimal (`1.0583`), in
//! scientific notation (`1e3`, `2.5e-1`) or a fraction (`127/120`), held exactly. Ratio syntax
//! adds a ratio of two numbers (`37.5:1`) and `pi`. Tolerance syntax: a number (`0.0001`,
//! `1e-4`), a percentage (`0.01%`), parts per million (`50ppm`) or per billion (`20ppb`).

use crate::error::{Error, Quantity, Result};
use crate::numbers::rational::Ratio;

/// π held as its continued-fraction convergent 2646693125139304345/842468587426513207, the last
/// whose parts fit in 63 bits; it differs from π by 4.5·10⁻³⁹ relative, far below any tolerance
/// a gear train can be asked to meet.
pub const PI: Ratio = match Ratio::from_parts(2646693125139304345, 842468587426513207) {
    Some(r) => r,
    None => panic!("the π convergent is reduced"),
};

/// Largest decimal exponent accepted in a number such as `1e-12`.
const MAX_EXPONENT: u32 = 30;

/// A required ratio and tolerance.
#[derive(Debug, Clone, PartialEq)]
pub struct Target {
    /// The ratio as the user typed it, e.g. `37.5:1`.
    pub text: String,
    /// The ratio, exactly (`75/2`). Always positive.
    pub ratio: Ratio,
    /// Relative tolerance `T`: a train is within it when `|i/R − 1| ≤ T`. `0 ≤ T < 1`.
    pub tolerance: Ratio,
}

impl Target {
    /// Parse a ratio and a tolerance; errors name [`Quantity::TargetRatio`] or
    /// [`Quantity::Tolerance`].
    pub fn parse(ratio: &str, tol: &str) -> Result<Target> {
        Ok(Target {
            text: ratio.trim().to_string(),
            ratio: parse_ratio(ratio, Quantity::TargetRatio)?,
            tolerance: parse_tolerance(tol)?,
        })
    }

    /// Build from an exact ratio (for the trade workflows that compute their own ratio).
    pub fn exact(text: impl Into<String>, ratio: Ratio, tolerance: Ratio) -> Target {
        Target { text: text.into(), ratio, tolerance }
    }
}

/// What a ratio error says is wanted.
const RATIO_WANTED: &str = "wanted a positive number such as 12, 1.0583, 2.5e-1, 127/120, 37.5:1 or pi";

/// Parse a positive ratio in any of the accepted forms; errors name `quantity`, the ratio being
/// whatever the caller needs (a target, a stud ratio, a speed). Each number takes the same
/// syntax as a tolerance: `1e3` is 1000 and `2.5e-1` is 1/4, exactly.
pub fn parse_ratio(text: &str, quantity: Quantity) -> Result<Ratio> {
    let t = text.trim();
    if t.is_empty() {
        return Err(Error::value(quantity, format!("empty ratio; {RATIO_WANTED}")));
    }
    if t.eq_ignore_ascii_case("pi") || t == "π" {
        return Ok(PI);
    }
    let bad = |why: &str| Error::value(quantity, format!("\"{t}\" {why}; {RATIO_WANTED}"));
    let value = match t.split_once(':') {
        Some((a, b)) => quotient(a, b, ':'),
        None => parse_number(t),
    }
    .map_err(|why| bad(&why))?;
    if value.is_zero() {
        return Err(bad("is zero: a train cannot stop its output"));
    }
    Ok(value)
}

/// An exact number of zero or more as typed for any quantity: a decimal (`1.25`, `.5`), in
/// scientific notation (`1e3`, `2.5e-1`) or a fraction of two such (`9/2`). `Err` says what is
/// wrong, in words that follow the quoted text ("is not a number"); the caller names the
/// quantity and says what it wants.
pub fn parse_number(text: &str) -> std::result::Result<Ratio, String> {
    match text.split_once('/') {
        Some((a, b)) => quotient(a, b, '/'),
        None => {
            let (num, den) = parse_decimal(text.trim()).map_err(str::to_string)?;
            Ratio::new(num, den).ok_or_else(|| "has too many digits to hold exactly".to_string())
        }
    }
}

/// `a / b` of two decimals, exactly; `sep` is how the user wrote the division.
fn quotient(a: &str, b: &str, sep: char) -> std::result::Result<Ratio, String> {
    let a = parse_decimal(a.trim()).map_err(str::to_string)?;
    let b = parse_decimal(b.trim()).map_err(str::to_string)?;
    if b.0 == 0 {
        return Err(format!("divides by zero after '{sep}'"));
    }
    let too_many = || "has too many digits to hold exactly".to_string();
    let num = a.0.checked_mul(b.1).ok_or_else(too_many)?;
    let den = a.1.checked_mul(b.0).ok_or_else(too_many)?;
    Ratio::new(num, den).ok_or_else(too_many)
}

/// Parse a relative tolerance; the result is in `[0, 1)`. Errors name [`Quantity::Tolerance`].
pub fn parse_tolerance(text: &str) -> Result<Ratio> {
    let t = text.trim();
    let wanted = "wanted a tolerance such as 0, 1e-4, 0.01% or 50ppm, below 100%";
    let bad = |why: &str| Error::value(Quantity::Tolerance, format!("\"{t}\" {why}; {wanted}"));
    if t.is_empty() {
        return Err(bad("is empty"));
    }
    let lower = t.to_ascii_lowercase();
    let (number, scale): (&str, u128) = if let Some(n) = lower.strip_suffix("ppm") {
        (n, 1_000_000)
    } else if let Some(n) = lower.strip_suffix("ppb") {
        (n, 1_000_000_000)
    } else if let Some(n) = lower.strip_suffix('%') {
        (n, 100)
    } else {
        (lower.as_str(), 1)
    };
    let (num, den) = parse_decimal(number.trim()).map_err(&bad)?;
    let den = den.checked_mul(scale).ok_or_else(|| bad("has too many digits to hold exactly"))?;
    if num >= den {
        return Err(bad("is 100% or more: every ratio would pass"));
    }
    Ratio::new(num, den).ok_or_else(|| bad("has too many digits to hold exactly"))
}

/// An unsigned decimal `123`, `1.25` or `.5`, optionally with a decimal exponent (`1e3`,
/// `2.5E-1`, at most 30 either way), as an unreduced `(num, den)`: the one number syntax every
/// ratio, tolerance, length and period shares.
fn parse_decimal(s: &str) -> std::result::Result<(u128, u128), &'static str> {
    if s.is_empty() {
        return Err("has an empty number");
    }
    if s.starts_with('-') {
        return Err("is negative");
    }
    let (mantissa, exponent) = s.split_once(['e', 'E']).map_or((s, None), |(m, e)| (m, Some(e)));
    let (int, frac) = mantissa.split_once('.').unwrap_or((mantissa, ""));
    if int.is_empty() && frac.is_empty() {
        return Err("is not a number");
    }
    if !int.bytes().chain(frac.bytes()).all(|b| b.is_ascii_digit()) {
        return Err("is not a number");
    }
    let exponent: i32 = match exponent {
        None => 0,
        Some(e) => {
            let digits = e.strip_prefix(['+', '-']).unwrap_or(e);
            if !digits.bytes().all(|b| b.is_ascii_digit()) {
                return Err("is not a number");
            }
            if digits.is_empty() {
                return Err("has an unreadable exponent");
            }
            match e.parse::<i32>() {
                Ok(e) if e.unsigned_abs() <= MAX_EXPONENT => e,
                _ => return Err("has an exponent out of range"),
            }
        }
    };
    if int.len() + frac.len() > 36 {
        return Err("has too many digits to hold exactly");
    }
    let digits: u128 = format!("{int}{frac}").parse().map_err(|_| "is not a number")?;
    let (mut num, mut den) = (digits, 10u128.pow(frac.len() as u32));
    let pow = 10u128.pow(exponent.unsigned_abs());
    let scaled = if exponent >= 0 { num.checked_mul(pow) } else { den.checked_mul(pow) };
    let scaled = scaled.ok_or("has too many digits to hold exactly")?;
    if exponent >= 0 {
        num = scaled;
    } else {
        den = scaled;
    }
    Ok((num, den))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn r(s: &str) -> String {
        parse_ratio(s, Quantity::TargetRatio).unwrap().to_string()
    }

    fn t(s: &str) -> String {
        parse_tolerance(s).unwrap().to_string()
    }

    #[test]
    fn ratio_forms_are_exact() {
        assert_eq!(r("12"), "12");
        assert_eq!(r("1.0583"), "10583/10000");
        assert_eq!(r("127/120"), "127/120");
        assert_eq!(r("37.5:1"), "75/2");
        assert_eq!(r(" 2.5 : 0.5 "), "5");
        assert_eq!(r(".5"), "1/2");
        assert_eq!(r("29.530588"), "7382647/250000");
        assert_eq!(r("PI"), PI.to_string());
    }

    #[test]
    fn ratios_take_the_number_syntax_of_tolerances() {
        assert_eq!(r("1e3"), "1000");
        assert_eq!(r("2.5e-1"), "1/4");
        assert_eq!(r("1E3"), "1000");
        assert_eq!(r("1.5e+2:3"), "50");
        assert_eq!(r("1e3/7"), "1000/7");
        // The same text, read as a tolerance, is the same number.
        assert_eq!(t("2.5e-1"), r("2.5e-1"));
        let e = parse_ratio("1e3x", Quantity::TargetRatio).unwrap_err().to_string();
        assert!(e.starts_with("the target ratio: \"1e3x\" is not a number"), "{e}");
        let e = parse_ratio("1e31", Quantity::TargetRatio).unwrap_err().to_string();
        assert!(e.starts_with("the target ratio: \"1e31\" has an exponent out of range"), "{e}");
        assert_eq!(parse_number("0").unwrap(), Ratio::integer(0));
        assert_eq!(parse_number("9/2").unwrap().to_string(), "9/2");
        assert_eq!(parse_number("pi").unwrap_err(), "is not a number");
    }

    #[test]
    fn pi_is_a_convergent_of_pi() {
        // Convergents of π: 355/113 (OEIS A002485/A002486); ours must agree to f64 precision.
        assert!((PI.to_f64() - std::f64::consts::PI).abs() < 1e-15);
    }

    #[test]
    fn bad_ratios_name_the_quantity() {
        for bad in ["", "0", "0/5", "-3", "1/0", "abc", "1.2.3", "nan", "inf", "3:", "1e", "1e-99", "5/-2"] {
            let e = parse_ratio(bad, Quantity::TargetRatio).unwrap_err().to_string();
            assert!(e.starts_with("the target ratio: "), "{bad}: {e}");
        }
        let e = parse_ratio("1/0", Quantity::TargetRatio).unwrap_err().to_string();
        assert!(e.contains("divides by zero"), "{e}");
    }

    #[test]
    fn errors_name_the_quantity_and_the_value_never_a_flag() {
        let e = parse_ratio("1e3x", Quantity::TargetRatio).unwrap_err();
        assert_eq!(
            e.to_string(),
            "the target ratio: \"1e3x\" is not a number; wanted a positive number such as 12, 1.0583, \
             2.5e-1, 127/120, 37.5:1 or pi"
        );
        assert!(matches!(e, Error::Value { quantity: Quantity::TargetRatio, .. }));
        let e = parse_ratio("0", Quantity::StudRatio).unwrap_err().to_string();
        assert!(e.starts_with("the stud ratio: \"0\" is zero"), "{e}");
        let e = parse_tolerance("lots").unwrap_err().to_string();
        assert!(e.starts_with("the tolerance: \"lots\" "), "{e}");
        let e = Target::parse("2", "150%").unwrap_err().to_string();
        assert!(e.starts_with("the tolerance: \"150%\" is 100% or more"), "{e}");
        assert!(!e.contains("--"), "{e}");
    }

    #[test]
    fn tolerance_forms_are_exact() {
        assert_eq!(t("0"), "0");
        assert_eq!(t("1e-4"), "1/10000");
        assert_eq!(t("0.0001"), "1/10000");
        assert_eq!(t("0.01%"), "1/10000");
        assert_eq!(t("50ppm"), "1/20000");
        assert_eq!(t("50 ppm"), "1/20000");
        assert_eq!(t("20ppb"), "1/50000000");
        assert_eq!(t("2.5E-3"), "1/400");
        assert_eq!(t("99.9%"), "999/1000");
    }

    #[test]
    fn bad_tolerances_are_refused() {
        for bad in ["", "-1e-4", "100%", "1", "150%", "nan", "inf", "x", "1e-99", "5ppmx", "1e"] {
            let e = parse_tolerance(bad).unwrap_err().to_string();
            assert!(e.starts_with("the tolerance: "), "{bad}: {e}");
        }
    }
}
