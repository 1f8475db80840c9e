//! Every command the README shows runs, succeeds, and prints what the
//! README says it prints (the lines shown, in order; `…` marks lines left
//! out). Commands run in a scratch folder holding a copy of catalogs/.

mod common;

use std::path::{Path, PathBuf};
use std::process::Command;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn split(cmd: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut cur = String::new();
    let mut quote = None;
    let mut any = false;
    for ch in cmd.chars() {
        match (quote, ch) {
            (None, '\'' | '"') => {
                quote = Some(ch);
                any = true;
            }
            (Some(q), c) if c == q => quote = None,
            (None, ' ') => {
                if any {
                    out.push(std::mem::take(&mut cur));
                    any = false;
                }
            }
            (_, c) => {
                cur.push(c);
                any = true;
            }
        }
    }
    if any {
        out.push(cur);
    }
    out
}

fn run(args: &[String], dir: &Path) -> (i32, String, String) {
    let o = Command::new(env!("CARGO_BIN_EXE_beamsift"))
        .args(args)
        .current_dir(dir)
        .output()
        .unwrap();
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

#[test]
fn readme_commands_run_and_print_what_the_readme_shows() {
    let readme = std::fs::read_to_string(root().join("README.md")).unwrap();
    let scratch = tempfile::tempdir().unwrap();
    common::copy_dir(&root().join("catalogs"), &scratch.path().join("catalogs"));
    let mut blocks: Vec<(String, Vec<String>)> = Vec::new();
    let mut lines = readme.lines();
    let mut sh_commands = Vec::new();
    while let Some(l) = lines.next() {
        if l.trim_start().starts_with("```") {
            let lang = l.trim_start().trim_start_matches('`').to_string();
            let body: Vec<String> = lines
                .by_ref()
                .take_while(|x| !x.trim_start().starts_with("```"))
                .map(|s| s.to_string())
                .collect();
            if lang == "text" && body.first().is_some_and(|f| f.starts_with("$ beamsift ")) {
                blocks.push((body[0][2..].to_string(), body[1..].to_vec()));
            } else if lang == "sh" {
                for c in body {
                    let c = c.trim();
                    if let Some(rest) = c.strip_prefix("cargo run --release -- ") {
                        sh_commands.push(format!("beamsift {rest}"));
                    } else if c.starts_with("beamsift ") && !c.ends_with('\\') {
                        sh_commands.push(c.to_string());
                    }
                }
            }
        }
    }
    assert!(
        blocks.len() >= 8,
        "the README tour shows {} commands",
        blocks.len()
    );
    let mut failures = Vec::new();
    for (cmd, want) in &blocks {
        let args = split(cmd);
        let (code, out, err) = run(&args[1..], scratch.path());
        if code != 0 {
            failures.push(format!("`{cmd}` exited {code}: {err}"));
            continue;
        }
        let got: Vec<&str> = out.lines().map(|l| l.trim_end()).collect();
        let mut at = 0;
        for w in want.iter().filter(|w| w.trim() != "…") {
            match got[at..].iter().position(|g| *g == w.trim_end()) {
                Some(p) => at += p + 1,
                None => {
                    failures.push(format!(
                        "`{cmd}`: README line not in the output (in order): {w:?}"
                    ));
                    break;
                }
            }
        }
    }
    for cmd in &sh_commands {
        let args = split(cmd);
        let (code, _, err) = run(&args[1..], scratch.path());
        // A second run of a command writing files needs --force; the tour
        // commands are independent, so each must succeed on its own.
        if code != 0 && !err.contains("--force") {
            failures.push(format!("`{cmd}` exited {code}: {err}"));
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
