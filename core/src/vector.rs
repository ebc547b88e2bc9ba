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
    /// Euclidean length. The components are scaled by the largest magnitude before
    /// squaring, so the length of a vector with components near `f64::MAX` (or near
    /// the smallest subnormal) neither overflows to infinity nor underflows to zero.
    pub fn norm(self) -> f64 {
        let largest = self.x.abs().max(self.y.abs()).max(self.z.abs());
        if largest == 0.0 || !largest.is_finite() {
            // Zero, or an infinity/NaN that the plain sum carries through unchanged.
            return self.dot(self).sqrt();
        }
        let (x, y, z) = (self.x / largest, self.y / largest, self.z / largest);
        largest * (x * x + y * y + z * z).sqrt()
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn norm_of_small_vectors_is_exact() {
        assert_eq!(Vec3::new(3.0, 4.0, 0.0).norm(), 5.0);
        assert_eq!(Vec3::new(2.0, 3.0, 6.0).norm(), 7.0);
        assert_eq!(Vec3::ZERO.norm(), 0.0);
    }

    #[test]
    fn norm_does_not_overflow_or_underflow() {
        // 1e200² overflows f64; the scaled length is 5e200 (a 3-4-5 triangle).
        let big = Vec3::new(3e200, -4e200, 0.0);
        assert!((big.norm() - 5e200).abs() <= 1e-15 * 5e200, "{}", big.norm());
        let max = Vec3::new(f64::MAX, 0.0, 0.0);
        assert_eq!(max.norm(), f64::MAX);
        // 1e-200² underflows to zero unscaled.
        let tiny = Vec3::new(0.0, 3e-200, 4e-200);
        assert!((tiny.norm() - 5e-200).abs() <= 1e-15 * 5e-200, "{}", tiny.norm());
        assert!(Direction::new(Vec3::new(1e300, 1e300, 0.0)).is_some());
    }

    #[test]
    fn norm_of_non_finite_vectors_is_not_finite() {
        assert!(Vec3::new(f64::INFINITY, 1.0, 0.0).norm().is_infinite());
        assert!(Vec3::new(f64::NAN, 1.0, 0.0).norm().is_nan());
    }
}
