//! Serialisable mirrors of the core's descriptions and results, and the pure
//! functions that build them.
//!
//! The core keeps its types free of serde on purpose (it knows nothing of JSON or
//! JavaScript); this module is the one place where they get a wire shape. Every
//! struct here is a field-by-field copy of a core type with snake_case keys, as
//! documented in the project's contract between core, adapter and page script.
//! Nothing here computes, defaults or converts physical values: unit lists come from
//! [`fluxledger_core::units::units_of`], labels and messages from the core.
//!
//! Non-finite numbers are never meant to leave the core (its report filters them),
//! but a NaN or infinity that slipped through is written as `null` here, because
//! `serde-wasm-bindgen` would otherwise pass it to JavaScript unchanged.
//!
//! These functions are plain Rust and are tested natively (the crate is also an
//! `rlib`); only [`crate::catalog`] and [`crate::solve`] touch `JsValue`.

use serde::Serialize;

use fluxledger_core::calculators::{self, Outcome};
use fluxledger_core::catalog::{
    CalculatorSpec, Diagram, FieldEcho, FieldKind, FieldSpec, OutputSpec, OutputValue, Plot, Shape, ShapeStyle,
    Solution, Table, Warning, COMMON_CAUTIONS,
};
use fluxledger_core::units::{self, QuantityKind, UnitSystem};
use fluxledger_core::{FieldError, SolveError};

/// A number that is `null` on the JavaScript side when it is not finite.
pub type Num = Option<f64>;

/// Maps a non-finite float to `None` (serialised as `null`).
pub fn num(value: f64) -> Num {
    value.is_finite().then_some(value)
}

fn point(p: [f64; 2]) -> [Num; 2] {
    [num(p[0]), num(p[1])]
}

fn points(ps: &[[f64; 2]]) -> Vec<[Num; 2]> {
    ps.iter().copied().map(point).collect()
}

/// The wire name of a quantity kind (`"volume_flow"`): the variant name in
/// snake_case. An explicit match so that a new kind is a compile error here, not a
/// silently misspelt name.
pub fn quantity_name(kind: QuantityKind) -> &'static str {
    match kind {
        QuantityKind::Length => "length",
        QuantityKind::Area => "area",
        QuantityKind::Volume => "volume",
        QuantityKind::ConcreteVolume => "concrete_volume",
        QuantityKind::Mass => "mass",
        QuantityKind::Time => "time",
        QuantityKind::Pressure => "pressure",
        QuantityKind::SoilBearing => "soil_bearing",
        QuantityKind::Velocity => "velocity",
        QuantityKind::Acceleration => "acceleration",
        QuantityKind::VolumeFlow => "volume_flow",
        QuantityKind::MassFlow => "mass_flow",
        QuantityKind::Force => "force",
        QuantityKind::Torque => "torque",
        QuantityKind::Power => "power",
        QuantityKind::Angle => "angle",
        QuantityKind::AngularSpeed => "angular_speed",
        QuantityKind::Temperature => "temperature",
        QuantityKind::Density => "density",
        QuantityKind::SpecificWeight => "specific_weight",
        QuantityKind::DynamicViscosity => "dynamic_viscosity",
        QuantityKind::KinematicViscosity => "kinematic_viscosity",
        QuantityKind::Ratio => "ratio",
    }
}

/// The label of a page unit system in the switch.
fn unit_system_label(system: UnitSystem) -> &'static str {
    match system {
        UnitSystem::Si => "SI",
        UnitSystem::UsCustomary => "US customary",
    }
}

// ---------------------------------------------------------------------------
// Catalog

/// What `catalog()` returns.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CatalogView {
    pub version: &'static str,
    pub common_cautions: Vec<&'static str>,
    pub unit_systems: Vec<UnitSystemView>,
    pub calculators: Vec<CalculatorView>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct UnitSystemView {
    pub key: &'static str,
    pub label: &'static str,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CalculatorView {
    pub key: &'static str,
    pub title: &'static str,
    pub group: &'static str,
    pub summary: &'static str,
    pub cautions: Vec<&'static str>,
    pub fields: Vec<FieldView>,
    pub outputs: Vec<OutputSpecView>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FieldView {
    pub key: &'static str,
    pub label: &'static str,
    /// `"quantity"`, `"choice"` or `"text"`.
    pub kind: &'static str,
    /// Quantity kind name for quantity fields, else `null`.
    pub quantity: Option<&'static str>,
    /// Unit ids offered in the selector, in order (`[]` for choice and text).
    pub units: Vec<&'static str>,
    pub si_unit: &'static str,
    pub us_unit: &'static str,
    pub demo: &'static str,
    pub optional: bool,
    pub help: &'static str,
    pub options: Vec<OptionView>,
    pub visible_when: Option<VisibleWhenView>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct OptionView {
    pub key: &'static str,
    pub label: &'static str,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct VisibleWhenView {
    pub field: &'static str,
    pub values: Vec<&'static str>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct OutputSpecView {
    pub key: &'static str,
    pub label: &'static str,
    pub quantity: &'static str,
    pub headline: bool,
}

/// The catalog of every registered calculator.
pub fn catalog_view() -> CatalogView {
    catalog_view_of(&calculators::catalog())
}

/// The catalog view of the given specs (separate from [`catalog_view`] so that it can
/// be tested on hand-made specs).
pub fn catalog_view_of(specs: &[CalculatorSpec]) -> CatalogView {
    CatalogView {
        version: env!("CARGO_PKG_VERSION"),
        common_cautions: COMMON_CAUTIONS.to_vec(),
        unit_systems: [UnitSystem::Si, UnitSystem::UsCustomary]
            .into_iter()
            .map(|s| UnitSystemView {
                key: s.key(),
                label: unit_system_label(s),
            })
            .collect(),
        calculators: specs.iter().map(calculator_view).collect(),
    }
}

pub fn calculator_view(spec: &CalculatorSpec) -> CalculatorView {
    CalculatorView {
        key: spec.key,
        title: spec.title,
        group: spec.group,
        summary: spec.summary,
        cautions: spec.cautions.clone(),
        fields: spec.fields.iter().map(field_view).collect(),
        outputs: spec.outputs.iter().map(output_spec_view).collect(),
    }
}

pub fn field_view(field: &FieldSpec) -> FieldView {
    let (kind, quantity, unit_ids, options) = match &field.kind {
        FieldKind::Quantity(q) => (
            "quantity",
            Some(quantity_name(*q)),
            units::units_of(*q).map(|u| u.id).collect(),
            Vec::new(),
        ),
        FieldKind::Choice(options) => (
            "choice",
            None,
            Vec::new(),
            options
                .iter()
                .map(|o| OptionView {
                    key: o.key,
                    label: o.label,
                })
                .collect(),
        ),
        FieldKind::Text => ("text", None, Vec::new(), Vec::new()),
    };
    FieldView {
        key: field.key,
        label: field.label,
        kind,
        quantity,
        units: unit_ids,
        si_unit: field.si_unit,
        us_unit: field.us_unit,
        demo: field.demo,
        optional: field.optional,
        help: field.help,
        options,
        visible_when: field.visible_when.map(|(field, values)| VisibleWhenView {
            field,
            values: values.to_vec(),
        }),
    }
}

fn output_spec_view(output: &OutputSpec) -> OutputSpecView {
    OutputSpecView {
        key: output.key,
        label: output.label,
        quantity: quantity_name(output.kind),
        headline: output.headline,
    }
}

// ---------------------------------------------------------------------------
// Solve

/// What `solve()` returns: `{ok: true, ...}` or `{ok: false, ...}`.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(untagged)]
pub enum SolveView {
    Solved(SolvedView),
    Failed(FailedView),
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SolvedView {
    /// Always `true`.
    pub ok: bool,
    pub echoes: Vec<EchoView>,
    pub outputs: Vec<OutputView>,
    pub tables: Vec<TableView>,
    pub diagrams: Vec<DiagramView>,
    pub plots: Vec<PlotView>,
    pub warnings: Vec<WarningView>,
    pub carry_over: Vec<CarryOverView>,
}

/// A link to another calculator with inputs filled: the page builds the address from
/// the catalog key and these inputs, never from anything typed into the address bar.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CarryOverView {
    pub calculator: &'static str,
    pub label: String,
    pub inputs: std::collections::BTreeMap<&'static str, String>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FailedView {
    /// Always `false`.
    pub ok: bool,
    pub echoes: Vec<EchoView>,
    pub errors: Vec<ErrorView>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct EchoView {
    pub field: &'static str,
    pub number: String,
    pub unit: &'static str,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ErrorView {
    /// Field key, or `""` when the error is not about a field (unknown calculator).
    pub field: String,
    /// The field's label from the spec (the key when the spec does not know it).
    pub label: String,
    pub message: String,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct OutputView {
    pub key: &'static str,
    pub label: &'static str,
    pub text: String,
    pub si: Num,
    pub headline: bool,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct TableView {
    pub key: &'static str,
    pub title: String,
    pub columns: Vec<String>,
    pub rows: Vec<Vec<String>>,
    pub emphasised_rows: Vec<usize>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct DiagramView {
    pub title: String,
    pub bounds: [Num; 4],
    pub shapes: Vec<ShapeView>,
    pub caption: String,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "type", rename_all = "snake_case")]
pub enum ShapeView {
    Polygon {
        points: Vec<[Num; 2]>,
        style: StyleView,
    },
    Polyline {
        points: Vec<[Num; 2]>,
        style: StyleView,
    },
    Circle {
        center: [Num; 2],
        radius: Num,
        style: StyleView,
    },
    Arrow {
        from: [Num; 2],
        to: [Num; 2],
        label: String,
        style: StyleView,
    },
    Text {
        at: [Num; 2],
        text: String,
        style: StyleView,
    },
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum StyleView {
    Wall,
    Fluid,
    ControlVolume,
    Flow,
    Restraint,
    Thrust,
    Pressure,
    Momentum,
    Weight,
    Velocity,
    Guide,
    Label,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct PlotView {
    pub key: &'static str,
    pub title: String,
    pub x_label: String,
    pub y_label: String,
    pub series: Vec<SeriesView>,
    pub markers: Vec<MarkerView>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SeriesView {
    pub name: String,
    pub points: Vec<[Num; 2]>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct MarkerView {
    pub at: [Num; 2],
    pub label: String,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct WarningView {
    pub field: Option<&'static str>,
    pub message: String,
}

/// The view of a solve outcome. `spec` (the solved calculator's description, if the
/// key was known) supplies the field labels of errors.
pub fn solve_view(outcome: &Outcome, spec: Option<&CalculatorSpec>) -> SolveView {
    let echoes = outcome.echoes.iter().map(echo_view).collect();
    match &outcome.result {
        Ok(solution) => SolveView::Solved(solved_view(echoes, solution)),
        Err(error) => SolveView::Failed(FailedView {
            ok: false,
            echoes,
            errors: error_views(error, spec),
        }),
    }
}

fn echo_view(echo: &FieldEcho) -> EchoView {
    EchoView {
        field: echo.key,
        number: echo.number.clone(),
        unit: echo.unit,
    }
}

fn solved_view(echoes: Vec<EchoView>, solution: &Solution) -> SolvedView {
    SolvedView {
        ok: true,
        echoes,
        outputs: solution.outputs.iter().map(output_view).collect(),
        tables: solution.tables.iter().map(table_view).collect(),
        diagrams: solution.diagrams.iter().map(diagram_view).collect(),
        plots: solution.plots.iter().map(plot_view).collect(),
        warnings: solution.warnings.iter().map(warning_view).collect(),
        carry_over: solution
            .carry_over
            .iter()
            .map(|c| CarryOverView {
                calculator: c.calculator,
                label: c.label.clone(),
                inputs: c.inputs.iter().map(|(k, v)| (*k, v.clone())).collect(),
            })
            .collect(),
    }
}

// ---------------------------------------------------------------------------
// Convert

/// What `convert()` returns: `{ok: true, number, unit}` or `{ok: false, message}`.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(untagged)]
pub enum ConvertView {
    Converted {
        /// Always `true`.
        ok: bool,
        /// The number in `unit`, without the unit (`"145.038"`).
        number: String,
        /// The field's default unit in the target system (`"psi"`).
        unit: &'static str,
    },
    Refused {
        /// Always `false`.
        ok: bool,
        message: String,
    },
}

fn refused(message: String) -> ConvertView {
    ConvertView::Refused { ok: false, message }
}

/// Converts what is typed in field `field` of calculator `key` (a bare number takes
/// `from_unit`) to that field's default unit in `system`, through
/// [`units::convert_text`], which rounds for the eye (one figure more than typed, at
/// least four); the page script keeps the typed text and restores it when the system
/// is switched back. The default unit of a system is the spec's `si_unit` or
/// `us_unit`; an empty one falls back to the other, as the page script does.
pub fn convert_view(key: &str, field: &str, text: &str, from_unit: &str, system: UnitSystem) -> ConvertView {
    let Some(spec) = calculators::spec(key) else {
        return refused(SolveError::UnknownCalculator { key: key.to_string() }.to_string());
    };
    let Some(field_spec) = spec.fields.iter().find(|f| f.key == field) else {
        return refused(format!("the calculator '{key}' has no field '{field}'"));
    };
    let FieldKind::Quantity(kind) = field_spec.kind else {
        return refused(format!("{}: not a quantity, nothing to convert", field_spec.label));
    };
    let (own, other) = match system {
        UnitSystem::Si => (field_spec.si_unit, field_spec.us_unit),
        UnitSystem::UsCustomary => (field_spec.us_unit, field_spec.si_unit),
    };
    let unit = if own.is_empty() { other } else { own };
    match units::convert_text(text, kind, from_unit, unit) {
        Ok(number) => ConvertView::Converted { ok: true, number, unit },
        Err(error) => refused(format!("{}: {error}", field_spec.label)),
    }
}

/// Every error of a failed solve, each with its field key, label and message.
pub fn error_views(error: &SolveError, spec: Option<&CalculatorSpec>) -> Vec<ErrorView> {
    match error {
        SolveError::UnknownCalculator { .. } => {
            vec![ErrorView {
                field: String::new(),
                label: String::new(),
                message: error.to_string(),
            }]
        }
        SolveError::Fields(errors) => errors.iter().map(|e| field_error_view(e, spec)).collect(),
    }
}

fn field_error_view(error: &FieldError, spec: Option<&CalculatorSpec>) -> ErrorView {
    let label = spec
        .and_then(|s| s.field(&error.field))
        .map(|f| f.label.to_string())
        .unwrap_or_else(|| error.field.clone());
    ErrorView {
        field: error.field.clone(),
        label,
        message: error.kind.to_string(),
    }
}

fn output_view(output: &OutputValue) -> OutputView {
    OutputView {
        key: output.key,
        label: output.label,
        text: output.text.clone(),
        si: num(output.si),
        headline: output.headline,
    }
}

fn table_view(table: &Table) -> TableView {
    TableView {
        key: table.key,
        title: table.title.clone(),
        columns: table.columns.clone(),
        rows: table.rows.clone(),
        emphasised_rows: table.emphasised_rows.clone(),
    }
}

fn diagram_view(diagram: &Diagram) -> DiagramView {
    let b = diagram.bounds;
    DiagramView {
        title: diagram.title.clone(),
        bounds: [num(b[0]), num(b[1]), num(b[2]), num(b[3])],
        shapes: diagram.shapes.iter().map(shape_view).collect(),
        caption: diagram.caption.clone(),
    }
}

pub fn shape_view(shape: &Shape) -> ShapeView {
    match shape {
        Shape::Polygon { points: ps, style } => ShapeView::Polygon {
            points: points(ps),
            style: style_view(*style),
        },
        Shape::Polyline { points: ps, style } => ShapeView::Polyline {
            points: points(ps),
            style: style_view(*style),
        },
        Shape::Circle { center, radius, style } => ShapeView::Circle {
            center: point(*center),
            radius: num(*radius),
            style: style_view(*style),
        },
        Shape::Arrow { from, to, label, style } => ShapeView::Arrow {
            from: point(*from),
            to: point(*to),
            label: label.clone(),
            style: style_view(*style),
        },
        Shape::Text { at, text, style } => ShapeView::Text {
            at: point(*at),
            text: text.clone(),
            style: style_view(*style),
        },
    }
}

fn style_view(style: ShapeStyle) -> StyleView {
    match style {
        ShapeStyle::Wall => StyleView::Wall,
        ShapeStyle::Fluid => StyleView::Fluid,
        ShapeStyle::ControlVolume => StyleView::ControlVolume,
        ShapeStyle::Flow => StyleView::Flow,
        ShapeStyle::Restraint => StyleView::Restraint,
        ShapeStyle::Thrust => StyleView::Thrust,
        ShapeStyle::Pressure => StyleView::Pressure,
        ShapeStyle::Momentum => StyleView::Momentum,
        ShapeStyle::Weight => StyleView::Weight,
        ShapeStyle::Velocity => StyleView::Velocity,
        ShapeStyle::Guide => StyleView::Guide,
        ShapeStyle::Label => StyleView::Label,
    }
}

fn plot_view(plot: &Plot) -> PlotView {
    PlotView {
        key: plot.key,
        title: plot.title.clone(),
        x_label: plot.x_label.clone(),
        y_label: plot.y_label.clone(),
        series: plot
            .series
            .iter()
            .map(|s| SeriesView {
                name: s.name.clone(),
                points: points(&s.points),
            })
            .collect(),
        markers: plot
            .markers
            .iter()
            .map(|m| MarkerView {
                at: point(m.at),
                label: m.label.clone(),
            })
            .collect(),
    }
}

fn warning_view(warning: &Warning) -> WarningView {
    WarningView {
        field: warning.field,
        message: warning.message.clone(),
    }
}

#[cfg(test)]
mod tests {
    //! The mapping from core types to the wire shape, checked on hand-made core
    //! values serialised through `serde_json` (the same serde data model that
    //! `serde-wasm-bindgen` walks in the browser).

    use super::*;
    use fluxledger_core::catalog::{ChoiceOption, Limits, Marker, Series};
    use fluxledger_core::FieldErrorKind;
    use serde_json::{json, Value};

    const LAYOUT: &[ChoiceOption] = &[
        ChoiceOption {
            key: "horizontal",
            label: "Horizontal",
        },
        ChoiceOption {
            key: "vertical",
            label: "Vertical",
        },
    ];

    fn sample_spec() -> CalculatorSpec {
        CalculatorSpec {
            key: "sample",
            title: "Sample fitting",
            group: "Pipe fittings",
            summary: "A made-up page for the adapter tests.",
            fields: vec![
                FieldSpec {
                    key: "q",
                    label: "Flow",
                    kind: FieldKind::Quantity(QuantityKind::VolumeFlow),
                    si_unit: "m3/h",
                    us_unit: "gpm",
                    demo: "120 m3/h",
                    limits: Some(Limits::positive(100.0)),
                    optional: false,
                    help: "Volumetric flow through the fitting.",
                    visible_when: None,
                },
                FieldSpec {
                    key: "layout",
                    label: "Layout",
                    kind: FieldKind::Choice(LAYOUT),
                    si_unit: "",
                    us_unit: "",
                    demo: "horizontal",
                    limits: None,
                    optional: false,
                    help: "",
                    visible_when: None,
                },
                FieldSpec {
                    key: "note",
                    label: "Note",
                    kind: FieldKind::Text,
                    si_unit: "",
                    us_unit: "",
                    demo: "",
                    limits: None,
                    optional: true,
                    help: "",
                    visible_when: Some(("layout", &["vertical"])),
                },
            ],
            outputs: vec![OutputSpec {
                key: "f",
                label: "Restraint force",
                kind: QuantityKind::Force,
                headline: true,
            }],
            cautions: vec!["A page caution."],
        }
    }

    fn to_json<T: Serialize>(value: &T) -> Value {
        serde_json::to_value(value).expect("the views serialise to JSON")
    }

    #[test]
    fn catalog_has_version_cautions_and_both_unit_systems() {
        let view = to_json(&catalog_view_of(&[]));
        assert_eq!(view["version"], json!(env!("CARGO_PKG_VERSION")));
        assert_eq!(
            view["common_cautions"].as_array().map(Vec::len),
            Some(COMMON_CAUTIONS.len())
        );
        assert_eq!(
            view["unit_systems"],
            json!([{"key": "si", "label": "SI"}, {"key": "us", "label": "US customary"}])
        );
        assert_eq!(view["calculators"], json!([]));
    }

    #[test]
    fn registered_catalog_matches_the_core_list() {
        let view = catalog_view();
        let keys: Vec<&str> = view.calculators.iter().map(|c| c.key).collect();
        let expected: Vec<&str> = calculators::CALCULATORS.iter().map(|c| c.key).collect();
        assert_eq!(keys, expected);
    }

    #[test]
    fn quantity_field_lists_the_core_units_and_snake_case_kind() {
        let spec = sample_spec();
        let view = to_json(&calculator_view(&spec));
        let q = &view["fields"][0];
        let expected_units: Vec<&str> = units::units_of(QuantityKind::VolumeFlow).map(|u| u.id).collect();
        assert!(!expected_units.is_empty());
        assert_eq!(q["kind"], json!("quantity"));
        assert_eq!(q["quantity"], json!("volume_flow"));
        assert_eq!(q["units"], json!(expected_units));
        assert_eq!(q["options"], json!([]));
        assert_eq!(q["visible_when"], Value::Null);
        assert_eq!(q["si_unit"], json!("m3/h"));
        assert_eq!(q["demo"], json!("120 m3/h"));
        assert_eq!(
            view["outputs"],
            json!([{"key": "f", "label": "Restraint force", "quantity": "force", "headline": true}])
        );
        assert_eq!(view["cautions"], json!(["A page caution."]));
    }

    #[test]
    fn choice_and_text_fields_have_no_units_and_carry_options_and_visibility() {
        let spec = sample_spec();
        let view = to_json(&calculator_view(&spec));
        let layout = &view["fields"][1];
        assert_eq!(layout["kind"], json!("choice"));
        assert_eq!(layout["quantity"], Value::Null);
        assert_eq!(layout["units"], json!([]));
        assert_eq!(
            layout["options"],
            json!([{"key": "horizontal", "label": "Horizontal"}, {"key": "vertical", "label": "Vertical"}])
        );
        let note = &view["fields"][2];
        assert_eq!(note["kind"], json!("text"));
        assert_eq!(note["optional"], json!(true));
        assert_eq!(note["visible_when"], json!({"field": "layout", "values": ["vertical"]}));
    }

    #[test]
    fn every_quantity_kind_name_is_distinct_snake_case() {
        let all = QuantityKind::ALL;
        let mut names: Vec<&str> = all.iter().map(|k| quantity_name(*k)).collect();
        for (kind, name) in all.iter().zip(&names) {
            // The Debug name folded to snake_case is the wire name.
            let mut snake = String::new();
            for (i, ch) in format!("{kind:?}").chars().enumerate() {
                if ch.is_ascii_uppercase() && i > 0 {
                    snake.push('_');
                }
                snake.push(ch.to_ascii_lowercase());
            }
            assert_eq!(&snake, name);
        }
        names.sort_unstable();
        names.dedup();
        assert_eq!(names.len(), all.len());
    }

    #[test]
    fn solved_outcome_maps_every_part_and_nulls_non_finite_numbers() {
        let solution = Solution {
            outputs: vec![
                OutputValue {
                    key: "f",
                    label: "Restraint force",
                    kind: QuantityKind::Force,
                    si: 12_400.0,
                    text: "12.4 kN".into(),
                    headline: true,
                },
                OutputValue {
                    key: "g",
                    label: "Broken",
                    kind: QuantityKind::Force,
                    si: f64::NAN,
                    text: "—".into(),
                    headline: false,
                },
            ],
            tables: vec![Table {
                key: "ledger",
                title: "Ledger".into(),
                columns: vec!["Term".into(), "x".into()],
                rows: vec![vec!["Total".into(), "1 kN".into()]],
                emphasised_rows: vec![0],
            }],
            diagrams: vec![Diagram {
                title: "Plan".into(),
                bounds: [-1.0, -2.0, 3.0, f64::INFINITY],
                shapes: vec![
                    Shape::Polygon {
                        points: vec![[0.0, 0.0], [1.0, 0.0], [1.0, 1.0]],
                        style: ShapeStyle::Wall,
                    },
                    Shape::Polyline {
                        points: vec![[0.0, f64::NAN]],
                        style: ShapeStyle::Flow,
                    },
                    Shape::Circle {
                        center: [0.5, 0.5],
                        radius: 0.25,
                        style: ShapeStyle::ControlVolume,
                    },
                    Shape::Arrow {
                        from: [0.0, 0.0],
                        to: [1.0, 1.0],
                        label: "R".into(),
                        style: ShapeStyle::Restraint,
                    },
                    Shape::Text {
                        at: [0.2, 0.3],
                        text: "inlet".into(),
                        style: ShapeStyle::Label,
                    },
                ],
                caption: "Not to scale.".into(),
            }],
            plots: vec![Plot {
                key: "power",
                title: "Power".into(),
                x_label: "u".into(),
                y_label: "P".into(),
                series: vec![Series {
                    name: "ideal".into(),
                    points: vec![[0.0, 0.0], [1.0, 2.0]],
                }],
                markers: vec![Marker {
                    at: [0.5, 1.0],
                    label: "best".into(),
                }],
            }],
            warnings: vec![
                Warning {
                    field: Some("q"),
                    message: "high velocity".into(),
                },
                Warning {
                    field: None,
                    message: "general".into(),
                },
            ],
            carry_over: Vec::new(),
            checks: Vec::new(),
            defects: Vec::new(),
        };
        let outcome = Outcome {
            echoes: vec![FieldEcho {
                key: "q",
                number: "120".into(),
                unit: "m3/h",
            }],
            result: Ok(solution),
        };
        let view = to_json(&solve_view(&outcome, Some(&sample_spec())));
        assert_eq!(view["ok"], json!(true));
        assert!(view.get("errors").is_none());
        assert_eq!(view["echoes"], json!([{"field": "q", "number": "120", "unit": "m3/h"}]));
        assert_eq!(
            view["outputs"][0],
            json!({"key": "f", "label": "Restraint force", "text": "12.4 kN", "si": 12400.0, "headline": true})
        );
        assert_eq!(view["outputs"][1]["si"], Value::Null);
        assert_eq!(
            view["tables"][0],
            json!({"key": "ledger", "title": "Ledger", "columns": ["Term", "x"], "rows": [["Total", "1 kN"]], "emphasised_rows": [0]})
        );
        let diagram = &view["diagrams"][0];
        assert_eq!(diagram["bounds"], json!([-1.0, -2.0, 3.0, null]));
        assert_eq!(diagram["caption"], json!("Not to scale."));
        assert_eq!(
            diagram["shapes"],
            json!([
                {"type": "polygon", "points": [[0.0, 0.0], [1.0, 0.0], [1.0, 1.0]], "style": "wall"},
                {"type": "polyline", "points": [[0.0, null]], "style": "flow"},
                {"type": "circle", "center": [0.5, 0.5], "radius": 0.25, "style": "control_volume"},
                {"type": "arrow", "from": [0.0, 0.0], "to": [1.0, 1.0], "label": "R", "style": "restraint"},
                {"type": "text", "at": [0.2, 0.3], "text": "inlet", "style": "label"},
            ])
        );
        assert_eq!(
            view["plots"][0],
            json!({"key": "power", "title": "Power", "x_label": "u", "y_label": "P",
                   "series": [{"name": "ideal", "points": [[0.0, 0.0], [1.0, 2.0]]}],
                   "markers": [{"at": [0.5, 1.0], "label": "best"}]})
        );
        assert_eq!(
            view["warnings"],
            json!([{"field": "q", "message": "high velocity"}, {"field": null, "message": "general"}])
        );
    }

    #[test]
    fn field_errors_carry_the_spec_label_and_the_core_message() {
        let spec = sample_spec();
        let out_of_range = FieldErrorKind::OutOfRange {
            min: "0 m3/h".into(),
            max: "360000 m3/h".into(),
            min_inclusive: false,
        };
        let outcome = Outcome {
            echoes: vec![FieldEcho {
                key: "q",
                number: "-3".into(),
                unit: "m3/h",
            }],
            result: Err(SolveError::Fields(vec![
                FieldError::new("q", out_of_range.clone()),
                FieldError::new("mystery", FieldErrorKind::Missing),
            ])),
        };
        let view = to_json(&solve_view(&outcome, Some(&spec)));
        assert_eq!(view["ok"], json!(false));
        assert!(view.get("outputs").is_none());
        assert_eq!(view["echoes"], json!([{"field": "q", "number": "-3", "unit": "m3/h"}]));
        assert_eq!(
            view["errors"],
            json!([
                {"field": "q", "label": "Flow", "message": out_of_range.to_string()},
                {"field": "mystery", "label": "mystery", "message": FieldErrorKind::Missing.to_string()},
            ])
        );
    }

    /// Every registered calculator, solved on its own demo inputs in both unit
    /// systems, comes out as `ok: true` with one numeric `si` per reported output
    /// and only output keys its spec describes.
    #[test]
    fn every_calculator_demo_maps_to_a_solved_view() {
        for spec in calculators::catalog() {
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                let request = fluxledger_core::Request {
                    inputs: fluxledger_core::catalog::demo_inputs(&spec),
                    units: Default::default(),
                    system,
                };
                let outcome = fluxledger_core::solve(spec.key, &request);
                let view = to_json(&solve_view(&outcome, Some(&spec)));
                assert_eq!(view["ok"], json!(true), "{} ({system:?}): {view}", spec.key);
                let outputs = view["outputs"].as_array().cloned().unwrap_or_default();
                assert!(!outputs.is_empty(), "{}: no outputs", spec.key);
                for output in outputs {
                    assert!(output["si"].is_f64(), "{}: {output}", spec.key);
                    let key = output["key"].as_str().unwrap_or_default();
                    assert!(
                        spec.outputs.iter().any(|o| o.key == key),
                        "{}: undescribed output {key}",
                        spec.key
                    );
                }
            }
        }
    }

    #[test]
    fn convert_goes_to_the_field_default_unit_of_the_target_system() {
        // The bend page's pressure field: kPa in SI, psi in US customary (its spec).
        let bend = calculators::spec("bend").expect("bend is registered");
        let p = bend
            .fields
            .iter()
            .find(|f| f.key == "p")
            .expect("bend has a pressure field");
        assert_eq!((p.si_unit, p.us_unit), ("kPa", "psi"));
        // Expected numbers derived from the definitions (NIST SP 811 App. B:
        // psi = 6894.757 293 Pa, psf = 47.880 26 Pa), rounded as the core rounds a
        // converted input: one figure more than typed, at least four. A bare number
        // takes `from_unit`, a typed unit wins.
        let cases: &[(&str, &str, &str, &str, UnitSystem, &str, &str)] = &[
            // 10 bar = 145.0377 psi: "145.0" to four figures, trailing zero dropped.
            ("bend", "p", "10", "bar", UnitSystem::UsCustomary, "145", "psi"),
            ("bend", "p", "10 bar", "kPa", UnitSystem::UsCustomary, "145", "psi"),
            // The thrust-restraint demo's 7 bar showed as 101.526 psi (issue 8).
            (
                "thrust-block",
                "p",
                "7 bar",
                "bar",
                UnitSystem::UsCustomary,
                "101.5",
                "psi",
            ),
            // 150 psi = 1034.214 kPa.
            ("bend", "p", "150", "psi", UnitSystem::Si, "1034", "kPa"),
            // Soil bearing goes to psf, not psi: 150 kPa = 3132.8 psf (20.83 psi).
            (
                "thrust-block",
                "sigma",
                "150",
                "kPa",
                UnitSystem::UsCustomary,
                "3133",
                "psf",
            ),
            (
                "thrust-block",
                "sigma",
                "2000 psf",
                "psf",
                UnitSystem::Si,
                "95.761",
                "kPa",
            ),
        ];
        for (key, field, text, from, system, number, unit) in cases {
            let view = to_json(&convert_view(key, field, text, from, *system));
            assert_eq!(
                view,
                json!({"ok": true, "number": number, "unit": unit}),
                "{key}/{field}: {text} [{from}]"
            );
        }
    }

    #[test]
    fn demo_values_switched_to_either_system_read_rounded() {
        // Every demo quantity converted to the other system shows at most one figure
        // more than it was typed with (four for a demo typed with up to three):
        // "7 bar" gives "101.5", never "101.526".
        let mut converted = 0;
        for spec in calculators::catalog() {
            for field in &spec.fields {
                let FieldKind::Quantity(_) = field.kind else { continue };
                if field.demo.is_empty() {
                    continue;
                }
                for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                    let own = match system {
                        UnitSystem::Si => field.us_unit,
                        UnitSystem::UsCustomary => field.si_unit,
                    };
                    let view = convert_view(spec.key, field.key, field.demo, own, system);
                    let ConvertView::Converted { number, .. } = &view else {
                        panic!(
                            "{}/{}: demo {} not converted: {view:?}",
                            spec.key, field.key, field.demo
                        );
                    };
                    let typed = significant(field.demo);
                    let shown = significant(number);
                    assert!(
                        shown <= typed.max(3) + 1,
                        "{}/{}: demo {} shown as {number} ({shown} figures)",
                        spec.key,
                        field.key,
                        field.demo
                    );
                    converted += 1;
                }
            }
        }
        assert!(converted > 50, "only {converted} demo values converted");
    }

    /// Significant digits of the leading decimal number of `text` (test helper).
    fn significant(text: &str) -> usize {
        let number: String = text
            .trim()
            .chars()
            .take_while(|c| c.is_ascii_digit() || matches!(c, '.' | ',' | '-' | '+'))
            .filter(char::is_ascii_digit)
            .collect();
        number.trim_start_matches('0').len().max(1)
    }

    #[test]
    fn convert_refuses_with_a_message_and_never_throws() {
        for (key, field, text) in [
            ("no-such-page", "p", "10"),
            ("bend", "no-such-field", "10"),
            ("bend", "plane", "horizontal"),
            ("bend", "p", "ten"),
            ("bend", "p", "5 m"),
        ] {
            let view = to_json(&convert_view(key, field, text, "bar", UnitSystem::UsCustomary));
            assert_eq!(view["ok"], json!(false), "{key}/{field}/{text}: {view}");
            assert!(view["message"].as_str().is_some_and(|m| !m.is_empty()), "{view}");
        }
        let view = to_json(&convert_view("bend", "p", "ten", "bar", UnitSystem::UsCustomary));
        assert!(view["message"].as_str().is_some_and(|m| m.contains("ten")), "{view}");
    }

    #[test]
    fn unknown_calculator_is_an_error_without_a_field() {
        let outcome = fluxledger_core::solve("no-such-page", &fluxledger_core::Request::default());
        let view = to_json(&solve_view(&outcome, None));
        assert_eq!(view["ok"], json!(false));
        assert_eq!(view["echoes"], json!([]));
        let errors = view["errors"].as_array().cloned().unwrap_or_default();
        assert_eq!(errors.len(), 1);
        assert_eq!(errors[0]["field"], json!(""));
        assert_eq!(errors[0]["label"], json!(""));
        assert!(
            errors[0]["message"]
                .as_str()
                .is_some_and(|m| m.contains("no-such-page")),
            "{errors:?}"
        );
    }
}
