//! The vane's physics as a pure function of its typed inputs: the engine's balance
//! at the blade speed given (in a frame moving with a single vane, or fixed around
//! a fixed vane or a wheel), the searched optimum speeds, and the balances at each
//! plotted blade speed. Nothing here reads a field or formats a number.

use uom::si::f64::{Angle, Length, Ratio, Velocity};

use crate::engine::{self, si, Balance, ControlVolume, EngineError, Frame, Loss, Port, Stream, StreamUnknown};
use crate::error::FieldErrors;
use crate::fluid::Fluid;
use crate::units::STANDARD_GRAVITY;
use crate::vector::{Direction, Vec3};

use super::super::common::{self, Jet, JetGiven};

/// Points on each plotted curve (blade speed from 0 to the jet speed).
pub const PLOT_POINTS: usize = 41;

/// The validated inputs of the page.
#[derive(Clone, Debug, PartialEq)]
pub struct Inputs {
    pub kind: VaneKind,
    /// Deflection angle θ of the relative flow.
    pub angle: Angle,
    /// Relative-velocity factor k = W₂/W₁ (1 when left empty).
    pub w_ratio: Ratio,
    /// Blade speed: zero for a fixed vane, below the jet speed for a single vane,
    /// not above it for a wheel.
    pub u: Velocity,
    /// How the jet's speed was given.
    pub jet_given: JetGiven,
    /// The free jet it gives (typed), range-checked by [`common::jet_from`].
    pub jet: Jet,
    pub fluid: Fluid,
    /// For a wheel whose pitch diameter is given: the wheel's size and jets.
    pub wheel: Option<Wheel>,
}

/// An impulse wheel's pitch circle and jets (each jet is the page's jet).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Wheel {
    /// Diameter of the circle the jet's centre line touches.
    pub pitch_diameter: Length,
    /// Number of identical jets.
    pub jets: usize,
}

impl Wheel {
    /// Rotational speed (rad/s) at which the buckets on the pitch circle move at
    /// `u` (m/s): ω = 2u/D.
    pub fn omega(&self, u: f64) -> f64 {
        2.0 * u / self.pitch_diameter.value
    }
}

impl Inputs {
    /// The vane in SI.
    pub fn vane(&self) -> Vane {
        Vane {
            theta: self.angle.value,
            k: self.w_ratio.value,
        }
    }
}

/// One point of a plotted curve: blade speed (m/s), power (W), efficiency (−).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CurvePoint {
    pub u: f64,
    pub power: f64,
    pub efficiency: f64,
}

/// The solved vane: the state at the blade speed given and the optima searched
/// (the curves for the plots are balanced by [`curve`] only when plotted).
#[derive(Clone, Debug)]
pub struct Solved {
    pub state: VaneState,
    pub best_single: VaneState,
    pub best_wheel: VaneState,
}

/// Why a valid set of inputs has no operating point on this page.
#[derive(Clone, Debug, PartialEq)]
pub enum Refusal {
    /// Errors that name their field directly.
    Fields(FieldErrors),
    /// A single vane at or above the jet speed: no water reaches it. Speeds in m/s.
    VaneOutrunsJet { u: f64, v: f64 },
    /// A wheel's buckets above the jet speed. Speeds in m/s.
    WheelOutrunsJet { u: f64, v: f64 },
}

impl From<FieldErrors> for Refusal {
    fn from(e: FieldErrors) -> Refusal {
        Refusal::Fields(e)
    }
}

/// Solves the vane for its inputs.
///
/// # Errors
/// A blade speed the jet cannot reach, or an engine refusal named on the jet
/// diameter.
pub fn solve(inputs: &Inputs) -> Result<Solved, Refusal> {
    let (fluid, jet, vane) = (&inputs.fluid, &inputs.jet, inputs.vane());
    let (u, v) = (inputs.u.value, jet.velocity.value);
    match inputs.kind {
        VaneKind::Single if u >= v => return Err(Refusal::VaneOutrunsJet { u, v }),
        VaneKind::Wheel if u > v => return Err(Refusal::WheelOutrunsJet { u, v }),
        _ => {}
    }
    let named = |e: EngineError| FieldErrors::from(common::engine_error(e, "d_jet"));
    let state = vane_balance(fluid, jet, &vane, inputs.kind, inputs.u.value).map_err(named)?;
    let best_single = best_speed(fluid, jet, &vane, VaneKind::Single).map_err(named)?;
    let best_wheel = best_speed(fluid, jet, &vane, VaneKind::Wheel).map_err(named)?;
    Ok(Solved {
        state,
        best_single,
        best_wheel,
    })
}

/// The balances at [`PLOT_POINTS`] blade speeds from standstill to the jet speed, for
/// a single vane or a wheel (`mode`): the power and efficiency curves. Balanced only
/// when the plots are built (a full solve): they were most of a headline solve.
///
/// # Errors
/// The first balance that fails (the plots are then left out; every value shown
/// comes from balances of its own).
pub fn curve(inputs: &Inputs, mode: VaneKind) -> Result<Vec<CurvePoint>, EngineError> {
    let (fluid, jet, vane) = (&inputs.fluid, &inputs.jet, inputs.vane());
    (0..PLOT_POINTS)
        .map(|i| {
            let u = jet.velocity.value * i as f64 / (PLOT_POINTS - 1) as f64;
            let s = vane_balance(fluid, jet, &vane, mode, u)?;
            Ok(CurvePoint {
                u,
                power: s.power,
                efficiency: s.efficiency,
            })
        })
        .collect()
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum VaneKind {
    Fixed,
    Single,
    Wheel,
}

/// The vane: deflection angle and relative-velocity factor.
#[derive(Clone, Copy, Debug)]
pub struct Vane {
    /// Deflection angle θ, rad.
    pub theta: f64,
    /// Relative-velocity factor k = W₂/W₁.
    pub k: f64,
}

impl Vane {
    pub fn exit_direction(&self) -> Vec3 {
        Vec3::new(self.theta.cos(), self.theta.sin(), 0.0)
    }
}

/// One solved vane balance at one blade speed.
#[derive(Clone, Debug)]
pub struct VaneState {
    pub balance: Balance,
    pub u: f64,
    /// Force of the water on the vane, N.
    pub force: Vec3,
    pub power: f64,
    pub efficiency: f64,
    pub mass_turned: f64,
    pub w_in: Vec3,
    pub w_out: Vec3,
    pub v_out: Vec3,
    /// Loss on the vane, m of head (relative frame).
    pub head_loss: f64,
}

/// Where the flow enters and leaves the vane (for moments and the drawing): it enters
/// at the origin along +x and follows an arc of radius `radius` about (0, radius).
pub fn exit_point(vane: &Vane, radius: f64) -> Vec3 {
    Vec3::new(radius * vane.theta.sin(), radius * (1.0 - vane.theta.cos()), 0.0)
}

/// Balances the vane at blade speed `u` (ignored for a fixed vane). The caller has
/// checked 0 ≤ u ≤ V.
///
/// # Errors
/// An engine refusal.
pub fn vane_balance(fluid: &Fluid, jet: &Jet, vane: &Vane, mode: VaneKind, u: f64) -> Result<VaneState, EngineError> {
    let v = jet.velocity.value;
    let u = if mode == VaneKind::Fixed { 0.0 } else { u };
    let w1 = (v - u).max(0.0);
    let radius = 2.5 * jet.diameter.value;
    let exit = exit_point(vane, radius);
    let exit_dir = vane.exit_direction();
    let w_out_vec = exit_dir * (vane.k * w1);
    let mut cv = ControlVolume::new(fluid.clone());
    let state = match mode {
        VaneKind::Fixed | VaneKind::Single => {
            // A CV on the vane, moving with it: relative velocities, relative mass flow.
            cv.frame(match mode {
                VaneKind::Fixed => Frame::Fixed,
                _ => Frame::Translating {
                    velocity: Vec3::new(u, 0.0, 0.0),
                },
            });
            let i = cv.port(
                Port::inlet("jet at the vane", si::area(jet.area.value), Direction::X)
                    .velocity(si::velocity(w1))
                    .pressure(si::pressure(0.0)),
            );
            // The sheet leaving is thicker as it is slower (area A/k): the outlet
            // flow is solved from the mass balance and its speed comes out k·W₁.
            let o = cv.port(
                Port::outlet(
                    "water leaving the vane",
                    si::area(jet.area.value / vane.k),
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
        VaneKind::Wheel => {
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
                Port::inlet("jet", si::area(jet.area.value), Direction::X)
                    .velocity(si::velocity(v))
                    .pressure(si::pressure(0.0)),
            );
            let o = cv.port(
                Port::outlet("water leaving the wheel", si::area(jet.flow.value / speed2), dir2)
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
    let jet_power = 0.5 * fluid.density * jet.flow.value * v * v;
    Ok(VaneState {
        power,
        efficiency: if jet_power > 0.0 { power / jet_power } else { 0.0 },
        ..state
    })
}

/// The blade speed that gives the most power, searched over the balance itself
/// (power is zero at standstill and at the jet speed); returns the state there.
pub fn best_speed(fluid: &Fluid, jet: &Jet, vane: &Vane, mode: VaneKind) -> Result<VaneState, EngineError> {
    let power = |u: f64| vane_balance(fluid, jet, vane, mode, u).map(|s| s.power);
    let u = common::peak_of(0.0, jet.velocity.value, power)?;
    vane_balance(fluid, jet, vane, mode, u)
}
