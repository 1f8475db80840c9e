//! Naming a catalogue input and reading it once: a regular file is opened
//! again for each reading; a stream (standard input as `-`, a pipe, a
//! FIFO) is read into memory once, so every reading sees the same bytes.

use crate::error::{Error, Result};
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
}

impl Input {
    /// Name an input: '-' is standard input; anything that is not a regular
    /// file (a pipe, a FIFO, /dev/stdin, a process substitution) is read
    /// once, here, so later readings see the same bytes.
    pub fn new(p: &std::path::Path) -> Result<Input> {
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
            })
        };
        if p.as_os_str() == "-" {
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
        if m.is_file() {
            return Ok(Input {
                shown,
                source: Source::File(p.to_path_buf()),
                len: m.len(),
            });
        }
        let mut f = f;
        read_all(&mut f)
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
