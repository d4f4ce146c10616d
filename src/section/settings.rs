//! Settings of a `section` run, read from the project's `settings.toml` with defaults.

use crate::error::TableError;
use crate::poles::Cutoff;
use crate::simulate::Settings;

/// Keys `section` reads from `settings.toml`; any other key is reported as a warning.
pub const KNOWN_KEYS: [&str; 13] = [
    "seed",
    "confidence",
    "resamples",
    "vgp_threshold",
    "min_levels",
    "max_mad",
    "max_dang",
    "min_steps",
    "max_site_a95",
    "scatter_cutoff",
    "title",
    "auto_rule",
    "alpha",
];

/// Settings in force for a run.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SectionSettings {
    /// Seed of every random result (default 1).
    pub seed: u64,
    /// Confidence level of site-mean cones and of the scatter interval (default 0.95). Field tests
    /// always use 95 %, the level of their published critical values.
    pub confidence: f64,
    /// Monte Carlo resamples of the field tests and the scatter bootstrap (default 1000).
    pub resamples: usize,
    /// VGP latitude, degrees, from which a level is normal or reversed (default 45).
    pub vgp_threshold: f64,
    /// Levels a magnetozone needs to be confirmed (default 2).
    pub min_levels: usize,
    /// Largest accepted MAD of a fitted line, degrees (default 15).
    pub max_mad: f64,
    /// Largest DANG of an automatic line, degrees (default 10).
    pub max_dang: f64,
    /// Fewest steps of an automatic line (default 3).
    pub min_steps: usize,
    /// Largest α95 of a site mean used downstream, degrees (default 30).
    pub max_site_a95: f64,
    /// Cutoff of the VGP scatter: `none`, `vandamme` or an angle (default `none`).
    pub scatter_cutoff: String,
    /// Title of the report (default: the project's name).
    pub title: Option<String>,
    /// Automatic rule without picks: `last` (the last component, default) or `longest` (the longest
    /// straight run, the earlier rule).
    pub auto_rule: String,
    /// Significance level of the last-component rule's break test (default 0.05).
    pub alpha: f64,
}

impl Default for SectionSettings {
    fn default() -> Self {
        Self {
            seed: crate::montecarlo::DEFAULT_SEED,
            confidence: 0.95,
            resamples: 1000,
            vgp_threshold: crate::strat::DEFAULT_THRESHOLD,
            min_levels: crate::strat::DEFAULT_MIN_LEVELS,
            max_mad: 15.0,
            max_dang: 10.0,
            min_steps: 3,
            max_site_a95: 30.0,
            scatter_cutoff: "none".into(),
            title: None,
            auto_rule: "last".into(),
            alpha: 0.05,
        }
    }
}

impl SectionSettings {
    /// Settings from a parsed settings file, defaults for missing keys. Returns the settings and the
    /// unknown keys.
    pub fn from_settings(s: &Settings) -> Result<(SectionSettings, Vec<String>), TableError> {
        let d = SectionSettings::default();
        let cut = s.text("scatter_cutoff")?.map(str::to_string).unwrap_or(d.scatter_cutoff.clone());
        if parse_cutoff(&cut).is_none() {
            let line = s.values.get("scatter_cutoff").map_or(0, |v| v.line);
            return Err(TableError::value(
                s.source.as_str(),
                line,
                Some("scatter_cutoff"),
                format!("'{cut}' is not \"none\", \"vandamme\" or an angle in (0, 180]"),
            ));
        }
        let out = SectionSettings {
            seed: s.integer("seed", u64::MAX >> 11)?.unwrap_or(d.seed),
            confidence: s.number("confidence", 0.5, 0.999)?.unwrap_or(d.confidence),
            resamples: s
                .integer("resamples", 1_000_000)?
                .map_or(d.resamples, |x| x as usize)
                .max(crate::montecarlo::MIN_RESAMPLES),
            vgp_threshold: s.number("vgp_threshold", 0.0, 89.0)?.unwrap_or(d.vgp_threshold),
            min_levels: s.integer("min_levels", 1000)?.map_or(d.min_levels, |x| (x as usize).max(1)),
            max_mad: s.number("max_mad", 0.0, 90.0)?.unwrap_or(d.max_mad),
            max_dang: s.number("max_dang", 0.0, 90.0)?.unwrap_or(d.max_dang),
            min_steps: s.integer("min_steps", 1000)?.map_or(d.min_steps, |x| (x as usize).max(2)),
            max_site_a95: s.number("max_site_a95", 0.0, 180.0)?.unwrap_or(d.max_site_a95),
            scatter_cutoff: cut,
            title: s.text("title")?.map(str::to_string),
            auto_rule: s.text("auto_rule")?.map_or(d.auto_rule.clone(), str::to_string),
            alpha: s.number("alpha", 1e-6, 0.5)?.unwrap_or(d.alpha),
        };
        if !matches!(out.auto_rule.as_str(), "last" | "longest") {
            let line = s.values.get("auto_rule").map_or(0, |v| v.line);
            return Err(TableError::value(
                s.source.as_str(),
                line,
                Some("auto_rule"),
                format!("'{}' is not \"last\" or \"longest\"", out.auto_rule),
            ));
        }
        let unknown = s.unknown_keys(&KNOWN_KEYS).into_iter().map(str::to_string).collect();
        Ok((out, unknown))
    }

    /// The scatter cutoff as the library's [`Cutoff`].
    pub fn cutoff(&self) -> Cutoff {
        parse_cutoff(&self.scatter_cutoff).unwrap_or(Cutoff::None)
    }
}

fn parse_cutoff(s: &str) -> Option<Cutoff> {
    Cutoff::parse(s)
}
