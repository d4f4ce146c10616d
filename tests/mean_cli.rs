//! Integration tests of `lodestone mean` (assert_cmd).

use assert_cmd::Command;
use predicates::prelude::*;
use std::fs;

fn cmd() -> Command {
    Command::cargo_bin("lodestone").unwrap()
}

fn write(dir: &tempfile::TempDir, name: &str, body: &str) -> std::path::PathBuf {
    let p = dir.path().join(name);
    fs::write(&p, body).unwrap();
    p
}

const FOUR: &str = "site,dec,inc\nA,10,0\nA,350,0\nA,0,10\nA,0,-10\nB,123,45\n";

#[test]
fn json_output_follows_the_contract() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", FOUR);
    let out = cmd().args(["mean", f.to_str().unwrap(), "--format", "json"]).output().unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let a = &v["groups"][0];
    assert_eq!(a["group"], "A");
    assert_eq!(a["n"], 4);
    // Analytic check: R = 4 cos 10 degrees, mean (0, 0).
    assert!((a["r"].as_f64().unwrap() - 4.0 * 10f64.to_radians().cos()).abs() < 1e-12);
    assert!(a["inc"].as_f64().unwrap().abs() < 1e-9);
    // A group of one direction: reported, with k, a95, theta63 null.
    let b = &v["groups"][1];
    assert_eq!(b["n"], 1);
    assert!(b["k"].is_null() && b["a95"].is_null() && b["theta63"].is_null());
    assert!((b["dec"].as_f64().unwrap() - 123.0).abs() < 1e-9);
}

#[test]
fn csv_and_table_outputs() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", FOUR);
    cmd()
        .args(["mean", f.to_str().unwrap(), "--format", "csv"])
        .assert()
        .success()
        .stdout(predicate::str::starts_with("group,n,dec,inc,r,k,a95,theta63\nA,4,"))
        .stdout(predicate::str::contains("\nB,1,123,45,1,,,\n"));
    cmd()
        .args(["--format", "table", "mean", f.to_str().unwrap()])
        .assert()
        .success()
        .stdout(predicate::str::contains("group  n"))
        .stdout(predicate::str::contains("one direction only"));
}

#[test]
fn whole_file_and_by_column_and_tilt() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", "lith,dec,inc,bed_dip_dir,bed_dip\nx,90,30,90,30\nx,90,30,90,30\ny,0,0,90,30\n");
    let out = cmd()
        .args(["mean", f.to_str().unwrap(), "--by", "lith", "--frame", "tilt", "--format", "json"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    // Down-dip lines restore to horizontal (090, 0); identical directions give k = "inf".
    assert!(v["groups"][0]["inc"].as_f64().unwrap().abs() < 1e-9);
    assert_eq!(v["groups"][0]["k"], "inf");
    let out = cmd().args(["mean", f.to_str().unwrap(), "--whole", "--format", "json"]).output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["groups"].as_array().unwrap().len(), 1);
    assert_eq!(v["groups"][0]["n"], 3);
}

#[test]
fn bad_input_messages_name_file_line_column_and_exit_1() {
    let d = tempfile::tempdir().unwrap();
    let cases = [
        ("missing.csv", "site,dec\nA,10\n", ":1: column 'inc': required column is missing"),
        ("nonnum.csv", "dec,inc\n10,20\n10,abc\n", ":3: column 'inc': 'abc' is not a number"),
        ("range.csv", "dec,inc\n10,95.2\n", ":2: column 'inc': 95.2 is outside [-90, 90]"),
        ("empty.csv", "", ":1: the file is empty"),
        ("header.csv", "dec,inc\n", "no data rows"),
        ("notilt.csv", "dec,inc\n10,20\n", ":2: column 'bed_dip': no bedding"),
    ];
    for (name, body, msg) in cases {
        let f = write(&d, name, body);
        let plot = d.path().join(format!("{name}.svg"));
        let mut c = cmd();
        c.args(["mean", f.to_str().unwrap(), "--plot", plot.to_str().unwrap()]);
        if name == "notilt.csv" {
            c.args(["--frame", "tilt"]);
        }
        c.assert().code(1).stdout("").stderr(predicate::str::contains(name)).stderr(predicate::str::contains(msg));
        assert!(!plot.exists(), "{name}: nothing may be written on error");
    }
}

#[test]
fn bad_command_line_exits_2() {
    cmd().args(["mean"]).assert().code(2);
    cmd().args(["nosuchverb"]).assert().code(2);
    cmd().args(["mean", "x.csv", "--frame", "sideways"]).assert().code(2);
}

#[test]
fn plots_are_written_and_inputs_never_overwritten() {
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "d.csv", FOUR);
    for ext in ["svg", "png"] {
        let p = d.path().join(format!("net.{ext}"));
        cmd().args(["mean", f.to_str().unwrap(), "--plot", p.to_str().unwrap()]).assert().success();
        let bytes = fs::read(&p).unwrap();
        assert!(bytes.len() > 1000);
        if ext == "png" {
            assert_eq!(&bytes[1..4], b"PNG");
        } else {
            assert!(String::from_utf8(bytes).unwrap().contains("<svg"));
        }
    }
    let svg_input = d.path().join("d.svg");
    fs::write(&svg_input, FOUR).unwrap();
    // Using an input file as the plot path is refused.
    let g = write(&d, "in.svg", "dec,inc\n1,2\n");
    cmd()
        .args(["mean", g.to_str().unwrap(), "--plot", g.to_str().unwrap()])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("input"));
    assert_eq!(fs::read_to_string(&g).unwrap(), "dec,inc\n1,2\n");
    cmd().args(["mean", f.to_str().unwrap(), "--plot", d.path().join("x.pdf").to_str().unwrap()]).assert().code(1);
}

/// The streamed path (no figure) and the whole-table path (a figure asks for the points) give the same
/// groups, to the last digit, and the same message for a faulty file.
#[test]
fn streamed_and_whole_table_paths_agree() {
    let d = tempfile::tempdir().unwrap();
    let body = "# Harlow Bench, invented\nsite,dec,inc,bed_dip_dir,bed_dip\nA,10,20,90,30\nB,200,-35,270,15\nA,14,26,90,30\n\nA,8,31,90,30\nB,190,-40,270,15\n";
    let f = write(&d, "h.csv", body);
    for frame in ["geo", "tilt"] {
        let run = |plot: bool| {
            let mut c = cmd();
            c.args(["mean", f.to_str().unwrap(), "--frame", frame, "--format", "json"]);
            if plot {
                c.args(["--plot", d.path().join("h.svg").to_str().unwrap()]);
            }
            let out = c.output().unwrap();
            assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
            serde_json::from_slice::<serde_json::Value>(&out.stdout).unwrap()
        };
        let (streamed, whole) = (run(false), run(true));
        assert_eq!(streamed["groups"], whole["groups"]);
        assert_eq!(streamed["groups"][0]["lines"], serde_json::json!([3, 5, 7]));
    }
    let bad = write(&d, "bad.csv", "site,dec,inc\nA,10,20\nA,x,20\nB,1\n");
    let msg = |plot: bool| {
        let mut c = cmd();
        c.args(["mean", bad.to_str().unwrap()]);
        if plot {
            c.args(["--plot", d.path().join("b.svg").to_str().unwrap()]);
        }
        let out = c.output().unwrap();
        assert_eq!(out.status.code(), Some(1));
        String::from_utf8_lossy(&out.stderr).to_string()
    };
    let (a, b) = (msg(false), msg(true));
    assert_eq!(a, b);
    assert!(a.contains("bad.csv:4"), "{a}");
}

/// Rows of many groups (invented Corran Flats survey): 200 groups whose rows are interleaved (no two
/// adjacent), 150 groups of 3 adjacent rows, rows revisiting early groups at the end, a row without a
/// site and two hand-checked groups. Returns the body and the file line of each row of group `S7`.
fn many_groups() -> (String, Vec<usize>) {
    let mut body = String::from("# Corran Flats, invented\nsite,dec,inc\n");
    let mut line = 2;
    let mut s7 = Vec::new();
    let mut row = |body: &mut String, site: &str, dec: f64, inc: f64| {
        line += 1;
        if site == "S7" {
            s7.push(line);
        }
        body.push_str(&format!("{site},{dec},{inc}\n"));
    };
    for i in 0..600 {
        let dec = ((37 * i) % 360) as f64 + 0.5;
        let inc = ((53 * i) % 170) as f64 - 85.0;
        row(&mut body, &format!("S{}", i % 200), dec, inc);
    }
    for i in 0..450 {
        row(&mut body, &format!("T{}", i / 3), ((11 * i) % 360) as f64, ((7 * i) % 60) as f64 + 10.0);
    }
    for i in 0..10 {
        row(&mut body, &format!("S{}", 7 * i), 180.0, -45.0);
    }
    row(&mut body, "", 5.0, 5.0);
    // Two directions 10 degrees either side of north on the horizon: mean (0, 0), R = 2 cos 10°.
    row(&mut body, "P", 350.0, 0.0);
    row(&mut body, "P", 10.0, 0.0);
    row(&mut body, "Q", 123.0, 45.0);
    (body, s7)
}

/// With many groups the streamed path (compact sums, output written group by group) and the
/// whole-table path (taken when a figure is asked for) write the same bytes in every format; the JSON
/// lists each group's lines and the hand-checked groups have their known statistics.
#[test]
fn many_groups_streamed_and_whole_table_outputs_are_identical() {
    let d = tempfile::tempdir().unwrap();
    let (body, s7) = many_groups();
    let f = write(&d, "corran.csv", &body);
    let run = |format: &str, confidence: &str, plot: bool| {
        let mut c = cmd();
        c.args(["mean", f.to_str().unwrap(), "--format", format, "--confidence", confidence]);
        if plot {
            c.args(["--plot", d.path().join("corran.svg").to_str().unwrap()]);
        }
        let out = c.output().unwrap();
        assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
        (out.stdout, out.stderr)
    };
    for format in ["table", "csv", "json"] {
        for confidence in ["0.95", "0.9"] {
            let streamed = run(format, confidence, false);
            let whole = run(format, confidence, true);
            assert!(streamed == whole, "{format} at {confidence}: the two paths differ");
        }
    }
    let (json, _) = run("json", "0.95", false);
    let v: serde_json::Value = serde_json::from_slice(&json).unwrap();
    let groups = v["groups"].as_array().unwrap();
    // 200 S groups, 150 T groups, the row without a site, P and Q.
    assert_eq!(groups.len(), 353);
    assert_eq!(groups[0]["group"], "S0");
    assert_eq!(groups[200]["group"], "T0");
    assert!(groups[350]["group"].is_null());
    let s7_json = &groups[7];
    assert_eq!(s7_json["group"], "S7");
    assert_eq!(s7_json["n"], 4);
    assert_eq!(s7_json["lines"], serde_json::json!(s7));
    assert_eq!(s7, vec![10, 210, 410, 1054]); // lines 3.. hold the rows; S7 comes back on the second revisit row
    assert_eq!(groups[201]["lines"], serde_json::json!([606, 607, 608]));
    let p = &groups[351];
    assert_eq!(p["group"], "P");
    let r = 2.0 * 10f64.to_radians().cos();
    assert!((p["r"].as_f64().unwrap() - r).abs() < 1e-12);
    // k = (N − 1)/(N − R) (Fisher 1953) with N = 2.
    assert!((p["k"].as_f64().unwrap() - 1.0 / (2.0 - r)).abs() < 1e-9);
    assert!(p["inc"].as_f64().unwrap().abs() < 1e-9);
    let dec = p["dec"].as_f64().unwrap();
    assert!(dec.min(360.0 - dec) < 1e-9, "{dec}");
    assert!(groups[352]["k"].is_null() && groups[352]["a95"].is_null());
    // The text table has one row per group, and the CSV too (plus the header).
    let (table, _) = run("table", "0.95", false);
    let table = String::from_utf8(table).unwrap();
    assert!(table.lines().any(|l| l.starts_with("  P  ") && l.contains("  0.0  ")), "{table}");
    let (csv, notes) = run("csv", "0.95", false);
    assert_eq!(String::from_utf8(csv).unwrap().lines().count(), 354);
    let notes = String::from_utf8(notes).unwrap();
    assert!(
        notes.contains("note: Q: one direction only") && notes.contains("note: (all): one direction only"),
        "{notes}"
    );
}

#[test]
fn a_declination_just_below_360_is_never_printed_as_360() {
    // The contract gives declinations in [0, 360): 359.97 at one decimal is the direction 0.0, and a
    // mean a hair west of north likewise (the CSV keeps full precision, below 360).
    let d = tempfile::tempdir().unwrap();
    let f = write(&d, "north.csv", "site,dec,inc\nA,359.97,30\nB,359.98,31\nB,359.95,29\nC,359.94,30\n");
    let out = cmd().args(["mean", f.to_str().unwrap()]).output().unwrap();
    assert!(out.status.success());
    let text = String::from_utf8(out.stdout).unwrap();
    assert!(!text.contains("360.0"), "{text}");
    let decs: Vec<&str> = text.lines().skip(2).take(3).map(|l| l.split_whitespace().nth(2).unwrap()).collect();
    assert_eq!(decs, ["0.0", "0.0", "359.9"], "{text}");
    let out = cmd().args(["mean", f.to_str().unwrap(), "--format", "csv"]).output().unwrap();
    let csv = String::from_utf8(out.stdout).unwrap();
    assert!(csv.contains("\nA,1,359.97,30,"), "{csv}");
}

/// One polyline of an SVG written by the figures.
struct Polyline {
    /// Stroke colour, upper-case hex.
    stroke: String,
    /// Stroke width as written.
    width: String,
    points: Vec<(f64, f64)>,
}

/// The polylines of an SVG written by the figures.
fn polylines(svg: &str) -> Vec<Polyline> {
    let attr = |tag: &str, name: &str| {
        let key = format!(" {name}=\"");
        tag.find(&key).map(|i| tag[i + key.len()..].split('"').next().unwrap_or("").to_string()).unwrap_or_default()
    };
    svg.split("<polyline")
        .skip(1)
        .map(|rest| {
            let tag = rest.split("/>").next().unwrap();
            let pts = attr(tag, "points")
                .split_whitespace()
                .map(|p| {
                    let (x, y) = p.split_once(',').unwrap();
                    (x.parse().unwrap(), y.parse().unwrap())
                })
                .collect();
            Polyline { stroke: attr(tag, "stroke").to_uppercase(), width: attr(tag, "stroke-width"), points: pts }
        })
        .collect()
}

#[test]
fn planes_are_drawn_as_great_circles_with_the_combined_mean() {
    use lodestone::figures::unproject;
    use lodestone::sphere::Direction;
    // Invented site: three lines and two planes (poles given as dec, inc with kind = plane).
    let d = tempfile::tempdir().unwrap();
    let body = "site,dec,inc,kind\nQ,350,52,line\nQ,8,47,line\nQ,2,60,line\nQ,100,20,plane\nQ,250,10,plane\n";
    let f = write(&d, "q.csv", body);
    let svg_path = d.path().join("q.svg");
    let out = cmd()
        .args(["mean", f.to_str().unwrap(), "--plot", svg_path.to_str().unwrap(), "--format", "json"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let g = &v["groups"][0];
    let mean = Direction { dec: g["dec"].as_f64().unwrap(), inc: g["inc"].as_f64().unwrap() };
    let svg = fs::read_to_string(&svg_path).unwrap();
    let lines = polylines(&svg);
    // The net's primitive circle (ink #222831, 2 px, 361 points) gives the centre and radius in pixels.
    let rim = lines
        .iter()
        .find(|l| l.stroke == "#222831" && l.width == "2" && l.points.len() == 361)
        .expect("primitive circle");
    let (xs, ys): (Vec<f64>, Vec<f64>) = rim.points.iter().copied().unzip();
    let span = |v: &[f64]| (v.iter().copied().fold(f64::MAX, f64::min), v.iter().copied().fold(f64::MIN, f64::max));
    let ((x0, x1), (y0, y1)) = (span(&xs), span(&ys));
    let (cx, cy, rad) = ((x0 + x1) / 2.0, (y0 + y1) / 2.0, (x1 - x0) / 2.0);
    // Pixel → unit net; points rounded just outside the rim are put back on it.
    let net = |(px, py): (f64, f64)| {
        let (x, y) = ((px - cx) / rad, (cy - py) / rad);
        let r = x.hypot(y).max(1.0);
        (x / r, y / r)
    };
    let poles = [Direction { dec: 100.0, inc: 20.0 }, Direction { dec: 250.0, inc: 10.0 }];
    // Which pole's circle (if any) a polyline follows: every vertex, unprojected on the given hemisphere,
    // 90° from the pole within 1.5° (pixel rounding: ≤ 0.5° on this net).
    let on_circle = |pts: &[(f64, f64)], lower: bool| {
        poles.iter().position(|p| {
            pts.iter().all(|q| unproject(net(*q), lower).is_some_and(|d| (d.angle_to(*p) - 90.0).abs() < 1.5))
        })
    };
    let colour = "#006D77"; // the first series colour of the figures' theme
    let mut solid = [0; 2];
    let mut dashed = [0; 2];
    let a95 = g["a95"].as_f64().unwrap();
    let on_cone = |pts: &[(f64, f64)]| {
        [true, false].iter().any(|&lower| {
            pts.iter().all(|q| unproject(net(*q), lower).is_some_and(|d| (d.angle_to(mean) - a95).abs() < 1.5))
        })
    };
    let mut cone = 0;
    for Polyline { stroke, width, points: pts } in lines.iter().filter(|l| l.stroke == colour) {
        if on_cone(pts) {
            cone += 1;
            continue;
        }
        match (width.as_str(), on_circle(pts, width == "2")) {
            ("2", Some(i)) if pts.len() > 50 => solid[i] += 1,
            ("1", Some(i)) if pts.len() < 10 => dashed[i] += 1,
            other => panic!("unexpected {stroke} polyline {other:?} with {} points", pts.len()),
        }
    }
    assert_eq!(cone, 1, "the α95 cone of the combined mean, all on the lower hemisphere");
    assert_eq!(solid, [1, 1], "one solid lower half per plane");
    // The upper halves of these steep planes are about two radii long on the net (about 550 px: some
    // 45 dashes of 7 px with 5 px gaps).
    assert!(dashed.iter().all(|&n| n > 30), "dashes per plane: {dashed:?}");
    // The combined mean (from the JSON output) is marked by the square, 12 px wide, centred on its projection.
    let (mx, my) = lodestone::figures::project(mean);
    let (px, py) = ((cx + mx * rad).round(), (cy - my * rad).round());
    let square = format!("<rect x=\"{}\" y=\"{}\" width=\"12\" height=\"12\"", px - 6.0, py - 6.0);
    assert!(svg.contains(&square), "no mean square {square}");
    // Plane poles are no longer drawn as points: no marker at either pole's projection.
    for p in poles {
        let (x, y) = lodestone::figures::project(p);
        let at = format!("<circle cx=\"{}\" cy=\"{}\"", (cx + x * rad).round(), (cy - y * rad).round());
        assert!(!svg.contains(&at), "a marker at the pole {p:?}");
    }
    assert!(svg.contains("great circle, upper half") && svg.contains("(3 lines, 2 circles)"));
    assert!(svg.contains("mean of lines and circles"));
}
