//! Velocity profile or traverse → flow, mean velocity and correction factors.
//!
//! # Method
//! For a round pipe of radius R with axial velocity u(r), s = r/R:
//!
//! Q = ∫₀ᴿ u·2πr dr,  V = Q/A = ∫₀¹ u·2s ds,  β = ∫u² dA / (A·V²),  α = ∫u³ dA / (A·V³).
//!
//! A measured traverse (points at radius fractions r/R along one or more diameters,
//! averaged per radius) is taken as linear in s between its points and flat from the
//! innermost point to the axis (du/dr = 0 there by symmetry). Between the outermost
//! point (s_L, u_L) and the wall it is closed with the power-law wall zone of the
//! velocity-area methods, u = u_L·((1 − s)/(1 − s_L))^(1/m), m typed (4 for rough
//! walls to 10 for smooth ones, 7 when left empty): ISO 3966 (Pitot static tubes) and
//! ISO 7194 (current meters) close the traverse this way (from memory). Closing it with
//! a straight line to zero at the wall instead biases the flow low: an equal-area
//! traverse of five rings of an exact 1/7 power-law profile reads 3.6 % low with
//! β = 1.055 (exact 1.020) that way, and 0.6 % low with β = 1.020 with the wall zone
//! (scipy 1.17.1, `scipy.integrate.quad` of both closures). The linear segments
//! (integrand of degree ≤ 4 in s) are integrated exactly by three-point Gauss–Legendre
//! quadrature and the wall zone in closed form ([`crate::velocity_profile::wall_zone_means`]).
//! The laminar and power-law profiles use the closed forms of [`crate::velocity_profile`].
//!
//! Checks shown to users compare the mean velocity and β with a tanh-sinh quadrature
//! ([`crate::quadrature`]) of the same profile function, an independent numerical
//! path through the same profile (for the laws: against their closed forms).
//!
//! # Assumptions
//! Axisymmetric profile; the points describe u(r) linearly between them; the wall zone
//! follows a power law from the outermost point; point positions and counts follow
//! the measurement standard the user works to.

use crate::catalog::{
    CalculatorSpec, ChoiceOption, FieldKind, FieldSpec, Limits, OutputSpec, Plot, Report, Series, Table, Values,
};
use crate::error::FieldError;
use crate::quadrature;
use crate::units::{self, QuantityKind as Q};
use crate::velocity_profile;

use super::common::{self, choice, quantity, MAX_SIZE_M};

pub const KEY: &str = "profile";

const SHAPES: &[ChoiceOption] = &[
    ChoiceOption {
        key: "traverse",
        label: "Measured traverse (r/R and velocity)",
    },
    ChoiceOption {
        key: "power_law",
        label: "Power-law turbulent profile",
    },
    ChoiceOption {
        key: "laminar",
        label: "Laminar (parabolic) profile",
    },
];

/// Most points accepted in one traverse.
const MAX_POINTS: usize = 200;
/// Largest velocity accepted anywhere on this page, m/s (faster than any liquid pipe
/// flow this handbook covers).
const MAX_VELOCITY: f64 = 100.0;
/// Smallest peak velocity with a measurable flow, m/s.
const MIN_PEAK_VELOCITY: f64 = 1e-3;
/// Wall-zone exponent used when the field is left empty.
const DEFAULT_WALL_EXPONENT: f64 = 7.0;
/// Tolerance of the quadrature checks (the tanh-sinh sums converge to about 1e-12).
const QUADRATURE_TOLERANCE: f64 = 1e-8;

pub fn spec() -> CalculatorSpec {
    CalculatorSpec {
        key: KEY,
        title: "Velocity profile to flow and correction factors",
        group: crate::catalog::group::FLOW_AND_TANKS,
        summary: "Flow, mean velocity and the momentum-flux and kinetic-energy factors from a traverse or a profile law.",
        fields: vec![
            quantity("d", "Pipe inside diameter", Q::Length, "mm", "in", "610 mm", Limits::closed(1e-3, MAX_SIZE_M), "Inside diameter at the traverse section."),
            choice("shape", "Profile", SHAPES, "traverse", "A measured traverse, or an assumed profile."),
            FieldSpec {
                key: "points",
                label: "Traverse points",
                kind: FieldKind::Text,
                si_unit: "m/s",
                us_unit: "ft/s",
                demo: "0 2.62; 0.2 2.58; 0.4 2.49; 0.6 2.35; 0.8 2.12; 0.9 1.93; 0.95 1.74",
                limits: None,
                optional: true,
                help: "One point per entry, separated by ';' or new lines: r/R (0 at the centre, 1 at the wall) then the velocity, with or without a unit (e.g. '0.5 2.4 m/s'), from 0 to 100 m/s. Points at the same r/R are averaged. The profile is closed to the wall with the power-law wall zone below (a 0 typed at r/R = 1 is the no-slip condition and is treated the same way).",
                visible_when: Some(("shape", &["traverse"])),
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["traverse"])),
                ..quantity("m_wall", "Wall-zone exponent m in u ∝ (1 − r/R)^(1/m)", Q::Ratio, "-", "-", "7", Limits::closed(4.0, 10.0), "The traverse is closed from its outermost point to the wall with a power law, as the velocity-area methods of ISO 3966 and ISO 7194 do: m about 4 for rough walls to 10 for smooth ones (from memory). Empty means 7.")
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["power_law", "laminar"])),
                ..quantity("u_max", "Centre-line velocity", Q::Velocity, "m/s", "ft/s", "2.6 m/s", Limits::closed(MIN_PEAK_VELOCITY, MAX_VELOCITY), "Peak velocity on the axis, from 1 mm/s to 100 m/s.")
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["power_law"])),
                ..quantity("n_power", "Power-law exponent n in u = U(1 − r/R)^(1/n)", Q::Ratio, "-", "-", "7", Limits::closed(1.0, 20.0), "About 6 to 10 for turbulent pipe flow; 7 is the usual default (common practice).")
            },
        ],
        outputs: vec![
            OutputSpec { key: "flow", label: "Volumetric flow", kind: Q::VolumeFlow, headline: true },
            OutputSpec { key: "v_mean", label: "Mean velocity", kind: Q::Velocity, headline: true },
            OutputSpec { key: "beta", label: "Momentum-flux factor β", kind: Q::Ratio, headline: true },
            OutputSpec { key: "alpha", label: "Kinetic-energy factor α", kind: Q::Ratio, headline: true },
            OutputSpec { key: "mean_over_peak", label: "Mean ÷ peak velocity", kind: Q::Ratio, headline: false },
        ],
        cautions: vec![
            "The wall zone is assumed, not measured: a disturbed or rough-walled section can differ; a traverse with points close to the wall depends least on it.",
            "For flow measured for a contract, a permit or an acceptance test, follow the measurement standard and the local rules, and have the result checked by a licensed engineer; this page does not replace them.",
            "Traverse point positions and counts follow the measurement standard you work to (e.g. ISO 3966, ISO 7194); this page integrates what you give it.",
        ],
    }
}

/// Parses traverse text into (r/R, u SI) pairs sorted by radius, starting at the
/// axis, and whether the axis point was added (flat from the innermost point).
fn parse_points(text: &str, unit: &str) -> Result<(Vec<(f64, f64)>, bool), FieldError> {
    let mut points = Vec::new();
    for (index, entry) in text
        .split([';', '\n'])
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .enumerate()
    {
        let row = index + 1;
        let (r_text, u_text) = entry
            .split_once(|c: char| c.is_whitespace() || c == '\t')
            .ok_or_else(|| {
                FieldError::inconsistent(
                    "points",
                    format!("point {row}: give r/R and a velocity, e.g. '0.5 2.4 m/s'"),
                )
            })?;
        let r = units::parse_quantity(r_text, Q::Ratio, "-")
            .map_err(|e| FieldError::inconsistent("points", format!("point {row}, r/R: {e}")))?;
        if !(0.0..=1.0).contains(&r) {
            return Err(FieldError::inconsistent(
                "points",
                format!("point {row}: r/R must be from 0 (centre) to 1 (wall)"),
            ));
        }
        let u = units::parse_quantity(u_text.trim(), Q::Velocity, unit)
            .map_err(|e| FieldError::inconsistent("points", format!("point {row}, velocity: {e}")))?;
        if u < 0.0 {
            return Err(FieldError::inconsistent(
                "points",
                format!("point {row}: a negative velocity means reversed flow; this page needs u ≥ 0"),
            ));
        }
        if !(0.0..=MAX_VELOCITY).contains(&u) {
            return Err(FieldError::inconsistent(
                "points",
                format!(
                    "point {row}: the velocity must be from 0 to {}",
                    units::format_quantity_in(MAX_VELOCITY, Q::Velocity, unit)
                ),
            ));
        }
        points.push((r, u));
        if points.len() > MAX_POINTS {
            return Err(FieldError::inconsistent(
                "points",
                format!("at most {MAX_POINTS} points"),
            ));
        }
    }
    points.sort_by(|a, b| a.0.total_cmp(&b.0));
    // Average points at the same radius.
    let mut merged: Vec<(f64, f64, usize)> = Vec::new();
    for (r, u) in points {
        match merged.last_mut() {
            Some(last) if (last.0 - r).abs() < 1e-12 => {
                last.1 += u;
                last.2 += 1;
            }
            _ => merged.push((r, u, 1)),
        }
    }
    let mut out: Vec<(f64, f64)> = merged.into_iter().map(|(r, u, n)| (r, u / n as f64)).collect();
    if out.len() < 2 {
        return Err(FieldError::inconsistent("points", "give at least two points"));
    }
    let axis_added = out.first().map(|p| p.0 > 0.0).unwrap_or(false);
    if axis_added {
        // Extend flat to the axis (symmetry: du/dr = 0 there).
        let u0 = out[0].1;
        out.insert(0, (0.0, u0));
    }
    if let [.., before, (last_s, last_u)] = out[..] {
        // A zero typed at the wall is the no-slip condition the wall zone already
        // meets: drop it so that the wall zone starts at the last measured point.
        if last_s >= 1.0 && last_u == 0.0 && before.0 < 1.0 {
            out.pop();
        }
    }
    if out.iter().map(|p| p.1).fold(0.0, f64::max) < MIN_PEAK_VELOCITY {
        return Err(FieldError::inconsistent(
            "points",
            format!(
                "no measurable flow: the largest velocity is below {}",
                units::format_quantity_in(MIN_PEAK_VELOCITY, Q::Velocity, unit)
            ),
        ));
    }
    Ok((out, axis_added))
}

/// A traverse closed for integration: linear between `points` (the first at the
/// axis), then, when the last point is inside the wall, the power-law wall zone with
/// exponent 1/`wall_exponent` down to zero at the wall.
struct ClosedTraverse {
    points: Vec<(f64, f64)>,
    /// Whether the point on the axis was added (flat from the innermost point).
    axis_added: bool,
    wall_exponent: f64,
}

impl ClosedTraverse {
    fn outermost(&self) -> (f64, f64) {
        self.points.last().copied().unwrap_or((1.0, 0.0))
    }
    fn has_wall_zone(&self) -> bool {
        self.outermost().0 < 1.0
    }
    /// u at s = r/R; `from_wall` is 1 − s, passed separately for precision.
    fn velocity(&self, s: f64, from_wall: f64) -> f64 {
        let (s_last, u_last) = self.outermost();
        if s >= s_last {
            if s_last >= 1.0 {
                return u_last;
            }
            return u_last * (from_wall / (1.0 - s_last)).powf(1.0 / self.wall_exponent);
        }
        for w in self.points.windows(2) {
            let ((s0, u0), (s1, u1)) = (w[0], w[1]);
            if s <= s1 && s1 > s0 {
                return u0 + (u1 - u0) * (s - s0) / (s1 - s0);
            }
        }
        self.points.first().map(|p| p.1).unwrap_or(0.0)
    }
    /// Area means of u, u², u³: exact for the linear part and the wall zone.
    fn means(&self) -> [f64; 3] {
        let mut sums = area_means(&self.points);
        if self.has_wall_zone() {
            let (s_last, u_last) = self.outermost();
            let wall = velocity_profile::wall_zone_means(s_last, u_last, self.wall_exponent);
            for (sum, part) in sums.iter_mut().zip(wall) {
                *sum += part;
            }
        }
        sums
    }
    /// The same means by tanh-sinh quadrature of [`Self::velocity`] over each piece.
    fn means_by_quadrature(&self) -> [f64; 3] {
        let mut edges: Vec<f64> = self.points.iter().map(|p| p.0).collect();
        if self.has_wall_zone() {
            edges.push(1.0);
        }
        let mut sums = [0.0; 3];
        for w in edges.windows(2) {
            let (a, b) = (w[0], w[1]);
            if b <= a {
                continue;
            }
            for (k, sum) in sums.iter_mut().enumerate() {
                *sum += quadrature::tanh_sinh(a, b, 1.0 / 32.0, |from_a, from_b| {
                    let s = a + from_a;
                    let from_wall = if b >= 1.0 { from_b } else { 1.0 - s };
                    self.velocity(s, from_wall).powi(k as i32 + 1) * 2.0 * s
                });
            }
        }
        sums
    }
    /// Points for the table and plot: the measured ones and samples of the wall zone.
    fn samples(&self) -> Vec<(f64, f64, &'static str)> {
        let mut out: Vec<(f64, f64, &'static str)> = Vec::new();
        for (i, &(s, u)) in self.points.iter().enumerate() {
            let note = if i == 0 && self.axis_added {
                "axis (flat)"
            } else {
                "measured"
            };
            out.push((s, u, note));
        }
        if self.has_wall_zone() {
            let (s_last, _) = self.outermost();
            let delta = 1.0 - s_last;
            for j in 1..=8 {
                let from_wall = delta * (1.0 - j as f64 / 8.0).powi(2);
                out.push((1.0 - from_wall, self.velocity(1.0 - from_wall, from_wall), "wall zone"));
            }
        }
        out
    }
}

/// ∫₀¹ f(s)·2s ds for piecewise-linear u(s), returning the means of u, u², u³ over
/// the area (exact for the piecewise-linear profile: Gauss–Legendre on each segment).
fn area_means(points: &[(f64, f64)]) -> [f64; 3] {
    let mut sums = [0.0; 3];
    for w in points.windows(2) {
        let (s0, u0) = w[0];
        let (s1, u1) = w[1];
        let h = s1 - s0;
        if h <= 0.0 {
            continue;
        }
        // Integrand degree ≤ 4 (u³·s): three-point Gauss–Legendre is exact to degree 5.
        const NODES: [(f64, f64); 3] = [
            (-0.774_596_669_241_483_4, 5.0 / 9.0),
            (0.0, 8.0 / 9.0),
            (0.774_596_669_241_483_4, 5.0 / 9.0),
        ];
        for k in 1..=3 {
            let mut acc = 0.0;
            for (x, w) in NODES {
                let s = s0 + 0.5 * h * (x + 1.0);
                let u = u0 + (u1 - u0) * (s - s0) / h;
                acc += w * u.powi(k) * 2.0 * s;
            }
            sums[k as usize - 1] += 0.5 * h * acc;
        }
    }
    sums
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let d = values.quantity("d").map_err(|e| vec![e])?;
    let area = common::circle_area(d);
    let shape = values.choice("shape").map_err(|e| vec![e])?;
    let unit = match report.system() {
        units::UnitSystem::Si => "m/s",
        units::UnitSystem::UsCustomary => "ft/s",
    };
    let mut basis: Vec<(&str, String)> = Vec::new();
    // (mean, β, α, peak, samples for the table and plot, means by quadrature)
    let (mean, beta, alpha, peak, samples, by_quadrature) = match shape {
        "traverse" => {
            let text = values.text("points").map_err(|e| vec![e])?;
            if text.trim().is_empty() {
                return Err(vec![FieldError::inconsistent("points", "give the traverse points")]);
            }
            let (points, axis_added) = parse_points(text, unit).map_err(|e| vec![e])?;
            let wall_exponent = values.quantity_or("m_wall", DEFAULT_WALL_EXPONENT);
            let traverse = ClosedTraverse {
                points,
                axis_added,
                wall_exponent,
            };
            let [m1, m2, m3] = traverse.means();
            if m1 <= 0.0 {
                return Err(vec![FieldError::inconsistent(
                    "points",
                    "the velocities are all zero: no flow",
                )]);
            }
            let (s_last, u_last) = traverse.outermost();
            if traverse.has_wall_zone() {
                basis.push((
                    "Wall zone",
                    format!(
                        "power law u ∝ (1 − r/R)^(1/{}) from r/R = {} to the wall{}",
                        units::format_significant(wall_exponent, 3),
                        units::format_significant(s_last, 3),
                        if values.is_set("m_wall") {
                            ""
                        } else {
                            " (m = 7 when left empty)"
                        }
                    ),
                ));
            } else if u_last > 0.0 {
                basis.push(("Wall zone", "none: the last point is at the wall".to_string()));
                report.warn(
                    Some("points"),
                    "the point at r/R = 1 has a velocity above 0: the flow sticks to the wall (no slip), so a velocity there overstates the flow; leave the wall point out and the wall zone closes the profile",
                );
            }
            let peak = traverse.points.iter().map(|p| p.1).fold(0.0, f64::max);
            (
                m1,
                m2 / (m1 * m1),
                m3 / (m1 * m1 * m1),
                peak,
                traverse.samples(),
                traverse.means_by_quadrature(),
            )
        }
        kind => {
            if !values.is_set("u_max") {
                return Err(vec![FieldError::inconsistent("u_max", "give the centre-line velocity")]);
            }
            let u_max = values.quantity_or("u_max", 0.0);
            let (factors, exponent) = if kind == "laminar" {
                (velocity_profile::laminar(), None)
            } else {
                if !values.is_set("n_power") {
                    return Err(vec![FieldError::inconsistent("n_power", "give the power-law exponent")]);
                }
                let n = values.quantity_or("n_power", 7.0);
                let f = velocity_profile::power_law(n)
                    .ok_or_else(|| vec![FieldError::inconsistent("n_power", "n must be greater than 0")])?;
                (f, Some(n))
            };
            // u/U at s, with the distance from the wall passed for precision there.
            let law = move |s: f64, from_wall: f64| match exponent {
                None => from_wall * (1.0 + s),
                Some(n) => from_wall.max(0.0).powf(1.0 / n),
            };
            let samples: Vec<(f64, f64, &'static str)> = (0..=40)
                .map(|i| i as f64 / 40.0)
                .map(|s| (s, u_max * law(s, 1.0 - s), "profile law"))
                .collect();
            let mut by_quadrature = [0.0; 3];
            for (k, sum) in by_quadrature.iter_mut().enumerate() {
                *sum = quadrature::tanh_sinh(0.0, 1.0, 1.0 / 32.0, |s, from_wall| {
                    (u_max * law(s, from_wall)).powi(k as i32 + 1) * 2.0 * s
                });
            }
            (
                u_max * factors.mean_over_peak,
                factors.momentum_flux,
                factors.kinetic_energy,
                u_max,
                samples,
                by_quadrature,
            )
        }
    };
    report.output("flow", mean * area);
    report.output("v_mean", mean);
    report.output("beta", beta);
    report.output("alpha", alpha);
    report.output("mean_over_peak", mean / peak);
    let [q1, q2, _] = by_quadrature;
    let independent = if shape == "traverse" {
        "tanh-sinh quadrature of the same closed profile (measured points, linear between them, and the wall zone)"
    } else {
        "tanh-sinh quadrature of the profile law against its closed form"
    };
    report.check(
        "Mean velocity",
        independent,
        Q::Velocity,
        mean,
        q1,
        QUADRATURE_TOLERANCE,
        0.0,
    );
    report.check(
        "Momentum-flux factor β",
        independent,
        Q::Ratio,
        beta,
        q2 / (q1 * q1),
        QUADRATURE_TOLERANCE,
        0.0,
    );
    if beta > 1.1 {
        report.warn(
            Some("shape"),
            "β above 1.1: the profile is far from flat (laminar, disturbed or skewed flow); use β in momentum balances",
        );
    }
    if !basis.is_empty() {
        report.solution.tables.push(common::basis_table(basis));
    }
    let to_unit = |u: f64| units::convert_to(u, Q::Velocity, unit).unwrap_or(u);
    let mut table = Table {
        key: "profile",
        title: "Profile used in the integration".to_string(),
        columns: vec![
            "r/R".to_string(),
            format!("u ({unit})"),
            "u/V".to_string(),
            "from".to_string(),
        ],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
    };
    for (s, u, note) in &samples {
        table.rows.push(vec![
            units::format_significant(*s, 3),
            units::format_significant(to_unit(*u), 4),
            units::format_significant(u / mean, 4),
            note.to_string(),
        ]);
    }
    report.solution.tables.push(table);
    let mut curve: Vec<[f64; 2]> = samples.iter().rev().map(|(s, u, _)| [-s, to_unit(*u)]).collect();
    curve.extend(samples.iter().map(|(s, u, _)| [*s, to_unit(*u)]));
    report.solution.plots.push(Plot {
        key: "profile",
        title: "Velocity across the pipe".to_string(),
        x_label: "position r/R across the diameter".to_string(),
        y_label: format!("velocity ({unit})"),
        series: vec![
            Series {
                name: "profile".to_string(),
                points: curve,
            },
            Series {
                name: "mean velocity".to_string(),
                points: vec![[-1.0, to_unit(mean)], [1.0, to_unit(mean)]],
            },
        ],
        markers: Vec::new(),
    });
    Ok(())
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;
    use crate::catalog::{Shape, Solution};

    /// Whether a solution shows only finite numbers and agreeing checks: outputs,
    /// table cells (no NaN, inf or "—"), plot points, diagram shapes; no defects.
    pub(crate) fn clean(s: &Solution) -> Result<(), String> {
        if !s.defects.is_empty() {
            return Err(format!("defects {:?}", s.defects));
        }
        if let Some(c) = s.checks.iter().find(|c| !c.agrees()) {
            return Err(format!(
                "check '{}' disagrees: {} against {}",
                c.label, c.value, c.reference
            ));
        }
        if let Some(o) = s.outputs.iter().find(|o| !o.si.is_finite()) {
            return Err(format!("output {} is {}", o.key, o.si));
        }
        for t in &s.tables {
            for cell in t.rows.iter().flatten() {
                let lower = cell.to_lowercase();
                if lower.contains("nan") || lower.contains("inf") || cell.contains('—') {
                    return Err(format!("table '{}' shows '{cell}'", t.title));
                }
            }
        }
        for p in &s.plots {
            if !p
                .series
                .iter()
                .flat_map(|s| &s.points)
                .flatten()
                .chain(p.markers.iter().flat_map(|m| &m.at))
                .all(|x| x.is_finite())
            {
                return Err(format!("plot '{}' has a non-finite point", p.title));
            }
        }
        for d in &s.diagrams {
            let finite = d.bounds.iter().all(|x| x.is_finite())
                && d.shapes.iter().all(|shape| {
                    common::shape_points(shape).iter().flatten().all(|x| x.is_finite())
                        && !matches!(shape, Shape::Circle { radius, .. } if !radius.is_finite())
                });
            if !finite {
                return Err(format!("diagram '{}' has a non-finite shape", d.title));
            }
        }
        Ok(())
    }

    #[test]
    fn extreme_accepted_inputs_show_finite_numbers() {
        let sets: &[&[(&str, &str)]] = &[
            &[("d", "1 mm"), ("points", "0 100; 0.999999 100")],
            &[("d", "10 m"), ("points", "0 0.001; 0.5 0; 0.9 0")],
            &[("d", "10 m"), ("points", "0 100; 1e-12 0.001")],
            &[("points", "0 1; 0.3 100; 0.6 0.001; 1 0"), ("m_wall", "4")],
            &[("points", "0.999 5; 1 5"), ("m_wall", "10")],
            &[("shape", "power_law"), ("u_max", "0.001 m/s"), ("n_power", "1")],
            &[
                ("shape", "power_law"),
                ("u_max", "100 m/s"),
                ("n_power", "20"),
                ("d", "10 m"),
            ],
            &[("shape", "laminar"), ("u_max", "0.001 m/s"), ("d", "1 mm")],
        ];
        for pairs in sets {
            let s = crate::calculators::testing::solved(KEY, pairs);
            clean(&s).unwrap_or_else(|e| panic!("{pairs:?}: {e}"));
        }
    }
    use approx::assert_relative_eq;

    #[test]
    fn linear_segments_integrate_exactly() {
        // Derived from the definition: u = U(1 − s) (a cone) has mean U/3 over the area
        // (∫(1−s)2s ds = 1/3), mean of u² = U²/6, of u³ = U³/10.
        let [m1, m2, m3] = area_means(&[(0.0, 1.0), (1.0, 0.0)]);
        assert_relative_eq!(m1, 1.0 / 3.0, max_relative = 1e-12);
        assert_relative_eq!(m2, 1.0 / 6.0, max_relative = 1e-12);
        assert_relative_eq!(m3, 1.0 / 10.0, max_relative = 1e-12);
    }

    #[test]
    fn bad_rows_name_the_point() {
        let err = parse_points("0 2.0; 1.5 1.0", "m/s").unwrap_err();
        assert!(err.to_string().contains("point 2"), "{err}");
        let err = parse_points("0 2.0; 0.5 5 psi", "m/s").unwrap_err();
        assert!(err.to_string().contains("point 2, velocity"), "{err}");
    }

    fn outcome(pairs: &[(&str, &str)]) -> crate::Outcome {
        crate::calculators::testing::outcome(super::KEY, pairs)
    }

    #[test]
    fn wall_zone_closure_of_the_demo() {
        // The reviewer's figures (issue 8, item 1.5), recomputed with scipy==1.17.1,
        // scipy.integrate.quad over each segment of the demo traverse: 2222.4 m³/h
        // closed with a straight line to the wall, 2289.8 m³/h with a 1/7 wall zone.
        let s = outcome(&[]).result.expect("solves");
        assert_relative_eq!(
            s.output("flow").unwrap().si * 3600.0,
            2289.8150952470055,
            max_relative = 1e-9
        );
        assert_relative_eq!(s.output("beta").unwrap().si, 1.0204897208408683, max_relative = 1e-9);
        assert!(s.defects.is_empty() && s.checks.iter().all(|c| c.agrees()), "{s:?}");
    }

    #[test]
    fn wall_zone_closed_form_matches_quadrature() {
        for (s_last, u_last, m) in [(0.0, 1.0, 7.0), (0.9, 2.5, 4.0), (0.99, 1.0, 10.0)] {
            let closed = velocity_profile::wall_zone_means(s_last, u_last, m);
            for (power, closed) in (1..=3).zip(closed) {
                let numeric = quadrature::tanh_sinh(s_last, 1.0, 1.0 / 64.0, |from_a, from_wall| {
                    (u_last * (from_wall / (1.0 - s_last)).powf(1.0 / m)).powi(power) * 2.0 * (s_last + from_a)
                });
                assert_relative_eq!(closed, numeric, max_relative = 1e-11);
            }
        }
    }

    #[test]
    fn tiny_and_zero_velocities_are_refused_or_finite() {
        let field = |pairs: &[(&str, &str)]| match outcome(pairs).result {
            Err(crate::SolveError::Fields(errors)) => errors[0].field.clone(),
            other => panic!("expected a field error, got {other:?}"),
        };
        assert_eq!(field(&[("shape", "laminar"), ("u_max", "0")]), "u_max");
        assert_eq!(field(&[("points", "0 1e-300; 0.5 0")]), "points");
        assert_eq!(field(&[("points", "0 2; 0.5 NaN")]), "points");
        let s = outcome(&[("points", "0 0.001; 1e-9 0")]).result.expect("solves");
        assert!(s.defects.is_empty(), "{:?}", s.defects);
    }
}
