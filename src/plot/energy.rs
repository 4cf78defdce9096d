//! The energy-level (Tanabe–Sugano) figure: E/B of every level against Δ/B, free-ion terms on
//! the left, level labels on the right (spread apart with leader lines where levels bunch), the
//! spin crossover with its value, and optionally a sample: its Δ/B with the uncertainty band,
//! both spin states' Δ/B, and its spin-allowed transitions as arrows with their energies.

use super::axes::{draw_axes, Frame};
use super::layout::{fit_count, spread};
use super::legend::{draw_flow_legend, legend_height, Key};
use super::style::{self, Column, BAND_FILL, INK, MUTED};
use super::svg::{Anchor, Label, Stroke, Svg};
use super::text::{term_label, Rich};
use crate::report::diagram::DiagramReport;

/// One spin-allowed transition drawn as an arrow (energies in units of B, as the diagram).
#[derive(Debug, Clone, PartialEq)]
pub struct Arrow {
    /// Lower level E/B (0 for the ground level).
    pub from: f64,
    /// Upper level E/B.
    pub to: f64,
    /// Upper level label, e.g. "4T1g".
    pub level: String,
    /// The energy as printed, e.g. "17 400 cm⁻¹" (or "E/B = 17.4" without B).
    pub text: String,
}

/// A sample's place on the diagram.
#[derive(Debug, Clone, PartialEq)]
pub struct SampleMark {
    /// What to call it, e.g. "[Fe(H2O)6]2+".
    pub name: String,
    /// Δ/B of its predicted ground state.
    pub delta_over_b: f64,
    /// 1σ of Δ/B (absolute); 0 when unknown.
    pub uncertainty: f64,
    /// Each spin state's own Δ/B, e.g. ("HS", 14.2), ("LS", 19.0); empty when the spin cannot
    /// change.
    pub states: Vec<(String, f64)>,
    /// The spin-allowed transitions from the lowest level of the ground spin.
    pub arrows: Vec<Arrow>,
}

/// How to draw the figure.
#[derive(Debug, Clone, PartialEq)]
pub struct EnergyOptions {
    pub column: Column,
    /// Caption at the top (the complex and its parameters).
    pub title: String,
    /// Multiplicities to highlight (each spin state's spin-allowed levels); others grey. Empty:
    /// every level coloured by multiplicity.
    pub highlight: Vec<(i32, String)>,
}

/// The SVG of a diagram report with an optional sample.
pub fn energy_svg(d: &DiagramReport, sample: Option<&SampleMark>, o: &EnergyOptions) -> String {
    let size = o.column.font();
    let small = size * 0.9;
    let width = o.column.width();
    let height = width
        * if o.column == Column::Single {
            1.0
        } else {
            0.62
        };
    let xmax = d.delta_over_b.last().copied().unwrap_or(1.0).max(1e-9);
    let top_e = d
        .series
        .iter()
        .filter_map(|s| s.energies.last().copied())
        .filter(|e| e.is_finite())
        .fold(0.0f64, f64::max);
    let ymax = top_e.min(2.0 * xmax + 30.0).max(10.0);
    let ymax = super::axes::ticks(0.0, ymax, 5)
        .last()
        .copied()
        .filter(|t| *t >= ymax * 0.97)
        .unwrap_or(ymax);

    // Legend entries first: their rows fix the frame height.
    let line_w = 0.9;
    let mults: Vec<i32> = {
        let mut m: Vec<i32> = d.series.iter().map(|s| s.multiplicity).collect();
        m.sort_unstable();
        m.dedup();
        m.reverse();
        m
    };
    let highlighted = |m: i32| o.highlight.is_empty() || o.highlight.iter().any(|(h, _)| *h == m);
    let stroke_of = |m: i32| -> Stroke {
        if highlighted(m) {
            style::multiplicity(m, if o.highlight.is_empty() { line_w } else { 1.2 })
        } else {
            Stroke {
                colour: MUTED,
                width: 0.5,
                dash: None,
            }
        }
    };
    let mut legend: Vec<(Key, Rich)> = Vec::new();
    if o.highlight.is_empty() {
        for &m in &mults {
            legend.push((
                Key::Line(stroke_of(m)),
                Rich::parse(&style::multiplicity_name(m)),
            ));
        }
    } else {
        for (m, name) in &o.highlight {
            if mults.contains(m) {
                legend.push((
                    Key::Line(stroke_of(*m)),
                    Rich::parse(&format!("{} ({name})", style::multiplicity_name(*m))),
                ));
            }
        }
        if mults.iter().any(|m| !highlighted(*m)) {
            legend.push((Key::Line(stroke_of(0)), Rich::parse("other spins")));
        }
    }
    let cross_stroke = Stroke {
        colour: INK,
        width: 0.7,
        dash: Some("3 2"),
    };
    let cross = d.crossover_delta_over_b.filter(|x| *x <= xmax);
    if cross.is_some() {
        legend.push((Key::Line(cross_stroke), Rich::parse("spin crossover")));
    }
    let sample_stroke = Stroke::solid(INK, 1.3);
    if let Some(s) = sample {
        legend.push((Key::Line(sample_stroke), Rich::parse("sample *Δ*/*B*")));
        if s.uncertainty > 0.0 {
            legend.push((Key::Swatch(BAND_FILL, 0.3), Rich::parse("±1σ")));
        }
    }

    // Margins: title, a strip for marks above the frame, axes, legend.
    let title = Rich::parse(&o.title);
    let strip = size * 1.5;
    let top = size * 1.9 + strip;
    let term_w = d
        .series
        .iter()
        .map(|s| term_label(&s.parent).width(small))
        .fold(0.0, f64::max)
        * 2.2
        + size;
    let tick_w = super::text::text_width("100", size) + size * 0.6;
    let left = size * 1.6 + tick_w + term_w + size * 0.8;
    let label_w = d
        .series
        .iter()
        .map(|s| term_label(&s.label).width(small))
        .fold(0.0, f64::max);
    let leader = size * 1.6;
    let right = label_w + leader + size * 0.6;
    let frame_w = width - left - right;
    let legend_h = legend_height(&legend, size, width - 2.0 * size);
    let bottom = size * 3.4 + legend_h + size * 0.6;
    let f = Frame {
        left,
        top,
        width: frame_w,
        height: height - top - bottom,
        x: (0.0, xmax),
        y: (0.0, ymax),
    };

    let mut svg = Svg::new(width, height);
    svg.title(&title, size);

    // Sample band under everything.
    if let Some(s) = sample {
        if s.uncertainty > 0.0 {
            let a = f.px((s.delta_over_b - s.uncertainty).max(0.0));
            let b = f.px((s.delta_over_b + s.uncertainty).min(xmax));
            svg.rect(
                (a, f.top),
                (b - a, f.height),
                BAND_FILL,
                0.3,
                None,
                "sample-band",
            );
        }
    }

    // Levels: muted first so highlighted ones lie on top.
    svg.open_group("levels");
    let mut order: Vec<usize> = (0..d.series.len()).collect();
    order.sort_by_key(|&i| highlighted(d.series[i].multiplicity));
    for &i in &order {
        let s = &d.series[i];
        for run in f.clipped_runs(&d.delta_over_b, &s.energies) {
            svg.polyline(&run, &stroke_of(s.multiplicity), "level");
        }
    }
    svg.close_group();
    draw_axes(
        &mut svg,
        &f,
        &Rich::parse("*Δ*/*B*"),
        &Rich::parse("*E*/*B*"),
        size,
        term_w,
    );

    // Right-edge level labels: levels that end inside the frame, lowest first.
    let lh = small * 1.15;
    let mut ends: Vec<(usize, f64)> = d
        .series
        .iter()
        .enumerate()
        .filter_map(|(i, s)| s.energies.last().map(|e| (i, *e)))
        .filter(|(_, e)| e.is_finite() && *e <= ymax)
        .collect();
    ends.sort_by(|a, b| a.1.total_cmp(&b.1));
    let room = fit_count(lh, f.top, f.bottom() + lh / 2.0);
    ends.truncate(room);
    let wanted: Vec<f64> = ends.iter().map(|(_, e)| f.py(*e)).collect();
    let placed = spread(
        &wanted,
        &vec![lh; wanted.len()],
        f.top - lh / 2.0,
        f.bottom() + lh / 2.0,
    );
    svg.open_group("level-labels");
    for (k, (i, _)) in ends.iter().enumerate() {
        let s = &d.series[*i];
        let colour = stroke_of(s.multiplicity).colour;
        let colour = if colour == MUTED { "#6e6e6e" } else { colour };
        let tx = f.right() + leader;
        let thin = Stroke::solid(colour, 0.35);
        svg.polyline(
            &[
                (f.right(), wanted[k]),
                (f.right() + leader * 0.35, wanted[k]),
                (tx - size * 0.25, placed[k]),
            ],
            &thin,
            "leader",
        );
        let t = term_label(&s.label);
        svg.text(&Label {
            x: tx,
            y: placed[k] + small * 0.35,
            text: &t,
            size: small,
            anchor: Anchor::Start,
            colour,
            class: "level-label",
            rotate: 0.0,
        });
    }
    svg.close_group();

    // Free-ion terms on the left: one label per distinct zero-field energy.
    let mut terms: Vec<(f64, Vec<String>)> = Vec::new();
    for s in &d.series {
        let e = match s.energies.first() {
            Some(e) if e.is_finite() && *e <= ymax => *e,
            _ => continue,
        };
        match terms.iter_mut().find(|(t, _)| (t - e).abs() < 0.3) {
            Some((_, names)) => {
                if !names.contains(&s.parent) {
                    names.push(s.parent.clone());
                }
            }
            None => terms.push((e, vec![s.parent.clone()])),
        }
    }
    terms.sort_by(|a, b| a.0.total_cmp(&b.0));
    terms.truncate(room);
    let wanted: Vec<f64> = terms.iter().map(|(e, _)| f.py(*e)).collect();
    let placed = spread(
        &wanted,
        &vec![lh; wanted.len()],
        f.top - lh / 2.0,
        f.bottom() + lh / 2.0,
    );
    svg.open_group("term-labels");
    for (k, (_, names)) in terms.iter().enumerate() {
        let mut t = Rich::default();
        for (j, n) in names.iter().enumerate() {
            if j > 0 {
                t.spans.push(super::text::Span {
                    text: " ".into(),
                    script: super::text::Script::Normal,
                });
            }
            t.spans.extend(term_label(n).spans);
        }
        let tx = f.left - size * 0.9;
        let thin = Stroke::solid("#6e6e6e", 0.35);
        svg.polyline(
            &[
                (f.left, wanted[k]),
                (f.left - size * 0.3, wanted[k]),
                (tx + size * 0.2, placed[k]),
            ],
            &thin,
            "leader",
        );
        svg.text(&Label {
            x: tx,
            y: placed[k] + small * 0.35,
            text: &t,
            size: small,
            anchor: Anchor::End,
            colour: INK,
            class: "term-label",
            rotate: 0.0,
        });
    }
    svg.close_group();

    // Marks in the strip above the frame: crossover, sample, each spin state's Δ/B.
    let mut marks: Vec<(f64, Rich, &'static str)> = Vec::new();
    if let Some(x) = cross {
        svg.polyline(
            &[(f.px(x), f.top), (f.px(x), f.bottom())],
            &cross_stroke,
            "crossover",
        );
        marks.push((
            x,
            Rich::parse(&format!("{} (crossover)", num2(x))),
            "crossover-label",
        ));
    }
    if let Some(s) = sample {
        let x = s.delta_over_b.min(xmax);
        svg.polyline(
            &[(f.px(x), f.top), (f.px(x), f.bottom())],
            &sample_stroke,
            "sample",
        );
        let text = if s.uncertainty > 0.0 {
            format!("{} ± {}", num2(s.delta_over_b), num2(s.uncertainty))
        } else {
            num2(s.delta_over_b)
        };
        marks.push((x, Rich::parse(&text), "sample-label"));
        for (name, x) in &s.states {
            if *x <= xmax {
                let px = f.px(*x);
                svg.polygon(
                    &[
                        (px, f.top + size * 0.6),
                        (px - size * 0.3, f.top),
                        (px + size * 0.3, f.top),
                    ],
                    INK,
                    "state-mark",
                );
                marks.push((*x, Rich::parse(name), "state-label"));
            }
        }
    }
    if !marks.is_empty() {
        let widths: Vec<f64> = marks
            .iter()
            .map(|(_, t, _)| t.width(small) + size * 0.6)
            .collect();
        let wanted: Vec<f64> = marks.iter().map(|(x, _, _)| f.px(*x)).collect();
        let placed = spread(&wanted, &widths, f.left, width - size * 0.3);
        let y = f.top - strip * 0.35;
        for (k, (_, t, class)) in marks.iter().enumerate() {
            if (placed[k] - wanted[k]).abs() > 0.5 {
                svg.polyline(
                    &[(wanted[k], f.top), (placed[k], y + size * 0.15)],
                    &Stroke::solid("#6e6e6e", 0.35),
                    "leader",
                );
            }
            svg.text(&Label {
                x: placed[k],
                y,
                text: t,
                size: small,
                anchor: Anchor::Middle,
                colour: INK,
                class,
                rotate: 0.0,
            });
        }
    }

    // Transitions as arrows from the sample's ground level, labels spread beside them.
    if let Some(s) = sample {
        let arrows: Vec<&Arrow> = s
            .arrows
            .iter()
            .filter(|a| a.to <= ymax && a.to > a.from)
            .collect();
        if !arrows.is_empty() {
            let gap = size * 0.55;
            let x0 = f.px(s.delta_over_b.min(xmax)) + gap;
            let widest = arrows
                .iter()
                .map(|a| Rich::parse(&a.text).width(small))
                .fold(0.0, f64::max);
            let needed = gap * (arrows.len() as f64 + 1.5) + widest + size * 0.3;
            let fits_right = x0 + needed <= f.right();
            let fits_left = x0 - 2.0 * gap - needed >= f.left;
            let flip = !fits_right && fits_left;
            let dir = if flip { -1.0 } else { 1.0 };
            let arrow_stroke = Stroke::solid(INK, 0.6);
            svg.open_group("transitions");
            let xs: Vec<f64> = (0..arrows.len())
                .map(|k| if flip { x0 - 2.0 * gap } else { x0 } + dir * k as f64 * gap)
                .collect();
            for (a, x) in arrows.iter().zip(&xs) {
                svg.arrow(*x, f.py(a.from), f.py(a.to), &arrow_stroke, "transition");
            }
            let wanted: Vec<f64> = arrows.iter().map(|a| f.py(a.to)).collect();
            let placed = spread(
                &wanted,
                &vec![lh; wanted.len()],
                f.top + lh / 2.0,
                f.bottom() - lh / 2.0,
            );
            let mut lx = xs.last().copied().unwrap_or(x0) + dir * gap * 1.2;
            if !flip && !fits_right {
                // Neither side has room: keep the labels inside the frame (over the arrows).
                lx = lx.min(f.right() - widest - size * 0.3);
            }
            for (k, a) in arrows.iter().enumerate() {
                let t = Rich::parse(&a.text);
                let w = t.width(small);
                let bx = if flip { lx - w } else { lx };
                svg.rect(
                    (bx - 0.6, placed[k] - lh / 2.0),
                    (w + 1.2, lh),
                    "white",
                    0.85,
                    None,
                    "label-backing",
                );
                svg.polyline(
                    &[(xs[k], wanted[k]), (lx - dir * size * 0.15, placed[k])],
                    &Stroke::solid("#6e6e6e", 0.3),
                    "leader",
                );
                svg.text(&Label {
                    x: lx,
                    y: placed[k] + small * 0.35,
                    text: &t,
                    size: small,
                    anchor: if flip { Anchor::End } else { Anchor::Start },
                    colour: INK,
                    class: "transition-label",
                    rotate: 0.0,
                });
            }
            svg.close_group();
        }
    }

    let legend_top = f.bottom() + size * 3.4;
    draw_flow_legend(
        &mut svg,
        (size, legend_top),
        &legend,
        size,
        width - 2.0 * size,
    );
    let mut desc =
        "Energy-level diagram. x axis: Δ/B; y axis: E/B (ground level at 0).".to_string();
    if let Some(x) = cross {
        desc.push_str(&format!(" Spin crossover at Δ/B = {x:.2}."));
    }
    if let Some(s) = sample {
        desc.push_str(&format!(
            " Sample at Δ/B = {:.2} ± {:.2} with {} spin-allowed transitions.",
            s.delta_over_b,
            s.uncertainty,
            s.arrows.len()
        ));
    }
    svg.finish(&plain(&o.title), &desc)
}

/// Δ/B as printed on the figure (one decimal).
fn num2(x: f64) -> String {
    format!("{x:.1}")
}

/// A caption without markup.
pub fn plain(markup: &str) -> String {
    Rich::parse(markup).plain()
}
