//! Synthetic polarity time scales from a renewal model of polarity-interval lengths.

use crate::error::{check_positive, Error, Result};
use crate::model::{Chron, Polarity, TimeScale};
use crate::montecarlo::replicate_rng;
use crate::reversals::Fitted;
use serde::ser::{Serialize, SerializeStruct, Serializer};

/// Random stream used for synthetic time scales (see [`crate::montecarlo::replicate_rng`]).
pub const TIMESCALE_STREAM: u64 = 0x7153_0001;

/// Polarity of the youngest chron of a synthetic time scale.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum FirstPolarity {
    /// This polarity.
    Fixed(Polarity),
    /// Normal or reversed with equal probability (drawn from the seed).
    Random,
}

/// What to simulate: a renewal model over a span of time.
#[derive(Debug, Clone, PartialEq)]
pub struct TimeScaleModel {
    /// The interval-length model (stated, e.g. by [`Fitted::from_settings`], or fitted to a record).
    pub model: Fitted,
    /// Age of the young end, Ma (usually 0, the present).
    pub young: f64,
    /// Length of time covered, Myr.
    pub span: f64,
    /// Polarity of the youngest chron.
    pub first: FirstPolarity,
    /// If given, chrons are named `PREFIX1`, `PREFIX2`, … from young to old.
    pub name_prefix: Option<String>,
}

/// The span of the time scale drawn for a synthetic section that is given none (the `simulate
/// section` verb and the Python package alike): from the present to one mean interval below the
/// section's base, so that the base falls inside the scale whatever the draw near it.
///
/// # Units
/// `base_age` in Ma, `mean_interval` and the result in Myr.
pub fn section_timescale_span(base_age: f64, mean_interval: f64) -> f64 {
    base_age + mean_interval
}

/// JSON form: the model with its mean, the young end, the span and the first polarity (the chron
/// names are in the time scale itself).
impl Serialize for TimeScaleModel {
    fn serialize<S: Serializer>(&self, s: S) -> std::result::Result<S::Ok, S::Error> {
        let mut st = s.serialize_struct("TimeScaleModel", 5)?;
        st.serialize_field("model", &self.model)?;
        st.serialize_field("mean", &self.model.mean())?;
        st.serialize_field("young", &self.young)?;
        st.serialize_field("span", &self.span)?;
        st.serialize_field("first_polarity", &self.first)?;
        st.end()
    }
}

/// Where the time scale of a synthetic section came from: a table file, or a renewal model
/// (JSON `{"file": PATH}` or `{"renewal": MODEL}`).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum TimeScaleSource {
    /// A timescale table, by its path as given.
    File(String),
    /// Simulated from this model.
    Renewal(TimeScaleModel),
}

/// Intervals simulated (and thrown away) before the young end, so that the chron running at the
/// young end has the length-biased distribution of a process already in progress rather than
/// starting afresh.
pub const BURN_IN_INTERVALS: usize = 50;

/// Chron boundaries of synthetic time scales are rounded to this step, Myr (one year), so that the
/// table written with six decimals reads back exactly.
pub const AGE_QUANTUM: f64 = 1e-6;

/// Simulate a polarity time scale: alternating chrons whose lengths are independent draws from the
/// renewal model.
///
/// The process is started [`BURN_IN_INTERVALS`] mean intervals before the young end (in the future,
/// read as ages) and run into the past until it passes `young + span`; the chrons are then cut at both
/// ends. So the youngest chron is an interval in progress (its young boundary is the young end, not a
/// reversal) and the oldest one is cut by the end of the span: both are censored, as in a real record.
/// Polarity alternates from chron to chron.
///
/// # Units
/// Ages in Ma, lengths in Myr.
///
/// # References
/// Cox (1962), *Renewal Theory*, ch. 5 (the interval straddling a fixed time is length-biased, which
/// is why the burn-in is needed).
pub fn simulate_timescale(m: &TimeScaleModel, seed: u64) -> Result<TimeScale> {
    crate::error::check_range("young", m.young, 0.0, f64::MAX, "[0, ∞)")?;
    let span = check_positive("span", m.span)?;
    m.model.check()?;
    let mean = m.model.mean();
    let limit = 10_000_000usize;
    if span / mean > limit as f64 {
        return Err(Error::invalid(
            "span",
            span,
            format!("a span of {span} Myr with a mean interval of {mean} Myr would need more than {limit} chrons"),
        ));
    }
    let mut rng = replicate_rng(seed, TIMESCALE_STREAM, 0);
    let first = match m.first {
        FirstPolarity::Fixed(p) => p,
        FirstPolarity::Random => {
            if rand::RngExt::random::<bool>(&mut rng) {
                Polarity::Normal
            } else {
                Polarity::Reversed
            }
        }
    };
    let old_end = m.young + span;
    // Boundaries as ages; the process starts BURN_IN_INTERVALS mean lengths younger than `young`.
    let mut t = m.young - BURN_IN_INTERVALS as f64 * mean;
    let mut edges = Vec::new();
    loop {
        let len = m.model.sample(&mut rng);
        // Lengths of zero (possible in floating point for tiny shapes) are not chrons: draw again.
        if !(len > 0.0) {
            continue;
        }
        t += len;
        if t <= m.young {
            continue;
        }
        if t >= old_end {
            break;
        }
        edges.push(t);
        if edges.len() > limit {
            return Err(Error::TooMany {
                what: "chrons (shorten the span)",
                count: edges.len() as u64,
                limit: limit as u64,
            });
        }
    }
    // Boundaries are kept to AGE_QUANTUM (so that a written table reads back exactly); a chron that
    // rounds to zero length is removed, which merges its two neighbours of equal polarity.
    let q = |a: f64| (a / AGE_QUANTUM).round() * AGE_QUANTUM;
    let (young_q, old_q) = (q(m.young), q(old_end));
    let mut bounds: Vec<f64> = Vec::with_capacity(edges.len() + 2);
    bounds.push(young_q);
    for e in edges.into_iter().map(q) {
        if e <= young_q || e >= old_q {
            continue;
        }
        if bounds.len() > 1 && (e - bounds[bounds.len() - 1]).abs() < 0.5 * AGE_QUANTUM {
            bounds.pop();
            continue;
        }
        bounds.push(e);
    }
    bounds.push(old_q);
    let mut pol = first;
    let chrons = bounds
        .windows(2)
        .enumerate()
        .map(|(i, w)| {
            let c = Chron {
                name: m.name_prefix.as_ref().map(|p| format!("{p}{}", i + 1)),
                young: w[0],
                old: w[1],
                polarity: pol,
                line: i + 2,
            };
            pol = pol.flip();
            c
        })
        .collect();
    Ok(TimeScale {
        source: format!("synthetic {} time scale (seed {seed})", m.model.model.name()),
        chrons,
        oldest_is_reversal: false,
    })
}
