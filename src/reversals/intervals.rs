//! Polarity intervals from a time scale: joining, short-chron merging, the window, and the open
//! (right-censored) chron at the present.

use super::models::Sample;
use crate::error::{Error, Result};
use crate::model::{Polarity, TimeScale, AGE_TOLERANCE};

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

/// How the interval at the old end of the record is read.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum EdgeReading {
    /// A whole interval: its old boundary is a reversal (a reference scale listing whole chrons).
    Complete,
    /// Right-censored: it lasted at least its length in the record (a table or window cut at an
    /// arbitrary age).
    Censored,
    /// Left out of the likelihoods.
    LeftOut,
}

impl EdgeReading {
    /// The name used in output: `complete`, `censored` or `left-out`.
    pub fn name(self) -> &'static str {
        match self {
            EdgeReading::Complete => "complete",
            EdgeReading::Censored => "censored",
            EdgeReading::LeftOut => "left-out",
        }
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
    /// Whether the open chron at the present (or the chron cut by the window's young edge) enters as
    /// a right-censored length.
    pub censor: bool,
    /// How to read the interval at the old end. `None`: the default rule — the scale's oldest row is
    /// complete when the table states that its old boundary is a reversal
    /// ([`TimeScale::oldest_is_reversal`]), censored otherwise; a chron cut by the window's old edge
    /// is censored. `Complete` applies to the scale's oldest row only.
    pub old_edge: Option<EdgeReading>,
}

impl Default for IntervalOptions {
    fn default() -> Self {
        IntervalOptions { from: None, to: None, min_length: 0.0, censor: true, old_edge: None }
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
    /// The chron cut by the window's young edge (its part inside the window), when the window starts
    /// after the present.
    pub young_cut: Option<Interval>,
    /// The length of the open chron, or of the part of `young_cut` inside the window, as a
    /// right-censored observation; `None` when censoring is off or there is neither.
    pub censored: Option<f64>,
    /// The interval at the old end of the window (clipped to it) when its old boundary is the end of
    /// the scale or the window's old edge; `None` when the window ends at a reversal inside the scale.
    pub old_end: Option<Interval>,
    /// How `old_end` was read.
    pub old_reading: EdgeReading,
    /// `old_end` is a chron cut by the window's old edge (not the scale's oldest row).
    pub old_end_cut_by_window: bool,
    /// Its length as a second right-censored observation, when read as censored.
    pub censored_old: Option<f64>,
    /// Short chrons merged into their neighbours by `min_length`.
    pub merged_short: usize,
    /// Adjacent chrons of the same polarity joined into one interval.
    pub joined: usize,
    /// Intervals cut by the window edges or by the old end of the scale and left out of the likelihoods.
    pub left_out: usize,
    /// Ages of the reversals (interval boundaries) strictly inside the window, youngest first, Ma.
    pub reversals: Vec<f64>,
}

impl IntervalRecord {
    /// The time since the last reversal at which a hazard is evaluated: `given`, or else the length so
    /// far of the open chron at the present (0 Ma), whatever the censoring setting.
    ///
    /// # Errors
    /// [`Error::Invalid`] (quantity `elapsed`) when none is given and the window holds no open chron.
    pub fn elapsed(&self, given: Option<f64>) -> Result<f64> {
        match (given, &self.open) {
            (Some(t), _) => Ok(t),
            (None, Some(o)) => Ok(o.duration()),
            (None, None) => Err(Error::Invalid {
                quantity: "elapsed",
                value: "none given".into(),
                reason: "the window holds no open chron at the present".into(),
            }),
        }
    }

    /// The interval lengths as a [`Sample`] for fitting.
    pub fn sample(&self) -> Result<Sample> {
        Sample::new(self.complete.iter().map(Interval::duration).collect(), self.censored)?
            .with_old_censored(self.censored_old)
    }
}

/// Cut polarity intervals from a time scale.
///
/// Steps: (1) adjacent chrons of the same polarity are joined; (2) while some interval other than the
/// open one is shorter than `min_length`, the shortest is removed and merged with its neighbours
/// (which share a polarity, so the three become one interval); (3) intervals lying wholly in the
/// window are complete, the interval whose young boundary is the present (0 Ma) is the open chron
/// (right-censored unless `censor` is off), and so is the part of a chron cut by the window's young
/// edge. The interval at the old end — the scale's oldest row, whose old boundary need not be a
/// reversal, or a chron cut by the window's old edge — is read by `old_edge` (see
/// [`IntervalOptions`]): complete, right-censored (a second censored length), or left out. Reading
/// an edge interval as censored keeps the information that it lasted at least that long; leaving it
/// out drops a long interval and biases the rate upward.
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
        return Err(Error::invalid(
            "window",
            format!("{from} – {to} Ma"),
            format!(
                "the window from {from} Ma to {to} Ma is empty or outside the time scale ({} – {} Ma)",
                ts.young(),
                ts.old()
            ),
        ));
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
    let scale_reading = if ts.oldest_is_reversal { EdgeReading::Complete } else { EdgeReading::Censored };
    let mut rec = IntervalRecord {
        from,
        to,
        complete: vec![],
        open: None,
        young_cut: None,
        censored: None,
        old_end: None,
        old_reading: opt.old_edge.unwrap_or(EdgeReading::Censored),
        old_end_cut_by_window: false,
        censored_old: None,
        merged_short,
        joined,
        left_out: 0,
        reversals: vec![],
    };
    for iv in &list {
        if !(iv.old > from + AGE_TOLERANCE && iv.young < to - AGE_TOLERANCE) {
            continue; // outside the window
        }
        let starts_inside = iv.young >= from - AGE_TOLERANCE;
        let ends_inside = iv.old <= to + AGE_TOLERANCE;
        let clipped = Interval { young: iv.young.max(from), old: iv.old.min(to), ..iv.clone() };
        if is_open(iv) || !starts_inside {
            // The young end of the record: the open chron, or a chron cut by the window's young edge.
            if starts_inside {
                rec.open = Some(clipped.clone());
            } else {
                rec.young_cut = Some(clipped.clone());
            }
            if opt.censor {
                rec.censored = Some(clipped.duration());
            } else {
                rec.left_out += usize::from(rec.young_cut.is_some());
            }
        } else if ends_inside && iv.old < scale_end - AGE_TOLERANCE {
            rec.complete.push(iv.clone());
        } else {
            // The old end: the scale's oldest row (ends_inside) or a chron cut by the window's old edge.
            let reading = match (opt.old_edge, ends_inside) {
                (Some(EdgeReading::Complete), false) => {
                    return Err(Error::invalid(
                        "old edge",
                        "complete",
                        format!(
                            "the window's old edge at {to} Ma cuts the chron from {} to {} Ma: it cannot be read as complete",
                            iv.young, iv.old
                        ),
                    ))
                }
                (Some(r), _) => r,
                (None, true) => scale_reading,
                (None, false) => EdgeReading::Censored,
            };
            rec.old_reading = reading;
            rec.old_end_cut_by_window = !ends_inside;
            match reading {
                EdgeReading::Complete => rec.complete.push(iv.clone()),
                EdgeReading::Censored => rec.censored_old = Some(clipped.duration()),
                EdgeReading::LeftOut => rec.left_out += 1,
            }
            rec.old_end = Some(clipped);
        }
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
    fn elapsed_is_given_or_the_open_chron_so_far() {
        let scale = "young,old,polarity\n0,0.78,N\n0.78,0.99,R\n0.99,1.07,N\n1.07,1.77,R\n";
        let rec = intervals(&ts(scale), &IntervalOptions::default()).unwrap();
        assert_eq!(rec.elapsed(None).unwrap(), 0.78);
        assert_eq!(rec.elapsed(Some(0.1)).unwrap(), 0.1);
        // Censoring off: the open chron is still the time since the last reversal.
        let off = IntervalOptions { censor: false, ..IntervalOptions::default() };
        assert_eq!(intervals(&ts(scale), &off).unwrap().elapsed(None).unwrap(), 0.78);
        // A window that starts after the present holds no open chron: the elapsed time must be given.
        let later = IntervalOptions { from: Some(0.5), ..IntervalOptions::default() };
        let cut = intervals(&ts(scale), &later).unwrap();
        assert!(matches!(cut.elapsed(None), Err(Error::Invalid { quantity: "elapsed", .. })));
        assert_eq!(cut.elapsed(Some(0.2)).unwrap(), 0.2);
    }

    #[test]
    fn joins_censors_and_counts() {
        let r = intervals(&ts(SCALE), &IntervalOptions::default()).unwrap();
        assert_eq!(r.joined, 1);
        assert_eq!(r.open.as_ref().unwrap().duration(), 0.7);
        assert_eq!(r.censored, Some(0.7));
        let d: Vec<f64> = r.complete.iter().map(|i| (i.duration() * 1e9).round() / 1e9).collect();
        // The oldest interval (2.0–2.6 Ma) ends with the table, not necessarily at a reversal: by
        // default it is right-censored (it lasted at least 0.6 Myr), a second censored length.
        assert_eq!(d, vec![0.3, 0.02, 0.48, 0.5]);
        assert_eq!((r.left_out, r.old_reading), (0, EdgeReading::Censored));
        assert!((r.censored_old.unwrap() - 0.6).abs() < 1e-12);
        assert_eq!(r.sample().unwrap().n_obs(), 6);
        assert_eq!(r.reversals.len(), 5);
        let no = intervals(&ts(SCALE), &IntervalOptions { censor: false, ..Default::default() }).unwrap();
        assert_eq!(no.censored, None);
        assert_eq!(no.complete.len(), 4);
    }

    #[test]
    fn the_oldest_row_is_read_as_stated() {
        // Stated reversal on the oldest row (column old_edge): a whole interval by default.
        let with_column = |last: &str| {
            let mut rows: Vec<String> = SCALE.lines().map(|l| format!("{l},")).collect();
            rows[0] = rows[0].replace("name,", "name,old_edge");
            let end = rows.len() - 1;
            rows[end].push_str(last);
            rows.join("\n") + "\n"
        };
        let stated = with_column("reversal");
        let r = intervals(&ts(&stated), &IntervalOptions::default()).unwrap();
        assert_eq!((r.complete.len(), r.censored_old, r.old_reading), (5, None, EdgeReading::Complete));
        // The option overrides the table either way.
        let opt = |e| IntervalOptions { old_edge: Some(e), ..Default::default() };
        let r = intervals(&ts(&stated), &opt(EdgeReading::LeftOut)).unwrap();
        assert_eq!((r.complete.len(), r.left_out, r.censored_old), (4, 1, None));
        let r = intervals(&ts(SCALE), &opt(EdgeReading::Complete)).unwrap();
        assert_eq!(r.complete.len(), 5);
        // 'cut' anywhere but the oldest row is refused.
        let bad = with_column("").replace("1.0,R,b,", "1.0,R,b,cut");
        assert!(TimeScale::from_table(&Table::parse("ts.csv", bad.as_bytes()).unwrap()).is_err());
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
        let total: f64 =
            r.complete.iter().map(Interval::duration).sum::<f64>() + r.censored.unwrap() + r.censored_old.unwrap();
        assert!((total - 2.6).abs() < 1e-12);
    }

    #[test]
    fn window_edges_censor_cut_intervals() {
        let r =
            intervals(&ts(SCALE), &IntervalOptions { from: Some(0.8), to: Some(2.0), ..Default::default() }).unwrap();
        // The reversed interval 0.7–1.0 is cut at 0.8: its 0.2 Myr inside the window are censored.
        assert!(r.open.is_none() && (r.censored.unwrap() - 0.2).abs() < 1e-12);
        assert_eq!(r.young_cut.as_ref().unwrap().young, 0.8);
        assert_eq!((r.left_out, r.complete.len(), r.old_end.clone(), r.censored_old), (0, 3, None, None));
        // A window ending inside a chron (1.2 Ma, inside 1.02–1.5) censors its part at the old end;
        // that chron cannot be read as complete.
        let w = |e| IntervalOptions { from: Some(0.8), to: Some(1.2), old_edge: e, ..Default::default() };
        let r = intervals(&ts(SCALE), &w(None)).unwrap();
        assert!((r.censored_old.unwrap() - 0.18).abs() < 1e-12, "{r:?}");
        assert!(intervals(&ts(SCALE), &w(Some(EdgeReading::Complete))).is_err());
        let r = intervals(&ts(SCALE), &IntervalOptions { censor: false, ..w(Some(EdgeReading::LeftOut)) }).unwrap();
        assert_eq!((r.left_out, r.censored, r.censored_old), (2, None, None));
        assert!(
            intervals(&ts(SCALE), &IntervalOptions { from: Some(3.0), to: Some(2.0), ..Default::default() }).is_err()
        );
    }
}
