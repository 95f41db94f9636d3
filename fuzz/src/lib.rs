//! The invariants the fuzz targets hold gearsieve's input parsers to. Each check panics on a
//! broken invariant, which is how libFuzzer learns of a failure; `tests/fuzz_regressions.rs` in
//! the main package includes this file as a module and runs the same checks on the seed corpus
//! and on every input a fuzzer has ever failed on, so `cargo test` keeps them.
//!
//! Nothing here depends on libFuzzer: it uses only the gearsieve library.

use std::path::Path;

use gearsieve::model::catalog::{self, CatalogueDefaults};
use gearsieve::model::pool::{
    Pool, StockGear, MAX_TEETH, MIN_TEETH, MODULE_RANGE_MM, PRESSURE_ANGLE_RANGE_DEG,
};
use gearsieve::numbers::length::{parse_length, LengthUnit};
use gearsieve::numbers::period::{parse_period, TimeUnit};
use gearsieve::numbers::range::{parse_int_range, parse_length_range, parse_ratio_range};
use gearsieve::numbers::rational::{gcd, Ratio};
use gearsieve::numbers::target::{parse_ratio, parse_tolerance};
use gearsieve::Quantity;

/// The file name the catalogue checks pass to the loader; every error must name it.
pub const CATALOGUE_NAME: &str = "fuzz.csv";

/// Which text parsers accepted an input, so a corpus can be shown to reach both outcomes.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct TextOutcome {
    /// `parse_ratio` returned a ratio.
    pub ratio: bool,
    /// `parse_tolerance` returned a tolerance.
    pub tolerance: bool,
    /// `parse_int_range` (teeth, 3..=1000) returned a range.
    pub int_range: bool,
    /// `parse_ratio_range` returned a range.
    pub ratio_range: bool,
    /// `parse_length_range` returned a range.
    pub float_range: bool,
}

/// What the catalogue loader and the pool made of one input.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct CatalogueOutcome {
    /// Gears loaded with no default module (0 when the loader refused the file).
    pub gears_without_default: usize,
    /// Gears loaded with a default module for rows that give none.
    pub gears_with_default: usize,
    /// `Pool::from_stock` accepted the gears loaded with the default module.
    pub pool: bool,
}

fn assert_reduced_positive(r: Ratio, what: &str, input: &str) {
    assert!(r.den() > 0, "{what} of {input:?} has a zero denominator: {r:?}");
    assert_eq!(gcd(r.num() as u128, r.den() as u128), 1, "{what} of {input:?} is not reduced: {r:?}");
}

fn assert_names_quantity(message: &str, quantity: Quantity, input: &str) {
    assert!(
        message.starts_with(&format!("{quantity}: ")),
        "error for {input:?} does not start with \"{quantity}: \": {message}"
    );
}

/// Run every text parser on `input` and check what each returns.
///
/// - A ratio is positive and reduced, and parsing its `Display` gives the same ratio.
/// - A tolerance is reduced and in `[0, 1)`.
/// - A teeth range lies in `3..=1000` with `lo ≤ hi`, and parsing its `Display` gives it back.
/// - A ratio range has at least one end, each end positive and reduced, `lo ≤ hi`.
/// - A length range has `lo ≤ hi`; each end is finite and positive unless left open (`0` below,
///   infinity above).
/// - A length or a period (with or without a unit) is positive and reduced.
/// - Every error message starts with the quantity it was given.
///
/// Panics on a broken invariant (and, of course, if a parser panics).
pub fn check_text(input: &str) -> TextOutcome {
    let mut seen = TextOutcome::default();

    match parse_ratio(input, Quantity::TargetRatio) {
        Ok(r) => {
            seen.ratio = true;
            assert!(r.num() > 0, "ratio of {input:?} is not positive: {r:?}");
            assert_reduced_positive(r, "ratio", input);
            let shown = r.to_string();
            match parse_ratio(&shown, Quantity::TargetRatio) {
                Ok(again) => {
                    assert_eq!(again, r, "ratio of {input:?} shown as {shown:?} reads back differently")
                }
                Err(e) => panic!("ratio of {input:?} shown as {shown:?} does not read back: {e}"),
            }
        }
        Err(e) => assert_names_quantity(&e.to_string(), Quantity::TargetRatio, input),
    }

    match parse_tolerance(input) {
        Ok(t) => {
            seen.tolerance = true;
            assert_reduced_positive(t, "tolerance", input);
            assert!(t.num() < t.den(), "tolerance of {input:?} is not below 1: {t:?}");
        }
        Err(e) => assert_names_quantity(&e.to_string(), Quantity::Tolerance, input),
    }

    match parse_int_range(input, Quantity::ToothRange, "teeth", MIN_TEETH, MAX_TEETH) {
        Ok(r) => {
            seen.int_range = true;
            assert!(
                MIN_TEETH <= r.lo && r.lo <= r.hi && r.hi <= MAX_TEETH,
                "teeth range of {input:?} is out of bounds: {r:?}"
            );
            let shown = r.to_string();
            match parse_int_range(&shown, Quantity::ToothRange, "teeth", MIN_TEETH, MAX_TEETH) {
                Ok(again) => {
                    assert_eq!(again, r, "teeth range of {input:?} shown as {shown:?} reads back differently")
                }
                Err(e) => {
                    panic!("teeth range of {input:?} shown as {shown:?} does not read back: {e}")
                }
            }
        }
        Err(e) => assert_names_quantity(&e.to_string(), Quantity::ToothRange, input),
    }

    match parse_ratio_range(input, Quantity::StageRatio) {
        Ok(r) => {
            seen.ratio_range = true;
            assert!(r.lo.is_some() || r.hi.is_some(), "ratio range of {input:?} has no end");
            for end in [r.lo, r.hi].into_iter().flatten() {
                assert!(end.num() > 0, "ratio range of {input:?} has end {end:?}");
                assert_reduced_positive(end, "ratio range end", input);
            }
            if let (Some(lo), Some(hi)) = (r.lo, r.hi) {
                assert!(lo <= hi, "ratio range of {input:?} is inverted: {r:?}");
            }
        }
        Err(e) => assert_names_quantity(&e.to_string(), Quantity::StageRatio, input),
    }

    match parse_length_range(input, Quantity::CentreDistance) {
        Ok(r) => {
            seen.float_range = true;
            assert!(r.lo <= r.hi, "length range of {input:?} is inverted or NaN: {r:?}");
            assert!(
                r.lo == 0.0 || (r.lo.is_finite() && r.lo > 0.0),
                "length range of {input:?} has a bad lower end: {r:?}"
            );
            assert!(
                r.hi == f64::INFINITY || (r.hi.is_finite() && r.hi > 0.0),
                "length range of {input:?} has a bad upper end: {r:?}"
            );
            assert!(r.lo > 0.0 || r.hi.is_finite(), "length range of {input:?} is open at both ends: {r:?}");
        }
        Err(e) => assert_names_quantity(&e.to_string(), Quantity::CentreDistance, input),
    }

    // Lengths and periods: positive and exact when read, or refused naming their quantity.
    for default in [None, Some(LengthUnit::Millimetre), Some(LengthUnit::Metre)] {
        match parse_length(input, Quantity::CentreDistance, default) {
            Ok(l) => {
                assert!(l.mm.num() > 0, "length of {input:?} is not positive: {l:?}");
                assert_reduced_positive(l.mm, "length", input);
            }
            Err(e) => assert_names_quantity(&e.to_string(), Quantity::CentreDistance, input),
        }
    }
    for unit in [TimeUnit::Second, TimeUnit::Day] {
        match parse_period(input, Quantity::PendulumPeriod, unit) {
            Ok(p) => {
                assert!(p.num() > 0, "period of {input:?} is not positive: {p:?}");
                assert_reduced_positive(p, "period", input);
            }
            Err(e) => assert_names_quantity(&e.to_string(), Quantity::PendulumPeriod, input),
        }
    }

    seen
}

fn check_gear(g: &StockGear, input: &[u8]) {
    let (m_lo, m_hi) = MODULE_RANGE_MM;
    let (a_lo, a_hi) = PRESSURE_ANGLE_RANGE_DEG;
    assert!(
        (MIN_TEETH..=MAX_TEETH).contains(&g.teeth),
        "loaded a gear with {} teeth from {input:?}",
        g.teeth
    );
    assert!(
        g.module_mm.is_finite() && (m_lo..=m_hi).contains(&g.module_mm),
        "loaded a gear of module {} from {input:?}",
        g.module_mm
    );
    assert!(
        g.pressure_angle_deg.is_finite() && (a_lo..=a_hi).contains(&g.pressure_angle_deg),
        "loaded a gear of pressure angle {} from {input:?}",
        g.pressure_angle_deg
    );
    assert!(g.quantity >= 1, "loaded a gear of quantity 0 from {input:?}");
    if let Some(p) = g.diametral_pitch {
        assert!(p.is_finite() && p > 0.0, "loaded a gear of diametral pitch {p} from {input:?}");
        assert!(
            (g.module_mm - 25.4 / p).abs() <= 1e-6 * g.module_mm,
            "loaded a gear whose module {} disagrees with its diametral pitch {p} from {input:?}",
            g.module_mm
        );
    }
}

fn check_pool(pool: &Pool, stock: &[StockGear], input: &[u8]) {
    assert!(pool.from_stock, "a pool from stock says it is not");
    for k in &pool.gears {
        assert!(k.group < pool.groups.len(), "gear kind points at a missing mesh group, from {input:?}");
        assert!(
            k.quantity.is_some_and(|q| q >= 1),
            "gear kind from stock without a quantity, from {input:?}"
        );
    }
    for w in pool.gears.windows(2) {
        assert!(
            (w[0].group, w[0].teeth) < (w[1].group, w[1].teeth),
            "gear kinds are not sorted and unique, from {input:?}"
        );
    }
    // Merging may add quantities up but never lose or invent a gear.
    let loaded: u64 = stock.iter().map(|g| g.quantity as u64).sum();
    let pooled: u64 = pool.gears.iter().map(|k| k.quantity.unwrap_or(0) as u64).sum();
    assert_eq!(loaded, pooled, "the pool holds a different number of gears than {input:?}");
    for g in stock {
        assert!(
            pool.gears
                .iter()
                .any(|k| k.teeth == g.teeth
                    && pool.groups[k.group].meshes_with(g.module_mm, g.pressure_angle_deg)),
            "a loaded gear of {} teeth has no place in the pool, from {input:?}",
            g.teeth
        );
    }
    assert!(
        pool.gears.iter().any(|a| pool.gears.iter().any(|b| a.group == b.group && a.teeth != b.teeth)),
        "the pool was accepted though nothing in it can mesh, from {input:?}"
    );
}

fn assert_catalogue_error(message: &str, input: &[u8]) {
    assert!(
        message.starts_with(&format!("catalogue {CATALOGUE_NAME}")),
        "catalogue error for {input:?} does not start with \"catalogue {CATALOGUE_NAME}\": {message}"
    );
}

/// Load `input` as a catalogue, once without and once with a default module, and merge what
/// loads into a pool.
///
/// - Every loaded gear has teeth in `3..=1000`, a finite module and pressure angle inside the
///   allowed ranges, a quantity of at least 1, and a diametral pitch (if any) that agrees with
///   its module.
/// - A default module only fills rows that give none: a file that loads without one loads the
///   same with one.
/// - A loader error starts with `catalogue fuzz.csv`; a pool error names `fuzz.csv`.
/// - A pool holds exactly the gears loaded, sorted and merged by tooth count and mesh group,
///   and at least two of them can mesh.
///
/// Panics on a broken invariant (and if the loader or the pool panics).
pub fn check_catalogue(input: &[u8]) -> CatalogueOutcome {
    let path = Path::new(CATALOGUE_NAME);
    let mut seen = CatalogueOutcome::default();

    let bare = catalog::parse(input, path, CatalogueDefaults::default());
    let with_default = catalog::parse(
        input,
        path,
        CatalogueDefaults { module_mm: Some(1.25), ..CatalogueDefaults::default() },
    );

    match &bare {
        Ok(gears) => {
            seen.gears_without_default = gears.len();
            gears.iter().for_each(|g| check_gear(g, input));
            assert_eq!(
                Some(gears),
                with_default.as_ref().ok(),
                "a default module changed a catalogue that needs none: {input:?}"
            );
        }
        Err(e) => assert_catalogue_error(&e.to_string(), input),
    }

    match &with_default {
        Ok(gears) => {
            assert!(!gears.is_empty(), "loaded no gears without an error from {input:?}");
            seen.gears_with_default = gears.len();
            gears.iter().for_each(|g| check_gear(g, input));
            match Pool::from_stock(gears, CATALOGUE_NAME) {
                Ok(pool) => {
                    seen.pool = true;
                    check_pool(&pool, gears, input);
                }
                Err(e) => {
                    let message = e.to_string();
                    assert!(
                        message.starts_with(&format!("{CATALOGUE_NAME}: ")),
                        "pool error for {input:?} does not name the catalogue: {message}"
                    );
                }
            }
        }
        Err(e) => assert_catalogue_error(&e.to_string(), input),
    }

    seen
}
