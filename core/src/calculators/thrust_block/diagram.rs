//! The thrust-restraint diagram: the fitting (outside diameter, to scale), the
//! thrust and the block that carries it (a bearing face in plan, a block under a
//! sag bend, or a gravity block in elevation). Shared with the line schedule.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::restraint::block::Block;
use crate::restraint::Plane;
use crate::units::QuantityKind as Q;
use crate::vector::Vec3;

use super::super::common;

#[allow(clippy::too_many_arguments)]
pub fn diagram(
    fitting: &str,
    plane: Plane,
    od: f64,
    od2: Option<f64>,
    (inlet_angle, angle): (f64, f64),
    submerged: bool,
    thrust: Vec3,
    block: &Block,
    report: &Report<'_>,
) -> Diagram {
    let mut shapes = Vec::new();
    let lead = 3.0 * od;
    let turn = plane.turn();
    // The pipe: legs meeting at the origin, to scale (outside diameter).
    let legs: Vec<([f64; 2], [f64; 2], f64)> = match fitting {
        "bend" => {
            let a = inlet_angle + turn * angle;
            vec![
                ([-lead * inlet_angle.cos(), -lead * inlet_angle.sin()], [0.0, 0.0], od),
                ([0.0, 0.0], [lead * a.cos(), lead * a.sin()], od),
            ]
        }
        "tee" => vec![
            ([-lead, 0.0], [lead, 0.0], od),
            ([0.0, 0.0], [0.0, turn * lead], od2.unwrap_or(od)),
        ],
        "reducer" => vec![
            ([-lead, 0.0], [0.0, 0.0], od),
            ([0.0, 0.0], [lead, 0.0], od2.unwrap_or(od)),
        ],
        "dead_end" => vec![([-lead, 0.0], [0.0, 0.0], od)],
        _ => vec![],
    };
    for (a, b, d) in &legs {
        shapes.push(Shape::Polygon {
            points: common::straight_band(*a, *b, *d),
            style: ShapeStyle::Wall,
        });
    }
    // Thrust direction in the drawing plane.
    let (tx, ty) = match plane {
        Plane::Horizontal if thrust.x.abs() + thrust.y.abs() > 0.0 => (thrust.x, thrust.y),
        Plane::Horizontal => (1.0, 0.0),
        _ => (thrust.x, thrust.y),
    };
    let tn = (tx * tx + ty * ty).sqrt();
    let (ux, uy) = if tn > 0.0 { (tx / tn, ty / tn) } else { (1.0, 0.0) };
    let (nx, ny) = (-uy, ux);
    let caption;
    let title;
    let mut arrow_end = [ux * 3.0 * od.max(0.2), uy * 3.0 * od.max(0.2)];
    match block {
        Block::Bearing { w, h, .. } => {
            // Plan (horizontal): the face width is seen; a sag block is drawn in
            // elevation, its base under the fitting.
            let depth = (0.5 * w).max(0.5 * od).max(0.3);
            let near = 0.5 * od;
            let far = near + depth;
            let half = 0.5 * w;
            let p = |s: f64, t: f64| [s * ux + t * nx, s * uy + t * ny];
            shapes.push(Shape::Polygon {
                points: vec![p(near, -half), p(far, -half), p(far, half), p(near, half)],
                style: ShapeStyle::Restraint,
            });
            shapes.push(Shape::Polyline {
                points: vec![p(far + 0.05 * depth, -half * 1.3), p(far + 0.05 * depth, half * 1.3)],
                style: ShapeStyle::Guide,
            });
            shapes.push(Shape::Text {
                at: p(far + 0.8 * depth, -0.9 * half),
                text: "undisturbed soil".into(),
                style: ShapeStyle::Label,
            });
            let label_w = report.fmt(*w, Q::Length);
            let label_h = report.fmt(*h, Q::Length);
            shapes.push(Shape::Text {
                at: p(0.5 * (near + far), half + 0.2 * depth),
                text: format!("face {label_w} × {label_h} (w × h)"),
                style: ShapeStyle::Label,
            });
            // Bearing pressure arrows on the face, pointing back at the block.
            for k in [-0.6, 0.0, 0.6] {
                shapes.push(Shape::Arrow {
                    from: p(far + 0.6 * depth, k * half),
                    to: p(far, k * half),
                    label: String::new(),
                    style: ShapeStyle::Pressure,
                });
            }
            arrow_end = p(near + 0.55 * depth, 0.0);
            title = if plane == Plane::Horizontal {
                "Bearing block, plan view"
            } else {
                "Block under a sag bend, elevation"
            }
            .to_string();
            caption =
                "Pipe (outside diameter) and the bearing face width to scale; the block's depth behind the face is \
                    schematic (a sag block is drawn square to the resultant). T is the thrust on the block; the soil \
                    pushes back on the face."
                    .to_string();
        }
        Block::Gravity { volume, side, height } => {
            // Elevation: the block under the crest fitting, hanging from it.
            let top = -0.5 * od;
            let half = 0.5 * side;
            shapes.push(Shape::Polygon {
                points: vec![[-half, top], [half, top], [half, top - height], [-half, top - height]],
                style: ShapeStyle::Restraint,
            });
            let weight_arrow_len = 0.6 * height;
            shapes.push(Shape::Arrow {
                from: [0.0, top - 0.5 * height],
                to: [0.0, top - 0.5 * height - weight_arrow_len],
                label: "W (block)".into(),
                style: ShapeStyle::Weight,
            });
            shapes.push(Shape::Text {
                at: [half + 0.1, top - 0.5 * height],
                text: format!("{} of concrete", report.fmt(*volume, Q::Volume)),
                style: ShapeStyle::Label,
            });
            if submerged {
                shapes.push(Shape::Polyline {
                    points: vec![[-half * 1.5, top + 0.2], [half * 1.5, top + 0.2]],
                    style: ShapeStyle::Fluid,
                });
                shapes.push(Shape::Text {
                    at: [half * 1.5, top + 0.25],
                    text: "groundwater".into(),
                    style: ShapeStyle::Label,
                });
            }
            title = "Gravity block under a crest bend, elevation".to_string();
            caption = "Pipe and block to scale (square plan, side shown); the block is tied to the fitting, and its \
                    effective weight holds the upward thrust."
                .to_string();
        }
    }
    shapes.push(Shape::Arrow {
        from: [0.0, 0.0],
        to: arrow_end,
        label: format!("T {}", report.fmt(thrust.norm(), Q::Force)),
        style: ShapeStyle::Thrust,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.5 * od.max(0.2));
    Diagram {
        title,
        bounds,
        shapes,
        caption,
    }
}
