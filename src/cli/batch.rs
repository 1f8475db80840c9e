//! `beamsift batch`: size a member schedule against a catalogue, with a
//! bill of quantities and optional rationalisation to k sizes.

use super::catargs::CatalogArgs;
use super::output::emit;
use super::{EXIT_FAILS, Out};
use beamsift::catalog::Materials;
use beamsift::error::{Error, Result};
use beamsift::job;
use beamsift::report::{self, Align, Document, Table};
use beamsift::search::batch::{self, BoqLine, MemberResult};
use beamsift::search::{self, rationalise::Plan};
use beamsift::units::{self, Show, System};
use serde::Serialize;
use std::path::PathBuf;

pub const EXAMPLES: &str = "Examples:
  beamsift batch --schedule catalogs/demo-schedule.csv --job catalogs/demo-job.toml --catalog catalogs/demo-steel.csv
  beamsift batch --schedule catalogs/demo-schedule.csv --job catalogs/demo-job.toml -c catalogs/demo-steel.csv --max-sizes 3

The job file is a template: its material, grades, lateral bracing and combination
presets apply to every member; its beam and loads are not used.";

#[derive(clap::Args, Debug)]
pub struct Args {
    /// Member schedule (CSV): mark, count, spans [m], supports, dead/live/snow [kN/m], ...
    #[arg(long, value_name = "FILE")]
    pub schedule: PathBuf,
    /// Template job file: material, grades, bracing, presets.
    #[arg(long, short = 'j', value_name = "FILE")]
    pub job: PathBuf,
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Use at most this many distinct sections across the schedule (1–10,000).
    #[arg(long = "max-sizes", value_name = "K", value_parser = super::count_in::<1, 10_000>)]
    pub max_sizes: Option<usize>,
    /// Rationalise for least total mass or least total cost.
    #[arg(long, value_parser = ["mass", "cost"], default_value = "mass")]
    pub objective: String,
    /// Deflection limit under variable load, for members without a service
    /// preset (refused when the template has one) [default: L/360].
    #[arg(long = "limit-live")]
    pub limit_live: Option<String>,
    /// Deflection limit under total load, likewise [default: L/240].
    #[arg(long = "limit-total")]
    pub limit_total: Option<String>,
}

#[derive(Serialize)]
struct MemberOut {
    #[serde(flatten)]
    result: MemberResult,
    section: Option<String>,
    /// kg/m.
    mass: Option<f64>,
}

#[derive(Serialize)]
struct BatchResult {
    members: Vec<MemberOut>,
    bill: Vec<BoqLine>,
    total_mass: f64,
    total_cost: Option<f64>,
    rationalised: Option<Rationalised>,
    not_sized: Vec<String>,
    currency: String,
    caution: &'static str,
}

#[derive(Serialize)]
struct Rationalised {
    k: usize,
    plan: Plan,
    members: Vec<(String, String)>,
    bill: Vec<BoqLine>,
    total_mass: f64,
    total_cost: Option<f64>,
}

fn totals(bill: &[BoqLine]) -> (f64, Option<f64>) {
    let m = bill.iter().map(|l| l.total_mass).sum();
    let c = bill
        .iter()
        .try_fold(0.0, |acc, l| l.total_cost.map(|c| acc + c));
    (m, c)
}

fn bill_table(title: &str, bill: &[BoqLine], sys: System, cur: &str) -> Table {
    let w = if sys == System::Si { "kg" } else { "lb" };
    let wf = if sys == System::Si {
        1.0
    } else {
        1.0 / units::KG_PER_LB
    };
    let mut t = Table::new(
        title,
        &[
            ("Section", Align::Left),
            ("Pieces", Align::Right),
            (
                &format!("Total length [{}]", Show::Span.label(sys)),
                Align::Right,
            ),
            (&format!("Total mass [{w}]"), Align::Right),
            (&format!("Total cost [{cur}]"), Align::Right),
            ("Marks", Align::Left),
        ],
    );
    for l in bill {
        t.row(vec![
            l.section.clone(),
            l.pieces.to_string(),
            Show::Span.num(l.total_length, sys),
            format!("{:.0}", l.total_mass * wf),
            l.total_cost
                .map(|c| format!("{c:.2}"))
                .unwrap_or_else(|| "—".into()),
            l.marks.join(", "),
        ]);
    }
    let (m, c) = totals(bill);
    t.row(vec![
        "Total".into(),
        bill.iter().map(|l| l.pieces).sum::<u32>().to_string(),
        Show::Span.num(bill.iter().map(|l| l.total_length).sum(), sys),
        format!("{:.0}", m * wf),
        c.map(|c| format!("{c:.2}")).unwrap_or_else(|| "—".into()),
        String::new(),
    ]);
    t
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let sys = out.units;
    let shown = a.job.display().to_string();
    let text = beamsift::job::read_text(&a.job, &shown)?;
    let template = job::from_toml(&text, &shown)?;
    if template.presets.1.is_some() && (a.limit_live.is_some() || a.limit_total.is_some()) {
        return Err(Error::msg(format!(
            "the template's [presets] service = \"{}\" sets the deflection limits: remove it from {shown}, or leave out --limit-live/--limit-total",
            template.presets.1.as_deref().unwrap_or("")
        )));
    }
    let own_service = template
        .beam
        .combinations
        .iter()
        .any(|c| c.source.is_none() && c.kind == beamsift::beam::ComboKind::Service);
    if own_service && (a.limit_live.is_some() || a.limit_total.is_some()) {
        return Err(Error::msg(format!(
            "the template {shown} has its own service combinations, which set the deflection limits: leave out --limit-live/--limit-total, or remove them from the template"
        )));
    }
    let n_live = job::parse_ratio(a.limit_live.as_deref().unwrap_or("L/360"))
        .map_err(|e| e.in_field("--limit-live"))?;
    let n_total = job::parse_ratio(a.limit_total.as_deref().unwrap_or("L/240"))
        .map_err(|e| e.in_field("--limit-total"))?;
    let sched_shown = a.schedule.display().to_string();
    let f = std::fs::File::open(&a.schedule).map_err(|e| Error::io(&sched_shown, e))?;
    let members = batch::read_schedule(
        std::io::BufReader::new(f),
        &sched_shown,
        &template,
        n_live,
        n_total,
    )?;
    a.cat.setup_threads()?;
    let (cats, _) = a.cat.open()?;
    let currencies: Vec<String> = cats
        .iter()
        .filter_map(|c| c.schema.currency.clone())
        .collect();
    let cur = super::catargs::currency(&template, &currencies);
    let mats = Materials {
        base: &template.material,
        grades: &template.grades,
    };
    let filters = a.cat.filters_for(&template)?;
    let (rows, counts, _skipped) = search::load_rows(cats, &mats, a.cat.skip_bad_rows, &filters)?;
    let results = batch::size(&members, &rows, &mats, &filters, a.objective == "cost")?;
    let choice: Vec<Option<usize>> = results.iter().map(|r| r.chosen).collect();
    let bill = batch::bill(&results, &choice, &rows);
    let (total_mass, total_cost) = totals(&bill);
    let not_sized: Vec<String> = results
        .iter()
        .filter(|r| r.chosen.is_none())
        .map(|r| r.mark.clone())
        .collect();
    let rationalised = match a.max_sizes {
        Some(0) => return Err(Error::msg("--max-sizes must be at least 1")),
        Some(k) if not_sized.is_empty() => {
            batch::rationalise_schedule(&results, &rows, k, a.objective == "cost").map(|plan| {
                let members = results
                    .iter()
                    .zip(&plan.choice)
                    .map(|(r, &j)| (r.mark.clone(), rows[j].name.clone()))
                    .collect();
                let ch: Vec<Option<usize>> = plan.choice.iter().map(|&j| Some(j)).collect();
                let bill = batch::bill(&results, &ch, &rows);
                let (m, c) = totals(&bill);
                Rationalised {
                    k,
                    plan,
                    members,
                    bill,
                    total_mass: m,
                    total_cost: c,
                }
            })
        }
        _ => None,
    };
    let members_out: Vec<MemberOut> = results
        .iter()
        .map(|r| MemberOut {
            section: r.chosen.map(|j| rows[j].name.clone()),
            mass: r.chosen.map(|j| rows[j].mass),
            result: r.clone(),
        })
        .collect();
    let result = BatchResult {
        members: members_out,
        bill,
        total_mass,
        total_cost,
        rationalised,
        not_sized: not_sized.clone(),
        currency: cur.clone(),
        caution: report::CAUTION,
    };
    let mut doc = Document::new(format!("Schedule {}", sched_shown));
    doc.para(format!(
        "{} member mark(s) sized against {} section(s){}{}; template {} ({}).",
        members.len(),
        rows.len(),
        if counts.filtered > 0 {
            format!(" ({} row(s) left out by the filters)", counts.filtered)
        } else {
            String::new()
        },
        if a.cat.skip_bad_rows {
            format!(", {} bad row(s) skipped", counts.bad)
        } else {
            String::new()
        },
        shown,
        template.material.name
    ));
    let mut legend = beamsift::report::select::Legend::default();
    let mut t = Table::new(
        if a.objective == "cost" {
            "Members (cheapest passing section each)"
        } else {
            "Members (lightest passing section each)"
        },
        &[
            ("Mark", Align::Left),
            ("Count", Align::Right),
            (&format!("Length [{}]", Show::Span.label(sys)), Align::Right),
            ("Section", Align::Left),
            (&format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
            ("Utilisation", Align::Right),
            ("Governed by", Align::Left),
            ("Passing sections", Align::Right),
            ("Lighter, not verified", Align::Right),
            ("Not checked", Align::Left),
        ],
    );
    for m in &result.members {
        t.row(vec![
            m.result.mark.clone(),
            m.result.count.to_string(),
            Show::Span.num(m.result.length, sys),
            m.section.clone().unwrap_or_else(|| "NONE PASSES".into()),
            m.mass
                .map(|v| Show::Mass.fixed(v, sys, 1))
                .unwrap_or_else(|| "—".into()),
            m.result
                .utilisation
                .map(|u| format!("{u:.3}"))
                .unwrap_or_else(|| "—".into()),
            m.result.governing.clone().unwrap_or_default(),
            m.result.passing.len().to_string(),
            m.result.lighter_not_verified.to_string(),
            legend.keys(&m.result.not_checked),
        ]);
    }
    doc.table(t);
    if let Some(m) = result
        .members
        .iter()
        .find(|m| m.result.lighter_not_verified > 0)
    {
        doc.list(
            format!(
                "Lighter sections that are not verified were not chosen (a limit state that applies could not be evaluated), e.g. for {}:",
                m.result.mark
            ),
            m.result.not_verified_reasons.clone(),
        );
    }
    doc.table(bill_table("Bill of quantities", &result.bill, sys, &cur));
    if let Some(r) = &result.rationalised {
        doc.heading(format!(
            "Rationalised to at most {} section size(s) (least total {})",
            r.k, a.objective
        ));
        let mut t = Table::new("", &[("Mark", Align::Left), ("Section", Align::Left)]);
        for (m, s) in &r.members {
            t.row(vec![m.clone(), s.clone()]);
        }
        doc.table(t);
        doc.table(bill_table(
            "Bill of quantities, rationalised",
            &r.bill,
            sys,
            &cur,
        ));
        doc.para(if r.plan.exact {
            format!(
                "Exact optimum (branch and bound completed). It costs {:.1} % more {} than sizing every member on its own.",
                100.0 * r.plan.gap,
                a.objective
            )
        } else {
            format!(
                "Heuristic (greedy with swaps; the exact search exceeded its budget): at most {:.1} % above the optimum, measured against the unconstrained lower bound.",
                100.0 * r.plan.gap
            )
        });
    }
    if !not_sized.is_empty() {
        doc.para(format!(
            "No section in the catalogue passes: {}. Check these members with `beamsift select` to see the nearest misses{}.",
            not_sized.join(", "),
            if a.max_sizes.is_some() { " (rationalisation needs every member sized)" } else { "" }
        ));
    }
    // Each distinct assumption or note once, with the marks it concerns.
    let grouped = |pick: &dyn Fn(&MemberResult) -> &Vec<String>| -> Vec<String> {
        let mut out: Vec<(String, Vec<String>)> = Vec::new();
        for m in &results {
            for x in pick(m) {
                match out.iter_mut().find(|(t, _)| t == x) {
                    Some((_, marks)) => marks.push(m.mark.clone()),
                    None => out.push((x.clone(), vec![m.mark.clone()])),
                }
            }
        }
        out.into_iter()
            .map(|(t, marks)| {
                if marks.len() == results.len() {
                    t
                } else {
                    format!("{}: {t}", marks.join(", "))
                }
            })
            .collect()
    };
    let assumptions = grouped(&|m| &m.assumptions);
    let notes = grouped(&|m| &m.notes);
    beamsift::report::select::finish_doc(
        &mut doc,
        &template.criteria.exclude.list(),
        &assumptions,
        &notes,
        legend,
    );
    emit(out, &report::render(out.format, &result, &doc))?;
    Ok(if not_sized.is_empty() { 0 } else { EXIT_FAILS })
}
