//! `beamsift select` and `beamsift shortlist`: scan catalogues, rank what
//! passes, and price a shortlist.

use super::catargs::{CatalogArgs, run_scan};
use super::jobargs::JobArgs;
use super::output::emit_data;
use super::{EXIT_FAILS, Out};
use beamsift::error::{Error, Result};
use beamsift::report::select::{
    SelectResult, SelectView, ShortlistResult, select_document, shortlist_document,
};
use beamsift::report::{self, sheet};
use beamsift::search::{Rank, ScanOptions};
use beamsift::units::{self, Dim};

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

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let prep = job.prepare()?;
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
    if a.rank == Rank::Cost {
        cur.require("--rank cost", "rank by mass, depth or utilisation")?;
    }
    let sys = out.units;
    let result = SelectResult::new(&job, &prep, &sel, a.rank, cur, sys);
    let sheet_line = match &a.report {
        None => None,
        Some(prefix) => Some(match sel.lists[0].items.iter().find(|c| c.passes) {
            Some(best) => {
                let s = sheet::for_candidate(&job, &prep, &sel, best, true, sys);
                super::output::write_sheet(&s, prefix).map(|(md, html)| {
                    format!(
                        "Calculation sheet for {}: {} and {} ({}).",
                        best.name,
                        md.display(),
                        html.display(),
                        s.verdict.word()
                    )
                })?
            }
            None => "No section passes: no calculation sheet was written (--report).".into(),
        }),
    };
    let view = SelectView {
        sys,
        include_unverified: a.include_unverified,
        skip_bad_rows: a.cat.skip_bad_rows,
        sheet_line,
        job: &job,
        selection: &sel,
    };
    let doc = select_document(&result, &view);
    let data = report::select::select_data(&result, &doc, sys);
    emit_data(out, &result, &doc, &data)?;
    Ok(if result.passing_count() == 0 {
        EXIT_FAILS
    } else {
        0
    })
}

pub fn run_shortlist(a: ShortlistArgs, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let prep = job.prepare()?;
    let length = match &a.length {
        Some(t) => {
            let l = units::parse(t, Dim::Length).map_err(|e| e.in_field("--length"))?;
            if !(1.0..=1e6).contains(&l) {
                return Err(Error::msg(format!(
                    "{} is outside the supported piece length, 1 mm to 1 km",
                    t.trim()
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
    let result = ShortlistResult::new(&job, &prep, &sel, a.count, length, cur, out.units);
    let doc = shortlist_document(&result, &prep, &sel, out.units, a.cat.skip_bad_rows);
    let data = report::select::shortlist_data(&result, &doc, out.units);
    emit_data(out, &result, &doc, &data)?;
    Ok(if result.by_mass.is_empty() {
        EXIT_FAILS
    } else {
        0
    })
}
