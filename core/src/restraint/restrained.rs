//! Restrained-joint length: how much pipe on each side of a fitting must have its
//! joints restrained so that soil friction along the pipe and the passive
//! resistance of the soil beside it carry the fitting's thrust.
//!
//! # Governing equations
//! Per unit length of buried pipe of outside diameter D under a cover H (to the top
//! of the pipe), in soil of unit weight γ, friction angle φ and cohesion c
//! (*Thrust Restraint Design for Ductile Iron Pipe*, DIPRA, 7th ed. 2016, the same
//! equations as the 6th ed. 2006; equations from memory, recomputed here):
//!
//! - earth load (prism) W_e = γ·H·D; normal load on the pipe
//!   W = W_p + W_w + 2·W_e (top and bottom), W_p and W_w the weights of pipe and
//!   water;
//! - unit friction F_f = A_p·C + W·tan δ, with A_p = π·D the pipe's surface, the
//!   pipe adhesion C = f_c·c and the wall friction angle δ = f_φ·φ; pipe in
//!   polyethylene encasement slides on the film: F_f = 0.7·W·tan δ and no adhesion
//!   ([`ENCASEMENT_FACTOR`]);
//! - passive resistance R_s = K_n·D·(γ·H_c·K_p + 2·c·√K_p), H_c = H + D/2 the depth
//!   to the pipe's centre, K_p = tan²(45° + φ/2) Rankine's coefficient, K_n the
//!   trench-condition factor of the laying condition ([`Laying`]).
//!
//! The restrained length L on each side, with a safety factor S_f on the thrust:
//!
//! | Fitting | L |
//! |---|---|
//! | horizontal bend, or vertical bend with the thrust down | S_f·P·A·tan(Δ/2) / (F_f + ½·R_s) |
//! | vertical bend with the thrust up (crest) | S_f·P·A·tan(Δ/2) / (W_p + W_w + W_e) |
//! | dead end, closed valve | S_f·P·A / F_f |
//! | reducer (large side) | S_f·P·(A₁ − A₂) / F_f |
//! | tee branch | (S_f·P·A_b − R_s,run·L_run) / F_f,branch, at least 0 |
//!
//! A = π·D²/4 on the outside diameter. The passive term at a bend is halved
//! because the soil's reaction is taken to fall linearly from the fitting to zero
//! at L; under uplift only weight holds the pipe (no friction, no bearing).
//!
//! # Two pipe walls
//! The ductile-iron pipe industry's method (DIPRA) is the balance above. The PVC
//! pipe industry publishes its own restrained-joint method (AWWA M23 *PVC Pipe —
//! Design and Installation*, 2nd ed. 2002, ch. 4 "Thrust Restraint—General", whose
//! figures show the friction and passive forces on a bend and the trench
//! conditions for restrained joints on PVC mains; 3rd ed. 2020 not consulted;
//! Uni-Bell); its equations and soil values have NOT been checked here: the
//! public text reachable while this was written stopped at M23's contents.
//! What this handbook computes for PVC ([`Method::Pvc`]) is the same balance
//! with reduced wall ratios of its own choosing: 0.8 × the ductile-iron f_φ and
//! ⅔ × its f_c, with no encasement, so that a PVC main is never given a shorter
//! length than ductile iron in the same soil. The page says so and asks for the
//! published or the restraint maker's ratios to be typed where they are at hand.
//! Typed ratios override both.
//!
//! # Assumptions
//! Static thrust on the outside diameter; soil in the trench as assumed along the
//! whole length (undisturbed by later digging); bends up to 90°; a tee's run
//! credited with its passive resistance over the typed restrained run on one side
//! only (conservative where the method allows both sides).

use std::f64::consts::PI;

use super::keyed_choice;

/// Factor on the friction of pipe in polyethylene encasement (from memory: the
/// ductile-iron guide's reduction for encased pipe), with no adhesion credited.
pub const ENCASEMENT_FACTOR: f64 = 0.7;

keyed_choice! {
    /// Which published method's pipe-wall ratios set the restrained length.
    pub enum Method {
        Longer => ("longer", "The longer of the two"),
        DuctileIron => ("ductile_iron", "Ductile-iron pipe industry (DIPRA)"),
        Pvc => ("pvc", "PVC wall: ductile-iron equations with reduced wall ratios"),
    }
}

keyed_choice! {
    /// The laying condition of the pipe in its trench (the five standard laying
    /// conditions of AWWA C150/A21.50), which sets the trench factor K_n.
    pub enum Laying {
        Type1 => ("type1", "Type 1: flat trench, loose backfill (Kn 0.20)"),
        Type2 => ("type2", "Type 2: flat trench, fill lightly compacted to the centre (Kn 0.40)"),
        Type3 => ("type3", "Type 3: loose-soil bed, fill lightly compacted to the top (Kn 0.60)"),
        Type4 => ("type4", "Type 4: granular bed, fill compacted to the top (Kn 0.85)"),
        Type5 => ("type5", "Type 5: compacted granular bed and fill (Kn 1.00)"),
    }
}

impl Laying {
    /// The trench-condition factor K_n (ductile-iron guide's table; from memory).
    pub const fn kn(self) -> f64 {
        match self {
            Laying::Type1 => 0.20,
            Laying::Type2 => 0.40,
            Laying::Type3 => 0.60,
            Laying::Type4 => 0.85,
            Laying::Type5 => 1.00,
        }
    }
}

keyed_choice! {
    /// Whether the pipe is wrapped in polyethylene encasement.
    pub enum Encasement {
        None => ("none", "None"),
        Polyethylene => ("polyethylene", "Polyethylene (friction × 0.7, no adhesion)"),
    }
}

/// One soil class: unit weight, friction angle, cohesion and the pipe-wall ratios
/// of the two methods.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SoilClass {
    pub key: &'static str,
    pub label: &'static str,
    /// Unit weight, N/m³.
    pub gamma: f64,
    /// Friction angle, rad.
    pub phi: f64,
    /// Cohesion, Pa.
    pub cohesion: f64,
    /// Ductile iron: (f_φ, f_c).
    pub ductile_iron: (f64, f64),
    /// PVC: (f_φ, f_c).
    pub pvc: (f64, f64),
}

const PCF: f64 = 4.448_221_615_260_5 / (0.3048 * 0.3048 * 0.3048);
const PSF: f64 = 4.448_221_615_260_5 / (0.3048 * 0.3048);
const DEG: f64 = PI / 180.0;

/// Where the soil classes come from (shown on the page).
pub const SOIL_CLASS_SOURCE: &str = "DIPRA's soil table (γ, φ, c, ductile-iron ratios); PVC ratios this handbook's \
    own reduction (0.8 × fφ, ⅔ × fc), not the AWWA M23 table; confirm against the geotechnical report";

// The ductile-iron columns are DIPRA's table as recalled (from memory); the PVC
// columns are this handbook's reading (from memory of the PVC literature's lower
// wall friction), marked as such in the source above.
/// Every soil class, in selector order.
pub const SOIL_CLASSES: &[SoilClass] = &[
    SoilClass {
        key: "clay_fine",
        label: "Clay, under 25 % sand and gravel",
        gamma: 90.0 * PCF,
        phi: 0.0,
        cohesion: 500.0 * PSF,
        ductile_iron: (0.0, 0.5),
        pvc: (0.0, 0.33),
    },
    SoilClass {
        key: "clay_coarse",
        label: "Clay, 25 to 50 % sand and gravel",
        gamma: 90.0 * PCF,
        phi: 20.0 * DEG,
        cohesion: 200.0 * PSF,
        ductile_iron: (0.5, 0.4),
        pvc: (0.4, 0.27),
    },
    SoilClass {
        key: "silt_fine",
        label: "Silt, under 25 % sand and gravel",
        gamma: 90.0 * PCF,
        phi: 29.0 * DEG,
        cohesion: 0.0,
        ductile_iron: (0.5, 0.0),
        pvc: (0.4, 0.0),
    },
    SoilClass {
        key: "silt_coarse",
        label: "Silt, 25 to 50 % sand and gravel",
        gamma: 90.0 * PCF,
        phi: 29.0 * DEG,
        cohesion: 0.0,
        ductile_iron: (0.75, 0.0),
        pvc: (0.6, 0.0),
    },
    SoilClass {
        key: "cohesive_granular",
        label: "Cohesive granular soil",
        gamma: 90.0 * PCF,
        phi: 20.0 * DEG,
        cohesion: 300.0 * PSF,
        ductile_iron: (0.4, 0.4),
        pvc: (0.32, 0.27),
    },
    SoilClass {
        key: "silty_sand",
        label: "Silty sand or gravel",
        gamma: 100.0 * PCF,
        phi: 30.0 * DEG,
        cohesion: 0.0,
        ductile_iron: (0.75, 0.0),
        pvc: (0.6, 0.0),
    },
    SoilClass {
        key: "clean_sand",
        label: "Clean sand",
        gamma: 100.0 * PCF,
        phi: 36.0 * DEG,
        cohesion: 0.0,
        ductile_iron: (0.8, 0.0),
        pvc: (0.64, 0.0),
    },
];

/// The soil class with this key.
pub fn soil_class(key: &str) -> Option<&'static SoilClass> {
    SOIL_CLASSES.iter().find(|s| s.key == key)
}

/// The trench and soil around the pipe, SI.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Trench {
    /// Depth of cover to the top of the pipe, m.
    pub cover: f64,
    /// Unit weight of the soil, N/m³.
    pub gamma: f64,
    /// Friction angle, rad.
    pub phi: f64,
    /// Cohesion, Pa.
    pub cohesion: f64,
    /// Trench-condition factor K_n.
    pub kn: f64,
}

/// The pipe-soil interface of one method.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Wall {
    /// Ratio of the wall friction angle to the soil's, f_φ.
    pub f_phi: f64,
    /// Ratio of the wall adhesion to the soil's cohesion, f_c.
    pub f_c: f64,
    pub encased: bool,
}

/// A pipe: outside diameter (m) and its weights per metre (N/m).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PipeLoads {
    pub od: f64,
    pub pipe_weight: f64,
    pub water_weight: f64,
}

/// The terms of one pipe in one trench for one method, per metre of pipe (N/m).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct UnitResistance {
    /// Earth (prism) load W_e = γ·H·D.
    pub earth: f64,
    /// Normal load W = W_p + W_w + 2·W_e.
    pub normal: f64,
    /// Wall friction angle δ = f_φ·φ, rad.
    pub delta: f64,
    /// Friction part W·tan δ (before any encasement factor).
    pub friction: f64,
    /// Adhesion part A_p·f_c·c (zero in encasement).
    pub adhesion: f64,
    /// Unit friction F_f.
    pub f_f: f64,
    /// Rankine's passive coefficient K_p.
    pub kp: f64,
    /// Passive resistance R_s.
    pub r_s: f64,
    /// Weight holding the pipe down under uplift, W_p + W_w + W_e.
    pub uplift_weight: f64,
}

/// Rankine's passive earth-pressure coefficient tan²(45° + φ/2).
pub fn passive_coefficient(phi: f64) -> f64 {
    (PI / 4.0 + phi / 2.0).tan().powi(2)
}

/// The per-metre terms of a pipe in a trench (module doc).
pub fn unit_resistance(pipe: PipeLoads, trench: Trench, wall: Wall) -> UnitResistance {
    let d = pipe.od;
    let earth = trench.gamma * trench.cover * d;
    let normal = pipe.pipe_weight + pipe.water_weight + 2.0 * earth;
    let delta = wall.f_phi * trench.phi;
    let friction = normal * delta.tan();
    let (adhesion, f_f) = if wall.encased {
        (0.0, ENCASEMENT_FACTOR * friction)
    } else {
        let adhesion = PI * d * wall.f_c * trench.cohesion;
        (adhesion, adhesion + friction)
    };
    let kp = passive_coefficient(trench.phi);
    let depth_to_centre = trench.cover + d / 2.0;
    let r_s = trench.kn * d * (trench.gamma * depth_to_centre * kp + 2.0 * trench.cohesion * kp.sqrt());
    UnitResistance {
        earth,
        normal,
        delta,
        friction,
        adhesion,
        f_f,
        kp,
        r_s,
        uplift_weight: pipe.pipe_weight + pipe.water_weight + earth,
    }
}

/// Where a bend's thrust goes, which sets what holds it.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum BendHold {
    /// Horizontal, or vertical with the thrust down: friction and bearing.
    FrictionAndBearing,
    /// Vertical with the thrust up: weight only.
    Weight,
}

/// The resistance per metre that holds each leg of a bend: F_f + ½·R_s, or the
/// uplift weight.
pub fn bend_resistance(u: &UnitResistance, hold: BendHold) -> f64 {
    match hold {
        BendHold::FrictionAndBearing => u.f_f + 0.5 * u.r_s,
        BendHold::Weight => u.uplift_weight,
    }
}

/// Restrained length on each side of a bend of deflection `angle` (rad, up to 90°)
/// carrying S_f·P·A·tan(Δ/2) on `resistance` per metre; infinite when nothing
/// resists.
pub fn bend_length(sf: f64, p: f64, area: f64, angle: f64, resistance: f64) -> f64 {
    sf * p * area * (angle / 2.0).tan() / resistance
}

/// Restrained length behind a thrust carried by friction alone (dead end, closed
/// valve, reducer): S_f·T/F_f.
pub fn friction_length(sf: f64, thrust: f64, f_f: f64) -> f64 {
    sf * thrust / f_f
}

/// Restrained length of a tee's branch: (S_f·P·A_b − R_s,run·L_run)/F_f,branch,
/// never below zero.
pub fn tee_branch_length(sf: f64, branch_thrust: f64, run_r_s: f64, run_length: f64, branch_f_f: f64) -> f64 {
    ((sf * branch_thrust - run_r_s * run_length) / branch_f_f).max(0.0)
}

/// What sets a fitting's restrained length, per side: the resistance per metre
/// that holds it, the length, and for a tee the run that alone would hold it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FittingLength {
    /// F_f + ½R_s or the uplift weight (bend), F_f (dead end, reducer), the
    /// branch's F_f (tee), N/m.
    pub resistance: f64,
    /// Length on each side (a tee's branch), m; infinite when nothing resists.
    pub length: f64,
    /// A tee's run on each side that alone would carry the branch thrust, m.
    pub run_alone: Option<f64>,
}

/// The restrained length of a fitting (table of the module doc): `area` and
/// `area2` on the joint's basis, `main` the per-metre terms of the main pipe (a
/// tee's run), `branch` those of a tee's branch, `run_credit` a tee's restrained
/// run (credited on one side).
#[allow(clippy::too_many_arguments)]
pub fn fitting_length(
    kind: super::FittingKind,
    hold: BendHold,
    sf: f64,
    p: f64,
    (area, area2): (f64, f64),
    angle: f64,
    main: &UnitResistance,
    branch: Option<&UnitResistance>,
    run_credit: f64,
) -> FittingLength {
    use super::FittingKind;
    match kind {
        FittingKind::Bend => {
            let resistance = bend_resistance(main, hold);
            FittingLength {
                resistance,
                length: bend_length(sf, p, area, angle, resistance),
                run_alone: None,
            }
        }
        FittingKind::DeadEnd => FittingLength {
            resistance: main.f_f,
            length: friction_length(sf, p * area, main.f_f),
            run_alone: None,
        },
        FittingKind::Reducer => FittingLength {
            resistance: main.f_f,
            length: friction_length(sf, p * (area - area2), main.f_f),
            run_alone: None,
        },
        FittingKind::Tee => {
            let b = branch.unwrap_or(main);
            FittingLength {
                resistance: b.f_f,
                length: tee_branch_length(sf, p * area2, main.r_s, run_credit, b.f_f),
                run_alone: Some(sf * p * area2 / main.r_s),
            }
        }
    }
}

/// The longer restrained length of the two methods for a fitting in a soil class
/// with no typed overrides, no encasement and no run credit (the line schedule's
/// column), m; `None` when the soil gives no resistance.
#[allow(clippy::too_many_arguments)]
pub fn class_length(
    kind: super::FittingKind,
    hold: BendHold,
    sf: f64,
    p: f64,
    areas: (f64, f64),
    angle: f64,
    pipes: (PipeLoads, Option<PipeLoads>),
    trench: Trench,
    class: &SoilClass,
) -> Option<f64> {
    let longest = [class.ductile_iron, class.pvc]
        .into_iter()
        .map(|(f_phi, f_c)| {
            let wall = Wall {
                f_phi,
                f_c,
                encased: false,
            };
            let main = unit_resistance(pipes.0, trench, wall);
            let branch = pipes.1.map(|b| unit_resistance(b, trench, wall));
            fitting_length(kind, hold, sf, p, areas, angle, &main, branch.as_ref(), 0.0)
        })
        .map(|f| if f.resistance > 0.0 { f.length } else { f64::INFINITY })
        .fold(0.0, f64::max);
    longest.is_finite().then_some(longest)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn the_pvc_wall_ratios_are_the_stated_reduction_of_the_ductile_iron_ones() {
        // The page and its note promise 0.8 × fφ and ⅔ × fc (to the table's two
        // decimals), so that a PVC main is never given a shorter length than
        // ductile iron in the same soil: a row that breaks the promise fails here.
        for class in SOIL_CLASSES {
            let (di_phi, di_c) = class.ductile_iron;
            let (pvc_phi, pvc_c) = class.pvc;
            assert!(
                (pvc_phi - 0.8 * di_phi).abs() <= 0.005,
                "{}: fφ {pvc_phi} vs 0.8 × {di_phi}",
                class.key
            );
            assert!(
                (pvc_c - 2.0 / 3.0 * di_c).abs() <= 0.005,
                "{}: fc {pvc_c} vs ⅔ × {di_c}",
                class.key
            );
            assert!(pvc_phi <= di_phi && pvc_c <= di_c, "{}", class.key);
        }
    }

    #[test]
    fn option_keys_are_glossary_options() {
        for (term, keys) in [
            ("rl_method", Method::ALL.iter().map(|m| m.key()).collect::<Vec<_>>()),
            ("laying", Laying::ALL.iter().map(|m| m.key()).collect()),
            ("encasement", Encasement::ALL.iter().map(|m| m.key()).collect()),
        ] {
            let options = crate::glossary::term_of(term).map(|t| t.options).unwrap_or(&[]);
            for k in keys {
                assert!(options.contains(&k), "{k} is not an option of '{term}'");
            }
        }
        for s in SOIL_CLASSES {
            let options = crate::glossary::term_of("soil_class").map(|t| t.options).unwrap_or(&[]);
            assert!(options.contains(&s.key), "{} is not an option of 'soil_class'", s.key);
        }
    }

    #[test]
    fn rankine_coefficient_matches_its_sine_form() {
        // Derived from the definition: tan²(45° + φ/2) = (1 + sin φ)/(1 − sin φ).
        for deg in [0.0_f64, 20.0, 30.0, 36.0] {
            let phi = deg.to_radians();
            assert_relative_eq!(
                passive_coefficient(phi),
                (1.0 + phi.sin()) / (1.0 - phi.sin()),
                max_relative = 1e-12
            );
        }
    }

    #[test]
    fn encasement_drops_adhesion_and_scales_friction() {
        let pipe = PipeLoads {
            od: 0.3,
            pipe_weight: 500.0,
            water_weight: 600.0,
        };
        let trench = Trench {
            cover: 1.0,
            gamma: 18e3,
            phi: 0.5,
            cohesion: 10e3,
            kn: 0.6,
        };
        let bare = unit_resistance(
            pipe,
            trench,
            Wall {
                f_phi: 0.5,
                f_c: 0.5,
                encased: false,
            },
        );
        let wrapped = unit_resistance(
            pipe,
            trench,
            Wall {
                f_phi: 0.5,
                f_c: 0.5,
                encased: true,
            },
        );
        assert_relative_eq!(bare.f_f, bare.friction + PI * 0.3 * 0.5 * 10e3, max_relative = 1e-12);
        assert_relative_eq!(wrapped.f_f, 0.7 * bare.friction, max_relative = 1e-12);
        assert_relative_eq!(bare.r_s, wrapped.r_s, max_relative = 1e-12);
    }
}
