//! One cell of a presented table, and its text and CSV forms.

/// One cell of a text or CSV table.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell {
    /// Text.
    Text(String),
    /// A number shown with this many decimals in text tables (full precision in CSV).
    Num(f64, usize),
    /// An azimuth (declination, longitude) in degrees: as `Num`, but reduced into [0, 360) and never
    /// written as 360 after rounding.
    Azimuth(f64, usize),
    /// An integer.
    Int(i64),
    /// No value (JSON null): printed as `-` in text and empty in CSV.
    Empty,
}

impl Cell {
    /// A number, or `Empty` for `None`; infinite values print as `inf`.
    pub fn opt(v: Option<f64>, decimals: usize) -> Cell {
        v.map_or(Cell::Empty, |x| Cell::Num(x, decimals))
    }
    /// An azimuth, or `Empty` for `None`.
    pub fn opt_azimuth(v: Option<f64>, decimals: usize) -> Cell {
        v.map_or(Cell::Empty, |x| Cell::Azimuth(x, decimals))
    }
    /// Text, or `Empty` for `None`.
    pub fn opt_text(v: Option<&str>) -> Cell {
        v.map_or(Cell::Empty, |s| Cell::Text(s.to_string()))
    }
    /// Append the text form to `buf` (no allocation for numbers).
    pub fn push_text(&self, buf: &mut String) {
        use std::fmt::Write as _;
        match self {
            Cell::Text(s) => buf.push_str(s),
            Cell::Num(x, d) => crate::numbers::push_fixed(buf, *x, *d),
            Cell::Azimuth(x, d) => crate::numbers::push_azimuth(buf, *x, *d),
            Cell::Int(i) => {
                let _ = write!(buf, "{i}");
            }
            Cell::Empty => buf.push('-'),
        }
    }
    /// Append the CSV form to `buf`: numbers at full precision, empty for no value.
    pub fn push_csv(&self, buf: &mut String) {
        match self {
            Cell::Num(x, _) => crate::numbers::push_csv(buf, *x),
            Cell::Azimuth(x, _) => crate::numbers::push_csv_azimuth(buf, *x),
            Cell::Empty => {}
            other => other.push_text(buf),
        }
    }
}
