//! The one vocabulary of the handbook: every query key (and every option key of a
//! choice) names one concept on every page, and old keys of bookmarked links are
//! read through one alias table that reports what it translated.
//!
//! The query keys are the product's public interface: users bookmark them and send
//! them to each other. So a concept has exactly one key ([`TERMS`]), a key has
//! exactly one meaning, and a key that was ever published and then renamed stays
//! readable through [`KEY_ALIASES`] and [`VALUE_ALIASES`]. A tidy test fails when a
//! page uses a key that is not in the glossary, or a retired key of the alias table
//! (that is: two pages using different keys for one concept).
//!
//! Keys of the repeated groups of a page (a tee's branches) are written with `#` in
//! place of the group number (`b#_d` for `b1_d` … `b6_d`).

/// One concept and its key.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Term {
    /// The query key (`#` stands for a group number 1–9).
    pub key: &'static str,
    /// What the key means, on every page that uses it.
    pub meaning: &'static str,
    /// The option keys a choice of this concept may use (a page offers a subset);
    /// empty for quantities and text.
    pub options: &'static [&'static str],
}

const fn term(key: &'static str, meaning: &'static str) -> Term {
    Term {
        key,
        meaning,
        options: &[],
    }
}

const fn choice(key: &'static str, meaning: &'static str, options: &'static [&'static str]) -> Term {
    Term { key, meaning, options }
}

/// Every concept of the handbook, by key.
pub const TERMS: &[Term] = &[
    // Pipe geometry.
    term("d", "inside diameter (bore) of the pipe at the main or inlet end"),
    term("od", "outside diameter of the pipe at the main or inlet end"),
    term(
        "d2",
        "inside diameter at the second end: the outlet, the small end or the branch",
    ),
    term(
        "od2",
        "outside diameter at the second end: the outlet, the small end or the branch",
    ),
    term(
        "size",
        "pipe size preset of the main end (a key of the pipe-size tables, or custom)",
    ),
    term("size2", "pipe size preset of the second end"),
    term("wall", "pipe wall thickness"),
    term("r_bend", "centre-line radius of a bend"),
    term(
        "angle",
        "deflection angle of a bend or vane: the change of flow direction",
    ),
    term("cone_angle", "included angle of a conical reducer or expander"),
    term("plate_angle", "angle between a jet and a flat plate"),
    choice(
        "joint",
        "joint at the fitting, which sets the thrust area: the bore for welded, flanged or fused joints, the \
                outside diameter for push-on and mechanical joints (restrained or not)",
        &["push_on", "mechanical", "restrained", "flanged", "welded", "fused"],
    ),
    choice(
        "plane",
        "plane of a bend: horizontal, or vertical at a low point (sag) or a high point (crest)",
        &["horizontal", "vertical_sag", "vertical_crest"],
    ),
    choice(
        "legs",
        "legs of a vertical bend: both sloped, or one level",
        &["symmetric", "one_level"],
    ),
    choice(
        "flow_dir",
        "direction of flow along a straight fitting's axis",
        &["horizontal", "upward", "downward"],
    ),
    // Flow and pressure.
    choice(
        "flow_given",
        "how the flow is given: volume flow, mean velocity, mass flow, supply head or supply pressure",
        &["q", "v", "mdot", "head", "p"],
    ),
    term("q", "volume flow of the given stream"),
    term("v", "mean velocity of the given stream"),
    term("mdot", "mass flow of the given stream"),
    term(
        "p",
        "gauge pressure where the page says: the working pressure, or the pressure at the inlet",
    ),
    term(
        "head",
        "head: total head at a nozzle inlet, or the net head of a machine",
    ),
    choice(
        "p_known",
        "the port of a fitting whose gauge pressure is known (the others follow from the energy balance)",
        &[
            "inlet",
            "outlet",
            "atmosphere",
            "common",
            "b1",
            "b2",
            "b3",
            "b4",
            "b5",
            "b6",
        ],
    ),
    term("p2", "gauge pressure at a fitting's outlet, where it is the known one"),
    choice(
        "weights",
        "whether the weights of the fluid inside and of the fitting enter the momentum balance",
        &["included", "neglected"],
    ),
    choice(
        "profile_in",
        "velocity profile at a fitting's inlet, which sets its factors β and α",
        &["uniform", "laminar", "power_law", "typed", "carried"],
    ),
    choice(
        "profile_out",
        "velocity profile at a fitting's outlet, which sets its factors β and α",
        &["uniform", "laminar", "power_law", "typed", "carried"],
    ),
    choice(
        "profile_common",
        "velocity profile in a junction's common pipe, which sets its factors β and α",
        &["uniform", "laminar", "power_law", "typed", "carried"],
    ),
    term(
        "n_power_common",
        "exponent n of the power-law velocity profile in a junction's common pipe",
    ),
    term(
        "beta_common",
        "momentum-flux correction factor β in a junction's common pipe",
    ),
    term(
        "alpha_common",
        "kinetic-energy correction factor α in a junction's common pipe",
    ),
    term(
        "p_branch",
        "gauge pressure at the branch of a junction whose pressure is the known one",
    ),
    term(
        "n_power_in",
        "exponent n of the power-law velocity profile at a fitting's inlet",
    ),
    term(
        "n_power_out",
        "exponent n of the power-law velocity profile at a fitting's outlet",
    ),
    term("beta_in", "momentum-flux correction factor β at a fitting's inlet"),
    term("beta_out", "momentum-flux correction factor β at a fitting's outlet"),
    term("alpha_in", "kinetic-energy correction factor α at a fitting's inlet"),
    term("alpha_out", "kinetic-energy correction factor α at a fitting's outlet"),
    term("k", "loss coefficient K of a fitting"),
    choice(
        "k_ref",
        "the velocity a loss coefficient refers to",
        &["small", "inlet", "outlet", "common", "branch"],
    ),
    term("cd", "discharge coefficient C_d"),
    term("cc", "contraction coefficient C_c"),
    term("cv", "velocity coefficient C_v"),
    // Fluid.
    choice(
        "fluid",
        "the liquid: water from its temperature, or typed properties",
        &["water", "custom"],
    ),
    term("t", "temperature of the water"),
    term("rho", "density of the liquid"),
    term("mu", "dynamic viscosity of the liquid"),
    term("g_local", "local acceleration of gravity (empty: standard gravity)"),
    term("bulk_modulus", "bulk modulus of the liquid"),
    // Design pressure and surge.
    choice(
        "p_basis",
        "design pressure basis",
        &["highest", "operating", "test", "surge"],
    ),
    choice(
        "test_rule",
        "field test pressure rule",
        &["en805", "en805_surge", "c600", "c605", "nfpa24", "custom"],
    ),
    term("mdp", "maximum design pressure MDP (EN 805), surge included"),
    term("p_test", "typed field test pressure"),
    term("dv", "velocity change of a sudden stop (surge)"),
    term("dp_surge", "surge allowance above the working pressure"),
    choice(
        "wave_given",
        "whether the pressure-wave speed is computed from the pipe wall and liquid or typed",
        &["computed", "typed"],
    ),
    term(
        "wave_speed",
        "typed pressure-wave speed in the liquid-filled pipe (used when wave_given is typed)",
    ),
    term("length", "pipe length from a closing valve to the reflecting boundary"),
    term("closure_time", "effective closure time of a valve"),
    term("run_length", "length of a straight run between two elbows"),
    term(
        "z_test",
        "elevation of the point where the test and working pressures are given",
    ),
    choice(
        "surge_from",
        "where a line schedule's surge allowance comes from",
        &["typed", "computed"],
    ),
    term("z_fitting", "elevation of a fitting, on the same datum as z_test"),
    choice(
        "material",
        "pipe wall material (wave speed)",
        &["from_size", "steel", "ductile_iron", "pvc", "pe", "custom"],
    ),
    term("e_pipe", "Young's modulus of the pipe wall"),
    choice(
        "anchoring",
        "axial restraint of the pipe (wave speed)",
        &["joints", "anchored", "upstream"],
    ),
    // Restraint.
    choice(
        "fitting",
        "fitting to restrain",
        &["bend", "dead_end", "tee", "reducer", "force"],
    ),
    term("thrust", "thrust to restrain"),
    term("thrust_elev", "angle of a given thrust above horizontal"),
    choice(
        "soil",
        "soil class (allowable bearing and friction from the published tables), or a typed bearing",
        &[
            "custom",
            "organic",
            "soft_cohesive",
            "firm_cohesive",
            "stiff_cohesive",
            "loose_granular",
            "dense_granular",
            "rock",
        ],
    ),
    term("sigma", "allowable soil bearing"),
    term("sf", "safety factor"),
    choice(
        "block_dims",
        "how a bearing face is proportioned",
        &["height", "aspect"],
    ),
    term("block_h", "height of a bearing face"),
    term("block_aspect", "width ÷ height of a bearing face"),
    term("gamma_c", "unit weight of concrete"),
    choice("submerged", "whether a block is below groundwater", &["no", "yes"]),
    term("gravity_h", "height of a gravity block"),
    term("friction", "friction coefficient of a block on soil"),
    term("sf_slide", "safety factor against sliding"),
    term("rows", "the fittings of a line schedule, one per line"),
    // Restrained-joint length.
    term(
        "cover",
        "depth of cover from the ground surface to the top of a buried pipe",
    ),
    choice(
        "soil_class",
        "soil class of a restrained-joint trench (unit weight, friction angle, cohesion, pipe-wall ratios)",
        &[
            "custom",
            "clay_fine",
            "clay_coarse",
            "silt_fine",
            "silt_coarse",
            "cohesive_granular",
            "silty_sand",
            "clean_sand",
        ],
    ),
    term("gamma_s", "unit weight of the soil around a buried pipe"),
    term("phi", "internal friction angle of the soil"),
    term("cohesion", "cohesion of the soil"),
    term(
        "f_phi",
        "ratio of the pipe-wall friction angle to the soil's friction angle",
    ),
    term("f_c", "ratio of the pipe-wall adhesion to the soil's cohesion"),
    choice(
        "laying",
        "laying condition of a buried pipe (AWWA C150 types 1 to 5)",
        &["type1", "type2", "type3", "type4", "type5"],
    ),
    choice("encasement", "encasement of a buried pipe", &["none", "polyethylene"]),
    choice(
        "rl_method",
        "method of a restrained-joint length",
        &["longer", "ductile_iron", "pvc"],
    ),
    term(
        "run_restrained",
        "restrained length of a tee's run on each side, credited against the branch thrust",
    ),
    term("w_fitting", "weight of a fitting and the pipe it carries"),
    choice(
        "closure",
        "kind of closure at a dead end",
        &["cap", "blind_flange", "closed_valve"],
    ),
    choice(
        "loss",
        "loss model of a reducer",
        &["cone_formula", "borda", "k", "none"],
    ),
    term("d_gasket", "gasket reaction diameter G"),
    term("bolts", "number of bolts in a flange"),
    choice(
        "bolt_size",
        "thread size of a flange bolt (sets its tensile stress area), or custom",
        &[
            "unc_0500", "unc_0625", "unc_0750", "unc_0875", "unc_1000", "un8_1125", "un8_1250", "un8_1375", "un8_1500",
            "m12", "m16", "m20", "m24", "m27", "m30", "m36", "custom",
        ],
    ),
    term("bolt_area", "typed tensile stress area of one bolt"),
    choice(
        "bolt_grade",
        "material grade of a flange bolt (sets its allowable stress), or custom",
        &[
            "a193_b7", "a193_b7m", "a320_l7", "iso_5_6", "iso_8_8", "iso_10_9", "custom",
        ],
    ),
    term("bolt_stress", "typed allowable tensile stress of a bolt"),
    // Tee branches.
    choice(
        "junction",
        "direction of flow at a junction",
        &["dividing", "combining"],
    ),
    choice("branches", "number of branches", &["1", "2", "3", "4", "5", "6"]),
    term("b#_d", "inside diameter of branch #"),
    term("b#_od", "outside diameter of branch #"),
    term("b#_angle", "direction of branch # in plan"),
    term("b#_elev", "elevation angle of branch #"),
    term("b#_share", "share of the common flow in branch #"),
    term("b#_k", "loss coefficient K of branch #"),
    choice(
        "b#_profile",
        "velocity profile in branch # of a junction, which sets its factors β and α",
        &["uniform", "laminar", "power_law", "typed", "carried"],
    ),
    term(
        "b#_n_power",
        "exponent n of the power-law velocity profile in branch # of a junction",
    ),
    term("b#_beta", "momentum-flux correction factor β in branch # of a junction"),
    term(
        "b#_alpha",
        "kinetic-energy correction factor α in branch # of a junction",
    ),
    // Pipe runs meeting at an above-ground anchor.
    choice(
        "runs",
        "number of pipe runs meeting at an anchor",
        &["1", "2", "3", "4"],
    ),
    term(
        "r#_azimuth",
        "compass bearing of run # leaving the anchor, clockwise from north",
    ),
    term(
        "r#_slope",
        "slope of run # above the horizontal, going away from the anchor",
    ),
    term(
        "r#_size",
        "pipe size preset of run # (a key of the pipe-size tables, or custom)",
    ),
    term("r#_d", "inside diameter of run #"),
    term("r#_od", "outside diameter of run #"),
    term(
        "r#_p",
        "gauge pressure in run #, where it differs from the page's pressure",
    ),
    term("r#_q", "volume flow in run #, positive away from the anchor"),
    term(
        "r#_length",
        "length of run # from the anchor to what lies at its far end",
    ),
    choice(
        "r#_end",
        "what lies at the far end of run #",
        &["elbow", "bellows", "closed", "support"],
    ),
    term(
        "r#_a_eff",
        "effective area of the bellows or expansion joint at the far end of run #",
    ),
    term(
        "r#_f_spring",
        "axial spring force of the bellows at the far end of run #",
    ),
    choice(
        "r#_moves",
        "which way the far end of run # moves along it",
        &["away", "toward"],
    ),
    term(
        "r#_friction",
        "friction coefficient of the sliding support at the far end of run #",
    ),
    term("r#_w_pipe", "weight of the empty pipe of run # over its length"),
    // Jets, vanes and rotors.
    term("d_jet", "diameter of a free jet (nozzle outlet)"),
    term("d_nozzle", "outlet diameter of a nozzle"),
    choice("vane", "kind of vane", &["fixed", "single", "wheel"]),
    term("u", "blade speed"),
    term("w_ratio", "relative-velocity factor k = W₂/W₁ of a vane"),
    term(
        "d_pitch",
        "pitch diameter of an impulse wheel: the circle the jet's centre line touches",
    ),
    term("jets", "number of identical jets on an impulse wheel"),
    term("nozzles", "number of nozzles"),
    term("radius", "radius of a nozzle from the axis"),
    term("alpha", "nozzle angle to the tangent"),
    term("d_hub", "bore of a hub"),
    choice(
        "load",
        "load on a shaft",
        &["none", "constant", "linear", "quadratic", "speed"],
    ),
    term("t_load", "load torque"),
    term("speed_load", "speed at which a load torque applies"),
    term("speed_held", "speed a shaft is held at"),
    term(
        "t_bearing",
        "constant friction torque of a shaft's bearings and seals, besides its load",
    ),
    term(
        "t_viscous",
        "viscous friction torque of a shaft's bearings, growing in proportion to speed, at the speed \
                speed_viscous",
    ),
    term("speed_viscous", "speed at which a viscous friction torque applies"),
    term("speed", "rotational speed"),
    choice("machine", "kind of machine", &["turbine", "pump"]),
    choice("layout", "flow through the blades", &["radial", "axial"]),
    term("r1", "radius at the blade inlet"),
    term("r2", "radius at the blade outlet"),
    term("b1", "blade height at the inlet"),
    term("b2", "blade height at the outlet"),
    term("r_mean", "mean radius of an axial stage"),
    term("a1", "annulus area at the inlet"),
    term("a2", "annulus area at the outlet"),
    term("beta1", "blade angle at the inlet"),
    term("beta2", "blade angle at the outlet"),
    term("alpha1", "guide-vane (inlet flow) angle"),
    choice(
        "slip",
        "slip correlation of a pump impeller with finite blades",
        &["none", "wiesner", "stodola"],
    ),
    term("blades", "number of blades of an impeller"),
    choice(
        "suction",
        "whether a pump's suction pressure is read on a gauge (for the NPSH available)",
        &["none", "gauge"],
    ),
    term("p_suction", "gauge pressure read at a pump's suction"),
    term("p_atm", "absolute pressure of the local atmosphere"),
    term(
        "z_suction",
        "height of a pump's suction pressure reading above the impeller eye",
    ),
    term("d_suction", "bore where a pump's suction pressure is read"),
    term("p_vapour", "absolute vapour pressure of the liquid"),
    // Tanks and profiles.
    term("d_tank", "inside diameter of a tank"),
    term("d_orifice", "diameter of an orifice"),
    term("h_start", "starting liquid level"),
    term("h_end", "final liquid level"),
    choice(
        "vessel_shape",
        "shape of a vessel: vertical or horizontal cylinder, cone-bottomed cylinder, sphere, or a typed table",
        &["vertical", "horizontal", "cone_bottom", "sphere", "table"],
    ),
    term("l_vessel", "inside length of a horizontal cylindrical vessel"),
    term("h_cone", "height of a vessel's cone bottom"),
    term("h_vessel", "height of a vessel's top above its outlet"),
    term(
        "area_table",
        "a vessel's free-surface area against level, one row per level",
    ),
    choice(
        "outlet",
        "how a vessel lets liquid out: an orifice, a pipe to a lower point, or a pump",
        &["orifice", "pipe", "pump"],
    ),
    term("d_outlet", "bore of a vessel's outlet pipe"),
    term("l_pipe", "length of a vessel's outlet pipe"),
    term("roughness", "equivalent sand roughness of a pipe wall"),
    term(
        "k_outlet",
        "sum of the minor loss coefficients of a vessel's outlet pipe",
    ),
    term("z_outlet", "drop from a vessel's outlet to its outlet pipe's discharge"),
    term("q_out", "flow a pump takes from a vessel"),
    choice(
        "inflow",
        "inflow to a vessel: none, constant, or a typed table against time",
        &["none", "constant", "table"],
    ),
    term("q_in", "constant inflow to a vessel"),
    term("inflow_table", "inflow to a vessel against time, one row per time"),
    term("d_inlet", "bore of the pipe through which the inflow enters a vessel"),
    term("p_gas", "gauge pressure of the gas above the liquid in a vessel"),
    term("t_max", "longest time to simulate"),
    choice(
        "shape",
        "shape of a velocity profile",
        &["traverse", "power_law", "laminar"],
    ),
    term("points", "velocity traverse points"),
    term("m_wall", "exponent m of the power-law wall zone"),
    term("u_max", "centre-line velocity"),
    term("n_power", "exponent n of a power-law velocity profile"),
    // Page-level keys of the calculation sheet and the case comparison: kept in the
    // link, never calculator inputs (see SHEET_KEYS).
    term("project", "calculation sheet: project name"),
    term(
        "tag",
        "calculation sheet: location or equipment tag the calculation is for",
    ),
    term("calc_no", "calculation sheet: calculation number"),
    term("rev", "calculation sheet: revision of the calculation"),
    term("prepared_by", "calculation sheet: who prepared the calculation"),
    term("checked_by", "calculation sheet: who checked the calculation"),
    term("date", "calculation sheet: date of the calculation, as typed"),
    term(
        "pin#",
        "a pinned case shown beside the current one: that case's query, URL-encoded (pin1 to pin4)",
    ),
];

/// The page-level keys of the calculation sheet with their labels, in the order the
/// sheet shows them: text kept in the link as typed, read by no calculator.
pub const SHEET_KEYS: &[(&str, &str)] = &[
    ("project", "Project"),
    ("tag", "Location / tag"),
    ("calc_no", "Calculation no."),
    ("rev", "Revision"),
    ("prepared_by", "Prepared by"),
    ("checked_by", "Checked by"),
    ("date", "Date"),
];

/// How many cases can be pinned beside the current one (`pin1` … `pin4`).
pub const MAX_PINS: usize = 4;

/// The glossary term of a query key (`b3_d` finds `b#_d`).
pub fn term_of(key: &str) -> Option<&'static Term> {
    TERMS.iter().find(|t| key_matches(t.key, key))
}

/// Whether `key` is `pattern` with `#` standing for one digit 1–9.
fn key_matches(pattern: &str, key: &str) -> bool {
    match pattern.split_once('#') {
        None => pattern == key,
        Some((head, tail)) => {
            key.len() == pattern.len()
                && key.starts_with(head)
                && key.ends_with(tail)
                && key[head.len()..head.len() + 1]
                    .chars()
                    .all(|c| ('1'..='9').contains(&c))
        }
    }
}

/// A retired query key of a page and the key that replaced it. Option values of the
/// old key may have been renamed as well.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct KeyAlias {
    /// The page (calculator key) whose links used the old key.
    pub page: &'static str,
    pub old: &'static str,
    pub new: &'static str,
    /// Renamed option values: `(old value, new value)`.
    pub values: &'static [(&'static str, &'static str)],
}

/// A renamed option value of a key that itself kept its name.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ValueAlias {
    pub page: &'static str,
    pub key: &'static str,
    pub old: &'static str,
    pub new: &'static str,
}

const fn alias(page: &'static str, old: &'static str, new: &'static str) -> KeyAlias {
    KeyAlias {
        page,
        old,
        new,
        values: &[],
    }
}

const BASIS_TO_JOINT: &[(&str, &str)] = &[("id", "flanged"), ("od", "push_on")];
const ORIENTATION_TO_FLOW_DIR: &[(&str, &str)] = &[("vertical_up", "upward"), ("vertical_down", "downward")];
const DRIVE_TO_FLOW_GIVEN: &[(&str, &str)] = &[("flow", "q"), ("pressure", "p")];

/// Every retired key, per page. Tee branch keys are listed per branch.
pub const KEY_ALIASES: &[KeyAlias] = &[
    alias("bend", "d_in", "d"),
    alias("bend", "d_out", "d2"),
    alias("bend", "d_od", "od"),
    alias("bend", "d_out_od", "od2"),
    KeyAlias {
        page: "bend",
        old: "basis",
        new: "joint",
        values: BASIS_TO_JOINT,
    },
    alias("bend", "flow_basis", "flow_given"),
    alias("reducer", "d_in", "d"),
    alias("reducer", "d_out", "d2"),
    alias("reducer", "d_in_od", "od"),
    alias("reducer", "d_out_od", "od2"),
    KeyAlias {
        page: "reducer",
        old: "basis",
        new: "joint",
        values: BASIS_TO_JOINT,
    },
    KeyAlias {
        page: "reducer",
        old: "orientation",
        new: "flow_dir",
        values: ORIENTATION_TO_FLOW_DIR,
    },
    alias("reducer", "angle", "cone_angle"),
    alias("reducer", "flow_basis", "flow_given"),
    alias("dead-end", "d_od", "od"),
    KeyAlias {
        page: "dead-end",
        old: "basis",
        new: "joint",
        values: BASIS_TO_JOINT,
    },
    alias("tee", "mode", "junction"),
    alias("tee", "n", "branches"),
    alias("tee", "d_od", "od"),
    KeyAlias {
        page: "tee",
        old: "basis",
        new: "joint",
        values: BASIS_TO_JOINT,
    },
    alias("tee", "flow_basis", "flow_given"),
    alias("tee", "d1", "b1_d"),
    alias("tee", "d2", "b2_d"),
    alias("tee", "d3", "b3_d"),
    alias("tee", "d4", "b4_d"),
    alias("tee", "d5", "b5_d"),
    alias("tee", "d6", "b6_d"),
    alias("tee", "od1", "b1_od"),
    alias("tee", "od2", "b2_od"),
    alias("tee", "od3", "b3_od"),
    alias("tee", "od4", "b4_od"),
    alias("tee", "od5", "b5_od"),
    alias("tee", "od6", "b6_od"),
    alias("tee", "angle1", "b1_angle"),
    alias("tee", "angle2", "b2_angle"),
    alias("tee", "angle3", "b3_angle"),
    alias("tee", "angle4", "b4_angle"),
    alias("tee", "angle5", "b5_angle"),
    alias("tee", "angle6", "b6_angle"),
    alias("tee", "elev1", "b1_elev"),
    alias("tee", "elev2", "b2_elev"),
    alias("tee", "elev3", "b3_elev"),
    alias("tee", "elev4", "b4_elev"),
    alias("tee", "elev5", "b5_elev"),
    alias("tee", "elev6", "b6_elev"),
    alias("tee", "share1", "b1_share"),
    alias("tee", "share2", "b2_share"),
    alias("tee", "share3", "b3_share"),
    alias("tee", "share4", "b4_share"),
    alias("tee", "share5", "b5_share"),
    alias("tee", "share6", "b6_share"),
    alias("tee", "k1", "b1_k"),
    alias("tee", "k2", "b2_k"),
    alias("tee", "k3", "b3_k"),
    alias("tee", "k4", "b4_k"),
    alias("tee", "k5", "b5_k"),
    alias("tee", "k6", "b6_k"),
    alias("nozzle", "d_pipe", "d"),
    alias("nozzle", "given", "flow_given"),
    alias("thrust-block", "p_work", "p"),
    alias("thrust-block", "k_fluid", "bulk_modulus"),
    alias("line-schedule", "p_work", "p"),
    alias("jet-plate", "angle", "plate_angle"),
    alias("jet-plate", "jet_basis", "flow_given"),
    alias("jet-plate", "v_jet", "v"),
    alias("jet-plate", "q_jet", "q"),
    alias("jet-plate", "p_supply", "p"),
    alias("jet-plate", "h_supply", "head"),
    alias("vane", "mode", "vane"),
    alias("vane", "k", "w_ratio"),
    alias("vane", "jet_basis", "flow_given"),
    alias("vane", "v_jet", "v"),
    alias("vane", "q_jet", "q"),
    alias("vane", "p_supply", "p"),
    alias("vane", "h_supply", "head"),
    KeyAlias {
        page: "reaction-arm",
        old: "drive",
        new: "flow_given",
        values: DRIVE_TO_FLOW_GIVEN,
    },
    alias("reaction-arm", "n_load", "speed_load"),
    alias("reaction-arm", "n_held", "speed_held"),
    alias("runner", "n", "speed"),
    alias("profile", "n", "n_power"),
];

const fn soil_alias(page: &'static str, old: &'static str, new: &'static str) -> ValueAlias {
    ValueAlias {
        page,
        key: "soil",
        old,
        new,
    }
}

/// Every renamed option value of a key that kept its name.
///
/// Soil: the presets named after one table's rows (`nfpa24_sand`) became neutral
/// classes (`restraint::soil::SOILS`). Each retired preset reads as the class named
/// for the same kind of soil; where that class's value is higher than the old
/// preset's, as the next softer class, so an old link never sizes a smaller block
/// (a soil test checks it). Sand of unstated density and sandy silt are loose
/// granular (2000 psf against their 3000–4000 psf); sandy, hard and very stiff clays
/// are stiff cohesive (150 kPa); medium dense sand (100 kPa) is loose granular
/// (95.8 kPa), since dense granular's 143.6 kPa would be higher; compact sand and
/// every gravel are dense granular; muck and peat are organic (no bearing).
pub const VALUE_ALIASES: &[ValueAlias] = &[
    ValueAlias {
        page: "bend",
        key: "plane",
        old: "vertical_up",
        new: "vertical_sag",
    },
    ValueAlias {
        page: "bend",
        key: "plane",
        old: "vertical_down",
        new: "vertical_crest",
    },
    // The loss choice named after a maker's handbook now names its method.
    ValueAlias {
        page: "reducer",
        key: "loss",
        old: "crane",
        new: "cone_formula",
    },
    soil_alias("thrust-block", "safe_muck", "organic"),
    soil_alias("thrust-block", "safe_soft_clay", "soft_cohesive"),
    soil_alias("thrust-block", "safe_sand", "loose_granular"),
    soil_alias("thrust-block", "safe_sand_gravel", "dense_granular"),
    soil_alias("thrust-block", "safe_sand_gravel_clay", "dense_granular"),
    soil_alias("thrust-block", "safe_hard_shale", "rock"),
    soil_alias("thrust-block", "nfpa24_soft_clay", "soft_cohesive"),
    soil_alias("thrust-block", "nfpa24_silt", "firm_cohesive"),
    soil_alias("thrust-block", "nfpa24_sandy_silt", "loose_granular"),
    soil_alias("thrust-block", "nfpa24_sand", "loose_granular"),
    soil_alias("thrust-block", "nfpa24_sandy_clay", "stiff_cohesive"),
    soil_alias("thrust-block", "nfpa24_hard_clay", "stiff_cohesive"),
    soil_alias("thrust-block", "bs8004_firm_clay", "firm_cohesive"),
    soil_alias("thrust-block", "bs8004_stiff_clay", "stiff_cohesive"),
    soil_alias("thrust-block", "bs8004_hard_clay", "stiff_cohesive"),
    soil_alias("thrust-block", "bs8004_medium_sand", "loose_granular"),
    soil_alias("thrust-block", "bs8004_compact_sand", "dense_granular"),
    soil_alias("thrust-block", "bs8004_medium_gravel", "dense_granular"),
    soil_alias("thrust-block", "bs8004_dense_gravel", "dense_granular"),
    soil_alias("line-schedule", "safe_muck", "organic"),
    soil_alias("line-schedule", "safe_soft_clay", "soft_cohesive"),
    soil_alias("line-schedule", "safe_sand", "loose_granular"),
    soil_alias("line-schedule", "safe_sand_gravel", "dense_granular"),
    soil_alias("line-schedule", "safe_sand_gravel_clay", "dense_granular"),
    soil_alias("line-schedule", "safe_hard_shale", "rock"),
    soil_alias("line-schedule", "nfpa24_soft_clay", "soft_cohesive"),
    soil_alias("line-schedule", "nfpa24_silt", "firm_cohesive"),
    soil_alias("line-schedule", "nfpa24_sandy_silt", "loose_granular"),
    soil_alias("line-schedule", "nfpa24_sand", "loose_granular"),
    soil_alias("line-schedule", "nfpa24_sandy_clay", "stiff_cohesive"),
    soil_alias("line-schedule", "nfpa24_hard_clay", "stiff_cohesive"),
    soil_alias("line-schedule", "bs8004_firm_clay", "firm_cohesive"),
    soil_alias("line-schedule", "bs8004_stiff_clay", "stiff_cohesive"),
    soil_alias("line-schedule", "bs8004_hard_clay", "stiff_cohesive"),
    soil_alias("line-schedule", "bs8004_medium_sand", "loose_granular"),
    soil_alias("line-schedule", "bs8004_compact_sand", "dense_granular"),
    soil_alias("line-schedule", "bs8004_medium_gravel", "dense_granular"),
    soil_alias("line-schedule", "bs8004_dense_gravel", "dense_granular"),
];

/// A choice an old link implies: before the choice existed, giving `given` (not
/// empty) meant `key = value`. Read when the link gives `given` but not `key`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ImpliedChoice {
    pub page: &'static str,
    pub given: &'static str,
    pub key: &'static str,
    pub value: &'static str,
}

/// Every implied choice, per page.
pub const IMPLIED_CHOICES: &[ImpliedChoice] = &[ImpliedChoice {
    page: "surge",
    given: "wave_speed",
    key: "wave_given",
    value: "typed",
}];

/// What reading an old link translated: `"basis=od → joint=push_on"`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Translation {
    pub old_key: String,
    pub old_value: String,
    pub new_key: &'static str,
    pub new_value: String,
}

impl std::fmt::Display for Translation {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "{}={} → {}={}",
            self.old_key, self.old_value, self.new_key, self.new_value
        )
    }
}

/// A link's pairs in today's vocabulary, and what was translated.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Upgraded {
    pub pairs: Vec<(String, String)>,
    pub translations: Vec<Translation>,
}

/// Reads the `(key, value)` pairs of a link to `page` in today's vocabulary. A
/// retired key is renamed (and its renamed values translated) unless the link also
/// gives the new key, which wins; pairs in today's vocabulary pass unchanged, in
/// their order.
pub fn upgrade(page: &str, pairs: &[(String, String)]) -> Upgraded {
    let mut out = Upgraded::default();
    for (key, value) in pairs {
        let value_alias = VALUE_ALIASES
            .iter()
            .find(|a| a.page == page && a.key == key && a.old == value);
        if let Some(a) = value_alias {
            out.translations.push(Translation {
                old_key: key.clone(),
                old_value: value.clone(),
                new_key: a.key,
                new_value: a.new.to_string(),
            });
            out.pairs.push((key.clone(), a.new.to_string()));
            continue;
        }
        let Some(a) = KEY_ALIASES.iter().find(|a| a.page == page && a.old == key) else {
            out.pairs.push((key.clone(), value.clone()));
            continue;
        };
        if pairs.iter().any(|(k, _)| k == a.new) {
            // The link carries both: today's key wins and the old one is dropped.
            continue;
        }
        let new_value = a
            .values
            .iter()
            .find(|(old, _)| old == value)
            .map(|(_, new)| new.to_string())
            .unwrap_or_else(|| value.clone());
        out.translations.push(Translation {
            old_key: key.clone(),
            old_value: value.clone(),
            new_key: a.new,
            new_value: new_value.clone(),
        });
        out.pairs.push((a.new.to_string(), new_value));
    }
    for implied in IMPLIED_CHOICES.iter().filter(|i| i.page == page) {
        let given = pairs.iter().find(|(k, v)| k == implied.given && !v.trim().is_empty());
        if let Some((key, value)) = given {
            if !pairs.iter().any(|(k, _)| k == implied.key) {
                out.translations.push(Translation {
                    old_key: key.clone(),
                    old_value: value.clone(),
                    new_key: implied.key,
                    new_value: implied.value.to_string(),
                });
                out.pairs.push((implied.key.to_string(), implied.value.to_string()));
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn pairs(list: &[(&str, &str)]) -> Vec<(String, String)> {
        list.iter().map(|(k, v)| (k.to_string(), v.to_string())).collect()
    }

    #[test]
    fn sheet_and_pin_keys_are_terms_used_by_no_calculator() {
        let pins = (1..=MAX_PINS).map(|i| format!("pin{i}"));
        for key in SHEET_KEYS.iter().map(|(k, _)| k.to_string()).chain(pins) {
            assert!(term_of(&key).is_some(), "{key} is not a term");
            for spec in crate::calculators::catalog() {
                assert!(
                    spec.fields.iter().all(|f| f.key != key),
                    "{} uses the page-level key {key}",
                    spec.key
                );
            }
        }
        assert!(
            term_of("pin5").is_some_and(|t| t.key == "pin#"),
            "pin# matches one digit"
        );
    }

    #[test]
    fn every_key_is_one_term_and_every_alias_lands_on_a_term() {
        for (i, t) in TERMS.iter().enumerate() {
            assert!(
                TERMS[..i].iter().all(|u| u.key != t.key),
                "the glossary lists '{}' twice",
                t.key
            );
        }
        for a in KEY_ALIASES {
            assert!(term_of(a.new).is_some(), "alias {} → {} lands on no term", a.old, a.new);
            assert_ne!(a.old, a.new);
            for (_, new) in a.values {
                let options = term_of(a.new).map(|t| t.options).unwrap_or(&[]);
                assert!(
                    options.contains(new),
                    "alias value {new} is not an option of '{}'",
                    a.new
                );
            }
        }
        for a in VALUE_ALIASES {
            let options = term_of(a.key).map(|t| t.options).unwrap_or(&[]);
            assert!(options.contains(&a.new), "{} is not an option of '{}'", a.new, a.key);
        }
    }

    #[test]
    fn branch_keys_match_their_pattern_only() {
        assert_eq!(term_of("b3_d").map(|t| t.key), Some("b#_d"));
        assert_eq!(term_of("b0_d"), None);
        assert_eq!(term_of("b10_d"), None);
        assert_eq!(term_of("bx_d"), None);
        assert_eq!(term_of("d").map(|t| t.key), Some("d"));
    }

    #[test]
    fn old_links_are_translated_and_report_what_changed() {
        let up = upgrade(
            "bend",
            &pairs(&[
                ("angle", "45deg"),
                ("d_in", "300mm"),
                ("basis", "od"),
                ("plane", "vertical_up"),
            ]),
        );
        assert_eq!(
            up.pairs,
            pairs(&[
                ("angle", "45deg"),
                ("d", "300mm"),
                ("joint", "push_on"),
                ("plane", "vertical_sag")
            ])
        );
        let notes: Vec<String> = up.translations.iter().map(|t| t.to_string()).collect();
        assert_eq!(
            notes,
            [
                "d_in=300mm → d=300mm",
                "basis=od → joint=push_on",
                "plane=vertical_up → plane=vertical_sag"
            ]
        );
    }

    #[test]
    fn a_new_key_in_the_same_link_wins_over_its_old_key() {
        let up = upgrade("bend", &pairs(&[("d_in", "300mm"), ("d", "250mm")]));
        assert_eq!(up.pairs, pairs(&[("d", "250mm")]));
        assert!(up.translations.is_empty());
    }

    #[test]
    fn aliases_belong_to_their_page() {
        // `d2` is a tee branch's old key but today's second-end diameter elsewhere.
        let tee = upgrade("tee", &pairs(&[("d2", "200mm")]));
        assert_eq!(tee.pairs, pairs(&[("b2_d", "200mm")]));
        let block = upgrade("thrust-block", &pairs(&[("d2", "200mm")]));
        assert_eq!(block.pairs, pairs(&[("d2", "200mm")]));
        assert!(block.translations.is_empty());
    }
}
