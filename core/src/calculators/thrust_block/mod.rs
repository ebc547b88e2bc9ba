//! Thrust restraint: the design pressure, the thrust of a fitting at that pressure,
//! and the concrete block that carries it into the ground.
//!
//! # Method
//! 1. **Design pressure**, chosen openly (`p_basis`): the operating pressure; the
//!    field test pressure from a named rule
//!    ([`TEST_RULES`](crate::restraint::pressure::TEST_RULES)) or typed; the working
//!    pressure plus a surge estimate; or the highest of these. EN 805's rule applies
//!    to the maximum design pressure MDP, which includes surge: typed (`mdp`), or the
//!    working pressure plus the standard's smallest allowance where surge is not
//!    calculated, 200 kPa (EN 805:2000 cl. 11.3.3 as usually read, from memory):
//!    6 bar working → MDP 8 bar → STP min(1.5·8, 8 + 5) = 12 bar. The pressure table
//!    says which MDP was used. The surge is the
//!    Joukowsky rise Δp = ρ·a·ΔV for an instantaneous velocity change ΔV, with the
//!    pipe-elasticity-corrected wave speed (Wylie & Streeter, *Fluid Transients in
//!    Systems*, 1993, eq. 2.21; Chaudhry, *Applied Hydraulic Transients*, 3rd ed.,
//!    eq. 2.19 — equation forms from memory, recomputed here):
//!    a = √( (K/ρ) / (1 + c₁·K·D/(E·e)) ),
//!    K the liquid's bulk modulus, D the inside diameter, e the wall, E the wall's
//!    Young's modulus and c₁ the axial-restraint factor (1 for pipe with expansion
//!    joints throughout, which jointed pipe approximates; 1 − ν² anchored against
//!    axial movement; 1 − ν/2 anchored at the upstream end only).
//!    **Elevation**: the pressures typed are those at the test point (`z_test`);
//!    the fitting (`z_fitting`, same datum) is sized at the basis pressure plus the
//!    static head ρ·g·(z_test − z_fitting), g = 9.80665 m/s² (hydrostatics, derived
//!    from the definition; [`crate::restraint::pressure::elevation_head`]), checked
//!    against the engine's energy balance of the still line between the two
//!    elevations. Both default to 0 m (no correction); one without the other, or a
//!    fitting so high that its pressure falls below zero gauge, is refused.
//! 2. **Thrust**, from the engine: a control volume around the fitting, zero flow,
//!    the design pressure at the inlet and the other faces solved by the energy
//!    balance (no flow, same point: the same pressure). The momentum balance then
//!    gives the static thrust, e.g. T = 2·p·A·sin(θ/2) for a bend, p·A for a dead
//!    end, p·A_branch for a tee, p·(A₁ − A₂) for a reducer; each is recorded as a
//!    check of the engine's result ([`Report::check`]), and for a vertical bend so is
//!    the vertical part. The area A comes from the outside diameter for push-on and
//!    mechanical joints, restrained or not (they seal on the outside of the spigot,
//!    so the thrust acts on the OD of the nearest sealing joint; the ductile-iron
//!    pipe industry's thrust-restraint design guide uses the OD), and from the bore
//!    only for welded, flanged or fused joints, which seal on it.
//!    A vertical bend has either both legs sloped by θ/2 (a summit or low point, the
//!    default: thrust 2pA·sin(θ/2) straight up or down) or one leg level and the
//!    other sloped by θ (thrust pA·(1 − cos θ, ±sin θ)); the uplift of the first is
//!    2·sin(θ/2)/sin θ times the second's, 8 % more at 45°, 41 % more at 90°.
//! 3. **Horizontal bearing block** (and the base of a block under a sag bend):
//!    bearing area A_b = SF·T/σ with σ the allowable soil bearing. A sag block's
//!    base carries the resultant; its horizontal part T_h must also be held: by
//!    friction under the base, μ·T_down ≥ SF_slide·T_h (the block's own weight
//!    neglected, conservative), or by a side face of SF·T_h/σ against the trench
//!    wall, which is reported. Soil presets come
//!    from three published tables that disagree (see [`SOILS`](crate::restraint::soil::SOILS)); a typed value is
//!    always allowed. Face dimensions follow from a chosen height or width ÷ height.
//! 4. **Gravity block** under upward thrust (a vertical bend at a crest): the block's
//!    effective weight must be SF times the upward component, W = γ_eff·V, with
//!    γ_eff = γ_c below groundwater reduced by the water's unit weight (buoyancy).
//!    Sliding is checked by default, μ·(W − T_v) ≥ SF_slide·T_h, with μ from the
//!    soil preset ([`FRICTION_SOURCE`](crate::restraint::soil::FRICTION_SOURCE):
//!    NAVFAC DM-7.02 ultimate friction factors,
//!    lower end, from memory) or typed; where neither gives μ and the thrust has a
//!    horizontal part, an unchecked-sliding warning is raised.
//! 5. **A given thrust** (`fitting=force`, e.g. carried from a fitting page) is used
//!    as typed: the design-pressure, joint and fluid fields are hidden and no design
//!    pressure is shown. A sag block for a given thrust warns that its face lies
//!    below the pipe.
//!
//! # Field keys (stable: other pages link here with them)
//! - `fitting`: `bend` | `dead_end` | `tee` | `reducer` | `force` (a given thrust).
//! - `thrust` (force, used only with `fitting=force`), `thrust_elev` (angle above
//!   horizontal of a given thrust; empty: from `plane`).
//! - `angle` (bend deflection), `plane`: `horizontal` | `vertical_crest` | `vertical_sag`;
//!   `legs` (vertical bends): `symmetric` (default) | `one_level`.
//! - `size` (a key of [`crate::pipe_sizes`] or `custom`), `d` (inside), `od` (outside);
//!   `size2`, `d2`, `od2` for the tee branch or the reducer's small end. Typed
//!   diameters override presets.
//! - `joint`: `push_on` | `mechanical` | `restrained` (area on the OD) | `flanged` |
//!   `welded` (bore).
//! - `p_basis`: `highest` | `operating` | `test` | `surge`; `p` (the working pressure, gauge),
//!   `test_rule` (`en805` | `en805_surge` | `c600` | `c605` | `nfpa24` | `custom`),
//!   `mdp` (EN 805), `p_test`, `dv`, `material` (`from_size`: the size preset's
//!   material, the default), `e_pipe`, `wall`, `anchoring`, `bulk_modulus`; `z_test`
//!   and `z_fitting` (elevations of the test point and of the fitting); fluid fields
//!   `fluid`, `t`, `rho`, `mu`.
//! - Block: `soil` (preset key or `custom`), `sigma`, `sf`, `block_dims`
//!   (`height` | `aspect`), `block_h`, `block_aspect`; gravity block `gamma_c`,
//!   `submerged` (`no` | `yes`), `gravity_h`; sliding (crest and sag) `friction`
//!   (empty: from the soil), `sf_slide`.
//!
//! A fitting page links here with, e.g., `fitting=tee&size=custom&d=300mm&od=320mm&
//! d2=200mm&od2=220mm&p=10bar` so the thrust is recomputed at the design
//! pressure chosen here; or with `fitting=force&thrust=85kN` to size a block for
//! the force it computed.
//!
//! # Code
//! [`model::read`] reads the values once into typed inputs, [`model::solve`] is the
//! pure model (design pressure, thrust, block) built on [`crate::restraint`], which
//! the line schedule shares; [`report::write`] shows the result and
//! [`diagram::diagram`] draws it.
//!
//! # Assumptions
//! Static thrust (flow momentum neglected: at pipe velocities it is a few percent of
//! p·A at most, and zero at test); the weights of pipe and water are neglected
//! (conservative for uplift); the block bears on undisturbed soil; a vertical bend's
//! legs are as chosen (both sloped by θ/2, or one level).

use std::f64::consts::PI;

use crate::catalog::{CalculatorSpec, ChoiceOption, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::pipe_sizes;
use crate::units::QuantityKind as Q;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA};

pub mod diagram;
pub mod model;
pub mod report;

pub use diagram::diagram;

pub const KEY: &str = "thrust-block";
/// The page title.
pub const TITLE: &str = "Thrust block size for a buried fitting";

// The restraint model shared with the line schedule lives in `crate::restraint`;
// other pages and tests use it from there.
use crate::restraint::block::{BLOCK_DIM_OPTIONS, YES_NO};
use crate::restraint::pressure::{BASIS_OPTIONS, TEST_RULE_OPTIONS};

use super::common::wall::ShownWhen;
use crate::restraint::soil::SOIL_OPTIONS;
use crate::restraint::{FittingChoice, Joint, Legs, Plane, JOINT_HELP, MIN_ANGLE};

/// Range of a typed elevation, m (a datum of the user's choosing: site levels,
/// sea level; from 1 km below to 10 km above it).
pub const MIN_ELEVATION_M: f64 = -1000.0;
pub const MAX_ELEVATION_M: f64 = 10_000.0;

const Z_TEST_HELP: &str = "Where the pressures above apply (the gauge of the field test), on any datum, from \
    −1000 m to 10 000 m. With the fitting's elevation, the fitting is sized at the pressure there plus \
    ρ·g·(test point − fitting): more below the test point, less above. Empty: no correction.";
const Z_FITTING_HELP: &str = "Elevation of the fitting's centre line on the same datum as the test point, from \
    −1000 m to 10 000 m.";

/// The fitting options (derived from [`FittingChoice`]).
const FITTING_OPTIONS: &[ChoiceOption] = FittingChoice::OPTIONS;
/// The plane options (derived from [`Plane`]).
const PLANE_OPTIONS: &[ChoiceOption] = Plane::OPTIONS;
/// The joint options (derived from [`Joint`]).
const JOINT_OPTIONS: &[ChoiceOption] = Joint::OPTIONS;
/// The legs options (derived from [`Legs`]).
const LEGS_OPTIONS: &[ChoiceOption] = Legs::OPTIONS;

pub fn spec() -> CalculatorSpec {
    let fitting_only = |keys: &'static [&'static str]| Some(("fitting", keys));
    const FITTINGS: &[&str] = &["bend", "dead_end", "tee", "reducer"];
    let mut fields = vec![
        choice(
            "fitting",
            "Fitting to restrain",
            FITTING_OPTIONS,
            "bend",
            "The thrust is recomputed here at the design pressure; choose 'a given thrust' to size a block \
                for a force from elsewhere.",
        ),
        FieldSpec {
            visible_when: fitting_only(&["force"]),
            ..quantity(
                "thrust",
                "Thrust to restrain",
                Q::Force,
                "kN",
                "lbf",
                "",
                Limits::closed(1.0, 1e9),
                "Resultant thrust on the restraint at the design pressure (from a fitting page).",
            )
        },
        FieldSpec {
            visible_when: fitting_only(&["force"]),
            optional: true,
            ..quantity(
                "thrust_elev",
                "Angle of the given thrust above horizontal",
                Q::Angle,
                "deg",
                "deg",
                "",
                Limits::closed(-PI / 2.0, PI / 2.0),
                "0 for a horizontal thrust, 90° straight up (gravity block), −90° straight down. Empty: from \
                the plane chosen below.",
            )
        },
        FieldSpec {
            visible_when: fitting_only(&["bend"]),
            ..quantity(
                "angle",
                "Bend deflection angle",
                Q::Angle,
                "deg",
                "deg",
                "45 deg",
                Limits::closed(MIN_ANGLE, PI),
                "From 0.1° to 180°; 11¼, 22½, 45 and 90° are the usual fittings.",
            )
        },
        choice(
            "plane",
            "Plane and block type",
            PLANE_OPTIONS,
            "horizontal",
            "A horizontal fitting bears sideways on the trench wall; a crest in a vertical bend pushes up \
                and needs a gravity block; a sag pushes down.",
        ),
        FieldSpec {
            visible_when: Some(("plane", &["vertical_crest", "vertical_sag"])),
            optional: true,
            ..choice(
                "legs",
                "Legs of a vertical bend",
                LEGS_OPTIONS,
                "symmetric",
                "A bend at a summit or low point with both legs sloped has the larger vertical thrust \
                (2·sin(θ/2) against sin θ: 8 % more at 45°, 41 % more at 90°). Used for bends only; empty: \
                both legs sloped.",
            )
        },
        choice(
            "size",
            "Pipe size",
            pipe_sizes::SIZE_OPTIONS,
            "di52_12",
            "A preset gives both diameters, from the dimension standards (steel: ASME B36.10M; ductile iron: \
                AWWA C150/C151 class 52; PVC: AWWA C900 DR18); typed diameters below override it.",
        ),
        common::diameter_override(
            "d",
            "Inside diameter (overrides the preset)",
            "Bore of the pipe at the fitting's main end.",
        ),
        common::diameter_override(
            "od",
            "Outside diameter (overrides the preset)",
            "Outside diameter of the pipe (the thrust area for push-on and mechanical joints).",
        ),
        FieldSpec {
            visible_when: fitting_only(&["tee", "reducer"]),
            ..choice(
                "size2",
                "Branch (tee) or small-end (reducer) size",
                pipe_sizes::SIZE_OPTIONS,
                "custom",
                "A preset, or type the diameters below.",
            )
        },
        FieldSpec {
            visible_when: fitting_only(&["tee", "reducer"]),
            ..common::diameter_override("d2", "Branch or small-end inside diameter", "Overrides the preset.")
        },
        FieldSpec {
            visible_when: fitting_only(&["tee", "reducer"]),
            ..common::diameter_override("od2", "Branch or small-end outside diameter", "Overrides the preset.")
        },
        FieldSpec {
            visible_when: fitting_only(FITTINGS),
            ..choice("joint", "Joints at the fitting", JOINT_OPTIONS, "push_on", JOINT_HELP)
        },
        FieldSpec {
            visible_when: fitting_only(FITTINGS),
            ..choice(
                "p_basis",
                "Design pressure basis",
                BASIS_OPTIONS,
                "highest",
                "Design to the highest pressure the line will see, test and surge included.",
            )
        },
        FieldSpec {
            visible_when: fitting_only(FITTINGS),
            ..quantity(
                "p",
                "Working (operating) pressure, gauge",
                Q::Pressure,
                "bar",
                "psi",
                "7 bar",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "The highest steady operating pressure at the test point (at the fitting when no elevations \
                are given).",
            )
        },
        FieldSpec {
            visible_when: fitting_only(FITTINGS),
            optional: true,
            ..quantity(
                "z_test",
                "Elevation of the test point",
                Q::Length,
                "m",
                "ft",
                "0 m",
                Limits::closed(MIN_ELEVATION_M, MAX_ELEVATION_M),
                Z_TEST_HELP,
            )
        },
        FieldSpec {
            visible_when: fitting_only(FITTINGS),
            optional: true,
            ..quantity(
                "z_fitting",
                "Elevation of the fitting",
                Q::Length,
                "m",
                "ft",
                "0 m",
                Limits::closed(MIN_ELEVATION_M, MAX_ELEVATION_M),
                Z_FITTING_HELP,
            )
        },
        FieldSpec {
            visible_when: Some(("p_basis", &["test", "highest"])),
            ..choice(
                "test_rule",
                "Field test pressure rule",
                TEST_RULE_OPTIONS,
                "c600",
                "Named rules of published standards (check the edition your contract cites), or a typed test \
                pressure.",
            )
        },
        FieldSpec {
            visible_when: Some(("test_rule", &["en805"])),
            optional: true,
            ..quantity(
                "mdp",
                "Maximum design pressure MDP (EN 805), gauge",
                Q::Pressure,
                "bar",
                "psi",
                "",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "MDP includes surge. Empty: the working pressure plus EN 805's smallest surge allowance, 2 bar \
                (200 kPa).",
            )
        },
        common::typed_test_pressure_field(),
        FieldSpec {
            visible_when: Some(("p_basis", &["test", "surge", "highest"])),
            optional: true,
            ..quantity(
                "dv",
                "Velocity change for surge (sudden stop)",
                Q::Velocity,
                "m/s",
                "ft/s",
                "0.3 m/s",
                Limits::closed(0.0, 50.0),
                "The flow velocity stopped or reversed quickly (a valve closing faster than 2L/a, a pump \
                trip). Used by the surge and highest bases and the EN 805 calculated-surge test rule. Empty: \
                no surge estimate.",
            )
        },
    ];
    let surge_shown: ShownWhen = Some(("p_basis", &["test", "surge", "highest"]));
    const MATERIAL_HELP: &str = "Sets Young's modulus E and Poisson's ratio ν of the wall; by default the material \
        of the size preset (a PVC size gets PVC).";
    fields.extend(common::wave_given_fields(surge_shown));
    fields.extend(common::wave_speed_fields(surge_shown, surge_shown, MATERIAL_HELP));
    // The fluid sets the density of a fitting's balance and surge; a given thrust
    // needs none of it.
    fields.extend(common::fluid_fields("15 degC").into_iter().map(|f| FieldSpec {
        visible_when: f.visible_when.or(fitting_only(FITTINGS)),
        ..f
    }));
    fields.extend([
        FieldSpec {
            visible_when: Some(("plane", &["horizontal", "vertical_sag"])),
            ..choice(
                "soil",
                "Soil (allowable bearing)",
                SOIL_OPTIONS,
                "dense_granular",
                "Each class takes the lowest value of the published tables' rows for it (the comparison below \
                shows them side by side: they disagree by up to about 4×). The value should come from a \
                geotechnical basis: a typed value always wins.",
            )
        },
        FieldSpec {
            visible_when: Some(("soil", &["custom"])),
            optional: true,
            ..quantity(
                "sigma",
                "Typed allowable soil bearing",
                Q::SoilBearing,
                "kPa",
                "psf",
                "",
                Limits::closed(1e3, 20e6),
                "Allowable bearing of the undisturbed soil against the block face, from 1 kPa to 20 MPa (sound \
                rock).",
            )
        },
        quantity(
            "sf",
            "Safety factor",
            Q::Ratio,
            "-",
            "-",
            "1.5",
            Limits::closed(1.0, 10.0),
            "Applied to the thrust: bearing area = SF·T/σ, gravity block weight = SF·T_up. Use 1 with \
                tables whose values are already 'safe'.",
        ),
        FieldSpec {
            visible_when: Some(("plane", &["horizontal", "vertical_sag"])),
            ..choice(
                "block_dims",
                "Block face proportions",
                BLOCK_DIM_OPTIONS,
                "height",
                "Fix the face height (trench depth allows) or its width ÷ height.",
            )
        },
        FieldSpec {
            visible_when: Some(("block_dims", &["height"])),
            optional: true,
            ..quantity(
                "block_h",
                "Bearing face height",
                Q::Length,
                "m",
                "ft",
                "0.6 m",
                Limits::closed(0.05, 20.0),
                "Height of the face against undisturbed soil; at least the pipe's outside diameter.",
            )
        },
        FieldSpec {
            visible_when: Some(("block_dims", &["aspect"])),
            optional: true,
            ..quantity(
                "block_aspect",
                "Face width ÷ height",
                Q::Ratio,
                "-",
                "-",
                "1.5",
                Limits::closed(0.1, 10.0),
                "1 for a square face.",
            )
        },
        FieldSpec {
            visible_when: Some(("plane", &["vertical_crest"])),
            ..quantity(
                "gamma_c",
                "Unit weight of concrete",
                Q::SpecificWeight,
                "kN/m3",
                "lbf/ft3",
                "23.6 kN/m3",
                Limits::closed(10e3, 40e3),
                "About 23.6 kN/m³ (150 lbf/ft³) for normal-weight concrete (common practice).",
            )
        },
        FieldSpec {
            visible_when: Some(("plane", &["vertical_crest"])),
            ..choice(
                "submerged",
                "Block below groundwater",
                YES_NO,
                "no",
                "Below the water table the block weighs less by the water it displaces.",
            )
        },
        FieldSpec {
            visible_when: Some(("plane", &["vertical_crest"])),
            optional: true,
            ..quantity(
                "gravity_h",
                "Gravity block height",
                Q::Length,
                "m",
                "ft",
                "",
                Limits::closed(0.05, 20.0),
                "Empty: a cube.",
            )
        },
        FieldSpec {
            visible_when: Some(("plane", &["vertical_crest", "vertical_sag"])),
            optional: true,
            ..quantity(
                "friction",
                "Friction coefficient, block on soil (sliding check)",
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(0.0, 1.5),
                "Empty: from the soil class (NAVFAC DM-7.02 table, lower end); a typed value overrides it. \
                With a typed soil and no value the sliding check cannot be made and the page says so.",
            )
        },
        FieldSpec {
            visible_when: Some(("plane", &["vertical_crest", "vertical_sag"])),
            optional: true,
            ..quantity(
                "sf_slide",
                "Safety factor against sliding",
                Q::Ratio,
                "-",
                "-",
                "",
                Limits::closed(1.0, 10.0),
                "Empty: 1.5.",
            )
        },
    ]);
    // The soil also gives the friction of the sliding check, so it is shown for
    // every plane (set here, apart from its declaration, which the unit work shares).
    if let Some(soil) = fields.iter_mut().find(|f| f.key == "soil") {
        soil.visible_when = None;
        soil.label = "Soil (allowable bearing, friction)";
        soil.help = "Each class takes the lowest value of the published tables' rows for it (the comparison \
                below shows them side by side: they disagree by up to about 4×). The value should come from a \
                geotechnical basis: a typed value always wins. A class also gives the friction coefficient of the \
                sliding check.";
    }
    // The fluid fields' viscosity is not used here; keep the water temperature for density.
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary: "Thrust of a bend, dead end, tee or reducer at the design pressure (test and surge included), \
                and the bearing or gravity block that carries it.",
        fields,
        outputs: vec![
            OutputSpec::headline("thrust", "Thrust on the restraint (at the design pressure)", Q::Force),
            OutputSpec::headline("bearing_area", "Required bearing area", Q::Area),
            OutputSpec::headline("block_volume", "Gravity block: concrete volume", Q::ConcreteVolume),
            OutputSpec::headline("p_design", "Design pressure used", Q::Pressure),
            OutputSpec::listed(
                "thrust_angle",
                "Direction of the thrust from the inlet flow direction (plan: + to the left; elevation: + \
                    upward)",
                Q::Angle,
            ),
            OutputSpec::listed("thrust_h", "Horizontal component of the thrust", Q::Force),
            OutputSpec::listed("thrust_v", "Vertical component of the thrust (+ up)", Q::Force),
            OutputSpec::listed("area_d", "Diameter of the thrust area", Q::Length),
            OutputSpec::listed("thrust_area", "Thrust area of the main end", Q::Area),
            OutputSpec::listed("p_test", "Field test pressure", Q::Pressure),
            OutputSpec::listed(
                "p_test_point",
                "Design pressure at the test point (before the elevation correction)",
                Q::Pressure,
            ),
            OutputSpec::listed(
                "dp_elevation",
                "Static head from the test point to the fitting ρ·g·(z_test − z_fitting)",
                Q::Pressure,
            ),
            OutputSpec::listed("wave_speed", "Pressure wave speed", Q::Velocity),
            OutputSpec::listed("dp_surge", "Joukowsky surge rise ρ·a·ΔV", Q::Pressure),
            OutputSpec::listed("p_surge", "Working pressure plus surge", Q::Pressure),
            OutputSpec::listed("sigma", "Allowable soil bearing used", Q::SoilBearing),
            OutputSpec::listed("face_h", "Bearing face height", Q::Length),
            OutputSpec::listed("face_w", "Bearing face width", Q::Length),
            OutputSpec::listed("block_mass", "Gravity block: concrete mass", Q::Mass),
            OutputSpec::listed("block_weight", "Gravity block: effective weight needed", Q::Force),
            OutputSpec::listed("block_side", "Gravity block: plan side (square plan)", Q::Length),
            OutputSpec::headline("sliding_sf", "Factor of safety against sliding", Q::Ratio),
            OutputSpec::listed("friction", "Friction coefficient used for sliding", Q::Ratio),
            OutputSpec::listed(
                "side_bearing_area",
                "Sag block: bearing area against the trench wall for the horizontal thrust",
                Q::Area,
            ),
            OutputSpec::listed("mdp", "Maximum design pressure MDP (EN 805)", Q::Pressure),
        ],
        cautions: vec![
            "Published bearing tables differ by up to about 4× for the same soil name: take the \
                    allowable bearing from the geotechnical report, and keep later digging from removing the \
                    soil behind the block.",
            "This sizes the bearing area only: the concrete's reinforcement, the block's own stability \
                    and any restrained-joint alternative are for the responsible engineer and the local \
                    codes.",
        ],
    }
}

/// The registered entry point: read the values once, solve the pure model, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, model::read, model::solve, report::write)
}

#[cfg(test)]
mod tests {
    use crate::units::UnitSystem;
    use approx::assert_relative_eq;

    crate::calculators::testing::page_helpers!(super::KEY);

    #[test]
    fn field_keys_are_unique() {
        let spec = super::spec();
        for (i, f) in spec.fields.iter().enumerate() {
            assert!(
                spec.fields[i + 1..].iter().all(|g| g.key != f.key),
                "duplicate field key {}",
                f.key
            );
        }
    }

    #[test]
    fn demo_solves_in_both_unit_systems() {
        let mut r = request(&[]);
        assert!(crate::solve(super::KEY, &r).result.is_ok());
        r.system = UnitSystem::UsCustomary;
        assert!(crate::solve(super::KEY, &r).result.is_ok());
    }

    #[test]
    fn demo_matches_the_method_note_worked_example() {
        // site/notes/thrust-block.md works the demo by hand: surge governs at about
        // 10.69 bar, T ≈ 72.3 kN, bearing area ≈ 0.755 m² (rounded figures).
        let s = solved(&[]);
        let get = |k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
        assert_relative_eq!(get("p_design"), 10.69e5, max_relative = 2e-3);
        assert_relative_eq!(get("thrust"), 72.3e3, max_relative = 2e-3);
        assert_relative_eq!(get("bearing_area"), 0.755, max_relative = 2e-3);
    }

    #[test]
    fn bend_thrust_on_outside_diameter_matches_static_formula() {
        // Derived from the definition: T = 2 p A sin(θ/2), A on the OD for push-on joints.
        let s = solved(&[
            ("fitting", "bend"),
            ("angle", "90 deg"),
            ("size", "custom"),
            ("d", "300 mm"),
            ("od", "320 mm"),
            ("p_basis", "operating"),
            ("p", "10 bar"),
        ]);
        let expected = 2.0 * 1e6 * std::f64::consts::PI * 0.32 * 0.32 / 4.0 * (std::f64::consts::FRAC_PI_4).sin();
        assert_relative_eq!(
            s.output("thrust").map(|o| o.si).unwrap_or(0.0),
            expected,
            max_relative = 1e-9
        );
        assert_relative_eq!(
            s.output("area_d").map(|o| o.si).unwrap_or(0.0),
            0.32,
            max_relative = 1e-12
        );
    }

    #[test]
    fn a_reducer_with_ends_nearly_alike_agrees_with_its_closed_form() {
        // Derived from the definition: T = p(A₁ − A₂). Ends 0.1 nm apart leave 7e-10 of
        // p·A₁: the engine's two end forces cancel to it with their rounding, which
        // the check must not report as a disagreement.
        let s = solved(&[
            ("fitting", "reducer"),
            ("size", "custom"),
            ("d", "300 mm"),
            ("od", "320 mm"),
            ("size2", "custom"),
            ("d2", "299.9999999 mm"),
            ("od2", "319.9999999 mm"),
            ("joint", "flanged"),
            ("p_basis", "operating"),
            ("p", "10 bar"),
        ]);
        let (d1, d2) = (0.3_f64, 0.2999999999_f64);
        let expected = 1e6 * std::f64::consts::PI / 4.0 * (d1 * d1 - d2 * d2);
        assert_relative_eq!(
            s.output("thrust").map(|o| o.si).unwrap_or(0.0),
            expected,
            max_relative = 1e-5
        );
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    #[test]
    fn crest_needs_a_gravity_block_and_sag_bears_down() {
        let crest = solved(&[
            ("plane", "vertical_crest"),
            ("angle", "45 deg"),
            ("p_basis", "operating"),
        ]);
        let tv = crest.output("thrust_v").map(|o| o.si).unwrap_or(0.0);
        assert!(tv > 0.0);
        assert!(crest.output("block_volume").is_some());
        let sag = solved(&[("plane", "vertical_sag"), ("angle", "45 deg"), ("p_basis", "operating")]);
        assert!(sag.output("thrust_v").map(|o| o.si).unwrap_or(0.0) < 0.0);
        assert!(sag.output("bearing_area").is_some());
    }

    #[test]
    fn a_given_inclined_thrust_bears_with_its_horizontal_part() {
        // Derived from the definition: T_h = T cos 30°, A_b = SF·T_h/σ.
        let s = solved(&[
            ("fitting", "force"),
            ("thrust", "10 kN"),
            ("thrust_elev", "30 deg"),
            ("soil", "custom"),
            ("sigma", "100 kPa"),
            ("sf", "1.5"),
        ]);
        let get = |k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
        assert_relative_eq!(
            get("thrust_h"),
            10e3 * (std::f64::consts::PI / 6.0).cos(),
            max_relative = 1e-12
        );
        assert_relative_eq!(get("thrust_v"), 5e3, max_relative = 1e-12);
        assert_relative_eq!(
            get("bearing_area"),
            1.5 * 10e3 * (std::f64::consts::PI / 6.0).cos() / 100e3,
            max_relative = 1e-12
        );
        assert!(s.warnings.iter().any(|w| w.field == Some("plane")));
    }

    #[test]
    fn bad_inputs_name_their_field() {
        assert_eq!(error_field(&[("p", "-5 psi")]), "p");
        assert_eq!(error_field(&[("soil", "custom"), ("sigma", "0 kPa")]), "sigma");
        assert_eq!(error_field(&[("soil", "safe_muck")]), "soil");
        assert_eq!(error_field(&[("size", "custom")]), "d");
        assert_eq!(error_field(&[("fitting", "reducer"), ("size2", "di52_16")]), "size2");
        assert_eq!(error_field(&[("p_basis", "surge"), ("dv", "")]), "dv");
        assert_eq!(
            error_field(&[("p_basis", "test"), ("test_rule", "en805_surge"), ("dv", "")]),
            "dv"
        );
    }

    #[test]
    fn a_field_that_does_not_apply_is_hidden_along_its_chain() {
        let spec = super::spec();
        let shown = |pairs: &[(&str, &str)], key: &str| {
            let field = spec.field(key).expect("field");
            crate::catalog::is_shown(&spec, field, &request(pairs))
        };
        // The face height depends on the proportions selector, which a crest hides.
        assert!(shown(&[("plane", "horizontal")], "block_h"));
        assert!(!shown(&[("plane", "vertical_crest")], "block_h"));
        assert!(shown(&[("plane", "vertical_crest")], "gravity_h"));
        assert!(!shown(&[("plane", "horizontal")], "legs"));
        // A given thrust has no design pressure, joint or fluid of its own.
        for key in ["p", "p_basis", "test_rule", "dv", "material", "joint", "fluid", "t"] {
            assert!(!shown(&[("fitting", "force")], key), "{key}");
        }
        assert!(shown(&[("fitting", "bend")], "p"));
    }

    #[test]
    fn an_unchecked_sliding_mode_is_said_not_silent() {
        let s = solved(&[
            ("plane", "vertical_crest"),
            ("legs", "one_level"),
            ("soil", "custom"),
            ("friction", ""),
            ("p_basis", "operating"),
        ]);
        assert!(s.output("sliding_sf").is_none());
        assert!(
            s.warnings
                .iter()
                .any(|w| w.field.is_none() && w.message.contains("NOT checked")),
            "{:?}",
            s.warnings
        );
        // A typed coefficient overrides the soil's.
        let s = solved(&[
            ("plane", "vertical_crest"),
            ("legs", "one_level"),
            ("soil", "loose_granular"),
            ("friction", "0.5"),
            ("p_basis", "operating"),
        ]);
        assert_relative_eq!(s.output("friction").unwrap().si, 0.5);
        // Both legs sloped: no horizontal thrust, nothing to slide, no warning.
        let s = solved(&[
            ("plane", "vertical_sag"),
            ("legs", "symmetric"),
            ("p_basis", "operating"),
        ]);
        assert!(s.output("side_bearing_area").is_none());
        assert!(
            !s.warnings.iter().any(|w| w.message.contains("sliding")),
            "{:?}",
            s.warnings
        );
    }

    #[test]
    fn the_wave_speed_material_follows_the_size_preset() {
        let get = |pairs: &[(&str, &str)]| solved(pairs).output("wave_speed").map(|o| o.si).unwrap_or(f64::NAN);
        let base = [("p_basis", "surge"), ("dv", "0.5 m/s"), ("size", "c900dr18_8")];
        let preset = get(&[base[0], base[1], base[2], ("material", "from_size")]);
        let pvc = get(&[base[0], base[1], base[2], ("material", "pvc")]);
        let iron = get(&[base[0], base[1], base[2], ("material", "ductile_iron")]);
        assert_relative_eq!(preset, pvc, max_relative = 1e-12);
        assert!(iron > 2.0 * pvc);
        assert_eq!(
            error_field(&[
                ("p_basis", "surge"),
                ("size", "custom"),
                ("d", "300 mm"),
                ("od", "320 mm"),
                ("material", "from_size")
            ]),
            "material"
        );
    }

    #[test]
    fn highest_basis_takes_the_largest_candidate() {
        let s = solved(&[
            ("p_basis", "highest"),
            ("test_rule", "nfpa24"),
            ("p", "100 psi"),
            ("dv", ""),
        ]);
        // NFPA 24: max(200 psi, 100 + 50 psi) = 200 psi.
        assert_relative_eq!(
            s.output("p_design").map(|o| o.si).unwrap_or(0.0),
            200.0 * 6_894.757_293_168_361, // 1 psi in Pa (NIST SP 811, App. B)
            max_relative = 1e-12
        );
    }
}
