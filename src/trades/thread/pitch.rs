//! Pitches and leadscrews as typed: `8tpi`, a length (`3mm`, `1.25mm`, `0.003in`, read by
//! [`crate::numbers::length`]), `module:2` (a module worm, axial pitch π·m) and `dp:16` (a
//! diametral-pitch worm, axial pitch π/P inch). Every value is held in millimetres as an exact
//! rational where it can be (1 in = 25.4 mm = 127/5 mm exactly); values that carry π use
//! [`crate::numbers::target::PI`] and are marked inexact. Owns the syntax and the units a pitch
//! is shown in; knows nothing of gears.

use std::fmt;

use crate::error::{Error, Quantity, Result};
use crate::numbers::exact::Exact;
pub use crate::numbers::length::MM_PER_INCH;
use crate::numbers::length::{Length, LengthUnit};
use crate::numbers::rational::Ratio;
use crate::numbers::target::{parse_number, PI};

/// How a pitch was given, which decides the unit it is shown in.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PitchKind {
    /// Millimetres between threads (`1.25mm`, or another metric length such as `0.00125m`).
    Metric,
    /// Threads per inch (`11tpi`).
    Inch,
    /// Inches between threads, or a feed in inches per turn (`0.003in`).
    InchLength,
    /// A module worm: axial pitch π·m mm (`module:2`).
    Module,
    /// A diametral-pitch worm: axial pitch π/P inch (`dp:16`).
    Diametral,
}

impl PitchKind {
    /// True for pitches counted in inches (shown as TPI or inch, lead error in inch per inch).
    pub fn is_inch(self) -> bool {
        matches!(self, PitchKind::Inch | PitchKind::InchLength | PitchKind::Diametral)
    }
}

/// A thread pitch or a leadscrew pitch.
#[derive(Debug, Clone, PartialEq)]
pub struct Pitch {
    /// As typed, trimmed, e.g. `11tpi`.
    pub text: String,
    /// How it was given.
    pub kind: PitchKind,
    /// The number given: mm, threads per inch, inches, module or diametral pitch.
    pub given: Ratio,
    /// Axial pitch in mm (exact unless it carries π).
    pub mm: Exact,
}

impl fmt::Display for Pitch {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.text)
    }
}

const WANTED: &str = "wanted a pitch such as 1.25mm, 11tpi, 0.05in, module:2 or dp:16";

/// Parse a thread pitch; errors name [`Quantity::ThreadPitch`].
pub fn parse_pitch(text: &str) -> Result<Pitch> {
    let t = text.trim();
    let lower = t.to_ascii_lowercase();
    let bad = |why: String| Error::value(Quantity::ThreadPitch, format!("\"{t}\" {why}; {WANTED}"));
    let counted = if let Some(n) = lower.strip_prefix("module:") {
        Some((PitchKind::Module, n))
    } else if let Some(n) = lower.strip_prefix("dp:") {
        Some((PitchKind::Diametral, n))
    } else {
        lower.strip_suffix("tpi").map(|n| (PitchKind::Inch, n))
    };
    let Some((kind, number)) = counted else {
        // A length between threads, in any unit a length takes; a unit must be written.
        let length = Length::parse(t, None).map_err(bad)?;
        let kind = match length.unit {
            LengthUnit::Inch => PitchKind::InchLength,
            LengthUnit::Millimetre | LengthUnit::Metre => PitchKind::Metric,
        };
        let given = if kind == PitchKind::Metric { length.mm } else { length.given };
        return Ok(Pitch { text: t.to_string(), kind, given, mm: Exact::of(length.mm) });
    };
    let given = parse_number(number).map_err(bad)?;
    if given.is_zero() {
        return Err(bad("is zero".into()));
    }
    let g = Exact::of(given);
    let inch = Exact::of(MM_PER_INCH);
    let pi = Exact { value: PI, exact: false };
    let mm = match kind {
        PitchKind::Inch => inch.over(g),
        PitchKind::Module => pi.times(g),
        _ => pi.times(inch).over(g),
    };
    Ok(Pitch { text: t.to_string(), kind, given, mm })
}

/// Parse a leadscrew pitch: threads per inch or mm only (a leadscrew is not a worm). Errors
/// name [`Quantity::Leadscrew`].
pub fn parse_leadscrew(text: &str) -> Result<Pitch> {
    let p = parse_pitch(text).map_err(|_| {
        Error::value(
            Quantity::Leadscrew,
            format!(
                "\"{}\" is not a leadscrew pitch; wanted threads per inch such as 8tpi or a \
                 pitch such as 3mm or 0.25in",
                text.trim()
            ),
        )
    })?;
    match p.kind {
        PitchKind::Metric | PitchKind::Inch | PitchKind::InchLength => Ok(p),
        _ => Err(Error::value(
            Quantity::Leadscrew,
            format!(
                "\"{}\" is a worm; a leadscrew is given in threads per inch (8tpi) or as a pitch \
                 (3mm, 0.25in)",
                p.text
            ),
        )),
    }
}

impl Pitch {
    /// A length in mm expressed in this pitch's own terms: mm for metric and module pitches,
    /// threads per inch for inch threads, inches for diametral-pitch worms.
    pub fn in_own_unit(&self, mm: f64) -> f64 {
        match self.kind {
            PitchKind::Metric | PitchKind::Module => mm,
            PitchKind::Inch => 25.4 / mm,
            PitchKind::InchLength | PitchKind::Diametral => mm / 25.4,
        }
    }

    /// The unit of [`Pitch::in_own_unit`].
    pub fn own_unit(&self) -> &'static str {
        match self.kind {
            PitchKind::Metric | PitchKind::Module => "mm",
            PitchKind::Inch => "tpi",
            PitchKind::InchLength | PitchKind::Diametral => "in",
        }
    }

    /// A length in mm written in this pitch's own terms, e.g. `1.2500 mm` or `11.000 tpi`.
    pub fn show(&self, mm: f64) -> String {
        let v = self.in_own_unit(mm);
        match self.kind {
            PitchKind::Inch => format!("{v:.3} tpi"),
            PitchKind::InchLength | PitchKind::Diametral => format!("{v:.5} in"),
            _ => format!("{v:.4} mm"),
        }
    }

    /// The length over which lead error is stated, and its name: 100 mm for metric and module
    /// pitches, 1 inch for inch ones.
    pub fn lead_error_basis(&self) -> (f64, &'static str) {
        if self.kind.is_inch() {
            (1.0, "in per in")
        } else {
            (100.0, "mm per 100 mm")
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn mm(s: &str) -> String {
        parse_pitch(s).unwrap().mm.value.to_string()
    }

    #[test]
    fn inch_is_exactly_25_4_mm() {
        // 1 in = 25.4 mm exactly (international yard and pound agreement, 1959; Wikipedia,
        // "Inch", section "Modern standardisation").
        assert_eq!(mm("1tpi"), "127/5");
        assert_eq!(mm("25.4mm"), "127/5");
        assert!(parse_pitch("1tpi").unwrap().mm.exact);
    }

    #[test]
    fn forms_are_exact_where_they_can_be() {
        assert_eq!(mm("3mm"), "3");
        assert_eq!(mm("1.25mm"), "5/4");
        assert_eq!(mm("8tpi"), "127/40");
        assert_eq!(mm("11TPI"), "127/55");
        assert_eq!(mm("2.3tpi"), "254/23");
        assert_eq!(mm("9/2tpi"), "254/45");
        assert_eq!(mm("1.25e0mm"), "5/4");
        assert_eq!(mm("0.00125m"), "5/4");
    }

    #[test]
    fn inch_pitches_and_feeds_are_lengths() {
        let p = parse_pitch("0.003in").unwrap();
        assert_eq!(p.kind, PitchKind::InchLength);
        assert!(p.mm.exact);
        assert_eq!(p.mm.value.to_string(), "381/5000");
        assert_eq!(p.given.to_string(), "3/1000");
        assert_eq!(p.show(p.mm.value.to_f64()), "0.00300 in");
        assert_eq!(p.lead_error_basis().1, "in per in");
        // A quarter-inch pitch is four threads per inch, exactly.
        assert_eq!(parse_pitch("0.25in").unwrap().mm.value, parse_pitch("4tpi").unwrap().mm.value);
        assert!(parse_leadscrew("0.25in").is_ok());
    }

    #[test]
    fn worms_carry_pi() {
        // Common practice: a module worm's axial pitch is π·m; a DP worm's is π/P inch.
        let m = parse_pitch("module:2").unwrap();
        assert_eq!(m.kind, PitchKind::Module);
        assert!(!m.mm.exact);
        assert!((m.mm.value.to_f64() - 2.0 * std::f64::consts::PI).abs() < 1e-12);
        let d = parse_pitch("dp:16").unwrap();
        assert!((d.mm.value.to_f64() - std::f64::consts::PI * 25.4 / 16.0).abs() < 1e-12);
        assert_eq!(d.own_unit(), "in");
    }

    #[test]
    fn bad_pitches_name_the_quantity() {
        for bad in ["", "3", "mm", "0mm", "-2mm", "pimm", "abc", "module:", "dp:x", "1.2.3tpi"] {
            let e = parse_pitch(bad).unwrap_err().to_string();
            assert!(e.starts_with("the thread pitch: "), "{bad}: {e}");
        }
        let e = parse_leadscrew("module:2").unwrap_err().to_string();
        assert!(e.starts_with("the leadscrew pitch: "), "{e}");
        assert!(parse_leadscrew("6tpi").is_ok());
        let e = parse_pitch("3").unwrap_err().to_string();
        assert_eq!(
            e,
            "the thread pitch: \"3\" has no unit; wanted a pitch such as 1.25mm, 11tpi, 0.05in, module:2 or \
             dp:16"
        );
        let e = parse_leadscrew("module:2").unwrap_err().to_string();
        assert_eq!(
            e,
            "the leadscrew pitch: \"module:2\" is a worm; a leadscrew is given in threads per inch (8tpi) or \
             as a pitch (3mm, 0.25in)"
        );
    }

    #[test]
    fn shown_in_their_own_units() {
        let p = parse_pitch("11tpi").unwrap();
        assert_eq!(p.show(25.4 / 11.0), "11.000 tpi");
        let p = parse_pitch("1.25mm").unwrap();
        assert_eq!(p.show(1.25), "1.2500 mm");
        assert_eq!(p.lead_error_basis().1, "mm per 100 mm");
    }
}
