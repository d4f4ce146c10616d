//! Rendering a figure to SVG or PNG bytes, with the embedded font.
//!
//! Figures never depend on system fonts: DejaVu Sans (Bitstream Vera licence, notice in
//! `assets/fonts/DejaVu-LICENSE.txt`) is compiled in and registered under the family name `sans-serif`.

use crate::error::{Error, Result};
use plotters::coord::Shift;
use plotters::prelude::*;
use std::path::Path;
use std::sync::Once;

static FONT: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");
static REGISTER: Once = Once::new();

/// Register the embedded font (idempotent).
pub fn register_fonts() {
    REGISTER.call_once(|| {
        for style in [FontStyle::Normal, FontStyle::Bold, FontStyle::Italic, FontStyle::Oblique] {
            // The font is a valid TrueType file compiled into the binary; failure is impossible.
            let _ = plotters::style::register_font("sans-serif", style, FONT);
        }
    });
}

/// Output format of a figure, chosen by file extension.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FigureFormat {
    /// Scalable vector graphics (`.svg`).
    Svg,
    /// Portable network graphics (`.png`).
    Png,
}

impl FigureFormat {
    /// From a path's extension (`.svg` or `.png`, any case).
    pub fn from_path(path: &Path) -> Result<Self> {
        match path.extension().and_then(|e| e.to_str()).map(str::to_lowercase).as_deref() {
            Some("svg") => Ok(Self::Svg),
            Some("png") => Ok(Self::Png),
            _ => Err(Error::FigurePath(path.display().to_string())),
        }
    }
    /// The file extension.
    pub fn extension(self) -> &'static str {
        match self {
            Self::Svg => "svg",
            Self::Png => "png",
        }
    }
}

/// Something that can draw itself on any plotters backend.
pub trait Figure {
    /// Width and height in pixels.
    fn size(&self) -> (u32, u32);
    /// Draw on the root area.
    fn draw<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> std::result::Result<(), String>;
}

/// Convert a plotters drawing error into a message (used with `?` inside [`Figure::draw`]).
pub fn de<E: std::fmt::Display>(e: E) -> String {
    e.to_string()
}

/// Render a figure to the bytes of an SVG or PNG file.
pub fn render<F: Figure>(fig: &F, format: FigureFormat) -> Result<Vec<u8>> {
    register_fonts();
    let (w, h) = fig.size();
    let fail = |e: String| Error::Figure { context: "drawing the figure failed".into(), detail: e };
    match format {
        FigureFormat::Svg => {
            let mut s = String::new();
            {
                let root = SVGBackend::with_string(&mut s, (w, h)).into_drawing_area();
                fig.draw(&root).map_err(fail)?;
                root.present().map_err(|e| fail(e.to_string()))?;
            }
            Ok(s.into_bytes())
        }
        FigureFormat::Png => {
            let mut buf = vec![0u8; (w * h * 3) as usize];
            {
                let root = BitMapBackend::with_buffer(&mut buf, (w, h)).into_drawing_area();
                fig.draw(&root).map_err(fail)?;
                root.present().map_err(|e| fail(e.to_string()))?;
            }
            encode_png(&buf, w, h)
        }
    }
}

fn encode_png(rgb: &[u8], w: u32, h: u32) -> Result<Vec<u8>> {
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, w, h);
        enc.set_color(png::ColorType::Rgb);
        enc.set_depth(png::BitDepth::Eight);
        let png =
            |e: png::EncodingError| Error::Figure { context: "PNG encoding failed".into(), detail: e.to_string() };
        let mut wr = enc.write_header().map_err(png)?;
        wr.write_image_data(rgb).map_err(png)?;
    }
    Ok(out)
}
