//! Job files: the demo parses and means what it says; errors carry the
//! file, line and column of the offending value.

use beamsift::beam::model::{ComboKind, LoadKind, Support};
use beamsift::check::Bracing;
use beamsift::job::from_toml;

const DEMO: &str = include_str!("../catalogs/demo-job.toml");

#[test]
fn demo_job_reads_as_written() {
    let job = from_toml(DEMO, "demo-job.toml").unwrap();
    let b = &job.beam;
    assert_eq!(b.spans, vec![6000.0, 1200.0]);
    assert_eq!(
        b.supports,
        vec![Support::Pinned, Support::Pinned, Support::Free]
    );
    // 1.4 kPa × 3.0 m = 4.2 kN/m = 4.2 N/mm.
    match b.loads[0].kind {
        LoadKind::Distributed { w1, x1, x2, .. } => {
            assert!((w1 - 4.2).abs() < 1e-12);
            assert_eq!((x1, x2), (0.0, 7200.0));
        }
        _ => panic!("area load should become a line load"),
    }
    assert_eq!(job.material.e, 200_000.0);
    assert_eq!(job.criteria.bracing, Bracing::Spacing(2000.0));
    // ASCE 7-16 §2.4.1 (from memory) with only D and L present, an absent
    // load contributing zero: (1) D, (2) D+L, (4) D+0.75L and (7) 0.6D;
    // (3), (5) and (6a) repeat (1) and (4) and are not listed twice.
    let strength: Vec<_> = b
        .combinations
        .iter()
        .filter(|c| c.kind == ComboKind::Strength)
        .map(|c| c.name.as_str())
        .collect();
    assert_eq!(strength, vec!["D", "D+L", "D+0.75L", "0.6D"]);
    // IBC Table 1604.3 floor members: L/360 live, L/240 total (from memory).
    assert_eq!(limits(b), vec![360.0, 240.0]);
    assert_eq!(b.self_weight_case, Some(0));
}

/// The deflection limits (L/n) of the combinations, in order.
fn limits(b: &beamsift::beam::model::Beam) -> Vec<f64> {
    b.combinations
        .iter()
        .filter_map(|c| c.limit.and_then(|l| l.ratio))
        .collect()
}

fn err(text: &str) -> String {
    from_toml(text, "job.toml").unwrap_err().to_string()
}

const BASE: &str = r#"
[beam]
spans = ["5 m"]
supports = ["pinned", "pinned"]
[material]
E = "200 GPa"
Fb = "165 MPa"
[[case]]
name = "D"
category = "dead"
[[combination]]
name = "D"
factors = { D = 1.0 }
"#;

#[test]
fn errors_name_file_line_and_column() {
    assert!(from_toml(BASE, "job.toml").is_ok());
    let e = err(&BASE.replace("\"5 m\"", "\"5\""));
    assert!(e.starts_with("job.toml:3:"), "{e}");
    assert!(e.contains("no unit"), "{e}");
    let e = err(&format!(
        "{BASE}[[load]]\ncase = \"X\"\nuniform = \"1 kN/m\"\n"
    ));
    assert!(
        e.contains("job.toml:15:8") && e.contains("unknown load case 'X'"),
        "{e}"
    );
    let e = err(&format!(
        "{BASE}[[load]]\ncase = \"D\"\npoint = \"1 kN\"\nat = \"7 m\"\n"
    ));
    // At the position's value (line 17, after `at = `).
    assert!(
        e.contains("job.toml:17:6: load[1].at") && e.contains("not on the beam"),
        "{e}"
    );
    let e = err(&BASE.replace("factors = { D = 1.0 }", "factors = { Q = 1.0 }"));
    assert!(
        e.contains("unknown load case 'Q'") && e.contains("job.toml:13:11"),
        "{e}"
    );
    let e = err(&BASE.replace("\"pinned\", \"pinned\"", "\"pinned\", \"free\""));
    assert!(e.contains("mechanism"), "{e}");
    let e = err(&BASE.replace("Fb = \"165 MPa\"\n", ""));
    assert!(e.contains("Fb"), "{e}");
    let e = err(&BASE.replace("[beam]", "[beam]\nspam = 1"));
    assert!(
        e.contains("job.toml:3") && e.contains("unknown field"),
        "{e}"
    );
    let e = err("this is not toml = = =");
    assert!(e.starts_with("job.toml:1:"), "{e}");
    let e = err(&BASE.replace("\"pinned\", \"pinned\"", "\"pinned\", \"hinge\""));
    assert!(e.contains("unknown support 'hinge'"), "{e}");
}

/// The job from plain flag values, as any front end gives them (no command
/// line involved): what each value means, and the rules between them.
#[test]
fn flags_build_the_job_a_front_end_describes() {
    use beamsift::job::JobFlags;
    let s = |t: &str| Some(t.to_string());
    let flags = JobFlags {
        span: s("4.2m,4.2m"),
        dead: s("1.2kN/m"),
        live_point: vec!["12kN@2.5m".into()],
        e: s("11GPa"),
        fb: s("10MPa"),
        ..Default::default()
    };
    let job = flags.load().unwrap();
    let b = &job.beam;
    // SI: 1 m = 1000 mm, 1 kN/m = 1 N/mm, 1 kN = 1000 N, 1 GPa = 1000 MPa.
    assert_eq!(b.spans, vec![4200.0, 4200.0]);
    assert_eq!(b.supports, vec![Support::Pinned; 3]);
    match b.loads[0].kind {
        LoadKind::Distributed { w1, w2, x1, x2 } => {
            assert!((w1 - 1.2).abs() < 1e-12 && (w2 - 1.2).abs() < 1e-12);
            assert_eq!((x1, x2), (0.0, 8400.0));
        }
        _ => panic!("--dead is a uniform load over the whole beam"),
    }
    match b.loads[1].kind {
        LoadKind::Point { x, p } => assert_eq!((x, p), (2500.0, 12_000.0)),
        _ => panic!("--live-point is a point load"),
    }
    assert_eq!(job.material.e, 11_000.0);
    assert_eq!(job.material.fb_tension, Some(10.0));
    // IBC Table 1604.3 floor members: L/360 live, L/240 total (from memory).
    assert_eq!(limits(b), vec![360.0, 240.0]);
    // Two spans need three supports.
    let two = JobFlags {
        supports: s("pinned,roller"),
        ..flags.clone()
    };
    assert!(
        two.load()
            .unwrap_err()
            .to_string()
            .contains("need 3 supports")
    );
    // With a job file, the beam comes from the file: --span is refused
    // before the file is read.
    let with_file = JobFlags {
        job: Some("no-such-job.toml".into()),
        ..flags
    };
    let e = with_file.load().unwrap_err().to_string();
    assert!(
        e.contains("--span, --dead, --live-point describe(s) the beam"),
        "{e}"
    );
}
