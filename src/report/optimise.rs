//! The document of an optimisation study (the study itself, with its
//! sensitivities, is computed in `optimise::study`).

use super::{Align, Document, Table};
use crate::optimise::discrete;
use crate::optimise::{Family, Study, Variant};
use crate::units::{self, Show, System};

/// Where the slenderness limits of a study came from, for the words beside
/// them.
#[derive(Clone, Copy, Debug, Default)]
pub struct LimitSource {
    /// The flange limit was given (not a default).
    pub flange_given: bool,
    /// The web (or wall) limit was given.
    pub web_given: bool,
    /// The defaults are the compact limits.
    pub compact: bool,
    /// The job gives a yield stress (the defaults need one).
    pub yield_stress_known: bool,
}

impl LimitSource {
    /// Notes on the limits of a family: without a yield stress no default
    /// applies.
    pub fn notes(&self, fam: Family) -> Vec<String> {
        let limits = fam.kind().limits();
        if !self.yield_stress_known
            && (limits.flange || limits.web)
            && (!self.flange_given || !self.web_given)
        {
            vec!["no yield stress Fy in the job: no default slenderness limits were applied (give --lambda-f and --lambda-w)".to_string()]
        } else {
            Vec::new()
        }
    }
}

/// The study as a document: its fields in tables and sentences.
pub fn document(result: &Study, source: &LimitSource, sys: System) -> Document {
    let prob = &result.problem;
    let fam = prob.family;
    let vars = fam.variables();
    let mut doc = Document::new(format!(
        "Optimised {} for {}",
        fam.kind().name(),
        result.title
    ));
    let mut pt = Table::new("Problem", &[("Item", Align::Left), ("Value", Align::Left)]);
    pt.row(vec!["Minimise".into(), prob.objective.noun().into()]);
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
                if source.flange_given {
                    " (as given)"
                } else if source.compact {
                    " (compact, AISC 360-16 Table B4.1b λp = 0.38√(E/Fy))"
                } else {
                    ""
                }
            ),
        ]);
    }
    if let Some(l) = prob.lambda_w {
        let (label, basis) = fam.kind().limits().web_words;
        pt.row(vec![
            label.to_string(),
            format!(
                "{l:.2}{}",
                if source.web_given {
                    " (as given)"
                } else if source.compact {
                    " (compact, AISC 360-16 Table B4.1b λp)"
                } else {
                    basis
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
        if result.whole_grid {
            format!(
                "the optimum of all {} grid points (visited in order of {}; {} checked before the first that passes)",
                units::count(result.grid_points),
                prob.objective.noun(),
                units::count(result.grid_points_checked)
            )
        } else {
            format!(
                "the best of {} grid points searched — the whole of a coarser sub-grid of it, then a window around the continuous optimum (the grid has {}, more than the {} searched exhaustively: at most {:.1} % above the grid optimum)",
                units::count(result.grid_points_checked),
                units::count(result.grid_points),
                units::count(discrete::EXHAUSTIVE_POINTS as u64),
                100.0 * result.gap_bound.unwrap_or(f64::NAN)
            )
        },
        100.0 * result.gap,
        prob.objective.noun(),
        result.discrete.governing.clone().unwrap_or_default()
    ));
    if let Some(r) = &result.reference {
        let mut rt = Table::new(
            format!("Against the catalogue row {}", r.name),
            &[
                ("", Align::Left),
                ("Catalogue row", Align::Right),
                ("Fabrication sizes", Align::Right),
                ("Change", Align::Right),
            ],
        );
        rt.row(vec![
            format!("Area [{}]", Show::Area.label(sys)),
            Show::Area.num(r.area, sys),
            Show::Area.num(result.discrete.area, sys),
            format!("{:+.1} %", 100.0 * r.area_change),
        ]);
        rt.row(vec![
            format!("Mass [{}]", Show::Mass.label(sys)),
            Show::Mass.fixed(r.mass, sys, 2),
            Show::Mass.fixed(result.discrete.mass, sys, 2),
            format!("{:+.1} %", 100.0 * r.mass_change),
        ]);
        rt.row(vec![
            "Utilisation".into(),
            format!("{:.3}", r.utilisation),
            format!("{:.3}", result.discrete.utilisation),
            String::new(),
        ]);
        doc.table(rt);
        doc.para(format!(
            "The catalogue row ({} deep) was checked against the same job in its own grade: {}{}. A negative change is what the fabrication sizes save against it.",
            Show::Dimension.fmt(r.depth, sys),
            r.verdict.word(),
            r.governing
                .as_ref()
                .map(|g| format!(", governed by {g}"))
                .unwrap_or_default()
        ));
    }
    if !result.active.is_empty() {
        doc.list(
            "Active (binding) constraints at the continuous optimum:",
            result.active.clone(),
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
    let notes = source.notes(fam);
    if !notes.is_empty() {
        doc.list("Notes:", notes);
    }
    // Welds and stiffeners are in the section's own list (plate shapes);
    // the slenderness limits apply to plate families, not to a rectangle.
    let mut nc = result.not_checked.clone();
    if fam != Family::Rect {
        nc.push("local buckling beyond the slenderness limits stated above".into());
    }
    doc.caution(nc);
    doc
}
