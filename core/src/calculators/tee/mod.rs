//! Tee, wye, splitter or manifold: the thrust of a junction of one common pipe and
//! up to six branches at any angles, dividing or combining flow.
//!
//! # Method
//! A control volume is drawn around the fluid in the junction, cut at the face of
//! the common pipe (0) and of each branch (i). In the dividing case fluid enters
//! through the common pipe and leaves through the branches; in the combining case
//! the reverse. Each branch has a direction û_i (the direction its fluid moves, at
//! an angle in the plan from the common pipe's flow direction and, optionally, an
//! elevation angle out of the plan), a diameter, a share of the common flow and a
//! loss coefficient.
//!
//! - **Mass** ([`crate::engine`]): Q_i = s_i·Q₀ for the branches whose share s_i is
//!   given; one share may be left empty and that branch's flow is solved from
//!   Σ Q_out = Σ Q_in. When every share is given (they must add up to 100 % within
//!   1e-6), the branch with the largest share takes Q₀ less the others, so that mass
//!   closes exactly.
//! - **Energy**, along each stream between the common pipe and branch i:
//!   p₀/ρ + α₀V₀²/2 = p_i/ρ + α_iV_i²/2 + g·z_i + K_i·V_ref²/2 (dividing; combining
//!   runs from the branch to the common pipe; z_i the rise of the branch's face above
//!   the common pipe's), with V_ref the common pipe's velocity (as most
//!   junction-loss tables give it, e.g. Idelchik, *Handbook of Hydraulic
//!   Resistance*, or Miller, *Internal Flow Systems*) or the branch's own. The
//!   pressure is known in the common pipe (`p_known=common`, the default) and each
//!   branch pressure is solved, or at one branch (`p_known=b1`…`b6`, `p_branch`):
//!   that branch's stream is balanced first for the common pipe's pressure, then the
//!   others from it. K may be
//!   negative (published tee data has it where a stream is drawn along by another:
//!   Crane TP-410, 2009, Example 7-36, K = −0.040 for a converging branch), down to
//!   [`MIN_LOSS_COEFFICIENT`] on the common velocity, as long as the junction as a whole
//!   dissipates energy: Σ ρQ_i·K_i·V_ref,i²/2 ≥ 0.
//! - **Momentum**: R = Σ p_i·A_i·n_i + Σ_out ṁβV − Σ_in ṁβV − W − W_f, thrust T = −R.
//!
//! # Velocity profile, weights, gravity
//! Each port has its own momentum-flux factor β and kinetic-energy factor α: the
//! common pipe (`profile_common`) and each branch (`b1_profile` … `b6_profile`), from
//! [`common::profile_from`]: uniform (1, the default and what links without the key
//! mean), fully developed laminar (4/3 and 2), a turbulent power law
//! ([`crate::velocity_profile::power_law`]), typed, or carried from the
//! velocity-profile page. β multiplies the port's ṁV in the momentum balance, α its
//! V²/2 in the energy line; the ledger names each port's β where it is not 1 and the
//! basis table where a non-uniform one came from. The junction is drawn in plan with
//! gravity down out of it (−z), so the weights of the fluid inside (W) and of the
//! fitting and the pipe it carries (W_f, optional) enter only the thrust's z
//! component; with `weights=neglected` they are left out (to reproduce a case that
//! neglects them) and z loses exactly W + W_f, while gravity still sets the
//! elevation term of a branch that leaves the plan. Gravity is standard unless
//! `g_local` is typed. A one-branch junction rising at 30° reproduces the reducing
//! elbow of Çengel & Cimbala (β = 1.03, discharging to atmosphere, weights
//! neglected): the vertical force ṁβV₂·sin 30° = 144.2 N, as the book gives.
//!
//! With no flow every face has the same pressure and the thrust reduces to
//! T = p·|Σ A_i·(−n_i)|, for a tee T = p·A_branch along the branch axis, away from
//! the branch (on the wall opposite its opening), the tee
//! formula of the thrust-restraint guides (DIPRA, *Thrust Restraint Design for
//! Ductile Iron Pipe*; AWWA Manual M41); it is reported beside the full result.
//!
//! # Checks
//! Shown in the checks table ([`Report::check`]): the engine's branch flows against
//! the common flow as given, and each thrust component against the impulse-function
//! sum −Σ[(p_i + β_iρV_i²)A_i + p_i(A_OD,i − A_i)]·n_i + W + W_f with the branch
//! pressures written out from the energy line per branch (with each α), not taken from
//! the engine; with a branch's pressure known, the common pipe's pressure against the
//! energy line from that branch. A thrust
//! component within 1e-12 of the terms it is summed from (cos 90° = 6e-17 of a
//! square branch's pressure force) is rounding residue and shown as 0.
//!
//! On the outside-diameter basis (`joint` = push-on, mechanical or restrained: joints
//! that seal on the spigot's outside) each face's pressure also acts on the wall
//! annulus out to the outside diameter, −p·(A_OD − A)·n, added to the engine as a
//! named force per face. Flanged, welded and fused joints seal on the bore. The
//! joint is required (the bore is low for push-on joints, so it is never a silent
//! default); the joint options are the restraint model's [`crate::restraint::Joint`].
//!
//! # Layout
//! [`read`] turns the validated values into typed [`Inputs`] once (and refuses
//! shares and loss coefficients that cannot hold); [`model::solve`] is the physics,
//! a pure function of them; `report` writes outputs, checks, warnings, tables and
//! the carry-over from the solved [`model::Solved`], and `diagram` draws it.
//!
//! # Assumptions
//! Incompressible, steady flow; uniform pressure over each face (the velocity may
//! vary over it: β and α); momentum on the bores; drawn in plan with gravity out of
//! the plan (−z); the fluid inside is a stub of each pipe one common-pipe diameter
//! long.

use std::f64::consts::PI;

use uom::si::f64::{Acceleration, Force, Length, MassRate, Ratio, Velocity, VolumeRate};

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, FromSi, Limits, OutputSpec, Report, Values};
use crate::engine::FlowSpec;
use crate::error::{FieldError, FieldErrors};
use crate::restraint;
use crate::units::{self, QuantityKind as Q};
use crate::vector::Vec3;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M};

mod diagram;
pub mod model;
mod report;

use model::{Branch, CommonFlow, Inputs, Junction, KnownAt, LossReference};

/// The ports whose pressure may be the known one: the common pipe or one branch.
const P_KNOWN_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "common",
        label: "In the common pipe",
    },
    ChoiceOption {
        key: "b1",
        label: "At branch 1",
    },
    ChoiceOption {
        key: "b2",
        label: "At branch 2",
    },
    ChoiceOption {
        key: "b3",
        label: "At branch 3",
    },
    ChoiceOption {
        key: "b4",
        label: "At branch 4",
    },
    ChoiceOption {
        key: "b5",
        label: "At branch 5",
    },
    ChoiceOption {
        key: "b6",
        label: "At branch 6",
    },
];

pub const KEY: &str = "tee";
/// The page title.
pub const TITLE: &str = "Thrust at a tee, wye or manifold";

/// The most branches a junction may have.
pub const MAX_BRANCHES: usize = 6;

/// The lowest loss coefficient accepted, on the common pipe's velocity. Published
/// junction data has negative K where one stream is drawn along by another: the
/// Crane method for a converging tee's branch (Crane, *Flow of Fluids Through Valves,
/// Fittings, and Pipe*, TP-410, 2009 edition, as coded in `fluids==1.3.1`,
/// `fluids.fittings.K_branch_converging_Crane(0.3, 0.1, 1.0, 0.0, 90)`) gives −1.0 as
/// the branch flow vanishes, its lowest value; Crane's Example 7-36 gives −0.040.
pub const MIN_LOSS_COEFFICIENT: f64 = -1.0;
/// The highest loss coefficient accepted: far above any tee or wye in the tables.
pub const MAX_LOSS_COEFFICIENT: f64 = 50.0;
/// The smallest bore accepted for the common pipe and the branches.
const MIN_BORE_M: f64 = 1e-3;

pub(crate) const JUNCTION_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "dividing",
        label: "Dividing: the common pipe feeds the branches",
    },
    ChoiceOption {
        key: "combining",
        label: "Combining: the branches feed the common pipe",
    },
];

const COUNT_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption { key: "1", label: "1" },
    ChoiceOption {
        key: "2",
        label: "2 (a tee or wye)",
    },
    ChoiceOption { key: "3", label: "3" },
    ChoiceOption { key: "4", label: "4" },
    ChoiceOption { key: "5", label: "5" },
    ChoiceOption { key: "6", label: "6" },
];

const K_REF_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "common",
        label: "Velocity in the common pipe",
    },
    ChoiceOption {
        key: "branch",
        label: "Velocity in each branch",
    },
];

/// Branch i is shown when the branch count is at least i.
const N_AT_LEAST: [&[&str]; MAX_BRANCHES] = [
    &["1", "2", "3", "4", "5", "6"],
    &["2", "3", "4", "5", "6"],
    &["3", "4", "5", "6"],
    &["4", "5", "6"],
    &["5", "6"],
    &["6"],
];

/// Field and output keys of one branch.
pub(crate) struct BranchKeys {
    pub(crate) visible: &'static [&'static str],
    pub(crate) d: &'static str,
    pub(crate) d_label: &'static str,
    pub(crate) d_demo: &'static str,
    pub(crate) angle: &'static str,
    pub(crate) angle_label: &'static str,
    pub(crate) angle_demo: &'static str,
    pub(crate) elev: &'static str,
    pub(crate) elev_label: &'static str,
    pub(crate) od: &'static str,
    pub(crate) od_label: &'static str,
    pub(crate) od_demo: &'static str,
    pub(crate) share: &'static str,
    pub(crate) share_label: &'static str,
    pub(crate) share_demo: &'static str,
    pub(crate) k: &'static str,
    pub(crate) k_label: &'static str,
    pub(crate) k_demo: &'static str,
    pub(crate) p_out: &'static str,
    pub(crate) p_label: &'static str,
    pub(crate) q_out: &'static str,
    pub(crate) q_label: &'static str,
    pub(crate) v_out: &'static str,
    pub(crate) v_label: &'static str,
}

pub(crate) const BRANCHES: [BranchKeys; MAX_BRANCHES] = [
    BranchKeys {
        visible: N_AT_LEAST[0],
        d: "b1_d",
        d_label: "Branch 1 inside diameter",
        d_demo: "310 mm",
        angle: "b1_angle",
        angle_label: "Branch 1 direction",
        angle_demo: "0 deg",
        elev: "b1_elev",
        elev_label: "Branch 1 elevation angle",
        od: "b1_od",
        od_label: "Branch 1 outside diameter",
        od_demo: "326 mm",
        share: "b1_share",
        share_label: "Branch 1 flow share",
        share_demo: "70 %",
        k: "b1_k",
        k_label: "Branch 1 loss coefficient K",
        k_demo: "0.3",
        p_out: "p_b1",
        p_label: "Gauge pressure in branch 1",
        q_out: "q_b1",
        q_label: "Flow in branch 1",
        v_out: "v_b1",
        v_label: "Mean velocity in branch 1",
    },
    BranchKeys {
        visible: N_AT_LEAST[1],
        d: "b2_d",
        d_label: "Branch 2 inside diameter",
        d_demo: "154 mm",
        angle: "b2_angle",
        angle_label: "Branch 2 direction",
        angle_demo: "90 deg",
        elev: "b2_elev",
        elev_label: "Branch 2 elevation angle",
        od: "b2_od",
        od_label: "Branch 2 outside diameter",
        od_demo: "170 mm",
        share: "b2_share",
        share_label: "Branch 2 flow share",
        share_demo: "",
        k: "b2_k",
        k_label: "Branch 2 loss coefficient K",
        k_demo: "1.0",
        p_out: "p_b2",
        p_label: "Gauge pressure in branch 2",
        q_out: "q_b2",
        q_label: "Flow in branch 2",
        v_out: "v_b2",
        v_label: "Mean velocity in branch 2",
    },
    BranchKeys {
        visible: N_AT_LEAST[2],
        d: "b3_d",
        d_label: "Branch 3 inside diameter",
        d_demo: "100 mm",
        angle: "b3_angle",
        angle_label: "Branch 3 direction",
        angle_demo: "-90 deg",
        elev: "b3_elev",
        elev_label: "Branch 3 elevation angle",
        od: "b3_od",
        od_label: "Branch 3 outside diameter",
        od_demo: "118 mm",
        share: "b3_share",
        share_label: "Branch 3 flow share",
        share_demo: "5 %",
        k: "b3_k",
        k_label: "Branch 3 loss coefficient K",
        k_demo: "1.0",
        p_out: "p_b3",
        p_label: "Gauge pressure in branch 3",
        q_out: "q_b3",
        q_label: "Flow in branch 3",
        v_out: "v_b3",
        v_label: "Mean velocity in branch 3",
    },
    BranchKeys {
        visible: N_AT_LEAST[3],
        d: "b4_d",
        d_label: "Branch 4 inside diameter",
        d_demo: "100 mm",
        angle: "b4_angle",
        angle_label: "Branch 4 direction",
        angle_demo: "45 deg",
        elev: "b4_elev",
        elev_label: "Branch 4 elevation angle",
        od: "b4_od",
        od_label: "Branch 4 outside diameter",
        od_demo: "118 mm",
        share: "b4_share",
        share_label: "Branch 4 flow share",
        share_demo: "5 %",
        k: "b4_k",
        k_label: "Branch 4 loss coefficient K",
        k_demo: "1.0",
        p_out: "p_b4",
        p_label: "Gauge pressure in branch 4",
        q_out: "q_b4",
        q_label: "Flow in branch 4",
        v_out: "v_b4",
        v_label: "Mean velocity in branch 4",
    },
    BranchKeys {
        visible: N_AT_LEAST[4],
        d: "b5_d",
        d_label: "Branch 5 inside diameter",
        d_demo: "100 mm",
        angle: "b5_angle",
        angle_label: "Branch 5 direction",
        angle_demo: "-45 deg",
        elev: "b5_elev",
        elev_label: "Branch 5 elevation angle",
        od: "b5_od",
        od_label: "Branch 5 outside diameter",
        od_demo: "118 mm",
        share: "b5_share",
        share_label: "Branch 5 flow share",
        share_demo: "5 %",
        k: "b5_k",
        k_label: "Branch 5 loss coefficient K",
        k_demo: "1.0",
        p_out: "p_b5",
        p_label: "Gauge pressure in branch 5",
        q_out: "q_b5",
        q_label: "Flow in branch 5",
        v_out: "v_b5",
        v_label: "Mean velocity in branch 5",
    },
    BranchKeys {
        visible: N_AT_LEAST[5],
        d: "b6_d",
        d_label: "Branch 6 inside diameter",
        d_demo: "100 mm",
        angle: "b6_angle",
        angle_label: "Branch 6 direction",
        angle_demo: "135 deg",
        elev: "b6_elev",
        elev_label: "Branch 6 elevation angle",
        od: "b6_od",
        od_label: "Branch 6 outside diameter",
        od_demo: "118 mm",
        share: "b6_share",
        share_label: "Branch 6 flow share",
        share_demo: "5 %",
        k: "b6_k",
        k_label: "Branch 6 loss coefficient K",
        k_demo: "1.0",
        p_out: "p_b6",
        p_label: "Gauge pressure in branch 6",
        q_out: "q_b6",
        q_label: "Flow in branch 6",
        v_out: "v_b6",
        v_label: "Mean velocity in branch 6",
    },
];

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        choice(
            "junction",
            "Flow",
            JUNCTION_OPTIONS,
            "dividing",
            "Dividing: a tee or manifold taking flow off a main. Combining: branches joining into one pipe.",
        ),
        quantity(
            "d",
            "Common pipe inside diameter",
            Q::Length,
            "mm",
            "in",
            "310 mm",
            Limits::closed(MIN_BORE_M, MAX_SIZE_M),
            "Bore of the pipe that carries the whole flow (the inlet when dividing, the outlet when \
                    combining).",
        ),
        FieldSpec {
            optional: true,
            ..choice(
                common::P_KNOWN,
                "Pressure known at",
                P_KNOWN_OPTIONS,
                "common",
                "The port whose gauge pressure you know; the others follow from the energy balance of each \
                    stream with its loss.",
            )
        },
        FieldSpec {
            visible_when: Some((common::P_KNOWN, &["common"])),
            ..quantity(
                "p",
                "Gauge pressure in the common pipe",
                Q::Pressure,
                "bar",
                "psi",
                "10 bar",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "The design pressure at the common pipe's face: the highest the line will see, test and surge \
                    included. Gauge, so not below 0.",
            )
        },
        FieldSpec {
            visible_when: Some((common::P_KNOWN, &["b1", "b2", "b3", "b4", "b5", "b6"])),
            ..quantity(
                "p_branch",
                "Gauge pressure at that branch",
                Q::Pressure,
                "bar",
                "psi",
                "",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "Gauge, so not below 0; the common pipe's pressure follows from that branch's energy balance, \
                    and the other branches' from the common pipe's.",
            )
        },
    ];
    for mut field in common::flow_given_fields("850 m3/h") {
        match field.key {
            "q" => {
                field.label = "Flow in the common pipe";
                field.help = "The whole flow through the junction.";
            }
            "v" => {
                field.label = "Mean velocity in the common pipe";
                field.help = "Mean velocity in the common pipe.";
            }
            "mdot" => {
                field.label = "Mass flow in the common pipe";
                field.help = "The whole mass flow through the junction.";
            }
            _ => {}
        }
        fields.push(field);
    }
    fields.extend(common::profile_fields(&common::COMMON_PROFILE));
    fields.push(choice(
        "branches",
        "Number of branches",
        COUNT_OPTIONS,
        "2",
        "Branches other than the common pipe: a tee or wye has 2 (the run and the branch).",
    ));
    fields.push(choice(
        "k_ref",
        "Loss coefficients refer to",
        K_REF_OPTIONS,
        "common",
        "Most junction tables give each branch's K on the velocity of the common (combined) flow.",
    ));
    // Required: an empty joint would put the thrust on the bore, which is low for
    // push-on and mechanical joints; the user chooses (the demo is flanged).
    fields.push(choice(
        "joint",
        "Joints at the junction",
        restraint::Joint::OPTIONS,
        "flanged",
        restraint::JOINT_HELP,
    ));
    fields.push(FieldSpec {
        visible_when: Some(("joint", restraint::OD_JOINTS)),
        ..quantity(
            "od",
            "Common pipe outside diameter",
            Q::Length,
            "mm",
            "in",
            "326 mm",
            Limits::closed(MIN_BORE_M, MAX_SIZE_M),
            "Outside diameter of the common pipe at its joint.",
        )
    });
    for (index, b) in BRANCHES.iter().enumerate() {
        let shown = Some(("branches", b.visible));
        fields.push(FieldSpec {
            visible_when: shown,
            ..quantity(
                b.d,
                b.d_label,
                Q::Length,
                "mm",
                "in",
                b.d_demo,
                Limits::closed(MIN_BORE_M, MAX_SIZE_M),
                "Bore of this branch.",
            )
        });
        fields.push(FieldSpec {
            visible_when: shown,
            ..quantity(
                b.angle,
                b.angle_label,
                Q::Angle,
                "deg",
                "deg",
                b.angle_demo,
                Limits::closed(-PI, PI),
                "Direction the fluid moves in this branch, counter-clockwise in plan from its direction in the \
                        common pipe: 0° straight on, 90° a square branch to the left, −90° to the right.",
            )
        });
        fields.push(FieldSpec {
            visible_when: shown,
            optional: true,
            ..quantity(
                b.elev,
                b.elev_label,
                Q::Angle,
                "deg",
                "deg",
                "",
                Limits::closed(-PI / 2.0, PI / 2.0),
                "Angle of the branch's flow above the plan (+ up); empty means in the plan.",
            )
        });
        fields.push(FieldSpec {
            visible_when: shown,
            optional: true,
            ..quantity(
                b.share,
                b.share_label,
                Q::Ratio,
                "%",
                "%",
                b.share_demo,
                Limits::closed(0.0, 1.0),
                "Share of the common flow, 0 to 100 %. Leave exactly one branch empty: its flow is solved from \
                        the mass balance.",
            )
        });
        fields.push(FieldSpec {
            visible_when: shown,
            optional: true,
            ..quantity(
                b.k,
                b.k_label,
                Q::Ratio,
                "-",
                "-",
                b.k_demo,
                Limits::closed(MIN_LOSS_COEFFICIENT, MAX_LOSS_COEFFICIENT),
                "Head loss K·V²/2g between the common pipe and this branch, −1 to 50; empty means no loss. \
                        Published tee data has negative K for some flow splits (the stream gains energy from the \
                        others), down to −1 on the common pipe's velocity; the losses of all branches together must \
                        not create energy. Name the method (Idelchik, Miller, Crane).",
            )
        });
        fields.push(FieldSpec {
            visible_when: shown,
            optional: true,
            ..quantity(
                b.od,
                b.od_label,
                Q::Length,
                "mm",
                "in",
                b.od_demo,
                Limits::closed(MIN_BORE_M, MAX_SIZE_M),
                "Needed only for push-on, mechanical or restrained joints (the thrust acts on the outside \
                        diameter), and then for every branch in use: the branch pipe's outside diameter at its joint. \
                        Left empty for flanged, welded or fused joints.",
            )
        });
        // The branch's velocity profile: its choice is shown with the branch, the
        // exponent and the factors with the choice that needs them.
        for (n, field) in common::profile_fields(&common::BRANCH_PROFILES[index])
            .into_iter()
            .enumerate()
        {
            fields.push(if n == 0 {
                FieldSpec {
                    visible_when: shown,
                    ..field
                }
            } else {
                field
            });
        }
    }
    fields.extend(common::fluid_fields("25 degC"));
    fields.push(common::gravity_field());
    fields.push(common::weights_field());
    fields.push(FieldSpec {
        visible_when: Some(("weights", &["included"])),
        optional: true,
        ..quantity(
            "w_fitting",
            "Fitting weight",
            Q::Force,
            "kN",
            "lbf",
            "",
            Limits::closed(0.0, 1e8),
            "Optional dead weight of the tee and the pipe it carries: it acts down, out of the plan, with the \
                fluid's weight (the thrust's z component).",
        )
    });

    let mut outputs = vec![
        OutputSpec::headline("thrust_in_plane", "Thrust in the plan (horizontal)", Q::Force),
        OutputSpec::headline(
            "thrust_angle",
            "Direction of the thrust in the plan, from the common pipe's flow direction",
            Q::Angle,
        ),
        OutputSpec::listed(
            "thrust",
            "Thrust on the supports (resultant, with the weights)",
            Q::Force,
        ),
        OutputSpec::listed("thrust_x", "Thrust along the common pipe's flow (x)", Q::Force),
        OutputSpec::listed("thrust_y", "Thrust across it, in the plan (y)", Q::Force),
        OutputSpec::listed("thrust_z", "Thrust out of the plan (z, + up)", Q::Force),
        OutputSpec::listed("static_thrust", "Static thrust with no flow, p·|Σ A·(−n)|", Q::Force),
        OutputSpec::listed(
            "solved_share",
            "Flow share solved from the mass balance (fraction)",
            Q::Ratio,
        ),
        OutputSpec::listed("flow", "Flow in the common pipe", Q::VolumeFlow),
        OutputSpec::listed("mass_flow", "Mass flow in the common pipe", Q::MassFlow),
        OutputSpec::listed("v_common", "Mean velocity in the common pipe", Q::Velocity),
    ];
    for b in &BRANCHES {
        outputs.push(OutputSpec {
            key: b.p_out,
            label: b.p_label,
            kind: Q::Pressure,
            headline: false,
        });
        outputs.push(OutputSpec {
            key: b.q_out,
            label: b.q_label,
            kind: Q::VolumeFlow,
            headline: false,
        });
        outputs.push(OutputSpec {
            key: b.v_out,
            label: b.v_label,
            kind: Q::Velocity,
            headline: false,
        });
    }
    outputs.extend([
        OutputSpec::listed("momentum_share", "Momentum flux ÷ pressure force", Q::Ratio),
        OutputSpec::listed("fluid_weight", "Weight of the fluid inside", Q::Force),
        OutputSpec::listed("density", "Fluid density", Q::Density),
    ]);
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "Thrust on a tee, wye, splitter or manifold with up to six branches at any angles, dividing or \
                combining, with one unknown branch flow solved by mass.",
        fields,
        outputs,
        cautions: vec![
            "For push-on and mechanical joints, restrained or not, choose them under joints (the \
                    outside-diameter basis): using the bores there under-states the thrust by the wall's share, often \
                    15 % or more.",
            "When a branch valve is shut the branch becomes a dead end: check the thrust with that branch's \
                    flow set to zero, and with the run closed too.",
            "Junction loss coefficients depend strongly on the flow split and the area ratios; published \
                    tables (Idelchik, Miller, Crane) differ: name yours.",
            "A negative loss coefficient (the stream gains energy from the others) holds only for the flow \
                    split and area ratio it was published for: recheck it whenever the split changes.",
        ],
    }
}

/// Reads the page's validated values into typed inputs.
///
/// # Errors
/// Each inconsistent field, named with what is allowed: an outside diameter not
/// above its bore, a branch along the common pipe, shares that cannot add up to
/// 100 %, loss coefficients that would create energy.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let junction = match values.choice("junction")? {
        "combining" => Junction::Combining,
        _ => Junction::Dividing,
    };
    let d_common: Length = values.typed("d")?;
    let count: usize = values
        .choice("branches")?
        .parse()
        .map_err(|_| FieldError::inconsistent("branches", "choose 1 to 6 branches"))?;
    let count = count.clamp(1, MAX_BRANCHES);
    let known = match values.choice(common::P_KNOWN).unwrap_or("common") {
        "common" => KnownAt::Common(values.typed("p")?),
        branch => {
            let n: usize = branch.trim_start_matches('b').parse().unwrap_or(0);
            if !(1..=count).contains(&n) {
                return Err(FieldError::inconsistent(
                    common::P_KNOWN,
                    format!("branch {n} is not on this page: choose the common pipe or a branch from 1 to {count}"),
                )
                .into());
            }
            KnownAt::Branch(n - 1, values.typed("p_branch")?)
        }
    };
    let loss_reference = match values.choice("k_ref")? {
        "branch" => LossReference::OwnBranch,
        _ => LossReference::CommonPipe,
    };
    let fluid = common::fluid_from(values)?;
    let flow = read_flow(values)?;
    let joint = values.choice("joint")?;
    let on_outside = restraint::Joint::from_key(joint)
        .ok_or_else(|| FieldError::inconsistent("joint", "choose one of the listed joints"))?
        .uses_od();
    let common_outside = if on_outside {
        let od: Length = values.typed("od")?;
        if od <= d_common {
            return Err(
                FieldError::inconsistent("od", "the outside diameter must be larger than the inside diameter").into(),
            );
        }
        Some(od)
    } else {
        None
    };
    let branches = read_branches(values, count, on_outside)?;
    let inputs = Inputs {
        junction,
        d_common,
        common_outside,
        known,
        profile_common: common::profile_from(values, &common::COMMON_PROFILE)?,
        flow,
        loss_reference,
        branches,
        fluid,
        weights: common::weights_from(values),
        w_fitting: values
            .typed_opt("w_fitting")
            .unwrap_or(Force::new::<uom::si::force::newton>(0.0)),
        gravity: Acceleration::new::<uom::si::acceleration::meter_per_second_squared>(common::gravity_from(values)),
    };
    check_loss_coefficients(&inputs)?;
    Ok(inputs)
}

/// Reads the common pipe's flow in the way it is given.
fn read_flow(values: &Values) -> Result<CommonFlow, FieldErrors> {
    Ok(match common::flow_given_from(values)? {
        FlowSpec::Velocity(v) => CommonFlow::Velocity(Velocity::from_si(v)),
        FlowSpec::MassFlow(m) => CommonFlow::Mass(MassRate::from_si(m)),
        FlowSpec::VolumeFlow(q) => CommonFlow::Volume(VolumeRate::from_si(q)),
        FlowSpec::Unknown => {
            return Err(FieldError::inconsistent("flow_given", "choose how the flow is given").into());
        }
    })
}

/// Reads the first `count` branches and refuses shares that cannot add up.
fn read_branches(values: &Values, count: usize, on_outside: bool) -> Result<Vec<Branch>, FieldErrors> {
    let mut branches = Vec::with_capacity(count);
    let mut errors = Vec::new();
    for (index, b) in BRANCHES.iter().enumerate().take(count) {
        let diameter: Length = match values.typed(b.d) {
            Ok(d) => d,
            Err(e) => {
                errors.push(e);
                continue;
            }
        };
        let angle = match values.quantity(b.angle) {
            Ok(a) => a,
            Err(e) => {
                errors.push(e);
                continue;
            }
        };
        let elev = values.quantity_or(b.elev, 0.0);
        let direction = Vec3::new(elev.cos() * angle.cos(), elev.cos() * angle.sin(), elev.sin());
        // The branch pipe must not lie along the common pipe (within 10°).
        if direction.dot(Vec3::new(-1.0, 0.0, 0.0)) > (10f64).to_radians().cos() {
            errors.push(FieldError::inconsistent(
                b.angle,
                "the branch would lie along the common pipe: its direction must differ from 180° by more than \
                        10°",
            ));
            continue;
        }
        let share: Option<Ratio> = values.typed_opt(b.share);
        let profile = match common::profile_from(values, &common::BRANCH_PROFILES[index]) {
            Ok(p) => p,
            Err(e) => {
                errors.extend(e.0);
                continue;
            }
        };
        let outside = if on_outside {
            if !values.is_set(b.od) {
                errors.push(FieldError::inconsistent(
                    b.od,
                    "an outside diameter is required for push-on, mechanical or restrained joints: the thrust \
                            acts on it",
                ));
                continue;
            }
            let od: Length = values.typed_opt(b.od).unwrap_or(diameter);
            if od <= diameter {
                errors.push(FieldError::inconsistent(
                    b.od,
                    "the outside diameter must be larger than the inside diameter",
                ));
                continue;
            }
            Some(od)
        } else {
            None
        };
        branches.push(Branch {
            index,
            diameter,
            outside,
            direction,
            share,
            k: values
                .typed_opt(b.k)
                .unwrap_or(Ratio::new::<uom::si::ratio::ratio>(0.0)),
            profile,
        });
    }
    if !errors.is_empty() {
        return Err(errors.into());
    }
    // Shares: at most one empty; the given ones add up to 100 %, or to at most 100 %
    // when one is left to be solved.
    let empty: Vec<usize> = branches.iter().filter(|b| b.share.is_none()).map(|b| b.index).collect();
    let given_sum: f64 = branches.iter().filter_map(|b| b.share.map(|s| s.value)).sum();
    let last_given = branches
        .iter()
        .rev()
        .find(|b| b.share.is_some())
        .map(|b| BRANCHES[b.index].share);
    let percent = |x: f64| format!("{} %", units::format_significant(100.0 * x, 4));
    if empty.len() > 1 {
        return Err(FieldError::inconsistent(
            BRANCHES[empty[1]].share,
            "only one branch's flow share can be left empty (it is solved from the mass balance): give this \
                    one",
        )
        .into());
    }
    let tolerance = 1e-9;
    match (empty.first(), last_given) {
        (None, Some(field)) if (given_sum - 1.0).abs() > 1e-6 => {
            return Err(FieldError::inconsistent(
                field,
                format!(
                    "the branch flow shares add up to {}; they must add up to 100 % (or leave one empty to be \
                            solved)",
                    percent(given_sum)
                ),
            )
            .into());
        }
        (Some(_), Some(field)) if given_sum > 1.0 + tolerance => {
            return Err(FieldError::inconsistent(
                field,
                format!(
                    "the given branch flow shares add up to {}, over 100 %: the remaining branch would have to \
                            flow backwards",
                    percent(given_sum)
                ),
            )
            .into());
        }
        _ => {}
    }
    Ok(branches)
}

/// Negative loss coefficients are physical (a stream drawn along by another gains
/// energy) but bounded: each, taken on the common pipe's velocity, is at least
/// [`MIN_LOSS_COEFFICIENT`], and the junction as a whole must not create energy:
/// the dissipation Σ ṁ_i·K_i·V_ref,i²/2 over the branches is not negative. (The
/// mechanical energy the streams carry in less what they carry out is that sum, for
/// dividing and combining flow alike.)
fn check_loss_coefficients(inputs: &Inputs) -> Result<(), FieldError> {
    let (branches, k_on_common) = (&inputs.branches, inputs.k_on_common());
    let a_common = common::circle_area(inputs.d_common.value);
    let total_flow = inputs.total_flow();
    let flows = model::branch_flows(branches, total_flow);
    let v_common = total_flow / a_common;
    if v_common <= 0.0 {
        // No flow, no loss: the coefficients do not enter.
        return Ok(());
    }
    let given: f64 = flows.iter().flatten().sum();
    let mut dissipation = 0.0;
    let mut magnitude = 0.0;
    let mut most_negative: Option<(f64, &'static str)> = None;
    for (b, q) in branches.iter().zip(&flows) {
        let q = q.unwrap_or((total_flow - given).max(0.0));
        let v_ref = if k_on_common {
            v_common
        } else {
            q / common::circle_area(b.diameter.value)
        };
        let key = BRANCHES[b.index].k;
        let k = b.k.value;
        let on_common = k * (v_ref / v_common).powi(2);
        if on_common < MIN_LOSS_COEFFICIENT - 1e-12 {
            return Err(FieldError::inconsistent(
                key,
                format!(
                    "on the common pipe's velocity this loss coefficient is {}, below the lowest published \
                            junction value of {} (Crane TP-410, converging tee): allowed is {} to {} on the common \
                            velocity",
                    units::format_significant(on_common, 4),
                    MIN_LOSS_COEFFICIENT,
                    MIN_LOSS_COEFFICIENT,
                    MAX_LOSS_COEFFICIENT
                ),
            ));
        }
        let term = q * k * v_ref * v_ref / 2.0;
        dissipation += term;
        magnitude += term.abs();
        if k < 0.0 && most_negative.is_none_or(|(t, _)| term < t) {
            most_negative = Some((term, key));
        }
    }
    if let Some((_, key)) = most_negative {
        if dissipation < -1e-12 * magnitude {
            return Err(FieldError::inconsistent(
                key,
                "with these loss coefficients and flows the junction would create energy: the gain of the \
                        streams with negative K exceeds the losses of the others (Σ flow × K × V²/2 over the branches \
                        must not be negative); check the coefficients and the split they belong to",
            ));
        }
    }
    Ok(())
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, read, model::solve, report::write)
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn a_branch_pressure_known_gives_back_the_common_pressure() {
        // Issue 12 §2: the pressure known at branch 2 (found from the common pipe's
        // in a first solve) must give back the common pipe's pressure and thrust.
        let base = [("junction", "dividing"), ("b2_k", "0.8"), ("profile_common", "laminar")];
        let forward = solved(&[&base[..], &[("p", "9 bar")]].concat());
        let p_b2 = forward.output("p_b2").unwrap().si;
        let typed = format!("{p_b2} Pa");
        let back = solved(&[&base[..], &[("p_known", "b2"), ("p_branch", typed.as_str())]].concat());
        // Branch 1's pressure follows from the common pipe's: equal only if that is.
        let run = back.output("p_b1").unwrap().si;
        assert_relative_eq!(run, forward.output("p_b1").unwrap().si, max_relative = 1e-9);
        assert_relative_eq!(
            back.output("thrust").unwrap().si,
            forward.output("thrust").unwrap().si,
            max_relative = 1e-9
        );
        assert!(back.checks.iter().all(|c| c.agrees()), "{:?}", back.checks);
        assert!(back
            .checks
            .iter()
            .any(|c| c.label == "Gauge pressure in the common pipe"));
        // A branch that is not on the page is refused by name.
        assert_eq!(
            error_field(&[("branches", "2"), ("p_known", "b4"), ("p_branch", "3 bar")]),
            "p_known"
        );
    }

    #[test]
    fn a_link_without_the_new_keys_gives_today_s_result_exactly() {
        // Issue 12: links written before the branch profiles, the weights choice and
        // local gravity: uniform branches, weights included, standard gravity.
        let base = [("branches", "3"), ("b3_elev", "30 deg"), ("b2_k", "0.7")];
        let old = solved(&base);
        let mut with_defaults = base.to_vec();
        with_defaults.extend([
            ("b1_profile", "uniform"),
            ("b2_profile", "uniform"),
            ("b3_profile", "uniform"),
            ("weights", "included"),
            ("g_local", ""),
            ("w_fitting", ""),
        ]);
        let new = solved(&with_defaults);
        for key in ["thrust", "thrust_x", "thrust_y", "thrust_z", "p_b1", "p_b2", "p_b3"] {
            assert_eq!(old.output(key).map(|o| o.si), new.output(key).map(|o| o.si), "{key}");
        }
        let mut cleared = base.to_vec();
        cleared.extend([
            ("b1_profile", ""),
            ("b2_profile", ""),
            ("b3_profile", ""),
            ("weights", ""),
        ]);
        assert_eq!(
            solved(&cleared).output("thrust").map(|o| o.si),
            old.output("thrust").map(|o| o.si)
        );
    }

    #[test]
    fn a_branch_profile_enters_its_momentum_flux_and_its_energy_line() {
        // Dividing, the pressure known in the common pipe: a laminar branch 2
        // (β = 4/3, α = 2) lowers its pressure by ρ(α − 1)V₂²/2 and changes its
        // momentum flux by (β − 1)ṁ₂V₂ along its axis (y), its pressure force by
        // −Δp·A₂ along it: T_y changes by −[(4/3 − 1)ρV₂² − ρV₂²/2]·A₂ (derived from
        // the definition, by hand).
        let uniform = solved(&[]);
        let laminar = solved(&[("b2_profile", "laminar")]);
        let (rho, v2) = (
            uniform.output("density").unwrap().si,
            uniform.output("v_b2").unwrap().si,
        );
        let a2 = std::f64::consts::PI * 0.154 * 0.154 / 4.0;
        let dp = -rho * v2 * v2 / 2.0;
        assert_relative_eq!(
            laminar.output("p_b2").unwrap().si - uniform.output("p_b2").unwrap().si,
            dp,
            max_relative = 1e-9
        );
        let d_thrust_y = -((4.0 / 3.0 - 1.0) * rho * v2 * v2 + dp) * a2;
        assert_relative_eq!(
            laminar.output("thrust_y").unwrap().si - uniform.output("thrust_y").unwrap().si,
            d_thrust_y,
            max_relative = 1e-6
        );
        // Branch 1 is untouched: its pressure follows from the common pipe's alone.
        assert_eq!(laminar.output("p_b1").unwrap().si, uniform.output("p_b1").unwrap().si);
        assert!(laminar.checks.iter().all(|c| c.agrees()), "{:?}", laminar.checks);
        // The ledger names the β branch 2 used, and the basis where it came from.
        let ledger = laminar.tables.iter().find(|t| t.key == "ledger").expect("ledger");
        assert!(
            ledger
                .rows
                .iter()
                .any(|r| r[0].starts_with("branch 2") && r[0].contains("β = 1.333")),
            "{ledger:?}"
        );
        let basis = laminar.tables.iter().find(|t| t.key == "basis").expect("basis");
        assert!(
            basis
                .rows
                .iter()
                .any(|r| r[1].contains("branch 2 β = 1.333, α = 2 (fully developed laminar)")),
            "{basis:?}"
        );
        // A power law needs its exponent, typed factors need β: refused by name.
        assert_eq!(error_field(&[("b1_profile", "power_law")]), "b1_n_power");
        assert_eq!(error_field(&[("b2_profile", "typed")]), "b2_beta");
    }

    #[test]
    fn neglected_weights_take_exactly_the_weights_out_of_the_vertical_component() {
        let with = solved(&[("w_fitting", "2 kN")]);
        let without = solved(&[("w_fitting", "2 kN"), ("weights", "neglected")]);
        let weights = with.output("fluid_weight").unwrap().si + 2000.0;
        assert_relative_eq!(
            without.output("thrust_z").unwrap().si - with.output("thrust_z").unwrap().si,
            weights,
            max_relative = 1e-12
        );
        // In the plan nothing changes.
        assert_eq!(
            with.output("thrust_in_plane").unwrap().si,
            without.output("thrust_in_plane").unwrap().si
        );
        assert_eq!(without.output("thrust_z").unwrap().si, 0.0);
        assert!(without.checks.iter().all(|c| c.agrees()), "{:?}", without.checks);
        assert!(with.checks.iter().all(|c| c.agrees()), "{:?}", with.checks);
        let basis = without.tables.iter().find(|t| t.key == "basis").expect("basis");
        assert!(basis.rows.iter().any(|r| r[1].contains("neglected")), "{basis:?}");
    }

    #[test]
    fn local_gravity_scales_the_weight_and_the_elevation_head() {
        // Branch 2 rising at 30°, its face one 310 mm stub from the junction: the
        // weight scales with g, and so does the branch pressure's elevation term ρg·z.
        let base = [("b2_elev", "30 deg")];
        let standard = solved(&base);
        let local = solved(&[&base[..], &[("g_local", "9.78 m/s2")]].concat());
        assert_relative_eq!(
            local.output("fluid_weight").unwrap().si / standard.output("fluid_weight").unwrap().si,
            9.78 / crate::units::STANDARD_GRAVITY,
            max_relative = 1e-12
        );
        let rho = standard.output("density").unwrap().si;
        let z = 0.31 * 0.5; // one common-pipe diameter along the branch, sin 30°
        assert_relative_eq!(
            local.output("p_b2").unwrap().si - standard.output("p_b2").unwrap().si,
            rho * (crate::units::STANDARD_GRAVITY - 9.78) * z,
            max_relative = 1e-9
        );
        assert!(local.checks.iter().all(|c| c.agrees()), "{:?}", local.checks);
        assert_eq!(error_field(&[("g_local", "12 m/s2")]), "g_local");
    }

    #[test]
    fn keys_are_the_glossary_s_and_old_links_land_on_fields() {
        crate::calculators::testing::assert_glossary_keys(super::KEY);
    }

    #[test]
    fn still_tee_thrust_is_pressure_on_the_branch_area() {
        // Derived from the definition: T = p·A_branch along the branch axis, pointing
        // away from the branch (the unbalanced wall is opposite the branch opening).
        let s = outcome(&[
            ("q", "0"),
            ("p", "10 bar"),
            ("d", "300 mm"),
            ("b1_d", "300 mm"),
            ("b2_d", "200 mm"),
            ("b1_share", "100 %"),
        ])
        .result
        .expect("solves");
        let expected = 1e6 * std::f64::consts::PI * 0.04 / 4.0;
        assert_relative_eq!(s.output("thrust_in_plane").unwrap().si, expected, max_relative = 1e-9);
        assert_relative_eq!(
            s.output("thrust_angle").unwrap().si,
            -std::f64::consts::FRAC_PI_2,
            max_relative = 1e-9
        );
        assert_relative_eq!(s.output("static_thrust").unwrap().si, expected, max_relative = 1e-9);
        // cos 90° is 6e-17 in floating point: the along-run thrust it leaves is
        // rounding residue, shown as the 0 it is.
        assert_eq!(s.output("thrust_x").unwrap().si, 0.0);
    }

    #[test]
    fn the_model_solves_typed_inputs_on_the_outside_diameter() {
        // Derived from the definition (the outside-diameter basis of push-on joints,
        // DIPRA, Thrust Restraint Design for Ductile Iron Pipe, from memory): a still
        // square tee with equal run ODs takes T = p·A_OD,branch, away from the branch.
        use super::model::{self, Branch, CommonFlow, Inputs, Junction, LossReference};
        use crate::vector::Vec3;
        use uom::si::f64::{Length, Pressure, Ratio, VolumeRate};
        use uom::si::{length::millimeter, pressure::bar, ratio::ratio, volume_rate::cubic_meter_per_second};
        let mm = Length::new::<millimeter>;
        let branch = |index, d, od, direction, share: Option<f64>| Branch {
            index,
            diameter: mm(d),
            outside: Some(mm(od)),
            direction,
            share: share.map(Ratio::new::<ratio>),
            k: Ratio::new::<ratio>(0.0),
            profile: crate::calculators::common::PortProfile::uniform(),
        };
        let inputs = Inputs {
            junction: Junction::Dividing,
            d_common: mm(300.0),
            common_outside: Some(mm(326.0)),
            known: super::KnownAt::Common(Pressure::new::<bar>(10.0)),
            profile_common: crate::calculators::common::PortProfile::uniform(),
            flow: CommonFlow::Volume(VolumeRate::new::<cubic_meter_per_second>(0.0)),
            loss_reference: LossReference::CommonPipe,
            branches: vec![
                branch(0, 300.0, 326.0, Vec3::new(1.0, 0.0, 0.0), Some(1.0)),
                branch(1, 200.0, 222.0, Vec3::new(0.0, 1.0, 0.0), None),
            ],
            fluid: crate::fluid::water_celsius(15.0).expect("water at 15 °C"),
            weights: true,
            w_fitting: uom::si::f64::Force::new::<uom::si::force::newton>(0.0),
            gravity: uom::si::f64::Acceleration::new::<uom::si::acceleration::meter_per_second_squared>(
                crate::units::STANDARD_GRAVITY,
            ),
        };
        let solved = model::solve(&inputs).expect("solves");
        let expected = 1e6 * std::f64::consts::PI * 0.222 * 0.222 / 4.0;
        assert_relative_eq!(solved.thrust.y, -expected, max_relative = 1e-9);
        assert_eq!(solved.thrust.x, 0.0);
        assert_relative_eq!(solved.static_thrust.y, -expected, max_relative = 1e-9);
    }

    #[test]
    fn an_old_link_reads_as_today_s_keys() {
        // A bookmarked link in the retired keys solves as the same link in today's.
        let old = [
            ("mode", "dividing"),
            ("n", "2"),
            ("flow_basis", "q"),
            ("basis", "od"),
            ("d_od", "326 mm"),
            ("d1", "300 mm"),
            ("od1", "326 mm"),
            ("share1", "60 %"),
            ("d2", "200 mm"),
            ("od2", "222 mm"),
            ("angle2", "90 deg"),
            ("k2", "0.9"),
        ];
        let pairs: Vec<(String, String)> = old.iter().map(|(k, v)| (k.to_string(), v.to_string())).collect();
        let up = crate::glossary::upgrade(super::KEY, &pairs);
        assert_eq!(up.translations.len(), old.len());
        let new: Vec<(&str, &str)> = up.pairs.iter().map(|(k, v)| (k.as_str(), v.as_str())).collect();
        assert!(new.contains(&("joint", "push_on")), "{new:?}");
        let today = crate::calculators::testing::solved(super::KEY, &new);
        let mut by_hand = vec![
            ("junction", "dividing"),
            ("branches", "2"),
            ("flow_given", "q"),
            ("joint", "push_on"),
            ("od", "326 mm"),
            ("b1_d", "300 mm"),
            ("b1_od", "326 mm"),
            ("b1_share", "60 %"),
            ("b2_d", "200 mm"),
            ("b2_od", "222 mm"),
            ("b2_angle", "90 deg"),
            ("b2_k", "0.9"),
        ];
        let thrust = |pairs: &[(&str, &str)]| {
            crate::calculators::testing::solved(super::KEY, pairs)
                .output("thrust_in_plane")
                .map(|o| o.si)
        };
        assert_eq!(today.output("thrust_in_plane").map(|o| o.si), thrust(&by_hand));
        // The same link on flanged joints (the bore) gives less: the alias kept the OD.
        let on_outside = thrust(&by_hand);
        by_hand[3] = ("joint", "flanged");
        assert!(on_outside > thrust(&by_hand));
    }

    #[test]
    fn the_joint_is_required_and_fused_joints_take_the_bore() {
        // An empty joint once meant the bore, low for push-on joints: now refused,
        // naming the field.
        assert_eq!(error_field(&[("joint", "")]), "joint");
        let thrust = |joint: &str| {
            crate::calculators::testing::solved(super::KEY, &[("joint", joint)])
                .output("thrust_in_plane")
                .map(|o| o.si)
        };
        // Fused joints seal on the bore like flanged ones; push-on on the OD (more).
        assert_eq!(thrust("fused"), thrust("flanged"));
        assert!(thrust("push_on") > thrust("flanged"));
    }

    #[test]
    fn the_empty_share_is_solved_by_mass() {
        let s = outcome(&[("b1_share", "70 %"), ("b2_share", "")])
            .result
            .expect("solves");
        assert_relative_eq!(s.output("solved_share").unwrap().si, 0.3, max_relative = 1e-9);
        let q = s.output("flow").unwrap().si;
        assert_relative_eq!(s.output("q_b2").unwrap().si, 0.3 * q, max_relative = 1e-9);
    }

    #[test]
    fn combining_mirror_of_a_symmetric_wye_has_no_side_thrust() {
        let s = outcome(&[
            ("junction", "combining"),
            ("b1_angle", "30 deg"),
            ("b2_angle", "-30 deg"),
            ("b1_d", "200 mm"),
            ("b2_d", "200 mm"),
            ("b1_share", "50 %"),
            ("b2_share", ""),
            ("b1_k", "0.2"),
            ("b2_k", "0.2"),
        ])
        .result
        .expect("solves");
        assert!(s.output("thrust_y").unwrap().si.abs() < 1e-6 * s.output("thrust").unwrap().si);
        // Combining: the branch pressures exceed the common pressure by the loss.
        assert!(s.output("p_b1").unwrap().si > 1e6 - 1e4);
    }

    #[test]
    fn bad_shares_and_sizes_name_their_field() {
        assert_eq!(error_field(&[("b1_share", "120 %")]), "b1_share");
        assert_eq!(error_field(&[("b1_share", "70 %"), ("b2_share", "40 %")]), "b2_share");
        assert_eq!(
            error_field(&[
                ("branches", "3"),
                ("b1_share", "70 %"),
                ("b2_share", ""),
                ("b3_share", "")
            ]),
            "b3_share"
        );
        assert_eq!(
            error_field(&[
                ("branches", "3"),
                ("b1_share", "80 %"),
                ("b2_share", ""),
                ("b3_share", "30 %")
            ]),
            "b3_share"
        );
        assert_eq!(error_field(&[("b2_d", "0 mm")]), "b2_d");
        assert_eq!(error_field(&[("b2_angle", "175 deg")]), "b2_angle");
        assert_eq!(error_field(&[("p", "-3 psi")]), "p");
    }

    #[test]
    fn shares_within_the_tolerance_of_100_percent_close_mass_exactly() {
        // 70.00005 % + 30 % is accepted (within 1e-6 of 100 %); the branch flows must
        // still add up to the common flow to rounding, not leave 5e-7 of it over.
        let s = outcome(&[("b1_share", "70.00005 %"), ("b2_share", "30 %")])
            .result
            .expect("solves");
        let q = s.output("flow").unwrap().si;
        let sum = s.output("q_b1").unwrap().si + s.output("q_b2").unwrap().si;
        assert!((sum - q).abs() <= 1e-12 * q, "branch flows {sum} against {q}");
        assert_relative_eq!(s.output("q_b2").unwrap().si, 0.3 * q, max_relative = 1e-12);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    #[test]
    fn negative_loss_coefficients_are_accepted_while_the_junction_loses_energy() {
        // Combining, small branch share: a negative branch K (Crane TP-410 gives down
        // to −1 on the combined velocity) with a positive run K.
        let combining = [
            ("junction", "combining"),
            ("b1_share", "90 %"),
            ("b2_share", ""),
            ("b1_k", "0.3"),
            ("b2_k", "-0.9"),
        ];
        let s = outcome(&combining).result.expect("solves");
        // The branch gains the energy: its pressure is below the common pipe's plus
        // its own velocity-head change by 0.9·ρV0²/2.
        let (rho, v0) = (s.output("density").unwrap().si, s.output("v_common").unwrap().si);
        let v2 = s.output("v_b2").unwrap().si;
        let p0 = 1e6;
        let expected = p0 + rho * (v0 * v0 - v2 * v2) / 2.0 - 0.9 * rho * v0 * v0 / 2.0;
        assert_relative_eq!(s.output("p_b2").unwrap().si, expected, max_relative = 1e-12);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        // Both streams gaining energy would create it: refused on the more negative K.
        assert_eq!(error_field(&[("b1_k", "-0.1"), ("b2_k", "-0.2")]), "b1_k");
        // Below −1 on the common velocity: refused by the field's range.
        assert_eq!(error_field(&[("b2_k", "-1.5")]), "b2_k");
        // On the branch's own velocity a K of −1 in a branch faster than the common
        // pipe is below −1 on the common velocity.
        assert_eq!(
            error_field(&[
                ("k_ref", "branch"),
                ("b2_d", "100 mm"),
                ("b1_share", "50 %"),
                ("b2_share", "50 %"),
                ("b2_k", "-1")
            ]),
            "b2_k"
        );
    }

    #[test]
    fn demo_matches_the_method_note_worked_example() {
        // site/notes/tee.md works the demo by hand: p1 = 1001.0 kPa, p2 = 992.8 kPa,
        // T = 18.76 kN at −89.1°, static 18.63 kN.
        let s = outcome(&[]).result.expect("solves");
        assert_relative_eq!(s.output("p_b1").unwrap().si, 1001.0e3, max_relative = 1e-4);
        assert_relative_eq!(s.output("p_b2").unwrap().si, 992.8e3, max_relative = 1e-4);
        assert_relative_eq!(s.output("thrust_in_plane").unwrap().si, 18.76e3, max_relative = 5e-4);
        assert_relative_eq!(
            s.output("thrust_angle").unwrap().si,
            (-89.09f64).to_radians(),
            max_relative = 5e-4
        );
        assert_relative_eq!(s.output("static_thrust").unwrap().si, 18.63e3, max_relative = 5e-4);
    }
}
