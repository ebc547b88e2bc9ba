//! Darcy friction factor for pipe flow.
//!
//! Laminar (Re < 2300): f = 64/Re (Hagen–Poiseuille). Turbulent: the Colebrook
//! equation, 1/√f = −2 log₁₀(ε/(3.7 D) + 2.51/(Re √f)) (C. F. Colebrook, J. ICE 11
//! (1939) 133–156), solved by fixed-point iteration on x = 1/√f from the Haaland
//! (1983) explicit estimate; the iteration converges in a few steps for all
//! Re ≥ 2300 and 0 ≤ ε/D ≤ 0.05. Between 2300 and 4000 the flow is transitional and
//! the turbulent value is returned with a warning by the caller.

/// Why a friction factor could not be given.
#[derive(Clone, Debug, PartialEq)]
pub enum FrictionError {
    /// Reynolds number not finite and positive.
    Reynolds,
    /// Relative roughness outside 0 to 0.05.
    Roughness,
}

/// Darcy friction factor from Reynolds number and relative roughness ε/D.
///
/// # Errors
/// A non-positive or non-finite Reynolds number; relative roughness outside [0, 0.05].
///
/// # References
/// Colebrook (1939); Haaland, *J. Fluids Eng.* 105 (1983) 89–90 for the start value.
pub fn darcy_friction_factor(reynolds: f64, relative_roughness: f64) -> Result<f64, FrictionError> {
    if !(reynolds.is_finite() && reynolds > 0.0) {
        return Err(FrictionError::Reynolds);
    }
    if !(relative_roughness.is_finite() && (0.0..=0.05).contains(&relative_roughness)) {
        return Err(FrictionError::Roughness);
    }
    if reynolds < 2300.0 {
        return Ok(64.0 / reynolds);
    }
    Ok(colebrook(reynolds, relative_roughness))
}

/// Colebrook equation solved to machine precision (turbulent flow).
pub fn colebrook(reynolds: f64, relative_roughness: f64) -> f64 {
    let haaland = -1.8 * ((relative_roughness / 3.7).powf(1.11) + 6.9 / reynolds).log10();
    let mut x = haaland; // x = 1/√f
    for _ in 0..50 {
        let next = -2.0 * (relative_roughness / 3.7 + 2.51 * x / reynolds).log10();
        if (next - x).abs() < 1e-14 * x.abs() {
            x = next;
            break;
        }
        x = next;
    }
    1.0 / (x * x)
}
