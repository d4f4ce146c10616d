//! Which way a stratigraphic position runs: height (upward) or depth (downward).

/// Which way the stratigraphic position column runs.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum StratAxis {
    /// `height` in metres, growing upward (younger upward).
    Height,
    /// `depth` in metres, growing downward (cores).
    Depth,
}

impl StratAxis {
    /// The column name.
    pub fn column(self) -> &'static str {
        match self {
            StratAxis::Height => "height",
            StratAxis::Depth => "depth",
        }
    }
}
