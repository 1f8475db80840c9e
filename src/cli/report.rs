//! `beamsift report` (the `--report` option of check and select writes the
//! same sheet):
//! a calculation sheet as Markdown and HTML.

use super::Out;
use super::catargs::{CatalogArgs, scan_for_sheet};
use super::jobargs::JobArgs;
use super::output::{emit, write_sheet};
use beamsift::error::{Error, Result};
use beamsift::report::sheet::{self, Subject};
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
        a.cat.refuse_idle(a.section.is_some())?;
        let shape = shape_from_pairs(fam, &split_pairs(dims)?)?;
        let p = shape.properties()?;
        let subject = Subject {
            name: &shape.describe(sys),
            properties: &p,
            mass: p.mass_per_length(job.material.density),
            source: "properties computed from the dimensions (section module)".to_string(),
            alternatives: None,
            near_misses: None,
            material: None,
        };
        sheet::for_section(&job, &prep, subject, sys)
    } else {
        if a.cat.catalog.is_empty() {
            return Err(Error::msg(
                "give a shape (e.g. rect b=75mm d=300mm) or --catalog FILE",
            ));
        }
        let (sel, note) = scan_for_sheet(&job, &prep, &a.cat, a.section.as_deref(), sys)?;
        let mut written = match &a.section {
            Some(n) => sheet::for_candidate(&job, &prep, &sel, sel.named(n)?, false, sys),
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
