//! The tank drain's model: the typed inputs read once from the values, and the pure
//! physics (the unsteady balance integrated from rest, the largest outflow, the
//! engine's mass balance there, the energy of the whole drain, the level against
//! time) returning a typed result. The method is in the page's module doc
//! ([`super`]).

use std::f64::consts::PI;

use uom::si::f64::{Length, Pressure, Ratio, Time, VolumeRate};
use uom::si::time::second;

use crate::catalog::Values;
use crate::engine::{self, si, Balance, ControlVolume, Port};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::units::STANDARD_GRAVITY;
use crate::vector::{Direction, Vec3};

use super::geometry::{self, Shape};
use super::run::{self, Inflow, Outlet, OutletState, Point, Run, Stop, Vessel};
use super::{DEFAULT_LONGEST, MAX_FLOW, MAX_ORIFICE_SHARE, MAX_TIME};
use crate::calculators::common;
use crate::units::{QuantityKind as Q, UnitSystem};

/// Points of the level against time curve (closed form).
const CURVE_STEPS: usize = 40;
/// Most points of the level against time curve (integrated run).
const PLOT_POINTS: usize = 160;

/// The vessel as typed, read once from the values ([`read`]).
#[derive(Clone, Debug)]
pub struct Inputs {
    pub fluid: Fluid,
    pub shape: Shape,
    /// Typed height of a vertical or cone-bottomed vessel (its top above the outlet).
    pub height: Option<Length>,
    pub outlet: OutletInput,
    pub inflow: Inflow,
    /// Bore of the inflow pipe (for the inflow's momentum), when there is inflow.
    pub inlet_bore: Option<Length>,
    /// Gauge pressure of the gas above the liquid (0 when vented).
    pub gas_pressure: Pressure,
    pub start_level: Length,
    /// Final level (0 when left empty: drained to the outlet).
    pub end_level: Length,
    pub longest: Time,
}

/// The outlet as typed.
#[derive(Clone, Debug)]
pub enum OutletInput {
    Orifice {
        diameter: Length,
        /// Discharge coefficient C_d.
        cd: Ratio,
        /// Velocity coefficient C_v.
        cv: Ratio,
    },
    Pipe {
        bore: Length,
        length: Length,
        roughness: Length,
        k_minor: Ratio,
        drop: Length,
    },
    Pump {
        flow: VolumeRate,
    },
}

/// Reads the vessel's values once into typed inputs.
///
/// # Errors
/// The field that makes the vessel impossible, naming the valid range.
pub fn read(values: &Values, system: UnitSystem) -> Result<Inputs, FieldErrors> {
    let shape_key = choice_or(values, "vessel_shape", "vertical");
    let diameter = || values.quantity("d_tank");
    let shape = match shape_key {
        "horizontal" => Shape::HorizontalCylinder {
            diameter: diameter()?,
            length: values.quantity("l_vessel")?,
        },
        "cone_bottom" => Shape::ConeBottom {
            diameter: diameter()?,
            cone_height: values.quantity("h_cone")?,
        },
        "sphere" => Shape::Sphere { diameter: diameter()? },
        "table" => geometry::level_area_table("area_table", values.text("area_table")?, system)?,
        _ => Shape::VerticalCylinder { diameter: diameter()? },
    };
    let height: Option<Length> = match shape {
        Shape::VerticalCylinder { .. } | Shape::ConeBottom { .. } => values.typed_opt("h_vessel"),
        _ => None,
    };
    let smallest_area = match &shape {
        Shape::Table(rows) => rows.iter().skip(1).map(|r| r.1).fold(f64::INFINITY, f64::min),
        Shape::VerticalCylinder { .. } | Shape::ConeBottom { .. } => shape.area(f64::INFINITY),
        Shape::HorizontalCylinder { diameter, length } => diameter * length,
        Shape::Sphere { diameter } => PI * diameter * diameter / 4.0,
    };
    let outlet = match choice_or(values, "outlet", "orifice") {
        "pipe" => OutletInput::Pipe {
            bore: values.typed("d_outlet")?,
            length: values.typed("l_pipe")?,
            roughness: values.typed_opt("roughness").unwrap_or_default(),
            k_minor: values.typed_opt("k_outlet").unwrap_or_default(),
            drop: values.typed_opt("z_outlet").unwrap_or_default(),
        },
        "pump" => OutletInput::Pump {
            flow: values.typed("q_out")?,
        },
        _ => OutletInput::Orifice {
            diameter: values.typed("d_orifice")?,
            cd: values.typed("cd")?,
            cv: values.typed("cv")?,
        },
    };
    let inflow = match choice_or(values, "inflow", "none") {
        "constant" => Inflow::Constant(values.quantity("q_in")?),
        "table" => inflow_table(values.text("inflow_table")?, system)?,
        _ => Inflow::None,
    };
    let inlet_bore = match inflow {
        Inflow::None => None,
        _ => Some(values.typed("d_inlet")?),
    };
    let inputs = Inputs {
        shape,
        height,
        outlet,
        inflow,
        inlet_bore,
        gas_pressure: values.typed_opt("p_gas").unwrap_or_default(),
        start_level: values.typed("h_start")?,
        end_level: values.typed_opt("h_end").unwrap_or_default(),
        longest: values
            .typed_opt("t_max")
            .unwrap_or(Time::new::<second>(DEFAULT_LONGEST)),
        fluid: common::fluid_from(values)?,
    };
    match &inputs.outlet {
        OutletInput::Orifice { diameter, cd, cv } => {
            let hole = PI * diameter.value * diameter.value / 4.0;
            if hole > MAX_ORIFICE_SHARE * MAX_ORIFICE_SHARE * smallest_area {
                return Err(FieldError::inconsistent(
                    "d_orifice",
                    "the orifice must be smaller than the vessel: its area at most 99.8 % of the vessel's \
                     smallest cross-section above the outlet",
                )
                .into());
            }
            if cd > cv {
                return Err(FieldError::inconsistent(
                    "cv",
                    "C_v must be at least C_d: the contraction coefficient C_c = C_d/C_v cannot exceed 1",
                )
                .into());
            }
        }
        OutletInput::Pipe { bore, roughness, .. } => {
            if PI * bore.value * bore.value / 4.0 > MAX_ORIFICE_SHARE * MAX_ORIFICE_SHARE * smallest_area {
                return Err(FieldError::inconsistent(
                    "d_outlet",
                    "the outlet pipe must be narrower than the vessel: its bore area at most 99.8 % of the \
                     vessel's smallest cross-section above the outlet",
                )
                .into());
            }
            if roughness.value > 0.05 * bore.value {
                return Err(FieldError::inconsistent(
                    "roughness",
                    "the roughness must be at most 5 % of the pipe bore (the range of the Colebrook equation)",
                )
                .into());
            }
        }
        OutletInput::Pump { .. } => {}
    }
    if let Some(top) = inputs.shape.top(inputs.height.map(|h| h.value)) {
        if let Shape::ConeBottom { cone_height, .. } = inputs.shape {
            if top < cone_height {
                return Err(
                    FieldError::inconsistent("h_vessel", "the vessel must be at least as tall as its cone").into(),
                );
            }
        }
        for (key, level) in [("h_start", inputs.start_level), ("h_end", inputs.end_level)] {
            if level.value > top {
                return Err(
                    FieldError::inconsistent(key, "the level must be within the vessel: at most its top").into(),
                );
            }
        }
    }
    if let OutletInput::Pipe { drop, .. } = inputs.outlet {
        if inputs.end_level.value == 0.0 && drop.value == 0.0 && inputs.gas_pressure.value == 0.0 {
            return Err(FieldError::inconsistent(
                "h_end",
                "with the pipe's end level with the outlet and no gas pressure, the last of the liquid drains ever \
                 more slowly (the flow turns laminar and falls with the level) and never quite empties: give a \
                 final level above 0, or the drop to the pipe's end",
            )
            .into());
        }
    }
    if inputs.end_level == inputs.start_level {
        return Err(FieldError::inconsistent("h_end", "the final level must differ from the starting level").into());
    }
    if inputs.end_level > inputs.start_level && matches!(inputs.inflow, Inflow::None) {
        return Err(FieldError::inconsistent(
            "h_end",
            "without inflow the level can only fall: the final level must be below the starting level",
        )
        .into());
    }
    Ok(inputs)
}

/// The value of an optional choice, `default` when left empty (an old link).
fn choice_or<'a>(values: &'a Values, key: &str, default: &'a str) -> &'a str {
    values.choice(key).unwrap_or(default)
}

/// Reads the inflow table: times from 0 rising, flows within the page's limits.
fn inflow_table(text: &str, system: UnitSystem) -> Result<Inflow, FieldError> {
    let field = "inflow_table";
    let rows = geometry::parse_pairs(field, text, [Q::Time, Q::VolumeFlow], ["time", "inflow"], system)?;
    for (i, pair) in rows.windows(2).enumerate() {
        if pair[1].0 <= pair[0].0 {
            return Err(FieldError::inconsistent(
                field,
                format!("row {}: times must rise from row to row", i + 2),
            ));
        }
    }
    for (i, &(t, q)) in rows.iter().enumerate() {
        if t > MAX_TIME || q > MAX_FLOW {
            return Err(FieldError::inconsistent(
                field,
                format!("row {}: times at most 1000 days and flows at most 100 m³/s", i + 1),
            ));
        }
    }
    Ok(Inflow::Table(rows))
}

/// The tank and its outlet in SI numbers, as the model computes with them.
#[derive(Clone, Debug)]
pub struct Tank {
    pub area: f64,
    /// C_d·a.
    pub effective_orifice: f64,
    /// r = C_d·a/A_t, below 1.
    pub ratio: f64,
    /// Starting level h₁ (the liquid is at rest there).
    pub start: f64,
}

impl Tank {
    /// W = V², the ideal outlet velocity squared, at level `h`; `below_start` is
    /// h₁ − h, passed separately so that levels just under the start keep their
    /// precision.
    pub fn velocity_squared(&self, h: f64, below_start: f64) -> f64 {
        if h <= 0.0 {
            // The limit of W as h → 0 for every r < 1.
            return 0.0;
        }
        let r2 = self.ratio * self.ratio;
        let ln_x = if below_start < 0.5 * self.start {
            (-below_start / self.start).ln_1p()
        } else {
            (h / self.start).ln()
        };
        let eps = 1.0 - 2.0 * r2;
        let factor = if eps.abs() < 1e-9 {
            -ln_x / r2
        } else {
            -(eps / r2 * ln_x).exp_m1() / eps
        };
        2.0 * STANDARD_GRAVITY * h * factor
    }

    /// Time for the level to fall from `high` to `low` (h₁ ≥ high > low ≥ 0).
    pub fn time(&self, high: f64, low: f64, step: f64) -> f64 {
        let at_start = high >= self.start;
        crate::quadrature::tanh_sinh(low, high, step, |from_low, from_high| {
            let (h, below_start) = if from_low < from_high || !at_start {
                let h = low + from_low;
                (h, self.start - h)
            } else {
                (high - from_high, from_high)
            };
            let w = self.velocity_squared(h, below_start);
            if w > 0.0 && w.is_finite() {
                1.0 / (self.ratio * w.sqrt())
            } else {
                0.0
            }
        })
    }

    /// The level of the largest outflow, not below `low`.
    pub fn level_of_peak(&self, low: f64) -> f64 {
        let r2 = self.ratio * self.ratio;
        let eps = 1.0 - 2.0 * r2;
        // ln(r²/(1 − r²)) = ln((1 − ε)/(1 + ε)), exact near r² = ½.
        let ln_ratio = (-eps).ln_1p() - eps.ln_1p();
        let ln_x = if eps.abs() < 1e-9 {
            -2.0 * r2
        } else {
            ln_ratio / eps * r2
        };
        (self.start * ln_x.exp()).max(low)
    }
}

/// The quasi-steady (Torricelli) closed form, used as the independent check.
pub fn quasi_steady_time(tank: &Tank, high: f64, low: f64) -> f64 {
    let r2 = tank.ratio * tank.ratio;
    2.0 * tank.area / tank.effective_orifice
        * ((1.0 - r2) / (2.0 * STANDARD_GRAVITY)).sqrt()
        * (high.sqrt() - low.sqrt())
}

/// The classic case the closed-form unsteady solution covers: a vented vertical
/// cylinder draining through an orifice with no inflow.
#[derive(Clone, Debug)]
pub struct Classic {
    pub tank: Tank,
    pub cd: f64,
    pub cv: f64,
    /// Free fall over the same drop (a lower bound of the time).
    pub time_free_fall: f64,
    /// The quasi-steady Torricelli time (the independent check for small outlets).
    pub time_quasi_steady: f64,
    /// Time from the start to the end of the run: to the final level, or the longest
    /// time simulated when the level would take longer.
    pub elapsed: f64,
    /// Level, ideal outlet velocity V and outflow at the largest outflow.
    pub level_at_peak: f64,
    pub velocity_at_peak: f64,
    /// Ideal outlet velocity V at the final level.
    pub velocity_at_end: f64,
    /// Energy carried out by the jet plus kinetic energy left in the tank, per unit
    /// weight drained (m).
    pub energy_out_per_weight: f64,
}

/// The general case: the run integrated in time.
#[derive(Clone, Debug)]
pub struct General {
    pub vessel: Vessel,
    pub run: Run,
    /// The level where the final inflow balances the outflow, if the vessel holds it.
    pub steady_level: Option<f64>,
    /// The run's time by quadrature over the level, where that path applies.
    pub time_by_quadrature: Option<f64>,
}

/// How the result was found.
#[derive(Clone, Debug)]
pub enum Method {
    Classic(Box<Classic>),
    General(Box<General>),
}

/// Everything the report shows, computed once (SI).
#[derive(Clone, Debug)]
pub struct Solved {
    pub method: Method,
    pub shape: Shape,
    pub top: Option<f64>,
    pub density: f64,
    pub start: f64,
    pub end: f64,
    /// Time to reach the final level, when it was reached.
    pub time: Option<f64>,
    /// Level where the run stopped.
    pub end_of_run: f64,
    /// The outlet at the largest outflow, and the level and inflow there.
    pub peak: OutletState,
    pub level_at_peak: f64,
    pub inflow_at_peak: f64,
    /// The outlet and inflow at the end of the run.
    pub at_end: OutletState,
    pub inflow_at_end: f64,
    /// Inflow and outflow at the start of the run.
    pub inflow_at_start: f64,
    pub flow_at_start: f64,
    /// Net volume rate dV/dt at the start and at the end of the run.
    pub rate_at_start: f64,
    pub rate_at_end: f64,
    /// The engine's balance at the largest outflow.
    pub balance: Option<Balance>,
    /// The level against time, for the plot.
    pub level_curve: LevelCurve,
    pub inlet_bore: Option<f64>,
}

/// The level against time: the integrated run's points, or the classic tank's
/// closed-form time, made into a curve only when the plot asks for it (its
/// [`CURVE_STEPS`] quadratures were most of a headline solve's time).
#[derive(Clone, Debug)]
pub enum LevelCurve {
    /// (time, level) of the run, and when half the level change was done, if it was.
    Points {
        points: Vec<[f64; 2]>,
        half_way: Option<[f64; 2]>,
    },
    /// The classic tank from level `from` down to level `to`.
    Classic { tank: Tank, from: f64, to: f64 },
}

/// (time, level) points of a [`LevelCurve`], and when half the level change is done.
pub struct LevelPoints {
    pub points: Vec<[f64; 2]>,
    pub half_way: Option<[f64; 2]>,
}

impl LevelCurve {
    /// The curve's points (integrated now for the classic tank).
    pub fn points(&self) -> LevelPoints {
        match self {
            LevelCurve::Points { points, half_way } => LevelPoints {
                points: points.clone(),
                half_way: *half_way,
            },
            LevelCurve::Classic { tank, from, to } => {
                let (h1, h2) = (*from, *to);
                let mut points = Vec::with_capacity(CURVE_STEPS + 1);
                let mut elapsed = 0.0;
                let mut previous = h1;
                points.push([0.0, h1]);
                let mut half_way = [0.0, 0.5 * (h1 + h2)];
                for i in 1..=CURVE_STEPS {
                    let h = h1 - (h1 - h2) * i as f64 / CURVE_STEPS as f64;
                    elapsed += tank.time(previous, h, 1.0 / 16.0);
                    if i == CURVE_STEPS / 2 {
                        half_way[0] = elapsed;
                    }
                    previous = h;
                    points.push([elapsed, h]);
                }
                LevelPoints {
                    points,
                    half_way: Some(half_way),
                }
            }
        }
    }
}

/// Solves the vessel.
///
/// # Errors
/// The outlet's field when the engine refuses the balance.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let (h1, h2) = (inputs.start_level.value, inputs.end_level.value);
    let fluid = &inputs.fluid;
    let top = inputs.shape.top(inputs.height.map(|h| h.value));
    let outlet = match inputs.outlet {
        OutletInput::Orifice { diameter, cd, cv } => Outlet::Orifice {
            area: PI * diameter.value * diameter.value / 4.0,
            cd: cd.value,
            cv: cv.value,
        },
        OutletInput::Pipe {
            bore,
            length,
            roughness,
            k_minor,
            drop,
        } => Outlet::Pipe {
            bore: bore.value,
            length: length.value,
            roughness: roughness.value,
            k_minor: k_minor.value,
            drop: drop.value,
        },
        OutletInput::Pump { flow } => Outlet::Pump { flow: flow.value },
    };
    let vessel = Vessel {
        shape: inputs.shape.clone(),
        top,
        outlet,
        inflow: inputs.inflow.clone(),
        gas_pressure: inputs.gas_pressure.value,
        density: fluid.density,
        viscosity: fluid.viscosity,
    };
    let classic = matches!(vessel.shape, Shape::VerticalCylinder { .. })
        && matches!(vessel.outlet, Outlet::Orifice { .. })
        && matches!(vessel.inflow, Inflow::None)
        && vessel.gas_pressure == 0.0;
    let mut solved = if let (true, Outlet::Orifice { area, cd, cv }) = (classic, vessel.outlet.clone()) {
        solve_classic(&vessel, (area, cd, cv), h1, h2, inputs.longest.value)
    } else {
        solve_general(vessel, h1, h2, inputs.longest.value)
    };
    solved.inlet_bore = inputs.inlet_bore.map(|d| d.value);
    solved.balance = Some(ledger(&solved, fluid)?);
    Ok(solved)
}

/// The vented vertical cylinder through an orifice, without inflow: the unsteady
/// balance from rest, in closed form.
fn solve_classic(vessel: &Vessel, (orifice, cd, cv): (f64, f64, f64), h1: f64, wanted: f64, longest: f64) -> Solved {
    let area = vessel.shape.area(0.0);
    let effective_orifice = cd * orifice;
    let tank = Tank {
        area,
        effective_orifice,
        ratio: effective_orifice / area,
        start: h1,
    };
    let r = tank.ratio;
    let time_to_wanted = tank.time(h1, wanted, 1.0 / 64.0);
    // Beyond the longest time the run stops where the level is then (a bracketed search on the
    // closed-form time, which falls as the level rises).
    let reached = time_to_wanted <= longest;
    let h2 = if reached {
        wanted
    } else {
        crate::numeric::sign_change_of(wanted, h1, |h| tank.time(h1, h, 1.0 / 64.0) - longest)
    };
    let time = if reached { time_to_wanted } else { longest };
    let time_free_fall = (2.0 * (h1 - h2) / STANDARD_GRAVITY).sqrt();
    let h_peak = tank.level_of_peak(h2);
    let v_peak = tank.velocity_squared(h_peak, h1 - h_peak).max(0.0).sqrt();
    let v_end = tank.velocity_squared(h2, h1 - h2).max(0.0).sqrt();
    let jet = |v: f64| OutletState {
        flow: effective_orifice * v,
        jet_velocity: cv * v,
        jet_area: cd / cv * orifice,
        ..OutletState::default()
    };

    // Second balance: the potential energy released must leave as the jet's kinetic
    // energy or stay as kinetic energy in the tank. Per unit weight drained (ρ·g·A_t
    // ·(h₁ − h₂)): released (h₁ + h₂)/2; jet ½∫W dh and tank ½h₂·r²·W(h₂), over g·(h₁ − h₂).
    let jet_energy = 0.5
        * crate::quadrature::tanh_sinh(h2, h1, 1.0 / 64.0, |from_low, from_high| {
            let (h, below_start) = if from_low < from_high {
                (h2 + from_low, h1 - h2 - from_low)
            } else {
                (h1 - from_high, from_high)
            };
            tank.velocity_squared(h, below_start)
        });
    let tank_energy = 0.5 * h2 * r * r * v_end * v_end;

    let level_curve = LevelCurve::Classic {
        tank: tank.clone(),
        from: h1,
        to: h2,
    };
    let at_end = jet(v_end);
    Solved {
        shape: vessel.shape.clone(),
        top: vessel.top,
        density: vessel.density,
        start: h1,
        end: wanted,
        time: reached.then_some(time),
        end_of_run: h2,
        peak: jet(v_peak),
        level_at_peak: h_peak,
        inflow_at_peak: 0.0,
        at_end,
        inflow_at_end: 0.0,
        // From rest: nothing flows when the outlet opens.
        inflow_at_start: 0.0,
        flow_at_start: 0.0,
        rate_at_start: 0.0,
        rate_at_end: -at_end.flow,
        balance: None,
        level_curve,
        inlet_bore: None,
        method: Method::Classic(Box::new(Classic {
            time_quasi_steady: quasi_steady_time(&tank, h1, h2),
            elapsed: time,
            tank,
            cd,
            cv,
            time_free_fall,
            level_at_peak: h_peak,
            velocity_at_peak: v_peak,
            velocity_at_end: v_end,
            energy_out_per_weight: (jet_energy + tank_energy) / (STANDARD_GRAVITY * (h1 - h2)),
        })),
    }
}

/// Every other vessel: the mass balance integrated in time with the quasi-steady
/// outflow.
fn solve_general(vessel: Vessel, h1: f64, h2: f64, longest: f64) -> Solved {
    let run = run::integrate(&vessel, h1, h2, longest);
    let final_inflow = vessel.inflow.last();
    let steady_level = run::steady_level(&vessel, final_inflow);
    let last = *run.last();
    let time = (run.stop == Stop::Reached).then_some(last.time);
    // The quadrature path applies with a constant inflow when the level was reached.
    let time_by_quadrature = match (&vessel.inflow, time) {
        (Inflow::None | Inflow::Constant(_), Some(_)) => Some(run::quadrature_time(&vessel, h1, h2)),
        _ => None,
    };
    let peak = run::peak(&vessel, &run);
    let first = run.points[0];
    let points: Vec<[f64; 2]> = thin(&run.points).iter().map(|p| [p.time, p.level]).collect();
    let half = 0.5 * (h1 + h2);
    let half_way = run
        .points
        .windows(2)
        .find(|w| (w[0].level - half) * (w[1].level - half) <= 0.0 && w[0].level != w[1].level)
        .map(|w| {
            let share = (half - w[0].level) / (w[1].level - w[0].level);
            [w[0].time + share * (w[1].time - w[0].time), half]
        });
    Solved {
        shape: vessel.shape.clone(),
        top: vessel.top,
        density: vessel.density,
        start: h1,
        end: h2,
        time,
        end_of_run: last.level,
        peak: peak.outlet,
        level_at_peak: peak.level,
        inflow_at_peak: peak.inflow,
        at_end: last.outlet,
        inflow_at_end: last.inflow,
        inflow_at_start: first.inflow,
        flow_at_start: first.outlet.flow,
        rate_at_start: first.inflow - first.outlet.flow,
        rate_at_end: last.inflow - last.outlet.flow,
        balance: None,
        level_curve: LevelCurve::Points { points, half_way },
        inlet_bore: None,
        method: Method::General(Box::new(General {
            vessel,
            run,
            steady_level,
            time_by_quadrature,
        })),
    }
}

/// At most [`PLOT_POINTS`] points of the run, the first and last kept.
fn thin(points: &[Point]) -> Vec<Point> {
    if points.len() <= PLOT_POINTS {
        return points.to_vec();
    }
    let stride = points.len().div_ceil(PLOT_POINTS - 1);
    let mut out: Vec<Point> = points.iter().step_by(stride).copied().collect();
    if let Some(last) = points.last() {
        if out.last() != Some(last) {
            out.push(*last);
        }
    }
    out
}

/// The engine's mass and momentum balance of the vessel at the largest outflow:
/// the jet leaving (area, velocity), the inflow entering from above, the storage
/// term ρ·dV/dt and the weight of the liquid.
fn ledger(s: &Solved, fluid: &Fluid) -> Result<Balance, FieldErrors> {
    let field = match s.method {
        Method::General(ref g) => match g.vessel.outlet {
            Outlet::Orifice { .. } => "d_orifice",
            Outlet::Pipe { .. } => "d_outlet",
            Outlet::Pump { .. } => "q_out",
        },
        Method::Classic(_) => "d_orifice",
    };
    let mut cv = ControlVolume::new(fluid.clone());
    let peak = s.peak;
    if peak.jet_area > 0.0 {
        cv.port(
            Port::outlet("outlet jet", si::area(peak.jet_area), Direction::Z.reversed())
                .volume_flow(si::volume_flow(peak.flow))
                .pressure(si::pressure(0.0))
                .at(Vec3::ZERO),
        );
    } else {
        // A pump's suction: its flow leaves through the outlet; the nozzle is not typed,
        // so its momentum is not counted (a nominal area of the vessel's section).
        cv.port(
            Port::outlet(
                "pump suction",
                si::area(s.shape.area(s.level_at_peak).max(1e-6)),
                Direction::Z.reversed(),
            )
            .volume_flow(si::volume_flow(peak.flow))
            .pressure(si::pressure(0.0))
            .at(Vec3::ZERO),
        );
    }
    if let (Some(bore), true) = (s.inlet_bore, s.inflow_at_peak > 0.0) {
        let top = s.top.unwrap_or(s.start.max(s.end));
        cv.port(
            Port::inlet("inflow", si::area(PI * bore * bore / 4.0), Direction::Z.reversed())
                .volume_flow(si::volume_flow(s.inflow_at_peak))
                .pressure(si::pressure(0.0))
                .at(Vec3::new(0.0, 0.0, top)),
        );
    }
    let rate = s.inflow_at_peak - peak.flow;
    cv.storage(fluid.density * rate, Vec3::ZERO);
    cv.gravity(Vec3::new(0.0, 0.0, -STANDARD_GRAVITY));
    let level = s.level_at_peak;
    cv.contains(si::volume(s.shape.volume(level)), Vec3::new(0.0, 0.0, 0.5 * level));
    engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, field)))
}
