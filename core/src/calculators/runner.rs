//! Runner (impeller) from its velocity triangles: Euler head, torque, shaft power and
//! hydraulic efficiency of a radial or axial turbine runner or pump impeller.
//!
//! # Method
//! Index 1 is where the water enters the blades and 2 where it leaves, in the
//! direction of flow, for both machines (a radial turbine: 1 outer, 2 inner; a
//! centrifugal pump: 1 at the eye, 2 at the rim). At each station
//!
//! - blade speed u = ω·r (axial machine: r the mean radius, u₁ = u₂);
//! - meridional (through-flow) velocity V_m = Q/A, with A = 2π·r·b for a radial
//!   runner of blade height b (no blade blockage) and the given annulus area for an
//!   axial one;
//! - inlet swirl from the guide vanes, V_θ1 = V_m1 / tan α₁, with α₁ the angle of the
//!   absolute velocity from the direction of blade motion (90° = no pre-swirl);
//! - outlet swirl from the blade, the flow leaving along it (no slip):
//!   V_θ2 = u₂ − V_m2 / tan β₂, with β the blade angle measured from the direction
//!   opposite to the blade motion (90° = a radial or axial blade; below 90° = a
//!   blade swept back from the motion, as in a backward-curved pump impeller);
//! - relative velocity W = V − u; the inlet relative flow angle
//!   β₁,flow = atan2(V_m1, u₁ − V_θ1) is compared with the inlet blade angle β₁: the
//!   difference is the incidence (a shock loss the ideal head does not include).
//!
//! The torque comes from the engine's angular-momentum balance ([`crate::engine`])
//! on the runner as a **rotating control volume** (`Frame::Rotating`): each station
//! is a port at its radius whose velocity is the relative velocity W; the engine adds
//! the frame velocity ω×r, so the moment of momentum is written with the absolute
//! velocity, and the torque the water delivers to the shaft is
//! T = ρQ(r₁V_θ1 − r₂V_θ2). The Euler head follows from it:
//!
//! - turbine: H_E = T·ω/(ρgQ) = (u₁V_θ1 − u₂V_θ2)/g, head taken out of the water;
//!   hydraulic efficiency η_h = H_E/H against the net head H;
//! - pump: H_E = −T·ω/(ρgQ) = (u₂V_θ2 − u₁V_θ1)/g, head given to the water;
//!   η_h = H/H_E.
//!
//! The station pressures do not enter that balance: over a surface of revolution
//! (the cylinder r = r₁ of a radial runner, the annulus of an axial one) pressure
//! acts radially or axially and has no moment about the axis. The engine's ports
//! take the pressure force along the flow direction, which is right for a pipe cut
//! square to the flow but not for these oblique ports, so the momentum balance is
//! run with gauge pressures of zero. A second balance in the same rotating frame
//! solves the static pressure change from the energy equation with the centrifugal
//! term (the rothalpy is constant along an ideal blade passage):
//! p₂ − p₁ = ρ/2·[(W₁² − W₂²) + (u₂² − u₁²)].
//!
//! # Checks
//! The checks table ([`Report::check`]) compares the engine's torque with
//! ρQ(r₁V_θ1 − r₂V_θ2) written from the triangles, and the Euler head with the energy
//! form of the triangles [(V₁² − V₂²) + (u₁² − u₂²) + (W₂² − W₁²)]/2g and with the
//! static pressure change of the second balance plus the change of absolute velocity
//! head. A torque within 1e-12 of the swirl moments is rounding residue, shown as 0;
//! the efficiency is reported as not applicable, with the reason, when the Euler head
//! is not positive.
//!
//! # Assumptions
//! Ideal (Euler) flow: the water follows the blades exactly (infinitely many blades,
//! no slip), uniform velocities over each station, no leakage, disc friction or
//! shock loss; incompressible, steady in the rotating frame.
//!
//! Sources: Euler's turbomachine equation and velocity triangles as derived in
//! White, *Fluid Mechanics* (chapter 11), Munson et al., *Fundamentals of Fluid
//! Mechanics* (chapter 12), Çengel & Cimbala, *Fluid Mechanics* (chapter 14), Dixon &
//! Hall, *Fluid Mechanics and Thermodynamics of Turbomachinery* (chapters 1 and 2).

use std::f64::consts::PI;

use crate::catalog::{
    CalculatorSpec, ChoiceOption, Diagram, FieldSpec, Limits, OutputSpec, Plot, Report, Series, Shape, ShapeStyle,
    Table, Values,
};
use crate::engine::{self, si, Balance, ControlVolume, EngineError, Port, Stream};
use crate::error::FieldError;
use crate::fluid::Fluid;
use crate::units::{self, QuantityKind as Q, UnitSystem, STANDARD_GRAVITY};
use crate::vector::{Direction, Vec3};

use super::common::{self, choice, quantity, MAX_SIZE_M};

pub const KEY: &str = "runner";

/// Incidence beyond which a warning is given (common practice, no source: a few
/// degrees of incidence already cost measurable shock loss).
const INCIDENCE_WARNING_RAD: f64 = PI / 180.0;

const MACHINE_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "turbine",
        label: "Turbine (water drives the runner)",
    },
    ChoiceOption {
        key: "pump",
        label: "Pump (impeller drives the water)",
    },
];

const LAYOUT_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "radial",
        label: "Radial flow (Francis runner, centrifugal impeller)",
    },
    ChoiceOption {
        key: "axial",
        label: "Axial flow (propeller, Kaplan, axial pump), at the mean radius",
    },
];

/// Blade and flow angles: 1° to 179° (a blade at 0° or 180° lies in the plane of
/// the motion and passes no flow; tan of a vanishing angle overflows the swirl).
const ANGLE_RANGE: Limits = Limits::closed(PI / 180.0, 179.0 * PI / 180.0);
/// Sizes: 1 mm to 10 m.
const SIZE_RANGE: Limits = Limits::closed(1e-3, MAX_SIZE_M);
/// Annulus areas: 1 mm² to 100 m².
const AREA_RANGE: Limits = Limits::closed(1e-6, 100.0);
/// Shaft speeds: 1 to 100 000 rpm.
const SPEED_RANGE: Limits = Limits::closed(2.0 * PI / 60.0, 1e5 * 2.0 * PI / 60.0);
/// Flows: 0.001 L/s to 1000 m³/s.
const FLOW_RANGE: Limits = Limits::closed(1e-6, 1e3);
/// Net heads: 1 cm to 10 km.
const HEAD_RANGE: Limits = Limits::closed(0.01, 1e4);
/// The fastest blade speed accepted, m/s: well above the tip speeds of water
/// turbines and pumps (a few tens to about 200 m/s, common practice, no source).
const MAX_BLADE_SPEED: f64 = 500.0;
/// Results within this fraction of the terms they were summed from are rounding
/// residue and shown as 0.
const RESIDUE: f64 = 1e-12;

pub fn spec() -> CalculatorSpec {
    let radial = Some(("layout", &["radial"][..]));
    let axial = Some(("layout", &["axial"][..]));
    let mut fields = vec![
        choice(
            "machine",
            "Machine",
            MACHINE_OPTIONS,
            "pump",
            "Sets the sign convention: a turbine's Euler head is taken out of the water, a pump's is given to it.",
        ),
        choice(
            "layout",
            "Flow through the blades",
            LAYOUT_OPTIONS,
            "radial",
            "Radial: give the two radii and blade heights. Axial: give the mean radius and the two annulus areas.",
        ),
        FieldSpec {
            visible_when: radial,
            ..quantity("r1", "Radius at the blade inlet r₁", Q::Length, "mm", "in", "65 mm", SIZE_RANGE, "Where the water enters the blades: the eye of a pump, the outer rim of a radial turbine.")
        },
        FieldSpec {
            visible_when: radial,
            ..quantity("r2", "Radius at the blade outlet r₂", Q::Length, "mm", "in", "160 mm", SIZE_RANGE, "Where the water leaves the blades.")
        },
        FieldSpec {
            visible_when: radial,
            ..quantity("b1", "Blade height at the inlet b₁", Q::Length, "mm", "in", "40 mm", SIZE_RANGE, "Width of the passage across the flow at r₁ (flow area 2π·r₁·b₁).")
        },
        FieldSpec {
            visible_when: radial,
            ..quantity("b2", "Blade height at the outlet b₂", Q::Length, "mm", "in", "22 mm", SIZE_RANGE, "Width of the passage at r₂ (flow area 2π·r₂·b₂).")
        },
        FieldSpec {
            visible_when: axial,
            ..quantity("r_mean", "Mean radius", Q::Length, "mm", "in", "", SIZE_RANGE, "Radius at which the triangles are drawn, usually the mean of hub and tip radii.")
        },
        FieldSpec {
            visible_when: axial,
            ..quantity("a1", "Annulus area at the inlet", Q::Area, "m2", "ft2", "", AREA_RANGE, "Flow area between hub and tip where the water enters the blades.")
        },
        FieldSpec {
            visible_when: axial,
            ..quantity("a2", "Annulus area at the outlet", Q::Area, "m2", "ft2", "", AREA_RANGE, "Flow area where the water leaves the blades.")
        },
        FieldSpec {
            optional: true,
            ..quantity("beta1", "Blade angle at the inlet β₁", Q::Angle, "deg", "deg", "", ANGLE_RANGE, "From the direction opposite to the blade motion (90 deg = radial or axial blade). Empty: taken to match the inlet flow (no incidence).")
        },
        quantity("beta2", "Blade angle at the outlet β₂", Q::Angle, "deg", "deg", "25 deg", ANGLE_RANGE, "From the direction opposite to the blade motion; sets the outlet swirl V_θ2 = u₂ − V_m2/tan β₂."),
        FieldSpec {
            optional: true,
            ..quantity("alpha1", "Guide-vane (inlet flow) angle α₁", Q::Angle, "deg", "deg", "", ANGLE_RANGE, "Angle of the absolute inlet velocity from the direction of blade motion, V_θ1 = V_m1/tan α₁. Empty: 90 deg, no pre-swirl.")
        },
        quantity("speed", "Speed", Q::AngularSpeed, "rpm", "rpm", "1480 rpm", SPEED_RANGE, "Shaft speed, 1 to 100 000 rpm."),
        quantity("q", "Flow", Q::VolumeFlow, "m3/h", "gpm", "180 m3/h", FLOW_RANGE, "Flow through the blades, 0.001 L/s to 1000 m³/s."),
        FieldSpec {
            optional: true,
            ..quantity("head", "Net head H", Q::Length, "m", "ft", "40 m", HEAD_RANGE, "Turbine: net head available; pump: head delivered. Gives the hydraulic efficiency.")
        },
    ];
    fields.extend(common::fluid_fields("25 degC"));
    CalculatorSpec {
        key: KEY,
        title: "Runner from velocity triangles (turbine or pump)",
        group: crate::catalog::group::JETS_AND_ROTORS,
        summary: "Euler head, torque, power and hydraulic efficiency of a radial or axial runner from its blade angles, speed and flow.",
        fields,
        outputs: vec![
            OutputSpec { key: "euler_head", label: "Euler head H_E", kind: Q::Length, headline: true },
            OutputSpec { key: "torque", label: "Shaft torque (turbine: delivered; pump: needed)", kind: Q::Torque, headline: true },
            OutputSpec { key: "power", label: "Shaft power, ideal", kind: Q::Power, headline: true },
            OutputSpec { key: "efficiency", label: "Hydraulic efficiency (turbine H_E/H, pump H/H_E)", kind: Q::Ratio, headline: true },
            OutputSpec { key: "u1", label: "Blade speed at the inlet u₁", kind: Q::Velocity, headline: false },
            OutputSpec { key: "u2", label: "Blade speed at the outlet u₂", kind: Q::Velocity, headline: false },
            OutputSpec { key: "vm1", label: "Meridional velocity at the inlet V_m1", kind: Q::Velocity, headline: false },
            OutputSpec { key: "vm2", label: "Meridional velocity at the outlet V_m2", kind: Q::Velocity, headline: false },
            OutputSpec { key: "vtheta1", label: "Swirl at the inlet V_θ1", kind: Q::Velocity, headline: false },
            OutputSpec { key: "vtheta2", label: "Swirl at the outlet V_θ2", kind: Q::Velocity, headline: false },
            OutputSpec { key: "v1", label: "Absolute velocity at the inlet V₁", kind: Q::Velocity, headline: false },
            OutputSpec { key: "v2", label: "Absolute velocity at the outlet V₂", kind: Q::Velocity, headline: false },
            OutputSpec { key: "w1", label: "Relative velocity at the inlet W₁", kind: Q::Velocity, headline: false },
            OutputSpec { key: "w2", label: "Relative velocity at the outlet W₂", kind: Q::Velocity, headline: false },
            OutputSpec { key: "alpha2", label: "Outlet flow angle α₂ (from the blade motion; 90 deg = no swirl)", kind: Q::Angle, headline: false },
            OutputSpec { key: "beta1_flow", label: "Inlet relative flow angle β₁,flow", kind: Q::Angle, headline: false },
            OutputSpec { key: "incidence", label: "Incidence β₁ − β₁,flow", kind: Q::Angle, headline: false },
            OutputSpec { key: "pressure_rise", label: "Static pressure change p₂ − p₁ (ideal; negative = drop)", kind: Q::Pressure, headline: false },
            OutputSpec { key: "mass_flow", label: "Mass flow", kind: Q::MassFlow, headline: false },
            OutputSpec { key: "density", label: "Fluid density", kind: Q::Density, headline: false },
        ],
        cautions: vec![
            "Euler head is the ideal, infinite-blade figure: real runners lose more (slip, shock at off-design incidence, friction, leakage, disc friction); real heads and powers are lower for a pump's delivery and a turbine's output.",
            "Anything that spins needs a guard and overspeed protection; a turbine that loses its load runs away. Defer to the machine's manufacturer and to a licensed engineer for ratings, speeds and foundations.",
        ],
    }
}

/// Turbine or pump.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Machine {
    Turbine,
    Pump,
}

/// The velocity triangle at one station.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
struct Triangle {
    radius: f64,
    area: f64,
    u: f64,
    vm: f64,
    vtheta: f64,
}

impl Triangle {
    fn w_theta(&self) -> f64 {
        self.vtheta - self.u
    }
    fn v(&self) -> f64 {
        self.vm.hypot(self.vtheta)
    }
    fn w(&self) -> f64 {
        self.vm.hypot(self.w_theta())
    }
    /// Absolute flow angle from the direction of blade motion.
    fn alpha(&self) -> f64 {
        self.vm.atan2(self.vtheta)
    }
    /// Relative flow angle from the direction opposite to the blade motion.
    fn beta(&self) -> f64 {
        self.vm.atan2(self.u - self.vtheta)
    }
}

/// The validated runner.
#[derive(Clone, Debug)]
struct Runner {
    machine: Machine,
    axial: bool,
    fluid: Fluid,
    omega: f64,
    flow: f64,
    /// Radius and flow area of each station.
    inlet: (f64, f64),
    outlet: (f64, f64),
    alpha1: f64,
    beta1: Option<f64>,
    beta2: f64,
}

impl Runner {
    fn triangles(&self, flow: f64) -> (Triangle, Triangle) {
        let station = |(radius, area): (f64, f64)| Triangle {
            radius,
            area,
            u: self.omega * radius,
            vm: flow / area,
            vtheta: 0.0,
        };
        let mut t1 = station(self.inlet);
        let mut t2 = station(self.outlet);
        t1.vtheta = t1.vm / self.alpha1.tan();
        if (self.alpha1 - PI / 2.0).abs() < 1e-12 {
            t1.vtheta = 0.0;
        }
        t2.vtheta = t2.u - t2.vm / self.beta2.tan();
        if (self.beta2 - PI / 2.0).abs() < 1e-12 {
            t2.vtheta = t2.u;
        }
        (t1, t2)
    }

    /// Meridional direction of the flow at a station and the port position: radial
    /// machines put the stations on the x axis (flow inward for a turbine, outward
    /// for a pump), axial machines at the mean radius with the flow along −z.
    fn geometry(&self, t: &Triangle) -> (Vec3, Vec3) {
        let position = Vec3::new(t.radius, 0.0, 0.0);
        let meridional = match (self.axial, self.machine) {
            (true, _) => Vec3::new(0.0, 0.0, -1.0),
            (false, Machine::Turbine) => Vec3::new(-1.0, 0.0, 0.0),
            (false, Machine::Pump) => Vec3::new(1.0, 0.0, 0.0),
        };
        (position, meridional)
    }

    /// The rotating control volume around the blades; `energy` leaves the outlet
    /// pressure to the energy balance (the momentum balance uses zero pressures, see
    /// the module doc).
    fn control_volume(&self, t1: &Triangle, t2: &Triangle, flow: f64, energy: bool) -> ControlVolume {
        let mut cv = ControlVolume::new(self.fluid.clone());
        let port = |t: &Triangle, name: &str, inlet: bool| {
            let (at, m) = self.geometry(t);
            // Relative velocity: meridional part plus W_θ along the direction of
            // blade motion (+y at a station on the +x axis, rotation about +z).
            let w = m * t.vm + Vec3::new(0.0, t.w_theta(), 0.0);
            let direction = Direction::new(w).unwrap_or(Direction::X);
            let area = si::area(flow / w.norm().max(f64::MIN_POSITIVE));
            let p = if inlet {
                Port::inlet(name, area, direction).volume_flow(si::volume_flow(flow))
            } else {
                Port::outlet(name, area, direction)
            };
            p.at(at)
        };
        let i = cv.port(port(t1, "blade inlet (1)", true).pressure(si::pressure(0.0)));
        let mut outlet = port(t2, "blade outlet (2)", false);
        if !energy {
            outlet = outlet.pressure(si::pressure(0.0));
        }
        let o = cv.port(outlet);
        if energy {
            cv.stream(Stream::new(i, o));
        }
        cv.frame(engine::Frame::Rotating {
            axis: Direction::Z,
            origin: Vec3::ZERO,
            omega: self.omega,
        });
        cv
    }

    /// Torque the water delivers to the shaft at `flow` (negative for a pump).
    fn momentum(&self, flow: f64) -> Result<(Triangle, Triangle, Balance), EngineError> {
        let (t1, t2) = self.triangles(flow);
        let balance = engine::balance(&self.control_volume(&t1, &t2, flow, false))?;
        Ok((t1, t2, balance))
    }

    /// Euler head in the machine's own sense from the engine's torque.
    fn euler_head(&self, torque: f64, flow: f64) -> f64 {
        let sign = if self.machine == Machine::Turbine { 1.0 } else { -1.0 };
        sign * torque * self.omega / (self.fluid.density * STANDARD_GRAVITY * flow)
    }
}

fn read(values: &Values) -> Result<Runner, Vec<FieldError>> {
    let mut errors = Vec::new();
    let machine = match values.choice("machine").map_err(|e| vec![e])? {
        "turbine" => Machine::Turbine,
        _ => Machine::Pump,
    };
    let axial = values.choice("layout").map_err(|e| vec![e])? == "axial";
    let mut need = |key: &'static str| {
        if values.is_set(key) {
            values.quantity_or(key, 1.0)
        } else {
            errors.push(FieldError::inconsistent(key, "a value is required for this layout"));
            1.0
        }
    };
    let (inlet, outlet) = if axial {
        let r = need("r_mean");
        let a1 = need("a1");
        let a2 = need("a2");
        ((r, a1), (r, a2))
    } else {
        let (r1, r2, b1, b2) = (need("r1"), need("r2"), need("b1"), need("b2"));
        ((r1, 2.0 * PI * r1 * b1), (r2, 2.0 * PI * r2 * b2))
    };
    let fluid = common::fluid_from(values)?;
    let omega = values.quantity("speed").map_err(|e| vec![e])?;
    let flow = values.quantity("q").map_err(|e| vec![e])?;
    let beta2 = values.quantity("beta2").map_err(|e| vec![e])?;
    let fastest = omega * inlet.0.max(outlet.0);
    if fastest > MAX_BLADE_SPEED {
        errors.push(FieldError::inconsistent(
            "speed",
            format!(
                "at this speed the blades move at {} at the larger radius, above the {} m/s of any water runner or impeller: check the speed and the radii",
                units::format_quantity_in(fastest, Q::Velocity, "m/s"),
                MAX_BLADE_SPEED
            ),
        ));
    }
    if !errors.is_empty() {
        return Err(errors);
    }
    Ok(Runner {
        machine,
        axial,
        fluid,
        omega,
        flow,
        inlet,
        outlet,
        alpha1: values.quantity_or("alpha1", PI / 2.0),
        beta1: values.is_set("beta1").then(|| values.quantity_or("beta1", PI / 2.0)),
        beta2,
    })
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let runner = read(values)?;
    let fail = |e: EngineError| common::engine_error(e, "q");
    let flow = runner.flow;
    let (t1, t2, balance) = runner.momentum(flow).map_err(fail)?;
    // A torque that is rounding residue of the moments of momentum it is summed from
    // (inlet and outlet swirl moments that balance) is the 0 it stands for.
    let moment_scale = moment_scale(&runner, &t1, &t2);
    let water_torque = balance.shaft_torque.unwrap_or(f64::NAN);
    let water_torque = if water_torque.abs() <= RESIDUE * moment_scale {
        0.0
    } else {
        water_torque
    };
    let euler_head = runner.euler_head(water_torque, flow);
    let (torque, name, other) = match runner.machine {
        Machine::Turbine => (water_torque, "turbine", "pump"),
        Machine::Pump => (-water_torque, "pump", "turbine"),
    };
    let energy = engine::balance(&runner.control_volume(&t1, &t2, flow, true)).map_err(fail)?;
    let pressure_rise = energy.ports[1].pressure - energy.ports[0].pressure;

    report.output("euler_head", euler_head);
    report.output("torque", torque);
    report.output("power", torque * runner.omega);
    if values.is_set("head") {
        let head = values.quantity_or("head", 1.0);
        let efficiency = match runner.machine {
            Machine::Turbine => euler_head / head,
            Machine::Pump => head / euler_head,
        };
        if euler_head <= 0.0 {
            report.warn(
                Some("head"),
                format!("Efficiency: not applicable, the Euler head is not positive: the {name} neither takes head out of the water nor gives it any with these triangles"),
            );
        } else {
            report.output("efficiency", efficiency);
            if efficiency > 1.0 {
                report.warn(
                    Some("head"),
                    format!(
                        "the hydraulic efficiency comes out above 100 %: the {} cannot {} the net head with these triangles; check the blade angles, speed and flow",
                        name,
                        if runner.machine == Machine::Turbine { "take out more than" } else { "deliver more than its Euler head, let alone" }
                    ),
                );
            }
        }
    }
    report.output("u1", t1.u);
    report.output("u2", t2.u);
    report.output("vm1", t1.vm);
    report.output("vm2", t2.vm);
    report.output("vtheta1", t1.vtheta);
    report.output("vtheta2", t2.vtheta);
    report.output("v1", t1.v());
    report.output("v2", t2.v());
    report.output("w1", t1.w());
    report.output("w2", t2.w());
    report.output("alpha2", t2.alpha());
    report.output("beta1_flow", t1.beta());
    if let Some(beta1) = runner.beta1 {
        let incidence = beta1 - t1.beta();
        report.output("incidence", incidence);
        if incidence.abs() > INCIDENCE_WARNING_RAD {
            report.warn(
                Some("beta1"),
                format!(
                    "the water meets the inlet blades at {} while the blades are set at {}: an incidence of {} (shock loss not in the Euler head; the triangles match only at one flow for a given speed)",
                    report.fmt(t1.beta(), Q::Angle),
                    report.fmt(beta1, Q::Angle),
                    report.fmt(incidence, Q::Angle)
                ),
            );
        }
    }
    report.output("pressure_rise", pressure_rise);
    report.output("mass_flow", flow * runner.fluid.density);
    report.output("density", runner.fluid.density);
    if euler_head.is_nan() || euler_head <= 0.0 {
        report.warn(
            Some("beta2"),
            format!(
                "the Euler head comes out zero or negative: with these triangles the {name} would work as a {other}; check the blade angles and the direction of rotation"
            ),
        );
    }
    common::forward_warnings(&balance, report);
    independent_checks(report, &runner, &t1, &t2, torque, euler_head, pressure_rise);

    let system = report.system();
    report.solution.tables.push(triangle_table(&t1, &t2, system));
    report
        .solution
        .tables
        .push(ledger(&balance, water_torque, euler_head, system));
    report.solution.diagrams.push(triangles_diagram(&t1, &t2, report));
    let plot = head_plot(&runner, report).map_err(fail)?;
    report.solution.plots.push(plot);
    Ok(())
}

/// The size of the moments of momentum the engine sums: it writes each swirl as the
/// relative swirl plus the blade speed, so its rounding follows ρQ·r·(|V_θ| + u).
fn moment_scale(runner: &Runner, t1: &Triangle, t2: &Triangle) -> f64 {
    let station = |t: &Triangle| t.radius * (t.vtheta.abs() + t.u.abs());
    runner.fluid.density * runner.flow * (station(t1) + station(t2))
}

/// Checks against paths that do not use the engine's angular-momentum balance:
///
/// - the torque against the moment of momentum written from the triangles,
///   ρQ(r₁V_θ1 − r₂V_θ2) (with the machine's sign);
/// - the Euler head against the energy form of the triangles,
///   [(V₁² − V₂²) + (u₁² − u₂²) + (W₂² − W₁²)]/2g, in the machine's sense;
/// - the Euler head against the static pressure change from the engine's energy
///   balance in the rotating frame plus the change of absolute kinetic head:
///   pump (p₂ − p₁)/ρg + (V₂² − V₁²)/2g, turbine the reverse.
fn independent_checks(
    report: &mut Report<'_>,
    runner: &Runner,
    t1: &Triangle,
    t2: &Triangle,
    torque: f64,
    euler_head: f64,
    pressure_rise: f64,
) {
    let rho = runner.fluid.density;
    let g = STANDARD_GRAVITY;
    let sign = if runner.machine == Machine::Turbine { 1.0 } else { -1.0 };
    let moment = rho * runner.flow * (t1.radius * t1.vtheta - t2.radius * t2.vtheta);
    let moment_scale = moment_scale(runner, t1, t2);
    report.check(
        "Shaft torque",
        "moment of momentum from the triangles, ρQ(r₁V_θ1 − r₂V_θ2)",
        Q::Torque,
        torque,
        sign * moment,
        1e-9,
        moment_scale,
    );
    let head_scale = [t1.v(), t2.v(), t1.u, t2.u, t1.w(), t2.w()]
        .iter()
        .map(|x| x * x)
        .sum::<f64>()
        / (2.0 * g);
    let triangles =
        (t1.v().powi(2) - t2.v().powi(2) + t1.u.powi(2) - t2.u.powi(2) + t2.w().powi(2) - t1.w().powi(2)) / (2.0 * g);
    report.check(
        "Euler head",
        "energy form of the triangles, [(V₁²−V₂²) + (u₁²−u₂²) + (W₂²−W₁²)]/2g",
        Q::Length,
        euler_head,
        sign * triangles,
        1e-9,
        head_scale,
    );
    let kinetic_rise = (t2.v().powi(2) - t1.v().powi(2)) / (2.0 * g);
    let head_from_pressure = -sign * (pressure_rise / (rho * g) + kinetic_rise);
    report.check(
        "Euler head",
        "static pressure change from the rotating-frame energy balance plus the change of absolute velocity head",
        Q::Length,
        euler_head,
        head_from_pressure,
        1e-9,
        head_scale,
    );
}

fn cell(v: f64, kind: Q, unit: &str) -> String {
    units::convert_to(v, kind, unit)
        .map(|x| units::format_significant(x, 4))
        .unwrap_or_else(|| "—".to_string())
}

fn triangle_table(t1: &Triangle, t2: &Triangle, system: UnitSystem) -> Table {
    let biggest = [t1.u, t2.u, t1.v(), t2.v(), t1.w(), t2.w()]
        .into_iter()
        .fold(0.0, f64::max);
    let vu = units::display_unit(biggest, Q::Velocity, system).id;
    let au = "deg";
    let row = |label: &str, f: &dyn Fn(&Triangle) -> f64, kind: Q, unit: &str| {
        vec![label.to_string(), cell(f(t1), kind, unit), cell(f(t2), kind, unit)]
    };
    Table {
        key: "triangles",
        title: "Velocity triangles: components at the blade inlet (1) and outlet (2)".to_string(),
        columns: vec![
            "Component".to_string(),
            "inlet (1)".to_string(),
            "outlet (2)".to_string(),
        ],
        rows: vec![
            row(
                &format!(
                    "radius r ({})",
                    units::display_unit(t1.radius.max(t2.radius), Q::Length, system).id
                ),
                &|t| t.radius,
                Q::Length,
                units::display_unit(t1.radius.max(t2.radius), Q::Length, system).id,
            ),
            row(&format!("blade speed u = ωr ({vu})"), &|t| t.u, Q::Velocity, vu),
            row(
                &format!("meridional velocity V_m = Q/A ({vu})"),
                &|t| t.vm,
                Q::Velocity,
                vu,
            ),
            row(&format!("swirl V_θ ({vu})"), &|t| t.vtheta, Q::Velocity, vu),
            row(&format!("absolute velocity V ({vu})"), &|t| t.v(), Q::Velocity, vu),
            row(
                &format!("relative swirl W_θ = V_θ − u ({vu})"),
                &|t| t.w_theta(),
                Q::Velocity,
                vu,
            ),
            row(&format!("relative velocity W ({vu})"), &|t| t.w(), Q::Velocity, vu),
            row(
                &format!("absolute flow angle α, from u ({au})"),
                &|t| t.alpha(),
                Q::Angle,
                au,
            ),
            row(
                &format!("relative flow angle β, from −u ({au})"),
                &|t| t.beta(),
                Q::Angle,
                au,
            ),
        ],
        emphasised_rows: vec![3],
    }
}

/// The angular-momentum ledger about the axis (terms of one balance) and the Euler
/// head that follows from it; the checks table holds the independent forms.
fn ledger(balance: &Balance, water_torque: f64, euler_head: f64, system: UnitSystem) -> Table {
    let o = balance.moment_point;
    let mut rows: Vec<(String, f64, Q)> = Vec::new();
    for p in &balance.ports {
        rows.push((
            format!("{}: moment of momentum out, r × ±ṁ(W + ω×r)", p.name),
            (p.position - o).cross(p.momentum_outflow).z,
            Q::Torque,
        ));
    }
    let total = rows.len();
    rows.push((
        "M = torque the shaft exerts on the water (sum)".to_string(),
        balance.support_moment.z,
        Q::Torque,
    ));
    rows.push((
        "T = torque the water exerts on the runner, −M".to_string(),
        water_torque,
        Q::Torque,
    ));
    rows.push((
        "Euler head from the torque, ±Tω/(ρgQ)".to_string(),
        euler_head,
        Q::Length,
    ));
    let torque_max = rows
        .iter()
        .filter(|r| r.2 == Q::Torque)
        .map(|r| r.1.abs())
        .fold(0.0, f64::max);
    let tu = units::display_unit(torque_max, Q::Torque, system).id;
    let lu = units::display_unit(euler_head.abs(), Q::Length, system).id;
    Table {
        key: "torque_ledger",
        title:
            "Angular-momentum ledger about the axis (rotating CV; pressures over surfaces of revolution have no moment)"
                .to_string(),
        columns: vec!["Term".to_string(), "value".to_string(), "unit".to_string()],
        rows: rows
            .into_iter()
            .map(|(label, v, kind)| {
                let unit = if kind == Q::Torque { tu } else { lu };
                vec![label, cell(v, kind, unit), unit.to_string()]
            })
            .collect(),
        emphasised_rows: vec![total + 1, total + 2],
    }
}

/// The two triangles in velocity space, the inlet above the outlet (stacked, so that
/// each gets the full width of a phone screen), their origins aligned.
fn triangles_diagram(t1: &Triangle, t2: &Triangle, report: &Report<'_>) -> Diagram {
    let mut shapes = Vec::new();
    let fmt = |v: f64| report.fmt(v, Q::Velocity);
    let biggest = [t1.u, t2.u, t1.v(), t2.v(), t1.w(), t2.w()]
        .into_iter()
        .fold(0.0, f64::max)
        .max(1e-9);
    let gap = 0.1 * biggest;
    // Each triangle occupies from its base line − 1.3 gap (swirl arrow) less a line
    // for its label, to its apex + 0.12 × the largest velocity (its title).
    let base2 = -(1.3 * gap + 0.12 * biggest + t2.vm.max(0.0) + 0.17 * biggest);
    for (t, yb, n) in [(t1, 0.0, "1"), (t2, base2, "2")] {
        let o = [0.0, yb];
        let u_tip = [t.u, yb];
        let v_tip = [t.vtheta, yb + t.vm];
        shapes.push(Shape::Arrow {
            from: o,
            to: u_tip,
            label: String::new(),
            style: ShapeStyle::Velocity,
        });
        // V and W unlabelled at their shared tip; their labels (and u's) sit beside
        // the middle of each side, away from the triangle, so they do not pile up.
        shapes.push(Shape::Arrow {
            from: o,
            to: v_tip,
            label: String::new(),
            style: ShapeStyle::Momentum,
        });
        shapes.push(Shape::Arrow {
            from: u_tip,
            to: v_tip,
            label: String::new(),
            style: ShapeStyle::Flow,
        });
        let centroid = [(o[0] + u_tip[0] + v_tip[0]) / 3.0, (o[1] + u_tip[1] + v_tip[1]) / 3.0];
        let beside = |a: [f64; 2], b: [f64; 2], away: f64| {
            let m = [(a[0] + b[0]) / 2.0, (a[1] + b[1]) / 2.0];
            let (dx, dy) = (m[0] - centroid[0], m[1] - centroid[1]);
            let len = dx.hypot(dy);
            if len > 1e-12 * biggest {
                [m[0] + away * dx / len, m[1] + away * dy / len]
            } else {
                [m[0], m[1] + away]
            }
        };
        shapes.push(Shape::Text {
            at: [0.5 * t.u, yb - 0.45 * gap],
            text: format!("u{n}"),
            style: ShapeStyle::Label,
        });
        shapes.push(Shape::Text {
            at: beside(o, v_tip, 0.08 * biggest),
            text: format!("V{n}"),
            style: ShapeStyle::Label,
        });
        shapes.push(Shape::Text {
            at: beside(u_tip, v_tip, 0.08 * biggest),
            text: format!("W{n}"),
            style: ShapeStyle::Label,
        });
        // Swirl below the blade-speed line, with a guide from the apex.
        shapes.push(Shape::Polyline {
            points: vec![v_tip, [v_tip[0], yb - 1.3 * gap]],
            style: ShapeStyle::Guide,
        });
        if t.vtheta.abs() > 1e-9 * biggest {
            shapes.push(Shape::Arrow {
                from: [0.0, yb - 1.3 * gap],
                to: [v_tip[0], yb - 1.3 * gap],
                label: format!("Vθ{n} {}", fmt(t.vtheta)),
                style: ShapeStyle::Velocity,
            });
        } else {
            shapes.push(Shape::Text {
                at: [0.0, yb - 1.3 * gap],
                text: format!("Vθ{n} = 0"),
                style: ShapeStyle::Label,
            });
        }
        let place = if n == "1" { "inlet (1)" } else { "outlet (2)" };
        let left = t.vtheta.min(0.0);
        let right = t.u.max(t.vtheta).max(0.0);
        shapes.push(Shape::Text {
            at: [0.5 * (left + right), yb + t.vm.max(0.0) + 0.12 * biggest],
            text: place.to_string(),
            style: ShapeStyle::Label,
        });
    }
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.1 * biggest);
    Diagram {
        title: "Velocity triangles, inlet above outlet".to_string(),
        bounds,
        shapes,
        caption: format!(
            "Drawn in velocity space, not runner geometry: both triangles to one velocity scale, x along the blade motion u, y the meridional (through-flow) component V_m. V = u + W, with V the absolute velocity (momentum-flux colour: the flux is ṁV) and W the velocity relative to the blades (flow colour); the swirl V_θ, below each triangle, is the projection of V on u. Magnitudes are in the table above; largest velocity shown: {}.",
            fmt(biggest)
        ),
    }
}

/// Euler head against flow at this speed, from engine balances, with this flow marked.
fn head_plot(runner: &Runner, report: &Report<'_>) -> Result<Plot, EngineError> {
    let system = report.system();
    let top = 1.6 * runner.flow;
    let mut points = Vec::new();
    for i in 1..=40 {
        let q = top * i as f64 / 40.0;
        let (_, _, b) = runner.momentum(q)?;
        points.push([q, runner.euler_head(b.shaft_torque.unwrap_or(f64::NAN), q)]);
    }
    let q_unit = units::display_unit(top, Q::VolumeFlow, system).id;
    let h_max = points.iter().map(|p| p[1].abs()).fold(0.0, f64::max);
    let h_unit = units::display_unit(h_max, Q::Length, system).id;
    let conv = |p: [f64; 2]| {
        [
            units::convert_to(p[0], Q::VolumeFlow, q_unit).unwrap_or(f64::NAN),
            units::convert_to(p[1], Q::Length, h_unit).unwrap_or(f64::NAN),
        ]
    };
    let here = report.solution.output("euler_head").map(|o| o.si).unwrap_or(f64::NAN);
    Ok(Plot {
        key: "head_flow",
        title: "Euler head against flow at this speed".to_string(),
        x_label: format!("flow ({q_unit})"),
        y_label: format!("Euler head ({h_unit})"),
        series: vec![Series {
            name: "Euler head (ideal, no slip)".to_string(),
            points: points.into_iter().map(conv).collect(),
        }],
        markers: vec![crate::catalog::Marker {
            at: conv([runner.flow, here]),
            label: "this flow".to_string(),
        }],
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalog::Request;
    use approx::assert_relative_eq;

    fn request(pairs: &[(&str, &str)]) -> Request {
        crate::catalog::demo_request(&spec(), pairs)
    }

    fn solve(pairs: &[(&str, &str)]) -> crate::catalog::Solution {
        crate::calculators::testing::solved(super::KEY, pairs)
    }

    #[test]
    fn engine_torque_equals_euler_form_for_pump_and_turbine() {
        // Derived from the definition: T = ρQ(r₁V_θ1 − r₂V_θ2), H_E = (u₁V_θ1 − u₂V_θ2)/g.
        for machine in ["pump", "turbine"] {
            for alpha1 in ["90 deg", "60 deg", "120 deg"] {
                let s = solve(&[
                    ("machine", machine),
                    ("alpha1", alpha1),
                    ("fluid", "custom"),
                    ("rho", "1000 kg/m3"),
                    ("mu", "1 mPa.s"),
                ]);
                let get = |k: &str| s.output(k).unwrap().si;
                let omega = 1480.0 * 2.0 * PI / 60.0;
                let q = 180.0 / 3600.0;
                let (r1, r2) = (0.065, 0.160);
                let water = 1000.0 * q * (r1 * get("vtheta1") - r2 * get("vtheta2"));
                let sign = if machine == "turbine" { 1.0 } else { -1.0 };
                assert_relative_eq!(get("torque"), sign * water, max_relative = 1e-10);
                let h = sign * (get("u1") * get("vtheta1") - get("u2") * get("vtheta2")) / STANDARD_GRAVITY;
                assert_relative_eq!(get("euler_head"), h, max_relative = 1e-10);
                assert_relative_eq!(get("power"), get("torque") * omega, max_relative = 1e-12);
            }
        }
    }

    #[test]
    fn pressure_change_follows_rothalpy() {
        // Derived from the definition: p₂ − p₁ = ρ/2 [(W₁² − W₂²) + (u₂² − u₁²)].
        let s = solve(&[("fluid", "custom"), ("rho", "1000 kg/m3"), ("mu", "1 mPa.s")]);
        let get = |k: &str| s.output(k).unwrap().si;
        let expected = 500.0 * (get("w1").powi(2) - get("w2").powi(2) + get("u2").powi(2) - get("u1").powi(2));
        assert_relative_eq!(get("pressure_rise"), expected, max_relative = 1e-9);
        // And the ideal pump's total-head rise equals its Euler head.
        let total =
            (get("pressure_rise") + 500.0 * (get("v2").powi(2) - get("v1").powi(2))) / (1000.0 * STANDARD_GRAVITY);
        assert_relative_eq!(total, get("euler_head"), max_relative = 1e-9);
    }

    #[test]
    fn incidence_is_warned() {
        let s = solve(&[("beta1", "60 deg")]);
        assert!(s.warnings.iter().any(|w| w.field == Some("beta1")));
        let matched = s.output("beta1_flow").unwrap().si;
        let deg = format!("{} rad", matched);
        let s = solve(&[("beta1", deg.as_str())]);
        assert!(s.warnings.iter().all(|w| w.field != Some("beta1")));
        assert!(s.output("incidence").unwrap().si.abs() < 1e-9);
    }

    #[test]
    fn demo_has_triangles_table_and_plot() {
        let s = solve(&[]);
        assert_eq!(s.diagrams.len(), 1);
        assert!(s.tables.iter().any(|t| t.key == "triangles"));
        assert_eq!(s.plots.len(), 1);
        assert!(s.output("euler_head").unwrap().si > 0.0);
    }

    #[test]
    fn bad_inputs_name_their_field() {
        let field = |pairs: &[(&str, &str)]| match crate::solve(KEY, &request(pairs)).result {
            Err(crate::SolveError::Fields(errors)) => errors[0].field.clone(),
            other => panic!("expected a field error, got {other:?}"),
        };
        assert_eq!(field(&[("r1", "0 mm")]), "r1");
        assert_eq!(field(&[("q", "-5 m3/h")]), "q");
        assert_eq!(field(&[("q", "0")]), "q");
        assert_eq!(field(&[("layout", "axial")]), "r_mean");
        assert_eq!(field(&[("beta2", "0 deg")]), "beta2");
        // A vanishing angle would make the swirl V_m/tan α overflow: refused, as are
        // sizes and speeds that are not physical.
        assert_eq!(field(&[("alpha1", "1e-300 deg")]), "alpha1");
        assert_eq!(field(&[("b1", "1e-300 mm")]), "b1");
        assert_eq!(field(&[("speed", "1e-300 rpm")]), "speed");
        assert_eq!(field(&[("head", "1e-300 m")]), "head");
        // 160 mm at 60 000 rpm: blades at 1005 m/s, faster than any water runner.
        assert_eq!(field(&[("speed", "60000 rpm")]), "speed");
    }

    #[test]
    fn checks_agree_and_efficiency_is_explained_when_not_applicable() {
        for machine in ["pump", "turbine"] {
            let s = solve(&[("machine", machine)]);
            assert_eq!(s.checks.len(), 3, "{machine}");
            assert!(s.checks.iter().all(|c| c.agrees()), "{machine}: {:?}", s.checks);
        }
        // The demo pump's triangles run as a turbine give no positive Euler head:
        // the efficiency is not applicable and the page says why.
        let s = solve(&[("machine", "turbine"), ("head", "40 m")]);
        assert!(s.output("efficiency").is_none());
        assert!(s
            .warnings
            .iter()
            .any(|w| w.message.starts_with("Efficiency: not applicable")));
    }
}
