//! The member schedule format, read into one job per member.
//!
//! Schedule CSV (our format; units in brackets as in catalogues):
//! `mark`, `count`, `spans [m]` (`;`-separated), `supports`
//! (`;`-separated; default pinned at every node), `dead [kN/m]`,
//! `live [kN/m]`, `snow [kN/m]` (uniform over the member),
//! `dead_point [kN]`, `live_point [kN]`, `snow_point [kN]` with
//! `point_at [m]` (`;`-lists: one position per point, each load column
//! one value per position, 0 where that category has none; positions
//! from the left end of the member), `grade` (a grade the template
//! defines: the member is sized only from catalogue rows of that grade),
//! `max_depth [mm]`, `bracing` (`continuous`, `supports` or a spacing with
//! its unit), `service` (`floor` or `roof` preset for this member),
//! `length [m]` (for quantities; default the sum of the spans).
//! Columns named note... are ignored.

use crate::beam::model::{Beam, Category, ComboKind, LoadKind, Support};
use crate::error::{Error, Location, Result};
use crate::job::{self, Job};
use crate::units::{self, Dim};
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
    /// The grade the member must be (a template grade, as spelled there):
    /// only catalogue rows of this grade are considered.
    pub grade: Option<String>,
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
    Grade,
    Note,
}

const KNOWN: &str = "mark, count, spans [m], supports, dead [kN/m], live [kN/m], snow [kN/m], dead_point [kN], live_point [kN], snow_point [kN], point_at [m] (';'-lists), grade, max_depth [mm], bracing, service (floor or roof), length [m]";

/// Read a schedule; every bad row is reported. `template` supplies the
/// material, grades, criteria and combination presets.
pub fn read_schedule<R: Read>(
    input: R,
    file: &str,
    opts: &crate::catalog::read::ReadOptions,
    template: &Job,
    n_live: f64,
    n_total: f64,
) -> Result<Vec<Member>> {
    read_schedule_at(
        input,
        &Location::in_file(file),
        opts,
        template,
        n_live,
        n_total,
    )
}

/// [`read_schedule`] with its problems at `at` (a file, or a workbook's
/// sheet: see `catalog::input::Input`).
pub fn read_schedule_at<R: Read>(
    input: R,
    at: &Location,
    opts: &crate::catalog::read::ReadOptions,
    template: &Job,
    n_live: f64,
    n_total: f64,
) -> Result<Vec<Member>> {
    use crate::catalog::records::{Block, Blocks, Records};
    let text = |f: &[u8], line: u64, col: usize| -> Result<String> {
        std::str::from_utf8(f).map(str::to_string).map_err(|_| {
            Error::input(
                at.clone().with_line(line).with_column(col as u64 + 1),
                "not valid UTF-8 text",
            )
        })
    };
    let mut rdr = Blocks::new(input, opts.delimiter);
    let mut head = Records::default();
    rdr.take_records(1, &mut head)
        .map_err(|e| crate::catalog::read::read_error(at, e))?;
    if head.is_empty() {
        return Err(Error::input(
            at.clone(),
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
    if headers.len() == 1 {
        let d = opts.delimiter;
        let hint = if d == b',' && (headers[0].contains(';') || headers[0].contains('\t')) {
            Some("the header has a single column but contains ';' or tabs: use --delimiter ';' (or 'tab') for this file".to_string())
        } else if d != b',' && headers[0].contains(',') {
            let shown = if d == b'\t' {
                "tab".to_string()
            } else {
                (d as char).to_string()
            };
            Some(format!(
                "the header has a single column when split at '{shown}' (--delimiter) but contains commas: leave --delimiter out for a comma-separated file"
            ))
        } else {
            None
        };
        if let Some(h) = hint {
            return Err(Error::input(at.clone().with_line(header_line), h));
        }
    }
    let mut cols = Vec::new();
    let mut errors = Vec::new();
    for (i, h) in headers.iter().enumerate() {
        let h = h.as_str();
        let (name, unit) = crate::catalog::split_header(h);
        let (name, unit) = (name.to_ascii_lowercase(), unit.as_deref());
        let at = at
            .clone()
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
            "snow_point" => unit_of(Dim::Force).map(|f| SCol::Point(Category::Snow, f)),
            "grade" => Ok(SCol::Grade),
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
            at.clone().with_line(header_line),
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
        .map_err(|e| crate::catalog::read::read_error(at, e))?
        > 0
    {
        for r in recs.iter() {
            let line = r.line();
            let fields = if r.fault().is_some() {
                Err(Error::input(
                    at.clone().with_line(line),
                    "a quoted field is never closed (the row runs to the end of the file)",
                ))
            } else if r.len() != headers.len() {
                Err(Error::input(
                    at.clone().with_line(line),
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
        match member_of(
            &rec,
            &cols,
            &headers,
            opts.decimal_comma,
            template,
            n_live,
            n_total,
        ) {
            Ok(mut m) => {
                m.line = line;
                if let Some(first) = marks.insert(m.mark.clone(), line) {
                    errors.push(Error::input(
                        at.clone().with_line(line),
                        format!(
                            "mark '{}' appears twice (first on {})",
                            m.mark,
                            at.line_text(first)
                        ),
                    ));
                }
                members.push(m);
            }
            Err((col, e)) => {
                errors.push(e.at(&at.clone().with_line(line).with_column(col as u64 + 1)))
            }
        }
    }
    if members.is_empty() && errors.is_empty() {
        errors.push(Error::input(at.clone(), "the schedule has no members"));
    }
    if !errors.is_empty() {
        return Err(Error::Many(errors));
    }
    Ok(members)
}

/// The message of an empty entry in a ';'-list cell.
fn empty_entry(cell: &str) -> String {
    format!("'{cell}' has an empty entry: give one number between each ';' (0 where there is none)")
}

fn member_of(
    rec: &[String],
    cols: &[SCol],
    headers: &[String],
    decimal_comma: bool,
    template: &Job,
    n_live: f64,
    n_total: f64,
) -> std::result::Result<Member, (usize, Error)> {
    let mut mark = String::new();
    let mut count = 1u32;
    let mut spans = Vec::new();
    let mut supports: Option<Vec<Support>> = None;
    let mut uniform: Vec<(Category, f64)> = Vec::new();
    // Point loads: (category, values, column) and the positions.
    let mut points: Vec<(Category, Vec<f64>, usize)> = Vec::new();
    let mut point_at: Option<(Vec<f64>, usize, f64)> = None;
    let mut grade: Option<String> = None;
    let mut max_depth = None;
    let mut bracing = None;
    let mut service: Option<String> = None;
    let mut length = None;
    for (i, col) in cols.iter().enumerate() {
        let cell = rec.get(i).map_or("", |c| c.trim());
        let h = headers.get(i).map_or("", String::as_str);
        let fail = |msg: String| (i, Error::msg(msg).in_field(h));
        // With --decimal-comma, 12,5 is 12.5 (a '.' is refused).
        let point = |s: &str| -> std::result::Result<String, (usize, Error)> {
            if decimal_comma {
                crate::catalog::number::decimal_comma_text(s)
                    .map_err(|m| (i, Error::msg(m).in_field(h)))
            } else {
                Ok(s.to_string())
            }
        };
        let num = |s: &str| -> std::result::Result<f64, (usize, Error)> {
            let s = point(s)?;
            units::parse_number(&s).map_err(|e| (i, e.in_field(h)))
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
                    if s.trim().is_empty() {
                        return Err(fail(empty_entry(cell)));
                    }
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
            SCol::Point(c, f) => {
                let mut v = Vec::new();
                for s in cell.split(';') {
                    if s.trim().is_empty() {
                        return Err(fail(empty_entry(cell)));
                    }
                    v.push(num(s.trim())? * f);
                }
                points.push((c, v, i));
            }
            SCol::PointAt(f) => {
                let mut v = Vec::new();
                for s in cell.split(';') {
                    if s.trim().is_empty() {
                        return Err(fail(empty_entry(cell)));
                    }
                    let x = num(s.trim())? * f;
                    if x < 0.0 {
                        return Err(fail(format!(
                            "position '{}' is negative: positions are measured from the left end of the member",
                            s.trim()
                        )));
                    }
                    v.push(x);
                }
                point_at = Some((v, i, f));
            }
            SCol::Grade => {
                let g = template
                    .grades
                    .iter()
                    .find(|(n, _)| n.eq_ignore_ascii_case(cell))
                    .ok_or_else(|| {
                        let known: Vec<&str> =
                            template.grades.iter().map(|(n, _)| n.as_str()).collect();
                        fail(if known.is_empty() {
                            format!(
                                "grade '{cell}': the template defines no grades ([materials.NAME] tables)"
                            )
                        } else {
                            format!(
                                "grade '{cell}': the template defines no such grade (expected one of [{}])",
                                known.join(", ")
                            )
                        })
                    })?;
                grade = Some(g.0.clone());
            }
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
                bracing = Some(job::parse_bracing(&point(cell)?).map_err(|e| (i, e.in_field(h)))?)
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
    // A member's case of a category takes the template's pattern for
    // that category (e.g. live load patterned by span or not); of several
    // template cases of one category, a patterned one (the envelope over
    // the patterns holds the unpatterned load too, so it is never less
    // severe).
    let case_of = |beam: &mut Beam, c: Category| -> usize {
        match beam.cases.iter().position(|k| k.category == c) {
            Some(i) => i,
            None => {
                let i = beam.case(c.name(), c);
                let of_c = || template.beam.cases.iter().filter(|k| k.category == c);
                if let Some(t) = of_c().find(|k| k.pattern.is_on()).or_else(|| of_c().next()) {
                    beam.cases[i].pattern = t.pattern;
                }
                i
            }
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
    // A problem of the point loads, at its column.
    let header = |i: usize| headers.get(i).map_or("", String::as_str);
    let at_col = |i: usize, msg: String| (i, Error::msg(msg).in_field(header(i)));
    match (&point_at, points.first()) {
        (None, Some(&(_, _, i))) => {
            return Err(at_col(
                i,
                format!(
                    "member '{mark}' has a point load but no point_at: give its position from the left end"
                ),
            ));
        }
        (Some((_, i, _)), None) => {
            return Err(at_col(
                *i,
                format!(
                    "member '{mark}' gives point_at but no point load: fill dead_point, live_point or snow_point, or leave point_at empty"
                ),
            ));
        }
        _ => {}
    }
    if let Some((xs, xi, f)) = &point_at {
        if let Some((_, v, i)) = points.iter().find(|(_, v, _)| v.len() != xs.len()) {
            return Err(at_col(
                *i,
                format!(
                    "{} value(s) for {} position(s) in point_at: give one value per position, separated by ';' (0 where there is none)",
                    v.len(),
                    xs.len()
                ),
            ));
        }
        if let Some(x) = xs.iter().find(|x| **x > total * (1.0 + 1e-12)) {
            // In the column's own unit, as typed in its header.
            let unit = crate::catalog::split_header(header(*xi))
                .1
                .unwrap_or_default();
            return Err(at_col(
                *xi,
                format!(
                    "a point load at {} {unit} lies beyond the end of the member, {} {unit} long",
                    units::fmt_num(*x / f),
                    units::fmt_num(total / f)
                ),
            ));
        }
        for (c, v, _) in points {
            let ci = case_of(&mut beam, c);
            for (&x, p) in xs.iter().zip(v) {
                if p != 0.0 {
                    beam.load(ci, LoadKind::Point { x: x.min(total), p });
                }
            }
        }
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
    notes.splice(0..0, template.notes.iter().cloned());
    if let Some(g) = &grade {
        notes.push(format!(
            "grade {g} (schedule column): sized only from catalogue rows of grade {g}"
        ));
    }
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
        grade,
        line: 0,
    })
}
