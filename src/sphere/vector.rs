//! Cartesian 3-vectors in the paleomagnetic frame: x = north, y = east, z = down.

use std::ops::{Add, AddAssign, Mul, Neg, Sub};

/// A Cartesian vector, x = north, y = east, z = down (right-handed).
///
/// # Units
/// Dimensionless unless stated by the caller (moments in A·m² in demagnetization data).
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct Vec3 {
    /// North component.
    pub x: f64,
    /// East component.
    pub y: f64,
    /// Down component.
    pub z: f64,
}

impl Vec3 {
    /// Construct from components.
    pub const fn new(x: f64, y: f64, z: f64) -> Self {
        Self { x, y, z }
    }
    /// The zero vector.
    pub const ZERO: Vec3 = Vec3::new(0.0, 0.0, 0.0);
    /// Scalar product.
    pub fn dot(self, o: Vec3) -> f64 {
        self.x * o.x + self.y * o.y + self.z * o.z
    }
    /// Vector product.
    pub fn cross(self, o: Vec3) -> Vec3 {
        Vec3::new(self.y * o.z - self.z * o.y, self.z * o.x - self.x * o.z, self.x * o.y - self.y * o.x)
    }
    /// Euclidean length.
    pub fn norm(self) -> f64 {
        self.dot(self).sqrt()
    }
    /// Unit vector in the same direction, or `None` for a (numerically) zero vector.
    pub fn normalized(self) -> Option<Vec3> {
        let n = self.norm();
        if n > crate::tolerance::ZERO_NORM && n.is_finite() {
            Some(self * (1.0 / n))
        } else {
            None
        }
    }
    /// Components as an array `[x, y, z]`.
    pub fn to_array(self) -> [f64; 3] {
        [self.x, self.y, self.z]
    }
    /// From an array `[x, y, z]`.
    pub fn from_array(a: [f64; 3]) -> Vec3 {
        Vec3::new(a[0], a[1], a[2])
    }
}

impl Add for Vec3 {
    type Output = Vec3;
    fn add(self, o: Vec3) -> Vec3 {
        Vec3::new(self.x + o.x, self.y + o.y, self.z + o.z)
    }
}
impl AddAssign for Vec3 {
    fn add_assign(&mut self, o: Vec3) {
        self.x += o.x;
        self.y += o.y;
        self.z += o.z;
    }
}
impl Sub for Vec3 {
    type Output = Vec3;
    fn sub(self, o: Vec3) -> Vec3 {
        Vec3::new(self.x - o.x, self.y - o.y, self.z - o.z)
    }
}
impl Mul<f64> for Vec3 {
    type Output = Vec3;
    fn mul(self, s: f64) -> Vec3 {
        Vec3::new(self.x * s, self.y * s, self.z * s)
    }
}
impl Neg for Vec3 {
    type Output = Vec3;
    fn neg(self) -> Vec3 {
        Vec3::new(-self.x, -self.y, -self.z)
    }
}
