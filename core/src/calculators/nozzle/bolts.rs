//! The nozzle flange's bolts: the end force shared among the bolts against each
//! bolt's allowable load.
//!
//! # Method
//! The end force the bolts must hold is taken with no credit for the flow (the
//! nozzle can be shut or blocked at the same pressure): the hydrostatic end force at
//! the gasket reaction diameter, H = (π/4)·G²·p₁, when G is given, otherwise the
//! pressure on the bore, p₁·A₁. Each of the n bolts carries F = H/n, compared with
//! its allowable load S·A_s (allowable stress S of the grade, tensile stress area
//! A_s of the size); the utilisation is F/(S·A_s). The gasket load (ASME BPVC VIII-1
//! Appendix 2: H_p = 2b·π·G·m·P in operation, W_m2 = π·b·G·y to seat the gasket) is
//! not included, so the utilisation is a lower bound for a gasketed joint.
//!
//! # Sizes and grades
//! Tensile stress areas are the standards' closed forms, tabulated to four figures:
//!
//! - inch threads (ASME B1.1, UNC up to 1 in and the 8-thread series above it, as
//!   ASME B16.5 calls for flange bolting): A_s = 0.7854·(D − 0.9743/n)², D the major
//!   diameter in inches, n threads per inch;
//! - ISO metric coarse threads (ISO 898-1): A_s = (π/4)·((d₂ + d₃)/2)² with
//!   d₂ = d − 0.649519·P and d₃ = d − 1.226869·P, i.e. (π/4)·(d − 0.938194·P)².
//!
//! The checks table recomputes the chosen size's area from its diameter and pitch
//! and compares it with the tabulated value.
//!
//! Allowable stresses at ambient temperature:
//!
//! - ASTM A193 B7 and A320 L7 (up to 2½ in): 25.0 ksi; A193 B7M: 20.0 ksi (ASME BPVC
//!   Section II Part D, Table 3, bolting for Section VIII Division 1; the same basic
//!   allowables in ASME B31.3 Table A-2; from memory).
//! - ISO 898-1 property classes 5.6, 8.8 and 10.9: the nominal design stress of
//!   bolting in EN 13445-3 (clause 11, f_B = min(R_p0.2/3, R_m/4) at 20 °C; from
//!   memory) with R_m and R_p0.2 of ISO 898-1: 5.6 (500 and 300 MPa) 100 MPa, 8.8
//!   (800 and 640 MPa) 200 MPa, 10.9 (1040 and 940 MPa) 260 MPa.
//!
//! A typed allowable stress or stress area replaces the table's.

use std::f64::consts::PI;

use uom::si::f64::{Area, Pressure};

use crate::catalog::{ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Table, Values};
use crate::error::{FieldError, FieldErrors};
use crate::units::{self, QuantityKind as Q};

use super::super::common::{choice, quantity};

/// One inch.
const INCH: f64 = 0.0254;
/// One ksi in pascals (NIST SP 811: 1 psi = 6894.757 Pa).
const KSI: f64 = 6.894_757_293_168_361e6;

/// A bolt size: its tensile stress area as tabulated, and the major diameter and
/// pitch the area follows from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BoltSize {
    pub key: &'static str,
    pub label: &'static str,
    /// Tensile stress area, m², as tabulated (four figures).
    pub stress_area: f64,
    /// Major (nominal) diameter, m.
    pub diameter: f64,
    /// Thread pitch, m.
    pub pitch: f64,
    pub metric: bool,
}

const fn inch(key: &'static str, label: &'static str, area_in2: f64, d_in: f64, tpi: f64) -> BoltSize {
    BoltSize {
        key,
        label,
        stress_area: area_in2 * INCH * INCH,
        diameter: d_in * INCH,
        pitch: INCH / tpi,
        metric: false,
    }
}

const fn metric(key: &'static str, label: &'static str, area_mm2: f64, d_mm: f64, pitch_mm: f64) -> BoltSize {
    BoltSize {
        key,
        label,
        stress_area: area_mm2 * 1e-6,
        diameter: d_mm * 1e-3,
        pitch: pitch_mm * 1e-3,
        metric: true,
    }
}

/// The sizes offered: ASME B1.1 inch series (tensile stress area in in²) and ISO
/// metric coarse (mm²), each with its diameter and pitch.
pub const BOLT_SIZES: &[BoltSize] = &[
    inch("unc_0500", "1/2-13 UNC (0.1419 in²)", 0.1419, 0.5, 13.0),
    inch("unc_0625", "5/8-11 UNC (0.2260 in²)", 0.2260, 0.625, 11.0),
    inch("unc_0750", "3/4-10 UNC (0.3345 in²)", 0.3345, 0.75, 10.0),
    inch("unc_0875", "7/8-9 UNC (0.4617 in²)", 0.4617, 0.875, 9.0),
    inch("unc_1000", "1-8 UNC (0.6057 in²)", 0.6057, 1.0, 8.0),
    inch("un8_1125", "1 1/8-8 UN (0.7905 in²)", 0.7905, 1.125, 8.0),
    inch("un8_1250", "1 1/4-8 UN (1.000 in²)", 1.000, 1.25, 8.0),
    inch("un8_1375", "1 3/8-8 UN (1.233 in²)", 1.233, 1.375, 8.0),
    inch("un8_1500", "1 1/2-8 UN (1.492 in²)", 1.492, 1.5, 8.0),
    metric("m12", "M12 × 1.75 (84.3 mm²)", 84.3, 12.0, 1.75),
    metric("m16", "M16 × 2 (157 mm²)", 157.0, 16.0, 2.0),
    metric("m20", "M20 × 2.5 (245 mm²)", 245.0, 20.0, 2.5),
    metric("m24", "M24 × 3 (353 mm²)", 353.0, 24.0, 3.0),
    metric("m27", "M27 × 3 (459 mm²)", 459.0, 27.0, 3.0),
    metric("m30", "M30 × 3.5 (561 mm²)", 561.0, 30.0, 3.5),
    metric("m36", "M36 × 4 (817 mm²)", 817.0, 36.0, 4.0),
];

/// The size options: the table and a typed stress area.
pub const BOLT_SIZE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "unc_0500",
        label: "1/2-13 UNC (0.1419 in²)",
    },
    ChoiceOption {
        key: "unc_0625",
        label: "5/8-11 UNC (0.2260 in²)",
    },
    ChoiceOption {
        key: "unc_0750",
        label: "3/4-10 UNC (0.3345 in²)",
    },
    ChoiceOption {
        key: "unc_0875",
        label: "7/8-9 UNC (0.4617 in²)",
    },
    ChoiceOption {
        key: "unc_1000",
        label: "1-8 UNC (0.6057 in²)",
    },
    ChoiceOption {
        key: "un8_1125",
        label: "1 1/8-8 UN (0.7905 in²)",
    },
    ChoiceOption {
        key: "un8_1250",
        label: "1 1/4-8 UN (1.000 in²)",
    },
    ChoiceOption {
        key: "un8_1375",
        label: "1 3/8-8 UN (1.233 in²)",
    },
    ChoiceOption {
        key: "un8_1500",
        label: "1 1/2-8 UN (1.492 in²)",
    },
    ChoiceOption {
        key: "m12",
        label: "M12 × 1.75 (84.3 mm²)",
    },
    ChoiceOption {
        key: "m16",
        label: "M16 × 2 (157 mm²)",
    },
    ChoiceOption {
        key: "m20",
        label: "M20 × 2.5 (245 mm²)",
    },
    ChoiceOption {
        key: "m24",
        label: "M24 × 3 (353 mm²)",
    },
    ChoiceOption {
        key: "m27",
        label: "M27 × 3 (459 mm²)",
    },
    ChoiceOption {
        key: "m30",
        label: "M30 × 3.5 (561 mm²)",
    },
    ChoiceOption {
        key: "m36",
        label: "M36 × 4 (817 mm²)",
    },
    ChoiceOption {
        key: "custom",
        label: "Typed tensile stress area",
    },
];

/// A bolt grade and its allowable stress at ambient temperature, Pa.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct BoltGrade {
    pub key: &'static str,
    pub label: &'static str,
    pub allowable: f64,
    /// Where the allowable comes from, as shown on the page.
    pub basis: &'static str,
}

const ASME_BASIS: &str = "ASME BPVC II-D Table 3 (VIII-1 bolting), ASME B31.3 Table A-2, ambient";
const EN_BASIS: &str = "EN 13445-3 f_B = min(R_p0.2/3, R_m/4), R_m and R_p0.2 of ISO 898-1, 20 °C";

/// The grades offered.
pub const BOLT_GRADES: &[BoltGrade] = &[
    BoltGrade {
        key: "a193_b7",
        label: "ASTM A193 B7, up to 2 1/2 in (25.0 ksi)",
        allowable: 25.0 * KSI,
        basis: ASME_BASIS,
    },
    BoltGrade {
        key: "a193_b7m",
        label: "ASTM A193 B7M (20.0 ksi)",
        allowable: 20.0 * KSI,
        basis: ASME_BASIS,
    },
    BoltGrade {
        key: "a320_l7",
        label: "ASTM A320 L7, up to 2 1/2 in (25.0 ksi)",
        allowable: 25.0 * KSI,
        basis: ASME_BASIS,
    },
    BoltGrade {
        key: "iso_5_6",
        label: "ISO 898-1 class 5.6 (100 MPa)",
        allowable: 100e6,
        basis: EN_BASIS,
    },
    BoltGrade {
        key: "iso_8_8",
        label: "ISO 898-1 class 8.8 (200 MPa)",
        allowable: 200e6,
        basis: EN_BASIS,
    },
    BoltGrade {
        key: "iso_10_9",
        label: "ISO 898-1 class 10.9 (260 MPa)",
        allowable: 260e6,
        basis: EN_BASIS,
    },
];

/// The grade options: the table and a typed allowable stress.
pub const BOLT_GRADE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "a193_b7",
        label: "ASTM A193 B7, up to 2 1/2 in (25.0 ksi)",
    },
    ChoiceOption {
        key: "a193_b7m",
        label: "ASTM A193 B7M (20.0 ksi)",
    },
    ChoiceOption {
        key: "a320_l7",
        label: "ASTM A320 L7, up to 2 1/2 in (25.0 ksi)",
    },
    ChoiceOption {
        key: "iso_5_6",
        label: "ISO 898-1 class 5.6 (100 MPa)",
    },
    ChoiceOption {
        key: "iso_8_8",
        label: "ISO 898-1 class 8.8 (200 MPa)",
    },
    ChoiceOption {
        key: "iso_10_9",
        label: "ISO 898-1 class 10.9 (260 MPa)",
    },
    ChoiceOption {
        key: "custom",
        label: "Typed allowable stress",
    },
];

/// The tables give three or four figures: half a unit in the third figure of a
/// number from 100 up is at most 0.5 %.
const AREA_TABLE_ROUNDING: f64 = 5e-3;

/// The most bolts a flange of this page may have.
const MAX_BOLTS: f64 = 100.0;

const BOLTS_HELP: &str = "Number of bolts (or studs) in the flange, a whole number; flanges use multiples of 4. \
    Empty: no bolt check.";
const SIZE_HELP: &str = "Thread size, with the tensile stress area of ASME B1.1 (inch) or ISO 898-1 (metric); or \
    type the stress area.";
const GRADE_HELP: &str = "Bolt material and its allowable stress at ambient temperature (ASME BPVC II-D for ASTM \
    grades, EN 13445-3 for ISO 898-1 classes); or type the allowable stress your code gives at the design \
    temperature.";

/// The bolt fields, shown in the nozzle page after the gasket reaction diameter.
pub fn fields() -> Vec<FieldSpec> {
    let with_bolts = Some(("bolt_size", &BOLT_SIZE_KEYS[..]));
    vec![
        FieldSpec {
            optional: true,
            ..quantity(
                "bolts",
                "Number of flange bolts",
                Q::Ratio,
                "-",
                "-",
                "8",
                Limits::closed(1.0, MAX_BOLTS),
                BOLTS_HELP,
            )
        },
        FieldSpec {
            optional: true,
            ..choice("bolt_size", "Bolt size", BOLT_SIZE_OPTIONS, "m20", SIZE_HELP)
        },
        FieldSpec {
            visible_when: Some(("bolt_size", &["custom"])),
            ..quantity(
                "bolt_area",
                "Tensile stress area of one bolt",
                Q::Area,
                "mm2",
                "in2",
                "",
                Limits::closed(1e-6, 0.1),
                "The thread's tensile stress area A_s from its standard, 1 mm² to 0.1 m².",
            )
        },
        // Optional: read only with a number of bolts and a size (an empty size
        // shows the grade, as it reads as the size's demo on the page).
        FieldSpec {
            optional: true,
            visible_when: with_bolts,
            ..choice("bolt_grade", "Bolt grade", BOLT_GRADE_OPTIONS, "iso_8_8", GRADE_HELP)
        },
        FieldSpec {
            visible_when: Some(("bolt_grade", &["custom"])),
            ..quantity(
                "bolt_stress",
                "Allowable bolt stress",
                Q::Pressure,
                "MPa",
                "ksi",
                "",
                Limits::closed(1e6, 2e9),
                "The allowable tensile stress of the bolt material at the design temperature, from your code; 1 \
                 to 2000 MPa.",
            )
        },
    ]
}

/// Every size option key (the grade is shown whenever a size is chosen).
const BOLT_SIZE_KEYS: [&str; 17] = [
    "unc_0500", "unc_0625", "unc_0750", "unc_0875", "unc_1000", "un8_1125", "un8_1250", "un8_1375", "un8_1500", "m12",
    "m16", "m20", "m24", "m27", "m30", "m36", "custom",
];

/// The bolt outputs.
pub fn outputs() -> Vec<OutputSpec> {
    vec![
        OutputSpec::listed(
            "bolt_end_force",
            "End force the bolts hold, no credit for the flow (at G, else on the bore)",
            Q::Force,
        ),
        OutputSpec::listed("bolt_load", "Load per bolt, end force ÷ n", Q::Force),
        OutputSpec::listed("bolt_allowable", "Allowable load per bolt, S·A_s", Q::Force),
        OutputSpec::listed(
            "bolt_utilisation",
            "Bolt utilisation, load ÷ allowable (gasket load not included)",
            Q::Ratio,
        ),
    ]
}

/// Where a bolt's area comes from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum AreaFrom {
    Table(BoltSize),
    Typed(Area),
}

/// Where a bolt's allowable stress comes from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum StressFrom {
    Table(BoltGrade),
    Typed(Pressure),
}

/// The flange's bolting as typed.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Bolting {
    pub count: usize,
    pub area: AreaFrom,
    pub stress: StressFrom,
}

impl Bolting {
    /// Tensile stress area of one bolt, m².
    pub fn stress_area(&self) -> f64 {
        match self.area {
            AreaFrom::Table(size) => size.stress_area,
            AreaFrom::Typed(a) => a.value,
        }
    }
    /// Allowable stress, Pa.
    pub fn allowable_stress(&self) -> f64 {
        match self.stress {
            StressFrom::Table(grade) => grade.allowable,
            StressFrom::Typed(s) => s.value,
        }
    }
}

/// Reads the bolting; `None` when the number of bolts or the size is left empty.
///
/// # Errors
/// A fractional number of bolts, or a typed area or stress missing.
pub fn read(values: &Values) -> Result<Option<Bolting>, FieldErrors> {
    let (Ok(count), Ok(size)) = (values.quantity("bolts"), values.choice("bolt_size")) else {
        return Ok(None);
    };
    if count.fract() != 0.0 {
        return Err(FieldError::inconsistent(
            "bolts",
            format!("the number of bolts must be a whole number from 1 to {MAX_BOLTS}"),
        )
        .into());
    }
    let area = match BOLT_SIZES.iter().find(|s| s.key == size) {
        Some(s) => AreaFrom::Table(*s),
        None => AreaFrom::Typed(values.typed("bolt_area").map_err(|_| {
            FieldError::inconsistent(
                "bolt_area",
                "type the tensile stress area of one bolt, or choose a size",
            )
        })?),
    };
    let grade = values.choice("bolt_grade")?;
    let stress = match BOLT_GRADES.iter().find(|g| g.key == grade) {
        Some(g) => StressFrom::Table(*g),
        None => StressFrom::Typed(values.typed("bolt_stress").map_err(|_| {
            FieldError::inconsistent("bolt_stress", "type the allowable bolt stress, or choose a grade")
        })?),
    };
    Ok(Some(Bolting {
        count: count as usize,
        area,
        stress,
    }))
}

/// The tensile stress area of a thread from its standard's closed form, m²: ASME
/// B1.1 for inch threads, ISO 898-1 for metric ones.
pub fn stress_area_closed_form(size: &BoltSize) -> f64 {
    if size.metric {
        PI / 4.0 * (size.diameter - 0.938_194 * size.pitch).powi(2)
    } else {
        let (d, n) = (size.diameter / INCH, INCH / size.pitch);
        // The standard's formula as printed, its rounded π/4 included.
        #[allow(clippy::approx_constant)]
        let quarter_pi_as_printed = 0.7854;
        quarter_pi_as_printed * (d - 0.9743 / n).powi(2) * INCH * INCH
    }
}

/// Writes the bolt outputs, check, warning and table for gauge pressure `p1` at the
/// flange, the bore area and the gasket reaction diameter when given (SI).
pub fn write(bolting: &Bolting, p1: f64, bore_area: f64, gasket_diameter: Option<f64>, report: &mut Report<'_>) {
    let (end_force, where_) = match gasket_diameter {
        Some(g) => (p1 * PI / 4.0 * g * g, "(π/4)·G²·p₁ at the gasket reaction diameter"),
        None => (p1 * bore_area, "p₁·A₁ on the bore (no gasket diameter given)"),
    };
    let n = bolting.count as f64;
    let load = end_force / n;
    let allowable = bolting.allowable_stress() * bolting.stress_area();
    let utilisation = load / allowable;
    report.output("bolt_end_force", end_force);
    report.output("bolt_load", load);
    report.output("bolt_allowable", allowable);
    report.output("bolt_utilisation", utilisation);
    if let AreaFrom::Table(size) = bolting.area {
        report.check(
            "Tensile stress area of the bolt",
            if size.metric {
                "ISO 898-1 closed form (π/4)·(d − 0.938194·P)²"
            } else {
                "ASME B1.1 closed form 0.7854·(D − 0.9743/n)²"
            },
            Q::Area,
            size.stress_area,
            stress_area_closed_form(&size),
            AREA_TABLE_ROUNDING,
            0.0,
        );
    }
    if utilisation > 1.0 {
        report.warn(
            Some("bolts"),
            format!(
                "each bolt carries {} against an allowable {} ({} %): more or larger bolts, or a stronger grade, are \
                 needed, before the gasket load is even added",
                report.fmt(load, Q::Force),
                report.fmt(allowable, Q::Force),
                units::format_significant(100.0 * utilisation, 3)
            ),
        );
    }
    if !bolting.count.is_multiple_of(4) {
        report.warn(
            Some("bolts"),
            "flanges are drilled for a multiple of 4 bolts (ASME B16.5, EN 1092-1): check the count",
        );
    }
    report.table(|report| table(bolting, end_force, where_, load, allowable, utilisation, report));
}

fn table(
    bolting: &Bolting,
    end_force: f64,
    where_: &str,
    load: f64,
    allowable: f64,
    utilisation: f64,
    report: &Report<'_>,
) -> Table {
    let (size, area_basis) = match bolting.area {
        AreaFrom::Table(s) => (s.label.to_string(), if s.metric { "ISO 898-1" } else { "ASME B1.1" }),
        AreaFrom::Typed(_) => ("typed".to_string(), "typed"),
    };
    let (grade, stress_basis) = match bolting.stress {
        StressFrom::Table(g) => (g.label.to_string(), g.basis),
        StressFrom::Typed(_) => ("typed".to_string(), "typed"),
    };
    let rows = vec![
        vec![
            "end force the bolts hold".to_string(),
            report.fmt(end_force, Q::Force),
            format!("{where_}, no credit for the flow"),
        ],
        vec![
            "number of bolts n".to_string(),
            bolting.count.to_string(),
            "typed".to_string(),
        ],
        vec![
            "load per bolt".to_string(),
            report.fmt(load, Q::Force),
            "end force ÷ n".to_string(),
        ],
        vec![
            format!("tensile stress area A_s, {size}"),
            report.fmt(bolting.stress_area(), Q::Area),
            area_basis.to_string(),
        ],
        vec![
            format!("allowable stress S, {grade}"),
            report.fmt(bolting.allowable_stress(), Q::Pressure),
            stress_basis.to_string(),
        ],
        vec![
            "allowable load per bolt".to_string(),
            report.fmt(allowable, Q::Force),
            "S·A_s".to_string(),
        ],
        vec![
            "utilisation".to_string(),
            format!("{} %", units::format_significant(100.0 * utilisation, 3)),
            "load ÷ allowable; the gasket load (ASME BPVC VIII-1 Appendix 2) is not included".to_string(),
        ],
    ];
    Table {
        key: "bolts",
        title: "Flange bolts: end force shared among the bolts".to_string(),
        columns: vec!["Quantity".to_string(), "value".to_string(), "basis".to_string()],
        rows,
        emphasised_rows: vec![6],
        typed_columns: Vec::new(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    crate::calculators::testing::page_helpers!(super::super::KEY);

    #[test]
    fn tabulated_areas_match_the_standards_closed_forms_and_the_options() {
        for size in BOLT_SIZES {
            let closed = stress_area_closed_form(size);
            assert!(
                (size.stress_area / closed - 1.0).abs() <= AREA_TABLE_ROUNDING,
                "{}: {} vs {closed}",
                size.key,
                size.stress_area
            );
            assert!(BOLT_SIZE_OPTIONS
                .iter()
                .any(|o| o.key == size.key && o.label == size.label));
        }
        assert_eq!(BOLT_SIZE_OPTIONS.len(), BOLT_SIZES.len() + 1);
        assert_eq!(BOLT_SIZE_KEYS.len(), BOLT_SIZE_OPTIONS.len());
        assert!(BOLT_SIZE_OPTIONS.iter().zip(BOLT_SIZE_KEYS).all(|(o, k)| o.key == k));
        for grade in BOLT_GRADES {
            assert!(BOLT_GRADE_OPTIONS
                .iter()
                .any(|o| o.key == grade.key && o.label == grade.label));
        }
        assert_eq!(BOLT_GRADE_OPTIONS.len(), BOLT_GRADES.len() + 1);
    }

    #[test]
    fn load_per_bolt_against_the_allowable_load() {
        // 10 bar on a 100 mm gasket diameter: 7853.98 N over 4 bolts of typed area
        // 100 mm² at 50 MPa (5 kN each): 1963.5 N per bolt, 39.27 %.
        let s = solved(&[
            ("d", "80 mm"),
            ("d_nozzle", "30 mm"),
            ("flow_given", "p"),
            ("p", "10 bar"),
            ("d_gasket", "100 mm"),
            ("bolts", "4"),
            ("bolt_size", "custom"),
            ("bolt_area", "100 mm2"),
            ("bolt_grade", "custom"),
            ("bolt_stress", "50 MPa"),
        ]);
        let get = |k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
        approx::assert_relative_eq!(get("bolt_load"), 1e6 * PI / 4.0 * 0.01 / 4.0, max_relative = 1e-12);
        approx::assert_relative_eq!(get("bolt_allowable"), 5000.0, max_relative = 1e-12);
        assert!(s.tables.iter().any(|t| t.key == "bolts"));
        // Without a gasket diameter the bore carries the pressure.
        let bore = solved(&[("d", "80 mm"), ("p", "10 bar"), ("d_gasket", ""), ("bolts", "4")]);
        let end = bore.output("bolt_end_force").map(|o| o.si).unwrap_or(f64::NAN);
        approx::assert_relative_eq!(end, 1e6 * PI / 4.0 * 0.08 * 0.08, max_relative = 1e-12);
        // Overloaded bolts and an odd count are warned about; no bolts, no section.
        let over = solved(&[
            ("p", "100 bar"),
            ("bolts", "3"),
            ("bolt_size", "m12"),
            ("bolt_grade", "iso_5_6"),
        ]);
        assert!(over.warnings.iter().any(|w| w.message.contains("allowable")));
        assert!(over.warnings.iter().any(|w| w.message.contains("multiple of 4")));
        assert!(solved(&[("bolts", "")]).output("bolt_load").is_none());
        // A typed area or stress left empty is named.
        assert_eq!(error_field(&[("bolt_size", "custom"), ("bolt_area", "")]), "bolt_area");
        assert_eq!(
            error_field(&[("bolt_grade", "custom"), ("bolt_stress", "")]),
            "bolt_stress"
        );
        assert_eq!(error_field(&[("bolts", "6.5")]), "bolts");
    }
}
