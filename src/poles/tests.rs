//! Checks of the pole arithmetic against outside references.

use super::*;
use crate::montecarlo::MonteCarlo;
use crate::sphere::{Direction, GeoPoint};
use crate::stats::FisherSampler;
use approx::assert_abs_diff_eq;
use geographiclib_rs::{DirectGeodesic, Geodesic, InverseGeodesic};

fn lon_diff(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(360.0);
    d.min(360.0 - d)
}

#[test]
fn vgp_matches_geographiclib_direct_problem_on_a_unit_sphere() {
    // GeographicLib (geographiclib-rs 0.2.7, Karney 2013) on a sphere of radius 1 and flattening 0: the
    // VGP is the point at arc p (magnetic colatitude, in radians = metres) along azimuth D from the site.
    let sphere = Geodesic::new(1.0, 0.0);
    let sites = [(41.6, 243.85), (0.0, 10.0), (-33.9, 18.4), (89.5, 120.0), (-89.0, 300.0), (12.0, 359.9)];
    let dirs = [
        (0.0, 60.0),
        (10.0, 50.0),
        (200.0, -30.0),
        (355.0, 5.0),
        (90.0, 80.0),
        (180.0, -60.0),
        (135.0, -89.0),
        (270.0, 0.0),
    ];
    for &(la, lo) in &sites {
        let site = GeoPoint::new(la, lo).unwrap();
        for &(d, i) in &dirs {
            let dir = Direction::new(d, i).unwrap();
            let v = vgp(site, dir);
            let p = colatitude_from_inclination(i);
            let (glat, glon): (f64, f64) = sphere.direct(la, lo, d, p.to_radians());
            assert_abs_diff_eq!(v.pole.lat, glat, epsilon = 1e-8);
            if glat.abs() < 89.999 {
                assert!(lon_diff(v.pole.lon, glon) < 1e-7, "site {la} {lo} dir {d} {i}: {:?} vs {glat} {glon}", v.pole);
            }
            // Inverse problem: arc distance and azimuth back from GeographicLib give the expected direction.
            let (azi1, _azi2, a12): (f64, f64, f64) = sphere.inverse(la, lo, v.pole.lat, v.pole.lon);
            let e = expected_direction(site, v.pole);
            assert_abs_diff_eq!(e.inc, dipole_inclination(90.0 - a12), epsilon = 1e-7);
            if a12 > 1e-6 && a12 < 180.0 - 1e-6 && la.abs() < 89.999 {
                assert!(lon_diff(e.dec, azi1) < 1e-6, "dec {} vs azi {azi1}", e.dec);
            }
            // Round trip site -> pole -> expected direction returns the input.
            assert!(e.angle_to(dir) < 1e-8, "{la} {lo} {d} {i}: {e:?}");
        }
    }
}

#[test]
fn pole_beyond_the_geographic_pole_and_reversed_sites() {
    // A site at 70N looking north with a shallow inclination: p = 90 - 10.3 > 20, so the pole lies past
    // the geographic pole, on the far meridian (branch of Butler 1992, eq. 7.4), here checked against
    // GeographicLib as above.
    let sphere = Geodesic::new(1.0, 0.0);
    let site = GeoPoint::new(70.0, 20.0).unwrap();
    let v = vgp(site, Direction::new(10.0, 20.0).unwrap());
    let (glat, glon): (f64, f64) = sphere.direct(70.0, 20.0, 10.0, v.colatitude.to_radians());
    assert!(v.colatitude > 20.0);
    assert!(lon_diff(v.pole.lon, 20.0) > 90.0, "pole should be on the far side: {:?}", v.pole);
    assert_abs_diff_eq!(v.pole.lat, glat, epsilon = 1e-9);
    assert!(lon_diff(v.pole.lon, glon) < 1e-8);
    // A reversed direction gives the antipode of the normal VGP (reported as computed).
    let n = vgp(site, Direction::new(10.0, 50.0).unwrap());
    let r = vgp(site, Direction::new(190.0, -50.0).unwrap());
    assert_abs_diff_eq!(r.pole.lat, -n.pole.lat, epsilon = 1e-9);
    assert!(lon_diff(r.pole.lon, n.pole.lon + 180.0) < 1e-9);
    assert_abs_diff_eq!(r.paleolat, -n.paleolat, epsilon = 1e-9);
    let (f, flipped) = northern(r.pole);
    assert!(flipped);
    assert_abs_diff_eq!(f.lat, n.pole.lat, epsilon = 1e-9);
}

#[test]
fn precision_from_a95_inverts_fishers_cone() {
    // Fisher (1953) cone: alpha95 from (N, R), then back to k = (N - 1)/(N - R).
    for &(n, r) in &[(5usize, 4.8), (12, 11.5), (2, 1.99), (40, 39.0)] {
        let a = crate::stats::confidence_cone(n, r, 0.95).unwrap();
        let k = precision_from_a95(n, a).unwrap();
        assert_abs_diff_eq!(k, (n as f64 - 1.0) / (n as f64 - r), epsilon = 1e-8 * k);
    }
    assert!(precision_from_a95(1, 5.0).is_err());
}

#[test]
fn within_site_factor_is_the_mean_square_of_dp_and_dm_factors() {
    // Cox (1970) factor (5 + 18 s^2 + 9 s^4)/8 equals the mean of the squared dp and dm transfer factors of
    // Butler (1992) eqs. 7.5-7.6 (with cos p = sin(paleolatitude)): two published forms agree.
    for lat in [-80.0f64, -20.0, 0.0, 33.0, 61.0, 90.0] {
        let o = pole_oval(90.0 - lat, 1.0).unwrap();
        let factor = (o.dp * o.dp + o.dm * o.dm) / 2.0;
        let k = 50.0;
        let sw = within_site_sw(k, lat);
        assert_abs_diff_eq!(sw, 81.0 / (k / factor).sqrt(), epsilon = 1e-9);
    }
}

// Ten VGPs (lat, lon) used by the scatter checks below.
const LAT: [f64; 10] = [82.0, 75.0, 88.0, 79.0, 70.0, 84.0, 77.0, 86.0, 25.0, 62.0];
const LON: [f64; 10] = [10.0, 120.0, 200.0, 300.0, 45.0, 250.0, 170.0, 80.0, 20.0, 330.0];
const K: [f64; 10] = [50.0, 80.0, 120.0, 60.0, 40.0, 90.0, 70.0, 100.0, 30.0, 55.0];
const N: [usize; 10] = [6, 8, 5, 7, 9, 6, 8, 5, 4, 7];
const PL: [f64; 10] = [30.0, 35.0, 40.0, 32.0, 28.0, 36.0, 33.0, 38.0, 31.0, 34.0];

fn ten(within: bool) -> Vec<ScatterSite> {
    (0..10)
        .map(|i| ScatterSite {
            pole: GeoPoint::new(LAT[i], LON[i]).unwrap(),
            within: within.then(|| WithinSite { n: N[i], sw: within_site_sw(K[i], PL[i]) }),
        })
        .collect()
}

#[test]
fn scatter_matches_an_independent_numpy_computation() {
    // Reference values from NumPy 2.4.6: unit vectors, mean = normalised sum, angles = degrees(arccos(V @ m)),
    // S = sqrt(sum(d**2)/(N-1)); the 45-degree cutoff and Vandamme (1994) loops written separately in Python;
    // within-site term mean(Sw**2/n) with Kw = 8k/(5+18 sin^2 + 9 sin^4) (McElhinny & McFadden 1997).
    let s = vgp_scatter(&ten(false), Cutoff::None).unwrap();
    assert_abs_diff_eq!(s.s_total, 23.970790099977357, epsilon = 1e-9);
    assert_abs_diff_eq!(s.mean_pole.lat, 81.40050386299833, epsilon = 1e-9);
    assert_abs_diff_eq!(s.mean_pole.lon, 16.707215304206088, epsilon = 1e-9);
    assert_eq!(s.s, Some(s.s_total));
    assert_eq!(s.n_removed, 0);
    let f = vgp_scatter(&ten(false), Cutoff::Fixed(45.0)).unwrap();
    assert_abs_diff_eq!(f.s_total, 14.69265156935232, epsilon = 1e-9);
    assert_eq!((f.n_used, f.n_removed), (9, 1));
    assert!(!f.kept[8]);
    let v = vgp_scatter(&ten(false), Cutoff::Vandamme).unwrap();
    assert_abs_diff_eq!(v.s_total, 14.69265156935232, epsilon = 1e-9);
    assert_abs_diff_eq!(v.threshold.unwrap(), 31.446772824834177, epsilon = 1e-9);
    assert_eq!(v.n_removed, 1);
    let w = vgp_scatter(&ten(true), Cutoff::None).unwrap();
    assert_abs_diff_eq!(w.s.unwrap(), 23.429806488032927, epsilon = 1e-9);
}

#[test]
fn scatter_of_fisher_vgps_is_near_81_over_sqrt_kappa() {
    // For Fisher-distributed VGPs, the angular standard deviation approaches 81/sqrt(kappa) for large kappa
    // (Cox 1970; Butler 1992 eq. 6.16, common practice). 2000 draws, kappa = 100: about 8.1 deg.
    let sampler = FisherSampler::new(Direction::new(0.0, 90.0).unwrap(), 100.0).unwrap();
    let mut rng = crate::montecarlo::replicate_rng(7, 0, 0);
    let sites: Vec<ScatterSite> = (0..2000)
        .map(|_| {
            let d = sampler.sample_direction(&mut rng);
            // inc 90 (down) maps to the north pole: latitude = inc, longitude = dec.
            ScatterSite { pole: GeoPoint::new(d.inc, d.dec).unwrap(), within: None }
        })
        .collect();
    let s = vgp_scatter(&sites, Cutoff::None).unwrap();
    assert!((s.s_total - 8.1).abs() < 0.25, "S = {}", s.s_total);
    // A Vandamme cutoff on a clean Fisher set removes almost nothing (A is about 19.6 deg, roughly 2.4 S).
    let v = vgp_scatter(&sites, Cutoff::Vandamme).unwrap();
    assert!(v.n_removed < 10, "removed {}", v.n_removed);
    // The bootstrap interval brackets the estimate and narrows like 1/sqrt(N).
    let b = bootstrap_scatter(&sites[..200], 0.95, &MonteCarlo::new(3, 200)).unwrap();
    let s200 = vgp_scatter(&sites[..200], Cutoff::None).unwrap().s_total;
    assert!(b.low < s200 && s200 < b.high, "{b:?} {s200}");
    assert!(b.high - b.low < 3.0 && b.high - b.low > 0.5, "{b:?}");
    let again = bootstrap_scatter(&sites[..200], 0.95, &MonteCarlo::new(3, 200)).unwrap();
    assert_eq!(b, again);
}

#[test]
fn scatter_edges() {
    let two = &ten(false)[..2];
    assert!(vgp_scatter(two, Cutoff::None).is_ok());
    assert!(matches!(vgp_scatter(&ten(false)[..1], Cutoff::None), Err(crate::Error::TooFew { .. })));
    // A cutoff so tight that fewer than two remain is an error, not a panic.
    assert!(matches!(vgp_scatter(&ten(false), Cutoff::Fixed(0.5)), Err(crate::Error::TooFew { .. })));
    // A huge within-site term: S_B undefined (None), not NaN.
    let mut s = ten(false);
    for x in &mut s {
        x.within = Some(WithinSite { n: 1, sw: 80.0 });
    }
    let r = vgp_scatter(&s, Cutoff::None).unwrap();
    assert!(r.s.is_none());
    // Identical VGPs: zero scatter.
    let same = vec![ScatterSite { pole: GeoPoint::new(80.0, 0.0).unwrap(), within: None }; 3];
    assert_abs_diff_eq!(vgp_scatter(&same, Cutoff::None).unwrap().s_total, 0.0, epsilon = 1e-6);
}

#[test]
fn expected_declination_range_is_the_angle_subtended_by_the_a95_circle() {
    // GeographicLib (geographiclib-rs 0.2.7) on a unit sphere: walk the A95 circle about the pole and take the
    // largest azimuth deviation seen from the site; Butler (1992) §11.1 gives asin(sin A95 / sin p).
    let sphere = Geodesic::new(1.0, 0.0);
    let site = GeoPoint::new(35.0, 250.0).unwrap();
    let pole = GeoPoint::new(78.0, 160.0).unwrap();
    let a95 = 6.0;
    let o = expected_oval(site, pole, a95).unwrap();
    let (az0, _, _): (f64, f64, f64) = sphere.inverse(site.lat, site.lon, pole.lat, pole.lon);
    let mut widest: f64 = 0.0;
    for k in 0..3600 {
        let (la, lo): (f64, f64) = sphere.direct(pole.lat, pole.lon, k as f64 / 10.0, a95.to_radians());
        let (az, _, _): (f64, f64, f64) = sphere.inverse(site.lat, site.lon, la, lo);
        widest = widest.max(lon_diff(az, az0));
    }
    assert_abs_diff_eq!(o.delta_dec.unwrap(), widest, epsilon = 1e-3);
    // Delta I is A95 divided by the dp factor: inverse of Butler eq. 7.5.
    let p = site.distance_azimuth(pole).0;
    assert_abs_diff_eq!(o.delta_inc * pole_oval(p, 1.0).unwrap().dp, a95, epsilon = 1e-9);
    // A site inside the A95 circle: every declination possible.
    assert!(expected_oval(GeoPoint::new(80.0, 160.0).unwrap(), pole, 6.0).unwrap().delta_dec.is_none());
}

#[test]
fn within_site_term_follows_one_rule() {
    // The rule shared by poles, psv, section and Python: n ≥ 2 and k (or k from α95 by inverting
    // Fisher's cone, Butler 1992 eq. 6.21); otherwise no correction.
    let lat = 30.0;
    assert_eq!(WithinSite::from_site(None, Some(50.0), None, lat).unwrap(), None);
    assert_eq!(WithinSite::from_site(Some(1), Some(50.0), None, lat).unwrap(), None);
    assert_eq!(WithinSite::from_site(Some(5), None, None, lat).unwrap(), None);
    let w = WithinSite::from_site(Some(5), Some(50.0), Some(3.0), lat).unwrap().unwrap();
    assert_eq!(w, WithinSite { n: 5, sw: within_site_sw(50.0, lat) }, "a given k wins over α95");
    // The α95 of N = 6 directions with k = 45 (Fisher 1953 cone, R = N − (N − 1)/k) gives back k.
    let (n, k) = (6usize, 45.0);
    let r = n as f64 - (n as f64 - 1.0) / k;
    let a95 = crate::stats::confidence_cone(n, r, 0.95).unwrap();
    let w = WithinSite::from_site(Some(n), None, Some(a95), lat).unwrap().unwrap();
    assert_abs_diff_eq!(w.sw, within_site_sw(k, lat), epsilon = 1e-6);
    let w = WithinSite::from_site(Some(3), Some(f64::INFINITY), None, lat).unwrap().unwrap();
    assert_eq!(w.sw, 0.0, "identical directions: no within-site scatter");
    assert!(WithinSite::from_site(Some(3), None, Some(200.0), lat).is_err());
}
