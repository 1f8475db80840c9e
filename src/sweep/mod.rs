//! Span sweeps and span tables.
//!
//! * Lightest per span: over a list of spans, the lightest passing
//!   catalogue section at each (the demand is analysed once per span,
//!   never per section; rows are sorted lightest first, so the scan stops
//!   at the first that passes).
//! * Maximum span per section (a span table): for each section and each
//!   column (a joist spacing, or a live-load level), the longest span that
//!   passes every check, with the governing check.
//!
//! A sweep scales the job's geometry: every span and load position is
//! multiplied so that the longest span equals the swept value; load
//! intensities stay as given.
//!
//! Exactness. When every load is uniform over the whole beam (self-weight
//! included), the supports are rigid, the deflection limits are ratios L/n
//! and lateral buckling is either not checked or the flange is continuously
//! braced, each utilisation scales with a known power of the span: bending
//! with L² (M ∝ wL²), shear with L, deflection/limit with L³ (δ ∝ wL⁴/EI,
//! limit ∝ L). The maximum span is then L0·u^(−1/p), minimised over every
//! check line (closed form). Otherwise it is found by bisection to
//! `tolerance`.

mod optima;
pub mod options;
pub use optima::{SpanOptimum, optimum_by_span};
pub use options::TableFlags;

use crate::beam::model::{Beam, LoadKind, Support};
use crate::catalog::Materials;
use crate::check::{
    BracedFlange, Bracing, CheckKind, Criteria, Material, Prepared, SectionInput, Verdict,
};
use crate::error::{Error, Result};
use crate::search::Candidate;
use rayon::prelude::*;
use serde::Serialize;

/// The span a sweep sets: the longest segment of the beam.
pub fn reference_span(beam: &Beam) -> f64 {
    beam.spans.iter().copied().fold(0.0, f64::max)
}

/// The beam scaled so its longest segment is `span`.
pub fn at_span(beam: &Beam, span: f64) -> Beam {
    beam.scaled(span / reference_span(beam))
}

/// The job prepared at each span of a sweep: its geometry scaled so the
/// longest span is each value ([`at_span`]), load intensities as given.
pub fn prepared_by_span(
    beam: &Beam,
    material: &Material,
    criteria: &Criteria,
    spans: &[f64],
) -> Result<Vec<Prepared>> {
    spans
        .iter()
        .map(|&s| Prepared::new(&at_span(beam, s), material.clone(), criteria.clone()))
        .collect()
}

/// A column of a span table: what changes the job's loads.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Column {
    /// The job as given.
    AsGiven,
    /// The tributary width of the job's area loads, mm.
    Spacing(f64),
    /// The pressure of the job's live area loads, N/mm².
    LivePressure(f64),
}

impl Column {
    /// The beam of this column; None when the job has no load the column
    /// sets (no area loads for a spacing, no live area loads for a
    /// pressure).
    pub fn beam(self, beam: &Beam) -> Option<Beam> {
        match self {
            Column::AsGiven => Some(beam.clone()),
            Column::Spacing(w) => beam.with_spacing(w),
            Column::LivePressure(p) => beam.with_live_pressure(p),
        }
    }
}

/// Spans from start to end (inclusive) by step.
pub fn span_range(start: f64, end: f64, step: f64) -> Result<Vec<f64>> {
    if !(start > 0.0 && end >= start && step > 0.0) {
        return Err(Error::msg(
            "a span range needs 0 < start ≤ end and a step greater than zero",
        ));
    }
    let n = ((end - start) / step + 1e-9).floor() as usize;
    if n > 100_000 {
        return Err(Error::msg(
            "the span range has more than 100 000 spans: use a larger step",
        ));
    }
    Ok((0..=n).map(|k| start + k as f64 * step).collect())
}

/// The lightest passing section at one span.
#[derive(Clone, Debug, Serialize)]
pub struct Lightest {
    /// mm.
    pub span: f64,
    /// Row index of the lightest passing section.
    pub row: Option<usize>,
    pub utilisation: Option<f64>,
    pub governing: Option<CheckKind>,
    /// Rows lighter than the one found that are not verified (a limit state
    /// that applies could not be evaluated): never taken as passing.
    pub lighter_not_verified: u64,
    /// The reasons of the lightest of them.
    pub not_verified_reasons: Vec<String>,
}

/// The lightest passing row at each span (parallel over spans).
pub fn lightest(
    beam: &Beam,
    material: &Material,
    criteria: &Criteria,
    rows: &[Candidate],
    mats: &Materials<'_>,
    spans: &[f64],
    progress: &(dyn Fn() + Sync),
) -> Result<Vec<Lightest>> {
    spans
        .par_iter()
        .map(|&span| {
            let prep = Prepared::new(&at_span(beam, span), material.clone(), criteria.clone())?;
            let mut out = Lightest {
                span,
                row: None,
                utilisation: None,
                governing: None,
                lighter_not_verified: 0,
                not_verified_reasons: Vec::new(),
            };
            for (j, r) in rows.iter().enumerate() {
                let s = prep.check(
                    SectionInput::new(&r.properties, r.mass).with_material(mats.get(&r.material)),
                );
                if s.passes {
                    out.row = Some(j);
                    out.utilisation = Some(s.utilisation);
                    out.governing = s.governing.map(|g| g.kind);
                    break;
                }
                if s.verdict == Verdict::NotVerified {
                    if out.lighter_not_verified == 0 {
                        out.not_verified_reasons = s.gaps.describe();
                    }
                    out.lighter_not_verified += 1;
                }
            }
            progress();
            Ok(out)
        })
        .collect()
}

/// How a cell was found.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Method {
    ClosedForm,
    Bisection,
}

/// One cell of a span table.
#[derive(Clone, Debug, Serialize)]
pub struct Cell {
    /// Longest passing span, mm (None: fails even at the shortest span tried).
    pub span: Option<f64>,
    /// The exact value before rounding down.
    pub exact: Option<f64>,
    pub governing: Option<CheckKind>,
    pub method: Method,
    pub rounded: bool,
    /// Not verified: a limit state that applies cannot be evaluated for this
    /// section (the reasons); the cell has no span.
    pub not_verified: Vec<String>,
    /// The span passes, and just beyond it the section is not verified
    /// (a method's range ends there, e.g. timber R_B ≤ 50): the reasons.
    pub not_verified_beyond: Vec<String>,
    /// The section still passes at the longest span searched
    /// (`TableOptions::max_span`): the true limit is longer.
    pub at_search_limit: bool,
}

/// Options for span tables.
#[derive(Clone, Debug)]
pub struct TableOptions {
    /// Bisection tolerance, mm.
    pub tolerance: f64,
    /// Round spans down to a multiple of this (mm), as publishers do.
    pub round: Option<f64>,
    /// Search range for bisection (mm).
    pub min_span: f64,
    pub max_span: f64,
}

impl Default for TableOptions {
    fn default() -> Self {
        TableOptions {
            tolerance: 1.0,
            round: None,
            min_span: 100.0,
            max_span: 50_000.0,
        }
    }
}

/// Whether the closed form applies to this beam and criteria.
pub fn closed_form_applies(beam: &Beam, criteria: &Criteria) -> bool {
    let l = beam.length();
    let loads_scale = beam.loads.iter().all(|ld| match ld.kind {
        LoadKind::Distributed { x1, x2, w1, w2 } => {
            x1.abs() <= 1e-9 * l && (x2 - l).abs() <= 1e-9 * l && w1 == w2
        }
        _ => false,
    });
    let limits_ratio = beam
        .combinations
        .iter()
        .all(|c| c.limit.is_none_or(|lim| lim.absolute.is_none()));
    let rigid = !beam
        .supports
        .iter()
        .any(|s| matches!(s, Support::Spring(_)));
    // Lateral stability does not scale with a power of the span: the closed
    // form needs it absent — both flanges braced continuously, or the top
    // flange braced on a beam that never hogs (a single simple span under
    // downward loads).
    let never_hogs = beam.spans.len() == 1
        && beam.supports.iter().all(|s| !matches!(s, Support::Fixed))
        && beam.supports.iter().all(|s| s.restrains_vertical())
        && beam.loads.iter().all(|ld| match ld.kind {
            LoadKind::Distributed { w1, w2, .. } => w1 >= 0.0 && w2 >= 0.0,
            _ => false,
        })
        && beam
            .combinations
            .iter()
            .all(|c| c.factors.iter().all(|(_, f)| *f >= 0.0));
    let ltb_ok = criteria.exclude.lateral_torsional_buckling
        || (criteria.bracing == Bracing::Continuous
            && (criteria.braced_flange == BracedFlange::Both || never_hogs));
    loads_scale && limits_ratio && rigid && ltb_ok
}

fn power(kind: CheckKind) -> f64 {
    match kind {
        CheckKind::Shear | CheckKind::WebShear => 1.0,
        CheckKind::Deflection => 3.0,
        _ => 2.0,
    }
}

/// The longest passing span of one section for one beam (a column).
pub fn max_span(
    beam: &Beam,
    material: &Material,
    criteria: &Criteria,
    row: &Candidate,
    mats: &Materials<'_>,
    opts: &TableOptions,
) -> Result<Cell> {
    if !(opts.tolerance.is_finite() && opts.tolerance > 0.0) {
        return Err(
            Error::msg("the bisection tolerance must be greater than zero").in_field("--tolerance"),
        );
    }
    let finish = |exact: Option<f64>, beyond: &At, method: Method| -> Cell {
        let span = match (exact, opts.round) {
            (Some(e), Some(r)) => Some((e / r + 1e-9).floor() * r).filter(|s| *s > 0.0),
            (e, None) => e,
            (None, _) => None,
        };
        let (governing, nv_beyond, limit) = match beyond {
            At::Fails(k) => (*k, Vec::new(), false),
            At::NotVerified(r) => (None, r.clone(), false),
            At::Passes => (None, Vec::new(), true),
        };
        Cell {
            span,
            exact,
            governing,
            method,
            rounded: opts.round.is_some(),
            not_verified: Vec::new(),
            not_verified_beyond: nv_beyond,
            at_search_limit: limit,
        }
    };
    let at = |l: f64| outcome_at(beam, material, criteria, row, mats, l);
    let unverified = |reasons: Vec<String>, method: Method| Cell {
        span: None,
        exact: None,
        governing: None,
        method,
        rounded: false,
        not_verified: reasons,
        not_verified_beyond: Vec::new(),
        at_search_limit: false,
    };
    if closed_form_applies(beam, criteria) {
        let l0 = reference_span(beam);
        let prep = Prepared::new(beam, material.clone(), criteria.clone())?;
        let mut best: Option<(f64, CheckKind)> = None;
        prep.visit(
            SectionInput::new(&row.properties, row.mass).with_material(mats.get(&row.material)),
            &mut |it: crate::check::Item| {
                if it.utilisation > 0.0 && it.utilisation.is_finite() {
                    let l = l0 * it.utilisation.powf(-1.0 / power(it.kind));
                    if best.is_none_or(|(b, _)| l < b) {
                        best = Some((l, it.kind));
                    }
                }
            },
        );
        if let Some((l, k)) = best
            && l < opts.min_span
        {
            // By the same scaling the check fails at every span from the
            // shortest one tried: no span to list (and no beam shorter than
            // the supported range is analysed).
            return Ok(finish(None, &At::Fails(Some(k)), Method::ClosedForm));
        }
        if let Some((mut l, k)) = best
            && l <= opts.max_span
        {
            // At the exact span one utilisation is 1 to round-off: step
            // below it until the real check passes, so a table never lists
            // a span that fails. A section not verified there (a method's
            // range ends before the closed-form span) is searched by
            // bisection instead.
            let mut found = false;
            for _ in 0..20 {
                match at(l)? {
                    At::Passes => {
                        found = true;
                        break;
                    }
                    At::NotVerified(_) => break,
                    At::Fails(_) => l *= 1.0 - 1e-10,
                }
            }
            if found && l <= opts.max_span {
                return Ok(finish(Some(l), &At::Fails(Some(k)), Method::ClosedForm));
            }
        }
    }
    // Bisection on [lo, hi] with passes(lo) and not passes(hi).
    let mut lo = opts.min_span;
    match at(lo)? {
        At::Passes => {}
        At::NotVerified(r) => return Ok(unverified(r, Method::Bisection)),
        At::Fails(k) => return Ok(finish(None, &At::Fails(k), Method::Bisection)),
    }
    let mut hi = (2.0 * lo).max(reference_span(beam)).min(opts.max_span);
    let mut beyond;
    loop {
        let o = at(hi)?;
        if o != At::Passes {
            beyond = o;
            break;
        }
        if hi >= opts.max_span {
            // Passes at the longest span searched: say so, never more.
            return Ok(finish(Some(hi), &At::Passes, Method::Bisection));
        }
        lo = hi;
        hi = (2.0 * hi).min(opts.max_span);
    }
    // Each step halves the bracket; 200 steps reach any tolerance that a
    // double can resolve, so the loop is bounded whatever the tolerance.
    for _ in 0..200 {
        if hi - lo <= opts.tolerance {
            break;
        }
        let mid = 0.5 * (lo + hi);
        let o = at(mid)?;
        if o == At::Passes {
            lo = mid;
        } else {
            hi = mid;
            beyond = o;
        }
    }
    Ok(finish(Some(lo), &beyond, Method::Bisection))
}

/// What a section does at one span.
#[derive(Clone, Debug, PartialEq)]
enum At {
    Passes,
    /// Fails, with the governing check.
    Fails(Option<CheckKind>),
    /// Not verified, with the reasons.
    NotVerified(Vec<String>),
}

fn outcome_at(
    beam: &Beam,
    m: &Material,
    c: &Criteria,
    row: &Candidate,
    mats: &Materials<'_>,
    span: f64,
) -> Result<At> {
    let prep = Prepared::new(&at_span(beam, span), m.clone(), c.clone())?;
    let s = prep
        .check(SectionInput::new(&row.properties, row.mass).with_material(mats.get(&row.material)));
    Ok(match s.verdict {
        Verdict::Passes => At::Passes,
        Verdict::Fails => At::Fails(s.governing.map(|g| g.kind)),
        Verdict::NotVerified => At::NotVerified(s.gaps.describe()),
    })
}

/// A whole span table: rows × columns (parallel over rows).
pub fn span_table(
    columns: &[Beam],
    material: &Material,
    criteria: &Criteria,
    rows: &[Candidate],
    mats: &Materials<'_>,
    opts: &TableOptions,
    progress: &(dyn Fn() + Sync),
) -> Result<Vec<Vec<Cell>>> {
    rows.par_iter()
        .map(|r| {
            let cells = columns
                .iter()
                .map(|b| max_span(b, material, criteria, r, mats, opts))
                .collect::<Result<Vec<_>>>();
            progress();
            cells
        })
        .collect()
}
