//! The line schedule's "restrained length per side" column: the same restraint
//! model as the restrained-joint page ([`crate::restraint::restrained`]), with one
//! cover, soil class and laying condition for the whole line, the longer of the
//! two methods, no encasement and no run credit at tees.

use std::f64::consts::FRAC_PI_2;

use crate::catalog::{FieldSpec, Limits, Report, Values};
use crate::error::{FieldError, FieldErrors};
use crate::pipe_sizes;
use crate::restraint::pressure::Material;
use crate::restraint::restrained::{self, BendHold, Laying, PipeLoads, SoilClass, Trench};
use crate::restraint::{diameters, FittingKind, Joint, Plane};
use crate::units::{QuantityKind as Q, STANDARD_GRAVITY};

use super::super::common::{choice, quantity};
use super::super::line_schedule::{Row, RowKind};

/// Density of the water in the schedule's pipes, kg/m³ (the schedule's water at
/// 15 °C, rounded: the water weight is a small part of the normal load).
const WATER_DENSITY: f64 = 999.1;

/// The column's settings, validated.
#[derive(Clone, Debug)]
pub struct Column {
    pub cover: f64,
    pub class: &'static SoilClass,
    pub laying: Laying,
}

/// The schedule's fields of the column: cover, soil class and laying condition.
pub fn fields() -> Vec<FieldSpec> {
    vec![
        FieldSpec {
            optional: true,
            ..quantity(
                "cover",
                "Depth of cover (restrained-length column)",
                Q::Length,
                "m",
                "ft",
                "1.2 m",
                Limits::closed(0.1, 20.0),
                "Ground surface to the top of the pipe, for the restrained length per side of each fitting. \
            Empty: no restrained lengths.",
            )
        },
        FieldSpec {
            optional: true,
            ..choice(
                "soil_class",
                "Soil in the trench (restrained-length column)",
                &super::SOIL_CLASS_OPTIONS[1..],
                "silty_sand",
                "Unit weight, friction angle and cohesion for the restrained length; the restrained-joint page \
            takes typed values.",
            )
        },
        FieldSpec {
            optional: true,
            ..choice(
                "laying",
                "Laying condition (restrained-length column)",
                Laying::OPTIONS,
                "type4",
                "Sets the trench factor Kn of the soil's passive resistance.",
            )
        },
    ]
}

/// Reads the column's settings: `None` (no column values) while the cover, the
/// soil class or the laying condition is left empty.
///
/// # Errors
/// An unknown soil class or laying condition, named by its field.
pub fn read(values: &Values) -> Result<Option<Column>, FieldErrors> {
    if !(values.is_set("cover") && values.is_set("soil_class") && values.is_set("laying")) {
        return Ok(None);
    }
    let class = values.choice("soil_class")?;
    Ok(Some(Column {
        cover: values.quantity("cover")?,
        class: restrained::soil_class(class)
            .ok_or_else(|| FieldError::inconsistent("soil_class", format!("'{class}' is not a soil class")))?,
        laying: Laying::from_key(values.choice("laying")?)
            .ok_or_else(|| FieldError::inconsistent("laying", "unknown laying condition"))?,
    }))
}

/// The column's cell of a row at design pressure `p`: the longer restrained length
/// of the two methods, or why there is none.
pub fn cell(
    row: &Row,
    p: f64,
    plane: Plane,
    joint: Joint,
    sf: f64,
    column: &Option<Column>,
    report: &Report<'_>,
) -> String {
    let Some(column) = column else {
        return String::new();
    };
    let RowKind::Fitting(kind) = row.kind else {
        return "given force".into();
    };
    let angle = row.angle.unwrap_or(0.0);
    if kind == FittingKind::Bend && angle > FRAC_PI_2 * (1.0 + 1e-9) {
        return "bend over 90°".into();
    }
    let main = diameters(
        row.size.as_deref().unwrap_or(pipe_sizes::CUSTOM),
        row.d,
        row.od,
        ("size", "d", "od"),
    );
    let second = diameters(
        row.size2.as_deref().unwrap_or(pipe_sizes::CUSTOM),
        row.d2,
        row.od2,
        ("size2", "d2", "od2"),
    );
    let Ok(main) = main else { return String::new() };
    let second = matches!(kind, FittingKind::Tee | FittingKind::Reducer)
        .then_some(second.ok())
        .flatten();
    let area = |d: f64| std::f64::consts::PI * d * d / 4.0;
    let a1 = area(joint.thrust_diameter(main));
    let a2 = second.map_or(a1, |s| area(joint.thrust_diameter(s)));
    let loads = |d: crate::restraint::Diameters, size: Option<&str>| {
        let density = size
            .and_then(pipe_sizes::find)
            .and_then(|s| Material::of_family(s.family).wall_density())
            .unwrap_or(0.0);
        let ring = std::f64::consts::PI / 4.0 * (d.od * d.od - d.id * d.id);
        PipeLoads {
            od: d.od,
            pipe_weight: density * STANDARD_GRAVITY * ring,
            water_weight: WATER_DENSITY * STANDARD_GRAVITY * std::f64::consts::PI / 4.0 * d.id * d.id,
        }
    };
    let main_loads = loads(main, row.size.as_deref());
    let branch_loads = (kind == FittingKind::Tee)
        .then(|| second.map(|s| loads(s, row.size2.as_deref())))
        .flatten();
    let trench = Trench {
        cover: column.cover,
        gamma: column.class.gamma,
        phi: column.class.phi,
        cohesion: column.class.cohesion,
        kn: column.laying.kn(),
    };
    let hold = if kind == FittingKind::Bend && plane == Plane::Crest {
        BendHold::Weight
    } else {
        BendHold::FrictionAndBearing
    };
    match restrained::class_length(
        kind,
        hold,
        sf,
        p,
        (a1, a2),
        angle,
        (main_loads, branch_loads),
        trench,
        column.class,
    ) {
        Some(l) if kind == FittingKind::Tee => format!("branch {}", report.fmt(l, Q::Length)),
        Some(l) => report.fmt(l, Q::Length),
        None => "soil gives no friction".into(),
    }
}

#[cfg(test)]
mod tests {
    use crate::calculators::testing;

    /// The first number of a table cell, in the cell's own unit.
    fn number(cell: &str) -> f64 {
        cell.split_whitespace()
            .find_map(|w| w.parse::<f64>().ok())
            .unwrap_or(f64::NAN)
    }

    #[test]
    fn a_schedule_row_and_the_restrained_joint_page_agree() {
        // The same 12 in bend at the same pressure, cover, soil and laying on both
        // pages: the schedule's column and the page's headline (the longer method).
        let rows = "bend 90deg di52_12 p=10bar tag=B1\ndead_end di52_8 p=10bar tag=D1\n\
            tee di52_12 di52_8 p=10bar tag=T1";
        let schedule = testing::solved(
            super::super::super::line_schedule::KEY,
            &[
                ("rows", rows),
                ("cover", "1.5 m"),
                ("soil_class", "clean_sand"),
                ("laying", "type3"),
            ],
        );
        let table = schedule
            .tables
            .iter()
            .find(|t| t.key == "schedule")
            .expect("schedule table");
        let column = table
            .columns
            .iter()
            .position(|c| c == "Restrained length per side")
            .expect("column");
        for (i, (fitting, size2, output)) in [
            ("bend", "", "length"),
            ("dead_end", "", "length"),
            ("tee", "di52_8", "length_branch"),
        ]
        .into_iter()
        .enumerate()
        {
            let size = if fitting == "dead_end" { "di52_8" } else { "di52_12" };
            let mut pairs = vec![
                ("fitting", fitting),
                ("angle", "90 deg"),
                ("plane", "horizontal"),
                ("size", size),
                ("p_basis", "operating"),
                ("p", "10 bar"),
                ("cover", "1.5 m"),
                ("soil_class", "clean_sand"),
                ("laying", "type3"),
                ("sf", "1.5"),
                ("rl_method", "longer"),
                ("t", "15 degC"),
            ];
            if !size2.is_empty() {
                pairs.push(("size2", size2));
            }
            let page = testing::solved(super::super::KEY, &pairs);
            let want = page.output(output).map(|o| o.si).unwrap_or(f64::NAN);
            let shown = number(&table.rows[i][column]);
            assert!(
                (shown - want).abs() <= 1e-3 * want,
                "{fitting}: schedule {shown} m, page {want} m ({:?})",
                table.rows[i]
            );
        }
    }
}
