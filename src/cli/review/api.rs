//! The review page's JSON API: the project's specimens, fits on request, and picks saved to
//! `picks.csv`. Requests are plain values (method, path, body) so the rules are testable without a
//! socket; `super` connects them to the HTTP server.

use anyhow::{Context, Result};
use lodestone::demag::{fit_range, SpecimenFit};
use lodestone::model::{Anchor, FitKind};
use lodestone::model::{SpecimenSteps, StepSet};
use lodestone::section::{automatic_fit, rule_text, Project, ProjectFile, SectionSettings};
use lodestone::simulate::{Settings, PICKS_FILE, SAMPLING_FILE, SETTINGS_FILE, STEPS_FILE};
use lodestone::table::{read_picks, read_steps, Table};
use serde_json::{json, Value};
use std::path::{Path, PathBuf};

/// A response: status, content type, body.
pub struct Reply {
    pub status: u16,
    pub content_type: &'static str,
    pub body: Vec<u8>,
}

impl Reply {
    fn json(status: u16, v: &Value) -> Self {
        Reply { status, content_type: "application/json; charset=utf-8", body: v.to_string().into_bytes() }
    }
    fn error(status: u16, msg: impl Into<String>) -> Self {
        Self::json(status, &json!({ "error": msg.into() }))
    }
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

    fn current(&self, sp: &SpecimenSteps) -> (Value, &'static str, Option<&'static str>, String) {
        if let Some((_, p)) = self.picks.iter().find(|(s, _)| s == &sp.specimen) {
            return match fit_range(sp, p.from, p.to, p.kind, p.anchor) {
                Ok(f) => (fit_json(&f), "pick", None, "chosen on this page or in picks.csv".into()),
                Err(e) => (Value::Null, "pick", None, e.to_string()),
            };
        }
        match automatic_fit(sp, &self.settings) {
            Ok(c) => (fit_json(&c.fit), "auto", Some(c.grade.as_str()), c.reason),
            Err(why) => (Value::Null, "auto", None, why),
        }
    }

    fn specimens(&self) -> Value {
        let list: Vec<Value> = self
            .set
            .specimens
            .iter()
            .map(|sp| {
                let (fit, source, grade, reason) = self.current(sp);
                json!({"specimen": sp.specimen, "site": sp.site, "n_steps": sp.steps.len(), "fit": fit,
                       "source": source, "grade": grade, "reason": reason})
            })
            .collect();
        Value::Array(list)
    }

    fn specimen(&self, sp: &SpecimenSteps) -> Value {
        let (fit, source, grade, reason) = self.current(sp);
        let steps: Vec<Value> = sp
            .steps
            .iter()
            .map(|s| {
                let v = s.vector();
                json!({"step": s.step, "dec": s.direction.dec, "inc": s.direction.inc, "moment": s.moment,
                       "x": v.x, "y": v.y, "z": v.z})
            })
            .collect();
        let unit = sp.steps.iter().find_map(|s| s.treatment.map(|t| t.unit()).filter(|u| !u.is_empty()));
        json!({"specimen": sp.specimen, "site": sp.site, "unit": unit, "steps": steps, "fit": fit,
               "source": source, "grade": grade, "reason": reason, "rule": rule_text(&self.settings)})
    }

    /// Handle one request (already past the key and Host checks).
    pub fn handle(&mut self, method: &str, path: &str, body: &[u8]) -> Reply {
        let spec_of = |rest: &str| percent_decode(rest);
        match (method, path) {
            ("GET", "/api/specimens") => Reply::json(200, &self.specimens()),
            ("GET", "/api/effect") => match self.effect() {
                Ok(v) => Reply::json(200, &v),
                Err(e) => Reply::error(500, format!("{e:#}")),
            },
            ("POST", "/api/fit") => match self.parse_fit(body, None) {
                Ok((_, f)) => Reply::json(200, &fit_json(&f)),
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
                    Ok((row, f)) => self.save_with(&name, Some(row), fit_json(&f)),
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
                self.save_with(&name, None, now)
            }
            (_, p) if p.starts_with("/api/") => Reply::error(404, format!("no {method} {p}")),
            _ => Reply::error(404, "not found"),
        }
    }

    /// The site means and field tests with the current picks (and the automatic rule for the
    /// rest): the `section` chain run in memory without the time scale (no correlation), nothing
    /// written.
    fn effect(&self) -> Result<Value> {
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
        let stages: Vec<Value> = run
            .stages
            .iter()
            .filter(|s| ["Characteristic components", "Site means", "Field tests"].contains(&s.name.as_str()))
            .map(|s| json!({"name": s.name, "ran": s.ran, "result": s.result}))
            .collect();
        Ok(json!({"stages": stages, "cautions": run.cautions.iter().take(1).collect::<Vec<_>>()}))
    }

    fn specimen_after_delete(&self, sp: &SpecimenSteps) -> Value {
        match automatic_fit(sp, &self.settings) {
            Ok(c) => json!({"fit": fit_json(&c.fit), "grade": c.grade.as_str(), "reason": c.reason}),
            Err(why) => json!({"fit": null, "grade": null, "reason": why}),
        }
    }

    /// Validate a fit request: JSON object with from, to (step values of the specimen), kind, anchor.
    fn parse_fit(&self, body: &[u8], name: Option<&str>) -> std::result::Result<(PickRow, SpecimenFit), String> {
        let v: Value = serde_json::from_slice(body).map_err(|e| format!("the body is not valid JSON: {e}"))?;
        let obj = v.as_object().ok_or("the body must be a JSON object")?;
        let specimen = match name {
            Some(n) => n.to_string(),
            None => obj.get("specimen").and_then(Value::as_str).ok_or("'specimen' (a string) is required")?.to_string(),
        };
        let sp = self.set.get(&specimen).ok_or_else(|| format!("no specimen '{specimen}' in {STEPS_FILE}"))?;
        let step = |key: &str| -> std::result::Result<f64, String> {
            let x = obj.get(key).and_then(Value::as_f64).ok_or(format!("'{key}' (a number) is required"))?;
            let tol = 1e-9 * x.abs().max(1.0);
            if sp.steps.iter().any(|s| (s.step - x).abs() <= tol) {
                Ok(x)
            } else {
                Err(format!("{key} = {x} is not a step of specimen {specimen}"))
            }
        };
        let (from, to) = (step("from")?, step("to")?);
        if from > to {
            return Err(format!("from = {from} is above to = {to}"));
        }
        let kind = match obj.get("kind").and_then(Value::as_str).unwrap_or("line") {
            "line" => FitKind::Line,
            "plane" => FitKind::Plane,
            o => return Err(format!("kind '{o}' is not 'line' or 'plane'")),
        };
        let anchor = match obj.get("anchor").and_then(Value::as_str).unwrap_or("free") {
            "free" => Anchor::Free,
            "origin" => Anchor::Origin,
            o => return Err(format!("anchor '{o}' is not 'free' or 'origin'")),
        };
        let f = fit_range(sp, from, to, kind, anchor).map_err(|e| e.to_string())?;
        Ok((PickRow { from, to, kind, anchor }, f))
    }

    /// Replace (or remove) a specimen's pick and write the picks file; the state changes only if
    /// the write succeeds.
    fn save_with(&mut self, name: &str, row: Option<PickRow>, answer: Value) -> Reply {
        let mut next: Vec<(String, PickRow)> = self.picks.iter().filter(|(s, _)| s != name).cloned().collect();
        if let Some(r) = row {
            next.push((name.to_string(), r));
        }
        let order = |s: &str| self.set.specimens.iter().position(|x| x.specimen == s).unwrap_or(usize::MAX);
        next.sort_by_key(|(s, _)| order(s));
        match self.write(&next) {
            Ok(()) => {
                self.picks = next;
                Reply::json(200, &answer)
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

fn fit_json(f: &SpecimenFit) -> Value {
    json!({"kind": f.kind, "anchor": f.anchor, "n_steps": f.n_steps, "from": f.from, "to": f.to,
           "dec": f.direction.dec, "inc": f.direction.inc, "mad": f.mad, "dang": f.dang})
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
