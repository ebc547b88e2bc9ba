//! Restrained-joint length: how far along the pipe, on each side of a bend, tee,
//! reducer, dead end or closed valve, the joints must be restrained so that the
//! soil's friction along the pipe and its passive resistance beside it carry the
//! fitting's thrust (the usual alternative to a thrust block on ductile-iron and
//! PVC mains).
//!
//! # Method
//! 1. **Design pressure** as on the thrust-restraint page (the same fields and
//!    [`crate::calculators::thrust_block::model::read_pressure`]): operating, field
//!    test by a named rule, working plus Joukowsky surge, or the highest.
//! 2. **Thrust** of the fitting at that pressure from the engine's static balance
//!    ([`crate::restraint::static_balance`]) on the outside diameter (restrained
//!    push-on and mechanical joints seal on the spigot's outside).
//! 3. **Length**, per metre of pipe, by the restraint model
//!    [`crate::restraint::restrained`] (the ductile-iron pipe industry's *Thrust
//!    Restraint Design for Ductile Iron Pipe*, DIPRA, 7th ed. 2016, equations from
//!    memory; for PVC the same equations with this handbook's reduced wall ratios,
//!    not checked against the PVC industry's method in AWWA M23, 2nd ed. 2002, ch. 4):
//!    W_e = γ·H·D, W = W_p + W_w + 2·W_e, F_f = π·D·f_c·c + W·tan(f_φ·φ) (0.7·W·tan δ
//!    in polyethylene encasement), R_s = K_n·D·(γ·H_c·K_p + 2c√K_p),
//!    K_p = tan²(45° + φ/2); then L = S_f·P·A·tan(Δ/2)/(F_f + ½R_s) at a bend
//!    (horizontal, or thrust down), S_f·P·A·tan(Δ/2)/(W_p + W_w + W_e) at a bend
//!    whose thrust is up, S_f·P·A/F_f at a dead end, S_f·P·(A₁ − A₂)/F_f at a
//!    reducer and (S_f·P·A_b − R_s,run·L_run)/F_f,branch on a tee's branch. Both
//!    methods are computed and compared; the page headlines the chosen one or the
//!    longer.
//! 4. **Check**: the resistance the computed length mobilises, resolved on the
//!    thrust line (2·L·(F_f + ½R_s)·cos(Δ/2) at a bend, F_f·L behind a dead end …),
//!    against S_f times the engine's thrust, an independent path
//!    ([`Report::check`](crate::catalog::Report::check)).
//!
//! # Field keys
//! `fitting` (`bend` | `dead_end` | `tee` | `reducer`), `angle`, `plane`, `size`,
//! `d`, `od`, `size2`, `d2`, `od2`; the design-pressure fields of the
//! thrust-restraint page (`p_basis`, `p`, `test_rule`, `mdp`, `p_test`, `dv`, the
//! wave-speed and fluid fields; `material` also sets the pipe's weight); `cover`,
//! `soil_class`, `gamma_s`, `phi`, `cohesion`, `f_phi`, `f_c`, `laying`,
//! `encasement`, `sf`, `rl_method`, `run_restrained`.
//!
//! # Assumptions
//! Static thrust; the soil in the trench as assumed along the whole length and
//! never dug away later; bends up to 90° with both legs restrained alike (vertical
//! bends with both legs sloped by Δ/2); the run of a tee credited on one side only.

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::pipe_sizes;
use crate::restraint::restrained::{Encasement, Laying, Method};
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, wall::ShownWhen};

pub mod diagram;
pub mod model;
pub mod report;
pub mod schedule;

pub const KEY: &str = "restrained-length";
/// The page title.
pub const TITLE: &str = "Restrained-joint length at bends, tees, reducers and dead ends";

/// The fittings this page restrains (keys of the restraint model's fittings).
const FITTING_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "bend",
        label: "Bend (elbow)",
    },
    ChoiceOption {
        key: "tee",
        label: "Tee (branch and run)",
    },
    ChoiceOption {
        key: "reducer",
        label: "Reducer (large end to small end)",
    },
    ChoiceOption {
        key: "dead_end",
        label: "Dead end, cap, plug or closed valve",
    },
];

/// The planes of a bend, worded for restrained joints.
const PLANE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "horizontal",
        label: "Horizontal (plan)",
    },
    ChoiceOption {
        key: "vertical_crest",
        label: "Vertical crest: thrust up, held by weight",
    },
    ChoiceOption {
        key: "vertical_sag",
        label: "Vertical sag: thrust down",
    },
];

/// Soil class options: typed, or a class of the table.
pub(crate) const SOIL_CLASS_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "custom",
        label: "Typed values (from the geotechnical report)",
    },
    ChoiceOption {
        key: "clay_fine",
        label: "Clay, under 25 % sand and gravel",
    },
    ChoiceOption {
        key: "clay_coarse",
        label: "Clay, 25 to 50 % sand and gravel",
    },
    ChoiceOption {
        key: "silt_fine",
        label: "Silt, under 25 % sand and gravel",
    },
    ChoiceOption {
        key: "silt_coarse",
        label: "Silt, 25 to 50 % sand and gravel",
    },
    ChoiceOption {
        key: "cohesive_granular",
        label: "Cohesive granular soil",
    },
    ChoiceOption {
        key: "silty_sand",
        label: "Silty sand or gravel",
    },
    ChoiceOption {
        key: "clean_sand",
        label: "Clean sand",
    },
];

const FITTINGS_WITH_SECOND: &[&str] = &["tee", "reducer"];
const SOIL_HELP: &str = "A class gives unit weight, friction angle, cohesion and the pipe-wall ratios of both methods \
    (conservative values for saturated soil; clays and silts of low to medium plasticity, by their share of sand \
    and gravel); any value typed below overrides its class value.";
const MATERIAL_HELP: &str = "Sets the weight of the pipe (part of the normal load that makes friction) and, with \
    surge, the wave speed; by default the material of the size preset.";

/// The design-pressure fields of the thrust-restraint page, taken from its
/// description so both pages offer the same basis, rules and help.
fn pressure_fields() -> Vec<FieldSpec> {
    const KEYS: &[&str] = &["p_basis", "p", "test_rule", "mdp", "p_test", "dv"];
    super::thrust_block::spec()
        .fields
        .into_iter()
        .filter(|f| KEYS.contains(&f.key))
        .map(|f| FieldSpec {
            visible_when: f.visible_when.filter(|(key, _)| *key != "fitting"),
            ..f
        })
        .collect()
}

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        choice(
            "fitting",
            "Fitting",
            FITTING_OPTIONS,
            "bend",
            "A closed valve holds the same thrust as a cap: choose the dead end.",
        ),
        FieldSpec {
            visible_when: Some(("fitting", &["bend"])),
            ..quantity(
                "angle",
                "Bend deflection angle",
                Q::Angle,
                "deg",
                "deg",
                "45 deg",
                Limits::closed(crate::restraint::MIN_ANGLE, std::f64::consts::FRAC_PI_2),
                "From 0.1° to 90°; 11¼, 22½, 45 and 90° are the usual fittings.",
            )
        },
        FieldSpec {
            visible_when: Some(("fitting", &["bend"])),
            ..choice(
                "plane",
                "Plane of the bend",
                PLANE_OPTIONS,
                "horizontal",
                "A bend at a crest pushes up and only weight holds it; a horizontal or sag bend is held by \
                friction and by the soil it bears on.",
            )
        },
        choice(
            "size",
            "Pipe size",
            pipe_sizes::SIZE_OPTIONS,
            "di52_12",
            "A preset gives both diameters; typed diameters below override it.",
        ),
        common::diameter_override(
            "d",
            "Inside diameter (overrides the preset)",
            "Bore of the pipe at the fitting's main end (the weight of the water in it).",
        ),
        common::diameter_override(
            "od",
            "Outside diameter (overrides the preset)",
            "Outside diameter: the thrust area, the earth load and the bearing width.",
        ),
        FieldSpec {
            visible_when: Some(("fitting", FITTINGS_WITH_SECOND)),
            ..choice(
                "size2",
                "Branch (tee) or small-end (reducer) size",
                pipe_sizes::SIZE_OPTIONS,
                "di52_8",
                "A preset, or type the diameters below.",
            )
        },
        FieldSpec {
            visible_when: Some(("fitting", FITTINGS_WITH_SECOND)),
            ..common::diameter_override("d2", "Branch or small-end inside diameter", "Overrides the preset.")
        },
        FieldSpec {
            visible_when: Some(("fitting", FITTINGS_WITH_SECOND)),
            ..common::diameter_override("od2", "Branch or small-end outside diameter", "Overrides the preset.")
        },
        FieldSpec {
            visible_when: Some(("fitting", &["tee"])),
            optional: true,
            ..quantity(
                "run_restrained",
                "Restrained run on each side of the tee",
                Q::Length,
                "m",
                "ft",
                "",
                Limits::closed(0.0, 1000.0),
                "The run pipe restrained with the tee bears sideways on the soil and takes part of the branch \
                thrust (credited on one side only). Empty: no credit.",
            )
        },
    ];
    fields.extend(pressure_fields());
    let always: ShownWhen = None;
    let surge_shown: ShownWhen = Some(("p_basis", &["test", "surge", "highest"]));
    fields.extend(common::wave_speed_fields(always, surge_shown, MATERIAL_HELP));
    fields.extend(common::fluid_fields("15 degC"));
    fields.extend([
        quantity(
            "cover",
            "Depth of cover to the top of the pipe",
            Q::Length,
            "m",
            "ft",
            "1.2 m",
            Limits::closed(0.1, 20.0),
            "From the finished ground surface to the top of the pipe, as it will be for the life of the line.",
        ),
        choice(
            "soil_class",
            "Soil in the trench",
            SOIL_CLASS_OPTIONS,
            "silty_sand",
            SOIL_HELP,
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "gamma_s",
                "Unit weight of the soil (overrides the class)",
                Q::SpecificWeight,
                "kN/m3",
                "lbf/ft3",
                "",
                Limits::closed(5e3, 30e3),
                "Backfill over and beside the pipe; use the submerged unit weight below groundwater.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "phi",
                "Friction angle of the soil (overrides the class)",
                Q::Angle,
                "deg",
                "deg",
                "",
                Limits::closed(0.0, 50f64.to_radians()),
                "Internal friction angle φ, 0 to 50°.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "cohesion",
                "Cohesion of the soil (overrides the class)",
                Q::Pressure,
                "kPa",
                "psf",
                "",
                Limits::closed(0.0, 200e3),
                "Cohesion c, 0 to 200 kPa; 0 for sand and gravel.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "f_phi",
                "Pipe-wall friction ratio f_φ = δ/φ (overrides both methods)",
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(0.0, 1.0),
                "Friction angle between pipe wall and soil over the soil's own. Empty: each method's value for \
                the soil class.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "f_c",
                "Pipe-wall adhesion ratio f_c (overrides both methods)",
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(0.0, 1.0),
                "Adhesion between pipe wall and soil over the soil's cohesion. Empty: each method's value for \
                the soil class.",
            )
        },
        choice(
            "laying",
            "Laying condition (trench and bedding)",
            Laying::OPTIONS,
            "type4",
            "The standard laying conditions of ductile-iron pipe; the better the bedding and compaction beside \
            the pipe, the more passive resistance the soil gives (trench factor Kn).",
        ),
        choice(
            "encasement",
            "Pipe encasement",
            Encasement::OPTIONS,
            "none",
            "Polyethylene encasement lets the pipe slide on the film: friction is reduced and no adhesion \
            counts (ductile-iron method; PVC pipe is not encased).",
        ),
        quantity(
            "sf",
            "Safety factor",
            Q::Ratio,
            "-",
            "-",
            "1.5",
            Limits::closed(1.0, 10.0),
            "Applied to the thrust; 1.5 is usual with these methods.",
        ),
        choice(
            "rl_method",
            "Method in the headline",
            Method::OPTIONS,
            "longer",
            "Both methods are computed and compared below; the headline shows the one chosen, or the longer.",
        ),
    ]);
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "How far each side of a buried fitting the joints must be restrained so that soil friction and \
                bearing carry the thrust: the ductile-iron pipe industry's method, and the same equations with \
                reduced wall ratios for PVC, side by side.",
        fields,
        outputs: vec![
            OutputSpec::headline("length", "Restrained length on each leg of the fitting", Q::Length),
            OutputSpec::headline("length_branch", "Tee: restrained length on the branch", Q::Length),
            OutputSpec::headline("length_run", "Tee: restrained run on each side (credited)", Q::Length),
            OutputSpec::headline("thrust", "Thrust at the design pressure", Q::Force),
            OutputSpec::headline("p_design", "Design pressure used", Q::Pressure),
            OutputSpec::listed("length_di", "Length by the ductile-iron method", Q::Length),
            OutputSpec::listed("length_pvc", "Length with the PVC wall ratios", Q::Length),
            OutputSpec::listed(
                "length_run_alone",
                "Tee: run on each side that alone would carry the branch thrust",
                Q::Length,
            ),
            OutputSpec::listed("area_d", "Diameter of the thrust area (outside diameter)", Q::Length),
            OutputSpec::listed("p_test", "Field test pressure", Q::Pressure),
            OutputSpec::listed("mdp", "Maximum design pressure MDP (EN 805)", Q::Pressure),
            OutputSpec::listed("wave_speed", "Pressure wave speed", Q::Velocity),
            OutputSpec::listed("dp_surge", "Joukowsky surge rise ρ·a·ΔV", Q::Pressure),
            OutputSpec::listed("p_surge", "Working pressure plus surge", Q::Pressure),
        ],
        cautions: vec![
            "The length holds only while the soil along all of it is as assumed (class, cover, compaction, \
                    groundwater); later digging beside or over the pipe takes that away.",
            "Restrain every joint within the length, fittings included, for the design pressure, as the pipe \
                    and restraint makers instruct.",
            "The PVC wall ratios are this handbook's reduction of the ductile-iron ones (0.8 × fφ, ⅔ × fc), \
                    not the PVC pipe industry's published table (AWWA M23): where that table or the restraint \
                    maker's is at hand, type its ratios.",
            "Simplified published methods, not a soil-structure analysis: the local codes, the pipe maker and \
                    a licensed engineer decide the design.",
        ],
    }
}

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, model::read, model::solve, report::write)
}

#[cfg(test)]
mod tests {
    use crate::units::UnitSystem;
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn every_field_key_is_a_glossary_term() {
        crate::calculators::testing::assert_glossary_keys(super::KEY);
    }

    #[test]
    fn demo_solves_in_both_unit_systems_with_agreeing_checks() {
        let mut r = request(&[]);
        for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
            r.system = system;
            let s = crate::solve(super::KEY, &r).result.expect("demo solves");
            assert!(s.defects.is_empty(), "{:?}", s.defects);
            assert_eq!(s.checks.len(), 2);
            assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        }
    }

    #[test]
    fn a_reducer_with_ends_nearly_alike_has_agreeing_checks() {
        // The engine's thrust p(A₁ − A₂) is its two end forces cancelling: ends apart
        // by 1e-9 of their diameter leave their rounding, which the checks of the
        // mobilised resistance must not report as a disagreement (typed ends, and a
        // fuzz-found pair of diameters typed over presets).
        let cases: [&[(&str, &str)]; 2] = [
            &[
                ("size", "custom"),
                ("d", "280 mm"),
                ("od", "300 mm"),
                ("size2", "custom"),
                ("d2", "279.9999997 mm"),
                ("od2", "299.9999997 mm"),
            ],
            &[
                ("size", "iso4427sdr17_225"),
                ("od", "3075.2797641812963 mm"),
                ("size2", "sch80_6"),
                ("od2", "3075.2797641782213 mm"),
            ],
        ];
        for ends in cases {
            let mut pairs = vec![("fitting", "reducer"), ("material", "ductile_iron")];
            pairs.extend_from_slice(ends);
            let s = solved(&pairs);
            assert!(s.checks.iter().all(|c| c.agrees()), "{ends:?}: {:?}", s.checks);
        }
    }

    #[test]
    fn demo_matches_the_method_note_worked_example() {
        // site/notes/restrained-length.md works the demo by hand: T ≈ 72.27 kN,
        // L ≈ 3.91 m (ductile iron) and 4.26 m (PVC, the longer, headlined).
        let s = solved(&[]);
        let get = |k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
        assert_relative_eq!(get("thrust"), 72.27e3, max_relative = 2e-3);
        assert_relative_eq!(get("length_di"), 3.906, max_relative = 2e-3);
        assert_relative_eq!(get("length_pvc"), 4.263, max_relative = 2e-3);
        assert_relative_eq!(get("length"), get("length_pvc"), max_relative = 1e-12);
    }

    #[test]
    fn every_fitting_and_plane_solves() {
        for pairs in [
            &[("fitting", "dead_end")][..],
            &[("fitting", "reducer")],
            &[("fitting", "tee"), ("run_restrained", "6 m")],
            &[("fitting", "tee")],
            &[("plane", "vertical_crest")],
            &[("plane", "vertical_sag")],
            &[("encasement", "polyethylene"), ("rl_method", "ductile_iron")],
            &[("soil_class", "clay_fine")],
        ] {
            let s = solved(pairs);
            assert!(s.defects.is_empty(), "{pairs:?}: {:?}", s.defects);
            assert!(s.checks.iter().all(|c| c.agrees()), "{pairs:?}: {:?}", s.checks);
        }
    }

    #[test]
    fn encasement_lengthens_the_ductile_iron_length_only() {
        let get = |pairs: &[(&str, &str)], key: &str| solved(pairs).output(key).map(|o| o.si).unwrap_or(f64::NAN);
        let bare = get(&[], "length_di");
        let wrapped = get(&[("encasement", "polyethylene")], "length_di");
        assert!(wrapped > bare);
        assert_relative_eq!(
            get(&[], "length_pvc"),
            get(&[("encasement", "polyethylene")], "length_pvc"),
            max_relative = 1e-12
        );
    }

    #[test]
    fn a_tee_run_credit_shortens_the_branch() {
        let get = |pairs: &[(&str, &str)]| solved(pairs).output("length_branch").map(|o| o.si).unwrap_or(f64::NAN);
        let none = get(&[("fitting", "tee")]);
        let some = get(&[("fitting", "tee"), ("run_restrained", "3 m")]);
        assert!(some < none, "{some} < {none}");
    }

    #[test]
    fn bad_inputs_name_their_field() {
        assert_eq!(error_field(&[("angle", "120 deg")]), "angle");
        assert_eq!(error_field(&[("cover", "0 m")]), "cover");
        assert_eq!(error_field(&[("soil_class", "custom")]), "gamma_s");
        assert_eq!(
            error_field(&[("soil_class", "custom"), ("gamma_s", "18 kN/m3"), ("phi", "30 deg")]),
            "f_phi"
        );
        assert_eq!(
            error_field(&[
                ("fitting", "dead_end"),
                ("soil_class", "custom"),
                ("gamma_s", "18 kN/m3"),
                ("phi", "0 deg"),
                ("f_phi", "0.5")
            ]),
            "soil_class"
        );
        assert_eq!(error_field(&[("fitting", "reducer"), ("size2", "di52_16")]), "size2");
        assert_eq!(error_field(&[("p", "-5 psi")]), "p");
    }
}
