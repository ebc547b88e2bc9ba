//! Rotating reaction arm (lawn sprinkler, reaction turbine, rotating cleaning head):
//! torque, power and speed from the angular-momentum balance of a rotating CV.
//!
//! # Method
//! The control volume is the arm and its passages, rotating with the arm at ω about
//! the vertical axis z. Water enters at the hub, on the axis, moving along the axis
//! with no swirl; it leaves through N nozzles at radius R as jets of speed W relative
//! to the nozzle, each at angle α to the tangent of the nozzle circle (α = 0: jet
//! purely tangential, pointing against the rotation). The engine ([`crate::engine`],
//! `Frame::Rotating`) writes each nozzle's momentum flux with the absolute velocity
//! V = W + ω×r, so the torque the water delivers to the shaft is
//!
//! T = −Σ_out r × ṁ(W + ω×r) · ẑ = ρQ·R·(W·cos α − ωR),
//!
//! (the inlet, on the axis, carries no moment of momentum) and the shaft power is
//! P = T·ω. Both are taken from the engine. The checks table compares them with
//! paths that do not use its angular-momentum balance: the torque with N tangential
//! jet reactions ṁ_n(W·cos α − ωR) at R, the power with the fixed-frame energy
//! balance Q·p₀,hub − ṁ|V|²/2 − ṁ·K·W²/2, and the searched runaway speed with its
//! closed form (fed at fixed pressure the search is good to about 1e-12/(1 − c²)²,
//! c = C_v·cos α: the tolerance follows, and no comparison is made for c² within
//! 1e-4 of 1). A given hub bore must have at least the nozzles' total area (the
//! model puts all the loss in the nozzles). Rounding residue (below 1e-12 of the
//! terms summed) is shown as 0; the efficiency is reported as not applicable, with the reason, when the arm runs
//! free, is driven by its shaft, or sees no hub pressure.
//!
//! The jet speed comes either from the given flow, W = Q/(N·A_n), or from the supply
//! gauge pressure p at the hub through the energy balance in the rotating frame
//! (Bernoulli with the centrifugal term, hub on the axis, jet at atmospheric pressure):
//!
//! p/ρ + ½V_hub² = ½W² − ½ω²R² + K·½W², with K = 1/C_v² − 1,
//!
//! so W = C_v·√(2p/ρ + ω²R²) when the hub velocity head is neglected: the rotation
//! itself pumps, and a pressure-fed arm speeds its own jets up as it turns faster.
//! The engine solves the hub pressure for a given W; because that pressure is linear
//! in W², two engine calls give the W that matches the supply pressure exactly.
//!
//! The speed at the load is where the water's torque equals the load torque (a
//! constant friction or brake torque, a torque growing with speed or with speed
//! squared, or a speed held by the driven machine), found over engine balances by a
//! bracketed search to floating-point resolution (`numeric::sign_change`). The
//! runaway speed is where the water's torque falls to zero; with a
//! fixed flow it is ω = W·cos α / R (derived from the definition), and the power
//! peaks at half of it. Bearing and seal friction, a constant torque T_b plus an
//! optional viscous part c·ω, resists besides the load; the free-running speed is
//! where the water's torque equals the friction alone. At fixed flow the water's
//! torque is linear in ω, so against T₀ + c·ω the speed at the load is
//! (ρQR·W·cos α − T₀)/(ρQR² + c), which the checks table compares with the
//! searched speed. The page opens fed at a fixed supply pressure, as a sprinkler on a
//! main is. With a fixed pressure and an ideal tangential nozzle
//! (C_v·cos α = 1) the torque never falls to zero and there is no finite runaway
//! speed: only friction and windage hold such an arm.
//!
//! # Assumptions
//! Steady, incompressible flow; uniform jets; friction in the arm only through the
//! nozzle velocity coefficient; no windage or jet spreading; the arm's passages are
//! symmetric so the nozzle forces cancel and only the torque remains. Sources: the
//! angular-momentum form of the Reynolds transport theorem and its sprinkler examples
//! in White, *Fluid Mechanics* (chapter 3), Munson et al., *Fundamentals of Fluid
//! Mechanics* (chapter 5), Çengel & Cimbala, *Fluid Mechanics* (chapter 6).

//!
//! # Code
//! [`model::read`] reads the values once into typed [`model::Inputs`] (`uom`
//! quantities); [`model::solve`] is the pure physics, returning [`model::Solved`];
//! `report` writes the outputs, checks, tables and plots from it and `diagram` draws
//! the plan view.

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA};

mod diagram;
pub mod model;
mod report;

pub const KEY: &str = "reaction-arm";
/// The page title.
pub const TITLE: &str = "Spinning sprinkler speed and torque";

/// The most nozzles an arm may have.
const MAX_NOZZLES: f64 = 72.0;
/// Points on the torque–speed and power–speed curves.
const PLOT_POINTS: usize = 61;
/// The shortest arm accepted: 5 mm from the axis to the nozzle.
const MIN_RADIUS_M: f64 = 5e-3;
/// The smallest nozzle (and hub bore) accepted: 0.5 mm.
const MIN_NOZZLE_M: f64 = 5e-4;
/// The smallest flow accepted: 0.01 L/min.
const MIN_FLOW_M3_S: f64 = 1e-5 / 60.0;
/// The smallest supply pressure accepted: 10 Pa (1 mm of water). Whatever drives it, a
/// jet leaving the arm held still faster than `common::MAX_JET_SPEED` is refused.
const MIN_PRESSURE_PA: f64 = 10.0;
/// Speeds typed for a load: 0.1 to 100 000 rpm.
const MIN_SPEED_RAD_S: f64 = 0.1 * 2.0 * PI / 60.0;
const MAX_SPEED_RAD_S: f64 = 1e5 * 2.0 * PI / 60.0;
/// Results within this fraction of the terms they were summed from are rounding
/// residue and shown as 0 (a free-running arm's torque, its hub pressure at runaway).
const RESIDUE: f64 = 1e-12;

const FLOW_GIVEN_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "p",
        label: "Fixed supply pressure at the hub",
    },
    ChoiceOption {
        key: "q",
        label: "Fixed flow (positive-displacement or throttled supply)",
    },
];

const LOAD_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "none",
        label: "No load (free running: runaway)",
    },
    ChoiceOption {
        key: "constant",
        label: "Constant torque (bearing friction, brake)",
    },
    ChoiceOption {
        key: "linear",
        label: "Torque proportional to speed (viscous drag)",
    },
    ChoiceOption {
        key: "quadratic",
        label: "Torque proportional to speed squared (fan, windage)",
    },
    ChoiceOption {
        key: "speed",
        label: "Speed held by the driven machine (generator, governor)",
    },
];

/// The usual cautions of the page.
const CAUTIONS: &[&str] = &[
    "Idealised arm: uniform jets, no jet spreading or windage, bearing friction only as you give it. Real arms \
        and runners lose more and run slower than these figures.",
    "Anything that spins needs a guard and overspeed protection: a free-running arm fed at fixed pressure can \
        reach a very high speed. Keep people out of the plane of rotation and the jets.",
    "For a machine bought in, the manufacturer's ratings govern; defer to the manufacturer and to a licensed \
        engineer for speed limits, guarding and mounting loads.",
];

const CV_HELP: &str = "Actual ÷ ideal jet speed, 0.5 to 1; empty means 1 (no loss). Used with a fixed pressure \
    and for the pressure a fixed flow needs.";
const D_HUB_HELP: &str = "Bore of the passage where the supply pressure is read. Empty: the velocity head in the \
    hub is neglected (the pressure is the total head).";
const T_BEARING_HELP: &str = "Torque of the bearings and seals that the arm must overcome at any speed (a \
    sprinkler's swivel, a turbine's bearings), besides the load. Empty: 0, frictionless.";
const T_VISCOUS_HELP: &str = "Friction that grows in proportion to speed (a lubricated bearing, a viscous brake), \
    given as its torque at the speed below. Empty: none.";
const SUMMARY: &str =
    "Torque, power and speed of a jet-driven arm from the angular-momentum balance in the rotating frame.";

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity(
            "nozzles",
            "Number of nozzles N",
            Q::Ratio,
            "-",
            "-",
            "4",
            Limits::closed(1.0, MAX_NOZZLES),
            "Whole number of identical nozzles spaced evenly round the arm, 1 to 72.",
        ),
        quantity(
            "radius",
            "Nozzle radius R",
            Q::Length,
            "mm",
            "in",
            "1200 mm",
            Limits::closed(MIN_RADIUS_M, common::MAX_SIZE_M),
            "Distance from the axis of rotation to the centre of each nozzle exit.",
        ),
        quantity(
            "d_nozzle",
            "Nozzle exit diameter",
            Q::Length,
            "mm",
            "in",
            "25 mm",
            Limits::closed(MIN_NOZZLE_M, 1.0),
            "Diameter of each jet at the nozzle exit (the vena contracta for a sharp orifice), 0.5 mm to 1 m.",
        ),
        quantity(
            "alpha",
            "Nozzle angle to the tangent α",
            Q::Angle,
            "deg",
            "deg",
            "10 deg",
            Limits::closed(0.0, PI / 2.0),
            "0 = jet along the tangent, against the rotation; 90° = radial jet, no torque.",
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "cv",
                "Nozzle velocity coefficient C_v",
                Q::Ratio,
                "-",
                "-",
                "0.95",
                Limits {
                    min: 0.5,
                    max: 1.0,
                    min_inclusive: true,
                },
                CV_HELP,
            )
        },
        choice(
            "flow_given",
            "The arm is fed at",
            FLOW_GIVEN_OPTIONS,
            "p",
            "Fixed pressure (as a garden or process sprinkler is fed from a main): W grows with speed, W = \
                    C_v·√(2p/ρ + ω²R²). Fixed flow (a positive-displacement or throttled supply): the jet speed \
                    W = Q/(N·A) is set.",
        ),
        FieldSpec {
            visible_when: Some(("flow_given", &["q"])),
            ..quantity(
                "q",
                "Total flow through the arm",
                Q::VolumeFlow,
                "m3/h",
                "gpm",
                "40 m3/h",
                Limits::closed(MIN_FLOW_M3_S, 100.0),
                "All nozzles together, 0.01 L/min to 100 m³/s.",
            )
        },
        FieldSpec {
            visible_when: Some(("flow_given", &["p"])),
            ..quantity(
                "p",
                "Supply gauge pressure at the hub",
                Q::Pressure,
                "kPa",
                "psi",
                "20 kPa",
                Limits::closed(MIN_PRESSURE_PA, MAX_PRESSURE_PA),
                "Gauge pressure in the hub on the axis, after the swivel, 10 Pa to 100 MPa.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "d_hub",
                "Hub bore",
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(MIN_NOZZLE_M, common::MAX_SIZE_M),
                D_HUB_HELP,
            )
        },
        choice(
            "load",
            "Load on the shaft",
            LOAD_OPTIONS,
            "constant",
            "What holds the arm back. The speed is where the water's torque equals the load torque.",
        ),
        FieldSpec {
            visible_when: Some(("load", &["constant", "linear", "quadratic"])),
            ..quantity(
                "t_load",
                "Load torque",
                Q::Torque,
                "N.m",
                "lbf.ft",
                "30 N.m",
                Limits::closed(0.0, 1e7),
                "The constant torque, or the torque at the speed below.",
            )
        },
        FieldSpec {
            visible_when: Some(("load", &["linear", "quadratic"])),
            ..quantity(
                "speed_load",
                "Speed at which that torque applies",
                Q::AngularSpeed,
                "rpm",
                "rpm",
                "",
                Limits::closed(MIN_SPEED_RAD_S, MAX_SPEED_RAD_S),
                "The load torque scales with speed (or speed squared) through this point; 0.1 to 100 000 rpm.",
            )
        },
        FieldSpec {
            visible_when: Some(("load", &["speed"])),
            ..quantity(
                "speed_held",
                "Held speed",
                Q::AngularSpeed,
                "rpm",
                "rpm",
                "",
                Limits::closed(0.0, MAX_SPEED_RAD_S),
                "The speed the driven machine holds, 0 to 100 000 rpm; 0 gives the stall torque.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "t_bearing",
                "Bearing friction torque (constant)",
                Q::Torque,
                "N.m",
                "lbf.ft",
                "",
                Limits::closed(0.0, 1e7),
                T_BEARING_HELP,
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "t_viscous",
                "Viscous friction torque at the speed below",
                Q::Torque,
                "N.m",
                "lbf.ft",
                "",
                Limits::closed(0.0, 1e7),
                T_VISCOUS_HELP,
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "speed_viscous",
                "Speed of that viscous friction torque",
                Q::AngularSpeed,
                "rpm",
                "rpm",
                "",
                Limits::closed(MIN_SPEED_RAD_S, MAX_SPEED_RAD_S),
                "The viscous friction torque grows in proportion to speed through this point; 0.1 to 100 000 \
                    rpm.",
            )
        },
    ];
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary: SUMMARY,
        fields,
        outputs: vec![
            OutputSpec::headline("speed", "Speed at the load", Q::AngularSpeed),
            OutputSpec::headline("torque", "Torque delivered to the shaft at that speed", Q::Torque),
            OutputSpec::headline("power", "Shaft power at that speed", Q::Power),
            OutputSpec::headline("runaway_speed", "Runaway speed (no load)", Q::AngularSpeed),
            OutputSpec::listed("stall_torque", "Stall torque (arm held still)", Q::Torque),
            OutputSpec::listed("max_power", "Largest shaft power (over speed)", Q::Power),
            OutputSpec::listed("speed_at_max_power", "Speed of largest power", Q::AngularSpeed),
            OutputSpec::listed("jet_velocity", "Jet speed relative to the nozzle W", Q::Velocity),
            OutputSpec::listed("tip_speed", "Nozzle speed ωR", Q::Velocity),
            OutputSpec::listed(
                "jet_swirl",
                "Absolute tangential jet velocity W·cos α − ωR",
                Q::Velocity,
            ),
            OutputSpec::listed("flow", "Total flow", Q::VolumeFlow),
            OutputSpec::listed("mass_flow", "Mass flow", Q::MassFlow),
            OutputSpec::listed("supply_pressure", "Supply gauge pressure at the hub", Q::Pressure),
            OutputSpec::listed(
                "efficiency",
                "Efficiency: shaft power ÷ (flow × total hub pressure)",
                Q::Ratio,
            ),
            OutputSpec::listed("density", "Fluid density", Q::Density),
            OutputSpec::listed(
                "friction_torque",
                "Bearing friction torque at the speed at the load",
                Q::Torque,
            ),
            OutputSpec::listed(
                "power_to_load",
                "Power to the load, (torque − bearing friction)·ω",
                Q::Power,
            ),
            OutputSpec::listed(
                "free_speed",
                "Free-running speed against bearing friction alone",
                Q::AngularSpeed,
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
    use super::model::{Arm, Drive};
    use super::*;
    use crate::catalog::Request;
    use crate::engine::si;
    use crate::fluid::Fluid;
    use approx::assert_relative_eq;

    fn water() -> Fluid {
        Fluid {
            name: "test".to_string(),
            density: 1000.0,
            viscosity: 1e-3,
            vapour_pressure: None,
        }
    }

    fn arm(nozzles: usize, alpha_deg: f64, drive: Drive) -> Arm {
        Arm {
            fluid: water(),
            nozzles,
            radius: 0.3,
            nozzle_area: common::circle_area(0.008),
            nozzle_diameter: 0.008,
            alpha: alpha_deg.to_radians(),
            k: 0.0,
            cv: 1.0,
            hub_area: None,
            drive,
        }
    }

    #[test]
    fn a_free_running_arm_shows_zero_torque_and_hub_pressure_and_no_efficiency() {
        // Derived from the definition: an ideal tangential arm fed a fixed flow runs
        // free at ωR = W, where T = ρQR(W − ωR) = 0 and the rotating-frame energy
        // balance gives a hub pressure ρ(W² − ω²R²)/2 = 0: rounding residue of
        // 1e-16 N·m or 1e-11 Pa is shown as the 0 it is.
        for alpha in ["0 deg", "0.0001 deg"] {
            let s = crate::calculators::testing::solved(
                KEY,
                &[
                    ("flow_given", "q"),
                    ("load", "none"),
                    ("alpha", alpha),
                    ("cv", "1"),
                    ("nozzles", "3"),
                ],
            );
            let out = |k: &str| s.output(k).map(|o| o.si);
            assert_eq!(out("torque"), Some(0.0), "{alpha}");
            assert_eq!(out("power"), Some(0.0), "{alpha}");
            if alpha == "0 deg" {
                assert_eq!(out("supply_pressure"), Some(0.0));
            }
            assert_eq!(out("efficiency"), None, "{alpha}");
            let texts: Vec<&str> = s.warnings.iter().map(|w| w.message.as_str()).collect();
            assert!(
                texts.iter().any(|t| t.starts_with("Efficiency: not applicable")),
                "{texts:?}"
            );
            assert!(!texts.iter().any(|t| t.contains("held speed")), "{texts:?}");
            assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        }
    }

    #[test]
    fn a_hub_bore_narrower_than_the_nozzles_together_is_refused() {
        // Four 25 mm nozzles need a hub bore of at least 50 mm (√4 × 25 mm): a
        // narrower one would be faster than the jets, outside this model.
        let (field, message) =
            crate::calculators::testing::first_error(KEY, &[("flow_given", "q"), ("d_hub", "40 mm")]);
        assert_eq!(field, "d_hub");
        assert!(message.contains("50.00 mm"), "{message}");
        // 100 m³/s through four 0.5 mm nozzles would leave at 1.3e8 m/s: refused.
        let (field, message) = crate::calculators::testing::first_error(
            KEY,
            &[("flow_given", "q"), ("q", "100 m3/s"), ("d_nozzle", "0.5 mm")],
        );
        assert_eq!(field, "q");
        assert!(message.contains("500 m/s"), "{message}");
        let s = crate::calculators::testing::solved(KEY, &[("d_hub", "50 mm")]);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    #[test]
    fn held_speed_above_runaway_is_warned_only_when_a_speed_is_held() {
        let held = crate::calculators::testing::solved(KEY, &[("load", "speed"), ("speed_held", "5000 rpm")]);
        assert!(held.output("torque").map(|o| o.si < 0.0).unwrap_or(false));
        assert!(held.warnings.iter().any(|w| w.message.contains("held speed is above")));
        assert_eq!(held.output("efficiency"), None);
        assert!(held.checks.iter().all(|c| c.agrees()), "{:?}", held.checks);
    }

    #[test]
    fn engine_torque_matches_rho_q_r_w_cos_alpha_minus_omega_r() {
        // Derived from the definition: T = ρQR(W cos α − ωR).
        for nozzles in [1, 2, 3, 4, 7] {
            for alpha in [0.0, 15.0, 40.0, 75.0] {
                for omega in [0.0, 12.0, 55.0, 140.0] {
                    let a = arm(nozzles, alpha, Drive::Flow(si::volume_flow(0.002)));
                    let s = a.state(omega).expect("balances");
                    let w = 0.002 / (nozzles as f64 * a.nozzle_area);
                    let expected = 1000.0 * 0.002 * 0.3 * (w * alpha.to_radians().cos() - omega * 0.3);
                    assert_relative_eq!(s.torque, expected, epsilon = 1e-9, max_relative = 1e-12);
                    assert_relative_eq!(s.power, expected * omega, epsilon = 1e-9, max_relative = 1e-12);
                    // Symmetric arms leave no net force in the plane.
                    if nozzles > 1 {
                        let f = s.balance.support_force;
                        assert!(f.x.abs() + f.y.abs() < 1e-9 * (1.0 + expected.abs()));
                    }
                }
            }
        }
    }

    #[test]
    fn the_typed_model_solves_without_values() {
        // Derived from the definition: a fixed-flow arm with no load runs away at
        // ω = W·cos α/R and its power peaks at half of that, W = Q/(N·A_n).
        use uom::si::angle::degree;
        use uom::si::f64::{Angle, Length, Ratio, VolumeRate};
        use uom::si::length::millimeter;
        use uom::si::ratio::ratio;
        use uom::si::volume_rate::liter_per_second;
        let inputs = model::Inputs {
            fluid: water(),
            nozzles: 3,
            radius: Length::new::<millimeter>(250.0),
            nozzle_diameter: Length::new::<millimeter>(6.0),
            alpha: Angle::new::<degree>(20.0),
            cv: Ratio::new::<ratio>(1.0),
            hub_bore: None,
            drive: Drive::Flow(VolumeRate::new::<liter_per_second>(0.9)),
            load: model::Load::None,
            friction: model::Friction::default(),
        };
        let solved = model::solve(&inputs).expect("solves");
        let w = 0.9e-3 / (3.0 * PI * 0.006 * 0.006 / 4.0);
        let runaway = w * 20f64.to_radians().cos() / 0.25;
        assert_relative_eq!(solved.runaway.expect("finite"), runaway, max_relative = 1e-9);
        assert_eq!(solved.operating, model::Operating::At(solved.runaway.unwrap_or(0.0)));
        assert_relative_eq!(solved.peak.expect("a peak").0, 0.5 * runaway, max_relative = 1e-6);
        let curve = solved.curve().expect("balances");
        assert_eq!(curve.len(), PLOT_POINTS);
        // The curve reaches beyond runaway, where the water's torque is negative.
        assert!(curve[PLOT_POINTS - 1].omega > runaway && curve[PLOT_POINTS - 1].torque < 0.0);
    }

    #[test]
    fn pressure_fed_jet_follows_rotating_frame_bernoulli() {
        // Derived from the definition: W = C_v √(2p/ρ + ω²R²) with the hub head neglected.
        let mut a = arm(2, 0.0, Drive::Pressure(si::pressure(3e5)));
        a.cv = 0.9;
        a.k = 1.0 / 0.81 - 1.0;
        for omega in [0.0, 30.0, 90.0] {
            let s = a.state(omega).expect("balances");
            let w = 0.9 * (2.0 * 3e5 / 1000.0 + (omega * 0.3f64).powi(2)).sqrt();
            assert_relative_eq!(s.jet, w, max_relative = 1e-10);
            assert_relative_eq!(s.supply_pressure, 3e5, max_relative = 1e-10);
        }
    }

    fn request(pairs: &[(&str, &str)]) -> Request {
        crate::catalog::demo_request(&spec(), pairs)
    }

    fn error_field(pairs: &[(&str, &str)]) -> String {
        crate::calculators::testing::error_field(super::KEY, pairs)
    }

    #[test]
    fn demo_solves_with_plots_and_no_runaway_surprise() {
        let s = crate::solve(KEY, &request(&[])).result.expect("demo solves");
        assert!(s.output("speed").is_some());
        assert_eq!(s.plots.len(), 2);
        assert!(s.plots.iter().all(|p| p.series[0].points.len() == PLOT_POINTS));
        assert_eq!(s.diagrams.len(), 1);
    }

    #[test]
    fn fixed_flow_runaway_and_friction_speed_match_closed_forms() {
        // ω_runaway = W cos α / R; with friction T0, ω = W cos α / R − T0/(ρQR²).
        let s = crate::solve(
            KEY,
            &request(&[
                ("nozzles", "2"),
                ("radius", "450 mm"),
                ("d_nozzle", "12 mm"),
                ("alpha", "10 deg"),
                ("flow_given", "q"),
                ("q", "1.5 L/s"),
                ("fluid", "custom"),
                ("rho", "1000 kg/m3"),
                ("mu", "1 mPa.s"),
                ("load", "constant"),
                ("t_load", "2 N.m"),
            ]),
        )
        .result
        .expect("solves");
        let a = common::circle_area(0.012);
        let w = 1.5e-3 / (2.0 * a);
        let c = 10f64.to_radians().cos();
        assert_relative_eq!(s.output("runaway_speed").unwrap().si, w * c / 0.45, max_relative = 1e-9);
        let expected = w * c / 0.45 - 2.0 / (1000.0 * 1.5e-3 * 0.45 * 0.45);
        assert_relative_eq!(s.output("speed").unwrap().si, expected, max_relative = 1e-9);
        assert_relative_eq!(
            s.output("speed_at_max_power").unwrap().si,
            0.5 * w * c / 0.45,
            max_relative = 1e-6
        );
    }

    #[test]
    fn ideal_pressure_fed_arm_has_no_finite_runaway() {
        let s = crate::solve(
            KEY,
            &request(&[
                ("alpha", "0 deg"),
                ("cv", "1"),
                ("load", "none"),
                ("flow_given", "p"),
                ("p", "4 bar"),
            ]),
        )
        .result
        .expect("solves with a warning");
        assert!(s.output("runaway_speed").is_none());
        assert!(s.warnings.iter().any(|w| w.message.contains("no finite runaway")));
    }

    #[test]
    fn held_speed_above_runaway_and_unheld_ideal_arm_are_warned() {
        let s = crate::solve(
            KEY,
            &request(&[("flow_given", "q"), ("load", "speed"), ("speed_held", "60 rpm")]),
        )
        .result
        .expect("solves");
        assert!(s.output("torque").unwrap().si < 0.0);
        assert!(s.warnings.iter().any(|w| w.field == Some("speed_held")));
        let s = crate::solve(
            KEY,
            &request(&[
                ("flow_given", "p"),
                ("alpha", "0 deg"),
                ("cv", "1"),
                ("load", "constant"),
                ("t_load", "1 N.m"),
            ]),
        )
        .result
        .expect("solves with a warning");
        assert!(s.output("speed").is_none());
        assert!(s.warnings.iter().any(|w| w.field == Some("t_load")));
    }

    #[test]
    fn radial_jets_give_exactly_no_torque() {
        let s = crate::solve(KEY, &request(&[("alpha", "90 deg"), ("load", "none")]))
            .result
            .expect("solves");
        assert_eq!(s.output("stall_torque").unwrap().si, 0.0);
        assert_eq!(s.output("speed").unwrap().si, 0.0);
        assert!(s.warnings.iter().any(|w| w.field == Some("alpha")));
    }

    #[test]
    fn bad_inputs_name_their_field() {
        assert_eq!(error_field(&[("nozzles", "2.5")]), "nozzles");
        assert_eq!(error_field(&[("nozzles", "0")]), "nozzles");
        assert_eq!(error_field(&[("radius", "0 mm")]), "radius");
        assert_eq!(error_field(&[("flow_given", "q"), ("q", "-1 L/s")]), "q");
        assert_eq!(error_field(&[("flow_given", "q"), ("q", "")]), "q");
        assert_eq!(error_field(&[("load", "linear")]), "speed_load");
        assert_eq!(error_field(&[("flow_given", "p"), ("d_hub", "1 mm")]), "d_hub");
    }

    #[test]
    fn bearing_friction_slows_the_arm_and_the_fixed_pressure_drive_is_the_default() {
        let solved = |pairs: &[(&str, &str)]| crate::calculators::testing::solved(KEY, pairs);
        // The page opens fed at fixed pressure, as a sprinkler on a main is.
        let spec = spec();
        let drive = spec.fields.iter().find(|f| f.key == "flow_given").map(|f| f.demo);
        assert_eq!(drive, Some("p"));
        // Friction alone holds a free-running arm below its runaway speed.
        let free = solved(&[("load", "none"), ("t_bearing", "5 N.m")]);
        let get = |s: &crate::catalog::Solution, k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
        assert!(get(&free, "speed") < get(&free, "runaway_speed"));
        assert_relative_eq!(get(&free, "speed"), get(&free, "free_speed"), max_relative = 1e-12);
        assert_relative_eq!(get(&free, "torque"), 5.0, max_relative = 1e-6);
        // At fixed flow the speed is checked against its closed form.
        let fixed = solved(&[
            ("flow_given", "q"),
            ("load", "linear"),
            ("t_load", "10 N.m"),
            ("speed_load", "100 rpm"),
            ("t_bearing", "2 N.m"),
            ("t_viscous", "1 N.m"),
            ("speed_viscous", "50 rpm"),
        ]);
        assert!(fixed.checks.iter().any(|c| c.label.starts_with("Speed at the load")));
        assert!(fixed.checks.iter().all(|c| c.agrees()), "{:?}", fixed.checks);
        let to_load = get(&fixed, "power_to_load");
        let expected = (get(&fixed, "torque") - get(&fixed, "friction_torque")) * get(&fixed, "speed");
        assert_relative_eq!(to_load, expected, max_relative = 1e-12);
        // Friction above the stall torque: the arm does not start, and says so.
        let stuck = solved(&[("load", "none"), ("t_bearing", "1000 N.m")]);
        assert_eq!(get(&stuck, "speed"), 0.0);
        assert!(stuck.warnings.iter().any(|w| w.message.contains("does not start")));
        // A viscous torque needs its speed.
        assert_eq!(
            error_field(&[("t_viscous", "1 N.m"), ("speed_viscous", "")]),
            "speed_viscous"
        );
    }
}
