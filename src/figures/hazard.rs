//! Hazard figure: the hazard of each fitted renewal model against time since the last reversal, with
//! the elapsed time marked.

use super::intervals::{axes, draw_curves, Curve};
use super::render::{de, Figure};
use super::theme;
use crate::reversals::RenewalFits;
use plotters::coord::Shift;
use plotters::prelude::*;

/// Hazard curves per model, with the elapsed time marked.
#[derive(Debug, Clone, PartialEq)]
pub struct HazardFigure {
    /// Title.
    pub title: String,
    /// One curve per model: (time since last reversal in Myr, hazard per Myr).
    pub curves: Vec<Curve>,
    /// Elapsed time marked on the figure, Myr.
    pub elapsed: f64,
}

impl HazardFigure {
    /// Build from fitted models, over 0 … max(2 × elapsed, 3 × the longest fitted mean).
    pub fn new(fits: &RenewalFits, elapsed: f64, source: &str) -> Self {
        let top = fits.fits.iter().map(|f| 3.0 * f.fitted.mean()).fold(2.0 * elapsed, f64::max).max(1e-3);
        let xs: Vec<f64> = (1..=240).map(|i| top * i as f64 / 240.0).collect();
        let curves = fits
            .fits
            .iter()
            .map(|f| Curve {
                label: format!("{} (w = {:.2})", f.fitted.model.name(), f.weight),
                points: xs.iter().map(|&x| (x, f.fitted.hazard(x))).collect(),
            })
            .collect();
        HazardFigure {
            title: format!("Hazard of a reversal (model statement, not a forecast) — {source}"),
            curves,
            elapsed,
        }
    }
}

impl Figure for HazardFigure {
    fn size(&self) -> (u32, u32) {
        (820, 560)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        let xmax = self.curves.first().and_then(|c| c.points.last()).map_or(1.0, |p| p.0);
        // Clip the vertical range at a generous multiple of the median hazard so that a curve that
        // diverges near zero (shape < 1) does not flatten the others.
        let mut hs: Vec<f64> =
            self.curves.iter().flat_map(|c| c.points.iter().map(|p| p.1)).filter(|h| h.is_finite()).collect();
        hs.sort_by(f64::total_cmp);
        let ymax = hs.get(hs.len() * 95 / 100).copied().unwrap_or(1.0).max(1e-9) * 1.2;
        let mut chart = axes(
            root,
            &self.title,
            0.0..xmax,
            0.0..ymax * 1.45,
            "time since the last reversal (Myr)",
            "hazard (per Myr)",
        )?;
        let clipped: Vec<Curve> = self
            .curves
            .iter()
            .map(|c| Curve {
                label: c.label.clone(),
                points: c.points.iter().map(|&(x, y)| (x, y.min(ymax))).collect(),
            })
            .collect();
        chart
            .draw_series(LineSeries::new(
                vec![(self.elapsed, 0.0), (self.elapsed, ymax * 1.45)],
                theme::INK.stroke_width(1),
            ))
            .map_err(de)?
            .label(format!("elapsed {:.3} Myr", self.elapsed))
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], theme::INK.stroke_width(1)));
        draw_curves(&mut chart, &clipped, SeriesLabelPosition::UpperLeft)
    }
}
