//! The layers of DEVELOPERS.md hold: the core (units, section, beam,
//! check) does no I/O and imports nothing above it, the library knows no
//! command line, and no command file imports another. Read from the
//! source, so a change that breaks a layer fails here, by name.

use std::path::{Path, PathBuf};

fn files(dir: &Path, out: &mut Vec<PathBuf>) {
    for e in std::fs::read_dir(dir).unwrap() {
        let p = e.unwrap().path();
        if p.is_dir() {
            files(&p, out);
        } else if p.extension().is_some_and(|x| x == "rs") {
            out.push(p);
        }
    }
}

fn src(rel: &str) -> Vec<(String, String)> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let p = root.join(rel);
    let mut v = Vec::new();
    if p.is_dir() {
        files(&p, &mut v);
    } else {
        v.push(p);
    }
    v.into_iter()
        .map(|p| {
            let text = std::fs::read_to_string(&p).unwrap();
            let name = p.strip_prefix(&root).unwrap().display().to_string();
            // Code only: drop comment lines.
            let code: String = text
                .lines()
                .filter(|l| !l.trim_start().starts_with("//"))
                .map(|l| format!("{l}\n"))
                .collect();
            (name, code)
        })
        .collect()
}

/// Modules above the core.
const ABOVE_CORE: [&str; 10] = [
    "job", "catalog", "search", "optimise", "sweep", "report", "member", "files", "cli", "main",
];

#[test]
fn the_core_imports_nothing_above_it_and_does_no_io() {
    let mut problems = Vec::new();
    for part in ["units.rs", "section", "beam", "check"] {
        for (name, code) in src(part) {
            for m in ABOVE_CORE {
                if code.contains(&format!("crate::{m}::")) || code.contains(&format!("crate::{m};"))
                {
                    problems.push(format!("{name} uses crate::{m}"));
                }
            }
            for io in [
                "std::fs",
                "std::io::stdin",
                "std::io::stdout",
                "println!",
                "eprintln!",
                "File::",
            ] {
                if code.contains(io) {
                    problems.push(format!("{name} does I/O ({io})"));
                }
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
}

#[test]
fn the_core_layers_import_only_downward() {
    // units < section < beam < check.
    let order = ["units", "section", "beam", "check"];
    let mut problems = Vec::new();
    for (i, part) in ["units.rs", "section", "beam", "check"].iter().enumerate() {
        for (name, code) in src(part) {
            for above in &order[i + 1..] {
                if code.contains(&format!("crate::{above}::")) {
                    problems.push(format!("{name} uses crate::{above}"));
                }
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
}

#[test]
fn the_library_knows_no_command_line() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut all = Vec::new();
    files(&root, &mut all);
    let mut problems = Vec::new();
    for p in all {
        let name = p.strip_prefix(&root).unwrap().display().to_string();
        if name.starts_with("cli") || name == "main.rs" {
            continue;
        }
        let code = std::fs::read_to_string(&p).unwrap();
        for word in [
            "clap",
            "indicatif",
            "ctrlc",
            "std::process::exit",
            "crate::cli",
        ] {
            if code.contains(word) {
                problems.push(format!("{name} mentions {word}"));
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
}

#[test]
fn no_command_file_imports_another() {
    // Shared pieces live in catargs, jobargs, output, progress and values;
    // a command file (one per command) never reaches into another.
    let commands = [
        "analyse", "batch", "catalog", "check", "optimise", "report", "section", "select", "sweep",
    ];
    let mut problems = Vec::new();
    for (name, code) in src("cli") {
        for c in commands {
            if name != format!("cli/{c}.rs")
                && name != "cli/mod.rs"
                && (code.contains(&format!("super::{c}::"))
                    || code.contains(&format!("super::{c};")))
            {
                problems.push(format!("{name} imports cli::{c}"));
            }
        }
    }
    assert!(problems.is_empty(), "{problems:#?}");
}

#[test]
fn the_library_modules_form_no_cycle() {
    // Top-level modules and the modules each one uses (code only).
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut all = Vec::new();
    files(&root, &mut all);
    let mut uses: std::collections::BTreeMap<String, std::collections::BTreeSet<String>> =
        Default::default();
    for p in all {
        let rel = p.strip_prefix(&root).unwrap().display().to_string();
        let top = rel
            .split('/')
            .next()
            .unwrap()
            .trim_end_matches(".rs")
            .to_string();
        if top == "cli" || top == "main" || top == "lib" {
            continue;
        }
        for (_, code) in src(&rel) {
            for part in code.split("crate::").skip(1) {
                let m: String = part
                    .chars()
                    .take_while(|c| c.is_ascii_lowercase() || *c == '_')
                    .collect();
                if !m.is_empty() && m != top && !m.chars().all(|c| c == '_') {
                    uses.entry(top.clone()).or_default().insert(m);
                }
            }
        }
    }
    // Depth-first search for a path back to each module.
    let mut cycles = Vec::new();
    for (a, targets) in &uses {
        for b in targets {
            let mut stack = vec![b.clone()];
            let mut seen = std::collections::BTreeSet::new();
            while let Some(x) = stack.pop() {
                if &x == a {
                    cycles.push(format!("{a} -> {b} -> … -> {a}"));
                    break;
                }
                if seen.insert(x.clone()) {
                    stack.extend(uses.get(&x).into_iter().flatten().cloned());
                }
            }
        }
    }
    assert!(cycles.is_empty(), "{cycles:#?}\nuses: {uses:#?}");
}

#[test]
fn unsafe_code_is_only_the_prefetch_hint() {
    // The library denies unsafe code; the one allowed site is the cache
    // prefetch of the duplicate filter (a hint that cannot fault). Every
    // use of the word `unsafe` in code (any form: blocks, functions,
    // traits, impls, extern, attributes) and every `allow(unsafe_code)`
    // must be there.
    let mut words = Vec::new();
    let mut allows = Vec::new();
    for (name, code) in src("") {
        for l in code.lines() {
            let bare = l.replace("unsafe_code", "");
            let has_word = bare.match_indices("unsafe").any(|(i, _)| {
                let before = bare[..i].chars().next_back();
                let after = bare[i + 6..].chars().next();
                let ident = |c: Option<char>| c.is_some_and(|c| c.is_alphanumeric() || c == '_');
                !ident(before) && !ident(after)
            });
            if has_word {
                words.push(format!("{name}: {}", l.trim()));
            }
            if l.contains("allow(unsafe_code)") {
                allows.push(name.clone());
            }
        }
    }
    assert_eq!(
        allows,
        vec!["search/duplicates.rs".to_string()],
        "{allows:?}"
    );
    assert!(
        !words.is_empty()
            && words
                .iter()
                .all(|w| w.starts_with("search/duplicates.rs: ")),
        "{words:#?}"
    );
    let lib = &src("lib.rs")[0].1;
    assert!(
        lib.contains("#![deny(unsafe_code)]"),
        "lib.rs must deny unsafe code"
    );
    let main = &src("main.rs")[0].1;
    assert!(
        main.contains("#![forbid(unsafe_code)]"),
        "main.rs must forbid unsafe code"
    );
}
