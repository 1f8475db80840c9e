//! Cutting members from stock bars: which bars to buy for one section and
//! how to cut them, with the offcuts and the waste.
//!
//! Model (conservative): every piece uses its length plus one saw kerf, so
//! a bar of length S holds pieces with Σ (l + kerf) ≤ S. The objective is
//! the least total length of bars bought (the least waste); ties go to
//! fewer bars. A piece longer than every stock length (less the kerf)
//! cannot be cut: it is reported as needing a splice, never dropped.
//!
//! Method: up to [`EXACT_PIECES`] pieces an exact search over every
//! partition of the pieces into bars (each bar then the shortest stock
//! length that holds it); beyond that first-fit decreasing into bars of the
//! longest stock length, each bar then shortened to the shortest stock
//! length that holds its pieces. With a single stock length, first-fit
//! decreasing uses at most 11/9·OPT + 6/9 bars (Dósa 2007, the tight bound
//! for FFD in bin packing; from memory).

use serde::Serialize;

/// Pieces up to which the plan is exact (a search over set partitions:
/// Bell(10) = 115,975 partitions at most, pruned).
pub const EXACT_PIECES: usize = 10;

/// One bar bought and how it is cut.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Bar {
    /// mm.
    pub stock: f64,
    /// Indices into the pieces given, longest first.
    pub pieces: Vec<usize>,
    /// What is left of the bar after the pieces and their kerfs, mm.
    pub offcut: f64,
}

/// The cutting plan for one section.
#[derive(Clone, Debug, Serialize)]
pub struct CutPlan {
    pub bars: Vec<Bar>,
    /// Pieces longer than every stock length less the kerf (indices): they
    /// need a splice or a special length.
    pub too_long: Vec<usize>,
    /// Whether the plan is the least total bar length (exact search).
    pub exact: bool,
    /// mm, Σ stock of the bars bought.
    pub bought: f64,
    /// mm, Σ length of the pieces cut.
    pub used: f64,
}

impl CutPlan {
    /// Waste (offcuts and kerfs) as a length, mm.
    pub fn waste(&self) -> f64 {
        self.bought - self.used
    }
    /// Waste as a fraction of the length bought (0 when nothing is bought).
    pub fn waste_fraction(&self) -> f64 {
        if self.bought > 0.0 {
            self.waste() / self.bought
        } else {
            0.0
        }
    }
    /// Bars bought of each stock length (shortest first): (stock mm, count).
    pub fn bars_by_stock(&self) -> Vec<(f64, usize)> {
        let mut out: Vec<(f64, usize)> = Vec::new();
        for b in &self.bars {
            match out.iter_mut().find(|(s, _)| *s == b.stock) {
                Some((_, n)) => *n += 1,
                None => out.push((b.stock, 1)),
            }
        }
        out.sort_by(|a, b| a.0.total_cmp(&b.0));
        out
    }
}

/// The shortest stock length holding `need` mm (stock sorted ascending).
fn shortest(stock: &[f64], need: f64) -> Option<f64> {
    stock.iter().copied().find(|&s| need <= s * (1.0 + 1e-12))
}

/// Cut `pieces` (mm) from bars of the `stock` lengths (mm, any order, at
/// least one, all positive) with a saw `kerf` (mm, ≥ 0) per piece.
pub fn cut(pieces: &[f64], stock: &[f64], kerf: f64) -> CutPlan {
    cut_limited(pieces, stock, kerf, EXACT_PIECES)
}

/// [`cut`] with the exact search used up to `exact_up_to` pieces (0: always
/// first-fit decreasing), so the heuristic can be tested on its own.
pub fn cut_limited(pieces: &[f64], stock: &[f64], kerf: f64, exact_up_to: usize) -> CutPlan {
    let mut stock: Vec<f64> = stock.to_vec();
    stock.sort_by(f64::total_cmp);
    stock.dedup();
    let longest = stock.last().copied().unwrap_or(0.0);
    let mut order: Vec<usize> = (0..pieces.len()).collect();
    order.sort_by(|&a, &b| pieces[b].total_cmp(&pieces[a]).then(a.cmp(&b)));
    let (fit, too_long): (Vec<usize>, Vec<usize>) = order
        .into_iter()
        .partition(|&i| pieces[i] + kerf <= longest * (1.0 + 1e-12));
    let need = |i: usize| pieces[i] + kerf;
    let (groups, exact) = if fit.len() <= exact_up_to {
        (exact_groups(&fit, &stock, &need), true)
    } else {
        (ffd_groups(&fit, longest, &need), false)
    };
    let bars: Vec<Bar> = groups
        .into_iter()
        .map(|g| {
            let load: f64 = g.iter().map(|&i| need(i)).sum();
            let s = shortest(&stock, load).unwrap_or(longest);
            Bar {
                stock: s,
                offcut: (s - load).max(0.0),
                pieces: g,
            }
        })
        .collect();
    let bought = bars.iter().map(|b| b.stock).sum();
    let used = fit.iter().map(|&i| pieces[i]).sum();
    CutPlan {
        bars,
        too_long,
        exact,
        bought,
        used,
    }
}

/// First-fit decreasing into bars of `cap` (pieces already longest first).
fn ffd_groups(fit: &[usize], cap: f64, need: &dyn Fn(usize) -> f64) -> Vec<Vec<usize>> {
    let mut bars: Vec<(f64, Vec<usize>)> = Vec::new();
    for &i in fit {
        let n = need(i);
        match bars
            .iter_mut()
            .find(|(load, _)| load + n <= cap * (1.0 + 1e-12))
        {
            Some((load, g)) => {
                *load += n;
                g.push(i);
            }
            None => bars.push((n, vec![i])),
        }
    }
    bars.into_iter().map(|b| b.1).collect()
}

/// (stock bought, bars) and the groups of the best plan so far.
type Best = ((f64, usize), Vec<Vec<usize>>);

/// The partition of the pieces into bars with the least total stock
/// bought (then fewest bars): depth-first over "put piece k in an open bar
/// or a new one", pruned by the bound (bought so far + the remaining
/// length, which no plan can avoid buying).
fn exact_groups(fit: &[usize], stock: &[f64], need: &dyn Fn(usize) -> f64) -> Vec<Vec<usize>> {
    struct Search<'a> {
        fit: &'a [usize],
        stock: &'a [f64],
        need: &'a dyn Fn(usize) -> f64,
        suffix: Vec<f64>,
        best: Option<Best>,
        loads: Vec<f64>,
        groups: Vec<Vec<usize>>,
    }
    impl Search<'_> {
        fn bought(&self) -> Option<f64> {
            self.loads
                .iter()
                .map(|&l| shortest(self.stock, l))
                .sum::<Option<f64>>()
        }
        fn go(&mut self, k: usize) {
            let Some(now) = self.bought() else { return };
            if let Some(((b, _), _)) = &self.best {
                // A lower bound: what is bought already, or all the length cut.
                let open: f64 = self.loads.iter().sum();
                if now.max(open + self.suffix[k]) > *b * (1.0 + 1e-12) {
                    return;
                }
            }
            if k == self.fit.len() {
                let key = (now, self.groups.len());
                let better = self.best.as_ref().is_none_or(|((b, n), _)| {
                    key.0 < *b * (1.0 - 1e-12) || (key.0 <= *b * (1.0 + 1e-12) && key.1 < *n)
                });
                if better {
                    self.best = Some((key, self.groups.clone()));
                }
                return;
            }
            let i = self.fit[k];
            let n = (self.need)(i);
            let longest = *self.stock.last().unwrap_or(&0.0);
            for b in 0..self.groups.len() {
                if self.loads[b] + n <= longest * (1.0 + 1e-12) {
                    self.loads[b] += n;
                    self.groups[b].push(i);
                    self.go(k + 1);
                    self.groups[b].pop();
                    self.loads[b] -= n;
                }
            }
            self.loads.push(n);
            self.groups.push(vec![i]);
            self.go(k + 1);
            self.groups.pop();
            self.loads.pop();
        }
    }
    let mut suffix = vec![0.0; fit.len() + 1];
    for k in (0..fit.len()).rev() {
        suffix[k] = suffix[k + 1] + need(fit[k]);
    }
    let mut s = Search {
        fit,
        stock,
        need,
        suffix,
        best: None,
        loads: Vec::new(),
        groups: Vec::new(),
    };
    s.go(0);
    s.best.map(|b| b.1).unwrap_or_default()
}
