//! Tables shared by the calculators: the momentum ledger, the ports table and the
//! basis-of-result table.

use crate::catalog::Table;
use crate::engine::{Balance, Role};
use crate::units::{self, QuantityKind, UnitSystem};
use crate::vector::Vec3;

use QuantityKind as Q;

/// The unit a table column of forces is shown in: chosen from the largest magnitude.
fn table_unit(max_abs: f64, kind: QuantityKind, system: UnitSystem) -> &'static str {
    units::display_unit(max_abs, kind, system).id
}

fn cell(value: f64, kind: QuantityKind, unit: &str) -> String {
    match units::convert_to(value, kind, unit) {
        Some(v) => units::format_significant(v, 4),
        None => "—".to_string(),
    }
}

/// `"1.000"` → `"1"`, `"1.050"` → `"1.05"`: a factor shown as short as it reads.
pub fn trimmed(text: String) -> String {
    if text.contains('.') && !text.contains('e') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    }
}

/// The momentum ledger: every term of the support-force equation per port, the
/// weight and storage terms, the total force the supports supply and the thrust on
/// the supports. It shows the terms of one balance, so it has no residual row (the
/// total is defined by the sum and would close by algebra); the independent checks
/// are in the `checks` table (see `Report::check`).
pub fn ledger_table(balance: &Balance, system: UnitSystem) -> Table {
    let mut rows: Vec<(String, Vec3)> = Vec::new();
    for p in &balance.ports {
        let role = if p.role == Role::Inlet { "in" } else { "out" };
        rows.push((format!("{} ({role}): pressure, p·A·n", p.name), -p.pressure_force));
        // β is named where it is not 1 (a uniform port reads as before).
        let beta = if p.beta == 1.0 {
            String::new()
        } else {
            format!(", β = {}", trimmed(units::format_significant(p.beta, 4)))
        };
        rows.push((
            format!("{} ({role}): momentum flux, ±ṁβV{beta}", p.name),
            p.momentum_outflow,
        ));
    }
    if balance.fluid_weight.norm() > 0.0 {
        rows.push(("fluid inside: weight, −W".to_string(), -balance.fluid_weight));
    }
    for e in &balance.extra_forces {
        rows.push((format!("{}: −F", e.name), -e.force));
    }
    if balance.momentum_storage.norm() > 0.0 {
        rows.push(("storage: dP/dt".to_string(), balance.momentum_storage));
    }
    let total_index = rows.len();
    rows.push((
        "R = force the supports exert on the fitting (sum)".to_string(),
        balance.support_force,
    ));
    rows.push(("T = thrust on the supports, −R".to_string(), balance.thrust()));
    let max = rows.iter().map(|(_, v)| v.norm()).fold(0.0, f64::max);
    let unit = table_unit(max, Q::Force, system);
    let mut table = Table {
        key: "ledger",
        title: "Momentum ledger: the terms of one balance, R = Σ p·A·n + Σ ±ṁβV − W − ΣF + dP/dt (R is their sum, so \
                this table cannot disagree with itself; the checks table compares results with independent paths)"
            .to_string(),
        columns: vec![
            "Term".to_string(),
            format!("x ({unit})"),
            format!("y ({unit})"),
            format!("z ({unit})"),
            format!("magnitude ({unit})"),
        ],
        rows: Vec::new(),
        emphasised_rows: vec![total_index, total_index + 1],
        typed_columns: Vec::new(),
    };
    // A component of a term that is rounding residue of sines and cosines (1e-12 of
    // the largest term) is shown as the 0 it is.
    let component = |c: f64| if c.abs() < 1e-12 * max { 0.0 } else { c };
    for (label, v) in rows {
        table.rows.push(vec![
            label,
            cell(component(v.x), Q::Force, unit),
            cell(component(v.y), Q::Force, unit),
            cell(component(v.z), Q::Force, unit),
            cell(v.norm(), Q::Force, unit),
        ]);
    }
    table
}

/// The port table: size, flow, velocity and pressure at every port. When every flow
/// was given (none solved by the mass balance) a last row shows how far the given
/// flows are from balancing: a real check, which the engine also raises as a
/// warning beyond 1e-6. When a flow was solved, that row would be zero by algebra
/// and is left out; the solved port is marked instead.
pub fn ports_table(balance: &Balance, system: UnitSystem) -> Table {
    let area_unit = table_unit(
        balance.ports.iter().map(|p| p.area).fold(0.0, f64::max),
        Q::Area,
        system,
    );
    let flow_unit = table_unit(
        balance.ports.iter().map(|p| p.volume_flow).fold(0.0, f64::max),
        Q::VolumeFlow,
        system,
    );
    let speed_unit = table_unit(1.0, Q::Velocity, system);
    let p_unit = table_unit(
        balance.ports.iter().map(|p| p.pressure.abs()).fold(0.0, f64::max),
        Q::Pressure,
        system,
    );
    let mass_unit = table_unit(1.0, Q::MassFlow, system);
    let mut table = Table {
        key: "ports",
        title: if balance.solved_flow.is_some() {
            "Ports: state (the port marked \"flow solved\" takes the flow that closes the mass balance)".to_string()
        } else {
            "Ports: state, and the mass balance of the given flows".to_string()
        },
        columns: vec![
            "Port".to_string(),
            format!("area ({area_unit})"),
            format!("flow ({flow_unit})"),
            format!("mass flow ({mass_unit})"),
            format!("mean velocity ({speed_unit})"),
            format!("gauge pressure ({p_unit})"),
        ],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for (index, p) in balance.ports.iter().enumerate() {
        let role = if p.role == Role::Inlet { "in" } else { "out" };
        let solved = if balance.solved_flow == Some(index) {
            ", flow solved"
        } else {
            ""
        };
        table.rows.push(vec![
            format!("{} ({role}{solved})", p.name),
            cell(p.area, Q::Area, area_unit),
            cell(p.volume_flow, Q::VolumeFlow, flow_unit),
            cell(p.mass_flow, Q::MassFlow, mass_unit),
            cell(p.speed, Q::Velocity, speed_unit),
            cell(p.pressure, Q::Pressure, p_unit),
        ]);
    }
    if balance.solved_flow.is_none() {
        table.rows.push(vec![
            "given flows: Σout − Σin (+ storage)".to_string(),
            String::new(),
            String::new(),
            cell(balance.mass_residual, Q::MassFlow, mass_unit),
            String::new(),
            String::new(),
        ]);
        table.emphasised_rows.push(table.rows.len() - 1);
    }
    table
}

/// A two-column table of what the result is based on (area basis, loss model, ...),
/// so the choices that change the answer are shown beside it.
pub fn basis_table(rows: Vec<(&str, String)>) -> Table {
    Table {
        key: "basis",
        title: "Basis of the result".to_string(),
        columns: vec!["Item".to_string(), "Used".to_string()],
        rows: rows.into_iter().map(|(k, v)| vec![k.to_string(), v]).collect(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    }
}
