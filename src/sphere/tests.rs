use super::*;
use approx::assert_abs_diff_eq;

#[test]
fn vector_round_trip_and_cardinal_points() {
    // Direction cosines (Butler 1992, §5.1): D = 90, I = 0 is due east, I = 90 straight down.
    let e = Direction::new(90.0, 0.0).unwrap().to_vector();
    assert_abs_diff_eq!(e.y, 1.0, epsilon = 1e-15);
    let d = Direction::new(0.0, 90.0).unwrap().to_vector();
    assert_abs_diff_eq!(d.z, 1.0, epsilon = 1e-15);
    for &(dec, inc) in &[(0.0, 0.0), (359.9, -45.0), (123.4, 56.7), (0.1, 89.9), (270.0, -89.0)] {
        let back = Direction::from_vector(Direction::new(dec, inc).unwrap().to_vector()).unwrap();
        assert_abs_diff_eq!(back.dec, dec, epsilon = 1e-9);
        assert_abs_diff_eq!(back.inc, inc, epsilon = 1e-9);
    }
}

#[test]
fn declination_wraps_and_inclination_is_checked() {
    assert_abs_diff_eq!(Direction::new(-10.0, 0.0).unwrap().dec, 350.0);
    assert_abs_diff_eq!(Direction::new(360.0, 0.0).unwrap().dec, 0.0);
    assert!(Direction::new(0.0, 95.2).is_err());
    assert!(Direction::new(f64::NAN, 0.0).is_err());
    assert_eq!(wrap360(-1e-18), 0.0);
}

#[test]
fn angles_and_antipodes() {
    let a = Direction::new(10.0, 20.0).unwrap();
    assert_abs_diff_eq!(a.angle_to(a.antipode()), 180.0, epsilon = 1e-9);
    assert_abs_diff_eq!(a.angle_to(a), 0.0, epsilon = 1e-9);
    // Across north: 355 and 5 on the horizon are 10 degrees apart (plane geometry, exact).
    assert_abs_diff_eq!(
        Direction::new(355.0, 0.0).unwrap().angle_to(Direction::new(5.0, 0.0).unwrap()),
        10.0,
        epsilon = 1e-9
    );
}

#[test]
fn rotation_about_vertical_adds_to_declination() {
    let v = Direction::new(30.0, 40.0).unwrap().to_vector();
    let r = Direction::from_vector(rotate_about(v, Vec3::new(0.0, 0.0, 1.0), 25.0)).unwrap();
    assert_abs_diff_eq!(r.dec, 55.0, epsilon = 1e-9);
    assert_abs_diff_eq!(r.inc, 40.0, epsilon = 1e-9);
    let m = Rotation::about(Vec3::new(1.0, 2.0, 3.0), 33.0);
    let w = Vec3::new(0.3, -0.2, 0.9);
    let (p, q) = (m.apply(w), rotate_about(w, Vec3::new(1.0, 2.0, 3.0), 33.0));
    assert_abs_diff_eq!((p - q).norm(), 0.0, epsilon = 1e-14);
}

#[test]
fn north_to_target_rotation() {
    let t = Direction::new(200.0, -35.0).unwrap();
    let r = Rotation::from_north_to(t.to_vector());
    let got = Direction::from_vector(r.apply(Vec3::new(1.0, 0.0, 0.0))).unwrap();
    assert_abs_diff_eq!(got.angle_to(t), 0.0, epsilon = 1e-9);
}

#[test]
fn untilting_brings_bedding_horizontal() {
    // A line lying down-dip in a bed dipping 30 degrees toward 090 is (090, 30) in geographic
    // coordinates and horizontal (090, 0) once the bed is restored (definition of bedding correction,
    // Butler 1992 §5.3).
    let bed = Bedding::from_dip_direction(90.0, 30.0, false).unwrap();
    let d = Direction::from_vector(bed.untilt(Direction::new(90.0, 30.0).unwrap().to_vector())).unwrap();
    assert_abs_diff_eq!(d.dec, 90.0, epsilon = 1e-9);
    assert_abs_diff_eq!(d.inc, 0.0, epsilon = 1e-9);
    // The bed's pole (up-normal tilted toward 270) becomes vertical: pole of a bed dipping 30 toward 090
    // points down at (270, 60).
    let pole = Direction::from_vector(bed.untilt(Direction::new(270.0, 60.0).unwrap().to_vector())).unwrap();
    assert_abs_diff_eq!(pole.inc, 90.0, epsilon = 1e-6);
    // Strike is dip direction - 90 (right-hand rule): the two constructors agree.
    let s = Bedding::from_strike(0.0, 30.0, false).unwrap();
    assert_abs_diff_eq!(s.dip_dir, 90.0);
    // Lines along strike do not move.
    let st = Direction::new(0.0, 0.0).unwrap().to_vector();
    assert_abs_diff_eq!((bed.untilt(st) - st).norm(), 0.0, epsilon = 1e-12);
}

#[test]
fn overturned_beds_rotate_past_vertical() {
    // A bed rotated 120 degrees toward the east looks like a bed dipping 60 toward the west
    // (180 - 120). Its original horizontal east-pointing line now points west and down:
    // (0, cos 120, sin 120) = (270, 60). Untilting the overturned bed must bring it back to (090, 0).
    let bed = Bedding::from_dip_direction(270.0, 60.0, true).unwrap();
    let d = Direction::from_vector(bed.untilt(Direction::new(270.0, 60.0).unwrap().to_vector())).unwrap();
    assert_abs_diff_eq!(d.dec, 90.0, epsilon = 1e-9);
    assert_abs_diff_eq!(d.inc, 0.0, epsilon = 1e-9);
}

#[test]
fn specimen_frame_worked_table() {
    let cases = [
        ((0.0, 0.0), (10.0, 20.0), (10.0, 20.0)),
        ((90.0, 0.0), (0.0, 0.0), (90.0, 0.0)),
        ((90.0, 0.0), (90.0, 0.0), (180.0, 0.0)),
        ((0.0, 90.0), (0.0, 0.0), (0.0, 90.0)),
        ((0.0, 90.0), (0.0, 90.0), (180.0, 0.0)),
    ];
    for ((az, pl), (sd, si), (gd, gi)) in cases {
        let o = SpecimenOrientation::new(az, pl).unwrap();
        let g = o.direction_to_geographic(Direction::new(sd, si).unwrap());
        assert!(g.angle_to(Direction::new(gd, gi).unwrap()) < 1e-9, "{az} {pl}: {g:?}");
    }
}

mod props {
    use super::super::*;
    use proptest::prelude::*;
    proptest! {
        #[test]
        fn untilt_then_retilt_is_identity(dd in 0.0f64..360.0, dip in 0.0f64..90.0, over: bool,
                                          dec in 0.0f64..360.0, inc in -90.0f64..90.0) {
            let bed = Bedding::from_dip_direction(dd, dip, over).unwrap();
            let v = Direction::new(dec, inc).unwrap().to_vector();
            prop_assert!((bed.retilt(bed.untilt(v)) - v).norm() < 1e-12);
            prop_assert!((bed.partial(1.0).apply(v) - bed.untilt(v)).norm() < 1e-12);
            let turn = bed.untilting();
            for f in [-0.1, 0.37, 1.5] {
                prop_assert!((bed.partial_apply(f, v) - bed.partial(f).apply(v)).norm() < 1e-14);
                // The split form (sine and cosine computed once per angle) gives the same bits.
                let (s, c) = turn.angle_deg(f).to_radians().sin_cos();
                let w = rotate_unit(v, turn.axis, s, c);
                prop_assert_eq!(w.to_array().map(f64::to_bits), bed.partial_apply(f, v).to_array().map(f64::to_bits));
            }
        }
    }
}
