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
//! - a banjo has one slot or more; each intermediate (or idler) stud sits in a slot of its own,
//!   at a distance from the leadscrew within the slot's range, so a setup of `n` stages needs
//!   `n − 1` slots;
//! - setups of three and four stages are placed by searching the angles of their studs (in steps
//!   of [`CHAIN_STEP_DEG`], [`CHAIN_STEP_4_DEG`] for four stages) for a position where every
//!   stud is in its slot, and the planes of their meshes for an order in which every gear clears
//!   every shaft that passes through its plane and every gear it does not mesh with (a shaft
//!   passes through every plane from the machine out to its outermost gear; the two gears on an
//!   intermediate stud sit in neighbouring planes). Setups of five stages or more are not
//!   checked, and say so.

use std::path::Path;

use crate::error::{Error, Message, Quantity, Result};
use crate::model::pool::{fmt_num, Pool};
use crate::model::train::{standard_centre_distance_mm, Train};
use crate::numbers::length::{parse_length, LengthUnit};
use crate::numbers::range::{parse_length_range, FloatRange};

/// Slack for distances computed in floating point, mm.
const SLACK_MM: f64 = 1e-9;

/// Angle step, degrees, of the search for where the two studs of a three-stage setup sit.
pub const CHAIN_STEP_DEG: f64 = 0.5;

/// Angle step, degrees, of the search for where the three studs of a four-stage setup sit.
pub const CHAIN_STEP_4_DEG: f64 = 2.0;

/// The most stages a setup the banjo model places may have.
pub const MAX_PLACED_STAGES: usize = 4;

/// The fixed geometry of a lathe's banjo.
#[derive(Debug, Clone, PartialEq)]
pub struct Banjo {
    /// Distance between the stud and leadscrew axes, mm.
    pub stud_to_leadscrew_mm: f64,
    /// The slots, each the distances from the leadscrew axis a stud in it can take, mm; at
    /// least one. Each intermediate or idler stud takes a slot of its own.
    pub slots: Vec<FloatRange>,
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
    /// For three stages or more: where the studs sit and the plane of each mesh.
    pub chain: Option<ChainFit>,
    /// Why the setup was not checked on a banjo, when it was not (no banjo described, or more
    /// stages than the model places).
    pub not_checked: Option<String>,
}

/// How a setup of three or more stages sits on the banjo.
#[derive(Debug, Clone, PartialEq)]
pub struct ChainFit {
    /// The intermediate studs from the stud side, mm in the plane of the gears (the leadscrew
    /// axis at the origin, the stud at `(−stud_to_leadscrew, 0)`).
    pub studs: Vec<[f64; 2]>,
    /// The slot (index into [`Banjo::slots`]) each stud sits in.
    pub slots: Vec<usize>,
    /// The plane of each mesh from the stud to the leadscrew, 1 nearest the machine.
    pub planes: Vec<u32>,
}

impl ChainFit {
    /// Each stud's distance from the leadscrew axis, mm.
    pub fn from_leadscrew_mm(&self) -> Vec<f64> {
        self.studs.iter().map(|p| p[0].hypot(p[1])).collect()
    }
}

impl Fit {
    /// The plain order, nothing placed; `why` says why it was not checked.
    pub fn unchecked(train: &Train, why: impl Into<String>) -> Fit {
        Fit { not_checked: Some(why.into()), ..Fit::placed((0..train.stages.len()).collect()) }
    }

    /// A fit in `order` with nothing else said yet.
    fn placed(order: Vec<usize>) -> Fit {
        Fit {
            order,
            idler: None,
            stud_mesh_inner: None,
            intermediate_from_leadscrew_mm: None,
            chain: None,
            not_checked: None,
        }
    }
}

/// Why a setup is not checked when no banjo was described.
pub const NO_BANJO: &str = "not checked: no banjo described";

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
        Banjo::with_slots(
            stud_to_leadscrew_mm,
            vec![intermediate_from_leadscrew_mm],
            shaft_diameter_mm,
            place,
        )
    }

    /// [`Banjo::new`] for a banjo of one slot or more.
    pub fn with_slots(
        stud_to_leadscrew_mm: f64,
        slots: Vec<FloatRange>,
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
        if slots.is_empty() || slots.iter().any(|s| !s.hi.is_finite()) {
            return Err(place(Quantity::IntermediateRange, "wanted LO..HI mm with an upper end".into()));
        }
        Ok(Banjo { stud_to_leadscrew_mm, slots, shaft_diameter_mm })
    }

    /// One-line description for reports.
    pub fn describe(&self) -> String {
        let ranges: Vec<String> =
            self.slots.iter().map(|r| format!("{}..{}", fmt_num(r.lo), fmt_num(r.hi))).collect();
        let slots = match ranges.as_slice() {
            [one] => format!("intermediate stud {one} mm from the leadscrew"),
            more => format!("{} slots, studs {} mm from the leadscrew", more.len(), more.join(" and ")),
        };
        format!(
            "stud {} mm from the leadscrew, {slots}, shafts and spacers {} mm",
            fmt_num(self.stud_to_leadscrew_mm),
            fmt_num(self.shaft_diameter_mm)
        )
    }

    /// The slot whose range holds `r` mm, the first if several do.
    pub fn slot_holding(&self, r: f64) -> Option<usize> {
        self.slots.iter().position(|s| s.contains(r, SLACK_MM))
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
            n if n <= MAX_PLACED_STAGES => self.fit_chain(train),
            n => self.fit_chain_closure(train).map(|()| {
                Fit::unchecked(
                    train,
                    format!("not checked: the banjo model places at most {MAX_PLACED_STAGES} stages, this has {n}"),
                )
            }),
        }
    }

    fn slot_reason(&self, r: f64) -> Option<String> {
        self.slot_holding(r).is_none().then(|| {
            let ranges: Vec<String> =
                self.slots.iter().map(|s| format!("{}..{}", fmt_num(s.lo), fmt_num(s.hi))).collect();
            format!(
                "the intermediate stud would sit {} mm from the leadscrew, outside the slot{} {} mm",
                fmt_num(r),
                if ranges.len() == 1 { "" } else { "s" },
                ranges.join(" and ")
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
            return Ok(Fit::placed(vec![0]));
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
                        idler: Some(zi),
                        intermediate_from_leadscrew_mm: Some(a2),
                        ..Fit::placed(vec![0])
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
                            stud_mesh_inner: Some(stud_inner),
                            intermediate_from_leadscrew_mm: Some(a2),
                            ..Fit::placed(order.to_vec())
                        })
                    }
                    Some(r) => why.push(format!("{name}, {plane}: {r}")),
                }
            }
        }
        Err(why)
    }

    /// Place a setup of three or four stages: its `n − 1` studs each in a slot of its own, at
    /// the centre distances of its meshes, found by stepping the studs' angles; then the planes
    /// of its meshes, fewest planes first. `Err` says why no position and plane order serves.
    fn fit_chain(&self, train: &Train) -> std::result::Result<Fit, Vec<String>> {
        self.fit_chain_closure(train)?;
        let mut first_reasons = None;
        let mut tried: Vec<Vec<(u32, u32)>> = Vec::new();
        for order in orders(train.stages.len()) {
            let stages: Vec<_> = order.iter().map(|&k| train.stages[k].clone()).collect();
            // Equal stages in another order are the same setup.
            let teeth: Vec<(u32, u32)> = stages.iter().map(|s| (s.driver.teeth, s.driven.teeth)).collect();
            if tried.contains(&teeth) {
                continue;
            }
            tried.push(teeth);
            let ordered = Train { stages, ..train.clone() };
            match self.fit_chain_in_order(&ordered) {
                Ok(fit) => return Ok(Fit { order, ..fit }),
                Err(why) => {
                    first_reasons.get_or_insert(why);
                }
            }
        }
        let why = first_reasons.unwrap_or_default();
        Err(why
            .into_iter()
            .map(|w| format!("in every order of its stages; in the order given, {w}"))
            .collect())
    }

    /// [`Banjo::fit_chain`] for the stages in the order given.
    fn fit_chain_in_order(&self, train: &Train) -> std::result::Result<Fit, Vec<String>> {
        let n = train.stages.len();
        let studs = n - 1;
        if self.slots.len() < studs {
            return Err(vec![format!(
                "{n} stages need {studs} intermediate studs, each in a slot of its own; the banjo has {} \
                 slot{}",
                self.slots.len(),
                if self.slots.len() == 1 { "" } else { "s" }
            )]);
        }
        let links: Vec<f64> = train.stages.iter().map(|s| s.centre_distance_mm()).collect();
        let slot_orders = arrangements(self.slots.len(), studs);
        let plane_orders = plane_orders(n);
        let mut in_slots = false;
        let mut last_clash = None;
        for inner in self.chain_positions(&links) {
            for slots in &slot_orders {
                let fits =
                    inner.iter().zip(slots).all(|(p, &k)| self.slots[k].contains(p[0].hypot(p[1]), SLACK_MM));
                if !fits {
                    continue;
                }
                in_slots = true;
                let mut axes = vec![[-self.stud_to_leadscrew_mm, 0.0]];
                axes.extend(inner.iter().copied());
                axes.push([0.0, 0.0]);
                for planes in &plane_orders {
                    match self.clash(train, &axes, planes) {
                        None => {
                            return Ok(Fit {
                                chain: Some(ChainFit {
                                    studs: inner,
                                    slots: slots.clone(),
                                    planes: planes.clone(),
                                }),
                                ..Fit::placed((0..n).collect())
                            })
                        }
                        Some(why) => last_clash = Some(why),
                    }
                }
            }
        }
        let ranges: Vec<String> =
            self.slots.iter().map(|s| format!("{}..{}", fmt_num(s.lo), fmt_num(s.hi))).collect();
        Err(vec![match (in_slots, last_clash) {
            (true, Some(why)) => {
                format!("wherever its studs sit in the slots, a gear fouls; for example {why}")
            }
            _ => format!(
                "no position of its {studs} studs at centre distances {} mm puts each in a slot of its own \
                 (slots {} mm from the leadscrew)",
                links.iter().map(|a| fmt_num(*a)).collect::<Vec<_>>().join(", "),
                ranges.join(" and ")
            ),
        }])
    }

    /// Every position of the intermediate studs (stud side first) the search tries for a chain of
    /// centre distances `links` (stud mesh first): the last stud on a circle about the leadscrew
    /// (upper half: the lower is its mirror image), for four stages the middle one on a circle
    /// about it, and the first where the circles about the stud and its neighbour meet.
    fn chain_positions(&self, links: &[f64]) -> Vec<Vec<[f64; 2]>> {
        let n = links.len();
        let stud = [-self.stud_to_leadscrew_mm, 0.0];
        let step = if n == 3 { CHAIN_STEP_DEG } else { CHAIN_STEP_4_DEG };
        let half_turn = (180.0 / step).round() as usize;
        let angles = |count: usize| (0..=count).map(move |k| (k as f64 * step).to_radians());
        let on = |centre: [f64; 2], r: f64, a: f64| [centre[0] + r * a.cos(), centre[1] + r * a.sin()];
        let mut out = Vec::new();
        for a in angles(half_turn) {
            let last = on([0.0, 0.0], links[n - 1], a);
            let middles: Vec<Vec<[f64; 2]>> = if n == 3 {
                vec![vec![last]]
            } else {
                angles(2 * half_turn - 1).map(|b| vec![on(last, links[n - 2], b), last]).collect()
            };
            for tail in middles {
                for first in circles_meet(stud, links[0], tail[0], links[1]) {
                    let mut studs = vec![first];
                    studs.extend(tail.iter().copied());
                    out.push(studs);
                }
            }
        }
        out
    }

    /// Why the gears of `train`, on the axes `axes` (stud, intermediate studs, leadscrew) with
    /// mesh `j` in plane `planes[j]`, cannot run: a gear fouling a shaft that passes through its
    /// plane, or two gears of one plane that do not mesh touching. `None` when all is clear.
    fn clash(&self, train: &Train, axes: &[[f64; 2]], planes: &[u32]) -> Option<String> {
        let c = self.shaft_diameter_mm / 2.0;
        let n = train.stages.len();
        // (axis, plane, tip radius, teeth, stage)
        let mut gears = Vec::new();
        for (j, s) in train.stages.iter().enumerate() {
            gears.push((j, planes[j], tip_mm(s.module_mm, s.driver.teeth), s.driver.teeth, j));
            gears.push((j + 1, planes[j], tip_mm(s.module_mm, s.driven.teeth), s.driven.teeth, j));
        }
        let outermost: Vec<u32> =
            (0..=n).map(|a| gears.iter().filter(|g| g.0 == a).map(|g| g.1).max().unwrap_or(0)).collect();
        let name = |a: usize| match a {
            0 => "stud".to_string(),
            a if a == n => "leadscrew".to_string(),
            a => format!("intermediate stud {a}"),
        };
        let dist = |a: usize, b: usize| (axes[a][0] - axes[b][0]).hypot(axes[a][1] - axes[b][1]);
        for g in &gears {
            for (b, &out_to) in outermost.iter().enumerate() {
                // The gear it meshes sits on the other axis of its own stage.
                let meshes_there = (g.0 == g.4 && b == g.4 + 1) || (g.0 == g.4 + 1 && b == g.4);
                if b == g.0 || meshes_there || out_to < g.1 {
                    continue;
                }
                if g.2 + c > dist(g.0, b) + SLACK_MM {
                    return Some(format!(
                        "the {}-tooth gear on the {} (tip {} mm, plane {}) fouls the {} shaft {} mm away",
                        g.3,
                        name(g.0),
                        fmt_num(g.2),
                        g.1,
                        name(b),
                        fmt_num(dist(g.0, b))
                    ));
                }
            }
        }
        for (i, g) in gears.iter().enumerate() {
            for h in &gears[i + 1..] {
                if g.0 == h.0 || g.1 != h.1 || g.4 == h.4 {
                    continue;
                }
                if g.2 + h.2 > dist(g.0, h.0) + SLACK_MM {
                    return Some(format!(
                        "the {}-tooth gear on the {} and the {}-tooth gear on the {} (plane {}) would touch",
                        g.3,
                        name(g.0),
                        h.3,
                        name(h.0),
                        g.1
                    ));
                }
            }
        }
        None
    }

    fn fit_chain_closure(&self, train: &Train) -> std::result::Result<(), Vec<String>> {
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
        Ok(())
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

/// The points where the circle of radius `ra` about `a` meets that of radius `rb` about `b` (none,
/// or two that may coincide).
fn circles_meet(a: [f64; 2], ra: f64, b: [f64; 2], rb: f64) -> Vec<[f64; 2]> {
    let (dx, dy) = (b[0] - a[0], b[1] - a[1]);
    let d = dx.hypot(dy);
    if d <= 0.0 || d > ra + rb + SLACK_MM || d < (ra - rb).abs() - SLACK_MM {
        return Vec::new();
    }
    let x = (ra * ra - rb * rb + d * d) / (2.0 * d);
    let h = (ra * ra - x * x).max(0.0).sqrt();
    let (ux, uy) = (dx / d, dy / d);
    let foot = [a[0] + x * ux, a[1] + x * uy];
    vec![[foot[0] - h * uy, foot[1] + h * ux], [foot[0] + h * uy, foot[1] - h * ux]]
}

/// Every order of `n` stages, the given order first.
fn orders(n: usize) -> Vec<Vec<usize>> {
    arrangements(n, n)
}

/// The ways of giving `k` studs slots of their own out of `slots`: ordered choices.
fn arrangements(slots: usize, k: usize) -> Vec<Vec<usize>> {
    if k == 0 {
        return vec![Vec::new()];
    }
    let mut out = Vec::new();
    for rest in arrangements(slots, k - 1) {
        for s in (0..slots).filter(|s| !rest.contains(s)) {
            let mut v = rest.clone();
            v.push(s);
            out.push(v);
        }
    }
    out
}

/// The plane orders of `n` meshes, 1 nearest the machine: neighbouring meshes share an
/// intermediate stud, whose two gears sit in neighbouring planes. Fewest planes first.
pub fn plane_orders(n: usize) -> Vec<Vec<u32>> {
    let mut out: Vec<Vec<u32>> = Vec::new();
    for steps in 0..1u32 << (n - 1) {
        let mut p = vec![0i64];
        for j in 0..n - 1 {
            let last = p[j];
            p.push(if steps >> j & 1 == 1 { last + 1 } else { last - 1 });
        }
        let low = p.iter().copied().min().unwrap_or(0);
        let planes: Vec<u32> = p.iter().map(|x| (x - low + 1) as u32).collect();
        if !out.contains(&planes) {
            out.push(planes);
        }
    }
    out.sort_by_key(|p| (p.iter().copied().max().unwrap_or(0), p.clone()));
    out
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
        let g: Vec<StockGear> = teeth.iter().map(|&t| StockGear::on_hand(t, 1.5, 20.0, 1)).collect();
        Pool::from_stock(&g, "t").unwrap()
    }

    fn banjo() -> Banjo {
        Banjo {
            stud_to_leadscrew_mm: 120.0,
            slots: vec![FloatRange { lo: 45.0, hi: 150.0 }],
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
        let long_slot = Banjo { slots: vec![FloatRange { lo: 20.0, hi: 150.0 }], ..banjo() };
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
            slots: vec![FloatRange { lo: 30.0, hi: 200.0 }],
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
            assert!(b.slots[0].contains(distance(i, p.leadscrew), 0.0));
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
        assert!(b.slots[0].contains(distance(i, p.leadscrew), 0.0));
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

    #[test]
    fn three_stages_take_two_slots_and_the_planes_that_clear() {
        // 20→40 three times at module 1.5: every mesh 45 mm, 135 mm of chain over 120 mm.
        // In planes 1-2-1 the first stud's 40 (tip 31.5 mm) and the second stud's 20 (tip
        // 16.5 mm) share plane 1 only 45 mm apart: 48 > 45, they touch. Planes 1-2-3 clear:
        // the 40s on the intermediate studs (tip 31.5 + shaft 10 = 41.5 mm) pass the next shaft
        // out at 45 mm.
        let t = train(vec![stage(20, 40), stage(20, 40), stage(20, 40)]);
        let two = Banjo { slots: vec![FloatRange { lo: 40.0, hi: 150.0 }; 2], ..banjo() };
        let f = two.fit(&t, &pool(&[20, 20, 20, 40, 40, 40])).unwrap();
        let chain = f.chain.unwrap();
        assert_eq!(chain.planes, vec![1, 2, 3]);
        let mut axes = vec![[-120.0, 0.0]];
        axes.extend(chain.studs.iter().copied());
        axes.push([0.0, 0.0]);
        for w in axes.windows(2) {
            assert!((distance(w[0], w[1]) - 45.0).abs() < 1e-9, "{axes:?}");
        }
        let r = chain.from_leadscrew_mm();
        assert!((r[1] - 45.0).abs() < 1e-9 && r[0] >= 40.0, "{r:?}");
        assert_ne!(chain.slots[0], chain.slots[1]);
        // One slot holds one stud: a three-stage setup needs two.
        let why = banjo().fit(&t, &pool(&[20, 20, 20, 40, 40, 40])).unwrap_err();
        assert!(
            why[0].contains(
                "3 stages need 2 intermediate studs, each in a slot of its own; the banjo has 1 slot"
            ),
            "{why:?}"
        );
        // Slots that start beyond 45 mm: the last stud (45 mm from the leadscrew) has no place.
        let far = Banjo { slots: vec![FloatRange { lo: 50.0, hi: 150.0 }; 2], ..banjo() };
        let why = far.fit(&t, &pool(&[20, 20, 20, 40, 40, 40])).unwrap_err();
        assert!(why[0].contains("no position of its 2 studs"), "{why:?}");
    }

    #[test]
    fn plane_orders_step_one_plane_at_a_time() {
        assert_eq!(plane_orders(2), vec![vec![1, 2], vec![2, 1]]);
        assert_eq!(plane_orders(3), vec![vec![1, 2, 1], vec![2, 1, 2], vec![1, 2, 3], vec![3, 2, 1]]);
        assert_eq!(plane_orders(4).len(), 8);
        for p in plane_orders(4) {
            assert!(p.windows(2).all(|w| w[0].abs_diff(w[1]) == 1), "{p:?}");
            assert_eq!(p.iter().min(), Some(&1));
        }
    }

    #[test]
    fn more_stages_than_the_model_places_are_not_checked_and_say_so() {
        let t = train(vec![stage(20, 40); 5]);
        let wide = Banjo { slots: vec![FloatRange { lo: 20.0, hi: 200.0 }; 4], ..banjo() };
        let f = wide.fit(&t, &pool(&[20, 40])).unwrap();
        assert_eq!(
            f.not_checked.as_deref(),
            Some("not checked: the banjo model places at most 4 stages, this has 5")
        );
    }
}
