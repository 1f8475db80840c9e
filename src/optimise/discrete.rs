//! Rounding a continuous optimum to fabrication sizes: widths and depths
//! on a step, thicknesses from a plate list, timber from size lists.
//!
//! The search is exhaustive: over the whole grid when it is small enough,
//! otherwise over a window of grid values around the continuous optimum,
//! re-centred while the best point lies on the window's edge. Every
//! candidate is judged by the real check (utilisation ≤ 1) and the
//! geometric limits; ties go to the smaller area, then the smaller
//! dimensions in order.

use super::{Eval, Problem};
use crate::check::Prepared;
use crate::error::{Error, Result};
use rayon::prelude::*;
use serde::Serialize;

/// Candidate values per variable, sorted ascending.
#[derive(Clone, Debug, Serialize)]
pub struct Grid {
    pub values: Vec<Vec<f64>>,
}

impl Grid {
    /// Values on `step` within the bounds (multiples of the step).
    pub fn stepped(lo: f64, hi: f64, step: f64) -> Vec<f64> {
        let mut v = Vec::new();
        let mut k = (lo / step - 1e-9).ceil();
        while k * step <= hi * (1.0 + 1e-12) {
            v.push(k * step);
            k += 1.0;
        }
        v
    }

    /// Values of a list within the bounds.
    pub fn listed(lo: f64, hi: f64, list: &[f64]) -> Vec<f64> {
        let mut v: Vec<f64> = list
            .iter()
            .copied()
            .filter(|t| *t >= lo * (1.0 - 1e-12) && *t <= hi * (1.0 + 1e-12))
            .collect();
        v.sort_by(f64::total_cmp);
        v.dedup();
        v
    }

    pub fn size(&self) -> u128 {
        self.values.iter().map(|v| v.len() as u128).product()
    }
}

/// The best grid point.
#[derive(Clone, Debug, Serialize)]
pub struct DiscreteOptimum {
    pub x: Vec<f64>,
    pub area: f64,
    pub objective: f64,
    /// Grid points checked.
    pub evaluated: u64,
    /// True when the whole grid was searched.
    pub whole_grid: bool,
}

fn better(a: &(f64, f64, Vec<f64>), b: &(f64, f64, Vec<f64>)) -> bool {
    a.0.total_cmp(&b.0)
        .then(a.1.total_cmp(&b.1))
        .then_with(|| {
            a.2.iter()
                .zip(&b.2)
                .map(|(x, y)| x.total_cmp(y))
                .find(|o| o.is_ne())
                .unwrap_or(std::cmp::Ordering::Equal)
        })
        .is_lt()
}

fn feasible(e: &Eval) -> bool {
    e.g.iter().all(|(_, g)| *g <= 1e-12)
}

/// A feasible grid point: (objective, area, x, grid indices).
type Hit = (f64, f64, Vec<f64>, Vec<usize>);

/// Search index ranges (one per variable) exhaustively, in parallel.
fn search_box(
    prob: &Problem,
    prep: &Prepared,
    grid: &Grid,
    ranges: &[(usize, usize)],
) -> (Option<Hit>, u64) {
    let dims: Vec<usize> = ranges.iter().map(|(a, b)| b - a + 1).collect();
    let total: usize = dims.iter().product();
    let best = (0..total)
        .into_par_iter()
        .filter_map(|flat| {
            let mut idx = Vec::with_capacity(dims.len());
            let mut r = flat;
            for (k, d) in dims.iter().enumerate() {
                idx.push(ranges[k].0 + r % d);
                r /= d;
            }
            let x: Vec<f64> = idx
                .iter()
                .enumerate()
                .map(|(k, &i)| grid.values[k][i])
                .collect();
            let e = prob.eval(prep, &x)?;
            feasible(&e).then_some((e.f, e.area, x, idx))
        })
        .reduce_with(|a, b| {
            if better(&(b.0, b.1, b.2.clone()), &(a.0, a.1, a.2.clone())) {
                b
            } else {
                a
            }
        });
    (best, total as u64)
}

/// Find the best grid point near `around` (mm). Grids of at most
/// `whole_limit` points are searched whole.
pub fn search(
    prob: &Problem,
    prep: &Prepared,
    grid: &Grid,
    around: &[f64],
    whole_limit: u128,
) -> Result<DiscreteOptimum> {
    if grid.values.iter().any(|v| v.is_empty()) {
        return Err(Error::msg(
            "a fabrication grid is empty within the bounds: check the steps, plate list and bounds",
        ));
    }
    let n = grid.values.len();
    if grid.size() <= whole_limit {
        let ranges: Vec<(usize, usize)> = grid.values.iter().map(|v| (0, v.len() - 1)).collect();
        let (best, count) = search_box(prob, prep, grid, &ranges);
        let best = best.ok_or_else(|| {
            Error::NoSolution(
                "no point of the fabrication grid passes every check and limit".into(),
            )
        })?;
        return Ok(DiscreteOptimum {
            x: best.2,
            area: best.1,
            objective: best.0,
            evaluated: count,
            whole_grid: true,
        });
    }
    let w = if n <= 4 { 3 } else { 2 };
    let mut centre: Vec<usize> = (0..n)
        .map(|k| {
            let v = &grid.values[k];
            v.iter()
                .position(|g| *g >= around[k] * (1.0 - 1e-12))
                .unwrap_or(v.len() - 1)
        })
        .collect();
    let mut evaluated = 0;
    let mut last = None;
    for _round in 0..8 {
        let ranges: Vec<(usize, usize)> = (0..n)
            .map(|k| {
                let len = grid.values[k].len();
                (centre[k].saturating_sub(w), (centre[k] + w).min(len - 1))
            })
            .collect();
        let (best, count) = search_box(prob, prep, grid, &ranges);
        evaluated += count;
        let Some(best) = best else {
            // Nothing feasible in the window: move it up in every variable.
            for (k, c) in centre.iter_mut().enumerate() {
                *c = (*c + w).min(grid.values[k].len() - 1);
            }
            continue;
        };
        let on_edge = (0..n).any(|k| {
            let len = grid.values[k].len();
            (best.3[k] == ranges[k].0 && ranges[k].0 > 0)
                || (best.3[k] == ranges[k].1 && ranges[k].1 < len - 1)
        });
        if !on_edge {
            return Ok(DiscreteOptimum {
                x: best.2,
                area: best.1,
                objective: best.0,
                evaluated,
                whole_grid: false,
            });
        }
        centre = best.3.clone();
        last = Some(best);
    }
    // Still moving after several re-centrings: return the best seen.
    last.map(|b| DiscreteOptimum { x: b.2, area: b.1, objective: b.0, evaluated, whole_grid: false }).ok_or_else(|| {
        Error::NoSolution("no point of the fabrication grid near the continuous optimum passes: narrow the bounds or refine the steps".into())
    })
}
