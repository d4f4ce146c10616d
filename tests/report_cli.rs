//! The demo's HTML report as a whole: its parts in reading order with a contents list that reaches
//! each; every figure and table of the run inside it (long tables folded, each linked to its CSV);
//! one drawing per specimen; the complete reversal statistics; the comparison with the true model;
//! the summary's numbers against the JSON of the verbs run on the same data; self-contained and
//! under the size budget; and a load in headless Chromium with no console message.
//!
//! The demo is run once and shared by the tests of this file.

use assert_cmd::Command;
use serde_json::Value;
use std::collections::BTreeMap;
use std::fs;
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

/// The report's size budget for the demo (issue 17).
const BUDGET: usize = 3 * 1024 * 1024;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

fn repo(p: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(p)
}

struct Demo {
    _dir: tempfile::TempDir,
    out: PathBuf,
    html: String,
    json: Value,
}

fn demo() -> &'static Demo {
    static DEMO: OnceLock<Demo> = OnceLock::new();
    DEMO.get_or_init(|| {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path().join("demo-out");
        let o = cmd().args(["demo", "--out", out.to_str().unwrap(), "--format", "json", "--quiet"]).output().unwrap();
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        let html = fs::read_to_string(out.join("report.html")).unwrap();
        Demo { _dir: dir, out, html, json: serde_json::from_slice(&o.stdout).unwrap() }
    })
}

/// The verb's JSON output (with `--format json`).
fn verb(args: &[&str]) -> Value {
    let o = cmd().args(args).args(["--format", "json"]).output().unwrap();
    assert!(o.status.success(), "{args:?}: {}", String::from_utf8_lossy(&o.stderr));
    serde_json::from_slice(&o.stdout).unwrap()
}

fn read_csv(p: &Path) -> Vec<BTreeMap<String, String>> {
    let mut r = csv::ReaderBuilder::new().comment(Some(b'#')).from_path(p).unwrap();
    let head: Vec<String> = r.headers().unwrap().iter().map(String::from).collect();
    r.records().map(|rec| head.iter().cloned().zip(rec.unwrap().iter().map(String::from)).collect()).collect()
}

/// Every `data-k="KEY">VALUE<` of the summary.
fn summary_values(html: &str) -> BTreeMap<String, String> {
    let mut m = BTreeMap::new();
    for part in html.split("data-k=\"").skip(1) {
        let (key, rest) = part.split_once("\">").unwrap();
        let value = rest.split('<').next().unwrap();
        m.insert(key.to_string(), value.to_string());
    }
    m
}

/// Byte offset of `id="ID"` in the page (panics if absent).
fn at(html: &str, id: &str) -> usize {
    html.find(&format!("id=\"{id}\"")).unwrap_or_else(|| panic!("no element with id {id}"))
}

/// `x` written with as many decimals as `shown` has.
fn like(shown: &str, x: f64) -> String {
    let d = shown.split_once('.').map_or(0, |(_, f)| f.len());
    let s = format!("{x:.d$}");
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s
    }
}

fn num(v: &BTreeMap<String, String>, key: &str) -> f64 {
    v.get(key).unwrap_or_else(|| panic!("summary has no {key}")).parse().unwrap()
}

/// The contents list's links: (target id, text), in order.
fn contents_links(html: &str) -> Vec<(String, String)> {
    let start = at(html, "contents");
    let nav = &html[start..start + html[start..].find("</nav>").unwrap()];
    nav.split("<a href=\"#")
        .skip(1)
        .map(|s| {
            let (id, rest) = s.split_once("\">").unwrap();
            (id.to_string(), rest.split("</a>").next().unwrap().to_string())
        })
        .collect()
}

#[test]
fn parts_come_in_reading_order_and_the_contents_list_reaches_each() {
    let d = demo();
    let h = &d.html;
    let links: Vec<(String, String)> = contents_links(h).into_iter().filter(|(id, _)| id != "warnings").collect();
    let stages: Vec<&str> = d.json["stages"].as_array().unwrap().iter().map(|s| s["name"].as_str().unwrap()).collect();
    assert!(stages.len() >= 7, "{stages:?}");
    // Summary, material, every stage of the run in its order, the gallery, the rejections, the files.
    let texts: Vec<&str> = links.iter().map(|l| l.1.as_str()).collect();
    assert_eq!(texts[..2], ["Summary", "Material and parameters"]);
    assert_eq!(texts[2..2 + stages.len()], stages[..]);
    assert_eq!(
        texts[2 + stages.len()..],
        [
            "Every specimen (192)",
            &format!("Specimens and sites rejected ({})", d.json["rejected"].as_array().unwrap().len()),
            "Files written"
        ]
    );
    // Each target exists, and the parts come in the page in the order of the list, after the contents.
    let mut ids: Vec<&str> = vec!["summary", "contents"];
    ids.extend(links.iter().skip(1).map(|l| l.0.as_str()));
    let pos: Vec<usize> = ids.iter().map(|id| at(h, id)).collect();
    assert!(pos.windows(2).all(|w| w[0] < w[1]), "parts out of order: {ids:?} at {pos:?}");
    // The first screen: title, locality, seed and version come before the summary.
    let h1 = h.find("<h1>").unwrap();
    assert!(h1 < pos[0] && h[h1..pos[0]].contains("Locality 41.30°N, 247.60°E"));
    let v = summary_values(h);
    assert_eq!(v["seed"], "2718");
    assert_eq!(v["version"], env!("CARGO_PKG_VERSION"));
    // The summary holds the key figures, before the contents list.
    for stem in ["column", "site-means-tilt", "vgps"] {
        let k = at(h, &format!("key-{stem}"));
        assert!(pos[0] < k && k < pos[1], "key figure {stem} is not in the summary");
    }
}

/// The HTML of the stage with this name (found through the contents list), up to the gallery.
fn stage_html<'a>(d: &'a Demo, name: &str) -> &'a str {
    let id = contents_links(&d.html).into_iter().find(|l| l.1 == name).unwrap().0;
    &d.html[at(&d.html, &id)..at(&d.html, "specimens")]
}

#[test]
fn every_figure_and_table_of_the_run_is_in_the_report() {
    let d = demo();
    let (mut n_tab, mut n_fig) = (0, 0);
    for e in fs::read_dir(d.out.join("tables")).unwrap() {
        let name = e.unwrap().file_name().to_string_lossy().to_string();
        let stem = name.strip_suffix(".csv").unwrap();
        let rows = read_csv(&d.out.join("tables").join(&name)).len();
        n_tab += 1;
        if stem == "rejected" && rows == 0 {
            // An empty table of rejections is said in words (the file is still written and listed).
            assert!(d.html[at(&d.html, "rejections")..].split("</section>").next().unwrap().contains("<p>None.</p>"));
            assert!(d.html.contains("href=\"tables/rejected.csv\""));
            continue;
        }
        let open = format!("<details class=\"table\" id=\"table-{stem}\"");
        let i = d.html.find(&open).unwrap_or_else(|| panic!("report lacks table {stem}"));
        let tag = &d.html[i..i + d.html[i..].find('>').unwrap()];
        // Long tables are folded, short ones open; each links its CSV file.
        assert_eq!(tag.ends_with(" open"), rows <= 12, "{stem}: {rows} rows, tag {tag}");
        assert!(d.html[i..].split("</summary>").next().unwrap().contains(&format!("href=\"tables/{stem}.csv\"")));
    }
    for e in fs::read_dir(d.out.join("figures")).unwrap() {
        let name = e.unwrap().file_name().to_string_lossy().to_string();
        if let Some(stem) = name.strip_suffix(".svg") {
            let i = at(&d.html, &format!("fig-{stem}"));
            assert!(
                d.html[i..].split_once('>').unwrap().1.trim_start().starts_with("<svg"),
                "figure {stem} is not inline SVG"
            );
            assert!(d.out.join(format!("figures/{stem}.png")).exists());
            n_fig += 1;
        }
    }
    // Tables: components, site means, field tests, VGPs, paleopole, levels, zones, correlations, ties,
    // age model, rates, renewal fits, hazard, rate, rate tests, three truth tables, rejections. Figures:
    // two nets of site means, fold, VGPs, column, intervals, hazard, rate.
    assert!(n_tab >= 19 && n_fig >= 8, "{n_tab} tables, {n_fig} figures");
    let components = read_csv(&d.out.join("tables/components.csv")).len();
    assert!(components > 12 && !d.html.contains("id=\"table-components\" open"), "the long components table is folded");
}

#[test]
fn every_specimen_has_a_drawing_and_the_rejected_carry_their_reason() {
    let d = demo();
    let steps = fs::read_to_string(repo("records/demo/steps.csv")).unwrap();
    let mut specimens: Vec<String> = Vec::new();
    for line in steps.lines().filter(|l| !l.starts_with('#')).skip(1) {
        let s = line.split(',').next().unwrap().to_string();
        if !specimens.contains(&s) {
            specimens.push(s);
        }
    }
    assert_eq!(specimens.len(), 192);
    let gallery = &d.html[at(&d.html, "specimens")..at(&d.html, "rejections")];
    let cards: Vec<&str> = gallery.split("<figure class=\"card").skip(1).collect();
    assert_eq!(cards.len(), specimens.len());
    for (card, name) in cards.iter().zip(&specimens) {
        assert!(card.contains(&format!("data-specimen=\"{name}\"")), "cards out of the steps table's order at {name}");
        // Three panels in one drawing: the net is the only circle.
        let svg = &card[card.find("<svg").unwrap()..card.find("</svg>").unwrap()];
        assert_eq!(svg.matches("<circle").count(), 1, "{name}");
    }
    // Every rejection of the run (none on the demo since its regeneration; the fixture below has
    // some) is marked on its cards with the reason.
    rejections_are_marked(&d.out, &cards);
}

/// Every row of the run's `tables/rejected.csv` is marked on the cards it concerns with its reason; a
/// rejected specimen's card carries the `rejected` class. Returns the number of rows.
fn rejections_are_marked(out: &Path, cards: &[&str]) -> usize {
    let rejected = read_csv(&out.join("tables/rejected.csv"));
    for r in &rejected {
        let reason = r["reason"].replace('<', "&lt;").replace('>', "&gt;");
        let marked: Vec<&&str> = cards
            .iter()
            .filter(|c| match r["what"].as_str() {
                "specimen" => c.contains(&format!("data-specimen=\"{}\"", r["name"])),
                _ => c.contains(&format!("data-specimen=\"{}-", r["name"])),
            })
            .collect();
        assert!(!marked.is_empty(), "{r:?}");
        assert!(marked.iter().all(|c| c.contains(&reason)), "{r:?} is not marked with its reason");
        if r["what"] == "specimen" {
            assert!(marked.iter().all(|c| c.starts_with(" rejected\"")), "{r:?}");
        }
    }
    rejected.len()
}

#[test]
fn rejected_specimens_and_sites_are_marked_on_a_small_fixture() {
    // A small folder written by `simulate section` with two picks over every step: the normal overprint
    // and the reversed (FX001) or normal (FX004) characteristic component do not make one line, so
    // their MAD (26° and 31°, measured) exceeds max_mad = 15° and the two specimens must be rejected;
    // sites with two specimens scattered by κ = 40 also fail max_site_a95.
    let dir = tempfile::tempdir().unwrap();
    let proj = dir.path().join("fixture");
    let o = cmd()
        .args(["simulate", "section", proj.to_str().unwrap(), "--seed", "7", "--base-age", "1.3"])
        .args(["--lat", "-33", "--lon", "150", "--spacing", "2", "--specimens", "2", "--bedding", "90/20,180/30"])
        .args(["--overprint", "10/40", "--overprint-ratio", "1", "--site-prefix", "FX", "--quiet"])
        .output()
        .unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    fs::write(proj.join("picks.csv"), "specimen,from,to\nFX001-1,0,560\nFX004-2,0,560\n").unwrap();
    let out = dir.path().join("out");
    let o =
        cmd().args(["section", proj.to_str().unwrap(), "--out", out.to_str().unwrap(), "--quiet"]).output().unwrap();
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let html = fs::read_to_string(out.join("report.html")).unwrap();
    let gallery = &html[at(&html, "specimens")..at(&html, "rejections")];
    let cards: Vec<&str> = gallery.split("<figure class=\"card").skip(1).collect();
    assert_eq!(cards.len(), 26);
    let rows = read_csv(&out.join("tables/rejected.csv"));
    let specimens: Vec<&str> = rows.iter().filter(|r| r["what"] == "specimen").map(|r| r["name"].as_str()).collect();
    assert_eq!(specimens, ["FX001-1", "FX004-2"]);
    assert!(rows.iter().any(|r| r["what"] == "site"), "{rows:?}");
    assert_eq!(rejections_are_marked(&out, &cards), rows.len());
}

#[test]
fn reversal_statistics_are_complete_with_their_cautions() {
    let d = demo();
    let fits = read_csv(&d.out.join("tables/renewal-fits.csv"));
    assert_eq!(fits.len(), 5);
    for f in &fits {
        for k in ["ks_p", "ad_p"] {
            let p: f64 = f[k].parse().unwrap_or_else(|_| panic!("{f:?} has no {k}"));
            assert!((0.0..=1.0).contains(&p), "{f:?}");
        }
    }
    let hazard = read_csv(&d.out.join("tables/hazard.csv"));
    let avg = hazard.iter().find(|r| r["model"].starts_with("averaged")).unwrap();
    let (p, lo, hi): (f64, f64, f64) =
        (avg["p_within"].parse().unwrap(), avg["low"].parse().unwrap(), avg["high"].parse().unwrap());
    assert!(lo <= p && p <= hi, "{avg:?}");
    let rate = read_csv(&d.out.join("tables/rate.csv"));
    assert!(rate.len() > 10 && rate.iter().all(|r| r["low"].parse::<f64>().unwrap() <= r["rate"].parse().unwrap()));
    for fig in ["fig-intervals", "fig-hazard", "fig-rate"] {
        at(&d.html, fig);
    }
    let stage = stage_html(d, "Reversal statistics of the time scale");
    assert!(stage.contains("Kolmogorov–Smirnov") && stage.contains("Anderson–Darling") && stage.contains("bootstrap"));
    // The cautions of the hazard and of every other stage are in the summary.
    let summary = &d.html[at(&d.html, "summary")..at(&d.html, "contents")];
    for c in d.json["cautions"].as_array().unwrap() {
        let c = c.as_str().unwrap().replace('&', "&amp;");
        assert!(summary.contains(&c), "caution missing from the summary: {c}");
    }
    assert!(summary.contains("not a forecast"));
}

#[test]
fn summary_numbers_equal_the_verbs_json_on_the_same_data() {
    let d = demo();
    let v = summary_values(&d.html);
    let ts = repo("records/demo/timescale.csv");
    let ts = ts.to_str().unwrap();
    let seed = ["--seed", "2718", "--resamples", "1000"];

    // Reversal statistics: the same time scale file, seed and resamples give the same numbers.
    let iv = verb(&[&["intervals", ts][..], &seed[..]].concat());
    let best = iv["models"]
        .as_array()
        .unwrap()
        .iter()
        .max_by(|a, b| a["weight"].as_f64().unwrap().total_cmp(&b["weight"].as_f64().unwrap()))
        .unwrap();
    assert_eq!(v["intervals"], iv["n_intervals"].to_string());
    assert_eq!(v["best-model"], best["model"].as_str().unwrap());
    for (k, j) in
        [("best-weight", "weight"), ("best-ks-p", "ks_p"), ("best-ad-p", "ad_p"), ("best-mean", "mean_interval")]
    {
        assert_eq!(v[k], like(&v[k], best[j].as_f64().unwrap()), "{k}");
    }
    let hz = verb(&[&["hazard", ts][..], &seed[..]].concat());
    assert_eq!(v["elapsed"], like(&v["elapsed"], hz["elapsed"].as_f64().unwrap()));
    for (k, j) in [("p-within", "p_within"), ("p-within-low", "low"), ("p-within-high", "high")] {
        assert_eq!(v[k], like(&v[k], hz["averaged"][j].as_f64().unwrap()), "{k}");
    }
    let rt = verb(&["rate", ts]);
    assert_eq!(v["laplace-u"], like(&v["laplace-u"], rt["laplace"]["u"].as_f64().unwrap()));
    assert_eq!(v["laplace-p"], like(&v["laplace-p"], rt["laplace"]["p_value"].as_f64().unwrap()));

    // Correlation: the zones table the run wrote, against the same time scale.
    let zones = d.out.join("tables/zones.csv");
    let cr = verb(&["correlate", zones.to_str().unwrap(), ts]);
    let c0 = &cr["candidates"][0];
    assert_eq!(v["ties"], c0["ties"].as_array().unwrap().len().to_string());
    assert_eq!(v["score"], like(&v["score"], c0["score"].as_f64().unwrap()));
    assert_eq!(v["score-next"], like(&v["score-next"], cr["candidates"][1]["score"].as_f64().unwrap()));
    assert_eq!(v["missing-chrons"], c0["missing_chrons"].to_string());
    assert_eq!(v["zones"], read_csv(&zones).len().to_string());

    // Poles and field tests: the site means of the run's table (written with one decimal), so the
    // verbs agree within the rounding of their input.
    let dir = tempfile::tempdir().unwrap();
    let sampling = read_csv(&repo("records/demo/sampling.csv")).into_iter();
    let sampling: BTreeMap<String, BTreeMap<String, String>> = sampling.map(|r| (r["site"].clone(), r)).collect();
    let means: Vec<_> =
        read_csv(&d.out.join("tables/site-means.csv")).into_iter().filter(|r| r["used"] == "yes").collect();
    let mut sites = String::from("site,lat,lon,dec,inc,n,k\n");
    let mut geo = String::from("site,dec,inc,bed_dip_dir,bed_dip\n");
    let mut tilt = String::from("site,dec,inc\n");
    for m in &means {
        let s = &sampling[&m["site"]];
        sites += &format!(
            "{},{},{},{},{},{},{}\n",
            m["site"], s["lat"], s["lon"], m["dec_tilt"], m["inc_tilt"], m["n"], m["k_tilt"]
        );
        geo += &format!("{},{},{},{},{}\n", m["site"], m["dec_geo"], m["inc_geo"], s["bed_dip_dir"], s["bed_dip"]);
        tilt += &format!("{},{},{}\n", m["site"], m["dec_tilt"], m["inc_tilt"]);
    }
    let write = |name: &str, text: &str| {
        let p = dir.path().join(name);
        fs::write(&p, text).unwrap();
        p.to_str().unwrap().to_string()
    };
    let (sites, geo, tilt) = (write("sites.csv", &sites), write("geo.csv", &geo), write("tilt.csv", &tilt));
    let pl = verb(&[&["poles", &sites, "--northern"][..], &seed[..]].concat());
    assert_eq!(v["pole-n"], pl["pole"]["n"].to_string());
    for (k, j, tol) in [("pole-plat", "plat", 0.05), ("pole-plon", "plon", 0.3), ("pole-a95", "a95", 0.02)] {
        let got = pl["pole"][j].as_f64().unwrap();
        assert!((num(&v, k) - got).abs() <= tol, "{k}: summary {} against poles {got}", v[k]);
    }
    assert!((num(&v, "pole-k") / pl["pole"]["k"].as_f64().unwrap() - 1.0).abs() < 0.01);
    // S_B is undefined (JSON null) when the within-site scatter exceeds the total; the summary then
    // says so and gives the total instead.
    match pl["scatter"]["s"].as_f64() {
        Some(s) => assert!((num(&v, "scatter-s") - s).abs() <= 0.05),
        None => assert!(!v.contains_key("scatter-s") && v.contains_key("scatter-total"), "{v:?}"),
    }
    let rv = verb(&[&["test", "reversal", &tilt][..], &seed[..]].concat());
    assert!((num(&v, "reversal-gamma") - rv["gamma"].as_f64().unwrap()).abs() <= 0.05);
    assert!((num(&v, "reversal-gamma-c") - rv["gamma_c"].as_f64().unwrap()).abs() <= 0.05);
    let summary = &d.html[at(&d.html, "answer-field-tests")..];
    assert!(summary.contains(&format!("class {}<", rv["class"].as_str().unwrap())), "class {}", rv["class"]);
    let fd = verb(&[&["test", "fold", &geo][..], &seed[..]].concat());
    assert!(
        (num(&v, "fold-best") - fd["best_untilt"].as_f64().unwrap()).abs() <= 2.0,
        "{} {}",
        v["fold-best"],
        fd["best_untilt"]
    );
    assert!(summary.split("</tr>").next().unwrap().contains(fd["verdict"].as_str().unwrap()));
}

#[test]
fn the_comparison_with_the_truth_recomputes_from_truth_json() {
    let d = demo();
    let truth: Value = serde_json::from_str(&fs::read_to_string(repo("records/demo/truth.json")).unwrap()).unwrap();
    let ties: Vec<_> = read_csv(&d.out.join("tables/ties.csv")).into_iter().filter(|r| r["rank"] == "1").collect();
    let rows = read_csv(&d.out.join("tables/truth-ties.csv"));
    let true_ties = truth["ties"].as_array().unwrap();
    let mut right = 0;
    for t in true_ties {
        let (age, h) = (t["age"].as_f64().unwrap(), t["height"].as_f64().unwrap());
        let tie = ties.iter().find(|r| (r["age"].parse::<f64>().unwrap() - age).abs() < 5e-4);
        let row = rows.iter().find(|r| (r["true_age"].parse::<f64>().unwrap() - age).abs() < 5e-4).unwrap();
        match tie {
            Some(r) if r["low"].parse::<f64>().unwrap() <= h && h <= r["high"].parse::<f64>().unwrap() => {
                right += 1;
                assert_eq!(row["outcome"], "tied in the right gap");
            }
            Some(_) => assert_eq!(row["outcome"], "tied in another gap"),
            None => assert_eq!(row["outcome"], "not tied"),
        }
    }
    let stage = stage_html(d, "Comparison with the true model");
    assert!(stage.contains(&format!(
        "Of {} true reversals in the section, {right} are tied in the right sampling gap",
        true_ties.len()
    )));
    assert!(d.html[at(&d.html, "answer-against-the-truth")..]
        .starts_with("id=\"answer-against-the-truth\"><th>Against the truth"));
    // Every level's true age is the one in truth.json.
    let ages = read_csv(&d.out.join("tables/truth-ages.csv"));
    for l in truth["levels"].as_array().unwrap() {
        if let Some(r) = ages.iter().find(|r| r["site"] == l["site"].as_str().unwrap()) {
            assert_eq!(r["true_age"], format!("{:.4}", l["age"].as_f64().unwrap()));
        }
    }
    assert!(ages.len() >= 40, "{}", ages.len());
}

#[test]
fn self_contained_and_under_the_size_budget() {
    let d = demo();
    let h = &d.html;
    assert!(h.len() < BUDGET, "report is {} bytes", h.len());
    eprintln!("demo report: {} bytes", h.len());
    // Every src and href stays in the page or its output folder: no scheme, no network path.
    for attr in ["src=\"", "href=\"", "src='", "href='"] {
        for part in h.split(attr).skip(1) {
            let target = part.split(['"', '\'']).next().unwrap();
            assert!(
                target.starts_with('#') || target.starts_with("tables/") || target.starts_with("figures/"),
                "external or unexpected link: {target}"
            );
        }
    }
    for bad in ["<link", "@import", "url(", "<script src", "<iframe", "<img"] {
        assert!(!h.contains(bad), "report contains {bad}");
    }
    // The scripts are embedded: every <script> has a body and no attributes.
    assert!(h.matches("<script").count() == h.matches("<script>").count());
    // A print style sheet.
    assert!(h.contains("@media print"));
}

#[test]
fn headless_chromium_loads_it_without_a_console_message() {
    let d = demo();
    let Some(b) = ["chromium", "chromium-browser"].into_iter().find(|b| {
        std::process::Command::new("sh")
            .args(["-c", &format!("command -v {b}")])
            .output()
            .is_ok_and(|o| o.status.success())
    }) else {
        eprintln!("skipped the headless-browser load: no chromium on PATH (.ci/run installs Debian's chromium)");
        return;
    };
    let profile = tempfile::tempdir().unwrap();
    let shot = profile.path().join("shot.png");
    let o = std::process::Command::new(b)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--no-first-run",
            "--disable-quic",
            "--enable-logging=stderr",
            "--v=0",
            &format!("--user-data-dir={}", profile.path().join("profile").display()),
            &format!("--screenshot={}", shot.display()),
            "--window-size=1280,900",
        ])
        .arg(format!("file://{}", d.out.join("report.html").display()))
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(o.status.success(), "{err}");
    let console: Vec<&str> = err.lines().filter(|l| l.contains(":CONSOLE")).collect();
    assert!(console.is_empty(), "console messages: {console:?}");
    assert!(fs::metadata(&shot).unwrap().len() > 10_000);
}
