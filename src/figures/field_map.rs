//! Map of the total intensity at the reference sphere with contours, and the surface-intensity low's
//! minima marked; a plate carrée of longitude against latitude (no coastlines are drawn).

use super::render::{de, Figure};
use super::theme;
use super::theme::LegendStyle as _;
use crate::field::{IntensityGrid, IntensityMinimum};
use plotters::coord::Shift;
use plotters::prelude::*;

/// F on a global grid with contours and the low's minima.
#[derive(Debug, Clone, PartialEq)]
pub struct IntensityMap {
    /// Title.
    pub title: String,
    /// The grid (cell-centred, degrees).
    pub grid: IntensityGrid,
    /// Contour interval, nT.
    pub interval: f64,
    /// The low's threshold, nT (drawn heavier).
    pub threshold: f64,
    /// Separate minima below the threshold.
    pub minima: Vec<IntensityMinimum>,
}

/// Colour of an intensity between `lo` and `hi`: from deep teal (weak) through pale sand to rust (strong).
fn ramp(f: f64, lo: f64, hi: f64) -> RGBColor {
    let t = ((f - lo) / (hi - lo)).clamp(0.0, 1.0);
    let stops = [(0.0, (0.0, 92.0, 104.0)), (0.5, (238.0, 228.0, 204.0)), (1.0, (160.0, 62.0, 30.0))];
    let (a, b) = if t < 0.5 { (stops[0], stops[1]) } else { (stops[1], stops[2]) };
    let u = (t - a.0) / (b.0 - a.0);
    let mix = |p: f64, q: f64| (p + (q - p) * u).round() as u8;
    RGBColor(mix(a.1 .0, b.1 .0), mix(a.1 .1, b.1 .1), mix(a.1 .2, b.1 .2))
}

/// Segments of the contour at `level` by marching squares over the grid's cell centres
/// (longitudes −180…180 for the map).
fn contour(g: &IntensityGrid, level: f64) -> Vec<[(f64, f64); 2]> {
    let mut out = Vec::new();
    let x = |j: usize| g.lon(j) - 180.0;
    for i in 0..g.nlat - 1 {
        for j in 0..g.nlon - 1 {
            // Corners counter-clockwise from bottom-left; shift columns by half a turn to centre on 0°.
            let col = |jj: usize| (jj + g.nlon / 2) % g.nlon;
            let c = [
                (x(j), g.lat(i), g.at(i, col(j))),
                (x(j + 1), g.lat(i), g.at(i, col(j + 1))),
                (x(j + 1), g.lat(i + 1), g.at(i + 1, col(j + 1))),
                (x(j), g.lat(i + 1), g.at(i + 1, col(j))),
            ];
            let mut pts = Vec::with_capacity(4);
            for k in 0..4 {
                let (a, b) = (c[k], c[(k + 1) % 4]);
                if (a.2 < level) != (b.2 < level) {
                    let t = (level - a.2) / (b.2 - a.2);
                    pts.push((a.0 + t * (b.0 - a.0), a.1 + t * (b.1 - a.1)));
                }
            }
            for p in pts.chunks_exact(2) {
                out.push([p[0], p[1]]);
            }
        }
    }
    out
}

impl Figure for IntensityMap {
    fn size(&self) -> (u32, u32) {
        (1000, 560)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let g = &self.grid;
        let (lo, hi) = g.f.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &v| (a.min(v), b.max(v)));
        let mut chart = ChartBuilder::on(root)
            .caption(&self.title, (theme::FONT, 17).into_font().color(&theme::INK))
            .margin(16)
            .x_label_area_size(40)
            .y_label_area_size(48)
            .build_cartesian_2d(-180.0..180.0, -90.0..90.0)
            .map_err(de)?;
        let half = g.step / 2.0;
        chart
            .draw_series((0..g.nlat).flat_map(|i| {
                (0..g.nlon).map(move |j| {
                    let lon = g.lon(j);
                    let x = if lon >= 180.0 { lon - 360.0 } else { lon };
                    let colour = ramp(g.at(i, j), lo, hi);
                    Rectangle::new([(x - half, g.lat(i) - half), (x + half, g.lat(i) + half)], colour.filled())
                })
            }))
            .map_err(de)?;
        chart
            .configure_mesh()
            .x_labels(13)
            .y_labels(7)
            .light_line_style(TRANSPARENT)
            .bold_line_style(theme::GUIDE.mix(0.5))
            .x_desc("longitude (°E)")
            .y_desc("geocentric latitude (°)")
            .label_style((theme::FONT, 13).into_font().color(&theme::INK))
            .draw()
            .map_err(de)?;
        let first = (lo / self.interval).ceil() as i64;
        let last = (hi / self.interval).floor() as i64;
        for k in first..=last {
            let level = k as f64 * self.interval;
            let style = theme::INK.mix(0.55).stroke_width(1);
            chart
                .draw_series(contour(g, level).into_iter().map(|s| PathElement::new(s.to_vec(), style)))
                .map_err(de)?;
        }
        let heavy = theme::INK.stroke_width(3);
        chart
            .draw_series(contour(g, self.threshold).into_iter().map(|s| PathElement::new(s.to_vec(), heavy)))
            .map_err(de)?
            .label(format!("{:.0} nT (the low's threshold); thin lines every {:.0} nT", self.threshold, self.interval))
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], heavy));
        let font = (theme::FONT, 13).into_font().color(&theme::INK);
        for m in &self.minima {
            let x = if m.lon >= 180.0 { m.lon - 360.0 } else { m.lon };
            chart
                .draw_series(std::iter::once(
                    EmptyElement::at((x, m.lat))
                        + Cross::new((0, 0), 7, theme::PAPER.stroke_width(4))
                        + Cross::new((0, 0), 7, theme::INK.stroke_width(2))
                        + Text::new(format!("{:.0} nT", m.f), (10, -16), font.clone()),
                ))
                .map_err(de)?;
        }
        chart.configure_series_labels().legend_style().position(SeriesLabelPosition::LowerLeft).draw().map_err(de)
    }
}
