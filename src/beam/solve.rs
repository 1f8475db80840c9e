//! Linear-elastic analysis of a continuous prismatic beam by the direct
//! stiffness method, exact for the supported load types.
//!
//! Euler–Bernoulli beam elements (DOFs v, θ = dv/dx per node, v positive
//! downward) with the standard stiffness matrix EI/L³·[12, 6L, −12, 6L; …]
//! and work-equivalent (consistent) nodal loads for a linearly varying load
//! (Przemieniecki, *Theory of Matrix Structural Analysis*, ch. 5; the
//! consistent loads for q = qa(1−ξ) + qb·ξ are L·(7qa+3qb)/20,
//! L²(3qa+2qb)/60, L·(3qa+7qb)/20, −L²(2qa+3qb)/60). With consistent
//! loads the nodal displacements of such elements are exact. Every load
//! end, support and requested station is a node, so each element carries
//! one linear load and its moment is a cubic in the local coordinate s.
//!
//! Internal forces then follow from statics of the left free body:
//! V(s) = V0 − qa·s − (qb−qa)·s²/(2L), M(s) = M0 + V0·s − qa·s²/2 −
//! (qb−qa)·s³/(6L), and the deflection from integrating the curvature
//! κ = M/(E·I) twice from the exact nodal v and θ: v(s) = v0 + θ0·s −
//! ∫∫M ds² (v downward, so v'' = −M/EI). All responses are for E·I = 1;
//! deflections scale with 1/(E·I).

use super::model::{Beam, LoadKind, Support};
use crate::error::{Error, Result};

/// Coefficients of one element's response for E·I = 1:
/// M(s) = m0 + m1·s + m2·s² + m3·s³ (so V = m1 + 2m2·s + 3m3·s²) and
/// v(s) = d0 + d1·s − (m0·s²/2 + m1·s³/6 + m2·s⁴/12 + m3·s⁵/20),
/// where the deflection is relative to the stretch's supports.
pub type Coef = [f64; 6];

/// Element boundaries shared by every response of one demand.
#[derive(Clone, Debug)]
pub struct Mesh {
    pub x: Vec<f64>,
    /// Mesh node of each beam node (support position).
    pub beam_node: Vec<usize>,
    /// Stretch index of each element.
    pub stretch_of: Vec<usize>,
}

impl Mesh {
    pub fn elements(&self) -> usize {
        self.x.len() - 1
    }
}

/// Build the mesh: beam nodes, load ends, zero-crossings of linear loads,
/// and any extra stations.
pub fn mesh(beam: &Beam, extra: &[f64]) -> Mesh {
    let length = beam.length();
    let nodes = beam.node_x();
    let mut xs: Vec<f64> = nodes.clone();
    for l in &beam.loads {
        match l.kind {
            LoadKind::Distributed { x1, x2, w1, w2 } => {
                xs.push(x1);
                xs.push(x2);
                if w1 * w2 < 0.0 {
                    xs.push(x1 + (x2 - x1) * w1 / (w1 - w2));
                }
            }
            LoadKind::Point { x, .. } | LoadKind::Moment { x, .. } => xs.push(x),
        }
    }
    xs.extend_from_slice(extra);
    let tol = 1e-9 * length;
    for x in xs.iter_mut() {
        *x = x.clamp(0.0, length);
    }
    xs.sort_by(f64::total_cmp);
    let mut merged: Vec<f64> = Vec::with_capacity(xs.len());
    for x in xs {
        match merged.last() {
            Some(&last) if x - last <= tol => {}
            _ => merged.push(x),
        }
    }
    // Beam nodes take their exact positions.
    let beam_node: Vec<usize> = nodes
        .iter()
        .map(|&n| {
            let (i, _) = merged
                .iter()
                .enumerate()
                .min_by(|a, b| (a.1 - n).abs().total_cmp(&(b.1 - n).abs()))
                .unwrap_or((0, &0.0));
            i
        })
        .collect();
    for (k, &i) in beam_node.iter().enumerate() {
        merged[i] = nodes[k];
    }
    let stretches = beam.stretches();
    let stretch_of = (0..merged.len() - 1)
        .map(|e| {
            let mid = 0.5 * (merged[e] + merged[e + 1]);
            stretches
                .iter()
                .position(|s| mid >= s.x1 && mid <= s.x2)
                .unwrap_or(0)
        })
        .collect();
    Mesh {
        x: merged,
        beam_node,
        stretch_of,
    }
}

/// The response of the beam to one set of loads.
#[derive(Clone, Debug)]
pub struct Response {
    pub elems: Vec<Coef>,
    /// Upward reaction force at each beam node (N).
    pub reaction: Vec<f64>,
    /// Clockwise reaction moment at each beam node (N·mm).
    pub reaction_moment: Vec<f64>,
    /// Absolute downward displacement at each beam node for E·I = 1
    /// (non-zero only at springs and free ends).
    pub node_v: Vec<f64>,
}

impl Response {
    pub fn zero(elements: usize, nodes: usize) -> Self {
        Response {
            elems: vec![[0.0; 6]; elements],
            reaction: vec![0.0; nodes],
            reaction_moment: vec![0.0; nodes],
            node_v: vec![0.0; nodes],
        }
    }

    /// self += f·other
    pub fn add_scaled(&mut self, f: f64, other: &Response) {
        for (a, b) in self.elems.iter_mut().zip(&other.elems) {
            for k in 0..6 {
                a[k] += f * b[k];
            }
        }
        for (a, b) in self.reaction.iter_mut().zip(&other.reaction) {
            *a += f * b;
        }
        for (a, b) in self.reaction_moment.iter_mut().zip(&other.reaction_moment) {
            *a += f * b;
        }
        for (a, b) in self.node_v.iter_mut().zip(&other.node_v) {
            *a += f * b;
        }
    }
}

/// A load on the mesh, with its factor applied.
#[derive(Clone, Copy, Debug)]
pub enum MeshLoad {
    Distributed { x1: f64, x2: f64, w1: f64, w2: f64 },
    Point { x: f64, p: f64 },
    Moment { x: f64, m: f64 },
}

impl From<&LoadKind> for MeshLoad {
    fn from(k: &LoadKind) -> Self {
        match *k {
            LoadKind::Distributed { x1, x2, w1, w2 } => MeshLoad::Distributed { x1, x2, w1, w2 },
            LoadKind::Point { x, p } => MeshLoad::Point { x, p },
            LoadKind::Moment { x, m } => MeshLoad::Moment { x, m },
        }
    }
}

impl MeshLoad {
    /// The part of this load within [a, b] (points at a boundary belong to
    /// the stretch on their left, except at x = 0).
    pub fn clip(&self, a: f64, b: f64, first: bool) -> Option<MeshLoad> {
        match *self {
            MeshLoad::Distributed { x1, x2, w1, w2 } => {
                let lo = x1.max(a);
                let hi = x2.min(b);
                if hi <= lo {
                    return None;
                }
                let at = |x: f64| w1 + (w2 - w1) * (x - x1) / (x2 - x1);
                Some(MeshLoad::Distributed {
                    x1: lo,
                    x2: hi,
                    w1: at(lo),
                    w2: at(hi),
                })
            }
            MeshLoad::Point { x, .. } | MeshLoad::Moment { x, .. } => {
                let inside = if first {
                    x >= a && x <= b
                } else {
                    x > a && x <= b
                };
                inside.then_some(*self)
            }
        }
    }
}

fn nearest(xs: &[f64], x: f64) -> usize {
    match xs.binary_search_by(|p| p.total_cmp(&x)) {
        Ok(i) => i,
        Err(i) => {
            if i == 0 {
                0
            } else if i >= xs.len() {
                xs.len() - 1
            } else if (xs[i] - x).abs() < (x - xs[i - 1]).abs() {
                i
            } else {
                i - 1
            }
        }
    }
}

/// Analyse the beam for a set of loads on a mesh, E·I = 1. Spring
/// supports are held rigid here: their flexibility enters per section
/// through [`analyse_settlement`] (see `beam::demand`).
pub fn analyse(beam: &Beam, mesh: &Mesh, loads: &[MeshLoad]) -> Result<Response> {
    solve_case(beam, mesh, loads, None)
}

/// The response of the beam (springs held rigid, E·I = 1) to a unit
/// downward settlement of the support at beam node `node`, with no load:
/// one basis response of the spring compatibility system.
pub fn analyse_settlement(beam: &Beam, mesh: &Mesh, node: usize) -> Result<Response> {
    solve_case(beam, mesh, &[], Some(node))
}

/// Half-bandwidth of the beam stiffness matrix (two DOFs per node).
const BW: usize = 3;

/// A symmetric band matrix: row i holds columns i..=i+BW.
#[derive(Clone)]
struct Band {
    n: usize,
    a: Vec<[f64; BW + 1]>,
}

impl Band {
    fn new(n: usize) -> Self {
        Band {
            n,
            a: vec![[0.0; BW + 1]; n],
        }
    }
    #[inline]
    fn get(&self, i: usize, j: usize) -> f64 {
        let (r, c) = if i <= j { (i, j) } else { (j, i) };
        if c - r > BW { 0.0 } else { self.a[r][c - r] }
    }
    #[inline]
    fn add(&mut self, i: usize, j: usize, v: f64) {
        if i <= j {
            self.a[i][j - i] += v;
        }
    }
    /// y = A·x
    fn row_dot(&self, i: usize, x: &[f64]) -> f64 {
        let lo = i.saturating_sub(BW);
        let hi = (i + BW + 1).min(self.n);
        (lo..hi).map(|j| self.get(i, j) * x[j]).sum()
    }
}

fn solve_case(
    beam: &Beam,
    mesh: &Mesh,
    loads: &[MeshLoad],
    settle: Option<usize>,
) -> Result<Response> {
    let nn = mesh.x.len();
    let ne = nn - 1;
    // Mesh-element loads (qa, qb) and mesh-node loads (P downward, C
    // clockwise), for the statics walk.
    let mut q = vec![(0.0f64, 0.0f64); ne];
    let mut p_node = vec![0.0f64; nn];
    let mut c_node = vec![0.0f64; nn];
    for l in loads {
        match *l {
            MeshLoad::Distributed { x1, x2, w1, w2 } => {
                let i1 = nearest(&mesh.x, x1);
                let i2 = nearest(&mesh.x, x2);
                for (e, qe) in q.iter_mut().enumerate().take(i2).skip(i1) {
                    let at = |x: f64| w1 + (w2 - w1) * (x - x1) / (x2 - x1);
                    qe.0 += at(mesh.x[e]);
                    qe.1 += at(mesh.x[e + 1]);
                }
            }
            MeshLoad::Point { x, p } => p_node[nearest(&mesh.x, x)] += p,
            MeshLoad::Moment { x, m } => c_node[nearest(&mesh.x, x)] += m,
        }
    }
    // Stiffness solution on the beam nodes only (one element per span), with
    // the consistent nodal loads of every load inside a span: this keeps the
    // system as well conditioned as the spans themselves.
    let nb = beam.supports.len();
    let n = 2 * nb;
    let bx = beam.node_x();
    let mut k = Band::new(n);
    let mut f = vec![0.0f64; n];
    let span_of = |x: f64| -> usize {
        let mut j = 0;
        while j + 1 < beam.spans.len() && x > bx[j + 1] {
            j += 1;
        }
        j
    };
    for l in loads {
        match *l {
            MeshLoad::Point { x, p } => {
                let j = span_of(x);
                let nv = hermite(beam.spans[j], x - bx[j]);
                for a in 0..4 {
                    f[2 * j + a] += p * nv[a];
                }
            }
            MeshLoad::Moment { x, m } => {
                let j = span_of(x);
                let nd = hermite_slope(beam.spans[j], x - bx[j]);
                for a in 0..4 {
                    f[2 * j + a] += m * nd[a];
                }
            }
            MeshLoad::Distributed { x1, x2, w1, w2 } => {
                for j in 0..beam.spans.len() {
                    let lo = x1.max(bx[j]);
                    let hi = x2.min(bx[j + 1]);
                    if hi <= lo {
                        continue;
                    }
                    // ∫ q·N ds is a quartic: 3-point Gauss–Legendre is exact.
                    let (c, h) = (0.5 * (lo + hi), 0.5 * (hi - lo));
                    let g = (0.6f64).sqrt();
                    for (t, wt) in [(-g, 5.0 / 9.0), (0.0, 8.0 / 9.0), (g, 5.0 / 9.0)] {
                        let x = c + h * t;
                        let qx = w1 + (w2 - w1) * (x - x1) / (x2 - x1);
                        let nv = hermite(beam.spans[j], x - bx[j]);
                        for a in 0..4 {
                            f[2 * j + a] += wt * h * qx * nv[a];
                        }
                    }
                }
            }
        }
    }
    for (j, &l) in beam.spans.iter().enumerate() {
        let ke = element_stiffness(l);
        for (a, row) in ke.iter().enumerate() {
            for (b, v) in row.iter().enumerate() {
                k.add(2 * j + a, 2 * j + b, *v);
            }
        }
    }
    // Prescribed displacements: zero at every vertical restraint (springs
    // held rigid) and fixed rotation, one at a settling support.
    let mut prescribed: Vec<Option<f64>> = vec![None; n];
    for (i, s) in beam.supports.iter().enumerate() {
        match s {
            Support::Pinned | Support::Roller | Support::Spring(_) => {
                prescribed[2 * i] = Some(if settle == Some(i) { 1.0 } else { 0.0 })
            }
            Support::Fixed => {
                prescribed[2 * i] = Some(if settle == Some(i) { 1.0 } else { 0.0 });
                prescribed[2 * i + 1] = Some(0.0);
            }
            Support::Free => {}
        }
    }
    let disp = solve_prescribed(&k, &f, &prescribed).ok_or_else(|| {
        Error::msg("the supports form a mechanism: the stiffness matrix is singular")
    })?;
    // Reactions R = K·d − F at restrained DOFs (DOF convention: downward, clockwise).
    let mut resp = Response::zero(ne, nb);
    let mut r_up_mesh = vec![0.0f64; nn];
    let mut r_m_mesh = vec![0.0f64; nn];
    let row = |d: usize| -> f64 { k.row_dot(d, &disp) - f[d] };
    for (i, s) in beam.supports.iter().enumerate() {
        let mi = mesh.beam_node[i];
        match s {
            Support::Pinned | Support::Roller | Support::Spring(_) => r_up_mesh[mi] = -row(2 * i),
            Support::Fixed => {
                r_up_mesh[mi] = -row(2 * i);
                r_m_mesh[mi] = row(2 * i + 1);
            }
            Support::Free => {}
        }
        resp.reaction[i] = r_up_mesh[mi];
        resp.reaction_moment[i] = r_m_mesh[mi];
        resp.node_v[i] = disp[2 * i];
    }
    // Internal forces from the left free body; deflection by integrating
    // the curvature element by element, restarting from the exact nodal
    // values at every beam node.
    let mut is_beam_node = vec![None; nn];
    for (i, &mi) in mesh.beam_node.iter().enumerate() {
        is_beam_node[mi] = Some(i);
    }
    let mut v_run = 0.0;
    let mut m_run = 0.0;
    let (mut d0, mut d1) = (0.0, 0.0);
    for e in 0..ne {
        v_run += r_up_mesh[e] - p_node[e];
        m_run += c_node[e] + r_m_mesh[e];
        if let Some(i) = is_beam_node[e] {
            d0 = disp[2 * i];
            d1 = disp[2 * i + 1];
        }
        let l = mesh.x[e + 1] - mesh.x[e];
        let (qa, qb) = q[e];
        let m2 = -qa / 2.0;
        let m3 = -(qb - qa) / (6.0 * l);
        let c = [m_run, v_run, m2, m3, d0, d1];
        resp.elems[e] = c;
        v_run += -qa * l - (qb - qa) * l / 2.0;
        m_run = moment(&c, l);
        d0 = deflection(&c, l);
        d1 = slope(&c, l);
    }
    relative_to_supports(beam, mesh, &mut resp);
    Ok(resp)
}

/// Solve K·d = F with some displacements prescribed. The free DOFs are
/// solved with the prescribed values moved to the right-hand side, after a
/// symmetric diagonal scaling D^(-1/2)·K·D^(-1/2) (unit diagonal), so the
/// test for a vanishing pivot does not depend on the spans' lengths or on
/// the units (a 50 m cantilever and a 50 mm one are equally well posed).
/// Returns None for a mechanism.
fn solve_prescribed(k: &Band, f: &[f64], prescribed: &[Option<f64>]) -> Option<Vec<f64>> {
    let n = k.n;
    let mut a = Band::new(n);
    let mut b = vec![0.0; n];
    let mut scale = vec![1.0; n];
    for i in 0..n {
        if prescribed[i].is_none() {
            let d = k.get(i, i);
            if !(d.is_finite() && d > 0.0) {
                return None;
            }
            scale[i] = 1.0 / d.sqrt();
        }
    }
    for i in 0..n {
        match prescribed[i] {
            Some(v) => {
                a.a[i][0] = 1.0;
                b[i] = v;
            }
            None => {
                let mut rhs = f[i];
                let lo = i.saturating_sub(BW);
                let hi = (i + BW + 1).min(n);
                for j in lo..hi {
                    if let Some(v) = prescribed[j] {
                        rhs -= k.get(i, j) * v;
                    } else if j >= i {
                        a.a[i][j - i] = k.get(i, j) * scale[i] * scale[j];
                    }
                }
                b[i] = rhs * scale[i];
            }
        }
    }
    // Banded LDLᵀ-style elimination (no pivoting: the scaled matrix is
    // symmetric positive definite unless the supports form a mechanism).
    for i in 0..n {
        let piv = a.a[i][0];
        if !(piv.is_finite() && piv > 1e-12) {
            return None;
        }
        let hi = (i + BW + 1).min(n);
        for r in i + 1..hi {
            let factor = a.a[i][r - i] / piv;
            if factor == 0.0 {
                continue;
            }
            for c in r..hi {
                a.a[r][c - r] -= factor * a.a[i][c - i];
            }
            b[r] -= factor * b[i];
        }
    }
    let mut y = vec![0.0; n];
    for i in (0..n).rev() {
        let hi = (i + BW + 1).min(n);
        let mut s = b[i];
        for (c, yc) in y.iter().enumerate().take(hi).skip(i + 1) {
            s -= a.a[i][c - i] * yc;
        }
        y[i] = s / a.a[i][0];
    }
    Some(
        (0..n)
            .map(|i| match prescribed[i] {
                Some(v) => v,
                None => y[i] * scale[i],
            })
            .collect(),
    )
}

/// Refer deflections to the supports of each stretch: a span's chord
/// between its two supports, an overhang's supported end.
fn relative_to_supports(beam: &Beam, mesh: &Mesh, resp: &mut Response) {
    let stretches = beam.stretches();
    for e in 0..mesh.elements() {
        let s = &stretches[mesh.stretch_of[e]];
        let x0 = mesh.x[e];
        let (base, slope) = match (s.left_node, s.right_node, s.cantilever) {
            (Some(a), Some(b), false) => {
                let (va, vb) = (resp.node_v[a], resp.node_v[b]);
                let slope = (vb - va) / (s.x2 - s.x1);
                (va + slope * (x0 - s.x1), slope)
            }
            (Some(a), None, true) | (None, Some(a), true) => (resp.node_v[a], 0.0),
            _ => (0.0, 0.0),
        };
        resp.elems[e][4] -= base;
        resp.elems[e][5] -= slope;
    }
}

/// Hermite shape functions of a beam element of length l at s.
fn hermite(l: f64, s: f64) -> [f64; 4] {
    let x = (s / l).clamp(0.0, 1.0);
    let (x2, x3) = (x * x, x * x * x);
    [
        1.0 - 3.0 * x2 + 2.0 * x3,
        l * (x - 2.0 * x2 + x3),
        3.0 * x2 - 2.0 * x3,
        l * (-x2 + x3),
    ]
}

/// d/ds of the Hermite shape functions (work-equivalent loads of a couple).
fn hermite_slope(l: f64, s: f64) -> [f64; 4] {
    let x = (s / l).clamp(0.0, 1.0);
    let x2 = x * x;
    [
        (-6.0 * x + 6.0 * x2) / l,
        1.0 - 4.0 * x + 3.0 * x2,
        (6.0 * x - 6.0 * x2) / l,
        -2.0 * x + 3.0 * x2,
    ]
}

fn element_stiffness(l: f64) -> [[f64; 4]; 4] {
    let l2 = l * l;
    let l3 = l2 * l;
    [
        [12.0 / l3, 6.0 / l2, -12.0 / l3, 6.0 / l2],
        [6.0 / l2, 4.0 / l, -6.0 / l2, 2.0 / l],
        [-12.0 / l3, -6.0 / l2, 12.0 / l3, -6.0 / l2],
        [6.0 / l2, 2.0 / l, -6.0 / l2, 4.0 / l],
    ]
}

/// Evaluate an element's moment at s.
#[inline]
pub fn moment(c: &Coef, s: f64) -> f64 {
    c[0] + s * (c[1] + s * (c[2] + s * c[3]))
}

/// Evaluate an element's shear at s.
#[inline]
pub fn shear(c: &Coef, s: f64) -> f64 {
    c[1] + s * (2.0 * c[2] + s * 3.0 * c[3])
}

/// Evaluate an element's deflection (E·I = 1) at s.
#[inline]
pub fn deflection(c: &Coef, s: f64) -> f64 {
    let s2 = s * s;
    c[4] + c[5] * s - s2 * (c[0] / 2.0 + s * (c[1] / 6.0 + s * (c[2] / 12.0 + s * c[3] / 20.0)))
}

/// Evaluate an element's slope (E·I = 1) at s.
#[inline]
pub fn slope(c: &Coef, s: f64) -> f64 {
    c[5] - s * (c[0] + s * (c[1] / 2.0 + s * (c[2] / 3.0 + s * c[3] / 4.0)))
}
