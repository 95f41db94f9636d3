//! The tables of the built-in series beyond ISO 261 and the unified threads: British Standard
//! Whitworth and Fine, BA, British pipe (G), the model engineering 32 and 40 threads per inch,
//! ISO metric fine sizes, trapezoidal leads, and module and diametral-pitch worms. Owns only the
//! tables; [`super::series::built_in`] names them and turns rows into threads.
//!
//! Every value here is from memory, not copied from the standards named: check a row against a
//! copy of its standard before relying on it. The BA pitches also follow the series' own rule
//! (the pitch of n BA is 0.9ⁿ mm, rounded to 0.01 mm), which the tests check independently.

/// British Standard Whitworth (BS 84), size in inches and threads per inch — from memory.
pub const BSW: &[(&str, &str)] = &[
    ("1/8", "40"),
    ("3/16", "24"),
    ("1/4", "20"),
    ("5/16", "18"),
    ("3/8", "16"),
    ("7/16", "14"),
    ("1/2", "12"),
    ("9/16", "12"),
    ("5/8", "11"),
    ("3/4", "10"),
    ("7/8", "9"),
    ("1", "8"),
    ("1 1/8", "7"),
    ("1 1/4", "7"),
    ("1 1/2", "6"),
    ("1 3/4", "5"),
    ("2", "4.5"),
];

/// British Standard Fine (BS 84), size in inches and threads per inch — from memory.
pub const BSF: &[(&str, &str)] = &[
    ("3/16", "32"),
    ("1/4", "26"),
    ("5/16", "22"),
    ("3/8", "20"),
    ("7/16", "18"),
    ("1/2", "16"),
    ("9/16", "16"),
    ("5/8", "14"),
    ("3/4", "12"),
    ("7/8", "11"),
    ("1", "10"),
];

/// BA threads (BS 93), number and pitch in mm — from memory.
pub const BA: &[(&str, &str)] = &[
    ("0", "1.00"),
    ("1", "0.90"),
    ("2", "0.81"),
    ("3", "0.73"),
    ("4", "0.66"),
    ("5", "0.59"),
    ("6", "0.53"),
    ("7", "0.48"),
    ("8", "0.43"),
    ("9", "0.39"),
    ("10", "0.35"),
];

/// British pipe threads, G (ISO 228-1; the same pitches as BSP), size and threads per inch —
/// from memory.
pub const PIPE_G: &[(&str, &str)] = &[
    ("1/8", "28"),
    ("1/4", "19"),
    ("3/8", "19"),
    ("1/2", "14"),
    ("5/8", "14"),
    ("3/4", "14"),
    ("1", "11"),
    ("1 1/4", "11"),
    ("1 1/2", "11"),
    ("2", "11"),
];

/// The model engineering series: one pitch for every size, 32 and 40 threads per inch (common
/// practice).
pub const MODEL_ENGINEERING: &[&str] = &["32", "40"];

/// ISO metric fine sizes (ISO 261), size and pitch in mm — from memory.
pub const ISO_FINE_SIZES: &[(&str, &str)] = &[
    ("M8", "1"),
    ("M10", "1.25"),
    ("M10", "1"),
    ("M12", "1.5"),
    ("M12", "1.25"),
    ("M14", "1.5"),
    ("M16", "1.5"),
    ("M18", "1.5"),
    ("M20", "1.5"),
    ("M22", "1.5"),
    ("M24", "2"),
    ("M27", "2"),
    ("M30", "2"),
    ("M36", "3"),
    ("M42", "3"),
    ("M48", "3"),
];

/// Trapezoidal threads (ISO 2904), nominal diameter and lead of the single-start thread in mm —
/// from memory.
pub const TRAPEZOIDAL: &[(&str, &str)] = &[
    ("8", "1.5"),
    ("10", "2"),
    ("12", "3"),
    ("14", "3"),
    ("16", "4"),
    ("18", "4"),
    ("20", "4"),
    ("22", "5"),
    ("24", "5"),
    ("26", "5"),
    ("28", "5"),
    ("30", "6"),
    ("32", "6"),
    ("36", "6"),
    ("40", "7"),
    ("44", "7"),
    ("48", "8"),
    ("52", "8"),
    ("60", "9"),
];

/// Modules of the module worms charted, mm: DIN 780 series I from 0.5 to 6 (German Wikipedia,
/// "Modul (Technik)").
pub const WORM_MODULES: &[&str] =
    &["0.5", "0.6", "0.7", "0.8", "0.9", "1", "1.25", "1.5", "2", "2.5", "3", "4", "5", "6"];

/// Diametral pitches of the DP worms charted (common practice, from memory).
pub const WORM_DIAMETRAL_PITCHES: &[&str] = &["8", "10", "12", "14", "16", "18", "20", "24", "32", "48"];
