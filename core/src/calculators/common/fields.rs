//! Fields shared by the calculators: the quantity and choice constructors, the
//! fluid fields, the flow fields (`flow_given` and `q`, `v`, `mdot`), the jet
//! fields, the fitting pages' velocity profile at a port (β and α: uniform,
//! laminar, power law from [`crate::velocity_profile`], typed, or carried from the
//! velocity-profile page), the port whose pressure is known, whether the weights
//! enter the balance, local gravity, and the readers that turn them into engine
//! inputs.

use uom::si::f64::{Area, Length, Pressure, Ratio, Velocity, VolumeRate};

use crate::catalog::{ChoiceOption, FieldKind, FieldSpec, FromSi, Limits, Values};
use crate::engine::FlowSpec;
use crate::error::FieldError;
use crate::fluid::{Fluid, FluidError, ZERO_CELSIUS};
use crate::units::QuantityKind;

use QuantityKind as Q;

/// A quantity field with the usual defaults; adjust with struct update syntax.
pub const fn quantity(
    key: &'static str,
    label: &'static str,
    kind: QuantityKind,
    si_unit: &'static str,
    us_unit: &'static str,
    demo: &'static str,
    limits: Limits,
    help: &'static str,
) -> FieldSpec {
    FieldSpec {
        key,
        label,
        kind: FieldKind::Quantity(kind),
        si_unit,
        us_unit,
        demo,
        limits: Some(limits),
        optional: false,
        help,
        visible_when: None,
    }
}

/// A choice field.
pub const fn choice(
    key: &'static str,
    label: &'static str,
    options: &'static [ChoiceOption],
    demo: &'static str,
    help: &'static str,
) -> FieldSpec {
    FieldSpec {
        key,
        label,
        kind: FieldKind::Choice(options),
        si_unit: "",
        us_unit: "",
        demo,
        limits: None,
        optional: false,
        help,
        visible_when: None,
    }
}

/// The typed field test pressure (`p_test`) of the restraint pages, shown when the
/// test rule is "typed test pressure" (`test_rule=custom`), 0 to 100 MPa gauge.
pub fn typed_test_pressure_field() -> FieldSpec {
    FieldSpec {
        visible_when: Some(("test_rule", &["custom"])),
        optional: true,
        ..quantity(
            "p_test",
            "Typed test pressure, gauge",
            Q::Pressure,
            "bar",
            "psi",
            "",
            Limits::closed(0.0, MAX_PRESSURE_PA),
            "Used when the test rule is 'typed test pressure'.",
        )
    }
}

/// The test pressure `test_rule=custom` asks for; an empty field is an error naming
/// `p_test`, since the rule has nothing else to go on.
pub fn typed_test_pressure(values: &Values) -> Result<Pressure, FieldError> {
    values
        .typed_opt("p_test")
        .ok_or_else(|| FieldError::inconsistent("p_test", "type the test pressure, or choose a named rule"))
}

/// Upper bound used for sizes: 10 m is larger than any pipe this handbook covers.
pub const MAX_SIZE_M: f64 = 10.0;

/// Smallest pipe diameter or bend radius the fitting pages accept, m (1 mm).
pub const MIN_SIZE_M: f64 = 1e-3;

/// An optional diameter that overrides the pipe size preset (`d`, `od`, `d2`,
/// `od2` of the restraint and surge pages), in mm or in, 1 mm to 10 m.
pub fn diameter_override(key: &'static str, label: &'static str, help: &'static str) -> FieldSpec {
    FieldSpec {
        optional: true,
        ..quantity(
            key,
            label,
            Q::Length,
            "mm",
            "in",
            "",
            Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
            help,
        )
    }
}

/// Upper bound for gauge pressures: 100 MPa (≈ 14 500 psi).
pub const MAX_PRESSURE_PA: f64 = 100e6;

pub const FLUID_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "water",
        label: "Water (from temperature)",
    },
    ChoiceOption {
        key: "custom",
        label: "Other liquid (density and viscosity)",
    },
];

/// The fluid fields: `fluid` (water/custom), `t`, `rho`, `mu`.
pub fn fluid_fields(demo_temperature: &'static str) -> Vec<FieldSpec> {
    vec![
        choice(
            "fluid",
            "Fluid",
            FLUID_OPTIONS,
            "water",
            "Water properties come from the temperature; choose 'other liquid' to type density and viscosity.",
        ),
        FieldSpec {
            visible_when: Some(("fluid", &["water"])),
            // Required while shown; a hidden field is neither required nor checked.
            ..quantity(
                "t",
                "Water temperature",
                Q::Temperature,
                "degC",
                "degF",
                demo_temperature,
                Limits::closed(ZERO_CELSIUS, ZERO_CELSIUS + 99.9),
                "Liquid water at atmospheric pressure, 0 to 99.9 °C (32 to 211.8 °F).",
            )
        },
        FieldSpec {
            visible_when: Some(("fluid", &["custom"])),
            ..quantity(
                "rho",
                "Density",
                Q::Density,
                "kg/m3",
                "lb/ft3",
                "",
                Limits::closed(50.0, 25_000.0),
                "Density of the liquid, from 50 kg/m³ (cryogenic liquids) to 25 000 kg/m³.",
            )
        },
        FieldSpec {
            visible_when: Some(("fluid", &["custom"])),
            ..quantity(
                "mu",
                "Dynamic viscosity",
                Q::DynamicViscosity,
                "mPa.s",
                "lb/(ft.s)",
                "",
                Limits::closed(1e-6, 1e3),
                "Used for warnings and friction only; it does not change the momentum balance. From 0.001 \
                        mPa·s to 10⁶ mPa·s.",
            )
        },
    ]
}

/// Reads the fluid fields.
pub fn fluid_from(values: &Values) -> Result<Fluid, Vec<FieldError>> {
    match values.choice("fluid").map_err(|e| vec![e])? {
        "custom" => {
            let mut errors = Vec::new();
            if !values.is_set("rho") {
                errors.push(FieldError::inconsistent(
                    "rho",
                    "a density is required for another liquid",
                ));
            }
            if !values.is_set("mu") {
                errors.push(FieldError::inconsistent(
                    "mu",
                    "a viscosity is required for another liquid",
                ));
            }
            if !errors.is_empty() {
                return Err(errors);
            }
            let density = values.quantity_or("rho", 1000.0);
            let viscosity = values.quantity_or("mu", 1e-3);
            Ok(Fluid {
                name: "custom liquid".to_string(),
                density,
                viscosity,
                vapour_pressure: None,
            })
        }
        _ => {
            let t = values.quantity("t").map_err(|e| vec![e])?;
            Fluid::water_kelvin(t).map_err(|e| match e {
                FluidError::BelowFreezing { .. } | FluidError::AtOrAboveSaturation { .. } => {
                    vec![FieldError::inconsistent("t", e.to_string())]
                }
                FluidError::InvalidProperty { .. } => vec![FieldError::inconsistent("t", e.to_string())],
            })
        }
    }
}

pub const FLOW_BASIS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "q",
        label: "Volumetric flow",
    },
    ChoiceOption {
        key: "v",
        label: "Mean velocity at the inlet",
    },
    ChoiceOption {
        key: "mdot",
        label: "Mass flow",
    },
];

/// The glossary key of how the flow is given.
pub const FLOW_GIVEN: &str = "flow_given";

/// The flow fields: the glossary's `flow_given` and one of `q`, `v`, `mdot`.
pub fn flow_given_fields(demo_q: &'static str) -> Vec<FieldSpec> {
    let on = |options: &'static [&'static str]| -> Option<(&'static str, &'static [&'static str])> {
        Some((FLOW_GIVEN, options))
    };
    vec![
        choice(
            FLOW_GIVEN,
            "Flow given as",
            FLOW_BASIS_OPTIONS,
            "q",
            "How the flow is given; zero flow is allowed (a full, still line under pressure).",
        ),
        FieldSpec {
            visible_when: on(&["q"]),
            ..quantity(
                "q",
                "Volumetric flow",
                Q::VolumeFlow,
                "m3/h",
                "gpm",
                demo_q,
                Limits::closed(0.0, 1e3),
                "Flow through the fitting's inlet.",
            )
        },
        FieldSpec {
            visible_when: on(&["v"]),
            ..quantity(
                "v",
                "Mean velocity at the inlet",
                Q::Velocity,
                "m/s",
                "ft/s",
                "",
                Limits::closed(0.0, 100.0),
                "Mean velocity in the inlet pipe.",
            )
        },
        FieldSpec {
            visible_when: on(&["mdot"]),
            ..quantity(
                "mdot",
                "Mass flow",
                Q::MassFlow,
                "kg/s",
                "lb/s",
                "",
                Limits::closed(0.0, 1e6),
                "Mass flow through the inlet.",
            )
        },
    ]
}

/// Reads the flow fields of [`flow_given_fields`] into an engine flow spec for the
/// inlet.
pub fn flow_given_from(values: &Values) -> Result<FlowSpec, Vec<FieldError>> {
    let basis = values.choice(FLOW_GIVEN).map_err(|e| vec![e])?;
    let need = |key: &'static str| {
        if values.is_set(key) {
            Ok(values.quantity_or(key, 0.0))
        } else {
            Err(vec![FieldError::inconsistent(
                key,
                "a value is required for the chosen flow basis",
            )])
        }
    };
    Ok(match basis {
        "v" => FlowSpec::Velocity(need("v")?),
        "mdot" => FlowSpec::MassFlow(need("mdot")?),
        _ => FlowSpec::VolumeFlow(need("q")?),
    })
}

/// The key of the flow field the user filled (`q`, `v` or `mdot`), for warnings.
pub fn flow_field(values: &Values) -> &'static str {
    match values.choice(FLOW_GIVEN).unwrap_or("q") {
        "v" => "v",
        "mdot" => "mdot",
        _ => "q",
    }
}

// --- Free jets from a nozzle (jet on a plate, jet on a vane, ...) -------------------

pub const JET_BASIS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "v",
        label: "Jet velocity",
    },
    ChoiceOption {
        key: "q",
        label: "Jet flow",
    },
    ChoiceOption {
        key: "head",
        label: "Supply head at the nozzle, with Cv",
    },
    ChoiceOption {
        key: "p",
        label: "Gauge pressure at the nozzle inlet, with Cv",
    },
];

/// The smallest jet accepted: 0.5 mm.
const MIN_JET_DIAMETER_M: f64 = 5e-4;

/// Jet speeds handled, m/s: from a trickle to the jet of a 125 MPa cutting head (the
/// incompressible model is already stretched there).
pub const MIN_JET_SPEED: f64 = 0.1;

pub const MAX_JET_SPEED: f64 = 500.0;

/// A free jet leaving a nozzle: diameter and area of the jet, mean speed, flow
/// (typed; the models take `.value`, SI base units, where they do arithmetic).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Jet {
    pub diameter: Length,
    pub area: Area,
    pub velocity: Velocity,
    pub flow: VolumeRate,
}

impl Jet {
    /// The jet of diameter `diameter` (m) at mean speed `velocity` (m/s).
    pub fn from_si(diameter: f64, velocity: f64) -> Self {
        let area = super::drawing::circle_area(diameter);
        Jet {
            diameter: Length::from_si(diameter),
            area: Area::from_si(area),
            velocity: Velocity::from_si(velocity),
            flow: VolumeRate::from_si(velocity * area),
        }
    }
}

/// The jet fields: `d_jet`, `flow_given` and one of `v`, `q`, `head`,
/// `p` (the last two with the velocity coefficient `cv`). Demo values are
/// given in the order diameter, basis, velocity, flow, head, pressure, Cv.
pub fn jet_fields(demo: [&'static str; 7]) -> Vec<FieldSpec> {
    let [d, basis, v, q, head, p, cv] = demo;
    vec![
        quantity(
            "d_jet",
            "Jet diameter (nozzle outlet)",
            Q::Length,
            "mm",
            "in",
            d,
            Limits::closed(MIN_JET_DIAMETER_M, 2.0),
            "Diameter of the round jet where it leaves the nozzle (the nozzle's outlet bore), 0.5 mm to 2 m.",
        ),
        choice(
            "flow_given",
            "Jet given as",
            JET_BASIS_OPTIONS,
            basis,
            "How the jet's speed is known: measured directly, from the flow, or from the head or pressure at \
                    the nozzle inlet through V = Cv·√(2gH).",
        ),
        FieldSpec {
            visible_when: Some(("flow_given", &["v"])),
            ..quantity(
                "v",
                "Jet velocity",
                Q::Velocity,
                "m/s",
                "ft/s",
                v,
                Limits::closed(MIN_JET_SPEED, MAX_JET_SPEED),
                "Mean speed of the jet at the nozzle outlet, 0.1 to 500 m/s.",
            )
        },
        FieldSpec {
            visible_when: Some(("flow_given", &["q"])),
            ..quantity(
                "q",
                "Jet flow",
                Q::VolumeFlow,
                "L/s",
                "gpm",
                q,
                Limits::closed(1e-6, 100.0),
                "Volumetric flow through the nozzle, 0.001 L/s to 100 m³/s; the jet speed is the flow over the jet \
                    area.",
            )
        },
        FieldSpec {
            visible_when: Some(("flow_given", &["head"])),
            ..quantity(
                "head",
                "Total head at the nozzle inlet",
                Q::Length,
                "m",
                "ft",
                head,
                Limits::closed(1e-3, 10_000.0),
                "Pressure head plus approach velocity head at the nozzle inlet, above the jet: V = Cv·√(2gH).",
            )
        },
        FieldSpec {
            visible_when: Some(("flow_given", &["p"])),
            ..quantity(
                "p",
                "Gauge pressure at the nozzle inlet",
                Q::Pressure,
                "kPa",
                "psi",
                p,
                Limits::closed(10.0, MAX_PRESSURE_PA),
                "Nozzle pressure (approach velocity head neglected): V = Cv·√(2p/ρ).",
            )
        },
        FieldSpec {
            visible_when: Some(("flow_given", &["head", "p"])),
            optional: true,
            ..quantity(
                "cv",
                "Velocity coefficient Cv",
                Q::Ratio,
                "-",
                "-",
                cv,
                Limits::closed(0.6, 1.0),
                "Actual over ideal jet speed; about 0.97 to 0.99 for a well-made smooth-bore nozzle (common \
                    practice). Empty means 1 (ideal).",
            )
        },
    ]
}

/// Reads the jet fields (see [`jet_fields`]) for a fluid of density `density`.
pub fn jet_from(values: &Values, density: f64) -> Result<Jet, Vec<FieldError>> {
    let diameter = values.quantity("d_jet").map_err(|e| vec![e])?;
    let area = super::drawing::circle_area(diameter);
    let need = |key: &'static str| {
        if values.is_set(key) {
            Ok(values.quantity_or(key, 0.0))
        } else {
            Err(vec![FieldError::inconsistent(
                key,
                "a value is required for the chosen way of giving the jet",
            )])
        }
    };
    let cv = values.quantity_or("cv", 1.0);
    let velocity = match values.choice("flow_given").map_err(|e| vec![e])? {
        "q" => need("q")? / area,
        "head" => cv * (2.0 * crate::units::STANDARD_GRAVITY * need("head")?).sqrt(),
        "p" => cv * (2.0 * need("p")? / density).sqrt(),
        _ => need("v")?,
    };
    if !(velocity.is_finite() && velocity > 0.0) {
        return Err(vec![FieldError::inconsistent(
            "d_jet",
            "the jet speed comes out zero or not finite: check the jet inputs",
        )]);
    }
    if !(MIN_JET_SPEED..=MAX_JET_SPEED).contains(&velocity) {
        let field = match values.choice("flow_given").unwrap_or("v") {
            "q" => "q",
            "head" => "head",
            "p" => "p",
            _ => "v",
        };
        return Err(vec![FieldError::inconsistent(
            field,
            format!(
                "the jet speed comes out {} m/s; free jets are handled from {MIN_JET_SPEED} to {MAX_JET_SPEED} \
                        m/s",
                crate::units::format_significant(velocity, 4)
            ),
        )]);
    }
    Ok(Jet::from_si(diameter, velocity))
}

/// How the speed of a jet was given, typed: what a report says about it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum JetGiven {
    Velocity(uom::si::f64::Velocity),
    Flow(uom::si::f64::VolumeRate),
    /// Total head at the nozzle inlet, with the velocity coefficient.
    Head(uom::si::f64::Length, uom::si::f64::Ratio),
    /// Gauge pressure at the nozzle inlet, with the velocity coefficient.
    Pressure(uom::si::f64::Pressure, uom::si::f64::Ratio),
}

/// Reads how the jet's speed is given (see [`jet_fields`]); `cv` is 1 when empty.
pub fn jet_given(values: &Values) -> Result<JetGiven, crate::error::FieldErrors> {
    let cv = values
        .typed_opt("cv")
        .unwrap_or(uom::si::f64::Ratio::new::<uom::si::ratio::ratio>(1.0));
    Ok(match values.choice("flow_given")? {
        "q" => JetGiven::Flow(values.typed("q")?),
        "head" => JetGiven::Head(values.typed("head")?, cv),
        "p" => JetGiven::Pressure(values.typed("p")?, cv),
        _ => JetGiven::Velocity(values.typed("v")?),
    })
}

// --- Velocity profile at a port, the known pressure, weights and gravity ------------

pub const PROFILE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "uniform",
        label: "Uniform (β = α = 1)",
    },
    ChoiceOption {
        key: "laminar",
        label: "Fully developed laminar (β = 4/3, α = 2)",
    },
    ChoiceOption {
        key: "power_law",
        label: "Turbulent, power law with exponent n",
    },
    ChoiceOption {
        key: "typed",
        label: "Typed β and α",
    },
    ChoiceOption {
        key: "carried",
        label: "From the velocity-profile page",
    },
];

/// The keys and labels of the velocity-profile fields of one port.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ProfileKeys {
    /// Where the port is, as the basis table names it ("inlet").
    pub place: &'static str,
    pub profile: &'static str,
    pub profile_label: &'static str,
    pub n: &'static str,
    pub n_label: &'static str,
    pub beta: &'static str,
    pub beta_label: &'static str,
    pub alpha: &'static str,
    pub alpha_label: &'static str,
}

/// The velocity-profile fields of a fitting's inlet.
pub const INLET_PROFILE: ProfileKeys = ProfileKeys {
    place: "inlet",
    profile: "profile_in",
    profile_label: "Velocity profile at the inlet",
    n: "n_power_in",
    n_label: "Power-law exponent n at the inlet",
    beta: "beta_in",
    beta_label: "Momentum-flux factor β at the inlet",
    alpha: "alpha_in",
    alpha_label: "Kinetic-energy factor α at the inlet",
};

/// The velocity-profile fields of a fitting's outlet.
pub const OUTLET_PROFILE: ProfileKeys = ProfileKeys {
    place: "outlet",
    profile: "profile_out",
    profile_label: "Velocity profile at the outlet",
    n: "n_power_out",
    n_label: "Power-law exponent n at the outlet",
    beta: "beta_out",
    beta_label: "Momentum-flux factor β at the outlet",
    alpha: "alpha_out",
    alpha_label: "Kinetic-energy factor α at the outlet",
};

/// The velocity-profile fields of a junction's common pipe.
pub const COMMON_PROFILE: ProfileKeys = ProfileKeys {
    place: "common pipe",
    profile: "profile_common",
    profile_label: "Velocity profile in the common pipe",
    n: "n_power_common",
    n_label: "Power-law exponent n in the common pipe",
    beta: "beta_common",
    beta_label: "Momentum-flux factor β in the common pipe",
    alpha: "alpha_common",
    alpha_label: "Kinetic-energy factor α in the common pipe",
};

/// The velocity-profile fields of each branch of a junction (`b#_profile`, …).
pub const BRANCH_PROFILES: [ProfileKeys; 6] = [
    ProfileKeys {
        place: "branch 1",
        profile: "b1_profile",
        profile_label: "Branch 1 velocity profile",
        n: "b1_n_power",
        n_label: "Power-law exponent n in branch 1",
        beta: "b1_beta",
        beta_label: "Momentum-flux factor β in branch 1",
        alpha: "b1_alpha",
        alpha_label: "Kinetic-energy factor α in branch 1",
    },
    ProfileKeys {
        place: "branch 2",
        profile: "b2_profile",
        profile_label: "Branch 2 velocity profile",
        n: "b2_n_power",
        n_label: "Power-law exponent n in branch 2",
        beta: "b2_beta",
        beta_label: "Momentum-flux factor β in branch 2",
        alpha: "b2_alpha",
        alpha_label: "Kinetic-energy factor α in branch 2",
    },
    ProfileKeys {
        place: "branch 3",
        profile: "b3_profile",
        profile_label: "Branch 3 velocity profile",
        n: "b3_n_power",
        n_label: "Power-law exponent n in branch 3",
        beta: "b3_beta",
        beta_label: "Momentum-flux factor β in branch 3",
        alpha: "b3_alpha",
        alpha_label: "Kinetic-energy factor α in branch 3",
    },
    ProfileKeys {
        place: "branch 4",
        profile: "b4_profile",
        profile_label: "Branch 4 velocity profile",
        n: "b4_n_power",
        n_label: "Power-law exponent n in branch 4",
        beta: "b4_beta",
        beta_label: "Momentum-flux factor β in branch 4",
        alpha: "b4_alpha",
        alpha_label: "Kinetic-energy factor α in branch 4",
    },
    ProfileKeys {
        place: "branch 5",
        profile: "b5_profile",
        profile_label: "Branch 5 velocity profile",
        n: "b5_n_power",
        n_label: "Power-law exponent n in branch 5",
        beta: "b5_beta",
        beta_label: "Momentum-flux factor β in branch 5",
        alpha: "b5_alpha",
        alpha_label: "Kinetic-energy factor α in branch 5",
    },
    ProfileKeys {
        place: "branch 6",
        profile: "b6_profile",
        profile_label: "Branch 6 velocity profile",
        n: "b6_n_power",
        n_label: "Power-law exponent n in branch 6",
        beta: "b6_beta",
        beta_label: "Momentum-flux factor β in branch 6",
        alpha: "b6_alpha",
        alpha_label: "Kinetic-energy factor α in branch 6",
    },
];

const PROFILE_HELP: &str = "How the velocity varies over the port: β multiplies the momentum flux ṁV, α the \
    kinetic-energy flux ṁV²/2. Uniform (1) is the usual assumption; a fully developed pipe flow has β about 1.02 \
    (turbulent) to 4/3 (laminar).";
const N_HELP: &str = "u = U(1 − r/R)^(1/n): about 6 to 10 in turbulent pipe flow, higher at higher Reynolds \
    numbers; from 4 to 12.";
const BETA_HELP: &str = "β = (1/A)∫(u/V)² dA, from 1 (uniform) to 2.";
const ALPHA_HELP: &str = "α = (1/A)∫(u/V)³ dA, from 1 (uniform) to 4. Empty: 1 (the energy line as Bernoulli \
    writes it).";

/// Exponents of the power-law profile accepted at a fitting's port.
const N_LIMITS: Limits = Limits::closed(4.0, 12.0);

/// The velocity-profile fields of one port: the profile choice (empty: uniform),
/// the power-law exponent, and the typed or carried β and α.
pub fn profile_fields(keys: &ProfileKeys) -> Vec<FieldSpec> {
    let profile = keys.profile;
    let on = |options: &'static [&'static str]| Some((profile, options));
    vec![
        FieldSpec {
            optional: true,
            ..choice(profile, keys.profile_label, PROFILE_OPTIONS, "uniform", PROFILE_HELP)
        },
        FieldSpec {
            visible_when: on(&["power_law"]),
            ..quantity(keys.n, keys.n_label, Q::Ratio, "-", "-", "", N_LIMITS, N_HELP)
        },
        FieldSpec {
            visible_when: on(&["typed", "carried"]),
            ..quantity(
                keys.beta,
                keys.beta_label,
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(1.0, 2.0),
                BETA_HELP,
            )
        },
        FieldSpec {
            visible_when: on(&["typed", "carried"]),
            optional: true,
            ..quantity(
                keys.alpha,
                keys.alpha_label,
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(1.0, 4.0),
                ALPHA_HELP,
            )
        },
    ]
}

/// Where a port's β and α came from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ProfileSource {
    Uniform,
    Laminar,
    /// The power law with this exponent n.
    PowerLaw(f64),
    Typed,
    /// Carried from the velocity-profile page.
    Carried,
}

/// A port's momentum-flux and kinetic-energy factors, and where they came from.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PortProfile {
    pub beta: Ratio,
    pub alpha: Ratio,
    pub source: ProfileSource,
}

impl PortProfile {
    /// β = α = 1.
    pub fn uniform() -> PortProfile {
        PortProfile {
            beta: Ratio::from_si(1.0),
            alpha: Ratio::from_si(1.0),
            source: ProfileSource::Uniform,
        }
    }

    /// Sets the port's β and α.
    pub fn apply(&self, mut port: crate::engine::Port) -> crate::engine::Port {
        port.beta = self.beta.value;
        port.alpha = self.alpha.value;
        port
    }

    pub fn is_uniform(&self) -> bool {
        self.beta.value == 1.0 && self.alpha.value == 1.0
    }

    /// "β = 1.02, α = 1.06 (turbulent, power law n = 7)", for the basis table.
    pub fn describe(&self) -> String {
        let source = match self.source {
            ProfileSource::Uniform => "uniform".to_string(),
            ProfileSource::Laminar => "fully developed laminar".to_string(),
            ProfileSource::PowerLaw(n) => {
                format!("turbulent, power law n = {}", crate::units::format_significant(n, 3))
            }
            ProfileSource::Typed => "typed".to_string(),
            ProfileSource::Carried => "β from the velocity-profile page".to_string(),
        };
        format!(
            "β = {}, α = {} ({source})",
            super::tables::trimmed(crate::units::format_significant(self.beta.value, 4)),
            super::tables::trimmed(crate::units::format_significant(self.alpha.value, 4))
        )
    }
}

/// Reads the velocity-profile fields of one port ([`profile_fields`]); an empty
/// choice is a uniform profile.
///
/// # Errors
/// The power-law exponent or β when the choice needs them and they are empty.
pub fn profile_from(values: &Values, keys: &ProfileKeys) -> Result<PortProfile, crate::error::FieldErrors> {
    let ratio = |x: f64| Ratio::from_si(x);
    let from = |factors: crate::velocity_profile::ProfileFactors, source| PortProfile {
        beta: ratio(factors.momentum_flux),
        alpha: ratio(factors.kinetic_energy),
        source,
    };
    let choice = if values.is_set(keys.profile) {
        values.choice(keys.profile)?
    } else {
        "uniform"
    };
    Ok(match choice {
        "laminar" => from(crate::velocity_profile::laminar(), ProfileSource::Laminar),
        "power_law" => {
            let n: Ratio = values.typed(keys.n)?;
            let factors = crate::velocity_profile::power_law(n.value).ok_or_else(|| {
                FieldError::inconsistent(keys.n, "the power-law exponent must be a number from 4 to 12")
            })?;
            from(factors, ProfileSource::PowerLaw(n.value))
        }
        "typed" | "carried" => PortProfile {
            beta: values.typed(keys.beta)?,
            alpha: values.typed_opt(keys.alpha).unwrap_or(ratio(1.0)),
            source: if choice == "carried" {
                ProfileSource::Carried
            } else {
                ProfileSource::Typed
            },
        },
        _ => PortProfile::uniform(),
    })
}

/// The ports whose pressure a fitting page may take as the known one.
pub const P_KNOWN_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "inlet",
        label: "At the inlet",
    },
    ChoiceOption {
        key: "outlet",
        label: "At the outlet",
    },
    ChoiceOption {
        key: "atmosphere",
        label: "Outlet discharges to atmosphere (0 gauge)",
    },
];

/// The glossary key of where the pressure is known.
pub const P_KNOWN: &str = "p_known";

/// Where `p` (the inlet pressure) is shown: the pressure known at the inlet, or the
/// choice left empty (old links: an empty optional choice reads as its demo,
/// `inlet`; see [`crate::catalog::shown_when`]).
pub const P_AT_INLET: Option<(&str, &[&str])> = Some((P_KNOWN, &["inlet"]));

/// The choice of the port whose pressure is known (empty: the inlet, as old links
/// read) and the outlet pressure `p2` shown when it is the outlet's.
pub fn pressure_known_fields() -> Vec<FieldSpec> {
    vec![
        FieldSpec {
            optional: true,
            ..choice(
                P_KNOWN,
                "Pressure known at",
                P_KNOWN_OPTIONS,
                "inlet",
                "The port whose gauge pressure you know; the other follows from the energy balance with the \
                    loss. An open-ended elbow or a nozzle discharges to atmosphere.",
            )
        },
        FieldSpec {
            visible_when: Some((P_KNOWN, &["outlet"])),
            ..quantity(
                "p2",
                "Gauge pressure at the outlet",
                Q::Pressure,
                "kPa",
                "psi",
                "",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "Gauge, so not below 0; the inlet pressure follows from the energy balance.",
            )
        },
    ]
}

/// The port whose pressure is known, and that pressure.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum KnownPressure {
    Inlet(Pressure),
    Outlet(Pressure),
    /// The outlet discharges to atmosphere: 0 gauge there.
    Atmosphere,
}

impl KnownPressure {
    /// Whether the inlet's pressure is the known one.
    pub fn at_inlet(&self) -> bool {
        matches!(self, KnownPressure::Inlet(_))
    }

    /// The known pressure, Pa.
    pub fn pascals(&self) -> f64 {
        match self {
            KnownPressure::Inlet(p) | KnownPressure::Outlet(p) => p.value,
            KnownPressure::Atmosphere => 0.0,
        }
    }

    /// The field a refusal of the balance is laid on.
    pub fn field(&self) -> &'static str {
        match self {
            KnownPressure::Inlet(_) => "p",
            KnownPressure::Outlet(_) => "p2",
            KnownPressure::Atmosphere => P_KNOWN,
        }
    }

    /// Sets the known pressure on the inlet or the outlet port.
    pub fn apply(&self, inlet: crate::engine::Port, outlet: crate::engine::Port) -> [crate::engine::Port; 2] {
        let at = |p: f64| Pressure::from_si(p);
        match self {
            KnownPressure::Inlet(p) => [inlet.pressure(*p), outlet],
            KnownPressure::Outlet(p) => [inlet, outlet.pressure(*p)],
            KnownPressure::Atmosphere => [inlet, outlet.pressure(at(0.0))],
        }
    }

    /// For the basis table.
    pub fn describe(&self) -> &'static str {
        match self {
            KnownPressure::Inlet(_) => "gauge, known at the inlet; the outlet's from the energy balance",
            KnownPressure::Outlet(_) => "gauge, known at the outlet; the inlet's from the energy balance",
            KnownPressure::Atmosphere => {
                "gauge; the outlet discharges to atmosphere (0), the inlet's from the energy balance"
            }
        }
    }
}

/// Reads [`pressure_known_fields`] and the page's inlet pressure `p`.
///
/// # Errors
/// The pressure of the chosen port when it is empty or out of range.
pub fn known_pressure_from(values: &Values) -> Result<KnownPressure, crate::error::FieldErrors> {
    let choice = if values.is_set(P_KNOWN) {
        values.choice(P_KNOWN)?
    } else {
        "inlet"
    };
    Ok(match choice {
        "outlet" => KnownPressure::Outlet(values.typed("p2")?),
        "atmosphere" => KnownPressure::Atmosphere,
        _ => KnownPressure::Inlet(values.typed("p")?),
    })
}

pub const WEIGHTS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "included",
        label: "Included (fluid and fitting)",
    },
    ChoiceOption {
        key: "neglected",
        label: "Neglected (pressure and momentum only)",
    },
];

/// Whether the weights of the fluid and of the fitting enter the balance (empty:
/// included).
pub fn weights_field() -> FieldSpec {
    FieldSpec {
        optional: true,
        ..choice(
            "weights",
            "Weights in the balance",
            WEIGHTS_OPTIONS,
            "included",
            "The weight of the fluid inside and of the fitting: in a vertical fitting they load the restraint \
                along with the pressure; leave them out only to reproduce a case that neglects them.",
        )
    }
}

/// Reads [`weights_field`]: `true` when the weights enter the balance.
pub fn weights_from(values: &Values) -> bool {
    values.choice("weights").unwrap_or("included") != "neglected"
}

/// Local gravity accepted: the sea-level range on Earth is about 9.780 to 9.832 m/s².
const GRAVITY_LIMITS: Limits = Limits::closed(9.7, 9.9);

/// The local gravity field of the fluid section (empty: standard gravity).
pub fn gravity_field() -> FieldSpec {
    FieldSpec {
        optional: true,
        ..quantity(
            "g_local",
            "Local gravity",
            Q::Acceleration,
            "m/s2",
            "ft/s2",
            "",
            GRAVITY_LIMITS,
            "Empty: standard gravity 9.80665 m/s². Type a local value (9.7 to 9.9 m/s²) only to match a \
                calculation that used one.",
        )
    }
}

/// Reads [`gravity_field`], m/s².
pub fn gravity_from(values: &Values) -> f64 {
    values.quantity_or("g_local", crate::units::STANDARD_GRAVITY)
}

/// The rows of a fitting's basis table that say how its balances were set up: the
/// known pressure, the velocity profile (β, α and their source) at each port,
/// whether the weights entered, and the gravity used (m/s²).
pub fn balance_basis_rows(
    known: &KnownPressure,
    profiles: &[(&'static str, &PortProfile)],
    weights: bool,
    gravity: f64,
) -> Vec<(&'static str, String)> {
    let mut rows = vec![("Pressure", known.describe().to_string())];
    for (label, profile) in profiles {
        rows.push((label, profile.describe()));
    }
    rows.push((
        "Weights",
        if weights {
            "fluid inside and fitting: included".to_string()
        } else {
            "fluid inside and fitting: neglected (pressure and momentum only)".to_string()
        },
    ));
    rows.push((
        "Gravity",
        if (gravity - crate::units::STANDARD_GRAVITY).abs() > 1e-12 {
            format!(
                "{} m/s² (typed local value)",
                crate::units::format_significant(gravity, 6)
            )
        } else {
            "standard, 9.80665 m/s²".to_string()
        },
    ));
    rows
}

/// The fitting pages a velocity profile's β and α can be carried to, with the text
/// of each link.
pub const PROFILE_TARGETS: &[(&str, &str, &ProfileKeys)] = &[
    ("bend", "Use this β and α at a bend's inlet", &INLET_PROFILE),
    ("reducer", "Use this β and α at a reducer's inlet", &INLET_PROFILE),
    ("tee", "Use this β and α in a tee's common pipe", &COMMON_PROFILE),
    ("tee", "Use this β and α in a tee's branch 1", &BRANCH_PROFILES[0]),
    ("tee", "Use this β and α in a tee's branch 2", &BRANCH_PROFILES[1]),
    ("nozzle", "Use this β and α at a nozzle's flange", &INLET_PROFILE),
];

/// Links that carry a measured or computed profile's β and α to the inlet of each
/// fitting page ([`PROFILE_TARGETS`]): the profile is `carried`, so the fitting's
/// basis says "β from the velocity-profile page".
pub fn profile_carry_overs(beta: f64, alpha: f64) -> Vec<crate::catalog::CarryOver> {
    let typed = |x: f64| crate::units::format_significant(x, 6);
    PROFILE_TARGETS
        .iter()
        .map(|(calculator, label, keys)| crate::catalog::CarryOver {
            calculator,
            label: label.to_string(),
            inputs: vec![
                (keys.profile, "carried".to_string()),
                (keys.beta, typed(beta)),
                (keys.alpha, typed(alpha)),
            ],
        })
        .collect()
}

/// A text field (a list of lines: rows, points, a table), required, shown always.
pub fn text_field(key: &'static str, label: &'static str, demo: &'static str, help: &'static str) -> FieldSpec {
    FieldSpec {
        key,
        label,
        kind: FieldKind::Text,
        si_unit: "",
        us_unit: "",
        demo,
        limits: None,
        optional: false,
        help,
        visible_when: None,
    }
}
