//! The pressure-wave speed of every page that uses one (the thrust-restraint page's
//! surge, the surge page): a "computed / typed" choice ([`WaveGiven`], read by
//! [`read_wave`]), the typed wave speed (a measured or published value), and the
//! pipe wall and liquid of a computed one, read once: the wall material (by default
//! the material of the size preset), its Young's modulus and Poisson's ratio, the
//! wall thickness, the axial restraint and the liquid's bulk modulus. The computed
//! wave speed is [`crate::restraint::pressure::wave_speed`] (Wylie & Streeter,
//! Chaudhry). A link that gives a wave speed but no choice (written when an empty
//! wave speed meant "computed") is read as typed by the glossary's implied choices.

use uom::si::f64::{Length, Pressure, Velocity};

use crate::catalog::{ChoiceOption, FieldSpec, Limits, Values};
use crate::units::QuantityKind as Q;

use super::fields::{choice, quantity};
use crate::error::{FieldError, FieldErrors};
use crate::pipe_sizes;
use crate::restraint::pressure::{self, Anchoring, Material, ANCHOR_OPTIONS, MATERIAL_OPTIONS, WATER_BULK_MODULUS};
use crate::restraint::Diameters;

fn si(values: &Values, key: &str) -> Option<f64> {
    values.quantity(key).ok()
}

/// The pipe wall and liquid that set a computed wave speed.
#[derive(Clone, Debug, PartialEq)]
pub struct Elastic {
    pub e_modulus: Pressure,
    pub poisson: f64,
    pub material_source: String,
    pub wall: Length,
    pub anchoring: Anchoring,
    pub bulk_modulus: Pressure,
}

/// How the wave speed is found.
#[derive(Clone, Debug, PartialEq)]
pub enum WaveGiven {
    /// Typed by the user (a measured or published value).
    Typed(Velocity),
    /// From the pipe's elasticity and the liquid's bulk modulus.
    Computed(Elastic),
}

impl WaveGiven {
    /// The wave speed, m/s, in a pipe of bore `d_inside` (m) full of liquid of
    /// `density` (kg/m³), and where it comes from.
    pub fn speed(&self, density: f64, d_inside: f64) -> (f64, String) {
        match self {
            WaveGiven::Typed(a) => (a.value, "typed".to_string()),
            WaveGiven::Computed(e) => {
                let c1 = e.anchoring.c1(e.poisson);
                (
                    pressure::wave_speed(
                        e.bulk_modulus.value,
                        density,
                        d_inside,
                        e.wall.value,
                        e.e_modulus.value,
                        c1,
                    ),
                    format!(
                        "computed: a = √((K/ρ)/(1 + c₁·K·D/(E·e))), {}; c₁ = {:.3} ({})",
                        e.material_source,
                        c1,
                        e.anchoring.label()
                    ),
                )
            }
        }
    }
}

/// The options of the wave-speed choice.
pub const WAVE_GIVEN_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "computed",
        label: "Computed from the pipe wall and the liquid",
    },
    ChoiceOption {
        key: "typed",
        label: "Typed (measured or published)",
    },
];

/// The smallest and largest wave speeds a user may type, m/s: from a gassy liquid
/// in a soft hose to a rigid pipe (water's sound speed is about 1480 m/s).
const WAVE_SPEED_RANGE: Limits = Limits::closed(10.0, 2000.0);

const WAVE_GIVEN_HELP: &str = "Computed: from the wall material, thickness and restraint and the liquid's bulk \
    modulus. Typed: a measured or published wave speed (the wall fields are then not used).";
const WAVE_SPEED_HELP: &str = "A measured or published pressure-wave speed in the liquid-filled pipe, 10 to 2000 m/s.";

/// The wave speed of the page: typed when the choice says so, computed otherwise.
///
/// # Errors
/// A typed wave speed left empty; a wall or liquid the computed one cannot use
/// ([`read_elastic`]).
pub fn read_wave(values: &Values, pipe: Diameters, size_key: &str) -> Result<WaveGiven, FieldErrors> {
    match values.choice("wave_given").unwrap_or("computed") {
        "typed" => Ok(WaveGiven::Typed(values.typed("wave_speed").map_err(|_| {
            FieldError::inconsistent(
                "wave_speed",
                "type the wave speed (10 to 2000 m/s), or choose a computed one",
            )
        })?)),
        _ => Ok(WaveGiven::Computed(read_elastic(values, pipe, size_key)?)),
    }
}

/// The wave-speed choice and the typed wave speed, shown when `shown` holds (the
/// typed value only when the choice is "typed"). Put them before
/// [`wave_speed_fields`].
pub fn wave_given_fields(shown: ShownWhen) -> Vec<FieldSpec> {
    vec![
        FieldSpec {
            visible_when: shown,
            optional: true,
            ..choice(
                "wave_given",
                "Wave speed",
                WAVE_GIVEN_OPTIONS,
                "computed",
                WAVE_GIVEN_HELP,
            )
        },
        FieldSpec {
            visible_when: Some(("wave_given", &["typed"])),
            ..quantity(
                "wave_speed",
                "Wave speed (typed)",
                Q::Velocity,
                "m/s",
                "ft/s",
                "",
                WAVE_SPEED_RANGE,
                WAVE_SPEED_HELP,
            )
        },
    ]
}

/// The wall and liquid of a computed wave speed, through the restraint model's
/// materials ([`pressure::material`], [`Material::of_family`]).
pub fn read_elastic(values: &Values, pipe: Diameters, size_key: &str) -> Result<Elastic, FieldErrors> {
    let material = match Material::from_key(values.choice("material").unwrap_or("")) {
        Some(Material::FromSize) => match pipe_sizes::find(size_key) {
            Some(size) => Material::of_family(size.family),
            None => {
                return Err(FieldError::inconsistent(
                    "material",
                    "the pipe size is typed, so its material is not known: choose the wall material \
                 (or type the wave speed where the page offers it)",
                )
                .into())
            }
        },
        Some(m) => m,
        None => {
            return Err(FieldError::inconsistent("material", "choose the pipe wall material for the wave speed").into())
        }
    };
    let (e_modulus, poisson, material_source) = match material {
        Material::Custom => {
            let e = si(values, "e_pipe").ok_or_else(|| {
                FieldError::inconsistent("e_pipe", "type Young's modulus of the wall, or choose a material")
            })?;
            (e, 0.3, "typed modulus, ν = 0.3".to_string())
        }
        m => {
            let (e, nu, s) =
                pressure::material(m.key()).ok_or_else(|| FieldError::inconsistent("material", "unknown material"))?;
            (e, nu, s.to_string())
        }
    };
    let wall = si(values, "wall").unwrap_or((pipe.od - pipe.id) / 2.0);
    if wall >= pipe.od / 2.0 {
        return Err(FieldError::inconsistent("wall", "the wall must be thinner than half the outside diameter").into());
    }
    Ok(Elastic {
        e_modulus: Pressure::new::<uom::si::pressure::pascal>(e_modulus),
        poisson,
        material_source,
        wall: Length::new::<uom::si::length::meter>(wall),
        anchoring: Anchoring::from_key(values.choice("anchoring").unwrap_or("joints")).unwrap_or(Anchoring::Joints),
        bulk_modulus: values
            .typed_opt("bulk_modulus")
            .unwrap_or(Pressure::new::<uom::si::pressure::pascal>(WATER_BULK_MODULUS)),
    })
}

/// When a field is shown: `(controlling field, options)`, as in [`FieldSpec`].
pub type ShownWhen = Option<(&'static str, &'static [&'static str])>;

/// The fields [`read_elastic`] reads, in page order: wall material (shown when
/// `material_shown` holds), typed modulus (when the material is 'custom'), wall
/// thickness, axial restraint and the liquid's bulk modulus (when `rest_shown`
/// holds). `material_help` says how the page uses the material.
pub fn wave_speed_fields(
    material_shown: ShownWhen,
    rest_shown: ShownWhen,
    material_help: &'static str,
) -> Vec<FieldSpec> {
    vec![
        FieldSpec {
            visible_when: material_shown,
            optional: true,
            ..choice(
                "material",
                "Pipe wall material (wave speed)",
                MATERIAL_OPTIONS,
                "from_size",
                material_help,
            )
        },
        FieldSpec {
            visible_when: Some(("material", &["custom"])),
            optional: true,
            ..quantity(
                "e_pipe",
                "Typed Young's modulus of the wall",
                Q::Pressure,
                "MPa",
                "ksi",
                "",
                Limits::closed(50e6, 1e12),
                "Used when the material is 'typed modulus'; from 50 MPa (soft plastics under long load) to \
                1000 GPa.",
            )
        },
        FieldSpec {
            visible_when: rest_shown,
            optional: true,
            ..quantity(
                "wall",
                "Wall thickness",
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(0.1e-3, 1.0),
                "Empty: half the difference of outside and inside diameters.",
            )
        },
        FieldSpec {
            visible_when: rest_shown,
            optional: true,
            ..choice(
                "anchoring",
                "Axial restraint of the pipe (wave speed)",
                ANCHOR_OPTIONS,
                "joints",
                "Wylie & Streeter's factor c₁; jointed buried pipe is usually taken as c₁ = 1 (the default \
                when empty).",
            )
        },
        FieldSpec {
            visible_when: rest_shown,
            optional: true,
            ..quantity(
                "bulk_modulus",
                "Bulk modulus of the liquid",
                Q::Pressure,
                "MPa",
                "ksi",
                "",
                Limits::closed(10e6, 1e11),
                "Empty: 2200 MPa, water near 20 °C. From 10 MPa (gassy liquids) to 100 GPa.",
            )
        },
    ]
}

#[cfg(test)]
mod tests {
    use crate::calculators::testing::{error_field, solved};
    use crate::glossary;

    #[test]
    fn a_typed_wave_speed_replaces_the_computed_one_on_both_pages() {
        let surge = [
            ("p_basis", "surge"),
            ("dv", "1 m/s"),
            ("fluid", "custom"),
            ("rho", "1000 kg/m3"),
            ("mu", "1 mPa.s"),
        ];
        let mut typed = surge.to_vec();
        typed.extend([("wave_given", "typed"), ("wave_speed", "1000 m/s")]);
        let block = solved("thrust-block", &typed);
        let a = block.output("wave_speed").map(|o| o.si);
        assert_eq!(a, Some(1000.0));
        assert_eq!(block.output("dp_surge").map(|o| o.si), Some(1e6));
        // Computed by default, and the typed value is then not used.
        let mut computed = surge.to_vec();
        computed.push(("wave_speed", "1000 m/s"));
        let a = solved("thrust-block", &computed).output("wave_speed").map(|o| o.si);
        assert!(a.is_some_and(|a| a != 1000.0));
        // Typed, no material is needed (a typed size's material is not known).
        let page = solved(
            "surge",
            &[
                ("size", "custom"),
                ("d", "200 mm"),
                ("od", "225 mm"),
                ("wave_given", "typed"),
                ("wave_speed", "350 m/s"),
            ],
        );
        assert_eq!(page.output("wave_speed").map(|o| o.si), Some(350.0));
        // Typed but empty: named.
        assert_eq!(
            error_field("surge", &[("wave_given", "typed"), ("wave_speed", "")]),
            "wave_speed"
        );
    }

    #[test]
    fn an_old_surge_link_with_a_wave_speed_reads_as_typed() {
        let pairs = |list: &[(&str, &str)]| -> Vec<(String, String)> {
            list.iter().map(|(k, v)| (k.to_string(), v.to_string())).collect()
        };
        let upgraded = glossary::upgrade("surge", &pairs(&[("wave_speed", "1000 m/s"), ("dv", "1 m/s")]));
        assert!(upgraded
            .pairs
            .contains(&("wave_given".to_string(), "typed".to_string())));
        assert_eq!(upgraded.translations.len(), 1);
        // A link that says which, or has no wave speed, is read as it is.
        for link in [
            pairs(&[("wave_speed", "1000 m/s"), ("wave_given", "computed")]),
            pairs(&[("wave_speed", ""), ("dv", "1 m/s")]),
        ] {
            let upgraded = glossary::upgrade("surge", &link);
            assert_eq!(upgraded.pairs, link);
            assert!(upgraded.translations.is_empty());
        }
        // Only the surge page had a typed wave speed before the choice.
        assert!(glossary::upgrade("thrust-block", &pairs(&[("wave_speed", "1000 m/s")]))
            .translations
            .is_empty());
    }
}
