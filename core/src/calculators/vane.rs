//! Jet on a curved vane: a fixed vane, a single moving vane, and a wheel of vanes
//! (an impulse wheel such as a Pelton wheel); force, power and efficiency, and how
//! power and efficiency vary with the blade speed.
//!
//! # Method
//! A round free jet (area A, speed V, flow Q = AV; from the nozzle diameter and one
//! of the jet velocity, the flow, or the head or pressure at the nozzle inlet with a
//! velocity coefficient) enters the vane tangentially along +x. The vane moves along
//! +x at the blade speed u (zero for a fixed vane) and turns the flow, relative to
//! itself, through the deflection angle θ (180° turns it straight back). Friction on
//! the vane slows the relative flow: W₂ = k·W₁ with W₁ = V − u and k ≤ 1. All ports
//! are open to the atmosphere (gauge pressure zero), so only momentum fluxes act.
//!
//! - **Fixed vane** (u = 0): a fixed control volume around the vane; ṁ = ρAV.
//! - **Single moving vane**: a control volume that moves with the vane at u
//!   ([`crate::engine::Frame::Translating`]). The flow is steady in that frame, and
//!   momentum is written with relative velocities: only ṁ = ρA(V − u) reaches the
//!   vane per second, because the vane runs away from the jet and the jet between
//!   nozzle and vane grows longer by u every second.
//! - **Wheel of vanes**: one vane after another enters the jet, so the whole jet,
//!   ṁ = ρAV, is turned. A control volume fixed around the wheel takes in the jet at
//!   V and discharges it with the absolute exit velocity of the exit velocity
//!   triangle, V₂ = u + W₂ (vectors).
//!
//! In each case the engine ([`crate::engine`]) returns the force of the water on the
//! vane; its component along the jet is F_x = ṁ·W₁·(1 − k·cos θ), the power is
//! P = F_x·u, and the efficiency is P over the jet's kinetic-energy flux ρQV²/2.
//! That gives the classic results: a single vane delivers most power at u = V/3
//! (efficiency (8/27)(1 − k·cos θ), 16/27 for θ = 180°, k = 1); a wheel at u = V/2
//! (efficiency (1 − k·cos θ)/2, 100 % for θ = 180°, k = 1). The plotted curves are
//! balances at each blade speed, and the optimum speeds are found by searching those
//! balances, not from the formulas. An energy table lists where the jet's power goes.
//!
//! The checks table ([`Report::check`]) compares the force along the jet with
//! ṁ·W₁·(1 − k·cos θ) written by hand, the power F_x·u with the energy balance (jet
//! flux − kinetic energy carried off − vane loss ṁ(1 − k²)W₁²/2 − the lengthening
//! jet of a single vane), and the searched peak powers with their closed forms. A
//! side force that is rounding residue of the flux turned is shown as 0. The
//! efficiency is reported as not applicable, with the reason, for a fixed vane (it
//! does no work) and for a wheel at its runaway speed (no load).
//!
//! Sources: the moving-vane and impulse-turbine sections of White, *Fluid
//! Mechanics* (chapters 3 and 11), Munson et al., *Fundamentals of Fluid Mechanics*
//! (chapters 5 and 12), Dixon & Hall, *Fluid Mechanics and Thermodynamics of
//! Turbomachinery* (the Pelton wheel), and the impact-of-jets chapter of hydraulics
//! texts such as Bansal, *A Textbook of Fluid Mechanics and Hydraulic Machines*.
//!
//! # Assumptions
//! Idealised jet: steady (on average for a wheel), incompressible, uniform speed,
//! no spreading, windage or spray; the jet enters tangentially and along the vane's
//! motion; the vane's friction is lumped in k; the jet's weight is neglected; for the
//! wheel, the vane speed u is the speed of the bucket at the jet's line.

use std::f64::consts::PI;

use crate::catalog::{
    CalculatorSpec, ChoiceOption, Diagram, FieldSpec, Limits, Marker, OutputSpec, Plot, Report, Series, Shape,
    ShapeStyle, Table, Values,
};
use crate::engine::{self, si, Balance, ControlVolume, EngineError, Frame, Loss, Port, Stream, StreamUnknown};
use crate::error::FieldError;
use crate::fluid::Fluid;
use crate::units::{self, QuantityKind as Q, UnitSystem, STANDARD_GRAVITY};
use crate::vector::{Direction, Vec3};

use super::common::{self, choice, quantity, Jet};

pub const KEY: &str = "vane";

const MODE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "fixed",
        label: "Fixed vane",
    },
    ChoiceOption {
        key: "single",
        label: "Single moving vane",
    },
    ChoiceOption {
        key: "wheel",
        label: "Wheel of vanes (impulse wheel)",
    },
];

/// Points on each plotted curve (blade speed from 0 to the jet speed).
const PLOT_POINTS: usize = 41;
/// The smallest relative-velocity factor accepted: a vane that keeps less than 5 % of
/// the relative speed is a brake, not a vane.
const MIN_K: f64 = 0.05;

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        choice(
            "vane",
            "Vane",
            MODE_OPTIONS,
            "wheel",
            "A fixed vane; a single vane moving away from the jet (only the water that catches up with it is turned); or a wheel, where one vane follows another and the whole jet is turned.",
        ),
        FieldSpec {
            // Required while shown (a single vane or a wheel); hidden for a fixed vane.
            visible_when: Some(("vane", &["single", "wheel"])),
            ..quantity(
                "u",
                "Blade speed",
                Q::Velocity,
                "m/s",
                "ft/s",
                "16 m/s",
                Limits::closed(0.0, common::MAX_JET_SPEED),
                "Speed of the vane along the jet, away from the nozzle. For a wheel: the bucket speed at the jet's line, ω·r. A single vane must move slower than the jet.",
            )
        },
        quantity(
            "angle",
            "Deflection angle of the vane",
            Q::Angle,
            "deg",
            "deg",
            "165 deg",
            Limits::closed(PI / 180.0, PI),
            "How far the vane turns the flow relative to itself, 1 to 180 degrees (straight back). Impulse buckets turn about 160 to 170 degrees.",
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "w_ratio",
                "Relative-velocity factor k = W₂/W₁",
                Q::Ratio,
                "-",
                "-",
                "0.9",
                Limits::closed(MIN_K, 1.0),
                "Relative speed leaving the vane over relative speed entering it, 0.05 to 1; 1 for a smooth vane (empty means 1). Friction makes it less than 1.",
            )
        },
    ];
    fields.extend(common::jet_fields([
        "25 mm", "head", "33 m/s", "16 L/s", "60 m", "6 bar", "0.98",
    ]));
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: "Jet on a curved vane: fixed, moving, wheel",
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary: "Force, power and efficiency of a jet on a fixed vane, a single moving vane or a wheel of vanes, with power and efficiency against blade speed.",
        fields,
        outputs: vec![
            OutputSpec { key: "force_x", label: "Force on the vane along the jet (x)", kind: Q::Force, headline: true },
            OutputSpec { key: "power", label: "Power delivered to the vane(s), F_x·u", kind: Q::Power, headline: true },
            OutputSpec { key: "efficiency", label: "Efficiency: power ÷ jet kinetic-energy flux", kind: Q::Ratio, headline: true },
            OutputSpec { key: "force_y", label: "Force on the vane across the jet (y, positive towards the side the water is turned to)", kind: Q::Force, headline: false },
            OutputSpec { key: "force_side", label: "Side force on the vane, away from the side the water is turned to", kind: Q::Force, headline: false },
            OutputSpec { key: "force", label: "Resultant force on the vane", kind: Q::Force, headline: false },
            OutputSpec { key: "mass_flow_turned", label: "Mass flow turned by the vane(s)", kind: Q::MassFlow, headline: false },
            OutputSpec { key: "w_in", label: "Relative velocity entering the vane, W₁ = V − u", kind: Q::Velocity, headline: false },
            OutputSpec { key: "w_out", label: "Relative velocity leaving the vane, W₂ = k·W₁", kind: Q::Velocity, headline: false },
            OutputSpec { key: "v_out", label: "Absolute velocity of the water leaving, |V₂|", kind: Q::Velocity, headline: false },
            OutputSpec { key: "v_out_angle", label: "Direction of V₂, from the jet direction", kind: Q::Angle, headline: false },
            OutputSpec { key: "head_loss", label: "Loss on the vane, (1 − k²)·W₁²/2g", kind: Q::Length, headline: false },
            OutputSpec { key: "jet_velocity", label: "Jet velocity V", kind: Q::Velocity, headline: false },
            OutputSpec { key: "jet_flow", label: "Jet flow Q", kind: Q::VolumeFlow, headline: false },
            OutputSpec { key: "jet_power", label: "Jet kinetic-energy flux ρQV²/2", kind: Q::Power, headline: false },
            OutputSpec { key: "u_best_single", label: "Single vane: blade speed of peak power (searched)", kind: Q::Velocity, headline: false },
            OutputSpec { key: "power_best_single", label: "Single vane: peak power", kind: Q::Power, headline: false },
            OutputSpec { key: "efficiency_best_single", label: "Single vane: peak efficiency", kind: Q::Ratio, headline: false },
            OutputSpec { key: "u_best_wheel", label: "Wheel: blade speed of peak power (searched)", kind: Q::Velocity, headline: false },
            OutputSpec { key: "power_best_wheel", label: "Wheel: peak power", kind: Q::Power, headline: false },
            OutputSpec { key: "efficiency_best_wheel", label: "Wheel: peak efficiency", kind: Q::Ratio, headline: false },
            OutputSpec { key: "density", label: "Fluid density", kind: Q::Density, headline: false },
        ],
        cautions: vec![
            "Idealised jet: no spreading, windage, spray or splash, and the jet's weight neglected. Real vanes and buckets lose more than the factor k suggests (friction, windage, interference between buckets, water leaving at an angle): treat power and efficiency as upper bounds.",
            "Anything that spins needs guards and overspeed protection. An unloaded wheel runs up towards the jet speed at the buckets (runaway); check the runner, bearings and coupling for runaway speed and keep people clear of the jet and the wheel.",
            "A single vane on a carriage (a test rig) needs end stops that hold the full fixed-vane force: held still, the vane takes the most force.",
            "Defer to the machine manufacturer's ratings and to a licensed engineer for the vane, wheel, housing and foundations.",
        ],
    }
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Mode {
    Fixed,
    Single,
    Wheel,
}

/// The vane: deflection angle and relative-velocity factor.
#[derive(Clone, Copy, Debug)]
struct Vane {
    theta: f64,
    k: f64,
}

impl Vane {
    fn exit_direction(&self) -> Vec3 {
        Vec3::new(self.theta.cos(), self.theta.sin(), 0.0)
    }
}

/// One solved vane balance at one blade speed.
struct VaneState {
    balance: Balance,
    u: f64,
    /// Force of the water on the vane, N.
    force: Vec3,
    power: f64,
    efficiency: f64,
    mass_turned: f64,
    w_in: Vec3,
    w_out: Vec3,
    v_out: Vec3,
    /// Loss on the vane, m of head (relative frame).
    head_loss: f64,
}

/// Where the flow enters and leaves the vane (for moments and the drawing): it enters
/// at the origin along +x and follows an arc of radius `radius` about (0, radius).
fn exit_point(vane: &Vane, radius: f64) -> Vec3 {
    Vec3::new(radius * vane.theta.sin(), radius * (1.0 - vane.theta.cos()), 0.0)
}

/// Balances the vane at blade speed `u` (ignored for a fixed vane). The caller has
/// checked 0 ≤ u ≤ V.
fn vane_balance(fluid: &Fluid, jet: &Jet, vane: &Vane, mode: Mode, u: f64) -> Result<VaneState, EngineError> {
    let v = jet.velocity;
    let u = if mode == Mode::Fixed { 0.0 } else { u };
    let w1 = (v - u).max(0.0);
    let radius = 2.5 * jet.diameter;
    let exit = exit_point(vane, radius);
    let exit_dir = vane.exit_direction();
    let w_out_vec = exit_dir * (vane.k * w1);
    let mut cv = ControlVolume::new(fluid.clone());
    let state = match mode {
        Mode::Fixed | Mode::Single => {
            // A CV on the vane, moving with it: relative velocities, relative mass flow.
            cv.frame(match mode {
                Mode::Fixed => Frame::Fixed,
                _ => Frame::Translating {
                    velocity: Vec3::new(u, 0.0, 0.0),
                },
            });
            let i = cv.port(
                Port::inlet("jet at the vane", si::area(jet.area), Direction::X)
                    .velocity(si::velocity(w1))
                    .pressure(si::pressure(0.0)),
            );
            // The sheet leaving is thicker as it is slower (area A/k): the outlet
            // flow is solved from the mass balance and its speed comes out k·W₁.
            let o = cv.port(
                Port::outlet(
                    "water leaving the vane",
                    si::area(jet.area / vane.k),
                    Direction::new(exit_dir).unwrap_or(Direction::X),
                )
                .pressure(si::pressure(0.0))
                .at(exit),
            );
            cv.stream(Stream::new(i, o).solve_for(StreamUnknown::HeadLoss));
            let balance = engine::balance(&cv)?;
            let head_loss = balance.streams.first().map(|s| s.head_loss).unwrap_or(0.0);
            let inlet = &balance.ports[i];
            let outlet = &balance.ports[o];
            VaneState {
                u,
                force: balance.thrust(),
                power: 0.0,
                efficiency: 0.0,
                mass_turned: inlet.mass_flow,
                w_in: inlet.relative_velocity,
                w_out: outlet.relative_velocity,
                v_out: outlet.absolute_velocity,
                head_loss,
                balance,
            }
        }
        Mode::Wheel => {
            // A CV fixed around the wheel: the whole jet enters at V and leaves with
            // the absolute velocity of the exit triangle, V₂ = u + W₂.
            let v2 = Vec3::new(u, 0.0, 0.0) + w_out_vec;
            // The water may leave at (nearly) rest (θ = 180°, k = 1, u = V/2): its
            // speed is floored at 1e-9·V so that the sheet has a finite area; the
            // momentum it carries off is then below 1e-9 of the jet's.
            let speed2 = v2.norm().max(1e-9 * v);
            let dir2 = Direction::new(v2)
                .or_else(|| Direction::new(exit_dir))
                .unwrap_or(Direction::X);
            let head_loss = (1.0 - vane.k * vane.k) * w1 * w1 / (2.0 * STANDARD_GRAVITY);
            let i = cv.port(
                Port::inlet("jet", si::area(jet.area), Direction::X)
                    .velocity(si::velocity(v))
                    .pressure(si::pressure(0.0)),
            );
            let o = cv.port(
                Port::outlet("water leaving the wheel", si::area(jet.flow / speed2), dir2)
                    .pressure(si::pressure(0.0))
                    .at(exit),
            );
            cv.stream(
                Stream::new(i, o)
                    .loss(Loss::Head(head_loss))
                    .solve_for(StreamUnknown::ShaftHead),
            );
            let balance = engine::balance(&cv)?;
            let inlet = &balance.ports[i];
            let outlet = &balance.ports[o];
            let mass = inlet.mass_flow;
            VaneState {
                u,
                force: balance.thrust(),
                power: 0.0,
                efficiency: 0.0,
                mass_turned: mass,
                w_in: inlet.absolute_velocity - Vec3::new(u, 0.0, 0.0),
                w_out: w_out_vec,
                v_out: outlet.absolute_velocity,
                head_loss,
                balance,
            }
        }
    };
    let power = state.force.x * u;
    let jet_power = 0.5 * fluid.density * jet.flow * v * v;
    Ok(VaneState {
        power,
        efficiency: if jet_power > 0.0 { power / jet_power } else { 0.0 },
        ..state
    })
}

/// The blade speed that gives the most power, searched over the balance itself
/// (power is zero at standstill and at the jet speed); returns the state there.
fn best_speed(fluid: &Fluid, jet: &Jet, vane: &Vane, mode: Mode) -> Result<VaneState, EngineError> {
    let power = |u: f64| vane_balance(fluid, jet, vane, mode, u).map(|s| s.power);
    let u = common::peak_of(0.0, jet.velocity, power)?;
    vane_balance(fluid, jet, vane, mode, u)
}

fn mode_from(values: &Values) -> Result<Mode, Vec<FieldError>> {
    Ok(match values.choice("vane").map_err(|e| vec![e])? {
        "fixed" => Mode::Fixed,
        "single" => Mode::Single,
        _ => Mode::Wheel,
    })
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let mode = mode_from(values)?;
    let theta = values.quantity("angle").map_err(|e| vec![e])?;
    let k = values.quantity_or("w_ratio", 1.0);
    let fluid = common::fluid_from(values)?;
    let jet = common::jet_from(values, fluid.density)?;
    let vane = Vane { theta, k };
    let v = jet.velocity;

    let u = match mode {
        Mode::Fixed => 0.0,
        Mode::Single | Mode::Wheel => {
            if !values.is_set("u") {
                return Err(vec![FieldError::inconsistent(
                    "u",
                    "a blade speed is required for a moving vane or a wheel (0 for one held still)",
                )]);
            }
            values.quantity_or("u", 0.0)
        }
    };
    let (u_text, v_text) = (report.fmt(u, Q::Velocity), report.fmt(v, Q::Velocity));
    if mode == Mode::Single && u >= v {
        return Err(vec![FieldError::inconsistent(
            "u",
            format!("the blade speed ({u_text}) must be less than the jet speed ({v_text}): a single vane moving at or above the jet speed runs away from the jet and no water reaches it"),
        )]);
    }
    if mode == Mode::Wheel && u > v {
        return Err(vec![FieldError::inconsistent(
            "u",
            format!("the blade speed ({u_text}) is above the jet speed ({v_text}): the buckets would outrun the jet, which then strikes their backs and brakes the wheel; the jet cannot drive a wheel faster than the jet speed (its ideal runaway speed)"),
        )]);
    }

    let state = vane_balance(&fluid, &jet, &vane, mode, u).map_err(|e| common::engine_error(e, "d_jet"))?;
    let best_single = best_speed(&fluid, &jet, &vane, Mode::Single).map_err(|e| common::engine_error(e, "d_jet"))?;
    let best_wheel = best_speed(&fluid, &jet, &vane, Mode::Wheel).map_err(|e| common::engine_error(e, "d_jet"))?;

    let rho = fluid.density;
    let jet_power = 0.5 * rho * jet.flow * v * v;
    let w1 = state.w_in.norm();
    // A component that is rounding residue of the momentum flux turned (the side
    // force of a vane turning the flow straight back, sin 180° = 1.2e-16) is 0.
    let flux = state.mass_turned * w1;
    let force_y = if state.force.y.abs() <= 1e-12 * flux {
        0.0
    } else {
        state.force.y
    };
    report.output("force_x", state.force.x);
    report.output("power", state.power);
    match (mode, v - u <= 1e-9 * v) {
        (Mode::Fixed, _) => report.warn(
            None,
            "Efficiency: not applicable, a fixed vane does no work (there is no blade speed to take power at); choose a moving vane or a wheel",
        ),
        (Mode::Wheel, true) => report.warn(
            Some("u"),
            "Efficiency: not applicable, at the runaway speed no load takes power from the wheel",
        ),
        _ => report.output("efficiency", state.efficiency),
    }
    report.output("force_y", force_y);
    report.output("force_side", -force_y);
    report.output("force", state.force.norm());
    report.output("mass_flow_turned", state.mass_turned);
    report.output("w_in", w1);
    report.output("w_out", state.w_out.norm());
    // Below the 1e-9·V floor of the wheel's exit sheet the water leaves at rest.
    let v_out = if state.v_out.norm() > 1e-9 * v {
        state.v_out.norm()
    } else {
        0.0
    };
    report.output("v_out", v_out);
    if state.v_out.norm() > 1e-9 * v {
        report.output("v_out_angle", state.v_out.plane_angle());
    }
    report.output("head_loss", state.head_loss);
    report.output("jet_velocity", v);
    report.output("jet_flow", jet.flow);
    report.output("jet_power", jet_power);
    report.output("u_best_single", best_single.u);
    report.output("power_best_single", best_single.power);
    report.output("efficiency_best_single", best_single.efficiency);
    report.output("u_best_wheel", best_wheel.u);
    report.output("power_best_wheel", best_wheel.power);
    report.output("efficiency_best_wheel", best_wheel.efficiency);
    report.output("density", rho);

    independent_checks(report, &jet, &vane, mode, rho, &state, &best_single, &best_wheel);

    common::forward_warnings(&state.balance, report);
    if mode == Mode::Wheel && v - u <= 1e-9 * v {
        report.warn(
            Some("u"),
            "the blade speed equals the jet speed: this is the ideal wheel's runaway speed; no water is turned, no force acts and no power is delivered",
        );
    }
    if mode != Mode::Fixed && u == 0.0 {
        report.warn(
            Some("u"),
            "with the vane held still the force is the fixed-vane force and no power is delivered",
        );
    }
    if theta < PI / 2.0 {
        report.warn(
            Some("angle"),
            "a vane that turns the flow less than 90 degrees sends the water on forward; impulse buckets turn it about 160 to 170 degrees",
        );
    }

    let system = report.system();
    report.solution.tables.push(velocity_table(&state, system));
    report
        .solution
        .tables
        .push(energy_table(&state, mode, &jet, rho, system));
    report
        .solution
        .tables
        .push(optimum_table(&jet, &vane, rho, &best_single, &best_wheel, system));
    report
        .solution
        .tables
        .push(common::ledger_table(&state.balance, system));
    report.solution.tables.push(common::ports_table(&state.balance, system));
    report.solution.tables.push(basis(values, mode, &jet, &vane, report));
    let plots = plots(&fluid, &jet, &vane, mode, &state, system).map_err(|e| common::engine_error(e, "d_jet"))?;
    report.solution.plots.extend(plots);
    let diagram = diagram(&jet, &vane, mode, &state, report);
    report.solution.diagrams.push(diagram);
    Ok(())
}

/// Checks against paths that do not go through the engine's momentum balance:
///
/// - the force along the jet against ṁ·W₁·(1 − k·cos θ), with ṁ = ρA(V − u) for a
///   single vane and ρAV otherwise, written by hand;
/// - the power F_x·u (momentum) against the energy balance: the jet's kinetic-energy
///   flux less what the water carries off, ṁ|V₂|²/2, the loss on the vane,
///   ṁ(1 − k²)W₁²/2, and for a single vane the lengthening jet, ρAu·V²/2;
/// - the searched peak powers against (4/27)ρAV³(1 − k·cos θ) for a single vane and
///   ρAV³(1 − k·cos θ)/4 for a wheel.
#[allow(clippy::too_many_arguments)]
fn independent_checks(
    report: &mut Report<'_>,
    jet: &Jet,
    vane: &Vane,
    mode: Mode,
    rho: f64,
    state: &VaneState,
    best_single: &VaneState,
    best_wheel: &VaneState,
) {
    let (v, u, a) = (jet.velocity, state.u, jet.area);
    let w1 = v - u;
    let turning = 1.0 - vane.k * vane.theta.cos();
    let mass = match mode {
        Mode::Single => rho * a * w1,
        Mode::Fixed | Mode::Wheel => rho * a * v,
    };
    report.check(
        "Force on the vane along the jet",
        "closed form ṁ·W₁·(1 − k·cos θ)",
        Q::Force,
        state.force.x,
        mass * w1 * turning,
        1e-9,
        mass * w1 * 2.0,
    );
    let jet_power = 0.5 * rho * jet.flow * v * v;
    let carried = 0.5 * mass * state.v_out.dot(state.v_out);
    let loss = 0.5 * mass * (1.0 - vane.k * vane.k) * w1 * w1;
    let lengthening = if mode == Mode::Single {
        0.5 * rho * a * u * v * v
    } else {
        0.0
    };
    report.check(
        "Power delivered to the vane(s), F_x·u",
        "energy balance: jet's kinetic-energy flux − kinetic energy carried off − loss on the vane ṁ(1 − k²)W₁²/2 (− the lengthening jet, single vane)",
        Q::Power,
        state.power,
        jet_power - carried - loss - lengthening,
        1e-9,
        jet_power,
    );
    let rav3 = rho * a * v * v * v;
    report.check(
        "Single vane: peak power (searched)",
        "closed form (4/27)ρAV³(1 − k·cos θ) at u = V/3",
        Q::Power,
        best_single.power,
        4.0 / 27.0 * rav3 * turning,
        1e-8,
        0.0,
    );
    report.check(
        "Wheel: peak power (searched)",
        "closed form ρAV³(1 − k·cos θ)/4 at u = V/2",
        Q::Power,
        best_wheel.power,
        0.25 * rav3 * turning,
        1e-8,
        0.0,
    );
}

fn fmt_in(value: f64, kind: Q, unit: &str) -> String {
    match units::convert_to(value, kind, unit) {
        Some(v) => units::format_significant(v, 5),
        None => "—".to_string(),
    }
}

fn velocity_table(state: &VaneState, system: UnitSystem) -> Table {
    let unit = units::display_unit(1.0, Q::Velocity, system).id;
    let f = |x: f64| fmt_in(x, Q::Velocity, unit);
    let blade = Vec3::new(state.u, 0.0, 0.0);
    let v_in = state.w_in + blade;
    let row = |name: &str, vec: Vec3| vec![name.to_string(), f(vec.x), f(vec.y), f(vec.norm())];
    Table {
        key: "velocities",
        title: "Velocity triangles: absolute V = blade u + relative W".to_string(),
        columns: vec![
            "Velocity".to_string(),
            format!("x ({unit})"),
            format!("y ({unit})"),
            format!("magnitude ({unit})"),
        ],
        rows: vec![
            row("blade speed u", blade),
            row("entering: absolute V₁ (the jet)", v_in),
            row("entering: relative W₁", state.w_in),
            row("leaving: relative W₂", state.w_out),
            row("leaving: absolute V₂", state.v_out),
        ],
        emphasised_rows: Vec::new(),
    }
}

fn energy_table(state: &VaneState, mode: Mode, jet: &Jet, rho: f64, system: UnitSystem) -> Table {
    let v = jet.velocity;
    let jet_power = 0.5 * rho * jet.flow * v * v;
    let unit = units::display_unit(jet_power.max(1e-12), Q::Power, system).id;
    let f = |x: f64| fmt_in(x, Q::Power, unit);
    let carried = 0.5 * state.mass_turned * state.v_out.dot(state.v_out);
    let loss = state.mass_turned * STANDARD_GRAVITY * state.head_loss;
    let mut rows = vec![
        vec!["jet kinetic-energy flux ρQV²/2".to_string(), f(jet_power)],
        vec!["power to the vane(s), F_x·u".to_string(), f(state.power)],
        vec!["kinetic energy carried off, ṁ·V₂²/2".to_string(), f(carried)],
        vec!["loss on the vane, ṁ·g·h_L".to_string(), f(loss)],
    ];
    if mode == Mode::Single {
        // The jet between nozzle and vane grows by u every second: ρA·u of jet at V.
        let lengthening = 0.5 * rho * jet.area * state.u * v * v;
        rows.push(vec![
            "kinetic energy of the lengthening jet, ρAu·V²/2".to_string(),
            f(lengthening),
        ]);
    }
    Table {
        key: "energy",
        title: "Where the jet's power goes (the checks table compares F_x·u with the energy balance)".to_string(),
        columns: vec!["Term".to_string(), format!("power ({unit})")],
        rows,
        emphasised_rows: vec![1],
    }
}

fn optimum_table(jet: &Jet, vane: &Vane, rho: f64, single: &VaneState, wheel: &VaneState, system: UnitSystem) -> Table {
    let v = jet.velocity;
    let c = 1.0 - vane.k * vane.theta.cos();
    let rav3 = rho * jet.area * v * v * v;
    let speed_unit = units::display_unit(1.0, Q::Velocity, system).id;
    let power_unit = units::display_unit((0.25 * rav3 * c).max(1e-12), Q::Power, system).id;
    let s = |x: f64| fmt_in(x, Q::Velocity, speed_unit);
    let p = |x: f64| fmt_in(x, Q::Power, power_unit);
    let e = |x: f64| units::format_significant(100.0 * x, 5);
    Table {
        key: "optimum",
        title: "Best blade speed: searched over the balance, and the closed forms".to_string(),
        columns: vec![
            "Quantity".to_string(),
            "single vane".to_string(),
            "closed form".to_string(),
            "wheel".to_string(),
            "closed form".to_string(),
        ],
        rows: vec![
            vec![
                format!("blade speed ({speed_unit})"),
                s(single.u),
                format!("V/3 = {}", s(v / 3.0)),
                s(wheel.u),
                format!("V/2 = {}", s(v / 2.0)),
            ],
            vec![
                format!("peak power ({power_unit})"),
                p(single.power),
                format!("(4/27)ρAV³(1 − k cos θ) = {}", p(4.0 / 27.0 * rav3 * c)),
                p(wheel.power),
                format!("ρAV³(1 − k cos θ)/4 = {}", p(0.25 * rav3 * c)),
            ],
            vec![
                "peak efficiency (%)".to_string(),
                e(single.efficiency),
                format!("(8/27)(1 − k cos θ) = {}", e(8.0 / 27.0 * c)),
                e(wheel.efficiency),
                format!("(1 − k cos θ)/2 = {}", e(0.5 * c)),
            ],
        ],
        emphasised_rows: Vec::new(),
    }
}

fn basis(values: &Values, mode: Mode, jet: &Jet, vane: &Vane, report: &Report<'_>) -> Table {
    let speed = report.fmt(jet.velocity, Q::Velocity);
    let cv = units::format_significant(values.quantity_or("cv", 1.0), 4);
    let how = match values.choice("flow_given").unwrap_or("v") {
        "q" => format!("V = Q/A = {speed}"),
        "head" => format!("V = Cv·√(2gH), Cv = {cv}: {speed}"),
        "p" => format!("V = Cv·√(2p/ρ), Cv = {cv}: {speed}"),
        _ => format!("given: {speed}"),
    };
    let frame = match mode {
        Mode::Fixed => "fixed control volume around the vane; ṁ = ρAV",
        Mode::Single => "control volume moving with the vane at u (relative velocities); ṁ = ρA(V − u)",
        Mode::Wheel => {
            "fixed control volume around the wheel (absolute velocities from the exit triangle); ṁ = ρAV, the whole jet"
        }
    };
    common::basis_table(vec![
        ("Jet speed", how),
        ("Control volume", frame.to_string()),
        (
            "Vane",
            format!(
                "turns the relative flow through θ = {}; W₂ = k·W₁ with k = {}",
                report.fmt(vane.theta, Q::Angle),
                units::format_significant(vane.k, 4)
            ),
        ),
        (
            "Pressures",
            "atmospheric (gauge zero) at every port: a free jet".to_string(),
        ),
        (
            "Force reported",
            "force the water puts on the vane; the vane's mounting (or the wheel's shaft) supplies the opposite"
                .to_string(),
        ),
    ])
}

fn plots(
    fluid: &Fluid,
    jet: &Jet,
    vane: &Vane,
    mode: Mode,
    state: &VaneState,
    system: UnitSystem,
) -> Result<Vec<Plot>, EngineError> {
    let v = jet.velocity;
    let c = 1.0 - vane.k * vane.theta.cos();
    let rav3 = fluid.density * jet.area * v * v * v;
    let speed_unit = units::display_unit(1.0, Q::Velocity, system);
    let power_unit = units::display_unit((0.25 * rav3 * c).max(1e-12), Q::Power, system);
    let sx = |u: f64| units::convert_to(u, Q::Velocity, speed_unit.id).unwrap_or(u);
    let py = |p: f64| units::convert_to(p, Q::Power, power_unit.id).unwrap_or(p);
    let mut power_series = Vec::new();
    let mut efficiency_series = Vec::new();
    for (name, m) in [("single vane", Mode::Single), ("wheel of vanes", Mode::Wheel)] {
        let mut power = Vec::with_capacity(PLOT_POINTS);
        let mut efficiency = Vec::with_capacity(PLOT_POINTS);
        for i in 0..PLOT_POINTS {
            let u = v * i as f64 / (PLOT_POINTS - 1) as f64;
            let s = vane_balance(fluid, jet, vane, m, u)?;
            power.push([sx(u), py(s.power)]);
            efficiency.push([sx(u), 100.0 * s.efficiency]);
        }
        power_series.push(Series {
            name: name.to_string(),
            points: power,
        });
        efficiency_series.push(Series {
            name: name.to_string(),
            points: efficiency,
        });
    }
    let mut power_markers = vec![
        Marker {
            at: [sx(v / 3.0), py(4.0 / 27.0 * rav3 * c)],
            label: "single vane optimum, u = V/3".to_string(),
        },
        Marker {
            at: [sx(v / 2.0), py(0.25 * rav3 * c)],
            label: "wheel optimum, u = V/2".to_string(),
        },
    ];
    let mut efficiency_markers = vec![
        Marker {
            at: [sx(v / 3.0), 100.0 * 8.0 / 27.0 * c],
            label: "single vane optimum, u = V/3".to_string(),
        },
        Marker {
            at: [sx(v / 2.0), 100.0 * 0.5 * c],
            label: "wheel optimum, u = V/2".to_string(),
        },
    ];
    if mode != Mode::Fixed {
        power_markers.push(Marker {
            at: [sx(state.u), py(state.power)],
            label: "this case".to_string(),
        });
        efficiency_markers.push(Marker {
            at: [sx(state.u), 100.0 * state.efficiency],
            label: "this case".to_string(),
        });
    }
    let x_label = format!("blade speed u ({})", speed_unit.id);
    Ok(vec![
        Plot {
            key: "power",
            title: "Power against blade speed (balances at each speed)".to_string(),
            x_label: x_label.clone(),
            y_label: format!("power ({})", power_unit.id),
            series: power_series,
            markers: power_markers,
        },
        Plot {
            key: "efficiency",
            title: "Efficiency against blade speed (balances at each speed)".to_string(),
            x_label,
            y_label: "efficiency (%)".to_string(),
            series: efficiency_series,
            markers: efficiency_markers,
        },
    ])
}

fn diagram(jet: &Jet, vane: &Vane, mode: Mode, state: &VaneState, report: &Report<'_>) -> Diagram {
    let d = jet.diameter;
    let radius = 2.5 * d;
    let center = [0.0, radius];
    let (a0, a1) = (-PI / 2.0, -PI / 2.0 + vane.theta);
    let steps = 32;
    let exit = exit_point(vane, radius);
    let exit_dir = vane.exit_direction();
    let mut shapes = Vec::new();
    // Nozzle and jet.
    let lead = 4.0 * d;
    shapes.push(Shape::Polygon {
        points: vec![
            [-lead - 1.2 * d, 1.1 * d],
            [-lead, 0.6 * d],
            [-lead, -0.6 * d],
            [-lead - 1.2 * d, -1.1 * d],
        ],
        style: ShapeStyle::Wall,
    });
    shapes.push(Shape::Polygon {
        points: common::straight_band([-lead, 0.0], [0.0, 0.0], d),
        style: ShapeStyle::Fluid,
    });
    // Water on the vane and leaving it (sheet drawn at the jet's width).
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, radius, d, a0, a1, steps),
        style: ShapeStyle::Fluid,
    });
    let out_end = exit + exit_dir * (1.5 * d);
    shapes.push(Shape::Polygon {
        points: common::straight_band(exit.xy(), out_end.xy(), d),
        style: ShapeStyle::Fluid,
    });
    // The vane: on the outside of the turning sheet (the water presses outward).
    let thickness = 0.3 * d;
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, radius + 0.5 * d + 0.5 * thickness, thickness, a0, a1, steps),
        style: ShapeStyle::Wall,
    });
    // Control volume: around the vane, cutting the jet and the leaving sheet.
    let m = 0.4 * d;
    let mut cv_points = vec![[-d, 0.5 * d + m], [-d, -0.5 * d - m]];
    for i in 0..=steps {
        let a = a0 + (a1 - a0) * i as f64 / steps as f64;
        let r = radius + 0.5 * d + thickness + m;
        cv_points.push([center[0] + r * a.cos(), center[1] + r * a.sin()]);
    }
    let cut = exit + exit_dir * (0.8 * d);
    let across = Vec3::new(-exit_dir.y, exit_dir.x, 0.0) * (0.5 * d + m);
    cv_points.push((cut + across).xy());
    cv_points.push((cut - across).xy());
    shapes.push(Shape::Polygon {
        points: common::convex_hull(cv_points),
        style: ShapeStyle::ControlVolume,
    });
    // Velocities: the jet, the blade, and the exit triangle V₂ = W₂ + u.
    let v = jet.velocity;
    let scale = if v > 0.0 { 4.0 * d / v } else { 0.0 };
    let fmt_v = |x: f64| report.fmt(x, Q::Velocity);
    shapes.push(Shape::Arrow {
        from: [-lead + 0.2 * d, -1.5 * d],
        to: [-lead + 0.2 * d + v * scale, -1.5 * d],
        label: format!("V = {}", fmt_v(v)),
        style: ShapeStyle::Velocity,
    });
    if mode != Mode::Fixed && state.u > 0.0 {
        let base = [radius + d, -1.4 * d];
        shapes.push(Shape::Arrow {
            from: base,
            to: [base[0] + state.u * scale, base[1]],
            label: format!("vane moves at u = {}", fmt_v(state.u)),
            style: ShapeStyle::Velocity,
        });
        // The exit velocity triangle, drawn beside the vane at twice the scale:
        // V₂ = W₂ + u.
        let big = 2.0 * scale;
        // Clear of the vane: a relative velocity leaving backwards (θ > 90°) points
        // left, so the triangle starts further right.
        let origin = Vec3::new(
            radius + 2.0 * d + (-state.w_out.x * big).max(0.0),
            2.0 * radius + 0.5 * d,
            0.0,
        );
        let tip_w = origin + state.w_out * big;
        let tip_v = tip_w + Vec3::new(state.u * big, 0.0, 0.0);
        shapes.push(Shape::Text {
            at: (origin - Vec3::new(0.0, 1.0 * d, 0.0)).xy(),
            text: "exit triangle (2 × scale)".to_string(),
            style: ShapeStyle::Label,
        });
        // Sides unlabelled; each name sits beside the middle of its side, outside the
        // triangle, so that the names do not pile up at the shared corners.
        let centroid = (origin + tip_w + tip_v) * (1.0 / 3.0);
        let sides = [
            (origin, tip_w, "W₂".to_string(), ShapeStyle::Flow),
            (tip_w, tip_v, "u".to_string(), ShapeStyle::Flow),
            (origin, tip_v, "V₂".to_string(), ShapeStyle::Velocity),
        ];
        for (from, to, label, style) in sides {
            if (to - from).norm() < 1e-9 {
                continue;
            }
            shapes.push(Shape::Arrow {
                from: from.xy(),
                to: to.xy(),
                label: String::new(),
                style,
            });
            let mid = (from + to) * 0.5;
            let along = to - from;
            let mut normal = Vec3::new(-along.y, along.x, 0.0) * (1.0 / along.norm());
            if normal.dot(mid - centroid) < 0.0 {
                normal = -normal;
            }
            shapes.push(Shape::Text {
                at: (mid + normal * (0.5 * d)).xy(),
                text: label,
                style: ShapeStyle::Label,
            });
        }
    } else {
        shapes.push(Shape::Arrow {
            from: exit.xy(),
            to: (exit + state.v_out * scale).xy(),
            label: format!("V₂ = {}", fmt_v(state.v_out.norm())),
            style: ShapeStyle::Velocity,
        });
    }
    // The force on the vane, from the back of the vane's middle.
    let mid = a0 + 0.5 * vane.theta;
    let r_back = radius + 0.5 * d + thickness;
    let back = [center[0] + r_back * mid.cos(), center[1] + r_back * mid.sin()];
    let force_scale = if state.force.norm() > 0.0 {
        2.0 * radius / state.force.norm()
    } else {
        0.0
    };
    if let Some(a) = common::force_arrow(
        back,
        state.force,
        force_scale,
        format!("F on vane {}", report.fmt(state.force.norm(), Q::Force)),
        ShapeStyle::Thrust,
        true,
    ) {
        shapes.push(a);
    }
    let name = match mode {
        Mode::Fixed => "fixed vane",
        Mode::Single => "single vane, moving",
        Mode::Wheel => "one bucket of the wheel",
    };
    shapes.push(Shape::Text {
        at: [-lead - 1.2 * d, 3.0 * d],
        text: format!("{name}, θ = {}", report.fmt(vane.theta, Q::Angle)),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.6 * d);
    Diagram {
        title: "Jet on a vane: control volume, velocities and force".to_string(),
        bounds,
        shapes,
        caption: "Schematic: the jet and vane are drawn to scale with the jet diameter, the vane's radius is not. Velocity arrows share one scale (the jet speed V), except the exit triangle beside the vane, drawn at twice that scale: the relative velocity W₂ plus the blade speed u gives the absolute velocity V₂ of the water leaving. The force arrow is the force of the water on the vane; the mounting or the shaft supplies the opposite.".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalog::{Request, Solution};
    use approx::assert_relative_eq;

    fn request(pairs: &[(&str, &str)]) -> Request {
        crate::catalog::demo_request(&super::spec(), pairs)
    }

    fn solve(pairs: &[(&str, &str)]) -> Solution {
        crate::calculators::testing::solved(super::KEY, pairs)
    }

    fn out(s: &Solution, key: &str) -> f64 {
        s.output(key).map(|o| o.si).unwrap_or(f64::NAN)
    }

    fn error_of(pairs: &[(&str, &str)]) -> (String, String) {
        match crate::solve(super::KEY, &request(pairs)).result {
            Err(crate::SolveError::Fields(errors)) => (errors[0].field.clone(), errors[0].kind.to_string()),
            other => panic!("expected a field error, got {other:?}"),
        }
    }

    const BASE: &[(&str, &str)] = &[
        ("fluid", "custom"),
        ("rho", "1000 kg/m3"),
        ("mu", "1 mPa.s"),
        ("flow_given", "v"),
        ("v", "30 m/s"),
        ("d_jet", "50 mm"),
    ];

    fn with(extra: &[(&'static str, &'static str)]) -> Vec<(&'static str, &'static str)> {
        let mut v: Vec<(&str, &str)> = BASE.to_vec();
        v.extend_from_slice(extra);
        v
    }

    fn water() -> Fluid {
        Fluid {
            name: "test".into(),
            density: 1000.0,
            viscosity: 1e-3,
            vapour_pressure: None,
        }
    }

    fn jet() -> Jet {
        let area = PI * 0.05 * 0.05 / 4.0;
        Jet {
            diameter: 0.05,
            area,
            velocity: 30.0,
            flow: 30.0 * area,
        }
    }

    #[test]
    fn translating_frame_matches_the_relative_velocity_momentum_balance() {
        // Derived from the definition: F_x = ρA(V − u)²(1 − k cos θ), F_y = −ρA(V − u)²k sin θ,
        // and the absolute exit velocity is W₂ + u.
        let vane = Vane { theta: 2.0, k: 0.85 };
        let (v, u) = (30.0, 11.0);
        let s = match vane_balance(&water(), &jet(), &vane, Mode::Single, u) {
            Ok(s) => s,
            Err(e) => panic!("{e}"),
        };
        let m = 1000.0 * jet().area * (v - u);
        assert_relative_eq!(
            s.force.x,
            m * (v - u) * (1.0 - 0.85 * 2.0f64.cos()),
            max_relative = 1e-12
        );
        assert_relative_eq!(s.force.y, -m * (v - u) * 0.85 * 2.0f64.sin(), max_relative = 1e-12);
        assert_relative_eq!(s.v_out.x, u + 0.85 * (v - u) * 2.0f64.cos(), max_relative = 1e-12);
        // Loss in the vane's frame: (1 − k²)W₁²/2g, from the engine's energy balance.
        assert_relative_eq!(
            s.head_loss,
            (1.0 - 0.85 * 0.85) * (v - u) * (v - u) / (2.0 * STANDARD_GRAVITY),
            max_relative = 1e-9
        );
    }

    #[test]
    fn wheel_is_the_single_vane_scaled_by_the_mass_flow_and_power_closes() {
        // The fixed-CV wheel balance (absolute velocities) and the moving-CV single-vane
        // balance (relative velocities) differ only in the mass flow turned.
        for (theta, k, u) in [(PI, 1.0, 15.0), (165f64.to_radians(), 0.9, 10.0), (1.2, 0.7, 25.0)] {
            let vane = Vane { theta, k };
            let single = vane_balance(&water(), &jet(), &vane, Mode::Single, u).map_err(|e| e.to_string());
            let wheel = vane_balance(&water(), &jet(), &vane, Mode::Wheel, u).map_err(|e| e.to_string());
            let (Ok(single), Ok(wheel)) = (single, wheel) else {
                panic!("balances fail")
            };
            let ratio = 30.0 / (30.0 - u);
            assert_relative_eq!(wheel.force.x, single.force.x * ratio, max_relative = 1e-8);
            assert_relative_eq!(
                wheel.force.y,
                single.force.y * ratio,
                max_relative = 1e-8,
                epsilon = 1e-6
            );
            // Euler (F_x·u) and energy (jet flux − carried off − vane loss) agree for
            // the wheel.
            let j = jet();
            let m = 1000.0 * j.flow;
            let from_energy = 0.5 * m * 30.0 * 30.0
                - 0.5 * m * wheel.v_out.dot(wheel.v_out)
                - 0.5 * m * (1.0 - k * k) * (30.0 - u) * (30.0 - u);
            assert_relative_eq!(wheel.power, from_energy, max_relative = 1e-8, epsilon = 1e-6);
        }
    }

    #[test]
    fn searched_optima_are_at_a_third_and_a_half_of_the_jet_speed() {
        // Derived from the definition: d/du[(V − u)²u] = 0 at u = V/3; d/du[(V − u)u] = 0 at V/2.
        let s = solve(&with(&[
            ("vane", "single"),
            ("u", "10 m/s"),
            ("angle", "180 deg"),
            ("w_ratio", "1"),
        ]));
        assert_relative_eq!(out(&s, "u_best_single"), 10.0, max_relative = 1e-6);
        assert_relative_eq!(out(&s, "efficiency_best_single"), 16.0 / 27.0, max_relative = 1e-9);
        assert_relative_eq!(out(&s, "u_best_wheel"), 15.0, max_relative = 1e-6);
        assert_relative_eq!(out(&s, "efficiency_best_wheel"), 1.0, max_relative = 1e-9);
        // The plotted curves peak where the search says.
        let power = s
            .plots
            .iter()
            .find(|p| p.key == "power")
            .map(|p| p.series.clone())
            .unwrap_or_default();
        assert_eq!(power.len(), 2);
        let peak = |pts: &[[f64; 2]]| {
            pts.iter()
                .fold([0.0, f64::MIN], |a, p| if p[1] > a[1] { *p } else { a })
        };
        assert!((peak(&power[0].points)[0] - 10.0).abs() <= 30.0 / 40.0);
        assert!((peak(&power[1].points)[0] - 15.0).abs() <= 30.0 / 40.0);
    }

    #[test]
    fn force_and_power_agree_with_the_independent_paths_in_every_mode() {
        for mode in ["fixed", "single", "wheel"] {
            let s = solve(&with(&[
                ("vane", mode),
                ("u", "12 m/s"),
                ("angle", "150 deg"),
                ("w_ratio", "0.8"),
            ]));
            let labels: Vec<&str> = s.checks.iter().map(|c| c.label.as_str()).collect();
            assert!(
                labels.iter().any(|l| l.starts_with("Power delivered")),
                "{mode}: {labels:?}"
            );
            assert!(
                labels.iter().any(|l| l.starts_with("Force on the vane")),
                "{mode}: {labels:?}"
            );
            assert!(s.checks.iter().all(|c| c.agrees()), "{mode}: {:?}", s.checks);
            // The energy table lists terms only: no residual row restating the sum.
            let energy = s.tables.iter().find(|t| t.key == "energy").expect("energy table");
            assert!(!energy.rows.iter().any(|r| r[0].contains("residual")));
        }
        // Turned straight back the side force is 0, not 1e-16 of the flux.
        let back = solve(&with(&[("vane", "fixed"), ("angle", "180 deg"), ("w_ratio", "1")]));
        assert_eq!(out(&back, "force_y"), 0.0);
        // A fixed vane does no work: its efficiency is not applicable, and says why.
        assert!(back.output("efficiency").is_none());
        assert!(back
            .warnings
            .iter()
            .any(|w| w.message.starts_with("Efficiency: not applicable")));
    }

    #[test]
    fn blade_speed_errors_and_meanings() {
        let (field, message) = error_of(&with(&[("vane", "single"), ("u", "30 m/s")]));
        assert_eq!(field, "u");
        assert!(message.contains("less than the jet speed"), "{message}");
        let (field, message) = error_of(&with(&[("vane", "wheel"), ("u", "31 m/s")]));
        assert_eq!(field, "u");
        assert!(message.contains("outrun"), "{message}");
        let (field, _) = error_of(&with(&[("vane", "wheel"), ("u", "")]));
        assert_eq!(field, "u");
        assert_eq!(error_of(&with(&[("u", "-3 m/s")])).0, "u");
        // At the jet speed the ideal wheel runs away: zero force, stated.
        let s = solve(&with(&[("vane", "wheel"), ("u", "30 m/s")]));
        assert!(out(&s, "force_x").abs() < 1e-9);
        assert!(s.warnings.iter().any(|w| w.message.contains("runaway")));
        // A fixed vane ignores the hidden blade speed.
        let s = solve(&with(&[
            ("vane", "fixed"),
            ("u", "50 m/s"),
            ("angle", "180 deg"),
            ("w_ratio", "1"),
        ]));
        let q = jet().flow;
        assert_relative_eq!(out(&s, "force_x"), 2.0 * 1000.0 * q * 30.0, max_relative = 1e-12);
    }

    #[test]
    fn bad_jet_inputs_name_their_field() {
        let (field, message) = error_of(&with(&[("flow_given", "q"), ("q", "-2 L/s")]));
        assert_eq!(field, "q");
        assert!(message.contains("at least"), "{message}");
        assert_eq!(error_of(&with(&[("d_jet", "0 mm")])).0, "d_jet");
        // A flow that would make a jet faster than 500 m/s names the flow field.
        let (field, message) = error_of(&with(&[("flow_given", "q"), ("q", "90 m3/s")]));
        assert_eq!(field, "q");
        assert!(message.contains("500 m/s"), "{message}");
        // The smallest k and deflection accepted are physical, not 5e-324.
        assert_eq!(error_of(&with(&[("w_ratio", "1e-300")])).0, "w_ratio");
        assert_eq!(error_of(&with(&[("angle", "1e-300 deg")])).0, "angle");
        assert_eq!(error_of(&with(&[("w_ratio", "1.2")])).0, "w_ratio");
        assert_eq!(error_of(&with(&[("angle", "0 deg")])).0, "angle");
    }

    #[test]
    fn demo_solves_with_plots_and_a_diagram() {
        let s = solve(&[]);
        assert_eq!(s.plots.len(), 2);
        assert!(s
            .plots
            .iter()
            .all(|p| p.series.iter().all(|x| x.points.len() == PLOT_POINTS)));
        assert_eq!(s.diagrams.len(), 1);
        assert!(out(&s, "power") > 0.0);
        assert!(out(&s, "efficiency") > 0.0 && out(&s, "efficiency") < 1.0);
    }
}
