//! Every row of the catalogues read into memory, unchecked (schedules
//! check each row against many members).

use super::{Candidate, Counts, Filters, Rank, compare, to_candidate_unchecked};
use crate::catalog::read::{Catalog, Chunk};
use crate::catalog::{Materials, parse_row};
use crate::error::{Error, Result};
use std::collections::HashSet;
use std::io::Read;

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
                                cat.at.clone().with_line(line),
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
                            cat.at.clone().with_line(line).with_column(e.column as u64),
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
