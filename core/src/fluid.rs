//! Fluid properties: water at atmospheric pressure from its temperature, or a custom
//! fluid given by density and viscosity.
//!
//! Water, liquid, 0 °C to saturation at 101.325 kPa (99.97 °C):
//! - density: G. S. Kell, "Density, thermal expansivity, and compressibility of liquid
//!   water from 0° to 150 °C", *J. Chem. Eng. Data* 20 (1975) 97–105, the rational
//!   fit at 1 atm (coefficients as commonly reprinted; checked in the reference tests
//!   against IAPWS-95 to within 2·10⁻⁵ relative);
//! - dynamic viscosity: IAPWS, *Release on the IAPWS Formulation 2008 for the
//!   Viscosity of Ordinary Water Substance*, eqs. (10)–(12) with the critical
//!   enhancement μ₂ = 1 (negligible far from the critical point);
//! - vapour (saturation) pressure: IAPWS-IF97 (Revised Release 2007), eq. (30).
//!
//! Pressure effects on liquid density (≈ 0.05 % per MPa) are neglected: the fluid is
//! treated as incompressible at the density of 1 atm.

use uom::si::f64::{DynamicViscosity, MassDensity, ThermodynamicTemperature};
use uom::si::{
    dynamic_viscosity::pascal_second, mass_density::kilogram_per_cubic_meter,
    thermodynamic_temperature::kelvin as unit_kelvin,
};

use crate::units::STANDARD_ATMOSPHERE;

/// Critical temperature of water, K (IAPWS-95).
const T_CRITICAL: f64 = 647.096;
/// Critical density of water, kg/m³ (IAPWS-95).
const RHO_CRITICAL: f64 = 322.0;
/// 0 °C in kelvin.
pub const ZERO_CELSIUS: f64 = 273.15;

/// Why fluid properties could not be given.
#[derive(Clone, Debug, PartialEq)]
pub enum FluidError {
    /// Water below 0 °C (ice) at atmospheric pressure.
    BelowFreezing { kelvin: f64 },
    /// Water at or above its boiling point at atmospheric pressure.
    AtOrAboveSaturation { kelvin: f64, saturation_kelvin: f64 },
    /// Density or viscosity not finite and positive.
    InvalidProperty { what: &'static str },
}

impl std::fmt::Display for FluidError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            FluidError::BelowFreezing { kelvin } => write!(
                f,
                "{:.2} °C is below freezing; liquid water properties are given from 0 °C to 99.9 °C",
                kelvin - ZERO_CELSIUS
            ),
            FluidError::AtOrAboveSaturation {
                kelvin,
                saturation_kelvin,
            } => write!(
                f,
                "{:.2} °C is at or above the boiling point at atmospheric pressure ({:.2} °C); use a \
                        custom fluid for hot water under pressure",
                kelvin - ZERO_CELSIUS,
                saturation_kelvin - ZERO_CELSIUS
            ),
            FluidError::InvalidProperty { what } => write!(f, "{what} must be a finite number greater than 0"),
        }
    }
}

/// An incompressible fluid.
#[derive(Clone, Debug, PartialEq)]
pub struct Fluid {
    pub name: String,
    /// kg/m³
    pub density: f64,
    /// Pa·s
    pub viscosity: f64,
    /// Absolute saturation pressure, Pa, where known.
    pub vapour_pressure: Option<f64>,
}

impl Fluid {
    /// Liquid water at atmospheric pressure.
    ///
    /// # Errors
    /// Below 0 °C, or at or above the saturation temperature at 101.325 kPa.
    pub fn water(temperature: ThermodynamicTemperature) -> Result<Fluid, FluidError> {
        let t = temperature.get::<unit_kelvin>();
        Fluid::water_kelvin(t)
    }

    /// [`Fluid::water`] with the temperature in kelvin.
    pub fn water_kelvin(t: f64) -> Result<Fluid, FluidError> {
        let saturation_kelvin = water_saturation_temperature_at_one_atmosphere();
        if t.is_nan() || t < ZERO_CELSIUS {
            return Err(FluidError::BelowFreezing { kelvin: t });
        }
        if t >= saturation_kelvin {
            return Err(FluidError::AtOrAboveSaturation {
                kelvin: t,
                saturation_kelvin,
            });
        }
        let density = water_density(t);
        Ok(Fluid {
            name: format!("water at {:.1} °C", t - ZERO_CELSIUS),
            density,
            viscosity: water_viscosity(t, density),
            vapour_pressure: Some(water_saturation_pressure(t)),
        })
    }

    /// A fluid of given density and viscosity (vapour pressure unknown).
    ///
    /// # Errors
    /// Density or viscosity not finite and positive.
    pub fn custom(name: &str, density: MassDensity, viscosity: DynamicViscosity) -> Result<Fluid, FluidError> {
        let rho = density.get::<kilogram_per_cubic_meter>();
        let mu = viscosity.get::<pascal_second>();
        if !(rho.is_finite() && rho > 0.0) {
            return Err(FluidError::InvalidProperty { what: "density" });
        }
        if !(mu.is_finite() && mu > 0.0) {
            return Err(FluidError::InvalidProperty { what: "viscosity" });
        }
        Ok(Fluid {
            name: name.to_string(),
            density: rho,
            viscosity: mu,
            vapour_pressure: None,
        })
    }

    /// Kinematic viscosity, m²/s.
    pub fn kinematic_viscosity(&self) -> f64 {
        self.viscosity / self.density
    }
}

/// Density of liquid water at 101.325 kPa, kg/m³ (Kell 1975), `t` in kelvin.
pub fn water_density(t: f64) -> f64 {
    let c = t - ZERO_CELSIUS;
    let numerator = 999.83952 + 16.945176 * c - 7.9870401e-3 * c.powi(2) - 46.170461e-6 * c.powi(3)
        + 105.56302e-9 * c.powi(4)
        - 280.54253e-12 * c.powi(5);
    numerator / (1.0 + 16.879850e-3 * c)
}

/// Dynamic viscosity of water, Pa·s, at `t` kelvin and `density` kg/m³
/// (IAPWS 2008, eqs. 10–12, μ₂ = 1).
pub fn water_viscosity(t: f64, density: f64) -> f64 {
    const H0: [f64; 4] = [1.67752, 2.20462, 0.6366564, -0.241605];
    // (i, j, H_ij) of eq. (12), IAPWS 2008 Table 2.
    const H1: [(i32, i32, f64); 21] = [
        (0, 0, 5.20094e-1),
        (1, 0, 8.50895e-2),
        (2, 0, -1.08374),
        (3, 0, -2.89555e-1),
        (0, 1, 2.22531e-1),
        (1, 1, 9.99115e-1),
        (2, 1, 1.88797),
        (3, 1, 1.26613),
        (5, 1, 1.20573e-1),
        (0, 2, -2.81378e-1),
        (1, 2, -9.06851e-1),
        (2, 2, -7.72479e-1),
        (3, 2, -4.89837e-1),
        (4, 2, -2.57040e-1),
        (0, 3, 1.61913e-1),
        (1, 3, 2.57399e-1),
        (0, 4, -3.25372e-2),
        (3, 4, 6.98452e-2),
        (4, 5, 8.72102e-3),
        (3, 6, -4.35673e-3),
        (5, 6, -5.93264e-4),
    ];
    let tr = t / T_CRITICAL;
    let dr = density / RHO_CRITICAL;
    let mu0 = 100.0 * tr.sqrt() / H0.iter().enumerate().map(|(i, h)| h / tr.powi(i as i32)).sum::<f64>();
    let sum: f64 = H1
        .iter()
        .map(|&(i, j, h)| h * (1.0 / tr - 1.0).powi(i) * (dr - 1.0).powi(j))
        .sum();
    let mu1 = (dr * sum).exp();
    mu0 * mu1 * 1e-6
}

/// Coefficients n₁…n₁₀ of the IAPWS-IF97 saturation-line equations (Table 34).
const SATURATION_N: [f64; 10] = [
    0.11670521452767e4,
    -0.72421316703206e6,
    -0.17073846940092e2,
    0.12020824702470e5,
    -0.32325550322333e7,
    0.14915108613530e2,
    -0.48232657361591e4,
    0.40511340542057e6,
    -0.23855557567849,
    0.65017534844798e3,
];

/// Saturation pressure of water, Pa absolute, at `t` kelvin (IAPWS-IF97 eq. 30).
pub fn water_saturation_pressure(t: f64) -> f64 {
    let theta = t + SATURATION_N[8] / (t - SATURATION_N[9]);
    let a = theta * theta + SATURATION_N[0] * theta + SATURATION_N[1];
    let b = SATURATION_N[2] * theta * theta + SATURATION_N[3] * theta + SATURATION_N[4];
    let c = SATURATION_N[5] * theta * theta + SATURATION_N[6] * theta + SATURATION_N[7];
    (2.0 * c / (-b + (b * b - 4.0 * a * c).sqrt())).powi(4) * 1e6
}

/// Saturation temperature of water at `p` Pa absolute, K (IAPWS-IF97 eq. 31).
pub fn water_saturation_temperature(p: f64) -> f64 {
    let beta = (p / 1e6).powf(0.25);
    let e = beta * beta + SATURATION_N[2] * beta + SATURATION_N[5];
    let f = SATURATION_N[0] * beta * beta + SATURATION_N[3] * beta + SATURATION_N[6];
    let g = SATURATION_N[1] * beta * beta + SATURATION_N[4] * beta + SATURATION_N[7];
    let d = 2.0 * g / (-f - (f * f - 4.0 * e * g).sqrt());
    (SATURATION_N[9] + d - ((SATURATION_N[9] + d).powi(2) - 4.0 * (SATURATION_N[8] + SATURATION_N[9] * d)).sqrt()) / 2.0
}

/// Boiling point at one standard atmosphere, K (≈ 373.124 K).
pub fn water_saturation_temperature_at_one_atmosphere() -> f64 {
    water_saturation_temperature(STANDARD_ATMOSPHERE)
}

/// Convenience for tests and calculators: water at `celsius`.
pub fn water_celsius(celsius: f64) -> Result<Fluid, FluidError> {
    Fluid::water(ThermodynamicTemperature::new::<unit_kelvin>(celsius + ZERO_CELSIUS))
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn saturation_equations_are_inverse() {
        // IAPWS-IF97 eqs. 30 and 31 are exact inverses of each other.
        for t in [280.0, 300.0, 350.0, 373.0] {
            assert_relative_eq!(
                water_saturation_temperature(water_saturation_pressure(t)),
                t,
                max_relative = 1e-9
            );
        }
        // IF97 verification value (Table 35): T = 300 K → ps = 0.353658941e-2 MPa.
        assert_relative_eq!(water_saturation_pressure(300.0), 3536.58941, max_relative = 1e-8);
    }

    #[test]
    fn refuses_ice_and_boiling_water() {
        assert!(matches!(water_celsius(-1.0), Err(FluidError::BelowFreezing { .. })));
        assert!(matches!(
            water_celsius(100.0),
            Err(FluidError::AtOrAboveSaturation { .. })
        ));
        assert!(water_celsius(99.9).is_ok());
        assert!(matches!(
            Fluid::water_kelvin(f64::NAN),
            Err(FluidError::BelowFreezing { .. })
        ));
    }
}
