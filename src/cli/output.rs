//! Output options shared by every command, and writing the result.

use super::Out;
use beamsift::report::Format;
use beamsift::units::System;
use beamsift::{Error, Result};
use std::io::Write;
use std::path::PathBuf;

#[derive(clap::Args, Debug)]
pub struct OutputArgs {
    /// Unit system of the output.
    #[arg(long, global = true, value_enum, default_value_t = System::Si)]
    pub units: System,
    /// Output format.
    #[arg(long, global = true, value_enum, default_value_t = Format::Table)]
    pub format: Format,
    /// Shorthand for --format json.
    #[arg(long, global = true)]
    pub json: bool,
    /// Write the result to FILE instead of standard output ('-' = stdout).
    #[arg(long, short = 'o', global = true, value_name = "FILE")]
    pub output: Option<PathBuf>,
}

impl OutputArgs {
    pub fn resolve(&self) -> Result<Out> {
        let format = if self.json { Format::Json } else { self.format };
        let path = match &self.output {
            Some(p) if p.as_os_str() == "-" => None,
            Some(p) => Some(p.clone()),
            None => None,
        };
        Ok(Out {
            units: self.units,
            format,
            path,
        })
    }
}

/// Write text to the chosen output. Files are written to a temporary file
/// in the same folder and renamed into place, so a failed run never leaves
/// a half-written file.
pub fn emit(out: &Out, text: &str) -> Result<()> {
    match &out.path {
        None => {
            let stdout = std::io::stdout();
            let mut lock = stdout.lock();
            lock.write_all(text.as_bytes())
                .and_then(|_| lock.flush())
                .map_err(|e| Error::io("standard output", e))
        }
        Some(path) => write_atomic(path, text.as_bytes()),
    }
}

pub fn write_atomic(path: &std::path::Path, bytes: &[u8]) -> Result<()> {
    let shown = path.display().to_string();
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or_else(|| std::path::Path::new("."));
    let name = path
        .file_name()
        .ok_or_else(|| Error::msg(format!("{shown}: not a file name")))?;
    let tmp = dir.join(format!(
        ".{}.beamsift-{}.tmp",
        name.to_string_lossy(),
        std::process::id()
    ));
    let result = std::fs::File::create(&tmp)
        .and_then(|mut f| {
            f.write_all(bytes)?;
            f.sync_all()
        })
        .and_then(|_| std::fs::rename(&tmp, path));
    if let Err(e) = result {
        let _ = std::fs::remove_file(&tmp);
        return Err(Error::io(shown, e));
    }
    Ok(())
}
