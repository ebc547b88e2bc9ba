//! The page link as a QR code, drawn offline as one SVG path.
//!
//! The printed calculation sheet carries its own link as a QR code, so a reviewer
//! can open the same case from paper. The symbol is made by the `qrcodegen` crate
//! (Project Nayuki, an implementation of ISO/IEC 18004), at error-correction level
//! M (about 15 % of the codewords may be lost), with the smallest version that
//! holds the text. This module only turns its module matrix into an SVG path: one
//! `M x y h1 v1 h-1 z` square per dark module, in module units, so the page scales
//! it with a `viewBox` of `0 0 size size` (plus the quiet zone it adds). No
//! network, no image files: the path is text like the rest of the page.

use qrcodegen::{QrCode, QrCodeEcc};
use serde::Serialize;

/// A QR symbol as the page draws it: `size` modules a side and the SVG path of the
/// dark modules, or `ok: false` with a message when the text is too long for any
/// QR version (more than about 2 300 bytes at level M).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct QrView {
    pub ok: bool,
    pub size: i32,
    pub path: String,
    pub message: String,
}

/// The dark modules of the QR symbol for `text`, row by row (`true` = dark), or
/// `None` when the text does not fit in the largest version.
pub fn matrix(text: &str) -> Option<Vec<Vec<bool>>> {
    let code = QrCode::encode_text(text, QrCodeEcc::Medium).ok()?;
    let size = code.size();
    Some(
        (0..size)
            .map(|y| (0..size).map(|x| code.get_module(x, y)).collect())
            .collect(),
    )
}

/// The SVG path of a module matrix: one unit square per dark module.
pub fn svg_path(modules: &[Vec<bool>]) -> String {
    let mut path = String::new();
    for (y, row) in modules.iter().enumerate() {
        for (x, dark) in row.iter().enumerate() {
            if *dark {
                path.push_str(&format!("M{x} {y}h1v1h-1z"));
            }
        }
    }
    path
}

/// The QR symbol of `text` as the page draws it.
pub fn qr_view(text: &str) -> QrView {
    match matrix(text) {
        Some(modules) => QrView {
            ok: true,
            size: i32::try_from(modules.len()).unwrap_or(0),
            path: svg_path(&modules),
            message: String::new(),
        },
        None => QrView {
            ok: false,
            size: 0,
            path: String::new(),
            message: "The link is too long for a QR code; use the printed link.".to_string(),
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The finder pattern of ISO/IEC 18004 (7 × 7: dark ring, light ring, dark 3 × 3
    /// centre), written out here independently of the encoder.
    fn finder(x: usize, y: usize) -> bool {
        let ring = x.min(y).min(6 - x).min(6 - y);
        ring != 1
    }

    /// Reads an SVG path written by [`svg_path`] back into a matrix.
    fn read_path(path: &str, size: usize) -> Vec<Vec<bool>> {
        let mut modules = vec![vec![false; size]; size];
        for square in path.split('M').filter(|s| !s.is_empty()) {
            let corner = square.strip_suffix("h1v1h-1z").expect("a unit square");
            let (x, y) = corner.split_once(' ').expect("x y");
            modules[y.parse::<usize>().expect("y")][x.parse::<usize>().expect("x")] = true;
        }
        modules
    }

    #[test]
    fn the_symbol_has_the_standard_structure() {
        let link = "https://fluxledger.example/thrust-block.html?p=150psi&d=12in&system=us&project=Main St/Phase 2";
        let modules = matrix(link).expect("fits");
        let size = modules.len();
        // Sizes are 17 + 4 × version modules.
        assert_eq!((size - 17) % 4, 0, "size {size}");
        // About 100 bytes at level M need version 5 or more (version 4-M holds 62 bytes).
        assert!(size >= 17 + 4 * 5, "size {size}");
        for (ox, oy) in [(0, 0), (size - 7, 0), (0, size - 7)] {
            for y in 0..7 {
                for x in 0..7 {
                    assert_eq!(
                        modules[oy + y][ox + x],
                        finder(x, y),
                        "finder at ({ox},{oy}) + ({x},{y})"
                    );
                }
            }
        }
        // Timing patterns: row 6 and column 6 alternate dark/light between the finders.
        for i in 8..size - 8 {
            assert_eq!(modules[6][i], i % 2 == 0, "timing row at {i}");
            assert_eq!(modules[i][6], i % 2 == 0, "timing column at {i}");
        }
        // The dark module beside the lower-left finder.
        assert!(modules[size - 8][8]);
    }

    #[test]
    fn the_path_draws_exactly_the_dark_modules() {
        let modules = matrix("HELLO WORLD").expect("fits");
        let view = qr_view("HELLO WORLD");
        assert!(view.ok);
        assert_eq!(view.size as usize, modules.len());
        // 11 alphanumeric characters fit version 1 (21 × 21) at level M.
        assert_eq!(view.size, 21);
        assert_eq!(read_path(&view.path, modules.len()), modules);
    }

    #[test]
    fn text_too_long_is_refused_with_a_message() {
        let view = qr_view(&"é".repeat(3000));
        assert!(!view.ok);
        assert!(view.path.is_empty());
        assert!(view.message.contains("too long"));
    }
}
