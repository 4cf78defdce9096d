//! Observed band maxima as sticks against the computed spin-allowed transitions of each spin
//! state, one row each on a common wavenumber axis.

use super::axes::{tick_text, ticks, Frame};
use super::layout::spread;
use super::style::{self, Column, INK};
use super::svg::{Anchor, Label, Stroke, Svg};
use super::text::{term_label, Rich};

/// One row of sticks.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    /// Row name on the left, e.g. "observed" or "HS computed".
    pub name: String,
    /// (wavenumber in cm⁻¹, label); labels are Mulliken labels ("4T1g") or plain text.
    pub sticks: Vec<(f64, String)>,
    /// Whether the labels are Mulliken labels (set with sub/superscripts).
    pub term_labels: bool,
}

/// The SVG of the stick figure (rows from top to bottom).
pub fn sticks_svg(title: &str, rows: &[Row], column: Column) -> String {
    let size = column.font();
    let small = size * 0.85;
    let width = column.width();
    let row_h = size * 4.2;
    let top = size * 2.6;
    let bottom = size * 3.6;
    let height = top + row_h * rows.len().max(1) as f64 + bottom;
    let names: Vec<Rich> = rows.iter().map(|r| Rich::parse(&r.name)).collect();
    let left = names.iter().map(|n| n.width(size)).fold(0.0, f64::max) + size * 1.4;
    let xmax_data = rows
        .iter()
        .flat_map(|r| r.sticks.iter().map(|s| s.0))
        .filter(|x| x.is_finite())
        .fold(0.0f64, f64::max)
        .max(1000.0);
    let xt = ticks(0.0, xmax_data * 1.08, 5);
    let step = if xt.len() > 1 {
        xt[1] - xt[0]
    } else {
        xmax_data
    };
    let xmax = (xmax_data * 1.08 / step).ceil() * step;
    // Room right of the frame for half the last tick label, centred on the frame's edge.
    let right =
        (Rich::parse(&tick_text(xmax, step)).width(size) / 2.0 + size * 0.4).max(size * 1.2);
    let f = Frame {
        left,
        top,
        width: width - left - right,
        height: row_h * rows.len().max(1) as f64,
        x: (0.0, xmax),
        y: (0.0, rows.len().max(1) as f64),
    };
    let mut svg = Svg::new(width, height);
    let t = Rich::parse(title);
    svg.title(&t, size);
    let axis = Stroke::solid(INK, 0.6);
    svg.open_group("axes");
    svg.line((f.left, f.bottom()), (f.right(), f.bottom()), &axis);
    for &v in &ticks(0.0, xmax, 5) {
        let x = f.px(v);
        svg.line((x, f.bottom()), (x, f.bottom() + size * 0.35), &axis);
        let tt = Rich::parse(&tick_text(v, step));
        svg.text(&Label {
            x,
            y: f.bottom() + size * 1.35,
            text: &tt,
            size,
            anchor: Anchor::Middle,
            colour: INK,
            class: "tick-label",
            rotate: 0.0,
        });
    }
    let xt_title = Rich::parse("*ν̃* / cm⁻¹");
    svg.text(&Label {
        x: f.left + f.width / 2.0,
        y: f.bottom() + size * 2.7,
        text: &xt_title,
        size,
        anchor: Anchor::Middle,
        colour: INK,
        class: "axis-title",
        rotate: 0.0,
    });
    svg.close_group();
    for (r, row) in rows.iter().enumerate() {
        let base = f.top + row_h * (r as f64 + 1.0) - size * 0.6;
        let stick_top = base - row_h * 0.45;
        let stroke = if r == 0 && !row.term_labels {
            Stroke::solid(INK, 1.4)
        } else {
            style::series(r, 1.1)
        };
        svg.open_group("row");
        svg.line(
            (f.left, base),
            (f.right(), base),
            &Stroke::solid("#b3b3b3", 0.4),
        );
        svg.text(&Label {
            x: f.left - size * 0.6,
            y: base - size * 0.2,
            text: &names[r],
            size,
            anchor: Anchor::End,
            colour: INK,
            class: "row-label",
            rotate: 0.0,
        });
        let shown: Vec<&(f64, String)> = row
            .sticks
            .iter()
            .filter(|s| s.0 > 0.0 && s.0 <= xmax)
            .collect();
        for s in &shown {
            let x = f.px(s.0);
            svg.polyline(
                &[(x, base), (x, stick_top)],
                &Stroke {
                    dash: None,
                    ..stroke
                },
                "stick",
            );
        }
        let labels: Vec<Rich> = shown
            .iter()
            .map(|s| {
                if row.term_labels {
                    term_label(&s.1)
                } else {
                    Rich::parse(&s.1)
                }
            })
            .collect();
        let widths: Vec<f64> = labels.iter().map(|l| l.width(small) + size * 0.4).collect();
        if widths.iter().sum::<f64>() <= f.width {
            let wanted: Vec<f64> = shown.iter().map(|s| f.px(s.0)).collect();
            let placed = spread(&wanted, &widths, f.left, f.right());
            let ly = stick_top - size * 0.9;
            for (k, l) in labels.iter().enumerate() {
                if (placed[k] - wanted[k]).abs() > 0.5 {
                    svg.polyline(
                        &[(wanted[k], stick_top), (placed[k], ly + size * 0.2)],
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
                    class: "stick-label",
                    rotate: 0.0,
                });
            }
        }
        svg.close_group();
    }
    svg.finish(
        &super::energy::plain(title),
        &format!(
            "x axis: wavenumber / cm⁻¹; rows: {}.",
            rows.iter()
                .map(|r| r.name.as_str())
                .collect::<Vec<_>>()
                .join(", ")
        ),
    )
}
