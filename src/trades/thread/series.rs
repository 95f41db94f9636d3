//! Thread series for a chart: the built-in ISO metric and unified inch series, and a user's list
//! file. Owns the tables and the list syntax; each entry is a label and a pitch in the syntax of
//! [`super::pitch::parse_pitch`].
//!
//! The built-in values are from memory (ISO 261 coarse pitches, the common ISO 262 fine pitches,
//! ASME B1.1 UNC and UNF threads per inch), not copied from the standards: check them against a
//! copy of the standard before relying on one.

use std::path::Path;

use super::pitch::{parse_pitch, Pitch};
use super::series_tables::{
    BA, BSF, BSW, ISO_FINE_SIZES, MODEL_ENGINEERING, PIPE_G, TRAPEZOIDAL, WORM_DIAMETRAL_PITCHES,
    WORM_MODULES,
};
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
pub const BUILT_IN: &[&str] = &[
    "iso-coarse",
    "iso-fine",
    "iso-fine-sizes",
    "unc",
    "unf",
    "bsw",
    "bsf",
    "ba",
    "pipe-g",
    "me",
    "trapezoidal",
    "module-worms",
    "dp-worms",
];

/// What each built-in series is, and the standard its values follow.
pub fn describe_built_in(name: &str) -> Option<&'static str> {
    Some(match name {
        "iso-coarse" => "ISO metric coarse (ISO 261)",
        "iso-fine" => "ISO metric fine pitches (ISO 262)",
        "iso-fine-sizes" => "ISO metric fine sizes (ISO 261)",
        "unc" => "Unified coarse (ASME B1.1)",
        "unf" => "Unified fine (ASME B1.1)",
        "bsw" => "British Standard Whitworth (BS 84)",
        "bsf" => "British Standard Fine (BS 84)",
        "ba" => "BA (BS 93)",
        "pipe-g" => "British pipe, G (ISO 228-1)",
        "me" => "model engineering, 32 and 40 TPI for every size",
        "trapezoidal" => "trapezoidal leads (ISO 2904)",
        "module-worms" => "module worms, axial pitch π·m (modules of DIN 780 series I)",
        "dp-worms" => "diametral-pitch worms, axial pitch π/P inch",
        _ => return None,
    })
}

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
        "iso-fine-sizes" => {
            ISO_FINE_SIZES.iter().map(|(s, p)| entry(format!("{s}×{p}"), format!("{p}mm"))).collect()
        }
        "bsw" => BSW
            .iter()
            .map(|(s, t)| entry(format!("{s} BSW ({} tpi)", tpi_text(t)), format!("{t}tpi")))
            .collect(),
        "bsf" => BSF.iter().map(|(s, t)| entry(format!("{s} BSF ({t} tpi)"), format!("{t}tpi"))).collect(),
        "ba" => BA.iter().map(|(n, p)| entry(format!("{n}BA ({p} mm)"), format!("{p}mm"))).collect(),
        "pipe-g" => {
            PIPE_G.iter().map(|(s, t)| entry(format!("G {s} ({t} tpi)"), format!("{t}tpi"))).collect()
        }
        "me" => MODEL_ENGINEERING
            .iter()
            .map(|t| entry(format!("ME {t} tpi (every size)"), format!("{t}tpi")))
            .collect(),
        "trapezoidal" => {
            TRAPEZOIDAL.iter().map(|(d, p)| entry(format!("Tr {d}×{p}"), format!("{p}mm"))).collect()
        }
        "module-worms" => {
            WORM_MODULES.iter().map(|m| entry(format!("module {m} worm"), format!("module:{m}"))).collect()
        }
        "dp-worms" => {
            WORM_DIAMETRAL_PITCHES.iter().map(|p| entry(format!("{p} DP worm"), format!("dp:{p}"))).collect()
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
            assert!(s.len() >= if *name == "me" { 2 } else { 10 }, "{name}");
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
        let e = built_in("bsx").unwrap_err().to_string();
        assert_eq!(
            e,
            format!(
                "the thread series: unknown series \"bsx\"; built-in series are {}, or give the thread list FILE",
                BUILT_IN.join(", ")
            )
        );
        for name in BUILT_IN {
            assert!(describe_built_in(name).is_some(), "{name}");
        }
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

    /// The pitch of each thread of a built-in series in mm, by label.
    fn pitches_mm(name: &str) -> Vec<(String, f64)> {
        built_in(name).unwrap().into_iter().map(|e| (e.label, e.pitch.mm.value.to_f64())).collect()
    }

    /// Check `(label, threads per inch)` pairs against a series whose labels start with the size.
    fn check_tpi(name: &str, want: &[(&str, f64)]) {
        let got = pitches_mm(name);
        for (size, tpi) in want {
            let row = got
                .iter()
                .find(|(l, _)| l.starts_with(&format!("{size} ")) || l.starts_with(&format!("G {size} ")))
                .unwrap_or_else(|| panic!("{name}: no {size}"));
            assert!((row.1 - 25.4 / tpi).abs() < 1e-12, "{name} {size}: {} mm", row.1);
        }
    }

    #[test]
    fn british_series_against_their_standards() {
        // BSW and BSF (BS 84) — from memory, as listed in the project's check values.
        check_tpi(
            "bsw",
            &[
                ("1/4", 20.0),
                ("5/16", 18.0),
                ("3/8", 16.0),
                ("7/16", 14.0),
                ("1/2", 12.0),
                ("5/8", 11.0),
                ("3/4", 10.0),
                ("7/8", 9.0),
                ("1", 8.0),
            ],
        );
        check_tpi(
            "bsf",
            &[
                ("1/4", 26.0),
                ("5/16", 22.0),
                ("3/8", 20.0),
                ("7/16", 18.0),
                ("1/2", 16.0),
                ("5/8", 14.0),
                ("3/4", 12.0),
                ("7/8", 11.0),
                ("1", 10.0),
            ],
        );
        // British pipe G / BSP (ISO 228-1) — from memory: 1/8-28, 1/4 and 3/8-19, 1/2 and 3/4-14,
        // 1 inch and over 11.
        check_tpi(
            "pipe-g",
            &[("1/8", 28.0), ("1/4", 19.0), ("3/8", 19.0), ("1/2", 14.0), ("3/4", 14.0), ("1", 11.0)],
        );
        for (label, mm) in pitches_mm("pipe-g") {
            let size = label.trim_start_matches("G ").split(" (").next().unwrap().to_string();
            let inches: f64 = size
                .split(' ')
                .map(|p| match p.split_once('/') {
                    Some((a, b)) => a.parse::<f64>().unwrap() / b.parse::<f64>().unwrap(),
                    None => p.parse().unwrap(),
                })
                .sum();
            if inches >= 1.0 {
                assert!((mm - 25.4 / 11.0).abs() < 1e-12, "{label}");
            }
        }
        // The model engineering series: 32 and 40 threads per inch (common practice).
        let me: Vec<f64> = pitches_mm("me").iter().map(|r| 25.4 / r.1).collect();
        assert_eq!(me.len(), 2);
        assert!((me[0] - 32.0).abs() < 1e-9 && (me[1] - 40.0).abs() < 1e-9, "{me:?}");
    }

    #[test]
    fn ba_pitches_follow_the_series_rule() {
        // BA (BS 93, from memory): the pitch of n BA is 0.9ⁿ mm rounded to 0.01 mm; the listed
        // 0BA 1.00 … 6BA 0.53 are in the project's check values, also from memory.
        let got = pitches_mm("ba");
        assert_eq!(got.len(), 11);
        for (n, (label, mm)) in got.iter().enumerate() {
            assert!(label.starts_with(&format!("{n}BA")), "{label}");
            let rule = (0.9f64.powi(n as i32) * 100.0).round() / 100.0;
            assert!((mm - rule).abs() < 1e-12, "{label}: {mm} vs {rule}");
        }
        let listed = [1.00, 0.90, 0.81, 0.73, 0.66, 0.59, 0.53];
        for (n, want) in listed.iter().enumerate() {
            assert!((got[n].1 - want).abs() < 1e-12);
        }
    }

    #[test]
    fn metric_fine_and_trapezoidal_against_their_standards() {
        // The common ISO metric fine pitches (from memory): every fine size uses one of them.
        let fine = [0.2, 0.25, 0.35, 0.5, 0.75, 1.0, 1.25, 1.5, 2.0, 3.0];
        for (label, mm) in pitches_mm("iso-fine-sizes") {
            assert!(fine.iter().any(|f| (f - mm).abs() < 1e-12), "{label}");
        }
        let iso_fine: Vec<f64> = pitches_mm("iso-fine").iter().map(|r| r.1).collect();
        assert_eq!(iso_fine, fine);
        // Trapezoidal (ISO 2904, from memory): Tr 10×2, 12×3, 16×4, 20×4, 24×5, 28×5, 32×6.
        let tr = pitches_mm("trapezoidal");
        for (size, lead) in [(10, 2.0), (12, 3.0), (16, 4.0), (20, 4.0), (24, 5.0), (28, 5.0), (32, 6.0)] {
            let row =
                tr.iter().find(|r| r.0 == format!("Tr {size}×{lead}")).unwrap_or_else(|| panic!("Tr {size}"));
            assert!((row.1 - lead).abs() < 1e-12);
        }
    }

    #[test]
    fn worms_carry_pi() {
        // Common practice: a module worm's axial pitch is π·m, a DP worm's π/P inch; the
        // modules are DIN 780 series I (German Wikipedia, "Modul (Technik)").
        let series_i = [0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.25, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0];
        let m = pitches_mm("module-worms");
        assert_eq!(m.len(), series_i.len());
        for ((label, mm), module) in m.iter().zip(series_i) {
            assert!((mm - std::f64::consts::PI * module).abs() < 1e-12, "{label}");
        }
        for (label, mm) in pitches_mm("dp-worms") {
            let p: f64 = label.split(' ').next().unwrap().parse().unwrap();
            assert!((mm - std::f64::consts::PI * 25.4 / p).abs() < 1e-12, "{label}");
        }
    }
}
