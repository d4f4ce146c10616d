//! Figures: an outer ring that only reads results. Each figure renders to SVG or PNG bytes with the
//! embedded font, so figures come out the same on a machine with no fonts installed.

mod column;
mod decay;
mod ellipse_net;
mod equal_area;
mod field_map;
mod field_series;
mod fold;
mod great_circle;
mod hazard;
mod intervals;
mod latitude;
mod net_projection;
mod pole_plot;
mod rate;
mod render;
pub mod theme;
mod unflatten;
mod vector_endpoint;

pub use column::{ColumnFigure, ScalePanel};
pub use decay::{draw_decay, label_order, place_labels};
pub use ellipse_net::EllipseNet;
pub use equal_area::{draw_net, small_circle, EqualAreaPlot, NetCoords, NetGroup};
pub use field_map::IntensityMap;
pub use field_series::FieldSeriesFigure;
pub use fold::FoldPlot;
pub use great_circle::{dashes, great_circle_halves, project_all, unproject, CircleHalves};
pub use hazard::HazardFigure;
pub use intervals::{Curve, IntervalFigure};
pub use latitude::{LatitudeFigure, LatitudePoint};
pub use net_projection::project;
pub use pole_plot::{pole_map_rim, pole_map_xy, MappedVgp, PolePlot};
pub use rate::RateFigure;
pub use render::{de, register_fonts, render, Figure, FigureFormat};
pub use unflatten::UnflattenFigure;
pub use vector_endpoint::{endpoint_projections, VectorEndpointPlot};
