//! Catalogue scans: check every row against a prepared job, in parallel,
//! keeping only what the ranking needs (the top rows by each requested
//! criterion, the mass–depth Pareto front, the nearest misses), so memory
//! does not grow with the catalogue.
//!
//! Determinism: rows are read in blocks of segments; each block is checked
//! in parallel, and its outcomes are merged in file order with a total order
//! (criterion, then mass, depth, name, file, line), so the result does not
//! depend on the number of threads.

pub mod batch;
pub mod rationalise;
pub mod schedule;
pub mod spans;

use crate::catalog::read::{Catalog, Chunk};
use crate::catalog::records::{Block, Records};
use crate::catalog::{Materials, Row, RowMaterial, parse_row};
use crate::check::{Item, Prepared, SectionInput, Verdict};
use crate::error::{Error, Location, Result};
use crate::section::{Properties, Shape};
use rayon::prelude::*;
use serde::{Deserialize, Serialize};
use std::cmp::Ordering;
use std::collections::HashSet;
use std::io::Read;

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
    /// The filters in words (empty when none is set), e.g. "in stock only,
    /// depth at most 350 mm".
    pub fn describe(&self) -> Vec<String> {
        let mm = |v: f64| format!("{} mm", crate::units::fmt_num(v));
        let mut out = Vec::new();
        if let Some(v) = self.max_depth {
            out.push(format!("depth at most {}", mm(v)));
        }
        if let Some(v) = self.min_depth {
            out.push(format!("depth at least {}", mm(v)));
        }
        if let Some(v) = self.max_width {
            out.push(format!("width at most {}", mm(v)));
        }
        if let Some(g) = &self.grade {
            out.push(format!("grade {g}"));
        }
        if self.in_stock_only {
            out.push("in stock only".into());
        }
        if let Some(n) = &self.name {
            out.push(format!("names matching '{n}'"));
        }
        out
    }

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
    pub verdict: Verdict,
    pub passes: bool,
    /// Why the verdict is not verified (empty otherwise).
    pub not_verified: Vec<String>,
    /// What beamsift does not check for this row (outside its scope).
    pub not_checked: Vec<String>,
    /// On the mass–depth Pareto front of the passing sections.
    pub pareto: bool,
    pub properties: Properties,
    #[serde(skip)]
    pub material: RowMaterial,
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
    fn insert(&mut self, c: Candidate) {
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

/// Scan options.
#[derive(Clone, Debug)]
pub struct ScanOptions {
    /// Rankings to keep, each with its length (usize::MAX = all).
    pub ranks: Vec<(Rank, usize)>,
    /// Nearest misses to keep.
    pub near: usize,
    pub filters: Filters,
    pub skip_bad_rows: bool,
    /// Bytes per parallel segment of a block (results never depend on it).
    pub chunk: usize,
    /// Keep the Pareto front.
    pub pareto: bool,
    /// Not-verified rows to keep (lightest first), listed apart.
    pub unverified: usize,
    /// Rank not-verified rows with the passing ones (marked on every line).
    pub include_unverified: bool,
}

impl Default for ScanOptions {
    fn default() -> Self {
        ScanOptions {
            ranks: vec![(Rank::Mass, 10)],
            near: 5,
            filters: Filters::default(),
            skip_bad_rows: false,
            chunk: crate::catalog::records::SEGMENT,
            pareto: true,
            unverified: 5,
            include_unverified: false,
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
    /// Checked, nothing failed, but a limit state could not be evaluated.
    pub not_verified: u64,
    pub filtered: u64,
    pub bad: u64,
}

/// What a scan keeps.
#[derive(Clone, Debug, Serialize)]
pub struct Selection {
    pub lists: Vec<TopList>,
    pub pareto: Vec<Candidate>,
    pub near_misses: TopList,
    /// The lightest not-verified rows.
    pub unverified: TopList,
    pub counts: Counts,
    /// Problems in skipped rows (the first 100).
    pub skipped: Vec<String>,
    pub files: Vec<String>,
    /// Names that may be duplicates (confirmed by `scan_checked`).
    pub suspects: Vec<Suspect>,
    /// Files with more than `SUSPECT_CAP` suspects: confirm every name.
    pub check_all_names: Vec<usize>,
}

impl Selection {
    /// The row with exactly this name among every row kept (ranked, near
    /// misses, not verified), whatever its verdict; the error names rows
    /// that differ only in case.
    pub fn named(&self, name: &str) -> Result<&Candidate> {
        let all = || {
            self.lists[0]
                .items
                .iter()
                .chain(self.near_misses.items.iter())
                .chain(self.unverified.items.iter())
        };
        if let Some(c) = all().find(|c| c.name == name) {
            return Ok(c);
        }
        let similar: Vec<String> = all()
            .filter(|c| c.name.eq_ignore_ascii_case(name))
            .map(|c| format!("'{}'", c.name))
            .collect();
        Err(if similar.is_empty() {
            Error::msg(format!("no section named '{name}' in the catalogue"))
        } else {
            Error::msg(format!(
                "no section named '{name}' in the catalogue (names are matched exactly, case included); similar: {}",
                similar.join(", ")
            ))
        })
    }
}

/// What the parallel phase hands to the merge: small, so moving a chunk
/// of them is cheap. A row that enters a list is parsed again to build
/// its candidate (rare after the first chunks).
enum Outcome<'r> {
    Bad(u64, usize, String),
    Filtered,
    Excluded,
    Checked {
        name: &'r str,
        /// The duplicate filter had seen this name.
        suspect: bool,
        mass: f64,
        depth: f64,
        cost: Option<f64>,
        summary: crate::check::Summary,
    },
}

fn to_candidate(
    prep: &Prepared,
    mats: &Materials<'_>,
    row: &Row<'_>,
    s: &crate::check::Summary,
    file: usize,
    line: u64,
) -> Candidate {
    let mat = mats.get(&row.material);
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
        verdict: s.verdict,
        passes: s.passes,
        not_verified: s.gaps.describe(),
        not_checked: prep.not_checked(&row.props, Some(mat)),
        pareto: false,
        properties: row.props.clone(),
        material: row.material.clone(),
    }
}

/// A row read for later checking (schedules): no verdict yet.
fn to_candidate_unchecked(
    row: &Row<'_>,
    s: &crate::check::Summary,
    file: usize,
    line: u64,
) -> Candidate {
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
        verdict: s.verdict,
        passes: s.passes,
        not_verified: Vec::new(),
        not_checked: Vec::new(),
        pareto: false,
        properties: row.props.clone(),
        material: row.material.clone(),
    }
}

impl Candidate {
    /// Fill in the verdict of a check (for rows read before checking).
    pub fn with_summary(
        mut self,
        prep: &Prepared,
        mat: &crate::check::Material,
        s: &crate::check::Summary,
    ) -> Candidate {
        self.utilisation = s.utilisation;
        self.governing = s.governing;
        self.verdict = s.verdict;
        self.passes = s.passes;
        self.not_verified = s.gaps.describe();
        self.not_checked = prep.not_checked(&self.properties, Some(mat));
        self
    }
}

/// The ranking key of a row that has not been materialised yet.
struct KeyRef<'a> {
    mass: f64,
    depth: f64,
    cost: Option<f64>,
    utilisation: f64,
    name: &'a str,
    file: usize,
    line: u64,
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
    fn wants_key(&self, k: &KeyRef<'_>) -> bool {
        if self.limit == 0 {
            return false;
        }
        match self.cutoff() {
            None => true,
            Some(l) => k.cmp(self.rank, l) == Ordering::Less,
        }
    }
}

/// A Bloom filter over section names in 64-bit words, 8 probes inside one
/// word chosen by the name's hash, sized from the input's length: one word
/// per 8 bytes of catalogue (at least 32 KiB, at most 2^22 words = 32 MiB,
/// reached at 32 MB of catalogue, about 600,000 rows; unknown lengths take
/// the most). One word per name means one memory access and an atomic
/// `fetch_or`, so the worker threads insert in parallel, and of two equal
/// names the later insert always sees the earlier's bits (no duplicate is
/// missed). A hit only makes a name a suspect; suspects are confirmed
/// exactly by a second reading of the file (`confirm_duplicates`), which
/// therefore happens only when a name repeats or the filter errs. Rows of
/// ~54 bytes give about 0.15 names per word below the cap, a false flag per
/// row of about (1 − e^(−8·0.15/64))^8 ≈ 10⁻¹⁴; at the cap with n names,
/// (1 − e^(−8n/2²⁸))^8: 5·10⁻¹³ at 1 M rows (none expected below about 3 M
/// rows), 2·10⁻⁵ at 10 M (about 200 suspects, one extra reading of names
/// only). Beyond `SUSPECT_CAP` suspects (a file in which more than 100,000
/// names repeat) the confirmation checks every name and memory then grows
/// with the catalogue.
struct Bloom {
    words: Vec<std::sync::atomic::AtomicU64>,
    /// Words − 1 (a power of two less one).
    mask: u64,
    /// log2 of the words: the hash bits above it give the probes.
    shift: u32,
}

const BLOOM_MAX_WORDS_LOG2: u32 = 22;
const BLOOM_MIN_WORDS_LOG2: u32 = 12;

/// A fast 64-bit hash of a name, eight bytes at a time (multiply–xorshift
/// rounds, splitmix64 finish). Not for adversarial input: a collision only
/// costs a confirmation read.
fn name_hash(s: &str) -> u64 {
    let b = s.as_bytes();
    let mut h = 0x243f_6a88_85a3_08d3u64 ^ (b.len() as u64);
    let mut chunks = b.chunks_exact(8);
    for c in chunks.by_ref() {
        let w = u64::from_le_bytes([c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7]]);
        h = (h ^ w).wrapping_mul(0x9e37_79b9_7f4a_7c15);
        h ^= h >> 29;
    }
    let rest = chunks.remainder();
    if !rest.is_empty() {
        let mut w = [0u8; 8];
        w[..rest.len()].copy_from_slice(rest);
        h = (h ^ u64::from_le_bytes(w)).wrapping_mul(0x9e37_79b9_7f4a_7c15);
        h ^= h >> 29;
    }
    h ^= h >> 30;
    h = h.wrapping_mul(0xbf58_476d_1ce4_e5b9);
    h ^= h >> 27;
    h = h.wrapping_mul(0x94d0_49bb_1331_11eb);
    h ^ (h >> 31)
}

impl Bloom {
    /// Insert the names of a segment's checked rows, setting `suspect`.
    /// The words are first read with plain loads, which the processor
    /// overlaps, so the atomic updates (each a full barrier) then find
    /// them in cache: one memory wait per segment instead of one per row.
    fn insert_all(&self, outs: &mut [Outcome<'_>]) {
        let mut touch = 0u64;
        for o in outs.iter() {
            if let Outcome::Checked { name, .. } = o {
                let h = name_hash(name);
                touch ^=
                    self.words[(h & self.mask) as usize].load(std::sync::atomic::Ordering::Relaxed);
            }
        }
        std::hint::black_box(touch);
        for o in outs.iter_mut() {
            if let Outcome::Checked { name, suspect, .. } = o {
                *suspect = self.insert(name);
            }
        }
    }

    /// A filter for an input of `bytes` (None: unknown, the largest).
    fn for_input(bytes: Option<u64>) -> Self {
        let shift = match bytes {
            None => BLOOM_MAX_WORDS_LOG2,
            Some(b) => (b / 8)
                .max(1)
                .next_power_of_two()
                .trailing_zeros()
                .clamp(BLOOM_MIN_WORDS_LOG2, BLOOM_MAX_WORDS_LOG2),
        };
        let n = 1usize << shift;
        let mut words = Vec::with_capacity(n);
        words.resize_with(n, || std::sync::atomic::AtomicU64::new(0));
        Bloom {
            words,
            mask: n as u64 - 1,
            shift,
        }
    }
    /// Insert; true if the name may have been seen before.
    fn insert(&self, name: &str) -> bool {
        let h = name_hash(name);
        // The low bits choose the word; the others give the probes.
        let word = &self.words[(h & self.mask) as usize];
        let mut g = (h >> self.shift).wrapping_mul(0xff51_afd7_ed55_8ccd) ^ h;
        let mut mask = 0u64;
        for _ in 0..8 {
            mask |= 1u64 << (g & 63);
            g >>= 6;
        }
        let old = word.fetch_or(mask, std::sync::atomic::Ordering::Relaxed);
        old & mask == mask
    }
}

/// Most suspects kept per file before the confirmation checks every name.
const SUSPECT_CAP: usize = 100_000;

/// A name the Bloom filter flagged: (file index, name, line).
#[derive(Clone, Debug, Serialize)]
pub struct Suspect {
    pub file: usize,
    pub name: String,
    pub line: u64,
}

/// Is `a` dominated by `b` on (mass, depth)?
fn dominated(a: &Candidate, b: &Candidate) -> bool {
    b.mass <= a.mass && b.depth <= a.depth && (b.mass < a.mass || b.depth < a.depth)
}

fn dominated_by(mass: f64, depth: f64, b: &Candidate) -> bool {
    b.mass <= mass && b.depth <= depth && (b.mass < mass || b.depth < depth)
}

/// Scan catalogues against a prepared job. `progress` is called after
/// each chunk with the rows and bytes read so far (over all files). Rows in
/// `exclude` ((file, line)) are skipped as bad. Names the duplicate filter
/// flags are returned as suspects for `confirm_duplicates`.
pub fn scan<R: Read + Send>(
    prep: &Prepared,
    catalogs: Vec<Catalog<R>>,
    mats: &Materials<'_>,
    opts: &ScanOptions,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<Selection> {
    scan_excluding(prep, catalogs, mats, opts, &HashSet::new(), progress)
}

fn near_insert(near: &mut TopList, cand: Candidate) {
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

/// `scan` with rows to leave out.
pub fn scan_excluding<R: Read + Send>(
    prep: &Prepared,
    catalogs: Vec<Catalog<R>>,
    mats: &Materials<'_>,
    opts: &ScanOptions,
    exclude: &HashSet<(usize, u64)>,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<Selection> {
    let mut done_bytes = 0u64;
    let mut lists: Vec<TopList> = opts
        .ranks
        .iter()
        .map(|&(r, n)| TopList::new(r, n))
        .collect();
    let mut near = TopList::new(Rank::Utilisation, opts.near);
    let mut unverified = TopList::new(
        opts.ranks.first().map(|r| r.0).unwrap_or(Rank::Mass),
        opts.unverified,
    );
    let mut pareto: Vec<Candidate> = Vec::new();
    let mut counts = Counts::default();
    let mut errors: Vec<Error> = Vec::new();
    let mut skipped = Vec::new();
    let mut files = Vec::new();
    let mut suspects = Vec::new();
    let mut check_all_names = Vec::new();
    for (fi, cat) in catalogs.into_iter().enumerate() {
        files.push(cat.file.clone());
        let bloom = Bloom::for_input(cat.size_hint);
        let schema = cat.schema.clone();
        let file = cat.file.clone();
        let header_line = cat.header_line;
        let rows_before = counts.rows;
        let mut suspects_in_file = 0usize;
        let delim = cat.delimiter;
        // A reader thread reads the next block (finding where its records
        // end) while this one is parsed and checked, segment by segment, in
        // parallel.
        let read_bytes = std::thread::scope(|sc| -> Result<u64> {
            let (tx, rx) = std::sync::mpsc::sync_channel::<Result<Block>>(2);
            let (back_tx, back_rx) = std::sync::mpsc::channel::<Block>();
            let mut cat = cat;
            cat.set_segment(opts.chunk);
            let reader = sc.spawn(move || -> u64 {
                loop {
                    let mut block = back_rx.try_recv().unwrap_or_default();
                    match cat.next_block(&mut block) {
                        Ok(false) => return cat.offset(),
                        Ok(true) => {
                            if tx.send(Ok(block)).is_err() {
                                return 0;
                            }
                        }
                        Err(e) => {
                            let _ = tx.send(Err(e));
                            return 0;
                        }
                    }
                }
            });
            let mut pool: Vec<Records> = Vec::new();
            for msg in rx {
                let block = msg?;
                let pos = block.end_offset;
                let schema = &schema;
                let mut parsed = map_block(
                    &block,
                    delim,
                    &mut pool,
                    || (),
                    |_, rec| {
                        if !exclude.is_empty() && exclude.contains(&(fi, rec.line())) {
                            return Outcome::Excluded;
                        }
                        match parse_row(schema, &rec, mats) {
                            Err(e) => Outcome::Bad(rec.line(), e.column, e.message),
                            Ok(row) => {
                                if !opts.filters.admits(&row) {
                                    return Outcome::Filtered;
                                }
                                let mat = mats.get(&row.material);
                                let s = prep.check(
                                    SectionInput::new(&row.props, row.mass).with_material(mat),
                                );
                                Outcome::Checked {
                                    name: row.name,
                                    suspect: false,
                                    mass: row.mass,
                                    depth: row.props.depth,
                                    cost: row.cost,
                                    summary: s,
                                }
                            }
                        }
                    },
                );
                parsed
                    .par_iter_mut()
                    .for_each(|(_, outs)| bloom.insert_all(outs));
                for (rec, out) in parsed
                    .into_iter()
                    .flat_map(|(recs, outs)| recs.iter().zip(outs))
                {
                    counts.rows += 1;
                    let line = rec.line();
                    match out {
                        Outcome::Bad(line, col, msg) => {
                            counts.bad += 1;
                            let e = Error::input(
                                Location::in_file(&file)
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
                        Outcome::Excluded => counts.bad += 1,
                        Outcome::Filtered => counts.filtered += 1,
                        Outcome::Checked {
                            name,
                            suspect,
                            mass,
                            depth,
                            cost,
                            summary: s,
                        } => {
                            if suspect && suspects_in_file >= SUSPECT_CAP {
                                if !check_all_names.contains(&fi) {
                                    check_all_names.push(fi);
                                }
                            } else if suspect {
                                suspects_in_file += 1;
                                suspects.push(Suspect {
                                    file: fi,
                                    name: name.to_string(),
                                    line,
                                });
                            }
                            counts.checked += 1;
                            let k = KeyRef {
                                mass,
                                depth,
                                cost,
                                utilisation: s.utilisation,
                                name,
                                file: fi,
                                line,
                            };
                            let materialise = || -> Result<Candidate> {
                                let row = parse_row(schema, &rec, mats)
                                    .map_err(|e| Error::Internal(e.message))?;
                                Ok(to_candidate(prep, mats, &row, &s, fi, line))
                            };
                            if s.passes {
                                counts.passing += 1;
                                let front = opts.pareto
                                    && !pareto.iter().any(|p| dominated_by(k.mass, k.depth, p));
                                // No allocation unless the row is kept.
                                let any = lists.iter().any(|l| l.wants_key(&k));
                                if front || any {
                                    let cand = materialise()?;
                                    if front {
                                        pareto.retain(|p| !dominated(p, &cand));
                                        pareto.push(cand.clone());
                                    }
                                    for l in lists.iter_mut() {
                                        if l.wants_key(&k) {
                                            l.insert(cand.clone());
                                        }
                                    }
                                }
                            } else if s.verdict == Verdict::NotVerified {
                                counts.not_verified += 1;
                                let in_lists = opts.include_unverified
                                    && lists.iter().any(|l| l.wants_key(&k));
                                if in_lists || unverified.wants_key(&k) {
                                    let cand = materialise()?;
                                    if opts.include_unverified {
                                        for l in lists.iter_mut() {
                                            if l.wants_key(&k) {
                                                l.insert(cand.clone());
                                            }
                                        }
                                    }
                                    if unverified.wants_key(&k) {
                                        unverified.insert(cand);
                                    }
                                }
                            } else {
                                counts.failing += 1;
                                let wanted = near.items.len() < near.limit
                                    || near
                                        .items
                                        .last()
                                        .is_some_and(|l| s.utilisation < l.utilisation);
                                if wanted {
                                    near_insert(&mut near, materialise()?);
                                }
                            }
                        }
                    }
                }
                progress(counts.rows, done_bytes + pos);
                let _ = back_tx.send(block);
            }
            // A panic in the reader is an internal error, never the end of
            // the file.
            reader.join().map_err(|_| {
                Error::Internal("the catalogue reader thread stopped unexpectedly".into())
            })
        })?;
        done_bytes += read_bytes;
        if counts.rows == rows_before {
            return Err(Error::input(
                Location::in_file(&file).with_line(header_line + 1),
                "the catalogue has a header but no rows: expected one section per row after the header",
            ));
        }
    }
    // (Excluded rows count as bad, and only come with skip_bad_rows.)
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
    for l in lists.iter_mut() {
        l.finish();
    }
    unverified.finish();
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
        unverified,
        counts,
        skipped,
        files,
        suspects,
        check_all_names,
    })
}

/// Names confirmed to repeat: their errors (at most 1000 listed), their
/// (file, line)s when asked for, and how many there are.
pub(crate) struct Repeats {
    pub errors: Vec<Error>,
    pub lines: HashSet<(usize, u64)>,
    pub total: usize,
}

/// Read each catalogue's flagged names again (`flagged(file)`: the names,
/// and whether every name must be compared) and confirm the repeats among
/// the rows `keep` accepts.
pub(crate) fn find_repeats<R: Read>(
    catalogs: Vec<Catalog<R>>,
    flagged: impl Fn(usize) -> (HashSet<String>, bool),
    keep: impl Fn(&crate::catalog::Schema, &crate::catalog::records::Record<'_>) -> bool + Copy,
    want_lines: bool,
) -> Result<Repeats> {
    let mut rep = Repeats {
        errors: Vec::new(),
        lines: HashSet::new(),
        total: 0,
    };
    for (fi, cat) in catalogs.into_iter().enumerate() {
        let (names, all) = flagged(fi);
        if names.is_empty() && !all {
            continue;
        }
        let file = cat.file.clone();
        let name_col = cat.schema.name_column();
        confirm_duplicates(cat, (!all).then_some(&names), keep, |name, line, first| {
            if want_lines {
                rep.lines.insert((fi, line));
            }
            rep.total += 1;
            if rep.errors.len() < 1000 {
                rep.errors.push(Error::input(
                    Location::in_file(&file)
                        .with_line(line)
                        .with_column(name_col as u64 + 1),
                    format!("duplicate section name '{name}' (first on line {first})"),
                ));
            }
        })?;
    }
    Ok(rep)
}

/// The refusal of a catalogue whose names repeat.
pub(crate) fn refuse_repeats(mut errors: Vec<Error>, total: usize) -> Error {
    if total > errors.len() {
        errors.push(Error::msg(format!("... and {} more", total - errors.len())));
    }
    errors.push(Error::msg(format!(
        "{total} duplicate name(s): the catalogue is refused (fix them, or use --skip-bad-rows to keep only the first of each)"
    )));
    Error::Many(errors)
}

/// Parse a block's segments and map each record, in parallel: one
/// (records, results) pair per segment, in file order. `init` makes the
/// state one segment's records share, in order (see search::spans).
pub(crate) fn map_block<'p, T, S, I, F>(
    block: &Block,
    delim: u8,
    pool: &'p mut Vec<Records>,
    init: I,
    f: F,
) -> Vec<(&'p Records, Vec<T>)>
where
    T: Send + 'p,
    I: Fn() -> S + Sync,
    F: Fn(&mut S, crate::catalog::records::Record<'p>) -> T + Sync,
{
    let nseg = block.segments.len();
    if pool.len() < nseg {
        pool.resize_with(nseg, Records::default);
    }
    pool[..nseg]
        .par_iter_mut()
        .enumerate()
        .map(|(k, recs)| {
            block.parse_segment(k, delim, recs);
            let recs: &'p Records = recs;
            let mut state = init();
            (recs, recs.iter().map(|r| f(&mut state, r)).collect())
        })
        .collect()
}

/// Second reading of one catalogue: `found(name, line, first line)` for
/// every occurrence of a suspect name after its first (true duplicates),
/// exactly, in file order, among the rows `keep` accepts.
pub fn confirm_duplicates<R: Read>(
    mut cat: Catalog<R>,
    names: Option<&HashSet<String>>,
    keep: impl Fn(&crate::catalog::Schema, &crate::catalog::records::Record<'_>) -> bool,
    mut found: impl FnMut(&str, u64, u64),
) -> Result<()> {
    let name_col = cat.schema.name_column();
    let mut first: std::collections::HashMap<String, u64> = std::collections::HashMap::new();
    let mut chunk = Chunk::default();
    loop {
        let n = cat.next_chunk(&mut chunk)?;
        if n == 0 {
            break;
        }
        for rec in chunk.records.iter() {
            let name = std::str::from_utf8(rec.get(name_col).unwrap_or(b""))
                .unwrap_or("")
                .trim();
            // Only rows the scan entered in the filter (valid, and for a
            // scan admitted by the filters) count: a bad row never makes a
            // good one a repeat.
            if names.is_none_or(|n| n.contains(name)) && keep(&cat.schema, &rec) {
                let line = rec.line();
                match first.get(name) {
                    Some(&f) => found(name, line, f),
                    None => {
                        first.insert(name.to_string(), line);
                    }
                }
            }
        }
    }
    Ok(())
}

/// Scan with exact duplicate detection: `open` (re)opens the catalogues;
/// a second reading confirms the names the Bloom filter flagged, and a
/// re-scan without the duplicates follows only when some are real and
/// bad rows are to be skipped.
pub fn scan_checked<R: Read + Send>(
    prep: &Prepared,
    open: &dyn Fn() -> Result<Vec<Catalog<R>>>,
    mats: &Materials<'_>,
    opts: &ScanOptions,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<Selection> {
    let mut sel = scan(prep, open()?, mats, opts, progress)?;
    if sel.suspects.is_empty() && sel.check_all_names.is_empty() {
        return Ok(sel);
    }
    let keep = |schema: &crate::catalog::Schema, rec: &crate::catalog::records::Record<'_>| {
        parse_row(schema, rec, mats).is_ok_and(|r| opts.filters.admits(&r))
    };
    let flagged = |fi: usize| {
        let names: HashSet<String> = sel
            .suspects
            .iter()
            .filter(|s| s.file == fi)
            .map(|s| s.name.clone())
            .collect();
        (names, sel.check_all_names.contains(&fi))
    };
    let rep = find_repeats(open()?, flagged, keep, opts.skip_bad_rows)?;
    let (errors, exclude, dup_total) = (rep.errors, rep.lines, rep.total);
    if errors.is_empty() {
        sel.suspects.clear();
        sel.check_all_names.clear();
        return Ok(sel);
    }
    if !opts.skip_bad_rows {
        return Err(refuse_repeats(errors, dup_total));
    }
    let mut again = scan_excluding(prep, open()?, mats, opts, &exclude, progress)?;
    again.skipped.extend(errors.iter().map(|e| e.to_string()));
    again.skipped.truncate(100);
    again.suspects.clear();
    again.check_all_names.clear();
    Ok(again)
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
    let mut chunk = Chunk::default();
    let none = crate::check::Summary {
        utilisation: f64::NAN,
        governing: None,
        verdict: crate::check::Verdict::NotVerified,
        gaps: crate::check::Gaps::default(),
        passes: false,
    };
    for (fi, mut cat) in catalogs.into_iter().enumerate() {
        let mut names: HashSet<String> = HashSet::new();
        loop {
            let n = cat.next_chunk(&mut chunk)?;
            if n == 0 {
                break;
            }
            for rec in chunk.records.iter() {
                counts.rows += 1;
                let line = rec.line();
                match parse_row(&cat.schema, &rec, mats) {
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
                            rows.push(to_candidate_unchecked(&row, &none, fi, line));
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
