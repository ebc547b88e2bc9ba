//! Velocity profile or traverse → flow, mean velocity and correction factors.
//!
//! # Method
//! For a round pipe of radius R with axial velocity u(r), s = r/R:
//!
//! Q = ∫₀ᴿ u·2πr dr,  V = Q/A = ∫₀¹ u·2s ds,  β = ∫u² dA / (A·V²),  α = ∫u³ dA / (A·V³).
//!
//! A measured traverse (points at radius fractions r/R along one or more diameters,
//! averaged per radius) is taken as linear in s between its points and flat from the
//! innermost point to the axis (du/dr = 0 there by symmetry). Between the outermost
//! point (s_L, u_L) and the wall it is closed with the power-law wall zone of the
//! velocity-area methods, u = u_L·((1 − s)/(1 − s_L))^(1/m), m typed (4 for rough
//! walls to 10 for smooth ones, 7 when left empty): ISO 3966 (Pitot static tubes) and
//! ISO 7194 (current meters) close the traverse this way (from memory). Closing it with
//! a straight line to zero at the wall instead biases the flow low: an equal-area
//! traverse of five rings of an exact 1/7 power-law profile reads 3.6 % low with
//! β = 1.055 (exact 1.020) that way, and 0.6 % low with β = 1.020 with the wall zone
//! (scipy 1.17.1, `scipy.integrate.quad` of both closures). The linear segments
//! (integrand of degree ≤ 4 in s) are integrated exactly by three-point Gauss–Legendre
//! quadrature and the wall zone in closed form
//! ([`crate::velocity_profile::wall_zone_means`]).
//! The laminar and power-law profiles use the closed forms of [`crate::velocity_profile`].
//!
//! Checks shown to users compare the mean velocity and β with a tanh-sinh quadrature
//! ([`crate::quadrature`]) of the same profile function, an independent numerical
//! path through the same profile (for the laws: against their closed forms).
//!
//! # Carried to the fitting pages
//! The report links to the bend, reducer and nozzle pages (their inlet) and to the
//! tee page (its common pipe, its branch 1 or its branch 2) with the profile
//! `carried` and β and α typed
//! ([`crate::calculators::common::profile_carry_overs`]); the fitting's basis table
//! then says "β from the velocity-profile page".
//!
//! # Assumptions
//! Axisymmetric profile; the points describe u(r) linearly between them; the wall zone
//! follows a power law from the outermost point; point positions and counts follow
//! the measurement standard the user works to.
//!
//! # Code
//! [`model::read`] reads the values once into typed [`model::Inputs`] (the traverse
//! text parsed into points, `uom` quantities); [`model::solve`] is the pure
//! integration, returning [`model::Solved`]; `report` writes the outputs, checks,
//! tables and plot from it.

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldKind, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::units::QuantityKind as Q;

use super::common::{choice, quantity, MAX_SIZE_M};

pub mod model;
mod report;

pub const KEY: &str = "profile";
/// The page title.
pub const TITLE: &str = "Flow and momentum factors from a velocity traverse";

const SHAPES: &[ChoiceOption] = &[
    ChoiceOption {
        key: "traverse",
        label: "Measured traverse (r/R and velocity)",
    },
    ChoiceOption {
        key: "power_law",
        label: "Power-law turbulent profile",
    },
    ChoiceOption {
        key: "laminar",
        label: "Laminar (parabolic) profile",
    },
];

/// Most points accepted in one traverse.
const MAX_POINTS: usize = 200;
/// Largest velocity accepted anywhere on this page, m/s (faster than any liquid pipe
/// flow this handbook covers).
const MAX_VELOCITY: f64 = 100.0;
/// Smallest peak velocity with a measurable flow, m/s.
const MIN_PEAK_VELOCITY: f64 = 1e-3;
/// Wall-zone exponent used when the field is left empty.
const DEFAULT_WALL_EXPONENT: f64 = 7.0;
/// Tolerance of the quadrature checks (the tanh-sinh sums converge to about 1e-12).
const QUADRATURE_TOLERANCE: f64 = 1e-8;

/// The usual cautions of the page.
const CAUTIONS: &[&str] = &[
    "The wall zone is assumed, not measured: a disturbed or rough-walled section can differ; a traverse with points \
        close to the wall depends least on it.",
    "For flow measured for a contract, a permit or an acceptance test, follow the measurement standard and the local \
        rules, and have the result checked by a licensed engineer; this page does not replace them.",
    "Traverse point positions and counts follow the measurement standard you work to (e.g. ISO 3966, ISO 7194); this \
        page integrates what you give it.",
];

const SUMMARY: &str =
    "Flow, mean velocity and the momentum-flux and kinetic-energy factors from a traverse or a profile law.";
const POINTS_HELP: &str = "One point per entry, separated by ';' or new lines: r/R (0 at the centre, 1 at the wall) \
    then the velocity, with or without a unit (e.g. '0.5 2.4 m/s'), from 0 to 100 m/s. Points at the same r/R are \
    averaged. The profile is closed to the wall with the power-law wall zone below (a 0 typed at r/R = 1 is the \
    no-slip condition and is treated the same way).";
const D_HELP: &str = "Inside diameter at the traverse section.";
// The ISO 3966 / ISO 7194 range of m is quoted from memory.
const M_WALL_HELP: &str = "The traverse is closed from its outermost point to the wall with a power law, as the \
    velocity-area methods of ISO 3966 and ISO 7194 do: m about 4 for rough walls to 10 for smooth ones. Empty \
    means 7.";
const U_MAX_HELP: &str = "Peak velocity on the axis, from 1 mm/s to 100 m/s.";
const N_POWER_HELP: &str = "About 6 to 10 for turbulent pipe flow; 7 is the usual default (common practice).";

pub fn spec() -> CalculatorSpec {
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FLOW_AND_TANKS,
        summary: SUMMARY,
        fields: vec![
            quantity(
                "d",
                "Pipe inside diameter",
                Q::Length,
                "mm",
                "in",
                "610 mm",
                Limits::closed(1e-3, MAX_SIZE_M),
                D_HELP,
            ),
            choice(
                "shape",
                "Profile",
                SHAPES,
                "traverse",
                "A measured traverse, or an assumed profile.",
            ),
            FieldSpec {
                key: "points",
                label: "Traverse points",
                kind: FieldKind::Text,
                si_unit: "m/s",
                us_unit: "ft/s",
                demo: "0 2.62; 0.2 2.58; 0.4 2.49; 0.6 2.35; 0.8 2.12; 0.9 1.93; 0.95 1.74",
                limits: None,
                optional: true,
                help: POINTS_HELP,
                visible_when: Some(("shape", &["traverse"])),
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["traverse"])),
                ..quantity(
                    "m_wall",
                    "Wall-zone exponent m in u ∝ (1 − r/R)^(1/m)",
                    Q::Ratio,
                    "-",
                    "-",
                    "7",
                    Limits::closed(4.0, 10.0),
                    M_WALL_HELP,
                )
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["power_law", "laminar"])),
                ..quantity(
                    "u_max",
                    "Centre-line velocity",
                    Q::Velocity,
                    "m/s",
                    "ft/s",
                    "2.6 m/s",
                    Limits::closed(MIN_PEAK_VELOCITY, MAX_VELOCITY),
                    U_MAX_HELP,
                )
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["power_law"])),
                ..quantity(
                    "n_power",
                    "Power-law exponent n in u = U(1 − r/R)^(1/n)",
                    Q::Ratio,
                    "-",
                    "-",
                    "7",
                    Limits::closed(1.0, 20.0),
                    N_POWER_HELP,
                )
            },
        ],
        outputs: vec![
            OutputSpec::headline("flow", "Volumetric flow", Q::VolumeFlow),
            OutputSpec::headline("v_mean", "Mean velocity", Q::Velocity),
            OutputSpec::headline("beta", "Momentum-flux factor β", Q::Ratio),
            OutputSpec::headline("alpha", "Kinetic-energy factor α", Q::Ratio),
            OutputSpec::listed("mean_over_peak", "Mean ÷ peak velocity", Q::Ratio),
        ],
        cautions: CAUTIONS.to_vec(),
    }
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let inputs = model::read(values, report.system())?;
    report::write(&model::solve(&inputs)?, report);
    Ok(())
}

#[cfg(test)]
pub(crate) mod tests {
    use super::model::{area_means, parse_points};
    use super::*;
    use crate::calculators::common;
    use crate::catalog::{Shape, Solution};
    use crate::{quadrature, velocity_profile};

    /// Whether a solution shows only finite numbers and agreeing checks: outputs,
    /// table cells (no NaN, inf or "—"), plot points, diagram shapes; no defects.
    pub(crate) fn clean(s: &Solution) -> Result<(), String> {
        if !s.defects.is_empty() {
            return Err(format!("defects {:?}", s.defects));
        }
        if let Some(c) = s.checks.iter().find(|c| !c.agrees()) {
            return Err(format!(
                "check '{}' disagrees: {} against {}",
                c.label, c.value, c.reference
            ));
        }
        if let Some(o) = s.outputs.iter().find(|o| !o.si.is_finite()) {
            return Err(format!("output {} is {}", o.key, o.si));
        }
        for t in &s.tables {
            for cell in t.rows.iter().flatten() {
                let lower = cell.to_lowercase();
                if lower.contains("nan") || lower.contains("inf") || cell.contains('—') {
                    return Err(format!("table '{}' shows '{cell}'", t.title));
                }
            }
        }
        for p in &s.plots {
            if !p
                .series
                .iter()
                .flat_map(|s| &s.points)
                .flatten()
                .chain(p.markers.iter().flat_map(|m| &m.at))
                .all(|x| x.is_finite())
            {
                return Err(format!("plot '{}' has a non-finite point", p.title));
            }
        }
        for d in &s.diagrams {
            let finite = d.bounds.iter().all(|x| x.is_finite())
                && d.shapes.iter().all(|shape| {
                    common::shape_points(shape).iter().flatten().all(|x| x.is_finite())
                        && !matches!(shape, Shape::Circle { radius, .. } if !radius.is_finite())
                });
            if !finite {
                return Err(format!("diagram '{}' has a non-finite shape", d.title));
            }
        }
        Ok(())
    }

    #[test]
    fn the_profile_carries_its_beta_to_each_fitting_page() {
        // Issue 12 §1: one link per fitting page; the fitting reads the carried β
        // and α and says where they came from.
        let s = crate::calculators::testing::solved(super::KEY, &[("shape", "power_law"), ("n_power", "7")]);
        let beta = s.output("beta").expect("β").si;
        assert_eq!(s.carry_over.len(), crate::calculators::common::PROFILE_TARGETS.len());
        for carry in &s.carry_over {
            let pairs: Vec<(&str, &str)> = carry.inputs.iter().map(|(k, v)| (*k, v.as_str())).collect();
            let fitting = crate::calculators::testing::solved(carry.calculator, &pairs);
            let basis = fitting.tables.iter().find(|t| t.key == "basis").expect("basis table");
            assert!(
                basis
                    .rows
                    .iter()
                    .any(|r| r[1].contains("β from the velocity-profile page")),
                "{}: {basis:?}",
                carry.calculator
            );
            let ledger = fitting.tables.iter().find(|t| t.key == "ledger").expect("ledger");
            let shown = format!(
                "β = {}",
                crate::calculators::common::trimmed(crate::units::format_significant(beta, 4))
            );
            assert!(
                ledger.rows.iter().any(|r| r[0].contains(&shown)),
                "{}: {ledger:?}",
                carry.calculator
            );
        }
    }

    #[test]
    fn extreme_accepted_inputs_show_finite_numbers() {
        let sets: &[&[(&str, &str)]] = &[
            &[("d", "1 mm"), ("points", "0 100; 0.999999 100")],
            &[("d", "10 m"), ("points", "0 0.001; 0.5 0; 0.9 0")],
            &[("d", "10 m"), ("points", "0 100; 1e-12 0.001")],
            &[("points", "0 1; 0.3 100; 0.6 0.001; 1 0"), ("m_wall", "4")],
            &[("points", "0.999 5; 1 5"), ("m_wall", "10")],
            &[("shape", "power_law"), ("u_max", "0.001 m/s"), ("n_power", "1")],
            &[
                ("shape", "power_law"),
                ("u_max", "100 m/s"),
                ("n_power", "20"),
                ("d", "10 m"),
            ],
            &[("shape", "laminar"), ("u_max", "0.001 m/s"), ("d", "1 mm")],
        ];
        for pairs in sets {
            let s = crate::calculators::testing::solved(KEY, pairs);
            clean(&s).unwrap_or_else(|e| panic!("{pairs:?}: {e}"));
        }
    }
    use approx::assert_relative_eq;

    #[test]
    fn linear_segments_integrate_exactly() {
        // Derived from the definition: u = U(1 − s) (a cone) has mean U/3 over the area
        // (∫(1−s)2s ds = 1/3), mean of u² = U²/6, of u³ = U³/10.
        let [m1, m2, m3] = area_means(&[(0.0, 1.0), (1.0, 0.0)]);
        assert_relative_eq!(m1, 1.0 / 3.0, max_relative = 1e-12);
        assert_relative_eq!(m2, 1.0 / 6.0, max_relative = 1e-12);
        assert_relative_eq!(m3, 1.0 / 10.0, max_relative = 1e-12);
    }

    #[test]
    fn bad_rows_name_the_point() {
        let err = parse_points("0 2.0; 1.5 1.0", "m/s").unwrap_err();
        assert!(err.to_string().contains("point 2"), "{err}");
        let err = parse_points("0 2.0; 0.5 5 psi", "m/s").unwrap_err();
        assert!(err.to_string().contains("point 2, velocity"), "{err}");
    }

    fn outcome(pairs: &[(&str, &str)]) -> crate::Outcome {
        crate::calculators::testing::outcome(super::KEY, pairs)
    }

    #[test]
    fn wall_zone_closure_of_the_demo() {
        // The reviewer's figures (issue 8, item 1.5), recomputed with scipy==1.17.1,
        // scipy.integrate.quad over each segment of the demo traverse: 2222.4 m³/h
        // closed with a straight line to the wall, 2289.8 m³/h with a 1/7 wall zone.
        let s = outcome(&[]).result.expect("solves");
        assert_relative_eq!(
            s.output("flow").unwrap().si * 3600.0,
            2289.8150952470055,
            max_relative = 1e-9
        );
        assert_relative_eq!(s.output("beta").unwrap().si, 1.0204897208408683, max_relative = 1e-9);
        assert!(s.defects.is_empty() && s.checks.iter().all(|c| c.agrees()), "{s:?}");
    }

    #[test]
    fn wall_zone_closed_form_matches_quadrature() {
        for (s_last, u_last, m) in [(0.0, 1.0, 7.0), (0.9, 2.5, 4.0), (0.99, 1.0, 10.0)] {
            let closed = velocity_profile::wall_zone_means(s_last, u_last, m);
            for (power, closed) in (1..=3).zip(closed) {
                let numeric = quadrature::tanh_sinh(s_last, 1.0, 1.0 / 64.0, |from_a, from_wall| {
                    (u_last * (from_wall / (1.0 - s_last)).powf(1.0 / m)).powi(power) * 2.0 * (s_last + from_a)
                });
                assert_relative_eq!(closed, numeric, max_relative = 1e-11);
            }
        }
    }

    #[test]
    fn tiny_and_zero_velocities_are_refused_or_finite() {
        let field = |pairs: &[(&str, &str)]| match outcome(pairs).result {
            Err(crate::SolveError::Fields(errors)) => errors[0].field.clone(),
            other => panic!("expected a field error, got {other:?}"),
        };
        assert_eq!(field(&[("shape", "laminar"), ("u_max", "0")]), "u_max");
        assert_eq!(field(&[("points", "0 1e-300; 0.5 0")]), "points");
        assert_eq!(field(&[("points", "0 2; 0.5 NaN")]), "points");
        let s = outcome(&[("points", "0 0.001; 1e-9 0")]).result.expect("solves");
        assert!(s.defects.is_empty(), "{:?}", s.defects);
    }
}
