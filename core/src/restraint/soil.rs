//! Soil presets: allowable bearing of undisturbed soil against a block face, and
//! the friction coefficient of mass concrete cast on it, from published tables.
//!
//! Three tables disagree by up to about 4× for the same soil name ([`SoilTable`]
//! cites each and its safety-factor convention); a typed value from a geotechnical
//! basis is always allowed, from [`MIN_TYPED_BEARING`] to [`MAX_TYPED_BEARING`].
//! Friction coefficients: [`FRICTION_SOURCE`].

use crate::catalog::ChoiceOption;

/// Range of a typed allowable soil bearing, Pa: 1 kPa to 20 MPa (sound rock).
pub const MIN_TYPED_BEARING: f64 = 1e3;
pub const MAX_TYPED_BEARING: f64 = 20e6;

/// Which published table a soil preset comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SoilTable {
    SafeBearing,
    Nfpa24,
    Bs8004,
}

impl SoilTable {
    pub fn citation(self) -> &'static str {
        match self {
            SoilTable::SafeBearing => {
                "Safe bearing loads for horizontal thrusts (cover over 2 ft), the table reproduced in AWWA M23 \
                    *PVC Pipe — Design and Installation* and in pipe makers' installation guides (from memory; \
                    confirmed against a pipe maker's reproduction)"
            }
            SoilTable::Nfpa24 => {
                "NFPA 24, *Installation of Private Fire Service Mains*, annex table of horizontal bearing \
                    strengths (A.10.8.2 in the 2002 edition; numbering varies by edition; from memory)"
            }
            SoilTable::Bs8004 => {
                "BS 8004:1986 *Foundations*, Table 1, presumed allowable bearing values under static loading, \
                    lower end of each range (from memory)"
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

/// One soil preset: allowable bearing, Pa, and the friction coefficient of mass
/// concrete cast on it (see [`FRICTION_SOURCE`]; `None` where that table gives none).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SoilPreset {
    pub key: &'static str,
    pub table: SoilTable,
    pub soil: &'static str,
    pub bearing: f64,
    pub friction: Option<f64>,
}

/// Where the presets' friction coefficients come from.
pub const FRICTION_SOURCE: &str =
    "NAVFAC DM-7.02 (1986), table of ultimate friction factors for dissimilar materials, mass concrete on the soil \
        named (from memory), lower end of the range of the row that fits the soil name; none for soft clay, muck and \
        peat, which that table does not cover";

const PSF: f64 = 4.448_221_615_260_5 / (0.3048 * 0.3048);

/// Every soil preset. A zero value means the source gives no bearing at all.
pub const SOILS: &[SoilPreset] = &[
    SoilPreset {
        key: "safe_muck",
        table: SoilTable::SafeBearing,
        soil: "Muck, peat",
        bearing: 0.0,
        friction: None,
    },
    SoilPreset {
        key: "safe_soft_clay",
        table: SoilTable::SafeBearing,
        soil: "Soft clay",
        bearing: 1000.0 * PSF,
        friction: None,
    },
    SoilPreset {
        key: "safe_sand",
        table: SoilTable::SafeBearing,
        soil: "Sand",
        bearing: 2000.0 * PSF,
        friction: Some(0.35),
    },
    SoilPreset {
        key: "safe_sand_gravel",
        table: SoilTable::SafeBearing,
        soil: "Sand and gravel",
        bearing: 3000.0 * PSF,
        friction: Some(0.45),
    },
    SoilPreset {
        key: "safe_sand_gravel_clay",
        table: SoilTable::SafeBearing,
        soil: "Sand and gravel cemented with clay",
        bearing: 4000.0 * PSF,
        friction: Some(0.45),
    },
    SoilPreset {
        key: "safe_hard_shale",
        table: SoilTable::SafeBearing,
        soil: "Hard shale",
        bearing: 10000.0 * PSF,
        friction: Some(0.40),
    },
    SoilPreset {
        key: "nfpa24_soft_clay",
        table: SoilTable::Nfpa24,
        soil: "Soft clay",
        bearing: 1000.0 * PSF,
        friction: None,
    },
    SoilPreset {
        key: "nfpa24_silt",
        table: SoilTable::Nfpa24,
        soil: "Silt",
        bearing: 1500.0 * PSF,
        friction: Some(0.30),
    },
    SoilPreset {
        key: "nfpa24_sandy_silt",
        table: SoilTable::Nfpa24,
        soil: "Sandy silt",
        bearing: 3000.0 * PSF,
        friction: Some(0.30),
    },
    SoilPreset {
        key: "nfpa24_sand",
        table: SoilTable::Nfpa24,
        soil: "Sand",
        bearing: 4000.0 * PSF,
        friction: Some(0.35),
    },
    SoilPreset {
        key: "nfpa24_sandy_clay",
        table: SoilTable::Nfpa24,
        soil: "Sandy clay",
        bearing: 6000.0 * PSF,
        friction: Some(0.30),
    },
    SoilPreset {
        key: "nfpa24_hard_clay",
        table: SoilTable::Nfpa24,
        soil: "Hard clay",
        bearing: 9000.0 * PSF,
        friction: Some(0.40),
    },
    SoilPreset {
        key: "bs8004_firm_clay",
        table: SoilTable::Bs8004,
        soil: "Firm clay (75–150 kPa)",
        bearing: 75e3,
        friction: Some(0.30),
    },
    SoilPreset {
        key: "bs8004_stiff_clay",
        table: SoilTable::Bs8004,
        soil: "Stiff clay (150–300 kPa)",
        bearing: 150e3,
        friction: Some(0.30),
    },
    SoilPreset {
        key: "bs8004_hard_clay",
        table: SoilTable::Bs8004,
        soil: "Very stiff boulder clay, hard clay (300–600 kPa)",
        bearing: 300e3,
        friction: Some(0.40),
    },
    SoilPreset {
        key: "bs8004_medium_sand",
        table: SoilTable::Bs8004,
        soil: "Medium dense sand (100–300 kPa)",
        bearing: 100e3,
        friction: Some(0.35),
    },
    SoilPreset {
        key: "bs8004_compact_sand",
        table: SoilTable::Bs8004,
        soil: "Compact sand (over 300 kPa)",
        bearing: 300e3,
        friction: Some(0.35),
    },
    SoilPreset {
        key: "bs8004_medium_gravel",
        table: SoilTable::Bs8004,
        soil: "Medium dense gravel, sand and gravel (200–600 kPa)",
        bearing: 200e3,
        friction: Some(0.45),
    },
    SoilPreset {
        key: "bs8004_dense_gravel",
        table: SoilTable::Bs8004,
        soil: "Dense gravel, sand and gravel (over 600 kPa)",
        bearing: 600e3,
        friction: Some(0.45),
    },
];

pub const SOIL_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "custom",
        label: "Typed value (from the geotechnical report)",
    },
    ChoiceOption {
        key: "safe_muck",
        label: "Muck, peat: 0 (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "safe_soft_clay",
        label: "Soft clay: 1000 psf (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "safe_sand",
        label: "Sand: 2000 psf (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "safe_sand_gravel",
        label: "Sand and gravel: 3000 psf (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "safe_sand_gravel_clay",
        label: "Sand and gravel cemented with clay: 4000 psf (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "safe_hard_shale",
        label: "Hard shale: 10000 psf (safe-bearing table, M23)",
    },
    ChoiceOption {
        key: "nfpa24_soft_clay",
        label: "Soft clay: 1000 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "nfpa24_silt",
        label: "Silt: 1500 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "nfpa24_sandy_silt",
        label: "Sandy silt: 3000 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "nfpa24_sand",
        label: "Sand: 4000 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "nfpa24_sandy_clay",
        label: "Sandy clay: 6000 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "nfpa24_hard_clay",
        label: "Hard clay: 9000 psf (NFPA 24 annex)",
    },
    ChoiceOption {
        key: "bs8004_firm_clay",
        label: "Firm clay: 75 kPa (BS 8004 Table 1, low end)",
    },
    ChoiceOption {
        key: "bs8004_stiff_clay",
        label: "Stiff clay: 150 kPa (BS 8004 Table 1, low end)",
    },
    ChoiceOption {
        key: "bs8004_hard_clay",
        label: "Very stiff or hard clay: 300 kPa (BS 8004 Table 1, low end)",
    },
    ChoiceOption {
        key: "bs8004_medium_sand",
        label: "Medium dense sand: 100 kPa (BS 8004 Table 1, low end)",
    },
    ChoiceOption {
        key: "bs8004_compact_sand",
        label: "Compact sand: 300 kPa (BS 8004 Table 1, low end)",
    },
    ChoiceOption {
        key: "bs8004_medium_gravel",
        label: "Medium dense gravel: 200 kPa (BS 8004 Table 1, low end)",
    },
    ChoiceOption {
        key: "bs8004_dense_gravel",
        label: "Dense gravel: 600 kPa (BS 8004 Table 1, low end)",
    },
];

/// The soil preset with this key.
pub fn soil(key: &str) -> Option<&'static SoilPreset> {
    SOILS.iter().find(|s| s.key == key)
}

/// The allowable bearing of a preset, Pa.
///
/// # Errors
/// [`SoilRefusal`] for an unknown key or a soil its table gives no bearing (0).
pub fn bearing_of(key: &str) -> Result<(f64, &'static SoilPreset), SoilRefusal> {
    match soil(key) {
        Some(s) if s.bearing > 0.0 => Ok((s.bearing, s)),
        Some(s) => Err(SoilRefusal::NoBearing(s)),
        None => Err(SoilRefusal::Unknown),
    }
}

/// Why a soil preset gives no bearing.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum SoilRefusal {
    Unknown,
    NoBearing(&'static SoilPreset),
}

impl std::fmt::Display for SoilRefusal {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            SoilRefusal::Unknown => write!(f, "unknown soil preset"),
            SoilRefusal::NoBearing(s) => write!(
                f,
                "{}: the {} gives no bearing (0); a block cannot bear on it: use restrained joints, piles or \
                        tie rods to firm ground, or replace the soil, with a geotechnical engineer",
                s.soil,
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
    fn every_preset_is_offered_and_psf_values_convert_exactly() {
        for s in SOILS {
            assert!(SOIL_OPTIONS.iter().any(|o| o.key == s.key), "{} not offered", s.key);
        }
        // 2000 psf, 1 lbf = 4.448 221 615 260 5 N, 1 ft = 0.3048 m (NIST SP 811, App. B).
        assert_relative_eq!(soil("safe_sand").unwrap().bearing, 95_760.517_96, max_relative = 1e-9);
        assert!(matches!(bearing_of("safe_muck"), Err(SoilRefusal::NoBearing(_))));
        assert_eq!(bearing_of("granite?"), Err(SoilRefusal::Unknown));
    }
}
