//! The junction's physics as a pure function of its typed inputs: the flows given
//! to the branches (mass closed exactly), the engine's mass, energy and momentum
//! balances over the junction's fluid (β and α per port, the weights when they are
//! included, gravity as given), the pressure on each joint's wall annulus on the
//! outside-diameter basis, and the static thrust. Nothing here reads a field or
//! formats a number.

use uom::si::f64::{Acceleration, Force, Length, MassRate, Pressure, Ratio, Velocity, VolumeRate};

use crate::engine::{self, si, Balance, ControlVolume, FlowSpec, Loss, Port, Stream};
use crate::error::FieldErrors;
use crate::fluid::Fluid;
use crate::vector::{Direction, Vec3};

use super::super::common;
use super::BRANCHES;

/// Direction of flow at the junction.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Junction {
    /// The common pipe feeds the branches.
    Dividing,
    /// The branches feed the common pipe.
    Combining,
}

/// The velocity the branches' loss coefficients refer to.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LossReference {
    CommonPipe,
    OwnBranch,
}

/// The flow in the common pipe, as given.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum CommonFlow {
    Volume(VolumeRate),
    Velocity(Velocity),
    Mass(MassRate),
}

impl CommonFlow {
    /// The field the flow was typed in.
    pub fn key(&self) -> &'static str {
        match self {
            CommonFlow::Volume(_) => "q",
            CommonFlow::Velocity(_) => "v",
            CommonFlow::Mass(_) => "mdot",
        }
    }

    /// The engine's flow spec for the common pipe's port.
    fn spec(&self) -> FlowSpec {
        match self {
            CommonFlow::Volume(q) => FlowSpec::VolumeFlow(q.value),
            CommonFlow::Velocity(v) => FlowSpec::Velocity(v.value),
            CommonFlow::Mass(m) => FlowSpec::MassFlow(m.value),
        }
    }

    /// Volumetric flow, m³/s, through a pipe of area `area` (m²) for a liquid of
    /// density `density` (kg/m³).
    pub fn volume_flow(&self, area: f64, density: f64) -> f64 {
        match self {
            CommonFlow::Volume(q) => q.value,
            CommonFlow::Velocity(v) => v.value * area,
            CommonFlow::Mass(m) => m.value / density,
        }
    }
}

/// The port whose gauge pressure is known.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum KnownAt {
    /// The common pipe.
    Common(Pressure),
    /// The branch at this position among the page's branches (0 for branch 1).
    Branch(usize, Pressure),
}

impl KnownAt {
    /// The field a refusal of the balance is laid on.
    pub fn field(&self) -> &'static str {
        match self {
            KnownAt::Common(_) => "p",
            KnownAt::Branch(..) => "p_branch",
        }
    }
}

/// One branch as read from its fields.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Branch {
    /// Position of the branch among the page's branches (0 for branch 1).
    pub index: usize,
    pub diameter: Length,
    /// Outside diameter, on the outside-diameter basis.
    pub outside: Option<Length>,
    /// Unit vector of the direction the branch's fluid moves.
    pub direction: Vec3,
    /// Share of the common flow; `None` for the one branch solved by mass.
    pub share: Option<Ratio>,
    /// Loss coefficient K between the common pipe and this branch.
    pub k: Ratio,
    /// β and α at the branch's face, and where they came from.
    pub profile: common::PortProfile,
}

/// The validated inputs of the page.
#[derive(Clone, Debug, PartialEq)]
pub struct Inputs {
    pub junction: Junction,
    /// Bore of the common pipe.
    pub d_common: Length,
    /// Outside diameter of the common pipe, on the outside-diameter basis (joints
    /// that seal on the spigot's outside).
    pub common_outside: Option<Length>,
    /// Where the gauge pressure is known: the common pipe, or a branch.
    pub known: KnownAt,
    /// β and α in the common pipe (each branch carries its own).
    pub profile_common: common::PortProfile,
    pub flow: CommonFlow,
    pub loss_reference: LossReference,
    /// One to six branches; at most one share is empty and the shares add up to
    /// 100 % (or to at most 100 % with one empty).
    pub branches: Vec<Branch>,
    pub fluid: Fluid,
    /// Whether the weights of the fluid inside and of the fitting enter the balance.
    pub weights: bool,
    /// Weight of the fitting and the pipe it carries (0 when not given).
    pub w_fitting: Force,
    /// Acceleration of gravity, along −z (out of the plan).
    pub gravity: Acceleration,
}

impl Inputs {
    pub fn dividing(&self) -> bool {
        self.junction == Junction::Dividing
    }
    /// Whether the thrust area is the outside diameter (push-on, mechanical or
    /// restrained joints).
    pub fn on_outside(&self) -> bool {
        self.common_outside.is_some()
    }
    pub fn k_on_common(&self) -> bool {
        self.loss_reference == LossReference::CommonPipe
    }
    /// The fitting's weight that enters the balance, N (0 when weights are neglected).
    pub fn fitting_weight(&self) -> f64 {
        if self.weights {
            self.w_fitting.value
        } else {
            0.0
        }
    }
    /// The common pipe's volumetric flow, m³/s.
    pub fn total_flow(&self) -> f64 {
        self.flow
            .volume_flow(common::circle_area(self.d_common.value), self.fluid.density)
    }
}

/// The solved junction, SI units.
#[derive(Clone, Debug)]
pub struct Solved {
    /// The common pipe's flow as given, m³/s.
    pub total_flow: f64,
    /// Flow given to each branch (the mass-balance closure applied), `None` for the
    /// one left to be solved.
    pub branch_flows: Vec<Option<f64>>,
    /// Length of each pipe stub inside the control volume, m.
    pub stub: f64,
    /// Volume of fluid inside, m³ (weighed only when the weights are included).
    pub volume: f64,
    /// Centroid of the fluid inside, m (where the weights act).
    pub centroid: Vec3,
    /// The engine's balance (with the joints' annulus forces on the OD basis).
    pub balance: Balance,
    /// Index of the common pipe's port and of each branch's port in the balance.
    pub common_port: usize,
    pub port_of: Vec<usize>,
    /// Thrust on the supports, N, with rounding residue of its terms shown as 0.
    pub thrust: Vec3,
    /// Static thrust (every face at p, no flow), N.
    pub static_thrust: Vec3,
}

/// The flow given to each branch (`None` for the one solved by mass). When every
/// share is given, they add up to 100 % only within 1e-6: the branch with the largest
/// share takes the common flow less the others, so that mass closes exactly rather
/// than to the rounding of the typed shares. So too when the one left empty has
/// nothing left (the given shares reach 100 %, or pass it by the 1e-9 the inputs
/// allow): it gets no flow, not a backward trickle the size of the rounding.
pub fn branch_flows(branches: &[Branch], total_flow: f64) -> Vec<Option<f64>> {
    let share = |b: &Branch| b.share.map_or(0.0, |s| s.value);
    let mut flows: Vec<Option<f64>> = branches.iter().map(|b| b.share.map(|s| s.value * total_flow)).collect();
    let given: f64 = flows.iter().flatten().sum();
    if flows.iter().filter(|q| q.is_none()).count() == 1 && given >= total_flow {
        for q in flows.iter_mut().filter(|q| q.is_none()) {
            *q = Some(0.0);
        }
    }
    if flows.iter().all(Option::is_some) {
        let largest = branches
            .iter()
            .enumerate()
            .max_by(|a, b| share(a.1).total_cmp(&share(b.1)))
            .map(|(n, _)| n);
        if let Some(n) = largest {
            let others: f64 = flows
                .iter()
                .enumerate()
                .filter(|(m, _)| *m != n)
                .filter_map(|(_, q)| *q)
                .sum();
            flows[n] = Some((total_flow - others).max(0.0));
        }
    }
    flows
}

/// `value`, or 0 when it is rounding residue: within 1e-12 of `scale`, the size of the
/// terms it was summed from.
fn zero_if_residue(value: f64, scale: f64) -> f64 {
    if value.abs() <= 1e-12 * scale.abs() {
        0.0
    } else {
        value
    }
}

/// Solves the junction for its inputs.
///
/// # Errors
/// An engine refusal, named on the share solved by mass (or the pressure).
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let dividing = inputs.dividing();
    let k_on_common = inputs.k_on_common();
    let d_common = inputs.d_common.value;
    let branches = &inputs.branches;
    let a_common = common::circle_area(d_common);
    let total_flow = inputs.total_flow();
    let branch_flows = branch_flows(branches, total_flow);
    // Each port sits one common-pipe diameter from the junction, on its pipe's axis.
    let stub = d_common;
    let mut cv = ControlVolume::new(inputs.fluid.clone());
    cv.gravity(Vec3::new(0.0, 0.0, -inputs.gravity.value));
    let common_position = if dividing {
        Vec3::new(-stub, 0.0, 0.0)
    } else {
        Vec3::new(stub, 0.0, 0.0)
    };
    let mut common_port = inputs.profile_common.apply(
        if dividing {
            Port::inlet("common pipe", si::area(a_common), Direction::X)
        } else {
            Port::outlet("common pipe", si::area(a_common), Direction::X)
        }
        .at(common_position),
    );
    if let KnownAt::Common(p) = inputs.known {
        common_port = common_port.pressure(p);
    }
    common_port.flow = inputs.flow.spec();
    let c = cv.port(common_port);
    let mut volume = a_common * stub;
    let mut moment = common_position * (0.5 * a_common * stub);
    let mut port_of = Vec::with_capacity(branches.len());
    // The stream of a branch whose pressure is known goes first: it gives the common
    // pipe's pressure, from which the other streams solve theirs.
    let mut streams = Vec::with_capacity(branches.len());
    for (b, given) in branches.iter().zip(&branch_flows) {
        let area = common::circle_area(b.diameter.value);
        let direction = Direction::new(b.direction).unwrap_or(Direction::X);
        let position = if dividing {
            b.direction * stub
        } else {
            b.direction * (-stub)
        };
        let name = format!("branch {}", b.index + 1);
        let mut port = b.profile.apply(
            if dividing {
                Port::outlet(&name, si::area(area), direction)
            } else {
                Port::inlet(&name, si::area(area), direction)
            }
            .at(position),
        );
        if let Some(q) = given {
            port = port.volume_flow(si::volume_flow(*q));
        }
        let known_here = matches!(inputs.known, KnownAt::Branch(n, _) if n == b.index);
        if let KnownAt::Branch(n, p) = inputs.known {
            if n == b.index {
                port = port.pressure(p);
            }
        }
        let i = cv.port(port);
        port_of.push(i);
        let reference_port = if k_on_common { c } else { i };
        let stream = if dividing { Stream::new(c, i) } else { Stream::new(i, c) };
        let stream = stream.loss(Loss::Coefficient {
            k: b.k.value,
            reference_port,
        });
        if known_here {
            streams.insert(0, stream);
        } else {
            streams.push(stream);
        }
        volume += area * stub;
        moment += position * (0.5 * area * stub);
    }
    for stream in streams {
        cv.stream(stream);
    }
    let centroid = if volume > 0.0 {
        moment * (1.0 / volume)
    } else {
        Vec3::ZERO
    };
    // Neglected weights: gravity still sets the elevation head, the fluid weighs nothing.
    cv.contains(si::volume(if inputs.weights { volume } else { 0.0 }), centroid);
    let w_fitting = inputs.fitting_weight();
    if w_fitting > 0.0 {
        cv.extra_force("fitting weight", Vec3::new(0.0, 0.0, -w_fitting), centroid);
    }
    let engine_field = branches
        .iter()
        .find(|b| b.share.is_none())
        .and_then(|b| BRANCHES.get(b.index))
        .map(|keys| keys.share)
        .unwrap_or(inputs.known.field());
    let named = |e| FieldErrors::from(common::engine_error(e, engine_field));
    let mut balance = engine::balance(&cv).map_err(named)?;
    // Outside diameter of each port on the area basis (the bore on the inside basis).
    let mut basis_diameters = vec![inputs.common_outside.unwrap_or(inputs.d_common).value];
    basis_diameters.extend(branches.iter().map(|b| b.outside.unwrap_or(b.diameter).value));
    if inputs.on_outside() {
        // Push-on or mechanical joints: the solved pressures also act on the wall
        // annulus out to each outside diameter (a second pass adds them as named
        // forces; they change no pressure or flow).
        common::add_joint_annulus_forces(&mut cv, &balance, basis_diameters.iter().copied().enumerate());
        balance = engine::balance(&cv).map_err(named)?;
    }

    // A component that is rounding residue of the terms it was summed from (a
    // symmetric wye's side thrust) is the 0 it stands for.
    let term_scale: f64 = balance
        .ports
        .iter()
        .map(|s| s.pressure_force.norm() + s.momentum_outflow.norm())
        .sum::<f64>()
        + balance.fluid_weight.norm()
        + balance.extra_forces.iter().map(|e| e.force.norm()).sum::<f64>();
    let raw = balance.thrust();
    let thrust = Vec3::new(
        zero_if_residue(raw.x, term_scale),
        zero_if_residue(raw.y, term_scale),
        zero_if_residue(raw.z, term_scale),
    );
    // Static: every face at the common pipe's pressure, no flow.
    let p = balance.ports[c].pressure;
    let static_thrust: Vec3 = cv
        .ports
        .iter()
        .zip(&basis_diameters)
        .map(|(port, &d)| port.outward_normal() * (-p * common::circle_area(d)))
        .sum();
    Ok(Solved {
        total_flow,
        branch_flows,
        stub,
        volume,
        centroid,
        balance,
        common_port: c,
        port_of,
        thrust,
        static_thrust,
    })
}
