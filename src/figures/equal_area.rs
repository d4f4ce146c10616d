//! Equal-area (Lambert azimuthal) projection of directions, lower hemisphere view from above.

use super::great_circle::{dashes, great_circle_halves, project_all};
use super::net_projection::project;
use super::render::{de, Figure};
use super::theme;
use crate::sphere::{Direction, Vec3};
use plotters::coord::Shift;
use plotters::prelude::*;

/// Points of the small circle of angular radius `radius_deg` about `centre`, as directions, in order.
pub fn small_circle(centre: Direction, radius_deg: f64, n: usize) -> Vec<Direction> {
    let m = centre.to_vector();
    let helper = if m.z.abs() < 0.9 { Vec3::new(0.0, 0.0, 1.0) } else { Vec3::new(1.0, 0.0, 0.0) };
    let a = m.cross(helper).normalized().expect("non-parallel helper");
    let b = m.cross(a);
    let (s, c) = radius_deg.to_radians().sin_cos();
    (0..=n)
        .map(|k| {
            let phi = std::f64::consts::TAU * k as f64 / n as f64;
            let v = m * c + (a * phi.cos() + b * phi.sin()) * s;
            Direction::from_vector(v).expect("unit vector")
        })
        .collect()
}

/// One group of directions on the net, with an optional mean and cone.
#[derive(Debug, Clone, PartialEq)]
pub struct NetGroup {
    /// Legend label.
    pub label: String,
    /// The directions.
    pub points: Vec<Direction>,
    /// Poles of great circles (planes), each drawn as its circle: lower half solid, upper half dashed.
    pub circles: Vec<Direction>,
    /// The mean direction (of lines and circles together, when there are circles) and its cone
    /// half-angle (degrees), if any.
    pub mean: Option<(Direction, Option<f64>)>,
}

/// An equal-area figure of groups of directions.
#[derive(Debug, Clone, PartialEq)]
pub struct EqualAreaPlot {
    /// Title above the net.
    pub title: String,
    /// Groups, each drawn in its own colour.
    pub groups: Vec<NetGroup>,
    /// Name of the cone (e.g. "α95").
    pub cone_label: String,
}

/// Draw an equal-area net into `area`: primitive circle, cardinal ticks and inclination ticks on the axes.
pub fn draw_net<DB: DrawingBackend>(area: &DrawingArea<DB, Shift>) -> Result<NetCoords, String> {
    let (w, h) = area.dim_in_pixel();
    let size = w.min(h) as f64;
    let c = (w as f64 / 2.0, h as f64 / 2.0);
    let rad = size / 2.0 - 28.0;
    let nc = NetCoords { cx: c.0, cy: c.1, rad };
    let circle: Vec<(i32, i32)> =
        (0..=360).map(|k| nc.px(((k as f64).to_radians().sin(), (k as f64).to_radians().cos()))).collect();
    area.draw(&PathElement::new(circle, theme::INK.stroke_width(2))).map_err(de)?;
    let font = (theme::FONT, 15).into_font().color(&theme::INK);
    for (dec, label) in [(0.0, "N"), (90.0, "E"), (180.0, "S"), (270.0, "W")] {
        let d: f64 = f64::to_radians(dec);
        let outer = nc.px((d.sin() * 1.0, d.cos() * 1.0));
        let inner = nc.px((d.sin() * 0.95, d.cos() * 0.95));
        area.draw(&PathElement::new(vec![outer, inner], theme::INK.stroke_width(2))).map_err(de)?;
        let lp = nc.px((d.sin() * 1.09, d.cos() * 1.09));
        area.draw(&Text::new(label, (lp.0 - 5, lp.1 - 8), font.clone())).map_err(de)?;
        // Inclination ticks every 10 degrees along the four axes.
        for inc in (10..90).step_by(10) {
            let p = nc.px(project(Direction { dec, inc: inc as f64 }));
            let (dx, dy) = if dec == 0.0 || dec == 180.0 { (4, 0) } else { (0, 4) };
            area.draw(&PathElement::new(
                vec![(p.0 - dx, p.1 - dy), (p.0 + dx, p.1 + dy)],
                theme::GUIDE.stroke_width(1),
            ))
            .map_err(de)?;
        }
    }
    area.draw(&Cross::new(nc.px((0.0, 0.0)), 4, theme::GUIDE.stroke_width(1))).map_err(de)?;
    Ok(nc)
}

/// Pixel mapping of a net drawn by [`draw_net`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NetCoords {
    cx: f64,
    cy: f64,
    rad: f64,
}

impl NetCoords {
    /// Pixel position of unit-net coordinates.
    pub fn px(&self, (x, y): (f64, f64)) -> (i32, i32) {
        ((self.cx + x * self.rad).round() as i32, (self.cy - y * self.rad).round() as i32)
    }
    /// Draw one direction as a circle marker: filled when pointing down, open when up.
    pub fn marker<DB: DrawingBackend>(
        &self,
        area: &DrawingArea<DB, Shift>,
        d: Direction,
        color: RGBColor,
        size: i32,
    ) -> Result<(), String> {
        let p = self.px(project(d));
        if d.inc >= 0.0 {
            area.draw(&Circle::new(p, size, color.filled())).map_err(de)?;
        } else {
            area.draw(&Circle::new(p, size, theme::PAPER.filled())).map_err(de)?;
            area.draw(&Circle::new(p, size, color.stroke_width(2))).map_err(de)?;
        }
        Ok(())
    }
    /// Draw the great circle of pole `pole`: its lower-hemisphere half solid, its upper half dashed
    /// (thinner and lighter), split at the horizon ([`great_circle_halves`]).
    pub fn great_circle<DB: DrawingBackend>(
        &self,
        area: &DrawingArea<DB, Shift>,
        pole: Direction,
        color: RGBColor,
    ) -> Result<(), String> {
        let h = great_circle_halves(pole, 90);
        let solid: Vec<(i32, i32)> = project_all(&h.lower).into_iter().map(|p| self.px(p)).collect();
        area.draw(&PathElement::new(solid, color.stroke_width(2))).map_err(de)?;
        // Dashes of 7 px with gaps of 5 px, measured on the net.
        for dash in dashes(&project_all(&h.upper), 7.0 / self.rad, 5.0 / self.rad) {
            let pts: Vec<(i32, i32)> = dash.into_iter().map(|p| self.px(p)).collect();
            area.draw(&PathElement::new(pts, color.mix(0.8).stroke_width(1))).map_err(de)?;
        }
        Ok(())
    }
    /// Draw a path of directions (a small or great circle): solid on the lower hemisphere, thin on the upper.
    pub fn curve<DB: DrawingBackend>(
        &self,
        area: &DrawingArea<DB, Shift>,
        pts: &[Direction],
        color: RGBColor,
    ) -> Result<(), String> {
        let mut run: Vec<(i32, i32)> = Vec::new();
        let mut down = pts.first().map(|d| d.inc >= 0.0).unwrap_or(true);
        let flush = |run: &mut Vec<(i32, i32)>, down: bool| -> Result<(), String> {
            if run.len() > 1 {
                let style = if down { color.stroke_width(2) } else { color.mix(0.55).stroke_width(1) };
                area.draw(&PathElement::new(run.clone(), style)).map_err(de)?;
            }
            run.clear();
            Ok(())
        };
        for d in pts {
            let is_down = d.inc >= 0.0;
            if is_down != down {
                flush(&mut run, down)?;
                down = is_down;
            }
            run.push(self.px(project(*d)));
        }
        flush(&mut run, down)
    }
}

impl Figure for EqualAreaPlot {
    fn size(&self) -> (u32, u32) {
        (860, 640)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let (left, right) = root.split_horizontally(620);
        let title_font = (theme::FONT, 18).into_font().color(&theme::INK);
        left.draw(&Text::new(self.title.clone(), (16, 10), title_font)).map_err(de)?;
        let net_area = left.margin(30, 0, 0, 0);
        let nc = draw_net(&net_area)?;
        for (gi, g) in self.groups.iter().enumerate() {
            let color = theme::series(gi);
            for pole in &g.circles {
                nc.great_circle(&net_area, *pole, color)?;
            }
            for d in &g.points {
                nc.marker(&net_area, *d, color, 4)?;
            }
            if let Some((m, cone)) = g.mean {
                if let Some(a) = cone.filter(|a| *a > 0.0 && *a < 90.0) {
                    nc.curve(&net_area, &small_circle(m, a, 180), color)?;
                }
                let p = nc.px(project(m));
                let style = if m.inc >= 0.0 { color.filled() } else { theme::PAPER.filled() };
                net_area.draw(&Rectangle::new([(p.0 - 6, p.1 - 6), (p.0 + 6, p.1 + 6)], style)).map_err(de)?;
                net_area
                    .draw(&Rectangle::new([(p.0 - 6, p.1 - 6), (p.0 + 6, p.1 + 6)], theme::INK.stroke_width(1)))
                    .map_err(de)?;
            }
        }
        // Legend, drawn by hand on the right.
        let font = (theme::FONT, 13).into_font().color(&theme::INK);
        let mut y = 50;
        let shown = self.groups.len().min(24);
        for (gi, g) in self.groups.iter().take(shown).enumerate() {
            right.draw(&Circle::new((14, y + 7), 5, theme::series(gi).filled())).map_err(de)?;
            let cone =
                g.mean.and_then(|m| m.1).map(|a| format!(" ({} {:.1}°)", self.cone_label, a)).unwrap_or_default();
            let n = match g.circles.len() {
                0 => format!("n={}", g.points.len()),
                c => format!("n={} ({} lines, {} circles)", g.points.len() + c, g.points.len(), c),
            };
            right.draw(&Text::new(format!("{} {}{}", g.label, n, cone), (26, y), font.clone())).map_err(de)?;
            y += 20;
        }
        if self.groups.len() > shown {
            right
                .draw(&Text::new(format!("… and {} more groups", self.groups.len() - shown), (26, y), font.clone()))
                .map_err(de)?;
            y += 20;
        }
        y += 14;
        let small = (theme::FONT, 12).into_font().color(&theme::INK);
        right.draw(&Circle::new((14, y + 6), 4, theme::INK.filled())).map_err(de)?;
        right.draw(&Text::new("filled: lower hemisphere (down)", (26, y), small.clone())).map_err(de)?;
        y += 18;
        right.draw(&Circle::new((14, y + 6), 4, theme::INK.stroke_width(2))).map_err(de)?;
        right.draw(&Text::new("open: upper hemisphere (up)", (26, y), small.clone())).map_err(de)?;
        y += 18;
        right.draw(&Rectangle::new([(9, y + 1), (19, y + 11)], theme::INK.stroke_width(1))).map_err(de)?;
        let circles = self.groups.iter().any(|g| !g.circles.is_empty());
        right
            .draw(&Text::new(format!("square: mean, ring: {}", self.cone_label), (26, y), small.clone()))
            .map_err(de)?;
        y += 18;
        if circles {
            right.draw(&Text::new("(mean of lines and circles)", (26, y), small.clone())).map_err(de)?;
            y += 18;
            right.draw(&PathElement::new(vec![(6, y + 6), (22, y + 6)], theme::INK.stroke_width(2))).map_err(de)?;
            right.draw(&Text::new("great circle, lower half", (26, y), small.clone())).map_err(de)?;
            y += 18;
            for x in [6, 15] {
                right
                    .draw(&PathElement::new(vec![(x, y + 6), (x + 5, y + 6)], theme::INK.stroke_width(1)))
                    .map_err(de)?;
            }
            right.draw(&Text::new("great circle, upper half", (26, y), small.clone())).map_err(de)?;
            y += 18;
        }
        right.draw(&Text::new("equal-area projection", (26, y), small)).map_err(de)?;
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn small_circle_points_are_at_the_radius() {
        let c = Direction { dec: 20.0, inc: 60.0 };
        for d in small_circle(c, 12.5, 36) {
            assert_abs_diff_eq!(d.angle_to(c), 12.5, epsilon = 1e-9);
        }
    }
}
