//! The document of a beam analysis: reactions, settlements, extremes per
//! combination and part, and stations (computed in `beam::analysis`).

use super::{Align, Document, Table, member};
use crate::beam::analysis::{Analysis, At};
use crate::job::Job;
use crate::units::{Show, System};

/// What the deflections of an analysis are for.
pub enum Basis {
    /// A section (its description) and its self-weight [N/mm].
    Section(String, f64),
    /// A given second moment of area, no self-weight.
    SecondMoment,
    /// No stiffness: no deflections.
    None,
}

/// The document of an analysis.
pub fn document(job: &Job, r: &Analysis, section: &Basis, sys: System) -> Document {
    // Document.
    let mut doc = Document::new(format!("Analysis of {}", job.title));
    for t in member::job_tables(job, sys) {
        doc.table(t);
    }
    match section {
        Basis::Section(s, w) => doc.para(format!(
            "Section {s}: self-weight {} added to the dead case.",
            Show::LineLoad.fmt(*w, sys)
        )),
        Basis::SecondMoment => doc.para("Deflections for the given Ix; no self-weight."),
        Basis::None => {
            doc.para("No section or --Ix given: deflections are not computed; no self-weight.")
        }
    }
    let f = Show::Force.label(sys);
    let mut rt = Table::new(
        format!(
            "Reactions per case (upward force [{f}]; clockwise moment [{}])",
            Show::Moment.label(sys)
        ),
        &[
            ("Case", Align::Left),
            ("Support", Align::Left),
            ("x", Align::Right),
            ("R", Align::Right),
            ("M", Align::Right),
        ],
    );
    for c in &r.cases {
        for n in &c.reactions {
            rt.row(vec![
                c.case.clone(),
                n.support.clone(),
                Show::Span.fmt(n.x_mm, sys),
                Show::Force.num(n.force_n, sys),
                if n.moment_nmm != 0.0 {
                    Show::Moment.num(n.moment_nmm, sys)
                } else {
                    String::new()
                },
            ]);
        }
    }
    doc.table(rt);
    let mut ct = Table::new(
        format!("Reactions per combination, upward [{f}] (range over load patterns)"),
        &[
            ("Combination", Align::Left),
            ("Support", Align::Left),
            ("x", Align::Right),
            ("R min", Align::Right),
            ("R max", Align::Right),
        ],
    );
    for c in &r.combinations {
        for n in &c.reactions {
            ct.row(vec![
                c.combination.clone(),
                n.support.clone(),
                Show::Span.fmt(n.x_mm, sys),
                Show::Force.num(n.force_n.min, sys),
                Show::Force.num(n.force_n.max, sys),
            ]);
        }
    }
    doc.table(ct);
    if r.combinations.iter().any(|c| !c.settlements_mm.is_empty()) {
        let dl = Show::Deflection.label(sys);
        let mut st = Table::new(
            format!(
                "Spring settlements per combination, downward [{dl}] (range over load patterns)"
            ),
            &[
                ("Combination", Align::Left),
                ("x", Align::Right),
                ("min", Align::Right),
                ("max", Align::Right),
            ],
        );
        for c in &r.combinations {
            for (x, range) in &c.settlements_mm {
                st.row(vec![
                    c.combination.clone(),
                    Show::Span.fmt(*x, sys),
                    Show::Deflection.num(range.min, sys),
                    Show::Deflection.num(range.max, sys),
                ]);
            }
        }
        doc.table(st);
    }
    let (ml, dl, sl) = (
        Show::Moment.label(sys),
        Show::Deflection.label(sys),
        Show::Span.label(sys),
    );
    let mut et = Table::new(
        "Extremes per combination and span (envelope over load patterns)",
        &[
            ("Combination", Align::Left),
            ("Part", Align::Left),
            (&format!("M+ [{ml}]"), Align::Right),
            (&format!("at [{sl}]"), Align::Right),
            (&format!("M− [{ml}]"), Align::Right),
            (&format!("at [{sl}]"), Align::Right),
            (&format!("|V| [{f}]"), Align::Right),
            (&format!("at [{sl}]"), Align::Right),
            (&format!("δ down [{dl}]"), Align::Right),
            (&format!("at [{sl}]"), Align::Right),
            (&format!("δ up [{dl}]"), Align::Right),
            (&format!("at [{sl}]"), Align::Right),
        ],
    );
    let dash = || "—".to_string();
    let pair = |v: Option<At>, show: Show| -> [String; 2] {
        match v {
            Some(a) => [show.num(a.value, sys), Show::Span.num(a.x_mm, sys)],
            None => [dash(), dash()],
        }
    };
    for e in &r.extremes {
        let mut row = vec![e.combination.clone(), e.part.clone()];
        row.extend(pair(e.sagging_nmm, Show::Moment));
        row.extend(pair(e.hogging_nmm, Show::Moment));
        row.push(Show::Force.num(e.shear_n.value.abs(), sys));
        row.push(Show::Span.num(e.shear_n.x_mm, sys));
        row.extend(pair(e.deflection_down_mm, Show::Deflection));
        // Deflection positive downward, as on the sheet: an upward
        // movement is negative.
        row.extend(pair(e.deflection_up_mm, Show::Deflection));
        et.row(row);
    }
    doc.table(et);
    if let Some(st) = &r.stations {
        let mut headers: Vec<(String, Align)> = vec![(format!("x [{sl}]"), Align::Right)];
        for c in &r.combinations {
            headers.push((format!("{} V [{f}]", c.combination), Align::Right));
            headers.push((format!("{} M [{ml}]", c.combination), Align::Right));
            headers.push((format!("{} δ [{dl}]", c.combination), Align::Right));
        }
        let hs: Vec<(&str, Align)> = headers.iter().map(|(h, a)| (h.as_str(), *a)).collect();
        let mut t = Table::new("Stations (every span loaded)", &hs);
        for s in st {
            let mut row = vec![Show::Span.num(s.x_mm, sys)];
            for (v, m, y) in &s.values {
                row.push(Show::Force.num(*v, sys));
                row.push(Show::Moment.num(*m, sys));
                row.push(
                    y.map(|y| Show::Deflection.num(y, sys))
                        .unwrap_or_else(|| "—".into()),
                );
            }
            t.row(row);
        }
        doc.table(t);
    }
    doc.list(
        "Sign conventions:",
        vec![
            "x from the left end; loads and deflections positive downward".into(),
            "M positive sagging (tension in the bottom fibre); reaction moments clockwise positive".into(),
            "deflection measured from the line joining the span's supports (an overhang: from its support), so a spring's settlement is not in it: the settlements are listed apart".into(),
            "δ down and δ up: the largest downward and the largest upward movement in each part, in the one convention (positive downward, so δ up is negative)".into(),
        ],
    );
    if !job.notes.is_empty() {
        doc.list("Notes:", job.notes.clone());
    }
    doc.caution(vec![
        "any section strength, stability or serviceability (use `check`)".into(),
    ]);
    doc
}
