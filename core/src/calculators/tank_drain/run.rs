//! The vessel's run in time: the outflow of each outlet at a level (quasi-steady
//! energy balance), the inflow at a time, and the mass balance dV/dt = Q_in − Q_out
//! integrated with step-doubling RK4 until the level reaches the final level, the
//! vessel empties or fills, the level settles, or the longest time is reached.
//!
//! The state is the liquid volume V, not the level: where the area vanishes at the
//! outlet (a sphere, a horizontal cylinder, a cone) dh/dt is unbounded near empty
//! while dV/dt stays finite, so the step control sees a smooth problem.

use crate::friction::darcy_friction_factor;
use crate::numeric;
use crate::units::STANDARD_GRAVITY;

use super::geometry::Shape;

/// Relative tolerance of one RK4 step (against the volume scale of the run).
const STEP_TOLERANCE: f64 = 1e-11;
/// Most accepted and rejected steps of one run.
pub const MAX_STEPS: usize = 100_000;
/// The level has settled when |Q_in − Q_out| is below this share of the flows.
const SETTLED: f64 = 1e-7;
/// Reynolds number where the pipe's laminar law ends.
pub const LAMINAR_LIMIT: f64 = 2300.0;

/// How the vessel lets liquid out.
#[derive(Clone, Debug, PartialEq)]
pub enum Outlet {
    /// A bottom orifice: area a, C_d, C_v.
    Orifice { area: f64, cd: f64, cv: f64 },
    /// A pipe from the bottom, discharging to atmosphere `drop` below the outlet.
    Pipe {
        bore: f64,
        length: f64,
        roughness: f64,
        /// Sum of the minor loss coefficients (entrance, fittings, valve).
        k_minor: f64,
        drop: f64,
    },
    /// A pump taking a fixed flow while there is liquid.
    Pump { flow: f64 },
}

/// How liquid comes in.
#[derive(Clone, Debug, PartialEq)]
pub enum Inflow {
    None,
    Constant(f64),
    /// (time, flow) rows, linear between rows, the last flow held after the last row
    /// and the first before the first.
    Table(Vec<(f64, f64)>),
}

impl Inflow {
    pub fn at(&self, t: f64) -> f64 {
        match self {
            Inflow::None => 0.0,
            Inflow::Constant(q) => *q,
            Inflow::Table(rows) => super::geometry::interpolate(rows, t),
        }
    }
    /// The first row time of a table after `t`.
    pub fn next_row_after(&self, t: f64) -> Option<f64> {
        match self {
            Inflow::Table(rows) => rows.iter().map(|r| r.0).find(|&time| time > t),
            _ => None,
        }
    }
    /// The time after which the inflow no longer changes.
    pub fn settles_after(&self) -> f64 {
        match self {
            Inflow::Table(rows) => rows.last().map_or(0.0, |r| r.0),
            _ => 0.0,
        }
    }
    /// The inflow once it no longer changes.
    pub fn last(&self) -> f64 {
        self.at(self.settles_after() + 1.0)
    }
}

/// The vessel and its outlet in SI numbers.
#[derive(Clone, Debug)]
pub struct Vessel {
    pub shape: Shape,
    /// Height of the top above the outlet, if the vessel has one.
    pub top: Option<f64>,
    pub outlet: Outlet,
    pub inflow: Inflow,
    /// Gauge pressure of the gas above the liquid, Pa (held constant).
    pub gas_pressure: f64,
    pub density: f64,
    pub viscosity: f64,
}

/// The outlet's state at one level.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct OutletState {
    /// Volume flow out.
    pub flow: f64,
    /// Velocity of the leaving jet (vena contracta, pipe exit), 0 for a pump.
    pub jet_velocity: f64,
    /// Area of the leaving jet, 0 for a pump.
    pub jet_area: f64,
    /// Reynolds number in the outlet pipe (0 for the others).
    pub reynolds: f64,
    /// Darcy friction factor of the outlet pipe (0 for the others).
    pub friction: f64,
}

impl Vessel {
    /// Area ratio r = C_d·a/A of the prismatic (vertical cylinder) orifice case,
    /// whose quasi-steady law keeps the velocity head of the falling surface; 0
    /// otherwise (the surface's velocity head is neglected).
    pub fn approach_ratio(&self) -> f64 {
        match (&self.shape, &self.outlet) {
            (Shape::VerticalCylinder { .. }, Outlet::Orifice { area, cd, .. }) => cd * area / self.shape.area(0.0),
            _ => 0.0,
        }
    }

    /// Driving head at level `h`: the level, the gas pressure and the pipe's drop.
    pub fn head(&self, h: f64) -> f64 {
        let drop = match self.outlet {
            Outlet::Pipe { drop, .. } => drop,
            _ => 0.0,
        };
        h.max(0.0) + drop + self.gas_pressure / (self.density * STANDARD_GRAVITY)
    }

    /// The outlet's quasi-steady state at level `h` (below 0 reads as 0).
    pub fn outlet_at(&self, h: f64) -> OutletState {
        let head = self.head(h);
        match self.outlet {
            Outlet::Orifice { area, cd, cv } => {
                let r = self.approach_ratio();
                let ideal = (2.0 * STANDARD_GRAVITY * head / (1.0 - r * r)).sqrt();
                OutletState {
                    flow: cd * area * ideal,
                    jet_velocity: cv * ideal,
                    jet_area: cd / cv * area,
                    ..OutletState::default()
                }
            }
            Outlet::Pipe {
                bore,
                length,
                roughness,
                k_minor,
                ..
            } => {
                let velocity = self.pipe_velocity(head, bore, length, roughness, k_minor);
                let reynolds = self.density * velocity * bore / self.viscosity;
                OutletState {
                    flow: pipe_area(bore) * velocity,
                    jet_velocity: velocity,
                    jet_area: pipe_area(bore),
                    reynolds,
                    friction: friction(reynolds, roughness / bore),
                }
            }
            Outlet::Pump { flow } => OutletState {
                flow,
                ..OutletState::default()
            },
        }
    }

    /// Pipe velocity V from g·H = ½V²·(1 + K) + ½V²·f·L/D (exit velocity head,
    /// minor losses, Darcy–Weisbach friction with f from Colebrook or 64/Re), by
    /// a bracketed search ([`numeric::sign_change_of`]): the right side rises with V.
    fn pipe_velocity(&self, head: f64, bore: f64, length: f64, roughness: f64, k_minor: f64) -> f64 {
        let energy = STANDARD_GRAVITY * head;
        if energy <= 0.0 {
            return 0.0;
        }
        let needed = |v: f64| {
            let reynolds = self.density * v * bore / self.viscosity;
            0.5 * v * v * (1.0 + k_minor) + friction_loss(v, reynolds, roughness / bore, length / bore)
        };
        // At the upper end the exit head alone takes all the energy.
        let fastest = (2.0 * energy / (1.0 + k_minor)).sqrt();
        numeric::sign_change_of(0.0, fastest, |v| energy - needed(v))
    }

    /// Levels where the outflow or the area has a kink: the shape's, and for an outlet
    /// pipe the two ends of the flat stretch where the friction factor jumps from the
    /// laminar to the Colebrook value at Re = 2300 (the outflow holds at that Reynolds
    /// number while the head rises across the jump).
    pub fn kinks(&self) -> Vec<f64> {
        let mut kinks = self.shape.kinks();
        if let Outlet::Pipe {
            bore,
            length,
            roughness,
            k_minor,
            ..
        } = self.outlet
        {
            let v = LAMINAR_LIMIT * self.viscosity / (self.density * bore);
            let laminar = 0.5 * v * v * (1.0 + k_minor + 64.0 / LAMINAR_LIMIT * length / bore);
            let turbulent = 0.5 * v * v * (1.0 + k_minor + friction(LAMINAR_LIMIT, roughness / bore) * length / bore);
            let datum = self.head(0.0);
            for energy in [laminar, turbulent] {
                let level = energy / STANDARD_GRAVITY - datum;
                if level.is_finite() && level > 0.0 {
                    kinks.push(level);
                }
            }
        }
        kinks
    }

    /// Net rate of change of the liquid volume at time `t` and volume `v`.
    pub fn rate(&self, t: f64, v: f64, top: f64) -> f64 {
        let h = self.shape.level_of(v, top);
        self.inflow.at(t) - self.outlet_at(h).flow
    }
}

pub fn pipe_area(bore: f64) -> f64 {
    std::f64::consts::PI * bore * bore / 4.0
}

/// Darcy friction factor, laminar 64/Re below [`LAMINAR_LIMIT`].
pub fn friction(reynolds: f64, relative_roughness: f64) -> f64 {
    if reynolds < LAMINAR_LIMIT {
        if reynolds > 0.0 {
            64.0 / reynolds
        } else {
            0.0
        }
    } else {
        darcy_friction_factor(reynolds, relative_roughness).unwrap_or(0.0)
    }
}

/// Friction energy per unit mass, ½V²·f·L/D, written for the laminar range as
/// 32·ν·L·V/D² so that it stays finite as V → 0.
fn friction_loss(v: f64, reynolds: f64, relative_roughness: f64, length_over_bore: f64) -> f64 {
    if reynolds < LAMINAR_LIMIT {
        // ½V²·(64/Re)·L/D = 32·V²·L/(Re·D).
        if reynolds > 0.0 {
            32.0 * v * v * length_over_bore / reynolds
        } else {
            0.0
        }
    } else {
        0.5 * v * v * friction(reynolds, relative_roughness) * length_over_bore
    }
}

/// Why the run stopped.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Stop {
    /// The level reached the final level.
    Reached,
    /// The vessel emptied before the final level was reached.
    Empty,
    /// The vessel filled to its top.
    Full,
    /// The inflow and outflow balance: the level settled.
    Settled,
    /// The longest time to simulate passed.
    LongestTime,
    /// The step limit was reached (an extremely stiff or slow case).
    Steps,
}

/// One accepted point of the run.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Point {
    pub time: f64,
    pub level: f64,
    pub volume: f64,
    pub inflow: f64,
    pub outlet: OutletState,
}

/// The run from the starting level.
#[derive(Clone, Debug)]
pub struct Run {
    pub points: Vec<Point>,
    pub stop: Stop,
}

impl Run {
    pub fn last(&self) -> &Point {
        // A run always holds its starting point.
        &self.points[self.points.len() - 1]
    }
}

pub fn rk4(vessel: &Vessel, t: f64, v: f64, dt: f64, top: f64) -> f64 {
    let k1 = vessel.rate(t, v, top);
    let k2 = vessel.rate(t + 0.5 * dt, v + 0.5 * dt * k1, top);
    let k3 = vessel.rate(t + 0.5 * dt, v + 0.5 * dt * k2, top);
    let k4 = vessel.rate(t + dt, v + dt * k3, top);
    v + dt / 6.0 * (k1 + 2.0 * k2 + 2.0 * k3 + k4)
}

/// Integrates the mass balance from `start` towards `target` (levels above the
/// outlet), for at most `longest` seconds.
pub fn integrate(vessel: &Vessel, start: f64, target: f64, longest: f64) -> Run {
    let top = vessel.top.unwrap_or(f64::INFINITY);
    // Volumes beyond a bottomless top are not asked for; the search needs a bound.
    let search_top = vessel.top.unwrap_or(2.0 * start.max(target) + 1.0);
    let level_of = |v: f64| vessel.shape.level_of(v, search_top.max(1e-9));
    let point = |t: f64, v: f64| {
        let level = level_of(v);
        Point {
            time: t,
            level,
            volume: v,
            inflow: vessel.inflow.at(t),
            outlet: vessel.outlet_at(level),
        }
    };
    let v_start = vessel.shape.volume(start);
    let v_target = vessel.shape.volume(target);
    let v_top = if top.is_finite() {
        vessel.shape.volume(top)
    } else {
        f64::INFINITY
    };
    // The step error is held against the volume the run is to move, so that the
    // time spent in a narrow part of the vessel is followed as closely as the rest.
    // Near an empty vessel the outflow vanishes and a volume error costs time in
    // proportion: the error is also held against the volume still to go.
    let scale = (v_start - v_target).abs().max(1e-300);
    let tolerance_at = |v: f64| STEP_TOLERANCE * (v - v_target).abs().max(1e-6 * scale);
    // Volumes where the outflow or the area has a kink: steps land on them.
    let mut kinks: Vec<f64> = vessel.kinks().into_iter().map(|h| vessel.shape.volume(h)).collect();
    kinks.sort_by(f64::total_cmp);
    // Once the inflow no longer changes, the balance dV/dt = Q_in − Q_out(h(V)) has
    // one variable and no time in it: the level approaches the steady level but never
    // reaches or passes it. A step that does has overshot (the approach is fast
    // against the step when the steady level is tiny), and is taken again shorter.
    let v_steady = steady_level(vessel, vessel.inflow.last()).map(|h| vessel.shape.volume(h));
    let mut points = vec![point(0.0, v_start)];
    let (mut t, mut v) = (0.0, v_start);
    let rate0 = vessel.rate(0.0, v_start, search_top).abs();
    let flow_scale = rate0
        .max(vessel.outlet_at(start).flow)
        .max(vessel.inflow.at(0.0))
        .max(1e-300);
    // The run's own time scale: tiny vessels drain in microseconds, large ones in days.
    let time_scale = (scale / flow_scale).min(longest);
    let mut dt = 1e-3 * time_scale;
    let mut steps = 0;
    let stop = loop {
        // Settled: a constant inflow balanced by the outflow.
        if t >= vessel.inflow.settles_after() {
            let last = points[points.len() - 1];
            let (q_in, q_out) = (last.inflow, last.outlet.flow);
            if (q_in - q_out).abs() <= SETTLED * q_in.max(q_out) && q_in > 0.0 {
                break Stop::Settled;
            }
        }
        if t >= longest {
            break Stop::LongestTime;
        }
        steps += 1;
        if steps > MAX_STEPS {
            break Stop::Steps;
        }
        // Steps end at the rows of an inflow table (kinks of the inflow in time).
        let next_row = vessel.inflow.next_row_after(t).unwrap_or(f64::INFINITY);
        let dt_try = dt.min(longest - t).min(next_row - t);
        let whole = rk4(vessel, t, v, dt_try, search_top);
        let half = rk4(vessel, t, v, 0.5 * dt_try, search_top);
        let halves = rk4(vessel, t + 0.5 * dt_try, half, 0.5 * dt_try, search_top);
        let error = (halves - whole).abs() / 15.0;
        let tolerance = tolerance_at(v);
        if !(error <= tolerance) && dt_try > 1e-13 * (time_scale + t) {
            let factor = if error.is_finite() {
                0.9 * (tolerance / error).powf(0.2)
            } else {
                0.1
            };
            dt = dt_try * factor.clamp(0.1, 0.9);
            continue;
        }
        let v_new = halves + (halves - whole) / 15.0;
        if let Some(steady) = v_steady.filter(|_| t >= vessel.inflow.settles_after()) {
            if v != steady && (v - steady) * (v_new - steady) <= 0.0 {
                if dt_try > 1e-13 * (time_scale + t) {
                    dt = 0.5 * dt_try;
                    continue;
                }
                break Stop::Settled;
            }
        }
        // Events within the step: the final level, empty, full.
        let crossed = |goal: f64| match goal {
            g if g == v_target => (v - g) * (v_new - g) <= 0.0,
            g if g == 0.0 => v_new < 0.0,
            g => v_new > g,
        };
        let event = [(v_target, Stop::Reached), (0.0, Stop::Empty), (v_top, Stop::Full)]
            .into_iter()
            .filter(|(goal, _)| goal.is_finite() && crossed(*goal))
            .map(|(goal, stop)| (step_to(vessel, t, v, dt_try, goal, search_top), goal, stop))
            .min_by(|a, b| a.0.total_cmp(&b.0));
        if let Some((fraction, level, stop)) = event {
            t += fraction * dt_try;
            points.push(point(t, level));
            // Reaching the final level at empty or full is reaching it.
            break if level == v_target { Stop::Reached } else { stop };
        }
        let between = |k: f64| (v < k && k < v_new) || (v_new < k && k < v);
        if let Some(&kink) = kinks.iter().find(|&&k| between(k)) {
            // Land on the kink and go on from there with the same step length.
            t += step_to(vessel, t, v, dt_try, kink, search_top) * dt_try;
            v = kink;
            points.push(point(t, v));
            continue;
        }
        t += dt_try;
        v = v_new;
        points.push(point(t, v));
        let factor = if error > 0.0 {
            0.9 * (tolerance / error).powf(0.2)
        } else {
            4.0
        };
        dt = dt_try * factor.clamp(0.2, 4.0);
    };
    Run { points, stop }
}

/// The point of the run with the largest outflow. The outflow rises with the level,
/// so an interior peak is where the net flow changes sign from filling to draining;
/// it is placed there by a bracketed search within its step (an accepted point alone would
/// put it wherever the step control happened to land).
pub fn peak(vessel: &Vessel, run: &Run) -> Point {
    let points = &run.points;
    let last = *run.last();
    let Some((index, _)) = points
        .iter()
        .enumerate()
        .max_by(|a, b| a.1.outlet.flow.total_cmp(&b.1.outlet.flow))
    else {
        return last;
    };
    let top = vessel.top.unwrap_or(f64::INFINITY);
    let search_top = if top.is_finite() {
        top
    } else {
        2.0 * points.iter().fold(0.0f64, |a, p| a.max(p.level)) + 1.0
    };
    let net = |p: &Point| p.inflow - p.outlet.flow;
    for (a, b) in [(index.wrapping_sub(1), index), (index, index + 1)] {
        let (Some(pa), Some(pb)) = (points.get(a), points.get(b)) else {
            continue;
        };
        if !(net(pa) > 0.0 && net(pb) <= 0.0) {
            continue;
        }
        let dt = pb.time - pa.time;
        let net_rate = |share: f64| {
            let v = rk4(vessel, pa.time, pa.volume, share * dt, search_top);
            vessel.rate(pa.time + share * dt, v, search_top)
        };
        let share = numeric::sign_change_of(0.0, 1.0, net_rate);
        let volume = rk4(vessel, pa.time, pa.volume, share * dt, search_top);
        let time = pa.time + share * dt;
        let level = vessel.shape.level_of(volume, search_top);
        return Point {
            time,
            level,
            volume,
            inflow: vessel.inflow.at(time),
            outlet: vessel.outlet_at(level),
        };
    }
    points[index]
}

/// The share of a step of `dt` from (t, v) at which one RK4 step lands on `goal`,
/// by a bracketed search (the step's end is a smooth function of its length).
fn step_to(vessel: &Vessel, t: f64, v: f64, dt: f64, goal: f64, top: f64) -> f64 {
    let rising = rk4(vessel, t, v, dt, top) > v;
    // How far the step's end still is from the goal, positive short of it.
    let short_of_goal = |share: f64| {
        let end = rk4(vessel, t, v, share * dt, top);
        if rising {
            goal - end
        } else {
            end - goal
        }
    };
    numeric::sign_change_of(0.0, 1.0, short_of_goal)
}

/// The level where the outflow equals `inflow`, if the vessel holds it: the
/// outflow rises with the level, so the sign change of Q_in − Q_out(h).
pub fn steady_level(vessel: &Vessel, inflow: f64) -> Option<f64> {
    if inflow <= 0.0 {
        return None;
    }
    if let Outlet::Pump { .. } = vessel.outlet {
        return None;
    }
    if vessel.outlet_at(0.0).flow >= inflow {
        return None;
    }
    let mut hi = vessel.top.unwrap_or(1.0);
    if vessel.top.is_none() {
        while vessel.outlet_at(hi).flow < inflow {
            hi *= 2.0;
            if hi > 1e12 {
                return None;
            }
        }
    } else if vessel.outlet_at(hi).flow < inflow {
        return None;
    }
    Some(numeric::sign_change_of(0.0, hi, |level| {
        inflow - vessel.outlet_at(level).flow
    }))
}

/// Time from `high` to `low` (or back) with a constant inflow, by tanh-sinh
/// quadrature of dt = A(h)·dh/(Q_in − Q_out(h)) over the level: an independent path
/// to the run's time, valid when the net flow keeps one sign between the levels.
pub fn quadrature_time(vessel: &Vessel, from: f64, to: f64) -> f64 {
    let inflow = vessel.inflow.last();
    let (low, high) = if from < to { (from, to) } else { (to, from) };
    // The area has kinks (the top of a cone, the rows of a table): integrate piecewise.
    let mut edges = vec![low];
    edges.extend(vessel.kinks().into_iter().filter(|&k| k > low && k < high));
    edges.sort_by(f64::total_cmp);
    edges.push(high);
    edges
        .windows(2)
        .map(|w| {
            let (a, b) = (w[0], w[1]);
            crate::quadrature::tanh_sinh(a, b, 1.0 / 64.0, |from_a, from_b| {
                let h = if from_a < from_b { a + from_a } else { b - from_b };
                let net = (inflow - vessel.outlet_at(h).flow).abs();
                let value = vessel.shape.area(h) / net;
                if value.is_finite() {
                    value
                } else {
                    0.0
                }
            })
        })
        .sum()
}
