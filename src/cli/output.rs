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
    /// Overwrite an existing output file.
    #[arg(long, global = true)]
    pub force: bool,
}

/// Every argument of the command line that names an existing file, except
/// the values of the output options: the inputs an output must not replace.
fn input_files() -> Vec<PathBuf> {
    let args: Vec<std::ffi::OsString> = std::env::args_os().skip(1).collect();
    let mut out = Vec::new();
    let mut skip = false;
    for a in &args {
        if skip {
            skip = false;
            continue;
        }
        let s = a.to_string_lossy();
        // Values of the options that name outputs are not inputs.
        const OUTPUTS: [&str; 5] = ["-o", "--output", "--chart", "--to", "--report"];
        if OUTPUTS.contains(&s.as_ref()) {
            skip = true;
            continue;
        }
        if OUTPUTS
            .iter()
            .any(|o| o.starts_with("--") && s.starts_with(&format!("{o}=")))
        {
            continue;
        }
        let v = s
            .split_once('=')
            .map(|(_, v)| v.to_string())
            .unwrap_or_else(|| s.to_string());
        for cand in [PathBuf::from(a), PathBuf::from(v)] {
            if cand.is_file() {
                out.push(cand);
            }
        }
    }
    out
}

/// Check an output path before any work starts: its folder exists, it is
/// not a folder, it is not one of the inputs (those named in `inputs` and
/// every existing file on the command line), and it is overwritten only
/// with `force`.
pub fn guard(p: &std::path::Path, force: bool, inputs: &[PathBuf]) -> Result<()> {
    let shown = p.display().to_string();
    let dir = p
        .parent()
        .filter(|d| !d.as_os_str().is_empty())
        .unwrap_or(std::path::Path::new("."));
    if !dir.is_dir() {
        return Err(Error::msg(format!(
            "{shown}: the folder {} does not exist",
            dir.display()
        )));
    }
    if p.is_dir() {
        return Err(Error::msg(format!(
            "{shown}: is a folder, expected a file name"
        )));
    }
    if let Ok(target) = std::fs::canonicalize(p) {
        for i in inputs.iter().cloned().chain(input_files()) {
            if std::fs::canonicalize(&i).ok().as_ref() == Some(&target) {
                return Err(Error::msg(format!(
                    "{shown}: refusing to overwrite an input file"
                )));
            }
        }
        if !force {
            return Err(Error::msg(format!(
                "{shown}: the file exists; use --force to overwrite it"
            )));
        }
    }
    Ok(())
}

impl OutputArgs {
    /// Resolve and check the output before any work starts: its folder
    /// exists, it is not one of the inputs, and it is overwritten only with
    /// --force.
    pub fn resolve(&self) -> Result<Out> {
        let format = if self.json { Format::Json } else { self.format };
        let path = match &self.output {
            Some(p) if p.as_os_str() == "-" => None,
            Some(p) => Some(p.clone()),
            None => None,
        };
        if let Some(p) = &path {
            guard(p, self.force, &[])?;
        }
        Ok(Out {
            units: self.units,
            format,
            path,
            force: self.force,
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

/// A file written through a temporary file in the same folder and renamed
/// into place on `commit`; dropped without commit, it removes itself.
pub struct AtomicFile {
    tmp: std::path::PathBuf,
    path: std::path::PathBuf,
    file: Option<std::io::BufWriter<std::fs::File>>,
}

impl AtomicFile {
    pub fn create(path: &std::path::Path) -> Result<AtomicFile> {
        let dir = path
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or_else(|| std::path::Path::new("."));
        let name = path
            .file_name()
            .ok_or_else(|| Error::msg(format!("{}: not a file name", path.display())))?;
        let tmp = dir.join(format!(
            ".{}.beamsift-{}.tmp",
            name.to_string_lossy(),
            std::process::id()
        ));
        let f =
            std::fs::File::create(&tmp).map_err(|e| Error::io(path.display().to_string(), e))?;
        Ok(AtomicFile {
            tmp,
            path: path.to_path_buf(),
            file: Some(std::io::BufWriter::with_capacity(1 << 20, f)),
        })
    }

    pub fn writer(&mut self) -> &mut std::io::BufWriter<std::fs::File> {
        self.file.as_mut().expect("open until commit")
    }

    pub fn commit(mut self) -> Result<()> {
        let shown = self.path.display().to_string();
        let f = self.file.take().expect("open until commit");
        let f = f
            .into_inner()
            .map_err(|e| Error::io(&shown, e.into_error()))?;
        f.sync_all().map_err(|e| Error::io(&shown, e))?;
        std::fs::rename(&self.tmp, &self.path).map_err(|e| Error::io(&shown, e))
    }
}

impl Drop for AtomicFile {
    fn drop(&mut self) {
        if self.file.is_some() {
            self.file = None;
            let _ = std::fs::remove_file(&self.tmp);
        }
    }
}
