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
    /// Figure width: single (8.5 cm journal column, the default) or double (17 cm).
    #[arg(long, value_name = "WIDTH", value_parser = ["single", "double"])]
    pub column: Option<String>,
}

impl FigureArgs {
    pub fn column(&self) -> Column {
        self.column
            .as_deref()
            .and_then(Column::parse)
            .unwrap_or(Column::Single)
    }

    /// Refuses figure options when no figure is written (`svg`: the command's --svg given):
    /// --column and the command's own figure-only `options` (given, name).
    pub fn check_used(&self, svg: bool, options: &[(bool, &str)]) -> Result<(), Failure> {
        let picture = svg || self.png.is_some();
        for &(given, option) in [(self.column.is_some(), "--column")].iter().chain(options) {
            only_with(given, option, picture, "--svg FILE or --png FILE")?;
        }
        Ok(())
    }
}

/// An option that only means something with another: a usage error naming both when `given`
/// without `needed`.
pub fn only_with(given: bool, option: &str, needed: bool, needs: &str) -> Result<(), Failure> {
    if given && !needed {
        return Err(Failure::usage(format!(
            "{option} applies only with {needs}; add it or drop {option}"
        )));
    }
    Ok(())
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
