//! Every specimen of a steps table fitted by one automatic rule: the stage the `components` verb and
//! the Python package share, with each rule's defaults decided here and nowhere else.

use super::auto::{auto_line, AutoOutcome, AutoRule};
use super::last_component::{last_component, LastComponentRule};
use super::ranges::SpecimenFit;
use crate::error::{Error, Result};
use crate::model::StepSet;

/// An automatic rule with its parameters.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum AutomaticRule {
    /// The last component ([`last_component`]): a line grown down from the last steps, else a great
    /// circle; each fit graded.
    Last(LastComponentRule),
    /// The longest straight run heading for the origin ([`auto_line`]); no grades.
    Longest(AutoRule),
}

impl AutomaticRule {
    /// The rule called `name` (`last` or `longest`) with its defaults ([`LastComponentRule::default`],
    /// [`AutoRule::default`]: MAD ≤ 15° for `last`, ≤ 5° for `longest`).
    ///
    /// # Errors
    /// [`Error::Invalid`] (quantity `rule`) for any other name.
    pub fn by_name(name: &str) -> Result<Self> {
        match name {
            "last" => Ok(AutomaticRule::Last(LastComponentRule::default())),
            "longest" => Ok(AutomaticRule::Longest(AutoRule::default())),
            other => Err(Error::invalid("rule", other, "the automatic rule is 'last' or 'longest'")),
        }
    }

    /// The rule's name (`last`, `longest`).
    pub fn name(&self) -> &'static str {
        match self {
            AutomaticRule::Last(_) => "last",
            AutomaticRule::Longest(_) => "longest",
        }
    }

    /// The largest accepted MAD, degrees.
    pub fn max_mad(&self) -> f64 {
        match self {
            AutomaticRule::Last(r) => r.max_mad,
            AutomaticRule::Longest(r) => r.max_mad,
        }
    }
}

/// What an automatic rule made of a steps table.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct AutomaticFits {
    /// The fits, in the steps table's specimen order.
    pub fits: Vec<SpecimenFit>,
    /// (specimen, reason) of the specimens the rule left without a fit.
    pub unfitted: Vec<(String, String)>,
    /// (specimen, grade, reason) of each fit of the last-component rule (empty for the longest run).
    pub grades: Vec<(String, &'static str, String)>,
}

/// Fit every specimen of `set` by `rule`.
///
/// # Errors
/// The last-component rule's parameters out of range ([`LastComponentRule::validate`]).
pub fn fit_automatically(set: &StepSet, rule: &AutomaticRule) -> Result<AutomaticFits> {
    let mut out = AutomaticFits::default();
    match rule {
        AutomaticRule::Last(r) => {
            r.validate()?;
            for sp in &set.specimens {
                match last_component(sp, r) {
                    Ok(c) => {
                        out.grades.push((sp.specimen.clone(), c.grade.as_str(), c.reason));
                        out.fits.push(c.fit);
                    }
                    Err(why) => out.unfitted.push((sp.specimen.clone(), why)),
                }
            }
        }
        AutomaticRule::Longest(r) => {
            for sp in &set.specimens {
                match auto_line(sp, r) {
                    AutoOutcome::Fitted(f) => out.fits.push(f),
                    AutoOutcome::Unfitted(why) => out.unfitted.push((sp.specimen.clone(), why)),
                }
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::super::tests::synthetic;
    use super::*;
    use crate::demag::AutoOutcome;

    /// Specimens of the synthetic history (tests.rs) with noise growing from none to 8 % of the NRM.
    fn set() -> StepSet {
        let specimens = (0..12).map(|i| synthetic(0.007 * i as f64, i).0).collect();
        StepSet { source: "synthetic".into(), axis: None, has_bedding: false, specimens }
    }

    #[test]
    fn the_stage_is_the_rule_applied_to_every_specimen() {
        let set = set();
        let last = fit_automatically(&set, &AutomaticRule::by_name("last").unwrap()).unwrap();
        let rule = LastComponentRule::default();
        let mut want = AutomaticFits::default();
        for sp in &set.specimens {
            match last_component(sp, &rule) {
                Ok(c) => {
                    want.grades.push((sp.specimen.clone(), c.grade.as_str(), c.reason));
                    want.fits.push(c.fit);
                }
                Err(why) => want.unfitted.push((sp.specimen.clone(), why)),
            }
        }
        assert_eq!(last, want);
        // The defaults are the library's: a last-component line may reach MAD 15°; the data hold
        // lines between 5° and 15°, which a MAD ≤ 5° limit would have refused.
        assert!(last.fits.iter().any(|f| f.mad > 5.0 && f.mad <= 15.0), "{:?}", last.fits);
        let longest = fit_automatically(&set, &AutomaticRule::by_name("longest").unwrap()).unwrap();
        assert!(longest.grades.is_empty());
        for sp in &set.specimens {
            match auto_line(sp, &AutoRule::default()) {
                AutoOutcome::Fitted(f) => assert!(longest.fits.contains(&f)),
                AutoOutcome::Unfitted(why) => assert!(longest.unfitted.contains(&(sp.specimen.clone(), why))),
            }
        }
        assert_eq!(longest.fits.len() + longest.unfitted.len(), set.specimens.len());
    }

    #[test]
    fn names_defaults_and_bad_rules() {
        assert_eq!(AutomaticRule::by_name("last").unwrap().max_mad(), 15.0);
        assert_eq!(AutomaticRule::by_name("longest").unwrap().max_mad(), 5.0);
        assert_eq!(AutomaticRule::by_name("longest").unwrap().name(), "longest");
        assert!(matches!(AutomaticRule::by_name("quickest"), Err(Error::Invalid { quantity: "rule", .. })));
        let two = AutomaticRule::Last(LastComponentRule { min_steps: 2, ..LastComponentRule::default() });
        assert!(matches!(fit_automatically(&set(), &two), Err(Error::TooFew { needed: 3, got: 2, .. })));
    }
}
