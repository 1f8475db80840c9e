//! `beamsift sweep lightest` and `beamsift sweep table`.

use super::Out;
use super::catargs::CatalogArgs;
use super::jobargs::JobArgs;
use super::output::{emit, write_atomic};
use beamsift::catalog::Materials;
use beamsift::error::{Error, Result};
use beamsift::job::Job;
use beamsift::optimise::Family;
use beamsift::report;
use beamsift::report::sweep::{
    LightestResult, Search, SweepView, TableResult, lightest_chart, lightest_document, table_chart,
    table_document,
};
use beamsift::search::{self, Candidate};
use beamsift::sweep::{self, Column, TableOptions};
use beamsift::units::{self, Dim, Show};
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

fn parse_spans(text: &str) -> Result<Vec<f64>> {
    if let Some((range, step)) = text.split_once(':')
        && let Some((a, b)) = range.split_once("..")
    {
        let p = |t: &str| units::parse(t, Dim::Length).map_err(|e| e.in_field("--spans"));
        return sweep::span_range(p(a)?, p(b)?, p(step)?);
    }
    units::parse_list(text, Dim::Length, "--spans")
}

/// The job's material and grades, as the rows refer to them.
fn materials(job: &Job) -> Materials<'_> {
    Materials {
        base: &job.material,
        grades: &job.grades,
    }
}

fn load(job: &Job, cat: &CatalogArgs) -> Result<(Vec<Candidate>, search::Counts)> {
    cat.setup_threads()?;
    let (cats, _) = cat.open()?;
    let (rows, c, _) = search::load_rows(
        cats,
        &materials(job),
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
    let spans = parse_spans(&a.spans)?;
    // Each span is a prepared job checked against the catalogue (and with
    // --optimise an optimisation, about 50 ms): bound the work a typo in a
    // range can ask for.
    let most = if a.optimise.is_some() { 200 } else { 1000 };
    if spans.len() > most {
        return Err(Error::msg(format!(
            "{} spans asked for, more than the {most} one sweep takes{}: use a larger step",
            spans.len(),
            if a.optimise.is_some() {
                " with --optimise"
            } else {
                ""
            }
        ))
        .in_field("--spans"));
    }
    let mats = materials(&job);
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
    )?;
    write_chart(a.chart.as_deref(), || lightest_chart(&result, sys));
    let view = SweepView {
        sys,
        job: &job,
        counts: &lightest.counts,
        skip_bad_rows: a.cat.skip_bad_rows,
    };
    let doc = lightest_document(&result, a.optimise.is_some(), &view);
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}

fn run_table(a: TableArgs, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let mut columns = Vec::new();
    let mut beams = Vec::new();
    match (&a.spacings, &a.live_levels) {
        (Some(_), Some(_)) => return Err(Error::msg("give --spacings or --live-levels, not both")),
        (Some(s), None) => {
            for w in units::parse_list(s, Dim::Length, "--spacings")? {
                let c = Column::Spacing(w);
                beams.push(c.beam(&job.beam).ok_or_else(|| {
                    Error::msg(
                        "--spacings needs area loads in the job (a [[load]] with area and width)",
                    )
                })?);
                columns.push(c);
            }
        }
        (None, Some(s)) => {
            for part in s.split(',') {
                let unit: String = s
                    .rsplit(|c: char| c.is_ascii_digit() || c == '.')
                    .next()
                    .unwrap_or("")
                    .to_string();
                let t = if part
                    .trim()
                    .chars()
                    .last()
                    .is_some_and(|c| c.is_ascii_digit())
                {
                    format!("{}{unit}", part.trim())
                } else {
                    part.trim().to_string()
                };
                let p = units::parse(&t, Dim::AreaLoad).map_err(|e| e.in_field("--live-levels"))?;
                let c = Column::LivePressure(p);
                beams.push(c.beam(&job.beam).ok_or_else(|| {
                    Error::msg("--live-levels needs live area loads in the job (a [[load]] of a live case with area and width)")
                })?);
                columns.push(c);
            }
        }
        (None, None) => {
            beams.push(job.beam.clone());
            columns.push(Column::AsGiven);
        }
    }
    let round = a
        .round
        .as_deref()
        .map(|t| units::parse(t, Dim::Length).map_err(|e| e.in_field("--round")))
        .transpose()?;
    let tolerance = units::parse(a.tolerance.as_deref().unwrap_or("1mm"), Dim::Length)
        .map_err(|e| e.in_field("--tolerance"))?;
    // Ranges: a tolerance from 0.001 mm to 100 mm; rounding from 1 mm to
    // 1 m (a step that rounds down, never up).
    if !(1e-3..=100.0).contains(&tolerance) {
        return Err(Error::msg(format!(
            "{}: expected a tolerance from 0.001 mm to 100 mm",
            Show::Dimension.fmt(tolerance, out.units)
        ))
        .in_field("--tolerance"));
    }
    if let Some(r) = round
        && !(1.0..=1000.0).contains(&r)
    {
        return Err(Error::msg(format!(
            "{}: expected a rounding step from 1 mm to 1 m (spans are rounded down to a multiple of it)",
            Show::Dimension.fmt(r, out.units)
        ))
        .in_field("--round"));
    }
    let opts = TableOptions {
        tolerance,
        round,
        ..TableOptions::default()
    };
    let (rows, counts) = load(&job, &a.cat)?;
    let mats = materials(&job);
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
        round,
        &mats,
        shown(a.chart.as_deref()),
        sys,
    )?;
    write_chart(a.chart.as_deref(), || table_chart(&result, sys));
    let search = Search {
        tolerance,
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
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}
