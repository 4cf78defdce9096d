//! Serialisable report types and their renderers (table, JSON, CSV, SVG), each through the one
//! [`Render`] trait of `render.rs`.
//!
//! Reports are plain data built from engine results; rendering never computes science. Human
//! tables round; JSON and CSV keep full precision.

pub mod bands;
pub mod check;
pub mod crossover;
pub mod data;
pub mod decimal;
pub mod diagram;
pub mod figures;
pub mod fit_bands;
pub mod html;
pub mod levels;
pub mod magnetism;
pub mod measured;
pub mod predict;
pub mod render;
pub mod sco;
pub mod screen;
pub mod structure;
pub mod structure_spin;
pub mod tetragonal_fit;

use comfy_table::{presets::UTF8_FULL_CONDENSED, ContentArrangement, Table};
pub use render::{to_json, JsonSchema, Render};

/// A table with the project's style and the given header.
pub fn new_table<I, S>(header: I) -> Table
where
    I: IntoIterator<Item = S>,
    S: Into<comfy_table::Cell>,
{
    let mut t = Table::new();
    t.load_style(UTF8_FULL_CONDENSED)
        .set_content_arrangement(ContentArrangement::Disabled)
        .set_header(header);
    t
}

/// A number rounded for a human table.
pub fn fmt_num(x: f64, decimals: usize) -> String {
    if x.is_finite() {
        format!("{x:.decimals$}")
    } else {
        "—".to_string()
    }
}
