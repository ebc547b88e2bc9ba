//! The anchor page's report, built from the solved model: the force and moment on
//! the anchor, the ledger of every term with its point of action and moment, the
//! checks by paths that do not use the engine (the closed-form sum of the per-run
//! terms, the closed-form weight moments, a second balance about another point, the
//! mass balance), warnings, the basis table and the two views.

use crate::catalog::{Report, Table};
use crate::engine::Role;
use crate::units::{self, QuantityKind as Q, UnitSystem, STANDARD_GRAVITY};
use crate::vector::Vec3;

use super::super::common;
use super::model::{End, Inputs, PipeWeightBasis, Solved};

/// The load on the anchor: the force the assembly puts on it and the moment about it.
pub fn anchor_load(solved: &Solved) -> (Vec3, Vec3) {
    (solved.balance.thrust(), -solved.balance.support_moment)
}

/// Writes the whole report of a solved anchor.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (force, moment) = anchor_load(solved);
    report.output("force", force.norm());
    report.output("moment", moment.norm());
    report.output("force_x", force.x);
    report.output("force_y", force.y);
    report.output("force_z", force.z);
    report.output("force_horizontal", force.x.hypot(force.y));
    report.output("moment_x", moment.x);
    report.output("moment_y", moment.y);
    report.output("moment_z", moment.z);
    let weight_terms = solved
        .terms
        .iter()
        .filter(|t| t.name.starts_with("weight") || t.name.starts_with("support: its reaction"))
        .map(|t| t.force.z)
        .sum::<f64>();
    report.output("weight", -weight_terms);
    for (run, state) in inputs.runs.iter().zip(&solved.balance.ports) {
        let sign = if state.role == Role::Outlet { 1.0 } else { -1.0 };
        report.output(run.keys.q_out, sign * state.volume_flow);
        report.output(run.keys.v_out, state.speed);
    }
    report.output("density", inputs.fluid.density);

    write_checks(inputs, solved, report);
    write_warnings(inputs, solved, report);
    let system = report.system();
    report.solution.tables.push(basis_table(inputs, solved, report));
    report.solution.tables.push(ledger_table(solved, system));
    report
        .solution
        .tables
        .push(common::ports_table(&solved.balance, system));
    let views = super::diagram::views(inputs, solved, report);
    report.solution.diagrams.extend(views);
}

/// The share of a run's weight the anchor carries (c·L·û×W moment factor c and the
/// fraction k of the weight normal to the run taken by a support at the far end).
fn weight_factors(end: End) -> (f64, f64) {
    match end {
        End::Support { .. } => (1.0 / 8.0, 3.0 / 8.0),
        _ => (0.5, 0.0),
    }
}

fn write_checks(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (force, moment) = anchor_load(solved);
    let rho = inputs.fluid.density;
    // The flows from the inputs alone: the empty one closes Σ Q = 0.
    let typed_net: f64 = inputs.runs.iter().filter_map(|r| r.q).map(|q| q.value).sum();
    let mut closed_force = Vec3::ZERO;
    let mut closed_moment = Vec3::ZERO;
    let mut scale = 0.0;
    for run in &inputs.runs {
        let (az, s) = (run.azimuth.value, run.slope.value);
        let (ux, uy, uz) = (az.sin() * s.cos(), az.cos() * s.cos(), s.sin());
        let u = Vec3::new(ux, uy, uz);
        let d = run.d.value;
        let area = std::f64::consts::PI * d * d / 4.0;
        let q = run.q.map(|q| q.value).unwrap_or(-typed_net);
        let (p, length) = (run.p.value, run.length.value);
        let momentum = rho * q * q / area;
        let weight = run.w_pipe.value + rho * STANDARD_GRAVITY * area * length;
        // The net of each run's terms along it: the cut's −(pA + ṁV) with the far end's.
        let along = match run.end {
            End::Elbow | End::Closed => 0.0,
            End::Bellows { effective_area, spring } => {
                -(p * effective_area.value + momentum) - run.moves.sign() * spring.value
            }
            End::Support { friction } => -run.moves.sign() * friction.value * weight * s.cos(),
        };
        let (c, k) = weight_factors(run.end);
        // Anchor's share of the weight: all of it less k of its part normal to the run,
        // W(−ẑ) − k·W·(−ẑ + u_z·û).
        let share = Vec3::new(
            k * weight * uz * ux,
            k * weight * uz * uy,
            -weight + k * weight * (1.0 - uz * uz),
        );
        closed_force += u * along + share;
        closed_moment += Vec3::new(-uy, ux, 0.0) * (c * length * weight);
        scale += (p * area + momentum) * 2.0 + along.abs() + weight;
    }
    for (label, basis, value, reference) in [
        (
            "Force on the anchor, east (x)",
            "closed-form sum of each run's terms: −(p·A_eff + ṁV)·û at a bellows, friction at a support, 0 along \
                an elbow's or a cap's run, and the weights' shares",
            force.x,
            closed_force.x,
        ),
        (
            "Force on the anchor, north (y)",
            "the same closed-form sum, y",
            force.y,
            closed_force.y,
        ),
        (
            "Force on the anchor, up (z)",
            "the same closed-form sum, z",
            force.z,
            closed_force.z,
        ),
    ] {
        report.check(label, basis, Q::Force, value, reference, 1e-9, scale);
    }
    let moment_scale: f64 = inputs
        .runs
        .iter()
        .zip(&solved.runs)
        .map(|(r, s)| s.weight * r.length.value)
        .sum();
    for (label, value, reference) in [
        ("Moment on the anchor about x", moment.x, closed_moment.x),
        ("Moment on the anchor about y", moment.y, closed_moment.y),
        ("Moment on the anchor about z", moment.z, closed_moment.z),
    ] {
        report.check(
            label,
            "closed form Σ c·L·W·(−u_y, u_x, 0): c = 1/2 for a cantilever run, 1/8 for a run propped by a support",
            Q::Torque,
            value,
            reference,
            1e-9,
            moment_scale,
        );
    }
    // A second balance about the far end of run 1, carried back: M_O = M_O′ + (O′ − O)×R.
    let other = &solved.balance_about_run1_end;
    let carried = other.support_moment + (other.moment_point - solved.balance.moment_point).cross(other.support_force);
    let carried_load = -carried;
    let arm = other.moment_point.norm();
    report.check(
        "Moment on the anchor (resultant)",
        "a second balance about the far end of run 1, carried to the anchor with r×R",
        Q::Torque,
        moment.norm(),
        carried_load.norm(),
        1e-9,
        moment_scale + arm * force.norm(),
    );
    // Mass: the flow the engine found for run 1 against the typed flows of the others.
    let balance = &solved.balance;
    if let Some(i) = solved.solved_run {
        let state = &balance.ports[i];
        let sign = if state.role == Role::Outlet { 1.0 } else { -1.0 };
        let largest = inputs
            .runs
            .iter()
            .filter_map(|r| r.q)
            .fold(0.0f64, |a, q| a.max(q.value.abs()));
        report.check(
            format!("Flow in run {}, found from the mass balance", i + 1),
            "minus the sum of the flows typed in the other runs",
            Q::VolumeFlow,
            sign * state.volume_flow,
            -typed_net,
            1e-9,
            largest,
        );
    }
}

fn write_warnings(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    common::forward_warnings(&solved.balance, report);
    for (i, (run, state)) in inputs.runs.iter().zip(&solved.runs).enumerate() {
        let n = i + 1;
        let way = match run.moves {
            super::model::Moves::Away => "away from the anchor (the line heating up)",
            super::model::Moves::Toward => "toward the anchor (the line cooling down)",
        };
        match run.end {
            End::Bellows { effective_area, .. } => {
                report.warn(
                    Some(run.keys.a_eff),
                    format!(
                        "run {n}: a bellows without tie rods passes its full pressure thrust p·A_eff ({}) to this \
                         anchor; tie rods or a pressure-balanced joint would carry it instead (not modelled here)",
                        report.fmt(run.p.value * effective_area.value, Q::Force)
                    ),
                );
                if effective_area.value < state.area {
                    report.warn(
                        Some(run.keys.a_eff),
                        format!("run {n}: the effective area is smaller than the bore; check the maker's value"),
                    );
                }
            }
            End::Support { .. } => {
                report.warn(
                    Some(run.keys.moves),
                    format!(
                        "run {n}: the support's friction is taken against a movement {way}; it reverses when the \
                         line moves the other way, so check the anchor both ways"
                    ),
                );
                if state.support_load == 0.0 {
                    report.warn(
                        Some(run.keys.slope),
                        format!("run {n} is vertical: its support carries no weight, so it has no friction here"),
                    );
                }
            }
            End::Elbow => report.warn(
                Some(run.keys.end),
                format!(
                    "run {n}: the elbow's thrust along the leg beyond it is taken by that leg's restraint, not by \
                     this anchor (the leg is taken at 90° to the run)"
                ),
            ),
            End::Closed => {}
        }
        if let PipeWeightBasis::Wall { material, .. } = run.weight_basis {
            if crate::pipe_sizes::find(&run.size_key).is_none() {
                report.warn(
                    Some(run.keys.w_pipe),
                    format!(
                        "run {n}: the pipe's weight is taken from the typed diameters as {material}; type the \
                         weight for another material, lining or insulation"
                    ),
                );
            }
        }
        common::pipe_velocity_warning(report, run.keys.q, &format!("run {n}"), state.speed);
    }
}

fn basis_table(inputs: &Inputs, solved: &Solved, report: &Report<'_>) -> Table {
    let mut rows: Vec<(&str, String)> = vec![
        (
            "Axes",
            "x east, y north, z up, from the anchor point; loads are what the piping puts on the anchor".to_string(),
        ),
        ("Fluid", inputs.fluid.name.clone()),
    ];
    let mut lines = Vec::new();
    for (i, (run, state)) in inputs.runs.iter().zip(&solved.runs).enumerate() {
        let flow = if solved.solved_run == Some(i) {
            format!("{} (found from the other runs)", report.fmt(state.flow, Q::VolumeFlow))
        } else {
            report.fmt(state.flow, Q::VolumeFlow)
        };
        let weight = match run.weight_basis {
            PipeWeightBasis::Typed => "empty pipe as typed".to_string(),
            PipeWeightBasis::Wall { density, material } => format!(
                "empty pipe from the wall, {material} at {}",
                report.fmt(density, Q::Density)
            ),
        };
        lines.push(format!(
            "run {}: bearing {}, slope {}, bore {}, {} long, {}, flow {}, ends at a {}; weight {} ({})",
            i + 1,
            report.fmt(run.azimuth.value, Q::Angle),
            report.fmt(run.slope.value, Q::Angle),
            report.fmt(run.d.value, Q::Length),
            report.fmt(run.length.value, Q::Length),
            report.fmt(run.p.value, Q::Pressure),
            flow,
            run.end.name(),
            report.fmt(state.weight, Q::Force),
            weight
        ));
    }
    rows.push(("Runs", lines.join("; ")));
    rows.push((
        "Pressure areas",
        "the bore for the cut, an elbow and a cap; the typed effective area at a bellows".to_string(),
    ));
    rows.push((
        "Weight",
        "at each run's mid-length, carried by the anchor as a cantilever; a run ending at a sliding support is a \
            propped cantilever (the support takes 3/8 of the weight normal to the run)"
            .to_string(),
    ));
    common::basis_table(rows)
}

fn table_unit(max_abs: f64, kind: Q, system: UnitSystem) -> &'static str {
    units::display_unit(max_abs, kind, system).id
}

fn cell(value: f64, kind: Q, unit: &str) -> String {
    match units::convert_to(value, kind, unit) {
        Some(v) => units::format_significant(v, 4),
        None => "—".to_string(),
    }
}

/// Every term of the load on the anchor: its force, where it acts and its moment.
fn ledger_table(solved: &Solved, system: UnitSystem) -> Table {
    let o = solved.balance.moment_point;
    let mut rows: Vec<(String, Vec3, Vec3)> = Vec::new();
    for port in &solved.balance.ports {
        rows.push((
            format!("{}: pressure at the cut, −p·A·û", port.name),
            port.pressure_force,
            port.position,
        ));
        if port.mass_flow > 0.0 {
            rows.push((
                format!("{}: momentum at the cut, −ṁV·û", port.name),
                -port.momentum_outflow,
                port.position,
            ));
        }
    }
    for t in &solved.terms {
        rows.push((format!("run {}: {}", t.run + 1, t.name), t.force, t.at));
    }
    let total_index = rows.len();
    let (force, moment) = anchor_load(solved);
    let max_force = rows.iter().map(|(_, f, _)| f.norm()).fold(force.norm(), f64::max);
    let moments: Vec<Vec3> = rows.iter().map(|(_, f, at)| (*at - o).cross(*f)).collect();
    let max_moment = moments.iter().map(|m| m.norm()).fold(moment.norm(), f64::max);
    let max_arm = rows.iter().map(|(_, _, at)| (*at - o).norm()).fold(0.0, f64::max);
    let (fu, mu, lu) = (
        table_unit(max_force, Q::Force, system),
        table_unit(max_moment, Q::Torque, system),
        table_unit(max_arm, Q::Length, system),
    );
    let mut table_rows: Vec<Vec<String>> = rows
        .iter()
        .zip(&moments)
        .map(|((name, f, at), m)| {
            vec![
                name.clone(),
                cell(f.x, Q::Force, fu),
                cell(f.y, Q::Force, fu),
                cell(f.z, Q::Force, fu),
                cell((*at - o).norm(), Q::Length, lu),
                cell(m.x, Q::Torque, mu),
                cell(m.y, Q::Torque, mu),
                cell(m.z, Q::Torque, mu),
            ]
        })
        .collect();
    table_rows.push(vec![
        "Load on the anchor (sum)".to_string(),
        cell(force.x, Q::Force, fu),
        cell(force.y, Q::Force, fu),
        cell(force.z, Q::Force, fu),
        "—".to_string(),
        cell(moment.x, Q::Torque, mu),
        cell(moment.y, Q::Torque, mu),
        cell(moment.z, Q::Torque, mu),
    ]);
    Table {
        key: "ledger",
        title: "Ledger: every force on the anchored assembly, where it acts and its moment about the anchor (the \
                sum is the load; the checks table compares it with independent paths)"
            .to_string(),
        columns: vec![
            "Term".to_string(),
            format!("x ({fu})"),
            format!("y ({fu})"),
            format!("z ({fu})"),
            format!("acts at, from the anchor ({lu})"),
            format!("Mx ({mu})"),
            format!("My ({mu})"),
            format!("Mz ({mu})"),
        ],
        rows: table_rows,
        emphasised_rows: vec![total_index],
    }
}
