//! The timescale table: polarity chrons with their young and old boundary ages.

use super::reader::Table;
use crate::error::TableError;
use crate::model::{Chron, Polarity, TimeScale, AGE_TOLERANCE};

impl TimeScale {
    /// Read and validate a timescale table (`young`, `old`, `polarity`; optional `name`, and
    /// `old_edge` = `reversal` or `cut`, read on the oldest row: see [`TimeScale::oldest_is_reversal`]).
    ///
    /// Refused: negative ages, `old ≤ young` (zero-length or inverted chrons), unknown polarity codes,
    /// and, once sorted by age, gaps or overlaps between neighbours (the message names both lines).
    /// Adjacent chrons of the same polarity are allowed (some scales split a chron into named parts).
    pub fn from_table(t: &Table) -> Result<TimeScale, TableError> {
        t.require_rows()?;
        let (y, o, p) = (t.require("young")?, t.require("old")?, t.require("polarity")?);
        let name = t.col("name");
        let edge = t.col("old_edge");
        let mut edges = Vec::with_capacity(t.rows.len());
        let mut chrons = Vec::with_capacity(t.rows.len());
        for row in &t.rows {
            let young = t.number(row, y)?;
            let old = t.number(row, o)?;
            if young < 0.0 {
                return Err(t.error(
                    row.line,
                    Some("young"),
                    format!("{young} is negative; ages are in Ma before present"),
                ));
            }
            if old <= young {
                return Err(t.error(
                    row.line,
                    Some("old"),
                    format!("{old} is not older than young = {young} (a chron must have positive length)"),
                ));
            }
            let polarity = match t.text(row, p).to_uppercase().as_str() {
                "N" | "NORMAL" => Polarity::Normal,
                "R" | "REVERSED" | "REVERSE" => Polarity::Reversed,
                other => {
                    return Err(t.error(
                        row.line,
                        Some("polarity"),
                        format!("'{other}' is not a polarity code (N or R)"),
                    ))
                }
            };
            let e = t.opt_text(row, edge).map(|s| s.to_lowercase());
            if let Some(other) = e.as_deref().filter(|s| *s != "reversal" && *s != "cut") {
                return Err(t.error(row.line, Some("old_edge"), format!("'{other}' is not 'reversal' or 'cut'")));
            }
            edges.push((row.line, e));
            chrons.push(Chron { name: t.opt_text(row, name), young, old, polarity, line: row.line });
        }
        chrons.sort_by(|a, b| a.young.total_cmp(&b.young));
        for w in chrons.windows(2) {
            let (a, b) = (&w[0], &w[1]);
            if (b.young - a.old).abs() > AGE_TOLERANCE {
                let what = if b.young > a.old { "a gap" } else { "an overlap" };
                return Err(t.error(
                    b.line,
                    Some("young"),
                    format!(
                        "{what} between line {} (old = {}) and line {} (young = {}): chrons must tile time",
                        a.line, a.old, b.line, b.young
                    ),
                ));
            }
        }
        let oldest = chrons.last().map(|c| c.line);
        if let Some((line, _)) = edges.iter().find(|(l, e)| e.as_deref() == Some("cut") && Some(*l) != oldest) {
            return Err(t.error(
                *line,
                Some("old_edge"),
                "only the oldest row can end in a cut; chrons must tile time",
            ));
        }
        let oldest_is_reversal = edges.iter().any(|(l, e)| Some(*l) == oldest && e.as_deref() == Some("reversal"));
        Ok(TimeScale { source: t.name.clone(), chrons, oldest_is_reversal })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ts(s: &str) -> Result<TimeScale, TableError> {
        TimeScale::from_table(&Table::parse("ts.csv", s.as_bytes()).unwrap())
    }

    #[test]
    fn sorted_and_validated() {
        let t = ts("young,old,polarity,name\n0.5,1.0,R,b\n0,0.5,N,a\n").unwrap();
        assert_eq!(t.chrons[0].name.as_deref(), Some("a"));
        assert_eq!(t.old(), 1.0);
        let e = ts("young,old,polarity\n0,0.5,N\n0.6,1.0,R\n").unwrap_err();
        assert!(e.to_string().contains("a gap between line 2"), "{e}");
        let e = ts("young,old,polarity\n0,0.5,N\n0.4,1.0,R\n").unwrap_err();
        assert!(e.to_string().contains("an overlap"), "{e}");
        assert!(ts("young,old,polarity\n0,0.5,X\n").unwrap_err().to_string().contains("column 'polarity'"));
        assert!(ts("young,old,polarity\n0.5,0.5,N\n").is_err());
        assert!(ts("young,old,polarity\n-1,0.5,N\n").is_err());
    }
}
