//! An equal-area figure with elliptical confidence regions drawn about the group means.

use super::equal_area::{draw_net, EqualAreaPlot};
use super::render::Figure;
use super::theme;
use crate::sphere::Direction;
use plotters::coord::Shift;
use plotters::prelude::*;

/// [`EqualAreaPlot`] with, for some groups, the boundary of an elliptical region.
#[derive(Debug, Clone, PartialEq)]
pub struct EllipseNet {
    /// The plot of the directions and means.
    pub base: EqualAreaPlot,
    /// (group index, boundary points) of each ellipse.
    pub ellipses: Vec<(usize, Vec<Direction>)>,
}

impl Figure for EllipseNet {
    fn size(&self) -> (u32, u32) {
        self.base.size()
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        self.base.draw(root)?;
        // The same layout as the base figure: the net sits in the left 620 pixels below a 30-pixel title.
        let (left, _) = root.split_horizontally(620);
        let net_area = left.margin(30, 0, 0, 0);
        let nc = draw_net(&net_area)?;
        // Drawn in ink so that a small ellipse stays visible over its group's points.
        for (_, pts) in &self.ellipses {
            nc.curve(&net_area, pts, theme::INK)?;
        }
        Ok(())
    }
}
