//! The calculation sheet: deterministic bytes (snapshots), numbers that
//! agree with the check result and a hand calculation, and well-formed
//! HTML.

mod common;

use beamsift::check::Prepared;
use beamsift::job::from_toml;
use beamsift::report::{member, sheet};
use beamsift::section::Shape;
use beamsift::units::System;

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
    let r = member::member_check(
        &job,
        &prep,
        &shape.describe(System::Si),
        &p,
        mass,
        None,
        System::Si,
    );
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

/// The Markdown sheet with each chart's base64 data URI replaced by the SVG
/// it encodes (so a snapshot diff reads), after checking that encoding the
/// SVG again gives the very same blob (so the snapshot still pins every
/// byte of the sheet).
fn readable(md: &str) -> String {
    use base64::Engine;
    const URI: &str = "data:image/svg+xml;base64,";
    let b64 = base64::engine::general_purpose::STANDARD;
    let mut out = String::new();
    let mut rest = md;
    let mut charts = 0;
    while let Some(i) = rest.find(URI) {
        let blob_start = i + URI.len();
        let len = rest[blob_start..]
            .find(')')
            .expect("a data URI inside an image link");
        let blob = &rest[blob_start..blob_start + len];
        let svg = b64.decode(blob).expect("valid base64");
        assert_eq!(
            b64.encode(&svg),
            blob,
            "the blob is the SVG's canonical base64"
        );
        let svg = String::from_utf8(svg).expect("the SVG is UTF-8");
        out.push_str(&rest[..blob_start]);
        out.push_str("[SVG below, decoded for the snapshot])\n");
        out.push_str(&svg);
        if !svg.ends_with('\n') {
            out.push('\n');
        }
        out.push_str("[end of SVG]");
        rest = &rest[blob_start + len + 1..];
        charts += 1;
    }
    out.push_str(rest);
    assert_eq!(charts, 4, "load, V, M and deflection diagrams");
    out
}

/// Same input, same bytes; and the bytes match the reviewed snapshots in
/// tests/snapshots (insta: review a deliberate change with `cargo insta
/// review`, or accept it with INSTA_UPDATE=always; a mismatch fails).
#[test]
fn report_is_deterministic_and_matches_snapshot() {
    let (md1, html1, _) = build();
    let (md2, html2, _) = build();
    assert_eq!(md1, md2);
    assert_eq!(html1, html2);
    insta::assert_snapshot!("calculation_sheet_markdown", readable(&md1));
    insta::assert_snapshot!("calculation_sheet_html", html1);
}

/// One check line of the sheet, read back as numbers: the heading ("3.29
/// lateral-torsional buckling — D+L, segment 0.000–4.000 m") and its line
/// "utilisation: D unit / C unit = U — passes", demand and capacity in N,
/// N·mm or MPa (the units the library works in).
struct SheetLine {
    heading: String,
    demand: f64,
    capacity: f64,
    utilisation: f64,
}

/// A shown quantity ("14.8 kN·m", "1,234 MPa") in library units.
fn quantity(s: &str) -> f64 {
    let (num, unit) = s.trim().split_once(' ').expect("number and unit");
    let v: f64 = num.replace(',', "").parse().expect("a number");
    v * match unit {
        "MPa" | "mm" => 1.0,
        "kN" => 1e3,
        "kN·m" => 1e6,
        other => panic!("unit {other} not expected in this sheet"),
    }
}

fn sheet_lines(md: &str) -> Vec<SheetLine> {
    let mut v = Vec::new();
    for block in md.split("\n### ").skip(1) {
        let heading = block.lines().next().unwrap().to_string();
        let Some(u) = block
            .lines()
            .find_map(|l| l.trim().strip_prefix("utilisation: "))
        else {
            continue;
        };
        let (ratio, _) = u.split_once(" — ").expect("'— passes' or '— fails'");
        let (dc, util) = ratio.rsplit_once(" = ").expect("D / C = U");
        let (d, c) = dc.split_once(" / ").expect("D / C");
        v.push(SheetLine {
            heading,
            demand: quantity(d),
            capacity: quantity(c),
            utilisation: util.parse().expect("utilisation"),
        });
    }
    v
}

/// Every check line's demand, capacity and utilisation in the sheet are
/// the numbers of the check result (read back from the text, not rebuilt
/// with the library's formatter), and the governing lines equal a hand
/// calculation.
#[test]
fn report_numbers_agree_with_the_check() {
    let (md, _, r) = build();
    let lines = sheet_lines(&md);
    assert!(!r.lines.is_empty());
    // Every line evaluated is a row of the sheet's table of check lines,
    // with its utilisation to 3 decimals.
    let rows: Vec<&str> = md
        .lines()
        .filter(|l| l.ends_with(" (governs) |") || l.contains("| governed by "))
        .collect();
    assert_eq!(rows.len(), r.lines.len(), "one table row per check line");
    for l in &r.lines {
        let want = format!(
            "| {} | {} | {} | {:.3} | ",
            l.label,
            l.combination,
            l.location(System::Si),
            l.utilisation
        );
        assert!(
            rows.iter().any(|row| row.starts_with(&want)),
            "no row {want}"
        );
    }
    // Each check at each part is written once, for the line that governs
    // it: the largest utilisation of that check and part.
    let mut parts: Vec<(String, String)> = r
        .lines
        .iter()
        .map(|l| (l.label.clone(), l.part_shown(System::Si)))
        .collect();
    parts.sort();
    parts.dedup();
    assert_eq!(
        lines.len(),
        parts.len(),
        "one written check per check and part"
    );
    // Shown to 4 significant figures, capacities rounded down: within 1e-3
    // relative of the value; utilisations to 3 decimals.
    for s in &lines {
        let l = r
            .lines
            .iter()
            .find(|l| {
                s.heading.ends_with(&format!(
                    " {} — {}, {}",
                    l.label,
                    l.combination,
                    l.location(System::Si)
                ))
            })
            .unwrap_or_else(|| panic!("no check line for {}", s.heading));
        for other in r
            .lines
            .iter()
            .filter(|o| o.label == l.label && o.part_shown(System::Si) == l.part_shown(System::Si))
        {
            assert!(
                other.utilisation <= l.utilisation,
                "{} does not govern",
                s.heading
            );
        }
        common::close(&format!("{}: demand", s.heading), s.demand, l.demand, 1e-3);
        common::close(
            &format!("{}: capacity", s.heading),
            s.capacity,
            l.capacity,
            1e-3,
        );
        assert!(
            (s.utilisation - l.utilisation).abs() <= 5e-4,
            "{}",
            s.heading
        );
    }
    let find = |prefix: &str| {
        lines
            .iter()
            .find(|s| s.heading.contains(prefix))
            .unwrap_or_else(|| panic!("no line '{prefix}'"))
    };
    // Hand calculation. IPE 200 (the section's dimensions; EN 10365 table,
    // from memory): W_el = 194.3 cm³, W_pl = 220.6 cm³, 22.4 kg/m, so the
    // self-weight is 22.4 × 9.80665 = 0.2197 kN/m. D+L, live on both spans:
    // w = 3 + 5 + 0.2197 = 8.2197 kN/m, and P = 6 kN at a = b = 1.5 m in
    // span 2. Three-moment equation (Clapeyron; any structural analysis
    // text) with pinned ends: 2·M_B·(L1 + L2) = −(w·L1³/4 + w·L2³/4 +
    // P·a·b·(L2 + b)/L2) → M_B = −(131.52 + 55.48 + 20.25)/14 =
    // −14.80 kN·m. Tolerance 0.1 %: the table values are rounded to 4
    // figures.
    let m_b = 14.803e6;
    let hog = find("bending, hogging, top fibre (tension) — D+L");
    common::close("f = M_B/S", hog.demand, m_b / 194.3e3, 1e-3);
    assert_eq!(hog.capacity, 165.0, "Fb as given");
    // u = 76.19/165 = 0.4617, shown to 3 decimals.
    common::close("u = f/Fb", hog.utilisation, m_b / 194.3e3 / 165.0, 2e-3);
    // Shear beside B in span 2: V = w·L2/2 + P·b/L2 + |M_B|/L2 = 12.33 + 3
    // + 4.934 = 20.26 kN. AISC 360-16 G2.1(a): V_n = 0.6·Fy·d·tw·C_v1 =
    // 0.6 × 275 × 200 × 5.6 = 184.8 kN, Ω_v = 1.50 → 123.2 kN.
    let v = find("shear strength — D+L");
    common::close("V at B", v.demand, 20.264e3, 1e-3);
    common::close("V_n/Ω_v", v.capacity, 123.2e3, 1e-3);
    // Flexural yielding, AISC 360-16 F2.1: M_p/Ω_b = Fy·Z_x/1.67 = 275 ×
    // 220.6e3 / 1.67 = 36.33 kN·m.
    let y = find("flexural yielding — D+L, span 1, x = 4 m");
    common::close("M_p/Ω_b", y.capacity, 36.33e6, 1e-3);
    common::close("M at B", y.demand, m_b, 1e-3);
    // The buckling segment over span 1 carries the same M_B; it governs
    // (0.709, the verdict's utilisation).
    let ltb = find("lateral-torsional buckling — D+L, segment 0.000–4.000 m");
    common::close("M_a = M_B", ltb.demand, m_b, 1e-3);
    assert!(md.contains("utilisation of the checks evaluated is 0.709"));
    assert!((r.utilisation - ltb.utilisation).abs() <= 5e-4);
    // The self-weight shown beside the properties.
    let sw = md
        .lines()
        .find_map(|l| l.strip_prefix("| Self-weight load | "))
        .expect("self-weight row");
    let sw: f64 = sw.split(' ').next().unwrap().parse().unwrap();
    common::close("self-weight [kN/m]", sw, 0.2197, 5e-3);
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
    assert_eq!(svgs, 4, "load, V, M and deflection diagrams");
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

/// Names from a user's job reach the sheet as text, never as markup:
/// HTML escaping per the HTML Living Standard (§13.1.2.6, the characters
/// `<`, `&` and `"` in text and attribute values), and the same entities in
/// Markdown, whose viewers render raw HTML (CommonMark 0.31.2, §6.6 "Raw
/// HTML"); `|` escaped inside a pipe-table cell (GFM spec, §4.10).
#[test]
fn names_from_the_job_are_escaped_in_both_formats() {
    let hostile = JOB
        .replace(
            "title = \"Snapshot beam (invented test data)\"",
            "title = \"B1 <script>alert(1)</script> & | co\"",
        )
        .replace("name = \"test steel\"", "name = \"steel <img src=x onerror=1>\"")
        .replace(
            "[presets]",
            "[[combination]]\nname = \"C <svg onload=1> | a\\\\|b\\n# PASSES [x](javascript:1)\"\nfactors = { dead = 1.0, live = 1.0 }\n[presets]",
        );
    let job = from_toml(&hostile, "hostile.toml").unwrap();
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone()).unwrap();
    let shape = Shape::Rect { b: 100.0, d: 300.0 };
    let p = shape.properties().unwrap();
    let r = member::member_check(&job, &prep, "rect", &p, 0.0, None, System::Si);
    let s = sheet::build(&job, &prep, &r, "given", None, System::Si);
    let (md, html) = (sheet::markdown(&s), sheet::html(&s));
    for (what, text) in [("markdown", &md), ("html", &html)] {
        for raw in ["<script", "<img", "<svg onload"] {
            assert!(!text.contains(raw), "{what} carries raw markup {raw}");
        }
        assert!(
            text.contains("B1 &lt;script&gt;alert(1)&lt;/script&gt; &amp;"),
            "{what}"
        );
        assert!(text.contains("C &lt;svg onload=1&gt;"), "{what}");
    }
    // In a pipe table the bar of a name is a character, not a column; a
    // backslash before it stays a backslash (CommonMark §2.4).
    assert!(md.contains("C &lt;svg onload=1&gt; \\|"));
    assert!(md.contains("a\\\\\\|b"), "backslash then bar");
    // A line break in a name starts no heading, and a link in it is text.
    assert!(!md.lines().any(|l| l.starts_with("# PASSES")), "{md}");
    assert!(!md.contains("[x](javascript"), "a live link");
    assert!(md.contains("[x]\\(javascript:1)"), "{md}");
    // Every table row of the Markdown keeps its header's column count.
    for block in md.split("\n\n").filter(|b| b.starts_with("| ")) {
        let cols = |l: &str| l.replace("\\|", "").matches('|').count();
        let mut lines = block.lines();
        let n = cols(lines.next().unwrap());
        for l in lines {
            assert_eq!(cols(l), n, "row with another column count: {l}");
        }
    }
}

/// The `[project]` table reaches the sheet as its title block (HTML and
/// Markdown), a name not given leaves its field blank to sign by hand,
/// and an unknown key in it is refused at its line and column.
#[test]
fn title_block_from_the_project_table() {
    let text = JOB.replace(
        "[beam]",
        "[project]\nproject = \"Test shed (invented)\"\njob_number = \"T-17\"\nengineer = \"E. Xample\"\nrevision = \"B\"\n[beam]",
    );
    let job = from_toml(&text, "tb.toml").unwrap();
    assert_eq!(job.project.project.as_deref(), Some("Test shed (invented)"));
    assert_eq!(job.project.checker, None);
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone()).unwrap();
    let shape = Shape::Rect { b: 100.0, d: 300.0 };
    let p = shape.properties().unwrap();
    let r = member::member_check(&job, &prep, "rect", &p, 0.0, None, System::Si);
    let s = sheet::build(&job, &prep, &r, "given", None, System::Si);
    let (md, html) = (sheet::markdown(&s), sheet::html(&s));
    assert!(
        md.contains("| Test shed (invented) | T-17 |  |  | B |"),
        "{md}"
    );
    assert!(md.contains("| Prepared by (engineer) | E. Xample |  |  |"));
    assert!(
        md.contains("| Checked by (checker) |  |  |  |"),
        "blank checker"
    );
    assert!(html.contains("<div class=\"titleblock\">"));
    assert!(html.contains("<td>T-17</td>"));
    // The title block comes before the first section.
    assert!(html.find("titleblock").unwrap() < html.find("<h2>").unwrap());
    // Unknown key: refused at file:line:column (JOB opens with a blank
    // line and the title, so the key is on line 4, column 1).
    let bad = JOB.replace("[beam]", "[project]\nsheet = \"1\"\n[beam]");
    let e = from_toml(&bad, "tb.toml").unwrap_err().to_string();
    assert!(e.contains("tb.toml:4:1"), "{e}");
    assert!(e.contains("sheet"), "{e}");
}

/// Every top-level heading of the sheet is numbered 1, 2, 3 … without a
/// gap, and each check's number starts with that of the checks section;
/// with and without the catalogue alternatives and near misses.
#[test]
fn section_numbers_have_no_gaps() {
    let (md, html, _) = build();
    let with = {
        let job = from_toml(JOB, "snap.toml").unwrap();
        let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone()).unwrap();
        let p = Shape::Rect { b: 100.0, d: 300.0 }.properties().unwrap();
        let r = member::member_check(&job, &prep, "rect", &p, 0.0, None, System::Si);
        let alt = beamsift::report::Table::new("Next lightest passing sections", &[]);
        sheet::markdown(
            &sheet::build(&job, &prep, &r, "given", Some(alt), System::Si)
                .with_near_misses(Some(beamsift::report::Table::new("Near misses", &[]))),
        )
    };
    for text in [&md, &with] {
        let nums: Vec<u32> = text
            .lines()
            .filter_map(|l| l.strip_prefix("## "))
            .map(|h| {
                h.split('.')
                    .next()
                    .unwrap()
                    .parse()
                    .unwrap_or_else(|_| panic!("unnumbered heading {h}"))
            })
            .collect();
        assert_eq!(
            nums,
            (1..=nums.len() as u32).collect::<Vec<_>>(),
            "{nums:?}"
        );
        let checks = text
            .lines()
            .find_map(|l| l.strip_prefix("## ").filter(|h| h.ends_with("Checks")))
            .unwrap();
        let k = checks.split('.').next().unwrap();
        let subs: Vec<&str> = text
            .lines()
            .filter_map(|l| l.strip_prefix("### "))
            .collect();
        assert!(!subs.is_empty());
        for (i, h) in subs.iter().enumerate() {
            assert!(h.starts_with(&format!("{k}.{} ", i + 1)), "{h}");
        }
    }
    assert!(with.contains("Alternatives from the catalogue"));
    // The HTML has the same headings.
    assert_eq!(
        html.matches("<h2").count(),
        md.lines().filter(|l| l.starts_with("## ")).count()
    );
}

/// Every check line names the combination and load pattern that govern
/// it (a patterned combination names its parts).
#[test]
fn every_check_line_names_its_governing_pattern() {
    let (md, html, r) = build();
    let blocks: Vec<&str> = md.split("\n### ").skip(1).collect();
    assert!(!blocks.is_empty() && blocks.len() <= r.lines.len());
    for b in &blocks {
        let g = b
            .lines()
            .find(|l| l.starts_with("Governing: combination "))
            .unwrap_or_else(|| panic!("no governing line in {b}"));
        assert!(
            g.contains("load pattern: live on span") || g.contains("no patterned loads"),
            "{g}"
        );
    }
    // D+L patterns the live load span by span (the job's live case).
    assert!(md.contains("Governing: combination D+L, load pattern: live on span 1"));
    assert_eq!(
        html.matches("governing: combination ").count(),
        blocks.len()
    );
}

/// One sign convention for deflection: positive downward in the extremes
/// table, the check line and the chart label. Simply supported span
/// L = 6 m, uniform w = 10 kN/m, rectangle 100 × 300 mm (I = b·d³/12 =
/// 225 × 10⁶ mm⁴), E = 200 GPa, no self-weight: midspan deflection
/// 5·w·L⁴/(384·E·I) = 5 × 10 × 6000⁴ / (384 × 200,000 × 225 × 10⁶) =
/// 3.750 mm downward (Roark's Formulas for Stress and Strain, Table 8.1
/// case 2e; any structural analysis text), at x = 3 m.
#[test]
fn deflection_is_positive_downward_everywhere() {
    let text = r#"
title = "Simply supported UDL (invented test data)"
[beam]
spans = ["6 m"]
supports = ["pinned", "pinned"]
[material]
name = "test"
E = "200 GPa"
Fb = "165 MPa"
Fv = "100 MPa"
density = "7850 kg/m3"
[[case]]
name = "live"
category = "live"
[[load]]
case = "live"
uniform = "10 kN/m"
[[combination]]
name = "L"
factors = { live = 1.0 }
[[combination]]
name = "L service"
kind = "service"
factors = { live = 1.0 }
limit = "L/360"
[checks]
self_weight = false
"#;
    let job = from_toml(text, "udl.toml").unwrap();
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone()).unwrap();
    let p = Shape::Rect { b: 100.0, d: 300.0 }.properties().unwrap();
    common::close("I", p.ix, 225e6, 1e-12);
    let r = member::member_check(&job, &prep, "rect", &p, 0.0, None, System::Si);
    let s = sheet::build(&job, &prep, &r, "given", None, System::Si);
    let md = sheet::markdown(&s);
    assert!(
        md.contains("deflection δ positive downward"),
        "the convention stated"
    );
    // Extremes table: 3.75 mm down at 3 m (4 significant figures).
    assert!(md.contains("| L service | span 1 |"), "{md}");
    let row = md
        .lines()
        .find(|l| l.starts_with("| L service | span 1 |"))
        .unwrap();
    assert!(row.contains("| 3.75 at 3 |"), "{row}");
    // The check line keeps the sign and says which way.
    assert!(md.contains("δ = 3.75 mm (downward), |δ| = 3.75 mm"), "{md}");
    // The chart's label of the extreme shows the same signed value.
    let fig = s
        .figures
        .iter()
        .find(|f| f.caption.starts_with("Deflection"))
        .expect("a deflection diagram");
    assert!(fig.caption.contains("positive downward"));
    assert!(fig.svg.contains("3.75 mm at 3 m"), "chart label");
    assert!(!fig.svg.contains("-3.75 mm"), "no other sign in the chart");
}

/// The printed sheet: the print rules a browser needs for A4 and Letter
/// (CSS Paged Media: `@page { size: auto }` takes the printer's paper),
/// a page break before each top-level section, tables, figures and checks
/// kept whole, no dark backgrounds; and the load diagram names the job's
/// loads by case (JOB: 3 kN/m dead, 5 kN/m and 6 kN live).
#[test]
fn print_rules_and_load_diagram() {
    let (_, html, _) = build();
    let style = &html[html.find("<style>").unwrap()..html.find("</style>").unwrap()];
    let print = &style[style.find("@media print").expect("print rules")..];
    assert!(style.contains("@page{size:auto;margin:"));
    assert!(print.contains("h2{break-before:page"));
    assert!(print.contains("table,figure,.check,.titleblock{break-inside:avoid"));
    assert!(print.contains("th{background:none}"));
    let fig = &html[html.find("Loads by case").expect("load diagram")..];
    let fig = &fig[..fig.find("</figure>").unwrap()];
    for label in ["3 kN/m", "5 kN/m", "6 kN", "pinned"] {
        assert!(fig.contains(label), "{label} in the load diagram");
    }
}
