//! The loads of a job, and where a load the beam refuses is reported.

use super::raw::RawLoad;
use super::source::Source;
use crate::beam::model::{Beam, Load, LoadKind};
use crate::error::{Error, Location, Result};
use crate::units::{self, Dim};
use std::ops::Range;
use toml::Spanned;

/// The keys of a load that give its place (`case`, `at`, `from`, `to`) and
/// their spans: a load off the beam is reported where its position is given.
pub(super) type Keys = [(&'static str, Option<Range<usize>>); 4];

/// The loads, added to the beam; each with the spans of its position keys.
pub(super) fn loads(
    src: &Source<'_>,
    beam: &mut Beam,
    raw: &[RawLoad],
) -> Result<Vec<(Load, Keys)>> {
    let mut loads = Vec::new();
    for (i, l) in raw.iter().enumerate() {
        loads.push(load(src, beam, i, l)?);
    }
    for (l, _) in &loads {
        beam.loads.push(l.clone());
    }
    Ok(loads)
}

/// The index of the case a load names.
fn case_index(src: &Source<'_>, beam: &Beam, name: &Spanned<String>, field: &str) -> Result<usize> {
    beam.cases
        .iter()
        .position(|c| c.name == name.get_ref().trim())
        .ok_or_else(|| {
            Error::input(
                src.loc(name.span(), field),
                format!(
                    "unknown load case '{}': expected one of {}",
                    name.get_ref(),
                    beam.cases
                        .iter()
                        .map(|c| c.name.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            )
        })
}

/// Load `i` (0-based) of the job.
fn load(src: &Source<'_>, beam: &Beam, i: usize, l: &RawLoad) -> Result<(Load, Keys)> {
    let field = format!("load[{}]", i + 1);
    let case = case_index(src, beam, &l.case, &format!("{field}.case"))?;
    let length_at = |v: &Option<Spanned<String>>, key: &str| {
        v.as_ref()
            .map(|v| src.q(v, Dim::Length, &format!("{field}.{key}")))
            .transpose()
    };
    let from = length_at(&l.from, "from")?;
    let to = length_at(&l.to, "to")?;
    let at = length_at(&l.at, "at")?;
    let kinds = [
        l.uniform.is_some(),
        l.area.is_some(),
        l.linear.is_some(),
        l.point.is_some(),
        l.moment.is_some(),
    ];
    let n_kinds = kinds.iter().filter(|k| **k).count();
    let span0 = l.case.span();
    if n_kinds != 1 {
        return src.err(
            span0,
            &field,
            "a load needs exactly one of uniform, area (with width), linear, point or moment",
        );
    }
    refuse_unused_keys(src, l, &field, &kinds)?;
    let kind = load_kind(src, l, &field, (from, to, at), beam.length())?;
    let tributary = match (&l.area, &l.width) {
        (Some(a), Some(w)) => Some((
            src.q(a, Dim::AreaLoad, &format!("{field}.area"))?,
            src.q(w, Dim::Length, &format!("{field}.width"))?,
        )),
        _ => None,
    };
    Ok((
        Load {
            case,
            kind,
            label: field.clone(),
            tributary,
        },
        [
            ("case", Some(span0)),
            ("at", l.at.as_ref().map(|v| v.span())),
            ("from", l.from.as_ref().map(|v| v.span())),
            ("to", l.to.as_ref().map(|v| v.span())),
        ],
    ))
}

/// Keys the load's kind does not use are refused, never ignored.
fn refuse_unused_keys(src: &Source<'_>, l: &RawLoad, field: &str, kinds: &[bool; 5]) -> Result<()> {
    let distributed = l.uniform.is_some() || l.area.is_some() || l.linear.is_some();
    let unused: [(&str, Option<Range<usize>>, bool); 4] = [
        ("at", l.at.as_ref().map(|v| v.span()), distributed),
        ("from", l.from.as_ref().map(|v| v.span()), !distributed),
        ("to", l.to.as_ref().map(|v| v.span()), !distributed),
        (
            "width",
            l.width.as_ref().map(|v| v.span()),
            l.area.is_none(),
        ),
    ];
    for (key, sp, refused) in unused {
        if let (Some(sp), true) = (sp, refused) {
            let kind = ["uniform", "area", "linear", "point", "moment"]
                [kinds.iter().position(|k| *k).unwrap_or(0)];
            let uses = match kind {
                "uniform" | "linear" => "from and to",
                "area" => "width, from and to",
                _ => "at",
            };
            return src.err(
                sp,
                &format!("{field}.{key}"),
                format!("a {kind} load does not use '{key}' (it takes {uses}): remove it, or give the load kind that uses it"),
            );
        }
    }
    Ok(())
}

/// What the load is and where it acts: `place` = (from, to, at) as given;
/// a distributed load without them covers the whole `length`.
fn load_kind(
    src: &Source<'_>,
    l: &RawLoad,
    field: &str,
    place: (Option<f64>, Option<f64>, Option<f64>),
    length: f64,
) -> Result<LoadKind> {
    let (from, to, at) = place;
    let distributed = |w1: f64, w2: f64| LoadKind::Distributed {
        x1: from.unwrap_or(0.0),
        x2: to.unwrap_or(length),
        w1,
        w2,
    };
    Ok(if let Some(u) = &l.uniform {
        let w = src.q(u, Dim::LineLoad, &format!("{field}.uniform"))?;
        distributed(w, w)
    } else if let Some(a) = &l.area {
        let p = src.q(a, Dim::AreaLoad, &format!("{field}.area"))?;
        let Some(wd) = &l.width else {
            return src.err(
                a.span(),
                field,
                "an area load needs width = \"...\" (the tributary width, e.g. the joist spacing)",
            );
        };
        let b = src.q(wd, Dim::Length, &format!("{field}.width"))?;
        if b <= 0.0 {
            return src.err(
                wd.span(),
                &format!("{field}.width"),
                "the tributary width must be greater than zero",
            );
        }
        distributed(p * b, p * b)
    } else if let Some(lin) = &l.linear {
        let v = lin.get_ref();
        if v.len() != 2 {
            return src.err(
                lin.span(),
                &format!("{field}.linear"),
                "expected two intensities, [start, end], e.g. [\"0 kN/m\", \"6 kN/m\"]",
            );
        }
        let w1 = units::parse(&v[0], Dim::LineLoad)
            .map_err(|e| e.at(&src.loc(lin.span(), &format!("{field}.linear"))))?;
        let w2 = units::parse(&v[1], Dim::LineLoad)
            .map_err(|e| e.at(&src.loc(lin.span(), &format!("{field}.linear"))))?;
        distributed(w1, w2)
    } else if let Some(p) = &l.point {
        let pv = src.q(p, Dim::Force, &format!("{field}.point"))?;
        let Some(x) = at else {
            return src.err(
                p.span(),
                field,
                "a point load needs at = \"...\" (its distance from the left end)",
            );
        };
        LoadKind::Point { x, p: pv }
    } else if let Some(mo) = &l.moment {
        let mv = src.q(mo, Dim::Moment, &format!("{field}.moment"))?;
        let Some(x) = at else {
            return src.err(
                mo.span(),
                field,
                "a point moment needs at = \"...\" (its distance from the left end)",
            );
        };
        LoadKind::Moment { x, m: mv }
    } else {
        return Err(Error::Internal("load kind".into()));
    })
}

/// Validate the beam, reporting a load it refuses at the key that places
/// the load.
pub(super) fn validate(src: &Source<'_>, beam: &Beam, loads: &[(Load, Keys)]) -> Result<()> {
    let Err(e) = beam.validate() else {
        return Ok(());
    };
    if let Error::Input { location, .. } = &e
        && let Some(field) = &location.field
        && let Some((l, keys)) = loads.iter().find(|(l, _)| {
            field == &l.label
                || field
                    .strip_prefix(l.label.as_str())
                    .is_some_and(|r| r.starts_with('.'))
        })
    {
        let Error::Input { message, .. } = e else {
            return Err(e);
        };
        // The key whose value is off the beam: `at`, or the end of a
        // distributed load that lies outside (`from` before 0, else
        // `to`); the case line when the position was defaulted.
        let length = beam.length();
        let want = match l.kind {
            LoadKind::Distributed { x1, .. } if x1 < 0.0 || x1 > length => "from",
            LoadKind::Distributed { .. } => "to",
            _ => "at",
        };
        let (key, span) = keys
            .iter()
            .find(|(k, sp)| *k == want && sp.is_some())
            .or_else(|| keys.first())
            .map(|(k, sp)| (*k, sp.clone().unwrap_or_default()))
            .unwrap_or(("case", 0..0));
        return Err(Error::input(
            src.loc(span, &format!("{}.{key}", l.label)),
            message,
        ));
    }
    Err(e.at(&Location::in_file(src.file)))
}
