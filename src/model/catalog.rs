//! Stock catalogues: CSV files listing the gears on hand. Owns the file format and its errors;
//! merging into mesh groups is [`crate::model::pool`]'s job.
//!
//! Format: a header row, then one row per gear or batch of gears. Columns (any order, names
//! case-insensitive):
//! - `teeth` (required): whole number from 3 to 1000;
//! - `module` (mm) or `diametral_pitch` (teeth per inch of pitch diameter); both may be given
//!   if they agree (module = 25.4 / diametral pitch). An empty cell, or no such column, takes the
//!   default module the caller gives ([`CatalogueDefaults`]), and is an error without one;
//! - `pressure_angle` (degrees, default 20);
//! - `quantity` (whole number ≥ 1, default 1);
//! - `shift` (the profile shift coefficient the gear was cut with, in modules, from -1 to 2;
//!   default 0) and `tip_diameter_mm` (its tip diameter as measured, mm; default the tip as cut
//!   for its shift): a gear on hand is used as it is made, never re-cut;
//! - `internal` (`yes` or `no`, default no): a ring gear with internal teeth, for planetary
//!   trains; a chain of external meshes leaves it out and says so;
//! - `label` (free text shown in results) and `note`/`notes` (free text, ignored).
//!
//! Lines starting with `#` are comments; a UTF-8 byte-order mark, CRLF line ends, quoted fields
//! and blanks around fields are accepted. Any other column is refused (a misspelt `modul` would
//! otherwise be silently ignored), naming the column and the known ones.

use std::path::Path;

use crate::error::{Error, Message, Quantity, Result};
use crate::model::pool::{
    check_diametral_pitch, check_module, check_pressure_angle, AsMade, StockGear, MAX_TEETH, MIN_TEETH,
};

/// Defaults for cells a catalogue leaves empty.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CatalogueDefaults {
    /// Module for rows without one, mm.
    pub module_mm: Option<f64>,
    /// Pressure angle for rows without one, degrees.
    pub pressure_angle_deg: f64,
}

impl Default for CatalogueDefaults {
    fn default() -> Self {
        CatalogueDefaults { module_mm: None, pressure_angle_deg: 20.0 }
    }
}

const KNOWN: &[&str] = &[
    "teeth",
    "module",
    "diametral_pitch",
    "pressure_angle",
    "quantity",
    "shift",
    "tip_diameter_mm",
    "internal",
    "label",
    "note",
    "notes",
];

/// Profile shift coefficients a catalogue row may give, in modules: wider than any gear is
/// usually cut with, so only a slip (a shift in mm, say) is refused.
pub const SHIFT_RANGE: (f64, f64) = (-1.0, 2.0);

/// Read one catalogue file.
pub fn load(path: &Path, defaults: CatalogueDefaults) -> Result<Vec<StockGear>> {
    let file_err =
        |message: String| Error::CatalogueFile { path: path.to_path_buf(), message: message.into() };
    if path.is_dir() {
        return Err(file_err("is a directory; wanted a CSV file".into()));
    }
    let bytes = std::fs::read(path).map_err(|e| file_err(format!("cannot read it: {e}")))?;
    parse(&bytes, path, defaults)
}

/// Parse catalogue text; `path` is used only in error messages.
pub fn parse(bytes: &[u8], path: &Path, defaults: CatalogueDefaults) -> Result<Vec<StockGear>> {
    let file_err =
        |message: String| Error::CatalogueFile { path: path.to_path_buf(), message: message.into() };
    let bytes = bytes.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(bytes);
    let mut reader =
        csv::ReaderBuilder::new().comment(Some(b'#')).trim(csv::Trim::All).flexible(false).from_reader(bytes);
    let headers = reader
        .headers()
        .map_err(|e| file_err(format!("cannot read the header row: {}", csv_reason(&e))))?
        .clone();
    if headers.is_empty() || headers.iter().all(str::is_empty) {
        return Err(file_err("is empty; wanted a header row such as teeth,module,quantity".into()));
    }
    let names: Vec<String> = headers.iter().map(|h| h.to_ascii_lowercase()).collect();
    for (i, n) in names.iter().enumerate() {
        if !KNOWN.contains(&n.as_str()) {
            return Err(file_err(format!(
                "unknown column \"{}\"; known columns are {} (put free text in label or note)",
                &headers[i],
                KNOWN.join(", ")
            )));
        }
        if names[..i].contains(n) {
            return Err(file_err(format!("column \"{n}\" appears twice")));
        }
    }
    let col = |name: &str| names.iter().position(|n| n == name);
    let teeth_col =
        col("teeth").ok_or_else(|| file_err("has no teeth column; the header must name one".into()))?;
    let (module_col, dp_col, pa_col, qty_col, label_col) =
        (col("module"), col("diametral_pitch"), col("pressure_angle"), col("quantity"), col("label"));
    let (shift_col, tip_col, internal_col) = (col("shift"), col("tip_diameter_mm"), col("internal"));

    let mut out = Vec::new();
    for record in reader.records() {
        let record = record.map_err(|e| {
            let row = e.position().map_or(0, |p| p.line());
            Error::CatalogueFile {
                path: path.to_path_buf(),
                message: format!("row {row}: {}", csv_reason(&e)).into(),
            }
        })?;
        let row = record.position().map_or(0, |p| p.line());
        let field_message = |column: &str, message: Message| Error::CatalogueField {
            path: path.to_path_buf(),
            row,
            column: column.to_string(),
            message,
        };
        let field_err = |column: &str, message: String| field_message(column, message.into());
        let cell = |c: Option<usize>| c.map(|c| &record[c]).filter(|s| !s.is_empty());
        let teeth_text = &record[teeth_col];
        let teeth = parse_whole(teeth_text)
            .filter(|t| (MIN_TEETH as u64..=MAX_TEETH as u64).contains(t))
            .ok_or_else(|| {
                field_err("teeth", format!("teeth must be a whole number from {MIN_TEETH} to {MAX_TEETH}, found \"{teeth_text}\""))
            })? as u32;
        let module = match cell(module_col) {
            Some(s) => Some(parse_positive(s).ok_or_else(|| {
                field_err("module", format!("module must be a positive number of mm, found \"{s}\""))
            })?),
            None => None,
        };
        let dp = match cell(dp_col) {
            Some(s) => Some(parse_positive(s).ok_or_else(|| {
                field_err(
                    "diametral_pitch",
                    format!("diametral pitch must be a positive number of teeth per inch, found \"{s}\""),
                )
            })?),
            None => None,
        };
        // A diametral pitch is held to the module limits said in teeth per inch, so its error
        // names the column and the unit the row gave.
        let dp_module = dp
            .map(|p| check_diametral_pitch(p, &|m| field_err("diametral_pitch", m)).map(|m| (p, m)))
            .transpose()?;
        let module_mm = match (module, dp_module) {
            (Some(m), Some((p, from_dp))) => {
                if (m - from_dp).abs() > 1e-6 * m {
                    return Err(field_err(
                        "diametral_pitch",
                        format!("diametral pitch {p} means module {:.4} mm, but module says {m}; give one or make them agree", from_dp),
                    ));
                }
                check_module(m, &|e| field_err("module", e))?
            }
            (Some(m), None) => check_module(m, &|e| field_err("module", e))?,
            (None, Some((_, from_dp))) => from_dp,
            (None, None) => {
                let m = defaults.module_mm.ok_or_else(|| {
                    field_message(
                        "module",
                        Message::from("no module: fill in module or diametral_pitch, or give ")
                            .quantity(Quantity::Module)
                            .text(" for the whole file"),
                    )
                })?;
                check_module(m, &|e| field_err("module", e))?
            }
        };
        let pressure_angle_deg = match cell(pa_col) {
            Some(s) => {
                let v: f64 = s.parse().map_err(|_| {
                    field_err(
                        "pressure_angle",
                        format!("pressure angle must be a number of degrees, found \"{s}\""),
                    )
                })?;
                check_pressure_angle(v, &|m| field_err("pressure_angle", m))?
            }
            None => defaults.pressure_angle_deg,
        };
        let quantity = match cell(qty_col) {
            Some(s) => parse_whole(s)
                .filter(|q| (1..=1_000_000).contains(q))
                .ok_or_else(|| field_err("quantity", format!("quantity must be a whole number from 1 to 1000000, found \"{s}\" (comment the row out with # to leave it out)")))?
                as u32,
            None => 1,
        };
        let label = cell(label_col).unwrap_or("").to_string();
        let shift = match cell(shift_col) {
            Some(s) => s.parse::<f64>().ok().filter(|x| (SHIFT_RANGE.0..=SHIFT_RANGE.1).contains(x)).ok_or_else(
                || {
                    field_err(
                        "shift",
                        format!(
                            "shift must be the profile shift coefficient in modules, from {} to {}, found \"{s}\"",
                            SHIFT_RANGE.0, SHIFT_RANGE.1
                        ),
                    )
                },
            )?,
            None => 0.0,
        };
        let tip_diameter_mm = match cell(tip_col) {
            Some(s) => {
                // The tip as cut, d + 2m(1 + x) for the usual rack; a measured tip far from it is
                // a slip (inches, or the wrong gear), not a worn blank.
                let as_cut = module_mm * (f64::from(teeth) + 2.0 * (1.0 + shift));
                match s.parse::<f64>().ok().filter(|d| d.is_finite() && (d - as_cut).abs() <= module_mm) {
                    Some(d) => Some(d),
                    None => {
                        return Err(field_err(
                            "tip_diameter_mm",
                            format!(
                                "tip diameter must be the measured tip in mm, within one module of the {} mm \
                                 a {teeth}-tooth gear of module {} with shift {} has as cut, found \"{s}\"",
                                crate::model::pool::fmt_num(as_cut),
                                crate::model::pool::fmt_num(module_mm),
                                crate::model::pool::fmt_num(shift),
                            ),
                        ))
                    }
                }
            }
            None => None,
        };
        let internal = match cell(internal_col).map(str::to_ascii_lowercase).as_deref() {
            None | Some("no" | "n" | "false" | "0") => false,
            Some("yes" | "y" | "true" | "1") => true,
            Some(_) => {
                return Err(field_err(
                    "internal",
                    format!(
                        "internal must be yes (a ring gear) or no, found \"{}\"",
                        &record[internal_col.unwrap_or(0)]
                    ),
                ))
            }
        };
        if internal {
            if let Some(column) = [("shift", shift_col), ("tip_diameter_mm", tip_col)]
                .into_iter()
                .find_map(|(name, c)| cell(c).map(|_| name))
            {
                return Err(field_err(
                    column,
                    format!("a ring gear's {column} is not used yet (rings on hand are taken as cut standard); leave it empty"),
                ));
            }
        }
        out.push(StockGear {
            internal,
            teeth,
            module_mm,
            diametral_pitch: dp,
            pressure_angle_deg,
            quantity,
            label,
            made: Some(AsMade { shift, tip_diameter_mm }),
        });
    }
    if out.is_empty() {
        return Err(file_err("has a header but no gears".into()));
    }
    Ok(out)
}

/// A whole number, also written as `20.0`; never rounds.
fn parse_whole(s: &str) -> Option<u64> {
    let (int, frac) = s.split_once('.').unwrap_or((s, ""));
    if int.is_empty() || !int.bytes().all(|b| b.is_ascii_digit()) || !frac.bytes().all(|b| b == b'0') {
        return None;
    }
    int.parse().ok()
}

fn parse_positive(s: &str) -> Option<f64> {
    s.parse::<f64>().ok().filter(|v| v.is_finite() && *v > 0.0)
}

fn csv_reason(e: &csv::Error) -> String {
    match e.kind() {
        csv::ErrorKind::Utf8 { .. } => "is not UTF-8 text; save the file as UTF-8 CSV".to_string(),
        csv::ErrorKind::UnequalLengths { expected_len, len, .. } => {
            format!("has {len} fields where the header has {expected_len}")
        }
        _ => e.to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn p(text: &str) -> Result<Vec<StockGear>> {
        parse(text.as_bytes(), Path::new("t.csv"), CatalogueDefaults::default())
    }

    #[test]
    fn a_missing_module_names_the_default_module_as_a_quantity() {
        let e = p("teeth\n20\n").unwrap_err();
        let wanted =
            "catalogue t.csv, row 2, column module: no module: fill in module or diametral_pitch, or give";
        assert_eq!(e.to_string(), format!("{wanted} the module for the whole file"));
        let named = e.render(|q| if q == Quantity::Module { "MODULE" } else { "?" });
        assert_eq!(named, format!("{wanted} MODULE for the whole file"));
    }

    #[test]
    fn reads_a_plain_catalogue() {
        let g =
            p("# box\nteeth,module,quantity,label\n20,1.5,2,A\n127,1.5,,\"metric, transposing\"\n").unwrap();
        assert_eq!(g.len(), 2);
        assert_eq!((g[0].teeth, g[0].quantity, g[0].label.as_str()), (20, 2, "A"));
        assert_eq!((g[1].teeth, g[1].quantity, g[1].label.as_str()), (127, 1, "metric, transposing"));
    }

    #[test]
    fn gears_on_hand_carry_their_shift_and_measured_tip() {
        let g = p("teeth,module,shift,tip_diameter_mm\n14,2,0.2,32.6\n40,2,,\n").unwrap();
        assert_eq!(g[0].made, Some(AsMade { shift: 0.2, tip_diameter_mm: Some(32.6) }));
        assert_eq!(g[1].made, Some(AsMade::default()));
        // A shift in mm, or a tip in inches, is refused with the row, column and what is wanted.
        let e = p("teeth,module,shift\n14,2,2.5\n").unwrap_err().to_string();
        assert!(
            e.contains("row 2, column shift: shift must be the profile shift coefficient in modules"),
            "{e}"
        );
        let e = p("teeth,module,tip_diameter_mm\n14,2,1.28\n").unwrap_err().to_string();
        assert!(e.contains("column tip_diameter_mm") && e.contains("32 mm"), "{e}");
        // Rows alike in every way merge; a differently cut gear of the same teeth stays apart.
        let g = p("teeth,module,shift\n14,2,0.2\n14,2,0.2\n14,2,0\n40,2,0\n").unwrap();
        let pool = crate::model::pool::Pool::from_stock(&g, "t.csv").unwrap();
        let fourteen: Vec<_> = pool.gears.iter().filter(|k| k.teeth == 14).collect();
        assert_eq!(fourteen.len(), 2);
        assert_eq!((fourteen[0].quantity, fourteen[0].made.unwrap().shift), (Some(1), 0.0));
        assert_eq!((fourteen[1].quantity, fourteen[1].made.unwrap().shift), (Some(2), 0.2));
    }

    #[test]
    fn bom_crlf_and_case_are_accepted() {
        let g = p("\u{feff}Teeth,Module\r\n30,1\r\n45,1\r\n").unwrap();
        assert_eq!(g.len(), 2);
    }

    #[test]
    fn diametral_pitch_becomes_module() {
        let g = p("teeth,diametral_pitch,pressure_angle\n40,16,14.5\n").unwrap();
        assert!((g[0].module_mm - 1.5875).abs() < 1e-12);
        assert_eq!(g[0].pressure_angle_deg, 14.5);
        assert!(p("teeth,module,diametral_pitch\n40,1.5875,16\n").is_ok());
        let e = p("teeth,module,diametral_pitch\n40,2,16\n").unwrap_err().to_string();
        assert!(e.contains("row 2, column diametral_pitch"), "{e}");
    }

    #[test]
    fn bad_rows_name_row_and_column() {
        let cases = [
            ("teeth,module\n20,1\ntwelve,1\n", "row 3, column teeth"),
            ("teeth,module\n0,1\n", "row 2, column teeth"),
            ("teeth,module\n-4,1\n", "column teeth"),
            ("teeth,module\n20.5,1\n", "column teeth"),
            ("teeth,module\n99999999999,1\n", "column teeth"),
            ("teeth,module\n20,0\n", "column module"),
            ("teeth,module\n20,NaN\n", "column module"),
            ("teeth,module\n20,\n", "column module"),
            ("teeth,module,quantity\n20,1,0\n", "column quantity"),
            ("teeth\n20\n", "column module"),
            ("module\n1\n", "no teeth column"),
            ("teeth,modul\n20,1\n", "unknown column \"modul\""),
            ("", "is empty"),
            ("teeth,module\n", "no gears"),
            ("teeth,module\n20,1,3\n", "fields"),
        ];
        for (text, want) in cases {
            let e = p(text).unwrap_err().to_string();
            assert!(e.contains(want), "{text:?}: {e}");
            assert!(e.starts_with("catalogue t.csv"), "{e}");
        }
    }

    #[test]
    fn whole_numbers_written_with_zero_decimals_are_whole() {
        assert_eq!(parse_whole("20.0"), Some(20));
        assert_eq!(parse_whole("20.5"), None);
        assert_eq!(parse_whole(""), None);
    }

    #[test]
    fn not_utf8_is_refused() {
        let e = parse(
            b"teeth,label\n20,\xff\xfe\n",
            Path::new("t.csv"),
            CatalogueDefaults { module_mm: Some(1.0), pressure_angle_deg: 20.0 },
        )
        .unwrap_err()
        .to_string();
        assert!(e.contains("UTF-8"), "{e}");
    }
}
