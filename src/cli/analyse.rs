//! `beamsift analyse`: reactions and the extremes of moment, shear and
//! deflection, per combination and span, for a given section or E·I.

use super::Out;
use super::jobargs::JobArgs;
use super::output::emit;
use beamsift::beam::demand::{Quantity, eval};
use beamsift::beam::model::ComboKind;
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::report::{self, Align, Document, Table, member};
use beamsift::section::spec::{shape_from_pairs, split_pairs};
use beamsift::units::{self, Dim, Show};
use serde::Serialize;

pub const EXAMPLES: &str = "Examples:
  beamsift analyse --span 5m,5m --dead 2kN/m --live 3kN/m --E 200GPa --Fb 165MPa --Ix 8356cm4
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
struct NodeReaction {
    /// mm from the left end.
    x: f64,
    support: String,
    /// Upward force, N.
    force: f64,
    /// Clockwise moment, N·mm.
    moment: f64,
}

#[derive(Serialize)]
struct CaseReactions {
    case: String,
    reactions: Vec<NodeReaction>,
}

#[derive(Serialize)]
struct ComboReactions {
    combination: String,
    /// (min, max) upward force at each node over the load patterns, N.
    reactions: Vec<(f64, f64)>,
}

#[derive(Serialize)]
struct PartExtremes {
    combination: String,
    part: String,
    m_max: f64,
    x_m_max: f64,
    m_min: f64,
    x_m_min: f64,
    v_abs_max: f64,
    x_v: f64,
    /// mm, when E·I is known.
    deflection: Option<f64>,
    x_deflection: f64,
}

#[derive(Serialize)]
struct Station {
    x: f64,
    /// Per combination: (V N, M N·mm, δ mm or null).
    values: Vec<(f64, f64, Option<f64>)>,
}

#[derive(Serialize)]
struct Analysis {
    title: String,
    /// N·mm², when known.
    ei: Option<f64>,
    /// N/mm added to the self-weight case.
    self_weight: f64,
    cases: Vec<CaseReactions>,
    combinations: Vec<ComboReactions>,
    extremes: Vec<PartExtremes>,
    stations: Option<Vec<Station>>,
    caution: &'static str,
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let job = a.job.load()?;
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
    let beam = &job.beam;
    let cases = beam
        .cases
        .iter()
        .enumerate()
        .map(|(ci, c)| {
            let r = &d.cases[ci];
            let sw = if Some(ci) == beam.self_weight_case {
                w
            } else {
                0.0
            };
            CaseReactions {
                case: c.name.clone(),
                reactions: (0..d.node_x.len())
                    .filter(|&n| beam.supports[n].restrains_vertical())
                    .map(|n| NodeReaction {
                        x: d.node_x[n],
                        support: beam.supports[n].name(),
                        force: r.reaction[n] + sw * d.unit_sw.reaction[n],
                        moment: r.reaction_moment[n] + sw * d.unit_sw.reaction_moment[n],
                    })
                    .collect(),
            }
        })
        .collect::<Vec<_>>();
    let combinations = d
        .combos
        .iter()
        .map(|c| ComboReactions {
            combination: c.name.clone(),
            reactions: d.reactions(c, w),
        })
        .collect::<Vec<_>>();
    let mut extremes = Vec::new();
    for c in &d.combos {
        for (k, st) in d.stretches.iter().enumerate() {
            let r = d.stretch_elements(k);
            let m = d.extremes(c, w, Quantity::Moment, r.clone());
            let v = d.extremes(c, w, Quantity::Shear, r.clone());
            let y = d.extremes(c, w, Quantity::Deflection, r);
            let (vv, xv) = v.abs_max();
            let (yy, xy) = y.abs_max();
            extremes.push(PartExtremes {
                combination: c.name.clone(),
                part: st.label.clone(),
                m_max: m.max,
                x_m_max: m.x_max,
                m_min: m.min,
                x_m_min: m.x_min,
                v_abs_max: vv,
                x_v: xv,
                deflection: ei.map(|ei| yy / ei),
                x_deflection: xy,
            });
        }
    }
    let stations = a.stations.then(|| {
        let mut v = Vec::new();
        for e in 0..d.len.len() {
            let last = e + 1 == d.len.len();
            for k in 0..=(if last { 4 } else { 3 }) {
                let s = d.len[e] * k as f64 / 4.0;
                let values = d
                    .combos
                    .iter()
                    .map(|c| {
                        let mut coef = d.base_coef(c, w, e);
                        for p in &c.patterns {
                            for (a, b) in coef.iter_mut().zip(p.elems[e].iter()) {
                                *a += b;
                            }
                        }
                        (
                            eval(Quantity::Shear, &coef, s),
                            eval(Quantity::Moment, &coef, s),
                            ei.map(|ei| eval(Quantity::Deflection, &coef, s) / ei),
                        )
                    })
                    .collect();
                v.push(Station {
                    x: d.mesh.x[e] + s,
                    values,
                });
            }
        }
        v
    });
    let result = Analysis {
        title: job.title.clone(),
        ei,
        self_weight: w,
        cases,
        combinations,
        extremes,
        stations,
        caution: report::CAUTION,
    };
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
    for c in &result.cases {
        for r in &c.reactions {
            rt.row(vec![
                c.case.clone(),
                r.support.clone(),
                Show::Span.fmt(r.x, sys),
                Show::Force.num(r.force, sys),
                if r.moment != 0.0 {
                    Show::Moment.num(r.moment, sys)
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
    for c in &result.combinations {
        for (n, (lo, hi)) in c.reactions.iter().enumerate() {
            if !beam.supports[n].restrains_vertical() {
                continue;
            }
            ct.row(vec![
                c.combination.clone(),
                beam.supports[n].name(),
                Show::Span.fmt(d.node_x[n], sys),
                Show::Force.num(*lo, sys),
                Show::Force.num(*hi, sys),
            ]);
        }
    }
    doc.table(ct);
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
            (&format!("δ [{dl}]"), Align::Right),
            (&format!("at [{sl}]"), Align::Right),
        ],
    );
    for (i, e) in result.extremes.iter().enumerate() {
        let combo = &d.combos[i / d.stretches.len()];
        let show_d = combo.kind == ComboKind::Service || ei.is_some();
        et.row(vec![
            e.combination.clone(),
            e.part.clone(),
            Show::Moment.num(e.m_max.max(0.0), sys),
            if e.m_max > 0.0 {
                Show::Span.num(e.x_m_max, sys)
            } else {
                "—".into()
            },
            Show::Moment.num(e.m_min.min(0.0), sys),
            if e.m_min < 0.0 {
                Show::Span.num(e.x_m_min, sys)
            } else {
                "—".into()
            },
            Show::Force.num(e.v_abs_max.abs(), sys),
            Show::Span.num(e.x_v, sys),
            match (e.deflection, show_d) {
                (Some(y), true) => Show::Deflection.num(y, sys),
                _ => "—".into(),
            },
            if e.deflection.is_some() {
                Show::Span.num(e.x_deflection, sys)
            } else {
                "—".into()
            },
        ]);
    }
    doc.table(et);
    if let Some(st) = &result.stations {
        let mut headers: Vec<(String, Align)> = vec![(format!("x [{sl}]"), Align::Right)];
        for c in &d.combos {
            headers.push((format!("{} V [{f}]", c.name), Align::Right));
            headers.push((format!("{} M [{ml}]", c.name), Align::Right));
            headers.push((format!("{} δ [{dl}]", c.name), Align::Right));
        }
        let hs: Vec<(&str, Align)> = headers.iter().map(|(h, a)| (h.as_str(), *a)).collect();
        let mut t = Table::new("Stations (every span loaded)", &hs);
        for s in st {
            let mut row = vec![Show::Span.num(s.x, sys)];
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
            "deflection measured from the line joining the span's supports (an overhang: from its support)".into(),
        ],
    );
    doc.caution(vec![
        "any section strength, stability or serviceability (use `check`)".into(),
    ]);
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(0)
}
