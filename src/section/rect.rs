//! Solid rectangle b × d.
//!
//! I = b·d³/12, S = b·d²/6, Z = b·d²/4, Q_NA = b·d²/8 (any mechanics of
//! materials text, e.g. Gere & Goodno, Appendix E). Torsion constant
//! J = w·t³·(1/3 − 0.21·(t/w)·(1 − t⁴/(12·w⁴))) with w the longer and t the
//! shorter side (Roark's Formulas for Stress and Strain, 7th ed., Table 10.7
//! case 4). Warping constant by the exact series of the Saint-Venant
//! warping function (below); a solid rectangle warps, if little.

use super::composite::{Composite, Part, add};
use super::{Properties, from_composite, positive};
use crate::error::Result;

pub(crate) fn validate(b: f64, d: f64, sys: crate::units::System) -> Result<()> {
    positive("b", b, sys)?;
    positive("d", d, sys)
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

/// Warping constant Γ = ∫φ² dA of a solid rectangle, φ the Saint-Venant
/// warping function of the rectangle |x| ≤ a, |y| ≤ c (a the half of the
/// shorter side; Timoshenko & Goodier, *Theory of Elasticity*, §109):
/// φ = x·y − Σ A_n·sin(k_n·x)·sinh(k_n·y)/cosh(k_n·c),
/// k_n = (2n+1)π/(2a), A_n = 32a²(−1)ⁿ/(π³(2n+1)³). The sines are
/// orthogonal on [−a, a], so Γ reduces to single sums:
/// Γ = 4a³c³/9 − 8·Σ A_n(−1)ⁿ(c/k_n − tanh(k_n c)/k_n²)/k_n²
///     + a·Σ A_n²(tanh(k_n c)/k_n − c/cosh²(k_n c)).
/// The terms fall as n⁻⁶: ten terms give round-off. Checked against a
/// finite-element section library in tests/sections.rs.
pub fn warping_constant(b: f64, d: f64) -> f64 {
    let (short, long) = if b <= d { (b, d) } else { (d, b) };
    let (a, c) = (short / 2.0, long / 2.0);
    let pi = std::f64::consts::PI;
    let mut g = 4.0 * a.powi(3) * c.powi(3) / 9.0;
    for n in 0..10 {
        let m = (2 * n + 1) as f64;
        let k = m * pi / (2.0 * a);
        let sign = if n % 2 == 0 { 1.0 } else { -1.0 };
        let an = 32.0 * a * a * sign / (pi.powi(3) * m.powi(3));
        let t = (k * c).tanh();
        let sech2 = if k * c < 300.0 {
            1.0 / (k * c).cosh().powi(2)
        } else {
            0.0
        };
        g -= 8.0 * an * sign * (c / k - t / (k * k)) / (k * k);
        g += a * an * an * (t / k - c * sech2);
    }
    g
}

pub(crate) fn properties(b: f64, d: f64) -> Properties {
    let mut p = from_composite(
        &composite(b, d),
        d,
        b,
        Some(torsion_constant(b, d)),
        Some(warping_constant(b, d)),
        None,
    );
    p.zy = Some(d * b * b / 4.0);
    p
}
