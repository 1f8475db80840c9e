//! Reading catalogue files: headers, chunked records for parallel scans,
//! whole-file validation that reports every bad row, and the listing of a
//! catalogue with its computed properties.

use super::records::{Block, Blocks, ReadError, Records};
use super::{CellError, Materials, Schema, parse_row};
use crate::check::Material;
use crate::error::{Error, Location, Result};
use crate::section::{Properties, Shape};
use serde::Serialize;
use std::io::Read;

/// Options for reading a catalogue.
#[derive(Clone, Debug)]
pub struct ReadOptions {
    pub delimiter: u8,
    /// Number cells are written with a decimal comma (`12,5` is 12.5); the
    /// delimiter is then not a comma.
    pub decimal_comma: bool,
}

impl ReadOptions {
    /// The options for a delimiter given as text: one character, or
    /// `tab` (or `\t`).
    pub fn from_delimiter(text: &str) -> Result<Self> {
        let delimiter = match text {
            "tab" | "\\t" => b'\t',
            s if s.len() == 1 => s.as_bytes()[0],
            s => {
                return Err(Error::msg(format!(
                    "--delimiter '{s}': expected one character or 'tab'"
                )));
            }
        };
        Ok(ReadOptions {
            delimiter,
            decimal_comma: false,
        })
    }

    /// The options for a delimiter given as text and decimal commas
    /// (`--decimal-comma`), which need a delimiter other than a comma.
    pub fn new(delimiter: &str, decimal_comma: bool) -> Result<Self> {
        let mut o = Self::from_delimiter(delimiter)?;
        if decimal_comma && o.delimiter == b',' {
            return Err(Error::msg(
                "--decimal-comma: numbers like 12,5 cannot be read from comma-separated fields: give the file's delimiter too, e.g. --delimiter ';' (or 'tab')",
            )
            .in_field("--decimal-comma"));
        }
        o.decimal_comma = decimal_comma;
        Ok(o)
    }
}

impl Default for ReadOptions {
    fn default() -> Self {
        ReadOptions {
            delimiter: b',',
            decimal_comma: false,
        }
    }
}

/// An open catalogue: its schema and a block reader positioned after the
/// header.
pub struct Catalog<R: Read> {
    pub file: String,
    /// Where its problems are: the file, and the sheet of a workbook.
    pub at: Location,
    pub schema: Schema,
    /// Line of the header row.
    pub header_line: u64,
    pub delimiter: u8,
    /// The input's length in bytes, when known (sizes the duplicate filter).
    pub size_hint: Option<u64>,
    blocks: Blocks<R>,
}

/// A reusable buffer for sequential reading with [`Catalog::next_chunk`].
#[derive(Default)]
pub struct Chunk {
    block: Block,
    pub records: Records,
}

/// Open a catalogue from any reader (`file` names it in messages).
pub fn open<R: Read>(input: R, file: &str, opts: &ReadOptions) -> Result<Catalog<R>> {
    open_at(input, &Location::in_file(file), opts)
}

/// Open a catalogue whose problems are at `at` (a file, or a workbook's
/// sheet: see `input::Input::open`).
pub fn open_at<R: Read>(input: R, at: &Location, opts: &ReadOptions) -> Result<Catalog<R>> {
    let file = at.file.as_deref().unwrap_or("");
    if matches!(opts.delimiter, b'"' | b'#' | b'\n' | b'\r') {
        return Err(Error::input(
            at.clone(),
            "the delimiter cannot be a quote, '#' or a line break",
        ));
    }
    let mut blocks = Blocks::new(input, opts.delimiter);
    let mut head = Records::default();
    blocks
        .take_records(1, &mut head)
        .map_err(|e| read_error(at, e))?;
    if head.is_empty() {
        return Err(Error::input(
            at.clone(),
            "the file is empty: expected a header row naming the columns",
        ));
    }
    let header = head.get(0);
    let line = header.line();
    let mut names = Vec::with_capacity(header.len());
    for (i, h) in header.iter().enumerate() {
        let s = std::str::from_utf8(h).map_err(|_| {
            Error::input(
                at.clone().with_line(line).with_column(i as u64 + 1),
                "the header is not valid UTF-8 text",
            )
        })?;
        names.push(s.trim().to_string());
    }
    if header.fault().is_some() {
        return Err(Error::input(
            at.clone().with_line(line),
            "the header has a quoted field that is never closed",
        ));
    }
    if names.len() == 1
        && opts.delimiter == b','
        && (names[0].contains(';') || names[0].contains('\t'))
    {
        return Err(Error::input(
            at.clone().with_line(line),
            "the header has a single column but contains ';' or tabs: use --delimiter ';' (or 'tab') for this file",
        ));
    }
    if names.len() == 1 && opts.delimiter != b',' && names[0].contains(',') {
        return Err(Error::input(
            at.clone().with_line(line),
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
    let mut schema = Schema::parse(&names, &at.clone().with_line(line))?;
    schema.decimal_comma = opts.decimal_comma;
    Ok(Catalog {
        file: file.to_string(),
        at: at.clone(),
        schema,
        header_line: line,
        delimiter: opts.delimiter,
        size_hint: None,
        blocks,
    })
}

/// Turn a reading error into ours, with its position.
pub fn read_error(at: &Location, e: ReadError) -> Error {
    match e {
        ReadError::Io(err) => Error::io(at.file.as_deref().unwrap_or(""), err),
        ReadError::TooLong { line } => Error::input(
            at.clone().with_line(line),
            format!(
                "a record runs on for more than {} MB from here: is a quote never closed?",
                super::records::MAX_RECORD >> 20
            ),
        ),
    }
}

impl<R: Read> Catalog<R> {
    /// The next block of whole records (parse its segments in parallel
    /// with [`Block::parse_segment`]); false at the end.
    pub fn next_block(&mut self, block: &mut Block) -> Result<bool> {
        self.blocks
            .next_block(block)
            .map_err(|e| read_error(&self.at, e))
    }

    /// The next records, in order, into `chunk.records`; 0 at the end.
    pub fn next_chunk(&mut self, chunk: &mut Chunk) -> Result<usize> {
        self.blocks
            .next_records(&mut chunk.block, &mut chunk.records)
            .map_err(|e| read_error(&self.at, e))
    }

    /// Bytes per parallel segment (results never depend on it).
    pub fn set_segment(&mut self, bytes: usize) {
        self.blocks.set_segment(bytes);
    }

    /// Input bytes read so far (whole records).
    pub fn offset(&self) -> u64 {
        self.blocks.offset()
    }
}

/// Result of validating a whole catalogue.
#[derive(Debug)]
pub struct Validation {
    pub rows: u64,
    pub good: u64,
    pub errors: Vec<Error>,
    /// Problems found beyond the first [`MAX_LISTED`].
    pub unlisted: u64,
}

/// Most problems one validation lists (the rest are counted).
pub const MAX_LISTED: usize = 10_000;

impl Validation {
    /// Every problem found, listed or not.
    pub fn problems(&self) -> u64 {
        self.errors.len() as u64 + self.unlisted
    }
    /// Rows read that have a problem.
    pub fn bad_rows(&self) -> u64 {
        self.rows - self.good
    }
    /// List a problem, or count it beyond [`MAX_LISTED`].
    fn push(&mut self, e: Error) {
        if self.errors.len() < MAX_LISTED {
            self.errors.push(e);
        } else {
            self.unlisted += 1;
        }
    }
}

/// The problem of a row that does not read, at its line and column.
fn row_error(at: &Location, line: u64, e: CellError) -> Error {
    Error::input(
        at.clone().with_line(line).with_column(e.column as u64),
        e.message,
    )
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
    let mut chunk = Chunk::default();
    let mut seen: std::collections::HashMap<String, u64> = std::collections::HashMap::new();
    let mut v = Validation {
        rows: 0,
        good: 0,
        errors: Vec::new(),
        unlisted: 0,
    };
    // Without a job, grades cannot be resolved: read the grade column as a
    // note.
    let schema = if check_grades {
        cat.schema.clone()
    } else {
        let mut s = cat.schema.clone();
        for c in s.cols.iter_mut() {
            if *c == super::Col::Grade {
                *c = super::Col::Note;
            }
        }
        s
    };
    let name_col = schema
        .cols
        .iter()
        .position(|c| *c == super::Col::Name)
        .unwrap_or(0);
    loop {
        let n = match cat.next_chunk(&mut chunk) {
            Ok(n) => n,
            Err(e) => {
                v.errors.push(e);
                break;
            }
        };
        if n == 0 {
            break;
        }
        for rec in chunk.records.iter() {
            v.rows += 1;
            let line = rec.line();
            match parse_row(&schema, &rec, &mats) {
                Ok(row) => {
                    if let Some(first) = seen.insert(row.name.to_string(), line) {
                        v.push(Error::input(
                            cat.at
                                .clone()
                                .with_line(line)
                                .with_column(name_col as u64 + 1),
                            format!(
                                "duplicate section name '{}' (first on {})",
                                row.name,
                                cat.at.line_text(first)
                            ),
                        ));
                    } else {
                        v.good += 1;
                    }
                }
                Err(e) => v.push(row_error(&cat.at, line, e)),
            }
        }
    }
    if v.rows == 0 && v.errors.is_empty() {
        v.errors.push(Error::input(
            cat.at.clone(),
            "the catalogue has a header but no rows",
        ));
    }
    Ok(v)
}

/// One row of a listing: the row as read, with its computed properties.
#[derive(Debug, Serialize)]
pub struct Listed {
    pub line: u64,
    pub name: String,
    pub shape: Option<Shape>,
    pub grade: String,
    pub properties: Properties,
    /// kg/m (NaN when the row gives no mass and no density is known).
    pub mass_per_length: f64,
    pub cost_per_mm: Option<f64>,
    pub stock: Option<bool>,
}

/// A catalogue listed: every row that reads, in file order, and the
/// problems of the rows that do not.
#[derive(Debug, Serialize)]
pub struct Listing {
    pub file: String,
    pub rows: Vec<Listed>,
    pub problems: Vec<String>,
}

/// List every row of a catalogue with its properties (a reading error
/// stops the listing; a bad row is a problem and the listing goes on).
pub fn list<R: Read>(mut cat: Catalog<R>, mats: &Materials<'_>) -> Result<Listing> {
    let mut out = Listing {
        file: cat.file.clone(),
        rows: Vec::new(),
        problems: Vec::new(),
    };
    let mut chunk = Chunk::default();
    while cat.next_chunk(&mut chunk)? > 0 {
        for rec in chunk.records.iter() {
            match parse_row(&cat.schema, &rec, mats) {
                Ok(r) => out.rows.push(Listed {
                    line: rec.line(),
                    name: r.name.to_string(),
                    shape: r.shape,
                    grade: r.grade.to_string(),
                    properties: r.props,
                    mass_per_length: r.mass,
                    cost_per_mm: r.cost,
                    stock: r.stock,
                }),
                Err(e) => out
                    .problems
                    .push(row_error(&cat.at, rec.line(), e).to_string()),
            }
        }
    }
    Ok(out)
}
