//! Drawing helpers shared by the diagrams: pipe bands, force arrows, the thrust
//! and restraint pair, hulls and bounds.

use crate::catalog::{Shape, ShapeStyle};
use crate::vector::Vec3;

/// Area of a circle of diameter `d`.
pub fn circle_area(d: f64) -> f64 {
    std::f64::consts::PI * d * d / 4.0
}

/// A force arrow ending at (or starting from) `at`, scaled by `scale` metres per
/// newton, labelled with its formatted magnitude.
pub fn force_arrow(
    at: [f64; 2],
    force: Vec3,
    scale: f64,
    label: String,
    style: ShapeStyle,
    tail_at_point: bool,
) -> Option<Shape> {
    let dx = force.x * scale;
    let dy = force.y * scale;
    if !(dx.is_finite() && dy.is_finite()) || (dx * dx + dy * dy).sqrt() < 1e-9 {
        return None;
    }
    let (from, to) = if tail_at_point {
        (at, [at[0] + dx, at[1] + dy])
    } else {
        ([at[0] - dx, at[1] - dy], at)
    };
    Some(Shape::Arrow { from, to, label, style })
}

/// Points of the two walls of a curved pipe of diameter `d` following an arc of
/// radius `r` about `center`, from angle `a0` to `a1` (radians), as one closed
/// polygon (outer wall out, inner wall back).
pub fn arc_band(center: [f64; 2], r: f64, d: f64, a0: f64, a1: f64, steps: usize) -> Vec<[f64; 2]> {
    let mut pts = Vec::with_capacity(2 * steps + 2);
    for i in 0..=steps {
        let a = a0 + (a1 - a0) * i as f64 / steps as f64;
        pts.push([center[0] + (r + d / 2.0) * a.cos(), center[1] + (r + d / 2.0) * a.sin()]);
    }
    for i in (0..=steps).rev() {
        let a = a0 + (a1 - a0) * i as f64 / steps as f64;
        pts.push([center[0] + (r - d / 2.0) * a.cos(), center[1] + (r - d / 2.0) * a.sin()]);
    }
    pts
}

/// A straight pipe band from `a` to `b` of diameter `d` (closed polygon).
pub fn straight_band(a: [f64; 2], b: [f64; 2], d: f64) -> Vec<[f64; 2]> {
    let (dx, dy) = (b[0] - a[0], b[1] - a[1]);
    let len = (dx * dx + dy * dy).sqrt().max(1e-12);
    let (nx, ny) = (-dy / len * d / 2.0, dx / len * d / 2.0);
    vec![
        [a[0] + nx, a[1] + ny],
        [b[0] + nx, b[1] + ny],
        [b[0] - nx, b[1] - ny],
        [a[0] - nx, a[1] - ny],
    ]
}

/// Bounds of a set of points with a margin.
pub fn bounds_of(points: impl IntoIterator<Item = [f64; 2]>, margin: f64) -> [f64; 4] {
    let mut b = [f64::INFINITY, f64::INFINITY, f64::NEG_INFINITY, f64::NEG_INFINITY];
    for p in points {
        if p[0].is_finite() && p[1].is_finite() {
            b[0] = b[0].min(p[0]);
            b[1] = b[1].min(p[1]);
            b[2] = b[2].max(p[0]);
            b[3] = b[3].max(p[1]);
        }
    }
    if !b.iter().all(|x| x.is_finite()) {
        return [-1.0, -1.0, 1.0, 1.0];
    }
    [b[0] - margin, b[1] - margin, b[2] + margin, b[3] + margin]
}

/// Every point a shape touches (for bounds).
pub fn shape_points(shape: &Shape) -> Vec<[f64; 2]> {
    match shape {
        Shape::Polygon { points, .. } | Shape::Polyline { points, .. } => points.clone(),
        Shape::Circle { center, radius, .. } => {
            vec![
                [center[0] - radius, center[1] - radius],
                [center[0] + radius, center[1] + radius],
            ]
        }
        Shape::Arrow { from, to, .. } => vec![*from, *to],
        Shape::Text { at, .. } => vec![*at],
    }
}

/// Convex hull of a few points (monotone chain), counter-clockwise; for drawing a
/// control volume around the parts of a diagram.
pub fn convex_hull(mut points: Vec<[f64; 2]>) -> Vec<[f64; 2]> {
    points.retain(|p| p[0].is_finite() && p[1].is_finite());
    points.sort_by(|a, b| a[0].total_cmp(&b[0]).then(a[1].total_cmp(&b[1])));
    let cross = |o: [f64; 2], a: [f64; 2], b: [f64; 2]| (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
    let mut lower: Vec<[f64; 2]> = Vec::new();
    for &p in &points {
        while lower.len() >= 2 && cross(lower[lower.len() - 2], lower[lower.len() - 1], p) <= 0.0 {
            lower.pop();
        }
        lower.push(p);
    }
    let mut upper: Vec<[f64; 2]> = Vec::new();
    for &p in points.iter().rev() {
        while upper.len() >= 2 && cross(upper[upper.len() - 2], upper[upper.len() - 1], p) <= 0.0 {
            upper.pop();
        }
        upper.push(p);
    }
    lower.pop();
    upper.pop();
    lower.extend(upper);
    lower
}

/// The pair of arrows every fitting diagram draws: the thrust T the fitting puts on
/// its supports, and the restraint R = −T the supports supply, each from its own
/// point, labelled with `text` (the formatted magnitude).
pub fn thrust_and_restraint_arrows(
    shapes: &mut Vec<Shape>,
    thrust_at: [f64; 2],
    restraint_at: [f64; 2],
    thrust: Vec3,
    scale: f64,
    text: &str,
) {
    let pair = [
        (thrust_at, thrust, format!("thrust T {text}"), ShapeStyle::Thrust),
        (
            restraint_at,
            -thrust,
            format!("restraint R {text}"),
            ShapeStyle::Restraint,
        ),
    ];
    for (at, force, label, style) in pair {
        if let Some(arrow) = force_arrow(at, force, scale, label, style, true) {
            shapes.push(arrow);
        }
    }
}
