//! An elliptical confidence region about the mean of each group of directions: Kent's (1982)
//! ellipse from the scatter, or one fitted to bootstrapped means (Tauxe et al. 1991).

use super::{bootstrap_ellipse, kent_ellipse, BootstrapKind, KentEllipse};
use crate::model::DirectionSet;
use crate::montecarlo::MonteCarlo;
use crate::sphere::Vec3;
use crate::stats::{Frame, GroupMean};

/// How the ellipses are made.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EllipseMethod {
    /// Kent's (1982) ellipse from the data.
    Kent,
    /// Fitted to the means of the data resampled with replacement.
    Bootstrap,
    /// Fitted to the means of Fisher draws with each group's mean and k.
    BootstrapParametric,
}

impl EllipseMethod {
    /// The method's name in outputs: `kent`, `bootstrap`, `bootstrap_parametric`.
    pub fn name(self) -> &'static str {
        match self {
            EllipseMethod::Kent => "kent",
            EllipseMethod::Bootstrap => "bootstrap",
            EllipseMethod::BootstrapParametric => "bootstrap_parametric",
        }
    }
}

/// The ellipse of every group (or why it has none).
#[derive(Debug, Clone)]
pub struct GroupEllipses {
    /// How they were made.
    pub method: EllipseMethod,
    /// Per group, the ellipse or the reason there is none.
    pub per_group: Vec<std::result::Result<KentEllipse, String>>,
    /// Per group: how many directions lie more than 90° from the mean (a second polarity).
    pub opposed: Vec<usize>,
}

impl GroupEllipses {
    /// The ellipse of group `index`, if it has one.
    pub fn get(&self, index: usize) -> Option<&KentEllipse> {
        self.per_group.get(index).and_then(|r| r.as_ref().ok())
    }
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

/// The 95 % ellipses of the groups `means` of `set` in `frame` (bootstraps drawn by `mc`). A group
/// holding great circles has none.
///
/// # References
/// Kent, J. T. (1982), *J. R. Stat. Soc. B* 44, 71–80; Tauxe, L., Kylstra, N. & Constable, C. (1991),
/// *J. Geophys. Res.* 96, 11723–11740.
pub fn group_ellipses(
    method: EllipseMethod,
    set: &DirectionSet,
    means: &[GroupMean],
    frame: Frame,
    mc: &MonteCarlo<'_>,
) -> GroupEllipses {
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
            let r = match method {
                EllipseMethod::Kent => kent_ellipse(&v, v.len() as f64, 0.95),
                EllipseMethod::Bootstrap => bootstrap_ellipse(&v, BootstrapKind::Resample, 0.95, mc),
                EllipseMethod::BootstrapParametric => bootstrap_ellipse(&v, BootstrapKind::Parametric, 0.95, mc),
            };
            r.map_err(|e| e.to_string())
        })
        .collect();
    GroupEllipses { method, per_group, opposed }
}
