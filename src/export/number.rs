//! Fast number text for the large outputs (sweep rows), in the layout of `format!("{v}")`
//! for an `f64`: the shortest digits that parse back to the same number, written without
//! an exponent, at a fraction of the cost. The digits come from `zmij` (Schubfach shortest
//! round-trip digits); only the layout is redone here. Where two digit strings of the
//! same shortest length both parse back to the number, the last digit may differ from the
//! standard library's choice: the value read back is the same.

/// Appends `v` to `out` in the layout of `write!(out, "{v}")`.
pub fn push_f64(out: &mut Vec<u8>, v: f64) {
    if !v.is_finite() {
        out.extend_from_slice(if v.is_nan() {
            b"NaN"
        } else if v > 0.0 {
            b"inf"
        } else {
            b"-inf"
        });
        return;
    }
    let mut buf = zmij::Buffer::new();
    let text = buf.format_finite(v).as_bytes();
    // An exponent ("e-7", "e+16", "e-308") sits in the last five bytes; digits hold no 'e'.
    if text[text.len().saturating_sub(5)..].contains(&b'e') {
        layout(text, out);
    } else {
        // Plain already (1e-5 ≤ |v| < 1e16): only a whole number's ".0" goes.
        out.extend_from_slice(text.strip_suffix(b".0").unwrap_or(text));
    }
}

/// `t` before and after the first `at`, if any.
fn split(t: &[u8], at: u8) -> (&[u8], Option<&[u8]>) {
    match t.iter().position(|&c| c == at) {
        Some(k) => (&t[..k], Some(&t[k + 1..])),
        None => (t, None),
    }
}

/// Re-lays a shortest round-trip text in scientific or plain form (`-1.5e-7`, `2750.0`)
/// as plain decimal without trailing zeros (`-0.00000015`, `2750`).
fn layout(text: &[u8], out: &mut Vec<u8>) {
    let (negative, body) = match text.strip_prefix(b"-") {
        Some(rest) => (true, rest),
        None => (false, text),
    };
    let (mantissa, exp) = match split(body, b'e') {
        (m, Some(e)) => (
            m,
            std::str::from_utf8(e)
                .ok()
                .and_then(|e| e.trim_start_matches('+').parse::<i32>().ok())
                .unwrap_or(0),
        ),
        (m, None) => (m, 0),
    };
    let (int, frac) = split(mantissa, b'.');
    let frac = frac.unwrap_or(b"");
    // All the digits (at most 17 significant, plus a few zeros), and where the decimal
    // point falls among them.
    let mut digits = [0u8; 64];
    let all = int.iter().chain(frac);
    let mut n = 0;
    for &d in all {
        if n == digits.len() {
            // Not a layout this function knows: let the standard library write it.
            use std::io::Write as _;
            let v = std::str::from_utf8(text)
                .ok()
                .and_then(|t| t.parse::<f64>().ok())
                .unwrap_or(f64::NAN);
            let _ = write!(out, "{v}");
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
        out.push(b'-');
    }
    let n = sig.len() as i32;
    if n == 0 {
        out.push(b'0');
    } else if point <= 0 {
        out.extend_from_slice(b"0.");
        out.extend(std::iter::repeat_n(b'0', (-point) as usize));
        out.extend_from_slice(sig);
    } else if point >= n {
        out.extend_from_slice(sig);
        out.extend(std::iter::repeat_n(b'0', (point - n) as usize));
    } else {
        out.extend_from_slice(&sig[..point as usize]);
        out.push(b'.');
        out.extend_from_slice(&sig[point as usize..]);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    /// The text parses back to the same number, with as many significant digits as the
    /// standard library writes and in its layout (sign, no exponent, no trailing ".0").
    fn same_as_display(v: f64) {
        let mut s = Vec::new();
        push_f64(&mut s, v);
        let s = String::from_utf8(s).expect("ASCII");
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
