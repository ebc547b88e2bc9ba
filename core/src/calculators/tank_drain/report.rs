//! The vessel's report: outputs, checks, warnings, the basis, ports and ledger
//! tables, the level against time and the vessel's section, built from the model's
//! typed result ([`super::model::Solved`]).

use crate::catalog::{Diagram, Marker, Plot, Report, Series, Shape, ShapeStyle, Table};
use crate::units::{self, QuantityKind as Q, UnitSystem};

use super::geometry::Shape as Vessel;
use super::model::{Classic, General, LevelPoints, Method, Solved};
use super::run::{Inflow, Outlet, Stop, LAMINAR_LIMIT};
use super::{CHECK_MAX_RATIO, UNSTEADY_NOTICE_RATIO};
use crate::calculators::common;

const TIME_BASIS: &str = "the quasi-steady Torricelli closed form (2A_t/(C_d·a))·√((1 − r²)/2g)·(√h₁ − √h₂), which \
    it must approach for a small outlet; allowed difference (1.5·r²/(1 − r²) + 10⁻⁹)·√h₁/(√h₁ − √h₂)";
const ENERGY_LABEL: &str =
    "Energy carried out by the jet plus kinetic energy left in the tank, per unit weight drained";
const ENERGY_BASIS: &str = "the potential energy released per unit weight drained, (h₁ + h₂)/2 (energy balance of \
    the whole drain; the quasi-steady law would overshoot it by r²/(1 − r²))";
const CLASSIC_METHOD: &str = "unsteady mass and energy balances, liquid at rest when the outlet opens; tanh-sinh \
    quadrature of dt = −dh/(r·V)";
const GENERAL_METHOD: &str = "mass balance dV/dt = Q_in − Q_out integrated in time (RK4 with step doubling), \
    quasi-steady energy balance of the outlet";
const QUADRATURE_BASIS: &str = "tanh-sinh quadrature of dt = A(h)·dh/(Q_in − Q_out(h)) over the level, a second \
    path to the same time";
const SETTLED_BASIS: &str =
    "the steady level where the outflow equals the inflow, found by a bracketed search on Q_out(h)";

/// Writes everything the page shows from the solved vessel.
pub fn write(s: &Solved, report: &mut Report<'_>) {
    if let Some(time) = s.time {
        report.output("time", time);
    }
    match &s.method {
        Method::General(g) => {
            if let Some(level) = g.steady_level {
                report.output("steady_level", level);
            }
        }
        Method::Classic(_) => {}
    }
    if s.peak.jet_area > 0.0 {
        report.output("jet_reaction", s.density * s.peak.flow * s.peak.jet_velocity);
    }
    report.output("end_of_run", s.end_of_run);
    report.output("q_peak", s.peak.flow);
    if s.peak.jet_area > 0.0 {
        report.output("v_jet_peak", s.peak.jet_velocity);
    }
    let area_at_peak = s.shape.area(s.level_at_peak);
    if s.inflow_at_peak == 0.0 && area_at_peak > 0.0 {
        // Without inflow the rate is the outflow over the area: well conditioned.
        report.output("level_rate_peak", s.peak.flow / area_at_peak);
    }
    report.output("level_at_peak", s.level_at_peak);
    report.output("volume", (s.shape.volume(s.start) - s.shape.volume(s.end_of_run)).abs());
    report.output("q_end", s.at_end.flow);
    report.output("storage_start", s.density * s.rate_at_start);
    let settled = matches!(&s.method, Method::General(g) if g.run.stop == Stop::Settled);
    if !settled {
        // At a settled level the rate is a small difference of large flows: not shown.
        report.output("storage_end", s.density * s.rate_at_end);
    }
    match &s.method {
        Method::Classic(c) => classic(s, c, report),
        Method::General(g) => general(s, g, report),
    }
    mass_ledger(s, report);
    if let Some(balance) = &s.balance {
        report.table(|report| common::ports_table(balance, report.system()));
        report.table(|report| common::ledger_table(balance, report.system()));
    }
    level_plot(s, report);
    report.diagram(|report| section(s, report));
}

/// The mass balance as a ledger at the start, at the largest outflow and at the end
/// of the run: inflow, outflow and the storage term ρ·dV/dt they leave.
fn mass_ledger(s: &Solved, report: &mut Report<'_>) {
    let rho = s.density;
    let moments = [
        ("start", s.inflow_at_start, s.flow_at_start),
        ("largest outflow", s.inflow_at_peak, s.peak.flow),
        ("end of the run", s.inflow_at_end, s.at_end.flow),
    ];
    let largest = moments.iter().fold(0.0f64, |a, m| a.max(rho * m.1).max(rho * m.2));
    let unit = units::display_unit(largest.max(1e-12), Q::MassFlow, report.system()).id;
    let cell =
        |v: f64| units::convert_to(v, Q::MassFlow, unit).map_or("—".to_string(), |x| units::format_significant(x, 4));
    let mut rows = Vec::new();
    for (name, inflow, outflow) in moments {
        rows.push(vec![
            name.to_string(),
            cell(rho * inflow),
            cell(rho * outflow),
            cell(rho * (inflow - outflow)),
        ]);
    }
    report.table(|_| Table {
        key: "mass_ledger",
        title: "Mass ledger: inflow − outflow = storage term ρ·dV/dt (positive when filling)".to_string(),
        columns: vec![
            "When".to_string(),
            format!("inflow ρ·Q_in ({unit})"),
            format!("outflow ρ·Q_out ({unit})"),
            format!("storage ρ·dV/dt ({unit})"),
        ],
        rows,
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    });
}

fn classic(s: &Solved, c: &Classic, report: &mut Report<'_>) {
    let (h1, h2, r) = (s.start, s.end_of_run, c.tank.ratio);
    let time = c.elapsed;
    if s.time.is_none() {
        report.warn(
            Some("t_max"),
            format!(
                "the final level is not reached within the longest time simulated ({}); the level is then {}",
                report.fmt(time, Q::Time),
                report.fmt(h2, Q::Length)
            ),
        );
    }
    let quasi_steady = c.time_quasi_steady;
    if time < c.time_free_fall * (1.0 - 1e-9) {
        report.defect(format!(
            "drain time {time} s is shorter than free fall {} s",
            c.time_free_fall
        ));
    }
    report.output("area_ratio", r);
    report.output("time_free_fall", c.time_free_fall);
    if r <= CHECK_MAX_RATIO {
        let r2 = r * r;
        // The closed form's time for the level reached is as sensitive to that level
        // as the model's difference is: both grow with √h₁/(√h₁ − √h₂), which is
        // large when the run ends soon after the start (fuzzing found 5e-8 on a run
        // of 2.4 s with the rounding allowance left outside that factor).
        let tolerance = (1.5 * r2 / (1.0 - r2) + 1e-9) * h1.sqrt() / (h1.sqrt() - h2.sqrt());
        report.check(
            if s.time.is_some() {
                "Time to drain (unsteady balance from rest)"
            } else {
                "Level drained to in the longest time, as a time (unsteady balance from rest)"
            },
            TIME_BASIS,
            Q::Time,
            time,
            quasi_steady,
            tolerance,
            0.0,
        );
    }
    report.check(
        ENERGY_LABEL,
        ENERGY_BASIS,
        Q::Length,
        c.energy_out_per_weight,
        0.5 * (h1 + h2),
        1e-8,
        0.0,
    );
    if r > UNSTEADY_NOTICE_RATIO {
        report.warn(
            Some("d_orifice"),
            format!(
                "the outlet is large for the tank (r = C_d·a/A_t = {}): the level falls fast enough that the \
                 unsteady term matters; the time shown is from the unsteady balance starting from rest, and the \
                 quasi-steady Torricelli formula would give {} ({} % less)",
                units::format_significant(r, 3),
                report.fmt(quasi_steady, Q::Time),
                units::format_significant(100.0 * (1.0 - quasi_steady / time), 2)
            ),
        );
    }
    if c.cd > 0.99 {
        report.warn(
            Some("cd"),
            "a discharge coefficient this close to 1 assumes an ideal, perfectly rounded outlet",
        );
    }
    report.table(|_| {
        common::basis_table(vec![
            ("Vessel", "vertical cylinder, vented".to_string()),
            ("Method", CLASSIC_METHOD.to_string()),
            (
                "Coefficients",
                format!(
                    "C_d = {}, C_v = {}, C_c = C_d/C_v = {}",
                    units::format_significant(c.cd, 4),
                    units::format_significant(c.cv, 4),
                    units::format_significant(c.cd / c.cv, 4)
                ),
            ),
            ("Area ratio r = C_d·a/A_t", units::format_significant(r, 4)),
            ("Ports table and ledger", "at the largest outflow".to_string()),
        ])
    });
}

fn general(s: &Solved, g: &General, report: &mut Report<'_>) {
    let vessel = &g.vessel;
    let start_area = s.shape.area(s.start.max(1e-9 * s.end.max(s.start)));
    let effective = match vessel.outlet {
        Outlet::Orifice { area, cd, .. } => Some(cd * area),
        Outlet::Pipe { bore, .. } => Some(super::run::pipe_area(bore)),
        Outlet::Pump { .. } => None,
    };
    if let Some(effective) = effective {
        if start_area > 0.0 {
            let ratio = effective / start_area;
            report.output("area_ratio", ratio);
            if ratio > UNSTEADY_NOTICE_RATIO {
                report.warn(
                    Some(outlet_field(&vessel.outlet)),
                    format!(
                        "the outlet is large against the vessel at the starting level (C_d·a/A = {}): the \
                         quasi-steady outflow used here neglects the inertia of the liquid{}, which matters when \
                         this ratio is not small",
                        units::format_significant(ratio, 3),
                        if matches!(vessel.shape, Vessel::VerticalCylinder { .. }) {
                            ""
                        } else {
                            " and the velocity head of the falling surface"
                        }
                    ),
                );
            }
        }
    }
    // Why the run stopped.
    let last = s.end_of_run;
    match g.run.stop {
        Stop::Reached => {}
        Stop::Empty => report.warn(
            Some("h_end"),
            format!(
                "the vessel empties before the final level is reached (after {})",
                report.fmt(g.run.last().time, Q::Time)
            ),
        ),
        Stop::Full => report.warn(
            Some("h_end"),
            format!(
                "the vessel fills to its top and overflows after {}, before the final level is reached",
                report.fmt(g.run.last().time, Q::Time)
            ),
        ),
        Stop::Settled => report.warn(
            Some("h_end"),
            format!(
                "the level settles at {}, where the inflow equals the outflow: the final level is never reached",
                report.fmt(last, Q::Length)
            ),
        ),
        Stop::LongestTime => report.warn(
            Some("t_max"),
            format!(
                "the final level is not reached within the longest time simulated ({}); the level is then {}",
                report.fmt(g.run.last().time, Q::Time),
                report.fmt(last, Q::Length)
            ),
        ),
        Stop::Steps => report.warn(
            None,
            format!(
                "the run was cut short after {} steps at {}, with the level at {}: the inflow table or the \
                 vessel makes the run extremely slow to follow",
                super::run::MAX_STEPS,
                report.fmt(g.run.last().time, Q::Time),
                report.fmt(last, Q::Length)
            ),
        ),
    }
    // Steady level.
    let final_inflow = vessel.inflow.last();
    if g.steady_level.is_none() && final_inflow > 0.0 {
        let why = match vessel.outlet {
            Outlet::Pump { flow } if (flow - final_inflow).abs() <= 1e-12 * flow => {
                "the pump takes exactly the inflow, so any level stays where it is"
            }
            Outlet::Pump { .. } => "a pump takes a fixed flow whatever the level, so the level keeps moving",
            _ if vessel.outlet_at(0.0).flow >= final_inflow => {
                "even with the vessel empty, the gas pressure or the outlet pipe's drop drives out more than the \
                 inflow"
            }
            _ => "the vessel would overflow before the outflow rises to the inflow",
        };
        report.warn(None, format!("there is no steady level: {why}"));
    }
    // Checks by an independent path.
    if let (Some(time), Some(by_quadrature)) = (s.time, g.time_by_quadrature) {
        // The run integrates the volume, known to a few ε of the larger volume: with a
        // final level nearly the start's, that rounding is a share ε·V/ΔV of the
        // volume moved, and so of the time, that no step control resolves.
        let (v_start, v_end) = (g.vessel.shape.volume(s.start), g.vessel.shape.volume(s.end));
        let moved = (v_start - v_end).abs().max(f64::MIN_POSITIVE);
        let unresolved = 64.0 * f64::EPSILON * v_start.abs().max(v_end.abs()) / moved;
        const TOLERANCE: f64 = 1e-6;
        report.check(
            "Time to reach the final level (run in time)",
            QUADRATURE_BASIS,
            Q::Time,
            time,
            by_quadrature,
            TOLERANCE,
            time.abs() * (1.0 + unresolved / TOLERANCE),
        );
    }
    if let (Stop::Settled, Some(steady)) = (g.run.stop, g.steady_level) {
        let range = s.start.max(steady).max(s.end);
        report.check(
            "Level where the run settled",
            SETTLED_BASIS,
            Q::Length,
            last,
            steady,
            1e-4,
            range,
        );
    }
    // Outlet pipe.
    if let Outlet::Pipe { .. } = vessel.outlet {
        let re = s.peak.reynolds;
        if (LAMINAR_LIMIT..4000.0).contains(&re) {
            report.warn(
                Some("d_outlet"),
                format!(
                    "the outlet pipe's flow is transitional at the largest outflow (Re = {}): the friction factor \
                     is uncertain between 2300 and 4000",
                    units::format_significant(re, 3)
                ),
            );
        }
    }
    if vessel.gas_pressure > 0.0 {
        report.warn(
            Some("p_gas"),
            "a vessel under gas pressure is a pressure vessel: its design and relief follow the pressure-vessel code",
        );
    }
    let mut basis = vec![
        ("Vessel", s.shape.name().to_string()),
        ("Method", GENERAL_METHOD.to_string()),
        ("Outlet", outlet_basis(s, &vessel.outlet)),
        (
            "Inflow",
            match &vessel.inflow {
                Inflow::None => "none".to_string(),
                Inflow::Constant(q) => format!("constant, {}", report.fmt(*q, Q::VolumeFlow)),
                Inflow::Table(rows) => format!("typed table of {} rows, the last inflow held after it", rows.len()),
            },
        ),
        (
            "Gas above the liquid",
            if vessel.gas_pressure > 0.0 {
                format!("{} gauge, held constant", report.fmt(vessel.gas_pressure, Q::Pressure))
            } else {
                "vented (atmospheric)".to_string()
            },
        ),
        ("Run stopped", stop_text(g.run.stop).to_string()),
        ("Ports table and ledger", "at the largest outflow".to_string()),
    ];
    if let Some(top) = s.top {
        basis.insert(1, ("Top of the vessel above the outlet", report.fmt(top, Q::Length)));
    }
    report.table(|_| common::basis_table(basis));
}

fn outlet_field(outlet: &Outlet) -> &'static str {
    match outlet {
        Outlet::Orifice { .. } => "d_orifice",
        Outlet::Pipe { .. } => "d_outlet",
        Outlet::Pump { .. } => "q_out",
    }
}

fn outlet_basis(s: &Solved, outlet: &Outlet) -> String {
    match outlet {
        Outlet::Orifice { cd, cv, .. } => format!(
            "orifice, C_d = {}, C_v = {}, Q = C_d·a·√(2gH{})",
            units::format_significant(*cd, 4),
            units::format_significant(*cv, 4),
            if matches!(s.shape, Vessel::VerticalCylinder { .. }) {
                "/(1 − r²)"
            } else {
                ""
            }
        ),
        Outlet::Pipe { .. } => format!(
            "pipe to atmosphere, g·H = ½V²·(1 + ΣK + f·L/D); at the largest outflow Re = {}, f = {}",
            units::format_significant(s.peak.reynolds, 3),
            units::format_significant(s.peak.friction, 4)
        ),
        Outlet::Pump { .. } => "pump at a fixed flow while there is liquid".to_string(),
    }
}

fn stop_text(stop: Stop) -> &'static str {
    match stop {
        Stop::Reached => "at the final level",
        Stop::Empty => "empty",
        Stop::Full => "full, at the top",
        Stop::Settled => "settled at the steady level",
        Stop::LongestTime => "at the longest time simulated",
        Stop::Steps => "at the step limit",
    }
}

/// Level against time (the classic tank's curve is integrated here, for a full solve
/// only).
fn level_plot(s: &Solved, report: &mut Report<'_>) {
    report.plot(|report| {
        let LevelPoints { points, half_way } = s.level_curve.points();
        let span = points.last().map_or(0.0, |p| p[0]);
        let (t_unit, h_unit) = match (report.system(), span > 48.0 * 3600.0) {
            (UnitSystem::Si, false) => ("min", "m"),
            (UnitSystem::Si, true) => ("h", "m"),
            (UnitSystem::UsCustomary, false) => ("min", "ft"),
            (UnitSystem::UsCustomary, true) => ("h", "ft"),
        };
        let t_out = |t: f64| units::convert_to(t, Q::Time, t_unit).unwrap_or(t);
        let h_out = |h: f64| units::convert_to(h, Q::Length, h_unit).unwrap_or(h);
        let markers = half_way
            .iter()
            .map(|[t, h]| Marker {
                at: [t_out(*t), h_out(*h)],
                label: "half the level change".to_string(),
            })
            .collect();
        Plot {
            key: "level",
            title: "Liquid level against time".to_string(),
            x_label: format!("time ({t_unit})"),
            y_label: format!("level above the outlet ({h_unit})"),
            series: vec![Series {
                name: "level".to_string(),
                points: points.iter().map(|[t, h]| [t_out(*t), h_out(*h)]).collect(),
            }],
            markers,
        }
    });
}

/// Section through the vessel, to scale.
fn section(s: &Solved, report: &Report<'_>) -> Diagram {
    let highest = s.start.max(s.end).max(s.end_of_run);
    let height = s.top.unwrap_or(highest * 1.15).max(highest);
    // The half-width of the section at a level: from the area for the table.
    let half_width = |h: f64| match &s.shape {
        Vessel::VerticalCylinder { diameter } | Vessel::ConeBottom { diameter, .. } if h >= cone(&s.shape) => {
            diameter / 2.0
        }
        Vessel::ConeBottom { diameter, cone_height } => diameter / 2.0 * h / cone_height,
        Vessel::HorizontalCylinder { diameter, .. } | Vessel::Sphere { diameter } => {
            let r = diameter / 2.0;
            (r * r - (h - r) * (h - r)).max(0.0).sqrt()
        }
        Vessel::Table(_) | Vessel::VerticalCylinder { .. } => (s.shape.area(h) / std::f64::consts::PI).sqrt(),
    };
    let levels: Vec<f64> = (0..=48).map(|i| height * i as f64 / 48.0).collect();
    let mut outline: Vec<[f64; 2]> = levels.iter().rev().map(|&h| [-half_width(h), h]).collect();
    outline.extend(levels.iter().map(|&h| [half_width(h), h]));
    let fluid_levels: Vec<f64> = (0..=48).map(|i| s.start * i as f64 / 48.0).collect();
    let mut fluid: Vec<[f64; 2]> = fluid_levels.iter().rev().map(|&h| [-half_width(h), h]).collect();
    fluid.extend(fluid_levels.iter().map(|&h| [half_width(h), h]));
    let width = outline.iter().fold(0.0f64, |a, p| a.max(p[0])).max(1e-3);
    let mut shapes = vec![
        Shape::Polyline {
            points: outline,
            style: ShapeStyle::Wall,
        },
        Shape::Polygon {
            points: fluid,
            style: ShapeStyle::Fluid,
        },
        Shape::Polyline {
            points: vec![[-width, s.end], [width, s.end]],
            style: ShapeStyle::Guide,
        },
        Shape::Text {
            at: [width * 1.05, s.start],
            text: "start level".to_string(),
            style: ShapeStyle::Label,
        },
        Shape::Text {
            at: [width * 1.05, s.end],
            text: "final level".to_string(),
            style: ShapeStyle::Label,
        },
    ];
    let jet_len = 0.3 * height.max(2.0 * width);
    let label = if s.peak.jet_area > 0.0 {
        format!("jet up to {}", report.fmt(s.peak.jet_velocity, Q::Velocity))
    } else {
        format!("pumped {}", report.fmt(s.peak.flow, Q::VolumeFlow))
    };
    shapes.push(Shape::Arrow {
        from: [0.0, 0.0],
        to: [0.0, -jet_len],
        label,
        style: ShapeStyle::Velocity,
    });
    let bounds = common::bounds_of(
        shapes.iter().flat_map(common::shape_points),
        0.15 * (2.0 * width).max(height),
    );
    Diagram {
        title: "Vessel section".to_string(),
        bounds,
        shapes,
        caption: "Vessel to scale (a typed table as the circle of the same area); the outlet and jet are drawn \
                  schematically."
            .to_string(),
    }
}

fn cone(shape: &Vessel) -> f64 {
    match shape {
        Vessel::ConeBottom { cone_height, .. } => *cone_height,
        _ => 0.0,
    }
}
