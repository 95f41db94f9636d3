//! Whether a change-gear train can actually be set up on the banjo (the swinging arm that carries
//! the intermediate stud between the stud and the leadscrew). Owns the setup geometry and the
//! reasons a setup is rejected; knows nothing of pitches.
//!
//! The model, stated so it can be checked against a real machine:
//! - the stud and leadscrew axes are a fixed distance apart;
//! - the banjo swings about the leadscrew axis and its slot holds the intermediate stud at a
//!   distance from the leadscrew within a range; the swing is taken to be free enough to close
//!   any triangle the distances allow;
//! - centre distances are standard, `a = m·(z1 + z2)/2`; tips reach `m·(z + 2)/2` (addendum one
//!   module) and roots `m·(z − 2.5)/2` (dedendum 1.25 module) — common practice;
//! - every gear must fit its shaft: its root radius must exceed the shaft/spacer radius;
//! - a compound train's two meshes sit in two planes. The shaft of whichever axis carries its
//!   gear in the outer plane passes through the inner plane, so the inner plane's gears must
//!   clear that shaft (tip radius plus shaft radius at most the distance to its axis);
//! - a simple train sits in one plane: the stud gear and the leadscrew gear must not touch, and
//!   an idler from the spare stock bridges them.
//!
//! Trains of three or more stages need more than one intermediate stud, which this model does not
//! place: for them only the closure of the chain and the shaft fit are checked.

use std::path::Path;

use crate::error::{Error, Message, Quantity, Result};
use crate::model::pool::{fmt_num, Pool};
use crate::model::train::{standard_centre_distance_mm, Train};
use crate::numbers::length::{parse_length, LengthUnit};
use crate::numbers::range::{parse_length_range, FloatRange};

/// Slack for distances computed in floating point, mm.
const SLACK_MM: f64 = 1e-9;

/// The fixed geometry of a lathe's banjo.
#[derive(Debug, Clone, PartialEq)]
pub struct Banjo {
    /// Distance between the stud and leadscrew axes, mm.
    pub stud_to_leadscrew_mm: f64,
    /// Distances from the leadscrew axis the intermediate stud can take, mm.
    pub intermediate_from_leadscrew_mm: FloatRange,
    /// Diameter of the shafts and the spacers on them, mm; gears must clear it.
    pub shaft_diameter_mm: f64,
}

/// How a train was placed on the banjo (or, with no banjo given, the order it is shown in).
#[derive(Debug, Clone, PartialEq)]
pub struct Fit {
    /// Indices of the train's stages from the stud to the leadscrew.
    pub order: Vec<usize>,
    /// Teeth of the idler bridging a one-stage train, when one is used.
    pub idler: Option<u32>,
    /// For a two-stage train: true when the stud mesh is the inner plane.
    pub stud_mesh_inner: Option<bool>,
    /// Where the intermediate (or idler) stud sits, mm from the leadscrew axis.
    pub intermediate_from_leadscrew_mm: Option<f64>,
}

impl Fit {
    /// The plain order, nothing placed (no banjo to check against).
    pub fn unchecked(train: &Train) -> Fit {
        Fit {
            order: (0..train.stages.len()).collect(),
            idler: None,
            stud_mesh_inner: None,
            intermediate_from_leadscrew_mm: None,
        }
    }
}

fn tip_mm(m: f64, z: u32) -> f64 {
    m * (z as f64 + 2.0) / 2.0
}

fn root_mm(m: f64, z: u32) -> f64 {
    m * (z as f64 - 2.5) / 2.0
}

impl Banjo {
    /// Check the numbers make a banjo; `place` makes the error for the quantity at fault, naming
    /// where the numbers came from.
    pub fn new(
        stud_to_leadscrew_mm: f64,
        intermediate_from_leadscrew_mm: FloatRange,
        shaft_diameter_mm: f64,
        place: &dyn Fn(Quantity, String) -> Error,
    ) -> Result<Banjo> {
        for (v, quantity) in
            [(stud_to_leadscrew_mm, Quantity::StudToLeadscrew), (shaft_diameter_mm, Quantity::ShaftDiameter)]
        {
            if !v.is_finite() || v <= 0.0 {
                return Err(place(quantity, format!("wanted a positive distance in mm, found {v}")));
            }
        }
        if !intermediate_from_leadscrew_mm.hi.is_finite() {
            return Err(place(Quantity::IntermediateRange, "wanted LO..HI mm with an upper end".into()));
        }
        Ok(Banjo { stud_to_leadscrew_mm, intermediate_from_leadscrew_mm, shaft_diameter_mm })
    }

    /// One-line description for reports.
    pub fn describe(&self) -> String {
        let r = &self.intermediate_from_leadscrew_mm;
        format!(
            "stud {} mm from the leadscrew, intermediate stud {}..{} mm from the leadscrew, \
             shafts and spacers {} mm",
            fmt_num(self.stud_to_leadscrew_mm),
            fmt_num(r.lo),
            fmt_num(r.hi),
            fmt_num(self.shaft_diameter_mm)
        )
    }

    /// Place `train` on the banjo, trying each stage nearer the stud and each plane inner, and
    /// (for one stage) each spare gear of `pool` as the idler. `Err` lists why every
    /// arrangement failed.
    pub fn fit(&self, train: &Train, pool: &Pool) -> std::result::Result<Fit, Vec<String>> {
        let c = self.shaft_diameter_mm / 2.0;
        let mut why = Vec::new();
        for s in &train.stages {
            for z in [s.driver.teeth, s.driven.teeth] {
                let rf = root_mm(s.module_mm, z);
                if rf <= c {
                    why.push(format!(
                        "the {z}-tooth gear (root radius {} mm) does not fit over a {} mm shaft",
                        fmt_num(rf),
                        fmt_num(self.shaft_diameter_mm)
                    ));
                }
            }
        }
        if !why.is_empty() {
            return Err(why);
        }
        match train.stages.len() {
            1 => self.fit_simple(train, pool),
            2 => self.fit_compound(train),
            _ => self.fit_chain(train),
        }
    }

    fn slot_reason(&self, r: f64) -> Option<String> {
        let s = &self.intermediate_from_leadscrew_mm;
        (!s.contains(r, SLACK_MM)).then(|| {
            format!(
                "the intermediate stud would sit {} mm from the leadscrew, outside the slot \
                 {}..{} mm",
                fmt_num(r),
                fmt_num(s.lo),
                fmt_num(s.hi)
            )
        })
    }

    fn closure_reason(&self, a1: f64, a2: f64) -> Option<String> {
        let d = self.stud_to_leadscrew_mm;
        if a1 + a2 + SLACK_MM < d {
            Some(format!(
                "the meshes reach {} mm, short of the {} mm from stud to leadscrew",
                fmt_num(a1 + a2),
                fmt_num(d)
            ))
        } else if (a1 - a2).abs() > d + SLACK_MM {
            Some(format!(
                "the centre distances {} and {} mm differ by more than the {} mm from stud to \
                 leadscrew",
                fmt_num(a1),
                fmt_num(a2),
                fmt_num(d)
            ))
        } else {
            None
        }
    }

    fn fit_simple(&self, train: &Train, pool: &Pool) -> std::result::Result<Fit, Vec<String>> {
        let s = &train.stages[0];
        let (m, za, zd) = (s.module_mm, s.driver.teeth, s.driven.teeth);
        let d = self.stud_to_leadscrew_mm;
        let direct = standard_centre_distance_mm(m, za, zd);
        if (direct - d).abs() <= 1e-6 {
            return Ok(Fit {
                order: vec![0],
                idler: None,
                stud_mesh_inner: None,
                intermediate_from_leadscrew_mm: None,
            });
        }
        let (ta, td) = (tip_mm(m, za), tip_mm(m, zd));
        if ta + td > d + SLACK_MM {
            return Err(vec![format!(
                "{za}→{zd} in one plane: the stud and leadscrew gears (tips {} and {} mm) would \
                 touch {} mm apart",
                fmt_num(ta),
                fmt_num(td),
                fmt_num(d)
            )]);
        }
        let idlers = spare_idlers(train, pool);
        if idlers.is_empty() {
            return Err(vec![format!(
                "{za}→{zd}: no spare gear of the same module and pressure angle to use as an idler"
            )]);
        }
        let c = self.shaft_diameter_mm / 2.0;
        let mut why = Vec::new();
        for zi in idlers {
            let (a1, a2) = (standard_centre_distance_mm(m, za, zi), standard_centre_distance_mm(m, zi, zd));
            let reason = if root_mm(m, zi) <= c {
                Some("does not fit over the shaft".to_string())
            } else {
                self.slot_reason(a2).or_else(|| self.closure_reason(a1, a2))
            };
            match reason {
                None => {
                    return Ok(Fit {
                        order: vec![0],
                        idler: Some(zi),
                        stud_mesh_inner: None,
                        intermediate_from_leadscrew_mm: Some(a2),
                    })
                }
                Some(r) => why.push(format!("{za}→{zd} through a {zi} idler: {r}")),
            }
        }
        Err(why)
    }

    fn fit_compound(&self, train: &Train) -> std::result::Result<Fit, Vec<String>> {
        let c = self.shaft_diameter_mm / 2.0;
        let d = self.stud_to_leadscrew_mm;
        let mut why = Vec::new();
        for order in [[0usize, 1], [1, 0]] {
            let (s1, s2) = (&train.stages[order[0]], &train.stages[order[1]]);
            let (a1, a2) = (s1.centre_distance_mm(), s2.centre_distance_mm());
            let name = format!(
                "{}→{} at the stud, {}→{} at the leadscrew",
                s1.driver.teeth, s1.driven.teeth, s2.driver.teeth, s2.driven.teeth
            );
            if let Some(r) = self.slot_reason(a2).or_else(|| self.closure_reason(a1, a2)) {
                why.push(format!("{name}: {r}"));
                continue;
            }
            for stud_inner in [true, false] {
                // The gears of the inner plane, the shaft that passes them, its distance from
                // the intermediate stud.
                let (fixed, moving, shaft, reach) = if stud_inner {
                    (&s1.driver, &s1.driven, "leadscrew", a2)
                } else {
                    (&s2.driven, &s2.driver, "stud", a1)
                };
                let m = if stud_inner { s1.module_mm } else { s2.module_mm };
                let (tf, tm) = (tip_mm(m, fixed.teeth), tip_mm(m, moving.teeth));
                let plane = if stud_inner { "stud mesh inner" } else { "leadscrew mesh inner" };
                let reason = if tm + c > reach + SLACK_MM {
                    Some(format!(
                        "the {}-tooth intermediate gear (tip {} mm) fouls the {shaft} shaft {} mm \
                         from its centre",
                        moving.teeth,
                        fmt_num(tm),
                        fmt_num(reach)
                    ))
                } else if tf + c > d + SLACK_MM {
                    Some(format!(
                        "the {}-tooth gear (tip {} mm) fouls the {shaft} shaft {} mm away",
                        fixed.teeth,
                        fmt_num(tf),
                        fmt_num(d)
                    ))
                } else {
                    None
                };
                match reason {
                    None => {
                        return Ok(Fit {
                            order: order.to_vec(),
                            idler: None,
                            stud_mesh_inner: Some(stud_inner),
                            intermediate_from_leadscrew_mm: Some(a2),
                        })
                    }
                    Some(r) => why.push(format!("{name}, {plane}: {r}")),
                }
            }
        }
        Err(why)
    }

    fn fit_chain(&self, train: &Train) -> std::result::Result<Fit, Vec<String>> {
        let links: Vec<f64> = train.stages.iter().map(|s| s.centre_distance_mm()).collect();
        let d = self.stud_to_leadscrew_mm;
        let sum: f64 = links.iter().sum::<f64>() + d;
        let longest = links.iter().copied().fold(d, f64::max);
        if longest > sum - longest + SLACK_MM {
            return Err(vec![format!(
                "the chain of centre distances {} mm cannot close over the {} mm from stud to \
                 leadscrew",
                links.iter().map(|a| fmt_num(*a)).collect::<Vec<_>>().join(" + "),
                fmt_num(d)
            )]);
        }
        Ok(Fit::unchecked(train))
    }
}

/// Where the shafts of a setup sit on the banjo, in mm in the plane of the gears: the leadscrew
/// axis at the origin, the stud on the negative x axis at the stud-to-leadscrew distance, and
/// the intermediate (or idler) stud, when there is one, above that line (y ≥ 0). Of the two
/// points at the right distances from both axes the upper one is taken: a fixed choice, so
/// pictures of setups compare; the lower one is its mirror image and serves as well.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Placement {
    /// The stud axis, mm.
    pub stud: [f64; 2],
    /// The intermediate or idler stud, mm; `None` when the stud gear meshes the leadscrew gear
    /// directly.
    pub intermediate: Option<[f64; 2]>,
    /// The leadscrew axis (the origin), mm.
    pub leadscrew: [f64; 2],
}

impl Placement {
    /// The axes in order from the stud to the leadscrew.
    pub fn shafts(&self) -> Vec<[f64; 2]> {
        let mut out = vec![self.stud];
        out.extend(self.intermediate);
        out.push(self.leadscrew);
        out
    }
}

impl Banjo {
    /// The intermediate stud's centre, mm, when it sits `intermediate_from_leadscrew_mm` from
    /// the leadscrew and `stud_mesh_mm` (the stud-side centre distance) from the stud: the upper
    /// meeting point of the two circles (see [`Placement`]). `None` when the circles do not
    /// meet (the triangle does not close).
    pub fn intermediate_at(
        &self,
        stud_mesh_mm: f64,
        intermediate_from_leadscrew_mm: f64,
    ) -> Option<[f64; 2]> {
        let (d, a, r) = (self.stud_to_leadscrew_mm, stud_mesh_mm, intermediate_from_leadscrew_mm);
        // |P| = r and |P − (−d, 0)| = a give r² + 2·d·x + d² = a².
        let x = (a * a - r * r - d * d) / (2.0 * d);
        let y2 = r * r - x * x;
        // A triangle closed to within the fit's slack is flat, not open.
        if y2 < -2.0 * r.max(a) * SLACK_MM {
            return None;
        }
        Some([x, y2.max(0.0).sqrt()])
    }

    /// Where the shafts of `train`, placed on this banjo as `fit` says, sit. `None` for a train
    /// this model does not place (three or more stages) or a fit that does not close.
    pub fn placement(&self, train: &Train, fit: &Fit) -> Option<Placement> {
        let stud = [-self.stud_to_leadscrew_mm, 0.0];
        let leadscrew = [0.0, 0.0];
        let first = train.stages.get(*fit.order.first()?)?;
        let stud_mesh_mm = match (train.stages.len(), fit.idler) {
            (1, Some(zi)) => standard_centre_distance_mm(first.module_mm, first.driver.teeth, zi),
            (1, None) => return Some(Placement { stud, intermediate: None, leadscrew }),
            (2, _) => first.centre_distance_mm(),
            _ => return None,
        };
        let r = fit.intermediate_from_leadscrew_mm?;
        let intermediate = Some(self.intermediate_at(stud_mesh_mm, r)?);
        Some(Placement { stud, intermediate, leadscrew })
    }
}

/// Tooth counts of the gears left over once `train` has taken its own, in the mesh group of a
/// one-stage train, ascending: the candidates for an idler.
pub fn spare_idlers(train: &Train, pool: &Pool) -> Vec<u32> {
    let s = &train.stages[0];
    let Some(group) = pool.groups.iter().position(|g| g.meshes_with(s.module_mm, s.pressure_angle_deg))
    else {
        return Vec::new();
    };
    let mut out: Vec<u32> = pool
        .gears
        .iter()
        .filter(|k| k.group == group)
        .filter(|k| {
            let used = [s.driver.teeth, s.driven.teeth].iter().filter(|&&z| z == k.teeth).count() as u32;
            k.quantity.is_none_or(|q| q > used)
        })
        .map(|k| k.teeth)
        .collect();
    out.sort_unstable();
    out
}

/// Read a banjo file: `key = value` lines (`#` starts a comment) with the keys
/// `stud_to_leadscrew_mm`, `intermediate_from_leadscrew_mm` (`LO..HI`) and `shaft_diameter_mm`.
/// Errors name [`Quantity::Banjo`], the file, line and key.
pub fn load_banjo(path: &Path) -> Result<Banjo> {
    let name = path.display().to_string();
    let text = std::fs::read_to_string(path)
        .map_err(|e| Error::value(Quantity::Banjo, format!("banjo file {name}: cannot read it: {e}")))?;
    let (mut dist, mut range, mut shaft) = (None, None, None);
    for (n, line) in text.lines().enumerate() {
        let line = line.split('#').next().unwrap_or("").trim();
        if line.is_empty() {
            continue;
        }
        let place = format!("banjo file {name}, line {}", n + 1);
        let Some((key, value)) = line.split_once('=') else {
            return Err(Error::value(
                Quantity::Banjo,
                format!("{place}: wanted key = value, found \"{line}\""),
            ));
        };
        let (key, value) = (key.trim(), value.trim());
        // The file's own errors name the banjo once, then the file, line and key.
        let at_key = |e: Error| {
            Error::value(Quantity::Banjo, Message::from(format!("{place}: {key}: ")).then(e.detail()))
        };
        let number = || -> Result<f64> {
            Ok(parse_length(value, Quantity::Banjo, Some(LengthUnit::Millimetre)).map_err(at_key)?.mm_f64())
        };
        match key {
            "stud_to_leadscrew_mm" => dist = Some(number()?),
            "shaft_diameter_mm" => shaft = Some(number()?),
            "intermediate_from_leadscrew_mm" => {
                range = Some(parse_length_range(value, Quantity::Banjo).map_err(at_key)?)
            }
            _ => {
                return Err(Error::value(
                    Quantity::Banjo,
                    format!(
                        "{place}: unknown key \"{key}\"; known keys are stud_to_leadscrew_mm, \
                         intermediate_from_leadscrew_mm, shaft_diameter_mm"
                    ),
                ))
            }
        }
    }
    let missing = |k: &str| Error::value(Quantity::Banjo, format!("banjo file {name}: {k} is missing"));
    Banjo::new(
        dist.ok_or_else(|| missing("stud_to_leadscrew_mm"))?,
        range.ok_or_else(|| missing("intermediate_from_leadscrew_mm"))?,
        shaft.ok_or_else(|| missing("shaft_diameter_mm"))?,
        &|q, m| Error::value(Quantity::Banjo, format!("banjo file {name}: {}: {m}", file_label(q))),
    )
}

/// What a banjo file's errors call the banjo's numbers: the short names, not the file's keys.
fn file_label(quantity: Quantity) -> &'static str {
    match quantity {
        Quantity::StudToLeadscrew => "stud-to-leadscrew",
        Quantity::IntermediateRange => "intermediate-range",
        Quantity::ShaftDiameter => "shaft-diameter",
        other => other.name(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::pool::StockGear;
    use crate::model::train::Stage;
    use crate::numbers::rational::{Ratio, RelError};

    fn stage(a: u32, b: u32) -> Stage {
        Stage::plain(a, b, 1.5, 20.0)
    }

    fn train(stages: Vec<Stage>) -> Train {
        let r = Ratio::integer(1);
        Train { stages, ratio: r, error: RelError::of(1, 1, r) }
    }

    fn pool(teeth: &[u32]) -> Pool {
        let g: Vec<StockGear> = teeth
            .iter()
            .map(|&t| StockGear {
                teeth: t,
                module_mm: 1.5,
                diametral_pitch: None,
                pressure_angle_deg: 20.0,
                quantity: 1,
                label: String::new(),
                made: Some(Default::default()),
                internal: false,
            })
            .collect();
        Pool::from_stock(&g, "t").unwrap()
    }

    fn banjo() -> Banjo {
        Banjo {
            stud_to_leadscrew_mm: 120.0,
            intermediate_from_leadscrew_mm: FloatRange { lo: 45.0, hi: 150.0 },
            shaft_diameter_mm: 20.0,
        }
    }

    #[test]
    fn banjo_file_errors_name_the_banjo_the_file_and_the_key() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("b.banjo");
        let f = p.display();
        std::fs::write(
            &p,
            "stud_to_leadscrew_mm = 120\nintermediate_from_leadscrew_mm = 60..\nshaft_diameter_mm = 16\n",
        )
        .unwrap();
        let e = load_banjo(&p).unwrap_err().to_string();
        assert_eq!(
            e,
            format!("the banjo: banjo file {f}: intermediate-range: wanted LO..HI mm with an upper end")
        );
        std::fs::write(&p, "intermediate_from_leadscrew_mm = 90..60\n").unwrap();
        let e = load_banjo(&p).unwrap_err().to_string();
        let inverted = "\"90..60\" is inverted (LO > HI); wanted LO..HI or one length, in mm such as 40..80 \
                        or 75 (or with units: 1.5in..3in), above 0, LO ≤ HI";
        // The banjo is named once, at the head; the rest says where in the file.
        assert_eq!(
            e,
            format!("the banjo: banjo file {f}, line 1: intermediate_from_leadscrew_mm: {inverted}")
        );
        std::fs::write(&p, "stud_to_leadscrew_mm = 4.5in\nshaft_diameter_mm = -3\n").unwrap();
        let e = load_banjo(&p).unwrap_err().to_string();
        assert!(
            e.starts_with(&format!(
                "the banjo: banjo file {f}, line 2: shaft_diameter_mm: \"-3\" is negative"
            )),
            "{e}"
        );
        assert_eq!(e.matches("the banjo").count(), 1, "{e}");
    }

    #[test]
    fn compound_closes_the_triangle_or_says_why() {
        // 20→60 (60 mm) and 40→80 (90 mm): 150 ≥ 120 ≥ 30, intermediate stud 90 mm from the
        // leadscrew with 40→80 there.
        let t = train(vec![stage(20, 60), stage(40, 80)]);
        let f = banjo().fit(&t, &pool(&[20, 60, 40, 80])).unwrap();
        assert_eq!(f.order, vec![0, 1]);
        assert_eq!(f.intermediate_from_leadscrew_mm, Some(90.0));
        // 20→25 (33.75) and 20→30 (37.5): either way round the intermediate stud would sit
        // inside 45 mm of the leadscrew; with a longer slot, 71.25 mm cannot reach 120 mm.
        let t = train(vec![stage(20, 25), stage(20, 30)]);
        let why = banjo().fit(&t, &pool(&[20, 25, 30])).unwrap_err();
        assert_eq!(why.len(), 2);
        assert!(why.iter().all(|w| w.contains("outside the slot 45..150 mm")), "{why:?}");
        let long_slot =
            Banjo { intermediate_from_leadscrew_mm: FloatRange { lo: 20.0, hi: 150.0 }, ..banjo() };
        let why = long_slot.fit(&t, &pool(&[20, 25, 30])).unwrap_err();
        assert!(why.iter().all(|w| w.contains("short of the 120 mm")), "{why:?}");
    }

    #[test]
    fn the_inner_plane_must_clear_the_far_shaft() {
        // 20→100 (90 mm) at the stud, 20→30 (37.5 mm) at the leadscrew: slot needs 45 mm, so
        // the other order, 20→30 at the stud, 20→100 at the leadscrew (90 mm from it), is tried.
        // With the stud mesh inner, the 30 (tip 24 mm) clears the leadscrew at 90 mm.
        let t = train(vec![stage(20, 100), stage(20, 30)]);
        let f = banjo().fit(&t, &pool(&[20, 20, 30, 100])).unwrap();
        assert_eq!(f.order, vec![1, 0]);
        assert_eq!(f.stud_mesh_inner, Some(true));
        // A tight banjo, stud 80 mm from the leadscrew. 20→100 at the stud, 40→20 at the
        // leadscrew (45 mm): with the stud mesh inner the 100 (tip 76.5 mm) passes the leadscrew
        // shaft 45 mm from its centre; with the leadscrew mesh inner the 40 (tip 31.5 mm) clears
        // the stud shaft 90 mm away, and the 20 clears it at 80 mm.
        let tight = Banjo {
            stud_to_leadscrew_mm: 80.0,
            intermediate_from_leadscrew_mm: FloatRange { lo: 30.0, hi: 200.0 },
            shaft_diameter_mm: 20.0,
        };
        let t = train(vec![stage(20, 100), stage(40, 20)]);
        let f = tight.fit(&t, &pool(&[20, 40, 100])).unwrap();
        assert_eq!((f.order, f.stud_mesh_inner), (vec![0, 1], Some(false)));
        // 100→95 and 95→100: whichever plane is inner, a gear of tip 72.75 mm or more sits on
        // the stud or leadscrew and fouls the other shaft 80 mm away (72.75 + 10 > 80).
        let t = train(vec![stage(100, 95), stage(95, 100)]);
        let why = tight.fit(&t, &pool(&[95, 100])).unwrap_err();
        assert_eq!(why.len(), 4, "{why:?}");
        assert!(why.iter().all(|w| w.contains("fouls the")), "{why:?}");
    }

    #[test]
    fn simple_trains_need_a_spare_idler() {
        // 20→40: tips 16.5 + 31.5 mm, well apart at 120 mm; an idler of z teeth sits
        // 0.75 (z + 40) mm from the leadscrew and 0.75 (z + 20) from the stud: z = 80 gives 90
        // and 75 mm, which close over 120 mm.
        let t = train(vec![stage(20, 40)]);
        let f = banjo().fit(&t, &pool(&[20, 40, 80])).unwrap();
        assert_eq!(f.idler, Some(80));
        // Without a spare gear there is no idler.
        let why = banjo().fit(&t, &pool(&[20, 40])).unwrap_err();
        assert!(why[0].contains("no spare gear"), "{why:?}");
        // A 25 idler: 33.75 + 48.75 mm cannot reach 120 mm.
        let why = banjo().fit(&t, &pool(&[20, 25, 40])).unwrap_err();
        assert!(why[0].contains("25 idler"), "{why:?}");
    }

    fn distance(p: [f64; 2], q: [f64; 2]) -> f64 {
        (p[0] - q[0]).hypot(p[1] - q[1])
    }

    #[test]
    fn a_compound_setup_is_placed_at_its_centre_distances() {
        for (stages, teeth) in [
            (vec![stage(20, 60), stage(40, 80)], vec![20, 60, 40, 80]),
            (vec![stage(30, 45), stage(50, 70)], vec![30, 45, 50, 70]),
        ] {
            let t = train(stages);
            let b = banjo();
            let f = b.fit(&t, &pool(&teeth)).unwrap();
            let p = b.placement(&t, &f).unwrap();
            let (s1, s2) = (&t.stages[f.order[0]], &t.stages[f.order[1]]);
            let i = p.intermediate.unwrap();
            assert!((distance(p.stud, p.leadscrew) - 120.0).abs() < 1e-9);
            assert!((distance(p.stud, i) - s1.centre_distance_mm()).abs() < 1e-9);
            assert!((distance(i, p.leadscrew) - s2.centre_distance_mm()).abs() < 1e-9);
            assert!(b.intermediate_from_leadscrew_mm.contains(distance(i, p.leadscrew), 0.0));
            assert!(i[1] >= 0.0, "above the line stud–leadscrew: {i:?}");
            assert_eq!(p.shafts(), vec![p.stud, i, p.leadscrew]);
        }
    }

    #[test]
    fn an_idler_is_placed_between_stud_and_leadscrew_gears() {
        // 20→40 through an 80 idler: 75 mm from the stud, 90 mm from the leadscrew; 75² + 90²
        // = 13725 < 120² = 14400, so the idler stands just short of a right angle at itself.
        let t = train(vec![stage(20, 40)]);
        let b = banjo();
        let f = b.fit(&t, &pool(&[20, 40, 80])).unwrap();
        let p = b.placement(&t, &f).unwrap();
        let i = p.intermediate.unwrap();
        assert!((distance(p.stud, i) - 75.0).abs() < 1e-9);
        assert!((distance(i, p.leadscrew) - 90.0).abs() < 1e-9);
        assert!(b.intermediate_from_leadscrew_mm.contains(distance(i, p.leadscrew), 0.0));
        assert!(i[1] > 0.0);
    }

    #[test]
    fn direct_meshes_and_open_triangles() {
        // 40→120 at module 1.5 spans exactly 120 mm: no intermediate stud.
        let t = train(vec![stage(40, 120)]);
        let b = banjo();
        let f = b.fit(&t, &pool(&[40, 120])).unwrap();
        let p = b.placement(&t, &f).unwrap();
        assert_eq!(p.intermediate, None);
        assert_eq!(p.shafts(), vec![[-120.0, 0.0], [0.0, 0.0]]);
        // 30 + 40 mm cannot reach across 120 mm; a flat triangle (50 + 70) closes on the line.
        assert_eq!(b.intermediate_at(30.0, 40.0), None);
        let flat = b.intermediate_at(50.0, 70.0).unwrap();
        assert!((flat[0] + 70.0).abs() < 1e-9 && flat[1].abs() < 1e-6, "{flat:?}");
    }

    #[test]
    fn gears_must_fit_their_shafts() {
        // Root radius of a 14-tooth module-1.5 gear: 1.5 (14 − 2.5) / 2 = 8.625 mm < 10 mm.
        let t = train(vec![stage(14, 80)]);
        let why = banjo().fit(&t, &pool(&[14, 80, 60])).unwrap_err();
        assert!(why[0].contains("does not fit over a 20 mm shaft"), "{why:?}");
    }
}
