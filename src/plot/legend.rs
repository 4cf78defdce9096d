//! Legends laid out in rows below a plot (they never cover data). Each key is drawn with the
//! very stroke, swatch or marker of its series, so the legend matches what it explains.

use super::style::INK;
use super::svg::{Anchor, Label, Shape, Stroke, Svg};
use super::text::Rich;

/// What a legend entry shows beside its text.
#[derive(Debug, Clone, PartialEq)]
pub enum Key {
    /// A line drawn with this stroke (the series' own).
    Line(Stroke),
    /// A filled swatch (colour, opacity).
    Swatch(&'static str, f64),
    /// A marker: circle with this stroke and fill.
    Marker(Stroke, &'static str),
    /// A marker of the given shape with this stroke and fill (as drawn on the plot).
    Shape(Shape, Stroke, &'static str),
}

fn key_width(size: f64) -> f64 {
    size * 2.6
}

fn entry_width(text: &Rich, size: f64) -> f64 {
    key_width(size) + size * 0.5 + text.width(size) + size * 1.4
}

fn rows(entries: &[(Key, Rich)], size: f64, max_width: f64) -> Vec<Vec<usize>> {
    let mut rows: Vec<Vec<usize>> = Vec::new();
    let mut used = f64::INFINITY;
    for (i, (_, t)) in entries.iter().enumerate() {
        let w = entry_width(t, size);
        if used + w > max_width {
            rows.push(Vec::new());
            used = 0.0;
        }
        rows.last_mut().expect("a row").push(i);
        used += w;
    }
    rows
}

/// Height (pt) of the legend for these entries within `max_width`.
pub fn legend_height(entries: &[(Key, Rich)], size: f64, max_width: f64) -> f64 {
    rows(entries, size, max_width).len() as f64 * size * 1.35
}

/// Draws the entries in rows from (x, y) (top-left), wrapping at `max_width`.
pub fn draw_flow_legend(
    svg: &mut Svg,
    (x, y): (f64, f64),
    entries: &[(Key, Rich)],
    size: f64,
    max_width: f64,
) {
    if entries.is_empty() {
        return;
    }
    svg.open_group("legend");
    let line_h = size * 1.35;
    for (r, row) in rows(entries, size, max_width).iter().enumerate() {
        let cy = y + line_h * (r as f64 + 0.5);
        let mut kx = x;
        for &i in row {
            let (key, text) = &entries[i];
            let kw = key_width(size);
            match key {
                Key::Line(s) => svg.polyline(&[(kx, cy), (kx + kw, cy)], s, "legend-key"),
                Key::Swatch(c, o) => svg.rect(
                    (kx, cy - size * 0.35),
                    (kw, size * 0.7),
                    c,
                    *o,
                    None,
                    "legend-key",
                ),
                Key::Marker(s, fill) => {
                    svg.circle((kx + kw / 2.0, cy), size * 0.3, fill, s, "legend-key")
                }
                Key::Shape(shape, s, fill) => svg.marker(
                    *shape,
                    (kx + kw / 2.0, cy),
                    size * 0.3,
                    fill,
                    s,
                    "legend-key",
                ),
            }
            svg.text(&Label {
                x: kx + kw + size * 0.5,
                y: cy + size * 0.35,
                text,
                size,
                anchor: Anchor::Start,
                colour: INK,
                class: "legend-label",
                rotate: 0.0,
            });
            kx += entry_width(text, size);
        }
    }
    svg.close_group();
}
