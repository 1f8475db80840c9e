//! Bad-input corpus: every file under tests/corpus/ is fed to the real
//! binary. Each run must end with the documented bad-input exit code (2),
//! a message naming the file and a line/column or field, no panic, and no
//! output file left behind.

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
