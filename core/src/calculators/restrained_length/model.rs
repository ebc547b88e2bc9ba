//! The restrained-joint page's typed inputs and its pure model: the design
//! pressure, the fitting's thrust from the engine, and the restrained length by
//! both methods ([`crate::restraint::restrained`]).

use std::f64::consts::PI;

use uom::si::f64::{Angle, Length, Pressure, Ratio};

use crate::catalog::Values;
use crate::engine::{self, Balance};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::restraint::pressure::Material;
use crate::restraint::restrained::{
    self, BendHold, Encasement, Laying, Method, PipeLoads, SoilClass, Trench, UnitResistance, Wall,
};
use crate::restraint::{self, diameters, Diameters, FittingKind, Joint, Plane, StaticFitting};
use crate::units::STANDARD_GRAVITY;

use super::super::common;
use super::super::thrust_block::model::{self as block_model, PressureInputs, Pressures};

/// Everything the page was given, validated.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub kind: FittingKind,
    /// Deflection of a bend (unused otherwise).
    pub angle: Angle,
    pub plane: Plane,
    pub main: Diameters,
    /// Tee branch or reducer small end.
    pub second: Option<Diameters>,
    pub fluid: Fluid,
    pub pressure: PressureInputs,
    /// Wall density for the pipe's weight, kg/m³ (`None`: weight left out).
    pub wall_density: Option<f64>,
    pub soil: SoilInputs,
    pub laying: Laying,
    pub encasement: Encasement,
    pub sf: Ratio,
    pub method: Method,
    /// A tee's run restrained on each side (credited on one side).
    pub run_restrained: Option<Length>,
}

/// The soil and pipe-wall values, each typed or from the class.
#[derive(Clone, Debug)]
pub struct SoilInputs {
    pub class: Option<&'static SoilClass>,
    pub cover: Length,
    /// Unit weight, N/m³.
    pub gamma: f64,
    pub phi: Angle,
    pub cohesion: Pressure,
    pub typed_f_phi: Option<f64>,
    pub typed_f_c: Option<f64>,
}

fn keyed<T>(values: &Values, key: &'static str, from_key: fn(&str) -> Option<T>) -> Result<T, FieldError> {
    let text = values.choice(key)?;
    from_key(text).ok_or_else(|| FieldError::inconsistent(key, format!("'{text}' is not an option here")))
}

fn opt(values: &Values, key: &str) -> Option<f64> {
    values.is_set(key).then(|| values.quantity_or(key, 0.0))
}

/// Reads the page's values once.
///
/// # Errors
/// The first field error, named by its field.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let kind = keyed(values, "fitting", FittingKind::from_key)?;
    let (angle, plane) = if kind == FittingKind::Bend {
        (values.typed("angle")?, keyed(values, "plane", Plane::from_key)?)
    } else {
        (Angle::new::<uom::si::angle::radian>(0.0), Plane::Horizontal)
    };
    let size_key = values.choice("size")?.to_string();
    let main = diameters(&size_key, opt(values, "d"), opt(values, "od"), ("size", "d", "od"))?;
    let second = if matches!(kind, FittingKind::Tee | FittingKind::Reducer) {
        let key = values.choice("size2").unwrap_or(pipe_sizes::CUSTOM).to_string();
        Some(diameters(
            &key,
            opt(values, "d2"),
            opt(values, "od2"),
            ("size2", "d2", "od2"),
        )?)
    } else {
        None
    };
    let fluid = common::fluid_from(values)?;
    let pressure = block_model::read_pressure(values, main, &size_key)?;
    let material = match Material::from_key(values.choice("material").unwrap_or("from_size")) {
        Some(Material::FromSize) | None => pipe_sizes::find(&size_key).map(|s| Material::of_family(s.family)),
        Some(m) => Some(m),
    };
    Ok(Inputs {
        kind,
        angle,
        plane,
        main,
        second,
        fluid,
        pressure,
        wall_density: material.and_then(Material::wall_density),
        soil: read_soil(values)?,
        laying: keyed(values, "laying", Laying::from_key)?,
        encasement: keyed(values, "encasement", Encasement::from_key)?,
        sf: values.typed("sf")?,
        method: keyed(values, "rl_method", Method::from_key)?,
        run_restrained: values.typed_opt("run_restrained"),
    })
}

fn read_soil(values: &Values) -> Result<SoilInputs, FieldErrors> {
    let key = values.choice("soil_class")?;
    let class = restrained::soil_class(key);
    if class.is_none() && key != "custom" {
        return Err(FieldError::inconsistent("soil_class", format!("'{key}' is not a soil class")).into());
    }
    let typed = |field: &'static str, what: &str| -> Result<f64, FieldError> {
        opt(values, field).ok_or_else(|| {
            FieldError::inconsistent(
                field,
                format!("type the {what}, or choose a soil class in 'soil_class'"),
            )
        })
    };
    let (gamma, phi, cohesion) = match class {
        Some(c) => (
            opt(values, "gamma_s").unwrap_or(c.gamma),
            opt(values, "phi").unwrap_or(c.phi),
            opt(values, "cohesion").unwrap_or(c.cohesion),
        ),
        None => (
            typed("gamma_s", "unit weight of the soil")?,
            typed("phi", "friction angle of the soil (0 for a clay taken undrained)")?,
            opt(values, "cohesion").unwrap_or(0.0),
        ),
    };
    let typed_f_phi = opt(values, "f_phi");
    let typed_f_c = opt(values, "f_c");
    if class.is_none() && typed_f_phi.is_none() {
        return Err(FieldError::inconsistent(
            "f_phi",
            "with typed soil values, type the pipe-wall friction ratio f_φ (0 to 1) as well",
        )
        .into());
    }
    Ok(SoilInputs {
        class,
        cover: values.typed("cover")?,
        gamma,
        phi: Angle::new::<uom::si::angle::radian>(phi),
        cohesion: Pressure::new::<uom::si::pressure::pascal>(cohesion),
        typed_f_phi,
        typed_f_c,
    })
}

/// One method's result.
#[derive(Clone, Debug)]
pub struct MethodResult {
    pub method: Method,
    pub wall: Wall,
    /// The main pipe (a bend's legs, the pipe behind a dead end, a reducer's large
    /// side, a tee's run).
    pub main: UnitResistance,
    /// A tee's branch.
    pub branch: Option<UnitResistance>,
    /// The resistance per metre that sets the length (F_f + ½R_s, F_f, the uplift
    /// weight, or the branch's F_f), N/m.
    pub governing_resistance: f64,
    /// Restrained length on each side (the branch for a tee), m.
    pub length: f64,
    /// A tee's run that alone would carry the branch thrust, m.
    pub run_alone: Option<f64>,
    /// The resistance the length mobilises on the thrust line, N, and its formula.
    pub mobilised: (f64, &'static str),
}

/// The page's result.
#[derive(Clone, Debug)]
pub struct Solved {
    pub pressures: Pressures,
    pub fit: StaticFitting,
    pub balance: Balance,
    /// The thrust the restraint must carry, N: the resultant, or its upward part
    /// at a crest.
    pub thrust: f64,
    pub main_pipe: PipeLoads,
    pub branch_pipe: Option<PipeLoads>,
    pub trench: Trench,
    pub ductile_iron: MethodResult,
    pub pvc: MethodResult,
    /// The method in the headline.
    pub headline: Method,
    /// The run credited on a tee, m.
    pub run_credit: f64,
}

impl Solved {
    /// The result of the headline method.
    pub fn governing(&self) -> &MethodResult {
        match self.headline {
            Method::Pvc => &self.pvc,
            _ => &self.ductile_iron,
        }
    }
}

fn pipe_loads(d: Diameters, wall_density: Option<f64>, fluid: &Fluid) -> PipeLoads {
    let ring = PI / 4.0 * (d.od * d.od - d.id * d.id);
    PipeLoads {
        od: d.od,
        pipe_weight: wall_density.map_or(0.0, |rho| rho * STANDARD_GRAVITY * ring),
        water_weight: fluid.density * STANDARD_GRAVITY * PI / 4.0 * d.id * d.id,
    }
}

fn wall_of(inputs: &Inputs, method: Method) -> Wall {
    let s = &inputs.soil;
    let (class_phi, class_c) = match (s.class, method) {
        (Some(c), Method::Pvc) => c.pvc,
        (Some(c), _) => c.ductile_iron,
        (None, _) => (0.0, 0.0),
    };
    Wall {
        f_phi: s.typed_f_phi.unwrap_or(class_phi),
        f_c: s.typed_f_c.unwrap_or(class_c),
        encased: method == Method::DuctileIron && inputs.encasement == Encasement::Polyethylene,
    }
}

/// The pure model of the page.
///
/// # Errors
/// A fitting whose ends do not make it (`size2`), an engine refusal (`p`), a soil
/// that gives no resistance (`soil_class`).
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let pressures = block_model::design_pressure(&inputs.pressure, inputs.main, &inputs.fluid);
    let p = pressures.design;
    let (a1, a2) = restraint::thrust_areas(inputs.kind, Joint::Restrained, inputs.main, inputs.second)
        .map_err(|e| FieldError::inconsistent("size2", e.message()))?;
    let fit = StaticFitting {
        kind: inputs.kind,
        angle: inputs.angle.value,
        area: a1,
        area2: a2,
        plane: inputs.plane,
        symmetric: true,
    };
    let balance = restraint::static_balance(&fit, p, &inputs.fluid)
        .map_err(|e: engine::EngineError| FieldErrors::from(common::engine_error(e, "p")))?;
    let engine_thrust = balance.thrust();
    let crest = inputs.kind == FittingKind::Bend && inputs.plane == Plane::Crest;
    let thrust = if crest { engine_thrust.y } else { engine_thrust.norm() };
    let main_pipe = pipe_loads(inputs.main, inputs.wall_density, &inputs.fluid);
    let branch_pipe = match (inputs.kind, inputs.second) {
        (FittingKind::Tee, Some(b)) => Some(pipe_loads(b, inputs.wall_density, &inputs.fluid)),
        _ => None,
    };
    let trench = Trench {
        cover: inputs.soil.cover.value,
        gamma: inputs.soil.gamma,
        phi: inputs.soil.phi.value,
        cohesion: inputs.soil.cohesion.value,
        kn: inputs.laying.kn(),
    };
    let run_credit = inputs.run_restrained.map_or(0.0, |l| l.value);
    let sf = inputs.sf.value;
    let by = |method: Method| -> Result<MethodResult, FieldErrors> {
        let wall = wall_of(inputs, method);
        let main = restrained::unit_resistance(main_pipe, trench, wall);
        let branch = branch_pipe.map(|b| restrained::unit_resistance(b, trench, wall));
        let half = inputs.angle.value / 2.0;
        let hold = if crest {
            BendHold::Weight
        } else {
            BendHold::FrictionAndBearing
        };
        let f = restrained::fitting_length(
            inputs.kind,
            hold,
            sf,
            p,
            (a1, a2),
            inputs.angle.value,
            &main,
            branch.as_ref(),
            run_credit,
        );
        let (resistance, length, run_alone) = (f.resistance, f.length, f.run_alone);
        let mobilised = match inputs.kind {
            FittingKind::Bend if crest => (2.0 * length * resistance * half.cos(), "2·L·(W_p + W_w + W_e)·cos(Δ/2)"),
            FittingKind::Bend => (2.0 * length * resistance * half.cos(), "2·L·(F_f + ½R_s)·cos(Δ/2)"),
            FittingKind::DeadEnd => (resistance * length, "F_f·L"),
            FittingKind::Reducer => (resistance * length, "F_f·L (large side)"),
            FittingKind::Tee if length > 0.0 => (
                resistance * length + main.r_s * run_credit,
                "F_f,branch·L_b + R_s,run·L_run",
            ),
            FittingKind::Tee => (main.r_s * run_alone.unwrap_or(0.0), "R_s,run·L_run alone"),
        };
        if !(resistance > 0.0) || !length.is_finite() {
            return Err(FieldError::inconsistent(
                "soil_class",
                "the soil and pipe wall give no resistance along the pipe (no friction angle, no adhesion): \
                    no length of restrained pipe can carry the thrust; check the soil values",
            )
            .into());
        }
        Ok(MethodResult {
            method,
            wall,
            main,
            branch,
            governing_resistance: resistance,
            length,
            run_alone,
            mobilised,
        })
    };
    let ductile_iron = by(Method::DuctileIron)?;
    let pvc = by(Method::Pvc)?;
    let headline = match inputs.method {
        Method::Longer if pvc.length > ductile_iron.length => Method::Pvc,
        Method::Longer => Method::DuctileIron,
        m => m,
    };
    Ok(Solved {
        pressures,
        fit,
        balance,
        thrust,
        main_pipe,
        branch_pipe,
        trench,
        ductile_iron,
        pvc,
        headline,
        run_credit,
    })
}
