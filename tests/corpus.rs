//! Bad-input corpus: every file under tests/corpus/{catalog,job,schedule}
//! is fed to the real binary. Each run must end with the documented
//! bad-input exit code (2), a message naming the file and a line/column or
//! field, no panic, and no output file left behind. Then every case of
//! tests/corpus/cases.txt (a command, its documented exit code and the text
//! its message must hold, with the file's line and column where there is
//! one) runs in a scratch folder.

mod common;

use std::path::{Path, PathBuf};
use std::process::Command;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn files(dir: &str) -> Vec<PathBuf> {
    let mut v: Vec<PathBuf> = std::fs::read_dir(root().join("tests/corpus").join(dir))
        .unwrap()
        .map(|e| e.unwrap().path())
        .collect();
    v.sort();
    v
}

fn run_case(args: &[&str], file: &Path, failures: &mut Vec<String>) {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out.txt");
    let o = Command::new(env!("CARGO_BIN_EXE_beamsift"))
        .args(args)
        .arg("-o")
        .arg(&out)
        .current_dir(root())
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    let shown = file
        .strip_prefix(root())
        .unwrap_or(file)
        .display()
        .to_string();
    let name = file.file_name().unwrap().to_string_lossy().to_string();
    let mut why = Vec::new();
    if o.status.code() != Some(2) {
        why.push(format!("exit {:?} (expected 2)", o.status.code()));
    }
    if err.contains("panicked") || err.contains("RUST_BACKTRACE") {
        why.push("panicked".into());
    }
    // The file is named and followed by ':' (a line, or a field).
    let named = err
        .find(&name)
        .map(|i| err[i + name.len()..].starts_with(':'))
        .unwrap_or(false);
    if !named {
        why.push("message does not name the file with a line, column or field".into());
    }
    if out.exists() || std::fs::read_dir(dir.path()).unwrap().count() > 0 {
        why.push("an output file was left behind".into());
    }
    if !why.is_empty() {
        failures.push(format!(
            "{shown}: {} — stderr: {}",
            why.join("; "),
            err.trim()
        ));
    }
}

#[test]
fn every_bad_input_is_refused_clearly() {
    let mut failures = Vec::new();
    let mut n = 0;
    for f in files("catalog") {
        n += 1;
        let p = f.to_string_lossy().to_string();
        run_case(
            &[
                "select",
                "--job",
                "catalogs/demo-joists.toml",
                "-c",
                &p,
                "-q",
            ],
            &f,
            &mut failures,
        );
    }
    for f in files("job") {
        n += 1;
        let p = f.to_string_lossy().to_string();
        run_case(
            &["check", "--job", &p, "rect", "b=100mm", "d=300mm"],
            &f,
            &mut failures,
        );
    }
    for f in files("schedule") {
        n += 1;
        let p = f.to_string_lossy().to_string();
        run_case(
            &[
                "batch",
                "--schedule",
                &p,
                "--job",
                "catalogs/demo-job.toml",
                "-c",
                "catalogs/demo-steel.csv",
            ],
            &f,
            &mut failures,
        );
    }
    assert!(n >= 50, "the corpus has {n} cases; at least 50 expected");
    assert!(
        failures.is_empty(),
        "{} of {n} cases failed:\n{}",
        failures.len(),
        failures.join("\n")
    );
}

/// Snapshot of a folder's files (name, length, modified), to see that a
/// refused command wrote nothing.
fn listing(dir: &Path) -> Vec<(PathBuf, u64, std::time::SystemTime)> {
    let mut v = Vec::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        for e in std::fs::read_dir(&d).unwrap() {
            let e = e.unwrap();
            let m = e.metadata().unwrap();
            if m.is_dir() {
                stack.push(e.path());
            } else {
                v.push((e.path(), m.len(), m.modified().unwrap()));
            }
        }
    }
    v.sort();
    v
}

#[test]
fn every_listed_case_ends_as_documented() {
    let text = std::fs::read_to_string(root().join("tests/corpus/cases.txt")).unwrap();
    let scratch = tempfile::tempdir().unwrap();
    common::copy_dir(&root().join("catalogs"), &scratch.path().join("catalogs"));
    common::copy_dir(
        &root().join("tests/corpus/cases"),
        &scratch.path().join("cases"),
    );
    let mut failures = Vec::new();
    let mut n = 0;
    for (k, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        n += 1;
        let parts: Vec<&str> = line.splitn(3, " | ").collect();
        assert_eq!(
            parts.len(),
            3,
            "cases.txt:{}: expected 'exit | text | arguments'",
            k + 1
        );
        let exit: i32 = parts[0].trim().parse().unwrap();
        let want = parts[1].replace("\\n", "\n");
        let (args, stdin) = match parts[2].split_once(" < ") {
            Some((a, f)) => (a, Some(f.trim())),
            None => (parts[2], None),
        };
        let args: Vec<&str> = args.split_whitespace().collect();
        let before = listing(scratch.path());
        let mut cmd = Command::new(env!("CARGO_BIN_EXE_beamsift"));
        cmd.args(&args).current_dir(scratch.path());
        cmd.stdin(match stdin {
            Some(f) => {
                std::process::Stdio::from(std::fs::File::open(scratch.path().join(f)).unwrap())
            }
            None => std::process::Stdio::null(),
        });
        let o = cmd.output().unwrap();
        let all = format!(
            "{}{}",
            String::from_utf8_lossy(&o.stdout),
            String::from_utf8_lossy(&o.stderr)
        );
        let mut why = Vec::new();
        if o.status.code() != Some(exit) {
            why.push(format!("exit {:?} (expected {exit})", o.status.code()));
        }
        if !all.contains(&want) {
            why.push(format!("output does not hold '{want}'"));
        }
        if all.contains("panicked") || all.contains("internal error") {
            why.push("panicked".into());
        }
        if exit != 0 && listing(scratch.path()) != before {
            why.push("a refused command changed the folder".into());
        }
        if !why.is_empty() {
            failures.push(format!(
                "cases.txt:{}: {} — {}",
                k + 1,
                why.join("; "),
                all.lines().take(4).collect::<Vec<_>>().join(" / ")
            ));
        }
    }
    assert!(n >= 60, "cases.txt has {n} cases; at least 60 expected");
    assert!(
        failures.is_empty(),
        "{} of {n} cases failed:\n{}",
        failures.len(),
        failures.join("\n")
    );
}
