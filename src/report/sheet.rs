//! Rendering the calculation sheet as self-contained Markdown (figures as
//! data-URI images) and self-contained, well-formed HTML (inline SVG, inline
//! style, no external assets). The layout is our own: a plain, printable
//! worksheet in the order a checker reads it.

use super::calc::{self, Sheet, TableOut};
use super::member::{self, MemberCheck};
use super::{Align, CAUTION, Table};
use crate::check::{Material, Prepared, Verdict};
use crate::job::Job;
use crate::search::{Candidate, Selection};
use crate::section::Properties;
use crate::units::{Show, System};

/// A sheet with the verdict it reports.
pub struct Written {
    pub sheet: Sheet,
    pub verdict: Verdict,
}

impl Written {
    pub fn verdict_word(&self) -> &'static str {
        self.verdict.word()
    }
}

/// What a sheet is about: the section, where it came from, what else passed.
pub struct Subject<'a> {
    pub name: &'a str,
    pub properties: &'a Properties,
    /// kg/m.
    pub mass: f64,
    pub source: String,
    pub alternatives: Option<Table>,
    /// The row's own material, where a catalogue row names a grade.
    pub material: Option<&'a Material>,
}

/// Check a section and write its sheet.
pub fn for_section(job: &Job, prep: &Prepared, s: Subject<'_>, sys: System) -> Written {
    let r = member::member_check(job, prep, s.name, s.properties, s.mass, s.material);
    Written {
        sheet: build(job, prep, &r, &s.source, s.alternatives, sys),
        verdict: r.verdict,
    }
}

/// The sheet of a catalogue row found by a scan (with the next lightest
/// passing rows as alternatives).
pub fn for_candidate(
    job: &Job,
    prep: &Prepared,
    sel: &Selection,
    c: &Candidate,
    sys: System,
) -> Written {
    let mats = crate::catalog::Materials {
        base: &job.material,
        grades: &job.grades,
    };
    let m = mats.get(&c.material).clone();
    for_section(
        job,
        prep,
        Subject {
            name: &c.name,
            properties: &c.properties,
            mass: c.mass,
            source: candidate_source(sel, c),
            alternatives: alternatives(&sel.lists[0].items, &c.name, sys),
            material: Some(&m),
        },
        sys,
    )
}

/// A table of alternatives from a scan.
pub fn alternatives(list: &[Candidate], skip: &str, sys: System) -> Option<Table> {
    let mut t = Table::new(
        "Next lightest passing sections",
        &[
            ("Section", Align::Left),
            ("Mass", Align::Right),
            ("Depth", Align::Right),
            ("Utilisation", Align::Right),
            ("Governed by", Align::Left),
        ],
    );
    for c in list.iter().filter(|c| c.name != skip).take(5) {
        t.row(vec![
            c.name.clone(),
            Show::Mass.fmt(c.mass, sys),
            Show::Dimension.fmt(c.depth, sys),
            format!("{:.3}", c.utilisation),
            c.governing
                .map(|g| g.kind.label().to_string())
                .unwrap_or_default(),
        ]);
    }
    (!t.rows.is_empty()).then_some(t)
}

/// How the scan that found a sheet's section read its catalogue: rows
/// read, the filters and what they left out, bad rows skipped.
pub fn scan_note(sel: &Selection, filters: &crate::search::Filters, skip_bad_rows: bool) -> String {
    let c = &sel.counts;
    let mut s = format!("chosen among {} row(s) read", c.rows);
    let f = filters.describe();
    if !f.is_empty() {
        s.push_str(&format!(
            ", filtered to {} ({} row(s) left out)",
            f.join(", "),
            c.filtered
        ));
    }
    if skip_bad_rows {
        s.push_str(&format!(", {} bad row(s) skipped", c.bad));
    }
    s
}

/// Where a catalogue section's properties came from, for the sheet.
pub fn candidate_source(sel: &Selection, c: &Candidate) -> String {
    format!(
        "catalogue {} line {}; {}",
        sel.files.get(c.file).cloned().unwrap_or_default(),
        c.line,
        if c.shape.is_some() {
            "properties computed from its dimensions (given values used where the row has them)"
        } else {
            "properties as given by the row"
        }
    )
}

/// Assemble the sheet for a checked member.
pub fn build(
    job: &Job,
    prep: &Prepared,
    r: &MemberCheck,
    source: &str,
    alternatives: Option<Table>,
    sys: System,
) -> Sheet {
    let mut tables: Vec<TableOut> = member::job_tables(job, sys)
        .into_iter()
        .map(TableOut::from)
        .collect();
    tables.extend(
        calc::reaction_tables(r, sys)
            .into_iter()
            .map(TableOut::from),
    );
    tables.push(calc::extremes_table(r, sys).into());
    if let Some(st) = super::member::settlements_table(r, sys) {
        tables.push(st.into());
    }
    tables.push(calc::section_table(r, sys).into());
    let verdict = match &r.governing {
        Some(g) => format!(
            "{}: the largest utilisation of the checks evaluated is {:.3}, from {} under {} ({}).{}",
            r.verdict.word(),
            r.utilisation,
            g.label,
            g.combination,
            g.part,
            if r.verdict == Verdict::NotVerified {
                " Some limit states that apply could not be evaluated (section 7): this is not a pass."
            } else {
                ""
            }
        ),
        None => format!("{}: no check line was evaluated.", r.verdict.word()),
    };
    let (methods, assumptions) = calc::methods(prep, r);
    Sheet {
        title: format!("Calculation: {}", job.title),
        member: job.title.clone(),
        section: r.section.clone(),
        section_source: source.to_string(),
        verdict,
        tables,
        figures: calc::figures(r, sys),
        checks: calc::written_checks(r, sys),
        alternatives: alternatives.map(TableOut::from),
        methods,
        assumptions,
        not_verified: r.not_verified.clone(),
        excluded: r.excluded.clone(),
        not_checked: r.not_checked.clone(),
        notes: r.notes.clone(),
        caution: CAUTION,
        generator: format!("beamsift {}", env!("CARGO_PKG_VERSION")),
    }
}

fn md_table(t: &TableOut) -> String {
    let mut s = String::new();
    if !t.title.is_empty() {
        s.push_str(&format!("**{}**\n\n", t.title));
    }
    s.push_str(&format!("| {} |\n|", t.headers.join(" | ")));
    for r in &t.right {
        s.push_str(if *r { "---:|" } else { "---|" });
    }
    s.push('\n');
    for row in &t.rows {
        s.push_str(&format!(
            "| {} |\n",
            row.iter()
                .map(|c| c.replace('|', "\\|"))
                .collect::<Vec<_>>()
                .join(" | ")
        ));
    }
    s.push('\n');
    s
}

/// Standard base64 (RFC 4648) for data URIs.
pub fn base64(data: &[u8]) -> String {
    const A: &[u8; 64] = b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
    let mut out = String::with_capacity(data.len().div_ceil(3) * 4);
    for chunk in data.chunks(3) {
        let b = [
            chunk[0],
            *chunk.get(1).unwrap_or(&0),
            *chunk.get(2).unwrap_or(&0),
        ];
        let n = (b[0] as u32) << 16 | (b[1] as u32) << 8 | b[2] as u32;
        for k in 0..4 {
            if k <= chunk.len() {
                out.push(A[(n >> (18 - 6 * k) & 63) as usize] as char);
            } else {
                out.push('=');
            }
        }
    }
    out
}

pub fn markdown(s: &Sheet) -> String {
    let mut o = String::new();
    o.push_str(&format!("# {}\n\n", s.title));
    o.push_str(&format!("> {}\n\n", s.caution));
    o.push_str(&format!(
        "**Section:** {} — {}.\n\n",
        s.section, s.section_source
    ));
    o.push_str(&format!("**Result:** {}\n\n", s.verdict));
    o.push_str(&format!("{}\n\n", calc::VERDICTS));
    o.push_str("## 1. Member, loads and combinations\n\n");
    for t in &s.tables {
        o.push_str(&md_table(t));
    }
    o.push_str("## 2. Diagrams\n\n");
    for f in &s.figures {
        o.push_str(&format!(
            "![{}](data:image/svg+xml;base64,{})\n\n",
            f.caption,
            base64(f.svg.as_bytes())
        ));
    }
    o.push_str("## 3. Checks\n\n");
    for (i, c) in s.checks.iter().enumerate() {
        o.push_str(&format!(
            "### 3.{} {} — {}, {}\n\n",
            i + 1,
            c.check,
            c.combination,
            c.location
        ));
        o.push_str(&format!("    {}\n", c.formula));
        for line in &c.substitution {
            o.push_str(&format!("      {line}\n"));
        }
        o.push_str(&format!("      {}\n", c.result));
        o.push_str(&format!("    allowable: {}\n", c.allowable));
        o.push_str(&format!(
            "    utilisation: {} — {}\n\n",
            c.utilisation,
            if c.passes { "passes" } else { "FAILS" }
        ));
    }
    if let Some(t) = &s.alternatives {
        o.push_str("## 4. Alternatives from the catalogue\n\n");
        o.push_str(&md_table(t));
    }
    o.push_str("## 5. Methods and sources\n\n");
    for m in &s.methods {
        o.push_str(&format!("- {m}\n"));
    }
    o.push_str("\n## 6. Assumptions\n\n");
    for a in &s.assumptions {
        o.push_str(&format!("- {a}\n"));
    }
    for (title, items, empty) in [
        (
            "7. Not verified",
            &s.not_verified,
            "Every limit state that applies was evaluated.",
        ),
        (
            "8. Excluded by the user",
            &s.excluded,
            "Nothing was excluded.",
        ),
        ("9. Not checked (outside beamsift)", &s.not_checked, ""),
    ] {
        o.push_str(&format!("\n## {title}\n\n"));
        if items.is_empty() {
            o.push_str(&format!("{empty}\n"));
        }
        for n in items {
            o.push_str(&format!("- {n}\n"));
        }
    }
    if !s.notes.is_empty() {
        o.push_str("\n## Notes\n\n");
        for n in &s.notes {
            o.push_str(&format!("- {n}\n"));
        }
    }
    o.push_str(&format!(
        "\n---\n\n{}\n\n*Prepared with {}.*\n",
        s.caution, s.generator
    ));
    o
}

/// Escape text for HTML/XML.
pub fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

fn html_table(t: &TableOut) -> String {
    let mut s = String::from("<table>\n");
    if !t.title.is_empty() {
        s.push_str(&format!("<caption>{}</caption>\n", esc(&t.title)));
    }
    s.push_str("<thead><tr>");
    for (i, h) in t.headers.iter().enumerate() {
        s.push_str(&format!(
            "<th{}>{}</th>",
            if t.right.get(i) == Some(&true) {
                " class=\"num\""
            } else {
                ""
            },
            esc(h)
        ));
    }
    s.push_str("</tr></thead>\n<tbody>\n");
    for row in &t.rows {
        s.push_str("<tr>");
        for (i, c) in row.iter().enumerate() {
            s.push_str(&format!(
                "<td{}>{}</td>",
                if t.right.get(i) == Some(&true) {
                    " class=\"num\""
                } else {
                    ""
                },
                esc(c)
            ));
        }
        s.push_str("</tr>\n");
    }
    s.push_str("</tbody>\n</table>\n");
    s
}

/// Strip the XML prologue plotters may emit, so SVG can sit inline.
fn inline_svg(svg: &str) -> &str {
    match svg.find("<svg") {
        Some(i) => &svg[i..],
        None => svg,
    }
}

const STYLE: &str = "body{font-family:sans-serif;max-width:60em;margin:2em auto;padding:0 1em;color:#111;line-height:1.4}\
h1{font-size:1.5em;border-bottom:2px solid #333}h2{font-size:1.2em;margin-top:2em;border-bottom:1px solid #999}\
h3{font-size:1em;margin:1.2em 0 .3em}table{border-collapse:collapse;margin:.8em 0;font-size:.9em}\
caption{text-align:left;font-weight:bold;padding:.3em 0}th,td{border:1px solid #bbb;padding:.2em .5em;vertical-align:top}\
th{background:#eee}td.num,th.num{text-align:right}.calc{font-family:monospace;white-space:pre-wrap;background:#f7f7f7;\
border-left:3px solid #666;padding:.4em .8em;margin:.3em 0}.fail{color:#b00;font-weight:bold}.unverified{color:#840;font-weight:bold}.pass{color:#060}\
.caution{border:2px solid #b60;background:#fff6e8;padding:.6em 1em}figure{margin:1em 0}svg{max-width:100%;height:auto}\
@media print{h2{page-break-after:avoid}.check{page-break-inside:avoid}}";

pub fn html(s: &Sheet) -> String {
    let mut o = String::new();
    o.push_str("<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n");
    o.push_str(&format!(
        "<title>{}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n",
        esc(&s.title)
    ));
    o.push_str(&format!("<h1>{}</h1>\n", esc(&s.title)));
    o.push_str(&format!("<p class=\"caution\">{}</p>\n", esc(s.caution)));
    o.push_str(&format!(
        "<p><strong>Section:</strong> {} — {}.</p>\n",
        esc(&s.section),
        esc(&s.section_source)
    ));
    let cls = if s.verdict.starts_with("PASSES") {
        "pass"
    } else if s.verdict.starts_with("NOT VERIFIED") {
        "unverified"
    } else {
        "fail"
    };

    o.push_str(&format!(
        "<p><strong>Result:</strong> <span class=\"{cls}\">{}</span></p>\n",
        esc(&s.verdict)
    ));
    o.push_str(&format!("<p>{}</p>\n", esc(calc::VERDICTS)));
    o.push_str("<h2>1. Member, loads and combinations</h2>\n");
    for t in &s.tables {
        o.push_str(&html_table(t));
    }
    o.push_str("<h2>2. Diagrams</h2>\n");
    for f in &s.figures {
        o.push_str(&format!(
            "<figure>\n{}\n<figcaption>{}</figcaption>\n</figure>\n",
            inline_svg(&f.svg),
            esc(&f.caption)
        ));
    }
    o.push_str("<h2>3. Checks</h2>\n");
    for (i, c) in s.checks.iter().enumerate() {
        o.push_str(&format!(
            "<div class=\"check\">\n<h3>3.{} {} — {}, {}</h3>\n<div class=\"calc\">",
            i + 1,
            esc(&c.check),
            esc(&c.combination),
            esc(&c.location)
        ));
        o.push_str(&esc(&c.formula));
        for line in &c.substitution {
            o.push_str(&format!("\n  {}", esc(line)));
        }
        o.push_str(&format!(
            "\n  {}\nallowable: {}\nutilisation: {} — ",
            esc(&c.result),
            esc(&c.allowable),
            esc(&c.utilisation)
        ));
        o.push_str(if c.passes {
            "<span class=\"pass\">passes</span>"
        } else {
            "<span class=\"fail\">FAILS</span>"
        });
        o.push_str("</div>\n</div>\n");
    }
    if let Some(t) = &s.alternatives {
        o.push_str("<h2>4. Alternatives from the catalogue</h2>\n");
        o.push_str(&html_table(t));
    }
    let list = |o: &mut String, title: &str, items: &[String]| {
        o.push_str(&format!("<h2>{}</h2>\n<ul>\n", esc(title)));
        for i in items {
            o.push_str(&format!("<li>{}</li>\n", esc(i)));
        }
        o.push_str("</ul>\n");
    };
    list(&mut o, "5. Methods and sources", &s.methods);
    list(&mut o, "6. Assumptions", &s.assumptions);
    let or_none = |v: &[String], none: &str| -> Vec<String> {
        if v.is_empty() {
            vec![none.to_string()]
        } else {
            v.to_vec()
        }
    };
    list(
        &mut o,
        "7. Not verified",
        &or_none(
            &s.not_verified,
            "Every limit state that applies was evaluated.",
        ),
    );
    list(
        &mut o,
        "8. Excluded by the user",
        &or_none(&s.excluded, "Nothing was excluded."),
    );
    list(&mut o, "9. Not checked (outside beamsift)", &s.not_checked);
    if !s.notes.is_empty() {
        list(&mut o, "Notes", &s.notes);
    }
    o.push_str(&format!(
        "<p class=\"caution\">{}</p>\n<p><em>Prepared with {}.</em></p>\n</body>\n</html>\n",
        esc(s.caution),
        esc(&s.generator)
    ));
    o
}
