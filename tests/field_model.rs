//! The bundled IGRF-14 model and the field synthesis against an outside implementation.
//!
//! Reference values: ppigrf 2.1.0 (PyPI, pure-Python IGRF with its own IGRF14.shc), computed once by
//! `tests/oracles/make_field_reference.py` (the command and the library versions are in its docstring).

use lodestone::field::{dip_pole, field_at, DipPole, FieldModel, Frame, Site};

/// The decimal year at which our linear-in-decimal-years interpolation takes the same fraction of a
/// five-year IGRF interval as ppigrf, which turns a decimal year into a date (day of year =
/// fraction × 365 or 366, as its `yearfrac_to_datetime`) and interpolates in days between epochs.
fn ppigrf_equivalent_year(y: f64) -> f64 {
    let leap = |y: i64| (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    let days = |y: i64| if leap(y) { 366.0 } else { 365.0 };
    let year = y.floor() as i64;
    let epoch = (year.min(2029) / 5) * 5;
    let since: f64 = (epoch..year).map(days).sum::<f64>() + (y - year as f64) * days(year);
    let span: f64 = (epoch..epoch + 5).map(days).sum();
    epoch as f64 + 5.0 * since / span
}

fn rows(text: &str) -> Vec<Vec<String>> {
    text.lines().filter(|l| !l.starts_with('#')).skip(1).map(|l| l.split(',').map(str::to_string).collect()).collect()
}

#[test]
fn xyz_at_1200_points_match_ppigrf_within_0_1_nt() {
    let model = FieldModel::igrf14();
    let data = rows(include_str!("oracles/field_ppigrf_points.csv"));
    assert_eq!(data.len(), 1200);
    let mut worst: f64 = 0.0;
    for r in &data {
        let v: Vec<f64> = [0, 2, 3, 4, 5, 6, 7].iter().map(|&i| r[i].parse().unwrap()).collect();
        let frame = if r[1] == "geodetic" { Frame::Geodetic } else { Frame::Geocentric };
        let c = model.at(ppigrf_equivalent_year(v[0])).unwrap();
        let e = field_at(&c, &Site::new(v[1], v[2], v[3], frame).unwrap());
        for (got, want) in [(e.x, v[4]), (e.y, v[5]), (e.z, v[6])] {
            worst = worst.max((got - want).abs());
            assert!((got - want).abs() < 0.1, "{r:?}: {got} vs {want}");
        }
    }
    // Measured: the largest difference is far below the 0.1 nT asked; printed for the record.
    eprintln!("largest |difference| from ppigrf over 3600 components: {worst:.2e} nT");
}

#[test]
fn dip_poles_match_ppigrf_within_0_05_degrees() {
    let model = FieldModel::igrf14();
    for r in rows(include_str!("oracles/field_ppigrf_dip_poles.csv")) {
        let (year, lat, lon): (f64, f64, f64) = (r[0].parse().unwrap(), r[2].parse().unwrap(), r[3].parse().unwrap());
        let which = if r[1] == "down" { DipPole::Down } else { DipPole::Up };
        let p = dip_pole(&model.at(ppigrf_equivalent_year(year)).unwrap(), which, None).unwrap();
        let dlon = ((p.lon - lon + 540.0) % 360.0 - 180.0) * lat.to_radians().cos();
        assert!((p.lat - lat).abs() < 0.05 && dlon.abs() < 0.05, "{r:?}: got {} {}", p.lat, p.lon);
        // Much closer in fact: the two root searches agree to about 1e-6 degrees.
        assert!((p.lat - lat).abs() < 1e-4 && dlon.abs() < 1e-4, "{r:?}: got {} {}", p.lat, p.lon);
    }
}
