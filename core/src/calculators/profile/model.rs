//! The profile page's model: the typed inputs read once from the values (the
//! traverse text parsed into points), and the pure integration returning a typed
//! result. The method is in the page's module doc ([`super`]).

use uom::si::f64::{Length, Ratio, Velocity};

use crate::catalog::Values;
use crate::error::{FieldError, FieldErrors};
use crate::quadrature;
use crate::units::{self, QuantityKind as Q, UnitSystem};
use crate::velocity_profile;

use super::{DEFAULT_WALL_EXPONENT, MAX_POINTS, MAX_VELOCITY, MIN_PEAK_VELOCITY};
use crate::calculators::common;

/// The profile, as given.
#[derive(Clone, Debug)]
pub enum Shape {
    /// A measured traverse: points (r/R, u in m/s) from the axis, whether the axis
    /// point was added, and the wall-zone exponent m (`None` when left empty: 7).
    Traverse {
        points: Vec<(f64, f64)>,
        axis_added: bool,
        wall_exponent: Option<Ratio>,
    },
    /// u = U(1 − (r/R)²).
    Laminar { peak: Velocity },
    /// u = U(1 − r/R)^(1/n).
    PowerLaw { peak: Velocity, exponent: Ratio },
}

/// The profile page's inputs, read once from the values ([`read`]).
#[derive(Clone, Debug)]
pub struct Inputs {
    pub diameter: Length,
    pub shape: Shape,
}

/// Reads the values once into typed inputs; traverse velocities typed without a
/// unit are in the default unit of `system` (m/s or ft/s).
///
/// # Errors
/// The field that is missing or wrong, naming the point for a traverse.
pub fn read(values: &Values, system: UnitSystem) -> Result<Inputs, FieldErrors> {
    let diameter: Length = values.typed("d")?;
    let shape = match values.choice("shape")? {
        "traverse" => {
            let text = values.text("points")?;
            if text.trim().is_empty() {
                return Err(FieldError::inconsistent("points", "give the traverse points").into());
            }
            let (points, axis_added) = parse_points(text, velocity_unit(system))?;
            Shape::Traverse {
                points,
                axis_added,
                wall_exponent: values.typed_opt("m_wall"),
            }
        }
        kind => {
            let peak: Velocity = values
                .typed_opt("u_max")
                .ok_or_else(|| FieldError::inconsistent("u_max", "give the centre-line velocity"))?;
            if kind == "laminar" {
                Shape::Laminar { peak }
            } else {
                let exponent: Ratio = values
                    .typed_opt("n_power")
                    .ok_or_else(|| FieldError::inconsistent("n_power", "give the power-law exponent"))?;
                Shape::PowerLaw { peak, exponent }
            }
        }
    };
    Ok(Inputs { diameter, shape })
}

/// The default velocity unit of a unit system.
pub fn velocity_unit(system: UnitSystem) -> &'static str {
    match system {
        UnitSystem::Si => "m/s",
        UnitSystem::UsCustomary => "ft/s",
    }
}

/// Parses traverse text into (r/R, u SI) pairs sorted by radius, starting at the
/// axis, and whether the axis point was added (flat from the innermost point).
pub fn parse_points(text: &str, unit: &str) -> Result<(Vec<(f64, f64)>, bool), FieldError> {
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
#[derive(Clone, Debug)]
pub struct ClosedTraverse {
    pub points: Vec<(f64, f64)>,
    /// Whether the point on the axis was added (flat from the innermost point).
    pub axis_added: bool,
    pub wall_exponent: f64,
}

impl ClosedTraverse {
    pub fn outermost(&self) -> (f64, f64) {
        self.points.last().copied().unwrap_or((1.0, 0.0))
    }
    pub fn has_wall_zone(&self) -> bool {
        self.outermost().0 < 1.0
    }
    /// u at s = r/R; `from_wall` is 1 − s, passed separately for precision.
    pub fn velocity(&self, s: f64, from_wall: f64) -> f64 {
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
    pub fn means(&self) -> [f64; 3] {
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
    pub fn means_by_quadrature(&self) -> [f64; 3] {
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
    pub fn samples(&self) -> Vec<(f64, f64, &'static str)> {
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
pub fn area_means(points: &[(f64, f64)]) -> [f64; 3] {
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

/// The result of integrating the profile (SI).
#[derive(Clone, Debug)]
pub struct Solved {
    pub area: f64,
    pub mean: f64,
    /// Momentum-flux factor β.
    pub beta: f64,
    /// Kinetic-energy factor α.
    pub alpha: f64,
    pub peak: f64,
    /// (r/R, u, where the point comes from) for the table and the plot.
    pub samples: Vec<(f64, f64, &'static str)>,
    /// Area means of u, u² and u³ by tanh-sinh quadrature (the independent path).
    pub by_quadrature: [f64; 3],
    /// Whether the profile came from a traverse (else from a law).
    pub traverse: bool,
    /// The wall zone of a traverse: (exponent m, r/R where it starts, whether m was
    /// left empty).
    pub wall_zone: Option<(f64, f64, bool)>,
    /// A traverse point at the wall with a velocity above 0 (no slip violated).
    pub moving_wall_point: bool,
}

/// Integrates the profile.
///
/// # Errors
/// A traverse with no flow, or a law with an impossible exponent.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let area = common::circle_area(inputs.diameter.value);
    match &inputs.shape {
        Shape::Traverse {
            points,
            axis_added,
            wall_exponent,
        } => {
            let traverse = ClosedTraverse {
                points: points.clone(),
                axis_added: *axis_added,
                wall_exponent: wall_exponent.map_or(DEFAULT_WALL_EXPONENT, |m| m.value),
            };
            let [m1, m2, m3] = traverse.means();
            if m1 <= 0.0 {
                return Err(FieldError::inconsistent("points", "the velocities are all zero: no flow").into());
            }
            let (s_last, u_last) = traverse.outermost();
            let wall_zone =
                traverse
                    .has_wall_zone()
                    .then_some((traverse.wall_exponent, s_last, wall_exponent.is_none()));
            Ok(Solved {
                area,
                mean: m1,
                beta: m2 / (m1 * m1),
                alpha: m3 / (m1 * m1 * m1),
                peak: traverse.points.iter().map(|p| p.1).fold(0.0, f64::max),
                samples: traverse.samples(),
                by_quadrature: traverse.means_by_quadrature(),
                traverse: true,
                wall_zone,
                moving_wall_point: !traverse.has_wall_zone() && u_last > 0.0,
            })
        }
        Shape::Laminar { peak } => Ok(law(area, peak.value, None)),
        Shape::PowerLaw { peak, exponent } => {
            let n = exponent.value;
            if velocity_profile::power_law(n).is_none() {
                return Err(FieldError::inconsistent("n_power", "n must be greater than 0").into());
            }
            Ok(law(area, peak.value, Some(n)))
        }
    }
}

/// A profile law: laminar (`exponent` `None`) or power law with exponent 1/n.
fn law(area: f64, u_max: f64, exponent: Option<f64>) -> Solved {
    let factors = match exponent {
        None => velocity_profile::laminar(),
        Some(n) => velocity_profile::power_law(n).unwrap_or_else(velocity_profile::laminar),
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
    Solved {
        area,
        mean: u_max * factors.mean_over_peak,
        beta: factors.momentum_flux,
        alpha: factors.kinetic_energy,
        peak: u_max,
        samples,
        by_quadrature,
        traverse: false,
        wall_zone: None,
        moving_wall_point: false,
    }
}
