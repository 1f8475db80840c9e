//! Reading a sheet of a workbook (.xlsx, .xlsm, .xlsb, .xls, .ods, by
//! calamine) as the records of our delimited text, so catalogues and
//! schedules in workbooks go through exactly the readers, header and unit
//! rules of CSV input.
//!
//! Each sheet row becomes one line (line L is sheet row L), each cell one
//! field (field C is the C-th column from the sheet's first used column),
//! so every position the text readers report is a cell: the location
//! carries the [`Sheet`] and is shown as `Sheet1!C7`.
//!
//! Cells: a number is written as the shortest decimal that reads back to
//! the same value (0.1 stays 0.1, 250.0 is 250); text is quoted; an empty
//! cell is an empty field. A TRUE/FALSE, error, date, time or duration
//! cell is refused at its cell (notes excepted), as is a line break in a
//! text cell (it would move the rows of every later line) and a value to
//! the right of the header's last column. A row whose first cell is text
//! starting with `#` is a comment, as a CSV line starting with `#` is; a
//! row of empty cells is blank. Columns whose header starts with `note`
//! are ignored by both readers: their cells are kept as text when they are
//! text or numbers, left empty otherwise, and line breaks in them become
//! spaces.

use crate::error::{Error, Location, Result, Sheet};
use calamine::{Data, Reader};
use std::fmt::Write as _;
use std::path::Path;

/// File name endings read as workbooks (compared without case).
pub const EXTENSIONS: &[&str] = &["xlsx", "xlsm", "xlsb", "xls", "ods"];

/// Does this path name a workbook (by its ending)?
pub fn is_workbook(path: &Path) -> bool {
    path.extension()
        .and_then(|e| e.to_str())
        .is_some_and(|e| EXTENSIONS.iter().any(|x| x.eq_ignore_ascii_case(e)))
}

/// A path as given, split into the file and the sheet it names: `FILE#SHEET`
/// where FILE names a workbook and the whole path is not itself a file.
pub fn split_sheet(path: &Path) -> (std::path::PathBuf, Option<String>) {
    let text = path.to_string_lossy();
    if !path.exists()
        && let Some((file, sheet)) = text.rsplit_once('#')
        && is_workbook(Path::new(file))
    {
        return (file.into(), Some(sheet.to_string()));
    }
    (path.to_path_buf(), None)
}

/// A sheet read as delimited text (comma-separated, one line per row).
#[derive(Debug)]
pub struct SheetText {
    pub bytes: Vec<u8>,
    pub sheet: Sheet,
}

/// Read the sheet `name` (the first sheet when None) of the workbook at
/// `path`; `shown` names it in messages.
pub fn read_sheet(path: &Path, shown: &str, name: Option<&str>) -> Result<SheetText> {
    let bad = |why: String| {
        Error::io(
            shown,
            std::io::Error::new(std::io::ErrorKind::InvalidData, why),
        )
    };
    let mut book = calamine::open_workbook_auto(path).map_err(|e| match e {
        calamine::Error::Io(e) => Error::io(shown, e),
        e => bad(format!("cannot be read as a workbook: {e}")),
    })?;
    let names = book.sheet_names();
    let listed = || {
        names
            .iter()
            .map(|n| format!("'{n}'"))
            .collect::<Vec<_>>()
            .join(", ")
    };
    let chosen = match name {
        None => names
            .first()
            .cloned()
            .ok_or_else(|| Error::input(Location::in_file(shown), "the workbook has no sheets"))?,
        Some(n) => names.iter().find(|s| *s == n).cloned().ok_or_else(|| {
            Error::input(
                Location::in_file(shown),
                format!(
                    "no sheet named '{n}' (FILE#SHEET): expected one of {}",
                    listed()
                ),
            )
        })?,
    };
    let range = book
        .worksheet_range(&chosen)
        .map_err(|e| bad(format!("sheet '{chosen}' cannot be read: {e}")))?;
    let (row0, col0) = range.start().unwrap_or((0, 0));
    let sheet = Sheet {
        name: chosen,
        first_column: col0 as u64 + 1,
    };
    let rows: Vec<&[Data]> = range.rows().collect();
    let bytes = text_of(
        &rows,
        row0 as u64,
        &Location::in_file(shown).in_sheet(Some(sheet.clone())),
    )?;
    Ok(SheetText { bytes, sheet })
}

/// Is this row's first cell text starting with `#` (a comment)?
fn is_comment(row: &[Data]) -> bool {
    matches!(row.first(), Some(Data::String(s)) if s.starts_with('#'))
}

fn is_blank(row: &[Data]) -> bool {
    row.iter().all(|c| matches!(c, Data::Empty))
}

/// The sheet's rows (the first is sheet row `row0 + 1`) as delimited text.
fn text_of(rows: &[&[Data]], row0: u64, at: &Location) -> Result<Vec<u8>> {
    // The header: the first row that is neither blank nor a comment. Its
    // last non-empty cell ends every row; note columns are found by name.
    let header = rows.iter().find(|r| !is_blank(r) && !is_comment(r));
    let width = header.map_or(0, |h| {
        h.iter()
            .rposition(|c| !matches!(c, Data::Empty))
            .map_or(0, |k| k + 1)
    });
    let notes: Vec<bool> = (0..width)
        .map(|k| {
            header.is_some_and(|h| {
                matches!(&h[k], Data::String(s) if s.trim().to_ascii_lowercase().starts_with("note"))
            })
        })
        .collect();
    // Rows above the used range are blank lines, so line L is row L.
    let mut out = vec![b'\n'; row0 as usize];
    let mut errors = Vec::new();
    for (k, row) in rows.iter().enumerate() {
        let line = row0 + k as u64 + 1;
        if is_comment(row) {
            out.extend_from_slice(b"#\n");
            continue;
        }
        if is_blank(row) {
            out.push(b'\n');
            continue;
        }
        let cell_at = |c: usize| at.clone().with_line(line).with_column(c as u64 + 1);
        if let Some(c) = row
            .iter()
            .enumerate()
            .skip(width)
            .find(|(_, d)| !matches!(d, Data::Empty))
            .map(|(c, _)| c)
        {
            errors.push(Error::input(
                cell_at(c),
                format!(
                    "a value to the right of the header's last column ({}): expected an empty cell, or a header for this column",
                    crate::error::column_letters(
                        width as u64 + at.sheet.as_ref().map_or(1, |s| s.first_column) - 1
                    )
                ),
            ));
            out.push(b'\n');
            continue;
        }
        let mut line_text = String::new();
        for (c, &note) in notes.iter().enumerate() {
            if c > 0 {
                line_text.push(',');
            }
            let cell = row.get(c).unwrap_or(&Data::Empty);
            match cell_field(cell, note) {
                Ok(field) => line_text.push_str(&field),
                Err(why) => errors.push(Error::input(cell_at(c), why)),
            }
        }
        out.extend_from_slice(line_text.as_bytes());
        out.push(b'\n');
    }
    match errors.len() {
        0 => Ok(out),
        1 => Err(errors.remove(0)),
        _ => Err(Error::Many(errors)),
    }
}

/// One cell as a field of our delimited text, or why it cannot be one.
fn cell_field(cell: &Data, note: bool) -> std::result::Result<String, String> {
    let quoted = |s: &str| {
        if s.is_empty() {
            String::new()
        } else {
            format!("\"{}\"", s.replace('"', "\"\""))
        }
    };
    Ok(match cell {
        Data::Empty => String::new(),
        // Rust writes the shortest decimal that reads back to the same
        // number, never with an exponent: 0.1 is "0.1", 250.0 is "250".
        Data::Float(v) if v.is_finite() => {
            let mut s = String::new();
            let _ = write!(s, "{v}");
            s
        }
        Data::Float(_) => return Err("not a finite number".into()),
        Data::Int(v) => v.to_string(),
        Data::String(s) if note => quoted(&s.replace(['\r', '\n'], " ")),
        Data::String(s) if s.contains(['\r', '\n']) => {
            return Err("the text has a line break: expected one line of text in this cell".into());
        }
        Data::String(s) => quoted(s),
        _ if note => String::new(),
        Data::Bool(b) => {
            return Err(format!(
                "a {} (true/false) cell: expected a number, or text such as yes or no",
                if *b { "TRUE" } else { "FALSE" }
            ));
        }
        Data::Error(e) => {
            return Err(format!(
                "an error cell ({e}): expected a number or text (fix the formula)"
            ));
        }
        Data::DateTime(_) | Data::DateTimeIso(_) => {
            return Err(
                "a date or time cell: expected a number or text (format the cell as a number)"
                    .into(),
            );
        }
        Data::DurationIso(_) => {
            return Err(
                "a duration cell: expected a number or text (format the cell as a number)".into(),
            );
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_read_back_exactly() {
        // Rust's f64 Display is the shortest round-trip decimal (std docs).
        for v in [
            0.1,
            250.0,
            1e-7,
            123456789.125,
            7.85e-6,
            0.30000000000000004,
        ] {
            let s = cell_field(&Data::Float(v), false).unwrap();
            assert!(!s.contains('e'), "{s}");
            assert_eq!(s.parse::<f64>().unwrap().to_bits(), v.to_bits(), "{s}");
        }
        assert_eq!(cell_field(&Data::Float(250.0), false).unwrap(), "250");
        assert_eq!(cell_field(&Data::Float(0.1), false).unwrap(), "0.1");
    }

    #[test]
    fn letters() {
        use crate::error::column_letters;
        assert_eq!(column_letters(1), "A");
        assert_eq!(column_letters(26), "Z");
        assert_eq!(column_letters(27), "AA");
        assert_eq!(column_letters(702), "ZZ");
        assert_eq!(column_letters(703), "AAA");
    }
}
