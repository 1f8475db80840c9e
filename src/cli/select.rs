//! `beamsift select` and `beamsift shortlist`: scan catalogues, rank what
//! passes, and price a shortlist.

use super::catargs::{CatalogArgs, currency};
use super::jobargs::JobArgs;
use super::output::emit;
use super::progress;
use super::{EXIT_FAILS, Out};
use beamsift::catalog::Materials;
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::job::Job;
use beamsift::report::{self, Align, Document, Table, member};
use beamsift::search::{self, Candidate, Rank, ScanOptions, Selection};
use beamsift::units::{self, Dim, Show, System};
use serde::Serialize;

pub const EXAMPLES: &str = "Examples:
  beamsift select --job catalogs/demo-job.toml --catalog catalogs/demo-steel.csv
  beamsift select --job catalogs/demo-joists.toml --catalog catalogs/demo-timber.csv --rank cost --in-stock
  beamsift select --job job.toml -c list1.csv -c list2.csv --max-depth 350mm --top 20 --format csv";

pub const SHORTLIST_EXAMPLES: &str = "Examples:
  beamsift shortlist --job catalogs/demo-job.toml --catalog catalogs/demo-steel.csv --count 4
  beamsift shortlist --job catalogs/demo-joists.toml -c catalogs/demo-timber.csv --count 24 --length 4.5m --format markdown";

#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Rank the passing sections by this criterion.
    #[arg(long, value_parser = super::values::rank(), default_value = "mass")]
    pub rank: Rank,
    /// How many passing sections to list (1–100,000).
    #[arg(long, default_value_t = 10, value_parser = super::count_in::<1, 100_000>)]
    pub top: usize,
    /// List every passing section.
    #[arg(long)]
    pub all: bool,
    /// How many nearest misses to list (0–10,000).
    #[arg(long, default_value_t = 5, value_parser = super::count_in::<0, 10_000>)]
    pub near: usize,
    /// Rank sections that are not verified (a limit state could not be
    /// evaluated) with the passing ones, marked on every line.
    #[arg(long = "include-unverified")]
    pub include_unverified: bool,
    /// Also write a calculation sheet for the best section: PREFIX.md and PREFIX.html.
    #[arg(long, value_name = "PREFIX")]
    pub report: Option<std::path::PathBuf>,
}

#[derive(clap::Args, Debug)]
pub struct ShortlistArgs {
    #[command(flatten)]
    pub job: JobArgs,
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Number of pieces of this member (1–1,000,000).
    #[arg(long, default_value_t = 1, value_parser = clap::value_parser!(u32).range(1..=1_000_000))]
    pub count: u32,
    /// Length of one piece (default: the beam's length).
    #[arg(long, value_name = "LENGTH")]
    pub length: Option<String>,
    /// How many sections in each list (1–10,000).
    #[arg(long, default_value_t = 5, value_parser = super::count_in::<1, 10_000>)]
    pub top: usize,
}

/// A ranked row as printed and serialised.
#[derive(Serialize)]
pub struct RankedRow {
    pub rank: usize,
    #[serde(flatten)]
    pub candidate: Candidate,
    pub governing_check: String,
    pub governing_combination: String,
    pub governing_where: String,
    /// 1 − utilisation.
    pub margin: f64,
    pub file: String,
}

#[derive(Serialize)]
struct SelectResult<'a> {
    title: String,
    rank: Rank,
    passing: Vec<RankedRow>,
    pareto: Vec<RankedRow>,
    near_misses: Vec<RankedRow>,
    /// Rows that are not verified, lightest first (never ranked with the
    /// passing ones unless --include-unverified).
    not_verified: Vec<RankedRow>,
    counts: &'a search::Counts,
    skipped_rows: &'a [String],
    currency: String,
    excluded: Vec<String>,
    assumptions: Vec<String>,
    notes: Vec<String>,
    caution: &'static str,
}

fn ranked(prep: &Prepared, sel: &Selection, list: &[Candidate]) -> Vec<RankedRow> {
    list.iter()
        .enumerate()
        .map(|(i, c)| {
            let (check, combo, place) = match &c.governing {
                Some(g) => (
                    g.kind.short().to_string(),
                    prep.demand.combos[g.combo].name.clone(),
                    format!("{}, {}", member::part_of(prep, g), format_x(g.x)),
                ),
                None => (String::new(), String::new(), String::new()),
            };
            RankedRow {
                rank: i + 1,
                candidate: c.clone(),
                governing_check: check,
                governing_combination: combo,
                governing_where: place,
                margin: 1.0 - c.utilisation,
                file: sel.files.get(c.file).cloned().unwrap_or_default(),
            }
        })
        .collect()
}

fn format_x(x: f64) -> String {
    format!("x = {} m", units::fmt_num(x / 1000.0))
}

pub(crate) fn prepare(job: &Job) -> Result<Prepared> {
    Prepared::new(&job.beam, job.material.clone(), job.criteria.clone())
}

pub(crate) fn run_scan(
    job: &Job,
    prep: &Prepared,
    cat: &CatalogArgs,
    opts: &ScanOptions,
) -> Result<(Selection, String)> {
    cat.setup_threads()?;
    let (cats, bytes) = cat.open()?;
    let currencies: Vec<String> = cats
        .iter()
        .filter_map(|c| c.schema.currency.clone())
        .collect();
    let mats = Materials {
        base: &job.material,
        grades: &job.grades,
    };
    drop(cats);
    let pb = progress::bytes_bar(bytes, cat.quiet);
    // The files are opened again for the exact duplicate confirmation.
    let open = || cat.open().map(|(c, _)| c);
    let sel = search::scan_checked(prep, &open, &mats, opts, &|_, b| pb.set_position(b))?;
    pb.finish_and_clear();
    Ok((sel, currency(job, &currencies)))
}

fn row_cells(r: &RankedRow, sys: System, legend: &mut Legend) -> Vec<String> {
    let c = &r.candidate;
    vec![
        r.rank.to_string(),
        if c.verdict == beamsift::check::Verdict::NotVerified {
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
pub(crate) struct Legend {
    items: Vec<String>,
}

impl Legend {
    pub(crate) fn keys(&mut self, list: &[String]) -> String {
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
    pub(crate) fn into_list(self) -> Vec<String> {
        self.items
            .into_iter()
            .enumerate()
            .map(|(i, s)| format!("{}: {s}", (b'a' + (i % 26) as u8) as char))
            .collect()
    }
}

/// Cost per display length (m or ft) from cost per mm.
fn per_len(cost_per_mm: f64, sys: System) -> f64 {
    cost_per_mm * Show::Span.unit(sys).1
}

fn headers(sys: System, cur: &str) -> Vec<(String, Align)> {
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
            format!("Cost [{cur}/{}]", Show::Span.label(sys)),
            Align::Right,
        ),
        ("Mass–depth front".into(), Align::Left),
        ("Not checked".into(), Align::Left),
    ]
}

fn table(title: &str, rows: &[RankedRow], sys: System, cur: &str, legend: &mut Legend) -> Table {
    let hs = headers(sys, cur);
    let refs: Vec<(&str, Align)> = hs.iter().map(|(h, a)| (h.as_str(), *a)).collect();
    let mut t = Table::new(title, &refs);
    for r in rows {
        t.row(row_cells(r, sys, legend));
    }
    t
}

fn counts_line(sel: &Selection, skip_bad_rows: bool) -> String {
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
    s
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let prep = prepare(&job)?;
    let top = if a.all { usize::MAX } else { a.top.max(1) };
    let opts = ScanOptions {
        ranks: vec![(a.rank, top)],
        near: a.near,
        filters: a.cat.filters_for(&job)?,
        skip_bad_rows: a.cat.skip_bad_rows,
        include_unverified: a.include_unverified,
        ..ScanOptions::default()
    };
    let (sel, cur) = run_scan(&job, &prep, &a.cat, &opts)?;
    let sys = out.units;
    let passing = ranked(&prep, &sel, &sel.lists[0].items);
    let pareto = ranked(&prep, &sel, &sel.pareto);
    let near = ranked(&prep, &sel, &sel.near_misses.items);
    let not_verified = ranked(&prep, &sel, &sel.unverified.items);
    let result = SelectResult {
        title: job.title.clone(),
        rank: a.rank,
        passing,
        pareto,
        near_misses: near,
        not_verified,
        counts: &sel.counts,
        skipped_rows: &sel.skipped,
        currency: cur.clone(),
        excluded: prep.criteria.exclude.list(),
        assumptions: prep.assumptions(),
        notes: job.notes.clone(),
        caution: report::CAUTION,
    };
    let mut legend = Legend::default();
    let mut doc = Document::new(format!("Selection for {}", job.title));
    for t in member::job_tables(&job, sys) {
        doc.table(t);
    }
    doc.para(counts_line(&sel, a.cat.skip_bad_rows));
    let rank_word = match a.rank {
        Rank::Mass => "lightest first",
        Rank::Cost => "cheapest first",
        Rank::Depth => "shallowest first",
        Rank::Utilisation => "most utilised first",
    };
    let passing_count = result.passing.iter().filter(|r| r.candidate.passes).count();
    if passing_count == 0 && result.near_misses.is_empty() {
        doc.para(
            "No section passes, and none fails either: every section checked is not verified (listed below with the reasons).",
        );
    } else if passing_count == 0 {
        doc.para("No section passes. The nearest misses, with what governs and by how much:");
        let mut t = table(
            "Nearest misses (lowest utilisation first)",
            &result.near_misses,
            sys,
            &cur,
            &mut legend,
        );
        t.headers[9] = "Over by".into();
        for (row, r) in t.rows.iter_mut().zip(&result.near_misses) {
            row[9] = format!("{:.1} %", 100.0 * (r.candidate.utilisation - 1.0));
        }
        doc.table(t);
    } else {
        doc.table(table(
            &if a.include_unverified {
                format!("Passing and NOT VERIFIED sections (--include-unverified), {rank_word}")
            } else {
                format!("Passing sections, {rank_word}")
            },
            &result.passing,
            sys,
            &cur,
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
    if let Some(prefix) = &a.report {
        match sel.lists[0].items.iter().find(|c| c.passes) {
            Some(best) => {
                let line = super::report::write_candidate(&job, &prep, &sel, best, sys, prefix)?;
                doc.para(line);
            }
            None => doc.para("No section passes: no calculation sheet was written (--report)."),
        }
    }
    finish_doc(
        &mut doc,
        &result.excluded,
        &result.assumptions,
        &result.notes,
        legend,
    );
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(if passing_count == 0 { EXIT_FAILS } else { 0 })
}

/// The not-verified rows, each with its reasons (never ranked with the
/// passing ones).
pub(crate) fn not_verified_table(doc: &mut Document, rows: &[RankedRow], sys: System) {
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
pub(crate) fn finish_doc(
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
struct PricedRow {
    #[serde(flatten)]
    row: RankedRow,
    /// mm, all pieces.
    total_length: f64,
    /// kg.
    total_mass: f64,
    total_cost: Option<f64>,
}

#[derive(Serialize)]
struct ShortlistResult {
    title: String,
    count: u32,
    /// mm per piece.
    length: f64,
    currency: String,
    by_cost: Vec<PricedRow>,
    by_mass: Vec<PricedRow>,
    counts: search::Counts,
    excluded: Vec<String>,
    assumptions: Vec<String>,
    notes: Vec<String>,
    caution: &'static str,
}

pub fn run_shortlist(a: ShortlistArgs, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let prep = prepare(&job)?;
    let length = match &a.length {
        Some(t) => {
            let l = units::parse(t, Dim::Length).map_err(|e| e.in_field("--length"))?;
            if !(1.0..=1e6).contains(&l) {
                return Err(Error::msg(format!(
                    "{} mm is outside the supported piece length, 1 mm to 1 km",
                    units::fmt_num(l)
                ))
                .in_field("--length"));
            }
            l
        }
        None => job.beam.length(),
    };
    if a.count == 0 {
        return Err(Error::msg("--count must be at least 1"));
    }
    let top = a.top.max(1);
    let opts = ScanOptions {
        ranks: vec![(Rank::Cost, top), (Rank::Mass, top)],
        filters: a.cat.filters_for(&job)?,
        skip_bad_rows: a.cat.skip_bad_rows,
        ..ScanOptions::default()
    };
    let (sel, cur) = run_scan(&job, &prep, &a.cat, &opts)?;
    let sys = out.units;
    let total_len = length * a.count as f64;
    let priced = |list: &[Candidate]| -> Vec<PricedRow> {
        ranked(&prep, &sel, list)
            .into_iter()
            .map(|r| PricedRow {
                total_length: total_len,
                total_mass: r.candidate.mass * total_len / 1000.0,
                total_cost: r.candidate.cost.map(|c| c * total_len),
                row: r,
            })
            .collect()
    };
    let result = ShortlistResult {
        title: job.title.clone(),
        count: a.count,
        length,
        currency: cur.clone(),
        by_cost: priced(&sel.lists[0].items),
        by_mass: priced(&sel.lists[1].items),
        counts: sel.counts.clone(),
        excluded: prep.criteria.exclude.list(),
        assumptions: prep.assumptions(),
        notes: job.notes.clone(),
        caution: report::CAUTION,
    };
    let mut doc = Document::new(format!("Shortlist for {}", job.title));
    doc.para(format!(
        "{} piece(s) of {} each = {} in all. {}",
        a.count,
        Show::Span.fmt(length, sys),
        Show::Span.fmt(total_len, sys),
        counts_line(&sel, a.cat.skip_bad_rows)
    ));
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
                    &format!("Unit cost [{cur}/{}]", Show::Span.label(sys)),
                    Align::Right,
                ),
                (&format!("Total mass [{w}]"), Align::Right),
                (&format!("Total cost [{cur}]"), Align::Right),
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
    let unverified = ranked(&prep, &sel, &sel.unverified.items);
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
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(if result.by_mass.is_empty() {
        EXIT_FAILS
    } else {
        0
    })
}
