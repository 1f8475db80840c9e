//! The selection and the shortlist: ranked rows as serialised, and their
//! documents (the tables a person reads). Built from a finished scan; no
//! checking happens here.

use super::{Align, CAUTION, Document, Table, member};
use crate::catalog::Prices;
use crate::check::{Prepared, Verdict};
use crate::job::Job;
use crate::search::{self, Candidate, Rank, Selection};
use crate::units::{self, Show, System};
use serde::Serialize;

/// A ranked row as printed and serialised.
#[derive(Serialize)]
pub struct RankedRow {
    pub rank: usize,
    #[serde(flatten)]
    pub candidate: Candidate,
    pub governing_check: String,
    pub governing_combination: String,
    pub governing_where: String,
    /// The span or overhang holding the governing position (no units:
    /// for the data tables, beside the position as a number).
    #[serde(skip)]
    pub governing_part: String,
    /// 1 − utilisation.
    pub margin: f64,
    pub file: String,
}

#[derive(Serialize)]
pub struct SelectResult<'a> {
    pub title: String,
    pub rank: Rank,
    pub passing: Vec<RankedRow>,
    pub pareto: Vec<RankedRow>,
    pub near_misses: Vec<RankedRow>,
    /// Rows that are not verified, lightest first (never ranked with the
    /// passing ones unless --include-unverified).
    pub not_verified: Vec<RankedRow>,
    pub counts: &'a search::Counts,
    pub skipped_rows: &'a [String],
    /// The prices (`"prices": "none"` without any; the currency or null).
    #[serde(flatten)]
    pub prices: Prices,
    pub excluded: Vec<String>,
    pub assumptions: Vec<String>,
    pub notes: Vec<String>,
    pub caution: &'static str,
}

/// The rows of a list, ranked, with where each is governed (a position in
/// the display units, as every other position).
pub fn ranked(prep: &Prepared, sel: &Selection, list: &[Candidate], sys: System) -> Vec<RankedRow> {
    list.iter()
        .enumerate()
        .map(|(i, c)| {
            let part = c
                .governing
                .as_ref()
                .map(|g| crate::member::part_at(prep, g.x))
                .unwrap_or_default();
            let (check, combo, place) = match &c.governing {
                Some(g) => (
                    g.kind.short().to_string(),
                    prep.demand.combos[g.combo].name.clone(),
                    format!(
                        "{}, x = {}",
                        member::part_of(prep, g, sys),
                        Show::Span.fmt(g.x, sys)
                    ),
                ),
                None => (String::new(), String::new(), String::new()),
            };
            RankedRow {
                rank: i + 1,
                candidate: c.clone(),
                governing_check: check,
                governing_combination: combo,
                governing_where: place,
                governing_part: part,
                margin: 1.0 - c.utilisation,
                file: sel.files.get(c.file).cloned().unwrap_or_default(),
            }
        })
        .collect()
}

fn row_cells(r: &RankedRow, sys: System, legend: &mut Legend) -> Vec<String> {
    let c = &r.candidate;
    vec![
        r.rank.to_string(),
        if c.verdict == Verdict::NotVerified {
            format!("{} (NOT VERIFIED)", c.name)
        } else {
            c.name.clone()
        },
        Show::Mass.fixed(c.mass, sys, 1),
        Show::Dimension.num(c.depth, sys),
        format!("{:.3}", c.utilisation),
        r.governing_check.clone(),
        r.governing_combination.clone(),
        r.governing_where.clone(),
        c.cost
            .map(|v| format!("{:.2}", per_len(v, sys)))
            .unwrap_or_else(|| "—".into()),
        if c.pareto {
            "yes".into()
        } else {
            String::new()
        },
        legend.keys(&c.not_checked),
    ]
}

/// Short keys for the lists of what is not checked, with their legend: each
/// row of a table carries its own list, printed as keys.
#[derive(Default)]
pub struct Legend {
    items: Vec<String>,
}

impl Legend {
    pub fn keys(&mut self, list: &[String]) -> String {
        list.iter()
            .map(|s| {
                let i = match self.items.iter().position(|x| x == s) {
                    Some(i) => i,
                    None => {
                        self.items.push(s.clone());
                        self.items.len() - 1
                    }
                };
                ((b'a' + (i % 26) as u8) as char).to_string()
            })
            .collect::<Vec<_>>()
            .join(" ")
    }
    pub fn into_list(self) -> Vec<String> {
        self.items
            .into_iter()
            .enumerate()
            .map(|(i, s)| format!("{}: {s}", (b'a' + (i % 26) as u8) as char))
            .collect()
    }
}

/// Cost per display length (m or ft) from cost per mm.
pub fn per_len(cost_per_mm: f64, sys: System) -> f64 {
    cost_per_mm * Show::Span.unit(sys).1
}

fn headers(sys: System, cur: &Prices) -> Vec<(String, Align)> {
    vec![
        ("#".into(), Align::Right),
        ("Section".into(), Align::Left),
        (format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
        (
            format!("Depth [{}]", Show::Dimension.label(sys)),
            Align::Right,
        ),
        ("Utilisation".into(), Align::Right),
        ("Governed by".into(), Align::Left),
        ("Combination".into(), Align::Left),
        ("Where".into(), Align::Left),
        (
            format!("Cost [{}]", cur.per(Show::Span.label(sys))),
            Align::Right,
        ),
        ("Mass–depth front".into(), Align::Left),
        ("Not checked".into(), Align::Left),
    ]
}

fn table(title: &str, rows: &[RankedRow], sys: System, cur: &Prices, legend: &mut Legend) -> Table {
    let hs = headers(sys, cur);
    let refs: Vec<(&str, Align)> = hs.iter().map(|(h, a)| (h.as_str(), *a)).collect();
    let mut t = Table::new(title, &refs);
    for r in rows {
        t.row(row_cells(r, sys, legend));
    }
    t
}

pub fn counts_line(sel: &Selection, skip_bad_rows: bool) -> String {
    let c = &sel.counts;
    let mut s = format!(
        "{} row(s) read from {}: {} checked, {} pass, {} fail, {} not verified",
        c.rows,
        sel.files.join(", "),
        c.checked,
        c.passing,
        c.failing,
        c.not_verified
    );
    if c.filtered > 0 {
        s.push_str(&format!(", {} left out by the filters", c.filtered));
    }
    if c.bad > 0 || skip_bad_rows {
        s.push_str(&format!(", {} bad row(s) skipped", c.bad));
    }
    s.push('.');
    if let Some(n) = flagged_note(c) {
        s.push(' ');
        s.push_str(&n);
    }
    s
}

/// What a scan says of the rows the duplicate filter flagged, if any.
pub fn flagged_note(c: &search::Counts) -> Option<String> {
    (c.flagged > 0).then(|| format!(
        "The duplicate-name filter flagged {} row(s) as possible repeats of an earlier name (it never misses a repeat but may flag a new name): the rows reported here were checked exactly and none repeats; the others were not confirmed (the catalogue is read once): `beamsift catalog validate` lists every repeated name.",
        units::count(c.flagged)
    ))
}

/// The not-verified rows, each with its reasons (never ranked with the
/// passing ones).
pub fn not_verified_table(doc: &mut Document, rows: &[RankedRow], sys: System) {
    let mut t = Table::new(
        "Not verified (nothing evaluated fails, but a limit state that applies could not be evaluated; not ranked)",
        &[
            ("Section", Align::Left),
            (&format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
            ("Utilisation of what was evaluated", Align::Right),
            ("Not verified", Align::Left),
        ],
    );
    for r in rows {
        t.row(vec![
            r.candidate.name.clone(),
            Show::Mass.fixed(r.candidate.mass, sys, 1),
            format!("{:.3}", r.candidate.utilisation),
            r.candidate.not_verified.join("; "),
        ]);
    }
    doc.table(t);
}

/// The end of every selection-like document: exclusions, assumptions,
/// notes, the legend of what is not checked, and the caution.
pub fn finish_doc(
    doc: &mut Document,
    excluded: &[String],
    assumptions: &[String],
    notes: &[String],
    legend: Legend,
) {
    doc.excluded(excluded.to_vec());
    doc.assumptions(assumptions.to_vec());
    if !notes.is_empty() {
        doc.list("Notes:", notes.to_vec());
    }
    doc.caution(legend.into_list());
}

#[derive(Serialize)]
pub struct PricedRow {
    #[serde(flatten)]
    pub row: RankedRow,
    /// mm, all pieces.
    pub total_length: f64,
    /// kg.
    pub total_mass: f64,
    pub total_cost: Option<f64>,
}

#[derive(Serialize)]
pub struct ShortlistResult {
    pub title: String,
    pub count: u32,
    /// mm per piece.
    pub length: f64,
    #[serde(flatten)]
    pub prices: Prices,
    pub by_cost: Vec<PricedRow>,
    pub by_mass: Vec<PricedRow>,
    pub counts: search::Counts,
    pub excluded: Vec<String>,
    pub assumptions: Vec<String>,
    pub notes: Vec<String>,
    pub caution: &'static str,
}

impl<'a> SelectResult<'a> {
    /// The result of a scan, ranked as the document and JSON show it.
    pub fn new(
        job: &Job,
        prep: &Prepared,
        sel: &'a Selection,
        rank: Rank,
        prices: Prices,
        sys: System,
    ) -> SelectResult<'a> {
        SelectResult {
            title: job.title.clone(),
            rank,
            passing: ranked(prep, sel, &sel.lists[0].items, sys),
            pareto: ranked(prep, sel, &sel.pareto, sys),
            near_misses: ranked(prep, sel, &sel.near_misses.items, sys),
            not_verified: ranked(prep, sel, &sel.unverified.items, sys),
            counts: &sel.counts,
            skipped_rows: &sel.skipped,
            prices,
            excluded: prep.criteria.exclude.list(),
            assumptions: prep.assumptions_in(sys),
            notes: job.notes.clone(),
            caution: CAUTION,
        }
    }

    /// How many of the ranked rows pass (not verified ones may be listed
    /// with them under --include-unverified).
    pub fn passing_count(&self) -> usize {
        self.passing.iter().filter(|r| r.candidate.passes).count()
    }
}

/// How a selection is shown.
pub struct SelectView<'a> {
    pub sys: System,
    pub include_unverified: bool,
    pub skip_bad_rows: bool,
    /// A line about the calculation sheet written for the best row.
    pub sheet_line: Option<String>,
    pub job: &'a Job,
    pub selection: &'a Selection,
}

/// The document of a selection.
pub fn select_document(result: &SelectResult<'_>, v: &SelectView<'_>) -> Document {
    let (sys, cur, job, sel) = (v.sys, &result.prices, v.job, v.selection);
    let mut legend = Legend::default();
    let mut doc = Document::new(format!("Selection for {}", job.title));
    for t in member::job_tables(job, sys) {
        doc.table(t);
    }
    doc.para(counts_line(sel, v.skip_bad_rows));
    if let Some(n) = cur.note().filter(|_| cur.any()) {
        doc.para(n);
    }
    let rank_word = match result.rank {
        Rank::Mass => "lightest first",
        Rank::Cost => "cheapest first",
        Rank::Depth => "shallowest first",
        Rank::Utilisation => "most utilised first",
    };
    if result.passing_count() == 0 && result.near_misses.is_empty() {
        doc.para(
            "No section passes, and none fails either: every section checked is not verified (listed below with the reasons).",
        );
    } else if result.passing_count() == 0 {
        doc.para("No section passes. The nearest misses, with what governs and by how much:");
        let mut t = table(
            "Nearest misses (lowest utilisation first)",
            &result.near_misses,
            sys,
            cur,
            &mut legend,
        );
        t.headers[9] = "Over by".into();
        for (row, r) in t.rows.iter_mut().zip(&result.near_misses) {
            row[9] = format!("{:.1} %", 100.0 * (r.candidate.utilisation - 1.0));
        }
        doc.table(t);
    } else {
        doc.table(table(
            &if v.include_unverified {
                format!("Passing and NOT VERIFIED sections (--include-unverified), {rank_word}")
            } else {
                format!("Passing sections, {rank_word}")
            },
            &result.passing,
            sys,
            cur,
            &mut legend,
        ));
        if let Some(best) = result.passing.iter().find(|r| r.candidate.passes) {
            doc.para(format!(
                "Best: {} — {} {}, utilisation {:.3} ({} under {}, {}), margin {:.1} %.",
                best.candidate.name,
                Show::Mass.fixed(best.candidate.mass, sys, 1),
                Show::Mass.label(sys),
                best.candidate.utilisation,
                best.governing_check,
                best.governing_combination,
                best.governing_where,
                100.0 * best.margin
            ));
        }
        let front: Vec<String> = result
            .pareto
            .iter()
            .map(|r| {
                format!(
                    "{} ({} {}, {} {})",
                    r.candidate.name,
                    Show::Mass.num(r.candidate.mass, sys),
                    Show::Mass.label(sys),
                    Show::Dimension.num(r.candidate.depth, sys),
                    Show::Dimension.label(sys)
                )
            })
            .collect();
        doc.list(
            "Mass–depth front (no other passing section is both lighter and shallower):",
            front,
        );
    }
    // The reasons are listed whenever a section is not verified, also when
    // --include-unverified shows it among the passing ones.
    if !result.not_verified.is_empty() {
        not_verified_table(&mut doc, &result.not_verified, sys);
    }
    if !sel.skipped.is_empty() {
        doc.list(
            "Skipped rows:",
            sel.skipped.iter().take(10).cloned().collect(),
        );
    }
    if let Some(line) = &v.sheet_line {
        doc.para(line.clone());
    }
    finish_doc(
        &mut doc,
        &result.excluded,
        &result.assumptions,
        &result.notes,
        legend,
    );
    doc
}

impl ShortlistResult {
    /// The priced shortlist of a scan ranked by cost (first list) and by
    /// mass (second list).
    pub fn new(
        job: &Job,
        prep: &Prepared,
        sel: &Selection,
        count: u32,
        length: f64,
        prices: Prices,
        sys: System,
    ) -> ShortlistResult {
        let total_len = length * count as f64;
        let priced = |list: &[Candidate]| -> Vec<PricedRow> {
            ranked(prep, sel, list, sys)
                .into_iter()
                .map(|r| PricedRow {
                    total_length: total_len,
                    total_mass: r.candidate.mass * total_len / 1000.0,
                    total_cost: r.candidate.cost.map(|c| c * total_len),
                    row: r,
                })
                .collect()
        };
        ShortlistResult {
            title: job.title.clone(),
            count,
            length,
            prices,
            by_cost: priced(&sel.lists[0].items),
            by_mass: priced(&sel.lists[1].items),
            counts: sel.counts.clone(),
            excluded: prep.criteria.exclude.list(),
            assumptions: prep.assumptions_in(sys),
            notes: job.notes.clone(),
            caution: CAUTION,
        }
    }
}

/// The document of a shortlist.
pub fn shortlist_document(
    result: &ShortlistResult,
    prep: &Prepared,
    sel: &Selection,
    sys: System,
    skip_bad_rows: bool,
) -> Document {
    let cur = &result.prices;
    let total_len = result.length * result.count as f64;
    let mut doc = Document::new(format!("Shortlist for {}", result.title));
    doc.para(format!(
        "{} piece(s) of {} each = {} in all. {}",
        result.count,
        Show::Span.fmt(result.length, sys),
        Show::Span.fmt(total_len, sys),
        counts_line(sel, skip_bad_rows)
    ));
    if let Some(n) = cur.note().filter(|_| cur.any()) {
        doc.para(n);
    }
    let mut legend = Legend::default();
    let w = if sys == System::Si { "kg" } else { "lb" };
    let wf = if sys == System::Si {
        1.0
    } else {
        1.0 / units::KG_PER_LB
    };
    for (title, list) in [
        ("Cheapest passing sections", &result.by_cost),
        ("Lightest passing sections", &result.by_mass),
    ] {
        let mut t = Table::new(
            title,
            &[
                ("#", Align::Right),
                ("Section", Align::Left),
                (&format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
                (
                    &format!("Depth [{}]", Show::Dimension.label(sys)),
                    Align::Right,
                ),
                ("Utilisation", Align::Right),
                ("Governed by", Align::Left),
                (
                    &format!("Unit cost [{}]", cur.per(Show::Span.label(sys))),
                    Align::Right,
                ),
                (&format!("Total mass [{w}]"), Align::Right),
                (&format!("Total cost [{}]", cur.label()), Align::Right),
                ("Mass–depth front", Align::Left),
                ("Not checked", Align::Left),
            ],
        );
        for p in list {
            let c = &p.row.candidate;
            t.row(vec![
                p.row.rank.to_string(),
                c.name.clone(),
                Show::Mass.fixed(c.mass, sys, 1),
                Show::Dimension.num(c.depth, sys),
                format!("{:.3}", c.utilisation),
                p.row.governing_check.clone(),
                c.cost
                    .map(|v| format!("{:.2}", per_len(v, sys)))
                    .unwrap_or_else(|| "—".into()),
                format!("{:.0}", p.total_mass * wf),
                p.total_cost
                    .map(|v| format!("{:.2}", v))
                    .unwrap_or_else(|| "—".into()),
                if c.pareto {
                    "yes".into()
                } else {
                    String::new()
                },
                legend.keys(&c.not_checked),
            ]);
        }
        doc.table(t);
    }
    if result.by_mass.is_empty() {
        doc.para("No section passes: run `beamsift select` to see the nearest misses.");
    }
    let unverified = ranked(prep, sel, &sel.unverified.items, sys);
    if !unverified.is_empty() {
        not_verified_table(&mut doc, &unverified, sys);
    }
    finish_doc(
        &mut doc,
        &result.excluded,
        &result.assumptions,
        &result.notes,
        legend,
    );
    doc
}

/// The data-table headers of ranked rows.
fn data_headers(sys: System, cur: &Prices, over: bool) -> Vec<String> {
    let mut h = vec![
        "Rank".to_string(),
        "Section".into(),
        "Verdict".into(),
        format!("Mass [{}]", Show::Mass.label(sys)),
        format!("Depth [{}]", Show::Dimension.label(sys)),
        "Utilisation".into(),
        "Governed by".into(),
        "Combination".into(),
        "Governing part".into(),
        format!("Governing x [{}]", Show::Span.label(sys)),
        format!("Cost [{}]", cur.per(Show::Span.label(sys))),
        "Mass–depth front".into(),
    ];
    if over {
        h.push("Over by [%]".into());
    }
    h.push("Not verified".into());
    h.push("Not checked".into());
    h.push("Catalogue".into());
    h.push("Line".into());
    h
}

/// Ranked rows as a data table (numbers in the display units).
fn data_table(
    key: &'static str,
    title: &str,
    rows: &[RankedRow],
    sys: System,
    cur: &Prices,
    over: bool,
) -> super::data::DataTable {
    use super::data::{DataTable, Value};
    let mut t = DataTable::new(key, title, data_headers(sys, cur, over));
    for r in rows {
        let c = &r.candidate;
        let mut cells = vec![
            Value::Num(r.rank as f64),
            Value::text(c.name.clone()),
            Value::text(c.verdict.word()),
            Value::Num(Show::Mass.value(c.mass, sys)),
            Value::Num(Show::Dimension.value(c.depth, sys)),
            Value::Num(c.utilisation),
            Value::text(r.governing_check.clone()),
            Value::text(r.governing_combination.clone()),
            Value::text(r.governing_part.clone()),
            Value::opt(c.governing.as_ref().map(|g| Show::Span.value(g.x, sys))),
            Value::opt(c.cost.map(|v| per_len(v, sys))),
            Value::text(if c.pareto { "yes" } else { "" }),
        ];
        if over {
            cells.push(Value::Num(100.0 * (c.utilisation - 1.0)));
        }
        cells.push(Value::text(c.not_verified.join("; ")));
        cells.push(Value::text(c.not_checked.join("; ")));
        cells.push(Value::text(r.file.clone()));
        cells.push(Value::Num(c.line as f64));
        t.row(cells);
    }
    t
}

/// The data tables of a selection: the passing rows (with
/// --include-unverified, the not verified ones among them), the nearest
/// misses and the not verified rows, each table present even when empty.
pub fn select_data(result: &SelectResult<'_>, doc: &Document, sys: System) -> super::data::DataSet {
    // Spreadsheet cells are numbers: lengths as decimals.
    let sys = sys.decimal();
    let cur = &result.prices;
    super::data::DataSet::new(
        doc,
        vec![
            data_table(
                "passing",
                "Passing sections, in rank order",
                &result.passing,
                sys,
                cur,
                false,
            ),
            data_table(
                "near-misses",
                "Nearest misses (failing sections, lowest utilisation first)",
                &result.near_misses,
                sys,
                cur,
                true,
            ),
            data_table(
                "not-verified",
                "Not verified (nothing evaluated fails, but a limit state that applies could not be evaluated; not ranked)",
                &result.not_verified,
                sys,
                cur,
                false,
            ),
        ],
    )
}

/// The data tables of a shortlist: the cheapest and the lightest passing
/// sections with their quantities.
pub fn shortlist_data(
    result: &ShortlistResult,
    doc: &Document,
    sys: System,
) -> super::data::DataSet {
    use super::data::{DataTable, Value};
    let sys = sys.decimal();
    let cur = &result.prices;
    let (w, wf) = if sys == System::Si {
        ("kg", 1.0)
    } else {
        ("lb", 1.0 / units::KG_PER_LB)
    };
    let mut tables = Vec::new();
    for (key, title, list) in [
        ("cheapest", "Cheapest passing sections", &result.by_cost),
        ("lightest", "Lightest passing sections", &result.by_mass),
    ] {
        let mut t = DataTable::new(
            key,
            format!(
                "{title}: {} piece(s) of {} each",
                result.count,
                Show::Span.fmt(result.length, sys)
            ),
            vec![
                "Rank".into(),
                "Section".into(),
                format!("Mass [{}]", Show::Mass.label(sys)),
                format!("Depth [{}]", Show::Dimension.label(sys)),
                "Utilisation".into(),
                "Governed by".into(),
                format!("Unit cost [{}]", cur.per(Show::Span.label(sys))),
                "Pieces".into(),
                format!("Total length [{}]", Show::Span.label(sys)),
                format!("Total mass [{w}]"),
                format!("Total cost [{}]", cur.label()),
                "Mass–depth front".into(),
                "Not checked".into(),
            ],
        );
        for p in list {
            let c = &p.row.candidate;
            t.row(vec![
                Value::Num(p.row.rank as f64),
                Value::text(c.name.clone()),
                Value::Num(Show::Mass.value(c.mass, sys)),
                Value::Num(Show::Dimension.value(c.depth, sys)),
                Value::Num(c.utilisation),
                Value::text(p.row.governing_check.clone()),
                Value::opt(c.cost.map(|v| per_len(v, sys))),
                Value::Num(result.count as f64),
                Value::Num(Show::Span.value(p.total_length, sys)),
                Value::Num(p.total_mass * wf),
                Value::opt(p.total_cost),
                Value::text(if c.pareto { "yes" } else { "" }),
                Value::text(c.not_checked.join("; ")),
            ]);
        }
        tables.push(t);
    }
    super::data::DataSet::new(doc, tables)
}
