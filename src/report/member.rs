//! The document of a single-member check (the result is
//! [`crate::member::MemberCheck`]). Shared by `check` and the calculation
//! sheet.

pub use crate::member::{
    Diagram, Line, MemberCheck, Settlement, line, member_check, part_at, part_of,
};

use super::{Align, Document, Table};
use crate::beam::model::{ComboKind, Support};
use crate::check::CheckKind;
use crate::job::Job;
use crate::units::{Show, System};

/// (action, demand, capacity) formatted for a line.
pub fn fmt_values(l: &Line, sys: System) -> (String, String, String) {
    let action = match l.check {
        CheckKind::Shear | CheckKind::WebShear => {
            format!("V = {}", Show::Force.fmt(l.action.abs(), sys))
        }
        CheckKind::Deflection => format!("δ = {}", Show::Deflection.fmt(l.action, sys)),
        _ => format!("M = {}", Show::Moment.fmt(l.action, sys)),
    };
    (
        action,
        l.show.fmt(l.demand, sys),
        l.show.fmt(l.capacity, sys),
    )
}

/// Describe the job: member, material, cases and combinations.
pub fn job_tables(job: &Job, sys: System) -> Vec<Table> {
    let b = &job.beam;
    let mut member = Table::new("Member", &[("Item", Align::Left), ("Value", Align::Left)]);
    let spans: Vec<String> = b.spans.iter().map(|s| Show::Span.fmt(*s, sys)).collect();
    member.row(vec!["Segments, left to right".into(), spans.join(" + ")]);
    let sups: Vec<String> = b
        .supports
        .iter()
        .map(|s| match s {
            Support::Spring(k) => format!(
                "spring {}",
                Show::LineLoad.fmt(*k, sys).replace("/m", "/m stiffness")
            ),
            other => other.name(),
        })
        .collect();
    member.row(vec!["Supports at the nodes".into(), sups.join(", ")]);
    let m = &job.material;
    member.row(vec!["Material".into(), m.name.clone()]);
    member.row(vec!["Kind of material".into(), m.kind.name().into()]);
    member.row(vec![
        "Modulus of elasticity E".into(),
        Show::Modulus.fmt(m.e, sys),
    ]);
    match (m.fb_tension, m.fb_compression) {
        (Some(t), Some(c)) if t == c => member.row(vec![
            "Allowable bending stress Fb".into(),
            Show::Stress.fmt(t, sys),
        ]),
        (Some(t), Some(c)) => {
            member.row(vec![
                "Allowable bending stress, tension Fbt".into(),
                Show::Stress.fmt(t, sys),
            ]);
            member.row(vec![
                "Allowable bending stress, compression Fbc".into(),
                Show::Stress.fmt(c, sys),
            ]);
        }
        _ => member.row(vec![
            "Allowable bending stress Fb".into(),
            "not given (bending strength by AISC 360-16 Chapter F)".into(),
        ]),
    }
    member.row(vec![
        "Allowable shear stress Fv".into(),
        m.fv.map(|v| Show::Stress.fmt(v, sys)).unwrap_or_else(|| {
            if m.kind == crate::check::MaterialKind::Steel {
                "not given (shear strength by AISC 360-16 Chapter G)".into()
            } else {
                "not given".into()
            }
        }),
    ]);
    if let Some(fy) = m.fy {
        member.row(vec!["Yield stress Fy".into(), Show::Stress.fmt(fy, sys)]);
    }
    if m.kind == crate::check::MaterialKind::Timber {
        if let Some(e) = m.timber.e_min {
            member.row(vec![
                "Stability modulus Emin".into(),
                Show::Modulus.fmt(e, sys),
            ]);
        }
        let f = m.timber.applied();
        member.row(vec![
            "Adjustment factors given".into(),
            if f.is_empty() {
                "none (each 1.0)".into()
            } else {
                f.join(", ")
            },
        ]);
        if m.timber.cd.is_none() {
            member.row(vec![
                "Load duration C_D".into(),
                "per combination, NDS Table 2.3.2".into(),
            ]);
        }
    }
    member.row(vec!["Density".into(), Show::Density.fmt(m.density, sys)]);
    let c = &job.criteria;
    member.row(vec![
        "Lateral bracing".into(),
        match c.bracing {
            crate::check::Bracing::NotGiven => "not given: taken as at the supports only".into(),
            crate::check::Bracing::Continuous => "continuous".into(),
            crate::check::Bracing::Supports => "at supports only".into(),
            crate::check::Bracing::Spacing(s) => {
                format!("at supports and every {}", Show::Span.fmt(s, sys))
            }
        },
    ]);
    if !matches!(
        c.bracing,
        crate::check::Bracing::Supports | crate::check::Bracing::NotGiven
    ) {
        member.row(vec![
            "Braces restrain".into(),
            match c.braced_flange {
                crate::check::BracedFlange::Top => "the top flange only".into(),
                crate::check::BracedFlange::Both => "both flanges".into(),
            },
        ]);
    }
    let ex = c.exclude.list();
    if !ex.is_empty() {
        member.row(vec!["Excluded by the user".into(), ex.join("; ")]);
    }
    let mut loads = Table::new(
        "Loads (x from the left end; downward and clockwise positive)",
        &[
            ("Case", Align::Left),
            ("Category", Align::Left),
            ("Load", Align::Left),
        ],
    );
    for l in &b.loads {
        let c = &b.cases[l.case];
        let desc = match l.kind {
            crate::beam::LoadKind::Distributed { x1, x2, w1, w2 } => {
                let span = format!(
                    "from {} to {}",
                    Show::Span.fmt(x1, sys),
                    Show::Span.fmt(x2, sys)
                );
                if w1 == w2 {
                    format!("uniform {} {span}", Show::LineLoad.fmt(w1, sys))
                } else {
                    format!(
                        "linear {} to {} {span}",
                        Show::LineLoad.fmt(w1, sys),
                        Show::LineLoad.fmt(w2, sys)
                    )
                }
            }
            crate::beam::LoadKind::Point { x, p } => {
                format!(
                    "point {} at {}",
                    Show::Force.fmt(p, sys),
                    Show::Span.fmt(x, sys)
                )
            }
            crate::beam::LoadKind::Moment { x, m } => {
                format!(
                    "moment {} at {}",
                    Show::Moment.fmt(m, sys),
                    Show::Span.fmt(x, sys)
                )
            }
        };
        let pat = if c.pattern.is_on() && b.stretches().len() > 1 {
            format!(" ({})", c.pattern.words())
        } else {
            String::new()
        };
        loads.row(vec![
            c.name.clone(),
            format!("{}{pat}", c.category.name()),
            desc,
        ]);
    }
    if let Some(sw) = b.self_weight_case.filter(|_| job.criteria.self_weight) {
        loads.row(vec![
            b.cases[sw].name.clone(),
            "dead".into(),
            "self-weight of the section, over the whole beam".into(),
        ]);
    }
    let mut combos = Table::new(
        "Combinations",
        &[
            ("Name", Align::Left),
            ("Kind", Align::Left),
            ("Factors", Align::Left),
            ("Limit", Align::Left),
            ("Source", Align::Left),
        ],
    );
    for c in &b.combinations {
        let f: Vec<String> = c
            .factors
            .iter()
            .map(|(i, f)| format!("{}×{}", crate::units::fmt_num(*f), b.cases[*i].name))
            .collect();
        let limit = match (c.kind, c.limit) {
            (ComboKind::Service, Some(l)) => {
                let mut parts = Vec::new();
                if let Some(n) = l.ratio {
                    parts.push(format!("L/{}", crate::units::fmt_num(n)));
                }
                if let Some(a) = l.absolute {
                    parts.push(Show::Deflection.fmt(a, sys));
                }
                parts.join(" and ")
            }
            _ => String::new(),
        };
        combos.row(vec![
            c.name.clone(),
            match c.kind {
                ComboKind::Strength => "strength".into(),
                ComboKind::Service => "service".into(),
            },
            f.join(" + "),
            limit,
            c.source.clone().unwrap_or_else(|| "as given".into()),
        ]);
    }
    vec![member, loads, combos]
}

/// The document of a member check.
pub fn document(job: &Job, r: &MemberCheck, sys: System) -> Document {
    let mut doc = Document::new(format!("Check of {} — {}", r.section, r.title));
    for t in job_tables(job, sys) {
        doc.table(t);
    }
    let mut sec = Table::new(
        "Section",
        &[
            ("Property", Align::Left),
            ("Value", Align::Right),
            ("Unit", Align::Left),
        ],
    );
    let p = &r.properties;
    for (label, v, kind) in [
        ("Depth d", p.depth, Show::Dimension),
        ("Area A", p.area, Show::Area),
        ("Second moment Ix", p.ix, Show::SecondMoment),
        ("S_top = Ix/c_top", p.s_top, Show::SectionModulus),
        ("S_bot = Ix/c_bot", p.s_bot, Show::SectionModulus),
        ("Mass per length", r.mass_per_length, Show::Mass),
    ] {
        sec.row(vec![label.into(), kind.num(v, sys), kind.label(sys).into()]);
    }
    sec.row(vec![
        "Self-weight added".into(),
        Show::LineLoad.num(r.self_weight, sys),
        Show::LineLoad.label(sys).into(),
    ]);
    doc.table(sec);
    let mut t = Table::new(
        "Checks",
        &[
            ("Check", Align::Left),
            ("Combination", Align::Left),
            ("Where", Align::Left),
            ("Action", Align::Right),
            ("Demand", Align::Right),
            ("Capacity", Align::Right),
            ("Utilisation", Align::Right),
            ("Result", Align::Left),
        ],
    );
    for l in &r.lines {
        let (a, d, c) = fmt_values(l, sys);
        t.row(vec![
            l.check.short().to_string(),
            l.combination.clone(),
            l.location(sys),
            a,
            d,
            c,
            format!("{:.3}", l.utilisation),
            if l.passes {
                "pass".into()
            } else {
                "FAIL".into()
            },
        ]);
    }
    doc.table(t);
    if let Some(st) = settlements_table(r, sys) {
        doc.table(st);
    }
    doc.para(
        "+M sagging, −M hogging; (C) fibre in compression, (T) in tension. Bending: f = M·c/I = M/S. \
Utilisation = demand / capacity (allowable strength: nominal/Ω).",
    );
    match &r.governing {
        Some(g) => doc.para(format!(
            "{}: utilisation {:.3}, governed by {} under {} ({}).",
            r.verdict.word(),
            r.utilisation,
            g.label,
            g.combination,
            g.location(sys)
        )),
        None => doc.para(format!(
            "{}: no check line was evaluated.",
            r.verdict.word()
        )),
    }
    if !r.not_verified.is_empty() {
        doc.list(
            "Not verified — these limit states apply but could not be evaluated, so the section does not pass:",
            r.not_verified.clone(),
        );
    }
    doc.para(super::calc::VERDICTS);
    doc.excluded(r.excluded.clone());
    doc.assumptions(r.assumptions.clone());
    if !r.notes.is_empty() {
        doc.list("Notes:", r.notes.clone());
    }
    doc.caution(r.not_checked.clone());
    doc
}

/// Each spring's settlement per combination (None without springs).
pub fn settlements_table(r: &MemberCheck, sys: System) -> Option<Table> {
    if r.settlements.is_empty() {
        return None;
    }
    let dl = Show::Deflection.label(sys);
    let mut st = Table::new(
        format!(
            "Spring settlements, downward [{dl}] (not in the deflection checks, which measure from the chord of the displaced supports)"
        ),
        &[
            ("Combination", Align::Left),
            ("x", Align::Right),
            ("min", Align::Right),
            ("max", Align::Right),
        ],
    );
    for x in &r.settlements {
        st.row(vec![
            x.combination.clone(),
            Show::Span.fmt(x.x, sys),
            Show::Deflection.num(x.min, sys),
            Show::Deflection.num(x.max, sys),
        ]);
    }
    Some(st)
}
