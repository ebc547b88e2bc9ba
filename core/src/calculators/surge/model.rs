//! The surge page's typed inputs and its pure model: wave speed, the round-trip
//! time 2L/a, the Joukowsky and slow-closure rises, the design pressure, the
//! transient thrust at the closing valve and the load on a run between elbows.

use uom::si::f64::{Length, Pressure, Time, Velocity};

use crate::catalog::Values;
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::restraint::pressure;
use crate::restraint::{diameters, Diameters, Joint};

use super::super::common;

pub use crate::calculators::common::WaveGiven;

/// The page's inputs, read once.
#[derive(Clone, Debug, PartialEq)]
pub struct Inputs {
    /// The size preset key (or `custom`), carried to the thrust-restraint page.
    pub size_key: String,
    pub pipe: Diameters,
    /// Whether the inside and outside diameters were typed (carried over as typed).
    pub typed_diameters: bool,
    pub joint: Joint,
    pub wave: WaveGiven,
    pub fluid: Fluid,
    pub dv: Velocity,
    pub length: Length,
    pub closure_time: Time,
    pub work: Pressure,
    pub run_length: Length,
}

fn si(values: &Values, key: &str) -> Option<f64> {
    values.quantity(key).ok()
}

/// Reads and cross-checks the values.
///
/// # Errors
/// Field errors naming the field: missing diameters, a wall too thick, a material
/// that cannot be known from a typed size, a typed modulus missing.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let size_key = values.choice("size")?.to_string();
    let typed_id = si(values, "d");
    let typed_od = si(values, "od");
    let pipe = diameters(&size_key, typed_id, typed_od, ("size", "d", "od"))?;
    let joint = Joint::from_key(values.choice("joint")?)
        .ok_or_else(|| FieldError::inconsistent("joint", "choose the joints at the closing valve"))?;
    let wave = common::read_wave(values, pipe, &size_key)?;
    let fluid = common::fluid_from(values)?;
    Ok(Inputs {
        size_key,
        pipe,
        typed_diameters: typed_id.is_some() || typed_od.is_some(),
        joint,
        wave,
        fluid,
        dv: read_velocity_change(values, pipe)?,
        length: values.typed("length")?,
        closure_time: values.typed("closure_time")?,
        work: values.typed("p")?,
        run_length: values.typed("run_length")?,
    })
}

/// The velocity stopped: typed, or the flow stopped over the bore area.
fn read_velocity_change(values: &Values, pipe: Diameters) -> Result<Velocity, FieldError> {
    match (values.typed_opt::<Velocity>("dv"), si(values, "q")) {
        (Some(_), Some(_)) => Err(FieldError::inconsistent(
            "q",
            "give the velocity stopped or the flow stopped, not both",
        )),
        (Some(dv), None) => Ok(dv),
        (None, Some(q)) => Ok(Velocity::new::<uom::si::velocity::meter_per_second>(
            q / common::circle_area(pipe.id),
        )),
        (None, None) => Err(FieldError::inconsistent(
            "dv",
            "give the flow velocity stopped (or the flow stopped)",
        )),
    }
}

/// Whether the closure is rapid (t_c ≤ 2L/a) or slow.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Closure {
    Rapid,
    Slow,
}

/// The load on a straight run between two elbows while the surge front passes.
/// The front is taken to rise linearly over the closure time, so it is a·t_c long;
/// the pressure difference between the run's ends rises to the peak, holds, and
/// falls again.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RunLoad {
    /// Peak unbalanced force along the run, N: A·Δp_J·min(1, L_run/(a·t_c)).
    pub peak: f64,
    /// The transit time of the front along the run, L_run/a, s.
    pub transit: f64,
    /// From the front reaching the first elbow to its passing the second, s:
    /// L_run/a + t_c.
    pub duration: f64,
    /// Time the force holds at its peak, s: |L_run/a − t_c|.
    pub plateau: f64,
    /// Length of the front, a·t_c, m.
    pub front_length: f64,
}

impl RunLoad {
    /// The impulse, N·s: the area under the trapezoid of force against time
    /// (ramps of min(L_run/a, t_c) each side of the plateau).
    pub fn impulse_of_history(&self) -> f64 {
        let ramp = (self.duration - self.plateau) / 2.0;
        self.peak * (self.plateau + ramp)
    }
}

/// Everything the page reports.
#[derive(Clone, Debug, PartialEq)]
pub struct Solved {
    pub wave_speed: f64,
    /// Where the wave speed comes from.
    pub wave_source: String,
    /// The thrust area (bore or outside diameter by the joint), m², and its diameter.
    pub area: f64,
    pub area_d: f64,
    /// 2L/a, s.
    pub round_trip: f64,
    pub closure: Closure,
    /// Joukowsky rise ρ·a·ΔV, Pa.
    pub joukowsky: f64,
    /// Slow-closure estimate 2ρLΔV/t_c, Pa (computed always; used only when slow).
    pub slow_estimate: f64,
    /// The surge used, Pa.
    pub surge: f64,
    /// Working pressure plus surge, Pa.
    pub design: f64,
    /// Transient thrust Δp·A at the closing valve or dead end, N.
    pub thrust_surge: f64,
    /// Total thrust (p + Δp)·A, N.
    pub thrust_total: f64,
    pub run: RunLoad,
    /// Mass of the liquid in the run, ρ·A_bore·L_run, kg (for the impulse check).
    pub run_mass: f64,
}

/// The Joukowsky rise of an instantaneous stop, Pa (the restraint model's).
pub fn joukowsky(density: f64, wave_speed: f64, dv: f64) -> f64 {
    pressure::joukowsky(density, wave_speed, dv)
}

/// The slow-closure (Michaud) estimate 2ρLΔV/t_c, Pa: the liquid column of length
/// L decelerated uniformly over t_c with the reflected relief arriving after 2L/a.
pub fn slow_closure(density: f64, length: f64, dv: f64, closure_time: f64) -> f64 {
    2.0 * density * length * dv / closure_time
}

/// The pure model.
pub fn solve(inputs: &Inputs) -> Solved {
    let rho = inputs.fluid.density;
    let (wave_speed, wave_source) = inputs.wave.speed(rho, inputs.pipe.id);
    let (dv, length, tc) = (inputs.dv.value, inputs.length.value, inputs.closure_time.value);
    let round_trip = 2.0 * length / wave_speed;
    let jouk = joukowsky(rho, wave_speed, dv);
    let slow_estimate = slow_closure(rho, length, dv, tc);
    let closure = if tc <= round_trip {
        Closure::Rapid
    } else {
        Closure::Slow
    };
    let surge = match closure {
        Closure::Rapid => jouk,
        Closure::Slow => slow_estimate.min(jouk),
    };
    let work = inputs.work.value;
    let area_d = inputs.joint.thrust_diameter(inputs.pipe);
    let area = common::circle_area(area_d);
    let run_length = inputs.run_length.value;
    let transit = run_length / wave_speed;
    let front_length = wave_speed * tc;
    let peak = area
        * jouk
        * if front_length > run_length {
            run_length / front_length
        } else {
            1.0
        };
    Solved {
        wave_speed,
        wave_source,
        area,
        area_d,
        round_trip,
        closure,
        joukowsky: jouk,
        slow_estimate,
        surge,
        design: work + surge,
        thrust_surge: surge * area,
        thrust_total: (work + surge) * area,
        run: RunLoad {
            peak,
            transit,
            duration: transit + tc,
            plateau: (transit - tc).abs(),
            front_length,
        },
        run_mass: rho * common::circle_area(inputs.pipe.id) * run_length,
    }
}
