//! The review page's JSON API: the project's specimens, fits on request, and picks saved to
//! `picks.csv`. Requests are plain values (method, path, body) so the rules are testable without a
//! socket; `super` connects them to the HTTP server.

use anyhow::{Context, Result};
use lodestone::demag::{fit_range, SpecimenFit};
use lodestone::model::{Anchor, FitKind};
use lodestone::model::{SpecimenSteps, StepSet};
// A fit as the page sees it (the contract's keys `dec`, `inc`, `mad`, `dang`, `n_steps`, with the
// range and the kind of fit) is the `components` presenter's view, so both give the same fields.
use lodestone::present::components::FitView;
use lodestone::section::{automatic_fit, rule_text, Project, ProjectFile, SectionSettings};
use lodestone::simulate::{Settings, PICKS_FILE, SAMPLING_FILE, SETTINGS_FILE, STEPS_FILE};
use lodestone::table::{read_picks, read_steps, Table};
use serde::{de::DeserializeOwned, Deserialize, Deserializer, Serialize};
use serde_json::Value;
use std::path::{Path, PathBuf};

/// A response: status, content type, body.
pub struct Reply {
    pub status: u16,
    pub content_type: &'static str,
    pub body: Vec<u8>,
}

impl Reply {
    fn json<T: Serialize + ?Sized>(status: u16, v: &T) -> Self {
        let body = serde_json::to_vec(v).expect("a reply body serializes");
        Reply { status, content_type: "application/json; charset=utf-8", body }
    }
    fn error(status: u16, msg: impl Into<String>) -> Self {
        Self::json(status, &ErrorBody { error: msg.into() })
    }
}

/// The body of a refusal.
#[derive(Serialize)]
struct ErrorBody {
    error: String,
}

/// A specimen's current fit: a saved pick, or the automatic rule's choice (with its grade).
struct Current {
    fit: Option<FitView>,
    source: &'static str,
    grade: Option<&'static str>,
    reason: String,
}

/// One row of `GET /api/specimens`.
#[derive(Serialize)]
struct SpecimenRow<'a> {
    specimen: &'a str,
    site: &'a Option<String>,
    n_steps: usize,
    fit: Option<FitView>,
    source: &'static str,
    grade: Option<&'static str>,
    reason: String,
}

/// One step of `GET /api/specimen/NAME`: the direction, moment and vector components.
#[derive(Serialize)]
struct StepBody {
    step: f64,
    dec: f64,
    inc: f64,
    moment: f64,
    x: f64,
    y: f64,
    z: f64,
}

/// The body of `GET /api/specimen/NAME`.
#[derive(Serialize)]
struct SpecimenBody<'a> {
    specimen: &'a str,
    site: &'a Option<String>,
    unit: Option<&'static str>,
    steps: Vec<StepBody>,
    fit: Option<FitView>,
    source: &'static str,
    grade: Option<&'static str>,
    reason: String,
    rule: String,
}

/// A stage of `GET /api/effect`.
#[derive(Serialize)]
struct StageBody<'a> {
    name: &'a str,
    ran: bool,
    result: &'a str,
}

/// The body of `GET /api/effect`: the stages the picks change, and the first caution.
#[derive(Serialize)]
struct EffectBody<'a> {
    stages: Vec<StageBody<'a>>,
    cautions: Vec<&'a String>,
}

/// The body of `DELETE /api/picks/NAME`: the automatic rule's fit that replaces the pick.
#[derive(Serialize)]
struct AfterDelete {
    fit: Option<FitView>,
    grade: Option<&'static str>,
    reason: String,
}

/// The body of `POST /api/fit` and `PUT /api/picks/NAME`. A field of the wrong type counts as
/// missing, so that the refusal names it.
#[derive(Deserialize)]
struct FitRequest {
    #[serde(default, deserialize_with = "lenient")]
    specimen: Option<String>,
    #[serde(default, deserialize_with = "lenient")]
    from: Option<f64>,
    #[serde(default, deserialize_with = "lenient")]
    to: Option<f64>,
    #[serde(default, deserialize_with = "lenient")]
    kind: Option<String>,
    #[serde(default, deserialize_with = "lenient")]
    anchor: Option<String>,
}

/// A value of type `T`, or `None` when the JSON value is of another type.
fn lenient<'de, D: Deserializer<'de>, T: DeserializeOwned>(d: D) -> std::result::Result<Option<T>, D::Error> {
    Ok(serde_json::from_value(Value::deserialize(d)?).ok())
}

/// One saved pick.
#[derive(Debug, Clone, PartialEq)]
pub struct PickRow {
    pub from: f64,
    pub to: f64,
    pub kind: FitKind,
    pub anchor: Anchor,
}

/// The project as the page sees it.
pub struct State {
    pub dir: PathBuf,
    pub set: StepSet,
    pub settings: SectionSettings,
    /// Picks per specimen, in the steps table's order when written.
    pub picks: Vec<(String, PickRow)>,
    /// Whether this run already kept a backup of the picks file.
    pub backed_up: bool,
}

fn read_table(dir: &Path, name: &str) -> Result<Table> {
    Ok(Table::read(&dir.join(name))?)
}

impl State {
    /// Read the folder's steps, settings and picks.
    pub fn load(dir: &Path) -> Result<State> {
        let set = read_steps(&read_table(dir, STEPS_FILE)?)?;
        if !dir.join(SAMPLING_FILE).is_file() {
            anyhow::bail!("{}: the project folder has no {SAMPLING_FILE}", dir.display());
        }
        let settings = match std::fs::read_to_string(dir.join(SETTINGS_FILE)) {
            Ok(text) => SectionSettings::from_settings(&Settings::parse(SETTINGS_FILE, &text)?)?.0,
            Err(_) => SectionSettings::default(),
        };
        let mut picks = Vec::new();
        let pp = dir.join(PICKS_FILE);
        if pp.is_file() {
            let t = Table::read(&pp)?;
            if !t.rows.is_empty() {
                for p in read_picks(&t, &set)? {
                    picks.push((p.specimen, PickRow { from: p.from, to: p.to, kind: p.kind, anchor: p.anchor }));
                }
            }
        }
        Ok(State { dir: dir.to_path_buf(), set, settings, picks, backed_up: false })
    }

    fn current(&self, sp: &SpecimenSteps) -> Current {
        let pick = |fit, reason| Current { fit, source: "pick", grade: None, reason };
        if let Some((_, p)) = self.picks.iter().find(|(s, _)| s == &sp.specimen) {
            return match fit_range(sp, p.from, p.to, p.kind, p.anchor) {
                Ok(f) => pick(Some(FitView::from(&f)), "chosen on this page or in picks.csv".into()),
                Err(e) => pick(None, e.to_string()),
            };
        }
        match automatic_fit(sp, &self.settings) {
            Ok(c) => Current {
                fit: Some(FitView::from(&c.fit)),
                source: "auto",
                grade: Some(c.grade.as_str()),
                reason: c.reason,
            },
            Err(why) => Current { fit: None, source: "auto", grade: None, reason: why },
        }
    }

    fn specimens(&self) -> Vec<SpecimenRow<'_>> {
        self.set
            .specimens
            .iter()
            .map(|sp| {
                let c = self.current(sp);
                SpecimenRow {
                    specimen: &sp.specimen,
                    site: &sp.site,
                    n_steps: sp.steps.len(),
                    fit: c.fit,
                    source: c.source,
                    grade: c.grade,
                    reason: c.reason,
                }
            })
            .collect()
    }

    fn specimen<'a>(&self, sp: &'a SpecimenSteps) -> SpecimenBody<'a> {
        let c = self.current(sp);
        let steps = sp
            .steps
            .iter()
            .map(|s| {
                let v = s.vector();
                StepBody {
                    step: s.step,
                    dec: s.direction.dec,
                    inc: s.direction.inc,
                    moment: s.moment,
                    x: v.x,
                    y: v.y,
                    z: v.z,
                }
            })
            .collect();
        let unit = sp.steps.iter().find_map(|s| s.treatment.map(|t| t.unit()).filter(|u| !u.is_empty()));
        SpecimenBody {
            specimen: &sp.specimen,
            site: &sp.site,
            unit,
            steps,
            fit: c.fit,
            source: c.source,
            grade: c.grade,
            reason: c.reason,
            rule: rule_text(&self.settings),
        }
    }

    /// Handle one request (already past the key and Host checks).
    pub fn handle(&mut self, method: &str, path: &str, body: &[u8]) -> Reply {
        let spec_of = |rest: &str| percent_decode(rest);
        match (method, path) {
            ("GET", "/api/specimens") => Reply::json(200, &self.specimens()),
            ("GET", "/api/effect") => match self.effect() {
                Ok(r) => r,
                Err(e) => Reply::error(500, format!("{e:#}")),
            },
            ("POST", "/api/fit") => match self.parse_fit(body, None) {
                Ok((_, f)) => Reply::json(200, &FitView::from(&f)),
                Err(e) => Reply::error(400, e),
            },
            ("GET", p) if p.starts_with("/api/specimen/") => match spec_of(&p["/api/specimen/".len()..]) {
                Some(name) => match self.set.get(&name) {
                    Some(sp) => Reply::json(200, &self.specimen(sp)),
                    None => Reply::error(404, format!("no specimen '{name}'")),
                },
                None => Reply::error(400, "the specimen name is not valid percent-encoded UTF-8"),
            },
            ("PUT", p) if p.starts_with("/api/picks/") => {
                let Some(name) = spec_of(&p["/api/picks/".len()..]) else {
                    return Reply::error(400, "the specimen name is not valid percent-encoded UTF-8");
                };
                match self.parse_fit(body, Some(&name)) {
                    Ok((row, f)) => self.save_with(&name, Some(row), &FitView::from(&f)),
                    Err(e) => Reply::error(400, e),
                }
            }
            ("DELETE", p) if p.starts_with("/api/picks/") => {
                let Some(name) = spec_of(&p["/api/picks/".len()..]) else {
                    return Reply::error(400, "the specimen name is not valid percent-encoded UTF-8");
                };
                let Some(sp) = self.set.get(&name) else {
                    return Reply::error(400, format!("no specimen '{name}' in {STEPS_FILE}"));
                };
                let now = self.specimen_after_delete(sp);
                self.save_with(&name, None, &now)
            }
            (_, p) if p.starts_with("/api/") => Reply::error(404, format!("no {method} {p}")),
            _ => Reply::error(404, "not found"),
        }
    }

    /// The site means and field tests with the current picks (and the automatic rule for the
    /// rest): the `section` chain run in memory without the time scale (no correlation), nothing
    /// written.
    fn effect(&self) -> Result<Reply> {
        let file = |name: &str| -> Result<Option<ProjectFile>> {
            let p = self.dir.join(name);
            Ok(if p.is_file() {
                Some(ProjectFile::new(name, std::fs::read(&p).with_context(|| format!("cannot read {}", p.display()))?))
            } else {
                None
            })
        };
        let project = Project {
            title: "review".into(),
            steps: file(STEPS_FILE)?.context("steps.csv is gone")?,
            sampling: file(SAMPLING_FILE)?.context("sampling.csv is gone")?,
            picks: (!self.picks.is_empty()).then(|| ProjectFile::new(PICKS_FILE, picks_csv(&self.picks))),
            timescale: None,
            settings: file(SETTINGS_FILE)?,
        };
        let run = lodestone::section::run(&project, &lodestone::montecarlo::Silent, &mut |_| {})?;
        let stages = run
            .stages
            .iter()
            .filter(|s| ["Characteristic components", "Site means", "Field tests"].contains(&s.name.as_str()))
            .map(|s| StageBody { name: &s.name, ran: s.ran, result: &s.result })
            .collect();
        Ok(Reply::json(200, &EffectBody { stages, cautions: run.cautions.iter().take(1).collect() }))
    }

    fn specimen_after_delete(&self, sp: &SpecimenSteps) -> AfterDelete {
        match automatic_fit(sp, &self.settings) {
            Ok(c) => AfterDelete { fit: Some(FitView::from(&c.fit)), grade: Some(c.grade.as_str()), reason: c.reason },
            Err(why) => AfterDelete { fit: None, grade: None, reason: why },
        }
    }

    /// Validate a fit request: JSON object with from, to (step values of the specimen), kind, anchor.
    fn parse_fit(&self, body: &[u8], name: Option<&str>) -> std::result::Result<(PickRow, SpecimenFit), String> {
        let v: Value = serde_json::from_slice(body).map_err(|e| format!("the body is not valid JSON: {e}"))?;
        if !v.is_object() {
            return Err("the body must be a JSON object".into());
        }
        let req: FitRequest = serde_json::from_value(v).map_err(|e| format!("the body is not a fit request: {e}"))?;
        let specimen = match name {
            Some(n) => n.to_string(),
            None => req.specimen.ok_or("'specimen' (a string) is required")?,
        };
        let sp = self.set.get(&specimen).ok_or_else(|| format!("no specimen '{specimen}' in {STEPS_FILE}"))?;
        let step = |key: &str, x: Option<f64>| -> std::result::Result<f64, String> {
            let x = x.ok_or(format!("'{key}' (a number) is required"))?;
            let tol = 1e-9 * x.abs().max(1.0);
            if sp.steps.iter().any(|s| (s.step - x).abs() <= tol) {
                Ok(x)
            } else {
                Err(format!("{key} = {x} is not a step of specimen {specimen}"))
            }
        };
        let (from, to) = (step("from", req.from)?, step("to", req.to)?);
        if from > to {
            return Err(format!("from = {from} is above to = {to}"));
        }
        let kind = match req.kind.as_deref().unwrap_or("line") {
            "line" => FitKind::Line,
            "plane" => FitKind::Plane,
            o => return Err(format!("kind '{o}' is not 'line' or 'plane'")),
        };
        let anchor = match req.anchor.as_deref().unwrap_or("free") {
            "free" => Anchor::Free,
            "origin" => Anchor::Origin,
            o => return Err(format!("anchor '{o}' is not 'free' or 'origin'")),
        };
        let f = fit_range(sp, from, to, kind, anchor).map_err(|e| e.to_string())?;
        Ok((PickRow { from, to, kind, anchor }, f))
    }

    /// Replace (or remove) a specimen's pick and write the picks file; the state changes only if
    /// the write succeeds.
    fn save_with<T: Serialize>(&mut self, name: &str, row: Option<PickRow>, answer: &T) -> Reply {
        let mut next: Vec<(String, PickRow)> = self.picks.iter().filter(|(s, _)| s != name).cloned().collect();
        if let Some(r) = row {
            next.push((name.to_string(), r));
        }
        let order = |s: &str| self.set.specimens.iter().position(|x| x.specimen == s).unwrap_or(usize::MAX);
        next.sort_by_key(|(s, _)| order(s));
        match self.write(&next) {
            Ok(()) => {
                self.picks = next;
                Reply::json(200, answer)
            }
            Err(e) => Reply::error(500, format!("{e:#}")),
        }
    }

    fn write(&mut self, picks: &[(String, PickRow)]) -> Result<()> {
        let path = self.dir.join(PICKS_FILE);
        if !self.backed_up && path.is_file() {
            let old = std::fs::read(&path).with_context(|| format!("cannot read {}", path.display()))?;
            let backup = self.dir.join(format!("{PICKS_FILE}.bak"));
            super::super::write_atomic(&backup, &old, &Default::default())?;
        }
        self.backed_up = true;
        if picks.is_empty() {
            // A picks table needs rows: with none left, every specimen is automatic.
            if path.is_file() {
                std::fs::remove_file(&path).with_context(|| format!("cannot remove {}", path.display()))?;
            }
            return Ok(());
        }
        super::super::write_atomic(&path, picks_csv(picks).as_bytes(), &Default::default())
    }
}

/// The picks table's text.
pub fn picks_csv(picks: &[(String, PickRow)]) -> String {
    let mut s = String::from("specimen,from,to,kind,anchor\n");
    for (name, p) in picks {
        let quoted =
            if name.contains([',', '"', '\n']) { format!("\"{}\"", name.replace('"', "\"\"")) } else { name.clone() };
        s.push_str(&format!("{quoted},{},{},{},{}\n", p.from, p.to, p.kind.as_str(), p.anchor.as_str()));
    }
    s
}

/// Decode `%XX` escapes of a URL path segment; `None` for bad escapes or invalid UTF-8.
pub fn percent_decode(s: &str) -> Option<String> {
    let b = s.as_bytes();
    let mut out = Vec::with_capacity(b.len());
    let mut i = 0;
    while i < b.len() {
        if b[i] == b'%' {
            let hex = std::str::from_utf8(b.get(i + 1..i + 3)?).ok()?;
            out.push(u8::from_str_radix(hex, 16).ok()?);
            i += 3;
        } else {
            out.push(b[i]);
            i += 1;
        }
    }
    String::from_utf8(out).ok()
}
