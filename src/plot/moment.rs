//! Moments against temperature: χ_M·T or μ_eff from the model, measured points with error bars,
//! and the spin-only values of each spin state as labelled horizontal lines.

use super::axes::{draw_axes, ticks, Frame};
use super::layout::spread;
use super::legend::{draw_flow_legend, legend_height, Key};
use super::style::{self, Column, INK};
use super::svg::{Anchor, Label, Stroke, Svg};
use super::text::Rich;

/// Which quantity the y axis shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// χ_M·T in cm³ K mol⁻¹ (cgs-emu), or m³ K mol⁻¹ with `si`.
    ChiT { si: bool },
    /// μ_eff in μB.
    Mu,
}

impl Quantity {
    /// The axis title in the "quantity / unit" form.
    pub fn axis_title(self) -> &'static str {
        match self {
            Quantity::ChiT { si: false } => "*χ*_{M}*T* / cm³ K mol⁻¹",
            Quantity::ChiT { si: true } => "*χ*_{M}*T* / m³ K mol⁻¹",
            Quantity::Mu => "*μ*_{eff} / *μ*_{B}",
        }
    }
}

/// A curve to draw.
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    pub name: String,
    /// Temperatures (K).
    pub t: Vec<f64>,
    /// Values in the figure's quantity.
    pub y: Vec<f64>,
}

/// A measured point with its 1σ.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Point {
    pub t: f64,
    pub y: f64,
    pub err: Option<f64>,
}

/// A horizontal reference line, e.g. a spin-only value.
#[derive(Debug, Clone, PartialEq)]
pub struct Reference {
    /// Label on the right edge, e.g. "S = 2 (HS)".
    pub name: String,
    pub value: f64,
}

/// The whole figure.
#[derive(Debug, Clone, PartialEq)]
pub struct MomentFigure {
    pub title: String,
    pub quantity: Quantity,
    pub curves: Vec<Curve>,
    pub measured: Vec<Point>,
    /// Name of the measured series in the legend.
    pub measured_name: String,
    pub references: Vec<Reference>,
}

/// The SVG of a moment figure.
pub fn moment_svg(fig: &MomentFigure, column: Column) -> String {
    let size = column.font();
    let small = size * 0.9;
    let width = column.width();
    let height = width * if column == Column::Single { 0.78 } else { 0.5 };
    let scale_si = matches!(fig.quantity, Quantity::ChiT { si: true });
    let tmax = fig
        .curves
        .iter()
        .flat_map(|c| c.t.iter().copied())
        .chain(fig.measured.iter().map(|p| p.t))
        .filter(|t| t.is_finite())
        .fold(0.0f64, f64::max)
        .max(1.0);
    let tmax = ticks(0.0, tmax, 6)
        .last()
        .copied()
        .filter(|t| *t >= tmax)
        .unwrap_or(tmax);
    let ytop = fig
        .curves
        .iter()
        .flat_map(|c| c.y.iter().copied())
        .chain(fig.measured.iter().map(|p| p.y + p.err.unwrap_or(0.0)))
        .chain(fig.references.iter().map(|r| r.value))
        .filter(|y| y.is_finite())
        .fold(0.0f64, f64::max)
        * 1.12;
    let ytop = if ytop > 0.0 { ytop } else { 1.0 };
    let yt = ticks(0.0, ytop, 5);
    let step = if yt.len() > 1 { yt[1] - yt[0] } else { ytop };
    let ymax = (ytop / step).ceil() * step;

    let curve_strokes: Vec<Stroke> = (0..fig.curves.len())
        .map(|i| style::series(i, 1.1))
        .collect();
    let ref_strokes: Vec<Stroke> = (0..fig.references.len())
        .map(|i| Stroke {
            width: 0.7,
            ..style::series(i + 1 + fig.curves.len(), 0.7)
        })
        .collect();
    let marker = Stroke::solid(INK, 0.6);
    let mut legend: Vec<(Key, Rich)> = Vec::new();
    for (c, s) in fig.curves.iter().zip(&curve_strokes) {
        legend.push((Key::Line(*s), Rich::parse(&c.name)));
    }
    if !fig.measured.is_empty() {
        legend.push((
            Key::Marker(marker, "white"),
            Rich::parse(&fig.measured_name),
        ));
    }
    for (r, s) in fig.references.iter().zip(&ref_strokes) {
        legend.push((
            Key::Line(*s),
            Rich::parse(&format!("spin-only, {}", r.name)),
        ));
    }
    let title = Rich::parse(&fig.title);
    let tick_w =
        super::text::text_width(if scale_si { "0.00000" } else { "0.00" }, size) + size * 0.6;
    let labels: Vec<Rich> = fig
        .references
        .iter()
        .map(|r| Rich::parse(&r.name))
        .collect();
    let label_w = labels.iter().map(|t| t.width(small)).fold(0.0, f64::max);
    let leader = size * 1.4;
    let left = size * 2.0 + tick_w;
    let right = label_w + leader + size * 0.8;
    let top = size * 2.6;
    let legend_h = legend_height(&legend, size, width - 2.0 * size);
    let bottom = size * 3.4 + legend_h + size * 0.6;
    let f = Frame {
        left,
        top,
        width: width - left - right,
        height: height - top - bottom,
        x: (0.0, tmax),
        y: (0.0, ymax),
    };
    let mut svg = Svg::new(width, height);
    svg.title(&title, size);
    svg.open_group("references");
    for (r, s) in fig.references.iter().zip(&ref_strokes) {
        if r.value <= ymax {
            svg.polyline(
                &[(f.left, f.py(r.value)), (f.right(), f.py(r.value))],
                s,
                "spin-only",
            );
        }
    }
    svg.close_group();
    svg.open_group("curves");
    for (c, s) in fig.curves.iter().zip(&curve_strokes) {
        for run in f.clipped_runs(&c.t, &c.y) {
            svg.polyline(&run, s, "model");
        }
    }
    svg.close_group();
    svg.open_group("measured");
    for p in &fig.measured {
        if !(p.t.is_finite() && p.y.is_finite()) || p.y > ymax || p.t > tmax {
            continue;
        }
        if let Some(e) = p.err.filter(|e| *e > 0.0) {
            let x = f.px(p.t);
            let cap = size * 0.25;
            let (lo, hi) = (f.py((p.y - e).max(0.0)), f.py((p.y + e).min(ymax)));
            svg.line((x, lo), (x, hi), &marker);
            svg.line((x - cap, lo), (x + cap, lo), &marker);
            svg.line((x - cap, hi), (x + cap, hi), &marker);
        }
        svg.circle(
            (f.px(p.t), f.py(p.y)),
            size * 0.24,
            "white",
            &marker,
            "measured-point",
        );
    }
    svg.close_group();
    draw_axes(
        &mut svg,
        &f,
        &Rich::parse("*T* / K"),
        &Rich::parse(fig.quantity.axis_title()),
        size,
        0.0,
    );
    // Right-edge labels of the reference lines.
    let shown: Vec<usize> = (0..fig.references.len())
        .filter(|&i| fig.references[i].value <= ymax)
        .collect();
    let lh = small * 1.15;
    let wanted: Vec<f64> = shown
        .iter()
        .map(|&i| f.py(fig.references[i].value))
        .collect();
    let placed = spread(
        &wanted,
        &vec![lh; wanted.len()],
        f.top - lh / 2.0,
        f.bottom() + lh / 2.0,
    );
    svg.open_group("reference-labels");
    for (k, &i) in shown.iter().enumerate() {
        let tx = f.right() + leader;
        svg.polyline(
            &[(f.right(), wanted[k]), (tx - size * 0.25, placed[k])],
            &Stroke::solid("#6e6e6e", 0.35),
            "leader",
        );
        svg.text(&Label {
            x: tx,
            y: placed[k] + small * 0.35,
            text: &labels[i],
            size: small,
            anchor: Anchor::Start,
            colour: ref_strokes[i].colour,
            class: "reference-label",
            rotate: 0.0,
        });
    }
    svg.close_group();
    draw_flow_legend(
        &mut svg,
        (size, f.bottom() + size * 3.4),
        &legend,
        size,
        width - 2.0 * size,
    );
    let y = match fig.quantity {
        Quantity::ChiT { si: false } => "χ_M·T / cm³ K mol⁻¹",
        Quantity::ChiT { si: true } => "χ_M·T / m³ K mol⁻¹",
        Quantity::Mu => "μ_eff / μB",
    };
    svg.finish(
        &super::energy::plain(&fig.title),
        &format!(
            "x axis: T / K; y axis: {y}; {} model curve(s), {} measured point(s), spin-only lines.",
            fig.curves.len(),
            fig.measured.len()
        ),
    )
}
