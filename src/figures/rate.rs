//! Rate figure: reversal rate through time with its confidence band and the reversals marked.

use super::intervals::axes;
use super::render::{de, Figure};
use super::theme;
use crate::reversals::RatePoint;
use plotters::coord::Shift;
use plotters::prelude::*;

/// Reversal rate through time with its band.
#[derive(Debug, Clone, PartialEq)]
pub struct RateFigure {
    /// Title.
    pub title: String,
    /// Rate per window.
    pub points: Vec<RatePoint>,
    /// Reversal ages (Ma), marked along the bottom.
    pub reversals: Vec<f64>,
    /// Window width, Myr (shown in the axis label).
    pub window: f64,
}

impl Figure for RateFigure {
    fn size(&self) -> (u32, u32) {
        (900, 520)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        let (x0, x1) =
            self.points.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| (a.min(p.age), b.max(p.age)));
        let (x0, x1) = if x0 < x1 { (x0 - self.window / 2.0, x1 + self.window / 2.0) } else { (0.0, 1.0) };
        let ymax = self.points.iter().map(|p| p.high).fold(0.0, f64::max).max(1e-9) * 1.1;
        let y_desc = format!("reversals per Myr ({} Myr window)", self.window);
        let mut chart = axes(root, &self.title, x0..x1, 0.0..ymax, "age (Ma)", &y_desc)?;
        let band: Vec<(f64, f64)> = self
            .points
            .iter()
            .map(|p| (p.age, p.high))
            .chain(self.points.iter().rev().map(|p| (p.age, p.low)))
            .collect();
        let fill = theme::series(0).mix(0.2);
        chart
            .draw_series(std::iter::once(Polygon::new(band, fill.filled())))
            .map_err(de)?
            .label("confidence band")
            .legend(move |(x, y)| Rectangle::new([(x, y - 5), (x + 18, y + 5)], fill.filled()));
        let line = theme::series(0).stroke_width(2);
        chart
            .draw_series(LineSeries::new(self.points.iter().map(|p| (p.age, p.rate)), line))
            .map_err(de)?
            .label("rate")
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], line));
        let tick = ymax * 0.03;
        chart
            .draw_series(
                self.reversals
                    .iter()
                    .filter(|a| **a >= x0 && **a <= x1)
                    .map(|&a| PathElement::new(vec![(a, 0.0), (a, tick)], theme::INK.stroke_width(1))),
            )
            .map_err(de)?;
        chart
            .configure_series_labels()
            .background_style(theme::PAPER.mix(0.9))
            .border_style(theme::GUIDE)
            .label_font((theme::FONT, 14).into_font().color(&theme::INK))
            .position(SeriesLabelPosition::UpperRight)
            .draw()
            .map_err(de)
    }
}
