//! No option is ever ignored silently: every option of every command that
//! takes a job is run together with `--job` on the demo, and must either
//! change the output (text or JSON) or be refused with exit code 2 and a
//! message naming it. The options are read from each command's `--help`,
//! so a new option without a row in the table below fails this test until
//! it is classified. The few options that cannot change a result by design
//! (progress display, thread count) are listed with the reason, and the test
//! asserts their output is identical.

mod common;

use common::{repo, run_in, text};
use std::collections::BTreeMap;
use std::path::Path;

#[derive(Clone, Copy, Debug, PartialEq)]
enum Expect {
    /// The output (text or JSON) differs from the base run.
    Changes,
    /// Exit code 2, the message names the option.
    Refused,
    /// Identical output by design (the reason is the string).
    Same(&'static str),
    /// Writes a file (the path is the argument after the option).
    Writes,
    /// Handled apart (--force).
    Special,
}

use Expect::*;

/// (command words, base arguments after them).
fn commands() -> Vec<(&'static str, Vec<String>)> {
    let s = |p: &str| repo(p).to_str().unwrap().to_string();
    let job = s("catalogs/demo-job.toml");
    let steel = s("catalogs/demo-steel.csv");
    let v = |xs: &[&str]| xs.iter().map(|x| x.to_string()).collect::<Vec<_>>();
    vec![
        (
            "check",
            [
                v(&["--job"]),
                vec![job.clone()],
                v(&["welded-i", "bf=120mm", "tf=8mm", "hw=420mm", "tw=6mm"]),
            ]
            .concat(),
        ),
        (
            "analyse",
            [
                v(&["--job"]),
                vec![job.clone()],
                v(&["welded-i", "bf=120mm", "tf=8mm", "hw=420mm", "tw=6mm"]),
            ]
            .concat(),
        ),
        (
            "select",
            [
                v(&["--job"]),
                vec![job.clone()],
                v(&["-c"]),
                vec![steel.clone()],
            ]
            .concat(),
        ),
        (
            "shortlist",
            [
                v(&["--job"]),
                vec![job.clone()],
                v(&["-c"]),
                vec![steel.clone()],
            ]
            .concat(),
        ),
        (
            "batch",
            [
                v(&["--schedule"]),
                vec![s("catalogs/demo-schedule.csv")],
                v(&["--job"]),
                vec![job.clone()],
                v(&["-c"]),
                vec![steel.clone()],
            ]
            .concat(),
        ),
        (
            "optimise",
            [v(&["--job"]), vec![job.clone()], v(&["welded-i"])].concat(),
        ),
        (
            "report",
            [
                v(&["--job"]),
                vec![job.clone()],
                v(&["-c"]),
                vec![steel.clone()],
                v(&["--to", "sheet"]),
            ]
            .concat(),
        ),
        (
            "sweep lightest",
            [
                v(&["--job"]),
                vec![job.clone()],
                v(&["-c"]),
                vec![steel.clone()],
                v(&["--spans", "4m..8m:2m"]),
            ]
            .concat(),
        ),
        (
            "sweep table",
            [
                v(&["--job"]),
                vec![s("catalogs/demo-joists.toml")],
                v(&["-c"]),
                vec![s("catalogs/demo-timber.csv")],
                v(&["--spacings", "400,600mm"]),
            ]
            .concat(),
        ),
    ]
}

/// What each option does with --job, and a value to try. Keys are
/// "command --option" or "* --option" for every command.
fn table() -> BTreeMap<&'static str, (Expect, Vec<&'static str>)> {
    let mut t: BTreeMap<&'static str, (Expect, Vec<&'static str>)> = BTreeMap::new();
    let mut add = |k: &'static str, e: Expect, a: &[&'static str]| {
        t.insert(k, (e, a.to_vec()));
    };
    // Output options.
    add("* --units", Changes, &["--units", "us"]);
    add("* --format", Changes, &["--format", "csv"]);
    add("* --json", Changes, &["--json"]);
    add("* --output", Writes, &["-o", "out.txt"]);
    add("* --force", Special, &[]);
    // The beam, loads and combinations come from the job file: refused.
    for k in [
        "* --span",
        "* --supports",
        "* --dead",
        "* --live",
        "* --snow",
        "* --dead-point",
        "* --live-point",
        "* --preset",
        "* --limit-live",
        "* --limit-total",
    ] {
        add(k, Refused, &[]);
    }
    // Material and checks override the job's values.
    add("* --E", Changes, &["--E", "150GPa"]);
    add("* --Fb", Changes, &["--Fb", "60MPa"]);
    add("* --Fv", Changes, &["--Fv", "15MPa"]);
    add("* --Fy", Changes, &["--Fy", "100MPa"]);
    // The joists' material is timber: Fy has no method there.
    add("sweep table --Fy", Refused, &["--Fy", "100MPa"]);
    add("* --density", Changes, &["--density", "7700kg/m3"]);
    // The demo steel rows give their mass: a density within 5 % only
    // cross-checks it (beyond 5 % the rows are refused).
    add(
        "shortlist --density",
        Same("catalogue rows give their mass; the density only cross-checks it (within 5 %)"),
        &["--density", "7700kg/m3"],
    );
    add("report --format", Refused, &["--format", "csv"]);
    add("* --Emin", Refused, &["--Emin", "5GPa"]);
    // The joists' demo material is timber: Emin replaces the job's.
    add("sweep table --Emin", Changes, &["--Emin", "5GPa"]);
    // The demo jobs give values only their own kind uses (Fy for steel,
    // Emin for timber): another kind would ignore them, so it is refused.
    add("* --kind", Refused, &["--kind", "other"]);
    add("* --bracing", Changes, &["--bracing", "1m"]);
    add("* --braced-flange", Changes, &["--braced-flange", "both"]);
    add("* --load-height", Changes, &["--load-height", "top_flange"]);
    // Timber beam stability uses NDS Table 3.3.3 effective lengths, which
    // the steel load-height option would not change: refused.
    add(
        "sweep table --load-height",
        Refused,
        &["--load-height", "top_flange"],
    );
    add("* --exclude", Changes, &["--exclude", "deflection"]);
    add("* --no-self-weight", Changes, &["--no-self-weight"]);
    // analyse checks no section: the check-only options are refused.
    for k in [
        "analyse --Fb",
        "analyse --Fv",
        "analyse --Fy",
        "analyse --kind",
        "analyse --bracing",
        "analyse --braced-flange",
        "analyse --load-height",
        "analyse --exclude",
    ] {
        add(k, Refused, &[]);
    }
    add("analyse --Ix", Refused, &["--Ix", "100e6mm4"]);
    add("analyse --stations", Changes, &["--stations"]);
    add("check --report", Writes, &["--report", "sheet"]);
    // Catalogue options.
    add("* --catalog", Changes, &["-c", "CATALOG2"]);
    add("* --delimiter", Refused, &["--delimiter", ";"]);
    // Spreadsheet-output options only apply with --format csv-numeric (or, for
    // --decimal-comma, with a ';' or tab delimiter): refused when given alone.
    add("* --table", Refused, &["--table", "ranking"]);
    add("* --bom", Refused, &["--bom"]);
    add("* --out-decimal-comma", Refused, &["--out-decimal-comma"]);
    add("* --decimal-comma", Refused, &["--decimal-comma"]);
    add("* --skip-bad-rows", Changes, &["--skip-bad-rows"]);
    add("* --max-depth", Changes, &["--max-depth", "300mm"]);
    add("* --min-depth", Changes, &["--min-depth", "400mm"]);
    add("* --max-width", Changes, &["--max-width", "60mm"]);
    add("* --grade", Refused, &["--grade", "X"]);
    add("* --in-stock", Changes, &["--in-stock"]);
    add("* --name", Changes, &["--name", "NB 3*"]);
    add(
        "* --jobs",
        Same("the thread count never changes a result (determinism tests)"),
        &["--jobs", "1"],
    );
    add(
        "* --quiet",
        Same("hides the progress bar, which is drawn only on a terminal"),
        &["--quiet"],
    );
    // select / shortlist.
    add("select --rank", Changes, &["--rank", "cost"]);
    add("* --top", Changes, &["--top", "2"]);
    add("select --all", Changes, &["--all"]);
    add("select --near", Changes, &["--near", "1"]);
    add(
        "select --include-unverified",
        Changes,
        &["--include-unverified"],
    );
    add("select --report", Writes, &["--report", "sheet"]);
    add("shortlist --count", Changes, &["--count", "3"]);
    add("shortlist --length", Changes, &["--length", "5m"]);
    // batch.
    add("batch --schedule", Changes, &[]);
    add("batch --max-sizes", Changes, &["--max-sizes", "2"]);
    add("batch --objective", Changes, &["--objective", "cost"]);
    add(
        "batch --stock-lengths",
        Changes,
        &["--stock-lengths", "6m,12m"],
    );
    add("batch --kerf", Refused, &["--kerf", "3mm"]);
    // The demo steel catalogue has prices: wastage and allowances change
    // the line costs.
    add("batch --wastage", Changes, &["--wastage", "5%"]);
    add("batch --allowance", Changes, &["--allowance", "paint=3%"]);
    // optimise.
    add("optimise --bound", Changes, &["--bound", "tw=8mm..20mm"]);
    add("optimise --max-depth", Changes, &["--max-depth", "450mm"]);
    add("optimise --min-depth", Changes, &["--min-depth", "700mm"]);
    add("optimise --aspect", Refused, &["--aspect", "4"]);
    add("optimise --lambda-f", Changes, &["--lambda-f", "6"]);
    add("optimise --lambda-w", Changes, &["--lambda-w", "60"]);
    add("optimise --compact", Changes, &["--compact"]);
    add("optimise --objective", Refused, &["--objective", "cost"]);
    add("optimise --plates", Changes, &["--plates", "8,12,16mm"]);
    add(
        "optimise --plate-prices",
        Refused,
        &["--plate-prices", "1,1,1"],
    );
    add("optimise --step", Changes, &["--step", "25mm"]);
    add("optimise --b-sizes", Refused, &["--b-sizes", "100,150mm"]);
    add("optimise --d-sizes", Refused, &["--d-sizes", "300,400mm"]);
    add("optimise --starts", Changes, &["--starts", "2"]);
    // report.
    add("report --section", Changes, &["--section", "NB 400 L"]);
    // check and optimise take a catalogue row only by name: with the base
    // run's shape (check) or without --section (optimise), each catalogue
    // option is refused by name.
    add("check --section", Refused, &["--section", "NB 400 L"]);
    add("check --catalog", Refused, &["-c", "CATALOG2"]);
    for opt in [
        &["--skip-bad-rows"][..],
        &["--max-depth", "300mm"],
        &["--min-depth", "400mm"],
        &["--max-width", "60mm"],
        &["--in-stock"],
        &["--name", "NB 3*"],
        &["--jobs", "1"],
    ] {
        add(format!("check {}", opt[0]).leak(), Refused, opt);
    }
    add("optimise --section", Refused, &["--section", "NB 400 L"]);
    add("optimise --catalog", Refused, &["-c", "CATALOG2"]);
    add("report --to", Changes, &[]);
    // sweeps.
    add("sweep lightest --spans", Changes, &[]);
    add(
        "sweep lightest --optimise",
        Changes,
        &["--optimise", "welded-i"],
    );
    add("* --chart", Writes, &["--chart", "chart.svg"]);
    add("sweep table --spacings", Changes, &[]);
    // The base run gives --spacings: the two column kinds are exclusive.
    add(
        "sweep table --live-levels",
        Refused,
        &["--live-levels", "1.5kPa,4kPa"],
    );
    add("sweep table --round", Changes, &["--round", "100mm"]);
    add("sweep table --tolerance", Changes, &["--tolerance", "5mm"]);
    t
}

/// The long options a command's --help lists (without --help and --job).
fn options_of(dir: &Path, cmd: &str) -> Vec<String> {
    let words: Vec<&str> = cmd.split(' ').chain(["--help"]).collect();
    let (out, _) = text(&run_in(dir, &words));
    let mut v = Vec::new();
    for line in out.lines() {
        let t = line.trim_start();
        let t = if t.starts_with('-') && t.chars().nth(1).is_some_and(|c| c != '-') {
            t.split_once(", ").map(|x| x.1).unwrap_or(t)
        } else {
            t
        };
        if let Some(rest) = t.strip_prefix("--") {
            let name: String = rest
                .chars()
                .take_while(|c| c.is_alphanumeric() || *c == '-')
                .collect();
            let o = format!("--{name}");
            if !["--help", "--job", "--version"].contains(&o.as_str()) && !v.contains(&o) {
                v.push(o);
            }
        }
    }
    v
}

/// The output without the lines that list what came from the command line,
/// so "changes" means the engine's result changed.
fn strip(s: &str) -> String {
    let mut out = Vec::new();
    let mut skipping = false;
    for l in s.lines() {
        if l.contains("from the command line") {
            skipping = true;
            continue;
        }
        // The wrapped continuation of the note.
        if skipping && l.starts_with("    ") && !l.trim_start().starts_with('-') {
            continue;
        }
        skipping = false;
        out.push(l);
    }
    out.join("\n")
}

fn run_cmd(
    dir: &Path,
    cmd: &str,
    base: &[String],
    extra: &[String],
    json: bool,
) -> (i32, String, String) {
    let mut args: Vec<String> = cmd.split(' ').map(String::from).collect();
    args.extend(base.iter().cloned());
    args.extend(extra.iter().cloned());
    if json {
        args.push("--json".into());
    }
    let refs: Vec<&str> = args.iter().map(String::as_str).collect();
    let o = run_in(dir, &refs);
    let (out, err) = text(&o);
    // A report's content is in its file.
    let sheet = std::fs::read_to_string(dir.join("sheet.md")).unwrap_or_default();
    let _ = std::fs::remove_file(dir.join("sheet.md"));
    let _ = std::fs::remove_file(dir.join("sheet.html"));
    (o.status.code().unwrap_or(-1), strip(&(out + &sheet)), err)
}

#[test]
fn every_option_with_a_job_changes_the_result_or_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    let table = table();
    let catalog2 = repo("catalogs/ipe-en10365-from-memory.csv")
        .to_str()
        .unwrap()
        .to_string();
    let mut failures = Vec::new();
    let mut checked = 0;
    for (cmd, base) in commands() {
        let (bc, btext, berr) = run_cmd(d, cmd, &base, &[], false);
        assert!(
            bc == 0 || bc == 1 || bc == 5,
            "{cmd} base run exited {bc}: {berr}"
        );
        let (_, bjson, _) = run_cmd(d, cmd, &base, &[], true);
        for opt in options_of(d, cmd) {
            let key_cmd = format!("{cmd} {opt}");
            let key_any = format!("* {opt}");
            let Some((expect, args)) = table.get(key_cmd.as_str()).or(table.get(key_any.as_str()))
            else {
                failures.push(format!("{key_cmd}: not classified in tests/options.rs"));
                continue;
            };
            let mut args: Vec<String> = args
                .iter()
                .map(|a| a.replace("CATALOG2", &catalog2))
                .collect();
            if args.is_empty() && *expect != Special {
                if base.contains(&opt) || (opt == "--catalog" && base.contains(&"-c".to_string())) {
                    continue; // part of the base run
                }
                args.push(opt.clone());
                if *expect == Refused {
                    // A value for options that take one.
                    let value = match opt.as_str() {
                        "--span" | "--limit-live" | "--limit-total" => Some("L/500"),
                        "--supports" => Some("pinned,pinned,free"),
                        "--preset" => Some("asce7-16-asd"),
                        "--dead-point" | "--live-point" => Some("1kN@1m"),
                        "--dead" | "--live" | "--snow" => Some("1kN/m"),
                        "--Fb" | "--Fv" | "--Fy" => Some("100MPa"),
                        "--kind" => Some("steel"),
                        "--bracing" => Some("1m"),
                        "--braced-flange" => Some("both"),
                        "--load-height" => Some("top_flange"),
                        "--exclude" => Some("shear"),
                        _ => None,
                    };
                    if opt == "--span" {
                        args.push("6m".into());
                    } else if let Some(v) = value {
                        args.push(v.into());
                    }
                }
            }
            checked += 1;
            match expect {
                Changes => {
                    let (c, t, e) = run_cmd(d, cmd, &base, &args, false);
                    let (_, j, _) = run_cmd(d, cmd, &base, &args, true);
                    if c == 2 || c == 3 || c == 4 {
                        failures.push(format!(
                            "{key_cmd} {args:?}: expected a changed result, got exit {c}: {e}"
                        ));
                    } else if t == btext && j == bjson {
                        failures.push(format!(
                            "{key_cmd} {args:?}: the output is unchanged (ignored?)"
                        ));
                    }
                }
                Refused => {
                    let (c, _, e) = run_cmd(d, cmd, &base, &args, false);
                    let named = e.contains(opt.trim_start_matches('-')) || e.contains(&opt);
                    if c != 2 || !named {
                        failures.push(format!(
                            "{key_cmd} {args:?}: expected exit 2 naming {opt}, got {c}: {e}"
                        ));
                    }
                }
                Same(_why) => {
                    let (c, t, e) = run_cmd(d, cmd, &base, &args, false);
                    if c != bc || t != btext {
                        failures.push(format!(
                            "{key_cmd}: expected the same output, got exit {c}: {e}"
                        ));
                    }
                }
                Writes => {
                    let file = d.join(&args[1]);
                    let _ = std::fs::remove_file(&file);
                    let written = |f: &Path| {
                        f.exists()
                            || std::path::PathBuf::from(format!("{}.md", f.display())).exists()
                    };
                    let (c, _, e) = run_cmd(d, cmd, &base, &args, false);
                    // report files are read and removed by run_cmd.
                    let ok =
                        (c == 0 || c == 1 || c == 5) && (written(&file) || args[0] == "--report");
                    if !ok {
                        failures.push(format!(
                            "{key_cmd} {args:?}: expected a file written, got exit {c}: {e}"
                        ));
                    }
                    let _ = std::fs::remove_file(&file);
                }
                Special => {
                    // --force: an existing -o file is refused without it and
                    // replaced with it.
                    let file = d.join("exists.txt");
                    std::fs::write(&file, "old").unwrap();
                    let o = vec!["-o".to_string(), "exists.txt".into()];
                    let (c1, _, _) = run_cmd(d, cmd, &base, &o, false);
                    let mut of = o.clone();
                    of.push("--force".into());
                    let (c2, _, e2) = run_cmd(d, cmd, &base, &of, false);
                    let replaced = std::fs::read_to_string(&file).unwrap_or_default() != "old";
                    if c1 == 0 || !(c2 == bc && replaced) {
                        failures.push(format!("{key_cmd}: --force: without it exit {c1} (expected refusal), with it exit {c2}, replaced {replaced}: {e2}"));
                    }
                    let _ = std::fs::remove_file(&file);
                }
            }
        }
    }
    assert!(checked > 150, "only {checked} option runs");
    assert!(
        failures.is_empty(),
        "{} problem(s):\n{}",
        failures.len(),
        failures.join("\n")
    );
}
