//! The calculation sheet: deterministic bytes (snapshots), numbers that
//! agree with the check result, and well-formed HTML.

use beamsift::check::Prepared;
use beamsift::job::from_toml;
use beamsift::report::{member, sheet};
use beamsift::section::Shape;
use beamsift::units::{Show, System};

const JOB: &str = r#"
title = "Snapshot beam (invented test data)"
[beam]
spans = ["4 m", "3 m"]
supports = ["pinned", "pinned", "pinned"]
[material]
name = "test steel"
E = "200 GPa"
Fb = "165 MPa"
Fv = "100 MPa"
Fy = "275 MPa"
density = "7850 kg/m3"
[[case]]
name = "dead"
category = "dead"
[[case]]
name = "live"
category = "live"
[[load]]
case = "dead"
uniform = "3 kN/m"
[[load]]
case = "live"
uniform = "5 kN/m"
[[load]]
case = "live"
point = "6 kN"
at = "5.5 m"
[presets]
strength = "asce7-16-asd"
service = "floor"
[checks]
lateral_bracing = "1 m"
"#;

fn build() -> (String, String, member::MemberCheck) {
    let job = from_toml(JOB, "snap.toml").unwrap();
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone()).unwrap();
    let shape = Shape::RolledI {
        d: 200.0,
        bf: 100.0,
        tf: 8.5,
        tw: 5.6,
        r: 12.0,
    };
    let p = shape.properties().unwrap();
    let mass = p.mass_per_length(7850.0);
    let r = member::member_check(&job, &prep, &shape.describe(System::Si), &p, mass, None);
    let s = sheet::build(
        &job,
        &prep,
        &r,
        "computed from the dimensions",
        None,
        System::Si,
    );
    (sheet::markdown(&s), sheet::html(&s), r)
}

/// Same input, same bytes; and the bytes match the reviewed snapshot
/// (set BEAMSIFT_UPDATE_SNAPSHOTS=1 to rewrite it after reviewing a change).
#[test]
fn report_is_deterministic_and_matches_snapshot() {
    let (md1, html1, _) = build();
    let (md2, html2, _) = build();
    assert_eq!(md1, md2);
    assert_eq!(html1, html2);
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/snapshots");
    for (name, text) in [("report.md", &md1), ("report.html", &html1)] {
        let path = dir.join(name);
        if std::env::var_os("BEAMSIFT_UPDATE_SNAPSHOTS").is_some() {
            std::fs::write(&path, text).unwrap();
        }
        let want = std::fs::read_to_string(&path).unwrap_or_default();
        assert!(
            want == *text,
            "{name} differs from its snapshot (review, then BEAMSIFT_UPDATE_SNAPSHOTS=1)"
        );
    }
}

/// Every check line's demand, capacity and utilisation, as formatted, is in
/// the sheet — the same numbers `check --json` reports.
#[test]
fn report_numbers_agree_with_the_check() {
    let (md, _, r) = build();
    assert!(!r.lines.is_empty());
    for l in &r.lines {
        let (_, d, c) = member::fmt_values(l, System::Si);
        let u = format!("{:.3}", l.utilisation);
        assert!(
            md.contains(&format!("{d} / {c} = {u}")),
            "missing '{d} / {c} = {u}' for {}",
            l.label
        );
    }
    // The verdict's utilisation matches too.
    assert!(md.contains(&format!("{:.3}", r.utilisation)));
    assert!(
        md.contains(
            &Show::Moment
                .fmt(r.lines[0].action.abs(), System::Si)
                .replace(" kN·m", "")
        )
    );
}

/// The HTML is well-formed XML (so it parses in any browser and in XML
/// tools), self-contained (no external references) and carries the caution.
#[test]
fn html_is_well_formed_and_self_contained() {
    let (_, html, _) = build();
    let doc = roxmltree::Document::parse_with_options(
        &html,
        roxmltree::ParsingOptions {
            allow_dtd: true,
            ..Default::default()
        },
    )
    .expect("well-formed");
    let svgs = doc
        .descendants()
        .filter(|n| n.tag_name().name() == "svg")
        .count();
    assert_eq!(svgs, 3, "V, M and deflection diagrams");
    for n in doc.descendants() {
        for a in n.attributes() {
            if a.name() == "href" || a.name() == "src" {
                assert!(
                    !a.value().starts_with("http"),
                    "external reference {}",
                    a.value()
                );
            }
        }
    }
    assert!(html.contains("CAUTION"));
    assert!(html.contains("Not checked"));
}
