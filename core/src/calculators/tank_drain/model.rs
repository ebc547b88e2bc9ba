//! The tank drain's model: the typed inputs read once from the values, and the pure
//! physics (the unsteady balance integrated from rest, the largest outflow, the
//! engine's mass balance there, the energy of the whole drain, the level against
//! time) returning a typed result. The method is in the page's module doc
//! ([`super`]).

use std::f64::consts::PI;

use uom::si::f64::{Length, Ratio};

use crate::catalog::Values;
use crate::engine::{self, si, Balance, ControlVolume, Port};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::units::STANDARD_GRAVITY;
use crate::vector::{Direction, Vec3};

use super::MAX_ORIFICE_SHARE;
use crate::calculators::common;

/// Points of the level against time curve.
const CURVE_STEPS: usize = 40;

/// The tank as typed, read once from the values ([`read`]).
#[derive(Clone, Debug)]
pub struct Inputs {
    pub fluid: Fluid,
    pub tank_diameter: Length,
    pub orifice_diameter: Length,
    /// Discharge coefficient C_d.
    pub cd: Ratio,
    /// Velocity coefficient C_v.
    pub cv: Ratio,
    pub start_level: Length,
    /// Final level (0 when left empty: drained to the orifice).
    pub end_level: Length,
}

/// Reads the tank's values once into typed inputs.
///
/// # Errors
/// The field that makes the tank impossible, naming the valid range.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let inputs = Inputs {
        tank_diameter: values.typed("d_tank")?,
        orifice_diameter: values.typed("d_orifice")?,
        cd: values.typed("cd")?,
        cv: values.typed("cv")?,
        start_level: values.typed("h_start")?,
        end_level: values.typed_opt("h_end").unwrap_or_default(),
        fluid: common::fluid_from(values)?,
    };
    if inputs.orifice_diameter > MAX_ORIFICE_SHARE * inputs.tank_diameter {
        return Err(FieldError::inconsistent(
            "d_orifice",
            "the orifice must be smaller than the tank: at most 99.9 % of its diameter",
        )
        .into());
    }
    if inputs.cd > inputs.cv {
        return Err(FieldError::inconsistent(
            "cv",
            "C_v must be at least C_d: the contraction coefficient C_c = C_d/C_v cannot exceed 1",
        )
        .into());
    }
    if inputs.end_level >= inputs.start_level {
        return Err(FieldError::inconsistent("h_end", "the final level must be below the starting level").into());
    }
    Ok(inputs)
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

/// Everything the report shows, computed once (SI).
#[derive(Clone, Debug)]
pub struct Solved {
    pub tank: Tank,
    pub cd: f64,
    pub cv: f64,
    pub start: f64,
    pub end: f64,
    pub tank_diameter: f64,
    /// Time to drain from the starting to the final level.
    pub time: f64,
    /// Free fall over the same drop (a lower bound of `time`).
    pub time_free_fall: f64,
    /// The quasi-steady Torricelli time (the independent check for small outlets).
    pub time_quasi_steady: f64,
    /// Level, ideal outlet velocity V and outflow at the largest outflow.
    pub level_at_peak: f64,
    pub velocity_at_peak: f64,
    pub flow_at_peak: f64,
    /// Rate of fall of the level at the largest outflow.
    pub level_rate_at_peak: f64,
    /// Ideal outlet velocity V at the final level.
    pub velocity_at_end: f64,
    /// The engine's mass balance at the largest outflow.
    pub balance: Balance,
    /// Energy carried out by the jet plus kinetic energy left in the tank, per unit
    /// weight drained (m).
    pub energy_out_per_weight: f64,
    /// (time, level) from opening to the final level.
    pub curve: Vec<[f64; 2]>,
    /// (time, level) when half the level drop is done.
    pub half_drop: [f64; 2],
}

/// Solves the drain.
///
/// # Errors
/// The orifice field when the engine refuses the mass balance.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let (cd, cv) = (inputs.cd.value, inputs.cv.value);
    let (h1, h2) = (inputs.start_level.value, inputs.end_level.value);
    let d_tank = inputs.tank_diameter.value;
    let d_orifice = inputs.orifice_diameter.value;
    let fluid = &inputs.fluid;
    let area = PI * d_tank * d_tank / 4.0;
    let orifice = PI * d_orifice * d_orifice / 4.0;
    let effective_orifice = cd * orifice;
    let tank = Tank {
        area,
        effective_orifice,
        ratio: effective_orifice / area,
        start: h1,
    };
    let r = tank.ratio;
    let time = tank.time(h1, h2, 1.0 / 64.0);
    let time_free_fall = (2.0 * (h1 - h2) / STANDARD_GRAVITY).sqrt();
    let h_peak = tank.level_of_peak(h2);
    let v_peak = tank.velocity_squared(h_peak, h1 - h_peak).max(0.0).sqrt();
    let q_peak = effective_orifice * v_peak;
    let v_end = tank.velocity_squared(h2, h1 - h2).max(0.0).sqrt();

    // Instantaneous mass balance at the largest outflow through the engine: the
    // tank's only port is the jet (area C_c·a, velocity C_v·V); the storage term is
    // the level falling.
    let jet_area = cd / cv * orifice;
    let mut cv_tank = ControlVolume::new(fluid.clone());
    let jet = Port::outlet("orifice jet", si::area(jet_area), Direction::Z.reversed())
        .volume_flow(si::volume_flow(q_peak))
        .pressure(si::pressure(0.0))
        .at(Vec3::ZERO);
    cv_tank.port(jet);
    let level_rate = q_peak / area;
    cv_tank.storage(-fluid.density * area * level_rate, Vec3::ZERO);
    cv_tank.gravity(Vec3::new(0.0, 0.0, -STANDARD_GRAVITY));
    let balance = engine::balance(&cv_tank).map_err(|e| FieldErrors::from(common::engine_error(e, "d_orifice")))?;

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

    // Level against time.
    let mut curve = Vec::with_capacity(CURVE_STEPS + 1);
    let mut elapsed = 0.0;
    let mut previous = h1;
    curve.push([0.0, h1]);
    let mut half_drop = [0.0, 0.5 * (h1 + h2)];
    for i in 1..=CURVE_STEPS {
        let h = h1 - (h1 - h2) * i as f64 / CURVE_STEPS as f64;
        elapsed += tank.time(previous, h, 1.0 / 16.0);
        if i == CURVE_STEPS / 2 {
            half_drop[0] = elapsed;
        }
        previous = h;
        curve.push([elapsed, h]);
    }

    Ok(Solved {
        time_quasi_steady: quasi_steady_time(&tank, h1, h2),
        tank,
        cd,
        cv,
        start: h1,
        end: h2,
        tank_diameter: d_tank,
        time,
        time_free_fall,
        level_at_peak: h_peak,
        velocity_at_peak: v_peak,
        flow_at_peak: q_peak,
        level_rate_at_peak: level_rate,
        velocity_at_end: v_end,
        balance,
        energy_out_per_weight: (jet_energy + tank_energy) / (STANDARD_GRAVITY * (h1 - h2)),
        curve,
        half_drop,
    })
}
