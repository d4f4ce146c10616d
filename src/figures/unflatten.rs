//! Figure of the elongation/inclination correction: the data's path, bootstrap paths and the field
//! model's curve, beside the distribution of corrected inclinations.

use super::intervals::axes;
use super::render::{de, Figure};
use super::theme;
use super::theme::LegendStyle as _;
use crate::dirstats::{tk03_curve, UnflattenResult};
use plotters::coord::Shift;
use plotters::prelude::*;

/// The elongation–inclination figure.
#[derive(Debug, Clone, PartialEq)]
pub struct UnflattenFigure {
    /// Title.
    pub title: String,
    /// The result to draw (its path, bootstrap paths and corrected inclinations).
    pub result: UnflattenResult,
}

impl UnflattenFigure {
    fn paths<DB: DrawingBackend>(&self, area: &DrawingArea<DB, Shift>) -> Result<(), String> {
        let r = &self.result;
        let top = r.path.e.iter().chain(r.boot_paths.iter().flat_map(|p| p.e.iter())).fold(3.2f64, |a, &b| a.max(b));
        let mut chart = axes(
            area,
            "elongation against inclination",
            0.0..90.0,
            0.0..top.min(8.0) + 0.2,
            "inclination of the principal axis |I| (°)",
            "elongation along the meridian E",
        )?;
        let faint = theme::series(0).mix(0.25);
        for p in &r.boot_paths {
            let pts = p.inc.iter().zip(&p.e).map(|(i, e)| (i.abs(), *e));
            chart.draw_series(LineSeries::new(pts, faint.stroke_width(1))).map_err(de)?;
        }
        let model: Vec<(f64, f64)> = (0..=90).map(|i| (i as f64, tk03_curve(i as f64))).collect();
        chart
            .draw_series(LineSeries::new(model, theme::INK.stroke_width(3)))
            .map_err(de)?
            .label("TK03 field model")
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], theme::INK.stroke_width(3)));
        let data = theme::series(1);
        let pts = r.path.inc.iter().zip(&r.path.e).map(|(i, e)| (i.abs(), *e));
        chart
            .draw_series(LineSeries::new(pts, data.stroke_width(3)))
            .map_err(de)?
            .label("data, unflattened by f = 1 … 0.2")
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], data.stroke_width(3)));
        chart
            .draw_series(std::iter::once(PathElement::new(vec![(0.0, 0.0), (0.0, 0.0)], faint.stroke_width(1))))
            .map_err(de)?
            .label(format!("{} bootstrap paths", r.boot_paths.len()))
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], faint.stroke_width(2)));
        if let Some(i) = r.inc_corrected {
            let e = tk03_curve(i);
            chart.draw_series(std::iter::once(Circle::new((i.abs(), e), 7, data.filled()))).map_err(de)?;
        }
        chart.configure_series_labels().legend_style().position(SeriesLabelPosition::UpperRight).draw().map_err(de)
    }

    fn histogram<DB: DrawingBackend>(&self, area: &DrawingArea<DB, Shift>) -> Result<(), String> {
        let r = &self.result;
        let width = 2.0;
        let (lo, hi) = r.boot_inc.iter().fold((f64::MAX, f64::MIN), |(a, b), &x| (a.min(x), b.max(x)));
        let (lo, hi) = if lo <= hi { (lo, hi) } else { (r.inc_observed - 5.0, r.inc_observed + 5.0) };
        let x0 = (lo.min(r.inc_observed) / width).floor() * width - width;
        let x1 = (hi.max(r.inc_observed) / width).ceil() * width + width;
        let bins = ((x1 - x0) / width).round() as usize;
        let mut count = vec![0usize; bins.max(1)];
        for &x in &r.boot_inc {
            let k = (((x - x0) / width).floor() as usize).min(count.len() - 1);
            count[k] += 1;
        }
        let total = r.boot_inc.len().max(1) as f64;
        let ymax = count.iter().copied().max().unwrap_or(1) as f64 / total * 1.15;
        let mut chart = axes(
            area,
            "corrected inclination, bootstrap",
            x0..x1,
            0.0..ymax.max(0.05),
            "inclination (°)",
            "fraction of pseudo-samples",
        )?;
        let fill = theme::series(0).mix(0.6).filled();
        chart
            .draw_series(count.iter().enumerate().map(|(k, &c)| {
                let x = x0 + k as f64 * width;
                Rectangle::new([(x, 0.0), (x + width, c as f64 / total)], fill)
            }))
            .map_err(de)?;
        let mark =
            |x: f64, colour: RGBColor, w: u32| PathElement::new(vec![(x, 0.0), (x, ymax)], colour.stroke_width(w));
        chart.draw_series(std::iter::once(mark(r.inc_observed, theme::INK, 2))).map_err(de)?;
        for x in [r.inc_low, r.inc_high].into_iter().flatten() {
            chart.draw_series(std::iter::once(mark(x, theme::series(4), 1))).map_err(de)?;
        }
        if let Some(x) = r.inc_corrected {
            chart.draw_series(std::iter::once(mark(x, theme::series(1), 3))).map_err(de)?;
        }
        let font = (theme::FONT, 12).into_font().color(&theme::INK);
        area.draw(&Text::new("black: observed · ochre: corrected · rust: 95 % bounds", (80, 62), font)).map_err(de)?;
        Ok(())
    }
}

impl Figure for UnflattenFigure {
    fn size(&self) -> (u32, u32) {
        (1200, 560)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let title = (theme::FONT, 18).into_font().color(&theme::INK);
        root.draw(&Text::new(self.title.clone(), (16, 8), title)).map_err(de)?;
        let body = root.margin(30, 0, 0, 0);
        let (left, right) = body.split_horizontally(660);
        self.paths(&left)?;
        self.histogram(&right)
    }
}
