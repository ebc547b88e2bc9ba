//! Pieces shared by the calculators. Nothing here is specific to one fitting.
//!
//! - [`fields`]: field constructors, fluid, flow and jet fields and their readers;
//! - [`tables`]: the momentum ledger, ports and basis tables;
//! - [`drawing`]: pipe bands, arrows, hulls and bounds;
//! - here: engine-error mapping, warnings, and the carry-over of a thrust to the
//!   thrust-restraint page.
//!
//! Root finding and peak search live in [`crate::numeric`]. Every item is
//! re-exported here, so `common::ledger_table`, `common::jet_fields`,
//! `common::peak_of` … keep working.

use crate::catalog::Report;
use crate::engine::{Balance, EngineError, EngineWarning};
use crate::error::FieldError;
use crate::units::{self, QuantityKind};
use crate::vector::Vec3;

use QuantityKind as Q;

pub mod drawing;
pub mod fields;
pub mod tables;
pub mod wall;

pub use crate::numeric::peak_of;
pub use drawing::*;
pub use fields::*;
pub use tables::*;
pub use wall::{read_elastic, read_wave, wave_given_fields, wave_speed_fields, Elastic, WaveGiven};

/// Maps an engine error onto the field most responsible for it.
pub fn engine_error(err: EngineError, field: &'static str) -> Vec<FieldError> {
    vec![FieldError::inconsistent(field, err.to_string())]
}

/// Copies engine warnings into the report.
pub fn forward_warnings(balance: &Balance, report: &mut Report<'_>) {
    for w in &balance.warnings {
        let field = match w {
            EngineWarning::BelowVapourPressure { .. } => Some("p"),
            _ => None,
        };
        report.warn(field, w.to_string());
    }
}

/// Speed of sound in water near room temperature, m/s: about 1480 (a fact of the
/// trade, from memory; 1482 m/s at 20 °C in the usual tables).
const WATER_SPEED_OF_SOUND: f64 = 1480.0;

/// Warns when a pipe velocity is outside the usual design range for water lines.
/// Common practice, no single source: about 0.5–3 m/s in mains, up to about 5 m/s in
/// plant and fire-water piping; faster lines see erosion, noise and larger surges.
/// Beyond [`fields::MAX_JET_SPEED`], a third of water's speed of sound
/// ([`WATER_SPEED_OF_SOUND`]), the liquid's compressibility is no longer small and
/// the incompressible balances of these pages do not hold: that is said instead (a
/// nozzle nearly as wide as its bore, with a pressure given, reaches it).
pub fn pipe_velocity_warning(report: &mut Report<'_>, field: &'static str, place: &str, speed: f64) {
    if speed > fields::MAX_JET_SPEED {
        let text = report.fmt(speed, Q::Velocity);
        let limit = report.fmt(fields::MAX_JET_SPEED, Q::Velocity);
        let sound = report.fmt(WATER_SPEED_OF_SOUND, Q::Velocity);
        report.warn(
            Some(field),
            format!(
                "the velocity at the {place} is {text}, beyond {limit}: the liquid's compressibility matters there \
                (water's speed of sound is about {sound}) and this page's incompressible balance does not hold; the \
                result is not physical, check the inputs"
            ),
        );
    } else if speed > 5.0 {
        let text = report.fmt(speed, Q::Velocity);
        report.warn(
            Some(field),
            format!(
                "the velocity at the {place} is {text}, above the usual 3 to 5 m/s for water piping: check erosion, \
                noise and surge (common practice)"
            ),
        );
    }
}

/// A force typed as a user would type it, in the report's unit system, five
/// significant figures (`"83.47 kN"`), for carrying a result to another page.
pub fn typed_force(report: &Report<'_>, newtons: f64) -> String {
    let unit = units::display_unit(newtons, Q::Force, report.system());
    match units::convert_to(newtons, Q::Force, unit.id) {
        Some(v) if v.is_finite() => format!("{} {}", units::format_significant(v, 5), unit.id),
        _ => format!("{} N", units::format_significant(newtons, 5)),
    }
}

/// A link that carries a fitting's thrust to the thrust-restraint page as "a given
/// thrust": its magnitude (N) and its angle above the horizontal (radians, + up),
/// which also picks that page's block type (bearing block, gravity block, sag).
pub fn thrust_carry_over(report: &Report<'_>, label: &str, thrust: f64, elevation: f64) -> crate::catalog::CarryOver {
    let degrees = if elevation.is_finite() {
        elevation.to_degrees()
    } else {
        0.0
    };
    let plane = if degrees > 1.0 {
        "vertical_crest"
    } else if degrees < -1.0 {
        "vertical_sag"
    } else {
        "horizontal"
    };
    crate::catalog::CarryOver {
        calculator: "thrust-block",
        label: label.to_string(),
        inputs: vec![
            ("fitting", "force".to_string()),
            ("thrust", typed_force(report, thrust)),
            ("thrust_elev", format!("{} deg", units::format_significant(degrees, 4))),
            ("plane", plane.to_string()),
        ],
    }
}

/// The extra force of a push-on or mechanical joint at one port: its pressure also
/// acts on the annulus between the bore and the outside diameter, −p·(A_OD − A)·n,
/// with n the port's outward normal. Added to the engine as a named extra force so
/// the ledger shows it as its own term.
pub fn joint_annulus_force(pressure: f64, bore_area: f64, outside_area: f64, outward_normal: Vec3) -> Vec3 {
    outward_normal * (-pressure * (outside_area - bore_area))
}

/// Adds the joint-annulus force of every `(port, outside diameter)` to the control
/// volume, from the pressures of a solved `balance` ([`joint_annulus_force`]): push-on
/// and mechanical joints seal on the outside diameter, so the port's pressure also
/// acts on the wall annulus. Each is a named extra force (its own ledger term); they
/// change no pressure or flow, so the caller balances once more to include them.
pub fn add_joint_annulus_forces(
    cv: &mut crate::engine::ControlVolume,
    balance: &Balance,
    outside: impl IntoIterator<Item = (usize, f64)>,
) {
    for (port, od) in outside {
        let state = &balance.ports[port];
        let force = joint_annulus_force(
            state.pressure,
            state.area,
            circle_area(od),
            cv.ports[port].outward_normal(),
        );
        let (name, at) = (cv.ports[port].name.to_string(), cv.ports[port].position);
        cv.extra_force(
            &format!("{name} joint, pressure on the wall annulus to the OD"),
            force,
            at,
        );
    }
}

/// Every quantity field of the restraint pages at the ends of its range, alone and
/// all together, in both unit systems and in each plane, fitting and area basis:
/// an accepted request must give finite outputs, agreeing checks, and tables and
/// diagrams free of NaN, ±inf and "—".
#[cfg(test)]
mod extremes {
    use crate::catalog::{demo_request, FieldKind, Limits, Request, Shape, Solution};
    use crate::units::{self, UnitSystem};

    /// Field overrides of one scenario of a page.
    type Scenario = &'static [(&'static str, &'static str)];

    const PAGES: &[(&str, &[Scenario])] = &[
        (
            super::super::bend::KEY,
            &[
                &[],
                &[("plane", "vertical_sag")],
                &[("plane", "vertical_crest")],
                &[("joint", "push_on")],
            ],
        ),
        (
            super::super::reducer::KEY,
            &[
                &[],
                &[("flow_dir", "upward")],
                &[("joint", "push_on")],
                &[("loss", "none")],
            ],
        ),
        (super::super::dead_end::KEY, &[&[], &[("joint", "flanged")]]),
        (
            super::super::thrust_block::KEY,
            &[
                &[],
                &[("plane", "vertical_crest"), ("legs", "one_level")],
                &[("plane", "vertical_sag"), ("legs", "one_level")],
                &[("plane", "vertical_sag")],
                &[("fitting", "force"), ("thrust", "10 kN")],
                &[
                    ("fitting", "force"),
                    ("thrust", "10 kN"),
                    ("plane", "vertical_crest"),
                    ("thrust_elev", "40 deg"),
                ],
                &[("fitting", "tee"), ("size2", "di52_8")],
                &[("fitting", "reducer"), ("size2", "di52_8")],
                &[("fitting", "dead_end"), ("joint", "welded"), ("block_dims", "aspect")],
                &[("p_basis", "test"), ("test_rule", "en805")],
            ],
        ),
        (
            super::super::restrained_length::KEY,
            &[
                &[],
                &[("plane", "vertical_crest")],
                &[("fitting", "tee"), ("run_restrained", "5 m")],
                &[("fitting", "reducer")],
                &[("fitting", "dead_end"), ("encasement", "polyethylene")],
            ],
        ),
        (super::super::line_schedule::KEY, &[&[]]),
    ];

    fn typed(limits: Limits, kind: crate::units::QuantityKind, unit: &str, high: bool) -> Option<String> {
        let si = match (high, limits.min_inclusive) {
            (true, _) => limits.max,
            (false, true) => limits.min,
            (false, false) => limits.min + (limits.max - limits.min) * 1e-9,
        };
        let v = units::convert_to(si, kind, unit)?;
        Some(format!("{v:e} {unit}"))
    }

    pub(super) fn faults(s: &Solution) -> Vec<String> {
        let mut out: Vec<String> = s.defects.clone();
        for c in s.checks.iter().filter(|c| !c.agrees()) {
            out.push(format!("check disagrees: {c:?}"));
        }
        for t in &s.tables {
            for cell in t.rows.iter().flatten() {
                let lower = cell.to_ascii_lowercase();
                let bad_word = lower
                    .split(|c: char| !c.is_ascii_alphanumeric())
                    .any(|w| w == "nan" || w == "inf" || w == "infinity");
                if cell.trim() == "—" || bad_word {
                    out.push(format!("table {}: cell '{cell}'", t.key));
                }
            }
        }
        for d in &s.diagrams {
            if d.bounds.iter().any(|b| !b.is_finite()) || d.bounds[2] <= d.bounds[0] || d.bounds[3] <= d.bounds[1] {
                out.push(format!("diagram bounds {:?}", d.bounds));
            }
            for shape in &d.shapes {
                let finite = super::shape_points(shape).iter().flatten().all(|v| v.is_finite())
                    && !matches!(shape, Shape::Circle { radius, .. } if !radius.is_finite());
                if !finite {
                    out.push(format!("diagram shape {shape:?}"));
                }
            }
        }
        for p in &s.plots {
            if p.series
                .iter()
                .flat_map(|s| s.points.iter())
                .flatten()
                .any(|v| !v.is_finite())
            {
                out.push(format!("plot {}", p.key));
            }
        }
        out
    }

    #[test]
    fn restraint_pages_stay_finite_at_the_ends_of_every_range() {
        let mut solved = 0;
        let mut tried = 0;
        let mut problems = Vec::new();
        for (key, scenarios) in PAGES {
            let spec = super::super::spec(key).expect("registered");
            for scenario in *scenarios {
                for (field, value) in *scenario {
                    let known = spec.fields.iter().find(|f| f.key == *field);
                    assert!(
                        known.is_some(),
                        "{key}: scenario field '{field}' is not a field of the page"
                    );
                    if let Some(FieldKind::Choice(options)) = known.map(|f| &f.kind) {
                        assert!(
                            options.iter().any(|o| o.key == *value),
                            "{key}: '{value}' is not an option of '{field}'"
                        );
                    }
                }
                for system in [UnitSystem::Si, UnitSystem::UsCustomary] {
                    let base = demo_request(&spec, scenario);
                    let quantities: Vec<_> = spec
                        .fields
                        .iter()
                        .filter_map(|f| match (&f.kind, f.limits) {
                            (FieldKind::Quantity(kind), Some(limits)) if !f.si_unit.is_empty() => {
                                Some((f.key, *kind, limits, f.si_unit))
                            }
                            _ => None,
                        })
                        .collect();
                    let mut requests: Vec<(String, Request)> = Vec::new();
                    for high in [false, true] {
                        let mut all = base.clone();
                        for (field, kind, limits, unit) in &quantities {
                            let Some(text) = typed(*limits, *kind, unit, high) else {
                                continue;
                            };
                            let mut one = base.clone();
                            one.inputs.insert(field.to_string(), text.clone());
                            requests.push((format!("{field}={text}"), one));
                            all.inputs.insert(field.to_string(), text);
                        }
                        requests.push((format!("all {}", if high { "max" } else { "min" }), all));
                    }
                    for (what, mut request) in requests {
                        request.system = system;
                        tried += 1;
                        if let Ok(s) = crate::solve(key, &request).result {
                            solved += 1;
                            for fault in faults(&s) {
                                problems.push(format!("{key} {scenario:?} {what}: {fault}"));
                            }
                        }
                    }
                }
            }
        }
        assert!(
            problems.is_empty(),
            "{} problems, e.g.\n{}",
            problems.len(),
            problems[..problems.len().min(15)].join("\n")
        );
        // Most single-field extremes are accepted; a test that solved nothing tests nothing.
        assert!(solved * 2 > tried, "only {solved} of {tried} requests solved");
    }
}

/// Random requests to the restraint pages (fixed seed, so a failure repeats).
#[cfg(test)]
mod random_requests {
    use crate::catalog::{demo_request, FieldKind};
    use crate::units::UnitSystem;

    /// A small deterministic generator (64-bit LCG, Knuth's MMIX constants).
    struct Lcg(u64);
    impl Lcg {
        fn next(&mut self) -> f64 {
            self.0 = self
                .0
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            (self.0 >> 11) as f64 / (1u64 << 53) as f64
        }
    }

    /// Random requests to the restraint pages: every choice drawn from its options,
    /// every quantity log-uniform (or uniform where the range starts at 0 or below)
    /// within its limits. Accepted requests must be free of defects and failed
    /// checks, and a fair share must be accepted.
    #[test]
    fn random_requests_to_the_restraint_pages_stay_finite() {
        let mut rng = Lcg(0x5eed_0008);
        let mut problems = Vec::new();
        let (mut tried, mut solved) = (0, 0);
        for key in ["bend", "reducer", "dead-end", "thrust-block", "line-schedule"] {
            let spec = super::super::spec(key).expect("registered");
            for n in 0..1500 {
                let mut request = demo_request(&spec, &[]);
                request.system = if n % 2 == 0 {
                    UnitSystem::Si
                } else {
                    UnitSystem::UsCustomary
                };
                for field in &spec.fields {
                    if rng.next() < 0.5 {
                        continue; // keep the demo value for half the fields
                    }
                    let text = match (&field.kind, field.limits) {
                        (FieldKind::Choice(options), _) => options
                            [((rng.next() * options.len() as f64) as usize).min(options.len() - 1)]
                        .key
                        .to_string(),
                        (FieldKind::Quantity(kind), Some(l)) if !field.si_unit.is_empty() => {
                            let u = rng.next();
                            let si = if l.min > 0.0 {
                                (l.min.ln() + u * (l.max.ln() - l.min.ln())).exp()
                            } else if u < 0.1 {
                                l.min.max(0.0)
                            } else {
                                let lo = l.max * 1e-6;
                                (lo.ln() + rng.next() * (l.max.ln() - lo.ln())).exp()
                            };
                            match crate::units::convert_to(si, *kind, field.si_unit) {
                                Some(v) => format!("{v:e} {}", field.si_unit),
                                None => continue,
                            }
                        }
                        _ => continue,
                    };
                    request.inputs.insert(field.key.to_string(), text);
                }
                tried += 1;
                if let Ok(s) = crate::solve(key, &request).result {
                    solved += 1;
                    for fault in super::extremes::faults(&s) {
                        problems.push(format!("{key} {:?}: {fault}", request.inputs));
                    }
                }
            }
        }
        assert!(
            problems.is_empty(),
            "{} problems, e.g.\n{}",
            problems.len(),
            problems[..problems.len().min(5)].join("\n\n")
        );
        assert!(solved * 4 > tried, "only {solved} of {tried} random requests solved");
        println!("restraint pages: {solved} of {tried} random requests solved");
    }
}

/// The restraint pages speak the glossary: every field key is a glossary term, every
/// option of a choice is an option of its term, no page uses a retired key of its
/// own alias table, and an old bookmarked link, read through the alias table,
/// gives the same result as today's link.
#[cfg(test)]
mod glossary_keys {
    use crate::catalog::{demo_request, FieldKind, Request};
    use crate::glossary::{self, KEY_ALIASES};

    const PAGES: &[&str] = &["bend", "reducer", "dead-end", "thrust-block", "line-schedule"];

    #[test]
    fn the_restraint_pages_use_glossary_keys_and_options_only() {
        let mut problems = Vec::new();
        for page in PAGES {
            let spec = super::super::spec(page).expect("registered");
            for field in &spec.fields {
                let Some(term) = glossary::term_of(field.key) else {
                    problems.push(format!("{page}: '{}' is not a glossary term", field.key));
                    continue;
                };
                if KEY_ALIASES.iter().any(|a| a.page == *page && a.old == field.key) {
                    problems.push(format!("{page}: '{}' is a retired key of this page", field.key));
                }
                if let FieldKind::Choice(options) = &field.kind {
                    // Presets (sizes, soils) are data keys, not glossary options.
                    if term.options.is_empty() {
                        continue;
                    }
                    for o in *options {
                        if !term.options.contains(&o.key) {
                            problems.push(format!("{page}: '{}' is not an option of '{}'", o.key, field.key));
                        }
                    }
                }
            }
        }
        assert!(problems.is_empty(), "{}", problems.join("\n"));
    }

    #[test]
    fn an_old_bend_link_reads_as_todays_and_says_what_it_translated() {
        // A bookmark of the bend page from before issue 13.
        let old = [
            ("angle", "90 deg"),
            ("d_in", "300 mm"),
            ("basis", "od"),
            ("d_od", "326 mm"),
            ("p", "10 bar"),
            ("flow_basis", "q"),
            ("q", "0 m3/h"),
            ("plane", "vertical_up"),
        ];
        let pairs: Vec<(String, String)> = old.iter().map(|(k, v)| (k.to_string(), v.to_string())).collect();
        let up = glossary::upgrade("bend", &pairs);
        assert_eq!(up.translations.len(), 5, "{:?}", up.translations);
        let spec = super::super::spec("bend").expect("registered");
        let solve = |pairs: Vec<(&str, &str)>| {
            let request: Request = demo_request(&spec, &pairs);
            crate::solve("bend", &request).result.expect("solves")
        };
        let upgraded = solve(up.pairs.iter().map(|(k, v)| (k.as_str(), v.as_str())).collect());
        let today = solve(vec![
            ("angle", "90 deg"),
            ("d", "300 mm"),
            ("joint", "push_on"),
            ("od", "326 mm"),
            ("p", "10 bar"),
            ("flow_given", "q"),
            ("q", "0 m3/h"),
            ("plane", "vertical_sag"),
        ]);
        // At rest on the OD: 2·p·A_OD·sin(θ/2) in the plane (closed form), plus the
        // weight of the water in the plane of a vertical bend.
        let thrust = |s: &crate::catalog::Solution| s.output("thrust").map(|o| o.si);
        assert_eq!(thrust(&upgraded), thrust(&today));
        let in_plane = today.output("thrust_in_plane").map(|o| o.si).unwrap_or(0.0);
        let static_od = 2.0 * 1e6 * std::f64::consts::PI * 0.326f64.powi(2) / 4.0 * std::f64::consts::FRAC_PI_4.sin();
        assert!(
            (in_plane - static_od).abs() < 0.01 * static_od,
            "{in_plane} vs {static_od}"
        );
    }
}
