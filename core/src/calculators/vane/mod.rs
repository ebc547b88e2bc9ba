//! Jet on a curved vane: a fixed vane, a single moving vane, and a wheel of vanes
//! (an impulse wheel such as a Pelton wheel); force, power and efficiency, and how
//! power and efficiency vary with the blade speed.
//!
//! # Method
//! A round free jet (area A, speed V, flow Q = AV; from the nozzle diameter and one
//! of the jet velocity, the flow, or the head or pressure at the nozzle inlet with a
//! velocity coefficient) enters the vane tangentially along +x. The vane moves along
//! +x at the blade speed u (zero for a fixed vane) and turns the flow, relative to
//! itself, through the deflection angle θ (180° turns it straight back). Friction on
//! the vane slows the relative flow: W₂ = k·W₁ with W₁ = V − u and k ≤ 1. All ports
//! are open to the atmosphere (gauge pressure zero), so only momentum fluxes act.
//!
//! - **Fixed vane** (u = 0): a fixed control volume around the vane; ṁ = ρAV.
//! - **Single moving vane**: a control volume that moves with the vane at u
//!   ([`crate::engine::Frame::Translating`]). The flow is steady in that frame, and
//!   momentum is written with relative velocities: only ṁ = ρA(V − u) reaches the
//!   vane per second, because the vane runs away from the jet and the jet between
//!   nozzle and vane grows longer by u every second.
//! - **Wheel of vanes**: one vane after another enters the jet, so the whole jet,
//!   ṁ = ρAV, is turned. A control volume fixed around the wheel takes in the jet at
//!   V and discharges it with the absolute exit velocity of the exit velocity
//!   triangle, V₂ = u + W₂ (vectors).
//!
//! In each case the engine ([`crate::engine`]) returns the force of the water on the
//! vane; its component along the jet is F_x = ṁ·W₁·(1 − k·cos θ), the power is
//! P = F_x·u, and the efficiency is P over the jet's kinetic-energy flux ρQV²/2.
//! That gives the classic results: a single vane delivers most power at u = V/3
//! (efficiency (8/27)(1 − k·cos θ), 16/27 for θ = 180°, k = 1); a wheel at u = V/2
//! (efficiency (1 − k·cos θ)/2, 100 % for θ = 180°, k = 1). The plotted curves are
//! balances at each blade speed, and the optimum speeds are found by searching those
//! balances, not from the formulas. An energy table lists where the jet's power goes.
//!
//! For a wheel with a pitch diameter D (the circle the jet's centre line touches) the
//! rotational speed is ω = 2u/D (n = 60u/(πD) rpm), the best speed ω = V/D, and z
//! identical jets give z times one jet's flow and power (the jets are taken not to
//! interfere). The searched best speed in rpm is checked against ω = V/D.
//!
//! The checks table ([`Report::check`]) compares the force along the jet with
//! ṁ·W₁·(1 − k·cos θ) written by hand, the power F_x·u with the energy balance (jet
//! flux − kinetic energy carried off − vane loss ṁ(1 − k²)W₁²/2 − the lengthening
//! jet of a single vane), and the searched peak powers with their closed forms. A
//! side force that is rounding residue of the flux turned is shown as 0. The
//! efficiency is reported as not applicable, with the reason, for a fixed vane (it
//! does no work) and for a wheel at its runaway speed (no load).
//!
//! Sources: the moving-vane and impulse-turbine sections of White, *Fluid
//! Mechanics* (chapters 3 and 11), Munson et al., *Fundamentals of Fluid Mechanics*
//! (chapters 5 and 12), Dixon & Hall, *Fluid Mechanics and Thermodynamics of
//! Turbomachinery* (the Pelton wheel), and the impact-of-jets chapter of hydraulics
//! texts such as Bansal, *A Textbook of Fluid Mechanics and Hydraulic Machines*.
//!
//! # Layout
//! [`read`] turns the validated values into typed [`Inputs`] once; [`model::solve`]
//! is the physics, a pure function of them (the balance at the blade speed given,
//! the optima and the plotted curves); `report` writes outputs, checks, warnings,
//! tables and plots from the solved [`model::Solved`], and `diagram` draws it.
//!
//! # Assumptions
//! Idealised jet: steady (on average for a wheel), incompressible, uniform speed,
//! no spreading, windage or spray; the jet enters tangentially and along the vane's
//! motion; the vane's friction is lumped in k; the jet's weight is neglected; for the
//! wheel, the vane speed u is the speed of the bucket at the jet's line.

use std::f64::consts::PI;

use uom::si::f64::{Length, Ratio, Velocity};

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::{FieldError, FieldErrors};
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity};

mod diagram;
pub mod model;
mod report;

use model::{Inputs, VaneKind, Wheel};

pub const KEY: &str = "vane";
/// The page title.
pub const TITLE: &str = "Impulse-wheel bucket load and best running speed";

const VANE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "fixed",
        label: "Fixed vane",
    },
    ChoiceOption {
        key: "single",
        label: "Single moving vane",
    },
    ChoiceOption {
        key: "wheel",
        label: "Wheel of vanes (impulse wheel)",
    },
];
/// The smallest relative-velocity factor accepted: a vane that keeps less than 5 % of
/// the relative speed is a brake, not a vane.
const MIN_K: f64 = 0.05;
/// The smallest pitch diameter accepted: 10 mm.
const MIN_PITCH_M: f64 = 0.01;
/// The most jets an impulse wheel of this page may have (six is the usual most on a
/// vertical-shaft wheel).
const MAX_JETS: f64 = 6.0;
/// Jets larger than this fraction of the pitch diameter are warned about.
const LARGEST_JET_RATIO: f64 = 1.0 / 6.0;
const PITCH_HELP: &str = "Diameter of the circle the jet's centre line touches (the bucket circle). Gives the \
    wheel's rotational speed from the blade speed, n = 60u/(πD). Empty: no speed in rpm.";

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        choice(
            "vane",
            "Vane",
            VANE_OPTIONS,
            "wheel",
            "A fixed vane; a single vane moving away from the jet (only the water that catches up with it is \
                    turned); or a wheel, where one vane follows another and the whole jet is turned.",
        ),
        FieldSpec {
            // Required while shown (a single vane or a wheel); hidden for a fixed vane.
            visible_when: Some(("vane", &["single", "wheel"])),
            ..quantity(
                "u",
                "Blade speed",
                Q::Velocity,
                "m/s",
                "ft/s",
                "16 m/s",
                Limits::closed(0.0, common::MAX_JET_SPEED),
                "Speed of the vane along the jet, away from the nozzle. For a wheel: the bucket speed at the \
                        jet's line, ω·r. A single vane must move slower than the jet.",
            )
        },
        FieldSpec {
            visible_when: Some(("vane", &["wheel"])),
            optional: true,
            ..quantity(
                "d_pitch",
                "Pitch diameter of the wheel",
                Q::Length,
                "mm",
                "in",
                "600 mm",
                Limits::closed(MIN_PITCH_M, common::MAX_SIZE_M),
                PITCH_HELP,
            )
        },
        FieldSpec {
            visible_when: Some(("vane", &["wheel"])),
            optional: true,
            ..quantity(
                "jets",
                "Number of jets on the wheel",
                Q::Ratio,
                "-",
                "-",
                "1",
                Limits::closed(1.0, MAX_JETS),
                "Whole number of identical jets round the wheel, 1 to 6 (empty means 1). Each jet is the jet \
                        described below.",
            )
        },
        quantity(
            "angle",
            "Deflection angle of the vane",
            Q::Angle,
            "deg",
            "deg",
            "165 deg",
            Limits::closed(PI / 180.0, PI),
            "How far the vane turns the flow relative to itself, 1 to 180 degrees (straight back). Impulse \
                    buckets turn about 160 to 170 degrees.",
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "w_ratio",
                "Relative-velocity factor k = W₂/W₁",
                Q::Ratio,
                "-",
                "-",
                "0.9",
                Limits::closed(MIN_K, 1.0),
                "Relative speed leaving the vane over relative speed entering it, 0.05 to 1; 1 for a smooth \
                        vane (empty means 1). Friction makes it less than 1.",
            )
        },
    ];
    fields.extend(common::jet_fields([
        "25 mm", "head", "33 m/s", "16 L/s", "60 m", "6 bar", "0.98",
    ]));
    fields.extend(common::fluid_fields("15 degC"));
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary:
            "Force, power and efficiency of a jet on a fixed vane, a single moving vane or a wheel of vanes, with \
                power and efficiency against blade speed.",
        fields,
        outputs: vec![
            OutputSpec::headline(
                "u_best",
                "Best blade speed: peak power of this vane or wheel (searched)",
                Q::Velocity,
            ),
            OutputSpec::headline("power_best", "Peak power, at the best blade speed", Q::Power),
            OutputSpec::headline(
                "force_x",
                "Force on the vane along the jet (x), at this blade speed",
                Q::Force,
            ),
            OutputSpec::listed("power", "Power at this blade speed, F_x·u", Q::Power),
            OutputSpec::listed(
                "efficiency",
                "Efficiency at this blade speed: power ÷ jet kinetic-energy flux",
                Q::Ratio,
            ),
            OutputSpec::listed(
                "force_y",
                "Force on the vane across the jet (y, positive towards the side the water is turned to)",
                Q::Force,
            ),
            OutputSpec::listed(
                "force_side",
                "Side force on the vane, away from the side the water is turned to",
                Q::Force,
            ),
            OutputSpec::listed("force", "Resultant force on the vane", Q::Force),
            OutputSpec::listed("mass_flow_turned", "Mass flow turned by the vane(s)", Q::MassFlow),
            OutputSpec::listed("w_in", "Relative velocity entering the vane, W₁ = V − u", Q::Velocity),
            OutputSpec::listed("w_out", "Relative velocity leaving the vane, W₂ = k·W₁", Q::Velocity),
            OutputSpec::listed("v_out", "Absolute velocity of the water leaving, |V₂|", Q::Velocity),
            OutputSpec::listed("v_out_angle", "Direction of V₂, from the jet direction", Q::Angle),
            OutputSpec::listed("head_loss", "Loss on the vane, (1 − k²)·W₁²/2g", Q::Length),
            OutputSpec::listed("jet_velocity", "Jet velocity V", Q::Velocity),
            OutputSpec::listed("jet_flow", "Jet flow Q", Q::VolumeFlow),
            OutputSpec::listed("jet_power", "Jet kinetic-energy flux ρQV²/2", Q::Power),
            OutputSpec::listed(
                "u_best_single",
                "Single vane: blade speed of peak power (searched)",
                Q::Velocity,
            ),
            OutputSpec::listed("power_best_single", "Single vane: peak power", Q::Power),
            OutputSpec::listed("efficiency_best_single", "Single vane: peak efficiency", Q::Ratio),
            OutputSpec::listed(
                "u_best_wheel",
                "Wheel: blade speed of peak power (searched)",
                Q::Velocity,
            ),
            OutputSpec::listed("power_best_wheel", "Wheel: peak power", Q::Power),
            OutputSpec::listed("efficiency_best_wheel", "Wheel: peak efficiency", Q::Ratio),
            OutputSpec::listed("speed", "Wheel speed at the blade speed, n = 60u/(πD)", Q::AngularSpeed),
            OutputSpec::listed("speed_best", "Wheel speed of peak power (searched)", Q::AngularSpeed),
            OutputSpec::listed("power_per_jet", "Power per jet at the blade speed", Q::Power),
            OutputSpec::listed("power_all_jets", "Power of the wheel, all jets", Q::Power),
            OutputSpec::listed("flow_all_jets", "Flow of all jets", Q::VolumeFlow),
            OutputSpec::listed("density", "Fluid density", Q::Density),
        ],
        cautions: vec![
            "Idealised jet: no spreading, windage, spray or splash, and the jet's weight neglected. Real vanes \
                    and buckets lose more than the factor k suggests (friction, windage, interference between \
                    buckets, water leaving at an angle): treat power and efficiency as upper bounds.",
            "Anything that spins needs guards and overspeed protection. An unloaded wheel runs up towards the \
                    jet speed at the buckets (runaway); check the runner, bearings and coupling for runaway speed and \
                    keep people clear of the jet and the wheel.",
            "A single vane on a carriage (a test rig) needs end stops that hold the full fixed-vane force: \
                    held still, the vane takes the most force.",
            "Defer to the machine manufacturer's ratings and to a licensed engineer for the vane, wheel, \
                    housing and foundations.",
        ],
    }
}

/// Reads the page's validated values into typed inputs.
///
/// # Errors
/// A missing blade speed for a moving vane or a wheel, or a jet value missing or
/// out of range, named.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let mode = match values.choice("vane")? {
        "fixed" => VaneKind::Fixed,
        "single" => VaneKind::Single,
        _ => VaneKind::Wheel,
    };
    let angle = values.typed("angle")?;
    let w_ratio = values
        .typed_opt("w_ratio")
        .unwrap_or(Ratio::new::<uom::si::ratio::ratio>(1.0));
    let fluid = common::fluid_from(values)?;
    let jet = common::jet_from(values, fluid.density)?;
    let jet_given = common::jet_given(values)?;
    let u = match mode {
        VaneKind::Fixed => Velocity::new::<uom::si::velocity::meter_per_second>(0.0),
        VaneKind::Single | VaneKind::Wheel => values.typed_opt("u").ok_or_else(|| {
            FieldError::inconsistent(
                "u",
                "a blade speed is required for a moving vane or a wheel (0 for one held still)",
            )
        })?,
    };
    let wheel = match mode {
        VaneKind::Wheel => read_wheel(values, jet.diameter)?,
        VaneKind::Fixed | VaneKind::Single => None,
    };
    Ok(Inputs {
        kind: mode,
        angle,
        w_ratio,
        u,
        jet_given,
        jet,
        fluid,
        wheel,
    })
}

/// The wheel's pitch diameter and number of jets, when the pitch diameter is given.
///
/// # Errors
/// A fractional number of jets, or a pitch diameter not larger than the jet.
fn read_wheel(values: &Values, jet_diameter: Length) -> Result<Option<Wheel>, FieldErrors> {
    let jets = values.quantity_or("jets", 1.0);
    if jets.fract() != 0.0 {
        return Err(FieldError::inconsistent(
            "jets",
            format!("the number of jets must be a whole number from 1 to {MAX_JETS}"),
        )
        .into());
    }
    let Some(pitch_diameter) = values.typed_opt::<Length>("d_pitch") else {
        return Ok(None);
    };
    if pitch_diameter <= jet_diameter {
        return Err(FieldError::inconsistent(
            "d_pitch",
            "the pitch diameter must be larger than the jet diameter (the jet strikes buckets on the pitch circle)",
        )
        .into());
    }
    Ok(Some(Wheel {
        pitch_diameter,
        jets: jets as usize,
    }))
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write_refusing(values, report, read, model::solve, report::refusal, report::write)
}

#[cfg(test)]
mod tests {
    use super::model::*;
    use super::*;
    use crate::catalog::Solution;
    use crate::fluid::Fluid;
    use crate::units::STANDARD_GRAVITY;
    use approx::assert_relative_eq;
    use common::Jet;

    crate::calculators::testing::page_helpers!(super::KEY);

    fn out(s: &Solution, key: &str) -> f64 {
        s.output(key).map(|o| o.si).unwrap_or(f64::NAN)
    }

    const BASE: &[(&str, &str)] = &[
        ("fluid", "custom"),
        ("rho", "1000 kg/m3"),
        ("mu", "1 mPa.s"),
        ("flow_given", "v"),
        ("v", "30 m/s"),
        ("d_jet", "50 mm"),
    ];

    fn with(extra: &[(&'static str, &'static str)]) -> Vec<(&'static str, &'static str)> {
        let mut v: Vec<(&str, &str)> = BASE.to_vec();
        v.extend_from_slice(extra);
        v
    }

    fn water() -> Fluid {
        Fluid {
            name: "test".into(),
            density: 1000.0,
            viscosity: 1e-3,
            vapour_pressure: None,
        }
    }

    fn jet() -> Jet {
        Jet::from_si(0.05, 30.0)
    }

    #[test]
    fn keys_are_the_glossary_s_and_old_links_land_on_fields() {
        crate::calculators::testing::assert_glossary_keys(super::KEY);
    }

    #[test]
    fn translating_frame_matches_the_relative_velocity_momentum_balance() {
        // Derived from the definition: F_x = ρA(V − u)²(1 − k cos θ), F_y = −ρA(V − u)²k sin θ,
        // and the absolute exit velocity is W₂ + u.
        let vane = Vane { theta: 2.0, k: 0.85 };
        let (v, u) = (30.0, 11.0);
        let s = match vane_balance(&water(), &jet(), &vane, VaneKind::Single, u) {
            Ok(s) => s,
            Err(e) => panic!("{e}"),
        };
        let m = 1000.0 * jet().area.value * (v - u);
        assert_relative_eq!(
            s.force.x,
            m * (v - u) * (1.0 - 0.85 * 2.0f64.cos()),
            max_relative = 1e-12
        );
        assert_relative_eq!(s.force.y, -m * (v - u) * 0.85 * 2.0f64.sin(), max_relative = 1e-12);
        assert_relative_eq!(s.v_out.x, u + 0.85 * (v - u) * 2.0f64.cos(), max_relative = 1e-12);
        // Loss in the vane's frame: (1 − k²)W₁²/2g, from the engine's energy balance.
        assert_relative_eq!(
            s.head_loss,
            (1.0 - 0.85 * 0.85) * (v - u) * (v - u) / (2.0 * STANDARD_GRAVITY),
            max_relative = 1e-9
        );
    }

    #[test]
    fn wheel_is_the_single_vane_scaled_by_the_mass_flow_and_power_closes() {
        // The fixed-CV wheel balance (absolute velocities) and the moving-CV single-vane
        // balance (relative velocities) differ only in the mass flow turned.
        for (theta, k, u) in [(PI, 1.0, 15.0), (165f64.to_radians(), 0.9, 10.0), (1.2, 0.7, 25.0)] {
            let vane = Vane { theta, k };
            let single = vane_balance(&water(), &jet(), &vane, VaneKind::Single, u).map_err(|e| e.to_string());
            let wheel = vane_balance(&water(), &jet(), &vane, VaneKind::Wheel, u).map_err(|e| e.to_string());
            let (Ok(single), Ok(wheel)) = (single, wheel) else {
                panic!("balances fail")
            };
            let ratio = 30.0 / (30.0 - u);
            assert_relative_eq!(wheel.force.x, single.force.x * ratio, max_relative = 1e-8);
            assert_relative_eq!(
                wheel.force.y,
                single.force.y * ratio,
                max_relative = 1e-8,
                epsilon = 1e-6
            );
            // Euler (F_x·u) and energy (jet flux − carried off − vane loss) agree for
            // the wheel.
            let j = jet();
            let m = 1000.0 * j.flow.value;
            let from_energy = 0.5 * m * 30.0 * 30.0
                - 0.5 * m * wheel.v_out.dot(wheel.v_out)
                - 0.5 * m * (1.0 - k * k) * (30.0 - u) * (30.0 - u);
            assert_relative_eq!(wheel.power, from_energy, max_relative = 1e-8, epsilon = 1e-6);
        }
    }

    #[test]
    fn a_jet_as_fast_as_the_blades_pushes_nothing_and_its_checks_agree() {
        // W₁ = V − u = 0: no force (the closed form's zero). The balance's momentum
        // fluxes cancel to their rounding instead, which its check must take for
        // agreement (a fuzz-found request: water near boiling at 500 m/s typed in
        // ft/s, six jets on a wheel; the angles and diameters around it).
        let speed = "1640.4199475065616 ft/s";
        for (angle, d_jet) in [
            ("164.74343239543643 deg", "123.91678039510373 mm"),
            ("90 deg", "50 mm"),
            ("180 deg", "10 mm"),
            ("45 deg", "2 in"),
        ] {
            let s = solved(&[
                ("vane", "wheel"),
                ("jets", "6"),
                ("fluid", "water"),
                ("t", "211.81999999999994 degF"),
                ("angle", angle),
                ("d_jet", d_jet),
                ("flow_given", "v"),
                ("v", speed),
                ("u", speed),
            ]);
            let momentum_flux = out(&s, "mass_flow_turned") * 500.0;
            assert!(
                out(&s, "force_x").abs() <= 1e-12 * momentum_flux,
                "{angle}: {}",
                out(&s, "force_x")
            );
            assert!(s.checks.iter().all(|c| c.agrees()), "{angle}: {:?}", s.checks);
        }
    }

    #[test]
    fn searched_optima_are_at_a_third_and_a_half_of_the_jet_speed() {
        // Derived from the definition: d/du[(V − u)²u] = 0 at u = V/3; d/du[(V − u)u] = 0 at V/2.
        let s = solved(&with(&[
            ("vane", "single"),
            ("u", "10 m/s"),
            ("angle", "180 deg"),
            ("w_ratio", "1"),
        ]));
        assert_relative_eq!(out(&s, "u_best_single"), 10.0, max_relative = 1e-6);
        assert_relative_eq!(out(&s, "efficiency_best_single"), 16.0 / 27.0, max_relative = 1e-9);
        assert_relative_eq!(out(&s, "u_best_wheel"), 15.0, max_relative = 1e-6);
        assert_relative_eq!(out(&s, "efficiency_best_wheel"), 1.0, max_relative = 1e-9);
        // The plotted curves peak where the search says.
        let power = s
            .plots
            .iter()
            .find(|p| p.key == "power")
            .map(|p| p.series.clone())
            .unwrap_or_default();
        assert_eq!(power.len(), 2);
        let peak = |pts: &[[f64; 2]]| {
            pts.iter()
                .fold([0.0, f64::MIN], |a, p| if p[1] > a[1] { *p } else { a })
        };
        assert!((peak(&power[0].points)[0] - 10.0).abs() <= 30.0 / 40.0);
        assert!((peak(&power[1].points)[0] - 15.0).abs() <= 30.0 / 40.0);
    }

    #[test]
    fn force_and_power_agree_with_the_independent_paths_in_every_mode() {
        for mode in ["fixed", "single", "wheel"] {
            let s = solved(&with(&[
                ("vane", mode),
                ("u", "12 m/s"),
                ("angle", "150 deg"),
                ("w_ratio", "0.8"),
            ]));
            let labels: Vec<&str> = s.checks.iter().map(|c| c.label.as_str()).collect();
            assert!(
                labels.iter().any(|l| l.starts_with("Power delivered")),
                "{mode}: {labels:?}"
            );
            assert!(
                labels.iter().any(|l| l.starts_with("Force on the vane")),
                "{mode}: {labels:?}"
            );
            assert!(s.checks.iter().all(|c| c.agrees()), "{mode}: {:?}", s.checks);
            // The energy table lists terms only: no residual row restating the sum.
            let energy = s.tables.iter().find(|t| t.key == "energy").expect("energy table");
            assert!(!energy.rows.iter().any(|r| r[0].contains("residual")));
        }
        // Turned straight back the side force is 0, not 1e-16 of the flux.
        let back = solved(&with(&[("vane", "fixed"), ("angle", "180 deg"), ("w_ratio", "1")]));
        assert_eq!(out(&back, "force_y"), 0.0);
        // A fixed vane does no work: its efficiency is not applicable, and says why.
        assert!(back.output("efficiency").is_none());
        assert!(back
            .warnings
            .iter()
            .any(|w| w.message.starts_with("Efficiency: not applicable")));
    }

    #[test]
    fn blade_speed_errors_and_meanings() {
        let (field, message) = first_error(&with(&[("vane", "single"), ("u", "30 m/s")]));
        assert_eq!(field, "u");
        assert!(message.contains("less than the jet speed"), "{message}");
        let (field, message) = first_error(&with(&[("vane", "wheel"), ("u", "31 m/s")]));
        assert_eq!(field, "u");
        assert!(message.contains("outrun"), "{message}");
        let (field, _) = first_error(&with(&[("vane", "wheel"), ("u", "")]));
        assert_eq!(field, "u");
        assert_eq!(first_error(&with(&[("u", "-3 m/s")])).0, "u");
        // At the jet speed the ideal wheel runs away: zero force, stated.
        let s = solved(&with(&[("vane", "wheel"), ("u", "30 m/s")]));
        assert!(out(&s, "force_x").abs() < 1e-9);
        assert!(s.warnings.iter().any(|w| w.message.contains("runaway")));
        // A fixed vane ignores the hidden blade speed.
        let s = solved(&with(&[
            ("vane", "fixed"),
            ("u", "50 m/s"),
            ("angle", "180 deg"),
            ("w_ratio", "1"),
        ]));
        let q = jet().flow.value;
        assert_relative_eq!(out(&s, "force_x"), 2.0 * 1000.0 * q * 30.0, max_relative = 1e-12);
    }

    #[test]
    fn a_wheel_s_pitch_diameter_gives_its_speed_and_jets_multiply_power_and_flow() {
        let wheel = with(&[
            ("vane", "wheel"),
            ("u", "12 m/s"),
            ("angle", "165 deg"),
            ("d_pitch", "800 mm"),
            ("jets", "3"),
        ]);
        let s = solved(&wheel);
        // n = 60u/(πD): 12 m/s on a 0.8 m circle is 30 rad/s; best at V/D = 37.5 rad/s.
        assert_relative_eq!(out(&s, "speed"), 30.0, max_relative = 1e-12);
        assert_relative_eq!(out(&s, "speed_best"), 37.5, max_relative = 1e-6);
        assert_relative_eq!(out(&s, "power_all_jets"), 3.0 * out(&s, "power"), max_relative = 1e-12);
        assert_relative_eq!(out(&s, "flow_all_jets"), 3.0 * jet().flow.value, max_relative = 1e-12);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        // A fractional number of jets, or a pitch circle inside the jet, is refused.
        let mut bad = wheel.clone();
        bad.push(("jets", "2.5"));
        assert_eq!(first_error(&bad).0, "jets");
        let mut bad = wheel.clone();
        bad.push(("d_pitch", "40 mm"));
        assert_eq!(first_error(&bad).0, "d_pitch");
        // A jet over a sixth of the pitch diameter is warned about.
        let mut tight = wheel.clone();
        tight.push(("d_pitch", "250 mm"));
        assert!(solved(&tight).warnings.iter().any(|w| w.message.contains("a sixth")));
        // Without a pitch diameter there is no speed in rpm; a single vane has none.
        let mut none = wheel.clone();
        none.push(("d_pitch", ""));
        assert!(solved(&none).output("speed").is_none());
        assert!(
            solved(&with(&[("vane", "single"), ("u", "12 m/s"), ("d_pitch", "800 mm")]))
                .output("speed")
                .is_none()
        );
    }

    #[test]
    fn bad_jet_inputs_name_their_field() {
        let (field, message) = first_error(&with(&[("flow_given", "q"), ("q", "-2 L/s")]));
        assert_eq!(field, "q");
        assert!(message.contains("at least"), "{message}");
        assert_eq!(first_error(&with(&[("d_jet", "0 mm")])).0, "d_jet");
        // A flow that would make a jet faster than 500 m/s names the flow field.
        let (field, message) = first_error(&with(&[("flow_given", "q"), ("q", "90 m3/s")]));
        assert_eq!(field, "q");
        assert!(message.contains("500 m/s"), "{message}");
        // The smallest k and deflection accepted are physical, not 5e-324.
        assert_eq!(first_error(&with(&[("w_ratio", "1e-300")])).0, "w_ratio");
        assert_eq!(first_error(&with(&[("angle", "1e-300 deg")])).0, "angle");
        assert_eq!(first_error(&with(&[("w_ratio", "1.2")])).0, "w_ratio");
        assert_eq!(first_error(&with(&[("angle", "0 deg")])).0, "angle");
    }

    #[test]
    fn demo_solves_with_plots_and_a_diagram() {
        let s = solved(&[]);
        assert_eq!(s.plots.len(), 2);
        assert!(s
            .plots
            .iter()
            .all(|p| p.series.iter().all(|x| x.points.len() == PLOT_POINTS)));
        assert_eq!(s.diagrams.len(), 1);
        assert!(out(&s, "power") > 0.0);
        assert!(out(&s, "efficiency") > 0.0 && out(&s, "efficiency") < 1.0);
    }
}
