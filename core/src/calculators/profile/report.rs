//! The profile page's report: outputs, checks, the basis and profile tables and the
//! plot, built from the model's typed result ([`super::model::Solved`]).

use crate::catalog::{Plot, Report, Series, Table};
use crate::units::{self, QuantityKind as Q};

use super::model::{velocity_unit, Solved};
use super::QUADRATURE_TOLERANCE;
use crate::calculators::common;

const TRAVERSE_CHECK: &str =
    "tanh-sinh quadrature of the same closed profile (measured points, linear between them, and the wall zone)";
const LAW_CHECK: &str = "tanh-sinh quadrature of the profile law against its closed form";
const FAR_FROM_FLAT: &str =
    "β above 1.1: the profile is far from flat (laminar, disturbed or skewed flow); use β in momentum balances";
const MOVING_WALL_POINT: &str = "the point at r/R = 1 has a velocity above 0: the flow sticks to the wall (no \
    slip), so a velocity there overstates the flow; leave the wall point out and the wall zone closes the profile";

/// Writes everything the page shows from the integrated profile.
pub fn write(s: &Solved, report: &mut Report<'_>) {
    let (mean, beta, alpha, peak, area, by_quadrature) = (s.mean, s.beta, s.alpha, s.peak, s.area, s.by_quadrature);
    let unit = velocity_unit(report.system());
    let mut basis: Vec<(&str, String)> = Vec::new();
    if let Some((wall_exponent, s_last, defaulted)) = s.wall_zone {
        basis.push((
            "Wall zone",
            format!(
                "power law u ∝ (1 − r/R)^(1/{}) from r/R = {} to the wall{}",
                units::format_significant(wall_exponent, 3),
                units::format_significant(s_last, 3),
                if defaulted { " (m = 7 when left empty)" } else { "" }
            ),
        ));
    } else if s.moving_wall_point {
        basis.push(("Wall zone", "none: the last point is at the wall".to_string()));
        report.warn(Some("points"), MOVING_WALL_POINT);
    }
    report.output("flow", mean * area);
    report.output("v_mean", mean);
    report.output("beta", beta);
    report.output("alpha", alpha);
    report.output("mean_over_peak", mean / peak);
    let [q1, q2, _] = by_quadrature;
    let independent = if s.traverse { TRAVERSE_CHECK } else { LAW_CHECK };
    report.check(
        "Mean velocity",
        independent,
        Q::Velocity,
        mean,
        q1,
        QUADRATURE_TOLERANCE,
        0.0,
    );
    report.check(
        "Momentum-flux factor β",
        independent,
        Q::Ratio,
        beta,
        q2 / (q1 * q1),
        QUADRATURE_TOLERANCE,
        0.0,
    );
    if beta > 1.1 {
        report.warn(Some("shape"), FAR_FROM_FLAT);
    }
    // One link per fitting page: the profile's β and α at that fitting's inlet.
    report
        .solution
        .carry_over
        .extend(common::profile_carry_overs(beta, alpha));
    if !basis.is_empty() {
        report.table(|_| common::basis_table(basis));
    }
    let to_unit = |u: f64| units::convert_to(u, Q::Velocity, unit).unwrap_or(u);
    let mut table = Table {
        key: "profile",
        title: "Profile used in the integration".to_string(),
        columns: vec![
            "r/R".to_string(),
            format!("u ({unit})"),
            "u/V".to_string(),
            "from".to_string(),
        ],
        rows: Vec::new(),
        emphasised_rows: Vec::new(),
        typed_columns: Vec::new(),
    };
    for (r, u, note) in &s.samples {
        table.rows.push(vec![
            units::format_significant(*r, 3),
            units::format_significant(to_unit(*u), 4),
            units::format_significant(u / mean, 4),
            note.to_string(),
        ]);
    }
    report.table(|_| table);
    let mut curve: Vec<[f64; 2]> = s.samples.iter().rev().map(|(r, u, _)| [-r, to_unit(*u)]).collect();
    curve.extend(s.samples.iter().map(|(r, u, _)| [*r, to_unit(*u)]));
    report.plot(|_| Plot {
        key: "profile",
        title: "Velocity across the pipe".to_string(),
        x_label: "position r/R across the diameter".to_string(),
        y_label: format!("velocity ({unit})"),
        series: vec![
            Series {
                name: "profile".to_string(),
                points: curve,
            },
            Series {
                name: "mean velocity".to_string(),
                points: vec![[-1.0, to_unit(mean)], [1.0, to_unit(mean)]],
            },
        ],
        markers: Vec::new(),
    });
}
