//! Second round of "would pass by omission": each case below was found by
//! trying the tool as a hostile checker would, and each expected verdict is
//! derived here by hand with its source. All data are invented.

mod common;

use beamsift::check::*;
use beamsift::section::Given;
use common::{repo, run, text};
use std::path::Path;

fn write(dir: &Path, name: &str, body: &str) -> String {
    let p = dir.join(name);
    std::fs::write(&p, body).unwrap();
    p.to_string_lossy().to_string()
}

const STEEL_10M: &str = r#"
[beam]
spans = ["10 m"]
supports = ["pinned", "roller"]
[material]
kind = "steel"
E = "200 GPa"
Fy = "345 MPa"
density = "7850 kg/m3"
[[case]]
name = "D"
category = "dead"
[[case]]
name = "L"
category = "live"
[[load]]
case = "D"
uniform = "6 kN/m"
[[load]]
case = "L"
uniform = "6 kN/m"
[presets]
strength = "asce7-16-asd"
service = "floor"
[checks]
lateral_bracing = "supports"
"#;

#[test]
fn a_mono_symmetric_row_by_table_values_is_not_taken_as_symmetric() {
    // A row giving A, Ix, ..., c_top = 363 ≠ c_bot = 237 and one bf, tf:
    // the flanges differ, and one pair of flange dimensions cannot say
    // which is which. Evaluating it as a doubly symmetric I (AISC F2) would
    // credit it about 3× the F4 strength of the same girder by its plates
    // (hand: I_yc/I_y = 0.18 ≤ 0.23, so J is taken as 0 in F4-5): not
    // verified, never passing.
    let p = Given {
        area: Some(13_520.0),
        ix: Some(828.2e6),
        iy: Some(55.02e6),
        zx: Some(2_982e3),
        j: Some(1.087e6),
        cw: Some(2_776e9),
        c_top: Some(363.0),
        c_bot: Some(237.0),
        depth: Some(600.0),
        bf: Some(200.0),
        tf: Some(15.0),
        tw: Some(8.0),
        ..Given::default()
    }
    .properties()
    .unwrap();
    assert!(p.i_geometry.is_none());
    assert_eq!(
        steel::strengths(&p, 345.0, 200_000.0),
        Err(steel::Missing::ShapeUnknown)
    );
    // The same values with equal fibres keep their plate geometry.
    let q = Given {
        c_top: Some(300.0),
        c_bot: Some(300.0),
        ..Given {
            area: Some(13_520.0),
            ix: Some(828.2e6),
            iy: Some(55.02e6),
            zx: Some(2_982e3),
            depth: Some(600.0),
            bf: Some(200.0),
            tf: Some(15.0),
            tw: Some(8.0),
            ..Given::default()
        }
    }
    .properties()
    .unwrap();
    assert!(q.i_geometry.is_some());
    // Through the command line: NOT VERIFIED, exit 5.
    let dir = tempfile::tempdir().unwrap();
    let job = write(dir.path(), "job.toml", STEEL_10M);
    let cat = write(
        dir.path(),
        "g.csv",
        "name,A [mm2],Ix [mm4],Iy [mm4],Zx [mm3],J [mm4],Cw [mm6],c_top [mm],c_bot [mm],d [mm],bf [mm],tf [mm],tw [mm],mass [kg/m]\n\
         MG2,13520,828.2e6,55.02e6,2982e3,1.087e6,2776e9,363,237,600,200,15,8,106.1\n",
    );
    let o = run(&[
        "report",
        "--job",
        &job,
        "-c",
        &cat,
        "--section",
        "MG2",
        "--format",
        "json",
        "--to",
        &dir.path().join("r").to_string_lossy(),
    ]);
    assert_eq!(o.status.code(), Some(5), "{}", text(&o).1);
}

#[test]
fn loads_no_combination_checks_are_refused() {
    // A snow case of 30 kN/m in no strength combination: D+S by hand is
    // M = 35.4·6²/8 = 159 kN·m, far over the section's capacity, yet the
    // run would show the load and check nothing of it.
    let dir = tempfile::tempdir().unwrap();
    let body = r#"
[beam]
spans = ["6 m"]
supports = ["pinned", "roller"]
[material]
E = "200 GPa"
Fb = "165 MPa"
density = "7850 kg/m3"
[[case]]
name = "D"
category = "dead"
[[case]]
name = "S"
category = "snow"
[[load]]
case = "D"
uniform = "5 kN/m"
[[load]]
case = "S"
uniform = "30 kN/m"
[[combination]]
name = "D"
factors = { D = 1.0 }
"#;
    let job = write(dir.path(), "j.toml", body);
    let o = run(&["check", "--job", &job, "rect", "b=100mm", "d=300mm"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        text(&o)
            .1
            .contains("'S' carries loads but no strength combination")
    );
    // A deflection limit on a strength combination would be ignored.
    let body2 = body.replace(
        "factors = { D = 1.0 }",
        "kind = \"strength\"\nfactors = { D = 1.0, S = 1.0 }\nlimit = \"L/1000\"",
    );
    let job = write(dir.path(), "j2.toml", &body2);
    let o = run(&["check", "--job", &job, "rect", "b=100mm", "d=300mm"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(
        text(&o).1.contains("j2.toml:")
            && text(&o)
                .1
                .contains("strength combination does not check deflection")
    );
}

#[test]
fn values_of_another_kind_of_material_are_refused() {
    // Fy is used only by the steel methods (AISC 360-16); a material of kind
    // "other" with Fy would print it and ignore it.
    let m = Material {
        name: "x".into(),
        kind: MaterialKind::Unspecified,
        e: 200_000.0,
        fb_tension: Some(165.0),
        fb_compression: Some(165.0),
        fv: None,
        fy: Some(100.0),
        density: 7850.0,
        timber: TimberFactors::default(),
    };
    assert!(m.validate().is_err());
    // A catalogue row's Fy on a timber job: refused at its cell.
    let dir = tempfile::tempdir().unwrap();
    let cat = write(
        dir.path(),
        "t.csv",
        "name,shape,b [mm],d [mm],Fy [MPa]\nR1,rect,75,250,1\n",
    );
    let o = run(&[
        "select",
        "--job",
        &repo("catalogs/demo-joists.toml").to_string_lossy(),
        "-c",
        &cat,
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o).1.contains("t.csv:2:5"), "{}", text(&o).1);
}

#[test]
fn settings_that_change_nothing_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    // braced_flange with bracing at the supports only.
    let body = format!("{STEEL_10M}braced_flange = \"both\"\n");
    let job = write(dir.path(), "b.toml", &body);
    let o = run(&["check", "--job", &job, "rect", "b=100mm", "d=600mm"]);
    assert_eq!(o.status.code(), Some(2), "{}", text(&o).1);
    assert!(text(&o).1.contains("checks.braced_flange"));
    // shear = "peak_vq" with no Fv anywhere (steel shear is AISC G).
    let body = format!("{STEEL_10M}shear = \"peak_vq\"\n");
    let job = write(dir.path(), "s.toml", &body);
    let o = run(&["check", "--job", &job, "rect", "b=100mm", "d=600mm"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o).1.contains("checks.shear"));
    // --braced-flange on the command line likewise.
    let job = write(dir.path(), "p.toml", STEEL_10M);
    let o = run(&[
        "check",
        "--job",
        &job,
        "--braced-flange",
        "both",
        "rect",
        "b=100mm",
        "d=600mm",
    ]);
    assert_eq!(o.status.code(), Some(2));
}

#[test]
fn every_output_lists_the_exclusions() {
    // Excluding a check is a choice that must show on every output: JSON
    // of optimise, CSV of shortlist and batch.
    let dir = tempfile::tempdir().unwrap();
    let demo = std::fs::read_to_string(repo("catalogs/demo-job.toml")).unwrap();
    let body = demo.replace("[checks]", "[checks]\nexclude = [\"shear\"]");
    let job = write(dir.path(), "x.toml", &body);
    let steel = repo("catalogs/demo-steel.csv")
        .to_string_lossy()
        .to_string();
    let o = run(&["optimise", "--job", &job, "welded-i", "--json"]);
    assert!(o.status.success(), "{}", text(&o).1);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(
        v["excluded"][0].as_str().unwrap().starts_with("shear"),
        "{v}"
    );
    assert!(v["caution"].as_str().unwrap().starts_with("CAUTION"));
    let o = run(&["shortlist", "--job", &job, "-c", &steel, "--format", "csv"]);
    assert!(
        text(&o).0.contains("# Excluded by the user"),
        "{}",
        text(&o).0
    );
    assert!(text(&o).0.contains("# Not checked by beamsift"));
    let o = run(&[
        "batch",
        "--schedule",
        &repo("catalogs/demo-schedule.csv").to_string_lossy(),
        "--job",
        &job,
        "-c",
        &steel,
        "--json",
    ]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(
        v["excluded"][0].as_str().unwrap().starts_with("shear"),
        "{v}"
    );
}

#[test]
fn a_batch_template_keeps_its_own_combinations() {
    // The template's own 1.2D+1.6L and L/600 apply to every member (by
    // case category): the member is then sized by L/600, and `check` of
    // the chosen section with the same combinations agrees that it passes.
    let dir = tempfile::tempdir().unwrap();
    let tmpl = r#"
[beam]
spans = ["6 m"]
supports = ["pinned", "roller"]
[material]
kind = "steel"
E = "200 GPa"
Fy = "345 MPa"
density = "7850 kg/m3"
[[case]]
name = "D"
category = "dead"
[[case]]
name = "L"
category = "live"
[[load]]
case = "D"
uniform = "1 kN/m"
[[combination]]
name = "1.2D+1.6L"
factors = { D = 1.2, L = 1.6 }
[[combination]]
name = "L/600"
kind = "service"
factors = { L = 1.0 }
limit = "L/600"
[checks]
lateral_bracing = "continuous"
braced_flange = "both"
"#;
    let t = write(dir.path(), "t.toml", tmpl);
    let s = write(
        dir.path(),
        "s.csv",
        "mark,count,spans [m],dead [kN/m],live [kN/m]\nB1,1,6,5,15\n",
    );
    let steel = repo("catalogs/demo-steel.csv")
        .to_string_lossy()
        .to_string();
    let o = run(&[
        "batch",
        "--schedule",
        &s,
        "--job",
        &t,
        "-c",
        &steel,
        "--json",
    ]);
    assert!(o.status.success(), "{}", text(&o).1);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let out = v.to_string();
    assert!(out.contains("L/600"), "{out}");
}

#[test]
fn a_span_table_never_claims_a_span_it_did_not_check() {
    // A strong section under a light point load passes at the longest span
    // searched (50 m): the cell says "≥ 50.00", not "50.00".
    let dir = tempfile::tempdir().unwrap();
    let job = write(
        dir.path(),
        "j.toml",
        r#"
[beam]
spans = ["4 m"]
supports = ["pinned", "roller"]
[material]
E = "200 GPa"
Fb = "165 MPa"
Fv = "100 MPa"
density = "0 kg/m3"
[[case]]
name = "L"
category = "live"
[[load]]
case = "L"
point = "0.1 kN"
at = "2 m"
[[combination]]
name = "L"
factors = { L = 1.0 }
[[combination]]
name = "Ls"
kind = "service"
factors = { L = 1.0 }
limit = "L/100"
[checks]
lateral_bracing = "continuous"
braced_flange = "both"
"#,
    );
    let cat = write(
        dir.path(),
        "c.csv",
        "name,shape,b [mm],d [mm],mass [kg/m]\nBIG,rect,400,1500,1\n",
    );
    let o = run(&["sweep", "table", "--job", &job, "-c", &cat]);
    assert!(text(&o).0.contains("≥ 50.00"), "{}", text(&o).0);
}

#[test]
fn a_span_table_says_where_a_method_runs_out() {
    // A 25 × 300 timber joist braced at its supports: beyond a span R_B =
    // √(ℓ_e·d/b²) exceeds 50 (NDS 3.3.3.7) and C_L has no method; the cell
    // marks "nv" with that reason instead of naming deflection.
    let o = run(&[
        "sweep",
        "table",
        "--job",
        &repo("tests/data/joist-supports-only.toml").to_string_lossy(),
        "-c",
        &repo("tests/data/joists-thin.csv").to_string_lossy(),
    ]);
    let (out, err) = text(&o);
    assert!(out.contains(" nv"), "{out}{err}");
    assert!(out.contains("R_B exceeds 50"), "{out}");
}

#[test]
fn a_free_end_rooted_at_a_top_flange_brace_is_not_torsionally_restrained() {
    // Springs at both ends (no lateral or torsional restraint there) and
    // braces on the top flange every 2 m: the end segments are cantilevers
    // from a brace that restrains the top flange only; from memory of
    // BS 5950-1:2000 Table 14 the effective length is 3.0 × L (not the
    // 1.0 × L of a support with lateral and torsional restraint).
    use beamsift::beam::*;
    let mut b = Beam::new(
        vec![6000.0],
        vec![Support::Spring(5000.0), Support::Spring(5000.0)],
    );
    let d = b.case("D", Category::Dead);
    b.udl(d, 10.0);
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    let prep = Prepared::new(
        &b,
        common::steel(345.0, None, None),
        Criteria {
            bracing: Bracing::Spacing(2000.0),
            ..Criteria::default()
        },
    );
    // A beam on springs only is a mechanism for the analysis unless it has
    // a vertical restraint; springs restrain vertically.
    let prep = prep.unwrap();
    let ends: Vec<&Segment> = prep
        .segments
        .iter()
        .filter(|s| s.free_end && s.sagging)
        .collect();
    assert!(!ends.is_empty());
    for s in ends {
        assert_eq!(s.k, 3.0, "{s:?}");
    }
}
