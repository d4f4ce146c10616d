//! The polarity-column figure: VGP latitude against position, the polarity column, and (optionally) the
//! time scale with tie lines for one correlation candidate.
//!
//! Fill convention of the trade: black normal, white reversed, grey intermediate or single-level.

use super::render::{de, Figure};
use super::theme;
use crate::model::{Chron, Polarity, StratAxis, TimeScale};
use crate::strat::{Candidate, LevelSet, Magnetozone, ZoneColumn, ZonePolarity};
use plotters::coord::Shift;
use plotters::prelude::*;

/// The time-scale panel with the ties of one candidate.
#[derive(Debug, Clone, PartialEq)]
pub struct ScalePanel {
    /// Chrons shown (youngest first).
    pub chrons: Vec<Chron>,
    /// Tie lines: (position in m, age in Ma).
    pub ties: Vec<(f64, f64)>,
    /// Label of the candidate (e.g. "candidate 1").
    pub label: String,
}

impl ScalePanel {
    /// The panel of one correlation candidate: the chrons its age model spans (with 0.05 Myr on
    /// either side) and its ties. Used by `correlate --plot` and by `section`, so both show the
    /// same window.
    pub fn of_candidate(chrons: &[Chron], candidate: &crate::strat::Candidate, label: &str) -> Self {
        let (y0, y1) = candidate
            .age_model
            .iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(x, y), p| (x.min(p.age), y.max(p.age)));
        ScalePanel {
            chrons: chrons.iter().filter(|c| c.old > y0 - 0.05 && c.young < y1 + 0.05).cloned().collect(),
            ties: candidate.ties.iter().map(|t| (t.position, t.age)).collect(),
            label: label.into(),
        }
    }
}

/// A polarity-column figure.
#[derive(Debug, Clone, PartialEq)]
pub struct ColumnFigure {
    /// Title.
    pub title: String,
    /// Height or depth.
    pub axis: StratAxis,
    /// Zones (any order).
    pub zones: Vec<Magnetozone>,
    /// Levels as (position, VGP latitude), if known.
    pub levels: Vec<(f64, f64)>,
    /// VGP-latitude threshold drawn as guides, degrees.
    pub threshold: Option<f64>,
    /// Optional time-scale panel.
    pub scale: Option<ScalePanel>,
}

impl ColumnFigure {
    /// The figure of a zoned section (as `column --plot` draws it): the levels' VGP latitudes with the
    /// threshold guides, and the magnetozones.
    pub fn of_column(title: String, set: &LevelSet, col: &ZoneColumn, threshold: f64) -> Self {
        ColumnFigure {
            title,
            axis: set.axis,
            zones: col.zones.clone(),
            levels: set.levels.iter().map(|l| (l.position, l.vgp_lat)).collect(),
            threshold: Some(threshold),
            scale: None,
        }
    }

    /// The figure of a correlation (as `correlate --plot` draws it): the column beside the chrons of the
    /// time scale that the candidate's age model spans (with 0.05 Myr beyond each end), and its ties.
    /// `levels` are (position, VGP latitude), empty when the column came from a zones table.
    pub fn of_correlation(
        title: String,
        col: &ZoneColumn,
        levels: Vec<(f64, f64)>,
        threshold: f64,
        ts: &TimeScale,
        candidate: &Candidate,
    ) -> Self {
        ColumnFigure {
            title,
            axis: col.axis,
            zones: col.zones.clone(),
            levels,
            threshold: Some(threshold),
            scale: Some(ScalePanel::of_candidate(&ts.chrons, candidate, &format!("candidate {}", candidate.rank))),
        }
    }
}

fn fill(z: &Magnetozone) -> RGBColor {
    match (z.polarity, z.confirmed) {
        (ZonePolarity::Intermediate, _) | (_, false) => theme::INTERMEDIATE,
        (ZonePolarity::Normal, true) => theme::NORMAL,
        (ZonePolarity::Reversed, true) => theme::REVERSED,
    }
}

impl Figure for ColumnFigure {
    fn size(&self) -> (u32, u32) {
        (if self.scale.is_some() { 860 } else { 620 }, 720)
    }

    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let (top, bottom) = (60.0, 680.0);
        let lo = self.zones.iter().map(|z| z.base.low.min(z.top.low)).fold(f64::INFINITY, f64::min);
        let hi = self.zones.iter().map(|z| z.base.high.max(z.top.high)).fold(f64::NEG_INFINITY, f64::max);
        let span = if hi > lo { hi - lo } else { 1.0 };
        // Height grows upward on the page; depth grows downward.
        let py = |p: f64| -> i32 {
            let f = (p - lo) / span;
            let f = if self.axis == StratAxis::Height { 1.0 - f } else { f };
            (top + f * (bottom - top)).round() as i32
        };
        let font = (theme::FONT, 15).into_font().color(&theme::INK);
        let small = (theme::FONT, 12).into_font().color(&theme::INK);
        root.draw(&Text::new(self.title.clone(), (20, 18), (theme::FONT, 18).into_font().color(&theme::INK)))
            .map_err(de)?;
        // VGP latitude panel.
        let (vx0, vx1) = (80, 330);
        let vx = |lat: f64| -> i32 { vx0 + ((lat + 90.0) / 180.0 * (vx1 - vx0) as f64).round() as i32 };
        root.draw(&Rectangle::new([(vx0, top as i32), (vx1, bottom as i32)], theme::INK.stroke_width(1)))
            .map_err(de)?;
        for lat in [-90.0, -45.0, 0.0, 45.0, 90.0] {
            root.draw(&Text::new(format!("{lat:.0}"), (vx(lat) - 10, bottom as i32 + 6), small.clone())).map_err(de)?;
        }
        let guides: Vec<f64> = match self.threshold {
            Some(t) => vec![-t, 0.0, t],
            None => vec![0.0],
        };
        for g in guides {
            root.draw(&PathElement::new(
                vec![(vx(g), top as i32), (vx(g), bottom as i32)],
                theme::GUIDE.stroke_width(1),
            ))
            .map_err(de)?;
        }
        root.draw(&Text::new("VGP latitude (°)", (vx0 + 70, bottom as i32 + 22), font.clone())).map_err(de)?;
        let mut pts: Vec<(f64, f64)> = self.levels.clone();
        pts.sort_by(|a, b| a.0.total_cmp(&b.0));
        let px: Vec<(i32, i32)> = pts.iter().map(|&(p, l)| (vx(l), py(p))).collect();
        root.draw(&PathElement::new(px.clone(), theme::series(0).stroke_width(1))).map_err(de)?;
        for p in px {
            root.draw(&Circle::new(p, 3, theme::series(0).filled())).map_err(de)?;
        }
        // Position axis labels.
        for k in 0..=5 {
            let p = lo + span * k as f64 / 5.0;
            root.draw(&Text::new(format!("{p:.1}"), (vx0 - 50, py(p) - 7), small.clone())).map_err(de)?;
        }
        let axis_label = match self.axis {
            StratAxis::Height => "height (m)",
            StratAxis::Depth => "depth (m)",
        };
        root.draw(&Text::new(axis_label, (10, 40), font.clone())).map_err(de)?;
        // Polarity column.
        let (cx0, cx1) = (370, 420);
        for z in &self.zones {
            let (a, b) = (py(z.base.mid), py(z.top.mid));
            root.draw(&Rectangle::new([(cx0, a.min(b)), (cx1, a.max(b))], fill(z).filled())).map_err(de)?;
            root.draw(&Rectangle::new([(cx0, a.min(b)), (cx1, a.max(b))], theme::INK.stroke_width(1))).map_err(de)?;
        }
        root.draw(&Text::new("polarity", (cx0 - 8, 40), font.clone())).map_err(de)?;
        // Time scale and ties.
        if let Some(sc) = &self.scale {
            let (a0, a1) =
                sc.chrons.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(x, y), c| (x.min(c.young), y.max(c.old)));
            let ay = |age: f64| -> i32 { (top + (age - a0) / (a1 - a0).max(1e-9) * (bottom - top)).round() as i32 };
            let (sx0, sx1) = (600, 650);
            for c in &sc.chrons {
                let col = if c.polarity == Polarity::Normal { theme::NORMAL } else { theme::REVERSED };
                root.draw(&Rectangle::new([(sx0, ay(c.young)), (sx1, ay(c.old))], col.filled())).map_err(de)?;
                root.draw(&Rectangle::new([(sx0, ay(c.young)), (sx1, ay(c.old))], theme::INK.stroke_width(1)))
                    .map_err(de)?;
                if let Some(n) = &c.name {
                    if ay(c.old) - ay(c.young) >= 12 {
                        root.draw(&Text::new(n.clone(), (sx1 + 8, (ay(c.young) + ay(c.old)) / 2 - 6), small.clone()))
                            .map_err(de)?;
                    }
                }
            }
            for k in 0..=5 {
                let a = a0 + (a1 - a0) * k as f64 / 5.0;
                root.draw(&Text::new(format!("{a:.2}"), (sx0 - 48, ay(a) - 7), small.clone())).map_err(de)?;
            }
            for &(p, age) in &sc.ties {
                root.draw(&PathElement::new(vec![(cx1, py(p)), (sx0, ay(age))], theme::series(1).stroke_width(1)))
                    .map_err(de)?;
            }
            root.draw(&Text::new(format!("age (Ma) — {}", sc.label), (sx0 - 40, 40), font.clone())).map_err(de)?;
        }
        Ok(())
    }
}
