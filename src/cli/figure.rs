//! Options shared by commands that draw figures: the column width and a PNG copy.

use super::Failure;
use spinstate::plot::raster::svg_to_png;
use spinstate::plot::style::Column;
use std::path::{Path, PathBuf};

/// PNG resolution (dots per inch): print quality for an 8.5 cm figure (about 1000 px wide).
pub const PNG_DPI: f64 = 300.0;

#[derive(Debug, Clone, clap::Args)]
pub struct FigureArgs {
    /// Also render the figure as PNG (300 dpi) to FILE, with the embedded font.
    #[arg(long, value_name = "FILE")]
    pub png: Option<PathBuf>,
    /// Figure width: single (8.5 cm journal column) or double (17 cm).
    #[arg(long, value_name = "WIDTH", default_value = "single", value_parser = ["single", "double"])]
    pub column: String,
}

impl FigureArgs {
    pub fn column(&self) -> Column {
        Column::parse(&self.column).unwrap_or(Column::Single)
    }
}

/// Writes `svg` rendered as PNG to `path`.
pub fn write_png(svg: &str, path: &Path) -> Result<String, Failure> {
    let png = svg_to_png(svg, PNG_DPI).map_err(|e| Failure::usage(format!("--png: {e}")))?;
    std::fs::write(path, png)
        .map_err(|e| Failure::usage(format!("--png: cannot write {}: {e}", path.display())))?;
    Ok(format!("wrote {}", path.display()))
}

/// Writes an HTML page to `path`.
pub fn write_html(html: &str, path: &Path) -> Result<String, Failure> {
    std::fs::write(path, html)
        .map_err(|e| Failure::usage(format!("--html: cannot write {}: {e}", path.display())))?;
    Ok(format!("wrote {}", path.display()))
}
