//! The job file (TOML): turns a user's description of a member into a
//! validated [`Beam`], [`Material`] and [`Criteria`]. Pure: it takes text,
//! not files (except [`read_text`], which reads one for the command line).
//!
//! Every quantity is a string with its unit (`"5.4 m"`, `"2.5 kN/m"`).
//! Errors carry the file name, line and column of the offending value.
//!
//! The combination presets a job may name (`[presets]`) and the standard
//! combinations of a beam built from flags live with the combinations, in
//! [`crate::beam::presets`].
//!
//! One file per part of the job: `raw` (the TOML as written), `source`
//! (spans to locations), `values` (the words flags and schedules share),
//! `beam` (spans, supports, cases), `loads`, `combinations` (with the
//! presets), `material` (and grades), `checks` (the criteria); `flags`
//! (the job from flag values, or a job file with values replaced).

mod beam;
mod checks;
mod combinations;
mod flags;
mod loads;
mod material;
mod raw;
mod source;
mod values;

pub use crate::beam::presets::{set_partial_snow, standard as standard_combinations};
pub use flags::JobFlags;
pub use values::{
    RATIO_RANGE, parse_braced_flange, parse_bracing, parse_kind, parse_load_height, parse_ratio,
    parse_support,
};

use crate::beam::model::Beam;
use crate::check::{Criteria, Material};
use crate::error::{Error, Location, Result};
use crate::units;
use raw::RawJob;
use source::Source;

/// The title block of a job (its `[project]` table): who and what a
/// calculation sheet is for. Every entry is optional; a sheet leaves a
/// blank to fill in by hand where one is not given.
#[derive(Clone, Debug, Default, PartialEq, Eq, serde::Serialize)]
pub struct Project {
    pub project: Option<String>,
    pub job_number: Option<String>,
    pub member: Option<String>,
    pub engineer: Option<String>,
    pub checker: Option<String>,
    pub date: Option<String>,
    pub revision: Option<String>,
}

impl Project {
    /// Whether the job gave no entry at all.
    pub fn is_empty(&self) -> bool {
        *self == Project::default()
    }
}

/// A job ready to analyse.
#[derive(Clone, Debug)]
pub struct Job {
    pub title: String,
    /// The title block (`[project]`), for calculation sheets.
    pub project: Project,
    pub beam: Beam,
    pub material: Material,
    pub criteria: Criteria,
    /// Named material grades a catalogue row may refer to.
    pub grades: Vec<(String, Material)>,
    /// Currency of catalogue costs (for display).
    pub currency: Option<String>,
    /// Preset names used (strength, service), so a schedule can regenerate
    /// the combinations for its own cases.
    pub presets: (Option<String>, Option<String>),
    /// Notes on how the job was interpreted (defaults applied, ...).
    pub notes: Vec<String>,
}

impl Job {
    /// Analyse the beam once for this job: the demand every section check
    /// of it uses (see [`crate::check::Prepared`]).
    pub fn prepare(&self) -> Result<crate::check::Prepared> {
        crate::check::Prepared::new(&self.beam, self.material.clone(), self.criteria.clone())
    }
}

/// Read a text file (a job file), reporting invalid UTF-8 as bad input at
/// its line and column rather than as an I/O failure.
pub fn read_text(path: &std::path::Path, shown: &str) -> Result<String> {
    // Read at most one byte past the limit (from_toml then refuses it).
    let mut bytes = Vec::new();
    std::fs::File::open(path)
        .and_then(|f| {
            use std::io::Read;
            f.take(MAX_JOB_BYTES as u64 + 1).read_to_end(&mut bytes)
        })
        .map_err(|e| Error::io(shown, e))?;
    if bytes.len() > MAX_JOB_BYTES {
        return Err(Error::input(
            Location::in_file(shown),
            format!(
                "the job file is more than {} bytes, the most a job may have: is it the right file?",
                units::count(MAX_JOB_BYTES as u64)
            ),
        ));
    }
    String::from_utf8(bytes).map_err(|e| {
        let good = &e.as_bytes()[..e.utf8_error().valid_up_to()];
        let line = good.iter().filter(|b| **b == b'\n').count() as u64 + 1;
        let col = good.iter().rev().take_while(|b| **b != b'\n').count() as u64 + 1;
        Error::input(
            Location::in_file(shown).with_line(line).with_column(col),
            "not valid UTF-8 text: save the file as UTF-8",
        )
    })
}

/// Largest job file read (a job with the most loads allowed is well under
/// 1 MB): a larger file is refused before it is parsed.
pub const MAX_JOB_BYTES: usize = 4 << 20;

/// Most spans, load cases, loads and combinations one job may hold.
pub const MAX_SPANS: usize = 100;
pub const MAX_CASES: usize = 200;
pub const MAX_LOADS: usize = 10_000;
pub const MAX_COMBINATIONS: usize = 2_000;

/// Read a job from TOML text; `file` names it in errors.
pub fn from_toml(text: &str, file: &str) -> Result<Job> {
    read_job(text, file, false).map(|(job, _)| job)
}

/// Read a schedule's template job: its material, grades, criteria,
/// presets, currency, project, and load cases with their combinations
/// (each case taken by its category). It need not be a member: `[beam]`
/// and `[[load]]` may be left out. Where they are given they are read
/// and checked as in any job but not used (every member's spans and loads
/// come from the schedule). Without a `[beam]` the returned job's beam is
/// a placeholder of one 1 m span that holds only the cases and
/// combinations: it is never analysed. The job's notes (which every
/// member carries) say what was not used.
pub fn template_from_toml(text: &str, file: &str) -> Result<Job> {
    let (mut job, unused) = read_job(text, file, true)?;
    job.notes.extend(unused);
    Ok(job)
}

fn read_job(text: &str, file: &str, template: bool) -> Result<(Job, Vec<String>)> {
    let src = Source { file, text };
    let raw = parse(&src)?;
    within_limits(&src, &raw)?;
    let mut notes = Vec::new();
    let mut unused = Vec::new();
    let mut beam = match (&raw.beam, template) {
        (Some(b), _) => beam::beam(&src, b)?,
        (None, true) => crate::beam::model::Beam::new(
            vec![1000.0],
            vec![
                crate::beam::model::Support::Pinned,
                crate::beam::model::Support::Pinned,
            ],
        ),
        (None, false) => {
            return Err(Error::input(
                Location::in_file(file).with_field("beam"),
                "the job has no [beam] table: add one with spans = [...] and supports = [...]",
            ));
        }
    };
    let material = material::parse_material(&src, &raw.material, "material", &mut notes)?;
    let grades = material::grades(&src, raw.materials.as_ref(), &material)?;
    // A template may leave the cases out: a schedule's columns are dead,
    // live and snow loads, each its own case.
    let explicit_pattern = if template && raw.case.is_empty() {
        for c in [
            crate::beam::model::Category::Dead,
            crate::beam::model::Category::Live,
            crate::beam::model::Category::Snow,
        ] {
            beam.case(c.name(), c);
        }
        beam.self_weight_case = Some(0);
        vec![false; 3]
    } else {
        beam::cases(&src, &mut beam, &raw.case)?
    };
    let loads = if template && raw.beam.is_none() {
        if let Some(l) = raw.load.first() {
            return src.err(
                l.case.span(),
                "load",
                "a template without a [beam] cannot place loads: every member's loads come from the schedule, so remove the [[load]] tables (or add the [beam] they were written for)",
            );
        }
        Vec::new()
    } else {
        loads::loads(&src, &mut beam, &raw.load)?
    };
    combinations::combinations(&src, &mut beam, &raw.combination)?;
    let before_presets = notes.len();
    combinations::presets(
        &src,
        &mut beam,
        raw.presets.as_ref(),
        &explicit_pattern,
        &mut notes,
    )?;
    if template {
        // Each member applies the presets to its own cases and says so.
        notes.truncate(before_presets);
    } else {
        combinations::need_strength(&src, &beam)?;
    }
    let criteria = checks::criteria(&src, raw.checks.as_ref())?;
    checks::refuse_unsuitable(&src, raw.checks.as_ref(), &criteria, &material, &grades)?;
    if !template && criteria.self_weight && beam.self_weight_case.is_none() {
        notes.push("no dead load case: the section's self-weight is not included".into());
    }
    loads::validate(&src, &beam, &loads)?;
    if template && raw.beam.is_some() {
        unused.push(format!(
            "the template {file}'s [beam] (spans and supports){}: every member's spans, supports and loads come from the schedule",
            if raw.load.is_empty() {
                " is not used".to_string()
            } else {
                format!(" and its {} [[load]] table(s) are not used", raw.load.len())
            }
        ));
    }
    let project = raw
        .project
        .as_ref()
        .map(|p| Project {
            project: p.project.clone(),
            job_number: p.job_number.clone(),
            member: p.member.clone(),
            engineer: p.engineer.clone(),
            checker: p.checker.clone(),
            date: p.date.clone(),
            revision: p.revision.clone(),
        })
        .unwrap_or_default();
    let job = Job {
        title: raw.title.unwrap_or_else(|| "beam".into()),
        project,
        beam,
        material,
        criteria,
        grades,
        currency: raw.currency.clone(),
        presets: (
            raw.presets
                .as_ref()
                .and_then(|p| p.strength.as_ref().map(|s| s.get_ref().clone())),
            raw.presets
                .as_ref()
                .and_then(|p| p.service.as_ref().map(|s| s.get_ref().clone())),
        ),
        notes,
    };
    Ok((job, unused))
}

/// The TOML parsed into the raw tables, refused before parsing when the
/// text is too large.
fn parse(src: &Source<'_>) -> Result<RawJob> {
    let (text, file) = (src.text, src.file);
    if text.len() > MAX_JOB_BYTES {
        return Err(Error::input(
            Location::in_file(file),
            format!(
                "the job file is {} bytes, more than the {} a job may have: is it the right file?",
                units::count(text.len() as u64),
                units::count(MAX_JOB_BYTES as u64)
            ),
        ));
    }
    toml::from_str(text).map_err(|e| {
        let loc = match e.span() {
            Some(sp) => src.loc(sp, ""),
            None => Location::in_file(file),
        };
        let loc = Location { field: None, ..loc };
        Error::input(loc, e.message().to_string())
    })
}

/// Counts above the most one job may hold are refused, at the first one
/// too many where it has a place.
fn within_limits(src: &Source<'_>, raw: &RawJob) -> Result<()> {
    for (what, n, most, span) in [
        (
            "spans",
            raw.beam.as_ref().map_or(0, |b| b.spans.get_ref().len()),
            MAX_SPANS,
            raw.beam
                .as_ref()
                .and_then(|b| b.spans.get_ref().get(MAX_SPANS).map(|s| s.span())),
        ),
        ("load cases", raw.case.len(), MAX_CASES, None),
        (
            "loads",
            raw.load.len(),
            MAX_LOADS,
            raw.load.get(MAX_LOADS).map(|l| l.case.span()),
        ),
        (
            "combinations",
            raw.combination.len(),
            MAX_COMBINATIONS,
            None,
        ),
    ] {
        if n > most {
            let loc = match span {
                Some(sp) => src.loc(sp, ""),
                None => Location::in_file(src.file),
            };
            return Err(Error::input(
                loc,
                format!(
                    "the job has {} {what}, more than the {} one job may have",
                    units::count(n as u64),
                    units::count(most as u64)
                ),
            ));
        }
    }
    Ok(())
}
