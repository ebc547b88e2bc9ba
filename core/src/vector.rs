//! Three-component vectors in SI units, and unit directions.
//!
//! Coordinates: x and y span the plane of a drawing (x to the right, y up), z out of
//! the page. Gravity defaults to −y for a fitting drawn in a vertical plane and to −z
//! for one drawn in a horizontal plane; the calculators say which.

use std::ops::{Add, AddAssign, Mul, Neg, Sub};

#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Vec3 {
    pub x: f64,
    pub y: f64,
    pub z: f64,
}

impl Vec3 {
    pub const ZERO: Vec3 = Vec3 { x: 0.0, y: 0.0, z: 0.0 };

    pub const fn new(x: f64, y: f64, z: f64) -> Vec3 {
        Vec3 { x, y, z }
    }
    /// A vector in the x–y plane at `angle` (radians, counter-clockwise from +x).
    pub fn in_plane(magnitude: f64, angle: f64) -> Vec3 {
        Vec3::new(magnitude * angle.cos(), magnitude * angle.sin(), 0.0)
    }
    pub fn dot(self, other: Vec3) -> f64 {
        self.x * other.x + self.y * other.y + self.z * other.z
    }
    pub fn cross(self, o: Vec3) -> Vec3 {
        Vec3::new(
            self.y * o.z - self.z * o.y,
            self.z * o.x - self.x * o.z,
            self.x * o.y - self.y * o.x,
        )
    }
    pub fn norm(self) -> f64 {
        self.dot(self).sqrt()
    }
    pub fn is_finite(self) -> bool {
        self.x.is_finite() && self.y.is_finite() && self.z.is_finite()
    }
    /// Angle in the x–y plane, radians counter-clockwise from +x.
    pub fn plane_angle(self) -> f64 {
        self.y.atan2(self.x)
    }
    /// Rotates about the z axis by `angle` radians.
    pub fn rotated_z(self, angle: f64) -> Vec3 {
        let (s, c) = angle.sin_cos();
        Vec3::new(c * self.x - s * self.y, s * self.x + c * self.y, self.z)
    }
    pub fn xy(self) -> [f64; 2] {
        [self.x, self.y]
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
        *self = *self + o;
    }
}
impl Sub for Vec3 {
    type Output = Vec3;
    fn sub(self, o: Vec3) -> Vec3 {
        Vec3::new(self.x - o.x, self.y - o.y, self.z - o.z)
    }
}
impl Neg for Vec3 {
    type Output = Vec3;
    fn neg(self) -> Vec3 {
        Vec3::new(-self.x, -self.y, -self.z)
    }
}
impl Mul<f64> for Vec3 {
    type Output = Vec3;
    fn mul(self, k: f64) -> Vec3 {
        Vec3::new(self.x * k, self.y * k, self.z * k)
    }
}
impl std::iter::Sum for Vec3 {
    fn sum<I: Iterator<Item = Vec3>>(iter: I) -> Vec3 {
        iter.fold(Vec3::ZERO, |a, b| a + b)
    }
}

/// A unit vector: finite and of length one by construction.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Direction(Vec3);

impl Direction {
    pub const X: Direction = Direction(Vec3::new(1.0, 0.0, 0.0));
    pub const Y: Direction = Direction(Vec3::new(0.0, 1.0, 0.0));
    pub const Z: Direction = Direction(Vec3::new(0.0, 0.0, 1.0));

    /// Normalises `v`; `None` for a zero, tiny or non-finite vector.
    pub fn new(v: Vec3) -> Option<Direction> {
        let n = v.norm();
        if n.is_finite() && n > 1e-12 {
            Some(Direction(v * (1.0 / n)))
        } else {
            None
        }
    }
    /// The direction in the x–y plane at `angle` radians from +x.
    pub fn in_plane(angle: f64) -> Direction {
        let v = Vec3::in_plane(1.0, angle);
        Direction::new(v).unwrap_or(Direction::X)
    }
    pub fn vec(self) -> Vec3 {
        self.0
    }
    /// The opposite direction.
    pub fn reversed(self) -> Direction {
        Direction(-self.0)
    }
}
