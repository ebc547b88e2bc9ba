//! Velocity profile or traverse → flow, mean velocity and correction factors.
//!
//! # Method
//! For a round pipe of radius R with axial velocity u(r):
//!
//! Q = ∫₀ᴿ u·2πr dr,  V = Q/A,  β = ∫u² dA / (A·V²),  α = ∫u³ dA / (A·V³).
//!
//! A measured traverse (points at radius fractions r/R along one or more diameters,
//! averaged per radius) is integrated with the trapezoidal rule in r over annuli, with
//! u = 0 added at the wall (no slip) when the last point is inside it. The laminar and
//! power-law profiles use the closed forms of [`crate::profile`].
//!
//! The trapezoid over annuli is the "log-linear"-free simple rule; the velocity-area
//! methods of ISO 3966 (Pitot static tubes) and ISO 7194 (current meters) place the
//! points by equal areas or log-linear rules and weight them accordingly; a traverse
//! taken at equal-area radii and integrated here agrees with those within their stated
//! uncertainty for smooth profiles, but this page does not replace those procedures.
//!
//! # Assumptions
//! Axisymmetric profile; the points describe u(r) between them linearly.

use crate::catalog::{
    CalculatorSpec, ChoiceOption, FieldKind, FieldSpec, Limits, OutputSpec, Plot, Report, Series, Table, Values,
};
use crate::error::FieldError;
use crate::profile;
use crate::units::{self, QuantityKind as Q};

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

pub fn spec() -> CalculatorSpec {
    CalculatorSpec {
        key: KEY,
        title: "Velocity profile to flow and correction factors",
        group: crate::catalog::group::FLOW_AND_TANKS,
        summary: "Flow, mean velocity and the momentum-flux and kinetic-energy factors from a traverse or a profile law.",
        fields: vec![
            quantity("d", "Pipe inside diameter", Q::Length, "mm", "in", "610 mm", Limits::positive(MAX_SIZE_M), "Inside diameter at the traverse section."),
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
                help: "One point per entry, separated by ';' or new lines: r/R (0 at the centre, 1 at the wall) then the velocity, with or without a unit (e.g. '0.5 2.4 m/s'). Points at the same r/R are averaged.",
                visible_when: Some(("shape", &["traverse"])),
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["power_law", "laminar"])),
                ..quantity("u_max", "Centre-line velocity", Q::Velocity, "m/s", "ft/s", "2.6 m/s", Limits::closed(0.0, 100.0), "Peak velocity on the axis.")
            },
            FieldSpec {
                optional: true,
                visible_when: Some(("shape", &["power_law"])),
                ..quantity("n", "Power-law exponent n in u = U(1 − r/R)^(1/n)", Q::Ratio, "-", "-", "7", Limits::closed(1.0, 20.0), "About 6 to 10 for turbulent pipe flow; 7 is the usual default (common practice).")
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
            "Traverse point positions and counts follow the measurement standard you work to (e.g. ISO 3966, ISO 7194); this page integrates what you give it.",
        ],
    }
}

/// Parses traverse text into (r/R, u SI) pairs sorted by radius.
fn parse_points(text: &str, unit: &str) -> Result<Vec<(f64, f64)>, FieldError> {
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
    if out.first().map(|p| p.0 > 0.0).unwrap_or(false) {
        // Extend flat to the axis (symmetry: du/dr = 0 there).
        let u0 = out[0].1;
        out.insert(0, (0.0, u0));
    }
    if out.last().map(|p| p.0 < 1.0).unwrap_or(false) {
        out.push((1.0, 0.0));
    }
    Ok(out)
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
    let (mean, beta, alpha, peak, profile_points) = match shape {
        "traverse" => {
            let text = values.text("points").map_err(|e| vec![e])?;
            if text.trim().is_empty() {
                return Err(vec![FieldError::inconsistent("points", "give the traverse points")]);
            }
            let points = parse_points(text, unit).map_err(|e| vec![e])?;
            let [m1, m2, m3] = area_means(&points);
            if m1 <= 0.0 {
                return Err(vec![FieldError::inconsistent(
                    "points",
                    "the velocities are all zero: no flow",
                )]);
            }
            let peak = points.iter().map(|p| p.1).fold(0.0, f64::max);
            (m1, m2 / (m1 * m1), m3 / (m1 * m1 * m1), peak, points)
        }
        kind => {
            if !values.is_set("u_max") {
                return Err(vec![FieldError::inconsistent("u_max", "give the centre-line velocity")]);
            }
            let u_max = values.quantity_or("u_max", 0.0);
            let (factors, law): (profile::ProfileFactors, Box<dyn Fn(f64) -> f64>) = if kind == "laminar" {
                (profile::laminar(), Box::new(|s: f64| 1.0 - s * s))
            } else {
                if !values.is_set("n") {
                    return Err(vec![FieldError::inconsistent("n", "give the power-law exponent")]);
                }
                let n = values.quantity_or("n", 7.0);
                let f = profile::power_law(n)
                    .ok_or_else(|| vec![FieldError::inconsistent("n", "n must be greater than 0")])?;
                (f, Box::new(move |s: f64| (1.0 - s).max(0.0).powf(1.0 / n)))
            };
            let pts: Vec<(f64, f64)> = (0..=40).map(|i| i as f64 / 40.0).map(|s| (s, u_max * law(s))).collect();
            (
                u_max * factors.mean_over_peak,
                factors.momentum_flux,
                factors.kinetic_energy,
                u_max,
                pts,
            )
        }
    };
    report.output("flow", mean * area);
    report.output("v_mean", mean);
    report.output("beta", beta);
    report.output("alpha", alpha);
    if peak > 0.0 {
        report.output("mean_over_peak", mean / peak);
    }
    if beta > 1.1 {
        report.warn(
            Some("shape"),
            "β above 1.1: the profile is far from flat (laminar, disturbed or skewed flow); use β in momentum balances",
        );
    }
    let to_unit = |u: f64| units::convert_to(u, Q::Velocity, unit).unwrap_or(u);
    let mut table = Table {
        key: "profile",
        title: "Profile used in the integration".to_string(),
        columns: vec!["r/R".to_string(), format!("u ({unit})"), "u/V".to_string()],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
    };
    for (s, u) in &profile_points {
        table.rows.push(vec![
            units::format_significant(*s, 3),
            units::format_significant(to_unit(*u), 4),
            units::format_significant(u / mean, 4),
        ]);
    }
    report.solution.tables.push(table);
    let mut curve: Vec<[f64; 2]> = profile_points.iter().rev().map(|(s, u)| [-s, to_unit(*u)]).collect();
    curve.extend(profile_points.iter().map(|(s, u)| [*s, to_unit(*u)]));
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
mod tests {
    use super::*;
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
}
