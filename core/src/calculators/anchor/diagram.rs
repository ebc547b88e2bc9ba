//! The anchor's two orthographic views in one drawing, to scale: a plan (x east, y
//! north) and beside it an elevation looking north (x east, z up), each with the runs, what lies at their far
//! ends, the anchor and the force on it projected into the view.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::QuantityKind as Q;
use crate::vector::Vec3;

use super::super::common;
use super::model::{End, Inputs, Solved};

/// One orthographic view: how a point of the anchor's axes lands on the drawing.
#[derive(Clone, Copy)]
struct View {
    title: &'static str,
    caption: &'static str,
    project: fn(Vec3) -> [f64; 2],
}

const PLAN: View = View {
    title: "Plan (x east, y north)",
    caption: "Plan (left), to scale: pipes at their outside diameter, sloped runs foreshortened; its arrow is \
        the horizontal force on the anchor, not to the length scale.",
    project: |v| [v.x, v.y],
};

const ELEVATION: View = View {
    title: "Elevation looking north (x east, z up)",
    caption: "Elevation looking north (right), same scale: its arrow is the east and vertical force.",
    project: |v| [v.x, v.z],
};

const CAPTION: &str = "To scale: plan (left) and elevation looking north (right), pipes at their outside \
    diameter; each arrow is the force on the anchor in its view, not to the length scale.";

/// Both views of the solved anchor, side by side in one drawing: the plan on the
/// left, the elevation to its right on the same scale.
pub fn views(inputs: &Inputs, solved: &Solved, report: &Report<'_>) -> Vec<Diagram> {
    let plan = draw(PLAN, inputs, solved, report);
    let elevation = draw(ELEVATION, inputs, solved, report);
    let gap = 0.1 * (plan.bounds[2] - plan.bounds[0]).max(elevation.bounds[2] - elevation.bounds[0]);
    let dx = plan.bounds[2] - elevation.bounds[0] + gap;
    let mut shapes = plan.shapes;
    let top = plan.bounds[3].max(elevation.bounds[3]);
    shapes.push(Shape::Text {
        at: [plan.bounds[0], top],
        text: PLAN.title.to_string(),
        style: ShapeStyle::Label,
    });
    shapes.push(Shape::Text {
        at: [elevation.bounds[0] + dx, top],
        text: ELEVATION.title.to_string(),
        style: ShapeStyle::Label,
    });
    shapes.extend(elevation.shapes.into_iter().map(|shape| shifted(shape, dx)));
    let bounds = [
        plan.bounds[0],
        plan.bounds[1].min(elevation.bounds[1]),
        elevation.bounds[2] + dx,
        top + 0.05 * (top - plan.bounds[1].min(elevation.bounds[1])),
    ];
    vec![Diagram {
        title: "Plan and elevation of the anchor".to_string(),
        bounds,
        shapes,
        caption: CAPTION.to_string(),
    }]
}

/// A shape moved `dx` to the right.
fn shifted(shape: Shape, dx: f64) -> Shape {
    let move_point = |p: [f64; 2]| [p[0] + dx, p[1]];
    match shape {
        Shape::Polygon { points, style } => Shape::Polygon {
            points: points.into_iter().map(move_point).collect(),
            style,
        },
        Shape::Polyline { points, style } => Shape::Polyline {
            points: points.into_iter().map(move_point).collect(),
            style,
        },
        Shape::Circle { center, radius, style } => Shape::Circle {
            center: move_point(center),
            radius,
            style,
        },
        Shape::Arrow { from, to, label, style } => Shape::Arrow {
            from: move_point(from),
            to: move_point(to),
            label,
            style,
        },
        Shape::Text { at, text, style } => Shape::Text {
            at: move_point(at),
            text,
            style,
        },
    }
}

fn draw(view: View, inputs: &Inputs, solved: &Solved, report: &Report<'_>) -> Diagram {
    let project = view.project;
    let largest_od = inputs.runs.iter().map(|r| r.od.value).fold(0.0, f64::max);
    let longest = inputs.runs.iter().map(|r| r.length.value).fold(0.0, f64::max);
    let mut shapes = Vec::new();
    for (i, (run, state)) in inputs.runs.iter().zip(&solved.runs).enumerate() {
        let od = run.od.value;
        let end = state.direction * run.length.value;
        let (a, b) = ([0.0, 0.0], project(end));
        let drawn = (b[0] * b[0] + b[1] * b[1]).sqrt();
        if drawn > 0.5 * od {
            shapes.push(Shape::Polygon {
                points: common::straight_band(a, b, od),
                style: ShapeStyle::Wall,
            });
            shapes.push(Shape::Polygon {
                points: common::straight_band(a, b, run.d.value),
                style: ShapeStyle::Fluid,
            });
        } else {
            // Seen end-on: the pipe's section.
            shapes.push(Shape::Circle {
                center: b,
                radius: od / 2.0,
                style: ShapeStyle::Wall,
            });
        }
        let along = if drawn > 1e-12 {
            [b[0] / drawn, b[1] / drawn]
        } else {
            [1.0, 0.0]
        };
        let across = [-along[1], along[0]];
        let at = |s: f64, n: f64| [b[0] + s * along[0] + n * across[0], b[1] + s * along[1] + n * across[1]];
        match run.end {
            End::Elbow => shapes.push(Shape::Circle {
                center: b,
                radius: 0.6 * od,
                style: ShapeStyle::Wall,
            }),
            End::Closed => shapes.push(Shape::Polyline {
                points: vec![at(0.0, -0.7 * od), at(0.0, 0.7 * od)],
                style: ShapeStyle::Wall,
            }),
            End::Bellows { .. } => {
                let points = (0..=8)
                    .map(|k| {
                        let n = if k % 2 == 0 { 0.75 * od } else { -0.75 * od };
                        at(-(k as f64) * 0.15 * od, n)
                    })
                    .collect();
                shapes.push(Shape::Polyline {
                    points,
                    style: ShapeStyle::Wall,
                });
            }
            End::Support { .. } => shapes.push(Shape::Polygon {
                points: vec![
                    [b[0], b[1] - 0.5 * od],
                    [b[0] - 0.5 * od, b[1] - 1.3 * od],
                    [b[0] + 0.5 * od, b[1] - 1.3 * od],
                ],
                style: ShapeStyle::Restraint,
            }),
        }
        shapes.push(Shape::Text {
            at: at(0.0, 1.6 * od),
            text: format!("{}: {}", i + 1, run.end.name()),
            style: ShapeStyle::Label,
        });
    }
    let half = 0.75 * largest_od;
    shapes.push(Shape::Polygon {
        points: vec![[-half, -half], [half, -half], [half, half], [-half, half]],
        style: ShapeStyle::Restraint,
    });
    let (force, _) = super::report::anchor_load(solved);
    let p = project(force);
    let shown = Vec3::new(p[0], p[1], 0.0);
    if shown.norm() > 0.0 {
        let scale = 0.4 * longest.max(largest_od) / shown.norm();
        if let Some(arrow) = common::force_arrow(
            [0.0, 0.0],
            shown,
            scale,
            format!("F {}", report.fmt(shown.norm(), Q::Force)),
            ShapeStyle::Thrust,
            true,
        ) {
            shapes.push(arrow);
        }
    }
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 2.0 * largest_od);
    Diagram {
        title: view.title.to_string(),
        bounds,
        shapes,
        caption: view.caption.to_string(),
    }
}
