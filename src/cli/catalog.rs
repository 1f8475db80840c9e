//! `beamsift catalog validate|show`.

use super::Out;
use super::output::emit;
use beamsift::catalog::read::{self, ReadOptions, line_of};
use beamsift::catalog::{Materials, parse_row};
use beamsift::check::Material;
use beamsift::error::{Error, Result};
use beamsift::job;
use beamsift::report::{self, Align, Document, Table};
use beamsift::units::Show;
use serde::Serialize;
use std::path::PathBuf;

#[derive(clap::Subcommand, Debug)]
pub enum Cmd {
    /// Check every row of a catalogue and report every problem with its line and column.
    Validate(FileArgs),
    /// List a catalogue with its computed properties.
    Show(FileArgs),
}

#[derive(clap::Args, Debug)]
pub struct FileArgs {
    /// Catalogue CSV file.
    pub file: PathBuf,
    /// Job file whose material and grades the rows refer to (for grades and
    /// masses from density).
    #[arg(long, short = 'j', value_name = "FILE")]
    pub job: Option<PathBuf>,
    /// Field delimiter: a character, or 'tab'.
    #[arg(long, default_value = ",")]
    pub delimiter: String,
}

/// The base material, the grades, and whether a job supplied them.
type MaterialsFound = (Material, Vec<(String, Material)>, bool);

fn materials(a: &FileArgs) -> Result<MaterialsFound> {
    match &a.job {
        Some(p) => {
            let shown = p.display().to_string();
            let text = std::fs::read_to_string(p).map_err(|e| Error::io(&shown, e))?;
            let j = job::from_toml(&text, &shown)?;
            Ok((j.material, j.grades, true))
        }
        None => Ok((
            Material {
                name: "unknown".into(),
                e: 1.0,
                fb_tension: 1.0,
                fb_compression: 1.0,
                fv: None,
                fy: None,
                // Unknown density: masses are taken from the rows only.
                density: f64::NAN,
            },
            Vec::new(),
            false,
        )),
    }
}

fn open(a: &FileArgs) -> Result<read::Catalog<std::io::BufReader<std::fs::File>>> {
    let shown = a.file.display().to_string();
    let f = std::fs::File::open(&a.file).map_err(|e| Error::io(&shown, e))?;
    let delim = if a.delimiter == "tab" {
        b'\t'
    } else {
        *a.delimiter.as_bytes().first().unwrap_or(&b',')
    };
    read::open(
        std::io::BufReader::new(f),
        &shown,
        &ReadOptions { delimiter: delim },
    )
}

#[derive(Serialize)]
struct ValidateResult {
    file: String,
    rows: u64,
    good: u64,
    problems: Vec<String>,
}

pub fn run(cmd: Cmd, out: &Out) -> Result<i32> {
    match cmd {
        Cmd::Validate(a) => {
            let (base, grades, have_job) = materials(&a)?;
            let cat = open(&a)?;
            let file = cat.file.clone();
            let v = read::validate(cat, &base, &grades, have_job)?;
            let problems: Vec<String> = v.errors.iter().map(|e| e.to_string()).collect();
            let result = ValidateResult {
                file: file.clone(),
                rows: v.rows,
                good: v.good,
                problems: problems.clone(),
            };
            let mut doc = Document::new(format!("Catalogue {file}"));
            if problems.is_empty() {
                doc.para(format!("{} row(s), all valid.", v.rows));
            } else {
                doc.list(format!("{} problem(s):", problems.len()), problems.clone());
                doc.para(format!(
                    "{} row(s) read, {} valid, {} with problems.",
                    v.rows,
                    v.good,
                    v.rows - v.good
                ));
            }
            if !have_job {
                doc.para("No --job given: grades were not looked up and masses were not compared with A·ρ.");
            }
            emit(out, &report::render(out.format, &result, &doc))?;
            if problems.is_empty() {
                Ok(0)
            } else {
                // Print the list, then exit as bad input.
                Ok(2)
            }
        }
        Cmd::Show(a) => {
            let (base, grades, _) = materials(&a)?;
            let mut cat = open(&a)?;
            let mats = Materials {
                base: &base,
                grades: &grades,
            };
            let sys = out.units;
            let mut t = Table::new(
                "",
                &[
                    ("Line", Align::Right),
                    ("Name", Align::Left),
                    ("Shape", Align::Left),
                    ("Grade", Align::Left),
                    (&format!("d [{}]", Show::Dimension.label(sys)), Align::Right),
                    (&format!("A [{}]", Show::Area.label(sys)), Align::Right),
                    (
                        &format!("Ix [{}]", Show::SecondMoment.label(sys)),
                        Align::Right,
                    ),
                    (
                        &format!("S_top [{}]", Show::SectionModulus.label(sys)),
                        Align::Right,
                    ),
                    (
                        &format!("S_bot [{}]", Show::SectionModulus.label(sys)),
                        Align::Right,
                    ),
                    (&format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
                ],
            );
            let mut rows_json = Vec::new();
            let mut buf = Vec::new();
            let mut errors = Vec::new();
            loop {
                let n = cat.next_chunk(&mut buf, 4096)?;
                if n == 0 {
                    break;
                }
                for rec in &buf[..n] {
                    match parse_row(&cat.schema, rec, &mats) {
                        Ok(r) => {
                            t.row(vec![
                                line_of(rec).to_string(),
                                r.name.to_string(),
                                r.shape
                                    .as_ref()
                                    .map(|s| s.family().to_string())
                                    .unwrap_or_else(|| "given".into()),
                                r.grade.to_string(),
                                Show::Dimension.num(r.props.depth, sys),
                                Show::Area.num(r.props.area, sys),
                                Show::SecondMoment.num(r.props.ix, sys),
                                Show::SectionModulus.num(r.props.s_top, sys),
                                Show::SectionModulus.num(r.props.s_bot, sys),
                                if r.mass.is_finite() {
                                    Show::Mass.num(r.mass, sys)
                                } else {
                                    "—".into()
                                },
                            ]);
                            rows_json.push(serde_json::json!({
                                "line": line_of(rec), "name": r.name, "shape": r.shape, "grade": r.grade,
                                "properties": r.props, "mass_per_length": r.mass, "cost_per_mm": r.cost, "stock": r.stock
                            }));
                        }
                        Err(e) => errors.push(format!(
                            "{}:{}:{}: {}",
                            cat.file,
                            line_of(rec),
                            e.column,
                            e.message
                        )),
                    }
                }
            }
            let mut doc = Document::new(format!("Catalogue {}", cat.file));
            doc.table(t);
            if !errors.is_empty() {
                doc.list("Rows with problems (not shown):", errors.clone());
            }
            doc.para("Properties computed from the dimensions unless the row gives them; check them before trusting a run.");
            let result =
                serde_json::json!({ "file": cat.file, "rows": rows_json, "problems": errors });
            emit(out, &report::render(out.format, &result, &doc))?;
            Ok(if errors.is_empty() { 0 } else { 2 })
        }
    }
}
