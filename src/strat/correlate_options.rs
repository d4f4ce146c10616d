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

impl DatedLevel {
    /// A dated bed; the position and age must be finite, the age and its uncertainty not negative.
    pub fn new(position: f64, age: f64, uncertainty: f64) -> crate::Result<Self> {
        let d = DatedLevel { position, age, uncertainty };
        d.check()?;
        Ok(d)
    }

    fn check(&self) -> crate::Result<()> {
        let finite = |name: &'static str, value: f64| {
            if value.is_finite() {
                Ok(())
            } else {
                Err(crate::Error::OutOfRange { name, value, range: "the finite numbers" })
            }
        };
        finite("anchor position", self.position)?;
        finite("anchor age", self.age)?;
        finite("anchor uncertainty", self.uncertainty)?;
        for (name, value) in [("anchor age", self.age), ("anchor uncertainty", self.uncertainty)] {
            if value < 0.0 {
                return Err(crate::Error::OutOfRange { name, value, range: "[0, ∞) (not negative)" });
            }
        }
        Ok(())
    }
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

impl CorrelateOptions {
    /// Refuse settings the search cannot use: no candidate asked for, a negative or non-finite
    /// penalty, a rate spread that is not positive, a bad dated bed.
    pub fn check(&self) -> crate::Result<()> {
        if self.candidates == 0 {
            return Err(crate::Error::invalid("candidates", 0, "the number of candidates must be at least 1"));
        }
        for (name, value) in [
            ("miss penalty", self.miss_penalty),
            ("hiatus penalty", self.hiatus_penalty),
            ("skip penalty", self.skip_penalty),
        ] {
            if !(value.is_finite() && value >= 0.0) {
                return Err(crate::Error::OutOfRange { name, value, range: "[0, ∞)" });
            }
        }
        if !(self.rate_spread.is_finite() && self.rate_spread > 0.0) {
            return Err(crate::Error::OutOfRange { name: "rate spread", value: self.rate_spread, range: "(0, ∞)" });
        }
        self.anchors.iter().try_for_each(DatedLevel::check)
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
