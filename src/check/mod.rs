//! Checks of one section against a prepared demand: bending stress at the
//! top and bottom fibres (sagging and hogging), shear, deflection of every
//! serviceability combination, and lateral-torsional buckling where an
//! unbraced length is given.
//!
//! * Bending: f = M·c/I = M/S (flexure formula), against the allowable
//!   bending stress of the fibre's sense (tension or compression).
//! * Shear: the average web shear V/(d·tw) for I-shapes (AISC 360-16 G2.1,
//!   A_w = d·tw), otherwise the peak V·Q/(I·t) at the neutral axis
//!   (Jourawski's formula), against the allowable shear stress.
//! * Deflection: δ = y/(E·I) against L/n and/or an absolute limit per span;
//!   for an overhang L is `cantilever_factor` × its length (2 by common
//!   practice).
//! * Lateral-torsional buckling: see [`ltb`].
//!
//! The per-section path allocates nothing: it scales and adds the demand's
//! polynomials (see `beam::demand`).

pub mod ltb;

use crate::beam::model::ComboKind;
use crate::beam::{Beam, Demand, Quantity};
use crate::error::{Error, Result};
use crate::section::Properties;
use crate::units::G;
use serde::{Deserialize, Serialize};

/// Material: stiffness, allowable stresses, density.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Material {
    pub name: String,
    /// Modulus of elasticity E, MPa.
    pub e: f64,
    /// Allowable bending stress at a fibre in tension, MPa.
    pub fb_tension: f64,
    /// Allowable bending stress at a fibre in compression, MPa.
    pub fb_compression: f64,
    /// Allowable shear stress, MPa (None: shear not checked).
    pub fv: Option<f64>,
    /// Yield stress, MPa (needed for lateral-torsional buckling of steel).
    pub fy: Option<f64>,
    /// Density, kg/m³.
    pub density: f64,
}

impl Material {
    pub fn validate(&self) -> Result<()> {
        let pos = |name: &str, v: f64| -> Result<()> {
            if !v.is_finite() || v <= 0.0 {
                return Err(Error::msg(format!(
                    "{name} = {} is not valid: expected a value greater than zero",
                    crate::units::fmt_num(v)
                ))
                .in_field(&format!("material.{name}")));
            }
            Ok(())
        };
        pos("E", self.e)?;
        pos("Fb (tension)", self.fb_tension)?;
        pos("Fb (compression)", self.fb_compression)?;
        if let Some(v) = self.fv {
            pos("Fv", v)?;
        }
        if let Some(v) = self.fy {
            pos("Fy", v)?;
        }
        if !self.density.is_finite() || self.density < 0.0 {
            return Err(Error::msg("density must be zero or more").in_field("material.density"));
        }
        Ok(())
    }
}

/// Lateral bracing of the compression flange.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Bracing {
    /// Not given: lateral stability is not checked (and the output says so).
    NotGiven,
    /// Continuously braced (e.g. by a fixed deck): no lateral-torsional buckling.
    Continuous,
    /// Braced at the supports and at this spacing along each span (mm).
    Spacing(f64),
    /// Braced at the supports only.
    Supports,
}

/// How shear is checked.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "snake_case")]
pub enum ShearMethod {
    /// Average web shear for I-shapes, V·Q/(I·t) otherwise.
    #[default]
    Auto,
    /// V·Q/(I·t) at the neutral axis for every shape.
    PeakVq,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Criteria {
    pub bracing: Bracing,
    pub shear: ShearMethod,
    /// Add the section's self-weight to its case.
    pub self_weight: bool,
}

impl Default for Criteria {
    fn default() -> Self {
        Criteria {
            bracing: Bracing::NotGiven,
            shear: ShearMethod::Auto,
            self_weight: true,
        }
    }
}

/// What a check line is about.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum CheckKind {
    /// Sagging moment, top fibre in compression.
    BendingSaggingTop,
    /// Sagging moment, bottom fibre in tension.
    BendingSaggingBottom,
    /// Hogging moment, top fibre in tension.
    BendingHoggingTop,
    /// Hogging moment, bottom fibre in compression.
    BendingHoggingBottom,
    Shear,
    LateralTorsional,
    Deflection,
}

impl CheckKind {
    pub fn label(self) -> &'static str {
        match self {
            CheckKind::BendingSaggingTop => "bending, sagging, top fibre (compression)",
            CheckKind::BendingSaggingBottom => "bending, sagging, bottom fibre (tension)",
            CheckKind::BendingHoggingTop => "bending, hogging, top fibre (tension)",
            CheckKind::BendingHoggingBottom => "bending, hogging, bottom fibre (compression)",
            CheckKind::Shear => "shear",
            CheckKind::LateralTorsional => "lateral-torsional buckling",
            CheckKind::Deflection => "deflection",
        }
    }
    pub fn short(self) -> &'static str {
        match self {
            CheckKind::BendingSaggingTop => "bending +M top (C)",
            CheckKind::BendingSaggingBottom => "bending +M bottom (T)",
            CheckKind::BendingHoggingTop => "bending −M top (T)",
            CheckKind::BendingHoggingBottom => "bending −M bottom (C)",
            CheckKind::Shear => "shear",
            CheckKind::LateralTorsional => "lateral-torsional buckling",
            CheckKind::Deflection => "deflection",
        }
    }
}

/// One check line: demand against capacity.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Item {
    pub kind: CheckKind,
    /// Index of the combination in the beam's list.
    pub combo: usize,
    /// Stretch (span/overhang) index for deflection, segment index for
    /// lateral-torsional buckling.
    pub part: usize,
    /// Position along the beam, mm.
    pub x: f64,
    /// Action at x: moment (N·mm), shear (N) or deflection (mm).
    pub action: f64,
    /// Demand: stress (MPa), moment (N·mm, for buckling) or deflection (mm).
    pub demand: f64,
    /// Capacity in the same unit as the demand.
    pub capacity: f64,
    pub utilisation: f64,
}

/// The outcome for one section: the largest utilisation and its check.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Summary {
    pub utilisation: f64,
    pub governing: Option<Item>,
    pub passes: bool,
}

/// A section as the checks see it.
#[derive(Clone, Copy, Debug)]
pub struct SectionInput<'a> {
    pub props: &'a Properties,
    /// Mass per length, kg/m (for self-weight).
    pub mass: f64,
    /// The section's own material (a catalogue row's grade); None = the job's.
    pub material: Option<&'a Material>,
}

impl<'a> SectionInput<'a> {
    pub fn new(props: &'a Properties, mass: f64) -> Self {
        SectionInput {
            props,
            mass,
            material: None,
        }
    }
    pub fn with_material(mut self, m: &'a Material) -> Self {
        self.material = Some(m);
        self
    }
}

/// An unbraced segment for lateral-torsional buckling.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Segment {
    pub x1: f64,
    pub x2: f64,
    /// Mesh nodes at x1, the quarter points and x2.
    pub nodes: [usize; 5],
    /// Elements inside the segment.
    pub elems: (usize, usize),
    /// One end is a free (cantilever) tip: Cb = 1.
    pub free_end: bool,
}

/// A job analysed once and ready to check any number of sections.
#[derive(Clone, Debug)]
pub struct Prepared {
    pub demand: Demand,
    pub material: Material,
    pub criteria: Criteria,
    pub segments: Vec<Segment>,
    stretch_elems: Vec<(usize, usize)>,
    strength: Vec<usize>,
    service: Vec<usize>,
}

/// Brace points: supported nodes, and every `spacing` along each stretch
/// from its supported end.
fn brace_points(beam: &Beam, bracing: Bracing) -> Vec<(f64, f64, bool)> {
    let spacing = match bracing {
        Bracing::Spacing(s) => Some(s),
        Bracing::Supports => None,
        _ => return Vec::new(),
    };
    let mut segs = Vec::new();
    for s in beam.stretches() {
        let len = s.x2 - s.x1;
        let n = spacing
            .map(|sp| (len / sp - 1e-9).ceil().max(1.0) as usize)
            .unwrap_or(1);
        let from_right = s.cantilever && s.left_node.is_none();
        for k in 0..n {
            let (a, b) = if from_right {
                let b = s.x2 - k as f64 * spacing.unwrap_or(len);
                (((b - spacing.unwrap_or(len)).max(s.x1)), b)
            } else {
                let a = s.x1 + k as f64 * spacing.unwrap_or(len);
                (a, (a + spacing.unwrap_or(len)).min(s.x2))
            };
            let free = s.cantilever && k == n - 1;
            segs.push((a, b, free));
        }
    }
    segs
}

impl Prepared {
    /// Analyse the beam once for these criteria.
    pub fn new(beam: &Beam, material: Material, criteria: Criteria) -> Result<Prepared> {
        material.validate()?;
        if let Bracing::Spacing(s) = criteria.bracing
            && (!s.is_finite() || s <= 0.0)
        {
            return Err(Error::msg("the unbraced length must be greater than zero")
                .in_field("lateral_bracing"));
        }
        let mut beam = beam.clone();
        if !criteria.self_weight {
            beam.self_weight_case = None;
        }
        let segs = brace_points(&beam, criteria.bracing);
        let mut extra = Vec::new();
        for &(a, b, _) in &segs {
            for k in 0..=4 {
                extra.push(a + (b - a) * k as f64 / 4.0);
            }
        }
        let demand = Demand::build(&beam, &extra)?;
        let node_of = |x: f64| -> usize {
            demand
                .mesh
                .x
                .iter()
                .enumerate()
                .min_by(|a, b| (a.1 - x).abs().total_cmp(&(b.1 - x).abs()))
                .map(|p| p.0)
                .unwrap_or(0)
        };
        let segments = segs
            .iter()
            .map(|&(a, b, free)| {
                let nodes = [0, 1, 2, 3, 4].map(|k| node_of(a + (b - a) * k as f64 / 4.0));
                Segment {
                    x1: a,
                    x2: b,
                    nodes,
                    elems: (nodes[0], nodes[4]),
                    free_end: free,
                }
            })
            .collect();
        let stretch_elems = (0..demand.stretches.len())
            .map(|k| {
                let r = demand.stretch_elements(k);
                (r.start, r.end)
            })
            .collect();
        let strength = (0..demand.combos.len())
            .filter(|&i| demand.combos[i].kind == ComboKind::Strength)
            .collect();
        let service = (0..demand.combos.len())
            .filter(|&i| demand.combos[i].kind == ComboKind::Service)
            .collect();
        Ok(Prepared {
            demand,
            material,
            criteria,
            segments,
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

    /// Self-weight intensity (N/mm) of a section of `mass` kg/m.
    #[inline]
    pub fn self_weight(&self, mass: f64) -> f64 {
        if self.criteria.self_weight {
            mass * G / 1000.0
        } else {
            0.0
        }
    }

    /// Visit every check line of a section (no allocation).
    pub fn visit<F: FnMut(Item)>(&self, sec: SectionInput<'_>, mut f: F) {
        let p = sec.props;
        let m = sec.material.unwrap_or(&self.material);
        let w = self.self_weight(sec.mass);
        let d = &self.demand;
        let ne = d.len.len();
        let shear_stress = shear_factor(p, self.criteria.shear);
        let ei = m.e * p.ix;
        let sl = d.section(w, ei);
        for &ci in &self.strength {
            let combo = d.apply(ci, &sl);
            let mx = d.extremes(&combo, Quantity::Moment, 0..ne);
            if mx.max > 0.0 {
                let ft = mx.max / p.s_top;
                let fb = mx.max / p.s_bot;
                f(item(
                    CheckKind::BendingSaggingTop,
                    ci,
                    0,
                    mx.x_max,
                    mx.max,
                    ft,
                    m.fb_compression,
                ));
                f(item(
                    CheckKind::BendingSaggingBottom,
                    ci,
                    0,
                    mx.x_max,
                    mx.max,
                    fb,
                    m.fb_tension,
                ));
            }
            if mx.min < 0.0 {
                let ft = -mx.min / p.s_top;
                let fb = -mx.min / p.s_bot;
                f(item(
                    CheckKind::BendingHoggingTop,
                    ci,
                    0,
                    mx.x_min,
                    mx.min,
                    ft,
                    m.fb_tension,
                ));
                f(item(
                    CheckKind::BendingHoggingBottom,
                    ci,
                    0,
                    mx.x_min,
                    mx.min,
                    fb,
                    m.fb_compression,
                ));
            }
            if let (Some(fv), Some(k)) = (m.fv, shear_stress) {
                let v = d.extremes(&combo, Quantity::Shear, 0..ne);
                let (vv, x) = v.abs_max();
                f(item(CheckKind::Shear, ci, 0, x, vv, vv.abs() * k, fv));
            }
            if let Some(cap) = ltb::Capacity::new(p, m, self.criteria.bracing) {
                for (si, seg) in self.segments.iter().enumerate() {
                    let ex = d.extremes(&combo, Quantity::Moment, seg.elems.0..seg.elems.1);
                    let (mmax, x) = ex.abs_max();
                    if mmax == 0.0 {
                        continue;
                    }
                    let cb = if seg.free_end {
                        1.0
                    } else {
                        let q = |k: usize| d.abs_moment_at_node(&combo, seg.nodes[k]);
                        ltb::cb(mmax.abs(), q(1), q(2), q(3))
                    };
                    let ma = cap.allowable(seg.x2 - seg.x1, cb);
                    f(item(
                        CheckKind::LateralTorsional,
                        ci,
                        si,
                        x,
                        mmax,
                        mmax.abs(),
                        ma,
                    ));
                }
                if self.criteria.bracing == Bracing::Continuous {
                    let (mmax, x) = mx.abs_max();
                    if mmax != 0.0 {
                        let ma = cap.allowable(0.0, 1.0);
                        f(item(
                            CheckKind::LateralTorsional,
                            ci,
                            0,
                            x,
                            mmax,
                            mmax.abs(),
                            ma,
                        ));
                    }
                }
            }
        }
        for &ci in &self.service {
            let combo = d.apply(ci, &sl);
            let Some(limit) = combo.combo.limit else {
                continue;
            };
            for (k, &(a, b)) in self.stretch_elems.iter().enumerate() {
                let st = &d.stretches[k];
                let ex = d.extremes(&combo, Quantity::Deflection, a..b);
                let (y, x) = ex.abs_max();
                let delta = y / ei;
                let mut l_eff = st.x2 - st.x1;
                if st.cantilever {
                    l_eff *= d.cantilever_factor;
                }
                let mut allow = f64::INFINITY;
                if let Some(n) = limit.ratio {
                    allow = allow.min(l_eff / n);
                }
                if let Some(abs) = limit.absolute {
                    allow = allow.min(abs);
                }
                f(item(
                    CheckKind::Deflection,
                    ci,
                    k,
                    x,
                    delta,
                    delta.abs(),
                    allow,
                ));
            }
        }
    }

    /// The governing check of a section.
    pub fn check(&self, sec: SectionInput<'_>) -> Summary {
        let mut best: Option<Item> = None;
        self.visit(sec, |it| {
            let better = match &best {
                None => true,
                // Ties (within round-off) keep the first check in the fixed
                // visiting order, so the governing check is deterministic.
                Some(b) => {
                    it.utilisation > b.utilisation * (1.0 + 1e-12) || it.utilisation.is_nan()
                }
            };
            if better {
                best = Some(it);
            }
        });
        let util = best.map(|b| b.utilisation).unwrap_or(0.0);
        Summary {
            utilisation: util,
            governing: best,
            passes: util <= 1.0,
        }
    }

    /// Every check line of a section.
    pub fn check_all(&self, sec: SectionInput<'_>) -> Vec<Item> {
        let mut v = Vec::new();
        self.visit(sec, |it| v.push(it));
        v
    }

    /// What these checks leave out for this section, in plain words.
    pub fn not_checked(&self, p: &Properties) -> Vec<String> {
        let mut v = Vec::new();
        match self.criteria.bracing {
            Bracing::NotGiven => v.push(
                "lateral stability (lateral-torsional buckling): no unbraced length was given"
                    .to_string(),
            ),
            _ => {
                if let Err(why) = ltb::Capacity::applicable(p, &self.material) {
                    v.push(format!("lateral-torsional buckling: {why}"));
                }
            }
        }
        if self.material.fv.is_none() {
            v.push("shear: no allowable shear stress Fv was given".into());
        } else if shear_factor(p, self.criteria.shear).is_none() {
            v.push("shear: the section's web thickness or first moment Q is not known".into());
        }
        v.push(
            "bearing and web crippling at supports and point loads, connections, vibration, fire resistance, durability, combined axial load and torsion"
                .into(),
        );
        v.push(
            "long-term effects such as creep of timber, and load-duration or size factors: enter allowable stresses and limits that already include them"
                .into(),
        );
        v
    }
}

/// Shear stress per unit shear force (1/mm²) for the chosen method, or
/// None when the section lacks what the method needs.
fn shear_factor(p: &Properties, method: ShearMethod) -> Option<f64> {
    let vq = match (p.q_na, p.t_na) {
        (Some(q), Some(t)) if t > 0.0 => Some(q / (p.ix * t)),
        _ => None,
    };
    match method {
        ShearMethod::Auto => p.web_area.map(|a| 1.0 / a).or(vq),
        ShearMethod::PeakVq => vq,
    }
}

#[inline]
fn item(
    kind: CheckKind,
    combo: usize,
    part: usize,
    x: f64,
    action: f64,
    demand: f64,
    capacity: f64,
) -> Item {
    Item {
        kind,
        combo,
        part,
        x,
        action,
        demand,
        capacity,
        utilisation: demand / capacity,
    }
}
