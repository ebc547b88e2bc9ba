//! Line schedule: the thrust and the block of every fitting along a line, from a
//! list typed or pasted one fitting per row.
//!
//! # Method
//! Each row is one fitting. Its design pressure is the row's own (`p=`) or the
//! page's basis applied to the working pressure (the page's or the row's `pw=`):
//! operating, field test by a named rule (see [`super::thrust_block::TEST_RULES`]),
//! working plus a typed surge allowance, or the highest of these. The thrust comes
//! from the engine's static balance of the fitting at that pressure with no flow
//! ([`super::thrust_block::static_balance`]), on the outside diameter for push-on and
//! mechanical joints, restrained or not (they seal on the spigot), and on the bore
//! only for welded, flanged or fused joints. A horizontal or sag fitting
//! gets a bearing block, area SF·T/σ; a crest (thrust upward) gets a gravity block,
//! volume SF·T_up/γ_concrete (above groundwater). The thrust-restraint page does
//! the same for one fitting with every option shown (and checks sliding, which
//! this list does not); this page is its list form. The sum of the rows' thrusts
//! is checked against the sum of each row's closed form (2pA·sin(θ/2), pA,
//! pA_branch, p(A₁ − A₂), or the typed force) with [`Report::check`]. EN 805 rows
//! use MDP = working + 200 kPa (see [`super::thrust_block::TEST_RULES`]).
//!
//! # Row format (ours; one fitting per line, `#` starts a comment)
//! ```text
//! KIND [TOKEN ...]
//! ```
//! - KIND: `bend`, `tee`, `dead_end` (also `cap`, `plug`, `valve`), `reducer`, `force`.
//! - A bare angle (`45deg`) is a bend's deflection; a bare pressure (`150psi`) is
//!   the row's design pressure; a bare size preset key (`di52_12`) is the main size,
//!   a second one the tee branch or reducer small end; a bare soil preset key
//!   (`nfpa24_sand`) is the soil.
//! - `key=value` tokens: `angle=`, `size=`, `d=` (inside), `od=` (outside),
//!   `size2=`, `d2=`, `od2=`, `p=` (design pressure), `pw=` (working pressure at
//!   this fitting, the page basis applies), `soil=`, `sigma=` (typed bearing),
//!   `joint=` (`push_on`, `mechanical`, `restrained`, `flanged`, `welded`), `h=` (face height),
//!   `turn=` (`left`, `right` in plan; `down` a crest: thrust up, gravity block;
//!   `up` a sag: thrust down), `legs=` (a vertical bend's legs: `symmetric`, both
//!   sloped by θ/2, uplift 2pA·sin(θ/2), the default; `one_level`, uplift pA·sin θ),
//!   `thrust=` (force rows, 1 N to 1 GN), `tag=` (a label, no spaces).
//! - Quantities carry their unit (`12in`, `0.9m`, `10bar`); a bare number is refused.
//!
//! Example: `bend 45deg di52_12 nfpa24_sand tag=B1` or
//! `tee size=sch40_12 size2=sch40_6 joint=welded p=16bar`.
//!
//! Errors name the row and the token. The whole list is one text field, so it lives
//! in the page's URL and survives a reload.

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, CarryOver, FieldSpec, Limits, OutputSpec, Plot, Report, Series, Table, Values};
use crate::error::FieldError;
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::units::{self, QuantityKind as Q, STANDARD_GRAVITY};
use crate::vector::Vec3;

use super::common::{choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};
use super::thrust_block::{self as tb, BASIS_OPTIONS, JOINT_OPTIONS, SOIL_OPTIONS, TEST_RULE_OPTIONS};
use crate::restraint::block::Block;
use crate::restraint::pressure::{self, Governing, PressureBasis};
use crate::restraint::{self, FittingChoice, FittingKind, Legs, Plane, StaticFitting};

pub const KEY: &str = "line-schedule";

/// The most rows a schedule may have.
pub const MAX_ROWS: usize = 2000;

/// Largest thrust a force row accepts, N (1 GN).
pub const MAX_ROW_THRUST: f64 = 1e9;
/// Range of a typed allowable soil bearing, Pa (1 kPa to 20 MPa, sound rock).
pub const MIN_BEARING: f64 = 1e3;
pub const MAX_BEARING: f64 = 20e6;

const DEMO_ROWS: &str = "# Harrow Creek Works fire-water ring main (invented demo)\n\
bend 90deg di52_12 nfpa24_sandy_silt tag=B1\n\
bend 45deg di52_12 nfpa24_sandy_silt tag=B2 turn=right\n\
tee di52_12 di52_8 nfpa24_sand tag=T1\n\
reducer di52_12 di52_8 tag=R1\n\
bend 22.5deg di52_8 turn=down tag=V1\n\
dead_end di52_8 tag=H1 h=0.9m";

pub fn spec() -> CalculatorSpec {
    let fields = vec![
        FieldSpec {
            kind: crate::catalog::FieldKind::Text,
            si_unit: "",
            us_unit: "",
            demo: DEMO_ROWS,
            limits: None,
            optional: false,
            help: "One fitting per line: KIND then tokens, e.g. 'bend 45deg di52_12 nfpa24_sand tag=B1'. Kinds: bend, tee, dead_end, reducer, force. See the method note for every token.",
            visible_when: None,
            key: "rows",
            label: "Fittings along the line",
        },
        choice("p_basis", "Design pressure basis (rows without p=)", BASIS_OPTIONS, "highest", "Applied to the working pressure of each row that does not give its own design pressure."),
        quantity("p", "Working pressure, gauge (rows without pw=)", Q::Pressure, "bar", "psi", "150 psi", Limits::closed(0.0, MAX_PRESSURE_PA), "The working pressure along the line; a row may give its own with pw=."),
        FieldSpec { visible_when: Some(("p_basis", &["test", "highest"])), ..choice("test_rule", "Field test pressure rule", TEST_RULE_OPTIONS, "nfpa24", "Named rules of published standards, or a typed test pressure.") },
        FieldSpec { visible_when: Some(("test_rule", &["custom"])), optional: true, ..quantity("p_test", "Typed test pressure, gauge", Q::Pressure, "bar", "psi", "", Limits::closed(0.0, MAX_PRESSURE_PA), "Used when the test rule is 'typed test pressure'.") },
        FieldSpec { optional: true, ..quantity("dp_surge", "Surge allowance above working", Q::Pressure, "bar", "psi", "", Limits::closed(0.0, MAX_PRESSURE_PA), "From a transient analysis or the thrust-restraint page's Joukowsky estimate. Empty: no surge.") },
        choice("soil", "Soil (rows without soil=)", SOIL_OPTIONS, "nfpa24_sandy_silt", "Published tables disagree by up to about 4×; see the thrust-restraint page's comparison."),
        FieldSpec { visible_when: Some(("soil", &["custom"])), optional: true, ..quantity("sigma", "Typed allowable soil bearing", Q::SoilBearing, "kPa", "psf", "", Limits::closed(MIN_BEARING, MAX_BEARING), "Used when the soil is 'typed value'; from 1 kPa to 20 MPa.") },
        choice("joint", "Joints (rows without joint=)", JOINT_OPTIONS, "push_on", tb::JOINT_HELP),
        quantity("sf", "Safety factor", Q::Ratio, "-", "-", "1.5", Limits::closed(1.0, 10.0), "Bearing area = SF·T/σ; gravity block weight = SF·T_up."),
        quantity("block_h", "Bearing face height (rows without h=)", Q::Length, "m", "ft", "0.6 m", Limits::closed(0.05, 20.0), "Face width = area ÷ height."),
        quantity("gamma_c", "Unit weight of concrete (gravity blocks)", Q::SpecificWeight, "kN/m3", "lbf/ft3", "23.6 kN/m3", Limits::closed(10e3, 40e3), "Blocks are taken above groundwater here; use the thrust-restraint page for buoyancy."),
    ];
    CalculatorSpec {
        key: KEY,
        title: "Line schedule: thrust blocks along a line",
        group: crate::catalog::group::FITTINGS,
        summary: "Paste the fittings of a line, one per row, and get each thrust, its direction and the block it needs, with totals and a CSV.",
        fields,
        outputs: vec![
            OutputSpec { key: "max_thrust", label: "Largest thrust", kind: Q::Force, headline: true },
            OutputSpec { key: "total_area", label: "Total bearing area", kind: Q::Area, headline: true },
            OutputSpec { key: "total_volume", label: "Total gravity-block concrete", kind: Q::Volume, headline: true },
            OutputSpec { key: "row_count", label: "Fittings", kind: Q::Ratio, headline: false },
            OutputSpec { key: "total_thrust", label: "Sum of thrust magnitudes (block loads)", kind: Q::Force, headline: false },
            OutputSpec { key: "p_design", label: "Design pressure of rows without their own", kind: Q::Pressure, headline: false },
        ],
        cautions: vec![
            "Every row uses one design pressure: check that the test and surge pressures at each fitting, at its elevation, are covered.",
            "Soil values need a geotechnical basis at each block; one soil for the whole line is a simplification.",
            "Blocks near each other, near other services or in fill need individual design.",
        ],
    }
}

/// One parsed row.
#[derive(Clone, Debug, PartialEq)]
pub struct Row {
    pub line: usize,
    pub kind: RowKind,
    pub tag: String,
    pub angle: Option<f64>,
    pub size: Option<String>,
    pub d: Option<f64>,
    pub od: Option<f64>,
    pub size2: Option<String>,
    pub d2: Option<f64>,
    pub od2: Option<f64>,
    pub p: Option<f64>,
    pub pw: Option<f64>,
    pub soil: Option<String>,
    pub sigma: Option<f64>,
    pub joint: Option<String>,
    pub h: Option<f64>,
    pub turn: Turn,
    /// A vertical bend with both legs sloped by θ/2 (the default), or one leg level.
    pub symmetric: bool,
    pub thrust: Option<f64>,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RowKind {
    Fitting(FittingKind),
    Force,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Turn {
    Left,
    Right,
    Down,
    Up,
}

impl Row {
    fn new(line: usize, kind: RowKind) -> Row {
        Row {
            line,
            kind,
            tag: String::new(),
            angle: None,
            size: None,
            d: None,
            od: None,
            size2: None,
            d2: None,
            od2: None,
            p: None,
            pw: None,
            soil: None,
            sigma: None,
            joint: None,
            h: None,
            turn: Turn::Left,
            symmetric: true,
            thrust: None,
        }
    }
}

/// The kind of a row from its first word: the restraint module's fitting keys
/// (`bend`, `dead_end`, `tee`, `reducer`, `force`), and the older spellings rows
/// were written with (`elbow`, `cap`, `plug`, `valve`, `dead-end`, `deadend`).
fn kind_of(word: &str) -> Option<RowKind> {
    let word = word.to_ascii_lowercase();
    let key = match word.as_str() {
        "elbow" => "bend",
        "cap" | "plug" | "valve" | "dead-end" | "deadend" => "dead_end",
        other => other,
    };
    Some(match FittingChoice::from_key(key)?.kind() {
        Some(kind) => RowKind::Fitting(kind),
        None => RowKind::Force,
    })
}

impl RowKind {
    /// The restraint module's key of the row's fitting (`dead_end`, …, `force`).
    pub fn key(self) -> &'static str {
        match self {
            RowKind::Fitting(kind) => kind.key(),
            RowKind::Force => FittingChoice::GivenForce.key(),
        }
    }
}

/// Parses a quantity token that must carry its unit.
fn typed(text: &str, kind: Q, row: usize, key: &str) -> Result<f64, String> {
    let t = text.trim();
    if !t.is_empty() && t.chars().all(|c| c.is_ascii_digit() || ".+-eE".contains(c)) {
        return Err(format!(
            "row {row}: {key}={t} has no unit; write it with one, e.g. {t}{}",
            example_unit(kind)
        ));
    }
    units::parse_quantity(t, kind, "").map_err(|e| format!("row {row}: {key}={t}: {e}"))
}

fn example_unit(kind: Q) -> &'static str {
    match kind {
        Q::Angle => "deg",
        Q::Pressure => "psi",
        Q::SoilBearing => "psf",
        Q::Length => "in",
        Q::Force => "kN",
        _ => "",
    }
}

/// Parses the whole schedule strictly. Every row error names its row (the line
/// number in the text) and the token.
///
/// # Errors
/// The messages of every bad row (at most 20).
pub fn parse(text: &str) -> Result<Vec<Row>, Vec<String>> {
    let mut rows = Vec::new();
    let mut errors = Vec::new();
    for (i, raw) in text.lines().enumerate() {
        let line = i + 1;
        let content = raw.split('#').next().unwrap_or("").trim();
        if content.is_empty() {
            continue;
        }
        match parse_row(line, content) {
            Ok(row) => rows.push(row),
            Err(e) => {
                errors.push(e);
                if errors.len() >= 20 {
                    errors.push("… more rows have errors; fix these first".to_string());
                    break;
                }
            }
        }
    }
    if rows.len() > MAX_ROWS && errors.is_empty() {
        errors.push(format!("{} rows: at most {MAX_ROWS} per schedule", rows.len()));
    }
    if errors.is_empty() {
        Ok(rows)
    } else {
        Err(errors)
    }
}

fn parse_row(line: usize, content: &str) -> Result<Row, String> {
    let mut tokens = content.split_whitespace();
    let first = tokens.next().unwrap_or("");
    let kind = kind_of(first).ok_or_else(|| {
        format!(
            "row {line}: '{}' is not a fitting kind; use bend, tee, dead_end, reducer or force",
            short(first)
        )
    })?;
    let mut row = Row::new(line, kind);
    let mut seen: Vec<&str> = Vec::new();
    for token in tokens {
        let (key, value) = match token.split_once('=') {
            Some((k, v)) => (k.to_ascii_lowercase(), v),
            None => (bare_key(&row, token, line)?.to_string(), token),
        };
        let key_static: &'static str = match key.as_str() {
            "angle" => "angle",
            "size" => "size",
            "d" => "d",
            "od" => "od",
            "size2" => "size2",
            "d2" => "d2",
            "od2" => "od2",
            "p" => "p",
            "pw" => "pw",
            "soil" => "soil",
            "sigma" => "sigma",
            "joint" => "joint",
            "h" => "h",
            "turn" => "turn",
            "legs" => "legs",
            "thrust" => "thrust",
            "tag" => "tag",
            other => {
                return Err(format!(
                    "row {line}: unknown key '{}'; use angle, size, d, od, size2, d2, od2, p, pw, soil, sigma, joint, h, turn, legs, thrust or tag",
                    short(other)
                ))
            }
        };
        if seen.contains(&key_static) {
            return Err(format!("row {line}: '{key_static}' is given twice"));
        }
        seen.push(key_static);
        if value.is_empty() {
            return Err(format!("row {line}: {key_static}= has no value"));
        }
        match key_static {
            "angle" => {
                let a = typed(value, Q::Angle, line, "angle")?;
                if !(tb::MIN_ANGLE..=PI).contains(&a) {
                    return Err(format!(
                        "row {line}: angle must be at least 0.1 deg and at most 180 deg"
                    ));
                }
                row.angle = Some(a);
            }
            "size" | "size2" => {
                if pipe_sizes::find(value).is_none() {
                    return Err(format!(
                        "row {line}: '{}' is not a size preset (e.g. di52_12, sch40_8, c900dr18_6)",
                        short(value)
                    ));
                }
                if key_static == "size" {
                    row.size = Some(value.to_string());
                } else {
                    row.size2 = Some(value.to_string());
                }
            }
            "d" | "od" | "d2" | "od2" | "h" => {
                let v = typed(value, Q::Length, line, key_static)?;
                let (lo, hi, range) = if key_static == "h" {
                    (0.05, 20.0, "at least 0.05 m and at most 20 m")
                } else {
                    (MIN_SIZE_M, MAX_SIZE_M, "at least 1 mm and at most 10 m")
                };
                if !(lo..=hi).contains(&v) {
                    return Err(format!("row {line}: {key_static} must be {range}"));
                }
                match key_static {
                    "d" => row.d = Some(v),
                    "od" => row.od = Some(v),
                    "d2" => row.d2 = Some(v),
                    "od2" => row.od2 = Some(v),
                    _ => row.h = Some(v),
                }
            }
            "p" | "pw" => {
                let v = typed(value, Q::Pressure, line, key_static)?;
                if !(0.0..=MAX_PRESSURE_PA).contains(&v) {
                    return Err(format!(
                        "row {line}: {key_static} is a gauge pressure: at least 0 and at most 100 MPa"
                    ));
                }
                if key_static == "p" {
                    row.p = Some(v);
                } else {
                    row.pw = Some(v);
                }
            }
            "sigma" => {
                let v = typed(value, Q::SoilBearing, line, "sigma")?;
                if !(MIN_BEARING..=MAX_BEARING).contains(&v) {
                    return Err(format!(
                        "row {line}: sigma (soil bearing) must be at least 1 kPa and at most 20 MPa"
                    ));
                }
                row.sigma = Some(v);
            }
            "soil" => {
                if tb::soil(value).is_none() {
                    return Err(format!(
                        "row {line}: '{}' is not a soil preset (e.g. nfpa24_sand, safe_soft_clay, bs8004_stiff_clay)",
                        short(value)
                    ));
                }
                row.soil = Some(value.to_string());
            }
            "joint" => {
                if !JOINT_OPTIONS.iter().any(|o| o.key == value) {
                    return Err(format!(
                        "row {line}: joint must be push_on, mechanical, restrained, flanged or welded"
                    ));
                }
                row.joint = Some(value.to_string());
            }
            "turn" => {
                row.turn = match value.to_ascii_lowercase().as_str() {
                    "left" => Turn::Left,
                    "right" => Turn::Right,
                    "down" => Turn::Down,
                    "up" => Turn::Up,
                    _ => return Err(format!("row {line}: turn must be left, right, up or down")),
                }
            }
            "legs" => {
                row.symmetric = match value.to_ascii_lowercase().as_str() {
                    "symmetric" => true,
                    "one_level" => false,
                    _ => return Err(format!("row {line}: legs must be symmetric or one_level")),
                }
            }
            "thrust" => {
                let v = typed(value, Q::Force, line, "thrust")?;
                if !(1.0..=MAX_ROW_THRUST).contains(&v) {
                    return Err(format!("row {line}: thrust must be at least 1 N and at most 1 GN"));
                }
                row.thrust = Some(v);
            }
            _ => {
                if value.chars().count() > 24 {
                    return Err(format!("row {line}: tag is longer than 24 characters"));
                }
                row.tag = value.to_string();
            }
        }
    }
    // What each kind needs.
    match row.kind {
        RowKind::Force => {
            if row.thrust.is_none() {
                return Err(format!("row {line}: a force row needs thrust=, e.g. thrust=40kN"));
            }
        }
        RowKind::Fitting(kind) => {
            if row.size.is_none() && (row.d.is_none() || row.od.is_none()) {
                return Err(format!(
                    "row {line}: give a size preset (e.g. di52_12) or both d= and od="
                ));
            }
            if kind == FittingKind::Bend && row.angle.is_none() {
                return Err(format!("row {line}: a bend needs its angle, e.g. 45deg"));
            }
            if matches!(kind, FittingKind::Tee | FittingKind::Reducer)
                && row.size2.is_none()
                && (row.d2.is_none() || row.od2.is_none())
            {
                return Err(format!(
                    "row {line}: a tee or reducer needs its second size (a preset, or d2= and od2=)"
                ));
            }
            if kind != FittingKind::Bend && row.angle.is_some() {
                return Err(format!("row {line}: only a bend takes an angle"));
            }
        }
    }
    Ok(row)
}

/// The key a bare token stands for.
fn bare_key(row: &Row, token: &str, line: usize) -> Result<&'static str, String> {
    if pipe_sizes::find(token).is_some() {
        return Ok(if row.size.is_none() { "size" } else { "size2" });
    }
    if tb::soil(token).is_some() {
        return Ok("soil");
    }
    if units::parse_quantity(token, Q::Angle, "").is_ok() {
        return Ok("angle");
    }
    if units::parse_quantity(token, Q::Pressure, "").is_ok() {
        return Ok("p");
    }
    if units::parse_quantity(token, Q::Length, "").is_ok() {
        return Err(format!(
            "row {line}: a bare length '{}' is ambiguous; write d= (inside), od= (outside), h= or a size preset",
            short(token)
        ));
    }
    Err(format!(
        "row {line}: '{}' is neither key=value, an angle, a pressure, a size preset nor a soil preset",
        short(token)
    ))
}

fn short(text: &str) -> String {
    let t: String = text.chars().take(30).collect();
    if text.chars().count() > 30 {
        format!("{t}…")
    } else {
        t
    }
}

/// A solved row.
struct Solved {
    row: Row,
    area_d: f64,
    /// Whether the thrust area is on the outside diameter.
    on_od: bool,
    p: f64,
    basis: String,
    thrust: Vec3,
    plane: Plane,
    block: Block,
    block_text: String,
    soil_text: String,
    direction: String,
    od: f64,
    od2: Option<f64>,
    /// The row's thrust by its closed form, computed without the engine.
    closed_form: f64,
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let one = |e: FieldError| vec![e];
    let text = values.text("rows").map_err(one)?;
    let rows = parse(text).map_err(|errors| {
        errors
            .into_iter()
            .map(|e| FieldError::inconsistent("rows", e))
            .collect::<Vec<_>>()
    })?;
    if rows.is_empty() {
        return Err(vec![FieldError::inconsistent(
            "rows",
            "no fittings: type one per line, e.g. 'bend 45deg di52_12'",
        )]);
    }
    let basis = values.choice("p_basis").map_err(one)?.to_string();
    let p_basis = PressureBasis::from_key(&basis)
        .ok_or_else(|| vec![FieldError::inconsistent("p_basis", "unknown design pressure basis")])?;
    let work = values.quantity("p").map_err(one)?;
    let sf = values.quantity("sf").map_err(one)?;
    let default_h = values.quantity("block_h").map_err(one)?;
    let gamma_c = values.quantity("gamma_c").map_err(one)?;
    let default_joint = values.choice("joint").map_err(one)?.to_string();
    let default_soil = values.choice("soil").map_err(one)?.to_string();
    let default_sigma = if default_soil == "custom" {
        values.is_set("sigma").then(|| values.quantity_or("sigma", 0.0))
    } else {
        None
    };

    // The page's rule for a working pressure.
    let test_rule = if matches!(basis.as_str(), "test" | "highest") {
        let key = values.choice("test_rule").map_err(one)?;
        if key == "custom" {
            let p = values.is_set("p_test").then(|| values.quantity_or("p_test", 0.0));
            Some(TestBasis::Typed(p.ok_or_else(|| {
                vec![FieldError::inconsistent(
                    "p_test",
                    "type the test pressure, or choose a named rule",
                )]
            })?))
        } else {
            Some(TestBasis::Rule(tb::test_rule(key).ok_or_else(|| {
                vec![FieldError::inconsistent("test_rule", "unknown rule")]
            })?))
        }
    } else {
        None
    };
    let surge = values.is_set("dp_surge").then(|| values.quantity_or("dp_surge", 0.0));
    if let Some(TestBasis::Rule(r)) = &test_rule {
        if r.needs_surge && surge.is_none() {
            return Err(vec![FieldError::inconsistent(
                "dp_surge",
                "this test rule adds the calculated surge: give the surge allowance",
            )]);
        }
    }
    let surge_in_basis = if matches!(basis.as_str(), "surge" | "highest") {
        surge
    } else {
        None
    };
    if basis == "surge" && surge_in_basis.is_none() {
        return Err(vec![FieldError::inconsistent(
            "dp_surge",
            "the surge basis needs the surge allowance",
        )]);
    }
    let design_of = |pw: f64| -> (f64, String) {
        let test = test_rule.as_ref().map(|t| match t {
            TestBasis::Typed(p) => (*p, "typed test".to_string()),
            TestBasis::Rule(r) => (
                r.test_pressure(pw, None, surge.unwrap_or(0.0)),
                format!("test ({})", r.key),
            ),
        });
        let (p, governing) = pressure::design_pressure(
            p_basis,
            pw,
            test.as_ref().map(|t| t.0),
            surge_in_basis.map(|dp| pw + dp),
        );
        let text = match (governing, &test) {
            (Governing::Test, Some((_, text))) => text.clone(),
            (other, _) => other.text().to_string(),
        };
        match p_basis {
            PressureBasis::Highest => (p, format!("highest: {text}")),
            _ => (p, text),
        }
    };
    report.output("p_design", design_of(work).0);

    let fluid = Fluid::water_kelvin(288.15).map_err(|e| vec![FieldError::inconsistent("rows", e.to_string())])?;
    let mut solved = Vec::with_capacity(rows.len());
    let mut errors = Vec::new();
    for row in rows {
        match solve_row(
            &row,
            &fluid,
            sf,
            default_h,
            gamma_c,
            &default_joint,
            &default_soil,
            default_sigma,
            &design_of,
            work,
            report,
        ) {
            Ok(s) => solved.push(s),
            Err(e) => errors.push(FieldError::inconsistent(if e.0 { "sigma" } else { "rows" }, e.1)),
        }
        if errors.len() >= 20 {
            break;
        }
    }
    if !errors.is_empty() {
        return Err(errors);
    }

    // --- Outputs and the table ------------------------------------------------------
    let system = report.system();
    let max = solved.iter().map(|s| s.thrust.norm()).fold(0.0, f64::max);
    let total: f64 = solved.iter().map(|s| s.thrust.norm()).sum();
    let mut total_area = 0.0;
    let mut total_volume = 0.0;
    for s in &solved {
        match s.block {
            Block::Bearing { h, w } => total_area += h * w,
            Block::Gravity { volume, .. } => total_volume += volume,
        }
    }
    report.output("max_thrust", max);
    // Each total only when the schedule has blocks of that kind.
    if solved.iter().any(|s| matches!(s.block, Block::Bearing { .. })) {
        report.output("total_area", total_area);
    }
    if solved.iter().any(|s| matches!(s.block, Block::Gravity { .. })) {
        report.output("total_volume", total_volume);
    }
    report.output("row_count", solved.len() as f64);
    report.output("total_thrust", total);
    // Vertical blocks with a horizontal thrust can slide; this list does not check
    // that, so it says so rather than stay silent.
    let sliding: Vec<String> = solved
        .iter()
        .filter(|s| s.plane != Plane::Horizontal && s.thrust.x.abs() > 1e-9 * s.thrust.norm().max(1.0))
        .map(|s| s.row.line.to_string())
        .collect();
    if !sliding.is_empty() {
        let shown = sliding.iter().take(12).cloned().collect::<Vec<_>>().join(", ");
        let more = if sliding.len() > 12 { ", …" } else { "" };
        report.warn(None, format!("sliding is NOT checked here for the vertical blocks with a horizontal thrust (rows {shown}{more}): open each on the thrust-restraint page, which checks it"));
    }
    report.check(
        "Sum of the rows' thrusts",
        "each row's closed form (2pA·sin(θ/2), pA, pA_branch, p(A₁ − A₂), or the typed force), summed",
        Q::Force,
        total,
        solved.iter().map(|s| s.closed_form).sum(),
        1e-9,
        0.0,
    );

    let f_unit = units::display_unit(max.max(1.0), Q::Force, system).id;
    let p_unit = units::display_unit(solved.iter().map(|s| s.p).fold(1.0, f64::max), Q::Pressure, system).id;
    let d_unit = match system {
        units::UnitSystem::Si => "mm",
        units::UnitSystem::UsCustomary => "in",
    };
    let cell = |v: f64, kind: Q, unit: &str| {
        units::convert_to(v, kind, unit)
            .map(|x| units::format_significant(x, 4))
            .unwrap_or_default()
    };
    let mut table = Table {
        key: "schedule",
        title: "Thrust and block of every fitting".to_string(),
        columns: vec![
            "Row".into(),
            "Tag".into(),
            "Kind".into(),
            format!("thrust diameter ({d_unit}), basis"),
            "Angle (deg)".into(),
            "Pressure basis".into(),
            format!("design pressure ({p_unit})"),
            format!("thrust ({f_unit})"),
            "Direction".into(),
            "Block".into(),
            "Soil".into(),
        ],
        rows: Vec::with_capacity(solved.len() + 1),
        emphasised_rows: Vec::new(),
    };
    for s in &solved {
        let kind = s.row.kind.key();
        table.rows.push(vec![
            s.row.line.to_string(),
            s.row.tag.clone(),
            kind.to_string(),
            if s.area_d > 0.0 {
                format!(
                    "{} {}",
                    cell(s.area_d, Q::Length, d_unit),
                    if s.on_od { "OD" } else { "ID" }
                )
            } else {
                String::new()
            },
            s.row
                .angle
                .map(|a| units::format_significant(a.to_degrees(), 4))
                .unwrap_or_default(),
            s.basis.clone(),
            cell(s.p, Q::Pressure, p_unit),
            cell(s.thrust.norm(), Q::Force, f_unit),
            s.direction.clone(),
            s.block_text.clone(),
            s.soil_text.clone(),
        ]);
    }
    table.rows.push(vec![
        "Total".into(),
        String::new(),
        format!("{} fittings", solved.len()),
        String::new(),
        String::new(),
        String::new(),
        String::new(),
        cell(total, Q::Force, f_unit),
        "sum of magnitudes".into(),
        format!(
            "{} bearing, {} gravity",
            report.fmt(total_area, Q::Area),
            report.fmt(total_volume, Q::Volume)
        ),
        String::new(),
    ]);
    table.emphasised_rows.push(table.rows.len() - 1);
    report.solution.tables.push(table);

    // Thrust by row, and the governing block drawn.
    let f_scale = units::convert_to(1.0, Q::Force, f_unit).unwrap_or(1.0);
    report.solution.plots.push(Plot {
        key: "thrust_by_row",
        title: "Thrust of each fitting".to_string(),
        x_label: "row".to_string(),
        y_label: format!("thrust ({f_unit})"),
        series: vec![Series {
            name: "thrust".into(),
            points: solved
                .iter()
                .map(|s| [s.row.line as f64, s.thrust.norm() * f_scale])
                .collect(),
        }],
        markers: Vec::new(),
    });
    if let Some(g) = solved.iter().max_by(|a, b| a.thrust.norm().total_cmp(&b.thrust.norm())) {
        let fitting = g.row.kind.key();
        let mut d = tb::diagram(
            fitting,
            g.plane,
            g.od,
            g.od2,
            (0.0, g.row.angle.unwrap_or(PI / 4.0)),
            false,
            g.thrust,
            &g.block,
            report,
        );
        d.title = format!("Largest thrust, row {}: {}", g.row.line, d.title);
        report.solution.diagrams.push(d);
        report.solution.carry_over.push(CarryOver {
            calculator: tb::KEY,
            label: format!("Open row {} (largest thrust) on the thrust-restraint page", g.row.line),
            inputs: carry_inputs(g, values, sf),
        });
    }
    Ok(())
}

/// The thrust-restraint page's inputs for one solved row: the fitting, its sizes and
/// the row's design pressure as the operating pressure (so the page shows the same
/// thrust), the soil and the face height.
fn carry_inputs(s: &Solved, values: &Values, sf: f64) -> Vec<(&'static str, String)> {
    let num = |x: f64| units::format_significant(x, 7);
    let r = &s.row;
    let mut v: Vec<(&'static str, String)> = Vec::new();
    v.push(("fitting", r.kind.key().to_string()));
    if let Some(t) = r.thrust {
        v.push(("thrust", format!("{}N", num(t))));
    }
    if let Some(a) = r.angle {
        v.push(("angle", format!("{}deg", num(a.to_degrees()))));
    }
    v.push(("plane", s.plane.key().to_string()));
    if s.plane != Plane::Horizontal {
        let legs = if r.symmetric { Legs::Symmetric } else { Legs::OneLevel };
        v.push(("legs", legs.key().to_string()));
    }
    v.push(("size", r.size.clone().unwrap_or_else(|| pipe_sizes::CUSTOM.to_string())));
    for (key, d) in [("d", r.d), ("od", r.od), ("d2", r.d2), ("od2", r.od2)] {
        if let Some(d) = d {
            v.push((key, format!("{}m", num(d))));
        }
    }
    if r.size2.is_some() || r.d2.is_some() {
        v.push((
            "size2",
            r.size2.clone().unwrap_or_else(|| pipe_sizes::CUSTOM.to_string()),
        ));
    }
    let joint = r
        .joint
        .clone()
        .unwrap_or_else(|| values.choice("joint").unwrap_or("push_on").to_string());
    v.push(("joint", joint));
    v.push(("p_basis", "operating".to_string()));
    v.push(("p", format!("{}Pa", num(s.p))));
    match (r.sigma, r.soil.as_deref()) {
        (Some(sigma), _) => {
            v.push(("soil", "custom".to_string()));
            v.push(("sigma", format!("{}Pa", num(sigma))));
        }
        (None, Some(key)) => v.push(("soil", key.to_string())),
        (None, None) => {
            let key = values.choice("soil").unwrap_or("custom");
            v.push(("soil", key.to_string()));
            if key == "custom" && values.is_set("sigma") {
                v.push(("sigma", format!("{}Pa", num(values.quantity_or("sigma", 0.0)))));
            }
        }
    }
    v.push(("sf", num(sf)));
    v.push(("block_dims", "height".to_string()));
    if let Block::Bearing { h, .. } = s.block {
        v.push(("block_h", format!("{}m", num(h))));
    }
    if s.plane == Plane::Crest {
        v.push(("gamma_c", format!("{}N/m3", num(values.quantity_or("gamma_c", 23.6e3)))));
        v.push(("submerged", "no".to_string()));
    }
    v.push(("fluid", "water".to_string()));
    v.push(("t", "15degC".to_string()));
    v
}

enum TestBasis {
    Typed(f64),
    Rule(&'static tb::TestRule),
}

#[allow(clippy::too_many_arguments)]
fn solve_row(
    row: &Row,
    fluid: &Fluid,
    sf: f64,
    default_h: f64,
    gamma_c: f64,
    default_joint: &str,
    default_soil: &str,
    default_sigma: Option<f64>,
    design_of: &dyn Fn(f64) -> (f64, String),
    work: f64,
    report: &Report<'_>,
) -> Result<Solved, (bool, String)> {
    let line = row.line;
    let err = |m: String| (false, format!("row {line}: {m}"));
    let (p, basis) = match (row.p, row.pw) {
        (Some(p), _) => (p, "row p=".to_string()),
        (None, Some(pw)) => {
            let (p, b) = design_of(pw);
            (p, format!("{b}, row pw="))
        }
        (None, None) => design_of(work),
    };
    let plane = match row.turn {
        Turn::Down => Plane::Crest,
        Turn::Up => Plane::Sag,
        Turn::Left | Turn::Right => Plane::Horizontal,
    };
    let joint = row.joint.as_deref().unwrap_or(default_joint);
    let uses_od = tb::joint_uses_od(joint);
    let mut area_d = 0.0;
    let mut od_main = 0.3;
    let mut od_second = None;
    let closed_form;
    let thrust = match row.kind {
        RowKind::Force => {
            let t = row.thrust.unwrap_or(0.0);
            closed_form = t;
            // As the thrust-restraint page draws a given thrust with no typed angle.
            plane.given_thrust(t, plane.default_elevation())
        }
        RowKind::Fitting(kind) => {
            let main = tb::diameters(
                row.size.as_deref().unwrap_or(pipe_sizes::CUSTOM),
                row.d,
                row.od,
                ("size", "d", "od"),
            )
            .map_err(|e| err(e.kind.to_string()))?;
            od_main = main.od;
            let d1 = if uses_od { main.od } else { main.id };
            area_d = d1;
            let a1 = super::common::circle_area(d1);
            let a2 = match kind {
                FittingKind::Tee | FittingKind::Reducer => {
                    let s = tb::diameters(
                        row.size2.as_deref().unwrap_or(pipe_sizes::CUSTOM),
                        row.d2,
                        row.od2,
                        ("size2", "d2", "od2"),
                    )
                    .map_err(|e| err(e.kind.to_string()))?;
                    od_second = Some(s.od);
                    let a2 = super::common::circle_area(if uses_od { s.od } else { s.id });
                    if kind == FittingKind::Reducer && a2 >= a1 {
                        return Err(err(
                            "the small end of a reducer must be smaller than the large end".into()
                        ));
                    }
                    if kind == FittingKind::Tee && s.od > main.od * 1.0001 {
                        return Err(err("the branch of a tee cannot be larger than the run".into()));
                    }
                    a2
                }
                _ => a1,
            };
            let fit = StaticFitting {
                kind,
                angle: row.angle.unwrap_or(0.0),
                area: a1,
                area2: a2,
                plane,
                symmetric: row.symmetric,
            };
            closed_form = restraint::closed_form_thrust(&fit, p).0;
            let balance = tb::static_balance(&fit, p, fluid).map_err(|e| err(e.to_string()))?;
            let mut t = balance.thrust();
            if row.turn == Turn::Right {
                t.y = -t.y;
            }
            t
        }
    };
    let t_norm = thrust.norm();
    let direction = direction_text(row, plane, thrust);
    let (block, block_text, soil_text) = match plane {
        Plane::Horizontal | Plane::Sag => {
            let (sigma, soil_text) = match (row.sigma, row.soil.as_deref()) {
                (Some(s), _) => (s, format!("typed {}", report.fmt(s, Q::Pressure))),
                (None, Some(key)) => preset_bearing(key).map_err(&err)?,
                (None, None) => match default_soil {
                    "custom" => match default_sigma {
                        Some(s) => (s, format!("typed {}", report.fmt(s, Q::Pressure))),
                        None => {
                            return Err((
                                true,
                                format!(
                                    "row {line}: type the allowable soil bearing on the page, or give soil= on the row"
                                ),
                            ))
                        }
                    },
                    key => preset_bearing(key).map_err(&err)?,
                },
            };
            let load = if plane == Plane::Horizontal {
                (thrust.x.powi(2) + thrust.y.powi(2)).sqrt()
            } else {
                t_norm
            };
            let area = sf * load / sigma;
            let h = row.h.unwrap_or(default_h);
            let w = area / h;
            let text = format!(
                "bearing {}: {} high × {} wide",
                report.fmt(area, Q::Area),
                report.fmt(h, Q::Length),
                report.fmt(w, Q::Length)
            );
            (Block::Bearing { h, w }, text, soil_text)
        }
        Plane::Crest => {
            let t_up = thrust.y.max(0.0);
            let volume = sf * t_up / gamma_c;
            let side = volume.cbrt();
            let text = format!(
                "gravity {} ({} of concrete), cube {}",
                report.fmt(volume, Q::Volume),
                report.fmt(gamma_c * volume / STANDARD_GRAVITY, Q::Mass),
                report.fmt(side, Q::Length)
            );
            (
                Block::Gravity {
                    volume,
                    side,
                    height: side,
                },
                text,
                "not used (gravity block)".to_string(),
            )
        }
    };
    Ok(Solved {
        row: row.clone(),
        area_d,
        on_od: uses_od,
        p,
        basis,
        thrust,
        plane,
        block,
        block_text,
        soil_text,
        direction,
        od: od_main,
        od2: od_second,
        closed_form,
    })
}

fn preset_bearing(key: &str) -> Result<(f64, String), String> {
    match tb::soil(key) {
        Some(s) if s.bearing > 0.0 => Ok((s.bearing, format!("{} ({})", s.soil, s.table.short()))),
        Some(s) => Err(format!(
            "{} gives no bearing in the {}: a block cannot bear on it",
            s.soil,
            s.table.short()
        )),
        None => Err(format!("unknown soil '{key}'")),
    }
}

fn direction_text(row: &Row, plane: Plane, t: Vec3) -> String {
    if t.norm() == 0.0 {
        return "none (no thrust)".to_string();
    }
    match plane {
        Plane::Horizontal => {
            let a = t.y.atan2(t.x).to_degrees();
            let side = if a.abs() < 0.05 || (a.abs() - 180.0).abs() < 0.05 {
                "along the axis".to_string()
            } else if a > 0.0 {
                "to the left".to_string()
            } else {
                "to the right".to_string()
            };
            let what = match row.kind {
                RowKind::Fitting(FittingKind::Bend) => "outward on the bisector, ",
                RowKind::Fitting(FittingKind::Tee) => "away from the branch, ",
                RowKind::Fitting(FittingKind::DeadEnd) => "toward the cap, ",
                RowKind::Fitting(FittingKind::Reducer) => "toward the small end, ",
                RowKind::Force => "",
            };
            format!("{what}{:.1}° from the inlet flow, {side}", a.abs())
        }
        Plane::Crest => format!("up and out, {:.1}° above horizontal", t.y.atan2(t.x.abs()).to_degrees()),
        Plane::Sag => format!(
            "down and out, {:.1}° below horizontal",
            (-t.y).atan2(t.x.abs()).to_degrees()
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalog::{demo_inputs, Request};
    use approx::assert_relative_eq;

    fn request(rows: &str, pairs: &[(&str, &str)]) -> Request {
        let mut request = Request::default();
        for (k, v) in demo_inputs(&spec()) {
            request.inputs.insert(k, v);
        }
        request.inputs.insert("rows".into(), rows.into());
        for (k, v) in pairs {
            request.inputs.insert(k.to_string(), v.to_string());
        }
        request
    }

    fn errors(rows: &str) -> Vec<String> {
        match crate::solve(KEY, &request(rows, &[])).result {
            Err(crate::SolveError::Fields(e)) => e.iter().map(|e| format!("{}: {}", e.field, e.kind)).collect(),
            other => panic!("expected errors, got {other:?}"),
        }
    }

    #[test]
    fn demo_solves() {
        let s = crate::solve(KEY, &request(DEMO_ROWS, &[]))
            .result
            .map_err(|e| e.to_string());
        let s = s.unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.output("row_count").map(|o| o.si), Some(6.0));
        assert_eq!(s.tables[0].rows.len(), 7);
    }

    #[test]
    fn the_method_note_examples_parse() {
        let examples = "bend 45deg di52_12 nfpa24_sand tag=B1\n\
            tee size=sch40_12 size2=sch40_6 joint=welded p=16bar\n\
            reducer c900dr18_12 c900dr18_8\n\
            bend 22.5deg di52_8 turn=down\n\
            dead_end d=200mm od=219.1mm h=0.9m\n\
            force thrust=40kN sigma=150kPa";
        let s = crate::solve(KEY, &request(examples, &[]))
            .result
            .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.output("row_count").map(|o| o.si), Some(6.0));
    }

    #[test]
    fn the_governing_row_opens_on_the_thrust_restraint_page_with_the_same_thrust() {
        for rows in [
            "bend 90deg di52_12 p=150psi soil=safe_sand h=2ft\ndead_end di52_8",
            "tee size=sch40_12 size2=sch40_6 joint=welded p=16bar sigma=150kPa",
            "bend 22.5deg di52_8 turn=down p=10bar",
        ] {
            let s = crate::solve(KEY, &request(rows, &[]))
                .result
                .unwrap_or_else(|e| panic!("{e}"));
            let link = &s.carry_over[0];
            let mut target = Request::default();
            for (k, v) in &link.inputs {
                target.inputs.insert(k.to_string(), v.clone());
            }
            let t = crate::solve(link.calculator, &target)
                .result
                .unwrap_or_else(|e| panic!("{rows}: {e}"));
            let here = s.output("max_thrust").map(|o| o.si).unwrap_or(0.0);
            let there = t.output("thrust").map(|o| o.si).unwrap_or(f64::NAN);
            assert_relative_eq!(here, there, max_relative = 1e-6);
        }
    }

    #[test]
    fn unchecked_sliding_of_a_vertical_block_is_said() {
        let said = |rows: &str| {
            let s = crate::solve(KEY, &request(rows, &[]))
                .result
                .unwrap_or_else(|e| panic!("{e}"));
            s.warnings.iter().any(|w| w.message.contains("sliding is NOT checked"))
        };
        assert!(said("bend 45deg di52_12 turn=down legs=one_level"));
        assert!(!said("bend 45deg di52_12 turn=down"));
        assert!(!said("bend 45deg di52_12"));
    }

    #[test]
    fn a_bend_row_matches_the_static_formula() {
        // Derived from the definition: T = 2 p A sin(θ/2) on the OD (push-on joints).
        let s = crate::solve(KEY, &request("bend 90deg d=300mm od=320mm p=10bar", &[]))
            .result
            .unwrap_or_else(|e| panic!("{e}"));
        let expected = 2.0 * 1e6 * PI * 0.32 * 0.32 / 4.0 * (PI / 4.0).sin();
        assert_relative_eq!(
            s.output("max_thrust").map(|o| o.si).unwrap_or(0.0),
            expected,
            max_relative = 1e-9
        );
    }

    #[test]
    fn row_errors_name_the_row_and_token() {
        let e = errors("bend 45deg di52_12\nelbw 45deg di52_12");
        assert!(e[0].starts_with("rows: row 2: 'elbw'"), "{e:?}");
        let e = errors("bend 45 di52_12");
        assert!(e[0].contains("row 1") && e[0].contains("'45'"), "{e:?}");
        let e = errors("bend 45deg di52_12 p=-5psi");
        assert!(e[0].contains("row 1: p is a gauge pressure"), "{e:?}");
        let e = errors("bend 45deg di52_12 sigma=0kPa");
        assert!(e[0].contains("sigma (soil bearing) must be at least 1 kPa"), "{e:?}");
        let e = errors("force thrust=5e-324N");
        assert!(e[0].contains("thrust must be at least 1 N and at most 1 GN"), "{e:?}");
        let e = errors("force thrust=2000MN");
        assert!(e[0].contains("at most 1 GN"), "{e:?}");
        let e = errors("bend 45deg d=300mm od=320mm d=0.0001mm");
        assert!(e[0].contains("given twice"), "{e:?}");
        let e = errors("bend 45deg d=0.0001mm od=320mm");
        assert!(e[0].contains("at least 1 mm"), "{e:?}");
        let e = errors("bend 45deg 12in");
        assert!(e[0].contains("bare length '12in' is ambiguous"), "{e:?}");
        let e = errors("bend di52_12");
        assert!(e[0].contains("needs its angle"), "{e:?}");
        let e = errors("tee di52_12 soil=safe_muck di52_8");
        assert!(e[0].contains("no bearing"), "{e:?}");
        let e = errors("reducer di52_8 di52_12");
        assert!(e[0].contains("smaller than the large end"), "{e:?}");
        let e = errors("bend 45deg di52_12 angle=30deg");
        assert!(e[0].contains("given twice"), "{e:?}");
        let e = errors("# only a comment");
        assert!(e[0].contains("no fittings"), "{e:?}");
    }

    /// 500 rows: every 23rd row's thrust against the same fitting solved alone on
    /// the thrust-restraint page (through its carried link), and the totals against
    /// the rows; prints the native solve time and the length of the rows as a URL
    /// query parameter (no assertion on time).
    #[test]
    fn five_hundred_rows_match_single_fitting_solves() {
        let kinds = [
            "bend 45deg di52_12 nfpa24_sand tag=B",
            "bend 90deg sch40_8 joint=welded p=16bar turn=right tag=E",
            "tee di52_12 di52_8 tag=T",
            "reducer c900dr18_12 c900dr18_8 tag=R",
            "bend 22.5deg di52_8 turn=down tag=V",
            "dead_end di52_16 h=1.2m tag=H",
        ];
        let rows: Vec<String> = (0..500).map(|i| format!("{}{}", kinds[i % kinds.len()], i)).collect();
        let text = rows.join("\n");
        let req = request(&text, &[]);
        let start = std::time::Instant::now();
        let outcome = crate::solve(KEY, &req);
        let elapsed = start.elapsed();
        let s = outcome.result.unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.output("row_count").map(|o| o.si), Some(500.0));
        assert!(s.defects.is_empty(), "{:?}", s.defects);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        // The plot holds each row's thrust in its axis unit.
        let plot = s.plots.iter().find(|p| p.key == "thrust_by_row").expect("thrust plot");
        let unit = plot.y_label.split(['(', ')']).nth(1).expect("unit in the axis label");
        let per_unit = crate::units::convert_to(1.0, Q::Force, unit).expect("a force unit");
        let thrusts: Vec<f64> = plot.series[0].points.iter().map(|p| p[1] / per_unit).collect();
        assert_eq!(thrusts.len(), 500);
        let total: f64 = thrusts.iter().sum();
        assert_relative_eq!(s.output("total_thrust").unwrap().si, total, max_relative = 1e-9);
        let max = thrusts.iter().copied().fold(0.0, f64::max);
        assert_relative_eq!(s.output("max_thrust").unwrap().si, max, max_relative = 1e-12);
        for i in (0..500).step_by(23) {
            // The row alone, opened on the thrust-restraint page by its own link.
            let alone = crate::solve(KEY, &request(&rows[i], &[]))
                .result
                .unwrap_or_else(|e| panic!("row {i}: {e}"));
            let link = &alone.carry_over[0];
            let mut target = Request::default();
            for (k, v) in &link.inputs {
                target.inputs.insert(k.to_string(), v.clone());
            }
            let page = crate::solve(link.calculator, &target)
                .result
                .unwrap_or_else(|e| panic!("row {i} on the page: {e}"));
            let there = page.output("thrust").map(|o| o.si).unwrap_or(f64::NAN);
            assert_relative_eq!(thrusts[i], there, max_relative = 1e-6);
            assert!(thrusts[i] > 1e3, "row {i}: {}", thrusts[i]);
        }
        // URLSearchParams encoding: unreserved bytes stay, space → '+', others %XX.
        let encoded: usize = text
            .bytes()
            .map(|b| {
                if b.is_ascii_alphanumeric() || b"*-._ ".contains(&b) {
                    1
                } else {
                    3
                }
            })
            .sum();
        println!(
            "line-schedule: 500 rows solved in {:.2} ms (this build); rows text {} bytes, {} bytes URL-encoded",
            elapsed.as_secs_f64() * 1e3,
            text.len(),
            encoded
        );
    }
}
