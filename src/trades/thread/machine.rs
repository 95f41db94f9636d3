//! The lathe's drive to the leadscrew: spindle → a fixed ratio to the stud → the change-gear
//! train → optionally one position of a gearbox → leadscrew. Owns that arithmetic (which train
//! ratio a lead needs, which lead a train cuts) and the gearbox list syntax; knows nothing of the
//! banjo or the search.
//!
//! Every ratio follows the library's convention (ISO 1122-1): input turns per output turn. So the
//! stud ratio is spindle turns per stud turn, a train's ratio is stud turns per turn of the
//! leadscrew gear, and a gearbox position's ratio is turns of its input per leadscrew turn. The
//! lead cut per spindle turn is then `leadscrew pitch / (stud ratio · train ratio · gearbox)`.

use std::path::Path;

use super::pitch::Pitch;
use crate::error::{Error, Message, Quantity, Result};
use crate::numbers::exact::Exact;
use crate::numbers::rational::Ratio;
use crate::numbers::target::parse_ratio;

/// One fixed position of a gearbox between the change gears and the leadscrew.
#[derive(Debug, Clone, PartialEq)]
pub struct GearboxPosition {
    /// Its name on the machine (`A`, `2`, `high`).
    pub name: String,
    /// Input turns per leadscrew turn.
    pub ratio: Ratio,
}

/// The drive from spindle to leadscrew.
#[derive(Debug, Clone, PartialEq)]
pub struct Machine {
    /// The leadscrew's pitch (one start).
    pub leadscrew: Pitch,
    /// Spindle turns per stud turn (1 on most lathes).
    pub stud_ratio: Ratio,
    /// Gearbox positions; empty when the change gears drive the leadscrew directly.
    pub gearbox: Vec<GearboxPosition>,
}

impl Machine {
    /// The positions to try: each gearbox position, or one direct drive (`None`).
    pub fn positions(&self) -> Vec<Option<&GearboxPosition>> {
        if self.gearbox.is_empty() {
            vec![None]
        } else {
            self.gearbox.iter().map(Some).collect()
        }
    }

    fn fixed(&self, position: Option<&GearboxPosition>) -> Exact {
        let g = position.map_or(Ratio::integer(1), |p| p.ratio);
        Exact::of(self.stud_ratio).times(Exact::of(g))
    }

    /// The change-gear ratio that cuts `lead_mm` per spindle turn through `position`.
    pub fn train_ratio_for(&self, lead_mm: Exact, position: Option<&GearboxPosition>) -> Exact {
        self.leadscrew.mm.over(lead_mm.times(self.fixed(position)))
    }

    /// The lead (mm per spindle turn) a change-gear train of ratio `train` cuts through
    /// `position`.
    pub fn lead_cut_mm(&self, train: Ratio, position: Option<&GearboxPosition>) -> Exact {
        self.leadscrew.mm.over(Exact::of(train).times(self.fixed(position)))
    }
}

/// Parse a gearbox list: `A=2,B=1,C=1/2`, or bare ratios `2,1,1/2` named 1, 2, 3 in order.
/// Errors name [`Quantity::Gearbox`] and the position.
pub fn parse_gearbox_list(text: &str) -> Result<Vec<GearboxPosition>> {
    let mut out: Vec<GearboxPosition> = Vec::new();
    for (i, item) in text.split(',').enumerate() {
        let item = item.trim();
        let (name, ratio) = match item.split_once('=') {
            Some((n, r)) => (n.trim().to_string(), r.trim()),
            None => ((i + 1).to_string(), item),
        };
        let place = Message::from(format!("position {}", i + 1));
        out.push(position(&name, ratio, &place)?);
        check_unique(&out, &place)?;
    }
    Ok(out)
}

/// One position; `place` says where it was given, at the head of each error.
fn position(name: &str, ratio: &str, place: &Message) -> Result<GearboxPosition> {
    let bad = |why: String| Error::value(Quantity::Gearbox, place.clone().text(format!(": {why}")));
    if name.is_empty() {
        return Err(bad("the position has no name".into()));
    }
    let ratio = parse_ratio(ratio, Quantity::Gearbox).map_err(|_| {
        bad(format!(
            "\"{ratio}\" is not a ratio; wanted NAME=RATIO such as A=1/2 (input turns per leadscrew turn)"
        ))
    })?;
    Ok(GearboxPosition { name: name.to_string(), ratio })
}

fn check_unique(out: &[GearboxPosition], place: &Message) -> Result<()> {
    let last = &out[out.len() - 1];
    if out[..out.len() - 1].iter().any(|p| p.name == last.name) {
        let twice = place.clone().text(format!(": position {} is named twice", last.name));
        return Err(Error::value(Quantity::Gearbox, twice));
    }
    Ok(())
}

/// Read a gearbox given either way: the file of that name when there is one, else a list as
/// for [`parse_gearbox_list`]. Text that is neither (a file name that does not exist) is
/// refused as such rather than read as a list. Errors name [`Quantity::Gearbox`].
pub fn parse_gearbox(text: &str) -> Result<Vec<GearboxPosition>> {
    let path = Path::new(text);
    if path.is_dir() {
        return Err(Error::value(
            Quantity::Gearbox,
            format!(
                "{text} is a folder; wanted a file of NAME = RATIO lines, or a list such as A=2,B=1,C=1/2"
            ),
        ));
    }
    if path.is_file() {
        return load_gearbox(path);
    }
    let t = text.trim();
    let looks_like_a_list = t.contains(['=', ',']) || parse_ratio(t, Quantity::Gearbox).is_ok();
    if !looks_like_a_list {
        return Err(Error::value(
            Quantity::Gearbox,
            format!(
                "there is no file \"{t}\", and it is not a list; wanted a file of NAME = RATIO lines, or \
                 a list NAME=RATIO,… such as A=2,B=1,C=1/2"
            ),
        ));
    }
    parse_gearbox_list(text)
}

/// Read a gearbox file: one `NAME = RATIO` a line, `#` starts a comment. Errors name
/// [`Quantity::Gearbox`], the file and the line.
pub fn load_gearbox(path: &Path) -> Result<Vec<GearboxPosition>> {
    let bad = |why: String| Error::value(Quantity::Gearbox, why);
    let text = std::fs::read_to_string(path)
        .map_err(|e| bad(format!("gearbox file {}: cannot read it: {e}", path.display())))?;
    let mut out = Vec::new();
    for (n, line) in text.lines().enumerate() {
        let line = line.split('#').next().unwrap_or("").trim();
        if line.is_empty() {
            continue;
        }
        let place = format!("gearbox file {}, line {}", path.display(), n + 1);
        let Some((name, ratio)) = line.split_once('=') else {
            return Err(bad(format!("{place}: wanted NAME = RATIO such as A = 1/2, found \"{line}\"")));
        };
        let place = Message::from(place);
        out.push(position(name.trim(), ratio.trim(), &place)?);
        check_unique(&out, &place)?;
    }
    if out.is_empty() {
        return Err(bad(format!("gearbox file {}: no positions; wanted lines NAME = RATIO", path.display())));
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::trades::thread::pitch::{parse_leadscrew, parse_pitch};

    fn lathe(ls: &str) -> Machine {
        Machine {
            leadscrew: parse_leadscrew(ls).unwrap(),
            stud_ratio: Ratio::integer(1),
            gearbox: Vec::new(),
        }
    }

    fn need(ls: &str, pitch: &str) -> String {
        let lead = parse_pitch(pitch).unwrap().mm;
        lathe(ls).train_ratio_for(lead, None).value.to_string()
    }

    #[test]
    fn published_train_ratios() {
        // "Turning and Boring": 3 mm on a 6-per-inch leadscrew needs 90 on the stud, 127 on the
        // screw: i = 127/90.
        assert_eq!(need("6tpi", "3mm"), "127/90");
        // "American Mechanic": 5 per inch on a 2-per-inch screw, 40 on the spindle, 100 on the
        // screw: 5/2.
        assert_eq!(need("2tpi", "5tpi"), "5/2");
        // "Construction Tools": 4 on 2 → 20 and 40; 7 on 1 → 20 and 140; 2.3 on 1.8 with a
        // 20 wheel needs 25.555… teeth.
        assert_eq!(need("2tpi", "4tpi"), "2");
        assert_eq!(need("1tpi", "7tpi"), "7");
        let r = lathe("1.8tpi").train_ratio_for(parse_pitch("2.3tpi").unwrap().mm, None).value;
        assert_eq!(r.to_string(), "23/18");
        let on_20 = Ratio::new(20 * r.num() as u128, r.den() as u128).unwrap();
        assert_ne!(on_20.den(), 1, "not a whole number of teeth");
        assert!((on_20.to_f64() - 25.555).abs() < 1e-3);
        // "Modern Machine Shop Practice": 4 × 66/48 × 36/18 = 11 per inch.
        assert_eq!(need("4tpi", "11tpi"), "11/4");
        assert_eq!(Ratio::new(66 * 36, 48 * 18).unwrap().to_string(), need("4tpi", "11tpi"));
    }

    #[test]
    fn lead_cut_inverts_train_ratio() {
        let mut m = lathe("8tpi");
        m.stud_ratio = Ratio::new(1, 2).unwrap();
        m.gearbox = parse_gearbox_list("A=2,B=1,C=1/2").unwrap();
        let lead = parse_pitch("1.25mm").unwrap().mm;
        for p in m.positions() {
            let i = m.train_ratio_for(lead, p);
            assert!(i.exact);
            assert_eq!(m.lead_cut_mm(i.value, p).value.to_string(), "5/4");
        }
    }

    #[test]
    fn gearbox_lists_parse_and_refuse() {
        let g = parse_gearbox_list("1, 2 ,1/2").unwrap();
        assert_eq!(g[2].name, "3");
        assert_eq!(g[2].ratio.to_string(), "1/2");
        for bad in ["A=1,A=2", "A=x", "=2", "1,,2"] {
            let e = parse_gearbox_list(bad).unwrap_err().to_string();
            assert!(e.starts_with("the gearbox: position "), "{bad}: {e}");
            assert_eq!(e.matches("gearbox").count(), 1, "{e}");
        }
        assert_eq!(
            parse_gearbox_list("A=1,A=2").unwrap_err().to_string(),
            "the gearbox: position 2: position A is named twice"
        );
    }

    #[test]
    fn a_gearbox_is_a_file_or_a_list_never_a_missing_file_read_as_a_list() {
        assert_eq!(parse_gearbox("A=2,B=1/2").unwrap().len(), 2);
        assert_eq!(parse_gearbox("2").unwrap()[0].name, "1");
        let e = parse_gearbox("nosuchfile").unwrap_err().to_string();
        assert_eq!(
            e,
            "the gearbox: there is no file \"nosuchfile\", and it is not a list; wanted a file of NAME = \
             RATIO lines, or a list NAME=RATIO,… such as A=2,B=1,C=1/2"
        );
        let dir = tempfile::tempdir().unwrap();
        let file = dir.path().join("box");
        std::fs::write(&file, "A = 2\nB = 1/2\n").unwrap();
        assert_eq!(parse_gearbox(&file.to_string_lossy()).unwrap()[1].ratio.to_string(), "1/2");
        let e = parse_gearbox(&dir.path().to_string_lossy()).unwrap_err().to_string();
        assert!(e.contains("is a folder; wanted a file of NAME = RATIO lines"), "{e}");
    }
}
