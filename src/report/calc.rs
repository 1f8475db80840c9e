//! The calculation sheet of one member: a model a checker can follow by
//! hand — the job, reactions, diagrams, the section, and each check
//! written as formula → numbers → result → allowable → utilisation. Built
//! from the same prepared demand and check lines as `check`; the Markdown
//! and HTML renderers (`sheet`) only print it.

use super::chart;
use super::member::MemberCheck;
use super::{Align, Table};
use crate::beam::analysis::At;
use crate::check::{CheckKind, Prepared};
use crate::units::{Show, System};
use serde::Serialize;

/// One check, written out.
#[derive(Clone, Debug, Serialize)]
pub struct WrittenCheck {
    pub check: String,
    pub combination: String,
    /// The combination and load pattern that give this line's demand,
    /// in words.
    pub governs: String,
    pub location: String,
    /// The span, overhang or buckling segment (what a check is grouped by
    /// over the combinations).
    pub part: String,
    pub formula: String,
    pub substitution: Vec<String>,
    pub result: String,
    pub allowable: String,
    pub utilisation: String,
    /// The utilisation as a number (what picks the line written in full).
    pub ratio: f64,
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
    /// The title block (the job's `[project]` table).
    pub project: crate::job::Project,
    pub member: String,
    pub section: String,
    pub section_source: String,
    pub verdict: String,
    pub tables: Vec<Table>,
    pub figures: Vec<Figure>,
    pub checks: Vec<WrittenCheck>,
    pub alternatives: Option<Table>,
    /// Failing sections lighter than this one (a scan's near misses);
    /// None where the section did not come from a scan.
    pub near_misses: Option<Table>,
    pub methods: Vec<String>,
    pub assumptions: Vec<String>,
    pub not_verified: Vec<String>,
    pub excluded: Vec<String>,
    pub not_checked: Vec<String>,
    pub notes: Vec<String>,
    pub caution: &'static str,
    pub generator: String,
}

impl Sheet {
    /// The sheet with the near misses of the scan that found its section.
    pub fn with_near_misses(mut self, t: Option<Table>) -> Sheet {
        self.near_misses = t;
        self
    }
}

/// The one sign convention of the sheet, stated at its start: every table,
/// check line and diagram follows it.
pub const SIGNS: &str = "Sign convention (the whole sheet): x from the left end of the beam; loads downward positive, applied moments clockwise positive; \
reactions upward positive; bending moment M sagging positive (hogging negative); shear V = dM/dx; \
deflection δ positive downward, an upward movement negative — in the tables, the check lines and the diagrams alike \
(the deflection diagram draws downward values below its axis and its scale reads positive downward).";

/// The three verdicts and their exit codes, in words (for every sheet).
pub const VERDICTS: &str = "Verdicts: PASSES — every limit state that applies was evaluated by the method stated and is within its capacity (exit code 0); \
FAILS — a limit state evaluated exceeds its capacity (exit code 1); NOT VERIFIED — nothing evaluated fails, but a limit state that applies \
could not be evaluated (a missing input, a shape outside a method's range, no method for the material): this is not a pass (exit code 5). \
A limit state the user excluded is listed as excluded, by choice.";

/// Write out every check line of a member check (from the working the
/// library attached to each line).
pub fn written_checks(r: &MemberCheck, sys: System) -> Vec<WrittenCheck> {
    r.lines
        .iter()
        .map(|l| {
            let location = l.location(sys);
            let w = &l.working;
            let terms: Vec<String> = w
                .terms
                .iter()
                .map(|t| format!("{} = {}", t.symbol, t.show.fmt(t.value, sys)))
                .collect();
            let substitution = terms.chunks(4).map(|c| c.join("; ")).collect();
            WrittenCheck {
                check: l.label.clone(),
                combination: l.combination.clone(),
                governs: match &l.pattern {
                    Some(p) => format!("combination {}, load pattern: {p}", l.combination),
                    None => format!(
                        "combination {} (no patterned loads: every load as given)",
                        l.combination
                    ),
                },
                location,
                part: l.part_shown(sys),
                formula: if w.formula.is_empty() {
                    w.method.clone()
                } else {
                    format!("{} — {}", w.method, w.formula)
                },
                substitution,
                // A deflection keeps its sign (downward positive) beside
                // the size the limit is compared with.
                result: if l.check == CheckKind::Deflection {
                    format!(
                        "δ = {} ({}), |δ| = {}",
                        Show::Deflection.fmt(l.action, sys),
                        if l.action < 0.0 { "upward" } else { "downward" },
                        l.show.fmt(l.demand, sys)
                    )
                } else {
                    format!("= {}", l.show.fmt(l.demand, sys))
                },
                allowable: format!("{} = {}", w.capacity, l.show.fmt(l.capacity, sys)),
                utilisation: format!(
                    "{} / {} = {:.3}",
                    l.show.fmt(l.demand, sys),
                    l.show.fmt(l.capacity, sys),
                    l.utilisation
                ),
                ratio: l.utilisation,
                passes: l.passes,
            }
        })
        .collect()
}

/// The figures of a member check: its diagrams drawn in display units.
pub fn figures(r: &MemberCheck, sys: System) -> Vec<Figure> {
    let supports: Vec<f64> = r
        .supports_x
        .iter()
        .map(|&x| Show::Span.value(x, sys))
        .collect();
    r.diagrams
        .iter()
        .map(|g| {
            let curves: Vec<Vec<(f64, f64)>> = g
                .curves
                .iter()
                .map(|c| {
                    c.iter()
                        .map(|&(x, v)| (Show::Span.value(x, sys), g.sign * g.show.value(v, sys)))
                        .collect()
                })
                .collect();
            let marks: Vec<(f64, f64, String)> = g
                .marks
                .iter()
                .map(|&(x, v)| {
                    (
                        Show::Span.value(x, sys),
                        g.sign * g.show.value(v, sys),
                        format!("{} at {}", g.show.fmt(v, sys), Show::Span.fmt(x, sys)),
                    )
                })
                .collect();
            let title = format!(
                "{} — {}{}",
                g.name,
                g.combination,
                if g.patterned {
                    " (envelope over span patterns)"
                } else {
                    ""
                }
            );
            let svg = chart::beam_diagram(
                &title,
                &format!("x [{}]", Show::Span.label(sys)),
                &format!("{} [{}]", g.name, g.show.label(sys)),
                &curves,
                &marks,
                &supports,
                g.sign < 0.0,
            );
            Figure {
                caption: title,
                svg,
            }
        })
        .collect()
}

/// A header row: the first column left, one right-aligned column per
/// supported node.
fn node_headers(first: &str, xs: &[f64], sys: System) -> Vec<(String, Align)> {
    let f = Show::Force.label(sys);
    let mut heads = vec![(first.to_string(), Align::Left)];
    heads.extend(xs.iter().map(|&x| {
        (
            format!("R at {} [{f}]", Show::Span.fmt(x, sys)),
            Align::Right,
        )
    }));
    heads
}

/// Reactions per case and per combination, from the member's analysis.
pub fn reaction_tables(r: &MemberCheck, sys: System) -> Vec<Table> {
    let a = &r.analysis;
    let xs: Vec<f64> = a
        .combinations
        .first()
        .map(|c| c.reactions.iter().map(|n| n.x_mm).collect())
        .unwrap_or_default();
    let table = |title: &str, first: &str| {
        let hs = node_headers(first, &xs, sys);
        let refs: Vec<(&str, Align)> = hs.iter().map(|(h, al)| (h.as_str(), *al)).collect();
        Table::new(title, &refs)
    };
    let mut t = table(
        "Reactions per load case (upward), self-weight in its case",
        "Case",
    );
    for c in &a.cases {
        let mut row = vec![c.case.clone()];
        row.extend(c.reactions.iter().map(|n| Show::Force.num(n.force_n, sys)));
        t.row(row);
    }
    let mut t2 = table(
        "Reactions per combination (upward; min … max over span patterns)",
        "Combination",
    );
    for c in &a.combinations {
        let mut row = vec![c.combination.clone()];
        row.extend(c.reactions.iter().map(|n| {
            let (lo, hi) = (n.force_n.min, n.force_n.max);
            if (hi - lo).abs() <= 1e-9 * hi.abs().max(1.0) {
                Show::Force.num(hi, sys)
            } else {
                format!(
                    "{} … {}",
                    Show::Force.num(lo, sys),
                    Show::Force.num(hi, sys)
                )
            }
        }));
        t2.row(row);
    }
    vec![t, t2]
}

/// Extremes per combination and span, with both deflection extremes (the
/// largest downward and the largest upward movement, e.g. a back span
/// lifted by its overhang), from the member's analysis.
pub fn extremes_table(r: &MemberCheck, sys: System) -> Table {
    let (ml, fl, dl, sl) = (
        Show::Moment.label(sys),
        Show::Force.label(sys),
        Show::Deflection.label(sys),
        Show::Span.label(sys),
    );
    let heads = [
        "Combination".to_string(),
        "Part".into(),
        format!("M+ [{ml}]"),
        format!("M− [{ml}]"),
        format!("|V| [{fl}]"),
        format!("δ largest down [{dl}] at x [{sl}]"),
        format!("δ largest up [{dl}] at x [{sl}]"),
    ];
    let refs: Vec<(&str, Align)> = heads
        .iter()
        .enumerate()
        .map(|(i, h)| (h.as_str(), if i < 2 { Align::Left } else { Align::Right }))
        .collect();
    let mut t = Table::new(
        "Extremes per combination and span (envelope over load patterns; deflection from the chord of the span's supports, positive downward: an upward movement is negative)",
        &refs,
    );
    // Both deflections as the analysis gives them, downward positive (the
    // upward one negative).
    let at = |v: Option<At>, show: Show| match v {
        Some(a) => format!(
            "{} at {}",
            show.num(a.value, sys),
            Show::Span.num(a.x_mm, sys)
        ),
        None => "—".into(),
    };
    for e in &r.analysis.extremes {
        t.row(vec![
            e.combination.clone(),
            e.part.clone(),
            e.sagging_nmm
                .map(|x| Show::Moment.num(x.value, sys))
                .unwrap_or_else(|| "—".into()),
            e.hogging_nmm
                .map(|x| Show::Moment.num(x.value, sys))
                .unwrap_or_else(|| "—".into()),
            Show::Force.num(e.shear_n.value.abs(), sys),
            at(e.deflection_down_mm, Show::Deflection),
            at(e.deflection_up_mm, Show::Deflection),
        ]);
    }
    t
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

/// Methods and sources (for the end of the sheet) and assumptions.
pub fn methods(prep: &Prepared, r: &MemberCheck, sys: System) -> (Vec<String>, Vec<String>) {
    let mut m = vec![
        "Flexure formula f = M·y/I (extreme fibres: f = M·c/I = M/S); shear stress by V·Q/(I·t) (Jourawski) or the average web shear V/(d·t_w) for I-shapes.".to_string(),
        "Analysis: direct stiffness method with Euler–Bernoulli beam elements and consistent nodal loads, exact for uniform, linearly varying, point and moment loads; moment and shear by statics; deflection by integrating the curvature M/(E·I) twice from the exact nodal values; spring supports by compatibility of the settlements for this section's E·I.".to_string(),
        "Pattern loading: live-type cases taken span by span, the worst combination of spans at every station; snow, where partial loading applies, full on some spans and half on the others.".to_string(),
    ];
    let mut seen: Vec<String> = Vec::new();
    for l in &r.lines {
        if !seen.contains(&l.working.method) && l.check != CheckKind::Deflection {
            seen.push(l.working.method.clone());
        }
    }
    m.extend(seen);
    m.push("Combination presets (where used): ASCE/SEI 7-16 §2.4.1 basic allowable-stress combinations; deflection presets: IBC 2018 Table 1604.3 (from memory; verify against the editions in force).".into());
    let mut a = vec![
        "Linear elastic material; plane sections remain plane; small deflections.".to_string(),
        "Prismatic member; loads act in the plane of the principal axis of bending (no torsion)."
            .to_string(),
        "Allowable stresses and deflection limits as entered by the user.".to_string(),
    ];
    a.extend(prep.assumptions_in(sys));
    (m, a)
}

/// The title block of the sheet from the job's `[project]` table: the
/// project, job number, member, date and revision, then who prepared and
/// who checked it, with the signature and date left blank to sign by hand
/// (and a name left blank where the job gives none).
pub fn title_block(p: &crate::job::Project) -> Vec<Table> {
    let or_blank = |v: &Option<String>| v.clone().unwrap_or_default();
    let mut t = Table::new(
        "Title block",
        &[
            ("Project", Align::Left),
            ("Job number", Align::Left),
            ("Member", Align::Left),
            ("Date", Align::Left),
            ("Revision", Align::Left),
        ],
    );
    t.row(vec![
        or_blank(&p.project),
        or_blank(&p.job_number),
        or_blank(&p.member),
        or_blank(&p.date),
        or_blank(&p.revision),
    ]);
    let mut s = Table::new(
        "Sign-off",
        &[
            ("Role", Align::Left),
            ("Name", Align::Left),
            ("Signature", Align::Left),
            ("Date", Align::Left),
        ],
    );
    s.row(vec![
        "Prepared by (engineer)".into(),
        or_blank(&p.engineer),
        String::new(),
        String::new(),
    ]);
    s.row(vec![
        "Checked by (checker)".into(),
        or_blank(&p.checker),
        String::new(),
        String::new(),
    ]);
    vec![t, s]
}

/// The load diagram of the job: supports at the nodes, one lane per load
/// case with its loads (and the section's self-weight in its case), in
/// display units.
pub fn load_figure(job: &crate::job::Job, r: &MemberCheck, sys: System) -> Figure {
    use super::chart::Glyph;
    use crate::beam::LoadKind;
    let b = &job.beam;
    let span = |v: f64| Show::Span.value(v, sys);
    let mut x = 0.0;
    let mut nodes = vec![0.0];
    for s in &b.spans {
        x += s;
        nodes.push(x);
    }
    let supports: Vec<(f64, String)> = b
        .supports
        .iter()
        .zip(&nodes)
        .filter(|(s, _)| s.restrains_vertical())
        .map(|(s, &x)| (span(x), s.name()))
        .collect();
    let sw = b.self_weight_case.filter(|_| job.criteria.self_weight);
    let cases: Vec<(String, Vec<(Glyph, String)>)> = b
        .cases
        .iter()
        .enumerate()
        .map(|(i, c)| {
            let mut g: Vec<(Glyph, String)> = b
                .loads
                .iter()
                .filter(|l| l.case == i)
                .map(|l| match l.kind {
                    LoadKind::Distributed { x1, x2, w1, w2 } => (
                        Glyph::Line {
                            x1: span(x1),
                            x2: span(x2),
                            w1: Show::LineLoad.value(w1, sys),
                            w2: Show::LineLoad.value(w2, sys),
                        },
                        if w1 == w2 {
                            Show::LineLoad.fmt(w1, sys)
                        } else {
                            format!(
                                "{} to {}",
                                Show::LineLoad.fmt(w1, sys),
                                Show::LineLoad.fmt(w2, sys)
                            )
                        },
                    ),
                    LoadKind::Point { x, p } => (
                        Glyph::Force {
                            x: span(x),
                            p: Show::Force.value(p, sys),
                        },
                        Show::Force.fmt(p, sys),
                    ),
                    LoadKind::Moment { x, m } => (
                        Glyph::Couple { x: span(x) },
                        format!(
                            "{} {}",
                            Show::Moment.fmt(m.abs(), sys),
                            if m >= 0.0 {
                                "clockwise"
                            } else {
                                "anticlockwise"
                            }
                        ),
                    ),
                })
                .collect();
            if sw == Some(i) && r.self_weight > 0.0 {
                g.push((
                    Glyph::Line {
                        x1: 0.0,
                        x2: span(b.length()),
                        w1: Show::LineLoad.value(r.self_weight, sys),
                        w2: Show::LineLoad.value(r.self_weight, sys),
                    },
                    format!("self-weight {}", Show::LineLoad.fmt(r.self_weight, sys)),
                ));
            }
            (c.name.clone(), g)
        })
        .collect();
    let title =
        "Loads by case (unfactored; line loads drawn to scale within each lane)".to_string();
    Figure {
        svg: chart::load_diagram(
            &title,
            &format!("x [{}]", Show::Span.label(sys)),
            span(b.length()),
            &supports,
            &cases,
        ),
        caption: title,
    }
}
