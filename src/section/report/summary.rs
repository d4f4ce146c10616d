//! The report's first screen: the answers a reader wants, each with its uncertainty, read from the
//! run's own tables (the same cells as the CSV files), beside the key figures, with the cautions.
//!
//! Every number carries a `data-k` attribute naming it, so tests (and scripts) can read the
//! summary back and hold it against the verbs' JSON output.

use super::html::{escape, figure};
use crate::present::Cell;
use crate::section::{CsvTable, SectionRun};
use std::fmt::Write as _;

/// A number of the summary, marked with its key.
fn v(key: &str, text: impl AsRef<str>) -> String {
    format!("<b data-k=\"{key}\">{}</b>", escape(text.as_ref()))
}

/// A verdict badge: `good`, `bad` or `open` (neither).
fn badge(text: &str, class: &str) -> String {
    format!("<span class=\"verdict {class}\">{}</span>", escape(text))
}

fn row<'a>(t: &'a CsvTable, col: &str, value: &str) -> Option<&'a Vec<Cell>> {
    t.rows.iter().find(|r| t.cell(r, col).as_deref() == Some(value))
}

fn components(run: &SectionRun) -> String {
    let h = &run.headline;
    format!(
        "{} of {} specimens gave an accepted component; {} of {} sites used.",
        v("specimens-fitted", h.specimens_fitted.to_string()),
        v("specimens", h.specimens.to_string()),
        v("sites-used", h.sites_used.to_string()),
        v("sites", h.sites.to_string())
    )
}

fn pole(run: &SectionRun) -> Option<String> {
    let t = run.table("paleopole")?;
    let r = t.rows.first()?;
    let c = |k: &str| t.cell(r, k).unwrap_or_default();
    // The pole to two decimals, as the summary has always given it (the table shows one).
    let two = |k: &str| t.number(r, k).map_or_else(String::new, |x| crate::numbers::fixed(x, 2));
    let mut s = format!(
        "{}°N, {}°E, A95 = {}° (K = {}, N = {} sites).",
        v("pole-plat", two("plat")),
        v("pole-plon", t.number(r, "plon").map_or_else(String::new, |x| crate::numbers::azimuth(x, 2))),
        v("pole-a95", two("a95")),
        v("pole-k", c("k")),
        v("pole-n", c("n"))
    );
    if !c("s").is_empty() {
        let _ = write!(
            s,
            " VGP scatter S = {}° ({}–{}°, {:.0} % bootstrap; cutoff {}).",
            v("scatter-s", c("s")),
            v("scatter-low", c("s_low")),
            v("scatter-high", c("s_high")),
            run.settings.confidence * 100.0,
            escape(&c("cutoff"))
        );
    } else if !c("s_total").is_empty() {
        let _ = write!(
            s,
            " VGP scatter S_B undefined: the within-site scatter exceeds the total VGP scatter ({}°).",
            v("scatter-total", c("s_total"))
        );
    }
    Some(s)
}

fn field_tests(run: &SectionRun) -> Option<String> {
    let t = run.table("field-tests")?;
    let mut parts = Vec::new();
    if let Some(r) = row(t, "quantity", "gamma (deg)") {
        let class = t.cell(r, "outcome").unwrap_or_default().trim_start_matches("class ").to_string();
        let tone = match class.as_str() {
            "A" | "B" | "C" => "good",
            "negative" => "bad",
            _ => "open",
        };
        let vw = row(t, "quantity", "V_w").and_then(|r| t.cell(r, "outcome")).unwrap_or_else(|| "—".into());
        let boot =
            row(t, "quantity", "bootstrap x/y/z").and_then(|r| t.cell(r, "outcome")).unwrap_or_else(|| "—".into());
        parts.push(format!(
            "Reversal: γ = {}° against γc = {}°, {} (V_w {}, bootstrap {}).",
            v("reversal-gamma", t.cell(r, "value").unwrap_or_default()),
            v("reversal-gamma-c", t.cell(r, "critical").unwrap_or_default()),
            badge(&format!("class {class}"), tone),
            v("reversal-vw", vw),
            v("reversal-bootstrap", boot)
        ));
    }
    if let Some(r) = row(t, "test", "fold") {
        parts.push(format!(
            "Fold: best untilting {} % (95 %: {} %), {}.",
            v("fold-best", t.cell(r, "value").unwrap_or_default()),
            v("fold-interval", t.cell(r, "critical").unwrap_or_default()),
            badge(&t.cell(r, "outcome").unwrap_or_default(), "open")
        ));
    }
    (!parts.is_empty()).then(|| parts.join("<br>"))
}

fn column(run: &SectionRun) -> Option<String> {
    let z = run.table("zones")?;
    let levels = run.table("levels").map_or(0, |l| l.rows.len());
    let code: Vec<String> = z.rows.iter().filter_map(|r| z.cell(r, "polarity")).collect();
    let single = z.rows.iter().filter(|r| z.cell(r, "status").as_deref() != Some("confirmed")).count();
    Some(format!(
        "{} magnetozones from {} levels ({} single-level), from the base up: <code>{}</code>.",
        v("zones", z.rows.len().to_string()),
        v("levels", levels.to_string()),
        single,
        escape(&code.join(" "))
    ))
}

fn age_model(run: &SectionRun) -> Option<String> {
    let t = run.table("correlations")?;
    let best = row(t, "rank", "1")?;
    let c = |k: &str| t.cell(best, k).unwrap_or_default();
    let next = row(t, "rank", "2").and_then(|r| t.cell(r, "score")).unwrap_or_else(|| "none".into());
    Some(format!(
        "Best correlation: {} ties, score {} (next best {}; lower is better), {} chrons missing, mean rate {} cm/kyr; levels span {}–{} Ma.",
        v("ties", c("ties")),
        v("score", c("score")),
        v("score-next", next),
        v("missing-chrons", c("missing_chrons")),
        v("mean-rate", c("mean_rate_cm_kyr")),
        v("age-top", c("top_age")),
        v("age-base", c("base_age"))
    ))
}

fn reversal_stats(run: &SectionRun) -> Option<String> {
    let f = run.table("renewal-fits")?;
    let best = f
        .rows
        .iter()
        .max_by(|a, b| f.number(a, "weight").unwrap_or(0.0).total_cmp(&f.number(b, "weight").unwrap_or(0.0)))?;
    let c = |k: &str| f.cell(best, k).unwrap_or_default();
    let mut s = format!(
        "{} complete intervals; highest Akaike weight {} ({}; mean interval {} Myr; goodness of fit p = {} Kolmogorov–Smirnov, {} Anderson–Darling).",
        v("intervals", run.headline.intervals.to_string()),
        v("best-model", c("model")),
        v("best-weight", c("weight")),
        v("best-mean", c("mean_interval_myr")),
        v("best-ks-p", c("ks_p")),
        v("best-ad-p", c("ad_p"))
    );
    if let (Some(h), Some(e)) = (run.table("hazard"), run.headline.open_chron) {
        if let Some(r) = h.rows.iter().find(|r| h.cell(r, "model").is_some_and(|m| m.starts_with("averaged"))) {
            let _ = write!(
                s,
                "<br>Model-averaged P(reversal within {} Myr | none in the last {} Myr) = {} ({:.0} % bootstrap interval {}–{}): a statement about the fitted models, not a forecast.",
                crate::section::HAZARD_HORIZON,
                v("elapsed", crate::numbers::fixed(e, 3)),
                v("p-within", h.cell(r, "p_within").unwrap_or_default()),
                crate::section::LEVEL * 100.0,
                v("p-within-low", h.cell(r, "low").unwrap_or_default()),
                v("p-within-high", h.cell(r, "high").unwrap_or_default())
            );
        }
    }
    if let Some(t) = run.table("rate-tests") {
        if let Some(r) = row(t, "test", "laplace trend") {
            let _ = write!(
                s,
                "<br>Rate trend (Laplace): U = {}, p = {}.",
                v("laplace-u", t.cell(r, "value").unwrap_or_default()),
                v("laplace-p", t.cell(r, "p").unwrap_or_default())
            );
        }
    }
    Some(s)
}

fn truth(run: &SectionRun) -> Option<String> {
    let st = run.stages.iter().find(|s| s.name == "Comparison with the true model" && s.ran)?;
    Some(format!("{} <a href=\"#{}\">Details</a>.", escape(&st.result), super::stage_id(st)))
}

/// Write the summary section: answers, key figures, cautions.
pub fn write(h: &mut String, run: &SectionRun) {
    let _ = writeln!(
        h,
        "<section id=\"summary\"><h2>Summary</h2>\n<div class=\"summary\">\n<div>\n<table class=\"answers\">"
    );
    let rows: [(&str, Option<String>); 7] = [
        ("Components", Some(components(run))),
        ("Paleopole", pole(run)),
        ("Field tests", field_tests(run)),
        ("Polarity column", column(run)),
        ("Age model", age_model(run)),
        ("Reversal statistics", reversal_stats(run)),
        ("Against the truth", truth(run)),
    ];
    for (label, html) in rows {
        if let Some(html) = html {
            let _ = writeln!(h, "<tr id=\"answer-{}\"><th>{label}</th><td>{html}</td></tr>", super::html::slug(label));
        }
    }
    let _ = writeln!(h, "</table>");
    let mut cautions: Vec<&String> = Vec::new();
    for c in &run.cautions {
        if !cautions.contains(&c) {
            cautions.push(c);
        }
    }
    if !cautions.is_empty() {
        let _ = writeln!(h, "<div class=\"caution\" id=\"cautions\"><b>How to read these results</b><ul>");
        for c in cautions {
            let _ = writeln!(h, "<li>{}</li>", escape(c));
        }
        let _ = writeln!(h, "</ul></div>");
    }
    let _ = writeln!(h, "</div>\n<div class=\"keyfigs\">");
    for stem in ["column", "site-means-tilt", "vgps"] {
        if let Some(f) = run.figure(stem) {
            figure(h, f, "key-");
        }
    }
    let _ = writeln!(h, "</div>\n</div>\n</section>");
}
