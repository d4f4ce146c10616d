//! A spherical-harmonic model of the main field through time: coefficients at epochs, linear in time
//! between them, and an optional yearly secular variation after the last one.

use super::coefficients::{index, Coefficients};
use super::error::{FieldError, FieldResult};
use crate::error::TableError;
use crate::table::Table;
use std::collections::BTreeMap;
use std::path::Path;

/// The bundled IGRF-14 table (see `records/fieldmodels/README.md` for its source and conversion).
pub const IGRF14_TABLE: &str = include_str!("../../records/fieldmodels/igrf14.csv");

/// Highest degree a model table may have.
pub const MAX_DEGREE: usize = 120;

/// Years a secular variation is carried beyond the last epoch (the IGRF convention).
pub const SV_YEARS: f64 = 5.0;

/// A main-field model: epochs (decimal years, increasing), one coefficient set per epoch, and the
/// yearly secular variation after the last epoch when the table has `sv` rows.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldModel {
    /// Name for messages (the file name, or `IGRF-14` for the bundled model).
    pub name: String,
    /// Epochs, decimal years, increasing.
    pub epochs: Vec<f64>,
    /// Coefficients per epoch.
    pub sets: Vec<Coefficients>,
    /// Yearly secular variation after the last epoch.
    pub sv: Option<Coefficients>,
}

/// Rows of one epoch as read: (degree, order) → (g, h, line).
type EpochRows = BTreeMap<(usize, usize), (f64, f64, usize)>;

impl FieldModel {
    /// The bundled IGRF-14 (epochs 1900–2025 every five years, secular variation to 2030).
    pub fn igrf14() -> FieldModel {
        let mut m = FieldModel::parse("igrf14.csv", IGRF14_TABLE.as_bytes()).expect("the bundled table is valid");
        m.name = "IGRF-14".into();
        m
    }

    /// Read a model table from a file (columns `epoch`, `degree`, `order`, `g`, `h`).
    pub fn read(path: &Path) -> FieldResult<FieldModel> {
        let t = Table::read(path)?;
        Ok(FieldModel::from_table(&t)?)
    }

    /// Parse model table text; `name` is used in messages.
    pub fn parse(name: &str, bytes: &[u8]) -> FieldResult<FieldModel> {
        let t = Table::parse(name, bytes)?;
        Ok(FieldModel::from_table(&t)?)
    }

    /// Build a model from a parsed table.
    ///
    /// Refused, with the file and line: an epoch that is neither a number nor `sv`; a degree outside
    /// 1..=[`MAX_DEGREE`] or an order outside 0..=degree; a repeated (epoch, degree, order); a non-zero
    /// `h` of order 0; and an epoch lacking any (degree, order) up to the model's highest degree (the
    /// `sv` rows may stop at a lower degree, but may not skip one).
    pub fn from_table(t: &Table) -> Result<FieldModel, TableError> {
        t.require_rows()?;
        let (ce, cn, cm, cg) = (t.require("epoch")?, t.require("degree")?, t.require("order")?, t.require("g")?);
        let ch = t.require("h")?;
        let mut epochs: BTreeMap<u64, (f64, EpochRows, usize)> = BTreeMap::new();
        let mut sv: Option<(EpochRows, usize)> = None;
        for row in &t.rows {
            let n = whole(t, row, cn, 1, MAX_DEGREE)?;
            let m = whole(t, row, cm, 0, n)?;
            let g = t.number(row, cg)?;
            let h = t.opt_number(row, Some(ch))?.unwrap_or(0.0);
            if m == 0 && h != 0.0 {
                return Err(t.error(row.line, Some("h"), format!("{h} given for order 0, which has no h term")));
            }
            let text = t.text(row, ce);
            let rows = if text.eq_ignore_ascii_case("sv") {
                &mut sv.get_or_insert_with(|| (EpochRows::new(), row.line)).0
            } else {
                let year = t.number_in(row, ce, -1.0e5, 1.0e5)?;
                &mut epochs.entry(year.to_bits()).or_insert_with(|| (year, EpochRows::new(), row.line)).1
            };
            if let Some(prev) = rows.insert((n, m), (g, h, row.line)) {
                return Err(t.error(
                    row.line,
                    Some("order"),
                    format!("degree {n} order {m} of epoch '{text}' was already given on line {}", prev.2),
                ));
            }
        }
        if epochs.is_empty() {
            return Err(t.error(t.header_line, Some("epoch"), "the model has no main-field epoch (only sv rows)"));
        }
        let mut list: Vec<(f64, EpochRows, usize)> = epochs.into_values().collect();
        list.sort_by(|a, b| a.0.total_cmp(&b.0));
        let degree = list.iter().flat_map(|e| e.1.keys().map(|k| k.0)).max().unwrap_or(1);
        let mut sets = Vec::with_capacity(list.len());
        for (year, rows, line) in &list {
            sets.push(complete(t, &format!("epoch {year}"), rows, *line, degree)?);
        }
        let sv = match sv {
            Some((rows, line)) => {
                let top = rows.keys().map(|k| k.0).max().unwrap_or(1);
                Some(complete(t, "the sv rows", &rows, line, top)?)
            }
            None => None,
        };
        Ok(FieldModel { name: t.name.clone(), epochs: list.iter().map(|e| e.0).collect(), sets, sv })
    }

    /// Highest degree of the main field.
    pub fn degree(&self) -> usize {
        self.sets[0].degree
    }

    /// First and last year where the model is defined: the first epoch, and the last epoch plus
    /// [`SV_YEARS`] when there is a secular variation (else the last epoch).
    pub fn span(&self) -> (f64, f64) {
        let last = *self.epochs.last().expect("at least one epoch");
        (self.epochs[0], if self.sv.is_some() { last + SV_YEARS } else { last })
    }

    fn check_year(&self, year: f64) -> FieldResult<()> {
        let (first, last) = self.span();
        if year.is_finite() && year >= first - 1e-9 && year <= last + 1e-9 {
            Ok(())
        } else {
            Err(FieldError::YearOutside { year, model: self.name.clone(), first, last })
        }
    }

    /// The segment holding `year`: the index i of the epoch at or before it.
    fn segment(&self, year: f64) -> usize {
        self.epochs.partition_point(|&e| e <= year).saturating_sub(1)
    }

    /// Coefficients at a decimal year.
    ///
    /// # Formula
    /// Linear between the bracketing epochs; after the last epoch, its coefficients plus
    /// (year − epoch) × the secular variation.
    ///
    /// # References
    /// Alken et al. (2021), IGRF-13, *Earth Planets Space* 73:49, §2 (the IGRF time dependence).
    pub fn at(&self, year: f64) -> FieldResult<Coefficients> {
        self.check_year(year)?;
        let i = self.segment(year);
        let last = self.epochs.len() - 1;
        if i == last {
            return Ok(match &self.sv {
                Some(sv) => self.sets[last].add_scaled(sv, year - self.epochs[last]),
                None => self.sets[last].clone(),
            });
        }
        let span = self.epochs[i + 1] - self.epochs[i];
        let rate = self.sets[i].rate_to(&self.sets[i + 1], span);
        Ok(self.sets[i].add_scaled(&rate, year - self.epochs[i]))
    }

    /// Yearly rate of change of the coefficients at a decimal year: the slope of the segment that
    /// starts at or before it (the secular variation from the last epoch on; zero there without one).
    pub fn rate(&self, year: f64) -> FieldResult<Coefficients> {
        self.check_year(year)?;
        let i = self.segment(year);
        let last = self.epochs.len() - 1;
        if i == last {
            return Ok(self.sv.clone().unwrap_or_else(|| Coefficients::zeros(self.degree())));
        }
        Ok(self.sets[i].rate_to(&self.sets[i + 1], self.epochs[i + 1] - self.epochs[i]))
    }
}

fn whole(t: &Table, row: &crate::table::Row, col: usize, lo: usize, hi: usize) -> Result<usize, TableError> {
    let v = t.number(row, col)?;
    if v.fract() != 0.0 || v < lo as f64 || v > hi as f64 {
        return Err(t.error(row.line, Some(&t.headers[col]), format!("{v} is not a whole number in {lo}..={hi}")));
    }
    Ok(v as usize)
}

fn complete(t: &Table, what: &str, rows: &EpochRows, line: usize, degree: usize) -> Result<Coefficients, TableError> {
    let mut c = Coefficients::zeros(degree);
    for n in 1..=degree {
        for m in 0..=n {
            let Some(&(g, h, _)) = rows.get(&(n, m)) else {
                return Err(t.error(
                    line,
                    Some("degree"),
                    format!("{what} (from this line on) lacks degree {n} order {m}; every degree and order from 1 to {degree} is needed"),
                ));
            };
            c.g[index(n, m)] = g;
            c.h[index(n, m)] = h;
        }
    }
    Ok(c)
}
