//! The thrust-restraint page's report, built from the model's typed result:
//! outputs, the checks of the static thrust against the guides' closed forms,
//! warnings, the pressure, ledger and soil tables, and the diagram.

use crate::catalog::{Report, Table};
use crate::engine::EngineWarning;
use crate::restraint::pressure::PressureBasis;
use crate::restraint::soil::{self, Bearing, SoilTable, SOILS};
use crate::restraint::{self, Plane, StaticFitting};
use crate::units::{self, QuantityKind as Q, UnitSystem};
use crate::vector::Vec3;

use super::super::common;
use super::model::{BlockResult, Inputs, MdpFrom, Pressures, Sliding, Solved, Subject};

/// Writes the whole report of a solved page.
pub fn write(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let plane = inputs.plane;
    let thrust = solved.thrust.norm();
    let given_force = matches!(inputs.subject, Subject::Given { .. });
    if let Some(f) = &solved.fitting {
        pressure_outputs(report, &f.pressures);
        static_checks(report, &f.fit, f.pressures.design, solved.thrust);
        report.output("area_d", f.area_d);
        report.output("thrust_area", f.fit.area);
    }
    report.output("thrust", thrust);
    if thrust > 0.0 && !given_force {
        report.output("thrust_angle", solved.thrust.y.atan2(solved.thrust.x));
    }
    report.output("thrust_h", solved.t_h);
    report.output("thrust_v", solved.t_v);
    if let Some(f) = &solved.fitting {
        report.output("p_design", f.pressures.design);
        for w in &f.balance.warnings {
            if !matches!(w, EngineWarning::MomentumNegligible { .. }) {
                report.warn(Some("p"), w.to_string());
            }
        }
    }
    if thrust == 0.0 {
        report.warn(Some("p"), "with zero pressure there is no thrust to restrain");
    }
    if given_force && plane == Plane::Sag {
        report.warn(
            None,
            "the block is sized as a sag block: its bearing face lies below the pipe and takes the thrust \
                downward. A horizontal bend's thrust is horizontal (the fluid's weight is carried by the bedding); \
                choose the horizontal plane unless the fitting really turns upward in a vertical plane",
        );
    }
    block_report(inputs, solved, report);
    if let Some(f) = &solved.fitting {
        pressure_table(report, &f.pressures);
        let system = report.system();
        report.table(|_| common::ledger_table(&f.balance, system));
    }
    let angle = match &inputs.subject {
        Subject::Fitting(f) => f.angle.value,
        Subject::Given { .. } => std::f64::consts::FRAC_PI_4,
    };
    let fitting = match &inputs.subject {
        Subject::Fitting(f) => f.kind.key(),
        Subject::Given { .. } => "force",
    };
    report.diagram(|report| {
        super::diagram::diagram(
            fitting,
            plane,
            inputs.main_od.unwrap_or(0.3),
            solved.fitting.as_ref().and_then(|f| f.od2),
            (solved.inlet_angle, angle),
            inputs.block.submerged,
            solved.thrust,
            &solved.block.shape(),
            report,
        )
    });
}

fn pressure_outputs(report: &mut Report<'_>, pr: &Pressures) {
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
    if let Some(e) = &pr.elevation {
        report.output("p_test_point", pr.at_test_point);
        report.output("dp_elevation", e.head);
        report.check(
            "Design pressure at the fitting",
            "energy balance of the still line from the test point to the fitting (engine)",
            Q::Pressure,
            pr.design,
            e.by_energy_balance,
            1e-9,
            pr.at_test_point.abs().max(e.head.abs()).max(e.hydrostatic_terms),
        );
    }
    if pr.basis == PressureBasis::Operating {
        report.warn(
            Some("p_basis"),
            "designing on the operating pressure alone: the field test and any surge will load the block \
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
}

fn block_report(inputs: &Inputs, solved: &Solved, report: &mut Report<'_>) {
    let plane = inputs.plane;
    let thrust = solved.thrust.norm();
    let t_v = solved.t_v;
    let sf = inputs.sf.value;
    match &solved.block {
        BlockResult::Bearing {
            sigma,
            load,
            area,
            h,
            w,
            side,
            ..
        } => {
            report.output("sigma", *sigma);
            report.output("bearing_area", *area);
            report.output("face_h", *h);
            report.output("face_w", *w);
            if let (Plane::Horizontal, Some(od)) = (plane, inputs.main_od) {
                if *h < od {
                    let text = report.fmt(od, Q::Length);
                    report.warn(
                        Some("block_h"),
                        format!(
                            "the bearing face is lower than the pipe's outside diameter ({text}): make it at least as \
                            tall as the pipe, centred on the thrust line"
                        ),
                    );
                }
            }
            if plane == Plane::Horizontal && t_v.abs() > 1e-9 * thrust.max(1.0) {
                report.warn(
                    Some("plane"),
                    "the given thrust has a vertical component; only the horizontal part is carried by the bearing \
                        face",
                );
            }
            if let Some((side_area, sliding)) = side {
                report.output("side_bearing_area", *side_area);
                let remedy = format!(
                    "bear a side face of {} against undisturbed soil",
                    report.fmt(*side_area, Q::Area)
                );
                sliding_check(report, sliding, "μ·T_down/T_h (block weight neglected)", remedy);
            }
            soil_comparison(report, *load, sf, &inputs.block.soil_key);
        }
        BlockResult::Gravity {
            gravity, side, sliding, ..
        } => {
            if t_v <= 0.0 {
                report.warn(
                    Some("plane"),
                    "the thrust has no upward component: a gravity block is not what holds it; choose a horizontal \
                        or sag block",
                );
            }
            report.output("block_weight", gravity.weight);
            report.output("block_volume", gravity.volume);
            report.output("block_mass", gravity.mass);
            report.output("block_side", *side);
            if let Some(sliding) = sliding {
                sliding_check(
                    report,
                    sliding,
                    "μ·(W − T_up)/T_h",
                    "enlarge the block or bear its side against undisturbed soil".to_string(),
                );
            }
            if inputs.block.submerged {
                report.warn(
                    Some("submerged"),
                    "below groundwater the block's effective weight uses γ_c − γ_w; check the highest groundwater \
                        level, not today's",
                );
            }
        }
    }
}

/// Checks of the engine's static thrust against the closed forms of the
/// thrust-restraint guides, computed from the areas and the angle alone: the
/// resultant (2pA·sin(θ/2), pA, pA_branch, p(A₁ − A₂)) and, for a vertical bend, the
/// vertical part (pA·sin θ with one leg level, 2pA·sin(θ/2) with both legs sloped).
///
/// The engine's thrust is the sum of the pressure forces on the ends, which cancel to
/// it (a reducer's two ends nearly alike leave little of p·A₁): the check's scale is
/// those forces, so their rounding is not taken for a disagreement.
fn static_checks(report: &mut Report<'_>, fit: &StaticFitting, p: f64, thrust: Vec3) {
    let (closed, formula) = restraint::closed_form_thrust(fit, p);
    report.check(
        "Thrust on the restraint",
        formula,
        Q::Force,
        thrust.norm(),
        closed,
        1e-9,
        fit.end_forces(p),
    );
    if let Some((closed_v, formula_v)) = restraint::closed_form_vertical(fit, p) {
        report.check(
            "Vertical thrust",
            formula_v,
            Q::Force,
            thrust.y,
            closed_v,
            1e-9,
            thrust.norm(),
        );
    }
}

/// Sliding of a block on its base: friction `μ·normal` against `SF_slide·T_h`.
/// Without a friction coefficient the check cannot be made: that is a warning in
/// the headline area, never silence.
fn sliding_check(report: &mut Report<'_>, sliding: &Sliding, formula: &str, remedy: String) {
    match (&sliding.friction, sliding.factor()) {
        (Some((mu, _)), Some(factor)) => {
            report.output("friction", *mu);
            report.output("sliding_sf", factor);
            if factor < sliding.required {
                report.warn(
                    Some("friction"),
                    format!(
                        "sliding: {formula} = {} is below the required {}; {remedy}",
                        units::format_significant(factor, 3),
                        units::format_significant(sliding.required, 3)
                    ),
                );
            }
        }
        _ => report.warn(
            None,
            format!(
                "sliding is NOT checked: the thrust has a horizontal part of {} and the chosen soil gives no friction \
                coefficient; type one (concrete on soil) to check it, or {remedy}",
                report.fmt(sliding.t_h, Q::Force)
            ),
        ),
    }
}

fn pressure_table(report: &mut Report<'_>, pr: &Pressures) {
    let unit = units::display_unit(pr.design.max(pr.work).max(1.0), Q::Pressure, report.system()).id;
    let cell = |v: f64| {
        units::convert_to(v, Q::Pressure, unit)
            .map(|x| units::format_significant(x, 4))
            .unwrap_or_default()
    };
    let mut table = Table {
        key: "pressures",
        title: "Design pressure: the candidates and the one used".to_string(),
        columns: vec![
            "Basis".into(),
            format!("gauge pressure ({unit})"),
            "How it was found".into(),
        ],
        rows: vec![vec!["Operating (working)".into(), cell(pr.work), "typed".into()]],
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    if let Some((m, from)) = &pr.mdp {
        let how = match from {
            MdpFrom::Typed => "typed".to_string(),
            // EN 805's smallest allowance, quoted from memory of the standard.
            MdpFrom::Allowance(a) => format!(
                "working + {} surge allowance (surge not calculated; EN 805's smallest allowance)",
                report.fmt(*a, Q::Pressure)
            ),
        };
        table
            .rows
            .push(vec!["MDP (EN 805, surge included)".into(), cell(*m), how]);
    }
    if let Some((pt, src)) = &pr.test {
        table.rows.push(vec!["Field test".into(), cell(*pt), src.clone()]);
    }
    if let Some(s) = &pr.surge {
        let a = report.fmt(s.wave_speed, Q::Velocity);
        let dv = report.fmt(s.dv, Q::Velocity);
        table.rows.push(vec![
            "Working + Joukowsky surge".into(),
            cell(pr.work + s.dp),
            format!("Δp = ρ·a·ΔV with a = {a}, ΔV = {dv}; {}", s.source),
        ]);
    }
    if let Some(e) = &pr.elevation {
        table.rows.push(vec![
            format!("At the test point ({})", pr.basis.key()),
            cell(pr.at_test_point),
            "the basis applied to the pressures above, which are those at the test point".into(),
        ]);
        let z = |v: f64| report.fmt(v, Q::Length);
        table.rows.push(vec![
            "Static head to the fitting".into(),
            cell(e.head),
            format!(
                "ρ·g·(z_test − z_fitting) with z_test = {}, z_fitting = {}: {}",
                z(e.z_test),
                z(e.z_fitting),
                if e.head >= 0.0 {
                    "the fitting is lower and sees more"
                } else {
                    "the fitting is higher and sees less"
                }
            ),
        ]);
    }
    table.rows.push(vec![
        match pr.elevation {
            Some(_) => format!("Used at the fitting ({} + static head)", pr.basis.key()),
            None => format!("Used ({})", pr.basis.key()),
        },
        cell(pr.design),
        "the design pressure of the thrust below".into(),
    ]);
    table.emphasised_rows.push(table.rows.len() - 1);
    report.table(|_| table);
}

/// The soil classes and the published tables side by side: every table row beside
/// the class it falls in, the bearing area it would need for this load, and which
/// row gives the class its value.
fn soil_comparison(report: &mut Report<'_>, load: f64, sf: f64, used: &str) {
    let system = report.system();
    let p_unit = match system {
        UnitSystem::Si => "kPa",
        UnitSystem::UsCustomary => "psf",
    };
    let a_unit = units::display_unit(sf * load / 50e3, Q::Area, system).id;
    let fmt = |v: f64, kind: Q, unit: &str| {
        units::convert_to(v, kind, unit)
            .map(|x| units::format_significant(x, 3))
            .unwrap_or_default()
    };
    let used = soil::soil(used).map(|s| s.key);
    let mut table = Table {
        key: "soils",
        title: format!(
            "Soil classes and the published tables: bearing area for this load at SF {}",
            units::format_significant(sf, 3)
        ),
        columns: vec![
            "Soil class".into(),
            "Table".into(),
            "Published row".into(),
            format!("allowable bearing ({p_unit})"),
            format!("bearing area ({a_unit})"),
            "Class value".into(),
        ],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for class in SOILS {
        for row in class.rows {
            let (bearing, area) = match row.bearing {
                Bearing::Value(v) => (fmt(v, Q::Pressure, p_unit), fmt(sf * load / v, Q::Area, a_unit)),
                // The row's name says why there is no number.
                Bearing::Below(_) => (String::new(), String::new()),
                Bearing::None => ("0".into(), String::new()),
            };
            let gives_value = row.table == class.table
                && match row.bearing {
                    Bearing::Value(v) => v == class.bearing,
                    _ => class.bearing == 0.0,
                };
            if gives_value && used == Some(class.key) {
                table.emphasised_rows.push(table.rows.len());
            }
            let name = match row.bearing {
                Bearing::Below(v) => format!("{} (under {})", row.name, report.fmt(v, Q::SoilBearing)),
                Bearing::None => format!("{} (no bearing)", row.name),
                Bearing::Value(_) => row.name.to_string(),
            };
            table.rows.push(vec![
                format!("{} ({})", class.soil, class.examples),
                row.table.short().into(),
                name,
                bearing,
                area,
                if gives_value {
                    "yes (lowest)".into()
                } else {
                    String::new()
                },
            ]);
        }
    }
    report.table(|_| table);
    let mut sources = Table {
        key: "soil_sources",
        title: "The soil tables: sources and safety-factor conventions".to_string(),
        columns: vec!["Table".into(), "Source".into(), "Convention".into()],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for t in SoilTable::ALL {
        sources.rows.push(vec![
            t.short().into(),
            t.citation().replace('*', ""),
            t.convention().into(),
        ]);
    }
    sources.rows.push(vec![
        "Soil classes".into(),
        "This handbook's grouping of the tables' rows; each class takes the lowest value of its rows".into(),
        "as the table it comes from; a typed value from a geotechnical basis always wins".into(),
    ]);
    report.table(|_| sources);
}
