//! Synthetic sampled sections: levels through a time scale, specimens with a characteristic
//! component and an overprint, stepwise demagnetization with measurement noise.

use super::accumulation::{AccumulationHistory, RateSegment};
use crate::error::{Error, Result};
use crate::model::{Polarity, StratAxis, TimeScale, Treatment};
use crate::montecarlo::{replicate_rng, McRng, MonteCarlo};
use crate::poles::dipole_inclination;
use crate::sphere::{Bedding, Direction, GeoPoint, Vec3};
use crate::stats::FisherSampler;
use rand_distr::{Distribution, StandardNormal};

/// Random stream of the between-level (secular-variation) scatter.
pub const LEVEL_STREAM: u64 = 0x7153_0002;
/// Random stream of the specimens.
pub const SPECIMEN_STREAM: u64 = 0x7153_0003;

/// The default schedule of a demagnetization kind: its steps and where its components unblock.
#[derive(Debug, Clone, PartialEq)]
pub struct TreatmentDefaults {
    /// Steps, °C or mT, starting with 0 (the NRM).
    pub steps: Vec<f64>,
    /// Unblocking range of the characteristic component.
    pub characteristic: Unblocking,
    /// Unblocking range of the overprint.
    pub overprint: Unblocking,
}

/// The default schedule of a synthetic section demagnetized by `t` (thermal or AF; a section is
/// not "demagnetized" by the NRM alone, which is refused). Illustrative values, not a standard.
pub fn treatment_defaults(t: Treatment) -> Result<TreatmentDefaults> {
    Ok(match t {
        Treatment::Thermal => TreatmentDefaults {
            steps: vec![0.0, 100.0, 150.0, 200.0, 250.0, 300.0, 350.0, 400.0, 450.0, 500.0, 530.0, 560.0],
            characteristic: Unblocking { low: 250.0, high: 590.0 },
            overprint: Unblocking { low: 0.0, high: 300.0 },
        },
        Treatment::Af => TreatmentDefaults {
            steps: vec![0.0, 5.0, 10.0, 15.0, 20.0, 25.0, 30.0, 40.0, 50.0, 60.0, 80.0, 100.0],
            characteristic: Unblocking { low: 10.0, high: 150.0 },
            overprint: Unblocking { low: 0.0, high: 25.0 },
        },
        Treatment::Nrm => return Err(not_stepwise()),
    })
}

fn not_stepwise() -> Error {
    Error::invalid(
        "treatment",
        "nrm",
        "a synthetic section is demagnetized stepwise: the treatment is thermal or af, not nrm",
    )
}

/// The range of treatment over which a component loses its moment.
///
/// # Units
/// °C (thermal) or mT (AF), `low < high`.
///
/// # Formula
/// Remaining fraction f(s) = 1 for s ≤ low, (high − s)/(high − low) for low < s < high, 0 for s ≥ high
/// (a uniform spectrum of unblocking temperatures or coercivities).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Unblocking {
    /// Step where the component starts to lose moment.
    pub low: f64,
    /// Step by which the component is gone.
    pub high: f64,
}

impl Unblocking {
    /// Fraction of the component left after step `s`.
    pub fn remaining(&self, s: f64) -> f64 {
        if s <= self.low {
            1.0
        } else if s >= self.high {
            0.0
        } else {
            (self.high - s) / (self.high - self.low)
        }
    }
    fn check(&self, what: &str) -> Result<()> {
        if self.low.is_finite() && self.high.is_finite() && self.low >= 0.0 && self.high > self.low {
            Ok(())
        } else {
            Err(Error::invalid(
                "unblocking range",
                format!("{}–{}", self.low, self.high),
                format!("{what} unblocking range {}–{} must satisfy 0 ≤ low < high", self.low, self.high),
            ))
        }
    }
}

/// A secondary magnetization laid on every specimen after folding (so it is fixed in geographic
/// coordinates), e.g. a recent viscous overprint.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Overprint {
    /// Direction, geographic coordinates.
    pub direction: Direction,
    /// Overprint moment as a fraction of the characteristic moment.
    pub ratio: f64,
    /// Where it unblocks.
    pub unblocking: Unblocking,
}

/// The model of a synthetic section.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SectionModel {
    /// Locality of the section.
    pub site: GeoPoint,
    /// Age of the base of the section, Ma.
    pub base_age: f64,
    /// Age of the top, Ma.
    pub top_age: f64,
    /// Accumulation-rate history, base upward.
    pub rates: Vec<RateSegment>,
    /// Distance between sampled levels, m; levels sit at (i + ½)·spacing above the base.
    pub spacing: f64,
    /// Specimens per level.
    pub specimens: usize,
    /// Fisher precision κ of the specimens' characteristic directions about their level's direction.
    pub kappa: f64,
    /// Fisher precision of the levels' field directions about the axial dipole (secular variation);
    /// `None` puts every level exactly on the axial dipole direction.
    pub level_kappa: Option<f64>,
    /// Bedding attitudes, assigned to levels in turn (level i gets `bedding[i % len]`); empty = flat.
    pub bedding: Vec<Bedding>,
    /// Demagnetization kind.
    pub treatment: Treatment,
    /// Treatment steps, increasing; 0 is the NRM.
    pub steps: Vec<f64>,
    /// Unblocking range of the characteristic component.
    pub characteristic: Unblocking,
    /// Optional overprint.
    pub overprint: Option<Overprint>,
    /// Characteristic moment of a typical specimen, A·m².
    pub moment: f64,
    /// Standard deviation of ln(moment) between specimens.
    pub moment_sigma: f64,
    /// Measurement noise: standard deviation of each vector component, as a fraction of the
    /// specimen's characteristic moment.
    pub noise: f64,
    /// Level names are this prefix plus a three-digit number counted from the base.
    pub site_prefix: String,
    /// Write heights (outcrop) or depths below the top (core).
    pub axis: StratAxis,
}

/// One sampled level and its true state.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SyntheticLevel {
    /// Level (site) name.
    pub site: String,
    /// Height above the base, m.
    pub height: f64,
    /// Depth below the top, m (thickness − height).
    pub depth: f64,
    /// True age, Ma.
    pub age: f64,
    /// True polarity.
    pub polarity: Polarity,
    /// Index of the chron (in the time scale) the level falls in.
    pub chron: usize,
    /// Field direction recorded by the level, tilt-corrected (stratigraphic) coordinates.
    pub field_tilt: Direction,
    /// The same direction in geographic coordinates.
    pub field_geo: Direction,
    /// Bedding at the level, if tilted.
    pub bedding: Option<Bedding>,
}

/// One demagnetization step of one specimen.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SyntheticStep {
    /// Treatment level, °C or mT (0 = NRM).
    pub step: f64,
    /// Measured direction, geographic coordinates (`None` if the measured vector is exactly zero).
    pub direction: Option<Direction>,
    /// Measured moment, A·m².
    pub moment: f64,
}

/// One specimen: its true characteristic direction and its measured steps.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SyntheticSpecimen {
    /// Specimen name.
    pub name: String,
    /// Index of its level.
    pub level: usize,
    /// True characteristic direction, tilt-corrected coordinates.
    pub characteristic_tilt: Direction,
    /// True characteristic direction, geographic coordinates.
    pub characteristic_geo: Direction,
    /// Characteristic moment before treatment, A·m².
    pub moment: f64,
    /// Measurements.
    pub steps: Vec<SyntheticStep>,
}

/// A chron of the time scale as recorded (or missed) by the section.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct RecordedChron {
    /// Index in the time scale.
    pub index: usize,
    /// Name, if the time scale has one.
    pub name: Option<String>,
    /// Polarity.
    pub polarity: Polarity,
    /// Young and old ages, Ma, clipped to the section's span.
    pub young: f64,
    /// Old age, Ma (clipped).
    pub old: f64,
    /// Whether the whole chron lies within the section's span.
    pub complete: bool,
    /// Height of its base and top, m above the section base.
    pub base: f64,
    /// Height of its top, m.
    pub top: f64,
    /// Number of sampled levels inside it.
    pub n_levels: usize,
}

impl RecordedChron {
    /// How the section holds the chron: `complete`, `spans the section`, `cut at top` or `cut at
    /// base` (its span clipped by the section's top and base ages, `top_age` ≤ `base_age`, Ma).
    pub fn status(&self, top_age: f64, base_age: f64) -> &'static str {
        if self.complete {
            "complete"
        } else if self.young <= top_age + 1e-12 && self.old >= base_age - 1e-12 {
            "spans the section"
        } else if self.young <= top_age + 1e-12 {
            "cut at top"
        } else {
            "cut at base"
        }
    }
}

/// A reversal boundary of the time scale inside the section: the true tie of height to age.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct TrueTie {
    /// Age, Ma.
    pub age: f64,
    /// Height above the base, m.
    pub height: f64,
    /// Polarity below (older) the boundary.
    pub below: Polarity,
    /// Polarity above (younger).
    pub above: Polarity,
    /// True when the boundary falls in a hiatus (it is not recorded in the rock).
    pub in_hiatus: bool,
}

/// A simulated section with its true state.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SyntheticSection {
    /// The accumulation history.
    pub history: AccumulationHistory,
    /// Levels from the base upward.
    pub levels: Vec<SyntheticLevel>,
    /// Specimens, level by level.
    pub specimens: Vec<SyntheticSpecimen>,
    /// Chrons of the time scale within the section's span, young first.
    pub chrons: Vec<RecordedChron>,
    /// Reversal boundaries within the section, young first.
    pub ties: Vec<TrueTie>,
}

/// Largest number of levels × specimens accepted (guards against a mistyped spacing).
pub const MAX_SPECIMENS: usize = 2_000_000;

impl SectionModel {
    fn validate(&self) -> Result<()> {
        let pos = |name: &'static str, v: f64| -> Result<()> {
            if v > 0.0 && v.is_finite() {
                Ok(())
            } else {
                Err(Error::OutOfRange { name, value: v, range: "(0, ∞)" })
            }
        };
        pos("sampling interval", self.spacing)?;
        pos("kappa", self.kappa)?;
        pos("moment", self.moment)?;
        if let Some(k) = self.level_kappa {
            pos("level kappa", k)?;
        }
        crate::error::check_range("noise", self.noise, 0.0, 10.0, "[0, 10]")?;
        crate::error::check_range("moment spread", self.moment_sigma, 0.0, 5.0, "[0, 5]")?;
        if self.specimens == 0 {
            return Err(Error::TooFew { what: "a level", needed: 1, got: 0, unit: "specimens" });
        }
        if self.treatment == Treatment::Nrm {
            return Err(not_stepwise());
        }
        if self.site_prefix.contains([',', '"', '\n', '\r']) {
            return Err(Error::invalid(
                "site prefix",
                &self.site_prefix,
                format!(
                "the site prefix {:?} may not contain commas, quotes or line breaks (it names the sites in the tables)",
                self.site_prefix
            ),
            ));
        }
        if self.steps.len() < 2 {
            return Err(Error::TooFew { what: "demagnetization", needed: 2, got: self.steps.len(), unit: "steps" });
        }
        if self.steps[0] != 0.0
            || self.steps.windows(2).any(|w| !(w[1] > w[0]))
            || !self.steps.iter().all(|s| s.is_finite())
        {
            return Err(Error::invalid(
                "steps",
                format!("{:?}", self.steps),
                "steps must start at 0 (the NRM) and increase strictly",
            ));
        }
        self.characteristic.check("characteristic")?;
        if let Some(o) = &self.overprint {
            o.unblocking.check("overprint")?;
            crate::error::check_range("overprint ratio", o.ratio, 0.0, 1e6, "[0, 1e6]")?;
        }
        if self.characteristic.remaining(*self.steps.last().unwrap()) <= 0.0 {
            return Err(Error::invalid("steps", self.steps.last().unwrap(), format!(
                "the last step ({}) removes the whole characteristic component (gone by {}): the specimens would end at the noise floor",
                self.steps.last().unwrap(),
                self.characteristic.high
            )));
        }
        Ok(())
    }

    /// The axial-dipole direction at the locality for a polarity (tilt-corrected frame).
    ///
    /// # Formula
    /// D = 0°, I = atan(2 tan λ) for normal polarity; the antipode for reversed (common practice).
    pub fn dipole_direction(&self, polarity: Polarity) -> Direction {
        let n = Direction { dec: 0.0, inc: dipole_inclination(self.site.lat) };
        match polarity {
            Polarity::Normal => n,
            Polarity::Reversed => n.antipode(),
        }
    }
}

fn chron_at(ts: &TimeScale, age: f64) -> Option<usize> {
    let i = ts.chrons.partition_point(|c| c.old <= age);
    (i < ts.chrons.len() && ts.chrons[i].young <= age).then_some(i)
}

fn gaussian(rng: &mut McRng) -> f64 {
    StandardNormal.sample(rng)
}

/// Simulate a section.
///
/// Each level's age follows from its height through the accumulation history; its polarity is that of
/// the time-scale chron at that age; its field direction is the axial dipole of that polarity at the
/// locality, scattered (if `level_kappa` is set) by a Fisher distribution. Each specimen's
/// characteristic direction is a Fisher draw (κ = `kappa`) about the level's direction, in
/// tilt-corrected coordinates, then tilted with the level's bedding into geographic coordinates (the
/// rock carries the magnetization through folding). The overprint is fixed in geographic coordinates.
/// The measured vector after step s is the vector sum
/// m_c f_c(s) ĉ + m_o f_o(s) ô + ε, ε ~ N(0, (noise · m_c)² I),
/// with f the remaining fractions ([`Unblocking::remaining`]); that is, each step is the vector
/// subtraction of what each component has lost from the NRM.
///
/// Random streams: levels use [`LEVEL_STREAM`], specimens [`SPECIMEN_STREAM`] (one replicate per
/// specimen through the Monte Carlo engine), so the output depends only on the seed.
///
/// # Units
/// Ages Ma, heights m, rates cm/kyr, steps °C or mT, moments A·m².
///
/// # References
/// Fisher (1953) for the scatter; Butler (1992), ch. 5, for vector demagnetization of two components
/// with distinct unblocking spectra (common practice).
pub fn simulate_section(model: &SectionModel, ts: &TimeScale, mc: &MonteCarlo) -> Result<SyntheticSection> {
    model.validate()?;
    let history = AccumulationHistory::new(model.base_age, model.top_age, &model.rates)?;
    if ts.chrons.is_empty() || ts.young() > model.top_age + 1e-12 || ts.old() < model.base_age - 1e-12 {
        return Err(Error::invalid(
            "time scale",
            format!("{}–{} Ma", ts.young(), ts.old()),
            format!(
                "the time scale covers {}–{} Ma but the section spans {}–{} Ma",
                ts.young(),
                ts.old(),
                model.top_age,
                model.base_age
            ),
        ));
    }
    let thickness = history.thickness();
    let n_levels = (thickness / model.spacing - 0.5).floor() as i64 + 1;
    if n_levels < 1 {
        return Err(Error::invalid(
            "sampling interval",
            model.spacing,
            format!(
                "the section is {thickness:.3} m thick: a sampling interval of {} m puts no level in it",
                model.spacing
            ),
        ));
    }
    let n_levels = n_levels as usize;
    if n_levels.saturating_mul(model.specimens) > MAX_SPECIMENS {
        return Err(Error::invalid(
            "specimens",
            n_levels.saturating_mul(model.specimens),
            format!("{n_levels} levels × {} specimens exceeds the limit of {MAX_SPECIMENS} specimens", model.specimens),
        ));
    }
    let mut levels = Vec::with_capacity(n_levels);
    for i in 0..n_levels {
        let height = (i as f64 + 0.5) * model.spacing;
        let age = history.age_at(height);
        let chron = chron_at(ts, age)
            .ok_or_else(|| Error::invalid("age", age, format!("no chron of the time scale holds age {age} Ma")))?;
        let polarity = ts.chrons[chron].polarity;
        let mean = model.dipole_direction(polarity);
        let field_tilt = match model.level_kappa {
            Some(k) => {
                FisherSampler::new(mean, k)?.sample_direction(&mut replicate_rng(mc.seed, LEVEL_STREAM, i as u64))
            }
            None => mean,
        };
        let bedding =
            (!model.bedding.is_empty()).then(|| model.bedding[i % model.bedding.len()]).filter(|b| b.dip > 0.0);
        let field_geo = match bedding {
            Some(b) => Direction::from_vector(b.retilt(field_tilt.to_vector())).expect("unit vector"),
            None => field_tilt,
        };
        levels.push(SyntheticLevel {
            site: format!("{}{:03}", model.site_prefix, i + 1),
            height,
            depth: thickness - height,
            age,
            polarity,
            chron,
            field_tilt,
            field_geo,
            bedding,
        });
    }
    let n_spec = model.specimens;
    let mc_spec = MonteCarlo { seed: mc.seed, resamples: n_levels * n_spec, progress: mc.progress };
    let specimens = mc_spec.run("simulating specimens", SPECIMEN_STREAM, |rng, j| {
        let lv = &levels[j / n_spec];
        let sampler = FisherSampler::new(lv.field_tilt, model.kappa).expect("kappa checked");
        let c_tilt = sampler.sample(rng);
        let c_geo = match lv.bedding {
            Some(b) => b.retilt(c_tilt),
            None => c_tilt,
        };
        let m_c = model.moment * (model.moment_sigma * gaussian(rng)).exp();
        let o_vec = model.overprint.map(|o| (o.direction.to_vector() * (o.ratio * m_c), o.unblocking));
        let steps = model
            .steps
            .iter()
            .map(|&s| {
                let mut v = c_geo * (m_c * model.characteristic.remaining(s));
                if let Some((ov, ub)) = o_vec {
                    v += ov * ub.remaining(s);
                }
                let sd = model.noise * m_c;
                let v = v + Vec3::new(gaussian(rng), gaussian(rng), gaussian(rng)) * sd;
                SyntheticStep { step: s, direction: Direction::from_vector(v), moment: v.norm() }
            })
            .collect();
        SyntheticSpecimen {
            name: format!("{}-{}", lv.site, j % n_spec + 1),
            level: j / n_spec,
            characteristic_tilt: Direction::from_vector(c_tilt).expect("unit vector"),
            characteristic_geo: Direction::from_vector(c_geo).expect("unit vector"),
            moment: m_c,
            steps,
        }
    });
    let (top_age, base_age) = (history.top_age(), history.base_age());
    let mut chrons = Vec::new();
    let mut ties = Vec::new();
    for (i, c) in ts.chrons.iter().enumerate() {
        if c.old <= top_age || c.young >= base_age {
            continue;
        }
        let (young, old) = (c.young.max(top_age), c.old.min(base_age));
        chrons.push(RecordedChron {
            index: i,
            name: c.name.clone(),
            polarity: c.polarity,
            young,
            old,
            complete: c.young >= top_age && c.old <= base_age,
            base: history.height_at(old),
            top: history.height_at(young),
            n_levels: levels.iter().filter(|l| l.chron == i).count(),
        });
        if c.young > top_age && i > 0 {
            let h = history.height_at(c.young);
            let in_hiatus = history.spans.iter().any(|s| s.rate == 0.0 && c.young > s.young && c.young < s.old);
            ties.push(TrueTie {
                age: c.young,
                height: h,
                below: c.polarity,
                above: ts.chrons[i - 1].polarity,
                in_hiatus,
            });
        }
    }
    Ok(SyntheticSection { history, levels, specimens, chrons, ties })
}
