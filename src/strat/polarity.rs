//! Polarity of one stratigraphic level from its VGP latitude.

/// Polarity class of a level or a magnetozone.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
pub enum ZonePolarity {
    /// Normal: the VGP lies at or above `+threshold` latitude. Code `N`.
    #[serde(rename = "N")]
    Normal,
    /// Reversed: the VGP lies at or below `−threshold`. Code `R`.
    #[serde(rename = "R")]
    Reversed,
    /// Intermediate (transitional or unreliable): the VGP lies between the two thresholds. Code `I`.
    #[serde(rename = "I")]
    Intermediate,
}

impl ZonePolarity {
    /// One-letter code: `N`, `R` or `I`.
    pub fn code(self) -> &'static str {
        match self {
            ZonePolarity::Normal => "N",
            ZonePolarity::Reversed => "R",
            ZonePolarity::Intermediate => "I",
        }
    }
    /// Parse a code (`N`, `R`, `I`, or the words normal / reversed / intermediate, any case).
    pub fn parse(s: &str) -> Option<ZonePolarity> {
        match s.trim().to_lowercase().as_str() {
            "n" | "normal" => Some(ZonePolarity::Normal),
            "r" | "reversed" | "reverse" => Some(ZonePolarity::Reversed),
            "i" | "intermediate" | "transitional" => Some(ZonePolarity::Intermediate),
            _ => None,
        }
    }
    /// The same polarity as a time-scale polarity, if it is not intermediate.
    pub fn as_chron(self) -> Option<crate::model::Polarity> {
        match self {
            ZonePolarity::Normal => Some(crate::model::Polarity::Normal),
            ZonePolarity::Reversed => Some(crate::model::Polarity::Reversed),
            ZonePolarity::Intermediate => None,
        }
    }
}

/// Default VGP-latitude threshold, degrees.
///
/// 45° is halfway between the pole and the equator: a VGP in the northern polar cap (above 45°N) is read
/// as normal, one in the southern cap as reversed, and one in the equatorial band as intermediate. It is
/// common practice in magnetostratigraphy (a fact of the trade, not a derived optimum); with strong secular
/// variation (high-latitude sites, VGP scatter of 20° and more) a lower threshold such as 30° loses fewer
/// good levels, and a higher one (60°) flags more transitional ones. The choice is the user's.
pub const DEFAULT_THRESHOLD: f64 = 45.0;

/// Classify a VGP latitude.
///
/// # Units
/// `vgp_lat` and `threshold` in degrees; `threshold` in (0, 90].
///
/// # Formula
/// N if λ ≥ θ, R if λ ≤ −θ, I otherwise.
///
/// # References
/// Common practice; see Opdyke & Channell (1996), *Magnetic Stratigraphy*, Academic Press, ch. 5, for the
/// use of VGP latitude in polarity determination.
pub fn classify(vgp_lat: f64, threshold: f64) -> ZonePolarity {
    if vgp_lat >= threshold {
        ZonePolarity::Normal
    } else if vgp_lat <= -threshold {
        ZonePolarity::Reversed
    } else {
        ZonePolarity::Intermediate
    }
}

/// Check a threshold: finite, in (0, 90].
pub fn check_threshold(threshold: f64) -> crate::Result<f64> {
    if threshold.is_finite() && threshold > 0.0 && threshold <= 90.0 {
        Ok(threshold)
    } else {
        Err(crate::Error::OutOfRange { name: "VGP latitude threshold", value: threshold, range: "(0, 90]" })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn thresholds_are_inclusive_and_symmetric() {
        assert_eq!(classify(45.0, 45.0), ZonePolarity::Normal);
        assert_eq!(classify(44.999, 45.0), ZonePolarity::Intermediate);
        assert_eq!(classify(-45.0, 45.0), ZonePolarity::Reversed);
        assert_eq!(classify(0.0, 45.0), ZonePolarity::Intermediate);
        assert_eq!(classify(90.0, 90.0), ZonePolarity::Normal);
        assert!(check_threshold(0.0).is_err() && check_threshold(91.0).is_err() && check_threshold(f64::NAN).is_err());
        assert_eq!(ZonePolarity::parse(" r "), Some(ZonePolarity::Reversed));
        assert_eq!(ZonePolarity::parse("x"), None);
    }
}
