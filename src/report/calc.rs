//! The calculation sheet of one member: a model a checker can follow by
//! hand — the job, reactions, diagrams, the section, and each check
//! written as formula → numbers → result → allowable → utilisation. Built
//! from the same prepared demand and check lines as `check`; the Markdown
//! and HTML renderers (`sheet`) only print it.

use super::chart;
use super::member::MemberCheck;
use super::{Align, Table};
use crate::beam::demand::Quantity;
use crate::beam::model::ComboKind;
use crate::check::{CheckKind, Prepared};
use crate::job::Job;
use crate::units::{Show, System};
use serde::Serialize;

/// One check, written out.
#[derive(Clone, Debug, Serialize)]
pub struct WrittenCheck {
    pub check: String,
    pub combination: String,
    pub location: String,
    pub formula: String,
    pub substitution: Vec<String>,
    pub result: String,
    pub allowable: String,
    pub utilisation: String,
    pub passes: bool,
}

/// A diagram (inline SVG) with its caption.
#[derive(Clone, Debug, Serialize)]
pub struct Figure {
    pub caption: String,
    pub svg: String,
}

/// The whole sheet.
#[derive(Clone, Debug, Serialize)]
pub struct Sheet {
    pub title: String,
    pub member: String,
    pub section: String,
    pub section_source: String,
    pub verdict: String,
    pub tables: Vec<TableOut>,
    pub figures: Vec<Figure>,
    pub checks: Vec<WrittenCheck>,
    pub alternatives: Option<TableOut>,
    pub methods: Vec<String>,
    pub assumptions: Vec<String>,
    pub not_verified: Vec<String>,
    pub excluded: Vec<String>,
    pub not_checked: Vec<String>,
    pub notes: Vec<String>,
    pub caution: &'static str,
    pub generator: String,
}

/// The three verdicts and their exit codes, in words (for every sheet).
pub const VERDICTS: &str = "Verdicts: PASSES — every limit state that applies was evaluated by the method stated and is within its capacity (exit code 0); \
FAILS — a limit state evaluated exceeds its capacity (exit code 1); NOT VERIFIED — nothing evaluated fails, but a limit state that applies \
could not be evaluated (a missing input, a shape outside a method's range, no method for the material): this is not a pass (exit code 5). \
A limit state the user excluded is listed as excluded, by choice.";

/// A table in the sheet (serialisable form of `Table`).
#[derive(Clone, Debug, Serialize)]
pub struct TableOut {
    pub title: String,
    pub headers: Vec<String>,
    pub right: Vec<bool>,
    pub rows: Vec<Vec<String>>,
}

impl From<Table> for TableOut {
    fn from(t: Table) -> Self {
        TableOut {
            title: t.title,
            right: t.align.iter().map(|a| *a == Align::Right).collect(),
            headers: t.headers,
            rows: t.rows,
        }
    }
}

/// Write out every check line of a member check (from the working the
/// library attached to each line).
pub fn written_checks(r: &MemberCheck, sys: System) -> Vec<WrittenCheck> {
    r.lines
        .iter()
        .map(|l| {
            let location = match l.check {
                CheckKind::LateralTorsional => l.part.clone(),
                _ => format!("{}, x = {}", l.part, Show::Span.fmt(l.x, sys)),
            };
            let w = &l.working;
            let terms: Vec<String> = w
                .terms
                .iter()
                .map(|t| format!("{} = {}", t.symbol, t.show.fmt(t.value, sys)))
                .collect();
            let substitution = terms.chunks(4).map(|c| c.join("; ")).collect();
            WrittenCheck {
                check: l.label.clone(),
                combination: l.combination.clone(),
                location,
                formula: if w.formula.is_empty() {
                    w.method.clone()
                } else {
                    format!("{} — {}", w.method, w.formula)
                },
                substitution,
                result: format!("= {}", l.show.fmt(l.demand, sys)),
                allowable: format!("{} = {}", w.capacity, l.show.fmt(l.capacity, sys)),
                utilisation: format!(
                    "{} / {} = {:.3}",
                    l.show.fmt(l.demand, sys),
                    l.show.fmt(l.capacity, sys),
                    l.utilisation
                ),
                passes: l.passes,
            }
        })
        .collect()
}

/// Diagrams of V, M (for the governing strength combination) and δ (for
/// the governing serviceability combination), enveloped over patterns.
pub fn figures(prep: &Prepared, r: &MemberCheck, sys: System) -> Vec<Figure> {
    let d = &prep.demand;
    let w = r.self_weight;
    let pick = |kind: ComboKind, prefer: &dyn Fn(CheckKind) -> bool| -> Option<usize> {
        r.lines
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
    let supports: Vec<f64> = d
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
        .map(|x| Show::Span.value(x, sys))
        .collect();
    let mut figs = Vec::new();
    let ei = prep.material.e * r.properties.ix;
    let sl = d.section(w, ei);
    let mut plot = |ci: usize, q: Quantity, name: &str, show: Show, scale: f64, sign: f64| {
        let a = d.apply(ci, &sl);
        let c = a.combo;
        let (mut lo, mut hi) = (Vec::new(), Vec::new());
        for e in 0..d.len.len() {
            for k in 0..=24 {
                let s = d.len[e] * k as f64 / 24.0;
                let (a, b) = d.envelope_at(&a, q, e, s);
                let x = Show::Span.value(d.mesh.x[e] + s, sys);
                lo.push((x, sign * show.value(a * scale, sys)));
                hi.push((x, sign * show.value(b * scale, sys)));
            }
        }
        let patterned = !c.patterns.is_empty();
        let ex = d.extremes(&a, q, 0..d.len.len());
        let mut marks = Vec::new();
        for (v, x) in [(ex.max, ex.x_max), (ex.min, ex.x_min)] {
            if v != 0.0 {
                marks.push((
                    Show::Span.value(x, sys),
                    sign * show.value(v * scale, sys),
                    format!("{} at {}", show.fmt(v * scale, sys), Show::Span.fmt(x, sys)),
                ));
            }
        }
        marks.dedup_by(|a, b| (a.0 - b.0).abs() < 1e-9 && (a.1 - b.1).abs() < 1e-9);
        let curves = if patterned { vec![hi, lo] } else { vec![hi] };
        let title = format!(
            "{name} — {}{}",
            c.name,
            if patterned {
                " (envelope over span patterns)"
            } else {
                ""
            }
        );
        let svg = chart::beam_diagram(
            &title,
            &format!("x [{}]", Show::Span.label(sys)),
            &format!("{name} [{}]", show.label(sys)),
            &curves,
            &marks,
            &supports,
        );
        figs.push(Figure {
            caption: title,
            svg,
        });
    };
    if let Some(ci) = strength {
        plot(ci, Quantity::Shear, "Shear V", Show::Force, 1.0, 1.0);
        plot(
            ci,
            Quantity::Moment,
            "Bending moment M (sagging positive)",
            Show::Moment,
            1.0,
            1.0,
        );
    }
    if let Some(ci) = service {
        plot(
            ci,
            Quantity::Deflection,
            "Deflection δ (downward plotted down)",
            Show::Deflection,
            1.0 / ei,
            -1.0,
        );
    }
    figs
}

/// Reactions per case and per combination.
pub fn reaction_tables(
    job: &Job,
    prep: &Prepared,
    sect: &crate::beam::SectionLoad,
    sys: System,
) -> Vec<Table> {
    let w_sw = sect.w_sw;
    let d = &prep.demand;
    let b = &job.beam;
    let f = Show::Force.label(sys);
    let nodes: Vec<usize> = (0..b.supports.len())
        .filter(|&n| b.supports[n].restrains_vertical())
        .collect();
    let mut heads: Vec<String> = vec!["Case".into()];
    heads.extend(
        nodes
            .iter()
            .map(|&n| format!("R at {} [{f}]", Show::Span.fmt(d.node_x[n], sys))),
    );
    let refs: Vec<(&str, Align)> = heads
        .iter()
        .enumerate()
        .map(|(i, h)| (h.as_str(), if i == 0 { Align::Left } else { Align::Right }))
        .collect();
    let mut t = Table::new(
        "Reactions per load case (upward), self-weight in its case",
        &refs,
    );
    for (ci, c) in b.cases.iter().enumerate() {
        let sw = if Some(ci) == prep_sw_case(job) {
            w_sw
        } else {
            0.0
        };
        let mut row = vec![c.name.clone()];
        let rs = d.case_reactions(sect, ci, sw);
        for &n in &nodes {
            row.push(Show::Force.num(rs[n].0, sys));
        }
        t.row(row);
    }
    let mut heads2: Vec<String> = vec!["Combination".into()];
    heads2.extend(
        nodes
            .iter()
            .map(|&n| format!("R at {} [{f}]", Show::Span.fmt(d.node_x[n], sys))),
    );
    let refs2: Vec<(&str, Align)> = heads2
        .iter()
        .enumerate()
        .map(|(i, h)| (h.as_str(), if i == 0 { Align::Left } else { Align::Right }))
        .collect();
    let mut t2 = Table::new(
        "Reactions per combination (upward; min … max over span patterns)",
        &refs2,
    );
    for ci in 0..d.combos.len() {
        let a = d.apply(ci, sect);
        let c = a.combo;
        let r = d.reactions(&a);
        let mut row = vec![c.name.clone()];
        for &n in &nodes {
            let (lo, hi) = r[n];
            row.push(if (hi - lo).abs() <= 1e-9 * hi.abs().max(1.0) {
                Show::Force.num(hi, sys)
            } else {
                format!(
                    "{} … {}",
                    Show::Force.num(lo, sys),
                    Show::Force.num(hi, sys)
                )
            });
        }
        t2.row(row);
    }
    vec![t, t2]
}

/// Extremes per combination and span, with both deflection extremes (the
/// largest downward and the largest upward movement, e.g. a back span
/// lifted by its overhang), from the analysis of this section.
pub fn extremes_table(job: &Job, prep: &Prepared, r: &MemberCheck, sys: System) -> Table {
    let d = &prep.demand;
    let sect = d.section(r.self_weight, prep.material.e_eff() * r.properties.ix);
    let a = crate::beam::analysis::analyse(&job.beam, d, &sect, prep_sw_case(job), true, false);
    let (ml, fl, dl, sl) = (
        Show::Moment.label(sys),
        Show::Force.label(sys),
        Show::Deflection.label(sys),
        Show::Span.label(sys),
    );
    let heads = [
        "Combination".to_string(),
        "Part".into(),
        format!("M+ [{ml}]"),
        format!("M− [{ml}]"),
        format!("|V| [{fl}]"),
        format!("δ down [{dl}] at x [{sl}]"),
        format!("δ up [{dl}] at x [{sl}]"),
    ];
    let refs: Vec<(&str, Align)> = heads
        .iter()
        .enumerate()
        .map(|(i, h)| (h.as_str(), if i < 2 { Align::Left } else { Align::Right }))
        .collect();
    let mut t = Table::new(
        "Extremes per combination and span (envelope over load patterns; deflection from the chord of the span's supports)",
        &refs,
    );
    let at = |v: Option<crate::beam::analysis::At>, show: Show, neg: bool| match v {
        Some(a) => format!(
            "{} at {}",
            show.num(if neg { -a.value } else { a.value }, sys),
            Show::Span.num(a.x_mm, sys)
        ),
        None => "—".into(),
    };
    for e in &a.extremes {
        t.row(vec![
            e.combination.clone(),
            e.part.clone(),
            e.sagging_nmm
                .map(|x| Show::Moment.num(x.value, sys))
                .unwrap_or_else(|| "—".into()),
            e.hogging_nmm
                .map(|x| Show::Moment.num(x.value, sys))
                .unwrap_or_else(|| "—".into()),
            Show::Force.num(e.shear_n.value.abs(), sys),
            at(e.deflection_down_mm, Show::Deflection, false),
            at(e.deflection_up_mm, Show::Deflection, true),
        ]);
    }
    t
}

fn prep_sw_case(job: &Job) -> Option<usize> {
    job.beam
        .self_weight_case
        .filter(|_| job.criteria.self_weight)
}

/// Section properties with their origin.
pub fn section_table(r: &MemberCheck, sys: System) -> Table {
    let mut t = Table::new(
        "Section properties",
        &[
            ("Property", Align::Left),
            ("Value", Align::Right),
            ("Unit", Align::Left),
        ],
    );
    for (label, v, kind) in r.properties.rows() {
        t.row(vec![label.into(), kind.num(v, sys), kind.label(sys).into()]);
    }
    t.row(vec![
        "Mass per length".into(),
        Show::Mass.num(r.mass_per_length, sys),
        Show::Mass.label(sys).into(),
    ]);
    t.row(vec![
        "Self-weight load".into(),
        Show::LineLoad.num(r.self_weight, sys),
        Show::LineLoad.label(sys).into(),
    ]);
    t
}

/// Methods and sources (for the end of the sheet) and assumptions.
pub fn methods(prep: &Prepared, r: &MemberCheck) -> (Vec<String>, Vec<String>) {
    let mut m = vec![
        "Flexure formula f = M·y/I (extreme fibres: f = M·c/I = M/S); shear stress by V·Q/(I·t) (Jourawski) or the average web shear V/(d·t_w) for I-shapes.".to_string(),
        "Analysis: direct stiffness method with Euler–Bernoulli beam elements and consistent nodal loads, exact for uniform, linearly varying, point and moment loads; moment and shear by statics; deflection by integrating the curvature M/(E·I) twice from the exact nodal values; spring supports by compatibility of the settlements for this section's E·I.".to_string(),
        "Pattern loading: live-type cases taken span by span, the worst combination of spans at every station; snow, where partial loading applies, full on some spans and half on the others.".to_string(),
    ];
    let mut seen: Vec<String> = Vec::new();
    for l in &r.lines {
        if !seen.contains(&l.working.method) && l.check != CheckKind::Deflection {
            seen.push(l.working.method.clone());
        }
    }
    m.extend(seen);
    m.push("Combination presets (where used): ASCE/SEI 7-16 §2.4.1 basic allowable-stress combinations; deflection presets: IBC 2018 Table 1604.3 (from memory; verify against the editions in force).".into());
    let mut a = vec![
        "Linear elastic material; plane sections remain plane; small deflections.".to_string(),
        "Prismatic member; loads act in the plane of the principal axis of bending (no torsion)."
            .to_string(),
        "Allowable stresses and deflection limits as entered by the user.".to_string(),
    ];
    a.extend(prep.assumptions());
    (m, a)
}
