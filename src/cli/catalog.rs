//! `beamsift catalog validate|show`.

use super::Out;
use super::output::emit;
use beamsift::catalog::Materials;
use beamsift::catalog::generate;
use beamsift::catalog::read::{self, ReadOptions};
use beamsift::check::Material;
use beamsift::error::{Error, Result};
use beamsift::job;
use beamsift::report::catalog::{ValidateResult, show_document, validate_document};
use beamsift::report::{self, Format};
use beamsift::units;
use std::path::PathBuf;

#[derive(clap::Subcommand, Debug)]
pub enum Cmd {
    /// Check every row of a catalogue and report every problem with its line and column.
    #[command(
        after_help = "Example:\n  beamsift catalog validate catalogs/demo-timber.csv --job catalogs/demo-joists.toml"
    )]
    Validate(FileArgs),
    /// List a catalogue with its computed properties.
    #[command(
        after_help = "Example:\n  beamsift catalog show catalogs/ipe-en10365-from-memory.csv --job catalogs/demo-job.toml"
    )]
    Show(FileArgs),
    /// Write a catalogue of every combination of given plates or timber sizes.
    #[command(after_help = GENERATE_EXAMPLES)]
    Generate(Box<GenerateArgs>),
}

pub const GENERATE_EXAMPLES: &str = "Examples:
  beamsift catalog generate welded-i --bf 150..400:10mm --tf 8,10,12,15,20,25mm --hw 300..900:10mm \\
      --tw 6,8,10,12mm --Fy 345MPa --price-per-kg 1.25 -o plates.csv
  beamsift catalog generate rect --b 38,47,63,75mm --d 100..300:25mm --grades T1=650,T2=780 --max-aspect 5 -o timber.csv
  beamsift catalog generate rect --nominal us-lumber --b 2,3,4in --d 6,8,10,12in --grades No2 -o lumber.csv

Ranges are START..END:STEP with a unit; lists are comma-separated with a unit at the end.
Rules for welded I: tw <= tf and bf <= hw (common practice), plus the slenderness limits
(--lambda-f/--lambda-w, or AISC 360-16 Table B4.1b compact limits from --Fy and --E).";

#[derive(clap::Args, Debug)]
pub struct GenerateArgs {
    /// welded-i or rect.
    pub family: String,
    /// Flange widths (welded-i): a list "150,180,200mm" or a range
    /// "150..400:10mm".
    #[arg(long)]
    pub bf: Option<String>,
    /// Flange thicknesses (welded-i), as a list or range.
    #[arg(long)]
    pub tf: Option<String>,
    /// Web heights between the flanges (welded-i), as a list or range.
    #[arg(long)]
    pub hw: Option<String>,
    /// Web thicknesses (welded-i), as a list or range.
    #[arg(long)]
    pub tw: Option<String>,
    /// Rectangle widths (rect), as a list or range.
    #[arg(long)]
    pub b: Option<String>,
    /// Rectangle depths (rect), as a list or range.
    #[arg(long)]
    pub d: Option<String>,
    /// Timber grades with an optional price per m³: T1=650,T2=780.
    #[arg(long)]
    pub grades: Option<String>,
    /// Largest depth/width d/b kept (rect).
    #[arg(long = "max-aspect")]
    pub max_aspect: Option<f64>,
    /// --b and --d are nominal timber sizes in inches (rect): rows are named
    /// by them (2x10) and written at their dressed sizes (1.5 x 9.25 in).
    #[arg(long, value_parser = super::values::nominal())]
    pub nominal: Option<generate::Nominal>,
    /// Largest flange outstand ratio bf/(2tf) kept (welded-i; default from
    /// --Fy, else no limit).
    #[arg(long = "lambda-f")]
    pub lambda_f: Option<f64>,
    /// Largest web ratio hw/tw kept (welded-i; default from --Fy, else no
    /// limit).
    #[arg(long = "lambda-w")]
    pub lambda_w: Option<f64>,
    /// Yield stress, for default compact slenderness limits.
    #[arg(long = "Fy")]
    pub fy: Option<String>,
    /// Modulus of elasticity for the slenderness limits.
    #[arg(long = "E", default_value = generate::DEFAULT_E)]
    pub e: String,
    /// Steel density for the mass column (welded-i).
    #[arg(long, default_value = generate::DEFAULT_DENSITY)]
    pub density: String,
    /// Price per kg of steel for the cost column (welded-i).
    #[arg(long = "price-per-kg")]
    pub price_per_kg: Option<f64>,
    /// Currency named in the cost column header.
    #[arg(long, default_value = "EUR")]
    pub currency: String,
}

impl GenerateArgs {
    /// The options as given, for the library.
    fn options(&self) -> generate::Options {
        generate::Options {
            family: self.family.clone(),
            bf: self.bf.clone(),
            tf: self.tf.clone(),
            hw: self.hw.clone(),
            tw: self.tw.clone(),
            b: self.b.clone(),
            d: self.d.clone(),
            grades: self.grades.clone(),
            max_aspect: self.max_aspect,
            nominal: self.nominal,
            lambda_f: self.lambda_f,
            lambda_w: self.lambda_w,
            fy: self.fy.clone(),
            e: self.e.clone(),
            density: self.density.clone(),
            price_per_kg: self.price_per_kg,
        }
    }
}

#[derive(clap::Args, Debug)]
pub struct FileArgs {
    /// Catalogue file: CSV ('-' for standard input), or a workbook (.xlsx,
    /// .xlsm, .xlsb, .xls, .ods: its first sheet, or FILE#SHEET).
    pub file: PathBuf,
    /// Job file whose material and grades the rows refer to (for grades and
    /// masses from density).
    #[arg(long, short = 'j', value_name = "FILE")]
    pub job: Option<PathBuf>,
    /// Field delimiter of CSV: a character, or 'tab' (refused for a workbook).
    #[arg(long, default_value = ",")]
    pub delimiter: String,
    /// Numbers use a decimal comma: 12,5 is 12.5 (needs --delimiter ';' or tab).
    #[arg(long = "decimal-comma")]
    pub decimal_comma: bool,
}

/// The base material, the grades, and whether a job supplied them.
type MaterialsFound = (Material, Vec<(String, Material)>, bool);

fn materials(a: &FileArgs) -> Result<MaterialsFound> {
    match &a.job {
        Some(p) => {
            let shown = p.display().to_string();
            let text = beamsift::job::read_text(p, &shown)?;
            let j = job::from_toml(&text, &shown)?;
            Ok((j.material, j.grades, true))
        }
        None => Ok((
            Material {
                // Unknown density: masses are taken from the rows only.
                density: f64::NAN,
                ..Material::allowable("unknown", 1.0, 1.0, None, 0.0)
            },
            Vec::new(),
            false,
        )),
    }
}

fn open(a: &FileArgs) -> Result<read::Catalog<Box<dyn std::io::Read + Send>>> {
    // '-' is standard input; pipes and FIFOs are read once (see Input).
    let input = super::catargs::Input::new(&a.file)?;
    let opts = ReadOptions::new(&a.delimiter, a.decimal_comma)?;
    input.open(&opts)
}

pub fn run(cmd: Cmd, out: &Out) -> Result<i32> {
    match cmd {
        Cmd::Validate(a) => {
            let (base, grades, have_job) = materials(&a)?;
            let cat = open(&a)?;
            let file = cat.file.clone();
            let v = read::validate(cat, &base, &grades, have_job)?;
            let result = ValidateResult::new(file, &v);
            let doc = validate_document(&result, have_job);
            emit(out, &report::render(out.format, &result, &doc)?)?;
            // Print the list, then exit as bad input.
            Ok(if result.valid() { 0 } else { 2 })
        }
        Cmd::Generate(a) => generate(*a, out),
        Cmd::Show(a) => {
            let (base, grades, _) = materials(&a)?;
            let mats = Materials {
                base: &base,
                grades: &grades,
            };
            let result = read::list(open(&a)?, &mats)?;
            let doc = show_document(&result, out.units);
            emit(out, &report::render(out.format, &result, &doc)?)?;
            Ok(if result.problems.is_empty() { 0 } else { 2 })
        }
    }
}

fn generate(a: GenerateArgs, out: &Out) -> Result<i32> {
    if !matches!(out.format, Format::Table | Format::Csv) {
        return Err(Error::msg(
            "catalog generate writes a catalogue CSV: --format json or markdown has no meaning here",
        )
        .in_field("--format"));
    }
    if out.units != units::System::Si {
        return Err(Error::msg(
            "catalog generate writes sizes in mm (the catalogue reader takes any unit in the header): --units us is not supported here",
        )
        .in_field("--units"));
    }
    let spec = a.options().spec()?;
    let n = match &out.path {
        Some(p) => {
            let mut f = super::files::StreamFile::create(p)?;
            let n = generate::generate(&spec, &a.currency, &p.display().to_string(), f.writer())?;
            f.commit(out.force)?;
            eprintln!("beamsift: wrote {n} rows to {}", p.display());
            n
        }
        None => {
            let stdout = std::io::stdout();
            let mut lock = std::io::BufWriter::new(stdout.lock());
            generate::generate(&spec, &a.currency, "standard output", &mut lock)?
        }
    };
    if n == 0 {
        eprintln!("beamsift: warning: no combination satisfied the rules");
    }
    Ok(0)
}
