//! The calculation sheet of one member: a model a checker can follow by
//! hand — the job, reactions, diagrams, the section, and each check
//! written as formula → numbers → result → allowable → utilisation. Built
//! from the same prepared demand and check lines as `check`; the Markdown
//! and HTML renderers (`sheet`) only print it.

use super::chart;
use super::member::{self, MemberCheck};
use super::{Align, Table};
use crate::beam::demand::Quantity;
use crate::beam::model::ComboKind;
use crate::check::{CheckKind, Prepared, ShearMethod, ltb};
use crate::job::Job;
use crate::units::{self, Show, System, fmt_num};
use serde::Serialize;

/// One check, written out.
#[derive(Clone, Debug, Serialize)]
pub struct WrittenCheck {
    pub check: String,
    pub combination: String,
    pub location: String,
    pub formula: String,
    pub substitution: Vec<String>,
    pub result: String,
    pub allowable: String,
    pub utilisation: String,
    pub passes: bool,
}

/// A diagram (inline SVG) with its caption.
#[derive(Clone, Debug, Serialize)]
pub struct Figure {
    pub caption: String,
    pub svg: String,
}

/// The whole sheet.
#[derive(Clone, Debug, Serialize)]
pub struct Sheet {
    pub title: String,
    pub member: String,
    pub section: String,
    pub section_source: String,
    pub verdict: String,
    pub tables: Vec<TableOut>,
    pub figures: Vec<Figure>,
    pub checks: Vec<WrittenCheck>,
    pub alternatives: Option<TableOut>,
    pub methods: Vec<String>,
    pub assumptions: Vec<String>,
    pub not_checked: Vec<String>,
    pub notes: Vec<String>,
    pub caution: &'static str,
    pub generator: String,
}

/// A table in the sheet (serialisable form of `Table`).
#[derive(Clone, Debug, Serialize)]
pub struct TableOut {
    pub title: String,
    pub headers: Vec<String>,
    pub right: Vec<bool>,
    pub rows: Vec<Vec<String>>,
}

impl From<Table> for TableOut {
    fn from(t: Table) -> Self {
        TableOut {
            title: t.title,
            right: t.align.iter().map(|a| *a == Align::Right).collect(),
            headers: t.headers,
            rows: t.rows,
        }
    }
}

/// Moment in "base" units for a substitution line: SI N·mm with ×10⁶, US kip·in.
fn moment_base(m: f64, sys: System) -> String {
    match sys {
        System::Si => format!("{}×10⁶ N·mm", fmt_num(m / 1e6)),
        System::Us => format!(
            "{} kip·in",
            fmt_num(m / (units::N_PER_LBF * 1e3 * units::MM_PER_IN))
        ),
    }
}

fn force_base(v: f64, sys: System) -> String {
    match sys {
        System::Si => format!("{}×10³ N", fmt_num(v / 1e3)),
        System::Us => format!("{} kip", fmt_num(v / (units::N_PER_LBF * 1e3))),
    }
}

fn modulus_base(s: f64, sys: System) -> String {
    match sys {
        System::Si => format!("{}×10³ mm³", fmt_num(s / 1e3)),
        System::Us => format!("{} in³", fmt_num(s / units::MM_PER_IN.powi(3))),
    }
}

fn inertia_base(i: f64, sys: System) -> String {
    match sys {
        System::Si => format!("{}×10⁶ mm⁴", fmt_num(i / 1e6)),
        System::Us => format!("{} in⁴", fmt_num(i / units::MM_PER_IN.powi(4))),
    }
}

fn stress(v: f64, sys: System) -> String {
    Show::Stress.fmt(v, sys)
}

fn len(v: f64, sys: System) -> String {
    Show::Dimension.fmt(v, sys)
}

/// Write out every check line of a member check.
pub fn written_checks(prep: &Prepared, r: &MemberCheck, sys: System) -> Vec<WrittenCheck> {
    let p = &r.properties;
    let m = &prep.material;
    let items = prep.check_all(crate::check::SectionInput::new(p, r.mass_per_length));
    items
        .iter()
        .map(|it| {
            let l = member::line(prep, it);
            let location = match it.kind {
                CheckKind::LateralTorsional => l.part.clone(),
                _ => format!("{}, x = {}", l.part, Show::Span.fmt(l.x, sys)),
            };
            let util = format!("{} / {} = {:.3}", fmt_value(it.kind, it.demand, sys), fmt_value(it.kind, it.capacity, sys), it.utilisation);
            let (formula, substitution, allowable) = match it.kind {
                CheckKind::BendingSaggingTop | CheckKind::BendingHoggingTop => (
                    "f_top = M·c_top/I = M/S_top".to_string(),
                    vec![format!(
                        "= {} / {} (c_top = {}, I = {})",
                        moment_base(it.action.abs(), sys),
                        modulus_base(p.s_top, sys),
                        len(p.c_top, sys),
                        inertia_base(p.ix, sys)
                    )],
                    if it.kind == CheckKind::BendingSaggingTop {
                        format!("Fbc = {} (top fibre in compression)", stress(m.fb_compression, sys))
                    } else {
                        format!("Fbt = {} (top fibre in tension)", stress(m.fb_tension, sys))
                    },
                ),
                CheckKind::BendingSaggingBottom | CheckKind::BendingHoggingBottom => (
                    "f_bot = M·c_bot/I = M/S_bot".to_string(),
                    vec![format!(
                        "= {} / {} (c_bot = {}, I = {})",
                        moment_base(it.action.abs(), sys),
                        modulus_base(p.s_bot, sys),
                        len(p.c_bot, sys),
                        inertia_base(p.ix, sys)
                    )],
                    if it.kind == CheckKind::BendingSaggingBottom {
                        format!("Fbt = {} (bottom fibre in tension)", stress(m.fb_tension, sys))
                    } else {
                        format!("Fbc = {} (bottom fibre in compression)", stress(m.fb_compression, sys))
                    },
                ),
                CheckKind::Shear => {
                    let use_web = prep.criteria.shear == ShearMethod::Auto && p.web_area.is_some();
                    if use_web {
                        let aw = p.web_area.unwrap_or(f64::NAN);
                        (
                            "f_v = V/A_w, A_w = d·t_w (average web shear)".to_string(),
                            vec![format!("= {} / {}", force_base(it.action.abs(), sys), Show::Area.fmt(aw, sys))],
                            format!("Fv = {}", m.fv.map(|v| stress(v, sys)).unwrap_or_default()),
                        )
                    } else {
                        (
                            "f_v = V·Q/(I·t) at the neutral axis".to_string(),
                            vec![format!(
                                "= {} × {} / ({} × {})",
                                force_base(it.action.abs(), sys),
                                modulus_base(p.q_na.unwrap_or(f64::NAN), sys),
                                inertia_base(p.ix, sys),
                                len(p.t_na.unwrap_or(f64::NAN), sys)
                            )],
                            format!("Fv = {}", m.fv.map(|v| stress(v, sys)).unwrap_or_default()),
                        )
                    }
                }
                CheckKind::Deflection => {
                    let st = &prep.demand.stretches[it.part];
                    let length = st.x2 - st.x1;
                    let ei = m.e * p.ix;
                    let limit = prep.demand.combos[it.combo].limit;
                    let mut allow = Vec::new();
                    if let Some(n) = limit.and_then(|l| l.ratio) {
                        if st.cantilever {
                            allow.push(format!(
                                "L/n = {} × {} / {} = {}",
                                fmt_num(prep.demand.cantilever_factor),
                                len(length, sys),
                                fmt_num(n),
                                len(prep.demand.cantilever_factor * length / n, sys)
                            ));
                        } else {
                            allow.push(format!("L/n = {} / {} = {}", len(length, sys), fmt_num(n), len(length / n, sys)));
                        }
                    }
                    if let Some(a) = limit.and_then(|l| l.absolute) {
                        allow.push(format!("absolute limit {}", len(a, sys)));
                    }
                    let ei_text = match sys {
                        System::Si => format!("{} kN·m²", fmt_num(ei / 1e9)),
                        System::Us => format!("{} kip·in²", fmt_num(ei / (units::N_PER_LBF * 1e3 * units::MM_PER_IN.powi(2)))),
                    };
                    (
                        "δ = ∫∫ M/(E·I) dx² with the support conditions (relative to the span's supports)".to_string(),
                        vec![format!(
                            "E·I = {} × {} = {}; the curvature integral peaks at x = {}",
                            Show::Modulus.fmt(m.e, sys),
                            inertia_base(p.ix, sys),
                            ei_text,
                            Show::Span.fmt(it.x, sys)
                        )],
                        allow.join("; "),
                    )
                }
                CheckKind::LateralTorsional => {
                    let mut sub = Vec::new();
                    if let Some(cap) = ltb::Capacity::new(p, m, prep.criteria.bracing) {
                        let (lb, cb, ms) = match prep.segments.get(it.part) {
                            Some(seg) if !matches!(prep.criteria.bracing, crate::check::Bracing::Continuous) => {
                                let w = prep.self_weight(r.mass_per_length);
                                let sl = prep.demand.section(w, m.e * p.ix);
                                let combo = prep.demand.apply(it.combo, &sl);
                                let q: Vec<f64> = (1..4).map(|k| prep.demand.abs_moment_at_node(&combo, seg.nodes[k])).collect();
                                let cb = if seg.free_end { 1.0 } else { ltb::cb(it.demand, q[0], q[1], q[2]) };
                                (seg.x2 - seg.x1, cb, Some((q, seg.free_end)))
                            }
                            _ => (0.0, 1.0, None),
                        };
                        sub.push(format!(
                            "L_b = {}; L_p = 1.76·r_y·√(E/F_y) = {}; L_r (F2-6) = {}",
                            len(lb, sys),
                            len(cap.lp, sys),
                            len(cap.lr, sys)
                        ));
                        match ms {
                            Some((q, false)) => sub.push(format!(
                                "C_b = 12.5·M_max/(2.5·M_max + 3·M_A + 4·M_B + 3·M_C) = 12.5×{m0}/(2.5×{m0} + 3×{a} + 4×{b} + 3×{c}) = {cb:.3}",
                                m0 = fmt_num(Show::Moment.value(it.demand, sys)),
                                a = fmt_num(Show::Moment.value(q[0], sys)),
                                b = fmt_num(Show::Moment.value(q[1], sys)),
                                c = fmt_num(Show::Moment.value(q[2], sys)),
                            )),
                            Some((_, true)) => sub.push("C_b = 1.0 (segment with a free end)".into()),
                            None => sub.push("continuously braced: L_b = 0".into()),
                        }
                        sub.push(format!(
                            "M_p = F_y·Z_x = {}; 0.7·F_y·S_x = {}; {} → M_n = {}",
                            Show::Moment.fmt(cap.mp, sys),
                            Show::Moment.fmt(cap.fy_sx_07, sys),
                            cap.regime(lb, cb),
                            Show::Moment.fmt(cap.nominal(lb, cb), sys)
                        ));
                    }
                    (
                        "M_a ≤ M_n/Ω_b, Ω_b = 1.67 (AISC 360-16 F1, F2, F3)".to_string(),
                        sub,
                        format!("M_n/Ω_b = {}", Show::Moment.fmt(it.capacity, sys)),
                    )
                }
            };
            WrittenCheck {
                check: it.kind.label().to_string(),
                combination: l.combination.clone(),
                location,
                formula,
                substitution,
                result: format!("= {}", fmt_value(it.kind, it.demand, sys)),
                allowable,
                utilisation: util,
                passes: it.utilisation <= 1.0,
            }
        })
        .collect()
}

fn fmt_value(kind: CheckKind, v: f64, sys: System) -> String {
    match kind {
        CheckKind::Deflection => Show::Deflection.fmt(v, sys),
        CheckKind::LateralTorsional => Show::Moment.fmt(v, sys),
        _ => Show::Stress.fmt(v, sys),
    }
}

/// Diagrams of V, M (for the governing strength combination) and δ (for
/// the governing serviceability combination), enveloped over patterns.
pub fn figures(prep: &Prepared, r: &MemberCheck, sys: System) -> Vec<Figure> {
    let d = &prep.demand;
    let w = r.self_weight;
    let pick = |kind: ComboKind, prefer: &dyn Fn(CheckKind) -> bool| -> Option<usize> {
        r.lines
            .iter()
            .filter(|l| prefer(l.check))
            .max_by(|a, b| a.utilisation.total_cmp(&b.utilisation))
            .and_then(|l| {
                d.combos
                    .iter()
                    .position(|c| c.name == l.combination && c.kind == kind)
            })
    };
    let strength = pick(ComboKind::Strength, &|k| k != CheckKind::Deflection);
    let service = pick(ComboKind::Service, &|k| k == CheckKind::Deflection);
    let supports: Vec<f64> = d
        .stretches
        .iter()
        .flat_map(|s| {
            let mut v = Vec::new();
            if s.left_node.is_some() {
                v.push(s.x1);
            }
            if s.right_node.is_some() {
                v.push(s.x2);
            }
            v
        })
        .map(|x| Show::Span.value(x, sys))
        .collect();
    let mut figs = Vec::new();
    let ei = prep.material.e * r.properties.ix;
    let sl = d.section(w, ei);
    let mut plot = |ci: usize, q: Quantity, name: &str, show: Show, scale: f64, sign: f64| {
        let a = d.apply(ci, &sl);
        let c = a.combo;
        let (mut lo, mut hi) = (Vec::new(), Vec::new());
        for e in 0..d.len.len() {
            for k in 0..=24 {
                let s = d.len[e] * k as f64 / 24.0;
                let (a, b) = d.envelope_at(&a, q, e, s);
                let x = Show::Span.value(d.mesh.x[e] + s, sys);
                lo.push((x, sign * show.value(a * scale, sys)));
                hi.push((x, sign * show.value(b * scale, sys)));
            }
        }
        let patterned = !c.patterns.is_empty();
        let ex = d.extremes(&a, q, 0..d.len.len());
        let mut marks = Vec::new();
        for (v, x) in [(ex.max, ex.x_max), (ex.min, ex.x_min)] {
            if v != 0.0 {
                marks.push((
                    Show::Span.value(x, sys),
                    sign * show.value(v * scale, sys),
                    format!("{} at {}", show.fmt(v * scale, sys), Show::Span.fmt(x, sys)),
                ));
            }
        }
        marks.dedup_by(|a, b| (a.0 - b.0).abs() < 1e-9 && (a.1 - b.1).abs() < 1e-9);
        let curves = if patterned { vec![hi, lo] } else { vec![hi] };
        let title = format!(
            "{name} — {}{}",
            c.name,
            if patterned {
                " (envelope over span patterns)"
            } else {
                ""
            }
        );
        let svg = chart::beam_diagram(
            &title,
            &format!("x [{}]", Show::Span.label(sys)),
            &format!("{name} [{}]", show.label(sys)),
            &curves,
            &marks,
            &supports,
        );
        figs.push(Figure {
            caption: title,
            svg,
        });
    };
    if let Some(ci) = strength {
        plot(ci, Quantity::Shear, "Shear V", Show::Force, 1.0, 1.0);
        plot(
            ci,
            Quantity::Moment,
            "Bending moment M (sagging positive)",
            Show::Moment,
            1.0,
            1.0,
        );
    }
    if let Some(ci) = service {
        plot(
            ci,
            Quantity::Deflection,
            "Deflection δ (downward plotted down)",
            Show::Deflection,
            1.0 / ei,
            -1.0,
        );
    }
    figs
}

/// Reactions per case and per combination.
pub fn reaction_tables(
    job: &Job,
    prep: &Prepared,
    sect: &crate::beam::SectionLoad,
    sys: System,
) -> Vec<Table> {
    let w_sw = sect.w_sw;
    let d = &prep.demand;
    let b = &job.beam;
    let f = Show::Force.label(sys);
    let nodes: Vec<usize> = (0..b.supports.len())
        .filter(|&n| b.supports[n].restrains_vertical())
        .collect();
    let mut heads: Vec<String> = vec!["Case".into()];
    heads.extend(
        nodes
            .iter()
            .map(|&n| format!("R at {} [{f}]", Show::Span.fmt(d.node_x[n], sys))),
    );
    let refs: Vec<(&str, Align)> = heads
        .iter()
        .enumerate()
        .map(|(i, h)| (h.as_str(), if i == 0 { Align::Left } else { Align::Right }))
        .collect();
    let mut t = Table::new(
        "Reactions per load case (upward), self-weight in its case",
        &refs,
    );
    for (ci, c) in b.cases.iter().enumerate() {
        let sw = if Some(ci) == prep_sw_case(job) {
            w_sw
        } else {
            0.0
        };
        let mut row = vec![c.name.clone()];
        let rs = d.case_reactions(sect, ci, sw);
        for &n in &nodes {
            row.push(Show::Force.num(rs[n].0, sys));
        }
        t.row(row);
    }
    let mut heads2: Vec<String> = vec!["Combination".into()];
    heads2.extend(
        nodes
            .iter()
            .map(|&n| format!("R at {} [{f}]", Show::Span.fmt(d.node_x[n], sys))),
    );
    let refs2: Vec<(&str, Align)> = heads2
        .iter()
        .enumerate()
        .map(|(i, h)| (h.as_str(), if i == 0 { Align::Left } else { Align::Right }))
        .collect();
    let mut t2 = Table::new(
        "Reactions per combination (upward; min … max over span patterns)",
        &refs2,
    );
    for ci in 0..d.combos.len() {
        let a = d.apply(ci, sect);
        let c = a.combo;
        let r = d.reactions(&a);
        let mut row = vec![c.name.clone()];
        for &n in &nodes {
            let (lo, hi) = r[n];
            row.push(if (hi - lo).abs() <= 1e-9 * hi.abs().max(1.0) {
                Show::Force.num(hi, sys)
            } else {
                format!(
                    "{} … {}",
                    Show::Force.num(lo, sys),
                    Show::Force.num(hi, sys)
                )
            });
        }
        t2.row(row);
    }
    vec![t, t2]
}

fn prep_sw_case(job: &Job) -> Option<usize> {
    job.beam
        .self_weight_case
        .filter(|_| job.criteria.self_weight)
}

/// Section properties with their origin.
pub fn section_table(r: &MemberCheck, sys: System) -> Table {
    let mut t = Table::new(
        "Section properties",
        &[
            ("Property", Align::Left),
            ("Value", Align::Right),
            ("Unit", Align::Left),
        ],
    );
    for (label, v, kind) in r.properties.rows() {
        t.row(vec![label.into(), kind.num(v, sys), kind.label(sys).into()]);
    }
    t.row(vec![
        "Mass per length".into(),
        Show::Mass.num(r.mass_per_length, sys),
        Show::Mass.label(sys).into(),
    ]);
    t.row(vec![
        "Self-weight load".into(),
        Show::LineLoad.num(r.self_weight, sys),
        Show::LineLoad.label(sys).into(),
    ]);
    t
}

/// Methods, sources and assumptions, for the end of the sheet.
pub fn methods(prep: &Prepared) -> (Vec<String>, Vec<String>) {
    let mut m = vec![
        "Flexure formula f = M·y/I (extreme fibres: f = M·c/I = M/S); shear stress by V·Q/(I·t) (Jourawski) or the average web shear V/(d·t_w) for I-shapes (AISC 360-16 G2.1).".to_string(),
        "Analysis: direct stiffness method with Euler–Bernoulli beam elements and consistent nodal loads, exact for uniform, linearly varying, point and moment loads; moment and shear by statics; deflection by integrating the curvature M/(E·I) twice from the exact nodal values.".to_string(),
        "Pattern loading: live-type cases taken span by span, the worst combination of spans at every station.".to_string(),
    ];
    if !matches!(prep.criteria.bracing, crate::check::Bracing::NotGiven) {
        m.push("Lateral-torsional buckling: ANSI/AISC 360-16 Chapter F, §F2 and §F3, allowable strength design, Ω_b = 1.67, C_b by eq. F1-1.".into());
    }
    m.push("Combination presets (where used): ASCE/SEI 7-16 §2.4.1 basic allowable-stress combinations; deflection presets: IBC 2018 Table 1604.3 (from memory; verify against the editions in force).".into());
    let a = vec![
        "Linear elastic material; plane sections remain plane; small deflections.".to_string(),
        "Prismatic member; loads act in the plane of the principal axis of bending (no torsion).".to_string(),
        "Supports as modelled (pinned, roller, fixed, springs); deflections measured from the line joining a span's supports.".to_string(),
        "Allowable stresses and deflection limits as entered by the user, including any duration, size or creep factors.".to_string(),
    ];
    (m, a)
}
