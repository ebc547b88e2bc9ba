//! Decimal number text read into `f64`, without the standard library's parser.
//!
//! Why a reader of our own: `str::parse::<f64>` is correctly rounded for every
//! input, and pays for it with a 10 kB table of 128-bit powers of five and a
//! big-number fallback. In a page's wasm module that is about 13 kB of the 103 kB
//! Brotli the page downloads before a link's first result (issue 9; measured in
//! DEVELOPERS.md, "Module size"). What people type into a calculator is short, so
//! this reader takes the exact path for it and an approximate one for the rest:
//!
//! - **Exact** (the same `f64` as `str::parse`, bit for bit): at most 15
//!   significant digits, or more that still form an integer `w ≤ 2⁵³`, with the
//!   decimal exponent `q` of `w × 10^q` in −22 ..= 22, or above 22 while
//!   `w × 10^(q−22)` stays an integer `≤ 2⁵³`. Both operands of the one
//!   multiplication or division are then exact in `f64`, so IEEE 754's single
//!   rounding is the correctly rounded result (Clinger, "How to read floating
//!   point numbers accurately", PLDI 1990, the "fast path").
//! - **Nearly exact** (every other finite input: 16 or more significant digits,
//!   pasted from a spreadsheet, or an exponent beyond that range): `w` (its
//!   first 19 digits) scaled by powers of ten in 64-bit binary arithmetic, then
//!   rounded once to `f64` ([`approximate`]). It differs from `str::parse` only
//!   for a value within 2⁻⁵⁹ of a halfway point between two `f64`, and then by one
//!   unit in the last place (a relative error below 2.3 × 10⁻¹⁶): the tests bound
//!   it at one unit over generated inputs, far below any input's own precision
//!   and any figure a page shows (four significant digits).
//!
//! Grammar (what `str::parse::<f64>` accepts, less `inf`, `infinity` and `nan`):
//! an optional sign, digits with at most one `.` (at least one digit in all), and
//! an optional exponent `e` or `E`, an optional sign and at least one digit.
//! Text outside it is `None`. A value beyond `f64`'s range reads as infinity, as
//! `str::parse` reads it; the callers refuse it by name.

/// The powers of ten that `f64` holds exactly: 10⁰ ..= 10²² (5²² < 2⁵³).
const EXACT_POWERS_OF_TEN: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20,
    1e21, 1e22,
];

/// The largest integer below which every integer is exact in `f64`.
const EXACT_INTEGER_LIMIT: u64 = 1 << 53;

/// Significant digits kept in the integer `w` (10¹⁹ − 1 < 2⁶⁴).
const KEPT_DIGITS: u32 = 19;

/// Reads decimal number text (see the module docs for what it accepts and how
/// exactly). `None` for text outside the grammar.
pub fn parse_decimal(text: &str) -> Option<f64> {
    let bytes = text.as_bytes();
    let (negative, mut at) = match bytes.first() {
        Some(b'-') => (true, 1),
        Some(b'+') => (false, 1),
        _ => (false, 0),
    };
    // w: the first KEPT_DIGITS significant digits; the value is w × 10^scale.
    let mut w: u64 = 0;
    let mut kept = 0u32;
    let mut truncated = false;
    let mut scale: i64 = 0;
    let mut digits = 0usize;
    let mut seen_point = false;
    while let Some(&byte) = bytes.get(at) {
        match byte {
            b'0'..=b'9' => {
                digits += 1;
                let digit = u64::from(byte - b'0');
                if kept < KEPT_DIGITS {
                    if w > 0 || digit > 0 {
                        w = w * 10 + digit;
                        kept += 1;
                    }
                    if seen_point {
                        scale -= 1;
                    }
                } else {
                    // A digit beyond those kept: it shifts w's place value
                    // before the point, and only rounds after it.
                    truncated |= digit > 0;
                    if !seen_point {
                        scale += 1;
                    }
                }
            }
            b'.' if !seen_point => seen_point = true,
            _ => break,
        }
        at += 1;
    }
    if digits == 0 {
        return None;
    }
    if let Some(b'e' | b'E') = bytes.get(at) {
        at += 1;
        let exponent_negative = match bytes.get(at) {
            Some(b'-') => {
                at += 1;
                true
            }
            Some(b'+') => {
                at += 1;
                false
            }
            _ => false,
        };
        let start = at;
        let mut exponent: i64 = 0;
        while let Some(&byte) = bytes.get(at).filter(|b| b.is_ascii_digit()) {
            // Saturates far beyond f64's range; a larger exponent reads the same.
            exponent = (exponent * 10 + i64::from(byte - b'0')).min(1_000_000);
            at += 1;
        }
        if at == start {
            return None;
        }
        scale += if exponent_negative { -exponent } else { exponent };
    }
    if at != bytes.len() {
        return None;
    }
    let magnitude = scaled(w, scale, truncated);
    Some(if negative { -magnitude } else { magnitude })
}

/// `w × 10^scale` as `f64`: exact on Clinger's fast path, else [`approximate`].
fn scaled(w: u64, scale: i64, truncated: bool) -> f64 {
    if w == 0 {
        return 0.0;
    }
    if !truncated && w <= EXACT_INTEGER_LIMIT {
        if let Ok(q) = usize::try_from(scale) {
            if let Some(&power) = EXACT_POWERS_OF_TEN.get(q) {
                return w as f64 * power;
            }
            // q > 22: exact while w × 10^(q − 22) is still an exact integer.
            let shifted = u32::try_from(q - 22)
                .ok()
                .and_then(|extra| 10u64.checked_pow(extra))
                .and_then(|factor| w.checked_mul(factor))
                .filter(|&product| product <= EXACT_INTEGER_LIMIT);
            if let Some(product) = shifted {
                return product as f64 * EXACT_POWERS_OF_TEN[22];
            }
        } else if let Some(&power) = usize::try_from(-scale).ok().and_then(|q| EXACT_POWERS_OF_TEN.get(q)) {
            return w as f64 / power;
        }
    }
    approximate(w, scale)
}

/// 5²⁷, the largest power of five below 2⁶³.
const MAX_STEP: i64 = 27;

/// `w × 10^scale` in binary floating point with a 64-bit significand `m × 2^e2`:
/// each step multiplies or divides by `5^k × 2^k` (k ≤ 27) in 128-bit integer
/// arithmetic, keeps the top 64 bits and folds what is cut into the lowest bit.
/// Each step is off by less than 2⁻⁶³ of the value, at most 13 steps less than
/// 2⁻⁵⁹, so the final rounding to `f64`'s 53 bits is the correct one unless the
/// value lies that close to a halfway point (then it is one unit in the last
/// place off at most).
fn approximate(w: u64, scale: i64) -> f64 {
    let zeros = w.leading_zeros();
    let (mut m, mut e2) = (w << zeros, -i64::from(zeros));
    let mut remaining = scale;
    while remaining != 0 && e2.abs() < 4_000 {
        let k = remaining.abs().min(MAX_STEP);
        let power = u128::from(5u64.pow(k as u32));
        let (wide, cut, shift) = if remaining > 0 {
            (u128::from(m) * power, false, 64 + k)
        } else {
            let numerator = u128::from(m) << 64;
            (numerator / power, numerator % power != 0, -k)
        };
        let top = wide.leading_zeros();
        let normalised = wide << top;
        m = (normalised >> 64) as u64 | u64::from(cut || normalised as u64 != 0);
        e2 += shift - i64::from(top);
        remaining -= remaining.signum() * k;
    }
    times_power_of_two(m as f64, e2)
}

/// `value × 2^exponent`, exact while the result is a normal `f64`; beyond the
/// range infinity or zero.
fn times_power_of_two(mut value: f64, mut exponent: i64) -> f64 {
    let power = |n: i64| f64::from_bits(((n + 1023) as u64) << 52);
    while exponent > 1000 && value.is_finite() {
        value *= power(1000);
        exponent -= 1000;
    }
    while exponent < -1000 && value != 0.0 {
        value *= power(-1000);
        exponent += 1000;
    }
    value * power(exponent.clamp(-1022, 1023))
}

#[cfg(test)]
mod tests {
    use super::parse_decimal;
    use crate::test_random::TestRandom;

    /// Units in the last place between two positive finite `f64`.
    fn ulps(a: f64, b: f64) -> u64 {
        a.to_bits().abs_diff(b.to_bits())
    }

    /// Decimal text of `digits` random digits with a point at a random place (or
    /// none) and a random exponent in `exponents` (or none), drawn from the tests'
    /// shared deterministic generator.
    fn number(random: &mut TestRandom, digits: u64, exponents: i64) -> String {
        let mut text: String = (0..digits).map(|_| char::from(b'0' + random.below(10) as u8)).collect();
        if random.below(3) > 0 {
            let at = random.below(digits + 1) as usize;
            text.insert(at, '.');
        }
        if exponents > 0 && random.below(2) == 0 {
            let exponent = random.below(2 * exponents as u64 + 1) as i64 - exponents;
            text.push_str(&format!("e{exponent}"));
        }
        if random.below(4) == 0 {
            text.insert(0, '-');
        }
        text
    }

    /// Text as people type it: the exact path gives `str::parse`'s value (the
    /// standard library's correctly rounded reader, an independent path) bit for
    /// bit.
    #[test]
    fn typed_numbers_read_exactly_as_the_standard_library_reads_them() {
        let typed = [
            "0",
            "-0",
            "+0",
            "12",
            "12.5",
            "0.1",
            "0.3",
            "300",
            "1,5",
            "16.7",
            "1e5",
            "1E5",
            "1.5e-7",
            "2.5E+3",
            ".5",
            "5.",
            "-.5",
            "007",
            "0.000125",
            "101325",
            "999999999999999",
            "9007199254740992",
            "1e22",
            "1e23",
            "123456789e15",
            "3.14159265358979",
            "1e-22",
            "4.2e-5",
            "0.0",
            "00.00e0",
            "1e0000000000000000000001",
        ];
        for text in typed {
            match (parse_decimal(text), text.parse::<f64>().ok()) {
                (Some(ours), Some(std)) => assert_eq!(ours.to_bits(), std.to_bits(), "{text}: {ours} vs {std}"),
                (None, None) => {}
                (ours, std) => panic!("{text}: ours {ours:?}, the standard library's {std:?}"),
            }
        }
    }

    /// Up to 15 digits with exponents within ±22 of the point: always the exact
    /// path, so every one equals `str::parse` bit for bit.
    #[test]
    fn generated_short_numbers_read_exactly() {
        let mut random = TestRandom::new(0x9e37_79b9_7f4a_7c15);
        for _ in 0..200_000 {
            let digits = 1 + random.below(15);
            let text = number(&mut random, digits, 7);
            let std: f64 = text.parse().expect("generated text is a number");
            let ours = parse_decimal(&text).expect("generated text is a number");
            assert_eq!(ours.to_bits(), std.to_bits(), "{text}");
        }
    }

    /// Long and far-scaled numbers take the nearly exact path: within one unit in
    /// the last place of `str::parse` (and mostly equal), infinite where it is.
    #[test]
    fn generated_long_and_far_scaled_numbers_read_within_one_ulp() {
        let mut random = TestRandom::new(0x2545_f491_4f6c_dd1d);
        let (mut differing, mut approximate) = (0, 0);
        for _ in 0..200_000 {
            let digits = 1 + random.below(30);
            let text = number(&mut random, digits, 300);
            let std: f64 = text.parse().expect("generated text is a number");
            let ours = parse_decimal(&text).expect("generated text is a number");
            if std.is_infinite() || std == 0.0 || std.abs() < f64::MIN_POSITIVE {
                // Beyond the range both read infinity; subnormals and underflow
                // are far below any field's range: only the sign and class must agree.
                assert_eq!(ours.is_infinite(), std.is_infinite(), "{text}: {ours} vs {std}");
                continue;
            }
            assert_eq!(ours.is_sign_negative(), std.is_sign_negative(), "{text}");
            let off = ulps(ours.abs(), std.abs());
            assert!(off <= 1, "{text}: {ours} vs {std}");
            differing += usize::from(off > 0);
            approximate += usize::from(digits > 15);
        }
        assert!(
            approximate > 50_000,
            "the generator hardly reaches the approximate path: {approximate}"
        );
        // Within 2⁻⁵⁹ of a halfway point is 1 in 64 of the values at most; this
        // generator's inputs differ far less often (93 of them when written).
        assert!(
            differing < 500,
            "{differing} of {approximate} differ from the correctly rounded value"
        );
    }

    /// Text outside the grammar is refused, as `str::parse` refuses it; the
    /// standard library's words for infinity and not-a-number are refused too.
    #[test]
    fn text_that_is_not_a_number_is_refused() {
        for text in [
            "", "-", "+", ".", "e5", "1e", "1e+", "1.2.3", "1..2", "--1", "1 ", " 1", "1x", "0x10", "1_000",
        ] {
            assert!(parse_decimal(text).is_none(), "{text}");
            assert!(text.parse::<f64>().is_err(), "{text}: the standard library reads it");
        }
        for text in ["inf", "-infinity", "NaN", "nan"] {
            assert!(parse_decimal(text).is_none(), "{text}");
        }
        assert_eq!(parse_decimal("1e400"), Some(f64::INFINITY));
        assert_eq!(parse_decimal("-1e400"), Some(f64::NEG_INFINITY));
    }
}
