//! Serialisable mirrors of the core's descriptions and results, and the pure
//! functions that build them.
//!
//! The core keeps its types free of serde on purpose (it knows nothing of JSON or
//! JavaScript); this module is the one place where they get a wire shape. Every
//! struct here is a copy of a core type with snake_case keys; enum names on the wire
//! are the core's own `key()` (quantity kinds, shape styles, field kinds, unit
//! systems), so there is no mirror enum to keep in step. Nothing here computes,
//! defaults or converts physical values: unit lists and labels come from
//! [`fluxledger_core::units`], default units and visibility rules from
//! [`fluxledger_core::catalog`], messages from the core. Values travel split: an
//! output as `{number, unit, text, shown}`, a table cell as `{text, number, unit,
//! shown}` under per-column `{title, unit, kind}` ([`Table::layout`]), an arrow label
//! as `{label, name, value}`, so the page script takes no text apart.
//!
//! Non-finite numbers are never meant to leave the core (its report filters them),
//! but a NaN or infinity that slipped through is written as `null` here, because
//! `serde-wasm-bindgen` would otherwise pass it to JavaScript unchanged.
//!
//! These functions are plain Rust and are tested natively (the crate is also an
//! `rlib`); only [`crate::catalog`] and [`crate::solve`] touch `JsValue`.

use serde::Serialize;

use fluxledger_core::calculators::{self, Calculator, Outcome};
use fluxledger_core::catalog::{
    self as core_catalog, CalculatorSpec, Diagram, FieldEcho, FieldKind, FieldSpec, OutputSpec, OutputValue, Plot,
    Shape, Solution, Table, Warning, COMMON_CAUTIONS,
};
use fluxledger_core::glossary;
use fluxledger_core::units::{self, UnitSystem};
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

/// What `calculator(key)` returns: one page's description and what its page shows
/// around it (version, unit systems, common cautions), without the other pages.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct PageView {
    pub version: &'static str,
    /// The shared cautions this page concerns.
    pub common_cautions: Vec<&'static str>,
    pub unit_systems: Vec<UnitSystemView>,
    pub calculator: CalculatorView,
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
    /// Units offered in the selector, in order (`[]` for choice and text).
    pub units: Vec<UnitView>,
    /// The unit the field starts in per unit system (`""` for choice and text).
    pub default_units: DefaultUnitsView,
    pub demo: &'static str,
    /// Whether the user may leave it empty ([`core_catalog::FieldSpec::may_be_left_empty`]):
    /// the page marks it "(optional)".
    pub optional: bool,
    pub help: &'static str,
    pub options: Vec<OptionView>,
    /// Every condition under which the field is shown, its controller's first
    /// ([`core_catalog::shown_when`]): shown while all hold.
    pub shown_when: Vec<VisibleWhenView>,
}

/// A unit: its ASCII id (links, selector values) and its label (`m³/h`).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct UnitView {
    pub id: &'static str,
    pub label: &'static str,
}

#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct DefaultUnitsView {
    pub si: &'static str,
    pub us: &'static str,
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

/// The catalog of the calculators `served`.
pub fn catalog_view(served: &[Calculator]) -> CatalogView {
    catalog_view_of(&calculators::catalog_in(served))
}

/// The catalog view of the given specs (separate from [`catalog_view`] so that it can
/// be tested on hand-made specs).
pub fn catalog_view_of(specs: &[CalculatorSpec]) -> CatalogView {
    CatalogView {
        version: env!("CARGO_PKG_VERSION"),
        common_cautions: COMMON_CAUTIONS.iter().map(|caution| caution.text).collect(),
        unit_systems: [UnitSystem::Si, UnitSystem::UsCustomary]
            .into_iter()
            .map(|s| UnitSystemView {
                key: s.key(),
                label: s.label(),
            })
            .collect(),
        calculators: specs.iter().map(calculator_view).collect(),
    }
}

/// The description of one page (`None` for a key that is not among those `served`).
pub fn page_view(served: &[Calculator], key: &str) -> Option<PageView> {
    let spec = calculators::spec_in(served, key)?;
    let catalog = catalog_view_of(&[]);
    Some(PageView {
        version: catalog.version,
        common_cautions: core_catalog::common_cautions(&spec).collect(),
        unit_systems: catalog.unit_systems,
        calculator: calculator_view(&spec),
    })
}

pub fn calculator_view(spec: &CalculatorSpec) -> CalculatorView {
    CalculatorView {
        key: spec.key,
        title: spec.title,
        group: spec.group,
        summary: spec.summary,
        cautions: spec.cautions.clone(),
        fields: spec.fields.iter().map(|f| field_view(spec, f)).collect(),
        outputs: spec.outputs.iter().map(output_spec_view).collect(),
    }
}

pub fn field_view(spec: &CalculatorSpec, field: &FieldSpec) -> FieldView {
    let (quantity, unit_ids, options) = match &field.kind {
        FieldKind::Quantity(q) => (
            Some(q.key()),
            units::units_of(*q)
                .map(|u| UnitView {
                    id: u.id,
                    label: u.label(),
                })
                .collect(),
            Vec::new(),
        ),
        FieldKind::Choice(options) => (
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
        FieldKind::Text => (None, Vec::new(), Vec::new()),
    };
    FieldView {
        key: field.key,
        label: field.label,
        kind: field.kind.key(),
        quantity,
        units: unit_ids,
        default_units: DefaultUnitsView {
            si: core_catalog::default_unit(field, UnitSystem::Si),
            us: core_catalog::default_unit(field, UnitSystem::UsCustomary),
        },
        demo: field.demo,
        optional: field.may_be_left_empty(),
        help: field.help,
        options,
        shown_when: core_catalog::shown_when(spec, field)
            .into_iter()
            .map(|(field, values)| VisibleWhenView {
                field,
                values: values.to_vec(),
            })
            .collect(),
    }
}

fn output_spec_view(output: &OutputSpec) -> OutputSpecView {
    OutputSpecView {
        key: output.key,
        label: output.label,
        quantity: output.kind.key(),
        headline: output.headline,
    }
}

// ---------------------------------------------------------------------------
// Solve

/// What `solve()` returns: `{ok: true, ...}` or `{ok: false, ...}`; what
/// `solve_headline()` returns: `{ok: true, headline_only: true, ...}` or the same
/// `{ok: false, ...}`.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(untagged)]
pub enum SolveView {
    Solved(SolvedView),
    Headline(HeadlineView),
    Failed(FailedView),
}

/// How much of a solved result a solve builds and its view carries: the core's
/// [`Detail`]. The page asks for [`Detail::Headline`] while every table and figure
/// is off screen (a keystroke then waits for nothing else) and for the full result
/// when it catches them up. Tables, diagrams and plots are most of the result's text
/// (on the bend page 16 of its 19 kB), and building them most of a solve's time.
pub use fluxledger_core::catalog::Detail;

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
    /// The target page's title (from its spec).
    pub title: &'static str,
    pub label: String,
    pub inputs: std::collections::BTreeMap<&'static str, String>,
}

/// A solved result without its tables, diagrams and plots ([`Detail::Headline`]):
/// the other fields are those of the [`SolvedView`] of the same outcome.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct HeadlineView {
    /// Always `true`.
    pub ok: bool,
    /// Always `true`: the tables, diagrams and plots were left out.
    pub headline_only: bool,
    pub echoes: Vec<EchoView>,
    pub outputs: Vec<OutputView>,
    pub warnings: Vec<WarningView>,
    pub carry_over: Vec<CarryOverView>,
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
    /// The formatted value with the unit id (`"3.2 m3/h"`).
    pub text: String,
    /// The number alone (`"3.2"`).
    pub number: String,
    /// The unit id (`"m3/h"`; `"-"` for a plain number).
    pub unit: &'static str,
    /// The value as shown, with the unit's label (`"3.2 m³/h"`, `"45°"`).
    pub shown: String,
    pub si: Num,
    pub headline: bool,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct TableView {
    pub key: &'static str,
    pub title: String,
    /// Each column as shown: title, unit label (`""` when the header names none),
    /// kind (`"text"` or `"number"`).
    pub columns: Vec<ColumnView>,
    /// The headers as the core wrote them (for the CSV file).
    pub headers: Vec<String>,
    pub rows: Vec<Vec<CellView>>,
    pub emphasised_rows: Vec<usize>,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ColumnView {
    pub title: String,
    pub unit: &'static str,
    pub kind: &'static str,
}

/// One table cell: the core's text (for the CSV file), the number and unit label
/// when the cell is a value (`null` otherwise), and the text as shown.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct CellView {
    pub text: String,
    pub number: Option<String>,
    pub unit: Option<&'static str>,
    pub shown: String,
}

/// What `upgrade_link()` returns: the link's pairs in today's vocabulary and what
/// was translated (`"basis=od → joint=push_on"`), in link order.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct UpgradeView {
    pub pairs: Vec<(String, String)>,
    pub translations: Vec<String>,
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
        /// The label without a trailing value (`"R ="`), and the value (`"12.4 kN"`);
        /// `name` is the whole label and `value` empty when it ends in no value.
        name: String,
        value: String,
        style: StyleView,
    },
    Text {
        at: [Num; 2],
        text: String,
        /// As for an arrow's label: the text without a trailing value, and the value.
        name: String,
        value: String,
        style: StyleView,
    },
}

/// A shape style's key (`"control_volume"`): [`fluxledger_core::catalog::ShapeStyle::key`].
pub type StyleView = &'static str;

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
    solve_view_with(outcome, spec, Detail::Full)
}

/// The view of a solve outcome carrying `detail`; a failed outcome has the same
/// view whatever the detail.
pub fn solve_view_with(outcome: &Outcome, spec: Option<&CalculatorSpec>, detail: Detail) -> SolveView {
    let echoes = outcome.echoes.iter().map(echo_view).collect();
    match &outcome.result {
        Ok(solution) => match detail {
            Detail::Full => SolveView::Solved(solved_view(echoes, solution)),
            Detail::Headline => SolveView::Headline(headline_view(echoes, solution)),
        },
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
        carry_over: carry_over_views(solution),
    }
}

fn headline_view(echoes: Vec<EchoView>, solution: &Solution) -> HeadlineView {
    HeadlineView {
        ok: true,
        headline_only: true,
        echoes,
        outputs: solution.outputs.iter().map(output_view).collect(),
        warnings: solution.warnings.iter().map(warning_view).collect(),
        carry_over: carry_over_views(solution),
    }
}

fn carry_over_views(solution: &Solution) -> Vec<CarryOverView> {
    solution
        .carry_over
        .iter()
        .map(|c| CarryOverView {
            calculator: c.calculator,
            title: calculators::title(c.calculator).unwrap_or(""),
            label: c.label.clone(),
            inputs: inputs_by_key(&c.inputs),
        })
        .collect()
}

/// A carried-over link's inputs keyed by field (the last of a key given twice).
/// Inserted one by one, not collected: `BTreeMap`'s `from_iter` sorts with the
/// standard library's stable sort, a few kB of every page's module for a list of
/// a handful of keys.
fn inputs_by_key(inputs: &[(&'static str, String)]) -> std::collections::BTreeMap<&'static str, String> {
    let mut map = std::collections::BTreeMap::new();
    for (key, value) in inputs {
        map.insert(*key, value.clone());
    }
    map
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
/// is switched back. The default unit of a system is the core's
/// [`core_catalog::default_unit`], the one the page receives in `default_units`.
pub fn convert_view(
    served: &[Calculator],
    key: &str,
    field: &str,
    text: &str,
    from_unit: &str,
    system: UnitSystem,
) -> ConvertView {
    let Some(spec) = calculators::spec_in(served, key) else {
        return refused(SolveError::UnknownCalculator { key: key.to_string() }.to_string());
    };
    let Some(field_spec) = spec.fields.iter().find(|f| f.key == field) else {
        return refused(format!("the calculator '{key}' has no field '{field}'"));
    };
    let FieldKind::Quantity(kind) = field_spec.kind else {
        return refused(format!("{}: not a quantity, nothing to convert", field_spec.label));
    };
    let unit = core_catalog::default_unit(field_spec, system);
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
    let shown = match units::find_unit(output.unit) {
        Some(unit) => unit.show(&output.number),
        None => output.text.clone(),
    };
    OutputView {
        key: output.key,
        label: output.label,
        text: output.text.clone(),
        number: output.number.clone(),
        unit: output.unit,
        shown,
        si: num(output.si),
        headline: output.headline,
    }
}

/// A cell as it travels: a value (`"12.4 kN"`) gets its number, unit label and
/// shown text (`"12.4 kN"`, `"3 m³/h"`); other text is shown as written.
pub fn cell_view(text: &str) -> CellView {
    match units::split_shown(text) {
        Some((number, unit)) => CellView {
            text: text.to_string(),
            shown: unit.map(|u| u.show(&number)).unwrap_or_else(|| number.clone()),
            unit: unit.map(|u| u.label()),
            number: Some(number),
        },
        None => CellView {
            text: text.to_string(),
            number: None,
            unit: None,
            shown: text.to_string(),
        },
    }
}

pub fn table_view(table: &Table) -> TableView {
    TableView {
        key: table.key,
        title: table.title.clone(),
        columns: table
            .layout()
            .into_iter()
            .map(|c| ColumnView {
                title: c.title,
                unit: c.unit.map(|u| u.label()).unwrap_or(""),
                kind: c.kind.key(),
            })
            .collect(),
        headers: table.columns.clone(),
        rows: table
            .rows
            .iter()
            .map(|row| row.iter().map(|cell| cell_view(cell)).collect())
            .collect(),
        emphasised_rows: table.emphasised_rows.clone(),
    }
}

/// Splits an arrow label that ends in a value (`"R = 12.4 kN"`) into the name
/// (`"R ="`) and the value (`"12.4 kN"`), so that a narrow page can put the value on
/// its own line without reading the text; a label without a value is all name.
pub fn split_label(label: &str) -> (String, String) {
    let words: Vec<&str> = label.split(' ').collect();
    for tail in [2, 1] {
        if words.len() > tail {
            let value = words[words.len() - tail..].join(" ");
            if units::split_shown(&value).is_some() {
                return (words[..words.len() - tail].join(" ").trim_end().to_string(), value);
            }
        }
    }
    (label.to_string(), String::new())
}

/// Reads a link's `(key, value)` pairs for page `key` in today's vocabulary, through
/// the core's alias table ([`glossary::upgrade`]). Pairs this page already
/// understands (a key it has, with any value but a renamed one it no longer offers)
/// pass unchanged, so a key still in use is never mistranslated. The
/// unit system's key `units=` is read as `system=` (unless the link gives both) and
/// reported the same way.
pub fn upgrade_view(served: &[Calculator], page: &str, pairs: &[(String, String)]) -> UpgradeView {
    let spec = calculators::spec_in(served, page);
    // A key the page has is never renamed; its value only when the glossary renames
    // that value and the page no longer offers it.
    let understood = |key: &str, value: &str| {
        key == "system"
            || spec
                .as_ref()
                .and_then(|s| s.field(key))
                .is_some_and(|field| match field.kind {
                    FieldKind::Choice(options) => {
                        options.iter().any(|o| o.key == value)
                            || !glossary::VALUE_ALIASES
                                .iter()
                                .any(|a| a.page == page && a.key == key && a.old == value)
                    }
                    _ => true,
                })
    };
    let given = |key: &str| pairs.iter().any(|(k, _)| k == key);
    let mut out = UpgradeView::default();
    for (key, value) in pairs {
        if understood(key, value) {
            out.pairs.push((key.clone(), value.clone()));
            continue;
        }
        if key == "units" {
            if !given("system") {
                out.translations.push(format!("units={value} → system={value}"));
                out.pairs.push(("system".to_string(), value.clone()));
            }
            continue;
        }
        let one = glossary::upgrade(page, &[(key.clone(), value.clone())]);
        match (one.pairs.first(), one.translations.first()) {
            (Some((new_key, new_value)), Some(translation)) => {
                if new_key != key && given(new_key) {
                    // The link carries both: today's key wins, the old one is dropped.
                    continue;
                }
                out.translations.push(translation.to_string());
                out.pairs.push((new_key.clone(), new_value.clone()));
            }
            _ => out.pairs.push((key.clone(), value.clone())),
        }
    }
    out
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
            style: style.key(),
        },
        Shape::Polyline { points: ps, style } => ShapeView::Polyline {
            points: points(ps),
            style: style.key(),
        },
        Shape::Circle { center, radius, style } => ShapeView::Circle {
            center: point(*center),
            radius: num(*radius),
            style: style.key(),
        },
        Shape::Arrow { from, to, label, style } => {
            let (name, value) = split_label(label);
            ShapeView::Arrow {
                from: point(*from),
                to: point(*to),
                label: label.clone(),
                name,
                value,
                style: style.key(),
            }
        }
        Shape::Text { at, text, style } => {
            let (name, value) = split_label(text);
            ShapeView::Text {
                at: point(*at),
                text: text.clone(),
                name,
                value,
                style: style.key(),
            }
        }
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
    use fluxledger_core::catalog::{ChoiceOption, Limits, Marker, Series, ShapeStyle};
    use fluxledger_core::error::Bounds;
    use fluxledger_core::units::QuantityKind;
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
        let view = catalog_view(calculators::CALCULATORS);
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
        let ids: Vec<Value> = q["units"]
            .as_array()
            .cloned()
            .unwrap_or_default()
            .iter()
            .map(|u| u["id"].clone())
            .collect();
        assert_eq!(json!(ids), json!(expected_units));
        assert_eq!(q["units"][0], json!({"id": "m3/h", "label": "m³/h"}));
        assert_eq!(q["options"], json!([]));
        assert_eq!(q["shown_when"], json!([]));
        assert_eq!(q["default_units"], json!({"si": "m3/h", "us": "gpm"}));
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
        assert_eq!(note["shown_when"], json!([{"field": "layout", "values": ["vertical"]}]));
        assert_eq!(layout["default_units"], json!({"si": "", "us": ""}));
    }

    /// The vessel keeps its shape optional so that an old draining-tank link (which has
    /// no shape) still reads; on the page the shape list has no blank entry, so it must
    /// not read "(optional)". Its height, which may be left empty, must.
    #[test]
    fn an_optional_choice_is_not_shown_as_optional_but_an_optional_quantity_is() {
        let spec = fluxledger_core::calculators::spec("tank-drain").expect("the vessel page");
        let view = to_json(&calculator_view(&spec));
        let field = |key: &str| {
            view["fields"]
                .as_array()
                .and_then(|fields| fields.iter().find(|f| f["key"] == json!(key)))
                .cloned()
                .unwrap_or_else(|| panic!("no field {key}"))
        };
        assert!(
            spec.field("vessel_shape").is_some_and(|f| f.optional),
            "the shape is optional in the core"
        );
        assert_eq!(field("vessel_shape")["optional"], json!(false));
        assert_eq!(field("h_vessel")["optional"], json!(true));
        for f in view["fields"].as_array().into_iter().flatten() {
            assert!(!(f["kind"] == json!("choice") && f["optional"] == json!(true)), "{f}");
        }
    }

    #[test]
    fn every_quantity_kind_name_is_distinct_snake_case() {
        let all = QuantityKind::ALL;
        let mut names: Vec<&str> = all.iter().map(|k| k.key()).collect();
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
                    number: "12.4".into(),
                    unit: "kN",
                    headline: true,
                },
                OutputValue {
                    key: "g",
                    label: "Broken",
                    kind: QuantityKind::Force,
                    si: f64::NAN,
                    text: "—".into(),
                    number: "—".into(),
                    unit: "kN",
                    headline: false,
                },
            ],
            tables: vec![Table {
                key: "ledger",
                title: "Ledger".into(),
                columns: vec!["Term".into(), "x".into()],
                rows: vec![vec!["Total".into(), "1 kN".into()]],
                emphasised_rows: vec![0],
                typed_columns: Vec::new(),
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
            json!({"key": "f", "label": "Restraint force", "text": "12.4 kN", "number": "12.4", "unit": "kN",
                   "shown": "12.4 kN", "si": 12400.0, "headline": true})
        );
        assert_eq!(view["outputs"][1]["si"], Value::Null);
        assert_eq!(
            view["tables"][0],
            json!({"key": "ledger", "title": "Ledger",
                   "columns": [{"title": "Term", "unit": "", "kind": "text"}, {"title": "x", "unit": "", "kind": "number"}],
                   "headers": ["Term", "x"],
                   "rows": [[{"text": "Total", "number": null, "unit": null, "shown": "Total"},
                             {"text": "1 kN", "number": "1", "unit": "kN", "shown": "1 kN"}]],
                   "emphasised_rows": [0]})
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
                {"type": "arrow", "from": [0.0, 0.0], "to": [1.0, 1.0], "label": "R", "name": "R", "value": "",
                 "style": "restraint"},
                {"type": "text", "at": [0.2, 0.3], "text": "inlet", "name": "inlet", "value": "", "style": "label"},
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
        let out_of_range = FieldErrorKind::OutOfRange(Bounds {
            min: "0 m3/h".into(),
            max: "360000 m3/h".into(),
            min_inclusive: false,
        });
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
                    field_units: Default::default(),
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
            let view = to_json(&convert_view(calculators::CALCULATORS, key, field, text, from, *system));
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
                    let view = convert_view(calculators::CALCULATORS, spec.key, field.key, field.demo, own, system);
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
            let view = to_json(&convert_view(
                calculators::CALCULATORS,
                key,
                field,
                text,
                "bar",
                UnitSystem::UsCustomary,
            ));
            assert_eq!(view["ok"], json!(false), "{key}/{field}/{text}: {view}");
            assert!(view["message"].as_str().is_some_and(|m| !m.is_empty()), "{view}");
        }
        let view = to_json(&convert_view(
            calculators::CALCULATORS,
            "bend",
            "p",
            "ten",
            "bar",
            UnitSystem::UsCustomary,
        ));
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

    #[test]
    fn table_columns_carry_title_unit_and_kind_and_cells_their_parts() {
        let table = Table {
            key: "t",
            title: "T".into(),
            columns: vec![
                "Term".into(),
                "area (mm2)".into(),
                "note".into(),
                "flow".into(),
                "tag".into(),
            ],
            rows: vec![
                vec![
                    "inlet".into(),
                    "12.5".into(),
                    "pressure side".into(),
                    "3.2 m3/h".into(),
                    "TB_1".into(),
                ],
                vec![
                    "outlet".into(),
                    "—".into(),
                    "12 too".into(),
                    "45 deg".into(),
                    "12".into(),
                ],
            ],
            emphasised_rows: Vec::new(),
            // A column of what the user typed is typed even where it reads as a number.
            typed_columns: vec![4],
        };
        let view = to_json(&table_view(&table));
        assert_eq!(
            view["columns"],
            json!([
                {"title": "Term", "unit": "", "kind": "text"},
                {"title": "area", "unit": "mm²", "kind": "number"},
                {"title": "note", "unit": "", "kind": "text"},
                {"title": "flow", "unit": "", "kind": "number"},
                {"title": "tag", "unit": "", "kind": "typed"},
            ])
        );
        assert_eq!(
            view["rows"][0][3],
            json!({"text": "3.2 m3/h", "number": "3.2", "unit": "m³/h", "shown": "3.2 m³/h"})
        );
        assert_eq!(view["rows"][1][3]["shown"], json!("45°"));
        assert_eq!(view["rows"][1][2]["number"], Value::Null);
    }

    #[test]
    fn arrow_labels_split_into_name_and_value_only_when_they_end_in_one() {
        for (label, name, value) in [
            ("R = 12.4 kN", "R =", "12.4 kN"),
            ("Restraint 3.1 kip", "Restraint", "3.1 kip"),
            ("V1 2.5 m/s", "V1", "2.5 m/s"),
            ("ratio 0.5", "ratio", "0.5"),
            ("Flow", "Flow", ""),
            ("Flow out at 2 points", "Flow out at 2 points", ""),
            ("12 kN", "12 kN", ""),
        ] {
            assert_eq!(split_label(label), (name.to_string(), value.to_string()), "{label}");
        }
    }

    fn link(list: &[(&str, &str)]) -> Vec<(String, String)> {
        list.iter().map(|(k, v)| (k.to_string(), v.to_string())).collect()
    }

    #[test]
    fn old_links_upgrade_through_the_glossary_and_keys_in_use_pass_unchanged() {
        // Every alias whose old key this page no longer has is translated as the
        // core's glossary says; a key the page has today is never touched.
        for alias in glossary::KEY_ALIASES {
            let Some(spec) = calculators::spec(alias.page) else {
                continue;
            };
            let option = spec.field(alias.old).and_then(|f| match f.kind {
                FieldKind::Choice(options) => options.first().map(|o| o.key),
                _ => None,
            });
            let value = option.or(alias.values.first().map(|(old, _)| *old)).unwrap_or("1");
            let up = upgrade_view(calculators::CALCULATORS, alias.page, &link(&[(alias.old, value)]));
            if spec.field(alias.old).is_some() {
                assert_eq!(up.pairs, link(&[(alias.old, value)]), "{}: {}", alias.page, alias.old);
                assert!(up.translations.is_empty());
                // A field left blank in a link is still this page's field.
                let blank = upgrade_view(calculators::CALCULATORS, alias.page, &link(&[(alias.old, "")]));
                assert_eq!(blank.pairs, link(&[(alias.old, "")]), "{}: {}", alias.page, alias.old);
            } else {
                let core = glossary::upgrade(alias.page, &link(&[(alias.old, value)]));
                assert_eq!(up.pairs, core.pairs, "{}: {}", alias.page, alias.old);
                assert_eq!(up.translations.len(), 1);
            }
        }
        let up = upgrade_view(
            calculators::CALCULATORS,
            "bend",
            &link(&[("units", "us"), ("angle", "45deg")]),
        );
        assert_eq!(up.pairs, link(&[("system", "us"), ("angle", "45deg")]));
        assert_eq!(up.translations, ["units=us → system=us"]);
        let both = upgrade_view(
            calculators::CALCULATORS,
            "bend",
            &link(&[("units", "us"), ("system", "si")]),
        );
        assert_eq!(both.pairs, link(&[("system", "si")]));
        assert!(both.translations.is_empty());
        let unknown = upgrade_view(calculators::CALCULATORS, "bend", &link(&[("zzz", "1")]));
        assert_eq!(unknown.pairs, link(&[("zzz", "1")]));
        assert!(unknown.translations.is_empty());
    }

    #[test]
    fn page_view_describes_one_calculator_and_refuses_unknown_keys() {
        let page = page_view(calculators::CALCULATORS, "bend").map(|p| p.calculator.key);
        assert_eq!(page, Some("bend"));
        assert!(page_view(calculators::CALCULATORS, "no-such-page").is_none());
    }
}
