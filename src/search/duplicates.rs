//! Duplicate names: the Bloom filter the scan enters every name in, the
//! repeats it leads to, and their exact confirmation by a second reading
//! where the one reading cannot settle them (see `scan::scan_checked`).

use crate::catalog::read::{Catalog, Chunk};
use crate::error::{Error, Result};
use serde::Serialize;
use std::collections::HashSet;
use std::io::Read;

/// A Bloom filter over section names in 64-bit words, 8 probes inside one
/// word chosen by the name's hash, sized from the input's length: one word
/// per 4 bytes of catalogue (at least 32 KiB, at most 2^21 words = 16 MiB,
/// reached at 8 MB of catalogue, about 150,000 rows; unknown lengths take
/// the most), so memory is flat from there on (benches/README.md). One
/// word per name means one memory access and an atomic `fetch_or`, so the
/// worker threads insert in parallel, and of two equal names the later
/// insert always sees the earlier's bits (no duplicate is missed). A hit
/// only makes a name a suspect: the scan compares it with the names it
/// keeps, and only a reported row flagged with no kept row of its name is
/// confirmed by a second reading (`confirm_duplicates`). Rows of ~54 bytes
/// give about 0.07 names per word below the cap, a false flag per row of
/// about (1 − e^(−8·0.07/64))^8 ≈ 10⁻¹⁶; at the cap with n names,
/// (1 − e^(−8n/2²⁷))^8: 2·10⁻¹⁰ at 1 M rows, 2·10⁻³ at 10 M (about 24,000
/// flagged rows, each only compared with the kept names; a reported row is
/// flagged falsely with that chance, which then costs the second reading).
pub(super) struct Bloom {
    words: Vec<std::sync::atomic::AtomicU64>,
    /// Words − 1 (a power of two less one).
    mask: u64,
    /// log2 of the words: the hash bits above it give the probes.
    shift: u32,
}

const BLOOM_MAX_WORDS_LOG2: u32 = 21;
const BLOOM_MIN_WORDS_LOG2: u32 = 12;

/// A fast 64-bit hash of a name, eight bytes at a time (multiply–xorshift
/// rounds, splitmix64 finish). Not for adversarial input: a collision only
/// costs a confirmation read.
fn name_hash(s: &str) -> u64 {
    name_hash_bytes(s.as_bytes())
}

/// [`name_hash`] of bytes.
fn name_hash_bytes(b: &[u8]) -> u64 {
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

/// Ask the processor to bring `word`'s cache line in without waiting for
/// it. A hint only: it changes no value, and elsewhere than x86-64 it is
/// nothing.
#[inline(always)]
fn prefetch(word: &std::sync::atomic::AtomicU64) {
    #[cfg(target_arch = "x86_64")]
    #[allow(unsafe_code)]
    // SAFETY: `_mm_prefetch` (SSE, part of every x86-64 processor) only
    // hints the cache; it never faults, even on an invalid address, and
    // reads nothing into the program. The address is a live reference's.
    unsafe {
        std::arch::x86_64::_mm_prefetch::<{ std::arch::x86_64::_MM_HINT_T0 }>(
            (word as *const std::sync::atomic::AtomicU64).cast::<i8>(),
        );
    }
    #[cfg(not(target_arch = "x86_64"))]
    let _ = word;
}

impl Bloom {
    /// The hash of a name's cell as read (ASCII spaces trimmed), and the
    /// trimmed length. The cell is the schema's one name column, so the
    /// hash is of the row's name whenever the lengths agree
    /// (`insert_touched`). A scan's worker hashes, and its merge inserts
    /// in file order, prefetching the words of the rows a little ahead
    /// (`scan::MERGE_AHEAD`).
    pub(super) fn cell_hash(cell: &[u8]) -> (u64, usize) {
        let cell = cell.trim_ascii();
        (name_hash_bytes(cell), cell.len())
    }

    /// [`Bloom::cell_hash`] with the name's word prefetched: called before
    /// a sweep's worker parses and checks the row, so the memory access
    /// overlaps that work and its insert then finds the word in cache. (A
    /// plain load instead measured slower than inserting a segment's names
    /// in one batch, as the processor waits for it; the prefetch, which it
    /// does not wait for, took one scan worker on 1 M rows from 0.52–0.55 s
    /// to 0.48–0.52 s: benches/README.md.)
    pub(super) fn touch(&self, cell: &[u8]) -> (u64, usize) {
        let hashed = Self::cell_hash(cell);
        self.prefetch_hash(hashed.0);
        hashed
    }

    /// Prefetch the word of a name hashed by [`Bloom::cell_hash`].
    #[inline]
    pub(super) fn prefetch_hash(&self, h: u64) {
        prefetch(&self.words[(h & self.mask) as usize]);
    }

    /// Insert `name` given the result of [`Bloom::cell_hash`] on its cell:
    /// the hash is reused when the trimmed cell is the name. The name is
    /// the cell trimmed of Unicode white space (`str::trim`), which takes
    /// off at least the ASCII white space `touch` trims, so the name is a
    /// part of the trimmed cell, and equal lengths mean equal text. True if
    /// the name may have been seen before.
    pub(super) fn insert_touched(&self, name: &str, touched: (u64, usize)) -> bool {
        if touched.1 == name.len() {
            self.insert_hashed(touched.0)
        } else {
            self.insert(name)
        }
    }

    /// A filter for an input of `bytes` (None: unknown, the largest).
    pub(super) fn for_input(bytes: Option<u64>) -> Self {
        let shift = match bytes {
            None => BLOOM_MAX_WORDS_LOG2,
            Some(b) => (b / 4)
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
    pub(super) fn insert(&self, name: &str) -> bool {
        self.insert_hashed(name_hash(name))
    }

    /// Insert a name by its [`name_hash`].
    fn insert_hashed(&self, h: u64) -> bool {
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

/// Most suspects or repeats held (sweeps: per file) before the confirmation
/// checks every name (sweeps) or every reported name (scans).
pub(super) const SUSPECT_CAP: usize = 100_000;

/// Most readings of a scan or sweep with --skip-bad-rows and repeated
/// names (each round leaves out the repeats found among the rows reported).
pub(super) const MAX_ROUNDS: usize = 6;

/// A name that repeats: (file index, name, its first line, this line).
#[derive(Clone, Debug, Serialize)]
pub struct Repeat {
    pub file: usize,
    pub name: String,
    pub first: u64,
    pub line: u64,
}

/// A name the Bloom filter flagged: (file index, name, line).
#[derive(Clone, Debug, Serialize)]
pub struct Suspect {
    pub file: usize,
    pub name: String,
    pub line: u64,
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
    repeats_of(catalogs, flagged, keep, |place, r| {
        if want_lines {
            rep.lines.insert((r.file, r.line));
        }
        rep.total += 1;
        if rep.errors.len() < 1000 {
            rep.errors.push(repeat_error(place, &r));
        }
    })?;
    Ok(rep)
}

/// Read each catalogue's flagged names again and hand every repeat (its
/// file's place and name column, and the repeat) to `found`, in file
/// order.
pub(crate) fn repeats_of<R: Read>(
    catalogs: Vec<Catalog<R>>,
    flagged: impl Fn(usize) -> (HashSet<String>, bool),
    keep: impl Fn(&crate::catalog::Schema, &crate::catalog::records::Record<'_>) -> bool + Copy,
    mut found: impl FnMut(&(crate::error::Location, usize), Repeat),
) -> Result<()> {
    for (fi, cat) in catalogs.into_iter().enumerate() {
        let (names, all) = flagged(fi);
        if names.is_empty() && !all {
            continue;
        }
        let place = (cat.at.clone(), cat.schema.name_column());
        confirm_duplicates(cat, (!all).then_some(&names), keep, |name, line, first| {
            found(
                &place,
                Repeat {
                    file: fi,
                    name: name.to_string(),
                    first,
                    line,
                },
            )
        })?;
    }
    Ok(())
}

/// The error of a repeated name at its line, naming the first.
pub(crate) fn repeat_error(place: &(crate::error::Location, usize), r: &Repeat) -> Error {
    let (at, name_col) = place;
    Error::input(
        at.clone()
            .with_line(r.line)
            .with_column(*name_col as u64 + 1),
        format!(
            "duplicate section name '{}' (first on {})",
            r.name,
            at.line_text(r.first)
        ),
    )
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
