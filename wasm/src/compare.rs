//! The difference and ratio of one headline result between two cases, formatted by
//! the core's rules so the page formats no numbers.
//!
//! Both values are the core's own SI values of the same output (`si` of the solve
//! view). The difference is `current − pinned` shown in the unit the current case
//! shows (a unit with an offset, such as °C, is a difference of temperature: the
//! offset cancels), four significant figures; the ratio is `current / pinned`, four
//! significant figures, or "—" when the pinned value is zero.

use fluxledger_core::units::{find_unit, format_significant};
use serde::Serialize;

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DifferenceView {
    /// `current − pinned` with the unit id (`"-12.50 kN"`), or "—".
    pub difference: String,
    /// `current / pinned` (`"0.9231"`), or "—".
    pub ratio: String,
}

/// The difference and ratio of `current` against `pinned` (SI values), the
/// difference shown in `unit_id` (`"-"` or an unknown id: a plain number).
pub fn difference_view(pinned: f64, current: f64, unit_id: &str) -> DifferenceView {
    let delta = current - pinned;
    let difference = match find_unit(unit_id) {
        Some(def) if delta.is_finite() && def.factor != 0.0 && def.id != "-" => {
            format!("{} {}", format_significant(delta / def.factor, 4), def.id)
        }
        Some(def) if def.factor != 0.0 => format_significant(delta / def.factor, 4),
        _ => format_significant(delta, 4),
    };
    let ratio = if pinned != 0.0 {
        format_significant(current / pinned, 4)
    } else {
        "—".to_string()
    };
    DifferenceView { difference, ratio }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn differences_are_in_the_shown_unit() {
        // 10 kN against 12 kN (SI newtons): +2 kN, ratio 1.2.
        let view = difference_view(10_000.0, 12_000.0, "kN");
        assert_eq!(view.difference, "2.000 kN");
        assert_eq!(view.ratio, "1.200");
        // 1 lbf = 4.4482216152605 N exactly (NIST SP 811): 100 lbf less.
        let view = difference_view(444.822_161_526_05, 0.0, "lbf");
        assert_eq!(view.difference, "-100.0 lbf");
        assert_eq!(view.ratio, "0");
        // A temperature difference: the offset of °C cancels (20 °C to 25 °C is 5 K).
        let view = difference_view(293.15, 298.15, "degC");
        assert!(view.difference.starts_with("5.000 "), "{}", view.difference);
    }

    #[test]
    fn a_zero_pinned_value_has_no_ratio() {
        let view = difference_view(0.0, 3.0, "-");
        assert_eq!(view.ratio, "—");
        assert_eq!(view.difference, "3.000");
    }
}
