//! `beamsift check`: one section against one job.

use super::Out;
use super::catargs::{CatalogArgs, scan_for_sheet};
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::error::Error;
use beamsift::report::{self, member, sheet};
use beamsift::section::spec::{shape_from_pairs, split_pairs};

pub const EXAMPLES: &str = "Examples:
  beamsift check --span 6m --dead 1.5kN/m --live 3kN/m --E 11GPa --Fb 11MPa --Fv 1.2MPa \\
      --density 450kg/m3 rect b=75mm d=250mm
  beamsift check --job catalogs/demo-job.toml welded-i bf=200mm tf=12mm hw=400mm tw=8mm
  beamsift check --job job.toml --bracing 1.5m rolled-i d=300mm bf=150mm tf=10.7mm tw=7.1mm r=15mm --json
  beamsift check --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --section 'NB 360 L'

Exit code 0 when the section passes, 1 when any check fails, 5 when it is not verified
(a limit state that applies could not be evaluated), 2 for bad input.";

#[derive(clap::Args, Debug)]
#[command(mut_arg("catalog", |a| a.required(false)))]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    /// Catalogue holding the row named by --section (instead of a shape and
    /// its dimensions), with the usual catalogue options.
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Name of the catalogue row to check (exact, case included).
    #[arg(long, value_name = "NAME")]
    pub section: Option<String>,
    /// Shape family (rect, welded-i, rolled-i, mono-i, rhs, chs, round).
    pub shape: Option<String>,
    /// Dimensions as key=value-with-unit.
    #[arg(value_name = "KEY=VALUE")]
    pub dims: Vec<String>,
    /// Also write a calculation sheet: PREFIX.md and PREFIX.html.
    #[arg(long, value_name = "PREFIX")]
    pub report: Option<std::path::PathBuf>,
}

pub fn run(a: Args, out: &Out) -> beamsift::Result<i32> {
    let sys = out.units;
    let job = a.job.load()?;
    let prep = job.prepare()?;
    let (result, source) = if let Some(fam) = &a.shape {
        if !a.cat.catalog.is_empty() {
            return Err(Error::msg(
                "give either a shape with its dimensions or --catalog FILE --section NAME, not both",
            ));
        }
        a.cat.refuse_idle(a.section.is_some())?;
        let shape = shape_from_pairs(fam, &split_pairs(&a.dims)?)?;
        let props = shape.properties()?;
        let mass = props.mass_per_length(job.material.density);
        (
            member::member_check(&job, &prep, &shape.describe(sys), &props, mass, None, sys),
            "properties computed from the dimensions (section module)".to_string(),
        )
    } else {
        let Some(name) = a.section.as_deref() else {
            return Err(Error::msg(if a.cat.catalog.is_empty() {
                "give a shape with its dimensions (e.g. rect b=75mm d=250mm), or --catalog FILE --section NAME"
            } else {
                "check takes one section: name the catalogue row with --section NAME (to find the lightest passing row, use `beamsift select`)"
            })
            .in_field("--section"));
        };
        if a.cat.catalog.is_empty() {
            return Err(Error::msg(
                "--section names a catalogue row: give the catalogue with --catalog FILE",
            )
            .in_field("--section"));
        }
        let (sel, note) = scan_for_sheet(&job, &prep, &a.cat, Some(name), sys)?;
        let c = sel.named(name)?;
        let m = beamsift::catalog::Materials::of(&job)
            .get(&c.material)
            .clone();
        (
            member::member_check(&job, &prep, &c.name, &c.properties, c.mass, Some(&m), sys),
            format!("{}; {note}", sheet::candidate_source(&sel, c)),
        )
    };
    let doc = member::document(&job, &result, sys);
    emit(out, &report::render(out.format, &result, &doc)?)?;
    if let Some(p) = &a.report {
        let w = sheet::Written {
            sheet: sheet::build(&job, &prep, &result, &source, None, sys),
            verdict: result.verdict,
        };
        super::output::write_sheet(&w, p)?;
    }
    Ok(super::verdict_code(result.verdict))
}
