//! The lightest passing row at each of several spans in one reading of the
//! catalogues, in select's memory: rows are parsed and checked in parallel
//! block by block, and a row is checked at a span only while it is lighter
//! than the best found there so far (the best of the earlier blocks, and of
//! the earlier rows of its own segment); only passes and not-verified
//! outcomes are kept for the merge. Both prunings are exact, so the result
//! depends on neither the thread count nor the block size. The answer equals
//! sorting every row lightest first and taking each span's first pass
//! (`sweep::lightest`; tests/sweep.rs compares the two).

use super::{
    Bloom, Counts, Filters, MAX_ROUNDS, find_repeats, map_block, refuse_repeats,
    to_candidate_unchecked,
};
use crate::catalog::read::Catalog;
use crate::catalog::records::{Block, Records};
use crate::catalog::{Materials, parse_row};
use crate::check::{CheckKind, Prepared, SectionInput, Summary, Verdict};
use crate::error::{Error, Result};
use std::cmp::Ordering;
use std::collections::HashSet;
use std::io::Read;

/// The result at one span.
#[derive(Clone, Debug, serde::Serialize)]
pub struct SpanBest {
    /// The lightest passing row (mass order: mass, depth, name, file, line).
    pub best: Option<super::Candidate>,
    pub utilisation: Option<f64>,
    pub governing: Option<CheckKind>,
    /// Not-verified rows lighter than the best (all of them when none
    /// passes): never taken as passing.
    pub lighter_not_verified: u64,
    /// The reasons of the lightest of them.
    pub not_verified_reasons: Vec<String>,
}

/// What `lightest_by_span` finds.
pub struct Lightest {
    /// One per prepared span, in order.
    pub spans: Vec<SpanBest>,
    pub counts: Counts,
    /// One row per section form and material kind met (what the "not
    /// checked" list depends on).
    pub samples: Vec<super::Candidate>,
}

/// The mass order of rows.
#[derive(Clone, Debug, PartialEq)]
struct Key {
    mass: f64,
    depth: f64,
    name: String,
    file: usize,
    line: u64,
}

/// A row's place in the mass order, borrowed from its record.
type RowKey<'a> = (f64, f64, &'a str, usize, u64);

fn cmp_keys(a: RowKey<'_>, b: RowKey<'_>) -> Ordering {
    a.0.total_cmp(&b.0)
        .then(a.1.total_cmp(&b.1))
        .then_with(|| a.2.cmp(b.2))
        .then(a.3.cmp(&b.3))
        .then(a.4.cmp(&b.4))
}

fn cmp(a: RowKey<'_>, b: &Key) -> Ordering {
    cmp_keys(a, (b.mass, b.depth, &b.name, b.file, b.line))
}

#[derive(Default)]
struct State {
    best: Option<(Key, super::Candidate, Summary)>,
    /// Not-verified rows lighter than `best`.
    lighter_nv: Vec<Key>,
    /// The lightest not-verified row and its reasons.
    lightest_nv: Option<(Key, Vec<String>)>,
}

enum RowOut<'r> {
    Bad(u64, usize, String),
    /// Left out by the filters (its name still counts for repeats).
    Filtered {
        name: &'r str,
        suspect: bool,
    },
    Excluded,
    Checked {
        /// What decides the "not checked" list: the section's form and
        /// the material's kind.
        kind: Kind,
        name: &'r str,
        mass: f64,
        depth: f64,
        suspect: bool,
        /// (span index, summary) where the row was checked.
        at: Vec<(usize, Summary)>,
    },
}

/// What one pass gives.
struct Pass {
    states: Vec<State>,
    counts: Counts,
    /// The bad rows' errors (at most 1000).
    errors: Vec<Error>,
    /// Names the duplicate filter flagged: (file, name).
    suspects: Vec<(usize, String)>,
    /// One checked row per (form, material kind), for the "not checked"
    /// list (which depends on nothing else).
    samples: Vec<(Kind, super::Candidate)>,
}

type Kind = (
    std::mem::Discriminant<crate::section::Form>,
    crate::check::MaterialKind,
);

/// One pass; rows in `exclude` ((file, line)) count as bad.
fn pass<R: Read + Send>(
    preps: &[Prepared],
    catalogs: Vec<Catalog<R>>,
    mats: &Materials<'_>,
    filters: &Filters,
    exclude: &HashSet<(usize, u64)>,
) -> Result<Pass> {
    let mut states: Vec<State> = (0..preps.len()).map(|_| State::default()).collect();
    let mut counts = Counts::default();
    let mut errors = Vec::new();
    let mut suspects = Vec::new();
    let mut samples: Vec<(Kind, super::Candidate)> = Vec::new();
    for (fi, mut cat) in catalogs.into_iter().enumerate() {
        let bloom = Bloom::for_input(cat.size_hint);
        let at = cat.at.clone();
        let schema = cat.schema.clone();
        let delim = cat.delimiter;
        let rows_before = counts.rows;
        let mut block = Block::default();
        let mut pool: Vec<Records> = Vec::new();
        while cat.next_block(&mut block)? {
            // Each span's best so far: a row at least as heavy cannot win.
            let bound: Vec<Option<Key>> = states
                .iter()
                .map(|s| s.best.as_ref().map(|b| b.0.clone()))
                .collect();
            let nspans = preps.len();
            // Per segment, in order: the lightest pass found so far at
            // each span, so a heavier row there is not checked either.
            let init = || -> Vec<Option<RowKey<'_>>> { vec![None; nspans] };
            let parsed = map_block(&block, delim, &mut pool, init, |local, rec| {
                let line = rec.line();
                if !exclude.is_empty() && exclude.contains(&(fi, line)) {
                    return RowOut::Excluded;
                }
                // The filter's word is fetched while the row is parsed.
                let touched = bloom.touch(rec.get(schema.name_column()).unwrap_or(b""));
                let row = match parse_row(&schema, &rec, mats) {
                    Ok(r) => r,
                    Err(e) => return RowOut::Bad(line, e.column, e.message),
                };
                // Repeats count before the filters, as in `load_rows`.
                let suspect = bloom.insert_touched(row.name, touched);
                if !filters.admits(&row) {
                    return RowOut::Filtered {
                        name: row.name,
                        suspect,
                    };
                }
                let key = (row.mass, row.props.depth, row.name, fi, line);
                let mat = mats.get(&row.material);
                // Only passes and not-verified rows matter to the merge: a
                // failing row is kept out (memory stays small at any span
                // count).
                let mut at = Vec::new();
                for (k, p) in preps.iter().enumerate() {
                    let lighter = bound[k]
                        .as_ref()
                        .is_none_or(|b| cmp(key, b) == Ordering::Less)
                        && local[k].is_none_or(|b| cmp_keys(key, b) == Ordering::Less);
                    if !lighter {
                        continue;
                    }
                    let s = p.check(SectionInput::new(&row.props, row.mass).with_material(mat));
                    if s.passes {
                        local[k] = Some(key);
                        at.push((k, s));
                    } else if s.verdict == Verdict::NotVerified {
                        at.push((k, s));
                    }
                }
                RowOut::Checked {
                    kind: (std::mem::discriminant(&row.props.form), mat.kind),
                    name: row.name,
                    mass: row.mass,
                    depth: row.props.depth,
                    suspect,
                    at,
                }
            });
            for (rec, out) in parsed
                .into_iter()
                .flat_map(|(recs, outs)| recs.iter().zip(outs))
            {
                counts.rows += 1;
                let line = rec.line();
                match out {
                    RowOut::Bad(line, col, msg) => {
                        counts.bad += 1;
                        if errors.len() < 1000 {
                            errors.push(Error::input(
                                at.clone().with_line(line).with_column(col as u64),
                                msg,
                            ));
                        }
                    }
                    RowOut::Excluded => counts.bad += 1,
                    RowOut::Filtered { name, suspect } => {
                        counts.filtered += 1;
                        if suspect {
                            counts.flagged += 1;
                            if suspects.len() < super::SUSPECT_CAP {
                                suspects.push((fi, name.to_string()));
                            }
                        }
                    }
                    RowOut::Checked {
                        kind,
                        name,
                        mass,
                        depth,
                        suspect,
                        at,
                    } => {
                        counts.checked += 1;
                        if !samples.iter().any(|s| s.0 == kind) {
                            let row = parse_row(&schema, &rec, mats)
                                .map_err(|e| Error::Internal(e.message))?;
                            let none = crate::check::Summary {
                                utilisation: f64::NAN,
                                governing: None,
                                verdict: Verdict::NotVerified,
                                gaps: crate::check::Gaps::default(),
                                passes: false,
                            };
                            samples.push((kind, to_candidate_unchecked(&row, &none, fi, line)));
                        }
                        if suspect {
                            counts.flagged += 1;
                            if suspects.len() < super::SUSPECT_CAP {
                                suspects.push((fi, name.to_string()));
                            }
                        }
                        let key = (mass, depth, name, fi, line);
                        let owned = || Key {
                            mass,
                            depth,
                            name: name.to_string(),
                            file: fi,
                            line,
                        };
                        for (k, s) in at {
                            let st = &mut states[k];
                            let lighter = st
                                .best
                                .as_ref()
                                .is_none_or(|b| cmp(key, &b.0) == Ordering::Less);
                            if !lighter {
                                continue;
                            }
                            if s.passes {
                                let row = parse_row(&schema, &rec, mats)
                                    .map_err(|e| Error::Internal(e.message))?;
                                let cand = to_candidate_unchecked(&row, &s, fi, line);
                                st.lighter_nv.retain(|n| cmp(key, n) == Ordering::Greater);
                                st.best = Some((owned(), cand, s));
                            } else if s.verdict == Verdict::NotVerified {
                                st.lighter_nv.push(owned());
                                let lightest = st
                                    .lightest_nv
                                    .as_ref()
                                    .is_none_or(|n| cmp(key, &n.0) == Ordering::Less);
                                if lightest {
                                    st.lightest_nv = Some((owned(), s.gaps.describe()));
                                }
                            }
                        }
                    }
                }
            }
        }
        if counts.rows == rows_before {
            return Err(Error::input(
                at.clone().with_line(cat.header_line + 1),
                "the catalogue has a header but no rows: expected one section per row after the header",
            ));
        }
    }
    Ok(Pass {
        states,
        counts,
        errors,
        suspects,
        samples,
    })
}

/// The lightest passing row at each prepared span, reading each catalogue
/// once (again only when the duplicate filter flagged a reported row's
/// name, and once more per round when names repeat and `skip_bad_rows`
/// leaves the repeats out).
pub fn lightest_by_span<R: Read + Send>(
    preps: &[Prepared],
    open: &dyn Fn() -> Result<Vec<Catalog<R>>>,
    mats: &Materials<'_>,
    filters: &Filters,
    skip_bad_rows: bool,
) -> Result<Lightest> {
    let none = HashSet::new();
    let mut p = pass(preps, open()?, mats, filters, &none)?;
    // Bad rows first, as select reports them.
    if p.counts.bad > 0 && !skip_bad_rows {
        let total = p.counts.bad as usize;
        let mut errors = p.errors;
        if total > errors.len() {
            errors.push(Error::msg(format!("... and {} more", total - errors.len())));
        }
        errors.push(Error::msg(format!(
            "{total} bad row(s): the catalogue is refused (fix them, or use --skip-bad-rows to leave them out)"
        )));
        return Err(Error::Many(errors));
    }
    // Repeated names among the rows reported (the lightest at each span,
    // and the lightest not-verified one): confirmed by a second reading of
    // those names alone, and only when the filter flagged one of them.
    // Flagged rows of other names are counted (`counts.flagged`), not
    // confirmed, as in `select`. Skipping the repeats (--skip-bad-rows)
    // can bring rows whose names repeat into the results, hence rounds.
    let keep = |schema: &crate::catalog::Schema, rec: &crate::catalog::records::Record<'_>| {
        parse_row(schema, rec, mats).is_ok()
    };
    let mut exclude: HashSet<(usize, u64)> = HashSet::new();
    for round in 0.. {
        let mut reported: HashSet<(usize, String)> = HashSet::new();
        for st in &p.states {
            if let Some((k, _, _)) = &st.best {
                reported.insert((k.file, k.name.clone()));
            }
            if let Some((k, _)) = &st.lightest_nv {
                reported.insert((k.file, k.name.clone()));
            }
        }
        // Past the cap every reported name is confirmed.
        let all = p.suspects.len() >= super::SUSPECT_CAP;
        let doubt: HashSet<(usize, String)> = if all {
            reported
        } else {
            p.suspects
                .iter()
                .filter(|s| reported.contains(*s))
                .cloned()
                .collect()
        };
        if doubt.is_empty() {
            break;
        }
        let flagged = |fi: usize| {
            let names: HashSet<String> = doubt
                .iter()
                .filter(|s| s.0 == fi)
                .map(|s| s.1.clone())
                .collect();
            (names, false)
        };
        let rep = find_repeats(open()?, flagged, keep, true)?;
        let new: Vec<(usize, u64)> = rep
            .lines
            .iter()
            .filter(|l| !exclude.contains(l))
            .copied()
            .collect();
        if rep.total == 0 || new.is_empty() {
            break;
        }
        if !skip_bad_rows {
            return Err(refuse_repeats(rep.errors, rep.total));
        }
        if round >= MAX_ROUNDS {
            return Err(Error::msg(format!(
                "{} duplicate name(s): after skipping them {MAX_ROUNDS} times, rows whose names repeat are still the lightest; fix the names (`beamsift catalog validate` lists every repeat)",
                exclude.len() + new.len()
            )));
        }
        exclude.extend(new);
        p = pass(preps, open()?, mats, filters, &exclude)?;
    }
    let samples = p.samples.into_iter().map(|s| s.1).collect();
    let states = p.states;
    let counts = p.counts;
    let out = states
        .into_iter()
        .map(|st| {
            let (best, utilisation, governing) = match st.best {
                Some((_, c, s)) => (Some(c), Some(s.utilisation), s.governing.map(|g| g.kind)),
                None => (None, None, None),
            };
            SpanBest {
                best,
                utilisation,
                governing,
                lighter_not_verified: st.lighter_nv.len() as u64,
                // The lightest not-verified row is lighter than the best
                // whenever any is.
                not_verified_reasons: if st.lighter_nv.is_empty() {
                    Vec::new()
                } else {
                    st.lightest_nv.map(|n| n.1).unwrap_or_default()
                },
            }
        })
        .collect();
    Ok(Lightest {
        spans: out,
        counts,
        samples,
    })
}
