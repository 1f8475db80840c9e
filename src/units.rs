//! Quantities with units: parse at the edge, compute in one set, format at
//! the edge.
//!
//! Internal units (used everywhere inside the library):
//! length mm, force N, line load N/mm, area load and stress N/mm² (= MPa),
//! moment N·mm, area mm², section modulus mm³, second moment mm⁴, warping
//! constant mm⁶, mass per length kg/m, density kg/m³.
//!
//! Conversion factors are exact by definition of the inch (25.4 mm), the
//! foot (304.8 mm) and the pound-force (4.448 221 615 260 5 N, from the
//! avoirdupois pound 0.453 592 37 kg and standard gravity 9.806 65 m/s²),
//! per NIST SP 811 (2008), Appendix B.
//!
//! Parsing accepts the usual spellings: `kN·m`, `kN-m`, `kNm`, `kN*m`,
//! `N/mm²`, `N/mm^2`, `N/mm2`, `10^6 mm^4`, `10⁶ mm⁴`, feet–inches such as
//! `12'-6"` or `12' 6 1/2"`. A bare number is rejected: every quantity a user
//! types carries its unit.

use crate::error::{Error, Result};
use serde::{Deserialize, Serialize};

/// Millimetres per inch (exact).
pub const MM_PER_IN: f64 = 25.4;
/// Millimetres per foot (exact).
pub const MM_PER_FT: f64 = 304.8;
/// Newtons per pound-force (exact, NIST SP 811).
pub const N_PER_LBF: f64 = 4.448_221_615_260_5;
/// Kilograms per avoirdupois pound (exact).
pub const KG_PER_LB: f64 = 0.453_592_37;
/// Standard acceleration of gravity, m/s² (exact, CGPM 1901).
pub const G: f64 = 9.806_65;

/// The physical dimension of a quantity, which decides the accepted units.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Dim {
    Length,
    Force,
    LineLoad,
    AreaLoad,
    Moment,
    Stress,
    Area,
    Modulus,
    SecondMoment,
    Warping,
    MassPerLength,
    Density,
}

struct UnitDef {
    /// Canonical keys (see `canonical`), lower case.
    keys: &'static [&'static str],
    /// Internal units per one of this unit.
    factor: f64,
}

const LBF_PER_FT: f64 = N_PER_LBF / MM_PER_FT;
const LBF_PER_IN: f64 = N_PER_LBF / MM_PER_IN;
const PSF: f64 = N_PER_LBF / (MM_PER_FT * MM_PER_FT);
const PSI: f64 = N_PER_LBF / (MM_PER_IN * MM_PER_IN);

fn table(dim: Dim) -> &'static [UnitDef] {
    macro_rules! u {
        ($f:expr; $($k:expr),+) => { UnitDef { keys: &[$($k),+], factor: $f } };
    }
    match dim {
        Dim::Length => &[
            u!(1.0; "mm"),
            u!(10.0; "cm"),
            u!(1000.0; "m"),
            u!(MM_PER_IN; "in", "inch", "inches", "\""),
            u!(MM_PER_FT; "ft", "foot", "feet", "'"),
        ],
        Dim::Force => &[
            u!(1.0; "n"),
            u!(1e3; "kn"),
            u!(1e6; "mn"),
            u!(N_PER_LBF; "lbf", "lb", "lbs"),
            u!(N_PER_LBF * 1e3; "kip", "kips"),
        ],
        Dim::LineLoad => &[
            u!(1.0; "n/mm", "kn/m"),
            u!(1e-3; "n/m"),
            u!(1e3; "kn/mm"),
            u!(LBF_PER_FT; "lb/ft", "lbf/ft", "plf", "lbs/ft"),
            u!(LBF_PER_FT * 1e3; "kip/ft", "klf", "kips/ft"),
            u!(LBF_PER_IN; "lb/in", "lbf/in", "pli"),
            u!(LBF_PER_IN * 1e3; "kip/in", "kips/in"),
        ],
        Dim::AreaLoad => &[
            u!(1e-6; "pa", "n/m2"),
            u!(1e-3; "kpa", "kn/m2"),
            u!(1.0; "n/mm2", "mpa"),
            u!(PSF; "psf", "lb/ft2", "lbf/ft2"),
            u!(PSF * 1e3; "ksf", "kip/ft2"),
            u!(PSI; "psi", "lb/in2"),
        ],
        Dim::Stress => &[
            u!(1e-6; "pa", "n/m2"),
            u!(1e-3; "kpa", "kn/m2"),
            u!(1.0; "mpa", "n/mm2"),
            u!(1e3; "gpa", "kn/mm2"),
            u!(10.0; "kn/cm2"),
            u!(PSI; "psi", "lb/in2", "lbf/in2"),
            u!(PSI * 1e3; "ksi", "kip/in2"),
            u!(PSF; "psf", "lb/ft2"),
            u!(PSF * 1e3; "ksf", "kip/ft2"),
        ],
        Dim::Moment => &[
            u!(1.0; "n.mm", "nmm", "mm.n"),
            u!(1e3; "n.m", "nm", "m.n", "kn.mm", "knmm"),
            u!(1e6; "kn.m", "knm", "m.kn"),
            u!(1e9; "mn.m", "mnm"),
            u!(N_PER_LBF * MM_PER_IN; "lb.in", "lbf.in", "in.lb", "in.lbf", "lbin"),
            u!(N_PER_LBF * MM_PER_FT; "lb.ft", "lbf.ft", "ft.lb", "ft.lbf", "lbft"),
            u!(N_PER_LBF * 1e3 * MM_PER_IN; "kip.in", "in.kip", "kipin", "k.in"),
            u!(N_PER_LBF * 1e3 * MM_PER_FT; "kip.ft", "ft.kip", "kipft", "k.ft"),
        ],
        Dim::Area => &[
            u!(1.0; "mm2"),
            u!(100.0; "cm2"),
            u!(1e6; "m2"),
            u!(MM_PER_IN * MM_PER_IN; "in2"),
            u!(MM_PER_FT * MM_PER_FT; "ft2"),
        ],
        Dim::Modulus => &[
            u!(1.0; "mm3"),
            u!(1e3; "cm3"),
            u!(1e9; "m3"),
            u!(MM_PER_IN * MM_PER_IN * MM_PER_IN; "in3"),
        ],
        Dim::SecondMoment => &[
            u!(1.0; "mm4"),
            u!(1e4; "cm4"),
            u!(1e12; "m4"),
            u!(MM_PER_IN * MM_PER_IN * MM_PER_IN * MM_PER_IN; "in4"),
        ],
        Dim::Warping => &[
            u!(1.0; "mm6"),
            u!(1e6; "cm6"),
            u!(1e18; "m6"),
            u!(MM_PER_IN * MM_PER_IN * MM_PER_IN * MM_PER_IN * MM_PER_IN * MM_PER_IN; "in6"),
        ],
        Dim::MassPerLength => &[
            u!(1.0; "kg/m"),
            u!(1e3; "kg/mm"),
            u!(KG_PER_LB / (MM_PER_FT / 1000.0); "lb/ft", "lbs/ft", "plf"),
        ],
        Dim::Density => &[
            u!(1.0; "kg/m3"),
            u!(1e3; "t/m3", "g/cm3"),
            u!(KG_PER_LB / (0.3048 * 0.3048 * 0.3048); "lb/ft3", "pcf", "lbs/ft3"),
            // Unit weight, converted with standard gravity.
            u!(1e3 / G; "kn/m3"),
        ],
    }
}

impl Dim {
    /// The spellings a user may type, for error messages.
    pub fn accepted(self) -> &'static str {
        match self {
            Dim::Length => "mm, cm, m, in, ft, or feet-inches like 12'-6\"",
            Dim::Force => "N, kN, MN, lbf (lb), kip",
            Dim::LineLoad => "N/mm, N/m, kN/m, lb/ft (plf), kip/ft (klf), lb/in, kip/in",
            Dim::AreaLoad => "Pa, kPa, kN/m², N/mm², psf, ksf, psi",
            Dim::Moment => "N·mm, N·m, kN·m (also kN-m, kNm), lb-in, lb-ft, kip-in, kip-ft",
            Dim::Stress => "Pa, kPa, MPa, GPa, N/mm², kN/cm², psi, ksi",
            Dim::Area => "mm², cm², m², in², ft²",
            Dim::Modulus => "mm³, cm³, m³, in³ (also 10^3 mm^3 style)",
            Dim::SecondMoment => "mm⁴, cm⁴, m⁴, in⁴ (also 10^6 mm^4 style)",
            Dim::Warping => "mm⁶, cm⁶, in⁶ (also 10^9 mm^6 style)",
            Dim::MassPerLength => "kg/m, lb/ft",
            Dim::Density => "kg/m³, t/m³, g/cm³, lb/ft³ (pcf), kN/m³ (unit weight)",
        }
    }

    pub fn name(self) -> &'static str {
        match self {
            Dim::Length => "length",
            Dim::Force => "force",
            Dim::LineLoad => "load per length",
            Dim::AreaLoad => "load per area",
            Dim::Moment => "moment",
            Dim::Stress => "stress",
            Dim::Area => "area",
            Dim::Modulus => "section modulus",
            Dim::SecondMoment => "second moment of area",
            Dim::Warping => "warping constant",
            Dim::MassPerLength => "mass per length",
            Dim::Density => "density",
        }
    }
}

/// Turn a unit spelling into the canonical key used by the tables:
/// superscripts become digits, `^` is dropped, any of `· ⋅ * - space` becomes
/// `.`, and letters are lower-cased; with the original character behind each
/// character of the key, so the case of SI prefixes is checked after the
/// lookup (`check_prefix_case`).
fn canonical_with_source(unit: &str) -> (String, Vec<char>) {
    // (canonical character, the character typed), kept in step.
    let mut pairs: Vec<(char, char)> = Vec::with_capacity(unit.len());
    for ch in unit.chars() {
        let mapped = match ch {
            '²' => '2',
            '³' => '3',
            '⁴' => '4',
            '⁶' => '6',
            '^' => continue,
            '·' | '⋅' | '*' | '-' | ' ' | '\t' | '•' | '×' => '.',
            '′' | '’' => '\'',
            '″' | '”' => '"',
            c => c.to_ascii_lowercase(),
        };
        if mapped == '.' && pairs.last().is_none_or(|p| p.0 == '.' || p.0 == '/') {
            continue;
        }
        pairs.push((mapped, ch));
    }
    while pairs.last().is_some_and(|p| p.0 == '.') {
        pairs.pop();
    }
    // "kN/m.2" cannot arise; but "kn./m" can from "kN /m".
    let mut k = 0;
    while k + 1 < pairs.len() {
        if pairs[k].0 == '.' && pairs[k + 1].0 == '/' {
            pairs.remove(k);
        } else {
            k += 1;
        }
    }
    (
        pairs.iter().map(|p| p.0).collect(),
        pairs.iter().map(|p| p.1).collect(),
    )
}

/// SI prefixes are case-sensitive: M (mega) and m (milli, or the metre)
/// differ by 10⁹. Keys that begin with mega carry an upper-case M; every
/// other m of an accepted unit is lower case. A unit whose case says
/// otherwise ("mPa", "mN", "6Mm", "MM") is refused with the reading it
/// would have, never taken for its neighbour.
fn check_prefix_case(unit: &str, key: &str, src: &[char]) -> Result<()> {
    const MEGA: [&str; 4] = ["mn", "mpa", "mn.m", "mnm"];
    for (i, (k, o)) in key.chars().zip(src).enumerate() {
        if k != 'm' {
            continue;
        }
        let want_upper = i == 0 && MEGA.contains(&key);
        if o.is_ascii_uppercase() != want_upper {
            let hint = if want_upper {
                format!(
                    "'m' is milli; mega is 'M' (e.g. '{}')",
                    fix_first_m(unit, true)
                )
            } else {
                "'M' is mega; milli and the metre are 'm' (e.g. 'mm', 'kN/m', 'MPa')".to_string()
            };
            return Err(Error::msg(format!(
                "unit '{unit}': SI prefixes are case-sensitive, so this does not read as the unit it resembles: {hint}"
            )));
        }
    }
    Ok(())
}

fn fix_first_m(unit: &str, upper: bool) -> String {
    let mut done = false;
    unit.chars()
        .map(|c| {
            if !done && c.eq_ignore_ascii_case(&'m') {
                done = true;
                if upper { 'M' } else { 'm' }
            } else {
                c
            }
        })
        .collect()
}

/// Superscript digits to `^`-prefixed ASCII digits ("10⁶" → "10^6").
fn desuperscript(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + 4);
    let mut in_sup = false;
    for ch in s.chars() {
        let d = match ch {
            '⁰' => Some('0'),
            '¹' => Some('1'),
            '²' => Some('2'),
            '³' => Some('3'),
            '⁴' => Some('4'),
            '⁵' => Some('5'),
            '⁶' => Some('6'),
            '⁷' => Some('7'),
            '⁸' => Some('8'),
            '⁹' => Some('9'),
            '⁻' => Some('-'),
            _ => None,
        };
        match d {
            Some(d) => {
                if !in_sup {
                    out.push('^');
                }
                out.push(d);
                in_sup = true;
            }
            None => {
                out.push(ch);
                in_sup = false;
            }
        }
    }
    out
}

/// Split a leading decimal number from `s`; returns (number, rest).
fn split_number(s: &str) -> Option<(f64, &str)> {
    let b = s.as_bytes();
    let mut i = 0;
    if i < b.len() && (b[i] == b'+' || b[i] == b'-') {
        i += 1;
    }
    let digits_start = i;
    while i < b.len() && b[i].is_ascii_digit() {
        i += 1;
    }
    if i < b.len() && b[i] == b'.' {
        i += 1;
        while i < b.len() && b[i].is_ascii_digit() {
            i += 1;
        }
    }
    if i == digits_start || (i == digits_start + 1 && b[digits_start] == b'.') {
        return None;
    }
    // Exponent only if followed by a digit (so "5 em" is not eaten).
    if i < b.len() && (b[i] == b'e' || b[i] == b'E') {
        let mut j = i + 1;
        if j < b.len() && (b[j] == b'+' || b[j] == b'-') {
            j += 1;
        }
        if j < b.len() && b[j].is_ascii_digit() {
            while j < b.len() && b[j].is_ascii_digit() {
                j += 1;
            }
            i = j;
        }
    }
    let v: f64 = s[..i].parse().ok()?;
    Some((v, &s[i..]))
}

/// A leading power-of-ten scale in a unit ("10^6 mm^4", "x10^3 mm3",
/// "1e6 mm4"); returns (scale, rest of unit).
fn split_scale(unit: &str) -> (f64, &str) {
    let u = unit.trim_start();
    let u2 = u
        .strip_prefix('x')
        .or_else(|| u.strip_prefix('×'))
        .map(str::trim_start)
        .unwrap_or(u);
    if let Some(rest) = u2.strip_prefix("10^") {
        let b = rest.as_bytes();
        let mut i = 0;
        if i < b.len() && (b[i] == b'-' || b[i] == b'+') {
            i += 1;
        }
        let s = i;
        while i < b.len() && b[i].is_ascii_digit() {
            i += 1;
        }
        if i > s
            && let Ok(p) = rest[..i].parse::<i32>()
        {
            return (10f64.powi(p), rest[i..].trim_start());
        }
    }
    if (u2.starts_with("1e") || u2.starts_with("1E"))
        && let Some((v, rest)) = split_number(u2)
        && (rest.starts_with(' ') || rest.is_empty())
    {
        return (v, rest.trim_start());
    }
    (1.0, u)
}

/// Factor (internal units per one of `unit`) for a unit spelling, with an
/// optional leading power-of-ten scale.
pub fn unit_factor(unit: &str, dim: Dim) -> Result<f64> {
    let desup = desuperscript(unit.trim());
    let (scale, rest) = split_scale(&desup);
    let (key, src) = canonical_with_source(rest);
    if key.is_empty() {
        return Err(Error::msg(format!(
            "missing unit for a {}: expected one of {}",
            dim.name(),
            dim.accepted()
        )));
    }
    for def in table(dim) {
        if def.keys.contains(&key.as_str()) {
            check_prefix_case(rest.trim(), &key, &src)?;
            return Ok(scale * def.factor);
        }
    }
    Err(Error::msg(format!(
        "unknown unit '{}' for a {}: expected one of {}",
        unit.trim(),
        dim.name(),
        dim.accepted()
    )))
}

/// Read a whole text as a non-negative number written as a decimal
/// (`1.5`), a fraction (`3/16`) or a mixed number (`1-1/2`, `1 1/2`):
/// whole, numerator and denominator are plain digits and the denominator
/// is not zero. Negative fractions are refused (every fractional quantity
/// we read is a length that must be positive). The error says what was
/// expected.
pub fn fraction(text: &str) -> std::result::Result<f64, String> {
    const FORMS: &str =
        "expected a decimal, a fraction or a mixed number such as 3/16, 1-1/2 or 1 1/2";
    let t = text.trim();
    let digits = |s: &str| !s.is_empty() && s.bytes().all(|c| c.is_ascii_digit());
    if t.starts_with('-') {
        return Err(format!(
            "'{t}' is negative: a fractional length must be positive"
        ));
    }
    let Some((head, den)) = t.rsplit_once('/') else {
        return match split_number(t) {
            Some((v, rest)) if rest.is_empty() && v.is_finite() && v >= 0.0 => Ok(v),
            _ => Err(format!("cannot read '{t}': {FORMS}")),
        };
    };
    let (whole, num) = match head.trim_end().rsplit_once([' ', '-']) {
        Some((w, n)) => (Some(w.trim()), n.trim()),
        None => (None, head.trim()),
    };
    let den = den.trim();
    if !digits(num) || !digits(den) || whole.is_some_and(|w| !digits(w)) {
        return Err(format!("cannot read '{t}' as a fraction: {FORMS}"));
    }
    let d: f64 = den
        .parse()
        .map_err(|_| format!("cannot read '{t}': {FORMS}"))?;
    if d == 0.0 {
        return Err(format!(
            "'{t}' divides by zero: the denominator must not be 0"
        ));
    }
    let n: f64 = num
        .parse()
        .map_err(|_| format!("cannot read '{t}': {FORMS}"))?;
    let w: f64 = match whole {
        Some(w) => w
            .parse()
            .map_err(|_| format!("cannot read '{t}': {FORMS}"))?,
        None => 0.0,
    };
    let v = w + n / d;
    if v.is_finite() {
        Ok(v)
    } else {
        Err(format!("'{t}' is out of range"))
    }
}

/// Split a leading fraction or mixed number (`3/16 in`, `1-1/2in`,
/// `1 1/2 in`) from its unit: `None` when the number part holds no `/`
/// (an ordinary number), else the value or why it cannot be read.
fn split_fraction(t: &str) -> Option<std::result::Result<(f64, &str), String>> {
    let end = t
        .find(|c: char| !(c.is_ascii_digit() || matches!(c, '/' | '-' | '+' | '.' | ' ')))
        .unwrap_or(t.len());
    let (number, unit) = t.split_at(end);
    if !number.contains('/') {
        return None;
    }
    Some(fraction(number).map(|v| (v, unit)))
}

/// Parse feet–inches: `12'-6"`, `12' 6"`, `12'`, `6"`, `12'-6 1/2"`, `1-1/2"`.
fn parse_feet_inches(s: &str) -> Option<f64> {
    let s = s
        .replace(['′', '’'], "'")
        .replace(['″', '”'], "\"")
        .replace("''", "\"");
    let s = s.trim();
    let (feet_part, inch_part) = match s.find('\'') {
        Some(p) => (Some(&s[..p]), s[p + 1..].trim()),
        None => (None, s),
    };
    let feet: f64 = match feet_part {
        Some(f) => f.trim().parse().ok()?,
        None => 0.0,
    };
    let inch_part = inch_part.trim_start_matches('-').trim();
    let inches = if inch_part.is_empty() {
        feet_part?;
        0.0
    } else {
        let body = inch_part.strip_suffix('"')?.trim();
        fraction(body).ok()?
    };
    if !(feet.is_finite() && inches.is_finite()) || feet < 0.0 || inches < 0.0 {
        return None;
    }
    let total = feet * MM_PER_FT + inches * MM_PER_IN;
    total.is_finite().then_some(total)
}

/// Parse a quantity such as `"6.5 m"`, `"12 kN/m"`, `"8356 cm^4"` into
/// internal units. Rejects bare numbers, unknown units, NaN and infinities.
pub fn parse(text: &str, dim: Dim) -> Result<f64> {
    let t = text.trim();
    if t.is_empty() {
        return Err(Error::msg(format!(
            "empty value: expected a {} with a unit ({})",
            dim.name(),
            dim.accepted()
        )));
    }
    let lower = t.to_ascii_lowercase();
    if lower.contains("nan") || lower.contains("inf") {
        return Err(Error::msg(format!(
            "'{t}' is not a finite number: expected a {} such as 12.5 followed by a unit ({})",
            dim.name(),
            dim.accepted()
        )));
    }
    if dim == Dim::Length
        && (t.contains('\'') || t.contains('"') || t.contains('′') || t.contains('″'))
    {
        return parse_feet_inches(t).ok_or_else(|| {
            Error::msg(format!(
                "cannot read '{t}' as feet-inches: expected forms like 12'-6\", 12' 6 1/2\", 10' or 9\""
            ))
        });
    }
    let fractional = match split_fraction(t) {
        Some(_) if dim != Dim::Length => {
            return Err(Error::msg(format!(
                "'{t}': fractions are read only for lengths; write a {} as a decimal followed by a unit ({})",
                dim.name(),
                dim.accepted()
            )));
        }
        Some(r) => Some(r.map_err(Error::msg)?),
        None => None,
    };
    let (value, unit) = fractional.or_else(|| split_number(t)).ok_or_else(|| {
        Error::msg(format!(
            "'{t}' does not start with a number: expected a {} such as 12.5 followed by a unit ({})",
            dim.name(),
            dim.accepted()
        ))
    })?;
    if unit.trim().is_empty() {
        return Err(Error::msg(format!(
            "'{t}' has no unit: a {} needs one of {}",
            dim.name(),
            dim.accepted()
        )));
    }
    let f = unit_factor(unit, dim)?;
    let v = value * f;
    if !v.is_finite() {
        return Err(Error::msg(format!(
            "'{t}' is out of range for a {}",
            dim.name()
        )));
    }
    Ok(v)
}

/// The system a length was typed in (for the words of a message about
/// it): US for inches, feet and feet-inches, else SI.
pub fn typed_length_system(text: &str) -> System {
    let t = text.trim();
    if t.contains(['\'', '"', '′', '″']) {
        return System::Us;
    }
    let unit = match split_fraction(t) {
        Some(Ok((_, u))) => u,
        Some(Err(_)) => return System::Si,
        None => split_number(t).map_or("", |(_, u)| u),
    };
    match unit_factor(unit, Dim::Length) {
        Ok(f) if f == MM_PER_IN || f == MM_PER_FT => System::Us,
        _ => System::Si,
    }
}

/// The system a stress was typed in (psi, ksi: US; else SI).
pub fn typed_stress_system(text: &str) -> System {
    let unit = split_number(text.trim()).map_or("", |(_, u)| u);
    match unit_factor(unit, Dim::Stress) {
        Ok(f)
            if (f - Show::Stress.unit(System::Us).1).abs() <= 1e-9 * f
                || (f - Show::Stress.unit(System::Us).1 / 1000.0).abs() <= 1e-9 * f =>
        {
            System::Us
        }
        _ => System::Si,
    }
}

/// Parse a plain number (no unit), rejecting NaN and infinities.
pub fn parse_number(text: &str) -> Result<f64> {
    let t = text.trim();
    match split_number(t) {
        Some((v, rest)) if rest.trim().is_empty() && v.is_finite() => Ok(v),
        _ => Err(Error::msg(format!("'{t}' is not a finite number"))),
    }
}

/// Parse an optional quantity of `dim` (an option that may be absent);
/// errors name `field`.
pub fn parse_field(text: Option<&str>, dim: Dim, field: &str) -> Result<Option<f64>> {
    text.map(|t| parse(t, dim).map_err(|e| e.in_field(field)))
        .transpose()
}

/// Parse a list such as `"6,8,10mm"` (one unit at the end, applying to
/// every bare number) or `"4m,5.5m"` (a unit on each) as quantities of
/// `dim`; errors name `field`.
pub fn parse_list(text: &str, dim: Dim, field: &str) -> Result<Vec<f64>> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    let last = parts.last().copied().unwrap_or("");
    let unit: String = last
        .trim_start_matches(|c: char| c.is_ascii_digit() || matches!(c, '.' | ' ' | '/' | '-'))
        .to_string();
    parts
        .iter()
        .map(|p| {
            let t = if p.chars().last().is_some_and(|c| c.is_ascii_digit()) {
                format!("{p}{unit}")
            } else {
                p.to_string()
            };
            parse(&t, dim).map_err(|e| e.in_field(field))
        })
        .collect()
}

/// The output unit system.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum System {
    /// SI: mm, m, kN, kN·m, MPa.
    #[default]
    Si,
    /// US customary: in, ft, kip, kip·ft, ksi.
    Us,
    /// US customary, with spans and lengths along the member in feet and
    /// inches to the nearest 1/16 in (16'-1 1/4").
    #[serde(rename = "us-ft-in")]
    UsFeetInches,
}

impl System {
    /// US customary units (in either writing of lengths).
    pub fn is_us(self) -> bool {
        matches!(self, System::Us | System::UsFeetInches)
    }

    /// The units, with lengths as decimals (what numeric outputs use).
    pub fn decimal(self) -> System {
        match self {
            System::UsFeetInches => System::Us,
            s => s,
        }
    }
}

impl System {
    /// Every choice with its name (the serde name where it has one) and
    /// a line of help, for front ends that list the choices.
    pub const CHOICES: &[(Self, &str, &str)] = &[
        (Self::Si, "si", "SI: mm, m, kN, kN·m, MPa"),
        (Self::Us, "us", "US customary: in, ft, kip, kip·ft, ksi"),
        (
            Self::UsFeetInches,
            "us-ft-in",
            "US customary, spans and lengths in feet-inches (16'-1 1/4\")",
        ),
    ];
}

/// What a printed number means, which decides its display unit.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Show {
    /// Span or position along a beam (m / ft).
    Span,
    /// Section dimension (mm / in).
    Dimension,
    /// Deflection (mm / in).
    Deflection,
    Force,
    LineLoad,
    AreaLoad,
    Moment,
    Stress,
    /// Modulus of elasticity (GPa... shown in MPa / ksi).
    Modulus,
    Area,
    SectionModulus,
    SecondMoment,
    Warping,
    Mass,
    Density,
    /// Slope (rad), same in both systems.
    Rotation,
    /// A pure number (a factor or a ratio).
    Ratio,
}

impl Show {
    /// (unit label, internal units per display unit).
    pub fn unit(self, sys: System) -> (&'static str, f64) {
        use Show::*;
        match (self, sys.decimal()) {
            (_, System::UsFeetInches) => unreachable!("decimal() has no feet-inches"),
            (Span, System::Si) => ("m", 1000.0),
            (Span, System::Us) => ("ft", MM_PER_FT),
            (Dimension | Deflection, System::Si) => ("mm", 1.0),
            (Dimension | Deflection, System::Us) => ("in", MM_PER_IN),
            (Force, System::Si) => ("kN", 1e3),
            (Force, System::Us) => ("kip", N_PER_LBF * 1e3),
            (LineLoad, System::Si) => ("kN/m", 1.0),
            (LineLoad, System::Us) => ("lb/ft", LBF_PER_FT),
            (AreaLoad, System::Si) => ("kPa", 1e-3),
            (AreaLoad, System::Us) => ("psf", PSF),
            (Moment, System::Si) => ("kN·m", 1e6),
            (Moment, System::Us) => ("kip·ft", N_PER_LBF * 1e3 * MM_PER_FT),
            (Stress | Modulus, System::Si) => ("MPa", 1.0),
            (Stress | Modulus, System::Us) => ("ksi", PSI * 1e3),
            (Area, System::Si) => ("mm²", 1.0),
            (Area, System::Us) => ("in²", MM_PER_IN * MM_PER_IN),
            (SectionModulus, System::Si) => ("10³ mm³", 1e3),
            (SectionModulus, System::Us) => ("in³", MM_PER_IN.powi(3)),
            (SecondMoment, System::Si) => ("10⁶ mm⁴", 1e6),
            (SecondMoment, System::Us) => ("in⁴", MM_PER_IN.powi(4)),
            (Warping, System::Si) => ("10⁹ mm⁶", 1e9),
            (Warping, System::Us) => ("in⁶", MM_PER_IN.powi(6)),
            (Mass, System::Si) => ("kg/m", 1.0),
            (Mass, System::Us) => ("lb/ft", KG_PER_LB / 0.3048),
            (Density, System::Si) => ("kg/m³", 1.0),
            (Density, System::Us) => ("lb/ft³", KG_PER_LB / (0.3048 * 0.3048 * 0.3048)),
            (Rotation, _) => ("rad", 1.0),
            (Ratio, _) => ("", 1.0),
        }
    }

    /// Value in display units.
    pub fn value(self, internal: f64, sys: System) -> f64 {
        internal / self.unit(sys).1
    }

    pub fn label(self, sys: System) -> &'static str {
        if self.feet_inches(sys) {
            return "ft-in";
        }
        self.unit(sys).0
    }

    /// Written in feet and inches: a span or length under
    /// [`System::UsFeetInches`].
    fn feet_inches(self, sys: System) -> bool {
        self == Show::Span && sys == System::UsFeetInches
    }

    /// Number only, in display units, with engineering formatting.
    pub fn num(self, internal: f64, sys: System) -> String {
        if self.feet_inches(sys) {
            return feet_inches(internal, false);
        }
        fmt_num(self.value(internal, sys))
    }

    /// Number with a fixed count of decimals (for table columns).
    pub fn fixed(self, internal: f64, sys: System, decimals: usize) -> String {
        if self.feet_inches(sys) {
            return feet_inches(internal, false);
        }
        let v = self.value(internal, sys);
        if v.abs() >= 1000.0 {
            return fmt_num(v);
        }
        format!("{v:.decimals$}")
    }

    /// As [`Show::fixed`] but rounded towards zero at the last decimal
    /// shown, for capacities such as the longest passing span: a displayed
    /// value never exceeds the computed one. (A value that is a whole
    /// multiple of the last decimal to within 1e-9 of it stays itself.)
    pub fn fixed_down(self, internal: f64, sys: System, decimals: usize) -> String {
        if self.feet_inches(sys) {
            return feet_inches(internal, true);
        }
        let v = self.value(internal, sys);
        let scale = 10f64.powi(decimals as i32);
        let t = (v * scale + 1e-9 * v.signum()).trunc() / scale;
        if t.abs() >= 1000.0 {
            return fmt_num(t);
        }
        format!("{t:.decimals$}")
    }

    /// Number and unit, e.g. `"12.5 kN·m"`.
    pub fn fmt(self, internal: f64, sys: System) -> String {
        let l = self.label(sys);
        if l.is_empty() || self.feet_inches(sys) {
            self.num(internal, sys)
        } else {
            format!("{} {l}", self.num(internal, sys))
        }
    }
}

/// A length (mm) in feet and inches to the nearest 1/16 in, fractions
/// reduced (`16'-1 1/4"`, `0'-0 3/8"`, `-2'-0"`); `down` rounds towards
/// zero instead (for capacities: never more than computed).
pub fn feet_inches(mm: f64, down: bool) -> String {
    if !mm.is_finite() {
        return fmt_num(mm);
    }
    let sixteenths = mm.abs() / MM_PER_IN * 16.0;
    // A value within 1e-9 of a whole sixteenth stays itself.
    let n = if down {
        (sixteenths + 1e-9).floor()
    } else {
        sixteenths.round()
    } as u64;
    let (feet, rest) = (n / 192, n % 192);
    let (inches, mut num) = (rest / 16, rest % 16);
    let mut den = 16;
    while num > 0 && num % 2 == 0 {
        num /= 2;
        den /= 2;
    }
    let sign = if mm < 0.0 && n > 0 { "-" } else { "" };
    let feet = group_thousands(feet as f64);
    match (inches, num) {
        (i, 0) => format!("{sign}{feet}'-{i}\""),
        (i, f) => format!("{sign}{feet}'-{i} {f}/{den}\""),
    }
}

/// Format a number the way an engineer writes it: four significant figures
/// below 1000, whole numbers with thousands separators from 1000 up, and
/// scientific notation for very small or very large magnitudes.
pub fn fmt_num(v: f64) -> String {
    if !v.is_finite() {
        return if v.is_nan() {
            "n/a".into()
        } else {
            "∞".into()
        };
    }
    if v == 0.0 {
        return "0".into();
    }
    let a = v.abs();
    if !(1e-4..1e12).contains(&a) {
        return format!("{v:.3e}");
    }
    if a >= 1000.0 {
        let r = v.round();
        return group_thousands(r);
    }
    let digits = 4 - 1 - a.log10().floor() as i32;
    let decimals = digits.max(0) as usize;
    let s = format!("{v:.decimals$}");
    // Rounding can carry into the thousands (999.96 → 1000): group then.
    if s.trim_start_matches('-').starts_with("1000") {
        return group_thousands(v.round());
    }
    let s = if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    };
    if s == "-0" { "0".into() } else { s }
}

/// A whole count with thousands separators (`910,656`).
pub fn count(n: impl Into<u128>) -> String {
    let digits = n.into().to_string();
    let mut out = String::new();
    for (i, ch) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(ch);
    }
    out
}

fn group_thousands(r: f64) -> String {
    let neg = r < 0.0;
    let digits = format!("{:.0}", r.abs());
    let mut out = String::new();
    for (i, ch) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(ch);
    }
    if neg { format!("-{out}") } else { out }
}
