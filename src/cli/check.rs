//! `beamsift check`: one section against one job.

use super::Out;
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::report::{self, member, sheet};
use beamsift::section::spec::{shape_from_pairs, split_pairs};

pub const EXAMPLES: &str = "Examples:
  beamsift check --span 6m --dead 1.5kN/m --live 3kN/m --E 11GPa --Fb 11MPa --Fv 1.2MPa \\
      --density 450kg/m3 rect b=75mm d=250mm
  beamsift check --job catalogs/demo-job.toml welded-i bf=200mm tf=12mm hw=400mm tw=8mm
  beamsift check --job job.toml --bracing 1.5m rolled-i d=300mm bf=150mm tf=10.7mm tw=7.1mm r=15mm --json

Exit code 0 when the section passes, 1 when any check fails, 5 when it is not verified
(a limit state that applies could not be evaluated), 2 for bad input.";

#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    /// Shape family (rect, welded-i, rolled-i, mono-i, rhs, chs, round).
    pub shape: String,
    /// Dimensions as key=value-with-unit.
    #[arg(value_name = "KEY=VALUE")]
    pub dims: Vec<String>,
    /// Also write a calculation sheet: PREFIX.md and PREFIX.html.
    #[arg(long, value_name = "PREFIX")]
    pub report: Option<std::path::PathBuf>,
}

pub fn run(a: Args, out: &Out) -> beamsift::Result<i32> {
    let shape = shape_from_pairs(&a.shape, &split_pairs(&a.dims)?)?;
    let job = a.job.load()?;
    let props = shape.properties()?;
    let mass = props.mass_per_length(job.material.density);
    let prep = job.prepare()?;
    let result = member::member_check(&job, &prep, &shape.describe(out.units), &props, mass, None);
    let doc = member::document(&job, &result, out.units);
    emit(out, &report::render(out.format, &result, &doc)?)?;
    if let Some(p) = &a.report {
        let w = sheet::Written {
            sheet: sheet::build(
                &job,
                &prep,
                &result,
                "properties computed from the dimensions (section module)",
                None,
                out.units,
            ),
            verdict: result.verdict,
        };
        super::output::write_sheet(&w, p)?;
    }
    Ok(super::verdict_code(result.verdict))
}
