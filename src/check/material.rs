//! The material: its kind, allowable stresses, yield stress, modulus and
//! density, and their validation.

use super::timber::TimberFactors;
use crate::error::{Error, Result};
use serde::{Deserialize, Serialize};

/// What the material is, which decides the methods of stability and local
/// buckling that apply.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum MaterialKind {
    /// Structural steel: AISC 360-16 Chapters F and G (needs F_y).
    Steel,
    /// Timber: NDS adjustment factors, beam stability C_L (needs E_min).
    Timber,
    /// Not stated: bending, shear and deflection by the allowables given;
    /// no stability or local buckling method (not verified unless excluded
    /// or not applicable).
    #[default]
    Unspecified,
}

impl MaterialKind {
    pub fn name(self) -> &'static str {
        match self {
            MaterialKind::Steel => "steel",
            MaterialKind::Timber => "timber",
            MaterialKind::Unspecified => "unspecified",
        }
    }
}

/// Material: stiffness, allowable stresses, density.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Material {
    pub name: String,
    pub kind: MaterialKind,
    /// Modulus of elasticity E, MPa.
    pub e: f64,
    /// Allowable bending stress at a fibre in tension, MPa (timber: the
    /// reference design value F_b). None: no allowable-stress check (steel
    /// then uses AISC 360-16 Chapter F).
    pub fb_tension: Option<f64>,
    /// Allowable bending stress at a fibre in compression, MPa.
    pub fb_compression: Option<f64>,
    /// Allowable shear stress, MPa (timber: reference F_v).
    pub fv: Option<f64>,
    /// Yield stress, MPa (steel).
    pub fy: Option<f64>,
    /// Density, kg/m³.
    pub density: f64,
    /// Timber values and adjustment factors (ignored for other kinds).
    #[serde(default)]
    pub timber: TimberFactors,
}

/// The highest yield stress accepted (MPa): ASTM A514, 100 ksi, the
/// strongest steel in AISC 360-16 Table A3.1 (from memory).
pub const FY_MAX: f64 = 690.0;

impl Material {
    /// A material with allowable stresses only (kind unspecified).
    pub fn allowable(name: &str, e: f64, fb: f64, fv: Option<f64>, density: f64) -> Material {
        Material {
            name: name.into(),
            kind: MaterialKind::Unspecified,
            e,
            fb_tension: Some(fb),
            fb_compression: Some(fb),
            fv,
            fy: None,
            density,
            timber: TimberFactors::default(),
        }
    }

    /// Check the values (problems in SI).
    pub fn validate(&self) -> Result<()> {
        self.validate_in(crate::units::System::Si)
    }

    /// [`Material::validate`] with the values in the problems in the units
    /// of `sys` (the system they were typed in); the ranges stay stated
    /// in SI, as they are defined.
    pub fn validate_in(&self, sys: crate::units::System) -> Result<()> {
        self.validate_strengths(sys)?;
        self.validate_timber_values(sys)?;
        if !(self.density == 0.0 || (100.0..=25_000.0).contains(&self.density)) {
            return Err(Error::msg(format!(
                "density = {}: expected 0 (no self-weight) or 100 to 25,000 kg/m³; check its unit",
                crate::units::Show::Density.fmt(self.density, sys)
            ))
            .in_field("material.density"));
        }
        if self.fb_tension.is_none() != self.fb_compression.is_none() {
            return Err(Error::msg("give Fb, or both Fbt and Fbc").in_field("material.Fb"));
        }
        // Values only one kind's methods use are refused for the others,
        // never carried and ignored.
        if self.fy.is_some() && self.kind != MaterialKind::Steel {
            return Err(Error::msg(format!(
                "Fy is used only by the steel limit states (AISC 360-16), but the material '{}' is {}: give kind = \"steel\", or leave Fy out",
                self.name,
                self.kind.name()
            ))
            .in_field("material.Fy"));
        }
        if self.timber != TimberFactors::default() && self.kind != MaterialKind::Timber {
            return Err(Error::msg(format!(
                "Emin and the adjustment factors are used only by the timber checks (NDS), but the material '{}' is {}: give kind = \"timber\", or leave them out",
                self.name,
                self.kind.name()
            ))
            .in_field("material.kind"));
        }
        Ok(())
    }

    /// E and the strengths: positive, in physical ranges, Fy within the
    /// steels AISC 360-16 lists.
    fn validate_strengths(&self, sys: crate::units::System) -> Result<()> {
        let stress = |v: f64| crate::units::Show::Stress.fmt(v, sys);
        let modulus = |v: f64| crate::units::Show::Modulus.fmt(v, sys);
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
        for (name, v) in [
            ("Fb (tension)", self.fb_tension),
            ("Fb (compression)", self.fb_compression),
            ("Fv", self.fv),
            ("Fy", self.fy),
            ("Emin", self.timber.e_min),
        ] {
            if let Some(v) = v {
                pos(name, v)?;
            }
        }
        // Physical ranges, wide enough for every structural material and
        // narrow enough to catch a wrong unit: E from 1 GPa to 1000 GPa;
        // each allowable or yield stress at most 2 % of E (a strain no
        // structural material reaches elastically); density zero (no
        // self-weight) or 100 to 25,000 kg/m³.
        if !(1e3..=1e6).contains(&self.e) {
            return Err(Error::msg(format!(
                "E = {} is outside 1 GPa to 1000 GPa: check its unit",
                modulus(self.e)
            ))
            .in_field("material.E"));
        }
        for (name, v) in [
            ("Fb", self.fb_tension),
            ("Fb", self.fb_compression),
            ("Fv", self.fv),
            ("Fy", self.fy),
        ] {
            if let Some(v) = v
                && v > 0.02 * self.e
            {
                return Err(Error::msg(format!(
                    "{name} = {} is more than 2 % of E = {}, which no structural material reaches: check the units",
                    stress(v),
                    modulus(self.e)
                ))
                .in_field(&format!("material.{name}")));
            }
        }
        if let Some(fy) = self.fy
            && fy > FY_MAX
        {
            return Err(Error::msg(format!(
                "Fy = {} is above the structural steels AISC 360-16 lists (Table A3.1, up to {}, from memory): its limit states are not stated for it",
                stress(fy),
                stress(FY_MAX)
            ))
            .in_field("material.Fy"));
        }
        Ok(())
    }

    /// E_min and the NDS adjustment factors, in their ranges.
    fn validate_timber_values(&self, sys: crate::units::System) -> Result<()> {
        let modulus = |v: f64| crate::units::Show::Modulus.fmt(v, sys);
        let t = &self.timber;
        if let Some(em) = t.e_min
            && em > self.e
        {
            return Err(Error::msg(format!(
                "Emin = {} exceeds E = {}: the modulus for stability is a lower fractile of E (NDS Appendix D), never above it",
                modulus(em),
                modulus(self.e)
            ))
            .in_field("material.Emin"));
        }
        // Ranges of the NDS 2018 factors (from memory): C_D up to 2.0 for
        // impact (Table 2.3.2); C_M, C_t and C_i only reduce (Tables 4A
        // notes, 2.3.3, 4.3.8); C_F up to 1.5 (Table 4A); C_r up to 1.15
        // (4.3.9); C_fu up to 1.2 (Table 4A).
        for (name, v, max) in [
            ("CD", t.cd, 2.0),
            ("CM_Fb", t.cm_fb, 1.0),
            ("CM_Fv", t.cm_fv, 1.0),
            ("CM_E", t.cm_e, 1.0),
            ("Ct", t.ct, 1.0),
            ("Ci", t.ci, 1.0),
            ("Ct_E", t.ct_e, 1.0),
            ("Ci_E", t.ci_e, 1.0),
            ("CF", t.cf, 1.5),
            ("Cr", t.cr, 1.15),
            ("Cfu", t.cfu, 1.2),
        ] {
            if let Some(v) = v
                && !(v.is_finite() && v > 0.0 && v <= max)
            {
                return Err(Error::msg(format!(
                    "adjustment factor {name} = {} is outside 0 < {name} ≤ {} (NDS 2018, from memory)",
                    crate::units::fmt_num(v),
                    crate::units::fmt_num(max)
                ))
                .in_field(&format!("material.{name}")));
            }
        }
        Ok(())
    }

    /// The modulus used for stiffness: E′ = E·C_M·C_t·C_i for timber.
    #[inline]
    pub fn e_eff(&self) -> f64 {
        match self.kind {
            MaterialKind::Timber => self.e * self.timber.e_factor(),
            _ => self.e,
        }
    }
}
