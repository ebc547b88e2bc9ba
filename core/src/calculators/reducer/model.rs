//! The reducer page's typed inputs and pure model: the control volume of the
//! fluid in the cone, its momentum and energy balances with the chosen loss, and
//! the joint annulus forces of push-on and mechanical joints.

use std::f64::consts::PI;

use uom::si::f64::{Acceleration, Angle, Length, Ratio};

use crate::catalog::{ChoiceOption, Values};
use crate::engine::{self, si, ControlVolume, Loss, Port, Stream};
use crate::error::{FieldError, FieldErrors};
use crate::vector::{Direction, Vec3};

use super::super::common::{self, KnownPressure, PortProfile};
use super::{crane_k_small, K_REF_OPTIONS, LOSS_OPTIONS, ORIENTATION_OPTIONS};

/// The page's inputs, validated. Diameters and pressures are uom quantities.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub d: Length,
    pub d2: Length,
    /// The port whose gauge pressure is known, and that pressure.
    pub known: KnownPressure,
    pub cone_angle: Angle,
    /// The loss model key (`crane`, `borda`, `k`, `none`).
    pub loss: &'static str,
    /// A given K and the velocity it refers to (`loss=k`).
    pub k_given: Option<(Ratio, &'static str)>,
    /// Flow direction along the axis (`horizontal`, `upward`, `downward`).
    pub flow_dir: &'static str,
    /// Outside diameters at the two joints when the joint seals on them.
    pub outside: Option<(Length, Length)>,
    pub fluid: crate::fluid::Fluid,
    pub flow: crate::engine::FlowSpec,
    /// The flow field the user filled, for warnings.
    pub flow_field: &'static str,
    /// β and α at the inlet and the outlet.
    pub profile_in: PortProfile,
    pub profile_out: PortProfile,
    /// Whether the fluid's weight enters the balance.
    pub weights: bool,
    /// Gravity used (standard unless a local value is typed).
    pub gravity: Acceleration,
}

fn option_key(options: &'static [ChoiceOption], field: &'static str, key: &str) -> Result<&'static str, FieldError> {
    options
        .iter()
        .find(|o| o.key == key)
        .map(|o| o.key)
        .ok_or_else(|| FieldError::inconsistent(field, format!("'{key}' is not an option here")))
}

/// Reads the page's values once.
///
/// # Errors
/// Each bad field by name.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let d: Length = values.typed("d")?;
    let d2: Length = values.typed("d2")?;
    let known = common::known_pressure_from(values)?;
    let cone_angle = values.typed("cone_angle")?;
    let loss = option_key(LOSS_OPTIONS, "loss", values.choice("loss")?)?;
    let flow_dir = option_key(ORIENTATION_OPTIONS, "flow_dir", values.choice("flow_dir")?)?;
    let outside = match crate::restraint::joint_uses_od(values.choice("joint").unwrap_or("flanged")) {
        true => {
            let od: Length = values.typed("od")?;
            let od2: Length = values.typed("od2")?;
            let mut errors = FieldErrors::default();
            for (field, od, bore) in [("od", od, d), ("od2", od2, d2)] {
                if od <= bore {
                    errors.push(FieldError::inconsistent(
                        field,
                        "the outside diameter must be larger than the inside diameter",
                    ));
                }
            }
            Some(errors.or_ok((od, od2))?)
        }
        false => None,
    };
    let fluid = common::fluid_from(values)?;
    let flow = common::flow_given_from(values)?;
    if loss == "borda" && d2 <= d {
        return Err(FieldError::inconsistent(
            "loss",
            "Borda–Carnot is the loss of a sudden expansion; this fitting does not expand (outlet not larger \
                    than inlet): choose the cone-angle formula or a given K",
        )
        .into());
    }
    let k_given = match loss {
        "k" => Some((
            values.typed("k")?,
            option_key(K_REF_OPTIONS, "k_ref", values.choice("k_ref").unwrap_or("small"))?,
        )),
        _ => None,
    };
    Ok(Inputs {
        d,
        d2,
        known,
        cone_angle,
        loss,
        k_given,
        flow_dir,
        outside,
        fluid,
        flow,
        flow_field: common::flow_field(values),
        profile_in: common::profile_from(values, &common::INLET_PROFILE)?,
        profile_out: common::profile_from(values, &common::OUTLET_PROFILE)?,
        weights: common::weights_from(values),
        gravity: Acceleration::new::<uom::si::acceleration::meter_per_second_squared>(common::gravity_from(values)),
    })
}

/// The solved reducer.
#[derive(Clone, Debug)]
pub struct Solved {
    pub balance: engine::Balance,
    /// The loss coefficient used and the description of its method.
    pub k: f64,
    pub loss_text: String,
    /// Included angle used (π for Borda–Carnot, a sudden step), rad.
    pub theta: f64,
    /// Length of the cone, m.
    pub length: f64,
    pub axis: Direction,
    pub expands: bool,
    pub a_in: f64,
    pub a_out: f64,
    pub basis_a_in: f64,
    pub basis_a_out: f64,
    /// The port the loss coefficient refers to (0 inlet, 1 outlet).
    pub reference_port: usize,
    /// Gravity in the drawing axes, m/s².
    pub gravity: Vec3,
    /// Volume of fluid inside, m³.
    pub volume: f64,
}

/// The pure model: the control volume of the fluid in the cone and its balances.
///
/// # Errors
/// An engine refusal, on the known pressure's field.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let (d_in, d_out) = (inputs.d.value, inputs.d2.value);
    let g = inputs.gravity.value;
    let mut theta = inputs.cone_angle.value;
    let loss_model = inputs.loss;
    let orientation = inputs.flow_dir;
    let outside = inputs.outside.map(|(od, od2)| (od.value, od2.value));
    let fluid = &inputs.fluid;
    let flow = inputs.flow;
    let expands = d_out > d_in;
    let (a_in, a_out) = (common::circle_area(d_in), common::circle_area(d_out));
    let small_port = if expands { 0 } else { 1 };

    let (k, reference_port, loss_text) = match loss_model {
        "borda" => {
            theta = PI;
            let k = (1.0 - a_in / a_out).powi(2);
            (
                k,
                0,
                "Borda–Carnot sudden expansion, K = (1 − A₁/A₂)² on the inlet velocity".to_string(),
            )
        }
        "k" => {
            let (k, k_ref) = inputs.k_given.map_or((0.0, "small"), |(k, r)| (k.value, r));
            let (port, name) = match k_ref {
                "inlet" => (0, "the inlet velocity"),
                "outlet" => (1, "the outlet velocity"),
                _ => (small_port, "the smaller pipe's velocity"),
            };
            (k, port, format!("given K on {name}"))
        }
        "none" => (0.0, small_port, "no loss (Bernoulli)".to_string()),
        _ => (
            crane_k_small(d_in, d_out, theta),
            small_port,
            format!(
                "cone-angle {} formula (Crane TP-410), K on the smaller pipe's velocity",
                if expands { "expansion" } else { "contraction" }
            ),
        ),
    };

    let (axis, gravity) = match orientation {
        "upward" => (Direction::Y, Vec3::new(0.0, -g, 0.0)),
        "downward" => (Direction::in_plane(-PI / 2.0), Vec3::new(0.0, -g, 0.0)),
        _ => (Direction::X, Vec3::new(0.0, 0.0, -g)),
    };
    let length = if theta >= PI {
        0.0
    } else {
        (d_in - d_out).abs() / (2.0 * (theta / 2.0).tan())
    };
    let volume = PI * length * (d_in * d_in + d_in * d_out + d_out * d_out) / 12.0;
    let a = axis.vec();

    let mut cv = ControlVolume::new(fluid.clone());
    cv.gravity(gravity);
    let mut inlet = inputs
        .profile_in
        .apply(Port::inlet("inlet", si::area(a_in), axis).at(Vec3::ZERO));
    inlet.flow = flow;
    let outlet = inputs
        .profile_out
        .apply(Port::outlet("outlet", si::area(a_out), axis).at(a * length));
    let [inlet, outlet] = inputs.known.apply(inlet, outlet);
    let i = cv.port(inlet);
    let o = cv.port(outlet);
    cv.stream(Stream::new(i, o).loss(Loss::Coefficient { k, reference_port }));
    // Neglected weights: gravity still sets the elevation head, the fluid weighs nothing.
    let weighed_volume = if inputs.weights { volume } else { 0.0 };
    cv.contains(si::volume(weighed_volume), a * (0.5 * length));
    let field = inputs.known.field();
    let mut balance = engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, field)))?;
    if let Some((od_in, od_out)) = outside {
        // Push-on or mechanical joints: the solved pressures also act on the wall
        // annulus out to the outside diameter at each end.
        common::add_joint_annulus_forces(&mut cv, &balance, [(i, od_in), (o, od_out)]);
        balance = engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, field)))?;
    }
    let (basis_a_in, basis_a_out) = match outside {
        Some((od_in, od_out)) => (common::circle_area(od_in), common::circle_area(od_out)),
        None => (a_in, a_out),
    };

    Ok(Solved {
        balance,
        k,
        loss_text,
        theta,
        length,
        axis,
        expands,
        a_in,
        a_out,
        basis_a_in,
        basis_a_out,
        reference_port,
        gravity,
        volume,
    })
}
