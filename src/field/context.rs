//! The present dipole moment and its recent change beside a paleointensity record.
//!
//! A comparison of a model of today's field with a record of the past; not a forecast.

use super::error::{FieldError, FieldResult};
use super::model::FieldModel;
use crate::error::TableError;
use crate::model::TimeScale;
use crate::poles::gauss_dipole;
use crate::table::Table;

/// A paleointensity record: ages (Ma, increasing) and virtual axial dipole moments (A·m²).
#[derive(Debug, Clone, PartialEq)]
pub struct PaleoRecord {
    /// File name for messages.
    pub source: String,
    /// Ages, Ma, increasing (youngest first).
    pub ages: Vec<f64>,
    /// VADM at each age, A·m².
    pub vadm: Vec<f64>,
    /// Its standard deviation where given, A·m².
    pub sigma: Vec<Option<f64>>,
}

impl PaleoRecord {
    /// Read a record table (`age`, `vadm`; optional `vadm_sigma`). Refused: negative ages, moments not
    /// above zero (or above 10²⁴ A·m²), the same age twice; fewer than two rows.
    pub fn from_table(t: &Table) -> Result<PaleoRecord, TableError> {
        t.require_rows()?;
        let (ca, cv, cs) = (t.require("age")?, t.require("vadm")?, t.col("vadm_sigma"));
        let mut rows = Vec::with_capacity(t.rows.len());
        for row in &t.rows {
            let age = t.number_in(row, ca, 0.0, 1.0e4)?;
            let v = t.number(row, cv)?;
            if !(v > 0.0 && v < 1.0e24) {
                return Err(t.error(row.line, Some("vadm"), format!("{v} is not a moment in (0, 1e24) A·m²")));
            }
            let s = t.opt_number_in(row, cs, 0.0, 1.0e24)?;
            rows.push((age, v, s, row.line));
        }
        rows.sort_by(|a, b| a.0.total_cmp(&b.0));
        for w in rows.windows(2) {
            if w[0].0 == w[1].0 {
                return Err(t.error(w[1].3, Some("age"), format!("age {} also on line {}", w[1].0, w[0].3)));
            }
        }
        if rows.len() < 2 {
            return Err(t.error(t.header_line, None, "a record needs at least two ages"));
        }
        Ok(PaleoRecord {
            source: t.name.clone(),
            ages: rows.iter().map(|r| r.0).collect(),
            vadm: rows.iter().map(|r| r.1).collect(),
            sigma: rows.iter().map(|r| r.2).collect(),
        })
    }

    /// VADM at `age` by linear interpolation (`None` outside the record).
    pub fn at(&self, age: f64) -> Option<f64> {
        let i = self.ages.partition_point(|&a| a <= age);
        if i == 0 || age > *self.ages.last()? {
            return (age == self.ages[0]).then_some(self.vadm[0]);
        }
        if i == self.ages.len() {
            return Some(self.vadm[i - 1]);
        }
        let (a0, a1) = (self.ages[i - 1], self.ages[i]);
        Some(self.vadm[i - 1] + (self.vadm[i] - self.vadm[i - 1]) * (age - a0) / (a1 - a0))
    }

    /// Median spacing of the ages, Myr.
    pub fn median_spacing(&self) -> f64 {
        let mut d: Vec<f64> = self.ages.windows(2).map(|w| w[1] - w[0]).collect();
        d.sort_by(f64::total_cmp);
        d[d.len() / 2]
    }
}

/// What [`field_context`] found.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct FieldContext {
    /// Year of the present moment (the model's last epoch).
    pub present_year: f64,
    /// Dipole moment then, A·m².
    pub present_moment: f64,
    /// First epoch of the model (start of the change).
    pub span_from: f64,
    /// Change of the dipole moment from the first to the last epoch, %.
    pub present_change: f64,
    /// Percent of the record's moments below the present one (ties count half).
    pub percentile: f64,
    /// Window of the record's changes, Myr (the model's span).
    pub window_myr: f64,
    /// Number of windows (one starting at each record age that has a full window behind it).
    pub n_windows: usize,
    /// Percent of the record's windowed changes below the present change (ties count half).
    pub change_percentile: f64,
    /// 5, 25, 50, 75, 95 % quantiles of the windowed changes, %.
    pub change_quantiles: [f64; 5],
    /// Separate episodes (runs of consecutive windows) with a change as large as the present one in the
    /// same direction.
    pub drops_like_present: usize,
    /// How many of those episodes were followed by a polarity boundary within `within_myr` (with a
    /// time scale).
    pub drops_before_reversal: Option<usize>,
    /// Share of all windows followed by a boundary within `within_myr`, for comparison (with a time scale).
    pub windows_before_reversal: Option<f64>,
    /// The stated time after a drop, Myr.
    pub within_myr: f64,
    /// Median spacing of the record's ages, Myr.
    pub record_spacing_myr: f64,
}

/// Percent of `values` below `x`, ties counted half.
fn percentile_of(values: &[f64], x: f64) -> f64 {
    let below = values.iter().filter(|&&v| v < x).count() as f64;
    let equal = values.iter().filter(|&&v| v == x).count() as f64;
    100.0 * (below + 0.5 * equal) / values.len() as f64
}

/// The present dipole moment and its change over the model's span, set beside a paleointensity record.
///
/// # Units
/// Moments in A·m²; ages and `within_myr` in Ma / Myr; changes in %.
///
/// # Formula
/// Present moment: the dipole of the last epoch's (g10, g11, h11). Present change:
/// 100 (M_last − M_first)/M_first over w = last − first years. Record: for each age t with t + w inside
/// the record, the change 100 (V(t) − V(t + w))/V(t + w), V linearly interpolated. Episodes: runs of
/// consecutive ages whose change is at least as large as the present one in the same direction. An
/// episode is followed by a reversal when a polarity boundary lies between its youngest age minus
/// `within_myr` and its youngest age plus w.
///
/// # References
/// Percentiles and windowed changes are elementary statistics (common practice). The smoothing of
/// sedimentary and compiled records, which hides changes faster than their resolution: Ziegler et al.
/// (2011), *Geophys. J. Int.* 184, 1069–1089.
pub fn field_context(
    model: &FieldModel,
    record: &PaleoRecord,
    timescale: Option<&TimeScale>,
    within_myr: f64,
) -> FieldResult<FieldContext> {
    super::error::check("within", within_myr, 0.0, 100.0, "[0, 100] Myr")?;
    let moment = |i: usize| {
        let (g10, g11, h11) = model.sets[i].dipole_terms();
        gauss_dipole(g10, g11, h11).map(|d| d.moment).map_err(|_| FieldError::OutOfRange {
            name: "degree-1 coefficients",
            value: g10,
            range: "not all zero",
        })
    };
    let last = model.epochs.len() - 1;
    if last == 0 {
        return Err(FieldError::TooFew { what: "a change of the present field", needed: 2, got: 1, unit: "epochs" });
    }
    let (m0, m1) = (moment(0)?, moment(last)?);
    let change = 100.0 * (m1 - m0) / m0;
    let w = crate::units::years_to_myr(model.epochs[last] - model.epochs[0]);
    let top = *record.ages.last().expect("two ages");
    let starts: Vec<f64> = record.ages.iter().copied().filter(|&t| t + w <= top).collect();
    if starts.len() < 2 {
        return Err(FieldError::TooFew {
            what: "windowed changes of the record",
            needed: 2,
            got: starts.len(),
            unit: "windows",
        });
    }
    let changes: Vec<f64> = starts
        .iter()
        .map(|&t| {
            let (young, old) = (record.at(t).expect("inside"), record.at(t + w).expect("inside"));
            100.0 * (young - old) / old
        })
        .collect();
    let like = |c: f64| if change < 0.0 { c <= change } else { c >= change };
    let mut episodes: Vec<f64> = Vec::new(); // youngest age of each episode
    let mut inside = false;
    for (k, &c) in changes.iter().enumerate() {
        if like(c) && !inside {
            episodes.push(starts[k]);
        }
        inside = like(c);
    }
    let boundaries: Option<Vec<f64>> =
        timescale.map(|ts| ts.chrons.windows(2).filter(|p| p[0].polarity != p[1].polarity).map(|p| p[0].old).collect());
    let followed = |t: f64, b: &[f64]| b.iter().any(|&x| x >= t - within_myr && x <= t + w);
    let mut sorted = changes.clone();
    sorted.sort_by(f64::total_cmp);
    let q = |p: f64| crate::montecarlo::quantile_sorted(&sorted, p);
    Ok(FieldContext {
        present_year: model.epochs[last],
        present_moment: m1,
        span_from: model.epochs[0],
        present_change: change,
        percentile: percentile_of(&record.vadm, m1),
        window_myr: w,
        n_windows: changes.len(),
        change_percentile: percentile_of(&changes, change),
        change_quantiles: [q(0.05), q(0.25), q(0.5), q(0.75), q(0.95)],
        drops_like_present: episodes.len(),
        drops_before_reversal: boundaries.as_ref().map(|b| episodes.iter().filter(|&&t| followed(t, b)).count()),
        windows_before_reversal: boundaries
            .as_ref()
            .map(|b| starts.iter().filter(|&&t| followed(t, b)).count() as f64 / starts.len() as f64),
        within_myr,
        record_spacing_myr: record.median_spacing(),
    })
}
