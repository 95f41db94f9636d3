//! The striking train of a count-wheel (or rack) striking clock: from the great wheel to the
//! pin wheel, whose pins lift the hammer, then the locking wheel (turning once a blow), the
//! warning wheel and the fly; and the count wheel, driven by a pinion on the pin wheel's arbor
//! and turning once in 12 hours. Works out the blows (1 + 2 + … + 12 = 78 in 12 hours, 90 with
//! one blow at each half hour) and each arbor's turns from the pins and the run time, and
//! searches every part ([`super::part`]) with the going train's search and ranking.
//!
//! Arithmetic (common practice, from memory): over a run of `H` hours the hammer strikes
//! `b·H/12` blows (`b` = 78 or 90); the pin wheel turns once per `P` blows, so the great wheel
//! (`T` turns at a winding) to the pin wheel is `i = P·T / (b·H/12)`; the pin wheel to the locking
//! wheel `i = 1/P`; the locking wheel to the warning wheel `i = 1/W` (the warning wheel turning a
//! whole `W` times a blow, so it stops in the same place every hour); the warning wheel to the
//! fly `i = 1/F`; the pinion on the pin wheel's arbor to the count wheel `i = b/P`.

use super::part::{MeshCheck, Part, PartPlan};
use crate::engine::RunOptions;
use crate::error::{Error, Quantity, Result};
use crate::model::pool::Pool;
use crate::numbers::exact::Exact;
use crate::numbers::range::IntRange;
use crate::numbers::rational::Ratio;

/// Blows in 12 hours striking the hours: 1 + 2 + … + 12.
pub fn hour_blows_in_12_hours() -> u32 {
    (1..=12).sum()
}

/// Default pins of the pin wheel (common practice, from memory, settable).
pub const DEFAULT_PINS: u32 = 8;
/// Default turns of the warning wheel per blow (from memory, settable).
pub const DEFAULT_WARNING_TURNS: u32 = 8;
/// Default turns of the fly per turn of the warning wheel (from memory, settable).
pub const DEFAULT_FLY_TURNS: u32 = 8;
/// Most pins a pin wheel may have.
pub const MAX_PINS: u32 = 30;
/// Most turns per turn of the arbor before asked of one part (warning wheel, fly).
pub const MAX_TURNS_PER_PART: u32 = 60;

/// What the clockmaker asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct StrikeSpec {
    /// Pins on the pin wheel, one blow each.
    pub pins: u32,
    /// A blow at each half hour too (90 blows in 12 hours instead of 78).
    pub half_hours: bool,
    /// The run time at a winding, hours, exactly.
    pub run_hours: Ratio,
    /// Turns of the barrel (great wheel) at a winding, exactly.
    pub barrel_turns: Ratio,
    /// Turns of the warning wheel per blow (whole).
    pub warning_turns: u32,
    /// Turns of the fly per turn of the warning wheel.
    pub fly_turns: u32,
    /// Wheel blanks to be cut or on hand.
    pub pool: Pool,
    /// Wheel teeth allowed.
    pub wheels: IntRange,
    /// Pinion leaves allowed.
    pub pinions: IntRange,
    /// Stage counts from the great wheel to the pin wheel.
    pub great_stages: IntRange,
    /// The meshes to check, if any.
    pub meshes: Option<MeshCheck>,
    /// Gear sets to list per part, each by its first arrangement.
    pub limit: usize,
}

/// The result of a striking-train search: the blows, then each part.
#[derive(Debug, Clone, PartialEq)]
pub struct StrikePlan {
    /// What was asked.
    pub spec: StrikeSpec,
    /// Blows in 12 hours (78 or 90).
    pub blows_per_12_hours: u32,
    /// Blows over the run time, exactly.
    pub blows_in_run: Ratio,
    /// Turns of the pin wheel over the run time, exactly.
    pub pin_wheel_turns: Ratio,
    /// The parts: great wheel to pin wheel, pin wheel to locking wheel, locking wheel to
    /// warning wheel, warning wheel to fly, and the count wheel.
    pub parts: Vec<PartPlan>,
}

impl StrikeSpec {
    /// Blows in 12 hours: 78, or 90 with the half hours.
    pub fn blows_per_12_hours(&self) -> u32 {
        hour_blows_in_12_hours() + if self.half_hours { 12 } else { 0 }
    }

    /// Blows over the run time, exactly: blows in 12 hours × run hours / 12.
    pub fn blows_in_run(&self) -> Ratio {
        Exact::of(Ratio::integer(self.blows_per_12_hours() as u64))
            .times(Exact::of(self.run_hours))
            .over(Exact::of(Ratio::integer(12)))
            .value
    }

    fn check(&self) -> Result<()> {
        if !(2..=MAX_PINS).contains(&self.pins) {
            return Err(Error::value(
                Quantity::StrikePins,
                format!("wanted 2 to {MAX_PINS} pins, found {}", self.pins),
            ));
        }
        for (n, q) in [(self.warning_turns, Quantity::WarningTurns), (self.fly_turns, Quantity::FlyTurns)] {
            if !(1..=MAX_TURNS_PER_PART).contains(&n) {
                return Err(Error::value(q, format!("wanted 1 to {MAX_TURNS_PER_PART} turns, found {n}")));
            }
        }
        Ok(())
    }

    /// The parts to search, in order from the great wheel, the count wheel last.
    pub fn parts(&self) -> Result<Vec<Part>> {
        self.check()?;
        let names = |v: &[&str]| v.iter().map(|s| s.to_string()).collect::<Vec<_>>();
        let speed_up = |arbors: Vec<String>, ratio: Ratio, stages: IntRange| Part {
            arbors,
            ratio,
            drivers: self.wheels,
            driven: self.pinions,
            stages,
        };
        let one = IntRange { lo: 1, hi: 1 };
        let inverse = |n: u32| Ratio::new(1, n as u128).expect("n ≥ 1");
        let great_ratio = Exact::of(Ratio::integer(self.pins as u64))
            .times(Exact::of(self.barrel_turns))
            .over(Exact::of(self.blows_in_run()))
            .value;
        let mut great_arbors = names(&["great wheel", "intermediate", "second intermediate"]);
        great_arbors.truncate(self.great_stages.hi as usize);
        great_arbors.push("pin wheel".into());
        Ok(vec![
            speed_up(great_arbors, great_ratio, self.great_stages),
            speed_up(names(&["pin wheel", "locking wheel"]), inverse(self.pins), one),
            speed_up(names(&["locking wheel", "warning wheel"]), inverse(self.warning_turns), one),
            speed_up(names(&["warning wheel", "fly"]), inverse(self.fly_turns), one),
            Part {
                arbors: names(&["pin wheel", "count wheel"]),
                ratio: Ratio::new(self.blows_per_12_hours() as u128, self.pins as u128).expect("pins ≥ 2"),
                drivers: self.pinions,
                driven: self.wheels,
                stages: one,
            },
        ])
    }

    /// Search every part.
    pub fn plan(&self, options: &RunOptions) -> Result<StrikePlan> {
        let parts = self
            .parts()?
            .iter()
            .map(|p| p.plan(&self.pool, self.meshes, self.limit, options))
            .collect::<Result<Vec<_>>>()?;
        let blows_in_run = self.blows_in_run();
        Ok(StrikePlan {
            spec: self.clone(),
            blows_per_12_hours: self.blows_per_12_hours(),
            pin_wheel_turns: Exact::of(blows_in_run).over(Exact::of(Ratio::integer(self.pins as u64))).value,
            blows_in_run,
            parts,
        })
    }
}

impl StrikePlan {
    /// True when every part has at least one train.
    pub fn found(&self) -> bool {
        self.parts.iter().all(|p| p.count > 0)
    }

    /// True when no part's search was interrupted.
    pub fn complete(&self) -> bool {
        self.parts.iter().all(|p| p.complete)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec(half_hours: bool) -> StrikeSpec {
        StrikeSpec {
            pins: 8,
            half_hours,
            run_hours: Ratio::integer(192),
            barrel_turns: Ratio::integer(16),
            warning_turns: 8,
            fly_turns: 8,
            pool: Pool::to_cut(IntRange { lo: 6, hi: 130 }, 0.5, 20.0, None).unwrap(),
            wheels: IntRange { lo: 30, hi: 130 },
            pinions: IntRange { lo: 6, hi: 16 },
            great_stages: IntRange { lo: 1, hi: 1 },
            meshes: None,
            limit: 5,
        }
    }

    #[test]
    fn the_blows_add_up() {
        // Counted here blow by blow over 12 hours, independently of the formula: each hour
        // strikes its number, each half hour once.
        let mut hours = 0;
        let mut with_halves = 0;
        for h in 1..=12 {
            hours += h;
            with_halves += h + 1;
        }
        assert_eq!(spec(false).blows_per_12_hours(), hours);
        assert_eq!(spec(true).blows_per_12_hours(), with_halves);
        assert_eq!((hours, with_halves), (78, 90)); // common practice, from memory
                                                    // Eight days are 16 twelve-hour rounds.
        assert_eq!(spec(false).blows_in_run(), Ratio::integer(16 * 78));
    }

    #[test]
    fn an_eight_day_count_wheel_strike() {
        // An eight-day striking train (common practice, from memory): great wheel 78 into a
        // pinion of 8 on the pin wheel's arbor, 8 pins, 16 turns of the barrel; the count wheel
        // of 78 driven by a pinion of 8 on the pin wheel's arbor turns once in 12 hours.
        let plan = spec(false).plan(&RunOptions::default()).unwrap();
        assert!(plan.found() && plan.complete());
        let pairs = |k: usize| -> Vec<(u32, u32)> {
            plan.parts[k]
                .trains
                .iter()
                .filter(|t| t.stages.len() == 1)
                .map(|t| (t.stages[0].driver.teeth, t.stages[0].driven.teeth))
                .collect()
        };
        assert!(pairs(0).contains(&(78, 8)), "{:?}", pairs(0));
        assert!(pairs(4).contains(&(8, 78)), "{:?}", pairs(4));
        // The pin wheel turns 1248/8 = 156 times in 8 days; 78/8 × 16 = 156 too.
        assert_eq!(plan.pin_wheel_turns, Ratio::integer(156));
        // Each listed train gives the part's ratio exactly.
        for part in &plan.parts {
            for t in &part.trains {
                assert_eq!(t.ratio_from_teeth(), part.part.ratio, "{:?}", part.part.arbors);
            }
        }
    }

    #[test]
    fn bad_counts_name_their_quantity() {
        let mut s = spec(false);
        s.pins = 1;
        assert!(s.parts().unwrap_err().to_string().starts_with("the pin wheel's pins: wanted 2 to"));
        let mut s = spec(false);
        s.fly_turns = 0;
        assert!(s.parts().unwrap_err().to_string().starts_with("the fly's turns"));
    }
}
