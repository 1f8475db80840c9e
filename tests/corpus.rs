//! Bad-input corpus: every file under tests/corpus/{catalog,job,schedule}
//! is fed to the real binary. Each run must end with the documented
//! bad-input exit code (2), a message naming the file and a line/column or
//! field, no panic, and no output file left behind. Then every case of
//! tests/corpus/cases.trycmd (a command, its documented exit code and all
//! it prints, with the text its message must hold: the file's line and
//! column where there is one) runs by trycmd in a scratch folder.

mod common;

use std::path::{Path, PathBuf};

fn root() -> PathBuf {
    common::repo("")
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
    let o = common::bin()
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

/// The cases of tests/corpus/cases.trycmd, run by trycmd in a scratch
/// folder; then every case's expected output must hold the text its
/// `Holds:` line names and no panic, and the folder must be as it was.
#[test]
fn every_listed_case_ends_as_documented() {
    let src = root().join("tests/corpus/cases.trycmd");
    let scratch = tempfile::tempdir().unwrap();
    let base = scratch.path().join("cases.in");
    common::copy_dir(&root().join("catalogs"), &base.join("catalogs"));
    common::copy_dir(&root().join("tests/corpus/cases"), &base.join("cases"));
    let case = scratch.path().join("cases.trycmd");
    std::fs::copy(&src, &case).unwrap();
    let before = listing(&base);
    let bin = std::path::Path::new(env!("CARGO_BIN_EXE_beamsift"));
    trycmd::TestCases::new()
        .register_bin("beamsift", bin)
        // For the cases that read standard input from a file.
        .register_bin("sh", std::path::Path::new("/bin/sh"))
        .env("BEAMSIFT", bin.to_string_lossy())
        .case(&case)
        .run();
    if std::env::var_os("TRYCMD").is_some_and(|m| m == "overwrite") {
        std::fs::copy(&case, &src).unwrap();
    }
    assert!(
        listing(&base) == before,
        "a case changed the scratch folder (no case in cases.trycmd may write a file)"
    );
    let text = std::fs::read_to_string(&src).unwrap();
    let mut failures = Vec::new();
    let mut n = 0;
    let mut holds: Option<(usize, String)> = None;
    let mut lines = text.lines().enumerate();
    while let Some((k, l)) = lines.next() {
        if let Some(h) = l.strip_prefix("Holds: `").and_then(|h| h.strip_suffix('`')) {
            holds = Some((k + 1, h.replace("\\n", "\n")));
        } else if l == "```console" {
            n += 1;
            let body: Vec<&str> = lines
                .by_ref()
                .map(|x| x.1)
                .take_while(|x| *x != "```")
                .collect();
            let Some((at, want)) = holds.take() else {
                failures.push(format!(
                    "cases.trycmd:{}: no 'Holds:' line before the case",
                    k + 1
                ));
                continue;
            };
            // `? N`: the exit code; none for 0 (trycmd's default, success).
            let status = body.get(1).and_then(|s| s.strip_prefix("? "));
            if !body[0].starts_with("$ ") || status.is_some_and(|s| s.parse::<i32>().is_err()) {
                failures.push(format!(
                    "cases.trycmd:{}: expected '$ command' and '? exit code'",
                    k + 2
                ));
                continue;
            }
            let expected = body[if status.is_some() { 2 } else { 1 }..].join("\n");
            if !expected.contains(&want) {
                failures.push(format!(
                    "cases.trycmd:{at}: the output does not hold '{want}'"
                ));
            }
            if expected.contains("panicked") || expected.contains("internal error") {
                failures.push(format!("cases.trycmd:{}: panicked", k + 2));
            }
        }
    }
    assert!(n >= 60, "cases.trycmd has {n} cases; at least 60 expected");
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
