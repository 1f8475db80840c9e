//! Output options shared by every command, and writing the result.

use super::Out;
use beamsift::report::data::{DataOptions, DataSet};
use beamsift::report::{self, Document, Format};
use beamsift::units::System;
use beamsift::{Error, Result};
use serde::Serialize;
use std::path::PathBuf;

#[derive(clap::Args, Debug)]
pub struct OutputArgs {
    /// Unit system of the output.
    #[arg(long, global = true, value_parser = super::values::system(), default_value = "si")]
    pub units: System,
    /// Output format [default: table; xlsx when -o names a .xlsx file].
    #[arg(long, global = true, value_parser = super::values::format())]
    pub format: Option<Format>,
    /// Shorthand for --format json.
    #[arg(long, global = true)]
    pub json: bool,
    /// Write the result to FILE instead of standard output ('-' = stdout).
    #[arg(long, short = 'o', global = true, value_name = "FILE")]
    pub output: Option<PathBuf>,
    /// Overwrite an existing output file.
    #[arg(long, global = true)]
    pub force: bool,
    /// --format csv-numeric: the table to write (one table per file; the
    /// first when left out; the file's first lines name the others).
    #[arg(long, global = true, value_name = "NAME")]
    pub table: Option<String>,
    /// --format csv-numeric: start the file with a UTF-8 byte-order mark
    /// (for spreadsheet programs that need one to read UTF-8).
    #[arg(long, global = true)]
    pub bom: bool,
    /// --format csv-numeric: write decimal commas (12,5), fields
    /// separated by ';'.
    #[arg(long = "out-decimal-comma", global = true)]
    pub out_decimal_comma: bool,
}

impl OutputArgs {
    /// Resolve the output options (the paths are checked with every other
    /// input and output of the command in `files::check`).
    pub fn resolve(&self) -> Result<Out> {
        let path = match &self.output {
            Some(p) if p.as_os_str() == "-" => None,
            Some(p) => Some(p.clone()),
            None => None,
        };
        let xlsx_path = path.as_ref().is_some_and(|p| {
            p.extension()
                .is_some_and(|e| e.eq_ignore_ascii_case("xlsx"))
        });
        let format = match (self.json, self.format) {
            (true, Some(f)) if f != Format::Json => {
                return Err(
                    Error::msg("--json is --format json: give one of --json and --format")
                        .in_field("--json"),
                );
            }
            (true, _) => Format::Json,
            (false, Some(f)) => f,
            (false, None) if xlsx_path => Format::Xlsx,
            (false, None) => Format::Table,
        };
        if xlsx_path && format != Format::Xlsx {
            return Err(Error::msg(format!(
                "-o {} names a workbook, but the format is {}: use --format xlsx, or another file name",
                path.as_ref().map(|p| p.display().to_string()).unwrap_or_default(),
                Format::CHOICES
                    .iter()
                    .find(|c| c.0 == format)
                    .map_or("", |c| c.1)
            ))
            .in_field("--output"));
        }
        if format == Format::Xlsx && path.is_none() {
            return Err(Error::msg(
                "--format xlsx writes a workbook (binary): name the file with -o FILE.xlsx",
            )
            .in_field("--format"));
        }
        if format != Format::CsvNumeric {
            for (given, name) in [
                (self.table.is_some(), "--table"),
                (self.bom, "--bom"),
                (self.out_decimal_comma, "--out-decimal-comma"),
            ] {
                if given {
                    let why = if format == Format::Xlsx && name == "--table" {
                        " (a workbook has every table, one sheet each)"
                    } else {
                        ""
                    };
                    return Err(Error::msg(format!(
                        "{name} applies to --format csv-numeric only{why}"
                    ))
                    .in_field(name));
                }
            }
        }
        Ok(Out {
            units: self.units,
            format,
            path,
            force: self.force,
            data: DataOptions {
                bom: self.bom,
                decimal_comma: self.out_decimal_comma,
                table: self.table.clone(),
            },
        })
    }
}

/// Write text to the chosen output, at the end of the run with every other
/// output: files first, then standard output (see `files`), so nothing is
/// announced that was not written.
pub fn emit(out: &Out, text: &str) -> Result<()> {
    match &out.path {
        None => {
            super::files::queue_stdout(text);
            Ok(())
        }
        Some(path) => {
            write_atomic(path, text.as_bytes());
            Ok(())
        }
    }
}

/// Write a result that has data tables: the spreadsheet formats from its
/// data tables, the others from its document (as [`emit`]).
pub fn emit_data<T: Serialize>(
    out: &Out,
    result: &T,
    doc: &Document,
    data: &DataSet,
) -> Result<()> {
    let bytes = report::render_data(out.format, result, doc, data, &out.data)?;
    match &out.path {
        None => {
            super::files::queue_stdout(&String::from_utf8_lossy(&bytes));
            Ok(())
        }
        Some(path) => {
            write_atomic(path, &bytes);
            Ok(())
        }
    }
}

/// Queue a file output for the end of the run.
pub fn write_atomic(path: &std::path::Path, bytes: &[u8]) {
    super::files::queue(path, bytes.to_vec());
}

/// The two files a sheet prefix names: PREFIX.md and PREFIX.html (a
/// prefix already ending in either is taken without it).
pub fn sheet_paths(prefix: &std::path::Path) -> (PathBuf, PathBuf) {
    let s = prefix.as_os_str().to_string_lossy();
    let s = s
        .strip_suffix(".md")
        .or_else(|| s.strip_suffix(".html"))
        .unwrap_or(&s)
        .to_string();
    (
        PathBuf::from(format!("{s}.md")),
        PathBuf::from(format!("{s}.html")),
    )
}

/// Queue a calculation sheet's two files; returns their paths.
pub fn write_sheet(
    w: &beamsift::report::sheet::Written,
    prefix: &std::path::Path,
) -> Result<(PathBuf, PathBuf)> {
    use beamsift::report::sheet;
    let (md, html) = sheet_paths(prefix);
    write_atomic(&md, sheet::markdown(&w.sheet).as_bytes());
    write_atomic(&html, sheet::html(&w.sheet).as_bytes());
    Ok((md, html))
}
