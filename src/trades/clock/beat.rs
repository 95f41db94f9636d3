//! The beat of a clock and the escape arbor's speed. Owns the pendulum arithmetic (length,
//! period, beats per hour) and the escapement convention; knows nothing of wheels.
//!
//! Conventions, stated because clockmakers count both ways: the *period* is a full swing there
//! and back; a *beat* is one swing (half a period), the tick heard; an escape wheel tooth lets
//! through `beats_per_tooth` beats (two with an anchor or dead-beat escapement, one pallet
//! each — common practice).

use crate::error::{Error, Quantity, Result};
use crate::numbers::exact::Exact;
use crate::numbers::rational::Ratio;
use crate::numbers::target::parse_number;

/// Standard gravity, m/s² (the conventional value 9.80665 — from memory).
pub const STANDARD_GRAVITY: f64 = 9.80665;

/// Gravity accepted, m/s²: from the Moon's (about 1.6) to Jupiter's (about 25) with room to
/// spare, so a slip of the decimal point (98.0665, 0.980665) is caught rather than believed.
pub const GRAVITY_RANGE: (f64, f64) = (1.0, 30.0);

/// Longest simple pendulum accepted, m.
pub const MAX_PENDULUM_M: f64 = 100.0;

/// Check a gravity, m/s²; errors name [`Quantity::Gravity`] and give the accepted range.
pub fn check_gravity(gravity: f64) -> Result<f64> {
    let (lo, hi) = GRAVITY_RANGE;
    if gravity.is_finite() && (lo..=hi).contains(&gravity) {
        Ok(gravity)
    } else {
        Err(Error::value(
            Quantity::Gravity,
            format!("wanted m/s² from {lo} to {hi} ({STANDARD_GRAVITY} is standard), found {gravity}"),
        ))
    }
}

/// Parse a gravity in m/s², in the number syntax every quantity takes; errors name
/// [`Quantity::Gravity`].
pub fn parse_gravity(text: &str) -> Result<f64> {
    let t = text.trim();
    let g = parse_number(t).map_err(|why| {
        Error::value(Quantity::Gravity, format!("\"{t}\" {why}; wanted m/s² such as {STANDARD_GRAVITY}"))
    })?;
    check_gravity(g.to_f64())
}

/// Parse beats per hour, a positive number such as `3600`; errors name
/// [`Quantity::BeatsPerHour`].
pub fn parse_beats_per_hour(text: &str) -> Result<Ratio> {
    let t = text.trim();
    let bad = |why: &str| {
        Error::value(
            Quantity::BeatsPerHour,
            format!("\"{t}\" {why}; wanted beats per hour above 0 such as 3600"),
        )
    };
    let bph = parse_number(t).map_err(|why| bad(&why))?;
    if bph.is_zero() {
        return Err(bad("is zero"));
    }
    Ok(bph)
}

/// Parse beats per minute, a positive number such as `60`, as beats per hour (60 times as
/// many); errors name [`Quantity::BeatsPerMinute`].
pub fn parse_beats_per_minute(text: &str) -> Result<Ratio> {
    let t = text.trim();
    let bad = |why: &str| {
        Error::value(
            Quantity::BeatsPerMinute,
            format!("\"{t}\" {why}; wanted beats per minute above 0 such as 60"),
        )
    };
    let bpm = parse_number(t).map_err(|why| bad(&why))?;
    if bpm.is_zero() {
        return Err(bad("is zero"));
    }
    Ok(Exact::of(bpm).times(Exact::of(Ratio::integer(60))).value)
}

/// Where the beat came from, as given.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum BeatSource {
    /// A simple pendulum of this length, m (small swings), under the beat's gravity.
    Length {
        /// Length from the suspension to the centre of oscillation, m.
        metres: f64,
    },
    /// A full period (there and back), s, exactly as given.
    Period(Ratio),
    /// Beats per hour, exactly as given.
    BeatsPerHour(Ratio),
}

/// The clock's beat.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Beat {
    /// What was given.
    pub source: BeatSource,
    /// Beats per hour.
    pub beats_per_hour: f64,
    /// Beats per hour exactly, when the beat was given as a period or a beat count.
    pub exact_beats_per_hour: Option<Ratio>,
    /// The gravity the pendulum swings under, m/s²: what sets a length's period, and the
    /// simple pendulum a period or beat count stands for.
    pub gravity: f64,
}

impl Beat {
    /// The beat of a simple pendulum `metres` long under `gravity`: period `T = 2π·√(L/g)`.
    pub fn from_length(metres: f64, gravity: f64) -> Result<Beat> {
        if !(metres.is_finite() && metres > 0.0 && metres <= MAX_PENDULUM_M) {
            return Err(Error::value(
                Quantity::PendulumLength,
                format!("wanted a length in m above 0 and at most {MAX_PENDULUM_M}, found {metres}"),
            ));
        }
        let gravity = check_gravity(gravity)?;
        let period = 2.0 * std::f64::consts::PI * (metres / gravity).sqrt();
        Ok(Beat {
            source: BeatSource::Length { metres },
            beats_per_hour: 7200.0 / period,
            exact_beats_per_hour: None,
            gravity,
        })
    }

    /// The beat of a pendulum of full period `seconds`: 7200 / T beats per hour; `gravity`
    /// gives the simple pendulum it stands for.
    pub fn from_period(seconds: Ratio, gravity: f64) -> Result<Beat> {
        let bph = Exact::of(Ratio::integer(7200)).over(Exact::of(seconds));
        Ok(Beat {
            source: BeatSource::Period(seconds),
            beats_per_hour: bph.value.to_f64(),
            exact_beats_per_hour: bph.exact.then_some(bph.value),
            gravity: check_gravity(gravity)?,
        })
    }

    /// A beat given as beats per hour; `gravity` gives the simple pendulum it stands for.
    pub fn from_beats_per_hour(bph: Ratio, gravity: f64) -> Result<Beat> {
        Ok(Beat {
            source: BeatSource::BeatsPerHour(bph),
            beats_per_hour: bph.to_f64(),
            exact_beats_per_hour: Some(bph),
            gravity: check_gravity(gravity)?,
        })
    }

    /// Full period (there and back), s.
    pub fn period_s(&self) -> f64 {
        7200.0 / self.beats_per_hour
    }

    /// Length of the simple pendulum with this period under the beat's gravity, m:
    /// `g·(T/2π)²`.
    pub fn length_m(&self) -> f64 {
        let t = self.period_s() / (2.0 * std::f64::consts::PI);
        self.gravity * t * t
    }
}

/// The escape wheel and how many beats each tooth lets through.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Escapement {
    /// Escape wheel teeth.
    pub teeth: u32,
    /// Beats per tooth (two for an anchor or dead-beat escapement — common practice).
    pub beats_per_tooth: u32,
}

impl Escapement {
    /// Check the counts; errors name [`Quantity::EscapeTeeth`] or [`Quantity::BeatsPerTooth`].
    pub fn new(teeth: u32, beats_per_tooth: u32) -> Result<Escapement> {
        if !(3..=1000).contains(&teeth) {
            return Err(Error::value(
                Quantity::EscapeTeeth,
                format!("wanted a whole number of teeth from 3 to 1000, found {teeth}"),
            ));
        }
        if !(1..=4).contains(&beats_per_tooth) {
            return Err(Error::value(
                Quantity::BeatsPerTooth,
                format!("wanted 1 to 4 beats per tooth (2 for an anchor or dead-beat escapement), found {beats_per_tooth}"),
            ));
        }
        Ok(Escapement { teeth, beats_per_tooth })
    }

    /// Beats per escape arbor turn.
    pub fn beats_per_turn(&self) -> u32 {
        self.teeth * self.beats_per_tooth
    }

    /// Escape arbor turns per hour for `beat`.
    pub fn turns_per_hour(&self, beat: &Beat) -> f64 {
        beat.beats_per_hour / self.beats_per_turn() as f64
    }

    /// The same, exactly, when the beat is exact.
    pub fn exact_turns_per_hour(&self, beat: &Beat) -> Option<Ratio> {
        let bph = beat.exact_beats_per_hour?;
        let t = Exact::of(bph).over(Exact::of(Ratio::integer(self.beats_per_turn() as u64)));
        t.exact.then_some(t.value)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn seconds_pendulum_beats_once_a_second() {
        // Wikipedia, "Seconds pendulum": period exactly 2 s, length about 0.994 m at standard
        // gravity; computed g/π² = 0.99362 m.
        let b = Beat::from_period(Ratio::integer(2), STANDARD_GRAVITY).unwrap();
        assert_eq!(b.exact_beats_per_hour, Some(Ratio::integer(3600)));
        assert!((b.length_m() - 0.99362).abs() < 5e-6);
        assert!((b.length_m() - 0.994).abs() < 1e-3);
        let l = Beat::from_length(
            STANDARD_GRAVITY / (std::f64::consts::PI * std::f64::consts::PI),
            STANDARD_GRAVITY,
        )
        .unwrap();
        assert!((l.period_s() - 2.0).abs() < 1e-12);
        assert!(l.exact_beats_per_hour.is_none());
    }

    #[test]
    fn the_equivalent_length_follows_the_gravity_given() {
        // L = g·(T/2π)²: proportional to g for one period.
        let standard = Beat::from_period(Ratio::integer(2), STANDARD_GRAVITY).unwrap();
        let local = Beat::from_period(Ratio::integer(2), 9.81).unwrap();
        assert!((local.length_m() / standard.length_m() - 9.81 / STANDARD_GRAVITY).abs() < 1e-15);
        assert_eq!(local.gravity, 9.81);
        assert_eq!(Beat::from_beats_per_hour(Ratio::integer(3600), 9.81).unwrap().gravity, 9.81);
    }

    #[test]
    fn thirty_tooth_escape_wheel_turns_once_a_minute() {
        // Common practice: a seconds pendulum and a 30-tooth escape wheel, two beats per tooth,
        // turn the escape arbor once a minute (60 turns an hour).
        let e = Escapement::new(30, 2).unwrap();
        let b = Beat::from_period(Ratio::integer(2), STANDARD_GRAVITY).unwrap();
        assert_eq!(e.exact_turns_per_hour(&b), Some(Ratio::integer(60)));
        assert_eq!(e.turns_per_hour(&b), 60.0);
    }

    #[test]
    fn bad_values_name_their_quantity() {
        let e = Beat::from_length(-1.0, STANDARD_GRAVITY).unwrap_err().to_string();
        assert_eq!(e, "the pendulum length: wanted a length in m above 0 and at most 100, found -1");
        let e = Beat::from_period(Ratio::integer(2), 0.0).unwrap_err().to_string();
        assert_eq!(e, "the gravity: wanted m/s² from 1 to 30 (9.80665 is standard), found 0");
        assert!(Beat::from_length(1.0, 98.0665).unwrap_err().to_string().starts_with("the gravity: "));
        assert_eq!(parse_gravity("9.81").unwrap(), 9.81);
        let e = parse_gravity("-9.81").unwrap_err().to_string();
        assert_eq!(e, "the gravity: \"-9.81\" is negative; wanted m/s² such as 9.80665");
        let e = parse_beats_per_hour("0").unwrap_err().to_string();
        assert_eq!(e, "the beats per hour: \"0\" is zero; wanted beats per hour above 0 such as 3600");
        assert!(Escapement::new(2, 2).unwrap_err().to_string().starts_with("the escape wheel teeth: "));
        assert!(Escapement::new(30, 0).unwrap_err().to_string().starts_with("the beats per tooth: "));
    }
}
