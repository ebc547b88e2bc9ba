//! The nozzle's report, built from the solved [`Nozzle`]: outputs, checks by
//! independent paths, warnings, the basis, ledger and ports tables, the diagram and
//! the carry-over to the thrust-restraint page.

use crate::catalog::Report;
use crate::error::FieldError;
use crate::units::{self, QuantityKind as Q};

use super::super::common::{self, MAX_PRESSURE_PA};
use super::model::{Given, Inputs, Nozzle, Refusal};
use super::GIVEN_OPTIONS;

/// The field errors of a refusal, with pressures in the report's units.
pub fn refusal(refusal: Refusal, report: &Report<'_>) -> Vec<FieldError> {
    match refusal {
        Refusal::Fields(errors) => errors.into(),
        Refusal::FlowNeedsTooMuchPressure { needed } => vec![FieldError::inconsistent(
            "q",
            format!(
                "this flow needs {} at the flange, above the {} this page covers: check the flow and the \
                        nozzle diameter",
                report.fmt(needed, Q::Pressure),
                report.fmt(MAX_PRESSURE_PA, Q::Pressure)
            ),
        )],
    }
}

/// Writes the whole report of a solved nozzle.
pub fn write(inputs: &Inputs, nozzle: &Nozzle, report: &mut Report<'_>) {
    let balance = &nozzle.balance;
    let (inlet, jet) = (&balance.ports[nozzle.flange_port], &balance.ports[nozzle.jet_port]);
    let rho = inputs.fluid.density;

    report.output("end_force_bore", nozzle.end_force);
    if let Some(g) = inputs.d_gasket {
        report.output("end_force_gasket", inlet.pressure * common::circle_area(g.value));
    }
    report.output("jet_reaction", nozzle.jet_reaction);
    report.output("flow", jet.volume_flow);
    report.output("p_in", inlet.pressure);
    report.output("v_jet", jet.speed);
    report.output("v_pipe", inlet.speed);
    report.output("mass_flow", jet.mass_flow);
    report.output("cv", nozzle.cv);
    report.output("k_nozzle", nozzle.k);
    if let Some(s) = balance.streams.first() {
        report.output("head_loss", s.head_loss);
    }
    report.output("jet_diameter", nozzle.d_jet);
    report.output("jet_power", 0.5 * jet.mass_flow * jet.speed * jet.speed);
    report.output("pressure_force", inlet.pressure * nozzle.a_pipe);
    report.output("density", rho);

    // Checks by independent paths (see the module doc).
    let (flow, cv) = (nozzle.flow, nozzle.cv);
    let (beta1, alpha1) = (inputs.profile_in.beta.value, inputs.profile_in.alpha.value);
    let (v_jet_closed, v_pipe_closed) = (flow / nozzle.a_jet, flow / nozzle.a_pipe);
    let p_closed = 0.5 * rho * (v_jet_closed * v_jet_closed / (cv * cv) - alpha1 * v_pipe_closed * v_pipe_closed);
    // Scaled by the terms that cancel to the end force (and in p₁, to the pressure):
    // a nozzle nearly as wide as the bore leaves their rounding, not a zero.
    let momentum_terms = rho * flow.abs() * (v_jet_closed.abs() + beta1.abs() * v_pipe_closed.abs());
    report.check(
        "End force on the bore",
        "the closed form p₁A₁ − ρQ(V_j − β₁V₁) with p₁ = ρ(V_j²/C_v² − α₁V₁²)/2, in plain arithmetic",
        Q::Force,
        nozzle.end_force,
        p_closed * nozzle.a_pipe - rho * flow * (v_jet_closed - beta1 * v_pipe_closed),
        1e-9,
        p_closed.abs() * nozzle.a_pipe + momentum_terms,
    );
    report.check(
        "Jet reaction ṁV_j",
        "the energy form 2·C_v²·A_j·(p₁ + α₁ρV₁²/2) with the balance's p₁",
        Q::Force,
        nozzle.jet_reaction,
        2.0 * cv * cv * nozzle.a_jet * (inlet.pressure + 0.5 * alpha1 * rho * inlet.speed * inlet.speed),
        1e-9,
        0.0,
    );
    if let Given::Pressure(p) = inputs.given {
        report.check(
            "Gauge pressure at the flange",
            "the pressure given (the flow was found from it in closed form; the balance recomputes the \
                    pressure from that flow)",
            Q::Pressure,
            inlet.pressure,
            p.value,
            1e-9,
            // The velocity heads that cancel to p₁ (they dwarf it when the nozzle is
            // nearly as wide as the bore).
            0.5 * rho * (v_jet_closed * v_jet_closed / (cv * cv) + alpha1.abs() * v_pipe_closed * v_pipe_closed),
        );
    }
    common::forward_warnings(balance, report);
    common::pipe_velocity_warning(report, "d", "flange", inlet.speed);
    if nozzle.end_force < 0.0 {
        report.warn(
            Some("d_nozzle"),
            "the momentum of the jet exceeds the pressure force on the bore: the nozzle is pushed onto the \
                    pipe while it flows; shut or blocked, the pressure alone pulls it off",
        );
    }
    if flow == 0.0 {
        report.warn(
            None,
            "no flow: there is no jet, and with the nozzle open to the air no pressure acts on it",
        );
    }

    let system = report.system();
    report.table(|report| basis_table(inputs, nozzle, report));
    report.table(|_| common::ledger_table(balance, system));
    report.table(|_| common::ports_table(balance, system));
    if let Some(bolting) = &inputs.bolts {
        let gasket = inputs.d_gasket.map(|g| g.value);
        super::bolts::write(bolting, inlet.pressure, nozzle.a_pipe, gasket, report);
    }
    report.diagram(|report| super::diagram::diagram(inputs, nozzle, report));
    let carry = common::thrust_carry_over(
        report,
        "Size a thrust block for the jet reaction on the line",
        nozzle.jet_reaction,
        0.0,
    );
    report.solution.carry_over.push(carry);
}

fn basis_table(inputs: &Inputs, nozzle: &Nozzle, report: &Report<'_>) -> crate::catalog::Table {
    let given = match inputs.given {
        Given::Pressure(_) => "p",
        Given::Flow(_) => "q",
    };
    common::basis_table(vec![
        (
            "Given",
            GIVEN_OPTIONS
                .iter()
                .find(|o| o.key == given)
                .map(|o| o.label)
                .unwrap_or(given)
                .to_string(),
        ),
        (
            "Nozzle coefficients",
            format!(
                "C_d = {}, C_c = {}, C_v = {}",
                units::format_significant(inputs.cd.value, 4),
                units::format_significant(inputs.cc.value, 4),
                units::format_significant(nozzle.cv, 4)
            ),
        ),
        (
            "End force on the bore",
            "T = p₁A₁ − ṁ(V_j − β₁V₁), + when the nozzle pulls off; not the bolt load".to_string(),
        ),
        ("Velocity profile at the flange", inputs.profile_in.describe()),
        ("Velocity profile of the jet", "uniform (β = α = 1)".to_string()),
        (
            "End force at the gasket",
            match inputs.d_gasket {
                Some(g) => format!(
                    "H = (π/4)·G²·p₁ with G = {}, no credit for the flow; the bolts carry H plus the gasket \
                            load (ASME BPVC VIII-1 Appendix 2)",
                    report.fmt(g.value, Q::Length)
                ),
                None => "not shown: give the gasket reaction diameter G".to_string(),
            },
        ),
        (
            "Jet reaction",
            "ṁ·V_j on the line as a whole, pointing upstream".to_string(),
        ),
        ("Pressure area", "pipe bore at the flange (inside diameter)".to_string()),
    ])
}
