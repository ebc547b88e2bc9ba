//! Free jet on a fixed flat plate, normal or inclined: the force on the plate and
//! the split of the flow along it.
//!
//! # Method
//! A round free jet of area A and speed V (from the nozzle diameter and one of the
//! jet velocity, the flow, or the head H or pressure p at the nozzle inlet with a
//! velocity coefficient, V = Cv·√(2gH) = Cv·√(2p/ρ)) strikes a fixed flat plate. θ is
//! the angle between the jet axis and the plate surface (90° = a plate normal to the
//! jet). The control volume surrounds the plate's wetted face; it cuts the jet (port
//! "jet") and the two sheets that leave along the plate, the forward one (port
//! "forward", the side the jet leans towards) and the back one (port "back").
//!
//! - Every port is open to the atmosphere: gauge pressure zero, so the pressure
//!   terms vanish and only momentum fluxes remain.
//! - Energy (Bernoulli along each branch, no friction, jet weight neglected): both
//!   sheets leave at the jet speed V.
//! - Momentum normal to the plate ([`crate::engine`]): the force on the plate is
//!   F_n = ṁ·V·sin θ = ρQV·sin θ, with ṁ = ρQ.
//! - Momentum along the plate: a frictionless plate exerts no force along its
//!   surface, so 0 = ṁ₁V − ṁ₂V − ṁV·cos θ. With mass, ṁ₁ + ṁ₂ = ṁ, this gives the
//!   split Q₁ = Q(1 + cos θ)/2 forward and Q₂ = Q(1 − cos θ)/2 back.
//!
//! The calculator does not write these results down: it finds the split by asking
//! the engine for the force along the plate at two trial splits (the force is linear
//! in the split) and taking the split at which it vanishes, then balances the final
//! control volume and reports the engine's force. The checks table compares the
//! normal force with ρQV·sin θ and the forward flow with Q(1 + cos θ)/2, written by
//! hand above. (The force along the plate is zero by the way the split is found, so
//! it is not shown as a check.) Force components that are rounding residue of the
//! jet's momentum flux (below 1e-12 of ρQV) are shown as 0. Sources: the jet-on-a-plate examples in White, *Fluid
//! Mechanics* (chapter 3), Munson et al., *Fundamentals of Fluid Mechanics* (chapter
//! 5), and the impact-of-jets chapter of hydraulics texts such as Bansal, *A Textbook
//! of Fluid Mechanics and Hydraulic Machines*.
//!
//! # Layout
//! [`read`] turns the validated values into typed [`Inputs`] once; [`model::solve`]
//! is the physics, a pure function of them; `report` writes outputs, checks,
//! warnings and tables from the solved [`model::Plate`], and `diagram` draws it.
//!
//! # Assumptions
//! Idealised free jet: steady, incompressible, uniform speed, no spreading, break-up,
//! air entrainment or friction; the plate is large enough to turn the whole jet
//! parallel to its surface; the jet's weight is neglected (the balance is written in
//! the plane of the jet and the plate normal); the sheets are drawn as a 2-D picture
//! of what is, for a round jet, a 3-D spread.

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, Limits, OutputSpec, Report, Values};
use crate::error::{FieldError, FieldErrors};
use crate::units::QuantityKind as Q;

use super::common::{self, quantity};

mod diagram;
pub mod model;
mod report;

use model::Inputs;

pub const KEY: &str = "jet-plate";
/// The page title.
pub const TITLE: &str = "Force of a water jet on a flat plate";

/// The smallest plate angle accepted: below about 1° the jet grazes the plate.
const MIN_ANGLE: f64 = PI / 180.0;

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![quantity(
        "plate_angle",
        "Angle between the jet and the plate",
        Q::Angle,
        "deg",
        "deg",
        "60 deg",
        Limits::closed(MIN_ANGLE, PI / 2.0),
        "Angle between the jet axis and the plate surface, 1 to 90 degrees; 90 degrees is a plate normal to \
                the jet.",
    )];
    fields.extend(common::jet_fields([
        "38 mm", "p", "30 m/s", "20 L/s", "45 m", "4.5 bar", "0.97",
    ]));
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary: "Force of a free jet on a fixed normal or inclined plate, and how the flow splits along the plate.",
        fields,
        outputs: vec![
            OutputSpec::headline("force_normal", "Force on the plate, normal to it", Q::Force),
            OutputSpec::listed("force_along_jet", "Component along the jet (x)", Q::Force),
            OutputSpec::listed("force_across_jet", "Component across the jet (y)", Q::Force),
            OutputSpec::headline("q_forward", "Flow along the plate, forward branch", Q::VolumeFlow),
            OutputSpec::headline("q_back", "Flow along the plate, back branch", Q::VolumeFlow),
            OutputSpec::listed("share_forward", "Forward share Q₁/Q", Q::Ratio),
            OutputSpec::listed("share_back", "Back share Q₂/Q", Q::Ratio),
            OutputSpec::listed("jet_velocity", "Jet velocity", Q::Velocity),
            OutputSpec::listed("jet_flow", "Jet flow", Q::VolumeFlow),
            OutputSpec::listed("mass_flow", "Jet mass flow", Q::MassFlow),
            OutputSpec::listed(
                "jet_momentum",
                "Jet momentum flux ρQV (force on a normal plate)",
                Q::Force,
            ),
            OutputSpec::listed(
                "stagnation_pressure",
                "Stagnation pressure at the impact point, ρV²/2",
                Q::Pressure,
            ),
            OutputSpec::listed("jet_power", "Jet kinetic-energy flux ρQV²/2", Q::Power),
            OutputSpec::listed("density", "Fluid density", Q::Density),
        ],
        cautions: vec![
            "Idealised jet: no spreading, break-up, air entrainment, friction or windage, and the jet's weight \
                    neglected. A jet that has travelled far from its nozzle spreads and breaks up and gives less \
                    force, but design the plate and its fixings for the full value.",
            "The plate must be large enough to turn the whole jet parallel to its surface. A small plate \
                    deflects less and takes less force; a plate with a lip or a dished face turns the jet back and \
                    takes more (up to twice ρQV; use the vane page).",
            "A high-pressure water jet injures people and cuts skin: keep people out of its path and guard \
                    deflectors and test rigs.",
            "Defer to the equipment manufacturer's ratings and to a licensed engineer for the plate, its \
                    supports and anchors.",
        ],
    }
}

/// Reads the page's validated values into typed inputs.
///
/// # Errors
/// A missing jet value, or a jet speed outside the range handled, named.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let plate_angle = values.typed("plate_angle")?;
    let fluid = common::fluid_from(values)?;
    let jet = common::jet_from(values, fluid.density)?;
    let jet_given = common::jet_given(values)?;
    Ok(Inputs {
        plate_angle,
        jet_given,
        jet,
        fluid,
    })
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, read, model::solve, report::write)
}

#[cfg(test)]
mod tests {
    use crate::error::FieldErrorKind;
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    const WATER_1000: &[(&str, &str)] = &[("fluid", "custom"), ("rho", "1000 kg/m3"), ("mu", "1 mPa.s")];

    #[test]
    fn keys_are_the_glossary_s_and_old_links_land_on_fields() {
        crate::calculators::testing::assert_glossary_keys(super::KEY);
    }

    #[test]
    fn split_and_force_match_the_closed_forms_at_every_angle() {
        // Derived from the definition: Q1 = Q(1 + cos θ)/2, F_n = ρQV sin θ.
        for deg in [1.0f64, 10.0, 30.0, 45.0, 60.0, 75.0, 90.0] {
            let angle = format!("{deg} deg");
            let mut pairs = vec![
                ("plate_angle", angle.as_str()),
                ("flow_given", "v"),
                ("v", "20 m/s"),
                ("d_jet", "50 mm"),
            ];
            pairs.extend_from_slice(WATER_1000);
            let s = solved(&pairs);
            let theta = deg.to_radians();
            let q = std::f64::consts::PI * 0.05 * 0.05 / 4.0 * 20.0;
            let out = |k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
            assert_relative_eq!(out("share_forward"), (1.0 + theta.cos()) / 2.0, max_relative = 1e-9);
            assert_relative_eq!(out("q_back"), q * (1.0 - theta.cos()) / 2.0, max_relative = 1e-7);
            assert_relative_eq!(
                out("force_normal"),
                1000.0 * q * 20.0 * theta.sin(),
                max_relative = 1e-9
            );
            assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
            if deg == 90.0 {
                // A normal plate takes no force across the jet: not 1e-16 of ρQV.
                assert_eq!(out("force_across_jet"), 0.0);
            }
            // Components: F_x = F_n sin θ (towards the plate), F_y = −F_n cos θ.
            assert_relative_eq!(
                out("force_along_jet"),
                out("force_normal") * theta.sin(),
                max_relative = 1e-9
            );
        }
    }

    #[test]
    fn head_and_pressure_bases_give_the_same_jet() {
        // V = Cv·√(2gH) and V = Cv·√(2p/ρ) with p = ρgH: derived from the definition.
        let mut a = vec![("flow_given", "head"), ("head", "20 m"), ("cv", "0.95")];
        a.extend_from_slice(WATER_1000);
        let mut b = vec![("flow_given", "p"), ("p", "196.133 kPa"), ("cv", "0.95")];
        b.extend_from_slice(WATER_1000);
        let (sa, sb) = (solved(&a), solved(&b));
        let v = 0.95 * (2.0 * 9.80665 * 20.0f64).sqrt();
        assert_relative_eq!(
            sa.output("jet_velocity").map(|o| o.si).unwrap_or(0.0),
            v,
            max_relative = 1e-12
        );
        assert_relative_eq!(
            sb.output("jet_velocity").map(|o| o.si).unwrap_or(0.0),
            v,
            max_relative = 1e-9
        );
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let (field, message) = first_error(&[("flow_given", "q"), ("q", "-5 L/s")]);
        assert_eq!(field, "q");
        assert!(message.contains("at least"), "{message}");
        assert_eq!(first_error(&[("d_jet", "0 mm")]).0, "d_jet");
        assert_eq!(first_error(&[("plate_angle", "120 deg")]).0, "plate_angle");
        let (field, _) = first_error(&[("flow_given", "v"), ("v", "")]);
        assert_eq!(field, "v");
        match crate::solve(super::KEY, &request(&[("flow_given", "nozzle")])).result {
            Err(crate::SolveError::Fields(errors)) => {
                assert!(matches!(errors[0].kind, FieldErrorKind::UnknownChoice { .. }))
            }
            other => panic!("expected a choice error, got {other:?}"),
        }
    }

    #[test]
    fn demo_solves_with_a_diagram_and_tables() {
        let s = solved(&[]);
        assert_eq!(s.diagrams.len(), 1);
        assert!(s.tables.iter().any(|t| t.key == "split"));
        assert!(s.tables.iter().any(|t| t.key == "ledger"));
        assert!(s.output("force_normal").map(|o| o.si > 0.0).unwrap_or(false));
    }
}
