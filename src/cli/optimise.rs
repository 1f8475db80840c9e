//! `beamsift optimise`: the best proportions of a rectangle, welded I,
//! mono-symmetric I or hollow section, continuous and on fabrication sizes.

use super::Out;
use super::catargs::{CatalogArgs, scan_for_sheet};
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::error::{Error, Result};
use beamsift::optimise::{self, Family, Objective};
use beamsift::report;
use beamsift::report::optimise::{LimitSource, document};

pub const EXAMPLES: &str = "Examples:
  beamsift optimise --job catalogs/demo-joists.toml rect --aspect 4 --b-sizes 38,47,63,75mm --d-sizes 100,125,150,175,200,225,250,300mm
  beamsift optimise --job catalogs/demo-job.toml welded-i --max-depth 450mm
  beamsift optimise --job catalogs/demo-job.toml welded-i --max-depth 450mm -c catalogs/demo-steel.csv --section 'NB 360 L'
  beamsift optimise --job job.toml welded-i --bound hw=300mm..900mm --plates 8,10,12,15,20,25mm --objective cost \\
      --plate-prices 1.35,1.30,1.25,1.22,1.20,1.20

Bounds default to: rect b 38–300, d 75–1200 mm; welded-i bf 100–600, tf 6–50, hw 150–2000,
tw 5–30 mm; mono-i the same for each flange; rhs b 50–400, h 50–600, t 3–20 mm.";

#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    /// Catalogue file(s) holding the row named by --section: CSV, or a
    /// workbook (FILE#SHEET names a sheet).
    #[arg(long, short = 'c', value_name = "FILE")]
    pub catalog: Vec<std::path::PathBuf>,
    /// Field delimiter of the catalogue: a character, or 'tab'.
    #[arg(long, default_value = ",")]
    pub delimiter: String,
    /// Name of a catalogue row to set beside the optimum (checked against
    /// the same job, in its own grade).
    #[arg(long, value_name = "NAME")]
    pub section: Option<String>,
    /// Section family to proportion.
    #[arg(value_parser = super::values::family())]
    pub family: Family,
    /// Bounds on a variable as NAME=LOW..HIGH (e.g. hw=300mm..900mm); repeatable.
    #[arg(long = "bound", value_name = "NAME=LOW..HIGH")]
    pub bounds: Vec<String>,
    /// Largest overall depth.
    #[arg(long = "max-depth", value_name = "LENGTH")]
    pub max_depth: Option<String>,
    /// Smallest overall depth.
    #[arg(long = "min-depth", value_name = "LENGTH")]
    pub min_depth: Option<String>,
    /// Largest d/b of a rectangle.
    #[arg(long)]
    pub aspect: Option<f64>,
    /// Flange slenderness limit bf/(2tf) of I-shapes (default none: flange
    /// local buckling is a constraint by AISC 360-16 F3/F4/F5).
    #[arg(long = "lambda-f")]
    pub lambda_f: Option<f64>,
    /// Web slenderness limit hw/tw of I-shapes (default the AISC 360-16 F13.2
    /// limit of unstiffened webs, min(0.40·E/Fy, 260)); wall (b−2t)/t of rhs
    /// (default 5.70√(E/Fy), the end of the webs implemented by F7).
    #[arg(long = "lambda-w")]
    pub lambda_w: Option<f64>,
    /// Keep flanges and webs compact (AISC 360-16 Table B4.1b λp), as some
    /// fabricators prefer.
    #[arg(long)]
    pub compact: bool,
    /// What to minimise.
    #[arg(long, value_parser = super::values::objective(), default_value = "area")]
    pub objective: Objective,
    /// Plate thicknesses available (a list with one unit at the end)
    /// [default: 6,8,10,12,15,20,25,30,35,40,45,50mm].
    #[arg(long)]
    pub plates: Option<String>,
    /// Price per kg of each plate thickness, same order as --plates (for --objective cost).
    #[arg(long = "plate-prices", value_name = "LIST")]
    pub plate_prices: Option<String>,
    /// Step of plate widths and of depths other than thicknesses [default: 10mm].
    #[arg(long)]
    pub step: Option<String>,
    /// Rectangle widths available (list with a unit), instead of --step.
    #[arg(long = "b-sizes", value_name = "LIST")]
    pub b_sizes: Option<String>,
    /// Rectangle depths available (list with a unit), instead of --step.
    #[arg(long = "d-sizes", value_name = "LIST")]
    pub d_sizes: Option<String>,
    /// Number of starting points for the continuous search.
    #[arg(long, default_value_t = 6)]
    pub starts: usize,
}

impl Args {
    /// The options as typed, for the library to check.
    fn options(&self) -> optimise::Options {
        optimise::Options {
            family: self.family,
            bounds: self.bounds.clone(),
            max_depth: self.max_depth.clone(),
            min_depth: self.min_depth.clone(),
            aspect: self.aspect,
            lambda_f: self.lambda_f,
            lambda_w: self.lambda_w,
            compact: self.compact,
            objective: self.objective,
            plates: self.plates.clone(),
            plate_prices: self.plate_prices.clone(),
            step: self.step.clone(),
            b_sizes: self.b_sizes.clone(),
            d_sizes: self.d_sizes.clone(),
            starts: self.starts,
        }
    }
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let options = a.options();
    options.refuse_inapplicable()?;
    let job = a.job.load()?;
    let sys = out.units;
    let prep = job.prepare()?;
    let (prob, opts) = options.build(&job.material, sys)?;
    let mut result = optimise::study(&job.title, &prob, &prep, &opts)?;
    match (&a.section, a.catalog.is_empty()) {
        (Some(name), false) => {
            let cat = CatalogArgs::rows_of(a.catalog.clone(), &a.delimiter);
            let (sel, _) = scan_for_sheet(&job, &prep, &cat, Some(name), sys)?;
            sel.named(name)?.set_beside(&mut result);
        }
        (None, true) if a.delimiter != "," => {
            return Err(Error::msg(
                "--delimiter is for the catalogue of --section NAME --catalog FILE: give them, or leave it out",
            )
            .in_field("--delimiter"));
        }
        (None, true) => {}
        (Some(_), true) => {
            return Err(Error::msg(
                "--section names a catalogue row: give the catalogue with --catalog FILE",
            )
            .in_field("--section"));
        }
        (None, false) => {
            return Err(Error::msg(
                "--catalog is read for the row to compare the optimum with: name it with --section NAME",
            )
            .in_field("--catalog"));
        }
    }
    let source = LimitSource {
        flange_given: a.lambda_f.is_some(),
        web_given: a.lambda_w.is_some(),
        compact: a.compact,
        yield_stress_known: job.material.fy.is_some(),
    };
    let doc = document(&result, &source, sys);
    emit(out, &report::render(out.format, &result, &doc)?)?;
    Ok(0)
}
