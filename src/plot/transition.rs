//! Spin transitions against temperature: χ_M·T (with the high-spin fraction γ_HS on a second
//! axis on the right) or γ_HS itself, the model's heating and cooling branches, measured points
//! marked by the direction they were taken in (cooling ▼ filled, heating △ open, other ○ open),
//! the characteristic temperatures as dotted verticals with their values, and, for a fit, the
//! residuals in a panel below that shares the temperature axis.

use super::axes::{
    draw_axes, draw_axes_with, draw_right_axis, right_axis_width, tick_text, ticks, y_tick_width,
    Frame,
};
use super::layout::spread;
use super::legend::{draw_flow_legend, legend_height, Key};
use super::moment::Curve;
use super::style::{self, Column, INK, MUTED};
use super::svg::{Anchor, Label, Shape, Stroke, Svg};
use super::text::Rich;

/// What the y axis shows.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TransitionQuantity {
    /// χ_M·T in cm³ K mol⁻¹; with `hs` > `ls` (the pure states' χ_M·T) a γ_HS axis on the right.
    ChiT { hs: f64, ls: f64 },
    /// The high-spin fraction γ_HS (dimensionless).
    Fraction,
}

impl TransitionQuantity {
    /// The axis title in the "quantity / unit" form.
    pub fn axis_title(self) -> &'static str {
        match self {
            TransitionQuantity::ChiT { .. } => "*χ*_{M}*T* / cm³ K mol⁻¹",
            TransitionQuantity::Fraction => "*γ*_{HS}",
        }
    }

    fn residual_title(self) -> &'static str {
        match self {
            TransitionQuantity::ChiT { .. } => "resid. / cm³ K mol⁻¹",
            TransitionQuantity::Fraction => "resid.",
        }
    }
}

/// The direction a measured point was taken in.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Direction {
    Cooling,
    Heating,
    /// Not said, or an equilibrium measurement.
    Other,
}

impl Direction {
    fn shape(self) -> Shape {
        match self {
            Direction::Cooling => Shape::Down,
            Direction::Heating => Shape::Up,
            Direction::Other => Shape::Circle,
        }
    }
}

/// A measured point in the figure's quantity, and its residual against the model (same unit)
/// when the figure has a residual panel.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TransitionPoint {
    pub t: f64,
    pub y: f64,
    pub direction: Direction,
    pub residual: Option<f64>,
}

/// A characteristic temperature drawn as a dotted vertical, e.g. ("*T*_{½}", 150.0).
#[derive(Debug, Clone, PartialEq)]
pub struct Marker {
    /// Symbol in the label markup; the label reads "symbol = value K".
    pub symbol: String,
    /// K.
    pub t: f64,
}

/// The whole figure.
#[derive(Debug, Clone, PartialEq)]
pub struct TransitionFigure {
    pub title: String,
    pub quantity: TransitionQuantity,
    /// Model branches: the first is drawn as the heating branch (or the only one), the second as
    /// the cooling branch.
    pub curves: Vec<Curve>,
    pub measured: Vec<TransitionPoint>,
    pub markers: Vec<Marker>,
    /// Draw the residual panel (for a fit).
    pub residual_panel: bool,
}

/// Stroke of model branch `i` (series colours and dashes of the project's palette).
fn branch_stroke(i: usize) -> Stroke {
    style::series(i, 1.1)
}

/// Colour of the points of a direction: the colour of the branch they belong to.
fn point_colour(d: Direction, looped: bool) -> &'static str {
    match (d, looped) {
        (Direction::Cooling, true) => branch_stroke(1).colour,
        (Direction::Heating, _) | (Direction::Cooling, false) => branch_stroke(0).colour,
        (Direction::Other, _) => INK,
    }
}

fn point_fill(d: Direction, colour: &'static str) -> &'static str {
    match d {
        Direction::Cooling => colour,
        _ => "white",
    }
}

/// A data range padded by 3 %: the top widened to a whole or half tick step; the bottom to zero when positive data start low
/// (`zero_pad`: 3 % below zero, so points on zero stay visible), else to a whole step or a fifth
/// of one.
fn nice_range(lo: f64, hi: f64, target: usize, zero_pad: bool) -> (f64, f64) {
    let span = (hi - lo).abs().max(1e-6);
    let (a, b) = (lo - 0.03 * span, hi + 0.03 * span);
    let t = ticks(a, b, target);
    let step = if t.len() > 1 { t[1] - t[0] } else { span };
    let top = (b / (step / 2.0)).ceil() * (step / 2.0);
    let whole = (a / step).floor() * step;
    let bottom = if lo >= 0.0 && lo < 0.3 * b {
        if zero_pad {
            -0.03 * span
        } else {
            0.0
        }
    } else if a - whole > 0.1 * (b - a) {
        let minor = step / 5.0;
        (a / minor).floor() * minor
    } else {
        whole
    };
    (bottom, top)
}

/// The SVG of a spin-transition figure.
pub fn transition_svg(fig: &TransitionFigure, column: Column) -> String {
    let size = column.font();
    let small = size * 0.9;
    let width = column.width();
    let looped = fig.curves.len() > 1;
    let finite = |v: &f64| v.is_finite();
    // Temperature range: data and curves, from 0 K at the lowest.
    let ts: Vec<f64> = fig
        .curves
        .iter()
        .flat_map(|c| c.t.iter().copied())
        .chain(fig.measured.iter().map(|p| p.t))
        .filter(finite)
        .collect();
    let tmin = ts.iter().copied().fold(f64::INFINITY, f64::min);
    let tmax = ts.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let (tmin, tmax) = if tmin.is_finite() && tmax > tmin {
        (tmin, tmax)
    } else {
        (0.0, 300.0)
    };
    let (x0, x1) = nice_range(tmin.max(0.0), tmax, 6, false);
    // y range: data, curves and the pure states.
    let mut ys: Vec<f64> = fig
        .curves
        .iter()
        .flat_map(|c| c.y.iter().copied())
        .chain(fig.measured.iter().map(|p| p.y))
        .filter(finite)
        .collect();
    match fig.quantity {
        TransitionQuantity::ChiT { hs, ls } => ys.extend([0.0, hs, ls]),
        TransitionQuantity::Fraction => ys.extend([0.0, 1.0]),
    }
    let ylo = ys.iter().copied().fold(f64::INFINITY, f64::min);
    let yhi = ys.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    // γ_HS gets steps of 0.2 over its 0–1 range; χ_M·T about five steps.
    let y_target = match fig.quantity {
        TransitionQuantity::Fraction => 6,
        TransitionQuantity::ChiT { .. } => 5,
    };
    let (y0, y1) = match fig.quantity {
        TransitionQuantity::Fraction => (ylo.min(0.0) - 0.04, yhi.max(1.0) + 0.04),
        TransitionQuantity::ChiT { .. } => nice_range(ylo, yhi.max(ylo + 1e-3), 5, true),
    };
    // Residual range: symmetric about zero.
    let rmax = fig
        .measured
        .iter()
        .filter_map(|p| p.residual)
        .filter(finite)
        .map(f64::abs)
        .fold(0.0, f64::max);
    let rt = ticks(-rmax.max(1e-3) * 1.15, rmax.max(1e-3) * 1.15, 3);
    let rstep = if rt.len() > 1 {
        rt[1] - rt[0]
    } else {
        rmax.max(1e-3)
    };
    let rr = ((rmax.max(1e-3) * 1.15) / rstep).ceil() * rstep;
    // The γ_HS axis on the right (χ_M·T = ls + γ (hs − ls)).
    let gamma_marks: Vec<(f64, String)> = match fig.quantity {
        TransitionQuantity::ChiT { hs, ls } if hs - ls > 1e-6 => {
            let g = |y: f64| (y - ls) / (hs - ls);
            let gt = ticks(g(y0).max(0.0), g(y1).min(1.0), 5);
            let gstep = if gt.len() > 1 { gt[1] - gt[0] } else { 1.0 };
            gt.iter()
                .map(|&v| (ls + v * (hs - ls), tick_text(v, gstep)))
                .collect()
        }
        _ => Vec::new(),
    };
    let gamma_title = Rich::parse("*γ*_{HS}");

    // Legend: branches, then the measured series present.
    let mut legend: Vec<(Key, Rich)> = Vec::new();
    for (i, c) in fig.curves.iter().enumerate() {
        legend.push((Key::Line(branch_stroke(i)), Rich::parse(&c.name)));
    }
    for (d, name) in [
        (Direction::Cooling, "measured, cooling"),
        (Direction::Heating, "measured, heating"),
        (Direction::Other, "measured"),
    ] {
        if fig.measured.iter().any(|p| p.direction == d) {
            let c = point_colour(d, looped);
            legend.push((
                Key::Shape(d.shape(), Stroke::solid(c, 0.6), point_fill(d, c)),
                Rich::parse(name),
            ));
        }
    }
    let resid_on = fig.residual_panel && fig.measured.iter().any(|p| p.residual.is_some());
    let tick_w = y_tick_width((y0, y1), size, y_target).max(if resid_on {
        y_tick_width((-rr, rr), small, 5)
    } else {
        0.0
    });
    let left = tick_w + size * 2.6;
    let right = if gamma_marks.is_empty() {
        size * 1.2
    } else {
        right_axis_width(
            &gamma_marks.iter().map(|m| m.1.clone()).collect::<Vec<_>>(),
            size,
        ) + size * 0.6
    };
    let legend_h = legend_height(&legend, size, width - 2.0 * size);
    let top = size * 3.9;
    let plot_w = width - left - right;
    let main_h = plot_w * if column == Column::Single { 0.62 } else { 0.42 };
    let resid_title = Rich::parse(fig.quantity.residual_title());
    let gap = size * 1.3;
    let resid_h = if resid_on {
        (main_h * 0.3).max(resid_title.width(small) + size)
    } else {
        0.0
    };
    let bottom = size * 3.4 + legend_h + size * 0.6;
    let height = top + main_h + if resid_on { gap + resid_h } else { 0.0 } + bottom;
    let f = Frame {
        left,
        top,
        width: plot_w,
        height: main_h,
        x: (x0, x1),
        y: (y0, y1),
    };
    let rf = Frame {
        left,
        top: f.bottom() + gap,
        width: plot_w,
        height: resid_h,
        x: (x0, x1),
        y: (-rr, rr),
    };
    let mut svg = Svg::new(width, height);
    svg.title(&Rich::parse(&fig.title), size);

    // Characteristic temperatures: dotted verticals, labels in a row above the frame.
    let shown: Vec<&Marker> = fig
        .markers
        .iter()
        .filter(|m| m.t.is_finite() && m.t >= x0 && m.t <= x1)
        .collect();
    let guide = Stroke {
        dash: Some("1 1.6"),
        ..Stroke::solid("#6e6e6e", 0.5)
    };
    svg.open_group("markers");
    for m in &shown {
        let x = f.px(m.t);
        svg.polyline(&[(x, f.top), (x, f.bottom())], &guide, "temperature-marker");
    }
    let labels: Vec<Rich> = shown
        .iter()
        .map(|m| Rich::parse(&format!("{} = {:.1} K", m.symbol, m.t)))
        .collect();
    let widths: Vec<f64> = labels.iter().map(|l| l.width(small) + size * 0.6).collect();
    if widths.iter().sum::<f64>() <= f.width + right {
        let wanted: Vec<f64> = shown.iter().map(|m| f.px(m.t)).collect();
        let placed = spread(&wanted, &widths, f.left, f.right() + right - size * 0.3);
        let ly = f.top - size * 0.75;
        for (k, l) in labels.iter().enumerate() {
            if (placed[k] - wanted[k]).abs() > 0.5 {
                svg.polyline(
                    &[(wanted[k], f.top), (placed[k], ly + size * 0.25)],
                    &Stroke::solid("#6e6e6e", 0.3),
                    "leader",
                );
            }
            svg.text(&Label {
                x: placed[k],
                y: ly,
                text: l,
                size: small,
                anchor: Anchor::Middle,
                colour: INK,
                class: "marker-label",
                rotate: 0.0,
            });
        }
    }
    svg.close_group();

    // The pure states as faint horizontals (γ = 0 and 1).
    if let TransitionQuantity::ChiT { hs, ls } = fig.quantity {
        svg.open_group("pure-states");
        for v in [hs, ls] {
            if v > y0 && v < y1 {
                svg.polyline(
                    &[(f.left, f.py(v)), (f.right(), f.py(v))],
                    &Stroke::solid(MUTED, 0.4),
                    "pure-state",
                );
            }
        }
        svg.close_group();
    }

    svg.open_group("curves");
    for (i, c) in fig.curves.iter().enumerate() {
        for run in f.clipped_runs(&c.t, &c.y) {
            svg.polyline(&run, &branch_stroke(i), "model");
        }
    }
    svg.close_group();

    let r = size * 0.26;
    svg.open_group("measured");
    for p in &fig.measured {
        if !(p.t.is_finite() && p.y.is_finite()) {
            continue;
        }
        let c = point_colour(p.direction, looped);
        svg.marker(
            p.direction.shape(),
            (f.px(p.t), f.py(p.y)),
            r,
            point_fill(p.direction, c),
            &Stroke::solid(c, 0.6),
            "measured-point",
        );
    }
    svg.close_group();

    let x_title = Rich::parse("*T* / K");
    let y_title = Rich::parse(fig.quantity.axis_title());
    if resid_on {
        draw_axes_with(&mut svg, &f, None, &y_title, size, 0.0, y_target);
    } else {
        draw_axes_with(&mut svg, &f, Some(&x_title), &y_title, size, 0.0, y_target);
    }
    if !gamma_marks.is_empty() {
        draw_right_axis(&mut svg, &f, &gamma_marks, &gamma_title, size);
    }

    if resid_on {
        svg.open_group("residuals");
        svg.polyline(
            &[(rf.left, rf.py(0.0)), (rf.right(), rf.py(0.0))],
            &Stroke::solid(MUTED, 0.5),
            "zero-line",
        );
        for p in &fig.measured {
            let Some(res) = p.residual.filter(|v| v.is_finite()) else {
                continue;
            };
            if !p.t.is_finite() {
                continue;
            }
            let c = point_colour(p.direction, looped);
            svg.marker(
                p.direction.shape(),
                (rf.px(p.t), rf.py(res)),
                r * 0.8,
                point_fill(p.direction, c),
                &Stroke::solid(c, 0.5),
                "residual-point",
            );
        }
        svg.close_group();
        draw_axes(&mut svg, &rf, &x_title, &resid_title, small, 0.0);
    }
    let last = if resid_on { rf } else { f };
    draw_flow_legend(
        &mut svg,
        (size, last.bottom() + size * 3.4),
        &legend,
        size,
        width - 2.0 * size,
    );
    let y = match fig.quantity {
        TransitionQuantity::ChiT { .. } if !gamma_marks.is_empty() => {
            "χ_M·T / cm³ K mol⁻¹ (right: γ_HS)"
        }
        TransitionQuantity::ChiT { .. } => "χ_M·T / cm³ K mol⁻¹",
        TransitionQuantity::Fraction => "γ_HS",
    };
    svg.finish(
        &super::energy::plain(&fig.title),
        &format!(
            "x axis: T / K; y axis: {y}; {} model branch(es), {} measured point(s){}; dotted: {}.",
            fig.curves.len(),
            fig.measured.len(),
            if resid_on { ", residuals below" } else { "" },
            if shown.is_empty() {
                "none".to_string()
            } else {
                shown
                    .iter()
                    .map(|m| format!("{} = {:.1} K", super::energy::plain(&m.symbol), m.t))
                    .collect::<Vec<_>>()
                    .join(", ")
            }
        ),
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ranges_snap_to_ticks() {
        assert_eq!(nice_range(50.0, 350.0, 6, false), (0.0, 400.0));
        assert_eq!(nice_range(250.0, 350.0, 6, false), (240.0, 360.0));
        // 0–3 cm³ K mol⁻¹: 3 % below zero, top at half a step (3.5, not 4).
        let (a, b) = nice_range(0.0, 3.0, 5, true);
        assert!((a + 0.09).abs() < 1e-9 && b == 3.5, "{a} {b}");
        let (a, _) = nice_range(-0.3, 3.0, 5, true);
        assert!((a + 0.4).abs() < 1e-9, "{a}");
    }
}
