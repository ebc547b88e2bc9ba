//! Root finding and peak search, shared by the calculators.
//!
//! Both work on a bracket and on functions that may fail (a balance refusing an
//! input): the error of the function is returned as is.
//!
//! - [`sign_change`]: the point in [lo, hi] where f changes sign from positive to
//!   not positive. It keeps a bracket that always holds the sign change, and stops
//!   when the bracket's midpoint no longer moves, i.e. at floating-point resolution,
//!   as bisection does. Each step tries the false-position point with the Illinois
//!   modification (the value kept at an end that stays twice running is halved) and
//!   falls back to halving the bracket whenever three steps did not halve it, so it
//!   is never much slower than bisection and on a smooth function takes about a
//!   fifth of its steps (bisection needs about 55 to reach floating-point
//!   resolution). [`sign_change_of`] is the same for a function that cannot fail.
//! - [`peak_of`]: the maximum of a smooth function with one peak: the sign change
//!   of a central difference (see its doc for why not golden section).
//!
//! References: bisection and false position with the Illinois modification, Press
//! et al., *Numerical Recipes*, 3rd ed., §9.1–9.2, and Dahlquist & Björck,
//! *Numerical Methods* (1974), §6.2 (from memory).

/// Finds x in [`lo`, `hi`] where `f` changes sign from positive (at `lo`) to not
/// positive (at `hi`), to floating-point resolution (see the module docs for the
/// method). `f` is evaluated at both ends too. When the ends do not have those
/// signs, it bisects, and ends next to the end that has the wrong sign.
///
/// # Errors
/// The first error `f` returns.
pub fn sign_change<E>(lo: f64, hi: f64, f: impl Fn(f64) -> Result<f64, E>) -> Result<f64, E> {
    sign_change_until(lo, hi, f, |_, _| false)
}

/// [`sign_change`] of a function that cannot fail.
pub fn sign_change_of(lo: f64, hi: f64, f: impl Fn(f64) -> f64) -> f64 {
    let Ok(x) = sign_change(lo, hi, |x| Ok::<_, std::convert::Infallible>(f(x)));
    x
}

/// [`sign_change`], also stopping once `narrow_enough(lo, hi)` holds for the bracket.
fn sign_change_until<E>(
    mut lo: f64,
    mut hi: f64,
    f: impl Fn(f64) -> Result<f64, E>,
    narrow_enough: impl Fn(f64, f64) -> bool,
) -> Result<f64, E> {
    /// Which end of the bracket the last step kept.
    #[derive(PartialEq)]
    enum Kept {
        Low,
        High,
        Neither,
    }
    let (mut f_lo, mut f_hi) = (f(lo)?, f(hi)?);
    // False position needs the two signs it assumes and finite values; otherwise
    // every step halves the bracket.
    let interpolate = f_lo > 0.0 && f_hi <= 0.0 && f_lo.is_finite() && f_hi.is_finite();
    // The bracket's widths one, two and three steps back.
    let mut widths_before = [f64::INFINITY; 3];
    let mut kept = Kept::Neither;
    for _ in 0..400 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi || narrow_enough(lo, hi) {
            break;
        }
        let width = hi - lo;
        let halving = !interpolate || width > 0.5 * widths_before[2];
        // A false-position point is kept a few units of the last place inside
        // the bracket: a point on an end (a function that is exactly 0 there) or
        // creeping along one side would shrink the bracket by nothing.
        let margin = 4.0 * f64::EPSILON * lo.abs().max(hi.abs());
        let x = if halving || width <= 4.0 * margin {
            mid
        } else {
            let x = hi - f_hi * (hi - lo) / (f_hi - f_lo);
            if x.is_finite() {
                x.clamp(lo + margin, hi - margin)
            } else {
                mid
            }
        };
        let f_x = f(x)?;
        if f_x > 0.0 {
            lo = x;
            f_lo = f_x;
            if kept == Kept::High && !halving {
                f_hi *= 0.5;
            }
            kept = Kept::High;
        } else {
            hi = x;
            f_hi = f_x;
            if kept == Kept::Low && !halving {
                f_lo *= 0.5;
            }
            kept = Kept::Low;
        }
        widths_before = [width, widths_before[0], widths_before[1]];
    }
    Ok(0.5 * (lo + hi))
}

/// Where a smooth function with one peak on (`lo`, `hi`) is largest: the point where
/// its slope changes sign, found by [`sign_change`] on a central difference, to
/// 1e-13 of the range.
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
    let rising = |x: f64| Ok(f(x + step)? - f(x - step)?);
    // The bracket's ends are evaluated too: kept two steps inside, so that `f` is
    // never asked for at `lo` or `hi` themselves (a balance may refuse its ends).
    sign_change_until(lo + 2.0 * step, hi - 2.0 * step, rising, |a, b| b - a <= 1e-13 * span)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    type Never = std::convert::Infallible;

    #[test]
    fn the_sign_change_of_two_minus_x_squared_is_the_square_root_of_two() {
        // √2 = 1.414 213 562 373 095 (closed form).
        let r = sign_change(0.0, 2.0, |x| Ok::<_, Never>(2.0 - x * x)).unwrap();
        assert_relative_eq!(r, std::f64::consts::SQRT_2, max_relative = 1e-15);
    }

    /// The steps the module docs promise: on smooth functions a fraction of
    /// bisection's (about 55 from these brackets), and the same answer.
    #[test]
    fn false_position_needs_far_fewer_steps_than_bisection() {
        let cases: [(&str, f64, f64, fn(f64) -> f64, f64); 4] = [
            // √2 (closed form 1.414 213 562 373 095).
            ("2 − x²", 0.0, 2.0, |x| 2.0 - x * x, std::f64::consts::SQRT_2),
            // The same root seen through a steep, curved function.
            (
                "exp(2 − x²) − 1",
                0.0,
                2.0,
                |x| (2.0 - x * x).exp() - 1.0,
                std::f64::consts::SQRT_2,
            ),
            // A falling line: one false-position step lands on it.
            ("3 − x", 0.0, 8.0, |x| 3.0 - x, 3.0),
            // A root where the function is very flat on one side: 0.5 − x⁹ on [0, 1].
            ("0.5 − x⁹", 0.0, 1.0, |x| 0.5 - x.powi(9), 0.5f64.powf(1.0 / 9.0)),
        ];
        for (name, lo, hi, f, root) in cases {
            let calls = std::cell::Cell::new(0);
            let found = sign_change(lo, hi, |x| {
                calls.set(calls.get() + 1);
                Ok::<_, Never>(f(x))
            })
            .unwrap();
            assert_relative_eq!(found, root, max_relative = 4e-16);
            assert!(calls.get() <= 20, "{name}: {} calls", calls.get());
        }
    }

    #[test]
    fn the_bracket_shrinks_to_the_sign_change_when_the_ends_have_the_wrong_signs() {
        // Positive everywhere: the search ends at the upper end, as bisection did.
        let r = sign_change(0.0, 1.0, |_| Ok::<_, Never>(1.0)).unwrap();
        assert_relative_eq!(r, 1.0, max_relative = 1e-15);
        // A step (no smooth root): halving finds the jump at 0.3.
        let r = sign_change(0.0, 1.0, |x| Ok::<_, Never>(if x < 0.3 { 1.0 } else { -1.0 })).unwrap();
        assert_relative_eq!(r, 0.3, max_relative = 1e-15);
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
        assert_eq!(sign_change(0.0, 1.0, |_| Err::<f64, _>("refused")), Err("refused"));
    }
}
