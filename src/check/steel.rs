//! Steel members in flexure and shear by ANSI/AISC 360-16, *Specification
//! for Structural Steel Buildings*, allowable strength design (ASD): the
//! nominal strengths of Chapters F and G divided by Ω_b = 1.67 (§F1) and
//! Ω_v = 1.67 (§G1; 1.50 for the webs of rolled I-shapes that meet
//! G2.1(a)). Equation numbers are those of the 2016 edition, quoted from
//! memory: verify against the edition in force.
//!
//! The section is classified by Table B4.1b for each sense of bending
//! (the compression flange changes with the sign of M), and the chapter
//! section that covers it is applied:
//!
//! * I-shapes, doubly symmetric, compact web: §F2 (compact flanges) or §F3
//!   (noncompact or slender flanges);
//! * I-shapes with noncompact webs, and singly symmetric I-shapes with
//!   compact or noncompact webs: §F4 (R_pc, M_yc, r_t, F_L, tension-flange
//!   yielding);
//! * I-shapes with slender webs: §F5 (R_pg), within the proportioning limits
//!   of §F13.2 (0.1 ≤ I_yc/I_y ≤ 0.9; unstiffened webs h/t_w ≤
//!   min(0.40·E/F_y, 260));
//! * rectangular HSS: §F7 (yielding, flange and web local buckling with the
//!   effective width of slender flanges, lateral-torsional buckling);
//! * round HSS: §F8 (D/t < 0.45·E/F_y);
//! * solid rectangles and rounds: §F11.
//!
//! Shear: §G2.1 (I-shapes, C_v1, k_v = 5.34 for unstiffened webs), §G4
//! (rectangular HSS, C_v2, k_v = 5), §G5 (round HSS, without the L_v term
//! of G5-2a, which is conservative). Solid bars have no Chapter G rule: the
//! elastic peak V·Q/(I·t) is checked against 0.6·F_y/Ω_v, the shear yield
//! of G2.1 applied at the peak (a stated, conservative basis).
//!
//! Lateral-torsional buckling uses L_b (the effective length: the unbraced
//! length times the effective-length factor) and C_b (eq. F1-1).

use crate::section::{Form, IGeometry, Properties};
use std::f64::consts::PI;

/// ASD safety factor for flexure, §F1.
pub const OMEGA_B: f64 = 1.67;
/// ASD safety factor for shear, §G1.
pub const OMEGA_V: f64 = 1.67;
/// ASD safety factor for the webs of rolled I-shapes of §G2.1(a).
pub const OMEGA_V_ROLLED: f64 = 1.50;

/// Moment gradient factor, eq. F1-1, from the absolute values of the
/// largest moment and the quarter-point moments of the unbraced segment.
pub fn cb(mmax: f64, ma: f64, mb: f64, mc: f64) -> f64 {
    let den = 2.5 * mmax + 3.0 * ma + 4.0 * mb + 3.0 * mc;
    if den <= 0.0 { 1.0 } else { 12.5 * mmax / den }
}

/// Why a steel limit state cannot be evaluated: `Gap::SteelProperties`
/// (Iy, J, Cw or Zx not known), `Gap::SteelRange` (outside the method's
/// range, e.g. §F13.2, D/t of §F8, slender HSS webs) or `Gap::ShapeUnknown`
/// (table values only). The check's own gap type, so the strengths reach
/// the check without conversion or copying.
pub type Missing = super::Gap;

/// Compactness of an element (Table B4.1b).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Class {
    Compact,
    Noncompact,
    Slender,
}

impl Class {
    fn of(lam: f64, lp: f64, lr: f64) -> Class {
        if lam <= lp {
            Class::Compact
        } else if lam <= lr {
            Class::Noncompact
        } else {
            Class::Slender
        }
    }
    pub fn name(self) -> &'static str {
        match self {
            Class::Compact => "compact",
            Class::Noncompact => "noncompact",
            Class::Slender => "slender",
        }
    }
}

/// The slenderness of an element and its limits.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Slenderness {
    /// What λ is, e.g. "b_f/(2·t_f)".
    pub ratio: &'static str,
    pub lambda: f64,
    pub lambda_p: f64,
    pub lambda_r: f64,
    pub class: Class,
}

/// The provision of Chapter F that governs a sense of bending.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Provision {
    F2,
    F3,
    F4,
    F5,
    F7,
    F8,
    F11,
}

impl Provision {
    pub fn name(self) -> &'static str {
        match self {
            Provision::F2 => "AISC 360-16 §F2 (doubly symmetric I, compact web and flanges)",
            Provision::F3 => {
                "AISC 360-16 §F3 (doubly symmetric I, compact web, noncompact or slender flanges)"
            }
            Provision::F4 => "AISC 360-16 §F4 (I-shape with a noncompact web, or singly symmetric)",
            Provision::F5 => "AISC 360-16 §F5 (I-shape with a slender web)",
            Provision::F7 => "AISC 360-16 §F7 (rectangular HSS)",
            Provision::F8 => "AISC 360-16 §F8 (round HSS)",
            Provision::F11 => "AISC 360-16 §F11 (solid rectangular or round bar)",
        }
    }
}

/// A nominal strength with the equation that gives it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Nominal {
    pub mn: f64,
    pub eq: &'static str,
}

/// Lateral-torsional buckling constants of one sense of bending.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Ltb {
    /// No lateral-torsional buckling (closed round sections).
    None,
    /// Not asked for (the job has no unbraced segment).
    NotComputed,
    /// §F2.2 (also for §F3): M_p, 0.7·F_y·S_x, L_p, L_r, r_ts, J·c/(S_x·h_0), S_x.
    F2 {
        mp: f64,
        mr: f64,
        lp: f64,
        lr: f64,
        rts: f64,
        jc: f64,
        sx: f64,
    },
    /// §F4.2: R_pc·M_yc, F_L·S_xc, L_p, L_r, r_t, J/(S_xc·h_0), S_xc.
    F4 {
        mmax: f64,
        mr: f64,
        lp: f64,
        lr: f64,
        rt: f64,
        jc: f64,
        sxc: f64,
    },
    /// §F5.2: R_pg, F_y, S_xc, L_p, L_r, r_t.
    F5 {
        rpg: f64,
        fy: f64,
        sxc: f64,
        lp: f64,
        lr: f64,
        rt: f64,
    },
    /// §F7.4: M_p, 0.7·F_y·S_x, L_p, L_r, r_y, √(J·A_g).
    F7 {
        mp: f64,
        mr: f64,
        lp: f64,
        lr: f64,
        ry: f64,
        sqja: f64,
    },
    /// §F11.2: M_y, M_p, depth d, width t, F_y, S_x.
    F11 {
        my: f64,
        mp: f64,
        d: f64,
        t: f64,
        fy: f64,
        sx: f64,
    },
}

impl Ltb {
    /// Nominal strength for effective length `lb` and `cb`, with the
    /// equation used.
    pub fn nominal(&self, e: f64, lb: f64, cb: f64) -> Nominal {
        match *self {
            Ltb::None => Nominal {
                mn: f64::INFINITY,
                eq: "no lateral-torsional buckling",
            },
            Ltb::NotComputed => Nominal {
                mn: f64::NAN,
                eq: "not computed",
            },
            Ltb::F2 {
                mp,
                mr,
                lp,
                lr,
                rts,
                jc,
                sx,
            } => i_shape_ltb(
                mp,
                mr,
                lp,
                lr,
                rts,
                jc,
                sx,
                e,
                lb,
                cb,
                ["F2-1", "F2-2", "F2-3"],
            ),
            Ltb::F4 {
                mmax,
                mr,
                lp,
                lr,
                rt,
                jc,
                sxc,
            } => i_shape_ltb(
                mmax,
                mr,
                lp,
                lr,
                rt,
                jc,
                sxc,
                e,
                lb,
                cb,
                ["F4-1", "F4-2", "F4-3"],
            ),
            Ltb::F5 {
                rpg,
                fy,
                sxc,
                lp,
                lr,
                rt,
            } => {
                let (fcr, eq) = if lb <= lp {
                    (fy, "F5-2 with F_cr = F_y (L_b ≤ L_p)")
                } else if lb <= lr {
                    (
                        (cb * (fy - 0.3 * fy * (lb - lp) / (lr - lp))).min(fy),
                        "F5-2 with F5-3",
                    )
                } else {
                    let s = lb / rt;
                    ((cb * PI * PI * e / (s * s)).min(fy), "F5-2 with F5-4")
                };
                Nominal {
                    mn: rpg * fcr * sxc,
                    eq,
                }
            }
            Ltb::F7 {
                mp,
                mr,
                lp,
                lr,
                ry,
                sqja,
            } => {
                if lb <= lp {
                    Nominal {
                        mn: mp,
                        eq: "F7-1 (L_b ≤ L_p: no lateral-torsional buckling)",
                    }
                } else if lb <= lr {
                    Nominal {
                        mn: (cb * (mp - (mp - mr) * (lb - lp) / (lr - lp))).min(mp),
                        eq: "F7-10",
                    }
                } else {
                    Nominal {
                        mn: (2.0 * e * cb * sqja / (lb / ry)).min(mp),
                        eq: "F7-11",
                    }
                }
            }
            Ltb::F11 {
                my,
                mp,
                d,
                t,
                fy,
                sx,
            } => {
                let x = lb * d / (t * t);
                if x <= 0.08 * e / fy {
                    Nominal {
                        mn: mp,
                        eq: "F11-1 (L_b·d/t² ≤ 0.08·E/F_y: no lateral-torsional buckling)",
                    }
                } else if x <= 1.9 * e / fy {
                    Nominal {
                        mn: (cb * (1.52 - 0.274 * x * fy / e) * my).min(mp),
                        eq: "F11-3",
                    }
                } else {
                    Nominal {
                        mn: (1.9 * e * cb / x * sx).min(mp),
                        eq: "F11-4 with F11-5",
                    }
                }
            }
        }
    }

    /// L_p and L_r (for the written check); None for §F11 and closed rounds.
    pub fn limits(&self) -> Option<(f64, f64)> {
        match *self {
            Ltb::F2 { lp, lr, .. }
            | Ltb::F4 { lp, lr, .. }
            | Ltb::F5 { lp, lr, .. }
            | Ltb::F7 { lp, lr, .. } => Some((lp, lr)),
            _ => None,
        }
    }
}

#[allow(clippy::too_many_arguments)]
#[inline]
fn i_shape_ltb(
    mp: f64,
    mr: f64,
    lp: f64,
    lr: f64,
    r: f64,
    jc: f64,
    s: f64,
    e: f64,
    lb: f64,
    cb: f64,
    eqs: [&'static str; 3],
) -> Nominal {
    if lb <= lp {
        Nominal { mn: mp, eq: eqs[0] }
    } else if lb <= lr {
        Nominal {
            mn: (cb * (mp - (mp - mr) * (lb - lp) / (lr - lp))).min(mp),
            eq: eqs[1],
        }
    } else {
        let q = lb / r;
        let fcr = cb * PI * PI * e / (q * q) * (1.0 + 0.078 * jc * q * q).sqrt();
        Nominal {
            mn: (fcr * s).min(mp),
            eq: eqs[2],
        }
    }
}

/// Flexural strength of one sense of bending.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Flexure {
    pub provision: Provision,
    /// Yielding (F2-1, F7-1, F8-1, F11-1) or compression-flange yielding
    /// (F4-1, F5-1).
    pub yielding: Nominal,
    /// Compression-flange local buckling (F3, F4.3, F5.3, F7.2) or wall
    /// local buckling (F8.2); None when the element is compact.
    pub flange: Option<Nominal>,
    /// Web local buckling of a rectangular HSS (F7.3); None when compact.
    pub web: Option<Nominal>,
    /// Tension-flange yielding (F4.4, F5.4); None when S_xt ≥ S_xc.
    pub tension_flange: Option<Nominal>,
    pub ltb: Ltb,
    /// Compression flange (or wall) slenderness.
    pub flange_class: Option<Slenderness>,
    /// Web slenderness.
    pub web_class: Option<Slenderness>,
}

/// Shear strength.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Shear {
    /// Nominal shear strength V_n, N (for the elastic basis of solid bars:
    /// the shear force at which the peak stress reaches 0.6·F_y).
    pub vn: f64,
    pub omega: f64,
    pub eq: &'static str,
    /// C_v1 or C_v2 (1 where not used).
    pub cv: f64,
    /// Shear area used, mm² (A_w, 2·h·t, A_g/2, or I·t/Q).
    pub area: f64,
}

/// Every steel strength of a section: both senses of bending and shear.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Steel {
    /// [sagging (top flange in compression), hogging (bottom flange)].
    pub flexure: [Flexure; 2],
    pub shear: Shear,
}

impl Flexure {
    /// A placeholder to be written over.
    pub const EMPTY: Flexure = Flexure {
        provision: Provision::F2,
        yielding: Nominal { mn: 0.0, eq: "" },
        flange: None,
        web: None,
        tension_flange: None,
        ltb: Ltb::None,
        flange_class: None,
        web_class: None,
    };
}

impl Steel {
    /// A placeholder to be written over.
    pub const EMPTY: Steel = Steel {
        flexure: [Flexure::EMPTY; 2],
        shear: Shear {
            vn: 0.0,
            omega: 1.0,
            eq: "",
            cv: 1.0,
            area: 0.0,
        },
    };
}

/// A section as AISC sees it: doubly symmetric within round-off?
fn doubly_symmetric(g: &IGeometry) -> bool {
    (g.bf_top - g.bf_bot).abs() <= 1e-9 * g.bf_top && (g.tf_top - g.tf_bot).abs() <= 1e-9 * g.tf_top
}

/// Height of the plastic neutral axis above the bottom fibre of an I-shape
/// (plates only: fillets of a rolled, doubly symmetric shape are
/// symmetric and do not move it).
fn plastic_axis(g: &IGeometry) -> f64 {
    if doubly_symmetric(g) {
        return g.d / 2.0;
    }
    let at = g.bf_top * g.tf_top;
    let ab = g.bf_bot * g.tf_bot;
    let aw = g.hw * g.tw;
    let half = 0.5 * (at + ab + aw);
    if ab >= half {
        half / g.bf_bot
    } else if ab + aw >= half {
        g.tf_bot + (half - ab) / g.tw
    } else {
        g.tf_bot + g.hw + (half - ab - aw) / g.bf_top
    }
}

/// The steel strengths of a section, or why they cannot be evaluated.
pub fn strengths(p: &Properties, fy: f64, e: f64) -> Result<Steel, Missing> {
    strengths_for(p, fy, e, true)
}

/// As [`strengths`]; with `with_ltb` false the lateral-torsional buckling
/// constants of I-shapes are left out (`Ltb::NotComputed`), for jobs with
/// no unbraced segment.
#[inline]
pub fn strengths_for(p: &Properties, fy: f64, e: f64, with_ltb: bool) -> Result<Steel, Missing> {
    let mut out = Steel::EMPTY;
    strengths_into(p, fy, e, with_ltb, &mut out)?;
    Ok(out)
}

/// As [`strengths_for`], written into `out` (the check's hot path: no
/// copy of the result). On an error `out` is left partly written.
#[inline]
pub fn strengths_into(
    p: &Properties,
    fy: f64,
    e: f64,
    with_ltb: bool,
    out: &mut Steel,
) -> Result<(), Missing> {
    match p.form {
        Form::RolledI | Form::WeldedI => i_shape(p, fy, e, p.form == Form::RolledI, with_ltb, out),
        Form::Given if p.i_geometry.is_some() => i_shape(p, fy, e, false, with_ltb, out),
        Form::Rhs { b, h, t, r_out } => {
            *out = rhs(p, fy, e, b, h, t, r_out)?;
            Ok(())
        }
        Form::Chs { d, t } => {
            *out = chs(p, fy, e, d, t)?;
            Ok(())
        }
        Form::Rect { b, d } => {
            *out = bar(p, fy, e, Some((b, d)))?;
            Ok(())
        }
        Form::Round { .. } => {
            *out = bar(p, fy, e, None)?;
            Ok(())
        }
        Form::Given => Err(Missing::ShapeUnknown),
    }
}

#[inline]
fn i_shape(
    p: &Properties,
    fy: f64,
    e: f64,
    rolled: bool,
    with_ltb: bool,
    out: &mut Steel,
) -> Result<(), Missing> {
    let g = p.i_geometry.ok_or(Missing::ShapeUnknown)?;
    let (iy, zx) = (
        p.iy.ok_or(Missing::SteelProperties)?,
        p.zx.ok_or(Missing::SteelProperties)?,
    );
    let j = p.j.ok_or(Missing::SteelProperties)?;
    let sq = (e / fy).sqrt();
    let sym = doubly_symmetric(&g);
    // Web depth for slenderness: clear distance between the flanges less
    // the fillets (Table B4.1b, h).
    let h = g.hw - 2.0 * g.r;
    if h <= 0.0 {
        return Err(Missing::SteelRange);
    }
    let lam_rw = 5.70 * sq;
    // §F13.2: proportioning limits.
    // Either flange may be the compression flange (sagging or hogging), so
    // both must satisfy 0.1 ≤ I_yc/I_y ≤ 0.9 (F13-2).
    if !sym {
        let iyt = g.tf_top * g.bf_top.powi(3) / 12.0;
        let iyb = g.tf_bot * g.bf_bot.powi(3) / 12.0;
        if [iyt / iy, iyb / iy]
            .iter()
            .any(|r| !(0.1..=0.9).contains(r))
        {
            return Err(Missing::SteelRange);
        }
    }
    if h / g.tw > lam_rw && h / g.tw > (0.40 * e / fy).min(260.0) {
        return Err(Missing::SteelRange);
    }
    let yp = plastic_axis(&g);
    let sx_min = p.s_top.min(p.s_bot);
    let mp = (fy * zx).min(1.6 * fy * sx_min);
    let my = fy * sx_min;
    let sense = |sag: bool, out: &mut Flexure| -> Result<(), Missing> {
        let (bfc, tfc) = if sag {
            (g.bf_top, g.tf_top)
        } else {
            (g.bf_bot, g.tf_bot)
        };
        let (sxc, sxt) = if sag {
            (p.s_top, p.s_bot)
        } else {
            (p.s_bot, p.s_top)
        };
        // hc: twice the distance from the centroid to the inside face of the
        // compression flange less the fillet; hp: the same from the plastic
        // neutral axis.
        let (hc, hp) = if sag {
            let inside = g.d - g.tf_top - g.r;
            (2.0 * (inside - p.y_c), 2.0 * (inside - yp))
        } else {
            let inside = g.tf_bot + g.r;
            (2.0 * (p.y_c - inside), 2.0 * (yp - inside))
        };
        let hc = hc.max(0.0);
        let lam_w = hc / g.tw;
        let lam_pw = if sym {
            3.76 * sq
        } else if hp > 0.0 {
            // Table B4.1b case 16.
            let k = 0.54 * mp / my - 0.09;
            ((hc / hp) * sq / (k * k)).min(lam_rw)
        } else {
            lam_rw
        };
        let web_class = Slenderness {
            ratio: if sym { "h/t_w" } else { "h_c/t_w" },
            lambda: lam_w,
            lambda_p: lam_pw,
            lambda_r: lam_rw,
            class: Class::of(lam_w, lam_pw, lam_rw),
        };
        // Flange: Table B4.1b case 10 (rolled) or 11 (built-up).
        let kc = (4.0 / (h / g.tw).sqrt()).clamp(0.35, 0.76);
        let fl = if sxt / sxc >= 0.7 {
            0.7 * fy
        } else {
            (fy * sxt / sxc).max(0.5 * fy)
        };
        let lam_f = bfc / (2.0 * tfc);
        let lam_pf = 0.38 * sq;
        // Table B4.1b note [b]: F_L = 0.7·F_y for slender-web members.
        let fl_flange = if lam_w > lam_rw { 0.7 * fy } else { fl };
        let lam_rf = if rolled {
            sq
        } else {
            0.95 * (kc * e / fl_flange).sqrt()
        };
        let flange_class = Slenderness {
            ratio: "b_f/(2·t_f)",
            lambda: lam_f,
            lambda_p: lam_pf,
            lambda_r: lam_rf,
            class: Class::of(lam_f, lam_pf, lam_rf),
        };
        let iyc = tfc * bfc.powi(3) / 12.0;
        let aw = hc * g.tw / (bfc * tfc);
        // r_t, eq. F4-11 (2016 form).
        let rt = bfc / (12.0 * (1.0 + aw / 6.0)).sqrt();
        if sym && web_class.class == Class::Compact {
            let sx = sx_min;
            let mp2 = fy * zx;
            let ltb = if with_ltb {
                let cw = p.cw.unwrap_or(f64::NAN);
                let ry = (iy / p.area).sqrt();
                let lp = 1.76 * ry * sq;
                let rts = ((iy * cw).sqrt() / sx).sqrt();
                let jc = j / (sx * g.h0);
                let lr = 1.95 * rts * e / (0.7 * fy)
                    * (jc + (jc * jc + 6.76 * (0.7 * fy / e).powi(2)).sqrt()).sqrt();
                Ltb::F2 {
                    mp: mp2,
                    mr: 0.7 * fy * sx,
                    lp,
                    lr,
                    rts,
                    jc,
                    sx,
                }
            } else {
                Ltb::NotComputed
            };
            let flange = match flange_class.class {
                Class::Compact => None,
                Class::Noncompact => Some(Nominal {
                    mn: mp2 - (mp2 - 0.7 * fy * sx) * (lam_f - lam_pf) / (lam_rf - lam_pf),
                    eq: "F3-1",
                }),
                Class::Slender => Some(Nominal {
                    mn: 0.9 * e * kc * sx / (lam_f * lam_f),
                    eq: "F3-2",
                }),
            };
            *out = Flexure {
                provision: if flange.is_none() {
                    Provision::F2
                } else {
                    Provision::F3
                },
                yielding: Nominal {
                    mn: mp2,
                    eq: "F2-1",
                },
                flange,
                web: None,
                tension_flange: None,
                ltb,
                flange_class: Some(flange_class),
                web_class: Some(web_class),
            };
            return Ok(());
        }
        let myc = fy * sxc;
        let myt = fy * sxt;
        if web_class.class != Class::Slender {
            // §F4.
            let rpc = if iyc / iy > 0.23 {
                if lam_w <= lam_pw {
                    mp / myc
                } else {
                    (mp / myc - (mp / myc - 1.0) * (lam_w - lam_pw) / (lam_rw - lam_pw))
                        .min(mp / myc)
                }
            } else {
                1.0
            };
            let jj = if iyc / iy <= 0.23 { 0.0 } else { j };
            let jc = jj / (sxc * g.h0);
            let lp = 1.1 * rt * sq;
            let lr = 1.95 * rt * e / fl * (jc + (jc * jc + 6.76 * (fl / e).powi(2)).sqrt()).sqrt();
            let flange = match flange_class.class {
                Class::Compact => None,
                Class::Noncompact => Some(Nominal {
                    mn: rpc * myc - (rpc * myc - fl * sxc) * (lam_f - lam_pf) / (lam_rf - lam_pf),
                    eq: "F4-13",
                }),
                Class::Slender => Some(Nominal {
                    mn: 0.9 * e * kc * sxc / (lam_f * lam_f),
                    eq: "F4-14",
                }),
            };
            let tension_flange = (sxt < sxc).then(|| {
                // As for R_pc, R_pt = 1.0 when I_yc/I_y ≤ 0.23 (conservative,
                // from memory of F4.4).
                let rpt = if iyc / iy <= 0.23 {
                    1.0
                } else if lam_w <= lam_pw {
                    mp / myt
                } else {
                    (mp / myt - (mp / myt - 1.0) * (lam_w - lam_pw) / (lam_rw - lam_pw))
                        .min(mp / myt)
                };
                Nominal {
                    mn: rpt * myt,
                    eq: "F4-15",
                }
            });
            *out = Flexure {
                provision: Provision::F4,
                yielding: Nominal {
                    mn: rpc * myc,
                    eq: "F4-1",
                },
                flange,
                web: None,
                tension_flange,
                ltb: if with_ltb {
                    Ltb::F4 {
                        mmax: rpc * myc,
                        mr: fl * sxc,
                        lp,
                        lr,
                        rt,
                        jc,
                        sxc,
                    }
                } else {
                    Ltb::NotComputed
                },
                flange_class: Some(flange_class),
                web_class: Some(web_class),
            };
            return Ok(());
        }
        // §F5. R_pg (F5-6) is stated for a_w ≤ 10; a web larger than ten
        // times the compression flange is outside the method (F5.2), so it
        // is not verified rather than capped.
        if aw > 10.0 {
            return Err(Missing::SteelRange);
        }
        let rpg = (1.0 - aw / (1200.0 + 300.0 * aw) * (lam_w - 5.7 * sq)).min(1.0);
        let lp = 1.1 * rt * sq;
        let lr = PI * rt * (e / (0.7 * fy)).sqrt();
        let flange = match flange_class.class {
            Class::Compact => None,
            Class::Noncompact => Some(Nominal {
                mn: rpg * (fy - 0.3 * fy * (lam_f - lam_pf) / (lam_rf - lam_pf)) * sxc,
                eq: "F5-7 with F5-8",
            }),
            Class::Slender => Some(Nominal {
                mn: rpg * (0.9 * e * kc / (lam_f * lam_f)) * sxc,
                eq: "F5-7 with F5-9",
            }),
        };
        *out = Flexure {
            provision: Provision::F5,
            yielding: Nominal {
                mn: rpg * fy * sxc,
                eq: "F5-1",
            },
            flange,
            web: None,
            tension_flange: (sxt < sxc).then_some(Nominal {
                mn: fy * sxt,
                eq: "F5-10",
            }),
            ltb: Ltb::F5 {
                rpg,
                fy,
                sxc,
                lp,
                lr,
                rt,
            },
            flange_class: Some(flange_class),
            web_class: Some(web_class),
        };
        Ok(())
    };
    let [sag, hog] = &mut out.flexure;
    sense(true, sag)?;
    // A doubly symmetric section bends the same way either way.
    if sym {
        *hog = *sag;
    } else {
        sense(false, hog)?;
    }
    if (sag.provision == Provision::F2 || sag.provision == Provision::F3) && p.cw.is_none() {
        return Err(Missing::SteelProperties);
    }
    // §G2.1: h as for slenderness, A_w = d·t_w, k_v = 5.34 (no stiffeners).
    let lam = h / g.tw;
    let aw = g.d * g.tw;
    out.shear = if rolled && lam <= 2.24 * sq {
        Shear {
            vn: 0.6 * fy * aw,
            omega: OMEGA_V_ROLLED,
            eq: "G2-1 with C_v1 = 1.0 (G2-2, rolled web h/t_w ≤ 2.24√(E/F_y), Ω_v = 1.50)",
            cv: 1.0,
            area: aw,
        }
    } else {
        let lim = 1.10 * (5.34 * e / fy).sqrt();
        let (cv, eq) = if lam <= lim {
            (1.0, "G2-1 with C_v1 = 1.0 (G2-3)")
        } else {
            (lim / lam, "G2-1 with C_v1 by G2-4")
        };
        Shear {
            vn: 0.6 * fy * aw * cv,
            omega: OMEGA_V,
            eq,
            cv,
            area: aw,
        }
    };
    Ok(())
}

#[allow(clippy::too_many_arguments)]
fn rhs(
    p: &Properties,
    fy: f64,
    e: f64,
    bo: f64,
    ho: f64,
    t: f64,
    r_out: f64,
) -> Result<Steel, Missing> {
    let zx = p.zx.ok_or(Missing::SteelProperties)?;
    let (iy, j) = (
        p.iy.ok_or(Missing::SteelProperties)?,
        p.j.ok_or(Missing::SteelProperties)?,
    );
    let sq = (e / fy).sqrt();
    // Flat widths: the clear distance between the walls less the inside
    // corner radius on each side (Table B4.1b, b and h).
    let corner = r_out.max(t);
    let b = bo - 2.0 * corner;
    let h = ho - 2.0 * corner;
    if b <= 0.0 || h <= 0.0 {
        return Err(Missing::SteelRange);
    }
    let s = p.s_top.min(p.s_bot);
    let mp = fy * zx;
    let flange_class = Slenderness {
        ratio: "b/t",
        lambda: b / t,
        lambda_p: 1.12 * sq,
        lambda_r: 1.40 * sq,
        class: Class::of(b / t, 1.12 * sq, 1.40 * sq),
    };
    let web_class = Slenderness {
        ratio: "h/t",
        lambda: h / t,
        lambda_p: 2.42 * sq,
        lambda_r: 5.70 * sq,
        class: Class::of(h / t, 2.42 * sq, 5.70 * sq),
    };
    if web_class.class == Class::Slender {
        // Slender HSS webs (F7.3(c)) are not implemented.
        return Err(Missing::SteelRange);
    }
    let sense = |sag: bool| -> Flexure {
        let flange = match flange_class.class {
            Class::Compact => None,
            Class::Noncompact => Some(Nominal {
                mn: (mp - (mp - fy * s) * (3.57 * (b / t) / sq - 4.0)).min(mp),
                eq: "F7-2",
            }),
            Class::Slender => {
                // Effective width of the compression flange (F7-4) and the
                // elastic modulus of the section with the ineffective part
                // (b − b_e)·t removed at the flange's mid-thickness.
                let be = (1.92 * t * sq * (1.0 - 0.38 / (b / t) * sq)).min(b);
                let da = (b - be) * t;
                let yf = if sag { ho - t / 2.0 } else { t / 2.0 };
                let a2 = p.area - da;
                let y2 = (p.area * p.y_c - da * yf) / a2;
                let i2 = p.ix + p.area * (p.y_c - y2).powi(2)
                    - da * t * t / 12.0
                    - da * (yf - y2).powi(2);
                let se = i2 / y2.max(ho - y2);
                Some(Nominal {
                    mn: fy * se,
                    eq: "F7-3 with b_e by F7-4",
                })
            }
        };
        let web = match web_class.class {
            Class::Compact => None,
            _ => Some(Nominal {
                mn: (mp - (mp - fy * s) * (0.305 * (h / t) / sq - 0.738)).min(mp),
                eq: "F7-5",
            }),
        };
        let ry = (iy / p.area).sqrt();
        let sqja = (j * p.area).sqrt();
        let _ = sag;
        Flexure {
            provision: Provision::F7,
            yielding: Nominal { mn: mp, eq: "F7-1" },
            flange,
            web,
            tension_flange: None,
            ltb: Ltb::F7 {
                mp,
                mr: 0.7 * fy * s,
                lp: 0.13 * e * ry * sqja / mp,
                lr: 2.0 * e * ry * sqja / (0.7 * fy * s),
                ry,
                sqja,
            },
            flange_class: Some(flange_class),
            web_class: Some(web_class),
        }
    };
    // §G4: A_w = 2·h·t, k_v = 5, C_v2 by G2-9 to G2-11. h as above, but
    // G4 takes h = H − 3t where the corner radius is not known: with no
    // radius given (r_out = 0) that is used, which is conservative for a
    // truly sharp-cornered box too (its h is H − 2t).
    let kv = 5.0;
    let h = ho - 2.0 * r_out.max(1.5 * t);
    if h <= 0.0 {
        return Err(Missing::SteelRange);
    }
    let lam = h / t;
    let r = (kv * e / fy).sqrt();
    let (cv, eq) = if lam <= 1.10 * r {
        (1.0, "G4-1 with C_v2 = 1.0 (G2-9)")
    } else if lam <= 1.37 * r {
        (1.10 * r / lam, "G4-1 with C_v2 by G2-10")
    } else {
        (1.51 * kv * e / (lam * lam * fy), "G4-1 with C_v2 by G2-11")
    };
    let aw = 2.0 * h * t;
    // The section is symmetric about its mid-depth: both senses alike.
    let f = sense(true);
    Ok(Steel {
        flexure: [f, f],
        shear: Shear {
            vn: 0.6 * fy * aw * cv,
            omega: OMEGA_V,
            eq,
            cv,
            area: aw,
        },
    })
}

fn chs(p: &Properties, fy: f64, e: f64, d: f64, t: f64) -> Result<Steel, Missing> {
    let zx = p.zx.ok_or(Missing::SteelProperties)?;
    let dt = d / t;
    if dt >= 0.45 * e / fy {
        // Outside the scope of §F8.
        return Err(Missing::SteelRange);
    }
    let s = p.s_top.min(p.s_bot);
    let lp = 0.07 * e / fy;
    let lr = 0.31 * e / fy;
    let class = Class::of(dt, lp, lr);
    let flange = match class {
        Class::Compact => None,
        Class::Noncompact => Some(Nominal {
            mn: (0.021 * e / dt + fy) * s,
            eq: "F8-2",
        }),
        Class::Slender => Some(Nominal {
            mn: 0.33 * e / dt * s,
            eq: "F8-3 with F8-4",
        }),
    };
    let fl = Flexure {
        provision: Provision::F8,
        yielding: Nominal {
            mn: fy * zx,
            eq: "F8-1",
        },
        flange,
        web: None,
        tension_flange: None,
        ltb: Ltb::None,
        flange_class: Some(Slenderness {
            ratio: "D/t",
            lambda: dt,
            lambda_p: lp,
            lambda_r: lr,
            class,
        }),
        web_class: None,
    };
    // §G5 without the L_v term (conservative): F_cr = 0.78·E/(D/t)^1.5 ≤ 0.6·F_y.
    let fcr = (0.78 * e / dt.powf(1.5)).min(0.6 * fy);
    Ok(Steel {
        flexure: [fl, fl],
        shear: Shear {
            vn: fcr * p.area / 2.0,
            omega: OMEGA_V,
            eq: "G5-1 with F_cr by G5-2b, ≤ 0.6·F_y (the L_v term of G5-2a is not credited)",
            cv: 1.0,
            area: p.area / 2.0,
        },
    })
}

fn bar(p: &Properties, fy: f64, _e: f64, rect: Option<(f64, f64)>) -> Result<Steel, Missing> {
    let zx = p.zx.ok_or(Missing::SteelProperties)?;
    let sx = p.s_top.min(p.s_bot);
    let mp = (fy * zx).min(1.6 * fy * sx);
    let ltb = match rect {
        Some((b, d)) => Ltb::F11 {
            my: fy * sx,
            mp,
            d,
            t: b,
            fy,
            sx,
        },
        None => Ltb::None,
    };
    let fl = Flexure {
        provision: Provision::F11,
        yielding: Nominal {
            mn: mp,
            eq: "F11-1",
        },
        flange: None,
        web: None,
        tension_flange: None,
        ltb,
        flange_class: None,
        web_class: None,
    };
    // Elastic peak shear stress V·Q/(I·t) ≤ 0.6·F_y: V_n = 0.6·F_y·I·t/Q.
    let (q, t) = (
        p.q_na.ok_or(Missing::SteelProperties)?,
        p.t_na.ok_or(Missing::SteelProperties)?,
    );
    let area = p.ix * t / q;
    Ok(Steel {
        flexure: [fl, fl],
        shear: Shear {
            vn: 0.6 * fy * area,
            omega: OMEGA_V,
            eq: "peak V·Q/(I·t) ≤ 0.6·F_y/Ω_v (G2.1 shear yield applied at the elastic peak)",
            cv: 1.0,
            area,
        },
    })
}
