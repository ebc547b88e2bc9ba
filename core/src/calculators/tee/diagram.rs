//! The junction's diagram: a plan view of the pipes to scale, the control volume,
//! the flows with their shares and the forces on one scale.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::{self, QuantityKind as Q};
use crate::vector::Vec3;

use super::super::common;
use super::model::{Inputs, Solved};

/// The junction in plan: pipes to scale, the control volume, flows and forces.
pub fn diagram(inputs: &Inputs, solved: &Solved, report: &Report<'_>) -> Diagram {
    let (branches, port_of, balance) = (&inputs.branches, &solved.port_of, &solved.balance);
    let (d_common, dividing) = (inputs.d_common.value, inputs.dividing());
    let stub = d_common;
    let lead = 3.0 * d_common;
    let mut shapes = Vec::new();
    let common_end = if dividing { [-lead, 0.0] } else { [lead, 0.0] };
    shapes.push(Shape::Polygon {
        points: common::straight_band(common_end, [0.0, 0.0], 1.1 * d_common),
        style: ShapeStyle::Wall,
    });
    for b in branches {
        let sign = if dividing { 1.0 } else { -1.0 };
        let end = [sign * lead * b.direction.x, sign * lead * b.direction.y];
        shapes.push(Shape::Polygon {
            points: common::straight_band([0.0, 0.0], end, 1.1 * b.diameter.value),
            style: ShapeStyle::Wall,
        });
    }
    shapes.push(Shape::Polygon {
        points: common::straight_band(common_end, [0.0, 0.0], d_common),
        style: ShapeStyle::Fluid,
    });
    for b in branches {
        let sign = if dividing { 1.0 } else { -1.0 };
        let end = [sign * lead * b.direction.x, sign * lead * b.direction.y];
        shapes.push(Shape::Polygon {
            points: common::straight_band([0.0, 0.0], end, b.diameter.value),
            style: ShapeStyle::Fluid,
        });
    }
    // Control volume: a circle through the faces of the ports.
    shapes.push(Shape::Circle {
        center: [0.0, 0.0],
        radius: stub,
        style: ShapeStyle::ControlVolume,
    });
    // Flow arrows along each pipe, labelled with the branch number and share.
    let common_flow = balance.ports.first().map(|s| s.volume_flow).unwrap_or(0.0);
    let flow_arrow = |from: [f64; 2], to: [f64; 2], label: String| Shape::Arrow {
        from,
        to,
        label,
        style: ShapeStyle::Flow,
    };
    if dividing {
        shapes.push(flow_arrow(
            [-0.9 * lead, 0.6 * d_common],
            [-0.5 * lead, 0.6 * d_common],
            "common".to_string(),
        ));
    } else {
        shapes.push(flow_arrow(
            [0.5 * lead, 0.6 * d_common],
            [0.9 * lead, 0.6 * d_common],
            "common".to_string(),
        ));
    }
    for (b, &i) in branches.iter().zip(port_of) {
        let u = [b.direction.x, b.direction.y];
        let share = if common_flow > 0.0 {
            balance.ports[i].volume_flow / common_flow
        } else {
            0.0
        };
        let label = format!("{}: {} %", b.index + 1, units::format_significant(100.0 * share, 3));
        let (s0, s1) = if dividing {
            (0.5 * lead, 0.9 * lead)
        } else {
            (-0.9 * lead, -0.5 * lead)
        };
        shapes.push(flow_arrow([s0 * u[0], s0 * u[1]], [s1 * u[0], s1 * u[1]], label));
    }
    let thrust = balance.thrust();
    let flat = |v: Vec3| Vec3::new(v.x, v.y, 0.0);
    let max_force = balance
        .ports
        .iter()
        .map(|s| flat(s.pressure_force).norm())
        .chain([flat(thrust).norm()])
        .fold(0.0, f64::max);
    let scale = if max_force > 0.0 { 0.8 * lead / max_force } else { 0.0 };
    let fmt = |f: Vec3| report.fmt(flat(f).norm(), Q::Force);
    for s in &balance.ports {
        if let Some(a) = common::force_arrow(
            s.position.xy(),
            flat(s.pressure_force),
            scale,
            format!("p·A {}", fmt(s.pressure_force)),
            ShapeStyle::Pressure,
            false,
        ) {
            shapes.push(a);
        }
    }
    common::thrust_and_restraint_arrows(&mut shapes, [0.0, 0.0], [0.0, 0.0], flat(thrust), scale, &fmt(thrust));
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.3 * d_common);
    Diagram {
        title: format!(
            "{} junction, plan view: control volume and forces",
            if dividing { "Dividing" } else { "Combining" }
        ),
        bounds,
        shapes,
        caption:
            "Pipes to scale in plan (branches with an elevation angle are drawn foreshortened); force arrows share \
                one scale, plan components only. T acts on the supports; R = −T is what the restraint supplies."
                .to_string(),
    }
}
