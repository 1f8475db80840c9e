//! Naming a catalogue input and reading it once: a regular file is opened
//! again for each reading; a stream (standard input as `-`, a pipe, a
//! FIFO) is read into memory once, so every reading sees the same bytes.
//! A regular file named as a workbook (`.xlsx`, `.ods`, ...; `FILE#SHEET`
//! names a sheet, the first by default) is read once into the delimited
//! text of its sheet (`workbook.rs`), its locations shown as cells.

use super::workbook;
use crate::error::{Error, Result};
use crate::error::{Location, Sheet};
use std::fs::File;
use std::io::BufReader;
use std::path::PathBuf;

/// Where a catalogue's bytes come from.
#[derive(Clone, Debug)]
pub enum Source {
    /// A regular file, opened again for each reading.
    File(PathBuf),
    /// A stream read once into memory.
    Bytes(std::sync::Arc<Vec<u8>>),
}

/// One catalogue input.
#[derive(Clone, Debug)]
pub struct Input {
    pub shown: String,
    pub source: Source,
    pub len: u64,
    /// The sheet read, for a workbook.
    pub sheet: Option<Sheet>,
}

impl Input {
    /// Name an input: '-' is standard input; anything that is not a regular
    /// file (a pipe, a FIFO, /dev/stdin, a process substitution) is read
    /// once, here, so later readings see the same bytes.
    pub fn new(p: &std::path::Path) -> Result<Input> {
        let (p, sheet) = workbook::split_sheet(p);
        let p = p.as_path();
        let shown = if p.as_os_str() == "-" {
            "standard input".to_string()
        } else {
            p.display().to_string()
        };
        let read_all = |r: &mut dyn std::io::Read| -> Result<Input> {
            let mut buf = Vec::new();
            r.read_to_end(&mut buf).map_err(|e| Error::io(&shown, e))?;
            Ok(Input {
                shown: shown.clone(),
                len: buf.len() as u64,
                source: Source::Bytes(std::sync::Arc::new(buf)),
                sheet: None,
            })
        };
        let not_workbook = || {
            Error::input(
                Location::in_file(&shown),
                format!(
                    "a sheet is named (#{}) but this is not a workbook file: expected a regular file ending in .{}",
                    sheet.as_deref().unwrap_or(""),
                    workbook::EXTENSIONS.join(", .")
                ),
            )
        };
        if p.as_os_str() == "-" {
            if sheet.is_some() {
                return Err(not_workbook());
            }
            return read_all(&mut std::io::stdin().lock());
        }
        let f = File::open(p).map_err(|e| Error::io(&shown, e))?;
        let m = f.metadata().map_err(|e| Error::io(&shown, e))?;
        if m.is_dir() {
            return Err(Error::io(
                &shown,
                std::io::Error::new(
                    std::io::ErrorKind::InvalidInput,
                    "is a folder, expected a catalogue file",
                ),
            ));
        }
        if m.is_file() && workbook::is_workbook(p) {
            drop(f);
            let read = workbook::read_sheet(p, &shown, sheet.as_deref())?;
            return Ok(Input {
                shown,
                len: read.bytes.len() as u64,
                source: Source::Bytes(std::sync::Arc::new(read.bytes)),
                sheet: Some(read.sheet),
            });
        }
        if sheet.is_some() {
            return Err(not_workbook());
        }
        if m.is_file() {
            return Ok(Input {
                shown,
                source: Source::File(p.to_path_buf()),
                len: m.len(),
                sheet: None,
            });
        }
        let mut f = f;
        read_all(&mut f)
    }

    /// Where this input is, for messages (its file, and its sheet).
    pub fn at(&self) -> Location {
        Location::in_file(&self.shown).in_sheet(self.sheet.clone())
    }

    /// Open it as a catalogue (a workbook's text is comma-separated: any
    /// other delimiter is refused).
    pub fn open(
        &self,
        opts: &super::read::ReadOptions,
    ) -> Result<super::read::Catalog<Box<dyn std::io::Read + Send>>> {
        if self.sheet.is_some() && opts.delimiter != b',' {
            return Err(Error::input(
                self.at(),
                "--delimiter applies to delimited text only: leave it out for a workbook",
            ));
        }
        let mut cat = super::read::open_at(self.reader()?, &self.at(), opts)?;
        cat.size_hint = Some(self.len);
        Ok(cat)
    }

    /// A fresh reader over the whole input.
    pub fn reader(&self) -> Result<Box<dyn std::io::Read + Send>> {
        Ok(match &self.source {
            Source::File(p) => Box::new(BufReader::with_capacity(
                1 << 16,
                File::open(p).map_err(|e| Error::io(&self.shown, e))?,
            )),
            Source::Bytes(b) => Box::new(std::io::Cursor::new(SharedBytes(b.clone()))),
        })
    }
}

/// Shared bytes as a reader's buffer.
struct SharedBytes(std::sync::Arc<Vec<u8>>);

impl AsRef<[u8]> for SharedBytes {
    fn as_ref(&self) -> &[u8] {
        &self.0
    }
}
