//! `beamsift sweep lightest` and `beamsift sweep table`.

use super::Out;
use super::catargs::CatalogArgs;
use super::jobargs::JobArgs;
use super::output::{emit, write_atomic};
use beamsift::catalog::Materials;
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::optimise::Family;
use beamsift::report::{self, Align, Document, Table, chart, member};
use beamsift::search::{self, Candidate};
use beamsift::sweep::{self, Cell, Method, SpanOptimum, TableOptions};
use beamsift::units::{self, Dim, Show};
use serde::Serialize;
use std::path::PathBuf;

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

/// The job's exclusions and assumptions (for the result and its document).
fn context(job: &beamsift::job::Job) -> Result<(Vec<String>, Vec<String>)> {
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone())?;
    Ok((prep.criteria.exclude.list(), prep.assumptions()))
}

/// Exclusions, assumptions, notes and what is not checked (per section
/// kind, as a legend), then the caution.
fn finish(
    doc: &mut Document,
    job: &beamsift::job::Job,
    rows: &[Candidate],
    mats: &Materials<'_>,
) -> Result<()> {
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone())?;
    let mut legend = beamsift::report::select::Legend::default();
    for r in rows {
        legend.keys(&prep.not_checked(&r.properties, Some(mats.get(&r.material))));
    }
    beamsift::report::select::finish_doc(
        doc,
        &prep.criteria.exclude.list(),
        &prep.assumptions(),
        &job.notes,
        legend,
    );
    Ok(())
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

fn short(kind: Option<beamsift::check::CheckKind>) -> &'static str {
    use beamsift::check::CheckKind::*;
    match kind {
        Some(
            BendingSaggingTop | BendingSaggingBottom | BendingHoggingTop | BendingHoggingBottom,
        ) => "M",
        Some(Shear | WebShear) => "V",
        Some(Yielding | TensionFlangeYielding) => "M",
        Some(FlangeLocalBuckling | WebLocalBuckling) => "LB",
        Some(LateralTorsional) => "LTB",
        Some(Deflection) => "δ",
        None => "",
    }
}

#[derive(Serialize)]
struct LightestOut {
    /// mm.
    span: f64,
    section: Option<String>,
    /// kg/m.
    mass: Option<f64>,
    utilisation: Option<f64>,
    governing: Option<beamsift::check::CheckKind>,
    /// Lighter rows not verified at this span (never taken as passing).
    lighter_not_verified: u64,
    not_verified_reasons: Vec<String>,
    /// Parametric optimum at this span (area mm², description).
    optimum: Option<SpanOptimum>,
}

#[derive(Serialize)]
struct LightestResult {
    title: String,
    excluded: Vec<String>,
    assumptions: Vec<String>,
    notes: Vec<String>,
    rows: Vec<LightestOut>,
    chart: Option<String>,
    caution: &'static str,
}

fn load(job: &beamsift::job::Job, cat: &CatalogArgs) -> Result<(Vec<Candidate>, String)> {
    cat.setup_threads()?;
    let (cats, _) = cat.open()?;
    let mats = Materials {
        base: &job.material,
        grades: &job.grades,
    };
    let (rows, c, _) = search::load_rows(cats, &mats, cat.skip_bad_rows, &cat.filters_for(job)?)?;
    Ok((rows, rows_read_line(&c, cat.skip_bad_rows)))
}

fn rows_read_line(c: &search::Counts, skip_bad_rows: bool) -> String {
    let mut line = format!("{} section(s) read", c.rows);
    if c.filtered > 0 {
        line.push_str(&format!(", {} left out by the filters", c.filtered));
    }
    if c.bad > 0 || skip_bad_rows {
        line.push_str(&format!(", {} bad row(s) skipped", c.bad));
    }
    line.push('.');
    line
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
    let mats = Materials {
        base: &job.material,
        grades: &job.grades,
    };
    let sys = out.units;
    // One reading of the catalogues for every span.
    a.cat.setup_threads()?;
    let preps = spans
        .iter()
        .map(|&s| {
            Prepared::new(
                &sweep::at_span(&job.beam, s),
                job.material.clone(),
                job.criteria.clone(),
            )
        })
        .collect::<Result<Vec<_>>>()?;
    let filters = a.cat.filters_for(&job)?;
    let open = || a.cat.open().map(|c| c.0);
    let lightest =
        search::spans::lightest_by_span(&preps, &open, &mats, &filters, a.cat.skip_bad_rows)?;
    let rows_line = rows_read_line(&lightest.counts, a.cat.skip_bad_rows);
    let found = lightest.spans;
    let samples = lightest.samples;
    let optima = match a.optimise {
        Some(fam) => sweep::optimum_by_span(&preps, fam, sys),
        None => vec![None; spans.len()],
    };
    let out_rows: Vec<LightestOut> = found
        .iter()
        .zip(optima)
        .zip(&spans)
        .map(|((f, o), &span)| LightestOut {
            span,
            section: f.best.as_ref().map(|b| b.name.clone()),
            mass: f.best.as_ref().map(|b| b.mass),
            utilisation: f.utilisation,
            governing: f.governing,
            lighter_not_verified: f.lighter_not_verified,
            not_verified_reasons: f.not_verified_reasons.clone(),
            optimum: o,
        })
        .collect();
    let svg = a.chart.as_ref().map(|_| {
        let pts: Vec<(f64, Option<f64>, String)> = out_rows
            .iter()
            .map(|r| {
                (
                    Show::Span.value(r.span, sys),
                    r.mass.map(|m| Show::Mass.value(m, sys)),
                    r.section.clone().unwrap_or_default(),
                )
            })
            .collect();
        chart::lightest_chart(
            &format!("Lightest passing section — {}", job.title),
            &format!("Span [{}]", Show::Span.label(sys)),
            &format!("Mass per length [{}]", Show::Mass.label(sys)),
            &pts,
        )
    });
    if let (Some(p), Some(s)) = (&a.chart, &svg) {
        write_atomic(p, s.as_bytes());
    }
    let (excluded, assumptions) = context(&job)?;
    let result = LightestResult {
        title: job.title.clone(),
        excluded,
        assumptions,
        notes: job.notes.clone(),
        rows: out_rows,
        chart: a.chart.as_ref().map(|p| p.display().to_string()),
        caution: report::CAUTION,
    };
    let mut doc = Document::new(format!("Lightest section by span — {}", job.title));
    for t in member::job_tables(&job, sys) {
        doc.table(t);
    }
    doc.para(rows_line);
    let mut hs = vec![
        (format!("Span [{}]", Show::Span.label(sys)), Align::Right),
        ("Lightest passing".to_string(), Align::Left),
        (format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
        ("Utilisation".to_string(), Align::Right),
        ("Governed by".to_string(), Align::Left),
        ("Lighter, not verified".to_string(), Align::Right),
    ];
    if a.optimise.is_some() {
        hs.push((
            format!("Optimum area [{}]", Show::Area.label(sys)),
            Align::Right,
        ));
        hs.push(("Optimum".to_string(), Align::Left));
    }
    let refs: Vec<(&str, Align)> = hs.iter().map(|(h, a)| (h.as_str(), *a)).collect();
    let mut t = Table::new("", &refs);
    for r in &result.rows {
        let mut row = vec![
            Show::Span.fixed_down(r.span, sys, 2),
            r.section.clone().unwrap_or_else(|| "none passes".into()),
            r.mass
                .map(|m| Show::Mass.fixed(m, sys, 1))
                .unwrap_or_else(|| "—".into()),
            r.utilisation
                .map(|u| format!("{u:.3}"))
                .unwrap_or_else(|| "—".into()),
            r.governing
                .map(|g| g.short().to_string())
                .unwrap_or_default(),
            r.lighter_not_verified.to_string(),
        ];
        if a.optimise.is_some() {
            row.push(
                r.optimum
                    .as_ref()
                    .map(|o| Show::Area.num(o.0, sys))
                    .unwrap_or_else(|| "—".into()),
            );
            row.push(r.optimum.as_ref().map(|o| o.1.clone()).unwrap_or_default());
        }
        t.row(row);
    }
    doc.table(t);
    if let Some(p) = &a.chart {
        doc.para(format!("Chart written to {}.", p.display()));
    }
    doc.para("Each span scales the job's geometry (spans and load positions) so the longest span equals it; load intensities are as given.");
    if let Some(r) = result.rows.iter().find(|r| r.lighter_not_verified > 0) {
        doc.list(
            "Lighter sections that are not verified were skipped (a limit state that applies could not be evaluated), for example:",
            r.not_verified_reasons.clone(),
        );
    }
    finish(&mut doc, &job, &samples, &mats)?;
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}

#[derive(Serialize)]
struct TableRow {
    section: String,
    /// kg/m.
    mass: f64,
    cells: Vec<Cell>,
}

#[derive(Serialize)]
struct TableResult {
    title: String,
    excluded: Vec<String>,
    assumptions: Vec<String>,
    notes: Vec<String>,
    /// Column labels.
    columns: Vec<String>,
    rows: Vec<TableRow>,
    rounded_to: Option<f64>,
    chart: Option<String>,
    caution: &'static str,
}

fn run_table(a: TableArgs, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
    let sys = out.units;
    let mut columns = Vec::new();
    let mut labels = Vec::new();
    match (&a.spacings, &a.live_levels) {
        (Some(_), Some(_)) => return Err(Error::msg("give --spacings or --live-levels, not both")),
        (Some(s), None) => {
            for w in units::parse_list(s, Dim::Length, "--spacings")? {
                let b = job.beam.with_spacing(w).ok_or_else(|| {
                    Error::msg(
                        "--spacings needs area loads in the job (a [[load]] with area and width)",
                    )
                })?;
                columns.push(b);
                labels.push(format!("{} centres", Show::Dimension.fmt(w, sys)));
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
                let b = job.beam.with_live_pressure(p).ok_or_else(|| {
                    Error::msg("--live-levels needs live area loads in the job (a [[load]] of a live case with area and width)")
                })?;
                columns.push(b);
                labels.push(format!("live {}", Show::AreaLoad.fmt(p, sys)));
            }
        }
        (None, None) => {
            columns.push(job.beam.clone());
            labels.push("as in the job".into());
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
    let opts_max_span = opts.max_span;
    let (rows, rows_line) = load(&job, &a.cat)?;
    let mats = Materials {
        base: &job.material,
        grades: &job.grades,
    };
    let pb = super::progress::count_bar(rows.len() as u64, a.cat.quiet, "sections");
    let cells = sweep::span_table(
        &columns,
        &job.material,
        &job.criteria,
        &rows,
        &mats,
        &opts,
        &|| pb.inc(1),
    )?;
    pb.finish_and_clear();
    let result_rows: Vec<TableRow> = rows
        .iter()
        .zip(cells)
        .map(|(r, c)| TableRow {
            section: r.name.clone(),
            mass: r.mass,
            cells: c,
        })
        .collect();
    let svg = a.chart.as_ref().map(|_| {
        let names: Vec<String> = result_rows.iter().map(|r| r.section.clone()).collect();
        let spans: Vec<Vec<Option<f64>>> = (0..labels.len())
            .map(|c| {
                result_rows
                    .iter()
                    .map(|r| r.cells[c].span.map(|s| Show::Span.value(s, sys)))
                    .collect()
            })
            .collect();
        chart::span_chart(
            &format!("Maximum span — {}", job.title),
            &format!("Maximum span [{}]", Show::Span.label(sys)),
            &names,
            &labels,
            &spans,
        )
    });
    if let (Some(p), Some(s)) = (&a.chart, &svg) {
        write_atomic(p, s.as_bytes());
    }
    let (excluded, assumptions) = context(&job)?;
    let result = TableResult {
        title: job.title.clone(),
        excluded,
        assumptions,
        notes: job.notes.clone(),
        columns: labels.clone(),
        rows: result_rows,
        rounded_to: round,
        chart: a.chart.as_ref().map(|p| p.display().to_string()),
        caution: report::CAUTION,
    };
    let mut doc = Document::new(format!("Span table — {}", job.title));
    for t in member::job_tables(&job, sys) {
        doc.table(t);
    }
    doc.para(rows_line);
    let mut hs: Vec<(String, Align)> = vec![
        ("Section".into(), Align::Left),
        (format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
    ];
    for l in &labels {
        hs.push((format!("{l} [{}]", Show::Span.label(sys)), Align::Right));
    }
    let refs: Vec<(&str, Align)> = hs.iter().map(|(h, a)| (h.as_str(), *a)).collect();
    let mut t = Table::new("", &refs);
    for r in &result.rows {
        let mut row = vec![r.section.clone(), Show::Mass.fixed(r.mass, sys, 1)];
        for c in &r.cells {
            row.push(match c.span {
                Some(s) if c.at_search_limit => {
                    format!("≥ {}", Show::Span.fixed_down(s, sys, 2))
                }
                Some(s) if !c.not_verified_beyond.is_empty() => {
                    format!("{} nv", Show::Span.fixed_down(s, sys, 2))
                }
                Some(s) => format!(
                    "{} {}",
                    Show::Span.fixed_down(s, sys, 2),
                    short(c.governing)
                ),
                None if !c.not_verified.is_empty() => "not verified".into(),
                None => "—".into(),
            });
        }
        t.row(row);
    }
    doc.table(t);
    if let Some(r) = result
        .rows
        .iter()
        .find(|r| r.cells.iter().any(|c| !c.not_verified.is_empty()))
    {
        let c = r.cells.iter().find(|c| !c.not_verified.is_empty());
        doc.list(
            format!(
                "\"not verified\": a limit state that applies cannot be evaluated, e.g. for {}:",
                r.section
            ),
            c.map(|c| c.not_verified.clone()).unwrap_or_default(),
        );
    }
    if let Some((r, c)) = result.rows.iter().find_map(|r| {
        r.cells
            .iter()
            .find(|c| !c.not_verified_beyond.is_empty())
            .map(|c| (r, c))
    }) {
        doc.list(
            format!(
                "\"nv\": the section passes up to that span and is not verified just beyond it (a method's range ends there), e.g. for {}:",
                r.section
            ),
            c.not_verified_beyond.clone(),
        );
    }
    if result
        .rows
        .iter()
        .any(|r| r.cells.iter().any(|c| c.at_search_limit))
    {
        doc.para(format!(
            "\"≥\": the section still passes at {}, the longest span searched; its limit is longer (not searched).",
            Show::Span.fmt(opts_max_span, sys)
        ));
    }
    let methods: Vec<Method> = result
        .rows
        .iter()
        .flat_map(|r| r.cells.iter().map(|c| c.method))
        .collect();
    doc.para(format!(
        "Each cell: the longest span that passes every check, and what governs just beyond it (M bending, V shear, δ deflection, LTB lateral-torsional buckling). {}{}",
        if methods.contains(&Method::ClosedForm) {
            "Found in closed form (uniform loads: utilisation ∝ L² for bending, L for shear, L³ for deflection/limit, self-weight included). "
        } else {
            ""
        },
        if methods.contains(&Method::Bisection) { format!("Found by bisection to {}. ", Show::Dimension.fmt(tolerance, sys)) } else { String::new() }
    ));
    if a.tolerance.is_some() && !methods.contains(&Method::Bisection) {
        doc.para("--tolerance was not used: every cell was found in closed form, exactly.");
    }
    if let Some(r) = round {
        doc.para(format!(
            "Spans are rounded down to a multiple of {}.",
            Show::Dimension.fmt(r, sys)
        ));
    }
    if let Some(p) = &a.chart {
        doc.para(format!("Chart written to {}.", p.display()));
    }
    finish(&mut doc, &job, &rows, &mats)?;
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}
