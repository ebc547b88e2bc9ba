//! The bend page's report, built from the solved model: outputs, the checks by
//! paths that do not use the engine (Bernoulli for the outlet pressure, the closed
//! form of the momentum balance, the static formula), warnings, the carry-over to
//! the thrust-restraint page, the tables and the diagram.

use crate::catalog::Report;
use crate::restraint::Plane;
use crate::units::QuantityKind as Q;
use crate::vector::Direction;

use super::super::common;
use super::model::{Inputs, Solved};

/// Writes the whole report of a solved bend.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let Solved {
        geometry,
        balance,
        gravity,
        a_in,
        a_out,
        basis_a_in,
        basis_a_out,
        volume,
    } = solved;
    let (geometry, gravity) = (*geometry, *gravity);
    let (a_in, a_out, basis_a_in, basis_a_out, volume) = (*a_in, *a_out, *basis_a_in, *basis_a_out, *volume);
    let (d_in, d_out) = (inputs.d.value, inputs.d2.value);
    let (k, theta) = (inputs.k.value, inputs.angle.value);
    let w_fitting = if inputs.weights { inputs.w_fitting.value } else { 0.0 };
    let g = inputs.gravity.value;
    let (beta1, beta2) = (inputs.profile_in.beta.value, inputs.profile_out.beta.value);
    let (alpha1, alpha2) = (inputs.profile_in.alpha.value, inputs.profile_out.alpha.value);
    let plane = inputs.plane;
    let fluid = &inputs.fluid;
    let outside = inputs.outside.map(|(od, od2)| (od.value, od2.value));
    let (i, o) = (0, 1);
    let thrust = balance.thrust();
    let inlet_state = &balance.ports[i];
    let outlet_state = &balance.ports[o];
    let in_plane = (thrust.x * thrust.x + thrust.y * thrust.y).sqrt();
    report.output("thrust", thrust.norm());
    report.output("thrust_in_plane", in_plane);
    // The components right under the headline; z only where there is one (a
    // component at rounding level of the thrust is none).
    report.output("thrust_x", thrust.x);
    report.output("thrust_y", thrust.y);
    if thrust.z.abs() > 1e-9 * thrust.norm() {
        report.output("thrust_z", thrust.z);
    }
    if in_plane > 0.0 {
        report.output("thrust_angle", thrust.plane_angle());
    }
    report.output("p_in", inlet_state.pressure);
    report.output("p_out", outlet_state.pressure);
    report.output("v_in", inlet_state.speed);
    report.output("v_out", outlet_state.speed);
    report.output("flow", inlet_state.volume_flow);
    report.output("mass_flow", inlet_state.mass_flow);
    let pressure_force: f64 = balance.ports.iter().map(|p| p.pressure_force.norm()).sum();
    let momentum: f64 = balance.ports.iter().map(|p| p.momentum_outflow.norm()).sum();
    if pressure_force > 0.0 {
        report.output("momentum_share", momentum / pressure_force);
    }
    report.output("fluid_weight", balance.fluid_weight.norm());
    report.output("density", fluid.density);
    report.output("viscosity", fluid.viscosity);

    // Check: the closed-form momentum balance of a bend, with the unknown pressure
    // from the energy line with α and the loss (not the engine's), the weights along
    // gravity.
    let mass_flow = inlet_state.mass_flow;
    let rho = fluid.density;
    let (v1, v2) = (mass_flow / (rho * a_in), mass_flow / (rho * a_out));
    let dz = gravity.dot(geometry.outlet_position()) / -g;
    // p₁ − p₂ = ρ(α₂V₂² − α₁V₁²)/2 + ρg(z₂ − z₁) + K·ρV₁²/2.
    let drop = 0.5 * rho * (alpha2 * v2 * v2 - alpha1 * v1 * v1) + rho * g * dz + k * 0.5 * rho * v1 * v1;
    let known = inputs.known.pascals();
    let (p_in, p_out) = if inputs.known.at_inlet() {
        (known, known - drop)
    } else {
        (known + drop, known)
    };
    let (solved_label, solved_by_engine, solved_closed) = if inputs.known.at_inlet() {
        ("Gauge pressure at the outlet", outlet_state.pressure, p_out)
    } else {
        ("Gauge pressure at the inlet", inlet_state.pressure, p_in)
    };
    let energy_terms = known.abs() + rho * (alpha1 * v1 * v1 + alpha2 * v2 * v2 + k * v1 * v1 + g * dz.abs());
    report.check(
        solved_label,
        "energy line with α and the loss, p₁ + α₁ρV₁²/2 = p₂ + α₂ρV₂²/2 + ρg(z₂ − z₁) + K·ρV₁²/2",
        Q::Pressure,
        solved_by_engine,
        solved_closed,
        1e-9,
        // Relative to the largest term of the energy line (they can cancel).
        energy_terms,
    );
    let e1 = Direction::X.vec();
    let e2 = geometry.outlet_direction().vec();
    let down = gravity * (1.0 / g);
    let fluid_weight = if inputs.weights { rho * g * volume } else { 0.0 };
    let closed = e1 * (p_in * basis_a_in + beta1 * mass_flow * v1)
        - e2 * (p_out * basis_a_out + beta2 * mass_flow * v2)
        + down * (fluid_weight + w_fitting);
    // Relative to the sum of the terms' magnitudes: the terms can cancel, and the
    // pressure found by the energy line carries the rounding of its terms (a fast
    // 1 mm bore on a wide outside diameter: seen off by 2.5e-9 of the momentum).
    let scale = p_in.abs() * basis_a_in
        + p_out.abs() * basis_a_out
        + energy_terms * basis_a_in.max(basis_a_out)
        + mass_flow * (beta1 * v1 + beta2 * v2)
        + fluid_weight
        + w_fitting;
    report.check(
        "Thrust, along the inlet (x)",
        "closed form (p₁A₁ + β₁ṁV₁)·e₁ − (p₂A₂ + β₂ṁV₂)·e₂ + W",
        Q::Force,
        thrust.x,
        closed.x,
        1e-9,
        scale,
    );
    report.check(
        "Thrust, across the inlet in the plane (y)",
        "the same closed form, y component",
        Q::Force,
        thrust.y,
        closed.y,
        1e-9,
        scale,
    );
    if outside.is_none() && (d_in - d_out).abs() <= 1e-12 * d_in && mass_flow == 0.0 && plane == Plane::Horizontal {
        report.check(
            "Thrust in the plane of the bend",
            "static formula 2·p·A·sin(θ/2) of the thrust-restraint guides",
            Q::Force,
            in_plane,
            2.0 * p_in * a_in * (theta / 2.0).sin(),
            1e-9,
            0.0,
        );
    }

    common::forward_warnings(balance, report);
    let flow_field = inputs.flow_field;
    common::pipe_velocity_warning(report, flow_field, "inlet", inlet_state.speed);
    common::pipe_velocity_warning(report, "d2", "outlet", outlet_state.speed);
    let solved_place = if inputs.known.at_inlet() { "outlet" } else { "inlet" };
    if solved_by_engine < 0.0 {
        report.warn(
            Some(inputs.known.field()),
            format!("the {solved_place} gauge pressure comes out below atmospheric: check the inputs"),
        );
    }
    if !inputs.weights && plane != Plane::Horizontal {
        report.warn(
            Some("weights"),
            "the weights of the fluid and the fitting are left out: a vertical bend's restraint carries them \
                too; include them for design",
        );
    }
    if p_in == 0.0 && inlet_state.speed == 0.0 {
        report.warn(
            Some(inputs.known.field()),
            "with no pressure and no flow the only load is the weight of the fluid",
        );
    }

    // Carry the thrust to the restraint page. A vertical bend carries its resultant
    // with its angle above the horizontal; a horizontal bend carries the in-plane
    // thrust only: the fluid's weight (z) rests on the bedding, not on the block
    // (carried with it, a large low-pressure bend would open as a sag block).
    let (carried, vertical, horizontal) = match plane {
        Plane::Sag | Plane::Crest => (thrust.norm(), thrust.y, thrust.x.hypot(thrust.z)),
        Plane::Horizontal => (in_plane, 0.0, in_plane),
    };
    let carry = common::thrust_carry_over(
        report,
        "Size a thrust block for this thrust",
        carried,
        vertical.atan2(horizontal),
    );
    report.solution.carry_over.push(carry);

    report.table(|report| {
        let equal = (d_in - d_out).abs() <= 1e-9 * d_in;
        let direction = if equal && p_in > 0.0 {
            "along the bisector of the bend, away from its centre (equal sizes; flow and weight tilt it slightly, \
                    see the angle)"
        } else {
            "as given by the angle: a reducing bend's thrust leaves the bisector"
        };
        let loss = if k > 0.0 {
            format!(
                "K = {} on the inlet velocity (method as typed)",
                crate::units::format_significant(k, 3)
            )
        } else {
            "none".to_string()
        };
        let plane_text = match plane {
            Plane::Sag => "vertical, the line turning upward (a sag): fluid weight in the plane",
            Plane::Crest => "vertical, the line turning downward (a crest): fluid weight in the plane",
            Plane::Horizontal => "horizontal: fluid weight normal to the plane (carried by the bedding)",
        };
        let mut basis = common::balance_basis_rows(
            &inputs.known,
            &[
                ("Velocity profile, inlet", &inputs.profile_in),
                ("Velocity profile, outlet", &inputs.profile_out),
            ],
            inputs.weights,
            g,
        );
        basis.extend(vec![
            (
                "Pressure area",
                match outside {
                    Some((od_in, od_out)) => format!(
                        "outside diameters {} and {} (push-on or mechanical joints, restrained or not): the \
                                pressure on the wall annulus is its own ledger term; momentum on the bores",
                        report.fmt(od_in, Q::Length),
                        report.fmt(od_out, Q::Length)
                    ),
                    None => "inside diameter (welded, flanged or fused joints only)".to_string(),
                },
            ),
            ("Direction of the thrust", direction.to_string()),
            ("Plane", plane_text.to_string()),
            ("Loss", loss),
            ("Fluid", fluid.name.clone()),
        ]);
        common::basis_table(basis)
    });
    report.table(|report| common::ledger_table(balance, report.system()));
    report.table(|report| common::ports_table(balance, report.system()));
    report.diagram(|report| super::diagram::diagram(&geometry, balance, report));
}
