//! The moment-decay panel of a specimen figure (remaining moment, normalised to the first step,
//! against step), and a label placer that never lets two labels overlap.

use super::render::de;
use super::theme;
use crate::demag::SpecimenFit;
use crate::sphere::Vec3;
use plotters::coord::Shift;
use plotters::prelude::*;

/// Approximate width of one character at `size` px of the embedded sans-serif font.
fn char_width(size: u32) -> i32 {
    (size as i32 * 6 + 9) / 10
}

/// Where to put each label, or `None` where none fits.
///
/// Each label is tried at four places around its point (upper right, lower right, upper left,
/// lower left) and kept at the first place whose box lies inside `bounds` and overlaps no label
/// already placed; labels are considered in order, so the first and the last labels should come
/// first in `order` if they matter most.
pub fn place_labels(
    points: &[(i32, i32)],
    texts: &[String],
    size: u32,
    bounds: (i32, i32),
    order: &[usize],
) -> Vec<Option<(i32, i32)>> {
    let h = size as i32 + 2;
    let mut boxes: Vec<[i32; 4]> = Vec::new();
    let mut out = vec![None; points.len()];
    for &i in order {
        let (x, y) = points[i];
        let w = char_width(size) * texts[i].chars().count() as i32 + 2;
        for (dx, dy) in [(6, -h - 3), (6, 4), (-w - 6, -h - 3), (-w - 6, 4)] {
            let b = [x + dx, y + dy, x + dx + w, y + dy + h];
            let inside = b[0] >= 0 && b[1] >= 0 && b[2] <= bounds.0 && b[3] <= bounds.1;
            if inside && !boxes.iter().any(|o| b[0] < o[2] && o[0] < b[2] && b[1] < o[3] && o[1] < b[3]) {
                boxes.push(b);
                out[i] = Some((b[0], b[1]));
                break;
            }
        }
    }
    out
}

/// First, last, then the others in step order: the ends of the demagnetization matter most.
pub fn label_order(n: usize) -> Vec<usize> {
    let mut v: Vec<usize> = Vec::with_capacity(n);
    if n > 0 {
        v.push(0);
    }
    if n > 1 {
        v.push(n - 1);
    }
    v.extend(1..n.saturating_sub(1));
    v
}

/// Draw the decay of |M|/|M₀| against step, with the fitted ranges shaded.
pub fn draw_decay<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    steps: &[(f64, Vec3)],
    fits: &[SpecimenFit],
    unit: &str,
    label: impl Fn(f64) -> String,
) -> Result<(), String> {
    let (w, h) = area.dim_in_pixel();
    let (w, h) = (w as i32, h as i32);
    let (l, r, t, b) = (56, 16, 30, 48);
    let m0 = steps.first().map_or(1.0, |s| s.1.norm());
    let m0 = if m0 > 0.0 { m0 } else { 1.0 };
    let top = steps.iter().map(|s| s.1.norm() / m0).fold(1.0f64, f64::max);
    let (s0, s1) = (steps.first().map_or(0.0, |s| s.0), steps.last().map_or(1.0, |s| s.0));
    let span = if s1 > s0 { s1 - s0 } else { 1.0 };
    let px = |s: f64, v: f64| -> (i32, i32) {
        (
            l + ((s - s0) / span * (w - l - r) as f64).round() as i32,
            h - b - (v / top * (h - t - b) as f64).round() as i32,
        )
    };
    let font = (theme::FONT, 13).into_font().color(&theme::INK);
    area.draw(&Text::new("moment decay, |M| / |M₀|", (l, 6), font.clone())).map_err(de)?;
    for f in fits {
        let (a, c) = (px(f.from, top), px(f.to, 0.0));
        area.draw(&Rectangle::new([a, (c.0.max(a.0 + 2), c.1)], theme::series(2).mix(0.15).filled())).map_err(de)?;
    }
    let axis = theme::INK.stroke_width(1);
    area.draw(&PathElement::new(vec![px(s0, top), px(s0, 0.0), px(s1, 0.0)], axis)).map_err(de)?;
    let small = (theme::FONT, 11).into_font().color(&theme::INK);
    for v in [0.0, 0.5, 1.0] {
        let p = px(s0, v);
        area.draw(&Text::new(format!("{v:.1}"), (p.0 - 30, p.1 - 6), small.clone())).map_err(de)?;
    }
    let axis_label = if unit.is_empty() { "step".to_string() } else { format!("step ({unit})") };
    area.draw(&Text::new(axis_label, (l + (w - l - r) / 2 - 30, h - 22), font)).map_err(de)?;
    let pts: Vec<(i32, i32)> = steps.iter().map(|(s, v)| px(*s, v.norm() / m0)).collect();
    area.draw(&PathElement::new(pts.clone(), theme::series(0).stroke_width(2))).map_err(de)?;
    for p in &pts {
        area.draw(&Circle::new(*p, 4, theme::series(0).filled())).map_err(de)?;
    }
    let texts: Vec<String> = steps.iter().map(|s| label(s.0)).collect();
    for (i, at) in place_labels(&pts, &texts, 11, (w, h), &label_order(pts.len())).into_iter().enumerate() {
        if let Some(at) = at {
            area.draw(&Text::new(texts[i].clone(), at, small.clone())).map_err(de)?;
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn labels_never_overlap_even_when_points_crowd() {
        // Forty points packed into a small box, most of them too close for all labels.
        let pts: Vec<(i32, i32)> = (0..40).map(|i| (50 + (i % 7) * 9, 60 + (i / 7) * 5)).collect();
        let texts: Vec<String> = (0..40).map(|i| format!("{}", i * 25)).collect();
        let placed = place_labels(&pts, &texts, 11, (300, 200), &label_order(40));
        let boxes: Vec<[i32; 4]> = placed
            .iter()
            .enumerate()
            .filter_map(|(i, p)| p.map(|(x, y)| [x, y, x + char_width(11) * texts[i].len() as i32 + 2, y + 13]))
            .collect();
        assert!(boxes.len() >= 2 && placed[0].is_some() && placed[39].is_some(), "the ends are labelled");
        assert!(boxes.len() < 40, "some labels are left out");
        for (i, a) in boxes.iter().enumerate() {
            for c in &boxes[i + 1..] {
                assert!(!(a[0] < c[2] && c[0] < a[2] && a[1] < c[3] && c[1] < a[3]), "{a:?} overlaps {c:?}");
            }
            assert!(a[0] >= 0 && a[1] >= 0 && a[2] <= 300 && a[3] <= 200);
        }
    }
}
