//! The vessel's shape: the free-surface area A(h) and the liquid volume V(h) at a
//! level h above the outlet, and the level holding a given volume.
//!
//! Closed forms (derived from the definition V(h) = ∫₀ʰ A(z) dz):
//! - vertical cylinder of diameter D: A = πD²/4, V = A·h;
//! - horizontal cylinder of diameter D = 2R and length L: A = 2L·√(h(D − h)),
//!   V = L·R²·(x − sin x)/2 with x = 4·asin(√(h/D)) (the circular segment; by its
//!   series for a small angle, where x − sin x would cancel);
//! - cone-bottomed cylinder (apex at the outlet, cone height H_c, diameter D): in the
//!   cone A = A_D·(h/H_c)², V = A_D·h³/(3H_c²); above it V = A_D·(H_c/3 + h − H_c);
//! - sphere of diameter D = 2R: A = π·h·(D − h), V = π·h²·(3R − h)/3 (the
//!   spherical cap);
//! - a typed level–area table: A linear between rows, V its exact integral
//!   (trapezoids, plus the quadratic part within the row where h falls).
//!
//! The level holding a volume is found by a bracketed search on V(h) (monotone in h,
//! [`crate::numeric::sign_change_of`]), except
//! for the vertical cylinder and the cone, which invert in closed form.

use std::f64::consts::PI;

use crate::error::FieldError;
use crate::numeric;
use crate::units::{self, QuantityKind as Q, UnitSystem};

/// Most rows of a level–area table.
pub const MAX_TABLE_ROWS: usize = 500;

/// The vessel's shape in SI numbers.
#[derive(Clone, Debug, PartialEq)]
pub enum Shape {
    VerticalCylinder {
        diameter: f64,
    },
    HorizontalCylinder {
        diameter: f64,
        length: f64,
    },
    ConeBottom {
        diameter: f64,
        cone_height: f64,
    },
    Sphere {
        diameter: f64,
    },
    /// (level, area) rows, levels rising from 0.
    Table(Vec<(f64, f64)>),
}

impl Shape {
    /// Free-surface area at level `h` (clamped to the vessel).
    pub fn area(&self, h: f64) -> f64 {
        let h = h.max(0.0);
        match self {
            Shape::VerticalCylinder { diameter } => PI * diameter * diameter / 4.0,
            Shape::HorizontalCylinder { diameter, length } => {
                let h = h.min(*diameter);
                2.0 * length * (h * (diameter - h)).max(0.0).sqrt()
            }
            Shape::ConeBottom { diameter, cone_height } => {
                let full = PI * diameter * diameter / 4.0;
                if h < *cone_height {
                    full * (h / cone_height).powi(2)
                } else {
                    full
                }
            }
            Shape::Sphere { diameter } => {
                let h = h.min(*diameter);
                PI * h * (diameter - h)
            }
            Shape::Table(rows) => table_area(rows, h),
        }
    }

    /// Liquid volume below level `h` (clamped to the vessel).
    pub fn volume(&self, h: f64) -> f64 {
        let h = h.max(0.0);
        match self {
            Shape::VerticalCylinder { diameter } => PI * diameter * diameter / 4.0 * h,
            Shape::HorizontalCylinder { diameter, length } => {
                let radius = diameter / 2.0;
                length * segment_area(radius, h.min(*diameter))
            }
            Shape::ConeBottom { diameter, cone_height } => {
                let full = PI * diameter * diameter / 4.0;
                if h < *cone_height {
                    full * h * h * h / (3.0 * cone_height * cone_height)
                } else {
                    full * (cone_height / 3.0 + h - cone_height)
                }
            }
            Shape::Sphere { diameter } => {
                let h = h.min(*diameter);
                PI * h * h * (1.5 * diameter - h) / 3.0
            }
            Shape::Table(rows) => table_volume(rows, h),
        }
    }

    /// Height of the vessel's top above the outlet, where the shape has one
    /// (`height` is the typed height of a vertical or cone-bottomed vessel).
    pub fn top(&self, height: Option<f64>) -> Option<f64> {
        match self {
            Shape::VerticalCylinder { .. } | Shape::ConeBottom { .. } => height,
            Shape::HorizontalCylinder { diameter, .. } | Shape::Sphere { diameter } => Some(*diameter),
            Shape::Table(rows) => rows.last().map(|r| r.0),
        }
    }

    /// The level holding `volume` (0 for none; levels above `top` are not asked for).
    pub fn level_of(&self, volume: f64, top: f64) -> f64 {
        if volume <= 0.0 {
            return 0.0;
        }
        match self {
            Shape::VerticalCylinder { .. } => volume / self.area(0.0),
            Shape::ConeBottom { diameter, cone_height } => {
                let full = PI * diameter * diameter / 4.0;
                let cone = full * cone_height / 3.0;
                if volume < cone {
                    (3.0 * volume * cone_height * cone_height / full).cbrt()
                } else {
                    cone_height + (volume - cone) / full
                }
            }
            _ => {
                if self.volume(top) <= volume {
                    return top;
                }
                numeric::sign_change_of(0.0, top, |level| volume - self.volume(level))
            }
        }
    }

    /// Levels where the area has a kink (the top of a cone, the rows of a table).
    pub fn kinks(&self) -> Vec<f64> {
        match self {
            Shape::ConeBottom { cone_height, .. } => vec![*cone_height],
            Shape::Table(rows) => rows.iter().map(|r| r.0).collect(),
            _ => Vec::new(),
        }
    }

    /// Plain name of the shape.
    pub fn name(&self) -> &'static str {
        match self {
            Shape::VerticalCylinder { .. } => "vertical cylinder",
            Shape::HorizontalCylinder { .. } => "horizontal cylinder",
            Shape::ConeBottom { .. } => "cone-bottomed cylinder",
            Shape::Sphere { .. } => "sphere",
            Shape::Table(_) => "typed level–area table",
        }
    }
}

/// Area of the circular segment of height `h` in a circle of radius `r`,
/// r²/2·(x − sin x) with the central angle x = 4·asin(√(h/2r)); by its series for a
/// small angle, where x − sin x would cancel.
fn segment_area(r: f64, h: f64) -> f64 {
    let x = 4.0 * (h / (2.0 * r)).clamp(0.0, 1.0).sqrt().asin();
    let x_minus_sin = if x < 0.1 {
        let x2 = x * x;
        x * x2 / 6.0 * (1.0 - x2 / 20.0 * (1.0 - x2 / 42.0 * (1.0 - x2 / 72.0)))
    } else {
        x - x.sin()
    };
    0.5 * r * r * x_minus_sin
}

fn table_area(rows: &[(f64, f64)], h: f64) -> f64 {
    interpolate(rows, h)
}

/// Linear interpolation in a table of rising x: the first value below the table,
/// the last above it (the level–area and time–inflow tables alike).
pub(super) fn interpolate(rows: &[(f64, f64)], x: f64) -> f64 {
    match rows.iter().position(|r| r.0 >= x) {
        Some(0) => rows[0].1,
        Some(i) => {
            let (x0, y0) = rows[i - 1];
            let (x1, y1) = rows[i];
            y0 + (y1 - y0) * (x - x0) / (x1 - x0)
        }
        None => rows.last().map_or(0.0, |r| r.1),
    }
}

fn table_volume(rows: &[(f64, f64)], h: f64) -> f64 {
    let mut volume = 0.0;
    for pair in rows.windows(2) {
        let ((h0, a0), (h1, a1)) = (pair[0], pair[1]);
        if h <= h0 {
            break;
        }
        let upper = h.min(h1);
        let a_upper = a0 + (a1 - a0) * (upper - h0) / (h1 - h0);
        volume += 0.5 * (a0 + a_upper) * (upper - h0);
    }
    volume
}

/// The unit a bare number takes in a table, by unit system.
pub fn table_unit(kind: Q, system: UnitSystem) -> &'static str {
    match (kind, system) {
        (Q::Length, UnitSystem::Si) => "m",
        (Q::Length, UnitSystem::UsCustomary) => "ft",
        (Q::Area, UnitSystem::Si) => "m2",
        (Q::Area, UnitSystem::UsCustomary) => "ft2",
        (Q::Time, _) => "min",
        (Q::VolumeFlow, UnitSystem::Si) => "m3/h",
        (Q::VolumeFlow, UnitSystem::UsCustomary) => "gpm",
        _ => "-",
    }
}

/// Parses a two-column table (rows separated by `;` or new lines, each row two
/// quantities, each a number with or without its unit: `"1.5 m 2.4 m2"`) into SI
/// pairs. `what` names the columns in messages (`["level", "area"]`).
///
/// # Errors
/// The field, naming the row and what is wrong with it.
pub fn parse_pairs(
    field: &'static str,
    text: &str,
    kinds: [Q; 2],
    what: [&str; 2],
    system: UnitSystem,
) -> Result<Vec<(f64, f64)>, FieldError> {
    let mut rows = Vec::new();
    for (index, entry) in text
        .split([';', '\n'])
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .enumerate()
    {
        let row = index + 1;
        if row > MAX_TABLE_ROWS {
            return Err(FieldError::inconsistent(
                field,
                format!("at most {MAX_TABLE_ROWS} rows"),
            ));
        }
        // Group tokens into quantities: a token that starts like a number opens one,
        // any other token is the unit of the quantity before it.
        let mut groups: Vec<String> = Vec::new();
        for token in entry.split_whitespace() {
            let opens = token
                .chars()
                .next()
                .is_some_and(|c| c.is_ascii_digit() || matches!(c, '.' | '-' | '+'));
            match groups.last_mut() {
                Some(last) if !opens => {
                    last.push(' ');
                    last.push_str(token);
                }
                _ => groups.push(token.to_string()),
            }
        }
        if groups.len() != 2 {
            return Err(FieldError::inconsistent(
                field,
                format!(
                    "row {row}: give a {} and a {}, e.g. '{}'",
                    what[0],
                    what[1],
                    example(kinds)
                ),
            ));
        }
        let mut pair = [0.0; 2];
        for (k, group) in groups.iter().enumerate() {
            let value = units::parse_quantity(group, kinds[k], table_unit(kinds[k], system))
                .map_err(|e| FieldError::inconsistent(field, format!("row {row}, {}: {e}", what[k])))?;
            if !value.is_finite() || value < 0.0 {
                return Err(FieldError::inconsistent(
                    field,
                    format!("row {row}: the {} must be zero or more", what[k]),
                ));
            }
            pair[k] = value;
        }
        rows.push((pair[0], pair[1]));
    }
    if rows.is_empty() {
        return Err(FieldError::inconsistent(
            field,
            format!("give at least one row, e.g. '{}'", example(kinds)),
        ));
    }
    Ok(rows)
}

fn example(kinds: [Q; 2]) -> &'static str {
    match kinds[0] {
        Q::Length => "1.5 m 2.4 m2",
        _ => "30 min 20 m3/h",
    }
}

/// Reads a level–area table: the first level 0 (the outlet), levels rising, areas
/// positive above the first row, levels and areas within the page's limits.
///
/// # Errors
/// The field, naming the row.
pub fn level_area_table(field: &'static str, text: &str, system: UnitSystem) -> Result<Shape, FieldError> {
    let rows = parse_pairs(field, text, [Q::Length, Q::Area], ["level", "area"], system)?;
    if rows.len() < 2 {
        return Err(FieldError::inconsistent(
            field,
            "give at least two rows: the outlet level 0 and a level above",
        ));
    }
    if rows[0].0 != 0.0 {
        return Err(FieldError::inconsistent(
            field,
            "row 1: the first level must be 0 (the outlet)",
        ));
    }
    for (i, pair) in rows.windows(2).enumerate() {
        if pair[1].0 <= pair[0].0 {
            return Err(FieldError::inconsistent(
                field,
                format!("row {}: levels must rise from row to row", i + 2),
            ));
        }
    }
    for (i, &(h, a)) in rows.iter().enumerate() {
        if h > super::MAX_LEVEL {
            return Err(FieldError::inconsistent(
                field,
                format!("row {}: the level must be at most 1000 m", i + 1),
            ));
        }
        if !(super::MIN_AREA..=super::MAX_AREA).contains(&a) && !(i == 0 && a == 0.0) {
            return Err(FieldError::inconsistent(
                field,
                format!(
                    "row {}: the area must be from 1 cm² to 100 000 m² (0 allowed at the outlet)",
                    i + 1
                ),
            ));
        }
    }
    Ok(Shape::Table(rows))
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn shapes() -> Vec<Shape> {
        vec![
            Shape::VerticalCylinder { diameter: 2.0 },
            Shape::HorizontalCylinder {
                diameter: 2.0,
                length: 5.0,
            },
            Shape::ConeBottom {
                diameter: 2.0,
                cone_height: 1.2,
            },
            Shape::Sphere { diameter: 3.0 },
            Shape::Table(vec![(0.0, 0.5), (1.0, 2.0), (2.5, 2.0), (3.0, 1.0)]),
        ]
    }

    #[test]
    fn volume_is_the_integral_of_the_area() {
        // Derived from the definition: dV/dh = A(h), checked by a central difference
        // independent of each closed form.
        for shape in shapes() {
            for h in [0.1, 0.7, 1.3, 1.9, 2.7] {
                if shape.top(Some(3.0)).is_some_and(|t| h >= t) {
                    continue;
                }
                let dh = 1e-6;
                let slope = (shape.volume(h + dh) - shape.volume(h - dh)) / (2.0 * dh);
                assert_relative_eq!(slope, shape.area(h), max_relative = 1e-6);
            }
        }
    }

    #[test]
    fn a_thin_segment_keeps_its_precision() {
        // Derived from the definition: for h ≪ R the segment's area tends to
        // (4/3)·√(2R)·h^(3/2); at h/R = 1e-8 the next term is of relative order 1e-9.
        let (r, h): (f64, f64) = (2.0, 2e-8);
        let thin = (4.0 / 3.0) * (2.0 * r).sqrt() * h * h.sqrt();
        assert_relative_eq!(segment_area(r, h), thin, max_relative = 1e-8);
        // And the two branches meet: just below and above the series' limit.
        let h_at = |x: f64| 2.0 * r * (x / 4.0).sin().powi(2);
        let area = |x: f64| 0.5 * r * r * (x - x.sin());
        assert_relative_eq!(segment_area(r, h_at(0.0999)), area(0.0999), max_relative = 1e-9);
        assert_relative_eq!(segment_area(r, h_at(0.2)), area(0.2), max_relative = 1e-12);
    }

    #[test]
    fn level_of_inverts_volume() {
        for shape in shapes() {
            let top = shape.top(Some(3.0)).unwrap();
            for share in [0.01, 0.3, 0.5, 0.99] {
                let h = share * top;
                assert_relative_eq!(shape.level_of(shape.volume(h), top), h, max_relative = 1e-10);
            }
        }
    }

    #[test]
    fn full_sphere_and_horizontal_cylinder_hold_their_textbook_volumes() {
        // Derived from the definition: πD³/6 and πD²L/4.
        assert_relative_eq!(
            Shape::Sphere { diameter: 3.0 }.volume(3.0),
            PI * 27.0 / 6.0,
            max_relative = 1e-14
        );
        let drum = Shape::HorizontalCylinder {
            diameter: 2.0,
            length: 5.0,
        };
        assert_relative_eq!(drum.volume(2.0), PI * 5.0, max_relative = 1e-14);
        assert_relative_eq!(drum.volume(1.0), PI * 2.5, max_relative = 1e-14);
    }

    #[test]
    fn table_errors_name_the_row() {
        let err = |text: &str| {
            level_area_table("area_table", text, UnitSystem::Si)
                .unwrap_err()
                .to_string()
        };
        assert!(err("0 1; 2").contains("row 2"), "{}", err("0 1; 2"));
        assert!(err("0 m 1 m2; 1 m 2 m2; 0.5 m 2 m2").contains("row 3"));
        assert!(err("0.5 m 1 m2; 1 m 2 m2").contains("row 1"));
        assert!(
            err("0 m 1 m2; 1 m 2 x").contains("row 2, area"),
            "{}",
            err("0 m 1 m2; 1 m 2 x")
        );
        assert!(err("0 m 1 m2; 1 m 0 m2").contains("row 2"));
        let ok = level_area_table("area_table", "0 m 1 m2\n3.28084 ft 10.7639 ft2", UnitSystem::Si).unwrap();
        let Shape::Table(rows) = ok else { panic!() };
        assert_relative_eq!(rows[1].0, 1.0, max_relative = 1e-5);
        assert_relative_eq!(rows[1].1, 1.0, max_relative = 1e-5);
    }
}
