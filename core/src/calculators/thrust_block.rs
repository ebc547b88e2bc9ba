//! Thrust restraint: the design pressure, the thrust of a fitting at that pressure,
//! and the concrete block that carries it into the ground.
//!
//! # Method
//! 1. **Design pressure**, chosen openly (`p_basis`): the operating pressure; the
//!    field test pressure from a named rule ([`TEST_RULES`]) or typed; the working
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
//!    from three published tables that disagree (see [`SOILS`]); a typed value is
//!    always allowed. Face dimensions follow from a chosen height or width ÷ height.
//! 4. **Gravity block** under upward thrust (a vertical bend at a crest): the block's
//!    effective weight must be SF times the upward component, W = γ_eff·V, with
//!    γ_eff = γ_c below groundwater reduced by the water's unit weight (buoyancy).
//!    Sliding is checked by default, μ·(W − T_v) ≥ SF_slide·T_h, with μ from the
//!    soil preset ([`FRICTION_SOURCE`]: NAVFAC DM-7.02 ultimate friction factors,
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
//!   material, the default), `e_pipe`, `wall`, `anchoring`, `bulk_modulus`; fluid fields
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
//! # Assumptions
//! Static thrust (flow momentum neglected: at pipe velocities it is a few percent of
//! p·A at most, and zero at test); the weights of pipe and water are neglected
//! (conservative for uplift); the block bears on undisturbed soil; a vertical bend's
//! legs are as chosen (both sloped by θ/2, or one level).

use std::f64::consts::PI;

use crate::catalog::{
    CalculatorSpec, ChoiceOption, Diagram, FieldSpec, Limits, OutputSpec, Report, Shape, ShapeStyle, Table, Values,
};
use crate::engine::EngineWarning;
use crate::error::FieldError;
use crate::fluid::Fluid;
use crate::pipe_sizes;
use crate::restraint::pressure::{self, Anchoring, PressureBasis};
use crate::units::{self, QuantityKind as Q, UnitSystem, STANDARD_GRAVITY};
use crate::vector::Vec3;

use super::common::{self, choice, quantity, MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};

pub const KEY: &str = "thrust-block";

// The restraint model shared with the line schedule lives in `crate::restraint`;
// its names are re-exported here for the pages and tests that use them.
pub use crate::restraint::block::{Block, BLOCK_DIM_OPTIONS, WATER_UNIT_WEIGHT, YES_NO};
pub use crate::restraint::pressure::{
    material, preset_material, test_rule, wave_speed, TestRule, ANCHOR_OPTIONS, BASIS_OPTIONS, EN805_SURGE_ALLOWANCE,
    MATERIAL_OPTIONS, TEST_RULES, TEST_RULE_OPTIONS, WATER_BULK_MODULUS,
};
pub use crate::restraint::soil::{
    soil, SoilPreset, SoilTable, FRICTION_SOURCE, MAX_TYPED_BEARING, MIN_TYPED_BEARING, SOILS, SOIL_OPTIONS,
};
pub use crate::restraint::{
    diameters, joint_uses_od, static_balance, Diameters, FittingChoice, FittingKind, Joint, Legs, Plane, StaticFitting,
    JOINT_HELP, MIN_ANGLE, OD_JOINTS,
};

/// The fitting options (derived from [`FittingChoice`]).
pub const FITTING_OPTIONS: &[ChoiceOption] = FittingChoice::OPTIONS;
/// The plane options (derived from [`Plane`]).
pub const PLANE_OPTIONS: &[ChoiceOption] = Plane::OPTIONS;
/// The joint options (derived from [`Joint`]).
pub const JOINT_OPTIONS: &[ChoiceOption] = Joint::OPTIONS;
/// The legs options (derived from [`Legs`]).
pub const LEGS_OPTIONS: &[ChoiceOption] = Legs::OPTIONS;

pub fn spec() -> CalculatorSpec {
    let fitting_only = |keys: &'static [&'static str]| Some(("fitting", keys));
    const FITTINGS: &[&str] = &["bend", "dead_end", "tee", "reducer"];
    let mut fields = vec![
        choice("fitting", "Fitting to restrain", FITTING_OPTIONS, "bend", "The thrust is recomputed here at the design pressure; choose 'a given thrust' to size a block for a force from elsewhere."),
        FieldSpec { visible_when: fitting_only(&["force"]), ..quantity("thrust", "Thrust to restrain", Q::Force, "kN", "lbf", "", Limits::closed(1.0, 1e9), "Resultant thrust on the restraint at the design pressure (from a fitting page).") },
        FieldSpec { visible_when: fitting_only(&["force"]), optional: true, ..quantity("thrust_elev", "Angle of the given thrust above horizontal", Q::Angle, "deg", "deg", "", Limits::closed(-PI / 2.0, PI / 2.0), "0 for a horizontal thrust, 90° straight up (gravity block), −90° straight down. Empty: from the plane chosen below.") },
        FieldSpec { visible_when: fitting_only(&["bend"]), ..quantity("angle", "Bend deflection angle", Q::Angle, "deg", "deg", "45 deg", Limits::closed(MIN_ANGLE, PI), "From 0.1° to 180°; 11¼, 22½, 45 and 90° are the usual fittings.") },
        choice("plane", "Plane and block type", PLANE_OPTIONS, "horizontal", "A horizontal fitting bears sideways on the trench wall; a crest in a vertical bend pushes up and needs a gravity block; a sag pushes down."),
        FieldSpec { visible_when: Some(("plane", &["vertical_crest", "vertical_sag"])), optional: true, ..choice("legs", "Legs of a vertical bend", LEGS_OPTIONS, "symmetric", "A bend at a summit or low point with both legs sloped has the larger vertical thrust (2·sin(θ/2) against sin θ: 8 % more at 45°, 41 % more at 90°). Used for bends only; empty: both legs sloped.") },
        choice("size", "Pipe size", pipe_sizes::SIZE_OPTIONS, "di52_12", "A preset gives both diameters; typed diameters below override it."),
        FieldSpec { optional: true, ..quantity("d", "Inside diameter (overrides the preset)", Q::Length, "mm", "in", "", Limits::closed(MIN_SIZE_M, MAX_SIZE_M), "Bore of the pipe at the fitting's main end.") },
        FieldSpec { optional: true, ..quantity("od", "Outside diameter (overrides the preset)", Q::Length, "mm", "in", "", Limits::closed(MIN_SIZE_M, MAX_SIZE_M), "Outside diameter of the pipe (the thrust area for push-on and mechanical joints).") },
        FieldSpec { visible_when: fitting_only(&["tee", "reducer"]), ..choice("size2", "Branch (tee) or small-end (reducer) size", pipe_sizes::SIZE_OPTIONS, "custom", "A preset, or type the diameters below.") },
        FieldSpec { visible_when: fitting_only(&["tee", "reducer"]), optional: true, ..quantity("d2", "Branch or small-end inside diameter", Q::Length, "mm", "in", "", Limits::closed(MIN_SIZE_M, MAX_SIZE_M), "Overrides the preset.") },
        FieldSpec { visible_when: fitting_only(&["tee", "reducer"]), optional: true, ..quantity("od2", "Branch or small-end outside diameter", Q::Length, "mm", "in", "", Limits::closed(MIN_SIZE_M, MAX_SIZE_M), "Overrides the preset.") },
        FieldSpec { visible_when: fitting_only(FITTINGS), ..choice("joint", "Joints at the fitting", JOINT_OPTIONS, "push_on", JOINT_HELP) },
        FieldSpec { visible_when: fitting_only(FITTINGS), ..choice("p_basis", "Design pressure basis", BASIS_OPTIONS, "highest", "Design to the highest pressure the line will see, test and surge included.") },
        FieldSpec { visible_when: fitting_only(FITTINGS), ..quantity("p", "Working (operating) pressure, gauge", Q::Pressure, "bar", "psi", "7 bar", Limits::closed(0.0, MAX_PRESSURE_PA), "The highest steady operating pressure at the fitting.") },
        FieldSpec { visible_when: Some(("p_basis", &["test", "highest"])), ..choice("test_rule", "Field test pressure rule", TEST_RULE_OPTIONS, "c600", "Named rules of published standards (check the edition your contract cites), or a typed test pressure.") },
        FieldSpec { visible_when: Some(("test_rule", &["en805"])), optional: true, ..quantity("mdp", "Maximum design pressure MDP (EN 805), gauge", Q::Pressure, "bar", "psi", "", Limits::closed(0.0, MAX_PRESSURE_PA), "MDP includes surge. Empty: the working pressure plus EN 805's smallest surge allowance, 2 bar (200 kPa).") },
        FieldSpec { visible_when: Some(("test_rule", &["custom"])), optional: true, ..quantity("p_test", "Typed test pressure, gauge", Q::Pressure, "bar", "psi", "", Limits::closed(0.0, MAX_PRESSURE_PA), "Used when the test rule is 'typed test pressure'.") },
        FieldSpec { visible_when: Some(("p_basis", &["test", "surge", "highest"])), optional: true, ..quantity("dv", "Velocity change for surge (sudden stop)", Q::Velocity, "m/s", "ft/s", "0.3 m/s", Limits::closed(0.0, 50.0), "The flow velocity stopped or reversed quickly (a valve closing faster than 2L/a, a pump trip). Used by the surge and highest bases and the EN 805 calculated-surge test rule. Empty: no surge estimate.") },
        FieldSpec { visible_when: Some(("p_basis", &["test", "surge", "highest"])), optional: true, ..choice("material", "Pipe wall material (wave speed)", MATERIAL_OPTIONS, "from_size", "Sets Young's modulus E and Poisson's ratio ν of the wall; by default the material of the size preset (a PVC size gets PVC).") },
        FieldSpec { visible_when: Some(("material", &["custom"])), optional: true, ..quantity("e_pipe", "Typed Young's modulus of the wall", Q::Pressure, "MPa", "ksi", "", Limits::closed(50e6, 1e12), "Used when the material is 'typed modulus'; from 50 MPa (soft plastics under long load) to 1000 GPa.") },
        FieldSpec { visible_when: Some(("p_basis", &["test", "surge", "highest"])), optional: true, ..quantity("wall", "Wall thickness", Q::Length, "mm", "in", "", Limits::closed(0.1e-3, 1.0), "Empty: half the difference of outside and inside diameters.") },
        FieldSpec { visible_when: Some(("p_basis", &["test", "surge", "highest"])), optional: true, ..choice("anchoring", "Axial restraint of the pipe (wave speed)", ANCHOR_OPTIONS, "joints", "Wylie & Streeter's factor c₁; jointed buried pipe is usually taken as c₁ = 1 (the default when empty).") },
        FieldSpec { visible_when: Some(("p_basis", &["test", "surge", "highest"])), optional: true, ..quantity("bulk_modulus", "Bulk modulus of the liquid", Q::Pressure, "MPa", "ksi", "", Limits::closed(10e6, 1e11), "Empty: 2200 MPa, water near 20 °C. From 10 MPa (gassy liquids) to 100 GPa.") },
    ];
    // The fluid sets the density of a fitting's balance and surge; a given thrust
    // needs none of it.
    fields.extend(common::fluid_fields("15 degC").into_iter().map(|f| FieldSpec {
        visible_when: f.visible_when.or(fitting_only(FITTINGS)),
        ..f
    }));
    fields.extend([
        FieldSpec { visible_when: Some(("plane", &["horizontal", "vertical_sag"])), ..choice("soil", "Soil (allowable bearing)", SOIL_OPTIONS, "nfpa24_sandy_silt", "Published tables disagree by up to about 4× for the same soil name; the value should come from a geotechnical basis.") },
        FieldSpec { visible_when: Some(("soil", &["custom"])), optional: true, ..quantity("sigma", "Typed allowable soil bearing", Q::SoilBearing, "kPa", "psf", "", Limits::closed(1e3, 20e6), "Allowable bearing of the undisturbed soil against the block face, from 1 kPa to 20 MPa (sound rock).") },
        quantity("sf", "Safety factor", Q::Ratio, "-", "-", "1.5", Limits::closed(1.0, 10.0), "Applied to the thrust: bearing area = SF·T/σ, gravity block weight = SF·T_up. Use 1 with tables whose values are already 'safe'."),
        FieldSpec { visible_when: Some(("plane", &["horizontal", "vertical_sag"])), ..choice("block_dims", "Block face proportions", BLOCK_DIM_OPTIONS, "height", "Fix the face height (trench depth allows) or its width ÷ height.") },
        FieldSpec { visible_when: Some(("block_dims", &["height"])), optional: true, ..quantity("block_h", "Bearing face height", Q::Length, "m", "ft", "0.6 m", Limits::closed(0.05, 20.0), "Height of the face against undisturbed soil; at least the pipe's outside diameter.") },
        FieldSpec { visible_when: Some(("block_dims", &["aspect"])), optional: true, ..quantity("block_aspect", "Face width ÷ height", Q::Ratio, "-", "-", "1.5", Limits::closed(0.1, 10.0), "1 for a square face.") },
        FieldSpec { visible_when: Some(("plane", &["vertical_crest"])), ..quantity("gamma_c", "Unit weight of concrete", Q::SpecificWeight, "kN/m3", "lbf/ft3", "23.6 kN/m3", Limits::closed(10e3, 40e3), "About 23.6 kN/m³ (150 lbf/ft³) for normal-weight concrete (common practice).") },
        FieldSpec { visible_when: Some(("plane", &["vertical_crest"])), ..choice("submerged", "Block below groundwater", YES_NO, "no", "Below the water table the block weighs less by the water it displaces.") },
        FieldSpec { visible_when: Some(("plane", &["vertical_crest"])), optional: true, ..quantity("gravity_h", "Gravity block height", Q::Length, "m", "ft", "", Limits::closed(0.05, 20.0), "Empty: a cube.") },
        FieldSpec { visible_when: Some(("plane", &["vertical_crest", "vertical_sag"])), optional: true, ..quantity("friction", "Friction coefficient, block on soil (sliding check)", Q::Ratio, "-", "-", "", Limits::closed(0.0, 1.5), "Empty: from the soil preset (NAVFAC DM-7.02 table, lower end); a typed value overrides it. With a typed soil and no value the sliding check cannot be made and the page says so.") },
        FieldSpec { visible_when: Some(("plane", &["vertical_crest", "vertical_sag"])), optional: true, ..quantity("sf_slide", "Safety factor against sliding", Q::Ratio, "-", "-", "", Limits::closed(1.0, 10.0), "Empty: 1.5.") },
    ]);
    // The soil also gives the friction of the sliding check, so it is shown for
    // every plane (set here, apart from its declaration, which the unit work shares).
    if let Some(soil) = fields.iter_mut().find(|f| f.key == "soil") {
        soil.visible_when = None;
        soil.label = "Soil (allowable bearing, friction)";
        soil.help = "Published tables disagree by up to about 4× for the same soil name; the value should come from a geotechnical basis. A preset also gives the friction coefficient of the sliding check.";
    }
    // The fluid fields' viscosity is not used here; keep the water temperature for density.
    CalculatorSpec {
        key: KEY,
        title: "Thrust restraint: design pressure and thrust block",
        group: crate::catalog::group::FITTINGS,
        summary: "Thrust of a bend, dead end, tee or reducer at the design pressure (test and surge included), and the bearing or gravity block that carries it.",
        fields,
        outputs: vec![
            OutputSpec { key: "thrust", label: "Thrust on the restraint (at the design pressure)", kind: Q::Force, headline: true },
            OutputSpec { key: "bearing_area", label: "Required bearing area", kind: Q::Area, headline: true },
            OutputSpec { key: "block_volume", label: "Gravity block: concrete volume", kind: Q::ConcreteVolume, headline: true },
            OutputSpec { key: "p_design", label: "Design pressure used", kind: Q::Pressure, headline: true },
            OutputSpec { key: "thrust_angle", label: "Direction of the thrust from the inlet flow direction (plan: + to the left; elevation: + upward)", kind: Q::Angle, headline: false },
            OutputSpec { key: "thrust_h", label: "Horizontal component of the thrust", kind: Q::Force, headline: false },
            OutputSpec { key: "thrust_v", label: "Vertical component of the thrust (+ up)", kind: Q::Force, headline: false },
            OutputSpec { key: "area_d", label: "Diameter of the thrust area", kind: Q::Length, headline: false },
            OutputSpec { key: "thrust_area", label: "Thrust area of the main end", kind: Q::Area, headline: false },
            OutputSpec { key: "p_test", label: "Field test pressure", kind: Q::Pressure, headline: false },
            OutputSpec { key: "wave_speed", label: "Pressure wave speed", kind: Q::Velocity, headline: false },
            OutputSpec { key: "dp_surge", label: "Joukowsky surge rise ρ·a·ΔV", kind: Q::Pressure, headline: false },
            OutputSpec { key: "p_surge", label: "Working pressure plus surge", kind: Q::Pressure, headline: false },
            OutputSpec { key: "sigma", label: "Allowable soil bearing used", kind: Q::SoilBearing, headline: false },
            OutputSpec { key: "face_h", label: "Bearing face height", kind: Q::Length, headline: false },
            OutputSpec { key: "face_w", label: "Bearing face width", kind: Q::Length, headline: false },
            OutputSpec { key: "block_mass", label: "Gravity block: concrete mass", kind: Q::Mass, headline: false },
            OutputSpec { key: "block_weight", label: "Gravity block: effective weight needed", kind: Q::Force, headline: false },
            OutputSpec { key: "block_side", label: "Gravity block: plan side (square plan)", kind: Q::Length, headline: false },
            OutputSpec { key: "sliding_sf", label: "Factor of safety against sliding", kind: Q::Ratio, headline: true },
            OutputSpec { key: "friction", label: "Friction coefficient used for sliding", kind: Q::Ratio, headline: false },
            OutputSpec { key: "side_bearing_area", label: "Sag block: bearing area against the trench wall for the horizontal thrust", kind: Q::Area, headline: false },
            OutputSpec { key: "mdp", label: "Maximum design pressure MDP (EN 805)", kind: Q::Pressure, headline: false },
        ],
        cautions: vec![
            "Design to the highest pressure the line will see: the field test pressure and surge usually exceed the operating pressure.",
            "Allowable soil bearing must have a geotechnical basis; published tables differ by up to about 4× for the same soil name. Pour the block against undisturbed ground, and keep later excavation from undermining it or removing the soil behind it.",
            "This sizes the bearing area only: the concrete's reinforcement, the block's own stability and any restrained-joint alternative are for the responsible engineer and the local codes.",
        ],
    }
}

fn opt(values: &Values, key: &str) -> Option<f64> {
    values.is_set(key).then(|| values.quantity_or(key, 0.0))
}

/// Design pressures found from the inputs.
struct Pressures {
    work: f64,
    /// EN 805's maximum design pressure and how it was found.
    mdp: Option<(f64, String)>,
    test: Option<(f64, String)>,
    surge: Option<Surge>,
    design: f64,
    basis: String,
}

struct Surge {
    wave_speed: f64,
    dp: f64,
    source: String,
}

pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    let one = |e: FieldError| vec![e];
    let fitting = values.choice("fitting").map_err(one)?.to_string();
    let plane = Plane::from_key(values.choice("plane").map_err(one)?)
        .ok_or_else(|| vec![FieldError::inconsistent("plane", "unknown plane")])?;
    let symmetric = values.choice("legs").unwrap_or("symmetric") == "symmetric";
    let sf = values.quantity("sf").map_err(one)?;
    let given_force = fitting == "force";
    // The fluid matters only to a fitting's balance and surge (hidden for a given thrust).
    let fluid = if given_force {
        None
    } else {
        Some(common::fluid_from(values)?)
    };
    // A given thrust carries no joint: its area basis was chosen on the page it came from.
    let uses_od = !given_force && joint_uses_od(values.choice("joint").map_err(one)?);

    // --- Sizes --------------------------------------------------------------------
    let size_key = values.choice("size").map_err(one)?.to_string();
    let main = diameters(&size_key, opt(values, "d"), opt(values, "od"), ("size", "d", "od"));
    let main = match (main, given_force) {
        (Ok(d), _) => Some(d),
        (Err(e), false) => return Err(vec![e]),
        (Err(_), true) => None,
    };
    let second = if matches!(fitting.as_str(), "tee" | "reducer") {
        let key = values.choice("size2").unwrap_or(pipe_sizes::CUSTOM).to_string();
        Some(diameters(&key, opt(values, "d2"), opt(values, "od2"), ("size2", "d2", "od2")).map_err(one)?)
    } else {
        None
    };
    let basis_d = |d: Diameters| if uses_od { d.od } else { d.id };

    // --- Design pressure (not for a given thrust: it was found elsewhere) ------------
    let pressures = match &fluid {
        None => None,
        Some(fluid) => Some(design_pressure(values, main, &size_key, fluid, report)?),
    };
    let p = pressures.as_ref().map_or(0.0, |pr| pr.design);

    // --- Thrust --------------------------------------------------------------------
    let mut inlet_angle = 0.0;
    let (thrust_vec, balance) = match fitting.as_str() {
        "force" => {
            let t = values.quantity("thrust").map_err(one)?;
            let elev = match values.is_set("thrust_elev") {
                true => values.quantity_or("thrust_elev", 0.0),
                false => plane.default_elevation(),
            };
            (plane.given_thrust(t, elev), None)
        }
        kind => {
            let main = main.ok_or_else(|| vec![FieldError::inconsistent("d", "a size is required")])?;
            let fluid = fluid
                .as_ref()
                .ok_or_else(|| vec![FieldError::inconsistent("fluid", "choose the fluid")])?;
            let a1 = common::circle_area(basis_d(main));
            let (kind, angle, a2) = match kind {
                "bend" => (FittingKind::Bend, values.quantity("angle").map_err(one)?, a1),
                "dead_end" => (FittingKind::DeadEnd, 0.0, a1),
                "tee" | "reducer" => {
                    let s = second.ok_or_else(|| {
                        vec![FieldError::inconsistent("d2", "a branch or small-end size is required")]
                    })?;
                    let a2 = common::circle_area(basis_d(s));
                    if kind == "tee" {
                        if s.od > main.od * 1.0001 {
                            return Err(vec![FieldError::inconsistent(
                                "size2",
                                "the branch of a tee cannot be larger than the run",
                            )]);
                        }
                        (FittingKind::Tee, 0.0, a2)
                    } else {
                        if a2 >= a1 {
                            return Err(vec![FieldError::inconsistent(
                                "size2",
                                "the small end of a reducer must be smaller than the large end",
                            )]);
                        }
                        (FittingKind::Reducer, 0.0, a2)
                    }
                }
                _ => return Err(vec![FieldError::inconsistent("fitting", "unknown fitting")]),
            };
            let fit = StaticFitting {
                kind,
                angle,
                area: a1,
                area2: a2,
                plane,
                symmetric,
            };
            inlet_angle = fit.inlet_angle();
            let balance = static_balance(&fit, p, fluid).map_err(|e| common::engine_error(e, "p"))?;
            let thrust = balance.thrust();
            static_checks(report, &fit, p, thrust);
            report.output("area_d", basis_d(main));
            report.output("thrust_area", a1);
            (thrust, Some(balance))
        }
    };
    let (t_h, t_v) = match plane {
        Plane::Horizontal => (thrust_vec.x.hypot(thrust_vec.y), thrust_vec.z),
        Plane::Crest | Plane::Sag => (thrust_vec.x.abs(), thrust_vec.y),
    };
    let thrust = thrust_vec.norm();
    report.output("thrust", thrust);
    if thrust > 0.0 && !given_force {
        report.output("thrust_angle", thrust_vec.y.atan2(thrust_vec.x));
    }
    report.output("thrust_h", t_h);
    report.output("thrust_v", t_v);
    if pressures.is_some() {
        report.output("p_design", p);
    }
    if let Some(b) = &balance {
        for w in &b.warnings {
            if !matches!(w, EngineWarning::MomentumNegligible { .. }) {
                report.warn(Some("p"), w.to_string());
            }
        }
    }
    if thrust == 0.0 {
        report.warn(Some("p"), "with zero pressure there is no thrust to restrain");
    }
    if given_force && plane == Plane::Sag {
        report.warn(None, "the block is sized as a sag block: its bearing face lies below the pipe and takes the thrust downward. A horizontal bend's thrust is horizontal (the fluid's weight is carried by the bedding); choose the horizontal plane unless the fitting really turns upward in a vertical plane");
    }

    // --- Block -----------------------------------------------------------------------
    let od_for_drawing = main.map(|d| d.od).unwrap_or(0.3);
    let soil_key = values.choice("soil").map_err(one)?;
    let friction = match opt(values, "friction") {
        Some(mu) => Some((mu, "typed".to_string())),
        None => soil(soil_key).and_then(|s| {
            s.friction
                .map(|mu| (mu, format!("{} preset ({FRICTION_SOURCE})", s.soil)))
        }),
    };
    let sf_slide = opt(values, "sf_slide").unwrap_or(1.5);
    let block = match plane {
        Plane::Horizontal | Plane::Sag => {
            let sigma = soil_bearing(values)?;
            report.output("sigma", sigma);
            let load = if plane == Plane::Horizontal { t_h } else { thrust };
            let area = sf * load / sigma;
            report.output("bearing_area", area);
            let (h, w) = face(values, area)?;
            report.output("face_h", h);
            report.output("face_w", w);
            if plane == Plane::Horizontal && main.is_some() && h < od_for_drawing {
                let text = report.fmt(od_for_drawing, Q::Length);
                report.warn(Some("block_h"), format!("the bearing face is lower than the pipe's outside diameter ({text}): make it at least as tall as the pipe, centred on the thrust line"));
            }
            if plane == Plane::Horizontal && t_v.abs() > 1e-9 * thrust.max(1.0) {
                report.warn(Some("plane"), "the given thrust has a vertical component; only the horizontal part is carried by the bearing face");
            }
            if plane == Plane::Sag && t_h > 1e-9 * thrust.max(1.0) {
                // The base bears the resultant; its horizontal part must also be held,
                // by friction under the base (the thrust's own downward part presses
                // it on; the block's weight is neglected, which is conservative) or by
                // a face against the trench wall.
                let side = sf * t_h / sigma;
                report.output("side_bearing_area", side);
                sliding_check(
                    report,
                    friction.as_ref(),
                    (-t_v).max(0.0),
                    t_h,
                    sf_slide,
                    "μ·T_down/T_h (block weight neglected)",
                    format!(
                        "bear a side face of {} against undisturbed soil",
                        report.fmt(side, Q::Area)
                    ),
                );
            }
            soil_comparison(report, load, sf, soil_key);
            Block::Bearing { h, w }
        }
        Plane::Crest => {
            let gamma_c = values.quantity("gamma_c").map_err(one)?;
            let submerged = values.choice("submerged").map_err(one)? == "yes";
            let gamma_eff = if submerged {
                gamma_c - WATER_UNIT_WEIGHT
            } else {
                gamma_c
            };
            if gamma_eff <= 0.0 {
                return Err(vec![FieldError::inconsistent(
                    "gamma_c",
                    "below groundwater the concrete must be heavier than water",
                )]);
            }
            if t_v <= 0.0 {
                report.warn(Some("plane"), "the thrust has no upward component: a gravity block is not what holds it; choose a horizontal or sag block");
            }
            let weight = sf * t_v.max(0.0);
            let volume = weight / gamma_eff;
            let mass = gamma_c * volume / STANDARD_GRAVITY;
            report.output("block_weight", weight);
            report.output("block_volume", volume);
            report.output("block_mass", mass);
            let height = opt(values, "gravity_h");
            let side = match height {
                Some(h) => (volume / h).sqrt(),
                None => volume.cbrt(),
            };
            report.output("block_side", side);
            if t_h > 1e-9 * thrust.max(1.0) {
                let normal = gamma_eff * volume - t_v.max(0.0);
                sliding_check(
                    report,
                    friction.as_ref(),
                    normal,
                    t_h,
                    sf_slide,
                    "μ·(W − T_up)/T_h",
                    "enlarge the block or bear its side against undisturbed soil".to_string(),
                );
            }
            if submerged {
                report.warn(Some("submerged"), "below groundwater the block's effective weight uses γ_c − γ_w; check the highest groundwater level, not today's");
            }
            Block::Gravity {
                volume,
                side,
                height: height.unwrap_or(side),
            }
        }
    };

    // --- Tables, diagram, links ---------------------------------------------------------
    if let Some(pr) = &pressures {
        pressure_table(report, pr, values);
    }
    if let Some(b) = &balance {
        let system = report.system();
        report.solution.tables.push(common::ledger_table(b, system));
    }
    let angle = values.quantity_or("angle", PI / 4.0);
    let submerged = values.choice("submerged").unwrap_or("no") == "yes";
    let diagram = diagram(
        &fitting,
        plane,
        od_for_drawing,
        second.map(|d| d.od),
        (inlet_angle, angle),
        submerged,
        thrust_vec,
        &block,
        report,
    );
    report.solution.diagrams.push(diagram);
    Ok(())
}

/// Checks of the engine's static thrust against the closed forms of the
/// thrust-restraint guides, computed from the areas and the angle alone: the
/// resultant (2pA·sin(θ/2), pA, pA_branch, p(A₁ − A₂)) and, for a vertical bend, the
/// vertical part (pA·sin θ with one leg level, 2pA·sin(θ/2) with both legs sloped).
fn static_checks(report: &mut Report<'_>, fit: &StaticFitting, p: f64, thrust: Vec3) {
    let (closed, formula) = crate::restraint::closed_form_thrust(fit, p);
    report.check(
        "Thrust on the restraint",
        formula,
        Q::Force,
        thrust.norm(),
        closed,
        1e-9,
        0.0,
    );
    if let Some((closed_v, formula_v)) = crate::restraint::closed_form_vertical(fit, p) {
        report.check(
            "Vertical thrust",
            formula_v,
            Q::Force,
            thrust.y,
            closed_v,
            1e-9,
            thrust.norm(),
        );
    }
}

/// Sliding of a block on its base: friction `μ·normal` against `SF_slide·T_h`.
/// Without a friction coefficient the check cannot be made: that is a warning in
/// the headline area, never silence.
fn sliding_check(
    report: &mut Report<'_>,
    friction: Option<&(f64, String)>,
    normal: f64,
    t_h: f64,
    sf_slide: f64,
    formula: &str,
    remedy: String,
) {
    match friction {
        Some((mu, _)) => {
            report.output("friction", *mu);
            let factor = mu * normal.max(0.0) / t_h;
            report.output("sliding_sf", factor);
            if factor < sf_slide {
                report.warn(Some("friction"), format!("sliding: {formula} = {} is below the required {}; {remedy}", units::format_significant(factor, 3), units::format_significant(sf_slide, 3)));
            }
        }
        None => report.warn(None, format!("sliding is NOT checked: the thrust has a horizontal part of {} and the chosen soil gives no friction coefficient; type one (concrete on soil) to check it, or {remedy}", report.fmt(t_h, Q::Force))),
    }
}

fn soil_bearing(values: &Values) -> Result<f64, Vec<FieldError>> {
    let key = values.choice("soil").map_err(|e| vec![e])?;
    if key == "custom" {
        if let Some(sigma) = opt(values, "sigma") {
            if !(MIN_TYPED_BEARING..=MAX_TYPED_BEARING).contains(&sigma) {
                return Err(vec![FieldError::inconsistent(
                    "sigma",
                    "the allowable soil bearing must be at least 1 kPa (21 psf) and at most 20 MPa (sound rock)",
                )]);
            }
        }
        return opt(values, "sigma").ok_or_else(|| {
            vec![FieldError::inconsistent(
                "sigma",
                "type the allowable soil bearing (greater than 0), or choose a soil preset",
            )]
        });
    }
    match soil(key) {
        Some(s) if s.bearing > 0.0 => Ok(s.bearing),
        Some(s) => Err(vec![FieldError::inconsistent("soil", format!("{}: the {} gives no bearing (0); a block cannot bear on it: use restrained joints, piles or tie rods to firm ground, or replace the soil, with a geotechnical engineer", s.soil, s.table.short()))]),
        None => Err(vec![FieldError::inconsistent("soil", "unknown soil preset")]),
    }
}

/// Face height and width for a bearing area.
fn face(values: &Values, area: f64) -> Result<(f64, f64), Vec<FieldError>> {
    match values.choice("block_dims").unwrap_or("height") {
        "aspect" => {
            let r = opt(values, "block_aspect").ok_or_else(|| {
                vec![FieldError::inconsistent(
                    "block_aspect",
                    "give the face's width ÷ height",
                )]
            })?;
            let h = (area / r).sqrt();
            Ok((h, r * h))
        }
        _ => {
            let h = opt(values, "block_h")
                .ok_or_else(|| vec![FieldError::inconsistent("block_h", "give the bearing face height")])?;
            Ok((h, area / h))
        }
    }
}

fn design_pressure(
    values: &Values,
    main: Option<Diameters>,
    size_key: &str,
    fluid: &Fluid,
    report: &mut Report<'_>,
) -> Result<Pressures, Vec<FieldError>> {
    let one = |e: FieldError| vec![e];
    let basis = values.choice("p_basis").map_err(one)?.to_string();
    let work = values.quantity("p").map_err(one)?;
    let wants_test = matches!(basis.as_str(), "test" | "highest");
    let wants_surge = matches!(basis.as_str(), "surge" | "highest");
    let rule_key = if wants_test {
        values.choice("test_rule").map_err(one)?
    } else {
        "custom"
    };
    let rule_needs_surge = wants_test && test_rule(rule_key).is_some_and(|r| r.needs_surge);
    let surge = if (wants_surge || rule_needs_surge) && values.is_set("dv") {
        let dv = values.quantity_or("dv", 0.0);
        let main = main.ok_or_else(|| vec![FieldError::inconsistent("d", "the surge estimate needs the pipe size")])?;
        let material_key = match values.choice("material").unwrap_or("") {
            "from_size" => match pipe_sizes::find(size_key) {
                Some(size) => preset_material(size.family),
                None => {
                    return Err(vec![FieldError::inconsistent(
                        "material",
                        "the pipe size is typed, so its material is not known: choose the wall material",
                    )])
                }
            },
            key => key,
        };
        let (e_mod, nu, source) = match material_key {
            "" => {
                return Err(vec![FieldError::inconsistent(
                    "material",
                    "choose the pipe wall material for the wave speed",
                )])
            }
            "custom" => {
                let e = opt(values, "e_pipe").ok_or_else(|| {
                    vec![FieldError::inconsistent(
                        "e_pipe",
                        "type Young's modulus of the wall, or choose a material",
                    )]
                })?;
                (e, 0.3, "typed modulus, ν = 0.3".to_string())
            }
            key => {
                let (e, nu, s) =
                    material(key).ok_or_else(|| vec![FieldError::inconsistent("material", "unknown material")])?;
                (e, nu, s.to_string())
            }
        };
        let wall = opt(values, "wall").unwrap_or((main.od - main.id) / 2.0);
        if wall >= main.od / 2.0 {
            return Err(vec![FieldError::inconsistent(
                "wall",
                "the wall must be thinner than half the outside diameter",
            )]);
        }
        let c1 = Anchoring::from_key(values.choice("anchoring").unwrap_or("joints"))
            .unwrap_or(Anchoring::Joints)
            .c1(nu);
        let k = opt(values, "bulk_modulus").unwrap_or(WATER_BULK_MODULUS);
        let a = wave_speed(k, fluid.density, main.id, wall, e_mod, c1);
        let dp = pressure::joukowsky(fluid.density, a, dv);
        report.output("wave_speed", a);
        report.output("dp_surge", dp);
        report.output("p_surge", work + dp);
        Some(Surge {
            wave_speed: a,
            dp,
            source,
        })
    } else {
        if basis == "surge" {
            return Err(vec![FieldError::inconsistent(
                "dv",
                "the surge basis needs the velocity change",
            )]);
        }
        if rule_needs_surge {
            return Err(vec![FieldError::inconsistent(
                "dv",
                "this test rule adds the calculated surge: give the velocity change",
            )]);
        }
        None
    };
    let mut mdp = None;
    let test = if wants_test {
        let rule = values.choice("test_rule").map_err(one)?;
        if rule == "custom" {
            let p = opt(values, "p_test").ok_or_else(|| {
                vec![FieldError::inconsistent(
                    "p_test",
                    "type the test pressure, or choose a named rule",
                )]
            })?;
            Some((p, "typed test pressure".to_string()))
        } else {
            let r = test_rule(rule).ok_or_else(|| vec![FieldError::inconsistent("test_rule", "unknown rule")])?;
            let typed_mdp = if rule == "en805" { opt(values, "mdp") } else { None };
            if r.allowance > 0.0 || typed_mdp.is_some() {
                let (base, how) = match typed_mdp {
                    Some(m) => (m, "typed".to_string()),
                    None => (
                        work + r.allowance,
                        format!(
                            "working + {} surge allowance (surge not calculated; EN 805's smallest allowance, from memory)",
                            report.fmt(r.allowance, Q::Pressure)
                        ),
                    ),
                };
                if base < work {
                    return Err(vec![FieldError::inconsistent(
                        "mdp",
                        "MDP includes surge: it cannot be below the working pressure",
                    )]);
                }
                report.output("mdp", base);
                mdp = Some((base, how));
            }
            Some((
                r.test_pressure(work, typed_mdp, surge.as_ref().map_or(0.0, |s| s.dp)),
                r.citation.to_string(),
            ))
        }
    } else {
        None
    };
    if let Some((pt, _)) = &test {
        report.output("p_test", *pt);
    }
    let surge_p = surge.as_ref().map(|s| work + s.dp);
    let p_basis = PressureBasis::from_key(&basis)
        .ok_or_else(|| vec![FieldError::inconsistent("p_basis", "unknown design pressure basis")])?;
    let (design, _) = pressure::design_pressure(p_basis, work, test.as_ref().map(|t| t.0), surge_p);
    if basis == "operating" {
        report.warn(
            Some("p_basis"),
            "designing on the operating pressure alone: the field test and any surge will load the block harder",
        );
    }
    if basis == "highest" && surge.is_none() {
        report.warn(Some("dv"), "no surge estimate: the highest pressure here omits surge; give the velocity change or check transients separately");
    }
    Ok(Pressures {
        work,
        mdp,
        test,
        surge,
        design,
        basis,
    })
}

fn pressure_table(report: &mut Report<'_>, pr: &Pressures, values: &Values) {
    let unit = units::display_unit(pr.design.max(pr.work).max(1.0), Q::Pressure, report.system()).id;
    let cell = |v: f64| {
        units::convert_to(v, Q::Pressure, unit)
            .map(|x| units::format_significant(x, 4))
            .unwrap_or_default()
    };
    let mut table = Table {
        key: "pressures",
        title: "Design pressure: the candidates and the one used".to_string(),
        columns: vec![
            "Basis".into(),
            format!("gauge pressure ({unit})"),
            "How it was found".into(),
        ],
        rows: vec![vec!["Operating (working)".into(), cell(pr.work), "typed".into()]],
        emphasised_rows: Vec::new(),
    };
    if let Some((m, how)) = &pr.mdp {
        table
            .rows
            .push(vec!["MDP (EN 805, surge included)".into(), cell(*m), how.clone()]);
    }
    if let Some((pt, src)) = &pr.test {
        table.rows.push(vec!["Field test".into(), cell(*pt), src.clone()]);
    }
    if let Some(s) = &pr.surge {
        let a = report.fmt(s.wave_speed, Q::Velocity);
        let dv = report.fmt(values.quantity_or("dv", 0.0), Q::Velocity);
        table.rows.push(vec![
            "Working + Joukowsky surge".into(),
            cell(pr.work + s.dp),
            format!("Δp = ρ·a·ΔV with a = {a}, ΔV = {dv}; {}", s.source),
        ]);
    }
    table.rows.push(vec![
        format!("Used ({})", pr.basis),
        cell(pr.design),
        "the design pressure of the thrust below".into(),
    ]);
    table.emphasised_rows.push(table.rows.len() - 1);
    report.solution.tables.push(table);
}

/// The soil tables side by side: the bearing area each preset would need for this load.
fn soil_comparison(report: &mut Report<'_>, load: f64, sf: f64, used: &str) {
    let system = report.system();
    let p_unit = match system {
        UnitSystem::Si => "kPa",
        UnitSystem::UsCustomary => "psf",
    };
    let a_unit = units::display_unit(sf * load / 50e3, Q::Area, system).id;
    let fmt = |v: f64, kind: Q, unit: &str| {
        units::convert_to(v, kind, unit)
            .map(|x| units::format_significant(x, 3))
            .unwrap_or_default()
    };
    let mut table = Table {
        key: "soils",
        title: format!(
            "Soil tables compared: bearing area for this load at SF {}",
            units::format_significant(sf, 3)
        ),
        columns: vec![
            "Table".into(),
            "Soil".into(),
            format!("allowable bearing ({p_unit})"),
            format!("bearing area ({a_unit})"),
        ],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
    };
    for s in SOILS {
        let area = if s.bearing > 0.0 {
            fmt(sf * load / s.bearing, Q::Area, a_unit)
        } else {
            "no bearing".into()
        };
        if s.key == used {
            table.emphasised_rows.push(table.rows.len());
        }
        table.rows.push(vec![
            s.table.short().into(),
            s.soil.into(),
            fmt(s.bearing, Q::Pressure, p_unit),
            area,
        ]);
    }
    report.solution.tables.push(table);
    let mut sources = Table {
        key: "soil_sources",
        title: "The soil tables: sources and safety-factor conventions".to_string(),
        columns: vec!["Table".into(), "Source".into(), "Convention".into()],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
    };
    for t in [SoilTable::SafeBearing, SoilTable::Nfpa24, SoilTable::Bs8004] {
        sources.rows.push(vec![
            t.short().into(),
            t.citation().replace('*', ""),
            t.convention().into(),
        ]);
    }
    report.solution.tables.push(sources);
}

#[allow(clippy::too_many_arguments)]
pub(crate) fn diagram(
    fitting: &str,
    plane: Plane,
    od: f64,
    od2: Option<f64>,
    (inlet_angle, angle): (f64, f64),
    submerged: bool,
    thrust: Vec3,
    block: &Block,
    report: &Report<'_>,
) -> Diagram {
    let mut shapes = Vec::new();
    let lead = 3.0 * od;
    let turn = plane.turn();
    // The pipe: legs meeting at the origin, to scale (outside diameter).
    let legs: Vec<([f64; 2], [f64; 2], f64)> = match fitting {
        "bend" => {
            let a = inlet_angle + turn * angle;
            vec![
                ([-lead * inlet_angle.cos(), -lead * inlet_angle.sin()], [0.0, 0.0], od),
                ([0.0, 0.0], [lead * a.cos(), lead * a.sin()], od),
            ]
        }
        "tee" => vec![
            ([-lead, 0.0], [lead, 0.0], od),
            ([0.0, 0.0], [0.0, turn * lead], od2.unwrap_or(od)),
        ],
        "reducer" => vec![
            ([-lead, 0.0], [0.0, 0.0], od),
            ([0.0, 0.0], [lead, 0.0], od2.unwrap_or(od)),
        ],
        "dead_end" => vec![([-lead, 0.0], [0.0, 0.0], od)],
        _ => vec![],
    };
    for (a, b, d) in &legs {
        shapes.push(Shape::Polygon {
            points: common::straight_band(*a, *b, *d),
            style: ShapeStyle::Wall,
        });
    }
    // Thrust direction in the drawing plane.
    let (tx, ty) = match plane {
        Plane::Horizontal if thrust.x.abs() + thrust.y.abs() > 0.0 => (thrust.x, thrust.y),
        Plane::Horizontal => (1.0, 0.0),
        _ => (thrust.x, thrust.y),
    };
    let tn = (tx * tx + ty * ty).sqrt();
    let (ux, uy) = if tn > 0.0 { (tx / tn, ty / tn) } else { (1.0, 0.0) };
    let (nx, ny) = (-uy, ux);
    let caption;
    let title;
    let mut arrow_end = [ux * 3.0 * od.max(0.2), uy * 3.0 * od.max(0.2)];
    match block {
        Block::Bearing { w, h, .. } => {
            // Plan (horizontal): the face width is seen; a sag block is drawn in
            // elevation, its base under the fitting.
            let depth = (0.5 * w).max(0.5 * od).max(0.3);
            let near = 0.5 * od;
            let far = near + depth;
            let half = 0.5 * w;
            let p = |s: f64, t: f64| [s * ux + t * nx, s * uy + t * ny];
            shapes.push(Shape::Polygon {
                points: vec![p(near, -half), p(far, -half), p(far, half), p(near, half)],
                style: ShapeStyle::Restraint,
            });
            shapes.push(Shape::Polyline {
                points: vec![p(far + 0.05 * depth, -half * 1.3), p(far + 0.05 * depth, half * 1.3)],
                style: ShapeStyle::Guide,
            });
            shapes.push(Shape::Text {
                at: p(far + 0.8 * depth, -0.9 * half),
                text: "undisturbed soil".into(),
                style: ShapeStyle::Label,
            });
            let label_w = report.fmt(*w, Q::Length);
            let label_h = report.fmt(*h, Q::Length);
            shapes.push(Shape::Text {
                at: p(0.5 * (near + far), half + 0.2 * depth),
                text: format!("face {label_w} × {label_h} (w × h)"),
                style: ShapeStyle::Label,
            });
            // Bearing pressure arrows on the face, pointing back at the block.
            for k in [-0.6, 0.0, 0.6] {
                shapes.push(Shape::Arrow {
                    from: p(far + 0.6 * depth, k * half),
                    to: p(far, k * half),
                    label: String::new(),
                    style: ShapeStyle::Pressure,
                });
            }
            arrow_end = p(near + 0.55 * depth, 0.0);
            title = if plane == Plane::Horizontal {
                "Bearing block, plan view"
            } else {
                "Block under a sag bend, elevation"
            }
            .to_string();
            caption = "Pipe (outside diameter) and the bearing face width to scale; the block's depth behind the face is schematic (a sag block is drawn square to the resultant). T is the thrust on the block; the soil pushes back on the face.".to_string();
        }
        Block::Gravity { volume, side, height } => {
            // Elevation: the block under the crest fitting, hanging from it.
            let top = -0.5 * od;
            let half = 0.5 * side;
            shapes.push(Shape::Polygon {
                points: vec![[-half, top], [half, top], [half, top - height], [-half, top - height]],
                style: ShapeStyle::Restraint,
            });
            let weight_arrow_len = 0.6 * height;
            shapes.push(Shape::Arrow {
                from: [0.0, top - 0.5 * height],
                to: [0.0, top - 0.5 * height - weight_arrow_len],
                label: "W (block)".into(),
                style: ShapeStyle::Weight,
            });
            shapes.push(Shape::Text {
                at: [half + 0.1, top - 0.5 * height],
                text: format!("{} of concrete", report.fmt(*volume, Q::Volume)),
                style: ShapeStyle::Label,
            });
            if submerged {
                shapes.push(Shape::Polyline {
                    points: vec![[-half * 1.5, top + 0.2], [half * 1.5, top + 0.2]],
                    style: ShapeStyle::Fluid,
                });
                shapes.push(Shape::Text {
                    at: [half * 1.5, top + 0.25],
                    text: "groundwater".into(),
                    style: ShapeStyle::Label,
                });
            }
            title = "Gravity block under a crest bend, elevation".to_string();
            caption = "Pipe and block to scale (square plan, side shown); the block is tied to the fitting, and its effective weight holds the upward thrust.".to_string();
        }
    }
    shapes.push(Shape::Arrow {
        from: [0.0, 0.0],
        to: arrow_end,
        label: format!("T {}", report.fmt(thrust.norm(), Q::Force)),
        style: ShapeStyle::Thrust,
    });
    let bounds = common::bounds_of(shapes.iter().flat_map(common::shape_points), 0.5 * od.max(0.2));
    Diagram {
        title,
        bounds,
        shapes,
        caption,
    }
}

#[cfg(test)]
mod tests {
    use crate::catalog::Request;
    use crate::units::UnitSystem;
    use approx::assert_relative_eq;

    fn request(pairs: &[(&str, &str)]) -> Request {
        crate::catalog::demo_request(&super::spec(), pairs)
    }

    fn solve(pairs: &[(&str, &str)]) -> crate::catalog::Solution {
        crate::calculators::testing::solved(super::KEY, pairs)
    }

    fn error_field(pairs: &[(&str, &str)]) -> String {
        crate::calculators::testing::error_field(super::KEY, pairs)
    }

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
        let s = solve(&[]);
        let get = |k: &str| s.output(k).map(|o| o.si).unwrap_or(f64::NAN);
        assert_relative_eq!(get("p_design"), 10.69e5, max_relative = 2e-3);
        assert_relative_eq!(get("thrust"), 72.3e3, max_relative = 2e-3);
        assert_relative_eq!(get("bearing_area"), 0.755, max_relative = 2e-3);
    }

    #[test]
    fn bend_thrust_on_outside_diameter_matches_static_formula() {
        // Derived from the definition: T = 2 p A sin(θ/2), A on the OD for push-on joints.
        let s = solve(&[
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
    fn crest_needs_a_gravity_block_and_sag_bears_down() {
        let crest = solve(&[
            ("plane", "vertical_crest"),
            ("angle", "45 deg"),
            ("p_basis", "operating"),
        ]);
        let tv = crest.output("thrust_v").map(|o| o.si).unwrap_or(0.0);
        assert!(tv > 0.0);
        assert!(crest.output("block_volume").is_some());
        let sag = solve(&[("plane", "vertical_sag"), ("angle", "45 deg"), ("p_basis", "operating")]);
        assert!(sag.output("thrust_v").map(|o| o.si).unwrap_or(0.0) < 0.0);
        assert!(sag.output("bearing_area").is_some());
    }

    #[test]
    fn a_given_inclined_thrust_bears_with_its_horizontal_part() {
        // Derived from the definition: T_h = T cos 30°, A_b = SF·T_h/σ.
        let s = solve(&[
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
        let s = solve(&[
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
        let s = solve(&[
            ("plane", "vertical_crest"),
            ("legs", "one_level"),
            ("soil", "nfpa24_sand"),
            ("friction", "0.5"),
            ("p_basis", "operating"),
        ]);
        assert_relative_eq!(s.output("friction").unwrap().si, 0.5);
        // Both legs sloped: no horizontal thrust, nothing to slide, no warning.
        let s = solve(&[
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
        let get = |pairs: &[(&str, &str)]| solve(pairs).output("wave_speed").map(|o| o.si).unwrap_or(f64::NAN);
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
        let s = solve(&[
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
