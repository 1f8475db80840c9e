//! Typed errors of the library.
//!
//! Every error carries the context a user needs to fix the input: where it
//! came from (file, line, column or field), the offending value and what was
//! expected. The binary prints the chain once and maps the variant to an
//! exit code (its own business: see `cli::exit_code`).

use std::fmt;

/// Where a piece of input came from. All parts are optional so that a
/// command-line flag, a TOML key and a CSV cell can all be described.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Location {
    pub file: Option<String>,
    pub line: Option<u64>,
    pub column: Option<u64>,
    pub field: Option<String>,
    /// A spreadsheet's sheet: then `line` is the sheet's row and `column`
    /// counts from the sheet's first used column, shown as `Sheet1!C7`.
    pub sheet: Option<Box<Sheet>>,
}

/// The sheet of a workbook a location is in.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Sheet {
    pub name: String,
    /// The sheet column (1 = A) of record column 1.
    pub first_column: u64,
}

impl Sheet {
    /// The sheet's name as a cell reference writes it: quoted when it is
    /// not plain letters, digits and underscores.
    pub fn quoted(&self) -> String {
        if !self.name.is_empty() && self.name.chars().all(|c| c.is_alphanumeric() || c == '_') {
            self.name.clone()
        } else {
            format!("'{}'", self.name.replace('\'', "''"))
        }
    }
}

/// A sheet column's letters: 1 is A, 26 is Z, 27 is AA.
pub fn column_letters(mut column: u64) -> String {
    let mut s = Vec::new();
    while column > 0 {
        let r = ((column - 1) % 26) as u8;
        s.push(b'A' + r);
        column = (column - 1) / 26;
    }
    s.reverse();
    String::from_utf8(s).unwrap_or_default()
}

impl Location {
    pub fn field(name: impl Into<String>) -> Self {
        Location {
            field: Some(name.into()),
            ..Default::default()
        }
    }
    pub fn in_file(file: impl Into<String>) -> Self {
        Location {
            file: Some(file.into()),
            ..Default::default()
        }
    }
    pub fn with_line(mut self, line: u64) -> Self {
        self.line = Some(line);
        self
    }
    /// Column 1, 2, ...; 0 means a problem of the whole row (no column).
    pub fn with_column(mut self, column: u64) -> Self {
        self.column = (column > 0).then_some(column);
        self
    }
    pub fn with_field(mut self, field: impl Into<String>) -> Self {
        self.field = Some(field.into());
        self
    }
    /// In a workbook's sheet (see [`Sheet`]).
    pub fn in_sheet(mut self, sheet: Option<Sheet>) -> Self {
        self.sheet = sheet.map(Box::new);
        self
    }
    pub fn is_empty(&self) -> bool {
        self.file.is_none()
            && self.line.is_none()
            && self.column.is_none()
            && self.field.is_none()
            && self.sheet.is_none()
    }
    /// A line of this input as a message names it: "line 12", or "row 12"
    /// in a sheet.
    pub fn line_text(&self, line: u64) -> String {
        match self.sheet {
            Some(_) => format!("row {line}"),
            None => format!("line {line}"),
        }
    }
    /// The place without file or field: "line 12, column 3", or "Sheet1!C12"
    /// in a sheet.
    pub fn cell_text(&self) -> String {
        match &self.sheet {
            Some(sheet) => {
                let name = sheet.quoted();
                match (self.line, self.column) {
                    (Some(l), Some(c)) => format!(
                        "{name}!{}{l}",
                        column_letters(c + sheet.first_column.max(1) - 1)
                    ),
                    (Some(l), None) => format!("{name} row {l}"),
                    (None, Some(c)) => format!(
                        "{name} column {}",
                        column_letters(c + sheet.first_column.max(1) - 1)
                    ),
                    (None, None) => format!("sheet {name}"),
                }
            }
            None => match (self.line, self.column) {
                (Some(l), Some(c)) => format!("line {l}, column {c}"),
                (Some(l), None) => format!("line {l}"),
                (None, Some(c)) => format!("column {c}"),
                (None, None) => String::new(),
            },
        }
    }
}

impl fmt::Display for Location {
    /// `file:line:column: field` with absent parts left out.
    /// In a sheet: `file: Sheet1!C7: field`.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.sheet.is_some() {
            let mut parts: Vec<String> = self.file.iter().cloned().collect();
            parts.push(self.cell_text());
            parts.extend(self.field.iter().filter(|f| !f.is_empty()).cloned());
            return write!(f, "{}", parts.join(": "));
        }
        let mut parts: Vec<String> = Vec::new();
        if let Some(file) = &self.file {
            parts.push(file.clone());
        }
        if let Some(line) = self.line {
            parts.push(line.to_string());
        }
        if let Some(col) = self.column {
            parts.push(col.to_string());
        }
        let head = parts.join(":");
        let field = self.field.as_ref().filter(|f| !f.is_empty());
        match (field, head.is_empty()) {
            (Some(field), true) => write!(f, "{field}"),
            (Some(field), false) => write!(f, "{head}: {field}"),
            (None, _) => write!(f, "{head}"),
        }
    }
}

/// The library's error type.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// A value the user gave is not acceptable (bad unit, bad dimension,
    /// a load off the beam, a mechanism, ...).
    #[error("{}{message}", prefix(location))]
    Input { location: Location, message: String },

    /// Several input problems at once (a catalogue with many bad rows),
    /// usually closed by a summary line that counts them.
    #[error("{}:\n{}", heading(.0), join_errors(.0))]
    Many(Vec<Error>),

    /// Reading or writing a file failed.
    #[error("{path}: {source}")]
    Io {
        path: String,
        #[source]
        source: std::io::Error,
    },

    /// The input is valid but nothing satisfies the checks (an optimiser
    /// with no feasible shape, a report with no passing section).
    #[error("{0}")]
    NoSolution(String),

    /// A bug: an invariant the code relies on did not hold.
    #[error("internal error (please report): {0}")]
    Internal(String),
}

fn prefix(loc: &Location) -> String {
    if loc.is_empty() {
        String::new()
    } else {
        format!("{loc}: ")
    }
}

/// "N problem(s) found" counting the located problems; the plain
/// messages among them are summaries ("... and 12 more", "3 bad row(s)").
fn heading(errors: &[Error]) -> String {
    let located = errors
        .iter()
        .filter(|e| !matches!(e, Error::Input { location, .. } if location.is_empty()))
        .count();
    let more = errors
        .iter()
        .any(|e| matches!(e, Error::Input { message, .. } if message.starts_with("... and ")));
    match (located, more) {
        (_, true) => "problems found (the first are listed)".to_string(),
        (1, false) => "1 problem found".to_string(),
        (n, false) => format!("{n} problems found"),
    }
}

fn join_errors(errors: &[Error]) -> String {
    errors
        .iter()
        .map(|e| format!("  {e}"))
        .collect::<Vec<_>>()
        .join("\n")
}

impl Error {
    /// An input error at a location.
    pub fn input(location: Location, message: impl Into<String>) -> Self {
        Error::Input {
            location,
            message: message.into(),
        }
    }

    /// An input error with no location yet (the caller adds it with `at`).
    pub fn msg(message: impl Into<String>) -> Self {
        Error::input(Location::default(), message)
    }

    /// Fill in the parts of the location that are still unknown.
    pub fn at(self, outer: &Location) -> Self {
        match self {
            Error::Input {
                mut location,
                message,
            } => {
                if location.file.is_none() {
                    location.file = outer.file.clone();
                }
                if location.line.is_none() {
                    location.line = outer.line;
                }
                if location.column.is_none() {
                    location.column = outer.column;
                }
                if location.sheet.is_none() {
                    location.sheet = outer.sheet.clone();
                }
                match (&outer.field, &location.field) {
                    (Some(o), _) if o.is_empty() => {}
                    (Some(o), None) => location.field = Some(o.clone()),
                    (Some(o), Some(i)) if !i.is_empty() => {
                        location.field = Some(format!("{o}.{i}"))
                    }
                    (Some(o), Some(_)) => location.field = Some(o.clone()),
                    (None, _) => {}
                }
                Error::Input { location, message }
            }
            Error::Many(v) => Error::Many(v.into_iter().map(|e| e.at(outer)).collect()),
            other => other,
        }
    }

    /// Shorthand for `at(&Location::field(name))`.
    pub fn in_field(self, name: &str) -> Self {
        self.at(&Location::field(name))
    }

    pub fn io(path: impl Into<String>, source: std::io::Error) -> Self {
        Error::Io {
            path: path.into(),
            source,
        }
    }
}

pub type Result<T> = std::result::Result<T, Error>;
