//! The hot path: a prepared job checks a section by scaling and adding the
//! demand's polynomials (`Prepared::visit`, `check`, `check_all`), with no
//! allocation. One concern, kept in one file: `visit` and `stability` are
//! the measured path (benches/) and are not restructured here.

use super::{
    CheckKind, Criteria, Gap, Gaps, Item, Material, MaterialKind, Segment, Sense, ShearMethod,
    Summary, Verdict, steel, timber,
};
use crate::beam::{Demand, Quantity};
use crate::section::{Form, Properties};
use crate::units::G;

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

/// Receives what a section's check produces.
pub trait Sink {
    fn item(&mut self, it: Item);
    fn gap(&mut self, g: Gap);
}

impl<F: FnMut(Item)> Sink for F {
    fn item(&mut self, it: Item) {
        self(it)
    }
    fn gap(&mut self, _g: Gap) {}
}

/// A job analysed once and ready to check any number of sections.
#[derive(Clone, Debug)]
pub struct Prepared {
    pub demand: Demand,
    pub material: Material,
    pub criteria: Criteria,
    pub segments: Vec<Segment>,
    /// Load duration factor C_D of each combination by NDS Table 2.3.2
    /// (used for timber without a fixed C_D).
    pub duration: Vec<f64>,
    pub(super) stretch_elems: Vec<(usize, usize)>,
    pub(super) strength: Vec<usize>,
    pub(super) service: Vec<usize>,
}

impl Prepared {
    /// Self-weight intensity (N/mm) of a section of `mass` kg/m.
    #[inline]
    pub fn self_weight(&self, mass: f64) -> f64 {
        if self.criteria.self_weight {
            mass * G / 1000.0
        } else {
            0.0
        }
    }

    /// C_D of combination `ci` for a material (1 for non-timber): the
    /// combination's NDS Table 2.3.2 value, capped by the C_D the material
    /// or row gives (a given C_D never raises the factor of a combination of
    /// longer loads: dead load alone stays at 0.9).
    #[inline]
    pub fn cd(&self, m: &Material, ci: usize) -> f64 {
        match m.kind {
            MaterialKind::Timber => match m.timber.cd {
                Some(cap) => cap.min(self.duration[ci]),
                None => self.duration[ci],
            },
            _ => 1.0,
        }
    }

    /// The steel strengths of a section for its material, or the gap.
    pub fn steel(
        &self,
        p: &Properties,
        m: &Material,
    ) -> Option<std::result::Result<steel::Steel, Gap>> {
        (m.kind == MaterialKind::Steel).then(|| self.steel_for(p, m, true))
    }

    /// The steel strengths of a steel material, with lateral-torsional
    /// buckling constants only when asked for.
    #[inline]
    fn steel_for(
        &self,
        p: &Properties,
        m: &Material,
        with_ltb: bool,
    ) -> std::result::Result<steel::Steel, Gap> {
        match m.fy {
            None => Err(Gap::NoYieldStress),
            Some(fy) => steel::strengths_for(p, fy, m.e, with_ltb),
        }
    }

    /// Visit every check line of a section, and every gap (no allocation).
    pub fn visit<S: Sink>(&self, sec: SectionInput<'_>, sink: &mut S) {
        let p = sec.props;
        let m = sec.material.unwrap_or(&self.material);
        let ex = &self.criteria.exclude;
        let w = self.self_weight(sec.mass);
        let d = &self.demand;
        let ne = d.len.len();
        let ei = m.e_eff() * p.ix;
        let sl = d.section(w, ei);
        let timber = m.kind == MaterialKind::Timber;
        let need_ltb = !self.segments.is_empty() && !ex.lateral_torsional_buckling;
        let is_steel = m.kind == MaterialKind::Steel;
        let mut st_buf = steel::Steel::EMPTY;
        let steel_ok = is_steel
            && match m.fy {
                None => {
                    sink.gap(Gap::NoYieldStress);
                    false
                }
                Some(fy) => match steel::strengths_into(p, fy, m.e, need_ltb, &mut st_buf) {
                    Ok(()) => true,
                    Err(g) => {
                        sink.gap(g);
                        false
                    }
                },
            };
        let steel = steel_ok.then_some(&st_buf);
        // Sections whose plates can buckle locally.
        let plated = matches!(
            p.form,
            Form::RolledI | Form::WeldedI | Form::Rhs { .. } | Form::Chs { .. } | Form::Given
        );
        if !is_steel && plated && !ex.local_buckling {
            sink.gap(if p.form == Form::Given && p.i_geometry.is_none() {
                Gap::ShapeUnknown
            } else {
                Gap::NoLocalBucklingMethod
            });
        }
        let fb = m.fb_tension.zip(m.fb_compression);
        if fb.is_none() && steel.is_none() && !is_steel {
            sink.gap(Gap::NoBendingMethod);
        }
        let shear_k = shear_factor(p, self.criteria.shear);
        if !ex.shear && !is_steel {
            if m.fv.is_none() {
                sink.gap(Gap::NoShearMethod);
            } else if shear_k.is_none() {
                sink.gap(Gap::ShearProperties);
            }
        }
        for &ci in &self.strength {
            let a = d.apply(ci, &sl);
            let cd = self.cd(m, ci);
            let tf = if timber {
                cd * m.timber.fb_factor()
            } else {
                1.0
            };
            let mx = d.extremes(&a, Quantity::Moment, 0..ne);
            let aux = [cd, 0.0];
            if let Some((fbt, fbc)) = fb {
                let (fbt, fbc) = (fbt * tf, fbc * tf);
                if mx.max > 0.0 {
                    sink.item(item(
                        CheckKind::BendingSaggingTop,
                        ci,
                        0,
                        Sense::Sagging,
                        mx.x_max,
                        mx.max,
                        mx.max / p.s_top,
                        fbc,
                        aux,
                    ));
                    sink.item(item(
                        CheckKind::BendingSaggingBottom,
                        ci,
                        0,
                        Sense::Sagging,
                        mx.x_max,
                        mx.max,
                        mx.max / p.s_bot,
                        fbt,
                        aux,
                    ));
                }
                if mx.min < 0.0 {
                    sink.item(item(
                        CheckKind::BendingHoggingTop,
                        ci,
                        0,
                        Sense::Hogging,
                        mx.x_min,
                        mx.min,
                        -mx.min / p.s_top,
                        fbt,
                        aux,
                    ));
                    sink.item(item(
                        CheckKind::BendingHoggingBottom,
                        ci,
                        0,
                        Sense::Hogging,
                        mx.x_min,
                        mx.min,
                        -mx.min / p.s_bot,
                        fbc,
                        aux,
                    ));
                }
            }
            if let Some(st) = steel {
                for (sense, m0, x) in [
                    (Sense::Sagging, mx.max, mx.x_max),
                    (Sense::Hogging, mx.min, mx.x_min),
                ] {
                    let on = if sense == Sense::Sagging {
                        m0 > 0.0
                    } else {
                        m0 < 0.0
                    };
                    if !on {
                        continue;
                    }
                    let f = &st.flexure[sense.index()];
                    let mm = m0.abs();
                    let z = [0.0; 2];
                    sink.item(item(
                        CheckKind::Yielding,
                        ci,
                        0,
                        sense,
                        x,
                        m0,
                        mm,
                        f.yielding.mn / steel::OMEGA_B,
                        z,
                    ));
                    if !ex.local_buckling {
                        if let Some(n) = f.flange {
                            sink.item(item(
                                CheckKind::FlangeLocalBuckling,
                                ci,
                                0,
                                sense,
                                x,
                                m0,
                                mm,
                                n.mn / steel::OMEGA_B,
                                z,
                            ));
                        }
                        if let Some(n) = f.web {
                            sink.item(item(
                                CheckKind::WebLocalBuckling,
                                ci,
                                0,
                                sense,
                                x,
                                m0,
                                mm,
                                n.mn / steel::OMEGA_B,
                                z,
                            ));
                        }
                    }
                    if let Some(n) = f.tension_flange {
                        sink.item(item(
                            CheckKind::TensionFlangeYielding,
                            ci,
                            0,
                            sense,
                            x,
                            m0,
                            mm,
                            n.mn / steel::OMEGA_B,
                            z,
                        ));
                    }
                }
            }
            if !ex.shear {
                let (vv, x) = d.abs_extreme(&a, Quantity::Shear, 0..ne);
                if let (Some(fv), Some(k)) = (m.fv, shear_k) {
                    let cap = if timber {
                        fv * cd * m.timber.fv_factor()
                    } else {
                        fv
                    };
                    sink.item(item(
                        CheckKind::Shear,
                        ci,
                        0,
                        Sense::None,
                        x,
                        vv,
                        vv.abs() * k,
                        cap,
                        aux,
                    ));
                }
                if let Some(st) = &steel {
                    sink.item(item(
                        CheckKind::WebShear,
                        ci,
                        0,
                        Sense::None,
                        x,
                        vv,
                        vv.abs(),
                        st.shear.vn / st.shear.omega,
                        [0.0; 2],
                    ));
                }
            }
            if !ex.lateral_torsional_buckling {
                self.stability(p, m, &a, ci, cd, steel, sink);
            }
        }
        if !ex.deflection {
            if self.service.is_empty() {
                sink.gap(Gap::NoDeflectionLimit);
            }
            for &ci in &self.service {
                let a = d.apply(ci, &sl);
                let Some(limit) = a.combo.limit else { continue };
                for (k, &(e0, e1)) in self.stretch_elems.iter().enumerate() {
                    let st = &d.stretches[k];
                    let (y, x) = d.abs_extreme(&a, Quantity::Deflection, e0..e1);
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
                    sink.item(item(
                        CheckKind::Deflection,
                        ci,
                        k,
                        Sense::None,
                        x,
                        delta,
                        delta.abs(),
                        allow,
                        [0.0; 2],
                    ));
                }
            }
        }
    }

    /// Lateral stability of every unbraced segment under one combination.
    #[allow(clippy::too_many_arguments)]
    #[inline]
    fn stability<S: Sink>(
        &self,
        p: &Properties,
        m: &Material,
        a: &crate::beam::Applied<'_>,
        ci: usize,
        cd: f64,
        steel: Option<&steel::Steel>,
        sink: &mut S,
    ) {
        let d = &self.demand;
        for (si, seg) in self.segments.iter().enumerate() {
            let ex = d.extremes(a, Quantity::Moment, seg.elems.0..seg.elems.1);
            // C_b (eq. F1-1) from the largest moment magnitude in the
            // segment and the quarter-point magnitudes, whatever their sign.
            let mut cb = f64::NAN;
            for (sense, m0, x) in [
                (Sense::Sagging, ex.max, ex.x_max),
                (Sense::Hogging, ex.min, ex.x_min),
            ] {
                let needed = match sense {
                    Sense::Sagging => seg.sagging && m0 > 0.0,
                    _ => seg.hogging && m0 < 0.0,
                };
                if !needed {
                    continue;
                }
                let len = seg.x2 - seg.x1;
                if seg.unrestrained {
                    sink.gap(Gap::NoLateralRestraint);
                    continue;
                }
                match m.kind {
                    MaterialKind::Steel => {
                        // A steel gap (no Fy, range, properties) was recorded.
                        let Some(st) = steel else { continue };
                        let f = &st.flexure[sense.index()];
                        if f.ltb == steel::Ltb::None {
                            continue;
                        }
                        if cb.is_nan() {
                            // A singly symmetric section in reverse
                            // curvature: C_b = 1.0 (conservative; the
                            // Commentary to F1 warns that F1-1 can
                            // overstate it for the smaller flange).
                            let reverse = ex.max > 0.0 && ex.min < 0.0;
                            let mono = p.i_geometry.is_some_and(|g| {
                                (g.bf_top - g.bf_bot).abs() > 1e-9 * g.bf_top
                                    || (g.tf_top - g.tf_bot).abs() > 1e-9 * g.tf_top
                            });
                            cb = if seg.cb_unity || (reverse && mono) {
                                1.0
                            } else {
                                let q = |k: usize| d.abs_moment_at_node(a, seg.nodes[k]);
                                steel::cb(ex.max.abs().max(ex.min.abs()), q(1), q(2), q(3))
                            };
                        }
                        let lb = seg.k * len;
                        let n = f.ltb.nominal(m.e, lb, cb);
                        sink.item(item(
                            CheckKind::LateralTorsional,
                            ci,
                            si,
                            sense,
                            x,
                            m0,
                            m0.abs(),
                            n.mn / steel::OMEGA_B,
                            [lb, cb],
                        ));
                    }
                    MaterialKind::Timber => {
                        let Form::Rect { b, d: depth } = p.form else {
                            sink.gap(Gap::TimberShape);
                            continue;
                        };
                        let Some(fb) = (match sense {
                            Sense::Sagging => m.fb_compression,
                            _ => m.fb_compression,
                        }) else {
                            continue;
                        };
                        let Some(emin) = m.timber.e_min else {
                            if depth > b {
                                sink.gap(Gap::NoEmin);
                            }
                            continue;
                        };
                        let fb_star = fb * cd * m.timber.fb_star_factor();
                        let emin_adj = emin * m.timber.e_factor();
                        let Some(s) = timber::stability(len, b, depth, fb_star, emin_adj) else {
                            sink.gap(Gap::TimberSlenderness);
                            continue;
                        };
                        let cap = fb * cd * m.timber.fb_factor() * s.cl;
                        let sc = if sense == Sense::Sagging {
                            p.s_top
                        } else {
                            p.s_bot
                        };
                        sink.item(item(
                            CheckKind::LateralTorsional,
                            ci,
                            si,
                            sense,
                            x,
                            m0,
                            m0.abs() / sc,
                            cap,
                            [s.le, s.cl],
                        ));
                    }
                    MaterialKind::Unspecified => {
                        // Closed round sections do not buckle laterally.
                        if !matches!(p.form, Form::Chs { .. } | Form::Round { .. }) {
                            sink.gap(Gap::NoStabilityMethod);
                        }
                    }
                }
            }
        }
    }

    /// The governing check and the verdict of a section.
    pub fn check(&self, sec: SectionInput<'_>) -> Summary {
        struct Worst {
            best: Option<Item>,
            gaps: Gaps,
        }
        impl Sink for Worst {
            #[inline]
            fn item(&mut self, it: Item) {
                let better = match &self.best {
                    None => true,
                    // Ties (within round-off) keep the first check in the
                    // fixed visiting order, so the governing check is
                    // deterministic.
                    Some(b) => {
                        it.utilisation > b.utilisation * (1.0 + 1e-12) || it.utilisation.is_nan()
                    }
                };
                if better {
                    self.best = Some(it);
                }
            }
            #[inline]
            fn gap(&mut self, g: Gap) {
                self.gaps.add(g);
            }
        }
        let mut w = Worst {
            best: None,
            gaps: Gaps::default(),
        };
        self.visit(sec, &mut w);
        summarise(w.best, w.gaps)
    }

    /// Every check line of a section, and its gaps.
    pub fn check_all(&self, sec: SectionInput<'_>) -> (Vec<Item>, Gaps) {
        struct All(Vec<Item>, Gaps);
        impl Sink for All {
            fn item(&mut self, it: Item) {
                self.0.push(it);
            }
            fn gap(&mut self, g: Gap) {
                self.1.add(g);
            }
        }
        let mut a = All(Vec::new(), Gaps::default());
        self.visit(sec, &mut a);
        (a.0, a.1)
    }
}

/// The verdict from the worst evaluated line and the gaps.
fn summarise(best: Option<Item>, gaps: Gaps) -> Summary {
    let util = best.map(|b| b.utilisation).unwrap_or(0.0);
    let verdict = if util > 1.0 || util.is_nan() {
        Verdict::Fails
    } else if !gaps.is_empty() || best.is_none() {
        Verdict::NotVerified
    } else {
        Verdict::Passes
    };
    Summary {
        utilisation: util,
        governing: best,
        verdict,
        gaps,
        passes: verdict == Verdict::Passes,
    }
}

/// Shear stress per unit shear force (1/mm²) for the chosen method, or
/// None when the section lacks what the method needs.
pub fn shear_factor(p: &Properties, method: ShearMethod) -> Option<f64> {
    let vq = match (p.q_na, p.t_na) {
        (Some(q), Some(t)) if t > 0.0 => Some(q / (p.ix * t)),
        _ => None,
    };
    match method {
        ShearMethod::Auto => p.web_area.map(|a| 1.0 / a).or(vq),
        ShearMethod::PeakVq => vq,
    }
}

#[allow(clippy::too_many_arguments)]
#[inline]
fn item(
    kind: CheckKind,
    combo: usize,
    part: usize,
    sense: Sense,
    x: f64,
    action: f64,
    demand: f64,
    capacity: f64,
    aux: [f64; 2],
) -> Item {
    Item {
        kind,
        combo,
        part,
        sense,
        x,
        action,
        demand,
        capacity,
        utilisation: demand / capacity,
        aux,
    }
}
