//! `beamsift report`, and the `--report` option of check, select and optimise:
//! a calculation sheet as Markdown and HTML.

use super::Out;
use super::catargs::CatalogArgs;
use super::jobargs::JobArgs;
use super::output::{emit, write_atomic};
use super::select::{prepare, run_scan};
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::job::Job;
use beamsift::report::{Align, Table, member, sheet};
use beamsift::search::{Candidate, Rank, ScanOptions};
use beamsift::section::Properties;
use beamsift::section::spec::{shape_from_pairs, split_pairs};
use beamsift::units::{Show, System};
use std::path::{Path, PathBuf};

pub const EXAMPLES: &str = "Examples:
  beamsift report --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --to b1-calc
  beamsift report --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --section 'NB 360 L' --to b1-calc --force
  beamsift report --job job.toml --to calc welded-i bf=180mm tf=14mm hw=420mm tw=8mm

Writes PREFIX.md and PREFIX.html (self-contained: diagrams inline, no external files).";

#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    /// Catalogue to take the section from (the lightest passing one unless --section names one).
    #[arg(long, short = 'c', value_name = "FILE")]
    pub catalog: Vec<PathBuf>,
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

/// The two files a prefix names.
pub fn report_paths(prefix: &Path) -> (PathBuf, PathBuf) {
    let s = prefix.as_os_str().to_string_lossy();
    let s = s
        .strip_suffix(".md")
        .or_else(|| s.strip_suffix(".html"))
        .unwrap_or(&s)
        .to_string();
    (
        PathBuf::from(format!("{s}.md")),
        PathBuf::from(format!("{s}.html")),
    )
}

/// Write the sheet; returns the two paths.
#[allow(clippy::too_many_arguments)]
pub fn write(
    job: &Job,
    prep: &Prepared,
    name: &str,
    props: &Properties,
    mass: f64,
    source: &str,
    alternatives: Option<Table>,
    sys: System,
    prefix: &Path,
    material: Option<&beamsift::check::Material>,
) -> Result<(
    PathBuf,
    PathBuf,
    beamsift::report::calc::Sheet,
    beamsift::check::Verdict,
)> {
    let r = member::member_check(job, prep, name, props, mass, material);
    let s = sheet::build(job, prep, &r, source, alternatives, sys);
    let (md, html) = report_paths(prefix);
    write_atomic(&md, sheet::markdown(&s).as_bytes());
    write_atomic(&html, sheet::html(&s).as_bytes());
    Ok((md, html, s, r.verdict))
}

/// A table of alternatives from a scan.
pub fn alternatives(list: &[Candidate], skip: &str, sys: System) -> Option<Table> {
    let mut t = Table::new(
        "Next lightest passing sections",
        &[
            ("Section", Align::Left),
            ("Mass", Align::Right),
            ("Depth", Align::Right),
            ("Utilisation", Align::Right),
            ("Governed by", Align::Left),
        ],
    );
    for c in list.iter().filter(|c| c.name != skip).take(5) {
        t.row(vec![
            c.name.clone(),
            Show::Mass.fmt(c.mass, sys),
            Show::Dimension.fmt(c.depth, sys),
            format!("{:.3}", c.utilisation),
            c.governing
                .map(|g| g.kind.label().to_string())
                .unwrap_or_default(),
        ]);
    }
    (!t.rows.is_empty()).then_some(t)
}

/// Where a catalogue section's properties came from, for the sheet.
pub fn candidate_source(sel: &beamsift::search::Selection, c: &Candidate) -> String {
    format!(
        "catalogue {} line {}; {}",
        sel.files.get(c.file).cloned().unwrap_or_default(),
        c.line,
        if c.shape.is_some() {
            "properties computed from its dimensions (given values used where the row has them)"
        } else {
            "properties as given by the row"
        }
    )
}

/// Write the sheet of a selected catalogue section (select --report).
pub fn write_candidate(
    job: &Job,
    prep: &Prepared,
    sel: &beamsift::search::Selection,
    c: &Candidate,
    sys: System,
    prefix: &Path,
) -> Result<String> {
    let mats = beamsift::catalog::Materials {
        base: &job.material,
        grades: &job.grades,
    };
    let m = mats.get(&c.material).clone();
    let (md, html, _, verdict) = write(
        job,
        prep,
        &c.name,
        &c.properties,
        c.mass,
        &candidate_source(sel, c),
        alternatives(&sel.lists[0].items, &c.name, sys),
        sys,
        prefix,
        Some(&m),
    )?;
    Ok(format!(
        "Calculation sheet for {}: {} and {} ({}).",
        c.name,
        md.display(),
        html.display(),
        verdict.word()
    ))
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
    let prep = prepare(&job)?;
    let sys = out.units;
    let mats = beamsift::catalog::Materials {
        base: &job.material,
        grades: &job.grades,
    };
    let (name, props, mass, source, alts, row_mat) = if let Some((fam, dims)) =
        a.shape.split_first()
    {
        if !a.catalog.is_empty() {
            return Err(Error::msg("give either a shape or --catalog, not both"));
        }
        let shape = shape_from_pairs(fam, &split_pairs(dims)?)?;
        let p = shape.properties()?;
        let m = p.mass_per_length(job.material.density);
        (
            shape.describe(sys),
            p,
            m,
            "properties computed from the dimensions (section module)".to_string(),
            None,
            None,
        )
    } else {
        if a.catalog.is_empty() {
            return Err(Error::msg(
                "give a shape (e.g. rect b=75mm d=300mm) or --catalog FILE",
            ));
        }
        let cat = CatalogArgs {
            catalog: a.catalog.clone(),
            delimiter: ",".into(),
            skip_bad_rows: false,
            max_depth: None,
            min_depth: None,
            max_width: None,
            grade: None,
            in_stock: false,
            name: a.section.clone(),
            jobs: None,
            quiet: true,
            inputs: Default::default(),
        };
        // With --section every row the name filter lets through is kept,
        // so the exact name is found whatever its verdict.
        let keep = if a.section.is_some() { 10_000 } else { 6 };
        let opts = ScanOptions {
            ranks: vec![(Rank::Mass, keep)],
            near: if a.section.is_some() { keep } else { 1 },
            unverified: keep,
            filters: cat.filters_for(&job)?,
            ..ScanOptions::default()
        };
        let (sel, _) = run_scan(&job, &prep, &cat, &opts)?;
        let pick = match &a.section {
            Some(n) => sel.lists[0]
                .items
                .iter()
                .chain(sel.near_misses.items.iter())
                .chain(sel.unverified.items.iter())
                .find(|c| &c.name == n)
                .cloned(),
            None => sel.lists[0].items.first().cloned(),
        };
        let similar: Vec<String> = match &a.section {
            Some(n) => sel.lists[0]
                .items
                .iter()
                .chain(sel.near_misses.items.iter())
                .chain(sel.unverified.items.iter())
                .filter(|c| c.name.eq_ignore_ascii_case(n) && &c.name != n)
                .map(|c| format!("'{}'", c.name))
                .collect(),
            None => Vec::new(),
        };
        let c = pick.ok_or_else(|| match &a.section {
            Some(n) if !similar.is_empty() => Error::msg(format!(
                "no section named '{n}' in the catalogue (names are matched exactly, case included); similar: {}",
                similar.join(", ")
            )),
            Some(n) => Error::msg(format!("no section named '{n}' in the catalogue")),
            None => Error::NoSolution("no catalogue section passes: nothing to report (see `beamsift select` for the nearest misses, and the sections not verified)".into()),
        })?;
        let src = candidate_source(&sel, &c);
        let alts = if a.section.is_none() {
            alternatives(&sel.lists[0].items, &c.name, sys)
        } else {
            None
        };
        (
            c.name.clone(),
            c.properties.clone(),
            c.mass,
            src,
            alts,
            Some(c.material.clone()),
        )
    };
    let row_material = row_mat.as_ref().map(|m| mats.get(m).clone());
    let (md, html, sheet, verdict) = write(
        &job,
        &prep,
        &name,
        &props,
        mass,
        &source,
        alts,
        sys,
        &a.to,
        row_material.as_ref(),
    )?;
    let summary = format!(
        "Wrote {} and {} for {name}: {}.\n",
        md.display(),
        html.display(),
        verdict.word()
    );
    if out.format == beamsift::report::Format::Json {
        emit(
            out,
            &format!(
                "{}\n",
                serde_json::to_string_pretty(&sheet).unwrap_or_default()
            ),
        )?;
    } else {
        emit(out, &summary)?;
    }
    Ok(super::check::verdict_code(verdict))
}
