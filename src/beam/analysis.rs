//! The analysis of a beam for one section (or a given E·I) as a result a
//! person reads: reactions per case and per combination, spring
//! settlements, the extremes of moment, shear and deflection per span, and
//! optionally the values at stations. Computed here, once, so every
//! renderer prints the same numbers. No I/O.
//!
//! Round-off is not a value: a station value below 10⁻⁹ of the largest
//! magnitude of the same quantity along the beam, in the same
//! combination, is printed as zero (a relative threshold, so a beam in
//! N·mm and one in kip·in are cleaned alike).

use super::demand::{Demand, Quantity, SectionLoad, eval};
use super::model::{Beam, ComboKind};
use serde::Serialize;

/// Reaction at one supported node.
#[derive(Clone, Debug, Serialize)]
pub struct NodeReaction {
    /// Position from the left end, mm.
    pub x_mm: f64,
    pub support: String,
    /// Upward force, N.
    pub force_n: f64,
    /// Clockwise moment, N·mm.
    pub moment_nmm: f64,
}

/// Reactions of one load case alone (unfactored, every span loaded).
#[derive(Clone, Debug, Serialize)]
pub struct CaseReactions {
    pub case: String,
    pub reactions: Vec<NodeReaction>,
}

/// A range over the load patterns (min = max without patterns).
#[derive(Clone, Copy, Debug, Serialize)]
pub struct Range {
    pub min: f64,
    pub max: f64,
}

/// A reaction range at one supported node.
#[derive(Clone, Debug, Serialize)]
pub struct NodeRange {
    /// Position from the left end, mm.
    pub x_mm: f64,
    pub support: String,
    /// Upward force, N.
    pub force_n: Range,
}

/// Reactions and spring settlements of one combination.
#[derive(Clone, Debug, Serialize)]
pub struct ComboReactions {
    pub combination: String,
    pub kind: ComboKind,
    /// Upward force at each supported node, N, over the load patterns.
    pub reactions: Vec<NodeRange>,
    /// Downward settlement of each spring support, mm: (x mm, range).
    pub settlements_mm: Vec<(f64, Range)>,
}

/// A value and where it occurs.
#[derive(Clone, Copy, Debug, Serialize)]
pub struct At {
    pub value: f64,
    /// Position from the left end, mm.
    pub x_mm: f64,
}

/// Extremes of one combination on one span or overhang (envelope over the
/// load patterns).
#[derive(Clone, Debug, Serialize)]
pub struct PartExtremes {
    pub combination: String,
    pub part: String,
    /// Largest sagging moment, N·mm (None: no sagging).
    pub sagging_nmm: Option<At>,
    /// Largest hogging moment (negative), N·mm (None: no hogging).
    pub hogging_nmm: Option<At>,
    /// Largest shear magnitude (signed), N.
    pub shear_n: At,
    /// Largest downward deflection from the supports' chord, mm (None:
    /// E·I unknown, or nothing moves down).
    pub deflection_down_mm: Option<At>,
    /// Largest upward deflection (negative), mm (None: E·I unknown, or
    /// nothing moves up).
    pub deflection_up_mm: Option<At>,
}

/// Values at one station with every span loaded.
#[derive(Clone, Debug, Serialize)]
pub struct Station {
    pub x_mm: f64,
    /// Per combination: shear N, moment N·mm, deflection mm (None: E·I
    /// unknown).
    pub values: Vec<(f64, f64, Option<f64>)>,
}

/// The whole analysis.
#[derive(Clone, Debug, Serialize)]
pub struct Analysis {
    /// E·I used for deflections and springs, N·mm² (None: not known).
    pub ei_nmm2: Option<f64>,
    /// Self-weight intensity added to its case, N/mm.
    pub self_weight_n_per_mm: f64,
    pub cases: Vec<CaseReactions>,
    pub combinations: Vec<ComboReactions>,
    pub extremes: Vec<PartExtremes>,
    pub stations: Option<Vec<Station>>,
}

/// Analyse for one section. `sect` carries the self-weight intensity and
/// E·I; `ei_known` says whether deflections can be stated (without E·I,
/// and without springs, moments and shears are still exact);
/// `sw_case` is the case receiving the self-weight.
pub fn analyse(
    beam: &Beam,
    d: &Demand,
    sect: &SectionLoad,
    sw_case: Option<usize>,
    ei_known: bool,
    stations: bool,
) -> Analysis {
    let supported: Vec<usize> = (0..beam.supports.len())
        .filter(|&n| beam.supports[n].restrains_vertical())
        .collect();
    let cases = beam
        .cases
        .iter()
        .enumerate()
        .map(|(ci, c)| {
            let sw = if Some(ci) == sw_case { sect.w_sw } else { 0.0 };
            let r = d.case_reactions(sect, ci, sw);
            CaseReactions {
                case: c.name.clone(),
                reactions: supported
                    .iter()
                    .map(|&n| NodeReaction {
                        x_mm: d.node_x[n],
                        support: beam.supports[n].name(),
                        force_n: r[n].0,
                        moment_nmm: r[n].1,
                    })
                    .collect(),
            }
        })
        .collect();
    let mut combinations = Vec::new();
    let mut extremes = Vec::new();
    for ci in 0..d.combos.len() {
        let a = d.apply(ci, sect);
        let r = d.reactions(&a);
        combinations.push(ComboReactions {
            combination: a.combo.name.clone(),
            kind: a.combo.kind,
            reactions: supported
                .iter()
                .map(|&n| NodeRange {
                    x_mm: d.node_x[n],
                    support: beam.supports[n].name(),
                    force_n: Range {
                        min: r[n].0,
                        max: r[n].1,
                    },
                })
                .collect(),
            settlements_mm: d
                .settlements(&a)
                .into_iter()
                .map(|(n, lo, hi)| (d.node_x[n], Range { min: lo, max: hi }))
                .collect(),
        });
        for (k, st) in d.stretches.iter().enumerate() {
            let elems = d.stretch_elements(k);
            let m = d.extremes(&a, Quantity::Moment, elems.clone());
            let v = d.extremes(&a, Quantity::Shear, elems.clone());
            let y = d.extremes(&a, Quantity::Deflection, elems);
            let (vv, xv) = v.abs_max();
            let defl = |val: f64, x: f64, down: bool| -> Option<At> {
                let moves = if down { val > 0.0 } else { val < 0.0 };
                (ei_known && moves).then_some(At {
                    value: val / sect.ei,
                    x_mm: x,
                })
            };
            extremes.push(PartExtremes {
                combination: a.combo.name.clone(),
                part: st.label.clone(),
                sagging_nmm: (m.max > 0.0).then_some(At {
                    value: m.max,
                    x_mm: m.x_max,
                }),
                hogging_nmm: (m.min < 0.0).then_some(At {
                    value: m.min,
                    x_mm: m.x_min,
                }),
                shear_n: At {
                    value: vv,
                    x_mm: xv,
                },
                deflection_down_mm: defl(y.max, y.x_max, true),
                deflection_up_mm: defl(y.min, y.x_min, false),
            });
        }
    }
    let stations = stations.then(|| station_values(d, sect, ei_known));
    Analysis {
        ei_nmm2: ei_known.then_some(sect.ei),
        self_weight_n_per_mm: sect.w_sw,
        cases,
        combinations,
        extremes,
        stations,
    }
}

/// V, M and δ at the element ends and quarter points, every span loaded,
/// cleaned of round-off relative to each column's largest magnitude.
fn station_values(d: &Demand, sect: &SectionLoad, ei_known: bool) -> Vec<Station> {
    let nc = d.combos.len();
    let mut rows: Vec<Station> = Vec::new();
    for e in 0..d.len.len() {
        let last = e + 1 == d.len.len();
        for k in 0..=(if last { 4 } else { 3 }) {
            let s = d.len[e] * k as f64 / 4.0;
            let values = (0..nc)
                .map(|ci| {
                    let a = d.apply(ci, sect);
                    let mut coef = d.base_coef(&a, e);
                    for j in 0..a.combo.patterns.len() {
                        let p = d.part_coef(&a, j, e);
                        for (c, pk) in coef.iter_mut().zip(p.iter()) {
                            *c += pk;
                        }
                    }
                    (
                        eval(Quantity::Shear, &coef, s),
                        eval(Quantity::Moment, &coef, s),
                        ei_known.then(|| eval(Quantity::Deflection, &coef, s) / sect.ei),
                    )
                })
                .collect();
            rows.push(Station {
                x_mm: d.mesh.x[e] + s,
                values,
            });
        }
    }
    for ci in 0..nc {
        let (mut vmax, mut mmax, mut ymax) = (0.0f64, 0.0f64, 0.0f64);
        for r in &rows {
            let (v, m, y) = r.values[ci];
            vmax = vmax.max(v.abs());
            mmax = mmax.max(m.abs());
            ymax = ymax.max(y.unwrap_or(0.0).abs());
        }
        let clean = |x: f64, big: f64| if x.abs() <= 1e-9 * big { 0.0 } else { x };
        for r in rows.iter_mut() {
            let (v, m, y) = r.values[ci];
            r.values[ci] = (clean(v, vmax), clean(m, mmax), y.map(|y| clean(y, ymax)));
        }
    }
    rows
}
