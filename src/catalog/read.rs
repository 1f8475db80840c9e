//! Reading catalogue files: headers, chunked records for parallel scans,
//! and whole-file validation that reports every bad row.

use super::{Materials, Schema, parse_row};
use crate::check::Material;
use crate::error::{Error, Location, Result};
use std::io::Read;

/// Options for reading a catalogue.
#[derive(Clone, Debug)]
pub struct ReadOptions {
    pub delimiter: u8,
}

impl Default for ReadOptions {
    fn default() -> Self {
        ReadOptions { delimiter: b',' }
    }
}

/// An open catalogue: its schema and a record reader.
pub struct Catalog<R: Read> {
    pub file: String,
    pub schema: Schema,
    pub reader: csv::Reader<R>,
}

/// Strip a UTF-8 byte-order mark from a header cell.
fn strip_bom(s: &str) -> &str {
    s.strip_prefix('\u{feff}').unwrap_or(s)
}

/// Open a catalogue from any reader (`file` names it in messages).
pub fn open<R: Read>(input: R, file: &str, opts: &ReadOptions) -> Result<Catalog<R>> {
    let mut reader = csv::ReaderBuilder::new()
        .delimiter(opts.delimiter)
        .comment(Some(b'#'))
        .flexible(false)
        .has_headers(true)
        .from_reader(input);
    let headers = reader
        .byte_headers()
        .map_err(|e| csv_error(file, e))?
        .clone();
    if headers.is_empty() || (headers.len() == 1 && headers[0].is_empty()) {
        return Err(Error::input(
            Location::in_file(file),
            "the file is empty: expected a header row naming the columns",
        ));
    }
    let mut names = Vec::with_capacity(headers.len());
    for (i, h) in headers.iter().enumerate() {
        let s = std::str::from_utf8(h).map_err(|_| {
            Error::input(
                Location::in_file(file)
                    .with_line(1)
                    .with_column(i as u64 + 1),
                "the header is not valid UTF-8 text",
            )
        })?;
        names.push(strip_bom(s).trim().to_string());
    }
    let line = reader.position().line().max(1);
    if names.len() == 1
        && opts.delimiter == b','
        && (names[0].contains(';') || names[0].contains('\t'))
    {
        return Err(Error::input(
            Location::in_file(file).with_line(line),
            "the header has a single column but contains ';' or tabs: use --delimiter ';' (or 'tab') for this file",
        ));
    }
    if names.len() == 1 && opts.delimiter != b',' && names[0].contains(',') {
        return Err(Error::input(
            Location::in_file(file).with_line(line),
            format!(
                "the header has a single column when split at '{}' (--delimiter) but contains commas: leave --delimiter out for a comma-separated file",
                if opts.delimiter == b'\t' {
                    "tab".to_string()
                } else {
                    (opts.delimiter as char).to_string()
                }
            ),
        ));
    }
    let schema = Schema::parse(&names, &Location::in_file(file).with_line(1))?;
    Ok(Catalog {
        file: file.to_string(),
        schema,
        reader,
    })
}

/// Turn a csv error into ours, with its position.
pub fn csv_error(file: &str, e: csv::Error) -> Error {
    let mut loc = Location::in_file(file);
    if let Some(p) = e.position() {
        loc = loc.with_line(p.line());
    }
    let msg = match e.kind() {
        csv::ErrorKind::UnequalLengths {
            expected_len, len, ..
        } => format!(
            "this row has {len} fields but the header has {expected_len}: check the delimiter and quoting"
        ),
        csv::ErrorKind::Utf8 { .. } => "not valid UTF-8 text".to_string(),
        csv::ErrorKind::Io(err) => {
            return Error::io(file, std::io::Error::new(err.kind(), err.to_string()));
        }
        _ => e.to_string(),
    };
    Error::input(loc, msg)
}

impl<R: Read> Catalog<R> {
    /// Fill `buf` with up to `n` records; returns how many (0 at the end).
    /// Each record keeps its position for line numbers.
    pub fn next_chunk(&mut self, buf: &mut Vec<csv::ByteRecord>, n: usize) -> Result<usize> {
        let mut k = 0;
        while k < n {
            if k == buf.len() {
                buf.push(csv::ByteRecord::new());
            }
            match self.reader.read_byte_record(&mut buf[k]) {
                Ok(true) => k += 1,
                Ok(false) => break,
                Err(e) => return Err(csv_error(&self.file, e)),
            }
        }
        Ok(k)
    }
}

/// Line number of a record.
pub fn line_of(rec: &csv::ByteRecord) -> u64 {
    rec.position().map(|p| p.line()).unwrap_or(0)
}

/// Result of validating a whole catalogue.
#[derive(Debug)]
pub struct Validation {
    pub rows: u64,
    pub good: u64,
    pub errors: Vec<Error>,
}

/// Validate every row; report all problems (bad rows, duplicate names).
/// `grades` may be empty when no job is given (grades are then not looked up).
pub fn validate<R: Read>(
    mut cat: Catalog<R>,
    base: &Material,
    grades: &[(String, Material)],
    check_grades: bool,
) -> Result<Validation> {
    let mats = Materials { base, grades };
    let mut buf = Vec::new();
    let mut seen: std::collections::HashMap<String, u64> = std::collections::HashMap::new();
    let mut v = Validation {
        rows: 0,
        good: 0,
        errors: Vec::new(),
    };
    let grade_col = cat.schema.cols.iter().position(|c| *c == super::Col::Grade);
    loop {
        let n = match cat.next_chunk(&mut buf, 4096) {
            Ok(n) => n,
            Err(e) => {
                v.errors.push(e);
                break;
            }
        };
        if n == 0 {
            break;
        }
        for rec in &buf[..n] {
            v.rows += 1;
            let line = line_of(rec);
            let mut rec2;
            let rec_used = if !check_grades && let Some(g) = grade_col {
                // Without a job, grades cannot be resolved: blank them.
                rec2 = csv::ByteRecord::new();
                for (i, f) in rec.iter().enumerate() {
                    rec2.push_field(if i == g { b"" } else { f });
                }
                &rec2
            } else {
                rec
            };
            match parse_row(&cat.schema, rec_used, &mats) {
                Ok(row) => {
                    if let Some(first) = seen.insert(row.name.to_string(), line) {
                        let col = cat
                            .schema
                            .cols
                            .iter()
                            .position(|c| *c == super::Col::Name)
                            .unwrap_or(0);
                        v.errors.push(Error::input(
                            Location::in_file(&cat.file)
                                .with_line(line)
                                .with_column(col as u64 + 1),
                            format!(
                                "duplicate section name '{}' (first on line {first})",
                                row.name
                            ),
                        ));
                    } else {
                        v.good += 1;
                    }
                }
                Err(e) => v.errors.push(Error::input(
                    Location::in_file(&cat.file)
                        .with_line(line)
                        .with_column(e.column as u64),
                    e.message,
                )),
            }
        }
    }
    if v.rows == 0 && v.errors.is_empty() {
        v.errors.push(Error::input(
            Location::in_file(&cat.file),
            "the catalogue has a header but no rows",
        ));
    }
    Ok(v)
}
