//! Design pressure: the pressure a restraint is sized for, chosen openly.
//!
//! # Method
//! The candidates are the operating (working) pressure; the field test pressure by
//! a named rule ([`TEST_RULES`]) or typed; and the working pressure plus surge. The
//! basis ([`PressureBasis`]) picks one, or the highest ([`design_pressure`]).
//!
//! EN 805's rule applies to the maximum design pressure MDP, which includes surge:
//! typed, or the working pressure plus the standard's smallest allowance where
//! surge is not calculated, 200 kPa (EN 805:2000 cl. 11.3.3 as usually read, from
//! memory): 6 bar working → MDP 8 bar → STP min(1.5·8, 8 + 5) = 12 bar.
//!
//! The surge is the Joukowsky rise Δp = ρ·a·ΔV for an instantaneous velocity change
//! ΔV ([`joukowsky`]), with the pipe-elasticity-corrected wave speed ([`wave_speed`];
//! Wylie & Streeter, *Fluid Transients in Systems*, 1993, eq. 2.21; Chaudhry,
//! *Applied Hydraulic Transients*, 3rd ed., eq. 2.19 — equation forms from memory):
//! a = √( (K/ρ) / (1 + c₁·K·D/(E·e)) ),
//! K the liquid's bulk modulus, D the inside diameter, e the wall, E the wall's
//! Young's modulus and c₁ the axial-restraint factor ([`Anchoring`]).
//!
//! # Pressure by elevation
//! Test pressure is set at a test point; with the line full and still, a fitting at
//! another elevation sees that pressure plus the static head between them
//! ([`elevation_head`]): p_fitting = p_test point + ρ·g·(z_test − z_fitting), so a
//! fitting below the test point sees more (hydrostatics, derived from the
//! definition; g = 9.80665 m/s², standard gravity, CGPM 1901). AWWA C600 and C605
//! state their test pressures at a point of the section (the lowest or the highest;
//! from memory), which is why the elevation of the test point matters.
//! [`hydrostatic_by_energy_balance`] finds the same pressure through the engine's
//! energy balance of still water between two ports at those elevations, the
//! independent path the pages check against.
//!
//! # Assumptions
//! Gauge pressures; an instantaneous velocity change (a valve closing faster than
//! 2L/a); the rules as their standards are usually read (check the edition a
//! contract cites).

use super::keyed_choice;
use crate::catalog::ChoiceOption;
use crate::engine::{self, si, ControlVolume, Port, Stream};
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::units::STANDARD_GRAVITY;
use crate::vector::{Direction, Vec3};

keyed_choice! {
    /// Which pressure a restraint is designed for.
    pub enum PressureBasis {
        Highest => ("highest", "Highest of operating, test and working + surge"),
        Operating => ("operating", "Operating (working) pressure"),
        Test => ("test", "Field test pressure"),
        Surge => ("surge", "Working pressure plus surge"),
    }
}

impl PressureBasis {
    /// Whether the basis needs the field test pressure.
    pub fn wants_test(self) -> bool {
        matches!(self, PressureBasis::Test | PressureBasis::Highest)
    }
    /// Whether the basis needs the surge.
    pub fn wants_surge(self) -> bool {
        matches!(self, PressureBasis::Surge | PressureBasis::Highest)
    }
}

/// Which candidate a design pressure is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Governing {
    Operating,
    Test,
    WorkingPlusSurge,
}

impl Governing {
    pub fn text(self) -> &'static str {
        match self {
            Governing::Operating => "operating",
            Governing::Test => "test",
            Governing::WorkingPlusSurge => "working + surge",
        }
    }
}

/// The design pressure on a basis from its candidates (gauge, Pa): the working
/// pressure, the test pressure and the working pressure plus surge (each `None`
/// when not found). A basis whose candidate is missing falls back to the working
/// pressure; the highest takes the largest (ties to the working pressure, then the
/// test).
pub fn design_pressure(
    basis: PressureBasis,
    work: f64,
    test: Option<f64>,
    work_plus_surge: Option<f64>,
) -> (f64, Governing) {
    let operating = (work, Governing::Operating);
    let test = test.map(|t| (t, Governing::Test));
    let surge = work_plus_surge.map(|s| (s, Governing::WorkingPlusSurge));
    match basis {
        PressureBasis::Operating => operating,
        PressureBasis::Test => test.unwrap_or(operating),
        PressureBasis::Surge => surge.unwrap_or(operating),
        PressureBasis::Highest => {
            [test, surge]
                .into_iter()
                .flatten()
                .fold(operating, |best, c| if c.0 > best.0 { c } else { best })
        }
    }
}

/// The Joukowsky pressure rise ρ·a·ΔV, Pa.
pub fn joukowsky(density: f64, wave_speed: f64, dv: f64) -> f64 {
    density * wave_speed * dv
}

/// Wave speed in a liquid-filled elastic pipe, m/s (see the module doc).
pub fn wave_speed(bulk_modulus: f64, density: f64, d_inside: f64, wall: f64, e_modulus: f64, c1: f64) -> f64 {
    (bulk_modulus / density / (1.0 + c1 * bulk_modulus * d_inside / (e_modulus * wall))).sqrt()
}

/// The static head from a test point at `z_test` to a fitting at `z_fitting` (m),
/// as a pressure, Pa: ρ·g·(z_test − z_fitting), positive when the fitting is lower.
pub fn elevation_head(density: f64, z_test: f64, z_fitting: f64) -> f64 {
    density * STANDARD_GRAVITY * (z_test - z_fitting)
}

/// ρ·g·(|z_test| + |z_fitting|), Pa: the size of the two hydrostatic terms whose
/// difference is [`elevation_head`] and that an energy balance between the two
/// elevations subtracts; a check of the head is relative to it (1 µm apart a
/// kilometre down, the head is a millionth of each).
pub fn hydrostatic_terms(density: f64, z_test: f64, z_fitting: f64) -> f64 {
    density * STANDARD_GRAVITY * (z_test.abs() + z_fitting.abs())
}

/// The pressure at a fitting at `z_fitting` when the still line holds `p_test_point`
/// (gauge, Pa) at `z_test`, by the engine's energy balance between two ports of a
/// pipe at those elevations with no flow (an independent path to
/// [`elevation_head`]).
///
/// # Errors
/// An engine refusal (a non-finite input).
pub fn hydrostatic_by_energy_balance(
    p_test_point: f64,
    z_test: f64,
    z_fitting: f64,
    fluid: &Fluid,
) -> Result<f64, engine::EngineError> {
    let mut cv = ControlVolume::new(fluid.clone());
    cv.gravity(Vec3::new(0.0, 0.0, -STANDARD_GRAVITY));
    let area = si::area(0.01);
    let inlet = cv.port(
        Port::inlet("test point", area, Direction::Z)
            .velocity(si::velocity(0.0))
            .pressure(si::pressure(p_test_point))
            .at(Vec3::new(0.0, 0.0, z_test)),
    );
    let outlet = cv.port(
        Port::outlet("fitting", area, Direction::Z)
            .velocity(si::velocity(0.0))
            .at(Vec3::new(0.0, 0.0, z_fitting)),
    );
    cv.stream(Stream::new(inlet, outlet));
    let balance = engine::balance(&cv)?;
    Ok(balance.ports[outlet].pressure)
}

/// Bulk modulus of water used when none is typed, Pa: 2.2 GPa, the usual round
/// value near 20 °C (White, *Fluid Mechanics*, gives 2.19 GPa at 20 °C; from memory).
pub const WATER_BULK_MODULUS: f64 = 2.2e9;

keyed_choice! {
    /// The wall material of a pipe, for the wave speed.
    pub enum Material {
        FromSize => ("from_size", "The material of the pipe size preset"),
        Steel => ("steel", "Steel: E = 207 GPa, ν = 0.30"),
        DuctileIron => ("ductile_iron", "Ductile iron: E = 165 GPa, ν = 0.28"),
        Pvc => ("pvc", "PVC: E = 2.76 GPa, ν = 0.45"),
        Pe => ("pe", "Polyethylene (PE100): E = 1.0 GPa, ν = 0.45"),
        Custom => ("custom", "Typed modulus"),
    }
}

impl Material {
    /// Density of the wall material for the weight of the pipe, kg/m³; `None` for
    /// a material not named. Steel 7850, the value behind ASME B36.10M's plain-end
    /// weight formula w = 10.69·(D − t)·t lb/ft (from memory); ductile iron 7150
    /// (0.258 lb/in³); PVC 1400 (specific gravity about 1.40); PE 100 950 (the last
    /// three common practice, no source).
    pub fn wall_density(self) -> Option<f64> {
        match self {
            Material::Steel => Some(7850.0),
            Material::DuctileIron => Some(7150.0),
            Material::Pvc => Some(1400.0),
            Material::Pe => Some(950.0),
            Material::FromSize | Material::Custom => None,
        }
    }

    /// The wall material of a pipe size preset's family.
    pub fn of_family(family: pipe_sizes::Family) -> Material {
        use pipe_sizes::Family as F;
        match family {
            F::SteelSch40 | F::SteelSch80 | F::SteelEn10220 => Material::Steel,
            F::DuctileIronClass52 | F::DuctileIronEn545K9 => Material::DuctileIron,
            F::PvcC900Dr18 | F::PvcIso1452Sdr21 | F::PvcIso1452Sdr17 => Material::Pvc,
            F::PeIso4427Sdr11 | F::PeIso4427Sdr17 => Material::Pe,
        }
    }
}

/// The material options (derived from [`Material`]).
pub const MATERIAL_OPTIONS: &[ChoiceOption] = Material::OPTIONS;

/// The wall material of a pipe size preset's family (a key of [`material`]).
pub fn preset_material(family: pipe_sizes::Family) -> &'static str {
    Material::of_family(family).key()
}

/// Young's modulus (Pa), Poisson's ratio and where the values come from.
pub fn material(key: &str) -> Option<(f64, f64, &'static str)> {
    match key {
        "steel" => Some((
            207e9,
            0.30,
            // Wylie & Streeter's table, quoted from memory.
            "steel E = 207 GPa, ν = 0.30: Wylie & Streeter, Fluid Transients in Systems (1993), table of pipe \
                properties",
        )),
        "ductile_iron" => Some((
            165e9,
            0.28,
            // Both values quoted from memory of the makers' literature.
            "ductile iron E ≈ 24 × 10⁶ psi (165 GPa), ν = 0.28: the ductile-iron pipe makers' design literature",
        )),
        "pvc" => Some((
            2.76e9,
            0.45,
            // The C900 design basis quoted from memory.
            "PVC E = 400 000 psi (2.76 GPa): the AWWA C900 design basis; ν = 0.45 common practice, no single \
                source",
        )),
        "pe" => Some((
            1.0e9,
            0.45,
            "PE100 short-term E ≈ 1.0 GPa, ν = 0.45: common practice, no source (varies with temperature and load \
                time)",
        )),
        _ => None,
    }
}

keyed_choice! {
    /// Axial restraint of the pipe: Wylie & Streeter's factor c₁ of the wave speed.
    pub enum Anchoring {
        Joints => ("joints", "Joints or expansion joints throughout (c₁ = 1)"),
        Anchored => ("anchored", "Anchored against axial movement throughout (c₁ = 1 − ν²)"),
        Upstream => ("upstream", "Anchored at the upstream end only (c₁ = 1 − ν/2)"),
    }
}

impl Anchoring {
    /// The factor c₁ for a wall of Poisson's ratio `nu`.
    pub fn c1(self, nu: f64) -> f64 {
        match self {
            Anchoring::Joints => 1.0,
            Anchoring::Anchored => 1.0 - nu * nu,
            Anchoring::Upstream => 1.0 - nu / 2.0,
        }
    }
}

/// The anchoring options (derived from [`Anchoring`]).
pub const ANCHOR_OPTIONS: &[ChoiceOption] = Anchoring::OPTIONS;

/// The design-pressure basis options (derived from [`PressureBasis`]).
pub const BASIS_OPTIONS: &[ChoiceOption] = PressureBasis::OPTIONS;

// ---------------------------------------------------------------------------------
// Test-pressure rules.

pub const TEST_RULE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "en805",
        label: "EN 805 system test pressure, surge not calculated: lower of 1.5 × MDP and MDP + 5 bar, MDP at least \
                working + 2 bar",
    },
    ChoiceOption {
        key: "en805_surge",
        label: "EN 805 system test pressure, surge calculated: MDPc + 1 bar",
    },
    ChoiceOption {
        key: "c600",
        label: "AWWA C600 (ductile iron): 1.5 × working pressure at the point of test",
    },
    ChoiceOption {
        key: "c605",
        label: "AWWA C605 (PVC): 1.25 × working pressure",
    },
    ChoiceOption {
        key: "nfpa24",
        label: "NFPA 24 (fire mains): 200 psi or working + 50 psi, whichever is greater",
    },
    ChoiceOption {
        key: "custom",
        label: "Typed test pressure",
    },
];

/// A named test-pressure rule: its citation and the test pressure for a working
/// pressure (both gauge, Pa).
#[derive(Debug)]
pub struct TestRule {
    pub key: &'static str,
    pub citation: &'static str,
    /// Whether the rule needs a calculated surge (the second argument of `apply`).
    pub needs_surge: bool,
    /// Surge allowance the rule's base pressure includes when surge is not
    /// calculated, Pa: the rule applies to working + allowance (EN 805's MDP).
    pub allowance: f64,
    /// Test pressure from the rule's base pressure (working + allowance, or a typed
    /// MDP) and the calculated surge rise, Pa.
    pub apply: fn(f64, f64) -> f64,
}

impl TestRule {
    /// The test pressure for a working pressure `work`: the rule applied to
    /// `work + allowance` (or to a typed base pressure such as EN 805's MDP).
    pub fn test_pressure(&self, work: f64, typed_base: Option<f64>, surge: f64) -> f64 {
        (self.apply)(typed_base.unwrap_or(work + self.allowance), surge)
    }
}

/// EN 805's smallest surge allowance where surge is not calculated, Pa (200 kPa).
pub const EN805_SURGE_ALLOWANCE: f64 = 200e3;

pub const TEST_RULES: &[TestRule] = &[
    TestRule {
        key: "en805",
        // Clause and allowance quoted from memory of EN 805:2000.
        citation: "EN 805:2000 clause 11.3.3: where surge is not calculated, STP is the lower of MDP × 1.5 and MDP + \
                500 kPa, and MDP includes a surge allowance of at least 200 kPa (as the standard is usually read): \
                MDP = working + 200 kPa unless MDP is typed",
        needs_surge: false,
        allowance: EN805_SURGE_ALLOWANCE,
        apply: |p, _| (1.5 * p).min(p + 500e3),
    },
    TestRule {
        key: "c600",
        // Quoted from memory of AWWA C600.
        citation: "ANSI/AWWA C600 (installation of ductile-iron mains), hydrostatic testing: not less than \
                1.5 × the working pressure at the point of testing (and 1.25 × at the highest point)",
        needs_surge: false,
        allowance: 0.0,
        apply: |p, _| 1.5 * p,
    },
    TestRule {
        key: "c605",
        // Quoted from memory of AWWA C605.
        citation: "ANSI/AWWA C605 (installation of PVC pressure pipe), hydrostatic testing: not less than \
                1.25 × the stated working pressure, measured at the highest point of the test section",
        needs_surge: false,
        allowance: 0.0,
        apply: |p, _| 1.25 * p,
    },
    TestRule {
        key: "nfpa24",
        // Quoted from memory of NFPA 24.
        citation: "NFPA 24 (private fire service mains), hydrostatic test: 200 psi (13.8 bar) or 50 psi \
                (3.4 bar) above the system working pressure, whichever is greater",
        needs_surge: false,
        allowance: 0.0,
        apply: |p, _| (200.0 * PSI).max(p + 50.0 * PSI),
    },
    TestRule {
        key: "en805_surge",
        // Quoted from memory of EN 805:2000.
        citation: "EN 805:2000 clause 11.3.3: where surge is calculated, STP = MDPc + 100 kPa, MDPc being \
                the working pressure plus the calculated surge",
        needs_surge: true,
        allowance: 0.0,
        apply: |p, surge| p + surge + 100e3,
    },
];

const PSI: f64 = 4.448_221_615_260_5 / (0.0254 * 0.0254);

/// The test rule with this key.
pub fn test_rule(key: &str) -> Option<&'static TestRule> {
    TEST_RULES.iter().find(|r| r.key == key)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn si_density(v: f64) -> uom::si::f64::MassDensity {
        uom::si::f64::MassDensity::new::<uom::si::mass_density::kilogram_per_cubic_meter>(v)
    }
    fn si_viscosity(v: f64) -> uom::si::f64::DynamicViscosity {
        uom::si::f64::DynamicViscosity::new::<uom::si::dynamic_viscosity::pascal_second>(v)
    }

    #[test]
    fn en805_without_calculated_surge_tests_6_bar_working_at_12_bar() {
        // EN 805:2000 cl. 11.3.3 as usually read (from memory): MDP = 6 + 2 bar,
        // STP = min(1.5 × 8, 8 + 5) = 12 bar.
        let rule = test_rule("en805").unwrap();
        assert_relative_eq!(rule.test_pressure(6e5, None, 0.0), 12e5, max_relative = 1e-12);
    }

    #[test]
    fn the_highest_basis_takes_the_largest_candidate_and_says_which() {
        let (p, g) = design_pressure(PressureBasis::Highest, 7e5, Some(10.5e5), Some(10.69e5));
        assert_eq!((p, g), (10.69e5, Governing::WorkingPlusSurge));
        let (p, g) = design_pressure(PressureBasis::Highest, 7e5, Some(10.5e5), None);
        assert_eq!((p, g), (10.5e5, Governing::Test));
        assert_eq!(
            design_pressure(PressureBasis::Test, 7e5, None, None),
            (7e5, Governing::Operating)
        );
    }

    #[test]
    fn wave_speed_in_a_rigid_pipe_is_the_liquids_sound_speed() {
        // Derived from the definition: E → ∞ leaves a = √(K/ρ) = √(2.2e9/1000) m/s.
        let a = wave_speed(2.2e9, 1000.0, 0.3, 0.01, 1e30, 1.0);
        assert_relative_eq!(a, (2.2e6f64).sqrt(), max_relative = 1e-12);
    }

    #[test]
    fn the_energy_balance_of_still_water_gives_the_static_head() {
        // Derived from the definition: 10 m of water at 1000 kg/m³ below the test
        // point adds ρ·g·Δz = 1000 × 9.80665 × 10 = 98 066.5 Pa.
        let fluid = Fluid::custom("water", si_density(1000.0), si_viscosity(1e-3)).unwrap();
        assert_relative_eq!(elevation_head(1000.0, 110.0, 100.0), 98_066.5, max_relative = 1e-12);
        let p = hydrostatic_by_energy_balance(10e5, 110.0, 100.0, &fluid).unwrap();
        assert_relative_eq!(p, 10e5 + 98_066.5, max_relative = 1e-9);
        let p = hydrostatic_by_energy_balance(10e5, 100.0, 110.0, &fluid).unwrap();
        assert_relative_eq!(p, 10e5 - 98_066.5, max_relative = 1e-9);
    }
}
