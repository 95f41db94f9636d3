//! Thread series for a chart: the built-in ISO metric and unified inch series, and a user's list
//! file. Owns the tables and the list syntax; each entry is a label and a pitch in the syntax of
//! [`super::pitch::parse_pitch`].
//!
//! The built-in values are from memory (ISO 261 coarse pitches, the common ISO 262 fine pitches,
//! ASME B1.1 UNC and UNF threads per inch), not copied from the standards: check them against a
//! copy of the standard before relying on one.

use std::path::Path;

use super::pitch::{parse_pitch, Pitch};
use crate::error::{Error, Message, Quantity, Result};

/// One thread of a series.
#[derive(Debug, Clone, PartialEq)]
pub struct SeriesEntry {
    /// What a machinist calls it (`M6`, `1/4-20 UNC`, or the pitch itself).
    pub label: String,
    /// Its pitch.
    pub pitch: Pitch,
}

/// ISO metric coarse pitches (ISO 261), size and pitch in mm — from memory.
const ISO_COARSE: &[(&str, &str)] = &[
    ("M1", "0.25"),
    ("M1.2", "0.25"),
    ("M1.6", "0.35"),
    ("M2", "0.4"),
    ("M2.5", "0.45"),
    ("M3", "0.5"),
    ("M4", "0.7"),
    ("M5", "0.8"),
    ("M6", "1"),
    ("M8", "1.25"),
    ("M10", "1.5"),
    ("M12", "1.75"),
    ("M16", "2"),
    ("M20", "2.5"),
    ("M24", "3"),
    ("M30", "3.5"),
    ("M36", "4"),
    ("M42", "4.5"),
    ("M48", "5"),
    ("M56", "5.5"),
    ("M64", "6"),
];

/// Common ISO metric fine pitches (ISO 262), mm — from memory.
const ISO_FINE: &[&str] = &["0.2", "0.25", "0.35", "0.5", "0.75", "1", "1.25", "1.5", "2", "3"];

/// Unified coarse (UNC, ASME B1.1), size and threads per inch — from memory.
const UNC: &[(&str, &str)] = &[
    ("#1", "64"),
    ("#2", "56"),
    ("#3", "48"),
    ("#4", "40"),
    ("#5", "40"),
    ("#6", "32"),
    ("#8", "32"),
    ("#10", "24"),
    ("#12", "24"),
    ("1/4", "20"),
    ("5/16", "18"),
    ("3/8", "16"),
    ("7/16", "14"),
    ("1/2", "13"),
    ("9/16", "12"),
    ("5/8", "11"),
    ("3/4", "10"),
    ("7/8", "9"),
    ("1", "8"),
    ("1 1/8", "7"),
    ("1 1/4", "7"),
    ("1 3/8", "6"),
    ("1 1/2", "6"),
    ("1 3/4", "5"),
    ("2", "4.5"),
];

/// Unified fine (UNF, ASME B1.1), size and threads per inch — from memory.
const UNF: &[(&str, &str)] = &[
    ("#0", "80"),
    ("#1", "72"),
    ("#2", "64"),
    ("#3", "56"),
    ("#4", "48"),
    ("#5", "44"),
    ("#6", "40"),
    ("#8", "36"),
    ("#10", "32"),
    ("#12", "28"),
    ("1/4", "28"),
    ("5/16", "24"),
    ("3/8", "24"),
    ("7/16", "20"),
    ("1/2", "20"),
    ("9/16", "18"),
    ("5/8", "18"),
    ("3/4", "16"),
    ("7/8", "14"),
    ("1", "12"),
    ("1 1/8", "12"),
    ("1 1/4", "12"),
    ("1 3/8", "12"),
    ("1 1/2", "12"),
];

/// Names of the built-in series.
pub const BUILT_IN: &[&str] = &["iso-coarse", "iso-fine", "unc", "unf"];

/// A built-in series by name; errors name [`Quantity::Series`].
pub fn built_in(name: &str) -> Result<Vec<SeriesEntry>> {
    let entry = |label: String, pitch: String| -> Result<SeriesEntry> {
        Ok(SeriesEntry { label, pitch: parse_pitch(&pitch)? })
    };
    match name.trim().to_ascii_lowercase().as_str() {
        "iso-coarse" => ISO_COARSE.iter().map(|(s, p)| entry(format!("{s}×{p}"), format!("{p}mm"))).collect(),
        "iso-fine" => ISO_FINE.iter().map(|p| entry(format!("{p} mm"), format!("{p}mm"))).collect(),
        "unc" => {
            UNC.iter().map(|(s, t)| entry(format!("{s}-{} UNC", tpi_text(t)), format!("{t}tpi"))).collect()
        }
        "unf" => {
            UNF.iter().map(|(s, t)| entry(format!("{s}-{} UNF", tpi_text(t)), format!("{t}tpi"))).collect()
        }
        other => Err(Error::value(
            Quantity::Series,
            Message::from(format!(
                "unknown series \"{other}\"; built-in series are {}, or give ",
                BUILT_IN.join(", ")
            ))
            .quantity(Quantity::ThreadList)
            .text(" FILE"),
        )),
    }
}

/// `4.5` is written `4 1/2` in a thread's name.
fn tpi_text(t: &str) -> String {
    if t == "4.5" {
        "4 1/2".to_string()
    } else {
        t.to_string()
    }
}

/// Read a list file: one thread a line, `LABEL, PITCH` or just `PITCH` (`#` starts a comment),
/// pitches as for [`parse_pitch`]. Errors name [`Quantity::ThreadList`], the file and the line.
pub fn load_list(path: &Path) -> Result<Vec<SeriesEntry>> {
    let name = path.display().to_string();
    let bad = |why: Message| {
        Error::value(Quantity::ThreadList, Message::from(format!("list file {name}")).then(why))
    };
    let text = std::fs::read_to_string(path).map_err(|e| bad(format!(": cannot read it: {e}").into()))?;
    let mut out = Vec::new();
    for (n, line) in text.lines().enumerate() {
        let line = line.split('#').next().unwrap_or("").trim();
        if line.is_empty() {
            continue;
        }
        let (label, pitch) = match line.rsplit_once(',') {
            Some((l, p)) => (l.trim(), p.trim()),
            None => (line, line),
        };
        let pitch = parse_pitch(pitch)
            .map_err(|e| bad(Message::from(format!(", line {}: ", n + 1)).then(e.detail())))?;
        out.push(SeriesEntry { label: label.to_string(), pitch });
    }
    if out.is_empty() {
        return Err(bad(": no threads; wanted one pitch a line such as 1.25mm or M8, 1.25mm".into()));
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::trades::thread::pitch::PitchKind;

    #[test]
    fn built_in_series_parse() {
        for name in BUILT_IN {
            let s = built_in(name).unwrap();
            assert!(s.len() >= 10, "{name}");
        }
        // From memory (ISO 261): M8 coarse is 1.25 mm; (ASME B1.1) 1/4-20 UNC, 2-4 1/2 UNC.
        let c = built_in("iso-coarse").unwrap();
        let m8 = c.iter().find(|e| e.label == "M8×1.25").unwrap();
        assert_eq!(m8.pitch.mm.value.to_string(), "5/4");
        let unc = built_in("unc").unwrap();
        assert_eq!(unc[9].label, "1/4-20 UNC");
        assert_eq!(unc[9].pitch.kind, PitchKind::Inch);
        let last = unc.last().unwrap();
        assert_eq!(last.label, "2-4 1/2 UNC");
        assert_eq!(last.pitch.given.to_string(), "9/2");
        let e = built_in("bsw").unwrap_err().to_string();
        assert_eq!(
            e,
            "the thread series: unknown series \"bsw\"; built-in series are iso-coarse, iso-fine, unc, unf, \
             or give the thread list FILE"
        );
    }

    #[test]
    fn list_files_name_the_line() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("mine.txt");
        std::fs::write(&p, "# my threads\nM8, 1.25mm\n11tpi\n\nworm, module:2\n").unwrap();
        let l = load_list(&p).unwrap();
        assert_eq!(l.len(), 3);
        assert_eq!((l[1].label.as_str(), l[1].pitch.kind), ("11tpi", PitchKind::Inch));
        std::fs::write(&p, "M8, 1.25mm\nM10, 1.5\n").unwrap();
        let e = load_list(&p).unwrap_err().to_string();
        assert!(e.starts_with("the thread list: list file ") && e.contains("line 2:"), "{e}");
        assert!(
            e.ends_with(
                "line 2: \"1.5\" has no unit; wanted a pitch such as 1.25mm, 11tpi, 0.05in, module:2 or dp:16"
            ),
            "{e}"
        );
    }
}
