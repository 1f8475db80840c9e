//! No output can destroy a file: the real binary, with outputs aimed at
//! inputs under every spelling, two outputs at one file, links, devices,
//! concurrent runs, signals, long names and a closed standard output.
//! Expected behaviour as README.md "Exit codes" documents it (3: an output
//! refused or not writable; 130: interrupted).

mod common;

use common::{bin, repo, run_in};
use proptest::prelude::*;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

fn s(x: &str) -> String {
    x.to_string()
}

/// A folder with copies of the demo job and catalogue, and a sub-folder.
fn setup() -> (tempfile::TempDir, Vec<u8>, Vec<u8>) {
    let dir = tempfile::tempdir().unwrap();
    std::fs::create_dir(dir.path().join("sub")).unwrap();
    std::fs::copy(repo("catalogs/demo-job.toml"), dir.path().join("job.toml")).unwrap();
    std::fs::copy(repo("catalogs/demo-steel.csv"), dir.path().join("cat.csv")).unwrap();
    let job = std::fs::read(dir.path().join("job.toml")).unwrap();
    let cat = std::fs::read(dir.path().join("cat.csv")).unwrap();
    (dir, job, cat)
}

/// Every file in a folder except the inputs: what a run left behind.
fn extra_files(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().to_string())
        .filter(|n| !["job.toml", "cat.csv", "sub", "link.csv", "hard.csv"].contains(&n.as_str()))
        .collect();
    v.sort();
    v
}

/// The ways a user may name the catalogue `cat.csv` from the folder.
fn spelling(k: usize, dir: &Path) -> String {
    match k {
        0 => s("cat.csv"),
        1 => s("./cat.csv"),
        2 => s("sub/../cat.csv"),
        3 => dir.join("cat.csv").to_string_lossy().to_string(),
        4 => s(".//cat.csv"),
        5 => s("link.csv"),
        _ => s("hard.csv"),
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]

    /// Whatever the spelling of the catalogue (as an input and as an
    /// output), attached or separate option values, and whichever output
    /// option names it, the run is refused with exit 3 and the input is
    /// unchanged.
    #[test]
    fn no_output_option_can_name_an_input(
        in_k in 0usize..7,
        out_k in 0usize..7,
        attached_in in any::<bool>(),
        attached_out in any::<bool>(),
        which in 0usize..4,
    ) {
        let (dir, job, cat) = setup();
        let d = dir.path();
        std::os::unix::fs::symlink("cat.csv", d.join("link.csv")).unwrap();
        std::fs::hard_link(d.join("cat.csv"), d.join("hard.csv")).unwrap();
        let cin = spelling(in_k, d);
        let cout = spelling(out_k, d);
        let mut args = vec![];
        let cat_opt = |args: &mut Vec<String>| {
            if attached_in {
                args.push(format!("-c{cin}"));
            } else {
                args.push(s("--catalog"));
                args.push(cin.clone());
            }
        };
        match which {
            // -o on select.
            0 => {
                args.extend([s("select"), s("--job"), s("job.toml")]);
                cat_opt(&mut args);
                if attached_out {
                    args.push(format!("-o{cout}"));
                } else {
                    args.extend([s("-o"), cout.clone()]);
                }
            }
            // --report PREFIX whose .md or .html would be the input: name
            // the input cat.csv as PREFIX.md by copying it there first.
            1 => {
                std::fs::copy(d.join("cat.csv"), d.join("sheet.md")).unwrap();
                args.extend([s("select"), s("--job"), s("job.toml"), s("-c"), s("sheet.md")]);
                args.extend([s("--report"), s("sheet")]);
            }
            // --chart on a sweep.
            2 => {
                args.extend([s("sweep"), s("lightest"), s("--job"), s("job.toml"), s("--spans"), s("4m,6m")]);
                cat_opt(&mut args);
                if attached_out {
                    args.push(format!("--chart={cout}"));
                } else {
                    args.extend([s("--chart"), cout.clone()]);
                }
            }
            // -o at the job file on check (-j attached).
            _ => {
                args.extend([s("check"), s("-jjob.toml"), s("rect"), s("b=100mm"), s("d=300mm")]);
                args.extend([s("-o"), s("./job.toml")]);
            }
        }
        args.push(s("--force"));
        let o = run_in(d, &args);
        let err = String::from_utf8_lossy(&o.stderr).to_string();
        prop_assert_eq!(o.status.code(), Some(3), "{:?}: {}", args, err);
        prop_assert!(err.contains("input"), "{}", err);
        prop_assert_eq!(&std::fs::read(d.join("cat.csv")).unwrap(), &cat);
        prop_assert_eq!(std::fs::read(d.join("job.toml")).unwrap(), job);
        if which == 1 {
            prop_assert_eq!(std::fs::read(d.join("sheet.md")).unwrap(), cat);
        }
        prop_assert!(!extra_files(d).iter().any(|n| n.starts_with(".beamsift")), "{:?}", extra_files(d));
    }
}

#[test]
fn two_outputs_at_one_file_are_refused() {
    let (dir, _, _) = setup();
    let d = dir.path();
    for args in [
        // report --to X with -o X.md.
        vec![
            s("report"),
            s("--job"),
            s("job.toml"),
            s("-c"),
            s("cat.csv"),
            s("--to"),
            s("calc"),
            s("--format"),
            s("json"),
            s("-o"),
            s("calc.md"),
        ],
        // --chart F -o F (another spelling).
        vec![
            s("sweep"),
            s("lightest"),
            s("--job"),
            s("job.toml"),
            s("-c"),
            s("cat.csv"),
            s("--spans"),
            s("4m,6m"),
            s("--chart"),
            s("out.svg"),
            s("-o"),
            s("./sub/../out.svg"),
        ],
        // select --report P -o P.html.
        vec![
            s("select"),
            s("--job"),
            s("job.toml"),
            s("-c"),
            s("cat.csv"),
            s("--report"),
            s("p"),
            s("-o"),
            s("p.html"),
        ],
    ] {
        let o = run_in(d, &args);
        let err = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(3), "{args:?}: {err}");
        assert!(err.contains("named twice"), "{err}");
        assert!(extra_files(d).is_empty(), "{:?}", extra_files(d));
    }
}

#[test]
fn links_and_devices_are_written_through() {
    let (dir, _, _) = setup();
    let d = dir.path();
    // A symbolic link to an existing file, with --force: the target gets
    // the result and the link stays a link.
    std::fs::write(d.join("target.txt"), "old").unwrap();
    std::os::unix::fs::symlink("target.txt", d.join("out.txt")).unwrap();
    let args = |o: &str, force: bool| {
        let mut v = vec![
            s("section"),
            s("rect"),
            s("b=100mm"),
            s("d=200mm"),
            s("-o"),
            s(o),
        ];
        if force {
            v.push(s("--force"));
        }
        v
    };
    let o = run_in(d, &args("out.txt", false));
    assert_eq!(o.status.code(), Some(3), "an existing target needs --force");
    let o = run_in(d, &args("out.txt", true));
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(
        std::fs::symlink_metadata(d.join("out.txt"))
            .unwrap()
            .file_type()
            .is_symlink()
    );
    assert!(
        std::fs::read_to_string(d.join("target.txt"))
            .unwrap()
            .contains("Area")
    );
    // A dangling link is refused, not replaced.
    std::os::unix::fs::symlink("missing.txt", d.join("dangling.txt")).unwrap();
    let o = run_in(d, &args("dangling.txt", true));
    assert_eq!(o.status.code(), Some(3));
    assert!(
        std::fs::symlink_metadata(d.join("dangling.txt"))
            .unwrap()
            .file_type()
            .is_symlink()
    );
    // A device: written directly, needs no --force, stays a device.
    let o = run_in(d, &args("/dev/null", false));
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(!std::fs::metadata("/dev/null").unwrap().is_file());
    // A full device: the error names it, exit 3.
    let o = run_in(d, &args("/dev/full", false));
    assert_eq!(o.status.code(), Some(3));
    assert!(String::from_utf8_lossy(&o.stderr).contains("/dev/full"));
    // A missing folder: exit 3 like every other output that cannot be written.
    let o = run_in(d, &args("nowhere/x.txt", false));
    assert_eq!(o.status.code(), Some(3));
    assert!(String::from_utf8_lossy(&o.stderr).contains("does not exist"));
    let left: Vec<String> = extra_files(d)
        .into_iter()
        .filter(|n| n.starts_with(".beamsift"))
        .collect();
    assert!(left.is_empty(), "{left:?}");
}

#[test]
fn a_long_valid_name_is_written() {
    // 250 bytes: under the usual 255-byte limit for one name; the
    // temporary file must not be longer than the name itself allows.
    let (dir, _, _) = setup();
    let name = format!("{}.txt", "n".repeat(246));
    let o = run_in(
        dir.path(),
        &[
            s("section"),
            s("rect"),
            s("b=100mm"),
            s("d=200mm"),
            s("-o"),
            name.clone(),
        ],
    );
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(dir.path().join(&name).is_file());
}

#[test]
fn a_closed_standard_output_is_an_error() {
    // Standard output closed (`>&-`): the result would be lost.
    let o = bin()
        .args(["section", "rect", "b=100mm", "d=200mm"])
        .stdout(Stdio::null())
        .output()
        .unwrap();
    assert!(o.status.success(), "/dev/null is open: fine");
    let o = Command::new("sh")
        .arg("-c")
        .arg(format!(
            "'{}' section rect b=100mm d=200mm >&-",
            env!("CARGO_BIN_EXE_beamsift")
        ))
        .output()
        .unwrap();
    assert_eq!(
        o.status.code(),
        Some(3),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    assert!(String::from_utf8_lossy(&o.stderr).contains("standard output"));
}

/// A catalogue generation that takes a while (about a million rows).
fn long_generate(out: &str) -> Vec<String> {
    [
        "catalog",
        "generate",
        "welded-i",
        "--bf",
        "100..600:5mm",
        "--tf",
        "6..40:1mm",
        "--hw",
        "200..1500:10mm",
        "--tw",
        "5..20:1mm",
        "--Fy",
        "345MPa",
        "-o",
        out,
    ]
    .iter()
    .map(|x| x.to_string())
    .collect()
}

#[test]
fn an_interrupted_run_leaves_nothing() {
    for signal in ["INT", "TERM", "HUP"] {
        let dir = tempfile::tempdir().unwrap();
        let mut child = bin()
            .args(long_generate("big.csv"))
            .current_dir(dir.path())
            .stderr(Stdio::piped())
            .spawn()
            .unwrap();
        // Wait until the temporary file exists (the run is under way).
        let t0 = std::time::Instant::now();
        loop {
            let any = std::fs::read_dir(dir.path()).unwrap().next().is_some();
            if any || t0.elapsed().as_secs() > 20 {
                break;
            }
            std::thread::sleep(std::time::Duration::from_millis(5));
        }
        let st = Command::new("kill")
            .arg(format!("-{signal}"))
            .arg(child.id().to_string())
            .status()
            .unwrap();
        assert!(st.success());
        let status = child.wait().unwrap();
        let left: Vec<PathBuf> = std::fs::read_dir(dir.path())
            .unwrap()
            .map(|e| e.unwrap().path())
            .collect();
        if status.code() == Some(0) {
            // It finished before the signal arrived: the output is whole.
            assert_eq!(left, vec![dir.path().join("big.csv")]);
            continue;
        }
        assert_eq!(status.code(), Some(130), "SIG{signal}");
        assert!(left.is_empty(), "SIG{signal} left {left:?}");
    }
}

#[test]
fn concurrent_runs_never_overwrite_each_other() {
    // Two runs aimed at one new file without --force: both pass the check
    // before any work (the file does not exist yet), but only one may
    // create it; the other is refused at the moment of the move, exit 3,
    // and the file holds one whole result.
    for _ in 0..3 {
        let dir = tempfile::tempdir().unwrap();
        let spawn = || {
            bin()
                .args(long_generate("out.csv"))
                .current_dir(dir.path())
                .stderr(Stdio::piped())
                .spawn()
                .unwrap()
        };
        let (a, b) = (spawn(), spawn());
        let (oa, ob) = (a.wait_with_output().unwrap(), b.wait_with_output().unwrap());
        let codes = [oa.status.code(), ob.status.code()];
        assert!(
            codes.contains(&Some(0)) && codes.contains(&Some(3)),
            "{codes:?}: {} / {}",
            String::from_utf8_lossy(&oa.stderr),
            String::from_utf8_lossy(&ob.stderr)
        );
        let text = std::fs::read_to_string(dir.path().join("out.csv")).unwrap();
        let rows = text.lines().filter(|l| !l.starts_with('#')).count();
        assert!(rows > 100_000 && text.ends_with('\n'));
        let left: Vec<String> = std::fs::read_dir(dir.path())
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().to_string())
            .collect();
        assert_eq!(left, vec!["out.csv".to_string()]);
    }
}
