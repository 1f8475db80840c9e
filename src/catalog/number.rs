//! Number cells, parsed straight from their bytes (on the per-row path of a
//! catalogue scan).

const POW10: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// Parse a number cell straight from its bytes. Fast path (Clinger 1990,
/// "How to read floating point numbers accurately"): a plain decimal with
/// at most 15 significant digits is an exact integer m and an exact power
/// of ten, so m / 10^k is correctly rounded by one IEEE division. Anything
/// else (exponents, long mantissas) goes to the standard library parser, and
/// a cell holding `/` is read as a fraction or mixed number (`3/16`, `1-1/2`).
#[inline]
pub fn number(cell: &[u8]) -> Option<f64> {
    let mut b = cell;
    while let [first, rest @ ..] = b {
        if first.is_ascii_whitespace() {
            b = rest
        } else {
            break;
        }
    }
    while let [rest @ .., last] = b {
        if last.is_ascii_whitespace() {
            b = rest
        } else {
            break;
        }
    }
    let (neg, digits) = match b {
        [b'-', rest @ ..] => (true, rest),
        [b'+', rest @ ..] => (false, rest),
        _ => (false, b),
    };
    let mut m: u64 = 0;
    let mut n_digits = 0;
    let mut frac: Option<usize> = None;
    let mut ok = !digits.is_empty();
    for &c in digits {
        match c {
            b'0'..=b'9' => {
                if m == 0 && c == b'0' && frac.is_none() {
                    // leading zeros do not count
                } else {
                    n_digits += 1;
                }
                m = m.wrapping_mul(10).wrapping_add((c - b'0') as u64);
                if let Some(f) = frac.as_mut() {
                    *f += 1;
                }
            }
            b'.' if frac.is_none() => frac = Some(0),
            _ => {
                ok = false;
                break;
            }
        }
    }
    let k = frac.unwrap_or(0);
    if ok && n_digits <= 15 && k <= 22 && digits != b"." {
        let v = m as f64 / POW10[k];
        return Some(if neg { -v } else { v });
    }
    let text = std::str::from_utf8(b).ok()?;
    if b.contains(&b'/') {
        // A fraction or mixed number (3/16, 1-1/2, 1 1/2): off the fast path.
        return crate::units::fraction(text).ok();
    }
    let v: f64 = text.parse().ok()?;
    v.is_finite().then_some(v)
}
