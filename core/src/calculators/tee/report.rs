//! The junction's report, built from the solved [`Solved`]: outputs, the checks by
//! independent paths, warnings, the basis, branch, ledger and ports tables, the
//! diagram and the carry-over to the thrust-restraint page.

use crate::catalog::{Report, Table};
use crate::units::{self, QuantityKind as Q};
use crate::vector::Vec3;

use super::super::common;
use super::model::{Inputs, Junction, KnownAt, Solved};
use super::BRANCHES;

/// Writes the whole report of a solved junction.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (balance, thrust, port_of) = (&solved.balance, solved.thrust, &solved.port_of);
    let branches = &inputs.branches;
    let (on_outside, k_on_common) = (inputs.on_outside(), inputs.k_on_common());
    let c = solved.common_port;
    let in_plane = (thrust.x * thrust.x + thrust.y * thrust.y).sqrt();
    report.output("thrust_in_plane", in_plane);
    if in_plane > 0.0 {
        report.output("thrust_angle", thrust.plane_angle());
    }
    report.output("thrust", thrust.norm());
    report.output("thrust_x", thrust.x);
    report.output("thrust_y", thrust.y);
    report.output("thrust_z", thrust.z);
    report.output("static_thrust", solved.static_thrust.norm());
    let common_state = &balance.ports[c];
    if let Some((_, &i)) = branches.iter().zip(port_of).find(|(b, _)| b.share.is_none()) {
        if common_state.volume_flow > 0.0 {
            report.output("solved_share", balance.ports[i].volume_flow / common_state.volume_flow);
        }
    }
    report.output("flow", common_state.volume_flow);
    report.output("mass_flow", common_state.mass_flow);
    report.output("v_common", common_state.speed);
    for (b, &i) in branches.iter().zip(port_of) {
        let keys = &BRANCHES[b.index];
        let state = &balance.ports[i];
        report.output(keys.p_out, state.pressure);
        report.output(keys.q_out, state.volume_flow);
        report.output(keys.v_out, state.speed);
    }
    let pressure_force: f64 = balance.ports.iter().map(|s| s.pressure_force.norm()).sum();
    let momentum: f64 = balance.ports.iter().map(|s| s.momentum_outflow.norm()).sum();
    if pressure_force > 0.0 {
        report.output("momentum_share", momentum / pressure_force);
    }
    report.output("fluid_weight", balance.fluid_weight.norm());
    report.output("density", inputs.fluid.density);
    independent_checks(report, inputs, solved);

    common::forward_warnings(balance, report);
    common::pipe_velocity_warning(report, inputs.flow.key(), "common pipe", common_state.speed);
    for (b, &i) in branches.iter().zip(port_of) {
        let state = &balance.ports[i];
        let keys = &BRANCHES[b.index];
        common::pipe_velocity_warning(report, keys.d, &format!("branch {}", b.index + 1), state.speed);
        if state.pressure < 0.0 {
            report.warn(
                Some(keys.k),
                format!(
                    "the gauge pressure in branch {} comes out below atmospheric: check the loss and the flow \
                            split",
                    b.index + 1
                ),
            );
        }
    }
    for (n, a) in branches.iter().enumerate() {
        for b in branches.iter().skip(n + 1) {
            if a.direction.dot(b.direction) > (5f64).to_radians().cos() {
                report.warn(
                    Some(BRANCHES[b.index].angle),
                    format!(
                        "branches {} and {} point the same way and would overlap",
                        a.index + 1,
                        b.index + 1
                    ),
                );
            }
        }
    }

    if !inputs.weights && branches.iter().any(|b| b.direction.z.abs() > 1e-12) {
        report.warn(
            Some("weights"),
            "the weights of the fluid and the fitting are left out: with a branch out of the plan the \
                    restraint carries them along with the pressure",
        );
    }

    let system = report.system();
    // The weights (fluid and fitting) rest on the bedding, not on the block.
    let fitting_weight = Vec3::new(0.0, 0.0, -inputs.fitting_weight());
    let carried = thrust - balance.fluid_weight - fitting_weight;
    let carried_norm = carried.norm();
    let elevation = if carried_norm > 0.0 {
        (carried.z / carried_norm).clamp(-1.0, 1.0).asin()
    } else {
        0.0
    };
    let known_text = match inputs.known {
        KnownAt::Common(_) => "known in the common pipe".to_string(),
        KnownAt::Branch(n, _) => format!("known at branch {}, the common pipe's from its stream", n + 1),
    };
    let mut basis = Vec::new();
    // Said only where it differs from the defaults (pressure known in the common
    // pipe, uniform profiles), to keep the printed sheet on two pages.
    let shaped: Vec<String> = std::iter::once(("common pipe".to_string(), &inputs.profile_common))
        .chain(branches.iter().map(|b| (format!("branch {}", b.index + 1), &b.profile)))
        .filter(|(_, profile)| !profile.is_uniform())
        .map(|(place, profile)| format!("{place} {}", profile.describe()))
        .collect();
    if !matches!(inputs.known, KnownAt::Common(_)) || !shaped.is_empty() {
        let profiles = match shaped.len() {
            0 => "every port uniform".to_string(),
            n if n == branches.len() + 1 => shaped.join("; "),
            _ => format!("{}; the others uniform", shaped.join("; ")),
        };
        basis.push(("Pressure; profiles", format!("{known_text}; {profiles}")));
    }
    let g = inputs.gravity.value;
    let gravity_text = if (g - units::STANDARD_GRAVITY).abs() > 1e-12 {
        format!("{} m/s² (typed local value)", units::format_significant(g, 6))
    } else {
        "standard gravity".to_string()
    };
    // One short row (the thrust-block link carries the thrust without the weights),
    // to keep the sheet on two pages.
    basis.push((
        "Weights; gravity",
        format!(
            "{}; {gravity_text}",
            if inputs.weights {
                "fluid and fitting included, out of the plan, left to the bedding"
            } else {
                "fluid and fitting neglected (pressure and momentum only)"
            }
        ),
    ));
    basis.extend(vec![
        (
            "Flow; loss coefficients",
            format!(
                "{}; K on {}",
                match inputs.junction {
                    Junction::Dividing => "dividing (the common pipe feeds the branches)",
                    Junction::Combining => "combining (the branches feed the common pipe)",
                },
                if k_on_common {
                    "the common pipe's velocity"
                } else {
                    "each branch's own velocity"
                }
            ),
        ),
        (
            "Thrust area basis",
            if on_outside {
                "outside diameters (push-on, mechanical or restrained joints): the pressure on each joint's \
                        wall annulus is its own ledger term; momentum on the bores"
                    .to_string()
            } else {
                "inside diameters (pressure and momentum terms)".to_string()
            },
        ),
    ]);
    report.table(|_| common::basis_table(basis));
    report.table(|report| branch_table(inputs, solved, report));
    report.table(|_| common::ledger_table(balance, system));
    report.table(|_| common::ports_table(balance, system));
    report.diagram(|report| super::diagram::diagram(inputs, solved, report));
    let carry = common::thrust_carry_over(
        report,
        "Size a thrust block for this junction's thrust",
        carried_norm,
        elevation,
    );
    report.solution.carry_over.push(carry);
}

/// Checks the balance against results computed without the engine:
///
/// - mass: the engine's branch flows add up to the common-pipe flow the user gave;
/// - thrust: each face's impulse function (p + βρV²)·A, plus p on the wall annulus on
///   the outside-diameter basis, along its outward normal, with the branch pressures
///   from the energy line written out per branch (p_i = p₀ + ρ(α₀V₀² − α_iV_i²)/2 +
///   ρg(z₀ − z_i) ∓ K_i·ρV_ref²/2, − dividing, + combining), velocities from the given
///   flows (the one left empty: the common flow less the others), and, when included,
///   the weights ρg·volume + W_f:
///   T = −Σ[(p_i + β_iρV_i²)A_i + p_i(A_OD,i − A_i)]·n_i + W.
fn independent_checks(report: &mut Report<'_>, inputs: &Inputs, solved: &Solved) {
    let (dividing, k_on_common) = (inputs.dividing(), inputs.k_on_common());
    let (rho, d_common) = (inputs.fluid.density, inputs.d_common.value);
    let (beta0, alpha0) = (inputs.profile_common.beta.value, inputs.profile_common.alpha.value);
    let (total_flow, stub, volume) = (solved.total_flow, solved.stub, solved.volume);
    let (branches, branch_flows) = (&inputs.branches, &solved.branch_flows);
    let (balance, port_of) = (&solved.balance, &solved.port_of);
    let g = inputs.gravity.value;
    let engine_sum: f64 = port_of.iter().map(|&i| balance.ports[i].volume_flow).sum();
    report.check(
        "Sum of the branch flows",
        "the common-pipe flow as given",
        Q::VolumeFlow,
        engine_sum,
        total_flow,
        1e-9,
        0.0,
    );

    let a_common = common::circle_area(d_common);
    let v_common = total_flow / a_common;
    let given: f64 = branch_flows.iter().flatten().sum();
    // Outward normal of the common pipe's face: upstream (−x) when it feeds the
    // junction, downstream (+x) when it is fed.
    let common_normal = Vec3::new(if dividing { -1.0 } else { 1.0 }, 0.0, 0.0);
    // A face's impulse function with its β: `beta_v2` is βV².
    let face = |pressure: f64, beta_v2: f64, area: f64, outside_area: f64, normal: Vec3| {
        normal * (-((pressure + rho * beta_v2) * area + pressure * (outside_area - area)))
    };
    let a_common_outside = inputs
        .common_outside
        .map_or(a_common, |od| common::circle_area(od.value));
    // Each branch's pressure less the common pipe's, from the energy line with α₀ in
    // the common pipe, α_i in the branch and the branch's loss:
    // p_i − p₀ = ρ(α₀V₀² − α_iV_i²)/2 − ρg·z_i ∓ loss.
    let branch_speed = |b: &super::model::Branch, q: &Option<f64>| {
        q.unwrap_or((total_flow - given).max(0.0)) / common::circle_area(b.diameter.value)
    };
    // The rise of the branch's pressure over the common pipe's, and the sum of its
    // terms' magnitudes (the rounding it carries when they cancel).
    let rise_and_terms = |b: &super::model::Branch, speed: f64| {
        let v_ref = if k_on_common { v_common } else { speed };
        let loss = b.k.value * rho * v_ref * v_ref / 2.0;
        // The common face sits at z = 0; a branch's face one stub along its axis.
        let z = stub * b.direction.z * if dividing { 1.0 } else { -1.0 };
        let alpha = b.profile.alpha.value;
        let (common_kinetic, branch_kinetic) = (
            rho * alpha0 * v_common * v_common / 2.0,
            rho * alpha * speed * speed / 2.0,
        );
        let rise = common_kinetic - branch_kinetic - rho * g * z + if dividing { -loss } else { loss };
        (rise, common_kinetic + branch_kinetic + (rho * g * z).abs() + loss.abs())
    };
    let p = match inputs.known {
        KnownAt::Common(p) => p.value,
        KnownAt::Branch(n, p_known) => branches
            .iter()
            .zip(branch_flows)
            .find(|(b, _)| b.index == n)
            .map_or(p_known.value, |(b, q)| {
                p_known.value - rise_and_terms(b, branch_speed(b, q)).0
            }),
    };
    if let KnownAt::Branch(..) = inputs.known {
        report.check(
            "Gauge pressure in the common pipe",
            "energy line from the known branch, with α and its loss",
            Q::Pressure,
            balance.ports[solved.common_port].pressure,
            p,
            1e-9,
            p.abs() + rho * alpha0 * v_common * v_common,
        );
    }
    let mut thrust = face(
        p,
        beta0 * v_common * v_common,
        a_common,
        a_common_outside,
        common_normal,
    );
    let mut scale = (p.abs() + beta0 * rho * v_common * v_common) * a_common_outside;
    for (b, q) in branches.iter().zip(branch_flows) {
        let area = common::circle_area(b.diameter.value);
        let speed = branch_speed(b, q);
        let (rise, rise_terms) = rise_and_terms(b, speed);
        let pressure = p + rise;
        let normal = b.direction * if dividing { 1.0 } else { -1.0 };
        let outside_area = b.outside.map_or(area, |od| common::circle_area(od.value));
        let beta = b.profile.beta.value;
        thrust += face(pressure, beta * speed * speed, area, outside_area, normal);
        // The branch pressure is the common pipe's plus the rise: when they nearly
        // cancel (a fast common pipe, a wide slow branch), it carries the rounding
        // of their terms, not of itself.
        scale += (p.abs() + rise_terms + beta * rho * speed * speed) * outside_area;
    }
    let weights = if inputs.weights {
        rho * g * volume + inputs.w_fitting.value
    } else {
        0.0
    };
    thrust += Vec3::new(0.0, 0.0, -weights);
    scale += weights;
    let engine_thrust = balance.thrust();
    let basis = if inputs.weights {
        "Σ (p + βρV²)·A on each face with Bernoulli branch pressures, plus the weights"
    } else {
        "Σ (p + βρV²)·A on each face with Bernoulli branch pressures, no weights"
    };
    for (label, value, reference) in [
        ("Thrust along the common pipe (x)", engine_thrust.x, thrust.x),
        ("Thrust across it, in the plan (y)", engine_thrust.y, thrust.y),
        ("Thrust out of the plan (z)", engine_thrust.z, thrust.z),
    ] {
        report.check(label, basis, Q::Force, value, reference, 1e-9, scale);
    }
}

fn branch_table(inputs: &Inputs, solved: &Solved, report: &Report<'_>) -> Table {
    let (branches, port_of, balance, dividing) =
        (&inputs.branches, &solved.port_of, &solved.balance, inputs.dividing());
    let mut table = Table {
        key: "branches",
        title: format!(
            "Branches ({})",
            if dividing { "dividing flow" } else { "combining flow" }
        ),
        columns: [
            "Branch",
            "direction",
            "elevation",
            "diameter",
            "share",
            "flow",
            "velocity",
            "K",
            "head loss",
            "gauge pressure",
        ]
        .iter()
        .map(|s| s.to_string())
        .collect(),
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for (n, (b, &i)) in branches.iter().zip(port_of).enumerate() {
        let state = &balance.ports[i];
        let common_flow = balance.ports.first().map(|s| s.volume_flow).unwrap_or(0.0);
        let share = if common_flow > 0.0 {
            state.volume_flow / common_flow
        } else {
            b.share.map_or(0.0, |s| s.value)
        };
        let head_loss = balance
            .streams
            .iter()
            .find(|s| s.from == i || s.to == i)
            .map(|s| s.head_loss)
            .unwrap_or(0.0);
        let angle = b.direction.y.atan2(b.direction.x);
        let elevation = b.direction.z.clamp(-1.0, 1.0).asin();
        table.rows.push(vec![
            format!("{}{}", b.index + 1, if b.share.is_none() { " (solved)" } else { "" }),
            report.fmt(angle, Q::Angle),
            report.fmt(elevation, Q::Angle),
            report.fmt(b.diameter.value, Q::Length),
            format!("{} %", units::format_significant(100.0 * share, 4)),
            report.fmt(state.volume_flow, Q::VolumeFlow),
            report.fmt(state.speed, Q::Velocity),
            units::format_significant(b.k.value, 4),
            report.fmt(head_loss, Q::Length),
            report.fmt(state.pressure, Q::Pressure),
        ]);
        if b.share.is_none() {
            table.emphasised_rows.push(n);
        }
    }
    table
}
