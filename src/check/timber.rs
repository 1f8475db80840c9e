//! Timber members by allowable stress design, after the ANSI/AWC *National
//! Design Specification for Wood Construction* (NDS), 2018 edition,
//! quoted from memory: verify against the edition in force.
//!
//! * Adjusted design values (NDS Table 4.3.1 for sawn lumber; 5.3.1 for
//!   glulam uses the same factors here): F_b′ = F_b·C_D·C_M·C_t·C_L·C_F·
//!   C_fu·C_i·C_r; F_v′ = F_v·C_D·C_M·C_t·C_i; E′ = E·C_M·C_t·C_i;
//!   E_min′ = E_min·C_M·C_t·C_i. Factors not given are 1.0 and the output
//!   says which were applied.
//! * Load duration C_D (NDS Table 2.3.2), per combination from the shortest
//!   duration load in it: dead 0.9 (permanent), live 1.0 (ten years), snow
//!   1.15 (two months), roof live 1.25 (seven days), wind 1.6 (ten
//!   minutes); rain and "other" are taken as 1.0 and 0.9 (conservative:
//!   the table lists neither).
//! * Beam stability factor C_L (NDS 3.3.3): R_B = √(ℓ_e·d/b²) ≤ 50
//!   (3.3-5); F_bE = 1.20·E_min′/R_B²; C_L = (1 + F_bE/F_b*)/1.9 −
//!   √([(1 + F_bE/F_b*)/1.9]² − (F_bE/F_b*)/0.95) (3.3-6), F_b* = F_b
//!   with every factor except C_fu, C_V and C_L. C_L = 1 when d ≤ b
//!   (3.3.3.1) or where the compression edge is braced throughout.
//!   Effective length ℓ_e by NDS Table 3.3.3, the row for a single span or
//!   cantilever under any load: 2.06·ℓ_u (ℓ_u/d < 7), 1.63·ℓ_u + 3d
//!   (7 ≤ ℓ_u/d ≤ 14.3), 1.84·ℓ_u (ℓ_u/d > 14.3).
//! * Shear: f_v = 3V/(2bd) (3.4-2) against F_v′.

use crate::beam::model::Category;
use serde::{Deserialize, Serialize};

/// Adjustment factors and values a timber grade (or a catalogue row)
/// brings. `None`: not given (1.0, and the output says so).
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize, Deserialize)]
pub struct TimberFactors {
    /// Reference modulus for stability E_min, MPa (needed for C_L).
    pub e_min: Option<f64>,
    /// Upper bound on the load duration factor C_D: each combination uses
    /// the smaller of it and its Table 2.3.2 value (None: the table value).
    pub cd: Option<f64>,
    /// Wet service factors on F_b, F_v and E (and E_min).
    pub cm_fb: Option<f64>,
    pub cm_fv: Option<f64>,
    pub cm_e: Option<f64>,
    /// Temperature factor on F_b and F_v (and on E, E_min unless `ct_e`
    /// is given: NDS Table 2.3.3 gives E a factor at least as large, so
    /// using the strength factor for E is conservative).
    pub ct: Option<f64>,
    /// Incising factor on F_b and F_v (and on E, E_min unless `ci_e` is
    /// given; NDS Table 4.3.8: 0.80 on strengths, 0.95 on E and E_min).
    pub ci: Option<f64>,
    /// Temperature factor on E and E_min.
    #[serde(default)]
    pub ct_e: Option<f64>,
    /// Incising factor on E and E_min.
    #[serde(default)]
    pub ci_e: Option<f64>,
    /// Size factor on F_b.
    pub cf: Option<f64>,
    /// Repetitive member factor on F_b.
    pub cr: Option<f64>,
    /// Flat use factor on F_b.
    pub cfu: Option<f64>,
}

impl TimberFactors {
    fn f(v: Option<f64>) -> f64 {
        v.unwrap_or(1.0)
    }
    /// F_b multiplier except C_D, C_L and C_fu (towards F_b*).
    pub fn fb_star_factor(&self) -> f64 {
        Self::f(self.cm_fb)
            * Self::f(self.ct)
            * Self::f(self.cf)
            * Self::f(self.ci)
            * Self::f(self.cr)
    }
    /// F_b multiplier except C_D and C_L.
    pub fn fb_factor(&self) -> f64 {
        self.fb_star_factor() * Self::f(self.cfu)
    }
    pub fn fv_factor(&self) -> f64 {
        Self::f(self.cm_fv) * Self::f(self.ct) * Self::f(self.ci)
    }
    /// E and E_min multiplier: C_M, C_t and C_i for stiffness (the
    /// strength values of C_t and C_i when no stiffness value is given).
    pub fn e_factor(&self) -> f64 {
        Self::f(self.cm_e) * Self::f(self.ct_e.or(self.ct)) * Self::f(self.ci_e.or(self.ci))
    }
    /// Overlay the factors a catalogue row gives.
    pub fn with(mut self, o: &TimberFactors) -> TimberFactors {
        macro_rules! take {
            ($($f:ident),*) => { $( if o.$f.is_some() { self.$f = o.$f; } )* };
        }
        take!(
            e_min, cd, cm_fb, cm_fv, cm_e, ct, ci, ct_e, ci_e, cf, cr, cfu
        );
        self
    }
    /// The factors given, in words (for the output).
    pub fn applied(&self) -> Vec<String> {
        let mut v = Vec::new();
        let mut add = |name: &str, x: Option<f64>| {
            if let Some(x) = x {
                v.push(format!("{name} = {}", crate::units::fmt_num(x)));
            }
        };
        add("C_D ≤", self.cd);
        add("C_M (F_b)", self.cm_fb);
        add("C_M (F_v)", self.cm_fv);
        add("C_M (E)", self.cm_e);
        add("C_t (F_b, F_v)", self.ct);
        add("C_i (F_b, F_v)", self.ci);
        add("C_t (E)", self.ct_e.or(self.ct));
        add("C_i (E)", self.ci_e.or(self.ci));
        add("C_F", self.cf);
        add("C_r", self.cr);
        add("C_fu", self.cfu);
        v
    }
}

/// NDS Table 2.3.2 load duration factor of one load category.
pub fn duration_factor(c: Category) -> f64 {
    match c {
        Category::Dead | Category::Other => 0.9,
        Category::Live | Category::Rain => 1.0,
        Category::Snow => 1.15,
        Category::RoofLive => 1.25,
        Category::Wind => 1.6,
    }
}

/// C_D of a combination: the factor of its shortest-duration load (the
/// largest C_D among the categories present).
pub fn combination_cd(categories: impl Iterator<Item = Category>) -> f64 {
    categories.map(duration_factor).fold(0.9, f64::max)
}

/// Effective length ℓ_e (NDS Table 3.3.3, single span or cantilever, any
/// load) for an unbraced length ℓ_u and depth d.
pub fn effective_length(lu: f64, d: f64) -> f64 {
    let r = lu / d;
    if r < 7.0 {
        2.06 * lu
    } else if r <= 14.3 {
        1.63 * lu + 3.0 * d
    } else {
        1.84 * lu
    }
}

/// The beam stability factor and its working.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Stability {
    pub le: f64,
    pub rb: f64,
    pub fbe: f64,
    pub fb_star: f64,
    pub cl: f64,
}

/// C_L for a rectangle b × d over an unbraced length `lu`, with F_b*
/// and E_min′ adjusted. None when R_B > 50 (NDS 3.3.3.7: outside the
/// method).
pub fn stability(lu: f64, b: f64, d: f64, fb_star: f64, e_min_adj: f64) -> Option<Stability> {
    if d <= b {
        return Some(Stability {
            le: 0.0,
            rb: 0.0,
            fbe: f64::INFINITY,
            fb_star,
            cl: 1.0,
        });
    }
    let le = effective_length(lu, d);
    let rb = (le * d / (b * b)).sqrt();
    if rb > 50.0 {
        return None;
    }
    let fbe = 1.20 * e_min_adj / (rb * rb);
    let x = fbe / fb_star;
    let a = (1.0 + x) / 1.9;
    let cl = a - (a * a - x / 0.95).sqrt();
    Some(Stability {
        le,
        rb,
        fbe,
        fb_star,
        cl: cl.min(1.0),
    })
}
