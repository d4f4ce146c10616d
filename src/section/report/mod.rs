//! The self-contained HTML report of a run, written to be read from the top: the summary (the
//! answers with their uncertainty, the key figures, the cautions) first, then a contents list, each
//! stage with its method, parameters, result, figures and tables (long tables folded, each linked
//! to its CSV file), every specimen in small drawings, and the files written.
//!
//! The page embeds its style sheet, one short script (print and keyboard helpers) and every figure
//! as inline SVG: it needs no network and no other file. It holds no timestamps or absolute paths,
//! so the same inputs give the same bytes. The parts read only the run's results (stages, tables,
//! figures, specimens), so they can take any stage that reports itself the same way.

mod gallery;
mod html;
mod sketch;
mod style;
mod summary;

pub use html::escape;

use super::{SectionRun, Stage};
use html::{figure, folded_table, slug};
use std::fmt::Write as _;

/// The HTML id of a stage's section.
pub fn stage_id(st: &Stage) -> String {
    format!("stage-{}", slug(&st.name))
}

/// The HTML report. `title` names the project (the settings' `title` wins); `inputs` lists the
/// input files with their sizes.
pub fn report_html(run: &SectionRun, title: &str, inputs: &[(String, usize)]) -> String {
    let s = &run.settings;
    let title = s.title.clone().unwrap_or_else(|| title.to_string());
    let mut h = String::new();
    let _ = write!(
        h,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>{}</title>\n<style>{}</style>\n<script>{}</script>\n</head>\n<body>\n<main>\n",
        escape(&format!("Section report: {title}")),
        style::CSS,
        style::SCRIPT
    );
    header(&mut h, run, &title);
    summary::write(&mut h, run);
    contents(&mut h, run);
    if !run.warnings.is_empty() {
        let _ = writeln!(h, "<div class=\"warn\" id=\"warnings\"><b>Warnings</b><ul>");
        for w in &run.warnings {
            let _ = writeln!(h, "<li>{}</li>", escape(w));
        }
        let _ = writeln!(h, "</ul></div>");
    }
    material(&mut h, run, inputs);
    for st in &run.stages {
        stage(&mut h, run, st);
    }
    gallery::write(&mut h, run);
    rejections(&mut h, run);
    files(&mut h, run);
    h.push_str("</main>\n</body>\n</html>\n");
    h
}

fn header(h: &mut String, run: &SectionRun, title: &str) {
    let locality = run.headline.locality.map_or(String::new(), |[lat, lon]| {
        let lon = crate::numbers::azimuth(lon, 2);
        format!("Locality {:.2}°{}, {lon}°E · ", lat.abs(), if lat < 0.0 { "S" } else { "N" })
    });
    let _ = writeln!(
        h,
        "<header class=\"top\"><h1>{}</h1>\n<p>{locality}{} specimens at {} sites · seed <b data-k=\"seed\">{}</b>, {} resamples · lodestone <b data-k=\"version\">{}</b> (<code>lodestone section</code>); the same inputs and settings give the same report, byte for byte.</p></header>",
        escape(title),
        run.headline.specimens,
        run.headline.sites,
        run.settings.seed,
        run.settings.resamples,
        env!("CARGO_PKG_VERSION")
    );
}

fn contents(h: &mut String, run: &SectionRun) {
    let _ = writeln!(h, "<nav class=\"toc\" id=\"contents\"><h2>Contents</h2><ol>");
    let _ = writeln!(h, "<li><a href=\"#summary\">Summary</a></li>");
    if !run.warnings.is_empty() {
        let _ = writeln!(h, "<li><a href=\"#warnings\">Warnings ({})</a></li>", run.warnings.len());
    }
    let _ = writeln!(h, "<li><a href=\"#material\">Material and parameters</a></li>");
    for st in &run.stages {
        let mark = if st.ran { "" } else { " (skipped)" };
        let _ = writeln!(h, "<li><a href=\"#{}\">{}</a>{mark}</li>", stage_id(st), escape(&st.name));
    }
    let _ = writeln!(h, "<li><a href=\"#specimens\">Every specimen ({})</a></li>", run.specimens.len());
    let _ = writeln!(h, "<li><a href=\"#rejections\">Specimens and sites rejected ({})</a></li>", run.rejected.len());
    let _ = writeln!(h, "<li><a href=\"#files\">Files written</a></li>\n</ol></nav>");
}

fn material(h: &mut String, run: &SectionRun, inputs: &[(String, usize)]) {
    let s = &run.settings;
    let _ = writeln!(
        h,
        "<section id=\"material\"><h2>Material and parameters</h2>\n<p>Input files: {}.</p>",
        inputs.iter().map(|(n, b)| format!("<code>{}</code> ({b} bytes)", escape(n))).collect::<Vec<_>>().join(", ")
    );
    let rows: [(&str, String); 12] = [
        ("seed", s.seed.to_string()),
        ("confidence", s.confidence.to_string()),
        ("resamples", s.resamples.to_string()),
        ("vgp_threshold", s.vgp_threshold.to_string()),
        ("min_levels", s.min_levels.to_string()),
        ("max_mad", s.max_mad.to_string()),
        ("max_dang", s.max_dang.to_string()),
        ("min_steps", s.min_steps.to_string()),
        ("max_site_a95", s.max_site_a95.to_string()),
        ("scatter_cutoff", s.scatter_cutoff.clone()),
        ("auto_rule", s.auto_rule.clone()),
        ("alpha", s.alpha.to_string()),
    ];
    let mut t = super::CsvTable::new(
        "settings",
        "Settings in force (from settings.toml, defaults otherwise)",
        &["key", "value"],
    );
    for (k, v) in rows {
        t.push(vec![k.into(), v]);
    }
    let _ = writeln!(h, "<details class=\"table\" id=\"settings\" open><summary>{}</summary>", escape(&t.title));
    html::table(h, &t);
    let _ = writeln!(h, "</details></section>");
}

fn stage(h: &mut String, run: &SectionRun, st: &Stage) {
    let _ = writeln!(h, "<section class=\"stage part\" id=\"{}\"><h2>{}</h2>", stage_id(st), escape(&st.name));
    let class = if st.ran { "result" } else { "result skipped" };
    let _ = writeln!(h, "<p class=\"{class}\">{}</p>", escape(&st.result));
    if !st.method.is_empty() {
        let _ = writeln!(h, "<p class=\"method\"><i>Method and parameters.</i> {}</p>", escape(&st.method));
    }
    let figs: Vec<_> = st.figures.iter().filter_map(|stem| run.figure(stem)).collect();
    if !figs.is_empty() {
        let _ = writeln!(h, "<div class=\"figs\">");
        for f in figs {
            figure(h, f, "fig-");
        }
        let _ = writeln!(h, "</div>");
    }
    for stem in &st.tables {
        if let Some(t) = run.table(stem) {
            folded_table(h, t);
        }
    }
    let _ = writeln!(h, "</section>");
}

fn rejections(h: &mut String, run: &SectionRun) {
    let _ = writeln!(h, "<section id=\"rejections\"><h2>Specimens and sites rejected</h2>");
    match run.table("rejected") {
        Some(t) if !t.rows.is_empty() => folded_table(h, t),
        _ => {
            let _ = writeln!(h, "<p>None.</p>");
        }
    }
    let _ = writeln!(h, "</section>");
}

fn files(h: &mut String, run: &SectionRun) {
    let _ = writeln!(
        h,
        "<section id=\"files\"><h2>Files written</h2>\n<p>Tables: {}.</p>\n<p>Figures (SVG and PNG): {}.</p></section>",
        run.tables
            .iter()
            .map(|t| format!("<a href=\"tables/{0}.csv\">tables/{0}.csv</a>", t.stem))
            .collect::<Vec<_>>()
            .join(", "),
        run.figures
            .iter()
            .map(|f| format!("<a href=\"figures/{0}.svg\">figures/{0}</a>", f.stem))
            .collect::<Vec<_>>()
            .join(", ")
    );
}
