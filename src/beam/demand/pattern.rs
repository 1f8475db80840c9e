//! Pattern (skip) loading: the parts of each patterned case, the
//! section-independent envelope of a combination's parts at stations, and
//! the extremes known before any section (`Pre`).

use super::{Extremes, Quantity, element_extremes, eval};
use crate::beam::model::{Beam, Pattern, Stretch};
use crate::beam::solve::{self, Coef, Mesh, MeshLoad, Response};
use crate::error::Result;

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
pub(crate) enum Pre {
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
    pub(super) fn at(&self, s: f64) -> Option<Extremes> {
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
pub(super) fn proportional(q: Quantity, f: &Coef, u: &Coef, l: f64) -> Option<f64> {
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

/// Interior stations per element used to locate envelope extremes under
/// pattern loading (before exact refinement).
pub(super) const PATTERN_STATIONS: usize = 5;

/// Stations per element, ends included, for pattern envelopes.
pub(super) const NST: usize = PATTERN_STATIONS + 2;

/// The pattern parts do not depend on the section, so at every station the
/// sum of their positive parts, of their negative parts, and which parts
/// are positive (the pattern) are computed once. Per element, each distinct
/// pattern seen at a station is stored as its summed coefficients, to be
/// maximised exactly with the section's base polynomial.
#[derive(Clone, Debug, Default)]
pub(crate) struct PatternEnv {
    pub(crate) hi: Vec<[f64; NST]>,
    pub(crate) lo: Vec<[f64; NST]>,
    pub(crate) plus: Vec<Vec<Coef>>,
    pub(crate) minus: Vec<Vec<Coef>>,
}

/// The section-independent envelope of the pattern parts for quantity
/// `q`, per element.
pub(super) fn pattern_env(patterns: &[Response], q: Quantity, len: &[f64]) -> PatternEnv {
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

/// The pattern parts of every case, analysed once and shared by the
/// combinations: for each case, one (label, response) per stretch with
/// loads, and the share of the case the parts carry.
pub(super) struct Parts {
    pub(super) parts: Vec<Vec<(String, Response)>>,
    pub(super) share: Vec<f64>,
}

/// Pattern parts per (case, stretch). Skip loading: each part on or off.
/// Partial loading: half of the case everywhere, plus each part's other
/// half on or off. None without patterns or on a single stretch.
pub(super) fn parts(
    beam: &Beam,
    mesh: &Mesh,
    case_loads: &[Vec<MeshLoad>],
    stretches: &[Stretch],
) -> Result<Parts> {
    let mut parts: Vec<Vec<(String, Response)>> = vec![Vec::new(); beam.cases.len()];
    let mut part_share = vec![1.0; beam.cases.len()];
    let multi = stretches.len() > 1;
    for (ci, case) in beam.cases.iter().enumerate() {
        if !(case.pattern.is_on() && multi) {
            continue;
        }
        if case.pattern == Pattern::Partial {
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
                solve::analyse(beam, mesh, &clipped)?,
            ));
        }
    }
    Ok(Parts {
        parts,
        share: part_share,
    })
}

/// Per element and quantity, the extremes of a combination without
/// patterns or springs that are known before any section (see `Pre`).
pub(super) fn precomputed(
    fixed: &Response,
    unit_sw: &Response,
    sw_factor: f64,
    len: &[f64],
) -> Vec<[Pre; 3]> {
    (0..len.len())
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
}
