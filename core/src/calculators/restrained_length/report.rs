//! The restrained-joint page's report: the lengths, the check of the mobilised
//! resistance against the engine's thrust, the ledger of the per-metre terms of
//! both methods, the methods compared and the diagram (the design pressure's
//! candidates are listed outputs; the thrust-restraint page tabulates them).

use crate::catalog::{Report, Table};
use crate::restraint::pressure::PressureBasis;
use crate::restraint::restrained::{Encasement, Method, UnitResistance, SOIL_CLASS_SOURCE};
use crate::restraint::{FittingKind, Plane};
use crate::units::{self, QuantityKind as Q, UnitSystem};

/// Where the PVC column comes from: said plainly, as it is not a published table.
const PVC_RATIOS_SOURCE: &str =
    "DIPRA's equations with this handbook's reduced wall ratios (0.8 × fφ, ⅔ × fc); AWWA M23's table not checked";

use super::model::{Inputs, MethodResult, Solved};

/// Longest restrained length that is still a practical alternative to a block, m
/// (about ten 6 m pipe lengths; common practice, no source).
const PRACTICAL_LENGTH: f64 = 60.0;
/// Shallowest cover the methods are usually applied with, m (2.5 ft; common
/// practice, no source).
const SHALLOW_COVER: f64 = 0.76;

/// Writes the whole report of a solved page.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let pr = &solved.pressures;
    if let Some(s) = &pr.surge {
        report.output("wave_speed", s.wave_speed);
        report.output("dp_surge", s.dp);
        report.output("p_surge", pr.work + s.dp);
    }
    if let Some((m, _)) = &pr.mdp {
        report.output("mdp", *m);
    }
    if let Some((pt, _)) = &pr.test {
        report.output("p_test", *pt);
    }
    let g = solved.governing();
    if inputs.kind == FittingKind::Tee {
        report.output("length_branch", g.length);
        report.output("length_run", solved.run_credit);
        if let Some(alone) = g.run_alone {
            report.output("length_run_alone", alone);
        }
    } else {
        report.output("length", g.length);
    }
    report.output("thrust", solved.thrust);
    report.output("p_design", pr.design);
    report.output("length_di", solved.ductile_iron.length);
    report.output("length_pvc", solved.pvc.length);
    report.output("area_d", inputs.main.od);
    checks(report, solved, inputs.sf.value);
    warnings(inputs, solved, report);
    ledger(report, inputs, solved);
    comparison(report, inputs, solved);
    report.diagram(|report| super::diagram::diagram(inputs, solved, report));
}

/// The resistance each method's length mobilises on the thrust line against the
/// safety factor times the engine's thrust (its momentum balance of the fitting at
/// rest, an independent path from the closed form P·A·tan(Δ/2) in the length).
///
/// Relative to the end forces the engine sums, S_f·p·(A₁ + A₂), as well as the
/// result: a reducer whose ends are nearly alike leaves their rounding.
fn checks(report: &mut Report<'_>, solved: &Solved, sf: f64) {
    let end_forces = sf * solved.fit.end_forces(solved.pressures.design);
    for m in [&solved.ductile_iron, &solved.pvc] {
        let (mobilised, formula) = m.mobilised;
        report.check(
            format!("Resistance, {}", method_name(m.method)),
            format!("S_f × engine thrust vs {formula}"),
            Q::Force,
            mobilised,
            sf * solved.thrust,
            1e-9,
            end_forces,
        );
    }
}

fn method_name(m: Method) -> &'static str {
    match m {
        Method::Pvc => "PVC wall ratios",
        _ => "ductile-iron method",
    }
}

fn warnings(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let pr = &solved.pressures;
    if pr.basis == PressureBasis::Operating {
        report.warn(
            Some("p_basis"),
            "designing on the operating pressure alone: the field test and any surge load the restrained joints \
                harder",
        );
    }
    if pr.basis == PressureBasis::Highest && pr.surge.is_none() {
        report.warn(
            Some("dv"),
            "no surge estimate: the highest pressure here omits surge; give the velocity change or check \
                transients separately",
        );
    }
    let longest = solved.ductile_iron.length.max(solved.pvc.length);
    if longest > PRACTICAL_LENGTH {
        report.warn(
            None,
            format!(
                "the restrained length reaches {}, more than about ten pipe lengths: check the soil values and \
                    the cover, or consider a thrust block, or a block combined with restrained joints",
                report.fmt(longest, Q::Length)
            ),
        );
    }
    if inputs.soil.cover.value < SHALLOW_COVER {
        report.warn(
            Some("cover"),
            "shallow cover: the earth load, the passive resistance and the weight against uplift are small and \
                easily lost to later digging; the methods are usually applied with at least 0.76 m (2.5 ft) of \
                cover",
        );
    }
    if inputs.wall_density.is_none() {
        report.warn(
            Some("material"),
            "the pipe's own weight is left out (its wall material is not known from a typed size or modulus): \
                conservative, since it would add friction",
        );
    }
    if inputs.encasement == Encasement::Polyethylene {
        report.warn(
            Some("encasement"),
            "polyethylene encasement is applied to the ductile-iron method only (PVC pipe is not encased)",
        );
    }
    if inputs.kind == FittingKind::Tee && solved.run_credit == 0.0 {
        report.warn(
            Some("run_restrained"),
            "no restrained run is credited: the branch alone carries the thrust by friction (conservative)",
        );
    }
}

/// Force per metre in the report's system: kN/m or lbf/ft.
fn per_length(v: f64, system: UnitSystem) -> String {
    match system {
        UnitSystem::Si => format!("{} kN/m", units::format_significant(v / 1e3, 4)),
        // 1 lbf/ft = 4.448 221 615 260 5 N / 0.3048 m (NIST SP 811, App. B).
        UnitSystem::UsCustomary => format!(
            "{} lbf/ft",
            units::format_significant(v * 0.3048 / 4.448_221_615_260_5, 4)
        ),
    }
}

fn ledger(report: &mut Report<'_>, inputs: &Inputs, solved: &Solved) {
    let system = report.system();
    let pl = |v: f64| per_length(v, system);
    let tee = inputs.kind == FittingKind::Tee;
    let mut rows: Vec<(String, Box<dyn Fn(&MethodResult) -> String>)> = Vec::new();
    let pipe = solved.main_pipe;
    let soil = format!(
        "{}, {}, {}; K_n {}",
        report.fmt(solved.trench.gamma, Q::SpecificWeight),
        report.fmt(solved.trench.phi, Q::Angle),
        report.fmt(solved.trench.cohesion, Q::Pressure),
        units::format_significant(solved.trench.kn, 3)
    );
    rows.push(("Soil γ, φ, c; K_n".into(), Box::new(move |_| soil.clone())));
    rows.push((
        "Pipe and water W_p + W_w".into(),
        Box::new(move |_| pl(pipe.pipe_weight + pipe.water_weight)),
    ));
    rows.push((
        "Earth load W_e = γ·H·D".into(),
        Box::new(move |m: &MethodResult| pl(m.main.earth)),
    ));
    rows.push((
        "Normal load W = W_p + W_w + 2·W_e".into(),
        Box::new(move |m: &MethodResult| pl(m.main.normal)),
    ));
    rows.push((
        "Wall ratios f_φ, f_c".into(),
        Box::new(|m: &MethodResult| {
            format!(
                "{}, {}",
                units::format_significant(m.wall.f_phi, 3),
                units::format_significant(m.wall.f_c, 3)
            )
        }),
    ));
    rows.push((
        "Friction W·tan(f_φ·φ)".into(),
        Box::new(move |m: &MethodResult| pl(m.main.friction)),
    ));
    rows.push((
        "Adhesion π·D·f_c·c".into(),
        Box::new(move |m: &MethodResult| pl(m.main.adhesion)),
    ));
    rows.push((
        "Unit friction F_f".into(),
        Box::new(move |m: &MethodResult| pl(m.main.f_f)),
    ));
    let kp = units::format_significant(solved.ductile_iron.main.kp, 4);
    rows.push((
        format!("Passive R_s = K_n·D·(γ·H_c·K_p + 2c√K_p), K_p {kp}"),
        Box::new(move |m: &MethodResult| pl(m.main.r_s)),
    ));
    if tee {
        rows.push((
            "Branch: unit friction F_f".into(),
            Box::new(move |m: &MethodResult| m.branch.map(|b: UnitResistance| pl(b.f_f)).unwrap_or_default()),
        ));
    }
    let resisting = match (inputs.kind, inputs.plane) {
        (FittingKind::Bend, Plane::Crest) => "Holding each leg: W_p + W_w + W_e",
        (FittingKind::Bend, _) => "Holding each leg: F_f + ½·R_s",
        (FittingKind::Tee, _) => "Holding the branch: F_f,branch",
        _ => "Holding the pipe: F_f",
    };
    rows.push((
        resisting.into(),
        Box::new(move |m: &MethodResult| pl(m.governing_resistance)),
    ));
    let mut table = Table {
        key: "per_length",
        title: "Resistance per length of pipe, by method".to_string(),
        columns: vec!["Term".into(), "Ductile-iron method".into(), "PVC wall ratios".into()],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for (label, cell) in &rows {
        table
            .rows
            .push(vec![label.clone(), cell(&solved.ductile_iron), cell(&solved.pvc)]);
    }
    table.emphasised_rows.push(table.rows.len() - 1);
    report.table(|_| table);
}

fn comparison(report: &mut Report<'_>, inputs: &Inputs, solved: &Solved) {
    let system = report.system();
    let unit = units::display_unit(solved.ductile_iron.length.max(1.0), Q::Length, system).id;
    let cell = |v: f64| {
        units::convert_to(v, Q::Length, unit)
            .map(|x| units::format_significant(x, 4))
            .unwrap_or_default()
    };
    let what = if inputs.kind == FittingKind::Tee {
        "branch length"
    } else {
        "length on each leg"
    };
    let mut table = Table {
        key: "methods",
        title: format!("The two methods compared ({what}, {unit})"),
        columns: vec!["Method".into(), format!("{what} ({unit})"), "Source".into()],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for m in [&solved.ductile_iron, &solved.pvc] {
        if m.method == solved.headline {
            table.emphasised_rows.push(table.rows.len());
        }
        let source = match m.method {
            Method::Pvc => PVC_RATIOS_SOURCE,
            _ => "DIPRA, Thrust Restraint Design for Ductile Iron Pipe (7th ed. 2016)",
        };
        table
            .rows
            .push(vec![method_name(m.method).into(), cell(m.length), source.into()]);
    }
    let soil = match inputs.soil.class {
        Some(c) => format!("{}: {SOIL_CLASS_SOURCE}", c.label),
        None => "typed values".to_string(),
    };
    table.rows.push(vec!["Soil values".into(), String::new(), soil]);
    report.table(|_| table);
}
