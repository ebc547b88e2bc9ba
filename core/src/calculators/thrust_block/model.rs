//! The thrust-restraint page's typed inputs and its pure model: the design
//! pressure, the static thrust of the fitting at that pressure, and the block.
//!
//! [`read`] turns the page's [`Values`] into [`Inputs`] once (every field error
//! named there); [`solve`] is a pure function of the inputs (no report, no text)
//! returning a [`Solved`] that the report module shows. The equations are those of
//! the page's module doc and of [`crate::restraint`].

use uom::si::f64::{Angle, Force, Length, Pressure, Ratio, Velocity};

use crate::catalog::Values;
use crate::engine::{self, Balance};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::restraint::block::{self, Block, BlockDims, FaceGiven, GravityBlock};
use crate::restraint::pressure::{self, PressureBasis, TestRule};
use crate::restraint::soil::{self, SoilPreset, FRICTION_SOURCE, MAX_TYPED_BEARING, MIN_TYPED_BEARING};
use crate::restraint::{
    self, diameters, Diameters, FittingChoice, FittingKind, Joint, Legs, Plane, SizeMismatch, StaticFitting,
};
use crate::vector::Vec3;

use super::super::common;

/// Everything the page was given, validated.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub subject: Subject,
    pub plane: Plane,
    /// Safety factor on the thrust.
    pub sf: Ratio,
    pub block: BlockInputs,
    /// Outside diameter of the main end when the size gives one, m: drawn, and the
    /// least height of a bearing face (also for a given thrust).
    pub main_od: Option<f64>,
}

/// What is restrained: a fitting at the design pressure, or a thrust given as such.
#[derive(Clone, Debug)]
pub enum Subject {
    Given {
        thrust: Force,
        /// Angle above horizontal; `None`: from the plane.
        elevation: Option<Angle>,
    },
    Fitting(Box<FittingInputs>),
}

#[derive(Clone, Debug)]
pub struct FittingInputs {
    pub kind: FittingKind,
    /// Deflection of a bend (45° when the fitting is not a bend: unused).
    pub angle: Angle,
    pub legs: Legs,
    pub joint: Joint,
    /// The main (inlet) end, m.
    pub main: Diameters,
    /// The tee branch or reducer small end, m.
    pub second: Option<Diameters>,
    pub fluid: Fluid,
    pub pressure: PressureInputs,
}

/// How the design pressure is found.
#[derive(Clone, Debug)]
pub struct PressureInputs {
    pub basis: PressureBasis,
    pub work: Pressure,
    pub test: Option<TestGiven>,
    pub surge: Option<SurgeInputs>,
    /// The test point's and the fitting's elevations, when both are given: the
    /// pressures above are at the test point, the fitting sees them plus the static
    /// head between the two.
    pub elevations: Option<Elevations>,
}

/// The elevations of the test point and of the fitting.
#[derive(Clone, Copy, Debug)]
pub struct Elevations {
    pub z_test: Length,
    pub z_fitting: Length,
}

/// The field test pressure: typed, or by a named rule (EN 805 with a typed MDP).
#[derive(Clone, Debug)]
pub enum TestGiven {
    Typed(Pressure),
    Rule {
        rule: &'static TestRule,
        typed_mdp: Option<Pressure>,
    },
}

/// What the Joukowsky surge needs.
#[derive(Clone, Debug)]
pub struct SurgeInputs {
    pub dv: Velocity,
    /// The wave speed: typed, or computed from the wall and the liquid.
    pub wave: common::WaveGiven,
}

/// The block's inputs.
#[derive(Clone, Debug)]
pub struct BlockInputs {
    /// Allowable bearing (a bearing or sag block), and the preset it came from.
    pub bearing: Option<(Pressure, Option<&'static SoilPreset>)>,
    /// The preset key chosen (for the comparison table).
    pub soil_key: String,
    /// Friction coefficient of the sliding check and where it comes from.
    pub friction: Option<(f64, String)>,
    pub sf_slide: f64,
    pub face: Option<FaceGiven>,
    /// Unit weight of concrete, N/m³ (gravity block).
    pub gamma_c: f64,
    pub submerged: bool,
    pub gravity_h: Option<Length>,
}

fn opt(values: &Values, key: &str) -> Option<f64> {
    values.is_set(key).then(|| values.quantity_or(key, 0.0))
}

fn keyed<T>(values: &Values, key: &'static str, from_key: fn(&str) -> Option<T>) -> Result<T, FieldError> {
    let text = values.choice(key)?;
    from_key(text).ok_or_else(|| FieldError::inconsistent(key, format!("'{text}' is not an option here")))
}

/// Reads the page's values once.
///
/// # Errors
/// The first field error, named by its field, in the order the page reads them.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let choice = keyed(values, "fitting", FittingChoice::from_key)?;
    let plane = keyed(values, "plane", Plane::from_key)?;
    let sf = values.typed::<Ratio>("sf")?;
    let subject = match choice.kind() {
        None => Subject::Given {
            thrust: values.typed("thrust")?,
            elevation: values.typed_opt("thrust_elev"),
        },
        Some(kind) => Subject::Fitting(Box::new(read_fitting(values, kind)?)),
    };
    let main_od = values
        .choice("size")
        .ok()
        .and_then(|key| diameters(key, opt(values, "d"), opt(values, "od"), ("size", "d", "od")).ok())
        .map(|d| d.od);
    Ok(Inputs {
        subject,
        plane,
        sf,
        block: read_block(values, plane)?,
        main_od,
    })
}

fn read_fitting(values: &Values, kind: FittingKind) -> Result<FittingInputs, FieldErrors> {
    let fluid = common::fluid_from(values)?;
    let joint = keyed(values, "joint", Joint::from_key)?;
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
    let pressure = read_pressure(values, main, &size_key)?;
    let angle = match kind {
        FittingKind::Bend => values.typed("angle")?,
        _ => Angle::new::<uom::si::angle::radian>(std::f64::consts::FRAC_PI_4),
    };
    let legs = Legs::from_key(values.choice("legs").unwrap_or("symmetric")).unwrap_or(Legs::Symmetric);
    Ok(FittingInputs {
        kind,
        angle,
        legs,
        joint,
        main,
        second,
        fluid,
        pressure,
    })
}

pub fn read_pressure(values: &Values, main: Diameters, size_key: &str) -> Result<PressureInputs, FieldErrors> {
    let basis = keyed(values, "p_basis", PressureBasis::from_key)?;
    let work = values.typed::<Pressure>("p")?;
    let test = if basis.wants_test() {
        Some(match values.choice("test_rule")? {
            "custom" => TestGiven::Typed(common::typed_test_pressure(values)?),
            key => {
                let rule =
                    pressure::test_rule(key).ok_or_else(|| FieldError::inconsistent("test_rule", "unknown rule"))?;
                let typed_mdp = if key == "en805" {
                    values.typed_opt::<Pressure>("mdp")
                } else {
                    None
                };
                if typed_mdp.is_some_and(|m| m < work) {
                    return Err(FieldError::inconsistent(
                        "mdp",
                        "MDP includes surge: it cannot be below the working pressure",
                    )
                    .into());
                }
                TestGiven::Rule { rule, typed_mdp }
            }
        })
    } else {
        None
    };
    let rule_needs_surge = matches!(&test, Some(TestGiven::Rule { rule, .. }) if rule.needs_surge);
    let surge = if (basis.wants_surge() || rule_needs_surge) && values.is_set("dv") {
        Some(read_surge(values, main, size_key)?)
    } else if basis == PressureBasis::Surge {
        return Err(FieldError::inconsistent("dv", "the surge basis needs the velocity change").into());
    } else if rule_needs_surge {
        return Err(FieldError::inconsistent(
            "dv",
            "this test rule adds the calculated surge: give the velocity change",
        )
        .into());
    } else {
        None
    };
    Ok(PressureInputs {
        basis,
        work,
        test,
        surge,
        elevations: read_elevations(values)?,
    })
}

/// The two elevations, both or neither.
fn read_elevations(values: &Values) -> Result<Option<Elevations>, FieldError> {
    match (
        values.typed_opt::<Length>("z_test"),
        values.typed_opt::<Length>("z_fitting"),
    ) {
        // At one elevation there is nothing to correct, and nothing to show.
        (Some(z_test), Some(z_fitting)) if z_test == z_fitting => Ok(None),
        (Some(z_test), Some(z_fitting)) => Ok(Some(Elevations { z_test, z_fitting })),
        (None, None) => Ok(None),
        (Some(_), None) => Err(FieldError::inconsistent(
            "z_fitting",
            "give the fitting's elevation too (or clear the test point's): the pressure is corrected by the \
                difference of the two",
        )),
        (None, Some(_)) => Err(FieldError::inconsistent(
            "z_test",
            "give the test point's elevation too (or clear the fitting's): the pressure is corrected by the \
                difference of the two",
        )),
    }
}

fn read_surge(values: &Values, main: Diameters, size_key: &str) -> Result<SurgeInputs, FieldErrors> {
    Ok(SurgeInputs {
        dv: values
            .typed_opt("dv")
            .unwrap_or(Velocity::new::<uom::si::velocity::meter_per_second>(0.0)),
        wave: common::read_wave(values, main, size_key)?,
    })
}

fn read_block(values: &Values, plane: Plane) -> Result<BlockInputs, FieldErrors> {
    let soil_key = values.choice("soil")?.to_string();
    let preset = soil::soil(&soil_key);
    let friction = match opt(values, "friction") {
        Some(mu) => Some((mu, "typed".to_string())),
        None => preset.and_then(|s| {
            s.friction
                .map(|mu| (mu, format!("{} class ({FRICTION_SOURCE})", s.soil)))
        }),
    };
    let bearing = match plane {
        Plane::Horizontal | Plane::Sag => Some(read_bearing(values, &soil_key)?),
        Plane::Crest => None,
    };
    let face = match plane {
        Plane::Horizontal | Plane::Sag => Some(
            match BlockDims::from_key(values.choice("block_dims").unwrap_or("height")) {
                Some(BlockDims::Aspect) => FaceGiven::Aspect(
                    opt(values, "block_aspect")
                        .ok_or_else(|| FieldError::inconsistent("block_aspect", "give the face's width ÷ height"))?,
                ),
                _ => FaceGiven::Height(
                    opt(values, "block_h")
                        .ok_or_else(|| FieldError::inconsistent("block_h", "give the bearing face height"))?,
                ),
            },
        ),
        Plane::Crest => None,
    };
    let (gamma_c, submerged) = match plane {
        Plane::Crest => (values.quantity("gamma_c")?, values.choice("submerged")? == "yes"),
        _ => (0.0, false),
    };
    if plane == Plane::Crest && block::effective_unit_weight(gamma_c, submerged) <= 0.0 {
        return Err(
            FieldError::inconsistent("gamma_c", "below groundwater the concrete must be heavier than water").into(),
        );
    }
    Ok(BlockInputs {
        bearing,
        soil_key,
        friction,
        sf_slide: opt(values, "sf_slide").unwrap_or(1.5),
        face,
        gamma_c,
        submerged,
        gravity_h: values.typed_opt("gravity_h"),
    })
}

fn read_bearing(values: &Values, key: &str) -> Result<(Pressure, Option<&'static SoilPreset>), FieldErrors> {
    let pa = |v: f64| Pressure::new::<uom::si::pressure::pascal>(v);
    if key == "custom" {
        let sigma = opt(values, "sigma").ok_or_else(|| {
            FieldError::inconsistent(
                "sigma",
                "type the allowable soil bearing (greater than 0), or choose a soil class",
            )
        })?;
        if !(MIN_TYPED_BEARING..=MAX_TYPED_BEARING).contains(&sigma) {
            return Err(FieldError::inconsistent(
                "sigma",
                "the allowable soil bearing must be at least 1 kPa (21 psf) and at most 20 MPa (sound rock)",
            )
            .into());
        }
        return Ok((pa(sigma), None));
    }
    match soil::bearing_of(key) {
        Ok((sigma, preset)) => Ok((pa(sigma), Some(preset))),
        Err(refusal) => Err(FieldError::inconsistent("soil", refusal.to_string()).into()),
    }
}

/// The design pressure and its candidates, gauge, Pa.
#[derive(Clone, Debug)]
pub struct Pressures {
    pub work: f64,
    /// EN 805's maximum design pressure and how it was found.
    pub mdp: Option<(f64, MdpFrom)>,
    /// The test pressure and the rule's citation (or "typed test pressure").
    pub test: Option<(f64, String)>,
    pub surge: Option<Surge>,
    /// The design pressure at the fitting: the basis's pressure at the test point
    /// plus the static head to the fitting.
    pub design: f64,
    /// The basis's pressure at the test point (equal to `design` with no elevations).
    pub at_test_point: f64,
    /// The static head from the test point to the fitting, ρ·g·(z_test − z_fitting), Pa,
    /// with the two elevations, m.
    pub elevation: Option<ElevationHead>,
    pub basis: PressureBasis,
}

/// The static head between the test point and the fitting.
#[derive(Clone, Copy, Debug)]
pub struct ElevationHead {
    pub z_test: f64,
    pub z_fitting: f64,
    /// ρ·g·(z_test − z_fitting), Pa.
    pub head: f64,
    /// [`pressure::hydrostatic_terms`], which the check's tolerance is relative to.
    pub hydrostatic_terms: f64,
    /// The pressure at the fitting by the engine's energy balance of the still
    /// line between the two elevations (the independent check of `design`), Pa.
    pub by_energy_balance: f64,
}

/// Where an MDP comes from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum MdpFrom {
    Typed,
    /// Working pressure plus this allowance, Pa.
    Allowance(f64),
}

/// The Joukowsky surge estimate.
#[derive(Clone, Debug)]
pub struct Surge {
    pub wave_speed: f64,
    pub dp: f64,
    pub dv: f64,
    pub source: String,
}

/// The design pressure of a fitting's inputs.
pub fn design_pressure(pi: &PressureInputs, main: Diameters, fluid: &Fluid) -> Pressures {
    let work = pi.work.value;
    let surge = pi.surge.as_ref().map(|s| {
        let (a, source) = match &s.wave {
            common::WaveGiven::Typed(a) => (a.value, "wave speed typed".to_string()),
            common::WaveGiven::Computed(e) => (s.wave.speed(fluid.density, main.id).0, e.material_source.clone()),
        };
        Surge {
            wave_speed: a,
            dp: pressure::joukowsky(fluid.density, a, s.dv.value),
            dv: s.dv.value,
            source,
        }
    });
    let mut mdp = None;
    let test = pi.test.as_ref().map(|t| match t {
        TestGiven::Typed(p) => (p.value, "typed test pressure".to_string()),
        TestGiven::Rule { rule, typed_mdp } => {
            let typed_mdp = typed_mdp.map(|m| m.value);
            if rule.allowance > 0.0 || typed_mdp.is_some() {
                mdp = Some(match typed_mdp {
                    Some(m) => (m, MdpFrom::Typed),
                    None => (work + rule.allowance, MdpFrom::Allowance(rule.allowance)),
                });
            }
            (
                rule.test_pressure(work, typed_mdp, surge.as_ref().map_or(0.0, |s| s.dp)),
                rule.citation.to_string(),
            )
        }
    });
    let (at_test_point, _) = pressure::design_pressure(
        pi.basis,
        work,
        test.as_ref().map(|t| t.0),
        surge.as_ref().map(|s| work + s.dp),
    );
    let elevation = pi.elevations.map(|e| ElevationHead {
        z_test: e.z_test.value,
        z_fitting: e.z_fitting.value,
        head: pressure::elevation_head(fluid.density, e.z_test.value, e.z_fitting.value),
        hydrostatic_terms: pressure::hydrostatic_terms(fluid.density, e.z_test.value, e.z_fitting.value),
        by_energy_balance: f64::NAN,
    });
    Pressures {
        work,
        mdp,
        test,
        surge,
        design: at_test_point + elevation.map_or(0.0, |e| e.head),
        at_test_point,
        elevation,
        basis: pi.basis,
    }
}

/// A fitting's static thrust at the design pressure.
#[derive(Clone, Debug)]
pub struct FittingThrust {
    pub pressures: Pressures,
    pub fit: StaticFitting,
    pub balance: Balance,
    /// Diameter of the thrust area of the main end, m.
    pub area_d: f64,
    /// Outside diameter of the branch or small end, m (drawing).
    pub od2: Option<f64>,
}

/// A sliding check: friction against the horizontal thrust.
#[derive(Clone, Debug)]
pub struct Sliding {
    pub friction: Option<(f64, String)>,
    /// Normal force on the base, N.
    pub normal: f64,
    pub t_h: f64,
    pub required: f64,
}

impl Sliding {
    /// μ·N/T_h, when a friction coefficient is known.
    pub fn factor(&self) -> Option<f64> {
        self.friction
            .as_ref()
            .map(|(mu, _)| block::sliding_factor(*mu, self.normal, self.t_h))
    }
}

/// The block that carries the thrust.
#[derive(Clone, Debug)]
pub enum BlockResult {
    Bearing {
        sigma: f64,
        preset: Option<&'static SoilPreset>,
        /// The load on the face: the horizontal thrust (horizontal) or the resultant (sag).
        load: f64,
        area: f64,
        h: f64,
        w: f64,
        /// A sag block's side face for the horizontal part, m², and its sliding.
        side: Option<(f64, Sliding)>,
    },
    Gravity {
        gravity: GravityBlock,
        side: f64,
        height: f64,
        sliding: Option<Sliding>,
    },
}

impl BlockResult {
    /// The block as drawn.
    pub fn shape(&self) -> Block {
        match self {
            BlockResult::Bearing { h, w, .. } => Block::Bearing { h: *h, w: *w },
            BlockResult::Gravity {
                gravity, side, height, ..
            } => Block::Gravity {
                volume: gravity.volume,
                side: *side,
                height: *height,
            },
        }
    }
}

/// The page's result.
#[derive(Clone, Debug)]
pub struct Solved {
    pub fitting: Option<FittingThrust>,
    /// Thrust on the restraint, N, in the plane's drawing axes.
    pub thrust: Vec3,
    pub t_h: f64,
    pub t_v: f64,
    pub block: BlockResult,
    /// Direction of the inlet in the drawing, rad.
    pub inlet_angle: f64,
}

/// The pure model of the page.
///
/// # Errors
/// A fitting whose ends do not make it (`size2`), an engine refusal (`p`).
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let plane = inputs.plane;
    let (thrust, fitting) = match &inputs.subject {
        Subject::Given { thrust, elevation } => {
            let elevation = elevation.map_or(plane.default_elevation(), |e| e.value);
            (plane.given_thrust(thrust.value, elevation), None)
        }
        Subject::Fitting(f) => {
            let mut pressures = design_pressure(&f.pressure, f.main, &f.fluid);
            if let Some(e) = pressures.elevation.as_mut() {
                e.by_energy_balance =
                    pressure::hydrostatic_by_energy_balance(pressures.at_test_point, e.z_test, e.z_fitting, &f.fluid)
                        .map_err(|e| FieldErrors::from(common::engine_error(e, "z_fitting")))?;
            }
            if pressures.design < 0.0 {
                return Err(FieldError::inconsistent(
                    "z_fitting",
                    "the fitting lies so far above the test point that the pressure there is below zero gauge: \
                        check the two elevations (the fitting's must be lower than the test point's plus the \
                        pressure head)",
                )
                .into());
            }
            let (a1, a2) = restraint::thrust_areas(f.kind, f.joint, f.main, f.second).map_err(|e| match e {
                SizeMismatch::BranchLargerThanRun | SizeMismatch::SmallEndNotSmaller => {
                    FieldError::inconsistent("size2", e.message())
                }
            })?;
            let fit = StaticFitting {
                kind: f.kind,
                angle: if f.kind == FittingKind::Bend {
                    f.angle.value
                } else {
                    0.0
                },
                area: a1,
                area2: a2,
                plane,
                symmetric: f.legs == Legs::Symmetric,
            };
            let balance = restraint::static_balance(&fit, pressures.design, &f.fluid)
                .map_err(|e: engine::EngineError| FieldErrors::from(common::engine_error(e, "p")))?;
            let thrust = balance.thrust();
            (
                thrust,
                Some(FittingThrust {
                    pressures,
                    fit,
                    balance,
                    area_d: f.joint.thrust_diameter(f.main),
                    od2: f.second.map(|d| d.od),
                }),
            )
        }
    };
    let (t_h, t_v) = plane.horizontal_vertical(thrust);
    let norm = thrust.norm();
    let sf = inputs.sf.value;
    let b = &inputs.block;
    let block = match (plane, b.bearing, b.face) {
        (Plane::Horizontal | Plane::Sag, Some((sigma, preset)), Some(face)) => {
            let sigma = sigma.value;
            let load = if plane == Plane::Horizontal { t_h } else { norm };
            let area = block::bearing_area(sf, load, sigma);
            let (h, w) = block::face(area, face);
            let side = (plane == Plane::Sag && t_h > 1e-9 * norm.max(1.0)).then(|| {
                // The base bears the resultant; its horizontal part must also be held,
                // by friction under the base (the block's weight neglected) or by a
                // face against the trench wall.
                let sliding = Sliding {
                    friction: b.friction.clone(),
                    normal: (-t_v).max(0.0),
                    t_h,
                    required: b.sf_slide,
                };
                (block::bearing_area(sf, t_h, sigma), sliding)
            });
            BlockResult::Bearing {
                sigma,
                preset,
                load,
                area,
                h,
                w,
                side,
            }
        }
        _ => {
            let gravity = block::gravity_block(sf, t_v, b.gamma_c, b.submerged).ok_or_else(|| {
                FieldError::inconsistent("gamma_c", "below groundwater the concrete must be heavier than water")
            })?;
            let side = match b.gravity_h {
                Some(h) => (gravity.volume / h.value).sqrt(),
                None => gravity.volume.cbrt(),
            };
            let sliding = (t_h > 1e-9 * norm.max(1.0)).then(|| Sliding {
                friction: b.friction.clone(),
                normal: gravity.gamma_eff * gravity.volume - t_v.max(0.0),
                t_h,
                required: b.sf_slide,
            });
            BlockResult::Gravity {
                gravity,
                side,
                height: b.gravity_h.map_or(side, |h| h.value),
                sliding,
            }
        }
    };
    Ok(Solved {
        inlet_angle: fitting.as_ref().map_or(0.0, |f| f.fit.inlet_angle()),
        fitting,
        thrust,
        t_h,
        t_v,
        block,
    })
}
