//! Full-precision numbers for CSV and JSON-like text: the shortest decimal that reads back as the
//! same f64, written exactly as Rust's `Display` for f64 writes it (no exponent; `1` for 1.0),
//! but through the `ryu` crate, which is several times faster on the long CSV of a diagram.

/// Appends `x` to `out` with the same characters as `format!("{x}")`.
pub fn push_f64(out: &mut String, x: f64) {
    if !x.is_finite() {
        use std::fmt::Write;
        let _ = write!(out, "{x}");
        return;
    }
    let mut buffer = ryu::Buffer::new();
    let text = buffer.format_finite(x);
    if !text.as_bytes().contains(&b'e') {
        // "d.ddd" as Display writes it, but "d.0" written "d".
        out.push_str(text.strip_suffix(".0").unwrap_or(text));
        return;
    }
    let (negative, text) = match text.strip_prefix('-') {
        Some(rest) => (true, rest),
        None => (false, text),
    };
    if negative {
        out.push('-');
    }
    // ryu writes "d.ddd", "d.dddeX" or "deX"; split into digits and the power of ten of the
    // first digit, then write them without an exponent.
    let Some((mantissa, exponent)) = text.split_once('e') else {
        out.push_str(text);
        return;
    };
    let exponent: i32 = exponent.parse().expect("ryu writes an integer exponent");
    let (int_part, frac_part) = mantissa.split_once('.').unwrap_or((mantissa, ""));
    let frac_part = if frac_part == "0" { "" } else { frac_part };
    // With an exponent ryu's mantissa has one digit before the point.
    let digits: String = [int_part, frac_part].concat();
    let point = 1 + exponent; // digits before the decimal point
    if point <= 0 {
        out.push_str("0.");
        out.extend(std::iter::repeat_n('0', (-point) as usize));
        out.push_str(&digits);
    } else if point as usize >= digits.len() {
        out.push_str(&digits);
        out.extend(std::iter::repeat_n('0', point as usize - digits.len()));
    } else {
        out.push_str(&digits[..point as usize]);
        out.push('.');
        out.push_str(&digits[point as usize..]);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn text(x: f64) -> String {
        let mut s = String::new();
        push_f64(&mut s, x);
        s
    }

    #[test]
    fn edge_values_match_display() {
        // Rust's own f64 Display is the reference (std documentation, common practice).
        for x in [
            0.0,
            -0.0,
            1.0,
            -1.0,
            0.1,
            12.5,
            1e-7,
            1.5e-300,
            f64::MIN_POSITIVE,
            5e-324,
            1e15,
            1e16,
            1.2345e20,
            f64::MAX,
            f64::MIN,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
            123456789.125,
        ] {
            assert_eq!(text(x), format!("{x}"), "{x:e}");
        }
    }

    proptest::proptest! {
        /// Any finite or non-finite f64 (from its bits) is written as Display writes it.
        #[test]
        fn every_f64_matches_display(bits in proptest::prelude::any::<u64>()) {
            let x = f64::from_bits(bits);
            proptest::prop_assert_eq!(text(x), format!("{x}"));
        }

        /// Values in the range diagrams and curves use.
        #[test]
        fn diagram_range_matches_display(x in -1.0e4f64..1.0e4) {
            proptest::prop_assert_eq!(text(x), format!("{x}"));
        }
    }
}
