//! The JSON format for planetary trains. A document is
//!
//! ```text
//! {"schema_version", "target", "arrangement", "held", "input", "output", "direction_wanted",
//!  "sun_teeth", "planet_teeth", "planet_ring_teeth", "planet_ring2_teeth", "ring_teeth",
//!  "ring2_teeth",
//!  "planet_counts", "spacing", "module_mm", "pressure_angle_deg", "shift_per_mesh",
//!  "carrier_offset_modules", "tip_clearance_mm", "mesh_checks", "limit", "count", "complete",
//!  "convention", "caution", "designs": […], "left_out"?, "asked"?}
//! ```
//!
//! and each design gives its tooth counts under the names of its gears (`sun`, `planet` or
//! `planet_sun` and `planet_ring`, `ring`; `ring`, `planet_ring`, `planet_ring2`, `ring2` for
//! the two-ring train), `planets`, the exact `ratio` with its `value`, `error` and `direction`,
//! the carrier, each gear as cut (`gear_sizes`), the places and angles of the planets and the
//! figures of the planet's two meshes (`planet_meshes`). Every key is described in `docs/output-fields.md`.

use std::io::Write;

use serde::Serialize;

use crate::numbers::range::IntRange;
use crate::report::fields::TargetJson;
use crate::report::words::PLANETARY_CONVENTION;
use crate::report::{write_json, RenderError, SCHEMA_VERSION};
use crate::trades::planetary::layout::{gear_circles, Gear, GearCircles};
use crate::trades::planetary::{Arrangement, Design, Spacing, CAUTION};

use super::{arrangement_key, candidate_words, drive, mesh_figures, mesh_words, PlanetaryReport};

#[derive(Serialize, Default)]
struct DesignJson {
    rank: usize,
    #[serde(skip_serializing_if = "Option::is_none")]
    sun: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    planet: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    planet_sun: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    planet_ring: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    planet_ring2: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    ring: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    ring2: Option<u32>,
    planets: u32,
    /// Trains made of this design's gears: always 1 (see `gear_set_count`).
    arrangements: u64,
    ratio: String,
    value: f64,
    error: f64,
    direction: &'static str,
    carrier_centre_distance_mm: f64,
    mesh_shift: [f64; 2],
    gear_sizes: Vec<GearCircles>,
    neighbour_gap_mm: f64,
    places: u64,
    equally_spaced: bool,
    planet_angles_deg: Vec<f64>,
    planet_meshes: Vec<MeshJson>,
    /// What is wrong with the gears on hand as they are made (designs from stock whose meshes
    /// are not checked); left out when nothing is.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    on_hand_defects: Vec<String>,
}

#[derive(Serialize)]
struct MeshJson {
    mesh: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    working_pressure_angle_deg: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    contact_ratio: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    defect: Option<String>,
}

#[derive(Serialize)]
struct LeftOutJson {
    candidates: u64,
    conditions: Vec<ConditionJson>,
}

#[derive(Serialize)]
struct ConditionJson {
    condition: &'static str,
    count: u64,
    example: String,
    reason: String,
}

#[derive(Serialize)]
struct AskedJson {
    design: String,
    planets: u32,
    unmet: Vec<UnmetJson>,
}

#[derive(Serialize)]
struct UnmetJson {
    condition: &'static str,
    reason: String,
}

#[derive(Serialize)]
struct Doc {
    schema_version: u32,
    target: TargetJson,
    arrangement: &'static str,
    held: &'static str,
    input: &'static str,
    output: &'static str,
    direction_wanted: Option<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    sun_teeth: Option<[u32; 2]>,
    planet_teeth: [u32; 2],
    #[serde(skip_serializing_if = "Option::is_none")]
    planet_ring_teeth: Option<[u32; 2]>,
    #[serde(skip_serializing_if = "Option::is_none")]
    planet_ring2_teeth: Option<[u32; 2]>,
    ring_teeth: [u32; 2],
    #[serde(skip_serializing_if = "Option::is_none")]
    ring2_teeth: Option<[u32; 2]>,
    planet_counts: [u32; 2],
    spacing: &'static str,
    module_mm: f64,
    pressure_angle_deg: f64,
    shift_per_mesh: [f64; 2],
    carrier_offset_modules: f64,
    tip_clearance_mm: f64,
    mesh_checks: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    stock: Option<StockJson>,
    limit: usize,
    count: u64,
    /// Gear sets among the designs: a design's gears (sun, planets, rings) pair up one way
    /// only — swapping a stepped planet's two gears, or the rings, changes the ratio — so every
    /// design is a gear set of its own and this equals `count`.
    gear_set_count: u64,
    complete: bool,
    convention: &'static str,
    caution: &'static str,
    designs: Vec<DesignJson>,
    #[serde(skip_serializing_if = "Option::is_none")]
    left_out: Option<LeftOutJson>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    asked: Vec<AskedJson>,
}

/// The gears on hand a search drew from.
#[derive(Serialize)]
struct StockJson {
    /// External gears: `[teeth, how many]`, by teeth.
    gears: Vec<[u32; 2]>,
    /// Ring gears (internal teeth): `[teeth, how many]`, by teeth.
    rings: Vec<[u32; 2]>,
    /// Gears of the catalogues in other modules or pressure angles, not usable here.
    left_out: u64,
}

fn pair(r: IntRange) -> [u32; 2] {
    [r.lo, r.hi]
}

fn design_json(r: &PlanetaryReport, rank: usize, d: &Design) -> DesignJson {
    let gear_sizes = gear_circles(r.problem.system(), d);
    let mut json = DesignJson {
        rank,
        planets: d.planets,
        arrangements: 1,
        ratio: d.ratio.magnitude.to_string(),
        value: d.ratio.magnitude.to_f64(),
        error: d.error.to_f64(),
        direction: d.ratio.direction.as_str(),
        carrier_centre_distance_mm: d.carrier.centre_distance_mm,
        mesh_shift: d.carrier.mesh_shift,
        neighbour_gap_mm: d.neighbour_gap_mm,
        places: d.positions.places,
        equally_spaced: d.positions.equally_spaced(),
        planet_angles_deg: d.positions.angles_deg(),
        planet_meshes: mesh_figures(d)
            .into_iter()
            .enumerate()
            .map(|(i, m)| {
                let mesh = mesh_words(&d.teeth, i);
                match m {
                    Ok((angle, contact)) => MeshJson {
                        mesh,
                        working_pressure_angle_deg: Some(angle),
                        contact_ratio: Some(contact),
                        defect: None,
                    },
                    Err(defect) => MeshJson {
                        mesh,
                        working_pressure_angle_deg: None,
                        contact_ratio: None,
                        defect: Some(defect),
                    },
                }
            })
            .collect(),
        on_hand_defects: d.on_hand_defects.iter().map(ToString::to_string).collect(),
        ..DesignJson::default()
    };
    for g in &gear_sizes {
        let slot = match g.gear {
            Gear::Sun => &mut json.sun,
            Gear::Planet => &mut json.planet,
            Gear::PlanetSun => &mut json.planet_sun,
            Gear::PlanetRing => &mut json.planet_ring,
            Gear::PlanetRing2 => &mut json.planet_ring2,
            Gear::Ring => &mut json.ring,
            Gear::Ring2 => &mut json.ring2,
        };
        *slot = Some(g.teeth);
    }
    json.gear_sizes = gear_sizes;
    json
}

/// Write a planetary search as one JSON document.
pub fn write(r: &PlanetaryReport, w: &mut dyn Write) -> Result<(), RenderError> {
    let s = r.problem.spec();
    let (held, input, output) = drive(s.arrangement);
    let (stepped, two_ring) = match s.arrangement {
        Arrangement::Simple { .. } => (false, false),
        Arrangement::Stepped { .. } => (true, false),
        Arrangement::TwoRing => (false, true),
    };
    let doc = Doc {
        schema_version: SCHEMA_VERSION,
        target: TargetJson {
            ratio: r.ratio_text.to_string(),
            value: s.ratio.to_f64(),
            tolerance: s.tolerance.to_f64(),
            exact: s.ratio.to_string(),
        },
        arrangement: arrangement_key(s.arrangement),
        held,
        input,
        output,
        direction_wanted: s.direction.map(|d| d.as_str()),
        sun_teeth: (!two_ring).then_some(pair(s.sun_teeth)),
        planet_teeth: pair(s.planet_teeth),
        planet_ring_teeth: (stepped || two_ring).then_some(pair(s.range_of(Gear::PlanetRing))),
        planet_ring2_teeth: two_ring.then_some(pair(s.range_of(Gear::PlanetRing2))),
        ring_teeth: pair(s.ring_teeth),
        ring2_teeth: two_ring.then_some(pair(s.range_of(Gear::Ring2))),
        planet_counts: pair(s.planets),
        spacing: match s.spacing {
            Spacing::Equal => "equal",
            Spacing::NearEqual => "near-equal",
        },
        module_mm: s.module_mm,
        pressure_angle_deg: s.pressure_angle_deg,
        shift_per_mesh: [s.shift_sum.0, s.shift_sum.1],
        carrier_offset_modules: s.carrier_offset_modules,
        tip_clearance_mm: s.tip_clearance_mm,
        mesh_checks: s.mesh_limits.is_some(),
        stock: r.problem.stock().map(|st| StockJson {
            gears: st.gears.iter().map(|(&t, &n)| [t, n]).collect(),
            rings: st.rings.iter().map(|(&t, &n)| [t, n]).collect(),
            left_out: st.left_out,
        }),
        limit: s.limit,
        count: r.outcome.count,
        gear_set_count: r.outcome.count,
        complete: r.outcome.complete,
        convention: PLANETARY_CONVENTION,
        caution: CAUTION,
        designs: r.outcome.designs.iter().enumerate().map(|(n, d)| design_json(r, n + 1, d)).collect(),
        left_out: r.outcome.left_out.as_ref().map(|l| LeftOutJson {
            candidates: l.candidates,
            conditions: l
                .conditions
                .iter()
                .map(|c| ConditionJson {
                    condition: c.condition.name(),
                    count: c.count,
                    example: candidate_words(&c.teeth, c.planets),
                    reason: c.unmet.to_string(),
                })
                .collect(),
        }),
        asked: r
            .asked
            .iter()
            .map(|a| AskedJson {
                design: candidate_words(&a.teeth, a.planets),
                planets: a.planets,
                unmet: a
                    .unmet
                    .iter()
                    .map(|u| UnmetJson { condition: u.condition().name(), reason: u.to_string() })
                    .collect(),
            })
            .collect(),
    };
    write_json(&doc, w)
}
