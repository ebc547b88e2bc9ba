//! The reaction arm's report: outputs, warnings, checks, the angular-momentum
//! ledger, the ports table, the diagram and the torque and power curves, all built
//! from the model's typed result ([`super::model::Solved`]).

use std::f64::consts::PI;

use crate::catalog::{Marker, Plot, Report, Series, Table};
use crate::engine::EngineError;
use crate::units::{self, QuantityKind as Q, UnitSystem};

use super::model::{efficiency_of, Arm, Drive, Load, Operating, Solved, State};
use crate::calculators::common;

const DOES_NOT_START: &str =
    "the load and bearing-friction torque at standstill is at least the stall torque: the arm does not start";
const LOAD_NEVER_BALANCES: &str = "the water's torque stays above the load torque up to a nozzle speed of 2 km/s: \
    there is no speed at the load in this model (a frictionless arm fed at fixed pressure runs away); give a \
    larger friction or load torque";
const NO_FINITE_RUNAWAY: &str = "with a fixed supply pressure and C_v·cos α = 1 the water's torque never falls to \
    zero: no finite runaway speed (only friction and windage limit it)";
const RUNAWAY_BASIS: &str = "closed form: fixed flow ω = W·cos α/R; fixed pressure ω = c·√(2p/ρ)/(R·√(1 − c²)), \
    c = C_v·cos α";
const HELD_ABOVE_RUNAWAY: &str = "the held speed is above the runaway speed: the shaft drives the arm, which then \
    works as a pump (negative torque and power)";
const HUB_BELOW_ATMOSPHERIC: &str = "at this speed the hub pressure comes out below atmospheric: the spinning arm \
    pumps and would draw the flow in by itself";
const POWER_BASIS: &str = "energy balance: Q·p_total at the hub − jets' kinetic energy ṁV²/2 − nozzle loss ṁ·K·W²/2";

/// Writes everything the page shows from the solved arm.
pub fn write(solved: &Solved, report: &mut Report<'_>) {
    let Solved {
        arm,
        load,
        stall,
        runaway,
        operating,
        shown,
        ..
    } = solved;
    match operating {
        Operating::DoesNotStart => report.warn(Some("t_load"), DOES_NOT_START),
        Operating::LoadNeverBalances => report.warn(Some("t_load"), LOAD_NEVER_BALANCES),
        Operating::At(_) | Operating::NoFiniteRunaway => {}
    }
    match runaway {
        Some(w) => report.output("runaway_speed", *w),
        None => report.warn(Some("cv"), NO_FINITE_RUNAWAY),
    }
    report.output("stall_torque", stall.torque);
    if let (Some(closed), Some(found)) = (solved.runaway_closed_form, *runaway) {
        report.check(
            "Runaway speed (searched over the balances)",
            RUNAWAY_BASIS,
            Q::AngularSpeed,
            found,
            closed.speed,
            closed.tolerance,
            0.0,
        );
    }
    if let Some((speed, power)) = solved.peak {
        report.output("max_power", power);
        report.output("speed_at_max_power", speed);
    }
    if operating.speed().is_some() {
        report.output("speed", shown.omega);
        report.output("torque", shown.torque);
        report.output("power", shown.power);
        if solved.friction.is_some() {
            let friction = solved.friction.torque(shown.omega);
            report.output("friction_torque", friction);
            // With no load the friction takes all the torque: nothing reaches a load
            // (the search leaves a rounding residue of the torques, not shown).
            let to_load = match load {
                Load::None => 0.0,
                _ => (shown.torque - friction) * shown.omega,
            };
            report.output("power_to_load", to_load);
        }
        if matches!(load, Load::Held(_)) && shown.torque < 0.0 {
            report.warn(Some("speed_held"), HELD_ABOVE_RUNAWAY);
        }
    }
    report.output("jet_velocity", shown.jet);
    report.output("tip_speed", shown.omega * arm.radius);
    report.output("jet_swirl", shown.jet * arm.cos_alpha() - shown.omega * arm.radius);
    report.output("flow", shown.flow);
    report.output("mass_flow", shown.flow * arm.fluid.density);
    report.output("supply_pressure", shown.supply_pressure);
    match efficiency_of(shown, load) {
        Ok(efficiency) => report.output("efficiency", efficiency),
        Err(reason) => report.warn(None, format!("Efficiency: not applicable, {reason}")),
    }
    independent_checks(report, arm, shown);
    operating_check(report, solved);
    if let Some(w) = solved.free_speed {
        report.output("free_speed", w);
    }
    report.output("density", arm.fluid.density);
    if shown.supply_pressure < 0.0 {
        report.warn(Some("q"), HUB_BELOW_ATMOSPHERIC);
    }
    if arm.alpha >= PI / 2.0 - 1e-9 {
        report.warn(Some("alpha"), "a radial jet (90 deg) gives no torque");
    }
    common::forward_warnings(&shown.balance, report);

    let system = report.system();
    report.table(|_| torque_ledger(shown, system));
    report.table(|_| common::ports_table(&shown.balance, system));
    report.diagram(|report| super::diagram::draw(arm, shown, report));
    plots(solved, report);
}

/// At a fixed flow the water's torque is linear in speed, ρQR(W·cos α − ωR), so
/// against a resisting torque T₀ + c·ω (constant and viscous friction, a constant or
/// linear load) the speed has the closed form ω = (ρQR·W·cos α − T₀)/(ρQR² + c):
/// compared with the speed searched over the engine's balances.
fn operating_check(report: &mut Report<'_>, solved: &Solved) {
    let (arm, friction) = (&solved.arm, solved.friction);
    let Drive::Flow(q) = arm.drive else { return };
    let Operating::At(found) = solved.operating else { return };
    let (load_constant, load_viscous) = match solved.load {
        Load::None => (0.0, 0.0),
        Load::Constant(t) => (t.value, 0.0),
        Load::Power {
            torque,
            speed,
            exponent: 1,
        } => (0.0, torque.value / speed.value),
        Load::Power { .. } | Load::Held(_) => return,
    };
    if !(friction.is_some() || load_constant > 0.0 || load_viscous > 0.0) {
        return;
    }
    let (rho, r, q) = (arm.fluid.density, arm.radius, q.value);
    let w = q / (arm.nozzles as f64 * arm.nozzle_area);
    let t0 = friction.constant_torque() + load_constant;
    let c = friction.viscous_coefficient() + load_viscous;
    let closed = (rho * q * r * w * arm.cos_alpha() - t0) / (rho * q * r * r + c);
    report.check(
        "Speed at the load (searched over the balances)",
        "closed form at fixed flow ω = (ρQR·W·cos α − T₀)/(ρQR² + c), T₀ + c·ω the load and friction",
        Q::AngularSpeed,
        found,
        closed,
        1e-9,
        // Relative to W/R, the speed of a frictionless arm with tangential jets, as
        // well as to the two speeds: at a speed of zero (jets pointing outwards, no
        // load) the search ends at a rounding of zero, 1e-18 rad/s, not at 0.
        w / r,
    );
}

/// Checks of the state shown against paths that do not go through the engine's
/// angular-momentum balance:
///
/// - torque: N nozzles, each with the tangential reaction of its jet,
///   ṁ_n·(W·cos α − ωR), at the radius R;
/// - power: T·ω against the energy balance in the fixed frame, the hydraulic power
///   the supply delivers, Q·p_total, less the kinetic energy the jets carry off,
///   ṁ·|V|²/2 with V = W + ωR, and the nozzle loss ṁ·K·W²/2.
fn independent_checks(report: &mut Report<'_>, arm: &Arm, state: &State) {
    let rho = arm.fluid.density;
    let (r, w, omega) = (arm.radius, state.jet, state.omega);
    let mass_flow = rho * state.flow;
    let per_nozzle = mass_flow / arm.nozzles as f64;
    let tangential = w * arm.cos_alpha() - omega * r;
    let torque = arm.nozzles as f64 * per_nozzle * tangential * r;
    let torque_scale = mass_flow * r * (w + omega * r);
    report.check(
        "Torque delivered to the shaft",
        "N × tangential jet reaction ṁ_n(W·cos α − ωR) × R",
        Q::Torque,
        state.torque,
        torque,
        1e-9,
        torque_scale,
    );
    let hub_speed = state.flow / arm.hub_port_area();
    let total_hub_pressure = match arm.hub_area {
        // A given bore: the supply pressure is static; add the hub velocity head.
        Some(_) => state.supply_pressure + 0.5 * rho * hub_speed * hub_speed,
        // No bore: the supply pressure is already the total head.
        None => state.supply_pressure,
    };
    let jet_speed_squared = tangential * tangential + (w * arm.alpha.sin()).powi(2);
    let carried = 0.5 * mass_flow * jet_speed_squared;
    let loss = 0.5 * mass_flow * arm.k * w * w;
    let supplied = state.flow * total_hub_pressure;
    report.check(
        "Shaft power T·ω",
        POWER_BASIS,
        Q::Power,
        state.power,
        supplied - carried - loss,
        1e-9,
        supplied.abs() + 0.5 * mass_flow * (w * w * (1.0 + arm.k) + (omega * r).powi(2)),
    );
}

/// The angular-momentum ledger about the axis: each nozzle's moment of momentum
/// outflow and pressure moment, the torque the shaft supplies and the torque the
/// water delivers.
fn torque_ledger(state: &State, system: UnitSystem) -> Table {
    let b = &state.balance;
    let o = b.moment_point;
    let mut rows: Vec<(String, f64)> = Vec::new();
    for p in &b.ports {
        let flux = (p.position - o).cross(p.momentum_outflow).z;
        let pressure = -(p.position - o).cross(p.pressure_force).z;
        rows.push((format!("{}: moment of momentum out, r × ±ṁV", p.name), flux));
        if pressure != 0.0 {
            rows.push((format!("{}: pressure moment, r × p·A·n", p.name), pressure));
        }
    }
    let total = rows.len();
    rows.push((
        "M = torque the shaft exerts on the arm (sum)".to_string(),
        b.support_moment.z,
    ));
    rows.push((
        "T = torque the water delivers to the shaft, −M".to_string(),
        state.torque,
    ));
    let max = rows.iter().map(|(_, v)| v.abs()).fold(0.0, f64::max);
    let unit = units::display_unit(max, Q::Torque, system).id;
    Table {
        key: "torque_ledger",
        title: "Angular-momentum ledger about the axis (rotating CV, absolute velocities V = W + ω×r)".to_string(),
        columns: vec!["Term".to_string(), format!("about +z ({unit})")],
        rows: rows
            .into_iter()
            .map(|(label, v)| {
                vec![
                    label,
                    units::convert_to(v, Q::Torque, unit)
                        .map(|x| units::format_significant(x, 4))
                        .unwrap_or_else(|| "—".to_string()),
                ]
            })
            .collect(),
        emphasised_rows: vec![total, total + 1],
        typed_columns: Vec::new(),
    }
}

/// Unit for a plot axis in the report's system, and the conversion.
fn axis_unit(max_abs: f64, kind: Q, system: UnitSystem) -> &'static str {
    units::display_unit(max_abs, kind, system).id
}

/// The torque and power curves, balanced here (for a full solve only); left out when
/// a balance on them fails.
fn plots(solved: &Solved, report: &mut Report<'_>) {
    report.plots(|report| curve_plots(solved, report.system()).unwrap_or_default());
}

fn curve_plots(solved: &Solved, system: UnitSystem) -> Result<Vec<Plot>, EngineError> {
    let Solved {
        load,
        runaway,
        operating,
        shown,
        ..
    } = solved;
    let states = &solved.curve()?;
    let operating = operating.speed();
    let top = states.last().map(|s| s.omega).unwrap_or(0.0);
    let conv = |v: f64, kind: Q, unit: &str| units::convert_to(v, kind, unit).unwrap_or(f64::NAN);
    let speed_unit = axis_unit(top, Q::AngularSpeed, system);
    let max_torque = states.iter().map(|s| s.torque.abs()).fold(0.0, f64::max);
    let torque_unit = axis_unit(max_torque, Q::Torque, system);
    let max_power = states.iter().map(|s| s.power.abs()).fold(0.0, f64::max);
    let power_unit = axis_unit(max_power, Q::Power, system);
    let x = |w: f64| conv(w, Q::AngularSpeed, speed_unit);

    let mut torque_series = vec![Series {
        name: "torque of the water".to_string(),
        points: states
            .iter()
            .map(|s| [x(s.omega), conv(s.torque, Q::Torque, torque_unit)])
            .collect(),
    }];
    let friction = solved.friction;
    if matches!(load, Load::Constant(_) | Load::Power { .. }) || friction.is_some() {
        let resisting = |w: f64| match load {
            Load::Held(_) => friction.torque(w),
            _ => load.torque(w) + friction.torque(w),
        };
        torque_series.push(Series {
            name: if friction.is_some() {
                "load and bearing friction torque".to_string()
            } else {
                "load torque".to_string()
            },
            points: states
                .iter()
                .map(|s| [x(s.omega), conv(resisting(s.omega), Q::Torque, torque_unit)])
                .collect(),
        });
    }
    let mut torque_markers = vec![Marker {
        at: [0.0, conv(states[0].torque, Q::Torque, torque_unit)],
        label: "stall".to_string(),
    }];
    let mut power_markers = Vec::new();
    if let Some(w) = *runaway {
        torque_markers.push(Marker {
            at: [x(w), 0.0],
            label: "runaway".to_string(),
        });
    }
    if let Some(w) = operating {
        let s = shown;
        torque_markers.push(Marker {
            at: [x(w), conv(s.torque, Q::Torque, torque_unit)],
            label: "at the load".to_string(),
        });
        power_markers.push(Marker {
            at: [x(w), conv(s.power, Q::Power, power_unit)],
            label: "at the load".to_string(),
        });
    }
    if let Some((peak, p)) = solved.peak {
        power_markers.push(Marker {
            at: [x(peak), conv(p, Q::Power, power_unit)],
            label: "largest power".to_string(),
        });
    }
    let torque_plot = Plot {
        key: "torque_speed",
        title: "Torque against speed".to_string(),
        x_label: format!("speed ({speed_unit})"),
        y_label: format!("torque ({torque_unit})"),
        series: torque_series,
        markers: torque_markers,
    };
    let power_plot = Plot {
        key: "power_speed",
        title: "Shaft power against speed".to_string(),
        x_label: format!("speed ({speed_unit})"),
        y_label: format!("power ({power_unit})"),
        series: vec![Series {
            name: "shaft power".to_string(),
            points: states
                .iter()
                .map(|s| [x(s.omega), conv(s.power, Q::Power, power_unit)])
                .collect(),
        }],
        markers: power_markers,
    };
    Ok(vec![torque_plot, power_plot])
}
