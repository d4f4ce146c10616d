//! Settings of a correlation (the `correlate` function): penalties, the accepted rate spread, dated beds; and
//! the two readings of a run with missing chrons.

/// A dated bed: the age at a position must fall within the chrons the candidate assigns there.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct DatedLevel {
    /// Height or depth, m (same axis as the column).
    pub position: f64,
    /// Age, Ma.
    pub age: f64,
    /// Uncertainty of the age, Myr (half-width of the accepted interval; 0 for exact).
    pub uncertainty: f64,
}

/// Settings of the `correlate` function.
#[derive(Debug, Clone, PartialEq)]
pub struct CorrelateOptions {
    /// Score added per missing chron, whatever its reading (default 2).
    pub miss_penalty: f64,
    /// Score added once per run read as containing a hiatus (default 6).
    pub hiatus_penalty: f64,
    /// Score added per single-level zone ignored (default 2).
    pub skip_penalty: f64,
    /// Accepted spread σ of the natural log of the accumulation rate (default 0.25).
    pub rate_spread: f64,
    /// Number of ranked candidates to return (default 5).
    pub candidates: usize,
    /// Dated beds.
    pub anchors: Vec<DatedLevel>,
}

impl Default for CorrelateOptions {
    fn default() -> Self {
        Self {
            miss_penalty: 2.0,
            hiatus_penalty: 6.0,
            skip_penalty: 2.0,
            rate_spread: 0.25,
            candidates: 5,
            anchors: vec![],
        }
    }
}

/// Which duration a run with missing chrons was given.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Reading {
    /// No chron is missing in the run.
    Complete,
    /// Missing chrons were too short to be sampled: their time is in the run.
    Unsampled,
    /// Missing chrons were removed by a hiatus: their time is not in the run.
    Hiatus,
}
