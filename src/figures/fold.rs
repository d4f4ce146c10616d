//! Figure of the bootstrap fold test: τ₁ against untilting for a sample of resamples, and the
//! cumulative distribution of the untilting at which each resample peaks.

use super::render::{de, Figure};
use super::theme;
use crate::fieldtests::FoldTest;
use plotters::coord::types::RangedCoordf64;
use plotters::coord::Shift;
use plotters::prelude::*;

/// The two-panel fold-test figure.
#[derive(Debug, Clone, PartialEq)]
pub struct FoldPlot {
    /// Title.
    pub title: String,
    /// Untilting steps, percent.
    pub steps: Vec<f64>,
    /// τ₁ of the data at each step.
    pub data_curve: Vec<f64>,
    /// τ₁ curves of some resamples.
    pub curves: Vec<Vec<f64>>,
    /// Sorted best untilting of every resample.
    pub maxima: Vec<f64>,
    /// Interval bounds, percent.
    pub ci: (f64, f64),
    /// Verdict text.
    pub verdict: String,
}

impl FoldPlot {
    /// Build the figure from a finished test.
    pub fn from_test(t: &FoldTest, name: String) -> Self {
        FoldPlot {
            title: format!("{name}: fold test, {} directions", t.n),
            steps: t.steps.clone(),
            data_curve: t.data_curve.clone(),
            curves: t.curves.clone(),
            maxima: t.maxima.clone(),
            ci: (t.ci_low, t.ci_high),
            verdict: t.verdict.name().to_string(),
        }
    }
}

type Chart<'a, DB> = ChartContext<'a, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>;

/// One panel: caption, axes with integer untilting labels, and guides at 0 % and 100 %.
fn panel<'a, DB: DrawingBackend>(
    area: &'a DrawingArea<DB, Shift>,
    caption: &str,
    x: (f64, f64),
    y: (f64, f64),
    desc: (&str, &str),
) -> Result<Chart<'a, DB>, String> {
    let mut c = ChartBuilder::on(area)
        .margin(10)
        .caption(caption, (theme::FONT, 14))
        .x_label_area_size(36)
        .y_label_area_size(52)
        .build_cartesian_2d(x.0..x.1, y.0..y.1)
        .map_err(de)?;
    c.configure_mesh()
        .disable_mesh()
        .x_desc(desc.0)
        .y_desc(desc.1)
        .x_label_formatter(&|v| format!("{v:.0}"))
        .label_style((theme::FONT, 12))
        .axis_desc_style((theme::FONT, 13))
        .draw()
        .map_err(de)?;
    for g in [0.0, 100.0] {
        c.draw_series(LineSeries::new([(g, y.0), (g, y.1)], theme::GUIDE.stroke_width(1))).map_err(de)?;
    }
    Ok(c)
}

impl Figure for FoldPlot {
    fn size(&self) -> (u32, u32) {
        (1000, 460)
    }

    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), String> {
        root.fill(&theme::PAPER).map_err(de)?;
        let title_font = (theme::FONT, 18).into_font().color(&theme::INK);
        root.draw(&Text::new(self.title.clone(), (16, 10), title_font)).map_err(de)?;
        let body = root.margin(40, 8, 8, 8);
        let (left, right) = body.split_horizontally(500);
        let (x0, x1) = (self.steps.first().copied().unwrap_or(-10.0), self.steps.last().copied().unwrap_or(150.0));
        let all = self.curves.iter().flatten().chain(self.data_curve.iter());
        let (lo, hi) = all.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &x| (a.min(x), b.max(x)));
        let (lo, hi) =
            if lo.is_finite() && hi > lo { (lo - 0.02 * (hi - lo), hi + 0.02 * (hi - lo)) } else { (0.3, 1.0) };
        let mut c =
            panel(&left, "largest eigenvalue τ1 against untilting", (x0, x1), (lo, hi), ("untilting (%)", "τ1"))?;
        for curve in &self.curves {
            c.draw_series(LineSeries::new(
                self.steps.iter().copied().zip(curve.iter().copied()),
                theme::series(1).mix(0.45).stroke_width(1),
            ))
            .map_err(de)?;
        }
        c.draw_series(LineSeries::new(
            self.steps.iter().copied().zip(self.data_curve.iter().copied()),
            theme::INK.stroke_width(3),
        ))
        .map_err(de)?
        .label("data")
        .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], theme::INK.stroke_width(3)));
        c.draw_series(std::iter::once(PathElement::new(vec![(x0, lo), (x0, lo)], theme::series(1).stroke_width(1))))
            .map_err(de)?
            .label(format!("{} resamples", self.curves.len()))
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], theme::series(1).stroke_width(1)));
        c.configure_series_labels()
            .position(SeriesLabelPosition::LowerRight)
            .background_style(theme::PAPER.mix(0.9))
            .border_style(theme::GUIDE)
            .label_font((theme::FONT, 12))
            .draw()
            .map_err(de)?;

        let mut d = panel(
            &right,
            "share of resamples peaking at or below",
            (x0, x1),
            (0.0, 1.0),
            ("untilting at the peak (%)", "cumulative share"),
        )?;
        let m = self.maxima.len().max(1) as f64;
        let mut pts = vec![(x0, 0.0)];
        for (i, x) in self.maxima.iter().enumerate() {
            pts.push((*x, i as f64 / m));
            pts.push((*x, (i + 1) as f64 / m));
        }
        pts.push((x1, 1.0));
        d.draw_series(LineSeries::new(pts, theme::series(0).stroke_width(2))).map_err(de)?;
        for x in [self.ci.0, self.ci.1] {
            d.draw_series(DashedLineSeries::new([(x, 0.0), (x, 1.0)], 6, 4, theme::INK.stroke_width(1))).map_err(de)?;
        }
        let font = (theme::FONT, 13).into_font().color(&theme::INK);
        right
            .draw(&Text::new(
                format!("interval {:.0} to {:.0} %: {}", self.ci.0, self.ci.1, self.verdict),
                (150, 330),
                font,
            ))
            .map_err(de)?;
        Ok(())
    }
}
