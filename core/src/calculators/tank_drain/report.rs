//! The tank drain's report: outputs, checks, warnings, the basis and ports tables,
//! the level against time and the tank section, built from the model's typed result
//! ([`super::model::Solved`]).

use crate::catalog::{Diagram, Marker, Plot, Report, Series, Shape, ShapeStyle};
use crate::units::{self, QuantityKind as Q, UnitSystem};

use super::model::Solved;
use super::{CHECK_MAX_RATIO, UNSTEADY_NOTICE_RATIO};
use crate::calculators::common;

const TIME_BASIS: &str = "the quasi-steady Torricelli closed form (2A_t/(C_d·a))·√((1 − r²)/2g)·(√h₁ − √h₂), which \
    it must approach for a small outlet; allowed difference 1.5·r²/(1 − r²)·√h₁/(√h₁ − √h₂)";
const ENERGY_LABEL: &str =
    "Energy carried out by the jet plus kinetic energy left in the tank, per unit weight drained";
const ENERGY_BASIS: &str = "the potential energy released per unit weight drained, (h₁ + h₂)/2 (energy balance of \
    the whole drain; the quasi-steady law would overshoot it by r²/(1 − r²))";
const METHOD: &str = "unsteady mass and energy balances, liquid at rest when the outlet opens; tanh-sinh \
    quadrature of dt = −dh/(r·V)";

/// Writes everything the page shows from the solved drain.
pub fn write(s: &Solved, report: &mut Report<'_>) {
    let (h1, h2, r) = (s.start, s.end, s.tank.ratio);
    let (time, quasi_steady) = (s.time, s.time_quasi_steady);
    if time < s.time_free_fall * (1.0 - 1e-9) {
        report.defect(format!(
            "drain time {time} s is shorter than free fall {} s",
            s.time_free_fall
        ));
    }
    report.output("time", time);
    report.output("q_peak", s.flow_at_peak);
    report.output("v_jet_peak", s.cv * s.velocity_at_peak);
    report.output("level_rate_peak", s.level_rate_at_peak);
    report.output("level_at_peak", s.level_at_peak);
    report.output("volume", s.tank.area * (h1 - h2));
    report.output("q_end", s.tank.effective_orifice * s.velocity_at_end);
    report.output("area_ratio", r);
    report.output("time_free_fall", s.time_free_fall);
    if r <= CHECK_MAX_RATIO {
        let r2 = r * r;
        let tolerance = 1.5 * r2 / (1.0 - r2) * h1.sqrt() / (h1.sqrt() - h2.sqrt()) + 1e-9;
        report.check(
            "Time to drain (unsteady balance from rest)",
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
        s.energy_out_per_weight,
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
    if s.cd > 0.99 {
        report.warn(
            Some("cd"),
            "a discharge coefficient this close to 1 assumes an ideal, perfectly rounded outlet",
        );
    }
    report.solution.tables.push(common::basis_table(vec![
        ("Method", METHOD.to_string()),
        (
            "Coefficients",
            format!(
                "C_d = {}, C_v = {}, C_c = C_d/C_v = {}",
                units::format_significant(s.cd, 4),
                units::format_significant(s.cv, 4),
                units::format_significant(s.cd / s.cv, 4)
            ),
        ),
        ("Area ratio r = C_d·a/A_t", units::format_significant(r, 4)),
        ("Ports table", "at the largest outflow".to_string()),
    ]));
    report
        .solution
        .tables
        .push(common::ports_table(&s.balance, report.system()));
    level_plot(s, report);
    let section = section(s, report);
    report.solution.diagrams.push(section);
}

/// Level against time.
fn level_plot(s: &Solved, report: &mut Report<'_>) {
    let (t_unit, h_unit) = match report.system() {
        UnitSystem::Si => ("min", "m"),
        UnitSystem::UsCustomary => ("min", "ft"),
    };
    let t_out = |t: f64| units::convert_to(t, Q::Time, t_unit).unwrap_or(t);
    let h_out = |h: f64| units::convert_to(h, Q::Length, h_unit).unwrap_or(h);
    report.solution.plots.push(Plot {
        key: "level",
        title: "Liquid level against time".to_string(),
        x_label: format!("time ({t_unit})"),
        y_label: format!("level above the orifice ({h_unit})"),
        series: vec![Series {
            name: "level".to_string(),
            points: s.curve.iter().map(|[t, h]| [t_out(*t), h_out(*h)]).collect(),
        }],
        markers: vec![Marker {
            at: [t_out(s.half_drop[0]), h_out(s.half_drop[1])],
            label: "half the level drop".to_string(),
        }],
    });
}

/// Section through the tank, to scale.
fn section(s: &Solved, report: &Report<'_>) -> Diagram {
    let (h1, h2, d_tank) = (s.start, s.end, s.tank_diameter);
    let radius = d_tank / 2.0;
    let mut shapes = vec![
        Shape::Polyline {
            points: vec![
                [-radius, h1 * 1.15 + 0.1 * radius],
                [-radius, 0.0],
                [radius, 0.0],
                [radius, h1 * 1.15 + 0.1 * radius],
            ],
            style: ShapeStyle::Wall,
        },
        Shape::Polygon {
            points: vec![[-radius, 0.0], [radius, 0.0], [radius, h1], [-radius, h1]],
            style: ShapeStyle::Fluid,
        },
        Shape::Polyline {
            points: vec![[-radius, h2], [radius, h2]],
            style: ShapeStyle::Guide,
        },
        Shape::Text {
            at: [radius * 1.05, h1],
            text: "start level".to_string(),
            style: ShapeStyle::Label,
        },
        Shape::Text {
            at: [radius * 1.05, h2],
            text: "final level".to_string(),
            style: ShapeStyle::Label,
        },
    ];
    let jet_len = 0.3 * h1.max(d_tank);
    shapes.push(Shape::Arrow {
        from: [0.0, 0.0],
        to: [0.0, -jet_len],
        label: format!("jet up to {}", report.fmt(s.cv * s.velocity_at_peak, Q::Velocity)),
        style: ShapeStyle::Velocity,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.15 * d_tank.max(h1));
    Diagram {
        title: "Tank section".to_string(),
        bounds,
        shapes,
        caption: "Tank to scale; the orifice and jet are drawn schematically.".to_string(),
    }
}
