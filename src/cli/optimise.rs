//! `beamsift optimise`: the best proportions of a rectangle, welded I,
//! mono-symmetric I or hollow section, continuous and on fabrication sizes.

use super::Out;
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::optimise::discrete::GridOptions;
use beamsift::optimise::{self, Axis, Family, Objective, Problem, StudyOptions};
use beamsift::report;
use beamsift::report::optimise::{LimitSource, document};
use beamsift::units::{self, Dim};

pub const EXAMPLES: &str = "Examples:
  beamsift optimise --job catalogs/demo-joists.toml rect --aspect 4 --b-sizes 38,47,63,75mm --d-sizes 100,125,150,175,200,225,250,300mm
  beamsift optimise --job catalogs/demo-job.toml welded-i --max-depth 450mm
  beamsift optimise --job job.toml welded-i --bound hw=300mm..900mm --plates 8,10,12,15,20,25mm --objective cost \\
      --plate-prices 1.35,1.30,1.25,1.22,1.20,1.20

Bounds default to: rect b 38–300, d 75–1200 mm; welded-i bf 100–600, tf 6–50, hw 150–2000,
tw 5–30 mm; mono-i the same for each flange; rhs b 50–400, h 50–600, t 3–20 mm.";

#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
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

/// Options that do not apply to the chosen family (or objective) are
/// refused, never ignored.
fn refuse_inapplicable(a: &Args) -> Result<()> {
    let fam = a.family;
    let mut bad = Vec::new();
    let limits = fam.kind().limits();
    let plated = fam.kind().axes().contains(&Axis::Thickness);
    if a.aspect.is_some() && !limits.aspect {
        bad.push("--aspect (rectangles only)");
    }
    if (a.b_sizes.is_some() || a.d_sizes.is_some()) && plated {
        bad.push("--b-sizes/--d-sizes (rectangles only)");
    }
    if a.plates.is_some() && !plated {
        bad.push("--plates (a rectangle has no plate thickness: use --b-sizes/--d-sizes)");
    }
    if a.lambda_f.is_some() && !limits.flange {
        bad.push("--lambda-f (I-shapes only)");
    }
    if a.lambda_w.is_some() && !limits.web {
        bad.push("--lambda-w (I-shapes and rhs only)");
    }
    if a.compact && !plated {
        bad.push("--compact (a solid rectangle has no slender plates)");
    }
    if a.plate_prices.is_some() && a.objective != Objective::Cost {
        bad.push("--plate-prices (only used with --objective cost)");
    }
    if a.step.is_some() && !plated && a.b_sizes.is_some() && a.d_sizes.is_some() {
        bad.push("--step (both --b-sizes and --d-sizes are given)");
    }
    if bad.is_empty() {
        Ok(())
    } else {
        Err(Error::msg(format!(
            "these options do not apply to optimising a {}: {}",
            fam.variables().join("/"),
            bad.join("; ")
        )))
    }
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    refuse_inapplicable(&a)?;
    let job = a.job.load()?;
    let sys = out.units;
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone())?;
    let fam = a.family;
    let vars = fam.variables();
    let mut bounds = fam.default_bounds();
    for b in &a.bounds {
        let (name, range) = b.split_once('=').ok_or_else(|| {
            Error::msg(format!(
                "--bound '{b}': expected NAME=LOW..HIGH, e.g. hw=300mm..900mm"
            ))
        })?;
        let i = vars.iter().position(|v| *v == name.trim()).ok_or_else(|| {
            Error::msg(format!(
                "--bound: '{name}' is not a variable of {fam:?}: expected one of {}",
                vars.join(", ")
            ))
        })?;
        let (lo, hi) = range
            .split_once("..")
            .ok_or_else(|| Error::msg(format!("--bound '{b}': expected LOW..HIGH with units")))?;
        bounds[i] = (
            units::parse(lo, Dim::Length).map_err(|e| e.in_field("--bound"))?,
            units::parse(hi, Dim::Length).map_err(|e| e.in_field("--bound"))?,
        );
    }
    let len = |v: &Option<String>, n: &str| -> Result<Option<f64>> {
        v.as_deref()
            .map(|t| units::parse(t, Dim::Length).map_err(|e| e.in_field(n)))
            .transpose()
    };
    let (df, dw) = match job.material.fy {
        Some(fy) if a.compact => optimise::compact_slenderness(fam, job.material.e, fy),
        Some(fy) => optimise::default_slenderness(fam, job.material.e, fy),
        None => (None, None),
    };
    let plates = units::parse_list(
        a.plates
            .as_deref()
            .unwrap_or("6,8,10,12,15,20,25,30,35,40,45,50mm"),
        Dim::Length,
        "--plates",
    )?;
    let plate_prices = match &a.plate_prices {
        Some(t) => {
            let prices: Vec<f64> = t
                .split(',')
                .map(|p| units::parse_number(p).map_err(|e| e.in_field("--plate-prices")))
                .collect::<Result<_>>()?;
            if prices.len() != plates.len() {
                return Err(Error::msg(format!(
                    "--plate-prices has {} values but --plates has {}: give one price per kg for each thickness",
                    prices.len(),
                    plates.len()
                )));
            }
            plates.iter().copied().zip(prices).collect()
        }
        None => Vec::new(),
    };
    let prob = Problem {
        family: fam,
        bounds,
        max_depth: len(&a.max_depth, "--max-depth")?,
        min_depth: len(&a.min_depth, "--min-depth")?,
        aspect: a.aspect,
        lambda_f: a.lambda_f.or(df),
        lambda_w: a.lambda_w.or(dw),
        objective: a.objective,
        plate_prices,
    };
    if !(1..=64).contains(&a.starts) {
        return Err(Error::msg(format!(
            "--starts {}: expected 1 to 64 starting points",
            a.starts
        )));
    }
    // Fabrication grid: a step from 0.1 mm (no stock is finer) to 1 m.
    let step = units::parse(a.step.as_deref().unwrap_or("10mm"), Dim::Length)
        .map_err(|e| e.in_field("--step"))?;
    if !(0.1..=1000.0).contains(&step) {
        return Err(Error::msg(format!(
            "{} mm: expected a step from 0.1 mm to 1 m",
            units::fmt_num(step)
        ))
        .in_field("--step"));
    }
    for (name, list) in [("--plates", &plates)] {
        if let Some(t) = list.iter().find(|t| !(**t > 0.0 && **t <= 1000.0)) {
            return Err(Error::msg(format!(
                "{} mm: expected thicknesses above 0 and up to 1 m",
                units::fmt_num(*t)
            ))
            .in_field(name));
        }
    }
    prob.validate()?;
    let list = |v: &Option<String>, n: &str| -> Result<Option<Vec<f64>>> {
        v.as_deref()
            .map(|t| units::parse_list(t, Dim::Length, n))
            .transpose()
    };
    let opts = StudyOptions {
        starts: a.starts,
        grid: GridOptions {
            plates,
            step,
            widths: list(&a.b_sizes, "--b-sizes")?,
            depths: list(&a.d_sizes, "--d-sizes")?,
        },
        units: sys,
    };
    let result = optimise::study(&job.title, &prob, &prep, &opts)?;
    let source = LimitSource {
        flange_given: a.lambda_f.is_some(),
        web_given: a.lambda_w.is_some(),
        compact: a.compact,
        yield_stress_known: job.material.fy.is_some(),
    };
    let doc = document(&result, &source, sys);
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}
