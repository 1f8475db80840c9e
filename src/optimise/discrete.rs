//! Rounding a continuous optimum to fabrication sizes: widths and depths
//! on a step, thicknesses from a plate list, timber from size lists.
//!
//! The result is provably the grid optimum: every grid point's objective
//! (area, cost or depth) is computed — cheap, no check — and the points are
//! visited in increasing order of (objective, area, dimensions); the first
//! that passes the real check (verdict passes) and the geometric limits is
//! the optimum, since every point before it failed and every point after it
//! costs at least as much. Feasibility is tested in parallel batches in
//! that order, so the answer does not depend on the thread count. Only a
//! grid larger than `EXHAUSTIVE_POINTS` falls back to a window around the
//! continuous optimum, and then says so, with the bound on its gap: the
//! continuous optimum is a lower bound of every grid point.

use super::{Axis, Eval, Problem};
use crate::check::Prepared;
use crate::error::{Error, Result};
use crate::units;
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

/// The fabrication sizes a grid is built from (mm).
#[derive(Clone, Debug, Default)]
pub struct GridOptions {
    /// Plate thicknesses available: the values of every thickness.
    pub plates: Vec<f64>,
    /// Step of widths and depths not given by a list.
    pub step: f64,
    /// Widths available (solid sections sized from lists, such as timber),
    /// instead of the step.
    pub widths: Option<Vec<f64>>,
    /// Depths available, instead of the step.
    pub depths: Option<Vec<f64>>,
}

impl Grid {
    /// The grid of a problem: each variable's values within its bounds,
    /// by its [`Axis`] (thicknesses from the plate list, widths and depths
    /// from their lists or on the step); an error names a variable with
    /// no value within its bounds.
    pub fn for_problem(prob: &Problem, opts: &GridOptions) -> Result<Grid> {
        let kind = prob.family.kind();
        let vars = kind.variables();
        let mut values = Vec::new();
        for (i, &(lo, hi)) in prob.bounds.iter().enumerate() {
            let v = match (kind.axes()[i], &opts.widths, &opts.depths) {
                (Axis::Width, Some(list), _) | (Axis::Depth, _, Some(list)) => {
                    Grid::listed(lo, hi, list)
                }
                (Axis::Thickness, _, _) => Grid::listed(lo, hi, &opts.plates),
                _ => Grid::stepped(lo, hi, opts.step),
            };
            if v.is_empty() {
                return Err(Error::msg(format!(
                    "no fabrication size of {} lies within its bounds {}–{} mm",
                    vars[i],
                    units::fmt_num(lo),
                    units::fmt_num(hi)
                )));
            }
            values.push(v);
        }
        Ok(Grid { values })
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
    /// True when the result is the optimum of the whole grid.
    pub whole_grid: bool,
    /// For a windowed search (grids beyond `EXHAUSTIVE_POINTS`): at most
    /// this fraction above the grid optimum (from the continuous optimum,
    /// a lower bound). None when exhaustive.
    pub gap_bound: Option<f64>,
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

/// Grids up to this many points are searched exhaustively (about 48 MB of
/// sort keys at the limit).
pub const EXHAUSTIVE_POINTS: u128 = 2_000_000;

/// The grid point of flat index `flat` (variable 0 most significant, so
/// that ascending flat order is ascending lexicographic order of x).
fn point(grid: &Grid, mut flat: u64, x: &mut [f64]) {
    for k in (0..grid.values.len()).rev() {
        let n = grid.values[k].len() as u64;
        x[k] = grid.values[k][(flat % n) as usize];
        flat /= n;
    }
}

/// The exhaustive search in objective order.
fn exhaustive(prob: &Problem, prep: &Prepared, grid: &Grid) -> Result<DiscreteOptimum> {
    let total = grid.size() as u64;
    let n = grid.values.len();
    // (objective, area, flat index) of every point with a valid shape.
    let mut keys: Vec<(f64, f64, u64)> = (0..total)
        .into_par_iter()
        .filter_map(|flat| {
            let mut x = vec![0.0; n];
            point(grid, flat, &mut x);
            prob.objective_at(&x, prep.material.density)
                .map(|(f, a)| (f, a, flat))
        })
        .collect();
    keys.par_sort_unstable_by(|a, b| {
        a.0.total_cmp(&b.0)
            .then(a.1.total_cmp(&b.1))
            .then(a.2.cmp(&b.2))
    });
    let mut evaluated = 0u64;
    for batch in keys.chunks(2048) {
        evaluated += batch.len() as u64;
        let hit = batch.par_iter().position_first(|&(_, _, flat)| {
            let mut x = vec![0.0; n];
            point(grid, flat, &mut x);
            prob.eval(prep, &x).is_some_and(|e| feasible(&e))
        });
        if let Some(i) = hit {
            let (f, area, flat) = batch[i];
            let mut x = vec![0.0; n];
            point(grid, flat, &mut x);
            evaluated -= (batch.len() - i - 1) as u64;
            return Ok(DiscreteOptimum {
                x,
                area,
                objective: f,
                evaluated,
                whole_grid: true,
                gap_bound: None,
            });
        }
    }
    Err(Error::NoSolution(format!(
        "none of the {total} points of the fabrication grid passes every check and limit"
    )))
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

/// The best grid point: the exhaustive optimum for grids of at most
/// `whole_limit` points (use [`EXHAUSTIVE_POINTS`]), otherwise the best of a
/// window around `around` (mm, the continuous optimum, whose objective
/// `lower_bound` bounds the gap).
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
    if grid.size() <= whole_limit.min(EXHAUSTIVE_POINTS) {
        return exhaustive(prob, prep, grid);
    }
    let lower_bound = prob
        .objective_at(around, prep.material.density)
        .map(|o| o.0);
    // A grid too large to search whole: first the whole of a coarser
    // sub-grid (every m-th value of the longest lists, so each of its
    // points is a point of the grid), whose optimum the result can only
    // improve on; then a window around the continuous optimum.
    let coarse = {
        let mut values = grid.values.clone();
        let size = |v: &[Vec<f64>]| v.iter().map(|x| x.len() as u128).product::<u128>();
        while size(&values) > EXHAUSTIVE_POINTS {
            let k = (0..n).max_by_key(|&k| values[k].len()).unwrap_or(0);
            if values[k].len() <= 2 {
                break;
            }
            values[k] = values[k].iter().copied().step_by(2).collect();
        }
        let sub = Grid { values };
        if sub.size() <= EXHAUSTIVE_POINTS {
            exhaustive(prob, prep, &sub).ok()
        } else {
            None
        }
    };
    let windowed = windowed(prob, prep, grid, around, lower_bound);
    let coarse_evaluated = coarse.as_ref().map_or(0, |c| c.evaluated);
    let pick = match (windowed, coarse) {
        (Ok(w), Some(c)) => {
            if better(
                &(c.objective, c.area, c.x.clone()),
                &(w.objective, w.area, w.x.clone()),
            ) {
                c
            } else {
                w
            }
        }
        (Ok(w), None) => w,
        (Err(_), Some(c)) => c,
        (Err(e), None) => return Err(e),
    };
    Ok(DiscreteOptimum {
        gap_bound: lower_bound.map(|lb| (pick.objective - lb) / lb),
        evaluated: pick.evaluated.max(coarse_evaluated),
        whole_grid: false,
        ..pick
    })
}

/// The windowed search around the continuous optimum.
fn windowed(
    prob: &Problem,
    prep: &Prepared,
    grid: &Grid,
    around: &[f64],
    lower_bound: Option<f64>,
) -> Result<DiscreteOptimum> {
    let n = grid.values.len();
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
                gap_bound: lower_bound.map(|lb| (best.0 - lb) / lb),
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
    last.map(|b| DiscreteOptimum { gap_bound: lower_bound.map(|lb| (b.0 - lb) / lb), x: b.2, area: b.1, objective: b.0, evaluated, whole_grid: false }).ok_or_else(|| {
        Error::NoSolution("no point of the fabrication grid near the continuous optimum passes: narrow the bounds or refine the steps".into())
    })
}
