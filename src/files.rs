//! What a command reads and writes, and writing it safely: I/O for any
//! front end (outside the I/O-free core).
//!
//! Every command names its inputs and outputs from its parsed arguments
//! (never by re-reading the command line). Before any work starts, each
//! output is checked: its folder exists, it is not a folder, it is not an
//! input (by path and by file identity, so hard links, symbolic links and
//! other spellings are caught), no two outputs name the same file, and an
//! existing file is replaced only with `--force`.
//!
//! Outputs are written at the end, together: each to a temporary file with a
//! short random name beside its target, flushed to disk, then moved into
//! place. Without `--force` the move refuses to replace a file (a hard
//! link, so a file another run created meanwhile is never overwritten);
//! with it the move replaces atomically. If any move fails, the files
//! already moved are put back as they were. Device files and FIFOs
//! (`/dev/null`, `/dev/stdout`) are written directly; a symbolic link is
//! written through to its target. Temporary files are removed on an error,
//! a panic, and on SIGINT, SIGTERM or SIGHUP.

use crate::{Error, Result};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::Mutex;

/// Temporary files alive now (removed by the signal handler).
static LIVE: Mutex<Vec<PathBuf>> = Mutex::new(Vec::new());

/// Outputs waiting for the end of the run: (target, bytes).
static PENDING: Mutex<Vec<(PathBuf, Vec<u8>)>> = Mutex::new(Vec::new());

/// Remove every temporary file alive now (for a front end's signal
/// handler: an interrupted run leaves nothing behind).
pub fn remove_temporaries() {
    if let Ok(live) = LIVE.lock() {
        for p in live.iter() {
            let _ = std::fs::remove_file(p);
        }
    }
}

fn register(p: &Path) {
    if let Ok(mut live) = LIVE.lock() {
        live.push(p.to_path_buf());
    }
}

fn unregister(p: &Path) {
    if let Ok(mut live) = LIVE.lock() {
        live.retain(|x| x != p);
    }
}

/// An output refused before any work: exit code 3 like every other output
/// that cannot be written.
fn refused(path: &Path, kind: std::io::ErrorKind, why: String) -> Error {
    Error::io(path.display().to_string(), std::io::Error::new(kind, why))
}

/// The identity of an existing file (device and inode on Unix).
#[cfg(unix)]
fn identity(m: &std::fs::Metadata) -> (u64, u64) {
    use std::os::unix::fs::MetadataExt;
    (m.dev(), m.ino())
}

#[cfg(not(unix))]
fn identity(_m: &std::fs::Metadata) -> (u64, u64) {
    (0, 0)
}

/// Is this (followed) file a device, FIFO or socket: written directly,
/// never replaced?
fn special(m: &std::fs::Metadata) -> bool {
    !m.is_file() && !m.is_dir()
}

/// The folder a path is in ("." for a bare name).
fn folder(p: &Path) -> &Path {
    p.parent()
        .filter(|d| !d.as_os_str().is_empty())
        .unwrap_or(Path::new("."))
}

/// Where an output really goes: symbolic links followed (an existing
/// target, or the link's own folder resolved for a new file).
fn resolve(p: &Path) -> Result<PathBuf> {
    let text = p.as_os_str().to_string_lossy();
    if text.ends_with('/') || text.ends_with(std::path::MAIN_SEPARATOR) || p.file_name().is_none() {
        return Err(refused(
            p,
            std::io::ErrorKind::InvalidInput,
            "names a folder (it ends with a separator or is . or ..): expected a file name".into(),
        ));
    }
    if let Ok(m) = std::fs::symlink_metadata(p)
        && m.file_type().is_symlink()
    {
        // A link to a device or a pipe (/dev/stdout, /dev/fd/N) is
        // written directly through the link.
        if std::fs::metadata(p).is_ok_and(|t| special(&t)) {
            return Ok(p.to_path_buf());
        }
        return std::fs::canonicalize(p).map_err(|_| {
            refused(
                p,
                std::io::ErrorKind::NotFound,
                "is a symbolic link to a missing file: give the target itself".into(),
            )
        });
    }
    let dir = folder(p);
    let dir = std::fs::canonicalize(dir).map_err(|_| {
        refused(
            p,
            std::io::ErrorKind::NotFound,
            format!("the folder {} does not exist", dir.display()),
        )
    })?;
    let name = p.file_name().ok_or_else(|| {
        refused(
            p,
            std::io::ErrorKind::InvalidInput,
            "is not a file name".into(),
        )
    })?;
    Ok(dir.join(name))
}

/// Check every output against the inputs, each other, and `--force`,
/// before any work starts.
pub fn check(inputs: &[PathBuf], outputs: &[PathBuf], force: bool) -> Result<()> {
    let ids: Vec<(u64, u64)> = inputs
        .iter()
        .filter_map(|i| std::fs::metadata(i).ok())
        .filter(|m| m.is_file())
        .map(|m| identity(&m))
        .collect();
    let canon: Vec<PathBuf> = inputs
        .iter()
        .filter_map(|i| std::fs::canonicalize(i).ok())
        .collect();
    let mut seen: Vec<(PathBuf, &Path)> = Vec::new();
    for o in outputs {
        let target = resolve(o)?;
        let meta = std::fs::metadata(&target).ok();
        if let Some(m) = &meta {
            if m.is_dir() {
                return Err(refused(
                    o,
                    std::io::ErrorKind::InvalidInput,
                    "is a folder, expected a file name".into(),
                ));
            }
            if special(m) {
                // /dev/null and the like: nothing to lose, may repeat.
                continue;
            }
            if ids.contains(&identity(m)) || canon.contains(&target) {
                return Err(refused(
                    o,
                    std::io::ErrorKind::AlreadyExists,
                    "is an input of this command: refusing to overwrite it".into(),
                ));
            }
        }
        if let Some((_, first)) = seen.iter().find(|(t, _)| *t == target) {
            return Err(refused(
                o,
                std::io::ErrorKind::AlreadyExists,
                format!(
                    "is named twice as an output (also as {}): one result would be lost",
                    first.display()
                ),
            ));
        }
        seen.push((target, o));
        if meta.is_some() && !force {
            return Err(refused(
                o,
                std::io::ErrorKind::AlreadyExists,
                "the file exists; use --force to overwrite it".into(),
            ));
        }
    }
    Ok(())
}

/// Queue an output for the end of the run.
pub fn queue(path: &Path, bytes: Vec<u8>) {
    if let Ok(mut p) = PENDING.lock() {
        p.push((path.to_path_buf(), bytes));
    }
}

/// Text for standard output, written after the files.
static STDOUT: Mutex<String> = Mutex::new(String::new());

/// Queue text for standard output.
pub fn queue_stdout(text: &str) {
    if let Ok(mut s) = STDOUT.lock() {
        s.push_str(text);
    }
}

/// Drop the queued outputs (the run failed).
pub fn discard() {
    if let Ok(mut p) = PENDING.lock() {
        p.clear();
    }
    if let Ok(mut s) = STDOUT.lock() {
        s.clear();
    }
}

/// Write every queued file, all or none, then the text for standard
/// output.
pub fn commit_queued(force: bool) -> Result<()> {
    let pending = std::mem::take(
        &mut *PENDING
            .lock()
            .map_err(|_| Error::Internal("output queue".into()))?,
    );
    let text = std::mem::take(
        &mut *STDOUT
            .lock()
            .map_err(|_| Error::Internal("output queue".into()))?,
    );
    write_all(&pending, force)?;
    if !text.is_empty() {
        let stdout = std::io::stdout();
        let mut lock = stdout.lock();
        lock.write_all(text.as_bytes())
            .and_then(|_| lock.flush())
            .map_err(|e| Error::io("standard output", e))?;
    }
    Ok(())
}

/// A temporary file beside `target`, registered for signal cleanup.
fn temp_beside(target: &Path, shown: &Path) -> Result<tempfile::NamedTempFile> {
    // Those of the file it replaces, or those of a new file.
    let perms = match std::fs::metadata(target) {
        Ok(m) => Some(m.permissions()),
        Err(_) => default_permissions(),
    };
    let mut b = tempfile::Builder::new();
    b.prefix(".beamsift-").suffix(".tmp");
    if let Some(p) = perms {
        b.permissions(p);
    }
    let t = b
        .tempfile_in(folder(target))
        .map_err(|e| Error::io(shown.display().to_string(), e))?;
    register(t.path());
    Ok(t)
}

/// The permissions of a new file as any program creates it (0666 less the
/// umask, applied by the system at creation).
#[cfg(unix)]
fn default_permissions() -> Option<std::fs::Permissions> {
    use std::os::unix::fs::PermissionsExt;
    Some(std::fs::Permissions::from_mode(0o666))
}

#[cfg(not(unix))]
fn default_permissions() -> Option<std::fs::Permissions> {
    None
}

/// One file moved into place, with what to undo.
struct Moved {
    target: PathBuf,
    /// The target existed before (without a backup it is left as written).
    existed: bool,
    /// The file it replaced, kept under a temporary name until all moves
    /// succeed.
    backup: Option<PathBuf>,
}

fn undo(moved: Vec<Moved>) {
    for m in moved.into_iter().rev() {
        match m.backup {
            Some(b) => {
                let _ = std::fs::rename(&b, &m.target);
                unregister(&b);
            }
            None if !m.existed => {
                let _ = std::fs::remove_file(&m.target);
            }
            None => {}
        }
    }
}

/// Write several outputs together: every temporary file is written and
/// flushed first, then devices are written, then all files are moved into
/// place; a failure puts back what was moved.
pub fn write_all(files: &[(PathBuf, Vec<u8>)], force: bool) -> Result<()> {
    let mut staged: Vec<(&PathBuf, tempfile::NamedTempFile, PathBuf)> = Vec::new();
    let mut direct = Vec::new();
    let forget = |staged: &[(&PathBuf, tempfile::NamedTempFile, PathBuf)]| {
        for (_, t, _) in staged {
            unregister(t.path());
        }
    };
    for (path, bytes) in files {
        let target = match resolve(path) {
            Ok(t) => t,
            Err(e) => {
                forget(&staged);
                return Err(e);
            }
        };
        if std::fs::metadata(&target).is_ok_and(|m| special(&m)) {
            direct.push((path, bytes));
            continue;
        }
        let mut t = match temp_beside(&target, path) {
            Ok(t) => t,
            Err(e) => {
                forget(&staged);
                return Err(e);
            }
        };
        let written = t
            .as_file_mut()
            .write_all(bytes)
            .and_then(|_| t.as_file().sync_all());
        if let Err(e) = written {
            unregister(t.path());
            forget(&staged);
            return Err(Error::io(path.display().to_string(), e));
        }
        staged.push((path, t, target));
    }
    for (path, bytes) in direct {
        let r = std::fs::OpenOptions::new()
            .write(true)
            .open(path)
            .and_then(|mut f| f.write_all(bytes).and_then(|_| f.flush()));
        if let Err(e) = r {
            forget(&staged);
            return Err(Error::io(path.display().to_string(), e));
        }
    }
    let mut moved: Vec<Moved> = Vec::new();
    let mut failure = None;
    let mut rest = staged.into_iter();
    for (path, t, target) in rest.by_ref() {
        let tmp = t.path().to_path_buf();
        let r = move_into_place(t, &target, force);
        unregister(&tmp);
        match r {
            Ok(m) => moved.push(m),
            Err(e) => {
                failure = Some(Error::io(path.display().to_string(), e));
                break;
            }
        }
    }
    for (_, t, _) in rest {
        unregister(t.path());
    }
    if let Some(e) = failure {
        undo(moved);
        return Err(e);
    }
    for m in moved {
        if let Some(b) = m.backup {
            let _ = std::fs::remove_file(&b);
            unregister(&b);
        }
    }
    Ok(())
}

/// Move a written temporary file onto its target: refusing to replace a
/// file without `force` (checked by the move itself), keeping a backup of
/// a replaced file until the whole group is in place.
fn move_into_place(
    t: tempfile::NamedTempFile,
    target: &Path,
    force: bool,
) -> std::io::Result<Moved> {
    if !force {
        t.persist_noclobber(target).map_err(|e| {
            if e.error.kind() == std::io::ErrorKind::AlreadyExists {
                std::io::Error::new(
                    std::io::ErrorKind::AlreadyExists,
                    "the file was created while beamsift ran (another run?): not replaced; use --force to overwrite it",
                )
            } else {
                e.error
            }
        })?;
        return Ok(Moved {
            target: target.to_path_buf(),
            existed: false,
            backup: None,
        });
    }
    let existed = target.exists();
    let backup = if existed {
        let b = tempfile::Builder::new()
            .prefix(".beamsift-")
            .suffix(".old")
            .make_in(folder(target), |p| std::fs::hard_link(target, p))
            .map(|b| b.into_temp_path().keep())
            .ok()
            .and_then(|r| r.ok());
        if let Some(b) = &b {
            register(b);
        }
        b
    } else {
        None
    };
    match t.persist(target) {
        Ok(_) => Ok(Moved {
            target: target.to_path_buf(),
            existed,
            backup,
        }),
        Err(e) => {
            if let Some(b) = backup {
                let _ = std::fs::remove_file(&b);
                unregister(&b);
            }
            Err(e.error)
        }
    }
}

/// A streamed output (a generated catalogue): written to a temporary file
/// beside its target and moved into place by `commit`, by the same rules.
pub struct StreamFile {
    target: PathBuf,
    shown: PathBuf,
    temp: Option<tempfile::NamedTempFile>,
    writer: Option<std::io::BufWriter<std::fs::File>>,
    direct: bool,
}

impl StreamFile {
    pub fn create(path: &Path) -> Result<StreamFile> {
        let target = resolve(path)?;
        if std::fs::metadata(&target).is_ok_and(|m| special(&m)) {
            let f = std::fs::OpenOptions::new()
                .write(true)
                .open(path)
                .map_err(|e| Error::io(path.display().to_string(), e))?;
            return Ok(StreamFile {
                target,
                shown: path.to_path_buf(),
                temp: None,
                writer: Some(std::io::BufWriter::with_capacity(1 << 20, f)),
                direct: true,
            });
        }
        let t = temp_beside(&target, path)?;
        let f = t
            .reopen()
            .map_err(|e| Error::io(path.display().to_string(), e))?;
        Ok(StreamFile {
            target,
            shown: path.to_path_buf(),
            temp: Some(t),
            writer: Some(std::io::BufWriter::with_capacity(1 << 20, f)),
            direct: false,
        })
    }

    pub fn writer(&mut self) -> &mut std::io::BufWriter<std::fs::File> {
        self.writer.as_mut().expect("open until commit")
    }

    pub fn commit(mut self, force: bool) -> Result<()> {
        let shown = self.shown.display().to_string();
        let w = self.writer.take().expect("open until commit");
        let f = w
            .into_inner()
            .map_err(|e| Error::io(&shown, e.into_error()))?;
        if self.direct {
            return Ok(());
        }
        f.sync_all().map_err(|e| Error::io(&shown, e))?;
        let t = self.temp.take().expect("a temporary file");
        let tmp = t.path().to_path_buf();
        let r = move_into_place(t, &self.target, force);
        unregister(&tmp);
        let m = r.map_err(|e| Error::io(&shown, e))?;
        if let Some(b) = m.backup {
            let _ = std::fs::remove_file(&b);
            unregister(&b);
        }
        Ok(())
    }
}

impl Drop for StreamFile {
    fn drop(&mut self) {
        if let Some(t) = self.temp.take() {
            unregister(t.path());
        }
    }
}

/// Was standard output open when the program started? The standard
/// library reopens a closed descriptor 1 on /dev/null (read-write) before
/// `main`, so a result written there would be lost without a word. On
/// Linux that case is told apart from a deliberate `>/dev/null` (opened
/// write-only by the shell) by the descriptor's flags in /proc; elsewhere
/// the descriptor is taken as open.
pub fn stdout_is_open() -> bool {
    let Ok(target) = std::fs::read_link("/proc/self/fd/1") else {
        return true;
    };
    if target != Path::new("/dev/null") {
        return true;
    }
    let Ok(info) = std::fs::read_to_string("/proc/self/fdinfo/1") else {
        return true;
    };
    let flags = info
        .lines()
        .find_map(|l| l.strip_prefix("flags:"))
        .and_then(|f| u32::from_str_radix(f.trim(), 8).ok());
    // O_ACCMODE = 3, O_RDWR = 2.
    !matches!(flags, Some(f) if f & 3 == 2)
}
