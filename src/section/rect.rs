//! Solid rectangle b × d.
//!
//! I = b·d³/12, S = b·d²/6, Z = b·d²/4, Q_NA = b·d²/8 (any mechanics of
//! materials text, e.g. Gere & Goodno, Appendix E). Torsion constant
//! J = w·t³·(1/3 − 0.21·(t/w)·(1 − t⁴/(12·w⁴))) with w the longer and t the
//! shorter side (Roark's Formulas for Stress and Strain, 7th ed., Table 10.7
//! case 4).

use super::composite::{Composite, Part, add};
use super::{Properties, from_composite, positive};
use crate::error::Result;

pub(crate) fn validate(b: f64, d: f64) -> Result<()> {
    positive("b", b)?;
    positive("d", d)
}

pub(crate) fn composite(b: f64, d: f64) -> Composite {
    let mut c = Composite::new();
    c.push(add(Part::Rect {
        xc: 0.0,
        yb: 0.0,
        b,
        h: d,
    }));
    c
}

/// Roark's torsion constant of a solid rectangle.
pub fn torsion_constant(b: f64, d: f64) -> f64 {
    let (w, t) = if d >= b { (d, b) } else { (b, d) };
    w * t.powi(3) * (1.0 / 3.0 - 0.21 * (t / w) * (1.0 - t.powi(4) / (12.0 * w.powi(4))))
}

pub(crate) fn properties(b: f64, d: f64) -> Properties {
    from_composite(
        &composite(b, d),
        d,
        b,
        Some(torsion_constant(b, d)),
        None,
        None,
    )
}
