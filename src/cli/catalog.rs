//! `beamsift catalog validate|show`.

use super::Out;
use super::output::emit;
use beamsift::catalog::Materials;
use beamsift::catalog::read::{self, ReadOptions};
use beamsift::check::Material;
use beamsift::error::{Error, Result};
use beamsift::job;
use beamsift::report::catalog::{ValidateResult, show_document, validate_document};
use beamsift::report::{self, Format};
use beamsift::units::{self, Dim};
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
    #[arg(long = "E", default_value = "200GPa")]
    pub e: String,
    /// Steel density for the mass column (welded-i).
    #[arg(long, default_value = "7850kg/m3")]
    pub density: String,
    /// Price per kg of steel for the cost column (welded-i).
    #[arg(long = "price-per-kg")]
    pub price_per_kg: Option<f64>,
    /// Currency named in the cost column header.
    #[arg(long, default_value = "EUR")]
    pub currency: String,
}

/// A list "6,8,10mm" or a range "150..400:10mm".
fn sizes(text: &Option<String>, name: &str) -> Result<Vec<f64>> {
    let t = text
        .as_deref()
        .ok_or_else(|| Error::msg(format!("--{name} is required for this family")))?;
    if let Some((range, step)) = t.split_once(':')
        && let Some((a, b)) = range.split_once("..")
    {
        let unit: String = step
            .trim_start_matches(|c: char| c.is_ascii_digit() || c == '.')
            .to_string();
        let p = |v: &str| {
            let v = v.trim();
            let v = if v.chars().last().is_some_and(|c| c.is_ascii_digit()) {
                format!("{v}{unit}")
            } else {
                v.to_string()
            };
            units::parse(&v, Dim::Length).map_err(|e| e.in_field(&format!("--{name}")))
        };
        let (lo, hi, st) = (p(a)?, p(b)?, p(step)?);
        if !(st > 0.0 && hi >= lo) {
            return Err(Error::msg(format!(
                "--{name}: expected START..END:STEP with END ≥ START and STEP > 0"
            )));
        }
        let n = ((hi - lo) / st + 1e-9).floor();
        if n >= MAX_SIZES as f64 {
            return Err(Error::msg(format!(
                "--{name}: the range gives more than the {} values one list may give: use a coarser step",
                units::count(MAX_SIZES as u64)
            )));
        }
        let v: Vec<f64> = (0..=n as usize).map(|k| lo + k as f64 * st).collect();
        check_sizes(&v, name)?;
        return Ok(v);
    }
    let v = units::parse_list(t, Dim::Length, &format!("--{name}"))?;
    check_sizes(&v, name)?;
    Ok(v)
}

/// Grade names are plain CSV cells, given once each, with positive rates.
fn check_grades(g: Vec<(String, Option<f64>)>) -> Result<Vec<(String, Option<f64>)>> {
    for (k, (name, rate)) in g.iter().enumerate() {
        if name.is_empty() || name.chars().any(|c| c == '"' || c == ';' || c.is_control()) {
            return Err(Error::msg(format!(
                "grade {} '{name}': expected a non-empty name without quotes, semicolons or control characters",
                k + 1
            )));
        }
        if g[..k].iter().any(|o| o.0 == *name) {
            return Err(Error::msg(format!("grade '{name}' is given twice")));
        }
        if let Some(r) = rate
            && !(*r > 0.0 && *r < 1e7)
        {
            return Err(Error::msg(format!(
                "grade '{name}': price {r} per m³ is outside 0 < price < 10,000,000"
            )));
        }
    }
    Ok(g)
}

/// Most values one size list may give.
const MAX_SIZES: usize = 100_000;

fn check_sizes(v: &[f64], name: &str) -> Result<()> {
    if v.len() > MAX_SIZES {
        return Err(Error::msg(format!(
            "--{name}: {} values, more than the {} one list may give: use a coarser step",
            units::count(v.len() as u64),
            units::count(MAX_SIZES as u64)
        )));
    }
    let mut sorted = v.to_vec();
    sorted.sort_by(f64::total_cmp);
    if let Some(w) = sorted.windows(2).find(|w| w[0] == w[1]) {
        return Err(Error::msg(format!(
            "--{name}: {} mm is given twice (the rows would repeat a name)",
            w[0]
        )));
    }
    if let Some(x) = v.iter().find(|x| !(**x > 0.0 && **x <= 10_000.0)) {
        return Err(Error::msg(format!(
            "--{name}: {x} mm is outside 0 < size ≤ 10 m"
        )));
    }
    Ok(())
}

#[derive(clap::Args, Debug)]
pub struct FileArgs {
    /// Catalogue CSV file ('-' for standard input).
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
    let delim = if a.delimiter == "tab" {
        b'\t'
    } else {
        *a.delimiter.as_bytes().first().unwrap_or(&b',')
    };
    read::open(
        input.reader()?,
        &input.shown,
        &ReadOptions { delimiter: delim },
    )
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
            emit(out, &report::render(out.format, &result, &doc))?;
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
            emit(out, &report::render(out.format, &result, &doc))?;
            Ok(if result.problems.is_empty() { 0 } else { 2 })
        }
    }
}

fn generate(a: GenerateArgs, out: &Out) -> Result<i32> {
    use beamsift::catalog::generate::{self, Spec};
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
    let family = beamsift::section::spec::normalise_family(&a.family);
    let foreign: &[(&str, bool)] = match family.as_str() {
        "welded-i" => &[
            ("--b", a.b.is_some()),
            ("--d", a.d.is_some()),
            ("--grades", a.grades.is_some()),
            ("--max-aspect", a.max_aspect.is_some()),
        ],
        "rect" => &[
            ("--bf", a.bf.is_some()),
            ("--tf", a.tf.is_some()),
            ("--hw", a.hw.is_some()),
            ("--tw", a.tw.is_some()),
            ("--lambda-f", a.lambda_f.is_some()),
            ("--lambda-w", a.lambda_w.is_some()),
            ("--Fy", a.fy.is_some()),
            ("--E", a.e != "200GPa"),
            ("--density", a.density != "7850kg/m3"),
            ("--price-per-kg", a.price_per_kg.is_some()),
        ],
        _ => &[],
    };
    let unused: Vec<&str> = foreign.iter().filter(|f| f.1).map(|f| f.0).collect();
    if !unused.is_empty() {
        return Err(Error::msg(format!(
            "{} {} not apply to the {family} family (nothing would use {})",
            unused.join(", "),
            if unused.len() == 1 { "does" } else { "do" },
            if unused.len() == 1 { "it" } else { "them" }
        )));
    }
    for (name, v) in [
        ("--max-aspect", a.max_aspect),
        ("--lambda-f", a.lambda_f),
        ("--lambda-w", a.lambda_w),
    ] {
        if let Some(v) = v
            && !(v > 0.0 && v <= 1000.0)
        {
            return Err(Error::msg(format!(
                "{name}: {v} is outside 0 < value ≤ 1000"
            )));
        }
    }
    if let Some(p) = a.price_per_kg
        && !(p > 0.0 && p < 1e6)
    {
        return Err(Error::msg(format!(
            "--price-per-kg: {p} is outside 0 < price < 1,000,000"
        )));
    }
    let spec = match family.as_str() {
        "welded-i" => {
            let e = units::parse(&a.e, Dim::Stress).map_err(|e| e.in_field("--E"))?;
            let fy =
                a.fy.as_deref()
                    .map(|t| units::parse(t, Dim::Stress).map_err(|e| e.in_field("--Fy")))
                    .transpose()?;
            let (df, dw) = fy
                .map(|fy| {
                    beamsift::optimise::compact_slenderness(
                        beamsift::optimise::Family::WeldedI,
                        e,
                        fy,
                    )
                })
                .unwrap_or((None, None));
            Spec::WeldedI {
                bf: sizes(&a.bf, "bf")?,
                tf: sizes(&a.tf, "tf")?,
                hw: sizes(&a.hw, "hw")?,
                tw: sizes(&a.tw, "tw")?,
                lambda_f: a.lambda_f.or(df),
                lambda_w: a.lambda_w.or(dw),
                density: units::parse(&a.density, Dim::Density)
                    .map_err(|e| e.in_field("--density"))?,
                price_per_kg: a.price_per_kg,
            }
        }
        "rect" => {
            let grades = match &a.grades {
                Some(g) => g
                    .split(',')
                    .map(|p| match p.split_once('=') {
                        Some((n, r)) => {
                            units::parse_number(r).map(|r| (n.trim().to_string(), Some(r)))
                        }
                        None => Ok((p.trim().to_string(), None)),
                    })
                    .collect::<Result<Vec<_>>>()
                    .and_then(check_grades)
                    .map_err(|e| e.in_field("--grades"))?,
                None => vec![(String::new(), None)],
            };
            Spec::Rect {
                b: sizes(&a.b, "b")?,
                d: sizes(&a.d, "d")?,
                grades,
                max_aspect: a.max_aspect,
            }
        }
        other => {
            return Err(Error::msg(format!(
                "catalog generate: '{other}' is not supported: expected welded-i or rect"
            )));
        }
    };
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
