//! The restraint model, once: what every page that restrains a fitting shares.
//!
//! A key design decision: the thrust-restraint page, the line schedule (and the
//! coming restrained-joint and anchor pages) give the same result for the same
//! fitting because they call the same functions here; a page only reads its fields
//! and reports. Each concept is an enum with `key()` (its glossary option key,
//! [`crate::glossary`]), `from_key()` and `label()`, and the choice option list a
//! page offers is derived from the enum (`OPTIONS`), so a key is spelled once.
//!
//! - fittings ([`FittingKind`], [`FittingChoice`]), planes ([`Plane`]), the legs of a
//!   vertical bend ([`Legs`]), joints and their thrust area ([`Joint`]), sizes
//!   ([`diameters`]) and the static thrust of a fitting ([`static_balance`], checked
//!   against [`closed_form_thrust`]);
//! - [`pressure`]: the design pressure (operating, field test rules with EN 805's
//!   MDP allowance, Joukowsky surge with the elastic-pipe wave speed);
//! - [`soil`]: the published soil-bearing tables and friction coefficients;
//! - [`block`]: bearing and gravity blocks and the sliding check.
//!
//! # Governing equation
//! A fitting at rest under gauge pressure p: the momentum balance of the fluid in it
//! ([`crate::engine`]) with no flow gives the thrust T = −Σ p·Aᵢ·nᵢ over its faces,
//! which reduces to the closed forms of the thrust-restraint guides (AWWA M11 and
//! M23, the ductile-iron pipe industry's *Thrust Restraint Design for Ductile Iron
//! Pipe*; from memory): 2·p·A·sin(θ/2) for a bend, p·A for a dead end, p·A_branch
//! for a tee, p·(A₁ − A₂) for a reducer.
//!
//! # Assumptions
//! Static thrust (flow momentum neglected: a few percent of p·A at pipe
//! velocities, zero at test); the area A on the outside diameter for push-on and
//! mechanical joints, restrained or not (they seal on the spigot's outside), and on
//! the bore only for flanged, welded or fused joints; weights of pipe and water
//! neglected (conservative for uplift).

use std::f64::consts::PI;

use crate::engine::{self, si, ControlVolume, Port, Stream};
use crate::error::FieldError;
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::units::STANDARD_GRAVITY;
use crate::vector::{Direction, Vec3};

pub mod block;
pub mod pressure;
pub mod restrained;
pub mod soil;

/// An enum whose variants are the option keys of one glossary choice: `key()`,
/// `from_key()`, `label()`, every variant (`ALL`) and the option list (`OPTIONS`).
macro_rules! keyed_choice {
    (
        $(#[$meta:meta])*
        pub enum $name:ident {
            $( $(#[$vmeta:meta])* $variant:ident => ($key:literal, $label:literal), )+
        }
    ) => {
        $(#[$meta])*
        #[derive(Clone, Copy, Debug, PartialEq, Eq)]
        pub enum $name {
            $( $(#[$vmeta])* $variant, )+
        }

        impl $name {
            /// Every variant, in the order the page offers them.
            pub const ALL: &'static [$name] = &[$($name::$variant),+];
            /// The choice options of a field of this concept.
            pub const OPTIONS: &'static [$crate::catalog::ChoiceOption] = &[
                $($crate::catalog::ChoiceOption { key: $key, label: $label },)+
            ];
            /// The option key (query value) of this variant.
            pub const fn key(self) -> &'static str {
                match self {
                    $($name::$variant => $key,)+
                }
            }
            /// The label of this variant's option.
            pub const fn label(self) -> &'static str {
                match self {
                    $($name::$variant => $label,)+
                }
            }
            /// The variant of an option key.
            pub fn from_key(key: &str) -> Option<$name> {
                Self::ALL.iter().copied().find(|v| v.key() == key)
            }
        }
    };
}
pub(crate) use keyed_choice;

/// Smallest bend deflection accepted, rad (0.1°).
pub const MIN_ANGLE: f64 = PI / 1800.0;

keyed_choice! {
    /// What kind of fitting a block restrains.
    pub enum FittingKind {
        Bend => ("bend", "Bend (elbow)"),
        DeadEnd => ("dead_end", "Dead end, cap, plug or closed valve"),
        Tee => ("tee", "Tee (thrust of the branch)"),
        Reducer => ("reducer", "Reducer (large end to small end)"),
    }
}

keyed_choice! {
    /// What a restraint page is asked to hold: a fitting, or a thrust computed
    /// elsewhere (carried from a fitting page).
    pub enum FittingChoice {
        Bend => ("bend", "Bend (elbow)"),
        DeadEnd => ("dead_end", "Dead end, cap, plug or closed valve"),
        Tee => ("tee", "Tee (thrust of the branch)"),
        Reducer => ("reducer", "Reducer (large end to small end)"),
        GivenForce => ("force", "A given thrust (from another page)"),
    }
}

impl FittingChoice {
    /// The fitting, or `None` for a given thrust.
    pub fn kind(self) -> Option<FittingKind> {
        FittingKind::from_key(self.key())
    }
}

keyed_choice! {
    /// The plane of a fitting, which decides the kind of block.
    pub enum Plane {
        Horizontal => ("horizontal", "Horizontal (plan): bearing block"),
        /// A vertical bend turning downward: thrust upward, gravity block.
        Crest => ("vertical_crest", "Vertical, turning downward (crest): thrust upward, gravity block"),
        /// A vertical bend turning upward: thrust downward into the ground.
        Sag => ("vertical_sag", "Vertical, turning upward (sag): thrust downward into the ground"),
    }
}

impl Plane {
    /// Which way the fitting turns in the drawing plane (+1 toward +y).
    pub fn turn(self) -> f64 {
        match self {
            Plane::Crest => -1.0,
            Plane::Horizontal | Plane::Sag => 1.0,
        }
    }
    /// The horizontal and vertical (+ up) parts of a thrust drawn in this plane:
    /// plan view (z up) for a horizontal fitting, elevation (y up) for a vertical one.
    pub fn horizontal_vertical(self, thrust: Vec3) -> (f64, f64) {
        match self {
            Plane::Horizontal => (thrust.x.hypot(thrust.y), thrust.z),
            Plane::Crest | Plane::Sag => (thrust.x.abs(), thrust.y),
        }
    }
    /// A thrust given by its magnitude and angle above the horizontal, drawn in this
    /// plane (plan: along +x, any vertical part on z; elevation: x horizontal, y up).
    pub fn given_thrust(self, thrust: f64, elevation: f64) -> Vec3 {
        let (h, v) = (thrust * elevation.cos(), thrust * elevation.sin());
        match self {
            Plane::Horizontal => Vec3::new(h, 0.0, v),
            Plane::Crest | Plane::Sag => Vec3::new(h, v, 0.0),
        }
    }
    /// The angle above horizontal a given thrust takes when none is typed.
    pub fn default_elevation(self) -> f64 {
        match self {
            Plane::Horizontal => 0.0,
            Plane::Crest => PI / 2.0,
            Plane::Sag => -PI / 2.0,
        }
    }
}

keyed_choice! {
    /// The legs of a vertical bend.
    pub enum Legs {
        Symmetric => ("symmetric", "Both legs sloped by θ/2 (a summit or low point): vertical thrust 2·p·A·sin(θ/2)"),
        OneLevel => ("one_level", "One leg level, the other sloped by θ: vertical thrust p·A·sin θ"),
    }
}

keyed_choice! {
    /// The joint at a fitting, which sets its thrust area.
    pub enum Joint {
        PushOn => ("push_on", "Push-on joints (area on the OD)"),
        Mechanical => ("mechanical", "Mechanical joints (area on the OD)"),
        Restrained => ("restrained", "Restrained push-on or mechanical joints (area on the OD of the sealing joint)"),
        Flanged => ("flanged", "Flanged (area on the bore)"),
        Welded => ("welded", "Welded (area on the bore)"),
        Fused => ("fused", "Fused (area on the bore)"),
    }
}

impl Joint {
    /// Whether the thrust area is on the outside diameter: push-on and mechanical
    /// joints, restrained or not, seal on the spigot's outside.
    pub const fn uses_od(self) -> bool {
        matches!(self, Joint::PushOn | Joint::Mechanical | Joint::Restrained)
    }
    /// The diameter the thrust acts on.
    pub fn thrust_diameter(self, d: Diameters) -> f64 {
        if self.uses_od() {
            d.od
        } else {
            d.id
        }
    }
}

/// The joints whose thrust area is on the outside diameter (for `visible_when`).
pub const OD_JOINTS: &[&str] = &[Joint::PushOn.key(), Joint::Mechanical.key(), Joint::Restrained.key()];

/// Help text of every joint selector: why the bore is offered only for joints that
/// seal on it.
pub const JOINT_HELP: &str =
    "Push-on and mechanical joints seal on the outside of the spigot, restrained or not, so the pressure acts over \
        the outside diameter of the nearest sealing joint. Only welded, flanged or fused joints seal on the bore.";

/// Whether a joint key takes its thrust area on the outside diameter.
pub fn joint_uses_od(joint: &str) -> bool {
    Joint::from_key(joint).is_some_and(Joint::uses_od)
}

/// The diameters of one end of a fitting: inside and outside, m.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Diameters {
    pub id: f64,
    pub od: f64,
}

/// Reads a preset and typed diameters into inside and outside diameters.
///
/// # Errors
/// A field error naming the typed field when a diameter is missing or the inside
/// is not smaller than the outside.
pub fn diameters(
    preset: &str,
    typed_id: Option<f64>,
    typed_od: Option<f64>,
    fields: (&'static str, &'static str, &'static str),
) -> Result<Diameters, FieldError> {
    let (size_field, id_field, od_field) = fields;
    let preset = pipe_sizes::find(preset);
    let id = typed_id.or(preset.map(|p| p.id));
    let od = typed_od.or(preset.map(|p| p.od));
    match (id, od) {
        (Some(id), Some(od)) if id < od => Ok(Diameters { id, od }),
        (Some(_), Some(_)) => Err(FieldError::inconsistent(
            od_field,
            "the outside diameter must be larger than the inside diameter",
        )),
        (None, _) => Err(FieldError::inconsistent(
            id_field,
            format!("give an inside diameter or choose a preset in '{size_field}'"),
        )),
        (_, None) => Err(FieldError::inconsistent(
            od_field,
            format!("give an outside diameter or choose a preset in '{size_field}'"),
        )),
    }
}

/// Why the two ends of a fitting do not make that fitting.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SizeMismatch {
    BranchLargerThanRun,
    SmallEndNotSmaller,
}

impl SizeMismatch {
    pub fn message(self) -> &'static str {
        match self {
            SizeMismatch::BranchLargerThanRun => "the branch of a tee cannot be larger than the run",
            SizeMismatch::SmallEndNotSmaller => "the small end of a reducer must be smaller than the large end",
        }
    }
}

/// The pressure areas of a fitting's two ends on the joint's basis, m²: the main
/// (inlet) end and the branch (tee) or small end (reducer; the main end otherwise).
///
/// # Errors
/// A tee whose branch is larger than its run, a reducer whose small end is not
/// smaller.
pub fn thrust_areas(
    kind: FittingKind,
    joint: Joint,
    main: Diameters,
    second: Option<Diameters>,
) -> Result<(f64, f64), SizeMismatch> {
    let a1 = circle_area(joint.thrust_diameter(main));
    let a2 = match (kind, second) {
        (FittingKind::Tee, Some(s)) => {
            if s.od > main.od * 1.0001 {
                return Err(SizeMismatch::BranchLargerThanRun);
            }
            circle_area(joint.thrust_diameter(s))
        }
        (FittingKind::Reducer, Some(s)) => {
            let a2 = circle_area(joint.thrust_diameter(s));
            if a2 >= a1 {
                return Err(SizeMismatch::SmallEndNotSmaller);
            }
            a2
        }
        _ => a1,
    };
    Ok((a1, a2))
}

fn circle_area(d: f64) -> f64 {
    PI * d * d / 4.0
}

/// A fitting at rest under pressure: the geometry the engine needs.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct StaticFitting {
    pub kind: FittingKind,
    /// Deflection of a bend, rad (ignored otherwise).
    pub angle: f64,
    /// Pressure area of the main (inlet) end, m².
    pub area: f64,
    /// Pressure area of the branch (tee) or small end (reducer), m².
    pub area2: f64,
    pub plane: Plane,
    /// A vertical bend with both legs sloped by θ/2 (`true`), or with its inlet leg
    /// level and the outlet leg sloped by θ (`false`). Ignored for horizontal bends.
    pub symmetric: bool,
}

impl StaticFitting {
    /// Direction of the inlet flow in the drawing plane, rad from +x: level, or for a
    /// symmetric vertical bend rising (crest) or falling (sag) by θ/2.
    pub fn inlet_angle(&self) -> f64 {
        match (self.kind, self.plane, self.symmetric) {
            (FittingKind::Bend, Plane::Crest | Plane::Sag, true) => -self.plane.turn() * self.angle / 2.0,
            _ => 0.0,
        }
    }

    /// The size of the pressure forces on the fitting's ends at gauge pressure `p`,
    /// N: p·(A₁ + A₂). The engine sums such forces to the thrust, and a reducer's
    /// ends nearly alike cancel to their rounding: the scale of a check of a thrust.
    pub fn end_forces(&self, p: f64) -> f64 {
        p.abs() * (self.area + self.area2)
    }
}

/// The engine's static balance of a fitting at gauge pressure `p`, with no flow.
///
/// # Errors
/// The engine's error (non-finite input, zero area).
pub fn static_balance(f: &StaticFitting, p: f64, fluid: &Fluid) -> Result<engine::Balance, engine::EngineError> {
    let mut cv = ControlVolume::new(fluid.clone());
    cv.gravity(match f.plane {
        Plane::Horizontal => Vec3::new(0.0, 0.0, -STANDARD_GRAVITY),
        Plane::Crest | Plane::Sag => Vec3::new(0.0, -STANDARD_GRAVITY, 0.0),
    });
    let still = |port: Port| port.velocity(si::velocity(0.0));
    let a_in = f.inlet_angle();
    let inlet = cv.port(still(
        Port::inlet("inlet", si::area(f.area), Direction::in_plane(a_in)).pressure(si::pressure(p)),
    ));
    let turn = f.plane.turn();
    let outlets: Vec<(String, f64, Direction)> = match f.kind {
        FittingKind::Bend => vec![("outlet".into(), f.area, Direction::in_plane(a_in + turn * f.angle))],
        FittingKind::DeadEnd => vec![],
        FittingKind::Tee => vec![
            ("run outlet".into(), f.area, Direction::X),
            ("branch".into(), f.area2, Direction::in_plane(turn * PI / 2.0)),
        ],
        FittingKind::Reducer => vec![("small end".into(), f.area2, Direction::X)],
    };
    for (name, area, direction) in outlets {
        let o = cv.port(still(Port::outlet(&name, si::area(area), direction)));
        cv.stream(Stream::new(inlet, o));
    }
    engine::balance(&cv)
}

/// The static thrust of a fitting by the closed form of the thrust-restraint
/// guides, computed from the areas and the angle alone (no engine), and the
/// formula's name.
pub fn closed_form_thrust(f: &StaticFitting, p: f64) -> (f64, &'static str) {
    match f.kind {
        FittingKind::Bend => (2.0 * p * f.area * (f.angle / 2.0).sin(), "closed form 2·p·A·sin(θ/2)"),
        FittingKind::DeadEnd => (p * f.area, "closed form p·A"),
        FittingKind::Tee => (p * f.area2, "closed form p·A_branch"),
        FittingKind::Reducer => (p * (f.area - f.area2), "closed form p·(A₁ − A₂)"),
    }
}

/// The vertical part of a vertical bend's static thrust by its closed form (+ up)
/// and the formula's name: 2·p·A·sin(θ/2) with both legs sloped, p·A·sin θ with one
/// level. `None` for other fittings and horizontal bends.
pub fn closed_form_vertical(f: &StaticFitting, p: f64) -> Option<(f64, &'static str)> {
    if f.kind != FittingKind::Bend || f.plane == Plane::Horizontal {
        return None;
    }
    let (magnitude, formula) = if f.symmetric {
        (
            2.0 * p * f.area * (f.angle / 2.0).sin(),
            "closed form 2·p·A·sin(θ/2), both legs sloped",
        )
    } else {
        (p * f.area * f.angle.sin(), "closed form p·A·sin θ, one leg level")
    };
    let sign = if f.plane == Plane::Crest { 1.0 } else { -1.0 };
    Some((sign * magnitude, formula))
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn every_option_key_reads_back_to_its_variant_and_is_a_glossary_option() {
        fn check<T: Copy + PartialEq + std::fmt::Debug>(
            term: &str,
            all: &[T],
            key: fn(T) -> &'static str,
            from_key: fn(&str) -> Option<T>,
        ) {
            let options = crate::glossary::term_of(term).map(|t| t.options).unwrap_or(&[]);
            for v in all {
                assert_eq!(from_key(key(*v)), Some(*v));
                assert!(options.contains(&key(*v)), "{} is not an option of '{term}'", key(*v));
            }
        }
        check(
            "fitting",
            FittingChoice::ALL,
            FittingChoice::key,
            FittingChoice::from_key,
        );
        check("fitting", FittingKind::ALL, FittingKind::key, FittingKind::from_key);
        check("plane", Plane::ALL, Plane::key, Plane::from_key);
        check("legs", Legs::ALL, Legs::key, Legs::from_key);
        check("joint", Joint::ALL, Joint::key, Joint::from_key);
        check(
            "p_basis",
            pressure::PressureBasis::ALL,
            pressure::PressureBasis::key,
            pressure::PressureBasis::from_key,
        );
        check(
            "material",
            pressure::Material::ALL,
            pressure::Material::key,
            pressure::Material::from_key,
        );
        check(
            "anchoring",
            pressure::Anchoring::ALL,
            pressure::Anchoring::key,
            pressure::Anchoring::from_key,
        );
        check(
            "block_dims",
            block::BlockDims::ALL,
            block::BlockDims::key,
            block::BlockDims::from_key,
        );
        assert_eq!(
            Plane::from_key("vertical_up"),
            None,
            "retired keys are read by the glossary, not here"
        );
    }

    #[test]
    fn the_engine_thrust_matches_the_closed_forms_of_the_guides() {
        // 12 in ductile iron on the OD (13.20 in), 150 psi: the closed forms of the
        // thrust-restraint guides; the engine's balance is an independent path.
        let fluid = Fluid::water_kelvin(288.15).unwrap();
        let area = circle_area(13.20 * 0.0254);
        let p = 150.0 * 6894.757293168361;
        for kind in FittingKind::ALL {
            for plane in Plane::ALL {
                for symmetric in [true, false] {
                    let f = StaticFitting {
                        kind: *kind,
                        angle: PI / 4.0,
                        area,
                        area2: area / 2.0,
                        plane: *plane,
                        symmetric,
                    };
                    let t = static_balance(&f, p, &fluid).unwrap().thrust();
                    assert_relative_eq!(t.norm(), closed_form_thrust(&f, p).0, max_relative = 1e-9);
                    if let Some((v, _)) = closed_form_vertical(&f, p) {
                        assert_relative_eq!(t.y, v, max_relative = 1e-9);
                    }
                }
            }
        }
    }

    #[test]
    fn a_tee_branch_larger_than_its_run_and_an_upside_down_reducer_are_refused() {
        let big = Diameters { id: 0.3, od: 0.32 };
        let small = Diameters { id: 0.2, od: 0.22 };
        assert_eq!(
            thrust_areas(FittingKind::Tee, Joint::PushOn, small, Some(big)),
            Err(SizeMismatch::BranchLargerThanRun)
        );
        assert_eq!(
            thrust_areas(FittingKind::Reducer, Joint::Flanged, small, Some(big)),
            Err(SizeMismatch::SmallEndNotSmaller)
        );
        let (a1, a2) = thrust_areas(FittingKind::Reducer, Joint::PushOn, big, Some(small)).unwrap();
        assert_relative_eq!(
            a1 - a2,
            PI / 4.0 * (0.32f64.powi(2) - 0.22f64.powi(2)),
            max_relative = 1e-12
        );
    }
}
