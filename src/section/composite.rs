//! Exact properties of sections built from rectangles and fillet
//! "spandrels" (the region between two perpendicular edges and a concave
//! quarter-circle arc, as at a rolled I's root fillet or a rounded tube
//! corner), each added or removed.
//!
//! Every part is integrated in closed form: rectangles trivially; the
//! spandrel of radius r as a square r×r minus a quarter disc, whose area
//! πr²/4, centroid 4r/(3π) from the centre and second moment πr⁴/16 about a
//! diameter are the standard results (e.g. Gere & Goodno, *Mechanics of
//! Materials*, Appendix E). Clipped integrals use
//! ∫√(r²−t²)dt = ½(t√(r²−t²) + r²·asin(t/r)).
//!
//! All parts are placed symmetrically about the vertical axis x = 0 by the
//! shape constructors; y is measured up from the bottom fibre.

use std::f64::consts::PI;

#[derive(Clone, Copy, Debug)]
pub(crate) enum Part {
    /// Rectangle of width `b`, height `h`, centred on x = `xc`, bottom at `yb`.
    Rect { xc: f64, yb: f64, b: f64, h: f64 },
    /// Spandrel with its right-angle corner at (`x`, `y`), extending `r` in
    /// the x direction `sx` (±1) and the y direction `sy` (±1).
    Spandrel {
        x: f64,
        y: f64,
        sx: f64,
        sy: f64,
        r: f64,
    },
}

/// A part with a sign: +1 material added, −1 material removed.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Signed {
    pub part: Part,
    pub sign: f64,
}

pub(crate) fn add(part: Part) -> Signed {
    Signed { part, sign: 1.0 }
}
pub(crate) fn sub(part: Part) -> Signed {
    Signed { part, sign: -1.0 }
}

/// ∫√(r²−t²)dt antiderivative.
fn circ_f(r: f64, t: f64) -> f64 {
    let t = t.clamp(-r, r);
    0.5 * (t * (r * r - t * t).max(0.0).sqrt() + r * r * (t / r).asin())
}

/// ∫ t·√(r²−t²) dt antiderivative.
fn circ_g(r: f64, t: f64) -> f64 {
    let t = t.clamp(-r, r);
    -((r * r - t * t).max(0.0)).powf(1.5) / 3.0
}

/// Spandrel width at distance `u` (0..r) from its straight edge.
fn spandrel_width(r: f64, u: f64) -> f64 {
    if !(0.0..=r).contains(&u) {
        return 0.0;
    }
    let t = r - u;
    r - (r * r - t * t).max(0.0).sqrt()
}

/// (area, first moment about u = 0) of the spandrel strip 0 ≤ u ≤ s.
fn spandrel_partial(r: f64, s: f64) -> (f64, f64) {
    let s = s.clamp(0.0, r);
    if r == 0.0 {
        return (0.0, 0.0);
    }
    // ∫0^s √(r²−(r−u)²) du = F(r) − F(r−s)
    let circ = circ_f(r, r) - circ_f(r, r - s);
    let area = r * s - circ;
    // ∫0^s u √(..) du with u = r − t:  r·circ − (G(r) − G(r−s))
    let circ_u = r * circ - (circ_g(r, r) - circ_g(r, r - s));
    let m1 = r * s * s / 2.0 - circ_u;
    (area, m1)
}

/// Area, centroid distance from either straight edge, and second moment
/// about its own centroidal axis parallel to an edge, of a full spandrel.
pub(crate) fn spandrel_full(r: f64) -> (f64, f64, f64) {
    let a = r * r * (1.0 - PI / 4.0);
    if a == 0.0 {
        return (0.0, 0.0, 0.0);
    }
    let (_, m1) = spandrel_partial(r, r);
    let ubar = m1 / a;
    // Second moment about the edge u = 0: square r⁴/3 minus the quarter disc
    // (centre at u = r) about that edge.
    let qd_area = PI * r * r / 4.0;
    let qd_off = 4.0 * r / (3.0 * PI);
    let qd_ic = PI * r.powi(4) / 16.0 - qd_area * qd_off * qd_off;
    let qd_edge = qd_ic + qd_area * (r - qd_off).powi(2);
    let i_edge = r.powi(4) / 3.0 - qd_edge;
    (a, ubar, i_edge - a * ubar * ubar)
}

impl Part {
    /// (area, ȳ, x̄, I about own horizontal centroidal axis, I about own
    /// vertical centroidal axis).
    fn props(&self) -> (f64, f64, f64, f64, f64) {
        match *self {
            Part::Rect { xc, yb, b, h } => (
                b * h,
                yb + h / 2.0,
                xc,
                b * h.powi(3) / 12.0,
                h * b.powi(3) / 12.0,
            ),
            Part::Spandrel { x, y, sx, sy, r } => {
                let (a, ubar, ic) = spandrel_full(r);
                (a, y + sy * ubar, x + sx * ubar, ic, ic)
            }
        }
    }

    fn width_at(&self, yq: f64) -> f64 {
        match *self {
            Part::Rect { yb, b, h, .. } => {
                if yq >= yb && yq <= yb + h {
                    b
                } else {
                    0.0
                }
            }
            Part::Spandrel { y, sy, r, .. } => spandrel_width(r, (yq - y) * sy),
        }
    }

    /// (area, first moment about y = 0) of the part below height `yq`.
    fn below(&self, yq: f64) -> (f64, f64) {
        match *self {
            Part::Rect { yb, b, h, .. } => {
                let top = yq.clamp(yb, yb + h);
                let a = b * (top - yb);
                (a, a * (yb + top) / 2.0)
            }
            Part::Spandrel { y, sy, r, .. } => {
                let (a_full, m_full) = spandrel_partial(r, r);
                if sy > 0.0 {
                    // u grows upward from y.
                    let (a, m) = spandrel_partial(r, yq - y);
                    (a, y * a + m)
                } else {
                    // u grows downward from y: below yq means u ≥ y − yq.
                    let (a0, m0) = spandrel_partial(r, y - yq);
                    let a = a_full - a0;
                    let m = m_full - m0;
                    (a, y * a - m)
                }
            }
        }
    }
}

/// Most parts any shape needs (an RHS: 2 rectangles + 8 spandrels).
const MAX_PARTS: usize = 12;

/// Integrated properties of a composite section. Parts are kept in a fixed
/// array: section properties are computed per catalogue row, so this path
/// must not allocate.
#[derive(Clone, Debug)]
pub(crate) struct Composite {
    store: [Signed; MAX_PARTS],
    n: usize,
}

pub(crate) struct Integrated {
    pub area: f64,
    pub y_c: f64,
    pub ix: f64,
    pub iy: f64,
}

impl Composite {
    pub fn new() -> Self {
        Composite {
            store: [add(Part::Rect {
                xc: 0.0,
                yb: 0.0,
                b: 0.0,
                h: 0.0,
            }); MAX_PARTS],
            n: 0,
        }
    }

    pub fn push(&mut self, p: Signed) {
        // Shapes push at most MAX_PARTS parts (checked by the tests of every
        // family); an extra part would be a programming error.
        debug_assert!(self.n < MAX_PARTS);
        if self.n < MAX_PARTS {
            self.store[self.n] = p;
            self.n += 1;
        }
    }

    fn parts(&self) -> &[Signed] {
        &self.store[..self.n]
    }

    pub fn integrate(&self) -> Integrated {
        let (mut a, mut ay, mut iy0, mut iyy) = (0.0, 0.0, 0.0, 0.0);
        for p in self.parts() {
            let (pa, py, px, pix, piy) = p.part.props();
            a += p.sign * pa;
            ay += p.sign * pa * py;
            iy0 += p.sign * (pix + pa * py * py);
            iyy += p.sign * (piy + pa * px * px);
        }
        let y_c = ay / a;
        Integrated {
            area: a,
            y_c,
            ix: iy0 - a * y_c * y_c,
            iy: iyy,
        }
    }

    pub fn width_at(&self, y: f64) -> f64 {
        self.parts()
            .iter()
            .map(|p| p.sign * p.part.width_at(y))
            .sum::<f64>()
            .max(0.0)
    }

    /// (area, first moment about y = 0) below height y.
    pub fn below(&self, y: f64) -> (f64, f64) {
        let mut a = 0.0;
        let mut m = 0.0;
        for p in self.parts() {
            let (pa, pm) = p.part.below(y);
            a += p.sign * pa;
            m += p.sign * pm;
        }
        (a, m)
    }

    /// First moment about the axis at `y` of the area above `y`.
    pub fn q_above(&self, y: f64, total_area: f64, total_moment: f64) -> f64 {
        let (ab, mb) = self.below(y);
        let aa = total_area - ab;
        let ma = total_moment - mb;
        ma - y * aa
    }

    /// Plastic modulus about the horizontal equal-area axis; returns
    /// (Z, y of the plastic neutral axis).
    pub fn plastic(&self, depth: f64, total_area: f64) -> (f64, f64) {
        // Sections symmetric about mid-depth (most of them) need no search.
        let mid = depth / 2.0;
        let (a_mid, m_mid) = self.below(mid);
        if (a_mid - total_area / 2.0).abs() <= 1e-13 * total_area {
            let total_m = self.below(depth).1;
            let above = (total_m - m_mid) - mid * (total_area - a_mid);
            let below = mid * a_mid - m_mid;
            return (above + below, mid);
        }
        let (mut lo, mut hi) = (0.0, depth);
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if self.below(mid).0 < total_area / 2.0 {
                lo = mid;
            } else {
                hi = mid;
            }
            if hi - lo <= depth * 1e-15 {
                break;
            }
        }
        let yp = 0.5 * (lo + hi);
        let (ab, mb) = self.below(yp);
        let total_m = self.below(depth).1;
        let above = (total_m - mb) - yp * (total_area - ab);
        let below = yp * ab - mb;
        (above + below, yp)
    }
}
