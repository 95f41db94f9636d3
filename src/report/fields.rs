//! The names, views and precision of the quantities every result kind shares: the JSON view of
//! a train ([`TrainJson`]) and, for the CSV format, one value per cell, numbers at the precision they mean (lengths to 0.001 mm, profile shifts
//! to 0.0001 module, angles to 0.001°, ratios exact as `p/q` beside a decimal), and the stage
//! columns (`stage1_driver`, `stage1_driven`, …) every kind writes the same way. The names are
//! those of `docs/output-fields.md`; JSON uses the same names at full precision.

use serde::{Deserialize, Serialize};

use crate::model::purchase::ToBuy;
use crate::model::train::{Direction, Train};

/// `v` to `decimals` places without trailing zeros, and `0` rather than `-0`.
pub fn decimals(v: f64, decimals: usize) -> String {
    let s = format!("{v:.decimals$}");
    let s = if s.contains('.') { s.trim_end_matches('0').trim_end_matches('.') } else { &s };
    if s == "-0" {
        "0".to_string()
    } else {
        s.to_string()
    }
}

/// A length in mm, to 0.001 mm.
pub fn mm(v: f64) -> String {
    decimals(v, 3)
}

/// A profile shift coefficient, to 0.0001 module.
pub fn shift(v: f64) -> String {
    decimals(v, 4)
}

/// An angle in degrees, to 0.001°.
pub fn degrees(v: f64) -> String {
    decimals(v, 3)
}

/// A dimensionless figure such as a contact ratio or a stage balance, to 0.0001.
pub fn figure(v: f64) -> String {
    decimals(v, 4)
}

/// The decimal value of an exact ratio, to twelve decimals (the exact `p/q` stands beside it).
pub fn ratio_value(v: f64) -> String {
    decimals(v, 12)
}

/// A small signed quantity such as a relative error or a drift: `0`, else six significant
/// digits in scientific notation (`-6.66667e-4`).
pub fn small(v: f64) -> String {
    if v == 0.0 {
        "0".to_string()
    } else {
        let s = format!("{v:.5e}");
        // `6.66667e-4` rather than `6.66670e-4`: the mantissa without trailing zeros.
        match s.split_once('e') {
            Some((m, e)) if m.contains('.') => {
                format!("{}e{e}", m.trim_end_matches('0').trim_end_matches('.'))
            }
            _ => s,
        }
    }
}

/// The stage columns of a CSV file: as many stages as the longest train can have, with the
/// worked-out mesh of each when the result kind works meshes out.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct StageColumns {
    /// Stage column groups, `stage1_…` to `stageN_…`.
    pub stages: usize,
    /// Whether the mesh columns (shifts, working centre distance and pressure angle, contact
    /// ratio, tip diameters) are written.
    pub mesh: bool,
}

const PLAIN: [&str; 7] = [
    "driver",
    "driven",
    "module_mm",
    "pressure_angle_deg",
    "reference_centre_distance_mm",
    "driver_label",
    "driven_label",
];

const MESH: [&str; 7] = [
    "shift_driver",
    "shift_driven",
    "working_centre_distance_mm",
    "working_pressure_angle_deg",
    "contact_ratio",
    "tip_diameter_driver_mm",
    "tip_diameter_driven_mm",
];

impl StageColumns {
    /// Columns per stage.
    fn width(self) -> usize {
        PLAIN.len() + if self.mesh { MESH.len() } else { 0 }
    }

    /// The header cells.
    pub fn header(self) -> Vec<String> {
        let mut head = Vec::new();
        for n in 1..=self.stages {
            let mesh: &[&str] = if self.mesh { &MESH } else { &[] };
            head.extend(PLAIN.iter().chain(mesh).map(|f| format!("stage{n}_{f}")));
        }
        head
    }

    /// The cells of `train`, empty for the stages it does not have.
    pub fn cells(self, train: &TrainJson) -> Vec<String> {
        let mut cells = Vec::with_capacity(self.stages * self.width());
        for n in 0..self.stages {
            match train.stages.get(n) {
                Some(s) => {
                    cells.extend(plain(s));
                    if self.mesh {
                        cells.extend(mesh(s));
                    }
                }
                None => cells.extend(std::iter::repeat_n(String::new(), self.width())),
            }
        }
        cells
    }
}

fn plain(s: &StageJson) -> [String; 7] {
    [
        s.driver.to_string(),
        s.driven.to_string(),
        decimals(s.module_mm, 6),
        degrees(s.pressure_angle_deg),
        mm(s.reference_centre_distance_mm),
        s.driver_labels.join("/"),
        s.driven_labels.join("/"),
    ]
}

fn mesh(s: &StageJson) -> [String; 7] {
    let opt = |v: Option<f64>, f: fn(f64) -> String| v.map_or(String::new(), f);
    [
        opt(s.shift.map(|x| x[0]), shift),
        opt(s.shift.map(|x| x[1]), shift),
        opt(s.working_centre_distance_mm, mm),
        opt(s.working_pressure_angle_deg, degrees),
        opt(s.contact_ratio, figure),
        opt(s.tip_diameter_mm.map(|d| d[0]), mm),
        opt(s.tip_diameter_mm.map(|d| d[1]), mm),
    ]
}

/// The cells every train row starts with: `ratio`, `value`, `error`, `meshes`, `direction`,
/// `size`, `span_mm`.
pub const TRAIN_HEADER: [&str; 8] =
    ["ratio", "value", "error", "meshes", "direction", "size", "span_mm", "on_hand_defects"];

/// What is wrong with a train's gears on hand as they are made, stage by stage, in one line
/// (`stage 1 (14→42): the 14-tooth pinion is undercut …`); empty when nothing is.
pub fn on_hand_summary(train: &TrainJson) -> String {
    let parts: Vec<String> = train
        .stages
        .iter()
        .enumerate()
        .filter(|(_, s)| !s.on_hand_defects.is_empty())
        .map(|(n, s)| {
            format!("stage {} ({}→{}): {}", n + 1, s.driver, s.driven, s.on_hand_defects.join("; "))
        })
        .collect();
    parts.join("; ")
}

/// The [`TRAIN_HEADER`] cells of `train`.
pub fn train_cells(train: &TrainJson) -> Vec<String> {
    vec![
        train.ratio.clone(),
        ratio_value(train.value),
        small(train.error),
        train.meshes.to_string(),
        train.direction.as_str().to_string(),
        train.size.to_string(),
        mm(train.span_mm),
        on_hand_summary(train),
    ]
}

/// The heading over the notes on gears on hand that would not run well as they are made.
const ON_HAND_HEADING: &str = "Gears on hand as they are made (they cannot be re-cut; judged mounted tight):";

/// The trains whose gears on hand, as they are made, would not run well: gears on hand cannot
/// be re-cut, so this is said on every listing, whether or not meshes were checked.
pub fn on_hand(trains: &[TrainJson], d: &mut crate::report::Document) {
    on_hand_notes(trains.iter().enumerate().map(|(i, t)| (format!("#{}", i + 1), on_hand_summary(t))), d);
}

/// The notes on gears on hand that would not run well as they are made, under one heading:
/// each `(tag, summary)` as `tag: summary`, those with an empty summary left out; nothing when
/// every summary is empty.
pub fn on_hand_notes(notes: impl IntoIterator<Item = (String, String)>, d: &mut crate::report::Document) {
    let notes: Vec<String> =
        notes.into_iter().filter(|(_, s)| !s.is_empty()).map(|(tag, s)| format!("{tag}: {s}")).collect();
    if notes.is_empty() {
        return;
    }
    d.blank();
    d.line(ON_HAND_HEADING);
    for n in notes {
        d.line(format!("  {n}"));
    }
}

/// One train as JSON; shared by every command that lists trains.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct TrainJson {
    /// Reduced `p/q`.
    pub ratio: String,
    /// The ratio as a float.
    pub value: f64,
    /// Signed relative error `i/R − 1`.
    pub error: f64,
    /// Number of meshes.
    pub meshes: usize,
    /// Output direction.
    pub direction: Direction,
    /// Sum of teeth.
    pub size: u32,
    /// Largest pitch diameter, mm.
    pub span_mm: f64,
    /// Stages input to output.
    pub stages: Vec<StageJson>,
    /// In a listing of gear sets: how many arrangements of this train's gears (pairings of its
    /// drivers with its driven gears into stages) meet every constraint, this one among them.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub arrangements: Option<u64>,
    /// In a listing of gear sets with every arrangement asked for: the other arrangements, best
    /// first.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub other_arrangements: Vec<TrainJson>,
    /// In a search with gears to buy: the gears this train needs bought, by tooth count (empty
    /// when every gear is on hand).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub to_buy: Option<Vec<ToBuy>>,
}

/// One stage as JSON.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct StageJson {
    /// Driver teeth.
    pub driver: u32,
    /// Driven teeth.
    pub driven: u32,
    /// Module, mm.
    pub module_mm: f64,
    /// Pressure angle, degrees.
    pub pressure_angle_deg: f64,
    /// Reference centre distance m·(z1 + z2)/2 of the pair uncut by shift, mm.
    pub reference_centre_distance_mm: f64,
    /// Diametral pitch when given in inch terms.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub diametral_pitch: Option<f64>,
    /// Stock labels of the driver.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub driver_labels: Vec<String>,
    /// Stock labels of the driven gear.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub driven_labels: Vec<String>,
    /// Profile shifts `[x_driver, x_driven]`, in modules (when meshes were worked out).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shift: Option<[f64; 2]>,
    /// Working centre distance actually reached, mm.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub working_centre_distance_mm: Option<f64>,
    /// Working pressure angle, degrees.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub working_pressure_angle_deg: Option<f64>,
    /// Transverse contact ratio.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub contact_ratio: Option<f64>,
    /// Tip diameters `[driver, driven]`, mm.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tip_diameter_mm: Option<[f64; 2]>,
    /// Nominal circumferential backlash, mm, of gears already made mounted beyond their tight
    /// distance (a fixed or coaxial centre distance within the centre-distance tolerance);
    /// absent for a tight mesh.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub backlash_mm: Option<f64>,
    /// What is wrong with this stage's gears on hand as they are made, in shop words (absent
    /// when nothing is).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub on_hand_defects: Vec<String>,
    /// Allowances, backlash and the data block of both gears (`search --explain` over
    /// worked-out meshes).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub gear_data: Option<crate::geometry::measure::PairData>,
    /// The tooth form when it is not involute (`cycloidal`); absent for involute teeth.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tooth_form: Option<String>,
}

impl StageJson {
    /// A stage of gears cut without profile shift, at the reference centre distance.
    pub fn plain(driver: u32, driven: u32, module_mm: f64, pressure_angle_deg: f64) -> StageJson {
        StageJson {
            driver,
            driven,
            module_mm,
            pressure_angle_deg,
            diametral_pitch: None,
            reference_centre_distance_mm: module_mm * f64::from(driver + driven) / 2.0,
            driver_labels: Vec::new(),
            driven_labels: Vec::new(),
            shift: None,
            working_centre_distance_mm: None,
            working_pressure_angle_deg: None,
            contact_ratio: None,
            tip_diameter_mm: None,
            backlash_mm: None,
            on_hand_defects: Vec::new(),
            gear_data: None,
            tooth_form: None,
        }
    }
}

impl TrainJson {
    /// The JSON view of a train.
    pub fn from_train(t: &Train) -> TrainJson {
        TrainJson {
            ratio: t.ratio.to_string(),
            value: t.ratio.to_f64(),
            error: t.error.to_f64(),
            meshes: t.meshes(),
            direction: t.direction(),
            size: t.size(),
            span_mm: t.span_mm(),
            stages: t
                .stages
                .iter()
                .map(|s| StageJson {
                    driver: s.driver.teeth,
                    driven: s.driven.teeth,
                    module_mm: s.module_mm,
                    pressure_angle_deg: s.pressure_angle_deg,
                    reference_centre_distance_mm: s.centre_distance_mm(),
                    diametral_pitch: s.diametral_pitch,
                    driver_labels: s.driver.labels.clone(),
                    driven_labels: s.driven.labels.clone(),
                    shift: s.mesh.map(|m| m.shift),
                    working_centre_distance_mm: s.mesh.map(|m| m.centre_distance_mm),
                    working_pressure_angle_deg: s.mesh.map(|m| m.working_pressure_angle_deg),
                    contact_ratio: s.mesh.map(|m| m.contact_ratio),
                    tip_diameter_mm: s.mesh.map(|m| m.tip_diameter_mm),
                    backlash_mm: s.mesh.map(|m| m.backlash_mm).filter(|&j| j > 1e-9),
                    on_hand_defects: s.on_hand_defects.iter().map(ToString::to_string).collect(),
                    gear_data: None,
                    tooth_form: None,
                })
                .collect(),
            arrangements: None,
            other_arrangements: Vec::new(),
            to_buy: None,
        }
    }
}

/// The target as JSON.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq)]
pub struct TargetJson {
    /// The ratio as typed.
    pub ratio: String,
    /// Its value.
    pub value: f64,
    /// Relative tolerance.
    pub tolerance: f64,
    /// The ratio exactly, reduced `p/q`.
    pub exact: String,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_at_their_precision() {
        assert_eq!(mm(74.25), "74.25");
        assert_eq!(mm(74.2500001), "74.25");
        assert_eq!(mm(-0.0001), "0");
        assert_eq!(shift(0.12266666169616769), "0.1227");
        assert_eq!(shift(-0.12266666169616874), "-0.1227");
        assert_eq!(degrees(21.5243), "21.524");
        assert_eq!(ratio_value(1501.0 / 125.0), "12.008");
        assert_eq!(small(0.0), "0");
        assert_eq!(small(6.666666666666666e-4), "6.66667e-4");
        assert_eq!(small(-2.5e-9), "-2.5e-9");
        assert_eq!(decimals(12.0, 3), "12");
    }
}
