//! The combinations of a job: its own `[[combination]]` tables and those
//! of the presets it names (the presets themselves are in
//! [`crate::beam::presets`]).

use super::raw::{RawCombo, RawPresets};
use super::source::Source;
use super::values::parse_ratio;
use crate::beam::model::{Beam, Combination, ComboKind, DeflectionLimit, MAX_FACTOR};
use crate::beam::presets;
use crate::error::{Error, Location, Result};
use crate::units::Dim;

/// The job's own combinations, added to the beam.
pub(super) fn combinations(src: &Source<'_>, beam: &mut Beam, raw: &[RawCombo]) -> Result<()> {
    for (i, c) in raw.iter().enumerate() {
        let combination = combination(src, beam, i, c)?;
        beam.combinations.push(combination);
    }
    Ok(())
}

/// Combination `i` (0-based) of the job.
fn combination(src: &Source<'_>, beam: &Beam, i: usize, c: &RawCombo) -> Result<Combination> {
    let field = format!("combination[{}]", i + 1);
    let kind = kind(src, c, &field)?;
    let factors = factors(src, beam, c, &field)?;
    let ratio = c
        .limit
        .as_ref()
        .map(|l| {
            parse_ratio(l.get_ref())
                .map_err(|e| e.at(&src.loc(l.span(), &format!("{field}.limit"))))
        })
        .transpose()?;
    let absolute = c
        .max
        .as_ref()
        .map(|l| src.q(l, Dim::Length, &format!("{field}.max")))
        .transpose()?;
    if kind == ComboKind::Service && ratio.is_none() && absolute.is_none() {
        return src.err(
            c.name.span(),
            &field,
            "a service combination needs limit = \"L/360\" and/or max = \"20 mm\"",
        );
    }
    if kind == ComboKind::Strength
        && let Some(sp) = c
            .limit
            .as_ref()
            .map(|l| l.span())
            .or(c.max.as_ref().map(|m| m.span()))
    {
        return src.err(
            sp,
            &field,
            "a strength combination does not check deflection, so its limit would be ignored: give it kind = \"service\", or add a separate service combination with the limit",
        );
    }
    Ok(Combination {
        name: c.name.get_ref().clone(),
        kind,
        factors,
        limit: (kind == ComboKind::Service).then_some(DeflectionLimit { ratio, absolute }),
        source: None,
    })
}

/// Strength or service: as given, else service when a limit is given.
fn kind(src: &Source<'_>, c: &RawCombo, field: &str) -> Result<ComboKind> {
    match c.kind.as_ref().map(|k| k.get_ref().to_ascii_lowercase()) {
        None => Ok(if c.limit.is_some() || c.max.is_some() {
            ComboKind::Service
        } else {
            ComboKind::Strength
        }),
        Some(k) if k == "strength" => Ok(ComboKind::Strength),
        Some(k) if k == "service" || k == "serviceability" => Ok(ComboKind::Service),
        Some(k) => {
            let sp = c.kind.as_ref().map(|s| s.span()).unwrap_or(c.name.span());
            src.err(
                sp,
                &format!("{field}.kind"),
                format!("unknown combination kind '{k}': expected strength or service"),
            )
        }
    }
}

/// The factors by case index; every case named must exist.
fn factors(src: &Source<'_>, beam: &Beam, c: &RawCombo, field: &str) -> Result<Vec<(usize, f64)>> {
    let mut factors = Vec::new();
    for (name, f) in c.factors.get_ref() {
        let Some(ci) = beam.cases.iter().position(|k| &k.name == name) else {
            return src.err(
                c.factors.span(),
                &format!("{field}.factors"),
                format!(
                    "combination '{}' names unknown load case '{name}': expected one of {}",
                    c.name.get_ref(),
                    beam.cases
                        .iter()
                        .map(|c| c.name.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            );
        };
        if !(f.is_finite() && f.abs() <= MAX_FACTOR) {
            return src.err(
                c.factors.span(),
                &format!("{field}.factors"),
                format!(
                    "factor {} for case '{name}': expected a finite number between −{m} and {m}",
                    crate::units::fmt_num(*f),
                    m = MAX_FACTOR
                ),
            );
        }
        factors.push((ci, *f));
    }
    Ok(factors)
}

/// The combinations of the presets named in `[presets]`, added to the
/// beam with their notes (and partial snow where the strength preset's
/// standard asks for it, on cases without a pattern of their own).
pub(super) fn presets(
    src: &Source<'_>,
    beam: &mut Beam,
    raw: Option<&RawPresets>,
    explicit_pattern: &[bool],
    notes: &mut Vec<String>,
) -> Result<()> {
    let Some(p) = raw else {
        return Ok(());
    };
    if let Some(s) = &p.strength {
        let pr = presets::strength(&beam.cases, s.get_ref())
            .map_err(|e| e.at(&src.loc(s.span(), "presets.strength")))?;
        beam.combinations.extend(pr.combinations);
        notes.extend(pr.notes);
        if presets::partial_snow(Some(s.get_ref())) {
            presets::set_partial_snow(beam, explicit_pattern, notes);
        }
    }
    if let Some(s) = &p.service {
        let pr = presets::service(&beam.cases, s.get_ref())
            .map_err(|e| e.at(&src.loc(s.span(), "presets.service")))?;
        beam.combinations.extend(pr.combinations);
        notes.extend(pr.notes);
    }
    Ok(())
}

/// A job without a strength combination checks nothing: refused.
pub(super) fn need_strength(src: &Source<'_>, beam: &Beam) -> Result<()> {
    if !beam
        .combinations
        .iter()
        .any(|c| c.kind == ComboKind::Strength)
    {
        return Err(Error::input(
            Location::in_file(src.file).with_field("combination"),
            "the job has no strength combination: add [[combination]] tables or [presets] strength = \"asce7-16-asd\"",
        ));
    }
    Ok(())
}
