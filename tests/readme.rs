//! Every command the README shows runs, succeeds, and prints what the
//! README says it prints. README.md stays the source: each of its ```text
//! blocks that starts with `$ beamsift` becomes a trycmd `console` block
//! (the README's `…` line, "lines left out here", is trycmd's `...`), and
//! each `beamsift` command of its ```sh blocks a command whose output is
//! not shown. trycmd splits the commands (shlex), runs them one after the
//! other in a scratch folder holding a copy of catalogs/, and matches each
//! output exactly between the elisions: a README line the output does not
//! print there, in that order and next to the lines shown with it, fails.

mod common;

/// The README's tour as a trycmd file, and how many shown outputs it has.
fn tour(readme: &str) -> (String, usize) {
    let mut out = String::new();
    let mut shown = 0;
    let mut lines = readme.lines();
    while let Some(l) = lines.next() {
        let Some(lang) = l.trim_start().strip_prefix("```") else {
            continue;
        };
        let lang = lang.to_string();
        let body: Vec<&str> = lines
            .by_ref()
            .take_while(|x| !x.trim_start().starts_with("```"))
            .collect();
        if lang == "text" && body.first().is_some_and(|f| f.starts_with("$ beamsift ")) {
            shown += 1;
            out.push_str("```console\n");
            for b in &body {
                out.push_str(if b.trim() == "…" { "..." } else { b });
                out.push('\n');
            }
            // trycmd drops the block's last line break: an output shown to
            // its end keeps its own.
            if body.last().is_some_and(|b| b.trim() != "…") {
                out.push('\n');
            }
            out.push_str("```\n\n");
        } else if lang == "sh" {
            for c in body {
                let c = c.trim();
                let cmd = match c.strip_prefix("cargo run --release -- ") {
                    Some(rest) => format!("beamsift {rest}"),
                    None if c.starts_with("beamsift ") && !c.ends_with('\\') => c.to_string(),
                    None => continue,
                };
                out.push_str(&format!("```console\n$ {cmd}\n...\n```\n\n"));
            }
        }
    }
    (out, shown)
}

#[test]
fn readme_commands_run_and_print_what_the_readme_shows() {
    // TRYCMD=overwrite would rewrite the scratch copy and pass: the README
    // is edited by hand, never overwritten.
    assert!(
        std::env::var_os("TRYCMD").is_none(),
        "the README tour runs only as a check: unset TRYCMD and edit README.md"
    );
    let readme = std::fs::read_to_string(common::repo("README.md")).unwrap();
    let (tour, shown) = tour(&readme);
    assert!(shown >= 8, "the README tour shows {shown} commands");
    let scratch = tempfile::tempdir().unwrap();
    common::copy_dir(
        &common::repo("catalogs"),
        &scratch.path().join("tour.in/catalogs"),
    );
    let case = scratch.path().join("tour.trycmd");
    std::fs::write(&case, tour).unwrap();
    trycmd::TestCases::new()
        .register_bin(
            "beamsift",
            std::path::Path::new(env!("CARGO_BIN_EXE_beamsift")),
        )
        .case(&case)
        .run();
}
