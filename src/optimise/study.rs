//! A whole optimisation study, as `beamsift optimise` reports it: the
//! continuous optimum, the best section on fabrication sizes, what governs
//! each, which constraints bind and what relaxing each of them buys
//! (re-optimised). Every number a table, the JSON or any other front end
//! shows is a field of [`Study`]; renderers compute nothing.

use super::discrete::{self, Grid, GridOptions};
use super::{Constraint, Objective, Optimum, Problem};
use crate::check::{Group, Item, Prepared, SectionInput};
use crate::error::Result;
use crate::member;
use crate::units::{Show, System};
use serde::Serialize;

/// How to run a study.
#[derive(Clone, Debug)]
pub struct StudyOptions {
    /// Starting points of the continuous search (1 to 64).
    pub starts: usize,
    /// The fabrication sizes.
    pub grid: GridOptions,
    /// Units of the words (descriptions, sensitivities).
    pub units: System,
}

/// One section of the study (the continuous optimum or the fabrication
/// sizes) and what its check says.
#[derive(Clone, Debug, Serialize)]
pub struct Variant {
    /// (variable name, value mm), in the order of the family's variables.
    pub x: Vec<(String, f64)>,
    /// The section in words, in the study's units.
    pub description: String,
    /// Cross-sectional area, mm² (NaN for an impossible shape).
    pub area: f64,
    /// Mass per length, kg/m.
    pub mass: f64,
    /// Cost per mm of length, in the currency of the plate prices
    /// (objective cost only).
    pub cost: Option<f64>,
    /// Largest utilisation of every check (NaN for an impossible shape).
    pub utilisation: f64,
    /// The governing line and its combination, in words.
    pub governing: Option<String>,
    /// Largest utilisation by group of checks ("bending", "shear", "local
    /// buckling", "lateral-torsional buckling", "deflection"), in the order
    /// first met.
    pub by_check: Vec<(String, f64)>,
}

/// What relaxing one binding constraint buys, re-optimised.
#[derive(Clone, Debug, Serialize)]
pub struct Sensitivity {
    /// The constraint relaxed, in words.
    pub constraint: String,
    /// How it was relaxed, in words.
    pub change: String,
    /// Change of the objective (area mm², cost per mm, or depth mm);
    /// negative saves.
    pub delta: f64,
    /// The sentence a report shows, in the study's units.
    pub words: String,
}

/// The result of [`study`].
#[derive(Clone, Debug, Serialize)]
pub struct Study {
    /// The job's title.
    pub title: String,
    /// The problem solved (bounds mm).
    pub problem: Problem,
    /// The continuous optimum.
    pub continuous: Variant,
    /// The best section on the fabrication grid.
    pub discrete: Variant,
    /// (discrete − continuous) / continuous objective.
    pub gap: f64,
    /// Constraints active (binding) at the continuous optimum, in words.
    pub active: Vec<String>,
    /// What relaxing each active, adjustable constraint buys.
    pub sensitivities: Vec<Sensitivity>,
    /// Objective evaluations of the continuous search.
    pub evaluations: u64,
    /// Grid points checked by the discrete search.
    pub grid_points_checked: u64,
    /// True when the fabrication sizes are the optimum of the whole grid.
    pub whole_grid: bool,
    /// Windowed search only: the bound on its gap to the grid optimum (a
    /// fraction).
    pub gap_bound: Option<f64>,
    /// Points of the fabrication grid (not serialised: the JSON format
    /// predates it).
    #[serde(skip)]
    pub grid_points: u128,
    /// Limit states not checked for the fabrication sizes.
    pub not_checked: Vec<String>,
    /// Limit states excluded by the user.
    pub excluded: Vec<String>,
    /// Assumptions of the checks.
    pub assumptions: Vec<String>,
    /// A catalogue row set beside the result (`--section NAME -c FILE`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reference: Option<Reference>,
    pub caution: &'static str,
}

/// A catalogue row checked against the same job, set beside the
/// fabrication sizes: what the optimum saves (or costs) against it.
#[derive(Clone, Debug, Serialize)]
pub struct Reference {
    pub name: String,
    /// mm².
    pub area: f64,
    /// kg/m.
    pub mass: f64,
    /// mm.
    pub depth: f64,
    pub utilisation: f64,
    pub verdict: crate::check::Verdict,
    /// The governing check, in words.
    pub governing: Option<String>,
    /// (fabrication sizes − row) / row, of mass and of area: negative saves.
    pub mass_change: f64,
    pub area_change: f64,
}

impl Objective {
    /// The objective as a noun ("area", "cost", "depth").
    pub fn noun(self) -> &'static str {
        match self {
            Objective::Area => "area",
            Objective::Cost => "cost",
            Objective::Depth => "depth",
        }
    }
}

/// Optimise `prob` on the prepared demand: the continuous optimum from
/// `opts.starts` starts, the best point of the fabrication grid, both
/// checked, the active constraints and their sensitivities.
pub fn study(title: &str, prob: &Problem, prep: &Prepared, opts: &StudyOptions) -> Result<Study> {
    let sys = opts.units;
    let vars = prob.family.variables();
    let cont = super::continuous(prob, prep, opts.starts)?;
    let grid = Grid::for_problem(prob, &opts.grid)?;
    let disc = discrete::search(prob, prep, &grid, &cont.x, discrete::EXHAUSTIVE_POINTS)?;
    let active: Vec<String> = cont
        .constraints
        .iter()
        .filter(|(_, g)| *g > -2e-3)
        .map(|(c, _)| c.describe(vars))
        .collect();
    let d_props = prob.family.shape(&disc.x).properties()?;
    Ok(Study {
        title: title.to_string(),
        problem: prob.clone(),
        continuous: variant(prob, prep, &cont.x, sys),
        discrete: variant(prob, prep, &disc.x, sys),
        gap: (disc.objective - cont.objective) / cont.objective,
        active,
        sensitivities: sensitivities(prob, prep, &cont, sys),
        evaluations: cont.evaluations,
        grid_points_checked: disc.evaluated,
        whole_grid: disc.whole_grid,
        gap_bound: disc.gap_bound,
        grid_points: grid.size(),
        not_checked: prep.not_checked(&d_props, None),
        excluded: prep.criteria.exclude.list(),
        assumptions: prep.assumptions_in(sys),
        reference: None,
        caution: crate::CAUTION,
    })
}

/// The section at x (mm) and its check.
fn variant(prob: &Problem, prep: &Prepared, x: &[f64], sys: System) -> Variant {
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
            prep.visit(SectionInput::new(p, mass), &mut |it: Item| {
                let k = match it.kind.group() {
                    Group::Bending => "bending",
                    Group::Shear => "shear",
                    Group::LocalBuckling => "local buckling",
                    Group::LateralTorsional => "lateral-torsional buckling",
                    Group::Deflection => "deflection",
                }
                .to_string();
                match by.iter_mut().find(|(n, _)| *n == k) {
                    Some(e) => e.1 = e.1.max(it.utilisation),
                    None => by.push((k, it.utilisation)),
                }
            });
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

/// Relax each active, adjustable constraint a little, re-optimise, and say
/// what it buys.
fn sensitivities(prob: &Problem, prep: &Prepared, best: &Optimum, sys: System) -> Vec<Sensitivity> {
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
        if let Some(o) = super::continuous_from(&p2, prep_used, &best.x) {
            let delta = o.objective - base;
            let words = if delta < -1e-9 * base.abs() {
                format!(
                    "{change} saves about {} {unit} of {}",
                    fmt_delta(delta),
                    prob.objective.noun()
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
