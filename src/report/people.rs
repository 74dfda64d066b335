/*!
Numbers for people (`interface.md`: `explain` and the brief print 4 significant digits; CSV
and JSON are data and keep full precision). One place rounds, so that `explain` and the brief
show the same number the same way.
*/

/// Significant digits of people-facing numbers (`interface.md`).
pub const SIGNIFICANT: usize = 4;

/// `v` rounded to `digits` significant digits, in plain decimal notation (no exponent), with
/// trailing zeros after the decimal point removed: `0.012345` → `0.01235`, `1480634.9` →
/// `1481000`, `2.0` → `2`. With `group`, the integer part carries thousands separators
/// (`1,481,000`). Non-finite numbers give `None` (the caller says in words why there is no
/// number, never "null" or "NaN").
pub fn sig(v: f64, digits: usize, group: bool) -> Option<String> {
    if !v.is_finite() {
        return None;
    }
    let digits = digits.max(1) as i32;
    if v == 0.0 {
        return Some("0".into());
    }
    let mut exp = v.abs().log10().floor() as i32;
    // Rounding may carry into the next decade (9.9996 → 10.00): recompute from the rounded value.
    let round_at = |exp: i32| {
        let scale = 10f64.powi(digits - 1 - exp);
        (v * scale).round() / scale
    };
    let mut r = round_at(exp);
    if r.abs() >= 10f64.powi(exp + 1) {
        exp += 1;
        r = round_at(exp);
    }
    let decimals = (digits - 1 - exp).max(0) as usize;
    let mut s = format!("{:.*}", decimals, r);
    if s.contains('.') {
        while s.ends_with('0') {
            s.pop();
        }
        if s.ends_with('.') {
            s.pop();
        }
    }
    if s == "-0" {
        s = "0".into();
    }
    if group {
        s = group_thousands(&s);
    }
    Some(s)
}

/// [`sig`] at [`SIGNIFICANT`] digits without separators (`explain`).
pub fn sig4(v: f64) -> Option<String> {
    sig(v, SIGNIFICANT, false)
}

/// [`sig`] at [`SIGNIFICANT`] digits with thousands separators (the brief).
pub fn sig4_grouped(v: f64) -> Option<String> {
    sig(v, SIGNIFICANT, true)
}

/// A whole count with thousands separators (`1187` → `1,187`): counts are exact, not
/// rounded.
pub fn count(n: u64) -> String {
    group_thousands(&n.to_string())
}

/// Thousands separators in the integer part of a plain decimal number text.
fn group_thousands(s: &str) -> String {
    let (sign, rest) = match s.strip_prefix('-') {
        Some(r) => ("-", r),
        None => ("", s),
    };
    let (int, frac) = match rest.find('.') {
        Some(i) => rest.split_at(i),
        None => (rest, ""),
    };
    let mut out = String::with_capacity(s.len() + int.len() / 3);
    out.push_str(sign);
    for (i, ch) in int.chars().enumerate() {
        if i > 0 && (int.len() - i).is_multiple_of(3) {
            out.push(',');
        }
        out.push(ch);
    }
    out.push_str(frac);
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn four_significant_digits() {
        assert_eq!(sig4(0.012345).as_deref(), Some("0.01235"));
        assert_eq!(sig4(1.83).as_deref(), Some("1.83"));
        assert_eq!(sig4(2.0).as_deref(), Some("2"));
        assert_eq!(sig4(1480634.898).as_deref(), Some("1481000"));
        assert_eq!(sig4(-0.00012344).as_deref(), Some("-0.0001234"));
        assert_eq!(sig4(9.99996).as_deref(), Some("10"));
        assert_eq!(sig4(0.0).as_deref(), Some("0"));
        assert_eq!(sig4(123.456).as_deref(), Some("123.5"));
        assert_eq!(sig4(f64::NAN), None);
        assert_eq!(sig4(f64::INFINITY), None);
    }

    #[test]
    fn grouped_and_counts() {
        assert_eq!(sig4_grouped(1480634.898).as_deref(), Some("1,481,000"));
        assert_eq!(sig4_grouped(-12345.0).as_deref(), Some("-12,350"));
        assert_eq!(sig4_grouped(999.95).as_deref(), Some("1,000"));
        assert_eq!(sig4_grouped(1234.5).as_deref(), Some("1,235"));
        assert_eq!(count(1187), "1,187");
        assert_eq!(count(12), "12");
        assert_eq!(count(1_000_000), "1,000,000");
    }
}
