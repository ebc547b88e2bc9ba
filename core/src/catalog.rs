//! The description of every calculator, and the shape of what solving one returns.
//!
//! A key design decision of this crate: every page of the handbook is *described* by
//! the core, not written by hand in the site. A [`CalculatorSpec`] lists the input
//! fields (key, label, quantity kind, default unit per unit system, demo value,
//! limits, help), the outputs, and which job group the page belongs to. The wasm
//! adapter serialises these descriptions and the site script renders any of them;
//! reference tests drive calculators through the very same [`solve`](crate::solve) entry point
//! with the same typed strings a user would type, so a browser and a test see one
//! code path.
//!
//! Inputs arrive as text (`"150 psi"`, `"12 in"`, `"45"`); they are parsed once, at
//! this edge, by [`crate::units`] into SI values (checked against the field's limits)
//! and handed to the calculator as validated [`Values`]. Outputs leave as SI values
//! together with text formatted in the unit system the page asked for.

use std::collections::BTreeMap;

use crate::error::{Bounds, FieldError, FieldErrorKind};
use crate::units::{self, QuantityKind, UnitSystem};

/// What a field holds.
#[derive(Clone, Debug, PartialEq)]
pub enum FieldKind {
    /// A physical quantity typed with or without a unit.
    Quantity(QuantityKind),
    /// One of a fixed list of options (the stored value is the option key).
    Choice(&'static [ChoiceOption]),
    /// Free text that the calculator parses itself (for example a list of rows).
    Text,
}

impl FieldKind {
    /// The wire name of the kind: `"quantity"`, `"choice"` or `"text"`.
    pub fn key(&self) -> &'static str {
        match self {
            FieldKind::Quantity(_) => "quantity",
            FieldKind::Choice(_) => "choice",
            FieldKind::Text => "text",
        }
    }
}

/// One option of a [`FieldKind::Choice`] field.
#[derive(Clone, Debug, PartialEq)]
pub struct ChoiceOption {
    pub key: &'static str,
    pub label: &'static str,
}

/// Valid range of a quantity field, in SI base units of its kind.
///
/// Validation also refuses any non-zero magnitude below [`smallest_meaningful`] of
/// the field's kind, so a "greater than 0" field does not accept 5e-324 (whose
/// square or reciprocal is no longer a number), and every quantity field must have
/// finite bounds within [`largest_meaningful`] (the registry lint checks this).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Limits {
    pub min: f64,
    pub max: f64,
    /// Whether `min` itself is allowed (`false` for strictly positive sizes).
    pub min_inclusive: bool,
}

impl Limits {
    pub const fn closed(min: f64, max: f64) -> Limits {
        Limits {
            min,
            max,
            min_inclusive: true,
        }
    }
    pub const fn positive(max: f64) -> Limits {
        Limits {
            min: 0.0,
            max,
            min_inclusive: false,
        }
    }
    pub fn contains(&self, value: f64) -> bool {
        let above = if self.min_inclusive {
            value >= self.min
        } else {
            value > self.min
        };
        above && value <= self.max
    }
}

/// The smallest non-zero magnitude of a quantity that means anything in this
/// handbook, SI: a micrometre, a millipascal, a micrometre per second, ... Typed
/// values below it (other than 0 itself) are refused with the field's valid range:
/// they are typing slips or probes, and their squares and reciprocals underflow or
/// overflow. Each is far below any size, pressure or flow in a water main.
pub fn smallest_meaningful(kind: QuantityKind) -> f64 {
    match kind {
        QuantityKind::Length => 1e-6,
        QuantityKind::Area => 1e-12,
        QuantityKind::Volume => 1e-15,
        QuantityKind::ConcreteVolume => 1e-15,
        QuantityKind::Mass => 1e-9,
        QuantityKind::Time => 1e-6,
        QuantityKind::Pressure => 1e-3,
        QuantityKind::SoilBearing => 1e-3,
        QuantityKind::Velocity => 1e-6,
        QuantityKind::Acceleration => 1e-6,
        QuantityKind::VolumeFlow => 1e-12,
        QuantityKind::MassFlow => 1e-9,
        QuantityKind::Force => 1e-6,
        QuantityKind::Torque => 1e-9,
        QuantityKind::Power => 1e-9,
        QuantityKind::Angle => 1e-6,
        QuantityKind::AngularSpeed => 1e-6,
        QuantityKind::Temperature => 1e-3,
        QuantityKind::Density => 1e-3,
        QuantityKind::SpecificWeight => 1e-2,
        QuantityKind::DynamicViscosity => 1e-7,
        QuantityKind::KinematicViscosity => 1e-9,
        QuantityKind::Ratio => 1e-9,
    }
}

/// The largest magnitude a field limit of this kind may have, SI: generous physical
/// ceilings (10 km, 1 TPa, 10 km/s, ...) that keep every accepted input, and what is
/// computed from it, far from overflow. Field limits must lie within ±this value
/// (checked by the registry lint in the tests).
pub fn largest_meaningful(kind: QuantityKind) -> f64 {
    match kind {
        QuantityKind::Length => 1e4,
        QuantityKind::Area => 1e4,
        QuantityKind::Volume => 1e6,
        QuantityKind::ConcreteVolume => 1e6,
        QuantityKind::Mass => 1e9,
        QuantityKind::Time => 1e9,
        QuantityKind::Pressure => 1e12,
        QuantityKind::SoilBearing => 1e12,
        QuantityKind::Velocity => 1e4,
        QuantityKind::Acceleration => 1e3,
        QuantityKind::VolumeFlow => 1e4,
        QuantityKind::MassFlow => 1e7,
        QuantityKind::Force => 1e10,
        QuantityKind::Torque => 1e9,
        QuantityKind::Power => 1e10,
        QuantityKind::Angle => 4.0 * std::f64::consts::PI,
        QuantityKind::AngularSpeed => 1e6,
        QuantityKind::Temperature => 1e4,
        QuantityKind::Density => 1e5,
        QuantityKind::SpecificWeight => 1e6,
        QuantityKind::DynamicViscosity => 1e4,
        QuantityKind::KinematicViscosity => 1e2,
        QuantityKind::Ratio => 1e6,
    }
}

/// The job groups of the contents page, in order. Calculators name one of these.
pub mod group {
    pub const FITTINGS: &str = "Pipe fittings and thrust restraint";
    pub const JETS_AND_ROTORS: &str = "Jets, vanes and reaction turbines";
    pub const FLOW_AND_TANKS: &str = "Flow, profiles and tanks";
}

/// One input field of a calculator.
#[derive(Clone, Debug, PartialEq)]
pub struct FieldSpec {
    /// Stable key used in URLs and reference cases (ASCII, short).
    pub key: &'static str,
    pub label: &'static str,
    pub kind: FieldKind,
    /// Unit id offered first when the page is in SI (`"kPa"`), or `""` for choices/text.
    pub si_unit: &'static str,
    /// Unit id offered first when the page is in US customary (`"psi"`).
    pub us_unit: &'static str,
    /// What the page shows before the user types, taken from the invented demo
    /// scenario (never a reference value). Typed with its unit, e.g. `"45 deg"`.
    pub demo: &'static str,
    /// Valid range in SI; `None` for choices and text.
    pub limits: Option<Limits>,
    /// When `true` an empty value is allowed and the calculator applies its default.
    pub optional: bool,
    /// One or two sentences shown beside the field.
    pub help: &'static str,
    /// Show this field only when another choice field has one of these values:
    /// `(field key, allowed option keys)`.
    pub visible_when: Option<(&'static str, &'static [&'static str])>,
}

impl FieldSpec {
    /// Whether a user can leave the field empty: an optional quantity or text field.
    /// An optional choice is never empty on a page (its list has no blank entry; the
    /// default fills it for a link that lacks it), so it is not called optional there.
    pub fn may_be_left_empty(&self) -> bool {
        self.optional && !matches!(self.kind, FieldKind::Choice(_))
    }
}

/// One output a calculator reports.
#[derive(Clone, Debug, PartialEq)]
pub struct OutputSpec {
    pub key: &'static str,
    pub label: &'static str,
    pub kind: QuantityKind,
    /// Headline outputs are shown large at the top of the results.
    pub headline: bool,
}

impl OutputSpec {
    /// An output shown large at the top of the results.
    pub const fn headline(key: &'static str, label: &'static str, kind: QuantityKind) -> Self {
        OutputSpec {
            key,
            label,
            kind,
            headline: true,
        }
    }
    /// An output listed below the headline ones.
    pub const fn listed(key: &'static str, label: &'static str, kind: QuantityKind) -> Self {
        OutputSpec {
            key,
            label,
            kind,
            headline: false,
        }
    }
}

/// The description of one calculator page.
#[derive(Clone, Debug, PartialEq)]
pub struct CalculatorSpec {
    /// Page key, also the page file name (`bend` → `bend.html`).
    pub key: &'static str,
    pub title: &'static str,
    /// The job group on the contents page.
    pub group: &'static str,
    /// One sentence for the contents page.
    pub summary: &'static str,
    pub fields: Vec<FieldSpec>,
    pub outputs: Vec<OutputSpec>,
    /// Page-specific cautions, shown after the common ones.
    pub cautions: Vec<&'static str>,
}

impl CalculatorSpec {
    pub fn field(&self, key: &str) -> Option<&FieldSpec> {
        self.fields.iter().find(|f| f.key == key)
    }
}

/// Which calculator pages a shared caution concerns.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CautionScope {
    /// Every calculator page.
    Every,
    /// The pages of one job group ([`group`]).
    Group(&'static str),
    /// The pages that have a field with this key (for example `soil`: the pages
    /// that size a block against the ground).
    WithField(&'static str),
}

/// A caution shared by several pages, with the pages it concerns: a page shows
/// only the shared cautions about what it computes (test pressure and soil bearing
/// on the thrust-restraint pages, not on the jet, turbine and tank pages).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Caution {
    pub text: &'static str,
    pub scope: CautionScope,
}

impl Caution {
    /// Whether the page described by `spec` shows this caution.
    pub fn concerns(&self, spec: &CalculatorSpec) -> bool {
        match self.scope {
            CautionScope::Every => true,
            CautionScope::Group(group) => spec.group == group,
            CautionScope::WithField(key) => spec.field(key).is_some(),
        }
    }
}

/// Cautions shared by several calculator pages; each says which pages it concerns.
pub const COMMON_CAUTIONS: &[Caution] = &[
    Caution {
        scope: CautionScope::Group(group::FITTINGS),
        text:
            "Design to the highest pressure the line will see, including the field test pressure and surge, not only \
            the operating pressure.",
    },
    Caution {
        scope: CautionScope::WithField("soil"),
        text: "Soil bearing and friction values need a geotechnical basis and undisturbed ground; blocks must not be \
            undermined by later excavation.",
    },
    Caution {
        scope: CautionScope::Every,
        text: "Results are idealised control-volume balances. They support, and do not replace, the judgement of a \
            licensed engineer and the local codes that govern the work.",
    },
];

/// The shared cautions the page described by `spec` shows, in order.
pub fn common_cautions(spec: &CalculatorSpec) -> impl Iterator<Item = &'static str> + '_ {
    COMMON_CAUTIONS
        .iter()
        .filter(|caution| caution.concerns(spec))
        .map(|caution| caution.text)
}

/// Raw inputs as typed by the user, keyed by field key.
pub type Inputs = BTreeMap<String, String>;

/// A validated input value.
#[derive(Clone, Debug, PartialEq)]
pub enum Value {
    /// SI value of a quantity field.
    Quantity(f64),
    /// Selected option key of a choice field.
    Choice(String),
    Text(String),
    /// An optional field left empty.
    Empty,
}

/// Validated inputs handed to a calculator. After [`validate`], every field of the
/// spec has an entry: a visible, filled-in field holds its parsed value (a quantity
/// in SI, within its limits), while an optional field left empty and a field hidden
/// by its `visible_when` condition hold [`Value::Empty`]. Values built with
/// [`Values::insert`] have not been validated at all.
#[derive(Clone, Debug, Default)]
pub struct Values {
    values: BTreeMap<&'static str, Value>,
}

impl Values {
    /// SI value of a quantity field.
    ///
    /// # Errors
    /// [`FieldErrorKind::Missing`] naming `key` when there is no quantity under it:
    /// an unknown key, a field that is not a quantity, an optional field left empty or
    /// a hidden field (both [`Value::Empty`]). Use [`Values::quantity_or`] for optional
    /// fields.
    pub fn quantity(&self, key: &str) -> Result<f64, FieldError> {
        match self.values.get(key) {
            Some(Value::Quantity(v)) => Ok(*v),
            _ => Err(FieldError::new(key, FieldErrorKind::Missing)),
        }
    }
    /// SI value of an optional quantity field, or `default` when it holds no quantity
    /// (left empty, hidden, or not in the values at all).
    pub fn quantity_or(&self, key: &str, default: f64) -> f64 {
        match self.values.get(key) {
            Some(Value::Quantity(v)) => *v,
            _ => default,
        }
    }
    /// Whether `key` holds a value: `false` for a field left empty, a hidden field and
    /// an unknown key.
    pub fn is_set(&self, key: &str) -> bool {
        !matches!(self.values.get(key), None | Some(Value::Empty))
    }
    pub fn choice(&self, key: &str) -> Result<&str, FieldError> {
        match self.values.get(key) {
            Some(Value::Choice(v)) => Ok(v.as_str()),
            _ => Err(FieldError::new(key, FieldErrorKind::Missing)),
        }
    }
    pub fn text(&self, key: &str) -> Result<&str, FieldError> {
        match self.values.get(key) {
            Some(Value::Text(v)) => Ok(v.as_str()),
            Some(Value::Empty) => Ok(""),
            _ => Err(FieldError::new(key, FieldErrorKind::Missing)),
        }
    }
    /// A required quantity field as a typed `uom` quantity (`Length`, `Pressure`…):
    /// the stored SI value in the quantity's SI base unit.
    pub fn typed<Q: FromSi>(&self, key: &str) -> Result<Q, FieldError> {
        self.quantity(key).map(Q::from_si)
    }
    /// An optional quantity field as a typed quantity, `None` when left empty.
    pub fn typed_opt<Q: FromSi>(&self, key: &str) -> Option<Q> {
        match self.values.get(key) {
            Some(Value::Quantity(v)) => Some(Q::from_si(*v)),
            _ => None,
        }
    }
    /// Sets `key` to `value`, replacing any value already there. Nothing is parsed or
    /// checked against a spec's limits: this builds values directly for calculators
    /// that call each other and for tests, which must respect the limits themselves.
    pub fn insert(&mut self, key: &'static str, value: Value) {
        self.values.insert(key, value);
    }
}

/// A `uom` quantity built from its value in SI base units (what validation stores).
pub trait FromSi {
    fn from_si(value: f64) -> Self;
}

macro_rules! from_si {
    ($($quantity:ident => $unit:path),* $(,)?) => {
        $(impl FromSi for uom::si::f64::$quantity {
            fn from_si(value: f64) -> Self {
                uom::si::f64::$quantity::new::<$unit>(value)
            }
        })*
    };
}

from_si! {
    Length => uom::si::length::meter,
    Area => uom::si::area::square_meter,
    Volume => uom::si::volume::cubic_meter,
    Mass => uom::si::mass::kilogram,
    Time => uom::si::time::second,
    Pressure => uom::si::pressure::pascal,
    Velocity => uom::si::velocity::meter_per_second,
    Acceleration => uom::si::acceleration::meter_per_second_squared,
    VolumeRate => uom::si::volume_rate::cubic_meter_per_second,
    MassRate => uom::si::mass_rate::kilogram_per_second,
    Force => uom::si::force::newton,
    Torque => uom::si::torque::newton_meter,
    Power => uom::si::power::watt,
    Angle => uom::si::angle::radian,
    AngularVelocity => uom::si::angular_velocity::radian_per_second,
    ThermodynamicTemperature => uom::si::thermodynamic_temperature::kelvin,
    MassDensity => uom::si::mass_density::kilogram_per_cubic_meter,
    DynamicViscosity => uom::si::dynamic_viscosity::pascal_second,
    Ratio => uom::si::ratio::ratio,
}

/// An output value with its SI number and its formatted text.
#[derive(Clone, Debug, PartialEq)]
pub struct OutputValue {
    pub key: &'static str,
    pub label: &'static str,
    pub kind: QuantityKind,
    pub si: f64,
    /// Formatted in the requested unit system, unit included (`"12.4 kN"`).
    pub text: String,
    /// The number of `text` alone (`"12.4"`).
    pub number: String,
    /// The unit of `text` (its id, `"kN"`; `"-"` for a plain number).
    pub unit: &'static str,
    pub headline: bool,
}

/// A notice about the result (not an error: the numbers are still shown).
#[derive(Clone, Debug, PartialEq)]
pub struct Warning {
    /// Field the warning is about, if any.
    pub field: Option<&'static str>,
    pub message: String,
}

/// A table of text cells (the ledger, a schedule, a triangle's components).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Table {
    pub key: &'static str,
    pub title: String,
    pub columns: Vec<String>,
    pub rows: Vec<Vec<String>>,
    /// Rows (by index) that are totals or residuals and should stand out.
    pub emphasised_rows: Vec<usize>,
    /// Columns (by index) of text as the user typed it (a fitting's tag): shown as
    /// it is, never read for symbols or numbers ([`ColumnKind::Typed`]).
    pub typed_columns: Vec<usize>,
}

/// Whether a table column holds words, values (numbers, with or without a unit) or
/// text as the user typed it.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ColumnKind {
    /// The core's words: a page shows a symbol's subscript (`C_d`) as one.
    Text,
    Number,
    /// What the user typed (a tag): shown as it is, `TB_3` included.
    Typed,
}

impl ColumnKind {
    pub fn key(self) -> &'static str {
        match self {
            ColumnKind::Text => "text",
            ColumnKind::Number => "number",
            ColumnKind::Typed => "typed",
        }
    }
}

/// How one column of a [`Table`] is shown: its title without the unit, the unit its
/// header names (`"area (mm2)"` → `area`, mm2), and its kind.
#[derive(Clone, Debug, PartialEq)]
pub struct Column {
    pub title: String,
    pub unit: Option<&'static units::UnitDef>,
    pub kind: ColumnKind,
}

impl Table {
    /// The columns as shown, read from the headers and the cells the calculators
    /// wrote: a column whose every filled cell begins with a number (and is not the
    /// row-name column) is a [`ColumnKind::Number`] column, one the calculator marked
    /// typed ([`Table::typed_columns`]) a [`ColumnKind::Typed`] one; a header ending in
    /// a unit id in parentheses names that unit. `—` and empty cells count as neither.
    pub fn layout(&self) -> Vec<Column> {
        self.columns
            .iter()
            .enumerate()
            .map(|(index, header)| {
                let (title, unit) = match header.strip_suffix(')').and_then(|h| h.rsplit_once(" (")) {
                    Some((title, id)) => match units::unit_by_id(id) {
                        Some(unit) => (title.to_string(), Some(unit)),
                        None => (header.clone(), None),
                    },
                    None => (header.clone(), None),
                };
                let mut cells = self
                    .rows
                    .iter()
                    .filter_map(|row| row.get(index))
                    .map(|cell| cell.trim())
                    .filter(|cell| !cell.is_empty() && *cell != "—")
                    .peekable();
                let numeric = index > 0
                    && cells.peek().is_some()
                    && cells.all(|cell| {
                        let head = cell.split(' ').next().unwrap_or(cell);
                        units::split_shown(head).is_some()
                    });
                let kind = if self.typed_columns.contains(&index) {
                    ColumnKind::Typed
                } else if numeric {
                    ColumnKind::Number
                } else {
                    ColumnKind::Text
                };
                Column { title, unit, kind }
            })
            .collect()
    }
}

/// Drawing primitives in model coordinates (metres, x to the right, y up).
#[derive(Clone, Debug, PartialEq)]
pub enum Shape {
    /// A filled or outlined polygon (pipe walls, blocks, vanes).
    Polygon { points: Vec<[f64; 2]>, style: ShapeStyle },
    /// An open polyline (centre lines, jets).
    Polyline { points: Vec<[f64; 2]>, style: ShapeStyle },
    Circle {
        center: [f64; 2],
        radius: f64,
        style: ShapeStyle,
    },
    /// An arrow from `from` to `to`, labelled.
    Arrow {
        from: [f64; 2],
        to: [f64; 2],
        label: String,
        style: ShapeStyle,
    },
    Text {
        at: [f64; 2],
        text: String,
        style: ShapeStyle,
    },
}

impl Shape {
    /// Whether every coordinate and size of the shape is a finite number (a shape
    /// with NaN or ±inf cannot be drawn; every test of accepted inputs asks this).
    pub fn is_finite(&self) -> bool {
        match self {
            Shape::Polygon { points, .. } | Shape::Polyline { points, .. } => {
                points.iter().flatten().all(|x| x.is_finite())
            }
            Shape::Circle { center, radius, .. } => center.iter().all(|x| x.is_finite()) && radius.is_finite(),
            Shape::Arrow { from, to, .. } => from.iter().chain(to).all(|x| x.is_finite()),
            Shape::Text { at, .. } => at.iter().all(|x| x.is_finite()),
        }
    }
}

impl ShapeStyle {
    /// The wire name of the style (`"control_volume"`), the page's CSS class suffix.
    pub fn key(self) -> &'static str {
        match self {
            ShapeStyle::Wall => "wall",
            ShapeStyle::Fluid => "fluid",
            ShapeStyle::ControlVolume => "control_volume",
            ShapeStyle::Flow => "flow",
            ShapeStyle::Restraint => "restraint",
            ShapeStyle::Thrust => "thrust",
            ShapeStyle::Pressure => "pressure",
            ShapeStyle::Momentum => "momentum",
            ShapeStyle::Weight => "weight",
            ShapeStyle::Velocity => "velocity",
            ShapeStyle::Guide => "guide",
            ShapeStyle::Label => "label",
        }
    }
}

/// Semantic style of a shape; the site maps each to a stroke and fill of its own.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ShapeStyle {
    Wall,
    Fluid,
    ControlVolume,
    Flow,
    /// Force the supports (restraint) exert on the fitting.
    Restraint,
    /// Force the fluid exerts on the fitting (thrust).
    Thrust,
    Pressure,
    Momentum,
    Weight,
    Velocity,
    Guide,
    Label,
}

/// A diagram: shapes plus the bounding box to show.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Diagram {
    pub title: String,
    /// `[min_x, min_y, max_x, max_y]` in model coordinates.
    pub bounds: [f64; 4],
    pub shapes: Vec<Shape>,
    /// A caption saying what is to scale and what is not.
    pub caption: String,
}

/// An x–y plot (power against blade speed, torque against speed, ...).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Plot {
    pub key: &'static str,
    pub title: String,
    pub x_label: String,
    pub y_label: String,
    pub series: Vec<Series>,
    /// Marked points (an optimum, the operating point).
    pub markers: Vec<Marker>,
}

#[derive(Clone, Debug, Default, PartialEq)]
pub struct Series {
    pub name: String,
    pub points: Vec<[f64; 2]>,
}

#[derive(Clone, Debug, Default, PartialEq)]
pub struct Marker {
    pub at: [f64; 2],
    pub label: String,
}

/// A link to another calculator with some of its inputs filled from this result
/// (a fitting's thrust carried to the thrust-restraint page).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct CarryOver {
    /// Key of the target calculator.
    pub calculator: &'static str,
    /// Text of the link ("Size a thrust block for this force").
    pub label: String,
    /// Field key → typed text for the target page.
    pub inputs: Vec<(&'static str, String)>,
}

/// A result compared with the same quantity computed by an independent path: a
/// closed form, a second balance, a moment balance about another point, or the
/// mass balance of flows the user gave. Never the same sum restated: a check must be
/// able to fail.
#[derive(Clone, Debug, PartialEq)]
pub struct Check {
    /// What is checked ("Thrust on the supports").
    pub label: String,
    /// The independent path it is compared with ("closed form 2·p·A·sin(θ/2)").
    pub basis: String,
    pub kind: QuantityKind,
    /// The calculator's result, SI.
    pub value: f64,
    /// The independent value, SI.
    pub reference: f64,
    /// Agreement is `|value − reference| ≤ tolerance · scale`.
    pub tolerance: f64,
    /// Magnitude the tolerance is relative to (at least the larger of the two).
    pub scale: f64,
}

impl Check {
    /// `value − reference`.
    pub fn difference(&self) -> f64 {
        self.value - self.reference
    }
    /// Whether both values are finite and agree within the tolerance.
    pub fn agrees(&self) -> bool {
        self.value.is_finite()
            && self.reference.is_finite()
            && self.difference().abs() <= self.tolerance * self.scale.max(self.value.abs()).max(self.reference.abs())
    }
}

/// Everything a solved calculator reports.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Solution {
    pub outputs: Vec<OutputValue>,
    pub tables: Vec<Table>,
    pub diagrams: Vec<Diagram>,
    pub plots: Vec<Plot>,
    pub warnings: Vec<Warning>,
    pub carry_over: Vec<CarryOver>,
    /// Independent checks of the results (also shown as the `checks` table).
    pub checks: Vec<Check>,
    /// Faults of the calculator itself, never of the input: an output that the spec
    /// does not describe, a non-finite output or check. Users see a warning; every
    /// test fails on a non-empty list.
    pub defects: Vec<String>,
}

impl Solution {
    pub fn output(&self, key: &str) -> Option<&OutputValue> {
        self.outputs.iter().find(|o| o.key == key)
    }
}

/// How much of a [`Solution`] a solve builds.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Detail {
    /// Everything: values, warnings, checks, links, tables, diagrams and plots.
    #[default]
    Full,
    /// What is read at a glance: the values, the warnings, the checks (a check that
    /// disagrees is a warning) and the links to a next calculator; no tables,
    /// diagrams or plots, which are neither built nor formatted.
    ///
    /// Why: a page asks for this while every table and figure is off screen, and
    /// building their text is most of a solve's time (the bend's demo, natively:
    /// about 40 % less time for the solve and its headline text).
    /// Everything else is the same as [`Detail::Full`]'s: the builders of the parts
    /// left out get the report only to read ([`Report::table`]), so they cannot add
    /// a value or a warning that a headline solve would miss.
    Headline,
}

/// Builds a [`Solution`]'s outputs in the requested unit system.
#[derive(Debug)]
pub struct Report<'a> {
    spec: &'a CalculatorSpec,
    system: UnitSystem,
    detail: Detail,
    /// What has been written. Tables, diagrams and plots go through
    /// [`Report::table`], [`Report::diagram`] and [`Report::plot`] (they are built
    /// only for [`Detail::Full`]); the tidy test refuses a push to them elsewhere.
    pub solution: Solution,
}

impl<'a> Report<'a> {
    /// A report that builds everything ([`Detail::Full`]).
    pub fn new(spec: &'a CalculatorSpec, system: UnitSystem) -> Report<'a> {
        Report::with_detail(spec, system, Detail::Full)
    }
    pub fn with_detail(spec: &'a CalculatorSpec, system: UnitSystem, detail: Detail) -> Report<'a> {
        Report {
            spec,
            system,
            detail,
            solution: Solution::default(),
        }
    }
    pub fn system(&self) -> UnitSystem {
        self.system
    }
    /// Adds the table `build` makes, for [`Detail::Full`] only. `build` reads the
    /// report (its units, its formatting) and cannot write to it.
    pub fn table(&mut self, build: impl FnOnce(&Report<'a>) -> Table) {
        self.add_parts(|report| vec![build(report)], |solution| &mut solution.tables);
    }
    /// Adds the diagrams `build` makes, for [`Detail::Full`] only (as [`Report::table`]).
    pub fn diagrams(&mut self, build: impl FnOnce(&Report<'a>) -> Vec<Diagram>) {
        self.add_parts(build, |solution| &mut solution.diagrams);
    }
    /// Adds the diagram `build` makes, for [`Detail::Full`] only (as [`Report::table`]).
    pub fn diagram(&mut self, build: impl FnOnce(&Report<'a>) -> Diagram) {
        self.diagrams(|report| vec![build(report)]);
    }
    /// Adds the plots `build` makes, for [`Detail::Full`] only (as [`Report::table`]).
    pub fn plots(&mut self, build: impl FnOnce(&Report<'a>) -> Vec<Plot>) {
        self.add_parts(build, |solution| &mut solution.plots);
    }
    /// Adds the plot `build` makes, for [`Detail::Full`] only (as [`Report::table`]).
    pub fn plot(&mut self, build: impl FnOnce(&Report<'a>) -> Plot) {
        self.plots(|report| vec![build(report)]);
    }
    /// The one place that decides whether parts are built: runs `build` for
    /// [`Detail::Full`] only and appends what it makes to the list `parts` picks.
    fn add_parts<T>(
        &mut self,
        build: impl FnOnce(&Report<'a>) -> Vec<T>,
        parts: impl FnOnce(&mut Solution) -> &mut Vec<T>,
    ) {
        if self.detail == Detail::Full {
            let built = build(self);
            parts(&mut self.solution).extend(built);
        }
    }
    /// Records output `key` (which must be listed in the spec) with its SI value.
    /// An undescribed key or a non-finite value is a defect of the calculator: it is
    /// recorded in [`Solution::defects`] (every test fails on it) and users see a
    /// "could not compute" warning instead of a number.
    pub fn output(&mut self, key: &'static str, si: f64) {
        let Some(spec) = self.spec.outputs.iter().find(|o| o.key == key) else {
            self.defect(format!("output '{key}' is not described in the spec"));
            return;
        };
        if !si.is_finite() {
            self.defect(format!("output '{key}' is not finite ({si})"));
            self.warn(
                None,
                format!(
                    "{} could not be computed for these inputs (a fault in Fluxledger)",
                    spec.label
                ),
            );
            return;
        }
        // One choice of unit and one formatting for the text and its parts.
        let (number, unit) = units::display_parts(si, spec.kind, self.system);
        let text = units::joined_with_id(&number, unit);
        self.solution.outputs.push(OutputValue {
            key: spec.key,
            label: spec.label,
            kind: spec.kind,
            si,
            text,
            number,
            unit: unit.id,
            headline: spec.headline,
        });
    }
    pub fn warn(&mut self, field: Option<&'static str>, message: impl Into<String>) {
        self.solution.warnings.push(Warning {
            field,
            message: message.into(),
        });
    }
    /// Records a fault of the calculator (see [`Solution::defects`]).
    pub fn defect(&mut self, message: impl Into<String>) {
        self.solution.defects.push(message.into());
    }
    /// Records a check of `value` against `reference`, computed by an independent
    /// path named in `basis`; agreement within `tolerance` relative to the larger
    /// magnitude (or `scale`, when larger). A check that disagrees is also a warning
    /// users see in the headline area.
    pub fn check(
        &mut self,
        label: impl Into<String>,
        basis: impl Into<String>,
        kind: QuantityKind,
        value: f64,
        reference: f64,
        tolerance: f64,
        scale: f64,
    ) {
        let check = Check {
            label: label.into(),
            basis: basis.into(),
            kind,
            value,
            reference,
            tolerance,
            scale,
        };
        if !value.is_finite() || !reference.is_finite() {
            self.defect(format!("check '{}' is not finite ({value}, {reference})", check.label));
        } else if !check.agrees() {
            let message = format!(
                "Check failed: {} is {}, but {} gives {}. Do not use this result; please report it.",
                check.label,
                self.fmt(value, kind),
                check.basis,
                self.fmt(reference, kind)
            );
            self.warn(None, message);
        }
        self.solution.checks.push(check);
    }
    /// Formats a value of `kind` in the report's unit system, for people to read
    /// (`12 m²`, `45°`): messages and tables, never text parsed again.
    pub fn fmt(&self, si: f64, kind: QuantityKind) -> String {
        units::format_quantity_labelled(si, kind, self.system)
    }
    /// The solution, with the `checks` table appended when any check was made (for
    /// [`Detail::Full`]).
    pub fn finish(mut self) -> Solution {
        if self.detail == Detail::Full && !self.solution.checks.is_empty() {
            let table = checks_table(&self.solution.checks, self.system);
            self.solution.tables.push(table);
        }
        // Headings are built from unit codes (they also pick the unit the cells
        // are converted to); people read the labels.
        // Plot axes likewise. Most cells hold no code: only those that do are
        // written again.
        let Solution { tables, plots, .. } = &mut self.solution;
        let cells = tables
            .iter_mut()
            .flat_map(|t| t.columns.iter_mut().chain(t.rows.iter_mut().flatten()));
        let axes = plots.iter_mut().flat_map(|p| [&mut p.x_label, &mut p.y_label]);
        for text in cells.chain(axes) {
            if let Some(labelled) = units::relabel_codes(text) {
                *text = labelled;
            }
        }
        self.solution
    }
}

/// The table of independent checks: what is compared with what, both values, the
/// difference and whether they agree.
fn checks_table(checks: &[Check], system: UnitSystem) -> Table {
    let mut table = Table {
        key: "checks",
        title: "Checks by an independent path".to_string(),
        columns: [
            "Result",
            "compared with",
            "this result",
            "independent value",
            "difference",
            "agrees",
        ]
        .iter()
        .map(|c| c.to_string())
        .collect(),
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for (i, c) in checks.iter().enumerate() {
        let scale = c.scale.max(c.value.abs()).max(c.reference.abs());
        let relative = if scale > 0.0 { c.difference().abs() / scale } else { 0.0 };
        table.rows.push(vec![
            c.label.clone(),
            c.basis.clone(),
            units::format_quantity_labelled(c.value, c.kind, system),
            units::format_quantity_labelled(c.reference, c.kind, system),
            format!("{} %", units::format_significant(relative * 100.0, 2)),
            if c.agrees() {
                format!("yes (within {} %)", units::format_significant(c.tolerance * 100.0, 2))
            } else {
                "NO".to_string()
            },
        ]);
        if !c.agrees() {
            table.emphasised_rows.push(i);
        }
    }
    table
}

/// A request to solve one calculator: what the user typed, the unit each field's
/// selector shows (applied to bare numbers), and the page's unit system (used for
/// fields without a selector unit and for formatting results).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Request {
    pub inputs: Inputs,
    /// Selector unit per field key; an unknown or wrong-kind unit id falls back to
    /// the field's default for `system` (see [`default_unit`]). Not the page's unit
    /// system, which is `system` (`system=` in links).
    pub field_units: BTreeMap<String, String>,
    pub system: UnitSystem,
}

/// How one quantity field was read: its number text and the unit applied, so the
/// page can show the selector on the unit actually used and write a canonical URL
/// (`150psi`) without parsing anything itself.
#[derive(Clone, Debug, PartialEq)]
pub struct FieldEcho {
    pub key: &'static str,
    pub number: String,
    pub unit: &'static str,
}

/// The unit applied to bare numbers in `field` for this request.
pub fn selector_unit(field: &FieldSpec, request: &Request) -> &'static str {
    let FieldKind::Quantity(kind) = field.kind else {
        return "";
    };
    if let Some(def) = request
        .field_units
        .get(field.key)
        .and_then(|id| units::find_unit_of(id, kind))
    {
        return def.id;
    }
    default_unit(field, request.system)
}

/// The unit a field starts in for `system`: the spec's `si_unit` or `us_unit`, the
/// other one when that is empty (the one rule; the page receives its result).
pub fn default_unit(field: &FieldSpec, system: UnitSystem) -> &'static str {
    let (own, other) = match system {
        UnitSystem::Si => (field.si_unit, field.us_unit),
        UnitSystem::UsCustomary => (field.us_unit, field.si_unit),
    };
    if own.is_empty() {
        other
    } else {
        own
    }
}

/// Parses and validates raw inputs against a spec, collecting every field error and
/// echoing how each quantity field was read.
pub fn validate(spec: &CalculatorSpec, request: &Request) -> (Vec<FieldEcho>, Result<Values, Vec<FieldError>>) {
    let mut values = Values::default();
    let mut errors = Vec::new();
    let mut echoes = Vec::new();
    for field in &spec.fields {
        let raw = request.inputs.get(field.key).map(|s| s.trim()).unwrap_or("");
        if !is_shown(spec, field, request) {
            // A hidden field does not take part: whatever it holds is kept by the page
            // but neither required nor checked.
            values.insert(field.key, Value::Empty);
            continue;
        }
        if raw.is_empty() {
            if field.optional {
                values.insert(field.key, Value::Empty);
            } else {
                errors.push(FieldError::new(field.key, FieldErrorKind::Missing));
            }
            continue;
        }
        match &field.kind {
            FieldKind::Quantity(kind) => {
                let default_unit = selector_unit(field, request);
                match units::parse_quantity_echo(raw, *kind, default_unit) {
                    Ok((si, number, unit)) => {
                        echoes.push(FieldEcho {
                            key: field.key,
                            number,
                            unit,
                        });
                        let smallest = smallest_meaningful(*kind);
                        if si != 0.0 && si.abs() < smallest && *kind != QuantityKind::Temperature {
                            let shown = |si: f64| units::format_limit(si, *kind, unit);
                            let (max, zero_allowed) = match field.limits {
                                Some(limits) => (shown(limits.max), limits.contains(0.0)),
                                None => (String::new(), true),
                            };
                            let smallest = shown(smallest);
                            errors.push(FieldError::new(
                                field.key,
                                FieldErrorKind::BelowSmallest {
                                    smallest,
                                    zero: shown(0.0),
                                    max,
                                    zero_allowed,
                                },
                            ));
                            continue;
                        }
                        if let Some(limits) = field.limits {
                            if !limits.contains(si) {
                                errors.push(FieldError::new(
                                    field.key,
                                    FieldErrorKind::OutOfRange(bounds_in(limits, *kind, unit)),
                                ));
                                continue;
                            }
                        }
                        values.insert(field.key, Value::Quantity(si));
                    }
                    // What could not be read as a number is told the range to type in,
                    // in the unit its selector shows.
                    Err(error) => errors.push(FieldError::new(
                        field.key,
                        match field.limits {
                            Some(limits) => error.with_bounds(bounds_in(limits, *kind, default_unit)),
                            None => error,
                        },
                    )),
                }
            }
            FieldKind::Choice(options) => {
                if options.iter().any(|o| o.key == raw) {
                    values.insert(field.key, Value::Choice(raw.to_string()));
                } else {
                    errors.push(FieldError::new(
                        field.key,
                        FieldErrorKind::UnknownChoice {
                            allowed: options.iter().map(|o| o.key.to_string()).collect(),
                        },
                    ));
                }
            }
            FieldKind::Text => {
                if raw.chars().count() > MAX_TEXT_CHARS {
                    errors.push(FieldError::new(
                        field.key,
                        FieldErrorKind::TooLong {
                            max_chars: MAX_TEXT_CHARS,
                        },
                    ));
                } else {
                    values.insert(field.key, Value::Text(raw.to_string()));
                }
            }
        }
    }
    let result = if errors.is_empty() { Ok(values) } else { Err(errors) };
    (echoes, result)
}

/// A field's limits as a message states them, in `unit` ([`units::format_limit`]).
fn bounds_in(limits: Limits, kind: QuantityKind, unit: &str) -> Bounds {
    Bounds {
        min: units::format_limit(limits.min, kind, unit),
        max: units::format_limit(limits.max, kind, unit),
        min_inclusive: limits.min_inclusive,
    }
}

/// Whether a field is shown for this request: a field with `visible_when` is shown
/// only while its controlling choice field holds one of the listed options.
pub fn is_visible(field: &FieldSpec, request: &Request) -> bool {
    match field.visible_when {
        None => true,
        Some((controller, allowed)) => {
            let value = request.inputs.get(controller).map(|s| s.trim()).unwrap_or("");
            allowed.contains(&value)
        }
    }
}

/// Whether a field is shown: it is visible and so is every field that controls it
/// (a face height whose proportions selector is hidden for a crest block is hidden
/// too). The chain is followed at most as deep as the spec is long.
pub fn is_shown(spec: &CalculatorSpec, field: &FieldSpec, request: &Request) -> bool {
    shown_when(spec, field).iter().all(|(controller, allowed)| {
        let value = request.inputs.get(*controller).map(|s| s.trim()).unwrap_or("");
        allowed.contains(&value)
    })
}

/// The conditions under which a field is shown: its own `visible_when`, then that of
/// the field controlling it, and so on (followed at most as deep as the spec is
/// long). The field is shown while every condition holds; the page receives this
/// chain and applies it as [`is_shown`] does. An optional choice left empty reads
/// as its demo value (what its page takes an empty choice to mean: an old link
/// without `p_known` has the pressure known at the inlet), so a field shown for
/// that value is also shown while the choice is empty.
pub fn shown_when(spec: &CalculatorSpec, field: &FieldSpec) -> Vec<(&'static str, Vec<&'static str>)> {
    let mut chain = Vec::new();
    let mut current = field;
    for _ in 0..=spec.fields.len() {
        let Some((controller, allowed)) = current.visible_when else {
            break;
        };
        let mut values = allowed.to_vec();
        let next = spec.field(controller);
        if let Some(c) = next {
            if c.optional && matches!(c.kind, FieldKind::Choice(_)) && allowed.contains(&c.demo) {
                values.push("");
            }
        }
        chain.push((controller, values));
        match next {
            Some(next) => current = next,
            None => break,
        }
    }
    chain
}

/// The most characters a free-text field (such as a pasted schedule) accepts.
pub const MAX_TEXT_CHARS: usize = 200_000;

/// A request holding a spec's demo inputs with some fields replaced: the starting
/// point of calculator tests and of links that change a few fields.
pub fn demo_request(spec: &CalculatorSpec, overrides: &[(&str, &str)]) -> Request {
    let mut request = Request {
        inputs: demo_inputs(spec),
        ..Request::default()
    };
    for (key, value) in overrides {
        request.inputs.insert(key.to_string(), value.to_string());
    }
    request
}

/// The demo inputs of a spec, as a user would type them.
pub fn demo_inputs(spec: &CalculatorSpec) -> Inputs {
    spec.fields
        .iter()
        .filter(|f| !f.demo.is_empty())
        .map(|f| (f.key.to_string(), f.demo.to_string()))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shared_cautions_appear_only_on_the_pages_they_concern() {
        let shown = |key: &str| -> Vec<&'static str> {
            let spec = crate::calculators::spec(key).unwrap_or_else(|| panic!("no page {key}"));
            common_cautions(&spec).collect()
        };
        let text = |scope| {
            COMMON_CAUTIONS
                .iter()
                .find(|c| c.scope == scope)
                .map(|c| c.text)
                .unwrap_or_else(|| panic!("no caution for {scope:?}"))
        };
        let pressure = text(CautionScope::Group(group::FITTINGS));
        let soil = text(CautionScope::WithField("soil"));
        let every = text(CautionScope::Every);
        assert_eq!(shown("thrust-block"), [pressure, soil, every]);
        assert_eq!(shown("line-schedule"), [pressure, soil, every]);
        assert_eq!(shown("bend"), [pressure, every]);
        for key in ["vane", "jet-plate", "reaction-arm", "runner", "tank-drain", "profile"] {
            assert_eq!(shown(key), [every], "{key}");
        }
    }

    fn spec() -> CalculatorSpec {
        let field = |key, kind, si_unit, limits| FieldSpec {
            key,
            label: key,
            kind: FieldKind::Quantity(kind),
            si_unit,
            us_unit: si_unit,
            demo: "",
            limits: Some(limits),
            optional: false,
            help: "",
            visible_when: None,
        };
        CalculatorSpec {
            key: "test",
            title: "test",
            group: group::FITTINGS,
            summary: "",
            fields: vec![
                field("d", QuantityKind::Length, "mm", Limits::positive(10.0)),
                field(
                    "angle",
                    QuantityKind::Angle,
                    "deg",
                    Limits::closed(-std::f64::consts::PI, std::f64::consts::PI),
                ),
            ],
            outputs: Vec::new(),
            cautions: Vec::new(),
        }
    }

    fn errors(d: &str, angle: &str) -> Vec<FieldError> {
        let mut request = Request::default();
        request.inputs.insert("d".into(), d.into());
        request.inputs.insert("angle".into(), angle.into());
        match validate(&spec(), &request).1 {
            Ok(_) => Vec::new(),
            Err(errors) => errors,
        }
    }

    /// What cannot be read as a number is told the field's range, in the unit its
    /// selector shows, without trailing zeros. (Every field used to suggest
    /// "e.g. 150 psi", an angle's and a diameter's alike, and name no range.)
    #[test]
    fn a_field_that_cannot_read_its_text_states_its_range_in_its_own_unit() {
        let mut checked = 0;
        for calculator in crate::calculators::CALCULATORS {
            let spec = (calculator.spec)();
            let demo = demo_request(&spec, &[]);
            for field in &spec.fields {
                let (FieldKind::Quantity(_), Some(_)) = (&field.kind, field.limits) else {
                    continue;
                };
                if !is_shown(&spec, field, &demo) {
                    continue;
                }
                let unit = units::unit_by_id(selector_unit(field, &demo)).expect("a selector shows a known unit");
                let suffix = unit.show("");
                for typed in ["abc", "1e400", "-inf", "1..5"] {
                    let request = demo_request(&spec, &[(field.key, typed)]);
                    let errors = validate(&spec, &request).1.err().unwrap_or_default();
                    let Some(error) = errors.iter().find(|e| e.field == field.key) else {
                        panic!("{}: {} accepted {typed:?}", calculator.key, field.key);
                    };
                    let message = error.kind.to_string();
                    let Some((_, after)) = message.split_once(" and at most ") else {
                        panic!("{}: {}: {typed:?}: no range in {message:?}", calculator.key, field.key);
                    };
                    let max = after.split(" (").next().unwrap_or(after);
                    let Some(number) = max.strip_suffix(suffix.as_str()) else {
                        panic!("{}: {}: {message:?} is not in {suffix:?}", calculator.key, field.key);
                    };
                    assert!(
                        number.parse::<f64>().is_ok() && !(number.contains('.') && number.ends_with('0')),
                        "{}: {}: {message:?}",
                        calculator.key,
                        field.key
                    );
                    checked += 1;
                }
            }
        }
        assert!(checked > 200, "only {checked} messages checked");
    }

    #[test]
    fn a_greater_than_zero_field_refuses_the_smallest_subnormal() {
        // 5e-324 mm underflows to 0 m and meets the plain range message below.
        let in_metres = errors("5e-324 m", "0 deg");
        assert!(
            matches!(in_metres[0].kind, FieldErrorKind::BelowSmallest { .. }),
            "{in_metres:?}"
        );
        let found = errors("1e-300 mm", "0 deg");
        assert_eq!(found.len(), 1, "{found:?}");
        assert_eq!(found[0].field, "d");
        let message = found[0].kind.to_string();
        assert!(message.contains("greater than 0 mm"), "{message}");
        assert!(message.contains("at least 0.001 mm"), "{message}");
        assert!(message.contains("at most 10000 mm"), "{message}");
        // Zero and negatives keep the plain range message.
        let zero = errors("0 mm", "0 deg");
        assert!(matches!(zero[0].kind, FieldErrorKind::OutOfRange { .. }), "{zero:?}");
    }

    #[test]
    fn a_field_that_allows_zero_offers_zero_or_the_smallest_value() {
        let found = errors("300 mm", "1e-300 deg");
        assert_eq!(found.len(), 1, "{found:?}");
        assert_eq!(found[0].field, "angle");
        let message = found[0].kind.to_string();
        assert!(message.contains("type 0°"), "{message}");
        assert!(errors("300 mm", "-1e-300 deg").len() == 1);
    }

    #[test]
    fn values_at_and_above_the_smallest_magnitude_are_accepted() {
        assert!(errors("0.001 mm", "0 deg").is_empty());
        assert!(errors("300 mm", "-0.0001 deg").is_empty());
        assert!(errors("10 m", "180 deg").is_empty());
    }

    #[test]
    fn every_kind_has_a_smallest_magnitude_far_below_its_largest() {
        for kind in QuantityKind::ALL {
            let (lo, hi) = (smallest_meaningful(kind), largest_meaningful(kind));
            assert!(lo > 0.0 && hi.is_finite() && hi / lo >= 1e6, "{kind:?}: {lo} .. {hi}");
            // Squares and reciprocals of everything in between stay normal numbers.
            assert!((lo * lo).is_normal() && (hi * hi).is_finite() && (1.0 / lo).is_finite());
        }
    }
}

#[cfg(test)]
mod typed_tests {
    use super::*;
    use uom::si::f64::{Length, Pressure};
    use uom::si::{length::millimeter, pressure::bar};

    #[test]
    fn typed_reads_the_si_value_as_its_quantity() {
        let mut values = Values::default();
        values.insert("d", Value::Quantity(0.3));
        values.insert("p", Value::Quantity(1.0e6));
        values.insert("od", Value::Empty);
        let d: Length = values.typed("d").unwrap();
        let p: Pressure = values.typed("p").unwrap();
        assert!((d.get::<millimeter>() - 300.0).abs() < 1e-9);
        assert!((p.get::<bar>() - 10.0).abs() < 1e-12);
        assert_eq!(values.typed_opt::<Length>("od"), None);
        assert!(values.typed::<Length>("missing").is_err());
    }
}
