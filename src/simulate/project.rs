//! The project folder of one sampled section: file names, the settings file, and the writers that
//! turn a synthetic section into the folder's tables.
//!
//! A project folder holds:
//!
//! | file | content | required |
//! |---|---|---|
//! | `steps.csv` | steps table: `specimen`, `site`, `step`, `treatment`, `dec`, `inc`, `moment`, `height` or `depth` | yes |
//! | `sampling.csv` | one row per site (level): `site`, `lat`, `lon`, `height` or `depth`, `bed_dip_dir`, `bed_dip` | yes |
//! | `picks.csv` | picks table: `specimen`, `from`, `to`, optional `kind`, `anchor` | no |
//! | `timescale.csv` | timescale table: `young`, `old`, `polarity`, optional `name` | no |
//! | `settings.toml` | flat `key = value` settings ([`Settings`]) | no |
//! | `truth.json` | the model behind a synthetic folder (written by `simulate` only) | no |

use super::section::{SectionModel, SyntheticSection};
use super::{truth_document, TimeScaleSource};
use crate::error::TableError;
use crate::model::{StratAxis, TimeScale, Treatment};
use crate::numbers::{fixed, scientific};
use std::collections::BTreeMap;
use std::fmt::Write as _;

/// File name of the steps table.
pub const STEPS_FILE: &str = "steps.csv";
/// File name of the sampling (sites) table.
pub const SAMPLING_FILE: &str = "sampling.csv";
/// File name of the optional picks table.
pub const PICKS_FILE: &str = "picks.csv";
/// File name of the optional time scale.
pub const TIMESCALE_FILE: &str = "timescale.csv";
/// File name of the optional settings.
pub const SETTINGS_FILE: &str = "settings.toml";
/// File name of the true model of a synthetic folder.
pub const TRUTH_FILE: &str = "truth.json";

/// A value in the settings file.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[serde(untagged)]
pub enum SettingValue {
    /// A number.
    Number(f64),
    /// `true` or `false`.
    Bool(bool),
    /// A double-quoted string.
    Text(String),
}

/// One setting with the line it came from.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Setting {
    /// The value.
    pub value: SettingValue,
    /// 1-based line in the file.
    pub line: usize,
}

/// The settings file: one `key = value` per line, `#` starts a comment (to the end of the line
/// outside quotes), blank lines ignored. Keys are lower-case letters, digits and `_`; values are
/// numbers, `true`/`false`, or double-quoted strings (no escapes). No sections, no arrays: a small
/// subset of TOML, so any TOML reader also reads it.
///
/// Keys written by `simulate` and read by `section`: `seed` (integer ≥ 0), `confidence` (0–1),
/// `resamples` (integer), `vgp_threshold` (degrees of VGP latitude below which a level's polarity
/// is left undetermined), `min_levels` (levels per magnetozone), `max_mad` (degrees).
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize)]
pub struct Settings {
    /// File name for messages.
    pub source: String,
    /// Settings by key.
    pub values: BTreeMap<String, Setting>,
}

impl Settings {
    /// Parse settings text; errors name the file, line and key.
    pub fn parse(name: &str, text: &str) -> Result<Settings, TableError> {
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let mut values = BTreeMap::new();
        for (i, raw) in text.lines().enumerate() {
            let line = i + 1;
            let err = |col: Option<&str>, m: String| TableError::value(name, line, col, m);
            let body = strip_comment(raw).trim();
            if body.is_empty() {
                continue;
            }
            let Some((k, v)) = body.split_once('=') else {
                return Err(err(None, format!("expected 'key = value', found '{body}'")));
            };
            let key = k.trim().to_lowercase();
            if key.is_empty() || !key.chars().all(|c| c.is_ascii_alphanumeric() || c == '_') {
                return Err(err(None, format!("'{}' is not a key (letters, digits and _ only)", k.trim())));
            }
            let v = v.trim();
            let value = if let Some(s) = v.strip_prefix('"') {
                match s.strip_suffix('"') {
                    Some(inner) if !inner.contains('"') => SettingValue::Text(inner.to_string()),
                    _ => return Err(err(Some(&key), format!("unterminated or malformed string {v}"))),
                }
            } else if v == "true" || v == "false" {
                SettingValue::Bool(v == "true")
            } else {
                match v.replace('_', "").parse::<f64>() {
                    Ok(x) if x.is_finite() => SettingValue::Number(x),
                    _ => {
                        return Err(err(
                            Some(&key),
                            format!("'{v}' is not a number, true/false, or a \"quoted string\""),
                        ))
                    }
                }
            };
            if let Some(prev) = values.insert(key.clone(), Setting { value, line }) {
                return Err(err(Some(&key), format!("set twice (first on line {})", prev.line)));
            }
        }
        Ok(Settings { source: name.into(), values })
    }

    fn err(&self, key: &str, s: &Setting, m: String) -> TableError {
        TableError::value(self.source.as_str(), s.line, Some(key), m)
    }

    /// A number in `[lo, hi]`, if set.
    pub fn number(&self, key: &str, lo: f64, hi: f64) -> Result<Option<f64>, TableError> {
        match self.values.get(key) {
            None => Ok(None),
            Some(s) => match s.value {
                SettingValue::Number(x) if x >= lo && x <= hi => Ok(Some(x)),
                SettingValue::Number(x) => Err(self.err(key, s, format!("{x} is outside [{lo}, {hi}]"))),
                _ => Err(self.err(key, s, "expected a number".into())),
            },
        }
    }

    /// A non-negative integer no larger than `max`, if set.
    pub fn integer(&self, key: &str, max: u64) -> Result<Option<u64>, TableError> {
        match self.number(key, 0.0, max as f64)? {
            None => Ok(None),
            Some(x) if x.fract() == 0.0 => Ok(Some(x as u64)),
            Some(x) => Err(self.err(key, &self.values[key], format!("{x} is not a whole number"))),
        }
    }

    /// A boolean, if set.
    pub fn boolean(&self, key: &str) -> Result<Option<bool>, TableError> {
        match self.values.get(key) {
            None => Ok(None),
            Some(Setting { value: SettingValue::Bool(b), .. }) => Ok(Some(*b)),
            Some(s) => Err(self.err(key, s, "expected true or false".into())),
        }
    }

    /// A string, if set.
    pub fn text(&self, key: &str) -> Result<Option<&str>, TableError> {
        match self.values.get(key) {
            None => Ok(None),
            Some(Setting { value: SettingValue::Text(t), .. }) => Ok(Some(t)),
            Some(s) => Err(self.err(key, s, "expected a \"quoted string\"".into())),
        }
    }

    /// Keys present but not in `known` (for a warning: probably a typing mistake).
    pub fn unknown_keys<'a>(&'a self, known: &[&str]) -> Vec<&'a str> {
        self.values.keys().map(String::as_str).filter(|k| !known.contains(k)).collect()
    }
}

fn strip_comment(line: &str) -> &str {
    let mut quoted = false;
    for (i, c) in line.char_indices() {
        match c {
            '"' => quoted = !quoted,
            '#' if !quoted => return &line[..i],
            _ => {}
        }
    }
    line
}

/// Every file of the project folder of a synthetic section `sec` drawn from `model` over `ts`
/// (from `source`) with `seed`: (file name, text) for the steps, sampling, time scale, settings
/// and truth files, in that order. Each file says in its comment lines that it is synthetic.
pub fn project_files(
    model: &SectionModel,
    sec: &SyntheticSection,
    ts: &TimeScale,
    source: &TimeScaleSource,
    seed: u64,
) -> serde_json::Result<Vec<(&'static str, String)>> {
    let what = format!(
        "Synthetic data written by lodestone simulate section (seed {seed}): a model, not measurements.\nLocality {:.4}, {:.4}; {} levels, {} specimens each.",
        model.site.lat,
        model.site.lon,
        sec.levels.len(),
        model.specimens
    );
    let source_text = serde_json::to_string(source)?;
    let ts_comment = format!("Time scale used by the synthetic section (seed {seed}).\nSource: {source_text}");
    let settings_comment = "Settings for lodestone section (flat key = value; see the README, 'Project folder').";
    Ok(vec![
        (STEPS_FILE, steps_csv(model, sec, &what)),
        (SAMPLING_FILE, sampling_csv(model, sec, &what)),
        (TIMESCALE_FILE, timescale_csv(ts, &ts_comment)),
        (SETTINGS_FILE, settings_text(seed, settings_comment)),
        (TRUTH_FILE, serde_json::to_string_pretty(&truth_document(model, sec, ts, source, seed))? + "\n"),
    ])
}

/// The text of a timescale table (`name` column only when a chron is named). Ages with six decimals
/// (one year).
pub fn timescale_csv(ts: &TimeScale, comment: &str) -> String {
    let named = ts.chrons.iter().any(|c| c.name.is_some());
    let mut s = String::new();
    for l in comment.lines() {
        let _ = writeln!(s, "# {l}");
    }
    s.push_str(if named { "name,young,old,polarity\n" } else { "young,old,polarity\n" });
    for c in &ts.chrons {
        if named {
            let _ = write!(s, "{},", c.name.as_deref().unwrap_or(""));
        }
        let _ = writeln!(s, "{},{},{}", fixed(c.young, 6), fixed(c.old, 6), c.polarity.code());
    }
    s
}

fn position(model: &SectionModel, height: f64, depth: f64) -> f64 {
    match model.axis {
        StratAxis::Height => height,
        StratAxis::Depth => depth,
    }
}

/// The text of the steps table: directions with two decimals (degrees), moments with five
/// significant digits, positions in millimetres precision.
pub fn steps_csv(model: &SectionModel, sec: &SyntheticSection, comment: &str) -> String {
    let mut s = String::with_capacity(sec.specimens.len() * model.steps.len() * 64);
    for l in comment.lines() {
        let _ = writeln!(s, "# {l}");
    }
    let _ = writeln!(s, "specimen,site,step,treatment,dec,inc,moment,{}", model.axis.column());
    for sp in &sec.specimens {
        let lv = &sec.levels[sp.level];
        let pos = fixed(position(model, lv.height, lv.depth), 3);
        for st in &sp.steps {
            let t = if st.step == 0.0 { Treatment::Nrm } else { model.treatment }.code();
            // An exactly zero measured vector has no direction: written as 0, 0 with zero moment.
            let d = st.direction.unwrap_or(crate::sphere::Direction { dec: 0.0, inc: 0.0 });
            let _ = writeln!(
                s,
                "{},{},{},{t},{},{},{},{pos}",
                sp.name,
                lv.site,
                fixed(st.step, 1).trim_end_matches(".0"),
                fixed(d.dec, 2),
                fixed(d.inc, 2),
                scientific(st.moment, 4)
            );
        }
    }
    s
}

/// The text of the sampling table: one row per level with the locality and bedding (empty bedding
/// cells for flat-lying levels).
pub fn sampling_csv(model: &SectionModel, sec: &SyntheticSection, comment: &str) -> String {
    let mut s = String::new();
    for l in comment.lines() {
        let _ = writeln!(s, "# {l}");
    }
    let _ = writeln!(s, "site,lat,lon,{},bed_dip_dir,bed_dip", model.axis.column());
    for lv in &sec.levels {
        let (dd, dip) = match lv.bedding {
            Some(b) => (fixed(b.dip_dir, 1), fixed(b.dip, 1)),
            None => (String::new(), String::new()),
        };
        let _ = writeln!(
            s,
            "{},{},{},{},{dd},{dip}",
            lv.site,
            fixed(model.site.lat, 4),
            fixed(model.site.lon, 4),
            fixed(position(model, lv.height, lv.depth), 3)
        );
    }
    s
}

/// The text of a settings file written for a synthetic section.
pub fn settings_text(seed: u64, comment: &str) -> String {
    let mut s = String::new();
    for l in comment.lines() {
        let _ = writeln!(s, "# {l}");
    }
    let _ = writeln!(s, "seed = {seed}");
    s.push_str("confidence = 0.95\nresamples = 1000\nvgp_threshold = 45\nmin_levels = 2\nmax_mad = 15\n");
    s
}
