//! The bend page's typed inputs and pure model: the control volume of the fluid in
//! the bend and its momentum and energy balances ([`crate::engine`]), with the
//! joint annulus forces of push-on and mechanical joints (see the page's doc).

use uom::si::f64::{Acceleration, Angle, Force, Length, Ratio};

use crate::catalog::Values;
use crate::engine::{self, si, Balance, ControlVolume, FlowSpec, Loss, Port, Stream};
use crate::error::{FieldError, FieldErrors};
use crate::fluid::Fluid;
use crate::restraint::{self, Plane};
use crate::vector::{Direction, Vec3};

use super::super::common::{self, KnownPressure, PortProfile};

/// Everything the page was given, validated.
#[derive(Clone, Debug)]
pub struct Inputs {
    pub angle: Angle,
    /// Inlet and outlet bores.
    pub d: Length,
    pub d2: Length,
    /// The port whose gauge pressure is known, and that pressure.
    pub known: KnownPressure,
    /// Loss coefficient on the inlet velocity (0: none).
    pub k: Ratio,
    pub plane: Plane,
    /// Centre-line radius.
    pub radius: Length,
    pub w_fitting: Force,
    pub fluid: Fluid,
    pub flow: FlowSpec,
    /// The flow field the user filled (`q`, `v`, `mdot`), for warnings.
    pub flow_field: &'static str,
    /// Outside diameters of the inlet and outlet joints when the joint seals on them.
    pub outside: Option<(Length, Length)>,
    /// β and α at the inlet and the outlet.
    pub profile_in: PortProfile,
    pub profile_out: PortProfile,
    /// Whether the weights of the fluid and of the fitting enter the balance.
    pub weights: bool,
    /// Gravity used (standard unless a local value is typed).
    pub gravity: Acceleration,
}

/// Reads the page's values once.
///
/// # Errors
/// Each bad field by name.
pub fn read(values: &Values) -> Result<Inputs, FieldErrors> {
    let angle: Angle = values.typed("angle")?;
    let d: Length = values.typed("d")?;
    let d2: Length = values.typed_opt("d2").unwrap_or(d);
    let known = common::known_pressure_from(values)?;
    let k = values
        .typed_opt("k")
        .unwrap_or(Ratio::new::<uom::si::ratio::ratio>(0.0));
    let plane =
        Plane::from_key(values.choice("plane")?).ok_or_else(|| FieldError::inconsistent("plane", "unknown plane"))?;
    let radius = values.typed_opt("r_bend").unwrap_or(1.5 * d);
    let w_fitting = values
        .typed_opt("w_fitting")
        .unwrap_or(Force::new::<uom::si::force::newton>(0.0));
    let fluid = common::fluid_from(values)?;
    let flow = common::flow_given_from(values)?;
    let outside = match restraint::joint_uses_od(values.choice("joint").unwrap_or("flanged")) {
        true => {
            let od: Length = values.typed("od")?;
            let od2: Length = values.typed_opt("od2").unwrap_or(od);
            let mut errors = FieldErrors::default();
            for (field, od, bore) in [("od", od, d), ("od2", od2, d2)] {
                if od <= bore {
                    let message = if field == "od2" && !values.is_set("od2") {
                        "give the outlet's outside diameter: the inlet's is not larger than the outlet bore"
                    } else {
                        "the outside diameter must be larger than the inside diameter"
                    };
                    errors.push(FieldError::inconsistent(field, message));
                }
            }
            Some(errors.or_ok((od, od2))?)
        }
        false => None,
    };
    if radius.value < 0.5 * d.value.max(d2.value) {
        return Err(FieldError::inconsistent(
            "r_bend",
            "the centre-line radius must be at least half the larger diameter",
        )
        .into());
    }
    Ok(Inputs {
        angle,
        d,
        d2,
        known,
        k,
        plane,
        radius,
        w_fitting,
        fluid,
        flow,
        flow_field: common::flow_field(values),
        outside,
        profile_in: common::profile_from(values, &common::INLET_PROFILE)?,
        profile_out: common::profile_from(values, &common::OUTLET_PROFILE)?,
        weights: common::weights_from(values),
        gravity: Acceleration::new::<uom::si::acceleration::meter_per_second_squared>(common::gravity_from(values)),
    })
}

/// Geometry of the bend in the drawing plane: inlet at the origin flowing +x, the
/// bend turning towards +y (or −y when `sense` is −1) about a centre at (0, sense·R).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Geometry {
    pub theta: f64,
    pub sense: f64,
    pub radius: f64,
    pub d_in: f64,
    pub d_out: f64,
}

impl Geometry {
    pub fn outlet_position(&self) -> Vec3 {
        Vec3::new(
            self.radius * self.theta.sin(),
            self.sense * self.radius * (1.0 - self.theta.cos()),
            0.0,
        )
    }
    pub fn outlet_direction(&self) -> Direction {
        Direction::in_plane(self.sense * self.theta)
    }
    pub fn centroid(&self) -> Vec3 {
        // Centroid of a circular arc of radius R spanning θ from the inlet.
        let mid = self.theta / 2.0;
        let chord_factor = if self.theta > 1e-9 { mid.sin() / mid } else { 1.0 };
        let r = self.radius * chord_factor;
        Vec3::new(r * mid.sin(), self.sense * (self.radius - r * mid.cos()), 0.0)
    }
}

/// The solved bend.
#[derive(Clone, Debug)]
pub struct Solved {
    pub geometry: Geometry,
    pub balance: Balance,
    /// Gravity in the drawing axes, m/s².
    pub gravity: Vec3,
    /// Bore areas at the inlet and outlet, m².
    pub a_in: f64,
    pub a_out: f64,
    /// Pressure areas on the joint's basis, m².
    pub basis_a_in: f64,
    pub basis_a_out: f64,
    /// Volume of fluid inside, m³.
    pub volume: f64,
}

/// The pure model of the page.
///
/// # Errors
/// An engine refusal, on the known pressure's field.
pub fn solve(inputs: &Inputs) -> Result<Solved, FieldErrors> {
    let (d_in, d_out) = (inputs.d.value, inputs.d2.value);
    let (k, radius, theta) = (inputs.k.value, inputs.radius.value, inputs.angle.value);
    let w_fitting = if inputs.weights { inputs.w_fitting.value } else { 0.0 };
    let g = inputs.gravity.value;
    let (sense, gravity) = match inputs.plane {
        Plane::Sag => (1.0, Vec3::new(0.0, -g, 0.0)),
        Plane::Crest => (-1.0, Vec3::new(0.0, -g, 0.0)),
        Plane::Horizontal => (1.0, Vec3::new(0.0, 0.0, -g)),
    };
    let geometry = Geometry {
        theta,
        sense,
        radius,
        d_in,
        d_out,
    };
    let (a_in, a_out) = (common::circle_area(d_in), common::circle_area(d_out));
    let volume = 0.5 * (a_in + a_out) * radius * theta;

    let mut cv = ControlVolume::new(inputs.fluid.clone());
    cv.gravity(gravity);
    let mut inlet = inputs
        .profile_in
        .apply(Port::inlet("inlet", si::area(a_in), Direction::X).at(Vec3::ZERO));
    inlet.flow = inputs.flow;
    let outlet = inputs
        .profile_out
        .apply(Port::outlet("outlet", si::area(a_out), geometry.outlet_direction()).at(geometry.outlet_position()));
    let [inlet, outlet] = inputs.known.apply(inlet, outlet);
    let i = cv.port(inlet);
    let o = cv.port(outlet);
    cv.stream(Stream::new(i, o).loss(Loss::Coefficient { k, reference_port: i }));
    // Neglected weights: gravity still sets the elevation head, the fluid weighs nothing.
    let weighed_volume = if inputs.weights { volume } else { 0.0 };
    cv.contains(si::volume(weighed_volume), geometry.centroid());
    if w_fitting > 0.0 {
        let weight_dir = gravity * (1.0 / g);
        cv.extra_force("fitting weight", weight_dir * w_fitting, geometry.centroid());
    }
    let field = inputs.known.field();
    let mut balance = engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, field)))?;
    let outside = inputs.outside.map(|(od, od2)| (od.value, od2.value));
    if let Some((od_in, od_out)) = outside {
        // Push-on or mechanical joints: the solved pressures also act on the wall
        // annulus out to the outside diameter at each end.
        common::add_joint_annulus_forces(&mut cv, &balance, [(i, od_in), (o, od_out)]);
        balance = engine::balance(&cv).map_err(|e| FieldErrors::from(common::engine_error(e, field)))?;
    }
    let (basis_a_in, basis_a_out) = match outside {
        Some((od_in, od_out)) => (common::circle_area(od_in), common::circle_area(od_out)),
        None => (a_in, a_out),
    };
    Ok(Solved {
        geometry,
        balance,
        gravity,
        a_in,
        a_out,
        basis_a_in,
        basis_a_out,
        volume,
    })
}
