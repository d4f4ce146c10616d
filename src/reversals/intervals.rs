//! Polarity intervals from a time scale: joining, short-chron merging, the window, and the open
//! (right-censored) chron at the present.

use super::models::Sample;
use crate::error::{Error, Result};
use crate::table::{Polarity, TimeScale, AGE_TOLERANCE};

/// One polarity interval: one chron, or several joined (same-polarity neighbours, merged short chrons).
///
/// # Units
/// Ages in Ma, durations in Myr.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Interval {
    /// Young boundary, Ma.
    pub young: f64,
    /// Old boundary, Ma.
    pub old: f64,
    /// Polarity of the interval.
    pub polarity: Polarity,
    /// Names of the chrons it contains (those that had names).
    pub names: Vec<String>,
}

impl Interval {
    /// Duration, Myr.
    pub fn duration(&self) -> f64 {
        self.old - self.young
    }
}

/// How to cut intervals from a time scale.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct IntervalOptions {
    /// Young edge of the window, Ma (default: the young end of the scale).
    pub from: Option<f64>,
    /// Old edge of the window, Ma (default: the old end of the scale).
    pub to: Option<f64>,
    /// Chrons shorter than this (Myr) are merged into their neighbours; 0 keeps all.
    pub min_length: f64,
    /// Whether the open chron at the present enters as a right-censored length.
    pub censor: bool,
}

impl Default for IntervalOptions {
    fn default() -> Self {
        IntervalOptions { from: None, to: None, min_length: 0.0, censor: true }
    }
}

/// The intervals of a window of a time scale.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct IntervalRecord {
    /// Young edge of the window, Ma.
    pub from: f64,
    /// Old edge of the window, Ma.
    pub to: f64,
    /// Complete intervals (both boundaries are reversals inside the window), youngest first.
    pub complete: Vec<Interval>,
    /// The open chron at the present (young boundary at 0 Ma), when it lies in the window.
    pub open: Option<Interval>,
    /// Its length as a right-censored observation; `None` when censoring is off or there is no open chron.
    pub censored: Option<f64>,
    /// Short chrons merged into their neighbours by `min_length`.
    pub merged_short: usize,
    /// Adjacent chrons of the same polarity joined into one interval.
    pub joined: usize,
    /// Intervals cut by the window edges or by the old end of the scale, left out (true length unknown).
    pub left_out: usize,
    /// Ages of the reversals (interval boundaries) strictly inside the window, youngest first, Ma.
    pub reversals: Vec<f64>,
}

impl IntervalRecord {
    /// The interval lengths as a [`Sample`] for fitting.
    pub fn sample(&self) -> Result<Sample> {
        Sample::new(self.complete.iter().map(Interval::duration).collect(), self.censored)
    }
}

/// Cut polarity intervals from a time scale.
///
/// Steps: (1) adjacent chrons of the same polarity are joined; (2) while some interval other than the
/// open one is shorter than `min_length`, the shortest is removed and merged with its neighbours
/// (which share a polarity, so the three become one interval); (3) intervals lying wholly in the
/// window are complete, the interval whose young boundary is the present (0 Ma) is the open chron,
/// and intervals cut by a window edge are left out. The oldest interval of the scale ends where the
/// table ends, which need not be a reversal, so its length is unknown and it is left out too.
///
/// # References
/// Cox, A. (1968), Lengths of geomagnetic polarity intervals. *J. Geophys. Res.* 73, 3247–3260
/// (short events and the interval distribution); Lawless (2003), §1.2 (right censoring).
pub fn intervals(ts: &TimeScale, opt: &IntervalOptions) -> Result<IntervalRecord> {
    if ts.chrons.is_empty() {
        return Err(Error::TooFew { what: "a time scale", needed: 1, got: 0, unit: "chrons" });
    }
    if !(opt.min_length.is_finite() && opt.min_length >= 0.0) {
        return Err(Error::OutOfRange { name: "min_length", value: opt.min_length, range: "[0, ∞) Myr" });
    }
    let from = opt.from.unwrap_or(ts.young()).max(ts.young());
    let to = opt.to.unwrap_or(ts.old()).min(ts.old());
    if !(from.is_finite() && to.is_finite() && from < to) {
        return Err(Error::Invalid(format!(
            "the window from {from} Ma to {to} Ma is empty or outside the time scale ({} – {} Ma)",
            ts.young(),
            ts.old()
        )));
    }
    let mut list: Vec<Interval> = Vec::new();
    let mut joined = 0;
    for c in &ts.chrons {
        match list.last_mut() {
            Some(last) if last.polarity == c.polarity => {
                last.old = c.old;
                last.names.extend(c.name.clone());
                joined += 1;
            }
            _ => list.push(Interval {
                young: c.young,
                old: c.old,
                polarity: c.polarity,
                names: c.name.iter().cloned().collect(),
            }),
        }
    }
    let is_open = |iv: &Interval| iv.young <= AGE_TOLERANCE;
    let mut merged_short = 0;
    while list.len() > 1 {
        let shortest = list
            .iter()
            .enumerate()
            .filter(|(_, iv)| !is_open(iv) && iv.duration() < opt.min_length)
            .min_by(|a, b| a.1.duration().total_cmp(&b.1.duration()))
            .map(|(i, _)| i);
        let Some(i) = shortest else { break };
        let gone = list.remove(i);
        merged_short += 1;
        // After removal, index i − 1 (younger neighbour) and i (older neighbour) share a polarity.
        match (i.checked_sub(1), i < list.len()) {
            (Some(y), true) => {
                let older = list.remove(i);
                let keep = &mut list[y];
                keep.old = older.old;
                keep.names.extend(gone.names);
                keep.names.extend(older.names);
            }
            (Some(y), false) => {
                list[y].old = gone.old;
                list[y].names.extend(gone.names);
            }
            (None, _) => {
                list[0].young = gone.young;
                let mut names = gone.names;
                names.append(&mut list[0].names);
                list[0].names = names;
            }
        }
    }
    let scale_end = ts.old();
    let mut rec = IntervalRecord {
        from,
        to,
        complete: vec![],
        open: None,
        censored: None,
        merged_short,
        joined,
        left_out: 0,
        reversals: vec![],
    };
    for iv in &list {
        let inside = iv.young >= from - AGE_TOLERANCE && iv.old <= to + AGE_TOLERANCE;
        if inside && is_open(iv) {
            rec.open = Some(iv.clone());
        } else if inside && iv.old < scale_end - AGE_TOLERANCE {
            rec.complete.push(iv.clone());
        } else if iv.old > from && iv.young < to {
            rec.left_out += 1;
        }
    }
    if opt.censor {
        rec.censored = rec.open.as_ref().map(Interval::duration);
    }
    rec.reversals =
        list.windows(2).map(|w| w[0].old).filter(|&a| a > from + AGE_TOLERANCE && a < to - AGE_TOLERANCE).collect();
    Ok(rec)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::table::Table;

    fn ts(body: &str) -> TimeScale {
        TimeScale::from_table(&Table::parse("ts.csv", body.as_bytes()).unwrap()).unwrap()
    }

    // An invented scale: the open chron, a short event, same-polarity parts.
    const SCALE: &str =
        "young,old,polarity,name\n0,0.7,N,a\n0.7,1.0,R,b\n1.0,1.02,N,ev\n1.02,1.5,R,c\n1.5,1.8,N,d1\n1.8,2.0,N,d2\n2.0,2.6,R,e\n";

    #[test]
    fn joins_censors_and_counts() {
        let r = intervals(&ts(SCALE), &IntervalOptions::default()).unwrap();
        assert_eq!(r.joined, 1);
        assert_eq!(r.open.as_ref().unwrap().duration(), 0.7);
        assert_eq!(r.censored, Some(0.7));
        let d: Vec<f64> = r.complete.iter().map(|i| (i.duration() * 1e9).round() / 1e9).collect();
        // The oldest interval (2.0–2.6 Ma) ends with the table, not necessarily at a reversal: left out.
        assert_eq!(d, vec![0.3, 0.02, 0.48, 0.5]);
        assert_eq!(r.left_out, 1);
        assert_eq!(r.reversals.len(), 5);
        let no = intervals(&ts(SCALE), &IntervalOptions { censor: false, ..Default::default() }).unwrap();
        assert_eq!(no.censored, None);
        assert_eq!(no.complete.len(), 4);
    }

    #[test]
    fn short_chrons_merge_into_neighbours() {
        let r = intervals(&ts(SCALE), &IntervalOptions { min_length: 0.03, ..Default::default() }).unwrap();
        assert_eq!(r.merged_short, 1);
        // R 0.7–1.0, N event, R 1.02–1.5 become one reversed interval 0.7–1.5.
        assert!((r.complete[0].duration() - 0.8).abs() < 1e-12);
        assert_eq!(r.complete[0].names, vec!["b", "ev", "c"]);
        assert_eq!(r.complete.len(), 2);
        // Total time is conserved (complete + open chron + the oldest, left-out interval of 0.6 Myr).
        let total: f64 = r.complete.iter().map(Interval::duration).sum::<f64>() + r.censored.unwrap() + 0.6;
        assert!((total - 2.6).abs() < 1e-12);
    }

    #[test]
    fn window_leaves_out_cut_intervals() {
        let r =
            intervals(&ts(SCALE), &IntervalOptions { from: Some(0.8), to: Some(2.0), ..Default::default() }).unwrap();
        assert!(r.open.is_none() && r.censored.is_none());
        assert_eq!(r.left_out, 1); // the reversed interval 0.7–1.0 is cut at 0.8
        assert_eq!(r.complete.len(), 3);
        assert!(
            intervals(&ts(SCALE), &IntervalOptions { from: Some(3.0), to: Some(2.0), ..Default::default() }).is_err()
        );
    }
}
