//! The app icon, drawn at build time: a pipe bend with the thrust arrow that pushes
//! on it, white and amber on a deep teal tile. Our own simple design.
//!
//! The same geometry is written as SVG (for browsers that take vector icons) and
//! rasterised to PNG at the sizes the web app manifest lists, with a tiny PNG writer
//! (8-bit RGBA, one zlib stream, no filtering). Shapes are signed-distance
//! functions in a unit square with y down; coverage is estimated from the distance
//! at each pixel centre, which gives clean anti-aliased edges without a graphics
//! library.

use std::io::Write;

use flate2::write::ZlibEncoder;
use flate2::{Compression, Crc};

/// Background tile colour (also the manifest's theme and background colour).
pub const TILE: [u8; 3] = [0x1f, 0x4e, 0x5f];
const PIPE: [u8; 3] = [0xf4, 0xf7, 0xf8];
const THRUST: [u8; 3] = [0xf2, 0xa5, 0x3a];

/// Theme colour as a CSS hex string.
pub fn theme_colour() -> String {
    format!("#{:02x}{:02x}{:02x}", TILE[0], TILE[1], TILE[2])
}

// Geometry in a unit square, y down.
const PIPE_HALF_WIDTH: f64 = 0.085;
const INLET_START: [f64; 2] = [0.12, 0.34];
const BEND_CENTRE: [f64; 2] = [0.42, 0.62];
const BEND_RADIUS: f64 = 0.28;
const OUTLET_END: [f64; 2] = [0.70, 0.90];
const ARROW_FROM: [f64; 2] = [0.66, 0.38];
const ARROW_TIP: [f64; 2] = [0.86, 0.18];
const ARROW_HALF_WIDTH: f64 = 0.035;
const HEAD_LENGTH: f64 = 0.13;
const HEAD_HALF_WIDTH: f64 = 0.085;
const CORNER_RADIUS: f64 = 0.18;

/// The icon as an SVG document.
pub fn svg() -> String {
    let s = 512.0;
    let p = |v: [f64; 2]| format!("{:.1} {:.1}", v[0] * s, v[1] * s);
    let inlet_end = [BEND_CENTRE[0], BEND_CENTRE[1] - BEND_RADIUS];
    let outlet_start = [BEND_CENTRE[0] + BEND_RADIUS, BEND_CENTRE[1]];
    let (head_base, left, right) = arrow_head();
    format!(
        concat!(
            "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 512 512\">",
            "<rect width=\"512\" height=\"512\" rx=\"{rx:.1}\" fill=\"{tile}\"/>",
            "<path d=\"M{a} L{b} A{r:.1} {r:.1} 0 0 1 {c} L{d}\" fill=\"none\" stroke=\"{pipe}\" stroke-width=\"{w:.1}\" stroke-linecap=\"round\"/>",
            "<path d=\"M{f} L{hb}\" stroke=\"{thrust}\" stroke-width=\"{aw:.1}\" stroke-linecap=\"round\"/>",
            "<path d=\"M{l} L{t} L{rr} Z\" fill=\"{thrust}\"/>",
            "</svg>\n"
        ),
        rx = CORNER_RADIUS * s,
        tile = theme_colour(),
        a = p(INLET_START),
        b = p(inlet_end),
        r = BEND_RADIUS * s,
        c = p(outlet_start),
        d = p(OUTLET_END),
        pipe = hex(PIPE),
        w = 2.0 * PIPE_HALF_WIDTH * s,
        f = p(ARROW_FROM),
        hb = p(head_base),
        thrust = hex(THRUST),
        aw = 2.0 * ARROW_HALF_WIDTH * s,
        l = p(left),
        t = p(ARROW_TIP),
        rr = p(right),
    )
}

fn hex(c: [u8; 3]) -> String {
    format!("#{:02x}{:02x}{:02x}", c[0], c[1], c[2])
}

fn arrow_head() -> ([f64; 2], [f64; 2], [f64; 2]) {
    let dx = ARROW_TIP[0] - ARROW_FROM[0];
    let dy = ARROW_TIP[1] - ARROW_FROM[1];
    let len = dx.hypot(dy);
    let (ux, uy) = (dx / len, dy / len);
    let base = [ARROW_TIP[0] - ux * HEAD_LENGTH, ARROW_TIP[1] - uy * HEAD_LENGTH];
    let left = [base[0] - uy * HEAD_HALF_WIDTH, base[1] + ux * HEAD_HALF_WIDTH];
    let right = [base[0] + uy * HEAD_HALF_WIDTH, base[1] - ux * HEAD_HALF_WIDTH];
    (base, left, right)
}

/// Distance from `p` to the segment `a`–`b`.
fn segment_distance(p: [f64; 2], a: [f64; 2], b: [f64; 2]) -> f64 {
    let (abx, aby) = (b[0] - a[0], b[1] - a[1]);
    let (apx, apy) = (p[0] - a[0], p[1] - a[1]);
    let t = ((apx * abx + apy * aby) / (abx * abx + aby * aby)).clamp(0.0, 1.0);
    (apx - t * abx).hypot(apy - t * aby)
}

/// Signed distance to the pipe centre line (inlet leg, quarter arc, outlet leg)
/// minus the half width: negative inside the pipe.
fn pipe_distance(p: [f64; 2]) -> f64 {
    let inlet_end = [BEND_CENTRE[0], BEND_CENTRE[1] - BEND_RADIUS];
    let outlet_start = [BEND_CENTRE[0] + BEND_RADIUS, BEND_CENTRE[1]];
    let legs = segment_distance(p, INLET_START, inlet_end).min(segment_distance(p, outlet_start, OUTLET_END));
    // The arc runs from straight up (inlet end) to straight right (outlet start) of
    // the centre: the quadrant with dx >= 0 and dy <= 0.
    let (dx, dy) = (p[0] - BEND_CENTRE[0], p[1] - BEND_CENTRE[1]);
    let arc = if dx >= 0.0 && dy <= 0.0 {
        (dx.hypot(dy) - BEND_RADIUS).abs()
    } else {
        f64::INFINITY
    };
    legs.min(arc) - PIPE_HALF_WIDTH
}

/// Signed distance to the thrust arrow (shaft and triangular head).
fn arrow_distance(p: [f64; 2]) -> f64 {
    let (base, left, right) = arrow_head();
    let shaft = segment_distance(p, ARROW_FROM, base) - ARROW_HALF_WIDTH;
    shaft.min(triangle_distance(p, left, ARROW_TIP, right))
}

/// Signed distance to a triangle (negative inside).
fn triangle_distance(p: [f64; 2], a: [f64; 2], b: [f64; 2], c: [f64; 2]) -> f64 {
    let edge = segment_distance(p, a, b)
        .min(segment_distance(p, b, c))
        .min(segment_distance(p, c, a));
    let cross = |o: [f64; 2], u: [f64; 2], v: [f64; 2]| (u[0] - o[0]) * (v[1] - o[1]) - (u[1] - o[1]) * (v[0] - o[0]);
    let (d1, d2, d3) = (cross(a, b, p), cross(b, c, p), cross(c, a, p));
    let inside = (d1 >= 0.0 && d2 >= 0.0 && d3 >= 0.0) || (d1 <= 0.0 && d2 <= 0.0 && d3 <= 0.0);
    if inside {
        -edge
    } else {
        edge
    }
}

/// Signed distance to the rounded tile.
fn tile_distance(p: [f64; 2]) -> f64 {
    let (qx, qy) = (
        (p[0] - 0.5).abs() - (0.5 - CORNER_RADIUS),
        (p[1] - 0.5).abs() - (0.5 - CORNER_RADIUS),
    );
    qx.max(0.0).hypot(qy.max(0.0)) + qx.max(qy).min(0.0) - CORNER_RADIUS
}

/// The icon as straight RGBA pixels, `size` × `size`.
pub fn rasterise(size: u32) -> Vec<u8> {
    let n = size as usize;
    let pixel = 1.0 / size as f64;
    let coverage = |d: f64| (0.5 - d / pixel).clamp(0.0, 1.0);
    let mut rgba = Vec::with_capacity(n * n * 4);
    for y in 0..n {
        for x in 0..n {
            let p = [(x as f64 + 0.5) * pixel, (y as f64 + 0.5) * pixel];
            let mut colour = [TILE[0] as f64, TILE[1] as f64, TILE[2] as f64];
            for (shape, paint) in [(pipe_distance(p), PIPE), (arrow_distance(p), THRUST)] {
                let a = coverage(shape);
                for (c, v) in colour.iter_mut().zip(paint) {
                    *c = *c * (1.0 - a) + v as f64 * a;
                }
            }
            let alpha = coverage(tile_distance(p));
            rgba.extend(colour.iter().map(|c| c.round() as u8));
            rgba.push((alpha * 255.0).round() as u8);
        }
    }
    rgba
}

/// Encodes straight RGBA pixels as a PNG file.
pub fn encode_png(width: u32, height: u32, rgba: &[u8]) -> Vec<u8> {
    let row = width as usize * 4;
    let mut raw = Vec::with_capacity((row + 1) * height as usize);
    for line in rgba.chunks(row) {
        raw.push(0); // filter type: none
        raw.extend_from_slice(line);
    }
    let mut zlib = ZlibEncoder::new(Vec::new(), Compression::best());
    // Writing to a Vec cannot fail.
    let _ = zlib.write_all(&raw);
    let idat = zlib.finish().unwrap_or_default();

    let mut ihdr = Vec::with_capacity(13);
    ihdr.extend_from_slice(&width.to_be_bytes());
    ihdr.extend_from_slice(&height.to_be_bytes());
    ihdr.extend_from_slice(&[8, 6, 0, 0, 0]); // 8-bit depth, RGBA, deflate, no filter set, no interlace

    let mut png = b"\x89PNG\r\n\x1a\n".to_vec();
    for (kind, data) in [(b"IHDR", &ihdr[..]), (b"IDAT", &idat[..]), (b"IEND", &[][..])] {
        png.extend_from_slice(&(data.len() as u32).to_be_bytes());
        let mut crc = Crc::new();
        crc.update(kind);
        crc.update(data);
        png.extend_from_slice(kind);
        png.extend_from_slice(data);
        png.extend_from_slice(&crc.sum().to_be_bytes());
    }
    png
}

/// The PNG icon at `size` pixels square.
pub fn png(size: u32) -> Vec<u8> {
    encode_png(size, size, &rasterise(size))
}

#[cfg(test)]
mod tests {
    use super::*;
    use flate2::read::ZlibDecoder;
    use std::io::Read;

    /// Reads back the chunks of a PNG, checking each CRC.
    fn chunks(png: &[u8]) -> Vec<([u8; 4], Vec<u8>)> {
        assert_eq!(&png[..8], b"\x89PNG\r\n\x1a\n");
        let mut out = Vec::new();
        let mut at = 8;
        while at < png.len() {
            let len = u32::from_be_bytes([png[at], png[at + 1], png[at + 2], png[at + 3]]) as usize;
            let kind: [u8; 4] = [png[at + 4], png[at + 5], png[at + 6], png[at + 7]];
            let data = png[at + 8..at + 8 + len].to_vec();
            let crc = u32::from_be_bytes([
                png[at + 8 + len],
                png[at + 9 + len],
                png[at + 10 + len],
                png[at + 11 + len],
            ]);
            let mut check = Crc::new();
            check.update(&kind);
            check.update(&data);
            assert_eq!(check.sum(), crc, "CRC of {}", String::from_utf8_lossy(&kind));
            out.push((kind, data));
            at += 12 + len;
        }
        out
    }

    #[test]
    fn png_round_trips_through_its_own_chunks() {
        let size = 48;
        let rgba = rasterise(size);
        let png = encode_png(size, size, &rgba);
        let chunks = chunks(&png);
        let kinds: Vec<&[u8]> = chunks.iter().map(|(k, _)| &k[..]).collect();
        assert_eq!(kinds, [&b"IHDR"[..], b"IDAT", b"IEND"]);
        assert_eq!(&chunks[0].1[..8], &[0, 0, 0, 48, 0, 0, 0, 48]);
        let mut raw = Vec::new();
        ZlibDecoder::new(&chunks[1].1[..])
            .read_to_end(&mut raw)
            .expect("valid zlib stream");
        assert_eq!(raw.len(), (48 * 4 + 1) * 48);
        let unfiltered: Vec<u8> = raw.chunks(48 * 4 + 1).flat_map(|r| r[1..].to_vec()).collect();
        assert_eq!(unfiltered, rgba);
    }

    #[test]
    fn icon_shows_tile_pipe_and_arrow_with_transparent_corners() {
        let size = 256u32;
        let rgba = rasterise(size);
        let at = |x: f64, y: f64| {
            let i = ((y * size as f64) as usize * size as usize + (x * size as f64) as usize) * 4;
            [rgba[i], rgba[i + 1], rgba[i + 2], rgba[i + 3]]
        };
        assert_eq!(at(0.0, 0.0)[3], 0, "corner outside the rounded tile");
        assert_eq!(at(0.1, 0.9), [TILE[0], TILE[1], TILE[2], 255], "plain tile");
        assert_eq!(at(0.25, 0.34), [PIPE[0], PIPE[1], PIPE[2], 255], "on the inlet leg");
        let arc_45 = [
            BEND_CENTRE[0] + BEND_RADIUS * std::f64::consts::FRAC_1_SQRT_2,
            BEND_CENTRE[1] - BEND_RADIUS * std::f64::consts::FRAC_1_SQRT_2,
        ];
        assert_eq!(at(arc_45[0], arc_45[1]), [PIPE[0], PIPE[1], PIPE[2], 255], "on the arc");
        assert_eq!(
            at(0.72, 0.32),
            [THRUST[0], THRUST[1], THRUST[2], 255],
            "on the arrow shaft"
        );
    }

    #[test]
    fn svg_is_one_self_contained_document() {
        let svg = svg();
        assert!(svg.starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\""));
        assert!(svg.trim_end().ends_with("</svg>"));
        assert!(!svg.contains("href"), "no external references");
        assert!(svg.contains(&theme_colour()));
    }
}
