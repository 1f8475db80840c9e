//! `beamsift optimise`: the best proportions of a rectangle, welded I,
//! mono-symmetric I or hollow section, continuous and on fabrication sizes.

use super::Out;
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::check::{Prepared, SectionInput};
use beamsift::error::{Error, Result};
use beamsift::optimise::discrete::{self, Grid};
use beamsift::optimise::{self, Constraint, Family, Objective, Optimum, Problem};
use beamsift::report::{self, Align, Document, Table, member};
use beamsift::units::{self, Dim, Show};
use serde::Serialize;

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
    #[arg(value_enum)]
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
    #[arg(long, value_enum, default_value_t = Objective::Area)]
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

pub fn default_bounds_for(f: Family) -> Vec<(f64, f64)> {
    match f {
        Family::Rect => vec![(38.0, 300.0), (75.0, 1200.0)],
        Family::WeldedI => vec![(100.0, 600.0), (6.0, 50.0), (150.0, 2000.0), (5.0, 30.0)],
        Family::MonoI => vec![
            (100.0, 600.0),
            (6.0, 50.0),
            (100.0, 600.0),
            (6.0, 50.0),
            (150.0, 2000.0),
            (5.0, 30.0),
        ],
        Family::Rhs => vec![(50.0, 400.0), (50.0, 600.0), (3.0, 20.0)],
    }
}

#[derive(Serialize)]
struct Variant {
    x: Vec<(String, f64)>,
    description: String,
    area: f64,
    /// kg/m.
    mass: f64,
    /// Cost per mm (objective cost only).
    cost: Option<f64>,
    utilisation: f64,
    governing: Option<String>,
    by_check: Vec<(String, f64)>,
}

#[derive(Serialize)]
struct Sensitivity {
    constraint: String,
    change: String,
    /// Change of the objective (area mm², cost, or depth mm); negative saves.
    delta: f64,
    words: String,
}

#[derive(Serialize)]
struct OptimiseResult {
    title: String,
    problem: Problem,
    continuous: Variant,
    discrete: Variant,
    /// (discrete − continuous) / continuous objective.
    gap: f64,
    active: Vec<String>,
    sensitivities: Vec<Sensitivity>,
    evaluations: u64,
    grid_points_checked: u64,
    whole_grid: bool,
    /// Windowed search only: the bound on its gap to the grid optimum.
    gap_bound: Option<f64>,
    not_checked: Vec<String>,
    excluded: Vec<String>,
    assumptions: Vec<String>,
    caution: &'static str,
}

fn variant(prob: &Problem, prep: &Prepared, x: &[f64], sys: units::System) -> Variant {
    let shape = prob.family.shape(x);
    let p = shape.properties().ok();
    let mass = p
        .as_ref()
        .map(|p| p.mass_per_length(prep.material.density))
        .unwrap_or(0.0);
    let (util, gov, by_check) = match &p {
        Some(p) => {
            let s = prep.check(SectionInput::new(p, mass));
            let mut by: Vec<(String, f64)> = Vec::new();
            prep.visit(
                SectionInput::new(p, mass),
                &mut |it: beamsift::check::Item| {
                    let k = match it.kind.group() {
                        beamsift::check::Group::Bending => "bending",
                        beamsift::check::Group::Shear => "shear",
                        beamsift::check::Group::LocalBuckling => "local buckling",
                        beamsift::check::Group::LateralTorsional => "lateral-torsional buckling",
                        beamsift::check::Group::Deflection => "deflection",
                    }
                    .to_string();
                    match by.iter_mut().find(|(n, _)| *n == k) {
                        Some(e) => e.1 = e.1.max(it.utilisation),
                        None => by.push((k, it.utilisation)),
                    }
                },
            );
            (
                s.utilisation,
                s.governing
                    .map(|g| member::line(prep, SectionInput::new(p, mass), &g))
                    .map(|l| format!("{} under {}", l.label, l.combination)),
                by,
            )
        }
        None => (f64::NAN, None, Vec::new()),
    };
    Variant {
        x: prob
            .family
            .variables()
            .iter()
            .map(|v| v.to_string())
            .zip(x.iter().copied())
            .collect(),
        description: shape.describe(sys),
        area: p.as_ref().map(|p| p.area).unwrap_or(f64::NAN),
        mass,
        cost: (prob.objective == Objective::Cost).then(|| prob.cost_of(x, prep.material.density)),
        utilisation: util,
        governing: gov,
        by_check,
    }
}

fn objective_words(o: Objective) -> &'static str {
    match o {
        Objective::Area => "area",
        Objective::Cost => "cost",
        Objective::Depth => "depth",
    }
}

/// Relax each active, adjustable constraint a little, re-optimise, and say
/// what it buys.
fn sensitivities(
    prob: &Problem,
    prep: &Prepared,
    best: &Optimum,
    sys: units::System,
) -> Vec<Sensitivity> {
    let vars = prob.family.variables();
    let mut out = Vec::new();
    let base = best.objective;
    let unit = match prob.objective {
        Objective::Area => Show::Area.label(sys).to_string(),
        Objective::Cost => "per mm".to_string(),
        Objective::Depth => Show::Dimension.label(sys).to_string(),
    };
    let fmt_delta = |d: f64| -> String {
        match prob.objective {
            Objective::Area => Show::Area.num(-d, sys),
            Objective::Depth => Show::Dimension.num(-d, sys),
            Objective::Cost => format!("{:.4}", -d * 1000.0),
        }
    };
    for (c, g) in &best.constraints {
        if *g < -2e-3 {
            continue;
        }
        let (change, p2, prep2): (String, Problem, Option<Prepared>) = match c {
            Constraint::MaxDepth => {
                let mut p = prob.clone();
                let d = prob.max_depth.unwrap_or(0.0);
                p.max_depth = Some(d + 10.0);
                (
                    format!("allowing {} more depth", Show::Dimension.fmt(10.0, sys)),
                    p,
                    None,
                )
            }
            Constraint::Aspect => {
                let mut p = prob.clone();
                p.aspect = prob.aspect.map(|k| k + 0.5);
                ("allowing d/b half a unit larger".into(), p, None)
            }
            Constraint::FlangeSlenderness => {
                let mut p = prob.clone();
                p.lambda_f = prob.lambda_f.map(|l| l * 1.1);
                ("a flange slenderness limit 10 % higher".into(), p, None)
            }
            Constraint::WebSlenderness | Constraint::WallSlenderness => {
                let mut p = prob.clone();
                p.lambda_w = prob.lambda_w.map(|l| l * 1.1);
                ("a web slenderness limit 10 % higher".into(), p, None)
            }
            Constraint::Lower(i) => {
                let mut p = prob.clone();
                p.bounds[*i].0 *= 0.9;
                (format!("a lower bound on {} 10 % lower", vars[*i]), p, None)
            }
            Constraint::Upper(i) => {
                let mut p = prob.clone();
                p.bounds[*i].1 *= 1.1;
                (
                    format!("an upper bound on {} 10 % higher", vars[*i]),
                    p,
                    None,
                )
            }
            Constraint::Bending
            | Constraint::Shear
            | Constraint::LocalBuckling
            | Constraint::LateralTorsional => {
                let mut m = prep.material.clone();
                m.fb_tension = m.fb_tension.map(|v| v * 1.05);
                m.fb_compression = m.fb_compression.map(|v| v * 1.05);
                m.fv = m.fv.map(|v| v * 1.05);
                m.fy = m.fy.map(|v| v * 1.05);
                let text = format!(
                    "allowable stresses 5 % higher ({} governs)",
                    c.describe(vars)
                );
                (text, prob.clone(), Prepared::new_from(prep, m))
            }
            Constraint::Deflection => {
                // δ ∝ 1/E: a limit 10 % looser is exactly E 10 % higher for
                // the deflection checks.
                let mut m = prep.material.clone();
                m.e *= 1.1;
                let mut p2 = prep.clone();
                p2.material = m;
                // Keep the stress checks as they were: only deflection uses E
                // (and lateral buckling, which E also helps: slight overestimate).
                (
                    "deflection limits 10 % looser".into(),
                    prob.clone(),
                    Some(p2),
                )
            }
            _ => continue,
        };
        let prep_used = prep2.as_ref().unwrap_or(prep);
        if let Some(o) = optimise::continuous_from(&p2, prep_used, &best.x) {
            let delta = o.objective - base;
            let words = if delta < -1e-9 * base.abs() {
                format!(
                    "{change} saves about {} {unit} of {}",
                    fmt_delta(delta),
                    objective_words(prob.objective)
                )
            } else {
                format!("{change} saves nothing measurable")
            };
            out.push(Sensitivity {
                constraint: c.describe(vars),
                change,
                delta,
                words,
            });
        }
    }
    out
}

/// Options that do not apply to the chosen family (or objective) are
/// refused, never ignored.
fn refuse_inapplicable(a: &Args) -> Result<()> {
    let fam = a.family;
    let mut bad = Vec::new();
    let rect = fam == Family::Rect;
    let i_shape = matches!(fam, Family::WeldedI | Family::MonoI);
    if a.aspect.is_some() && !rect {
        bad.push("--aspect (rectangles only)");
    }
    if (a.b_sizes.is_some() || a.d_sizes.is_some()) && !rect {
        bad.push("--b-sizes/--d-sizes (rectangles only)");
    }
    if a.plates.is_some() && rect {
        bad.push("--plates (a rectangle has no plate thickness: use --b-sizes/--d-sizes)");
    }
    if a.lambda_f.is_some() && !i_shape {
        bad.push("--lambda-f (I-shapes only)");
    }
    if a.lambda_w.is_some() && rect {
        bad.push("--lambda-w (I-shapes and rhs only)");
    }
    if a.compact && rect {
        bad.push("--compact (a solid rectangle has no slender plates)");
    }
    if a.plate_prices.is_some() && a.objective != Objective::Cost {
        bad.push("--plate-prices (only used with --objective cost)");
    }
    if a.step.is_some() && rect && a.b_sizes.is_some() && a.d_sizes.is_some() {
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
    let mut bounds = default_bounds_for(fam);
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
    let mut notes = Vec::new();
    if job.material.fy.is_none()
        && matches!(fam, Family::WeldedI | Family::MonoI | Family::Rhs)
        && (a.lambda_f.is_none() || a.lambda_w.is_none())
    {
        notes.push("no yield stress Fy in the job: no default slenderness limits were applied (give --lambda-f and --lambda-w)".to_string());
    }
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
    let cont = optimise::continuous(&prob, &prep, a.starts)?;
    let mut values = Vec::new();
    for (i, &(lo, hi)) in prob.bounds.iter().enumerate() {
        let v = if fam == Family::Rect && i == 0 && a.b_sizes.is_some() {
            Grid::listed(
                lo,
                hi,
                &units::parse_list(a.b_sizes.as_deref().unwrap_or(""), Dim::Length, "--b-sizes")?,
            )
        } else if fam == Family::Rect && i == 1 && a.d_sizes.is_some() {
            Grid::listed(
                lo,
                hi,
                &units::parse_list(a.d_sizes.as_deref().unwrap_or(""), Dim::Length, "--d-sizes")?,
            )
        } else if fam.is_thickness(i) {
            Grid::listed(lo, hi, &plates)
        } else {
            Grid::stepped(lo, hi, step)
        };
        if v.is_empty() {
            return Err(Error::msg(format!(
                "no fabrication size of {} lies within its bounds {}–{} mm",
                vars[i],
                units::fmt_num(lo),
                units::fmt_num(hi)
            )));
        }
        values.push(v);
    }
    let grid = Grid { values };
    let disc = discrete::search(&prob, &prep, &grid, &cont.x, discrete::EXHAUSTIVE_POINTS)?;
    let c_var = variant(&prob, &prep, &cont.x, sys);
    let d_var = variant(&prob, &prep, &disc.x, sys);
    let gap = (disc.objective - cont.objective) / cont.objective;
    let active: Vec<String> = cont
        .constraints
        .iter()
        .filter(|(_, g)| *g > -2e-3)
        .map(|(c, _)| c.describe(vars))
        .collect();
    let sens = sensitivities(&prob, &prep, &cont, sys);
    let d_props = prob.family.shape(&disc.x).properties()?;
    let result = OptimiseResult {
        title: job.title.clone(),
        problem: prob.clone(),
        continuous: c_var,
        discrete: d_var,
        gap,
        active: active.clone(),
        sensitivities: sens,
        evaluations: cont.evaluations,
        grid_points_checked: disc.evaluated,
        whole_grid: disc.whole_grid,
        gap_bound: disc.gap_bound,
        not_checked: prep.not_checked(&d_props, None),
        excluded: prep.criteria.exclude.list(),
        assumptions: prep.assumptions(),
        caution: report::CAUTION,
    };
    // Document.
    let mut doc = Document::new(
        format!("Optimised {fam:?} for {}", job.title)
            .replace("WeldedI", "welded I")
            .replace("MonoI", "mono-symmetric I")
            .replace("Rect", "rectangle")
            .replace("Rhs", "hollow section"),
    );
    let mut pt = Table::new("Problem", &[("Item", Align::Left), ("Value", Align::Left)]);
    pt.row(vec![
        "Minimise".into(),
        objective_words(prob.objective).into(),
    ]);
    for (v, (lo, hi)) in vars.iter().zip(&prob.bounds) {
        pt.row(vec![
            format!("Bounds on {v}"),
            format!(
                "{} to {}",
                Show::Dimension.fmt(*lo, sys),
                Show::Dimension.fmt(*hi, sys)
            ),
        ]);
    }
    if let Some(d) = prob.max_depth {
        pt.row(vec!["Maximum depth".into(), Show::Dimension.fmt(d, sys)]);
    }
    if let Some(d) = prob.min_depth {
        pt.row(vec!["Minimum depth".into(), Show::Dimension.fmt(d, sys)]);
    }
    if let Some(k) = prob.aspect {
        pt.row(vec!["Largest d/b".into(), units::fmt_num(k)]);
    }
    if let Some(l) = prob.lambda_f {
        pt.row(vec![
            "Flange limit bf/(2·tf)".into(),
            format!(
                "{l:.2}{}",
                if a.lambda_f.is_some() {
                    " (as given)"
                } else if a.compact {
                    " (compact, AISC 360-16 Table B4.1b λp = 0.38√(E/Fy))"
                } else {
                    ""
                }
            ),
        ]);
    }
    if let Some(l) = prob.lambda_w {
        pt.row(vec![
            if fam == Family::Rhs {
                "Wall limit (b − 2t)/t".into()
            } else {
                "Web limit hw/tw".to_string()
            },
            format!(
                "{l:.2}{}",
                if a.lambda_w.is_some() {
                    " (as given)"
                } else if a.compact {
                    " (compact, AISC 360-16 Table B4.1b λp)"
                } else if fam == Family::Rhs {
                    " (5.70√(E/Fy): the webs AISC 360-16 F7 covers here)"
                } else {
                    " (AISC 360-16 F13.2, unstiffened web: min(0.40·E/Fy, 260))"
                }
            ),
        ]);
    }
    doc.table(pt);
    let mut t = Table::new(
        "Optima",
        &[
            ("", Align::Left),
            ("Continuous", Align::Right),
            ("Fabrication sizes", Align::Right),
        ],
    );
    for (i, v) in vars.iter().enumerate() {
        t.row(vec![
            format!("{v} [{}]", Show::Dimension.label(sys)),
            Show::Dimension.fixed(result.continuous.x[i].1, sys, 1),
            Show::Dimension.num(result.discrete.x[i].1, sys),
        ]);
    }
    t.row(vec![
        format!("Area [{}]", Show::Area.label(sys)),
        Show::Area.num(result.continuous.area, sys),
        Show::Area.num(result.discrete.area, sys),
    ]);
    t.row(vec![
        format!("Mass [{}]", Show::Mass.label(sys)),
        Show::Mass.fixed(result.continuous.mass, sys, 2),
        Show::Mass.fixed(result.discrete.mass, sys, 2),
    ]);
    if let (Some(c), Some(d)) = (result.continuous.cost, result.discrete.cost) {
        t.row(vec![
            "Cost [per m]".into(),
            format!("{:.2}", c * 1000.0),
            format!("{:.2}", d * 1000.0),
        ]);
    }
    let mut names: Vec<String> = result
        .continuous
        .by_check
        .iter()
        .map(|(k, _)| k.clone())
        .collect();
    for (k, _) in &result.discrete.by_check {
        if !names.contains(k) {
            names.push(k.clone());
        }
    }
    for k in names {
        let get = |v: &Variant| {
            v.by_check
                .iter()
                .find(|(n, _)| *n == k)
                .map(|(_, u)| format!("{u:.3}"))
                .unwrap_or_default()
        };
        t.row(vec![
            format!("Utilisation, {k}"),
            get(&result.continuous),
            get(&result.discrete),
        ]);
    }
    doc.table(t);
    doc.para(format!(
        "Fabrication sizes: {} — {}; it is {:.1} % above the continuous optimum in {}. Governing: {}.",
        result.discrete.description,
        if disc.whole_grid {
            format!(
                "the optimum of all {} grid points (visited in order of {}; {} checked before the first that passes)",
                beamsift::units::count(grid.size()),
                objective_words(prob.objective),
                beamsift::units::count(disc.evaluated)
            )
        } else {
            format!(
                "the best of {} grid points searched — the whole of a coarser sub-grid of it, then a window around the continuous optimum (the grid has {}, more than the {} searched exhaustively: at most {:.1} % above the grid optimum)",
                beamsift::units::count(disc.evaluated),
                beamsift::units::count(grid.size()),
                beamsift::units::count(discrete::EXHAUSTIVE_POINTS as u64),
                100.0 * disc.gap_bound.unwrap_or(f64::NAN)
            )
        },
        100.0 * gap,
        objective_words(prob.objective),
        result.discrete.governing.clone().unwrap_or_default()
    ));
    if !active.is_empty() {
        doc.list(
            "Active (binding) constraints at the continuous optimum:",
            active,
        );
    }
    if !result.sensitivities.is_empty() {
        doc.list(
            "What the binding limits cost (re-optimised):",
            result
                .sensitivities
                .iter()
                .map(|s| s.words.clone())
                .collect(),
        );
    }
    doc.excluded(result.excluded.clone());
    doc.assumptions(result.assumptions.clone());
    if !notes.is_empty() {
        doc.list("Notes:", notes);
    }
    let mut nc = result.not_checked.clone();
    nc.push("welds between plates, stiffeners, and local buckling beyond the slenderness limits stated above".into());
    doc.caution(nc);
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}
