//! Reducer or expander (concentric): the axial thrust the restraint must carry.
//!
//! # Method
//! A control volume is drawn around the fluid in the fitting, cut at the inlet face
//! (1) and the outlet face (2). With x along the flow, the linear-momentum balance
//! ([`crate::engine`]) gives the force the supports exert,
//!
//! R = p₁A₁n₁ + p₂A₂n₂ + ṁ(β₂V₂ − β₁V₁) − W, and the thrust T = −R,
//!
//! whose axial part is T_x = p₁A₁ − p₂A₂ + ṁ(V₁ − V₂). The outlet pressure comes
//! from the energy balance with the fitting's loss,
//!
//! p₂ = p₁ + ρ(V₁² − V₂²)/2 − ρg(z₂ − z₁) − K·ρV_ref²/2,
//!
//! with K on the velocity of the smaller pipe (or a named one) and taken from:
//! - Crane TP-410, *Flow of Fluids Through Valves, Fittings, and Pipe*, formulas for
//!   conical contractions and expansions by included angle θ and diameter ratio
//!   β = d_small/d_large (K on the small pipe): contraction 0.8·sin(θ/2)(1 − β²) for
//!   θ < 45°, else 0.5·(1 − β²)·√sin(θ/2); expansion 2.6·sin(θ/2)(1 − β²)² for
//!   θ < 45°, else (1 − β²)²;
//! - Borda–Carnot for a sudden expansion, K = (1 − A₁/A₂)² on the inlet velocity,
//!   which follows from the momentum balance with the inlet pressure acting on the
//!   annular step (White, *Fluid Mechanics*, minor losses; Idelchik, *Handbook of
//!   Hydraulic Resistance*, sudden expansion); with it the thrust is exactly
//!   p₁(A₂ − A₁), towards the small end;
//! - a K the user gives, naming its source.
//!
//! With no flow the thrust reduces to the static formula T = p(A₁ − A₂) of the
//! thrust-restraint guides (DIPRA, *Thrust Restraint Design for Ductile Iron Pipe*;
//! AWWA Manual M41).
//!
//! # Checks
//! Recorded with [`Report::check`], each without the engine: the outlet pressure by
//! the energy line above; the axial thrust by the closed form
//! p₁A₁ − p₂A₂ + ṁ(V₁ − V₂) + W·(ĝ·x̂) on the area basis; at rest in a horizontal
//! fitting, the static formula p(A₁ − A₂); with Borda–Carnot on the bores,
//! −p₁(A₂ − A₁).
//!
//! # Area basis
//! The joint (`joint`, empty: flanged) sets the area. For push-on and mechanical
//! joints, restrained or not (they seal on the spigot's outside; `od`, `od2`), the
//! pressure at each face also acts on the
//! wall annulus out to the outside diameter: −p·(A_OD − A)·n is added to the engine
//! as a named force per face, and the static formula uses the outside areas.
//!
//! # Code
//! [`read`] reads the values once into typed [`Inputs`] (uom quantities), [`solve`]
//! is the pure model (control volume, balances, joint annulus forces) returning a
//! [`Solved`], from which the report and diagram are built.
//!
//! # Assumptions
//! Incompressible, steady flow; uniform pressure over each face; momentum on the
//! bores; the fluid inside is a cone frustum of the included angle.
//! A horizontal fitting's fluid weight acts out of the drawing plane (z); a vertical
//! one's along the axis.

use std::f64::consts::PI;

use crate::catalog::{
    CalculatorSpec, ChoiceOption, Diagram, FieldSpec, Limits, OutputSpec, Report, Shape, ShapeStyle, Values,
};
use crate::engine::{self, si, ControlVolume, Loss, Port, Stream};
use crate::error::{FieldError, FieldErrors};
use crate::units::{QuantityKind as Q, STANDARD_GRAVITY};
use crate::vector::{Direction, Vec3};
use uom::si::f64::{Angle, Length, Pressure, Ratio};

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};

pub const KEY: &str = "reducer";

const LOSS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "crane",
        label: "Crane TP-410 formula for the cone angle",
    },
    ChoiceOption {
        key: "borda",
        label: "Sudden expansion, Borda–Carnot (1 − A₁/A₂)²",
    },
    ChoiceOption {
        key: "k",
        label: "Given loss coefficient K",
    },
    ChoiceOption {
        key: "none",
        label: "No loss (Bernoulli)",
    },
];

const K_REF_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "small",
        label: "Velocity in the smaller pipe",
    },
    ChoiceOption {
        key: "inlet",
        label: "Velocity at the inlet",
    },
    ChoiceOption {
        key: "outlet",
        label: "Velocity at the outlet",
    },
];

const ORIENTATION_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "horizontal",
        label: "Horizontal (plan view)",
    },
    ChoiceOption {
        key: "upward",
        label: "Vertical, flow upward",
    },
    ChoiceOption {
        key: "downward",
        label: "Vertical, flow downward",
    },
];

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity(
            "d",
            "Inlet inside diameter",
            Q::Length,
            "mm",
            "in",
            "310 mm",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            "Bore of the pipe the flow comes from.",
        ),
        quantity(
            "d2",
            "Outlet inside diameter",
            Q::Length,
            "mm",
            "in",
            "250 mm",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            "Smaller than the inlet for a reducer, larger for an expander.",
        ),
        quantity(
            "p",
            "Gauge pressure at the inlet",
            Q::Pressure,
            "bar",
            "psi",
            "10 bar",
            Limits::closed(0.0, MAX_PRESSURE_PA),
            "The design pressure: the highest the line will see, including test pressure and surge. Gauge, so not below 0.",
        ),
    ];
    fields.extend(common::flow_given_fields("850 m3/h"));
    fields.extend(common::fluid_fields("25 degC"));
    fields.extend([
        quantity(
            "cone_angle",
            "Included cone angle",
            Q::Angle,
            "deg",
            "deg",
            "30 deg",
            Limits::closed(crate::restraint::MIN_ANGLE, PI),
            "Full angle of the cone, from 0.1 up to 180 degrees (a sudden step). Sets the length of the fitting and the Crane loss.",
        ),
        choice(
            "loss",
            "Loss model",
            LOSS_OPTIONS,
            "crane",
            "Where the fitting's head loss comes from; it lowers the outlet pressure and so raises the thrust of a reducer.",
        ),
        FieldSpec {
            visible_when: Some(("loss", &["k"])),
            ..quantity(
                "k",
                "Loss coefficient K",
                Q::Ratio,
                "-",
                "-",
                "0.05",
                Limits::closed(0.0, 50.0),
                "Head loss K·V²/2g on the velocity chosen below; name the method your K comes from.",
            )
        },
        FieldSpec {
            visible_when: Some(("loss", &["k"])),
            ..choice(
                "k_ref",
                "K refers to",
                K_REF_OPTIONS,
                "small",
                "Most tables give K on the velocity in the smaller pipe.",
            )
        },
        choice(
            "flow_dir",
            "Direction of flow",
            ORIENTATION_OPTIONS,
            "horizontal",
            "In a vertical fitting the fluid's weight acts along the axis and the outlet is higher or lower.",
        ),
        FieldSpec {
            optional: true,
            ..choice(
                "joint",
                "Joints at the fitting (thrust area)",
                crate::restraint::Joint::OPTIONS,
                "flanged",
                "Push-on and mechanical joints seal on the spigot's outside, restrained or not: the pressure then also acts on the wall annulus out to the outside diameter of the sealing joint. Only welded, flanged or fused joints take the bore. Empty means flanged (the bore).",
            )
        },
        FieldSpec {
            visible_when: Some(("joint", crate::restraint::OD_JOINTS)),
            ..quantity(
                "od",
                "Inlet pipe outside diameter",
                Q::Length,
                "mm",
                "in",
                "326 mm",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Outside diameter of the inlet pipe at its joint.",
            )
        },
        FieldSpec {
            visible_when: Some(("joint", crate::restraint::OD_JOINTS)),
            ..quantity(
                "od2",
                "Outlet pipe outside diameter",
                Q::Length,
                "mm",
                "in",
                "274 mm",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Outside diameter of the outlet pipe at its joint.",
            )
        },
    ]);
    CalculatorSpec {
        key: KEY,
        title: "Reducer or expander thrust",
        group: crate::catalog::group::FITTINGS,
        summary: "Axial thrust on a concentric reducer or expander, with the outlet pressure from the energy balance and the fitting's loss.",
        fields,
        outputs: vec![
            OutputSpec { key: "thrust", label: "Axial thrust on the supports (magnitude)", kind: Q::Force, headline: true },
            OutputSpec { key: "thrust_axial", label: "Axial thrust, + along the flow, − against it", kind: Q::Force, headline: false },
            OutputSpec { key: "thrust_resultant", label: "Resultant thrust, with the fluid's weight", kind: Q::Force, headline: false },
            OutputSpec { key: "p_out", label: "Gauge pressure at the outlet", kind: Q::Pressure, headline: true },
            OutputSpec { key: "k_used", label: "Loss coefficient used, on the reference velocity", kind: Q::Ratio, headline: false },
            OutputSpec { key: "head_loss", label: "Head loss in the fitting", kind: Q::Length, headline: false },
            OutputSpec { key: "v_in", label: "Mean velocity at the inlet", kind: Q::Velocity, headline: false },
            OutputSpec { key: "v_out", label: "Mean velocity at the outlet", kind: Q::Velocity, headline: false },
            OutputSpec { key: "flow", label: "Volumetric flow", kind: Q::VolumeFlow, headline: false },
            OutputSpec { key: "mass_flow", label: "Mass flow", kind: Q::MassFlow, headline: false },
            OutputSpec { key: "length", label: "Length of the cone", kind: Q::Length, headline: false },
            OutputSpec { key: "momentum_share", label: "Momentum flux ÷ pressure force", kind: Q::Ratio, headline: false },
            OutputSpec { key: "fluid_weight", label: "Weight of the fluid inside", kind: Q::Force, headline: false },
            OutputSpec { key: "density", label: "Fluid density", kind: Q::Density, headline: false },
        ],
        cautions: vec![
            "For push-on and mechanical joints choose that joint (the outside-diameter basis): using the bores there under-states the thrust by the wall's share, often 15 % or more.",
            "Loss coefficients of reducers differ between published methods (Crane, Idelchik, Rennels, Miller) by tens of per cent; the thrust is rarely sensitive to them, the outlet pressure more so.",
        ],
    }
}

/// The loss coefficient on the smaller pipe's velocity from Crane TP-410's conical
/// contraction and expansion formulas; `theta` is the included angle in radians.
pub fn crane_k_small(d_in: f64, d_out: f64, theta: f64) -> f64 {
    let beta = d_in.min(d_out) / d_in.max(d_out);
    let b2 = beta * beta;
    let s = (theta / 2.0).sin();
    let steep = theta >= PI / 4.0;
    if d_out < d_in {
        if steep {
            0.5 * (1.0 - b2) * s.sqrt()
        } else {
            0.8 * s * (1.0 - b2)
        }
    } else if steep {
        (1.0 - b2).powi(2)
    } else {
        2.6 * s * (1.0 - b2).powi(2)
    }
}

/// The page's inputs, validated. Diameters and pressures are uom quantities.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub d: Length,
    pub d2: Length,
    pub p: Pressure,
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
    let p = values.typed("p")?;
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
            "Borda–Carnot is the loss of a sudden expansion; this fitting does not expand (outlet not larger than inlet): choose the Crane formula or a given K",
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
        p,
        cone_angle,
        loss,
        k_given,
        flow_dir,
        outside,
        fluid,
        flow,
        flow_field: common::flow_field(values),
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
/// An engine refusal, on `p`.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let (d_in, d_out, p_in) = (inputs.d.value, inputs.d2.value, inputs.p.value);
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
                "Crane TP-410 conical {} formula, K on the smaller pipe's velocity",
                if expands { "expansion" } else { "contraction" }
            ),
        ),
    };

    let (axis, gravity) = match orientation {
        "upward" => (Direction::Y, Vec3::new(0.0, -STANDARD_GRAVITY, 0.0)),
        "downward" => (Direction::in_plane(-PI / 2.0), Vec3::new(0.0, -STANDARD_GRAVITY, 0.0)),
        _ => (Direction::X, Vec3::new(0.0, 0.0, -STANDARD_GRAVITY)),
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
    let mut inlet = Port::inlet("inlet", si::area(a_in), axis)
        .pressure(si::pressure(p_in))
        .at(Vec3::ZERO);
    inlet.flow = flow;
    let i = cv.port(inlet);
    let o = cv.port(Port::outlet("outlet", si::area(a_out), axis).at(a * length));
    cv.stream(Stream::new(i, o).loss(Loss::Coefficient { k, reference_port }));
    cv.contains(si::volume(volume), a * (0.5 * length));
    let mut balance = engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, "p")))?;
    if let Some((od_in, od_out)) = outside {
        // Push-on or mechanical joints: the solved pressures also act on the wall
        // annulus out to the outside diameter at each end (a second pass adds them as
        // named forces; they change no pressure or flow).
        let ends = [(i, od_in, a_in, "inlet"), (o, od_out, a_out, "outlet")];
        for (port, od, bore, name) in ends {
            let pressure = balance.ports[port].pressure;
            let normal = cv.ports[port].outward_normal();
            let force = common::joint_annulus_force(pressure, bore, common::circle_area(od), normal);
            let at = cv.ports[port].position;
            cv.extra_force(
                &format!("{name} joint, pressure on the wall annulus to the OD"),
                force,
                at,
            );
        }
        balance = engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, "p")))?;
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

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let inputs = read(values)?;
    let solved = solve(&inputs)?;
    write(&inputs, &solved, report);
    Ok(())
}

/// The report, built from the solved model.
fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (d_in, d_out, p_in) = (inputs.d.value, inputs.d2.value, inputs.p.value);
    let (loss_model, orientation) = (inputs.loss, inputs.flow_dir);
    let outside = inputs.outside.map(|(od, od2)| (od.value, od2.value));
    let fluid = &inputs.fluid;
    let Solved {
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
    } = solved;
    let (reference_port, gravity, volume) = (*reference_port, *gravity, *volume);
    let (k, theta, length, axis, expands) = (*k, *theta, *length, *axis, *expands);
    let (a_in, a_out, basis_a_in, basis_a_out) = (*a_in, *a_out, *basis_a_in, *basis_a_out);
    let a = axis.vec();
    let (i, o) = (0, 1);
    let thrust = balance.thrust();
    let axial = thrust.dot(a);
    let (inlet_state, outlet_state) = (&balance.ports[i], &balance.ports[o]);
    report.output("thrust", axial.abs());
    report.output("thrust_axial", axial);
    report.output("thrust_resultant", thrust.norm());
    report.output("p_out", outlet_state.pressure);
    report.output("k_used", k);
    if let Some(s) = balance.streams.first() {
        report.output("head_loss", s.head_loss);
    }
    report.output("v_in", inlet_state.speed);
    report.output("v_out", outlet_state.speed);
    report.output("flow", inlet_state.volume_flow);
    report.output("mass_flow", inlet_state.mass_flow);
    report.output("length", length);
    let pressure_force: f64 = balance.ports.iter().map(|p| p.pressure_force.norm()).sum();
    let momentum: f64 = balance.ports.iter().map(|p| p.momentum_outflow.norm()).sum();
    if pressure_force > 0.0 {
        report.output("momentum_share", momentum / pressure_force);
    }
    report.output("fluid_weight", balance.fluid_weight.norm());
    report.output("density", fluid.density);

    // Checks by the closed forms, computed here without the engine: the outlet
    // pressure from Bernoulli with the loss, the axial momentum balance, and at rest
    // the static formula of the thrust-restraint guides.
    let mass_flow = inlet_state.mass_flow;
    let rho = fluid.density;
    let (v1, v2) = (mass_flow / (rho * a_in), mass_flow / (rho * a_out));
    let v_ref = if reference_port == 0 { v1 } else { v2 };
    let up = -gravity.dot(a) / STANDARD_GRAVITY;
    let p_out =
        p_in + 0.5 * rho * (v1 * v1 - v2 * v2) - rho * STANDARD_GRAVITY * up * length - k * 0.5 * rho * v_ref * v_ref;
    report.check(
        "Gauge pressure at the outlet",
        "Bernoulli with the loss K·ρV_ref²/2",
        Q::Pressure,
        outlet_state.pressure,
        p_out,
        1e-9,
        // Relative to the largest term of the energy line (they can cancel).
        p_in.abs() + rho * (v1 * v1 + v2 * v2 + k * v_ref * v_ref) + rho * STANDARD_GRAVITY * length,
    );
    let weight_along = -up * rho * STANDARD_GRAVITY * volume;
    let closed_axial = p_in * basis_a_in - p_out * basis_a_out + mass_flow * (v1 - v2) + weight_along;
    report.check(
        "Axial thrust",
        "closed form p₁A₁ − p₂A₂ + ṁ(V₁ − V₂) + W along the axis, on the area basis",
        Q::Force,
        axial,
        closed_axial,
        1e-9,
        // Relative to the sum of the terms' magnitudes: the terms can cancel.
        p_in.abs() * basis_a_in + p_out.abs() * basis_a_out + mass_flow * (v1 + v2) + weight_along.abs(),
    );
    if mass_flow == 0.0 && orientation == "horizontal" {
        report.check(
            "Axial thrust",
            "static formula p·(A₁ − A₂) of the thrust-restraint guides",
            Q::Force,
            axial,
            p_in * (basis_a_in - basis_a_out),
            1e-9,
            0.0,
        );
    }
    if loss_model == "borda" && outside.is_none() && orientation == "horizontal" {
        report.check(
            "Axial thrust",
            "Borda–Carnot: the inlet pressure on the step, −p₁(A₂ − A₁)",
            Q::Force,
            axial,
            -p_in * (a_out - a_in),
            1e-9,
            p_in.abs() * a_out + p_out.abs() * a_out + mass_flow * (v1 + v2),
        );
    }

    common::forward_warnings(balance, report);
    common::pipe_velocity_warning(report, inputs.flow_field, "inlet", inlet_state.speed);
    common::pipe_velocity_warning(report, "d2", "outlet", outlet_state.speed);
    if (d_in - d_out).abs() <= 1e-9 * d_in {
        report.warn(
            Some("d2"),
            "the two diameters are equal: this is straight pipe and only friction and weight load it",
        );
    }
    if outlet_state.pressure < 0.0 {
        report.warn(
            Some("p"),
            "the outlet gauge pressure comes out below atmospheric: check the inputs",
        );
    }
    if loss_model == "crane" && expands && theta > PI / 4.0 && theta < PI {
        report.warn(
            Some("cone_angle"),
            "an expansion steeper than 45 degrees loses about as much as a sudden one: Crane's formula then gives the Borda–Carnot value",
        );
    }

    let direction_text = if axial.abs() <= 1e-9 * pressure_force.max(1.0) {
        "none (balanced)".to_string()
    } else if axial > 0.0 {
        "along the flow (downstream)".to_string()
    } else {
        "against the flow (upstream)".to_string()
    };
    let toward_small = (axial > 0.0) != expands;
    let kind = if expands {
        "expander (outlet larger)"
    } else if d_out < d_in {
        "reducer (outlet smaller)"
    } else {
        "equal sizes"
    };
    report.solution.tables.push(common::basis_table(vec![
        ("Fitting", kind.to_string()),
        ("Loss model", loss_text.clone()),
        (
            "Thrust direction",
            format!(
                "{direction_text}{}",
                if toward_small && axial != 0.0 {
                    ", towards the smaller end"
                } else {
                    ""
                }
            ),
        ),
        (
            "Thrust area basis",
            match outside {
                Some((od_in, od_out)) => format!(
                    "outside diameters {} and {} (push-on or mechanical joints): the pressure on the wall annulus is its own ledger term; momentum on the bores",
                    report.fmt(od_in, Q::Length),
                    report.fmt(od_out, Q::Length)
                ),
                None => "inside diameters (pressure and momentum terms)".to_string(),
            },
        ),
        (
            "Orientation",
            ORIENTATION_OPTIONS
                .iter()
                .find(|o| o.key == orientation)
                .map(|o| o.label)
                .unwrap_or(orientation)
                .to_string(),
        ),
    ]));
    let system = report.system();
    report.solution.tables.push(common::ledger_table(balance, system));
    report.solution.tables.push(common::ports_table(balance, system));
    let diagram = diagram(d_in, d_out, length, axis, balance, report);
    report.solution.diagrams.push(diagram);
    // The carried force is the axial thrust; up is +z in plan view, +y in elevation.
    let up = if a.y.abs() > 0.5 {
        Vec3::new(0.0, 1.0, 0.0)
    } else {
        Vec3::new(0.0, 0.0, 1.0)
    };
    let carried = a * axial;
    let elevation = if axial != 0.0 {
        (carried.dot(up) / axial.abs()).clamp(-1.0, 1.0).asin()
    } else {
        0.0
    };
    let carry = common::thrust_carry_over(
        report,
        "Size a thrust block for this axial thrust",
        axial.abs(),
        elevation,
    );
    report.solution.carry_over.push(carry);
}

fn diagram(
    d_in: f64,
    d_out: f64,
    length: f64,
    axis: Direction,
    balance: &engine::Balance,
    report: &Report<'_>,
) -> Diagram {
    let a = axis.vec();
    let n = Vec3::new(-a.y, a.x, 0.0);
    let at = |s: f64, t: f64| -> [f64; 2] { [a.x * s + n.x * t, a.y * s + n.y * t] };
    let big = d_in.max(d_out);
    let lead = 1.5 * big;
    let wall = 0.08 * big;
    let outline = |grow: f64, s0: f64, s1: f64| -> Vec<[f64; 2]> {
        let (r_in, r_out) = (d_in / 2.0 + grow, d_out / 2.0 + grow);
        vec![
            at(s0, r_in),
            at(0.0, r_in),
            at(length, r_out),
            at(s1, r_out),
            at(s1, -r_out),
            at(length, -r_out),
            at(0.0, -r_in),
            at(s0, -r_in),
        ]
    };
    let mut shapes = vec![
        Shape::Polygon {
            points: outline(wall, -lead, length + lead),
            style: ShapeStyle::Wall,
        },
        Shape::Polygon {
            points: outline(0.0, -lead, length + lead),
            style: ShapeStyle::Fluid,
        },
    ];
    // Control volume: the fluid between the two faces (a thin band for a sudden step).
    let cv_len = length.max(0.1 * big);
    shapes.push(Shape::Polygon {
        points: vec![
            at(0.0, 0.6 * d_in),
            at(cv_len, 0.6 * d_out),
            at(cv_len, -0.6 * d_out),
            at(0.0, -0.6 * d_in),
        ],
        style: ShapeStyle::ControlVolume,
    });
    shapes.push(Shape::Polyline {
        points: vec![at(-lead, 0.0), at(length + lead, 0.0)],
        style: ShapeStyle::Guide,
    });

    let thrust = balance.thrust();
    let in_plane = |v: Vec3| Vec3::new(v.x, v.y, 0.0);
    let max_force = balance
        .ports
        .iter()
        .map(|p| p.pressure_force.norm())
        .chain([in_plane(thrust).norm()])
        .fold(0.0, f64::max);
    let scale = if max_force > 0.0 { 1.2 * lead / max_force } else { 0.0 };
    let fmt = |f: Vec3| report.fmt(in_plane(f).norm(), Q::Force);
    // The two face arrows are drawn a little off the axis so their labels do not meet.
    for (port, (s, t)) in balance.ports.iter().zip([(0.0, 0.2 * d_in), (length, -0.2 * d_out)]) {
        if let Some(arrow) = common::force_arrow(
            at(s, t),
            port.pressure_force,
            scale,
            format!("p·A {}", fmt(port.pressure_force)),
            ShapeStyle::Pressure,
            false,
        ) {
            shapes.push(arrow);
        }
    }
    let side = 0.9 * big;
    common::thrust_and_restraint_arrows(
        &mut shapes,
        at(0.5 * length, side),
        at(0.5 * length, -side),
        in_plane(thrust),
        scale,
        &fmt(thrust),
    );
    shapes.push(Shape::Text {
        at: at(-lead, -d_in),
        text: "inlet".to_string(),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.3 * big);
    let view = if a.y.abs() > 0.5 { "elevation" } else { "plan view" };
    Diagram {
        title: format!("Reducer, {view}: control volume and forces"),
        bounds,
        shapes,
        caption: "Pipes and cone to scale; force arrows share one scale, in-plane components only. T acts on the supports; R = −T is what the restraint supplies.".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use crate::catalog::Request;
    use approx::assert_relative_eq;

    fn outcome(pairs: &[(&str, &str)]) -> crate::Outcome {
        crate::calculators::testing::outcome(super::KEY, pairs)
    }

    fn solved(pairs: &[(&str, &str)]) -> crate::catalog::Solution {
        crate::calculators::testing::solved(super::KEY, pairs)
    }

    #[test]
    fn still_reducer_matches_static_formula() {
        // Derived from the definition: T = p(A1 − A2) with no flow.
        let s = solved(&[("q", "0"), ("p", "5 bar"), ("d", "400 mm"), ("d2", "200 mm")]);
        let expected = 5e5 * std::f64::consts::PI * (0.16 - 0.04) / 4.0;
        assert_relative_eq!(s.output("thrust_axial").unwrap().si, expected, max_relative = 1e-12);
        assert!(
            s.checks
                .iter()
                .any(|c| c.basis.starts_with("static formula") && c.agrees()),
            "{:?}",
            s.checks
        );
    }

    #[test]
    fn borda_carnot_expander_thrust_is_inlet_pressure_on_the_step() {
        // Derived from the definition: with K = (1 − A1/A2)², p2 − p1 = ρV2(V1 − V2),
        // and the thrust is −p1(A2 − A1) exactly, whatever the flow.
        let s = solved(&[
            ("d", "200 mm"),
            ("d2", "400 mm"),
            ("p", "3 bar"),
            ("q", "300 m3/h"),
            ("loss", "borda"),
        ]);
        let step = std::f64::consts::PI * (0.16 - 0.04) / 4.0;
        assert_relative_eq!(s.output("thrust_axial").unwrap().si, -3e5 * step, max_relative = 1e-9);
    }

    #[test]
    fn crane_k_matches_the_formulas_below_45_degrees_and_for_a_sudden_step() {
        use std::f64::consts::PI;
        let k = super::crane_k_small(0.3, 0.2, 30f64.to_radians());
        assert_relative_eq!(
            k,
            0.8 * (15f64.to_radians()).sin() * (1.0 - 4.0 / 9.0),
            max_relative = 1e-12
        );
        let k = super::crane_k_small(0.2, 0.3, PI);
        assert_relative_eq!(k, (1.0f64 - 4.0 / 9.0).powi(2), max_relative = 1e-12);
    }

    #[test]
    fn vertical_thrust_is_carried_with_its_direction() {
        for (orientation, plane) in [("upward", "vertical_crest"), ("downward", "vertical_sag")] {
            let s = solved(&[("flow_dir", orientation)]);
            let carry = &s.carry_over[0];
            let field = |key: &str| carry.inputs.iter().find(|(k, _)| *k == key).map(|(_, v)| v.clone());
            assert_eq!(field("plane").as_deref(), Some(plane));
            let target = crate::calculators::spec(carry.calculator).expect("registered");
            let mut request = Request::default();
            for (k, v) in crate::catalog::demo_inputs(&target) {
                request.inputs.insert(k, v);
            }
            for (k, v) in &carry.inputs {
                request.inputs.insert(k.to_string(), v.clone());
            }
            let block = crate::solve(carry.calculator, &request).result.expect("accepted");
            assert_relative_eq!(
                block.output("thrust").unwrap().si,
                s.output("thrust").unwrap().si,
                max_relative = 1e-4
            );
        }
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let field = |pairs: &[(&str, &str)]| match outcome(pairs).result {
            Err(crate::SolveError::Fields(errors)) => errors[0].field.clone(),
            other => panic!("expected a field error, got {other:?}"),
        };
        assert_eq!(field(&[("loss", "borda")]), "loss");
        assert_eq!(field(&[("d2", "0 mm")]), "d2");
        assert_eq!(field(&[("p", "-2 psi")]), "p");
        assert_eq!(field(&[("loss", "k"), ("k", "")]), "k");
    }

    #[test]
    fn demo_matches_the_method_note_worked_example() {
        // site/notes/reducer.md works the demo by hand: K = 0.0724, p2 = 992.5 kPa,
        // T = 26.36 kN downstream (static 26.39 kN, no longer an output).
        let s = solved(&[]);
        assert_relative_eq!(s.output("k_used").unwrap().si, 0.0724, max_relative = 1e-3);
        assert_relative_eq!(s.output("p_out").unwrap().si, 992.5e3, max_relative = 1e-4);
        assert_relative_eq!(s.output("thrust_axial").unwrap().si, 26.36e3, max_relative = 2e-4);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }
}
