//! `beamsift analyse`: reactions and the extremes of moment, shear and
//! deflection, per combination and span, for a given section or E·I.

use super::Out;
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::beam::analysis;
use beamsift::error::{Error, Result};
use beamsift::report;
use beamsift::report::analysis::{Basis, document};
use beamsift::section::spec::{shape_from_pairs, split_pairs};
use beamsift::units::{self, Dim};
use serde::Serialize;

pub const EXAMPLES: &str = "Examples:
  beamsift analyse --span 5m,5m --dead 2kN/m --live 3kN/m --E 200GPa --Ix 8356cm4
  beamsift analyse --job catalogs/demo-job.toml rolled-i d=300mm bf=150mm tf=10.7mm tw=7.1mm r=15mm
  beamsift analyse --job job.toml --Ix 120e6mm4 --stations --format csv";

#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    /// Second moment of area for deflections, when no section is given.
    #[arg(long = "Ix", value_name = "I")]
    pub ix: Option<String>,
    /// Also list V, M and δ at stations along the beam (all spans loaded).
    #[arg(long)]
    pub stations: bool,
    /// Optional section: shape family then key=value dimensions.
    #[arg(value_name = "SHAPE KEY=VALUE")]
    pub section: Vec<String>,
}

#[derive(Serialize)]
struct Analysed {
    title: String,
    #[serde(flatten)]
    analysis: analysis::Analysis,
    caution: &'static str,
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let job = a.job.load_for_analysis()?;
    if a.section.is_empty() {
        let sw = a.job.self_weight_flags();
        if !sw.is_empty() {
            return Err(Error::msg(format!(
                "{} set(s) the self-weight, which needs a section (its area): give a section after the options, or leave them out",
                sw.join(", ")
            )));
        }
    }
    let sys = out.units;
    let (ix, mass, section) = if let Some((fam, dims)) = a.section.split_first() {
        if a.ix.is_some() {
            return Err(Error::msg("give either a section or --Ix, not both"));
        }
        let shape = shape_from_pairs(fam, &split_pairs(dims)?)?;
        let p = shape.properties()?;
        (
            Some(p.ix),
            p.mass_per_length(job.material.density),
            Some(shape.describe(sys)),
        )
    } else {
        let ix =
            a.ix.as_deref()
                .map(|t| units::parse(t, Dim::SecondMoment).map_err(|e| e.in_field("--Ix")))
                .transpose()?;
        (ix, 0.0, None)
    };
    let prep = job.prepare()?;
    let d = &prep.demand;
    let w = prep.self_weight(mass);
    let ei = ix.map(|i| i * job.material.e);
    if ei.is_none() && !d.springs.is_empty() {
        return Err(Error::msg(
            "the beam rests on spring supports, whose forces depend on the section's E·I: give a section or --Ix",
        ));
    }
    let beam = &job.beam;
    let sect = d.section(w, ei.unwrap_or(1.0));
    let sw_case = beam.self_weight_case.filter(|_| job.criteria.self_weight);
    let result = Analysed {
        title: job.title.clone(),
        analysis: analysis::analyse(beam, d, &sect, sw_case, ei.is_some(), a.stations),
        caution: report::CAUTION,
    };
    let basis = match (section, ei) {
        (Some(s), _) => Basis::Section(s, w),
        (None, Some(_)) => Basis::SecondMoment,
        (None, None) => Basis::None,
    };
    let doc = document(&job, &result.analysis, &basis, sys);
    emit(out, &report::render(out.format, &result, &doc)?)?;
    Ok(0)
}
