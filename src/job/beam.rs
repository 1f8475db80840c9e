//! The beam of a job: spans, supports, and the load cases.

use super::raw::{RawBeam, RawCase, RawPattern, RawSupport};
use super::source::Source;
use super::values::parse_support;
use crate::beam::model::{Beam, Category, Pattern, Support};
use crate::error::{Error, Location, Result};
use crate::units::{self, Dim};

/// The spans and supports (one at each end of every span).
pub(super) fn beam(src: &Source<'_>, raw: &RawBeam) -> Result<Beam> {
    let mut spans = Vec::new();
    for (i, s) in raw.spans.get_ref().iter().enumerate() {
        spans.push(src.q(s, Dim::Length, &format!("beam.spans[{}]", i + 1))?);
    }
    let mut supports = Vec::new();
    for (i, s) in raw.supports.get_ref().iter().enumerate() {
        let field = format!("beam.supports[{}]", i + 1);
        let sup = match s.get_ref() {
            RawSupport::Name(n) => {
                parse_support(n).map_err(|e| e.at(&src.loc(s.span(), &field)))?
            }
            RawSupport::Spring { spring } => {
                let k = units::parse(spring, Dim::LineLoad)
                    .map_err(|e| e.at(&src.loc(s.span(), &field)))?;
                Support::Spring(k)
            }
        };
        supports.push(sup);
    }
    if supports.len() != spans.len() + 1 {
        return src.err(
            raw.supports.span(),
            "beam.supports",
            format!(
                "{} span(s) need {} supports, one at each end of every span ('free' where there is none); {} given",
                spans.len(),
                spans.len() + 1,
                supports.len()
            ),
        );
    }
    let mut beam = Beam::new(spans, supports);
    if let Some(f) = raw.cantilever_factor {
        beam.cantilever_factor = f;
    }
    Ok(beam)
}

/// The load cases, added to the beam with their patterns and the case that
/// carries the self-weight. Returns, by case, whether its pattern was
/// given (a given pattern is never replaced by a preset's).
pub(super) fn cases(src: &Source<'_>, beam: &mut Beam, raw: &[RawCase]) -> Result<Vec<bool>> {
    let mut sw_case = None;
    let mut explicit_pattern = vec![false; raw.len()];
    for (i, c) in raw.iter().enumerate() {
        let field = format!("case[{}]", i + 1);
        let name = c.name.get_ref().trim().to_string();
        if name.is_empty() {
            return src.err(c.name.span(), &field, "a load case needs a name");
        }
        if beam.cases.iter().any(|k| k.name == name) {
            return src.err(
                c.name.span(),
                &field,
                format!("load case '{name}' is defined twice"),
            );
        }
        let cat = Category::parse(c.category.get_ref())
            .map_err(|e| e.at(&src.loc(c.category.span(), &format!("{field}.category"))))?;
        let idx = beam.case(&name, cat);
        if let Some(p) = &c.pattern {
            beam.cases[idx].pattern = pattern(src, p, &field)?;
            explicit_pattern[idx] = true;
        }
        if c.self_weight == Some(true) {
            sw_case = Some(idx);
        }
    }
    if beam.cases.is_empty() {
        return Err(Error::input(
            Location::in_file(src.file).with_field("case"),
            "the job has no load cases: add [[case]] tables with name and category",
        ));
    }
    let sw_case = sw_case.or_else(|| beam.cases.iter().position(|c| c.category == Category::Dead));
    beam.self_weight_case = sw_case;
    Ok(explicit_pattern)
}

/// A case's `pattern`: true, false or a pattern's name.
fn pattern(src: &Source<'_>, p: &toml::Spanned<RawPattern>, field: &str) -> Result<Pattern> {
    Ok(match p.get_ref() {
        RawPattern::On(true) => Pattern::Skip,
        RawPattern::On(false) => Pattern::None,
        RawPattern::Name(n) => match n.trim().to_ascii_lowercase().as_str() {
            "skip" | "on" | "true" => Pattern::Skip,
            "partial" | "half" => Pattern::Partial,
            "none" | "off" | "false" => Pattern::None,
            other => {
                return src.err(
                    p.span(),
                    &format!("{field}.pattern"),
                    format!("unknown pattern '{other}': expected true (skip loading: on or off by span), \"partial\" (full or half by span) or false"),
                );
            }
        },
    })
}
