//! Turning feeds: the carriage driven by the same change gears and leadscrew as for a thread, to
//! a length per spindle turn (`0.1mm`, `0.004in`). Owns the feed's syntax; a feed is then
//! searched as a one-start thread of that lead, with the same ranking and banjo checks.

use super::pitch::{parse_pitch, Pitch, PitchKind};
use super::ThreadSpec;
use crate::error::{Error, Quantity, Result};

/// Parse a feed per spindle turn: a length with its unit (`0.1mm`, `0.004in`). Errors name
/// [`Quantity::Feed`].
pub fn parse_feed(text: &str) -> Result<Pitch> {
    let t = text.trim();
    let wanted = "wanted a length per spindle turn such as 0.1mm or 0.004in";
    let p = parse_pitch(t)
        .map_err(|_| Error::value(Quantity::Feed, format!("\"{t}\" is not a feed; {wanted}")))?;
    match p.kind {
        PitchKind::Metric | PitchKind::InchLength => Ok(p),
        _ => Err(Error::value(Quantity::Feed, format!("\"{t}\" is a thread, not a feed; {wanted}"))),
    }
}

impl ThreadSpec {
    /// A feed of `per_turn` per spindle turn.
    pub fn feed(per_turn: Pitch) -> ThreadSpec {
        ThreadSpec { pitch: per_turn, starts: 1, feed: true }
    }

    /// A thread of `pitch` with `starts` starts.
    pub fn thread(pitch: Pitch, starts: u32) -> ThreadSpec {
        ThreadSpec { pitch, starts, feed: false }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn feeds_are_lengths_per_turn() {
        let f = parse_feed("0.1mm").unwrap();
        assert_eq!(f.mm.value.to_string(), "1/10");
        // 0.004 in = 0.1016 mm exactly (1 in = 25.4 mm).
        assert_eq!(parse_feed("0.004in").unwrap().mm.value.to_string(), "127/1250");
        assert_eq!(
            parse_feed("20tpi").unwrap_err().to_string(),
            "the feed: \"20tpi\" is a thread, not a feed; wanted a length per spindle turn such as 0.1mm or 0.004in"
        );
        assert!(parse_feed("0.1").unwrap_err().to_string().starts_with("the feed: \"0.1\" is not a feed"));
        assert!(ThreadSpec::feed(f).feed);
    }
}
