//! Tests of the field module. Each check names where its reference value comes from.

use super::*;
use crate::table::Table;
use approx::assert_abs_diff_eq;

fn igrf() -> FieldModel {
    FieldModel::igrf14()
}

#[test]
fn schmidt_functions_match_closed_forms_and_their_derivatives() {
    // Closed forms of the Schmidt semi-normalised functions (Langel 1987, Table 4.1; common practice):
    // P10 = c, P11 = s, P20 = (3c² − 1)/2, P21 = √3 c s, P22 = (√3/2) s², P30 = (5c³ − 3c)/2,
    // P31 = √(3/8) s (5c² − 1), P32 = (√15/2) c s², P33 = (√10/4) s³.
    let (mut p, mut dp) = (Vec::new(), Vec::new());
    for theta in [1e-6, 0.3, 1.0, 1.57, 2.2, 3.1] {
        schmidt(theta, 3, &mut p, &mut dp);
        let (s, c): (f64, f64) = theta.sin_cos();
        let want = [
            (1, 0, c),
            (1, 1, s),
            (2, 0, (3.0 * c * c - 1.0) / 2.0),
            (2, 1, 3f64.sqrt() * c * s),
            (2, 2, 3f64.sqrt() / 2.0 * s * s),
            (3, 0, (5.0 * c.powi(3) - 3.0 * c) / 2.0),
            (3, 1, (3.0f64 / 8.0).sqrt() * s * (5.0 * c * c - 1.0)),
            (3, 2, 15f64.sqrt() / 2.0 * c * s * s),
            (3, 3, 10f64.sqrt() / 4.0 * s.powi(3)),
        ];
        for (n, m, v) in want {
            assert_abs_diff_eq!(p[index(n, m)], v, epsilon = 1e-14);
        }
    }
    // Derivatives against central differences at degree 13.
    let (mut p1, mut p2, mut d) = (Vec::new(), Vec::new(), Vec::new());
    for theta in [0.2, 1.1, 2.7] {
        schmidt(theta, 13, &mut p, &mut dp);
        schmidt(theta + 1e-6, 13, &mut p1, &mut d);
        schmidt(theta - 1e-6, 13, &mut p2, &mut d);
        for k in 0..p.len() {
            assert_abs_diff_eq!(dp[k], (p1[k] - p2[k]) / 2e-6, epsilon = 1e-6);
        }
    }
}

#[test]
fn spectrum_of_degree_one_is_twice_the_dipole_power_and_grid_equals_points() {
    let c = igrf().at(2020.0).unwrap();
    let (g10, g11, h11) = c.dipole_terms();
    // R_1 = 2 (g10² + g11² + h11²) by the Lowes–Mauersberger formula with n = 1.
    assert_abs_diff_eq!(c.power_spectrum()[0], 2.0 * (g10 * g10 + g11 * g11 + h11 * h11), epsilon = 1e-6);
    let g = intensity_grid(&c, 5.0).unwrap();
    for (i, j) in [(0, 0), (17, 33), (35, 71), (20, 60)] {
        assert_abs_diff_eq!(g.at(i, j), surface_intensity(&c, g.lat(i), g.lon(j)), epsilon = 1e-8);
    }
    // The cells tile the sphere: their areas add up to 4πa².
    let total: f64 = (0..g.nlat).map(|i| g.cell_area(i) * g.nlon as f64).sum();
    assert_abs_diff_eq!(total / (4.0 * std::f64::consts::PI * REFERENCE_RADIUS_KM.powi(2)), 1.0, epsilon = 1e-12);
}

#[test]
fn geodetic_and_geocentric_agree_on_the_equator_and_poles_stay_finite() {
    let c = igrf().at(2025.0).unwrap();
    // On the equator the two verticals coincide and the ellipsoid's radius is a = 6378.137 km (WGS84).
    let gd = field_at(&c, &Site::new(0.0, 40.0, 0.0, Frame::Geodetic).unwrap());
    let gc = field_at(&c, &Site::new(0.0, 40.0, WGS84_A_KM - REFERENCE_RADIUS_KM, Frame::Geocentric).unwrap());
    for (a, b) in [(gd.x, gc.x), (gd.y, gc.y), (gd.z, gc.z)] {
        assert_abs_diff_eq!(a, b, epsilon = 1e-9);
    }
    for lat in [90.0, -90.0] {
        for frame in [Frame::Geodetic, Frame::Geocentric] {
            let e = field_at(&c, &Site::new(lat, 0.0, 0.0, frame).unwrap());
            assert!(e.x.is_finite() && e.y.is_finite() && e.z.is_finite());
            // F does not depend on the longitude given for a pole.
            let e2 = field_at(&c, &Site::new(lat, 123.0, 0.0, frame).unwrap());
            assert_abs_diff_eq!(e.f, e2.f, epsilon = 1e-3);
        }
    }
    assert!(Site::new(90.5, 0.0, 0.0, Frame::Geodetic).is_err());
}

#[test]
fn years_outside_the_model_are_refused() {
    let m = igrf();
    assert_eq!(m.span(), (1900.0, 2030.0));
    assert!(m.at(2030.0).is_ok());
    match m.at(2031.0) {
        Err(FieldError::YearOutside { year, first, last, .. }) => {
            assert_eq!((year, first, last), (2031.0, 1900.0, 2030.0))
        }
        other => panic!("{other:?}"),
    }
    assert!(matches!(m.at(1899.9), Err(FieldError::YearOutside { .. })));
    assert!(matches!(m.at(f64::NAN), Err(FieldError::YearOutside { .. })));
}

#[test]
fn interpolation_is_linear_and_extrapolation_uses_the_secular_variation() {
    let m = igrf();
    // Values of the bundled table (IGRF-14): g10 = -29403.41 (2020), -29350.0 (2025), sv 12.6 nT/yr.
    assert_abs_diff_eq!(m.at(2022.5).unwrap().g(1, 0), (-29403.41 - 29350.0) / 2.0, epsilon = 1e-9);
    assert_abs_diff_eq!(m.at(2027.0).unwrap().g(1, 0), -29350.0 + 2.0 * 12.6, epsilon = 1e-9);
    assert_abs_diff_eq!(m.rate(2021.0).unwrap().g(1, 0), (-29350.0 + 29403.41) / 5.0, epsilon = 1e-9);
}

fn table(text: &str) -> Table {
    Table::parse("m.csv", text.as_bytes()).unwrap()
}

#[test]
fn model_tables_with_gaps_repeats_or_bad_orders_are_refused_with_the_line() {
    let ok = "epoch,degree,order,g,h\n2000,1,0,-30000,0\n2000,1,1,-1500,4000\n";
    assert_eq!(FieldModel::from_table(&table(ok)).unwrap().degree(), 1);
    let missing =
        "epoch,degree,order,g,h\n2000,1,0,-30000,0\n2000,1,1,-1500,4000\n2000,2,0,-2000,0\n2000,2,2,1600,-500\n";
    let e = FieldModel::from_table(&table(missing)).unwrap_err();
    assert_eq!((e.line, e.column.as_deref()), (2, Some("degree")));
    assert!(e.message.contains("degree 2 order 1"), "{}", e.message);
    let second_epoch_short = "epoch,degree,order,g,h\n2000,1,0,-30000,0\n2000,1,1,-1500,4000\n2005,1,0,-29900,0\n";
    let e = FieldModel::from_table(&table(second_epoch_short)).unwrap_err();
    assert_eq!(e.line, 4);
    let repeated = "epoch,degree,order,g,h\n2000,1,0,-30000,0\n2000,1,0,-30000,0\n";
    assert_eq!(FieldModel::from_table(&table(repeated)).unwrap_err().line, 3);
    let bad_order = "epoch,degree,order,g,h\n2000,1,2,-30000,0\n";
    assert_eq!(FieldModel::from_table(&table(bad_order)).unwrap_err().column.as_deref(), Some("order"));
    let h_of_zero = "epoch,degree,order,g,h\n2000,1,0,-30000,5\n";
    assert_eq!(FieldModel::from_table(&table(h_of_zero)).unwrap_err().column.as_deref(), Some("h"));
}

#[test]
fn an_axial_dipole_has_its_dip_poles_at_the_geographic_poles() {
    // A geocentric axial dipole: H = 0 exactly at the poles (textbook geometry, common practice).
    let mut c = Coefficients::zeros(1);
    c.g[index(1, 0)] = -30000.0;
    let n = dip_pole(&c, DipPole::Down, None).unwrap();
    let s = dip_pole(&c, DipPole::Up, None).unwrap();
    assert_abs_diff_eq!(n.lat, 90.0, epsilon = 1e-6);
    assert_abs_diff_eq!(s.lat, -90.0, epsilon = 1e-6);
}

/// Facts of the trade (common practice), used as loose checks of the whole chain on IGRF-14.
#[test]
fn igrf14_series_shows_the_commonly_stated_behaviour_of_the_present_field() {
    let m = igrf();
    let opts = SeriesOptions::new(1900.0, 2025.0, 1.0, DEFAULT_LOW_THRESHOLD).unwrap();
    let s = field_series(&m, &opts).unwrap();
    let at = |y: f64| s.iter().find(|e| e.year == y).unwrap();
    // The low's minimum: about 24 000 nT in 1970 and about 22 000 nT in 2020.
    assert!((at(1970.0).low_f - 24_000.0).abs() < 500.0, "{}", at(1970.0).low_f);
    assert!((at(2020.0).low_f - 22_000.0).abs() < 500.0, "{}", at(2020.0).low_f);
    // Its westward drift 1970 → 2020: about 20 km/yr (accepted 15–25).
    let (a, b) = (at(1970.0), at(2020.0));
    let dlon = a.low_lon - b.low_lon;
    let west = dlon.to_radians() * ((a.low_lat + b.low_lat) / 2.0).to_radians().cos() * REFERENCE_RADIUS_KM / 50.0;
    assert!((15.0..25.0).contains(&west), "{west}");
    // The north dip pole: slow in 1950–1980 (< 25 km/yr), fast in 2000–2015 (> 40 km/yr).
    for e in s.iter().filter(|e| e.year > 1950.0 && e.year <= 1980.0) {
        assert!(e.dip_north_speed.unwrap() < 25.0, "{} {:?}", e.year, e.dip_north_speed);
    }
    for e in s.iter().filter(|e| e.year > 2000.0 && e.year <= 2015.0) {
        assert!(e.dip_north_speed.unwrap() > 40.0, "{} {:?}", e.year, e.dip_north_speed);
    }
    // The dipole tilt stays within 9–11.7° over 1900–2025, and the moment falls by 6–9 %.
    assert!(s.iter().all(|e| (9.0..11.7).contains(&e.tilt)));
    let fall = 100.0 * (1.0 - at(2025.0).moment / at(1900.0).moment);
    assert!((6.0..9.0).contains(&fall), "{fall}");
    // A second minimum below 32 000 nT appears south-west of Africa in the 21st century (one in 1970).
    assert_eq!(at(1970.0).low_cells, 1);
    assert_eq!(at(2020.0).low_cells, 2);
    // The 2025 north geomagnetic pole of IGRF-14: 80.8° N, 72.8° W (from memory).
    assert_abs_diff_eq!(at(2025.0).pole_lat, 80.8, epsilon = 0.1);
    assert_abs_diff_eq!(at(2025.0).pole_lon, 360.0 - 72.8, epsilon = 0.1);
}

#[test]
fn context_counts_drops_in_a_hand_worked_record() {
    // A two-epoch model whose moment falls 10 % over 100 years (only g10 is set).
    let text = "epoch,degree,order,g,h\n1900,1,0,-30000,0\n1900,1,1,0,0\n2000,1,0,-27000,0\n2000,1,1,0,0\n";
    let m = FieldModel::from_table(&table(text)).unwrap();
    // Record at 0.0001 Myr spacing (one window = one step): a flat moment with one fall of 20 % and one
    // of 5 % (worked by hand: only the first is as large as today's 10 %).
    let rec = "age,vadm\n0,8e22\n0.0001,8e22\n0.0002,1e23\n0.0003,1e23\n0.0004,1.05263157894737e23\n0.0005,1.05263157894737e23\n";
    let r = PaleoRecord::from_table(&table(rec)).unwrap();
    let c = field_context(&m, &r, None, 0.05).unwrap();
    assert_abs_diff_eq!(c.present_change, -10.0, epsilon = 1e-9);
    assert_eq!(c.n_windows, 5);
    assert_eq!(c.drops_like_present, 1);
    assert_eq!(c.drops_before_reversal, None);
    // Percentile: one window (−20 %) below −10 %, four above: 20 %.
    assert_abs_diff_eq!(c.change_percentile, 20.0, epsilon = 1e-9);
}

#[test]
fn the_series_window_defaults_to_the_models_epochs() {
    // One default window for the `field series` verb and the Python package: the model's first and
    // last epoch unless given; the same checks as SeriesOptions::new on the edges.
    let m = igrf();
    let (first, last) = (m.epochs[0], *m.epochs.last().unwrap());
    let d = SeriesOptions::within(&m, None, None, 5.0, DEFAULT_LOW_THRESHOLD).unwrap();
    assert_eq!(d, SeriesOptions::new(first, last, 5.0, DEFAULT_LOW_THRESHOLD).unwrap());
    let part = SeriesOptions::within(&m, Some(1950.0), None, 5.0, DEFAULT_LOW_THRESHOLD).unwrap();
    assert_eq!((part.from, part.to), (1950.0, last));
    // A start after the model's last epoch leaves `to` before `from`: refused, as by `new`.
    assert!(matches!(
        SeriesOptions::within(&m, Some(last + 10.0), None, 5.0, DEFAULT_LOW_THRESHOLD),
        Err(FieldError::OutOfRange { name: "to", .. })
    ));
    assert!(SeriesOptions::within(&m, None, None, 0.0, DEFAULT_LOW_THRESHOLD).is_err());
}
