//! The restrained-joint diagram: the fitting and its pipes in plan (or in
//! elevation for a vertical bend), the restrained zone of each leg to scale with
//! its length, and the thrust.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::restraint::{FittingKind, Plane};
use crate::units::QuantityKind as Q;

use super::super::common;
use super::model::{Inputs, Solved};

/// One pipe leg from the fitting: its direction, outside diameter and restrained
/// length (m; zero when not restrained).
struct Leg {
    dir: [f64; 2],
    od: f64,
    restrained: f64,
}

pub fn diagram(inputs: &Inputs, solved: &Solved, report: &Report<'_>) -> Diagram {
    let g = solved.governing();
    let od = inputs.main.od;
    let od2 = inputs.second.map_or(od, |d| d.od);
    let unit = |a: f64| [a.cos(), a.sin()];
    let legs = match inputs.kind {
        FittingKind::Bend => {
            let a_in = solved.fit.inlet_angle();
            let a_out = a_in + inputs.plane.turn() * inputs.angle.value;
            vec![
                Leg {
                    dir: [-a_in.cos(), -a_in.sin()],
                    od,
                    restrained: g.length,
                },
                Leg {
                    dir: unit(a_out),
                    od,
                    restrained: g.length,
                },
            ]
        }
        FittingKind::DeadEnd => vec![Leg {
            dir: [-1.0, 0.0],
            od,
            restrained: g.length,
        }],
        FittingKind::Reducer => vec![
            Leg {
                dir: [-1.0, 0.0],
                od,
                restrained: g.length,
            },
            Leg {
                dir: [1.0, 0.0],
                od: od2,
                restrained: 0.0,
            },
        ],
        FittingKind::Tee => vec![
            Leg {
                dir: [-1.0, 0.0],
                od,
                restrained: solved.run_credit,
            },
            Leg {
                dir: [1.0, 0.0],
                od,
                restrained: solved.run_credit,
            },
            Leg {
                dir: [0.0, 1.0],
                od: od2,
                restrained: g.length,
            },
        ],
    };
    let longest = legs.iter().map(|l| l.restrained).fold(0.0, f64::max);
    let lead = (0.25 * longest).max(6.0 * od);
    let mut shapes = Vec::new();
    for leg in &legs {
        let [ux, uy] = leg.dir;
        let end = leg.restrained + lead;
        if leg.restrained > 0.0 {
            shapes.push(Shape::Polygon {
                points: common::straight_band([0.0, 0.0], [ux * leg.restrained, uy * leg.restrained], 2.4 * leg.od),
                style: ShapeStyle::Restraint,
            });
            let (nx, ny) = (-uy, ux);
            let off = 2.0 * leg.od + 0.02 * longest;
            shapes.push(Shape::Text {
                at: [
                    ux * 0.5 * leg.restrained + nx * off,
                    uy * 0.5 * leg.restrained + ny * off,
                ],
                text: format!("restrained {}", report.fmt(leg.restrained, Q::Length)),
                style: ShapeStyle::Label,
            });
        }
        shapes.push(Shape::Polygon {
            points: common::straight_band([0.0, 0.0], [ux * end, uy * end], leg.od),
            style: ShapeStyle::Wall,
        });
    }
    let thrust = solved.balance.thrust();
    let (tx, ty) = (thrust.x, thrust.y);
    let tn = tx.hypot(ty);
    let (ux, uy) = if tn > 0.0 { (tx / tn, ty / tn) } else { (1.0, 0.0) };
    let arrow = (0.3 * longest).max(4.0 * od);
    shapes.push(Shape::Arrow {
        from: [0.0, 0.0],
        to: [ux * arrow, uy * arrow],
        label: format!("T {}", report.fmt(solved.thrust, Q::Force)),
        style: ShapeStyle::Thrust,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.05 * (longest + lead));
    let view = match (inputs.kind, inputs.plane) {
        (FittingKind::Bend, Plane::Crest | Plane::Sag) => "elevation",
        _ => "plan",
    };
    Diagram {
        title: format!("Restrained zones, {view}"),
        bounds,
        shapes,
        caption: "Pipes and restrained lengths to scale (the restrained band drawn wider than the pipe).".to_string(),
    }
}
