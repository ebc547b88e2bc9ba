//! Tank draining through an orifice: the unsteady mass balance of a vented tank.
//!
//! # Method
//! The control volume is the liquid in the tank; its only port is the orifice. The
//! Reynolds transport theorem for mass gives dm/dt = −ṁ, i.e.
//!
//! A_t·dh/dt = −C_d·a·V_j, with V_j from the quasi-steady energy balance between the
//! free surface and the vena contracta: V_j = √(2gh / (1 − (C_d·a/A_t)²)).
//!
//! Because V_j ∝ √h the equation separates and integrates in closed form:
//!
//! t = (2A_t / (C_d·a)) · √((1 − (C_d·a/A_t)²) / (2g)) · (√h₁ − √h₂)
//!
//! (Torricelli's law with a discharge coefficient and the velocity-of-approach
//! correction; e.g. White, *Fluid Mechanics*, and Munson et al., *Fundamentals of
//! Fluid Mechanics*, unsteady draining examples; Çengel & Cimbala, *Fluid Mechanics*,
//! the conservation-of-mass chapter.) The instantaneous mass balance at the start is
//! also evaluated through the engine's storage term and its residual reported.
//!
//! # Assumptions
//! Vertical-sided (prismatic) tank open to the atmosphere; orifice at the bottom
//! discharging to atmosphere; quasi-steady flow (the level falls slowly enough that
//! the steady energy balance holds at each instant); constant C_d (≈ 0.61 for a
//! sharp-edged orifice, common practice, no source; about 0.8 for a short tube and
//! 0.95–0.98 for a rounded nozzle).

use std::f64::consts::PI;

use crate::catalog::{
    CalculatorSpec, Diagram, FieldSpec, Limits, Marker, OutputSpec, Plot, Report, Series, Shape, ShapeStyle, Values,
};
use crate::engine::{self, si, ControlVolume, Port};
use crate::error::FieldError;
use crate::units::{QuantityKind as Q, STANDARD_GRAVITY};
use crate::vector::{Direction, Vec3};

use super::common::{self, quantity, MAX_SIZE_M};

pub const KEY: &str = "tank-drain";

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity("d_tank", "Tank inside diameter", Q::Length, "m", "ft", "3.2 m", Limits::positive(100.0), "Inside diameter of a vertical cylindrical tank."),
        quantity("d_orifice", "Orifice diameter", Q::Length, "mm", "in", "80 mm", Limits::positive(MAX_SIZE_M), "Diameter of the outlet hole or short nozzle in the tank bottom."),
        quantity("cd", "Discharge coefficient C_d", Q::Ratio, "-", "-", "0.61", Limits { min: 0.0, max: 1.0, min_inclusive: false }, "About 0.61 for a sharp-edged orifice, 0.8 for a short tube, 0.95 to 0.98 for a rounded nozzle (common practice)."),
        quantity("h_start", "Starting liquid level above the orifice", Q::Length, "m", "ft", "4.5 m", Limits::positive(1000.0), "Height of the free surface above the orifice at the start."),
        FieldSpec {
            optional: true,
            ..quantity("h_end", "Final liquid level", Q::Length, "m", "ft", "0.5 m", Limits::closed(0.0, 1000.0), "Level at which to stop; empty or 0 means drained to the orifice.")
        },
    ];
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: "Tank draining through an orifice",
        group: crate::catalog::group::FLOW_AND_TANKS,
        summary: "Time to lower a vented tank through a bottom orifice, from the unsteady mass balance.",
        fields,
        outputs: vec![
            OutputSpec { key: "time", label: "Time to drain between the levels", kind: Q::Time, headline: true },
            OutputSpec { key: "q_start", label: "Outflow at the start", kind: Q::VolumeFlow, headline: true },
            OutputSpec { key: "v_jet_start", label: "Jet velocity at the start", kind: Q::Velocity, headline: false },
            OutputSpec { key: "level_rate_start", label: "Rate of fall of the level at the start", kind: Q::Velocity, headline: false },
            OutputSpec { key: "volume", label: "Volume drained", kind: Q::Volume, headline: false },
            OutputSpec { key: "q_end", label: "Outflow at the final level", kind: Q::VolumeFlow, headline: false },
        ],
        cautions: vec![
            "Vent the tank: a tank that cannot draw air in as it drains is pulled into vacuum and can collapse.",
            "The discharge coefficient governs the answer; measure it or take it from a published source for your outlet.",
        ],
    }
}

struct Tank {
    area: f64,
    effective_orifice: f64,
    approach: f64,
}

impl Tank {
    /// Jet velocity at level `h`.
    fn jet_velocity(&self, h: f64) -> f64 {
        (2.0 * STANDARD_GRAVITY * h / self.approach).sqrt()
    }
    fn outflow(&self, h: f64) -> f64 {
        self.effective_orifice * self.jet_velocity(h)
    }
    /// Time to fall from `h1` to `h2`.
    fn time(&self, h1: f64, h2: f64) -> f64 {
        2.0 * self.area / self.effective_orifice
            * (self.approach / (2.0 * STANDARD_GRAVITY)).sqrt()
            * (h1.sqrt() - h2.sqrt())
    }
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let d_tank = values.quantity("d_tank").map_err(|e| vec![e])?;
    let d_orifice = values.quantity("d_orifice").map_err(|e| vec![e])?;
    let cd = values.quantity("cd").map_err(|e| vec![e])?;
    let h1 = values.quantity("h_start").map_err(|e| vec![e])?;
    let h2 = values.quantity_or("h_end", 0.0);
    let fluid = common::fluid_from(values)?;
    if d_orifice >= d_tank {
        return Err(vec![FieldError::inconsistent(
            "d_orifice",
            "the orifice must be smaller than the tank",
        )]);
    }
    if h2 >= h1 {
        return Err(vec![FieldError::inconsistent(
            "h_end",
            "the final level must be below the starting level",
        )]);
    }
    let area = PI * d_tank * d_tank / 4.0;
    let effective_orifice = cd * PI * d_orifice * d_orifice / 4.0;
    let ratio = effective_orifice / area;
    let tank = Tank {
        area,
        effective_orifice,
        approach: 1.0 - ratio * ratio,
    };

    // Instantaneous mass balance at the start through the engine: the tank's only
    // port is the jet; the storage term is the level falling.
    let q1 = tank.outflow(h1);
    let mut cv = ControlVolume::new(fluid.clone());
    let jet = Port::outlet("orifice jet", si::area(effective_orifice), Direction::Z.reversed())
        .volume_flow(si::volume_flow(q1))
        .pressure(si::pressure(0.0))
        .at(Vec3::ZERO);
    cv.port(jet);
    let level_rate = q1 / area;
    cv.storage(-fluid.density * area * level_rate, Vec3::ZERO);
    cv.gravity(Vec3::new(0.0, 0.0, -STANDARD_GRAVITY));
    let balance = engine::balance(&cv).map_err(|e| common::engine_error(e, "d_orifice"))?;

    report.output("time", tank.time(h1, h2));
    report.output("q_start", q1);
    report.output("v_jet_start", tank.jet_velocity(h1));
    report.output("level_rate_start", level_rate);
    report.output("volume", area * (h1 - h2));
    report.output("q_end", tank.outflow(h2));
    if cd > 0.99 {
        report.warn(
            Some("cd"),
            "a discharge coefficient this close to 1 assumes an ideal, perfectly rounded outlet",
        );
    }
    report
        .solution
        .tables
        .push(common::ports_table(&balance, report.system()));

    // Level against time.
    let system = report.system();
    let (t_unit, h_unit) = match system {
        crate::units::UnitSystem::Si => ("min", "m"),
        crate::units::UnitSystem::UsCustomary => ("min", "ft"),
    };
    let steps = 40;
    let mut points = Vec::with_capacity(steps + 1);
    for i in 0..=steps {
        let h = h1 - (h1 - h2) * i as f64 / steps as f64;
        let t = tank.time(h1, h);
        points.push([
            crate::units::convert_to(t, Q::Time, t_unit).unwrap_or(t),
            crate::units::convert_to(h, Q::Length, h_unit).unwrap_or(h),
        ]);
    }
    let half_level = 0.5 * (h1 + h2);
    report.solution.plots.push(Plot {
        key: "level",
        title: "Liquid level against time".to_string(),
        x_label: format!("time ({t_unit})"),
        y_label: format!("level above the orifice ({h_unit})"),
        series: vec![Series {
            name: "level".to_string(),
            points,
        }],
        markers: vec![Marker {
            at: [
                crate::units::convert_to(tank.time(h1, half_level), Q::Time, t_unit).unwrap_or(0.0),
                crate::units::convert_to(half_level, Q::Length, h_unit).unwrap_or(0.0),
            ],
            label: "half the level drop".to_string(),
        }],
    });

    // Section through the tank, to scale.
    let r = d_tank / 2.0;
    let mut shapes = vec![
        Shape::Polyline {
            points: vec![[-r, h1 * 1.15 + 0.1 * r], [-r, 0.0], [r, 0.0], [r, h1 * 1.15 + 0.1 * r]],
            style: ShapeStyle::Wall,
        },
        Shape::Polygon {
            points: vec![[-r, 0.0], [r, 0.0], [r, h1], [-r, h1]],
            style: ShapeStyle::Fluid,
        },
        Shape::Polyline {
            points: vec![[-r, h2], [r, h2]],
            style: ShapeStyle::Guide,
        },
        Shape::Text {
            at: [r * 1.05, h1],
            text: "start level".to_string(),
            style: ShapeStyle::Label,
        },
        Shape::Text {
            at: [r * 1.05, h2],
            text: "final level".to_string(),
            style: ShapeStyle::Label,
        },
    ];
    let jet_len = 0.3 * h1.max(d_tank);
    shapes.push(Shape::Arrow {
        from: [0.0, 0.0],
        to: [0.0, -jet_len],
        label: format!("jet {}", report.fmt(tank.jet_velocity(h1), Q::Velocity)),
        style: ShapeStyle::Velocity,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.15 * d_tank.max(h1));
    report.solution.diagrams.push(Diagram {
        title: "Tank section".to_string(),
        bounds,
        shapes,
        caption: "Tank to scale; the orifice and jet are drawn schematically.".to_string(),
    });
    Ok(())
}
