//! The thread dial (chasing dial): which of its lines are safe to close the half-nuts at, for a
//! setup, so that a machinist who leaves the leadscrew turning between cuts drops the tool back
//! into the same groove. Owns that rule and the dial's description; knows nothing of gears
//! beyond the exact number of spindle turns per leadscrew turn a setup makes.
//!
//! The rule, exact: the dial's gear (of `teeth` teeth) meshes the leadscrew, so it turns once for
//! `teeth` leadscrew turns of travel of the carriage along the screw, and its `marks` lines
//! divide that into equal parts of `teeth / marks` leadscrew turns. Closing the half-nuts `k`
//! leadscrew turns after the first engagement puts the tool back in its groove when the spindle
//! has made a whole number of turns meanwhile: `k · s` whole, `s = p/q` (reduced) being the
//! spindle turns per leadscrew turn, so when `q` divides `k`. The dial cannot count its own
//! revolutions, so a line is safe only if every `k` it stands for is a multiple of `q`: no line
//! at all when `q` does not divide `teeth` (then the half-nuts stay closed and the spindle is
//! reversed to bring the tool back: common practice), else every `q / gcd(q, teeth/marks)`-th
//! line counted from the line of the first engagement.
//!
//! This reproduces the dial rules of the trade for an 8 tpi leadscrew whose dial lines stand
//! half an inch of travel apart and are numbered every inch (from memory): even threads per inch
//! at any line, odd at any numbered line, half threads (11½) at every other numbered line, other
//! fractions at the same line only; and a metric thread cut through a 127-tooth gear at no line.

use crate::numbers::rational::{gcd, Ratio};

/// A thread dial: its gear on the leadscrew and the lines on its face.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Dial {
    /// Teeth of the dial's gear (it turns once per this many leadscrew turns of travel).
    pub teeth: u32,
    /// Evenly spaced lines on its face; `teeth` is a multiple of it, so each line stands for a
    /// whole number of leadscrew turns (the half-nuts close only on whole turns).
    pub marks: u32,
}

/// Where the half-nuts may be closed for one setup.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Engagement {
    /// Leadscrew turns between one safe engagement and the next (`q`).
    pub leadscrew_turns: u64,
    /// With a dial: every how many lines it is safe, counted from the line of the first
    /// engagement (1: any line, `marks`: the same line only); `None` when no line is safe.
    pub every_nth_line: Option<u32>,
}

impl Dial {
    /// A dial of `teeth` and `marks`; the reason when they do not make one.
    pub fn new(teeth: u32, marks: u32) -> Result<Dial, String> {
        if teeth == 0 || marks == 0 || teeth % marks != 0 {
            return Err(format!(
                "a dial of {teeth} teeth and {marks} lines: the teeth must be a whole multiple of the lines, \
                 so that each line stands for whole turns of the leadscrew"
            ));
        }
        Ok(Dial { teeth, marks })
    }

    /// Leadscrew turns from one line to the next.
    pub fn turns_per_line(&self) -> u32 {
        self.teeth / self.marks
    }

    /// One-line description for reports.
    pub fn describe(&self) -> String {
        format!(
            "{}-tooth gear on the leadscrew, {} lines ({} leadscrew turn{} apart)",
            self.teeth,
            self.marks,
            self.turns_per_line(),
            if self.turns_per_line() == 1 { "" } else { "s" }
        )
    }
}

/// Where to engage for a setup that makes `spindle_per_leadscrew` spindle turns per leadscrew
/// turn (exact), on `dial` when there is one.
pub fn engagement(spindle_per_leadscrew: Ratio, dial: Option<&Dial>) -> Engagement {
    let q = spindle_per_leadscrew.den();
    let every_nth_line = dial.and_then(|d| {
        if d.teeth as u64 % q != 0 {
            return None;
        }
        let step = q / gcd(q as u128, d.turns_per_line() as u128) as u64;
        Some(step as u32)
    });
    Engagement { leadscrew_turns: q, every_nth_line }
}

impl Engagement {
    /// In words, for a table cell: `any line`, `every 2nd line`, `same line only`, `none: keep
    /// the half-nuts closed`.
    pub fn describe(&self, dial: &Dial) -> String {
        match self.every_nth_line {
            None => "none: keep the half-nuts closed".to_string(),
            Some(1) => "any line".to_string(),
            Some(n) if n == dial.marks => "same line only".to_string(),
            Some(n) => format!("every {} line", ordinal(n)),
        }
    }
}

fn ordinal(n: u32) -> String {
    let suffix = match (n % 10, n % 100) {
        (1, x) if x != 11 => "st",
        (2, x) if x != 12 => "nd",
        (3, x) if x != 13 => "rd",
        _ => "th",
    };
    format!("{n}{suffix}")
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Spindle turns per leadscrew turn for `tpi` on an 8 tpi leadscrew with a 1:1 train.
    fn on_8tpi(tpi_num: u64, tpi_den: u64) -> Ratio {
        Ratio::new(tpi_num as u128, 8 * tpi_den as u128).unwrap()
    }

    #[test]
    fn the_trade_rules_on_an_8_tpi_leadscrew() {
        // The trade's dial rules (from memory) for an 8 tpi leadscrew whose dial lines are half
        // an inch of travel apart (4 leadscrew turns), numbered every inch, 8 lines: a 32-tooth
        // dial gear. Numbered lines are every 2nd line.
        let dial = Dial::new(32, 8).unwrap();
        for even in [4, 10, 12, 14, 16, 18, 20, 24, 28, 40] {
            assert_eq!(engagement(on_8tpi(even, 1), Some(&dial)).describe(&dial), "any line", "{even} tpi");
        }
        for odd in [5, 7, 9, 11, 13, 19, 27] {
            let e = engagement(on_8tpi(odd, 1), Some(&dial));
            assert_eq!(e.every_nth_line, Some(2), "{odd} tpi: any numbered line");
        }
        // Half threads, 11½ and 4½ tpi: every other numbered line.
        for half in [23, 9] {
            assert_eq!(engagement(on_8tpi(half, 2), Some(&dial)).every_nth_line, Some(4));
        }
        // A quarter thread (11¼ tpi): the same line only.
        let e = engagement(on_8tpi(45, 4), Some(&dial));
        assert_eq!(e.describe(&dial), "same line only");
    }

    #[test]
    fn a_metric_thread_through_the_127_never_comes_round() {
        // 1.25 mm on 8 tpi: spindle turns per leadscrew turn = (127/40) / (5/4) = 127/50. The
        // 127 never divides a dial's teeth: keep the half-nuts closed (common practice).
        let s = Ratio::new(127, 50).unwrap();
        let dial = Dial::new(32, 8).unwrap();
        let e = engagement(s, Some(&dial));
        assert_eq!(e.every_nth_line, None);
        assert_eq!(e.leadscrew_turns, 50);
        assert_eq!(e.describe(&dial), "none: keep the half-nuts closed");
    }

    #[test]
    fn metric_on_metric() {
        // A 3 mm leadscrew, dial of 20 teeth and 4 lines (5 turns, 15 mm apart). 1.5 mm: s = 2,
        // any turn, so any line. 1.25 mm: s = 12/5, every 5 turns = every line. 1.75 mm:
        // s = 12/7; 7 does not divide 20: no line.
        let dial = Dial::new(20, 4).unwrap();
        assert_eq!(engagement(Ratio::integer(2), Some(&dial)).every_nth_line, Some(1));
        assert_eq!(engagement(Ratio::new(12, 5).unwrap(), Some(&dial)).every_nth_line, Some(1));
        assert_eq!(engagement(Ratio::new(12, 7).unwrap(), Some(&dial)).every_nth_line, None);
        // The same check by brute force: a line is safe when every engagement it stands for
        // (k = line offset + whole dial turns) leaves the spindle a whole number of turns on.
        for (p, q) in [(12u64, 5u64), (12, 7), (3, 2), (7, 4), (11, 8), (5, 1)] {
            let s = Ratio::new(p as u128, q as u128).unwrap();
            let e = engagement(s, Some(&dial));
            let safe: Vec<u32> = (0..dial.marks)
                .filter(|&line| {
                    (0..50u64).all(|rev| {
                        let k = (line * dial.turns_per_line()) as u64 + rev * dial.teeth as u64;
                        (k * s.num()) % s.den() == 0
                    })
                })
                .collect();
            let expected: Vec<u32> = match e.every_nth_line {
                None => Vec::new(),
                Some(n) => (0..dial.marks).filter(|l| l % n == 0).collect(),
            };
            assert_eq!(safe, expected, "{p}/{q}");
        }
    }

    #[test]
    fn a_dial_needs_whole_turns_per_line() {
        assert!(Dial::new(16, 8).is_ok());
        assert!(Dial::new(15, 4).unwrap_err().contains("whole multiple"));
        assert_eq!(ordinal(2), "2nd");
        assert_eq!(ordinal(12), "12th");
    }
}
