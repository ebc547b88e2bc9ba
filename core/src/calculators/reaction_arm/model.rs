//! The reaction arm's model: the typed inputs read once from the values, and the
//! pure physics (engine balances at a speed, runaway, the speed at the load, the
//! largest power, the torque and power curves) returning a typed result. The method
//! is in the page's module doc ([`super`]).

use std::f64::consts::PI;

use uom::si::f64::{Angle, AngularVelocity, Length, Pressure, Ratio, Torque, VolumeRate};

use crate::catalog::{FromSi, Values};
use crate::engine::{self, si, Balance, ControlVolume, EngineError, Loss, Port, Stream};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::units::{self, QuantityKind as Q};
use crate::vector::{Direction, Vec3};

use super::{MAX_NOZZLES, PLOT_POINTS, RESIDUE};
use crate::calculators::common;

const HUB_BORE_TOO_SMALL: &str =
    "the hub bore is too small: its velocity head exceeds the jets' and no jet speed matches the supply \
            pressure";
const RUNS_FREE: &str = "the arm runs free (no load): it takes no shaft power, so all the supply's energy leaves \
    in the jets and the nozzle loss";
const SHAFT_DRIVES: &str = "the shaft drives the arm at this speed (it works as a pump): the ratio of shaft to \
    supply power has no meaning";
const NO_HUB_PRESSURE: &str = "the hub pressure is not above atmospheric at this speed, so the supply delivers no \
    hydraulic power to compare with";

/// How the arm is fed.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Drive {
    /// Total flow through all nozzles.
    Flow(VolumeRate),
    /// Supply gauge pressure at the hub.
    Pressure(Pressure),
}

/// What holds the arm back.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Load {
    None,
    Constant(Torque),
    /// Torque at a speed, scaling with speed^exponent.
    Power {
        torque: Torque,
        speed: AngularVelocity,
        exponent: i32,
    },
    Held(AngularVelocity),
}

impl Load {
    /// Load torque at ω in N·m, ω in rad/s (not used for a held speed).
    pub fn torque(self, omega: f64) -> f64 {
        match self {
            Load::None | Load::Held(_) => 0.0,
            Load::Constant(t) => t.value,
            Load::Power {
                torque,
                speed,
                exponent,
            } => torque.value * (omega / speed.value).powi(exponent),
        }
    }
}

/// Friction of the arm's bearings and seals: a constant torque, and optionally a
/// viscous part proportional to speed, given as its torque at a speed.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Friction {
    pub constant: Option<Torque>,
    pub viscous: Option<(Torque, AngularVelocity)>,
}

impl Friction {
    /// Whether any friction was given.
    pub fn is_some(self) -> bool {
        self.constant.is_some() || self.viscous.is_some()
    }
    /// The constant part, N·m.
    pub fn constant_torque(self) -> f64 {
        self.constant.map_or(0.0, |t| t.value)
    }
    /// The viscous coefficient, N·m per rad/s.
    pub fn viscous_coefficient(self) -> f64 {
        self.viscous.map_or(0.0, |(t, w)| t.value / w.value)
    }
    /// Friction torque at ω ≥ 0 (rad/s), N·m.
    pub fn torque(self, omega: f64) -> f64 {
        self.constant_torque() + self.viscous_coefficient() * omega
    }
}

/// The arm as typed, read once from the values ([`read`]).
#[derive(Clone, Debug)]
pub struct Inputs {
    pub fluid: Fluid,
    pub nozzles: usize,
    pub radius: Length,
    pub nozzle_diameter: Length,
    /// Nozzle angle to the tangent of the nozzle circle.
    pub alpha: Angle,
    /// Nozzle velocity coefficient C_v (1 when left empty: no loss).
    pub cv: Ratio,
    /// Hub bore; `None` when the hub velocity head is neglected.
    pub hub_bore: Option<Length>,
    pub drive: Drive,
    pub load: Load,
    /// Bearing and seal friction, besides the load.
    pub friction: Friction,
}

/// The arm in SI numbers, as the model computes with it.
#[derive(Clone, Debug)]
pub struct Arm {
    pub fluid: Fluid,
    pub nozzles: usize,
    pub radius: f64,
    pub nozzle_area: f64,
    pub nozzle_diameter: f64,
    pub alpha: f64,
    /// Loss coefficient on the jet speed, K = 1/C_v² − 1.
    pub k: f64,
    pub cv: f64,
    /// Hub bore area; `None` when the hub velocity head is neglected.
    pub hub_area: Option<f64>,
    pub drive: Drive,
}

/// The state of the arm at one speed, read from the engine.
#[derive(Clone, Debug)]
pub struct State {
    pub omega: f64,
    pub jet: f64,
    /// Torque the water delivers, with rounding residue shown as 0.
    pub torque: f64,
    /// The engine's torque as computed, for finding where it changes sign.
    pub raw_torque: f64,
    pub power: f64,
    pub flow: f64,
    /// Gauge pressure at the hub as the supply sees it (total when the bore is not given).
    pub supply_pressure: f64,
    pub balance: Balance,
}

impl Arm {
    /// The arm of typed inputs.
    pub fn new(inputs: &Inputs) -> Arm {
        let cv = inputs.cv.value;
        let nozzle_diameter = inputs.nozzle_diameter.value;
        Arm {
            fluid: inputs.fluid.clone(),
            nozzles: inputs.nozzles,
            radius: inputs.radius.value,
            nozzle_area: common::circle_area(nozzle_diameter),
            nozzle_diameter,
            alpha: inputs.alpha.value,
            k: 1.0 / (cv * cv) - 1.0,
            cv,
            hub_area: inputs.hub_bore.map(|d| common::circle_area(d.value)),
            drive: inputs.drive,
        }
    }

    /// Area the engine gives the hub port.
    pub fn hub_port_area(&self) -> f64 {
        // Bore not given: a notional bore of 100 × the nozzle area, whose velocity
        // head is added back (the supply pressure is then the total head).
        self.hub_area.unwrap_or(100.0 * self.nozzles as f64 * self.nozzle_area)
    }

    /// cos α, exactly zero for a radial jet (so that a 90° nozzle gives no torque
    /// rather than a rounding residue).
    pub fn cos_alpha(&self) -> f64 {
        if (self.alpha - PI / 2.0).abs() < 1e-12 {
            0.0
        } else {
            self.alpha.cos()
        }
    }

    /// Position and jet direction (relative to the nozzle) of nozzle `i`: the arm
    /// turns counter-clockwise about +z; the jet points against the rotation and
    /// leans outward by α.
    pub fn nozzle(&self, i: usize) -> (Vec3, Direction) {
        let theta = 2.0 * PI * i as f64 / self.nozzles as f64;
        let radial = Vec3::new(theta.cos(), theta.sin(), 0.0);
        let tangent = Vec3::new(-theta.sin(), theta.cos(), 0.0);
        let jet = tangent * (-self.cos_alpha()) + radial * self.alpha.sin();
        (radial * self.radius, Direction::new(jet).unwrap_or(Direction::X))
    }

    /// The control volume at speed ω with jet speed `jet`.
    pub fn control_volume(&self, omega: f64, jet: f64) -> ControlVolume {
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
    pub fn supply_pressure_of(&self, balance: &Balance) -> f64 {
        let hub = &balance.ports[0];
        match self.hub_area {
            Some(_) => hub.pressure,
            None => hub.pressure + 0.5 * self.fluid.density * hub.speed * hub.speed,
        }
    }

    /// Balances the arm at ω.
    pub fn state(&self, omega: f64) -> Result<State, EngineError> {
        let jet = match self.drive {
            Drive::Flow(q) => q.value / (self.nozzles as f64 * self.nozzle_area),
            Drive::Pressure(p) => {
                // Hub pressure is a + b·W²: two balances fix a and b.
                let a = self.supply_pressure_of(&engine::balance(&self.control_volume(omega, 0.0))?);
                let b = self.supply_pressure_of(&engine::balance(&self.control_volume(omega, 1.0))?) - a;
                if b.is_nan() || b <= 0.0 {
                    return Err(EngineError::InvalidInput {
                        what: HUB_BORE_TOO_SMALL,
                    });
                }
                ((p.value - a) / b).max(0.0).sqrt()
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
    pub fn torque(&self, omega: f64) -> Result<f64, EngineError> {
        Ok(self.state(omega)?.raw_torque)
    }

    /// A speed scale: the runaway speed of the same arm with the stall jet speed.
    pub fn speed_scale(&self, stall_jet: f64) -> f64 {
        (stall_jet * self.cos_alpha().max(0.05) / self.radius).max(1e-6)
    }
}

/// `value`, or 0 when it is within [`RESIDUE`] of `scale`, the size of the terms it
/// was summed from.
pub fn zero_if_residue(value: f64, scale: f64) -> f64 {
    if value.abs() <= RESIDUE * scale.abs() {
        0.0
    } else {
        value
    }
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

/// A required quantity of the chosen option, or `message` as the field's error.
fn required<T: FromSi>(values: &Values, key: &'static str, message: &str, errors: &mut FieldErrors) -> T {
    values.typed_opt::<T>(key).unwrap_or_else(|| {
        errors.push(FieldError::inconsistent(key, message));
        T::from_si(0.0)
    })
}

/// Reads the arm's values once into typed inputs.
///
/// # Errors
/// Every field that makes the arm impossible, each naming the field and the range.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let mut errors = FieldErrors::default();
    let nozzles_raw = values.quantity("nozzles")?;
    if nozzles_raw.fract() != 0.0 {
        errors.push(FieldError::inconsistent(
            "nozzles",
            format!("the number of nozzles must be a whole number from 1 to {MAX_NOZZLES}"),
        ));
    }
    let radius: Length = values.typed("radius")?;
    let nozzle_diameter: Length = values.typed("d_nozzle")?;
    let alpha: Angle = values.typed("alpha")?;
    let cv = values.typed_opt::<Ratio>("cv").unwrap_or(Ratio::from_si(1.0));
    let fluid = common::fluid_from(values)?;
    let drive = match values.choice("flow_given")? {
        "q" => Drive::Flow(required(
            values,
            "q",
            "a flow is required for a fixed-flow arm",
            &mut errors,
        )),
        _ => Drive::Pressure(required(
            values,
            "p",
            "a supply pressure is required for a pressure-fed arm",
            &mut errors,
        )),
    };
    const TORQUE_NEEDED: &str = "a torque is required for this load";
    let load = match values.choice("load")? {
        "constant" => Load::Constant(required(values, "t_load", TORQUE_NEEDED, &mut errors)),
        kind @ ("linear" | "quadratic") => Load::Power {
            torque: required(values, "t_load", TORQUE_NEEDED, &mut errors),
            speed: required(
                values,
                "speed_load",
                "the speed of that torque is required for this load",
                &mut errors,
            ),
            exponent: if kind == "linear" { 1 } else { 2 },
        },
        "speed" => Load::Held(required(
            values,
            "speed_held",
            "a speed is required for this load",
            &mut errors,
        )),
        _ => Load::None,
    };
    let friction = Friction {
        constant: values.typed_opt("t_bearing"),
        viscous: match (
            values.typed_opt::<Torque>("t_viscous"),
            values.typed_opt("speed_viscous"),
        ) {
            (None, _) => None,
            (Some(t), Some(w)) => Some((t, w)),
            (Some(t), None) => {
                errors.push(FieldError::inconsistent(
                    "speed_viscous",
                    "the speed at which the viscous friction torque applies is required",
                ));
                Some((t, AngularVelocity::from_si(1.0)))
            }
        },
    };
    if nozzle_diameter > 2.0 * radius {
        errors.push(FieldError::inconsistent(
            "d_nozzle",
            "the nozzle diameter must not exceed twice the nozzle radius (the nozzles would overlap the axis)",
        ));
    }
    let hub_bore: Option<Length> = values.typed_opt("d_hub");
    let nozzles_area = nozzles_raw.max(1.0) * common::circle_area(nozzle_diameter.value);
    if hub_bore.is_some_and(|d| common::circle_area(d.value) < nozzles_area) {
        errors.push(FieldError::inconsistent(
            "d_hub",
            format!(
                "the hub bore must pass the flow at least as freely as the nozzles: at least √N × the nozzle \
                 diameter ({}), or leave it empty",
                units::format_quantity_in((4.0 * nozzles_area / PI).sqrt(), Q::Length, "mm")
            ),
        ));
    }
    errors.or_ok(Inputs {
        fluid,
        nozzles: nozzles_raw as usize,
        radius,
        nozzle_diameter,
        alpha,
        cv,
        hub_bore,
        drive,
        load,
        friction,
    })
}

/// Where the arm settles under its load.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Operating {
    /// The water's torque equals the load torque at this speed (rad/s), or the
    /// machine holds this speed.
    At(f64),
    /// The load torque at standstill is at least the stall torque: the arm stays at 0.
    DoesNotStart,
    /// The water's torque stays above the load torque up to a nozzle speed of 2 km/s.
    LoadNeverBalances,
    /// No load and no finite runaway speed (fed at fixed pressure, C_v·cos α = 1).
    NoFiniteRunaway,
}

impl Operating {
    /// The speed at the load, rad/s, when there is one.
    pub fn speed(self) -> Option<f64> {
        match self {
            Operating::At(w) => Some(w),
            Operating::DoesNotStart => Some(0.0),
            Operating::LoadNeverBalances | Operating::NoFiniteRunaway => None,
        }
    }
}

/// The runaway speed's closed form and how closely the search must meet it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RunawayClosedForm {
    pub speed: f64,
    pub tolerance: f64,
}

/// Everything the report shows, computed once.
#[derive(Clone, Debug)]
pub struct Solved {
    pub arm: Arm,
    pub load: Load,
    pub friction: Friction,
    /// Where the water's torque equals the friction alone, rad/s (friction given).
    pub free_speed: Option<f64>,
    /// The arm held still.
    pub stall: State,
    /// Where the water's torque falls to zero, rad/s; `None` when it never does.
    pub runaway: Option<f64>,
    /// The closed form of the runaway speed, when it can be compared.
    pub runaway_closed_form: Option<RunawayClosedForm>,
    pub operating: Operating,
    /// The largest shaft power between standstill and runaway: (speed, power).
    pub peak: Option<(f64, f64)>,
    /// The state at the load (the stall state when there is no speed at the load).
    pub shown: State,
    /// The highest speed of the torque and power curves, rad/s (beyond runaway).
    pub curve_top: f64,
}

impl Solved {
    /// States at [`PLOT_POINTS`] speeds from standstill to [`Solved::curve_top`], for
    /// the torque and power curves. Balanced only when the plots are built (a full
    /// solve): they were about half of a headline solve's balances.
    ///
    /// # Errors
    /// The first balance that fails (the plots are then left out; every value shown
    /// comes from balances of its own).
    pub fn curve(&self) -> Result<Vec<State>, EngineError> {
        (0..PLOT_POINTS)
            .map(|i| self.arm.state(self.curve_top * i as f64 / (PLOT_POINTS - 1) as f64))
            .collect()
    }
}

/// Solves the arm: stall, runaway, the speed at the load and the largest power, all
/// from engine balances, and the top speed of the curves ([`Solved::curve`]).
///
/// # Errors
/// The field that makes the case impossible (the flow or pressure that drives the
/// arm, or the hub bore).
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let arm = Arm::new(inputs);
    let load = inputs.load;
    let engine_field = match arm.drive {
        Drive::Flow(_) => "q",
        Drive::Pressure(_) => "p",
    };
    let fail = |e: EngineError| -> FieldErrors {
        let field = match e {
            EngineError::InvalidInput { what } if what.contains("hub bore") => "d_hub",
            _ => engine_field,
        };
        common::engine_error(e, field).into()
    };

    let stall = arm.state(0.0).map_err(fail)?;
    if !(stall.jet.is_finite() && stall.jet <= common::MAX_JET_SPEED) {
        return Err(FieldError::inconsistent(
            engine_field,
            format!(
                "the jets leave the arm held still at {} m/s; free jets are handled up to {} m/s: check the \
                 flow, the pressure and the nozzle size",
                units::format_significant(stall.jet, 4),
                common::MAX_JET_SPEED
            ),
        )
        .into());
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
            Some(hi) => Some(crate::numeric::sign_change(0.0, hi, fluid_torque).map_err(fail)?),
            None => None,
        }
    };

    // Operating point: the water's torque against the load and the friction.
    let friction = inputs.friction;
    let balance_against = |resisting: &dyn Fn(f64) -> f64| -> Result<Operating, EngineError> {
        let net = |w: f64| Ok(arm.torque(w)? - resisting(w));
        if net(0.0)? <= 0.0 {
            return Ok(Operating::DoesNotStart);
        }
        Ok(match bracket(scale, speed_limit, &net)? {
            Some(hi) => Operating::At(crate::numeric::sign_change(0.0, hi, net)?),
            None => Operating::LoadNeverBalances,
        })
    };
    let operating = match load {
        Load::Held(w) => Operating::At(w.value),
        Load::None if !friction.is_some() => runaway.map_or(Operating::NoFiniteRunaway, Operating::At),
        _ => balance_against(&|w| load.torque(w) + friction.torque(w)).map_err(fail)?,
    };
    // Free running against the friction alone.
    let free_speed = if friction.is_some() {
        balance_against(&|w| friction.torque(w)).map_err(fail)?.speed()
    } else {
        None
    };

    let closed_form = match arm.drive {
        Drive::Flow(_) => Some(stall.jet * arm.cos_alpha() / arm.radius),
        Drive::Pressure(p) if arm.hub_area.is_none() => {
            let c = arm.cv * arm.cos_alpha();
            (c < 1.0).then(|| c * (2.0 * p.value / arm.fluid.density).sqrt() / ((1.0 - c * c).sqrt() * arm.radius))
        }
        Drive::Pressure(_) => None,
    };
    // Fed at fixed pressure, the jet speed near runaway comes from a hub pressure
    // that nearly cancels the centrifugal head: the searched speed is good to a few
    // 1e-12/(1 − c²)² of itself (fuzzing found 2.8e-12/(1 − c²)² at 100 MPa and
    // c = 0.985), so the tolerance is 1e-11/(1 − c²)², and the comparison is not
    // made where it could no longer fail (c² within 1e-4 of 1).
    let tolerance = match arm.drive {
        Drive::Flow(_) => Some(1e-9),
        Drive::Pressure(_) => {
            let c = arm.cv * arm.cos_alpha();
            let gap = 1.0 - c * c;
            (gap >= 1e-4).then(|| 1e-9 + 1e-11 / (gap * gap))
        }
    };
    let runaway_closed_form = match (closed_form, tolerance) {
        (Some(speed), Some(tolerance)) => Some(RunawayClosedForm { speed, tolerance }),
        _ => None,
    };

    // Largest power between standstill and runaway (power is zero at both ends with
    // one peak between).
    let peak = match runaway.filter(|w| *w > 0.0) {
        Some(top) => {
            let power = |w: f64| arm.state(w).map(|s| s.power);
            let w = common::peak_of(0.0, top, power).map_err(fail)?;
            Some((w, power(w).map_err(fail)?))
        }
        None => None,
    };

    let mut shown = match operating.speed() {
        Some(w) => arm.state(w).map_err(fail)?,
        None => stall.clone(),
    };
    // Where the speed balances the water's torque against the load and friction,
    // the torque delivered is the resisting torque there, by the definition of that
    // speed. It is read from the load's model (well conditioned) rather than from
    // the balance, whose torque near runaway is a small difference of large terms
    // (the checks still compare it with the jet reaction).
    let balanced = !matches!(load, Load::Held(_)) && (!matches!(load, Load::None) || friction.is_some());
    if let (Operating::At(w), true) = (operating, balanced) {
        shown.torque = load.torque(w) + friction.torque(w);
        shown.power = shown.torque * w;
    }

    let top = match runaway {
        Some(w) if w > 0.0 => 1.1 * w.max(operating.speed().unwrap_or(0.0)),
        _ => 1.5 * operating.speed().unwrap_or(0.0).max(3.0 * scale),
    };

    Ok(Solved {
        arm,
        load,
        friction,
        free_speed,
        stall,
        runaway,
        runaway_closed_form,
        operating,
        peak,
        shown,
        curve_top: top,
    })
}

/// Shaft power over the hydraulic power the supply delivers, Q × total hub pressure;
/// or why that ratio means nothing at this state.
pub fn efficiency_of(state: &State, load: &Load) -> Result<f64, &'static str> {
    if matches!(load, Load::None) {
        return Err(RUNS_FREE);
    }
    if state.power < 0.0 {
        return Err(SHAFT_DRIVES);
    }
    if !(state.supply_pressure > 0.0 && state.flow > 0.0) {
        return Err(NO_HUB_PRESSURE);
    }
    Ok(state.power / (state.flow * state.supply_pressure))
}
