//! Soil classes: the allowable bearing of undisturbed soil against a block face,
//! and the friction coefficient of mass concrete cast on it.
//!
//! Published tables disagree by up to about 4× for the same soil name, and name
//! soils differently. So the choices are neutral classes in the handbook's own words
//! ([`SOILS`]: organic, soft, firm and stiff cohesive, loose and dense granular,
//! rock); each class lists the rows of the three tables ([`SoilTable`], each cited
//! with its safety-factor convention) that fit it, and takes as its value the
//! **lowest** bearing those rows give (the conservative reading: a block sized on it
//! is never smaller than one sized on any of its rows). The comparison table of the
//! thrust-restraint page shows every row beside its class. A typed value from a
//! geotechnical basis always wins (the "typed value" choice), from
//! [`MIN_TYPED_BEARING`] to [`MAX_TYPED_BEARING`]. Friction coefficients:
//! [`FRICTION_SOURCE`].
//!
//! The table values were typed from memory of the publications (the safe-bearing
//! table confirmed against a pipe maker's reproduction); the tests check that each
//! class takes the lowest value of its rows, and that every retired preset key of
//! older links (`glossary::VALUE_ALIASES`) lands on a class whose value is no higher
//! than the retired preset's, so an old link never sizes a smaller block.

use crate::catalog::ChoiceOption;

/// Range of a typed allowable soil bearing, Pa: 1 kPa to 20 MPa (sound rock).
pub const MIN_TYPED_BEARING: f64 = 1e3;
pub const MAX_TYPED_BEARING: f64 = 20e6;

/// Which published table a row comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SoilTable {
    SafeBearing,
    Nfpa24,
    Bs8004,
}

impl SoilTable {
    /// Every table, in the order the comparison shows them.
    pub const ALL: [SoilTable; 3] = [SoilTable::SafeBearing, SoilTable::Nfpa24, SoilTable::Bs8004];

    pub fn citation(self) -> &'static str {
        // All three quoted from memory; the safe-bearing table also confirmed against
        // a pipe maker's reproduction of it.
        match self {
            SoilTable::SafeBearing => {
                "Safe bearing loads for horizontal thrusts (cover over 2 ft), the table reproduced in AWWA M23 \
                    *PVC Pipe — Design and Installation* and in pipe makers' installation guides"
            }
            SoilTable::Nfpa24 => {
                "NFPA 24, *Installation of Private Fire Service Mains*, annex table of horizontal bearing \
                    strengths (A.10.8.2 in the 2002 edition; numbering varies by edition)"
            }
            SoilTable::Bs8004 => {
                "BS 8004:1986 *Foundations*, Table 1, presumed allowable bearing values under static loading, \
                    lower end of each range"
            }
        }
    }
    pub fn convention(self) -> &'static str {
        match self {
            SoilTable::SafeBearing => "already 'safe' values: the source divides the thrust by them directly (SF = 1)",
            SoilTable::Nfpa24 => "bearing strengths used with a safety factor, 1.5 in the same annex",
            SoilTable::Bs8004 => {
                "allowable values for vertical foundation loads, already reduced for safety; a proxy for \
                    horizontal bearing"
            }
        }
    }
    pub fn short(self) -> &'static str {
        match self {
            SoilTable::SafeBearing => "safe-bearing table (M23)",
            SoilTable::Nfpa24 => "NFPA 24 annex",
            SoilTable::Bs8004 => "BS 8004 Table 1",
        }
    }
}

/// What a published row gives.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Bearing {
    /// An allowable bearing, Pa (the low end where the table gives a range).
    Value(f64),
    /// Only an upper bound, Pa ("under 75 kPa"): no value to size on.
    Below(f64),
    /// The table says the soil carries no block (0, or "not applicable").
    None,
}

/// One row of a published table, as it reads there.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PublishedRow {
    pub table: SoilTable,
    /// The soil as the table names it.
    pub name: &'static str,
    pub bearing: Bearing,
}

/// One soil class: its value, the row it comes from, and every published row that
/// fits it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SoilPreset {
    pub key: &'static str,
    /// The class in the handbook's words ("Soft cohesive").
    pub soil: &'static str,
    /// Soils of the class as people name them in the field.
    pub examples: &'static str,
    /// The table the class value comes from (its lowest row).
    pub table: SoilTable,
    /// Allowable bearing, Pa; 0 where no table gives the class a bearing.
    pub bearing: f64,
    /// Friction coefficient of mass concrete cast on the class (see
    /// [`FRICTION_SOURCE`]; `None` where that table gives none).
    pub friction: Option<f64>,
    /// The rows of the published tables that fit the class, value row included.
    pub rows: &'static [PublishedRow],
}

/// Where the classes' friction coefficients come from.
// NAVFAC DM-7.02 quoted from memory.
pub const FRICTION_SOURCE: &str =
    "NAVFAC DM-7.02 (1986), table of ultimate friction factors for dissimilar materials, mass concrete on the soil \
        of the class, lower end of the range; none for soft cohesive and organic soils, which that table does not \
        cover";

const PSF: f64 = 4.448_221_615_260_5 / (0.3048 * 0.3048);

const fn row(table: SoilTable, name: &'static str, bearing: Bearing) -> PublishedRow {
    PublishedRow { table, name, bearing }
}

use Bearing::{Below, Value};
use SoilTable::{Bs8004, Nfpa24, SafeBearing};

/// Every soil class, softest first. A zero bearing means no table gives the class
/// one: a block cannot bear on it.
pub const SOILS: &[SoilPreset] = &[
    SoilPreset {
        key: "organic",
        soil: "Organic",
        examples: "muck, peat",
        table: SafeBearing,
        bearing: 0.0,
        friction: None,
        rows: &[
            row(SafeBearing, "Muck, peat", Bearing::None),
            row(Bs8004, "Peat and organic soils (not applicable)", Bearing::None),
        ],
    },
    SoilPreset {
        key: "soft_cohesive",
        soil: "Soft cohesive",
        examples: "soft clay, soft silt",
        table: Nfpa24,
        bearing: 1000.0 * PSF,
        friction: None,
        rows: &[
            row(SafeBearing, "Soft clay", Value(1000.0 * PSF)),
            row(Nfpa24, "Soft clay", Value(1000.0 * PSF)),
            row(Bs8004, "Soft clays and silts", Below(75e3)),
        ],
    },
    SoilPreset {
        key: "firm_cohesive",
        soil: "Firm cohesive",
        examples: "firm clay, silt",
        table: Nfpa24,
        bearing: 1500.0 * PSF,
        friction: Some(0.30),
        rows: &[
            row(Nfpa24, "Silt", Value(1500.0 * PSF)),
            row(Bs8004, "Firm clays (75–150 kPa)", Value(75e3)),
        ],
    },
    SoilPreset {
        key: "stiff_cohesive",
        soil: "Stiff cohesive",
        examples: "stiff to hard clay, sandy clay",
        table: Bs8004,
        bearing: 150e3,
        friction: Some(0.30),
        rows: &[
            row(Bs8004, "Stiff clays (150–300 kPa)", Value(150e3)),
            row(
                Bs8004,
                "Very stiff boulder clays, hard clays (300–600 kPa)",
                Value(300e3),
            ),
            row(Nfpa24, "Sandy clay", Value(6000.0 * PSF)),
            row(Nfpa24, "Hard clay", Value(9000.0 * PSF)),
        ],
    },
    SoilPreset {
        key: "loose_granular",
        soil: "Loose granular",
        examples: "sand of loose or unknown density, sandy silt",
        table: SafeBearing,
        bearing: 2000.0 * PSF,
        friction: Some(0.35),
        rows: &[
            row(SafeBearing, "Sand", Value(2000.0 * PSF)),
            row(Nfpa24, "Sandy silt", Value(3000.0 * PSF)),
            row(Nfpa24, "Sand", Value(4000.0 * PSF)),
            row(Bs8004, "Loose sand", Below(100e3)),
            row(Bs8004, "Medium dense sand (100–300 kPa)", Value(100e3)),
        ],
    },
    SoilPreset {
        key: "dense_granular",
        soil: "Dense granular",
        examples: "dense or compact sand, sand and gravel, gravel",
        table: SafeBearing,
        bearing: 3000.0 * PSF,
        friction: Some(0.45),
        rows: &[
            row(SafeBearing, "Sand and gravel", Value(3000.0 * PSF)),
            row(SafeBearing, "Sand and gravel cemented with clay", Value(4000.0 * PSF)),
            row(
                Bs8004,
                "Medium dense gravel, sand and gravel (200–600 kPa)",
                Value(200e3),
            ),
            row(Bs8004, "Compact sand (over 300 kPa)", Value(300e3)),
            row(Bs8004, "Dense gravel, sand and gravel (over 600 kPa)", Value(600e3)),
        ],
    },
    SoilPreset {
        key: "rock",
        soil: "Rock",
        examples: "hard shale, mudstone, sound rock",
        table: SafeBearing,
        bearing: 10000.0 * PSF,
        friction: Some(0.40),
        rows: &[
            row(SafeBearing, "Hard shale", Value(10000.0 * PSF)),
            // BS 8004:1986 Table 1's weakest rock row, from memory.
            row(Bs8004, "Strong shales, mudstones and siltstones", Value(2000e3)),
        ],
    },
];

/// The choices of a soil field: the typed value first, then every class with its
/// value and the table it comes from.
pub const SOIL_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "custom",
        label: "Typed value from the geotechnical report (use one whenever you have it)",
    },
    ChoiceOption {
        key: "organic",
        label: "Organic (muck, peat): 0 (safe-bearing table, M23): no block can bear on it",
    },
    ChoiceOption {
        key: "soft_cohesive",
        label: "Soft cohesive (soft clay, soft silt): 1000 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "firm_cohesive",
        label: "Firm cohesive (firm clay, silt): 1500 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "stiff_cohesive",
        label: "Stiff cohesive (stiff to hard clay): 150 kPa (BS 8004 Table 1, low end)",
    },
    ChoiceOption {
        key: "loose_granular",
        label: "Loose granular (sand of unknown density, sandy silt): 2000 psf (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "dense_granular",
        label: "Dense granular (dense sand, sand and gravel): 3000 psf (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "rock",
        label: "Rock (hard shale): 10000 psf (safe-bearing table, M23)",
    },
];

/// The soil class with this key; a retired preset key of an older link
/// (`glossary::VALUE_ALIASES`, key `soil`) reads as the class it was renamed to.
pub fn soil(key: &str) -> Option<&'static SoilPreset> {
    let key = crate::glossary::VALUE_ALIASES
        .iter()
        .find(|a| a.key == "soil" && a.old == key)
        .map_or(key, |a| a.new);
    SOILS.iter().find(|s| s.key == key)
}

/// The allowable bearing of a class, Pa.
///
/// # Errors
/// [`SoilRefusal`] for an unknown key or a class no table gives a bearing (0).
pub fn bearing_of(key: &str) -> Result<(f64, &'static SoilPreset), SoilRefusal> {
    match soil(key) {
        Some(s) if s.bearing > 0.0 => Ok((s.bearing, s)),
        Some(s) => Err(SoilRefusal::NoBearing(s)),
        None => Err(SoilRefusal::Unknown),
    }
}

/// Why a soil class gives no bearing.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum SoilRefusal {
    Unknown,
    NoBearing(&'static SoilPreset),
}

impl std::fmt::Display for SoilRefusal {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            SoilRefusal::Unknown => write!(f, "unknown soil class"),
            SoilRefusal::NoBearing(s) => write!(
                f,
                "{} soil ({}): the {} gives no bearing (0); a block cannot bear on it: use restrained joints, \
                        piles or tie rods to firm ground, or replace the soil, with a geotechnical engineer",
                s.soil,
                s.examples,
                s.table.short()
            ),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn every_class_is_offered_and_psf_values_convert_exactly() {
        for s in SOILS {
            assert!(SOIL_OPTIONS.iter().any(|o| o.key == s.key), "{} not offered", s.key);
        }
        // 2000 psf, 1 lbf = 4.448 221 615 260 5 N, 1 ft = 0.3048 m (NIST SP 811, App. B).
        assert_relative_eq!(
            soil("loose_granular").unwrap().bearing,
            95_760.517_96,
            max_relative = 1e-9
        );
        assert!(matches!(bearing_of("organic"), Err(SoilRefusal::NoBearing(_))));
        assert_eq!(bearing_of("granite?"), Err(SoilRefusal::Unknown));
    }

    /// Each class takes the lowest value its published rows give, from the row of
    /// the table it names; a class without a valued row gives no bearing.
    #[test]
    fn each_class_takes_the_lowest_value_of_its_rows() {
        for s in SOILS {
            let valued: Vec<(SoilTable, f64)> = s
                .rows
                .iter()
                .filter_map(|r| match r.bearing {
                    Value(v) => Some((r.table, v)),
                    _ => None,
                })
                .collect();
            match valued.iter().map(|(_, v)| *v).reduce(f64::min) {
                None => assert_eq!(s.bearing, 0.0, "{}", s.key),
                Some(lowest) => {
                    assert_eq!(s.bearing, lowest, "{}: not the lowest of its rows", s.key);
                    assert!(
                        valued.iter().any(|(t, v)| *t == s.table && *v == lowest),
                        "{}: the lowest row is not from the {}",
                        s.key,
                        s.table.short()
                    );
                }
            }
        }
    }

    /// The presets of older links, with the bearing each gave (the tables as they
    /// read there): every one reads as a class whose value is no higher, so an old
    /// link never sizes a smaller block than it did.
    #[test]
    fn retired_presets_read_as_a_class_no_less_safe() {
        let retired: &[(&str, f64)] = &[
            ("safe_muck", 0.0),
            ("safe_soft_clay", 1000.0 * PSF),
            ("safe_sand", 2000.0 * PSF),
            ("safe_sand_gravel", 3000.0 * PSF),
            ("safe_sand_gravel_clay", 4000.0 * PSF),
            ("safe_hard_shale", 10000.0 * PSF),
            ("nfpa24_soft_clay", 1000.0 * PSF),
            ("nfpa24_silt", 1500.0 * PSF),
            ("nfpa24_sandy_silt", 3000.0 * PSF),
            ("nfpa24_sand", 4000.0 * PSF),
            ("nfpa24_sandy_clay", 6000.0 * PSF),
            ("nfpa24_hard_clay", 9000.0 * PSF),
            ("bs8004_firm_clay", 75e3),
            ("bs8004_stiff_clay", 150e3),
            ("bs8004_hard_clay", 300e3),
            ("bs8004_medium_sand", 100e3),
            ("bs8004_compact_sand", 300e3),
            ("bs8004_medium_gravel", 200e3),
            ("bs8004_dense_gravel", 600e3),
        ];
        for (old, bearing) in retired {
            let class = soil(old).unwrap_or_else(|| panic!("{old} reads as no class"));
            assert!(
                class.bearing <= *bearing,
                "{old} → {}: {} > {bearing} Pa",
                class.key,
                class.bearing
            );
            assert_eq!(
                class.bearing == 0.0,
                *bearing == 0.0,
                "{old}: a bearing appears or vanishes"
            );
            for page in ["thrust-block", "line-schedule"] {
                let found = crate::glossary::VALUE_ALIASES
                    .iter()
                    .any(|a| a.page == page && a.key == "soil" && a.old == *old && a.new == class.key);
                assert!(found, "{page}: soil={old} is not aliased");
            }
        }
    }
}
