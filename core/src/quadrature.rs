//! Numerical integration for integrands with integrable end singularities.
//!
//! Tanh-sinh (double-exponential) quadrature maps [a, b] onto the real line with
//! x = tanh(π/2·sinh t), whose weights fall off double-exponentially at both ends, so
//! that integrands like 1/√(x − a) or (b − x)^(1/7) converge quickly; the integrand
//! receives the distances from both ends, computed without cancellation, so that it
//! can evaluate itself accurately next to a singular end. Source: Takahasi & Mori,
//! "Double exponential formulas for numerical integration", Publ. RIMS Kyoto Univ.
//! 9 (1974) 721–741 (from memory).
//!
//! Nodes run over |t| ≤ 4.5, where the distance to an end has fallen below 1e-60 of
//! the interval; a node whose integrand is not finite (an end value that underflowed)
//! is skipped, which for an integrable singularity loses less than the rounding.

use std::f64::consts::FRAC_PI_2;

/// ∫ f over [a, b] with step `step` in the transformed variable (1/64 gives about
/// 1e-12 relative for smooth or end-singular integrands). `f` receives the distances
/// from `a` and from `b` of each node.
pub fn tanh_sinh(a: f64, b: f64, step: f64, f: impl Fn(f64, f64) -> f64) -> f64 {
    let half = 0.5 * (b - a);
    let last = (4.5 / step).ceil() as i64;
    let mut sum = 0.0;
    for j in -last..=last {
        let t = j as f64 * step;
        let u = FRAC_PI_2 * t.sinh();
        let cosh_u = u.cosh();
        let weight = FRAC_PI_2 * t.cosh() / (cosh_u * cosh_u);
        let from_a = half * u.exp() / cosh_u;
        let from_b = half * (-u).exp() / cosh_u;
        if from_a > 0.0 && from_b > 0.0 {
            let value = f(from_a, from_b);
            if value.is_finite() {
                sum += weight * value;
            }
        }
    }
    half * step * sum
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn integrates_smooth_and_end_singular_functions() {
        // Derived from the definitions: ∫₀¹ x² dx = 1/3, ∫₀¹ dx/√x = 2,
        // ∫₀¹ (1 − x)^(1/7) dx = 7/8, ∫₀^π sin x dx = 2.
        assert_relative_eq!(
            tanh_sinh(0.0, 1.0, 1.0 / 64.0, |x, _| x * x),
            1.0 / 3.0,
            max_relative = 1e-13
        );
        assert_relative_eq!(
            tanh_sinh(0.0, 1.0, 1.0 / 64.0, |x, _| 1.0 / x.sqrt()),
            2.0,
            max_relative = 1e-12
        );
        assert_relative_eq!(
            tanh_sinh(0.0, 1.0, 1.0 / 64.0, |_, y| y.powf(1.0 / 7.0)),
            7.0 / 8.0,
            max_relative = 1e-13
        );
        assert_relative_eq!(
            tanh_sinh(0.0, std::f64::consts::PI, 1.0 / 64.0, |x, _| x.sin()),
            2.0,
            max_relative = 1e-13
        );
    }
}
