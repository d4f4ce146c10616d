//! `mean --ellipse`: the choice of an elliptical confidence region per group (Kent 1982, or a
//! bootstrap of Tauxe et al. 1991), and the figure with the ellipses drawn.

use lodestone::dirstats::{EllipseMethod, GroupEllipses};
use lodestone::figures::{EllipseNet, EqualAreaPlot};

/// The kind of ellipse asked for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum EllipseArg {
    /// Kent's (1982) ellipse from the data.
    Kent,
    /// An ellipse fitted to bootstrapped means (Tauxe et al. 1991).
    Bootstrap,
}

/// The method of `kind` (`parametric`: Fisher draws instead of resampling, for the bootstrap).
pub fn method(kind: EllipseArg, parametric: bool) -> EllipseMethod {
    match (kind, parametric) {
        (EllipseArg::Kent, _) => EllipseMethod::Kent,
        (EllipseArg::Bootstrap, false) => EllipseMethod::Bootstrap,
        (EllipseArg::Bootstrap, true) => EllipseMethod::BootstrapParametric,
    }
}

/// The figure with each group's ellipse drawn about its mean.
pub fn with_ellipses(base: EqualAreaPlot, e: &GroupEllipses) -> EllipseNet {
    let ellipses = e
        .per_group
        .iter()
        .enumerate()
        .filter_map(|(i, r)| r.as_ref().ok().filter(|x| x.major > 0.0).map(|x| (i, x.boundary(120))))
        .collect();
    EllipseNet { base, ellipses }
}
