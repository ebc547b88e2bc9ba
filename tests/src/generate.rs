//! Requests generated from a calculator's own description, for the property and
//! fuzz tests: values inside, at and just beyond every field's limits, every option,
//! valid free text (a line schedule, a traverse) as well as junk, and quantities of
//! one kind typed nearly alike.
//!
//! Everything is drawn from a small seeded generator ([`Rng`], SplitMix64), so a
//! failing request can be replayed from its seed and printed whole.

use fluxledger_core::catalog::{smallest_meaningful, CalculatorSpec, FieldKind, FieldSpec, Limits};
use fluxledger_core::pipe_sizes;
use fluxledger_core::restraint;
use fluxledger_core::units::{self, QuantityKind};
use fluxledger_core::{Request, UnitSystem};

/// SplitMix64 (Steele, Lea & Flood, "Fast splittable pseudorandom number
/// generators", OOPSLA 2014): small, fast and good enough to spread test inputs.
#[derive(Clone, Debug)]
pub struct Rng(u64);

impl Rng {
    pub fn new(seed: u64) -> Rng {
        Rng(seed)
    }
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// Uniform in [0, 1).
    pub fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }
    /// Uniform in [lo, hi).
    pub fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.unit()
    }
    /// Uniform index below `n` (`n` > 0).
    pub fn below(&mut self, n: usize) -> usize {
        (self.next_u64() % n.max(1) as u64) as usize
    }
    pub fn chance(&mut self, p: f64) -> bool {
        self.unit() < p
    }
    pub fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
        &items[self.below(items.len())]
    }
}

/// How far from the ordinary the generated values go.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Reach {
    /// Values within the limits, every option, valid text: most requests solve.
    Valid,
    /// Also the limits themselves, values just beyond them, below the smallest
    /// meaningful magnitude, empty optional fields and junk text.
    Edges,
}

/// A value inside `limits`, log-uniform where the range spans decades.
pub fn value_within(limits: Limits, kind: QuantityKind, rng: &mut Rng) -> f64 {
    let floor = if kind == QuantityKind::Temperature {
        limits.min
    } else {
        smallest_meaningful(kind)
    };
    let lo = if limits.min_inclusive {
        limits.min
    } else {
        limits.min.max(floor)
    };
    let hi = limits.max;
    if lo > 0.0 && hi / lo > 100.0 {
        (lo.ln() + (hi.ln() - lo.ln()) * rng.unit()).exp().clamp(lo, hi)
    } else if lo >= 0.0 && lo < floor && hi / floor > 100.0 && rng.chance(0.8) {
        // A range from 0 over many decades: mostly log-uniform above the floor.
        (floor.ln() + (hi.ln() - floor.ln()) * rng.unit()).exp().clamp(lo, hi)
    } else {
        rng.range(lo, hi).clamp(lo, hi)
    }
}

/// A value near or beyond the limits (may be refused).
fn edge_value(limits: Limits, kind: QuantityKind, rng: &mut Rng) -> f64 {
    let smallest = smallest_meaningful(kind);
    match rng.below(7) {
        0 => limits.min,
        1 => limits.max,
        2 => limits.max * (1.0 + 1e-9) + 1e-300,
        3 => limits.min - (limits.max - limits.min) * 1e-9,
        4 => smallest,
        5 => smallest * 0.5,
        _ => {
            if limits.contains(limits.min + smallest) {
                limits.min + smallest
            } else {
                limits.min
            }
        }
    }
}

/// A count (of nozzles, say): whole-number limits and a whole-number demo.
fn whole_number_field(limits: Limits, demo: f64) -> bool {
    limits.min_inclusive
        && limits.min.fract() == 0.0
        && limits.max.fract() == 0.0
        && demo.fract() == 0.0
        && limits.min >= 1.0
        && limits.max - limits.min <= 1000.0
}

/// `value` (SI) as text in `unit`, with the unit written out, at full precision.
pub fn typed(value: f64, kind: QuantityKind, unit: &str) -> Option<String> {
    let number = units::convert_to(value, kind, unit)?;
    number.is_finite().then(|| format!("{number:?} {unit}"))
}

/// Valid text for a free-text field. Quantities in it carry their units, so the
/// same text means the same in either unit system.
pub fn valid_text(spec: &CalculatorSpec, field: &FieldSpec, rng: &mut Rng) -> String {
    match (spec.key, field.key) {
        ("line-schedule", "rows") => schedule_rows(rng),
        ("profile", "points") => traverse_points(rng),
        ("tank-drain", "area_table") => level_area_rows(rng),
        ("tank-drain", "inflow_table") => inflow_rows(rng),
        _ => field.demo.to_string(),
    }
}

/// One to eight line-schedule rows of every kind, with presets and typed values.
pub fn schedule_rows(rng: &mut Rng) -> String {
    let sizes = pipe_sizes::SIZES;
    let soils: Vec<&str> = restraint::soil::SOILS
        .iter()
        .filter(|s| s.bearing > 0.0)
        .map(|s| s.key)
        .collect();
    let mut rows = Vec::new();
    if rng.chance(0.3) {
        rows.push("# generated schedule".to_string());
    }
    let count = 1 + rng.below(8);
    for n in 0..count {
        let kind = *rng.pick(&["bend", "bend", "tee", "reducer", "dead_end", "force"]);
        let mut tokens = vec![kind.to_string()];
        match kind {
            "force" => tokens.push(format!("thrust={:.3}kN", rng.range(0.5, 2000.0))),
            _ => {
                // The main size, and a second (smaller or equal) one for a tee or reducer.
                let (mut main, mut second) = (rng.pick(sizes), rng.pick(sizes));
                if second.od > main.od {
                    std::mem::swap(&mut main, &mut second);
                }
                if rng.chance(0.8) {
                    tokens.push(main.key.to_string());
                } else {
                    tokens.push(format!("d={:.2}mm", main.id * 1000.0));
                    tokens.push(format!("od={:.2}mm", main.od * 1000.0));
                }
                if kind == "bend" {
                    tokens.push(format!("{:.4}deg", rng.range(1.0, 180.0)));
                }
                if kind == "reducer" && rng.chance(0.2) {
                    // Ends nearly alike, typed: the end forces cancel to almost nothing.
                    let apart = 1.0 - *rng.pick(&[1e-12, 1e-9, 1e-7, 1e-4]);
                    tokens.push(format!("d2={:?}mm", main.id * 1000.0 * apart));
                    tokens.push(format!("od2={:?}mm", main.od * 1000.0 * apart));
                } else if kind == "tee" || kind == "reducer" {
                    tokens.push(format!("size2={}", second.key));
                }
            }
        }
        if rng.chance(0.6) {
            tokens.push(rng.pick(&soils).to_string());
        }
        if rng.chance(0.2) {
            tokens.push(format!("sigma={:.1}kPa", rng.range(20.0, 800.0)));
        }
        if rng.chance(0.3) {
            tokens.push(format!("pw={:.2}psi", rng.range(0.0, 400.0)));
        }
        if rng.chance(0.2) {
            tokens.push(format!("p={:.3}bar", rng.range(0.5, 40.0)));
        }
        if kind != "force" && rng.chance(0.3) {
            tokens.push(format!(
                "joint={}",
                rng.pick(&["push_on", "mechanical", "flanged", "welded"])
            ));
        }
        if rng.chance(0.3) {
            tokens.push(format!("turn={}", rng.pick(&["left", "right", "down", "up"])));
        }
        if rng.chance(0.3) {
            tokens.push(format!("h={:.3}m", rng.range(0.2, 3.0)));
        }
        tokens.push(format!("tag=G{n}"));
        rows.push(tokens.join(" "));
    }
    rows.join("\n")
}

/// A vessel's level–area table: the outlet at 0, 2 to 10 rows of rising levels,
/// areas from a square centimetre to a few hundred square metres, in SI or US units.
pub fn level_area_rows(rng: &mut Rng) -> String {
    let count = 2 + rng.below(9);
    let mut level = 0.0;
    let mut rows = Vec::new();
    for i in 0..count {
        if i > 0 {
            level += rng.range(0.01, 5.0);
        }
        let area = if i == 0 && rng.chance(0.2) {
            0.0
        } else {
            10f64.powf(rng.range(-3.5, 2.5))
        };
        if rng.chance(0.5) {
            rows.push(format!("{level:.4} m {area:.6} m2"));
        } else {
            rows.push(format!("{:.5} ft {:.6} ft2", level / 0.3048, area / (0.3048 * 0.3048)));
        }
    }
    rows.join(if rng.chance(0.5) { "; " } else { "\n" })
}

/// A vessel's inflow table: 1 to 8 rows of rising times and flows, in SI or US units.
pub fn inflow_rows(rng: &mut Rng) -> String {
    let count = 1 + rng.below(8);
    let mut time = rng.range(0.0, 30.0);
    let mut rows = Vec::new();
    for _ in 0..count {
        let flow = if rng.chance(0.1) {
            0.0
        } else {
            10f64.powf(rng.range(-1.0, 3.0))
        };
        if rng.chance(0.5) {
            rows.push(format!("{time:.3} min {flow:.5} m3/h"));
        } else {
            rows.push(format!(
                "{:.5} h {:.5} gpm",
                time / 60.0,
                flow * 1000.0 / 3.785411784 / 60.0
            ));
        }
        time += rng.range(0.5, 120.0);
    }
    rows.join(if rng.chance(0.5) { "; " } else { "\n" })
}

/// A traverse of 2 to 12 points from the centre outwards, velocities falling
/// towards the wall, each with its unit.
pub fn traverse_points(rng: &mut Rng) -> String {
    let count = 2 + rng.below(11);
    let centre = rng.range(0.05, 8.0);
    let exponent = rng.range(2.0, 12.0);
    let mut points = Vec::new();
    for i in 0..count {
        let r = if i == 0 && rng.chance(0.7) {
            0.0
        } else {
            (i as f64 + rng.unit()) / (count as f64 + 0.5)
        };
        let u = centre * (1.0 - r).max(0.0).powf(1.0 / exponent) * rng.range(0.9, 1.05);
        if rng.chance(0.5) {
            points.push(format!("{r:.4} {u:.4} m/s"));
        } else {
            points.push(format!("{r:.4} {:.4} ft/s", u / 0.3048));
        }
    }
    points.join(if rng.chance(0.5) { "; " } else { "\n" })
}

/// A valid entry for one field: a value within its limits typed in its SI or US
/// unit, one of its options, or valid free text. `None` for a quantity field
/// without limits.
pub fn valid_field_text(spec: &CalculatorSpec, field: &FieldSpec, rng: &mut Rng) -> Option<String> {
    match &field.kind {
        FieldKind::Quantity(kind) => {
            let value = value_within(field.limits?, *kind, rng);
            let unit = if rng.chance(0.5) { field.si_unit } else { field.us_unit };
            typed(value, *kind, unit)
        }
        FieldKind::Choice(options) => (!options.is_empty()).then(|| rng.pick(options).key.to_string()),
        FieldKind::Text => Some(valid_text(spec, field, rng)),
    }
}

/// Junk text: what a user might paste by mistake.
fn junk_text(rng: &mut Rng) -> String {
    let samples = [
        "",
        "NaN",
        "bend",
        "bend 45deg",
        "bend 1e-300deg di52_12",
        "force thrust=1e308kN",
        "force thrust=1e-300N",
        "0 1e308 m/s; 0.5 1 m/s",
        "0 0 m/s; 0.5 0 m/s",
        "0.5 1 m/s",
        "1 1 m/s",
        "tee di52_4 di52_24",
        "reducer di52_12 di52_12",
        "dead_end d=1e-9mm od=1e-9mm",
        "bend 90deg d=300mm od=1e-300mm",
    ];
    rng.pick(&samples).to_string()
}

/// A request for `spec` drawn with `rng`: every field filled as `reach` allows,
/// numbers typed in the page's or the other system's unit with the unit written.
pub fn request(spec: &CalculatorSpec, system: UnitSystem, reach: Reach, rng: &mut Rng) -> Request {
    let mut request = Request {
        system,
        ..Request::default()
    };
    // One scale per quantity kind and request, so that fields of one kind keep the
    // demo's proportions (an outside diameter above the bore, a nozzle smaller
    // than its pipe) while the whole case moves over decades.
    let mut scales: Vec<(QuantityKind, f64)> = Vec::new();
    let proportional = rng.chance(0.85);
    let exact_demo = rng.chance(0.2);
    for field in &spec.fields {
        let edges = reach == Reach::Edges;
        // Inside the limits, optional fields mostly follow the demo: filled where it
        // fills them, empty where it leaves them empty (a flow share left to the
        // mass balance).
        let skip = match (edges, field.demo.is_empty(), proportional) {
            (true, _, _) => 0.3,
            (false, true, true) => 1.0,
            (false, true, false) => 0.3,
            (false, false, _) => 0.05,
        };
        if field.optional && rng.chance(skip) {
            continue;
        }
        let text = match &field.kind {
            FieldKind::Quantity(kind) => {
                let Some(limits) = field.limits else { continue };
                let value = if edges && rng.chance(0.25) {
                    edge_value(limits, *kind, rng)
                } else {
                    let demo = units::parse_quantity(field.demo, *kind, field.si_unit).ok();
                    match demo {
                        Some(demo) if whole_number_field(limits, demo) => {
                            (limits.min + rng.below((limits.max - limits.min) as usize + 1) as f64).min(limits.max)
                        }
                        Some(demo) if proportional && exact_demo => demo,
                        Some(demo) if proportional && *kind != QuantityKind::Temperature => {
                            let scale = match scales.iter().find(|(k, _)| k == kind) {
                                Some((_, scale)) => *scale,
                                None => {
                                    // Ratios (flow shares that must add up, loss
                                    // coefficients) and angles stay at the demo's.
                                    let scale = if matches!(kind, QuantityKind::Ratio | QuantityKind::Angle) {
                                        1.0
                                    } else {
                                        (rng.range(-1.0, 1.0) * 10f64.ln()).exp()
                                    };
                                    scales.push((*kind, scale));
                                    scale
                                }
                            };
                            let value = demo * scale * rng.range(0.995, 1.005);
                            if limits.contains(value) {
                                value
                            } else {
                                value_within(limits, *kind, rng)
                            }
                        }
                        _ => value_within(limits, *kind, rng),
                    }
                };
                let unit = if rng.chance(0.5) { field.si_unit } else { field.us_unit };
                match typed(value, *kind, unit) {
                    Some(text) => text,
                    None => continue,
                }
            }
            FieldKind::Choice(options) => {
                if options.is_empty() {
                    continue;
                }
                if edges && rng.chance(0.02) {
                    "no-such-option".to_string()
                } else {
                    rng.pick(options).key.to_string()
                }
            }
            FieldKind::Text => {
                if edges && rng.chance(0.2) {
                    junk_text(rng)
                } else {
                    valid_text(spec, field, rng)
                }
            }
        };
        request.inputs.insert(field.key.to_string(), text);
    }
    if rng.chance(NEARLY_ALIKE_SHARE) {
        type_nearly_alike(spec, &mut request, rng);
    }
    request
}

/// The share of requests with two quantities of one kind typed nearly alike.
const NEARLY_ALIKE_SHARE: f64 = 0.25;

/// Types two quantities of one kind nearly alike: the degenerate cases where terms
/// of a balance cancel to almost nothing (a reducer's ends, a nozzle as wide as its
/// bore, blades as fast as the jet). The first keeps the value drawn for it (or
/// gets one, when it was left empty); the second is typed equal to it or apart by a
/// relative 1e-12 to 1e-4 either way, unless that is outside its limits.
fn type_nearly_alike(spec: &CalculatorSpec, request: &mut Request, rng: &mut Rng) {
    let quantities: Vec<(&FieldSpec, QuantityKind, Limits)> = spec
        .fields
        .iter()
        .filter_map(|f| match (&f.kind, f.limits) {
            (FieldKind::Quantity(kind), Some(limits)) => Some((f, *kind, limits)),
            _ => None,
        })
        .collect();
    if quantities.len() < 2 {
        return;
    }
    let (first, kind, first_limits) = quantities[rng.below(quantities.len())];
    let partners: Vec<_> = quantities
        .iter()
        .filter(|(field, k, _)| *k == kind && field.key != first.key)
        .collect();
    if partners.is_empty() {
        return;
    }
    let (second, _, limits) = **rng.pick(&partners);
    let drawn = request
        .inputs
        .get(first.key)
        .and_then(|text| units::parse_quantity(text, kind, first.si_unit).ok());
    let value = match drawn {
        Some(value) => value,
        None => {
            let value = value_within(first_limits, kind, rng);
            let Some(text) = typed(value, kind, first.si_unit) else {
                return;
            };
            request.inputs.insert(first.key.to_string(), text);
            value
        }
    };
    let apart = *rng.pick(&[0.0, 1e-12, 1e-9, 1e-7, 1e-4]);
    let sign = if rng.chance(0.5) { 1.0 } else { -1.0 };
    let near = value * (1.0 + sign * apart);
    if !limits.contains(near) {
        return;
    }
    let unit = if rng.chance(0.5) {
        second.si_unit
    } else {
        second.us_unit
    };
    if let Some(text) = typed(near, kind, unit) {
        request.inputs.insert(second.key.to_string(), text);
    }
}

/// The same generated case typed twice: every quantity in the SI request in its
/// field's SI unit, in the US customary request in its US unit (the same SI value
/// at full precision); options and text alike in both (text carries its units).
pub fn twin_requests(spec: &CalculatorSpec, reach: Reach, rng: &mut Rng) -> (Request, Request) {
    let base = request(spec, UnitSystem::Si, reach, rng);
    let mut si = Request {
        system: UnitSystem::Si,
        ..Request::default()
    };
    let mut us = Request {
        system: UnitSystem::UsCustomary,
        ..Request::default()
    };
    for (key, text) in &base.inputs {
        let field = spec.field(key);
        let retyped = match field.map(|f| (&f.kind, f)) {
            Some((FieldKind::Quantity(kind), f)) => units::parse_quantity(text, *kind, f.si_unit)
                .ok()
                .and_then(|v| Some((typed(v, *kind, f.si_unit)?, typed(v, *kind, f.us_unit)?))),
            _ => None,
        };
        let (a, b) = retyped.unwrap_or_else(|| (text.clone(), text.clone()));
        si.inputs.insert(key.clone(), a);
        us.inputs.insert(key.clone(), b);
    }
    (si, us)
}
