//! Pieces shared by the calculators: the fluid and flow fields, the ledger tables,
//! engine-error mapping and drawing helpers. Nothing here is specific to one fitting.

use crate::catalog::{ChoiceOption, FieldKind, FieldSpec, Limits, Report, Shape, ShapeStyle, Table, Values};
use crate::engine::{Balance, EngineError, EngineWarning, FlowSpec, Role};
use crate::error::FieldError;
use crate::fluid::{Fluid, FluidError, ZERO_CELSIUS};
use crate::units::{self, QuantityKind, UnitSystem};
use crate::vector::Vec3;

use QuantityKind as Q;

/// A quantity field with the usual defaults; adjust with struct update syntax.
pub const fn quantity(
    key: &'static str,
    label: &'static str,
    kind: QuantityKind,
    si_unit: &'static str,
    us_unit: &'static str,
    demo: &'static str,
    limits: Limits,
    help: &'static str,
) -> FieldSpec {
    FieldSpec {
        key,
        label,
        kind: FieldKind::Quantity(kind),
        si_unit,
        us_unit,
        demo,
        limits: Some(limits),
        optional: false,
        help,
        visible_when: None,
    }
}

/// A choice field.
pub const fn choice(
    key: &'static str,
    label: &'static str,
    options: &'static [ChoiceOption],
    demo: &'static str,
    help: &'static str,
) -> FieldSpec {
    FieldSpec {
        key,
        label,
        kind: FieldKind::Choice(options),
        si_unit: "",
        us_unit: "",
        demo,
        limits: None,
        optional: false,
        help,
        visible_when: None,
    }
}

/// Upper bound used for sizes: 10 m is larger than any pipe this handbook covers.
pub const MAX_SIZE_M: f64 = 10.0;

/// Smallest pipe diameter or bend radius the fitting pages accept, m (1 mm).
pub const MIN_SIZE_M: f64 = 1e-3;
/// Upper bound for gauge pressures: 100 MPa (≈ 14 500 psi).
pub const MAX_PRESSURE_PA: f64 = 100e6;

pub const FLUID_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "water",
        label: "Water (from temperature)",
    },
    ChoiceOption {
        key: "custom",
        label: "Other liquid (density and viscosity)",
    },
];

/// The fluid fields: `fluid` (water/custom), `t`, `rho`, `mu`.
pub fn fluid_fields(demo_temperature: &'static str) -> Vec<FieldSpec> {
    vec![
        choice(
            "fluid",
            "Fluid",
            FLUID_OPTIONS,
            "water",
            "Water properties come from the temperature; choose 'other liquid' to type density and viscosity.",
        ),
        FieldSpec {
            visible_when: Some(("fluid", &["water"])),
            // Required while shown; a hidden field is neither required nor checked.
            ..quantity(
                "t",
                "Water temperature",
                Q::Temperature,
                "degC",
                "degF",
                demo_temperature,
                Limits::closed(ZERO_CELSIUS, ZERO_CELSIUS + 99.9),
                "Liquid water at atmospheric pressure, 0 to 99.9 degC (32 to 211.8 degF).",
            )
        },
        FieldSpec {
            visible_when: Some(("fluid", &["custom"])),
            ..quantity(
                "rho",
                "Density",
                Q::Density,
                "kg/m3",
                "lb/ft3",
                "",
                Limits::closed(50.0, 25_000.0),
                "Density of the liquid, from 50 kg/m³ (cryogenic liquids) to 25 000 kg/m³.",
            )
        },
        FieldSpec {
            visible_when: Some(("fluid", &["custom"])),
            ..quantity(
                "mu",
                "Dynamic viscosity",
                Q::DynamicViscosity,
                "mPa.s",
                "lb/(ft.s)",
                "",
                Limits::closed(1e-6, 1e3),
                "Used for warnings and friction only; it does not change the momentum balance. From 0.001 mPa·s to 10⁶ mPa·s.",
            )
        },
    ]
}

/// Reads the fluid fields.
pub fn fluid_from(values: &Values) -> Result<Fluid, Vec<FieldError>> {
    match values.choice("fluid").map_err(|e| vec![e])? {
        "custom" => {
            let mut errors = Vec::new();
            if !values.is_set("rho") {
                errors.push(FieldError::inconsistent(
                    "rho",
                    "a density is required for another liquid",
                ));
            }
            if !values.is_set("mu") {
                errors.push(FieldError::inconsistent(
                    "mu",
                    "a viscosity is required for another liquid",
                ));
            }
            if !errors.is_empty() {
                return Err(errors);
            }
            let density = values.quantity_or("rho", 1000.0);
            let viscosity = values.quantity_or("mu", 1e-3);
            Ok(Fluid {
                name: "custom liquid".to_string(),
                density,
                viscosity,
                vapour_pressure: None,
            })
        }
        _ => {
            let t = values.quantity("t").map_err(|e| vec![e])?;
            Fluid::water_kelvin(t).map_err(|e| match e {
                FluidError::BelowFreezing { .. } | FluidError::AtOrAboveSaturation { .. } => {
                    vec![FieldError::inconsistent("t", e.to_string())]
                }
                FluidError::InvalidProperty { .. } => vec![FieldError::inconsistent("t", e.to_string())],
            })
        }
    }
}

pub const FLOW_BASIS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "q",
        label: "Volumetric flow",
    },
    ChoiceOption {
        key: "v",
        label: "Mean velocity at the inlet",
    },
    ChoiceOption {
        key: "mdot",
        label: "Mass flow",
    },
];

/// The flow fields: the glossary's `flow_given` and one of `q`, `v`, `mdot`.
pub fn flow_given_fields(demo_q: &'static str) -> Vec<FieldSpec> {
    flow_fields_keyed(FLOW_GIVEN, demo_q)
}

/// The flow fields under the retired key `flow_basis` (the tee's, until its keys
/// move to the glossary: old links are read through [`crate::glossary::upgrade`]).
pub fn flow_fields(demo_q: &'static str) -> Vec<FieldSpec> {
    flow_fields_keyed("flow_basis", demo_q)
}

/// The glossary key of how the flow is given.
pub const FLOW_GIVEN: &str = "flow_given";

fn flow_fields_keyed(key: &'static str, demo_q: &'static str) -> Vec<FieldSpec> {
    // `visible_when` needs a `'static` key: the two keys in use are spelled out.
    let on =
        |options: &'static [&'static str]| -> Option<(&'static str, &'static [&'static str])> { Some((key, options)) };
    vec![
        choice(
            key,
            "Flow given as",
            FLOW_BASIS_OPTIONS,
            "q",
            "How the flow is given; zero flow is allowed (a full, still line under pressure).",
        ),
        FieldSpec {
            visible_when: on(&["q"]),
            ..quantity(
                "q",
                "Volumetric flow",
                Q::VolumeFlow,
                "m3/h",
                "gpm",
                demo_q,
                Limits::closed(0.0, 1e3),
                "Flow through the fitting's inlet.",
            )
        },
        FieldSpec {
            visible_when: on(&["v"]),
            ..quantity(
                "v",
                "Mean velocity at the inlet",
                Q::Velocity,
                "m/s",
                "ft/s",
                "",
                Limits::closed(0.0, 100.0),
                "Mean velocity in the inlet pipe.",
            )
        },
        FieldSpec {
            visible_when: on(&["mdot"]),
            ..quantity(
                "mdot",
                "Mass flow",
                Q::MassFlow,
                "kg/s",
                "lb/s",
                "",
                Limits::closed(0.0, 1e6),
                "Mass flow through the inlet.",
            )
        },
    ]
}

/// Reads the flow fields of [`flow_given_fields`] into an engine flow spec for the
/// inlet.
pub fn flow_given_from(values: &Values) -> Result<FlowSpec, Vec<FieldError>> {
    flow_from_keyed(values, FLOW_GIVEN)
}

/// Reads the flow fields of [`flow_fields`] (retired key `flow_basis`).
pub fn flow_from(values: &Values) -> Result<FlowSpec, Vec<FieldError>> {
    flow_from_keyed(values, "flow_basis")
}

fn flow_from_keyed(values: &Values, key: &str) -> Result<FlowSpec, Vec<FieldError>> {
    let basis = values.choice(key).map_err(|e| vec![e])?;
    let need = |key: &'static str| {
        if values.is_set(key) {
            Ok(values.quantity_or(key, 0.0))
        } else {
            Err(vec![FieldError::inconsistent(
                key,
                "a value is required for the chosen flow basis",
            )])
        }
    };
    Ok(match basis {
        "v" => FlowSpec::Velocity(need("v")?),
        "mdot" => FlowSpec::MassFlow(need("mdot")?),
        _ => FlowSpec::VolumeFlow(need("q")?),
    })
}

/// Maps an engine error onto the field most responsible for it.
pub fn engine_error(err: EngineError, field: &'static str) -> Vec<FieldError> {
    vec![FieldError::inconsistent(field, err.to_string())]
}

/// Copies engine warnings into the report.
pub fn forward_warnings(balance: &Balance, report: &mut Report<'_>) {
    for w in &balance.warnings {
        let field = match w {
            EngineWarning::BelowVapourPressure { .. } => Some("p"),
            _ => None,
        };
        report.warn(field, w.to_string());
    }
}

/// Warns when a pipe velocity is outside the usual design range for water lines.
/// Common practice, no single source: about 0.5–3 m/s in mains, up to about 5 m/s in
/// plant and fire-water piping; faster lines see erosion, noise and larger surges.
pub fn pipe_velocity_warning(report: &mut Report<'_>, field: &'static str, place: &str, speed: f64) {
    if speed > 5.0 {
        let text = report.fmt(speed, Q::Velocity);
        report.warn(Some(field), format!("the velocity at the {place} is {text}, above the usual 3 to 5 m/s for water piping: check erosion, noise and surge (common practice)"));
    }
}

/// The unit a table column of forces is shown in: chosen from the largest magnitude.
fn table_unit(max_abs: f64, kind: QuantityKind, system: UnitSystem) -> &'static str {
    units::display_unit(max_abs, kind, system).id
}

fn cell(value: f64, kind: QuantityKind, unit: &str) -> String {
    match units::convert_to(value, kind, unit) {
        Some(v) => units::format_significant(v, 4),
        None => "—".to_string(),
    }
}

/// The momentum ledger: every term of the support-force equation per port, the
/// weight and storage terms, the total force the supports supply and the thrust on
/// the supports. It shows the terms of one balance, so it has no residual row (the
/// total is defined by the sum and would close by algebra); the independent checks
/// are in the `checks` table (see `Report::check`).
pub fn ledger_table(balance: &Balance, system: UnitSystem) -> Table {
    let mut rows: Vec<(String, Vec3)> = Vec::new();
    for p in &balance.ports {
        let role = if p.role == Role::Inlet { "in" } else { "out" };
        rows.push((format!("{} ({role}): pressure, p·A·n", p.name), -p.pressure_force));
        rows.push((format!("{} ({role}): momentum flux, ±ṁβV", p.name), p.momentum_outflow));
    }
    if balance.fluid_weight.norm() > 0.0 {
        rows.push(("fluid inside: weight, −W".to_string(), -balance.fluid_weight));
    }
    for e in &balance.extra_forces {
        rows.push((format!("{}: −F", e.name), -e.force));
    }
    if balance.momentum_storage.norm() > 0.0 {
        rows.push(("storage: dP/dt".to_string(), balance.momentum_storage));
    }
    let total_index = rows.len();
    rows.push((
        "R = force the supports exert on the fitting (sum)".to_string(),
        balance.support_force,
    ));
    rows.push(("T = thrust on the supports, −R".to_string(), balance.thrust()));
    let max = rows.iter().map(|(_, v)| v.norm()).fold(0.0, f64::max);
    let unit = table_unit(max, Q::Force, system);
    let mut table = Table {
        key: "ledger",
        title: "Momentum ledger: the terms of one balance, R = Σ p·A·n + Σ ±ṁβV − W − ΣF + dP/dt (R is their sum, so this table cannot disagree with itself; the checks table compares results with independent paths)".to_string(),
        columns: vec![
            "Term".to_string(),
            format!("x ({unit})"),
            format!("y ({unit})"),
            format!("z ({unit})"),
            format!("magnitude ({unit})"),
        ],
        rows: Vec::new(),
        emphasised_rows: vec![total_index, total_index + 1],
    };
    // A component of a term that is rounding residue of sines and cosines (1e-12 of
    // the largest term) is shown as the 0 it is.
    let component = |c: f64| if c.abs() < 1e-12 * max { 0.0 } else { c };
    for (label, v) in rows {
        table.rows.push(vec![
            label,
            cell(component(v.x), Q::Force, unit),
            cell(component(v.y), Q::Force, unit),
            cell(component(v.z), Q::Force, unit),
            cell(v.norm(), Q::Force, unit),
        ]);
    }
    table
}

/// The port table: size, flow, velocity and pressure at every port. When every flow
/// was given (none solved by the mass balance) a last row shows how far the given
/// flows are from balancing: a real check, which the engine also raises as a
/// warning beyond 1e-6. When a flow was solved, that row would be zero by algebra
/// and is left out; the solved port is marked instead.
pub fn ports_table(balance: &Balance, system: UnitSystem) -> Table {
    let area_unit = table_unit(
        balance.ports.iter().map(|p| p.area).fold(0.0, f64::max),
        Q::Area,
        system,
    );
    let flow_unit = table_unit(
        balance.ports.iter().map(|p| p.volume_flow).fold(0.0, f64::max),
        Q::VolumeFlow,
        system,
    );
    let speed_unit = table_unit(1.0, Q::Velocity, system);
    let p_unit = table_unit(
        balance.ports.iter().map(|p| p.pressure.abs()).fold(0.0, f64::max),
        Q::Pressure,
        system,
    );
    let mass_unit = table_unit(1.0, Q::MassFlow, system);
    let mut table = Table {
        key: "ports",
        title: if balance.solved_flow.is_some() {
            "Ports: state (the port marked \"flow solved\" takes the flow that closes the mass balance)".to_string()
        } else {
            "Ports: state, and the mass balance of the given flows".to_string()
        },
        columns: vec![
            "Port".to_string(),
            format!("area ({area_unit})"),
            format!("flow ({flow_unit})"),
            format!("mass flow ({mass_unit})"),
            format!("mean velocity ({speed_unit})"),
            format!("gauge pressure ({p_unit})"),
        ],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
    };
    for (index, p) in balance.ports.iter().enumerate() {
        let role = if p.role == Role::Inlet { "in" } else { "out" };
        let solved = if balance.solved_flow == Some(index) {
            ", flow solved"
        } else {
            ""
        };
        table.rows.push(vec![
            format!("{} ({role}{solved})", p.name),
            cell(p.area, Q::Area, area_unit),
            cell(p.volume_flow, Q::VolumeFlow, flow_unit),
            cell(p.mass_flow, Q::MassFlow, mass_unit),
            cell(p.speed, Q::Velocity, speed_unit),
            cell(p.pressure, Q::Pressure, p_unit),
        ]);
    }
    if balance.solved_flow.is_none() {
        table.rows.push(vec![
            "given flows: Σout − Σin (+ storage)".to_string(),
            String::new(),
            String::new(),
            cell(balance.mass_residual, Q::MassFlow, mass_unit),
            String::new(),
            String::new(),
        ]);
        table.emphasised_rows.push(table.rows.len() - 1);
    }
    table
}

/// Area of a circle of diameter `d`.
pub fn circle_area(d: f64) -> f64 {
    std::f64::consts::PI * d * d / 4.0
}

/// A force arrow ending at (or starting from) `at`, scaled by `scale` metres per
/// newton, labelled with its formatted magnitude.
pub fn force_arrow(
    at: [f64; 2],
    force: Vec3,
    scale: f64,
    label: String,
    style: ShapeStyle,
    tail_at_point: bool,
) -> Option<Shape> {
    let dx = force.x * scale;
    let dy = force.y * scale;
    if !(dx.is_finite() && dy.is_finite()) || (dx * dx + dy * dy).sqrt() < 1e-9 {
        return None;
    }
    let (from, to) = if tail_at_point {
        (at, [at[0] + dx, at[1] + dy])
    } else {
        ([at[0] - dx, at[1] - dy], at)
    };
    Some(Shape::Arrow { from, to, label, style })
}

/// Points of the two walls of a curved pipe of diameter `d` following an arc of
/// radius `r` about `center`, from angle `a0` to `a1` (radians), as one closed
/// polygon (outer wall out, inner wall back).
pub fn arc_band(center: [f64; 2], r: f64, d: f64, a0: f64, a1: f64, steps: usize) -> Vec<[f64; 2]> {
    let mut pts = Vec::with_capacity(2 * steps + 2);
    for i in 0..=steps {
        let a = a0 + (a1 - a0) * i as f64 / steps as f64;
        pts.push([center[0] + (r + d / 2.0) * a.cos(), center[1] + (r + d / 2.0) * a.sin()]);
    }
    for i in (0..=steps).rev() {
        let a = a0 + (a1 - a0) * i as f64 / steps as f64;
        pts.push([center[0] + (r - d / 2.0) * a.cos(), center[1] + (r - d / 2.0) * a.sin()]);
    }
    pts
}

/// A straight pipe band from `a` to `b` of diameter `d` (closed polygon).
pub fn straight_band(a: [f64; 2], b: [f64; 2], d: f64) -> Vec<[f64; 2]> {
    let (dx, dy) = (b[0] - a[0], b[1] - a[1]);
    let len = (dx * dx + dy * dy).sqrt().max(1e-12);
    let (nx, ny) = (-dy / len * d / 2.0, dx / len * d / 2.0);
    vec![
        [a[0] + nx, a[1] + ny],
        [b[0] + nx, b[1] + ny],
        [b[0] - nx, b[1] - ny],
        [a[0] - nx, a[1] - ny],
    ]
}

/// Bounds of a set of points with a margin.
pub fn bounds_of(points: impl IntoIterator<Item = [f64; 2]>, margin: f64) -> [f64; 4] {
    let mut b = [f64::INFINITY, f64::INFINITY, f64::NEG_INFINITY, f64::NEG_INFINITY];
    for p in points {
        if p[0].is_finite() && p[1].is_finite() {
            b[0] = b[0].min(p[0]);
            b[1] = b[1].min(p[1]);
            b[2] = b[2].max(p[0]);
            b[3] = b[3].max(p[1]);
        }
    }
    if !b.iter().all(|x| x.is_finite()) {
        return [-1.0, -1.0, 1.0, 1.0];
    }
    [b[0] - margin, b[1] - margin, b[2] + margin, b[3] + margin]
}

/// Every point a shape touches (for bounds).
pub fn shape_points(shape: &Shape) -> Vec<[f64; 2]> {
    match shape {
        Shape::Polygon { points, .. } | Shape::Polyline { points, .. } => points.clone(),
        Shape::Circle { center, radius, .. } => {
            vec![
                [center[0] - radius, center[1] - radius],
                [center[0] + radius, center[1] + radius],
            ]
        }
        Shape::Arrow { from, to, .. } => vec![*from, *to],
        Shape::Text { at, .. } => vec![*at],
    }
}

/// The key of the flow field the user filled (`q`, `v` or `mdot`), for warnings;
/// read from `flow_given`, or from the retired `flow_basis` of the tee.
pub fn flow_field(values: &Values) -> &'static str {
    let given = values.choice(FLOW_GIVEN).or_else(|_| values.choice("flow_basis"));
    match given.unwrap_or("q") {
        "v" => "v",
        "mdot" => "mdot",
        _ => "q",
    }
}

/// A force typed as a user would type it, in the report's unit system, five
/// significant figures (`"83.47 kN"`), for carrying a result to another page.
pub fn typed_force(report: &Report<'_>, newtons: f64) -> String {
    let unit = units::display_unit(newtons, Q::Force, report.system());
    match units::convert_to(newtons, Q::Force, unit.id) {
        Some(v) if v.is_finite() => format!("{} {}", units::format_significant(v, 5), unit.id),
        _ => format!("{} N", units::format_significant(newtons, 5)),
    }
}

/// A link that carries a fitting's thrust to the thrust-restraint page as "a given
/// thrust": its magnitude (N) and its angle above the horizontal (radians, + up),
/// which also picks that page's block type (bearing block, gravity block, sag).
pub fn thrust_carry_over(report: &Report<'_>, label: &str, thrust: f64, elevation: f64) -> crate::catalog::CarryOver {
    let degrees = if elevation.is_finite() {
        elevation.to_degrees()
    } else {
        0.0
    };
    let plane = if degrees > 1.0 {
        "vertical_crest"
    } else if degrees < -1.0 {
        "vertical_sag"
    } else {
        "horizontal"
    };
    crate::catalog::CarryOver {
        calculator: "thrust-block",
        label: label.to_string(),
        inputs: vec![
            ("fitting", "force".to_string()),
            ("thrust", typed_force(report, thrust)),
            ("thrust_elev", format!("{} deg", units::format_significant(degrees, 4))),
            ("plane", plane.to_string()),
        ],
    }
}

/// A two-column table of what the result is based on (area basis, loss model, ...),
/// so the choices that change the answer are shown beside it.
pub fn basis_table(rows: Vec<(&str, String)>) -> Table {
    Table {
        key: "basis",
        title: "Basis of the result".to_string(),
        columns: vec!["Item".to_string(), "Used".to_string()],
        rows: rows.into_iter().map(|(k, v)| vec![k.to_string(), v]).collect(),
        emphasised_rows: Vec::new(),
    }
}

/// The thrust-area basis of a fitting page: the bore only for joints that seal on
/// it (welded, flanged, fused); the outside diameter for push-on and mechanical
/// joints, restrained or not, whose gasket seals on the spigot's outside, so the
/// pressure acts over the OD of the nearest sealing joint.
pub const AREA_BASIS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "id",
        label: "Inside diameter (welded, flanged or fused joints only)",
    },
    ChoiceOption {
        key: "od",
        label: "Outside diameter (push-on and mechanical joints, restrained or not)",
    },
];

/// Help text of every area-basis selector: why restrained joints take the OD.
pub const AREA_BASIS_HELP: &str = "Push-on and mechanical joints seal on the spigot's outside, restrained or not: the thrust acts on the outside diameter of the nearest sealing joint. Only welded, flanged or fused joints, which seal on the bore, take the inside diameter.";

/// The extra force of a push-on or mechanical joint at one port: its pressure also
/// acts on the annulus between the bore and the outside diameter, −p·(A_OD − A)·n,
/// with n the port's outward normal. Added to the engine as a named extra force so
/// the ledger shows it as its own term.
pub fn joint_annulus_force(pressure: f64, bore_area: f64, outside_area: f64, outward_normal: Vec3) -> Vec3 {
    outward_normal * (-pressure * (outside_area - bore_area))
}

// --- Free jets from a nozzle (jet on a plate, jet on a vane, ...) -------------------

pub const JET_BASIS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "v",
        label: "Jet velocity",
    },
    ChoiceOption {
        key: "q",
        label: "Jet flow",
    },
    ChoiceOption {
        key: "head",
        label: "Supply head at the nozzle, with Cv",
    },
    ChoiceOption {
        key: "p",
        label: "Gauge pressure at the nozzle inlet, with Cv",
    },
];

/// The smallest jet accepted: 0.5 mm.
const MIN_JET_DIAMETER_M: f64 = 5e-4;
/// Jet speeds handled, m/s: from a trickle to the jet of a 125 MPa cutting head (the
/// incompressible model is already stretched there).
pub const MIN_JET_SPEED: f64 = 0.1;
pub const MAX_JET_SPEED: f64 = 500.0;

/// A free jet leaving a nozzle, SI: diameter and area of the jet, mean speed, flow.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Jet {
    pub diameter: f64,
    pub area: f64,
    pub velocity: f64,
    pub flow: f64,
}

/// The jet fields: `d_jet`, `jet_basis` and one of `v_jet`, `q_jet`, `h_supply`,
/// `p_supply` (the last two with the velocity coefficient `cv`). Demo values are
/// given in the order diameter, basis, velocity, flow, head, pressure, Cv.
pub fn jet_fields(demo: [&'static str; 7]) -> Vec<FieldSpec> {
    let [d, basis, v, q, head, p, cv] = demo;
    vec![
        quantity(
            "d_jet",
            "Jet diameter (nozzle outlet)",
            Q::Length,
            "mm",
            "in",
            d,
            Limits::closed(MIN_JET_DIAMETER_M, 2.0),
            "Diameter of the round jet where it leaves the nozzle (the nozzle's outlet bore), 0.5 mm to 2 m.",
        ),
        choice(
            "jet_basis",
            "Jet given as",
            JET_BASIS_OPTIONS,
            basis,
            "How the jet's speed is known: measured directly, from the flow, or from the head or pressure at the nozzle inlet through V = Cv·√(2gH).",
        ),
        FieldSpec {
            visible_when: Some(("jet_basis", &["v"])),
            ..quantity("v_jet", "Jet velocity", Q::Velocity, "m/s", "ft/s", v, Limits::closed(MIN_JET_SPEED, MAX_JET_SPEED), "Mean speed of the jet at the nozzle outlet, 0.1 to 500 m/s.")
        },
        FieldSpec {
            visible_when: Some(("jet_basis", &["q"])),
            ..quantity("q_jet", "Jet flow", Q::VolumeFlow, "L/s", "gpm", q, Limits::closed(1e-6, 100.0), "Volumetric flow through the nozzle, 0.001 L/s to 100 m³/s; the jet speed is the flow over the jet area.")
        },
        FieldSpec {
            visible_when: Some(("jet_basis", &["head"])),
            ..quantity("h_supply", "Total head at the nozzle inlet", Q::Length, "m", "ft", head, Limits::closed(1e-3, 10_000.0), "Pressure head plus approach velocity head at the nozzle inlet, above the jet: V = Cv·√(2gH).")
        },
        FieldSpec {
            visible_when: Some(("jet_basis", &["p"])),
            ..quantity("p_supply", "Gauge pressure at the nozzle inlet", Q::Pressure, "kPa", "psi", p, Limits::closed(10.0, MAX_PRESSURE_PA), "Nozzle pressure (approach velocity head neglected): V = Cv·√(2p/ρ).")
        },
        FieldSpec {
            visible_when: Some(("jet_basis", &["head", "p"])),
            optional: true,
            ..quantity("cv", "Velocity coefficient Cv", Q::Ratio, "-", "-", cv, Limits::closed(0.6, 1.0), "Actual over ideal jet speed; about 0.97 to 0.99 for a well-made smooth-bore nozzle (common practice). Empty means 1 (ideal).")
        },
    ]
}

/// Reads the jet fields (see [`jet_fields`]) for a fluid of density `density`.
pub fn jet_from(values: &Values, density: f64) -> Result<Jet, Vec<FieldError>> {
    let diameter = values.quantity("d_jet").map_err(|e| vec![e])?;
    let area = circle_area(diameter);
    let need = |key: &'static str| {
        if values.is_set(key) {
            Ok(values.quantity_or(key, 0.0))
        } else {
            Err(vec![FieldError::inconsistent(
                key,
                "a value is required for the chosen way of giving the jet",
            )])
        }
    };
    let cv = values.quantity_or("cv", 1.0);
    let velocity = match values.choice("jet_basis").map_err(|e| vec![e])? {
        "q" => need("q_jet")? / area,
        "head" => cv * (2.0 * crate::units::STANDARD_GRAVITY * need("h_supply")?).sqrt(),
        "p" => cv * (2.0 * need("p_supply")? / density).sqrt(),
        _ => need("v_jet")?,
    };
    if !(velocity.is_finite() && velocity > 0.0) {
        return Err(vec![FieldError::inconsistent(
            "d_jet",
            "the jet speed comes out zero or not finite: check the jet inputs",
        )]);
    }
    if !(MIN_JET_SPEED..=MAX_JET_SPEED).contains(&velocity) {
        let field = match values.choice("jet_basis").unwrap_or("v") {
            "q" => "q_jet",
            "head" => "h_supply",
            "p" => "p_supply",
            _ => "v_jet",
        };
        return Err(vec![FieldError::inconsistent(
            field,
            format!(
                "the jet speed comes out {} m/s; free jets are handled from {MIN_JET_SPEED} to {MAX_JET_SPEED} m/s",
                crate::units::format_significant(velocity, 4)
            ),
        )]);
    }
    Ok(Jet {
        diameter,
        area,
        velocity,
        flow: velocity * area,
    })
}

/// Convex hull of a few points (monotone chain), counter-clockwise; for drawing a
/// control volume around the parts of a diagram.
pub fn convex_hull(mut points: Vec<[f64; 2]>) -> Vec<[f64; 2]> {
    points.retain(|p| p[0].is_finite() && p[1].is_finite());
    points.sort_by(|a, b| a[0].total_cmp(&b[0]).then(a[1].total_cmp(&b[1])));
    let cross = |o: [f64; 2], a: [f64; 2], b: [f64; 2]| (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
    let mut lower: Vec<[f64; 2]> = Vec::new();
    for &p in &points {
        while lower.len() >= 2 && cross(lower[lower.len() - 2], lower[lower.len() - 1], p) <= 0.0 {
            lower.pop();
        }
        lower.push(p);
    }
    let mut upper: Vec<[f64; 2]> = Vec::new();
    for &p in points.iter().rev() {
        while upper.len() >= 2 && cross(upper[upper.len() - 2], upper[upper.len() - 1], p) <= 0.0 {
            upper.pop();
        }
        upper.push(p);
    }
    lower.pop();
    upper.pop();
    lower.extend(upper);
    lower
}

/// The pair of arrows every fitting diagram draws: the thrust T the fitting puts on
/// its supports, and the restraint R = −T the supports supply, each from its own
/// point, labelled with `text` (the formatted magnitude).
pub fn thrust_and_restraint_arrows(
    shapes: &mut Vec<Shape>,
    thrust_at: [f64; 2],
    restraint_at: [f64; 2],
    thrust: Vec3,
    scale: f64,
    text: &str,
) {
    let pair = [
        (thrust_at, thrust, format!("thrust T {text}"), ShapeStyle::Thrust),
        (
            restraint_at,
            -thrust,
            format!("restraint R {text}"),
            ShapeStyle::Restraint,
        ),
    ];
    for (at, force, label, style) in pair {
        if let Some(arrow) = force_arrow(at, force, scale, label, style, true) {
            shapes.push(arrow);
        }
    }
}

/// Where a smooth function with one peak on (`lo`, `hi`) is largest: the point where
/// its slope changes sign, found by bisection on a central difference.
///
/// Comparing function values (a golden-section search) fixes a flat peak only to
/// about the square root of the noise in the function: values computed through
/// several balances carry 1e-10 or so, which leaves the peak uncertain to 1e-5. The
/// sign of a central difference over a step of 1e-4 of the range resolves it to
/// about noise ÷ 2e-4 (5e-7), with a bias of order step² (about 1e-8 for the vane's
/// cubic power curve).
pub fn peak_of<E>(lo: f64, hi: f64, f: impl Fn(f64) -> Result<f64, E>) -> Result<f64, E> {
    let span = hi - lo;
    let step = 1e-4 * span;
    let (mut a, mut b) = (lo + step, hi - step);
    for _ in 0..200 {
        if b - a <= 1e-13 * span {
            break;
        }
        let mid = 0.5 * (a + b);
        if f(mid + step)? > f(mid - step)? {
            a = mid;
        } else {
            b = mid;
        }
    }
    Ok(0.5 * (a + b))
}

/// Every quantity field of the restraint pages at the ends of its range, alone and
/// all together, in both unit systems and in each plane, fitting and area basis:
/// an accepted request must give finite outputs, agreeing checks, and tables and
/// diagrams free of NaN, ±inf and "—".
#[cfg(test)]
mod extremes {
    use crate::catalog::{demo_request, FieldKind, Limits, Request, Shape, Solution};
    use crate::units::{self, UnitSystem};

    /// Field overrides of one scenario of a page.
    type Scenario = &'static [(&'static str, &'static str)];

    const PAGES: &[(&str, &[Scenario])] = &[
        (
            super::super::bend::KEY,
            &[
                &[],
                &[("plane", "vertical_up")],
                &[("plane", "vertical_down")],
                &[("basis", "od")],
            ],
        ),
        (
            super::super::reducer::KEY,
            &[
                &[],
                &[("orientation", "vertical_up")],
                &[("basis", "od")],
                &[("loss", "none")],
            ],
        ),
        (super::super::dead_end::KEY, &[&[], &[("basis", "id")]]),
        (
            super::super::thrust_block::KEY,
            &[
                &[],
                &[("plane", "vertical_crest"), ("legs", "one_level")],
                &[("plane", "vertical_sag"), ("legs", "one_level")],
                &[("plane", "vertical_sag")],
                &[("fitting", "force"), ("thrust", "10 kN")],
                &[
                    ("fitting", "force"),
                    ("thrust", "10 kN"),
                    ("plane", "vertical_crest"),
                    ("thrust_elev", "40 deg"),
                ],
                &[("fitting", "tee"), ("size2", "di52_8")],
                &[("fitting", "reducer"), ("size2", "di52_8")],
                &[("fitting", "dead_end"), ("joint", "welded"), ("block_dims", "aspect")],
                &[("p_basis", "test"), ("test_rule", "en805")],
            ],
        ),
        (super::super::line_schedule::KEY, &[&[]]),
    ];

    fn typed(limits: Limits, kind: crate::units::QuantityKind, unit: &str, high: bool) -> Option<String> {
        let si = match (high, limits.min_inclusive) {
            (true, _) => limits.max,
            (false, true) => limits.min,
            (false, false) => limits.min + (limits.max - limits.min) * 1e-9,
        };
        let v = units::convert_to(si, kind, unit)?;
        Some(format!("{v:e} {unit}"))
    }

    pub(super) fn faults(s: &Solution) -> Vec<String> {
        let mut out: Vec<String> = s.defects.clone();
        for c in s.checks.iter().filter(|c| !c.agrees()) {
            out.push(format!("check disagrees: {c:?}"));
        }
        for t in &s.tables {
            for cell in t.rows.iter().flatten() {
                let lower = cell.to_ascii_lowercase();
                let bad_word = lower
                    .split(|c: char| !c.is_ascii_alphanumeric())
                    .any(|w| w == "nan" || w == "inf" || w == "infinity");
                if cell.trim() == "—" || bad_word {
                    out.push(format!("table {}: cell '{cell}'", t.key));
                }
            }
        }
        for d in &s.diagrams {
            if d.bounds.iter().any(|b| !b.is_finite()) || d.bounds[2] <= d.bounds[0] || d.bounds[3] <= d.bounds[1] {
                out.push(format!("diagram bounds {:?}", d.bounds));
            }
            for shape in &d.shapes {
                let finite = super::shape_points(shape).iter().flatten().all(|v| v.is_finite())
                    && !matches!(shape, Shape::Circle { radius, .. } if !radius.is_finite());
                if !finite {
                    out.push(format!("diagram shape {shape:?}"));
                }
            }
        }
        for p in &s.plots {
            if p.series
                .iter()
                .flat_map(|s| s.points.iter())
                .flatten()
                .any(|v| !v.is_finite())
            {
                out.push(format!("plot {}", p.key));
            }
        }
        out
    }

    #[test]
    fn restraint_pages_stay_finite_at_the_ends_of_every_range() {
        let mut solved = 0;
        let mut tried = 0;
        let mut problems = Vec::new();
        for (key, scenarios) in PAGES {
            let spec = super::super::spec(key).expect("registered");
            for scenario in *scenarios {
                for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                    let base = demo_request(&spec, scenario);
                    let quantities: Vec<_> = spec
                        .fields
                        .iter()
                        .filter_map(|f| match (&f.kind, f.limits) {
                            (FieldKind::Quantity(kind), Some(limits)) if !f.si_unit.is_empty() => {
                                Some((f.key, *kind, limits, f.si_unit))
                            }
                            _ => None,
                        })
                        .collect();
                    let mut requests: Vec<(String, Request)> = Vec::new();
                    for high in [false, true] {
                        let mut all = base.clone();
                        for (field, kind, limits, unit) in &quantities {
                            let Some(text) = typed(*limits, *kind, unit, high) else {
                                continue;
                            };
                            let mut one = base.clone();
                            one.inputs.insert(field.to_string(), text.clone());
                            requests.push((format!("{field}={text}"), one));
                            all.inputs.insert(field.to_string(), text);
                        }
                        requests.push((format!("all {}", if high { "max" } else { "min" }), all));
                    }
                    for (what, mut request) in requests {
                        request.system = system;
                        tried += 1;
                        if let Ok(s) = crate::solve(key, &request).result {
                            solved += 1;
                            for fault in faults(&s) {
                                problems.push(format!("{key} {scenario:?} {what}: {fault}"));
                            }
                        }
                    }
                }
            }
        }
        assert!(
            problems.is_empty(),
            "{} problems, e.g.\n{}",
            problems.len(),
            problems[..problems.len().min(15)].join("\n")
        );
        // Most single-field extremes are accepted; a test that solved nothing tests nothing.
        assert!(solved * 2 > tried, "only {solved} of {tried} requests solved");
    }
}

/// Random requests to the restraint pages (fixed seed, so a failure repeats).
#[cfg(test)]
mod random_requests {
    use crate::catalog::{demo_request, FieldKind};
    use crate::units::UnitSystem;

    /// A small deterministic generator (64-bit LCG, Knuth's MMIX constants).
    struct Lcg(u64);
    impl Lcg {
        fn next(&mut self) -> f64 {
            self.0 = self
                .0
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            (self.0 >> 11) as f64 / (1u64 << 53) as f64
        }
    }

    /// Random requests to the restraint pages: every choice drawn from its options,
    /// every quantity log-uniform (or uniform where the range starts at 0 or below)
    /// within its limits. Accepted requests must be free of defects and failed
    /// checks, and a fair share must be accepted.
    #[test]
    fn random_requests_to_the_restraint_pages_stay_finite() {
        let mut rng = Lcg(0x5eed_0008);
        let mut problems = Vec::new();
        let (mut tried, mut solved) = (0, 0);
        for key in ["bend", "reducer", "dead-end", "thrust-block", "line-schedule"] {
            let spec = super::super::spec(key).expect("registered");
            for n in 0..1500 {
                let mut request = demo_request(&spec, &[]);
                request.system = if n % 2 == 0 {
                    UnitSystem::Si
                } else {
                    UnitSystem::UsCustomary
                };
                for field in &spec.fields {
                    if rng.next() < 0.5 {
                        continue; // keep the demo value for half the fields
                    }
                    let text = match (&field.kind, field.limits) {
                        (FieldKind::Choice(options), _) => options
                            [((rng.next() * options.len() as f64) as usize).min(options.len() - 1)]
                        .key
                        .to_string(),
                        (FieldKind::Quantity(kind), Some(l)) if !field.si_unit.is_empty() => {
                            let u = rng.next();
                            let si = if l.min > 0.0 {
                                (l.min.ln() + u * (l.max.ln() - l.min.ln())).exp()
                            } else if u < 0.1 {
                                l.min.max(0.0)
                            } else {
                                let lo = l.max * 1e-6;
                                (lo.ln() + rng.next() * (l.max.ln() - lo.ln())).exp()
                            };
                            match crate::units::convert_to(si, *kind, field.si_unit) {
                                Some(v) => format!("{v:e} {}", field.si_unit),
                                None => continue,
                            }
                        }
                        _ => continue,
                    };
                    request.inputs.insert(field.key.to_string(), text);
                }
                tried += 1;
                if let Ok(s) = crate::solve(key, &request).result {
                    solved += 1;
                    for fault in super::extremes::faults(&s) {
                        problems.push(format!("{key} {:?}: {fault}", request.inputs));
                    }
                }
            }
        }
        assert!(
            problems.is_empty(),
            "{} problems, e.g.\n{}",
            problems.len(),
            problems[..problems.len().min(5)].join("\n\n")
        );
        assert!(solved * 4 > tried, "only {solved} of {tried} random requests solved");
        println!("restraint pages: {solved} of {tried} random requests solved");
    }
}
