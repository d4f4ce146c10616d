//! Small drawings of one specimen for the report's gallery, written as compact SVG by hand (a few
//! kilobytes each, so that a hundred specimens stay well inside the report's size budget): the
//! vector-endpoint diagram, the step directions on an equal-area net and the decay of the moment,
//! side by side, with the fitted steps drawn in the fit colour.
//!
//! The projections are those of the full-size figures ([`crate::figures::endpoint_projections`],
//! [`crate::figures::project`]); only the drawing is lighter (no text but the axis letters).

use crate::demag::SpecimenFit;
use crate::figures::{endpoint_projections, great_circle_halves, project};
use crate::model::FitKind;
use crate::model::SpecimenSteps;
use crate::sphere::Direction;
use std::fmt::Write as _;

/// Width and height of one panel, in SVG user units.
const PANEL: f64 = 110.0;
/// Margin inside a panel.
const PAD: f64 = 9.0;
/// Horizontal projection (filled), vertical projection (open), fit: Okabe & Ito (2008) colours.
pub const HORIZONTAL: &str = "#0072B2";
/// Colour of the vertical projection.
pub const VERTICAL: &str = "#E69F00";
/// Colour of the fitted steps and the fitted direction.
pub const FIT: &str = "#D55E00";
const GUIDE: &str = "#b9c0c8";

/// A number with one decimal, without a trailing `.0`.
fn f(x: f64) -> String {
    let s = format!("{:.1}", x);
    s.strip_suffix(".0").map_or(s.clone(), str::to_string)
}

/// Path data joining the points.
fn line(pts: &[(f64, f64)]) -> String {
    let mut d = String::new();
    for (i, p) in pts.iter().enumerate() {
        let _ = write!(d, "{}{} {}", if i == 0 { "M" } else { "L" }, f(p.0), f(p.1));
    }
    d
}

/// Path data of zero-length segments: with round caps, one dot per point.
fn dots(pts: &[(f64, f64)]) -> String {
    pts.iter().map(|p| format!("M{} {}h0", f(p.0), f(p.1))).collect()
}

/// Filled dots of `colour`, or open ones (a white centre drawn over the dot).
fn markers(out: &mut String, pts: &[(f64, f64)], colour: &str, open: bool) {
    if pts.is_empty() {
        return;
    }
    let d = dots(pts);
    let _ = write!(out, "<path d=\"{d}\" stroke=\"{colour}\" stroke-width=\"4.2\" stroke-linecap=\"round\"/>");
    if open {
        let _ = write!(out, "<path d=\"{d}\" stroke=\"#fff\" stroke-width=\"2\" stroke-linecap=\"round\"/>");
    }
}

/// The fitted steps of a line fit (first..=last), if the fit is a line.
fn fit_range(fits: &[SpecimenFit]) -> Option<(usize, usize)> {
    fits.iter().find(|f| f.kind == FitKind::Line).map(|f| (f.first, f.last))
}

/// One specimen's three panels as an SVG element (no XML declaration), `3 × PANEL` wide.
pub fn specimen_svg(sp: &SpecimenSteps, fits: &[SpecimenFit], label: &str) -> String {
    let mut s = String::new();
    let _ = write!(
        s,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {} {}\" role=\"img\" aria-label=\"{label}\" fill=\"none\" font-size=\"8\" font-family=\"sans-serif\">",
        f(3.0 * PANEL),
        f(PANEL)
    );
    endpoint_panel(&mut s, sp, fits);
    net_panel(&mut s, sp, fits);
    decay_panel(&mut s, sp, fits);
    s.push_str("</svg>");
    s
}

fn endpoint_panel(s: &mut String, sp: &SpecimenSteps, fits: &[SpecimenFit]) {
    let proj: Vec<[(f64, f64); 2]> = sp.steps.iter().map(|st| endpoint_projections(st.vector())).collect();
    let (mut x0, mut x1, mut y0, mut y1) = (0.0f64, 0.0f64, 0.0f64, 0.0f64);
    for p in proj.iter().flatten() {
        (x0, x1, y0, y1) = (x0.min(p.0), x1.max(p.0), y0.min(p.1), y1.max(p.1));
    }
    let span = (x1 - x0).max(y1 - y0).max(f64::MIN_POSITIVE);
    let k = (PANEL - 2.0 * PAD) / span;
    let (ox, oy) =
        (PAD + ((PANEL - 2.0 * PAD) - (x1 - x0) * k) / 2.0, PAD + ((PANEL - 2.0 * PAD) - (y1 - y0) * k) / 2.0);
    let page = |p: (f64, f64)| (ox + (p.0 - x0) * k, oy + (y1 - p.1) * k);
    let origin = page((0.0, 0.0));
    let _ = write!(
        s,
        "<path d=\"M2 {y}H{w}M{x} 2V{h}\" stroke=\"{GUIDE}\" stroke-width=\".7\"/><text x=\"{w}\" y=\"{ty}\" fill=\"#333\" text-anchor=\"end\">N</text>",
        y = f(origin.1),
        w = f(PANEL - 2.0),
        x = f(origin.0),
        h = f(PANEL - 2.0),
        ty = f(origin.1 - 2.5)
    );
    for (which, colour, open) in [(0, HORIZONTAL, false), (1, VERTICAL, true)] {
        let pts: Vec<(f64, f64)> = proj.iter().map(|p| page(p[which])).collect();
        let _ = write!(s, "<path d=\"{}\" stroke=\"{colour}\" stroke-width=\".8\"/>", line(&pts));
        markers(s, &pts, colour, open);
    }
    if let Some((a, b)) = fit_range(fits) {
        for which in 0..2 {
            let pts: Vec<(f64, f64)> = proj[a..=b.min(proj.len() - 1)].iter().map(|p| page(p[which])).collect();
            if let (Some(p), Some(q)) = (pts.first(), pts.last()) {
                let _ = write!(s, "<path d=\"{}\" stroke=\"{FIT}\" stroke-width=\"1.6\"/>", line(&[*p, *q]));
            }
        }
    }
}

fn net_panel(s: &mut String, sp: &SpecimenSteps, fits: &[SpecimenFit]) {
    let (cx, cy, r) = (1.5 * PANEL, PANEL / 2.0, PANEL / 2.0 - PAD);
    let page = |d: Direction| {
        let (x, y) = project(d);
        (cx + r * x, cy - r * y)
    };
    let _ = write!(
        s,
        "<circle cx=\"{}\" cy=\"{}\" r=\"{}\" stroke=\"#555\" stroke-width=\".8\"/><path d=\"M{} {}v5\" stroke=\"#555\"/><text x=\"{}\" y=\"{}\" fill=\"#333\" text-anchor=\"middle\">N</text>",
        f(cx),
        f(cy),
        f(r),
        f(cx),
        f(cy - r),
        f(cx),
        f(cy - r - 1.5)
    );
    let pts: Vec<(f64, f64)> = sp.steps.iter().map(|st| page(st.direction)).collect();
    let _ = write!(s, "<path d=\"{}\" stroke=\"{GUIDE}\" stroke-width=\".7\"/>", line(&pts));
    let (down, up): (Vec<_>, Vec<_>) = sp.steps.iter().zip(&pts).partition(|(st, _)| st.direction.inc >= 0.0);
    markers(s, &down.iter().map(|x| *x.1).collect::<Vec<_>>(), "#222", false);
    markers(s, &up.iter().map(|x| *x.1).collect::<Vec<_>>(), "#222", true);
    for fit in fits {
        if fit.kind == FitKind::Plane {
            // The plane's great circle: lower half solid, upper half dashed (as on the full-size nets).
            let h = great_circle_halves(fit.direction, 36);
            let on_page = |v: &[Direction]| v.iter().map(|d| page(*d)).collect::<Vec<_>>();
            let _ = write!(s, "<path d=\"{}\" stroke=\"{FIT}\" stroke-width=\"1.3\"/>", line(&on_page(&h.lower)));
            if h.upper.len() > 1 {
                let d = line(&on_page(&h.upper));
                let _ = write!(s, "<path d=\"{d}\" stroke=\"{FIT}\" stroke-width=\".8\" stroke-dasharray=\"3 2\"/>");
            }
            continue;
        }
        let (x, y) = page(fit.direction);
        let fill = if fit.direction.inc >= 0.0 { FIT } else { "#fff" };
        let shape = "M0-4.5L4.5 0L0 4.5L-4.5 0Z";
        let _ = write!(
            s,
            "<path transform=\"translate({} {})\" d=\"{shape}\" fill=\"{fill}\" stroke=\"{FIT}\" stroke-width=\"1.3\"/>",
            f(x),
            f(y)
        );
    }
}

fn decay_panel(s: &mut String, sp: &SpecimenSteps, fits: &[SpecimenFit]) {
    let x_left = 2.0 * PANEL + PAD;
    let (w, h) = (PANEL - 2.0 * PAD, PANEL - 2.0 * PAD);
    let top_step = sp.steps.iter().map(|st| st.step).fold(0.0, f64::max).max(f64::MIN_POSITIVE);
    let top_m = sp.steps.iter().map(|st| st.moment).fold(0.0, f64::max).max(f64::MIN_POSITIVE);
    let pts: Vec<(f64, f64)> =
        sp.steps.iter().map(|st| (x_left + w * st.step / top_step, PAD + h * (1.0 - st.moment / top_m))).collect();
    let _ = write!(
        s,
        "<path d=\"M{} {}V{}H{}\" stroke=\"#555\" stroke-width=\".8\"/><text x=\"{}\" y=\"{}\" fill=\"#333\" text-anchor=\"end\">M/Mmax</text>",
        f(x_left),
        f(PAD),
        f(PAD + h),
        f(x_left + w),
        f(x_left + w),
        f(PAD + 6.0)
    );
    let _ = write!(s, "<path d=\"{}\" stroke=\"#444\" stroke-width=\".8\"/>", line(&pts));
    markers(s, &pts, "#444", false);
    if let Some((a, b)) = fit_range(fits) {
        markers(s, &pts[a..=b.min(pts.len() - 1)], FIT, false);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::StepRecord;

    fn specimen(steps: &[(f64, f64, f64, f64)]) -> SpecimenSteps {
        SpecimenSteps {
            specimen: "X1".into(),
            site: None,
            position: None,
            bedding: None,
            steps: steps
                .iter()
                .enumerate()
                .map(|(i, &(step, dec, inc, moment))| StepRecord {
                    line: i + 2,
                    step,
                    direction: Direction::new(dec, inc).unwrap(),
                    moment,
                    treatment: None,
                })
                .collect(),
        }
    }

    #[test]
    fn a_northward_horizontal_vector_plots_right_of_the_origin_on_both_projections() {
        // x = north → page right on both projections (the project's layout, figures::vector_endpoint).
        let sp = specimen(&[(0.0, 0.0, 0.0, 2.0), (10.0, 0.0, 0.0, 1.0)]);
        let svg = specimen_svg(&sp, &[], "X1");
        assert!(svg.starts_with("<svg") && svg.ends_with("</svg>"));
        // Three panels: two guide paths with axis letters, a net circle, a decay frame.
        assert_eq!(svg.matches("<circle").count(), 1);
        assert_eq!(svg.matches(">N</text>").count(), 2);
        // Equal-area: a horizontal direction lies on the primitive (r = 1), north at the top.
        assert!(svg.contains("M165 9h0"), "{svg}");
        // Decay: the first step at full moment sits at the top-left corner of the frame.
        assert!(svg.contains(&format!("M{} {}h0", f(2.0 * PANEL + PAD), f(PAD))), "{svg}");
    }

    #[test]
    fn upward_directions_are_open_and_the_fit_is_marked() {
        let sp = specimen(&[(0.0, 10.0, -30.0, 3.0), (100.0, 10.0, -30.0, 2.0), (200.0, 10.0, -30.0, 1.0)]);
        let fit = crate::demag::fit_range(&sp, 0.0, 200.0, FitKind::Line, crate::model::Anchor::Free).unwrap();
        let svg = specimen_svg(&sp, &[fit], "X1");
        // Open markers: a white centre over the dots (the vertical projection and the up directions).
        assert!(svg.matches("stroke=\"#fff\"").count() >= 2);
        assert!(svg.contains(FIT));
        assert!(svg.len() < 4000, "{}", svg.len());
    }

    #[test]
    fn a_plane_fit_is_drawn_as_its_great_circle() {
        // Three steps (step, dec, inc, moment) in the vertical north–south plane: its pole is horizontal
        // east–west, so its circle is the north–south diameter of the net (x = 165, the net's centre).
        let sp = specimen(&[(0.0, 0.0, 10.0, 5.0), (50.0, 0.0, 60.0, 3.0), (100.0, 180.0, 70.0, 1.0)]);
        let fit = crate::demag::fit_range(&sp, 0.0, 100.0, FitKind::Plane, crate::model::Anchor::Free).unwrap();
        let svg = specimen_svg(&sp, &[fit], "X1");
        let dashed = svg.split("<path").find(|p| p.contains("stroke-dasharray")).expect("dashed upper half");
        let solid = svg.split("<path").find(|p| p.contains(FIT) && !p.contains("dasharray") && p.contains("L"));
        for path in [dashed, solid.expect("solid lower half")] {
            let d = path.split("d=\"").nth(1).unwrap().split('"').next().unwrap();
            for xy in d.split(['M', 'L']).filter(|t| !t.is_empty()) {
                let x: f64 = xy.split(' ').next().unwrap().parse().unwrap();
                assert!((x - 1.5 * PANEL).abs() <= 0.1, "{x} in {d}");
            }
        }
    }
}
