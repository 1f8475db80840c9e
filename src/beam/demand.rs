//! The demand: the beam analysed once, for every case and combination, as
//! element polynomials for E·I = 1, plus the response to a unit uniform
//! self-weight. A section check then only scales and adds (see DESIGN.md,
//! "analyse once, check many"):
//!
//!   M(x) = Σ factor·M_case(x) + w_sw·f_sw·M_unit(x)
//!   δ(x) = (Σ factor·y_case(x) + w_sw·f_sw·y_unit(x)) / (E·I)
//!
//! Pattern (skip) loading: a case marked `pattern` is split into one part
//! per stretch (span or overhang); at each station the envelope adds only
//! the parts that make the value worse. The maximum of the envelope is
//! located on stations (element ends and interior points) and then refined
//! exactly on the element polynomials with the pattern found there.

use super::model::{Beam, ComboKind, DeflectionLimit, Stretch};
use super::solve::{self, Coef, Mesh, MeshLoad, Response};
use crate::error::Result;

/// A combination ready for checking.
#[derive(Clone, Debug)]
pub struct ComboDemand {
    pub name: String,
    pub kind: ComboKind,
    pub limit: Option<DeflectionLimit>,
    /// Response to the combination's non-patterned loads (factors applied).
    pub fixed: Response,
    /// Factor on the self-weight (0 when self-weight is off or its case is
    /// not in this combination).
    pub sw_factor: f64,
    /// Patterned parts (factored), one per (case, stretch) with loads.
    pub patterns: Vec<Response>,
    /// Label of each pattern part, e.g. "live on span 2".
    pub pattern_labels: Vec<String>,
    /// The section-independent part of the pattern envelope, per quantity
    /// (moment, shear, deflection); empty without patterns.
    pub env: Vec<PatternEnv>,
}

/// Stations per element, ends included, for pattern envelopes.
const NST: usize = PATTERN_STATIONS + 2;

/// The pattern parts do not depend on the section, so at every station the
/// sum of their positive parts, of their negative parts, and which parts
/// are positive (the pattern) are computed once. Per element, each distinct
/// pattern seen at a station is stored as its summed coefficients, to be
/// maximised exactly with the section's base polynomial.
#[derive(Clone, Debug, Default)]
pub struct PatternEnv {
    pub hi: Vec<[f64; NST]>,
    pub lo: Vec<[f64; NST]>,
    pub plus: Vec<Vec<Coef>>,
    pub minus: Vec<Vec<Coef>>,
}

fn pattern_env(patterns: &[Response], q: Quantity, len: &[f64]) -> PatternEnv {
    let mut env = PatternEnv::default();
    for (e, &l) in len.iter().enumerate() {
        let (mut hi, mut lo) = ([0.0; NST], [0.0; NST]);
        let (mut mh, mut ml) = ([0u64; NST], [0u64; NST]);
        for k in 0..NST {
            let s = l * (k as f64 / (NST - 1) as f64);
            for (j, p) in patterns.iter().enumerate() {
                let v = eval(q, &p.elems[e], s);
                if v > 0.0 {
                    hi[k] += v;
                    mh[k] |= 1u64 << j;
                } else {
                    lo[k] += v;
                    ml[k] |= 1u64 << j;
                }
            }
        }
        let sums = |masks: &[u64; NST]| -> Vec<Coef> {
            let mut seen: Vec<u64> = Vec::new();
            let mut out = Vec::new();
            for &m in masks {
                if seen.contains(&m) {
                    continue;
                }
                seen.push(m);
                let mut c = [0.0; 6];
                for (j, p) in patterns.iter().enumerate() {
                    if m & (1u64 << j) != 0 {
                        for (ck, pk) in c.iter_mut().zip(p.elems[e].iter()) {
                            *ck += pk;
                        }
                    }
                }
                out.push(c);
            }
            out
        };
        env.plus.push(sums(&mh));
        env.minus.push(sums(&ml));
        env.hi.push(hi);
        env.lo.push(lo);
    }
    env
}

/// The beam analysed once.
#[derive(Clone, Debug)]
pub struct Demand {
    pub mesh: Mesh,
    /// Element lengths.
    pub len: Vec<f64>,
    pub stretches: Vec<Stretch>,
    pub node_x: Vec<f64>,
    /// Response to each load case (unfactored, not patterned).
    pub cases: Vec<Response>,
    /// Response to a uniform 1 N/mm over the whole beam.
    pub unit_sw: Response,
    pub combos: Vec<ComboDemand>,
    pub cantilever_factor: f64,
}

/// Which response quantity.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Quantity {
    Moment,
    Shear,
    Deflection,
}

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
    fn push(&mut self, v: f64, x: f64) {
        if v > self.max {
            self.max = v;
            self.x_max = x;
        }
        if v < self.min {
            self.min = v;
            self.x_min = x;
        }
    }
    fn merge(&mut self, o: &Extremes) {
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
                    let r = bracketed_root(c, s0, s1, t0);
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
) -> f64 {
    let sa = fa.signum();
    let mut x = 0.5 * (a + b);
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
    )
}

/// A root of the slope in [a, b] (dθ/ds = −M). The deflection is flat at
/// its extreme, so a position good to 1e-10 of the interval gives the value
/// to round-off.
fn bracketed_root(c: &Coef, a: f64, b: f64, ta: f64) -> f64 {
    safeguarded_newton(
        |x| solve::slope(c, x),
        |x| -solve::moment(c, x),
        a,
        b,
        ta,
        1e-10 * (b - a),
    )
}

#[inline]
fn add_coef(a: &Coef, b: &Coef) -> Coef {
    [
        a[0] + b[0],
        a[1] + b[1],
        a[2] + b[2],
        a[3] + b[3],
        a[4] + b[4],
        a[5] + b[5],
    ]
}

/// Interior stations per element used to locate envelope extremes under
/// pattern loading (before exact refinement).
const PATTERN_STATIONS: usize = 5;

impl Demand {
    /// Analyse every case, the unit self-weight, and every combination.
    /// `extra` adds stations (brace points, quarter points) to the mesh.
    pub fn build(beam: &Beam, extra: &[f64]) -> Result<Demand> {
        beam.validate()?;
        let mesh = solve::mesh(beam, extra);
        let len: Vec<f64> = mesh.x.windows(2).map(|w| w[1] - w[0]).collect();
        let stretches = beam.stretches();
        let case_loads: Vec<Vec<MeshLoad>> = (0..beam.cases.len())
            .map(|c| {
                beam.loads
                    .iter()
                    .filter(|l| l.case == c)
                    .map(|l| MeshLoad::from(&l.kind))
                    .collect()
            })
            .collect();
        let cases = case_loads
            .iter()
            .map(|loads| solve::analyse(beam, &mesh, loads))
            .collect::<Result<Vec<_>>>()?;
        let length = beam.length();
        let unit_sw = solve::analyse(
            beam,
            &mesh,
            &[MeshLoad::Distributed {
                x1: 0.0,
                x2: length,
                w1: 1.0,
                w2: 1.0,
            }],
        )?;
        // Pattern parts per (case, stretch), analysed once and shared by combos.
        let mut parts: Vec<Vec<(String, Response)>> = vec![Vec::new(); beam.cases.len()];
        let multi = stretches.len() > 1;
        for (ci, case) in beam.cases.iter().enumerate() {
            if !(case.pattern && multi) {
                continue;
            }
            for (si, s) in stretches.iter().enumerate() {
                let clipped: Vec<MeshLoad> = case_loads[ci]
                    .iter()
                    .filter_map(|l| l.clip(s.x1, s.x2, si == 0))
                    .collect();
                if clipped.is_empty() {
                    continue;
                }
                parts[ci].push((
                    format!("{} on {}", case.name, s.label),
                    solve::analyse(beam, &mesh, &clipped)?,
                ));
            }
        }
        let ne = mesh.elements();
        let nodes = beam.supports.len();
        let combos = beam
            .combinations
            .iter()
            .map(|c| {
                let mut fixed = Response::zero(ne, nodes);
                let mut patterns = Vec::new();
                let mut pattern_labels = Vec::new();
                let mut sw_factor = 0.0;
                for &(ci, f) in &c.factors {
                    if Some(ci) == beam.self_weight_case {
                        sw_factor += f;
                    }
                    if !parts[ci].is_empty() {
                        for (label, r) in &parts[ci] {
                            let mut p = Response::zero(ne, nodes);
                            p.add_scaled(f, r);
                            patterns.push(p);
                            pattern_labels.push(label.clone());
                        }
                    } else {
                        fixed.add_scaled(f, &cases[ci]);
                    }
                }
                let env = if patterns.is_empty() || patterns.len() > 64 {
                    Vec::new()
                } else {
                    [Quantity::Moment, Quantity::Shear, Quantity::Deflection]
                        .iter()
                        .map(|&q| pattern_env(&patterns, q, &len))
                        .collect()
                };
                ComboDemand {
                    name: c.name.clone(),
                    kind: c.kind,
                    limit: c.limit,
                    fixed,
                    sw_factor,
                    patterns,
                    pattern_labels,
                    env,
                }
            })
            .collect();
        Ok(Demand {
            len,
            stretches,
            node_x: beam.node_x(),
            cases,
            unit_sw,
            combos,
            mesh,
            cantilever_factor: beam.cantilever_factor,
        })
    }

    /// Combined coefficients of element `e` for a combination with
    /// self-weight intensity `w_sw` (N/mm), patterns left out.
    #[inline]
    pub fn base_coef(&self, combo: &ComboDemand, w_sw: f64, e: usize) -> Coef {
        let f = &combo.fixed.elems[e];
        let u = &self.unit_sw.elems[e];
        let s = w_sw * combo.sw_factor;
        [
            f[0] + s * u[0],
            f[1] + s * u[1],
            f[2] + s * u[2],
            f[3] + s * u[3],
            f[4] + s * u[4],
            f[5] + s * u[5],
        ]
    }

    /// Extremes of a quantity over the elements `elems` for a combination,
    /// with pattern loading enveloped when the combination has patterns.
    pub fn extremes(
        &self,
        combo: &ComboDemand,
        w_sw: f64,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> Extremes {
        let mut ex = Extremes::EMPTY;
        if combo.patterns.is_empty() {
            for e in elems {
                let c = self.base_coef(combo, w_sw, e);
                let mut el = element_extremes(q, &c, self.len[e]);
                el.x_max += self.mesh.x[e];
                el.x_min += self.mesh.x[e];
                ex.merge(&el);
            }
            return ex.cleaned();
        }
        // Envelope on stations; in each element, every distinct pattern seen
        // at a station is then maximised exactly on the element polynomial.
        let qi = match q {
            Quantity::Moment => 0,
            Quantity::Shear => 1,
            Quantity::Deflection => 2,
        };
        let Some(env) = combo.env.get(qi) else {
            return self.extremes_slow(combo, w_sw, q, elems).cleaned();
        };
        // Per element: the envelope on its stations, then the exact maxima of
        // its patterns, skipping those that provably cannot beat the best so
        // far. Between stations h apart a function with |f''| ≤ K exceeds its
        // larger end value by at most K·h²/8, and at a station no pattern
        // exceeds the envelope.
        for e in elems {
            let base = self.base_coef(combo, w_sw, e);
            let x0 = self.mesh.x[e];
            let l = self.len[e];
            let h = l / (NST - 1) as f64;
            let (mut s_hi, mut s_lo) = (f64::NEG_INFINITY, f64::INFINITY);
            for k in 0..NST {
                let s = h * k as f64;
                let b = eval(q, &base, s);
                let (hi, lo) = (b + env.hi[e][k], b + env.lo[e][k]);
                ex.push(hi, x0 + s);
                ex.push(lo, x0 + s);
                s_hi = s_hi.max(hi);
                s_lo = s_lo.min(lo);
            }
            let curvature_bound = |c: &Coef| -> f64 {
                match q {
                    Quantity::Moment => 2.0 * c[2].abs() + 6.0 * c[3].abs() * l,
                    Quantity::Shear => 6.0 * c[3].abs(),
                    Quantity::Deflection => {
                        c[0].abs() + l * (c[1].abs() + l * (c[2].abs() + l * c[3].abs()))
                    }
                }
            };
            for p in &env.plus[e] {
                let c = add_coef(&base, p);
                if s_hi + curvature_bound(&c) * h * h / 8.0 <= ex.max {
                    continue;
                }
                let el = element_extremes(q, &c, l);
                if el.max > ex.max {
                    ex.max = el.max;
                    ex.x_max = x0 + el.x_max;
                }
            }
            for p in &env.minus[e] {
                let c = add_coef(&base, p);
                if s_lo - curvature_bound(&c) * h * h / 8.0 >= ex.min {
                    continue;
                }
                let el = element_extremes(q, &c, l);
                if el.min < ex.min {
                    ex.min = el.min;
                    ex.x_min = x0 + el.x_min;
                }
            }
        }
        ex.cleaned()
    }

    /// Envelope on stations without refinement, for more than 64 pattern
    /// parts (no pattern masks): conservative to the station spacing only.
    fn extremes_slow(
        &self,
        combo: &ComboDemand,
        w_sw: f64,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> Extremes {
        let mut ex = Extremes::EMPTY;
        for e in elems {
            for k in 0..NST {
                let s = self.len[e] * (k as f64 / (NST - 1) as f64);
                let (lo, hi) = self.envelope_at(combo, w_sw, q, e, s);
                ex.push(hi, self.mesh.x[e] + s);
                ex.push(lo, self.mesh.x[e] + s);
            }
        }
        ex
    }

    /// Elements of stretch `k`.
    pub fn stretch_elements(&self, k: usize) -> std::ops::Range<usize> {
        let first = self
            .mesh
            .stretch_of
            .iter()
            .position(|&s| s == k)
            .unwrap_or(0);
        let last = self
            .mesh
            .stretch_of
            .iter()
            .rposition(|&s| s == k)
            .map(|i| i + 1)
            .unwrap_or(first);
        first..last
    }

    /// Moment at a mesh node (the value just right of it, enveloped by
    /// magnitude under patterns) — used for Cb's quarter points.
    pub fn abs_moment_at_node(&self, combo: &ComboDemand, w_sw: f64, node: usize) -> f64 {
        let (e, s) = if node < self.len.len() {
            (node, 0.0)
        } else {
            (node - 1, self.len[node - 1])
        };
        let base = solve::moment(&self.base_coef(combo, w_sw, e), s);
        if combo.patterns.is_empty() {
            return base.abs();
        }
        let (mut hi, mut lo) = (base, base);
        for p in &combo.patterns {
            let v = solve::moment(&p.elems[e], s);
            if v > 0.0 {
                hi += v;
            } else {
                lo += v;
            }
        }
        hi.abs().max(lo.abs())
    }

    /// Reactions of a combination: (min, max) upward force at each beam
    /// node over the patterns, for self-weight intensity `w_sw`.
    pub fn reactions(&self, combo: &ComboDemand, w_sw: f64) -> Vec<(f64, f64)> {
        (0..self.node_x.len())
            .map(|n| {
                let b = combo.fixed.reaction[n] + w_sw * combo.sw_factor * self.unit_sw.reaction[n];
                let (mut lo, mut hi) = (b, b);
                for p in &combo.patterns {
                    let v = p.reaction[n];
                    if v > 0.0 {
                        hi += v;
                    } else {
                        lo += v;
                    }
                }
                (lo, hi)
            })
            .collect()
    }
}

impl Demand {
    /// (min, max) of a quantity at local position `s` of element `e` over
    /// the load patterns (equal when the combination has none).
    pub fn envelope_at(
        &self,
        combo: &ComboDemand,
        w_sw: f64,
        q: Quantity,
        e: usize,
        s: f64,
    ) -> (f64, f64) {
        let b = eval(q, &self.base_coef(combo, w_sw, e), s);
        let (mut lo, mut hi) = (b, b);
        for p in &combo.patterns {
            let v = eval(q, &p.elems[e], s);
            if v > 0.0 {
                hi += v;
            } else {
                lo += v;
            }
        }
        (lo, hi)
    }
}
