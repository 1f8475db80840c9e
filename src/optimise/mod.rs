//! Parametric optimisation of rectangular, welded I, mono-symmetric I and
//! rectangular hollow sections: least area (mass), least cost from plate
//! prices, or least depth, subject to every check of [`crate::check`] on
//! the prepared demand (self-weight of the trial shape included) and to
//! geometric limits.
//!
//! Method. argmin has no solver for inequality constraints, so its
//! Nelder–Mead simplex minimises an augmented Lagrangian (Powell–Hestenes–
//! Rockafellar form, Nocedal & Wright, *Numerical Optimization*, 2nd ed.,
//! §17.4):
//!
//!   L(z; λ, ρ) = f(z) + Σ_i ψ(g_i),  ψ = λ_i·g_i + ρ/2·g_i²  if g_i ≥ −λ_i/ρ,
//!                                     −λ_i²/(2ρ)          otherwise,
//!
//! with λ_i ← max(0, λ_i + ρ·g_i) after each inner solve, and ρ raised when
//! the violation does not fall fast enough. Constraints are normalised
//! ratios g = demand/capacity − 1 ≤ 0; variables are scaled to [0, 1] over
//! their bounds; impossible geometry returns a large finite penalty. The
//! demand is computed once, outside the loop; several starts run in
//! parallel (argmin's own parallelism is not used).
//!
//! The continuous optimum is then rounded to fabrication sizes by an exact
//! search of the surrounding grid (see [`discrete`]).

pub mod discrete;
pub mod families;
pub mod options;
pub mod study;

use crate::check::{Group, Material, Prepared, SectionInput};
use crate::error::{Error, Result};
use crate::section::Shape;
use argmin::core::{CostFunction, Executor, State};
use argmin::solver::neldermead::NelderMead;
pub use families::{Axis, FamilyKind, Limits};
pub use options::Options;
use rayon::prelude::*;
use serde::{Deserialize, Serialize};
pub use study::{Reference, Sensitivity, Study, StudyOptions, Variant, study};

/// Section families that can be optimised.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Family {
    /// Solid rectangle: b, d.
    Rect,
    /// Doubly symmetric welded I: bf, tf, hw, tw.
    WeldedI,
    /// Mono-symmetric welded I: bf_top, tf_top, bf_bot, tf_bot, hw, tw.
    MonoI,
    /// Rectangular hollow section (sharp corners): b, h, t.
    Rhs,
}

impl Family {
    /// Every family, in the order of the variants.
    pub const ALL: [Family; 4] = [Family::Rect, Family::WeldedI, Family::MonoI, Family::Rhs];

    /// Every choice with its name (the serde name where it has one) and
    /// a line of help, for front ends that list the choices.
    pub const CHOICES: &[(Self, &str, &str)] = &[
        (Self::Rect, "rect", "Solid rectangle: b, d"),
        (
            Self::WeldedI,
            "welded-i",
            "Doubly symmetric welded I: bf, tf, hw, tw",
        ),
        (
            Self::MonoI,
            "mono-i",
            "Mono-symmetric welded I: bf_top, tf_top, bf_bot, tf_bot, hw, tw",
        ),
        (
            Self::Rhs,
            "rhs",
            "Rectangular hollow section (sharp corners): b, h, t",
        ),
    ];

    /// The implementation of the family: everything the optimiser knows
    /// of it.
    pub fn kind(self) -> &'static dyn FamilyKind {
        match self {
            Family::Rect => &families::Rect,
            Family::WeldedI => &families::WeldedI,
            Family::MonoI => &families::MonoI,
            Family::Rhs => &families::Rhs,
        }
    }

    pub fn variables(self) -> &'static [&'static str] {
        self.kind().variables()
    }

    /// Which variables are plate thicknesses (rounded to the plate list).
    pub fn is_thickness(self, i: usize) -> bool {
        self.kind().axes()[i] == Axis::Thickness
    }

    /// Which variables are depths (rounded to the depth step).
    pub fn is_depth(self, i: usize) -> bool {
        self.kind().axes()[i] == Axis::Depth
    }

    /// Default bounds (lower, upper) of each variable, mm.
    pub fn default_bounds(self) -> Vec<(f64, f64)> {
        self.kind().default_bounds().to_vec()
    }

    pub fn shape(self, x: &[f64]) -> Shape {
        self.kind().shape(x)
    }
}

/// What to minimise.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Objective {
    /// Cross-sectional area (= mass per length).
    Area,
    /// Cost from plate prices (currency per kg by thickness).
    Cost,
    /// Overall depth (area breaks ties).
    Depth,
}

impl Objective {
    /// Every choice with its name (the serde name where it has one) and
    /// a line of help, for front ends that list the choices.
    pub const CHOICES: &[(Self, &str, &str)] = &[
        (
            Self::Area,
            "area",
            "Cross-sectional area (= mass per length)",
        ),
        (
            Self::Cost,
            "cost",
            "Cost from plate prices (currency per kg by thickness)",
        ),
        (Self::Depth, "depth", "Overall depth (area breaks ties)"),
    ];
}

/// A constraint, for reporting.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Constraint {
    Bending,
    Shear,
    LocalBuckling,
    LateralTorsional,
    Deflection,
    /// A limit state that applies could not be evaluated.
    NotVerified,
    MaxDepth,
    MinDepth,
    /// d/b ≤ k.
    Aspect,
    /// bf/(2·tf) ≤ λf.
    FlangeSlenderness,
    /// hw/tw ≤ λw.
    WebSlenderness,
    /// (b − 2t)/t ≤ λ for a hollow section.
    WallSlenderness,
    /// 0.1 ≤ Iyc/Iy ≤ 0.9 (AISC 360-16 F13.2) for a mono-symmetric I.
    FlangeProportion,
    Lower(usize),
    Upper(usize),
}

impl Constraint {
    pub fn describe(self, vars: &[&str]) -> String {
        match self {
            Constraint::Bending => "bending stress".into(),
            Constraint::Shear => "shear".into(),
            Constraint::LocalBuckling => "local buckling".into(),
            Constraint::NotVerified => {
                "every applicable limit state evaluated (not verified otherwise)".into()
            }
            Constraint::LateralTorsional => "lateral-torsional buckling / lateral stability".into(),
            Constraint::Deflection => "deflection limit".into(),
            Constraint::MaxDepth => "maximum depth".into(),
            Constraint::MinDepth => "minimum depth".into(),
            Constraint::Aspect => "aspect ratio d/b".into(),
            Constraint::FlangeSlenderness => "flange slenderness bf/(2·tf)".into(),
            Constraint::WebSlenderness => "web slenderness hw/tw".into(),
            Constraint::WallSlenderness => "wall slenderness (b − 2t)/t".into(),
            Constraint::FlangeProportion => {
                "flange proportion 0.1 ≤ Iyc/Iy ≤ 0.9 (AISC 360-16 F13.2)".into()
            }
            Constraint::Lower(i) => format!("lower bound on {}", vars[i]),
            Constraint::Upper(i) => format!("upper bound on {}", vars[i]),
        }
    }
    /// A check of the section against its loads (as opposed to geometry).
    pub fn is_check(self) -> bool {
        matches!(
            self,
            Constraint::Bending
                | Constraint::Shear
                | Constraint::LocalBuckling
                | Constraint::LateralTorsional
                | Constraint::Deflection
                | Constraint::NotVerified
        )
    }
}

/// The problem: a family, bounds, limits and an objective.
#[derive(Clone, Debug, Serialize)]
pub struct Problem {
    pub family: Family,
    /// (lower, upper) per variable, mm.
    pub bounds: Vec<(f64, f64)>,
    pub max_depth: Option<f64>,
    pub min_depth: Option<f64>,
    /// Largest d/b (rectangles).
    pub aspect: Option<f64>,
    /// Flange limit on bf/(2tf) (I-shapes).
    pub lambda_f: Option<f64>,
    /// Web limit on hw/tw (I-shapes) or wall limit on (b − 2t)/t (RHS).
    pub lambda_w: Option<f64>,
    pub objective: Objective,
    /// (thickness mm, currency per kg), sorted by thickness, for Cost.
    pub plate_prices: Vec<(f64, f64)>,
}

/// Default slenderness limits: the proportioning limits the methods need,
/// nothing stricter — local buckling enters as a constraint through the
/// exact piecewise capacities of AISC 360-16 F3–F5 and F7. I-shapes: webs
/// h/t_w ≤ min(0.40·E/F_y, 260) (§F13.2, unstiffened webs), flanges
/// unlimited; rectangular HSS: walls up to 5.70√(E/F_y) (the end of the
/// webs F7 covers here).
pub fn default_slenderness(family: Family, e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
    family.kind().default_slenderness(e, fy)
}

/// Compact limits (`--compact`): AISC 360-16 Table B4.1b λp, flanges of
/// I-shapes in flexure (case 10) 0.38√(E/Fy) and webs (case 15)
/// 3.76√(E/Fy); walls of rectangular HSS in flexure (case 17)
/// 1.12√(E/Fy), used for both walls (conservative).
pub fn compact_slenderness(family: Family, e: f64, fy: f64) -> (Option<f64>, Option<f64>) {
    family.kind().compact_slenderness(e, fy)
}

/// Evaluation of one trial point.
#[derive(Clone, Debug)]
pub struct Eval {
    pub f: f64,
    pub g: Vec<(Constraint, f64)>,
    pub area: f64,
    pub cost: f64,
    pub depth: f64,
}

const PENALTY: f64 = 1e6;

impl Problem {
    /// Least area of `family` within its default bounds, with the default
    /// slenderness limits for the material's E and Fy (none without Fy)
    /// and no other limit.
    pub fn least_area(family: Family, material: &Material) -> Problem {
        let (lambda_f, lambda_w) = material
            .fy
            .map(|fy| default_slenderness(family, material.e, fy))
            .unwrap_or((None, None));
        Problem {
            family,
            bounds: family.default_bounds(),
            max_depth: None,
            min_depth: None,
            aspect: None,
            lambda_f,
            lambda_w,
            objective: Objective::Area,
            plate_prices: vec![],
        }
    }

    pub fn n(&self) -> usize {
        self.bounds.len()
    }

    pub fn to_x(&self, z: &[f64]) -> Vec<f64> {
        z.iter()
            .zip(&self.bounds)
            .map(|(zi, (lo, hi))| lo + (hi - lo) * zi.clamp(0.0, 1.0))
            .collect()
    }

    pub fn to_z(&self, x: &[f64]) -> Vec<f64> {
        x.iter()
            .zip(&self.bounds)
            .map(|(xi, (lo, hi))| if hi > lo { (xi - lo) / (hi - lo) } else { 0.0 })
            .collect()
    }

    fn price(&self, t: f64) -> f64 {
        let p = &self.plate_prices;
        if p.is_empty() {
            return 1.0;
        }
        if t <= p[0].0 {
            return p[0].1;
        }
        for w in p.windows(2) {
            if t <= w[1].0 {
                return w[0].1 + (w[1].1 - w[0].1) * (t - w[0].0) / (w[1].0 - w[0].0);
            }
        }
        p[p.len() - 1].1
    }

    /// Cost per mm of length (currency), for a density in kg/m³.
    pub fn cost_of(&self, x: &[f64], density: f64) -> f64 {
        let kg_per_mm3 = density * 1e-9;
        self.family
            .kind()
            .cost(x, kg_per_mm3, &|t: f64| self.price(t))
    }

    /// The objective and the area at x (mm), without any check (None:
    /// impossible geometry).
    pub fn objective_at(&self, x: &[f64], density: f64) -> Option<(f64, f64)> {
        let shape = self.family.shape(x);
        let p = shape.properties().ok()?;
        let f = match self.objective {
            Objective::Area => p.area,
            Objective::Cost => self.cost_of(x, density),
            Objective::Depth => shape.depth() + 1e-6 * p.area,
        };
        Some((f, p.area))
    }

    /// Evaluate objective and constraints at x (mm). None: impossible geometry.
    pub fn eval(&self, prep: &Prepared, x: &[f64]) -> Option<Eval> {
        let shape = self.family.shape(x);
        let p = shape.properties().ok()?;
        let mat = &prep.material;
        let mass = p.mass_per_length(mat.density);
        // The exact piecewise capacities of every regime enter the
        // constraints (continuous across regime boundaries in AISC 360-16
        // and NDS); a limit state that applies but cannot be evaluated
        // makes the point infeasible (g = 1), never slack.
        struct Worst([f64; 5], bool);
        impl crate::check::Sink for Worst {
            fn item(&mut self, it: crate::check::Item) {
                let k = match it.kind.group() {
                    Group::Bending => 0,
                    Group::Shear => 1,
                    Group::LocalBuckling => 2,
                    Group::LateralTorsional => 3,
                    Group::Deflection => 4,
                };
                self.0[k] = self.0[k].max(it.utilisation);
            }
            fn gap(&mut self, _g: crate::check::Gap) {
                self.1 = true;
            }
        }
        let mut w = Worst([0.0; 5], false);
        prep.visit(SectionInput::new(&p, mass), &mut w);
        let worst = w.0;
        let mut g = vec![
            (Constraint::Bending, worst[0] - 1.0),
            (Constraint::Shear, worst[1] - 1.0),
            (Constraint::LocalBuckling, worst[2] - 1.0),
            (Constraint::LateralTorsional, worst[3] - 1.0),
            (Constraint::Deflection, worst[4] - 1.0),
            (Constraint::NotVerified, if w.1 { 1.0 } else { -1.0 }),
        ];
        let depth = shape.depth();
        if let Some(m) = self.max_depth {
            g.push((Constraint::MaxDepth, depth / m - 1.0));
        }
        if let Some(m) = self.min_depth {
            g.push((Constraint::MinDepth, 1.0 - depth / m));
        }
        self.family.kind().geometry(self, x, &mut g);
        let cost = if self.objective == Objective::Cost {
            self.cost_of(x, mat.density)
        } else {
            0.0
        };
        let f = match self.objective {
            Objective::Area => p.area,
            Objective::Cost => cost,
            Objective::Depth => depth + 1e-6 * p.area,
        };
        Some(Eval {
            f,
            g,
            area: p.area,
            cost,
            depth,
        })
    }

    /// Objective scale (the value at the middle of the box), so f ≈ 1.
    fn scale(&self, prep: &Prepared) -> f64 {
        let mid: Vec<f64> = self.bounds.iter().map(|(lo, hi)| 0.5 * (lo + hi)).collect();
        self.eval(prep, &mid)
            .map(|e| e.f)
            .filter(|f| *f > 0.0)
            .unwrap_or(1.0)
    }

    /// Check the problem (lengths in its problems in SI).
    pub fn validate(&self) -> Result<()> {
        self.validate_in(crate::units::System::Si)
    }

    /// [`Problem::validate`] with the lengths in its problems in `sys`
    /// (the system the bounds were typed in).
    pub fn validate_in(&self, sys: crate::units::System) -> Result<()> {
        let len = |v: f64| crate::units::Show::Dimension.fmt(v, sys);
        let vars = self.family.variables();
        if self.bounds.len() != vars.len() {
            return Err(Error::Internal("bounds do not match the family".into()));
        }
        for (i, (lo, hi)) in self.bounds.iter().enumerate() {
            if !(lo.is_finite() && hi.is_finite() && *lo > 0.0 && hi >= lo) {
                return Err(Error::msg(format!(
                    "bounds on {} ({} to {}) are not valid: expected 0 < lower ≤ upper",
                    vars[i],
                    len(*lo),
                    len(*hi)
                )));
            }
        }
        if self.objective == Objective::Cost && self.plate_prices.is_empty() {
            return Err(Error::msg(
                "the cost objective needs plate prices (--plate-prices)",
            ));
        }
        // Documented ranges (README "Optimise"): anything outside is a
        // typing error, refused rather than ignored or obeyed.
        let range = |name: &str, v: Option<f64>, lo: f64, hi: f64| -> Result<()> {
            match v {
                Some(x) if !(x.is_finite() && (lo..=hi).contains(&x)) => Err(Error::msg(format!(
                    "{name} = {}: expected {} to {}",
                    crate::units::fmt_num(x),
                    crate::units::fmt_num(lo),
                    crate::units::fmt_num(hi)
                ))
                .in_field(name)),
                _ => Ok(()),
            }
        };
        range("--aspect", self.aspect, 1.0, 50.0)?;
        range("--lambda-f", self.lambda_f, 1.0, 100.0)?;
        range("--lambda-w", self.lambda_w, 1.0, 1000.0)?;
        range("--max-depth", self.max_depth, 1.0, 10_000.0)?;
        range("--min-depth", self.min_depth, 1.0, 10_000.0)?;
        for (i, (lo, hi)) in self.bounds.iter().enumerate() {
            if *hi > 10_000.0 {
                return Err(Error::msg(format!(
                    "bounds on {}: an upper bound of {} is beyond 10 m",
                    vars[i],
                    len(*hi)
                ))
                .in_field("--bound"));
            }
            let _ = lo;
        }
        for (t, p) in &self.plate_prices {
            if !(p.is_finite() && *p > 0.0 && *p < 1e6) {
                return Err(Error::msg(format!(
                    "the price of {} plate is {}: expected a price per kg above zero",
                    len(*t),
                    crate::units::fmt_num(*p)
                ))
                .in_field("--plate-prices"));
            }
        }
        Ok(())
    }
}

/// The augmented Lagrangian for one inner solve.
struct Inner<'a> {
    prob: &'a Problem,
    prep: &'a Prepared,
    lambda: &'a [f64],
    rho: f64,
    scale: f64,
}

fn psi(g: f64, lambda: f64, rho: f64) -> f64 {
    if g >= -lambda / rho {
        lambda * g + 0.5 * rho * g * g
    } else {
        -lambda * lambda / (2.0 * rho)
    }
}

/// All constraints including the box bounds (in z-space).
pub fn all_g(e: &Eval, z: &[f64]) -> Vec<(Constraint, f64)> {
    let mut g = e.g.clone();
    for (i, zi) in z.iter().enumerate() {
        g.push((Constraint::Lower(i), -zi));
        g.push((Constraint::Upper(i), zi - 1.0));
    }
    g
}

impl CostFunction for Inner<'_> {
    type Param = Vec<f64>;
    type Output = f64;
    fn cost(&self, z: &Vec<f64>) -> std::result::Result<f64, argmin::core::Error> {
        let x = self.prob.to_x(z);
        let Some(e) = self.prob.eval(self.prep, &x) else {
            return Ok(PENALTY);
        };
        let g = all_g(&e, z);
        let mut l = e.f / self.scale;
        for (k, (_, gi)) in g.iter().enumerate() {
            l += psi(*gi, self.lambda[k], self.rho);
        }
        Ok(if l.is_finite() { l } else { PENALTY })
    }
}

/// A continuous optimum.
#[derive(Clone, Debug, Serialize)]
pub struct Optimum {
    /// Variables, mm.
    pub x: Vec<f64>,
    pub shape: Shape,
    pub area: f64,
    pub objective: f64,
    /// Constraint values g ≤ 0 (box bounds included, in z-space).
    pub constraints: Vec<(Constraint, f64)>,
    /// Final multipliers, same order (per unit of the scaled objective).
    pub multipliers: Vec<f64>,
    /// Largest violation max(0, g).
    pub violation: f64,
    pub evaluations: u64,
}

fn solve_from(prob: &Problem, prep: &Prepared, z0: Vec<f64>, scale: f64) -> Option<Optimum> {
    let n = prob.n();
    let e0 = prob.eval(prep, &prob.to_x(&z0))?;
    let m = all_g(&e0, &z0).len();
    let mut lambda = vec![0.0; m];
    let mut rho = 10.0;
    let mut z = z0;
    let mut prev_viol = f64::INFINITY;
    let mut evals = 0u64;
    let mut step = 0.15;
    for _outer in 0..40 {
        let mut simplex = vec![z.clone()];
        for i in 0..n {
            let mut v = z.clone();
            v[i] = if v[i] + step <= 1.0 {
                v[i] + step
            } else {
                v[i] - step
            };
            simplex.push(v);
        }
        let solver = NelderMead::new(simplex).with_sd_tolerance(1e-13).ok()?;
        let inner = Inner {
            prob,
            prep,
            lambda: &lambda,
            rho,
            scale,
        };
        let res = Executor::new(inner, solver)
            .configure(|s| s.max_iters(300 * n as u64))
            .run()
            .ok()?;
        evals += res.state().get_func_counts().values().sum::<u64>();
        z = res.state().get_best_param()?.clone();
        let e = prob.eval(prep, &prob.to_x(&z))?;
        let g = all_g(&e, &z);
        let viol = g.iter().map(|(_, v)| v.max(0.0)).fold(0.0, f64::max);
        for (k, (_, gi)) in g.iter().enumerate() {
            lambda[k] = (lambda[k] + rho * gi).max(0.0);
        }
        if viol < 1e-9 && step <= 2e-4 {
            break;
        }
        if viol > 0.25 * prev_viol {
            rho = (rho * 4.0).min(1e9);
        }
        prev_viol = viol;
        step = (step * 0.5).max(2e-4);
    }
    let x = restore_feasibility(prob, prep, prob.to_x(&z));
    let z = prob.to_z(&x);
    let e = prob.eval(prep, &x)?;
    let g = all_g(&e, &z);
    let viol = g.iter().map(|(_, v)| v.max(0.0)).fold(0.0, f64::max);
    Some(Optimum {
        shape: prob.family.shape(&x),
        x,
        area: e.area,
        objective: e.f,
        constraints: g,
        multipliers: lambda,
        violation: viol,
        evaluations: evals,
    })
}

/// The solver stops within its tolerance of the constraints, which can
/// leave a utilisation a hair above 1 (1.0003): a point that fails its own
/// check. Step out of it by enlarging every dimension together (ratios
/// such as b/t and h/t_w unchanged, so no slenderness regime changes),
/// by the smallest factor up to 3 % that passes; the point is returned
/// unchanged if it already passes or if no such factor exists (its
/// violation is then reported).
fn restore_feasibility(prob: &Problem, prep: &Prepared, x: Vec<f64>) -> Vec<f64> {
    let feasible = |x: &[f64]| {
        prob.eval(prep, x).is_some_and(|e| {
            e.g.iter().all(|(_, g)| *g <= 0.0)
                && prob
                    .to_z(x)
                    .iter()
                    .all(|z| (-1e-12..=1.0 + 1e-12).contains(z))
        })
    };
    if feasible(&x) {
        return x;
    }
    let at = |s: f64| -> Vec<f64> {
        x.iter()
            .zip(&prob.bounds)
            .map(|(xi, (lo, hi))| (xi * s).clamp(*lo, *hi))
            .collect()
    };
    let mut hi = None;
    let mut s = 1.0 + 1e-7;
    while s <= 1.03 {
        if feasible(&at(s)) {
            hi = Some(s);
            break;
        }
        s = 1.0 + 4.0 * (s - 1.0);
    }
    let Some(mut hi) = hi else {
        return x;
    };
    let mut lo = 1.0;
    for _ in 0..40 {
        let mid = 0.5 * (lo + hi);
        if feasible(&at(mid)) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    at(hi)
}

/// A continuous optimum as a person can write it down: every dimension
/// rounded up to what four significant figures show (0.1 mm below 1 m,
/// 1 mm above), so the section printed is never smaller than the one
/// computed; None unless that section passes every constraint.
pub fn as_printed(prob: &Problem, prep: &Prepared, x: &[f64]) -> Option<Vec<f64>> {
    let up: Vec<f64> = x
        .iter()
        .map(|v| {
            let step = if *v < 1000.0 { 0.1 } else { 1.0 };
            ((v / step) - 1e-9).ceil() * step
        })
        .collect();
    let e = prob.eval(prep, &up)?;
    e.g.iter().all(|(_, g)| *g <= 0.0).then_some(up)
}

/// Deterministic starting points in the box (centre, then a Halton spread).
fn starts(n: usize, count: usize) -> Vec<Vec<f64>> {
    let primes = [2.0, 3.0, 5.0, 7.0, 11.0, 13.0];
    let mut out = vec![vec![0.5; n]];
    for k in 1..count {
        out.push(
            (0..n)
                .map(|i| {
                    let p: f64 = primes[i % primes.len()];
                    let (mut f, mut r, mut kk) = (1.0, 0.0, k as f64);
                    while kk > 0.0 {
                        f /= p;
                        r += f * (kk % p);
                        kk = (kk / p).floor();
                    }
                    0.1 + 0.8 * r
                })
                .collect(),
        );
    }
    out
}

/// Solve the continuous problem from several starts in parallel; the best
/// feasible (violation ≤ 1e-6) result.
pub fn continuous(prob: &Problem, prep: &Prepared, n_starts: usize) -> Result<Optimum> {
    prob.validate()?;
    let scale = prob.scale(prep);
    let results: Vec<Optimum> = starts(prob.n(), n_starts.max(1))
        .into_par_iter()
        .filter_map(|z0| solve_from(prob, prep, z0, scale))
        .collect();
    let best = results
        .iter()
        .filter(|o| o.violation <= 1e-6)
        .min_by(|a, b| a.objective.total_cmp(&b.objective))
        .or_else(|| {
            results
                .iter()
                .min_by(|a, b| a.violation.total_cmp(&b.violation))
        })
        .cloned()
        .ok_or_else(|| Error::msg("the optimiser found no valid shape inside the bounds"))?;
    if best.violation > 1e-4 {
        return Err(infeasible(prob, prep, &best));
    }
    Ok(best)
}

/// Explain an infeasible problem: which constraints fail even at the most
/// capable corner of the box, and what would help.
fn infeasible(prob: &Problem, prep: &Prepared, best: &Optimum) -> Error {
    let vars = prob.family.variables();
    let upper: Vec<f64> = prob.bounds.iter().map(|b| b.1).collect();
    let mut lines = Vec::new();
    if let Some(e) = prob.eval(prep, &upper) {
        for (c, g) in &e.g {
            if *g > 1e-6 && c.is_check() {
                lines.push(format!(
                    "{} is not met even with every dimension at its upper bound (utilisation {:.3})",
                    c.describe(vars),
                    1.0 + g
                ));
            }
        }
    }
    let worst = best
        .constraints
        .iter()
        .filter(|(_, g)| *g > 1e-6)
        .max_by(|a, b| a.1.total_cmp(&b.1))
        .map(|(c, g)| format!("{} (exceeded by {:.1} %)", c.describe(vars), 100.0 * g))
        .unwrap_or_default();
    let bounds: Vec<String> = vars
        .iter()
        .zip(&prob.bounds)
        .map(|(v, (lo, hi))| {
            format!(
                "{v} {}–{} mm",
                crate::units::fmt_num(*lo),
                crate::units::fmt_num(*hi)
            )
        })
        .collect();
    // A limit state that cannot be evaluated: say which and why.
    let unverified = best
        .constraints
        .iter()
        .any(|(c, g)| *c == Constraint::NotVerified && *g > 0.0);
    if unverified && let Ok(p) = best.shape.properties() {
        let s = prep.check(SectionInput::new(
            &p,
            p.mass_per_length(prep.material.density),
        ));
        for r in s.gaps.describe() {
            lines.push(format!("not verified: {r}"));
        }
    }
    Error::NoSolution(format!(
        "no shape within the bounds ({}) satisfies every constraint; the closest the optimiser came still violates the {worst}.{}\nTo make it feasible: raise the upper bounds{}, relax the limit named, or choose a stronger material.",
        bounds.join(", "),
        if lines.is_empty() {
            String::new()
        } else {
            format!("\n  - {}", lines.join("\n  - "))
        },
        if prob.max_depth.is_some() {
            " and the maximum depth"
        } else {
            ""
        }
    ))
}

/// Re-solve from a known point (one start), e.g. for sensitivities.
pub fn continuous_from(prob: &Problem, prep: &Prepared, x0: &[f64]) -> Option<Optimum> {
    let scale = prob.scale(prep);
    solve_from(prob, prep, prob.to_z(x0), scale).filter(|o| o.violation <= 1e-5)
}
