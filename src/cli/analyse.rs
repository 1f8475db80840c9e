//! `beamsift analyse`: reactions and the extremes of moment, shear and
//! deflection, per combination and span, for a given section or E·I.

use super::Out;
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::beam::analysis;
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::report::{self, Align, Document, Table, member};
use beamsift::section::spec::{shape_from_pairs, split_pairs};
use beamsift::units::{self, Dim, Show};
use serde::Serialize;

pub const EXAMPLES: &str = "Examples:
  beamsift analyse --span 5m,5m --dead 2kN/m --live 3kN/m --E 200GPa --Ix 8356cm4
  beamsift analyse --job catalogs/demo-job.toml rolled-i d=300mm bf=150mm tf=10.7mm tw=7.1mm r=15mm
  beamsift analyse --job job.toml --Ix 120e6mm4 --stations --format csv";

#[derive(clap::Args, Debug)]
pub struct Args {
    #[command(flatten)]
    pub job: JobArgs,
    /// Second moment of area for deflections, when no section is given.
    #[arg(long = "Ix", value_name = "I")]
    pub ix: Option<String>,
    /// Also list V, M and δ at stations along the beam (all spans loaded).
    #[arg(long)]
    pub stations: bool,
    /// Optional section: shape family then key=value dimensions.
    #[arg(value_name = "SHAPE KEY=VALUE")]
    pub section: Vec<String>,
}

#[derive(Serialize)]
struct Analysed {
    title: String,
    #[serde(flatten)]
    analysis: analysis::Analysis,
    caution: &'static str,
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let job = a.job.load_for_analysis()?;
    if a.section.is_empty() {
        let sw = a.job.self_weight_flags();
        if !sw.is_empty() {
            return Err(Error::msg(format!(
                "{} set(s) the self-weight, which needs a section (its area): give a section after the options, or leave them out",
                sw.join(", ")
            )));
        }
    }
    let sys = out.units;
    let (ix, mass, section) = if let Some((fam, dims)) = a.section.split_first() {
        if a.ix.is_some() {
            return Err(Error::msg("give either a section or --Ix, not both"));
        }
        let shape = shape_from_pairs(fam, &split_pairs(dims)?)?;
        let p = shape.properties()?;
        (
            Some(p.ix),
            p.mass_per_length(job.material.density),
            Some(shape.describe(sys)),
        )
    } else {
        let ix =
            a.ix.as_deref()
                .map(|t| units::parse(t, Dim::SecondMoment).map_err(|e| e.in_field("--Ix")))
                .transpose()?;
        (ix, 0.0, None)
    };
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone())?;
    let d = &prep.demand;
    let w = prep.self_weight(mass);
    let ei = ix.map(|i| i * job.material.e);
    if ei.is_none() && !d.springs.is_empty() {
        return Err(Error::msg(
            "the beam rests on spring supports, whose forces depend on the section's E·I: give a section or --Ix",
        ));
    }
    let beam = &job.beam;
    let sect = d.section(w, ei.unwrap_or(1.0));
    let sw_case = beam.self_weight_case.filter(|_| job.criteria.self_weight);
    let result = Analysed {
        title: job.title.clone(),
        analysis: analysis::analyse(beam, d, &sect, sw_case, ei.is_some(), a.stations),
        caution: report::CAUTION,
    };
    let r = &result.analysis;
    // Document.
    let mut doc = Document::new(format!("Analysis of {}", job.title));
    for t in member::job_tables(&job, sys) {
        doc.table(t);
    }
    match (&section, ei) {
        (Some(s), _) => doc.para(format!(
            "Section {s}: self-weight {} added to the dead case.",
            Show::LineLoad.fmt(w, sys)
        )),
        (None, Some(_)) => doc.para("Deflections for the given Ix; no self-weight."),
        (None, None) => {
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
    let pair = |v: Option<beamsift::beam::analysis::At>, show: Show| -> [String; 2] {
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
        row.extend(pair(
            e.deflection_up_mm.map(|mut a| {
                a.value = -a.value;
                a
            }),
            Show::Deflection,
        ));
        et.row(row);
    }
    doc.table(et);
    if let Some(st) = &r.stations {
        let mut headers: Vec<(String, Align)> = vec![(format!("x [{sl}]"), Align::Right)];
        for c in &d.combos {
            headers.push((format!("{} V [{f}]", c.name), Align::Right));
            headers.push((format!("{} M [{ml}]", c.name), Align::Right));
            headers.push((format!("{} δ [{dl}]", c.name), Align::Right));
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
            "δ down and δ up: the largest downward and the largest upward movement in each part (δ up printed as a positive magnitude)".into(),
        ],
    );
    if !job.notes.is_empty() {
        doc.list("Notes:", job.notes.clone());
    }
    doc.caution(vec![
        "any section strength, stability or serviceability (use `check`)".into(),
    ]);
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}
