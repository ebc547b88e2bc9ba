//! Free jet on a fixed flat plate, normal or inclined: the force on the plate and
//! the split of the flow along it.
//!
//! # Method
//! A round free jet of area A and speed V (from the nozzle diameter and one of the
//! jet velocity, the flow, or the head H or pressure p at the nozzle inlet with a
//! velocity coefficient, V = Cv·√(2gH) = Cv·√(2p/ρ)) strikes a fixed flat plate. θ is
//! the angle between the jet axis and the plate surface (90° = a plate normal to the
//! jet). The control volume surrounds the plate's wetted face; it cuts the jet (port
//! "jet") and the two sheets that leave along the plate, the forward one (port
//! "forward", the side the jet leans towards) and the back one (port "back").
//!
//! - Every port is open to the atmosphere: gauge pressure zero, so the pressure
//!   terms vanish and only momentum fluxes remain.
//! - Energy (Bernoulli along each branch, no friction, jet weight neglected): both
//!   sheets leave at the jet speed V.
//! - Momentum normal to the plate ([`crate::engine`]): the force on the plate is
//!   F_n = ṁ·V·sin θ = ρQV·sin θ, with ṁ = ρQ.
//! - Momentum along the plate: a frictionless plate exerts no force along its
//!   surface, so 0 = ṁ₁V − ṁ₂V − ṁV·cos θ. With mass, ṁ₁ + ṁ₂ = ṁ, this gives the
//!   split Q₁ = Q(1 + cos θ)/2 forward and Q₂ = Q(1 − cos θ)/2 back.
//!
//! The calculator does not write these results down: it finds the split by asking
//! the engine for the force along the plate at two trial splits (the force is linear
//! in the split) and taking the split at which it vanishes, then balances the final
//! control volume and reports the engine's force. The checks table compares the
//! normal force with ρQV·sin θ and the forward flow with Q(1 + cos θ)/2, written by
//! hand above. (The force along the plate is zero by the way the split is found, so
//! it is not shown as a check.) Force components that are rounding residue of the
//! jet's momentum flux (below 1e-12 of ρQV) are shown as 0. Sources: the jet-on-a-plate examples in White, *Fluid
//! Mechanics* (chapter 3), Munson et al., *Fundamentals of Fluid Mechanics* (chapter
//! 5), and the impact-of-jets chapter of hydraulics texts such as Bansal, *A Textbook
//! of Fluid Mechanics and Hydraulic Machines*.
//!
//! # Assumptions
//! Idealised free jet: steady, incompressible, uniform speed, no spreading, break-up,
//! air entrainment or friction; the plate is large enough to turn the whole jet
//! parallel to its surface; the jet's weight is neglected (the balance is written in
//! the plane of the jet and the plate normal); the sheets are drawn as a 2-D picture
//! of what is, for a round jet, a 3-D spread.

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, Diagram, Limits, OutputSpec, Report, Shape, ShapeStyle, Table, Values};
use crate::engine::{self, si, Balance, ControlVolume, EngineError, FlowSpec, Port};
use crate::error::FieldError;
use crate::fluid::Fluid;
use crate::units::{self, QuantityKind as Q};
use crate::vector::{Direction, Vec3};

use super::common::{self, quantity, Jet};

pub const KEY: &str = "jet-plate";

/// The smallest plate angle accepted: below about 1° the jet grazes the plate.
const MIN_ANGLE: f64 = PI / 180.0;

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![quantity(
        "plate_angle",
        "Angle between the jet and the plate",
        Q::Angle,
        "deg",
        "deg",
        "60 deg",
        Limits::closed(MIN_ANGLE, PI / 2.0),
        "Angle between the jet axis and the plate surface, 1 to 90 degrees; 90 degrees is a plate normal to the jet.",
    )];
    fields.extend(common::jet_fields([
        "38 mm", "p", "30 m/s", "20 L/s", "45 m", "4.5 bar", "0.97",
    ]));
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: "Free jet on a fixed flat plate",
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary: "Force of a free jet on a fixed normal or inclined plate, and how the flow splits along the plate.",
        fields,
        outputs: vec![
            OutputSpec { key: "force_normal", label: "Force on the plate, normal to it", kind: Q::Force, headline: true },
            OutputSpec { key: "force_along_jet", label: "Component along the jet (x)", kind: Q::Force, headline: false },
            OutputSpec { key: "force_across_jet", label: "Component across the jet (y)", kind: Q::Force, headline: false },
            OutputSpec { key: "q_forward", label: "Flow along the plate, forward branch", kind: Q::VolumeFlow, headline: true },
            OutputSpec { key: "q_back", label: "Flow along the plate, back branch", kind: Q::VolumeFlow, headline: true },
            OutputSpec { key: "share_forward", label: "Forward share Q₁/Q", kind: Q::Ratio, headline: false },
            OutputSpec { key: "share_back", label: "Back share Q₂/Q", kind: Q::Ratio, headline: false },
            OutputSpec { key: "jet_velocity", label: "Jet velocity", kind: Q::Velocity, headline: false },
            OutputSpec { key: "jet_flow", label: "Jet flow", kind: Q::VolumeFlow, headline: false },
            OutputSpec { key: "mass_flow", label: "Jet mass flow", kind: Q::MassFlow, headline: false },
            OutputSpec { key: "jet_momentum", label: "Jet momentum flux ρQV (force on a normal plate)", kind: Q::Force, headline: false },
            OutputSpec { key: "stagnation_pressure", label: "Stagnation pressure at the impact point, ρV²/2", kind: Q::Pressure, headline: false },
            OutputSpec { key: "jet_power", label: "Jet kinetic-energy flux ρQV²/2", kind: Q::Power, headline: false },
            OutputSpec { key: "density", label: "Fluid density", kind: Q::Density, headline: false },
        ],
        cautions: vec![
            "Idealised jet: no spreading, break-up, air entrainment, friction or windage, and the jet's weight neglected. A jet that has travelled far from its nozzle spreads and breaks up and gives less force, but design the plate and its fixings for the full value.",
            "The plate must be large enough to turn the whole jet parallel to its surface. A small plate deflects less and takes less force; a plate with a lip or a dished face turns the jet back and takes more (up to twice ρQV; use the vane page).",
            "A high-pressure water jet injures people and cuts skin: keep people out of its path and guard deflectors and test rigs.",
            "Defer to the equipment manufacturer's ratings and to a licensed engineer for the plate, its supports and anchors.",
        ],
    }
}

/// Plate geometry in the drawing plane: the jet flows along +x and strikes the plate
/// at the origin; the plate surface runs along `tangent` (the forward branch).
struct Geometry {
    theta: f64,
    tangent: Vec3,
    /// Unit normal pointing from the plate towards the jet side.
    jet_side: Vec3,
    /// Distance from the impact point to the jet's cut (nozzle side).
    jet_length: f64,
    /// Distance from the impact point to where the CV cuts each sheet.
    sheet_length: f64,
}

impl Geometry {
    fn new(theta: f64, d: f64) -> Geometry {
        Geometry {
            theta,
            tangent: Vec3::new(theta.cos(), theta.sin(), 0.0),
            jet_side: Vec3::new(-theta.sin(), theta.cos(), 0.0),
            jet_length: 4.0 * d,
            sheet_length: 3.0 * d,
        }
    }
}

/// Balances the control volume for a given forward flow `q_forward` (m³/s); the back
/// flow follows from the mass balance.
fn plate_balance(fluid: &Fluid, jet: &Jet, g: &Geometry, q_forward: f64) -> Result<Balance, EngineError> {
    let v = jet.velocity;
    let tangent = Direction::new(g.tangent).unwrap_or(Direction::Y);
    let back = Direction::new(-g.tangent).unwrap_or(Direction::Y);
    let mut cv = ControlVolume::new(fluid.clone());
    cv.port(
        Port::inlet("jet", si::area(jet.area), Direction::X)
            .velocity(si::velocity(v))
            .pressure(si::pressure(0.0))
            .at(Vec3::new(-g.jet_length, 0.0, 0.0)),
    );
    cv.port(
        Port::outlet("forward", si::area(q_forward / v), tangent)
            .volume_flow(si::volume_flow(q_forward))
            .pressure(si::pressure(0.0))
            .at(g.tangent * g.sheet_length),
    );
    let mut back_port = Port::outlet("back", si::area((jet.flow - q_forward) / v), back)
        .pressure(si::pressure(0.0))
        .at(-g.tangent * g.sheet_length);
    back_port.flow = FlowSpec::Unknown;
    cv.port(back_port);
    engine::balance(&cv)
}

/// The split at which the plate takes no force along its surface, found from the
/// engine's momentum balance (linear in the split), and the balance there.
fn frictionless_split(fluid: &Fluid, jet: &Jet, g: &Geometry) -> Result<(f64, Balance), EngineError> {
    let along = |q: f64| -> Result<f64, EngineError> { Ok(plate_balance(fluid, jet, g, q)?.thrust().dot(g.tangent)) };
    let (qa, qb) = (0.25 * jet.flow, 0.75 * jet.flow);
    let (fa, fb) = (along(qa)?, along(qb)?);
    let slope = (fb - fa) / (qb - qa);
    let q = if slope != 0.0 && slope.is_finite() {
        qa - fa / slope
    } else {
        0.5 * jet.flow
    };
    let balance = plate_balance(fluid, jet, g, q)?;
    Ok((q, balance))
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let theta = values.quantity("plate_angle").map_err(|e| vec![e])?;
    let fluid = common::fluid_from(values)?;
    let jet = common::jet_from(values, fluid.density)?;
    let g = Geometry::new(theta, jet.diameter);
    let (q_forward, balance) =
        frictionless_split(&fluid, &jet, &g).map_err(|e| common::engine_error(e, "plate_angle"))?;

    let thrust = balance.thrust();
    let into_plate = -g.jet_side;
    let rho = fluid.density;
    let (v, q) = (jet.velocity, jet.flow);
    let q_back = balance.ports[2].volume_flow;
    // Components that are rounding residue of the jet's momentum flux (the force
    // across the jet on a normal plate, cos 90° = 6e-17) are the 0 they stand for.
    let momentum_flux = rho * q * v;
    let clean = |x: f64| if x.abs() <= 1e-12 * momentum_flux { 0.0 } else { x };
    let force_normal = thrust.dot(into_plate);
    report.output("force_normal", force_normal);
    report.output("force_along_jet", clean(thrust.x));
    report.output("force_across_jet", clean(thrust.y));
    report.output("q_forward", q_forward);
    report.output("q_back", q_back);
    report.output("share_forward", q_forward / q);
    report.output("share_back", q_back / q);
    report.output("jet_velocity", v);
    report.output("jet_flow", q);
    report.output("mass_flow", rho * q);
    report.output("jet_momentum", rho * q * v);
    report.output("stagnation_pressure", 0.5 * rho * v * v);
    report.output("jet_power", 0.5 * rho * q * v * v);
    report.output("density", rho);
    report.check(
        "Force on the plate, normal to it",
        "closed form ρQV·sin θ (momentum normal to the plate, written by hand)",
        Q::Force,
        force_normal,
        momentum_flux * theta.sin(),
        1e-9,
        momentum_flux,
    );
    report.check(
        "Flow along the plate, forward branch",
        "closed form Q(1 + cos θ)/2 (mass and momentum along a frictionless plate)",
        Q::VolumeFlow,
        q_forward,
        q * (1.0 + theta.cos()) / 2.0,
        1e-9,
        q,
    );

    common::forward_warnings(&balance, report);
    if theta < 10.0 * PI / 180.0 {
        report.warn(
            Some("plate_angle"),
            "the jet nearly grazes the plate: almost all of it runs on forward and the normal force is small; a real jet spreads and may miss the plate",
        );
    }

    let system = report.system();
    report
        .solution
        .tables
        .push(split_table(&jet, theta, q_forward, q_back, system));
    report.solution.tables.push(common::ledger_table(&balance, system));
    report.solution.tables.push(common::ports_table(&balance, system));
    report.solution.tables.push(basis(values, &jet, theta, report));
    let diagram = diagram(&g, &jet, &balance, q_forward, report);
    report.solution.diagrams.push(diagram);
    Ok(())
}

fn split_table(jet: &Jet, theta: f64, q_forward: f64, q_back: f64, system: units::UnitSystem) -> Table {
    let unit = units::display_unit(jet.flow, Q::VolumeFlow, system).id;
    let flow = |x: f64| match units::convert_to(x, Q::VolumeFlow, unit) {
        Some(v) => units::format_significant(v, 5),
        None => "—".to_string(),
    };
    let share = |x: f64| units::format_significant(x, 5);
    let closed_forward = (1.0 + theta.cos()) / 2.0;
    let closed_back = (1.0 - theta.cos()) / 2.0;
    Table {
        key: "split",
        title: "Split of the flow along the plate (zero force along a frictionless plate)".to_string(),
        columns: vec![
            "Branch".to_string(),
            format!("flow ({unit})"),
            "share of the jet (balance)".to_string(),
            "share, closed form".to_string(),
        ],
        rows: vec![
            vec!["jet".to_string(), flow(jet.flow), "1".to_string(), "1".to_string()],
            vec![
                "forward, Q₁".to_string(),
                flow(q_forward),
                share(q_forward / jet.flow),
                format!("(1 + cos θ)/2 = {}", share(closed_forward)),
            ],
            vec![
                "back, Q₂".to_string(),
                flow(q_back),
                share(q_back / jet.flow),
                format!("(1 − cos θ)/2 = {}", share(closed_back)),
            ],
        ],
        emphasised_rows: Vec::new(),
    }
}

fn basis(values: &Values, jet: &Jet, theta: f64, report: &Report<'_>) -> Table {
    let speed = report.fmt(jet.velocity, Q::Velocity);
    let how = match values.choice("flow_given").unwrap_or("v") {
        "q" => format!("V = Q/A = {speed}"),
        "head" => format!(
            "V = Cv·√(2gH), Cv = {}: {speed}",
            units::format_significant(values.quantity_or("cv", 1.0), 4)
        ),
        "p" => format!(
            "V = Cv·√(2p/ρ), Cv = {}: {speed}",
            units::format_significant(values.quantity_or("cv", 1.0), 4)
        ),
        _ => format!("given: {speed}"),
    };
    common::basis_table(vec![
        ("Jet speed", how),
        ("Jet area", format!("πd²/4 = {}", report.fmt(jet.area, Q::Area))),
        (
            "Angle θ",
            format!(
                "{} between the jet axis and the plate surface (90° = normal plate)",
                report.fmt(theta, Q::Angle)
            ),
        ),
        (
            "Pressures",
            "atmospheric (gauge zero) at every port: a free jet".to_string(),
        ),
        (
            "Sheet speeds",
            "equal to the jet speed (Bernoulli, no friction, weight neglected)".to_string(),
        ),
        (
            "Force reported",
            "force the jet puts on the plate; the plate's supports supply the opposite".to_string(),
        ),
    ])
}

fn diagram(g: &Geometry, jet: &Jet, balance: &Balance, q_forward: f64, report: &Report<'_>) -> Diagram {
    let d = jet.diameter;
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
    let share_forward = q_forward / jet.flow;
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
    let v_text = report.fmt(jet.velocity, Q::Velocity);
    shapes.push(Shape::Arrow {
        from: [x0 + 0.5 * d, 1.4 * d],
        to: [x0 + 2.5 * d, 1.4 * d],
        label: format!("V = {v_text}"),
        style: ShapeStyle::Velocity,
    });
    let q_back = jet.flow - q_forward;
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
                units::format_significant(100.0 * flow / jet.flow, 3)
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
        caption: "Jet and plate to scale with the jet diameter; distances along the jet and the plate are schematic. The sheets along the plate are drawn with thicknesses in proportion to their flows, a 2-D picture of a round jet's 3-D spread. The force arrow is the force on the plate (normal to it); the support supplies the opposite.".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use crate::catalog::{Request, Solution};
    use crate::error::FieldErrorKind;
    use approx::assert_relative_eq;

    fn request(pairs: &[(&str, &str)]) -> Request {
        crate::catalog::demo_request(&super::spec(), pairs)
    }

    fn solve(pairs: &[(&str, &str)]) -> Solution {
        crate::calculators::testing::solved(super::KEY, pairs)
    }

    fn error_field(pairs: &[(&str, &str)]) -> (String, String) {
        crate::calculators::testing::first_error(super::KEY, pairs)
    }

    const WATER_1000: &[(&str, &str)] = &[("fluid", "custom"), ("rho", "1000 kg/m3"), ("mu", "1 mPa.s")];

    #[test]
    fn split_and_force_match_the_closed_forms_at_every_angle() {
        // Derived from the definition: Q1 = Q(1 + cos θ)/2, F_n = ρQV sin θ.
        for deg in [1.0f64, 10.0, 30.0, 45.0, 60.0, 75.0, 90.0] {
            let angle = format!("{deg} deg");
            let mut pairs = vec![
                ("plate_angle", angle.as_str()),
                ("flow_given", "v"),
                ("v", "20 m/s"),
                ("d_jet", "50 mm"),
            ];
            pairs.extend_from_slice(WATER_1000);
            let s = solve(&pairs);
            let theta = deg.to_radians();
            let q = std::f64::consts::PI * 0.05 * 0.05 / 4.0 * 20.0;
            let out = |k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
            assert_relative_eq!(out("share_forward"), (1.0 + theta.cos()) / 2.0, max_relative = 1e-9);
            assert_relative_eq!(out("q_back"), q * (1.0 - theta.cos()) / 2.0, max_relative = 1e-7);
            assert_relative_eq!(
                out("force_normal"),
                1000.0 * q * 20.0 * theta.sin(),
                max_relative = 1e-9
            );
            assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
            if deg == 90.0 {
                // A normal plate takes no force across the jet: not 1e-16 of ρQV.
                assert_eq!(out("force_across_jet"), 0.0);
            }
            // Components: F_x = F_n sin θ (towards the plate), F_y = −F_n cos θ.
            assert_relative_eq!(
                out("force_along_jet"),
                out("force_normal") * theta.sin(),
                max_relative = 1e-9
            );
        }
    }

    #[test]
    fn head_and_pressure_bases_give_the_same_jet() {
        // V = Cv·√(2gH) and V = Cv·√(2p/ρ) with p = ρgH: derived from the definition.
        let mut a = vec![("flow_given", "head"), ("head", "20 m"), ("cv", "0.95")];
        a.extend_from_slice(WATER_1000);
        let mut b = vec![("flow_given", "p"), ("p", "196.133 kPa"), ("cv", "0.95")];
        b.extend_from_slice(WATER_1000);
        let (sa, sb) = (solve(&a), solve(&b));
        let v = 0.95 * (2.0 * 9.80665 * 20.0f64).sqrt();
        assert_relative_eq!(
            sa.output("jet_velocity").map(|o| o.si).unwrap_or(0.0),
            v,
            max_relative = 1e-12
        );
        assert_relative_eq!(
            sb.output("jet_velocity").map(|o| o.si).unwrap_or(0.0),
            v,
            max_relative = 1e-9
        );
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let (field, message) = error_field(&[("flow_given", "q"), ("q", "-5 L/s")]);
        assert_eq!(field, "q");
        assert!(message.contains("at least"), "{message}");
        assert_eq!(error_field(&[("d_jet", "0 mm")]).0, "d_jet");
        assert_eq!(error_field(&[("plate_angle", "120 deg")]).0, "plate_angle");
        let (field, _) = error_field(&[("flow_given", "v"), ("v", "")]);
        assert_eq!(field, "v");
        match crate::solve(super::KEY, &request(&[("flow_given", "nozzle")])).result {
            Err(crate::SolveError::Fields(errors)) => {
                assert!(matches!(errors[0].kind, FieldErrorKind::UnknownChoice { .. }))
            }
            other => panic!("expected a choice error, got {other:?}"),
        }
    }

    #[test]
    fn demo_solves_with_a_diagram_and_tables() {
        let s = solve(&[]);
        assert_eq!(s.diagrams.len(), 1);
        assert!(s.tables.iter().any(|t| t.key == "split"));
        assert!(s.tables.iter().any(|t| t.key == "ledger"));
        assert!(s.output("force_normal").map(|o| o.si > 0.0).unwrap_or(false));
    }
}
