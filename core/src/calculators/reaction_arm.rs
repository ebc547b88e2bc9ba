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
//! model puts all the loss in the nozzles). Rounding residue (below 1e-12 of the terms summed) is shown as 0;
//! the efficiency is reported as not applicable, with the reason, when the arm runs
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
//! squared, or a speed held by the driven machine), found by bisection over engine
//! balances. The runaway speed is where the water's torque falls to zero; with a
//! fixed flow it is ω = W·cos α / R (derived from the definition), and the power
//! peaks at half of it. With a fixed pressure and an ideal tangential nozzle
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

use std::f64::consts::PI;

use crate::catalog::{
    CalculatorSpec, ChoiceOption, Diagram, FieldSpec, Limits, Marker, OutputSpec, Plot, Report, Series, Shape,
    ShapeStyle, Table, Values,
};
use crate::engine::{self, si, Balance, ControlVolume, EngineError, Loss, Port, Stream};
use crate::error::FieldError;
use crate::fluid::Fluid;
use crate::units::{self, QuantityKind as Q, UnitSystem};
use crate::vector::{Direction, Vec3};

use super::common::{self, choice, quantity, MAX_PRESSURE_PA};

pub const KEY: &str = "reaction-arm";

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
        key: "q",
        label: "Fixed flow (positive-displacement or throttled supply)",
    },
    ChoiceOption {
        key: "p",
        label: "Fixed supply pressure at the hub",
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
            "0 = jet along the tangent, against the rotation; 90 deg = radial jet, no torque.",
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
                "Actual ÷ ideal jet speed, 0.5 to 1; empty means 1 (no loss). Used with a fixed pressure and for the pressure a fixed flow needs.",
            )
        },
        choice(
            "flow_given",
            "The arm is fed at",
            FLOW_GIVEN_OPTIONS,
            "q",
            "Fixed flow: the jet speed W = Q/(N·A) is set. Fixed pressure: W grows with speed, W = C_v·√(2p/ρ + ω²R²).",
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
                "Bore of the passage where the supply pressure is read. Empty: the velocity head in the hub is neglected (the pressure is the total head).",
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
    ];
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: "Rotating reaction arm (sprinkler, reaction turbine)",
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary: "Torque, power and speed of a jet-driven arm from the angular-momentum balance in the rotating frame.",
        fields,
        outputs: vec![
            OutputSpec { key: "speed", label: "Speed at the load", kind: Q::AngularSpeed, headline: true },
            OutputSpec { key: "torque", label: "Torque delivered to the shaft at that speed", kind: Q::Torque, headline: true },
            OutputSpec { key: "power", label: "Shaft power at that speed", kind: Q::Power, headline: true },
            OutputSpec { key: "runaway_speed", label: "Runaway speed (no load)", kind: Q::AngularSpeed, headline: true },
            OutputSpec { key: "stall_torque", label: "Stall torque (arm held still)", kind: Q::Torque, headline: false },
            OutputSpec { key: "max_power", label: "Largest shaft power (over speed)", kind: Q::Power, headline: false },
            OutputSpec { key: "speed_at_max_power", label: "Speed of largest power", kind: Q::AngularSpeed, headline: false },
            OutputSpec { key: "jet_velocity", label: "Jet speed relative to the nozzle W", kind: Q::Velocity, headline: false },
            OutputSpec { key: "tip_speed", label: "Nozzle speed ωR", kind: Q::Velocity, headline: false },
            OutputSpec { key: "jet_swirl", label: "Absolute tangential jet velocity W·cos α − ωR", kind: Q::Velocity, headline: false },
            OutputSpec { key: "flow", label: "Total flow", kind: Q::VolumeFlow, headline: false },
            OutputSpec { key: "mass_flow", label: "Mass flow", kind: Q::MassFlow, headline: false },
            OutputSpec { key: "supply_pressure", label: "Supply gauge pressure at the hub", kind: Q::Pressure, headline: false },
            OutputSpec { key: "efficiency", label: "Efficiency: shaft power ÷ (flow × total hub pressure)", kind: Q::Ratio, headline: false },
            OutputSpec { key: "density", label: "Fluid density", kind: Q::Density, headline: false },
        ],
        cautions: vec![
            "Idealised arm: uniform jets, no jet spreading, no bearing friction or windage except the load you give. Real arms and runners lose more and run slower than these figures.",
            "Anything that spins needs a guard and overspeed protection: a free-running arm fed at fixed pressure can reach a very high speed. Keep people out of the plane of rotation and the jets.",
            "For a machine bought in, the manufacturer's ratings govern; defer to the manufacturer and to a licensed engineer for speed limits, guarding and mounting loads.",
        ],
    }
}

/// How the arm is fed.
#[derive(Clone, Copy, Debug, PartialEq)]
enum Drive {
    /// Total flow, m³/s.
    Flow(f64),
    /// Supply gauge pressure at the hub, Pa.
    Pressure(f64),
}

/// What holds the arm back.
#[derive(Clone, Copy, Debug, PartialEq)]
enum Load {
    None,
    Constant(f64),
    /// Torque at a speed, scaling with speed^exponent.
    Power {
        torque: f64,
        speed: f64,
        exponent: i32,
    },
    Held(f64),
}

impl Load {
    /// Load torque at ω (not used for a held speed).
    fn torque(self, omega: f64) -> f64 {
        match self {
            Load::None | Load::Held(_) => 0.0,
            Load::Constant(t) => t,
            Load::Power {
                torque,
                speed,
                exponent,
            } => torque * (omega / speed).powi(exponent),
        }
    }
}

/// The validated arm.
#[derive(Clone, Debug)]
struct Arm {
    fluid: Fluid,
    nozzles: usize,
    radius: f64,
    nozzle_area: f64,
    nozzle_diameter: f64,
    alpha: f64,
    /// Loss coefficient on the jet speed, K = 1/C_v² − 1.
    k: f64,
    cv: f64,
    /// Hub bore area; `None` when the hub velocity head is neglected.
    hub_area: Option<f64>,
    drive: Drive,
}

/// The state of the arm at one speed, read from the engine.
#[derive(Clone, Debug)]
struct State {
    omega: f64,
    jet: f64,
    /// Torque the water delivers, with rounding residue shown as 0.
    torque: f64,
    /// The engine's torque as computed, for finding where it changes sign.
    raw_torque: f64,
    power: f64,
    flow: f64,
    /// Gauge pressure at the hub as the supply sees it (total when the bore is not given).
    supply_pressure: f64,
    balance: Balance,
}

impl Arm {
    /// Area the engine gives the hub port.
    fn hub_port_area(&self) -> f64 {
        // Bore not given: a notional bore of 100 × the nozzle area, whose velocity
        // head is added back (the supply pressure is then the total head).
        self.hub_area.unwrap_or(100.0 * self.nozzles as f64 * self.nozzle_area)
    }

    /// cos α, exactly zero for a radial jet (so that a 90° nozzle gives no torque
    /// rather than a rounding residue).
    fn cos_alpha(&self) -> f64 {
        if (self.alpha - PI / 2.0).abs() < 1e-12 {
            0.0
        } else {
            self.alpha.cos()
        }
    }

    /// Position and jet direction (relative to the nozzle) of nozzle `i`: the arm
    /// turns counter-clockwise about +z; the jet points against the rotation and
    /// leans outward by α.
    fn nozzle(&self, i: usize) -> (Vec3, Direction) {
        let theta = 2.0 * PI * i as f64 / self.nozzles as f64;
        let radial = Vec3::new(theta.cos(), theta.sin(), 0.0);
        let tangent = Vec3::new(-theta.sin(), theta.cos(), 0.0);
        let jet = tangent * (-self.cos_alpha()) + radial * self.alpha.sin();
        (radial * self.radius, Direction::new(jet).unwrap_or(Direction::X))
    }

    /// The control volume at speed ω with jet speed `jet`.
    fn control_volume(&self, omega: f64, jet: f64) -> ControlVolume {
        let mut cv = ControlVolume::new(self.fluid.clone());
        let hub_name = if self.hub_area.is_some() {
            "hub"
        } else {
            "hub (bore not given: notional)"
        };
        let hub = cv.port(Port::inlet(hub_name, si::area(self.hub_port_area()), Direction::Z).at(Vec3::ZERO));
        let mut first = None;
        for i in 0..self.nozzles {
            let (at, direction) = self.nozzle(i);
            let port = Port::outlet(&format!("nozzle {}", i + 1), si::area(self.nozzle_area), direction)
                .velocity(si::velocity(jet))
                .pressure(si::pressure(0.0))
                .at(at);
            let index = cv.port(port);
            first.get_or_insert(index);
        }
        // The nozzles are alike: one stream from the hub to the first solves the hub
        // pressure (rotating-frame Bernoulli with the nozzle loss).
        if let Some(out) = first {
            cv.stream(Stream::new(hub, out).loss(Loss::Coefficient {
                k: self.k,
                reference_port: out,
            }));
        }
        cv.frame(engine::Frame::Rotating {
            axis: Direction::Z,
            origin: Vec3::ZERO,
            omega,
        });
        cv
    }

    /// Pressure the supply must hold at the hub for jet speed `jet` at ω.
    fn supply_pressure_of(&self, balance: &Balance) -> f64 {
        let hub = &balance.ports[0];
        match self.hub_area {
            Some(_) => hub.pressure,
            None => hub.pressure + 0.5 * self.fluid.density * hub.speed * hub.speed,
        }
    }

    /// Balances the arm at ω.
    fn state(&self, omega: f64) -> Result<State, EngineError> {
        let jet = match self.drive {
            Drive::Flow(q) => q / (self.nozzles as f64 * self.nozzle_area),
            Drive::Pressure(p) => {
                // Hub pressure is a + b·W²: two balances fix a and b.
                let a = self.supply_pressure_of(&engine::balance(&self.control_volume(omega, 0.0))?);
                let b = self.supply_pressure_of(&engine::balance(&self.control_volume(omega, 1.0))?) - a;
                if b.is_nan() || b <= 0.0 {
                    return Err(EngineError::InvalidInput {
                        what: "the hub bore is too small: its velocity head exceeds the jets' and no jet speed matches the supply pressure",
                    });
                }
                ((p - a) / b).max(0.0).sqrt()
            }
        };
        let balance = engine::balance(&self.control_volume(omega, jet))?;
        let flow: f64 = balance.ports.iter().skip(1).map(|p| p.volume_flow).sum();
        // Rounding residue of the terms each result is summed from is the 0 it
        // stands for (a free-running arm's torque, the hub pressure at runaway).
        let (rho, r) = (self.fluid.density, self.radius);
        // The engine sums moments of jets of speed W leaving at R on a frame moving
        // at ωR: its rounding follows ρQR(W + ωR), whatever the nozzle angle.
        let torque_scale = rho * flow * r * (jet + omega * r);
        let raw_torque = balance.shaft_torque.unwrap_or(f64::NAN);
        let torque = zero_if_residue(raw_torque, torque_scale);
        // P = T·ω, from the torque as shown (the engine's power is the same product).
        let power = torque * omega;
        let hub_speed = balance.ports[0].speed;
        let pressure_scale = 0.5 * rho * (jet * jet * (1.0 + self.k) + (omega * r).powi(2) + hub_speed * hub_speed);
        Ok(State {
            omega,
            jet,
            torque,
            raw_torque,
            power,
            flow,
            supply_pressure: zero_if_residue(self.supply_pressure_of(&balance), pressure_scale),
            balance,
        })
    }

    /// The water's torque at ω as the engine computes it (residue included, so that
    /// a search for its zero is not stopped short by the band shown as 0).
    fn torque(&self, omega: f64) -> Result<f64, EngineError> {
        Ok(self.state(omega)?.raw_torque)
    }

    /// A speed scale: the runaway speed of the same arm with the stall jet speed.
    fn speed_scale(&self, stall_jet: f64) -> f64 {
        (stall_jet * self.cos_alpha().max(0.05) / self.radius).max(1e-6)
    }
}

/// `value`, or 0 when it is within [`RESIDUE`] of `scale`, the size of the terms it
/// was summed from.
fn zero_if_residue(value: f64, scale: f64) -> f64 {
    if value.abs() <= RESIDUE * scale.abs() {
        0.0
    } else {
        value
    }
}

/// Finds ω in [lo, hi] where `f` changes sign from positive to not positive.
fn bisect(mut lo: f64, mut hi: f64, f: impl Fn(f64) -> Result<f64, EngineError>) -> Result<f64, EngineError> {
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if f(mid)? > 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Ok(0.5 * (lo + hi))
}

/// Finds the first speed above `start` where `f` is not positive, doubling the
/// bracket up to `limit`; `None` when `f` stays positive.
fn bracket(start: f64, limit: f64, f: &impl Fn(f64) -> Result<f64, EngineError>) -> Result<Option<f64>, EngineError> {
    let mut hi = start.max(1e-9);
    while hi <= limit {
        if f(hi)? <= 0.0 {
            return Ok(Some(hi));
        }
        hi *= 2.0;
    }
    Ok(None)
}

fn read(values: &Values) -> Result<(Arm, Load), Vec<FieldError>> {
    let mut errors = Vec::new();
    let nozzles_raw = values.quantity("nozzles").map_err(|e| vec![e])?;
    if nozzles_raw.fract() != 0.0 {
        errors.push(FieldError::inconsistent(
            "nozzles",
            format!("the number of nozzles must be a whole number from 1 to {MAX_NOZZLES}"),
        ));
    }
    let radius = values.quantity("radius").map_err(|e| vec![e])?;
    let d_nozzle = values.quantity("d_nozzle").map_err(|e| vec![e])?;
    let alpha = values.quantity("alpha").map_err(|e| vec![e])?;
    let cv = values.quantity_or("cv", 1.0);
    let fluid = common::fluid_from(values)?;
    let drive = match values.choice("flow_given").map_err(|e| vec![e])? {
        "q" => match values.is_set("q") {
            true => Drive::Flow(values.quantity_or("q", 0.0)),
            false => {
                errors.push(FieldError::inconsistent("q", "a flow is required for a fixed-flow arm"));
                Drive::Flow(0.0)
            }
        },
        _ => match values.is_set("p") {
            true => Drive::Pressure(values.quantity_or("p", 0.0)),
            false => {
                errors.push(FieldError::inconsistent(
                    "p",
                    "a supply pressure is required for a pressure-fed arm",
                ));
                Drive::Pressure(0.0)
            }
        },
    };
    let need = |key: &'static str, what: &str, errors: &mut Vec<FieldError>| {
        if values.is_set(key) {
            values.quantity_or(key, 0.0)
        } else {
            errors.push(FieldError::inconsistent(
                key,
                format!("{what} is required for this load"),
            ));
            0.0
        }
    };
    let load = match values.choice("load").map_err(|e| vec![e])? {
        "constant" => Load::Constant(need("t_load", "a torque", &mut errors)),
        kind @ ("linear" | "quadratic") => Load::Power {
            torque: need("t_load", "a torque", &mut errors),
            speed: need("speed_load", "the speed of that torque", &mut errors),
            exponent: if kind == "linear" { 1 } else { 2 },
        },
        "speed" => Load::Held(need("speed_held", "a speed", &mut errors)),
        _ => Load::None,
    };
    if d_nozzle > 2.0 * radius {
        errors.push(FieldError::inconsistent(
            "d_nozzle",
            "the nozzle diameter must not exceed twice the nozzle radius (the nozzles would overlap the axis)",
        ));
    }
    let hub_area = values
        .is_set("d_hub")
        .then(|| common::circle_area(values.quantity_or("d_hub", 1.0)));
    let nozzles_area = nozzles_raw.max(1.0) * common::circle_area(d_nozzle);
    if hub_area.is_some_and(|a| a < nozzles_area) {
        errors.push(FieldError::inconsistent(
            "d_hub",
            format!(
                "the hub bore must pass the flow at least as freely as the nozzles: at least √N × the nozzle diameter ({}), or leave it empty",
                units::format_quantity_in((4.0 * nozzles_area / PI).sqrt(), Q::Length, "mm")
            ),
        ));
    }
    if !errors.is_empty() {
        return Err(errors);
    }
    let arm = Arm {
        fluid,
        nozzles: nozzles_raw as usize,
        radius,
        nozzle_area: common::circle_area(d_nozzle),
        nozzle_diameter: d_nozzle,
        alpha,
        k: 1.0 / (cv * cv) - 1.0,
        cv,
        hub_area,
        drive,
    };
    Ok((arm, load))
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let (arm, load) = read(values)?;
    let engine_field = match arm.drive {
        Drive::Flow(_) => "q",
        Drive::Pressure(_) => "p",
    };
    let fail = |e: EngineError| {
        let field = match e {
            EngineError::InvalidInput { what } if what.contains("hub bore") => "d_hub",
            _ => engine_field,
        };
        common::engine_error(e, field)
    };

    let stall = arm.state(0.0).map_err(fail)?;
    if !(stall.jet.is_finite() && stall.jet <= common::MAX_JET_SPEED) {
        return Err(vec![FieldError::inconsistent(
            engine_field,
            format!(
                "the jets leave the arm held still at {} m/s; free jets are handled up to {} m/s: check the flow, the pressure and the nozzle size",
                units::format_significant(stall.jet, 4),
                common::MAX_JET_SPEED
            ),
        )]);
    }
    let scale = arm.speed_scale(stall.jet);
    // No arm of this handbook turns faster than a nozzle speed of 2 km/s.
    let speed_limit = 2000.0 / arm.radius;
    let fluid_torque = |w: f64| arm.torque(w);

    // Runaway: the water's torque falls to zero.
    let runaway = if stall.torque <= 0.0 {
        Some(0.0)
    } else {
        match bracket(scale, speed_limit, &fluid_torque).map_err(fail)? {
            Some(hi) => Some(bisect(0.0, hi, fluid_torque).map_err(fail)?),
            None => None,
        }
    };

    // Operating point.
    let net = |w: f64| Ok(arm.torque(w)? - load.torque(w));
    let operating = match load {
        Load::Held(w) => Some(w),
        Load::None => runaway,
        _ if net(0.0).map_err(fail)? <= 0.0 => {
            report.warn(
                Some("t_load"),
                "the load torque at standstill is at least the stall torque: the arm does not start",
            );
            Some(0.0)
        }
        _ => match bracket(scale, speed_limit, &net).map_err(fail)? {
            Some(hi) => Some(bisect(0.0, hi, net).map_err(fail)?),
            None => {
                report.warn(
                    Some("t_load"),
                    "the water's torque stays above the load torque up to a nozzle speed of 2 km/s: there is no speed at the load in this model (a frictionless arm fed at fixed pressure runs away); give a larger friction or load torque",
                );
                None
            }
        },
    };

    if let Some(w) = runaway {
        report.output("runaway_speed", w);
    } else {
        report.warn(
            Some("cv"),
            "with a fixed supply pressure and C_v·cos α = 1 the water's torque never falls to zero: no finite runaway speed (only friction and windage limit it)",
        );
    }
    report.output("stall_torque", stall.torque);
    let closed_form = match arm.drive {
        Drive::Flow(_) => Some(stall.jet * arm.cos_alpha() / arm.radius),
        Drive::Pressure(p) if arm.hub_area.is_none() => {
            let c = arm.cv * arm.cos_alpha();
            (c < 1.0).then(|| c * (2.0 * p / arm.fluid.density).sqrt() / ((1.0 - c * c).sqrt() * arm.radius))
        }
        Drive::Pressure(_) => None,
    };
    // Fed at fixed pressure, the jet speed near runaway comes from a hub pressure
    // that nearly cancels the centrifugal head: the searched speed is good to about
    // 1e-12/(1 − c²)² of itself, so the tolerance follows that, and the comparison is
    // not made where it could no longer fail (c² within 1e-4 of 1).
    let tolerance = match arm.drive {
        Drive::Flow(_) => Some(1e-9),
        Drive::Pressure(_) => {
            let c = arm.cv * arm.cos_alpha();
            let gap = 1.0 - c * c;
            (gap >= 1e-4).then(|| 1e-9 + 1e-12 / (gap * gap))
        }
    };
    if let (Some(closed), Some(found), Some(tolerance)) = (closed_form, runaway, tolerance) {
        report.check(
            "Runaway speed (searched over the balances)",
            "closed form: fixed flow ω = W·cos α/R; fixed pressure ω = c·√(2p/ρ)/(R·√(1 − c²)), c = C_v·cos α",
            Q::AngularSpeed,
            found,
            closed,
            tolerance,
            0.0,
        );
    }

    // Largest power between standstill and runaway (power is zero at both ends with
    // one peak between).
    if let Some(top) = runaway.filter(|w| *w > 0.0) {
        let power = |w: f64| arm.state(w).map(|s| s.power);
        let w = common::peak_of(0.0, top, power).map_err(fail)?;
        report.output("max_power", power(w).map_err(fail)?);
        report.output("speed_at_max_power", w);
    }

    let shown = match operating {
        Some(w) => {
            let s = arm.state(w).map_err(fail)?;
            report.output("speed", s.omega);
            report.output("torque", s.torque);
            report.output("power", s.power);
            if matches!(load, Load::Held(_)) && s.torque < 0.0 {
                report.warn(
                    Some("speed_held"),
                    "the held speed is above the runaway speed: the shaft drives the arm, which then works as a pump (negative torque and power)",
                );
            }
            s
        }
        None => stall.clone(),
    };
    report.output("jet_velocity", shown.jet);
    report.output("tip_speed", shown.omega * arm.radius);
    report.output("jet_swirl", shown.jet * arm.cos_alpha() - shown.omega * arm.radius);
    report.output("flow", shown.flow);
    report.output("mass_flow", shown.flow * arm.fluid.density);
    report.output("supply_pressure", shown.supply_pressure);
    match efficiency_of(&shown, &load) {
        Ok(efficiency) => report.output("efficiency", efficiency),
        Err(reason) => report.warn(None, format!("Efficiency: not applicable, {reason}")),
    }
    independent_checks(report, &arm, &shown);
    report.output("density", arm.fluid.density);
    if shown.supply_pressure < 0.0 {
        report.warn(
            Some("q"),
            "at this speed the hub pressure comes out below atmospheric: the spinning arm pumps and would draw the flow in by itself",
        );
    }
    if arm.alpha >= PI / 2.0 - 1e-9 {
        report.warn(Some("alpha"), "a radial jet (90 deg) gives no torque");
    }
    common::forward_warnings(&shown.balance, report);

    let system = report.system();
    report.solution.tables.push(torque_ledger(&shown, system));
    report.solution.tables.push(common::ports_table(&shown.balance, system));
    report.solution.diagrams.push(diagram(&arm, &shown, report));
    plots(&arm, &load, operating, runaway, scale, report).map_err(fail)?;
    Ok(())
}

/// Shaft power over the hydraulic power the supply delivers, Q × total hub pressure;
/// or why that ratio means nothing at this state.
fn efficiency_of(state: &State, load: &Load) -> Result<f64, &'static str> {
    if matches!(load, Load::None) {
        return Err("the arm runs free (no load): it takes no shaft power, so all the supply's energy leaves in the jets and the nozzle loss");
    }
    if state.power < 0.0 {
        return Err("the shaft drives the arm at this speed (it works as a pump): the ratio of shaft to supply power has no meaning");
    }
    if !(state.supply_pressure > 0.0 && state.flow > 0.0) {
        return Err("the hub pressure is not above atmospheric at this speed, so the supply delivers no hydraulic power to compare with");
    }
    Ok(state.power / (state.flow * state.supply_pressure))
}

/// Checks of the state shown against paths that do not go through the engine's
/// angular-momentum balance:
///
/// - torque: N nozzles, each with the tangential reaction of its jet,
///   ṁ_n·(W·cos α − ωR), at the radius R;
/// - power: T·ω against the energy balance in the fixed frame, the hydraulic power
///   the supply delivers, Q·p_total, less the kinetic energy the jets carry off,
///   ṁ·|V|²/2 with V = W + ωR, and the nozzle loss ṁ·K·W²/2.
fn independent_checks(report: &mut Report<'_>, arm: &Arm, state: &State) {
    let rho = arm.fluid.density;
    let (r, w, omega) = (arm.radius, state.jet, state.omega);
    let mass_flow = rho * state.flow;
    let per_nozzle = mass_flow / arm.nozzles as f64;
    let tangential = w * arm.cos_alpha() - omega * r;
    let torque = arm.nozzles as f64 * per_nozzle * tangential * r;
    let torque_scale = mass_flow * r * (w + omega * r);
    report.check(
        "Torque delivered to the shaft",
        "N × tangential jet reaction ṁ_n(W·cos α − ωR) × R",
        Q::Torque,
        state.torque,
        torque,
        1e-9,
        torque_scale,
    );
    let hub_speed = state.flow / arm.hub_port_area();
    let total_hub_pressure = match arm.hub_area {
        // A given bore: the supply pressure is static; add the hub velocity head.
        Some(_) => state.supply_pressure + 0.5 * rho * hub_speed * hub_speed,
        // No bore: the supply pressure is already the total head.
        None => state.supply_pressure,
    };
    let jet_speed_squared = tangential * tangential + (w * arm.alpha.sin()).powi(2);
    let carried = 0.5 * mass_flow * jet_speed_squared;
    let loss = 0.5 * mass_flow * arm.k * w * w;
    let supplied = state.flow * total_hub_pressure;
    report.check(
        "Shaft power T·ω",
        "energy balance: Q·p_total at the hub − jets' kinetic energy ṁV²/2 − nozzle loss ṁ·K·W²/2",
        Q::Power,
        state.power,
        supplied - carried - loss,
        1e-9,
        supplied.abs() + 0.5 * mass_flow * (w * w * (1.0 + arm.k) + (omega * r).powi(2)),
    );
}

/// The angular-momentum ledger about the axis: each nozzle's moment of momentum
/// outflow and pressure moment, the torque the shaft supplies and the torque the
/// water delivers.
fn torque_ledger(state: &State, system: UnitSystem) -> Table {
    let b = &state.balance;
    let o = b.moment_point;
    let mut rows: Vec<(String, f64)> = Vec::new();
    for p in &b.ports {
        let flux = (p.position - o).cross(p.momentum_outflow).z;
        let pressure = -(p.position - o).cross(p.pressure_force).z;
        rows.push((format!("{}: moment of momentum out, r × ±ṁV", p.name), flux));
        if pressure != 0.0 {
            rows.push((format!("{}: pressure moment, r × p·A·n", p.name), pressure));
        }
    }
    let total = rows.len();
    rows.push((
        "M = torque the shaft exerts on the arm (sum)".to_string(),
        b.support_moment.z,
    ));
    rows.push((
        "T = torque the water delivers to the shaft, −M".to_string(),
        state.torque,
    ));
    let max = rows.iter().map(|(_, v)| v.abs()).fold(0.0, f64::max);
    let unit = units::display_unit(max, Q::Torque, system).id;
    Table {
        key: "torque_ledger",
        title: "Angular-momentum ledger about the axis (rotating CV, absolute velocities V = W + ω×r)".to_string(),
        columns: vec!["Term".to_string(), format!("about +z ({unit})")],
        rows: rows
            .into_iter()
            .map(|(label, v)| {
                vec![
                    label,
                    units::convert_to(v, Q::Torque, unit)
                        .map(|x| units::format_significant(x, 4))
                        .unwrap_or_else(|| "—".to_string()),
                ]
            })
            .collect(),
        emphasised_rows: vec![total, total + 1],
    }
}

fn diagram(arm: &Arm, state: &State, report: &Report<'_>) -> Diagram {
    let r = arm.radius;
    let mut shapes = Vec::new();
    let width = (2.5 * arm.nozzle_diameter).max(r / 25.0);
    let hub_radius = arm.hub_area.map(|a| (a / PI).sqrt()).unwrap_or(0.0).max(1.5 * width);
    for i in 0..arm.nozzles {
        let (at, _) = arm.nozzle(i);
        shapes.push(Shape::Polygon {
            points: common::straight_band([0.0, 0.0], at.xy(), width),
            style: ShapeStyle::Wall,
        });
    }
    shapes.push(Shape::Circle {
        center: [0.0, 0.0],
        radius: hub_radius,
        style: ShapeStyle::Wall,
    });
    shapes.push(Shape::Circle {
        center: [0.0, 0.0],
        radius: r,
        style: ShapeStyle::Guide,
    });
    shapes.push(Shape::Circle {
        center: [0.0, 0.0],
        radius: r + 1.5 * width,
        style: ShapeStyle::ControlVolume,
    });
    // Velocity arrows: the largest of W, ωR and V drawn 0.7 R long.
    let u = state.omega * r;
    let w_vec = |i: usize| arm.nozzle(i).1.vec() * state.jet;
    let biggest = [state.jet, u, (w_vec(0) + Vec3::new(0.0, u, 0.0)).norm()]
        .into_iter()
        .fold(0.0, f64::max);
    let scale = if biggest > 0.0 { 0.7 * r / biggest } else { 0.0 };
    let fmt = |v: f64| report.fmt(v, Q::Velocity);
    for i in 0..arm.nozzles {
        let (at, _) = arm.nozzle(i);
        let w = w_vec(i);
        let label = if i == 0 {
            format!("W {}", fmt(state.jet))
        } else {
            String::new()
        };
        if let Some(a) = common::force_arrow(at.xy(), w, scale, label, ShapeStyle::Flow, true) {
            shapes.push(a);
        }
    }
    let (at0, _) = arm.nozzle(0);
    let u_vec = Vec3::new(0.0, u, 0.0);
    if let Some(a) = common::force_arrow(
        at0.xy(),
        u_vec,
        scale,
        format!("u = ωR {}", fmt(u)),
        ShapeStyle::Velocity,
        true,
    ) {
        shapes.push(a);
    }
    let v = w_vec(0) + u_vec;
    if let Some(a) = common::force_arrow(
        at0.xy(),
        v,
        scale,
        format!("V = W + u {}", fmt(v.norm())),
        ShapeStyle::Momentum,
        true,
    ) {
        shapes.push(a);
    }
    // Sense of rotation: an arc at 0.45 R in the lower left (clear of the velocity
    // arrows at the first nozzle), ending in an arrow head.
    let arc_r = 0.45 * r;
    let arc: Vec<[f64; 2]> = (0..=16)
        .map(|s| {
            let a = 1.08 * PI + (0.3 * PI) * s as f64 / 16.0;
            [arc_r * a.cos(), arc_r * a.sin()]
        })
        .collect();
    let end = arc[arc.len() - 1];
    let before = arc[arc.len() - 2];
    shapes.push(Shape::Polyline {
        points: arc,
        style: ShapeStyle::Guide,
    });
    shapes.push(Shape::Arrow {
        from: before,
        to: end,
        label: "ω".to_string(),
        style: ShapeStyle::Guide,
    });
    // Speed and torque below the drawing, clear of arms and jets for any N.
    shapes.push(Shape::Text {
        at: [0.0, -1.3 * r],
        text: format!(
            "ω {} counter-clockwise, T {}",
            report.fmt(state.omega, Q::AngularSpeed),
            report.fmt(state.torque, Q::Torque)
        ),
        style: ShapeStyle::Label,
    });
    shapes.push(Shape::Text {
        at: [0.5 * r, -0.12 * r],
        text: format!("R {}", report.fmt(r, Q::Length)),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.15 * r);
    Diagram {
        title: "Reaction arm, plan view: rotating control volume and jet velocities".to_string(),
        bounds,
        shapes,
        caption: "Arm radius to scale (arm width and nozzles drawn wider than life); the arm turns counter-clockwise, its jets point back against the rotation. Velocity arrows at the nozzles share one velocity scale: W relative to the nozzle, u = ωR the nozzle's own speed, V = W + u the absolute jet velocity (drawn in the momentum-flux colour: the flux is ṁV) whose tangential part sets the torque.".to_string(),
    }
}

/// Unit for a plot axis in the report's system, and the conversion.
fn axis_unit(max_abs: f64, kind: Q, system: UnitSystem) -> &'static str {
    units::display_unit(max_abs, kind, system).id
}

fn plots(
    arm: &Arm,
    load: &Load,
    operating: Option<f64>,
    runaway: Option<f64>,
    scale: f64,
    report: &mut Report<'_>,
) -> Result<(), EngineError> {
    let system = report.system();
    let top = match runaway {
        Some(w) if w > 0.0 => 1.1 * w.max(operating.unwrap_or(0.0)),
        _ => 1.5 * operating.unwrap_or(0.0).max(3.0 * scale),
    };
    let mut states = Vec::with_capacity(PLOT_POINTS);
    for i in 0..PLOT_POINTS {
        let w = top * i as f64 / (PLOT_POINTS - 1) as f64;
        states.push(arm.state(w)?);
    }
    let conv = |v: f64, kind: Q, unit: &str| units::convert_to(v, kind, unit).unwrap_or(f64::NAN);
    let speed_unit = axis_unit(top, Q::AngularSpeed, system);
    let max_torque = states.iter().map(|s| s.torque.abs()).fold(0.0, f64::max);
    let torque_unit = axis_unit(max_torque, Q::Torque, system);
    let max_power = states.iter().map(|s| s.power.abs()).fold(0.0, f64::max);
    let power_unit = axis_unit(max_power, Q::Power, system);
    let x = |w: f64| conv(w, Q::AngularSpeed, speed_unit);

    let mut torque_series = vec![Series {
        name: "torque of the water".to_string(),
        points: states
            .iter()
            .map(|s| [x(s.omega), conv(s.torque, Q::Torque, torque_unit)])
            .collect(),
    }];
    if matches!(load, Load::Constant(_) | Load::Power { .. }) {
        torque_series.push(Series {
            name: "load torque".to_string(),
            points: states
                .iter()
                .map(|s| [x(s.omega), conv(load.torque(s.omega), Q::Torque, torque_unit)])
                .collect(),
        });
    }
    let mut torque_markers = vec![Marker {
        at: [0.0, conv(states[0].torque, Q::Torque, torque_unit)],
        label: "stall".to_string(),
    }];
    let mut power_markers = Vec::new();
    if let Some(w) = runaway {
        torque_markers.push(Marker {
            at: [x(w), 0.0],
            label: "runaway".to_string(),
        });
    }
    if let Some(w) = operating {
        let s = arm.state(w)?;
        torque_markers.push(Marker {
            at: [x(w), conv(s.torque, Q::Torque, torque_unit)],
            label: "at the load".to_string(),
        });
        power_markers.push(Marker {
            at: [x(w), conv(s.power, Q::Power, power_unit)],
            label: "at the load".to_string(),
        });
    }
    if let Some(peak) = report.solution.output("speed_at_max_power").map(|o| o.si) {
        let p = report.solution.output("max_power").map(|o| o.si).unwrap_or(0.0);
        power_markers.push(Marker {
            at: [x(peak), conv(p, Q::Power, power_unit)],
            label: "largest power".to_string(),
        });
    }
    report.solution.plots.push(Plot {
        key: "torque_speed",
        title: "Torque against speed".to_string(),
        x_label: format!("speed ({speed_unit})"),
        y_label: format!("torque ({torque_unit})"),
        series: torque_series,
        markers: torque_markers,
    });
    report.solution.plots.push(Plot {
        key: "power_speed",
        title: "Shaft power against speed".to_string(),
        x_label: format!("speed ({speed_unit})"),
        y_label: format!("power ({power_unit})"),
        series: vec![Series {
            name: "shaft power".to_string(),
            points: states
                .iter()
                .map(|s| [x(s.omega), conv(s.power, Q::Power, power_unit)])
                .collect(),
        }],
        markers: power_markers,
    });
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalog::Request;
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
                &[("load", "none"), ("alpha", alpha), ("cv", "1"), ("nozzles", "3")],
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
        let (field, message) = crate::calculators::testing::first_error(KEY, &[("d_hub", "40 mm")]);
        assert_eq!(field, "d_hub");
        assert!(message.contains("50.00 mm"), "{message}");
        // 100 m³/s through four 0.5 mm nozzles would leave at 1.3e8 m/s: refused.
        let (field, message) =
            crate::calculators::testing::first_error(KEY, &[("q", "100 m3/s"), ("d_nozzle", "0.5 mm")]);
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
                    let a = arm(nozzles, alpha, Drive::Flow(0.002));
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
    fn pressure_fed_jet_follows_rotating_frame_bernoulli() {
        // Derived from the definition: W = C_v √(2p/ρ + ω²R²) with the hub head neglected.
        let mut a = arm(2, 0.0, Drive::Pressure(3e5));
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
        let s = crate::solve(KEY, &request(&[("load", "speed"), ("speed_held", "60 rpm")]))
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
}
