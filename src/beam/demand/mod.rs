//! The demand: the beam analysed once, for every case and combination, as
//! element polynomials for E·I = 1, plus the response to a unit uniform
//! self-weight. A section check then only scales and adds (see DESIGN.md,
//! "analyse once, check many"):
//!
//!   M(x) = Σ factor·M_case(x) + w_sw·f_sw·M_unit(x)
//!   δ(x) = (Σ factor·y_case(x) + w_sw·f_sw·y_unit(x)) / (E·I)
//!
//! Pattern (skip) loading: a case marked `pattern` is split into one part
//! per stretch (span or overhang); at each station the envelope adds only
//! the parts that make the value worse. The maximum of the envelope is
//! located on stations (element ends and interior points) and then refined
//! exactly on the element polynomials with the pattern found there.
//!
//! Spring supports. With springs, moment and shear depend on E·I, so the
//! analysis holds every spring rigid and adds one basis response per spring:
//! a unit downward settlement of that support (E·I = 1). For a section of
//! stiffness E·I, the settlements Δ solve the compatibility of the spring
//! forces with the reactions (with u = E·I·Δ):
//!
//!   (diag(k/(E·I)) − ρ)·u = R₀
//!
//! where R₀ are the rigid-support reactions at the springs and ρ_ij the
//! reaction at spring i for a unit settlement of spring j (ρ is negative
//! semi-definite, so the matrix is positive definite for k > 0). Every
//! coefficient of the combined response is then c₀ + Σ_j u_j·c_j; the
//! small system is solved, on the stack, when a combination is applied to
//! a section ([`Demand::apply`]): no re-analysis and no allocation. k → ∞ gives u → 0 (rigid); k → 0 gives zero reaction at the
//! spring (support removed). Deflections stay measured from the chord of
//! each span's displaced supports; the settlements are reported apart.

mod extremes;
mod lookup;
mod pattern;
mod section;
mod springs;

pub use extremes::{Extremes, element_extremes, eval};
pub(crate) use pattern::{PatternEnv, Pre};
pub use springs::SpringBasis;

use super::model::{Beam, Combination, ComboKind, DeflectionLimit, Stretch};
use super::solve::{self, Mesh, MeshLoad, Response};
use crate::error::{Error, Result};
use pattern::pattern_env;

/// Most spring supports in one beam (the per-section compatibility system
/// lives on the stack).
pub const MAX_SPRINGS: usize = 16;

/// Most pattern parts (case × span with loads) in one combination: the
/// envelope records which parts are active as bits of a u64.
pub const MAX_PATTERN_PARTS: usize = 64;

/// What the demand needs to know of one section: its self-weight
/// intensity and bending stiffness. Built once per section by
/// [`Demand::section`].
#[derive(Clone, Debug)]
pub struct SectionLoad {
    /// Self-weight intensity, N/mm.
    pub w_sw: f64,
    /// Bending stiffness E·I, N·mm² (only needed with springs and for
    /// deflections).
    pub ei: f64,
    /// Number of springs.
    ns: usize,
}

/// One combination applied to one section: the self-weight scale and the
/// spring correction of the non-patterned loads.
#[derive(Clone, Copy, Debug)]
pub struct Applied<'a> {
    pub combo: &'a ComboDemand,
    pub sect: &'a SectionLoad,
    /// Self-weight intensity times the combination's self-weight factor.
    s: f64,
    /// E·I × settlement of each spring under the non-patterned loads.
    u: [f64; MAX_SPRINGS],
}

/// A combination ready for checking.
#[derive(Clone, Debug)]
pub struct ComboDemand {
    pub name: String,
    pub kind: ComboKind,
    pub limit: Option<DeflectionLimit>,
    /// Response to the combination's non-patterned loads (factors applied).
    pub fixed: Response,
    /// Factor on the self-weight (0 when self-weight is off or its case is
    /// not in this combination).
    pub sw_factor: f64,
    /// Patterned parts (factored), one per (case, stretch) with loads.
    pub patterns: Vec<Response>,
    /// Label of each pattern part, e.g. "live on span 2".
    pub pattern_labels: Vec<String>,
    /// The section-independent part of the pattern envelope, per quantity
    /// (moment, shear, deflection); empty without patterns.
    pub(crate) env: Vec<PatternEnv>,
    /// Per element and quantity, the extremes precomputed for every section
    /// where they can be (no patterns, no springs); empty otherwise.
    pub(crate) pre: Vec<[Pre; 3]>,
    /// Extremes looked up by self-weight interval for the element ranges
    /// the checks ask about ([`Demand::register`]).
    pub(crate) lookups: Vec<lookup::Lookup>,
}

/// The beam analysed once.
#[derive(Clone, Debug)]
pub struct Demand {
    pub mesh: Mesh,
    /// Element lengths.
    pub len: Vec<f64>,
    pub stretches: Vec<Stretch>,
    pub node_x: Vec<f64>,
    /// Response to each load case (unfactored, not patterned).
    pub cases: Vec<Response>,
    /// Response to a uniform 1 N/mm over the whole beam.
    pub unit_sw: Response,
    pub combos: Vec<ComboDemand>,
    pub cantilever_factor: f64,
    /// Spring supports, in node order.
    pub springs: Vec<SpringBasis>,
    /// ρ[i·n + j]: upward reaction at spring i for a unit downward
    /// settlement of spring j, E·I = 1 (n = number of springs).
    pub rho: Vec<f64>,
}

/// Which response quantity.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Quantity {
    Moment,
    Shear,
    Deflection,
}

impl Quantity {
    /// Position in per-quantity arrays (moment, shear, deflection).
    #[inline]
    pub(crate) fn index(self) -> usize {
        match self {
            Quantity::Moment => 0,
            Quantity::Shear => 1,
            Quantity::Deflection => 2,
        }
    }
}

impl Demand {
    /// Make the extremes of quantity `q` over `elems` a lookup by
    /// self-weight interval in every combination where that saves work
    /// (see `lookup.rs`); [`Demand::extremes`] then uses it for exactly
    /// this range. Call once per range a check will ask about.
    pub fn register(&mut self, q: Quantity, elems: std::ops::Range<usize>) {
        for ci in 0..self.combos.len() {
            let known = self.combos[ci]
                .lookups
                .iter()
                .any(|l| l.q == q && l.elems == (elems.start, elems.end));
            if known {
                continue;
            }
            if let Some(l) = lookup::Lookup::new(self, ci, q, elems.clone()) {
                self.combos[ci].lookups.push(l);
            }
        }
    }

    /// Analyse every case, the unit self-weight, and every combination.
    /// `extra` adds stations (brace points, quarter points) to the mesh.
    pub fn build(beam: &Beam, extra: &[f64]) -> Result<Demand> {
        beam.validate()?;
        let mesh = solve::mesh(beam, extra);
        let len: Vec<f64> = mesh.x.windows(2).map(|w| w[1] - w[0]).collect();
        let stretches = beam.stretches();
        let case_loads: Vec<Vec<MeshLoad>> = (0..beam.cases.len())
            .map(|c| {
                beam.loads
                    .iter()
                    .filter(|l| l.case == c)
                    .map(|l| MeshLoad::from(&l.kind))
                    .collect()
            })
            .collect();
        let cases = case_loads
            .iter()
            .map(|loads| solve::analyse(beam, &mesh, loads))
            .collect::<Result<Vec<_>>>()?;
        let length = beam.length();
        let unit_sw = solve::analyse(
            beam,
            &mesh,
            &[MeshLoad::Distributed {
                x1: 0.0,
                x2: length,
                w1: 1.0,
                w2: 1.0,
            }],
        )?;
        let parts = pattern::parts(beam, &mesh, &case_loads, &stretches)?;
        let (springs, rho) = springs::bases(beam, &mesh)?;
        let analysed = Analysed {
            beam,
            ne: mesh.elements(),
            nodes: beam.supports.len(),
            len: &len,
            cases: &cases,
            unit_sw: &unit_sw,
            parts: &parts,
            springs: !springs.is_empty(),
        };
        let combos = beam
            .combinations
            .iter()
            .map(|c| analysed.combo(c))
            .collect::<Result<Vec<_>>>()?;
        Ok(Demand {
            len,
            stretches,
            node_x: beam.node_x(),
            cases,
            unit_sw,
            combos,
            mesh,
            cantilever_factor: beam.cantilever_factor,
            springs,
            rho,
        })
    }
}

/// What every combination of a demand is built from.
struct Analysed<'a> {
    beam: &'a Beam,
    /// Elements and beam nodes.
    ne: usize,
    nodes: usize,
    len: &'a [f64],
    cases: &'a [Response],
    unit_sw: &'a Response,
    parts: &'a pattern::Parts,
    /// The beam has spring supports.
    springs: bool,
}

impl Analysed<'_> {
    /// One combination: its fixed (non-patterned) response, its pattern
    /// parts, its self-weight factor, and what can be known of its
    /// extremes before any section (the pattern envelope, or per element).
    fn combo(&self, c: &Combination) -> Result<ComboDemand> {
        let (ne, nodes) = (self.ne, self.nodes);
        let mut fixed = Response::zero(ne, nodes);
        let mut patterns = Vec::new();
        let mut pattern_labels = Vec::new();
        let mut sw_factor = 0.0;
        for &(ci, f) in &c.factors {
            if Some(ci) == self.beam.self_weight_case {
                sw_factor += f;
            }
            if !self.parts.parts[ci].is_empty() {
                let share = self.parts.share[ci];
                for (label, r) in &self.parts.parts[ci] {
                    let mut p = Response::zero(ne, nodes);
                    p.add_scaled(f * share, r);
                    patterns.push(p);
                    pattern_labels.push(label.clone());
                }
                if share < 1.0 {
                    fixed.add_scaled(f * (1.0 - share), &self.cases[ci]);
                }
            } else {
                fixed.add_scaled(f, &self.cases[ci]);
            }
        }
        let env = if patterns.is_empty() || self.springs {
            // With springs every part's response depends on E·I:
            // the envelope is formed per section.
            Vec::new()
        } else {
            [Quantity::Moment, Quantity::Shear, Quantity::Deflection]
                .iter()
                .map(|&q| pattern_env(&patterns, q, self.len))
                .collect()
        };
        if patterns.len() > MAX_PATTERN_PARTS {
            return Err(Error::msg(format!(
                "combination '{}' has {} patterned parts (load case × span): at most {MAX_PATTERN_PARTS} are supported; turn pattern loading off for some cases (pattern = false)",
                c.name,
                patterns.len()
            )));
        }
        let pre = if patterns.is_empty() && !self.springs {
            pattern::precomputed(&fixed, self.unit_sw, sw_factor, self.len)
        } else {
            Vec::new()
        };
        Ok(ComboDemand {
            pre,
            name: c.name.clone(),
            kind: c.kind,
            limit: c.limit,
            fixed,
            sw_factor,
            patterns,
            pattern_labels,
            env,
            lookups: Vec::new(),
        })
    }
}
