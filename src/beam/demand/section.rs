//! One section's demand: a combination applied to a section, and the
//! extremes, envelopes and reactions read from it (the per-section path:
//! scale and add, no allocation).

use super::extremes::{add_coef, curvature_bound, scaled_sum};
use super::pattern::NST;
use super::{
    Applied, Demand, Extremes, MAX_PATTERN_PARTS, MAX_SPRINGS, Quantity, SectionLoad,
    element_extremes, eval,
};
use crate::beam::solve::Coef;

impl super::ComboDemand {
    /// The lookup registered for quantity `q` over `elems`, if any.
    #[inline]
    fn lookup(
        &self,
        q: Quantity,
        elems: &std::ops::Range<usize>,
    ) -> Option<&super::lookup::Lookup> {
        self.lookups
            .iter()
            .find(|l| l.q == q && l.elems == (elems.start, elems.end))
    }
}

impl Demand {
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

    /// Combined coefficients of element `e` for an applied combination,
    /// patterns left out.
    #[inline]
    pub fn base_coef(&self, a: &Applied<'_>, e: usize) -> Coef {
        let c = scaled_sum(&a.combo.fixed.elems[e], &self.unit_sw.elems[e], a.s);
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
        if let Some(ex) = a.combo.lookup(q, &elems).and_then(|l| l.extremes(self, a)) {
            return ex;
        }
        self.extremes_full(a, q, elems)
    }

    /// The largest magnitude of a quantity over `elems`, signed, and its
    /// position: `extremes(..).abs_max()`, with less work where a lookup
    /// is registered for the range.
    pub fn abs_extreme(
        &self,
        a: &Applied<'_>,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> (f64, f64) {
        if let Some(v) = a
            .combo
            .lookup(q, &elems)
            .and_then(|l| l.abs_extreme(self, a))
        {
            return v;
        }
        self.extremes(a, q, elems).abs_max()
    }

    /// [`Demand::extremes`] by searching every element and pattern (what
    /// a lookup's survivors are drawn from, and its fallback).
    pub(super) fn extremes_full(
        &self,
        a: &Applied<'_>,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> Extremes {
        let combo = a.combo;
        let mut ex = Extremes::EMPTY;
        let qi = q.index();
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

    /// Which pattern parts are loaded in the pattern that gives the upper
    /// (`upper`) or lower bound of the envelope of quantity `q` at `x` (mm
    /// from the left end): the bound at a station is the base plus every
    /// part of that sign, so the governing pattern loads exactly those
    /// parts. Where `x` is a node the element whose bound is nearer to
    /// `target` (the governing value, E·I = 1) is taken, since shear jumps
    /// there. One entry per part: (index, loaded, no effect here); empty
    /// without patterns.
    pub fn loaded_parts(
        &self,
        a: &Applied<'_>,
        q: Quantity,
        x: f64,
        upper: bool,
        target: f64,
    ) -> Vec<(usize, bool, bool)> {
        if a.combo.patterns.is_empty() {
            return Vec::new();
        }
        let tol = 1e-6 * self.mesh.x.last().copied().unwrap_or(1.0).abs().max(1.0);
        let mut best: Option<(f64, usize, f64)> = None;
        for e in 0..self.len.len() {
            let x0 = self.mesh.x[e];
            if x < x0 - tol || x > x0 + self.len[e] + tol {
                continue;
            }
            let s = (x - x0).clamp(0.0, self.len[e]);
            let (lo, hi) = self.envelope_at(a, q, e, s);
            let miss = ((if upper { hi } else { lo }) - target).abs();
            if best.is_none_or(|b| miss < b.0) {
                best = Some((miss, e, s));
            }
        }
        let Some((_, e, s)) = best else {
            return Vec::new();
        };
        let v: Vec<f64> = (0..a.combo.patterns.len())
            .map(|j| eval(q, &self.part_coef(a, j, e), s))
            .collect();
        // A part whose value here is rounding noise has no effect on it.
        let tol = 1e-9 * (target.abs() + v.iter().map(|x| x.abs()).sum::<f64>());
        (0..v.len())
            .map(|j| {
                let on = if upper { v[j] > tol } else { v[j] < -tol };
                (j, on, v[j].abs() <= tol)
            })
            .collect()
    }
}
