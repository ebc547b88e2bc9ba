//! Tank draining through an orifice: the unsteady mass and energy balances of a
//! vented tank, integrated from rest.
//!
//! # Method
//! The control volume is the liquid in the tank; its only port is the orifice. Write
//! r = C_d·a/A_t (effective outlet area over tank area), V for the ideal outlet
//! velocity (so that the outflow is Q = C_d·a·V) and V_s = r·V for the speed at which
//! the free surface falls. The Reynolds transport theorem for mass gives
//!
//! A_t·dh/dt = −C_d·a·V, i.e. dh/dt = −r·V.
//!
//! The unsteady energy balance along a streamline from the free surface (atmospheric)
//! to the vena contracta (atmospheric), with the liquid in the tank moving as a plug
//! of height h at V_s and the nozzle loss folded into C_d, is
//!
//! h·dV_s/dt + ½V² − ½V_s² = g·h, i.e. h·r·dV/dt = g·h − ½V²(1 − r²).
//!
//! Dropping the first term gives the quasi-steady (Torricelli) law
//! V² = 2gh/(1 − r²), which is what the textbooks integrate; its neglected term is of
//! order r²/(1 − r²) of the head, and for a large outlet it lets the tank "drain"
//! faster than free fall. This page keeps it. With W = V² and the level as the
//! independent variable (dt = −dh/(r·V)) the balance is linear in W:
//!
//! dW/dh − k·W/h = −2g/r², with k = (1 − r²)/r²,
//!
//! and from rest at the starting level h₁ (W = 0 when the outlet opens) it integrates to
//!
//! W(h) = 2g·h·(1 − (h/h₁)^(k−1)) / (1 − 2r²)   (→ 4g·h·ln(h₁/h) at r² = ½).
//!
//! For r → 0 this tends to the quasi-steady law away from a start-up layer of
//! relative thickness r²; for r → 1 it is free fall, W = 2g(h₁ − h). The drain time
//! t = ∫ dh/(r·√W) from h₂ to h₁ has integrable end singularities and is found by
//! tanh-sinh quadrature. Because the surface starts from rest and its acceleration
//! g − ½V_s²(1/r² − 1)/h never exceeds g, the time is never less than free fall,
//! √(2(h₁ − h₂)/g). The outflow peaks where W meets the quasi-steady curve,
//! at h/h₁ = (r²/(1 − r²))^(r²/(1 − 2r²)), or at the final level if that is lower.
//!
//! The jet at the vena contracta has area C_c·a and velocity C_v·V (C_d = C_c·C_v).
//!
//! Checks shown to users. (1) The energy balance of the whole drain, a second balance
//! the solution must satisfy: the potential energy released, ρgA_t(h₁² − h₂²)/2, leaves
//! as the jet's kinetic energy ρA_t·½∫W dh or stays as the tank's, ½ρA_t·h₂·r²·W(h₂)
//! (shown per unit weight drained; the quasi-steady law overshoots it by a factor
//! 1/(1 − r²)). (2) For a small outlet (r ≤ 0.2) the time is compared with the
//! closed-form quasi-steady Torricelli time
//! t = (2A_t/(C_d·a))·√((1 − r²)/(2g))·(√h₁ − √h₂), an independent path that the
//! unsteady solution must approach as r → 0; the allowed difference is
//! 1.5·r²/(1 − r²)·√h₁/(√h₁ − √h₂), the order of the neglected term. The closed form
//! and the quasi-steady draining example are in White, *Fluid Mechanics*; Munson et
//! al., *Fundamentals of Fluid Mechanics*; Çengel & Cimbala, *Fluid Mechanics* (the
//! conservation-of-mass chapter). The unsteady energy balance (unsteady Bernoulli
//! with the plug-flow inertia of the tank's liquid) is derived here from the
//! definitions; its solution was checked against a direct time integration
//! (scipy 1.17.1, `solve_ivp(..., method="Radau", rtol=1e-12)`).
//!
//! # Assumptions
//! Vertical-sided (prismatic) tank open to the atmosphere; orifice at the bottom
//! discharging to atmosphere, opened at once with the liquid at rest; the liquid in the
//! tank moves as a plug (the inertia of the short flow path through the orifice is
//! neglected); constant C_d (≈ 0.61 for a sharp-edged orifice, common practice, no
//! source; about 0.8 for a short tube and 0.95–0.98 for a rounded nozzle) and C_v
//! (≈ 0.98 for a sharp-edged orifice, common practice, no source).
//!
//! # Code
//! [`model::read`] reads the values once into typed [`model::Inputs`] (`uom`
//! quantities); [`model::solve`] is the pure physics, returning [`model::Solved`];
//! `report` writes the outputs, checks, tables, plot and section from it.

use crate::catalog::{CalculatorSpec, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::units::QuantityKind as Q;

use super::common::{self, quantity};

pub mod model;
mod report;

pub const KEY: &str = "tank-drain";

/// Largest orifice diameter as a share of the tank diameter.
const MAX_ORIFICE_SHARE: f64 = 0.999;
/// Largest effective area ratio r for which the quasi-steady check is shown.
const CHECK_MAX_RATIO: f64 = 0.2;
/// Above this r the quasi-steady law is more than about 1 % off; users are told.
const UNSTEADY_NOTICE_RATIO: f64 = 0.1;

/// The usual cautions of the page.
const CAUTIONS: &[&str] = &[
    "Vent the tank: a tank that cannot draw air in as it drains is pulled into vacuum and can collapse.",
    "The discharge coefficient governs the answer; measure it or take it from a published source for your \
            outlet.",
    "A dam-break-like release from a large outlet is violent: keep people clear of the outlet and the \
            receiving area.",
    "Defer to the tank's manufacturer, the local codes and a licensed engineer for the tank, its vent and where the \
        drained liquid goes.",
];

const SUMMARY: &str =
    "Time to lower a vented tank through a bottom orifice, from the unsteady mass and energy balances.";
const D_TANK_HELP: &str = "Inside diameter of a vertical cylindrical tank.";
const D_ORIFICE_HELP: &str =
    "Diameter of the outlet hole or short nozzle in the tank bottom; at most 99.9 % of the tank diameter.";
const CD_HELP: &str =
    "About 0.61 for a sharp-edged orifice, 0.8 for a short tube, 0.95 to 0.98 for a rounded nozzle (common \
            practice).";
const CV_HELP: &str =
    "Jet velocity ÷ ideal velocity: about 0.98 for a sharp-edged orifice, 0.8 for a short tube, 0.95 \
    to 0.99 for a rounded nozzle (common practice). Not below C_d: the contraction coefficient C_d/C_v is at most 1.";
const H_START_HELP: &str = "Height of the free surface above the orifice when the outlet is opened.";
const H_END_HELP: &str = "Level at which to stop; empty or 0 means drained to the orifice.";

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity(
            "d_tank",
            "Tank inside diameter",
            Q::Length,
            "m",
            "ft",
            "3.2 m",
            Limits::closed(0.01, 100.0),
            D_TANK_HELP,
        ),
        quantity(
            "d_orifice",
            "Orifice diameter",
            Q::Length,
            "mm",
            "in",
            "80 mm",
            Limits::closed(1e-3, 99.9),
            D_ORIFICE_HELP,
        ),
        quantity(
            "cd",
            "Discharge coefficient C_d",
            Q::Ratio,
            "-",
            "-",
            "0.61",
            Limits::closed(0.1, 1.0),
            CD_HELP,
        ),
        quantity(
            "cv",
            "Velocity coefficient C_v",
            Q::Ratio,
            "-",
            "-",
            "0.98",
            Limits::closed(0.5, 1.0),
            CV_HELP,
        ),
        quantity(
            "h_start",
            "Starting liquid level above the orifice",
            Q::Length,
            "m",
            "ft",
            "4.5 m",
            Limits::closed(1e-3, 1000.0),
            H_START_HELP,
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "h_end",
                "Final liquid level",
                Q::Length,
                "m",
                "ft",
                "0.5 m",
                Limits::closed(0.0, 1000.0),
                H_END_HELP,
            )
        },
    ];
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: "Tank emptying time",
        group: crate::catalog::group::FLOW_AND_TANKS,
        summary: SUMMARY,
        fields,
        outputs: vec![
            OutputSpec::headline("time", "Time to drain between the levels", Q::Time),
            OutputSpec::headline(
                "q_peak",
                "Largest outflow (just after opening, for a small outlet)",
                Q::VolumeFlow,
            ),
            OutputSpec::listed("v_jet_peak", "Jet velocity at the largest outflow, C_v·V", Q::Velocity),
            OutputSpec::listed(
                "level_rate_peak",
                "Rate of fall of the level at the largest outflow",
                Q::Velocity,
            ),
            OutputSpec::listed("level_at_peak", "Level at the largest outflow", Q::Length),
            OutputSpec::listed("volume", "Volume drained", Q::Volume),
            OutputSpec::listed("q_end", "Outflow at the final level", Q::VolumeFlow),
            OutputSpec::listed(
                "area_ratio",
                "Effective outlet area ÷ tank area, r = C_d·a/A_t",
                Q::Ratio,
            ),
            OutputSpec::listed(
                "time_free_fall",
                "Free-fall time over the same drop (lower bound)",
                Q::Time,
            ),
        ],
        cautions: CAUTIONS.to_vec(),
    }
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, model::read, model::solve, |_, s, r| report::write(s, r))
}

#[cfg(test)]
mod tests {
    use super::model::{quasi_steady_time, Tank};
    use super::*;
    use crate::units::STANDARD_GRAVITY;
    use approx::assert_relative_eq;

    fn tank(ratio: f64, start: f64) -> Tank {
        Tank {
            area: 1.0,
            effective_orifice: ratio,
            ratio,
            start,
        }
    }

    #[test]
    fn never_drains_faster_than_free_fall() {
        // Derived from the definition: from rest the surface accelerates at most at
        // g, so the time to fall Δh is at least √(2Δh/g), for every outlet size.
        for ratio in [
            1e-6,
            1e-3,
            0.05,
            0.2,
            0.5,
            std::f64::consts::FRAC_1_SQRT_2,
            0.8,
            0.95,
            0.99,
            0.998,
        ] {
            for (h1, h2) in [(4.0, 0.0), (1.0, 0.5), (10.0, 9.0), (0.01, 0.0)] {
                let t = tank(ratio, h1).time(h1, h2, 1.0 / 64.0);
                let free = (2.0 * (h1 - h2) / STANDARD_GRAVITY).sqrt();
                assert!(
                    t.is_finite() && t >= free * (1.0 - 1e-9),
                    "r {ratio}, {h1}→{h2}: {t} s < free fall {free} s"
                );
            }
        }
    }

    #[test]
    fn near_full_bore_outlet_approaches_free_fall() {
        // Derived from the definition: as r → 1 the balance becomes dV_s/dt = g, and
        // W = 2g(h₁ − h) exactly at r = 1; at r = 0.998 the time is within 1 % of it.
        let t = tank(0.998, 4.0).time(4.0, 0.0, 1.0 / 64.0);
        let free = (8.0 / STANDARD_GRAVITY).sqrt();
        assert_relative_eq!(t, free, max_relative = 0.01);
    }

    #[test]
    fn solution_of_the_linear_balance_satisfies_it() {
        // The closed form W(h) must satisfy dW/dh − k·W/h = −2g/r² (checked by a
        // central difference, independent of the closed form's derivation).
        for ratio in [0.05, 0.3, std::f64::consts::FRAC_1_SQRT_2, 0.9] {
            let t = tank(ratio, 2.0);
            let k = (1.0 - ratio * ratio) / (ratio * ratio);
            for h in [0.1, 0.7, 1.5, 1.99] {
                let dh = 1e-6;
                let w = |h: f64| t.velocity_squared(h, 2.0 - h);
                let slope = (w(h + dh) - w(h - dh)) / (2.0 * dh);
                let residual = slope - k * w(h) / h + 2.0 * STANDARD_GRAVITY / (ratio * ratio);
                assert!(
                    residual.abs() < 1e-4 * (2.0 * STANDARD_GRAVITY / (ratio * ratio)),
                    "r {ratio}, h {h}: {residual}"
                );
            }
        }
    }

    #[test]
    fn peak_lies_on_the_quasi_steady_curve() {
        // Derived from the definition: dW/dh = 0 where W = 2gh/(1 − r²).
        for ratio in [0.01, 0.3, std::f64::consts::FRAC_1_SQRT_2, 0.9] {
            let t = tank(ratio, 3.0);
            let h = t.level_of_peak(0.0);
            let w = t.velocity_squared(h, 3.0 - h);
            assert_relative_eq!(
                w,
                2.0 * STANDARD_GRAVITY * h / (1.0 - ratio * ratio),
                max_relative = 1e-9
            );
        }
    }

    #[test]
    fn quasi_steady_check_holds_for_small_outlets() {
        for ratio in [1e-9, 1e-4, 0.01, 0.05, 0.1, 0.2] {
            for (h1, h2) in [(4.0, 0.0), (1.0, 0.5), (10.0, 9.9), (0.001, 0.0)] {
                let t = tank(ratio, h1);
                let unsteady = t.time(h1, h2, 1.0 / 64.0);
                let closed = quasi_steady_time(&t, h1, h2);
                let r2 = ratio * ratio;
                let tolerance = 1.5 * r2 / (1.0 - r2) * h1.sqrt() / (h1.sqrt() - h2.sqrt()) + 1e-9;
                assert!(
                    (unsteady - closed).abs() <= tolerance * unsteady.max(closed),
                    "r {ratio}, {h1}→{h2}: {unsteady} against {closed}"
                );
            }
        }
    }

    #[test]
    fn matches_a_direct_time_integration() {
        // scipy==1.17.1: solve_ivp on y = (h, V_s), dh/dt = −V_s,
        // dV_s/dt = g − ½V_s²(1/r² − 1)/h, from (h₁, 0), method="Radau", rtol=1e-12,
        // atol=1e-14, with a terminal event at h = h₂ (g = 9.80665 m/s²).
        for (ratio, h1, h2, expected) in [
            (0.01, 1.0, 0.5, 13.228887616672987),
            (0.1, 1.0, 0.5, 1.3409552170785557),
            (0.3, 1.0, 0.5, 0.5002263281109144),
            (0.5, 1.0, 0.5, 0.37303029717865266),
            (0.7, 1.0, 0.5, 0.33743775701683126),
        ] {
            let t = tank(ratio, h1).time(h1, h2, 1.0 / 64.0);
            assert!((t / expected - 1.0).abs() < 1e-9, "r {ratio}: {t} against {expected}");
        }
    }

    #[test]
    fn extreme_accepted_inputs_show_finite_numbers() {
        let mut count = 0;
        for d_tank in ["0.01 m", "1 m", "100 m"] {
            for d_orifice in ["1 mm", "9.99 mm", "999 mm", "99.9 m"] {
                for (cd, cv) in [("0.1", "0.5"), ("1", "1"), ("0.61", "0.98")] {
                    for (h1, h2) in [
                        ("1 mm", "0 m"),
                        ("1000 m", "999.999 m"),
                        ("4 m", "0 m"),
                        ("1000 m", "0 m"),
                    ] {
                        let pairs = [
                            ("d_tank", d_tank),
                            ("d_orifice", d_orifice),
                            ("cd", cd),
                            ("cv", cv),
                            ("h_start", h1),
                            ("h_end", h2),
                        ];
                        match crate::calculators::testing::outcome(KEY, &pairs).result {
                            Ok(s) => {
                                crate::calculators::profile::tests::clean(&s)
                                    .unwrap_or_else(|e| panic!("{pairs:?}: {e}"));
                                count += 1;
                            }
                            Err(crate::SolveError::Fields(errors)) => {
                                assert!(errors.iter().all(|e| e.field == "d_orifice"), "{pairs:?}: {errors:?}")
                            }
                            Err(e) => panic!("{pairs:?}: {e}"),
                        }
                    }
                }
            }
        }
        assert!(count >= 72, "only {count} solved");
    }
}
