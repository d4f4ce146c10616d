//! The self-contained HTML report of a run: a methods-and-results section with the figures inline
//! (SVG), every table, the warnings, the rejections and the cautions. No scripts, no external
//! style sheets, fonts or images; no timestamps or absolute paths, so the same inputs give the same
//! bytes.

use super::SectionRun;
use std::fmt::Write as _;

/// Escape text for HTML.
pub fn escape(s: &str) -> String {
    let mut o = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => o.push_str("&amp;"),
            '<' => o.push_str("&lt;"),
            '>' => o.push_str("&gt;"),
            '"' => o.push_str("&quot;"),
            _ => o.push(c),
        }
    }
    o
}

/// The SVG text without an XML declaration, ready to sit inside HTML.
fn inline_svg(svg: &str) -> &str {
    let s = svg.trim_start();
    match (s.starts_with("<?xml"), s.find("?>")) {
        (true, Some(i)) => s[i + 2..].trim_start(),
        _ => s,
    }
}

const STYLE: &str = "body{font-family:sans-serif;max-width:60em;margin:2em auto;padding:0 1em;color:#222;line-height:1.45}\
h1{font-size:1.6em}h2{font-size:1.25em;border-bottom:1px solid #bbb;margin-top:2em}h3{font-size:1.05em}\
table{border-collapse:collapse;font-size:.85em;margin:.5em 0 1.2em}th,td{border:1px solid #ccc;padding:.15em .45em;text-align:right}\
th{background:#f2f2f2}td.t{text-align:left}caption{text-align:left;font-weight:bold;padding:.3em 0}\
figure{margin:1em 0}figure svg{max-width:100%;height:auto}figcaption{font-size:.9em;color:#444}\
.warn{background:#fff6e0;border-left:4px solid #d9a400;padding:.4em .8em}.caution{background:#eef4fb;border-left:4px solid #4a78b0;padding:.4em .8em}\
.skipped{color:#8a5a00}code{font-size:.95em}";

/// The HTML report. `title` names the project; `inputs` lists the input files with their sizes.
pub fn report_html(run: &SectionRun, title: &str, inputs: &[(String, usize)]) -> String {
    let s = &run.settings;
    let title = s.title.clone().unwrap_or_else(|| title.to_string());
    let mut h = String::new();
    let _ = write!(h, "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>{}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n",
        escape(&format!("Section report: {title}")));
    let _ = writeln!(h, "<h1>Section report: {}</h1>", escape(&title));
    let _ = writeln!(h, "<p>Written by lodestone {} (<code>lodestone section</code>). Every random result uses seed {} with {} resamples; the same inputs and settings give the same report, byte for byte.</p>",
        env!("CARGO_PKG_VERSION"), s.seed, s.resamples);

    // Summary
    let hd = &run.headline;
    let _ = writeln!(h, "<h2 id=\"summary\">Summary</h2>\n<ul>");
    let _ = writeln!(
        h,
        "<li>{} of {} specimens gave an accepted characteristic component; {} of {} sites were used.</li>",
        hd.specimens_fitted, hd.specimens, hd.sites_used, hd.sites
    );
    for st in &run.stages {
        let _ = writeln!(h, "<li><b>{}</b>: {}</li>", escape(&st.name), escape(&st.result));
    }
    let _ = writeln!(h, "</ul>");
    if !run.warnings.is_empty() {
        let _ = writeln!(h, "<div class=\"warn\" id=\"warnings\"><b>Warnings</b><ul>");
        for w in &run.warnings {
            let _ = writeln!(h, "<li>{}</li>", escape(w));
        }
        let _ = writeln!(h, "</ul></div>");
    }

    // Material and parameters
    let _ = writeln!(h, "<h2 id=\"material\">Material and parameters</h2>\n<p>Input files:</p>\n<ul>");
    for (name, bytes) in inputs {
        let _ = writeln!(h, "<li><code>{}</code> ({bytes} bytes)</li>", escape(name));
    }
    let _ = writeln!(h, "</ul>\n<table id=\"settings\"><caption>Settings in force (from settings.toml, defaults otherwise)</caption><tr><th>key</th><th>value</th></tr>");
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
    for (k, v) in rows {
        let _ = writeln!(h, "<tr><td class=\"t\">{k}</td><td>{}</td></tr>", escape(&v));
    }
    let _ = writeln!(h, "</table>");

    // Methods and results, stage by stage
    let _ = writeln!(h, "<h2 id=\"stages\">Methods and results</h2>");
    for st in &run.stages {
        let _ = writeln!(h, "<h3>{}</h3>", escape(&st.name));
        if !st.method.is_empty() {
            let _ = writeln!(h, "<p><i>Method.</i> {}</p>", escape(&st.method));
        }
        let class = if st.ran { "" } else { " class=\"skipped\"" };
        let _ = writeln!(h, "<p{class}><i>Result.</i> {}</p>", escape(&st.result));
        for stem in &st.figures {
            if let Some(f) = run.figures.iter().find(|f| &f.stem == stem) {
                let _ = writeln!(h, "<figure id=\"fig-{}\">\n{}\n<figcaption>Figure <code>figures/{}.svg</code>: {}</figcaption>\n</figure>",
                    f.stem, inline_svg(&f.svg), f.stem, escape(&f.caption));
            }
        }
        for stem in &st.tables {
            if let Some(t) = run.tables.iter().find(|t| &t.stem == stem) {
                table_html(&mut h, t);
            }
        }
    }
    let _ = writeln!(h, "<h2 id=\"rejections\">Specimens and sites rejected</h2>");
    if let Some(t) = run.tables.iter().find(|t| t.stem == "rejected") {
        if t.rows.is_empty() {
            let _ = writeln!(h, "<p>None.</p>");
        }
        table_html(&mut h, t);
    }
    if !run.cautions.is_empty() {
        let _ = writeln!(h, "<h2 id=\"cautions\">How to read these results</h2>\n<div class=\"caution\"><ul>");
        for c in &run.cautions {
            let _ = writeln!(h, "<li>{}</li>", escape(c));
        }
        let _ = writeln!(h, "</ul></div>");
    }
    let _ = writeln!(
        h,
        "<h2 id=\"files\">Files written</h2>\n<p>Tables: {}. Figures (SVG and PNG): {}.</p>",
        run.tables.iter().map(|t| format!("<code>tables/{}.csv</code>", t.stem)).collect::<Vec<_>>().join(", "),
        run.figures.iter().map(|f| format!("<code>figures/{}</code>", f.stem)).collect::<Vec<_>>().join(", ")
    );
    h.push_str("</body>\n</html>\n");
    h
}

fn table_html(h: &mut String, t: &super::CsvTable) {
    let _ = writeln!(
        h,
        "<table id=\"table-{}\"><caption>{} (<code>tables/{}.csv</code>)</caption>",
        t.stem,
        escape(&t.title),
        t.stem
    );
    let _ = write!(h, "<tr>");
    for c in &t.columns {
        let _ = write!(h, "<th>{}</th>", escape(c));
    }
    let _ = writeln!(h, "</tr>");
    for r in &t.rows {
        let _ = write!(h, "<tr>");
        for c in r {
            let numeric = !c.is_empty() && c.parse::<f64>().is_ok();
            let _ = write!(h, "<td{}>{}</td>", if numeric { "" } else { " class=\"t\"" }, escape(c));
        }
        let _ = writeln!(h, "</tr>");
    }
    let _ = writeln!(h, "</table>");
}
