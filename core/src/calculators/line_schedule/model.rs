//! The line schedule's typed inputs and pure model: each row's design pressure,
//! static thrust and block, by the same functions as the thrust-restraint page
//! ([`crate::restraint`]), so a row and that page agree on the same fitting.

use uom::si::f64::{Length, Pressure, Ratio};

use crate::catalog::Values;
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::restraint::block::{self, Block, FaceGiven};
use crate::restraint::pressure::{self, Governing, PressureBasis, TestRule};
use crate::restraint::soil::{self, SoilPreset, SoilRefusal};
use crate::restraint::{self, diameters, FittingKind, Joint, Plane, StaticFitting};
use crate::vector::Vec3;

use super::rows::{parse, Row, RowKind, Turn};

/// The page's settings, validated, and the parsed rows.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub rows: Vec<Row>,
    pub basis: PressureBasis,
    /// Working pressure of rows without their own.
    pub work: Pressure,
    pub test: Option<TestBasis>,
    /// Surge allowance above working (the page's `dp_surge`).
    pub surge: Option<Pressure>,
    pub sf: Ratio,
    pub default_h: Length,
    /// Unit weight of concrete, N/m³.
    pub gamma_c: f64,
    pub default_joint: Joint,
    pub default_soil: String,
    pub default_sigma: Option<Pressure>,
    /// The restrained-length column's cover, soil class and laying condition.
    pub restrained: Option<super::super::restrained_length::schedule::Column>,
}

/// The field test pressure of the page: typed, or a named rule.
#[derive(Clone, Debug)]
pub enum TestBasis {
    Typed(Pressure),
    Rule(&'static TestRule),
}

/// Reads the page's values once.
///
/// # Errors
/// Every bad row (on `rows`), or the first bad page field.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let text = values.text("rows")?;
    let rows = parse(text).map_err(|errors| {
        errors
            .into_iter()
            .map(|e| FieldError::inconsistent("rows", e))
            .collect::<Vec<_>>()
    })?;
    if rows.is_empty() {
        return Err(
            FieldError::inconsistent("rows", "no fittings: type one per line, e.g. 'bend 45deg di52_12'").into(),
        );
    }
    let key = values.choice("p_basis")?;
    let basis = PressureBasis::from_key(key)
        .ok_or_else(|| FieldError::inconsistent("p_basis", "unknown design pressure basis"))?;
    let work = values.typed("p")?;
    let sf = values.typed("sf")?;
    let default_h = values.typed("block_h")?;
    let gamma_c = values.quantity("gamma_c")?;
    let default_joint =
        Joint::from_key(values.choice("joint")?).ok_or_else(|| FieldError::inconsistent("joint", "unknown joint"))?;
    let default_soil = values.choice("soil")?.to_string();
    let default_sigma = if default_soil == "custom" {
        values.typed_opt("sigma")
    } else {
        None
    };
    let test =
        if basis.wants_test() {
            Some(match values.choice("test_rule")? {
                "custom" => TestBasis::Typed(values.typed_opt("p_test").ok_or_else(|| {
                    FieldError::inconsistent("p_test", "type the test pressure, or choose a named rule")
                })?),
                key => TestBasis::Rule(
                    pressure::test_rule(key).ok_or_else(|| FieldError::inconsistent("test_rule", "unknown rule"))?,
                ),
            })
        } else {
            None
        };
    let surge = values.typed_opt::<Pressure>("dp_surge");
    if let Some(TestBasis::Rule(r)) = &test {
        if r.needs_surge && surge.is_none() {
            return Err(FieldError::inconsistent(
                "dp_surge",
                "this test rule adds the calculated surge: give the surge allowance",
            )
            .into());
        }
    }
    if basis == PressureBasis::Surge && surge.is_none() {
        return Err(FieldError::inconsistent("dp_surge", "the surge basis needs the surge allowance").into());
    }
    Ok(Inputs {
        rows,
        basis,
        work,
        test,
        surge,
        sf,
        default_h,
        gamma_c,
        default_joint,
        default_soil,
        default_sigma,
        restrained: super::super::restrained_length::schedule::read(values)?,
    })
}

/// Where a row's design pressure comes from.
#[derive(Clone, Debug, PartialEq)]
pub enum DesignFrom {
    /// The row's own `p=`.
    RowPressure,
    /// The page's basis on a working pressure (the row's `pw=` when `true`).
    Basis {
        governing: Governing,
        /// The rule's key, or `None` for a typed test pressure.
        rule: Option<&'static str>,
        row_working: bool,
    },
}

/// The design pressure for a working pressure `pw`, Pa, on the page's basis.
pub fn design_of(inputs: &Inputs, pw: f64) -> (f64, Governing, Option<&'static str>) {
    let surge = inputs.surge.map(|s| s.value);
    let (test, rule) = match &inputs.test {
        None => (None, None),
        Some(TestBasis::Typed(p)) => (Some(p.value), None),
        Some(TestBasis::Rule(r)) => (Some(r.test_pressure(pw, None, surge.unwrap_or(0.0))), Some(r.key)),
    };
    let with_surge = if inputs.basis.wants_surge() {
        surge.map(|dp| pw + dp)
    } else {
        None
    };
    let (p, governing) = pressure::design_pressure(inputs.basis, pw, test, with_surge);
    (p, governing, rule)
}

/// Where a row's soil bearing comes from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum SoilUsed {
    Typed(f64),
    Preset(&'static SoilPreset),
    /// A gravity block bears on no face.
    NotUsed,
}

/// A solved row.
#[derive(Clone, Debug)]
pub struct SolvedRow {
    pub row: Row,
    /// Diameter of the thrust area, m (0 for a force row).
    pub area_d: f64,
    /// Whether the thrust area is on the outside diameter.
    pub on_od: bool,
    pub p: f64,
    pub from: DesignFrom,
    pub thrust: Vec3,
    pub plane: Plane,
    pub block: Block,
    /// Bearing area of a bearing block, m².
    pub bearing_area: f64,
    /// Concrete mass of a gravity block, kg.
    pub block_mass: f64,
    pub soil: SoilUsed,
    pub joint: Joint,
    pub od: f64,
    pub od2: Option<f64>,
    /// The row's thrust by its closed form, computed without the engine.
    pub closed_form: f64,
}

/// Solves every row (at most 20 errors are collected).
///
/// # Errors
/// The rows that cannot be solved, on `rows` (or on `sigma` when the page's typed
/// bearing is missing).
pub fn solve(inputs: &Inputs) -> Result<Vec<SolvedRow>, FieldErrors> {
    let fluid = Fluid::water_kelvin(288.15).map_err(|e| FieldError::inconsistent("rows", e.to_string()))?;
    let mut solved = Vec::with_capacity(inputs.rows.len());
    let mut errors = FieldErrors::default();
    for row in &inputs.rows {
        match solve_row(row, &fluid, inputs) {
            Ok(s) => solved.push(s),
            Err((on_sigma, message)) => errors.push(FieldError::inconsistent(
                if on_sigma { "sigma" } else { "rows" },
                message,
            )),
        }
        if errors.0.len() >= 20 {
            break;
        }
    }
    errors.or_ok(solved)
}

fn solve_row(row: &Row, fluid: &Fluid, inputs: &Inputs) -> Result<SolvedRow, (bool, String)> {
    let line = row.line;
    let err = |m: String| (false, format!("row {line}: {m}"));
    let (p, from) = match (row.p, row.pw) {
        (Some(p), _) => (p, DesignFrom::RowPressure),
        (pw, _) => {
            let (p, governing, rule) = design_of(inputs, pw.unwrap_or(inputs.work.value));
            (
                p,
                DesignFrom::Basis {
                    governing,
                    rule,
                    row_working: pw.is_some(),
                },
            )
        }
    };
    let plane = match row.turn {
        Turn::Down => Plane::Crest,
        Turn::Up => Plane::Sag,
        Turn::Left | Turn::Right => Plane::Horizontal,
    };
    let joint = row.joint.unwrap_or(inputs.default_joint);
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
            let main = diameters(
                row.size.as_deref().unwrap_or(pipe_sizes::CUSTOM),
                row.d,
                row.od,
                ("size", "d", "od"),
            )
            .map_err(|e| err(e.kind.to_string()))?;
            od_main = main.od;
            area_d = joint.thrust_diameter(main);
            let second = match kind {
                FittingKind::Tee | FittingKind::Reducer => {
                    let s = diameters(
                        row.size2.as_deref().unwrap_or(pipe_sizes::CUSTOM),
                        row.d2,
                        row.od2,
                        ("size2", "d2", "od2"),
                    )
                    .map_err(|e| err(e.kind.to_string()))?;
                    od_second = Some(s.od);
                    Some(s)
                }
                _ => None,
            };
            let (a1, a2) =
                restraint::thrust_areas(kind, joint, main, second).map_err(|e| err(e.message().to_string()))?;
            let fit = StaticFitting {
                kind,
                angle: row.angle.unwrap_or(0.0),
                area: a1,
                area2: a2,
                plane,
                symmetric: row.symmetric,
            };
            closed_form = restraint::closed_form_thrust(&fit, p).0;
            let balance = restraint::static_balance(&fit, p, fluid).map_err(|e| err(e.to_string()))?;
            let mut t = balance.thrust();
            if row.turn == Turn::Right {
                t.y = -t.y;
            }
            t
        }
    };
    let sf = inputs.sf.value;
    let (block, bearing_area, block_mass, soil) = match plane {
        Plane::Horizontal | Plane::Sag => {
            let soil = match (row.sigma, row.soil.as_deref()) {
                (Some(s), _) => SoilUsed::Typed(s),
                (None, Some(key)) => preset(key).map_err(&err)?,
                (None, None) => match inputs.default_soil.as_str() {
                    "custom" => match inputs.default_sigma {
                        Some(s) => SoilUsed::Typed(s.value),
                        None => {
                            return Err((
                                true,
                                format!(
                                    "row {line}: type the allowable soil bearing on the page, or give soil= on \
                                            the row"
                                ),
                            ))
                        }
                    },
                    key => preset(key).map_err(&err)?,
                },
            };
            let sigma = match soil {
                SoilUsed::Typed(s) => s,
                SoilUsed::Preset(s) => s.bearing,
                SoilUsed::NotUsed => 0.0,
            };
            let (t_h, _) = plane.horizontal_vertical(thrust);
            let load = if plane == Plane::Horizontal { t_h } else { thrust.norm() };
            let area = block::bearing_area(sf, load, sigma);
            let (h, w) = block::face(area, FaceGiven::Height(row.h.unwrap_or(inputs.default_h.value)));
            (Block::Bearing { h, w }, area, 0.0, soil)
        }
        Plane::Crest => {
            let g = block::gravity_block(sf, thrust.y, inputs.gamma_c, false)
                .ok_or_else(|| err("the concrete must be heavier than water".to_string()))?;
            let side = g.volume.cbrt();
            (
                Block::Gravity {
                    volume: g.volume,
                    side,
                    height: side,
                },
                0.0,
                g.mass,
                SoilUsed::NotUsed,
            )
        }
    };
    Ok(SolvedRow {
        row: row.clone(),
        area_d,
        on_od: joint.uses_od(),
        p,
        from,
        thrust,
        plane,
        block,
        bearing_area,
        block_mass,
        soil,
        joint,
        od: od_main,
        od2: od_second,
        closed_form,
    })
}

fn preset(key: &str) -> Result<SoilUsed, String> {
    match soil::bearing_of(key) {
        Ok((_, s)) => Ok(SoilUsed::Preset(s)),
        Err(SoilRefusal::NoBearing(s)) => Err(format!(
            "{} gives no bearing in the {}: a block cannot bear on it",
            s.soil,
            s.table.short()
        )),
        Err(SoilRefusal::Unknown) => Err(format!("unknown soil '{key}'")),
    }
}
