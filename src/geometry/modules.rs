//! Module sizes: the DIN 780 preferred series and the conversion from diametral pitch.
//!
//! Owns the list of standard modules and the inch–millimetre factor; it does not validate or
//! restrict which modules a search may use (that is the gear pool's business).

/// Millimetres in one inch, exactly (international yard and pound agreement, 1959).
pub const MM_PER_INCH: f64 = 25.4;

/// DIN 780 module series I (preferred), mm, ascending.
pub const MODULE_SERIES_I: [f64; 33] = [
    0.05, 0.06, 0.08, 0.1, 0.12, 0.16, 0.2, 0.25, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.25, 1.5, 2.0,
    2.5, 3.0, 4.0, 5.0, 6.0, 8.0, 10.0, 12.0, 16.0, 20.0, 25.0, 32.0, 40.0, 50.0,
];

/// DIN 780 module series II (second choice), mm, ascending.
pub const MODULE_SERIES_II: [f64; 33] = [
    0.055, 0.07, 0.09, 0.11, 0.14, 0.18, 0.22, 0.28, 0.35, 0.45, 0.55, 0.65, 0.75, 0.85, 0.95, 1.125, 1.375,
    1.75, 2.25, 2.75, 3.5, 4.5, 5.5, 7.0, 9.0, 11.0, 14.0, 18.0, 22.0, 28.0, 36.0, 45.0, 55.0,
];

/// Which DIN 780 series a standard module belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Series {
    /// Series I, to be preferred.
    I,
    /// Series II, second choice.
    II,
}

/// The DIN 780 series that `module_mm` belongs to, or `None` for a module in neither.
///
/// A module matches a listed one to 1 part in 10⁹, so a value that went through a unit conversion
/// or a text round trip still matches; the listed values are far further apart than that.
pub fn is_standard_module(module_mm: f64) -> Option<Series> {
    let matches = |listed: &f64| (module_mm - listed).abs() <= 1e-9 * listed;
    if MODULE_SERIES_I.iter().any(matches) {
        Some(Series::I)
    } else if MODULE_SERIES_II.iter().any(matches) {
        Some(Series::II)
    } else {
        None
    }
}

/// The module in mm of a gear of diametral pitch `teeth_per_inch` (teeth per inch of pitch
/// diameter): `m = 25.4 / P`. `None` unless `P` is a positive finite number.
pub fn module_from_diametral_pitch(teeth_per_inch: f64) -> Option<f64> {
    (teeth_per_inch.is_finite() && teeth_per_inch > 0.0).then(|| MM_PER_INCH / teeth_per_inch)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn inch_is_exactly_25_4_mm() {
        // Source: 1 inch = 25.4 mm exactly (international yard and pound agreement, 1959).
        assert_eq!(MM_PER_INCH, 25.4);
        // So 25.4 = 127/5: an exact inch/metric translation needs a 127-tooth gear.
        assert_eq!(MM_PER_INCH * 5.0, 127.0);
    }

    #[test]
    fn diametral_pitch_to_module() {
        // m = 25.4 / P (common practice; 1 in = 25.4 mm exactly).
        assert_eq!(module_from_diametral_pitch(2.0), Some(12.7));
        assert_eq!(module_from_diametral_pitch(25.4), Some(1.0));
        assert!((module_from_diametral_pitch(32.0).unwrap() - 0.79375).abs() < 1e-15);
        assert_eq!(module_from_diametral_pitch(0.0), None);
        assert_eq!(module_from_diametral_pitch(-4.0), None);
        assert_eq!(module_from_diametral_pitch(f64::NAN), None);
        assert_eq!(module_from_diametral_pitch(f64::INFINITY), None);
    }

    #[test]
    fn series_match_the_published_lists() {
        // Source: German Wikipedia, "Modul (Technik)", DIN 780.
        let series_i = "0.05 0.06 0.08 0.1 0.12 0.16 0.2 0.25 0.3 0.4 0.5 0.6 0.7 0.8 0.9 1 1.25 \
                        1.5 2 2.5 3 4 5 6 8 10 12 16 20 25 32 40 50";
        let series_ii = "0.055 0.07 0.09 0.11 0.14 0.18 0.22 0.28 0.35 0.45 0.55 0.65 0.75 0.85 \
                         0.95 1.125 1.375 1.75 2.25 2.75 3.5 4.5 5.5 7 9 11 14 18 22 28 36 45 55";
        let parse = |s: &str| -> Vec<f64> { s.split_whitespace().map(|t| t.parse().unwrap()).collect() };
        assert_eq!(MODULE_SERIES_I.to_vec(), parse(series_i));
        assert_eq!(MODULE_SERIES_II.to_vec(), parse(series_ii));
    }

    #[test]
    fn series_are_ascending_and_disjoint() {
        for list in [&MODULE_SERIES_I, &MODULE_SERIES_II] {
            assert!(list.windows(2).all(|w| w[0] < w[1]));
        }
        // No value is in both series, and the lookup finds every series II value as such.
        for &m in &MODULE_SERIES_II {
            assert_eq!(is_standard_module(m), Some(Series::II), "{m}");
            assert!(!MODULE_SERIES_I.contains(&m));
        }
    }

    #[test]
    fn standard_module_lookup() {
        assert_eq!(is_standard_module(1.25), Some(Series::I));
        assert_eq!(is_standard_module(1.125), Some(Series::II));
        assert_eq!(is_standard_module(3.0 * (1.0 + 1e-12)), Some(Series::I));
        assert_eq!(is_standard_module(1.3), None);
        assert_eq!(is_standard_module(60.0), None);
        assert_eq!(is_standard_module(f64::NAN), None);
        // 10 DP gives 2.54 mm, which is in neither series.
        assert_eq!(is_standard_module(module_from_diametral_pitch(10.0).unwrap()), None);
    }
}
