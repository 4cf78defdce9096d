//! A small SVG writer: every coordinate in points (1/72 in) with two decimals, so curves are
//! smooth at any zoom, and a physical width in millimetres so a figure drops into a journal
//! column at its printed size.

use super::text::{Rich, Script, FONT_FAMILY, SCRIPT_SCALE};
use std::fmt::Write;

/// Millimetres per point.
pub const MM_PER_PT: f64 = 25.4 / 72.0;

/// How a line is drawn.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Stroke {
    /// CSS colour, e.g. "#1d3557".
    pub colour: &'static str,
    /// Width (pt).
    pub width: f64,
    /// Dash pattern (pt), e.g. "3 1.5"; None for solid.
    pub dash: Option<&'static str>,
}

impl Stroke {
    pub const fn solid(colour: &'static str, width: f64) -> Stroke {
        Stroke {
            colour,
            width,
            dash: None,
        }
    }

    fn attrs(&self) -> String {
        let mut s = format!(
            "stroke=\"{}\" stroke-width=\"{}\"",
            self.colour,
            num(self.width)
        );
        if let Some(d) = self.dash {
            let _ = write!(s, " stroke-dasharray=\"{d}\"");
        }
        s
    }
}

/// Shape of a data marker.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Shape {
    Circle,
    /// Triangle pointing up (e.g. heating).
    Up,
    /// Triangle pointing down (e.g. cooling).
    Down,
}

/// Horizontal anchoring of a text.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Anchor {
    Start,
    Middle,
    End,
}

impl Anchor {
    fn name(self) -> &'static str {
        match self {
            Anchor::Start => "start",
            Anchor::Middle => "middle",
            Anchor::End => "end",
        }
    }
}

/// A text to place.
#[derive(Debug, Clone)]
pub struct Label<'a> {
    pub x: f64,
    /// Baseline (pt).
    pub y: f64,
    pub text: &'a Rich,
    /// Font size (pt).
    pub size: f64,
    pub anchor: Anchor,
    pub colour: &'static str,
    /// A class name for readers and tests, e.g. "level-label".
    pub class: &'static str,
    /// Rotation in degrees about (x, y); 0 for none.
    pub rotate: f64,
}

/// A number with at most two decimals and no trailing zeros.
pub fn num(x: f64) -> String {
    let r = (x * 100.0).round() / 100.0;
    let r = if r == 0.0 { 0.0 } else { r };
    let s = format!("{r:.2}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    s.to_string()
}

/// Escapes text for XML content and attributes.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            _ => out.push(c),
        }
    }
    out
}

/// An SVG document being written.
#[derive(Debug, Clone)]
pub struct Svg {
    pub width: f64,
    pub height: f64,
    body: String,
}

impl Svg {
    /// A blank white figure `width` × `height` points.
    pub fn new(width: f64, height: f64) -> Svg {
        Svg {
            width,
            height,
            body: String::new(),
        }
    }

    /// Opens a group with a class name.
    pub fn open_group(&mut self, class: &str) {
        let _ = writeln!(self.body, "<g class=\"{}\">", escape(class));
    }

    pub fn close_group(&mut self) {
        self.body.push_str("</g>\n");
    }

    pub fn line(&mut self, (x1, y1): (f64, f64), (x2, y2): (f64, f64), stroke: &Stroke) {
        let _ = writeln!(
            self.body,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" {}/>",
            num(x1),
            num(y1),
            num(x2),
            num(y2),
            stroke.attrs()
        );
    }

    /// A polyline through `points` (at least two) as one path, with round joins.
    pub fn polyline(&mut self, points: &[(f64, f64)], stroke: &Stroke, class: &str) {
        if points.len() < 2 {
            return;
        }
        let mut d = String::new();
        for (i, (x, y)) in points.iter().enumerate() {
            let _ = write!(
                d,
                "{}{} {}",
                if i == 0 { "M" } else { " L" },
                num(*x),
                num(*y)
            );
        }
        let _ = writeln!(
            self.body,
            "<path class=\"{}\" d=\"{d}\" fill=\"none\" {} stroke-linejoin=\"round\" stroke-linecap=\"round\"/>",
            escape(class),
            stroke.attrs()
        );
    }

    /// A rectangle; `fill` a CSS colour or "none".
    pub fn rect(
        &mut self,
        (x, y): (f64, f64),
        (w, h): (f64, f64),
        fill: &str,
        opacity: f64,
        stroke: Option<&Stroke>,
        class: &str,
    ) {
        let _ = writeln!(
            self.body,
            "<rect class=\"{}\" x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\" fill-opacity=\"{}\" {}/>",
            escape(class),
            num(x),
            num(y),
            num(w.max(0.0)),
            num(h.max(0.0)),
            fill,
            num(opacity),
            stroke.map_or("stroke=\"none\"".to_string(), |s| s.attrs())
        );
    }

    /// A circle of radius `r` (pt): filled with `fill` ("white" for open markers).
    pub fn circle(&mut self, (x, y): (f64, f64), r: f64, fill: &str, stroke: &Stroke, class: &str) {
        let _ = writeln!(
            self.body,
            "<circle class=\"{}\" cx=\"{}\" cy=\"{}\" r=\"{}\" fill=\"{}\" {}/>",
            escape(class),
            num(x),
            num(y),
            num(r),
            fill,
            stroke.attrs()
        );
    }

    /// A data marker of radius `r` (pt) centred at (x, y): a circle, or a triangle pointing up or
    /// down (its centroid at the point), outlined with `stroke` and filled with `fill` ("white"
    /// for open markers).
    pub fn marker(
        &mut self,
        shape: Shape,
        (x, y): (f64, f64),
        r: f64,
        fill: &str,
        stroke: &Stroke,
        class: &str,
    ) {
        let tri = |dir: f64| {
            // Equilateral triangle with circumradius r·1.25 (same visual weight as the circle).
            let k = r * 1.25;
            [
                (x, y - dir * k),
                (x - k * 0.866, y + dir * k * 0.5),
                (x + k * 0.866, y + dir * k * 0.5),
            ]
        };
        match shape {
            Shape::Circle => self.circle((x, y), r, fill, stroke, class),
            Shape::Up | Shape::Down => {
                let pts = tri(if shape == Shape::Up { 1.0 } else { -1.0 });
                let p: Vec<String> = pts
                    .iter()
                    .map(|(a, b)| format!("{},{}", num(*a), num(*b)))
                    .collect();
                let _ = writeln!(
                    self.body,
                    "<polygon class=\"{}\" points=\"{}\" fill=\"{}\" {} stroke-linejoin=\"round\"/>",
                    escape(class),
                    p.join(" "),
                    fill,
                    stroke.attrs()
                );
            }
        }
    }

    /// A filled polygon.
    pub fn polygon(&mut self, points: &[(f64, f64)], fill: &str, class: &str) {
        let pts: Vec<String> = points
            .iter()
            .map(|(x, y)| format!("{},{}", num(*x), num(*y)))
            .collect();
        let _ = writeln!(
            self.body,
            "<polygon class=\"{}\" points=\"{}\" fill=\"{}\" stroke=\"none\"/>",
            escape(class),
            pts.join(" "),
            fill
        );
    }

    /// A vertical arrow from `y_from` to `y_to` at `x`, head at `y_to`.
    pub fn arrow(&mut self, x: f64, y_from: f64, y_to: f64, stroke: &Stroke, class: &str) {
        let head = 3.2 * stroke.width.max(0.5);
        let dir = if y_to < y_from { 1.0 } else { -1.0 };
        self.polyline(&[(x, y_from), (x, y_to + dir * head * 0.8)], stroke, class);
        self.polygon(
            &[
                (x, y_to),
                (x - head * 0.45, y_to + dir * head),
                (x + head * 0.45, y_to + dir * head),
            ],
            stroke.colour,
            class,
        );
    }

    /// The figure's title at the top left, for a figure whose body text is `size` pt; a title
    /// wider than the figure is set smaller until it fits.
    pub fn title(&mut self, text: &Rich, size: f64) {
        let room = self.width - size * 1.2;
        let wide = text.width(size * 1.05);
        let title_size = if wide > room && wide > 0.0 {
            size * 1.05 * room / wide
        } else {
            size * 1.05
        };
        self.text(&Label {
            x: size * 0.6,
            y: size * 1.25,
            text,
            size: title_size,
            anchor: Anchor::Start,
            colour: super::style::INK,
            class: "figure-title",
            rotate: 0.0,
        });
    }

    /// A text with its runs as tspans (sub- and superscripts shifted by `dy`).
    pub fn text(&mut self, l: &Label<'_>) {
        let mut s = format!(
            "<text class=\"{}\" x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{}\" fill=\"{}\"",
            escape(l.class),
            num(l.x),
            num(l.y),
            num(l.size),
            l.anchor.name(),
            l.colour
        );
        if l.rotate != 0.0 {
            let _ = write!(
                s,
                " transform=\"rotate({} {} {})\"",
                num(l.rotate),
                num(l.x),
                num(l.y)
            );
        }
        s.push('>');
        let small = num(l.size * SCRIPT_SCALE);
        let shift_sub = l.size * 0.22;
        let shift_sup = -l.size * 0.36;
        let mut offset = 0.0; // current baseline shift
        for span in &l.text.spans {
            let (target, attrs) = match span.script {
                Script::Normal => (0.0, String::new()),
                Script::Italic => (0.0, " font-style=\"italic\"".to_string()),
                Script::Sub => (shift_sub, format!(" font-size=\"{small}\"")),
                Script::Sup => (shift_sup, format!(" font-size=\"{small}\"")),
            };
            let dy = target - offset;
            offset = target;
            let dy_attr = if dy.abs() > 1e-9 {
                format!(" dy=\"{}\"", num(dy))
            } else {
                String::new()
            };
            let _ = write!(s, "<tspan{dy_attr}{attrs}>{}</tspan>", escape(&span.text));
        }
        s.push_str("</text>\n");
        self.body.push_str(&s);
    }

    /// Raw SVG markup (already escaped), e.g. a `<title>`.
    pub fn raw(&mut self, markup: &str) {
        self.body.push_str(markup);
    }

    /// The finished document: physical size in mm, a `viewBox` in points, the embedded font's
    /// family with fall-backs, a white background and an accessible title.
    ///
    /// `desc` is a plain-text description (axes and what is marked) for screen readers and search.
    pub fn finish(self, title: &str, desc: &str) -> String {
        format!(
            "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{}mm\" height=\"{}mm\" viewBox=\"0 0 {} {}\" font-family=\"{}\" role=\"img\">\n<title>{}</title>\n<desc>{}</desc>\n<rect class=\"background\" x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"white\"/>\n{}</svg>\n",
            num(self.width * MM_PER_PT),
            num(self.height * MM_PER_PT),
            num(self.width),
            num(self.height),
            FONT_FAMILY,
            escape(title),
            escape(desc),
            num(self.width),
            num(self.height),
            self.body
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_keep_two_decimals() {
        assert_eq!(num(1.0), "1");
        assert_eq!(num(1.234), "1.23");
        assert_eq!(num(-0.001), "0");
        assert_eq!(num(12.5), "12.5");
    }

    #[test]
    fn escapes_markup() {
        assert_eq!(escape("a<b & \"c\""), "a&lt;b &amp; &quot;c&quot;");
    }
}
