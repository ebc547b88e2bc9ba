//! The nozzle's diagram: pipe, flanges, nozzle and jet to scale, with the control
//! volume and the forces on it.

use crate::catalog::{Diagram, Report, Shape, ShapeStyle};
use crate::units::QuantityKind as Q;
use crate::vector::Vec3;

use super::super::common;
use super::model::{Inputs, Nozzle};

/// The nozzle, its flanges and the jet to scale, the control volume and the force
/// arrows on one scale.
pub fn diagram(inputs: &Inputs, nozzle: &Nozzle, report: &Report<'_>) -> Diagram {
    let (d_pipe, d_nozzle) = (inputs.d_pipe.value, inputs.d_nozzle.value);
    let (d_jet, length, vena) = (nozzle.d_jet, nozzle.length, nozzle.vena);
    let balance = &nozzle.balance;
    let lead = 2.0 * d_pipe;
    let wall = 0.08 * d_pipe;
    let flange = 1.7 * d_pipe;
    let t = 0.15 * d_pipe;
    let r1 = d_pipe / 2.0;
    let rn = d_nozzle / 2.0;
    let cone = |grow: f64| {
        vec![
            [-lead, r1 + grow],
            [0.0, r1 + grow],
            [length, rn + grow],
            [length, -rn - grow],
            [0.0, -r1 - grow],
            [-lead, -r1 - grow],
        ]
    };
    let mut shapes = vec![
        Shape::Polygon {
            points: cone(wall),
            style: ShapeStyle::Wall,
        },
        Shape::Polygon {
            points: cone(0.0),
            style: ShapeStyle::Fluid,
        },
        // Pipe flange and nozzle flange, bolted together at x = 0.
        Shape::Polygon {
            points: common::straight_band([-t, 0.0], [0.0, 0.0], flange),
            style: ShapeStyle::Wall,
        },
        Shape::Polygon {
            points: common::straight_band([0.0, 0.0], [t, 0.0], flange),
            style: ShapeStyle::Wall,
        },
        // The free jet, narrowing to the vena contracta.
        Shape::Polygon {
            points: vec![
                [length, rn],
                [vena, d_jet / 2.0],
                [vena + 2.0 * d_pipe, d_jet / 2.0],
                [vena + 2.0 * d_pipe, -d_jet / 2.0],
                [vena, -d_jet / 2.0],
                [length, -rn],
            ],
            style: ShapeStyle::Flow,
        },
        // Control volume: the nozzle's fluid from the flange face to the vena contracta.
        Shape::Polygon {
            points: vec![
                [0.0, 1.15 * r1],
                [length, 1.3 * rn],
                [vena, 1.3 * d_jet / 2.0],
                [vena, -1.3 * d_jet / 2.0],
                [length, -1.3 * rn],
                [0.0, -1.15 * r1],
            ],
            style: ShapeStyle::ControlVolume,
        },
        Shape::Polyline {
            points: vec![[-lead, 0.0], [vena + 2.0 * d_pipe, 0.0]],
            style: ShapeStyle::Guide,
        },
    ];
    let thrust = balance.thrust();
    let flux = balance
        .ports
        .get(nozzle.jet_port)
        .map(|p| p.momentum_outflow)
        .unwrap_or(Vec3::ZERO);
    let max_force = balance
        .ports
        .iter()
        .map(|p| p.pressure_force.norm())
        .chain([thrust.norm(), flux.norm()])
        .fold(0.0, f64::max);
    let scale = if max_force > 0.0 { 1.2 * lead / max_force } else { 0.0 };
    let fmt = |f: Vec3| report.fmt(f.norm(), Q::Force);
    if let Some(face) = balance.ports.get(nozzle.flange_port) {
        if let Some(a) = common::force_arrow(
            [0.0, 0.0],
            face.pressure_force,
            scale,
            format!("p₁A₁ {}", fmt(face.pressure_force)),
            ShapeStyle::Pressure,
            false,
        ) {
            shapes.push(a);
        }
    }
    if let Some(a) = common::force_arrow(
        [vena, 0.0],
        flux,
        scale,
        format!("ṁV_j {}", fmt(flux)),
        ShapeStyle::Momentum,
        true,
    ) {
        shapes.push(a);
    }
    let above = 0.5 * flange + 0.3 * d_pipe;
    if let Some(a) = common::force_arrow(
        [t, above],
        thrust,
        scale,
        format!("end force T {}", fmt(thrust)),
        ShapeStyle::Thrust,
        true,
    ) {
        shapes.push(a);
    }
    if let Some(a) = common::force_arrow(
        [-t, -above],
        balance.support_force,
        scale,
        format!("joint on nozzle R {}", fmt(balance.support_force)),
        ShapeStyle::Restraint,
        true,
    ) {
        shapes.push(a);
    }
    shapes.push(Shape::Text {
        at: [-lead, -flange / 2.0 - 0.2 * d_pipe],
        text: "pipe".to_string(),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.3 * d_pipe);
    Diagram {
        title: "Nozzle on a flange: control volume and forces".to_string(),
        bounds,
        shapes,
        caption: "Pipe, flanges, nozzle and jet to scale (nozzle length drawn as 1.5 pipe diameters); force arrows \
                share one scale. T is the nozzle's pull on the joint over the bore; R = −T is what the joint \
                supplies."
            .to_string(),
    }
}
