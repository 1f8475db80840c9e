//! Exact extremes of an element's polynomial (closed-form roots of the
//! slope, safeguarded Newton where there is none), and the helpers the
//! pattern envelope refines with.

use super::Quantity;
use crate::beam::solve::{self, Coef};

/// An extreme: largest and smallest value with their positions.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Extremes {
    pub max: f64,
    pub x_max: f64,
    pub min: f64,
    pub x_min: f64,
}

impl Extremes {
    pub const EMPTY: Extremes = Extremes {
        max: f64::NEG_INFINITY,
        x_max: 0.0,
        min: f64::INFINITY,
        x_min: 0.0,
    };
    #[inline]
    pub(super) fn push(&mut self, v: f64, x: f64) {
        if v > self.max {
            self.max = v;
            self.x_max = x;
        }
        if v < self.min {
            self.min = v;
            self.x_min = x;
        }
    }
    #[inline]
    pub(super) fn merge(&mut self, o: &Extremes) {
        self.push(o.max, o.x_max);
        self.push(o.min, o.x_min);
    }
    /// Round-off is not a value: anything below 1e-9 of the largest
    /// magnitude becomes zero (so an all-sagging beam has no hogging
    /// moment of 1e-15).
    #[inline]
    pub fn cleaned(mut self) -> Extremes {
        let tiny = 1e-9 * self.max.abs().max(self.min.abs());
        if self.max.abs() <= tiny {
            self.max = 0.0;
        }
        if self.min.abs() <= tiny {
            self.min = 0.0;
        }
        self
    }

    /// Largest magnitude, signed, and its position.
    pub fn abs_max(&self) -> (f64, f64) {
        if self.max.abs() >= self.min.abs() {
            (self.max, self.x_max)
        } else {
            (self.min, self.x_min)
        }
    }
}

#[inline]
pub fn eval(q: Quantity, c: &Coef, s: f64) -> f64 {
    match q {
        Quantity::Moment => solve::moment(c, s),
        Quantity::Shear => solve::shear(c, s),
        Quantity::Deflection => solve::deflection(c, s),
    }
}

/// Exact extremes of one element's polynomial over [0, l]; positions are
/// local (s).
#[inline]
pub fn element_extremes(q: Quantity, c: &Coef, l: f64) -> Extremes {
    element_extremes_from(q, c, l, None)
}

/// [`element_extremes`] with a guess of where a deflection extreme lies
/// (element-local): Newton's method starts there when the guess falls in
/// the root's bracket (same roots, to the same tolerance; fewer steps).
#[inline]
pub(super) fn element_extremes_from(q: Quantity, c: &Coef, l: f64, hint: Option<f64>) -> Extremes {
    let mut e = Extremes::EMPTY;
    e.push(eval(q, c, 0.0), 0.0);
    e.push(eval(q, c, l), l);
    match q {
        Quantity::Moment => {
            // dM/ds = V = c1 + 2c2·s + 3c3·s² = 0
            let (a, b, cc) = (3.0 * c[3], 2.0 * c[2], c[1]);
            let mut try_root = |s: f64| {
                if s > 0.0 && s < l {
                    e.push(solve::moment(c, s), s);
                }
            };
            if a.abs() <= 1e-300 || (a * l).abs() <= 1e-12 * b.abs() {
                if b != 0.0 {
                    try_root(-cc / b);
                }
            } else {
                let disc = b * b - 4.0 * a * cc;
                if disc >= 0.0 {
                    let sq = disc.sqrt();
                    // Numerically stable pair of roots.
                    let qv = -0.5 * (b + b.signum() * sq);
                    if qv != 0.0 {
                        try_root(qv / a);
                        try_root(cc / qv);
                    } else {
                        try_root(0.0);
                    }
                }
            }
        }
        Quantity::Shear => {
            // dV/ds = 2c2 + 6c3·s = 0
            if c[3] != 0.0 {
                let s = -c[2] / (3.0 * c[3]);
                if s > 0.0 && s < l {
                    e.push(solve::shear(c, s), s);
                }
            }
        }
        Quantity::Deflection => {
            // Exact bracketing: the slope θ has θ' = −M, so θ is monotone
            // between the roots of M, and M is monotone between the roots of
            // V (a quadratic, solved in closed form). So each piece between
            // consecutive roots of M holds at most one root of θ.
            let mut cuts = [0.0f64; 8];
            let mut n = 0;
            let push_cut = |x: f64, cuts: &mut [f64; 8], n: &mut usize| {
                if x > 0.0 && x < l && *n < 8 {
                    cuts[*n] = x;
                    *n += 1;
                }
            };
            // Pieces where M is monotone.
            let mut vcuts = [0.0f64, l, l, l];
            let mut nv = 1;
            for r in quadratic_roots(3.0 * c[3], 2.0 * c[2], c[1])
                .into_iter()
                .flatten()
            {
                if r > 0.0 && r < l {
                    vcuts[nv] = r;
                    nv += 1;
                }
            }
            vcuts[..nv].sort_by(f64::total_cmp);
            vcuts[nv] = l;
            for w in 0..nv {
                let (a, b) = (vcuts[w], vcuts[w + 1]);
                let (ma, mb) = (solve::moment(c, a), solve::moment(c, b));
                if ma * mb < 0.0 {
                    let r = if c[3] == 0.0 {
                        // M quadratic: closed form, the root inside [a, b].
                        quadratic_roots(c[2], c[1], c[0])
                            .into_iter()
                            .flatten()
                            .find(|r| *r >= a && *r <= b)
                            .unwrap_or(0.5 * (a + b))
                    } else {
                        moment_root(c, a, b, ma)
                    };
                    push_cut(r, &mut cuts, &mut n);
                }
            }
            cuts[..n].sort_by(f64::total_cmp);
            let mut s0 = 0.0;
            let mut t0 = solve::slope(c, 0.0);
            for &s1 in cuts[..n].iter().chain(std::iter::once(&l)) {
                let t1 = solve::slope(c, s1);
                if t0 == 0.0 {
                    e.push(solve::deflection(c, s0), s0);
                } else if t0 * t1 < 0.0 {
                    let r = bracketed_root(c, s0, s1, t0, hint);
                    e.push(solve::deflection(c, r), r);
                }
                s0 = s1;
                t0 = t1;
            }
        }
    }
    e
}

/// Real roots of a·x² + b·x + c (numerically stable form); a linear
/// equation when a is negligible.
#[inline]
fn quadratic_roots(a: f64, b: f64, c: f64) -> [Option<f64>; 2] {
    let scale = a.abs().max(b.abs()).max(c.abs());
    if scale == 0.0 {
        return [None, None];
    }
    if a.abs() <= 1e-14 * scale {
        return [if b != 0.0 { Some(-c / b) } else { None }, None];
    }
    let disc = b * b - 4.0 * a * c;
    if disc < 0.0 {
        return [None, None];
    }
    let q = -0.5 * (b + b.signum() * disc.sqrt());
    if q == 0.0 {
        return [Some(0.0), None];
    }
    [Some(q / a), Some(c / q)]
}

/// A root of f in [a, b], where f changes sign (f(a) = `fa`), by Newton's
/// method with derivative `df`, safeguarded by bisection; stops when the
/// step or the bracket is below `tol`.
#[inline]
fn safeguarded_newton(
    f: impl Fn(f64) -> f64,
    df: impl Fn(f64) -> f64,
    mut a: f64,
    mut b: f64,
    fa: f64,
    tol: f64,
    start: Option<f64>,
) -> f64 {
    let sa = fa.signum();
    let mut x = match start {
        Some(x) if x > a && x < b => x,
        _ => 0.5 * (a + b),
    };
    for _ in 0..80 {
        let v = f(x);
        if v == 0.0 {
            return x;
        }
        if v.signum() == sa {
            a = x;
        } else {
            b = x;
        }
        let d = df(x);
        let xn = if d != 0.0 { x - v / d } else { f64::NAN };
        let next = if xn > a && xn < b { xn } else { 0.5 * (a + b) };
        if (next - x).abs() <= tol || b - a <= tol {
            return next;
        }
        x = next;
    }
    x
}

/// A root of M in [a, b] where M changes sign and is monotone (dM/ds = V).
fn moment_root(c: &Coef, a: f64, b: f64, ma: f64) -> f64 {
    safeguarded_newton(
        |x| solve::moment(c, x),
        |x| solve::shear(c, x),
        a,
        b,
        ma,
        1e-12 * (b - a),
        None,
    )
}

/// A root of the slope in [a, b] (dθ/ds = −M). The deflection is flat at
/// its extreme, so a position good to 1e-10 of the interval gives the value
/// to round-off.
fn bracketed_root(c: &Coef, a: f64, b: f64, ta: f64, start: Option<f64>) -> f64 {
    safeguarded_newton(
        |x| solve::slope(c, x),
        |x| -solve::moment(c, x),
        a,
        b,
        ta,
        1e-10 * (b - a),
        start,
    )
}

/// A bound on |f''| over an element of length l, for the pruning of
/// pattern refinements.
#[inline]
pub(super) fn curvature_bound(q: Quantity, c: &Coef, l: f64) -> f64 {
    match q {
        Quantity::Moment => 2.0 * c[2].abs() + 6.0 * c[3].abs() * l,
        Quantity::Shear => 6.0 * c[3].abs(),
        Quantity::Deflection => c[0].abs() + l * (c[1].abs() + l * (c[2].abs() + l * c[3].abs())),
    }
}

/// f + s·u, coefficient by coefficient (a combination's base polynomial
/// at self-weight scale s).
#[inline]
pub(super) fn scaled_sum(f: &Coef, u: &Coef, s: f64) -> Coef {
    [
        f[0] + s * u[0],
        f[1] + s * u[1],
        f[2] + s * u[2],
        f[3] + s * u[3],
        f[4] + s * u[4],
        f[5] + s * u[5],
    ]
}

/// a + b, coefficient by coefficient.
#[inline]
pub(super) fn add_coef(a: &Coef, b: &Coef) -> Coef {
    [
        a[0] + b[0],
        a[1] + b[1],
        a[2] + b[2],
        a[3] + b[3],
        a[4] + b[4],
        a[5] + b[5],
    ]
}
