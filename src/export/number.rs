//! Fast number text for the large outputs (sweep rows), in the layout of `format!("{v}")`
//! for an `f64`: the shortest digits that parse back to the same number, written without
//! an exponent, at a fraction of the cost. The digits come from `zmij` (Schubfach shortest
//! round-trip digits); only the layout is redone here. Where two digit strings of the
//! same shortest length both parse back to the number, the last digit may differ from the
//! standard library's choice: the value read back is the same.

/// Appends `v` to `out` in the layout of `write!(out, "{v}")`.
pub fn push_f64(out: &mut String, v: f64) {
    if !v.is_finite() {
        out.push_str(if v.is_nan() {
            "NaN"
        } else if v > 0.0 {
            "inf"
        } else {
            "-inf"
        });
        return;
    }
    let mut buf = zmij::Buffer::new();
    let text = buf.format_finite(v);
    if text.as_bytes().contains(&b'e') {
        layout(text, out);
    } else {
        // Plain already (1e-5 ≤ |v| < 1e16): only a whole number's ".0" goes.
        out.push_str(text.strip_suffix(".0").unwrap_or(text));
    }
}

/// Re-lays a shortest round-trip text in scientific or plain form (`-1.5e-7`, `2750.0`)
/// as plain decimal without trailing zeros (`-0.00000015`, `2750`).
fn layout(text: &str, out: &mut String) {
    let (negative, body) = match text.strip_prefix('-') {
        Some(rest) => (true, rest),
        None => (false, text),
    };
    let (mantissa, exp) = match body.split_once('e') {
        Some((m, e)) => (m, e.trim_start_matches('+').parse::<i32>().unwrap_or(0)),
        None => (body, 0),
    };
    let (int, frac) = mantissa.split_once('.').unwrap_or((mantissa, ""));
    // All the digits (at most 17 significant, plus a few zeros), and where the decimal
    // point falls among them.
    let mut digits = [0u8; 64];
    let all = int.bytes().chain(frac.bytes());
    let mut n = 0;
    for d in all {
        if n == digits.len() {
            // Not a layout this function knows: let the standard library write it.
            use std::fmt::Write as _;
            let _ = write!(out, "{}", text.parse::<f64>().unwrap_or(f64::NAN));
            return;
        }
        digits[n] = d;
        n += 1;
    }
    let mut point = int.len() as i32 + exp;
    let lead = digits[..n].iter().take_while(|&&d| d == b'0').count();
    point -= lead as i32;
    let mut sig = &digits[lead..n];
    while let [rest @ .., b'0'] = sig {
        sig = rest;
    }
    if negative {
        out.push('-');
    }
    let push = |out: &mut String, d: &[u8]| d.iter().for_each(|&c| out.push(c as char));
    let n = sig.len() as i32;
    if n == 0 {
        out.push('0');
    } else if point <= 0 {
        out.push_str("0.");
        out.extend(std::iter::repeat_n('0', (-point) as usize));
        push(out, sig);
    } else if point >= n {
        push(out, sig);
        out.extend(std::iter::repeat_n('0', (point - n) as usize));
    } else {
        push(out, &sig[..point as usize]);
        out.push('.');
        push(out, &sig[point as usize..]);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    /// The text parses back to the same number, with as many significant digits as the
    /// standard library writes and in its layout (sign, no exponent, no trailing ".0").
    fn same_as_display(v: f64) {
        let mut s = String::new();
        push_f64(&mut s, v);
        let std = format!("{v}");
        let bits = v.to_bits();
        if v.is_nan() {
            assert_eq!(s, "NaN");
            return;
        }
        assert_eq!(s.parse::<f64>().unwrap().to_bits(), bits, "{s} vs {std}");
        let shape = |t: &str| {
            let sig: String = t.chars().filter(|c| c.is_ascii_digit()).collect();
            let sig = sig.trim_start_matches('0').trim_end_matches('0').len();
            (t.starts_with('-'), t.find('.'), t.len(), sig)
        };
        assert_eq!(shape(&s), shape(&std), "bits {bits:#x}: {s} vs {std}");
        // Mostly the very same text; a differing last digit only where both round-trip.
        if s != std {
            assert_eq!(s[..s.len() - 1], std[..std.len() - 1], "bits {bits:#x}");
        }
    }

    #[test]
    fn special_and_edge_values_read_back_exactly_in_the_standard_layout() {
        for v in [
            0.0,
            -0.0,
            1.0,
            -1.0,
            2750.0000000000005,
            0.1,
            1e-7,
            1.5e-7,
            123456789.0,
            1e21,
            1e22,
            1.7976931348623157e308,
            5e-324,
            f64::MIN_POSITIVE,
            0.30000000000000004,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
        ] {
            same_as_display(v);
        }
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(20_000))]
        #[test]
        fn any_bit_pattern_reads_back_exactly_in_the_standard_layout(bits in any::<u64>()) {
            same_as_display(f64::from_bits(bits));
        }

        #[test]
        fn engineering_magnitudes_read_back_exactly_in_the_standard_layout(
            v in -1e7f64..1e7, e in -12i32..12,
        ) {
            same_as_display(v * 10f64.powi(e));
        }
    }
}
