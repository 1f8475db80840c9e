//! Spring supports: one basis response per spring, and the compatibility
//! solved per section (the settlements, the corrected coefficients and
//! reactions).

use super::{Applied, Demand, MAX_SPRINGS, SectionLoad};
use crate::beam::model::{Beam, Support};
use crate::beam::solve::{self, Coef, Mesh, Response};
use crate::error::{Error, Result};

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

/// The spring supports' basis responses (a unit settlement of each, every
/// spring held rigid) and ρ, row-major: ρ_ij the reaction at spring i for
/// a unit settlement of spring j.
pub(super) fn bases(beam: &Beam, mesh: &Mesh) -> Result<(Vec<SpringBasis>, Vec<f64>)> {
    let mut springs = Vec::new();
    for (node, sup) in beam.supports.iter().enumerate() {
        if let Support::Spring(k) = *sup {
            springs.push(SpringBasis {
                node,
                k,
                resp: solve::analyse_settlement(beam, mesh, node)?,
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
    Ok((springs, rho))
}

impl Demand {
    /// The spring correction u for a response (scaled by `f`): the
    /// solution of (diag(k/(E·I)) − ρ)·u = f·R₀ by Gaussian elimination with
    /// partial pivoting, on the stack (the system is a few springs wide).
    #[allow(clippy::needless_range_loop)]
    pub(super) fn spring_u(&self, sect: &SectionLoad, r: &Response, f: f64) -> [f64; MAX_SPRINGS] {
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

    /// Coefficients of response `r` on element `e` with a spring
    /// correction `u` added.
    #[inline]
    pub(super) fn corrected(&self, r: &Coef, u: &[f64; MAX_SPRINGS], ns: usize, e: usize) -> Coef {
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
    pub(super) fn part_reaction(&self, a: &Applied<'_>, j: usize, n: usize) -> f64 {
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
}
