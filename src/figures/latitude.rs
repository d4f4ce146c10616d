//! Figure of VGP scatter against paleolatitude with the fitted latitude model and its band.

use super::intervals::axes;
use super::render::{de, Figure};
use super::theme;
use super::theme::LegendStyle as _;
use crate::dirstats::LatitudeFit;
use plotters::coord::Shift;
use plotters::prelude::*;

/// One group on the figure: |paleolatitude|, S and its interval.
#[derive(Debug, Clone, PartialEq)]
pub struct LatitudePoint {
    /// Group name.
    pub label: String,
    /// |Paleolatitude|, degrees.
    pub lat: f64,
    /// S, degrees.
    pub s: f64,
    /// Lower and upper bounds of S, degrees.
    pub bounds: (f64, f64),
}

/// S against |λ| with S(λ)² = a² + (bλ)².
#[derive(Debug, Clone, PartialEq)]
pub struct LatitudeFigure {
    /// Title.
    pub title: String,
    /// The groups.
    pub points: Vec<LatitudePoint>,
    /// The fitted model.
    pub fit: LatitudeFit,
    /// The band: (λ, low, high).
    pub band: Vec<(f64, f64, f64)>,
}

impl Figure for LatitudeFigure {
    fn size(&self) -> (u32, u32) {
        (820, 560)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        let top = self
            .points
            .iter()
            .map(|p| p.bounds.1.max(p.s))
            .chain(self.band.iter().map(|b| b.2))
            .fold(10.0f64, f64::max)
            * 1.1;
        let mut chart = axes(root, &self.title, 0.0..90.0, 0.0..top, "|paleolatitude| (°)", "VGP scatter S (°)")?;
        let c = theme::series(0);
        let mut poly: Vec<(f64, f64)> = self.band.iter().map(|b| (b.0, b.1)).collect();
        poly.extend(self.band.iter().rev().map(|b| (b.0, b.2)));
        chart
            .draw_series(std::iter::once(Polygon::new(poly, c.mix(0.18).filled())))
            .map_err(de)?
            .label("95 % band (bootstrap)")
            .legend(move |(x, y)| Rectangle::new([(x, y - 5), (x + 18, y + 5)], c.mix(0.18).filled()));
        let fit = self.fit;
        chart
            .draw_series(LineSeries::new((0..=90).map(|l| (l as f64, fit.s_at(l as f64))), c.stroke_width(3)))
            .map_err(de)?
            .label(format!("S² = a² + (bλ)², a = {:.1}°, b = {:.3}", fit.a, fit.b))
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], c.stroke_width(3)));
        for p in &self.points {
            chart
                .draw_series(std::iter::once(PathElement::new(
                    vec![(p.lat, p.bounds.0), (p.lat, p.bounds.1)],
                    theme::INK.stroke_width(2),
                )))
                .map_err(de)?;
        }
        chart
            .draw_series(self.points.iter().map(|p| Circle::new((p.lat, p.s), 5, theme::series(1).filled())))
            .map_err(de)?
            .label("groups (S with its bootstrap interval)")
            .legend(|(x, y)| Circle::new((x + 9, y), 5, theme::series(1).filled()));
        let font = (theme::FONT, 12).into_font().color(&theme::INK);
        chart
            .draw_series(self.points.iter().map(|p| Text::new(p.label.clone(), (p.lat + 1.0, p.s), font.clone())))
            .map_err(de)?;
        chart.configure_series_labels().legend_style().position(SeriesLabelPosition::UpperLeft).draw().map_err(de)
    }
}
