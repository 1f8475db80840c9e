//! Output options shared by every command, and writing the result.

use super::Out;
use beamsift::Result;
use beamsift::report::Format;
use beamsift::units::System;
use std::path::PathBuf;

#[derive(clap::Args, Debug)]
pub struct OutputArgs {
    /// Unit system of the output.
    #[arg(long, global = true, value_parser = super::values::system(), default_value = "si")]
    pub units: System,
    /// Output format.
    #[arg(long, global = true, value_parser = super::values::format(), default_value = "table")]
    pub format: Format,
    /// Shorthand for --format json.
    #[arg(long, global = true)]
    pub json: bool,
    /// Write the result to FILE instead of standard output ('-' = stdout).
    #[arg(long, short = 'o', global = true, value_name = "FILE")]
    pub output: Option<PathBuf>,
    /// Overwrite an existing output file.
    #[arg(long, global = true)]
    pub force: bool,
}

impl OutputArgs {
    /// Resolve the output options (the paths are checked with every other
    /// input and output of the command in `files::check`).
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
            force: self.force,
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
