//! Pipe bend: the force an anchor or thrust block must supply to hold a bend.
//!
//! # Method
//! A control volume is drawn around the fluid in the bend, cutting the pipe at the
//! inlet (1) and outlet (2) faces. With x along the inlet flow and the bend turning
//! through θ in its plane, the linear-momentum balance ([`crate::engine`]) gives the
//! force the supports exert on the bend,
//!
//! R = p₁A₁n₁ + p₂A₂n₂ + ṁ(β₂V₂ − β₁V₁) − W − W_f,
//!
//! with n the outward normals, p gauge pressures, W the contained fluid's weight and
//! W_f any given weight of the fitting. The thrust on the supports is T = −R. The
//! outlet pressure comes from the energy balance with the bend's loss coefficient K
//! on the inlet velocity: p₂ = p₁ + ρ(V₁² − V₂²)/2 − ρg(z₂ − z₁) − K·ρV₁²/2.
//!
//! For an equal-size bend at rest the thrust reduces to the static formula
//! T = 2pA·sin(θ/2), directed along the bisector, away from the bend's centre
//! (e.g. AWWA Manual M11, *Steel Pipe*, chapter on thrust restraint; the ductile-iron
//! pipe industry's thrust-restraint design guides).
//!
//! # Checks
//! Recorded with [`Report::check`], each by a path that does not use the engine:
//! the outlet pressure by the Bernoulli line above; the x and y thrust by the
//! closed form T = (p₁A₁ + ṁV₁)·e₁ − (p₂A₂ + ṁV₂)·e₂ + (W + W_f)·ĝ with that
//! pressure (areas on the chosen basis, momentum on the bores); and for an
//! equal-size horizontal bend at rest, the static formula 2pA·sin(θ/2).
//!
//! # Area basis
//! The bore (`joint=flanged` or `welded`, the default flanged) is for joints that
//! seal on it: welded, flanged or fused. Push-on and mechanical joints, restrained
//! or not (`joint=push_on`, `mechanical`, `restrained`), seal on the spigot's
//! outside, so the pressure acts out to the outside diameter of the sealing joint
//! (`od` and `od2`): −p·(A_OD − A)·n is added at each face
//! as a named force, as on the reducer page. 12 in ductile iron (OD 13.20 in, bore
//! 12.46 in), 150 psi, 90°: 29,030 lbf on the OD, 25,866 lbf on the bore.
//!
//! # Carried to the thrust-restraint page
//! A vertical bend carries its resultant and its angle above the horizontal; a
//! horizontal bend carries its in-plane thrust only, since the fluid's weight rests
//! on the bedding, not on the block.
//!
//! # Assumptions
//! Incompressible, steady flow; uniform pressure over each face; pressure area on
//! the chosen basis; the fluid inside follows the centre-line arc
//! (volume A·R·θ for equal sizes, mean area for reducing bends).

use std::f64::consts::PI;

use crate::catalog::{
    CalculatorSpec, ChoiceOption, Diagram, FieldSpec, Limits, OutputSpec, Report, Shape, ShapeStyle, Values,
};
use crate::engine::{self, si, ControlVolume, Loss, Port, Stream};
use crate::error::FieldError;
use crate::units::{QuantityKind as Q, STANDARD_GRAVITY};
use crate::vector::{Direction, Vec3};

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};

pub const KEY: &str = "bend";

const PLANE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "horizontal",
        label: "Horizontal (plan view)",
    },
    ChoiceOption {
        key: "vertical_sag",
        label: "Vertical, turning upward (a sag)",
    },
    ChoiceOption {
        key: "vertical_crest",
        label: "Vertical, turning downward (a crest)",
    },
];

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity(
            "angle",
            "Deflection angle",
            Q::Angle,
            "deg",
            "deg",
            "45 deg",
            Limits::closed(crate::restraint::MIN_ANGLE, PI),
            "How far the flow turns, from 0.1 to 180 degrees (a return bend).",
        ),
        quantity(
            "d",
            "Inlet inside diameter",
            Q::Length,
            "mm",
            "in",
            "310 mm",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            "Inside diameter of the pipe entering the bend.",
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "d2",
                "Outlet inside diameter",
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Leave empty for an equal-size bend; give it for a reducing bend.",
            )
        },
        quantity(
            "p",
            "Gauge pressure at the inlet",
            Q::Pressure,
            "kPa",
            "psi",
            "10 bar",
            Limits::closed(0.0, MAX_PRESSURE_PA),
            "The design pressure: the highest the line will see, including test pressure and surge.",
        ),
    ];
    fields.extend(common::flow_given_fields("850 m3/h"));
    fields.extend(common::fluid_fields("25 degC"));
    fields.extend([
        FieldSpec {
            optional: true,
            ..quantity("k", "Loss coefficient K", Q::Ratio, "-", "-", "", Limits::closed(0.0, 50.0), "Head loss K·V²/2g on the inlet velocity; empty means no loss. Name the method your K comes from (Crane, Idelchik, ...).")
        },
        FieldSpec {
            optional: true,
            ..choice("joint", "Joints at the bend (thrust area)", crate::restraint::Joint::OPTIONS, "flanged", crate::restraint::JOINT_HELP)
        },
        FieldSpec {
            visible_when: Some(("joint", crate::restraint::OD_JOINTS)),
            ..quantity("od", "Inlet pipe outside diameter", Q::Length, "mm", "in", "330 mm", Limits::closed(MIN_SIZE_M, MAX_SIZE_M), "Outside diameter of the pipe at the inlet joint (the sealing diameter of a push-on or mechanical joint).")
        },
        FieldSpec {
            visible_when: Some(("joint", crate::restraint::OD_JOINTS)),
            optional: true,
            ..quantity("od2", "Outlet pipe outside diameter", Q::Length, "mm", "in", "", Limits::closed(MIN_SIZE_M, MAX_SIZE_M), "Empty: the inlet's outside diameter (an equal-size bend).")
        },
        choice("plane", "Plane of the bend", PLANE_OPTIONS, "horizontal", "In a horizontal bend the fluid's weight acts out of the plane; in a vertical bend it acts in the plane."),
        FieldSpec {
            optional: true,
            ..quantity("r_bend", "Centre-line bend radius", Q::Length, "mm", "in", "", Limits::closed(MIN_SIZE_M, 100.0), "Sets the volume of fluid inside (its weight) and the drawing; empty means 1.5 × the inlet diameter.")
        },
        FieldSpec {
            optional: true,
            ..quantity("w_fitting", "Weight of the fitting and carried pipe", Q::Force, "kN", "lbf", "", Limits::closed(0.0, 1e8), "Optional dead weight the restraint also carries (vertical bends).")
        },
    ]);
    CalculatorSpec {
        key: KEY,
        title: "Pipe bend anchor force",
        group: crate::catalog::group::FITTINGS,
        summary: "Thrust on a horizontal or vertical bend, equal or reducing, from pressure, flow and fluid weight.",
        fields,
        outputs: vec![
            OutputSpec { key: "thrust", label: "Thrust on the supports (resultant)", kind: Q::Force, headline: true },
            OutputSpec { key: "thrust_in_plane", label: "Thrust in the plane of the bend", kind: Q::Force, headline: true },
            OutputSpec { key: "thrust_angle", label: "Direction of the in-plane thrust, from the inlet flow direction", kind: Q::Angle, headline: false },
            OutputSpec { key: "thrust_x", label: "Thrust along the inlet flow (x)", kind: Q::Force, headline: false },
            OutputSpec { key: "thrust_y", label: "Thrust across it, in the plane (y)", kind: Q::Force, headline: false },
            OutputSpec { key: "thrust_z", label: "Thrust normal to the plane (z, up in plan view)", kind: Q::Force, headline: false },
            OutputSpec { key: "p_out", label: "Gauge pressure at the outlet", kind: Q::Pressure, headline: false },
            OutputSpec { key: "v_in", label: "Mean velocity at the inlet", kind: Q::Velocity, headline: false },
            OutputSpec { key: "v_out", label: "Mean velocity at the outlet", kind: Q::Velocity, headline: false },
            OutputSpec { key: "flow", label: "Volumetric flow", kind: Q::VolumeFlow, headline: false },
            OutputSpec { key: "mass_flow", label: "Mass flow", kind: Q::MassFlow, headline: false },
            OutputSpec { key: "momentum_share", label: "Momentum flux ÷ pressure force", kind: Q::Ratio, headline: false },
            OutputSpec { key: "fluid_weight", label: "Weight of the fluid inside", kind: Q::Force, headline: false },
            OutputSpec { key: "density", label: "Fluid density", kind: Q::Density, headline: false },
            OutputSpec { key: "viscosity", label: "Fluid viscosity", kind: Q::DynamicViscosity, headline: false },
        ],
        cautions: vec![
            "The inside-diameter basis is for welded, flanged or fused joints only. Push-on and mechanical joints, restrained or not, seal on the spigot's outside: choose their joint (the outside diameter) for them.",
            "In a vertical bend where the line turns downward (a crest) the thrust points up and out: a gravity block must outweigh it. Where the line turns upward (a sag) it points down into the ground.",
        ],
    }
}

/// Geometry of the bend in the drawing plane: inlet at the origin flowing +x, the
/// bend turning towards +y (or −y when `sense` is −1) about a centre at (0, sense·R).
struct Geometry {
    theta: f64,
    sense: f64,
    radius: f64,
    d_in: f64,
    d_out: f64,
}

impl Geometry {
    fn outlet_position(&self) -> Vec3 {
        Vec3::new(
            self.radius * self.theta.sin(),
            self.sense * self.radius * (1.0 - self.theta.cos()),
            0.0,
        )
    }
    fn outlet_direction(&self) -> Direction {
        Direction::in_plane(self.sense * self.theta)
    }
    fn centroid(&self) -> Vec3 {
        // Centroid of a circular arc of radius R spanning θ from the inlet.
        let mid = self.theta / 2.0;
        let chord_factor = if self.theta > 1e-9 { mid.sin() / mid } else { 1.0 };
        let r = self.radius * chord_factor;
        Vec3::new(r * mid.sin(), self.sense * (self.radius - r * mid.cos()), 0.0)
    }
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let theta = values.quantity("angle").map_err(|e| vec![e])?;
    let d_in = values.quantity("d").map_err(|e| vec![e])?;
    let d_out = values.quantity_or("d2", d_in);
    let p_in = values.quantity("p").map_err(|e| vec![e])?;
    let k = values.quantity_or("k", 0.0);
    let plane = values.choice("plane").map_err(|e| vec![e])?;
    let radius = values.quantity_or("r_bend", 1.5 * d_in);
    let w_fitting = values.quantity_or("w_fitting", 0.0);
    let fluid = common::fluid_from(values)?;
    let flow = common::flow_given_from(values)?;
    let outside = match crate::restraint::joint_uses_od(values.choice("joint").unwrap_or("flanged")) {
        true => {
            let od_in = values.quantity("od").map_err(|e| vec![e])?;
            let od_out = values.quantity_or("od2", od_in);
            let mut errors = Vec::new();
            for (field, od, bore) in [("od", od_in, d_in), ("od2", od_out, d_out)] {
                if od <= bore {
                    let message = if field == "od2" && !values.is_set("od2") {
                        "give the outlet's outside diameter: the inlet's is not larger than the outlet bore"
                    } else {
                        "the outside diameter must be larger than the inside diameter"
                    };
                    errors.push(FieldError::inconsistent(field, message));
                }
            }
            if !errors.is_empty() {
                return Err(errors);
            }
            Some((od_in, od_out))
        }
        false => None,
    };
    if radius < 0.5 * d_in.max(d_out) {
        return Err(vec![FieldError::inconsistent(
            "r_bend",
            "the centre-line radius must be at least half the larger diameter",
        )]);
    }

    let (sense, gravity) = match plane {
        "vertical_sag" => (1.0, Vec3::new(0.0, -STANDARD_GRAVITY, 0.0)),
        "vertical_crest" => (-1.0, Vec3::new(0.0, -STANDARD_GRAVITY, 0.0)),
        _ => (1.0, Vec3::new(0.0, 0.0, -STANDARD_GRAVITY)),
    };
    let geometry = Geometry {
        theta,
        sense,
        radius,
        d_in,
        d_out,
    };
    let (a_in, a_out) = (common::circle_area(d_in), common::circle_area(d_out));
    let volume = 0.5 * (a_in + a_out) * radius * theta;

    let mut cv = ControlVolume::new(fluid.clone());
    cv.gravity(gravity);
    let mut inlet = Port::inlet("inlet", si::area(a_in), Direction::X)
        .pressure(si::pressure(p_in))
        .at(Vec3::ZERO);
    inlet.flow = flow;
    let i = cv.port(inlet);
    let o =
        cv.port(Port::outlet("outlet", si::area(a_out), geometry.outlet_direction()).at(geometry.outlet_position()));
    cv.stream(Stream::new(i, o).loss(Loss::Coefficient { k, reference_port: i }));
    cv.contains(si::volume(volume), geometry.centroid());
    if w_fitting > 0.0 {
        let weight_dir = gravity * (1.0 / STANDARD_GRAVITY);
        cv.extra_force("fitting weight", weight_dir * w_fitting, geometry.centroid());
    }
    let mut balance = engine::balance(&cv).map_err(|e| common::engine_error(e, "p"))?;
    if let Some((od_in, od_out)) = outside {
        // Push-on or mechanical joints: the solved pressures also act on the wall
        // annulus out to the outside diameter at each end (a second pass adds them as
        // named forces; they change no pressure or flow).
        for (port, od, bore, name) in [(i, od_in, a_in, "inlet"), (o, od_out, a_out, "outlet")] {
            let pressure = balance.ports[port].pressure;
            let normal = cv.ports[port].outward_normal();
            let force = common::joint_annulus_force(pressure, bore, common::circle_area(od), normal);
            let at = cv.ports[port].position;
            cv.extra_force(
                &format!("{name} joint, pressure on the wall annulus to the OD"),
                force,
                at,
            );
        }
        balance = engine::balance(&cv).map_err(|e| common::engine_error(e, "p"))?;
    }
    let (basis_a_in, basis_a_out) = match outside {
        Some((od_in, od_out)) => (common::circle_area(od_in), common::circle_area(od_out)),
        None => (a_in, a_out),
    };

    let thrust = balance.thrust();
    let inlet_state = &balance.ports[i];
    let outlet_state = &balance.ports[o];
    let in_plane = (thrust.x * thrust.x + thrust.y * thrust.y).sqrt();
    report.output("thrust", thrust.norm());
    report.output("thrust_in_plane", in_plane);
    if in_plane > 0.0 {
        report.output("thrust_angle", thrust.plane_angle());
    }
    report.output("thrust_x", thrust.x);
    report.output("thrust_y", thrust.y);
    report.output("thrust_z", thrust.z);
    report.output("p_out", outlet_state.pressure);
    report.output("v_in", inlet_state.speed);
    report.output("v_out", outlet_state.speed);
    report.output("flow", inlet_state.volume_flow);
    report.output("mass_flow", inlet_state.mass_flow);
    let pressure_force: f64 = balance.ports.iter().map(|p| p.pressure_force.norm()).sum();
    let momentum: f64 = balance.ports.iter().map(|p| p.momentum_outflow.norm()).sum();
    if pressure_force > 0.0 {
        report.output("momentum_share", momentum / pressure_force);
    }
    report.output("fluid_weight", balance.fluid_weight.norm());
    report.output("density", fluid.density);
    report.output("viscosity", fluid.viscosity);

    // Check: the closed-form momentum balance of a bend, with the outlet pressure
    // from Bernoulli with the loss (not the engine's), the weights along gravity.
    let mass_flow = inlet_state.mass_flow;
    let (v1, v2) = (mass_flow / (fluid.density * a_in), mass_flow / (fluid.density * a_out));
    let dz = gravity.dot(geometry.outlet_position()) / -STANDARD_GRAVITY;
    let p_out = p_in + 0.5 * fluid.density * (v1 * v1 - v2 * v2)
        - fluid.density * STANDARD_GRAVITY * dz
        - k * 0.5 * fluid.density * v1 * v1;
    report.check(
        "Gauge pressure at the outlet",
        "Bernoulli with the loss K·ρV₁²/2",
        Q::Pressure,
        outlet_state.pressure,
        p_out,
        1e-9,
        // Relative to the largest term of the energy line (they can cancel).
        p_in.abs() + fluid.density * (v1 * v1 + v2 * v2 + k * v1 * v1 + STANDARD_GRAVITY * dz.abs()),
    );
    let e1 = Direction::X.vec();
    let e2 = geometry.outlet_direction().vec();
    let down = gravity * (1.0 / STANDARD_GRAVITY);
    let closed = e1 * (p_in * basis_a_in + mass_flow * v1) - e2 * (p_out * basis_a_out + mass_flow * v2)
        + down * (fluid.density * STANDARD_GRAVITY * volume + w_fitting);
    // Relative to the sum of the terms' magnitudes: the terms can cancel.
    let scale = p_in.abs() * basis_a_in
        + p_out.abs() * basis_a_out
        + mass_flow * (v1 + v2)
        + fluid.density * STANDARD_GRAVITY * volume
        + w_fitting;
    report.check(
        "Thrust, along the inlet (x)",
        "closed form (p₁A₁ + ṁV₁)·e₁ − (p₂A₂ + ṁV₂)·e₂ + W",
        Q::Force,
        thrust.x,
        closed.x,
        1e-9,
        scale,
    );
    report.check(
        "Thrust, across the inlet in the plane (y)",
        "the same closed form, y component",
        Q::Force,
        thrust.y,
        closed.y,
        1e-9,
        scale,
    );
    if outside.is_none() && (d_in - d_out).abs() <= 1e-12 * d_in && mass_flow == 0.0 && plane == "horizontal" {
        report.check(
            "Thrust in the plane of the bend",
            "static formula 2·p·A·sin(θ/2) of the thrust-restraint guides",
            Q::Force,
            in_plane,
            2.0 * p_in * a_in * (theta / 2.0).sin(),
            1e-9,
            0.0,
        );
    }

    common::forward_warnings(&balance, report);
    let flow_field = common::flow_field(values);
    common::pipe_velocity_warning(report, flow_field, "inlet", inlet_state.speed);
    common::pipe_velocity_warning(report, "d2", "outlet", outlet_state.speed);
    if outlet_state.pressure < 0.0 {
        report.warn(
            Some("p"),
            "the outlet gauge pressure comes out below atmospheric: check the inputs",
        );
    }
    if p_in == 0.0 && inlet_state.speed == 0.0 {
        report.warn(
            Some("p"),
            "with no pressure and no flow the only load is the weight of the fluid",
        );
    }

    // Carry the thrust to the restraint page. A vertical bend carries its resultant
    // with its angle above the horizontal; a horizontal bend carries the in-plane
    // thrust only: the fluid's weight (z) rests on the bedding, not on the block
    // (carried with it, a large low-pressure bend would open as a sag block).
    let (carried, vertical, horizontal) = match plane {
        "vertical_sag" | "vertical_crest" => (thrust.norm(), thrust.y, thrust.x.hypot(thrust.z)),
        _ => (in_plane, 0.0, in_plane),
    };
    let carry = common::thrust_carry_over(
        report,
        "Size a thrust block for this thrust",
        carried,
        vertical.atan2(horizontal),
    );
    report.solution.carry_over.push(carry);

    let system = report.system();
    let equal = (d_in - d_out).abs() <= 1e-9 * d_in;
    let direction = if equal && p_in > 0.0 {
        "along the bisector of the bend, away from its centre (equal sizes; flow and weight tilt it slightly, see the angle)"
    } else {
        "as given by the angle: a reducing bend's thrust leaves the bisector"
    };
    let loss = if k > 0.0 {
        format!(
            "K = {} on the inlet velocity (method as typed)",
            crate::units::format_significant(k, 3)
        )
    } else {
        "none".to_string()
    };
    let plane_text = match plane {
        "vertical_sag" => "vertical, the line turning upward (a sag): fluid weight in the plane",
        "vertical_crest" => "vertical, the line turning downward (a crest): fluid weight in the plane",
        _ => "horizontal: fluid weight normal to the plane (carried by the bedding)",
    };
    report.solution.tables.push(common::basis_table(vec![
        (
            "Pressure area",
            match outside {
                Some((od_in, od_out)) => format!(
                    "outside diameters {} and {} (push-on or mechanical joints, restrained or not): the pressure on the wall annulus is its own ledger term; momentum on the bores",
                    report.fmt(od_in, Q::Length),
                    report.fmt(od_out, Q::Length)
                ),
                None => "inside diameter (welded, flanged or fused joints only)".to_string(),
            },
        ),
        (
            "Pressure",
            "gauge, at the inlet; outlet from the energy balance".to_string(),
        ),
        ("Direction of the thrust", direction.to_string()),
        ("Plane", plane_text.to_string()),
        ("Loss", loss),
        ("Fluid", fluid.name.clone()),
    ]));
    report.solution.tables.push(common::ledger_table(&balance, system));
    report.solution.tables.push(common::ports_table(&balance, system));
    let diagram = diagram(&geometry, &balance, report);
    report.solution.diagrams.push(diagram);
    Ok(())
}

fn diagram(g: &Geometry, balance: &engine::Balance, report: &Report<'_>) -> Diagram {
    let mut shapes = Vec::new();
    let lead = 1.2 * g.d_in.max(g.d_out);
    let center = [0.0, g.sense * g.radius];
    let start_angle = if g.sense > 0.0 { -PI / 2.0 } else { PI / 2.0 };
    let end_angle = start_angle + g.sense * g.theta;
    // Straight leads, then the bend itself.
    shapes.push(Shape::Polygon {
        points: common::straight_band([-lead, 0.0], [0.0, 0.0], g.d_in),
        style: ShapeStyle::Wall,
    });
    let out = g.outlet_position();
    let dir = g.outlet_direction().vec();
    shapes.push(Shape::Polygon {
        points: common::straight_band(out.xy(), [out.x + dir.x * lead, out.y + dir.y * lead], g.d_out),
        style: ShapeStyle::Wall,
    });
    let (a0, a1) = if g.sense > 0.0 {
        (start_angle, end_angle)
    } else {
        (end_angle, start_angle)
    };
    let mean_d = 0.5 * (g.d_in + g.d_out);
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, g.radius, mean_d, a0, a1, 24),
        style: ShapeStyle::Fluid,
    });
    // Control volume: the arc band itself, cut at the two faces.
    shapes.push(Shape::Polygon {
        points: common::arc_band(center, g.radius, mean_d * 1.25, a0, a1, 24),
        style: ShapeStyle::ControlVolume,
    });
    // Centre line.
    let mut line = vec![[-lead, 0.0]];
    for s in 0..=24 {
        let a = start_angle + g.sense * g.theta * s as f64 / 24.0;
        line.push([center[0] + g.radius * a.cos(), center[1] + g.radius * a.sin()]);
    }
    line.push([out.x + dir.x * lead, out.y + dir.y * lead]);
    shapes.push(Shape::Polyline {
        points: line,
        style: ShapeStyle::Guide,
    });

    // Forces: scale the largest in-plane force to 1.5 × the bend radius.
    let thrust = balance.thrust();
    let forces = balance
        .ports
        .iter()
        .map(|p| p.pressure_force.norm())
        .chain([thrust.norm()]);
    let max_force = forces.fold(0.0, f64::max);
    let scale = if max_force > 0.0 {
        1.5 * g.radius.max(lead) / max_force
    } else {
        0.0
    };
    let fmt = |f: Vec3| report.fmt((f.x * f.x + f.y * f.y).sqrt(), Q::Force);
    for p in &balance.ports {
        if let Some(a) = common::force_arrow(
            p.position.xy(),
            p.pressure_force,
            scale,
            format!("p·A {}", fmt(p.pressure_force)),
            ShapeStyle::Pressure,
            false,
        ) {
            shapes.push(a);
        }
    }
    let c = g.centroid().xy();
    common::thrust_and_restraint_arrows(&mut shapes, c, c, thrust, scale, &fmt(thrust));
    shapes.push(Shape::Text {
        at: [-lead, -g.d_in],
        text: "inlet".to_string(),
        style: ShapeStyle::Label,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.3 * lead);
    let plane = if (balance.fluid_weight.z).abs() > 0.0 {
        "plan view"
    } else {
        "elevation"
    };
    Diagram {
        title: format!("Bend, {plane}: control volume and forces"),
        bounds,
        shapes,
        caption: "Pipe and bend to scale; force arrows scaled to the largest force, in-plane components only. T acts on the supports; R = −T is what the restraint supplies.".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use crate::catalog::Request;
    use approx::assert_relative_eq;

    fn solve(pairs: &[(&str, &str)]) -> crate::catalog::Solution {
        let mut request = Request::default();
        for (k, v) in pairs {
            request.inputs.insert(k.to_string(), v.to_string());
        }
        crate::solve(super::KEY, &request).result.expect("solves")
    }

    #[test]
    fn still_equal_bend_matches_static_formula() {
        // Derived from the definition: T = 2pA sin(θ/2) with no flow.
        let s = solve(&[
            ("angle", "90 deg"),
            ("d", "300 mm"),
            ("p", "1 bar"),
            ("flow_given", "q"),
            ("q", "0"),
            ("fluid", "water"),
            ("t", "20 degC"),
            ("plane", "horizontal"),
        ]);
        let area = std::f64::consts::PI * 0.3 * 0.3 / 4.0;
        let expected = 2.0 * 1e5 * area * (std::f64::consts::FRAC_PI_4).sin();
        assert_relative_eq!(s.output("thrust_in_plane").unwrap().si, expected, max_relative = 1e-12);
        // Along the bisector, away from the centre: 45° below the inlet direction...
        // the bend turns to +y, so the thrust points to −45°.
        assert_relative_eq!(
            s.output("thrust_angle").unwrap().si,
            -std::f64::consts::FRAC_PI_4,
            max_relative = 1e-9
        );
    }

    #[test]
    fn carried_thrust_opens_the_restraint_page_with_the_same_force() {
        let request = crate::catalog::demo_request(&super::spec(), &[("plane", "vertical_crest")]);
        let s = crate::solve(super::KEY, &request).result.expect("solves");
        let thrust = s.output("thrust").unwrap().si;
        let carry = &s.carry_over[0];
        let carried: Vec<(&str, &str)> = carry.inputs.iter().map(|(k, v)| (*k, v.as_str())).collect();
        let target = crate::catalog::demo_request(&crate::calculators::spec(carry.calculator).unwrap(), &carried);
        let block = crate::solve(carry.calculator, &target)
            .result
            .expect("restraint page solves");
        let carried = block.output("thrust").expect("thrust reported").si;
        assert_relative_eq!(carried, thrust, max_relative = 1e-3);
        // A crest pushes up: the carried plane says so.
        assert!(
            carry.inputs.iter().any(|(k, v)| *k == "plane" && v == "vertical_crest"),
            "{:?}",
            carry.inputs
        );
    }

    #[test]
    fn a_horizontal_bend_carries_its_in_plane_thrust_to_a_horizontal_block() {
        // Issue 8: 1200 mm, 90°, 5 bar. The fluid's weight (out of the plane) once
        // tipped the carried force below −1° and opened a sag block.
        let request = crate::catalog::demo_request(
            &super::spec(),
            &[
                ("d", "1200 mm"),
                ("angle", "90 deg"),
                ("p", "5 bar"),
                ("plane", "horizontal"),
            ],
        );
        let s = crate::solve(super::KEY, &request).result.expect("solves");
        assert!(
            s.output("thrust_z").unwrap().si.abs() > 1e3,
            "the fluid weight is there"
        );
        let in_plane = s.output("thrust_in_plane").unwrap().si;
        let carry = &s.carry_over[0];
        let get = |key: &str| carry.inputs.iter().find(|(k, _)| *k == key).map(|(_, v)| v.clone());
        assert_eq!(get("plane").as_deref(), Some("horizontal"));
        let carried: Vec<(&str, &str)> = carry.inputs.iter().map(|(k, v)| (*k, v.as_str())).collect();
        let target = crate::catalog::demo_request(&crate::calculators::spec(carry.calculator).unwrap(), &carried);
        let block = crate::solve(carry.calculator, &target)
            .result
            .expect("restraint page solves");
        assert_relative_eq!(block.output("thrust").unwrap().si, in_plane, max_relative = 1e-4);
        assert_relative_eq!(block.output("thrust_v").unwrap().si, 0.0);
        // No design pressure of the restraint page's own is shown for a carried force.
        assert!(block.output("p_design").is_none());
    }

    #[test]
    fn the_outside_diameter_basis_adds_the_annulus_at_both_ends() {
        // Derived from the definition: at rest the thrust is 2·p·A_OD·sin(θ/2).
        let s = solve(&[
            ("angle", "60 deg"),
            ("d", "300 mm"),
            ("joint", "push_on"),
            ("od", "326 mm"),
            ("p", "10 bar"),
            ("flow_given", "q"),
            ("q", "0"),
            ("fluid", "water"),
            ("t", "20 degC"),
            ("plane", "horizontal"),
        ]);
        let area = std::f64::consts::PI * 0.326 * 0.326 / 4.0;
        let expected = 2.0 * 1e6 * area * (std::f64::consts::PI / 6.0).sin();
        assert_relative_eq!(s.output("thrust_in_plane").unwrap().si, expected, max_relative = 1e-12);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    #[test]
    fn errors_name_the_field() {
        let request = crate::catalog::demo_request(&super::spec(), &[("d", "5 psi")]);
        let outcome = crate::solve(super::KEY, &request);
        match outcome.result {
            Err(crate::SolveError::Fields(errors)) => assert_eq!(errors[0].field, "d"),
            other => panic!("expected a field error, got {other:?}"),
        }
    }
}
