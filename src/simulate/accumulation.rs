//! Accumulation-rate histories: piecewise-constant sediment accumulation, height ↔ age.

use crate::error::{Error, Result};
use crate::units::cm_per_kyr_to_m_per_myr;

/// One segment of an accumulation history, read from the base of the section upward.
///
/// # Units
/// `rate` in cm/kyr (numerically equal to 10 m/Myr); `until` in Ma: the age at which this rate stops
/// (the top of the segment); `None` for the last segment, which runs to the top of the section.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct RateSegment {
    /// Accumulation rate, cm/kyr (0 = a hiatus: time passes, no sediment is laid down).
    pub rate: f64,
    /// Age where the segment ends upward, Ma; `None` for the topmost segment.
    pub until: Option<f64>,
}

/// Parse a rate history written `RATE@AGE,RATE@AGE,…,RATE` (cm/kyr, Ma), read from the base upward:
/// `2.0@3.1,0.8@2.4,1.5` means 2.0 cm/kyr from the base until 3.1 Ma, then 0.8 cm/kyr until 2.4 Ma,
/// then 1.5 cm/kyr to the top. A single number is a constant rate.
pub fn parse_rates(text: &str) -> Result<Vec<RateSegment>> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    let mut out = Vec::with_capacity(parts.len());
    for (i, p) in parts.iter().enumerate() {
        let last = i + 1 == parts.len();
        let (r, until) = match p.split_once('@') {
            Some((r, a)) => (r.trim(), Some(a.trim())),
            None => (*p, None),
        };
        let bad = |what: &str| {
            Error::invalid("rate history", text, format!("rate history '{text}', part {} ('{p}'): {what}", i + 1))
        };
        let rate: f64 = r.parse().map_err(|_| bad("expected RATE (cm/kyr) or RATE@AGE (Ma)"))?;
        if !(rate >= 0.0 && rate.is_finite()) {
            return Err(bad("the rate must be a finite number ≥ 0 cm/kyr"));
        }
        let until = match (until, last) {
            (Some(a), false) => Some(a.parse::<f64>().map_err(|_| bad("the age after '@' is not a number"))?),
            (None, true) => None,
            (Some(_), true) => return Err(bad("the last part runs to the top of the section and takes no '@AGE'")),
            (None, false) => return Err(bad("every part but the last needs '@AGE', the age where it ends")),
        };
        out.push(RateSegment { rate, until });
    }
    Ok(out)
}

/// One resolved segment: an age range and its rate.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct AccumulationSpan {
    /// Young (upper) end, Ma.
    pub young: f64,
    /// Old (lower) end, Ma.
    pub old: f64,
    /// Rate, cm/kyr.
    pub rate: f64,
    /// Height of the old end, m above the base.
    pub base: f64,
    /// Height of the young end, m above the base.
    pub top: f64,
}

/// A piecewise-constant accumulation history from a base age (height 0) up to a top age.
///
/// # Formula
/// h(a) = Σ rᵢ · |[a, base] ∩ segmentᵢ|, with r in m/Myr (1 cm/kyr = 10 m/Myr); the inverse a(h) is
/// linear inside each segment of positive rate.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct AccumulationHistory {
    /// Segments from the base upward.
    pub spans: Vec<AccumulationSpan>,
}

impl AccumulationHistory {
    /// Resolve a rate history between `base_age` (oldest, bottom) and `top_age` (youngest, top).
    pub fn new(base_age: f64, top_age: f64, segments: &[RateSegment]) -> Result<Self> {
        crate::error::check_range("top age", top_age, 0.0, f64::MAX, "[0, ∞) Ma")?;
        if !(base_age > top_age && base_age.is_finite()) {
            return Err(Error::invalid(
                "base age",
                base_age,
                format!("the base age ({base_age} Ma) must be older than the top age ({top_age} Ma)"),
            ));
        }
        if segments.is_empty() {
            return Err(Error::invalid("rate history", "(empty)", "the rate history is empty"));
        }
        let mut spans = Vec::with_capacity(segments.len());
        let (mut old, mut h) = (base_age, 0.0);
        for (i, s) in segments.iter().enumerate() {
            let young = match s.until {
                Some(a) if i + 1 < segments.len() => {
                    if !(a < old && a > top_age) {
                        return Err(Error::invalid("rate segment end age", a, format!(
                            "rate segment {}: its end age {a} Ma must lie between {top_age} Ma (top) and {old} Ma (the segment's start), ages decreasing upward",
                            i + 1
                        )));
                    }
                    a
                }
                None if i + 1 == segments.len() => top_age,
                _ => {
                    return Err(Error::invalid(
                        "rate segment",
                        i + 1,
                        format!("rate segment {}: only the last segment runs to the top", i + 1),
                    ))
                }
            };
            if !(s.rate >= 0.0 && s.rate.is_finite()) {
                return Err(Error::OutOfRange { name: "accumulation rate", value: s.rate, range: "[0, ∞) cm/kyr" });
            }
            let top = h + cm_per_kyr_to_m_per_myr(s.rate) * (old - young);
            spans.push(AccumulationSpan { young, old, rate: s.rate, base: h, top });
            h = top;
            old = young;
        }
        if !(h > 0.0) {
            return Err(Error::invalid(
                "rate history",
                "every rate 0",
                "the rate history lays down no sediment (every rate is 0)",
            ));
        }
        Ok(Self { spans })
    }

    /// Total thickness, m.
    pub fn thickness(&self) -> f64 {
        self.spans.last().map_or(0.0, |s| s.top)
    }
    /// Base age, Ma.
    pub fn base_age(&self) -> f64 {
        self.spans.first().map_or(0.0, |s| s.old)
    }
    /// Top age, Ma.
    pub fn top_age(&self) -> f64 {
        self.spans.last().map_or(0.0, |s| s.young)
    }

    /// Height (m above the base) of the sediment laid down at `age` (clamped to the section's ages).
    pub fn height_at(&self, age: f64) -> f64 {
        let age = age.clamp(self.top_age(), self.base_age());
        for s in &self.spans {
            if age >= s.young {
                return s.base + cm_per_kyr_to_m_per_myr(s.rate) * (s.old - age);
            }
        }
        self.thickness()
    }

    /// Age (Ma) of the sediment at `height` (clamped to [0, thickness]). At the height of a hiatus
    /// (a segment of rate 0) the age returned is that of the sediment just below it (the hiatus'
    /// old end).
    pub fn age_at(&self, height: f64) -> f64 {
        let h = height.clamp(0.0, self.thickness());
        for s in &self.spans {
            if s.rate > 0.0 && h <= s.top {
                return s.old - (h - s.base) / cm_per_kyr_to_m_per_myr(s.rate);
            }
        }
        self.top_age()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn parse_and_integrate_a_two_rate_history_with_a_hiatus() {
        let segs = parse_rates("2.0@3.0, 0@2.5, 0.5").unwrap();
        assert_eq!(segs.len(), 3);
        let h = AccumulationHistory::new(4.0, 1.0, &segs).unwrap();
        // Hand arithmetic: 2 cm/kyr = 20 m/Myr for 1 Myr = 20 m; hiatus; 0.5 cm/kyr = 5 m/Myr for 1.5 Myr = 7.5 m.
        assert_abs_diff_eq!(h.thickness(), 27.5, epsilon = 1e-12);
        assert_abs_diff_eq!(h.height_at(3.5), 10.0, epsilon = 1e-12);
        assert_abs_diff_eq!(h.height_at(2.7), 20.0, epsilon = 1e-12);
        assert_abs_diff_eq!(h.height_at(2.0), 22.5, epsilon = 1e-12);
        assert_abs_diff_eq!(h.age_at(10.0), 3.5, epsilon = 1e-12);
        assert_abs_diff_eq!(h.age_at(22.5), 2.0, epsilon = 1e-12);
        assert_abs_diff_eq!(h.age_at(20.0), 3.0, epsilon = 1e-12);
        for a in [1.0, 1.3, 2.49, 3.01, 3.99] {
            assert_abs_diff_eq!(h.age_at(h.height_at(a)), a, epsilon = 1e-9);
        }
    }

    #[test]
    fn bad_histories_are_refused() {
        assert!(parse_rates("2@1").is_err());
        assert!(parse_rates("2,3").is_err());
        assert!(parse_rates("-1").is_err());
        assert!(parse_rates("x").is_err());
        assert!(AccumulationHistory::new(1.0, 2.0, &parse_rates("1").unwrap()).is_err());
        assert!(AccumulationHistory::new(3.0, 0.0, &parse_rates("1@4,2").unwrap()).is_err());
        assert!(AccumulationHistory::new(3.0, 0.0, &parse_rates("0").unwrap()).is_err());
    }
}
