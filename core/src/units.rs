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
//! Derived units: kilogram-force = 9.806 65 N, so kgf/cm² = 98 066.5 Pa (exact); the
//! short ton-force = 2000 lbf, so tsf = 2000 lbf/ft² = 95 760.518 Pa (NIST SP 811 lists
//! pound-force per square foot = 47.880 26 Pa and ton-force (2000 lbf) = 8.896 443 kN).
//! Water columns (`mWC`, `ftWC`, `inWC`; typed also `mH2O`, `ftH2O`, `inH2O`) are the
//! *conventional* ones: a column of water of density 1000 kg/m³ under standard
//! gravity, so 1 mWC = 9806.65 Pa exactly, 1 ftWC = 2989.0669 Pa and 1 inWC =
//! 249.088 91 Pa. NIST SP 811 Appendix B.8 gives foot of water (39.2 °F) = 2989.067 Pa
//! (the same to its seven figures), inch of water (39.2 °F) = 249.082 Pa (2.7 × 10⁻⁵
//! lower: water at 39.2 °F is 999.97 kg/m³) and inch of water (60 °F) = 248.84 Pa
//! (1.0 × 10⁻³ lower). A gauge reading in a water column is a head above atmosphere.
//!
//! Parsing rules:
//! - `"150 psi"`, `"150psi"`, `"1.2e3 kPa"` and `"1,5 bar"` are accepted; a bare
//!   number takes the field's unit.
//! - A unit resolves only by its exact id or one of its listed aliases (`psig`, `barg`,
//!   `kN/m2`, `m3/hr`, `KPA`, ...). There is no case-insensitive guessing: `mN` is
//!   not `MN` and `MM` is not `mm`. Anything else is refused with the nearest units of
//!   the field's kind as suggestions.
//! - Every pressure field is gauge (above the local atmosphere; the few that are a
//!   modulus or a bearing stress are neither), so absolute spellings (`psia`, `bara`,
//!   `kPaa`) are refused with the reason instead of being read as gauge: 14.7 psia
//!   is 0 psig.
//! - A comma is a decimal comma unless it could be a thousands separator: it is
//!   ambiguous, and refused, only when exactly three digits follow it and one to
//!   three digits precede it with no leading zero (`"1,500"`, `"-12,345"`). So
//!   `"1,5"`, `"0,500"` and `"1,5000"` are decimal commas: a thousands group never
//!   starts with 0 and is always three digits.
//! - Lengths may be typed as the trade writes fractional inches: `"1-1/4 in"`,
//!   `"1 1/4 in"`, `"1¼ in"`, `"3/4 in"` (a proper fraction after a whole number,
//!   denominators 1 to 1000); other kinds take decimal numbers only.
//! - NaN, infinities and text are refused with a typed error.
//!
//! Kinds that share a dimension: a soil bearing pressure ([`QuantityKind::SoilBearing`])
//! is measured in pressure units and a concrete volume ([`QuantityKind::ConcreteVolume`])
//! in volume units, but each offers and shows only the trade's units: soil bearing in
//! kPa or psf (also MPa, Pa, kgf/cm², ksf, tsf, psi; never 20.83 psi for 3000 psf),
//! concrete in m³ or yd³ (ft³ below one cubic yard).
//!
//! Switching a page's unit system converts what was typed ([`convert_text`]) to one
//! significant figure more than was typed, at least four, so a demo value of 7 bar
//! reads 101.5 psi rather than 101.526 psi; the page keeps the typed text to restore.

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
const PSF: f64 = POUND_FORCE / (FOOT * FOOT); // 47.880 259 Pa
const KGF_PER_CM2: f64 = STANDARD_GRAVITY / 1e-4; // 98 066.5 Pa
const TON_FORCE_PER_FT2: f64 = 2000.0 * PSF; // 95 760.518 Pa
/// Conventional water column: 1000 kg/m³ under standard gravity, Pa per metre.
const METRE_OF_WATER: f64 = 1000.0 * STANDARD_GRAVITY; // 9806.65 Pa

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
    /// m³ of concrete: measured in the units of [`QuantityKind::Volume`], shown in
    /// the trade's units (m³; yd³, or ft³ below one cubic yard).
    ConcreteVolume,
    /// kg
    Mass,
    /// s
    Time,
    /// Pa, gauge (above the local atmosphere), or a modulus. Every pressure field is
    /// gauge, so absolute spellings (`psia`) are refused; an absolute field would
    /// need a kind of its own.
    Pressure,
    /// Pa: allowable bearing of soil. Measured in units of [`QuantityKind::Pressure`],
    /// offered and shown in the trade's units (kPa; psf).
    SoilBearing,
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
    pub const ALL: [QuantityKind; 23] = [
        QuantityKind::Length,
        QuantityKind::Area,
        QuantityKind::Volume,
        QuantityKind::ConcreteVolume,
        QuantityKind::Mass,
        QuantityKind::Time,
        QuantityKind::Pressure,
        QuantityKind::SoilBearing,
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

    /// The wire name of the kind (`"volume_flow"`): the variant name in snake_case.
    pub fn key(self) -> &'static str {
        match self {
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

    /// A plain name for messages ("a unit of pressure").
    pub fn name(self) -> &'static str {
        match self {
            QuantityKind::Length => "length",
            QuantityKind::Area => "area",
            QuantityKind::Volume => "volume",
            QuantityKind::ConcreteVolume => "concrete volume",
            QuantityKind::Mass => "mass",
            QuantityKind::Time => "time",
            QuantityKind::Pressure => "pressure",
            QuantityKind::SoilBearing => "soil bearing pressure",
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

    /// The kind whose units this kind is measured in: a soil bearing pressure is a
    /// pressure and a concrete volume a volume; every other kind is its own.
    pub fn dimension(self) -> QuantityKind {
        match self {
            QuantityKind::SoilBearing => QuantityKind::Pressure,
            QuantityKind::ConcreteVolume => QuantityKind::Volume,
            other => other,
        }
    }

    /// The units offered for a kind that shares its dimension with another, by id,
    /// in selector order; `None` for a kind that offers every unit of its dimension.
    fn offered_ids(self) -> Option<&'static [&'static str]> {
        match self {
            QuantityKind::SoilBearing => Some(&["kPa", "MPa", "Pa", "kgf/cm2", "psf", "ksf", "tsf", "psi"]),
            QuantityKind::ConcreteVolume => Some(&["m3", "yd3", "ft3"]),
            _ => None,
        }
    }

    /// Whether `unit` is offered (in selectors) and accepted (when typed) for this kind.
    pub fn offers(self, unit: &UnitDef) -> bool {
        unit.kind == self.dimension()
            && match self.offered_ids() {
                Some(ids) => ids.contains(&unit.id),
                None => true,
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
    /// How the system is named on the page ("US customary").
    pub fn label(self) -> &'static str {
        match self {
            UnitSystem::Si => "SI",
            UnitSystem::UsCustomary => "US customary",
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
    /// Other spellings accepted when typed (`"gal/min"` for `"gpm"`), matched exactly
    /// after [`normalise_unit`]. Case variants are listed one by one, and only where
    /// no SI prefix could be misread (`KPA` for kPa, never `mpa` for MPa).
    pub aliases: &'static [&'static str],
}

impl UnitDef {
    /// How the unit is shown to people (`m³/h`, `°C`, `kN·m`); the id stays the ASCII
    /// spelling used in links and selectors' values. Typed back, a label reads as its
    /// unit (superscripts and the centre dot fold to the id).
    pub fn label(&self) -> &'static str {
        unit_label(self.id)
    }

    /// A number in this unit as shown: `12.4 kN`, `45°`, a bare number for `-`.
    pub fn show(&self, number: &str) -> String {
        match self.label() {
            "" | "-" => number.to_string(),
            "°" => format!("{number}°"),
            label => format!("{number} {label}"),
        }
    }
}

/// The display label of a unit id (see [`UnitDef::label`]); ids without superscripts
/// or products are their own label.
fn unit_label(id: &'static str) -> &'static str {
    match id {
        "m2" => "m²",
        "mm2" => "mm²",
        "cm2" => "cm²",
        "in2" => "in²",
        "ft2" => "ft²",
        "m3" => "m³",
        "ft3" => "ft³",
        "yd3" => "yd³",
        "in3" => "in³",
        "kgf/cm2" => "kgf/cm²",
        "m/s2" => "m/s²",
        "ft/s2" => "ft/s²",
        "m3/h" => "m³/h",
        "m3/s" => "m³/s",
        "ft3/s" => "ft³/s",
        "N.m" => "N·m",
        "kN.m" => "kN·m",
        "lbf.ft" => "lbf·ft",
        "lbf.in" => "lbf·in",
        "ft.lbf/s" => "ft·lbf/s",
        "deg" => "°",
        "degC" => "°C",
        "degF" => "°F",
        "kg/m3" => "kg/m³",
        "g/cm3" => "g/cm³",
        "lb/ft3" => "lb/ft³",
        "kN/m3" => "kN/m³",
        "N/m3" => "N/m³",
        "lbf/ft3" => "lbf/ft³",
        "mPa.s" => "mPa·s",
        "Pa.s" => "Pa·s",
        "lb/(ft.s)" => "lb/(ft·s)",
        "lbf.s/ft2" => "lbf·s/ft²",
        "mm2/s" => "mm²/s",
        "m2/s" => "m²/s",
        "ft2/s" => "ft²/s",
        other => other,
    }
}

/// A formatted value split into its number and unit: `"12.4 kN"` → (`"12.4"`, kN),
/// `"0.5"` → (`"0.5"`, none). Reads only what [`format_quantity`] and
/// [`format_significant`] write (a finite number, one space, a unit id); anything
/// else (words, `—`) is `None`. Used where formatted text leaves the core, so that
/// the page never takes text apart itself.
pub fn split_shown(text: &str) -> Option<(String, Option<&'static UnitDef>)> {
    let text = text.trim();
    let (number, unit) = match text.split_once(' ') {
        Some((number, unit)) => (number, Some(unit)),
        None => (text, None),
    };
    if !crate::decimal::parse_decimal(number).is_some_and(f64::is_finite)
        || number.contains(|c: char| c.is_ascii_alphabetic() && c != 'e')
    {
        return None;
    }
    match unit {
        None => Some((number.to_string(), None)),
        Some(id) => unit_by_id(id).map(|u| (number.to_string(), Some(u))),
    }
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

/// Every unit the parser knows, grouped by kind (a dimension: see
/// [`QuantityKind::dimension`]); within a kind, the order is the order offered in
/// unit selectors.
pub const UNITS: &[UnitDef] = &[
    u("m", Q::Length, 1.0),
    u("mm", Q::Length, 1e-3),
    u("cm", Q::Length, 1e-2),
    u("km", Q::Length, 1e3),
    ua("in", Q::Length, INCH, &["inch", "inches", "\"", "IN", "In"]),
    ua("ft", Q::Length, FOOT, &["feet", "foot", "'", "FT", "Ft"]),
    ua("yd", Q::Length, 3.0 * FOOT, &[]),
    u("m2", Q::Area, 1.0),
    u("mm2", Q::Area, 1e-6),
    u("cm2", Q::Area, 1e-4),
    ua("in2", Q::Area, INCH * INCH, &["sqin"]),
    ua("ft2", Q::Area, FOOT * FOOT, &["sqft"]),
    u("m3", Q::Volume, 1.0),
    ua("L", Q::Volume, 1e-3, &["l", "litre", "liter"]),
    ua("ft3", Q::Volume, FOOT * FOOT * FOOT, &["cuft"]),
    ua("yd3", Q::Volume, 27.0 * FOOT * FOOT * FOOT, &["cuyd"]),
    ua("gal", Q::Volume, US_GALLON, &["usgal"]),
    u("in3", Q::Volume, INCH * INCH * INCH),
    u("kg", Q::Mass, 1.0),
    ua("t", Q::Mass, 1e3, &["tonne"]),
    ua("lb", Q::Mass, POUND_MASS, &["lbm", "lbs", "LB", "LBS", "Lb", "Lbs"]),
    ua("ton", Q::Mass, 2000.0 * POUND_MASS, &["shortton"]),
    u("s", Q::Time, 1.0),
    ua("min", Q::Time, 60.0, &[]),
    ua("h", Q::Time, 3600.0, &["hr"]),
    ua(
        "kPa",
        Q::Pressure,
        1e3,
        &["kPag", "kPa(g)", "kN/m2", "kpa", "KPa", "KPA", "Kpa", "KPAG", "kpag"],
    ),
    ua("bar", Q::Pressure, 1e5, &["barg", "bar(g)", "BAR", "Bar", "BARG"]),
    ua("MPa", Q::Pressure, 1e6, &["MPag", "MPa(g)", "N/mm2", "MPA", "Mpa"]),
    ua("Pa", Q::Pressure, 1.0, &["N/m2"]),
    u("mbar", Q::Pressure, 1e2),
    ua(
        "psi",
        Q::Pressure,
        PSI,
        &["lbf/in2", "psig", "psi(g)", "PSI", "Psi", "PSIG", "Psig"],
    ),
    ua("psf", Q::Pressure, PSF, &["lbf/ft2", "PSF"]),
    ua("ksf", Q::Pressure, 1e3 * PSF, &["KSF"]),
    ua("ksi", Q::Pressure, 1e3 * PSI, &["KSI"]),
    ua(
        "kgf/cm2",
        Q::Pressure,
        KGF_PER_CM2,
        &["kg/cm2", "kgf/cm2g", "kg/cm2g", "kg/cm2(g)", "ksc"],
    ),
    ua("tsf", Q::Pressure, TON_FORCE_PER_FT2, &["TSF", "tonf/ft2"]),
    // Conventional water columns (1000 kg/m³, standard gravity): see the module doc.
    ua("mWC", Q::Pressure, METRE_OF_WATER, &["mH2O", "mwc", "m.w.c", "mAq"]),
    ua(
        "ftWC",
        Q::Pressure,
        FOOT * METRE_OF_WATER,
        &["ftH2O", "ftwc", "ft.w.c", "ftofwater", "feetofwater"],
    ),
    ua(
        "inWC",
        Q::Pressure,
        INCH * METRE_OF_WATER,
        &["inH2O", "inwc", "in.w.c", "\"WC", "\"H2O", "in.H2O", "inofwater"],
    ),
    u("m/s", Q::Velocity, 1.0),
    u("km/h", Q::Velocity, 1.0 / 3.6),
    ua("ft/s", Q::Velocity, FOOT, &["fps"]),
    ua("ft/min", Q::Velocity, FOOT / 60.0, &["fpm"]),
    u("mph", Q::Velocity, 1609.344 / 3600.0),
    ua("m/s2", Q::Acceleration, 1.0, &[]),
    u("ft/s2", Q::Acceleration, FOOT),
    ua("m3/h", Q::VolumeFlow, 1.0 / 3600.0, &["m3/hr"]),
    u("m3/s", Q::VolumeFlow, 1.0),
    ua("L/s", Q::VolumeFlow, 1e-3, &["l/s"]),
    ua("L/min", Q::VolumeFlow, 1e-3 / 60.0, &["l/min"]),
    ua(
        "gpm",
        Q::VolumeFlow,
        US_GALLON / 60.0,
        &["gal/min", "usgpm", "GPM", "Gpm"],
    ),
    ua("ft3/s", Q::VolumeFlow, FOOT * FOOT * FOOT, &["cfs", "CFS"]),
    ua("MGD", Q::VolumeFlow, 1e6 * US_GALLON / 86_400.0, &["mgd", "Mgd"]),
    u("kg/s", Q::MassFlow, 1.0),
    u("kg/h", Q::MassFlow, 1.0 / 3600.0),
    u("t/h", Q::MassFlow, 1e3 / 3600.0),
    u("lb/s", Q::MassFlow, POUND_MASS),
    ua("lb/h", Q::MassFlow, POUND_MASS / 3600.0, &["lb/hr"]),
    u("N", Q::Force, 1.0),
    ua("kN", Q::Force, 1e3, &["KN"]),
    u("MN", Q::Force, 1e6),
    ua("lbf", Q::Force, POUND_FORCE, &["LBF", "Lbf"]),
    ua(
        "kip",
        Q::Force,
        1e3 * POUND_FORCE,
        &["kips", "KIP", "KIPS", "Kip", "Kips"],
    ),
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
    ua("kW", Q::Power, 1e3, &["KW", "kw"]),
    u("MW", Q::Power, 1e6),
    ua("hp", Q::Power, HORSEPOWER, &["HP", "Hp"]),
    ua("ft.lbf/s", Q::Power, FOOT * POUND_FORCE, &[]),
    ua(
        "deg",
        Q::Angle,
        std::f64::consts::PI / 180.0,
        &["°", "degree", "degrees", "DEG", "Deg"],
    ),
    u("rad", Q::Angle, 1.0),
    u("rad/s", Q::AngularSpeed, 1.0),
    ua(
        "rpm",
        Q::AngularSpeed,
        2.0 * std::f64::consts::PI / 60.0,
        &["rev/min", "r/min", "RPM"],
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

/// The units offered for one kind, in selector order (for a kind that shares its
/// dimension, only the trade's units: see [`QuantityKind::offers`]).
pub fn units_of(kind: QuantityKind) -> impl Iterator<Item = &'static UnitDef> {
    UNITS.iter().filter(move |u| kind.offers(u))
}

/// Finds a unit by its exact id or one of its aliases (after folding superscripts,
/// `^`, `·` and spaces), whatever its kind. Nothing is matched case-insensitively:
/// `mN` is not `MN`, `MM` is not `mm`.
pub fn find_unit(text: &str) -> Option<&'static UnitDef> {
    // An id is its own normal form and no other unit spells it (both checked by
    // `unit_ids_and_aliases_are_unique_and_ids_ascii`): the usual call, with an id the
    // core wrote itself, needs neither the folding nor the aliases.
    if let Some(def) = unit_by_id(text) {
        return Some(def);
    }
    let norm = normalise_unit(text);
    UNITS
        .iter()
        .find(|u| u.id == norm || u.aliases.contains(&norm.as_str()))
}

/// Finds a unit offered for `kind` by its exact id or alias ([`find_unit`]).
pub fn find_unit_of(text: &str, kind: QuantityKind) -> Option<&'static UnitDef> {
    find_unit(text).filter(|def| kind.offers(def))
}

/// Spellings of absolute pressure, refused in every pressure field (all are gauge).
const ABSOLUTE_PRESSURE_SPELLINGS: &[&str] = &[
    "psia",
    "PSIA",
    "Psia",
    "psi(a)",
    "psiabs",
    "bara",
    "BARA",
    "Bara",
    "bar(a)",
    "barabs",
    "kPaa",
    "kPa(a)",
    "kPaabs",
    "kpaa",
    "KPAA",
    "MPaa",
    "MPa(a)",
    "ata",
    "kg/cm2a",
    "kgf/cm2a",
    "kg/cm2(a)",
];

/// Why an absolute pressure is refused; shown after the unit.
const ABSOLUTE_PRESSURE_REASON: &str =
    "it is an absolute pressure, and every pressure field here is gauge (above the local atmosphere); subtract the \
        local atmospheric pressure (101.325 kPa = 14.696 psi at sea level) and type the gauge value, e.g. in psig or \
        barg";

/// Resolves the unit text typed in a field of `kind` (already split from the number).
///
/// # Errors
/// [`FieldErrorKind::RefusedUnit`] for an absolute pressure in a pressure field or
/// a unit of the right dimension that `kind` does not offer,
/// [`FieldErrorKind::WrongKind`] for a unit of another kind, and
/// [`FieldErrorKind::UnknownUnit`] with the nearest units of `kind` otherwise.
pub fn resolve_unit(unit_text: &str, kind: QuantityKind) -> Result<&'static UnitDef, FieldErrorKind> {
    let expected = || units_of(kind).map(|u| u.id).collect::<Vec<_>>().join(", ");
    let norm = normalise_unit(unit_text);
    if kind.dimension() == QuantityKind::Pressure && ABSOLUTE_PRESSURE_SPELLINGS.contains(&norm.as_str()) {
        return Err(FieldErrorKind::RefusedUnit {
            unit: unit_text.to_string(),
            reason: ABSOLUTE_PRESSURE_REASON.to_string(),
        });
    }
    match find_unit(unit_text) {
        Some(def) if kind.offers(def) => Ok(def),
        Some(def) if def.kind == kind.dimension() => Err(FieldErrorKind::RefusedUnit {
            unit: unit_text.to_string(),
            reason: format!("it is not a unit used for {}; use one of: {}", kind.name(), expected()),
        }),
        Some(def) => Err(FieldErrorKind::WrongKind {
            unit: def.id.to_string(),
            unit_kind: def.kind.name(),
            expected: expected(),
        }),
        None => Err(FieldErrorKind::UnknownUnit {
            unit: unit_text.to_string(),
            suggestions: nearest_units(&norm, kind),
            expected: expected(),
        }),
    }
}

/// The units of `kind` nearest to an unknown spelling, at most three, nearest first:
/// a spelling that differs only in letter case (`MM` → mm; then only those), else
/// one or two edits away (`kpsi` → ksi, psi), compared in lower case over ids and aliases.
///
/// ASCII lower case: no unit spelling has a cased letter outside ASCII (a unit test
/// checks), so Unicode's full case tables (about 12 kB in every wasm module) would
/// change no suggestion.
fn nearest_units(norm: &str, kind: QuantityKind) -> Vec<String> {
    let typed = norm.to_ascii_lowercase();
    let budget = if typed.chars().count() <= 3 { 1 } else { 2 };
    let mut ranked: Vec<(usize, usize, &'static str)> = Vec::new();
    for (order, def) in units_of(kind).enumerate() {
        let distance = std::iter::once(def.id)
            .chain(def.aliases.iter().copied())
            .map(|spelling| edit_distance(&typed, &spelling.to_ascii_lowercase()))
            .min()
            .unwrap_or(usize::MAX);
        if distance <= budget {
            ranked.push((distance, order, def.id));
        }
    }
    sort_short_by_key(&mut ranked, |item| *item);
    if ranked.first().is_some_and(|(distance, _, _)| *distance == 0) {
        // Only the letter case differs: those are the suggestions.
        ranked.retain(|(distance, _, _)| *distance == 0);
    }
    ranked.into_iter().take(3).map(|(_, _, id)| id.to_string()).collect()
}

/// Sorts a short list in place by `key`, smallest first, equal keys in their
/// order (an insertion sort).
///
/// Why not the standard library's sort: each element type it sorts brings about
/// 2 kB Brotli of code into a page's wasm module (measured: two sorts of two
/// types, 9.3 kB against 7.0 kB for the same module reversing the lists instead).
/// The lists sorted here are short: the units of one kind near a misspelling, and
/// the unit table once per page (a few hundred units).
fn sort_short_by_key<T, K: Ord>(items: &mut [T], key: impl Fn(&T) -> K) {
    for end in 1..items.len() {
        let mut at = end;
        while at > 0 && key(&items[at - 1]) > key(&items[at]) {
            items.swap(at - 1, at);
            at -= 1;
        }
    }
}

/// Optimal-string-alignment distance (insertions, deletions, substitutions and
/// transpositions of neighbours, each 1).
fn edit_distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    let width = b.len() + 1;
    let mut d = vec![0usize; (a.len() + 1) * width];
    for i in 0..=a.len() {
        d[i * width] = i;
    }
    for (j, cell) in d.iter_mut().enumerate().take(width) {
        *cell = j;
    }
    for i in 1..=a.len() {
        for j in 1..=b.len() {
            let cost = usize::from(a[i - 1] != b[j - 1]);
            let mut best = (d[(i - 1) * width + j] + 1)
                .min(d[i * width + j - 1] + 1)
                .min(d[(i - 1) * width + j - 1] + cost);
            if i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1] {
                best = best.min(d[(i - 2) * width + j - 2] + 1);
            }
            d[i * width + j] = best;
        }
    }
    d[a.len() * width + b.len()]
}

/// Folds the spellings people type into unit ids: superscripts, `^`, `·`, spaces.
fn normalise_unit(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for ch in text.trim().chars() {
        match ch {
            '²' | '₂' => out.push('2'),
            '³' | '₃' => out.push('3'),
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
    let (si, number, unit) = read_quantity(text, kind, default_unit)?;
    Ok((si, number.text.to_string(), unit.id))
}

/// A number read from the start of what was typed.
#[derive(Clone, Copy, Debug, PartialEq)]
struct TypedNumber<'a> {
    /// The number as typed (`"1,5"`, `"1-1/4"`).
    text: &'a str,
    value: f64,
    /// Significant digits typed (`"0.500"`: 3, `"150"`: 3, `"7"`: 1); a fraction
    /// counts as 4, since it is exact.
    significant: i32,
}

/// Reads number and unit: the SI value, the number as typed and the unit applied.
fn read_quantity<'a>(
    text: &'a str,
    kind: QuantityKind,
    default_unit: &str,
) -> Result<(f64, TypedNumber<'a>, &'static UnitDef), FieldErrorKind> {
    let text = text.trim();
    if text.chars().count() > MAX_INPUT_CHARS {
        return Err(FieldErrorKind::TooLong {
            max_chars: MAX_INPUT_CHARS,
        });
    }
    let (number, unit_text) = match read_fraction(text) {
        Some(fraction) => {
            let (number, rest) = fraction?;
            if kind != QuantityKind::Length {
                // Fractions are how the trade writes inches; elsewhere "1-1/4" is
                // more likely a slip than a number.
                return Err(FieldErrorKind::not_a_number(number.text.to_string()));
            }
            (number, rest)
        }
        None => {
            let (number_text, rest) = split_number(text);
            if number_text.is_empty() {
                let lower = text.to_ascii_lowercase();
                let bare = lower.trim_start_matches(['+', '-']);
                if bare.starts_with("nan") || bare.starts_with("inf") {
                    return Err(FieldErrorKind::NOT_FINITE);
                }
                return Err(FieldErrorKind::not_a_number(text.to_string()));
            }
            let number = TypedNumber {
                text: number_text,
                value: parse_number(number_text)?,
                significant: significant_digits(number_text),
            };
            (number, rest)
        }
    };
    let unit_text = unit_text.trim();
    let unit = resolve_unit(if unit_text.is_empty() { default_unit } else { unit_text }, kind)?;
    let si = number.value * unit.factor + unit.offset;
    if si.is_finite() {
        Ok((si, number, unit))
    } else {
        Err(FieldErrorKind::NOT_FINITE)
    }
}

/// Unicode vulgar fractions and their values.
const VULGAR_FRACTIONS: &[(char, f64)] = &[
    ('½', 1.0 / 2.0),
    ('⅓', 1.0 / 3.0),
    ('⅔', 2.0 / 3.0),
    ('¼', 1.0 / 4.0),
    ('¾', 3.0 / 4.0),
    ('⅕', 1.0 / 5.0),
    ('⅖', 2.0 / 5.0),
    ('⅗', 3.0 / 5.0),
    ('⅘', 4.0 / 5.0),
    ('⅙', 1.0 / 6.0),
    ('⅚', 5.0 / 6.0),
    ('⅛', 1.0 / 8.0),
    ('⅜', 3.0 / 8.0),
    ('⅝', 5.0 / 8.0),
    ('⅞', 7.0 / 8.0),
];

/// The largest denominator of a typed fraction.
const MAX_DENOMINATOR: u32 = 1000;

/// Reads a fraction as the trade writes it at the start of `text`: `3/4`, `1-1/4`,
/// `1 1/4`, `1¼`, `1 ¼`, `¾`, with an optional sign. `None` when the text does not
/// start with one (a plain decimal number).
fn read_fraction(text: &str) -> Option<Result<(TypedNumber<'_>, &str), FieldErrorKind>> {
    let (sign, body) = match text.strip_prefix('-') {
        Some(rest) => (-1.0, rest),
        None => (1.0, text.strip_prefix('+').unwrap_or(text)),
    };
    let digits = |s: &str| s.len() - s.trim_start_matches(|c: char| c.is_ascii_digit()).len();
    let vulgar = |s: &str| {
        let ch = s.chars().next()?;
        VULGAR_FRACTIONS
            .iter()
            .find(|(v, _)| *v == ch)
            .map(|(_, value)| (*value, ch.len_utf8()))
    };
    let whole_len = digits(body);
    let after_whole = &body[whole_len..];
    // (value, bytes of `body` read)
    let read: Result<(f64, usize), ()> = if whole_len == 0 {
        match vulgar(body) {
            Some((value, len)) => Ok((value, len)),
            None => return None,
        }
    } else {
        let whole = crate::decimal::parse_decimal(&body[..whole_len])?;
        let spaced = after_whole.trim_start();
        if let Some(rest) = after_whole.strip_prefix('/') {
            // "3/4": the whole part is the numerator.
            let den_len = digits(rest);
            if den_len == 0 {
                return None;
            }
            denominator(&rest[..den_len]).map(|den| (whole / den, whole_len + 1 + den_len))
        } else if let Some((value, len)) = vulgar(spaced) {
            Ok((whole + value, body.len() - spaced.len() + len))
        } else {
            // "1-1/4" or "1 1/4": a proper fraction after the whole number.
            let rest = match after_whole.strip_prefix('-') {
                Some(rest) => rest,
                None if spaced.len() < after_whole.len() => spaced,
                None => return None,
            };
            let num_len = digits(rest);
            let den_len = rest
                .get(num_len..)
                .and_then(|r| r.strip_prefix('/'))
                .map(digits)
                .unwrap_or(0);
            if num_len == 0 || den_len == 0 {
                return None;
            }
            let numerator = crate::decimal::parse_decimal(&rest[..num_len])?;
            let consumed = body.len() - rest.len() + num_len + 1 + den_len;
            match denominator(&rest[num_len + 1..num_len + 1 + den_len]) {
                Ok(den) if numerator < den => Ok((whole + numerator / den, consumed)),
                _ => Err(()),
            }
        }
    };
    let number_end = text.len() - body.len();
    Some(match read {
        Ok((value, len)) => {
            let (number_text, rest) = text.split_at(number_end + len);
            if rest.starts_with(|c: char| c.is_ascii_digit() || c == '.' || c == ',' || c == '/') {
                Err(FieldErrorKind::not_a_number(text.to_string()))
            } else {
                Ok((
                    TypedNumber {
                        text: number_text,
                        value: sign * value,
                        significant: 4,
                    },
                    rest,
                ))
            }
        }
        Err(()) => Err(FieldErrorKind::not_a_number(text.to_string())),
    })
}

/// A fraction's denominator: a whole number from 1 to [`MAX_DENOMINATOR`].
fn denominator(text: &str) -> Result<f64, ()> {
    match text.parse::<u32>() {
        Ok(den) if (1..=MAX_DENOMINATOR).contains(&den) => Ok(f64::from(den)),
        _ => Err(()),
    }
}

/// Significant digits of decimal number text: every digit of the mantissa from the
/// first non-zero one (`"0.0500"`: 3, `"1500"`: 4, `"0"`: 1).
fn significant_digits(number_text: &str) -> i32 {
    let mantissa = number_text.split(['e', 'E']).next().unwrap_or(number_text);
    let digits: String = mantissa.chars().filter(|c| c.is_ascii_digit()).collect();
    let count = digits.trim_start_matches('0').len();
    i32::try_from(count).unwrap_or(i32::MAX).max(1)
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
        // A thousands separator is followed by exactly three digits and follows one
        // to three digits that do not start with 0 ("1,500"; never "0,500").
        let after_digits = after.chars().take_while(|c| c.is_ascii_digit()).count();
        let integer = before.trim_start_matches(['+', '-']);
        let could_be_thousands = after_digits == 3 && (1..=3).contains(&integer.len()) && !integer.starts_with('0');
        if could_be_thousands {
            return Err(FieldErrorKind::AmbiguousComma { text: text.to_string() });
        }
        text.replacen(',', ".", 1)
    } else {
        return Err(FieldErrorKind::not_a_number(text.to_string()));
    };
    if dots > 1 {
        return Err(FieldErrorKind::not_a_number(text.to_string()));
    }
    let value =
        crate::decimal::parse_decimal(&normalised).ok_or_else(|| FieldErrorKind::not_a_number(text.to_string()))?;
    if value.is_finite() {
        Ok(value)
    } else {
        Err(FieldErrorKind::NOT_FINITE)
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
        (Q::ConcreteVolume, Si) => &["m3"],
        (Q::ConcreteVolume, Us) => &["yd3", "ft3"],
        (Q::Mass, Si) => &["t", "kg"],
        (Q::Mass, Us) => &["lb"],
        (Q::Time, _) => &["h", "min", "s"],
        (Q::Pressure, Si) => &["MPa", "kPa", "Pa"],
        (Q::Pressure, Us) => &["psi", "psf"],
        (Q::SoilBearing, Si) => &["kPa"],
        (Q::SoilBearing, Us) => &["psf"],
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
    // Compare after rounding to four figures, so 999 999.99 Pa shows as 1.000 MPa.
    // Areas stay in m² (ft²) down to 0.01: a bearing face of 0.75 m² reads better
    // than 750 000 mm².
    let threshold = if kind == QuantityKind::Area {
        0.009_999_5
    } else {
        0.999_95
    };
    // The first unit in which the value reaches the threshold, else the last (the
    // smallest). Every id in the display table is offered for its kind (checked by
    // a unit test).
    let last = ids.len() - 1;
    ids.iter()
        .enumerate()
        .filter_map(|(i, id)| find_unit_of(id, kind).map(|def| (i, def)))
        .find(|&(i, def)| i == last || ((si - def.offset) / def.factor).abs() >= threshold)
        .map(|(_, def)| def)
        .unwrap_or(&UNITS[0])
}

/// An SI value in the display unit for `system`: the number (four significant
/// figures) and the unit, apart ([`format_quantity`] joins them).
pub fn display_parts(si: f64, kind: QuantityKind, system: UnitSystem) -> (String, &'static UnitDef) {
    let def = display_unit(si, kind, system);
    (format_significant((si - def.offset) / def.factor, 4), def)
}

/// A number and its unit as [`format_quantity`] joins them (`"12.4 kN"`; a
/// dimensionless `-` unit adds nothing): the text of [`display_parts`] without
/// formatting the number again.
pub fn joined_with_id(number: &str, def: &UnitDef) -> String {
    if def.id == "-" {
        number.to_string()
    } else {
        format!("{number} {}", def.id)
    }
}

/// Formats an SI value in the display unit for `system`, four significant figures.
pub fn format_quantity(si: f64, kind: QuantityKind, system: UnitSystem) -> String {
    let (number, def) = display_parts(si, kind, system);
    joined_with_id(&number, def)
}

/// [`format_quantity`] as people read it, the unit's label in place of its id
/// (`"12.4 kN"`, `"45°"`, `"2 m³/h"`): what [`with_label`] makes of it, written at
/// once.
pub fn format_quantity_labelled(si: f64, kind: QuantityKind, system: UnitSystem) -> String {
    let (number, def) = display_parts(si, kind, system);
    def.show(&number)
}

/// Formats an SI value in a given unit id (falls back to the SI display unit).
pub fn format_quantity_in(si: f64, kind: QuantityKind, unit_id: &str) -> String {
    let (number, def) = parts_in(si, kind, unit_id);
    joined_with_id(&number, def)
}

/// A field's limit (an SI value) in a unit id as a message states it: four
/// significant figures without trailing zeros, the unit by its label (`0.1°`,
/// `1 mm`, `99.9 °C`). A limit is a round number; `180.0°` would claim a precision
/// it does not have. Falls back to the SI display unit as [`format_quantity_in`].
pub fn format_limit(si: f64, kind: QuantityKind, unit_id: &str) -> String {
    let (number, def) = parts_in(si, kind, unit_id);
    def.show(&trim_zeros(&number))
}

/// The number (four significant figures) and unit of [`format_quantity_in`].
fn parts_in(si: f64, kind: QuantityKind, unit_id: &str) -> (String, &'static UnitDef) {
    match find_unit(unit_id) {
        Some(def) if def.kind == kind.dimension() => (format_significant((si - def.offset) / def.factor, 4), def),
        _ => display_parts(si, kind, UnitSystem::Si),
    }
}

/// Formatted text as people read it: `"99.9 degC"` → `"99.9 °C"`, `"45 deg"` →
/// `"45°"`, `"2 m3/h"` → `"2 m³/h"` (what [`format_quantity_in`] writes, with the
/// unit's label in place of its id); other text is returned as it is. For messages
/// and help, never for text that is parsed again.
pub fn with_label(text: &str) -> String {
    match text.split_once(' ') {
        Some((number, id)) => match unit_by_id(id) {
            Some(def) => def.show(number),
            None => text.to_string(),
        },
        None => text.to_string(),
    }
}

/// A table heading or axis title as people read it: each unit code in parentheses
/// written as its label (`"area (m2)"` → `"area (m²)"`, `"angle (deg)"` →
/// `"angle (°)"`), and a text that is nothing but a unit code likewise (`"N.m"` →
/// `"N·m"`); `None` when that is `text` itself (other text, or codes that are their
/// own labels): a result's tables have hundreds of cells, most of them numbers and
/// words with no code, so the caller keeps those as they are instead of copying
/// each. Never for text that is parsed again.
pub fn relabel_codes(text: &str) -> Option<String> {
    if let Some(def) = unit_by_id(text) {
        let label = def.label();
        return (label != text).then(|| label.to_string());
    }
    // Every "(" is tried as the start of a code: one pass over the text, each code
    // looked up by the text up to the next ")" (or the one after, for an id that
    // holds a parenthesis itself, `lb/(ft.s)`).
    let mut out = String::new();
    let mut copied = 0;
    let mut from = 0;
    while let Some(found) = text[from..].find('(') {
        let open = from + found;
        from = open + 1;
        let rest = &text[open + 1..];
        let mut closes = rest.match_indices(')').map(|(at, _)| at);
        let code = closes
            .by_ref()
            .take(2)
            .filter_map(|close| unit_by_id(&rest[..close]))
            .find(|def| def.label() != def.id);
        if let Some(def) = code {
            out.push_str(&text[copied..=open]);
            out.push_str(def.label());
            copied = open + 1 + def.id.len();
            from = copied;
        }
    }
    if copied == 0 {
        return None;
    }
    out.push_str(&text[copied..]);
    Some(out)
}

/// The unit whose id is exactly `id` (no folding, no aliases).
///
/// Every value a result shows is looked up by its unit's id (to format it, to
/// label it), dozens of times a solve: a binary search over the ids in order
/// instead of a scan of all of [`UNITS`].
pub fn unit_by_id(id: &str) -> Option<&'static UnitDef> {
    /// The units sorted by id (its length, then its text), and the longest id
    /// (longer text is no id at all).
    ///
    /// Length first: most steps of the search compare two lengths, and
    /// text is compared only among ids as long as the one sought (a solve looks up
    /// a unit several times per value it shows).
    static BY_ID: std::sync::OnceLock<(Vec<&'static UnitDef>, usize)> = std::sync::OnceLock::new();
    let (sorted, longest) = BY_ID.get_or_init(|| {
        let mut sorted: Vec<&'static UnitDef> = UNITS.iter().collect();
        // Every id is one unit's (the test
        // `unit_ids_and_aliases_are_unique_and_ids_ascii`): any sort gives the one
        // order.
        sort_short_by_key(&mut sorted, |u| (u.id.len(), u.id));
        let longest = UNITS.iter().map(|u| u.id.len()).max().unwrap_or(0);
        (sorted, longest)
    });
    if id.is_empty() || id.len() > *longest {
        return None;
    }
    sorted
        .binary_search_by(|u| u.id.len().cmp(&id.len()).then_with(|| u.id.cmp(id)))
        .ok()
        .map(|i| sorted[i])
}

/// The number of `si` expressed in `unit_id`, if that unit exists and measures
/// `kind` (any unit of its dimension: a soil bearing in bar is still a number).
pub fn convert_to(si: f64, kind: QuantityKind, unit_id: &str) -> Option<f64> {
    find_unit(unit_id)
        .filter(|d| d.kind == kind.dimension())
        .map(|d| (si - d.offset) / d.factor)
}

/// The fewest significant figures of a converted input ([`convert_text`]): a demo
/// value of 7 bar reads 101.5 psi, not 101.526 psi.
pub const CONVERTED_MIN_SIGNIFICANT_FIGURES: i32 = 4;
/// The most significant figures of a converted input (well inside an f64's 15).
pub const CONVERTED_MAX_SIGNIFICANT_FIGURES: i32 = 12;

/// Converts what the user typed in a field (`"10"` with `from_default_unit` `"bar"`,
/// or `"10 bar"`) to the number text in `to_unit`, without the unit, rounded for the
/// eye: one significant figure more than were typed (a guard figure, so that the
/// value converted back reads as typed), at least
/// [`CONVERTED_MIN_SIGNIFICANT_FIGURES`], trailing zeros dropped. So `"7"` bar gives
/// `"101.5"` psi, `"10"` bar `"145"` psi (145.04 to four figures is 145.0), and
/// `"1234.56"` m keeps seven figures, `"4050.394"` ft: an elevation typed to the
/// centimetre is not rounded to the foot. Derived from the definitions of the units
/// in [`UNITS`] (`si = value * factor + offset`). The page keeps what was typed and
/// restores it when the system is switched back.
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
    let (si, number, _) = read_quantity(text, kind, from_default_unit)?;
    let expected = || units_of(kind).map(|u| u.id).collect::<Vec<_>>().join(", ");
    let Some(target) = find_unit(to_unit) else {
        return Err(FieldErrorKind::UnknownUnit {
            unit: to_unit.to_string(),
            suggestions: Vec::new(),
            expected: expected(),
        });
    };
    if target.kind != kind.dimension() {
        return Err(FieldErrorKind::WrongKind {
            unit: target.id.to_string(),
            unit_kind: target.kind.name(),
            expected: expected(),
        });
    }
    let value = (si - target.offset) / target.factor;
    if !value.is_finite() {
        return Err(FieldErrorKind::NOT_FINITE);
    }
    let figures = (number.significant.saturating_add(1))
        .clamp(CONVERTED_MIN_SIGNIFICANT_FIGURES, CONVERTED_MAX_SIGNIFICANT_FIGURES);
    Ok(trim_zeros(&format_significant(value, figures)))
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
mod label_tests {
    use super::*;

    /// The text as people read it ([`relabel_codes`], or the text itself).
    fn labels_for_codes(text: &str) -> String {
        relabel_codes(text).unwrap_or_else(|| text.to_string())
    }

    #[test]
    fn every_label_reads_back_as_its_unit_and_has_no_ascii_exponent_or_dot() {
        for unit in UNITS {
            let label = unit.label();
            assert!(!label.is_empty(), "{}", unit.id);
            assert_eq!(
                find_unit(label).map(|u| u.id),
                Some(unit.id),
                "label {label} of {}",
                unit.id
            );
            if unit.id != "-" {
                assert!(
                    !label.contains(|c: char| c.is_ascii_digit() || c == '.'),
                    "label {label} of {} keeps an ASCII exponent or dot",
                    unit.id
                );
            }
        }
    }

    #[test]
    fn shown_values_split_into_number_and_unit() {
        type Split<'a> = Option<(&'a str, Option<&'a str>)>;
        let cases: &[(&str, Split)] = &[
            ("12.4 kN", Some(("12.4", Some("kN")))),
            ("45 deg", Some(("45", Some("deg")))),
            ("-3.5e-7 m2/s", Some(("-3.5e-7", Some("m2/s")))),
            ("0.5", Some(("0.5", None))),
            ("1.2 %", Some(("1.2", Some("%")))),
            ("—", None),
            ("yes (within 1 %)", None),
            ("12 apples", None),
            ("inf kN", None),
            ("NaN", None),
            ("12.4 kN up", None),
        ];
        for (text, expected) in cases {
            let got = split_shown(text).map(|(n, u)| (n, u.map(|u| u.id)));
            let expected = expected.map(|(n, u)| (n.to_string(), u));
            assert_eq!(got, expected, "{text}");
        }
        let deg = find_unit("deg").map(|u| u.show("45"));
        assert_eq!(deg.as_deref(), Some("45°"));
        let flow = find_unit("m3/h").map(|u| u.show("3.2"));
        assert_eq!(flow.as_deref(), Some("3.2 m³/h"));
        let ratio = find_unit("-").map(|u| u.show("0.9"));
        assert_eq!(ratio.as_deref(), Some("0.9"));
    }

    #[test]
    fn headings_show_labels_for_codes() {
        assert_eq!(labels_for_codes("area (m2)"), "area (m²)");
        assert_eq!(labels_for_codes("flow (m3/h)"), "flow (m³/h)");
        assert_eq!(labels_for_codes("angle β (deg)"), "angle β (°)");
        assert_eq!(labels_for_codes("N.m"), "N·m");
        assert_eq!(labels_for_codes("force (kN)"), "force (kN)");
        assert_eq!(labels_for_codes("bend 45deg (typed)"), "bend 45deg (typed)");
        assert_eq!(labels_for_codes("stress (kgf/cm2)"), "stress (kgf/cm²)");
        assert_eq!(labels_for_codes("viscosity (lb/(ft.s))"), "viscosity (lb/(ft·s))");
        assert_eq!(labels_for_codes("((m2)) (m3"), "((m²)) (m3");
    }

    /// Every code written as its label, unit after unit: the definition that
    /// [`labels_for_codes`] computes in one pass over the text.
    fn labels_for_codes_unit_by_unit(text: &str) -> String {
        if let Some(def) = UNITS.iter().find(|u| u.id == text) {
            return def.label().to_string();
        }
        let mut out = text.to_string();
        for def in UNITS.iter().filter(|u| u.label() != u.id) {
            out = out.replace(&format!("({})", def.id), &format!("({})", def.label()));
        }
        out
    }

    #[test]
    fn labelled_quantities_are_the_formatted_ones_with_labels() {
        for kind in QuantityKind::ALL {
            for si in [
                0.0,
                -2.5e-7,
                1.5e-4,
                0.75,
                1.0,
                12.0,
                -273.15,
                3.4e4,
                9.9e6,
                4.2e13,
                f64::NAN,
            ] {
                for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                    assert_eq!(
                        format_quantity_labelled(si, kind, system),
                        with_label(&format_quantity(si, kind, system)),
                        "{kind:?} {si} {system:?}"
                    );
                }
            }
        }
    }

    #[test]
    fn labels_for_codes_in_one_pass_agree_with_unit_by_unit() {
        let mut spellings: Vec<&str> = vec!["", "x", "(", ")", "()", "deg(", "typed", "1.5"];
        for def in UNITS {
            spellings.push(def.id);
            spellings.push(def.label());
            spellings.extend(def.aliases.iter().copied());
        }
        // Second codes: those that are written as another label, and no code at all.
        let mut others: Vec<&str> = vec!["", "x", "("];
        others.extend(UNITS.iter().filter(|u| u.label() != u.id).map(|u| u.id));
        let mut texts = Vec::new();
        for a in &spellings {
            texts.push(a.to_string());
            texts.push(format!("({a}"));
            texts.push(format!("{a})"));
            texts.push(format!("(({a}))"));
            for b in &others {
                texts.push(format!("heading ({a}) and ({b})"));
                texts.push(format!("({a})({b})"));
                texts.push(format!("({a}({b}))"));
            }
        }
        for text in &texts {
            assert_eq!(labels_for_codes(text), labels_for_codes_unit_by_unit(text), "{text:?}");
        }
    }

    #[test]
    fn display_parts_join_to_the_formatted_text() {
        for kind in QuantityKind::ALL {
            for si in [0.0, 1.5e-4, 0.75, 12.0, 3.4e4, 9.9e6] {
                for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                    let (number, unit) = display_parts(si, kind, system);
                    let text = format_quantity(si, kind, system);
                    let joined = if unit.id == "-" {
                        number.clone()
                    } else {
                        format!("{number} {}", unit.id)
                    };
                    assert_eq!(joined, text, "{kind:?} {si} {system:?}");
                }
            }
        }
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
    fn display_units_exist_and_are_offered_for_their_kind() {
        let kinds = QuantityKind::ALL;
        for kind in kinds {
            for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                for id in display_units(kind, system) {
                    assert!(
                        find_unit_of(id, kind).is_some(),
                        "{kind:?}: display unit {id} not offered"
                    );
                }
            }
            assert!(units_of(kind).count() > 0);
        }
    }

    #[test]
    fn units_are_defined_in_base_kinds_and_shared_kinds_offer_listed_ids() {
        for def in UNITS {
            assert_eq!(
                def.kind.dimension(),
                def.kind,
                "{} is defined under a shared kind",
                def.id
            );
        }
        for kind in QuantityKind::ALL {
            if let Some(ids) = kind.offered_ids() {
                assert_ne!(kind.dimension(), kind);
                for id in ids {
                    let def = find_unit(id).unwrap_or_else(|| panic!("{kind:?}: {id} is not a unit"));
                    assert_eq!(def.kind, kind.dimension(), "{kind:?}: {id}");
                }
                assert_eq!(units_of(kind).count(), ids.len(), "{kind:?}");
            }
        }
    }

    /// The short-list sort orders as the standard library's stable sort does
    /// (an independent implementation): equal keys keep their order.
    #[test]
    fn the_short_list_sort_orders_as_the_standard_librarys_stable_sort() {
        let mut random = crate::test_random::TestRandom::new(0x9e37_79b9_7f4a_7c15);
        for length in 0..40 {
            let mut list: Vec<(u64, usize)> = (0..length).map(|at| (random.below(7), at)).collect();
            let mut expected = list.clone();
            expected.sort_by_key(|item| item.0);
            sort_short_by_key(&mut list, |item| item.0);
            assert_eq!(list, expected, "length {length}");
        }
        let mut by_id: Vec<&UnitDef> = UNITS.iter().collect();
        let mut expected = by_id.clone();
        expected.sort_by_key(|u| (u.id.len(), u.id));
        sort_short_by_key(&mut by_id, |u| (u.id.len(), u.id));
        assert!(by_id.iter().zip(&expected).all(|(a, b)| a.id == b.id));
    }

    #[test]
    fn unit_ids_and_aliases_are_unique_and_ids_ascii() {
        let mut spellings: Vec<&str> = Vec::new();
        for def in UNITS {
            assert!(def.id.is_ascii(), "{}", def.id);
            assert_eq!(normalise_unit(def.id), def.id, "{} is not in normal form", def.id);
            spellings.push(def.id);
            for alias in def.aliases {
                assert_eq!(&normalise_unit(alias), alias, "{alias} can never match");
                spellings.push(alias);
            }
        }
        for (i, a) in spellings.iter().enumerate() {
            assert!(!spellings[i + 1..].contains(a), "{a} is listed twice");
            assert!(!ABSOLUTE_PRESSURE_SPELLINGS.contains(a), "{a} is also refused");
        }
    }

    #[test]
    fn no_unit_spelling_has_a_cased_letter_outside_ascii() {
        // The suggestions for an unknown unit compare in ASCII lower case
        // (`nearest_units`): a spelling with such a letter would need Unicode's.
        for def in UNITS {
            for spelling in std::iter::once(def.id).chain(def.aliases.iter().copied()) {
                assert!(
                    spelling
                        .chars()
                        .all(|c| c.is_ascii() || (c.to_lowercase().eq([c]) && c.to_uppercase().eq([c]))),
                    "{spelling} has a cased letter outside ASCII"
                );
            }
        }
    }

    #[test]
    fn case_aliases_never_read_a_prefix_as_another() {
        // An alias that differs from another unit's id or alias only in letter case
        // would bring back the guessing this module refuses (mN read as MN).
        for def in UNITS {
            for alias in def.aliases {
                for other in UNITS.iter().filter(|o| o.id != def.id) {
                    let clash = std::iter::once(other.id)
                        .chain(other.aliases.iter().copied())
                        .find(|o| o.eq_ignore_ascii_case(alias));
                    assert!(
                        clash.is_none(),
                        "{alias} ({}) is {clash:?} ({}) in another case",
                        def.id,
                        other.id
                    );
                }
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
            // What the trade types (issue 8): gauge suffixes and other spellings.
            ("150 psig", Q::Pressure, "kPa", 150.0 * 6894.757293168361),
            ("150 PSIG", Q::Pressure, "kPa", 150.0 * 6894.757293168361),
            ("10 barg", Q::Pressure, "kPa", 1.0e6),
            ("700 kPag", Q::Pressure, "bar", 7.0e5),
            ("700 kN/m2", Q::Pressure, "bar", 7.0e5),
            ("700 kN/m²", Q::Pressure, "bar", 7.0e5),
            ("2 N/mm2", Q::Pressure, "bar", 2.0e6),
            ("120 m3/hr", Q::VolumeFlow, "L/s", 120.0 / 3600.0),
            ("2 yd3", Q::Volume, "m3", 2.0 * 0.764554857984),
            ("2 yd3", Q::ConcreteVolume, "m3", 2.0 * 0.764554857984),
            ("2000 psf", Q::SoilBearing, "kPa", 2000.0 * 47.88025898033584),
            ("150 kN/m2", Q::SoilBearing, "psf", 150e3),
            ("2000", Q::SoilBearing, "psf", 2000.0 * 47.88025898033584),
            // Decimal commas that cannot be thousands separators.
            ("0,500 m", Q::Length, "m", 0.5),
            ("-0,500 m", Q::Length, "m", -0.5),
            ("1,5000 m", Q::Length, "m", 1.5),
            ("1234,567 m", Q::Length, "m", 1234.567),
            ("12,25 m", Q::Length, "m", 12.25),
            // Fractional inches as the trade writes them (exact: in = 0.0254 m).
            ("1-1/4 in", Q::Length, "m", 1.25 * 0.0254),
            ("1 1/4 in", Q::Length, "m", 1.25 * 0.0254),
            ("1 1/4in", Q::Length, "m", 1.25 * 0.0254),
            ("1¼ in", Q::Length, "m", 1.25 * 0.0254),
            ("1 ¼\"", Q::Length, "m", 1.25 * 0.0254),
            ("3/4 in", Q::Length, "m", 0.75 * 0.0254),
            ("¾ in", Q::Length, "m", 0.75 * 0.0254),
            ("-2-1/2", Q::Length, "in", -2.5 * 0.0254),
            ("10 3/16 in", Q::Length, "m", (10.0 + 3.0 / 16.0) * 0.0254),
            ("1 1/2 ft", Q::Length, "m", 1.5 * 0.3048),
            ("5 1/2", Q::Length, "in", 5.5 * 0.0254),
        ];
        for (text, kind, default, expected) in cases {
            let got = parse_quantity(text, *kind, default).unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_relative_eq!(got, *expected, max_relative = 1e-12);
        }
    }

    #[test]
    fn refuses_bad_text_with_typed_errors() {
        assert_eq!(parse_quantity("NaN", Q::Length, "m"), Err(FieldErrorKind::NOT_FINITE));
        assert_eq!(parse_quantity("-inf", Q::Length, "m"), Err(FieldErrorKind::NOT_FINITE));
        assert_eq!(parse_quantity("1e999", Q::Length, "m"), Err(FieldErrorKind::NOT_FINITE));
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
        // Fractions: a denominator of 0, an improper fraction after a whole number,
        // trailing digits, and fractions outside a length field are refused.
        for (text, kind) in [
            ("1/0 in", Q::Length),
            ("1 5/4 in", Q::Length),
            ("1-1/4/2 in", Q::Length),
            ("1 1/4.5 in", Q::Length),
            ("1/2", Q::Ratio),
            ("1-1/4 bar", Q::Pressure),
        ] {
            assert!(
                matches!(parse_quantity(text, kind, "in"), Err(FieldErrorKind::NotANumber { .. })),
                "{text}: {:?}",
                parse_quantity(text, kind, "in")
            );
        }
        let long = "9".repeat(100_000);
        assert!(matches!(
            parse_quantity(&long, Q::Length, "m"),
            Err(FieldErrorKind::TooLong { .. })
        ));
    }

    /// Unit spellings and what they resolve to in a field of `kind`: a unit id, or
    /// the error, by name.
    const SPELLINGS: &[(&str, QuantityKind, Result<&str, &str>)] = &[
        // No case-insensitive guessing: each of these was read with the wrong SI
        // prefix or without a rule before (issue 8).
        ("10 mN", Q::Force, Err("UnknownUnit")),
        ("10 mW", Q::Power, Err("UnknownUnit")),
        ("10 MM", Q::Length, Err("UnknownUnit")),
        ("10 mpa", Q::Pressure, Err("UnknownUnit")),
        ("10 Mw", Q::Power, Err("UnknownUnit")),
        ("10 KM", Q::Length, Err("UnknownUnit")),
        ("10 kn", Q::Force, Err("UnknownUnit")),
        // Listed case variants where no prefix can be misread.
        ("10 KPA", Q::Pressure, Ok("kPa")),
        ("10 kpa", Q::Pressure, Ok("kPa")),
        ("10 PSI", Q::Pressure, Ok("psi")),
        ("10 MPA", Q::Pressure, Ok("MPa")),
        ("10 GPM", Q::VolumeFlow, Ok("gpm")),
        ("10 KN", Q::Force, Ok("kN")),
        ("10 MN", Q::Force, Ok("MN")),
        ("10 MW", Q::Power, Ok("MW")),
        // What the trade types.
        ("10 psig", Q::Pressure, Ok("psi")),
        ("10 barg", Q::Pressure, Ok("bar")),
        ("10 kPag", Q::Pressure, Ok("kPa")),
        ("10 kN/m2", Q::Pressure, Ok("kPa")),
        ("10 kg/cm2", Q::Pressure, Ok("kgf/cm2")),
        ("10 kg/cm²", Q::Pressure, Ok("kgf/cm2")),
        ("2 tsf", Q::Pressure, Ok("tsf")),
        ("30 ftH2O", Q::Pressure, Ok("ftWC")),
        ("30 ft H2O", Q::Pressure, Ok("ftWC")),
        ("10 mH2O", Q::Pressure, Ok("mWC")),
        ("10 mH₂O", Q::Pressure, Ok("mWC")),
        ("4 inH2O", Q::Pressure, Ok("inWC")),
        ("4 in. w.c.", Q::Pressure, Ok("inWC")),
        ("10 m3/hr", Q::VolumeFlow, Ok("m3/h")),
        ("3 yd3", Q::Volume, Ok("yd3")),
        ("3 cu yd", Q::ConcreteVolume, Ok("yd3")),
        // Absolute pressures in gauge fields: refused with the reason.
        ("14.7 psia", Q::Pressure, Err("RefusedUnit")),
        ("14.7 PSIA", Q::Pressure, Err("RefusedUnit")),
        ("1 bara", Q::Pressure, Err("RefusedUnit")),
        ("1 bar(a)", Q::Pressure, Err("RefusedUnit")),
        ("101 kPaa", Q::Pressure, Err("RefusedUnit")),
        ("101 kPa (a)", Q::Pressure, Err("RefusedUnit")),
        ("1 bara", Q::SoilBearing, Err("RefusedUnit")),
        // Soil bearing: the trade's units only, and a reason for the others.
        ("2000 psf", Q::SoilBearing, Ok("psf")),
        ("2 ksf", Q::SoilBearing, Ok("ksf")),
        ("1.5 tsf", Q::SoilBearing, Ok("tsf")),
        ("150 kN/m2", Q::SoilBearing, Ok("kPa")),
        ("1.5 kg/cm2", Q::SoilBearing, Ok("kgf/cm2")),
        ("1.5 bar", Q::SoilBearing, Err("RefusedUnit")),
        ("1.5 inH2O", Q::SoilBearing, Err("RefusedUnit")),
        ("1.5 m", Q::SoilBearing, Err("WrongKind")),
        // Concrete: m³, yd³, ft³.
        ("2 m3", Q::ConcreteVolume, Ok("m3")),
        ("50 ft3", Q::ConcreteVolume, Ok("ft3")),
        ("50 gal", Q::ConcreteVolume, Err("RefusedUnit")),
        ("14.7 psia", Q::Length, Err("UnknownUnit")),
    ];

    fn error_name(error: &FieldErrorKind) -> &'static str {
        match error {
            FieldErrorKind::UnknownUnit { .. } => "UnknownUnit",
            FieldErrorKind::RefusedUnit { .. } => "RefusedUnit",
            FieldErrorKind::WrongKind { .. } => "WrongKind",
            _ => "another error",
        }
    }

    #[test]
    fn resolves_only_exact_spellings_and_listed_aliases() {
        for (text, kind, expected) in SPELLINGS {
            let got = parse_quantity_echo(text, *kind, "").map(|(_, _, unit)| unit);
            let got_named = got.as_ref().map(|unit| *unit).map_err(error_name);
            assert_eq!(got_named, *expected, "{text} as {kind:?}: {got:?}");
        }
    }

    #[test]
    fn unknown_units_suggest_the_nearest_of_the_field() {
        let cases: &[(&str, QuantityKind, &[&str])] = &[
            ("MM", Q::Length, &["mm"]),
            ("mN", Q::Force, &["MN"]),
            ("mW", Q::Power, &["MW"]),
            ("kpsi", Q::Pressure, &["psi", "ksi", "kPa"]),
            ("gmp", Q::VolumeFlow, &["gpm"]),
            ("furlongs", Q::Length, &[]),
        ];
        for (unit, kind, expected) in cases {
            let error = resolve_unit(unit, *kind).expect_err(unit);
            let FieldErrorKind::UnknownUnit { suggestions, .. } = &error else {
                panic!("{unit}: {error:?}");
            };
            assert_eq!(suggestions, expected, "{unit}");
            let message = error.to_string();
            for suggestion in *expected {
                assert!(message.contains(suggestion), "{message}");
            }
        }
        // The field's units are listed too, so the message names a way out.
        let message = resolve_unit("MM", Q::Length).expect_err("MM").to_string();
        assert!(
            message.contains("did you mean mm?") && message.contains("m, mm, cm"),
            "{message}"
        );
    }

    #[test]
    fn absolute_pressure_is_refused_saying_why() {
        let message = parse_quantity("14.7 psia", Q::Pressure, "psi")
            .expect_err("psia")
            .to_string();
        assert!(message.contains("absolute") && message.contains("gauge"), "{message}");
    }

    #[test]
    fn conversion_factors_match_published_and_library_values() {
        // (typed, kind, expected SI value, relative tolerance, source)
        let cases: &[(&str, QuantityKind, f64, f64, &str)] = &[
            (
                "1 psi",
                Q::Pressure,
                6894.757,
                1e-7,
                "NIST SP 811 (2008) App. B.8: pound-force per square inch = 6.894 757 E+03 Pa",
            ),
            (
                "1 psi",
                Q::Pressure,
                6894.7572931683635,
                1e-12,
                "pint==0.25.3: Quantity(1, 'psi').to('Pa')",
            ),
            (
                "1 psf",
                Q::Pressure,
                47.88025898033586,
                1e-12,
                "pint==0.25.3: Quantity(1, 'lbf/ft**2').to('Pa')",
            ),
            (
                "1 ksf",
                Q::SoilBearing,
                47880.25898033586,
                1e-12,
                "pint==0.25.3: Quantity(1, 'kip/ft**2').to('Pa')",
            ),
            (
                "1 tsf",
                Q::SoilBearing,
                95760.51796067174,
                1e-12,
                "pint==0.25.3: Quantity(1, 'ton_force/ft**2').to('Pa')",
            ),
            (
                "1 tsf",
                Q::Pressure,
                8896.443 / 0.09290304,
                1e-6,
                "NIST SP 811 App. B.8: ton-force (2000 lbf) = 8.896 443 E+03 N, over ft² = 9.290 304 E-02 m² (from \
                    memory)",
            ),
            (
                "1 kg/cm2",
                Q::Pressure,
                98066.5,
                1e-12,
                "NIST SP 811 App. B.8: kilogram-force per square centimeter = 9.806 65 E+04 Pa (exact); \
                    pint==0.25.3 'kgf/cm**2' the same",
            ),
            (
                "1 mH2O",
                Q::Pressure,
                9806.65,
                1e-12,
                "conventional metre of water, 1000 kg/m³ × 9.806 65 m/s²; pint==0.25.3 'meter_H2O' = 9806.65",
            ),
            (
                "1 ftH2O",
                Q::Pressure,
                2989.067,
                2e-7,
                "NIST SP 811 App. B.8: foot of water (39.2 °F) = 2.989 067 E+03 Pa",
            ),
            (
                "1 ftH2O",
                Q::Pressure,
                2989.0669199999993,
                1e-12,
                "pint==0.25.3: Quantity(1, 'foot_H2O').to('Pa')",
            ),
            (
                "1 inH2O",
                Q::Pressure,
                249.08890999999997,
                1e-12,
                "pint==0.25.3: Quantity(1, 'inch_H2O').to('Pa') (conventional)",
            ),
            (
                "1 inH2O",
                Q::Pressure,
                249.082,
                3e-5,
                "NIST SP 811 App. B.8: inch of water (39.2 °F) = 249.082 Pa; the conventional column is 2.7e-5 \
                    higher (1000 against 999.97 kg/m³)",
            ),
            (
                "1 inH2O",
                Q::Pressure,
                248.84,
                1.1e-3,
                "NIST SP 811 App. B.8: inch of water (60 °F) = 248.84 Pa; 1.0e-3 lower than the conventional \
                    column",
            ),
            (
                "1 yd3",
                Q::ConcreteVolume,
                0.764554857984,
                1e-12,
                "pint==0.25.3: Quantity(1, 'yard**3').to('m**3'); NIST SP 811: cubic yard = 7.645 549 E-01 m³",
            ),
            (
                "1 m3/hr",
                Q::VolumeFlow,
                0.0002777777777777778,
                1e-12,
                "pint==0.25.3: Quantity(1, 'm**3/hr').to('m**3/s')",
            ),
        ];
        for (text, kind, expected, tolerance, source) in cases {
            let got = parse_quantity(text, *kind, "").unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_relative_eq!(got, *expected, max_relative = *tolerance);
            // A tolerance that lets the conventional and 60 °F inch of water pass as
            // equal would test nothing: each is below the gap it must detect.
            assert!(*tolerance < 2e-3, "{source}");
        }
        // The 60 °F inch of water is not the conventional one: the check can fail.
        let inch_conventional = parse_quantity("1 inH2O", Q::Pressure, "").unwrap_or(f64::NAN);
        assert!((inch_conventional - 248.84).abs() / 248.84 > 9e-4);
    }

    #[test]
    fn converts_typed_text_between_units() {
        // Expected numbers derived from the definitions (NIST SP 811 Appendix B):
        // 10 bar = 1e6 Pa / 6894.757 293 168 Pa/psi = 145.037 738 psi;
        // 2.5 m/s / 0.3048 = 8.202 099 7 ft/s; 20 degC = 68 degF; 150 psi = 10.342 136 bar.
        // Rounded for the eye: one figure more than typed, at least four (issue 8:
        // a demo value of 7 bar showed as 101.526 psi).
        let cases: &[(&str, QuantityKind, &str, &str, &str)] = &[
            ("7", Q::Pressure, "bar", "psi", "101.5"),
            ("7 bar", Q::Pressure, "kPa", "psi", "101.5"),
            ("10", Q::Pressure, "bar", "psi", "145"),
            ("10 bar", Q::Pressure, "psi", "psi", "145"),
            ("10.00", Q::Pressure, "bar", "psi", "145.04"),
            ("145.038", Q::Pressure, "psi", "bar", "10.00002"),
            ("145.0377", Q::Pressure, "psi", "bar", "9.9999974"),
            ("150", Q::Pressure, "psi", "bar", "10.34"),
            ("2,5", Q::Velocity, "m/s", "ft/s", "8.202"),
            ("0,500", Q::Length, "m", "ft", "1.64"),
            ("1234.56", Q::Length, "m", "ft", "4050.394"),
            ("1-1/4", Q::Length, "in", "mm", "31.75"),
            ("150", Q::SoilBearing, "kPa", "psf", "3133"),
            ("2", Q::ConcreteVolume, "yd3", "m3", "1.529"),
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
            // What comes out is read back by the parser as the same value, to half a
            // unit in its last figure (at least four figures: 5e-4 relative).
            let back = parse_quantity(&got, *kind, to).unwrap_or_else(|e| panic!("{got}: {e}"));
            let original = parse_quantity(text, *kind, from).unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_relative_eq!(back, original, max_relative = 5e-4, epsilon = 1e-12);
        }
    }

    #[test]
    fn any_mix_of_number_and_fraction_pieces_is_read_or_refused_never_panics() {
        // Every string of up to three of these pieces: a value is finite, an error typed.
        let pieces = [
            "1", "12", "0", "-", "+", "/", " ", "¼", "½", ",", ".", "e", "in", "psi", "H2O", "\"", "/0", "1000", "a",
            "°",
        ];
        let mut texts = vec![String::new()];
        for _ in 0..3 {
            let longer: Vec<String> = texts
                .iter()
                .flat_map(|t| pieces.iter().map(move |p| format!("{t}{p}")))
                .collect();
            texts.extend(longer);
        }
        assert!(texts.len() > 8000);
        for text in &texts {
            for kind in [Q::Length, Q::Pressure] {
                if let Ok((si, number, unit)) = parse_quantity_echo(text, kind, "in") {
                    assert!(si.is_finite(), "{text:?}");
                    assert!(text.contains(&number), "{text:?} echoed as {number:?}");
                    assert!(find_unit_of(unit, kind).is_some(), "{text:?}: {unit}");
                }
            }
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
            Err(FieldErrorKind::NOT_FINITE)
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
            Err(FieldErrorKind::NOT_FINITE)
        );
    }

    #[test]
    fn every_field_default_unit_is_offered_for_its_kind() {
        // A default unit the field's kind does not offer would refuse every bare number.
        for spec in crate::calculators::catalog() {
            for field in &spec.fields {
                let crate::catalog::FieldKind::Quantity(kind) = field.kind else {
                    continue;
                };
                for unit in [field.si_unit, field.us_unit] {
                    assert!(
                        unit.is_empty() || find_unit_of(unit, kind).is_some(),
                        "{}/{}: default unit '{unit}' is not a unit of {}",
                        spec.key,
                        field.key,
                        kind.name()
                    );
                }
                if !field.demo.is_empty() {
                    let unit = if field.si_unit.is_empty() {
                        field.us_unit
                    } else {
                        field.si_unit
                    };
                    if let Err(e) = parse_quantity(field.demo, kind, unit) {
                        panic!("{}/{}: demo '{}': {e}", spec.key, field.key, field.demo);
                    }
                }
            }
        }
    }

    #[test]
    fn us_results_use_the_trades_units() {
        // (SI value, kind, system, shown): soil bearing in psf, never psi (3000 psf
        // showed as 20.83 psi); concrete in yd³, or ft³ below one cubic yard.
        // 3000 psf = 143 640.78 Pa and 1 yd³ = 0.764 554 857 984 m³ (NIST SP 811).
        let cases: &[(f64, QuantityKind, UnitSystem, &str)] = &[
            (
                143_640.776_941_007_6,
                Q::SoilBearing,
                UnitSystem::UsCustomary,
                "3000 psf",
            ),
            (143_640.776_941_007_6, Q::Pressure, UnitSystem::UsCustomary, "20.83 psi"),
            (150e3, Q::SoilBearing, UnitSystem::Si, "150.0 kPa"),
            (
                2.0 * 0.764_554_857_984,
                Q::ConcreteVolume,
                UnitSystem::UsCustomary,
                "2.000 yd3",
            ),
            (0.5, Q::ConcreteVolume, UnitSystem::UsCustomary, "17.66 ft3"),
            (0.5, Q::ConcreteVolume, UnitSystem::Si, "0.5000 m3"),
        ];
        for (si, kind, system, shown) in cases {
            assert_eq!(format_quantity(*si, *kind, *system), *shown, "{si} {kind:?} {system:?}");
        }
    }

    #[test]
    fn thrust_block_shows_soil_bearing_in_psf_and_concrete_in_cubic_yards() {
        use crate::calculators;
        let solved_us = |pairs: &[(&str, &str)]| {
            let spec = calculators::spec("thrust-block").expect("thrust-block is registered");
            let mut request = crate::catalog::demo_request(&spec, pairs);
            request.system = UnitSystem::UsCustomary;
            match calculators::solve("thrust-block", &request).result {
                Ok(solution) => solution,
                Err(e) => panic!("{pairs:?}: {e}"),
            }
        };
        let text = |solution: &crate::catalog::Solution, key: &str| {
            let output = solution.outputs.iter().find(|o| o.key == key);
            output
                .map(|o| o.text.clone())
                .unwrap_or_else(|| panic!("no output {key}"))
        };
        let bearing = solved_us(&[("soil", "custom"), ("sigma", "3000 psf")]);
        assert_eq!(text(&bearing, "sigma"), "3000 psf");
        let gravity = solved_us(&[("plane", "vertical_crest")]);
        let volume = text(&gravity, "block_volume");
        assert!(volume.ends_with(" yd3") || volume.ends_with(" ft3"), "{volume}");
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

    #[test]
    fn messages_read_units_by_their_labels() {
        assert_eq!(
            with_label(&format_quantity_in(372.9, Q::Temperature, "degC")),
            "99.75 °C"
        );
        assert_eq!(with_label("45.00 deg"), "45.00°");
        assert_eq!(with_label("2.000 m3/h"), "2.000 m³/h");
        assert_eq!(with_label("1.5"), "1.5");
        assert_eq!(with_label("300.0 mm"), "300.0 mm");
    }
}
