//! The `[checks]` table: the criteria, refusal of settings that would
//! change nothing, and whether the criteria suit each material.

use super::raw::RawChecks;
use super::source::Source;
use super::values::{parse_braced_flange, parse_bracing, parse_load_height};
use crate::check::{Bracing, Criteria, LoadHeight, LongTerm, Material, ShearMethod};
use crate::error::{Location, Result};

/// The criteria: the defaults, with what `[checks]` gives.
pub(super) fn criteria(src: &Source<'_>, raw: Option<&RawChecks>) -> Result<Criteria> {
    let mut criteria = Criteria::default();
    let Some(c) = raw else {
        return Ok(criteria);
    };
    if let Some(b) = &c.lateral_bracing {
        criteria.bracing = parse_bracing(b.get_ref())
            .map_err(|e| e.at(&src.loc(b.span(), "checks.lateral_bracing")))?;
    }
    if let Some(s) = &c.shear {
        criteria.shear = match s.get_ref().as_str() {
            "auto" => ShearMethod::Auto,
            "peak_vq" => ShearMethod::PeakVq,
            other => {
                return src.err(
                    s.span(),
                    "checks.shear",
                    format!("unknown shear method '{other}': expected auto or peak_vq"),
                );
            }
        };
    }
    if let Some(f) = &c.braced_flange {
        criteria.braced_flange = parse_braced_flange(f.get_ref())
            .map_err(|e| e.at(&src.loc(f.span(), "checks.braced_flange")))?;
    }
    if let Some(h) = &c.load_height {
        criteria.load_height = parse_load_height(h.get_ref())
            .map_err(|e| e.at(&src.loc(h.span(), "checks.load_height")))?;
    }
    if let Some(k) = &c.overhang_effective_length {
        criteria.overhang_k = Some(*k.get_ref());
    }
    if let Some(sw) = c.self_weight {
        criteria.self_weight = sw;
    }
    if let Some(list) = &c.exclude {
        for name in list.get_ref() {
            criteria
                .exclude
                .add(name.get_ref())
                .map_err(|e| e.at(&src.loc(name.span(), "checks.exclude")))?;
        }
    }
    match (&c.creep_factor, &c.sustained_live) {
        (Some(k), s) => {
            criteria.long_term = Some(LongTerm {
                creep_factor: *k.get_ref(),
                sustained_live: s.as_ref().map(|s| *s.get_ref()).unwrap_or(0.0),
            })
        }
        (None, Some(s)) => {
            return src.err(
                s.span(),
                "checks.sustained_live",
                "sustained_live needs creep_factor (the long-term deflection factor K_cr)",
            );
        }
        (None, None) => {}
    }
    Ok(criteria)
}

/// Check settings that would change nothing are refused, not ignored;
/// and the criteria must suit the job's material and every grade (a load
/// height or overhang factor for a material without a stability method is
/// refused at its key).
pub(super) fn refuse_unsuitable(
    src: &Source<'_>,
    raw: Option<&RawChecks>,
    criteria: &Criteria,
    material: &Material,
    grades: &[(String, Material)],
) -> Result<()> {
    if let Some(c) = raw {
        if let Some(f) = &c.braced_flange
            && !matches!(criteria.bracing, Bracing::Continuous | Bracing::Spacing(_))
        {
            return src.err(
                f.span(),
                "checks.braced_flange",
                "braced_flange says which flange the braces between supports restrain, but lateral_bracing gives none (braced at the supports only): set lateral_bracing = \"continuous\" or a spacing, or leave braced_flange out",
            );
        }
        if let Some(sh) = &c.shear
            && criteria.shear == ShearMethod::PeakVq
            && material.fv.is_none()
            && grades.iter().all(|(_, g)| g.fv.is_none())
        {
            return src.err(
                sh.span(),
                "checks.shear",
                "shear = \"peak_vq\" chooses how the stress checked against the allowable Fv is found, but no material gives Fv (steel shear is checked by AISC 360-16 G): give Fv, or leave shear out",
            );
        }
    }
    for (name, m) in
        std::iter::once(("material", material)).chain(grades.iter().map(|(n, m)| (n.as_str(), m)))
    {
        let what = if name == "material" {
            "the job's material".to_string()
        } else {
            format!("the grade '{name}'")
        };
        if let Err(e) = criteria.fit(m.kind, &what) {
            let key = match raw {
                Some(c) if criteria.load_height == LoadHeight::TopFlange => c
                    .load_height
                    .as_ref()
                    .map(|h| (h.span(), "checks.load_height")),
                Some(c) => c
                    .overhang_effective_length
                    .as_ref()
                    .map(|k| (k.span(), "checks.overhang_effective_length")),
                None => None,
            };
            return Err(match key {
                Some((span, f)) => e.at(&src.loc(span, f)),
                None => e.at(&Location::in_file(src.file)),
            });
        }
    }
    Ok(())
}
