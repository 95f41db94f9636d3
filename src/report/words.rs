//! Wording shared by every result kind and format: how an error, a tolerance or a count is
//! written, the ratio convention, and the cautions. One place, so that the formats and the
//! trades say the same thing the same way.

use crate::numbers::rational::RelError;

/// The ratio convention, in words, for reports and help.
pub const CONVENTION: &str = "ratio i = input turns per output turn = product of driven teeth / \
                              product of driver teeth (ISO 1122-1); above 1 reduces speed";

/// The caution printed under results.
pub const CAUTION: &str = "gearsieve checks ratios and geometry only. A train that carries real \
                           power needs a load-capacity rating (e.g. ISO 6336 or AGMA 2001) by a \
                           qualified person; follow local codes and licensed practice.";

/// The caution printed under every thread result.
pub const THREAD_CAUTION: &str = "Change gears only with the machine stopped and isolated from power. \
                           Check the pitch with a trial cut and a thread gauge before the real \
                           cut.";

/// The caution printed with every reducer result.
pub const REDUCER_CAUTION: &str = "gearsieve sizes geometry only. A reducer that carries power needs a \
                           load-capacity rating (e.g. ISO 6336 or AGMA 2001) and a check by a \
                           qualified person.";

/// The caution printed with every mesh report.
pub const MESH_CAUTION: &str = "gearsieve sizes geometry only. A pair that carries power needs a \
                                load-capacity rating (e.g. ISO 6336 or AGMA 2001) by a qualified \
                                person.";

/// The ratio convention of planetary trains, in words, for reports and help.
pub const PLANETARY_CONVENTION: &str = "ratio i = input turns per output turn (ISO 1122-1), from \
                                        Willis' equation for the member held and the member \
                                        driving; above 1 reduces speed. Direction: whether the \
                                        output turns the same way as the input or the opposite way";

/// A relative error for people: `exact`, `+3.21 ppm` or `-0.0123%`.
pub fn describe_error(e: &RelError) -> String {
    if e.is_exact() {
        return "exact".to_string();
    }
    describe_error_f64(e.to_f64())
}

/// A relative error read back from JSON, for people: `exact` only when it is zero; below a
/// thousandth of a ppm in the exponent form (`+3.39e-5 ppm`).
pub fn describe_error_f64(v: f64) -> String {
    if v == 0.0 {
        return "exact".to_string();
    }
    if v.abs() < 1e-9 {
        // Three decimals of a ppm would read as +0.000: an astronomical train's error is shown.
        format!("{:+.2e} ppm", v * 1e6)
    } else if v.abs() < 1e-3 {
        format!("{:+.3} ppm", v * 1e6)
    } else {
        format!("{:+.4}%", v * 100.0)
    }
}

/// A tolerance for people: `0 (exact)`, `±10 ppm`, `±0.5%`.
pub fn describe_tolerance(t: f64) -> String {
    if t == 0.0 {
        "0 (exact only)".to_string()
    } else if t < 1e-3 {
        format!("±{} ppm", crate::model::pool::fmt_num(t * 1e6))
    } else {
        format!("±{}%", crate::model::pool::fmt_num(t * 100.0))
    }
}

/// `1234567` → `1,234,567`.
pub fn group_thousands(n: u64) -> String {
    let s = n.to_string();
    let mut out = String::new();
    for (i, c) in s.chars().enumerate() {
        if i > 0 && (s.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

/// `3 trains; all listed` / `120 trains; the best 10 listed`, with the interrupted mark.
pub fn count_line(count: u64, listed: usize, complete: bool, what: &str, order: &str) -> String {
    let status = if complete { "" } else { "INCOMPLETE (interrupted): at least " };
    match count {
        0 => format!("{status}No {what} meets every constraint."),
        1 => format!("{status}1 {what}:"),
        n if n == listed as u64 => format!("{status}{} {what}s, all listed {order}:", group_thousands(n)),
        n => format!("{status}{} {what}s; the best {listed} listed {order}:", group_thousands(n)),
    }
}

/// `651 trains, made of 344 gear sets; the best 4 listed ORDER, each by …`: the count line of
/// a listing of gear sets, each shown by `each` (its best or first arrangement). `sets` is
/// `None` when the search counted trains in bulk without their gear sets; the line says so.
/// For a count of trains above zero; [`count_line`] says the rest.
pub fn set_count_line(
    count: u64,
    sets: Option<u64>,
    listed: usize,
    complete: bool,
    order: &str,
    each: &str,
) -> String {
    let made_of = match sets {
        Some(sets) => {
            format!(", made of {} gear set{}", group_thousands(sets), if sets == 1 { "" } else { "s" })
        }
        None => NOT_COUNTED.to_string(),
    };
    let which = match sets {
        Some(sets) if listed as u64 == sets => "all".to_string(),
        Some(_) => format!("the best {listed}"),
        None => format!("the best {listed} gear set{}", if listed == 1 { "" } else { "s" }),
    };
    format!(
        "{}{} train{}{made_of}; {which} listed {order}, each by {each}:",
        if complete { "" } else { "INCOMPLETE (interrupted): at least " },
        group_thousands(count),
        if count == 1 { "" } else { "s" },
    )
}

/// What a count line says of gear sets a search did not count.
pub const NOT_COUNTED: &str = " (their gear sets are not counted: this search counts trains in bulk)";

/// An identifier such as `ShiftSumOutOfRange` in plain words: `shift sum out of range`.
pub fn plain_words(id: &str) -> String {
    let mut out = String::new();
    for (i, c) in id.chars().enumerate() {
        if c.is_uppercase() && i > 0 {
            out.push(' ');
        }
        out.extend(c.to_lowercase());
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thousands() {
        assert_eq!(group_thousands(0), "0");
        assert_eq!(group_thousands(999), "999");
        assert_eq!(group_thousands(1000), "1,000");
        assert_eq!(group_thousands(1234567), "1,234,567");
    }

    #[test]
    fn identifiers_in_plain_words() {
        assert_eq!(plain_words("ShiftSumOutOfRange"), "shift sum out of range");
        assert_eq!(plain_words("NotCoaxial"), "not coaxial");
    }

    #[test]
    fn errors_for_people_keep_a_figure_however_small() {
        assert_eq!(describe_error_f64(0.0), "exact");
        assert_eq!(describe_error_f64(0.0123), "+1.2300%");
        assert_eq!(describe_error_f64(-2.5e-6), "-2.500 ppm");
        // 42795375/1449188 against a synodic month of 29.530588853 d: 3.4e-11.
        assert_eq!(describe_error_f64(3.39e-11), "+3.39e-5 ppm");
        assert_eq!(describe_error_f64(-1.0e-10), "-1.00e-4 ppm");
    }
}
