//! The jet-plate diagram: jet, sheets and plate to scale with the jet diameter,
//! with the control volume, the flows and the force on the plate.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::{self, QuantityKind as Q};
use crate::vector::Vec3;

use super::super::common;
use super::model::{Inputs, Plate};

/// The jet, the sheets and the plate, the control volume, flows and forces.
pub fn diagram(inputs: &Inputs, plate: &Plate, report: &Report<'_>) -> Diagram {
    let (g, jet, balance, q_forward) = (&plate.geometry, &inputs.jet, &plate.balance, plate.q_forward);
    let d = jet.diameter.value;
    let (t, n) = (g.tangent, g.jet_side);
    let p = |v: Vec3| v.xy();
    let mut shapes = Vec::new();
    // Where the jet's edges meet the plate (clipped so that a shallow plate stays in view).
    let cot = (g.theta.cos() / g.theta.sin()).min(4.0);
    let half = d / 2.0;
    shapes.push(Shape::Polygon {
        points: vec![
            [-g.jet_length, half],
            [half * cot, half],
            [-half * cot, -half],
            [-g.jet_length, -half],
        ],
        style: ShapeStyle::Fluid,
    });
    // Sheets along the plate, thickness in proportion to their share (2-D picture).
    let share_forward = q_forward / jet.flow.value;
    let sheets = [(t, d * share_forward), (-t, d * (1.0 - share_forward))];
    for (dir, thickness) in sheets {
        let end = dir * g.sheet_length;
        shapes.push(Shape::Polygon {
            points: vec![[0.0, 0.0], p(end), p(end + n * thickness), p(n * thickness)],
            style: ShapeStyle::Fluid,
        });
    }
    // Nozzle: a short taper ending at the jet's cut.
    let x0 = -g.jet_length;
    shapes.push(Shape::Polygon {
        points: vec![
            [x0 - 1.2 * d, 1.1 * d],
            [x0, 0.6 * d],
            [x0, -0.6 * d],
            [x0 - 1.2 * d, -1.1 * d],
        ],
        style: ShapeStyle::Wall,
    });
    // The plate: behind its wetted face.
    let reach = g.sheet_length + 0.8 * d;
    let back = -n * (0.25 * d);
    shapes.push(Shape::Polygon {
        points: vec![p(t * reach), p(t * reach + back), p(-t * reach + back), p(-t * reach)],
        style: ShapeStyle::Wall,
    });
    // Control volume: around the wetted face, cutting the jet and both sheets.
    let m = 0.35 * d;
    let cv_points = vec![
        [x0 + 0.3 * d, half + m],
        [x0 + 0.3 * d, -half - m],
        p(t * g.sheet_length + n * (d * share_forward + m)),
        p(t * g.sheet_length + back * 2.0),
        p(-t * g.sheet_length + back * 2.0),
        p(-t * g.sheet_length + n * (d * (1.0 - share_forward) + m)),
    ];
    shapes.push(Shape::Polygon {
        points: common::convex_hull(cv_points),
        style: ShapeStyle::ControlVolume,
    });
    // Velocities.
    let v_text = report.fmt(jet.velocity.value, Q::Velocity);
    shapes.push(Shape::Arrow {
        from: [x0 + 0.5 * d, 1.4 * d],
        to: [x0 + 2.5 * d, 1.4 * d],
        label: format!("V = {v_text}"),
        style: ShapeStyle::Velocity,
    });
    let q_back = jet.flow.value - q_forward;
    for (dir, flow, name, thickness) in [
        (t, q_forward, "Q₁", d * share_forward),
        (-t, q_back, "Q₂", d * (1.0 - share_forward)),
    ] {
        let base = dir * (0.6 * g.sheet_length) + n * (thickness + 0.5 * d);
        shapes.push(Shape::Arrow {
            from: p(base),
            to: p(base + dir * d),
            label: format!(
                "{name} = {} ({} %)",
                report.fmt(flow, Q::VolumeFlow),
                units::format_significant(100.0 * flow / jet.flow.value, 3)
            ),
            style: ShapeStyle::Flow,
        });
    }
    // Forces at the impact point, behind the plate.
    let thrust = balance.thrust();
    let scale = if thrust.norm() > 0.0 {
        0.8 * g.sheet_length / thrust.norm()
    } else {
        0.0
    };
    // F from the plate's back face, away from the jet; R beside it, pushing back.
    if let Some(a) = common::force_arrow(
        p(back + t * (0.8 * d)),
        thrust,
        scale,
        format!("F on plate {}", report.fmt(thrust.norm(), Q::Force)),
        ShapeStyle::Thrust,
        true,
    ) {
        shapes.push(a);
    }
    if let Some(a) = common::force_arrow(
        p(back - t * (0.8 * d)),
        balance.support_force,
        scale,
        "support R = −F".to_string(),
        ShapeStyle::Restraint,
        false,
    ) {
        shapes.push(a);
    }
    shapes.push(Shape::Text {
        at: p(-t * reach - n * (0.8 * d)),
        text: format!("plate, θ = {}", report.fmt(g.theta, Q::Angle)),
        style: ShapeStyle::Label,
    });
    shapes.push(Shape::Text {
        at: [x0 - 1.2 * d, -1.6 * d],
        text: "nozzle".to_string(),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.6 * d);
    Diagram {
        title: "Jet on a flat plate: control volume, flows and force".to_string(),
        bounds,
        shapes,
        caption: "Jet and plate to scale with the jet diameter; distances along the jet and the plate are schematic. \
                The sheets along the plate are drawn with thicknesses in proportion to their flows, a 2-D picture of \
                a round jet's 3-D spread. The force arrow is the force on the plate (normal to it); the support \
                supplies the opposite."
            .to_string(),
    }
}
