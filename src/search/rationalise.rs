//! Rationalisation: use at most k distinct sections across a schedule.
//!
//! Each member i (weight q_i = count × length) may use any section j that
//! passes it (j ∈ P_i); with unit value u_j (mass or cost per length) its
//! cost is q_i·u_j, so a member takes the cheapest section of the chosen
//! set S that passes it. Minimise Σ_i min_{j ∈ S ∩ P_i} q_i·u_j subject to
//! |S| ≤ k (a k-median-type problem).
//!
//! Method: sections dominated by another that is no more expensive and
//! passes every member it passes are removed; then an exact depth-first
//! branch and bound over the rest, within a node budget. If the budget
//! runs out, a greedy construction improved by 1-swaps is returned with
//! its gap to the lower bound Σ_i min_{j ∈ P_i} q_i·u_j (the unconstrained
//! optimum), an upper bound on its distance from the true optimum.

use serde::Serialize;

/// The outcome of rationalising.
#[derive(Clone, Debug, Serialize)]
pub struct Plan {
    /// Chosen section per member (index into the candidate list).
    pub choice: Vec<usize>,
    /// The distinct sections used.
    pub sections: Vec<usize>,
    pub total: f64,
    /// Unconstrained optimum (every member its own best section).
    pub lower_bound: f64,
    /// True when the branch and bound finished (the plan is optimal).
    pub exact: bool,
    /// (total − lower_bound) / lower_bound.
    pub gap: f64,
}

struct Problem<'a> {
    q: &'a [f64],
    u: &'a [f64],
    /// passes[j] = members that section j passes, as a bit set.
    passes: Vec<Vec<u64>>,
    n: usize,
}

fn bit(set: &[u64], i: usize) -> bool {
    set[i / 64] & (1u64 << (i % 64)) != 0
}

impl Problem<'_> {
    /// Cost of a set; infinite if a member is not covered.
    fn cost(&self, set: &[usize]) -> (f64, Vec<usize>) {
        let mut total = 0.0;
        let mut choice = vec![usize::MAX; self.n];
        for (i, ch) in choice.iter_mut().enumerate() {
            let mut best = f64::INFINITY;
            for &j in set {
                if bit(&self.passes[j], i) {
                    let c = self.q[i] * self.u[j];
                    if c < best || (c == best && j < *ch) {
                        best = c;
                        *ch = j;
                    }
                }
            }
            total += best;
        }
        (total, choice)
    }
}

/// Solve. `passing[i]` lists the sections (indices into `u`) that pass
/// member i; `q[i]` is its weight. Returns None if a member has none.
pub fn rationalise(
    q: &[f64],
    u: &[f64],
    passing: &[Vec<usize>],
    k: usize,
    node_budget: u64,
) -> Option<Plan> {
    let n = q.len();
    let m = u.len();
    if passing.iter().any(|p| p.is_empty()) || k == 0 {
        return None;
    }
    let words = n.div_ceil(64).max(1);
    let mut passes = vec![vec![0u64; words]; m];
    for (i, p) in passing.iter().enumerate() {
        for &j in p {
            passes[j][i / 64] |= 1u64 << (i % 64);
        }
    }
    let lower_bound: f64 = (0..n)
        .map(|i| {
            passing[i]
                .iter()
                .map(|&j| q[i] * u[j])
                .fold(f64::INFINITY, f64::min)
        })
        .sum();
    // Candidates that pass something, minus dominated ones.
    let mut cand: Vec<usize> = (0..m)
        .filter(|&j| passes[j].iter().any(|w| *w != 0))
        .collect();
    cand.sort_by(|&a, &b| u[a].total_cmp(&u[b]).then(a.cmp(&b)));
    let mut kept: Vec<usize> = Vec::new();
    for &j in &cand {
        let dominated = kept
            .iter()
            .any(|&o| u[o] <= u[j] && passes[j].iter().zip(&passes[o]).all(|(a, b)| a & !b == 0));
        if !dominated {
            kept.push(j);
        }
    }
    let prob = Problem { q, u, passes, n };
    // Branch and bound over `kept` (sorted by u), choosing up to k.
    let mut search = Search {
        prob: &prob,
        kept: &kept,
        k,
        stack: Vec::new(),
        best: None,
        nodes: 0,
        budget: node_budget,
        exhausted: true,
    };
    search.dfs(0);
    let (best, exhausted) = (search.best, search.exhausted);
    let exact = exhausted;
    let set = if exact {
        best.map(|b| b.1)?
    } else {
        let mut h = greedy(&prob, &kept, k)?;
        let hc = prob.cost(&h).0;
        if let Some((bc, bs)) = &best
            && *bc < hc
        {
            h = bs.clone();
        }
        h
    };
    let (total, choice) = prob.cost(&set);
    let mut sections: Vec<usize> = set.clone();
    sections.sort_unstable();
    sections.retain(|j| choice.contains(j));
    Some(Plan {
        choice,
        sections,
        total,
        lower_bound,
        exact,
        gap: if lower_bound > 0.0 {
            (total - lower_bound) / lower_bound
        } else {
            0.0
        },
    })
}

struct Search<'a> {
    prob: &'a Problem<'a>,
    kept: &'a [usize],
    k: usize,
    stack: Vec<usize>,
    best: Option<(f64, Vec<usize>)>,
    nodes: u64,
    budget: u64,
    exhausted: bool,
}

impl Search<'_> {
    fn dfs(&mut self, start: usize) {
        self.nodes += 1;
        if self.nodes > self.budget {
            self.exhausted = false;
            return;
        }
        // Lower bound: every member takes its best among the chosen and all
        // sections still available.
        let prob = self.prob;
        let mut lb = 0.0;
        for i in 0..prob.n {
            let mut b = f64::INFINITY;
            for &j in self.stack.iter().chain(self.kept[start..].iter()) {
                if bit(&prob.passes[j], i) {
                    b = b.min(prob.q[i] * prob.u[j]);
                }
            }
            lb += b;
        }
        if !lb.is_finite() || self.best.as_ref().is_some_and(|(c, _)| lb >= *c) {
            return;
        }
        let (c, _) = prob.cost(&self.stack);
        if c.is_finite() && self.best.as_ref().is_none_or(|(bc, _)| c < *bc) {
            self.best = Some((c, self.stack.clone()));
        }
        if self.stack.len() == self.k {
            return;
        }
        for idx in start..self.kept.len() {
            self.stack.push(self.kept[idx]);
            self.dfs(idx + 1);
            self.stack.pop();
            if !self.exhausted {
                return;
            }
        }
    }
}

/// Greedy construction then 1-swap improvement.
fn greedy(prob: &Problem<'_>, kept: &[usize], k: usize) -> Option<Vec<usize>> {
    let score = |set: &[usize]| -> f64 {
        let (c, ch) = prob.cost(set);
        if c.is_finite() {
            c
        } else {
            // Uncovered members count heavily, so coverage comes first.
            let uncovered = ch.iter().filter(|&&j| j == usize::MAX).count() as f64;
            let covered: f64 = (0..prob.n)
                .filter(|&i| ch[i] != usize::MAX)
                .map(|i| prob.q[i] * prob.u[ch[i]])
                .sum();
            1e200 * uncovered + covered
        }
    };
    let mut set: Vec<usize> = Vec::new();
    while set.len() < k {
        let mut best: Option<(f64, usize)> = None;
        for &j in kept {
            if set.contains(&j) {
                continue;
            }
            set.push(j);
            let s = score(&set);
            set.pop();
            if best.is_none_or(|(b, _)| s < b) {
                best = Some((s, j));
            }
        }
        match best {
            Some((_, j)) => set.push(j),
            None => break,
        }
    }
    let mut current = score(&set);
    loop {
        let mut improved = false;
        for pos in 0..set.len() {
            for &j in kept {
                if set.contains(&j) {
                    continue;
                }
                let old = set[pos];
                set[pos] = j;
                let s = score(&set);
                if s < current * (1.0 - 1e-12) {
                    current = s;
                    improved = true;
                } else {
                    set[pos] = old;
                }
            }
        }
        if !improved {
            break;
        }
    }
    prob.cost(&set).0.is_finite().then_some(set)
}
