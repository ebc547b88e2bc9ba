//! The anchor page's report, built from the solved model: the force and moment on
//! the anchor, the ledger of every term with its point of action and moment, the
//! checks by paths that do not use the engine (the closed-form sum of the per-run
//! terms, the closed-form weight moments, a second balance about another point, the
//! mass balance), warnings, the basis table and the two views.

use crate::catalog::{Report, Table};
use crate::engine::{EngineWarning, Role};
use crate::units::{self, QuantityKind as Q, UnitSystem, STANDARD_GRAVITY};
use crate::vector::Vec3;

use super::super::common;
use super::model::{End, Inputs, PipeWeightBasis, Solved};

/// The load on the anchor: the force the assembly puts on it and the moment about it.
pub fn anchor_load(solved: &Solved) -> (Vec3, Vec3) {
    (solved.balance.thrust(), -solved.balance.support_moment)
}

/// The load as shown: a component within 1e-12 of the largest term it is summed
/// from is rounding residue (cos 90° = 6e-17 of a run's pressure force) and is
/// shown as 0.
fn shown_load(solved: &Solved) -> (Vec3, Vec3) {
    let (force, moment) = anchor_load(solved);
    let o = solved.balance.moment_point;
    let forces = solved
        .balance
        .ports
        .iter()
        .flat_map(|p| [(p.pressure_force, p.position), (p.momentum_outflow, p.position)])
        .chain(solved.terms.iter().map(|t| (t.force, t.at)));
    let (mut largest_force, mut largest_moment) = (0.0f64, 0.0f64);
    for (f, at) in forces {
        largest_force = largest_force.max(f.norm());
        largest_moment = largest_moment.max((at - o).cross(f).norm());
    }
    let clean = |v: Vec3, largest: f64| {
        let c = |x: f64| if x.abs() <= 1e-12 * largest { 0.0 } else { x };
        Vec3::new(c(v.x), c(v.y), c(v.z))
    };
    (clean(force, largest_force), clean(moment, largest_moment))
}

/// Writes the whole report of a solved anchor.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (force, moment) = shown_load(solved);
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
        .filter(|t| t.name.starts_with("weight") || t.name.starts_with("support reaction"))
        .map(|t| t.force.z)
        .sum::<f64>();
    report.output("weight", -weight_terms);
    if let (Some(run), Some(state)) = (inputs.runs.first(), solved.balance.ports.first()) {
        let sign = if state.role == Role::Outlet { 1.0 } else { -1.0 };
        report.output(run.keys.q_out, sign * state.volume_flow);
    }

    write_checks(inputs, solved, report);
    write_warnings(inputs, solved, report);
    let system = report.system();
    report.table(|report| basis_table(inputs, solved, report));
    report.table(|_| ledger_table(solved, system));
    report.diagrams(|report| super::diagram::views(inputs, solved, report));
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
            -k * weight * uz * ux,
            -k * weight * uz * uy,
            -weight + k * weight * (1.0 - uz * uz),
        );
        closed_force += u * along + share;
        closed_moment += Vec3::new(-uy, ux, 0.0) * (c * length * weight);
        scale += (p * area + momentum) * 2.0 + along.abs() + weight;
    }
    // Vectors compared whole: a wrong sign in any component shows.
    report.check(
        "Force on the anchor: |F − F_closed|",
        "closed form: the per-run terms and the weights' shares (x, y, z)",
        Q::Force,
        (force - closed_force).norm(),
        0.0,
        1e-9,
        scale,
    );
    // Relative to every term's |r|·|F|: forces along a run pass through the anchor, but
    // their r×F is zero only to rounding.
    let moment_scale: f64 = solved
        .terms
        .iter()
        .map(|t| t.at.norm() * t.force.norm())
        .chain(
            solved
                .balance
                .ports
                .iter()
                .map(|p| p.position.norm() * (p.pressure_force.norm() + p.momentum_outflow.norm())),
        )
        .sum();
    report.check(
        "Moment on the anchor: |M − M_closed|",
        "closed form Σ c·L·W·(−u_y, u_x, 0), c = 1/2 or 1/8",
        Q::Torque,
        (moment - closed_moment).norm(),
        0.0,
        1e-9,
        moment_scale,
    );
    // A second balance about the far end of run 1, carried back: M_O = M_O′ + (O′ − O)×R.
    let other = &solved.balance_about_run1_end;
    let carried = other.support_moment + (other.moment_point - solved.balance.moment_point).cross(other.support_force);
    let carried_load = -carried;
    let arm = other.moment_point.norm();
    report.check(
        "Moment on the anchor (resultant)",
        "balance about run 1's far end, moved by r×R",
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
            format!("Flow in run {}", i + 1),
            "−Σ of the other runs' flows",
            Q::VolumeFlow,
            sign * state.volume_flow,
            -typed_net,
            1e-9,
            largest,
        );
    }
}

fn write_warnings(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    // The momentum is its own ledger term here: the engine's note that it is small
    // beside the pressure says nothing the ledger does not.
    for w in &solved.balance.warnings {
        if !matches!(w, EngineWarning::MomentumNegligible { .. }) {
            let field = matches!(w, EngineWarning::BelowVapourPressure { .. }).then_some("p");
            report.warn(field, w.to_string());
        }
    }
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
            End::Elbow | End::Closed => {}
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
            "x east, y north, z up, from the anchor; loads are what the piping puts on it".to_string(),
        ),
        ("Fluid", inputs.fluid.name.clone()),
    ];
    if let Some(i) = solved.solved_run {
        rows.push((
            "Flow",
            format!(
                "positive away from the anchor; run {} ({}) takes what the others leave",
                i + 1,
                report.fmt(solved.runs[i].flow, Q::VolumeFlow)
            ),
        ));
    }
    let weights: Vec<String> = inputs
        .runs
        .iter()
        .zip(&solved.runs)
        .enumerate()
        .map(|(i, (run, state))| {
            let basis = match run.weight_basis {
                PipeWeightBasis::Typed => "typed pipe".to_string(),
                PipeWeightBasis::Wall { material, .. } => format!("{material} wall"),
            };
            format!("run {}: {} ({basis})", i + 1, report.fmt(state.weight, Q::Force))
        })
        .collect();
    rows.push(("Pipe and contents", weights.join("; ")));
    common::basis_table(rows)
}

fn table_unit(max_abs: f64, kind: Q, system: UnitSystem) -> &'static str {
    units::display_unit(max_abs, kind, system).id
}

fn cell(value: f64, kind: Q, unit: &str) -> String {
    match units::convert_to(value, kind, unit) {
        // Rounding residue (cos 90° of a term) is shown as 0; see `shown_load`.
        Some(v) if v.abs() < 1e-9 * units::convert_to(1.0, kind, unit).unwrap_or(1.0) => "0".to_string(),
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
            format!("{}: cut, −(pA + ṁV)û", port.name),
            port.pressure_force - port.momentum_outflow,
            port.position,
        ));
    }
    for t in &solved.terms {
        rows.push((format!("run {}: {}", t.run + 1, t.name), t.force, t.at));
    }
    let total_index = rows.len();
    let (force, moment) = shown_load(solved);
    let max_force = rows.iter().map(|(_, f, _)| f.norm()).fold(force.norm(), f64::max);
    let moments: Vec<Vec3> = rows.iter().map(|(_, f, at)| (*at - o).cross(*f)).collect();
    let max_moment = moments.iter().map(|m| m.norm()).fold(moment.norm(), f64::max);
    let (fu, mu) = (
        table_unit(max_force, Q::Force, system),
        table_unit(max_moment, Q::Torque, system),
    );
    let mut table_rows: Vec<Vec<String>> = rows
        .iter()
        .zip(&moments)
        .map(|((name, f, _), m)| {
            vec![
                name.clone(),
                cell(f.x, Q::Force, fu),
                cell(f.y, Q::Force, fu),
                cell(f.z, Q::Force, fu),
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
        cell(moment.x, Q::Torque, mu),
        cell(moment.y, Q::Torque, mu),
        cell(moment.z, Q::Torque, mu),
    ]);
    Table {
        key: "ledger",
        title: "Ledger: every force on the anchored assembly and its moment about the anchor".to_string(),
        columns: vec![
            "Term".to_string(),
            format!("x ({fu})"),
            format!("y ({fu})"),
            format!("z ({fu})"),
            format!("Mx ({mu})"),
            format!("My ({mu})"),
            format!("Mz ({mu})"),
        ],
        rows: table_rows,
        emphasised_rows: vec![total_index],
        typed_columns: Vec::new(),
    }
}
