//! The written working of a check line: the provision, the formula, the
//! values that enter it and how the capacity follows. Built by the same
//! functions the check uses (steel strengths, C_b, C_L), so the sheet a
//! checker reads cannot disagree with the verdict. Values stay in internal
//! units with their kind ([`Show`]); renderers format them.

use super::{
    CheckKind, Item, LoadHeight, MaterialKind, Prepared, SectionInput, Sense, ShearMethod, steel,
    timber,
};
use crate::section::{Form, Properties};
use crate::units::Show;
use serde::Serialize;

/// A named value in a working.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Term {
    pub symbol: String,
    /// Internal units (N, mm, MPa, N·mm).
    pub value: f64,
    pub show: Show,
}

/// One check written out.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Working {
    /// The method and equation, e.g. "AISC 360-16 §F2.2, eq. F2-2".
    pub method: String,
    pub formula: String,
    pub terms: Vec<Term>,
    /// How the capacity follows from the nominal value, in words.
    pub capacity: String,
}

fn t(symbol: &str, value: f64, show: Show) -> Term {
    Term {
        symbol: symbol.to_string(),
        value,
        show,
    }
}

impl Prepared {
    /// The working of one check line of a section.
    pub fn working(&self, sec: SectionInput<'_>, it: &Item) -> Working {
        let p = sec.props;
        let m = sec.material.unwrap_or(&self.material);
        let timber = m.kind == MaterialKind::Timber;
        let cd = it.aux[0];
        let timber_note = |what: &str, f: f64| -> String {
            let mut v = vec![format!("C_D = {}", crate::units::fmt_num(cd))];
            v.extend(
                m.timber
                    .applied()
                    .into_iter()
                    .filter(|s| !s.starts_with("C_D")),
            );
            format!(
                "{what}′ = {what} × {} (NDS 2018 Table 4.3.1; factor product {})",
                v.join(" × "),
                crate::units::fmt_num(f)
            )
        };
        match it.kind {
            CheckKind::BendingSaggingTop
            | CheckKind::BendingSaggingBottom
            | CheckKind::BendingHoggingTop
            | CheckKind::BendingHoggingBottom => {
                let top = matches!(
                    it.kind,
                    CheckKind::BendingSaggingTop | CheckKind::BendingHoggingTop
                );
                let (s, c, name) = if top {
                    (p.s_top, p.c_top, "top")
                } else {
                    (p.s_bot, p.c_bot, "bottom")
                };
                let compression = matches!(
                    it.kind,
                    CheckKind::BendingSaggingTop | CheckKind::BendingHoggingBottom
                );
                let fb = if compression {
                    m.fb_compression
                } else {
                    m.fb_tension
                }
                .unwrap_or(f64::NAN);
                Working {
                    method: "flexure formula f = M·y/I at the extreme fibre".into(),
                    formula: format!("f_{name} = M·c_{name}/I = M/S_{name}"),
                    terms: vec![
                        t("M", it.action.abs(), Show::Moment),
                        t(&format!("c_{name}"), c, Show::Dimension),
                        t("I", p.ix, Show::SecondMoment),
                        t(&format!("S_{name}"), s, Show::SectionModulus),
                        t(if compression { "F_bc" } else { "F_bt" }, fb, Show::Stress),
                    ],
                    capacity: if timber {
                        timber_note("F_b", it.capacity / fb)
                    } else {
                        format!(
                            "the allowable bending stress of the fibre in {} as entered",
                            if compression {
                                "compression"
                            } else {
                                "tension"
                            }
                        )
                    },
                }
            }
            CheckKind::Shear => {
                let web = self.criteria.shear == ShearMethod::Auto && p.web_area.is_some();
                let mut terms = vec![t("V", it.action.abs(), Show::Force)];
                let formula = if web {
                    terms.push(t("A_w = d·t_w", p.web_area.unwrap_or(f64::NAN), Show::Area));
                    "f_v = V/A_w (average web shear, A_w = d·t_w)".to_string()
                } else {
                    terms.push(t("Q", p.q_na.unwrap_or(f64::NAN), Show::SectionModulus));
                    terms.push(t("I", p.ix, Show::SecondMoment));
                    terms.push(t("t", p.t_na.unwrap_or(f64::NAN), Show::Dimension));
                    "f_v = V·Q/(I·t) at the neutral axis (Jourawski; 3V/(2bd) for a rectangle, NDS 3.4.2)".to_string()
                };
                terms.push(t("F_v", m.fv.unwrap_or(f64::NAN), Show::Stress));
                Working {
                    method: "shear stress against the allowable F_v".into(),
                    formula,
                    terms,
                    capacity: if timber {
                        timber_note("F_v", it.capacity / m.fv.unwrap_or(f64::NAN))
                    } else {
                        "the allowable shear stress as entered".into()
                    },
                }
            }
            CheckKind::Yielding
            | CheckKind::FlangeLocalBuckling
            | CheckKind::WebLocalBuckling
            | CheckKind::TensionFlangeYielding => self.steel_working(p, m, it),
            CheckKind::LateralTorsional => {
                if timber {
                    self.timber_stability_working(p, m, it)
                } else {
                    self.ltb_working(sec, p, m, it)
                }
            }
            CheckKind::WebShear => {
                let Some(Ok(st)) = self.steel(p, m) else {
                    return missing();
                };
                let sh = st.shear;
                let sq = (m.e / m.fy.unwrap_or(f64::NAN)).sqrt();
                let mut terms = vec![
                    t("V", it.action.abs(), Show::Force),
                    t("F_y", m.fy.unwrap_or(f64::NAN), Show::Stress),
                    t("shear area", sh.area, Show::Area),
                    t("C_v", sh.cv, Show::Ratio),
                ];
                if let Some(g) = p.i_geometry {
                    terms.push(t("h/t_w", (g.hw - 2.0 * g.r) / g.tw, Show::Ratio));
                    terms.push(t("2.24√(E/F_y)", 2.24 * sq, Show::Ratio));
                    terms.push(t(
                        "1.10√(k_v·E/F_y), k_v = 5.34",
                        1.10 * (5.34f64).sqrt() * sq,
                        Show::Ratio,
                    ));
                }
                terms.push(t("V_n", sh.vn, Show::Force));
                terms.push(t("Ω_v", sh.omega, Show::Ratio));
                Working {
                    method: format!("AISC 360-16 Chapter G, {}", sh.eq),
                    formula:
                        "V_n = 0.6·F_y·A_w·C_v (G2-1, G4-1) or F_cr·A_g/2 (G5-1); V_a = V_n/Ω_v"
                            .into(),
                    terms,
                    capacity: format!("V_n/Ω_v with Ω_v = {}", crate::units::fmt_num(sh.omega)),
                }
            }
            CheckKind::Deflection => {
                let st = &self.demand.stretches[it.part];
                let length = st.x2 - st.x1;
                let limit = self.demand.combos[it.combo].limit;
                let mut terms = vec![
                    t("E", m.e_eff(), Show::Modulus),
                    t("I", p.ix, Show::SecondMoment),
                    t("L", length, Show::Span),
                ];
                if st.cantilever {
                    terms.push(t(
                        "cantilever factor",
                        self.demand.cantilever_factor,
                        Show::Ratio,
                    ));
                }
                if let Some(n) = limit.and_then(|l| l.ratio) {
                    terms.push(t("n in L/n", n, Show::Ratio));
                }
                if let Some(a) = limit.and_then(|l| l.absolute) {
                    terms.push(t("absolute limit", a, Show::Deflection));
                }
                Working {
                    method: "deflection by integrating the curvature M/(E·I) twice, from the chord of the span's supports".into(),
                    formula: if st.cantilever {
                        "δ ≤ (factor × L)/n and/or the absolute limit".into()
                    } else {
                        "δ ≤ L/n and/or the absolute limit".into()
                    },
                    terms,
                    capacity: "the smaller of the limits".into(),
                }
            }
        }
    }

    fn steel_working(&self, p: &Properties, m: &super::Material, it: &Item) -> Working {
        let Some(Ok(st)) = self.steel(p, m) else {
            return missing();
        };
        let f = &st.flexure[if it.sense == Sense::Hogging { 1 } else { 0 }];
        let fy = m.fy.unwrap_or(f64::NAN);
        let mut terms = vec![
            t("M_a", it.demand, Show::Moment),
            t("F_y", fy, Show::Stress),
        ];
        let slender = |s: &Option<steel::Slenderness>, terms: &mut Vec<Term>| {
            if let Some(s) = s {
                terms.push(t(s.ratio, s.lambda, Show::Ratio));
                terms.push(t("λ_p", s.lambda_p, Show::Ratio));
                terms.push(t("λ_r", s.lambda_r, Show::Ratio));
            }
        };
        let (formula, n) = match it.kind {
            CheckKind::Yielding => {
                // F5-1 uses S_xc only; F4-1 uses S_xc and, through
                // R_pc = M_p/M_yc, Z_x; the others Z_x.
                if f.provision != steel::Provision::F5
                    && let Some(z) = p.zx
                {
                    terms.push(t("Z_x", z, Show::SectionModulus));
                }
                if matches!(f.provision, steel::Provision::F4 | steel::Provision::F5) {
                    let sxc = if it.sense == Sense::Hogging {
                        p.s_bot
                    } else {
                        p.s_top
                    };
                    terms.push(t("S_xc", sxc, Show::SectionModulus));
                    let r = f.yielding.mn / (fy * sxc);
                    terms.push(t(
                        if f.provision == steel::Provision::F4 {
                            "R_pc"
                        } else {
                            "R_pg"
                        },
                        r,
                        Show::Ratio,
                    ));
                }
                slender(&f.web_class, &mut terms);
                (
                    match f.provision {
                        steel::Provision::F4 => "M_n = R_pc·M_yc = R_pc·F_y·S_xc (F4-1)",
                        steel::Provision::F5 => "M_n = R_pg·F_y·S_xc (F5-1)",
                        steel::Provision::F11 => "M_n = M_p = F_y·Z ≤ 1.6·F_y·S_x (F11-1)",
                        _ => "M_n = M_p = F_y·Z_x",
                    },
                    f.yielding,
                )
            }
            CheckKind::FlangeLocalBuckling => {
                slender(&f.flange_class, &mut terms);
                (
                    match f.provision {
                        steel::Provision::F7 => {
                            "F7-2 (noncompact) or F_y·S_e with b_e by F7-4 (slender)"
                        }
                        steel::Provision::F8 => {
                            "F8-2 (noncompact) or F_cr·S, F_cr = 0.33E/(D/t) (slender)"
                        }
                        _ => {
                            "noncompact: linear between M_p (or R_pc·M_yc) at λ_p and F_L·S_xc at λ_r; slender: 0.9·E·k_c·S_xc/λ², k_c = 4/√(h/t_w) in 0.35–0.76"
                        }
                    },
                    f.flange.unwrap_or(f.yielding),
                )
            }
            CheckKind::WebLocalBuckling => {
                slender(&f.web_class, &mut terms);
                (
                    "M_n = M_p − (M_p − F_y·S)(0.305·(h/t_w)·√(F_y/E) − 0.738) ≤ M_p (F7-5)",
                    f.web.unwrap_or(f.yielding),
                )
            }
            _ => {
                terms.push(t(
                    "S_xt",
                    if it.sense == Sense::Hogging {
                        p.s_top
                    } else {
                        p.s_bot
                    },
                    Show::SectionModulus,
                ));
                slender(&f.web_class, &mut terms);
                (
                    "M_n = R_pt·F_y·S_xt (F4-15) or F_y·S_xt (F5-10)",
                    f.tension_flange.unwrap_or(f.yielding),
                )
            }
        };
        terms.push(t("M_n", n.mn, Show::Moment));
        Working {
            method: format!("{}, eq. {}", f.provision.name(), n.eq),
            formula: formula.into(),
            terms,
            capacity: "M_n/Ω_b with Ω_b = 1.67 (AISC 360-16 F1)".into(),
        }
    }

    fn ltb_working(
        &self,
        sec: SectionInput<'_>,
        p: &Properties,
        m: &super::Material,
        it: &Item,
    ) -> Working {
        let Some(Ok(st)) = self.steel(p, m) else {
            return missing();
        };
        let f = &st.flexure[if it.sense == Sense::Hogging { 1 } else { 0 }];
        let seg = &self.segments[it.part];
        let (lb, cb) = (it.aux[0], it.aux[1]);
        let mut terms = vec![
            t("M_a", it.demand, Show::Moment),
            t("unbraced length", seg.x2 - seg.x1, Show::Span),
            t("effective-length factor", seg.k, Show::Ratio),
            t("L_b", lb, Show::Span),
        ];
        if let Some((lp, lr)) = f.ltb.limits() {
            terms.push(t("L_p", lp, Show::Span));
            terms.push(t("L_r", lr, Show::Span));
        }
        let cb_text = if seg.free_end {
            "C_b = 1.0 (segment with a free end, AISC 360-16 F1)".to_string()
        } else if seg.cb_unity {
            "C_b = 1.0 (bottom flange in compression with the top flange braced: conservative)"
                .to_string()
        } else {
            let w = self.self_weight(sec.mass);
            let sl = self.demand.section(w, m.e_eff() * p.ix);
            let a = self.demand.apply(it.combo, &sl);
            for (k, name) in [(1, "M_A"), (2, "M_B"), (3, "M_C")] {
                terms.push(t(
                    name,
                    self.demand.abs_moment_at_node(&a, seg.nodes[k]),
                    Show::Moment,
                ));
            }
            "C_b = 12.5·M_max/(2.5·M_max + 3·M_A + 4·M_B + 3·M_C) (F1-1, M_max the largest |M| in the segment)".to_string()
        };
        terms.push(t("C_b", cb, Show::Ratio));
        let n = f.ltb.nominal(m.e, lb, cb);
        terms.push(t("M_n", n.mn, Show::Moment));
        Working {
            method: format!(
                "{}, lateral-torsional buckling, eq. {}",
                f.provision.name(),
                n.eq
            ),
            formula: format!(
                "{cb_text}; M_n from L_b against L_p and L_r ({})",
                match self.criteria.load_height {
                    LoadHeight::ShearCentre => "loads at the shear centre",
                    LoadHeight::TopFlange => "destabilising top-flange loads",
                }
            ),
            terms,
            capacity: "M_n/Ω_b with Ω_b = 1.67 (AISC 360-16 F1)".into(),
        }
    }

    fn timber_stability_working(&self, p: &Properties, m: &super::Material, it: &Item) -> Working {
        let seg = &self.segments[it.part];
        let Form::Rect { b, d } = p.form else {
            return missing();
        };
        let cd = self.cd(m, it.combo);
        let fb = m.fb_compression.unwrap_or(f64::NAN);
        let lu = seg.x2 - seg.x1;
        let s = timber::stability(
            lu,
            b,
            d,
            fb * cd * m.timber.fb_star_factor(),
            m.timber.e_min.unwrap_or(f64::NAN) * m.timber.e_factor(),
        );
        let mut terms = vec![
            t("f_b", it.demand, Show::Stress),
            t("ℓ_u", lu, Show::Span),
            t("b", b, Show::Dimension),
            t("d", d, Show::Dimension),
        ];
        if let Some(s) = s {
            terms.push(t("ℓ_e", s.le, Show::Span));
            terms.push(t("R_B", s.rb, Show::Ratio));
            terms.push(t(
                "E_min′",
                m.timber.e_min.unwrap_or(f64::NAN) * m.timber.e_factor(),
                Show::Stress,
            ));
            terms.push(t("F_bE", s.fbe, Show::Stress));
            terms.push(t("F_b*", s.fb_star, Show::Stress));
            terms.push(t("C_L", s.cl, Show::Ratio));
        }
        Working {
            method: "NDS 2018 §3.3.3, beam stability factor C_L (eq. 3.3-5, 3.3-6; ℓ_e by Table 3.3.3, any load)".into(),
            formula: "R_B = √(ℓ_e·d/b²); F_bE = 1.20·E_min′/R_B²; C_L = (1 + F_bE/F_b*)/1.9 − √([(1 + F_bE/F_b*)/1.9]² − (F_bE/F_b*)/0.95)".into(),
            terms,
            capacity: "F_b′ = F_b* × C_fu × C_L".into(),
        }
    }
}

fn missing() -> Working {
    Working {
        method: "not evaluated".into(),
        formula: String::new(),
        terms: Vec::new(),
        capacity: String::new(),
    }
}
