//! Velocity-profile correction factors for ports.
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
//! - A measured traverse (equal-area or arbitrary radii) is integrated with the
//!   trapezoidal rule over annuli (see the `profile` calculator).

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
