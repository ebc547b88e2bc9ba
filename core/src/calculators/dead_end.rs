//! Dead end, cap, blind flange, plug or closed valve: the thrust of the pressure on
//! a closed end of a pipe.
//!
//! # Method
//! A control volume is drawn around the fluid in the last length of pipe, cut at
//! one face (1) upstream of the closure. Nothing flows through it, so the
//! linear-momentum balance ([`crate::engine`]) reduces to a balance of forces:
//!
//! R + p·A·(−n₁) = 0, with n₁ = −x the outward normal of the face,
//!
//! so the supports must supply R = −p·A·x̂ and the closure pushes on them with
//!
//! T = p·A, along the pipe axis, towards the closure.
//!
//! This is the dead-end formula of the published thrust-restraint guides (e.g. the
//! ductile-iron pipe industry's *Thrust Restraint Design for Ductile Iron Pipe*,
//! AWWA Manual M41 and M11, each listing T = P·A for a dead end).
//!
//! # Area basis
//! The area follows the joint (`joint`): the inside diameter (`flanged`, `welded`:
//! a welded, flanged or fused line, where the joint seals on the bore), or the
//! outside diameter `od` (`push_on`, `mechanical`, `restrained`: push-on and
//! mechanical joints, restrained or not: they seal on the spigot's outside, so the
//! pressure acts over the outside diameter of the sealing joint, as those guides
//! use it). The engine's thrust is checked against p·π·d²/4 on the diameter used
//! ([`Report::check`]). Both
//! thrusts are reported when both diameters are given; the output says which one is
//! the headline.
//!
//! # Code
//! [`read`] reads the values once into typed [`Inputs`], [`solve`] is the pure
//! model (the engine's balance of the still liquid), and the report is built from
//! its [`Solved`] result.
//!
//! # Assumptions
//! Gauge pressure, uniform over the face; still fluid; the weight of the fluid and
//! of the closure is carried by the pipe supports, not by the thrust restraint.

use crate::catalog::{
    CalculatorSpec, ChoiceOption, Diagram, FieldSpec, Limits, OutputSpec, Report, Shape, ShapeStyle, Values,
};
use crate::engine::{self, si, ControlVolume, EngineWarning, Port};
use crate::error::{FieldError, FieldErrors};
use crate::restraint::Joint;
use crate::units::QuantityKind as Q;
use crate::vector::{Direction, Vec3};
use uom::si::f64::{Length, Pressure};

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};

pub const KEY: &str = "dead-end";
/// The page title.
pub const TITLE: &str = "Thrust at a dead end, cap or closed valve";

const CLOSURE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "cap",
        label: "Cap or plug",
    },
    ChoiceOption {
        key: "blind_flange",
        label: "Blind flange",
    },
    ChoiceOption {
        key: "closed_valve",
        label: "Closed valve (line beyond it empty or open)",
    },
];

pub fn spec() -> CalculatorSpec {
    let fields = vec![
        choice(
            "closure",
            "Closure",
            CLOSURE_OPTIONS,
            "blind_flange",
            "The thrust is the same for each; a closed valve carries it only while the line beyond is empty or \
                    open to air.",
        ),
        quantity(
            "p",
            "Gauge pressure",
            Q::Pressure,
            "bar",
            "psi",
            "12 bar",
            Limits::closed(0.0, MAX_PRESSURE_PA),
            "The design pressure: the highest the line will see, including test pressure and surge. Gauge, so \
                    not below 0.",
        ),
        quantity(
            "d",
            "Pipe inside diameter",
            Q::Length,
            "mm",
            "in",
            "204 mm",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            "Bore of the pipe at the closure.",
        ),
        choice(
            "joint",
            "Joint at the closure (thrust area)",
            crate::restraint::Joint::OPTIONS,
            "push_on",
            crate::restraint::JOINT_HELP,
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "od",
                "Pipe outside diameter",
                Q::Length,
                "mm",
                "in",
                "222 mm",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Needed for push-on and mechanical joints (the outside-diameter basis); with it the \
                        inside-diameter thrust is shown as well.",
            )
        },
    ];
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "Thrust p·A on a cap, blind flange, plug or closed valve, on the inside or outside diameter.",
        fields,
        outputs: vec![
            OutputSpec::headline(
                "thrust",
                "Thrust on the supports, along the axis towards the closure",
                Q::Force,
            ),
            OutputSpec::listed("area", "Thrust area used", Q::Area),
            OutputSpec::listed("diameter_used", "Diameter the thrust area is based on", Q::Length),
            OutputSpec::listed("thrust_id", "Thrust on the inside diameter, p·π·d²/4", Q::Force),
            OutputSpec::listed("thrust_od", "Thrust on the outside diameter, p·π·D²/4", Q::Force),
        ],
        cautions: vec![
            "A closed valve must be restrained on the side that can lose its pressure; a valve in a chamber \
                    needs its own anchor.",
            "Caps and blind flanges are often removed later to extend the line: the restraint must stay until \
                    the line is depressurised.",
        ],
    }
}

/// The page's inputs, validated.
#[derive(Clone, Debug)]
pub struct Inputs {
    /// Gauge pressure.
    pub p: Pressure,
    /// Bore.
    pub d: Length,
    /// Outside diameter, when given.
    pub od: Option<Length>,
    pub joint: Joint,
    pub closure: &'static str,
}

/// Reads the page's values once.
///
/// # Errors
/// Each bad field by name.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let p = values.typed("p")?;
    let d: Length = values.typed("d")?;
    let joint =
        Joint::from_key(values.choice("joint")?).ok_or_else(|| FieldError::inconsistent("joint", "unknown joint"))?;
    let closure_key = values.choice("closure")?;
    let closure = CLOSURE_OPTIONS
        .iter()
        .find(|o| o.key == closure_key)
        .map(|o| o.key)
        .ok_or_else(|| FieldError::inconsistent("closure", "unknown closure"))?;
    let od: Option<Length> = values.typed_opt("od");
    if od.is_some_and(|od| od <= d) {
        return Err(
            FieldError::inconsistent("od", "the outside diameter must be larger than the inside diameter").into(),
        );
    }
    if joint.uses_od() && od.is_none() {
        return Err(FieldError::inconsistent(
            "od",
            "an outside diameter is required: push-on and mechanical joints take the thrust area on it",
        )
        .into());
    }
    Ok(Inputs {
        p,
        d,
        od,
        joint,
        closure,
    })
}

/// The solved dead end.
#[derive(Clone, Debug)]
pub struct Solved {
    /// The diameter the thrust acts on, m.
    pub d_used: f64,
    pub area: f64,
    pub balance: engine::Balance,
}

/// The pure model: the balance of the still fluid against the closure.
///
/// # Errors
/// An engine refusal, on `p`.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let d_used = match (inputs.joint.uses_od(), inputs.od) {
        (true, Some(od)) => od.value,
        _ => inputs.d.value,
    };
    let area = common::circle_area(d_used);
    // The face is cut upstream of the closure; the flow would move towards it (+x).
    let mut cv = ControlVolume::new(crate::fluid::Fluid {
        name: "liquid at rest".to_string(),
        density: 1000.0,
        viscosity: 1e-3,
        vapour_pressure: None,
    });
    cv.port(
        Port::inlet("pipe face", si::area(area), Direction::X)
            .velocity(si::velocity(0.0))
            .pressure(si::pressure(inputs.p.value))
            .at(Vec3::ZERO),
    );
    let balance = engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, "p")))?;
    Ok(Solved { d_used, area, balance })
}

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, read, solve, write)
}

/// The report, built from the solved model.
fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (p, d, closure) = (inputs.p.value, inputs.d.value, inputs.closure);
    let d_od = inputs.od.map(|od| od.value);
    let Solved { d_used, area, balance } = solved;
    let (d_used, area) = (*d_used, *area);
    let basis_text = if inputs.joint.uses_od() {
        "outside diameter (push-on or mechanical joint)"
    } else {
        "inside diameter (the bore)"
    };
    let thrust = balance.thrust();

    report.output("thrust", thrust.norm());
    report.check(
        "Thrust on the supports",
        "closed form p·A on the area basis (p·π·d²/4)",
        Q::Force,
        thrust.norm(),
        p * std::f64::consts::PI * d_used * d_used / 4.0,
        1e-12,
        0.0,
    );
    report.output("area", area);
    report.output("diameter_used", d_used);
    report.output("thrust_id", p * common::circle_area(d));
    if let Some(od) = d_od {
        report.output("thrust_od", p * common::circle_area(od));
    }
    for w in &balance.warnings {
        // With nothing flowing the momentum flux is zero by definition; say nothing.
        if !matches!(w, EngineWarning::MomentumNegligible { .. }) {
            report.warn(None, w.to_string());
        }
    }
    if p == 0.0 {
        report.warn(Some("p"), "at zero gauge pressure there is no thrust");
    }
    if closure == "closed_valve" {
        report.warn(
            Some("closure"),
            "a closed valve carries this thrust only while the line beyond it is empty or open; with equal \
                    pressure on both sides it carries none",
        );
    }

    let system = report.system();
    let closure_label = CLOSURE_OPTIONS
        .iter()
        .find(|o| o.key == closure)
        .map(|o| o.label)
        .unwrap_or(closure);
    report.table(|report| {
        common::basis_table(vec![
            ("Closure", closure_label.to_string()),
            ("Thrust area basis", basis_text.to_string()),
            ("Diameter used", report.fmt(d_used, Q::Length)),
            ("Thrust area", report.fmt(area, Q::Area)),
            ("Formula", "T = p·A (no flow, so no momentum flux)".to_string()),
        ])
    });
    report.table(|_| common::ledger_table(balance, system));
    report.diagram(|report| diagram(d, d_od, d_used, closure, balance, report));
    let carry = common::thrust_carry_over(report, "Size a thrust block for this dead end", thrust.norm(), 0.0);
    report.solution.carry_over.push(carry);
}

fn diagram(
    d: f64,
    d_od: Option<f64>,
    d_used: f64,
    closure: &str,
    balance: &engine::Balance,
    report: &Report<'_>,
) -> Diagram {
    let od = d_od.unwrap_or(d * 1.08);
    let lead = 3.0 * od;
    let mut shapes = vec![
        Shape::Polygon {
            points: common::straight_band([-lead, 0.0], [0.0, 0.0], od),
            style: ShapeStyle::Wall,
        },
        Shape::Polygon {
            points: common::straight_band([-lead, 0.0], [0.0, 0.0], d),
            style: ShapeStyle::Fluid,
        },
    ];
    match closure {
        "blind_flange" => {
            // Pipe flange and blind flange, about 1.6 × OD across.
            let f = 1.6 * od;
            let t = 0.15 * od;
            shapes.push(Shape::Polygon {
                points: common::straight_band([-t, 0.0], [0.0, 0.0], f),
                style: ShapeStyle::Wall,
            });
            shapes.push(Shape::Polygon {
                points: common::straight_band([0.0, 0.0], [t, 0.0], f),
                style: ShapeStyle::Wall,
            });
        }
        "closed_valve" => {
            // A gate valve body drawn as a bow-tie.
            let l = 1.0 * od;
            shapes.push(Shape::Polygon {
                points: vec![[0.0, od / 2.0], [l, -od / 2.0], [l, od / 2.0], [0.0, -od / 2.0]],
                style: ShapeStyle::Wall,
            });
        }
        _ => {
            let t = 0.12 * od;
            shapes.push(Shape::Polygon {
                points: common::straight_band([0.0, 0.0], [t, 0.0], od),
                style: ShapeStyle::Wall,
            });
        }
    }
    // Control volume: the fluid in the last length of pipe, cut at the face.
    let cv_start = -2.0 * od;
    shapes.push(Shape::Polygon {
        points: common::straight_band([cv_start, 0.0], [0.0, 0.0], d * 1.15),
        style: ShapeStyle::ControlVolume,
    });
    shapes.push(Shape::Polyline {
        points: vec![[-lead, 0.0], [0.3 * od, 0.0]],
        style: ShapeStyle::Guide,
    });
    // The thrust diameter, marked across the end.
    shapes.push(Shape::Polyline {
        points: vec![[0.02 * od, -d_used / 2.0], [0.02 * od, d_used / 2.0]],
        style: ShapeStyle::Guide,
    });
    let thrust = balance.thrust();
    let scale = if thrust.norm() > 0.0 {
        1.5 * od / thrust.norm()
    } else {
        0.0
    };
    let end = [0.3 * od, 0.0];
    let fmt = report.fmt(thrust.norm(), Q::Force);
    if let Some(face) = balance.ports.first() {
        if let Some(a) = common::force_arrow(
            [cv_start, 0.0],
            face.pressure_force,
            scale,
            format!("p·A {fmt}"),
            ShapeStyle::Pressure,
            false,
        ) {
            shapes.push(a);
        }
    }
    common::thrust_and_restraint_arrows(
        &mut shapes,
        end,
        [end[0] + 1.5 * od + 0.3 * od, -0.6 * od],
        thrust,
        scale,
        &fmt,
    );
    shapes.push(Shape::Text {
        at: [-lead, -od],
        text: format!("thrust diameter {}", report.fmt(d_used, Q::Length)),
        style: ShapeStyle::Label,
    });
    let mut bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.4 * od);
    // Room for the labels at the arrow heads on the right.
    bounds[2] += 1.2 * od;
    Diagram {
        title: "Dead end: control volume and forces".to_string(),
        bounds,
        shapes,
        caption: "Pipe and closure to scale; the force arrows share one scale. T acts on the supports, towards the \
                closure; R = −T is what the restraint supplies."
            .to_string(),
    }
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn thrust_is_pressure_times_the_chosen_area() {
        // Derived from the definition: T = p·π·D²/4.
        let s = outcome(&[("p", "10 bar"), ("d", "300 mm"), ("od", "326 mm"), ("joint", "push_on")])
            .result
            .expect("solves");
        let od_area = std::f64::consts::PI * 0.326 * 0.326 / 4.0;
        assert_relative_eq!(s.output("thrust").unwrap().si, 1e6 * od_area, max_relative = 1e-12);
        assert_relative_eq!(s.output("area").unwrap().si, od_area, max_relative = 1e-12);
        let id = outcome(&[("p", "10 bar"), ("d", "300 mm"), ("joint", "flanged"), ("od", "")])
            .result
            .expect("solves");
        assert_relative_eq!(
            id.output("thrust").unwrap().si,
            1e6 * std::f64::consts::PI * 0.09 / 4.0,
            max_relative = 1e-12
        );
        assert!(id.output("thrust_od").is_none());
        assert_eq!(id.carry_over[0].calculator, "thrust-block");
    }

    #[test]
    fn carried_thrust_opens_the_thrust_block_page_with_the_same_force() {
        let s = outcome(&[]).result.expect("solves");
        assert_eq!(s.carry_over[0].calculator, "thrust-block");
        let (block, _) = crate::calculators::testing::carried(&s);
        assert_relative_eq!(
            block.output("thrust").unwrap().si,
            s.output("thrust").unwrap().si,
            max_relative = 1e-4
        );
    }

    #[test]
    fn bad_inputs_name_their_field() {
        assert_eq!(error_field(&[("p", "-1 bar")]), "p");
        assert_eq!(error_field(&[("d", "0 mm")]), "d");
        assert_eq!(error_field(&[("od", "100 mm")]), "od");
        assert_eq!(error_field(&[("joint", "push_on"), ("od", "")]), "od");
    }

    #[test]
    fn demo_matches_the_method_note_worked_example() {
        // site/notes/dead-end.md works the demo by hand: 46.45 kN on the outside
        // diameter, 39.22 kN on the bore.
        let s = outcome(&[]).result.expect("solves");
        assert_relative_eq!(s.output("thrust").unwrap().si, 46.45e3, max_relative = 2e-4);
        assert_relative_eq!(s.output("thrust_id").unwrap().si, 39.22e3, max_relative = 2e-4);
    }
}
