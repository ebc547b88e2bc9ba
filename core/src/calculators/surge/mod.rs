//! Surge from valve closure: the rise at a closing valve or dead end, the design
//! pressure it gives, its thrust, and the water-hammer load on a straight run
//! between two elbows.
//!
//! # Method
//! 1. **Wave speed** a, typed (`wave_given` = typed, `wave_speed`) or computed as the thrust-restraint
//!    page does ([`crate::restraint::pressure::wave_speed`]; Wylie & Streeter,
//!    *Fluid Transients in Systems*, 1993, eq. 2.21; Chaudhry, *Applied Hydraulic
//!    Transients*, 3rd ed., eq. 2.19 — forms from memory):
//!    a = √( (K/ρ) / (1 + c₁·K·D/(E·e)) ).
//! 2. **Round trip** 2L/a, L the pipe length from the valve to the reflecting
//!    boundary (a reservoir or a large main at constant head).
//! 3. **Rapid closure** (t_c ≤ 2L/a): the Joukowsky rise Δp = ρ·a·ΔV reaches the
//!    valve before relief returns (same sources).
//! 4. **Slow closure** (t_c > 2L/a): the Michaud estimate Δp ≈ 2ρ·L·ΔV/t_c, the
//!    column of length L decelerated uniformly over t_c (Wylie & Streeter and
//!    Chaudhry give it as the classical slow-closure estimate; from memory). It is
//!    smaller than ρ·a·ΔV exactly when t_c > 2L/a, and the two agree at t_c = 2L/a
//!    (recorded as a check). The page says plainly that this is an estimate and not a
//!    transient analysis: a real valve's flow falls mostly at the end of its stroke.
//! 5. **Design pressure** p + Δp, and the thrust at the closing valve or dead end:
//!    Δp·A (the transient part) and (p + Δp)·A, A on the bore for flanged or welded
//!    joints, on the outside diameter for push-on and mechanical joints
//!    ([`crate::restraint::Joint`]). A link carries the design pressure to the
//!    thrust-restraint page as a dead end.
//! 6. **Run between elbows**: while the pressure front lies between two elbows the
//!    run carries an unbalanced axial force. With the velocity falling linearly over
//!    t_c, the front is a·t_c long and the peak force is
//!    F = A·ρ·a·ΔV·min(1, L_run/(a·t_c)) (the full Joukowsky step for a sharp front).
//!    The force rises, holds for |L_run/a − t_c| and falls: it lasts L_run/a + t_c,
//!    and its impulse is A·ρ·a·ΔV·L_run/a = A·ρ·ΔV·L_run whatever the front's length.
//!    That impulse, from the force history, is checked against the momentum of the
//!    liquid in the run, ρ·A·L_run·ΔV (impulse–momentum, an independent path).
//!
//! # Field keys
//! `size`, `d`, `od`, `joint`, `wave_given` (computed or typed), `wave_speed`, `material`,
//! `e_pipe`, `wall`, `anchoring`, `bulk_modulus`; `fluid`, `t`, `rho`, `mu`; `dv`
//! (the velocity stopped) or `q` (the flow stopped, ΔV = Q/A on the bore), `length`
//! (to the reflecting boundary), `closure_time`, `p` (working pressure, gauge),
//! `run_length`.
//!
//! # Assumptions
//! A single pipe of uniform size and wave speed; friction, line packing and cavitation
//! neglected; a velocity falling linearly in time for the slow-closure estimate and
//! the run's force history; the reflecting boundary holds its head. Pumps, air
//! valves, branches, column separation and closures far from linear need a transient
//! analysis (method of characteristics).

use crate::catalog::{CalculatorSpec, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::pipe_sizes;
use crate::restraint::{Joint, JOINT_HELP};
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA};

pub mod diagram;
pub mod model;
pub mod report;

pub const KEY: &str = "surge";

const LENGTH_HELP: &str = "Pipe length from the closing valve to the reflecting boundary (a reservoir, a tank or a \
    large main at constant head). Sets the round trip 2L/a.";
const CLOSURE_HELP: &str = "Effective closure time of the valve. Faster than 2L/a: the full Joukowsky rise. Slower: \
    the slow-closure estimate, which is not a transient analysis.";
const RUN_HELP: &str = "Length of a straight run between two elbows on the line. While the front is on it, the run \
    carries an unbalanced axial force its supports or anchors must hold.";
const DV_HELP: &str = "The flow velocity stopped by the closure (the mean velocity in the pipe before closure). \
    Leave it empty to give the flow instead.";
const Q_HELP: &str = "The flow stopped by the closure, instead of the velocity: ΔV = Q ÷ bore area. Give one of \
    the two, not both.";
const SLOW_CAUTION: &str = "A slow-closure estimate is not a transient analysis: valves close most of their flow in \
    the last part of the stroke, and pumps, air, branches and column separation change the surge. For a design \
    surge, have a transient analysis made.";
const RUN_CAUTION: &str = "The run load acts along the run and reverses as reflections return: restrain the run \
    axially at both elbows, or anchor it, for the force shown in both directions.";

const SIZE_HELP: &str = "A preset gives both diameters and the wall material, from the dimension standards (steel: \
    ASME B36.10M; ductile iron: AWWA C150/C151 class 52; PVC: AWWA C900 DR18); typed diameters below override it.";
const OD_HELP: &str = "Outside diameter of the pipe (the thrust area for push-on and mechanical joints).";
const MATERIAL_HELP: &str = "Sets Young's modulus E and Poisson's ratio ν of the wall; by default the material of \
    the size preset. Not used when the wave speed is typed.";
const P_HELP: &str = "The steady pressure at the valve before it closes.";
pub const TITLE: &str = "Surge at a closing valve and the load between elbows";
const SUMMARY: &str = "Joukowsky or slow-closure surge from the closure time and 2L/a, the design pressure and \
    thrust at the closing valve, and the water-hammer force, duration and impulse on a run between elbows.";
const THRUST_LABEL: &str = "Total thrust at the valve or dead end (p + Δp)·A";
const THRUST_SURGE_LABEL: &str = "Transient thrust Δp·A at the valve or dead end";
const RUN_TRANSIT_LABEL: &str = "Transit time of the front along the run L_run/a";

pub fn spec() -> CalculatorSpec {
    let computed = Some((
        "material",
        &["from_size", "steel", "ductile_iron", "pvc", "pe", "custom"][..],
    ));
    let mut fields = vec![
        choice("size", "Pipe size", pipe_sizes::SIZE_OPTIONS, "di52_12", SIZE_HELP),
        common::diameter_override("d", "Inside diameter (overrides the preset)", "Bore of the pipe."),
        common::diameter_override("od", "Outside diameter (overrides the preset)", OD_HELP),
        choice(
            "joint",
            "Joints at the closing valve or dead end",
            Joint::OPTIONS,
            Joint::Flanged.key(),
            JOINT_HELP,
        ),
    ];
    fields.extend(common::wave_given_fields(None));
    fields.extend(common::wave_speed_fields(None, computed, MATERIAL_HELP));
    fields.extend(common::fluid_fields("15 degC"));
    fields.extend([
        FieldSpec {
            optional: true,
            ..quantity(
                "dv",
                "Flow velocity stopped",
                Q::Velocity,
                "m/s",
                "ft/s",
                "1.2 m/s",
                Limits::closed(0.0, 50.0),
                DV_HELP,
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "q",
                "Or: flow stopped",
                Q::VolumeFlow,
                "m3/h",
                "gpm",
                "",
                Limits::closed(0.0, 1e3),
                Q_HELP,
            )
        },
        quantity(
            "length",
            "Pipe length to the reflecting boundary L",
            Q::Length,
            "m",
            "ft",
            "850 m",
            Limits::closed(1.0, 1e4),
            LENGTH_HELP,
        ),
        quantity(
            "closure_time",
            "Valve closure time t_c",
            Q::Time,
            "s",
            "s",
            "4 s",
            Limits::closed(1e-3, 1e5),
            CLOSURE_HELP,
        ),
        quantity(
            "p",
            "Working pressure before closure, gauge",
            Q::Pressure,
            "bar",
            "psi",
            "7 bar",
            Limits::closed(0.0, MAX_PRESSURE_PA),
            P_HELP,
        ),
        quantity(
            "run_length",
            "Straight run between two elbows L_run",
            Q::Length,
            "m",
            "ft",
            "60 m",
            Limits::closed(0.01, 1e4),
            RUN_HELP,
        ),
    ]);
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: SUMMARY,
        fields,
        outputs: vec![
            OutputSpec {
                key: "p_design",
                label: "Design pressure: working + surge",
                kind: Q::Pressure,
                headline: true,
            },
            OutputSpec {
                key: "dp_surge",
                label: "Surge used",
                kind: Q::Pressure,
                headline: true,
            },
            OutputSpec {
                key: "thrust",
                label: THRUST_LABEL,
                kind: Q::Force,
                headline: true,
            },
            OutputSpec {
                key: "run_force",
                label: "Peak force on the run between elbows",
                kind: Q::Force,
                headline: true,
            },
            OutputSpec {
                key: "wave_speed",
                label: "Pressure wave speed a",
                kind: Q::Velocity,
                headline: false,
            },
            OutputSpec {
                key: "round_trip",
                label: "Round trip of the wave 2L/a",
                kind: Q::Time,
                headline: false,
            },
            OutputSpec {
                key: "dp_joukowsky",
                label: "Joukowsky rise ρ·a·ΔV (rapid closure)",
                kind: Q::Pressure,
                headline: false,
            },
            OutputSpec {
                key: "dp_slow",
                label: "Slow-closure estimate 2ρLΔV/t_c",
                kind: Q::Pressure,
                headline: false,
            },
            OutputSpec {
                key: "thrust_surge",
                label: THRUST_SURGE_LABEL,
                kind: Q::Force,
                headline: false,
            },
            OutputSpec {
                key: "area_d",
                label: "Diameter of the thrust area",
                kind: Q::Length,
                headline: false,
            },
            OutputSpec {
                key: "thrust_area",
                label: "Thrust area",
                kind: Q::Area,
                headline: false,
            },
            OutputSpec {
                key: "run_transit",
                label: RUN_TRANSIT_LABEL,
                kind: Q::Time,
                headline: false,
            },
            OutputSpec {
                key: "run_duration",
                label: "Duration of the run load L_run/a + t_c",
                kind: Q::Time,
                headline: false,
            },
        ],
        cautions: vec![SLOW_CAUTION, RUN_CAUTION],
    }
}

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let inputs = model::read(values)?;
    let solved = model::solve(&inputs);
    report::write(&inputs, &solved, report);
    Ok(())
}

#[cfg(test)]
mod tests {
    use crate::catalog::Request;
    use crate::units::UnitSystem;
    use approx::assert_relative_eq;

    fn request(pairs: &[(&str, &str)]) -> Request {
        crate::catalog::demo_request(&super::spec(), pairs)
    }

    fn solve(pairs: &[(&str, &str)]) -> crate::catalog::Solution {
        crate::calculators::testing::solved(super::KEY, pairs)
    }

    fn get(s: &crate::catalog::Solution, k: &str) -> f64 {
        s.output(k).map(|o| o.si).unwrap_or(f64::NAN)
    }

    #[test]
    fn demo_solves_in_both_unit_systems_with_agreeing_checks() {
        let mut r = request(&[]);
        for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
            r.system = system;
            let s = crate::solve(super::KEY, &r).result.expect("demo solves");
            assert!(s.defects.is_empty(), "{:?}", s.defects);
            assert!(
                s.checks.len() >= 2 && s.checks.iter().all(|c| c.agrees()),
                "{:?}",
                s.checks
            );
        }
    }

    #[test]
    fn typed_wave_speed_rapid_closure_gives_joukowsky() {
        // Derived from the definition: Δp = ρ·a·ΔV = 1000 × 1000 × 2 = 2 MPa.
        let s = solve(&[
            ("fluid", "custom"),
            ("rho", "1000 kg/m3"),
            ("mu", "1 mPa.s"),
            ("wave_given", "typed"),
            ("wave_speed", "1000 m/s"),
            ("dv", "2 m/s"),
            ("length", "1000 m"),
            ("closure_time", "1 s"),
            ("p", "5 bar"),
        ]);
        assert_relative_eq!(get(&s, "dp_surge"), 2e6, max_relative = 1e-12);
        assert_relative_eq!(get(&s, "p_design"), 2.5e6, max_relative = 1e-12);
        assert!(s.output("dp_slow").is_none());
    }

    #[test]
    fn slow_closure_uses_the_smaller_michaud_estimate_and_says_so() {
        // 2ρLΔV/t_c = 2 × 1000 × 1000 × 2 / 10 = 400 kPa < 2 MPa.
        let s = solve(&[
            ("fluid", "custom"),
            ("rho", "1000 kg/m3"),
            ("mu", "1 mPa.s"),
            ("wave_given", "typed"),
            ("wave_speed", "1000 m/s"),
            ("dv", "2 m/s"),
            ("length", "1000 m"),
            ("closure_time", "10 s"),
        ]);
        assert_relative_eq!(get(&s, "dp_surge"), 4e5, max_relative = 1e-12);
        assert!(s
            .warnings
            .iter()
            .any(|w| w.message.contains("not a transient analysis")));
    }

    #[test]
    fn the_run_load_peak_is_cut_when_the_front_is_longer_than_the_run() {
        // Front a·t_c = 1000 m over a 100 m run: peak = A·ρaΔV·0.1, lasting 0.1 + 1 s.
        let pairs = [
            ("fluid", "custom"),
            ("rho", "1000 kg/m3"),
            ("mu", "1 mPa.s"),
            ("size", "custom"),
            ("d", "200 mm"),
            ("od", "220 mm"),
            ("joint", "flanged"),
            ("wave_given", "typed"),
            ("wave_speed", "1000 m/s"),
            ("dv", "1 m/s"),
            ("run_length", "100 m"),
            ("closure_time", "1 s"),
        ];
        let s = solve(&pairs);
        let area = std::f64::consts::PI * 0.2 * 0.2 / 4.0;
        assert_relative_eq!(get(&s, "run_force"), area * 1e6 * 0.1, max_relative = 1e-12);
        assert_relative_eq!(get(&s, "run_duration"), 1.1, max_relative = 1e-12);
        assert_relative_eq!(get(&s, "run_transit"), 0.1, max_relative = 1e-12);
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let field = |pairs: &[(&str, &str)]| crate::calculators::testing::error_field(super::KEY, pairs);
        assert_eq!(field(&[("size", "custom")]), "d");
        assert_eq!(
            field(&[("size", "custom"), ("d", "300 mm"), ("od", "320 mm")]),
            "material"
        );
        assert_eq!(field(&[("closure_time", "0 s")]), "closure_time");
        assert_eq!(field(&[("length", "-5 m")]), "length");
        assert_eq!(field(&[("wall", "200 mm")]), "wall");
        assert_eq!(field(&[("dv", "")]), "dv");
        assert_eq!(field(&[("q", "100 m3/h")]), "q");
    }

    #[test]
    fn a_flow_gives_the_velocity_over_the_bore() {
        // Derived from the definition: ΔV = Q/A = 0.1 m³/s ÷ (π/4 × 0.2² m²).
        let s = solve(&[
            ("fluid", "custom"),
            ("rho", "1000 kg/m3"),
            ("mu", "1 mPa.s"),
            ("size", "custom"),
            ("d", "200 mm"),
            ("od", "220 mm"),
            ("wave_given", "typed"),
            ("wave_speed", "1000 m/s"),
            ("dv", ""),
            ("q", "360 m3/h"),
            ("closure_time", "0.1 s"),
        ]);
        let dv = 0.1 / (std::f64::consts::PI * 0.2 * 0.2 / 4.0);
        assert_relative_eq!(get(&s, "dp_joukowsky"), 1e6 * dv, max_relative = 1e-9);
    }

    #[test]
    fn the_carry_over_gives_the_thrust_restraint_page_the_design_pressure() {
        let s = solve(&[]);
        let link = &s.carry_over[0];
        assert_eq!(link.calculator, "thrust-block");
        let p = link
            .inputs
            .iter()
            .find(|(k, _)| *k == "p")
            .map(|(_, v)| v.clone())
            .unwrap_or_default();
        let pairs: Vec<(&str, &str)> = link.inputs.iter().map(|(k, v)| (*k, v.as_str())).collect();
        let block = crate::calculators::testing::solved("thrust-block", &pairs);
        assert!(!p.is_empty());
        assert_relative_eq!(get(&block, "p_design"), get(&s, "p_design"), max_relative = 1e-4);
        assert_relative_eq!(get(&block, "thrust"), get(&s, "thrust"), max_relative = 1e-4);
    }
}
