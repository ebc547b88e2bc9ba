//! The pipe wall and liquid of a computed pressure-wave speed, read once for every
//! page that computes one (the thrust-restraint page's surge, the surge page): the
//! wall material (by default the material of the size preset), its Young's modulus
//! and Poisson's ratio, the wall thickness, the axial restraint and the liquid's
//! bulk modulus. The wave speed itself is [`crate::restraint::pressure::wave_speed`].

use uom::si::f64::{Length, Pressure};

use crate::catalog::{FieldSpec, Limits, Values};
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
