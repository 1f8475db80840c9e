//! The scan pipeline: a reader thread hands blocks of records to the
//! workers, which parse, filter and check each row in parallel
//! (`check_record`); the outcomes are merged in file order, one block
//! behind the parsing, into what the scan keeps (`Kept`), then finished
//! into a `Selection`. Also the scan with exact duplicate detection
//! (`scan_checked`).

use super::duplicates::{
    Bloom, MAX_ROUNDS, Repeat, SUSPECT_CAP, Suspect, refuse_repeats, repeat_error,
};
use super::rank::{KeyRef, compare, dominated, dominated_by, near_insert};
use super::{Candidate, Counts, Rank, ScanOptions, Selection, TopList, to_candidate};
use crate::catalog::read::Catalog;
use crate::catalog::records::{Block, Record, Records};
use crate::catalog::{Materials, Row, Schema, parse_row, parse_row_into};
use crate::check::{Prepared, SectionInput, Summary, Verdict};
use crate::error::{Error, Location, Result};
use rayon::prelude::*;
use std::collections::{HashMap, HashSet};
use std::io::Read;
use std::sync::mpsc::{Receiver, SyncSender};

/// What the parallel phase hands to the merge: small, so moving a chunk
/// of them is cheap, and owning nothing of the records, so a block's
/// outcomes can be merged while the next block is parsed. A row that
/// enters a list is parsed again to build its candidate (rare after the
/// first blocks), and the merge reads a checked row's name from its
/// record.
pub(super) enum Outcome {
    Bad(u64, usize, String),
    Filtered,
    Excluded,
    Checked {
        /// The name's hash for the duplicate filter (`Bloom::cell_hash`): the
        /// merge enters it, in file order, so which rows the filter flags
        /// is the same on every run.
        touched: (u64, usize),
        mass: f64,
        depth: f64,
        cost: Option<f64>,
        summary: Summary,
    },
}

/// Scan catalogues against a prepared job. `progress` is called after
/// each block is merged (one block behind the reading, possibly from a
/// worker thread of the pool) with the rows and bytes read so far (over
/// all files). Rows in `exclude` ((file, line)) are skipped as bad.
/// Repeats of the reported names found in the reading, and reported rows
/// in doubt, are returned for `scan_checked`.
pub fn scan<R: Read + Send>(
    prep: &Prepared,
    catalogs: Vec<Catalog<R>>,
    mats: &Materials<'_>,
    opts: &ScanOptions,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<Selection> {
    scan_excluding(prep, catalogs, mats, opts, &HashSet::new(), progress)
}

/// What every row of a scan is checked against.
struct ScanJob<'a> {
    prep: &'a Prepared,
    mats: &'a Materials<'a>,
    opts: &'a ScanOptions,
    exclude: &'a HashSet<(usize, u64)>,
}

/// `scan` with rows to leave out: each catalogue in turn (`scan_file`),
/// then what was kept is finished (`Kept::finish`).
pub fn scan_excluding<R: Read + Send>(
    prep: &Prepared,
    catalogs: Vec<Catalog<R>>,
    mats: &Materials<'_>,
    opts: &ScanOptions,
    exclude: &HashSet<(usize, u64)>,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<Selection> {
    let job = ScanJob {
        prep,
        mats,
        opts,
        exclude,
    };
    let mut kept = Kept::new(opts);
    let mut done_bytes = 0u64;
    for (fi, cat) in catalogs.into_iter().enumerate() {
        done_bytes += scan_file(&job, fi, cat, &mut kept, done_bytes, progress)?;
    }
    kept.finish(opts)
}

/// One catalogue of a scan: a reader thread reads ahead (finding where
/// the records end) while a block is parsed and checked, segment by
/// segment, in parallel (the names enter the duplicate filter), and the
/// block before it is merged in file order. Returns the bytes read.
fn scan_file<R: Read + Send>(
    job: &ScanJob<'_>,
    fi: usize,
    cat: Catalog<R>,
    kept: &mut Kept,
    done_bytes: u64,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<u64> {
    kept.files.push(cat.file.clone());
    kept.places.push((cat.at.clone(), cat.schema.name_column()));
    kept.names.push(HashMap::new());
    let bloom = Bloom::for_input(cat.size_hint);
    let schema = cat.schema.clone();
    let at = cat.at.clone();
    let header_line = cat.header_line;
    let rows_before = kept.counts.rows;
    let delim = cat.delimiter;
    let mut place = FilePlace {
        fi,
        at: &at,
        schema: &schema,
        bloom: &bloom,
    };
    let read_bytes = std::thread::scope(|sc| -> Result<u64> {
        let (tx, rx) = std::sync::mpsc::sync_channel::<Result<Block>>(2);
        let (back_tx, back_rx) = std::sync::mpsc::channel::<Block>();
        let mut cat = cat;
        cat.set_segment(job.opts.chunk);
        let reader = sc.spawn(move || read_blocks(cat, tx, back_rx));
        // Block k is merged (in file order, on one worker) while block
        // k + 1 is parsed and checked (on the others, which then take
        // over the merging worker's share): the merge is off the
        // critical path. With one worker the two run one after the other.
        let mut blocks = rx.into_iter();
        let mut pending: Option<Parsed> = None;
        let mut spare: Vec<Vec<Records>> = Vec::new();
        let run = (|| -> Result<()> {
            loop {
                let next = blocks.next().transpose()?;
                if next.is_none() && pending.is_none() {
                    return Ok(());
                }
                let pool = spare.pop().unwrap_or_default();
                let schema = &schema;
                let back_tx = &back_tx;
                let parse = move || {
                    next.map(|block| {
                        let mut pool = pool;
                        let outs: Vec<Vec<Outcome>> =
                            map_block(&block, delim, &mut pool, Row::slot, |row, rec| {
                                check_record(job, fi, schema, row, rec)
                            })
                            .into_iter()
                            .map(|(_, outs)| outs)
                            .collect();
                        let pos = block.end_offset;
                        let _ = back_tx.send(block);
                        Parsed { pool, outs, pos }
                    })
                };
                let done = pending.take();
                let merge = || -> Result<Option<Vec<Records>>> {
                    let Some(p) = done else { return Ok(None) };
                    for (recs, mut outs) in p.pool.iter().zip(p.outs) {
                        // The filter words of the rows a little ahead are
                        // fetched while these are merged.
                        for o in outs.iter().take(MERGE_AHEAD) {
                            o.prefetch(place.bloom);
                        }
                        for (k, rec) in recs.iter().enumerate().take(outs.len()) {
                            if let Some(o) = outs.get(k + MERGE_AHEAD) {
                                o.prefetch(place.bloom);
                            }
                            let out = std::mem::replace(&mut outs[k], Outcome::Filtered);
                            kept.merge(job, &mut place, rec, out)?;
                        }
                    }
                    progress(kept.counts.rows, done_bytes + p.pos);
                    Ok(Some(p.pool))
                };
                let (parsed, merged) = rayon::join(parse, merge);
                if let Some(pool) = merged? {
                    spare.push(pool);
                }
                pending = parsed;
            }
        })();
        // The reader is joined on every path: the receiver goes first, so
        // a reader waiting to send stops. A panic in the reader is an
        // internal error, never the end of the file.
        drop(blocks);
        let joined = reader.join().map_err(|_| {
            Error::Internal("the catalogue reader thread stopped unexpectedly".into())
        });
        run?;
        joined
    })?;
    if kept.counts.rows == rows_before {
        return Err(Error::input(
            at.clone().with_line(header_line + 1),
            "the catalogue has a header but no rows: expected one section per row after the header",
        ));
    }
    Ok(read_bytes)
}

/// How many rows ahead the merge prefetches the duplicate filter's words.
const MERGE_AHEAD: usize = 16;

impl Outcome {
    /// Prefetch a checked row's word of the duplicate filter.
    #[inline]
    fn prefetch(&self, bloom: &Bloom) {
        if let Outcome::Checked { touched, .. } = self {
            bloom.prefetch_hash(touched.0);
        }
    }
}

/// A block parsed and checked, waiting for its merge: its records (by
/// segment), their outcomes, and the input offset after it.
struct Parsed {
    pool: Vec<Records>,
    outs: Vec<Vec<Outcome>>,
    pos: u64,
}

/// The reader thread: read blocks into the ones sent back (or new ones)
/// and send them on. Returns the offset at the end of the file, or 0 when
/// the receiver has gone or reading failed (the error is sent).
fn read_blocks<R: Read>(
    mut cat: Catalog<R>,
    tx: SyncSender<Result<Block>>,
    back_rx: Receiver<Block>,
) -> u64 {
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
}

/// The parallel phase for one record: left out, bad, filtered, or checked.
/// The name is hashed for the duplicate filter (the merge enters it).
fn check_record<'r>(
    job: &ScanJob<'_>,
    fi: usize,
    schema: &Schema,
    row: &mut Row<'r>,
    rec: Record<'r>,
) -> Outcome {
    if !job.exclude.is_empty() && job.exclude.contains(&(fi, rec.line())) {
        return Outcome::Excluded;
    }
    let touched = Bloom::cell_hash(rec.get(schema.name_column()).unwrap_or(b""));
    match parse_row_into(schema, &rec, job.mats, row) {
        Err(e) => Outcome::Bad(rec.line(), e.column, e.message),
        Ok(()) => {
            if !job.opts.filters.admits(row) {
                return Outcome::Filtered;
            }
            let mat = job.mats.get(&row.material);
            let s = job
                .prep
                .check(SectionInput::new(&row.props, row.mass).with_material(mat));
            Outcome::Checked {
                touched,
                mass: row.mass,
                depth: row.props.depth,
                cost: row.cost,
                summary: s,
            }
        }
    }
}

/// The catalogue being merged: its index, name and schema, and its
/// duplicate filter.
struct FilePlace<'a> {
    fi: usize,
    at: &'a Location,
    schema: &'a Schema,
    bloom: &'a Bloom,
}

/// What the scan keeps while it reads (see `Selection`).
struct Kept {
    lists: Vec<TopList>,
    near: TopList,
    unverified: TopList,
    pareto: Vec<Candidate>,
    counts: Counts,
    errors: Vec<Error>,
    skipped: Vec<String>,
    files: Vec<String>,
    /// Each file's place and name column (for the repeats' errors).
    places: Vec<(Location, usize)>,
    /// By file, the names of the rows kept so far with the line of the
    /// first: every row that will be reported is among them (a row that
    /// leaves the lists never returns), so a later row of the same name is
    /// a repeat found in this reading. Rebuilt from the lists when it
    /// outgrows them, which keeps it the size of what is kept.
    names: Vec<HashMap<Box<str>, u64>>,
    /// Repeats of a kept row's name (cut to the reported rows at the end).
    repeats: Vec<Repeat>,
    /// Kept rows the filter flagged that no kept row explains.
    doubt: Vec<Suspect>,
    /// More repeats or doubts than are held: every reported name is then
    /// confirmed by a second reading.
    overflow: bool,
}

impl Kept {
    fn new(opts: &ScanOptions) -> Kept {
        Kept {
            lists: opts
                .ranks
                .iter()
                .map(|&(r, n)| TopList::new(r, n))
                .collect(),
            near: TopList::new(Rank::Utilisation, opts.near),
            unverified: TopList::new(
                opts.ranks.first().map(|r| r.0).unwrap_or(Rank::Mass),
                opts.unverified,
            ),
            pareto: Vec::new(),
            counts: Counts::default(),
            errors: Vec::new(),
            skipped: Vec::new(),
            files: Vec::new(),
            places: Vec::new(),
            names: Vec::new(),
            repeats: Vec::new(),
            doubt: Vec::new(),
            overflow: false,
        }
    }

    /// Merge one record's outcome, in file order.
    fn merge(
        &mut self,
        job: &ScanJob<'_>,
        place: &mut FilePlace<'_>,
        rec: Record<'_>,
        out: Outcome,
    ) -> Result<()> {
        self.counts.rows += 1;
        let line = rec.line();
        match out {
            Outcome::Bad(line, col, msg) => self.bad_row(place.at, line, col, msg),
            Outcome::Excluded => self.counts.bad += 1,
            Outcome::Filtered => self.counts.filtered += 1,
            Outcome::Checked {
                touched,
                mass,
                depth,
                cost,
                summary: s,
            } => {
                // The name as `parse_row` read it (a checked row's name
                // cell is UTF-8).
                let name = std::str::from_utf8(rec.get(place.schema.name_column()).unwrap_or(b""))
                    .map(str::trim)
                    .map_err(|_| Error::Internal("a checked row's name is not UTF-8".into()))?;
                let suspect = place.bloom.insert_touched(name, touched);
                // A flagged name is a repeat of a kept row's (exact),
                // or, if this row is kept, in doubt.
                let mut doubtful = false;
                if suspect {
                    self.counts.flagged += 1;
                    match self.names[place.fi].get(name) {
                        Some(&first) => self.repeat(place.fi, name, first, line),
                        None => doubtful = true,
                    }
                }
                self.counts.checked += 1;
                self.counts.priced += u64::from(cost.is_some());
                let k = KeyRef {
                    mass,
                    depth,
                    cost,
                    utilisation: s.utilisation,
                    name,
                    file: place.fi,
                    line,
                };
                let kept = std::cell::Cell::new(false);
                let materialise = || -> Result<Candidate> {
                    kept.set(true);
                    let row = parse_row(place.schema, &rec, job.mats)
                        .map_err(|e| Error::Internal(e.message))?;
                    Ok(to_candidate(job.prep, job.mats, &row, &s, place.fi, line))
                };
                self.keep_checked(job.opts, &k, s.verdict, materialise)?;
                if kept.get() {
                    self.kept_name(place.fi, name, line, doubtful);
                }
            }
        }
        Ok(())
    }

    /// A row that could not be read: counted, and listed (up to a limit).
    fn bad_row(&mut self, at: &Location, line: u64, col: usize, msg: String) {
        self.counts.bad += 1;
        let e = Error::input(at.clone().with_line(line).with_column(col as u64), msg);
        if self.skipped.len() < 100 {
            self.skipped.push(e.to_string());
        }
        if self.errors.len() < 1000 {
            self.errors.push(e);
        }
    }

    /// A repeat of a kept row's name, held up to `SUSPECT_CAP`.
    fn repeat(&mut self, file: usize, name: &str, first: u64, line: u64) {
        if self.repeats.len() >= SUSPECT_CAP {
            self.overflow = true;
        } else {
            self.repeats.push(Repeat {
                file,
                name: name.to_string(),
                first,
                line,
            });
        }
    }

    /// A row that entered a list: its name among the kept names (and in
    /// doubt when the filter flagged it and no kept row explains it).
    fn kept_name(&mut self, file: usize, name: &str, line: u64, doubtful: bool) {
        if doubtful {
            if self.doubt.len() >= SUSPECT_CAP {
                self.overflow = true;
            } else {
                self.doubt.push(Suspect {
                    file,
                    name: name.to_string(),
                    line,
                });
            }
        }
        self.names[file].entry(name.into()).or_insert(line);
        let held: usize = self.lists.iter().map(|l| l.items.len()).sum::<usize>()
            + self.near.items.len()
            + self.unverified.items.len()
            + self.pareto.len();
        if self.names[file].len() > 4 * held + 4096 {
            let mut names: HashMap<Box<str>, u64> = HashMap::new();
            for c in self.all_kept().filter(|c| c.file == file) {
                let e = names.entry(c.name.as_str().into()).or_insert(c.line);
                *e = (*e).min(c.line);
            }
            self.names[file] = names;
        }
    }

    /// Every candidate held in a list, on the front or apart.
    fn all_kept(&self) -> impl Iterator<Item = &Candidate> {
        self.lists
            .iter()
            .flat_map(|l| l.items.iter())
            .chain(self.near.items.iter())
            .chain(self.unverified.items.iter())
            .chain(self.pareto.iter())
    }

    /// Keep a checked row where a list wants it: a passing row in the
    /// rankings and on the front, a not-verified one apart (and ranked
    /// with `include_unverified`), a failing one among the nearest misses.
    /// No allocation unless the row is kept.
    fn keep_checked(
        &mut self,
        opts: &ScanOptions,
        k: &KeyRef<'_>,
        verdict: Verdict,
        materialise: impl Fn() -> Result<Candidate>,
    ) -> Result<()> {
        if verdict == Verdict::Passes {
            self.counts.passing += 1;
            let front =
                opts.pareto && !self.pareto.iter().any(|p| dominated_by(k.mass, k.depth, p));
            let any = self.lists.iter().any(|l| l.wants_key(k));
            if front || any {
                let cand = materialise()?;
                if front {
                    self.pareto.retain(|p| !dominated(p, &cand));
                    self.pareto.push(cand.clone());
                }
                for l in self.lists.iter_mut() {
                    if l.wants_key(k) {
                        l.insert(cand.clone());
                    }
                }
            }
        } else if verdict == Verdict::NotVerified {
            self.counts.not_verified += 1;
            let in_lists = opts.include_unverified && self.lists.iter().any(|l| l.wants_key(k));
            if in_lists || self.unverified.wants_key(k) {
                let cand = materialise()?;
                if opts.include_unverified {
                    for l in self.lists.iter_mut() {
                        if l.wants_key(k) {
                            l.insert(cand.clone());
                        }
                    }
                }
                if self.unverified.wants_key(k) {
                    self.unverified.insert(cand);
                }
            }
        } else {
            self.counts.failing += 1;
            let wanted = self.near.items.len() < self.near.limit
                || self
                    .near
                    .items
                    .last()
                    .is_some_and(|l| k.utilisation < l.utilisation);
            if wanted {
                near_insert(&mut self.near, materialise()?);
            }
        }
        Ok(())
    }

    /// The selection: refused if rows were bad (unless they are to be
    /// skipped), the lists sorted and cut, the front marked.
    fn finish(mut self, opts: &ScanOptions) -> Result<Selection> {
        // (Excluded rows count as bad, and only come with skip_bad_rows.)
        if self.counts.bad > 0 && !opts.skip_bad_rows {
            let total = self.counts.bad;
            let mut errs = self.errors;
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
        for l in self.lists.iter_mut() {
            l.finish();
        }
        self.unverified.finish();
        self.pareto.sort_by(|a, b| compare(Rank::Mass, a, b));
        let on_front: HashSet<(usize, u64)> =
            self.pareto.iter().map(|c| (c.file, c.line)).collect();
        for l in self.lists.iter_mut() {
            for c in l.items.iter_mut() {
                c.pareto = on_front.contains(&(c.file, c.line));
            }
        }
        for c in self.pareto.iter_mut() {
            c.pareto = true;
        }
        // Repeats and doubts of the names reported; the others are counted
        // only (`flagged`). Every later row of a reported name is among
        // `repeats` unless the name is in doubt: such a row was missed
        // only while no row of its name was kept, and the next row of the
        // name to be kept (the reported one at the latest) then found no
        // kept name though the filter had seen it.
        let reported: HashSet<(usize, &str)> =
            self.all_kept().map(|c| (c.file, c.name.as_str())).collect();
        let repeats: Vec<Repeat> = self
            .repeats
            .iter()
            .filter(|r| reported.contains(&(r.file, r.name.as_str())))
            .cloned()
            .collect();
        let doubt: Vec<Suspect> = self
            .doubt
            .iter()
            .filter(|d| reported.contains(&(d.file, d.name.as_str())))
            .cloned()
            .collect();
        drop(reported);
        (self.repeats, self.doubt) = (repeats, doubt);
        if self.overflow {
            // Confirm every reported name by a second reading.
            self.doubt = self
                .all_kept()
                .map(|c| Suspect {
                    file: c.file,
                    name: c.name.clone(),
                    line: c.line,
                })
                .collect();
            self.repeats.clear();
        }
        Ok(Selection {
            lists: self.lists,
            pareto: self.pareto,
            near_misses: self.near,
            unverified: self.unverified,
            counts: self.counts,
            skipped: self.skipped,
            files: self.files,
            places: self.places,
            repeats: self.repeats,
            doubt: self.doubt,
        })
    }
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

/// Scan with exact duplicate detection among the reported rows: `open`
/// (re)opens the catalogues. The one reading finds a repeat of a kept
/// row's name; a second reading, of the names in doubt only, happens when
/// a reported row was flagged with no kept row of its name; a re-scan
/// without the repeats follows only when bad rows are to be skipped.
pub fn scan_checked<R: Read + Send>(
    prep: &Prepared,
    open: &dyn Fn() -> Result<Vec<Catalog<R>>>,
    mats: &Materials<'_>,
    opts: &ScanOptions,
    progress: &(dyn Fn(u64, u64) + Sync),
) -> Result<Selection> {
    let keep = |schema: &crate::catalog::Schema, rec: &crate::catalog::records::Record<'_>| {
        parse_row(schema, rec, mats).is_ok_and(|r| opts.filters.admits(&r))
    };
    // The later line of every repeat found so far, its error (the first
    // 1000) and their number.
    let mut exclude: HashSet<(usize, u64)> = HashSet::new();
    let mut errors: Vec<Error> = Vec::new();
    let mut total = 0usize;
    let mut sel = scan(prep, open()?, mats, opts, progress)?;
    // Each round finds the repeats among the reported rows; skipping them
    // (--skip-bad-rows) can bring rows into the lists whose names repeat
    // an earlier unreported row, hence the rounds (each a reading).
    for _ in 0..MAX_ROUNDS {
        let before = total;
        let mut add = |place: &(Location, usize), r: &Repeat| {
            if exclude.insert((r.file, r.line)) {
                total += 1;
                if errors.len() < 1000 {
                    errors.push(repeat_error(place, r));
                }
            }
        };
        for r in &sel.repeats {
            add(&sel.places[r.file], r);
        }
        if !sel.doubt.is_empty() {
            // The one case of a second reading: a reported row the filter
            // flagged that no kept row explains (a repeat of an earlier,
            // unreported row, or a false hit of the filter).
            let flagged = |fi: usize| {
                let names: HashSet<String> = sel
                    .doubt
                    .iter()
                    .filter(|s| s.file == fi)
                    .map(|s| s.name.clone())
                    .collect();
                (names, false)
            };
            super::duplicates::repeats_of(open()?, flagged, keep, |p, r| add(p, &r))?;
        }
        sel.repeats.clear();
        sel.doubt.clear();
        if total == 0 {
            return Ok(sel);
        }
        if !opts.skip_bad_rows {
            return Err(refuse_repeats(errors, total));
        }
        if total == before {
            // Nothing new among the rows now reported.
            sel.skipped.extend(errors.iter().map(|e| e.to_string()));
            sel.skipped.truncate(100);
            return Ok(sel);
        }
        sel = scan_excluding(prep, open()?, mats, opts, &exclude, progress)?;
    }
    Err(Error::msg(format!(
        "{total} duplicate name(s): after skipping them {MAX_ROUNDS} times, rows whose names repeat still enter the lists; fix the names (`beamsift catalog validate` lists every repeat)"
    )))
}

/// A worker count for the scans, checked: more workers than cores only
/// add memory and switching, so at most four per core (and 256).
pub fn check_workers(n: usize, cores: usize) -> Result<()> {
    let max = (4 * cores).min(256);
    if n == 0 || n > max {
        return Err(Error::msg(format!(
            "--jobs {n}: expected 1 to {max} (four per core on this machine)"
        )));
    }
    Ok(())
}
