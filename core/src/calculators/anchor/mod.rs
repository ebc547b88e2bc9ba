//! Pipe anchor where plant pipe runs meet: the force and moment vectors the anchor
//! must hold, from up to four runs of above-ground piping.
//!
//! # Method
//! Axes of the anchor: x east, y north, z up, origin at the anchor point. Run i leaves
//! the anchor along û_i = (sin α·cos s, cos α·cos s, sin s), α its compass bearing
//! (clockwise from north) and s its slope above the horizontal, and ends, a length
//! L_i away, at what lies beyond it. The free body is the anchored assembly: the
//! fitting at the anchor, the runs and the fluid in them, cut at the far end of each
//! run. Its linear- and angular-momentum balances ([`crate::engine`], one port per
//! run at r_i = L_i·û_i, gravity −z) give the force R and moment M_R the anchor
//! exerts on it; the load on the anchor is F = −R, M = −M_R (moments about the
//! anchor point). Term by term (A the bore, ṁ = ρ|Q|, V = |Q|/A):
//!
//! - at the cut of every run: −(p·A + ṁV)·û (the pressure and momentum of the fitting
//!   at the anchor, whichever way the fluid flows);
//! - an **elbow** beyond, restrained in the direction of the leg beyond it (taken at
//!   90° to the run): its thrust along the run, +(p·A + ṁV)·û, comes back to the
//!   anchor through the run's wall;
//! - a **closed end** (cap or blind flange on the bore): +p·A·û on the cap;
//! - a **bellows or expansion joint without tie rods**: the pressure on its annulus
//!   −p·(A_eff − A)·û, so that the run delivers the unbalanced thrust −p·A_eff·û of
//!   the joint (EJMA Standards, pressure thrust p·A_eff with A_eff from the mean
//!   diameter of the convolutions), and its spring force F_s (the maker's stiffness ×
//!   the movement, typed) against the run's movement;
//! - a **sliding support** (guide) beyond which the pipe continues, restrained further
//!   on as an elbow would be: +(p·A + ṁV)·û, and friction μ·N along the run against the
//!   movement chosen, N the weight of one span of pipe and contents normal to the run
//!   (a support between equal spans);
//! - the **weight** of pipe and contents, W_i = (w_pipe + ρgA)·L_i, at the run's
//!   midpoint: a cantilever from the anchor, except a run ending at a sliding support,
//!   which is a propped cantilever: the support carries (3/8)·W⊥ (its reaction is a
//!   ledger term), the anchor W∥ + (5/8)·W⊥ and the fixed-end moment (L/8)·û×W.
//!
//! Every force along a run acts on a line through the anchor, so the moment comes from
//! the weights (and the support reactions): M = Σ c_i·L_i·û_i × W_i with c = 1/2 for a
//! cantilever and 1/8 for a propped one (beam formulas, e.g. Roark's *Formulas for
//! Stress and Strain*, cantilever and propped cantilever under uniform load).
//!
//! # Mass
//! Flows are signed, positive away from the anchor, and close: Σ Q_i = 0. Run 1's
//! flow is always the one found from the others (it has no field; the page reports
//! it); a closed end carries none (its flow field is hidden).
//!
//! # Checks
//! Shown in the checks table ([`Report::check`]): the force vector against the
//! closed-form sum of the per-run terms above written from the inputs (net along each
//! run: 0 for an elbow or a closed end, friction at a support, −(p·A_eff + ṁV)·û ∓ F_s
//! for a bellows, and each weight's share), not from the engine's ports; the moment
//! vector against the closed form Σ c_i·L_i·W_i·(−u_y, u_x, 0) (both compared whole,
//! |difference| against 0, so that a wrong sign in any component shows); the moment
//! against a second balance taken about the far end of run 1 and carried back to the
//! anchor (M_O = M_O′ + (O′ − O)×R); and run 1's flow against the typed ones.
//!
//! # Assumptions
//! A load estimate, not a stress analysis: steady, incompressible flow at one
//! pressure per run; no pressure loss along the runs; the runs' axes meet at the
//! anchor; an elbow's leg beyond is at 90° to the run and restrained in its own
//! direction; a continuous welded or flanged pipe carries its own pressure; friction
//! acts on the pipe's axis (its offset to the pipe's bottom is ignored); thermal
//! bending and the stiffness of the piping are left to a piping stress analysis.

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::pipe_sizes;
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};

pub mod diagram;
pub mod model;
pub mod report;

pub const KEY: &str = "pipe-anchor";
/// The page title.
pub const TITLE: &str = "Anchor loads where plant pipe runs meet";

/// The most runs that may meet at one anchor.
pub const MAX_RUNS: usize = 4;

/// The longest run accepted, m.
pub const MAX_RUN_LENGTH_M: f64 = 1000.0;

const RUN_COUNT_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "1",
        label: "1 (a run anchored at one end, no flow)",
    },
    ChoiceOption {
        key: "2",
        label: "2 (a straight run or a change of direction)",
    },
    ChoiceOption {
        key: "3",
        label: "3 (a tee)",
    },
    ChoiceOption {
        key: "4",
        label: "4 (a cross)",
    },
];

/// What lies at the far end of a run.
pub(crate) const END_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "elbow",
        label: "Elbow (leg beyond restrained)",
    },
    ChoiceOption {
        key: "bellows",
        label: "Untied bellows or expansion joint",
    },
    ChoiceOption {
        key: "closed",
        label: "Cap or blind flange",
    },
    ChoiceOption {
        key: "support",
        label: "Sliding support, pipe continues",
    },
];

const MOVES_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "away",
        label: "Away from the anchor (heating)",
    },
    ChoiceOption {
        key: "toward",
        label: "Toward the anchor (cooling)",
    },
];

/// Run i is shown when the run count is at least i.
const COUNT_AT_LEAST: [&[&str]; MAX_RUNS] = [&["1", "2", "3", "4"], &["2", "3", "4"], &["3", "4"], &["4"]];

const BELLOWS: &[&str] = &["bellows"];
const FLOWING_ENDS: &[&str] = &["elbow", "bellows", "support"];
const CUSTOM_SIZE: &[&str] = &[pipe_sizes::CUSTOM];
const MOVING_ENDS: &[&str] = &["bellows", "support"];
const SUPPORT: &[&str] = &["support"];

/// Field and output keys of one run, with its labels and demo values.
#[derive(Debug)]
pub struct RunKeys {
    pub(crate) visible: &'static [&'static str],
    pub(crate) azimuth: &'static str,
    pub(crate) slope: &'static str,
    pub(crate) size: &'static str,
    pub(crate) d: &'static str,
    pub(crate) od: &'static str,
    pub(crate) p: &'static str,
    pub(crate) q: &'static str,
    pub(crate) length: &'static str,
    pub(crate) end: &'static str,
    pub(crate) a_eff: &'static str,
    pub(crate) f_spring: &'static str,
    pub(crate) moves: &'static str,
    pub(crate) mu: &'static str,
    pub(crate) w_pipe: &'static str,
    pub(crate) q_out: &'static str,
    pub(crate) labels: RunLabels,
    pub(crate) demo: RunDemo,
}

#[derive(Debug)]
pub struct RunLabels {
    pub(crate) azimuth: &'static str,
    pub(crate) slope: &'static str,
    pub(crate) size: &'static str,
    pub(crate) d: &'static str,
    pub(crate) od: &'static str,
    pub(crate) p: &'static str,
    pub(crate) q: &'static str,
    pub(crate) length: &'static str,
    pub(crate) end: &'static str,
    pub(crate) a_eff: &'static str,
    pub(crate) f_spring: &'static str,
    pub(crate) moves: &'static str,
    pub(crate) mu: &'static str,
    pub(crate) w_pipe: &'static str,
    pub(crate) q_out: &'static str,
}

/// Demo values of one run (the invented scenario, never a reference).
#[derive(Debug)]
pub struct RunDemo {
    azimuth: &'static str,
    size: &'static str,
    q: &'static str,
    length: &'static str,
    end: &'static str,
    a_eff: &'static str,
    f_spring: &'static str,
    mu: &'static str,
}

macro_rules! run_keys {
    ($n:literal, $demo:expr) => {
        RunKeys {
            visible: COUNT_AT_LEAST[$n - 1],
            azimuth: concat!("r", $n, "_azimuth"),
            slope: concat!("r", $n, "_slope"),
            size: concat!("r", $n, "_size"),
            d: concat!("r", $n, "_d"),
            od: concat!("r", $n, "_od"),
            p: concat!("r", $n, "_p"),
            q: concat!("r", $n, "_q"),
            length: concat!("r", $n, "_length"),
            end: concat!("r", $n, "_end"),
            a_eff: concat!("r", $n, "_a_eff"),
            f_spring: concat!("r", $n, "_f_spring"),
            moves: concat!("r", $n, "_moves"),
            mu: concat!("r", $n, "_friction"),
            w_pipe: concat!("r", $n, "_w_pipe"),
            q_out: concat!("q_r", $n),
            labels: RunLabels {
                azimuth: concat!("Run ", $n, " bearing"),
                slope: concat!("Run ", $n, " slope"),
                size: concat!("Run ", $n, " pipe size"),
                d: concat!("Run ", $n, " inside diameter"),
                od: concat!("Run ", $n, " outside diameter"),
                p: concat!("Run ", $n, " gauge pressure"),
                q: concat!("Run ", $n, " flow (+ away from the anchor)"),
                length: concat!("Run ", $n, " length"),
                end: concat!("Run ", $n, " far end"),
                a_eff: concat!("Run ", $n, " bellows effective area"),
                f_spring: concat!("Run ", $n, " bellows spring force"),
                moves: concat!("Run ", $n, " far end moves"),
                mu: concat!("Run ", $n, " support friction coefficient"),
                w_pipe: concat!("Run ", $n, " weight of the empty pipe"),
                q_out: concat!("Flow in run ", $n, " (found from the others)"),
            },
            demo: $demo,
        }
    };
}

pub const RUNS: [RunKeys; MAX_RUNS] = [
    run_keys!(
        1,
        RunDemo {
            azimuth: "90 deg",
            size: "sch40_8",
            q: "",
            length: "12 m",
            end: "bellows",
            a_eff: "450 cm2",
            f_spring: "4 kN",
            mu: "0.3",
        }
    ),
    run_keys!(
        2,
        RunDemo {
            azimuth: "0 deg",
            size: "sch40_8",
            q: "-150 m3/h",
            length: "8 m",
            end: "elbow",
            a_eff: "450 cm2",
            f_spring: "",
            mu: "0.3",
        }
    ),
    run_keys!(
        3,
        RunDemo {
            azimuth: "270 deg",
            size: "sch40_6",
            q: "40 m3/h",
            length: "6 m",
            end: "support",
            a_eff: "260 cm2",
            f_spring: "",
            mu: "0.3",
        }
    ),
    run_keys!(
        4,
        RunDemo {
            azimuth: "180 deg",
            size: "sch40_4",
            q: "0",
            length: "3 m",
            end: "closed",
            a_eff: "120 cm2",
            f_spring: "",
            mu: "0.3",
        }
    ),
];

const AZIMUTH_HELP: &str = "Compass bearing of the run leaving the anchor, clockwise from north: 0° north, 90° east, \
    180° south, 270° west (−360° to 360°).";
const SLOPE_HELP: &str = "Angle of the run above the horizontal going away from the anchor: 90° straight up, −90° \
    straight down. Empty means level.";
const SIZE_HELP: &str = "A preset gives both diameters and the wall (for the pipe's weight); choose typed diameters \
    for another pipe.";
const P_RUN_HELP: &str = "Empty: the pressure above. Give it where a run's pressure differs (across a valve or a \
    pump).";
const Q_HELP: &str = "Volume flow, positive when it flows away from the anchor, negative when toward it; empty \
    means none. Run 1 takes what the others leave, so that the flows balance.";
const LENGTH_HELP: &str = "From the anchor point to the elbow, bellows, closed end or support at the run's far end.";
const END_HELP: &str = "An elbow or a continuous pipe through a sliding support carries the run's pressure in its \
    wall; a bellows without tie rods passes its full pressure thrust p·A_eff to the anchor; a cap pushes with p·A.";
const A_EFF_HELP: &str = "The maker's effective area of the joint, from the mean diameter of its convolutions; \
    larger than the bore.";
const F_SPRING_HELP: &str = "The joint's axial stiffness times the movement it takes, from the maker's data; empty \
    means no spring force.";
const MOVES_HELP: &str = "Friction at a support and a bellows' spring both act against the run's movement; the load \
    reverses with it, so check both ways.";
const MU_HELP: &str = "Steel sliding on steel about 0.3; PTFE pads about 0.1 (ask the support's maker).";
const W_PIPE_HELP: &str = "The whole run's empty pipe, insulation and lining. Empty: from the preset's wall (steel, \
    ductile iron or PVC by the preset's family; steel for typed diameters).";
const P_HELP: &str = "The design pressure of the runs: the highest they will see, test pressure included.";

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        choice(
            "runs",
            "Pipe runs meeting at the anchor",
            RUN_COUNT_OPTIONS,
            "2",
            "Up to four runs, each with its own direction, size, flow and far end.",
        ),
        quantity(
            "p",
            "Gauge pressure in the runs",
            Q::Pressure,
            "kPa",
            "psi",
            "10 bar",
            Limits::closed(0.0, MAX_PRESSURE_PA),
            P_HELP,
        ),
    ];
    fields.extend(common::fluid_fields("25 degC"));
    for run in &RUNS {
        let mut own = run_fields(run);
        if std::ptr::eq(run, &RUNS[0]) {
            // Run 1's flow is what the others leave (Σ Q = 0): it has no field.
            own.retain(|f| f.key != run.q);
        }
        fields.extend(own);
    }
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "Force and moment on an above-ground anchor from up to four pipe runs: pressure and flow, \
            expansion joints, closed ends, guide friction and weight.",
        fields,
        outputs: outputs(),
        cautions: vec![
            "A load estimate at one anchor, not a piping stress analysis: size plant pipe anchors by an \
                analysis to ASME B31.1 or B31.3, checked by a licensed engineer.",
            "Untied bellows pass their full pressure thrust; friction and springs reverse as the line heats or \
                cools: size for both, and for the test pressure.",
        ],
    }
}

fn run_fields(run: &'static RunKeys) -> Vec<FieldSpec> {
    let shown = Some(("runs", run.visible));
    let when_end = |ends: &'static [&'static str]| Some((run.end, ends));
    let l = &run.labels;
    vec![
        FieldSpec {
            visible_when: shown,
            ..quantity(
                run.azimuth,
                l.azimuth,
                Q::Angle,
                "deg",
                "deg",
                run.demo.azimuth,
                Limits::closed(-2.0 * PI, 2.0 * PI),
                AZIMUTH_HELP,
            )
        },
        FieldSpec {
            visible_when: shown,
            optional: true,
            ..quantity(
                run.slope,
                l.slope,
                Q::Angle,
                "deg",
                "deg",
                "",
                Limits::closed(-PI / 2.0, PI / 2.0),
                SLOPE_HELP,
            )
        },
        FieldSpec {
            visible_when: shown,
            ..choice(run.size, l.size, pipe_sizes::SIZE_OPTIONS, run.demo.size, SIZE_HELP)
        },
        FieldSpec {
            visible_when: Some((run.size, CUSTOM_SIZE)),
            ..quantity(
                run.d,
                l.d,
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Bore of the run's pipe.",
            )
        },
        FieldSpec {
            visible_when: Some((run.size, CUSTOM_SIZE)),
            ..quantity(
                run.od,
                l.od,
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(MIN_SIZE_M, MAX_SIZE_M),
                "Outside diameter of the run's pipe (sets its weight with the bore).",
            )
        },
        FieldSpec {
            visible_when: shown,
            optional: true,
            ..quantity(
                run.p,
                l.p,
                Q::Pressure,
                "kPa",
                "psi",
                "",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                P_RUN_HELP,
            )
        },
        FieldSpec {
            visible_when: when_end(FLOWING_ENDS),
            optional: true,
            ..quantity(
                run.q,
                l.q,
                Q::VolumeFlow,
                "m3/h",
                "gpm",
                run.demo.q,
                Limits::closed(-100.0, 100.0),
                Q_HELP,
            )
        },
        FieldSpec {
            visible_when: shown,
            ..quantity(
                run.length,
                l.length,
                Q::Length,
                "m",
                "ft",
                run.demo.length,
                Limits::closed(0.01, MAX_RUN_LENGTH_M),
                LENGTH_HELP,
            )
        },
        FieldSpec {
            visible_when: shown,
            ..choice(run.end, l.end, END_OPTIONS, run.demo.end, END_HELP)
        },
        FieldSpec {
            visible_when: when_end(BELLOWS),
            ..quantity(
                run.a_eff,
                l.a_eff,
                Q::Area,
                "cm2",
                "in2",
                run.demo.a_eff,
                Limits::closed(1e-6, 100.0),
                A_EFF_HELP,
            )
        },
        FieldSpec {
            visible_when: when_end(BELLOWS),
            optional: true,
            ..quantity(
                run.f_spring,
                l.f_spring,
                Q::Force,
                "kN",
                "lbf",
                run.demo.f_spring,
                Limits::closed(0.0, 1e8),
                F_SPRING_HELP,
            )
        },
        FieldSpec {
            visible_when: when_end(MOVING_ENDS),
            ..choice(run.moves, l.moves, MOVES_OPTIONS, "away", MOVES_HELP)
        },
        FieldSpec {
            visible_when: when_end(SUPPORT),
            ..quantity(
                run.mu,
                l.mu,
                Q::Ratio,
                "-",
                "-",
                run.demo.mu,
                Limits::closed(0.0, 1.0),
                MU_HELP,
            )
        },
        FieldSpec {
            visible_when: shown,
            optional: true,
            ..quantity(
                run.w_pipe,
                l.w_pipe,
                Q::Force,
                "kN",
                "lbf",
                "",
                Limits::closed(0.0, 1e8),
                W_PIPE_HELP,
            )
        },
    ]
}

fn outputs() -> Vec<OutputSpec> {
    let mut outputs = vec![
        OutputSpec::headline("force", "Force on the anchor (resultant)", Q::Force),
        OutputSpec::headline("moment", "Moment on the anchor (resultant)", Q::Torque),
        OutputSpec::listed("force_x", "Force east (x)", Q::Force),
        OutputSpec::listed("force_y", "Force north (y)", Q::Force),
        OutputSpec::listed("force_z", "Force up (z)", Q::Force),
        OutputSpec::listed("force_horizontal", "Horizontal force", Q::Force),
        OutputSpec::listed("moment_x", "Moment about the east axis (x)", Q::Torque),
        OutputSpec::listed("moment_y", "Moment about the north axis (y)", Q::Torque),
        OutputSpec::listed(
            "moment_z",
            "Moment about the vertical axis (z, torsion of a riser)",
            Q::Torque,
        ),
        OutputSpec::listed("weight", "Weight of pipe and contents on the anchor", Q::Force),
    ];
    outputs.push(OutputSpec::listed(RUNS[0].q_out, RUNS[0].labels.q_out, Q::VolumeFlow));
    outputs
}

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, model::read, model::solve, report::write)
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    /// Two opposite runs of one size, both ending at elbows restrained beyond: the
    /// pressure stays in the pipe walls and the anchor takes only the weights.
    #[test]
    fn a_straight_run_between_elbows_puts_no_pressure_load_on_the_anchor() {
        let s = solved(&[
            ("runs", "2"),
            ("p", "20 bar"),
            ("fluid", "water"),
            ("t", "20 degC"),
            ("r1_azimuth", "90 deg"),
            ("r1_size", "sch40_8"),
            ("r1_length", "6 m"),
            ("r1_end", "elbow"),
            ("r2_azimuth", "270 deg"),
            ("r2_size", "sch40_8"),
            ("r2_q", "-200 m3/h"),
            ("r2_length", "6 m"),
            ("r2_end", "elbow"),
        ]);
        assert!(s.output("force_horizontal").unwrap().si.abs() < 1e-6);
        // Equal runs either side: their weights' moments cancel.
        assert!(s.output("moment").unwrap().si.abs() < 1e-6);
        assert_relative_eq!(
            s.output("force_z").unwrap().si,
            -s.output("weight").unwrap().si,
            max_relative = 1e-12
        );
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    /// A riser: run 1 straight up to an untied bellows; the unbalanced thrust
    /// p·A_eff pushes the anchor down, with the weight.
    #[test]
    fn a_vertical_bellows_pushes_the_anchor_down_with_p_times_a_eff() {
        let s = solved(&[
            ("runs", "2"),
            ("p", "10 bar"),
            ("fluid", "water"),
            ("t", "20 degC"),
            ("r1_azimuth", "0 deg"),
            ("r1_slope", "90 deg"),
            ("r1_size", "sch40_6"),
            ("r1_length", "4 m"),
            ("r1_end", "bellows"),
            ("r1_a_eff", "300 cm2"),
            ("r1_f_spring", ""),
            ("r1_moves", "away"),
            ("r1_w_pipe", "0 N"),
            ("r2_azimuth", "0 deg"),
            ("r2_size", "sch40_6"),
            ("r2_length", "1 m"),
            ("r2_end", "closed"),
            ("r2_w_pipe", "0 N"),
        ]);
        let weight = s.output("weight").unwrap().si;
        assert_relative_eq!(
            s.output("force_z").unwrap().si,
            -1e6 * 0.03 - weight,
            max_relative = 1e-9
        );
        // The riser's weight acts on its axis: no moment from it.
        assert!(s.output("moment_y").unwrap().si.abs() < 1e-6 * weight);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    /// Friction and the spring reverse with the movement.
    #[test]
    fn friction_and_spring_reverse_with_the_movement() {
        let case = |moves: &'static str| {
            let pairs = [
                ("runs", "2"),
                ("p", "0 bar"),
                ("fluid", "water"),
                ("t", "20 degC"),
                ("r1_azimuth", "90 deg"),
                ("r1_size", "sch40_8"),
                ("r1_length", "6 m"),
                ("r1_end", "bellows"),
                ("r1_a_eff", "400 cm2"),
                ("r1_f_spring", "5 kN"),
                ("r1_moves", moves),
                ("r2_azimuth", "270 deg"),
                ("r2_size", "sch40_8"),
                ("r2_length", "6 m"),
                ("r2_end", "support"),
                ("r2_friction", "0.3"),
                ("r2_moves", moves),
                ("r2_q", "0"),
            ];
            solved(&pairs).output("force_x").unwrap().si
        };
        let (heating, cooling) = (case("away"), case("toward"));
        assert_relative_eq!(heating, -cooling, max_relative = 1e-12);
        // Heating: the bellows (east) pushes the anchor west, the support's friction
        // (west) pushes it east; 5 kN against 0.3 × one span of pipe and water.
        assert!(heating.abs() > 0.0);
    }

    #[test]
    fn a_closed_run_1_with_unbalanced_flows_is_refused_on_its_end() {
        let (field, message) = first_error(&[
            ("runs", "2"),
            ("r1_end", "closed"),
            ("r2_q", "50 m3/h"),
            ("r2_end", "elbow"),
        ]);
        assert_eq!(field, "r1_end");
        assert!(message.contains("add up to zero"), "{message}");
    }

    #[test]
    fn a_custom_size_needs_both_diameters() {
        assert_eq!(error_field(&[("r2_size", "custom"), ("r2_d", "200 mm")]), "r2_od");
    }

    #[test]
    fn every_key_is_a_glossary_term() {
        crate::calculators::testing::assert_glossary_keys(super::KEY);
    }
}
