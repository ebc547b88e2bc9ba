//! Pipe bend: the force an anchor or thrust block must supply to hold a bend.
//!
//! # Method
//! A control volume is drawn around the fluid in the bend, cutting the pipe at the
//! inlet (1) and outlet (2) faces. With x along the inlet flow and the bend turning
//! through θ in its plane, the linear-momentum balance ([`crate::engine`]) gives the
//! force the supports exert on the bend,
//!
//! R = p₁A₁n₁ + p₂A₂n₂ + ṁ(β₂V₂ − β₁V₁) − W − W_f,
//!
//! with n the outward normals, p gauge pressures, W the contained fluid's weight and
//! W_f any given weight of the fitting. The thrust on the supports is T = −R. The
//! pressure known at one face (`p_known`: the inlet, the default and what old links
//! mean; the outlet, `p2`; or the outlet open to atmosphere, 0 gauge) gives the other
//! by the energy balance with the bend's loss coefficient K on the inlet velocity:
//! p₁ + α₁ρV₁²/2 = p₂ + α₂ρV₂²/2 + ρg(z₂ − z₁) + K·ρV₁²/2.
//!
//! # Velocity profile, weights, gravity
//! β and α of each face come from [`common::profile_from`] (uniform by default;
//! fully developed laminar 4/3 and 2; a power law from
//! [`crate::velocity_profile::power_law`]; typed; or carried from the
//! velocity-profile page), and the ledger shows the β each momentum line used. The
//! weights of the fluid and of the fitting enter unless `weights=neglected` (to
//! reproduce a case that leaves them out; gravity still sets the elevation term).
//! Gravity is standard unless `g_local` is typed. Çengel & Cimbala's reducing elbow
//! (β = 1.03, outlet to atmosphere, weights neglected, g = 9.81 m/s²) gives
//! p₁ = 202.2 kPa and R = (−2053, 144) N, as the book does.
//!
//! For an equal-size bend at rest the thrust reduces to the static formula
//! T = 2pA·sin(θ/2), directed along the bisector, away from the bend's centre
//! (e.g. AWWA Manual M11, *Steel Pipe*, chapter on thrust restraint; the ductile-iron
//! pipe industry's thrust-restraint design guides).
//!
//! # Checks
//! Recorded with [`Report::check`], each by a path that does not use the engine:
//! the pressure that was not known by the energy line above; the x and y thrust by
//! the closed form T = (p₁A₁ + β₁ṁV₁)·e₁ − (p₂A₂ + β₂ṁV₂)·e₂ + (W + W_f)·ĝ with
//! those pressures (areas on the chosen basis, momentum on the bores); and for an
//! equal-size horizontal bend at rest, the static formula 2pA·sin(θ/2).
//!
//! # Area basis
//! The bore (`joint=flanged` or `welded`, the default flanged) is for joints that
//! seal on it: welded, flanged or fused. Push-on and mechanical joints, restrained
//! or not (`joint=push_on`, `mechanical`, `restrained`), seal on the spigot's
//! outside, so the pressure acts out to the outside diameter of the sealing joint
//! (`od` and `od2`): −p·(A_OD − A)·n is added at each face
//! as a named force, as on the reducer page. 12 in ductile iron (OD 13.20 in, bore
//! 12.46 in), 150 psi, 90°: 29,030 lbf on the OD, 25,866 lbf on the bore.
//!
//! # Carried to the thrust-restraint page
//! A vertical bend carries its resultant and its angle above the horizontal; a
//! horizontal bend carries its in-plane thrust only, since the fluid's weight rests
//! on the bedding, not on the block.
//!
//! # Code
//! [`model::read`] reads the values once into typed inputs (uom quantities),
//! [`model::solve`] builds and balances the control volume, [`report::write`]
//! reports from the solved model and [`diagram::diagram`] draws it.
//!
//! # Assumptions
//! Incompressible, steady flow; uniform pressure over each face (the velocity may
//! vary over it: β and α); pressure area on
//! the chosen basis; the fluid inside follows the centre-line arc
//! (volume A·R·θ for equal sizes, mean area for reducing bends).

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::restraint::Plane;
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};

pub mod diagram;
pub mod model;
pub mod report;

pub const KEY: &str = "bend";
/// The page title.
pub const TITLE: &str = "Anchor force at a pipe bend";

const PLANE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: Plane::Horizontal.key(),
        label: "Horizontal (plan view)",
    },
    ChoiceOption {
        key: Plane::Sag.key(),
        label: "Vertical, turning upward (a sag)",
    },
    ChoiceOption {
        key: Plane::Crest.key(),
        label: "Vertical, turning downward (a crest)",
    },
];

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity(
            "angle",
            "Deflection angle",
            Q::Angle,
            "deg",
            "deg",
            "45 deg",
            Limits::closed(crate::restraint::MIN_ANGLE, PI),
            "How far the flow turns, from 0.1 to 180 degrees (a return bend).",
        ),
        quantity(
            "d",
            "Inlet inside diameter",
            Q::Length,
            "mm",
            "in",
            "310 mm",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            "Inside diameter of the pipe entering the bend.",
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "d2",
                "Outlet inside diameter",
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Leave empty for an equal-size bend; give it for a reducing bend.",
            )
        },
        FieldSpec {
            visible_when: common::P_AT_INLET,
            ..quantity(
                "p",
                "Gauge pressure at the inlet",
                Q::Pressure,
                "kPa",
                "psi",
                "10 bar",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "The design pressure: the highest the line will see, including test pressure and surge.",
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
        FieldSpec {
            optional: true,
            ..quantity(
                "k",
                "Loss coefficient K",
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(0.0, 50.0),
                "Head loss K·V²/2g on the inlet velocity; empty means no loss. Name the method your K comes from \
                    (Crane, Idelchik, ...).",
            )
        },
        FieldSpec {
            optional: true,
            ..choice(
                "joint",
                "Joints at the bend (thrust area)",
                crate::restraint::Joint::OPTIONS,
                "flanged",
                crate::restraint::JOINT_HELP,
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
                "330 mm",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Outside diameter of the pipe at the inlet joint (the sealing diameter of a push-on or mechanical \
                    joint).",
            )
        },
        FieldSpec {
            visible_when: Some(("joint", crate::restraint::OD_JOINTS)),
            optional: true,
            ..quantity(
                "od2",
                "Outlet pipe outside diameter",
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Empty: the inlet's outside diameter (an equal-size bend).",
            )
        },
        choice(
            "plane",
            "Plane of the bend",
            PLANE_OPTIONS,
            "horizontal",
            "In a horizontal bend the fluid's weight acts out of the plane; in a vertical bend it acts in the \
                plane.",
        ),
        common::weights_field(),
        FieldSpec {
            optional: true,
            ..quantity(
                "r_bend",
                "Centre-line bend radius",
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(MIN_SIZE_M, 100.0),
                "Sets the volume of fluid inside (its weight) and the drawing; empty means 1.5 × the inlet \
                    diameter.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "w_fitting",
                "Weight of the fitting and carried pipe",
                Q::Force,
                "kN",
                "lbf",
                "",
                Limits::closed(0.0, 1e8),
                "Optional dead weight the restraint also carries (vertical bends).",
            )
        },
    ]);
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "Thrust on a horizontal or vertical bend, equal or reducing, from pressure, flow and fluid weight.",
        fields,
        outputs: vec![
            OutputSpec::headline("thrust", "Thrust on the supports (resultant)", Q::Force),
            OutputSpec::headline("thrust_in_plane", "Thrust in the plane of the bend", Q::Force),
            OutputSpec::listed("thrust_x", "Thrust along the inlet flow (x)", Q::Force),
            OutputSpec::listed("thrust_y", "Thrust across it, in the plane (y)", Q::Force),
            OutputSpec::listed("thrust_z", "Thrust normal to the plane (z, up in plan view)", Q::Force),
            OutputSpec::listed(
                "thrust_angle",
                "Direction of the in-plane thrust, from the inlet flow direction",
                Q::Angle,
            ),
            OutputSpec::listed("p_in", "Gauge pressure at the inlet", Q::Pressure),
            OutputSpec::listed("p_out", "Gauge pressure at the outlet", Q::Pressure),
            OutputSpec::listed("v_in", "Mean velocity at the inlet", Q::Velocity),
            OutputSpec::listed("v_out", "Mean velocity at the outlet", Q::Velocity),
            OutputSpec::listed("flow", "Volumetric flow", Q::VolumeFlow),
            OutputSpec::listed("mass_flow", "Mass flow", Q::MassFlow),
            OutputSpec::listed("momentum_share", "Momentum flux ÷ pressure force", Q::Ratio),
            OutputSpec::listed("fluid_weight", "Weight of the fluid inside", Q::Force),
            OutputSpec::listed("density", "Fluid density", Q::Density),
            OutputSpec::listed("viscosity", "Fluid viscosity", Q::DynamicViscosity),
        ],
        cautions: vec![
            "The inside-diameter basis is for welded, flanged or fused joints only. Push-on and mechanical \
                    joints, restrained or not, seal on the spigot's outside: choose their joint (the outside \
                    diameter) for them.",
            "In a vertical bend where the line turns downward (a crest) the thrust points up and out: a \
                    gravity block must outweigh it. Where the line turns upward (a sag) it points down into the \
                    ground.",
        ],
    }
}

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, model::read, model::solve, report::write)
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn still_equal_bend_matches_static_formula() {
        // Derived from the definition: T = 2pA sin(θ/2) with no flow.
        let s = solved(&[
            ("angle", "90 deg"),
            ("d", "300 mm"),
            ("p", "1 bar"),
            ("flow_given", "q"),
            ("q", "0"),
            ("fluid", "water"),
            ("t", "20 degC"),
            ("plane", "horizontal"),
        ]);
        let area = std::f64::consts::PI * 0.3 * 0.3 / 4.0;
        let expected = 2.0 * 1e5 * area * (std::f64::consts::FRAC_PI_4).sin();
        assert_relative_eq!(s.output("thrust_in_plane").unwrap().si, expected, max_relative = 1e-12);
        // Along the bisector, away from the centre: 45° below the inlet direction...
        // the bend turns to +y, so the thrust points to −45°.
        assert_relative_eq!(
            s.output("thrust_angle").unwrap().si,
            -std::f64::consts::FRAC_PI_4,
            max_relative = 1e-9
        );
    }

    #[test]
    fn carried_thrust_opens_the_restraint_page_with_the_same_force() {
        let request = crate::catalog::demo_request(&super::spec(), &[("plane", "vertical_crest")]);
        let s = crate::solve(super::KEY, &request).result.expect("solves");
        let thrust = s.output("thrust").unwrap().si;
        let (block, inputs) = crate::calculators::testing::carried(&s);
        let carried = block.output("thrust").expect("thrust reported").si;
        assert_relative_eq!(carried, thrust, max_relative = 1e-3);
        // A crest pushes up: the carried plane says so.
        assert!(
            inputs.iter().any(|(k, v)| *k == "plane" && v == "vertical_crest"),
            "{inputs:?}"
        );
    }

    #[test]
    fn a_horizontal_bend_carries_its_in_plane_thrust_to_a_horizontal_block() {
        // Issue 8: 1200 mm, 90°, 5 bar. The fluid's weight (out of the plane) once
        // tipped the carried force below −1° and opened a sag block.
        let request = crate::catalog::demo_request(
            &super::spec(),
            &[
                ("d", "1200 mm"),
                ("angle", "90 deg"),
                ("p", "5 bar"),
                ("plane", "horizontal"),
            ],
        );
        let s = crate::solve(super::KEY, &request).result.expect("solves");
        assert!(
            s.output("thrust_z").unwrap().si.abs() > 1e3,
            "the fluid weight is there"
        );
        let in_plane = s.output("thrust_in_plane").unwrap().si;
        let (block, inputs) = crate::calculators::testing::carried(&s);
        let get = |key: &str| inputs.iter().find(|(k, _)| *k == key).map(|(_, v)| v.clone());
        assert_eq!(get("plane").as_deref(), Some("horizontal"));
        assert_relative_eq!(block.output("thrust").unwrap().si, in_plane, max_relative = 1e-4);
        assert_relative_eq!(block.output("thrust_v").unwrap().si, 0.0);
        // No design pressure of the restraint page's own is shown for a carried force.
        assert!(block.output("p_design").is_none());
    }

    #[test]
    fn the_outside_diameter_basis_adds_the_annulus_at_both_ends() {
        // Derived from the definition: at rest the thrust is 2·p·A_OD·sin(θ/2).
        let s = solved(&[
            ("angle", "60 deg"),
            ("d", "300 mm"),
            ("joint", "push_on"),
            ("od", "326 mm"),
            ("p", "10 bar"),
            ("flow_given", "q"),
            ("q", "0"),
            ("fluid", "water"),
            ("t", "20 degC"),
            ("plane", "horizontal"),
        ]);
        let area = std::f64::consts::PI * 0.326 * 0.326 / 4.0;
        let expected = 2.0 * 1e6 * area * (std::f64::consts::PI / 6.0).sin();
        assert_relative_eq!(s.output("thrust_in_plane").unwrap().si, expected, max_relative = 1e-12);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    #[test]
    fn the_outlet_pressure_known_gives_back_the_inlet_pressure() {
        // A second solve from the other end of the same energy line: the outlet
        // pressure found from the inlet's, given back as known, must return it.
        let base = [
            ("d", "300 mm"),
            ("d2", "200 mm"),
            ("plane", "vertical_crest"),
            ("k", "0.3"),
            ("profile_in", "power_law"),
            ("n_power_in", "7"),
            ("profile_out", "laminar"),
        ];
        let forward = solved(&[&base[..], &[("p", "6 bar")]].concat());
        let p_out = forward.output("p_out").unwrap().si;
        let p_out_text = format!("{p_out} Pa");
        let back = solved(&[&base[..], &[("p_known", "outlet"), ("p2", p_out_text.as_str())]].concat());
        assert_relative_eq!(back.output("p_in").unwrap().si, 6e5, max_relative = 1e-9);
        assert_relative_eq!(
            back.output("thrust").unwrap().si,
            forward.output("thrust").unwrap().si,
            max_relative = 1e-9
        );
        assert!(back.checks.iter().all(|c| c.agrees()), "{:?}", back.checks);
    }

    #[test]
    fn an_old_link_without_the_new_keys_reads_as_before() {
        // Issue 12: old links typed the inlet pressure; no p_known, no profile, no
        // weights choice: the inlet is known, the profile uniform, the weights in.
        let mut request = super::super::testing::request(super::KEY, &[("p", "7 bar"), ("plane", "vertical_sag")]);
        for key in ["p_known", "profile_in", "profile_out", "weights", "p2"] {
            request.inputs.remove(key);
        }
        let s = crate::solve(super::KEY, &request).result.expect("an old link solves");
        assert_relative_eq!(s.output("p_in").unwrap().si, 7e5, max_relative = 1e-12);
        assert!(s.output("fluid_weight").unwrap().si > 0.0);
        let basis = s.tables.iter().find(|t| t.key == "basis").expect("basis table");
        assert!(
            basis.rows.iter().any(|r| r[1].contains("known at the inlet")),
            "{basis:?}"
        );
        assert!(basis.rows.iter().any(|r| r[1].contains("(uniform)")), "{basis:?}");
    }

    #[test]
    fn neglected_weights_take_exactly_the_weights_out() {
        let with = solved(&[("plane", "vertical_sag"), ("w_fitting", "2 kN")]);
        let without = solved(&[
            ("plane", "vertical_sag"),
            ("w_fitting", "2 kN"),
            ("weights", "neglected"),
        ]);
        let weight = with.output("fluid_weight").unwrap().si + 2e3;
        // The weights act down (−y): the thrust's y component loses exactly them.
        assert_relative_eq!(
            with.output("thrust_y").unwrap().si - without.output("thrust_y").unwrap().si,
            -weight,
            max_relative = 1e-9
        );
        assert_relative_eq!(
            with.output("p_out").unwrap().si,
            without.output("p_out").unwrap().si,
            max_relative = 1e-12
        );
    }

    #[test]
    fn the_ledger_names_the_beta_it_used() {
        let s = solved(&[("profile_in", "typed"), ("beta_in", "1.05"), ("alpha_in", "1.1")]);
        let ledger = s.tables.iter().find(|t| t.key == "ledger").expect("ledger");
        assert!(
            ledger
                .rows
                .iter()
                .any(|r| r[0].starts_with("inlet") && r[0].ends_with("β = 1.05")),
            "{ledger:?}"
        );
        assert!(
            ledger
                .rows
                .iter()
                .any(|r| r[0].starts_with("outlet") && r[0].ends_with("±ṁβV")),
            "{ledger:?}"
        );
    }

    #[test]
    fn errors_name_the_field() {
        let request = crate::catalog::demo_request(&super::spec(), &[("d", "5 psi")]);
        let outcome = crate::solve(super::KEY, &request);
        match outcome.result {
            Err(crate::SolveError::Fields(errors)) => assert_eq!(errors[0].field, "d"),
            other => panic!("expected a field error, got {other:?}"),
        }
    }
}
