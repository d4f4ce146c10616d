//! Figures: an outer ring that only reads results. Each figure renders to SVG or PNG bytes with the
//! embedded font, so figures come out the same on a machine with no fonts installed.

mod equal_area;
mod hazard;
mod intervals;
mod rate;
mod render;
pub mod theme;

pub use equal_area::{draw_net, project, small_circle, EqualAreaPlot, NetCoords, NetGroup};
pub use render::{de, register_fonts, render, Figure, FigureFormat};
pub use hazard::HazardFigure;
pub use intervals::{Curve, IntervalFigure};
pub use rate::RateFigure;
