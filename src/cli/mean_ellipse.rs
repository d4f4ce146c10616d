//! `mean --ellipse`: an elliptical confidence region per group (Kent 1982, or a bootstrap of Tauxe et
//! al. 1991), in the outputs and on the figure.

use super::{jnum, Cell};
use lodestone::dirstats::{bootstrap_ellipse, kent_ellipse, BootstrapKind, KentEllipse};
use lodestone::figures::{EllipseNet, EqualAreaPlot};
use lodestone::model::DirectionSet;
use lodestone::montecarlo::MonteCarlo;
use lodestone::sphere::{Direction, Vec3};
use lodestone::stats::{Frame, GroupMean};
use serde_json::{json, Value};

/// The kind of ellipse asked for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum EllipseArg {
    /// Kent's (1982) ellipse from the data.
    Kent,
    /// An ellipse fitted to bootstrapped means (Tauxe et al. 1991).
    Bootstrap,
}

/// Extra columns of the text and CSV tables.
pub const COLUMNS: [&str; 6] = ["major", "minor", "major_dec", "major_inc", "minor_dec", "minor_inc"];

/// The ellipse of every group (or why it has none), and the method's name.
pub struct Ellipses {
    method: &'static str,
    per_group: Vec<Result<KentEllipse, String>>,
    /// Per group: how many directions lie more than 90° from the mean (a second polarity).
    opposed: Vec<usize>,
}

/// The unit vectors of a group in the chosen frame.
fn group_vectors(set: &DirectionSet, g: &GroupMean, frame: Frame) -> Vec<Vec3> {
    g.lines
        .iter()
        .filter_map(|l| set.records.iter().find(|r| r.line == *l))
        .map(|r| match (frame, r.bedding) {
            (Frame::Tilt, Some(b)) => b.untilt(r.direction.to_vector()),
            _ => r.direction.to_vector(),
        })
        .collect()
}

/// The ellipses of all groups.
pub fn ellipses(
    kind: EllipseArg,
    parametric: bool,
    set: &DirectionSet,
    means: &[GroupMean],
    frame: Frame,
    mc: &MonteCarlo<'_>,
) -> Ellipses {
    let method = match (kind, parametric) {
        (EllipseArg::Kent, _) => "kent",
        (EllipseArg::Bootstrap, false) => "bootstrap",
        (EllipseArg::Bootstrap, true) => "bootstrap_parametric",
    };
    let mut opposed = vec![0; means.len()];
    let per_group = means
        .iter()
        .enumerate()
        .map(|(i, g)| {
            if g.planes > 0 {
                return Err("the group holds great circles; the ellipse needs lines only".to_string());
            }
            let v = group_vectors(set, g, frame);
            if let Some(m) = g.stats.mean {
                opposed[i] = v.iter().filter(|u| u.dot(m.to_vector()) < 0.0).count();
            }
            let r = match kind {
                EllipseArg::Kent => kent_ellipse(&v, v.len() as f64, 0.95),
                EllipseArg::Bootstrap => {
                    let b = if parametric { BootstrapKind::Parametric } else { BootstrapKind::Resample };
                    bootstrap_ellipse(&v, b, 0.95, mc)
                }
            };
            r.map_err(|e| e.to_string())
        })
        .collect();
    Ellipses { method, per_group, opposed }
}

/// The figure with each group's ellipse drawn about its mean.
pub fn with_ellipses(base: EqualAreaPlot, e: &Ellipses) -> EllipseNet {
    let ellipses = e
        .per_group
        .iter()
        .enumerate()
        .filter_map(|(i, r)| r.as_ref().ok().filter(|x| x.major > 0.0).map(|x| (i, x.boundary(120))))
        .collect();
    EllipseNet { base, ellipses }
}

impl Ellipses {
    fn get(&self, index: usize) -> Option<&KentEllipse> {
        self.per_group.get(index).and_then(|r| r.as_ref().ok())
    }

    /// The table cells of group `index`.
    pub fn cells(&self, index: usize) -> Vec<Cell> {
        let e = self.get(index);
        let f = |x: fn(&KentEllipse) -> f64| Cell::opt(e.map(x), 1);
        let az = |x: fn(&KentEllipse) -> f64| Cell::opt_azimuth(e.map(x), 1);
        vec![
            f(|e| e.major),
            f(|e| e.minor),
            az(|e| e.major_axis.dec),
            f(|e| e.major_axis.inc),
            az(|e| e.minor_axis.dec),
            f(|e| e.minor_axis.inc),
        ]
    }

    /// The `ellipse` object of group `index` (null when it has none).
    pub fn json(&self, index: usize) -> Value {
        match self.get(index) {
            None => Value::Null,
            Some(e) => {
                let d = |x: Direction| (x.dec, x.inc);
                let ((jd, ji), (nd, ni)) = (d(e.major_axis), d(e.minor_axis));
                json!({
                    "major": e.major, "minor": e.minor, "major_dec": jd, "major_inc": ji,
                    "minor_dec": nd, "minor_inc": ni, "method": self.method,
                    "confidence": e.confidence, "centre_dec": e.mean.dec, "centre_inc": e.mean.inc,
                    "mean_resultant": jnum(Some(e.mean_resultant)),
                })
            }
        }
    }

    /// Why group `index` has no ellipse, if it has none.
    pub fn note(
        &self,
        index: usize,
        name: &str,
        f: &mut dyn FnMut(&str) -> std::io::Result<()>,
    ) -> std::io::Result<()> {
        match self.per_group.get(index) {
            Some(Err(why)) => f(&format!("{name}: no {} ellipse: {why}.", self.method)),
            Some(Ok(_)) if self.opposed.get(index).is_some_and(|&k| k > 0) => f(&format!(
                "{name}: {} direction(s) lie more than 90° from the mean (another polarity?); the ellipse assumes one unimodal set, so invert one polarity first or read it with care.",
                self.opposed[index]
            )),
            _ => Ok(()),
        }
    }

    /// What the ellipses are, in one sentence.
    pub fn caution(&self) -> String {
        match self.method {
            "kent" => "Ellipses: Kent (1982) 95 % regions from the scatter of each group, a large-sample approximation; with few directions (fewer than about 25) read them as rough.".into(),
            m => format!(
                "Ellipses: 95 % regions fitted to the means of seeded bootstrap pseudo-samples ({}; Tauxe et al. 1991); they describe the sampling spread of the mean under that resampling, not the field.",
                if m == "bootstrap" { "directions resampled with replacement" } else { "Fisher draws with the group's mean and k" }
            ),
        }
    }
}
