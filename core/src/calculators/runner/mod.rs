//! Runner (impeller) from its velocity triangles: Euler head, torque, shaft power and
//! hydraulic efficiency of a radial or axial turbine runner or pump impeller.
//!
//! # Method
//! Index 1 is where the water enters the blades and 2 where it leaves, in the
//! direction of flow, for both machines (a radial turbine: 1 outer, 2 inner; a
//! centrifugal pump: 1 at the eye, 2 at the rim). At each station
//!
//! - blade speed u = ω·r (axial machine: r the mean radius, u₁ = u₂);
//! - meridional (through-flow) velocity V_m = Q/A, with A = 2π·r·b for a radial
//!   runner of blade height b (no blade blockage) and the given annulus area for an
//!   axial one;
//! - inlet swirl from the guide vanes, V_θ1 = V_m1 / tan α₁, with α₁ the angle of the
//!   absolute velocity from the direction of blade motion (90° = no pre-swirl);
//! - outlet swirl from the blade, the flow leaving along it (no slip):
//!   V_θ2 = u₂ − V_m2 / tan β₂, with β the blade angle measured from the direction
//!   opposite to the blade motion (90° = a radial or axial blade; below 90° = a
//!   blade swept back from the motion, as in a backward-curved pump impeller);
//! - relative velocity W = V − u; the inlet relative flow angle
//!   β₁,flow = atan2(V_m1, u₁ − V_θ1) is compared with the inlet blade angle β₁: the
//!   difference is the incidence (a shock loss the ideal head does not include).
//!
//! The torque comes from the engine's angular-momentum balance ([`crate::engine`])
//! on the runner as a **rotating control volume** (`Frame::Rotating`): each station
//! is a port at its radius whose velocity is the relative velocity W; the engine adds
//! the frame velocity ω×r, so the moment of momentum is written with the absolute
//! velocity, and the torque the water delivers to the shaft is
//! T = ρQ(r₁V_θ1 − r₂V_θ2). The Euler head follows from it:
//!
//! - turbine: H_E = T·ω/(ρgQ) = (u₁V_θ1 − u₂V_θ2)/g, head taken out of the water;
//!   hydraulic efficiency η_h = H_E/H against the net head H;
//! - pump: H_E = −T·ω/(ρgQ) = (u₂V_θ2 − u₁V_θ1)/g, head given to the water;
//!   η_h = H/H_E.
//!
//! The station pressures do not enter that balance: over a surface of revolution
//! (the cylinder r = r₁ of a radial runner, the annulus of an axial one) pressure
//! acts radially or axially and has no moment about the axis. The engine's ports
//! take the pressure force along the flow direction, which is right for a pipe cut
//! square to the flow but not for these oblique ports, so the momentum balance is
//! run with gauge pressures of zero. A second balance in the same rotating frame
//! solves the static pressure change from the energy equation with the centrifugal
//! term (the rothalpy is constant along an ideal blade passage):
//! p₂ − p₁ = ρ/2·[(W₁² − W₂²) + (u₂² − u₁²)].
//!
//! # Checks
//! The checks table ([`Report::check`]) compares the engine's torque with
//! ρQ(r₁V_θ1 − r₂V_θ2) written from the triangles, and the Euler head with the energy
//! form of the triangles [(V₁² − V₂²) + (u₁² − u₂²) + (W₂² − W₁²)]/2g and with the
//! static pressure change of the second balance plus the change of absolute velocity
//! head. A torque within 1e-12 of the swirl moments is rounding residue, shown as 0;
//! the efficiency is reported as not applicable, with the reason, when the Euler head
//! is not positive.
//!
//! # Pumps
//! A pump also gets the head with slip for a finite number of blades (Wiesner's or
//! Stodola's correlation), its specific speed (dimensionless, metric n_q and US
//! customary N_s) and the NPSH available at the eye: see [`pump`].
//!
//! # Assumptions
//! Ideal (Euler) flow: the water follows the blades exactly (infinitely many blades,
//! no slip), uniform velocities over each station, no leakage, disc friction or
//! shock loss; incompressible, steady in the rotating frame.
//!
//! Sources: Euler's turbomachine equation and velocity triangles as derived in
//! White, *Fluid Mechanics* (chapter 11), Munson et al., *Fundamentals of Fluid
//! Mechanics* (chapter 12), Çengel & Cimbala, *Fluid Mechanics* (chapter 14), Dixon &
//! Hall, *Fluid Mechanics and Thermodynamics of Turbomachinery* (chapters 1 and 2).
//!
//! # Code
//! [`model::read`] reads the values once into typed [`model::Inputs`] (`uom`
//! quantities); [`model::solve`] is the pure physics, returning [`model::Solved`];
//! `report` writes the outputs, checks, tables and the plot from it and `diagram`
//! draws the velocity triangles.

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_SIZE_M};

mod diagram;
pub mod model;
pub mod pump;
mod report;

pub const KEY: &str = "runner";
/// The page title.
pub const TITLE: &str = "Turbine or pump runner: head, torque and power from blade angles";

/// Incidence beyond which a warning is given (common practice, no source: a few
/// degrees of incidence already cost measurable shock loss).
const INCIDENCE_WARNING_RAD: f64 = PI / 180.0;

const MACHINE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "turbine",
        label: "Turbine (water drives the runner)",
    },
    ChoiceOption {
        key: "pump",
        label: "Pump (impeller drives the water)",
    },
];

const LAYOUT_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "radial",
        label: "Radial flow (Francis runner, centrifugal impeller)",
    },
    ChoiceOption {
        key: "axial",
        label: "Axial flow (propeller, Kaplan, axial pump), at the mean radius",
    },
];

/// Blade and flow angles: 1° to 179° (a blade at 0° or 180° lies in the plane of
/// the motion and passes no flow; tan of a vanishing angle overflows the swirl).
const ANGLE_RANGE: Limits = Limits::closed(PI / 180.0, 179.0 * PI / 180.0);
/// Sizes: 1 mm to 10 m.
const SIZE_RANGE: Limits = Limits::closed(1e-3, MAX_SIZE_M);
/// Annulus areas: 1 mm² to 100 m².
const AREA_RANGE: Limits = Limits::closed(1e-6, 100.0);
/// Shaft speeds: 1 to 100 000 rpm.
const SPEED_RANGE: Limits = Limits::closed(2.0 * PI / 60.0, 1e5 * 2.0 * PI / 60.0);
/// Flows: 0.001 L/s to 1000 m³/s.
const FLOW_RANGE: Limits = Limits::closed(1e-6, 1e3);
/// Net heads: 1 cm to 10 km.
const HEAD_RANGE: Limits = Limits::closed(0.01, 1e4);
/// The fastest blade speed accepted, m/s: well above the tip speeds of water
/// turbines and pumps (a few tens to about 200 m/s, common practice, no source).
const MAX_BLADE_SPEED: f64 = 500.0;
/// Results within this fraction of the terms they were summed from are rounding
/// residue and shown as 0.
const RESIDUE: f64 = 1e-12;

/// The usual cautions of the page.
const CAUTIONS: &[&str] = &[
    "Euler head is the ideal, infinite-blade figure: real runners lose more (slip, shock at off-design incidence, \
        friction, leakage, disc friction); real heads and powers are lower for a pump's delivery and a turbine's \
        output.",
    "Anything that spins needs a guard and overspeed protection; a turbine that loses its load runs away. Defer to the \
        machine's manufacturer and to a licensed engineer for ratings, speeds and foundations.",
    "Slip correlations are estimates, not a pump test. The NPSH available must exceed the pump maker's NPSH \
        required by the margin your code asks for.",
];

const SUMMARY: &str = "Euler head, torque, power and hydraulic efficiency of a radial or axial runner from its blade \
    angles, speed and flow.";
const R1_HELP: &str = "Where the water enters the blades: the eye of a pump, the outer rim of a radial turbine.";
const R2_HELP: &str = "Where the water leaves the blades.";
const B1_HELP: &str = "Width of the passage across the flow at r₁ (flow area 2π·r₁·b₁).";
const B2_HELP: &str = "Width of the passage at r₂ (flow area 2π·r₂·b₂).";
const R_MEAN_HELP: &str = "Radius at which the triangles are drawn, usually the mean of hub and tip radii.";
const A1_HELP: &str = "Flow area between hub and tip where the water enters the blades.";
const A2_HELP: &str = "Flow area where the water leaves the blades.";
const BETA1_HELP: &str = "From the direction opposite to the blade motion (90° = radial or axial blade). Empty: \
    taken to match the inlet flow (no incidence).";
const BETA2_HELP: &str =
    "From the direction opposite to the blade motion; sets the outlet swirl V_θ2 = u₂ − V_m2/tan β₂.";
const ALPHA1_HELP: &str = "Angle of the absolute inlet velocity from the direction of blade motion, V_θ1 = V_m1/tan \
    α₁. Empty: 90°, no pre-swirl.";
const SPEED_HELP: &str = "Shaft speed, 1 to 100 000 rpm.";
const Q_HELP: &str = "Flow through the blades, 0.001 L/s to 1000 m³/s.";
const HEAD_HELP: &str = "Turbine: net head available; pump: head delivered. Gives the hydraulic efficiency.";

pub fn spec() -> CalculatorSpec {
    let radial = Some(("layout", &["radial"][..]));
    let axial = Some(("layout", &["axial"][..]));
    let mut fields = vec![
        choice(
            "machine",
            "Machine",
            MACHINE_OPTIONS,
            "pump",
            "Sets the sign convention: a turbine's Euler head is taken out of the water, a pump's is given to \
                    it.",
        ),
        choice(
            "layout",
            "Flow through the blades",
            LAYOUT_OPTIONS,
            "radial",
            "Radial: give the two radii and blade heights. Axial: give the mean radius and the two annulus \
                    areas.",
        ),
        FieldSpec {
            visible_when: radial,
            ..quantity(
                "r1",
                "Radius at the blade inlet r₁",
                Q::Length,
                "mm",
                "in",
                "65 mm",
                SIZE_RANGE,
                R1_HELP,
            )
        },
        FieldSpec {
            visible_when: radial,
            ..quantity(
                "r2",
                "Radius at the blade outlet r₂",
                Q::Length,
                "mm",
                "in",
                "160 mm",
                SIZE_RANGE,
                R2_HELP,
            )
        },
        FieldSpec {
            visible_when: radial,
            ..quantity(
                "b1",
                "Blade height at the inlet b₁",
                Q::Length,
                "mm",
                "in",
                "40 mm",
                SIZE_RANGE,
                B1_HELP,
            )
        },
        FieldSpec {
            visible_when: radial,
            ..quantity(
                "b2",
                "Blade height at the outlet b₂",
                Q::Length,
                "mm",
                "in",
                "22 mm",
                SIZE_RANGE,
                B2_HELP,
            )
        },
        FieldSpec {
            visible_when: axial,
            ..quantity(
                "r_mean",
                "Mean radius",
                Q::Length,
                "mm",
                "in",
                "",
                SIZE_RANGE,
                R_MEAN_HELP,
            )
        },
        FieldSpec {
            visible_when: axial,
            ..quantity(
                "a1",
                "Annulus area at the inlet",
                Q::Area,
                "m2",
                "ft2",
                "",
                AREA_RANGE,
                A1_HELP,
            )
        },
        FieldSpec {
            visible_when: axial,
            ..quantity(
                "a2",
                "Annulus area at the outlet",
                Q::Area,
                "m2",
                "ft2",
                "",
                AREA_RANGE,
                A2_HELP,
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "beta1",
                "Blade angle at the inlet β₁",
                Q::Angle,
                "deg",
                "deg",
                "",
                ANGLE_RANGE,
                BETA1_HELP,
            )
        },
        quantity(
            "beta2",
            "Blade angle at the outlet β₂",
            Q::Angle,
            "deg",
            "deg",
            "25 deg",
            ANGLE_RANGE,
            BETA2_HELP,
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "alpha1",
                "Guide-vane (inlet flow) angle α₁",
                Q::Angle,
                "deg",
                "deg",
                "",
                ANGLE_RANGE,
                ALPHA1_HELP,
            )
        },
        quantity(
            "speed",
            "Speed",
            Q::AngularSpeed,
            "rpm",
            "rpm",
            "1480 rpm",
            SPEED_RANGE,
            SPEED_HELP,
        ),
        quantity(
            "q",
            "Flow",
            Q::VolumeFlow,
            "m3/h",
            "gpm",
            "180 m3/h",
            FLOW_RANGE,
            Q_HELP,
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "head",
                "Net head H",
                Q::Length,
                "m",
                "ft",
                "40 m",
                HEAD_RANGE,
                HEAD_HELP,
            )
        },
    ];
    fields.extend(pump_fields());
    fields.extend(common::fluid_fields("25 degC"));
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary: SUMMARY,
        fields,
        outputs: vec![
            OutputSpec::headline("euler_head", "Euler head H_E", Q::Length),
            OutputSpec::headline("torque", "Shaft torque (turbine: delivered; pump: needed)", Q::Torque),
            OutputSpec::headline("power", "Shaft power, ideal", Q::Power),
            OutputSpec::headline(
                "efficiency",
                "Hydraulic efficiency (turbine H_E/H, pump H/H_E)",
                Q::Ratio,
            ),
            OutputSpec::listed("u1", "Blade speed at the inlet u₁", Q::Velocity),
            OutputSpec::listed("u2", "Blade speed at the outlet u₂", Q::Velocity),
            OutputSpec::listed("vm1", "Meridional velocity at the inlet V_m1", Q::Velocity),
            OutputSpec::listed("vm2", "Meridional velocity at the outlet V_m2", Q::Velocity),
            OutputSpec::listed("vtheta1", "Swirl at the inlet V_θ1", Q::Velocity),
            OutputSpec::listed("vtheta2", "Swirl at the outlet V_θ2", Q::Velocity),
            OutputSpec::listed("v1", "Absolute velocity at the inlet V₁", Q::Velocity),
            OutputSpec::listed("v2", "Absolute velocity at the outlet V₂", Q::Velocity),
            OutputSpec::listed("w1", "Relative velocity at the inlet W₁", Q::Velocity),
            OutputSpec::listed("w2", "Relative velocity at the outlet W₂", Q::Velocity),
            OutputSpec::listed(
                "alpha2",
                "Outlet flow angle α₂ (from the blade motion; 90° = no swirl)",
                Q::Angle,
            ),
            OutputSpec::listed("beta1_flow", "Inlet relative flow angle β₁,flow", Q::Angle),
            OutputSpec::listed("incidence", "Incidence β₁ − β₁,flow", Q::Angle),
            OutputSpec::listed(
                "pressure_rise",
                "Static pressure change p₂ − p₁ (ideal; negative = drop)",
                Q::Pressure,
            ),
            OutputSpec::listed("mass_flow", "Mass flow", Q::MassFlow),
            OutputSpec::listed("density", "Fluid density", Q::Density),
            OutputSpec::listed("slip_factor", "Pump: slip factor σ = 1 − V_s/u₂", Q::Ratio),
            OutputSpec::listed("vtheta2_slip", "Pump: outlet swirl with slip V_θ2′", Q::Velocity),
            OutputSpec::listed("head_slip", "Pump: head with slip H′ (finite blades)", Q::Length),
            OutputSpec::listed(
                "specific_speed",
                "Pump: specific speed Ω_s = ω√Q/(gH)^¾ (dimensionless, rad)",
                Q::Ratio,
            ),
            OutputSpec::listed(
                "specific_speed_metric",
                "Pump: specific speed n_q = n√Q/H^¾ (rpm, m³/s, m)",
                Q::Ratio,
            ),
            OutputSpec::listed(
                "specific_speed_us",
                "Pump: specific speed N_s = n√Q/H^¾ (rpm, US gpm, ft)",
                Q::Ratio,
            ),
            OutputSpec::listed("npsh_available", "Pump: NPSH available at the eye", Q::Length),
            OutputSpec::listed(
                "vapour_pressure",
                "Vapour pressure of the liquid (absolute)",
                Q::Pressure,
            ),
        ],
        cautions: CAUTIONS.to_vec(),
    }
}

const SLIP_HELP: &str = "A pump impeller with a finite number of blades turns the water less than its blade \
    angle: Wiesner's correlation (1967) or Stodola's gives the slip factor and the head with slip. Radial impellers \
    only. Empty: none.";
const BLADES_HELP: &str = "Whole number of blades of the impeller, 2 to 40.";
const SUCTION_HELP: &str = "Read on a gauge: give the suction gauge pressure for the NPSH available at the eye.";
const P_SUCTION_HELP: &str = "Gauge pressure read at the pump suction (negative below atmospheric).";
const P_ATM_HELP: &str = "Absolute pressure of the local atmosphere, 30 to 110 kPa. Empty: the standard atmosphere, \
    101.325 kPa (lower at altitude).";
const Z_SUCTION_HELP: &str = "Height of the suction pressure reading above the impeller eye (negative below it). \
    Empty: 0, read at the eye.";
const D_SUCTION_HELP: &str = "Bore where the suction pressure is read, for its velocity head. Empty: read at the \
    blade inlet, with the absolute velocity V₁.";
const P_VAPOUR_HELP: &str = "Absolute vapour pressure of the liquid at the pumping temperature. Empty: water's, from \
    its temperature (IAPWS-IF97); another liquid needs it typed.";

/// The pump-only fields: slip correlation and blades, and the suction for the NPSH
/// available ([`pump`]).
fn pump_fields() -> Vec<FieldSpec> {
    let pump = Some(("machine", &["pump"][..]));
    let gauge = Some(("suction", &["gauge"][..]));
    let suction = |key, label, kind, si_unit, us_unit, limits, help| FieldSpec {
        visible_when: gauge,
        optional: true,
        ..quantity(key, label, kind, si_unit, us_unit, "", limits, help)
    };
    vec![
        FieldSpec {
            visible_when: pump,
            optional: true,
            ..choice("slip", "Slip (finite blades)", pump::SLIP_OPTIONS, "none", SLIP_HELP)
        },
        FieldSpec {
            visible_when: Some(("slip", &["wiesner", "stodola"])),
            ..quantity(
                "blades",
                "Number of blades Z",
                Q::Ratio,
                "-",
                "-",
                "7",
                Limits::closed(2.0, pump::MAX_BLADES),
                BLADES_HELP,
            )
        },
        FieldSpec {
            visible_when: pump,
            optional: true,
            ..choice(
                "suction",
                "Suction pressure",
                pump::SUCTION_OPTIONS,
                "none",
                SUCTION_HELP,
            )
        },
        FieldSpec {
            visible_when: gauge,
            ..quantity(
                "p_suction",
                "Suction gauge pressure",
                Q::Pressure,
                "kPa",
                "psi",
                "",
                Limits::closed(-crate::units::STANDARD_ATMOSPHERE, common::MAX_PRESSURE_PA),
                P_SUCTION_HELP,
            )
        },
        suction(
            "p_atm",
            "Local atmospheric pressure (absolute)",
            Q::Pressure,
            "kPa",
            "psi",
            Limits::closed(30e3, 110e3),
            P_ATM_HELP,
        ),
        suction(
            "z_suction",
            "Height of the suction reading above the eye",
            Q::Length,
            "m",
            "ft",
            Limits::closed(-100.0, 100.0),
            Z_SUCTION_HELP,
        ),
        suction(
            "d_suction",
            "Suction bore at the reading",
            Q::Length,
            "mm",
            "in",
            SIZE_RANGE,
            D_SUCTION_HELP,
        ),
        suction(
            "p_vapour",
            "Vapour pressure of the liquid (absolute)",
            Q::Pressure,
            "kPa",
            "psi",
            Limits::closed(0.0, 25e6),
            P_VAPOUR_HELP,
        ),
    ]
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, model::read, model::solve, |_, s, r| report::write(s, r))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::STANDARD_GRAVITY;
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn engine_torque_equals_euler_form_for_pump_and_turbine() {
        // Derived from the definition: T = ρQ(r₁V_θ1 − r₂V_θ2), H_E = (u₁V_θ1 − u₂V_θ2)/g.
        for machine in ["pump", "turbine"] {
            for alpha1 in ["90 deg", "60 deg", "120 deg"] {
                let s = solved(&[
                    ("machine", machine),
                    ("alpha1", alpha1),
                    ("fluid", "custom"),
                    ("rho", "1000 kg/m3"),
                    ("mu", "1 mPa.s"),
                ]);
                let get = |k: &str| s.output(k).unwrap().si;
                let omega = 1480.0 * 2.0 * PI / 60.0;
                let q = 180.0 / 3600.0;
                let (r1, r2) = (0.065, 0.160);
                let water = 1000.0 * q * (r1 * get("vtheta1") - r2 * get("vtheta2"));
                let sign = if machine == "turbine" { 1.0 } else { -1.0 };
                assert_relative_eq!(get("torque"), sign * water, max_relative = 1e-10);
                let h = sign * (get("u1") * get("vtheta1") - get("u2") * get("vtheta2")) / STANDARD_GRAVITY;
                assert_relative_eq!(get("euler_head"), h, max_relative = 1e-10);
                assert_relative_eq!(get("power"), get("torque") * omega, max_relative = 1e-12);
            }
        }
    }

    #[test]
    fn the_typed_model_solves_without_values() {
        // Derived from the definition: a radial pump with no pre-swirl has
        // H_E = u₂V_θ2/g, V_θ2 = u₂ − V_m2/tan β₂, V_m2 = Q/(2π·r₂·b₂).
        use uom::si::angle::degree;
        use uom::si::angular_velocity::revolution_per_minute;
        use uom::si::f64::{Angle, AngularVelocity, Length, VolumeRate};
        use uom::si::length::millimeter;
        use uom::si::volume_rate::cubic_meter_per_second;
        let inputs = model::Inputs {
            machine: model::Machine::Pump,
            stations: model::Stations::Radial {
                r1: Length::new::<millimeter>(50.0),
                r2: Length::new::<millimeter>(150.0),
                b1: Length::new::<millimeter>(30.0),
                b2: Length::new::<millimeter>(20.0),
            },
            fluid: crate::fluid::Fluid {
                name: "test".to_string(),
                density: 1000.0,
                viscosity: 1e-3,
                vapour_pressure: None,
            },
            speed: AngularVelocity::new::<revolution_per_minute>(1200.0),
            flow: VolumeRate::new::<cubic_meter_per_second>(0.05),
            alpha1: Angle::new::<degree>(90.0),
            beta1: None,
            beta2: Angle::new::<degree>(30.0),
            head: None,
            pump: pump::PumpInputs {
                slip: None,
                suction: None,
            },
            water_temperature: None,
        };
        let solved = model::solve(&inputs).expect("solves");
        let u2 = 1200.0 * 2.0 * PI / 60.0 * 0.15;
        let vm2 = 0.05 / (2.0 * PI * 0.15 * 0.02);
        let vtheta2 = u2 - vm2 / 30f64.to_radians().tan();
        assert_relative_eq!(solved.euler_head, u2 * vtheta2 / STANDARD_GRAVITY, max_relative = 1e-10);
        assert_relative_eq!(solved.torque, 1000.0 * 0.05 * 0.15 * vtheta2, max_relative = 1e-10);
        assert_eq!(solved.curve.len(), 40);
    }

    #[test]
    fn pressure_change_follows_rothalpy() {
        // Derived from the definition: p₂ − p₁ = ρ/2 [(W₁² − W₂²) + (u₂² − u₁²)].
        let s = solved(&[("fluid", "custom"), ("rho", "1000 kg/m3"), ("mu", "1 mPa.s")]);
        let get = |k: &str| s.output(k).unwrap().si;
        let expected = 500.0 * (get("w1").powi(2) - get("w2").powi(2) + get("u2").powi(2) - get("u1").powi(2));
        assert_relative_eq!(get("pressure_rise"), expected, max_relative = 1e-9);
        // And the ideal pump's total-head rise equals its Euler head.
        let total =
            (get("pressure_rise") + 500.0 * (get("v2").powi(2) - get("v1").powi(2))) / (1000.0 * STANDARD_GRAVITY);
        assert_relative_eq!(total, get("euler_head"), max_relative = 1e-9);
    }

    #[test]
    fn incidence_is_warned() {
        let s = solved(&[("beta1", "60 deg")]);
        assert!(s.warnings.iter().any(|w| w.field == Some("beta1")));
        let matched = s.output("beta1_flow").unwrap().si;
        let deg = format!("{} rad", matched);
        let s = solved(&[("beta1", deg.as_str())]);
        assert!(s.warnings.iter().all(|w| w.field != Some("beta1")));
        assert!(s.output("incidence").unwrap().si.abs() < 1e-9);
    }

    #[test]
    fn demo_has_triangles_table_and_plot() {
        let s = solved(&[]);
        assert_eq!(s.diagrams.len(), 1);
        assert!(s.tables.iter().any(|t| t.key == "triangles"));
        assert_eq!(s.plots.len(), 1);
        assert!(s.output("euler_head").unwrap().si > 0.0);
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let field = |pairs: &[(&str, &str)]| match crate::solve(KEY, &request(pairs)).result {
            Err(crate::SolveError::Fields(errors)) => errors[0].field.clone(),
            other => panic!("expected a field error, got {other:?}"),
        };
        assert_eq!(field(&[("r1", "0 mm")]), "r1");
        assert_eq!(field(&[("q", "-5 m3/h")]), "q");
        assert_eq!(field(&[("q", "0")]), "q");
        assert_eq!(field(&[("layout", "axial")]), "r_mean");
        assert_eq!(field(&[("beta2", "0 deg")]), "beta2");
        // A vanishing angle would make the swirl V_m/tan α overflow: refused, as are
        // sizes and speeds that are not physical.
        assert_eq!(field(&[("alpha1", "1e-300 deg")]), "alpha1");
        assert_eq!(field(&[("b1", "1e-300 mm")]), "b1");
        assert_eq!(field(&[("speed", "1e-300 rpm")]), "speed");
        assert_eq!(field(&[("head", "1e-300 m")]), "head");
        // 160 mm at 60 000 rpm: blades at 1005 m/s, faster than any water runner.
        assert_eq!(field(&[("speed", "60000 rpm")]), "speed");
    }

    #[test]
    fn checks_agree_and_efficiency_is_explained_when_not_applicable() {
        for machine in ["pump", "turbine"] {
            let s = solved(&[("machine", machine)]);
            // A pump adds the US specific speed (its demo has no slip or suction).
            let extra = if machine == "pump" { 1 } else { 0 };
            assert_eq!(s.checks.len(), 3 + extra, "{machine}");
            assert!(s.checks.iter().all(|c| c.agrees()), "{machine}: {:?}", s.checks);
        }
        // The demo pump's triangles run as a turbine give no positive Euler head:
        // the efficiency is not applicable and the page says why.
        let s = solved(&[("machine", "turbine"), ("head", "40 m")]);
        assert!(s.output("efficiency").is_none());
        assert!(s
            .warnings
            .iter()
            .any(|w| w.message.starts_with("Efficiency: not applicable")));
    }

    #[test]
    fn slip_specific_speed_and_npsh_of_a_pump() {
        use super::pump::{antoine_water, slip_factor, SlipModel};
        // Wiesner inside his limit, and with his correction beyond it (r₁/r₂ = 0.9).
        let beta2 = 25f64.to_radians();
        let (inside, limit) = slip_factor(SlipModel::Wiesner, 7, beta2, 0.4);
        assert_relative_eq!(inside, 1.0 - beta2.sin().sqrt() / 7f64.powf(0.7), max_relative = 1e-14);
        assert_eq!(limit.map(|l| l.1), Some(false));
        let (beyond, limit) = slip_factor(SlipModel::Wiesner, 7, beta2, 0.9);
        let eps = (-8.16 * beta2.sin() / 7.0).exp();
        let correction = 1.0 - ((0.9 - eps) / (1.0 - eps)).powi(3);
        assert_relative_eq!(beyond, inside * correction, max_relative = 1e-14);
        assert_eq!(limit.map(|l| l.1), Some(true));
        assert_relative_eq!(
            slip_factor(SlipModel::Stodola, 6, PI / 6.0, 0.4).0,
            1.0 - PI / 12.0,
            max_relative = 1e-14
        );
        // The Antoine path is within 0.2 % of IAPWS-IF97 over the liquid range.
        for celsius in [0.01, 10.0, 30.0, 50.0, 70.0, 90.0, 99.9] {
            let t = celsius + 273.15;
            let ratio = antoine_water(t) / crate::fluid::water_saturation_pressure(t);
            assert!((ratio - 1.0).abs() < 2e-3, "{celsius} degC: {ratio}");
        }
        // A pump with slip and a suction reading shows all three, every check agreeing.
        let s = solved(&[
            ("machine", "pump"),
            ("slip", "wiesner"),
            ("blades", "7"),
            ("suction", "gauge"),
            ("p_suction", "20 kPa"),
        ]);
        for key in ["slip_factor", "head_slip", "specific_speed_us", "npsh_available"] {
            assert!(s.output(key).is_some(), "{key}");
        }
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        assert!(s.tables.iter().any(|t| t.key == "pump"));
        // A turbine shows none of them.
        let t = solved(&[("machine", "turbine")]);
        assert!(t.output("slip_factor").is_none() && t.output("npsh_available").is_none());
        // A pump whose suction boils, a fractional blade count, a vacuum below zero.
        let boiling = solved(&[
            ("machine", "pump"),
            ("suction", "gauge"),
            ("p_suction", "-95 kPa"),
            ("t", "90 degC"),
        ]);
        assert!(solved(&[("machine", "pump")]).output("npsh_available").is_none());
        assert!(boiling.output("npsh_available").is_some_and(|o| o.si < 0.0));
        assert!(boiling.warnings.iter().any(|w| w.message.contains("boils at the eye")));
        assert_eq!(
            error_field(&[("machine", "pump"), ("slip", "stodola"), ("blades", "6.5")]),
            "blades"
        );
        assert_eq!(
            error_field(&[
                ("machine", "pump"),
                ("suction", "gauge"),
                ("p_suction", "-100 kPa"),
                ("p_atm", "90 kPa"),
            ]),
            "p_suction"
        );
        // Another liquid without a vapour pressure: no NPSH, and the page says why.
        let custom = solved(&[
            ("machine", "pump"),
            ("suction", "gauge"),
            ("p_suction", "20 kPa"),
            ("fluid", "custom"),
            ("rho", "1000 kg/m3"),
            ("mu", "1 mPa.s"),
        ]);
        assert!(custom.output("npsh_available").is_none());
        assert!(custom.warnings.iter().any(|w| w.field == Some("p_vapour")));
        // An axial pump gets no slip, and is told so.
        let axial = solved(&[
            ("machine", "pump"),
            ("slip", "wiesner"),
            ("blades", "7"),
            ("layout", "axial"),
            ("r_mean", "150 mm"),
            ("a1", "0.05 m2"),
            ("a2", "0.05 m2"),
        ]);
        assert!(axial.output("slip_factor").is_none());
        assert!(axial.warnings.iter().any(|w| w.message.contains("radial impellers")));
    }
}
