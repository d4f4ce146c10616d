//! Rotation of vectors about an arbitrary axis.

use super::vector::Vec3;

/// Rotate `v` by `angle_deg` about `axis` (right-hand rule in the x-north, y-east, z-down frame).
///
/// # Units
/// Angle in degrees; `axis` need not be unit length (it is normalised; a zero axis leaves `v` unchanged).
///
/// # Formula
/// Rodrigues: v' = v cos θ + (k × v) sin θ + k (k · v)(1 − cos θ).
///
/// # References
/// Rodrigues (1840); any linear-algebra text.
pub fn rotate_about(v: Vec3, axis: Vec3, angle_deg: f64) -> Vec3 {
    let Some(k) = axis.normalized() else { return v };
    let (s, c) = angle_deg.to_radians().sin_cos();
    rotate_unit(v, k, s, c)
}

/// [`rotate_about`] about a unit axis `k` by the angle whose sine and cosine are `sin` and `cos` (for
/// many vectors turned by the same few angles: the sine and cosine are computed once).
///
/// # Formula
/// Rodrigues, as in [`rotate_about`].
#[inline]
pub fn rotate_unit(v: Vec3, k: Vec3, sin: f64, cos: f64) -> Vec3 {
    v * cos + k.cross(v) * sin + k * (k.dot(v) * (1.0 - cos))
}

/// A rotation matrix, row-major, applied as `m · v`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Rotation {
    /// Rows of the matrix.
    pub m: [[f64; 3]; 3],
}

impl Rotation {
    /// The matrix of [`rotate_about`] for a fixed axis and angle (faster when applied many times).
    pub fn about(axis: Vec3, angle_deg: f64) -> Self {
        let e = |v| rotate_about(v, axis, angle_deg);
        let (a, b, c) = (e(Vec3::new(1.0, 0.0, 0.0)), e(Vec3::new(0.0, 1.0, 0.0)), e(Vec3::new(0.0, 0.0, 1.0)));
        Self { m: [[a.x, b.x, c.x], [a.y, b.y, c.y], [a.z, b.z, c.z]] }
    }
    /// Apply to a vector.
    pub fn apply(&self, v: Vec3) -> Vec3 {
        let m = &self.m;
        Vec3::new(
            m[0][0] * v.x + m[0][1] * v.y + m[0][2] * v.z,
            m[1][0] * v.x + m[1][1] * v.y + m[1][2] * v.z,
            m[2][0] * v.x + m[2][1] * v.y + m[2][2] * v.z,
        )
    }
    /// A rotation that takes the north-horizontal axis (1, 0, 0) to `target` (unit vector);
    /// used to carry samples drawn about the pole of a frame onto a mean direction.
    pub fn from_north_to(target: Vec3) -> Self {
        let d = super::Direction::from_vector(target).unwrap_or(super::Direction { dec: 0.0, inc: 0.0 });
        // First tilt north-horizontal down by I about the east-pointing horizontal axis (−y rotation
        // takes +x toward +z), then turn by D about the vertical.
        let tilt = Rotation::about(Vec3::new(0.0, -1.0, 0.0), d.inc);
        let turn = Rotation::about(Vec3::new(0.0, 0.0, 1.0), d.dec);
        turn.compose(&tilt)
    }
    /// `self ∘ other` (apply `other` first).
    pub fn compose(&self, other: &Rotation) -> Rotation {
        let mut m = [[0.0; 3]; 3];
        for (i, row) in m.iter_mut().enumerate() {
            for (j, cell) in row.iter_mut().enumerate() {
                *cell = (0..3).map(|k| self.m[i][k] * other.m[k][j]).sum();
            }
        }
        Rotation { m }
    }
}
