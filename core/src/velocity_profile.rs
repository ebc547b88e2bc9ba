//! Velocity-profile correction factors for ports (the `profile` page, which measures
//! a profile, is [`crate::calculators::profile`]).
//!
//! The momentum flux through a port is β·ṁ·V and its kinetic-energy flux α·ṁ·V²/2,
//! with V the mean velocity and β = (1/A)∫(u/V)² dA, α = (1/A)∫(u/V)³ dA.
//!
//! - Laminar (Poiseuille) profile u = U(1 − (r/R)²): β = 4/3, α = 2.
//! - Power-law profile u = U(1 − r/R)^(1/n), derived from the definitions with
//!   ∫₀¹(1 − s)^m s ds = 1/((m + 1)(m + 2)):
//!   V/U = 2n²/((n + 1)(2n + 1)), β = (n + 1)(2n + 1)²/(4n²(n + 2)),
//!   α = (n + 1)³(2n + 1)³/(4n⁴(n + 3)(2n + 3)).
//!   See e.g. White, *Fluid Mechanics*, and Çengel & Cimbala, *Fluid Mechanics*, the
//!   sections on the momentum-flux and kinetic-energy correction factors.
//! - A measured traverse (equal-area or arbitrary radii) is taken as linear between
//!   its points and closed to the wall with a power-law wall zone, and integrated
//!   exactly (see the `profile` calculator and [`wall_zone_means`]).
//! - Power-law wall zone from the last point (s_L, u_L), s = r/R, δ = 1 − s_L:
//!   u = u_L·((1 − s)/δ)^(1/m); with t = (1 − s)/δ its share of the area mean of u^k is
//!   ∫ u^k 2s ds = u_L^k·2δ·(1/(p + 1) − δ/(p + 2)), p = k/m (derived from the
//!   definition). The power-law wall zone is the one used by the velocity-area
//!   methods of ISO 3966 (Pitot static tubes) and ISO 7194 (current meters), with m
//!   from about 4 for rough walls to 10 for smooth ones and 7 typical (from memory).

/// β and α of one velocity profile, with the ratio of mean to peak velocity.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ProfileFactors {
    pub momentum_flux: f64,
    pub kinetic_energy: f64,
    pub mean_over_peak: f64,
}

/// Fully developed laminar flow in a round pipe.
pub fn laminar() -> ProfileFactors {
    ProfileFactors {
        momentum_flux: 4.0 / 3.0,
        kinetic_energy: 2.0,
        mean_over_peak: 0.5,
    }
}

/// Power-law turbulent profile with exponent 1/n, `n` > 0 (typically 6 to 10).
pub fn power_law(n: f64) -> Option<ProfileFactors> {
    if !(n.is_finite() && n > 0.0) {
        return None;
    }
    Some(ProfileFactors {
        momentum_flux: (n + 1.0) * (2.0 * n + 1.0).powi(2) / (4.0 * n * n * (n + 2.0)),
        kinetic_energy: (n + 1.0).powi(3) * (2.0 * n + 1.0).powi(3) / (4.0 * n.powi(4) * (n + 3.0) * (2.0 * n + 3.0)),
        mean_over_peak: 2.0 * n * n / ((n + 1.0) * (2.0 * n + 1.0)),
    })
}

/// The wall zone's contribution to the area means of u, u² and u³ (each ∫ u^k·2s ds
/// over s = r/R from `s_last` to 1) for u = u_last·((1 − s)/(1 − s_last))^(1/m).
pub fn wall_zone_means(s_last: f64, u_last: f64, m: f64) -> [f64; 3] {
    let delta = 1.0 - s_last;
    let mut sums = [0.0; 3];
    for (k, sum) in sums.iter_mut().enumerate() {
        let power = (k + 1) as f64;
        let p = power / m;
        *sum = u_last.powf(power) * 2.0 * delta * (1.0 / (p + 1.0) - delta / (p + 2.0));
    }
    sums
}
