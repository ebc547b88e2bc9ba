//! Reducer or expander (concentric): the axial thrust the restraint must carry.
//!
//! # Method
//! A control volume is drawn around the fluid in the fitting, cut at the inlet face
//! (1) and the outlet face (2). With x along the flow, the linear-momentum balance
//! ([`crate::engine`]) gives the force the supports exert,
//!
//! R = p₁A₁n₁ + p₂A₂n₂ + ṁ(β₂V₂ − β₁V₁) − W, and the thrust T = −R,
//!
//! whose axial part is T_x = p₁A₁ − p₂A₂ + ṁ(β₁V₁ − β₂V₂). The pressure known at one
//! face (`p_known`: the inlet, the default and what old links mean; the outlet; or
//! the outlet open to atmosphere) gives the other by the energy balance with the
//! fitting's loss,
//!
//! p₂ = p₁ + ρ(α₁V₁² − α₂V₂²)/2 − ρg(z₂ − z₁) − K·ρV_ref²/2,
//!
//! with K on the velocity of the smaller pipe (or a named one) and taken from:
//! - Crane TP-410, *Flow of Fluids Through Valves, Fittings, and Pipe*, formulas for
//!   conical contractions and expansions by included angle θ and diameter ratio
//!   β = d_small/d_large (K on the small pipe): contraction 0.8·sin(θ/2)(1 − β²) for
//!   θ < 45°, else 0.5·(1 − β²)·√sin(θ/2); expansion 2.6·sin(θ/2)(1 − β²)² for
//!   θ < 45°, else (1 − β²)²;
//! - Borda–Carnot for a sudden expansion, K = (1 − A₁/A₂)² on the inlet velocity,
//!   which follows from the momentum balance with the inlet pressure acting on the
//!   annular step (White, *Fluid Mechanics*, minor losses; Idelchik, *Handbook of
//!   Hydraulic Resistance*, sudden expansion); with it the thrust is exactly
//!   p₁(A₂ − A₁), towards the small end;
//! - a K the user gives, naming its source.
//!
//! With no flow the thrust reduces to the static formula T = p(A₁ − A₂) of the
//! thrust-restraint guides (DIPRA, *Thrust Restraint Design for Ductile Iron Pipe*;
//! AWWA Manual M41).
//!
//! β and α of each face are uniform unless chosen otherwise (fully developed
//! laminar, a power law, typed, or carried from the velocity-profile page; see
//! [`common::profile_from`]); the fluid's weight enters unless `weights=neglected`;
//! gravity is standard unless `g_local` is typed.
//!
//! # Checks
//! Recorded with [`Report::check`], each without the engine: the pressure that was
//! not known by the energy line above; the axial thrust by the closed form
//! p₁A₁ − p₂A₂ + ṁ(β₁V₁ − β₂V₂) + W·(ĝ·x̂) on the area basis; at rest in a
//! horizontal fitting, the static formula p(A₁ − A₂); with Borda–Carnot on the bores
//! and uniform faces, −p₁(A₂ − A₁).
//!
//! # Area basis
//! The joint (`joint`, empty: flanged) sets the area. For push-on and mechanical
//! joints, restrained or not (they seal on the spigot's outside; `od`, `od2`), the
//! pressure at each face also acts on the
//! wall annulus out to the outside diameter: −p·(A_OD − A)·n is added to the engine
//! as a named force per face, and the static formula uses the outside areas.
//!
//! # Code
//! [`read`] reads the values once into typed [`Inputs`] (uom quantities), [`solve`]
//! is the pure model (control volume, balances, joint annulus forces) returning a
//! [`Solved`], from which [`report::write`] and [`diagram::diagram`] build the report.
//!
//! # Assumptions
//! Incompressible, steady flow; uniform pressure over each face; momentum on the
//! bores; the fluid inside is a cone frustum of the included angle.
//! A horizontal fitting's fluid weight acts out of the drawing plane (z); a vertical
//! one's along the axis.

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};

pub mod diagram;
pub mod model;
pub mod report;

pub use model::{read, solve, Inputs, Solved};

pub const KEY: &str = "reducer";
/// The page title.
pub const TITLE: &str = "Thrust at a reducer or expander";

pub(crate) const LOSS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "cone_formula",
        label: "Gradual contraction or expansion, cone-angle formula",
    },
    ChoiceOption {
        key: "borda",
        label: "Sudden expansion, Borda–Carnot (1 − A₁/A₂)²",
    },
    ChoiceOption {
        key: "k",
        label: "Given loss coefficient K",
    },
    ChoiceOption {
        key: "none",
        label: "No loss (Bernoulli)",
    },
];

pub(crate) const K_REF_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "small",
        label: "Velocity in the smaller pipe",
    },
    ChoiceOption {
        key: "inlet",
        label: "Velocity at the inlet",
    },
    ChoiceOption {
        key: "outlet",
        label: "Velocity at the outlet",
    },
];

pub(crate) const ORIENTATION_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "horizontal",
        label: "Horizontal (plan view)",
    },
    ChoiceOption {
        key: "upward",
        label: "Vertical, flow upward",
    },
    ChoiceOption {
        key: "downward",
        label: "Vertical, flow downward",
    },
];

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity(
            "d",
            "Inlet inside diameter",
            Q::Length,
            "mm",
            "in",
            "310 mm",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            "Bore of the pipe the flow comes from.",
        ),
        quantity(
            "d2",
            "Outlet inside diameter",
            Q::Length,
            "mm",
            "in",
            "250 mm",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            "Smaller than the inlet for a reducer, larger for an expander.",
        ),
        FieldSpec {
            visible_when: common::P_AT_INLET,
            ..quantity(
                "p",
                "Gauge pressure at the inlet",
                Q::Pressure,
                "bar",
                "psi",
                "10 bar",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "The design pressure: the highest the line will see, including test pressure and surge. Gauge, so \
                    not below 0.",
            )
        },
    ];
    fields.extend(common::pressure_known_fields());
    fields.extend(common::flow_given_fields("850 m3/h"));
    fields.extend(common::profile_fields(&common::INLET_PROFILE));
    fields.extend(common::profile_fields(&common::OUTLET_PROFILE));
    fields.extend(common::fluid_fields("25 degC"));
    fields.push(common::gravity_field());
    fields.extend([
        quantity(
            "cone_angle",
            "Included cone angle",
            Q::Angle,
            "deg",
            "deg",
            "30 deg",
            Limits::closed(crate::restraint::MIN_ANGLE, PI),
            "Full angle of the cone, from 0.1 up to 180 degrees (a sudden step). Sets the length of the \
                    fitting and the cone-angle loss.",
        ),
        choice(
            "loss",
            "Loss model",
            LOSS_OPTIONS,
            "cone_formula",
            "Where the fitting's head loss comes from; it lowers the outlet pressure and so raises the thrust \
                    of a reducer.",
        ),
        FieldSpec {
            visible_when: Some(("loss", &["k"])),
            ..quantity(
                "k",
                "Loss coefficient K",
                Q::Ratio,
                "-",
                "-",
                "0.05",
                Limits::closed(0.0, 50.0),
                "Head loss K·V²/2g on the velocity chosen below; name the method your K comes from.",
            )
        },
        FieldSpec {
            visible_when: Some(("loss", &["k"])),
            ..choice(
                "k_ref",
                "K refers to",
                K_REF_OPTIONS,
                "small",
                "Most tables give K on the velocity in the smaller pipe.",
            )
        },
        choice(
            "flow_dir",
            "Direction of flow",
            ORIENTATION_OPTIONS,
            "horizontal",
            "In a vertical fitting the fluid's weight acts along the axis and the outlet is higher or lower.",
        ),
        common::weights_field(),
        FieldSpec {
            optional: true,
            ..choice(
                "joint",
                "Joints at the fitting (thrust area)",
                crate::restraint::Joint::OPTIONS,
                "flanged",
                "Push-on and mechanical joints seal on the spigot's outside, restrained or not: the pressure \
                        then also acts on the wall annulus out to the outside diameter of the sealing joint. Only \
                        welded, flanged or fused joints take the bore. Empty means flanged (the bore).",
            )
        },
        FieldSpec {
            visible_when: Some(("joint", crate::restraint::OD_JOINTS)),
            ..quantity(
                "od",
                "Inlet pipe outside diameter",
                Q::Length,
                "mm",
                "in",
                "326 mm",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Outside diameter of the inlet pipe at its joint.",
            )
        },
        FieldSpec {
            visible_when: Some(("joint", crate::restraint::OD_JOINTS)),
            ..quantity(
                "od2",
                "Outlet pipe outside diameter",
                Q::Length,
                "mm",
                "in",
                "274 mm",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Outside diameter of the outlet pipe at its joint.",
            )
        },
    ]);
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "Axial thrust on a concentric reducer or expander, with the outlet pressure from the energy balance \
                and the fitting's loss.",
        fields,
        outputs: vec![
            OutputSpec::headline("thrust", "Axial thrust on the supports (magnitude)", Q::Force),
            OutputSpec::listed("thrust_axial", "Axial thrust, + along the flow, − against it", Q::Force),
            OutputSpec::listed(
                "thrust_resultant",
                "Resultant thrust, with the fluid's weight",
                Q::Force,
            ),
            OutputSpec::headline("p_out", "Gauge pressure at the outlet", Q::Pressure),
            OutputSpec::listed("p_in", "Gauge pressure at the inlet", Q::Pressure),
            OutputSpec::listed("k_used", "Loss coefficient used, on the reference velocity", Q::Ratio),
            OutputSpec::listed("head_loss", "Head loss in the fitting", Q::Length),
            OutputSpec::listed("v_in", "Mean velocity at the inlet", Q::Velocity),
            OutputSpec::listed("v_out", "Mean velocity at the outlet", Q::Velocity),
            OutputSpec::listed("flow", "Volumetric flow", Q::VolumeFlow),
            OutputSpec::listed("mass_flow", "Mass flow", Q::MassFlow),
            OutputSpec::listed("length", "Length of the cone", Q::Length),
            OutputSpec::listed("momentum_share", "Momentum flux ÷ pressure force", Q::Ratio),
            OutputSpec::listed("fluid_weight", "Weight of the fluid inside", Q::Force),
            OutputSpec::listed("density", "Fluid density", Q::Density),
        ],
        cautions: vec![
            "For push-on and mechanical joints choose that joint (the outside-diameter basis): using the bores \
                    there under-states the thrust by the wall's share, often 15 % or more.",
            "Loss coefficients of reducers differ between published methods (Idelchik, Rennels, Miller and others) \
                    by tens of per cent; the thrust is rarely sensitive to them, the outlet pressure more so.",
        ],
    }
}

/// The loss coefficient on the smaller pipe's velocity from Crane TP-410's conical
/// contraction and expansion formulas; `theta` is the included angle in radians.
pub fn crane_k_small(d_in: f64, d_out: f64, theta: f64) -> f64 {
    let beta = d_in.min(d_out) / d_in.max(d_out);
    let b2 = beta * beta;
    let s = (theta / 2.0).sin();
    let steep = theta >= PI / 4.0;
    if d_out < d_in {
        if steep {
            0.5 * (1.0 - b2) * s.sqrt()
        } else {
            0.8 * s * (1.0 - b2)
        }
    } else if steep {
        (1.0 - b2).powi(2)
    } else {
        2.6 * s * (1.0 - b2).powi(2)
    }
}

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, read, solve, report::write)
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn still_reducer_matches_static_formula() {
        // Derived from the definition: T = p(A1 − A2) with no flow.
        let s = solved(&[("q", "0"), ("p", "5 bar"), ("d", "400 mm"), ("d2", "200 mm")]);
        let expected = 5e5 * std::f64::consts::PI * (0.16 - 0.04) / 4.0;
        assert_relative_eq!(s.output("thrust_axial").unwrap().si, expected, max_relative = 1e-12);
        assert!(
            s.checks
                .iter()
                .any(|c| c.basis.starts_with("static formula") && c.agrees()),
            "{:?}",
            s.checks
        );
    }

    #[test]
    fn borda_carnot_expander_thrust_is_inlet_pressure_on_the_step() {
        // Derived from the definition: with K = (1 − A1/A2)², p2 − p1 = ρV2(V1 − V2),
        // and the thrust is −p1(A2 − A1) exactly, whatever the flow.
        let s = solved(&[
            ("d", "200 mm"),
            ("d2", "400 mm"),
            ("p", "3 bar"),
            ("q", "300 m3/h"),
            ("loss", "borda"),
        ]);
        let step = std::f64::consts::PI * (0.16 - 0.04) / 4.0;
        assert_relative_eq!(s.output("thrust_axial").unwrap().si, -3e5 * step, max_relative = 1e-9);
    }

    #[test]
    fn crane_k_matches_the_formulas_below_45_degrees_and_for_a_sudden_step() {
        use std::f64::consts::PI;
        let k = super::crane_k_small(0.3, 0.2, 30f64.to_radians());
        assert_relative_eq!(
            k,
            0.8 * (15f64.to_radians()).sin() * (1.0 - 4.0 / 9.0),
            max_relative = 1e-12
        );
        let k = super::crane_k_small(0.2, 0.3, PI);
        assert_relative_eq!(k, (1.0f64 - 4.0 / 9.0).powi(2), max_relative = 1e-12);
    }

    #[test]
    fn vertical_thrust_is_carried_with_its_direction() {
        for (orientation, plane) in [("upward", "vertical_crest"), ("downward", "vertical_sag")] {
            let s = solved(&[("flow_dir", orientation)]);
            let (block, inputs) = crate::calculators::testing::carried(&s);
            let field = |key: &str| inputs.iter().find(|(k, _)| *k == key).map(|(_, v)| v.clone());
            assert_eq!(field("plane").as_deref(), Some(plane));
            assert_relative_eq!(
                block.output("thrust").unwrap().si,
                s.output("thrust").unwrap().si,
                max_relative = 1e-4
            );
        }
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let field = |pairs: &[(&str, &str)]| match outcome(pairs).result {
            Err(crate::SolveError::Fields(errors)) => errors[0].field.clone(),
            other => panic!("expected a field error, got {other:?}"),
        };
        assert_eq!(field(&[("loss", "borda")]), "loss");
        assert_eq!(field(&[("d2", "0 mm")]), "d2");
        assert_eq!(field(&[("p", "-2 psi")]), "p");
        assert_eq!(field(&[("loss", "k"), ("k", "")]), "k");
    }

    #[test]
    fn demo_matches_the_method_note_worked_example() {
        // site/notes/reducer.md works the demo by hand: K = 0.0724, p2 = 992.5 kPa,
        // T = 26.36 kN downstream (static 26.39 kN, no longer an output).
        let s = solved(&[]);
        assert_relative_eq!(s.output("k_used").unwrap().si, 0.0724, max_relative = 1e-3);
        assert_relative_eq!(s.output("p_out").unwrap().si, 992.5e3, max_relative = 1e-4);
        assert_relative_eq!(s.output("thrust_axial").unwrap().si, 26.36e3, max_relative = 2e-4);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }
}
