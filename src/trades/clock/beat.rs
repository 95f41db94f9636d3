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

/// Standard gravity, m/s² (the conventional value 9.80665 — from memory).
pub const STANDARD_GRAVITY: f64 = 9.80665;

/// Where the beat came from, as given.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum BeatSource {
    /// A simple pendulum of this length, m, under this gravity, m/s² (small swings).
    Length {
        /// Length from the suspension to the centre of oscillation, m.
        metres: f64,
        /// Local gravity, m/s².
        gravity: f64,
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
}

impl Beat {
    /// The beat of a simple pendulum `metres` long: period `T = 2π·√(L/g)`.
    pub fn from_length(metres: f64, gravity: f64) -> Result<Beat> {
        if !(metres.is_finite() && metres > 0.0 && metres <= 100.0) {
            return Err(Error::value(
                Quantity::PendulumLength,
                format!("wanted a length in m above 0 and at most 100, found {metres}"),
            ));
        }
        if !(gravity.is_finite() && gravity > 0.0 && gravity <= 100.0) {
            return Err(Error::value(
                Quantity::Gravity,
                format!("wanted a positive gravity in m/s², found {gravity}"),
            ));
        }
        let period = 2.0 * std::f64::consts::PI * (metres / gravity).sqrt();
        Ok(Beat {
            source: BeatSource::Length { metres, gravity },
            beats_per_hour: 7200.0 / period,
            exact_beats_per_hour: None,
        })
    }

    /// The beat of a pendulum of full period `seconds`: 7200 / T beats per hour.
    pub fn from_period(seconds: Ratio) -> Beat {
        let bph = Exact::of(Ratio::integer(7200)).over(Exact::of(seconds));
        Beat {
            source: BeatSource::Period(seconds),
            beats_per_hour: bph.value.to_f64(),
            exact_beats_per_hour: bph.exact.then_some(bph.value),
        }
    }

    /// A beat given as beats per hour.
    pub fn from_beats_per_hour(bph: Ratio) -> Beat {
        Beat {
            source: BeatSource::BeatsPerHour(bph),
            beats_per_hour: bph.to_f64(),
            exact_beats_per_hour: Some(bph),
        }
    }

    /// Full period (there and back), s.
    pub fn period_s(&self) -> f64 {
        7200.0 / self.beats_per_hour
    }

    /// Length of the simple pendulum with this period under `gravity`, m: `g·(T/2π)²`.
    pub fn length_m(&self, gravity: f64) -> f64 {
        let t = self.period_s() / (2.0 * std::f64::consts::PI);
        gravity * t * t
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
        let b = Beat::from_period(Ratio::integer(2));
        assert_eq!(b.exact_beats_per_hour, Some(Ratio::integer(3600)));
        assert!((b.length_m(STANDARD_GRAVITY) - 0.99362).abs() < 5e-6);
        assert!((b.length_m(STANDARD_GRAVITY) - 0.994).abs() < 1e-3);
        let l = Beat::from_length(
            STANDARD_GRAVITY / (std::f64::consts::PI * std::f64::consts::PI),
            STANDARD_GRAVITY,
        )
        .unwrap();
        assert!((l.period_s() - 2.0).abs() < 1e-12);
        assert!(l.exact_beats_per_hour.is_none());
    }

    #[test]
    fn thirty_tooth_escape_wheel_turns_once_a_minute() {
        // Common practice: a seconds pendulum and a 30-tooth escape wheel, two beats per tooth,
        // turn the escape arbor once a minute (60 turns an hour).
        let e = Escapement::new(30, 2).unwrap();
        let b = Beat::from_period(Ratio::integer(2));
        assert_eq!(e.exact_turns_per_hour(&b), Some(Ratio::integer(60)));
        assert_eq!(e.turns_per_hour(&b), 60.0);
    }

    #[test]
    fn bad_values_name_their_quantity() {
        let e = Beat::from_length(-1.0, STANDARD_GRAVITY).unwrap_err().to_string();
        assert_eq!(e, "the pendulum length: wanted a length in m above 0 and at most 100, found -1");
        assert!(Beat::from_length(1.0, 0.0).unwrap_err().to_string().starts_with("the gravity: "));
        assert!(Escapement::new(2, 2).unwrap_err().to_string().starts_with("the escape wheel teeth: "));
        assert!(Escapement::new(30, 0).unwrap_err().to_string().starts_with("the beats per tooth: "));
    }
}
