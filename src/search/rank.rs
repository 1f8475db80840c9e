//! Ranking: the criteria, their total order, the bounded top lists, the
//! mass–depth Pareto front and the nearest misses.

use super::Candidate;
use serde::{Deserialize, Serialize};
use std::cmp::Ordering;

/// Ranking criterion.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Rank {
    /// Lightest first (mass per length).
    Mass,
    /// Cheapest first (cost per length; rows without a cost last).
    Cost,
    /// Shallowest first.
    Depth,
    /// Most highly utilised first (the least spare capacity).
    Utilisation,
}

impl Rank {
    /// Every choice with its name (the serde name where it has one) and
    /// a line of help, for front ends that list the choices.
    pub const CHOICES: &[(Self, &str, &str)] = &[
        (Self::Mass, "mass", "Lightest first (mass per length)"),
        (
            Self::Cost,
            "cost",
            "Cheapest first (cost per length; rows without a cost last)",
        ),
        (Self::Depth, "depth", "Shallowest first"),
        (
            Self::Utilisation,
            "utilisation",
            "Most highly utilised first (the least spare capacity)",
        ),
    ];
}

/// The total order used for ranking (criterion, then mass, depth, name,
/// file, line).
pub fn compare(rank: Rank, a: &Candidate, b: &Candidate) -> Ordering {
    KeyRef::of(a).cmp(rank, b)
}

/// A bounded, sorted list.
#[derive(Clone, Debug, Serialize)]
pub struct TopList {
    pub rank: Rank,
    pub limit: usize,
    /// The best `limit` candidates in rank order once the scan has
    /// finished (`finish`); during the scan a sorted prefix of `limit`
    /// followed by candidates that beat its last, compacted now and then,
    /// so keeping n candidates costs O(n log n), not O(n²).
    pub items: Vec<Candidate>,
    sorted_prefix: bool,
}

impl TopList {
    pub fn new(rank: Rank, limit: usize) -> Self {
        TopList {
            rank,
            limit,
            items: Vec::new(),
            sorted_prefix: false,
        }
    }
    /// The worst candidate that is surely kept so far (None until the list
    /// holds `limit`): anything better may enter.
    fn cutoff(&self) -> Option<&Candidate> {
        (self.sorted_prefix && self.items.len() >= self.limit && self.limit > 0)
            .then(|| &self.items[self.limit - 1])
    }
    /// Would this candidate enter the list?
    fn wants(&self, c: &Candidate) -> bool {
        if self.limit == 0 {
            return false;
        }
        match self.cutoff() {
            None => true,
            Some(l) => compare(self.rank, c, l) == Ordering::Less,
        }
    }
    pub(super) fn insert(&mut self, c: Candidate) {
        if !self.wants(&c) {
            return;
        }
        self.items.push(c);
        let compact_at = self
            .limit
            .saturating_mul(2)
            .max(self.limit.saturating_add(64));
        if (!self.sorted_prefix && self.items.len() == self.limit) || self.items.len() >= compact_at
        {
            self.finish();
        }
    }
    /// Sort and cut to the limit.
    pub fn finish(&mut self) {
        let rank = self.rank;
        self.items.sort_by(|a, b| compare(rank, a, b));
        self.items.truncate(self.limit);
        self.sorted_prefix = true;
    }
}

/// The ranking key of a row that has not been materialised yet.
pub(super) struct KeyRef<'a> {
    pub(super) mass: f64,
    pub(super) depth: f64,
    pub(super) cost: Option<f64>,
    pub(super) utilisation: f64,
    pub(super) name: &'a str,
    pub(super) file: usize,
    pub(super) line: u64,
}

impl<'a> KeyRef<'a> {
    fn of(c: &'a Candidate) -> KeyRef<'a> {
        KeyRef {
            mass: c.mass,
            depth: c.depth,
            cost: c.cost,
            utilisation: c.utilisation,
            name: &c.name,
            file: c.file,
            line: c.line,
        }
    }

    fn key(&self, rank: Rank) -> f64 {
        match rank {
            Rank::Mass => self.mass,
            Rank::Cost => self.cost.unwrap_or(f64::INFINITY),
            Rank::Depth => self.depth,
            Rank::Utilisation => -self.utilisation,
        }
    }
    /// The ranking order, against a materialised candidate.
    fn cmp(&self, rank: Rank, b: &Candidate) -> Ordering {
        self.key(rank)
            .total_cmp(&KeyRef::of(b).key(rank))
            .then(self.mass.total_cmp(&b.mass))
            .then(self.depth.total_cmp(&b.depth))
            .then_with(|| self.name.cmp(b.name.as_str()))
            .then(self.file.cmp(&b.file))
            .then(self.line.cmp(&b.line))
    }
}

impl TopList {
    pub(super) fn wants_key(&self, k: &KeyRef<'_>) -> bool {
        if self.limit == 0 {
            return false;
        }
        match self.cutoff() {
            None => true,
            Some(l) => k.cmp(self.rank, l) == Ordering::Less,
        }
    }
}

/// Is `a` dominated by `b` on (mass, depth)?
pub(super) fn dominated(a: &Candidate, b: &Candidate) -> bool {
    b.mass <= a.mass && b.depth <= a.depth && (b.mass < a.mass || b.depth < a.depth)
}

pub(super) fn dominated_by(mass: f64, depth: f64, b: &Candidate) -> bool {
    b.mass <= mass && b.depth <= depth && (b.mass < mass || b.depth < depth)
}

/// Keep a near miss: the least utilised failing rows, best first.
pub(super) fn near_insert(near: &mut TopList, cand: Candidate) {
    near.items.push(cand);
    near.items.sort_by(|a, b| {
        a.utilisation
            .total_cmp(&b.utilisation)
            .then(a.mass.total_cmp(&b.mass))
            .then_with(|| a.name.cmp(&b.name))
            .then(a.file.cmp(&b.file))
            .then(a.line.cmp(&b.line))
    });
    near.items.truncate(near.limit);
}
