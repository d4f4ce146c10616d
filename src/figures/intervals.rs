//! Interval-length figure: the empirical distribution of complete polarity intervals (steps) with
//! the distribution functions of the fitted renewal models.

use super::render::{de, Figure};
use super::theme;
use crate::reversals::{RenewalFits, Sample};
use plotters::coord::types::RangedCoordf64;
use plotters::coord::Shift;
use plotters::prelude::*;

/// One fitted curve: label and (x, y) points.
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    /// Legend label.
    pub label: String,
    /// Points, x increasing.
    pub points: Vec<(f64, f64)>,
}

/// Empirical CDF of interval lengths with fitted model CDFs.
#[derive(Debug, Clone, PartialEq)]
pub struct IntervalFigure {
    /// Title.
    pub title: String,
    /// Sorted complete interval lengths, Myr.
    pub lengths: Vec<f64>,
    /// The open chron's length so far (marked), Myr.
    pub censored: Option<f64>,
    /// Fitted CDFs.
    pub curves: Vec<Curve>,
}

impl IntervalFigure {
    /// Build from a sample and its fits.
    pub fn new(s: &Sample, fits: &RenewalFits, source: &str) -> Self {
        let top = s.complete.last().copied().unwrap_or(1.0).max(s.censored.unwrap_or(0.0)) * 1.1;
        let xs: Vec<f64> = (1..=200).map(|i| top * i as f64 / 200.0).collect();
        let curves = fits
            .fits
            .iter()
            .map(|f| Curve {
                label: format!("{} (w = {:.2})", f.fitted.model.name(), f.weight),
                points: xs.iter().map(|&x| (x, f.fitted.cdf(x))).collect(),
            })
            .collect();
        IntervalFigure {
            title: format!("Polarity interval lengths — {source}"),
            lengths: s.complete.clone(),
            censored: s.censored,
            curves,
        }
    }
}

/// The plot frame shared by the reversal figures: paper, caption, axes with labels and a light mesh.
pub(crate) type XyChart<'a, DB> = ChartContext<'a, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>;

/// Fill the paper and build a captioned x–y chart with labelled axes.
pub(crate) fn axes<'a, DB: DrawingBackend + 'a>(
    root: &'a DrawingArea<DB, Shift>,
    title: &str,
    x: std::ops::Range<f64>,
    y: std::ops::Range<f64>,
    x_desc: &str,
    y_desc: &str,
) -> Result<XyChart<'a, DB>, String> {
    root.fill(&theme::PAPER).map_err(de)?;
    let mut chart = ChartBuilder::on(root)
        .caption(title, (theme::FONT, 17).into_font().color(&theme::INK))
        .margin(16)
        .x_label_area_size(44)
        .y_label_area_size(56)
        .build_cartesian_2d(x, y)
        .map_err(de)?;
    chart
        .configure_mesh()
        .light_line_style(theme::GUIDE.mix(0.4))
        .x_desc(x_desc)
        .y_desc(y_desc)
        .label_style((theme::FONT, 13).into_font().color(&theme::INK))
        .draw()
        .map_err(de)?;
    Ok(chart)
}

/// Draw curves with a legend on a chart (shared by the reversal figures).
pub(crate) fn draw_curves<'a, DB: DrawingBackend + 'a>(
    chart: &mut XyChart<'a, DB>,
    curves: &[Curve],
    legend: SeriesLabelPosition,
) -> Result<(), String> {
    for (i, c) in curves.iter().enumerate() {
        let colour = theme::series(i);
        chart
            .draw_series(LineSeries::new(c.points.iter().copied().filter(|p| p.1.is_finite()), colour.stroke_width(2)))
            .map_err(de)?
            .label(c.label.clone())
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], colour.stroke_width(2)));
    }
    chart
        .configure_series_labels()
        .background_style(theme::PAPER.mix(0.9))
        .border_style(theme::GUIDE)
        .label_font((theme::FONT, 14).into_font().color(&theme::INK))
        .position(legend)
        .draw()
        .map_err(de)
}

impl Figure for IntervalFigure {
    fn size(&self) -> (u32, u32) {
        (820, 560)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        let xmax = self.curves.first().and_then(|c| c.points.last()).map_or(1.0, |p| p.0);
        let mut chart =
            axes(root, &self.title, 0.0..xmax, 0.0..1.0, "interval length (Myr)", "fraction of intervals not longer")?;
        let n = self.lengths.len() as f64;
        let mut steps = vec![(0.0, 0.0)];
        for (i, &x) in self.lengths.iter().enumerate() {
            steps.push((x, i as f64 / n));
            steps.push((x, (i + 1) as f64 / n));
        }
        steps.push((xmax, 1.0));
        chart
            .draw_series(LineSeries::new(steps, theme::INK.stroke_width(2)))
            .map_err(de)?
            .label("observed (complete intervals)")
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], theme::INK.stroke_width(2)));
        if let Some(c) = self.censored {
            chart
                .draw_series(LineSeries::new(vec![(c, 0.0), (c, 1.0)], theme::INK.mix(0.6).stroke_width(1)))
                .map_err(de)?
                .label("open chron so far (censored)")
                .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], theme::INK.mix(0.6).stroke_width(1)));
        }
        draw_curves(&mut chart, &self.curves, SeriesLabelPosition::LowerRight)
    }
}
