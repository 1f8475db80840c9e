//! The document of a sized schedule: members, the bill of quantities and
//! the rationalised plan (computed in `search::batch`).

use super::select::{Legend, finish_doc};
use super::{Align, Block, Document, Table};
use crate::catalog::Prices;
use crate::search::Counts;
use crate::search::batch::{BoqLine, Costs, Cutting, Schedule};
use crate::units::{self, Show, System};

/// How a schedule is shown.
pub struct BatchView<'a> {
    pub sys: System,
    pub schedule: &'a str,
    pub template: &'a str,
    pub material: &'a str,
    pub rows: usize,
    pub counts: &'a Counts,
    pub skip_bad_rows: bool,
    pub by_cost: bool,
    pub rationalising: bool,
    pub prices: &'a Prices,
    pub excluded: Vec<String>,
    /// The template's title block (`[project]`), shown where given.
    pub project: &'a crate::job::Project,
}

pub fn bill_table(title: &str, bill: &[BoqLine], sys: System, cur: &Prices) -> Table {
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
            (&format!("Net cost [{}]", cur.label()), Align::Right),
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
                .unwrap_or_else(|| cur.missing().into()),
            l.marks.join(", "),
        ]);
    }
    let (m, c) = crate::search::batch::totals(bill);
    t.row(vec![
        "Total".into(),
        bill.iter().map(|l| l.pieces).sum::<u32>().to_string(),
        Show::Span.num(bill.iter().map(|l| l.total_length).sum(), sys),
        format!("{:.0}", m * wf),
        c.map(|c| format!("{c:.2}"))
            .unwrap_or_else(|| cur.missing().into()),
        String::new(),
    ]);
    t
}

/// The document of a sized schedule.
pub fn document(s: &Schedule, v: &BatchView<'_>) -> Document {
    let sys = v.sys;
    let objective = if v.by_cost { "cost" } else { "mass" };
    let mut doc = Document::new(format!("Schedule {}", v.schedule));
    if !v.project.is_empty() {
        doc.blocks
            .push(Block::TitleBlock(super::calc::title_block(v.project)));
    }
    doc.para(format!(
        "{} member mark(s) sized against {} section(s){}{}; template {} ({}).",
        s.members.len(),
        v.rows,
        if v.counts.filtered > 0 {
            format!(" ({} row(s) left out by the filters)", v.counts.filtered)
        } else {
            String::new()
        },
        if v.skip_bad_rows {
            format!(", {} bad row(s) skipped", v.counts.bad)
        } else {
            String::new()
        },
        v.template,
        v.material
    ));
    let mut legend = Legend::default();
    let mut t = Table::new(
        if v.by_cost {
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
    for m in &s.members {
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
    if let Some(m) = s.members.iter().find(|m| m.result.lighter_not_verified > 0) {
        doc.list(
            format!(
                "Lighter sections that are not verified were not chosen (a limit state that applies could not be evaluated), e.g. for {}:",
                m.result.mark
            ),
            m.result.not_verified_reasons.clone(),
        );
    }
    doc.table(bill_table("Bill of quantities", &s.bill, sys, v.prices));
    if let Some(r) = &s.rationalised {
        doc.heading(format!(
            "Rationalised to at most {} section size(s) (least total {})",
            r.k, objective
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
            v.prices,
        ));
        doc.para(if r.plan.exact {
            format!(
                "Exact optimum (branch and bound completed). It costs {:.1} % more {} than sizing every member on its own.",
                100.0 * r.plan.gap,
                objective
            )
        } else {
            format!(
                "Heuristic (greedy with swaps; the exact search exceeded its budget): at most {:.1} % above the optimum, measured against the unconstrained lower bound.",
                100.0 * r.plan.gap
            )
        });
    }
    if let Some(c) = &s.cutting {
        cutting(&mut doc, c, sys);
    }
    match &s.costs {
        Some(c) => costs(&mut doc, c, sys, v.prices),
        None => {
            if let Some(n) = v.prices.note() {
                doc.para(n);
            }
        }
    }
    if !s.not_sized.is_empty() {
        doc.para(format!(
            "No section in the catalogue passes: {}. Check these members with `beamsift select` to see the nearest misses{}.",
            s.not_sized.join(", "),
            if v.rationalising { " (rationalisation needs every member sized)" } else { "" }
        ));
    }
    finish_doc(&mut doc, &v.excluded, &s.assumptions, &s.notes, legend);
    doc
}

/// The cost of each mark with the wastage and allowances, the formula
/// and the totals.
fn costs(doc: &mut Document, c: &Costs, sys: System, prices: &Prices) {
    let cur = prices.label();
    let span = Show::Span.label(sys);
    let mut t = Table::new(
        format!(
            "Costs per mark{}",
            if c.rationalised {
                " (rationalised sections)"
            } else {
                ""
            }
        ),
        &[
            ("Mark", Align::Left),
            ("Section", Align::Left),
            ("Count", Align::Right),
            (&format!("Length [{span}]"), Align::Right),
            (&format!("Unit cost [{}]", prices.per(span)), Align::Right),
            (&format!("Net cost [{cur}]"), Align::Right),
            (&format!("Line cost [{cur}]"), Align::Right),
        ],
    );
    let money = |v: Option<f64>| v.map(|x| format!("{x:.2}")).unwrap_or_else(|| "—".into());
    for m in &c.marks {
        t.row(vec![
            m.mark.clone(),
            m.section.clone(),
            m.count.to_string(),
            Show::Span.num(m.length, sys),
            m.unit_cost
                .map(|u| format!("{:.2}", super::select::per_len(u, sys)))
                .unwrap_or_else(|| "—".into()),
            money(m.net_cost),
            money(m.line_cost),
        ]);
    }
    t.row(vec![
        "Total".into(),
        String::new(),
        c.marks.iter().map(|m| m.count).sum::<u32>().to_string(),
        String::new(),
        String::new(),
        money(c.net_total),
        money(c.total),
    ]);
    doc.table(t);
    let mut allow: Vec<String> = c
        .allowances
        .iter()
        .map(|a| format!("{} {} %", a.name, units::fmt_num(a.percent)))
        .collect();
    if allow.is_empty() {
        allow.push("none".into());
    }
    let mut p = format!(
        "{} (wastage {} %; allowances: {}; factor {:.4}). Masses in the bill are net, without wastage.",
        c.formula,
        units::fmt_num(c.wastage),
        allow.join(", "),
        c.factor
    );
    if let Some(n) = prices.note() {
        p.push(' ');
        p.push_str(&n);
    }
    doc.para(p);
}

/// The bars bought per section, their offcuts and waste, and the members
/// that need a splice.
fn cutting(doc: &mut Document, c: &Cutting, sys: System) {
    let (w, wf) = if sys == System::Si {
        ("kg", 1.0)
    } else {
        ("lb", 1.0 / units::KG_PER_LB)
    };
    let span = Show::Span.label(sys);
    // Each stock length with its unit (feet-inches carry their own marks).
    let stock: Vec<String> = c
        .stock_lengths
        .iter()
        .map(|&l| Show::Span.fmt(l, sys))
        .collect();
    let mut t = Table::new(
        format!(
            "Cutting from stock bars ({}; kerf {} per piece{})",
            stock.join(", "),
            Show::Dimension.fmt(c.kerf, sys),
            if c.rationalised {
                "; rationalised sections"
            } else {
                ""
            }
        ),
        &[
            ("Section", Align::Left),
            (&format!("Bars bought [count × {span}]"), Align::Left),
            (&format!("Bought [{span}]"), Align::Right),
            (&format!("Cut [{span}]"), Align::Right),
            (&format!("Waste [{span}]"), Align::Right),
            (&format!("Waste [{w}]"), Align::Right),
            ("Waste [%]", Align::Right),
            ("Plan", Align::Left),
            ("Needs a splice", Align::Left),
        ],
    );
    for s in &c.sections {
        t.row(vec![
            s.section.clone(),
            s.bars
                .iter()
                .map(|(l, n)| format!("{n} × {}", Show::Span.num(*l, sys)))
                .collect::<Vec<_>>()
                .join(", "),
            Show::Span.num(s.plan.bought, sys),
            Show::Span.num(s.plan.used, sys),
            Show::Span.num(s.plan.waste(), sys),
            format!("{:.0}", s.waste_mass * wf),
            format!("{:.1}", 100.0 * s.plan.waste_fraction()),
            if s.plan.exact {
                "least length (exact)".into()
            } else {
                "first-fit decreasing".into()
            },
            if s.too_long.is_empty() {
                "—".into()
            } else {
                s.too_long.join(", ")
            },
        ]);
    }
    doc.table(t);
    doc.para(
        "Each piece uses its length plus one kerf; offcuts are counted as waste. Up to 10 pieces per section the plan buys the least total length (exhaustive search); beyond that first-fit decreasing (with one stock length at most 11/9 × the optimum + 6/9 bars).".to_string(),
    );
    let long: Vec<String> = c
        .sections
        .iter()
        .filter(|s| !s.too_long.is_empty())
        .map(|s| format!("{} ({})", s.too_long.join(", "), s.section))
        .collect();
    if !long.is_empty() {
        doc.para(format!(
            "PROBLEM: longer than every stock length less the kerf, not cut and not in the bars bought: {}. These need a splice (design it and check it) or a special length.",
            long.join("; ")
        ));
    }
}

/// The bill of quantities as a data table (a "Total" row last, as in the
/// document).
fn bill_data(
    key: &'static str,
    title: &str,
    bill: &[BoqLine],
    sys: System,
    cur: &Prices,
) -> super::data::DataTable {
    use super::data::{DataTable, Value};
    let (w, wf) = if sys == System::Si {
        ("kg", 1.0)
    } else {
        ("lb", 1.0 / units::KG_PER_LB)
    };
    let mut t = DataTable::new(
        key,
        title,
        vec![
            "Section".into(),
            "Pieces".into(),
            format!("Total length [{}]", Show::Span.label(sys)),
            format!("Total mass [{w}]"),
            format!("Total cost [{}]", cur.label()),
            "Marks".into(),
        ],
    );
    for l in bill {
        t.row(vec![
            Value::text(l.section.clone()),
            Value::Num(l.pieces as f64),
            Value::Num(Show::Span.value(l.total_length, sys)),
            Value::Num(l.total_mass * wf),
            Value::opt(l.total_cost),
            Value::text(l.marks.join(", ")),
        ]);
    }
    let (m, c) = crate::search::batch::totals(bill);
    t.row(vec![
        Value::text("Total"),
        Value::Num(bill.iter().map(|l| l.pieces as f64).sum()),
        Value::Num(Show::Span.value(bill.iter().map(|l| l.total_length).sum(), sys)),
        Value::Num(m * wf),
        Value::opt(c),
        Value::Empty,
    ]);
    t
}

/// The data tables of a sized schedule: members, the bill of quantities,
/// and (when asked for) the rationalised plan and its bill, the cutting
/// from stock bars and the bars bought.
pub fn data(s: &Schedule, v: &BatchView<'_>, doc: &Document) -> super::data::DataSet {
    use super::data::{DataTable, Value};
    // Spreadsheet cells are numbers: lengths as decimals.
    let sys = v.sys.decimal();
    let mut members = DataTable::new(
        "members",
        if v.by_cost {
            "Members (cheapest passing section each)"
        } else {
            "Members (lightest passing section each)"
        },
        vec![
            "Mark".into(),
            "Count".into(),
            format!("Length [{}]", Show::Span.label(sys)),
            "Section".into(),
            format!("Mass [{}]", Show::Mass.label(sys)),
            "Utilisation".into(),
            "Governed by".into(),
            "Passing sections".into(),
            "Lighter, not verified".into(),
            "Not checked".into(),
        ],
    );
    for m in &s.members {
        members.row(vec![
            Value::text(m.result.mark.clone()),
            Value::Num(m.result.count as f64),
            Value::Num(Show::Span.value(m.result.length, sys)),
            Value::text(m.section.clone().unwrap_or_else(|| "NONE PASSES".into())),
            Value::opt(m.mass.map(|x| Show::Mass.value(x, sys))),
            Value::opt(m.result.utilisation),
            Value::text(m.result.governing.clone().unwrap_or_default()),
            Value::Num(m.result.passing.len() as f64),
            Value::Num(m.result.lighter_not_verified as f64),
            Value::text(m.result.not_checked.join("; ")),
        ]);
    }
    let mut tables = vec![
        members,
        bill_data("bill", "Bill of quantities", &s.bill, sys, v.prices),
    ];
    if let Some(r) = &s.rationalised {
        let mut t = DataTable::new(
            "rationalised",
            format!("Rationalised to at most {} section size(s)", r.k),
            vec!["Mark".into(), "Section".into()],
        );
        for (m, sec) in &r.members {
            t.row(vec![Value::text(m.clone()), Value::text(sec.clone())]);
        }
        tables.push(t);
        tables.push(bill_data(
            "rationalised-bill",
            "Bill of quantities, rationalised",
            &r.bill,
            sys,
            v.prices,
        ));
    }
    if let Some(c) = &s.cutting {
        let (w, wf) = if sys == System::Si {
            ("kg", 1.0)
        } else {
            ("lb", 1.0 / units::KG_PER_LB)
        };
        let span = Show::Span.label(sys);
        let mut t = DataTable::new(
            "cutting",
            format!(
                "Cutting from stock bars (kerf {} per piece{})",
                Show::Dimension.fmt(c.kerf, sys),
                if c.rationalised {
                    "; rationalised sections"
                } else {
                    ""
                }
            ),
            vec![
                "Section".into(),
                format!("Bought [{span}]"),
                format!("Cut [{span}]"),
                format!("Waste [{span}]"),
                format!("Waste [{w}]"),
                "Waste [%]".into(),
                "Plan".into(),
                "Needs a splice".into(),
            ],
        );
        let mut bars = DataTable::new(
            "bars",
            "Stock bars bought per section",
            vec![
                "Section".into(),
                format!("Stock length [{span}]"),
                "Bars".into(),
            ],
        );
        for sc in &c.sections {
            t.row(vec![
                Value::text(sc.section.clone()),
                Value::Num(Show::Span.value(sc.plan.bought, sys)),
                Value::Num(Show::Span.value(sc.plan.used, sys)),
                Value::Num(Show::Span.value(sc.plan.waste(), sys)),
                Value::Num(sc.waste_mass * wf),
                Value::Num(100.0 * sc.plan.waste_fraction()),
                Value::text(if sc.plan.exact {
                    "least length (exact)"
                } else {
                    "first-fit decreasing"
                }),
                Value::text(sc.too_long.join(", ")),
            ]);
            for (l, n) in &sc.bars {
                bars.row(vec![
                    Value::text(sc.section.clone()),
                    Value::Num(Show::Span.value(*l, sys)),
                    Value::Num(*n as f64),
                ]);
            }
        }
        tables.push(t);
        tables.push(bars);
    }
    super::data::DataSet::new(doc, tables)
}
