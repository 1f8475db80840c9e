//! Catalogue scans: check every row against a prepared job, in parallel,
//! keeping only what the ranking needs (the top rows by each requested
//! criterion, the mass–depth Pareto front, the nearest misses), so memory
//! does not grow with the catalogue.
//!
//! Determinism: rows are read in chunks; each chunk is checked in
//! parallel, and its outcomes are merged in file order with a total order
//! (criterion, then mass, depth, name, file, line), so the result does not
//! depend on the number of threads.

pub mod batch;
pub mod rationalise;

use crate::catalog::read::{Catalog, line_of};
use crate::catalog::{Materials, Row, RowMaterial, parse_row};
use crate::check::{Item, Prepared, SectionInput};
use crate::error::{Error, Location, Result};
use crate::section::{Properties, Shape};
use rayon::prelude::*;
use serde::{Deserialize, Serialize};
use std::cmp::Ordering;
use std::collections::HashSet;
use std::hash::{Hash, Hasher};
use std::io::Read;

/// Ranking criterion.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, clap::ValueEnum)]
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

/// Row filters, applied before checking.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Filters {
    pub max_depth: Option<f64>,
    pub min_depth: Option<f64>,
    pub max_width: Option<f64>,
    pub grade: Option<String>,
    pub in_stock_only: bool,
    /// Glob on the name: `*` any run, `?` one character.
    pub name: Option<String>,
}

/// Simple glob match (`*`, `?`), case-insensitive.
pub fn glob(pattern: &str, s: &str) -> bool {
    let p: Vec<char> = pattern.to_lowercase().chars().collect();
    let t: Vec<char> = s.to_lowercase().chars().collect();
    let (mut pi, mut ti, mut star, mut mark) = (0usize, 0usize, None, 0usize);
    while ti < t.len() {
        if pi < p.len() && (p[pi] == '?' || p[pi] == t[ti]) {
            pi += 1;
            ti += 1;
        } else if pi < p.len() && p[pi] == '*' {
            star = Some(pi);
            mark = ti;
            pi += 1;
        } else if let Some(s) = star {
            pi = s + 1;
            mark += 1;
            ti = mark;
        } else {
            return false;
        }
    }
    while pi < p.len() && p[pi] == '*' {
        pi += 1;
    }
    pi == p.len()
}

impl Filters {
    fn admits(&self, row: &Row<'_>) -> bool {
        let d = row.props.depth;
        if self.max_depth.is_some_and(|m| d > m * (1.0 + 1e-12)) {
            return false;
        }
        if self.min_depth.is_some_and(|m| d < m * (1.0 - 1e-12)) {
            return false;
        }
        if self
            .max_width
            .is_some_and(|m| row.props.width > m * (1.0 + 1e-12))
        {
            return false;
        }
        if let Some(g) = &self.grade
            && !row.grade.eq_ignore_ascii_case(g)
        {
            return false;
        }
        if self.in_stock_only && row.stock != Some(true) {
            return false;
        }
        if let Some(p) = &self.name
            && !glob(p, row.name)
        {
            return false;
        }
        true
    }
}

/// A section that was checked, with what a person needs to choose.
#[derive(Clone, Debug, Serialize)]
pub struct Candidate {
    pub name: String,
    pub series: String,
    pub grade: String,
    pub shape: Option<Shape>,
    /// Catalogue file index and line.
    pub file: usize,
    pub line: u64,
    /// kg/m.
    pub mass: f64,
    /// mm.
    pub depth: f64,
    pub width: f64,
    /// Currency per mm.
    pub cost: Option<f64>,
    pub stock: Option<bool>,
    pub utilisation: f64,
    pub governing: Option<Item>,
    pub passes: bool,
    /// On the mass–depth Pareto front of the passing sections.
    pub pareto: bool,
    pub properties: Properties,
    #[serde(skip)]
    pub material: RowMaterial,
}

fn key(rank: Rank, c: &Candidate) -> f64 {
    match rank {
        Rank::Mass => c.mass,
        Rank::Cost => c.cost.unwrap_or(f64::INFINITY),
        Rank::Depth => c.depth,
        Rank::Utilisation => -c.utilisation,
    }
}

/// The total order used for ranking.
pub fn compare(rank: Rank, a: &Candidate, b: &Candidate) -> Ordering {
    key(rank, a)
        .total_cmp(&key(rank, b))
        .then(a.mass.total_cmp(&b.mass))
        .then(a.depth.total_cmp(&b.depth))
        .then_with(|| a.name.cmp(&b.name))
        .then(a.file.cmp(&b.file))
        .then(a.line.cmp(&b.line))
}

/// A bounded, sorted list.
#[derive(Clone, Debug, Serialize)]
pub struct TopList {
    pub rank: Rank,
    pub limit: usize,
    pub items: Vec<Candidate>,
}

impl TopList {
    pub fn new(rank: Rank, limit: usize) -> Self {
        TopList {
            rank,
            limit,
            items: Vec::new(),
        }
    }
    /// Would this candidate enter the list?
    fn wants(&self, c: &Candidate) -> bool {
        self.items.len() < self.limit
            || self
                .items
                .last()
                .is_some_and(|l| compare(self.rank, c, l) == Ordering::Less)
    }
    fn insert(&mut self, c: Candidate) {
        if !self.wants(&c) {
            return;
        }
        let pos = self
            .items
            .binary_search_by(|x| compare(self.rank, x, &c))
            .unwrap_or_else(|p| p);
        self.items.insert(pos, c);
        self.items.truncate(self.limit);
    }
}

/// Scan options.
#[derive(Clone, Debug)]
pub struct ScanOptions {
    /// Rankings to keep, each with its length (usize::MAX = all).
    pub ranks: Vec<(Rank, usize)>,
    /// Nearest misses to keep.
    pub near: usize,
    pub filters: Filters,
    pub skip_bad_rows: bool,
    /// Rows per chunk.
    pub chunk: usize,
    /// Keep the Pareto front.
    pub pareto: bool,
}

impl Default for ScanOptions {
    fn default() -> Self {
        ScanOptions {
            ranks: vec![(Rank::Mass, 10)],
            near: 5,
            filters: Filters::default(),
            skip_bad_rows: false,
            chunk: 8192,
            pareto: true,
        }
    }
}

/// Counts of a scan.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Counts {
    pub rows: u64,
    pub checked: u64,
    pub passing: u64,
    pub failing: u64,
    pub filtered: u64,
    pub bad: u64,
}

/// What a scan keeps.
#[derive(Clone, Debug, Serialize)]
pub struct Selection {
    pub lists: Vec<TopList>,
    pub pareto: Vec<Candidate>,
    pub near_misses: TopList,
    pub counts: Counts,
    /// Problems in skipped rows (the first 100).
    pub skipped: Vec<String>,
    pub files: Vec<String>,
}

enum Outcome<'r> {
    Bad(u64, usize, String),
    Filtered,
    Checked(Box<Row<'r>>, crate::check::Summary),
}

fn to_candidate(row: &Row<'_>, s: &crate::check::Summary, file: usize, line: u64) -> Candidate {
    Candidate {
        name: row.name.to_string(),
        series: row.series.to_string(),
        grade: row.grade.to_string(),
        shape: row.shape.clone(),
        file,
        line,
        mass: row.mass,
        depth: row.props.depth,
        width: row.props.width,
        cost: row.cost,
        stock: row.stock,
        utilisation: s.utilisation,
        governing: s.governing,
        passes: s.passes,
        pareto: false,
        properties: row.props.clone(),
        material: row.material.clone(),
    }
}

fn name_hash(s: &str) -> u64 {
    let mut h = std::collections::hash_map::DefaultHasher::new();
    s.hash(&mut h);
    h.finish()
}

/// Is `a` dominated by `b` on (mass, depth)?
fn dominated(a: &Candidate, b: &Candidate) -> bool {
    b.mass <= a.mass && b.depth <= a.depth && (b.mass < a.mass || b.depth < a.depth)
}

/// Scan catalogues against a prepared job. `progress` is called after
/// each chunk with the rows and bytes read so far (over all files).
pub fn scan<R: Read + Send>(
    prep: &Prepared,
    catalogs: Vec<Catalog<R>>,
    mats: &Materials<'_>,
    opts: &ScanOptions,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<Selection> {
    let mut done_bytes = 0u64;
    let mut lists: Vec<TopList> = opts
        .ranks
        .iter()
        .map(|&(r, n)| TopList::new(r, n))
        .collect();
    let mut near = TopList::new(Rank::Utilisation, opts.near);
    // Near misses: lowest utilisation first.
    let mut pareto: Vec<Candidate> = Vec::new();
    let mut counts = Counts::default();
    let mut errors: Vec<Error> = Vec::new();
    let mut skipped = Vec::new();
    let mut files = Vec::new();
    let mut buf: Vec<csv::ByteRecord> = Vec::new();
    for (fi, mut cat) in catalogs.into_iter().enumerate() {
        files.push(cat.file.clone());
        let mut names: HashSet<u64> = HashSet::new();
        let name_col = cat
            .schema
            .cols
            .iter()
            .position(|c| *c == crate::catalog::Col::Name)
            .unwrap_or(0);
        loop {
            let n = cat.next_chunk(&mut buf, opts.chunk)?;
            if n == 0 {
                break;
            }
            let schema = &cat.schema;
            let outcomes: Vec<Outcome<'_>> = buf[..n]
                .par_iter()
                .map(|rec| match parse_row(schema, rec, mats) {
                    Err(e) => Outcome::Bad(line_of(rec), e.column, e.message),
                    Ok(row) => {
                        if !opts.filters.admits(&row) {
                            return Outcome::Filtered;
                        }
                        let mat = mats.get(&row.material);
                        let s =
                            prep.check(SectionInput::new(&row.props, row.mass).with_material(mat));
                        Outcome::Checked(Box::new(row), s)
                    }
                })
                .collect();
            for (rec, out) in buf[..n].iter().zip(outcomes) {
                counts.rows += 1;
                let line = line_of(rec);
                match out {
                    Outcome::Bad(line, col, msg) => {
                        counts.bad += 1;
                        let e = Error::input(
                            Location::in_file(&cat.file)
                                .with_line(line)
                                .with_column(col as u64),
                            msg,
                        );
                        if skipped.len() < 100 {
                            skipped.push(e.to_string());
                        }
                        if errors.len() < 1000 {
                            errors.push(e);
                        }
                    }
                    Outcome::Filtered => counts.filtered += 1,
                    Outcome::Checked(row, s) => {
                        if !names.insert(name_hash(row.name)) {
                            counts.bad += 1;
                            let e = Error::input(
                                Location::in_file(&cat.file)
                                    .with_line(line)
                                    .with_column(name_col as u64 + 1),
                                format!("duplicate section name '{}'", row.name),
                            );
                            if skipped.len() < 100 {
                                skipped.push(e.to_string());
                            }
                            errors.push(e);
                            continue;
                        }
                        counts.checked += 1;
                        if s.passes {
                            counts.passing += 1;
                            let cand = to_candidate(&row, &s, fi, line);
                            if opts.pareto && !pareto.iter().any(|p| dominated(&cand, p)) {
                                pareto.retain(|p| !dominated(p, &cand));
                                pareto.push(cand.clone());
                            }
                            for l in lists.iter_mut() {
                                if l.wants(&cand) {
                                    l.insert(cand.clone());
                                }
                            }
                        } else {
                            counts.failing += 1;
                            let cand = to_candidate(&row, &s, fi, line);
                            // Lowest utilisation first among failures.
                            let key_ok = near.items.len() < near.limit
                                || near
                                    .items
                                    .last()
                                    .is_some_and(|l| cand.utilisation < l.utilisation);
                            if key_ok {
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
                        }
                    }
                }
            }
            let pos = buf[n - 1].position().map(|p| p.byte()).unwrap_or(0);
            progress(counts.rows, done_bytes + pos);
        }
        done_bytes += cat.reader.position().byte();
    }
    if counts.bad > 0 && !opts.skip_bad_rows {
        let total = counts.bad;
        let mut errs = errors;
        if total as usize > errs.len() {
            errs.push(Error::msg(format!(
                "... and {} more",
                total as usize - errs.len()
            )));
        }
        errs.push(Error::msg(format!(
            "{total} bad row(s): the catalogue is refused (fix them, or use --skip-bad-rows to leave them out)"
        )));
        return Err(Error::Many(errs));
    }
    pareto.sort_by(|a, b| compare(Rank::Mass, a, b));
    let on_front: HashSet<(usize, u64)> = pareto.iter().map(|c| (c.file, c.line)).collect();
    for l in lists.iter_mut() {
        for c in l.items.iter_mut() {
            c.pareto = on_front.contains(&(c.file, c.line));
        }
    }
    for c in pareto.iter_mut() {
        c.pareto = true;
    }
    Ok(Selection {
        lists,
        pareto,
        near_misses: near,
        counts,
        skipped,
        files,
    })
}

/// Read every row of the catalogues into memory (for schedules, which
/// check each row against many members), sorted lightest first.
pub fn load_rows<R: Read>(
    catalogs: Vec<Catalog<R>>,
    mats: &Materials<'_>,
    skip_bad_rows: bool,
    filters: &Filters,
) -> Result<(Vec<Candidate>, Counts, Vec<String>)> {
    let mut rows = Vec::new();
    let mut counts = Counts::default();
    let mut errors = Vec::new();
    let mut skipped = Vec::new();
    let mut buf = Vec::new();
    let none = crate::check::Summary {
        utilisation: f64::NAN,
        governing: None,
        passes: false,
    };
    for (fi, mut cat) in catalogs.into_iter().enumerate() {
        let mut names: HashSet<String> = HashSet::new();
        loop {
            let n = cat.next_chunk(&mut buf, 4096)?;
            if n == 0 {
                break;
            }
            for rec in &buf[..n] {
                counts.rows += 1;
                let line = line_of(rec);
                match parse_row(&cat.schema, rec, mats) {
                    Ok(row) => {
                        if !names.insert(row.name.to_string()) {
                            counts.bad += 1;
                            let e = Error::input(
                                Location::in_file(&cat.file).with_line(line),
                                format!("duplicate section name '{}'", row.name),
                            );
                            skipped.push(e.to_string());
                            errors.push(e);
                        } else if filters.admits(&row) {
                            rows.push(to_candidate(&row, &none, fi, line));
                        } else {
                            counts.filtered += 1;
                        }
                    }
                    Err(e) => {
                        counts.bad += 1;
                        let e = Error::input(
                            Location::in_file(&cat.file)
                                .with_line(line)
                                .with_column(e.column as u64),
                            e.message,
                        );
                        skipped.push(e.to_string());
                        errors.push(e);
                    }
                }
            }
        }
    }
    if counts.bad > 0 && !skip_bad_rows {
        errors.push(Error::msg(format!(
            "{} bad row(s): the catalogue is refused (fix them, or use --skip-bad-rows to leave them out)",
            counts.bad
        )));
        return Err(Error::Many(errors));
    }
    rows.sort_by(|a, b| compare(Rank::Mass, a, b));
    skipped.truncate(100);
    Ok((rows, counts, skipped))
}
