//! Lateral-torsional buckling and flange local buckling of doubly
//! symmetric I-shapes bent about the strong axis, by ANSI/AISC 360-16
//! *Specification for Structural Steel Buildings*, Chapter F, §F2
//! (compact web and flanges) and §F3 (compact web, noncompact or slender
//! flanges), allowable strength design with Ω_b = 1.67 (§F1).
//!
//! F2:  M_p = F_y·Z_x; L_p = 1.76·r_y·√(E/F_y) (F2-5);
//!      r_ts² = √(I_y·C_w)/S_x (F2-7), c = 1 (doubly symmetric);
//!      L_r = 1.95·r_ts·E/(0.7F_y)·√(J·c/(S_x·h_0) + √((J·c/(S_x·h_0))² + 6.76(0.7F_y/E)²)) (F2-6);
//!      L_b ≤ L_p: M_n = M_p;  L_p < L_b ≤ L_r: M_n = C_b[M_p − (M_p − 0.7F_y·S_x)(L_b − L_p)/(L_r − L_p)] ≤ M_p;
//!      L_b > L_r: M_n = F_cr·S_x ≤ M_p, F_cr = C_b·π²E/(L_b/r_ts)²·√(1 + 0.078·J·c/(S_x·h_0)·(L_b/r_ts)²).
//! F3:  λ = b_f/(2t_f), λ_pf = 0.38√(E/F_y), λ_rf = 1.0√(E/F_y) (Table B4.1b);
//!      noncompact: M_n = M_p − (M_p − 0.7F_y·S_x)(λ − λ_pf)/(λ_rf − λ_pf);
//!      slender: M_n = 0.9·E·k_c·S_x/λ², k_c = 4/√(h/t_w), 0.35 ≤ k_c ≤ 0.76.
//! Web compactness h/t_w ≤ 3.76√(E/F_y) (Table B4.1b case 15) is required;
//! noncompact webs (§F4, F5) are outside this implementation and reported
//! as not checked.
//! C_b = 12.5·M_max/(2.5·M_max + 3M_A + 4M_B + 3M_C) (F1-1); 1.0 for a
//! segment with a free end (§F1 user note).

use super::{Bracing, Material};
use crate::section::Properties;
use std::f64::consts::PI;

/// ASD safety factor for flexure, AISC 360-16 §F1.
pub const OMEGA_B: f64 = 1.67;

/// Moment gradient factor, AISC 360-16 eq. F1-1.
pub fn cb(mmax: f64, ma: f64, mb: f64, mc: f64) -> f64 {
    let den = 2.5 * mmax + 3.0 * ma + 4.0 * mb + 3.0 * mc;
    if den <= 0.0 { 1.0 } else { 12.5 * mmax / den }
}

/// Section and material constants for the F2/F3 capacity.
#[derive(Clone, Copy, Debug)]
pub struct Capacity {
    pub mp: f64,
    pub fy_sx_07: f64,
    pub lp: f64,
    pub lr: f64,
    pub rts: f64,
    pub jc_sxh0: f64,
    pub e: f64,
    pub sx: f64,
    /// Flange local buckling limit on M_n (M_p when compact).
    pub m_flb: f64,
}

impl Capacity {
    /// Why the method does not apply, if it does not.
    pub fn applicable(p: &Properties, m: &Material) -> Result<(), String> {
        let g = p
            .i_geometry
            .ok_or("the method implemented (AISC 360-16 F2/F3) covers I-shapes only")?;
        if (g.bf_top - g.bf_bot).abs() > 1e-9 * g.bf_top
            || (g.tf_top - g.tf_bot).abs() > 1e-9 * g.tf_top
        {
            return Err("mono-symmetric I-shapes (AISC 360-16 F4) are not implemented".into());
        }
        let fy =
            m.fy.ok_or("no yield stress Fy was given for the material")?;
        if p.iy.is_none() || p.j.is_none() || p.cw.is_none() || p.zx.is_none() {
            return Err("the section lacks Iy, J, Cw or Zx".into());
        }
        let h = g.hw - 2.0 * g.r;
        if h / g.tw > 3.76 * (m.e / fy).sqrt() {
            return Err(format!(
                "the web is noncompact (h/tw = {:.1} > 3.76√(E/Fy) = {:.1}); AISC 360-16 F4/F5 are not implemented",
                h / g.tw,
                3.76 * (m.e / fy).sqrt()
            ));
        }
        Ok(())
    }

    /// Constants for a section, or None when the method does not apply.
    pub fn new(p: &Properties, m: &Material, bracing: Bracing) -> Option<Capacity> {
        if bracing == Bracing::NotGiven || Self::applicable(p, m).is_err() {
            return None;
        }
        let g = p.i_geometry?;
        let fy = m.fy?;
        let (iy, j, cw, zx) = (p.iy?, p.j?, p.cw?, p.zx?);
        let e = m.e;
        let sx = p.s_top.min(p.s_bot);
        let mp = fy * zx;
        let ry = (iy / p.area).sqrt();
        let lp = 1.76 * ry * (e / fy).sqrt();
        let rts = ((iy * cw).sqrt() / sx).sqrt();
        let jc = j / (sx * g.h0);
        let lr = 1.95 * rts * e / (0.7 * fy)
            * (jc + (jc * jc + 6.76 * (0.7 * fy / e).powi(2)).sqrt()).sqrt();
        let lam = g.bf_top / (2.0 * g.tf_top);
        let lpf = 0.38 * (e / fy).sqrt();
        let lrf = (e / fy).sqrt();
        let m_flb = if lam <= lpf {
            mp
        } else if lam <= lrf {
            mp - (mp - 0.7 * fy * sx) * (lam - lpf) / (lrf - lpf)
        } else {
            let h = g.hw - 2.0 * g.r;
            let kc = (4.0 / (h / g.tw).sqrt()).clamp(0.35, 0.76);
            0.9 * e * kc * sx / (lam * lam)
        };
        Some(Capacity {
            mp,
            fy_sx_07: 0.7 * fy * sx,
            lp,
            lr,
            rts,
            jc_sxh0: jc,
            e,
            sx,
            m_flb,
        })
    }

    /// Nominal flexural strength M_n for an unbraced length and C_b.
    pub fn nominal(&self, lb: f64, cb: f64) -> f64 {
        let ltb = if lb <= self.lp {
            self.mp
        } else if lb <= self.lr {
            (cb * (self.mp - (self.mp - self.fy_sx_07) * (lb - self.lp) / (self.lr - self.lp)))
                .min(self.mp)
        } else {
            let s = lb / self.rts;
            let fcr = cb * PI * PI * self.e / (s * s) * (1.0 + 0.078 * self.jc_sxh0 * s * s).sqrt();
            (fcr * self.sx).min(self.mp)
        };
        ltb.min(self.m_flb)
    }

    /// Which provision gives M_n (for the written calculation).
    pub fn regime(&self, lb: f64, cb: f64) -> &'static str {
        let n = self.nominal(lb, cb);
        if (n - self.m_flb).abs() <= 1e-12 * n && self.m_flb < self.mp {
            "flange local buckling, AISC 360-16 F3"
        } else if lb <= self.lp {
            "plastic moment, L_b ≤ L_p: M_n = M_p (F2-1)"
        } else if (n - self.mp).abs() <= 1e-12 * n {
            "C_b·(F2-2 or F2-3) exceeds M_p, so M_n = M_p"
        } else if lb <= self.lr {
            "inelastic lateral-torsional buckling, L_p < L_b ≤ L_r (F2-2)"
        } else {
            "elastic lateral-torsional buckling, L_b > L_r (F2-3, F2-4)"
        }
    }

    /// Allowable moment M_n/Ω_b.
    pub fn allowable(&self, lb: f64, cb: f64) -> f64 {
        self.nominal(lb, cb) / OMEGA_B
    }
}
