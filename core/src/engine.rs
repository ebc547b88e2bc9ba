//! The control-volume engine: mass, energy, linear-momentum and angular-momentum
//! balances over the ports of a fixed, translating or rotating control volume.
//!
//! # Governing equations
//!
//! The Reynolds transport theorem turns each conservation law for the fluid in a
//! control volume (CV) into a balance of storage and port fluxes. For steady,
//! incompressible flow through ports with uniform properties, momentum-flux factor
//! β and kinetic-energy factor α (see [`crate::velocity_profile`]):
//!
//! - Mass: Σ_out ṁ − Σ_in ṁ + dm/dt = 0, with ṁ = ρ·V_rel·A. At most one port flow
//!   may be unknown; it is solved here.
//! - Energy along each stream from port 1 to port 2 (per unit weight):
//!   p₁/(ρg) + α₁V₁²/(2g) + z₁ − ω²r₁²/(2g) = p₂/(ρg) + α₂V₂²/(2g) + z₂ − ω²r₂²/(2g) + h_L + h_s,
//!   with V relative to the CV, the ω² terms only in a rotating frame (Bernoulli in
//!   the rotating frame), h_L = K·V_ref²/(2g) or a given head, and h_s the shaft head
//!   taken out by a turbine (negative for a pump). One unknown per stream: a port
//!   pressure, the head loss or the shaft head.
//! - Linear momentum: R + Σ(−p·A·n) + W + ΣF_extra = Σ_out ṁ(βV + w) − Σ_in ṁ(βV + w) + dP/dt,
//!   where R is the force the supports (anchors, thrust blocks, the shaft) exert on
//!   the CV, n the outward normal of each port, p gauge pressure (the atmosphere's
//!   pressure on the outside of the fitting cancels), W = ρ·V_cv·g the weight of the
//!   contained fluid, V the mean velocity relative to the CV and w the velocity of
//!   the frame at the port (zero for a fixed or translating CV, whose momentum is
//!   written with relative velocities; ω×r for a rotating CV, which makes the flux
//!   absolute). The force the fitting puts on its supports, the *thrust*, is −R.
//! - Angular momentum about a point O: M_R + Σ r×(−p·A·n) + r_W×W + Σ r×F_extra =
//!   Σ_out r×ṁ(βV + w) − Σ_in r×ṁ(βV + w). In a rotating frame the component of M_R
//!   along the axis is the torque the shaft exerts on the rotor; the fluid delivers
//!   −M_R·â to the shaft and the power −(M_R·â)·ω.
//!
//! Sources: the integral forms of the conservation laws as derived in White, *Fluid
//! Mechanics* (chapter 3), Munson et al., *Fundamentals of Fluid Mechanics* (chapter
//! 5), Çengel & Cimbala, *Fluid Mechanics* (chapters 5 and 6).
//!
//! # Assumptions
//! Incompressible fluid of one density; uniform pressure over each port (pressure at
//! the centroid); steady flow apart from the given storage rates; the rotating CV's
//! contents are periodic about the axis (its stored angular momentum is constant).
//!
//! # Ledger and checks
//! [`Balance`] keeps every term of every balance as a vector, so that a checker can
//! see where each newton comes from. The support force is *defined* by the momentum
//! sum, so no momentum residual is kept: it would be zero by algebra. What can fail
//! is reported as a warning: the mass balance when every flow was given
//! ([`EngineWarning::MassDoesNotClose`]) and the energy balance of a stream whose
//! every term was given ([`StreamUnknown::Nothing`], [`EngineWarning::EnergyDoesNotClose`]).

use uom::si::f64::{Area, Length, MassRate, Pressure, Velocity, Volume, VolumeRate};
use uom::si::{
    area::square_meter, length::meter, mass_rate::kilogram_per_second, pressure::pascal, velocity::meter_per_second,
    volume::cubic_meter, volume_rate::cubic_meter_per_second,
};

use crate::fluid::Fluid;
use crate::units::STANDARD_GRAVITY;
use crate::units::{format_significant, STANDARD_ATMOSPHERE};
use crate::vector::{Direction, Vec3};
use crate::velocity_profile::ProfileFactors;

/// Typed SI quantities from plain SI numbers, for building control volumes from
/// validated calculator values.
pub mod si {
    use super::*;
    pub fn area(m2: f64) -> Area {
        Area::new::<square_meter>(m2)
    }
    pub fn length(m: f64) -> Length {
        Length::new::<meter>(m)
    }
    pub fn pressure(pa: f64) -> Pressure {
        Pressure::new::<pascal>(pa)
    }
    pub fn velocity(m_per_s: f64) -> Velocity {
        Velocity::new::<meter_per_second>(m_per_s)
    }
    pub fn volume(m3: f64) -> Volume {
        Volume::new::<cubic_meter>(m3)
    }
    pub fn volume_flow(m3_per_s: f64) -> VolumeRate {
        VolumeRate::new::<cubic_meter_per_second>(m3_per_s)
    }
    pub fn mass_flow(kg_per_s: f64) -> MassRate {
        MassRate::new::<kilogram_per_second>(kg_per_s)
    }
}

/// Whether fluid enters or leaves the CV through a port.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Role {
    Inlet,
    Outlet,
}

/// How the flow through a port is given. Values are magnitudes (≥ 0); the direction
/// of motion is the port's direction, and the role says in or out.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum FlowSpec {
    /// Mean velocity relative to the CV, m/s.
    Velocity(f64),
    /// m³/s
    VolumeFlow(f64),
    /// kg/s
    MassFlow(f64),
    /// Solved from the mass balance.
    Unknown,
}

/// A shared, cheaply cloned name (ports keep theirs through every balance).
pub type Name = std::sync::Arc<str>;

/// One port of a control volume.
#[derive(Clone, Debug, PartialEq)]
pub struct Port {
    pub name: Name,
    pub role: Role,
    /// m²
    pub area: f64,
    /// The direction the fluid moves through the port (into the CV for an inlet,
    /// out of it for an outlet).
    pub direction: Direction,
    pub flow: FlowSpec,
    /// Gauge pressure at the centroid, Pa; `None` when solved from a stream.
    pub pressure: Option<f64>,
    /// Position of the port centroid, m (for moments and elevations).
    pub position: Vec3,
    /// Momentum-flux correction factor β.
    pub beta: f64,
    /// Kinetic-energy correction factor α.
    pub alpha: f64,
}

impl Port {
    fn new(name: &str, role: Role, area: Area, direction: Direction) -> Port {
        Port {
            name: Name::from(name),
            role,
            area: area.get::<square_meter>(),
            direction,
            flow: FlowSpec::Unknown,
            pressure: None,
            position: Vec3::ZERO,
            beta: 1.0,
            alpha: 1.0,
        }
    }
    /// A port through which fluid enters, moving along `direction`.
    pub fn inlet(name: &str, area: Area, direction: Direction) -> Port {
        Port::new(name, Role::Inlet, area, direction)
    }
    /// A port through which fluid leaves, moving along `direction`.
    pub fn outlet(name: &str, area: Area, direction: Direction) -> Port {
        Port::new(name, Role::Outlet, area, direction)
    }
    pub fn velocity(mut self, v: Velocity) -> Port {
        self.flow = FlowSpec::Velocity(v.get::<meter_per_second>());
        self
    }
    pub fn volume_flow(mut self, q: VolumeRate) -> Port {
        self.flow = FlowSpec::VolumeFlow(q.get::<cubic_meter_per_second>());
        self
    }
    pub fn mass_flow(mut self, m: MassRate) -> Port {
        self.flow = FlowSpec::MassFlow(m.get::<kilogram_per_second>());
        self
    }
    /// Gauge pressure at the port centroid.
    pub fn pressure(mut self, p: Pressure) -> Port {
        self.pressure = Some(p.get::<pascal>());
        self
    }
    /// Centroid position, metres.
    pub fn at(mut self, position: Vec3) -> Port {
        self.position = position;
        self
    }
    pub fn profile(mut self, factors: ProfileFactors) -> Port {
        self.beta = factors.momentum_flux;
        self.alpha = factors.kinetic_energy;
        self
    }
    /// Outward unit normal of the port.
    pub fn outward_normal(&self) -> Vec3 {
        match self.role {
            Role::Outlet => self.direction.vec(),
            Role::Inlet => -self.direction.vec(),
        }
    }
}

/// The loss between the two ends of a stream.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Loss {
    None,
    /// h_L = K·V²/(2g) with V the mean velocity at port `reference_port`.
    Coefficient {
        k: f64,
        reference_port: usize,
    },
    /// A given head loss, m.
    Head(f64),
}

/// What the energy balance of a stream solves for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum StreamUnknown {
    /// The one unknown pressure at either end.
    Pressure,
    /// The head loss (both pressures known).
    HeadLoss,
    /// The shaft head (both pressures known).
    ShaftHead,
    /// Nothing: both pressures, both flows, the loss and the shaft head are given,
    /// and the balance is a check. When it does not close (beyond 1e-6 of the largest
    /// head in it) the engine warns [`EngineWarning::EnergyDoesNotClose`]. This is
    /// how a flow the calculator found outside the engine (a flow fixed by a supply
    /// pressure) is checked by an independent final balance.
    Nothing,
}

/// An energy balance along the flow from one port to another.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Stream {
    pub from: usize,
    pub to: usize,
    pub loss: Loss,
    /// Head taken out by a turbine between the ends, m (negative: added by a pump).
    pub shaft_head: f64,
    pub unknown: StreamUnknown,
}

impl Stream {
    /// A stream from port `from` to port `to` that solves for the unknown pressure.
    pub fn new(from: usize, to: usize) -> Stream {
        Stream {
            from,
            to,
            loss: Loss::None,
            shaft_head: 0.0,
            unknown: StreamUnknown::Pressure,
        }
    }
    pub fn loss(mut self, loss: Loss) -> Stream {
        self.loss = loss;
        self
    }
    pub fn shaft_head(mut self, head: Length) -> Stream {
        self.shaft_head = head.get::<meter>();
        self
    }
    pub fn solve_for(mut self, unknown: StreamUnknown) -> Stream {
        self.unknown = unknown;
        self
    }
}

/// How the control volume moves.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Frame {
    Fixed,
    /// Constant velocity of the CV, m/s; port velocities are relative to it.
    Translating {
        velocity: Vec3,
    },
    /// Constant rotation `omega` rad/s (right-handed about `axis`) about an axis
    /// through `origin`; port velocities are relative to the rotating CV.
    Rotating {
        axis: Direction,
        origin: Vec3,
        omega: f64,
    },
}

/// A known force on the CV other than pressure and the contained fluid's weight
/// (the pipe's own weight, a valve's weight), acting at a point.
#[derive(Clone, Debug, PartialEq)]
pub struct ExtraForce {
    pub name: Name,
    /// N
    pub force: Vec3,
    pub at: Vec3,
}

/// A control volume ready to balance.
#[derive(Clone, Debug, PartialEq)]
pub struct ControlVolume {
    pub fluid: Fluid,
    pub ports: Vec<Port>,
    pub streams: Vec<Stream>,
    /// Gravitational acceleration vector, m/s².
    pub gravity: Vec3,
    /// Volume of fluid inside, m³, and its centroid.
    pub contained_volume: f64,
    pub contained_centroid: Vec3,
    pub extra_forces: Vec<ExtraForce>,
    pub frame: Frame,
    /// Rate of increase of the mass inside, kg/s.
    pub mass_storage_rate: f64,
    /// Rate of increase of the momentum inside, N.
    pub momentum_storage_rate: Vec3,
    /// Point about which moments are taken (the rotation origin in a rotating frame).
    pub moment_point: Vec3,
}

impl ControlVolume {
    /// A fixed CV with standard gravity along −z (a fitting drawn in plan).
    pub fn new(fluid: Fluid) -> ControlVolume {
        ControlVolume {
            fluid,
            ports: Vec::new(),
            streams: Vec::new(),
            gravity: Vec3::new(0.0, 0.0, -STANDARD_GRAVITY),
            contained_volume: 0.0,
            contained_centroid: Vec3::ZERO,
            extra_forces: Vec::new(),
            frame: Frame::Fixed,
            mass_storage_rate: 0.0,
            momentum_storage_rate: Vec3::ZERO,
            moment_point: Vec3::ZERO,
        }
    }
    /// Adds a port and returns its index.
    pub fn port(&mut self, port: Port) -> usize {
        self.ports.push(port);
        self.ports.len() - 1
    }
    pub fn stream(&mut self, stream: Stream) -> &mut ControlVolume {
        self.streams.push(stream);
        self
    }
    pub fn gravity(&mut self, g: Vec3) -> &mut ControlVolume {
        self.gravity = g;
        self
    }
    pub fn contains(&mut self, volume: Volume, centroid: Vec3) -> &mut ControlVolume {
        self.contained_volume = volume.get::<cubic_meter>();
        self.contained_centroid = centroid;
        self
    }
    pub fn extra_force(&mut self, name: &str, force: Vec3, at: Vec3) -> &mut ControlVolume {
        self.extra_forces.push(ExtraForce {
            name: Name::from(name),
            force,
            at,
        });
        self
    }
    pub fn frame(&mut self, frame: Frame) -> &mut ControlVolume {
        self.frame = frame;
        if let Frame::Rotating { origin, .. } = frame {
            self.moment_point = origin;
        }
        self
    }
    pub fn moments_about(&mut self, point: Vec3) -> &mut ControlVolume {
        self.moment_point = point;
        self
    }
    pub fn storage(&mut self, mass_rate: f64, momentum_rate: Vec3) -> &mut ControlVolume {
        self.mass_storage_rate = mass_rate;
        self.momentum_storage_rate = momentum_rate;
        self
    }
}

/// Why a control volume could not be balanced.
#[derive(Clone, Debug, PartialEq)]
pub enum EngineError {
    /// The CV has no ports.
    NoPorts,
    /// A port quantity is not finite or out of its domain (`what` says which).
    InvalidPort { port: String, what: &'static str },
    /// Another input (gravity, volume, frame, stream, storage) is not finite or valid.
    InvalidInput { what: &'static str },
    /// More than one port flow is unknown: mass alone cannot close.
    TooManyUnknownFlows { ports: Vec<String> },
    /// The unknown flow came out negative: the fluid would leave through an inlet
    /// (or enter through an outlet).
    FlowReverses { port: String, mass_flow: f64 },
    /// A stream has both pressures unknown, or none while solving for a pressure.
    StreamUnderdetermined { from: String, to: String },
    /// A stream names a port that does not exist.
    NoSuchPort { index: usize },
    /// A port pressure is unknown and no stream solves it.
    PressureUnresolved { port: String },
}

impl std::fmt::Display for EngineError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            EngineError::NoPorts => write!(f, "the control volume has no ports"),
            EngineError::InvalidPort { port, what } => write!(f, "port '{port}': {what}"),
            EngineError::InvalidInput { what } => write!(f, "{what}"),
            EngineError::TooManyUnknownFlows { ports } => write!(
                f,
                "the flows at {} are all unknown; the mass balance can solve only one; give all but one",
                ports.join(", ")
            ),
            EngineError::FlowReverses { port, .. } => write!(
                f,
                "the flow at '{port}' would have to reverse to balance mass; the given flows leave more than \
                        enters"
            ),
            EngineError::StreamUnderdetermined { from, to } => {
                write!(
                    f,
                    "the energy balance from '{from}' to '{to}' needs exactly one unknown"
                )
            }
            EngineError::NoSuchPort { index } => write!(f, "a stream names port {index}, which does not exist"),
            EngineError::PressureUnresolved { port } => {
                write!(
                    f,
                    "the pressure at '{port}' is not given and no energy balance solves it"
                )
            }
        }
    }
}

impl std::error::Error for EngineError {}

/// A note about the balance that does not stop it.
#[derive(Clone, Debug, PartialEq)]
pub enum EngineWarning {
    /// The absolute pressure at a port (gauge plus the standard atmosphere,
    /// 101.325 kPa) falls below the fluid's vapour pressure.
    BelowVapourPressure { port: String, absolute: f64, vapour: f64 },
    /// The momentum flux is under 1 % of the pressure force (static formula governs).
    MomentumNegligible { ratio: f64 },
    /// All flows were given and they do not balance.
    MassDoesNotClose { residual: f64 },
    /// Every term of a stream ([`StreamUnknown::Nothing`]) was given and they disagree.
    EnergyDoesNotClose {
        from: String,
        to: String,
        residual_head: f64,
    },
    /// A solved head loss came out negative (energy would be created).
    NegativeHeadLoss { from: String, to: String, head: f64 },
}

impl std::fmt::Display for EngineWarning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            EngineWarning::BelowVapourPressure { port, absolute, vapour } => write!(
                f,
                "the absolute pressure at '{port}' ({:.1} kPa, gauge pressure plus a standard atmosphere of {} \
                        kPa) is below the vapour pressure ({:.1} kPa): the liquid would flash or cavitate and this \
                        balance does not hold; at altitude the atmosphere is lower and the margin smaller",
                absolute / 1e3,
                STANDARD_ATMOSPHERE / 1e3,
                vapour / 1e3
            ),
            EngineWarning::MomentumNegligible { ratio } => write!(
                f,
                "the momentum flux is {:.2} % of the pressure force: the static pressure term governs",
                ratio * 100.0
            ),
            EngineWarning::MassDoesNotClose { residual } => {
                let (amount, way) = (
                    format_significant(residual.abs(), 3),
                    if *residual > 0.0 {
                        "more leaves than enters"
                    } else {
                        "more enters than leaves"
                    },
                );
                write!(f, "the given flows do not balance: {amount} kg/s {way}")
            }
            EngineWarning::EnergyDoesNotClose {
                from,
                to,
                residual_head,
            } => write!(
                f,
                "the energy balance from '{from}' to '{to}' is off by {} m of head with all terms given",
                format_significant(*residual_head, 3)
            ),
            EngineWarning::NegativeHeadLoss { from, to, head } => write!(
                f,
                "the head loss from '{from}' to '{to}' comes out negative ({head:.3} m): check the pressures, \
                        energy cannot be created"
            ),
        }
    }
}

/// Solved state and ledger terms of one port.
#[derive(Clone, Debug, PartialEq)]
pub struct PortState {
    pub name: Name,
    pub role: Role,
    pub area: f64,
    /// Mean speed relative to the CV, m/s.
    pub speed: f64,
    /// Velocity relative to the CV, m/s.
    pub relative_velocity: Vec3,
    /// Absolute velocity (relative + frame), m/s.
    pub absolute_velocity: Vec3,
    pub mass_flow: f64,
    pub volume_flow: f64,
    /// Gauge pressure, Pa (given or solved).
    pub pressure: f64,
    pub position: Vec3,
    /// Force of the pressure on the CV at this port, −p·A·n, N.
    pub pressure_force: Vec3,
    /// Net momentum outflow through this port, ±ṁ(βV + w), N (negative-signed for inlets).
    pub momentum_outflow: Vec3,
    /// The port's momentum-flux and kinetic-energy factors β and α, as used.
    pub beta: f64,
    pub alpha: f64,
}

/// Solved energy balance of one stream.
#[derive(Clone, Debug, PartialEq)]
pub struct StreamState {
    pub from: usize,
    pub to: usize,
    /// Head loss, m.
    pub head_loss: f64,
    /// Shaft head taken out, m.
    pub shaft_head: f64,
    /// Left minus right side of the energy equation, m: zero by algebra when the
    /// stream solved an unknown, a real check for [`StreamUnknown::Nothing`].
    pub residual_head: f64,
}

/// The result of balancing a control volume: every term of every balance, and the
/// residuals that are checks (see the module doc).
#[derive(Clone, Debug, PartialEq)]
pub struct Balance {
    pub ports: Vec<PortState>,
    pub streams: Vec<StreamState>,
    /// Weight of the contained fluid, N.
    pub fluid_weight: Vec3,
    pub extra_forces: Vec<ExtraForce>,
    /// dP/dt, N.
    pub momentum_storage: Vec3,
    /// Force the supports exert on the CV, N.
    pub support_force: Vec3,
    /// Moment the supports exert on the CV about the moment point, N·m.
    pub support_moment: Vec3,
    pub moment_point: Vec3,
    /// In a rotating frame: torque the fluid delivers to the shaft about the axis,
    /// N·m (positive in the sense of rotation), and the power, W.
    pub shaft_torque: Option<f64>,
    pub shaft_power: Option<f64>,
    /// Σ_out ṁ − Σ_in ṁ + dm/dt, kg/s: a check only when every flow was given
    /// ([`Balance::solved_flow`] is `None`); otherwise zero up to rounding.
    pub mass_residual: f64,
    /// The port whose flow the mass balance solved, if any.
    pub solved_flow: Option<usize>,
    pub warnings: Vec<EngineWarning>,
}

impl Balance {
    /// The force the fitting puts on its supports: the opposite of [`Balance::support_force`].
    pub fn thrust(&self) -> Vec3 {
        -self.support_force
    }
    /// Σ of pressure forces on the CV.
    pub fn total_pressure_force(&self) -> Vec3 {
        self.ports.iter().map(|p| p.pressure_force).sum()
    }
    /// Σ of net momentum outflows.
    pub fn total_momentum_outflow(&self) -> Vec3 {
        self.ports.iter().map(|p| p.momentum_outflow).sum()
    }
    pub fn extra_force_total(&self) -> Vec3 {
        self.extra_forces.iter().map(|e| e.force).sum()
    }
}

fn finite(x: f64) -> bool {
    x.is_finite()
}

fn check_inputs(cv: &ControlVolume) -> Result<(), EngineError> {
    if cv.ports.is_empty() {
        return Err(EngineError::NoPorts);
    }
    for p in &cv.ports {
        let bad = |what| {
            Err(EngineError::InvalidPort {
                port: p.name.to_string(),
                what,
            })
        };
        if !(finite(p.area) && p.area > 0.0) {
            return bad("area must be a finite number greater than zero");
        }
        match p.flow {
            FlowSpec::Velocity(x) | FlowSpec::VolumeFlow(x) | FlowSpec::MassFlow(x) if !(finite(x) && x >= 0.0) => {
                return bad("flow must be a finite number of zero or more")
            }
            _ => {}
        }
        if let Some(pr) = p.pressure {
            if !finite(pr) {
                return bad("pressure must be finite");
            }
        }
        if !p.position.is_finite() {
            return bad("position must be finite");
        }
        if !(finite(p.beta) && p.beta >= 1.0 && finite(p.alpha) && p.alpha >= 1.0) {
            return bad("profile factors must be finite and at least 1");
        }
    }
    if !cv.gravity.is_finite() {
        return Err(EngineError::InvalidInput {
            what: "gravity must be finite",
        });
    }
    if !(finite(cv.contained_volume) && cv.contained_volume >= 0.0 && cv.contained_centroid.is_finite()) {
        return Err(EngineError::InvalidInput {
            what: "the contained volume must be finite and not negative",
        });
    }
    if !(finite(cv.fluid.density) && cv.fluid.density > 0.0) {
        return Err(EngineError::InvalidInput {
            what: "fluid density must be finite and greater than zero",
        });
    }
    if !(finite(cv.mass_storage_rate) && cv.momentum_storage_rate.is_finite() && cv.moment_point.is_finite()) {
        return Err(EngineError::InvalidInput {
            what: "storage rates and the moment point must be finite",
        });
    }
    if cv
        .extra_forces
        .iter()
        .any(|e| !(e.force.is_finite() && e.at.is_finite()))
    {
        return Err(EngineError::InvalidInput {
            what: "extra forces must be finite",
        });
    }
    match cv.frame {
        Frame::Fixed => {}
        Frame::Translating { velocity } if velocity.is_finite() => {}
        Frame::Rotating { origin, omega, .. } if origin.is_finite() && finite(omega) => {}
        _ => {
            return Err(EngineError::InvalidInput {
                what: "the frame's motion must be finite",
            })
        }
    }
    for s in &cv.streams {
        for i in [s.from, s.to] {
            if i >= cv.ports.len() {
                return Err(EngineError::NoSuchPort { index: i });
            }
        }
        if !finite(s.shaft_head) {
            return Err(EngineError::InvalidInput {
                what: "shaft head must be finite",
            });
        }
        match s.loss {
            Loss::Coefficient { k, reference_port } => {
                // A negative K is physical in a junction (a stream drawn along by
                // another gains energy); the calculator bounds it.
                if !finite(k) {
                    return Err(EngineError::InvalidInput {
                        what: "loss coefficient must be finite",
                    });
                }
                if reference_port >= cv.ports.len() {
                    return Err(EngineError::NoSuchPort { index: reference_port });
                }
            }
            Loss::Head(h) if !(finite(h) && h >= 0.0) => {
                return Err(EngineError::InvalidInput {
                    what: "head loss must be finite and not negative",
                })
            }
            _ => {}
        }
    }
    Ok(())
}

/// Velocity of the frame at a point, m/s.
fn frame_velocity(frame: Frame, at: Vec3) -> Vec3 {
    match frame {
        Frame::Fixed => Vec3::ZERO,
        // Momentum of a translating CV is written with relative velocities.
        Frame::Translating { .. } => Vec3::ZERO,
        Frame::Rotating { axis, origin, omega } => (axis.vec() * omega).cross(at - origin),
    }
}

/// ω²r²/2 of the rotating frame at a point (the centrifugal potential), m²/s².
fn centrifugal_potential(frame: Frame, at: Vec3) -> f64 {
    match frame {
        Frame::Rotating { axis, origin, omega } => {
            let r = at - origin;
            let radial = r - axis.vec() * r.dot(axis.vec());
            0.5 * omega * omega * radial.dot(radial)
        }
        _ => 0.0,
    }
}

/// Balances a control volume: mass, then energy per stream, then linear and angular
/// momentum.
///
/// # Errors
/// [`EngineError`] for non-finite or out-of-domain inputs, more than one unknown
/// flow, a reversing solved flow, or a stream that is not determined.
pub fn balance(cv: &ControlVolume) -> Result<Balance, EngineError> {
    check_inputs(cv)?;
    let rho = cv.fluid.density;
    let g = cv.gravity.norm();
    let up = if g > 0.0 { -(cv.gravity * (1.0 / g)) } else { Vec3::ZERO };
    // Heads are energies per unit mass divided by g; without gravity (a jet in
    // space, a test case) they are expressed with standard gravity.
    let g_head = if g > 0.0 { g } else { STANDARD_GRAVITY };
    let mut warnings = Vec::new();

    // One allocation for the port states; unknown mass flows and pressures are NaN
    // until solved.
    let mut ports: Vec<PortState> = cv
        .ports
        .iter()
        .map(|p| PortState {
            name: p.name.clone(),
            role: p.role,
            area: p.area,
            speed: 0.0,
            relative_velocity: Vec3::ZERO,
            absolute_velocity: Vec3::ZERO,
            mass_flow: match p.flow {
                FlowSpec::Velocity(v) => rho * v * p.area,
                FlowSpec::VolumeFlow(q) => rho * q,
                FlowSpec::MassFlow(m) => m,
                FlowSpec::Unknown => f64::NAN,
            },
            volume_flow: 0.0,
            pressure: p.pressure.unwrap_or(f64::NAN),
            position: p.position,
            pressure_force: Vec3::ZERO,
            momentum_outflow: Vec3::ZERO,
            beta: p.beta,
            alpha: p.alpha,
        })
        .collect();
    let signed = |p: &PortState, m: f64| if p.role == Role::Outlet { m } else { -m };

    // --- Mass -------------------------------------------------------------------
    let unknown_count = ports.iter().filter(|p| p.mass_flow.is_nan()).count();
    let known_net: f64 = ports
        .iter()
        .filter(|p| !p.mass_flow.is_nan())
        .map(|p| signed(p, p.mass_flow))
        .sum::<f64>()
        + cv.mass_storage_rate;
    if unknown_count > 1 {
        return Err(EngineError::TooManyUnknownFlows {
            ports: ports
                .iter()
                .filter(|p| p.mass_flow.is_nan())
                .map(|p| p.name.to_string())
                .collect(),
        });
    }
    let solved_flow = ports.iter().position(|p| p.mass_flow.is_nan());
    if let Some(port) = ports.iter_mut().find(|p| p.mass_flow.is_nan()) {
        // signed(port, m) + known_net = 0
        let m = match port.role {
            Role::Outlet => -known_net,
            Role::Inlet => known_net,
        };
        if m < -1e-12 * (1.0 + known_net.abs()) {
            return Err(EngineError::FlowReverses {
                port: port.name.to_string(),
                mass_flow: m,
            });
        }
        port.mass_flow = m.max(0.0);
    }
    let mass_residual: f64 = ports.iter().map(|p| signed(p, p.mass_flow)).sum::<f64>() + cv.mass_storage_rate;
    let flow_scale = ports.iter().fold(0.0f64, |a, p| a.max(p.mass_flow));
    if unknown_count == 0 && mass_residual.abs() > 1e-6 * flow_scale.max(1e-9) {
        warnings.push(EngineWarning::MassDoesNotClose {
            residual: mass_residual,
        });
    }
    for p in &mut ports {
        p.speed = p.mass_flow / (rho * p.area);
        p.volume_flow = p.mass_flow / rho;
    }

    // --- Energy -----------------------------------------------------------------
    let mut streams = Vec::with_capacity(cv.streams.len());
    for s in &cv.streams {
        // Mechanical energy per unit weight at a port for gauge pressure p.
        let (speed_from, speed_to) = (ports[s.from].speed, ports[s.to].speed);
        let head_of = |i: usize, p: f64| {
            let port = &cv.ports[i];
            let speed = if i == s.from { speed_from } else { speed_to };
            let z = port.position.dot(up) * g / g_head;
            let pot = centrifugal_potential(cv.frame, port.position);
            p / (rho * g_head) + port.alpha * speed * speed / (2.0 * g_head) + z - pot / g_head
        };
        let given_loss = match s.loss {
            Loss::None => 0.0,
            Loss::Head(h) => h,
            Loss::Coefficient { k, reference_port } => k * ports[reference_port].speed.powi(2) / (2.0 * g_head),
        };
        let (p_from, p_to) = (ports[s.from].pressure, ports[s.to].pressure);
        let underdetermined = || EngineError::StreamUnderdetermined {
            from: cv.ports[s.from].name.to_string(),
            to: cv.ports[s.to].name.to_string(),
        };
        let (mut head_loss, mut shaft_head) = (given_loss, s.shaft_head);
        match (s.unknown, p_from.is_nan(), p_to.is_nan()) {
            (StreamUnknown::Pressure, false, true) => {
                let target = head_of(s.from, p_from) - head_loss - shaft_head;
                ports[s.to].pressure = (target - head_of(s.to, 0.0)) * rho * g_head;
            }
            (StreamUnknown::Pressure, true, false) => {
                let target = head_of(s.to, p_to) + head_loss + shaft_head;
                ports[s.from].pressure = (target - head_of(s.from, 0.0)) * rho * g_head;
            }
            (StreamUnknown::HeadLoss, false, false) => {
                head_loss = head_of(s.from, p_from) - head_of(s.to, p_to) - shaft_head;
                if head_loss < -1e-9 {
                    warnings.push(EngineWarning::NegativeHeadLoss {
                        from: cv.ports[s.from].name.to_string(),
                        to: cv.ports[s.to].name.to_string(),
                        head: head_loss,
                    });
                }
            }
            (StreamUnknown::ShaftHead, false, false) => {
                shaft_head = head_of(s.from, p_from) - head_of(s.to, p_to) - head_loss;
            }
            (StreamUnknown::Nothing, false, false) => {}
            _ => return Err(underdetermined()),
        }
        let (head_from, head_to) = (
            head_of(s.from, ports[s.from].pressure),
            head_of(s.to, ports[s.to].pressure),
        );
        let residual_head = head_from - head_to - head_loss - shaft_head;
        // Only a stream with every term given can fail to close; the others solved
        // their unknown from this very equation.
        if s.unknown == StreamUnknown::Nothing {
            let largest = head_from
                .abs()
                .max(head_to.abs())
                .max(head_loss.abs())
                .max(shaft_head.abs());
            if residual_head.abs() > 1e-6 * largest.max(1e-3) {
                warnings.push(EngineWarning::EnergyDoesNotClose {
                    from: cv.ports[s.from].name.to_string(),
                    to: cv.ports[s.to].name.to_string(),
                    residual_head,
                });
            }
        }
        streams.push(StreamState {
            from: s.from,
            to: s.to,
            head_loss,
            shaft_head,
            residual_head,
        });
    }
    if let Some(p) = ports.iter().find(|p| !p.pressure.is_finite()) {
        return Err(EngineError::PressureUnresolved {
            port: p.name.to_string(),
        });
    }

    // --- Linear momentum --------------------------------------------------------
    for (state, p) in ports.iter_mut().zip(&cv.ports) {
        let relative_velocity = p.direction.vec() * state.speed;
        let w = frame_velocity(cv.frame, p.position);
        state.relative_velocity = relative_velocity;
        state.absolute_velocity = relative_velocity
            + match cv.frame {
                Frame::Translating { velocity } => velocity,
                _ => w,
            };
        let flux = (relative_velocity * p.beta + w) * state.mass_flow;
        state.pressure_force = p.outward_normal() * (-state.pressure * p.area);
        state.momentum_outflow = if p.role == Role::Outlet { flux } else { -flux };
    }
    let fluid_weight = cv.gravity * (rho * cv.contained_volume);
    let pressure_total: Vec3 = ports.iter().map(|p| p.pressure_force).sum();
    let flux_total: Vec3 = ports.iter().map(|p| p.momentum_outflow).sum();
    let extra_total: Vec3 = cv.extra_forces.iter().map(|e| e.force).sum();
    let support_force = flux_total + cv.momentum_storage_rate - pressure_total - fluid_weight - extra_total;
    let pressure_scale: f64 = ports.iter().map(|p| p.pressure_force.norm()).sum();
    let flux_scale: f64 = ports.iter().map(|p| p.momentum_outflow.norm()).sum();
    if pressure_scale > 0.0 && flux_scale < 0.01 * pressure_scale {
        warnings.push(EngineWarning::MomentumNegligible {
            ratio: flux_scale / pressure_scale,
        });
    }

    // --- Angular momentum -------------------------------------------------------
    let o = cv.moment_point;
    let moment_flux: Vec3 = ports.iter().map(|p| (p.position - o).cross(p.momentum_outflow)).sum();
    let moment_pressure: Vec3 = ports.iter().map(|p| (p.position - o).cross(p.pressure_force)).sum();
    let moment_weight = (cv.contained_centroid - o).cross(fluid_weight);
    let moment_extra: Vec3 = cv.extra_forces.iter().map(|e| (e.at - o).cross(e.force)).sum();
    let support_moment = moment_flux - moment_pressure - moment_weight - moment_extra;
    let (shaft_torque, shaft_power) = match cv.frame {
        Frame::Rotating { axis, omega, .. } => {
            let torque = -support_moment.dot(axis.vec());
            (Some(torque), Some(torque * omega))
        }
        _ => (None, None),
    };

    // --- Vapour pressure --------------------------------------------------------
    if let Some(pv) = cv.fluid.vapour_pressure {
        for p in &ports {
            let absolute = p.pressure + STANDARD_ATMOSPHERE;
            if absolute < pv {
                warnings.push(EngineWarning::BelowVapourPressure {
                    port: p.name.to_string(),
                    absolute,
                    vapour: pv,
                });
            }
        }
    }
    Ok(Balance {
        ports,
        streams,
        fluid_weight,
        extra_forces: cv.extra_forces.clone(),
        momentum_storage: cv.momentum_storage_rate,
        support_force,
        support_moment,
        moment_point: o,
        shaft_torque,
        shaft_power,
        mass_residual,
        solved_flow,
        warnings,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn water_like() -> Fluid {
        Fluid {
            name: "water at 1000 kg/m³".into(),
            density: 1000.0,
            viscosity: 1e-3,
            vapour_pressure: None,
        }
    }

    /// A horizontal contraction from 100 mm to 50 mm bore carrying 20 L/s, with the
    /// inlet pressure given and the outlet open (0 gauge): every term of the energy
    /// balance is given. Bernoulli without loss needs p₁ = ρ(V₂² − V₁²)/2 (derived
    /// from the definition); any other p₁ must be reported as not closing.
    fn contraction(inlet_pressure: f64) -> ControlVolume {
        let (a1, a2) = (
            std::f64::consts::PI * 0.1 * 0.1 / 4.0,
            std::f64::consts::PI * 0.05 * 0.05 / 4.0,
        );
        let mut cv = ControlVolume::new(water_like());
        let i = cv.port(
            Port::inlet("inlet", si::area(a1), Direction::X)
                .volume_flow(si::volume_flow(0.02))
                .pressure(si::pressure(inlet_pressure)),
        );
        let o = cv.port(
            Port::outlet("outlet", si::area(a2), Direction::X)
                .volume_flow(si::volume_flow(0.02))
                .pressure(si::pressure(0.0))
                .at(Vec3::new(0.3, 0.0, 0.0)),
        );
        cv.stream(Stream::new(i, o).solve_for(StreamUnknown::Nothing));
        cv
    }

    fn bernoulli_inlet_pressure() -> f64 {
        let (a1, a2) = (
            std::f64::consts::PI * 0.1 * 0.1 / 4.0,
            std::f64::consts::PI * 0.05 * 0.05 / 4.0,
        );
        let (v1, v2) = (0.02 / a1, 0.02 / a2);
        0.5 * 1000.0 * (v2 * v2 - v1 * v1)
    }

    fn energy_warnings(b: &Balance) -> Vec<&EngineWarning> {
        b.warnings
            .iter()
            .filter(|w| matches!(w, EngineWarning::EnergyDoesNotClose { .. }))
            .collect()
    }

    #[test]
    fn a_stream_with_every_term_given_closes_when_bernoulli_holds() {
        let p1 = bernoulli_inlet_pressure();
        // 48.63 kPa: V₁ = 2.546 m/s, V₂ = 10.186 m/s.
        assert!((p1 - 48_634.0).abs() < 1.0, "{p1}");
        let b = balance(&contraction(p1)).expect("balances");
        assert!(energy_warnings(&b).is_empty(), "{:?}", b.warnings);
        assert!(b.streams[0].residual_head.abs() < 1e-9);
    }

    #[test]
    fn a_stream_with_every_term_given_warns_when_it_does_not_close() {
        // 40 kPa is 8.63 kPa short of what the flows need: 0.880 m of head.
        let b = balance(&contraction(40_000.0)).expect("balances");
        let found = energy_warnings(&b);
        assert_eq!(found.len(), 1, "{:?}", b.warnings);
        let expected_head = (40_000.0 - bernoulli_inlet_pressure()) / (1000.0 * STANDARD_GRAVITY);
        let residual = b.streams[0].residual_head;
        assert!((residual - expected_head).abs() < 1e-9, "{residual} vs {expected_head}");
        assert!(found[0].to_string().contains("0.880"), "{}", found[0]);
        // A small disagreement (1 Pa in 48.6 kPa, 2e-5) is still reported; rounding is not.
        let off_by_one_pascal = balance(&contraction(bernoulli_inlet_pressure() + 1.0)).expect("balances");
        let small = energy_warnings(&off_by_one_pascal);
        assert_eq!(small.len(), 1);
        assert!(small[0].to_string().contains("0.000102 m"), "{}", small[0]);
    }

    #[test]
    fn a_stream_that_solves_its_unknown_never_warns_about_closure() {
        let mut cv = contraction(40_000.0);
        cv.ports[1].pressure = None;
        cv.streams[0].unknown = StreamUnknown::Pressure;
        let b = balance(&cv).expect("balances");
        assert!(energy_warnings(&b).is_empty());
        // The outlet pressure follows from Bernoulli: 40 kPa − 48.63 kPa.
        assert!((b.ports[1].pressure - (40_000.0 - bernoulli_inlet_pressure())).abs() < 1e-6);
    }

    #[test]
    fn a_stream_with_every_term_given_needs_both_pressures() {
        let mut cv = contraction(40_000.0);
        cv.ports[1].pressure = None;
        assert!(matches!(balance(&cv), Err(EngineError::StreamUnderdetermined { .. })));
    }

    #[test]
    fn the_mass_balance_of_given_flows_can_fail_and_a_solved_flow_is_named() {
        let mut cv = contraction(bernoulli_inlet_pressure());
        cv.ports[1].flow = FlowSpec::VolumeFlow(0.021);
        let b = balance(&cv).expect("balances");
        assert_eq!(b.solved_flow, None);
        assert!(b
            .warnings
            .iter()
            .any(|w| matches!(w, EngineWarning::MassDoesNotClose { .. })));
        assert!((b.mass_residual - 1.0).abs() < 1e-9, "{}", b.mass_residual);
        let message = b.warnings.iter().map(|w| w.to_string()).collect::<Vec<_>>().join("; ");
        assert!(message.contains("1.00 kg/s more leaves than enters"), "{message}");

        let mut solved = contraction(bernoulli_inlet_pressure());
        solved.ports[1].flow = FlowSpec::Unknown;
        let b = balance(&solved).expect("balances");
        assert_eq!(b.solved_flow, Some(1));
        assert!(!b
            .warnings
            .iter()
            .any(|w| matches!(w, EngineWarning::MassDoesNotClose { .. })));
    }

    #[test]
    fn the_vapour_pressure_warning_names_the_atmosphere_it_assumes() {
        // Water at 20 °C: saturation pressure 2.339 kPa (IAPWS-IF97 eq. 30). A gauge
        // pressure of −100 kPa is 1.3 kPa absolute at a standard atmosphere.
        let mut fluid = water_like();
        fluid.vapour_pressure = Some(2_339.0);
        let mut cv = ControlVolume::new(fluid);
        cv.port(
            Port::inlet("suction", si::area(0.01), Direction::X)
                .velocity(si::velocity(1.0))
                .pressure(si::pressure(-100_000.0)),
        );
        cv.port(Port::outlet("out", si::area(0.01), Direction::X).pressure(si::pressure(-100_000.0)));
        let b = balance(&cv).expect("balances");
        let message = b
            .warnings
            .iter()
            .find(|w| matches!(w, EngineWarning::BelowVapourPressure { .. }))
            .map(|w| w.to_string())
            .unwrap_or_default();
        assert!(message.contains("standard atmosphere of 101.325 kPa"), "{message}");
        assert!(message.contains("1.3 kPa"), "{message}");
    }
}
