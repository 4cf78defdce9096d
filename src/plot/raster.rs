//! PNG rendering of our SVGs with a pure-Rust rasteriser (resvg). The embedded DejaVu Sans is
//! loaded into the font database, so text renders the same on machines without system fonts.

use crate::error::{Error, Result};
use resvg::{tiny_skia, usvg};
use std::sync::{Arc, OnceLock};

fn fonts() -> Arc<usvg::fontdb::Database> {
    static DB: OnceLock<Arc<usvg::fontdb::Database>> = OnceLock::new();
    DB.get_or_init(|| {
        let mut db = usvg::fontdb::Database::new();
        db.load_font_data(dejavu::sans::regular().to_vec());
        db.load_font_data(dejavu::sans::oblique().to_vec());
        db.load_font_data(dejavu::sans::bold().to_vec());
        db.set_sans_serif_family("DejaVu Sans");
        Arc::new(db)
    })
    .clone()
}

/// Renders SVG text to PNG bytes at `dpi` dots per inch (the SVG's size is in mm).
pub fn svg_to_png(svg: &str, dpi: f64) -> Result<Vec<u8>> {
    let pixmap = rasterise(svg, dpi)?;
    pixmap
        .encode_png()
        .map_err(|e| Error::Computation(format!("PNG encoding failed: {e}")))
}

/// Renders SVG text to an RGBA pixmap at `dpi`.
pub fn rasterise(svg: &str, dpi: f64) -> Result<tiny_skia::Pixmap> {
    let options = usvg::Options {
        fontdb: fonts(),
        font_family: "DejaVu Sans".to_string(),
        ..usvg::Options::default()
    };
    let tree = usvg::Tree::from_str(svg, &options)
        .map_err(|e| Error::Computation(format!("SVG could not be read for rendering: {e}")))?;
    // The tree's size is in CSS px (96 per inch); scale to the wanted dpi.
    let scale = (dpi / 96.0) as f32;
    let size = tree.size();
    let w = (size.width() * scale).ceil() as u32;
    let h = (size.height() * scale).ceil() as u32;
    let mut pixmap = tiny_skia::Pixmap::new(w.max(1), h.max(1))
        .ok_or_else(|| Error::Computation("PNG size is zero or too large".into()))?;
    pixmap.fill(tiny_skia::Color::WHITE);
    resvg::render(
        &tree,
        tiny_skia::Transform::from_scale(scale, scale),
        &mut pixmap.as_mut(),
    );
    Ok(pixmap)
}

/// Share of pixels that are not (near) white: a quick "something was drawn" measure.
pub fn ink_fraction(pixmap: &tiny_skia::Pixmap) -> f64 {
    let data = pixmap.data();
    let n = data.len() / 4;
    let inked = data
        .chunks_exact(4)
        .filter(|p| p[0] < 200 || p[1] < 200 || p[2] < 200)
        .count();
    inked as f64 / n.max(1) as f64
}
