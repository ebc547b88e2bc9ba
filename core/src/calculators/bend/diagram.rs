//! The bend diagram: pipe and bend to scale, the control volume, the pressure
//! forces at the faces and the thrust with its restraint.

use std::f64::consts::PI;

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::engine;
use crate::units::QuantityKind as Q;
use crate::vector::Vec3;

use super::super::common;
use super::model::Geometry;

pub fn diagram(g: &Geometry, balance: &engine::Balance, report: &Report<'_>) -> Diagram {
    let mut shapes = Vec::new();
    let lead = 1.2 * g.d_in.max(g.d_out);
    let center = [0.0, g.sense * g.radius];
    let start_angle = if g.sense > 0.0 { -PI / 2.0 } else { PI / 2.0 };
    let end_angle = start_angle + g.sense * g.theta;
    // Straight leads, then the bend itself.
    shapes.push(Shape::Polygon {
        points: common::straight_band([-lead, 0.0], [0.0, 0.0], g.d_in),
        style: ShapeStyle::Wall,
    });
    let out = g.outlet_position();
    let dir = g.outlet_direction().vec();
    shapes.push(Shape::Polygon {
        points: common::straight_band(out.xy(), [out.x + dir.x * lead, out.y + dir.y * lead], g.d_out),
        style: ShapeStyle::Wall,
    });
    let (a0, a1) = if g.sense > 0.0 {
        (start_angle, end_angle)
    } else {
        (end_angle, start_angle)
    };
    let mean_d = 0.5 * (g.d_in + g.d_out);
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, g.radius, mean_d, a0, a1, 24),
        style: ShapeStyle::Fluid,
    });
    // Control volume: the arc band itself, cut at the two faces.
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, g.radius, mean_d * 1.25, a0, a1, 24),
        style: ShapeStyle::ControlVolume,
    });
    // Centre line.
    let mut line = vec![[-lead, 0.0]];
    for s in 0..=24 {
        let a = start_angle + g.sense * g.theta * s as f64 / 24.0;
        line.push([center[0] + g.radius * a.cos(), center[1] + g.radius * a.sin()]);
    }
    line.push([out.x + dir.x * lead, out.y + dir.y * lead]);
    shapes.push(Shape::Polyline {
        points: line,
        style: ShapeStyle::Guide,
    });

    // Forces: scale the largest in-plane force to 1.5 × the bend radius.
    let thrust = balance.thrust();
    let forces = balance
        .ports
        .iter()
        .map(|p| p.pressure_force.norm())
        .chain([thrust.norm()]);
    let max_force = forces.fold(0.0, f64::max);
    let scale = if max_force > 0.0 {
        1.5 * g.radius.max(lead) / max_force
    } else {
        0.0
    };
    let fmt = |f: Vec3| report.fmt((f.x * f.x + f.y * f.y).sqrt(), Q::Force);
    for p in &balance.ports {
        if let Some(a) = common::force_arrow(
            p.position.xy(),
            p.pressure_force,
            scale,
            format!("p·A {}", fmt(p.pressure_force)),
            ShapeStyle::Pressure,
            false,
        ) {
            shapes.push(a);
        }
    }
    let c = g.centroid().xy();
    common::thrust_and_restraint_arrows(&mut shapes, c, c, thrust, scale, &fmt(thrust));
    shapes.push(Shape::Text {
        at: [-lead, -g.d_in],
        text: "inlet".to_string(),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.3 * lead);
    let plane = if (balance.fluid_weight.z).abs() > 0.0 {
        "plan view"
    } else {
        "elevation"
    };
    Diagram {
        title: format!("Bend, {plane}: control volume and forces"),
        bounds,
        shapes,
        caption:
            "Pipe and bend to scale; force arrows scaled to the largest force, in-plane components only. T acts on \
                the supports; R = −T is what the restraint supplies."
                .to_string(),
    }
}
