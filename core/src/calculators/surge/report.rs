//! The surge page's report: outputs, the surge and run-load tables, the checks,
//! warnings, the carry-over to the thrust-restraint page and the diagram, all built
//! from the model's typed result ([`super::model::Solved`]).

use crate::catalog::{CarryOver, Report, Table};
use crate::units::{self, QuantityKind as Q};

use super::model::{Closure, Inputs, Solved};
use crate::calculators::common;

const SLOW_IS_NOT_TRANSIENT: &str = "the closure is slower than 2L/a, so the surge shown is the slow-closure \
    (Michaud) estimate 2ρLΔV/t_c for a velocity falling linearly in time. This is an estimate, not a transient \
    analysis: a real valve closes most of the flow in the last part of its stroke, which can give a rise close to \
    the Joukowsky value; pumps, air, column separation and branches need a transient (method of characteristics) \
    analysis.";
const SLOW_BASIS: &str = "slow-closure formula 2ρLΔV/t_c at t_c = 2L/a (equals ρ·a·ΔV)";
const IMPULSE_BASIS: &str = "momentum of the liquid in the run, ρ·A·L_run (impulse ÷ ΔV on the bore area)";
const RAPID_NOTE: &str = "the closure is at least as fast as 2L/a: the full Joukowsky rise ρ·a·ΔV reaches the valve \
    before relief returns from the reflecting boundary";
const CARRY_LABEL: &str = "Size the restraint of the dead end or closed valve at the design pressure (working + surge)";

/// A quantity typed as a user would type it in the report's unit system.
fn typed(report: &Report<'_>, si: f64, kind: Q) -> String {
    let unit = units::display_unit(si, kind, report.system());
    match units::convert_to(si, kind, unit.id) {
        Some(v) if v.is_finite() => format!("{} {}", units::format_significant(v, 5), unit.id),
        _ => format!(
            "{} {}",
            units::format_significant(si, 5),
            units::display_unit(1.0, kind, report.system()).id
        ),
    }
}

/// Writes everything the page shows.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    report.output("p_design", solved.design);
    report.output("dp_surge", solved.surge);
    report.output("thrust", solved.thrust_total);
    report.output("run_force", solved.run.peak);
    report.output("wave_speed", solved.wave_speed);
    report.output("round_trip", solved.round_trip);
    report.output("dp_joukowsky", solved.joukowsky);
    if solved.closure == Closure::Slow {
        report.output("dp_slow", solved.slow_estimate);
        report.warn(Some("closure_time"), SLOW_IS_NOT_TRANSIENT);
    }
    report.output("thrust_surge", solved.thrust_surge);
    report.output("area_d", solved.area_d);
    report.output("thrust_area", solved.area);
    report.output("run_transit", solved.run.transit);
    report.output("run_duration", solved.run.duration);
    checks(inputs, solved, report);
    let system = report.system();
    let fmt = |si: f64, kind: Q| units::format_quantity_labelled(si, kind, system);
    let closure = match solved.closure {
        Closure::Rapid => format!(
            "rapid: t_c = {} ≤ 2L/a = {}",
            fmt(inputs.closure_time.value, Q::Time),
            fmt(solved.round_trip, Q::Time)
        ),
        Closure::Slow => format!(
            "slow: t_c = {} > 2L/a = {}",
            fmt(inputs.closure_time.value, Q::Time),
            fmt(solved.round_trip, Q::Time)
        ),
    };
    let used = match solved.closure {
        Closure::Rapid => format!("Joukowsky ρ·a·ΔV ({RAPID_NOTE})"),
        Closure::Slow => {
            "slow-closure estimate 2ρLΔV/t_c (smaller than Joukowsky; not a transient analysis)".to_string()
        }
    };
    let (impulse_number, impulse_unit) = units::display_parts(solved.run.impulse_of_history(), Q::Force, system);
    report.table(|_| {
        common::basis_table(vec![
            (
                "Wave speed a",
                format!("{} ({})", fmt(solved.wave_speed, Q::Velocity), solved.wave_source),
            ),
            (
                "Density ρ",
                format!("{} ({})", fmt(inputs.fluid.density, Q::Density), inputs.fluid.name),
            ),
            ("Round trip 2L/a", fmt(solved.round_trip, Q::Time)),
            ("Closure", closure),
            ("Joukowsky rise ρ·a·ΔV", fmt(solved.joukowsky, Q::Pressure)),
            (
                "Slow-closure estimate 2ρLΔV/t_c",
                fmt(solved.slow_estimate, Q::Pressure),
            ),
            ("Surge used", format!("{}: {}", fmt(solved.surge, Q::Pressure), used)),
            ("Design pressure p + Δp", fmt(solved.design, Q::Pressure)),
            (
                "Thrust area",
                format!(
                    "{} on the {} ({})",
                    fmt(solved.area, Q::Area),
                    if inputs.joint.uses_od() {
                        "outside diameter"
                    } else {
                        "bore"
                    },
                    inputs.joint.label()
                ),
            ),
            (
                "Transient thrust Δp·A at the valve or dead end",
                fmt(solved.thrust_surge, Q::Force),
            ),
            ("Total thrust (p + Δp)·A", fmt(solved.thrust_total, Q::Force)),
        ])
    });
    report.table(|report| run_table(inputs, solved, report, (impulse_number, impulse_unit.id)));
    report.solution.carry_over.push(carry_over(inputs, solved, report));
    if solved.surge > inputs.work.value + 101_325.0 {
        report.warn(
            Some("p"),
            "the surge exceeds the working pressure plus one atmosphere: the down-surge that follows (the same \
             amplitude below the working pressure) would fall below vapour pressure, so the column may separate and \
             the collapse give a larger rise than shown; a transient analysis is needed",
        );
    }
    common::pipe_velocity_warning(report, "dv", "pipe", inputs.dv.value);
    report.diagram(|report| super::diagram::draw(solved, report));
}

fn run_table(inputs: &Inputs, solved: &Solved, report: &Report<'_>, impulse: (String, &str)) -> Table {
    let system = report.system();
    let fmt = |si: f64, kind: Q| units::format_quantity_labelled(si, kind, system);
    let run = &solved.run;
    let shape = if run.front_length > inputs.run_length.value {
        format!(
            "the front ({} long) is longer than the run: the force rises over L_run/a, holds {} and falls",
            fmt(run.front_length, Q::Length),
            fmt(run.plateau, Q::Time)
        )
    } else {
        format!(
            "the front ({} long) fits in the run: the force rises over t_c, holds {} and falls",
            fmt(run.front_length, Q::Length),
            fmt(run.plateau, Q::Time)
        )
    };
    let rows = common::basis_table(vec![
        (
            "Run length between elbows L_run",
            fmt(inputs.run_length.value, Q::Length),
        ),
        ("Transit time of the front L_run/a", fmt(run.transit, Q::Time)),
        (
            "Peak unbalanced force A·ρ·a·ΔV·min(1, L_run/(a·t_c))",
            fmt(run.peak, Q::Force),
        ),
        ("Shape of the load", shape),
        ("Duration of the load L_run/a + t_c", fmt(run.duration, Q::Time)),
        ("Impulse ∫F dt = A·ρ·ΔV·L_run", format!("{} {}·s", impulse.0, impulse.1)),
        (
            "Direction",
            "along the run, toward the elbow the front reaches first (the valve side on the way up the line); \
             reversed as the reflected wave returns"
                .to_string(),
        ),
    ]);
    Table {
        key: "run_load",
        title: "Water-hammer load on the run between elbows".to_string(),
        ..rows
    }
}

fn checks(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let rho = inputs.fluid.density;
    let dv = inputs.dv.value;
    report.check(
        "Joukowsky rise ρ·a·ΔV",
        SLOW_BASIS,
        Q::Pressure,
        solved.joukowsky,
        super::model::slow_closure(rho, inputs.length.value, dv, solved.round_trip),
        1e-9,
        0.0,
    );
    if dv > 0.0 {
        let bore = common::circle_area(inputs.pipe.id);
        report.check(
            "Impulse on the run ÷ ΔV (bore area)",
            IMPULSE_BASIS,
            Q::Mass,
            solved.run.impulse_of_history() * bore / solved.area / dv,
            solved.run_mass,
            1e-9,
            0.0,
        );
    }
}

fn carry_over(inputs: &Inputs, solved: &Solved, report: &Report<'_>) -> CarryOver {
    let mut fields = vec![
        ("fitting", "dead_end".to_string()),
        ("joint", inputs.joint.key().to_string()),
        ("p_basis", "operating".to_string()),
        ("p", typed(report, solved.design, Q::Pressure)),
    ];
    if inputs.typed_diameters || crate::pipe_sizes::find(&inputs.size_key).is_none() {
        fields.push(("size", crate::pipe_sizes::CUSTOM.to_string()));
        fields.push(("d", typed(report, inputs.pipe.id, Q::Length)));
        fields.push(("od", typed(report, inputs.pipe.od, Q::Length)));
    } else {
        fields.push(("size", inputs.size_key.clone()));
    }
    CarryOver {
        calculator: "thrust-block",
        label: CARRY_LABEL.to_string(),
        inputs: fields,
    }
}
