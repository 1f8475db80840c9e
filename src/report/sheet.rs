//! Rendering the calculation sheet as self-contained Markdown (figures as
//! data-URI images) and self-contained, well-formed HTML (inline SVG, inline
//! style, no external assets). The layout is our own: a plain, printable
//! worksheet in the order a checker reads it.

use super::calc::{self, Sheet};
use super::member::{self, MemberCheck};
use super::{Align, Block, CAUTION, Document, Table, Tone};
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

/// What a sheet is about: the section, where it came from, what else passed.
pub struct Subject<'a> {
    pub name: &'a str,
    pub properties: &'a Properties,
    /// kg/m.
    pub mass: f64,
    pub source: String,
    pub alternatives: Option<Table>,
    /// The sections that nearly passed (failing rows lighter than this
    /// one), where the section came from a scan.
    pub near_misses: Option<Table>,
    /// The row's own material, where a catalogue row names a grade.
    pub material: Option<&'a Material>,
}

/// Check a section and write its sheet.
pub fn for_section(job: &Job, prep: &Prepared, s: Subject<'_>, sys: System) -> Written {
    let r = member::member_check(job, prep, s.name, s.properties, s.mass, s.material, sys);
    Written {
        sheet: build(job, prep, &r, &s.source, s.alternatives, sys).with_near_misses(s.near_misses),
        verdict: r.verdict,
    }
}

/// The sheet of a catalogue row found by a scan, in the row's own
/// material; with `alternatives`, the next lightest passing rows too.
pub fn for_candidate(
    job: &Job,
    prep: &Prepared,
    sel: &Selection,
    c: &Candidate,
    alternatives: bool,
    sys: System,
) -> Written {
    let m = crate::catalog::Materials::of(job).get(&c.material).clone();
    for_section(
        job,
        prep,
        Subject {
            name: &c.name,
            properties: &c.properties,
            mass: c.mass,
            source: candidate_source(sel, c),
            alternatives: if alternatives {
                self::alternatives(&sel.lists[0].items, &c.name, sys)
            } else {
                None
            },
            near_misses: Some(near_misses(prep, &sel.near_misses.items, c, sys)),
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

/// The near misses of a scan: the failing rows lighter than the section
/// reported, least utilised first (the scan keeps them in that order), at
/// most five.
pub fn near_misses(prep: &Prepared, list: &[Candidate], chosen: &Candidate, sys: System) -> Table {
    let mut t = Table::new(
        format!(
            "Near misses: sections lighter than {} that fail, least utilised first",
            chosen.name
        ),
        &[
            ("Section", Align::Left),
            ("Mass", Align::Right),
            ("Depth", Align::Right),
            ("Utilisation", Align::Right),
            ("Governed by", Align::Left),
            ("Combination", Align::Left),
        ],
    );
    for c in list
        .iter()
        .filter(|c| c.name != chosen.name && c.mass < chosen.mass)
        .take(5)
    {
        t.row(vec![
            c.name.clone(),
            Show::Mass.fmt(c.mass, sys),
            Show::Dimension.fmt(c.depth, sys),
            format!("{:.3}", c.utilisation),
            c.governing
                .map(|g| g.kind.label().to_string())
                .unwrap_or_default(),
            c.governing
                .and_then(|g| prep.demand.combos.get(g.combo))
                .map(|k| k.name.clone())
                .unwrap_or_default(),
        ]);
    }
    t
}

/// How the scan that found a sheet's section read its catalogue: rows
/// read, the filters and what they left out, bad rows skipped.
pub fn scan_note(
    sel: &Selection,
    filters: &crate::search::Filters,
    skip_bad_rows: bool,
    sys: System,
) -> String {
    let c = &sel.counts;
    let mut s = format!("chosen among {} row(s) read", c.rows);
    let f = filters.describe(sys);
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

/// What a sheet says of the rows the duplicate filter flagged, if any.
fn flagged_words(c: &crate::search::Counts) -> String {
    if c.flagged == 0 {
        return String::new();
    }
    format!(
        "; its name was checked exactly against every row; {} other row(s) flagged by the duplicate-name filter were not confirmed (`beamsift catalog validate` lists every repeat)",
        crate::units::count(c.flagged)
    )
}

/// Where a catalogue section's properties came from, for the sheet.
pub fn candidate_source(sel: &Selection, c: &Candidate) -> String {
    format!(
        "catalogue {} line {}; {}{}",
        sel.files.get(c.file).cloned().unwrap_or_default(),
        c.line,
        if c.shape.is_some() {
            "properties computed from its dimensions (given values used where the row has them)"
        } else {
            "properties as given by the row"
        },
        flagged_words(&sel.counts)
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
    let mut tables: Vec<Table> = member::job_tables(job, sys);
    tables.extend(calc::reaction_tables(r, sys));
    tables.push(calc::extremes_table(r, sys));
    if let Some(st) = super::member::settlements_table(r, sys) {
        tables.push(st);
    }
    tables.push(calc::section_table(r, sys));
    let verdict = match &r.governing {
        Some(g) => format!(
            "{}: the largest utilisation of the checks evaluated is {:.3}, from {} under {} ({}).{}",
            r.verdict.word(),
            r.utilisation,
            g.label,
            g.combination,
            g.part_shown(sys),
            if r.verdict == Verdict::NotVerified {
                " Some limit states that apply could not be evaluated (see \"Not verified\"): this is not a pass."
            } else {
                ""
            }
        ),
        None => format!("{}: no check line was evaluated.", r.verdict.word()),
    };
    let (methods, assumptions) = calc::methods(prep, r, sys);
    Sheet {
        title: format!("Calculation: {}", job.title),
        project: job.project.clone(),
        member: job.title.clone(),
        section: r.section.clone(),
        section_source: source.to_string(),
        verdict,
        tables,
        figures: std::iter::once(calc::load_figure(job, r, sys))
            .chain(calc::figures(r, sys))
            .collect(),
        checks: calc::written_checks(r, sys),
        alternatives,
        near_misses: None,
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

/// The sheet as a document, in the order a checker reads it. The
/// top-level sections are numbered in the order they appear, so a section
/// left out (no alternatives, no notes) leaves no gap.
pub fn document(s: &Sheet) -> Document {
    let mut d = Document::new(s.title.clone());
    d.blocks
        .push(Block::TitleBlock(calc::title_block(&s.project)));
    d.blocks.push(Block::Caution(s.caution.to_string()));
    d.blocks.push(Block::Labelled(
        "Section:".into(),
        format!("{} — {}.", s.section, s.section_source),
        Tone::Plain,
    ));
    let tone = if s.verdict.starts_with("PASSES") {
        Tone::Pass
    } else if s.verdict.starts_with("NOT VERIFIED") {
        Tone::Unverified
    } else {
        Tone::Fail
    };
    d.blocks
        .push(Block::Labelled("Result:".into(), s.verdict.clone(), tone));
    d.para(calc::VERDICTS);
    let mut n = 0;
    let mut heading = |d: &mut Document, title: &str| -> usize {
        n += 1;
        // The short closing sections share the printed page of the
        // methods and sources.
        let text = format!("{n}. {title}");
        if matches!(
            title,
            "Assumptions"
                | "Not verified"
                | "Excluded by the user"
                | "Not checked (outside beamsift)"
                | "Notes"
        ) {
            d.blocks.push(Block::HeadingRunOn(text));
        } else {
            d.heading(text);
        }
        n
    };
    heading(&mut d, "Member, loads and combinations");
    d.para(calc::SIGNS);
    for t in &s.tables {
        d.table(t.clone());
    }
    heading(&mut d, "Diagrams");
    for f in &s.figures {
        d.blocks.push(Block::Figure(f.clone()));
    }
    let k = heading(&mut d, "Checks");
    checks(&mut d, k, &s.checks);
    if s.alternatives.is_some() || s.near_misses.is_some() {
        heading(&mut d, "Alternatives from the catalogue");
        if let Some(t) = &s.alternatives {
            d.table(t.clone());
        }
        match &s.near_misses {
            Some(t) if !t.rows.is_empty() => d.table(t.clone()),
            Some(_) => d.para(format!(
                "Near misses: no section lighter than {} that fails was among the rows the scan kept.",
                s.section
            )),
            None => {}
        }
    }
    let or_none = |v: &[String], none: &str| -> Vec<String> {
        if v.is_empty() && !none.is_empty() {
            vec![none.to_string()]
        } else {
            v.to_vec()
        }
    };
    for (title, items, none) in [
        ("Methods and sources", &s.methods, ""),
        ("Assumptions", &s.assumptions, ""),
        (
            "Not verified",
            &s.not_verified,
            "Every limit state that applies was evaluated.",
        ),
        ("Excluded by the user", &s.excluded, "Nothing was excluded."),
        ("Not checked (outside beamsift)", &s.not_checked, ""),
    ] {
        heading(&mut d, title);
        d.list("", or_none(items, none));
    }
    if !s.notes.is_empty() {
        heading(&mut d, "Notes");
        d.list("", s.notes.clone());
    }
    d.blocks.push(Block::Caution(s.caution.to_string()));
    d.blocks
        .push(Block::Footer(format!("Prepared with {}.", s.generator)));
    d
}

/// The checks section: every line evaluated, under every combination, in
/// one table grouped by check and place; then, for each check at each
/// span, overhang or segment, the line that governs it (the largest
/// utilisation over the combinations; the first of equals) written out in
/// full, numbered `k.1`, `k.2`, … The
/// table names where each line is written or which written line governs
/// it, so nothing evaluated is left out of the sheet.
fn checks(d: &mut Document, k: usize, all: &[calc::WrittenCheck]) {
    // Groups (check, part) in the order they first appear, each with the
    // index of its governing line.
    let mut groups: Vec<(&str, &str, usize)> = Vec::new();
    let mut group_of = Vec::with_capacity(all.len());
    for (i, c) in all.iter().enumerate() {
        let g = match groups
            .iter()
            .position(|(ch, p, _)| *ch == c.check && *p == c.part)
        {
            Some(g) => g,
            None => {
                groups.push((&c.check, &c.part, i));
                groups.len() - 1
            }
        };
        let best = &mut groups[g].2;
        if c.ratio > all[*best].ratio {
            *best = i;
        }
        group_of.push(g);
    }
    d.para(format!(
        "{} check line(s) were evaluated: every check, under every combination, at each span, overhang and buckling segment. The table lists them all, grouped by check and place; below it, the line that governs each check at each place (the largest utilisation over the combinations) is written out in full, {} in all.",
        all.len(),
        groups.len()
    ));
    let mut t = Table::new(
        "Every check line",
        &[
            ("Check", Align::Left),
            ("Combination", Align::Left),
            ("Where", Align::Left),
            ("Utilisation", Align::Right),
            ("Result", Align::Left),
            ("Written in full", Align::Left),
        ],
    );
    // Grouped by the written check, combinations in their order.
    let mut order: Vec<usize> = (0..all.len()).collect();
    order.sort_by_key(|&i| group_of[i]);
    for i in order {
        let (c, g) = (&all[i], group_of[i]);
        t.row(vec![
            c.check.clone(),
            c.combination.clone(),
            c.location.clone(),
            format!("{:.3}", c.ratio),
            if c.passes { "passes" } else { "FAILS" }.into(),
            if groups[g].2 == i {
                format!("{k}.{} (governs)", g + 1)
            } else {
                format!("governed by {k}.{}", g + 1)
            },
        ]);
    }
    d.table(t);
    for (g, (_, _, i)) in groups.iter().enumerate() {
        let c = &all[*i];
        d.blocks.push(Block::Check(
            format!(
                "{k}.{} {} — {}, {}",
                g + 1,
                c.check,
                c.combination,
                c.location
            ),
            c.clone(),
        ));
    }
}

/// The sheet as self-contained Markdown (figures as data-URI images).
pub fn markdown(s: &Sheet) -> String {
    super::markdown::render(&document(s))
}

/// The sheet as one self-contained HTML page (inline SVG and style).
pub fn html(s: &Sheet) -> String {
    super::html::render(&document(s))
}
