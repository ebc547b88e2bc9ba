//! The jet-plate report, built from the solved [`Plate`]: outputs, the checks
//! against the closed forms, warnings, the split, ledger, ports and basis tables and
//! the diagram.

use std::f64::consts::PI;

use crate::catalog::{Report, Table};
use crate::units::{self, QuantityKind as Q};

use super::super::common::{self, Jet, JetGiven};
use super::model::{Inputs, Plate};

/// Writes the whole report of a solved plate.
pub fn write(inputs: &Inputs, plate: &Plate, report: &mut Report<'_>) {
    let (jet, theta) = (&inputs.jet, inputs.plate_angle.value);
    let rho = inputs.fluid.density;
    let (v, q) = (jet.velocity.value, jet.flow.value);
    let (q_forward, q_back, thrust) = (plate.q_forward, plate.q_back, plate.force);
    // Components that are rounding residue of the jet's momentum flux (the force
    // across the jet on a normal plate, cos 90° = 6e-17) are the 0 they stand for.
    let momentum_flux = rho * q * v;
    let clean = |x: f64| if x.abs() <= 1e-12 * momentum_flux { 0.0 } else { x };
    report.output("force_normal", plate.force_normal);
    report.output("force_along_jet", clean(thrust.x));
    report.output("force_across_jet", clean(thrust.y));
    report.output("q_forward", q_forward);
    report.output("q_back", q_back);
    report.output("share_forward", q_forward / q);
    report.output("share_back", q_back / q);
    report.output("jet_velocity", v);
    report.output("jet_flow", q);
    report.output("mass_flow", rho * q);
    report.output("jet_momentum", momentum_flux);
    report.output("stagnation_pressure", 0.5 * rho * v * v);
    report.output("jet_power", 0.5 * rho * q * v * v);
    report.output("density", rho);
    report.check(
        "Force on the plate, normal to it",
        "closed form ρQV·sin θ (momentum normal to the plate, written by hand)",
        Q::Force,
        plate.force_normal,
        momentum_flux * theta.sin(),
        1e-9,
        momentum_flux,
    );
    report.check(
        "Flow along the plate, forward branch",
        "closed form Q(1 + cos θ)/2 (mass and momentum along a frictionless plate)",
        Q::VolumeFlow,
        q_forward,
        q * (1.0 + theta.cos()) / 2.0,
        1e-9,
        q,
    );

    common::forward_warnings(&plate.balance, report);
    if theta < 10.0 * PI / 180.0 {
        report.warn(
            Some("plate_angle"),
            "the jet nearly grazes the plate: almost all of it runs on forward and the normal force is small; \
                    a real jet spreads and may miss the plate",
        );
    }

    let system = report.system();
    report.table(|_| split_table(jet, theta, q_forward, q_back, system));
    report.table(|_| common::ledger_table(&plate.balance, system));
    report.table(|_| common::ports_table(&plate.balance, system));
    report.table(|report| basis(inputs, report));
    report.diagram(|report| super::diagram::diagram(inputs, plate, report));
}

fn split_table(jet: &Jet, theta: f64, q_forward: f64, q_back: f64, system: units::UnitSystem) -> Table {
    let unit = units::display_unit(jet.flow.value, Q::VolumeFlow, system).id;
    let flow = |x: f64| match units::convert_to(x, Q::VolumeFlow, unit) {
        Some(v) => units::format_significant(v, 5),
        None => "—".to_string(),
    };
    let share = |x: f64| units::format_significant(x, 5);
    let closed_forward = (1.0 + theta.cos()) / 2.0;
    let closed_back = (1.0 - theta.cos()) / 2.0;
    Table {
        key: "split",
        title: "Split of the flow along the plate (zero force along a frictionless plate)".to_string(),
        columns: vec![
            "Branch".to_string(),
            format!("flow ({unit})"),
            "share of the jet (balance)".to_string(),
            "share, closed form".to_string(),
        ],
        rows: vec![
            vec![
                "jet".to_string(),
                flow(jet.flow.value),
                "1".to_string(),
                "1".to_string(),
            ],
            vec![
                "forward, Q₁".to_string(),
                flow(q_forward),
                share(q_forward / jet.flow.value),
                format!("(1 + cos θ)/2 = {}", share(closed_forward)),
            ],
            vec![
                "back, Q₂".to_string(),
                flow(q_back),
                share(q_back / jet.flow.value),
                format!("(1 − cos θ)/2 = {}", share(closed_back)),
            ],
        ],
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    }
}

fn basis(inputs: &Inputs, report: &Report<'_>) -> Table {
    let (jet, theta) = (&inputs.jet, inputs.plate_angle.value);
    let speed = report.fmt(jet.velocity.value, Q::Velocity);
    let how = match inputs.jet_given {
        JetGiven::Flow(_) => format!("V = Q/A = {speed}"),
        JetGiven::Head(_, cv) => format!(
            "V = Cv·√(2gH), Cv = {}: {speed}",
            units::format_significant(cv.value, 4)
        ),
        JetGiven::Pressure(_, cv) => format!(
            "V = Cv·√(2p/ρ), Cv = {}: {speed}",
            units::format_significant(cv.value, 4)
        ),
        JetGiven::Velocity(_) => format!("given: {speed}"),
    };
    common::basis_table(vec![
        ("Jet speed", how),
        ("Jet area", format!("πd²/4 = {}", report.fmt(jet.area.value, Q::Area))),
        (
            "Angle θ",
            format!(
                "{} between the jet axis and the plate surface (90° = normal plate)",
                report.fmt(theta, Q::Angle)
            ),
        ),
        (
            "Pressures",
            "atmospheric (gauge zero) at every port: a free jet".to_string(),
        ),
        (
            "Sheet speeds",
            "equal to the jet speed (Bernoulli, no friction, weight neglected)".to_string(),
        ),
        (
            "Force reported",
            "force the jet puts on the plate; the plate's supports supply the opposite".to_string(),
        ),
    ])
}
