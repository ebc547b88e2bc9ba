//! The line schedule's row language: one fitting per line, `KIND [TOKEN ...]`
//! (see the page's module doc). Parsed strictly: every error names its row (the
//! line number in the text) and its token. Fitting kinds are the restraint
//! module's keys ([`crate::restraint::FittingChoice`]), older spellings still read.

use std::f64::consts::PI;

use crate::pipe_sizes;
use crate::restraint::soil;
use crate::restraint::{FittingChoice, FittingKind, Joint, Legs, MIN_ANGLE};
use crate::units::{self, QuantityKind as Q};

use super::super::common::{MAX_PRESSURE_PA, MAX_SIZE_M, MIN_SIZE_M};
use super::super::thrust_block::{MAX_ELEVATION_M, MIN_ELEVATION_M};
use super::{MAX_BEARING, MAX_ROWS, MAX_ROW_THRUST, MIN_BEARING};

/// One parsed row.
#[derive(Clone, Debug, PartialEq)]
pub struct Row {
    pub line: usize,
    pub kind: RowKind,
    pub tag: String,
    pub angle: Option<f64>,
    pub size: Option<String>,
    pub d: Option<f64>,
    pub od: Option<f64>,
    pub size2: Option<String>,
    pub d2: Option<f64>,
    pub od2: Option<f64>,
    pub p: Option<f64>,
    pub pw: Option<f64>,
    pub soil: Option<String>,
    pub sigma: Option<f64>,
    pub joint: Option<Joint>,
    pub h: Option<f64>,
    pub turn: Turn,
    /// A vertical bend with both legs sloped by θ/2 (the default), or one leg level.
    pub symmetric: bool,
    pub thrust: Option<f64>,
    /// Elevation of the fitting, m (`z=`), on the datum of the page's test point.
    pub z: Option<f64>,
    /// Velocity stopped at this row's pipe for a computed surge, m/s (`dv=`).
    pub dv: Option<f64>,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RowKind {
    Fitting(FittingKind),
    Force,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Turn {
    Left,
    Right,
    Down,
    Up,
}

impl Row {
    fn new(line: usize, kind: RowKind) -> Row {
        Row {
            line,
            kind,
            tag: String::new(),
            angle: None,
            size: None,
            d: None,
            od: None,
            size2: None,
            d2: None,
            od2: None,
            p: None,
            pw: None,
            soil: None,
            sigma: None,
            joint: None,
            h: None,
            turn: Turn::Left,
            symmetric: true,
            thrust: None,
            z: None,
            dv: None,
        }
    }
}

/// The kind of a row from its first word: the restraint module's fitting keys
/// (`bend`, `dead_end`, `tee`, `reducer`, `force`), and the older spellings rows
/// were written with (`elbow`, `cap`, `plug`, `valve`, `dead-end`, `deadend`).
pub(super) fn kind_of(word: &str) -> Option<RowKind> {
    let word = word.to_ascii_lowercase();
    let key = match word.as_str() {
        "elbow" => "bend",
        "cap" | "plug" | "valve" | "dead-end" | "deadend" => "dead_end",
        other => other,
    };
    Some(match FittingChoice::from_key(key)?.kind() {
        Some(kind) => RowKind::Fitting(kind),
        None => RowKind::Force,
    })
}

impl RowKind {
    /// The restraint module's key of the row's fitting (`dead_end`, …, `force`).
    pub fn key(self) -> &'static str {
        match self {
            RowKind::Fitting(kind) => kind.key(),
            RowKind::Force => FittingChoice::GivenForce.key(),
        }
    }
}

/// Parses a quantity token that must carry its unit.
pub(super) fn typed(text: &str, kind: Q, row: usize, key: &str) -> Result<f64, String> {
    let t = text.trim();
    if !t.is_empty() && t.chars().all(|c| c.is_ascii_digit() || ".+-eE".contains(c)) {
        return Err(format!(
            "row {row}: {key}={t} has no unit; write it with one, e.g. {t}{}",
            example_unit(kind)
        ));
    }
    units::parse_quantity(t, kind, "").map_err(|e| format!("row {row}: {key}={t}: {e}"))
}

pub(super) fn example_unit(kind: Q) -> &'static str {
    match kind {
        Q::Angle => "deg",
        Q::Pressure => "psi",
        Q::SoilBearing => "psf",
        Q::Length => "in",
        Q::Force => "kN",
        Q::Velocity => "ft/s",
        _ => "",
    }
}

/// Parses the whole schedule strictly. Every row error names its row (the line
/// number in the text) and the token.
///
/// # Errors
/// The messages of every bad row (at most 20).
pub fn parse(text: &str) -> Result<Vec<Row>, Vec<String>> {
    let mut rows = Vec::new();
    let mut errors = Vec::new();
    for (i, raw) in text.lines().enumerate() {
        let line = i + 1;
        let content = raw.split('#').next().unwrap_or("").trim();
        if content.is_empty() {
            continue;
        }
        match parse_row(line, content) {
            Ok(row) => rows.push(row),
            Err(e) => {
                errors.push(e);
                if errors.len() >= 20 {
                    errors.push("… more rows have errors; fix these first".to_string());
                    break;
                }
            }
        }
    }
    if rows.len() > MAX_ROWS && errors.is_empty() {
        errors.push(format!("{} rows: at most {MAX_ROWS} per schedule", rows.len()));
    }
    if errors.is_empty() {
        Ok(rows)
    } else {
        Err(errors)
    }
}

pub(super) fn parse_row(line: usize, content: &str) -> Result<Row, String> {
    let mut tokens = content.split_whitespace();
    let first = tokens.next().unwrap_or("");
    let kind = kind_of(first).ok_or_else(|| {
        format!(
            "row {line}: '{}' is not a fitting kind; use bend, tee, dead_end, reducer or force",
            short(first)
        )
    })?;
    let mut row = Row::new(line, kind);
    let mut seen: Vec<&str> = Vec::new();
    for token in tokens {
        let (key, value) = match token.split_once('=') {
            Some((k, v)) => (k.to_ascii_lowercase(), v),
            None => (bare_key(&row, token, line)?.to_string(), token),
        };
        let key_static: &'static str = match key.as_str() {
            "angle" => "angle",
            "size" => "size",
            "d" => "d",
            "od" => "od",
            "size2" => "size2",
            "d2" => "d2",
            "od2" => "od2",
            "p" => "p",
            "pw" => "pw",
            "soil" => "soil",
            "sigma" => "sigma",
            "joint" => "joint",
            "h" => "h",
            "turn" => "turn",
            "legs" => "legs",
            "thrust" => "thrust",
            "tag" => "tag",
            "z" => "z",
            "dv" => "dv",
            other => {
                return Err(format!(
                    "row {line}: unknown key '{}'; use angle, size, d, od, size2, d2, od2, p, pw, soil, sigma, \
                            joint, h, turn, legs, thrust, z, dv or tag",
                    short(other)
                ))
            }
        };
        if seen.contains(&key_static) {
            return Err(format!("row {line}: '{key_static}' is given twice"));
        }
        seen.push(key_static);
        if value.is_empty() {
            return Err(format!("row {line}: {key_static}= has no value"));
        }
        match key_static {
            "angle" => {
                let a = typed(value, Q::Angle, line, "angle")?;
                if !(MIN_ANGLE..=PI).contains(&a) {
                    return Err(format!(
                        "row {line}: angle must be at least 0.1 deg and at most 180 deg"
                    ));
                }
                row.angle = Some(a);
            }
            "size" | "size2" => {
                if pipe_sizes::find(value).is_none() {
                    return Err(format!(
                        "row {line}: '{}' is not a size preset (e.g. di52_12, sch40_8, c900dr18_6)",
                        short(value)
                    ));
                }
                if key_static == "size" {
                    row.size = Some(value.to_string());
                } else {
                    row.size2 = Some(value.to_string());
                }
            }
            "d" | "od" | "d2" | "od2" | "h" => {
                let v = typed(value, Q::Length, line, key_static)?;
                let (lo, hi, range) = if key_static == "h" {
                    (0.05, 20.0, "at least 0.05 m and at most 20 m")
                } else {
                    (MIN_SIZE_M, MAX_SIZE_M, "at least 1 mm and at most 10 m")
                };
                if !(lo..=hi).contains(&v) {
                    return Err(format!("row {line}: {key_static} must be {range}"));
                }
                match key_static {
                    "d" => row.d = Some(v),
                    "od" => row.od = Some(v),
                    "d2" => row.d2 = Some(v),
                    "od2" => row.od2 = Some(v),
                    _ => row.h = Some(v),
                }
            }
            "p" | "pw" => {
                let v = typed(value, Q::Pressure, line, key_static)?;
                if !(0.0..=MAX_PRESSURE_PA).contains(&v) {
                    return Err(format!(
                        "row {line}: {key_static} is a gauge pressure: at least 0 and at most 100 MPa"
                    ));
                }
                if key_static == "p" {
                    row.p = Some(v);
                } else {
                    row.pw = Some(v);
                }
            }
            "sigma" => {
                let v = typed(value, Q::SoilBearing, line, "sigma")?;
                if !(MIN_BEARING..=MAX_BEARING).contains(&v) {
                    return Err(format!(
                        "row {line}: sigma (soil bearing) must be at least 1 kPa and at most 20 MPa"
                    ));
                }
                row.sigma = Some(v);
            }
            "soil" => {
                // A retired preset key of an older schedule reads as its class.
                let Some(class) = soil::soil(value) else {
                    return Err(format!(
                        "row {line}: '{}' is not a soil class (soft_cohesive, firm_cohesive, stiff_cohesive, \
                                loose_granular, dense_granular, rock, organic)",
                        short(value)
                    ));
                };
                row.soil = Some(class.key.to_string());
            }
            "joint" => {
                let keys: Vec<&str> = Joint::ALL.iter().map(|j| j.key()).collect();
                row.joint = Some(
                    Joint::from_key(value).ok_or_else(|| format!("row {line}: joint must be {}", keys.join(", ")))?,
                );
            }
            "turn" => {
                row.turn = match value.to_ascii_lowercase().as_str() {
                    "left" => Turn::Left,
                    "right" => Turn::Right,
                    "down" => Turn::Down,
                    "up" => Turn::Up,
                    _ => return Err(format!("row {line}: turn must be left, right, up or down")),
                }
            }
            "legs" => {
                row.symmetric = match Legs::from_key(&value.to_ascii_lowercase()) {
                    Some(legs) => legs == Legs::Symmetric,
                    None => return Err(format!("row {line}: legs must be symmetric or one_level")),
                }
            }
            "z" => {
                let v = typed(value, Q::Length, line, "z")?;
                if !(MIN_ELEVATION_M..=MAX_ELEVATION_M).contains(&v) {
                    return Err(format!(
                        "row {line}: z (the fitting's elevation) must be at least −1000 m and at most 10 000 m"
                    ));
                }
                row.z = Some(v);
            }
            "dv" => {
                let v = typed(value, Q::Velocity, line, "dv")?;
                if !(0.0..=50.0).contains(&v) {
                    return Err(format!(
                        "row {line}: dv (the velocity stopped) must be at least 0 and at most 50 m/s"
                    ));
                }
                row.dv = Some(v);
            }
            "thrust" => {
                let v = typed(value, Q::Force, line, "thrust")?;
                if !(1.0..=MAX_ROW_THRUST).contains(&v) {
                    return Err(format!("row {line}: thrust must be at least 1 N and at most 1 GN"));
                }
                row.thrust = Some(v);
            }
            _ => {
                if value.chars().count() > 24 {
                    return Err(format!("row {line}: tag is longer than 24 characters"));
                }
                row.tag = value.to_string();
            }
        }
    }
    // What each kind needs.
    if row.p.is_some() && row.z.is_some() {
        return Err(format!(
            "row {line}: p= is the design pressure at the fitting itself, so z= cannot correct it; give p= or z=, \
                    not both"
        ));
    }
    match row.kind {
        RowKind::Force => {
            if row.thrust.is_none() {
                return Err(format!("row {line}: a force row needs thrust=, e.g. thrust=40kN"));
            }
        }
        RowKind::Fitting(kind) => {
            if row.size.is_none() && (row.d.is_none() || row.od.is_none()) {
                return Err(format!(
                    "row {line}: give a size preset (e.g. di52_12) or both d= and od="
                ));
            }
            if kind == FittingKind::Bend && row.angle.is_none() {
                return Err(format!("row {line}: a bend needs its angle, e.g. 45deg"));
            }
            if matches!(kind, FittingKind::Tee | FittingKind::Reducer)
                && row.size2.is_none()
                && (row.d2.is_none() || row.od2.is_none())
            {
                return Err(format!(
                    "row {line}: a tee or reducer needs its second size (a preset, or d2= and od2=)"
                ));
            }
            if kind != FittingKind::Bend && row.angle.is_some() {
                return Err(format!("row {line}: only a bend takes an angle"));
            }
        }
    }
    Ok(row)
}

/// The key a bare token stands for.
pub(super) fn bare_key(row: &Row, token: &str, line: usize) -> Result<&'static str, String> {
    if pipe_sizes::find(token).is_some() {
        return Ok(if row.size.is_none() { "size" } else { "size2" });
    }
    if soil::soil(token).is_some() {
        return Ok("soil");
    }
    if units::parse_quantity(token, Q::Angle, "").is_ok() {
        return Ok("angle");
    }
    if units::parse_quantity(token, Q::Pressure, "").is_ok() {
        return Ok("p");
    }
    if units::parse_quantity(token, Q::Length, "").is_ok() {
        return Err(format!(
            "row {line}: a bare length '{}' is ambiguous; write d= (inside), od= (outside), h= or a size \
                    preset",
            short(token)
        ));
    }
    Err(format!(
        "row {line}: '{}' is neither key=value, an angle, a pressure, a size preset nor a soil preset",
        short(token)
    ))
}

pub(super) fn short(text: &str) -> String {
    let t: String = text.chars().take(30).collect();
    if text.chars().count() > 30 {
        format!("{t}…")
    } else {
        t
    }
}
