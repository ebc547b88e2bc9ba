//! The line schedule's report, built from the solved rows: outputs, the sliding
//! notice, the check of the summed thrust against the rows' closed forms, the
//! schedule table, the thrust plot, the governing row's diagram and its link to the
//! thrust-restraint page.

use std::f64::consts::PI;

use crate::catalog::{CarryOver, Plot, Report, Series, Table};
use crate::pipe_sizes;
use crate::restraint::block::Block;
use crate::restraint::pressure::{Governing, PressureBasis};
use crate::restraint::{FittingKind, Legs, Plane};
use crate::units::{self, QuantityKind as Q};
use crate::vector::Vec3;

use super::model::{design_of, surge_used, DesignFrom, Inputs, SoilUsed, SolvedRow};
use super::rows::{Row, RowKind};

/// Writes the report of a solved schedule.
pub fn write(inputs: &Inputs, solved: &[SolvedRow], report: &mut Report<'_>) {
    if inputs.computed_surge.is_none() {
        let typed_surge = inputs.surge.map(|s| s.value);
        report.output("p_design", design_of(inputs, inputs.work.value, typed_surge).0);
    }
    elevation_and_surge_notes(inputs, solved, report);
    // --- Outputs and the table ------------------------------------------------------
    let system = report.system();
    let max = solved.iter().map(|s| s.thrust.norm()).fold(0.0, f64::max);
    let total: f64 = solved.iter().map(|s| s.thrust.norm()).sum();
    let mut total_area = 0.0;
    let mut total_volume = 0.0;
    for s in solved {
        match s.block {
            Block::Bearing { h, w } => total_area += h * w,
            Block::Gravity { volume, .. } => total_volume += volume,
        }
    }
    report.output("max_thrust", max);
    // Each total only when the schedule has blocks of that kind.
    if solved.iter().any(|s| matches!(s.block, Block::Bearing { .. })) {
        report.output("total_area", total_area);
    }
    if solved.iter().any(|s| matches!(s.block, Block::Gravity { .. })) {
        report.output("total_volume", total_volume);
    }
    report.output("row_count", solved.len() as f64);
    report.output("total_thrust", total);
    // Vertical blocks with a horizontal thrust can slide; this list does not check
    // that, so it says so rather than stay silent.
    let sliding: Vec<String> = solved
        .iter()
        .filter(|s| s.plane != Plane::Horizontal && s.thrust.x.abs() > 1e-9 * s.thrust.norm().max(1.0))
        .map(|s| s.row.line.to_string())
        .collect();
    if !sliding.is_empty() {
        let shown = sliding.iter().take(12).cloned().collect::<Vec<_>>().join(", ");
        let more = if sliding.len() > 12 { ", …" } else { "" };
        report.warn(
            None,
            format!(
                "sliding is NOT checked here for the vertical blocks with a horizontal thrust (rows {shown}{more}): \
                open each on the thrust-restraint page, which checks it"
            ),
        );
    }
    report.check(
        "Sum of the rows' thrusts",
        "each row's closed form (2pA·sin(θ/2), pA, pA_branch, p(A₁ − A₂), or the typed force), summed",
        Q::Force,
        total,
        solved.iter().map(|s| s.closed_form).sum(),
        1e-9,
        solved.iter().map(|s| s.end_forces).sum(),
    );

    let f_unit = units::display_unit(max.max(1.0), Q::Force, system).id;
    let p_unit = units::display_unit(solved.iter().map(|s| s.p).fold(1.0, f64::max), Q::Pressure, system).id;
    let (d_unit, z_unit) = match system {
        units::UnitSystem::Si => ("mm", "m"),
        units::UnitSystem::UsCustomary => ("in", "ft"),
    };
    // The table's text is built only for a full solve (a headline solve skips it).
    report.table(|report| {
        let cell = |v: f64, kind: Q, unit: &str| {
            units::convert_to(v, kind, unit)
                .map(|x| units::format_significant(x, 4))
                .unwrap_or_default()
        };
        let mut table = Table {
            key: "schedule",
            title: "Thrust and block of every fitting".to_string(),
            columns: vec![
                "Row".into(),
                "Tag".into(),
                "Kind".into(),
                format!("thrust diameter ({d_unit}), basis"),
                "Angle (deg)".into(),
                "Pressure basis".into(),
                format!("elevation ({z_unit})"),
                format!("surge allowance ({p_unit})"),
                format!("pressure used ({p_unit})"),
                format!("thrust ({f_unit})"),
                "Direction".into(),
                "Block".into(),
                "Soil".into(),
                "Restrained length per side".into(),
            ],
            rows: Vec::with_capacity(solved.len() + 1),
            emphasised_rows: Vec::new(),
            // The tag is the user's own text.
            typed_columns: vec![1],
        };
        for s in solved {
            let kind = s.row.kind.key();
            let (block_text, soil_text) = block_and_soil_text(s, inputs, report);
            table.rows.push(vec![
                s.row.line.to_string(),
                s.row.tag.clone(),
                kind.to_string(),
                if s.area_d > 0.0 {
                    format!(
                        "{} {}",
                        cell(s.area_d, Q::Length, d_unit),
                        if s.on_od { "OD" } else { "ID" }
                    )
                } else {
                    String::new()
                },
                s.row
                    .angle
                    .map(|a| units::format_significant(a.to_degrees(), 4))
                    .unwrap_or_default(),
                basis_text(&s.from, inputs.basis),
                s.row.z.map(|z| cell(z, Q::Length, z_unit)).unwrap_or_default(),
                surge_text(s, inputs, |v| cell(v, Q::Pressure, p_unit), report),
                cell(s.p, Q::Pressure, p_unit),
                cell(s.thrust.norm(), Q::Force, f_unit),
                direction_text(&s.row, s.plane, s.thrust),
                block_text,
                soil_text,
                super::super::restrained_length::schedule::cell(
                    &s.row,
                    s.p,
                    s.plane,
                    s.joint,
                    inputs.sf.value,
                    &inputs.restrained,
                    report,
                ),
            ]);
        }
        table.rows.push(vec![
            "Total".into(),
            String::new(),
            format!("{} fittings", solved.len()),
            String::new(),
            String::new(),
            String::new(),
            String::new(),
            String::new(),
            String::new(),
            cell(total, Q::Force, f_unit),
            "sum of magnitudes".into(),
            format!(
                "{} bearing, {} gravity",
                report.fmt(total_area, Q::Area),
                report.fmt(total_volume, Q::Volume)
            ),
            String::new(),
            String::new(),
        ]);
        table.emphasised_rows.push(table.rows.len() - 1);
        table
    });

    // Thrust by row, and the governing block drawn.
    let f_scale = units::convert_to(1.0, Q::Force, f_unit).unwrap_or(1.0);
    report.plot(|_| Plot {
        key: "thrust_by_row",
        title: "Thrust of each fitting".to_string(),
        x_label: "row".to_string(),
        y_label: format!("thrust ({f_unit})"),
        series: vec![Series {
            name: "thrust".into(),
            points: solved
                .iter()
                .map(|s| [s.row.line as f64, s.thrust.norm() * f_scale])
                .collect(),
        }],
        markers: Vec::new(),
    });
    if let Some(g) = solved.iter().max_by(|a, b| a.thrust.norm().total_cmp(&b.thrust.norm())) {
        let fitting = g.row.kind.key();
        report.diagram(|report| {
            let mut d = super::super::thrust_block::diagram(
                fitting,
                g.plane,
                g.od,
                g.od2,
                (0.0, g.row.angle.unwrap_or(PI / 4.0)),
                false,
                g.thrust,
                &g.block,
                report,
            );
            d.title = format!("Largest thrust, row {}: {}", g.row.line, d.title);
            d
        });
        report.solution.carry_over.push(CarryOver {
            calculator: super::super::thrust_block::KEY,
            label: format!("Open row {} (largest thrust) on the thrust-restraint page", g.row.line),
            inputs: carry_inputs(g, inputs),
        });
    }
}

/// The surge cell of a row: the computed allowance with its wave speed and method,
/// the page's typed allowance, or nothing.
fn surge_text(s: &SolvedRow, inputs: &Inputs, pressure: impl Fn(f64) -> String, report: &Report<'_>) -> String {
    if matches!(s.from, DesignFrom::RowPressure) || matches!(s.row.kind, RowKind::Force) {
        return String::new();
    }
    if !surge_used(inputs) {
        return String::new();
    }
    match (s.surge, inputs.surge) {
        (Some(r), _) => format!(
            "{} ({}, a = {})",
            pressure(r.dp),
            if r.slow { "slow closure" } else { "Joukowsky" },
            report.fmt(r.wave_speed, Q::Velocity)
        ),
        (None, Some(typed)) => format!("{} (typed)", pressure(typed.value)),
        (None, None) => String::new(),
    }
}

/// The elevation check, and the notices on rows the elevation or the surge leaves out.
fn elevation_and_surge_notes(inputs: &Inputs, solved: &[SolvedRow], report: &mut Report<'_>) {
    let corrected: Vec<&SolvedRow> = solved.iter().filter(|s| s.p_by_energy_balance.is_some()).collect();
    if !corrected.is_empty() {
        let by_head: f64 = corrected.iter().map(|s| s.p).sum();
        let by_engine: f64 = corrected.iter().filter_map(|s| s.p_by_energy_balance).sum();
        report.check(
            "Sum of the pressures used at rows with an elevation",
            "each row's pressure by the energy balance of the still line from the test point (engine), summed",
            Q::Pressure,
            by_head,
            by_engine,
            1e-9,
            corrected
                .iter()
                .map(|s| s.p.abs() + s.head.abs() + s.hydrostatic_terms)
                .sum(),
        );
    }
    if inputs.z_test.is_some() {
        let missing: Vec<String> = solved
            .iter()
            .filter(|s| s.row.z.is_none() && s.row.p.is_none() && !matches!(s.row.kind, RowKind::Force))
            .map(|s| s.row.line.to_string())
            .collect();
        if !missing.is_empty() {
            let shown = missing.iter().take(12).cloned().collect::<Vec<_>>().join(", ");
            let more = if missing.len() > 12 { ", …" } else { "" };
            report.warn(
                Some("rows"),
                format!(
                    "rows {shown}{more} give no elevation z=: they are sized at the test point's pressure, which \
                    is low for a fitting below it"
                ),
            );
        }
    }
}

/// The pressure-basis cell of a row.
fn basis_text(from: &DesignFrom, basis: PressureBasis) -> String {
    match from {
        DesignFrom::RowPressure => "row p=".to_string(),
        DesignFrom::Basis {
            governing,
            rule,
            row_working,
        } => {
            let what = match (governing, rule) {
                (Governing::Test, Some(key)) => format!("test ({key})"),
                (Governing::Test, None) => "typed test".to_string(),
                (other, _) => other.text().to_string(),
            };
            let what = match basis {
                PressureBasis::Highest => format!("highest: {what}"),
                _ => what,
            };
            if *row_working {
                format!("{what}, row pw=")
            } else {
                what
            }
        }
    }
}

/// The block and soil cells of a row.
fn block_and_soil_text(s: &SolvedRow, inputs: &Inputs, report: &Report<'_>) -> (String, String) {
    let soil = match s.soil {
        SoilUsed::Typed(sigma) => format!("typed {}", report.fmt(sigma, Q::Pressure)),
        SoilUsed::Preset(p) => format!("{} ({})", p.soil, p.table.short()),
        SoilUsed::NotUsed => "not used (gravity block)".to_string(),
    };
    let block = match s.block {
        Block::Bearing { h, w } => format!(
            "bearing {}: {} high × {} wide",
            report.fmt(s.bearing_area, Q::Area),
            report.fmt(h, Q::Length),
            report.fmt(w, Q::Length)
        ),
        Block::Gravity { volume, side, .. } => format!(
            "gravity {} ({} of concrete), cube {}",
            report.fmt(volume, Q::Volume),
            report.fmt(s.block_mass, Q::Mass),
            report.fmt(side, Q::Length)
        ),
    };
    let _ = inputs;
    (block, soil)
}

/// The thrust-restraint page's inputs for one solved row: the fitting, its sizes and
/// the row's design pressure as the operating pressure (so the page shows the same
/// thrust), the soil and the face height.
fn carry_inputs(s: &SolvedRow, inputs: &Inputs) -> Vec<(&'static str, String)> {
    let num = |x: f64| units::format_significant(x, 7);
    let r = &s.row;
    let mut v: Vec<(&'static str, String)> = Vec::new();
    v.push(("fitting", r.kind.key().to_string()));
    if let Some(t) = r.thrust {
        v.push(("thrust", format!("{}N", num(t))));
    }
    if let Some(a) = r.angle {
        v.push(("angle", format!("{}deg", num(a.to_degrees()))));
    }
    v.push(("plane", s.plane.key().to_string()));
    if s.plane != Plane::Horizontal {
        let legs = if r.symmetric { Legs::Symmetric } else { Legs::OneLevel };
        v.push(("legs", legs.key().to_string()));
    }
    v.push(("size", r.size.clone().unwrap_or_else(|| pipe_sizes::CUSTOM.to_string())));
    for (key, d) in [("d", r.d), ("od", r.od), ("d2", r.d2), ("od2", r.od2)] {
        if let Some(d) = d {
            v.push((key, format!("{}m", num(d))));
        }
    }
    if r.size2.is_some() || r.d2.is_some() {
        v.push((
            "size2",
            r.size2.clone().unwrap_or_else(|| pipe_sizes::CUSTOM.to_string()),
        ));
    }
    v.push(("joint", s.joint.key().to_string()));
    v.push(("p_basis", "operating".to_string()));
    v.push(("p", format!("{}Pa", num(s.p))));
    match (r.sigma, r.soil.as_deref()) {
        (Some(sigma), _) => {
            v.push(("soil", "custom".to_string()));
            v.push(("sigma", format!("{}Pa", num(sigma))));
        }
        (None, Some(key)) => v.push(("soil", key.to_string())),
        (None, None) => {
            v.push(("soil", inputs.default_soil.clone()));
            if let Some(sigma) = inputs.default_sigma {
                v.push(("sigma", format!("{}Pa", num(sigma.value))));
            }
        }
    }
    v.push(("sf", num(inputs.sf.value)));
    v.push(("block_dims", "height".to_string()));
    if let Block::Bearing { h, .. } = s.block {
        v.push(("block_h", format!("{}m", num(h))));
    }
    if s.plane == Plane::Crest {
        v.push(("gamma_c", format!("{}N/m3", num(inputs.gamma_c))));
        v.push(("submerged", "no".to_string()));
    }
    v.push(("fluid", "water".to_string()));
    v.push(("t", "15degC".to_string()));
    v
}

fn direction_text(row: &Row, plane: Plane, t: Vec3) -> String {
    if t.norm() == 0.0 {
        return "none (no thrust)".to_string();
    }
    match plane {
        Plane::Horizontal => {
            let a = t.y.atan2(t.x).to_degrees();
            let side = if a.abs() < 0.05 || (a.abs() - 180.0).abs() < 0.05 {
                "along the axis".to_string()
            } else if a > 0.0 {
                "to the left".to_string()
            } else {
                "to the right".to_string()
            };
            let what = match row.kind {
                RowKind::Fitting(FittingKind::Bend) => "outward on the bisector, ",
                RowKind::Fitting(FittingKind::Tee) => "away from the branch, ",
                RowKind::Fitting(FittingKind::DeadEnd) => "toward the cap, ",
                RowKind::Fitting(FittingKind::Reducer) => "toward the small end, ",
                RowKind::Force => "",
            };
            format!("{what}{:.1}° from the inlet flow, {side}", a.abs())
        }
        Plane::Crest => format!("up and out, {:.1}° above horizontal", t.y.atan2(t.x.abs()).to_degrees()),
        Plane::Sag => format!(
            "down and out, {:.1}° below horizontal",
            (-t.y).atan2(t.x.abs()).to_degrees()
        ),
    }
}
