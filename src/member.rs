//! The whole check of one member on one job, as one result every front
//! end renders: every check line with its working, the verdict and its
//! gaps, the analysis (reactions, settlements, extremes) for this section
//! and the sampled diagrams of the governing combinations. Computed once
//! here: the terminal table, JSON and the calculation sheet print these
//! numbers and compute none of their own.

use crate::CAUTION;
use crate::beam::analysis::{self, Analysis};
use crate::beam::demand::Quantity;
use crate::beam::model::ComboKind;
use crate::check::{CheckKind, Item, Material, Prepared, SectionInput, Verdict, working::Working};
use crate::job::Job;
use crate::section::Properties;
use crate::units::{Show, System};
use serde::Serialize;

/// One check line, with names resolved, in internal units.
#[derive(Clone, Debug, Serialize)]
pub struct Line {
    pub check: CheckKind,
    pub label: String,
    pub combination: String,
    /// The load pattern of the combination that gives this line's demand
    /// ("live on span 1 loaded; live on right overhang not loaded"), None
    /// where the combination has no patterned loads.
    pub pattern: Option<String>,
    /// Span or overhang label ("span 2"), or the buckling segment (its
    /// ends in m).
    pub part: String,
    /// The unbraced segment of a buckling line, mm from the left end.
    #[serde(skip)]
    pub segment: Option<(f64, f64)>,
    /// Position from the left end, mm.
    pub x: f64,
    /// The action at x: N·mm (bending, buckling), N (shear), mm (deflection).
    pub action: f64,
    /// Stress (MPa), moment (N·mm) or deflection (mm).
    pub demand: f64,
    pub capacity: f64,
    /// What the demand and capacity are (stress, moment, force, deflection).
    pub show: Show,
    pub utilisation: f64,
    pub passes: bool,
    /// The method, formula and values of this line.
    pub working: Working,
}

/// The outcome of checking one section on one job.
#[derive(Clone, Debug, Serialize)]
pub struct MemberCheck {
    pub title: String,
    pub section: String,
    pub properties: Properties,
    /// kg/m.
    pub mass_per_length: f64,
    /// N/mm, as added to the self-weight case (0 when off).
    pub self_weight: f64,
    pub lines: Vec<Line>,
    pub utilisation: f64,
    pub governing: Option<Line>,
    pub verdict: Verdict,
    /// verdict == Passes.
    pub passes: bool,
    /// Limit states that apply but could not be evaluated (why the verdict
    /// is not verified).
    pub not_verified: Vec<String>,
    /// Limit states the user excluded.
    pub excluded: Vec<String>,
    /// Outside beamsift's scope for this section.
    pub not_checked: Vec<String>,
    /// Bracing, effective lengths, load height, springs.
    pub assumptions: Vec<String>,
    /// Settlement of each spring support per combination, mm (downward;
    /// min and max over the load patterns): not in the deflection checks,
    /// which measure from the chord of the displaced supports.
    pub settlements: Vec<Settlement>,
    pub notes: Vec<String>,
    /// Reactions per case and combination, settlements and extremes per
    /// part, for this section (its self-weight and stiffness).
    pub analysis: Analysis,
    /// V and M of the governing strength combination, δ of the governing
    /// serviceability combination (for the sheet's figures).
    #[serde(skip)]
    pub diagrams: Vec<Diagram>,
    /// Positions of the supported nodes, mm (for the figures).
    #[serde(skip)]
    pub supports_x: Vec<f64>,
    pub caution: &'static str,
}

/// A spring's settlement under one combination.
#[derive(Clone, Debug, Serialize)]
pub struct Settlement {
    pub combination: String,
    /// Position of the spring from the left end, mm.
    pub x: f64,
    pub min: f64,
    pub max: f64,
}

/// A diagram of one quantity along the beam for one combination,
/// enveloped over the load patterns, in internal units (x in mm; N, N·mm
/// or mm), sampled at 25 points per element.
#[derive(Clone, Debug, Serialize)]
pub struct Diagram {
    /// What is plotted, e.g. "Shear V".
    pub name: String,
    pub combination: String,
    /// Whether the combination has load patterns (two curves: upper and
    /// lower bound of the envelope).
    pub patterned: bool,
    pub show: Show,
    /// +1 plots the value upward, −1 downward (deflection, downward
    /// positive, plotted down).
    pub sign: f64,
    /// The upper bound, then (patterned) the lower bound: (x mm, value).
    pub curves: Vec<Vec<(f64, f64)>>,
    /// The largest and smallest values and where: (x mm, value).
    pub marks: Vec<(f64, f64)>,
}

/// Where along the beam x lies, in words.
pub fn part_at(prep: &Prepared, x: f64) -> String {
    prep.demand
        .stretches
        .iter()
        .find(|s| x >= s.x1 - 1e-9 && x <= s.x2 + 1e-9)
        .map(|s| s.label.clone())
        .unwrap_or_default()
}

/// The part of the beam a check line is about: a span or overhang, or an
/// unbraced segment.
pub fn part_of(prep: &Prepared, it: &Item, sys: System) -> String {
    match segment_of(prep, it) {
        Some((x1, x2)) => segment_words(x1, x2, sys),
        None if it.kind == CheckKind::Deflection => prep.demand.stretches[it.part].label.clone(),
        None => part_at(prep, it.x),
    }
}

/// The unbraced segment a buckling line is about (mm from the left end).
fn segment_of(prep: &Prepared, it: &Item) -> Option<(f64, f64)> {
    (it.kind == CheckKind::LateralTorsional && !prep.segments.is_empty()).then(|| {
        let s = &prep.segments[it.part];
        (s.x1, s.x2)
    })
}

/// "segment 0.000–2.000 m" (feet in US units).
fn segment_words(x1: f64, x2: f64, sys: System) -> String {
    if sys == System::UsFeetInches {
        // Feet and inches as every other length of that system.
        return format!(
            "segment {} – {}",
            Show::Span.num(x1, sys),
            Show::Span.num(x2, sys)
        );
    }
    let (unit, per) = Show::Span.unit(sys);
    format!("segment {:.3}–{:.3} {unit}", x1 / per, x2 / per)
}

impl Line {
    /// Where the line is, in the display units: its unbraced segment, or
    /// its span or overhang and the position along the beam.
    pub fn location(&self, sys: System) -> String {
        match self.segment {
            Some(_) => self.part_shown(sys),
            None => format!("{}, x = {}", self.part, Show::Span.fmt(self.x, sys)),
        }
    }

    /// The part in the display units (a segment's ends are positions).
    pub fn part_shown(&self, sys: System) -> String {
        match self.segment {
            Some((x1, x2)) => segment_words(x1, x2, sys),
            None => self.part.clone(),
        }
    }
}

pub fn line(prep: &Prepared, sec: SectionInput<'_>, it: &Item) -> Line {
    let d = &prep.demand;
    let part = part_of(prep, it, System::Si);
    let timber = sec.material.unwrap_or(&prep.material).kind == crate::check::MaterialKind::Timber;
    let show = match it.kind {
        CheckKind::Deflection => Show::Deflection,
        CheckKind::WebShear => Show::Force,
        CheckKind::LateralTorsional if timber => Show::Stress,
        k if k.demand_is_moment() => Show::Moment,
        _ => Show::Stress,
    };
    Line {
        segment: segment_of(prep, it),
        check: it.kind,
        label: it.kind.label().to_string(),
        combination: d.combos[it.combo].name.clone(),
        pattern: governing_pattern(prep, sec, it),
        part,
        x: it.x,
        action: it.action,
        demand: it.demand,
        capacity: it.capacity,
        show,
        utilisation: it.utilisation,
        passes: it.utilisation <= 1.0,
        working: prep.working(sec, it),
    }
}

/// The load pattern that gives a check line its demand: the parts of the
/// combination's patterned loads that the envelope takes at the line's
/// position, for the sign of its action (read from the demand, see
/// [`crate::beam::demand::Demand::loaded_parts`]). None without patterns.
pub fn governing_pattern(prep: &Prepared, sec: SectionInput<'_>, it: &Item) -> Option<String> {
    let d = &prep.demand;
    let combo = &d.combos[it.combo];
    if combo.patterns.is_empty() {
        return None;
    }
    let m = sec.material.unwrap_or(&prep.material);
    let ei = m.e_eff() * sec.props.ix;
    let sl = d.section(prep.self_weight(sec.mass), ei);
    let a = d.apply(it.combo, &sl);
    let (q, target) = match it.kind {
        CheckKind::Shear | CheckKind::WebShear => (Quantity::Shear, it.action),
        // The deflection polynomials are for E·I = 1.
        CheckKind::Deflection => (Quantity::Deflection, it.action * ei),
        _ => (Quantity::Moment, it.action),
    };
    let upper = match it.sense {
        crate::check::Sense::Sagging => true,
        crate::check::Sense::Hogging => false,
        crate::check::Sense::None => target >= 0.0,
    };
    let parts = d.loaded_parts(&a, q, it.x, upper, target);
    let words = |pick: &dyn Fn(bool, bool) -> bool| -> Vec<String> {
        parts
            .iter()
            .filter(|&&(_, on, none)| pick(on, none))
            .map(|&(j, _, _)| combo.pattern_labels[j].clone())
            .collect()
    };
    let loaded = words(&|on, _| on);
    let off = words(&|on, none| !on && !none);
    let idle = words(&|_, none| none);
    let mut s = match (loaded.is_empty(), off.is_empty()) {
        (true, true) => "no patterned load acts here".to_string(),
        (true, false) => format!("no patterned load on ({} not loaded)", off.join(", ")),
        (false, true) => format!("{} loaded", loaded.join(", ")),
        (false, false) => format!(
            "{} loaded; {} not loaded",
            loaded.join(", "),
            off.join(", ")
        ),
    };
    if !idle.is_empty() {
        s.push_str(&format!("; {} without effect here", idle.join(", ")));
    }
    Some(s)
}

/// Check a section and collect the result.
pub fn member_check(
    job: &Job,
    prep: &Prepared,
    section: &str,
    props: &Properties,
    mass: f64,
    material: Option<&Material>,
    sys: System,
) -> MemberCheck {
    let mut sec = SectionInput::new(props, mass);
    if let Some(m) = material {
        sec = sec.with_material(m);
    }
    let (items, _) = prep.check_all(sec);
    let lines: Vec<Line> = items.iter().map(|it| line(prep, sec, it)).collect();
    let summary = prep.check(sec);
    let d = &prep.demand;
    let w = prep.self_weight(mass);
    let sl = d.section(w, sec.material.unwrap_or(&prep.material).e_eff() * props.ix);
    let sw_case = job
        .beam
        .self_weight_case
        .filter(|_| job.criteria.self_weight);
    let analysis = analysis::analyse(&job.beam, d, &sl, sw_case, true, false);
    let diagrams = diagrams(prep, &lines, &sl);
    let supports_x = d
        .stretches
        .iter()
        .flat_map(|s| {
            let mut v = Vec::new();
            if s.left_node.is_some() {
                v.push(s.x1);
            }
            if s.right_node.is_some() {
                v.push(s.x2);
            }
            v
        })
        .collect();
    MemberCheck {
        title: job.title.clone(),
        section: section.to_string(),
        properties: props.clone(),
        mass_per_length: mass,
        self_weight: w,
        governing: summary.governing.map(|g| line(prep, sec, &g)),
        utilisation: summary.utilisation,
        verdict: summary.verdict,
        passes: summary.passes,
        lines,
        not_verified: summary.gaps.describe(),
        excluded: prep.criteria.exclude.list(),
        not_checked: prep.not_checked(props, material),
        assumptions: prep.assumptions_in(sys),
        settlements: (0..d.combos.len())
            .flat_map(|ci| {
                let a = d.apply(ci, &sl);
                d.settlements(&a)
                    .into_iter()
                    .map(|(n, lo, hi)| Settlement {
                        combination: a.combo.name.clone(),
                        x: d.node_x[n],
                        min: lo,
                        max: hi,
                    })
                    .collect::<Vec<_>>()
            })
            .collect(),
        notes: job.notes.clone(),
        analysis,
        diagrams,
        supports_x,
        caution: CAUTION,
    }
}

/// The diagrams of the governing combinations: V and M of the strength
/// combination and δ of the serviceability combination whose lines have
/// the largest utilisation.
fn diagrams(prep: &Prepared, lines: &[Line], sl: &crate::beam::SectionLoad) -> Vec<Diagram> {
    let d = &prep.demand;
    let pick = |kind: ComboKind, prefer: &dyn Fn(CheckKind) -> bool| -> Option<usize> {
        lines
            .iter()
            .filter(|l| prefer(l.check))
            .max_by(|a, b| a.utilisation.total_cmp(&b.utilisation))
            .and_then(|l| {
                d.combos
                    .iter()
                    .position(|c| c.name == l.combination && c.kind == kind)
            })
    };
    let strength = pick(ComboKind::Strength, &|k| k != CheckKind::Deflection);
    let service = pick(ComboKind::Service, &|k| k == CheckKind::Deflection);
    let sample = |ci: usize, q: Quantity, name: &str, show: Show, scale: f64, sign: f64| {
        let a = d.apply(ci, sl);
        let (mut lo, mut hi) = (Vec::new(), Vec::new());
        for e in 0..d.len.len() {
            for k in 0..=24 {
                let s = d.len[e] * k as f64 / 24.0;
                let (a, b) = d.envelope_at(&a, q, e, s);
                let x = d.mesh.x[e] + s;
                lo.push((x, a * scale));
                hi.push((x, b * scale));
            }
        }
        let patterned = !a.combo.patterns.is_empty();
        let ex = d.extremes(&a, q, 0..d.len.len());
        let mut marks = Vec::new();
        for (v, x) in [(ex.max, ex.x_max), (ex.min, ex.x_min)] {
            if v != 0.0 {
                marks.push((x, v * scale));
            }
        }
        marks.dedup_by(|a, b| {
            (a.0 - b.0).abs() < 1e-9 && (a.1 - b.1).abs() < 1e-9 * a.1.abs().max(1.0)
        });
        Diagram {
            name: name.to_string(),
            combination: a.combo.name.clone(),
            patterned,
            show,
            sign,
            curves: if patterned { vec![hi, lo] } else { vec![hi] },
            marks,
        }
    };
    let mut out = Vec::new();
    if let Some(ci) = strength {
        out.push(sample(
            ci,
            Quantity::Shear,
            "Shear V",
            Show::Force,
            1.0,
            1.0,
        ));
        out.push(sample(
            ci,
            Quantity::Moment,
            "Bending moment M (sagging positive)",
            Show::Moment,
            1.0,
            1.0,
        ));
    }
    if let Some(ci) = service {
        out.push(sample(
            ci,
            Quantity::Deflection,
            "Deflection δ (positive downward, plotted downward)",
            Show::Deflection,
            1.0 / sl.ei,
            -1.0,
        ));
    }
    out
}
