//! The runner's report: outputs, warnings, checks, the triangles table, the
//! angular-momentum ledger, the diagram and the head–flow curve, all built from the
//! model's typed result ([`super::model::Solved`]).

use crate::catalog::{Plot, Report, Series, Table};
use crate::engine::Balance;
use crate::units::{self, QuantityKind as Q, UnitSystem, STANDARD_GRAVITY};

use super::model::{moment_scale, Machine, Runner, Solved, Triangle};
use super::INCIDENCE_WARNING_RAD;
use crate::calculators::common;

/// Writes everything the page shows from the solved runner.
pub fn write(solved: &Solved, report: &mut Report<'_>) {
    let Solved {
        runner,
        inlet: t1,
        outlet: t2,
        balance,
        water_torque,
        torque,
        euler_head,
        pressure_rise,
        ..
    } = solved;
    let (torque, euler_head, pressure_rise) = (*torque, *euler_head, *pressure_rise);
    let flow = runner.flow;
    let (name, other) = match runner.machine {
        Machine::Turbine => ("turbine", "pump"),
        Machine::Pump => ("pump", "turbine"),
    };

    report.output("euler_head", euler_head);
    report.output("torque", torque);
    report.output("power", torque * runner.omega);
    if let Some(head) = solved.head {
        let efficiency = match runner.machine {
            Machine::Turbine => euler_head / head,
            Machine::Pump => head / euler_head,
        };
        if euler_head <= 0.0 {
            report.warn(
                Some("head"),
                format!(
                    "Efficiency: not applicable, the Euler head is not positive: the {name} neither takes head out \
                     of the water nor gives it any with these triangles"
                ),
            );
        } else {
            report.output("efficiency", efficiency);
            if efficiency > 1.0 {
                let what = match runner.machine {
                    Machine::Turbine => "take out more than",
                    Machine::Pump => "deliver more than its Euler head, let alone",
                };
                report.warn(
                    Some("head"),
                    format!(
                        "the hydraulic efficiency comes out above 1: the {name} cannot {what} the net head with \
                         these triangles; check the blade angles, speed and flow"
                    ),
                );
            }
        }
    }
    report.output("u1", t1.u);
    report.output("u2", t2.u);
    report.output("vm1", t1.vm);
    report.output("vm2", t2.vm);
    report.output("vtheta1", t1.vtheta);
    report.output("vtheta2", t2.vtheta);
    report.output("v1", t1.v());
    report.output("v2", t2.v());
    report.output("w1", t1.w());
    report.output("w2", t2.w());
    report.output("alpha2", t2.alpha());
    report.output("beta1_flow", t1.beta());
    if let Some(beta1) = runner.beta1 {
        let incidence = beta1 - t1.beta();
        report.output("incidence", incidence);
        if incidence.abs() > INCIDENCE_WARNING_RAD {
            report.warn(
                Some("beta1"),
                format!(
                    "the water meets the inlet blades at {} while the blades are set at {}: an incidence of {} \
                     (shock loss not in the Euler head; the triangles match only at one flow for a given speed)",
                    report.fmt(t1.beta(), Q::Angle),
                    report.fmt(beta1, Q::Angle),
                    report.fmt(incidence, Q::Angle)
                ),
            );
        }
    }
    report.output("pressure_rise", pressure_rise);
    report.output("mass_flow", flow * runner.fluid.density);
    report.output("density", runner.fluid.density);
    if euler_head.is_nan() || euler_head <= 0.0 {
        report.warn(
            Some("beta2"),
            format!(
                "the Euler head comes out zero or negative: with these triangles the {name} would work as a \
                 {other}; check the blade angles and the direction of rotation"
            ),
        );
    }
    common::forward_warnings(balance, report);
    independent_checks(report, runner, t1, t2, torque, euler_head, pressure_rise);

    let system = report.system();
    report.table(|_| triangle_table(t1, t2, system));
    report.table(|_| ledger(balance, *water_torque, euler_head, system));
    super::pump::write(&solved.pump, runner, solved.water_temperature, report);
    report.diagram(|report| super::diagram::draw(t1, t2, report));
    report.plot(|report| head_plot(solved, report));
}

/// Checks against paths that do not use the engine's angular-momentum balance:
///
/// - the torque against the moment of momentum written from the triangles,
///   ρQ(r₁V_θ1 − r₂V_θ2) (with the machine's sign);
/// - the Euler head against the energy form of the triangles,
///   [(V₁² − V₂²) + (u₁² − u₂²) + (W₂² − W₁²)]/2g, in the machine's sense;
/// - the Euler head against the static pressure change from the engine's energy
///   balance in the rotating frame plus the change of absolute kinetic head:
///   pump (p₂ − p₁)/ρg + (V₂² − V₁²)/2g, turbine the reverse.
fn independent_checks(
    report: &mut Report<'_>,
    runner: &Runner,
    t1: &Triangle,
    t2: &Triangle,
    torque: f64,
    euler_head: f64,
    pressure_rise: f64,
) {
    let rho = runner.fluid.density;
    let g = STANDARD_GRAVITY;
    let sign = if runner.machine == Machine::Turbine { 1.0 } else { -1.0 };
    let moment = rho * runner.flow * (t1.radius * t1.vtheta - t2.radius * t2.vtheta);
    let moment_scale = moment_scale(runner, t1, t2);
    report.check(
        "Shaft torque",
        "moment of momentum from the triangles, ρQ(r₁V_θ1 − r₂V_θ2)",
        Q::Torque,
        torque,
        sign * moment,
        1e-9,
        moment_scale,
    );
    let head_scale = [t1.v(), t2.v(), t1.u, t2.u, t1.w(), t2.w()]
        .iter()
        .map(|x| x * x)
        .sum::<f64>()
        / (2.0 * g);
    let triangles =
        (t1.v().powi(2) - t2.v().powi(2) + t1.u.powi(2) - t2.u.powi(2) + t2.w().powi(2) - t1.w().powi(2)) / (2.0 * g);
    report.check(
        "Euler head",
        "energy form of the triangles, [(V₁²−V₂²) + (u₁²−u₂²) + (W₂²−W₁²)]/2g",
        Q::Length,
        euler_head,
        sign * triangles,
        1e-9,
        head_scale,
    );
    let kinetic_rise = (t2.v().powi(2) - t1.v().powi(2)) / (2.0 * g);
    let head_from_pressure = -sign * (pressure_rise / (rho * g) + kinetic_rise);
    report.check(
        "Euler head",
        "static pressure change from the rotating-frame energy balance plus the change of absolute velocity \
                head",
        Q::Length,
        euler_head,
        head_from_pressure,
        1e-9,
        head_scale,
    );
}

fn cell(v: f64, kind: Q, unit: &str) -> String {
    units::convert_to(v, kind, unit)
        .map(|x| units::format_significant(x, 4))
        .unwrap_or_else(|| "—".to_string())
}

fn triangle_table(t1: &Triangle, t2: &Triangle, system: UnitSystem) -> Table {
    let biggest = [t1.u, t2.u, t1.v(), t2.v(), t1.w(), t2.w()]
        .into_iter()
        .fold(0.0, f64::max);
    let vu = units::display_unit(biggest, Q::Velocity, system).id;
    let au = "deg";
    let row = |label: &str, f: &dyn Fn(&Triangle) -> f64, kind: Q, unit: &str| {
        vec![label.to_string(), cell(f(t1), kind, unit), cell(f(t2), kind, unit)]
    };
    Table {
        key: "triangles",
        title: "Velocity triangles: components at the blade inlet (1) and outlet (2)".to_string(),
        columns: vec![
            "Component".to_string(),
            "inlet (1)".to_string(),
            "outlet (2)".to_string(),
        ],
        rows: vec![
            row(
                &format!(
                    "radius r ({})",
                    units::display_unit(t1.radius.max(t2.radius), Q::Length, system).id
                ),
                &|t| t.radius,
                Q::Length,
                units::display_unit(t1.radius.max(t2.radius), Q::Length, system).id,
            ),
            row(&format!("blade speed u = ωr ({vu})"), &|t| t.u, Q::Velocity, vu),
            row(
                &format!("meridional velocity V_m = Q/A ({vu})"),
                &|t| t.vm,
                Q::Velocity,
                vu,
            ),
            row(&format!("swirl V_θ ({vu})"), &|t| t.vtheta, Q::Velocity, vu),
            row(&format!("absolute velocity V ({vu})"), &|t| t.v(), Q::Velocity, vu),
            row(
                &format!("relative swirl W_θ = V_θ − u ({vu})"),
                &|t| t.w_theta(),
                Q::Velocity,
                vu,
            ),
            row(&format!("relative velocity W ({vu})"), &|t| t.w(), Q::Velocity, vu),
            row(
                &format!("absolute flow angle α, from u ({au})"),
                &|t| t.alpha(),
                Q::Angle,
                au,
            ),
            row(
                &format!("relative flow angle β, from −u ({au})"),
                &|t| t.beta(),
                Q::Angle,
                au,
            ),
        ],
        emphasised_rows: vec![3],
        typed_columns: Vec::new(),
    }
}

/// The angular-momentum ledger about the axis (terms of one balance) and the Euler
/// head that follows from it; the checks table holds the independent forms.
fn ledger(balance: &Balance, water_torque: f64, euler_head: f64, system: UnitSystem) -> Table {
    let o = balance.moment_point;
    let mut rows: Vec<(String, f64, Q)> = Vec::new();
    for p in &balance.ports {
        rows.push((
            format!("{}: moment of momentum out, r × ±ṁ(W + ω×r)", p.name),
            (p.position - o).cross(p.momentum_outflow).z,
            Q::Torque,
        ));
    }
    let total = rows.len();
    rows.push((
        "M = torque the shaft exerts on the water (sum)".to_string(),
        balance.support_moment.z,
        Q::Torque,
    ));
    rows.push((
        "T = torque the water exerts on the runner, −M".to_string(),
        water_torque,
        Q::Torque,
    ));
    rows.push((
        "Euler head from the torque, ±Tω/(ρgQ)".to_string(),
        euler_head,
        Q::Length,
    ));
    let torque_max = rows
        .iter()
        .filter(|r| r.2 == Q::Torque)
        .map(|r| r.1.abs())
        .fold(0.0, f64::max);
    let tu = units::display_unit(torque_max, Q::Torque, system).id;
    let lu = units::display_unit(euler_head.abs(), Q::Length, system).id;
    Table {
        key: "torque_ledger",
        title: "Angular-momentum ledger about the axis (rotating CV; pressures over surfaces of revolution have \
                    no moment)"
            .to_string(),
        columns: vec!["Term".to_string(), "value".to_string(), "unit".to_string()],
        rows: rows
            .into_iter()
            .map(|(label, v, kind)| {
                let unit = if kind == Q::Torque { tu } else { lu };
                vec![label, cell(v, kind, unit), unit.to_string()]
            })
            .collect(),
        emphasised_rows: vec![total + 1, total + 2],
        typed_columns: Vec::new(),
    }
}

/// Euler head against flow at this speed, from engine balances, with this flow marked.
fn head_plot(solved: &Solved, report: &Report<'_>) -> Plot {
    let system = report.system();
    let top = 1.6 * solved.runner.flow;
    let points = &solved.curve;
    let q_unit = units::display_unit(top, Q::VolumeFlow, system).id;
    let h_max = points.iter().map(|p| p[1].abs()).fold(0.0, f64::max);
    let h_unit = units::display_unit(h_max, Q::Length, system).id;
    let conv = |p: [f64; 2]| {
        [
            units::convert_to(p[0], Q::VolumeFlow, q_unit).unwrap_or(f64::NAN),
            units::convert_to(p[1], Q::Length, h_unit).unwrap_or(f64::NAN),
        ]
    };
    Plot {
        key: "head_flow",
        title: "Euler head against flow at this speed".to_string(),
        x_label: format!("flow ({q_unit})"),
        y_label: format!("Euler head ({h_unit})"),
        series: vec![Series {
            name: "Euler head (ideal, no slip)".to_string(),
            points: points.iter().copied().map(conv).collect(),
        }],
        markers: vec![crate::catalog::Marker {
            at: conv([solved.runner.flow, solved.euler_head]),
            label: "this flow".to_string(),
        }],
    }
}
