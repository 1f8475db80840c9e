//! Extremes looked up by self-weight: which candidates (element × load
//! pattern) can hold a combination's largest and smallest value, per
//! interval of the section's self-weight, so that a section check refines
//! only those (usually one) instead of every element and pattern.
//!
//! For a candidate c (an element and one of the patterns seen on it), the
//! combined polynomial is F_c(x) + s·U(x), s the section's self-weight
//! intensity times the combination's factor. Its maximum over the element,
//! g_c(s) = max_x (F_c(x) + s·U(x)), is a maximum of functions linear in
//! s, hence convex in s. On an interval [s₁, s₂]:
//!
//! * g_c(s) ≤ the chord through g_c(s₁) and g_c(s₂) (convexity);
//! * for any candidate d and any fixed x in its element, the line
//!   L(s) = F_d(x) + s·U(x) is a value the combination actually takes, so
//!   L(s) ≤ max over all candidates.
//!
//! If a line lies above c's chord at both ends (by more than a round-off
//! margin), it lies above it on the whole interval, and c cannot hold the
//! maximum anywhere in it: c is dropped for that interval. The maximum is
//! then the largest refinement among the survivors — the refinement the
//! full search runs (same polynomial, same arithmetic), so the value and
//! its position are the full search's. One difference: a deflection
//! refinement's Newton iteration starts from the survivor's own guess
//! (`Hint`), so its root is the same to the same tolerance (1e-10 of the
//! bracket) rather than to the last bit; where the deflection is flat at
//! its extreme, the value then agrees to round-off (tests/checks.rs
//! `lookup_equals_full_search`; the outputs compared in benches/README.md
//! were byte-identical). The smallest value is the same argument applied
//! to −F and −U.
//!
//! The intervals are a fixed grid of eight steps per octave of s (the top
//! bits of the float), from 2⁻¹⁴ to 2⁷ N/mm (about 6 g/m to 13 t/m times
//! the factor); each interval's survivors are computed the first time a
//! section falls in it. s = 0 (no self-weight in the combination) is one
//! stored result. Anything else (s outside the grid, negative or not
//! finite) takes the full search.

use super::extremes::{add_coef, element_extremes_from, scaled_sum};
use super::{Applied, Demand, Extremes, Pre, Quantity, eval};
use crate::beam::solve::Coef;
use std::sync::OnceLock;

/// Grid steps per octave of s (the number of mantissa bits used).
const STEP_BITS: u32 = 3;
/// The float bits below the steps.
const SHIFT: u32 = 52 - STEP_BITS;
/// Smallest and largest s of the grid, as powers of two.
const LOW_EXP: i32 = -14;
const HIGH_EXP: i32 = 7;
/// Number of intervals.
const INTERVALS: usize = ((HIGH_EXP - LOW_EXP) as usize) << STEP_BITS;

/// The grid index of the lowest interval.
fn base_index() -> u64 {
    2f64.powi(LOW_EXP).to_bits() >> SHIFT
}

/// The interval holding `s`, if it is on the grid.
#[inline]
fn interval(s: f64) -> Option<usize> {
    if s.is_nan() || s <= 0.0 {
        return None;
    }
    let k = (s.to_bits() >> SHIFT).checked_sub(base_index())? as usize;
    (k < INTERVALS).then_some(k)
}

/// The lower end of interval `k` (the upper end is `grid(k + 1)`).
fn grid(k: usize) -> f64 {
    f64::from_bits((base_index() + k as u64) << SHIFT)
}

/// One candidate: an element's polynomials and the pattern sum refined
/// on it, held by value so a refinement reads nothing else.
#[derive(Clone, Copy, Debug)]
struct Candidate {
    /// Position of the element's start on the beam, and its length.
    x0: f64,
    l: f64,
    /// The combination's fixed response and the unit self-weight's.
    f: Coef,
    u: Coef,
    /// The pattern sum (`None`: the combination has no patterns).
    p: Option<Coef>,
    /// Extremes known before the section (no patterns), if any.
    pre: Pre,
    /// Where this side's extreme lies across the interval (element-local):
    /// the start of the deflection refinement, as the parabola through its
    /// positions at the interval's ends and middle (`Hint`).
    hint: Option<Hint>,
}

/// The parabola through a survivor's extreme positions at the lower end
/// s₁, the middle s_m and the upper end of its interval, in Newton's form
/// x(s) = x₁ + (s − s₁)·(d₁ + (s − s_m)·d₂). Only a start: Newton's
/// method takes it when it falls in the root's bracket, and the root is
/// the same to the same tolerance. (Starting at the lower end's position
/// took 2.7 Newton steps per refinement in the 3-span benchmark; a line
/// through both ends measured no faster.)
#[derive(Clone, Copy, Debug)]
struct Hint {
    s1: f64,
    sm: f64,
    x1: f64,
    d1: f64,
    d2: f64,
}

impl Hint {
    fn through(s: [f64; 3], x: [f64; 3]) -> Hint {
        let d1 = (x[1] - x[0]) / (s[1] - s[0]);
        let d12 = (x[2] - x[1]) / (s[2] - s[1]);
        Hint {
            s1: s[0],
            sm: s[1],
            x1: x[0],
            d1,
            d2: (d12 - d1) / (s[2] - s[0]),
        }
    }
    #[inline]
    fn at(&self, s: f64) -> f64 {
        self.x1 + (s - self.s1) * (self.d1 + (s - self.sm) * self.d2)
    }
}

impl Candidate {
    /// The polynomial at self-weight scale `s`, with the arithmetic of the
    /// full search (`base_coef`, then the pattern added).
    #[inline]
    fn coef(&self, s: f64) -> Coef {
        let base = scaled_sum(&self.f, &self.u, s);
        match &self.p {
            None => base,
            Some(p) => add_coef(&base, p),
        }
    }

    /// The exact maximum (`upper`) or minimum at scale `s` and its position
    /// on the beam: the refinement the full search runs.
    #[inline]
    fn refine(&self, q: Quantity, s: f64, upper: bool) -> (f64, f64) {
        let el = match self.pre.at(s) {
            Some(el) => el,
            None => element_extremes_from(q, &self.coef(s), self.l, self.hint.map(|h| h.at(s))),
        };
        if upper {
            (el.max, self.x0 + el.x_max)
        } else {
            (el.min, self.x0 + el.x_min)
        }
    }
}

/// Which candidates can hold the maximum and the minimum in one interval,
/// in search order.
#[derive(Clone, Debug)]
struct Survivors {
    max: Box<[Candidate]>,
    min: Box<[Candidate]>,
    /// For the largest magnitude alone: candidates of either side
    /// (`true`: a maximum candidate), pruned together.
    abs: Box<[(Candidate, bool)]>,
}

/// The lookup of one combination for one quantity over one element range.
#[derive(Clone, Debug)]
pub(crate) struct Lookup {
    pub(super) q: Quantity,
    pub(super) elems: (usize, usize),
    /// Candidates for the maximum (patterns that add positive parts) and
    /// for the minimum.
    upper: Vec<Candidate>,
    lower: Vec<Candidate>,
    intervals: Vec<OnceLock<Survivors>>,
    at_zero: OnceLock<Extremes>,
}

impl Lookup {
    /// A lookup for quantity `q` over elements `elems` of combination
    /// `ci`, if it would save work: the combination has patterns, or more
    /// than one element, or an element whose extremes are not known before
    /// the section. None with springs (every part then depends on E·I).
    pub(super) fn new(
        d: &Demand,
        ci: usize,
        q: Quantity,
        elems: std::ops::Range<usize>,
    ) -> Option<Lookup> {
        let combo = &d.combos[ci];
        if !d.springs.is_empty() || elems.is_empty() {
            return None;
        }
        let qi = q.index();
        let cand = |e: usize, p: Option<Coef>, pre: Pre| Candidate {
            x0: d.mesh.x[e],
            l: d.len[e],
            f: combo.fixed.elems[e],
            u: d.unit_sw.elems[e],
            p,
            pre,
            hint: None,
        };
        let (mut upper, mut lower) = (Vec::new(), Vec::new());
        if combo.patterns.is_empty() {
            let pre = |e: usize| combo.pre.get(e).map_or(Pre::Solve, |p| p[qi]);
            let solved = elems.clone().any(|e| matches!(pre(e), Pre::Solve));
            if !solved && elems.len() < 2 {
                return None;
            }
            for e in elems.clone() {
                upper.push(cand(e, None, pre(e)));
                lower.push(cand(e, None, pre(e)));
            }
        } else {
            let env = combo.env.get(qi)?;
            for e in elems.clone() {
                for p in &env.plus[e] {
                    upper.push(cand(e, Some(*p), Pre::Solve));
                }
                for p in &env.minus[e] {
                    lower.push(cand(e, Some(*p), Pre::Solve));
                }
            }
        }
        Some(Lookup {
            q,
            elems: (elems.start, elems.end),
            upper,
            lower,
            intervals: (0..INTERVALS).map(|_| OnceLock::new()).collect(),
            at_zero: OnceLock::new(),
        })
    }

    /// The interval's survivors, computed the first time.
    #[inline]
    fn survivors(&self, s: f64) -> Option<&Survivors> {
        let k = interval(s)?;
        Some(self.intervals[k].get_or_init(|| self.compute(k)))
    }

    /// The extremes for an applied combination, if the lookup covers its
    /// self-weight scale.
    #[inline]
    pub(super) fn extremes(&self, d: &Demand, a: &Applied<'_>) -> Option<Extremes> {
        if a.s == 0.0 {
            return Some(
                *self
                    .at_zero
                    .get_or_init(|| d.extremes_full(a, self.q, self.elems.0..self.elems.1)),
            );
        }
        let sv = self.survivors(a.s)?;
        let mut ex = Extremes::EMPTY;
        for c in sv.max.iter() {
            let (v, x) = c.refine(self.q, a.s, true);
            if v > ex.max {
                ex.max = v;
                ex.x_max = x;
            }
        }
        for c in sv.min.iter() {
            let (v, x) = c.refine(self.q, a.s, false);
            if v < ex.min {
                ex.min = v;
                ex.x_min = x;
            }
        }
        Some(ex.cleaned())
    }

    /// The largest magnitude, signed, and its position, as
    /// `extremes(..).abs_max()` gives it, refining only the candidates that
    /// can hold it (of either sign).
    #[inline]
    pub(super) fn abs_extreme(&self, d: &Demand, a: &Applied<'_>) -> Option<(f64, f64)> {
        if a.s == 0.0 {
            return self.extremes(d, a).map(|e| e.abs_max());
        }
        let sv = self.survivors(a.s)?;
        let mut ex = Extremes::EMPTY;
        let (mut upper, mut lower) = (false, false);
        for (c, up) in sv.abs.iter() {
            let (v, x) = c.refine(self.q, a.s, *up);
            if *up {
                upper = true;
                if v > ex.max {
                    ex.max = v;
                    ex.x_max = x;
                }
            } else {
                lower = true;
                if v < ex.min {
                    ex.min = v;
                    ex.x_min = x;
                }
            }
        }
        // A side with no survivor cannot hold the largest magnitude.
        Some(match (upper, lower) {
            (true, false) => (ex.max, ex.x_max),
            (false, true) => (ex.min, ex.x_min),
            _ => ex.cleaned().abs_max(),
        })
    }

    /// The survivors of interval `k` (see the module notes).
    fn compute(&self, k: usize) -> Survivors {
        let (s1, s2) = (grid(k), grid(k + 1));
        let upper = ends(self.q, &self.upper, s1, s2, true);
        let lower = ends(self.q, &self.lower, s1, s2, false);
        Survivors {
            max: pick(&self.upper, &upper, kept(&upper, &[&upper])).collect(),
            min: pick(&self.lower, &lower, kept(&lower, &[&lower])).collect(),
            abs: pick(&self.upper, &upper, kept(&upper, &[&upper, &lower]))
                .map(|c| (c, true))
                .chain(
                    pick(&self.lower, &lower, kept(&lower, &[&upper, &lower])).map(|c| (c, false)),
                )
                .collect(),
        }
    }
}

/// A side's candidates at the ends of one interval: each value with the
/// side's sign (the maximum, or −minimum), and the two lines through its
/// positions there (the values at those fixed positions at both ends).
struct Ends {
    value: Vec<[f64; 2]>,
    lines: Vec<[[f64; 2]; 2]>,
    /// Where each candidate's extreme lies across the interval (deflection
    /// only: the other quantities are solved in closed form).
    hint: Vec<Option<Hint>>,
}

/// The candidates of `c` at indices `keep`, in order, each with where its
/// extreme lies across the interval (`ends`).
fn pick<'a>(
    c: &'a [Candidate],
    ends: &'a Ends,
    keep: Vec<usize>,
) -> impl Iterator<Item = Candidate> + 'a {
    keep.into_iter().map(move |i| Candidate {
        hint: ends.hint[i],
        ..c[i]
    })
}

fn ends(q: Quantity, cands: &[Candidate], s1: f64, s2: f64, upper: bool) -> Ends {
    let sign = if upper { 1.0 } else { -1.0 };
    let mut out = Ends {
        value: Vec::with_capacity(cands.len()),
        lines: Vec::with_capacity(cands.len()),
        hint: Vec::with_capacity(cands.len()),
    };
    for c in cands {
        let at = [s1, s2].map(|s| c.refine(q, s, upper));
        out.hint.push((q == Quantity::Deflection).then(|| {
            let sm = 0.5 * (s1 + s2);
            let xm = c.refine(q, sm, upper).1;
            Hint::through([s1, sm, s2], [at[0].1, xm, at[1].1].map(|x| x - c.x0))
        }));
        out.value.push([sign * at[0].0, sign * at[1].0]);
        out.lines
            .push(at.map(|(_, x)| [s1, s2].map(|s| sign * eval(q, &c.coef(s), x - c.x0))));
    }
    out
}

/// The candidates of `side` that no line of `by` (through the best
/// candidate of each at either end) lies above at both ends of the
/// interval by more than a round-off margin.
fn kept(side: &Ends, by: &[&Ends]) -> Vec<usize> {
    let mut lines: Vec<[f64; 2]> = Vec::new();
    let mut scale = 0.0f64;
    for o in by {
        for end in 0..2 {
            let best =
                (0..o.value.len()).max_by(|&i, &j| o.value[i][end].total_cmp(&o.value[j][end]));
            if let Some(b) = best {
                lines.extend_from_slice(&o.lines[b]);
            }
        }
        for v in &o.value {
            scale = scale.max(v[0].abs()).max(v[1].abs());
        }
    }
    let margin = 1e-9 * scale;
    (0..side.value.len())
        .filter(|&i| {
            let v = side.value[i];
            !lines
                .iter()
                .any(|l| l[0] > v[0] + margin && l[1] > v[1] + margin)
        })
        .collect()
}
