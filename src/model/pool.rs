//! The gears a search may use: either a range of tooth counts to be cut (any number of each) or
//! the gears on hand from stock catalogues (each at most its quantity). Gears are sorted into mesh
//! groups: only gears of one module and pressure angle can mesh with each other.
//!
//! Owns the validity limits for a single gear (teeth, module, pressure angle); knows nothing of
//! stages or ratios.

use crate::error::{Error, Quantity, Result};
pub use crate::geometry::AsMade;
use crate::numbers::range::IntRange;

/// Fewest teeth a gear or pinion may have (clock pinions go down to 6 leaves; 3 is a hard floor).
pub const MIN_TEETH: u32 = 3;
/// Most teeth a gear may have. With at most [`MAX_STAGES`] stages every product of tooth counts
/// stays below 10¹⁸ and fits a `u64` exactly.
pub const MAX_TEETH: u32 = 1000;
/// Most stages in one train.
pub const MAX_STAGES: usize = 6;
/// Module range accepted, mm.
pub const MODULE_RANGE_MM: (f64, f64) = (0.05, 100.0);
/// Diametral pitches accepted, teeth per inch: modules of 25.4 / 500 = 0.0508 to 25.4 / 0.254 =
/// 100 mm, inside [`MODULE_RANGE_MM`] (508, which is 0.05 mm exactly, is left out because its
/// module in floating point falls a hair below 0.05).
pub const DIAMETRAL_PITCH_RANGE: (f64, f64) = (0.254, 500.0);
/// Pressure angles accepted, degrees.
pub const PRESSURE_ANGLE_RANGE_DEG: (f64, f64) = (10.0, 35.0);

/// Gears that can mesh with each other: one module and one pressure angle.
#[derive(Debug, Clone, PartialEq)]
pub struct MeshGroup {
    /// Module, mm (for inch gears, 25.4 / diametral pitch).
    pub module_mm: f64,
    /// Pressure angle, degrees.
    pub pressure_angle_deg: f64,
    /// The diametral pitch (teeth per inch of pitch diameter) when the gears were given that way.
    pub diametral_pitch: Option<f64>,
}

impl MeshGroup {
    /// Same module (to 1 part in 10⁹) and pressure angle: the gears mesh.
    pub fn meshes_with(&self, module_mm: f64, pressure_angle_deg: f64) -> bool {
        (self.module_mm - module_mm).abs() <= 1e-9 * self.module_mm
            && (self.pressure_angle_deg - pressure_angle_deg).abs() <= 1e-9
    }
}

/// One kind of gear: all gears of this tooth count in this mesh group, made alike, are
/// interchangeable.
#[derive(Debug, Clone, PartialEq)]
pub struct GearKind {
    /// Tooth count (leaves, for a clock pinion).
    pub teeth: u32,
    /// Index into [`Pool::groups`].
    pub group: usize,
    /// How many are on hand; `None` when any number can be cut.
    pub quantity: Option<u32>,
    /// Labels from the catalogue rows this kind came from, in file order.
    pub labels: Vec<String>,
    /// How the gear was made, for a gear on hand; `None` for a gear still to be cut, whose
    /// profile shift the search may choose.
    pub made: Option<AsMade>,
}

/// A gear as read from a stock catalogue, before merging.
#[derive(Debug, Clone, PartialEq)]
pub struct StockGear {
    /// Tooth count.
    pub teeth: u32,
    /// Module, mm.
    pub module_mm: f64,
    /// Diametral pitch, when given.
    pub diametral_pitch: Option<f64>,
    /// Pressure angle, degrees.
    pub pressure_angle_deg: f64,
    /// How many.
    pub quantity: u32,
    /// Free text from the catalogue, may be empty.
    pub label: String,
    /// How the gear was made, for a gear on hand (a catalogue row); `None` for a gear a trade
    /// lists to be cut, whose shift the search may choose.
    pub made: Option<AsMade>,
    /// A ring gear (internal teeth), for a planetary train; a chain of external meshes cannot
    /// use it.
    pub internal: bool,
}

impl StockGear {
    /// A gear on hand of `teeth` teeth, module `module_mm`, pressure angle
    /// `pressure_angle_deg`, `quantity` of them, unlabelled, cut standard (no shift, full tip).
    pub fn on_hand(teeth: u32, module_mm: f64, pressure_angle_deg: f64, quantity: u32) -> StockGear {
        StockGear {
            teeth,
            module_mm,
            diametral_pitch: None,
            pressure_angle_deg,
            quantity,
            label: String::new(),
            made: Some(AsMade::default()),
            internal: false,
        }
    }
}

/// The validated set of gears a search draws from.
#[derive(Debug, Clone, PartialEq)]
pub struct Pool {
    /// Mesh groups, in order of first appearance.
    pub groups: Vec<MeshGroup>,
    /// Gear kinds, sorted by group, teeth, then how they were made; unique per (group, teeth,
    /// made).
    pub gears: Vec<GearKind>,
    /// True when gears are drawn from stock (quantities apply).
    pub from_stock: bool,
    /// Ring gears (internal teeth) the catalogues hold, which a chain of external meshes
    /// cannot use: counted so that the listing says they were left out.
    pub rings_left_out: u64,
}

/// Check a module value; `place` names where it came from.
pub fn check_module(module_mm: f64, place: &dyn Fn(String) -> Error) -> Result<f64> {
    let (lo, hi) = MODULE_RANGE_MM;
    if !module_mm.is_finite() || module_mm < lo || module_mm > hi {
        return Err(place(format!("module must be a number of mm from {lo} to {hi}, found {module_mm}")));
    }
    Ok(module_mm)
}

/// Check a diametral pitch (teeth per inch of pitch diameter) and give its module, mm, 25.4 / P,
/// which then lies in [`MODULE_RANGE_MM`]; `place` names where it came from.
pub fn check_diametral_pitch(teeth_per_inch: f64, place: &dyn Fn(String) -> Error) -> Result<f64> {
    let (lo, hi) = DIAMETRAL_PITCH_RANGE;
    match crate::geometry::module_from_diametral_pitch(teeth_per_inch) {
        Some(m) if (lo..=hi).contains(&teeth_per_inch) => Ok(m),
        _ => Err(place(format!(
            "diametral pitch must be a number of teeth per inch from {lo} to {hi} (modules of {} to {} \
             mm), found {teeth_per_inch}",
            25.4 / hi,
            25.4 / lo
        ))),
    }
}

/// Check a pressure angle; `place` names where it came from.
pub fn check_pressure_angle(deg: f64, place: &dyn Fn(String) -> Error) -> Result<f64> {
    let (lo, hi) = PRESSURE_ANGLE_RANGE_DEG;
    if !deg.is_finite() || deg < lo || deg > hi {
        return Err(place(format!("pressure angle must be from {lo}° to {hi}°, found {deg}")));
    }
    Ok(deg)
}

impl Pool {
    /// Gears to be cut: every tooth count in `teeth`, any number of each, one module.
    pub fn to_cut(
        teeth: IntRange,
        module_mm: f64,
        pressure_angle_deg: f64,
        diametral_pitch: Option<f64>,
    ) -> Result<Pool> {
        match diametral_pitch {
            Some(p) => {
                check_diametral_pitch(p, &|m| Error::value(Quantity::DiametralPitch, m)).map(|_| ())?
            }
            None => check_module(module_mm, &|m| Error::value(Quantity::Module, m)).map(|_| ())?,
        }
        check_pressure_angle(pressure_angle_deg, &|m| Error::value(Quantity::PressureAngle, m))?;
        let teeth_err = |m: String| Error::value(Quantity::ToothRange, m);
        if teeth.lo < MIN_TEETH || teeth.hi > MAX_TEETH {
            return Err(teeth_err(format!("teeth must lie within {MIN_TEETH}..{MAX_TEETH}")));
        }
        let gears = (teeth.lo..=teeth.hi)
            .map(|t| GearKind { teeth: t, group: 0, quantity: None, labels: Vec::new(), made: None })
            .collect();
        let pool = Pool {
            groups: vec![MeshGroup { module_mm, pressure_angle_deg, diametral_pitch }],
            gears,
            from_stock: false,
            rings_left_out: 0,
        };
        pool.check_can_mesh(&teeth_err)?;
        Ok(pool)
    }

    /// Gears on hand. Gears of the same teeth, module and pressure angle merge and their
    /// quantities add up; `source` names the catalogues in errors.
    pub fn from_stock(stock: &[StockGear], source: &str) -> Result<Pool> {
        Pool::from_stock_at(stock, &|m| Error::problem(format!("{source}: {m}")))
    }

    /// [`Pool::from_stock`] for gears that came from elsewhere than catalogues (a trade's own
    /// gears to cut); `place` makes each error name where they came from.
    pub fn from_stock_at(stock: &[StockGear], place: &dyn Fn(String) -> Error) -> Result<Pool> {
        let mut groups: Vec<MeshGroup> = Vec::new();
        let mut gears: Vec<GearKind> = Vec::new();
        let mut rings_left_out = 0u64;
        for g in stock {
            if g.internal {
                rings_left_out += u64::from(g.quantity);
                continue;
            }
            let group = match groups.iter().position(|m| m.meshes_with(g.module_mm, g.pressure_angle_deg)) {
                Some(i) => i,
                None => {
                    groups.push(MeshGroup {
                        module_mm: g.module_mm,
                        pressure_angle_deg: g.pressure_angle_deg,
                        diametral_pitch: g.diametral_pitch,
                    });
                    groups.len() - 1
                }
            };
            let alike = |k: &&mut GearKind| match (&k.made, &g.made) {
                (Some(a), Some(b)) => a.same_as(b),
                (a, b) => a.is_none() && b.is_none(),
            };
            match gears.iter_mut().find(|k| k.group == group && k.teeth == g.teeth && alike(k)) {
                Some(k) => {
                    // Nothing the user gave is silently capped: a total past u32 is refused.
                    let q = k.quantity.unwrap_or(0).checked_add(g.quantity).ok_or_else(|| {
                        place(format!(
                            "the quantities of the {}-tooth gear add up to more than {}",
                            g.teeth,
                            u32::MAX
                        ))
                    })?;
                    k.quantity = Some(q);
                    if !g.label.is_empty() {
                        k.labels.push(g.label.clone());
                    }
                }
                None => gears.push(GearKind {
                    teeth: g.teeth,
                    group,
                    quantity: Some(g.quantity),
                    labels: if g.label.is_empty() { Vec::new() } else { vec![g.label.clone()] },
                    made: g.made,
                }),
            }
        }
        if gears.is_empty() {
            return Err(place(if rings_left_out > 0 {
                "no external gears in stock, only ring gears (internal), which a chain of external meshes \
                 cannot use"
                    .into()
            } else {
                "no gears in stock".into()
            }));
        }
        let mut pool = Pool { groups, gears, from_stock: true, rings_left_out };
        pool.sort_kinds();
        pool.check_can_mesh(place)?;
        Ok(pool)
    }

    /// Sort the kinds by group, then teeth; gears of one tooth count made differently by shift,
    /// then tip, so the order never depends on the order of the rows.
    pub fn sort_kinds(&mut self) {
        self.gears.sort_by(|a, b| {
            let key =
                |k: &GearKind| k.made.map(|m| (m.shift, m.tip_diameter_mm.unwrap_or(f64::NEG_INFINITY)));
            (a.group, a.teeth).cmp(&(b.group, b.teeth)).then_with(|| match (key(a), key(b)) {
                (Some(x), Some(y)) => x.partial_cmp(&y).unwrap_or(std::cmp::Ordering::Equal),
                (x, y) => x.is_some().cmp(&y.is_some()),
            })
        });
    }

    /// Refuse a pool in which no two gears of different tooth counts share a mesh group; `place`
    /// names where the gears came from.
    fn check_can_mesh(&self, place: &dyn Fn(String) -> Error) -> Result<()> {
        let ok =
            self.gears.iter().any(|a| self.gears.iter().any(|b| a.group == b.group && a.teeth != b.teeth));
        if ok {
            Ok(())
        } else {
            Err(place(
                "nothing can mesh: a stage needs two gears of different tooth counts with the same \
                 module and pressure angle"
                    .into(),
            ))
        }
    }

    /// Module of a gear kind, mm.
    pub fn module_of(&self, gear: usize) -> f64 {
        self.groups[self.gears[gear].group].module_mm
    }

    /// One-line description for reports, e.g. `teeth 12..150, module 1 mm, 20°`.
    pub fn describe(&self) -> String {
        let groups: Vec<String> = self.groups.iter().map(describe_group).collect();
        if self.from_stock {
            let total: u64 = self.gears.iter().map(|g| g.quantity.unwrap_or(0) as u64).sum();
            let rings = match self.rings_left_out {
                0 => String::new(),
                1 => {
                    "; 1 ring gear (internal teeth) not used: a chain of external meshes cannot use it".into()
                }
                n => format!(
                    "; {n} ring gears (internal teeth) not used: a chain of external meshes cannot use them"
                ),
            };
            format!("{} gears on hand ({} kinds) in {}{rings}", total, self.gears.len(), groups.join("; "))
        } else {
            let lo = self.gears.first().map_or(0, |g| g.teeth);
            let hi = self.gears.last().map_or(0, |g| g.teeth);
            format!("any number of gears of {lo}..{hi} teeth, {}", groups.join("; "))
        }
    }
}

/// `module 1.5 mm, 20°` or `16 DP (module 1.5875 mm), 14.5°`.
pub fn describe_group(g: &MeshGroup) -> String {
    match g.diametral_pitch {
        Some(p) => format!(
            "{} DP (module {} mm), {}°",
            fmt_num(p),
            fmt_num(g.module_mm),
            fmt_num(g.pressure_angle_deg)
        ),
        None => format!("module {} mm, {}°", fmt_num(g.module_mm), fmt_num(g.pressure_angle_deg)),
    }
}

/// A number with at most 4 decimals and no trailing zeros.
pub fn fmt_num(v: f64) -> String {
    let s = format!("{v:.4}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".to_string()
    } else {
        s.to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn g(teeth: u32, module_mm: f64, q: u32) -> StockGear {
        StockGear::on_hand(teeth, module_mm, 20.0, q)
    }

    #[test]
    fn stock_merges_interchangeable_gears() {
        let p = Pool::from_stock(&[g(20, 1.0, 1), g(40, 1.0, 1), g(20, 1.0, 2), g(20, 1.5, 1)], "t").unwrap();
        assert_eq!(p.groups.len(), 2);
        let k20: Vec<_> = p.gears.iter().filter(|k| k.teeth == 20).collect();
        assert_eq!(k20.len(), 2);
        assert_eq!(k20[0].quantity, Some(3));
    }

    #[test]
    fn nothing_to_mesh_is_refused() {
        let e = Pool::from_stock(&[g(20, 1.0, 5), g(40, 1.5, 1)], "x.csv").unwrap_err();
        assert!(e.to_string().contains("nothing can mesh"));
        assert!(Pool::from_stock(&[], "x.csv").is_err());
        assert!(Pool::to_cut(IntRange { lo: 20, hi: 20 }, 1.0, 20.0, None).is_err());
    }

    #[test]
    fn errors_name_the_catalogues_or_the_quantity() {
        let e = Pool::from_stock(&[g(20, 1.0, 5)], "catalogue x.csv").unwrap_err().to_string();
        assert!(e.starts_with("catalogue x.csv: nothing can mesh: a stage needs two gears"), "{e}");
        let e = Pool::to_cut(IntRange { lo: 20, hi: 20 }, 1.0, 20.0, None).unwrap_err();
        assert!(e.to_string().starts_with("the tooth range: nothing can mesh: "), "{e}");
        let e = Pool::to_cut(IntRange { lo: 12, hi: 40 }, 0.0, 20.0, None).unwrap_err().to_string();
        assert_eq!(e, "the module: module must be a number of mm from 0.05 to 100, found 0");
        let e = Pool::to_cut(IntRange { lo: 12, hi: 40 }, 1.0, 90.0, None).unwrap_err().to_string();
        assert_eq!(e, "the pressure angle: pressure angle must be from 10° to 35°, found 90");
    }

    #[test]
    fn bad_module_and_angle_are_refused() {
        let r = IntRange { lo: 12, hi: 40 };
        assert!(Pool::to_cut(r, 0.0, 20.0, None).is_err());
        assert!(Pool::to_cut(r, f64::NAN, 20.0, None).is_err());
        assert!(Pool::to_cut(r, 1.0, 90.0, None).is_err());
        assert!(Pool::to_cut(r, 1.0, 14.5, None).is_ok());
    }

    #[test]
    fn a_diametral_pitch_is_held_to_the_module_limits_in_its_own_unit() {
        let place = |m: String| Error::value(Quantity::DiametralPitch, m);
        let (m_lo, m_hi) = MODULE_RANGE_MM;
        for p in [0.254, 1.0, 16.0, 500.0] {
            let m = check_diametral_pitch(p, &place).unwrap();
            assert!((m_lo..=m_hi).contains(&m), "{p}: {m}");
        }
        let e = check_diametral_pitch(0.001, &place).unwrap_err().to_string();
        assert_eq!(
            e,
            "the diametral pitch: diametral pitch must be a number of teeth per inch from 0.254 to 500 \
             (modules of 0.0508 to 100 mm), found 0.001"
        );
        assert!(check_diametral_pitch(508.0, &place).is_err());
        assert!(check_diametral_pitch(f64::NAN, &place).is_err());
        // Gears to cut in diametral pitch are checked as such, named by their own quantity.
        let e = Pool::to_cut(IntRange { lo: 12, hi: 40 }, 25400.0, 20.0, Some(0.001)).unwrap_err();
        assert!(e.to_string().starts_with("the diametral pitch: "), "{e}");
    }

    #[test]
    fn numbers_print_plainly() {
        assert_eq!(fmt_num(1.0), "1");
        assert_eq!(fmt_num(1.5875), "1.5875");
        assert_eq!(fmt_num(47.50001), "47.5");
    }
}
