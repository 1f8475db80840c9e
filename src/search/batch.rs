//! Member schedules: size every member of a schedule against one
//! catalogue, total a bill of quantities, and optionally rationalise to at
//! most k distinct sections. The schedule format is in [`super::schedule`].

use super::cutting::{CutPlan, cut};
use super::rationalise::{Plan, rationalise};
pub use super::schedule::{Member, read_schedule, read_schedule_at};
use super::{Candidate, Filters};
use crate::catalog::Materials;
use crate::catalog::Prices;
use crate::check::{Prepared, SectionInput};
use crate::error::{Error, Location, Result};
use crate::units::{self, Dim};
use rayon::prelude::*;
use serde::Serialize;

/// The result for one member.
#[derive(Clone, Debug, Serialize)]
pub struct MemberResult {
    pub mark: String,
    pub count: u32,
    /// mm.
    pub length: f64,
    /// Chosen section (index into the catalogue rows), lightest passing.
    pub chosen: Option<usize>,
    pub utilisation: Option<f64>,
    pub governing: Option<String>,
    /// Indices of every passing row, lightest first.
    #[serde(skip)]
    pub passing: Vec<usize>,
    /// Utilisation of each passing row (same order).
    #[serde(skip)]
    pub utilisations: Vec<f64>,
    /// Rows lighter than the chosen one that are not verified (never
    /// chosen), and the reasons of the lightest of them.
    pub lighter_not_verified: u64,
    pub not_verified_reasons: Vec<String>,
    /// What beamsift does not check for the chosen section.
    pub not_checked: Vec<String>,
    /// The member's assumptions (bracing, effective lengths, load height).
    pub assumptions: Vec<String>,
    /// How the member's job was interpreted.
    pub notes: Vec<String>,
}

/// A line of the bill of quantities.
#[derive(Clone, Debug, Serialize)]
pub struct BoqLine {
    pub section: String,
    pub pieces: u32,
    /// mm.
    pub total_length: f64,
    /// kg.
    pub total_mass: f64,
    /// Currency.
    pub total_cost: Option<f64>,
    pub marks: Vec<String>,
}

/// Size every member against the loaded catalogue rows (in parallel over
/// members): the lightest passing row, or with `by_cost` the cheapest
/// (rows without a price last; ties to the lighter). Rows are expected
/// sorted by mass (then name).
pub fn size(
    members: &[Member],
    rows: &[Candidate],
    mats: &Materials<'_>,
    filters: &Filters,
    by_cost: bool,
    sys: units::System,
) -> Result<Vec<MemberResult>> {
    members
        .par_iter()
        .map(|m| {
            let prep = Prepared::new(&m.job.beam, m.job.material.clone(), m.job.criteria.clone())
                .map_err(|e| e.in_field(&format!("member {}", m.mark)))?;
            // The member's material (its schedule grade, else the
            // template's) for rows that name no grade of their own.
            let mats = &Materials {
                base: &m.job.material,
                grades: mats.grades,
            };
            let mut passing = Vec::new();
            let mut utils = Vec::new();
            let mut best: Option<(usize, crate::check::Summary)> = None;
            let mut unverified: Vec<(usize, crate::check::Summary)> = Vec::new();
            for (j, r) in rows.iter().enumerate() {
                if m.max_depth.is_some_and(|d| r.depth > d * (1.0 + 1e-12))
                    || m.grade
                        .as_ref()
                        .is_some_and(|g| !r.grade.eq_ignore_ascii_case(g))
                    || filters
                        .max_depth
                        .is_some_and(|d| r.depth > d * (1.0 + 1e-12))
                {
                    continue;
                }
                let mat = mats.get(&r.material);
                let s = prep.check(SectionInput::new(&r.properties, r.mass).with_material(mat));
                if s.passes {
                    passing.push(j);
                    utils.push(s.utilisation);
                    let better = match &best {
                        None => true,
                        Some((b, _)) if by_cost => {
                            rows[j].cost.unwrap_or(f64::INFINITY)
                                < rows[*b].cost.unwrap_or(f64::INFINITY)
                        }
                        Some(_) => false,
                    };
                    if better {
                        best = Some((j, s));
                    }
                } else if s.verdict == crate::check::Verdict::NotVerified {
                    unverified.push((j, s));
                }
            }
            let lighter: Vec<&(usize, crate::check::Summary)> = unverified
                .iter()
                .filter(|(j, _)| {
                    best.as_ref()
                        .is_none_or(|(b, _)| rows[*j].mass < rows[*b].mass)
                })
                .collect();
            Ok(MemberResult {
                mark: m.mark.clone(),
                count: m.count,
                length: m.length,
                chosen: best.map(|b| b.0),
                utilisation: best.map(|b| b.1.utilisation),
                governing: best
                    .and_then(|b| b.1.governing)
                    .map(|g| format!("{} ({})", g.kind.label(), prep.demand.combos[g.combo].name)),
                passing,
                utilisations: utils,
                lighter_not_verified: lighter.len() as u64,
                not_verified_reasons: lighter
                    .first()
                    .map(|(_, s)| s.gaps.describe())
                    .unwrap_or_default(),
                not_checked: best
                    .as_ref()
                    .map(|(j, _)| {
                        prep.not_checked(&rows[*j].properties, Some(mats.get(&rows[*j].material)))
                    })
                    .unwrap_or_default(),
                assumptions: prep.assumptions_in(sys),
                notes: m.job.notes.clone(),
            })
        })
        .collect()
}

/// Group chosen sections into a bill of quantities (order: by section mass).
pub fn bill(
    results: &[MemberResult],
    choice: &[Option<usize>],
    rows: &[Candidate],
) -> Vec<BoqLine> {
    let mut lines: Vec<(usize, BoqLine)> = Vec::new();
    for (r, c) in results.iter().zip(choice) {
        let Some(j) = c else { continue };
        let row = &rows[*j];
        let len = r.length * r.count as f64;
        match lines.iter_mut().find(|(k, _)| k == j) {
            Some((_, l)) => {
                l.pieces += r.count;
                l.total_length += len;
                l.total_mass += row.mass * len / 1000.0;
                l.total_cost = l.total_cost.zip(row.cost).map(|(a, c)| a + c * len);
                l.marks.push(r.mark.clone());
            }
            None => lines.push((
                *j,
                BoqLine {
                    section: row.name.clone(),
                    pieces: r.count,
                    total_length: len,
                    total_mass: row.mass * len / 1000.0,
                    total_cost: row.cost.map(|c| c * len),
                    marks: vec![r.mark.clone()],
                },
            )),
        }
    }
    lines.sort_by_key(|a| a.0);
    lines.into_iter().map(|l| l.1).collect()
}

/// Rationalise a sized schedule to at most k sections by mass (or cost).
pub fn rationalise_schedule(
    results: &[MemberResult],
    rows: &[Candidate],
    k: usize,
    by_cost: bool,
) -> Option<Plan> {
    let q: Vec<f64> = results.iter().map(|r| r.length * r.count as f64).collect();
    let u: Vec<f64> = rows
        .iter()
        .map(|r| {
            if by_cost {
                r.cost.unwrap_or(f64::INFINITY)
            } else {
                r.mass / 1000.0
            }
        })
        .collect();
    let passing: Vec<Vec<usize>> = results.iter().map(|r| r.passing.clone()).collect();
    rationalise(&q, &u, &passing, k, 2_000_000)
}

/// A member's result with the section chosen for it.
#[derive(Clone, Debug, Serialize)]
pub struct MemberOut {
    #[serde(flatten)]
    pub result: MemberResult,
    pub section: Option<String>,
    /// kg/m.
    pub mass: Option<f64>,
    /// Currency per mm (the row's price turned into a cost per length).
    pub cost: Option<f64>,
}

/// The schedule limited to k section sizes.
#[derive(Clone, Debug, Serialize)]
pub struct Rationalised {
    pub k: usize,
    pub plan: Plan,
    /// (mark, section) per member.
    pub members: Vec<(String, String)>,
    pub bill: Vec<BoqLine>,
    /// kg.
    pub total_mass: f64,
    /// Currency; none when a chosen row has no price.
    pub total_cost: Option<f64>,
}

/// A sized schedule: every member, the bill of quantities, its totals and
/// the rationalised plan when one was asked for.
#[derive(Clone, Debug, Serialize)]
pub struct Schedule {
    pub members: Vec<MemberOut>,
    pub bill: Vec<BoqLine>,
    /// kg.
    pub total_mass: f64,
    /// Currency; none when a chosen row has no price.
    pub total_cost: Option<f64>,
    pub rationalised: Option<Rationalised>,
    /// The members cut from stock bars, per section (with `--stock-lengths`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub cutting: Option<Cutting>,
    /// The cost of each mark with the wastage and allowances (none when
    /// no row has a price).
    pub costs: Option<Costs>,
    /// Marks no catalogue row passes.
    pub not_sized: Vec<String>,
    /// Each distinct assumption once, prefixed with the marks it concerns
    /// unless it concerns every member.
    #[serde(skip)]
    pub assumptions: Vec<String>,
    /// Each distinct note once, likewise.
    #[serde(skip)]
    pub notes: Vec<String>,
}

/// Total mass (kg) and cost (none if any line has no price) of a bill.
pub fn totals(bill: &[BoqLine]) -> (f64, Option<f64>) {
    let m = bill.iter().map(|l| l.total_mass).sum();
    let c = bill
        .iter()
        .try_fold(0.0, |acc, l| l.total_cost.map(|c| acc + c));
    (m, c)
}

/// Each distinct text once, with the marks it concerns (none when it
/// concerns every member).
fn grouped(results: &[MemberResult], pick: &dyn Fn(&MemberResult) -> &Vec<String>) -> Vec<String> {
    let mut out: Vec<(String, Vec<String>)> = Vec::new();
    for m in results {
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
}

/// Size a schedule: every member against the rows, the bill and its
/// totals, with `max_sizes` the rationalisation to at most k sections
/// (only when every member is sized), the cutting from stock bars and the
/// cost of each mark (when the rows have prices).
pub fn schedule(
    members: &[Member],
    rows: &[Candidate],
    mats: &Materials<'_>,
    filters: &Filters,
    opts: &Options,
) -> Result<Schedule> {
    let mut s = sized(members, rows, mats, filters, opts)?;
    if let Some(stock) = &opts.stock_lengths {
        s.cutting = Some(cut_schedule(&s, stock, opts.kerf));
    }
    if rows.iter().any(|r| r.cost.is_some()) {
        s.costs = Some(costs(&s, opts));
    }
    Ok(s)
}

/// Members whose schedule grade no loaded catalogue row has are refused
/// before sizing (they would read as "none passes" though nothing was
/// checked), each at its schedule line (`at`: the schedule).
pub fn check_grades(members: &[Member], rows: &[Candidate], at: &Location) -> Result<()> {
    let mut errors = Vec::new();
    for m in members {
        if let Some(g) = &m.grade
            && !rows.iter().any(|r| r.grade.eq_ignore_ascii_case(g))
        {
            errors.push(Error::input(
                at.clone().with_line(m.line).with_field("grade"),
                format!(
                    "member '{}' is of grade {g}, but no catalogue row is (after the filters): give the rows a grade column naming it, or leave the member's grade empty",
                    m.mark
                ),
            ));
        }
    }
    match errors.len() {
        0 => Ok(()),
        1 => Err(errors.pop().unwrap()),
        _ => Err(Error::Many(errors)),
    }
}

/// The sizing, the bill and the rationalisation of [`schedule`].
fn sized(
    members: &[Member],
    rows: &[Candidate],
    mats: &Materials<'_>,
    filters: &Filters,
    opts: &Options,
) -> Result<Schedule> {
    let (by_cost, max_sizes) = (opts.by_cost, opts.max_sizes);
    let results = size(members, rows, mats, filters, by_cost, opts.units)?;
    let choice: Vec<Option<usize>> = results.iter().map(|r| r.chosen).collect();
    let bill = bill(&results, &choice, rows);
    let (total_mass, total_cost) = totals(&bill);
    let not_sized: Vec<String> = results
        .iter()
        .filter(|r| r.chosen.is_none())
        .map(|r| r.mark.clone())
        .collect();
    let rationalised = match max_sizes {
        Some(k) if not_sized.is_empty() => {
            rationalise_schedule(&results, rows, k, by_cost).map(|plan| {
                let members = results
                    .iter()
                    .zip(&plan.choice)
                    .map(|(r, &j)| (r.mark.clone(), rows[j].name.clone()))
                    .collect();
                let ch: Vec<Option<usize>> = plan.choice.iter().map(|&j| Some(j)).collect();
                let bill = self::bill(&results, &ch, rows);
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
    let assumptions = grouped(&results, &|m| &m.assumptions);
    let notes = grouped(&results, &|m| &m.notes);
    Ok(Schedule {
        members: results
            .iter()
            .map(|r| MemberOut {
                section: r.chosen.map(|j| rows[j].name.clone()),
                mass: r.chosen.map(|j| rows[j].mass),
                cost: r.chosen.and_then(|j| rows[j].cost),
                result: r.clone(),
            })
            .collect(),
        bill,
        total_mass,
        total_cost,
        rationalised,
        cutting: None,
        costs: None,
        not_sized,
        assumptions,
        notes,
    })
}

/// The bars bought for one section and how its members are cut.
#[derive(Clone, Debug, Serialize)]
pub struct SectionCut {
    pub section: String,
    /// kg/m.
    pub mass: f64,
    /// The mark of each piece (indices of the plan's pieces).
    pub pieces: Vec<String>,
    pub plan: CutPlan,
    /// Bars bought per stock length: (mm, count).
    pub bars: Vec<(f64, usize)>,
    /// kg of offcuts and kerfs.
    pub waste_mass: f64,
    /// Marks longer than every stock length less the kerf (need a splice).
    pub too_long: Vec<String>,
}

/// Every section's cutting plan, with the stock lengths and kerf used.
#[derive(Clone, Debug, Serialize)]
pub struct Cutting {
    /// mm.
    pub stock_lengths: Vec<f64>,
    /// mm per piece.
    pub kerf: f64,
    /// Which sizing was cut: the rationalised one when there is one.
    pub rationalised: bool,
    pub sections: Vec<SectionCut>,
}

/// Cut the schedule's members (the rationalised sections when the
/// schedule was rationalised) from bars of `stock` lengths (mm) with a
/// `kerf` (mm) per piece. Members without a section are not cut.
pub fn cut_schedule(s: &Schedule, stock: &[f64], kerf: f64) -> Cutting {
    let section_of = |m: &MemberOut| -> Option<String> {
        match &s.rationalised {
            Some(r) => r
                .members
                .iter()
                .find(|(mark, _)| *mark == m.result.mark)
                .map(|(_, sec)| sec.clone()),
            None => m.section.clone(),
        }
    };
    let bill = s.rationalised.as_ref().map_or(&s.bill, |r| &r.bill);
    let mut sections = Vec::new();
    for line in bill {
        let mut lengths = Vec::new();
        let mut marks = Vec::new();
        for m in &s.members {
            if section_of(m).as_deref() == Some(line.section.as_str()) {
                for _ in 0..m.result.count {
                    lengths.push(m.result.length);
                    marks.push(m.result.mark.clone());
                }
            }
        }
        let plan = cut(&lengths, stock, kerf);
        let mass = line.total_mass / (line.total_length / 1000.0);
        let mut too_long: Vec<String> = plan.too_long.iter().map(|&i| marks[i].clone()).collect();
        too_long.dedup();
        sections.push(SectionCut {
            section: line.section.clone(),
            mass,
            bars: plan.bars_by_stock(),
            waste_mass: mass * plan.waste() / 1000.0,
            too_long,
            pieces: marks,
            plan,
        });
    }
    Cutting {
        stock_lengths: stock.to_vec(),
        kerf,
        rationalised: s.rationalised.is_some(),
        sections,
    }
}

/// A named allowance on the cost (connections, paint, ...), in per cent.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Allowance {
    pub name: String,
    pub percent: f64,
}

/// The options of a schedule run, checked (see [`Options::parse`]).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Options {
    /// Choose (and rationalise) by least cost rather than least mass.
    pub by_cost: bool,
    /// At most this many distinct sections.
    pub max_sizes: Option<usize>,
    /// Stock bar lengths, mm.
    pub stock_lengths: Option<Vec<f64>>,
    /// Saw kerf per piece, mm.
    pub kerf: f64,
    /// Wastage on the cost, per cent (none when not asked for).
    pub wastage: Option<f64>,
    /// Allowances on the cost, each in per cent.
    pub allowances: Vec<Allowance>,
    /// The display units of the members' words (assumptions).
    pub units: units::System,
}

/// The options of a schedule run as typed.
#[derive(Clone, Copy, Debug, Default)]
pub struct Typed<'a> {
    pub by_cost: bool,
    pub max_sizes: Option<usize>,
    pub stock_lengths: Option<&'a str>,
    pub kerf: Option<&'a str>,
    pub wastage: Option<&'a str>,
    pub allowances: &'a [String],
    pub units: units::System,
}

/// A percentage as typed: `5%`, `5 %` or `5`, from 0 to 100.
pub fn parse_percent(text: &str, field: &str) -> Result<f64> {
    let t = text.trim();
    let t = t.strip_suffix('%').unwrap_or(t).trim();
    let v = units::parse_number(t).map_err(|e| e.in_field(field))?;
    if !(0.0..=100.0).contains(&v) {
        return Err(Error::msg(format!(
            "{field}: expected a percentage from 0 to 100 %, got {text}"
        )));
    }
    Ok(v)
}

impl Options {
    /// Check the options as typed: stock lengths positive, a kerf from 0
    /// to 50 mm, percentages from 0 to 100, allowances `NAME=PERCENT` with
    /// distinct names.
    pub fn parse(t: &Typed<'_>) -> Result<Options> {
        let stock_lengths = t
            .stock_lengths
            .map(|s| {
                let v = units::parse_list(s, Dim::Length, "--stock-lengths")?;
                if v.iter().any(|&x| !(x > 0.0 && x.is_finite())) {
                    return Err(Error::msg(format!(
                        "--stock-lengths: every stock length must be positive (got {s})"
                    )));
                }
                Ok(v)
            })
            .transpose()?;
        if t.kerf.is_some() && stock_lengths.is_none() {
            return Err(Error::msg(
                "--kerf applies only with --stock-lengths: give the stock lengths, or leave out --kerf",
            ));
        }
        let kerf = units::parse_field(t.kerf, Dim::Length, "--kerf")?.unwrap_or(0.0);
        if !(0.0..=50.0).contains(&kerf) {
            return Err(Error::msg(format!(
                "--kerf: expected a saw kerf from 0 to 50 mm, got {}",
                t.kerf.unwrap_or("")
            )));
        }
        let wastage = t
            .wastage
            .map(|w| parse_percent(w, "--wastage"))
            .transpose()?;
        let mut allowances: Vec<Allowance> = Vec::new();
        for a in t.allowances {
            let Some((name, pct)) = a.split_once('=') else {
                return Err(Error::msg(format!(
                    "--allowance: expected NAME=PERCENT, e.g. connections=8%, got '{a}'"
                )));
            };
            let name = name.trim();
            if name.is_empty() {
                return Err(Error::msg(format!(
                    "--allowance: '{a}' has no name before '=': expected NAME=PERCENT, e.g. paint=3%"
                )));
            }
            if allowances.iter().any(|x| x.name == name) {
                return Err(Error::msg(format!("--allowance: '{name}' is given twice")));
            }
            allowances.push(Allowance {
                name: name.to_string(),
                percent: parse_percent(pct, &format!("--allowance {name}"))?,
            });
        }
        Ok(Options {
            by_cost: t.by_cost,
            max_sizes: t.max_sizes,
            stock_lengths,
            kerf,
            wastage,
            allowances,
            units: t.units,
        })
    }

    /// Refuse the options that need prices when the rows have none
    /// (`--objective cost`, `--wastage`, `--allowance`).
    pub fn check_prices(&self, prices: &Prices) -> Result<()> {
        if self.by_cost {
            prices.require("--objective cost", "use --objective mass")?;
        }
        if self.wastage.is_some() {
            prices.require(
                "--wastage",
                "leave out --wastage (it applies to costs only)",
            )?;
        }
        if !self.allowances.is_empty() {
            prices.require(
                "--allowance",
                "leave out --allowance (it applies to costs only)",
            )?;
        }
        Ok(())
    }
}

/// The prices of the catalogues' headers once their rows are loaded
/// (none when no row has a price).
pub fn prices(header: Prices, rows: &[Candidate]) -> Prices {
    let priced = rows.iter().filter(|r| r.cost.is_some()).count();
    header.with_rows(rows.len(), priced)
}

/// How a line cost is worked out (shown beside the costs).
pub const COST_FORMULA: &str =
    "line cost = count × length × cost per length × (1 + wastage) × (1 + sum of allowances)";

/// One mark's cost.
#[derive(Clone, Debug, Serialize)]
pub struct MarkCost {
    pub mark: String,
    pub section: String,
    pub count: u32,
    /// mm per piece.
    pub length: f64,
    /// Currency per mm (none when the row has no price).
    pub unit_cost: Option<f64>,
    /// count × length × unit cost, currency.
    pub net_cost: Option<f64>,
    /// The net cost × the factor, currency.
    pub line_cost: Option<f64>,
}

/// The cost of every sized mark with the wastage and allowances.
#[derive(Clone, Debug, Serialize)]
pub struct Costs {
    /// Per cent (0 when not asked for).
    pub wastage: f64,
    pub allowances: Vec<Allowance>,
    /// (1 + wastage) × (1 + sum of allowances).
    pub factor: f64,
    pub formula: &'static str,
    /// Which sizing is costed: the rationalised one when there is one.
    pub rationalised: bool,
    pub marks: Vec<MarkCost>,
    /// Currency; none when a costed mark has no price.
    pub net_total: Option<f64>,
    pub total: Option<f64>,
}

/// The cost of each sized mark (on the rationalised sections when the
/// schedule was rationalised), by [`COST_FORMULA`].
pub fn costs(s: &Schedule, opts: &Options) -> Costs {
    let w = opts.wastage.unwrap_or(0.0);
    let a: f64 = opts.allowances.iter().map(|x| x.percent).sum();
    let factor = (1.0 + w / 100.0) * (1.0 + a / 100.0);
    let unit = |section: &str, own: Option<f64>| -> Option<f64> {
        match &s.rationalised {
            // The rationalised bill's cost per length of the section.
            Some(r) => r
                .bill
                .iter()
                .find(|l| l.section == section)
                .and_then(|l| l.total_cost.map(|c| c / l.total_length)),
            None => own,
        }
    };
    let mut marks = Vec::new();
    for m in &s.members {
        let section = match &s.rationalised {
            Some(r) => r
                .members
                .iter()
                .find(|(mark, _)| *mark == m.result.mark)
                .map(|(_, sec)| sec.clone()),
            None => m.section.clone(),
        };
        let Some(section) = section else { continue };
        let unit_cost = unit(&section, m.cost);
        let net_cost = unit_cost.map(|c| m.result.count as f64 * m.result.length * c);
        marks.push(MarkCost {
            mark: m.result.mark.clone(),
            section,
            count: m.result.count,
            length: m.result.length,
            unit_cost,
            net_cost,
            line_cost: net_cost.map(|c| c * factor),
        });
    }
    let sum = |f: &dyn Fn(&MarkCost) -> Option<f64>| {
        marks.iter().try_fold(0.0, |acc, m| f(m).map(|c| acc + c))
    };
    let net_total = sum(&|m| m.net_cost);
    let total = sum(&|m| m.line_cost);
    Costs {
        wastage: w,
        allowances: opts.allowances.clone(),
        factor,
        formula: COST_FORMULA,
        rationalised: s.rationalised.is_some(),
        marks,
        net_total,
        total,
    }
}
