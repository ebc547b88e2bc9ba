//! The anchor page's typed inputs and pure model: the runs read once into typed
//! inputs, the flows closed by the mass balance, and the anchored assembly balanced
//! by the engine ([`crate::engine`]) with every far-end force and weight as a named
//! force (see the page's doc for the terms).

use uom::si::f64::{Angle, Area, Force, Length, Pressure, Ratio, VolumeRate};

use crate::catalog::Values;
use crate::engine::{self, si, Balance, ControlVolume, FlowSpec, Port};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::pipe_sizes::{self, Family};
use crate::restraint;
use crate::restraint::pressure::Material;
use crate::units::STANDARD_GRAVITY;
use crate::vector::{Direction, Vec3};

use super::super::common;
use super::{RunKeys, MAX_RUNS, RUNS};

/// What lies at the far end of a run.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum End {
    /// An elbow whose leg beyond is restrained in its own direction.
    Elbow,
    /// A bellows or expansion joint without tie rods.
    Bellows { effective_area: Area, spring: Force },
    /// A cap or blind flange.
    Closed,
    /// A sliding support; the pipe continues beyond it.
    Support { friction: Ratio },
}

impl End {
    pub fn name(self) -> &'static str {
        match self {
            End::Elbow => "elbow",
            End::Bellows { .. } => "bellows",
            End::Closed => "closed end",
            End::Support { .. } => "sliding support",
        }
    }
}

/// Which way the far end of a run moves along the run.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Moves {
    /// Away from the anchor: the run heats up and grows.
    Away,
    /// Toward the anchor: the run cools and shrinks.
    Toward,
}

impl Moves {
    /// +1 away from the anchor, −1 toward it.
    pub fn sign(self) -> f64 {
        match self {
            Moves::Away => 1.0,
            Moves::Toward => -1.0,
        }
    }
}

/// Where a run's empty-pipe weight came from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum PipeWeightBasis {
    Typed,
    /// From the wall area and this density, kg/m³, named.
    Wall {
        density: f64,
        material: &'static str,
    },
}

/// One run, validated.
#[derive(Clone, Debug)]
pub struct Run {
    /// Field and output keys of this run.
    pub keys: &'static RunKeys,
    /// The size preset key as chosen (`custom` for typed diameters).
    pub size_key: String,
    pub azimuth: Angle,
    pub slope: Angle,
    pub d: Length,
    pub od: Length,
    pub p: Pressure,
    /// Signed flow, positive away from the anchor; `None` when solved from the others.
    pub q: Option<VolumeRate>,
    pub length: Length,
    pub end: End,
    /// Movement of the far end, for friction and the bellows' spring.
    pub moves: Moves,
    /// Weight of the empty pipe over the run's length.
    pub w_pipe: Force,
    pub weight_basis: PipeWeightBasis,
}

impl Run {
    /// The unit vector along the run, away from the anchor (x east, y north, z up).
    pub fn direction(&self) -> Vec3 {
        let (az, s) = (self.azimuth.value, self.slope.value);
        Vec3::new(az.sin() * s.cos(), az.cos() * s.cos(), s.sin())
    }
}

/// Everything the page was given, validated.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub runs: Vec<Run>,
    pub fluid: Fluid,
}

/// The wall density and material name of a preset's family (steel for a typed
/// size), from the restraint model's one table of wall materials.
fn material_of(family: Option<Family>) -> (f64, &'static str) {
    let material = family.map_or(Material::Steel, Material::of_family);
    let name = match material {
        Material::DuctileIron => "ductile iron",
        Material::Pvc => "PVC",
        Material::Pe => "polyethylene",
        _ => "steel",
    };
    (material.wall_density().unwrap_or(STEEL_DENSITY), name)
}

/// Density of carbon steel, kg/m³, for a run whose size is typed.
const STEEL_DENSITY: f64 = 7850.0;

fn read_run(values: &Values, keys: &'static RunKeys, pressure: Pressure) -> Result<Run, FieldErrors> {
    let azimuth: Angle = values.typed(keys.azimuth)?;
    let slope: Angle = values
        .typed_opt(keys.slope)
        .unwrap_or(Angle::new::<uom::si::angle::radian>(0.0));
    let size = values.choice(keys.size)?;
    let typed_d: Option<Length> = values.typed_opt(keys.d);
    let typed_od: Option<Length> = values.typed_opt(keys.od);
    let pipe = restraint::diameters(
        size,
        typed_d.map(|d| d.value),
        typed_od.map(|d| d.value),
        (keys.size, keys.d, keys.od),
    )?;
    let p = values.typed_opt(keys.p).unwrap_or(pressure);
    // Run 1 has no flow field: its flow closes the mass balance. A closed end has
    // none; an empty flow elsewhere means no flow.
    let q = if std::ptr::eq(keys, &RUNS[0]) {
        None
    } else {
        Some(
            values
                .typed_opt(keys.q)
                .unwrap_or(VolumeRate::new::<uom::si::volume_rate::cubic_meter_per_second>(0.0)),
        )
    };
    let length: Length = values.typed(keys.length)?;
    let end = match values.choice(keys.end)? {
        "elbow" => End::Elbow,
        "bellows" => End::Bellows {
            effective_area: values.typed(keys.a_eff)?,
            spring: values
                .typed_opt(keys.f_spring)
                .unwrap_or(Force::new::<uom::si::force::newton>(0.0)),
        },
        "closed" => End::Closed,
        "support" => End::Support {
            friction: values.typed(keys.mu)?,
        },
        other => {
            return Err(FieldError::inconsistent(keys.end, format!("unknown end '{other}'")).into());
        }
    };
    let moves = match values.choice(keys.moves) {
        Ok("toward") => Moves::Toward,
        _ => Moves::Away,
    };
    let (w_pipe, weight_basis) = match values.typed_opt::<Force>(keys.w_pipe) {
        Some(w) => (w, PipeWeightBasis::Typed),
        None => {
            let (density, material) = material_of(pipe_sizes::find(size).map(|s| s.family));
            let wall = common::circle_area(pipe.od) - common::circle_area(pipe.id);
            let w = density * STANDARD_GRAVITY * wall * length.value;
            (
                Force::new::<uom::si::force::newton>(w),
                PipeWeightBasis::Wall { density, material },
            )
        }
    };
    Ok(Run {
        keys,
        size_key: size.to_string(),
        azimuth,
        slope,
        d: Length::new::<uom::si::length::meter>(pipe.id),
        od: Length::new::<uom::si::length::meter>(pipe.od),
        p,
        q,
        length,
        end,
        moves,
        w_pipe,
        weight_basis,
    })
}

/// Reads the page's values once.
///
/// # Errors
/// Each bad field by name; a closed run 1 while the other runs' flows do not add up
/// to zero, on `r1_end`.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let count = match values.choice("runs")? {
        "1" => 1,
        "2" => 2,
        "3" => 3,
        _ => MAX_RUNS,
    };
    let pressure: Pressure = values.typed("p")?;
    let fluid = common::fluid_from(values)?;
    let mut errors = FieldErrors::default();
    let mut runs = Vec::with_capacity(count);
    for keys in RUNS.iter().take(count) {
        match read_run(values, keys, pressure) {
            Ok(run) => runs.push(run),
            Err(e) => e.0.into_iter().for_each(|e| errors.push(e)),
        }
    }
    let runs = errors.or_ok(runs)?;
    if let Some(first) = runs.first() {
        let others: f64 = runs.iter().skip(1).filter_map(|r| r.q).map(|q| q.value).sum();
        if first.end == End::Closed && others != 0.0 {
            return Err(FieldError::inconsistent(
                first.keys.end,
                "run 1's flow is what the other runs leave, and a closed end carries none: make run 1 one that \
                 carries flow, or give the other runs flows that add up to zero",
            )
            .into());
        }
    }
    Ok(Inputs { runs, fluid })
}

/// One named force on the anchored assembly: a ledger term.
#[derive(Clone, Debug, PartialEq)]
pub struct Term {
    /// Index of the run (0-based).
    pub run: usize,
    pub name: String,
    /// Force on the assembly, N (the load it passes to the anchor).
    pub force: Vec3,
    /// Point of action, m from the anchor.
    pub at: Vec3,
}

/// A run as solved.
#[derive(Clone, Debug, PartialEq)]
pub struct SolvedRun {
    pub direction: Vec3,
    /// Bore area, m².
    pub area: f64,
    /// Signed flow, m³/s, positive away from the anchor.
    pub flow: f64,
    /// Mean speed, m/s.
    pub speed: f64,
    /// Weight of pipe and contents over the run, N.
    pub weight: f64,
    /// Normal load on a sliding support at the far end, N.
    pub support_load: f64,
}

/// The solved anchor.
#[derive(Clone, Debug)]
pub struct Solved {
    pub runs: Vec<SolvedRun>,
    /// The run whose flow the mass balance found, if any.
    pub solved_run: Option<usize>,
    /// The far-end and weight terms given to the engine as named forces.
    pub terms: Vec<Term>,
    pub balance: Balance,
    /// The same assembly balanced with moments about the far end of run 1.
    pub balance_about_run1_end: Balance,
}

/// The engine's refusal, on the first run's flow field (the mass balance is the
/// engine's only way to refuse valid inputs here).
fn refused(e: engine::EngineError) -> FieldErrors {
    FieldErrors::from(common::engine_error(e, "r1_q"))
}

/// The pure model of the page.
///
/// # Errors
/// An engine refusal.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let rho = inputs.fluid.density;
    let g = STANDARD_GRAVITY;
    let down = Vec3::new(0.0, 0.0, -1.0);
    // The flow of the run left empty, from Σ Q = 0 (positive away from the anchor).
    let typed_net: f64 = inputs.runs.iter().filter_map(|r| r.q).map(|q| q.value).sum();
    let solved_run = inputs.runs.iter().position(|r| r.q.is_none());

    let mut cv = ControlVolume::new(inputs.fluid.clone());
    let mut runs = Vec::with_capacity(inputs.runs.len());
    let mut terms = Vec::new();
    for (index, run) in inputs.runs.iter().enumerate() {
        let u = run.direction();
        let area = common::circle_area(run.d.value);
        let flow = run.q.map(|q| q.value).unwrap_or(-typed_net);
        let speed = flow.abs() / area;
        let (p, length) = (run.p.value, run.length.value);
        let end_point = u * length;
        let direction = Direction::new(u).unwrap_or(Direction::X);
        let mut port = if flow >= 0.0 {
            Port::outlet(&format!("run {}", index + 1), si::area(area), direction)
        } else {
            Port::inlet(&format!("run {}", index + 1), si::area(area), direction.reversed())
        };
        port = port.pressure(si::pressure(p)).at(end_point);
        port.flow = match run.q {
            Some(q) => FlowSpec::VolumeFlow(q.value.abs()),
            None => FlowSpec::Unknown,
        };
        cv.port(port);

        let mut add = |name: String, force: Vec3, at: Vec3| {
            terms.push(Term {
                run: index,
                name,
                force,
                at,
            })
        };
        let momentum = rho * flow * flow / area;
        let weight = run.w_pipe.value + rho * g * area * length;
        let weight_vec = down * weight;
        let normal_part = weight_vec - u * weight_vec.dot(u);
        let mut support_load = 0.0;
        match run.end {
            End::Elbow => add("elbow, +(pA + ṁV)û".to_string(), u * (p * area + momentum), end_point),
            End::Closed => add("cap, +pAû".to_string(), u * (p * area), end_point),
            End::Bellows { effective_area, spring } => {
                add(
                    "bellows annulus, −p(A_eff − A)û".to_string(),
                    u * (-p * (effective_area.value - area)),
                    end_point,
                );
                if spring.value > 0.0 {
                    add(
                        "bellows spring".to_string(),
                        u * (-run.moves.sign() * spring.value),
                        end_point,
                    );
                }
            }
            End::Support { friction } => {
                add(
                    "wall beyond the support, +(pA + ṁV)û".to_string(),
                    u * (p * area + momentum),
                    end_point,
                );
                support_load = normal_part.norm();
                if friction.value > 0.0 && support_load > 0.0 {
                    add(
                        "support friction, μN".to_string(),
                        u * (-run.moves.sign() * friction.value * support_load),
                        end_point,
                    );
                }
                // Propped cantilever: the support carries 3/8 of the weight normal
                // to the run.
                add(
                    "support reaction, −3/8 W⊥".to_string(),
                    normal_part * (-3.0 / 8.0),
                    end_point,
                );
            }
        }
        add("weight at mid-length".to_string(), weight_vec, u * (0.5 * length));
        runs.push(SolvedRun {
            direction: u,
            area,
            flow,
            speed,
            weight,
            support_load,
        });
    }
    for t in &terms {
        cv.extra_force(&t.name, t.force, t.at);
    }
    let balance = engine::balance(&cv).map_err(refused)?;
    let run1_end = runs.first().map(|r| r.direction).unwrap_or(Vec3::ZERO)
        * inputs.runs.first().map(|r| r.length.value).unwrap_or(0.0);
    cv.moments_about(run1_end);
    let balance_about_run1_end = engine::balance(&cv).map_err(refused)?;
    Ok(Solved {
        runs,
        solved_run,
        terms,
        balance,
        balance_about_run1_end,
    })
}
