//! The VGP-scatter stage as every front end runs it (the `poles` verb, the `section` run, the Python
//! package): the scatter with its cutoff, then the bootstrap interval over the sites it kept. A
//! scatter or an interval that the data cannot give does not fail the stage: the reason travels with
//! the result and is shown as a note, and the paleopole stands.

use super::scatter::{bootstrap_scatter, check_resamples, vgp_scatter, Cutoff, Scatter, ScatterInterval, ScatterSite};
use crate::error::{check_range, Error, Result};
use crate::montecarlo::MonteCarlo;

/// Fewest resamples of the scatter's bootstrap (fewer cannot place its percentiles).
pub const MIN_SCATTER_RESAMPLES: usize = 10;

/// What the scatter stage found.
#[derive(Debug, Clone, PartialEq)]
pub struct ScatterAssessment {
    /// The scatter after the cutoff, when the data give one.
    pub scatter: Option<Scatter>,
    /// Its bootstrap interval, when the scatter and the bootstrap give one.
    pub interval: Option<ScatterInterval>,
    /// Why the scatter (when `scatter` is None) or its interval could not be computed.
    pub failure: Option<Error>,
}

impl ScatterAssessment {
    /// The note that says what is missing and why, when something is.
    pub fn note(&self) -> Option<String> {
        missing_note(self.scatter.as_ref(), self.failure.as_ref())
    }

    /// Which sites the cutoff kept (all of them when there is no scatter).
    pub fn kept(&self, n_sites: usize) -> Vec<bool> {
        kept_or_all(self.scatter.as_ref(), n_sites)
    }
}

/// The note of [`ScatterAssessment::note`], for a result that keeps the stage's parts in its own fields
/// ([`super::PoleSummary`]).
pub(super) fn missing_note(scatter: Option<&Scatter>, failure: Option<&Error>) -> Option<String> {
    let e = failure?;
    Some(match scatter {
        None => format!("VGP scatter skipped: {e}."),
        Some(_) => format!("Scatter interval skipped: {e}."),
    })
}

/// The sites `scatter` kept, or all `n_sites` when there is no scatter.
pub(super) fn kept_or_all(scatter: Option<&Scatter>, n_sites: usize) -> Vec<bool> {
    scatter.map_or_else(|| vec![true; n_sites], |s| s.kept.clone())
}

/// See [`ScatterAssessment`]: [`vgp_scatter`] of `sites` with `cutoff`, then [`bootstrap_scatter`]
/// of the kept sites at `confidence`.
///
/// # Units
/// `confidence` a fraction in (0, 1); a fixed cutoff in degrees.
///
/// # Errors
/// Faults of the request, not of the data: a fixed cutoff outside [0, 180]°, `confidence` outside
/// (0, 1), fewer than [`MIN_SCATTER_RESAMPLES`] resamples.
pub fn assess_scatter(
    sites: &[ScatterSite],
    cutoff: Cutoff,
    confidence: f64,
    mc: &MonteCarlo<'_>,
) -> Result<ScatterAssessment> {
    if let Cutoff::Fixed(a) = cutoff {
        check_range("cutoff angle", a, 0.0, 180.0, "[0, 180]")?;
    }
    check_range("confidence", confidence, 1e-6, 1.0 - 1e-6, "(0, 1)")?;
    check_resamples(mc)?;
    let scatter = match vgp_scatter(sites, cutoff) {
        Ok(s) => s,
        Err(e) => return Ok(ScatterAssessment { scatter: None, interval: None, failure: Some(e) }),
    };
    let kept: Vec<ScatterSite> = sites.iter().zip(&scatter.kept).filter(|(_, k)| **k).map(|(s, _)| *s).collect();
    let (interval, failure) = match bootstrap_scatter(&kept, confidence, mc) {
        Ok(b) => (Some(b), None),
        Err(e) => (None, Some(e)),
    };
    Ok(ScatterAssessment { scatter: Some(scatter), interval, failure })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::poles::{within_site_sw, WithinSite};
    use crate::sphere::GeoPoint;

    /// Eight VGPs near the north pole and two far from it (invented), with within-site terms.
    fn sites() -> Vec<ScatterSite> {
        let lat = [82.0, 75.0, 88.0, 79.0, 70.0, 84.0, 77.0, 86.0, 25.0, 62.0];
        let lon = [10.0, 120.0, 200.0, 300.0, 45.0, 250.0, 170.0, 80.0, 20.0, 330.0];
        (0..10)
            .map(|i| ScatterSite {
                pole: GeoPoint::new(lat[i], lon[i]).unwrap(),
                within: Some(WithinSite { n: 5 + i % 3, sw: within_site_sw(40.0 + 10.0 * i as f64, 33.0) }),
            })
            .collect()
    }

    #[test]
    fn the_stage_is_the_scatter_and_its_bootstrap_on_the_kept_sites() {
        let s = sites();
        let mc = MonteCarlo::new(5, 200);
        let a = assess_scatter(&s, Cutoff::Fixed(45.0), 0.95, &mc).unwrap();
        let sc = vgp_scatter(&s, Cutoff::Fixed(45.0)).unwrap();
        let kept: Vec<ScatterSite> = s.iter().zip(&sc.kept).filter(|(_, k)| **k).map(|(x, _)| *x).collect();
        assert!(sc.n_removed > 0, "the cutoff must remove a site for this check");
        assert_eq!(a.interval, Some(bootstrap_scatter(&kept, 0.95, &mc).unwrap()));
        assert_eq!(a.kept(s.len()), sc.kept);
        assert_eq!(a.scatter, Some(sc));
        assert!(a.failure.is_none() && a.note().is_none());
    }

    #[test]
    fn a_scatter_the_data_cannot_give_is_a_note_and_a_bad_request_an_error() {
        let s = sites();
        let mc = MonteCarlo::new(5, 200);
        // A 1° cutoff about the mean pole keeps no site: no scatter, the reason as a note.
        let none = assess_scatter(&s, Cutoff::Fixed(1.0), 0.95, &mc).unwrap();
        assert!(none.scatter.is_none() && none.interval.is_none());
        assert!(matches!(none.failure, Some(Error::TooFew { needed: 2, .. })));
        assert!(none.note().unwrap().starts_with("VGP scatter skipped: "));
        assert_eq!(none.kept(s.len()), vec![true; s.len()]);
        // Two identical VGPs: a scatter of 0, but resamples of one pole repeated still have a mean;
        // two antipodal ones have no mean pole at all (a scatter failure).
        let p = GeoPoint::new(60.0, 10.0).unwrap();
        let anti = GeoPoint::new(-60.0, 190.0).unwrap();
        let pair = [ScatterSite { pole: p, within: None }, ScatterSite { pole: anti, within: None }];
        let odd = assess_scatter(&pair, Cutoff::None, 0.95, &mc).unwrap();
        assert!(odd.scatter.is_none() && odd.failure.is_some());
        // Faults of the request.
        assert!(matches!(
            assess_scatter(&s, Cutoff::Fixed(200.0), 0.95, &mc),
            Err(Error::OutOfRange { name: "cutoff angle", .. })
        ));
        assert!(matches!(
            assess_scatter(&s, Cutoff::None, 1.5, &mc),
            Err(Error::OutOfRange { name: "confidence", .. })
        ));
        let few = MonteCarlo::new(5, MIN_SCATTER_RESAMPLES - 1);
        assert!(matches!(
            assess_scatter(&s, Cutoff::None, 0.95, &few),
            Err(Error::Invalid { quantity: "resamples", .. })
        ));
    }
}
