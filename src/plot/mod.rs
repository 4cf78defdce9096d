//! Publication figures as SVG (and PNG through a pure-Rust rasteriser).
//!
//! One small SVG writer ([`svg`]) with sub-point coordinates and physical sizes for 8.5 cm and
//! 17 cm journal columns ([`style::Column`]); rich labels with italic quantity symbols and
//! sub/superscripts ([`text`]); label spreading with leader lines ([`layout`]); frames and ticks
//! ([`axes`]); legends drawn with their series' own strokes ([`legend`]); and the figure kinds:
//! the energy diagram ([`energy`]), moments against temperature ([`moment`]), observed bands
//! against computed transitions ([`sticks`]) and spin transitions against temperature
//! ([`transition`]). [`marks`] turns a prediction into the sample marks the energy diagram draws. Rendering never computes science beyond placing things.
//!
//! Conventions followed: axis labels "quantity / unit" with italic quantity symbols (ISO
//! 80000-1:2009; Cohen et al., IUPAC Green Book, 3rd ed., 2007, §1.3); figure widths of one
//! (8.5 cm) and two (17 cm) journal columns and 7–8 pt text (common practice of chemistry
//! journals' author guidelines); Mulliken labels with the multiplicity as a left superscript.

pub mod axes;
pub mod energy;
pub mod layout;
pub mod legend;
pub mod marks;
pub mod moment;
pub mod raster;
pub mod sticks;
pub mod style;
pub mod svg;
pub mod text;
pub mod transition;
