//! Nozzle on a flange: the end force on the flange joint, the jet reaction and the
//! discharge of a nozzle discharging a free jet to the atmosphere.
//!
//! # Method
//! A control volume is drawn around the fluid in the nozzle, cut at the flange face
//! (1, the pipe's bore) and at the vena contracta of the jet (j), where the jet's
//! pressure is atmospheric (zero gauge). The nozzle is described by its velocity
//! coefficient C_v = V_j / √(2(p₁/ρ + α₁V₁²/2)) and contraction coefficient
//! C_c = A_j / A_n; the discharge coefficient is C_d = C_c·C_v, so that
//! Q = C_d·A_n·√(2(p₁/ρ + α₁V₁²/2)). The energy balance between the faces is then
//!
//! p₁/ρ + α₁V₁²/2 = V_j²/2 + K·V_j²/2, with K = 1/C_v² − 1,
//!
//! which the engine solves for p₁ from a given flow. Given p₁ instead, the flow
//! follows from the same balance in closed form (with V₁ = V_j·A_j/A₁):
//!
//! V_j = √( (2p₁/ρ) / (1/C_v² − α₁(A_j/A₁)²) ).
//!
//! α₁ and β₁ are the kinetic-energy and momentum-flux factors of the approach flow
//! at the flange (uniform unless chosen: laminar, a power law, typed, or carried from
//! the velocity-profile page; [`common::profile_from`]); the jet is uniform.
//!
//! The linear-momentum balance ([`crate::engine`]) gives the force the pipe exerts
//! on the nozzle across the flange joint, R = −p₁A₁ + ṁ(V_j − β₁V₁) along the flow, so
//! the nozzle pulls on the joint with the **end force on the bore**
//! T = p₁A₁ − ṁ(V_j − β₁V₁), downstream. That is not the bolt load: the pressure also
//! acts between the flange faces out to the gasket reaction diameter G, and the bolts
//! carry the gasket load besides. When G is given the page reports the hydrostatic
//! end force of flange design, H = (π/4)·G²·p₁ = 0.785·G²·P (ASME BPVC Section VIII
//! Division 1, Mandatory Appendix 2, which adds the operating gasket load
//! H_p = 2b·π·G·m·P and the seating load W_m2 = π·b·G·y; from memory), with no
//! credit for the flow, which stops when the nozzle is shut or blocked. The **jet
//! reaction** on the line as a whole (a control volume from still fluid upstream to
//! the jet) is ṁ·V_j, pointing upstream; for an ideal nozzle fed from a large pipe it
//! is 2·p₁·A_n, the fire-service rule "1.57·d²·p" (lbf, in, psi).
//!
//! With the number of flange bolts, a size and a grade, [`bolts`] shares the end
//! force (at G, else on the bore, no credit for the flow) among the bolts and
//! compares each bolt's share with its allowable load S·A_s (ASME B1.1 and ISO 898-1
//! stress areas; ASME BPVC II-D and EN 13445-3 allowables).
//!
//! Checks shown to users: the end force on the bore against the closed form
//! p₁A₁ − ρQ(V_j − β₁V₁) with p₁ = ρ(V_j²/C_v² − α₁V₁²)/2 worked in plain arithmetic
//! (independent of the engine's balance); the jet reaction ṁV_j against the energy
//! form 2·C_v²·A_j·(p₁ + α₁ρV₁²/2) with the engine's p₁; and, with the pressure given,
//! the engine's p₁ against it. The first and last are relative to the terms that
//! cancel to them (ρQ(V_j + β₁V₁) and p₁A₁; the velocity heads), not to the result: a
//! nozzle nearly as wide as the bore leaves their rounding.
//!
//! Sources: the integral momentum and energy balances and nozzle coefficients as in
//! White, *Fluid Mechanics* (chapters 3 and 6), Munson et al., *Fundamentals of Fluid
//! Mechanics* (chapter 5); the nozzle-reaction and smooth-bore discharge rules of
//! fire-service hydraulics (NFPA, *Fire Protection Handbook*; IFSTA pump operator
//! manuals).
//!
//! # Layout
//! [`read`] turns the validated values into typed [`Inputs`] once; [`model::solve`]
//! is the physics, a pure function of them; `report` writes outputs, checks,
//! warnings, tables and the carry-over from the solved [`model::Nozzle`], and
//! `diagram` draws it.
//!
//! # Assumptions
//! Incompressible, steady flow; uniform pressure over the flange face; free jet to
//! atmosphere; horizontal axis (the weight of the nozzle and its water is carried
//! by the pipe supports and is not part of the end force along the axis).

use uom::si::f64::{Length, Ratio};

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::{FieldError, FieldErrors};
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M};

pub mod bolts;
mod diagram;
pub mod model;
mod report;

use model::{Given, Inputs};

pub const KEY: &str = "nozzle";
/// The page title.
pub const TITLE: &str = "End force and jet reaction at a flanged nozzle";

pub(crate) const GIVEN_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "p",
        label: "Pressure at the flange (find the flow)",
    },
    ChoiceOption {
        key: "q",
        label: "Flow (find the pressure)",
    },
];

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        quantity(
            "d",
            "Pipe inside diameter at the flange",
            Q::Length,
            "mm",
            "in",
            "154 mm",
            Limits::closed(1e-3, MAX_SIZE_M),
            "Bore of the pipe the nozzle is bolted to.",
        ),
        quantity(
            "d_nozzle",
            "Nozzle outlet diameter",
            Q::Length,
            "mm",
            "in",
            "38 mm",
            Limits::closed(1e-3, MAX_SIZE_M),
            "Diameter of the nozzle tip; not larger than the pipe.",
        ),
        choice(
            "flow_given",
            "Given",
            GIVEN_OPTIONS,
            "p",
            "Give the pressure upstream of the nozzle to find the flow, or the flow to find the pressure.",
        ),
        FieldSpec {
            visible_when: Some(("flow_given", &["p"])),
            ..quantity(
                "p",
                "Gauge pressure at the flange",
                Q::Pressure,
                "bar",
                "psi",
                "7 bar",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "Pressure in the pipe just upstream of the nozzle (the nozzle pressure). Gauge, so not below \
                        0.",
            )
        },
        FieldSpec {
            visible_when: Some(("flow_given", &["q"])),
            ..quantity(
                "q",
                "Flow through the nozzle",
                Q::VolumeFlow,
                "m3/h",
                "gpm",
                "90 m3/h",
                Limits::closed(0.0, 1e3),
                "Volumetric flow leaving the nozzle.",
            )
        },
        quantity(
            "cd",
            "Discharge coefficient C_d",
            Q::Ratio,
            "-",
            "-",
            "0.97",
            Limits::closed(0.3, 1.0),
            "Q = C_d·A_n·√(2·total head): about 0.96 to 0.99 for a smooth-bore nozzle, 0.61 for a sharp-edged \
                    orifice (common practice).",
        ),
        FieldSpec {
            optional: true,
            ..quantity(
                "cc",
                "Contraction coefficient C_c",
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(0.5, 1.0),
                "Jet area ÷ nozzle area, from 0.5 (a re-entrant Borda mouthpiece) to 1; empty means 1 (a \
                        smooth nozzle fills its tip). About 0.62 for a sharp-edged orifice.",
            )
        },
        FieldSpec {
            optional: true,
            ..quantity(
                "d_gasket",
                "Gasket reaction diameter G",
                Q::Length,
                "mm",
                "in",
                "",
                Limits::closed(1e-3, MAX_SIZE_M),
                // ASME BPVC VIII-1 Appendix 2's definition of G, quoted from memory.
                "Diameter at which the gasket reaction acts (ASME BPVC VIII-1 Appendix 2: the mean diameter of \
                        a narrow gasket contact, or the contact's outside diameter less 2b). Not smaller \
                        than the bore. Empty: the end force at the gasket is not shown.",
            )
        },
    ];
    fields.extend(bolts::fields());
    fields.extend(common::fluid_fields("15 degC"));
    fields.extend(common::profile_fields(&common::INLET_PROFILE));
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "End force on the flange joint, jet reaction and discharge of a nozzle, from the energy and momentum \
                balances with nozzle coefficients.",
        fields,
        outputs: vec![
            OutputSpec::headline(
                "end_force_bore",
                "End force on the flange joint over the bore, p₁A₁ − ṁ(V_j − V₁) (+: the nozzle pulls off)",
                Q::Force,
            ),
            OutputSpec {
                key: "end_force_gasket",
                label:
                    "Hydrostatic end force at the gasket reaction diameter, (π/4)·G²·p₁ (the bolts carry this plus the \
                    gasket load)",
                kind: Q::Force,
                headline: true,
            },
            OutputSpec::headline("jet_reaction", "Jet reaction on the line, ṁ·V_j, upstream", Q::Force),
            OutputSpec::headline("flow", "Discharge (volumetric flow)", Q::VolumeFlow),
            OutputSpec::listed("p_in", "Gauge pressure at the flange", Q::Pressure),
            OutputSpec::listed("v_jet", "Jet velocity at the vena contracta", Q::Velocity),
            OutputSpec::listed("v_pipe", "Mean velocity in the pipe", Q::Velocity),
            OutputSpec::listed("mass_flow", "Mass flow", Q::MassFlow),
            OutputSpec::listed("cv", "Velocity coefficient C_v = C_d ÷ C_c", Q::Ratio),
            OutputSpec::listed("k_nozzle", "Loss coefficient on the jet velocity, 1/C_v² − 1", Q::Ratio),
            OutputSpec::listed("head_loss", "Head loss in the nozzle", Q::Length),
            OutputSpec::listed("jet_diameter", "Jet diameter at the vena contracta", Q::Length),
            OutputSpec::listed("jet_power", "Kinetic power of the jet, ṁV_j²/2", Q::Power),
            OutputSpec::listed("pressure_force", "Pressure force on the flange face, p₁A₁", Q::Force),
            OutputSpec::listed("density", "Fluid density", Q::Density),
        ]
        .into_iter()
        .chain(bolts::outputs())
        .collect(),
        cautions: vec![
            // The Appendix 2 loads are quoted from memory of ASME BPVC VIII-1.
            "The end force is not the bolt load. Flange bolts carry the pressure out to the gasket reaction \
                    diameter G plus the gasket load: ASME BPVC Section VIII Division 1, Appendix 2 sizes them for the \
                    hydrostatic end force H = 0.785·G²·P plus the operating gasket load H_p = 2b·3.14·G·m·P, and for \
                    the seating load W_m2 = 3.14·b·G·y. Size bolts and flanges to the flange standard \
                    you work to, not to this page.",
            "A nozzle that is opened suddenly, or a jet that is shut off quickly, causes surge: the bolts and \
                    the line's restraint see more than the steady values shown.",
            "Defer to the local codes and a licensed engineer for the flange, its bolts and the line's \
                    restraint.",
            "The jet reaction acts on whatever holds the line (a monitor's base, a hose crew, a riser's \
                    anchor); a free hose whips. Never stand in line with a jet.",
        ],
    }
}

/// Reads the page's validated values into typed inputs, refusing a nozzle larger
/// than its pipe, a gasket inside the bore and C_d above C_c.
///
/// # Errors
/// The first inconsistent field, named, with the valid range.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let d_pipe: Length = values.typed("d")?;
    let d_nozzle: Length = values.typed("d_nozzle")?;
    let given = match values.choice("flow_given")? {
        "q" => Given::Flow(values.typed("q")?),
        _ => Given::Pressure(values.typed("p")?),
    };
    let cd: Ratio = values.typed("cd")?;
    let cc: Ratio = values
        .typed_opt("cc")
        .unwrap_or(Ratio::new::<uom::si::ratio::ratio>(1.0));
    let d_gasket: Option<Length> = values.typed_opt("d_gasket");
    let fluid = common::fluid_from(values)?;
    if d_gasket.is_some_and(|g| g < d_pipe) {
        return Err(FieldError::inconsistent(
            "d_gasket",
            "the gasket reaction diameter must not be smaller than the pipe bore",
        )
        .into());
    }
    if d_nozzle > d_pipe {
        return Err(FieldError::inconsistent(
            "d_nozzle",
            "the nozzle outlet must not be larger than the pipe it is bolted to",
        )
        .into());
    }
    if cd > cc {
        return Err(FieldError::inconsistent(
            "cd",
            format!(
                "C_d must not exceed C_c ({}): a velocity coefficient C_d/C_c above 1 would create energy",
                crate::units::format_significant(cc.value, 3)
            ),
        )
        .into());
    }
    let bolts = bolts::read(values)?;
    Ok(Inputs {
        bolts,
        d_pipe,
        d_nozzle,
        given,
        cd,
        cc,
        d_gasket,
        fluid,
        profile_in: common::profile_from(values, &common::INLET_PROFILE)?,
    })
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write_refusing(values, report, read, model::solve, report::refusal, report::write)
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn a_flow_beyond_the_incompressible_range_is_said_to_be_so() {
        // A nozzle 0.1 nm narrower than its bore, with 1 bar given: the ideal
        // Bernoulli flow is 223 700 m/s, which no liquid reaches incompressibly
        // (water's speed of sound is about 1480 m/s, a fact of the trade); a nozzle
        // a tenth narrower gives an ordinary fast line, warned about as such.
        let warnings = |d_nozzle: &str| {
            let s = solved(&[
                ("flow_given", "p"),
                ("p", "1 bar"),
                ("d", "100 mm"),
                ("d_nozzle", d_nozzle),
                ("cd", "1"),
            ]);
            s.warnings.iter().map(|w| w.message.clone()).collect::<Vec<_>>()
        };
        let wide = warnings("99.9999999 mm");
        assert!(
            wide.iter().any(|w| w.contains("incompressible balance does not hold")),
            "{wide:?}"
        );
        assert!(!wide.iter().any(|w| w.contains("check erosion")), "{wide:?}");
        let usual = warnings("90 mm");
        assert!(usual.iter().any(|w| w.contains("check erosion")), "{usual:?}");
        assert!(!usual.iter().any(|w| w.contains("incompressible")), "{usual:?}");
    }

    #[test]
    fn a_nozzle_nearly_as_wide_as_the_bore_pulls_nothing_and_its_checks_agree() {
        // V_j = V₁ and p₁ = 0 in the limit: the end force p₁A₁ − ρQ(V_j − V₁) is the
        // rounding of terms of order ρQV, which the check must not report as a
        // disagreement (a bore 0.1 nm wider than the nozzle).
        for (flow_given, key, value) in [("q", "q", "0.02 m3/s"), ("q", "q", "0.5 m3/s"), ("p", "p", "1 bar")] {
            let s = solved(&[
                ("flow_given", flow_given),
                (key, value),
                ("d", "100 mm"),
                ("d_nozzle", "99.9999999 mm"),
                ("cd", "1"),
            ]);
            let flow = s.output("flow").map(|o| o.si).unwrap_or(f64::NAN);
            let v = flow / (std::f64::consts::PI / 4.0 * 0.1 * 0.1);
            let end_force = s.output("end_force_bore").map(|o| o.si).unwrap_or(f64::NAN);
            assert!(end_force.abs() <= 1e-6 * 1000.0 * flow * v, "{value}: {end_force}");
            assert!(s.checks.iter().all(|c| c.agrees()), "{value}: {:?}", s.checks);
        }
    }

    #[test]
    fn keys_are_the_glossary_s_and_old_links_land_on_fields() {
        crate::calculators::testing::assert_glossary_keys(super::KEY);
    }

    #[test]
    fn pressure_and_flow_modes_agree() {
        let by_p = outcome(&[("flow_given", "p"), ("p", "6 bar")]).result.expect("solves");
        let q = by_p.output("flow").unwrap().si;
        let by_q = outcome(&[("flow_given", "q"), ("q", &format!("{q} m3/s"))])
            .result
            .expect("solves");
        assert_relative_eq!(by_q.output("p_in").unwrap().si, 6e5, max_relative = 1e-9);
        assert_relative_eq!(
            by_q.output("end_force_bore").unwrap().si,
            by_p.output("end_force_bore").unwrap().si,
            max_relative = 1e-9
        );
    }

    #[test]
    fn ideal_nozzle_end_force_matches_the_closed_form() {
        // Derived from the definition: C = 1, T = p1·A1 − ρQ(Vj − V1) with
        // p1 = ρ(Vj² − V1²)/2.
        let s = outcome(&[
            ("flow_given", "q"),
            ("q", "0.02 m3/s"),
            ("d", "100 mm"),
            ("d_nozzle", "50 mm"),
            ("cd", "1"),
            ("fluid", "custom"),
            ("rho", "1000 kg/m3"),
            ("mu", "1 mPa.s"),
        ])
        .result
        .expect("solves");
        let (a1, a2) = (std::f64::consts::PI * 0.01 / 4.0, std::f64::consts::PI * 0.0025 / 4.0);
        let (v1, v2) = (0.02 / a1, 0.02 / a2);
        let p1 = 500.0 * (v2 * v2 - v1 * v1);
        assert_relative_eq!(s.output("p_in").unwrap().si, p1, max_relative = 1e-12);
        assert_relative_eq!(
            s.output("end_force_bore").unwrap().si,
            p1 * a1 - 1000.0 * 0.02 * (v2 - v1),
            max_relative = 1e-12
        );
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let field = |pairs: &[(&str, &str)]| match outcome(pairs).result {
            Err(crate::SolveError::Fields(errors)) => errors[0].field.clone(),
            other => panic!("expected a field error, got {other:?}"),
        };
        assert_eq!(field(&[("d_nozzle", "200 mm")]), "d_nozzle");
        assert_eq!(field(&[("cd", "0.9"), ("cc", "0.62")]), "cd");
        assert_eq!(field(&[("p", "-1 bar")]), "p");
        assert_eq!(field(&[("cd", "0")]), "cd");
    }

    #[test]
    fn demo_matches_the_method_note_worked_example() {
        // site/notes/nozzle.md works the demo by hand: 148.5 m³/h, end force
        // 11.63 kN, jet reaction 1.50 kN.
        let s = outcome(&[]).result.expect("solves");
        assert_relative_eq!(s.output("flow").unwrap().si, 148.5 / 3600.0, max_relative = 5e-4);
        assert_relative_eq!(s.output("end_force_bore").unwrap().si, 11.63e3, max_relative = 5e-4);
        assert_relative_eq!(s.output("jet_reaction").unwrap().si, 1.50e3, max_relative = 5e-3);
    }

    #[test]
    fn extreme_accepted_inputs_show_finite_numbers() {
        let mut count = 0;
        for (d_pipe, d_nozzle) in [
            ("1 mm", "1 mm"),
            ("10 m", "1 mm"),
            ("10 m", "10 m"),
            ("154 mm", "38 mm"),
        ] {
            for (cd, cc) in [("0.3", "0.5"), ("1", ""), ("0.5", "0.5"), ("0.97", "1")] {
                for (given, value) in [
                    ("p", "0 bar"),
                    ("p", "100 MPa"),
                    ("q", "0 m3/h"),
                    ("q", "1000 m3/s"),
                    ("q", "1e-9 m3/s"),
                ] {
                    let key = if given == "p" { "p" } else { "q" };
                    let pairs = [
                        ("d", d_pipe),
                        ("d_nozzle", d_nozzle),
                        ("cd", cd),
                        ("cc", cc),
                        ("flow_given", given),
                        (key, value),
                        ("d_gasket", "10 m"),
                    ];
                    match outcome(&pairs).result {
                        Ok(s) => {
                            crate::calculators::profile::tests::clean(&s).unwrap_or_else(|e| panic!("{pairs:?}: {e}"));
                            count += 1;
                        }
                        Err(crate::SolveError::Fields(errors)) => {
                            assert!(
                                errors.iter().all(|e| ["q", "cd"].contains(&e.field.as_str())),
                                "{pairs:?}: {errors:?}"
                            )
                        }
                        Err(e) => panic!("{pairs:?}: {e}"),
                    }
                }
            }
        }
        assert!(count >= 50, "only {count} solved");
    }
}
