//! Shared fixtures for the integration tests: materials, simple beams, the
//! binary runner and tolerance checks. Each test file uses what it needs.
#![allow(dead_code)]

use beamsift::beam::{Beam, Category, ComboKind, DeflectionLimit, Support};
use beamsift::check::{Criteria, Exclusions, Material, MaterialKind, TimberFactors};
use std::ffi::OsStr;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// A material of allowable stresses only (kind not stated), MPa and kg/m³.
pub fn allowable(e: f64, fb: f64, fv: Option<f64>, density: f64) -> Material {
    Material::allowable("test material", e, fb, fv, density)
}

/// Structural steel with F_y, allowables Fb and Fv as given (None: AISC
/// Chapters F/G only).
pub fn steel(fy: f64, fb: Option<f64>, fv: Option<f64>) -> Material {
    Material {
        name: "steel".into(),
        kind: MaterialKind::Steel,
        e: 200_000.0,
        fb_tension: fb,
        fb_compression: fb,
        fv,
        fy: Some(fy),
        density: 7850.0,
        timber: TimberFactors::default(),
    }
}

/// Timber with reference values (MPa), E_min and a fixed load duration
/// factor (so the tests control C_D).
pub fn timber(e: f64, fb: f64, fv: f64, e_min: f64, cd: f64, density: f64) -> Material {
    Material {
        name: "timber".into(),
        kind: MaterialKind::Timber,
        e,
        fb_tension: Some(fb),
        fb_compression: Some(fb),
        fv: Some(fv),
        fy: None,
        density,
        timber: TimberFactors {
            e_min: Some(e_min),
            cd: Some(cd),
            ..TimberFactors::default()
        },
    }
}

/// Criteria for the plain allowable-stress job: lateral stability and local
/// buckling excluded by the user ("by others"), as a caller must say.
pub fn allowable_only() -> Criteria {
    Criteria {
        exclude: Exclusions {
            lateral_torsional_buckling: true,
            local_buckling: true,
            ..Exclusions::default()
        },
        ..Criteria::default()
    }
}

/// A simple span L (mm) under uniform dead `wd` and live `wl` (N/mm), with
/// strength D and D+L and service L ≤ L/360, D+L ≤ L/240 (IBC 2018 Table
/// 1604.3 floor limits, from memory).
pub fn simple_span(l: f64, wd: f64, wl: f64) -> Beam {
    let mut b = Beam::new(vec![l], vec![Support::Pinned, Support::Roller]);
    let d = b.case("D", Category::Dead);
    let lc = b.case("L", Category::Live);
    b.self_weight_case = Some(d);
    b.udl(d, wd);
    b.udl(lc, wl);
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    b.combo("D+L", ComboKind::Strength, &[(d, 1.0), (lc, 1.0)]);
    b.service(
        "L",
        &[(lc, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    b.service(
        "D+L",
        &[(d, 1.0), (lc, 1.0)],
        DeflectionLimit {
            ratio: Some(240.0),
            absolute: None,
        },
    );
    b
}

/// A beam under one uniform dead load `w` (N/mm) on every span, with
/// strength D and service D ≤ L/n. The self-weight is not a case of it: set
/// `self_weight_case = Some(0)` where the dead case should carry it.
pub fn dead_load(spans: Vec<f64>, supports: Vec<Support>, w: f64, n: f64) -> Beam {
    let mut b = Beam::new(spans, supports);
    let d = b.case("D", Category::Dead);
    b.udl(d, w);
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    b.service(
        "D",
        &[(d, 1.0)],
        DeflectionLimit {
            ratio: Some(n),
            absolute: None,
        },
    );
    b
}

/// `dead_load` on a simple span L (mm), pinned and roller.
pub fn dead_span(l: f64, w: f64, n: f64) -> Beam {
    dead_load(vec![l], vec![Support::Pinned, Support::Roller], w, n)
}

/// |got − want| ≤ tol·|want| (or ≤ tol when want is 0).
#[track_caller]
pub fn close(what: &str, got: f64, want: f64, tol: f64) {
    close_floor(what, got, want, tol, if want == 0.0 { 1.0 } else { 0.0 });
}

/// |got − want| ≤ tol·max(|want|, floor): relative, with the absolute
/// allowance tol·floor for values at or near zero (a round-off check of a
/// value that should vanish needs a floor of its scale, not 1).
#[track_caller]
pub fn close_floor(what: &str, got: f64, want: f64, tol: f64, floor: f64) {
    let ok = (got - want).abs() <= tol * want.abs().max(floor);
    assert!(
        ok,
        "{what}: got {got}, expected {want} (relative tolerance {tol}, floor {floor})"
    );
}

/// |a − b| / |b| (b at least 1e-300): for `prop_assert!`, which wants a
/// condition rather than a panic.
pub fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(1e-300)
}

pub fn repo(p: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join(p)
}

/// The built binary, as a command to configure (standard input, spawn).
pub fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_beamsift"))
}

/// Run the built binary.
pub fn run<S: AsRef<OsStr>>(args: &[S]) -> Output {
    bin().args(args).output().expect("run beamsift")
}

/// Run the binary in a folder.
pub fn run_in<S: AsRef<OsStr>>(dir: &Path, args: &[S]) -> Output {
    bin()
        .args(args)
        .current_dir(dir)
        .output()
        .expect("run beamsift")
}

/// (stdout, stderr) as text.
pub fn text(o: &Output) -> (String, String) {
    (
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

/// Copy a folder and everything below it (scratch copies of catalogs/).
pub fn copy_dir(from: &Path, to: &Path) {
    std::fs::create_dir_all(to).unwrap();
    for e in std::fs::read_dir(from).unwrap() {
        let e = e.unwrap();
        let p = e.path();
        if p.is_dir() {
            copy_dir(&p, &to.join(e.file_name()));
        } else {
            std::fs::copy(&p, to.join(e.file_name())).unwrap();
        }
    }
}
