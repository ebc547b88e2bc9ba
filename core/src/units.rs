//! Units: a strict parser for typed quantities and a formatter for results.
//!
//! "Units only at the boundary": every value is converted to SI base units (metre,
//! kilogram, second, newton, pascal, kelvin, radian) where the user's text arrives,
//! and back where a result leaves. Inside the core everything is SI.
//!
//! Conversion factors are exact by definition unless noted. Source: NIST Special
//! Publication 811 (2008 edition), *Guide for the Use of the International System of
//! Units*, Appendix B (inch = 0.0254 m, foot = 0.3048 m, pound (avoirdupois) =
//! 0.453 592 37 kg, standard gravity 9.806 65 m/s², US gallon = 231 in³ =
//! 3.785 411 784 L, horsepower (550 ft·lbf/s) = 745.699 871 582 270 2 W), and the
//! BIPM SI Brochure (9th edition, 2019) for bar = 10⁵ Pa and the litre.
//!
//! Parsing rules: `"150 psi"`, `"150psi"`, `"1.2e3 kPa"` and `"1,5 bar"` are
//! accepted; a bare number takes the field's unit; a comma is a decimal comma only
//! when it cannot be a thousands separator (`"1,5"` yes, `"1,500"` is refused as
//! ambiguous); NaN, infinities and text are refused with a typed error.

use crate::error::FieldErrorKind;

/// Standard acceleration of gravity, m/s² (exact; BIPM SI Brochure, CGPM 1901).
pub const STANDARD_GRAVITY: f64 = 9.80665;
/// Standard atmosphere, Pa (exact; BIPM).
pub const STANDARD_ATMOSPHERE: f64 = 101_325.0;

const INCH: f64 = 0.0254;
const FOOT: f64 = 0.3048;
const POUND_MASS: f64 = 0.45359237;
const POUND_FORCE: f64 = POUND_MASS * STANDARD_GRAVITY; // 4.448 221 615 260 5 N
const US_GALLON: f64 = 231.0 * INCH * INCH * INCH; // 3.785 411 784e-3 m³
const PSI: f64 = POUND_FORCE / (INCH * INCH); // 6894.757 293 168 Pa
const HORSEPOWER: f64 = 550.0 * FOOT * POUND_FORCE; // 745.699 871 582 270 2 W

/// The kind of physical quantity a field or output holds. The SI base unit of each
/// kind is given in its doc.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum QuantityKind {
    /// m
    Length,
    /// m²
    Area,
    /// m³
    Volume,
    /// kg
    Mass,
    /// s
    Time,
    /// Pa (gauge or absolute as the field says)
    Pressure,
    /// m/s
    Velocity,
    /// m/s²
    Acceleration,
    /// m³/s
    VolumeFlow,
    /// kg/s
    MassFlow,
    /// N
    Force,
    /// N·m
    Torque,
    /// W
    Power,
    /// rad
    Angle,
    /// rad/s
    AngularSpeed,
    /// K
    Temperature,
    /// kg/m³
    Density,
    /// N/m³ (unit weight of concrete or soil)
    SpecificWeight,
    /// Pa·s
    DynamicViscosity,
    /// m²/s
    KinematicViscosity,
    /// dimensionless (loss coefficients, factors, counts, efficiencies)
    Ratio,
}

impl QuantityKind {
    /// Every kind, in declaration order.
    pub const ALL: [QuantityKind; 21] = [
        QuantityKind::Length,
        QuantityKind::Area,
        QuantityKind::Volume,
        QuantityKind::Mass,
        QuantityKind::Time,
        QuantityKind::Pressure,
        QuantityKind::Velocity,
        QuantityKind::Acceleration,
        QuantityKind::VolumeFlow,
        QuantityKind::MassFlow,
        QuantityKind::Force,
        QuantityKind::Torque,
        QuantityKind::Power,
        QuantityKind::Angle,
        QuantityKind::AngularSpeed,
        QuantityKind::Temperature,
        QuantityKind::Density,
        QuantityKind::SpecificWeight,
        QuantityKind::DynamicViscosity,
        QuantityKind::KinematicViscosity,
        QuantityKind::Ratio,
    ];

    /// A plain name for messages ("a unit of pressure").
    pub fn name(self) -> &'static str {
        match self {
            QuantityKind::Length => "length",
            QuantityKind::Area => "area",
            QuantityKind::Volume => "volume",
            QuantityKind::Mass => "mass",
            QuantityKind::Time => "time",
            QuantityKind::Pressure => "pressure",
            QuantityKind::Velocity => "velocity",
            QuantityKind::Acceleration => "acceleration",
            QuantityKind::VolumeFlow => "volumetric flow",
            QuantityKind::MassFlow => "mass flow",
            QuantityKind::Force => "force",
            QuantityKind::Torque => "torque",
            QuantityKind::Power => "power",
            QuantityKind::Angle => "angle",
            QuantityKind::AngularSpeed => "rotational speed",
            QuantityKind::Temperature => "temperature",
            QuantityKind::Density => "density",
            QuantityKind::SpecificWeight => "unit weight",
            QuantityKind::DynamicViscosity => "dynamic viscosity",
            QuantityKind::KinematicViscosity => "kinematic viscosity",
            QuantityKind::Ratio => "a plain number",
        }
    }
}

/// Which family of units a page prefers by default.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum UnitSystem {
    #[default]
    Si,
    UsCustomary,
}

impl UnitSystem {
    pub fn key(self) -> &'static str {
        match self {
            UnitSystem::Si => "si",
            UnitSystem::UsCustomary => "us",
        }
    }
    pub fn from_key(key: &str) -> Option<UnitSystem> {
        match key {
            "si" => Some(UnitSystem::Si),
            "us" => Some(UnitSystem::UsCustomary),
            _ => None,
        }
    }
}

/// One unit: `si = value * factor + offset`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct UnitDef {
    /// ASCII id used in URLs and selectors (`"m3/h"`).
    pub id: &'static str,
    pub kind: QuantityKind,
    pub factor: f64,
    pub offset: f64,
    /// Other spellings accepted when typed (`"gal/min"` for `"gpm"`).
    pub aliases: &'static [&'static str],
}

const fn u(id: &'static str, kind: QuantityKind, factor: f64) -> UnitDef {
    UnitDef {
        id,
        kind,
        factor,
        offset: 0.0,
        aliases: &[],
    }
}
const fn ua(id: &'static str, kind: QuantityKind, factor: f64, aliases: &'static [&'static str]) -> UnitDef {
    UnitDef {
        id,
        kind,
        factor,
        offset: 0.0,
        aliases,
    }
}

use QuantityKind as Q;

/// Every unit the parser knows, grouped by kind; within a kind, the order is the
/// order offered in unit selectors.
pub const UNITS: &[UnitDef] = &[
    u("m", Q::Length, 1.0),
    u("mm", Q::Length, 1e-3),
    u("cm", Q::Length, 1e-2),
    u("km", Q::Length, 1e3),
    ua("in", Q::Length, INCH, &["inch", "inches", "\""]),
    ua("ft", Q::Length, FOOT, &["feet", "foot", "'"]),
    ua("yd", Q::Length, 3.0 * FOOT, &[]),
    u("m2", Q::Area, 1.0),
    u("mm2", Q::Area, 1e-6),
    u("cm2", Q::Area, 1e-4),
    ua("in2", Q::Area, INCH * INCH, &["sqin", "sq in"]),
    ua("ft2", Q::Area, FOOT * FOOT, &["sqft", "sq ft"]),
    u("m3", Q::Volume, 1.0),
    ua("L", Q::Volume, 1e-3, &["l", "litre", "liter"]),
    ua("ft3", Q::Volume, FOOT * FOOT * FOOT, &["cuft", "cu ft"]),
    ua("yd3", Q::Volume, 27.0 * FOOT * FOOT * FOOT, &["cuyd", "cu yd"]),
    ua("gal", Q::Volume, US_GALLON, &["usgal"]),
    u("in3", Q::Volume, INCH * INCH * INCH),
    u("kg", Q::Mass, 1.0),
    ua("t", Q::Mass, 1e3, &["tonne"]),
    ua("lb", Q::Mass, POUND_MASS, &["lbm", "lbs"]),
    ua("ton", Q::Mass, 2000.0 * POUND_MASS, &["shortton"]),
    u("s", Q::Time, 1.0),
    ua("min", Q::Time, 60.0, &[]),
    ua("h", Q::Time, 3600.0, &["hr"]),
    u("kPa", Q::Pressure, 1e3),
    u("bar", Q::Pressure, 1e5),
    u("MPa", Q::Pressure, 1e6),
    u("Pa", Q::Pressure, 1.0),
    u("mbar", Q::Pressure, 1e2),
    ua("psi", Q::Pressure, PSI, &["lbf/in2", "psig"]),
    ua("psf", Q::Pressure, POUND_FORCE / (FOOT * FOOT), &["lbf/ft2"]),
    u("ksf", Q::Pressure, 1e3 * POUND_FORCE / (FOOT * FOOT)),
    u("ksi", Q::Pressure, 1e3 * PSI),
    u("m/s", Q::Velocity, 1.0),
    u("km/h", Q::Velocity, 1.0 / 3.6),
    ua("ft/s", Q::Velocity, FOOT, &["fps"]),
    ua("ft/min", Q::Velocity, FOOT / 60.0, &["fpm"]),
    u("mph", Q::Velocity, 1609.344 / 3600.0),
    ua("m/s2", Q::Acceleration, 1.0, &[]),
    u("ft/s2", Q::Acceleration, FOOT),
    ua("m3/h", Q::VolumeFlow, 1.0 / 3600.0, &[]),
    u("m3/s", Q::VolumeFlow, 1.0),
    ua("L/s", Q::VolumeFlow, 1e-3, &["l/s"]),
    ua("L/min", Q::VolumeFlow, 1e-3 / 60.0, &["l/min"]),
    ua("gpm", Q::VolumeFlow, US_GALLON / 60.0, &["gal/min", "usgpm"]),
    ua("ft3/s", Q::VolumeFlow, FOOT * FOOT * FOOT, &["cfs"]),
    u("MGD", Q::VolumeFlow, 1e6 * US_GALLON / 86_400.0),
    u("kg/s", Q::MassFlow, 1.0),
    u("kg/h", Q::MassFlow, 1.0 / 3600.0),
    u("t/h", Q::MassFlow, 1e3 / 3600.0),
    u("lb/s", Q::MassFlow, POUND_MASS),
    ua("lb/h", Q::MassFlow, POUND_MASS / 3600.0, &["lb/hr"]),
    u("N", Q::Force, 1.0),
    u("kN", Q::Force, 1e3),
    u("MN", Q::Force, 1e6),
    u("lbf", Q::Force, POUND_FORCE),
    ua("kip", Q::Force, 1e3 * POUND_FORCE, &["kips"]),
    ua("N.m", Q::Torque, 1.0, &["Nm", "N*m"]),
    ua("kN.m", Q::Torque, 1e3, &["kNm", "kN*m"]),
    ua(
        "lbf.ft",
        Q::Torque,
        POUND_FORCE * FOOT,
        &["ft.lbf", "lbf*ft", "ftlbf", "lb-ft", "ft-lb"],
    ),
    ua(
        "lbf.in",
        Q::Torque,
        POUND_FORCE * INCH,
        &["in.lbf", "lbf*in", "lb-in", "in-lb"],
    ),
    u("W", Q::Power, 1.0),
    u("kW", Q::Power, 1e3),
    u("MW", Q::Power, 1e6),
    ua("hp", Q::Power, HORSEPOWER, &[]),
    ua("ft.lbf/s", Q::Power, FOOT * POUND_FORCE, &[]),
    ua(
        "deg",
        Q::Angle,
        std::f64::consts::PI / 180.0,
        &["°", "degree", "degrees"],
    ),
    u("rad", Q::Angle, 1.0),
    u("rad/s", Q::AngularSpeed, 1.0),
    ua(
        "rpm",
        Q::AngularSpeed,
        2.0 * std::f64::consts::PI / 60.0,
        &["rev/min", "r/min"],
    ),
    u("rev/s", Q::AngularSpeed, 2.0 * std::f64::consts::PI),
    UnitDef {
        id: "degC",
        kind: Q::Temperature,
        factor: 1.0,
        offset: 273.15,
        aliases: &["°C", "C", "celsius"],
    },
    UnitDef {
        id: "degF",
        kind: Q::Temperature,
        factor: 5.0 / 9.0,
        offset: 273.15 - 32.0 * 5.0 / 9.0,
        aliases: &["°F", "F", "fahrenheit"],
    },
    u("K", Q::Temperature, 1.0),
    u("kg/m3", Q::Density, 1.0),
    ua("g/cm3", Q::Density, 1e3, &["g/mL", "g/ml"]),
    ua("lb/ft3", Q::Density, POUND_MASS / (FOOT * FOOT * FOOT), &["lbm/ft3"]),
    u("kN/m3", Q::SpecificWeight, 1e3),
    u("N/m3", Q::SpecificWeight, 1.0),
    ua(
        "lbf/ft3",
        Q::SpecificWeight,
        POUND_FORCE / (FOOT * FOOT * FOOT),
        &["pcf"],
    ),
    ua("mPa.s", Q::DynamicViscosity, 1e-3, &["mPas", "cP", "cp"]),
    ua("Pa.s", Q::DynamicViscosity, 1.0, &["Pas", "Pa*s"]),
    ua(
        "lb/(ft.s)",
        Q::DynamicViscosity,
        POUND_MASS / FOOT,
        &["lb/ft.s", "lb/ft/s"],
    ),
    ua("lbf.s/ft2", Q::DynamicViscosity, POUND_FORCE / (FOOT * FOOT), &[]),
    ua("mm2/s", Q::KinematicViscosity, 1e-6, &["cSt", "cst"]),
    u("m2/s", Q::KinematicViscosity, 1.0),
    u("ft2/s", Q::KinematicViscosity, FOOT * FOOT),
    ua("-", Q::Ratio, 1.0, &["1"]),
    u("%", Q::Ratio, 0.01),
];

/// The units of one kind, in selector order.
pub fn units_of(kind: QuantityKind) -> impl Iterator<Item = &'static UnitDef> {
    UNITS.iter().filter(move |u| u.kind == kind)
}

/// Finds a unit by id or alias. Exact matches win; otherwise a case-insensitive
/// match is accepted when it is unique (so `KPA` finds `kPa`, but `MM` is refused
/// rather than guessed between `mm` and `Mm`).
pub fn find_unit(text: &str) -> Option<&'static UnitDef> {
    let norm = normalise_unit(text);
    if let Some(def) = UNITS
        .iter()
        .find(|u| u.id == norm || u.aliases.contains(&norm.as_str()))
    {
        return Some(def);
    }
    let mut found = UNITS
        .iter()
        .filter(|u| u.id.eq_ignore_ascii_case(&norm) || u.aliases.iter().any(|a| a.eq_ignore_ascii_case(&norm)));
    match (found.next(), found.next()) {
        (Some(def), None) => Some(def),
        _ => None,
    }
}

/// Folds the spellings people type into unit ids: superscripts, `^`, `·`, spaces.
fn normalise_unit(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for ch in text.trim().chars() {
        match ch {
            '²' => out.push('2'),
            '³' => out.push('3'),
            '^' | ' ' => {}
            '·' | '⋅' => out.push('.'),
            _ => out.push(ch),
        }
    }
    if out.ends_with('.') && out.len() > 1 && !out.ends_with("..") {
        out.pop(); // "in." → "in"
    }
    out
}

/// The most characters a field accepts.
pub const MAX_INPUT_CHARS: usize = 64;

/// Parses `"150 psi"` (or a bare `"150"`, which takes `default_unit`) into the SI
/// value of `kind`.
///
/// # Errors
/// A typed [`FieldErrorKind`]: not a number, not finite, ambiguous comma, unknown
/// unit, or a unit of another kind.
pub fn parse_quantity(text: &str, kind: QuantityKind, default_unit: &str) -> Result<f64, FieldErrorKind> {
    parse_quantity_echo(text, kind, default_unit).map(|(si, _, _)| si)
}

/// Like [`parse_quantity`], and also returns the number text and the id of the unit
/// that was applied (typed or default).
pub fn parse_quantity_echo(
    text: &str,
    kind: QuantityKind,
    default_unit: &str,
) -> Result<(f64, String, &'static str), FieldErrorKind> {
    let text = text.trim();
    if text.chars().count() > MAX_INPUT_CHARS {
        return Err(FieldErrorKind::TooLong {
            max_chars: MAX_INPUT_CHARS,
        });
    }
    let (number_text, unit_text) = split_number(text);
    let lower = text.to_ascii_lowercase();
    if number_text.is_empty() {
        let bare = lower.trim_start_matches(['+', '-']);
        if bare.starts_with("nan") || bare.starts_with("inf") {
            return Err(FieldErrorKind::NotFinite);
        }
        return Err(FieldErrorKind::NotANumber { text: text.to_string() });
    }
    let number = parse_number(number_text)?;
    let unit_text = unit_text.trim();
    let unit = if unit_text.is_empty() {
        find_unit(default_unit)
    } else {
        find_unit(unit_text)
    };
    let expected = || units_of(kind).map(|u| u.id).collect::<Vec<_>>().join(", ");
    let Some(unit) = unit else {
        return Err(FieldErrorKind::UnknownUnit {
            unit: unit_text.to_string(),
            expected: expected(),
        });
    };
    if unit.kind != kind {
        return Err(FieldErrorKind::WrongKind {
            unit: unit.id.to_string(),
            unit_kind: unit.kind.name(),
            expected: expected(),
        });
    }
    let si = number * unit.factor + unit.offset;
    if si.is_finite() {
        Ok((si, number_text.to_string(), unit.id))
    } else {
        Err(FieldErrorKind::NotFinite)
    }
}

/// Splits leading number text (sign, digits, one `.` or `,`, exponent) from the rest.
fn split_number(text: &str) -> (&str, &str) {
    let bytes = text.as_bytes();
    let mut i = 0;
    if i < bytes.len() && (bytes[i] == b'+' || bytes[i] == b'-') {
        i += 1;
    }
    let digits_start = i;
    while i < bytes.len() && (bytes[i].is_ascii_digit() || bytes[i] == b'.' || bytes[i] == b',') {
        i += 1;
    }
    if i == digits_start || !bytes[digits_start..i].iter().any(|b| b.is_ascii_digit()) {
        return ("", text);
    }
    // Exponent: e or E, optional sign, at least one digit. "5 e" is not an exponent.
    if i < bytes.len() && (bytes[i] == b'e' || bytes[i] == b'E') {
        let mut j = i + 1;
        if j < bytes.len() && (bytes[j] == b'+' || bytes[j] == b'-') {
            j += 1;
        }
        let exp_digits = j;
        while j < bytes.len() && bytes[j].is_ascii_digit() {
            j += 1;
        }
        if j > exp_digits {
            i = j;
        }
    }
    (&text[..i], &text[i..])
}

/// Parses the number part, applying the decimal-comma rule.
fn parse_number(text: &str) -> Result<f64, FieldErrorKind> {
    let commas = text.matches(',').count();
    let dots = text.matches('.').count();
    let normalised = if commas == 0 {
        text.to_string()
    } else if commas == 1 && dots == 0 {
        let (before, after) = text.split_once(',').unwrap_or((text, ""));
        let after_digits = after.chars().take_while(|c| c.is_ascii_digit()).count();
        let before_digits = before.chars().filter(|c| c.is_ascii_digit()).count();
        if after_digits == 3 && (1..=3).contains(&before_digits) {
            return Err(FieldErrorKind::AmbiguousComma { text: text.to_string() });
        }
        text.replacen(',', ".", 1)
    } else {
        return Err(FieldErrorKind::NotANumber { text: text.to_string() });
    };
    if dots > 1 {
        return Err(FieldErrorKind::NotANumber { text: text.to_string() });
    }
    let value: f64 = normalised
        .parse()
        .map_err(|_| FieldErrorKind::NotANumber { text: text.to_string() })?;
    if value.is_finite() {
        Ok(value)
    } else {
        Err(FieldErrorKind::NotFinite)
    }
}

/// Display units per kind and system, largest first: a value is shown in the first
/// unit in which its magnitude is at least 1 (else the last).
fn display_units(kind: QuantityKind, system: UnitSystem) -> &'static [&'static str] {
    use UnitSystem::{Si, UsCustomary as Us};
    match (kind, system) {
        (Q::Length, Si) => &["m", "mm"],
        (Q::Length, Us) => &["ft", "in"],
        (Q::Area, Si) => &["m2", "mm2"],
        (Q::Area, Us) => &["ft2", "in2"],
        (Q::Volume, Si) => &["m3", "L"],
        (Q::Volume, Us) => &["ft3", "in3"],
        (Q::Mass, Si) => &["t", "kg"],
        (Q::Mass, Us) => &["lb"],
        (Q::Time, _) => &["h", "min", "s"],
        (Q::Pressure, Si) => &["MPa", "kPa", "Pa"],
        (Q::Pressure, Us) => &["psi", "psf"],
        (Q::Velocity, Si) => &["m/s"],
        (Q::Velocity, Us) => &["ft/s"],
        (Q::Acceleration, Si) => &["m/s2"],
        (Q::Acceleration, Us) => &["ft/s2"],
        (Q::VolumeFlow, Si) => &["m3/s", "m3/h", "L/min"],
        (Q::VolumeFlow, Us) => &["gpm"],
        (Q::MassFlow, Si) => &["kg/s"],
        (Q::MassFlow, Us) => &["lb/s"],
        (Q::Force, Si) => &["MN", "kN", "N"],
        (Q::Force, Us) => &["lbf"],
        (Q::Torque, Si) => &["kN.m", "N.m"],
        (Q::Torque, Us) => &["lbf.ft"],
        (Q::Power, Si) => &["MW", "kW", "W"],
        (Q::Power, Us) => &["hp"],
        (Q::Angle, _) => &["deg"],
        (Q::AngularSpeed, _) => &["rpm"],
        (Q::Temperature, Si) => &["degC"],
        (Q::Temperature, Us) => &["degF"],
        (Q::Density, Si) => &["kg/m3"],
        (Q::Density, Us) => &["lb/ft3"],
        (Q::SpecificWeight, Si) => &["kN/m3"],
        (Q::SpecificWeight, Us) => &["lbf/ft3"],
        (Q::DynamicViscosity, Si) => &["mPa.s"],
        (Q::DynamicViscosity, Us) => &["lb/(ft.s)"],
        (Q::KinematicViscosity, Si) => &["mm2/s"],
        (Q::KinematicViscosity, Us) => &["ft2/s"],
        (Q::Ratio, _) => &["-"],
    }
}

/// The unit a result of `kind` is shown in for `si` in `system`.
pub fn display_unit(si: f64, kind: QuantityKind, system: UnitSystem) -> &'static UnitDef {
    let ids = display_units(kind, system);
    let mut chosen = ids[ids.len() - 1];
    for id in ids {
        if let Some(def) = find_unit(id) {
            // Compare after rounding to four figures, so 999 999.99 Pa shows as 1.000 MPa.
            // Areas stay in m² (ft²) down to 0.01: a bearing face of 0.75 m² reads
            // better than 750 000 mm².
            let threshold = if kind == QuantityKind::Area {
                0.009_999_5
            } else {
                0.999_95
            };
            if ((si - def.offset) / def.factor).abs() >= threshold {
                chosen = id;
                break;
            }
        }
    }
    // Every id in the display table is in UNITS (checked by a unit test).
    find_unit(chosen).unwrap_or(&UNITS[0])
}

/// Formats an SI value in the display unit for `system`, four significant figures.
pub fn format_quantity(si: f64, kind: QuantityKind, system: UnitSystem) -> String {
    let def = display_unit(si, kind, system);
    format_in(si, def)
}

/// Formats an SI value in a given unit id (falls back to the SI display unit).
pub fn format_quantity_in(si: f64, kind: QuantityKind, unit_id: &str) -> String {
    match find_unit(unit_id) {
        Some(def) if def.kind == kind => format_in(si, def),
        _ => format_quantity(si, kind, UnitSystem::Si),
    }
}

/// The number of `si` expressed in `unit_id`, if that unit exists and fits `kind`.
pub fn convert_to(si: f64, kind: QuantityKind, unit_id: &str) -> Option<f64> {
    find_unit(unit_id)
        .filter(|d| d.kind == kind)
        .map(|d| (si - d.offset) / d.factor)
}

/// Significant figures of a converted input ([`convert_text`]): enough that a
/// value converted there and back reads as typed to the four figures results show.
pub const CONVERTED_SIGNIFICANT_FIGURES: i32 = 6;

/// Converts what the user typed in a field (`"10"` with `from_default_unit` `"bar"`,
/// or `"10 bar"`) to the number text in `to_unit` (`"145.038"`), without the unit:
/// six significant figures, trailing zeros dropped (`"10"`, not `"10.0000"`).
/// Derived from the definitions of the units in [`UNITS`]
/// (`si = value * factor + offset`).
///
/// # Errors
/// What [`parse_quantity`] refuses, and [`FieldErrorKind::UnknownUnit`] or
/// [`FieldErrorKind::WrongKind`] when `to_unit` is not a unit of `kind`.
pub fn convert_text(
    text: &str,
    kind: QuantityKind,
    from_default_unit: &str,
    to_unit: &str,
) -> Result<String, FieldErrorKind> {
    let si = parse_quantity(text, kind, from_default_unit)?;
    let expected = || units_of(kind).map(|u| u.id).collect::<Vec<_>>().join(", ");
    let Some(target) = find_unit(to_unit) else {
        return Err(FieldErrorKind::UnknownUnit {
            unit: to_unit.to_string(),
            expected: expected(),
        });
    };
    if target.kind != kind {
        return Err(FieldErrorKind::WrongKind {
            unit: target.id.to_string(),
            unit_kind: target.kind.name(),
            expected: expected(),
        });
    }
    let value = (si - target.offset) / target.factor;
    if !value.is_finite() {
        return Err(FieldErrorKind::NotFinite);
    }
    Ok(trim_zeros(&format_significant(value, CONVERTED_SIGNIFICANT_FIGURES)))
}

/// Drops trailing zeros of the fraction (`"10.0000"` → `"10"`, `"1.50000e-7"` →
/// `"1.5e-7"`); integers are left alone.
fn trim_zeros(number: &str) -> String {
    let (mantissa, exponent) = match number.find(['e', 'E']) {
        Some(i) => number.split_at(i),
        None => (number, ""),
    };
    if !mantissa.contains('.') {
        return number.to_string();
    }
    let trimmed = mantissa.trim_end_matches('0').trim_end_matches('.');
    format!("{trimmed}{exponent}")
}

fn format_in(si: f64, def: &UnitDef) -> String {
    let value = (si - def.offset) / def.factor;
    let number = format_significant(value, 4);
    if def.id == "-" {
        number
    } else {
        format!("{number} {}", def.id)
    }
}

/// Formats with `sig` significant figures, no exponent for everyday magnitudes.
pub fn format_significant(value: f64, sig: i32) -> String {
    if !value.is_finite() {
        return "—".to_string();
    }
    if value == 0.0 {
        return "0".to_string();
    }
    let mut magnitude = value.abs().log10().floor() as i32;
    // 0.99999 rounds to 1.000, not 1.0000: take the magnitude after rounding.
    let rounded_to_sig = (value / 10f64.powi(magnitude + 1 - sig)).round() * 10f64.powi(magnitude + 1 - sig);
    if rounded_to_sig != 0.0 && rounded_to_sig.is_finite() {
        magnitude = rounded_to_sig.abs().log10().floor() as i32;
    }
    if !(-5..=11).contains(&magnitude) {
        return format!("{:.*e}", (sig - 1).max(0) as usize, value);
    }
    let decimals = (sig - 1 - magnitude).max(0) as usize;
    let scale = 10f64.powi(magnitude + 1 - sig);
    let rounded = if decimals == 0 {
        (value / scale).round() * scale
    } else {
        value
    };
    let text = format!("{rounded:.decimals$}");
    if text.starts_with('-') && text.trim_start_matches('-').chars().all(|c| c == '0' || c == '.') {
        text.trim_start_matches('-').to_string()
    } else {
        text
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn all_kinds_are_listed_once_in_declaration_order() {
        for (index, kind) in QuantityKind::ALL.iter().enumerate() {
            assert_eq!(*kind as usize, index, "{kind:?}");
        }
        assert_eq!(QuantityKind::ALL.len(), QuantityKind::Ratio as usize + 1);
    }

    #[test]
    fn display_units_exist_and_match_kind() {
        let kinds = QuantityKind::ALL;
        for kind in kinds {
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                for id in display_units(kind, system) {
                    let def = find_unit(id).unwrap_or_else(|| panic!("display unit {id} missing"));
                    assert_eq!(def.kind, kind, "{id}");
                }
            }
            assert!(units_of(kind).count() > 0);
        }
    }

    #[test]
    fn unit_ids_are_ascii_and_unique() {
        for (i, a) in UNITS.iter().enumerate() {
            assert!(a.id.is_ascii(), "{}", a.id);
            for b in &UNITS[i + 1..] {
                assert_ne!(a.id, b.id);
            }
        }
    }

    #[test]
    fn parses_typed_quantities() {
        // Factors: NIST SP 811 Appendix B (exact definitions).
        let cases: &[(&str, QuantityKind, &str, f64)] = &[
            ("150 psi", Q::Pressure, "kPa", 150.0 * 6894.757293168361),
            ("150psi", Q::Pressure, "kPa", 150.0 * 6894.757293168361),
            ("10 bar", Q::Pressure, "kPa", 1.0e6),
            ("1.2 MPa", Q::Pressure, "kPa", 1.2e6),
            ("1,5 bar", Q::Pressure, "kPa", 1.5e5),
            ("300 mm", Q::Length, "m", 0.3),
            ("12 in", Q::Length, "m", 0.3048),
            ("12", Q::Length, "in", 0.3048),
            ("2000 gpm", Q::VolumeFlow, "L/s", 2000.0 * 3.785411784e-3 / 60.0),
            ("0.5 m3/s", Q::VolumeFlow, "L/s", 0.5),
            ("0.5 m³/s", Q::VolumeFlow, "L/s", 0.5),
            ("45 deg", Q::Angle, "deg", std::f64::consts::FRAC_PI_4),
            ("20 degC", Q::Temperature, "degC", 293.15),
            ("68 degF", Q::Temperature, "degC", 293.15),
            ("-5e-1 kN", Q::Force, "N", -500.0),
            ("1 KPA", Q::Pressure, "psi", 1000.0),
            ("50 %", Q::Ratio, "-", 0.5),
        ];
        for (text, kind, default, expected) in cases {
            let got = parse_quantity(text, *kind, default).unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_relative_eq!(got, *expected, max_relative = 1e-12);
        }
    }

    #[test]
    fn refuses_bad_text_with_typed_errors() {
        assert_eq!(parse_quantity("NaN", Q::Length, "m"), Err(FieldErrorKind::NotFinite));
        assert_eq!(parse_quantity("-inf", Q::Length, "m"), Err(FieldErrorKind::NotFinite));
        assert_eq!(parse_quantity("1e999", Q::Length, "m"), Err(FieldErrorKind::NotFinite));
        assert!(matches!(
            parse_quantity("1,500 m", Q::Length, "m"),
            Err(FieldErrorKind::AmbiguousComma { .. })
        ));
        assert!(matches!(
            parse_quantity("5 psi", Q::Length, "m"),
            Err(FieldErrorKind::WrongKind { .. })
        ));
        assert!(matches!(
            parse_quantity("5 furlongs", Q::Length, "m"),
            Err(FieldErrorKind::UnknownUnit { .. })
        ));
        assert!(matches!(
            parse_quantity("abc", Q::Length, "m"),
            Err(FieldErrorKind::NotANumber { .. })
        ));
        assert!(matches!(
            parse_quantity("1.2.3 m", Q::Length, "m"),
            Err(FieldErrorKind::NotANumber { .. })
        ));
        assert!(matches!(
            parse_quantity("<script>", Q::Length, "m"),
            Err(FieldErrorKind::NotANumber { .. })
        ));
        let long = "9".repeat(100_000);
        assert!(matches!(
            parse_quantity(&long, Q::Length, "m"),
            Err(FieldErrorKind::TooLong { .. })
        ));
    }

    #[test]
    fn converts_typed_text_between_units() {
        // Expected numbers derived from the definitions (NIST SP 811 Appendix B):
        // 10 bar = 1e6 Pa / 6894.757 293 168 Pa/psi = 145.037 738 psi;
        // 2.5 m/s / 0.3048 = 8.202 099 7 ft/s; 20 degC = 68 degF; 150 psi = 10.342 136 bar.
        let cases: &[(&str, QuantityKind, &str, &str, &str)] = &[
            ("10", Q::Pressure, "bar", "psi", "145.038"),
            ("10 bar", Q::Pressure, "psi", "psi", "145.038"),
            ("145.038", Q::Pressure, "psi", "bar", "10"),
            ("150", Q::Pressure, "psi", "bar", "10.3421"),
            ("2,5", Q::Velocity, "m/s", "ft/s", "8.2021"),
            ("20", Q::Temperature, "degC", "degF", "68"),
            ("-40", Q::Temperature, "degF", "degC", "-40"),
            ("12", Q::Length, "in", "mm", "304.8"),
            ("0", Q::Force, "kN", "lbf", "0"),
            ("1e-9", Q::Length, "m", "mm", "1e-6"),
            ("45", Q::Angle, "deg", "deg", "45"),
        ];
        for (text, kind, from, to, expected) in cases {
            let got = convert_text(text, *kind, from, to).unwrap_or_else(|e| panic!("{text} {from}->{to}: {e}"));
            assert_eq!(&got, expected, "{text} {from} -> {to}");
            // What comes out is read back by the parser as the same value (6 figures).
            let back = parse_quantity(&got, *kind, to).unwrap_or_else(|e| panic!("{got}: {e}"));
            let original = parse_quantity(text, *kind, from).unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_relative_eq!(back, original, max_relative = 5e-6, epsilon = 1e-12);
        }
    }

    #[test]
    fn conversion_refuses_bad_text_and_foreign_units() {
        assert!(matches!(
            convert_text("abc", Q::Pressure, "bar", "psi"),
            Err(FieldErrorKind::NotANumber { .. })
        ));
        assert_eq!(
            convert_text("NaN", Q::Pressure, "bar", "psi"),
            Err(FieldErrorKind::NotFinite)
        );
        assert!(matches!(
            convert_text("10", Q::Pressure, "bar", "m"),
            Err(FieldErrorKind::WrongKind { .. })
        ));
        assert!(matches!(
            convert_text("10", Q::Pressure, "bar", "furlong"),
            Err(FieldErrorKind::UnknownUnit { .. })
        ));
        assert!(matches!(
            convert_text("5 m", Q::Pressure, "bar", "psi"),
            Err(FieldErrorKind::WrongKind { .. })
        ));
        // Past the largest finite number in the target unit.
        assert_eq!(
            convert_text("1e306", Q::Length, "m", "mm"),
            Err(FieldErrorKind::NotFinite)
        );
    }

    #[test]
    fn formats_four_significant_figures() {
        assert_eq!(format_significant(12345.0, 4), "12350");
        assert_eq!(format_significant(1.23456, 4), "1.235");
        assert_eq!(format_significant(0.0123456, 4), "0.01235");
        assert_eq!(format_significant(-0.0, 4), "0");
        assert_eq!(format_significant(0.999_999_9, 4), "1.000");
        assert_eq!(format_significant(9999.7, 4), "10000");
        assert_eq!(format_quantity(999_999.999, Q::Pressure, UnitSystem::Si), "1.000 MPa");
        assert_eq!(format_quantity(0.7547, Q::Area, UnitSystem::Si), "0.7547 m2");
        assert_eq!(format_quantity(0.005, Q::Area, UnitSystem::Si), "5000 mm2");
        assert_eq!(format_quantity(12_345.0, Q::Force, UnitSystem::Si), "12.35 kN");
        assert_eq!(
            format_quantity(293.15, Q::Temperature, UnitSystem::UsCustomary),
            "68.00 degF"
        );
    }
}
