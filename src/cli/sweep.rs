//! `beamsift sweep lightest` and `beamsift sweep table`.

use super::Out;
use super::catargs::CatalogArgs;
use super::jobargs::JobArgs;
use super::output::{emit_data, write_atomic};
use beamsift::error::Result;
use beamsift::job::Job;
use beamsift::optimise::Family;
use beamsift::report;
use beamsift::report::sweep::{
    LightestResult, Search, SweepView, TableResult, lightest_chart, lightest_document, table_chart,
    table_document,
};
use beamsift::search::{self, Candidate};
use beamsift::sweep::{self, TableFlags};
use std::path::{Path, PathBuf};

pub const EXAMPLES: &str = "Examples:
  beamsift sweep lightest --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --spans 3m..9m:0.5m --chart lightest.svg
  beamsift sweep table --job catalogs/demo-joists.toml -c catalogs/demo-timber.csv --spacings 300,400,600mm --round 10mm --chart spans.svg

A sweep scales the job's geometry so that its longest span equals each swept value;
load intensities stay as given (area loads follow --spacings).";

#[derive(clap::Subcommand, Debug)]
pub enum Cmd {
    /// The lightest passing section at each span of a range.
    #[command(
        after_help = "Example:\n  beamsift sweep lightest --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --spans 3m..9m:0.5m --chart lightest.svg"
    )]
    Lightest(LightestArgs),
    /// The longest span of each section, per joist spacing or live-load level.
    #[command(
        after_help = "Example:\n  beamsift sweep table --job catalogs/demo-joists.toml -c catalogs/demo-timber.csv --spacings 300,400,600mm --round 10mm"
    )]
    Table(TableArgs),
}

#[derive(clap::Args, Debug)]
pub struct LightestArgs {
    #[command(flatten)]
    pub job: JobArgs,
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Spans as START..END:STEP (e.g. 3m..9m:0.5m) or a list (4m,5m,6m).
    #[arg(long)]
    pub spans: String,
    /// Also the least-area parametric section of this family at each span.
    #[arg(long, value_parser = super::values::family())]
    pub optimise: Option<Family>,
    /// Write the chart (SVG) here.
    #[arg(long, value_name = "FILE")]
    pub chart: Option<PathBuf>,
}

#[derive(clap::Args, Debug)]
pub struct TableArgs {
    #[command(flatten)]
    pub job: JobArgs,
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Columns: tributary widths of the job's area loads (e.g. 300,400,600mm).
    #[arg(long)]
    pub spacings: Option<String>,
    /// Columns: pressures of the job's live area loads (e.g. 1.5,2.5,4kPa).
    #[arg(long = "live-levels")]
    pub live_levels: Option<String>,
    /// Round spans down to a multiple of this (e.g. 10mm, 1in), as publishers do.
    #[arg(long)]
    pub round: Option<String>,
    /// Bisection tolerance where no closed form applies [default: 1mm].
    #[arg(long)]
    pub tolerance: Option<String>,
    /// Write the chart (SVG) here.
    #[arg(long, value_name = "FILE")]
    pub chart: Option<PathBuf>,
}

fn load(job: &Job, cat: &CatalogArgs) -> Result<(Vec<Candidate>, search::Counts)> {
    cat.setup_threads()?;
    let (cats, _) = cat.open()?;
    let (rows, c, _) = search::load_rows(
        cats,
        &beamsift::catalog::Materials::of(job),
        cat.skip_bad_rows,
        &cat.filters_for(job)?,
    )?;
    Ok((rows, c))
}

/// Where the chart goes, as the result names it.
fn shown(chart: Option<&Path>) -> Option<String> {
    chart.map(|p| p.display().to_string())
}

/// Queue the chart, when one is asked for.
fn write_chart(path: Option<&Path>, svg: impl FnOnce() -> String) {
    if let Some(p) = path {
        write_atomic(p, svg().as_bytes());
    }
}

pub fn run(cmd: Cmd, out: &Out) -> Result<i32> {
    match cmd {
        Cmd::Lightest(a) => run_lightest(a, out),
        Cmd::Table(a) => run_table(a, out),
    }
}

fn run_lightest(a: LightestArgs, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let spans = sweep::options::spans(&a.spans, a.optimise.is_some())?;
    let mats = beamsift::catalog::Materials::of(&job);
    let sys = out.units;
    // One reading of the catalogues for every span.
    a.cat.setup_threads()?;
    let preps = sweep::prepared_by_span(&job.beam, &job.material, &job.criteria, &spans)?;
    let filters = a.cat.filters_for(&job)?;
    let open = || a.cat.open().map(|c| c.0);
    let lightest =
        search::spans::lightest_by_span(&preps, &open, &mats, &filters, a.cat.skip_bad_rows)?;
    let optima = match a.optimise {
        Some(fam) => sweep::optimum_by_span(&preps, fam, sys),
        None => vec![None; spans.len()],
    };
    let result = LightestResult::new(
        &job,
        &spans,
        &lightest.spans,
        optima,
        &lightest.samples,
        &mats,
        shown(a.chart.as_deref()),
        sys,
    )?;
    write_chart(a.chart.as_deref(), || lightest_chart(&result, sys));
    let view = SweepView {
        sys,
        job: &job,
        counts: &lightest.counts,
        skip_bad_rows: a.cat.skip_bad_rows,
    };
    let doc = lightest_document(&result, a.optimise.is_some(), &view);
    let data = report::sweep::lightest_data(&result, a.optimise.is_some(), &doc, sys);
    emit_data(out, &result, &doc, &data)?;
    Ok(0)
}

fn run_table(a: TableArgs, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let flags = TableFlags {
        spacings: a.spacings.clone(),
        live_levels: a.live_levels.clone(),
        round: a.round.clone(),
        tolerance: a.tolerance.clone(),
    };
    let (columns, beams) = flags.columns(&job.beam)?;
    let opts = flags.options(out.units)?;
    let (rows, counts) = load(&job, &a.cat)?;
    let mats = beamsift::catalog::Materials::of(&job);
    let pb = super::progress::count_bar(rows.len() as u64, a.cat.quiet, "sections");
    let cells = sweep::span_table(
        &beams,
        &job.material,
        &job.criteria,
        &rows,
        &mats,
        &opts,
        &|| pb.inc(1),
    )?;
    pb.finish_and_clear();
    let sys = out.units;
    let result = TableResult::new(
        &job,
        &columns,
        &rows,
        cells,
        opts.round,
        &mats,
        shown(a.chart.as_deref()),
        sys,
    )?;
    write_chart(a.chart.as_deref(), || table_chart(&result, sys));
    let search = Search {
        tolerance: opts.tolerance,
        tolerance_given: a.tolerance.is_some(),
        max_span: opts.max_span,
    };
    let view = SweepView {
        sys,
        job: &job,
        counts: &counts,
        skip_bad_rows: a.cat.skip_bad_rows,
    };
    let doc = table_document(&result, &search, &view);
    let data = report::sweep::table_data(&result, &doc, sys);
    emit_data(out, &result, &doc, &data)?;
    Ok(0)
}
