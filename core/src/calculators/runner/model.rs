//! The runner's model: the typed inputs read once from the values, and the pure
//! physics (velocity triangles, the engine's angular-momentum and energy balances in
//! the rotating frame, the Euler head against flow) returning a typed result. The
//! method is in the page's module doc ([`super`]).

use std::f64::consts::PI;

use uom::si::f64::{Angle, AngularVelocity, Area, Length, ThermodynamicTemperature, VolumeRate};

use crate::catalog::{FromSi, Values};
use crate::engine::{self, si, Balance, ControlVolume, EngineError, Port, Stream};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::units::{self, QuantityKind as Q, STANDARD_GRAVITY};
use crate::vector::{Direction, Vec3};

use super::pump::{self, PumpInputs, PumpSolved};
use super::{MAX_BLADE_SPEED, RESIDUE};
use crate::calculators::common;

/// Points of the Euler head against flow curve.
const CURVE_POINTS: usize = 40;

/// The blade stations as typed.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Stations {
    /// Radii and blade heights at the blade inlet (1) and outlet (2).
    Radial {
        r1: Length,
        r2: Length,
        b1: Length,
        b2: Length,
    },
    /// Mean radius and annulus areas at the inlet and outlet.
    Axial { r_mean: Length, a1: Area, a2: Area },
}

/// The runner as typed, read once from the values ([`read`]).
#[derive(Clone, Debug)]
pub struct Inputs {
    pub machine: Machine,
    pub stations: Stations,
    pub fluid: Fluid,
    pub speed: AngularVelocity,
    pub flow: VolumeRate,
    /// Guide-vane angle (90° when left empty: no pre-swirl).
    pub alpha1: Angle,
    /// Inlet blade angle; `None`: taken to match the inlet flow.
    pub beta1: Option<Angle>,
    pub beta2: Angle,
    /// Net head, for the hydraulic efficiency.
    pub head: Option<Length>,
    /// A pump's slip correlation and suction (none for a turbine).
    pub pump: PumpInputs,
    /// The water's temperature, when the fluid is water from its temperature.
    pub water_temperature: Option<ThermodynamicTemperature>,
}

/// Turbine or pump.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Machine {
    Turbine,
    Pump,
}

/// The velocity triangle at one station.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Triangle {
    pub radius: f64,
    pub area: f64,
    pub u: f64,
    pub vm: f64,
    pub vtheta: f64,
}

impl Triangle {
    pub fn w_theta(&self) -> f64 {
        self.vtheta - self.u
    }
    pub fn v(&self) -> f64 {
        self.vm.hypot(self.vtheta)
    }
    pub fn w(&self) -> f64 {
        self.vm.hypot(self.w_theta())
    }
    /// Absolute flow angle from the direction of blade motion.
    pub fn alpha(&self) -> f64 {
        self.vm.atan2(self.vtheta)
    }
    /// Relative flow angle from the direction opposite to the blade motion.
    pub fn beta(&self) -> f64 {
        self.vm.atan2(self.u - self.vtheta)
    }
}

/// The runner in SI numbers, as the model computes with it.
#[derive(Clone, Debug)]
pub struct Runner {
    pub machine: Machine,
    pub axial: bool,
    pub fluid: Fluid,
    pub omega: f64,
    pub flow: f64,
    /// Radius and flow area of each station.
    pub inlet: (f64, f64),
    pub outlet: (f64, f64),
    pub alpha1: f64,
    pub beta1: Option<f64>,
    pub beta2: f64,
}

impl Runner {
    /// The runner of typed inputs.
    pub fn new(inputs: &Inputs) -> Runner {
        let (inlet, outlet) = match inputs.stations {
            Stations::Radial { r1, r2, b1, b2 } => (
                (r1.value, 2.0 * PI * r1.value * b1.value),
                (r2.value, 2.0 * PI * r2.value * b2.value),
            ),
            Stations::Axial { r_mean, a1, a2 } => ((r_mean.value, a1.value), (r_mean.value, a2.value)),
        };
        Runner {
            machine: inputs.machine,
            axial: matches!(inputs.stations, Stations::Axial { .. }),
            fluid: inputs.fluid.clone(),
            omega: inputs.speed.value,
            flow: inputs.flow.value,
            inlet,
            outlet,
            alpha1: inputs.alpha1.value,
            beta1: inputs.beta1.map(|b| b.value),
            beta2: inputs.beta2.value,
        }
    }

    pub fn triangles(&self, flow: f64) -> (Triangle, Triangle) {
        let station = |(radius, area): (f64, f64)| Triangle {
            radius,
            area,
            u: self.omega * radius,
            vm: flow / area,
            vtheta: 0.0,
        };
        let mut t1 = station(self.inlet);
        let mut t2 = station(self.outlet);
        t1.vtheta = t1.vm / self.alpha1.tan();
        if (self.alpha1 - PI / 2.0).abs() < 1e-12 {
            t1.vtheta = 0.0;
        }
        t2.vtheta = t2.u - t2.vm / self.beta2.tan();
        if (self.beta2 - PI / 2.0).abs() < 1e-12 {
            t2.vtheta = t2.u;
        }
        (t1, t2)
    }

    /// Meridional direction of the flow at a station and the port position: radial
    /// machines put the stations on the x axis (flow inward for a turbine, outward
    /// for a pump), axial machines at the mean radius with the flow along −z.
    pub fn geometry(&self, t: &Triangle) -> (Vec3, Vec3) {
        let position = Vec3::new(t.radius, 0.0, 0.0);
        let meridional = match (self.axial, self.machine) {
            (true, _) => Vec3::new(0.0, 0.0, -1.0),
            (false, Machine::Turbine) => Vec3::new(-1.0, 0.0, 0.0),
            (false, Machine::Pump) => Vec3::new(1.0, 0.0, 0.0),
        };
        (position, meridional)
    }

    /// The rotating control volume around the blades; `energy` leaves the outlet
    /// pressure to the energy balance (the momentum balance uses zero pressures, see
    /// the module doc).
    pub fn control_volume(&self, t1: &Triangle, t2: &Triangle, flow: f64, energy: bool) -> ControlVolume {
        let mut cv = ControlVolume::new(self.fluid.clone());
        let port = |t: &Triangle, name: &str, inlet: bool| {
            let (at, m) = self.geometry(t);
            // Relative velocity: meridional part plus W_θ along the direction of
            // blade motion (+y at a station on the +x axis, rotation about +z).
            let w = m * t.vm + Vec3::new(0.0, t.w_theta(), 0.0);
            let direction = Direction::new(w).unwrap_or(Direction::X);
            let area = si::area(flow / w.norm().max(f64::MIN_POSITIVE));
            let p = if inlet {
                Port::inlet(name, area, direction).volume_flow(si::volume_flow(flow))
            } else {
                Port::outlet(name, area, direction)
            };
            p.at(at)
        };
        let i = cv.port(port(t1, "blade inlet (1)", true).pressure(si::pressure(0.0)));
        let mut outlet = port(t2, "blade outlet (2)", false);
        if !energy {
            outlet = outlet.pressure(si::pressure(0.0));
        }
        let o = cv.port(outlet);
        if energy {
            cv.stream(Stream::new(i, o));
        }
        cv.frame(engine::Frame::Rotating {
            axis: Direction::Z,
            origin: Vec3::ZERO,
            omega: self.omega,
        });
        cv
    }

    /// Torque the water delivers to the shaft at `flow` (negative for a pump).
    pub fn momentum(&self, flow: f64) -> Result<(Triangle, Triangle, Balance), EngineError> {
        let (t1, t2) = self.triangles(flow);
        let balance = engine::balance(&self.control_volume(&t1, &t2, flow, false))?;
        Ok((t1, t2, balance))
    }

    /// Euler head in the machine's own sense from the engine's torque.
    pub fn euler_head(&self, torque: f64, flow: f64) -> f64 {
        let sign = if self.machine == Machine::Turbine { 1.0 } else { -1.0 };
        sign * torque * self.omega / (self.fluid.density * STANDARD_GRAVITY * flow)
    }
}

/// A quantity the chosen layout needs.
fn required<T: FromSi>(values: &Values, key: &'static str, errors: &mut FieldErrors) -> T {
    values.typed_opt::<T>(key).unwrap_or_else(|| {
        errors.push(FieldError::inconsistent(key, "a value is required for this layout"));
        T::from_si(1.0)
    })
}

/// Reads the runner's values once into typed inputs.
///
/// # Errors
/// Every field that makes the runner impossible, each naming the field.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let mut errors = FieldErrors::default();
    let machine = match values.choice("machine")? {
        "turbine" => Machine::Turbine,
        _ => Machine::Pump,
    };
    let stations = if values.choice("layout")? == "axial" {
        Stations::Axial {
            r_mean: required(values, "r_mean", &mut errors),
            a1: required(values, "a1", &mut errors),
            a2: required(values, "a2", &mut errors),
        }
    } else {
        Stations::Radial {
            r1: required(values, "r1", &mut errors),
            r2: required(values, "r2", &mut errors),
            b1: required(values, "b1", &mut errors),
            b2: required(values, "b2", &mut errors),
        }
    };
    let fluid = common::fluid_from(values)?;
    let speed: AngularVelocity = values.typed("speed")?;
    let flow: VolumeRate = values.typed("q")?;
    let beta2: Angle = values.typed("beta2")?;
    let largest_radius = match stations {
        Stations::Radial { r1, r2, .. } => r1.value.max(r2.value),
        Stations::Axial { r_mean, .. } => r_mean.value,
    };
    let fastest = speed.value * largest_radius;
    if fastest > MAX_BLADE_SPEED {
        errors.push(FieldError::inconsistent(
            "speed",
            format!(
                "at this speed the blades move at {} at the larger radius, above the {} m/s of any water runner \
                 or impeller: check the speed and the radii",
                units::format_quantity_in(fastest, Q::Velocity, "m/s"),
                MAX_BLADE_SPEED
            ),
        ));
    }
    let pump = pump::read(values, machine).unwrap_or_else(|e| {
        for error in Vec::from(e) {
            errors.push(error);
        }
        PumpInputs {
            slip: None,
            suction: None,
        }
    });
    errors.or_ok(Inputs {
        pump,
        water_temperature: pump::water_temperature(values).map(ThermodynamicTemperature::from_si),
        machine,
        stations,
        fluid,
        speed,
        flow,
        alpha1: values.typed_opt("alpha1").unwrap_or(Angle::from_si(PI / 2.0)),
        beta1: values.typed_opt("beta1"),
        beta2,
        head: values.typed_opt("head"),
    })
}

/// Everything the report shows, computed once.
#[derive(Clone, Debug)]
pub struct Solved {
    pub runner: Runner,
    /// Net head given, for the efficiency.
    pub head: Option<f64>,
    pub inlet: Triangle,
    pub outlet: Triangle,
    /// The angular-momentum balance (zero station pressures).
    pub balance: Balance,
    /// Torque the water delivers to the shaft, residue shown as 0.
    pub water_torque: f64,
    /// Shaft torque in the machine's sense (turbine: delivered; pump: needed).
    pub torque: f64,
    pub euler_head: f64,
    /// Static pressure change p₂ − p₁ from the energy balance.
    pub pressure_rise: f64,
    /// (flow, Euler head) from a little above zero to 1.6 × the flow.
    pub curve: Vec<[f64; 2]>,
    /// A pump's slip, specific speed and NPSH available.
    pub pump: PumpSolved,
    /// The water's temperature, K, when the fluid is water from its temperature.
    pub water_temperature: Option<f64>,
}

/// Solves the runner's triangles and balances.
///
/// # Errors
/// The flow field when the engine refuses the case.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let runner = Runner::new(inputs);
    let fail = |e: EngineError| -> FieldErrors { common::engine_error(e, "q").into() };
    let flow = runner.flow;
    let (t1, t2, balance) = runner.momentum(flow).map_err(fail)?;
    // A torque that is rounding residue of the moments of momentum it is summed from
    // (inlet and outlet swirl moments that balance) is the 0 it stands for.
    let moment_scale = moment_scale(&runner, &t1, &t2);
    let water_torque = balance.shaft_torque.unwrap_or(f64::NAN);
    let water_torque = if water_torque.abs() <= RESIDUE * moment_scale {
        0.0
    } else {
        water_torque
    };
    let euler_head = runner.euler_head(water_torque, flow);
    let torque = match runner.machine {
        Machine::Turbine => water_torque,
        Machine::Pump => -water_torque,
    };
    let energy = engine::balance(&runner.control_volume(&t1, &t2, flow, true)).map_err(fail)?;
    let pressure_rise = energy.ports[1].pressure - energy.ports[0].pressure;
    let top = 1.6 * flow;
    let curve = (1..=CURVE_POINTS)
        .map(|i| {
            let q = top * i as f64 / CURVE_POINTS as f64;
            let (_, _, b) = runner.momentum(q)?;
            Ok([q, runner.euler_head(b.shaft_torque.unwrap_or(f64::NAN), q)])
        })
        .collect::<Result<Vec<[f64; 2]>, EngineError>>()
        .map_err(fail)?;
    let pump = pump::solve(
        &inputs.pump,
        &runner,
        &t1,
        &t2,
        euler_head,
        inputs.head.map(|h| h.value),
    )
    .map_err(fail)?;
    Ok(Solved {
        pump,
        water_temperature: inputs.water_temperature.map(|t| t.value),
        head: inputs.head.map(|h| h.value),
        runner,
        inlet: t1,
        outlet: t2,
        balance,
        water_torque,
        torque,
        euler_head,
        pressure_rise,
        curve,
    })
}

/// The size of the moments of momentum the engine sums: it writes each swirl as the
/// relative swirl plus the blade speed, so its rounding follows ρQ·r·(|V_θ| + u).
pub fn moment_scale(runner: &Runner, t1: &Triangle, t2: &Triangle) -> f64 {
    let station = |t: &Triangle| t.radius * (t.vtheta.abs() + t.u.abs());
    runner.fluid.density * runner.flow * (station(t1) + station(t2))
}
