//! Preparing a job: validate the criteria, apply long-term deflection,
//! place the bracing segments and analyse the beam once (`Prepared::new`);
//! and what a prepared job states on every output (what is not checked,
//! the assumptions).

use super::segments::{self, segments_of};
use super::{
    BracedFlange, Bracing, Criteria, LoadHeight, LongTerm, Material, MaterialKind, Prepared, timber,
};
use crate::beam::model::{Category, ComboKind};
use crate::beam::{Beam, Demand, Quantity};
use crate::error::{Error, Result};
use crate::section::{Form, Properties};

/// Apply the long-term creep factor to the service combinations that
/// include a dead case.
fn with_long_term(beam: &Beam, lt: &LongTerm) -> Beam {
    let mut b = beam.clone();
    for c in b.combinations.iter_mut() {
        if c.kind != ComboKind::Service
            || !c
                .factors
                .iter()
                .any(|(i, f)| *f != 0.0 && beam.cases[*i].category == Category::Dead)
        {
            continue;
        }
        for (i, f) in c.factors.iter_mut() {
            let psi = match beam.cases[*i].category {
                Category::Dead | Category::Other => 1.0,
                Category::Live => lt.sustained_live,
                _ => 0.0,
            };
            *f *= 1.0 + (lt.creep_factor - 1.0) * psi;
        }
        c.name = format!(
            "{} (long-term, K_cr = {})",
            c.name,
            crate::units::fmt_num(lt.creep_factor)
        );
    }
    b
}

impl Prepared {
    /// Analyse the beam once for these criteria.
    pub fn new(beam: &Beam, material: Material, criteria: Criteria) -> Result<Prepared> {
        material.validate()?;
        criteria.fit(material.kind, &format!("the material '{}'", material.name))?;
        if let Bracing::Spacing(s) = criteria.bracing
            && !(s.is_finite() && s >= 1e-3 * beam.length().max(1.0) && s > 0.0)
        {
            return Err(Error::msg(format!(
                "the brace spacing {} mm is not valid: expected at least 1/1000 of the beam's length",
                crate::units::fmt_num(s)
            ))
            .in_field("lateral_bracing"));
        }
        if let Some(k) = criteria.overhang_k
            && !(k.is_finite() && (0.5..=10.0).contains(&k))
        {
            return Err(Error::msg(
                "the overhang effective-length factor must be between 0.5 and 10",
            )
            .in_field("overhang_effective_length"));
        }
        let mut beam = match &criteria.long_term {
            Some(lt) => {
                if !(lt.creep_factor.is_finite() && (1.0..=5.0).contains(&lt.creep_factor)) {
                    return Err(Error::msg("the creep factor must be between 1 and 5")
                        .in_field("creep_factor"));
                }
                if !(0.0..=1.0).contains(&lt.sustained_live) {
                    return Err(Error::msg(
                        "the sustained fraction of live load must be between 0 and 1",
                    )
                    .in_field("sustained_live"));
                }
                with_long_term(beam, lt)
            }
            None => beam.clone(),
        };
        if !criteria.self_weight {
            beam.self_weight_case = None;
        }
        let segs = segments_of(&beam, &criteria);
        let mut extra = Vec::new();
        for &(a, b, ..) in &segs {
            for k in 0..=4 {
                extra.push(a + (b - a) * k as f64 / 4.0);
            }
        }
        let mut demand = Demand::build(&beam, &extra)?;
        let segments = segments::place(&segs, &demand.mesh.x, &criteria);
        let stretch_elems: Vec<(usize, usize)> = (0..demand.stretches.len())
            .map(|k| {
                let r = demand.stretch_elements(k);
                (r.start, r.end)
            })
            .collect();
        // The ranges the checks ask about (prepared.rs): the whole beam for
        // moment and shear, each stretch for deflection, each bracing
        // segment for moment.
        let ne = demand.len.len();
        demand.register(Quantity::Moment, 0..ne);
        demand.register(Quantity::Shear, 0..ne);
        for &(e0, e1) in &stretch_elems {
            demand.register(Quantity::Deflection, e0..e1);
        }
        for seg in &segments {
            demand.register(Quantity::Moment, seg.elems.0..seg.elems.1);
        }
        let strength = (0..demand.combos.len())
            .filter(|&i| demand.combos[i].kind == ComboKind::Strength)
            .collect();
        let service = (0..demand.combos.len())
            .filter(|&i| demand.combos[i].kind == ComboKind::Service)
            .collect();
        let duration = beam
            .combinations
            .iter()
            .map(|c| {
                timber::combination_cd(
                    c.factors
                        .iter()
                        .filter(|(_, f)| *f != 0.0)
                        .map(|(i, _)| beam.cases[*i].category),
                )
            })
            .collect();
        Ok(Prepared {
            demand,
            material,
            criteria,
            segments,
            duration,
            stretch_elems,
            strength,
            service,
        })
    }

    /// The same job with another material (the demand is reused: it does
    /// not depend on the material).
    pub fn new_from(prep: &Prepared, material: Material) -> Option<Prepared> {
        material.validate().ok()?;
        let mut p = prep.clone();
        p.material = material;
        Some(p)
    }

    /// What beamsift does not check for this section at all (outside its
    /// scope), in plain words.
    pub fn not_checked(&self, p: &Properties, m: Option<&Material>) -> Vec<String> {
        let m = m.unwrap_or(&self.material);
        let mut v = vec![
            "bearing and web crippling at supports and point loads, connections, vibration, fire resistance, durability, combined axial load and torsion".to_string(),
        ];
        if matches!(p.form, Form::WeldedI) {
            v.push("welds between the plates, and stiffeners (webs taken as unstiffened)".into());
        }
        if matches!(p.form, Form::Rhs { .. } | Form::Chs { .. }) && m.kind == MaterialKind::Steel {
            v.push("the design wall thickness: t is used as given (AISC 360-16 B4.2 takes 0.93 × the nominal thickness for electric-resistance-welded HSS: enter that as t)".into());
        }
        if m.kind == MaterialKind::Timber {
            v.push("notches, holes, and the volume factor C_V of glulam (enter it in the adjustment factors)".into());
        }
        if self.criteria.long_term.is_none() {
            v.push("long-term (creep) deflection: set checks.creep_factor to include it".into());
        }
        v
    }

    /// The assumptions a checker needs, for every output (lengths in SI).
    pub fn assumptions(&self) -> Vec<String> {
        self.assumptions_in(crate::units::System::Si)
    }

    /// [`Prepared::assumptions`] with lengths in the display units `sys`.
    pub fn assumptions_in(&self, sys: crate::units::System) -> Vec<String> {
        let c = &self.criteria;
        let mut v = Vec::new();
        match c.bracing {
            Bracing::NotGiven => v.push("lateral bracing not given: read as braced at the supports only (conservative)".to_string()),
            Bracing::Supports => v.push("laterally braced at the supports only".to_string()),
            Bracing::Continuous => v.push(match c.braced_flange {
                BracedFlange::Top => "top flange continuously braced; the bottom flange, in compression under hogging, is unbraced between supports".to_string(),
                BracedFlange::Both => "both flanges continuously braced: no lateral instability".to_string(),
            }),
            Bracing::Spacing(s) => v.push(match c.braced_flange {
                BracedFlange::Top => format!(
                    "braces every {} restrain the top flange only; under hogging the bottom flange is unbraced between supports",
                    crate::units::Show::Span.fmt(s, sys)
                ),
                BracedFlange::Both => format!(
                    "braces every {} restrain both flanges (or twist)",
                    crate::units::Show::Span.fmt(s, sys)
                ),
            }),
        }
        v.push("every pinned, roller or fixed support restrains the member laterally and against twist; spring supports and free ends do not (conservative)".into());
        if !c.self_weight {
            v.push("the section's self-weight is not included (by the user's choice)".into());
        }
        if c.braced_flange == BracedFlange::Top
            && matches!(c.bracing, Bracing::Continuous | Bracing::Spacing(_))
        {
            v.push("bottom flange in compression (hogging) between supports: the whole span is one unbraced length with C_b = 1.0 (conservative; AISC 360-16 Commentary F1 gives higher values for a braced top flange, to be applied by hand)".into());
        }
        v.push(match c.load_height {
            LoadHeight::ShearCentre => "load height not considered: loads taken at the shear centre (not destabilising), as AISC 360-16 F2–F5 assume; set load_height = \"top_flange\" for loads that move sideways with the top flange".into(),
            LoadHeight::TopFlange => "destabilising loads on the top flange: effective lengths 1.2 × the unbraced length between restraints (from memory of BS 5950-1:2000 Table 13)".into(),
        });
        if self.demand.stretches.iter().any(|s| s.cantilever) {
            v.push(format!(
                "overhangs: the free-tip segment's effective length is {} × its length ({}), C_b = 1.0 (AISC 360-16 F1)",
                crate::units::fmt_num(c.overhang_factor()),
                if c.overhang_k.is_some() {
                    "as given".to_string()
                } else {
                    "from memory of BS 5950-1:2000 Table 14, support continuous with lateral and torsional restraint, tip free".to_string()
                }
            ));
        }
        if self.segments.iter().any(|g| {
            g.free_end
                && (g.k - c.brace_rooted_factor()).abs() < 1e-12
                && c.braced_flange == BracedFlange::Top
        }) {
            v.push(format!(
                "a free end's segment whose other end is a top-flange brace (not a support): effective length {} × its length (from memory of BS 5950-1:2000 Table 14, continuous with lateral restraint to the top flange only, tip free)",
                crate::units::fmt_num(c.brace_rooted_factor())
            ));
        }
        if !self.demand.springs.is_empty() {
            v.push("spring supports: deflection limits measured from the chord of each span's displaced supports (the member's own deflection); the settlements are reported apart".into());
        }
        v
    }
}
