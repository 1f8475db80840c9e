//! `beamsift report` (the `--report` option of check and select writes the
//! same sheet):
//! a calculation sheet as Markdown and HTML.

use super::Out;
use super::catargs::{CatalogArgs, run_scan};
use super::jobargs::JobArgs;
use super::output::{emit, write_sheet};
use beamsift::error::{Error, Result};
use beamsift::report::sheet::{self, Subject};
use beamsift::search::{Rank, ScanOptions};
use beamsift::section::spec::{shape_from_pairs, split_pairs};
use std::path::PathBuf;

pub const EXAMPLES: &str = "Examples:
  beamsift report --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --to b1-calc
  beamsift report --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --section 'NB 360 L' --to b1-calc --force
  beamsift report --job job.toml --to calc welded-i bf=180mm tf=14mm hw=420mm tw=8mm

Writes PREFIX.md and PREFIX.html (self-contained: diagrams inline, no external files).";

#[derive(clap::Args, Debug)]
#[command(mut_arg("catalog", |a| a.required(false)))]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    /// Catalogue to take the section from (the lightest passing one
    /// unless --section names one), with the usual catalogue options.
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Name of the catalogue section to report on.
    #[arg(long)]
    pub section: Option<String>,
    /// Output prefix: writes PREFIX.md and PREFIX.html.
    #[arg(long, default_value = "beamsift-report")]
    pub to: PathBuf,
    /// Or a shape: family then key=value dimensions.
    #[arg(value_name = "SHAPE KEY=VALUE")]
    pub shape: Vec<String>,
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    if matches!(
        out.format,
        beamsift::report::Format::Csv | beamsift::report::Format::Markdown
    ) {
        return Err(Error::msg(
            "report writes PREFIX.md and PREFIX.html (--to): --format csv or markdown has no meaning here (use --format json for the sheet's data on standard output)",
        )
        .in_field("--format"));
    }
    let job = a.job.load()?;
    let prep = job.prepare()?;
    let sys = out.units;
    let written = if let Some((fam, dims)) = a.shape.split_first() {
        if !a.cat.catalog.is_empty() {
            return Err(Error::msg("give either a shape or --catalog, not both"));
        }
        // Without a catalogue the catalogue options have nothing to act on:
        // refused by name rather than ignored.
        let c = &a.cat;
        let idle: Vec<&str> = [
            (a.section.is_some(), "--section"),
            (c.delimiter != ",", "--delimiter"),
            (c.skip_bad_rows, "--skip-bad-rows"),
            (c.max_depth.is_some(), "--max-depth"),
            (c.min_depth.is_some(), "--min-depth"),
            (c.max_width.is_some(), "--max-width"),
            (c.grade.is_some(), "--grade"),
            (c.in_stock, "--in-stock"),
            (c.name.is_some(), "--name"),
            (c.jobs.is_some(), "--jobs"),
        ]
        .into_iter()
        .filter_map(|(set, name)| set.then_some(name))
        .collect();
        if !idle.is_empty() {
            return Err(Error::msg(format!(
                "{} select(s) rows of a catalogue, and a shape was given instead: leave {} out, or give --catalog FILE without the shape",
                idle.join(", "),
                if idle.len() == 1 { "it" } else { "them" }
            )));
        }
        let shape = shape_from_pairs(fam, &split_pairs(dims)?)?;
        let p = shape.properties()?;
        let subject = Subject {
            name: &shape.describe(sys),
            properties: &p,
            mass: p.mass_per_length(job.material.density),
            source: "properties computed from the dimensions (section module)".to_string(),
            alternatives: None,
            material: None,
        };
        sheet::for_section(&job, &prep, subject, sys)
    } else {
        if a.cat.catalog.is_empty() {
            return Err(Error::msg(
                "give a shape (e.g. rect b=75mm d=300mm) or --catalog FILE",
            ));
        }
        if a.section.is_some() && a.cat.name.is_some() {
            return Err(
                Error::msg("give either --section NAME or --name PATTERN, not both")
                    .in_field("--name"),
            );
        }
        // With --section every row the name filter lets through is kept,
        // so the exact name is found whatever its verdict.
        let keep = if a.section.is_some() { 10_000 } else { 6 };
        let mut filters = a.cat.filters_for(&job)?;
        if a.section.is_some() {
            filters.name = a.section.clone();
        }
        let opts = ScanOptions {
            ranks: vec![(Rank::Mass, keep)],
            near: if a.section.is_some() { keep } else { 1 },
            unverified: keep,
            filters,
            skip_bad_rows: a.cat.skip_bad_rows,
            ..ScanOptions::default()
        };
        let (sel, _) = run_scan(&job, &prep, &a.cat, &opts)?;
        let note = sheet::scan_note(&sel, &opts.filters, a.cat.skip_bad_rows, sys);
        let mut written = match &a.section {
            Some(n) => {
                let c = sel.named(n).map_err(|e| {
                    let f = opts.filters.describe(sys);
                    // The name filter is the section itself.
                    let others: Vec<&String> = f.iter().filter(|d| !d.starts_with("names matching")).collect();
                    if others.is_empty() {
                        e
                    } else {
                        Error::msg(format!(
                            "{e}, among the rows the filters let through ({}): it may have been left out by them",
                            others.iter().map(|s| s.as_str()).collect::<Vec<_>>().join(", ")
                        ))
                    }
                })?;
                sheet::for_candidate(&job, &prep, &sel, c, false, sys)
            }
            None => {
                let c = sel.lists[0].items.first().ok_or_else(|| Error::NoSolution("no catalogue section passes: nothing to report (see `beamsift select` for the nearest misses, and the sections not verified)".into()))?;
                sheet::for_candidate(&job, &prep, &sel, c, true, sys)
            }
        };
        written.sheet.section_source = format!("{}; {note}", written.sheet.section_source);
        written
    };
    let (md, html) = write_sheet(&written, &a.to)?;
    let name = &written.sheet.section;
    let verdict = written.verdict;
    let sheet = &written.sheet;
    let summary = format!(
        "Wrote {} and {} for {name}: {}.\n",
        md.display(),
        html.display(),
        verdict.word()
    );
    if out.format == beamsift::report::Format::Json {
        emit(
            out,
            &beamsift::report::render(out.format, sheet, &sheet::document(sheet))?,
        )?;
    } else {
        emit(out, &summary)?;
    }
    Ok(super::verdict_code(verdict))
}
