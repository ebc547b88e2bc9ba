//! The nozzle's physics as a pure function of its typed inputs: the discharge from
//! the energy balance in closed form (see the page's module doc), then the engine's
//! mass, energy and momentum balances over the fluid from the flange face to the
//! vena contracta. Nothing here reads a field or formats a number.

use uom::si::f64::{Length, Pressure, Ratio, VolumeRate};

use crate::engine::{self, si, Balance, ControlVolume, Loss, Port, Stream};
use crate::error::FieldErrors;
use crate::fluid::Fluid;
use crate::vector::{Direction, Vec3};

use super::super::common::{self, MAX_PRESSURE_PA};

/// What the user gives to fix the operating point.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Given {
    /// Gauge pressure at the flange: the flow is found.
    Pressure(Pressure),
    /// Volumetric flow: the pressure is found.
    Flow(VolumeRate),
}

/// The validated inputs of the page.
#[derive(Clone, Debug, PartialEq)]
pub struct Inputs {
    /// Bore of the pipe at the flange.
    pub d_pipe: Length,
    /// Outlet diameter of the nozzle tip, not larger than the bore.
    pub d_nozzle: Length,
    pub given: Given,
    /// Discharge coefficient, not above `cc`.
    pub cd: Ratio,
    /// Contraction coefficient (1 when left empty).
    pub cc: Ratio,
    /// Gasket reaction diameter G, not smaller than the bore, when given.
    pub d_gasket: Option<Length>,
    pub fluid: Fluid,
    /// The flange's bolts, when their number and size are given.
    pub bolts: Option<super::bolts::Bolting>,
    /// β and α at the flange face (the jet is taken as uniform).
    pub profile_in: common::PortProfile,
}

/// Why a valid set of inputs has no steady operating point on this page.
#[derive(Clone, Debug, PartialEq)]
pub enum Refusal {
    /// Errors that name their field directly.
    Fields(FieldErrors),
    /// The flow given needs a pressure at the flange (Pa) above the page's range.
    FlowNeedsTooMuchPressure { needed: f64 },
}

impl From<FieldErrors> for Refusal {
    fn from(e: FieldErrors) -> Refusal {
        Refusal::Fields(e)
    }
}

/// The solved nozzle, SI units throughout.
#[derive(Clone, Debug)]
pub struct Nozzle {
    /// Velocity coefficient C_v = C_d/C_c.
    pub cv: f64,
    /// Loss coefficient on the jet velocity, 1/C_v² − 1.
    pub k: f64,
    /// Bore area at the flange and jet area at the vena contracta, m².
    pub a_pipe: f64,
    pub a_jet: f64,
    /// Discharge, m³/s.
    pub flow: f64,
    /// Jet diameter at the vena contracta, m.
    pub d_jet: f64,
    /// Drawn nozzle length and distance of the vena contracta from the flange, m.
    pub length: f64,
    pub vena: f64,
    /// The engine's balance over the nozzle's fluid, and the index of the flange
    /// face and of the jet among its ports.
    pub balance: Balance,
    pub flange_port: usize,
    pub jet_port: usize,
    /// End force on the flange joint over the bore, + when the nozzle pulls off, N.
    pub end_force: f64,
    /// Jet reaction ṁV_j on the line, N.
    pub jet_reaction: f64,
}

/// Solves the nozzle for its inputs.
///
/// # Errors
/// A flow that needs more than the page's pressure range, or coefficients with
/// which the pipe velocity would exceed what the pressure can drive.
pub fn solve(inputs: &Inputs) -> Result<Nozzle, Refusal> {
    let (d_pipe, d_nozzle) = (inputs.d_pipe.value, inputs.d_nozzle.value);
    let (cd, cc) = (inputs.cd.value, inputs.cc.value);
    let cv = cd / cc;
    let k = 1.0 / (cv * cv) - 1.0;
    let a_pipe = common::circle_area(d_pipe);
    let a_jet = cc * common::circle_area(d_nozzle);
    let rho = inputs.fluid.density;
    let alpha_in = inputs.profile_in.alpha.value;

    let flow = match inputs.given {
        Given::Flow(q) => {
            let q = q.value;
            // Energy balance solved for the pressure (closed form, see the module doc).
            let (v_jet, v_pipe) = (q / a_jet, q / a_pipe);
            let needed = 0.5 * rho * (v_jet * v_jet / (cv * cv) - alpha_in * v_pipe * v_pipe);
            if needed > MAX_PRESSURE_PA {
                return Err(Refusal::FlowNeedsTooMuchPressure { needed });
            }
            q
        }
        Given::Pressure(p) => {
            // Energy balance solved for the jet velocity (closed form, see the module doc).
            let denominator = 1.0 / (cv * cv) - alpha_in * (a_jet / a_pipe).powi(2);
            if denominator <= 0.0 {
                return Err(Refusal::Fields(
                    crate::error::FieldError::inconsistent(
                        "cd",
                        "with this jet area the pipe velocity would exceed what the pressure can drive: check \
                                C_d, C_c and the diameters",
                    )
                    .into(),
                ));
            }
            (2.0 * p.value / rho / denominator).sqrt() * a_jet
        }
    };

    let d_jet = d_nozzle * cc.sqrt();
    let length = 1.5 * d_pipe;
    let vena = if cc < 1.0 { length + 0.5 * d_nozzle } else { length };
    let mut cv_fluid = ControlVolume::new(inputs.fluid.clone());
    let i = cv_fluid.port(
        inputs.profile_in.apply(
            Port::inlet("flange face", si::area(a_pipe), Direction::X)
                .volume_flow(si::volume_flow(flow))
                .at(Vec3::ZERO),
        ),
    );
    let o = cv_fluid.port(
        Port::outlet("jet", si::area(a_jet), Direction::X)
            .pressure(si::pressure(0.0))
            .at(Vec3::new(vena, 0.0, 0.0)),
    );
    cv_fluid.stream(Stream::new(i, o).loss(Loss::Coefficient { k, reference_port: o }));
    let balance = engine::balance(&cv_fluid).map_err(|e| FieldErrors::from(common::engine_error(e, "d_nozzle")))?;
    let jet = &balance.ports[o];
    let jet_reaction = jet.mass_flow * jet.speed;
    let end_force = balance.thrust().x;
    Ok(Nozzle {
        cv,
        k,
        a_pipe,
        a_jet,
        flow,
        d_jet,
        length,
        vena,
        balance,
        flange_port: i,
        jet_port: o,
        end_force,
        jet_reaction,
    })
}
