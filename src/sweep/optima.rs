//! The least-area parametric section of a family at each span of a sweep
//! (`sweep lightest --optimise FAMILY`).

use crate::check::Prepared;
use crate::optimise::{self, Family, Problem};
use crate::units::System;
use rayon::prelude::*;
use serde::Serialize;

/// The optimum at one span: (area mm², the section in words). Serialised
/// as a pair.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SpanOptimum(
    /// Area, mm².
    pub f64,
    /// The section as printed, in the given units; "at the limit" when the
    /// printed dimensions do not pass.
    pub String,
);

/// The least-area section of `family` within its default bounds and
/// slenderness limits ([`Problem::least_area`]) for each prepared span
/// (3 starts each, in parallel over spans), as printed: dimensions rounded
/// up to the figures shown ([`optimise::as_printed`]), with the area of
/// that section when it passes. None where no shape passes.
pub fn optimum_by_span(
    preps: &[Prepared],
    family: Family,
    sys: System,
) -> Vec<Option<SpanOptimum>> {
    preps
        .par_iter()
        .map(|prep| {
            let prob = Problem::least_area(family, &prep.material);
            let o = optimise::continuous(&prob, prep, 3).ok()?;
            match optimise::as_printed(&prob, prep, &o.x) {
                Some(x) => {
                    let shape = family.shape(&x);
                    let area = shape.properties().ok()?.area;
                    Some(SpanOptimum(area, shape.describe(sys)))
                }
                None => Some(SpanOptimum(
                    o.area,
                    format!(
                        "{} — at the limit: the printed dimensions do not pass",
                        o.shape.describe(sys)
                    ),
                )),
            }
        })
        .collect()
}
