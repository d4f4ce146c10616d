//! VGPs and their mean pole on an azimuthal equal-area map centred on the mean pole, with a graticule.

use super::render::{de, Figure};
use super::theme;
use crate::sphere::GeoPoint;
use plotters::coord::Shift;
use plotters::prelude::*;

/// Draws one key symbol on an area at a pixel position.
type KeySymbol<'a, DB> = dyn Fn(&DrawingArea<DB, Shift>, (i32, i32)) -> Result<(), String> + 'a;

/// One VGP on the map.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MappedVgp {
    /// The pole as used for averaging.
    pub pole: GeoPoint,
    /// Kept by the cutoff (false: drawn as a removed pole).
    pub kept: bool,
    /// Replaced by its antipode to align its polarity with the others.
    pub flipped: bool,
}

/// VGPs, the paleopole and its A95 circle.
#[derive(Debug, Clone, PartialEq)]
pub struct PolePlot {
    /// Title above the map.
    pub title: String,
    /// Centre of the projection (normally the paleopole).
    pub centre: GeoPoint,
    /// The VGPs.
    pub vgps: Vec<MappedVgp>,
    /// The mean pole and its A95 (degrees), if any.
    pub mean: Option<(GeoPoint, Option<f64>)>,
    /// Cutoff circle: its centre (the mean pole of the scatter) and angle, degrees; drawn dashed.
    pub cutoff: Option<(GeoPoint, f64)>,
}

/// Map coordinates (unit radius at `rim_deg` from the centre) of a point.
///
/// # Formula
/// Lambert azimuthal equal-area about the centre: ρ = distance from the centre, α = azimuth from it;
/// r = sin(ρ/2)/sin(ρ_rim/2), x = r sin α, y = r cos α. Centred on the geographic north pole this puts
/// 0°E at the bottom and 90°E on the right.
///
/// # References
/// Snyder (1987), *Map Projections — A Working Manual*, USGS PP 1395, §24.
pub fn pole_map_xy(centre: GeoPoint, p: GeoPoint, rim_deg: f64) -> (f64, f64) {
    let (rho, az) = centre.distance_azimuth(p);
    let r = (rho.to_radians() / 2.0).sin() / (rim_deg.to_radians() / 2.0).sin();
    let a = az.to_radians();
    (r * a.sin(), r * a.cos())
}

struct Map {
    centre: GeoPoint,
    rim: f64,
    cx: f64,
    cy: f64,
    rad: f64,
}

impl Map {
    fn inside(&self, p: GeoPoint) -> bool {
        self.centre.distance_azimuth(p).0 <= self.rim + 1e-9
    }
    fn px(&self, p: GeoPoint) -> (i32, i32) {
        let (x, y) = pole_map_xy(self.centre, p, self.rim);
        ((self.cx + x * self.rad).round() as i32, (self.cy - y * self.rad).round() as i32)
    }
    /// Draw a polyline of points, broken where it leaves the map.
    fn line<DB: DrawingBackend>(
        &self,
        area: &DrawingArea<DB, Shift>,
        pts: &[GeoPoint],
        style: ShapeStyle,
        dashed: bool,
    ) -> Result<(), String> {
        let mut run: Vec<(i32, i32)> = Vec::new();
        let flush = |run: &mut Vec<(i32, i32)>| -> Result<(), String> {
            if run.len() > 1 {
                if dashed {
                    for (i, seg) in run.windows(2).enumerate() {
                        if i % 2 == 0 {
                            area.draw(&PathElement::new(seg.to_vec(), style)).map_err(de)?;
                        }
                    }
                } else {
                    area.draw(&PathElement::new(run.clone(), style)).map_err(de)?;
                }
            }
            run.clear();
            Ok(())
        };
        for p in pts {
            if self.inside(*p) {
                run.push(self.px(*p));
            } else {
                flush(&mut run)?;
            }
        }
        flush(&mut run)
    }
}

fn ring(centre: GeoPoint, radius: f64, n: usize) -> Vec<GeoPoint> {
    (0..=n).map(|k| centre.destination(360.0 * k as f64 / n as f64, radius)).collect()
}

/// Angular radius of the map: 90° unless some VGP lies farther from the centre, then the next multiple
/// of 30° beyond it (at most 180°).
pub fn pole_map_rim(centre: GeoPoint, pts: impl IntoIterator<Item = GeoPoint>) -> f64 {
    let far = pts.into_iter().map(|p| centre.distance_azimuth(p).0).fold(0.0, f64::max);
    if far <= 85.0 {
        90.0
    } else {
        (((far + 5.0) / 30.0).ceil() * 30.0).min(180.0)
    }
}

impl Figure for PolePlot {
    fn size(&self) -> (u32, u32) {
        (900, 660)
    }
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let (left, right) = root.split_horizontally(640);
        let title_font = (theme::FONT, 18).into_font().color(&theme::INK);
        left.draw(&Text::new(self.title.clone(), (16, 10), title_font)).map_err(de)?;
        let area = left.margin(36, 0, 0, 0);
        let (w, h) = area.dim_in_pixel();
        let rim = pole_map_rim(self.centre, self.vgps.iter().map(|v| v.pole));
        let m = Map {
            centre: self.centre,
            rim,
            cx: w as f64 / 2.0,
            cy: h as f64 / 2.0,
            rad: (w.min(h) as f64) / 2.0 - 36.0,
        };
        // Graticule: parallels every 30 deg, meridians every 30 deg; the rim.
        let guide = theme::GUIDE.stroke_width(1);
        for lat in [-60.0, -30.0, 0.0, 30.0, 60.0] {
            let pts: Vec<GeoPoint> = (0..=360).map(|k| GeoPoint { lat, lon: k as f64 }).collect();
            m.line(&area, &pts, guide, false)?;
        }
        let label = (theme::FONT, 11).into_font().color(&theme::GUIDE.mix(1.0));
        for k in 0..12 {
            let lon = 30.0 * k as f64;
            let pts: Vec<GeoPoint> = (0..=180).map(|j| GeoPoint { lat: 90.0 - j as f64, lon }).collect();
            m.line(&area, &pts, guide, false)?;
            // Label the meridian where it last lies on the map, toward the rim.
            if let Some(p) = pts.iter().rev().find(|p| m.inside(**p) && m.centre.distance_azimuth(**p).0 > rim - 12.0) {
                let (x, y) = m.px(*p);
                let text = if lon == 0.0 || lon == 180.0 {
                    format!("{lon:.0}°")
                } else if lon < 180.0 {
                    format!("{lon:.0}°E")
                } else {
                    format!("{:.0}°W", 360.0 - lon)
                };
                area.draw(&Text::new(text, (x + 3, y - 6), label.clone())).map_err(de)?;
            }
        }
        let rim_pts: Vec<(i32, i32)> = (0..=360)
            .map(|k| {
                let a = (k as f64).to_radians();
                ((m.cx + m.rad * a.sin()).round() as i32, (m.cy - m.rad * a.cos()).round() as i32)
            })
            .collect();
        area.draw(&PathElement::new(rim_pts, theme::INK.stroke_width(2))).map_err(de)?;
        // Geographic poles, where on the map.
        let small = (theme::FONT, 12).into_font().color(&theme::INK);
        for (lat, name) in [(90.0, "N"), (-90.0, "S")] {
            let g = GeoPoint { lat, lon: 0.0 };
            if m.inside(g) {
                let p = m.px(g);
                area.draw(&Cross::new(p, 5, theme::INK.stroke_width(1))).map_err(de)?;
                area.draw(&Text::new(name, (p.0 + 6, p.1 + 2), small.clone())).map_err(de)?;
            }
        }
        let kept_col = theme::series(0);
        let mean_col = theme::series(4);
        if let Some((cp, c)) = self.cutoff {
            m.line(&area, &ring(cp, c, 240), theme::series(1).stroke_width(1), true)?;
        }
        for v in &self.vgps {
            if !m.inside(v.pole) {
                continue;
            }
            let p = m.px(v.pole);
            if !v.kept {
                area.draw(&Cross::new(p, 4, theme::INTERMEDIATE.stroke_width(2))).map_err(de)?;
            } else if v.flipped {
                area.draw(&Circle::new(p, 4, theme::PAPER.filled())).map_err(de)?;
                area.draw(&Circle::new(p, 4, kept_col.stroke_width(2))).map_err(de)?;
            } else {
                area.draw(&Circle::new(p, 4, kept_col.filled())).map_err(de)?;
            }
        }
        if let Some((mp, a95)) = self.mean {
            if let Some(a) = a95.filter(|a| *a > 0.0 && *a < 90.0) {
                m.line(&area, &ring(mp, a, 240), mean_col.stroke_width(2), false)?;
            }
            let p = m.px(mp);
            let diamond = vec![(p.0, p.1 - 8), (p.0 + 8, p.1), (p.0, p.1 + 8), (p.0 - 8, p.1)];
            area.draw(&Polygon::new(diamond.clone(), mean_col.filled())).map_err(de)?;
            let mut outline = diamond;
            outline.push((p.0, p.1 - 8));
            area.draw(&PathElement::new(outline, theme::INK.stroke_width(1))).map_err(de)?;
        }
        // Key, drawn by hand.
        let mut y = 54;
        let mut key = |draw: &KeySymbol<'_, DB>, text: String| -> Result<(), String> {
            draw(&right, (16, y + 7))?;
            right.draw(&Text::new(text, (32, y), small.clone())).map_err(de)?;
            y += 22;
            Ok(())
        };
        let n_kept = self.vgps.iter().filter(|v| v.kept && !v.flipped).count();
        let n_flip = self.vgps.iter().filter(|v| v.kept && v.flipped).count();
        let n_out = self.vgps.iter().filter(|v| !v.kept).count();
        key(&|a, p| a.draw(&Circle::new(p, 4, kept_col.filled())).map_err(de), format!("VGP ({n_kept})"))?;
        if n_flip > 0 {
            key(
                &|a, p| {
                    a.draw(&Circle::new(p, 4, theme::PAPER.filled())).map_err(de)?;
                    a.draw(&Circle::new(p, 4, kept_col.stroke_width(2))).map_err(de)
                },
                format!("VGP mapped from the south ({n_flip})"),
            )?;
        }
        if n_out > 0 {
            key(
                &|a, p| a.draw(&Cross::new(p, 4, theme::INTERMEDIATE.stroke_width(2))).map_err(de),
                format!("outside the cutoff ({n_out})"),
            )?;
        }
        if let Some((_, a95)) = self.mean {
            let txt = a95.map(|a| format!("paleopole, A95 {a:.1}°")).unwrap_or_else(|| "paleopole".into());
            key(
                &|a, p| {
                    a.draw(&Polygon::new(
                        vec![(p.0, p.1 - 7), (p.0 + 7, p.1), (p.0, p.1 + 7), (p.0 - 7, p.1)],
                        mean_col.filled(),
                    ))
                    .map_err(de)
                },
                txt,
            )?;
        }
        if let Some((_, c)) = self.cutoff {
            key(
                &|a, p| {
                    a.draw(&PathElement::new(vec![(p.0 - 8, p.1), (p.0 - 2, p.1)], theme::series(1).stroke_width(1)))
                        .map_err(de)
                },
                format!("cutoff {c:.1}° about the mean"),
            )?;
        }
        y += 8;
        for line in [
            "azimuthal equal-area map".to_string(),
            format!("centred on {:.1}°, {:.1}°E", self.centre.lat, self.centre.lon),
            format!("rim {rim:.0}° from the centre; graticule 30°"),
        ] {
            right.draw(&Text::new(line, (16, y), small.clone())).map_err(de)?;
            y += 18;
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn north_polar_view_and_equal_area_radius() {
        let np = GeoPoint::new(90.0, 0.0).unwrap();
        // 0E at the bottom, 90E on the right (the usual polar view).
        let (x, y) = pole_map_xy(np, GeoPoint::new(0.0, 0.0).unwrap(), 90.0);
        assert_abs_diff_eq!(x, 0.0, epsilon = 1e-12);
        assert_abs_diff_eq!(y, -1.0, epsilon = 1e-12);
        let (x, _) = pole_map_xy(np, GeoPoint::new(0.0, 90.0).unwrap(), 90.0);
        assert_abs_diff_eq!(x, 1.0, epsilon = 1e-12);
        // Equal area (Snyder 1987, §24): the area inside radius r is proportional to the cap area 1 - cos(rho).
        for rho in [10.0f64, 45.0, 80.0] {
            let (x, y) = pole_map_xy(np, GeoPoint::new(90.0 - rho, 33.0).unwrap(), 90.0);
            assert_abs_diff_eq!(
                x * x + y * y,
                (1.0 - rho.to_radians().cos()) / (1.0 - 90f64.to_radians().cos()),
                epsilon = 1e-12
            );
        }
        assert_eq!(pole_map_rim(np, [GeoPoint::new(10.0, 0.0).unwrap()]), 90.0);
        assert_eq!(pole_map_rim(np, [GeoPoint::new(-40.0, 0.0).unwrap()]), 150.0);
        assert_eq!(pole_map_rim(np, [GeoPoint::new(-90.0, 0.0).unwrap()]), 180.0);
    }
}
