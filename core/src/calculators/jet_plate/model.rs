//! The jet-plate physics as a pure function of the typed inputs: the frictionless
//! split found from the engine's momentum balance along the plate, and the balance
//! there. Nothing here reads a field or formats a number.

use uom::si::f64::Angle;

use crate::engine::{self, si, Balance, ControlVolume, EngineError, FlowSpec, Port};
use crate::error::FieldErrors;
use crate::fluid::Fluid;
use crate::vector::{Direction, Vec3};

use super::super::common::{self, Jet, JetGiven};

/// The validated inputs of the page.
#[derive(Clone, Debug, PartialEq)]
pub struct Inputs {
    /// Angle θ between the jet axis and the plate surface, 1° to 90°.
    pub plate_angle: Angle,
    /// How the jet's speed was given.
    pub jet_given: JetGiven,
    /// The free jet it gives (typed), range-checked by [`common::jet_from`].
    pub jet: Jet,
    pub fluid: Fluid,
}

/// The solved jet on the plate, SI units.
#[derive(Clone, Debug)]
pub struct Plate {
    pub geometry: Geometry,
    /// Flow along the plate, forward and back branch, m³/s.
    pub q_forward: f64,
    pub q_back: f64,
    /// The engine's balance at the frictionless split (ports: jet, forward, back).
    pub balance: Balance,
    /// Force on the plate normal to it, N (+ into the plate).
    pub force_normal: f64,
    /// Force on the plate, N.
    pub force: Vec3,
}

/// Solves the jet on the plate.
///
/// # Errors
/// An engine refusal, named on the plate angle.
pub fn solve(inputs: &Inputs) -> Result<Plate, FieldErrors> {
    let g = Geometry::new(inputs.plate_angle.value, inputs.jet.diameter.value);
    let (q_forward, balance) =
        frictionless_split(&inputs.fluid, &inputs.jet, &g).map_err(|e| common::engine_error(e, "plate_angle"))?;
    let force = balance.thrust();
    let q_back = balance
        .ports
        .get(2)
        .map_or(inputs.jet.flow.value - q_forward, |p| p.volume_flow);
    Ok(Plate {
        force_normal: force.dot(-g.jet_side),
        force,
        q_forward,
        q_back,
        balance,
        geometry: g,
    })
}

/// Plate geometry in the drawing plane: the jet flows along +x and strikes the plate
/// at the origin; the plate surface runs along `tangent` (the forward branch).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Geometry {
    pub theta: f64,
    pub tangent: Vec3,
    /// Unit normal pointing from the plate towards the jet side.
    pub jet_side: Vec3,
    /// Distance from the impact point to the jet's cut (nozzle side).
    pub jet_length: f64,
    /// Distance from the impact point to where the CV cuts each sheet.
    pub sheet_length: f64,
}

impl Geometry {
    pub fn new(theta: f64, d: f64) -> Geometry {
        Geometry {
            theta,
            tangent: Vec3::new(theta.cos(), theta.sin(), 0.0),
            jet_side: Vec3::new(-theta.sin(), theta.cos(), 0.0),
            jet_length: 4.0 * d,
            sheet_length: 3.0 * d,
        }
    }
}

/// Balances the control volume for a given forward flow `q_forward` (m³/s); the back
/// flow follows from the mass balance.
fn plate_balance(fluid: &Fluid, jet: &Jet, g: &Geometry, q_forward: f64) -> Result<Balance, EngineError> {
    let v = jet.velocity.value;
    let tangent = Direction::new(g.tangent).unwrap_or(Direction::Y);
    let back = Direction::new(-g.tangent).unwrap_or(Direction::Y);
    let mut cv = ControlVolume::new(fluid.clone());
    cv.port(
        Port::inlet("jet", si::area(jet.area.value), Direction::X)
            .velocity(si::velocity(v))
            .pressure(si::pressure(0.0))
            .at(Vec3::new(-g.jet_length, 0.0, 0.0)),
    );
    cv.port(
        Port::outlet("forward", si::area(q_forward / v), tangent)
            .volume_flow(si::volume_flow(q_forward))
            .pressure(si::pressure(0.0))
            .at(g.tangent * g.sheet_length),
    );
    let mut back_port = Port::outlet("back", si::area((jet.flow.value - q_forward) / v), back)
        .pressure(si::pressure(0.0))
        .at(-g.tangent * g.sheet_length);
    back_port.flow = FlowSpec::Unknown;
    cv.port(back_port);
    engine::balance(&cv)
}

/// The split at which the plate takes no force along its surface, found from the
/// engine's momentum balance (linear in the split), and the balance there.
fn frictionless_split(fluid: &Fluid, jet: &Jet, g: &Geometry) -> Result<(f64, Balance), EngineError> {
    let along = |q: f64| -> Result<f64, EngineError> { Ok(plate_balance(fluid, jet, g, q)?.thrust().dot(g.tangent)) };
    let (qa, qb) = (0.25 * jet.flow.value, 0.75 * jet.flow.value);
    let (fa, fb) = (along(qa)?, along(qb)?);
    let slope = (fb - fa) / (qb - qa);
    let q = if slope != 0.0 && slope.is_finite() {
        qa - fa / slope
    } else {
        0.5 * jet.flow.value
    };
    let balance = plate_balance(fluid, jet, g, q)?;
    Ok((q, balance))
}
