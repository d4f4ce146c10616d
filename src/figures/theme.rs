//! lodestone's own figure look: a restrained palette and common sizes, shared by every figure.

use plotters::style::RGBColor;

/// Ink for axes, frames and text.
pub const INK: RGBColor = RGBColor(34, 40, 49);
/// Light ink for graticules and guides.
pub const GUIDE: RGBColor = RGBColor(190, 196, 204);
/// Paper.
pub const PAPER: RGBColor = RGBColor(255, 255, 255);
/// Series colours, cycled: deep teal, ochre, plum, slate blue, rust, olive, rose, steel.
pub const SERIES: [RGBColor; 8] = [
    RGBColor(0, 109, 119),
    RGBColor(201, 133, 0),
    RGBColor(122, 62, 116),
    RGBColor(63, 92, 160),
    RGBColor(176, 74, 42),
    RGBColor(110, 122, 40),
    RGBColor(204, 92, 128),
    RGBColor(86, 110, 125),
];
/// Normal polarity fill (the trade's convention: black).
pub const NORMAL: RGBColor = RGBColor(0, 0, 0);
/// Reversed polarity fill (white).
pub const REVERSED: RGBColor = RGBColor(255, 255, 255);
/// Intermediate or unconfirmed polarity fill (grey).
pub const INTERMEDIATE: RGBColor = RGBColor(160, 160, 160);
/// Font family (the embedded DejaVu Sans is registered under this name).
pub const FONT: &str = "sans-serif";

/// The series colour for index `i`.
pub fn series(i: usize) -> RGBColor {
    SERIES[i % SERIES.len()]
}

/// The house legend box (paper mixed at 90 %, guide-coloured border, 13 px ink labels), set on a
/// chart's series-label style; the position and the final `draw` stay with the figure.
pub trait LegendStyle {
    /// This style with the house legend box applied.
    fn legend_style(&mut self) -> &mut Self;
}

impl<'a, 'b, DB, CT> LegendStyle for plotters::chart::SeriesLabelStyle<'a, 'b, DB, CT>
where
    DB: plotters::prelude::DrawingBackend + 'a,
    CT: plotters::coord::CoordTranslate,
{
    fn legend_style(&mut self) -> &mut Self {
        use plotters::style::{Color, IntoFont};
        self.background_style(PAPER.mix(0.9)).border_style(GUIDE).label_font((FONT, 13).into_font().color(&INK))
    }
}
