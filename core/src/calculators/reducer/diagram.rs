//! The reducer diagram: the cone to scale, the control volume and the forces.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::engine;
use crate::units::QuantityKind as Q;
use crate::vector::{Direction, Vec3};

use super::super::common;

pub fn diagram(
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
        caption: "Pipes and cone to scale; force arrows share one scale, in-plane components only. T acts on the \
                supports; R = −T is what the restraint supplies."
            .to_string(),
    }
}
