//! Numerical edges as property tests: for every valid input each statistic is finite or explicitly
//! undefined (`None`, or an infinite k reported as such), results do not depend on row order, and
//! declinations on both sides of north average to north.
//!
//! Inputs are drawn with weight on the awkward places: declinations near 0/360, inclinations and
//! latitudes at ±90, identical and antipodal directions, groups of one and two.
//! The default case count keeps `cargo test` quick; `LODESTONE_PROPERTY_CASES` raises it.

use lodestone::demag::{fit_line, fit_plane};
use lodestone::model::Anchor;
use lodestone::poles::{expected_direction, paleopole, vgp, vgp_scatter, Cutoff, ScatterSite};
use lodestone::sphere::{angle_between, Direction, GeoPoint, Vec3};
use lodestone::stats::{confidence_cone, fisher_mean, group_means, FisherStats, Frame};
use lodestone::table::{read_directions, GroupBy, Table};
use proptest::prelude::*;

fn cases() -> u32 {
    std::env::var("LODESTONE_PROPERTY_CASES").ok().and_then(|s| s.parse().ok()).unwrap_or(256)
}

fn declination() -> impl Strategy<Value = f64> {
    prop_oneof![3 => 0.0f64..360.0, 1 => Just(0.0), 1 => 359.999f64..360.0, 1 => 0.0f64..0.001]
}

fn inclination() -> impl Strategy<Value = f64> {
    prop_oneof![3 => -90.0f64..=90.0, 1 => Just(90.0), 1 => Just(-90.0), 1 => Just(0.0)]
}

fn direction() -> impl Strategy<Value = Direction> {
    (declination(), inclination()).prop_map(|(d, i)| Direction::new(d, i).unwrap())
}

/// Sets of directions, including repeated and antipodal members.
fn direction_set() -> impl Strategy<Value = Vec<Direction>> {
    prop_oneof![
        3 => proptest::collection::vec(direction(), 1..25),
        1 => (direction(), 1usize..6).prop_map(|(d, n)| vec![d; n]),
        1 => (direction(), 1usize..4).prop_map(|(d, n)| { let mut v = vec![d; n]; v.extend(vec![d.antipode(); n]); v }),
    ]
}

fn site() -> impl Strategy<Value = GeoPoint> {
    (prop_oneof![3 => -90.0f64..=90.0, 1 => Just(90.0), 1 => Just(-90.0)], -180.0f64..360.0)
        .prop_map(|(la, lo)| GeoPoint::new(la, lo).unwrap())
}

/// Every field of Fisher statistics is finite, or explicitly absent, or (k only) explicitly infinite.
fn check_fisher(s: &FisherStats, n: usize) -> Result<(), TestCaseError> {
    prop_assert_eq!(s.n, n);
    prop_assert!(s.r.is_finite() && s.r >= 0.0 && s.r <= n as f64 + 1e-9, "{:?}", s);
    if let Some(m) = s.mean {
        prop_assert!(m.dec.is_finite() && (0.0..360.0).contains(&m.dec), "{:?}", s);
        prop_assert!(m.inc.is_finite() && (-90.0..=90.0).contains(&m.inc), "{:?}", s);
    }
    if let Some(k) = s.k {
        prop_assert!(!k.0.is_nan() && k.0 > 0.0, "{:?}", s);
    }
    for x in [s.alpha, s.theta63].into_iter().flatten() {
        prop_assert!(x.is_finite() && (0.0..=180.0).contains(&x), "{:?}", s);
    }
    if n == 1 {
        prop_assert!(s.k.is_none() && s.alpha.is_none() && s.theta63.is_none(), "{:?}", s);
    }
    Ok(())
}

/// Angle between two optional directions (both absent counts as agreement).
fn same_direction(a: Option<Direction>, b: Option<Direction>, tol_deg: f64) -> bool {
    match (a, b) {
        (None, None) => true,
        (Some(a), Some(b)) => angle_between(a.to_vector(), b.to_vector()) < tol_deg,
        _ => false,
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: cases(), failure_persistence: None, ..ProptestConfig::default() })]

    #[test]
    fn fisher_statistics_finite_or_undefined(set in direction_set()) {
        let s = fisher_mean(&set, 0.95).unwrap();
        check_fisher(&s, set.len())?;
    }

    /// Row order: the Fisher mean is a sum, so a reversed and a rotated order agree (to rounding).
    #[test]
    fn fisher_mean_ignores_order(set in direction_set(), turn in 0usize..25) {
        let a = fisher_mean(&set, 0.95).unwrap();
        let mut other = set.clone();
        other.reverse();
        let t = turn % other.len();
        other.rotate_left(t);
        let b = fisher_mean(&other, 0.95).unwrap();
        prop_assert!((a.r - b.r).abs() < 1e-9, "{} vs {}", a.r, b.r);
        // Near R = 0 the mean direction is ill-conditioned; compare it only when R is clear of 0.
        if a.r > 1e-6 {
            prop_assert!(same_direction(a.mean, b.mean, 1e-6), "{:?} vs {:?}", a.mean, b.mean);
        }
    }

    /// Declinations mirrored about north (δ and 360 − δ, same inclination) average to north; the
    /// mean must not land at 180 (the arithmetic mean of 350 and 10 would). Common practice: mean
    /// directions are taken as vector sums, never as averages of angles.
    #[test]
    fn both_sides_of_north(deltas in proptest::collection::vec(0.001f64..80.0, 1..8), inc in -80.0f64..80.0) {
        let mut set = Vec::new();
        for d in &deltas {
            set.push(Direction::new(*d, inc).unwrap());
            set.push(Direction::new(360.0 - d, inc).unwrap());
        }
        let m = fisher_mean(&set, 0.95).unwrap().mean.unwrap();
        let off_north = m.dec.min(360.0 - m.dec);
        prop_assert!(off_north < 1e-7, "mean declination {}", m.dec);
        // Negative declinations in the file wrap to the same result.
        let mut text = String::from("dec,inc\n");
        for d in &deltas {
            text.push_str(&format!("{d},{inc}\n-{d},{inc}\n"));
        }
        let t = Table::parse("n.csv", text.as_bytes()).unwrap();
        let g = group_means(&read_directions(&t, &GroupBy::None).unwrap(), Frame::Geo, 0.95).unwrap();
        let m2 = g[0].stats.mean.unwrap();
        prop_assert!(m2.dec.min(360.0 - m2.dec) < 1e-7, "mean declination {}", m2.dec);
    }

    /// The table path: group means do not depend on the order of the rows, and every group's
    /// statistics are finite or absent.
    #[test]
    fn group_means_ignore_row_order(rows in proptest::collection::vec((0usize..3, direction()), 1..20), seed in any::<u64>()) {
        let text = |rows: &[(usize, Direction)]| {
            let mut s = String::from("site,dec,inc\n");
            for (g, d) in rows {
                s.push_str(&format!("G{g},{},{}\n", d.dec, d.inc));
            }
            s
        };
        let mut shuffled = rows.clone();
        // A seeded Fisher–Yates shuffle (deterministic per case).
        let mut x = seed | 1;
        for i in (1..shuffled.len()).rev() {
            x ^= x << 13; x ^= x >> 7; x ^= x << 17;
            shuffled.swap(i, (x % (i as u64 + 1)) as usize);
        }
        let read = |s: String| {
            let t = Table::parse("g.csv", s.as_bytes()).unwrap();
            group_means(&read_directions(&t, &GroupBy::Default).unwrap(), Frame::Geo, 0.95).unwrap()
        };
        let (a, b) = (read(text(&rows)), read(text(&shuffled)));
        prop_assert_eq!(a.len(), b.len());
        for ga in &a {
            let gb = b.iter().find(|g| g.group == ga.group).unwrap();
            check_fisher(&ga.stats, ga.stats.n)?;
            prop_assert_eq!(ga.stats.n, gb.stats.n);
            prop_assert!((ga.stats.r - gb.stats.r).abs() < 1e-9);
            if ga.stats.r > 1e-6 {
                prop_assert!(same_direction(ga.stats.mean, gb.stats.mean, 1e-6));
            }
        }
    }

    #[test]
    fn confidence_cone_finite_or_none(n in 0usize..200, frac in 0.0f64..=1.0, conf in 0.001f64..0.999) {
        let r = frac * n as f64;
        if let Some(a) = confidence_cone(n, r, conf) {
            prop_assert!(a.is_finite() && (0.0..=180.0).contains(&a), "n {n} r {r} conf {conf}: {a}");
        }
    }

    /// VGPs are finite and in range for every site (poles included) and direction, and the dipole
    /// formula inverts: the direction expected at the site from its own VGP is the observed one
    /// (common practice: the VGP transformation and the expected direction are the same dipole
    /// geometry read both ways).
    #[test]
    fn vgp_finite_and_inverts(s in site(), d in direction()) {
        let v = vgp(s, d);
        prop_assert!(v.pole.lat.is_finite() && (-90.0..=90.0).contains(&v.pole.lat), "{:?}", v);
        prop_assert!(v.pole.lon.is_finite() && (0.0..360.0).contains(&v.pole.lon), "{:?}", v);
        prop_assert!(v.paleolat.is_finite() && v.colatitude.is_finite(), "{:?}", v);
        let back = expected_direction(s, v.pole);
        prop_assert!(back.dec.is_finite() && back.inc.is_finite());
        // At a geographic pole declination is undefined; compare there only the inclination.
        if s.lat.abs() < 89.999 {
            prop_assert!(angle_between(back.to_vector(), d.to_vector()) < 1e-6, "{:?} -> {:?} -> {:?}", d, v, back);
        } else {
            prop_assert!((back.inc - d.inc).abs() < 1e-6, "{:?} -> {:?}", d, back);
        }
    }

    /// Paleopole and VGP scatter: finite or refused, never NaN; independent of site order.
    #[test]
    fn paleopole_and_scatter_finite(poles in proptest::collection::vec(site(), 1..15), cut in 0usize..3) {
        let cutoff = [Cutoff::None, Cutoff::Fixed(45.0), Cutoff::Vandamme][cut];
        if let Ok(p) = paleopole(&poles) {
            prop_assert!(p.pole.lat.is_finite() && p.pole.lon.is_finite() && p.r.is_finite());
            prop_assert!(!p.k.0.is_nan());
            if let Some(a) = p.a95 { prop_assert!(a.is_finite()); }
            let mut rev = poles.clone();
            rev.reverse();
            let q = paleopole(&rev).unwrap();
            if p.r > 1e-6 {
                prop_assert!(angle_between(p.pole.to_vector(), q.pole.to_vector()) < 1e-6);
            }
        }
        let sites: Vec<ScatterSite> = poles.iter().map(|&pole| ScatterSite { pole, within: None }).collect();
        if let Ok(s) = vgp_scatter(&sites, cutoff) {
            prop_assert!(s.s_total.is_finite() && s.s_total >= 0.0, "{:?}", s);
            if let Some(x) = s.s { prop_assert!(x.is_finite()); }
            prop_assert!(s.distance.iter().all(|d| d.is_finite()));
            prop_assert_eq!(s.n_used + s.n_removed, poles.len());
        }
    }

    /// Principal-component fits do not depend on the scale of the moments (a direction and an angle
    /// are scale-free), even at moments near the ends of the floating-point range. Scaling by a power
    /// of two is exact in floating point, so there the fits must agree to the last bit; scaling by a
    /// power of ten rounds, so there only finiteness and agreement of the MAD to 1e-3° are asked.
    #[test]
    fn pca_scale_free(pts in proptest::collection::vec((-1.0f64..1.0, -1.0f64..1.0, -1.0f64..1.0), 3..10),
                      exp in prop_oneof![Just(-960i32), Just(-500), Just(-27), Just(0), Just(500), Just(960)],
                      exp10 in prop_oneof![Just(-300i32), Just(-150), Just(-8), Just(150), Just(300)]) {
        let base: Vec<Vec3> = pts.iter().map(|&(x, y, z)| Vec3 { x, y, z }).collect();
        let two: Vec<Vec3> = base.iter().map(|p| *p * 2f64.powi(exp)).collect();
        let ten: Vec<Vec3> = base.iter().map(|p| *p * 10f64.powi(exp10)).collect();
        for anchor in [Anchor::Free, Anchor::Origin] {
            if let Ok(a) = fit_line(&base, anchor) {
                let b = fit_line(&two, anchor).unwrap();
                prop_assert_eq!((a.mad, a.direction), (b.mad, b.direction));
                if let Ok(c) = fit_line(&ten, anchor) {
                    prop_assert!(c.mad.is_finite() && (a.mad - c.mad).abs() < 1e-3, "{} vs {}", a.mad, c.mad);
                    prop_assert!(c.direction.dec.is_finite() && c.direction.inc.is_finite());
                }
            }
            if let Ok(a) = fit_plane(&base, anchor) {
                let b = fit_plane(&two, anchor).unwrap();
                prop_assert_eq!((a.mad, a.pole), (b.mad, b.pole));
                if let Ok(c) = fit_plane(&ten, anchor) {
                    prop_assert!(c.mad.is_finite() && (a.mad - c.mad).abs() < 1e-3, "{} vs {}", a.mad, c.mad);
                    prop_assert!(c.pole.dec.is_finite() && c.pole.inc.is_finite());
                }
            }
        }
    }
}

/// A fixed check of the wrap decision with an outside value: the mean of 350° and 10° at equal
/// inclination is 0° by the vector sum (common practice; the arithmetic mean, 180°, is the classic
/// mistake).
#[test]
fn north_straddling_pair() {
    let set = [Direction::new(350.0, 45.0).unwrap(), Direction::new(10.0, 45.0).unwrap()];
    let s = fisher_mean(&set, 0.95).unwrap();
    let m = s.mean.unwrap();
    assert!(m.dec.min(360.0 - m.dec) < 1e-9, "{}", m.dec);
    // R = 2 cos(angle/2), with the angle between the two from the spherical law of cosines:
    // cos θ = sin²I + cos²I cos ΔD (common practice).
    let i = 45f64.to_radians();
    let cos_t = i.sin().powi(2) + i.cos().powi(2) * 20f64.to_radians().cos();
    let r = 2.0 * (cos_t.acos() / 2.0).cos();
    assert!((s.r - r).abs() < 1e-12, "{} vs {}", s.r, r);
}
