//! One stage of the chain as the report shows it, and the figure each stage may draw (SVG and PNG).

use super::FigureOutput;
use crate::error::{Error, Result};
use crate::figures::{render, Figure, FigureFormat};

/// One stage of the chain: what it did, what it found, or why it was skipped.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Stage {
    /// Short name (a heading in the report).
    pub name: String,
    /// Whether it ran.
    pub ran: bool,
    /// What was done, with which parameters.
    pub method: String,
    /// What was found (or why the stage was skipped).
    pub result: String,
    /// Stems of the tables this stage wrote.
    pub tables: Vec<String>,
    /// Stems of the figures this stage drew.
    pub figures: Vec<String>,
}

impl Stage {
    pub(super) fn new(name: &str) -> Self {
        Stage {
            name: name.into(),
            ran: true,
            method: String::new(),
            result: String::new(),
            tables: vec![],
            figures: vec![],
        }
    }
}

/// Render `fig` as SVG and PNG under the file stem `stem`, with its caption.
pub(super) fn draw<F: Figure>(fig: &F, stem: &str, caption: String) -> Result<FigureOutput> {
    let svg = String::from_utf8(render(fig, FigureFormat::Svg)?)
        .map_err(|e| Error::Figure { context: format!("figure {stem}"), detail: e.to_string() })?;
    let png = render(fig, FigureFormat::Png)?;
    Ok(FigureOutput { stem: stem.into(), caption, svg, png })
}
