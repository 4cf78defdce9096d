//! The project's figure style: column sizes, font sizes and a palette of its own in which every
//! series differs in lightness and in dash pattern, so figures survive greyscale printing and
//! read for colour-blind readers (no red–green pair carries meaning).

use super::svg::Stroke;

/// Printed width of a figure.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Column {
    /// One journal column, 8.5 cm wide (the usual single-column figure width, common practice).
    Single,
    /// Two columns, 17 cm wide (the usual full-page figure width, common practice).
    Double,
}

impl Column {
    /// Width in points (85 mm or 170 mm).
    pub fn width(self) -> f64 {
        match self {
            Column::Single => 85.0 / super::svg::MM_PER_PT,
            Column::Double => 170.0 / super::svg::MM_PER_PT,
        }
    }

    /// Main font size (pt): 7 pt in one column, 8 pt across two (the printed minimum most
    /// journals ask for is 6–7 pt, common practice).
    pub fn font(self) -> f64 {
        match self {
            Column::Single => 7.0,
            Column::Double => 8.0,
        }
    }

    /// Parses "single" or "double".
    pub fn parse(s: &str) -> Option<Column> {
        match s.to_ascii_lowercase().as_str() {
            "single" | "1" | "8.5cm" => Some(Column::Single),
            "double" | "2" | "17cm" => Some(Column::Double),
            _ => None,
        }
    }
}

/// Axis, tick and text colour.
pub const INK: &str = "#1a1a1a";
/// Grey for context (unhighlighted levels, grid).
pub const MUTED: &str = "#a6a6a6";
/// Fill of the sample's uncertainty band.
pub const BAND_FILL: &str = "#7f95b8";

/// The series palette: dark to light, each with its own dash, in an order where neighbours
/// differ most. Colours: ink blue, burnt orange, slate, plum, ochre, teal-grey.
const PALETTE: [(&str, Option<&str>); 6] = [
    ("#1f3b73", None),
    ("#c8611c", Some("4.5 1.6")),
    ("#5c7c99", Some("1.2 1.3")),
    ("#7a3b73", Some("5 1.4 1.2 1.4")),
    ("#b58b12", Some("2.6 1.3")),
    ("#3f6e6a", Some("7 2")),
];

/// The stroke of series number `i` (wraps after six).
pub fn series(i: usize, width: f64) -> Stroke {
    let (colour, dash) = PALETTE[i % PALETTE.len()];
    Stroke {
        colour,
        width,
        dash,
    }
}

/// The stroke of levels of spin multiplicity `m` (1..=6).
pub fn multiplicity(m: i32, width: f64) -> Stroke {
    series((m.clamp(1, 6) - 1) as usize, width)
}

/// Name of a multiplicity for legends.
pub fn multiplicity_name(m: i32) -> String {
    match m {
        1 => "singlets".into(),
        2 => "doublets".into(),
        3 => "triplets".into(),
        4 => "quartets".into(),
        5 => "quintets".into(),
        6 => "sextets".into(),
        m => format!("2S+1 = {m}"),
    }
}

/// Relative luminance (0..1) of a "#rrggbb" colour (ITU-R BT.709 weights on linear sRGB, as in
/// WCAG 2.0), used by the tests to keep palette entries apart in greyscale.
pub fn luminance(hex: &str) -> f64 {
    let h = hex.trim_start_matches('#');
    let ch = |i: usize| {
        let v = f64::from(u8::from_str_radix(&h[i..i + 2], 16).unwrap_or(0)) / 255.0;
        if v <= 0.03928 {
            v / 12.92
        } else {
            ((v + 0.055) / 1.055).powf(2.4)
        }
    };
    0.2126 * ch(0) + 0.7152 * ch(2) + 0.0722 * ch(4)
}

/// Every palette entry (colour, dash), for tests and legends.
pub fn palette() -> Vec<(&'static str, Option<&'static str>)> {
    PALETTE.to_vec()
}
