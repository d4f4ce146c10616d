//! The one number formatter of every text table, CSV file and report: fixed decimals for people, a
//! trimmed full-precision form for CSV, `inf` for an infinite value (Fisher's k of identical
//! directions), and never a negative zero.

use std::fmt::Write as _;

/// Append `x` with `decimals` fixed decimals to `buf`: `inf`/`-inf` for infinities, and a value that
/// rounds to zero from below without its sign (`-0.00` is written `0.00`).
pub fn push_fixed(buf: &mut String, x: f64, decimals: usize) {
    if x.is_infinite() {
        buf.push_str(if x > 0.0 { "inf" } else { "-inf" });
        return;
    }
    let start = buf.len();
    let _ = write!(buf, "{x:.decimals$}");
    if buf[start..].starts_with('-') && buf[start + 1..].chars().all(|c| c == '0' || c == '.') {
        buf.remove(start);
    }
}

/// `x` with `decimals` fixed decimals, as [`push_fixed`] writes it.
pub fn fixed(x: f64, decimals: usize) -> String {
    let mut s = String::new();
    push_fixed(&mut s, x, decimals);
    s
}

/// `x` in scientific notation with `digits` digits after the point (`1.2345e22`), for quantities
/// that span many orders of magnitude (dipole moments, areas).
pub fn scientific(x: f64, digits: usize) -> String {
    format!("{x:.digits$e}")
}

/// An optional number as [`fixed`] writes it, or an empty string for `None`.
pub fn fixed_or_empty(x: Option<f64>, decimals: usize) -> String {
    x.map_or(String::new(), |v| fixed(v, decimals))
}

/// Append `x` for a CSV cell: ten decimals (more than any measurement carries, without floating-point
/// noise) with trailing zeros and a bare point trimmed, `0` for a negative zero; infinities as in
/// [`push_fixed`].
pub fn push_csv(buf: &mut String, x: f64) {
    if !x.is_finite() {
        push_fixed(buf, x, 0);
        return;
    }
    let start = buf.len();
    let _ = write!(buf, "{x:.10}");
    let kept = buf[start..].trim_end_matches('0').trim_end_matches('.').len();
    buf.truncate(start + kept);
    if &buf[start..] == "-0" {
        buf.truncate(start);
        buf.push('0');
    }
}

/// Append an azimuth (a declination or a longitude, degrees) with `decimals` fixed decimals, in
/// [0, 360) as written: the angle is reduced into [0, 360) first, and a value that rounds up to 360
/// (359.96 at one decimal) is written as 0 (`0.0`), the same direction.
///
/// # Units
/// Degrees.
pub fn push_azimuth(buf: &mut String, x: f64, decimals: usize) {
    if !x.is_finite() {
        push_fixed(buf, x, decimals);
        return;
    }
    let start = buf.len();
    push_fixed(buf, x.rem_euclid(360.0), decimals);
    if buf[start..].starts_with("360") {
        buf.truncate(start);
        push_fixed(buf, 0.0, decimals);
    }
}

/// An azimuth as [`push_azimuth`] writes it.
pub fn azimuth(x: f64, decimals: usize) -> String {
    let mut s = String::new();
    push_azimuth(&mut s, x, decimals);
    s
}

/// An optional azimuth as [`azimuth`] writes it, or an empty string for `None`.
pub fn azimuth_or_empty(x: Option<f64>, decimals: usize) -> String {
    x.map_or(String::new(), |v| azimuth(v, decimals))
}

/// Append an azimuth for a CSV cell: [`push_csv`] of the angle reduced into [0, 360), with a value
/// that rounds to 360 at ten decimals written `0`.
pub fn push_csv_azimuth(buf: &mut String, x: f64) {
    if !x.is_finite() {
        push_csv(buf, x);
        return;
    }
    let start = buf.len();
    push_csv(buf, x.rem_euclid(360.0));
    if &buf[start..] == "360" {
        buf.truncate(start);
        buf.push('0');
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fixed_decimals_without_negative_zero() {
        assert_eq!(fixed(1.23456, 2), "1.23");
        assert_eq!(fixed(-0.0001, 2), "0.00");
        assert_eq!(fixed(-0.0, 1), "0.0");
        assert_eq!(fixed(-0.006, 2), "-0.01");
        assert_eq!(fixed(f64::INFINITY, 1), "inf");
        assert_eq!(fixed(f64::NEG_INFINITY, 3), "-inf");
        assert_eq!(fixed_or_empty(None, 2), "");
        assert_eq!(fixed_or_empty(Some(2.5), 0), "2");
    }

    #[test]
    fn scientific_form() {
        // The Earth's dipole moment is about 8e22 A·m² (common practice); four digits after the point.
        assert_eq!(scientific(7.7123456e22, 4), "7.7123e22");
        assert_eq!(scientific(1.0e-3, 2), "1.00e-3");
        assert_eq!(scientific(f64::INFINITY, 4), "inf");
    }

    #[test]
    fn csv_form_is_trimmed() {
        let csv = |x: f64| {
            let mut s = String::from("|");
            push_csv(&mut s, x);
            s
        };
        assert_eq!(csv(0.1), "|0.1");
        assert_eq!(csv(2.0), "|2");
        assert_eq!(csv(-1e-12), "|0");
        assert_eq!(csv(1.0 / 3.0), "|0.3333333333");
        assert_eq!(csv(f64::INFINITY), "|inf");
    }

    #[test]
    fn azimuths_stay_below_360_after_rounding() {
        // The contract: declinations and longitudes are output in [0, 360).
        assert_eq!(azimuth(359.96, 1), "0.0");
        assert_eq!(azimuth(359.94, 1), "359.9");
        assert_eq!(azimuth(359.996, 2), "0.00");
        assert_eq!(azimuth(359.5, 0), "0");
        assert_eq!(azimuth(-0.01, 1), "0.0");
        assert_eq!(azimuth(-0.2, 1), "359.8");
        assert_eq!(azimuth(360.0, 1), "0.0");
        assert_eq!(azimuth(725.3, 1), "5.3");
        assert_eq!(azimuth(0.04, 1), "0.0");
        assert_eq!(azimuth_or_empty(None, 1), "");
        assert_eq!(azimuth(f64::NAN, 1), "NaN");
        let csv = |x: f64| {
            let mut s = String::new();
            push_csv_azimuth(&mut s, x);
            s
        };
        assert_eq!(csv(359.99999999999), "0");
        assert_eq!(csv(359.5), "359.5");
        assert_eq!(csv(-90.0), "270");
    }
}
