//! A pump impeller's finite-blade head (slip), its specific speed and the net
//! positive suction head available at the eye: read once, solved from the runner's
//! triangles, written as outputs, a table, checks and warnings.
//!
//! # Slip
//! With a finite number of blades Z the water leaves a pump impeller with less swirl
//! than the blade angle gives. The slip factor is taken as σ = 1 − V_s/u₂ (slip
//! velocity V_s over the tip speed), so that V_θ2′ = V_θ2 − (1 − σ)·u₂ and the head
//! with slip is H′ = (u₂V_θ2′ − u₁V_θ1)/g. Two correlations, β₂ measured from the
//! tangent as on the rest of the page:
//!
//! - Wiesner (F. J. Wiesner, "A review of slip factors for centrifugal impellers",
//!   ASME J. Eng. Power 89 (1967) 558–572): σ = 1 − √(sin β₂)/Z^0.7, valid while the
//!   radius ratio r₁/r₂ stays below ε = exp(−8.16·sin β₂/Z); above it σ is
//!   multiplied by 1 − ((r₁/r₂ − ε)/(1 − ε))³ (Wiesner's correction).
//! - Stodola (1927, as given by Dixon & Hall, *Fluid Mechanics and Thermodynamics of
//!   Turbomachinery*, centrifugal-pump chapter): V_s = π·u₂·sin β₂/Z, so
//!   σ = 1 − π·sin β₂/Z.
//!
//! The head with slip is taken from a second engine balance (the same rotating
//! control volume with the slipped outlet swirl) and checked against the closed
//! form above. Slip correlations are for radial impellers; an axial pump gets none.
//!
//! # Specific speed
//! At the flow Q, speed ω (n in rpm) and the head H given (or, when none is given,
//! the head with slip, else the Euler head; the table says which):
//!
//! - dimensionless, radians: Ω_s = ω·√Q/(gH)^¾ (Dixon & Hall);
//! - metric, n_q = n·√Q/H^¾ with Q in m³/s and H in m (Gülich, *Centrifugal Pumps*;
//!   Hydraulic Institute HI 1.3);
//! - US customary, N_s = n·√Q/H^¾ with Q in US gpm and H in ft (Karassik, *Pump
//!   Handbook*). N_s ≈ 51.6·n_q; the check compares the US figure worked in US units
//!   with that factor.
//!
//! # NPSH available
//! When the suction pressure is read on a gauge (`suction` = gauge): from the gauge
//! pressure read at the suction (at the eye, or in a suction branch
//! of given bore) at a height z above the impeller eye:
//!
//! NPSHa = (p_gauge + p_atm − p_v)/(ρg) + V²/2g + z,
//!
//! with p_atm the local atmospheric pressure (standard 101.325 kPa when empty), p_v
//! the vapour pressure (water: IAPWS-IF97 from [`crate::fluid`]; a custom liquid
//! needs it typed) and V the velocity where the pressure is read (the branch bore's
//! Q/A, or the absolute velocity at the blade inlet V₁). Sources: Karassik et al.,
//! *Pump Handbook* (NPSH), Gülich (chapter on cavitation), ANSI/HI 9.6.1 (margins).
//! The vapour head of water is checked against the Antoine equation with the NIST
//! Chemistry WebBook's parameters for water.

use std::f64::consts::PI;

use uom::si::f64::{Length, Pressure};

use crate::catalog::{ChoiceOption, Report, Table, Values};
use crate::engine::{self, EngineError};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::ZERO_CELSIUS;
use crate::units::{self, QuantityKind as Q, STANDARD_ATMOSPHERE, STANDARD_GRAVITY};

use super::model::{Machine, Runner, Triangle};

pub const SUCTION_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "none",
        label: "Not given (no NPSH)",
    },
    ChoiceOption {
        key: "gauge",
        label: "Read on a gauge (NPSH available)",
    },
];

pub const SLIP_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "none",
        label: "None (infinitely many blades)",
    },
    ChoiceOption {
        key: "wiesner",
        label: "Wiesner (1967)",
    },
    ChoiceOption {
        key: "stodola",
        label: "Stodola",
    },
];

/// Blade counts accepted for slip: 2 to 40.
pub const MAX_BLADES: f64 = 40.0;

/// A slip correlation.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SlipModel {
    Wiesner,
    Stodola,
}

impl SlipModel {
    fn name(self) -> &'static str {
        match self {
            SlipModel::Wiesner => "Wiesner (1967): σ = 1 − √(sin β₂)/Z^0.7",
            SlipModel::Stodola => "Stodola: σ = 1 − π·sin β₂/Z",
        }
    }
}

/// Where and how the suction pressure is read.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Suction {
    /// Gauge pressure read at the suction.
    pub gauge: Pressure,
    /// Local atmospheric pressure (absolute).
    pub atmosphere: Pressure,
    /// Height of the reading above the impeller eye.
    pub height: Length,
    /// Bore where the pressure is read; `None`: at the blade inlet.
    pub bore: Option<Length>,
    /// Vapour pressure typed (absolute); `None`: the fluid's.
    pub vapour: Option<Pressure>,
}

/// The pump-only inputs of the page.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PumpInputs {
    /// Slip correlation and number of blades.
    pub slip: Option<(SlipModel, usize)>,
    pub suction: Option<Suction>,
}

/// Reads the pump-only fields (hidden, and so empty, for a turbine).
///
/// # Errors
/// A missing or fractional blade count for a slip correlation; a suction pressure
/// below a perfect vacuum.
pub fn read(values: &Values, machine: Machine) -> Result<PumpInputs, FieldErrors> {
    if machine != Machine::Pump {
        return Ok(PumpInputs {
            slip: None,
            suction: None,
        });
    }
    let model = match values.choice("slip").unwrap_or("none") {
        "wiesner" => Some(SlipModel::Wiesner),
        "stodola" => Some(SlipModel::Stodola),
        _ => None,
    };
    let slip = match model {
        None => None,
        Some(model) => {
            let blades = values.quantity("blades").map_err(|_| {
                FieldError::inconsistent("blades", "the number of blades is required for a slip correlation")
            })?;
            if blades.fract() != 0.0 {
                return Err(FieldError::inconsistent(
                    "blades",
                    format!("the number of blades must be a whole number from 2 to {MAX_BLADES}"),
                )
                .into());
            }
            Some((model, blades as usize))
        }
    };
    let reading = match values.choice("suction").unwrap_or("none") {
        "gauge" => Some(values.typed::<Pressure>("p_suction").map_err(|_| {
            FieldError::inconsistent("p_suction", "type the suction gauge pressure, or choose no NPSH")
        })?),
        _ => None,
    };
    let suction = match reading {
        None => None,
        Some(gauge) => {
            let atmosphere = values
                .typed_opt("p_atm")
                .unwrap_or(Pressure::new::<uom::si::pressure::pascal>(STANDARD_ATMOSPHERE));
            if gauge.value + atmosphere.value <= 0.0 {
                return Err(FieldError::inconsistent(
                    "p_suction",
                    format!(
                        "the suction gauge pressure is below a perfect vacuum (−{} with this atmospheric \
                         pressure): check its sign and units",
                        units::format_quantity_in(atmosphere.value, Q::Pressure, "kPa")
                    ),
                )
                .into());
            }
            Some(Suction {
                gauge,
                atmosphere,
                height: values
                    .typed_opt("z_suction")
                    .unwrap_or(Length::new::<uom::si::length::meter>(0.0)),
                bore: values.typed_opt("d_suction"),
                vapour: values.typed_opt("p_vapour"),
            })
        }
    };
    Ok(PumpInputs { slip, suction })
}

/// The slip correlation applied.
#[derive(Clone, Debug, PartialEq)]
pub struct Slip {
    pub model: SlipModel,
    pub blades: usize,
    /// σ = 1 − V_s/u₂.
    pub factor: f64,
    /// Wiesner's limiting radius ratio ε, and whether r₁/r₂ exceeded it.
    pub wiesner_limit: Option<(f64, bool)>,
    /// Outlet swirl with slip, V_θ2′.
    pub vtheta2: f64,
    /// Head with slip from the second engine balance.
    pub head: f64,
    /// The same from the closed form (u₂V_θ2′ − u₁V_θ1)/g.
    pub head_closed_form: f64,
    /// Σ u(|V_θ| + u)/g over the two stations: the size of the terms whose
    /// difference is the head, which the check's tolerance is relative to (they can
    /// nearly cancel); the head's share of `moment_scale`, the torque check's.
    pub head_terms: f64,
}

/// Specific speed at one operating point.
#[derive(Clone, Debug, PartialEq)]
pub struct SpecificSpeed {
    pub head: f64,
    pub head_source: &'static str,
    /// Ω_s, dimensionless (radians).
    pub dimensionless: f64,
    /// n_q, rpm, m³/s, m.
    pub metric: f64,
    /// N_s, rpm, US gpm, ft.
    pub us: f64,
}

/// The terms of the NPSH available.
#[derive(Clone, Debug, PartialEq)]
pub struct Npsh {
    pub absolute_pressure_head: f64,
    pub vapour_pressure: f64,
    pub vapour_source: &'static str,
    pub vapour_head: f64,
    pub velocity: f64,
    pub velocity_source: &'static str,
    pub velocity_head: f64,
    pub height: f64,
    pub available: f64,
}

/// Everything the pump part of the page shows.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct PumpSolved {
    pub slip: Option<Slip>,
    /// Slip asked for an axial pump: not applied.
    pub slip_not_radial: bool,
    pub specific_speed: Option<SpecificSpeed>,
    pub npsh: Option<Npsh>,
    /// A suction pressure was given but the liquid's vapour pressure is unknown.
    pub npsh_needs_vapour: bool,
}

/// The slip factor of a correlation for Z blades at outlet blade angle β₂ (from the
/// tangent) and radius ratio r₁/r₂, with Wiesner's limiting ratio where it applies.
pub fn slip_factor(model: SlipModel, blades: usize, beta2: f64, radius_ratio: f64) -> (f64, Option<(f64, bool)>) {
    let z = blades as f64;
    match model {
        SlipModel::Stodola => (1.0 - PI * beta2.sin() / z, None),
        SlipModel::Wiesner => {
            let sigma = 1.0 - beta2.sin().sqrt() / z.powf(0.7);
            let limit = (-8.16 * beta2.sin() / z).exp();
            if radius_ratio > limit {
                let excess = ((radius_ratio - limit) / (1.0 - limit)).powi(3);
                (sigma * (1.0 - excess), Some((limit, true)))
            } else {
                (sigma, Some((limit, false)))
            }
        }
    }
}

/// Solves the pump part from the runner's triangles.
///
/// # Errors
/// An engine refusal of the slipped balance.
pub fn solve(
    inputs: &PumpInputs,
    runner: &Runner,
    t1: &Triangle,
    t2: &Triangle,
    euler_head: f64,
    given_head: Option<f64>,
) -> Result<PumpSolved, EngineError> {
    if runner.machine != Machine::Pump {
        return Ok(PumpSolved::default());
    }
    let g = STANDARD_GRAVITY;
    let mut out = PumpSolved::default();
    if let Some((model, blades)) = inputs.slip {
        if runner.axial {
            out.slip_not_radial = true;
        } else {
            let (factor, wiesner_limit) = slip_factor(model, blades, runner.beta2, t1.radius / t2.radius);
            let slipped = Triangle {
                vtheta: t2.vtheta - (1.0 - factor) * t2.u,
                ..*t2
            };
            let balance = engine::balance(&runner.control_volume(t1, &slipped, runner.flow, false))?;
            let head = runner.euler_head(balance.shaft_torque.unwrap_or(f64::NAN), runner.flow);
            out.slip = Some(Slip {
                model,
                blades,
                factor,
                wiesner_limit,
                vtheta2: slipped.vtheta,
                head,
                head_closed_form: (t2.u * slipped.vtheta - t1.u * t1.vtheta) / g,
                head_terms: [t1, &slipped]
                    .iter()
                    .map(|t| t.u.abs() * (t.vtheta.abs() + t.u.abs()))
                    .sum::<f64>()
                    / g,
            });
        }
    }
    let (head, head_source) = match (given_head, &out.slip) {
        (Some(h), _) => (h, "the head given"),
        (None, Some(s)) => (s.head, "the head with slip (no head given)"),
        (None, None) => (euler_head, "the Euler head (no head given)"),
    };
    if head > 0.0 {
        let q = runner.flow;
        let n_rpm = runner.omega * 60.0 / (2.0 * PI);
        let q_gpm = units::convert_to(q, Q::VolumeFlow, "gpm").unwrap_or(f64::NAN);
        let h_ft = units::convert_to(head, Q::Length, "ft").unwrap_or(f64::NAN);
        out.specific_speed = Some(SpecificSpeed {
            head,
            head_source,
            dimensionless: runner.omega * q.sqrt() / (g * head).powf(0.75),
            metric: n_rpm * q.sqrt() / head.powf(0.75),
            us: n_rpm * q_gpm.sqrt() / h_ft.powf(0.75),
        });
    }
    if let Some(s) = inputs.suction {
        let rho = runner.fluid.density;
        let (vapour_pressure, vapour_source) = match (s.vapour, runner.fluid.vapour_pressure) {
            (Some(p), _) => (p.value, "typed"),
            (None, Some(p)) => (p, "water, IAPWS-IF97"),
            (None, None) => {
                out.npsh_needs_vapour = true;
                return Ok(out);
            }
        };
        let (velocity, velocity_source) = match s.bore {
            Some(d) => (runner.flow / (PI * d.value * d.value / 4.0), "Q/A in the suction bore"),
            None => (t1.v(), "absolute velocity at the blade inlet V₁"),
        };
        let absolute_pressure_head = (s.gauge.value + s.atmosphere.value) / (rho * g);
        let vapour_head = vapour_pressure / (rho * g);
        let velocity_head = velocity * velocity / (2.0 * g);
        out.npsh = Some(Npsh {
            absolute_pressure_head,
            vapour_pressure,
            vapour_source,
            vapour_head,
            velocity,
            velocity_source,
            velocity_head,
            height: s.height.value,
            available: absolute_pressure_head - vapour_head + velocity_head + s.height.value,
        });
    }
    Ok(out)
}

/// Saturation pressure of water, Pa, from the Antoine equation with the parameters
/// of the NIST Chemistry WebBook for water (log₁₀ p = A − B/(T + C), p in bar, T in K;
/// Bridgeman & Aldrich 1964, three ranges joined at 303.5 K and 343.5 K): within
/// about 0.15 % of IAPWS-IF97 from 0 to 100 °C. An independent path for the check.
pub fn antoine_water(t: f64) -> f64 {
    let (a, b, c) = if t < 303.5 {
        (5.40221, 1838.675, -31.737)
    } else if t < 343.5 {
        (5.20389, 1733.926, -39.485)
    } else {
        (5.08354, 1663.125, -45.622)
    };
    10f64.powf(a - b / (t + c)) * 1e5
}

/// Writes the pump outputs, checks, warnings and the table.
pub fn write(solved: &PumpSolved, runner: &Runner, temperature: Option<f64>, report: &mut Report<'_>) {
    if solved.slip_not_radial {
        report.warn(
            Some("slip"),
            "slip correlations are for radial impellers: no slip is applied to an axial pump here",
        );
    }
    if let Some(s) = &solved.slip {
        report.output("slip_factor", s.factor);
        report.output("vtheta2_slip", s.vtheta2);
        report.output("head_slip", s.head);
        report.check(
            "Head with slip",
            "closed form (u₂V_θ2′ − u₁V_θ1)/g with V_θ2′ = V_θ2 − (1 − σ)u₂",
            Q::Length,
            s.head,
            s.head_closed_form,
            1e-9,
            s.head_terms,
        );
        if let Some((limit, true)) = s.wiesner_limit {
            report.warn(
                Some("blades"),
                format!(
                    "the radius ratio r₁/r₂ exceeds Wiesner's limit ε = {}: his correction factor is applied, and the \
                     correlation is less certain",
                    units::format_significant(limit, 3)
                ),
            );
        }
    }
    if let Some(n) = &solved.specific_speed {
        report.output("specific_speed", n.dimensionless);
        report.output("specific_speed_metric", n.metric);
        report.output("specific_speed_us", n.us);
        let factor = units::convert_to(1.0, Q::VolumeFlow, "gpm").unwrap_or(f64::NAN).sqrt()
            / units::convert_to(1.0, Q::Length, "ft").unwrap_or(f64::NAN).powf(0.75);
        report.check(
            "Specific speed, US customary N_s",
            "metric n_q × 51.64 (√(gpm per m³/s) ÷ (ft per m)^¾)",
            Q::Ratio,
            n.us,
            n.metric * factor,
            1e-9,
            0.0,
        );
    }
    if solved.npsh_needs_vapour {
        report.warn(
            Some("p_vapour"),
            "NPSH available: not computed, the vapour pressure of this liquid is not known; type it at the \
             pumping temperature",
        );
    }
    if let Some(n) = &solved.npsh {
        report.output("npsh_available", n.available);
        report.output("vapour_pressure", n.vapour_pressure);
        if let (Some(t), "water, IAPWS-IF97") = (temperature, n.vapour_source) {
            let g = STANDARD_GRAVITY;
            report.check(
                "Vapour pressure head of water",
                "Antoine equation, NIST Chemistry WebBook parameters for water",
                Q::Length,
                n.vapour_head,
                antoine_water(t) / (runner.fluid.density * g),
                5e-3,
                0.0,
            );
        }
        if n.available <= 0.0 {
            report.warn(
                Some("p_suction"),
                "the NPSH available is not positive: the liquid boils at the eye and the pump cannot run; raise \
                 the suction pressure or the liquid level, or cool the liquid",
            );
        }
    }
    // Specific speed alone is in the outputs; the table adds the slip and NPSH terms.
    if solved.slip.is_some() || solved.npsh.is_some() {
        report.table(|report| table(solved, temperature, report));
    }
}

fn table(solved: &PumpSolved, temperature: Option<f64>, report: &Report<'_>) -> Table {
    let mut rows: Vec<Vec<String>> = Vec::new();
    let mut row = |name: &str, value: String, how: String| rows.push(vec![name.to_string(), value, how]);
    let number = |x: f64| units::format_significant(x, 4);
    if let Some(s) = &solved.slip {
        row(
            "slip factor σ",
            number(s.factor),
            format!("{}, Z = {}", s.model.name(), s.blades),
        );
        row(
            "outlet swirl with slip V_θ2′",
            report.fmt(s.vtheta2, Q::Velocity),
            "V_θ2 − (1 − σ)·u₂".to_string(),
        );
        row(
            "head with slip H′",
            report.fmt(s.head, Q::Length),
            "(u₂V_θ2′ − u₁V_θ1)/g, from the rotating-frame balance".to_string(),
        );
    }
    if let Some(n) = &solved.specific_speed {
        let basis = format!("at {} = {}", n.head_source, report.fmt(n.head, Q::Length));
        row(
            "specific speed Ω_s (dimensionless, rad)",
            number(n.dimensionless),
            format!("ω√Q/(gH)^¾ {basis}"),
        );
        row(
            "specific speed n_q (rpm, m³/s, m)",
            number(n.metric),
            format!("n√Q/H^¾ {basis}"),
        );
        row(
            "specific speed N_s (rpm, US gpm, ft)",
            number(n.us),
            format!("n√Q/H^¾ {basis}"),
        );
    }
    if let Some(n) = &solved.npsh {
        row(
            "absolute pressure head (p_gauge + p_atm)/ρg",
            report.fmt(n.absolute_pressure_head, Q::Length),
            "suction gauge reading plus the local atmosphere".to_string(),
        );
        let vapour = match temperature {
            Some(t) if n.vapour_source != "typed" => format!(
                "{} at {}, {}",
                report.fmt(n.vapour_pressure, Q::Pressure),
                report.fmt(t, Q::Temperature),
                n.vapour_source
            ),
            _ => format!("{} ({})", report.fmt(n.vapour_pressure, Q::Pressure), n.vapour_source),
        };
        row(
            "− vapour pressure head p_v/ρg",
            report.fmt(n.vapour_head, Q::Length),
            vapour,
        );
        row(
            "+ velocity head V²/2g",
            report.fmt(n.velocity_head, Q::Length),
            format!("V = {}, {}", report.fmt(n.velocity, Q::Velocity), n.velocity_source),
        );
        row(
            "+ height of the reading above the eye z",
            report.fmt(n.height, Q::Length),
            "typed (empty: 0)".to_string(),
        );
        row(
            "NPSH available",
            report.fmt(n.available, Q::Length),
            "compare with the pump's NPSH required plus a margin".to_string(),
        );
    }
    let emphasised = rows.len().saturating_sub(1);
    Table {
        key: "pump",
        title: "Pump: slip, specific speed and NPSH available".to_string(),
        columns: vec!["Quantity".to_string(), "value".to_string(), "how".to_string()],
        rows,
        emphasised_rows: if solved.npsh.is_some() {
            vec![emphasised]
        } else {
            Vec::new()
        },
        typed_columns: Vec::new(),
    }
}

/// The water temperature, K, when the fluid is water from its temperature.
pub fn water_temperature(values: &Values) -> Option<f64> {
    match values.choice("fluid") {
        Ok("custom") => None,
        _ => values.quantity("t").ok().filter(|t| *t > ZERO_CELSIUS - 1.0),
    }
}
