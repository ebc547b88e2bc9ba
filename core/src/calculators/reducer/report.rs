//! The reducer page's report, built from the solved model: outputs, the checks by
//! paths that do not use the engine, warnings, the basis and ledger tables, the
//! diagram and the carry-over to the thrust-restraint page.

use std::f64::consts::PI;

use crate::catalog::Report;
use crate::units::QuantityKind as Q;
use crate::vector::Vec3;

use super::super::common;
use super::model::{Inputs, Solved};
use super::ORIENTATION_OPTIONS;

/// The report, built from the solved model.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (d_in, d_out) = (inputs.d.value, inputs.d2.value);
    let g = inputs.gravity.value;
    let (beta1, beta2) = (inputs.profile_in.beta.value, inputs.profile_out.beta.value);
    let (alpha1, alpha2) = (inputs.profile_in.alpha.value, inputs.profile_out.alpha.value);
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
    report.output("p_in", inlet_state.pressure);
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
    // Borda–Carnot's closed form assumes uniform velocity at both faces.
    let uniform = inputs.profile_in.is_uniform() && inputs.profile_out.is_uniform();
    let (v1, v2) = (mass_flow / (rho * a_in), mass_flow / (rho * a_out));
    let v_ref = if reference_port == 0 { v1 } else { v2 };
    let up = -gravity.dot(a) / g;
    // p₁ − p₂ = ρ(α₂V₂² − α₁V₁²)/2 + ρg(z₂ − z₁) + K·ρV_ref²/2.
    let drop =
        0.5 * rho * (alpha2 * v2 * v2 - alpha1 * v1 * v1) + rho * g * up * length + k * 0.5 * rho * v_ref * v_ref;
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
    report.check(
        solved_label,
        "energy line with α and the loss, p₁ + α₁ρV₁²/2 = p₂ + α₂ρV₂²/2 + ρg(z₂ − z₁) + K·ρV_ref²/2",
        Q::Pressure,
        solved_by_engine,
        solved_closed,
        1e-9,
        // Relative to the largest term of the energy line (they can cancel).
        known.abs() + rho * (alpha1 * v1 * v1 + alpha2 * v2 * v2 + k * v_ref * v_ref) + rho * g * length,
    );
    let weight_along = if inputs.weights { -up * rho * g * volume } else { 0.0 };
    let closed_axial = p_in * basis_a_in - p_out * basis_a_out + mass_flow * (beta1 * v1 - beta2 * v2) + weight_along;
    report.check(
        "Axial thrust",
        "closed form p₁A₁ − p₂A₂ + ṁ(β₁V₁ − β₂V₂) + W along the axis, on the area basis",
        Q::Force,
        axial,
        closed_axial,
        1e-9,
        // Relative to the sum of the terms' magnitudes: the terms can cancel, and
        // the pressure found by the energy balance carries the rounding of the
        // kinetic-energy and loss terms it was found from.
        p_in.abs() * basis_a_in
            + p_out.abs() * basis_a_out
            + mass_flow * (beta1 * v1 + beta2 * v2)
            + weight_along.abs()
            + rho * (alpha1 * v1 * v1 + alpha2 * v2 * v2 + k * v_ref * v_ref) * basis_a_in.max(basis_a_out),
    );
    if mass_flow == 0.0 && orientation == "horizontal" {
        report.check(
            "Axial thrust",
            "static formula p·(A₁ − A₂) of the thrust-restraint guides",
            Q::Force,
            axial,
            p_in * (basis_a_in - basis_a_out),
            1e-9,
            // Relative to the two pressure forces: with equal areas (push-on joints
            // on one outside diameter) the formula gives 0 and the balance the
            // rounding of their difference.
            p_in.abs() * (basis_a_in + basis_a_out),
        );
    }
    if loss_model == "borda" && outside.is_none() && orientation == "horizontal" && uniform {
        report.check(
            "Axial thrust",
            "Borda–Carnot: the inlet pressure on the step, −p₁(A₂ − A₁)",
            Q::Force,
            axial,
            -p_in * (a_out - a_in),
            1e-9,
            // As above, the kinetic-energy terms too: the energy balance finds p₁ as
            // their difference, which can be a millionth of each (a 1 mm inlet on a
            // 10 m outlet).
            p_in.abs() * a_out + p_out.abs() * a_out + mass_flow * (v1 + v2) + rho * (v1 * v1 + v2 * v2) * a_out,
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
    let solved_place = if inputs.known.at_inlet() { "outlet" } else { "inlet" };
    if solved_by_engine < 0.0 {
        report.warn(
            Some(inputs.known.field()),
            format!("the {solved_place} gauge pressure comes out below atmospheric: check the inputs"),
        );
    }
    if !inputs.weights && orientation != "horizontal" {
        report.warn(
            Some("weights"),
            "the fluid's weight is left out: a vertical fitting's restraint carries it too; include it for design",
        );
    }
    if loss_model == "cone_formula" && expands && theta > PI / 4.0 && theta < PI {
        report.warn(
            Some("cone_angle"),
            "an expansion steeper than 45 degrees loses about as much as a sudden one: the cone-angle formula \
                    then gives the Borda–Carnot value",
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
                    "outside diameters {} and {} (push-on or mechanical joints): the pressure on the wall \
                            annulus is its own ledger term; momentum on the bores",
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
    ]);
    report.table(|_| common::basis_table(basis));
    let system = report.system();
    report.table(|_| common::ledger_table(balance, system));
    report.table(|_| common::ports_table(balance, system));
    report.diagram(|report| super::diagram::diagram(d_in, d_out, length, axis, balance, report));
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
