//! Root finding and peak search, shared by the calculators.
//!
//! Both work on a bracket and on functions that may fail (a balance refusing an
//! input): the error of the function is returned as is.
//!
//! - [`bisect_sign_change`]: the point in [lo, hi] where f changes sign from
//!   positive to not positive, by bisection (each step halves the bracket; it stops
//!   when the midpoint no longer moves, i.e. at floating-point resolution).
//! - [`peak_of`]: the maximum of a smooth function with one peak, by bisection on
//!   the sign of a central difference (see its doc for why not golden section).
//!
//! Reference: bisection and its convergence, e.g. Press et al., *Numerical
//! Recipes*, 3rd ed., §9.1 (from memory).

/// Finds x in [`lo`, `hi`] where `f` changes sign from positive (at `lo`) to not
/// positive (at `hi`), by bisection to floating-point resolution.
///
/// # Errors
/// The first error `f` returns.
pub fn bisect_sign_change<E>(mut lo: f64, mut hi: f64, f: impl Fn(f64) -> Result<f64, E>) -> Result<f64, E> {
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if f(mid)? > 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Ok(0.5 * (lo + hi))
}

/// Where a smooth function with one peak on (`lo`, `hi`) is largest: the point where
/// its slope changes sign, found by bisection on a central difference.
///
/// Comparing function values (a golden-section search) fixes a flat peak only to
/// about the square root of the noise in the function: values computed through
/// several balances carry 1e-10 or so, which leaves the peak uncertain to 1e-5. The
/// sign of a central difference over a step of 1e-4 of the range resolves it to
/// about noise ÷ 2e-4 (5e-7), with a bias of order step² (about 1e-8 for the vane's
/// cubic power curve).
///
/// # Errors
/// The first error `f` returns.
pub fn peak_of<E>(lo: f64, hi: f64, f: impl Fn(f64) -> Result<f64, E>) -> Result<f64, E> {
    let span = hi - lo;
    let step = 1e-4 * span;
    let (mut a, mut b) = (lo + step, hi - step);
    for _ in 0..200 {
        if b - a <= 1e-13 * span {
            break;
        }
        let mid = 0.5 * (a + b);
        if f(mid + step)? > f(mid - step)? {
            a = mid;
        } else {
            b = mid;
        }
    }
    Ok(0.5 * (a + b))
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    type Never = std::convert::Infallible;

    #[test]
    fn bisection_finds_the_square_root_of_two() {
        // √2 = 1.414 213 562 373 095 (closed form).
        let r = bisect_sign_change(0.0, 2.0, |x| Ok::<_, Never>(2.0 - x * x)).unwrap();
        assert_relative_eq!(r, std::f64::consts::SQRT_2, max_relative = 1e-15);
    }

    #[test]
    fn the_peak_of_a_cubic_power_curve_is_at_a_third() {
        // P(u) = u·(1 − u)² peaks at u = 1/3 (dP/du = (1 − u)(1 − 3u) = 0), the
        // shape of a jet's power on a moving vane.
        let u = peak_of(0.0, 1.0, |u| Ok::<_, Never>(u * (1.0 - u).powi(2))).unwrap();
        assert_relative_eq!(u, 1.0 / 3.0, max_relative = 1e-7);
    }

    #[test]
    fn an_error_of_the_function_is_returned() {
        assert_eq!(peak_of(0.0, 1.0, |_| Err::<f64, _>("refused")), Err("refused"));
        assert_eq!(
            bisect_sign_change(0.0, 1.0, |_| Err::<f64, _>("refused")),
            Err("refused")
        );
    }
}
