//! Polarity of the geomagnetic field: normal or reversed.

/// Polarity of a chron.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
pub enum Polarity {
    /// Normal (field as today), code `N`.
    #[serde(rename = "N")]
    Normal,
    /// Reversed, code `R`.
    #[serde(rename = "R")]
    Reversed,
}

impl Polarity {
    /// The one-letter code.
    pub fn code(self) -> &'static str {
        match self {
            Polarity::Normal => "N",
            Polarity::Reversed => "R",
        }
    }
    /// The other polarity.
    pub fn flip(self) -> Polarity {
        match self {
            Polarity::Normal => Polarity::Reversed,
            Polarity::Reversed => Polarity::Normal,
        }
    }
}
