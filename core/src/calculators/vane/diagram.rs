//! The vane's diagram: nozzle, jet and vane to scale with the jet diameter, the
//! velocities at the exit and the force on the vane.

use std::f64::consts::PI;

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::QuantityKind as Q;
use crate::vector::Vec3;

use super::super::common::{self, Jet};
use super::model::{exit_point, Vane, VaneKind, VaneState};

/// The jet, the vane and its exit triangle, the control volume and the force.
pub fn diagram(jet: &Jet, vane: &Vane, mode: VaneKind, state: &VaneState, report: &Report<'_>) -> Diagram {
    let d = jet.diameter.value;
    let radius = 2.5 * d;
    let center = [0.0, radius];
    let (a0, a1) = (-PI / 2.0, -PI / 2.0 + vane.theta);
    let steps = 32;
    let exit = exit_point(vane, radius);
    let exit_dir = vane.exit_direction();
    let mut shapes = Vec::new();
    // Nozzle and jet.
    let lead = 4.0 * d;
    shapes.push(Shape::Polygon {
        points: vec![
            [-lead - 1.2 * d, 1.1 * d],
            [-lead, 0.6 * d],
            [-lead, -0.6 * d],
            [-lead - 1.2 * d, -1.1 * d],
        ],
        style: ShapeStyle::Wall,
    });
    shapes.push(Shape::Polygon {
        points: common::straight_band([-lead, 0.0], [0.0, 0.0], d),
        style: ShapeStyle::Fluid,
    });
    // Water on the vane and leaving it (sheet drawn at the jet's width).
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, radius, d, a0, a1, steps),
        style: ShapeStyle::Fluid,
    });
    let out_end = exit + exit_dir * (1.5 * d);
    shapes.push(Shape::Polygon {
        points: common::straight_band(exit.xy(), out_end.xy(), d),
        style: ShapeStyle::Fluid,
    });
    // The vane: on the outside of the turning sheet (the water presses outward).
    let thickness = 0.3 * d;
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, radius + 0.5 * d + 0.5 * thickness, thickness, a0, a1, steps),
        style: ShapeStyle::Wall,
    });
    // Control volume: around the vane, cutting the jet and the leaving sheet.
    let m = 0.4 * d;
    let mut cv_points = vec![[-d, 0.5 * d + m], [-d, -0.5 * d - m]];
    for i in 0..=steps {
        let a = a0 + (a1 - a0) * i as f64 / steps as f64;
        let r = radius + 0.5 * d + thickness + m;
        cv_points.push([center[0] + r * a.cos(), center[1] + r * a.sin()]);
    }
    let cut = exit + exit_dir * (0.8 * d);
    let across = Vec3::new(-exit_dir.y, exit_dir.x, 0.0) * (0.5 * d + m);
    cv_points.push((cut + across).xy());
    cv_points.push((cut - across).xy());
    shapes.push(Shape::Polygon {
        points: common::convex_hull(cv_points),
        style: ShapeStyle::ControlVolume,
    });
    // Velocities: the jet, the blade, and the exit triangle V₂ = W₂ + u.
    let v = jet.velocity.value;
    let scale = if v > 0.0 { 4.0 * d / v } else { 0.0 };
    let fmt_v = |x: f64| report.fmt(x, Q::Velocity);
    // The speeds of the jet and of the blade are named under their arrows, not at
    // their ends: a name at an end widens the drawing by its length, and on a
    // phone that shrank the drawing to a sketch between its names.
    let jet_arrow = [[-lead + 0.2 * d, -1.5 * d], [-lead + 0.2 * d + v * scale, -1.5 * d]];
    shapes.push(Shape::Arrow {
        from: jet_arrow[0],
        to: jet_arrow[1],
        label: String::new(),
        style: ShapeStyle::Velocity,
    });
    shapes.push(Shape::Text {
        at: [(jet_arrow[0][0] + jet_arrow[1][0]) / 2.0, -3.0 * d],
        text: format!("V = {}", fmt_v(v)),
        style: ShapeStyle::Velocity,
    });
    if mode != VaneKind::Fixed && state.u > 0.0 {
        let base = [radius + d, -1.5 * d];
        let tip = [base[0] + state.u * scale, base[1]];
        shapes.push(Shape::Arrow {
            from: base,
            to: tip,
            label: String::new(),
            style: ShapeStyle::Velocity,
        });
        shapes.push(Shape::Text {
            at: [(base[0] + tip[0]) / 2.0, -3.0 * d],
            text: format!("vane moves at u = {}", fmt_v(state.u)),
            style: ShapeStyle::Velocity,
        });
        // The exit velocity triangle, drawn beside the vane at twice the scale:
        // V₂ = W₂ + u.
        let big = 2.0 * scale;
        // Clear of the vane: a relative velocity leaving backwards (θ > 90°) points
        // left, so the triangle starts further right.
        let origin = Vec3::new(
            radius + 2.0 * d + (-state.w_out.x * big).max(0.0),
            2.0 * radius + 0.5 * d,
            0.0,
        );
        let tip_w = origin + state.w_out * big;
        let tip_v = tip_w + Vec3::new(state.u * big, 0.0, 0.0);
        // Its name above it, clear of its sides and of their names (which sit half
        // a jet diameter off the sides).
        let top = origin.y.max(tip_w.y).max(tip_v.y);
        let middle = (origin.x.min(tip_w.x).min(tip_v.x) + origin.x.max(tip_w.x).max(tip_v.x)) / 2.0;
        shapes.push(Shape::Text {
            at: [middle, top + 2.6 * d],
            text: "exit triangle (×2 scale)".to_string(),
            style: ShapeStyle::Label,
        });
        // Sides unlabelled; each name sits beside the middle of its side, outside the
        // triangle, so that the names do not pile up at the shared corners.
        let centroid = (origin + tip_w + tip_v) * (1.0 / 3.0);
        let sides = [
            (origin, tip_w, "W₂".to_string(), ShapeStyle::Flow),
            (tip_w, tip_v, "u".to_string(), ShapeStyle::Flow),
            (origin, tip_v, "V₂".to_string(), ShapeStyle::Velocity),
        ];
        for (from, to, label, style) in sides {
            if (to - from).norm() < 1e-9 {
                continue;
            }
            shapes.push(Shape::Arrow {
                from: from.xy(),
                to: to.xy(),
                label: String::new(),
                style,
            });
            let mid = (from + to) * 0.5;
            let along = to - from;
            let mut normal = Vec3::new(-along.y, along.x, 0.0) * (1.0 / along.norm());
            if normal.dot(mid - centroid) < 0.0 {
                normal = -normal;
            }
            shapes.push(Shape::Text {
                at: (mid + normal * (0.5 * d)).xy(),
                text: label,
                style: ShapeStyle::Label,
            });
        }
    } else {
        shapes.push(Shape::Arrow {
            from: exit.xy(),
            to: (exit + state.v_out * scale).xy(),
            label: format!("V₂ = {}", fmt_v(state.v_out.norm())),
            style: ShapeStyle::Velocity,
        });
    }
    // The force on the vane, from the back of the vane's middle.
    let mid = a0 + 0.5 * vane.theta;
    let r_back = radius + 0.5 * d + thickness;
    let back = [center[0] + r_back * mid.cos(), center[1] + r_back * mid.sin()];
    let force_scale = if state.force.norm() > 0.0 {
        2.0 * radius / state.force.norm()
    } else {
        0.0
    };
    if let Some(a) = common::force_arrow(
        back,
        state.force,
        force_scale,
        format!("F on vane {}", report.fmt(state.force.norm(), Q::Force)),
        ShapeStyle::Thrust,
        true,
    ) {
        shapes.push(a);
    }
    let name = match mode {
        VaneKind::Fixed => "fixed vane",
        VaneKind::Single => "single vane, moving",
        VaneKind::Wheel => "one bucket of the wheel",
    };
    // Under the nozzle and the jet's speed, where nothing else is drawn: a name
    // beside the nozzle widened the drawing by half its length, and on a phone
    // shrank everything else.
    shapes.push(Shape::Text {
        at: [-0.5 * lead - 0.6 * d, -4.6 * d],
        text: format!("{name}, θ = {}", report.fmt(vane.theta, Q::Angle)),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.6 * d);
    Diagram {
        title: "Jet on a vane: control volume, velocities and force".to_string(),
        bounds,
        shapes,
        caption: "Schematic: the jet and vane are drawn to scale with the jet diameter, the vane's radius is not. \
                Velocity arrows share one scale (the jet speed V), except the exit triangle beside the vane, drawn at \
                twice that scale: the relative velocity W₂ plus the blade speed u gives the absolute velocity V₂ of \
                the water leaving. The force arrow is the force of the water on the vane; the mounting or the shaft \
                supplies the opposite."
            .to_string(),
    }
}
