//! The line schedule's typed inputs and pure model: each row's design pressure,
//! static thrust and block, by the same functions as the thrust-restraint page
//! ([`crate::restraint`]), so a row and that page agree on the same fitting.

use uom::si::f64::{Length, Pressure, Ratio, Time, Velocity};

use crate::catalog::Values;
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::restraint::block::{self, Block, FaceGiven};
use crate::restraint::pressure::{self, Anchoring, Governing, Material, PressureBasis, TestRule};
use crate::restraint::soil::{self, SoilPreset, SoilRefusal};
use crate::restraint::{self, diameters, FittingKind, Joint, Plane, StaticFitting};
use crate::vector::Vec3;

use super::super::{common, surge};
use super::rows::{parse, Row, RowKind, Turn};

/// The page's settings, validated, and the parsed rows.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub rows: Vec<Row>,
    pub basis: PressureBasis,
    /// Working pressure of rows without their own.
    pub work: Pressure,
    pub test: Option<TestBasis>,
    /// Surge allowance above working (the page's `dp_surge`), when typed.
    pub surge: Option<Pressure>,
    /// The surge computed for each row's own pipe, when chosen (`surge_from=computed`).
    pub computed_surge: Option<SurgeSettings>,
    /// Elevation of the test point where the page's pressures apply (`z_test`).
    pub z_test: Option<Length>,
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

/// What a row's computed surge needs besides the row's pipe: the surge page's
/// method (see [`crate::calculators::surge`]) applied to each row's bore and wall.
#[derive(Clone, Debug)]
pub struct SurgeSettings {
    /// Velocity stopped, m/s, for rows without `dv=`.
    pub dv: Option<Velocity>,
    /// The wall material; `FromSize` takes each row's size preset family.
    pub material: Material,
    /// A typed Young's modulus (`material=custom`), Pa.
    pub e_typed: Option<Pressure>,
    pub anchoring: Anchoring,
    pub bulk_modulus: Pressure,
    /// Length to the reflecting boundary and the closure time: when both are
    /// given, a closure slower than 2L/a takes the slow-closure estimate.
    pub closure: Option<(Length, Time)>,
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
    let test = if basis.wants_test() {
        Some(match values.choice("test_rule")? {
            "custom" => TestBasis::Typed(common::typed_test_pressure(values)?),
            key => TestBasis::Rule(
                pressure::test_rule(key).ok_or_else(|| FieldError::inconsistent("test_rule", "unknown rule"))?,
            ),
        })
    } else {
        None
    };
    let computed_surge = match values.choice("surge_from").unwrap_or("typed") {
        "computed" => Some(read_surge_settings(values)?),
        _ => None,
    };
    let surge = match computed_surge {
        Some(_) => None,
        None => values.typed_opt::<Pressure>("dp_surge"),
    };
    let has_surge = surge.is_some() || computed_surge.is_some();
    if let Some(TestBasis::Rule(r)) = &test {
        if r.needs_surge && !has_surge {
            return Err(FieldError::inconsistent(
                "dp_surge",
                "this test rule adds the calculated surge: give the surge allowance, or compute it per row",
            )
            .into());
        }
    }
    if basis == PressureBasis::Surge && !has_surge {
        return Err(FieldError::inconsistent(
            "dp_surge",
            "the surge basis needs the surge allowance, typed or computed per row",
        )
        .into());
    }
    let z_test = values.typed_opt::<Length>("z_test");
    if z_test.is_none() {
        if let Some(row) = rows.iter().find(|r| r.z.is_some()) {
            return Err(FieldError::inconsistent(
                "z_test",
                format!(
                    "row {} gives its elevation z=: type the test point's elevation on the same datum (from \
                        −1000 m to 10 000 m)",
                    row.line
                ),
            )
            .into());
        }
    }
    Ok(Inputs {
        rows,
        basis,
        work,
        test,
        surge,
        computed_surge,
        z_test,
        sf,
        default_h,
        gamma_c,
        default_joint,
        default_soil,
        default_sigma,
        restrained: super::super::restrained_length::schedule::read(values)?,
    })
}

fn read_surge_settings(values: &Values) -> Result<SurgeSettings, FieldErrors> {
    let material = Material::from_key(values.choice("material").unwrap_or("from_size"))
        .ok_or_else(|| FieldError::inconsistent("material", "choose the pipe wall material for the wave speed"))?;
    let e_typed = values.typed_opt::<Pressure>("e_pipe");
    if material == Material::Custom && e_typed.is_none() {
        return Err(
            FieldError::inconsistent("e_pipe", "type Young's modulus of the wall, or choose a material").into(),
        );
    }
    let closure = match (
        values.typed_opt::<Length>("length"),
        values.typed_opt::<Time>("closure_time"),
    ) {
        (Some(l), Some(t)) => Some((l, t)),
        (None, None) => None,
        (Some(_), None) => {
            return Err(FieldError::inconsistent(
                "closure_time",
                "give the closure time with the length (or clear both for the instantaneous Joukowsky rise)",
            )
            .into())
        }
        (None, Some(_)) => {
            return Err(FieldError::inconsistent(
                "length",
                "give the length to the reflecting boundary with the closure time (or clear both)",
            )
            .into())
        }
    };
    Ok(SurgeSettings {
        dv: values.typed_opt("dv"),
        material,
        e_typed,
        anchoring: Anchoring::from_key(values.choice("anchoring").unwrap_or("joints")).unwrap_or(Anchoring::Joints),
        bulk_modulus: values
            .typed_opt("bulk_modulus")
            .unwrap_or(Pressure::new::<uom::si::pressure::pascal>(pressure::WATER_BULK_MODULUS)),
        closure,
    })
}

/// Whether the page's basis or test rule uses a surge allowance at all (a computed
/// surge that nothing uses is not computed, so it asks for nothing).
pub fn surge_used(inputs: &Inputs) -> bool {
    inputs.basis.wants_surge() || matches!(&inputs.test, Some(TestBasis::Rule(r)) if r.needs_surge)
}

/// A row's computed surge.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RowSurge {
    pub wave_speed: f64,
    /// The surge allowance used, Pa.
    pub dp: f64,
    /// Whether the closure is slower than 2L/a (the slow-closure estimate used).
    pub slow: bool,
}

/// The surge of a row's pipe: the wave speed from its bore, wall and material, the
/// Joukowsky rise ρ·a·ΔV, or with a closure time slower than 2L/a the smaller
/// slow-closure estimate 2ρLΔV/t_c (the surge page's method).
fn row_surge(
    row: &Row,
    main: restraint::Diameters,
    settings: &SurgeSettings,
    fluid: &Fluid,
) -> Result<RowSurge, String> {
    let line = row.line;
    let dv = row.dv.or(settings.dv.map(|v| v.value)).ok_or_else(|| {
        format!("row {line}: the surge is computed per row: give the velocity stopped on the page or dv= on the row")
    })?;
    let material = match settings.material {
        Material::FromSize => match row.size.as_deref().and_then(pipe_sizes::find) {
            Some(size) => Material::of_family(size.family),
            None => {
                return Err(format!(
                    "row {line}: typed diameters have no known wall material: choose the material on the page"
                ))
            }
        },
        m => m,
    };
    let (e_modulus, poisson) = match (material, settings.e_typed) {
        (Material::Custom, Some(e)) => (e.value, 0.3),
        (m, _) => match pressure::material(m.key()) {
            Some((e, nu, _)) => (e, nu),
            None => {
                return Err(format!(
                    "row {line}: type Young's modulus of the wall, or choose a material"
                ))
            }
        },
    };
    let wall = (main.od - main.id) / 2.0;
    let a = pressure::wave_speed(
        settings.bulk_modulus.value,
        fluid.density,
        main.id,
        wall,
        e_modulus,
        settings.anchoring.c1(poisson),
    );
    let joukowsky = pressure::joukowsky(fluid.density, a, dv);
    let (dp, slow) = match settings.closure {
        Some((length, time)) if time.value > 2.0 * length.value / a => (
            surge::model::slow_closure(fluid.density, length.value, dv, time.value).min(joukowsky),
            true,
        ),
        _ => (joukowsky, false),
    };
    Ok(RowSurge {
        wave_speed: a,
        dp,
        slow,
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

/// The design pressure for a working pressure `pw`, Pa, on the page's basis, with
/// the surge allowance `surge` (typed on the page or computed for the row).
pub fn design_of(inputs: &Inputs, pw: f64, surge: Option<f64>) -> (f64, Governing, Option<&'static str>) {
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
    /// The forces the engine sums to the row's thrust, N: the pressure on both ends
    /// (p·A₁ + p·A₂; they cancel to a reducer's thrust), or a force row's typed force.
    /// The scale of the check of the thrusts' sum, so their rounding is not taken
    /// for a disagreement.
    pub end_forces: f64,
    /// The computed surge of the row's pipe, when chosen.
    pub surge: Option<RowSurge>,
    /// The static head from the test point to the row, ρ·g·(z_test − z), Pa (0 without z=).
    pub head: f64,
    /// [`pressure::hydrostatic_terms`] of the row (0 without z=), which the elevation
    /// check's tolerance is relative to.
    pub hydrostatic_terms: f64,
    /// The row's pressure by the engine's energy balance of the still line from the
    /// test point (the independent check of `p`), when the row gives z=.
    pub p_by_energy_balance: Option<f64>,
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
    let main = match row.kind {
        RowKind::Fitting(_) => Some(
            diameters(
                row.size.as_deref().unwrap_or(pipe_sizes::CUSTOM),
                row.d,
                row.od,
                ("size", "d", "od"),
            )
            .map_err(|e| err(e.kind.to_string()))?,
        ),
        RowKind::Force => None,
    };
    let surge = match (&inputs.computed_surge, main) {
        (Some(settings), Some(main)) if row.p.is_none() && surge_used(inputs) => {
            Some(row_surge(row, main, settings, fluid).map_err(|m| (false, m))?)
        }
        _ => None,
    };
    let mut head = 0.0;
    let mut hydrostatic_terms = 0.0;
    let mut p_by_energy_balance = None;
    let (p, from) = match (row.p, row.pw) {
        (Some(p), _) => (p, DesignFrom::RowPressure),
        (pw, _) => {
            let surge_dp = surge.map(|s| s.dp).or(inputs.surge.map(|s| s.value));
            let (p_test_point, governing, rule) = design_of(inputs, pw.unwrap_or(inputs.work.value), surge_dp);
            let mut p = p_test_point;
            if let (Some(z_test), Some(z)) = (inputs.z_test, row.z) {
                head = pressure::elevation_head(fluid.density, z_test.value, z);
                hydrostatic_terms = pressure::hydrostatic_terms(fluid.density, z_test.value, z);
                p += head;
                if p < 0.0 {
                    return Err(err(
                        "the fitting lies so far above the test point that the pressure there is below zero gauge: \
                            check z= and the test point's elevation"
                            .to_string(),
                    ));
                }
                p_by_energy_balance = Some(
                    pressure::hydrostatic_by_energy_balance(p_test_point, z_test.value, z, fluid)
                        .map_err(|e| err(e.to_string()))?,
                );
            }
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
    let end_forces;
    let thrust = match row.kind {
        RowKind::Force => {
            let t = row.thrust.unwrap_or(0.0);
            closed_form = t;
            end_forces = t.abs();
            // As the thrust-restraint page draws a given thrust with no typed angle.
            plane.given_thrust(t, plane.default_elevation())
        }
        RowKind::Fitting(kind) => {
            let main = main.ok_or_else(|| err("a fitting row needs its size".to_string()))?;
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
            end_forces = fit.end_forces(p);
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
        end_forces,
        surge,
        head,
        hydrostatic_terms,
        p_by_energy_balance,
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
