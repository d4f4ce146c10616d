//! Time-series figure of the present field: dipole moment, dip-pole speeds, the low's minimum and area.

use super::intervals::axes;
use super::render::{de, Figure};
use super::theme;
use crate::field::EpochSummary;
use plotters::coord::Shift;
use plotters::prelude::*;

/// Four panels over the years of a `field series`.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldSeriesFigure {
    /// Title (drawn above the panels).
    pub title: String,
    /// The epochs.
    pub epochs: Vec<EpochSummary>,
}

type Panel<'a> = (&'a str, Vec<(String, Vec<(f64, f64)>)>);

impl FieldSeriesFigure {
    fn panels(&self) -> Vec<Panel<'_>> {
        let e = &self.epochs;
        let pts = |f: &dyn Fn(&EpochSummary) -> Option<f64>| -> Vec<(f64, f64)> {
            e.iter().filter_map(|r| f(r).map(|v| (r.year, v))).collect()
        };
        vec![
            ("dipole moment (10²² A·m²)", vec![("moment".into(), pts(&|r| Some(r.moment / 1e22)))]),
            (
                "dip-pole speed (km/yr)",
                vec![
                    ("where the field points down".into(), pts(&|r| r.dip_north_speed)),
                    ("where it points up".into(), pts(&|r| r.dip_south_speed)),
                ],
            ),
            ("lowest F (µT)", vec![("minimum of the low".into(), pts(&|r| Some(r.low_f / 1000.0)))]),
            ("area below the threshold (10⁶ km²)", vec![("area".into(), pts(&|r| Some(r.low_area / 1e6)))]),
        ]
    }
}

impl Figure for FieldSeriesFigure {
    fn size(&self) -> (u32, u32) {
        (1000, 720)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let root = root.titled(&self.title, (theme::FONT, 18).into_font().color(&theme::INK)).map_err(de)?;
        let (x0, x1) = match (self.epochs.first(), self.epochs.last()) {
            (Some(a), Some(b)) if b.year > a.year => (a.year, b.year),
            (Some(a), _) => (a.year - 1.0, a.year + 1.0),
            _ => (0.0, 1.0),
        };
        for (area, (desc, curves)) in root.split_evenly((2, 2)).iter().zip(self.panels()) {
            let all = curves.iter().flat_map(|c| c.1.iter().map(|p| p.1));
            let (lo, hi) = all.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
            let (lo, hi) = if lo.is_finite() && hi > lo { (lo, hi) } else { (lo.min(0.0) - 1.0, hi.max(0.0) + 1.0) };
            let pad = (hi - lo) * 0.08;
            let mut chart = axes(area, "", x0..x1, (lo - pad)..(hi + pad), "year", desc)?;
            for (i, (name, p)) in curves.into_iter().enumerate() {
                let style = theme::series(i).stroke_width(2);
                chart
                    .draw_series(LineSeries::new(p, style))
                    .map_err(de)?
                    .label(name)
                    .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], style));
            }
            chart
                .configure_series_labels()
                .background_style(theme::PAPER.mix(0.9))
                .border_style(theme::GUIDE)
                .label_font((theme::FONT, 12).into_font().color(&theme::INK))
                .position(SeriesLabelPosition::UpperRight)
                .draw()
                .map_err(de)?;
        }
        Ok(())
    }
}
