//! Line schedule: the thrust and the block of every fitting along a line, from a
//! list typed or pasted one fitting per row.
//!
//! # Method
//! Each row is one fitting. Its design pressure is the row's own (`p=`) or the
//! page's basis applied to the working pressure (the page's or the row's `pw=`):
//! operating, field test by a named rule (see [`crate::restraint::pressure::TEST_RULES`]),
//! working plus a typed surge allowance, or the highest of these. The thrust comes
//! from the engine's static balance of the fitting at that pressure with no flow
//! ([`crate::restraint::static_balance`]), on the outside diameter for push-on and
//! mechanical joints, restrained or not (they seal on the spigot), and on the bore
//! only for welded, flanged or fused joints. A horizontal or sag fitting
//! gets a bearing block, area SF·T/σ; a crest (thrust upward) gets a gravity block,
//! volume SF·T_up/γ_concrete (above groundwater). The thrust-restraint page does
//! the same for one fitting with every option shown (and checks sliding, which
//! this list does not); this page is its list form. The sum of the rows' thrusts
//! is checked against the sum of each row's closed form (2pA·sin(θ/2), pA,
//! pA_branch, p(A₁ − A₂), or the typed force) with [`Report::check`]. EN 805 rows
//! use MDP = working + 200 kPa (see [`crate::restraint::pressure::TEST_RULES`]).
//!
//! **Surge per row** (`surge_from=computed`): instead of one typed allowance, each
//! row's own pipe gives it, by the surge page's method ([`crate::calculators::surge`]):
//! the wave speed a = √((K/ρ)/(1 + c₁·K·D/(E·e))) from the row's bore D, its wall
//! e = (OD − ID)/2 and its material (the size preset's family, or the page's
//! `material`), then the Joukowsky rise ρ·a·ΔV (ΔV the page's `dv` or the row's
//! `dv=`), or with `length` and `closure_time` given and t_c > 2L/a the smaller
//! slow-closure estimate 2ρLΔV/t_c (Wylie & Streeter; Chaudhry; forms from memory).
//!
//! **Elevation**: the page's pressures are those at the test point, at `z_test`; a
//! row with `z=` is sized at the basis pressure plus ρ·g·(z_test − z)
//! ([`crate::restraint::pressure::elevation_head`]; water at 15 °C, standard
//! gravity), checked against the engine's still-line energy balance
//! ([`crate::restraint::pressure::hydrostatic_by_energy_balance`]). A row's own `p=`
//! is the pressure at that fitting and takes no `z=`; rows without `z=` are sized at
//! the test point's pressure and listed in a warning when `z_test` is given.
//!
//! # Row format (ours; one fitting per line, `#` starts a comment)
//! ```text
//! KIND [TOKEN ...]
//! ```
//! - KIND: the restraint module's fitting keys, `bend` (also `elbow`), `tee`,
//!   `dead_end` (also `cap`, `plug`, `valve`, `dead-end`), `reducer`, `force`.
//! - A bare angle (`45deg`) is a bend's deflection; a bare pressure (`150psi`) is
//!   the row's design pressure; a bare size preset key (`di52_12`) is the main size,
//!   a second one the tee branch or reducer small end; a bare soil class key
//!   (`dense_granular`) is the soil.
//! - `key=value` tokens: `angle=`, `size=`, `d=` (inside), `od=` (outside),
//!   `size2=`, `d2=`, `od2=`, `p=` (design pressure), `pw=` (working pressure at
//!   this fitting, the page basis applies), `soil=`, `sigma=` (typed bearing),
//!   `joint=` (`push_on`, `mechanical`, `restrained`, `flanged`, `welded`), `h=` (face height),
//!   `turn=` (`left`, `right` in plan; `down` a crest: thrust up, gravity block;
//!   `up` a sag: thrust down), `legs=` (a vertical bend's legs: `symmetric`, both
//!   sloped by θ/2, uplift 2pA·sin(θ/2), the default; `one_level`, uplift pA·sin θ),
//!   `thrust=` (force rows, 1 N to 1 GN), `tag=` (a label, no spaces), `z=` (the
//!   fitting's elevation, −1000 m to 10 000 m), `dv=` (the velocity stopped in this
//!   row's pipe, computed surge).
//! - Quantities carry their unit (`12in`, `0.9m`, `10bar`); a bare number is refused.
//!
//! Example: `bend 45deg di52_12 dense_granular tag=B1` or
//! `tee size=sch40_12 size2=sch40_6 joint=welded p=16bar`.
//!
//! # Code
//! [`rows`] parses the row language, [`model::read`] reads the page once into typed
//! inputs, [`model::solve`] solves each row with [`crate::restraint`] (the same
//! functions as the thrust-restraint page), [`report::write`] shows the result.
//!
//! Errors name the row and the token. The whole list is one text field, so it lives
//! in the page's URL and survives a reload.

use crate::catalog::{CalculatorSpec, FieldSpec, Limits, OutputSpec, Report, Values};
use crate::error::FieldError;
use crate::units::QuantityKind as Q;

use super::common::wall::ShownWhen;
use super::common::{self, choice, quantity, MAX_PRESSURE_PA};
use super::thrust_block::{MAX_ELEVATION_M, MIN_ELEVATION_M};
use crate::catalog::ChoiceOption;
use crate::restraint::pressure::{BASIS_OPTIONS, TEST_RULE_OPTIONS};
use crate::restraint::soil::SOIL_OPTIONS;
use crate::restraint::Joint;
use crate::restraint::JOINT_HELP;

pub mod model;
pub mod report;
pub mod rows;

pub use rows::{parse, Row, RowKind, Turn};

pub const KEY: &str = "line-schedule";
/// The page title.
pub const TITLE: &str = "Thrust blocks for every fitting along a line";

/// The most rows a schedule may have.
pub const MAX_ROWS: usize = 2000;

/// Largest thrust a force row accepts, N (1 GN).
pub const MAX_ROW_THRUST: f64 = 1e9;
/// Range of a typed allowable soil bearing, Pa (1 kPa to 20 MPa, sound rock).
pub const MIN_BEARING: f64 = 1e3;
pub const MAX_BEARING: f64 = 20e6;

const DEMO_ROWS: &str = "# Harrow Creek Works fire-water ring main (invented demo)\n\
bend 90deg di52_12 dense_granular tag=B1\n\
bend 45deg di52_12 dense_granular tag=B2 turn=right\n\
tee di52_12 di52_8 dense_granular tag=T1\n\
reducer di52_12 di52_8 tag=R1\n\
bend 22.5deg di52_8 turn=down tag=V1\n\
dead_end di52_8 tag=H1 h=0.9m";

const SURGE_FROM_OPTIONS: &[ChoiceOption] = &[
    ChoiceOption {
        key: "typed",
        label: "One typed allowance for every row",
    },
    ChoiceOption {
        key: "computed",
        label: "Computed for each row's pipe (wave speed from its bore, wall and material)",
    },
];
const SURGE_FROM_HELP: &str = "Typed: one allowance above the working pressure for the whole line. Computed: each \
    row's Joukowsky rise ρ·a·ΔV with the wave speed of its own pipe, or the slow-closure estimate when a closure \
    time slower than 2L/a is given, as on the surge page.";
const Z_TEST_HELP: &str = "Where the page's pressures apply (the gauge of the field test), on any datum, from \
    −1000 m to 10 000 m. A row with z= is sized at the pressure here plus ρ·g·(z_test − z): more below the test \
    point, less above.";
const DV_HELP: &str = "The flow velocity stopped by a fast closure, for rows without dv=.";
const MATERIAL_HELP: &str = "Sets Young's modulus E and Poisson's ratio ν of each row's wall; by default the \
    material of the row's size preset. The wall is half the difference of the row's diameters.";

/// The fields of a surge computed per row: the velocity stopped, the wall
/// material, the axial restraint, the bulk modulus, and the closure.
fn computed_surge_fields() -> Vec<FieldSpec> {
    let computed: ShownWhen = Some(("surge_from", &["computed"]));
    let mut fields = vec![FieldSpec {
        visible_when: computed,
        optional: true,
        ..quantity(
            "dv",
            "Velocity stopped (rows without dv=)",
            Q::Velocity,
            "m/s",
            "ft/s",
            "",
            Limits::closed(0.0, 50.0),
            DV_HELP,
        )
    }];
    fields.extend(
        common::wave_speed_fields(computed, computed, MATERIAL_HELP)
            .into_iter()
            .filter(|f| f.key != "wall"),
    );
    fields.extend([
        FieldSpec {
            visible_when: computed,
            optional: true,
            ..quantity(
                "length",
                "Pipe length to the reflecting boundary L",
                Q::Length,
                "m",
                "ft",
                "",
                Limits::closed(1.0, 1e4),
                "With the closure time: a closure slower than 2L/a takes the slow-closure estimate. Empty: \
                    the instantaneous Joukowsky rise.",
            )
        },
        FieldSpec {
            visible_when: computed,
            optional: true,
            ..quantity(
                "closure_time",
                "Valve closure time t_c",
                Q::Time,
                "s",
                "s",
                "",
                Limits::closed(1e-3, 1e5),
                "Effective closure time; given with the length.",
            )
        },
    ]);
    fields
}

pub fn spec() -> CalculatorSpec {
    let mut fields = vec![
        common::text_field(
            "rows",
            "Fittings along the line",
            DEMO_ROWS,
            "One fitting per line: KIND then tokens, e.g. 'bend 45deg di52_12 dense_granular tag=B1'. Kinds: \
                    bend, tee, dead_end, reducer, force. See the method note for every token.",
        ),
        choice(
            "p_basis",
            "Design pressure basis (rows without p=)",
            BASIS_OPTIONS,
            "highest",
            "Applied to the working pressure of each row that does not give its own design pressure.",
        ),
        quantity(
            "p",
            "Working pressure, gauge (rows without pw=)",
            Q::Pressure,
            "bar",
            "psi",
            "150 psi",
            Limits::closed(0.0, MAX_PRESSURE_PA),
            "The working pressure along the line; a row may give its own with pw=.",
        ),
        FieldSpec {
            visible_when: Some(("p_basis", &["test", "highest"])),
            ..choice(
                "test_rule",
                "Field test pressure rule",
                TEST_RULE_OPTIONS,
                "nfpa24",
                "Named rules of published standards, or a typed test pressure.",
            )
        },
        common::typed_test_pressure_field(),
        FieldSpec {
            optional: true,
            ..choice(
                "surge_from",
                "Surge allowance",
                SURGE_FROM_OPTIONS,
                "typed",
                SURGE_FROM_HELP,
            )
        },
        FieldSpec {
            visible_when: Some(("surge_from", &["typed"])),
            optional: true,
            ..quantity(
                "dp_surge",
                "Surge allowance above working",
                Q::Pressure,
                "bar",
                "psi",
                "",
                Limits::closed(0.0, MAX_PRESSURE_PA),
                "From a transient analysis or the thrust-restraint page's Joukowsky estimate. Empty: no surge.",
            )
        },
    ];
    fields.extend(computed_surge_fields());
    fields.extend([
        FieldSpec {
            optional: true,
            ..quantity(
                "z_test",
                "Elevation of the test point (rows with z=)",
                Q::Length,
                "m",
                "ft",
                "",
                Limits::closed(MIN_ELEVATION_M, MAX_ELEVATION_M),
                Z_TEST_HELP,
            )
        },
        choice(
            "soil",
            "Soil (rows without soil=)",
            SOIL_OPTIONS,
            "dense_granular",
            "Each class takes the lowest value of the published tables' rows for it; they disagree by up to \
                about 4× (see the thrust-restraint page's comparison). A typed value always wins.",
        ),
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
                Limits::closed(MIN_BEARING, MAX_BEARING),
                "Used when the soil is 'typed value'; from 1 kPa to 20 MPa.",
            )
        },
        choice(
            "joint",
            "Joints (rows without joint=)",
            Joint::OPTIONS,
            "push_on",
            JOINT_HELP,
        ),
        quantity(
            "sf",
            "Safety factor",
            Q::Ratio,
            "-",
            "-",
            "1.5",
            Limits::closed(1.0, 10.0),
            "Bearing area = SF·T/σ; gravity block weight = SF·T_up.",
        ),
        quantity(
            "block_h",
            "Bearing face height (rows without h=)",
            Q::Length,
            "m",
            "ft",
            "0.6 m",
            Limits::closed(0.05, 20.0),
            "Face width = area ÷ height.",
        ),
        quantity(
            "gamma_c",
            "Unit weight of concrete (gravity blocks)",
            Q::SpecificWeight,
            "kN/m3",
            "lbf/ft3",
            "23.6 kN/m3",
            Limits::closed(10e3, 40e3),
            "Blocks are taken above groundwater here; use the thrust-restraint page for buoyancy.",
        ),
    ]);
    fields.extend(super::restrained_length::schedule::fields());
    CalculatorSpec {
        key: KEY,
        title: TITLE,
        group: crate::catalog::group::FITTINGS,
        summary:
            "Paste the fittings of a line, one per row, and get each thrust, its direction and the block it needs, \
                with totals and a CSV.",
        fields,
        outputs: vec![
            OutputSpec::headline("max_thrust", "Largest thrust", Q::Force),
            OutputSpec::headline("total_area", "Total bearing area", Q::Area),
            OutputSpec::headline("total_volume", "Total gravity-block concrete", Q::Volume),
            OutputSpec::listed("row_count", "Fittings", Q::Ratio),
            OutputSpec::listed("total_thrust", "Sum of thrust magnitudes (block loads)", Q::Force),
            OutputSpec::listed(
                "p_design",
                "Design pressure of rows without their own (at the test point; typed or no surge)",
                Q::Pressure,
            ),
        ],
        cautions: vec![
            "Rows without z= are sized at the pressure of the test point: give each fitting's elevation, or \
                    check that the test and surge pressures at each fitting are covered.",
            "Soil values need a geotechnical basis at each block; one soil for the whole line is a \
                    simplification.",
            "Blocks near each other, near other services or in fill need individual design.",
        ],
    }
}

/// The registered entry point: read the values once, solve every row, report.
pub fn compute(values: &Values, report: &mut Report<'_>) -> Result<(), Vec<FieldError>> {
    super::read_solve_write(values, report, model::read, model::solve, |i, s, r| {
        report::write(i, s, r)
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalog::{demo_inputs, Request};
    use approx::assert_relative_eq;
    use std::f64::consts::PI;

    fn request(rows: &str, pairs: &[(&str, &str)]) -> Request {
        let mut request = Request::default();
        for (k, v) in demo_inputs(&spec()) {
            request.inputs.insert(k, v);
        }
        request.inputs.insert("rows".into(), rows.into());
        for (k, v) in pairs {
            request.inputs.insert(k.to_string(), v.to_string());
        }
        request
    }

    fn errors(rows: &str) -> Vec<String> {
        match crate::solve(KEY, &request(rows, &[])).result {
            Err(crate::SolveError::Fields(e)) => e.iter().map(|e| format!("{}: {}", e.field, e.kind)).collect(),
            other => panic!("expected errors, got {other:?}"),
        }
    }

    #[test]
    fn demo_solves() {
        let s = crate::solve(KEY, &request(DEMO_ROWS, &[]))
            .result
            .map_err(|e| e.to_string());
        let s = s.unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.output("row_count").map(|o| o.si), Some(6.0));
        assert_eq!(s.tables[0].rows.len(), 7);
    }

    #[test]
    fn reducers_with_ends_nearly_alike_sum_to_their_closed_forms() {
        // Derived from the definition: each row's T = p(A₁ − A₂). Ends 0.1 nm apart
        // leave 7e-10 of the end forces, which the engine sums with their rounding:
        // the check of the sum must not report that as a disagreement.
        let row = "reducer d=300mm od=320mm d2=299.9999999mm od2=319.9999999mm joint=flanged p=10bar";
        for rows in [row.to_string(), format!("{row}\n{row}\n{row}")] {
            let s = crate::solve(KEY, &request(&rows, &[]))
                .result
                .unwrap_or_else(|e| panic!("{e}"));
            let count = s.output("row_count").map(|o| o.si).unwrap_or(0.0);
            let (d1, d2) = (0.3_f64, 0.2999999999_f64);
            let each = 1e6 * std::f64::consts::PI / 4.0 * (d1 * d1 - d2 * d2);
            assert_relative_eq!(
                s.output("total_thrust").map(|o| o.si).unwrap_or(0.0),
                count * each,
                max_relative = 1e-5
            );
            assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        }
    }

    #[test]
    fn the_method_note_examples_parse() {
        let examples = "bend 45deg di52_12 dense_granular tag=B1\n\
            tee size=sch40_12 size2=sch40_6 joint=welded p=16bar\n\
            reducer c900dr18_12 c900dr18_8\n\
            bend 22.5deg di52_8 turn=down\n\
            dead_end d=200mm od=219.1mm h=0.9m\n\
            force thrust=40kN sigma=150kPa";
        let s = crate::solve(KEY, &request(examples, &[]))
            .result
            .unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.output("row_count").map(|o| o.si), Some(6.0));
    }

    #[test]
    fn the_governing_row_opens_on_the_thrust_restraint_page_with_the_same_thrust() {
        for rows in [
            "bend 90deg di52_12 p=150psi soil=safe_sand h=2ft\ndead_end di52_8",
            "bend 90deg di52_12 p=150psi soil=loose_granular h=2ft\ndead_end di52_8",
            "tee size=sch40_12 size2=sch40_6 joint=welded p=16bar sigma=150kPa",
            "bend 22.5deg di52_8 turn=down p=10bar",
        ] {
            let s = crate::solve(KEY, &request(rows, &[]))
                .result
                .unwrap_or_else(|e| panic!("{e}"));
            let link = &s.carry_over[0];
            let mut target = Request::default();
            for (k, v) in &link.inputs {
                target.inputs.insert(k.to_string(), v.clone());
            }
            let t = crate::solve(link.calculator, &target)
                .result
                .unwrap_or_else(|e| panic!("{rows}: {e}"));
            let here = s.output("max_thrust").map(|o| o.si).unwrap_or(0.0);
            let there = t.output("thrust").map(|o| o.si).unwrap_or(f64::NAN);
            assert_relative_eq!(here, there, max_relative = 1e-6);
        }
    }

    #[test]
    fn a_row_below_the_test_point_matches_the_thrust_restraint_page_given_both_elevations() {
        let pairs = [("p_basis", "operating"), ("p", "10 bar"), ("z_test", "100 m")];
        let s = crate::solve(KEY, &request("dead_end d=200mm od=219.1mm joint=welded z=70m", &pairs))
            .result
            .unwrap_or_else(|e| panic!("{e}"));
        let mut page = Request::default();
        for (k, v) in demo_inputs(&crate::calculators::thrust_block::spec()) {
            page.inputs.insert(k, v);
        }
        for (k, v) in [
            ("fitting", "dead_end"),
            ("size", "custom"),
            ("d", "200 mm"),
            ("od", "219.1 mm"),
            ("joint", "welded"),
            ("p_basis", "operating"),
            ("p", "10 bar"),
            ("z_test", "100 m"),
            ("z_fitting", "70 m"),
            ("fluid", "water"),
            ("t", "15 degC"),
        ] {
            page.inputs.insert(k.to_string(), v.to_string());
        }
        let t = crate::solve(crate::calculators::thrust_block::KEY, &page)
            .result
            .unwrap_or_else(|e| panic!("{e}"));
        let here = s.output("max_thrust").map(|o| o.si).unwrap_or(0.0);
        let there = t.output("thrust").map(|o| o.si).unwrap_or(f64::NAN);
        assert_relative_eq!(here, there, max_relative = 1e-9);
        // 30 m of water below the test point: more than at the test point.
        assert!(here > 1e6 * PI * 0.04 / 4.0 * 1.28, "{here}");
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
    }

    #[test]
    fn a_computed_surge_is_asked_for_only_where_the_basis_uses_it() {
        let rows = "dead_end sch40_12 joint=welded";
        let on = |basis: &str| {
            let pairs = [("p_basis", basis), ("p", "5 bar"), ("surge_from", "computed")];
            crate::solve(KEY, &request(rows, &pairs)).result
        };
        // Operating: no surge used, so no velocity needed.
        assert!(on("operating").is_ok());
        // Surge: the velocity stopped is needed, and the error says where to give it.
        match on("surge") {
            Err(crate::SolveError::Fields(e)) => {
                assert!(e[0].kind.to_string().contains("give the velocity stopped"), "{e:?}")
            }
            other => panic!("expected an error, got {other:?}"),
        }
    }

    #[test]
    fn unchecked_sliding_of_a_vertical_block_is_said() {
        let said = |rows: &str| {
            let s = crate::solve(KEY, &request(rows, &[]))
                .result
                .unwrap_or_else(|e| panic!("{e}"));
            s.warnings.iter().any(|w| w.message.contains("sliding is NOT checked"))
        };
        assert!(said("bend 45deg di52_12 turn=down legs=one_level"));
        assert!(!said("bend 45deg di52_12 turn=down"));
        assert!(!said("bend 45deg di52_12"));
    }

    #[test]
    fn fitting_kinds_are_the_restraint_keys_and_old_spellings_still_read() {
        // Issue 13: the schedule wrote "dead end" where the thrust-restraint page
        // writes "dead_end"; both now name a fitting by its one key.
        let s = crate::solve(
            KEY,
            &request("cap di52_8\ndead-end di52_8\ndead_end di52_8\nelbow 45deg di52_8", &[]),
        )
        .result
        .unwrap_or_else(|e| panic!("{e}"));
        let table = s.tables.iter().find(|t| t.key == "schedule").expect("schedule table");
        let kinds: Vec<&str> = table.rows[..4].iter().map(|r| r[2].as_str()).collect();
        assert_eq!(kinds, ["dead_end", "dead_end", "dead_end", "bend"]);
        assert!(s.carry_over[0]
            .inputs
            .iter()
            .any(|(k, v)| *k == "fitting" && v == "dead_end"));
    }

    #[test]
    fn a_bend_row_matches_the_static_formula() {
        // Derived from the definition: T = 2 p A sin(θ/2) on the OD (push-on joints).
        let s = crate::solve(KEY, &request("bend 90deg d=300mm od=320mm p=10bar", &[]))
            .result
            .unwrap_or_else(|e| panic!("{e}"));
        let expected = 2.0 * 1e6 * PI * 0.32 * 0.32 / 4.0 * (PI / 4.0).sin();
        assert_relative_eq!(
            s.output("max_thrust").map(|o| o.si).unwrap_or(0.0),
            expected,
            max_relative = 1e-9
        );
    }

    #[test]
    fn row_errors_name_the_row_and_token() {
        let e = errors("bend 45deg di52_12\nelbw 45deg di52_12");
        assert!(e[0].starts_with("rows: row 2: 'elbw'"), "{e:?}");
        let e = errors("bend 45 di52_12");
        assert!(e[0].contains("row 1") && e[0].contains("'45'"), "{e:?}");
        let e = errors("bend 45deg di52_12 p=-5psi");
        assert!(e[0].contains("row 1: p is a gauge pressure"), "{e:?}");
        let e = errors("bend 45deg di52_12 sigma=0kPa");
        assert!(e[0].contains("sigma (soil bearing) must be at least 1 kPa"), "{e:?}");
        let e = errors("force thrust=5e-324N");
        assert!(e[0].contains("thrust must be at least 1 N and at most 1 GN"), "{e:?}");
        let e = errors("force thrust=2000MN");
        assert!(e[0].contains("at most 1 GN"), "{e:?}");
        let e = errors("bend 45deg d=300mm od=320mm d=0.0001mm");
        assert!(e[0].contains("given twice"), "{e:?}");
        let e = errors("bend 45deg d=0.0001mm od=320mm");
        assert!(e[0].contains("at least 1 mm"), "{e:?}");
        let e = errors("bend 45deg 12in");
        assert!(e[0].contains("bare length '12in' is ambiguous"), "{e:?}");
        let e = errors("bend di52_12");
        assert!(e[0].contains("needs its angle"), "{e:?}");
        let e = errors("tee di52_12 soil=safe_muck di52_8");
        assert!(e[0].contains("no bearing"), "{e:?}");
        let e = errors("reducer di52_8 di52_12");
        assert!(e[0].contains("smaller than the large end"), "{e:?}");
        let e = errors("bend 45deg di52_12 angle=30deg");
        assert!(e[0].contains("given twice"), "{e:?}");
        let e = errors("# only a comment");
        assert!(e[0].contains("no fittings"), "{e:?}");
    }

    /// 500 rows: every 23rd row's thrust against the same fitting solved alone on
    /// the thrust-restraint page (through its carried link), and the totals against
    /// the rows; prints the native solve time and the length of the rows as a URL
    /// query parameter (no assertion on time).
    #[test]
    fn five_hundred_rows_match_single_fitting_solves() {
        let kinds = [
            "bend 45deg di52_12 loose_granular tag=B",
            "bend 90deg sch40_8 joint=welded p=16bar turn=right tag=E",
            "tee di52_12 di52_8 tag=T",
            "reducer c900dr18_12 c900dr18_8 tag=R",
            "bend 22.5deg di52_8 turn=down tag=V",
            "dead_end di52_16 h=1.2m tag=H",
        ];
        let rows: Vec<String> = (0..500).map(|i| format!("{}{}", kinds[i % kinds.len()], i)).collect();
        let text = rows.join("\n");
        let req = request(&text, &[]);
        let start = std::time::Instant::now();
        let outcome = crate::solve(KEY, &req);
        let elapsed = start.elapsed();
        let s = outcome.result.unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(s.output("row_count").map(|o| o.si), Some(500.0));
        assert!(s.defects.is_empty(), "{:?}", s.defects);
        assert!(s.checks.iter().all(|c| c.agrees()), "{:?}", s.checks);
        // The plot holds each row's thrust in its axis unit.
        let plot = s.plots.iter().find(|p| p.key == "thrust_by_row").expect("thrust plot");
        let unit = plot.y_label.split(['(', ')']).nth(1).expect("unit in the axis label");
        let per_unit = crate::units::convert_to(1.0, Q::Force, unit).expect("a force unit");
        let thrusts: Vec<f64> = plot.series[0].points.iter().map(|p| p[1] / per_unit).collect();
        assert_eq!(thrusts.len(), 500);
        let total: f64 = thrusts.iter().sum();
        assert_relative_eq!(s.output("total_thrust").unwrap().si, total, max_relative = 1e-9);
        let max = thrusts.iter().copied().fold(0.0, f64::max);
        assert_relative_eq!(s.output("max_thrust").unwrap().si, max, max_relative = 1e-12);
        for i in (0..500).step_by(23) {
            // The row alone, opened on the thrust-restraint page by its own link.
            let alone = crate::solve(KEY, &request(&rows[i], &[]))
                .result
                .unwrap_or_else(|e| panic!("row {i}: {e}"));
            let link = &alone.carry_over[0];
            let mut target = Request::default();
            for (k, v) in &link.inputs {
                target.inputs.insert(k.to_string(), v.clone());
            }
            let page = crate::solve(link.calculator, &target)
                .result
                .unwrap_or_else(|e| panic!("row {i} on the page: {e}"));
            let there = page.output("thrust").map(|o| o.si).unwrap_or(f64::NAN);
            assert_relative_eq!(thrusts[i], there, max_relative = 1e-6);
            assert!(thrusts[i] > 1e3, "row {i}: {}", thrusts[i]);
        }
        // URLSearchParams encoding: unreserved bytes stay, space → '+', others %XX.
        let encoded: usize = text
            .bytes()
            .map(|b| {
                if b.is_ascii_alphanumeric() || b"*-._ ".contains(&b) {
                    1
                } else {
                    3
                }
            })
            .sum();
        println!(
            "line-schedule: 500 rows solved in {:.2} ms (this build); rows text {} bytes, {} bytes URL-encoded",
            elapsed.as_secs_f64() * 1e3,
            text.len(),
            encoded
        );
    }
}
