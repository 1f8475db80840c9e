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
//!
//! Spring supports. With springs, moment and shear depend on E·I, so the
//! analysis holds every spring rigid and adds one basis response per spring:
//! a unit downward settlement of that support (E·I = 1). For a section of
//! stiffness E·I, the settlements Δ solve the compatibility of the spring
//! forces with the reactions (with u = E·I·Δ):
//!
//!   (diag(k/(E·I)) − ρ)·u = R₀
//!
//! where R₀ are the rigid-support reactions at the springs and ρ_ij the
//! reaction at spring i for a unit settlement of spring j (ρ is negative
//! semi-definite, so the matrix is positive definite for k > 0). Every
//! coefficient of the combined response is then c₀ + Σ_j u_j·c_j; the
//! small system is solved, on the stack, when a combination is applied to
//! a section ([`Demand::apply`]): no re-analysis and no allocation. k → ∞ gives u → 0 (rigid); k → 0 gives zero reaction at the
//! spring (support removed). Deflections stay measured from the chord of
//! each span's displaced supports; the settlements are reported apart.

use super::model::{Beam, ComboKind, DeflectionLimit, Stretch, Support};
use super::solve::{self, Coef, Mesh, MeshLoad, Response};
use crate::error::{Error, Result};

/// Most spring supports in one beam (the per-section compatibility system
/// lives on the stack).
pub const MAX_SPRINGS: usize = 16;

/// Most pattern parts (case × span with loads) in one combination: the
/// envelope records which parts are active as bits of a u64.
pub const MAX_PATTERN_PARTS: usize = 64;

/// One spring support's basis response.
#[derive(Clone, Debug)]
pub struct SpringBasis {
    /// Beam node of the spring.
    pub node: usize,
    /// Stiffness k, N/mm.
    pub k: f64,
    /// Response to a unit downward settlement of this support, E·I = 1,
    /// every spring held rigid.
    pub resp: Response,
}

/// What the demand needs to know of one section: its self-weight
/// intensity and bending stiffness. Built once per section by
/// [`Demand::section`].
#[derive(Clone, Debug)]
pub struct SectionLoad {
    /// Self-weight intensity, N/mm.
    pub w_sw: f64,
    /// Bending stiffness E·I, N·mm² (only needed with springs and for
    /// deflections).
    pub ei: f64,
    /// Number of springs.
    ns: usize,
}

/// One combination applied to one section: the self-weight scale and the
/// spring correction of the non-patterned loads.
#[derive(Clone, Copy, Debug)]
pub struct Applied<'a> {
    pub combo: &'a ComboDemand,
    pub sect: &'a SectionLoad,
    /// Self-weight intensity times the combination's self-weight factor.
    s: f64,
    /// E·I × settlement of each spring under the non-patterned loads.
    u: [f64; MAX_SPRINGS],
}

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
    /// Per element and quantity, the extremes precomputed for every section
    /// where they can be (no patterns, no springs); empty otherwise.
    pub pre: Vec<[Pre; 3]>,
}

/// An element's extremes, known before any section is checked.
///
/// The combined polynomial of an element is fixed + s·unit, s the
/// section's self-weight intensity (times the combination's factor). When
/// the combination has no self-weight, it is fixed for every section; when
/// fixed = a·unit on the element (a uniform load over the whole beam, the
/// commonest job), it is (a + s)·unit, whose extremes are those of unit
/// scaled by a + s (max and min swap when a + s < 0). Only the remaining
/// elements are solved per section.
#[derive(Clone, Copy, Debug)]
pub enum Pre {
    /// Depends on the section: solved per section.
    Solve,
    /// fixed = a·unit: the extremes of unit (local positions).
    Scaled { a: f64, ex: Extremes },
    /// No self-weight in the combination: the extremes of fixed.
    Fixed(Extremes),
}

impl Pre {
    /// The extremes for self-weight scale `s` (local positions), if known.
    #[inline]
    fn at(&self, s: f64) -> Option<Extremes> {
        match *self {
            Pre::Solve => None,
            Pre::Fixed(ex) => Some(ex),
            Pre::Scaled { a, ex } => {
                let k = a + s;
                Some(if k >= 0.0 {
                    Extremes {
                        max: k * ex.max,
                        x_max: ex.x_max,
                        min: k * ex.min,
                        x_min: ex.x_min,
                    }
                } else {
                    Extremes {
                        max: k * ex.min,
                        x_max: ex.x_min,
                        min: k * ex.max,
                        x_min: ex.x_max,
                    }
                })
            }
        }
    }
}

/// Is `f` = a·`u` as a polynomial of quantity `q` on [0, l]? Compared at
/// seven stations (more than the six coefficients of a quintic), to 1e-12
/// of the largest value.
fn proportional(q: Quantity, f: &Coef, u: &Coef, l: f64) -> Option<f64> {
    let mut fv = [0.0; NST];
    let mut uv = [0.0; NST];
    for k in 0..NST {
        let s = l * k as f64 / (NST - 1) as f64;
        fv[k] = eval(q, f, s);
        uv[k] = eval(q, u, s);
    }
    let (uu, fu): (f64, f64) = uv
        .iter()
        .zip(&fv)
        .fold((0.0, 0.0), |(a, b), (u, f)| (a + u * u, b + f * u));
    if uu == 0.0 {
        return None;
    }
    let a = fu / uu;
    let big = fv
        .iter()
        .zip(&uv)
        .fold(0.0f64, |m, (f, u)| m.max(f.abs()).max((a * u).abs()));
    let ok = fv
        .iter()
        .zip(&uv)
        .all(|(f, u)| (f - a * u).abs() <= 1e-12 * big);
    ok.then_some(a)
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
    /// Spring supports, in node order.
    pub springs: Vec<SpringBasis>,
    /// ρ[i·n + j]: upward reaction at spring i for a unit downward
    /// settlement of spring j, E·I = 1 (n = number of springs).
    pub rho: Vec<f64>,
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

/// A bound on |f''| over an element of length l, for the pruning of
/// pattern refinements.
#[inline]
fn curvature_bound(q: Quantity, c: &Coef, l: f64) -> f64 {
    match q {
        Quantity::Moment => 2.0 * c[2].abs() + 6.0 * c[3].abs() * l,
        Quantity::Shear => 6.0 * c[3].abs(),
        Quantity::Deflection => c[0].abs() + l * (c[1].abs() + l * (c[2].abs() + l * c[3].abs())),
    }
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
        // Pattern parts per (case, stretch), analysed once and shared by
        // combos. Skip loading: each part on or off. Partial loading: half
        // of the case everywhere, plus each part's other half on or off.
        let mut parts: Vec<Vec<(String, Response)>> = vec![Vec::new(); beam.cases.len()];
        let mut part_share = vec![1.0; beam.cases.len()];
        let multi = stretches.len() > 1;
        for (ci, case) in beam.cases.iter().enumerate() {
            if !(case.pattern.is_on() && multi) {
                continue;
            }
            if case.pattern == super::model::Pattern::Partial {
                part_share[ci] = 0.5;
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
        let mut springs = Vec::new();
        for (node, sup) in beam.supports.iter().enumerate() {
            if let Support::Spring(k) = *sup {
                springs.push(SpringBasis {
                    node,
                    k,
                    resp: solve::analyse_settlement(beam, &mesh, node)?,
                });
            }
        }
        if springs.len() > MAX_SPRINGS {
            return Err(Error::msg(format!(
                "the beam has {} spring supports: at most {MAX_SPRINGS} are supported",
                springs.len()
            ))
            .in_field("supports"));
        }
        let ns = springs.len();
        let mut rho = vec![0.0; ns * ns];
        for i in 0..ns {
            for j in 0..ns {
                rho[i * ns + j] = springs[j].resp.reaction[springs[i].node];
            }
        }
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
                        let share = part_share[ci];
                        for (label, r) in &parts[ci] {
                            let mut p = Response::zero(ne, nodes);
                            p.add_scaled(f * share, r);
                            patterns.push(p);
                            pattern_labels.push(label.clone());
                        }
                        if share < 1.0 {
                            fixed.add_scaled(f * (1.0 - share), &cases[ci]);
                        }
                    } else {
                        fixed.add_scaled(f, &cases[ci]);
                    }
                }
                let env = if patterns.is_empty() || !springs.is_empty() {
                    // With springs every part's response depends on E·I:
                    // the envelope is formed per section.
                    Vec::new()
                } else {
                    [Quantity::Moment, Quantity::Shear, Quantity::Deflection]
                        .iter()
                        .map(|&q| pattern_env(&patterns, q, &len))
                        .collect()
                };
                if patterns.len() > MAX_PATTERN_PARTS {
                    return Err(Error::msg(format!(
                        "combination '{}' has {} patterned parts (load case × span): at most {MAX_PATTERN_PARTS} are supported; turn pattern loading off for some cases (pattern = false)",
                        c.name,
                        patterns.len()
                    )));
                }
                let pre = if patterns.is_empty() && springs.is_empty() {
                    (0..ne)
                        .map(|e| {
                            let l = len[e];
                            [Quantity::Moment, Quantity::Shear, Quantity::Deflection].map(|q| {
                                if sw_factor == 0.0 {
                                    Pre::Fixed(element_extremes(q, &fixed.elems[e], l))
                                } else {
                                    match proportional(q, &fixed.elems[e], &unit_sw.elems[e], l) {
                                        Some(a) => Pre::Scaled {
                                            a,
                                            ex: element_extremes(q, &unit_sw.elems[e], l),
                                        },
                                        None => Pre::Solve,
                                    }
                                }
                            })
                        })
                        .collect()
                } else {
                    Vec::new()
                };
                Ok(ComboDemand {
                    pre,
                    name: c.name.clone(),
                    kind: c.kind,
                    limit: c.limit,
                    fixed,
                    sw_factor,
                    patterns,
                    pattern_labels,
                    env,
                })
            })
            .collect::<Result<Vec<_>>>()?;
        Ok(Demand {
            len,
            stretches,
            node_x: beam.node_x(),
            cases,
            unit_sw,
            combos,
            mesh,
            cantilever_factor: beam.cantilever_factor,
            springs,
            rho,
        })
    }

    /// Prepare a section: self-weight intensity `w_sw` (N/mm) and bending
    /// stiffness `ei` (N·mm²). Small and cheap: the spring compatibility is
    /// solved when a combination is applied.
    #[inline]
    pub fn section(&self, w_sw: f64, ei: f64) -> SectionLoad {
        SectionLoad {
            w_sw,
            ei,
            ns: self.springs.len(),
        }
    }

    /// The spring correction u for a response (scaled by `f`): the
    /// solution of (diag(k/(E·I)) − ρ)·u = f·R₀ by Gaussian elimination with
    /// partial pivoting, on the stack (the system is a few springs wide).
    #[allow(clippy::needless_range_loop)]
    fn spring_u(&self, sect: &SectionLoad, r: &Response, f: f64) -> [f64; MAX_SPRINGS] {
        let ns = sect.ns;
        let mut u = [0.0; MAX_SPRINGS];
        if ns == 0 {
            return u;
        }
        let mut a = [[0.0f64; MAX_SPRINGS]; MAX_SPRINGS];
        for i in 0..ns {
            for j in 0..ns {
                a[i][j] = -self.rho[i * ns + j];
            }
            a[i][i] += self.springs[i].k / sect.ei;
            u[i] = f * r.reaction[self.springs[i].node];
        }
        for c in 0..ns {
            let p = (c..ns)
                .max_by(|&x, &y| a[x][c].abs().total_cmp(&a[y][c].abs()))
                .unwrap_or(c);
            a.swap(c, p);
            u.swap(c, p);
            let d = a[c][c];
            for r in c + 1..ns {
                let m = a[r][c] / d;
                if m != 0.0 {
                    for j in c..ns {
                        a[r][j] -= m * a[c][j];
                    }
                    u[r] -= m * u[c];
                }
            }
        }
        for i in (0..ns).rev() {
            let mut v = u[i];
            for j in i + 1..ns {
                v -= a[i][j] * u[j];
            }
            u[i] = v / a[i][i];
        }
        u
    }

    /// Apply combination `ci` to a prepared section.
    #[inline]
    pub fn apply<'a>(&'a self, ci: usize, sect: &'a SectionLoad) -> Applied<'a> {
        let combo = &self.combos[ci];
        let s = sect.w_sw * combo.sw_factor;
        let mut u = [0.0; MAX_SPRINGS];
        if sect.ns > 0 {
            let a = self.spring_u(sect, &combo.fixed, 1.0);
            let b = self.spring_u(sect, &self.unit_sw, s);
            for i in 0..sect.ns {
                u[i] = a[i] + b[i];
            }
        }
        Applied { combo, sect, s, u }
    }

    /// Extremes of combination `ci` for one section (self-weight intensity
    /// `w_sw`, stiffness `ei`): [`Demand::section`], [`Demand::apply`] and
    /// [`Demand::extremes`] in one call, for one-off use.
    pub fn combo_extremes(
        &self,
        ci: usize,
        w_sw: f64,
        ei: f64,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> Extremes {
        let sl = self.section(w_sw, ei);
        self.extremes(&self.apply(ci, &sl), q, elems)
    }

    /// Coefficients of response `r` on element `e` with a spring
    /// correction `u` added.
    #[inline]
    fn corrected(&self, r: &Coef, u: &[f64; MAX_SPRINGS], ns: usize, e: usize) -> Coef {
        let mut c = *r;
        for (j, sp) in self.springs.iter().enumerate().take(ns) {
            let b = &sp.resp.elems[e];
            for k in 0..6 {
                c[k] += u[j] * b[k];
            }
        }
        c
    }

    /// Coefficients of pattern part `j` on element `e`, spring-corrected.
    pub fn part_coef(&self, a: &Applied<'_>, j: usize, e: usize) -> Coef {
        let p = &a.combo.patterns[j];
        if a.sect.ns == 0 {
            return p.elems[e];
        }
        let u = self.spring_u(a.sect, p, 1.0);
        self.corrected(&p.elems[e], &u, a.sect.ns, e)
    }

    /// Upward reaction of pattern part `j` at beam node `n`, spring-corrected.
    fn part_reaction(&self, a: &Applied<'_>, j: usize, n: usize) -> f64 {
        let p = &a.combo.patterns[j];
        let mut r = p.reaction[n];
        if a.sect.ns > 0 {
            let u = self.spring_u(a.sect, p, 1.0);
            for (i, sp) in self.springs.iter().enumerate() {
                r += u[i] * sp.resp.reaction[n];
            }
        }
        r
    }

    /// Combined coefficients of element `e` for an applied combination,
    /// patterns left out.
    #[inline]
    pub fn base_coef(&self, a: &Applied<'_>, e: usize) -> Coef {
        let f = &a.combo.fixed.elems[e];
        let u = &self.unit_sw.elems[e];
        let s = a.s;
        let c = [
            f[0] + s * u[0],
            f[1] + s * u[1],
            f[2] + s * u[2],
            f[3] + s * u[3],
            f[4] + s * u[4],
            f[5] + s * u[5],
        ];
        if a.sect.ns == 0 {
            c
        } else {
            self.corrected(&c, &a.u, a.sect.ns, e)
        }
    }

    /// Extremes of a quantity over the elements `elems` for an applied
    /// combination, with pattern loading enveloped when it has patterns.
    pub fn extremes(
        &self,
        a: &Applied<'_>,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> Extremes {
        let combo = a.combo;
        let mut ex = Extremes::EMPTY;
        let qi = match q {
            Quantity::Moment => 0,
            Quantity::Shear => 1,
            Quantity::Deflection => 2,
        };
        if combo.patterns.is_empty() {
            let pre = &combo.pre;
            for e in elems {
                let mut el = match pre.get(e).and_then(|p| p[qi].at(a.s)) {
                    Some(el) => el,
                    None => element_extremes(q, &self.base_coef(a, e), self.len[e]),
                };
                el.x_max += self.mesh.x[e];
                el.x_min += self.mesh.x[e];
                ex.merge(&el);
            }
            return ex.cleaned();
        }
        let Some(env) = combo.env.get(qi) else {
            return self.extremes_per_section(a, q, elems).cleaned();
        };
        // Envelope on stations; in each element, every distinct pattern seen
        // at a station is then maximised exactly on the element polynomial,
        // skipping those that provably cannot beat the best so far. Between
        // stations h apart a function with |f''| ≤ K exceeds its larger end
        // value by at most K·h²/8, and at a station no pattern exceeds the
        // envelope.
        for e in elems {
            let base = self.base_coef(a, e);
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
            for p in &env.plus[e] {
                let c = add_coef(&base, p);
                if s_hi + curvature_bound(q, &c, l) * h * h / 8.0 <= ex.max {
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
                if s_lo - curvature_bound(q, &c, l) * h * h / 8.0 >= ex.min {
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

    /// The pattern envelope formed for one section (springs make every
    /// part depend on E·I): the same station masks and exact refinement as
    /// the precomputed path, on the stack.
    fn extremes_per_section(
        &self,
        a: &Applied<'_>,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> Extremes {
        let np = a.combo.patterns.len();
        let mut us = [[0.0f64; MAX_SPRINGS]; MAX_PATTERN_PARTS];
        for (j, u) in us.iter_mut().enumerate().take(np) {
            *u = self.spring_u(a.sect, &a.combo.patterns[j], 1.0);
        }
        let mut ex = Extremes::EMPTY;
        let mut parts = [[0.0f64; 6]; MAX_PATTERN_PARTS];
        for e in elems {
            let base = self.base_coef(a, e);
            let x0 = self.mesh.x[e];
            let l = self.len[e];
            let h = l / (NST - 1) as f64;
            for j in 0..np {
                parts[j] = self.corrected(&a.combo.patterns[j].elems[e], &us[j], a.sect.ns, e);
            }
            let (mut mh, mut ml) = ([0u64; NST], [0u64; NST]);
            for k in 0..NST {
                let s = h * k as f64;
                let b = eval(q, &base, s);
                let (mut hi, mut lo) = (b, b);
                for (j, c) in parts.iter().enumerate().take(np) {
                    let v = eval(q, c, s);
                    if v > 0.0 {
                        hi += v;
                        mh[k] |= 1u64 << j;
                    } else {
                        lo += v;
                        ml[k] |= 1u64 << j;
                    }
                }
                ex.push(hi, x0 + s);
                ex.push(lo, x0 + s);
            }
            for (masks, upper) in [(&mh, true), (&ml, false)] {
                for k in 0..NST {
                    if masks[..k].contains(&masks[k]) {
                        continue;
                    }
                    let mut c = base;
                    for (j, pc) in parts.iter().enumerate().take(np) {
                        if masks[k] & (1u64 << j) != 0 {
                            c = add_coef(&c, pc);
                        }
                    }
                    let el = element_extremes(q, &c, l);
                    if upper && el.max > ex.max {
                        ex.max = el.max;
                        ex.x_max = x0 + el.x_max;
                    }
                    if !upper && el.min < ex.min {
                        ex.min = el.min;
                        ex.x_min = x0 + el.x_min;
                    }
                }
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
    pub fn abs_moment_at_node(&self, a: &Applied<'_>, node: usize) -> f64 {
        let (e, s) = if node < self.len.len() {
            (node, 0.0)
        } else {
            (node - 1, self.len[node - 1])
        };
        let (lo, hi) = self.envelope_at(a, Quantity::Moment, e, s);
        hi.abs().max(lo.abs())
    }

    /// Reactions of an applied combination: (min, max) upward force at
    /// each beam node over the patterns.
    pub fn reactions(&self, a: &Applied<'_>) -> Vec<(f64, f64)> {
        (0..self.node_x.len())
            .map(|n| {
                let mut b = a.combo.fixed.reaction[n] + a.s * self.unit_sw.reaction[n];
                for (i, sp) in self.springs.iter().enumerate() {
                    b += a.u[i] * sp.resp.reaction[n];
                }
                let (mut lo, mut hi) = (b, b);
                for j in 0..a.combo.patterns.len() {
                    let v = self.part_reaction(a, j, n);
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

    /// Reactions (upward force N, clockwise moment N·mm) at each beam node
    /// for load case `case` alone (unfactored, patterns off), plus `sw` ×
    /// the unit self-weight, spring-corrected for the section.
    pub fn case_reactions(&self, sect: &SectionLoad, case: usize, sw: f64) -> Vec<(f64, f64)> {
        let r = &self.cases[case];
        let mut u = [0.0; MAX_SPRINGS];
        if sect.ns > 0 {
            let a = self.spring_u(sect, r, 1.0);
            let b = self.spring_u(sect, &self.unit_sw, sw);
            for i in 0..sect.ns {
                u[i] = a[i] + b[i];
            }
        }
        (0..self.node_x.len())
            .map(|n| {
                let mut f = r.reaction[n] + sw * self.unit_sw.reaction[n];
                let mut m = r.reaction_moment[n] + sw * self.unit_sw.reaction_moment[n];
                for (i, sp) in self.springs.iter().enumerate() {
                    f += u[i] * sp.resp.reaction[n];
                    m += u[i] * sp.resp.reaction_moment[n];
                }
                (f, m)
            })
            .collect()
    }

    /// Settlement (mm, downward) of each spring support under an applied
    /// combination: (node, min, max) over the patterns. Empty without
    /// springs.
    pub fn settlements(&self, a: &Applied<'_>) -> Vec<(usize, f64, f64)> {
        let ns = a.sect.ns;
        let mut out = Vec::with_capacity(ns);
        for (i, sp) in self.springs.iter().enumerate().take(ns) {
            let (mut lo, mut hi) = (a.u[i], a.u[i]);
            for p in &a.combo.patterns {
                let v = self.spring_u(a.sect, p, 1.0)[i];
                if v > 0.0 {
                    hi += v;
                } else {
                    lo += v;
                }
            }
            out.push((sp.node, lo / a.sect.ei, hi / a.sect.ei));
        }
        out
    }

    /// (min, max) of a quantity at local position `s` of element `e` over
    /// the load patterns (equal when the combination has none).
    pub fn envelope_at(&self, a: &Applied<'_>, q: Quantity, e: usize, s: f64) -> (f64, f64) {
        let b = eval(q, &self.base_coef(a, e), s);
        let (mut lo, mut hi) = (b, b);
        for j in 0..a.combo.patterns.len() {
            let v = eval(q, &self.part_coef(a, j, e), s);
            if v > 0.0 {
                hi += v;
            } else {
                lo += v;
            }
        }
        (lo, hi)
    }
}
