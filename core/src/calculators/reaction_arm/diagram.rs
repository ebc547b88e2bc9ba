//! The reaction arm's diagram: plan view of the rotating control volume, the arms
//! and the velocity triangle at the first nozzle.

use std::f64::consts::PI;

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::QuantityKind as Q;
use crate::vector::Vec3;

use super::model::{Arm, State};
use crate::calculators::common;

const CAPTION: &str = "Arm radius to scale (arm width and nozzles drawn wider than life); the arm turns \
    counter-clockwise, its jets point back against the rotation. Velocity arrows at the nozzles share one velocity \
    scale: W relative to the nozzle, u = ωR the nozzle's own speed, V = W + u the absolute jet velocity (drawn in the \
    momentum-flux colour: the flux is ṁV) whose tangential part sets the torque.";

/// The plan view at the state shown.
pub fn draw(arm: &Arm, state: &State, report: &Report<'_>) -> Diagram {
    let r = arm.radius;
    let mut shapes = Vec::new();
    let width = (2.5 * arm.nozzle_diameter).max(r / 25.0);
    let hub_radius = arm.hub_area.map(|a| (a / PI).sqrt()).unwrap_or(0.0).max(1.5 * width);
    for i in 0..arm.nozzles {
        let (at, _) = arm.nozzle(i);
        shapes.push(Shape::Polygon {
            points: common::straight_band([0.0, 0.0], at.xy(), width),
            style: ShapeStyle::Wall,
        });
    }
    shapes.push(Shape::Circle {
        center: [0.0, 0.0],
        radius: hub_radius,
        style: ShapeStyle::Wall,
    });
    shapes.push(Shape::Circle {
        center: [0.0, 0.0],
        radius: r,
        style: ShapeStyle::Guide,
    });
    shapes.push(Shape::Circle {
        center: [0.0, 0.0],
        radius: r + 1.5 * width,
        style: ShapeStyle::ControlVolume,
    });
    // Velocity arrows: the largest of W, ωR and V drawn 0.7 R long.
    let u = state.omega * r;
    let w_vec = |i: usize| arm.nozzle(i).1.vec() * state.jet;
    let biggest = [state.jet, u, (w_vec(0) + Vec3::new(0.0, u, 0.0)).norm()]
        .into_iter()
        .fold(0.0, f64::max);
    let scale = if biggest > 0.0 { 0.7 * r / biggest } else { 0.0 };
    let fmt = |v: f64| report.fmt(v, Q::Velocity);
    for i in 0..arm.nozzles {
        let (at, _) = arm.nozzle(i);
        let w = w_vec(i);
        let label = if i == 0 {
            format!("W {}", fmt(state.jet))
        } else {
            String::new()
        };
        if let Some(a) = common::force_arrow(at.xy(), w, scale, label, ShapeStyle::Flow, true) {
            shapes.push(a);
        }
    }
    let (at0, _) = arm.nozzle(0);
    let u_vec = Vec3::new(0.0, u, 0.0);
    if let Some(a) = common::force_arrow(
        at0.xy(),
        u_vec,
        scale,
        format!("u = ωR {}", fmt(u)),
        ShapeStyle::Velocity,
        true,
    ) {
        shapes.push(a);
    }
    let v = w_vec(0) + u_vec;
    if let Some(a) = common::force_arrow(
        at0.xy(),
        v,
        scale,
        format!("V = W + u {}", fmt(v.norm())),
        ShapeStyle::Momentum,
        true,
    ) {
        shapes.push(a);
    }
    // Sense of rotation: an arc at 0.45 R in the lower left (clear of the velocity
    // arrows at the first nozzle), ending in an arrow head.
    let arc_r = 0.45 * r;
    let arc: Vec<[f64; 2]> = (0..=16)
        .map(|s| {
            let a = 1.08 * PI + (0.3 * PI) * s as f64 / 16.0;
            [arc_r * a.cos(), arc_r * a.sin()]
        })
        .collect();
    let end = arc[arc.len() - 1];
    let before = arc[arc.len() - 2];
    shapes.push(Shape::Polyline {
        points: arc,
        style: ShapeStyle::Guide,
    });
    shapes.push(Shape::Arrow {
        from: before,
        to: end,
        label: "ω".to_string(),
        style: ShapeStyle::Guide,
    });
    // Speed and torque below the drawing, clear of arms and jets for any N.
    shapes.push(Shape::Text {
        at: [0.0, -1.3 * r],
        text: format!(
            "ω {} counter-clockwise, T {}",
            report.fmt(state.omega, Q::AngularSpeed),
            report.fmt(state.torque, Q::Torque)
        ),
        style: ShapeStyle::Label,
    });
    shapes.push(Shape::Text {
        at: [0.5 * r, -0.12 * r],
        text: format!("R {}", report.fmt(r, Q::Length)),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.15 * r);
    Diagram {
        title: "Reaction arm, plan view: rotating control volume and jet velocities".to_string(),
        bounds,
        shapes,
        caption: CAPTION.to_string(),
    }
}
