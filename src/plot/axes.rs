//! A plot frame: data ranges mapped to a rectangle (pt), ticks at 1-2-5 steps, axis titles in
//! the "quantity / unit" form of ISO 80000-1 and the IUPAC Green Book, and a legend whose
//! samples are drawn with the very strokes of their series.

use super::style::INK;
use super::svg::{Anchor, Label, Stroke, Svg};
use super::text::Rich;

/// The plotting rectangle and the data ranges it shows.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Frame {
    /// Left edge (pt).
    pub left: f64,
    /// Top edge (pt).
    pub top: f64,
    pub width: f64,
    pub height: f64,
    pub x: (f64, f64),
    pub y: (f64, f64),
}

impl Frame {
    pub fn right(&self) -> f64 {
        self.left + self.width
    }

    pub fn bottom(&self) -> f64 {
        self.top + self.height
    }

    /// x in data units → pt.
    pub fn px(&self, x: f64) -> f64 {
        self.left + (x - self.x.0) / (self.x.1 - self.x.0) * self.width
    }

    /// y in data units → pt (up is smaller).
    pub fn py(&self, y: f64) -> f64 {
        self.bottom() - (y - self.y.0) / (self.y.1 - self.y.0) * self.height
    }

    /// The polyline of (x, y) data points in pt, cut where y leaves the y range (the crossing
    /// point is interpolated so curves end exactly at the frame). Non-finite values break runs.
    pub fn clipped_runs(&self, xs: &[f64], ys: &[f64]) -> Vec<Vec<(f64, f64)>> {
        let (lo, hi) = self.y;
        let mut runs: Vec<Vec<(f64, f64)>> = vec![Vec::new()];
        let inside = |y: f64| y.is_finite() && y >= lo - 1e-12 && y <= hi + 1e-12;
        for i in 0..xs.len().min(ys.len()) {
            let (x, y) = (xs[i], ys[i]);
            let prev = if i > 0 {
                Some((xs[i - 1], ys[i - 1]))
            } else {
                None
            };
            if inside(y) {
                if let Some((px, py)) = prev {
                    if py.is_finite() && !inside(py) {
                        let edge = if py > hi { hi } else { lo };
                        let t = (edge - py) / (y - py);
                        runs.last_mut()
                            .expect("a run")
                            .push((self.px(px + t * (x - px)), self.py(edge)));
                    }
                }
                runs.last_mut()
                    .expect("a run")
                    .push((self.px(x), self.py(y)));
            } else {
                if let Some((px, py)) = prev {
                    if inside(py) && y.is_finite() {
                        let edge = if y > hi { hi } else { lo };
                        let t = (edge - py) / (y - py);
                        runs.last_mut()
                            .expect("a run")
                            .push((self.px(px + t * (x - px)), self.py(edge)));
                    }
                }
                if !runs.last().expect("a run").is_empty() {
                    runs.push(Vec::new());
                }
            }
        }
        runs.retain(|r| r.len() > 1);
        runs
    }
}

/// Tick positions at a 1, 2 or 5 × 10^k step giving about `target` intervals over `[lo, hi]`.
pub fn ticks(lo: f64, hi: f64, target: usize) -> Vec<f64> {
    if hi <= lo || !lo.is_finite() || !hi.is_finite() {
        return vec![lo];
    }
    let raw = (hi - lo) / target.max(1) as f64;
    let mag = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * mag)
        .find(|s| *s >= raw * 0.999)
        .unwrap_or(10.0 * mag);
    let first = (lo / step).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    (first..=last).map(|k| k as f64 * step).collect()
}

/// A tick label: no more decimals than the step needs, with a true minus sign.
pub fn tick_text(v: f64, step: f64) -> String {
    let decimals = if step >= 1.0 {
        0
    } else {
        (-step.log10()).ceil().max(0.0) as usize
    };
    let s = format!("{v:.decimals$}");
    if let Some(rest) = s.strip_prefix('-') {
        if rest.chars().all(|c| c == '0' || c == '.') {
            rest.to_string()
        } else {
            format!("−{rest}")
        }
    } else {
        s
    }
}

/// Draws the frame box, outward ticks with labels, and both axis titles.
///
/// `gutter` (pt) moves the y tick labels further left, leaving room beside the axis (the energy
/// diagram puts its free-ion terms there).
pub fn draw_axes(svg: &mut Svg, f: &Frame, x_title: &Rich, y_title: &Rich, size: f64, gutter: f64) {
    draw_axes_with(svg, f, Some(x_title), y_title, size, gutter, 5);
}

/// As [`draw_axes`]; with `x_title` None the x axis keeps its ticks but has neither tick labels
/// nor a title (an upper panel sharing its x axis with the panel below); the y axis gets about
/// `y_target` tick intervals.
pub fn draw_axes_with(
    svg: &mut Svg,
    f: &Frame,
    x_title: Option<&Rich>,
    y_title: &Rich,
    size: f64,
    gutter: f64,
    y_target: usize,
) {
    let axis = Stroke::solid(INK, 0.6);
    svg.open_group("axes");
    svg.rect(
        (f.left, f.top),
        (f.width, f.height),
        "none",
        1.0,
        Some(&axis),
        "frame",
    );
    let tick_len = size * 0.35;
    let xt = ticks(f.x.0, f.x.1, 6);
    let xstep = if xt.len() > 1 { xt[1] - xt[0] } else { 1.0 };
    for &v in &xt {
        let x = f.px(v);
        svg.line((x, f.bottom()), (x, f.bottom() + tick_len), &axis);
        if x_title.is_none() {
            continue;
        }
        let t = Rich::parse(&tick_text(v, xstep));
        svg.text(&Label {
            x,
            y: f.bottom() + tick_len + size * 1.0,
            text: &t,
            size,
            anchor: Anchor::Middle,
            colour: INK,
            class: "tick-label",
            rotate: 0.0,
        });
    }
    let yt = ticks(f.y.0, f.y.1, y_target);
    let ystep = if yt.len() > 1 { yt[1] - yt[0] } else { 1.0 };
    let mut widest: f64 = 0.0;
    for &v in &yt {
        let y = f.py(v);
        svg.line((f.left - tick_len, y), (f.left, y), &axis);
        let t = Rich::parse(&tick_text(v, ystep));
        widest = widest.max(t.width(size));
        svg.text(&Label {
            x: f.left - tick_len - size * 0.3 - gutter,
            y: y + size * 0.35,
            text: &t,
            size,
            anchor: Anchor::End,
            colour: INK,
            class: "tick-label",
            rotate: 0.0,
        });
    }
    if let Some(x_title) = x_title {
        svg.text(&Label {
            x: f.left + f.width / 2.0,
            y: f.bottom() + tick_len + size * 2.35,
            text: x_title,
            size,
            anchor: Anchor::Middle,
            colour: INK,
            class: "axis-title",
            rotate: 0.0,
        });
    }
    svg.text(&Label {
        x: f.left - tick_len - size * 0.6 - widest - size * 0.35 - gutter,
        y: f.top + f.height / 2.0,
        text: y_title,
        size,
        anchor: Anchor::Middle,
        colour: INK,
        class: "axis-title",
        rotate: -90.0,
    });
    svg.close_group();
}

/// Width (pt) of the widest y tick label [`draw_axes_with`] writes for this y range and target.
pub fn y_tick_width(y: (f64, f64), size: f64, y_target: usize) -> f64 {
    let yt = ticks(y.0, y.1, y_target);
    let ystep = if yt.len() > 1 { yt[1] - yt[0] } else { 1.0 };
    yt.iter()
        .map(|&v| Rich::parse(&tick_text(v, ystep)).width(size))
        .fold(0.0, f64::max)
}

/// A second y axis on the right edge: outward ticks at the given positions (in the frame's y
/// units) with their labels, and a title read from bottom to top. Returns the width (pt) it
/// takes right of the frame.
pub fn draw_right_axis(
    svg: &mut Svg,
    f: &Frame,
    marks: &[(f64, String)],
    title: &Rich,
    size: f64,
) -> f64 {
    let axis = Stroke::solid(INK, 0.6);
    let tick_len = size * 0.35;
    svg.open_group("right-axis");
    let mut widest: f64 = 0.0;
    for (v, text) in marks {
        let y = f.py(*v);
        svg.line((f.right(), y), (f.right() + tick_len, y), &axis);
        let t = Rich::parse(text);
        widest = widest.max(t.width(size));
        svg.text(&Label {
            x: f.right() + tick_len + size * 0.3,
            y: y + size * 0.35,
            text: &t,
            size,
            anchor: Anchor::Start,
            colour: INK,
            class: "tick-label",
            rotate: 0.0,
        });
    }
    let x = f.right() + tick_len + size * 0.6 + widest + size * 0.35;
    svg.text(&Label {
        x,
        y: f.top + f.height / 2.0,
        text: title,
        size,
        anchor: Anchor::Middle,
        colour: INK,
        class: "axis-title",
        rotate: -90.0,
    });
    svg.close_group();
    x + size * 0.5 - f.right()
}

/// Width (pt) [`draw_right_axis`] takes right of the frame for these tick texts.
pub fn right_axis_width(texts: &[String], size: f64) -> f64 {
    let widest = texts
        .iter()
        .map(|t| Rich::parse(t).width(size))
        .fold(0.0, f64::max);
    size * 0.35 + size * 0.6 + widest + size * 0.35 + size * 0.5
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_use_one_two_five_steps() {
        assert_eq!(ticks(0.0, 40.0, 6), vec![0.0, 10.0, 20.0, 30.0, 40.0]);
        assert_eq!(ticks(0.0, 3.2, 5), vec![0.0, 1.0, 2.0, 3.0]);
        assert_eq!(tick_text(-2.0, 1.0), "−2");
        assert_eq!(tick_text(0.5, 0.5), "0.5");
    }

    #[test]
    fn clipping_ends_on_the_frame() {
        let f = Frame {
            left: 0.0,
            top: 0.0,
            width: 100.0,
            height: 100.0,
            x: (0.0, 10.0),
            y: (0.0, 10.0),
        };
        let runs = f.clipped_runs(&[0.0, 5.0, 10.0], &[0.0, 5.0, 15.0]);
        assert_eq!(runs.len(), 1);
        let end = runs[0].last().unwrap();
        assert!(
            (end.1 - 0.0).abs() < 1e-9 && (end.0 - 75.0).abs() < 1e-9,
            "{end:?}"
        );
    }
}
