//! Member schedules: size every member of a schedule against one
//! catalogue, total a bill of quantities, and optionally rationalise to at
//! most k distinct sections.
//!
//! Schedule CSV (our format; units in brackets as in catalogues):
//! `mark`, `count`, `spans [m]` (`;`-separated), `supports`
//! (`;`-separated; default pinned at every node), `dead [kN/m]`,
//! `live [kN/m]`, `snow [kN/m]` (uniform over the member),
//! `dead_point [kN]`, `live_point [kN]` with `point_at [m]`,
//! `max_depth [mm]`, `bracing` (`continuous`, `supports` or a spacing with
//! its unit), `service` (`floor` or `roof` preset for this member),
//! `length [m]` (for quantities; default the sum of the spans).
//! Columns named note... are ignored.

use super::rationalise::{Plan, rationalise};
use super::{Candidate, Filters};
use crate::beam::model::{Beam, Category, ComboKind, LoadKind, Support};

use crate::catalog::Materials;
use crate::check::{Prepared, SectionInput};
use crate::error::{Error, Location, Result};
use crate::job::{self, Job};
use crate::units::{self, Dim};
use rayon::prelude::*;
use serde::Serialize;
use std::io::Read;

/// One member of a schedule.
#[derive(Clone, Debug)]
pub struct Member {
    pub mark: String,
    pub count: u32,
    /// Member length for quantities, mm.
    pub length: f64,
    pub job: Job,
    pub max_depth: Option<f64>,
    pub line: u64,
}

#[derive(Clone, Copy, PartialEq)]
enum SCol {
    Mark,
    Count,
    Spans(f64),
    Supports,
    Uniform(Category, f64),
    Point(Category, f64),
    PointAt(f64),
    MaxDepth(f64),
    Bracing,
    Service,
    Length(f64),
    Note,
}

const KNOWN: &str = "mark, count, spans [m], supports, dead [kN/m], live [kN/m], snow [kN/m], dead_point [kN], live_point [kN], point_at [m], max_depth [mm], bracing, service (floor or roof), length [m]";

/// Read a schedule; every bad row is reported. `template` supplies the
/// material, grades, criteria and combination presets.
pub fn read_schedule<R: Read>(
    input: R,
    file: &str,
    template: &Job,
    n_live: f64,
    n_total: f64,
) -> Result<Vec<Member>> {
    use crate::catalog::records::{Block, Blocks, Records};
    let text = |f: &[u8], line: u64, col: usize| -> Result<String> {
        std::str::from_utf8(f).map(str::to_string).map_err(|_| {
            Error::input(
                Location::in_file(file)
                    .with_line(line)
                    .with_column(col as u64 + 1),
                "not valid UTF-8 text",
            )
        })
    };
    let mut rdr = Blocks::new(input, b',');
    let mut head = Records::default();
    rdr.take_records(1, &mut head)
        .map_err(|e| crate::catalog::read::read_error(file, e))?;
    if head.is_empty() {
        return Err(Error::input(
            Location::in_file(file),
            "the schedule is empty: expected a header row naming the columns",
        ));
    }
    let header_line = head.get(0).line();
    let headers: Vec<String> = head
        .get(0)
        .iter()
        .enumerate()
        .map(|(i, f)| text(f, header_line, i).map(|t| t.trim().to_string()))
        .collect::<Result<_>>()?;
    let mut cols = Vec::new();
    let mut errors = Vec::new();
    for (i, h) in headers.iter().enumerate() {
        let h = h.as_str();
        let (name, unit) = match (h.find('['), h.rfind(']')) {
            (Some(a), Some(b)) if b > a => {
                (h[..a].trim().to_ascii_lowercase(), Some(h[a + 1..b].trim()))
            }
            _ => (h.to_ascii_lowercase(), None),
        };
        let at = Location::in_file(file)
            .with_line(header_line)
            .with_column(i as u64 + 1)
            .with_field(h.to_string());
        let unit_of = |dim: Dim| -> Result<f64> {
            match unit {
                Some(u) => units::unit_factor(u, dim),
                None => Err(Error::msg(format!(
                    "column '{name}' needs its unit in brackets"
                ))),
            }
        };
        let col = match name.as_str() {
            "mark" => Ok(SCol::Mark),
            "count" => Ok(SCol::Count),
            "spans" | "span" => unit_of(Dim::Length).map(SCol::Spans),
            "supports" => Ok(SCol::Supports),
            "dead" => unit_of(Dim::LineLoad).map(|f| SCol::Uniform(Category::Dead, f)),
            "live" => unit_of(Dim::LineLoad).map(|f| SCol::Uniform(Category::Live, f)),
            "snow" => unit_of(Dim::LineLoad).map(|f| SCol::Uniform(Category::Snow, f)),
            "dead_point" => unit_of(Dim::Force).map(|f| SCol::Point(Category::Dead, f)),
            "live_point" => unit_of(Dim::Force).map(|f| SCol::Point(Category::Live, f)),
            "point_at" => unit_of(Dim::Length).map(SCol::PointAt),
            "max_depth" => unit_of(Dim::Length).map(SCol::MaxDepth),
            "bracing" => Ok(SCol::Bracing),
            "service" => Ok(SCol::Service),
            "length" => unit_of(Dim::Length).map(SCol::Length),
            n if n.starts_with("note") => Ok(SCol::Note),
            _ => Err(Error::msg(format!(
                "unknown column '{h}': expected {KNOWN}"
            ))),
        };
        match col {
            Ok(c) => cols.push(c),
            Err(e) => {
                errors.push(e.at(&at));
                cols.push(SCol::Note);
            }
        }
    }
    if !cols.contains(&SCol::Mark) || !cols.iter().any(|c| matches!(c, SCol::Spans(_))) {
        errors.push(Error::input(
            Location::in_file(file).with_line(header_line),
            "a schedule needs 'mark' and 'spans [unit]' columns",
        ));
    }
    if !errors.is_empty() {
        return Err(Error::Many(errors));
    }
    let mut members = Vec::new();
    let mut marks = std::collections::HashMap::new();
    let mut block = Block::default();
    let mut recs = Records::default();
    let mut rows: Vec<(u64, std::result::Result<Vec<String>, Error>)> = Vec::new();
    while rdr
        .next_records(&mut block, &mut recs)
        .map_err(|e| crate::catalog::read::read_error(file, e))?
        > 0
    {
        for r in recs.iter() {
            let line = r.line();
            let fields = if r.fault().is_some() {
                Err(Error::input(
                    Location::in_file(file).with_line(line),
                    "a quoted field is never closed (the row runs to the end of the file)",
                ))
            } else if r.len() != headers.len() {
                Err(Error::input(
                    Location::in_file(file).with_line(line),
                    format!(
                        "this row has {} field(s) but the header has {}: check the delimiter and quoting",
                        r.len(),
                        headers.len()
                    ),
                ))
            } else {
                r.iter()
                    .enumerate()
                    .map(|(i, f)| text(f, line, i))
                    .collect::<Result<Vec<_>>>()
            };
            rows.push((line, fields));
        }
    }
    for (line, rec) in rows {
        let rec = match rec {
            Ok(r) => r,
            Err(e) => {
                errors.push(e);
                continue;
            }
        };
        match member_of(&rec, &cols, &headers, template, n_live, n_total) {
            Ok(mut m) => {
                m.line = line;
                if let Some(first) = marks.insert(m.mark.clone(), line) {
                    errors.push(Error::input(
                        Location::in_file(file).with_line(line),
                        format!("mark '{}' appears twice (first on line {first})", m.mark),
                    ));
                }
                members.push(m);
            }
            Err((col, e)) => errors.push(
                e.at(&Location::in_file(file)
                    .with_line(line)
                    .with_column(col as u64 + 1)),
            ),
        }
    }
    if members.is_empty() && errors.is_empty() {
        errors.push(Error::input(
            Location::in_file(file),
            "the schedule has no members",
        ));
    }
    if !errors.is_empty() {
        return Err(Error::Many(errors));
    }
    Ok(members)
}

fn member_of(
    rec: &[String],
    cols: &[SCol],
    headers: &[String],
    template: &Job,
    n_live: f64,
    n_total: f64,
) -> std::result::Result<Member, (usize, Error)> {
    let mut mark = String::new();
    let mut count = 1u32;
    let mut spans = Vec::new();
    let mut supports: Option<Vec<Support>> = None;
    let mut uniform: Vec<(Category, f64)> = Vec::new();
    let mut points: Vec<(Category, f64)> = Vec::new();
    let mut point_at = None;
    let mut max_depth = None;
    let mut bracing = None;
    let mut service: Option<String> = None;
    let mut length = None;
    for (i, col) in cols.iter().enumerate() {
        let cell = rec.get(i).map_or("", |c| c.trim());
        let h = headers.get(i).map_or("", String::as_str);
        let fail = |msg: String| (i, Error::msg(msg).in_field(h));
        let num = |s: &str| -> std::result::Result<f64, (usize, Error)> {
            units::parse_number(s).map_err(|e| (i, e.in_field(h)))
        };
        if cell.is_empty() {
            continue;
        }
        match *col {
            SCol::Mark => mark = cell.to_string(),
            SCol::Count => {
                count = cell
                    .parse::<u32>()
                    .ok()
                    .filter(|c| (1..=1_000_000).contains(c))
                    .ok_or_else(|| {
                        fail(format!(
                            "'{cell}' is not a whole number of pieces from 1 to 1,000,000"
                        ))
                    })?
            }
            SCol::Spans(f) => {
                for s in cell.split(';') {
                    let v = num(s)? * f;
                    if v <= 0.0 {
                        return Err(fail(format!("span '{s}' must be greater than zero")));
                    }
                    spans.push(v);
                }
            }
            SCol::Supports => {
                supports = Some(
                    cell.split(';')
                        .map(job::parse_support)
                        .collect::<Result<Vec<_>>>()
                        .map_err(|e| (i, e.in_field(h)))?,
                )
            }
            SCol::Uniform(c, f) => uniform.push((c, num(cell)? * f)),
            SCol::Point(c, f) => points.push((c, num(cell)? * f)),
            SCol::PointAt(f) => point_at = Some(num(cell)? * f),
            SCol::MaxDepth(f) => {
                let v = num(cell)? * f;
                if !(1.0..=100_000.0).contains(&v) {
                    return Err(fail(format!(
                        "'{cell}' is outside the supported depth limit, 1 mm to 100 m"
                    )));
                }
                max_depth = Some(v)
            }
            SCol::Bracing => {
                bracing = Some(job::parse_bracing(cell).map_err(|e| (i, e.in_field(h)))?)
            }
            SCol::Length(f) => {
                let v = num(cell)? * f;
                if !(1.0..=1e6).contains(&v) {
                    return Err(fail(format!(
                        "'{cell}' is outside the supported piece length, 1 mm to 1 km"
                    )));
                }
                length = Some(v)
            }
            SCol::Service => service = Some(cell.to_string()),
            SCol::Note => {}
        }
    }
    if mark.is_empty() {
        return Err((0, Error::msg("every member needs a mark")));
    }
    if spans.is_empty() {
        return Err((0, Error::msg(format!("member '{mark}' has no spans"))));
    }
    let supports = supports.unwrap_or_else(|| vec![Support::Pinned; spans.len() + 1]);
    let mut beam = Beam::new(spans, supports);
    let total = beam.length();
    let case_of = |beam: &mut Beam, c: Category| -> usize {
        match beam.cases.iter().position(|k| k.category == c) {
            Some(i) => i,
            None => beam.case(c.name(), c),
        }
    };
    let d = case_of(&mut beam, Category::Dead);
    beam.self_weight_case = Some(d);
    for (c, w) in uniform {
        let ci = case_of(&mut beam, c);
        beam.load(
            ci,
            LoadKind::Distributed {
                x1: 0.0,
                x2: total,
                w1: w,
                w2: w,
            },
        );
    }
    for (c, p) in points {
        let x = point_at.ok_or((
            0,
            Error::msg(format!("member '{mark}' has a point load but no point_at")),
        ))?;
        let ci = case_of(&mut beam, c);
        beam.load(ci, LoadKind::Point { x, p });
    }
    // The template's own combinations apply to every member, each case
    // taken by its category (the schedule's columns are dead, live and
    // snow loads); presets are added where the template names them, and
    // the default combinations only where it has none of a kind.
    let own: Vec<&crate::beam::model::Combination> = template
        .beam
        .combinations
        .iter()
        .filter(|c| c.source.is_none())
        .collect();
    let own_strength = own.iter().any(|c| c.kind == ComboKind::Strength);
    let own_service = own.iter().any(|c| c.kind == ComboKind::Service);
    for c in &own {
        let mut factors = Vec::new();
        for &(ci, f) in &c.factors {
            let cat = template.beam.cases[ci].category;
            let same: Vec<&str> = template
                .beam
                .cases
                .iter()
                .filter(|k| k.category == cat)
                .map(|k| k.name.as_str())
                .collect();
            if same.len() > 1 {
                return Err((
                    0,
                    Error::msg(format!(
                        "the template's combination '{}' names case '{}', but the template has several {} cases ({}): a schedule gives one load per category, so the combination cannot be applied; keep one case per category in the template",
                        c.name,
                        template.beam.cases[ci].name,
                        cat.name(),
                        same.join(", ")
                    )),
                ));
            }
            let mi = case_of(&mut beam, cat);
            factors.push((mi, f));
        }
        beam.combinations.push(crate::beam::model::Combination {
            factors,
            source: Some("the template job's own combination".into()),
            ..(*c).clone()
        });
    }
    let service_preset = service.as_deref().or(template.presets.1.as_deref());
    let mut notes = crate::beam::presets::standard_with(
        &mut beam,
        template.presets.0.as_deref(),
        service_preset,
        (!own_strength, !own_service),
        n_live,
        n_total,
    )
    .map_err(|e| (0, e))?;
    if !own.is_empty() {
        notes.push(format!(
            "the template's {} combination(s) apply, each case taken by its category",
            own.len()
        ));
    }
    if crate::beam::presets::partial_snow(template.presets.0.as_deref()) {
        job::set_partial_snow(&mut beam, &[], &mut notes);
    }
    beam.validate()
        .map_err(|e| (0, e.in_field(&format!("member {mark}"))))?;
    let mut criteria = template.criteria.clone();
    if let Some(b) = bracing {
        criteria.bracing = b;
    }
    let job = Job {
        title: mark.clone(),
        beam,
        criteria,
        notes,
        ..template.clone()
    };
    Ok(Member {
        mark,
        count,
        length: length.unwrap_or(total),
        job,
        max_depth,
        line: 0,
    })
}

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
) -> Result<Vec<MemberResult>> {
    members
        .par_iter()
        .map(|m| {
            let prep = Prepared::new(&m.job.beam, m.job.material.clone(), m.job.criteria.clone())
                .map_err(|e| e.in_field(&format!("member {}", m.mark)))?;
            let mut passing = Vec::new();
            let mut utils = Vec::new();
            let mut best: Option<(usize, crate::check::Summary)> = None;
            let mut unverified: Vec<(usize, crate::check::Summary)> = Vec::new();
            for (j, r) in rows.iter().enumerate() {
                if m.max_depth.is_some_and(|d| r.depth > d * (1.0 + 1e-12))
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
                assumptions: prep.assumptions(),
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
