//! The vector-endpoint diagram of one specimen (horizontal and vertical projections of the
//! remanence vector on shared axes) beside an equal-area plot of the step directions and the
//! moment's decay.

use super::equal_area::draw_net;
use super::projection::project;
use super::render::{de, Figure};
use super::theme;
use crate::demag::SpecimenFit;
use crate::model::{Anchor, FitKind};
use crate::sphere::{Direction, Vec3};
use plotters::coord::Shift;
use plotters::prelude::*;

/// A specimen's demagnetization figure.
///
/// Layout (lodestone's own): left, the vector-endpoint diagram with North along the shared
/// horizontal axis; the horizontal projection plots (North, West) as teal discs, the vertical
/// projection (North, Up) as ochre open squares, each path joined in step order and labelled with
/// the step values; fitted lines are drawn in rust over both projections. Right, the step
/// directions on an equal-area net (filled: down, open: up), fitted lines as a rust diamond and
/// fitted planes as their great circle. Far right, the moment's decay (|M|/|M₀| against step) with
/// the fitted ranges shaded. Step labels are placed so that they never overlap.
#[derive(Debug, Clone, PartialEq)]
pub struct VectorEndpointPlot {
    /// Specimen name (title).
    pub specimen: String,
    /// Unit of the step values for labels (`mT`, `°C` or empty).
    pub unit: String,
    /// Step values and remanence vectors (A·m²), in step order.
    pub steps: Vec<(f64, Vec3)>,
    /// Fits to draw.
    pub fits: Vec<SpecimenFit>,
}

/// Page coordinates of the two projections of `v`: horizontal (N, W) and vertical (N, Up).
///
/// # Formula
/// horizontal: (x, −y); vertical: (x, −z), with x north, y east, z down.
pub fn endpoint_projections(v: Vec3) -> [(f64, f64); 2] {
    [(v.x, -v.y), (v.x, -v.z)]
}

const FIT: RGBColor = RGBColor(176, 74, 42);

impl VectorEndpointPlot {
    fn fit_segment(&self, f: &SpecimenFit) -> Option<(Vec3, Vec3)> {
        if f.kind != FitKind::Line || f.last >= self.steps.len() {
            return None;
        }
        let pts: Vec<Vec3> = self.steps[f.first..=f.last].iter().map(|s| s.1).collect();
        let v = f.direction.to_vector();
        let centre = match f.anchor {
            Anchor::Free => pts.iter().fold(Vec3::ZERO, |a, b| a + *b) * (1.0 / pts.len() as f64),
            Anchor::Origin => Vec3::ZERO,
        };
        let proj: Vec<f64> = pts.iter().map(|p| (*p - centre).dot(v)).collect();
        let (mut lo, mut hi) = proj.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &t| (a.min(t), b.max(t)));
        if f.anchor == Anchor::Origin {
            lo = lo.min(0.0);
            hi = hi.max(0.0);
        }
        Some((centre + v * lo, centre + v * hi))
    }

    fn draw_endpoints<DB: DrawingBackend>(&self, area: &DrawingArea<DB, Shift>) -> Result<(), String> {
        let (w, h) = area.dim_in_pixel();
        let (w, h) = (w as f64, h as f64);
        let mut ext: f64 = 0.0;
        for (_, v) in &self.steps {
            for (a, b) in endpoint_projections(*v) {
                ext = ext.max(a.abs()).max(b.abs());
            }
        }
        // Equal scales on both axes; the box spans the data (with the origin) plus a margin.
        let mut lo = (0.0f64, 0.0f64);
        let mut hi = (0.0f64, 0.0f64);
        for (_, v) in &self.steps {
            for (a, b) in endpoint_projections(*v) {
                lo = (lo.0.min(a), lo.1.min(b));
                hi = (hi.0.max(a), hi.1.max(b));
            }
        }
        let ext = if ext > 0.0 { ext } else { 1.0 };
        let pad = 0.08 * ext;
        let (lo, hi) = ((lo.0 - pad, lo.1 - pad), (hi.0 + pad, hi.1 + pad));
        let margin = 46.0;
        let scale = ((w - 2.0 * margin) / (hi.0 - lo.0)).min((h - 2.0 * margin) / (hi.1 - lo.1));
        let ox = margin + ((w - 2.0 * margin) - scale * (hi.0 - lo.0)) / 2.0 - scale * lo.0;
        let oy = margin + ((h - 2.0 * margin) - scale * (hi.1 - lo.1)) / 2.0 + scale * hi.1;
        let px =
            |(a, b): (f64, f64)| -> (i32, i32) { ((ox + scale * a).round() as i32, (oy - scale * b).round() as i32) };
        // Axes through the origin across the data box.
        let axis = theme::GUIDE.stroke_width(1);
        area.draw(&PathElement::new(vec![px((lo.0, 0.0)), px((hi.0, 0.0))], axis)).map_err(de)?;
        area.draw(&PathElement::new(vec![px((0.0, lo.1)), px((0.0, hi.1))], axis)).map_err(de)?;
        let font = (theme::FONT, 13).into_font().color(&theme::INK);
        let (r_end, l_end, t_end, b_end) = (px((hi.0, 0.0)), px((lo.0, 0.0)), px((0.0, hi.1)), px((0.0, lo.1)));
        area.draw(&Text::new("N", (r_end.0 + 4, r_end.1 - 7), font.clone())).map_err(de)?;
        area.draw(&Text::new("S", (l_end.0 - 14, l_end.1 - 7), font.clone())).map_err(de)?;
        area.draw(&Text::new("W, up", (t_end.0 + 4, t_end.1 - 14), font.clone())).map_err(de)?;
        area.draw(&Text::new("E, down", (b_end.0 + 4, b_end.1 + 2), font.clone())).map_err(de)?;
        let (hcol, vcol) = (theme::series(0), theme::series(1));
        for (k, col) in [(0usize, hcol), (1, vcol)] {
            let path: Vec<(i32, i32)> = self.steps.iter().map(|(_, v)| px(endpoint_projections(*v)[k])).collect();
            area.draw(&PathElement::new(path, col.mix(0.6).stroke_width(1))).map_err(de)?;
        }
        for f in &self.fits {
            if let Some((a, b)) = self.fit_segment(f) {
                for k in 0..2 {
                    let (pa, pb) = (px(endpoint_projections(a)[k]), px(endpoint_projections(b)[k]));
                    area.draw(&PathElement::new(vec![pa, pb], FIT.stroke_width(3))).map_err(de)?;
                }
            }
        }
        let small = (theme::FONT, 11).into_font().color(&theme::INK);
        let mut label_at = Vec::new();
        for (_, v) in self.steps.iter() {
            let [hp, vp] = endpoint_projections(*v);
            let (ph, pv) = (px(hp), px(vp));
            area.draw(&Circle::new(ph, 4, hcol.filled())).map_err(de)?;
            area.draw(&Rectangle::new([(pv.0 - 4, pv.1 - 4), (pv.0 + 4, pv.1 + 4)], theme::PAPER.filled()))
                .map_err(de)?;
            area.draw(&Rectangle::new([(pv.0 - 4, pv.1 - 4), (pv.0 + 4, pv.1 + 4)], vcol.stroke_width(2)))
                .map_err(de)?;
            label_at.push(ph);
        }
        // Step labels beside the horizontal projection, never overlapping (some are left out when
        // the steps crowd).
        let texts: Vec<String> = self.steps.iter().map(|s| format_step(s.0)).collect();
        let order = super::label_order(texts.len());
        for (i, at) in super::place_labels(&label_at, &texts, 11, (w as i32, h as i32), &order).into_iter().enumerate()
        {
            if let Some(at) = at {
                area.draw(&Text::new(texts[i].clone(), at, small.clone())).map_err(de)?;
            }
        }
        // A scale bar of one round length, labelled to its right.
        let bar = (nice_step(ext) * scale).round() as i32;
        let y0 = h as i32 - 12;
        area.draw(&PathElement::new(vec![(10, y0), (10 + bar, y0)], theme::INK.stroke_width(2))).map_err(de)?;
        area.draw(&Text::new(format!("{} A·m²", sig(nice_step(ext))), (16 + bar, y0 - 7), small)).map_err(de)?;
        Ok(())
    }
}

/// A step value as a short label.
fn format_step(s: f64) -> String {
    if s.fract() == 0.0 {
        format!("{s:.0}")
    } else {
        format!("{s}")
    }
}

/// A round length (1, 2 or 5 × 10ⁿ) near a fifth of `ext`.
fn nice_step(ext: f64) -> f64 {
    let raw = ext / 5.0;
    let p = 10f64.powf(raw.log10().floor());
    let m = raw / p;
    p * if m < 1.5 {
        1.0
    } else if m < 3.5 {
        2.0
    } else if m < 7.5 {
        5.0
    } else {
        10.0
    }
}

fn sig(x: f64) -> String {
    format!("{x:.1e}")
}

impl Figure for VectorEndpointPlot {
    fn size(&self) -> (u32, u32) {
        (1500, 620)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let title_font = (theme::FONT, 18).into_font().color(&theme::INK);
        root.draw(&Text::new(
            format!("Specimen {} — demagnetization ({} steps)", self.specimen, self.steps.len()),
            (16, 10),
            title_font,
        ))
        .map_err(de)?;
        let body = root.margin(36, 70, 0, 0);
        let (left, rest) = body.split_horizontally(600);
        let (right, decay) = rest.split_horizontally(480);
        self.draw_endpoints(&left)?;
        super::draw_decay(&decay, &self.steps, &self.fits, &self.unit, format_step)?;
        let nc = draw_net(&right)?;
        let dirs: Vec<Direction> = self.steps.iter().filter_map(|(_, v)| Direction::from_vector(*v)).collect();
        let path: Vec<(i32, i32)> = dirs.iter().map(|d| nc.px(project(*d))).collect();
        right.draw(&PathElement::new(path, theme::GUIDE.stroke_width(1))).map_err(de)?;
        for d in &dirs {
            nc.marker(&right, *d, theme::series(0), 4)?;
        }
        for f in &self.fits {
            match f.kind {
                FitKind::Plane => nc.great_circle(&right, f.direction, FIT)?,
                FitKind::Line => {
                    let p = nc.px(project(f.direction));
                    let diamond = vec![(p.0, p.1 - 8), (p.0 + 8, p.1), (p.0, p.1 + 8), (p.0 - 8, p.1), (p.0, p.1 - 8)];
                    let fill = if f.direction.inc >= 0.0 { FIT } else { theme::PAPER };
                    right.draw(&Polygon::new(diamond.clone(), fill.filled())).map_err(de)?;
                    right.draw(&PathElement::new(diamond, FIT.stroke_width(2))).map_err(de)?;
                }
            }
        }
        // Footer: one line per fit, then the key.
        let font = (theme::FONT, 13).into_font().color(&theme::INK);
        let (_, h) = root.dim_in_pixel();
        let mut y = h as i32 - 66;
        let unit = if self.unit.is_empty() { String::new() } else { format!(" {}", self.unit) };
        for f in self.fits.iter().take(2) {
            let what = match f.kind {
                FitKind::Line => "line",
                FitKind::Plane => "plane (pole)",
            };
            let dang = f.dang.map(|d| format!(", DANG {d:.1}°")).unwrap_or_default();
            let text = format!(
                "{what}, {} fit, steps {}–{}{unit} (n = {}): D {}°, I {:.1}°, MAD {:.1}°{dang}",
                f.anchor.as_str(),
                format_step(f.from),
                format_step(f.to),
                f.n_steps,
                crate::numbers::azimuth(f.direction.dec, 1),
                f.direction.inc,
                f.mad
            );
            root.draw(&Text::new(text, (16, y), font.clone())).map_err(de)?;
            y += 18;
        }
        let key = "discs: horizontal projection · squares: vertical projection · rust: fitted line or plane";
        root.draw(&Text::new(key, (16, h as i32 - 22), (theme::FONT, 12).into_font().color(&theme::INK)))
            .map_err(de)?;
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn projections_follow_the_frame() {
        // x north, y east, z down (common practice): a north-east-down vector plots right and below
        // in the horizontal view (west is up) and right and below in the vertical view (up is up).
        let [h, v] = endpoint_projections(Vec3::new(1.0, 2.0, 3.0));
        assert_eq!(h, (1.0, -2.0));
        assert_eq!(v, (1.0, -3.0));
        assert_eq!(nice_step(10.0), 2.0);
        assert_eq!(nice_step(0.004), 0.001);
    }
}
