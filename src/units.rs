//! Units: the conversions between the units of the interface, in one place.
//!
//! Times of the present field are in years, those of the rock record in Myr (ages in Ma).
//!
//! Accumulation rates are given to people in cm/kyr (common practice in magnetostratigraphy) and used
//! inside as m/Myr, since positions are in metres and ages in Ma: 1 cm/kyr = 0.01 m / 0.001 Myr = 10 m/Myr.

/// Metres per Myr in one cm/kyr (1 cm/kyr = 10 m/Myr).
pub const M_PER_MYR_IN_CM_PER_KYR: f64 = 10.0;

/// An accumulation rate in cm/kyr as m/Myr: `rate` × 10.
///
/// # Units
/// `rate` in cm/kyr; the result in m/Myr.
pub fn cm_per_kyr_to_m_per_myr(rate: f64) -> f64 {
    rate * M_PER_MYR_IN_CM_PER_KYR
}

/// An accumulation rate in m/Myr as cm/kyr: `rate` × 0.1.
///
/// # Units
/// `rate` in m/Myr; the result in cm/kyr.
///
/// # Formula
/// Multiplied by 0.1 (not divided by 10): the two differ in the last bit for some values, and the
/// published outputs were made with the product.
pub fn m_per_myr_to_cm_per_kyr(rate: f64) -> f64 {
    rate * 0.1
}

/// Years in one Myr.
pub const YEARS_PER_MYR: f64 = 1e6;

/// A length of time in years as Myr: `years` / 10⁶.
pub fn years_to_myr(years: f64) -> f64 {
    years / YEARS_PER_MYR
}

/// A length of time in Myr as years: `myr` × 10⁶.
pub fn myr_to_years(myr: f64) -> f64 {
    myr * YEARS_PER_MYR
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn years_and_myr() {
        // Definition: 1 Myr = 10⁶ years (the model's span of 125 years is 0.000125 Myr).
        assert_eq!(years_to_myr(125.0), 0.000125);
        assert_eq!(myr_to_years(0.05), 50_000.0);
        assert!((myr_to_years(years_to_myr(2025.0)) - 2025.0).abs() < 1e-9);
    }

    #[test]
    fn the_conversions_are_inverse_and_match_the_definition() {
        // Definition: 1 cm = 0.01 m, 1 kyr = 0.001 Myr, so 1 cm/kyr = 10 m/Myr.
        assert_eq!(cm_per_kyr_to_m_per_myr(1.0), 0.01 / 0.001);
        assert_eq!(cm_per_kyr_to_m_per_myr(2.5), 25.0);
        assert!((m_per_myr_to_cm_per_kyr(25.0) - 2.5).abs() < 1e-15);
        for r in [0.013, 0.7, 1.45, 3.0, 17.25] {
            assert!((m_per_myr_to_cm_per_kyr(cm_per_kyr_to_m_per_myr(r)) - r).abs() < 1e-15 * r.max(1.0));
        }
    }
}
