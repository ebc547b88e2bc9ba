//! The surge diagram: a schematic plan of the line from the reflecting boundary
//! (a reservoir) to the closing valve, with a dog-leg whose straight run between
//! two elbows carries the water-hammer load, the pressure front travelling back up
//! the line and the force on the run. Not to scale.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::QuantityKind as Q;

use super::model::Solved;
use crate::calculators::common;

const CAPTION: &str = "Schematic plan, not to scale (a line is hundreds of diameters long). The front leaves the \
    closing valve at speed a; while it lies between the two elbows, the run carries the unbalanced force shown, \
    toward the elbow the front reached first.";

/// The schematic at the solved state.
pub fn draw(solved: &Solved, report: &Report<'_>) -> Diagram {
    let d = 0.4;
    let mut shapes = Vec::new();
    // Reservoir: the reflecting boundary.
    shapes.push(Shape::Polygon {
        points: vec![[-3.0, -1.5], [0.0, -1.5], [0.0, 2.0], [-3.0, 2.0]],
        style: ShapeStyle::Fluid,
    });
    shapes.push(Shape::Text {
        at: [-3.0, 2.4],
        text: "reservoir (reflecting boundary)".to_string(),
        style: ShapeStyle::Label,
    });
    // The line: reservoir → elbow 1 → run → elbow 2 → valve.
    let e1 = [4.0, 0.0];
    let e2 = [4.0, -4.0];
    let valve = [10.0, -4.0];
    for (a, b) in [([0.0, 0.0], e1), (e1, e2), (e2, valve)] {
        shapes.push(Shape::Polygon {
            points: common::straight_band(a, b, d),
            style: ShapeStyle::Wall,
        });
    }
    for (at, text) in [(e1, "elbow 1"), (e2, "elbow 2")] {
        shapes.push(Shape::Text {
            at: [at[0] + 0.5, at[1] + 0.3],
            text: text.to_string(),
            style: ShapeStyle::Label,
        });
    }
    // The valve: a bow tie across the pipe.
    shapes.push(Shape::Polygon {
        points: vec![
            [valve[0] - 0.5, valve[1] - 0.5],
            [valve[0] + 0.5, valve[1] + 0.5],
            [valve[0] + 0.5, valve[1] - 0.5],
            [valve[0] - 0.5, valve[1] + 0.5],
        ],
        style: ShapeStyle::Wall,
    });
    shapes.push(Shape::Text {
        at: [valve[0] - 1.0, valve[1] - 1.2],
        text: format!("closing valve, Δp {}", report.fmt(solved.surge, Q::Pressure)),
        style: ShapeStyle::Label,
    });
    // The pressure front on the last leg, moving up the line.
    let front_x = 7.0;
    shapes.push(Shape::Polyline {
        points: vec![[front_x, -4.0 - 0.8], [front_x, -4.0 + 0.8]],
        style: ShapeStyle::Pressure,
    });
    shapes.push(Shape::Arrow {
        from: [front_x, -3.0],
        to: [front_x - 1.8, -3.0],
        label: format!("front, a = {}", report.fmt(solved.wave_speed, Q::Velocity)),
        style: ShapeStyle::Pressure,
    });
    // The force on the run, toward elbow 2 (reached first).
    shapes.push(Shape::Arrow {
        from: [4.9, -1.0],
        to: [4.9, -3.0],
        label: format!(
            "{} for {}",
            report.fmt(solved.run.peak, Q::Force),
            report.fmt(solved.run.transit, Q::Time)
        ),
        style: ShapeStyle::Thrust,
    });
    // The force on the closed valve, along the flow.
    shapes.push(Shape::Arrow {
        from: [valve[0] + 0.6, valve[1]],
        to: [valve[0] + 2.4, valve[1]],
        label: format!("(p + Δp)·A {}", report.fmt(solved.thrust_total, Q::Force)),
        style: ShapeStyle::Thrust,
    });
    Diagram {
        title: "Line from the reflecting boundary to the closing valve".to_string(),
        bounds: [-3.5, -6.0, 13.5, 3.0],
        shapes,
        caption: CAPTION.to_string(),
    }
}
