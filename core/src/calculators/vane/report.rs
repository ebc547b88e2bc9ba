//! The vane's report, built from the solved [`Solved`]: outputs, the checks by
//! independent paths, warnings, the velocity, energy, optimum, ledger, ports and
//! basis tables, the power and efficiency plots and the diagram.

use std::f64::consts::PI;

use crate::catalog::{Marker, Plot, Report, Series, Table};
use crate::engine::EngineError;
use crate::error::FieldError;
use crate::units::{self, QuantityKind as Q, UnitSystem, STANDARD_GRAVITY};
use crate::vector::Vec3;

use super::super::common::{self, Jet, JetGiven};
use super::model::{self, CurvePoint, Inputs, Refusal, Solved, Vane, VaneKind, VaneState};
use super::LARGEST_JET_RATIO;

/// The field errors of a refusal, with speeds in the report's units.
pub fn refusal(refusal: Refusal, report: &Report<'_>) -> Vec<FieldError> {
    let texts = |u: f64, v: f64| (report.fmt(u, Q::Velocity), report.fmt(v, Q::Velocity));
    match refusal {
        Refusal::Fields(errors) => errors.into(),
        Refusal::VaneOutrunsJet { u, v } => {
            let (u_text, v_text) = texts(u, v);
            vec![FieldError::inconsistent(
                "u",
                format!(
                    "the blade speed ({u_text}) must be less than the jet speed ({v_text}): a single vane moving \
                        at or above the jet speed runs away from the jet and no water reaches it"
                ),
            )]
        }
        Refusal::WheelOutrunsJet { u, v } => {
            let (u_text, v_text) = texts(u, v);
            vec![FieldError::inconsistent(
                "u",
                format!(
                    "the blade speed ({u_text}) is above the jet speed ({v_text}): the buckets would outrun the \
                        jet, which then strikes their backs and brakes the wheel; the jet cannot drive a wheel faster \
                        than the jet speed (its ideal runaway speed)"
                ),
            )]
        }
    }
}

/// Writes the whole report of a solved vane.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let (fluid, jet, vane, mode) = (&inputs.fluid, &inputs.jet, inputs.vane(), inputs.kind);
    let (state, best_single, best_wheel) = (&solved.state, &solved.best_single, &solved.best_wheel);
    let (u, v, theta) = (state.u, jet.velocity.value, vane.theta);
    let rho = fluid.density;
    let jet_power = 0.5 * rho * jet.flow.value * v * v;
    let w1 = state.w_in.norm();
    // A component that is rounding residue of the momentum flux turned (the side
    // force of a vane turning the flow straight back, sin 180° = 1.2e-16) is 0.
    let flux = state.mass_turned * w1;
    let force_y = if state.force.y.abs() <= 1e-12 * flux {
        0.0
    } else {
        state.force.y
    };
    // The job's answer first: the best running speed and the peak power of the
    // chosen kind (a fixed vane has neither: it does no work).
    match mode {
        VaneKind::Single => {
            report.output("u_best", best_single.u);
            report.output("power_best", best_single.power);
        }
        VaneKind::Wheel => {
            report.output("u_best", best_wheel.u);
            report.output("power_best", best_wheel.power);
        }
        VaneKind::Fixed => {}
    }
    report.output("force_x", state.force.x);
    report.output("power", state.power);
    match (mode, v - u <= 1e-9 * v) {
        (VaneKind::Fixed, _) => report.warn(
            None,
            "Efficiency: not applicable, a fixed vane does no work (there is no blade speed to take power at); \
                    choose a moving vane or a wheel",
        ),
        (VaneKind::Wheel, true) => report.warn(
            Some("u"),
            "Efficiency: not applicable, at the runaway speed no load takes power from the wheel",
        ),
        _ => report.output("efficiency", state.efficiency),
    }
    report.output("force_y", force_y);
    report.output("force_side", -force_y);
    report.output("force", state.force.norm());
    report.output("mass_flow_turned", state.mass_turned);
    report.output("w_in", w1);
    report.output("w_out", state.w_out.norm());
    // Below the 1e-9·V floor of the wheel's exit sheet the water leaves at rest.
    let v_out = if state.v_out.norm() > 1e-9 * v {
        state.v_out.norm()
    } else {
        0.0
    };
    report.output("v_out", v_out);
    if state.v_out.norm() > 1e-9 * v {
        report.output("v_out_angle", state.v_out.plane_angle());
    }
    report.output("head_loss", state.head_loss);
    report.output("jet_velocity", v);
    report.output("jet_flow", jet.flow.value);
    report.output("jet_power", jet_power);
    report.output("u_best_single", best_single.u);
    report.output("power_best_single", best_single.power);
    report.output("efficiency_best_single", best_single.efficiency);
    report.output("u_best_wheel", best_wheel.u);
    report.output("power_best_wheel", best_wheel.power);
    report.output("efficiency_best_wheel", best_wheel.efficiency);
    report.output("density", rho);
    if let Some(wheel) = inputs.wheel {
        let jets = wheel.jets as f64;
        report.output("speed", wheel.omega(u));
        report.output("speed_best", wheel.omega(best_wheel.u));
        report.output("power_per_jet", state.power);
        report.output("power_all_jets", jets * state.power);
        report.output("flow_all_jets", jets * jet.flow.value);
        if jet.diameter.value > LARGEST_JET_RATIO * wheel.pitch_diameter.value {
            report.warn(
                Some("d_pitch"),
                "the jet is larger than a sixth of the pitch diameter: buckets that size interfere with each \
                        other and the wheel loses more than this balance shows (usual practice keeps the pitch \
                        diameter at least 6 to 10 jet diameters)",
            );
        }
    }

    independent_checks(report, inputs, solved);

    common::forward_warnings(&state.balance, report);
    if mode == VaneKind::Wheel && v - u <= 1e-9 * v {
        report.warn(
            Some("u"),
            "the blade speed equals the jet speed: this is the ideal wheel's runaway speed; no water is \
                    turned, no force acts and no power is delivered",
        );
    }
    if mode != VaneKind::Fixed && u == 0.0 {
        report.warn(
            Some("u"),
            "with the vane held still the force is the fixed-vane force and no power is delivered",
        );
    }
    if theta < PI / 2.0 {
        report.warn(
            Some("angle"),
            "a vane that turns the flow less than 90 degrees sends the water on forward; impulse buckets turn \
                    it about 160 to 170 degrees",
        );
    }

    let system = report.system();
    report.table(|_| velocity_table(state, system));
    report.table(|_| energy_table(state, mode, jet, rho, system));
    report.table(|_| optimum_table(jet, &vane, rho, best_single, best_wheel, system));
    report.table(|_| common::ledger_table(&state.balance, system));
    report.table(|_| common::ports_table(&state.balance, system));
    report.table(|report| basis(inputs, report));
    report.plots(|_| plots(inputs, solved, system).unwrap_or_default());
    report.diagram(|report| super::diagram::diagram(jet, &vane, mode, state, report));
}

/// Checks against paths that do not go through the engine's momentum balance:
///
/// - the force along the jet against ṁ·W₁·(1 − k·cos θ), with ṁ = ρA(V − u) for a
///   single vane and ρAV otherwise, written by hand;
/// - the power F_x·u (momentum) against the energy balance: the jet's kinetic-energy
///   flux less what the water carries off, ṁ|V₂|²/2, the loss on the vane,
///   ṁ(1 − k²)W₁²/2, and for a single vane the lengthening jet, ρAu·V²/2;
/// - the searched peak powers against (4/27)ρAV³(1 − k·cos θ) for a single vane and
///   ρAV³(1 − k·cos θ)/4 for a wheel.
fn independent_checks(report: &mut Report<'_>, inputs: &Inputs, solved: &Solved) {
    let (jet, vane, mode, rho) = (&inputs.jet, inputs.vane(), inputs.kind, inputs.fluid.density);
    let (state, best_single, best_wheel) = (&solved.state, &solved.best_single, &solved.best_wheel);
    let (v, u, a) = (jet.velocity.value, state.u, jet.area.value);
    let w1 = v - u;
    let turning = 1.0 - vane.k * vane.theta.cos();
    let mass = match mode {
        VaneKind::Single => rho * a * w1,
        VaneKind::Fixed | VaneKind::Wheel => rho * a * v,
    };
    // The balance sums momentum fluxes of the order ṁ(|V| + |u|) (every velocity in
    // either frame is at most |V| + |u|) that cancel to F_x: a jet as fast as the
    // blades leaves their rounding, not a zero, so that is the check's scale.
    report.check(
        "Force on the vane along the jet",
        "closed form ṁ·W₁·(1 − k·cos θ)",
        Q::Force,
        state.force.x,
        mass * w1 * turning,
        1e-9,
        2.0 * mass.abs() * (v.abs() + u.abs()),
    );
    let jet_power = 0.5 * rho * jet.flow.value * v * v;
    let carried = 0.5 * mass * state.v_out.dot(state.v_out);
    let loss = 0.5 * mass * (1.0 - vane.k * vane.k) * w1 * w1;
    let lengthening = if mode == VaneKind::Single {
        0.5 * rho * a * u * v * v
    } else {
        0.0
    };
    report.check(
        "Power delivered to the vane(s), F_x·u",
        "energy balance: jet's kinetic-energy flux − kinetic energy carried off − loss on the vane ṁ(1 − \
                k²)W₁²/2 (− the lengthening jet, single vane)",
        Q::Power,
        state.power,
        jet_power - carried - loss - lengthening,
        1e-9,
        jet_power,
    );
    let rav3 = rho * a * v * v * v;
    report.check(
        "Single vane: peak power (searched)",
        "closed form (4/27)ρAV³(1 − k·cos θ) at u = V/3",
        Q::Power,
        best_single.power,
        4.0 / 27.0 * rav3 * turning,
        1e-8,
        0.0,
    );
    report.check(
        "Wheel: peak power (searched)",
        "closed form ρAV³(1 − k·cos θ)/4 at u = V/2",
        Q::Power,
        best_wheel.power,
        0.25 * rav3 * turning,
        1e-8,
        0.0,
    );
    if let Some(wheel) = inputs.wheel {
        // Power ∝ (V − u)·u peaks at u = V/2, so ω = 2u/D = V/D whatever k and θ.
        report.check(
            "Wheel: speed of peak power (searched)",
            "closed form ω = V/D (buckets at half the jet speed)",
            Q::AngularSpeed,
            wheel.omega(best_wheel.u),
            v / wheel.pitch_diameter.value,
            1e-6,
            0.0,
        );
    }
}

fn fmt_in(value: f64, kind: Q, unit: &str) -> String {
    match units::convert_to(value, kind, unit) {
        Some(v) => units::format_significant(v, 5),
        None => "—".to_string(),
    }
}

fn velocity_table(state: &VaneState, system: UnitSystem) -> Table {
    let unit = units::display_unit(1.0, Q::Velocity, system).id;
    let f = |x: f64| fmt_in(x, Q::Velocity, unit);
    let blade = Vec3::new(state.u, 0.0, 0.0);
    let v_in = state.w_in + blade;
    let row = |name: &str, vec: Vec3| vec![name.to_string(), f(vec.x), f(vec.y), f(vec.norm())];
    Table {
        key: "velocities",
        title: "Velocity triangles: absolute V = blade u + relative W".to_string(),
        columns: vec![
            "Velocity".to_string(),
            format!("x ({unit})"),
            format!("y ({unit})"),
            format!("magnitude ({unit})"),
        ],
        rows: vec![
            row("blade speed u", blade),
            row("entering: absolute V₁ (the jet)", v_in),
            row("entering: relative W₁", state.w_in),
            row("leaving: relative W₂", state.w_out),
            row("leaving: absolute V₂", state.v_out),
        ],
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    }
}

fn energy_table(state: &VaneState, mode: VaneKind, jet: &Jet, rho: f64, system: UnitSystem) -> Table {
    let v = jet.velocity.value;
    let jet_power = 0.5 * rho * jet.flow.value * v * v;
    let unit = units::display_unit(jet_power.max(1e-12), Q::Power, system).id;
    let f = |x: f64| fmt_in(x, Q::Power, unit);
    let carried = 0.5 * state.mass_turned * state.v_out.dot(state.v_out);
    let loss = state.mass_turned * STANDARD_GRAVITY * state.head_loss;
    let mut rows = vec![
        vec!["jet kinetic-energy flux ρQV²/2".to_string(), f(jet_power)],
        vec!["power to the vane(s), F_x·u".to_string(), f(state.power)],
        vec!["kinetic energy carried off, ṁ·V₂²/2".to_string(), f(carried)],
        vec!["loss on the vane, ṁ·g·h_L".to_string(), f(loss)],
    ];
    if mode == VaneKind::Single {
        // The jet between nozzle and vane grows by u every second: ρA·u of jet at V.
        let lengthening = 0.5 * rho * jet.area.value * state.u * v * v;
        rows.push(vec![
            "kinetic energy of the lengthening jet, ρAu·V²/2".to_string(),
            f(lengthening),
        ]);
    }
    Table {
        key: "energy",
        title: "Where the jet's power goes (the checks table compares F_x·u with the energy balance)".to_string(),
        columns: vec!["Term".to_string(), format!("power ({unit})")],
        rows,
        emphasised_rows: vec![1],
        typed_columns: Vec::new(),
    }
}

fn optimum_table(jet: &Jet, vane: &Vane, rho: f64, single: &VaneState, wheel: &VaneState, system: UnitSystem) -> Table {
    let v = jet.velocity.value;
    let c = 1.0 - vane.k * vane.theta.cos();
    let rav3 = rho * jet.area.value * v * v * v;
    let speed_unit = units::display_unit(1.0, Q::Velocity, system).id;
    let power_unit = units::display_unit((0.25 * rav3 * c).max(1e-12), Q::Power, system).id;
    let s = |x: f64| fmt_in(x, Q::Velocity, speed_unit);
    let p = |x: f64| fmt_in(x, Q::Power, power_unit);
    // Efficiency as a ratio, as the page's outputs show it (one format per page).
    let e = |x: f64| units::format_significant(x, 4);
    Table {
        key: "optimum",
        title: "Best blade speed: searched over the balance, and the closed forms".to_string(),
        columns: vec![
            "Quantity".to_string(),
            "single vane".to_string(),
            "closed form".to_string(),
            "wheel".to_string(),
            "closed form".to_string(),
        ],
        rows: vec![
            vec![
                format!("blade speed ({speed_unit})"),
                s(single.u),
                format!("V/3 = {}", s(v / 3.0)),
                s(wheel.u),
                format!("V/2 = {}", s(v / 2.0)),
            ],
            vec![
                format!("peak power ({power_unit})"),
                p(single.power),
                format!("(4/27)ρAV³(1 − k cos θ) = {}", p(4.0 / 27.0 * rav3 * c)),
                p(wheel.power),
                format!("ρAV³(1 − k cos θ)/4 = {}", p(0.25 * rav3 * c)),
            ],
            vec![
                "peak efficiency (ratio)".to_string(),
                e(single.efficiency),
                format!("(8/27)(1 − k cos θ) = {}", e(8.0 / 27.0 * c)),
                e(wheel.efficiency),
                format!("(1 − k cos θ)/2 = {}", e(0.5 * c)),
            ],
        ],
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    }
}

fn basis(inputs: &Inputs, report: &Report<'_>) -> Table {
    let (mode, jet, vane) = (inputs.kind, &inputs.jet, inputs.vane());
    let speed = report.fmt(jet.velocity.value, Q::Velocity);
    let cv = |cv: uom::si::f64::Ratio| units::format_significant(cv.value, 4);
    let how = match inputs.jet_given {
        JetGiven::Flow(_) => format!("V = Q/A = {speed}"),
        JetGiven::Head(_, c) => format!("V = Cv·√(2gH), Cv = {}: {speed}", cv(c)),
        JetGiven::Pressure(_, c) => format!("V = Cv·√(2p/ρ), Cv = {}: {speed}", cv(c)),
        JetGiven::Velocity(_) => format!("given: {speed}"),
    };
    let frame = match mode {
        VaneKind::Fixed => "fixed control volume around the vane; ṁ = ρAV",
        VaneKind::Single => "control volume moving with the vane at u (relative velocities); ṁ = ρA(V − u)",
        VaneKind::Wheel => {
            "fixed control volume around the wheel (absolute velocities from the exit triangle); ṁ = ρAV, the \
                    whole jet"
        }
    };
    let mut rows = vec![
        ("Jet speed", how),
        ("Control volume", frame.to_string()),
        (
            "Vane",
            format!(
                "turns the relative flow through θ = {}; W₂ = k·W₁ with k = {}",
                report.fmt(vane.theta, Q::Angle),
                units::format_significant(vane.k, 4)
            ),
        ),
        (
            "Pressures",
            "atmospheric (gauge zero) at every port: a free jet".to_string(),
        ),
        (
            "Force reported",
            "force the water puts on the vane; the vane's mounting (or the wheel's shaft) supplies the \
                    opposite"
                .to_string(),
        ),
    ];
    if let Some(wheel) = inputs.wheel {
        rows.push((
            "Wheel",
            format!(
                "pitch diameter D = {}, {} jet(s), each the jet above; speed n = 60u/(πD); power and flow of \
                        the wheel = jets × one jet's",
                report.fmt(wheel.pitch_diameter.value, Q::Length),
                wheel.jets
            ),
        ));
    }
    common::basis_table(rows)
}

/// Power and efficiency against blade speed, from the balances of the curves
/// ([`model::curve`], balanced here); none when a balance on them fails.
fn plots(inputs: &Inputs, solved: &Solved, system: UnitSystem) -> Result<Vec<Plot>, EngineError> {
    let single_curve = model::curve(inputs, VaneKind::Single)?;
    let wheel_curve = model::curve(inputs, VaneKind::Wheel)?;
    let (fluid, jet, vane, mode, state) = (&inputs.fluid, &inputs.jet, inputs.vane(), inputs.kind, &solved.state);
    let v = jet.velocity.value;
    let c = 1.0 - vane.k * vane.theta.cos();
    let rav3 = fluid.density * jet.area.value * v * v * v;
    let speed_unit = units::display_unit(1.0, Q::Velocity, system);
    let power_unit = units::display_unit((0.25 * rav3 * c).max(1e-12), Q::Power, system);
    let sx = |u: f64| units::convert_to(u, Q::Velocity, speed_unit.id).unwrap_or(u);
    let py = |p: f64| units::convert_to(p, Q::Power, power_unit.id).unwrap_or(p);
    let series = |pick: &dyn Fn(&CurvePoint) -> [f64; 2]| {
        [("single vane", &single_curve), ("wheel of vanes", &wheel_curve)]
            .into_iter()
            .map(|(name, curve)| Series {
                name: name.to_string(),
                points: curve.iter().map(pick).collect(),
            })
            .collect::<Vec<Series>>()
    };
    let mut power_markers = vec![
        Marker {
            at: [sx(v / 3.0), py(4.0 / 27.0 * rav3 * c)],
            label: "single vane optimum, u = V/3".to_string(),
        },
        Marker {
            at: [sx(v / 2.0), py(0.25 * rav3 * c)],
            label: "wheel optimum, u = V/2".to_string(),
        },
    ];
    let mut efficiency_markers = vec![
        Marker {
            at: [sx(v / 3.0), 8.0 / 27.0 * c],
            label: "single vane optimum, u = V/3".to_string(),
        },
        Marker {
            at: [sx(v / 2.0), 0.5 * c],
            label: "wheel optimum, u = V/2".to_string(),
        },
    ];
    if mode != VaneKind::Fixed {
        power_markers.push(Marker {
            at: [sx(state.u), py(state.power)],
            label: "this case".to_string(),
        });
        efficiency_markers.push(Marker {
            at: [sx(state.u), state.efficiency],
            label: "this case".to_string(),
        });
    }
    let x_label = format!("blade speed u ({})", speed_unit.id);
    Ok(vec![
        Plot {
            key: "power",
            title: "Power against blade speed (balances at each speed)".to_string(),
            x_label: x_label.clone(),
            y_label: format!("power ({})", power_unit.id),
            series: series(&|p| [sx(p.u), py(p.power)]),
            markers: power_markers,
        },
        Plot {
            key: "efficiency",
            title: "Efficiency against blade speed (balances at each speed)".to_string(),
            x_label,
            y_label: "efficiency (ratio)".to_string(),
            series: series(&|p| [sx(p.u), p.efficiency]),
            markers: efficiency_markers,
        },
    ])
}
