//! Property tests of the engine and of every registered calculator.
//!
//! Engine (`fluxledger_core::engine` directly):
//! - mass closes: with one unknown flow the solved flows balance (or the engine says
//!   the flow would have to reverse);
//! - a straight constant-area pipe without loss at any pressure and flow carries no
//!   net axial force;
//! - rotating the whole control volume (ports, gravity, weights, moment point, and the
//!   spin axis of a rotating frame) rotates the support force and moment with it and
//!   leaves the shaft torque unchanged;
//! - non-finite inputs give a typed error, finite ones a finite ledger; nothing panics.
//!
//! Catalog (`fluxledger_core::solve`, every calculator in `CALCULATORS`):
//! - the same case typed in SI or in US customary units gives the same SI result,
//!   free-text fields (a line schedule, a traverse) filled with valid generated text
//!   whose numbers carry their units;
//! - every output (and every drawn or plotted number) is finite, or the result is a
//!   typed error naming fields the calculator has;
//! - arbitrary strings, non-finite numbers included, in any field never panic.
//!
//! Every catalog property requires a least share of its generated requests to solve
//! for every calculator (`SolvedShare`), so that it cannot pass by refusing them all.
//!
//! Case counts are modest so the whole file runs in seconds.

use std::cell::RefCell;
use std::collections::BTreeMap;
use std::f64::consts::PI;

use fluxledger_core::calculators::{self, CALCULATORS};
use fluxledger_core::catalog::{CalculatorSpec, FieldKind, Solution};
use fluxledger_core::engine::{self, si, Balance, ControlVolume, EngineError, Frame, Loss, Port, Stream};
use fluxledger_core::fluid::Fluid;
use fluxledger_core::units::{self, QuantityKind};
use fluxledger_core::vector::{Direction, Vec3};
use fluxledger_core::{Request, SolveError, UnitSystem};
use fluxledger_tests::generate::{self, Reach, Rng};
use proptest::prelude::*;
use proptest::test_runner::{Config, TestRng, TestRunner};

fn config(cases: u32) -> Config {
    Config {
        cases,
        failure_persistence: None,
        ..Config::default()
    }
}

fn liquid(density: f64) -> Fluid {
    Fluid {
        name: "test liquid".into(),
        density,
        viscosity: 1e-3,
        vapour_pressure: None,
    }
}

/// Rotates `v` about the unit vector `axis` by `angle` (Rodrigues' formula).
fn rotate(v: Vec3, axis: Vec3, angle: f64) -> Vec3 {
    let (s, c) = angle.sin_cos();
    v * c + axis.cross(v) * s + axis * (axis.dot(v) * (1.0 - c))
}

fn unit_vector() -> impl Strategy<Value = Vec3> {
    (-1.0f64..1.0, -1.0f64..1.0, -1.0f64..1.0)
        .prop_filter("not too short", |(x, y, z)| Vec3::new(*x, *y, *z).norm() > 0.1)
        .prop_map(|(x, y, z)| {
            let v = Vec3::new(x, y, z);
            v * (1.0 / v.norm())
        })
}

fn point(scale: f64) -> impl Strategy<Value = Vec3> {
    (-scale..scale, -scale..scale, -scale..scale).prop_map(|(x, y, z)| Vec3::new(x, y, z))
}

/// Sizes of all ledger terms, for relative tolerances.
fn force_scale(b: &Balance) -> f64 {
    b.ports
        .iter()
        .map(|p| p.pressure_force.norm() + p.momentum_outflow.norm())
        .sum::<f64>()
        + b.fluid_weight.norm()
        + b.extra_force_total().norm()
        + b.momentum_storage.norm()
}

// ---------------------------------------------------------------------------------
// Engine properties

/// One port of a random control volume: (inlet?, area, direction, mass flow, position).
type PortDraw = (bool, f64, Vec3, f64, Vec3);

fn port_draw() -> impl Strategy<Value = PortDraw> {
    (any::<bool>(), 1e-4f64..2.0, unit_vector(), 0.0f64..500.0, point(5.0))
}

proptest! {
    #![proptest_config(config(256))]

    /// A straight pipe of one size, no loss, drawn in plan: no net force along its axis,
    /// whatever the pressure and the flow.
    #[test]
    fn straight_pipe_has_no_axial_force(angle in 0.0f64..(2.0 * PI), d in 0.01f64..3.0, length in 0.1f64..100.0,
                                        p in 0.0f64..1e8, q in 0.0f64..20.0, density in 500.0f64..2000.0) {
        let area = PI * d * d / 4.0;
        let axis = Direction::in_plane(angle);
        let mut cv = ControlVolume::new(liquid(density));
        let i = cv.port(Port::inlet("in", si::area(area), axis).volume_flow(si::volume_flow(q)).pressure(si::pressure(p)));
        let o = cv.port(Port::outlet("out", si::area(area), axis).at(axis.vec() * length));
        cv.stream(Stream::new(i, o).loss(Loss::None));
        cv.contains(si::volume(area * length), axis.vec() * (length / 2.0));
        let b = engine::balance(&cv).map_err(|e| TestCaseError::fail(format!("{e}")))?;
        let axial = b.support_force.dot(axis.vec());
        let scale = force_scale(&b);
        prop_assert!(axial.abs() <= 1e-9 * scale, "axial {axial} N against terms of {scale} N");
        prop_assert!((b.ports[o].pressure - p).abs() <= 1e-9 * (p + 1.0));
    }
}

/// Mass closes: Σ_out ṁ − Σ_in ṁ + dm/dt = 0 after solving the one unknown flow
/// (or the engine says the flow would have to reverse).
#[test]
fn mass_closes() {
    let share = SolvedShare::default();
    let strategy = (
        prop::collection::vec(port_draw(), 1..6),
        any::<bool>(),
        -50.0f64..50.0,
        1.0f64..2000.0,
    );
    run_property(256, strategy, |(draws, unknown_is_inlet, storage, density)| {
        let mut cv = ControlVolume::new(liquid(density));
        let mut known_net = storage;
        for (inlet, area, dir, mdot, at) in &draws {
            let direction = Direction::new(*dir).unwrap_or(Direction::X);
            let port = if *inlet {
                Port::inlet("p", si::area(*area), direction)
            } else {
                Port::outlet("p", si::area(*area), direction)
            };
            cv.port(port.mass_flow(si::mass_flow(*mdot)).pressure(si::pressure(0.0)).at(*at));
            known_net += if *inlet { -mdot } else { *mdot };
        }
        let unknown = if unknown_is_inlet {
            Port::inlet("unknown", si::area(0.1), Direction::X)
        } else {
            Port::outlet("unknown", si::area(0.1), Direction::X)
        };
        cv.port(unknown.pressure(si::pressure(0.0)));
        cv.storage(storage, Vec3::ZERO);
        let expected = if unknown_is_inlet { known_net } else { -known_net };
        let scale: f64 = draws.iter().map(|d| d.3).sum::<f64>() + storage.abs() + 1.0;
        let result = engine::balance(&cv);
        share.note("engine", result.is_ok());
        match result {
            Ok(b) => {
                prop_assert!(
                    b.mass_residual.abs() <= 1e-12 * scale,
                    "residual {} (scale {scale})",
                    b.mass_residual
                );
                let solved = b.ports.last().map(|p| p.mass_flow).unwrap_or(f64::NAN);
                prop_assert!(
                    (solved - expected.max(0.0)).abs() <= 1e-12 * scale,
                    "solved {solved}, expected {expected}"
                );
            }
            Err(EngineError::FlowReverses { .. }) => prop_assert!(expected < 0.0, "reversal reported for {expected}"),
            Err(other) => prop_assert!(false, "unexpected error {other:?}"),
        }
        Ok(())
    });
    share.require("mass closes", 0.3, &["engine"]);
}

/// Rotating everything rotates the support force and moment.
#[test]
fn rotating_the_control_volume_rotates_the_force() {
    let share = SolvedShare::default();
    let strategy = (
        (
            prop::collection::vec(port_draw(), 1..4),
            0.0f64..2e6,
            0.0f64..5.0,
            0.0f64..2.0,
            point(3.0),
            point(1e4),
            point(3.0),
        ),
        (
            point(3.0),
            unit_vector(),
            -PI..PI,
            prop_oneof![Just(0.0), -100.0f64..100.0],
            unit_vector(),
            point(2.0),
        ),
    );
    run_property(
        256,
        strategy,
        |(
            (draws, p0, k, volume, centroid, extra, extra_at),
            (moment_point, axis, angle, spin, spin_axis, spin_origin),
        )| {
            let build = |rot: &dyn Fn(Vec3) -> Vec3| {
                let mut cv = ControlVolume::new(liquid(1000.0));
                cv.gravity(rot(Vec3::new(0.0, 0.0, -units::STANDARD_GRAVITY)));
                let first = Port::inlet(
                    "in",
                    si::area(0.05),
                    Direction::new(rot(Vec3::new(1.0, 0.0, 0.0))).unwrap_or(Direction::X),
                )
                .pressure(si::pressure(p0))
                .at(rot(Vec3::ZERO));
                let i0 = cv.port(first);
                for (n, (inlet, area, dir, mdot, at)) in draws.iter().enumerate() {
                    let direction = Direction::new(rot(*dir)).unwrap_or(Direction::X);
                    let port = if *inlet && n > 0 {
                        Port::inlet("p", si::area(*area), direction)
                    } else {
                        Port::outlet("p", si::area(*area), direction)
                    };
                    let idx = cv.port(port.mass_flow(si::mass_flow(*mdot)).at(rot(*at)));
                    cv.stream(Stream::new(i0, idx).loss(Loss::Coefficient { k, reference_port: idx }));
                }
                cv.contains(si::volume(volume), rot(centroid));
                cv.extra_force("load", rot(extra), rot(extra_at));
                if spin != 0.0 {
                    let spin_direction = Direction::new(rot(spin_axis)).unwrap_or(Direction::Z);
                    cv.frame(Frame::Rotating {
                        axis: spin_direction,
                        origin: rot(spin_origin),
                        omega: spin,
                    });
                }
                cv.moments_about(rot(moment_point));
                engine::balance(&cv)
            };
            let identity = |v: Vec3| v;
            let turned = |v: Vec3| rotate(v, axis, angle);
            let (original, rotated) = (build(&identity), build(&turned));
            share.note("engine", original.is_ok());
            match (original, rotated) {
                (Ok(a), Ok(b)) => {
                    let scale = force_scale(&a) + 1.0;
                    let diff = (b.support_force - rotate(a.support_force, axis, angle)).norm();
                    prop_assert!(diff <= 1e-9 * scale, "force differs by {diff} N (scale {scale})");
                    let moment_scale = a.support_moment.norm() + scale * 10.0;
                    let mdiff = (b.support_moment - rotate(a.support_moment, axis, angle)).norm();
                    prop_assert!(mdiff <= 1e-9 * moment_scale, "moment differs by {mdiff} N.m");
                    match (a.shaft_torque, b.shaft_torque) {
                        (None, None) => {}
                        (Some(ta), Some(tb)) => {
                            prop_assert!((ta - tb).abs() <= 1e-9 * moment_scale, "shaft torque {ta} vs {tb}")
                        }
                        other => prop_assert!(false, "shaft torque present in one orientation only: {other:?}"),
                    }
                }
                (Err(a), Err(b)) => prop_assert_eq!(std::mem::discriminant(&a), std::mem::discriminant(&b)),
                (a, b) => prop_assert!(
                    false,
                    "one orientation solved, the other did not: {:?} / {:?}",
                    a.err(),
                    b.err()
                ),
            }
            Ok(())
        },
    );
    share.require("rotation", 0.3, &["engine"]);
}

/// Any f64, the awkward ones often.
fn any_number() -> impl Strategy<Value = f64> {
    prop_oneof![
        3 => -1e3f64..1e3,
        1 => Just(f64::NAN),
        1 => Just(f64::INFINITY),
        1 => Just(f64::NEG_INFINITY),
        1 => Just(0.0),
        1 => Just(-0.0),
        1 => Just(f64::MAX),
        1 => Just(f64::MIN_POSITIVE),
        1 => any::<f64>(),
    ]
}

fn all_ledger_numbers_finite(b: &Balance) -> bool {
    let v = |x: Vec3| x.is_finite();
    b.ports.iter().all(|p| {
        p.speed.is_finite()
            && v(p.relative_velocity)
            && v(p.absolute_velocity)
            && p.mass_flow.is_finite()
            && p.pressure.is_finite()
            && v(p.pressure_force)
            && v(p.momentum_outflow)
    }) && b
        .streams
        .iter()
        .all(|s| s.head_loss.is_finite() && s.shaft_head.is_finite() && s.residual_head.is_finite())
        && v(b.fluid_weight)
        && v(b.support_force)
        && v(b.support_moment)
        && b.shaft_torque.iter().all(|x| x.is_finite())
        && b.shaft_power.iter().all(|x| x.is_finite())
        && b.mass_residual.is_finite()
}

/// Non-finite inputs are refused with a typed error; moderate finite inputs give a
/// finite ledger or a typed error; nothing panics. Half the cases draw only moderate
/// numbers, so that the finite-ledger half of the property is exercised (at least
/// 30 % of those must balance).
#[test]
fn engine_never_panics_and_refuses_non_finite_input() {
    let share = SolvedShare::default();
    let strategy = (
        prop_oneof![
            prop::collection::vec(any_number(), 17),
            prop::collection::vec(0.0f64..1e3, 17)
        ],
        any::<bool>(),
        any::<bool>(),
    );
    run_property(512, strategy, |(nums, rotating, unknown_pressure)| {
        let n = |i: usize| nums[i];
        let mut cv = ControlVolume::new(liquid(if n(0).is_finite() { n(0).abs() + 1.0 } else { n(0) }));
        let inlet = Port::inlet("in", si::area(n(1)), Direction::X)
            .velocity(si::velocity(n(2)))
            .pressure(si::pressure(n(3)));
        let i = cv.port(inlet.at(Vec3::new(n(4), 0.0, 0.0)));
        let mut outlet = Port::outlet("out", si::area(n(5)), Direction::in_plane(1.0)).at(Vec3::new(1.0, n(6), 0.0));
        outlet.beta = n(7);
        if !unknown_pressure {
            outlet = outlet.pressure(si::pressure(n(8)));
        }
        let o = cv.port(outlet);
        if unknown_pressure {
            cv.stream(Stream::new(i, o).loss(Loss::Head(n(9))));
        }
        cv.gravity(Vec3::new(0.0, n(10), n(16)));
        cv.contains(si::volume(n(11)), Vec3::new(n(12), 0.0, 0.0));
        cv.storage(n(13), Vec3::new(n(14), 0.0, 0.0));
        if rotating {
            cv.frame(Frame::Rotating {
                axis: Direction::Z,
                origin: Vec3::ZERO,
                omega: n(15),
            });
        }
        let used: Vec<f64> = nums
            .iter()
            .enumerate()
            .filter(|(k, _)| match k {
                8 => !unknown_pressure,
                9 => unknown_pressure,
                15 => rotating,
                _ => true,
            })
            .map(|(_, x)| *x)
            .collect();
        let result = engine::balance(&cv);
        if used.iter().all(|x| x.is_finite() && x.abs() <= 1e3) {
            share.note("engine", result.is_ok());
        }
        if used.iter().any(|x| !x.is_finite()) {
            prop_assert!(result.is_err(), "non-finite input accepted: {nums:?}");
        }
        if used.iter().all(|x| x.is_finite() && x.abs() <= 1e3) {
            if let Ok(b) = &result {
                prop_assert!(all_ledger_numbers_finite(b), "non-finite ledger for {nums:?}: {b:?}");
            }
        }
        Ok(())
    });
    share.require("engine never panics", 0.3, &["engine"]);
}

// ---------------------------------------------------------------------------------
// Catalog properties, over every registered calculator

fn specs() -> Vec<CalculatorSpec> {
    calculators::catalog()
}

/// Every number a solution shows: outputs, table cells are text, so the drawn and
/// plotted coordinates.
fn solution_numbers_finite(s: &Solution) -> Result<(), String> {
    for o in &s.outputs {
        if !o.si.is_finite() {
            return Err(format!("output {} is {}", o.key, o.si));
        }
    }
    for d in &s.diagrams {
        if !d.bounds.iter().all(|x| x.is_finite()) {
            return Err(format!("diagram '{}' bounds {:?}", d.title, d.bounds));
        }
        for shape in &d.shapes {
            if !shape.is_finite() {
                return Err(format!("diagram '{}' has a non-finite shape {shape:?}", d.title));
            }
        }
    }
    for p in &s.plots {
        let series_ok = p.series.iter().flat_map(|s| &s.points).flatten().all(|x| x.is_finite());
        let markers_ok = p.markers.iter().flat_map(|m| m.at).all(|x| x.is_finite());
        if !(series_ok && markers_ok) {
            return Err(format!("plot '{}' has a non-finite point", p.title));
        }
    }
    Ok(())
}

/// The result is either a solution with finite numbers or errors on fields the
/// calculator has.
fn finite_or_typed_error(spec: &CalculatorSpec, request: &Request) -> Result<(), String> {
    let outcome = fluxledger_core::solve(spec.key, request);
    match &outcome.result {
        Ok(solution) => solution_numbers_finite(solution),
        Err(SolveError::Fields(errors)) => {
            if errors.is_empty() {
                return Err("an error result with no field errors".into());
            }
            for e in errors {
                if spec.field(&e.field).is_none() {
                    return Err(format!("error on unknown field '{}': {}", e.field, e.kind));
                }
                if e.kind.to_string().trim().is_empty() {
                    return Err(format!("empty message on field '{}'", e.field));
                }
            }
            Ok(())
        }
        Err(SolveError::UnknownCalculator { key }) => Err(format!("registered calculator '{key}' is unknown")),
    }
}

/// A typed value for a field: `scale` times its demo value (or a value from its limits),
/// as text in `unit`. Temperatures move by `scale` kelvin-ish steps instead.
fn typed_value(si_value: f64, kind: QuantityKind, unit: &str) -> Option<String> {
    let number = units::convert_to(si_value, kind, unit)?;
    number.is_finite().then(|| format!("{number:?} {unit}"))
}

/// Picks an SI value for a quantity field from its demo and limits, moved by `draw`
/// in [0, 1).
/// `exact_demo` keeps the demo value as it is (whole-number fields such as a count of
/// nozzles stay whole).
fn draw_quantity(
    field: &fluxledger_core::catalog::FieldSpec,
    kind: QuantityKind,
    draw: f64,
    exact_demo: bool,
) -> Option<f64> {
    let limits = field.limits?;
    let demo = if field.demo.is_empty() {
        None
    } else {
        units::parse_quantity(field.demo, kind, field.si_unit).ok()
    };
    let value = match (kind, demo) {
        (_, Some(demo)) if exact_demo => demo,
        (QuantityKind::Temperature, _) => limits.min + (limits.max - limits.min) * draw,
        (_, Some(demo)) => demo * (0.5 + draw),
        (_, None) => {
            let hi = limits.max.min(if limits.min > 0.0 { limits.min * 100.0 } else { 1.0 });
            limits.min + (hi - limits.min) * draw
        }
    };
    Some(value)
}

/// Builds the same inputs in SI and US customary text. Per field, `modes` picks the
/// demo value or option (0 to 5) or a drawn one (6 and 7), so that most requests
/// solve and every field still gets moved. Free-text fields (a pasted traverse, a
/// schedule) get valid generated text drawn from `text_seed`
/// (`fluxledger_tests::generate::valid_text`) whose every number carries its unit, so
/// the same text means the same in both systems; a bare number in such text would
/// take the page's system and is not generated here.
fn twin_requests(
    spec: &CalculatorSpec,
    draws: &[f64],
    modes: &[usize],
    fill_optional: &[bool],
    text_seed: u64,
) -> (Request, Request) {
    let mut si_req = Request {
        system: UnitSystem::Si,
        ..Request::default()
    };
    let mut us_req = Request {
        system: UnitSystem::UsCustomary,
        ..Request::default()
    };
    for (n, field) in spec.fields.iter().enumerate() {
        let draw = draws[n % draws.len()];
        let mode = modes[n % modes.len()];
        let keep_demo = mode < 6;
        match &field.kind {
            FieldKind::Quantity(kind) => {
                if field.optional && field.demo.is_empty() && !fill_optional[n % fill_optional.len()] {
                    continue;
                }
                let Some(value) = draw_quantity(field, *kind, draw, keep_demo) else {
                    continue;
                };
                if let (Some(a), Some(b)) = (
                    typed_value(value, *kind, field.si_unit),
                    typed_value(value, *kind, field.us_unit),
                ) {
                    si_req.inputs.insert(field.key.to_string(), a);
                    us_req.inputs.insert(field.key.to_string(), b);
                }
            }
            FieldKind::Choice(options) => {
                if !options.is_empty() {
                    let demo = options.iter().find(|o| o.key == field.demo);
                    let pick = match demo {
                        Some(option) if keep_demo => option.key.to_string(),
                        _ => options[mode % options.len()].key.to_string(),
                    };
                    si_req.inputs.insert(field.key.to_string(), pick.clone());
                    us_req.inputs.insert(field.key.to_string(), pick);
                }
            }
            FieldKind::Text => {
                let text = generate::valid_text(spec, field, &mut Rng::new(text_seed.wrapping_add(n as u64)));
                si_req.inputs.insert(field.key.to_string(), text.clone());
                us_req.inputs.insert(field.key.to_string(), text);
            }
        }
    }
    (si_req, us_req)
}

fn same_si_result(spec: &CalculatorSpec, si_req: &Request, us_req: &Request) -> Result<(), String> {
    let a = fluxledger_core::solve(spec.key, si_req).result;
    let b = fluxledger_core::solve(spec.key, us_req).result;
    match (a, b) {
        (Ok(a), Ok(b)) => {
            let keys_a: Vec<&str> = a.outputs.iter().map(|o| o.key).collect();
            let keys_b: Vec<&str> = b.outputs.iter().map(|o| o.key).collect();
            if keys_a != keys_b {
                return Err(format!("outputs differ: {keys_a:?} vs {keys_b:?}"));
            }
            let mut kind_scale: BTreeMap<String, f64> = BTreeMap::new();
            for o in &a.outputs {
                *kind_scale.entry(format!("{:?}", o.kind)).or_default() += o.si.abs();
            }
            for (x, y) in a.outputs.iter().zip(&b.outputs) {
                let scale = kind_scale.get(&format!("{:?}", x.kind)).copied().unwrap_or(0.0);
                // Unit conversions agree to ~1e-15. An optimum found by searching a
                // flat peak (the speed of largest power, `common::peak_of`) of a
                // function computed through several balances agrees to about 1e-6.
                // Any real unit slip is far larger (32.2 against 32.174 ft/s² is 8e-4).
                let tol = 1e-5 * x.si.abs().max(y.si.abs()) + 1e-12 * scale + 1e-300;
                if (x.si - y.si).abs() > tol {
                    return Err(format!(
                        "{}: SI-typed {} vs US-typed {} (diff {:e})",
                        x.key,
                        x.si,
                        y.si,
                        x.si - y.si
                    ));
                }
            }
            Ok(())
        }
        (Err(SolveError::Fields(a)), Err(SolveError::Fields(b))) => {
            let fa: Vec<&String> = a.iter().map(|e| &e.field).collect();
            let fb: Vec<&String> = b.iter().map(|e| &e.field).collect();
            if fa == fb {
                Ok(())
            } else {
                Err(format!("errors on different fields: {fa:?} vs {fb:?}"))
            }
        }
        (a, b) => Err(format!(
            "one unit system solved, the other did not: {:?} / {:?}",
            a.err(),
            b.err()
        )),
    }
}

/// Solved and tried requests per calculator over one property's cases: a property
/// whose requests are all refused would pass without testing anything, so each
/// property requires a least share of solved requests for every calculator.
#[derive(Default)]
struct SolvedShare(RefCell<BTreeMap<&'static str, (usize, usize)>>);

impl SolvedShare {
    fn note(&self, key: &'static str, solved: bool) {
        let mut counts = self.0.borrow_mut();
        let entry = counts.entry(key).or_default();
        entry.0 += usize::from(solved);
        entry.1 += 1;
    }
    /// Fails when any of `keys` (calculator keys, or `"engine"`) solved fewer than
    /// `min_share` of its requests, or was never tried.
    fn require(&self, property: &str, min_share: f64, keys: &[&'static str]) {
        let counts = self.0.borrow();
        let too_few: Vec<String> = keys
            .iter()
            .map(|key| {
                let (solved, tried) = counts.get(key).copied().unwrap_or((0, 0));
                (key, solved, tried)
            })
            .filter(|(_, solved, tried)| (*solved as f64) < min_share * (*tried).max(1) as f64)
            .map(|(key, solved, tried)| format!("{key}: {solved} of {tried}"))
            .collect();
        assert!(
            too_few.is_empty(),
            "{property}: fewer than {:.0} % of the generated requests solved, so the property tests little: {}",
            min_share * 100.0,
            too_few.join(", ")
        );
    }
}

/// The least share of generated requests that must solve in the catalog properties
/// with plausible inputs.
const MIN_SOLVED_SHARE: f64 = 0.3;

fn calculator_keys() -> Vec<&'static str> {
    CALCULATORS.iter().map(|c| c.key).collect()
}

fn solved(spec: &CalculatorSpec, request: &Request) -> bool {
    fluxledger_core::solve(spec.key, request).result.is_ok()
}

/// Runs `test` on `cases` values of `strategy`, failing with proptest's minimal case.
/// The values come from proptest's deterministic generator, so that a property's
/// share of solved requests (and any failure) is the same on every run: a share
/// drawn afresh each run would make the floor a coin toss.
fn run_property<S: Strategy>(cases: u32, strategy: S, test: impl Fn(S::Value) -> Result<(), TestCaseError>)
where
    S::Value: std::fmt::Debug,
{
    let config = config(cases);
    let rng = TestRng::deterministic_rng(config.rng_algorithm);
    let mut runner = TestRunner::new_with_rng(config, rng);
    if let Err(e) = runner.run(&strategy, test) {
        panic!("{e}");
    }
}

/// The same case typed in SI or US customary units gives the same SI result, over
/// the calculators with these keys. The cases come from `generate::twin_requests`
/// (values inside the limits, with the demo's proportions or drawn over the range,
/// every option, generated text).
fn si_and_us_typing_agree(keys: &[&'static str]) {
    si_and_us_typing_agree_over(keys, 96);
}

fn si_and_us_typing_agree_over(keys: &[&'static str], cases: u32) {
    let share = SolvedShare::default();
    let chosen: Vec<CalculatorSpec> = specs().into_iter().filter(|s| keys.contains(&s.key)).collect();
    run_property(cases, any::<u64>(), |seed| {
        let mut rng = Rng::new(seed);
        for spec in &chosen {
            let (si_req, us_req) = generate::twin_requests(spec, Reach::Valid, &mut rng);
            prop_assert!(
                si_req.inputs != us_req.inputs || spec.fields.iter().all(|f| f.si_unit == f.us_unit),
                "the twin requests should differ in their units"
            );
            share.note(spec.key, solved(spec, &si_req));
            if let Err(message) = same_si_result(spec, &si_req, &us_req) {
                prop_assert!(
                    false,
                    "{}: {message}\nSI: {:?}\nUS: {:?}",
                    spec.key,
                    si_req.inputs,
                    us_req.inputs
                );
            }
        }
        Ok(())
    });
    share.require("SI/US typing", MIN_SOLVED_SHARE, keys);
}

#[test]
fn si_and_us_typing_give_the_same_result() {
    si_and_us_typing_agree(&calculator_keys());
}

/// The vessel page integrates in time with step control, whose accepted steps could
/// differ between twin requests: more draws of that page alone than the test above
/// gives it.
#[test]
fn vessel_si_and_us_typing_give_the_same_result() {
    si_and_us_typing_agree_over(&["tank-drain"], 160);
}

/// Plausible and implausible numbers in every field: finite results or typed errors.
#[test]
fn every_output_is_finite_or_a_typed_error() {
    let share = SolvedShare::default();
    let strategy = (
        prop::collection::vec(prop_oneof![3 => 0.0f64..1.0, 1 => -2.0f64..40.0], 24),
        prop::collection::vec(0usize..8, 24),
        prop::collection::vec(any::<bool>(), 24),
        any::<bool>(),
        any::<u64>(),
    );
    run_property(64, strategy, |(draws, modes, fill, us, text_seed)| {
        for spec in specs() {
            let (si_req, us_req) = twin_requests(&spec, &draws, &modes, &fill, text_seed);
            let request = if us { us_req } else { si_req };
            share.note(spec.key, solved(&spec, &request));
            if let Err(message) = finite_or_typed_error(&spec, &request) {
                prop_assert!(false, "{}: {message}\ninputs: {:?}", spec.key, request.inputs);
            }
        }
        Ok(())
    });
    // A quarter of the drawn numbers lie outside [0, 1) scaled demo values, many
    // outside the limits: fewer requests solve, but still a real share. (The
    // nozzle's optional values that must agree with others, a gasket diameter not
    // below the bore and C_d not above C_c, drawn over their whole ranges, keep its
    // share near 14 % since the flange bolts and port profiles were added.)
    share.require("finite or typed error", 0.12, &calculator_keys());
}

/// Text a user (or a pasted URL) might put in a field.
fn field_text() -> impl Strategy<Value = String> {
    let unit_ids: Vec<String> = units::UNITS.iter().map(|u| u.id.to_string()).collect();
    prop_oneof![
        2 => prop::collection::vec(any::<char>(), 0..24).prop_map(String::from_iter),
        2 => (any::<f64>(), prop::sample::select(unit_ids.clone())).prop_map(|(x, u)| format!("{x} {u}")),
        2 => (-1e4f64..1e4, prop::sample::select(unit_ids)).prop_map(|(x, u)| format!("{x}{u}")),
        2 => prop::sample::select(vec![
            "", " ", "NaN", "nan psi", "inf", "-inf", "+Infinity", "1e999", "-1e999 kPa", "1e-400", "0", "-0",
            "1,5", "1,500", "1.2.3", "1e", "--1", "0x10", "∞", "٣", "½", "5 psi", "300 mm", "45 deg", "20 degC",
            "-300 degC", "1e308 m", "1e308 gpm", "<script>alert(1)</script>", "10 bar bar", "%", "-", "1 -",
        ]).prop_map(str::to_string),
        1 => Just("9".repeat(70)),
    ]
}

/// Arbitrary text in every field (and arbitrary selector units) never panics, and
/// the result is finite numbers or typed errors. Besides requests with text in many
/// fields, each case also changes one field of the demo inputs, to the arbitrary
/// text or (every other case) to a valid entry drawn for that field; a real share
/// of those must solve.
#[test]
fn arbitrary_text_never_panics() {
    let share = SolvedShare::default();
    let strategy = (
        prop::collection::vec(field_text(), 24),
        prop::collection::vec(field_text(), 24),
        any::<bool>(),
        prop::collection::vec(0usize..3, 24),
        any::<usize>(),
        any::<u64>(),
    );
    run_property(256, strategy, |(texts, selector, us, which, focus, seed)| {
        let system = if us { UnitSystem::UsCustomary } else { UnitSystem::Si };
        for spec in specs() {
            let mut request = Request {
                system,
                ..Request::default()
            };
            for (n, field) in spec.fields.iter().enumerate() {
                let text = match (&field.kind, which[n % which.len()]) {
                    // A valid option sometimes, so later fields get exercised too.
                    (FieldKind::Choice(options), 0) if !options.is_empty() => {
                        options[n % options.len()].key.to_string()
                    }
                    (_, 1) if !field.demo.is_empty() => field.demo.to_string(),
                    _ => texts[n % texts.len()].clone(),
                };
                request.inputs.insert(field.key.to_string(), text);
                request
                    .field_units
                    .insert(field.key.to_string(), selector[n % selector.len()].clone());
            }
            if let Err(message) = finite_or_typed_error(&spec, &request) {
                prop_assert!(false, "{}: {message}\ninputs: {:?}", spec.key, request.inputs);
            }
            // One field of the demo changed: to arbitrary text with an arbitrary
            // selector unit, or (every other case) to a valid entry drawn for it.
            let field = &spec.fields[focus % spec.fields.len()];
            let mut rng = Rng::new(seed);
            let valid = if seed % 2 == 0 {
                generate::valid_field_text(&spec, field, &mut rng)
            } else {
                None
            };
            let text = valid.clone().unwrap_or_else(|| texts[0].clone());
            let mut focused = fluxledger_core::catalog::demo_request(&spec, &[(field.key, text.as_str())]);
            focused.system = system;
            if valid.is_none() {
                focused.field_units.insert(field.key.to_string(), selector[0].clone());
            }
            share.note(spec.key, solved(&spec, &focused));
            if let Err(message) = finite_or_typed_error(&spec, &focused) {
                prop_assert!(false, "{}: {message}\ninputs: {:?}", spec.key, focused.inputs);
            }
        }
        // An unknown calculator is a typed error too.
        let unknown = fluxledger_core::solve(&texts[0], &Request::default());
        if CALCULATORS.iter().all(|c| c.key != texts[0]) {
            let is_unknown = matches!(unknown.result, Err(SolveError::UnknownCalculator { .. }));
            prop_assert!(is_unknown, "unknown key '{}' gave {:?}", texts[0], unknown.result);
        }
        Ok(())
    });
    share.require("arbitrary text", MIN_SOLVED_SHARE, &calculator_keys());
}

#[test]
fn at_least_one_calculator_is_registered() {
    // The catalog properties above are vacuous without calculators.
    assert!(!CALCULATORS.is_empty());
}
