//! The lathe file: one small text file that describes one machine, so a run names the lathe
//! once instead of repeating its leadscrew, gearbox, banjo and gears. Owns the file's syntax and
//! its errors (each names the file, the line and the key); what the values mean belongs to
//! [`super::machine`], [`super::banjo`], [`super::dial`] and [`crate::model::pool`].
//!
//! The format is ours: UTF-8 text, one `key = value` a line, `#` starts a comment, blank lines
//! are ignored, each key at most once except `slot_mm` (one line per slot of the banjo). Keys:
//!
//! | key | value |
//! |---|---|
//! | `name` | what the machine is called, for the report's header |
//! | `leadscrew` | `8tpi`, `3mm`, `0.25in` |
//! | `stud_ratio` | spindle turns per stud turn (`1`, `2`, `1/2`) |
//! | `gearbox` | positions `A=2, B=1, C=1/2` (input turns per leadscrew turn) |
//! | `gears` | the change gears on hand: tooth counts, `40x2` for two of one count (`20 25 30 40x2 127`) |
//! | `stock` | or a stock catalogue (CSV) with them, a path from the lathe file's folder |
//! | `module_mm`, `pressure_angle_deg` | of the gears on hand (for `stock`, of rows that give none) |
//! | `largest_teeth` | the largest gear the guard closes over, teeth |
//! | `tumbler_reverse` | `yes` or `no`: whether the hand of the thread is set by a tumbler |
//! | `stud_to_leadscrew_mm` | banjo: distance between the stud and leadscrew axes |
//! | `slot_mm` | banjo: distances from the leadscrew a stud in this slot can take, `LO..HI`; once per slot |
//! | `shaft_diameter_mm` | banjo: diameter of the shafts and spacers the gears must clear |
//! | `dial_teeth`, `dial_marks` | thread dial: teeth of its gear on the leadscrew, lines on its face |
//!
//! Lengths take a unit where one is written (`4.5in`) and are millimetres otherwise.

use std::path::{Path, PathBuf};

use super::banjo::Banjo;
use super::dial::Dial;
use super::machine::{parse_gearbox_list, GearboxPosition};
use super::pitch::{parse_leadscrew, Pitch};
use crate::error::{Error, Message, Quantity, Result};
use crate::model::catalog::{self, CatalogueDefaults};
use crate::model::pool::{check_module, check_pressure_angle, StockGear, MAX_TEETH, MIN_TEETH};
use crate::numbers::length::{parse_length, LengthUnit};
use crate::numbers::range::{parse_length_range, FloatRange};
use crate::numbers::rational::Ratio;
use crate::numbers::target::parse_ratio;

/// Every key a lathe file may hold, in the order the documentation lists them.
pub const KEYS: &[&str] = &[
    "name",
    "leadscrew",
    "stud_ratio",
    "gearbox",
    "gears",
    "stock",
    "module_mm",
    "pressure_angle_deg",
    "largest_teeth",
    "tumbler_reverse",
    "stud_to_leadscrew_mm",
    "slot_mm",
    "shaft_diameter_mm",
    "dial_teeth",
    "dial_marks",
];

/// The gears a lathe file says are on hand.
#[derive(Debug, Clone, PartialEq)]
pub enum GearsOnHand {
    /// Listed in the file: (teeth, how many).
    Listed(Vec<(u32, u32)>),
    /// In a stock catalogue, the path resolved from the lathe file's folder.
    Catalogue(PathBuf),
}

/// A lathe as its file describes it. Every part is optional: what the file leaves out, the
/// command's own options give (and they override what the file says).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct LatheFile {
    /// The file it was read from.
    pub path: PathBuf,
    /// What the machine is called.
    pub name: Option<String>,
    /// The leadscrew's pitch.
    pub leadscrew: Option<Pitch>,
    /// Spindle turns per stud turn.
    pub stud_ratio: Option<Ratio>,
    /// Gearbox positions (empty: none described).
    pub gearbox: Vec<GearboxPosition>,
    /// The change gears on hand.
    pub gears: Option<GearsOnHand>,
    /// Module of the gears on hand, mm.
    pub module_mm: Option<f64>,
    /// Pressure angle of the gears on hand, degrees.
    pub pressure_angle_deg: Option<f64>,
    /// The largest gear the guard closes over, teeth.
    pub largest_teeth: Option<u32>,
    /// Whether the hand of the thread is set by a tumbler reverse.
    pub tumbler_reverse: Option<bool>,
    /// The banjo, when the file describes one.
    pub banjo: Option<Banjo>,
    /// The thread dial, when the file describes one.
    pub dial: Option<Dial>,
}

impl LatheFile {
    /// The gears on hand as stock rows, with `module_mm` and `pressure_angle_deg` standing in
    /// for the file's own (the command's options override the file). `None` when the file lists
    /// no gears. Errors name [`Quantity::Lathe`] and the file.
    pub fn stock(
        &self,
        module_mm: Option<f64>,
        pressure_angle_deg: Option<f64>,
    ) -> Result<Option<Vec<StockGear>>> {
        let module = module_mm.or(self.module_mm);
        let angle = pressure_angle_deg.or(self.pressure_angle_deg).unwrap_or(20.0);
        match &self.gears {
            None => Ok(None),
            Some(GearsOnHand::Catalogue(path)) => {
                let defaults = CatalogueDefaults { module_mm: module, pressure_angle_deg: angle };
                Ok(Some(catalog::load(path, defaults)?))
            }
            Some(GearsOnHand::Listed(list)) => {
                let Some(module_mm) = module else {
                    return Err(
                        self.error("gears are listed without module_mm; add a line such as module_mm = 1.5")
                    );
                };
                Ok(Some(
                    list.iter()
                        // Change gears on hand, cut standard.
                        .map(|&(teeth, quantity)| StockGear::on_hand(teeth, module_mm, angle, quantity))
                        .collect(),
                ))
            }
        }
    }

    /// Where the gears came from, for error messages and reports.
    pub fn gears_source(&self) -> String {
        match &self.gears {
            Some(GearsOnHand::Catalogue(p)) => format!("catalogue {}", p.display()),
            _ => format!("lathe file {}", self.path.display()),
        }
    }

    fn error(&self, why: impl Into<Message>) -> Error {
        Error::value(
            Quantity::Lathe,
            Message::from(format!("lathe file {}: ", self.path.display())).then(why.into()),
        )
    }
}

/// Read a lathe file. Errors name [`Quantity::Lathe`], the file, and where it applies the line
/// and key: `the lathe: lathe file shop.lathe, line 4: leadscrew: …`.
pub fn load_lathe(path: &Path) -> Result<LatheFile> {
    let name = path.display().to_string();
    let file_error = |why: String| Error::value(Quantity::Lathe, format!("lathe file {name}: {why}"));
    let text = std::fs::read_to_string(path).map_err(|e| file_error(format!("cannot read it: {e}")))?;
    let mut out = LatheFile { path: path.to_path_buf(), ..LatheFile::default() };
    let mut seen: Vec<&str> = Vec::new();
    let (mut distance, mut slots, mut shaft) = (None, Vec::<(usize, FloatRange)>::new(), None);
    let (mut dial_teeth, mut dial_marks) = (None, None);
    for (n, line) in text.lines().enumerate() {
        let line = line.split('#').next().unwrap_or("").trim();
        if line.is_empty() {
            continue;
        }
        let place = format!("lathe file {name}, line {}", n + 1);
        let Some((key, value)) = line.split_once('=') else {
            return Err(Error::value(
                Quantity::Lathe,
                format!("{place}: wanted key = value, found \"{line}\""),
            ));
        };
        let (key, value) = (key.trim(), value.trim());
        let at = |why: Message| {
            Error::value(Quantity::Lathe, Message::from(format!("{place}: {key}: ")).then(why))
        };
        let said = |why: String| at(Message::from(why));
        let Some(&known) = KEYS.iter().find(|k| **k == key) else {
            return Err(Error::value(
                Quantity::Lathe,
                format!("{place}: unknown key \"{key}\"; known keys are {}", KEYS.join(", ")),
            ));
        };
        if known != "slot_mm" && seen.contains(&known) {
            return Err(said("given twice; give each key once (slot_mm once per slot)".into()));
        }
        seen.push(known);
        if value.is_empty() {
            return Err(said("has no value".into()));
        }
        let mm = |v: &str| -> Result<f64> {
            Ok(parse_length(v, Quantity::Lathe, Some(LengthUnit::Millimetre))
                .map_err(|e| at(e.detail()))?
                .mm_f64())
        };
        let whole = |v: &str, min: u32, max: u32| -> Result<u32> {
            match v.parse::<u32>() {
                Ok(z) if (min..=max).contains(&z) => Ok(z),
                _ => Err(said(format!("wanted a whole number from {min} to {max}, found \"{v}\""))),
            }
        };
        match known {
            "name" => out.name = Some(value.to_string()),
            "leadscrew" => out.leadscrew = Some(parse_leadscrew(value).map_err(|e| at(e.detail()))?),
            "stud_ratio" => {
                out.stud_ratio = Some(parse_ratio(value, Quantity::Lathe).map_err(|e| at(e.detail()))?)
            }
            "gearbox" => out.gearbox = parse_gearbox_list(value).map_err(|e| at(e.detail()))?,
            "gears" => out.gears = Some(GearsOnHand::Listed(parse_gear_list(value).map_err(said)?)),
            "stock" => {
                let folder = path.parent().unwrap_or(Path::new(""));
                out.gears = Some(GearsOnHand::Catalogue(folder.join(value)));
            }
            "module_mm" => {
                let m = mm(value)?;
                out.module_mm = Some(check_module(m, &|why| said(why))?);
            }
            "pressure_angle_deg" => {
                let deg = value
                    .parse::<f64>()
                    .map_err(|_| said(format!("wanted an angle in degrees such as 20, found \"{value}\"")))?;
                out.pressure_angle_deg = Some(check_pressure_angle(deg, &|why| said(why))?);
            }
            "largest_teeth" => out.largest_teeth = Some(whole(value, MIN_TEETH, MAX_TEETH)?),
            "tumbler_reverse" => {
                out.tumbler_reverse = Some(match value.to_ascii_lowercase().as_str() {
                    "yes" => true,
                    "no" => false,
                    _ => return Err(said(format!("wanted yes or no, found \"{value}\""))),
                })
            }
            "stud_to_leadscrew_mm" => distance = Some(mm(value)?),
            "shaft_diameter_mm" => shaft = Some(mm(value)?),
            "slot_mm" => {
                let r = parse_length_range(value, Quantity::Lathe).map_err(|e| at(e.detail()))?;
                if !r.hi.is_finite() {
                    return Err(said("wanted LO..HI mm with an upper end".into()));
                }
                slots.push((n + 1, r));
            }
            "dial_teeth" => dial_teeth = Some(whole(value, 1, 1000)?),
            "dial_marks" => dial_marks = Some(whole(value, 1, 1000)?),
            _ => unreachable!("every known key is matched"),
        }
    }
    if seen.is_empty() {
        return Err(file_error("no keys; wanted key = value lines such as leadscrew = 8tpi".to_string()));
    }
    let banjo_keys = [distance.is_some(), !slots.is_empty(), shaft.is_some()];
    if banjo_keys.iter().any(|&b| b) {
        let missing: Vec<&str> = ["stud_to_leadscrew_mm", "slot_mm", "shaft_diameter_mm"]
            .iter()
            .zip(banjo_keys)
            .filter(|(_, given)| !given)
            .map(|(k, _)| *k)
            .collect();
        if !missing.is_empty() {
            return Err(file_error(format!(
                "a banjo needs stud_to_leadscrew_mm, slot_mm and shaft_diameter_mm; {} is missing",
                missing.join(" and ")
            )));
        }
        let ranges: Vec<FloatRange> = slots.iter().map(|s| s.1).collect();
        let banjo = Banjo::with_slots(distance.unwrap_or(0.0), ranges, shaft.unwrap_or(0.0), &|_, why| {
            file_error(why)
        })?;
        out.banjo = Some(banjo);
    }
    match (dial_teeth, dial_marks) {
        (Some(teeth), Some(marks)) => out.dial = Some(Dial::new(teeth, marks).map_err(&file_error)?),
        (None, None) => {}
        (Some(_), None) => return Err(file_error("dial_teeth is given without dial_marks".into())),
        (None, Some(_)) => return Err(file_error("dial_marks is given without dial_teeth".into())),
    }
    Ok(out)
}

/// `20 25 30 40x2, 127`: tooth counts separated by spaces or commas, `ZxN` for N gears of Z teeth.
fn parse_gear_list(text: &str) -> std::result::Result<Vec<(u32, u32)>, String> {
    let mut out: Vec<(u32, u32)> = Vec::new();
    for item in text.split([',', ' ', '\t']).filter(|s| !s.is_empty()) {
        let (teeth, count) = match item.split_once(['x', 'X']) {
            Some((z, q)) => (z, q),
            None => (item, "1"),
        };
        let bad = || {
            format!(
                "\"{item}\" is not a gear; wanted tooth counts from {MIN_TEETH} to {MAX_TEETH}, ZxN for N of \
                 one count, such as 20 25 40x2 127"
            )
        };
        let z: u32 = teeth.parse().map_err(|_| bad())?;
        let q: u32 = count.parse().map_err(|_| bad())?;
        if !(MIN_TEETH..=MAX_TEETH).contains(&z) || q == 0 {
            return Err(bad());
        }
        match out.iter_mut().find(|g| g.0 == z) {
            Some(g) => g.1 = g.1.checked_add(q).ok_or_else(bad)?,
            None => out.push((z, q)),
        }
    }
    if out.is_empty() {
        return Err("no gears; wanted tooth counts such as 20 25 40x2 127".into());
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn write(text: &str) -> (tempfile::TempDir, PathBuf) {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("shop.lathe");
        std::fs::write(&p, text).unwrap();
        (dir, p)
    }

    #[test]
    fn a_whole_lathe_reads() {
        let (_d, p) = write(
            "name = test lathe\nleadscrew = 8tpi\nstud_ratio = 1/2\ngearbox = A=2, B=1\n\
             gears = 20 25 40x2, 127\nmodule_mm = 1.5\nlargest_teeth = 127\ntumbler_reverse = no\n\
             stud_to_leadscrew_mm = 120\nslot_mm = 45..150\nslot_mm = 60..140\nshaft_diameter_mm = 20\n\
             dial_teeth = 16\ndial_marks = 8\n",
        );
        let l = load_lathe(&p).unwrap();
        assert_eq!(l.name.as_deref(), Some("test lathe"));
        assert_eq!(l.leadscrew.as_ref().unwrap().mm.value.to_string(), "127/40");
        assert_eq!(l.stud_ratio.unwrap().to_string(), "1/2");
        assert_eq!(l.gearbox.len(), 2);
        assert_eq!(l.gears, Some(GearsOnHand::Listed(vec![(20, 1), (25, 1), (40, 2), (127, 1)])));
        assert_eq!((l.largest_teeth, l.tumbler_reverse), (Some(127), Some(false)));
        let b = l.banjo.as_ref().unwrap();
        assert_eq!(b.slots.len(), 2);
        assert_eq!((b.slots[1].lo, b.slots[1].hi), (60.0, 140.0));
        let stock = l.stock(None, None).unwrap().unwrap();
        assert_eq!(stock.iter().map(|g| g.quantity).sum::<u32>(), 5);
        assert_eq!(stock[0].module_mm, 1.5);
        assert_eq!(l.dial, Some(Dial::new(16, 8).unwrap()));
    }

    #[test]
    fn errors_name_the_file_the_line_and_the_key() {
        let cases: &[(&str, &str)] = &[
            ("leadscrew = 8\n", "line 1: leadscrew: \"8\" is not a leadscrew pitch"),
            ("# c\n\nspeed = 3\n", "line 3: unknown key \"speed\"; known keys are name, leadscrew,"),
            ("leadscrew = 8tpi\nleadscrew = 6tpi\n", "line 2: leadscrew: given twice"),
            ("gears = 20 25 x\n", "line 1: gears: \"x\" is not a gear"),
            ("gears = 20 2\n", "line 1: gears: \"2\" is not a gear"),
            ("tumbler_reverse = maybe\n", "line 1: tumbler_reverse: wanted yes or no"),
            ("slot_mm = 90..60\n", "line 1: slot_mm: \"90..60\" is inverted"),
            ("slot_mm = 60..\n", "line 1: slot_mm: wanted LO..HI mm with an upper end"),
            ("module_mm = -1\n", "line 1: module_mm: \"-1\" is negative"),
            ("leadscrew 8tpi\n", "line 1: wanted key = value, found \"leadscrew 8tpi\""),
            ("largest_teeth = 2000\n", "line 1: largest_teeth: wanted a whole number from"),
            ("stud_to_leadscrew_mm = 120\nslot_mm = 40..90\n", ": a banjo needs stud_to_leadscrew_mm, slot_mm and shaft_diameter_mm; shaft_diameter_mm is missing"),
            ("dial_teeth = 16\n", ": dial_teeth is given without dial_marks"),
            ("\n# nothing\n", ": no keys"),
        ];
        for (text, wanted) in cases {
            let (_d, p) = write(text);
            let e = load_lathe(&p).unwrap_err().to_string();
            let head = format!("the lathe: lathe file {}", p.display());
            assert!(e.starts_with(&head), "{text:?}: {e}");
            assert!(e[head.len()..].trim_start_matches(", ").starts_with(wanted), "{text:?}: {e}");
            assert_eq!(e.matches("the lathe").count(), 1, "{e}");
        }
        let e = load_lathe(Path::new("/no/such.lathe")).unwrap_err().to_string();
        assert!(e.starts_with("the lathe: lathe file /no/such.lathe: cannot read it"), "{e}");
    }

    #[test]
    fn listed_gears_need_a_module_and_a_catalogue_is_found_beside_the_file() {
        let (d, p) = write("gears = 20 40\n");
        let l = load_lathe(&p).unwrap();
        let e = l.stock(None, None).unwrap_err().to_string();
        assert!(e.contains("gears are listed without module_mm"), "{e}");
        assert_eq!(l.stock(Some(1.0), None).unwrap().unwrap()[0].module_mm, 1.0);
        std::fs::write(d.path().join("set.csv"), "teeth,module\n20,1\n40,1\n").unwrap();
        std::fs::write(&p, "stock = set.csv\n").unwrap();
        let l = load_lathe(&p).unwrap();
        assert_eq!(l.stock(None, None).unwrap().unwrap().len(), 2);
    }
}
