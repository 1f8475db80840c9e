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
    number_kind(cell).map(|(v, _)| v)
}

/// [`number`], and whether the cell was read as a fraction or mixed number
/// (so a caller need not search the cell for `/` again).
#[inline]
pub fn number_kind(cell: &[u8]) -> Option<(f64, bool)> {
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
        return Some((if neg { -v } else { v }, false));
    }
    let text = std::str::from_utf8(b).ok()?;
    if b.contains(&b'/') {
        // A fraction or mixed number (3/16, 1-1/2, 1 1/2): off the fast path.
        return crate::units::fraction(text).ok().map(|v| (v, true));
    }
    let v: f64 = text.parse().ok()?;
    v.is_finite().then_some((v, false))
}

/// Text holding a number with a decimal comma (a schedule's cell, a
/// bracing spacing `2,5 m`), with the comma made a point; the rules of
/// [`decimal_comma`].
pub fn decimal_comma_text(text: &str) -> Result<String, String> {
    let mut buf = Vec::new();
    let b = decimal_comma(text.trim().as_bytes(), &mut buf)?;
    // Only an ASCII comma was changed: still UTF-8.
    Ok(String::from_utf8_lossy(b).into_owned())
}

/// A number cell written with a decimal comma (`12,5`), as the standard
/// library and [`number`] read it (`12.5`): the cell itself when it has
/// no comma, else its bytes copied into `buf` with the comma made a point.
/// A point in such a cell is refused (it could be a thousands separator,
/// `1.234,5`), and so is more than one comma.
pub fn decimal_comma<'a>(cell: &'a [u8], buf: &'a mut Vec<u8>) -> Result<&'a [u8], String> {
    let shown = || String::from_utf8_lossy(cell).trim().to_string();
    if cell.contains(&b'.') {
        return Err(format!(
            "'{}': with --decimal-comma a number's decimal mark is ',' and a '.' is refused (it could be a thousands separator): write it as {}",
            shown(),
            shown().replace('.', ",")
        ));
    }
    match cell.iter().filter(|&&b| b == b',').count() {
        0 => Ok(cell),
        1 => {
            buf.clear();
            buf.extend(cell.iter().map(|&b| if b == b',' { b'.' } else { b }));
            Ok(buf.as_slice())
        }
        _ => Err(format!(
            "'{}': more than one decimal comma (thousands separators are not read)",
            shown()
        )),
    }
}
