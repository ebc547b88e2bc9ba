//! The runner's diagram: the two velocity triangles in velocity space.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::QuantityKind as Q;

use super::model::Triangle;
use crate::calculators::common;

/// The two triangles in velocity space, the inlet above the outlet (stacked, so that
/// each gets the full width of a phone screen), their origins aligned.
pub fn draw(t1: &Triangle, t2: &Triangle, report: &Report<'_>) -> Diagram {
    let mut shapes = Vec::new();
    let fmt = |v: f64| report.fmt(v, Q::Velocity);
    let biggest = [t1.u, t2.u, t1.v(), t2.v(), t1.w(), t2.w()]
        .into_iter()
        .fold(0.0, f64::max)
        .max(1e-9);
    let gap = 0.1 * biggest;
    // Each triangle occupies from its base line − 1.3 gap (swirl arrow) less a line
    // for its label, to its apex + 0.12 × the largest velocity (its title).
    let base2 = -(1.3 * gap + 0.12 * biggest + t2.vm.max(0.0) + 0.17 * biggest);
    for (t, yb, n) in [(t1, 0.0, "1"), (t2, base2, "2")] {
        let o = [0.0, yb];
        let u_tip = [t.u, yb];
        let v_tip = [t.vtheta, yb + t.vm];
        shapes.push(Shape::Arrow {
            from: o,
            to: u_tip,
            label: String::new(),
            style: ShapeStyle::Velocity,
        });
        // V and W unlabelled at their shared tip; their labels (and u's) sit beside
        // the middle of each side, away from the triangle, so they do not pile up.
        shapes.push(Shape::Arrow {
            from: o,
            to: v_tip,
            label: String::new(),
            style: ShapeStyle::Momentum,
        });
        shapes.push(Shape::Arrow {
            from: u_tip,
            to: v_tip,
            label: String::new(),
            style: ShapeStyle::Flow,
        });
        let centroid = [(o[0] + u_tip[0] + v_tip[0]) / 3.0, (o[1] + u_tip[1] + v_tip[1]) / 3.0];
        let beside = |a: [f64; 2], b: [f64; 2], away: f64| {
            let m = [(a[0] + b[0]) / 2.0, (a[1] + b[1]) / 2.0];
            let (dx, dy) = (m[0] - centroid[0], m[1] - centroid[1]);
            let len = dx.hypot(dy);
            if len > 1e-12 * biggest {
                [m[0] + away * dx / len, m[1] + away * dy / len]
            } else {
                [m[0], m[1] + away]
            }
        };
        shapes.push(Shape::Text {
            at: [0.5 * t.u, yb - 0.45 * gap],
            text: format!("u{n}"),
            style: ShapeStyle::Label,
        });
        shapes.push(Shape::Text {
            at: beside(o, v_tip, 0.08 * biggest),
            text: format!("V{n}"),
            style: ShapeStyle::Label,
        });
        shapes.push(Shape::Text {
            at: beside(u_tip, v_tip, 0.08 * biggest),
            text: format!("W{n}"),
            style: ShapeStyle::Label,
        });
        // Swirl below the blade-speed line, with a guide from the apex.
        shapes.push(Shape::Polyline {
            points: vec![v_tip, [v_tip[0], yb - 1.3 * gap]],
            style: ShapeStyle::Guide,
        });
        if t.vtheta.abs() > 1e-9 * biggest {
            shapes.push(Shape::Arrow {
                from: [0.0, yb - 1.3 * gap],
                to: [v_tip[0], yb - 1.3 * gap],
                label: format!("Vθ{n} {}", fmt(t.vtheta)),
                style: ShapeStyle::Velocity,
            });
        } else {
            shapes.push(Shape::Text {
                at: [0.0, yb - 1.3 * gap],
                text: format!("Vθ{n} = 0"),
                style: ShapeStyle::Label,
            });
        }
        let place = if n == "1" { "inlet (1)" } else { "outlet (2)" };
        let left = t.vtheta.min(0.0);
        let right = t.u.max(t.vtheta).max(0.0);
        shapes.push(Shape::Text {
            at: [0.5 * (left + right), yb + t.vm.max(0.0) + 0.12 * biggest],
            text: place.to_string(),
            style: ShapeStyle::Label,
        });
    }
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.1 * biggest);
    Diagram {
        title: "Velocity triangles, inlet above outlet".to_string(),
        bounds,
        shapes,
        caption: format!(
            "Drawn in velocity space, not runner geometry: both triangles to one velocity scale, x along the blade \
                motion u, y the meridional (through-flow) component V_m. V = u + W, with V the absolute velocity \
                (momentum-flux colour: the flux is ṁV) and W the velocity relative to the blades (flow colour); the \
                swirl V_θ, below each triangle, is the projection of V on u. Magnitudes are in the table above; \
                largest velocity shown: {}.",
            fmt(biggest)
        ),
    }
}
