//! Checks of one section against a prepared demand, and the verdict.
//!
//! Every check line is demand against capacity at a stated place and
//! combination:
//!
//! * Bending stress at the top and bottom fibres, sagging and hogging:
//!   f = M·c/I = M/S (flexure formula) against the allowable bending
//!   stress F_b the user gives (for timber, the adjusted F_b′ of [`timber`]).
//! * Shear stress: the average web shear V/(d·t_w) for I-shapes, otherwise
//!   the peak V·Q/(I·t) (Jourawski), against the allowable F_v.
//! * Steel (material kind `steel` with F_y): the flexural and shear limit
//!   states of AISC 360-16 Chapters F and G, see [`steel`].
//! * Lateral stability of every unbraced segment: lateral-torsional
//!   buckling (steel) or the beam stability factor C_L (timber).
//! * Deflection: δ = y/(E·I) against L/n and/or an absolute limit per span,
//!   measured from the chord of the span's (displaced) supports; an
//!   overhang's L is `cantilever_factor` × its length (2 by common
//!   practice).
//!
//! The verdict (see [`Verdict`]): a section passes only when every limit
//! state that applies to it was evaluated by a stated method and passed.
//! A limit state that applies but cannot be evaluated (a missing input, a
//! shape outside a method's range, no method for the material) leaves a
//! [`Gap`] and the verdict is *not verified* — never a pass. A limit state
//! the user excludes explicitly ([`Exclusions`]) is not evaluated and is
//! listed as excluded on every output.
//!
//! Bracing: supports restrain the member laterally and against twist;
//! brace points restrain the top flange only unless `braced_flange` is
//! `both`; so under hogging (bottom flange in compression) a top-flange
//! brace does not end an unbraced length. The per-section path allocates
//! nothing: it scales and adds the demand's polynomials.

pub mod steel;
pub mod timber;
pub mod working;

use crate::beam::model::{Category, ComboKind};
use crate::beam::{Beam, Demand, Quantity};
use crate::error::{Error, Result};
use crate::section::{Form, Properties};
use crate::units::G;
use serde::{Deserialize, Serialize};
pub use timber::TimberFactors;

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

    pub fn validate(&self) -> Result<()> {
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
                "E = {} MPa is outside 1 GPa to 1000 GPa: check its unit",
                crate::units::fmt_num(self.e)
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
                    "{name} = {} MPa is more than 2 % of E = {} MPa, which no structural material reaches: check the units",
                    crate::units::fmt_num(v),
                    crate::units::fmt_num(self.e)
                ))
                .in_field(&format!("material.{name}")));
            }
        }
        if let Some(fy) = self.fy
            && fy > FY_MAX
        {
            return Err(Error::msg(format!(
                "Fy = {} MPa is above the structural steels AISC 360-16 lists (Table A3.1, up to {} MPa, from memory): its limit states are not stated for it",
                crate::units::fmt_num(fy),
                crate::units::fmt_num(FY_MAX)
            ))
            .in_field("material.Fy"));
        }
        let t = &self.timber;
        if let Some(em) = t.e_min
            && em > self.e
        {
            return Err(Error::msg(format!(
                "Emin = {} MPa exceeds E = {} MPa: the modulus for stability is a lower fractile of E (NDS Appendix D), never above it",
                crate::units::fmt_num(em),
                crate::units::fmt_num(self.e)
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
        if !(self.density == 0.0 || (100.0..=25_000.0).contains(&self.density)) {
            return Err(Error::msg(format!(
                "density = {} kg/m³: expected 0 (no self-weight) or 100 to 25,000 kg/m³; check its unit",
                crate::units::fmt_num(self.density)
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

    /// The modulus used for stiffness: E′ = E·C_M·C_t·C_i for timber.
    #[inline]
    pub fn e_eff(&self) -> f64 {
        match self.kind {
            MaterialKind::Timber => self.e * self.timber.e_factor(),
            _ => self.e,
        }
    }
}

/// Lateral bracing of the member between supports.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Bracing {
    /// Not given: read conservatively as braced at the supports only (the
    /// output says so).
    NotGiven,
    /// Continuously braced (a deck or boarding fixed to the braced flange).
    Continuous,
    /// Braced at the supports and at this spacing along each span (mm).
    Spacing(f64),
    /// Braced at the supports only.
    Supports,
}

/// Which flange the braces restrain.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BracedFlange {
    /// The top flange only (joists or a deck on top): under hogging the
    /// bottom flange is unbraced between supports.
    #[default]
    Top,
    /// Both flanges (or twist) at every brace point.
    Both,
}

/// Where the loads act, for lateral stability.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LoadHeight {
    /// At the shear centre, as AISC 360-16 F2–F5 assume (not destabilising).
    #[default]
    ShearCentre,
    /// On the top flange, free to move sideways with it (destabilising):
    /// longer effective lengths.
    TopFlange,
}

/// How shear is checked against F_v.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
#[serde(rename_all = "snake_case")]
pub enum ShearMethod {
    /// Average web shear for I-shapes, V·Q/(I·t) otherwise.
    #[default]
    Auto,
    /// V·Q/(I·t) at the neutral axis for every shape.
    PeakVq,
}

/// Limit states the user excluded explicitly ("by others").
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
pub struct Exclusions {
    pub shear: bool,
    pub deflection: bool,
    pub lateral_torsional_buckling: bool,
    pub local_buckling: bool,
}

impl Exclusions {
    /// The names accepted in `exclude = [...]` and `--exclude`.
    pub const NAMES: &'static str =
        "shear, deflection, lateral_torsional_buckling (or lateral_stability), local_buckling";

    /// Add one limit state by name.
    pub fn add(&mut self, name: &str) -> Result<()> {
        match name
            .trim()
            .to_ascii_lowercase()
            .replace(['-', ' '], "_")
            .as_str()
        {
            "shear" => self.shear = true,
            "deflection" => self.deflection = true,
            "lateral_torsional_buckling" | "lateral_stability" | "ltb" | "stability" => {
                self.lateral_torsional_buckling = true
            }
            "local_buckling" => self.local_buckling = true,
            "bending" => {
                return Err(Error::msg(
                    "bending cannot be excluded: it is the check beamsift exists for",
                ));
            }
            other => {
                return Err(Error::msg(format!(
                    "unknown limit state '{other}' to exclude: expected {}",
                    Self::NAMES
                )));
            }
        }
        Ok(())
    }

    /// The excluded limit states in words.
    pub fn list(&self) -> Vec<String> {
        let mut v = Vec::new();
        if self.shear {
            v.push("shear (excluded by the user)".to_string());
        }
        if self.deflection {
            v.push("deflection (excluded by the user)".to_string());
        }
        if self.lateral_torsional_buckling {
            v.push(
                "lateral-torsional buckling / lateral stability (excluded by the user)".to_string(),
            );
        }
        if self.local_buckling {
            v.push("local buckling of flanges, webs and walls (excluded by the user)".to_string());
        }
        v
    }
}

/// Long-term deflection: service combinations with a dead case have their
/// permanent loads (dead, other, and a sustained fraction of live)
/// multiplied by the creep factor K_cr (NDS 3.5.2: Δ_T = K_cr·Δ_LT + Δ_ST).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct LongTerm {
    pub creep_factor: f64,
    /// Fraction of live loads that is sustained (0 to 1).
    pub sustained_live: f64,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Criteria {
    pub bracing: Bracing,
    pub braced_flange: BracedFlange,
    pub load_height: LoadHeight,
    /// Effective-length factor for an overhang's segment with a free tip
    /// (None: 1.0, or 2.5 for top-flange loads).
    pub overhang_k: Option<f64>,
    pub shear: ShearMethod,
    /// Add the section's self-weight to its case.
    pub self_weight: bool,
    pub exclude: Exclusions,
    pub long_term: Option<LongTerm>,
}

impl Default for Criteria {
    fn default() -> Self {
        Criteria {
            bracing: Bracing::NotGiven,
            braced_flange: BracedFlange::Top,
            load_height: LoadHeight::ShearCentre,
            overhang_k: None,
            shear: ShearMethod::Auto,
            self_weight: true,
            exclude: Exclusions::default(),
            long_term: None,
        }
    }
}

impl Criteria {
    /// Effective-length factor of an overhang's free-tip segment: from
    /// memory of BS 5950-1:2000 Table 14 (support continuous with lateral
    /// and torsional restraint, tip free): 1.0 for normal loads, 2.5 for
    /// destabilising ones.
    pub fn overhang_factor(&self) -> f64 {
        self.overhang_k.unwrap_or(match self.load_height {
            LoadHeight::ShearCentre => 1.0,
            LoadHeight::TopFlange => 2.5,
        })
    }
    /// Refuse the options that have no method for this material: timber
    /// beam stability uses the effective lengths of NDS Table 3.3.3 (the
    /// "any load" row, conservative for every load position), so the
    /// steel load-height and overhang effective-length options would be
    /// ignored there.
    pub fn fit(&self, kind: MaterialKind, what: &str) -> Result<()> {
        if kind != MaterialKind::Timber {
            return Ok(());
        }
        if self.load_height == LoadHeight::TopFlange {
            return Err(Error::msg(format!(
                "load_height = \"top_flange\" applies to steel members; {what} is timber, whose beam stability factor uses the effective lengths of NDS Table 3.3.3 (any load, conservative for loads on the compression edge): leave load_height out"
            )));
        }
        if self.overhang_k.is_some() {
            return Err(Error::msg(format!(
                "overhang_effective_length applies to steel members; {what} is timber, whose cantilever effective length comes from NDS Table 3.3.3: leave it out"
            )));
        }
        Ok(())
    }

    /// Effective-length factor of a free end's segment whose other end is a
    /// brace on the top flange only (no support there): from memory of
    /// BS 5950-1:2000 Table 14, "continuous, with lateral restraint to top
    /// flange", tip free: 3.0 for normal loads, 7.5 for destabilising ones.
    pub fn brace_rooted_factor(&self) -> f64 {
        match self.load_height {
            LoadHeight::ShearCentre => 3.0,
            LoadHeight::TopFlange => 7.5,
        }
    }

    /// Effective-length factor of a segment between restraints: 1.0, or
    /// 1.2 for destabilising loads (from memory of BS 5950-1:2000 Table 13,
    /// ends free to rotate on plan; AISC 360-16 has no such factor).
    pub fn span_factor(&self) -> f64 {
        match self.load_height {
            LoadHeight::ShearCentre => 1.0,
            LoadHeight::TopFlange => 1.2,
        }
    }
}

/// Which way the member bends at a check.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Sense {
    /// Positive moment: top flange (fibre) in compression.
    Sagging,
    /// Negative moment: bottom flange in compression.
    Hogging,
    /// Not a flexural check.
    None,
}

impl Sense {
    fn index(self) -> usize {
        match self {
            Sense::Hogging => 1,
            _ => 0,
        }
    }
    pub fn name(self) -> &'static str {
        match self {
            Sense::Sagging => "sagging",
            Sense::Hogging => "hogging",
            Sense::None => "",
        }
    }
}

/// What a check line is about.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum CheckKind {
    /// Sagging moment, top fibre in compression, against F_b.
    BendingSaggingTop,
    /// Sagging moment, bottom fibre in tension, against F_b.
    BendingSaggingBottom,
    /// Hogging moment, top fibre in tension, against F_b.
    BendingHoggingTop,
    /// Hogging moment, bottom fibre in compression, against F_b.
    BendingHoggingBottom,
    /// Shear stress against F_v.
    Shear,
    /// Steel: flexural yielding (or compression-flange yielding).
    Yielding,
    /// Steel: compression-flange (or wall) local buckling.
    FlangeLocalBuckling,
    /// Steel: web local buckling of a rectangular HSS.
    WebLocalBuckling,
    /// Steel: tension-flange yielding of a singly symmetric I.
    TensionFlangeYielding,
    /// Lateral-torsional buckling (steel) or lateral stability C_L
    /// (timber) of an unbraced segment.
    LateralTorsional,
    /// Steel: shear strength by AISC 360-16 Chapter G.
    WebShear,
    Deflection,
}

/// Limit-state groups, for the optimiser's constraints and exclusions.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Group {
    Bending,
    Shear,
    LocalBuckling,
    LateralTorsional,
    Deflection,
}

impl CheckKind {
    pub fn label(self) -> &'static str {
        match self {
            CheckKind::BendingSaggingTop => "bending, sagging, top fibre (compression)",
            CheckKind::BendingSaggingBottom => "bending, sagging, bottom fibre (tension)",
            CheckKind::BendingHoggingTop => "bending, hogging, top fibre (tension)",
            CheckKind::BendingHoggingBottom => "bending, hogging, bottom fibre (compression)",
            CheckKind::Shear => "shear stress",
            CheckKind::Yielding => "flexural yielding",
            CheckKind::FlangeLocalBuckling => "compression flange local buckling",
            CheckKind::WebLocalBuckling => "web local buckling",
            CheckKind::TensionFlangeYielding => "tension flange yielding",
            CheckKind::LateralTorsional => "lateral-torsional buckling",
            CheckKind::WebShear => "shear strength",
            CheckKind::Deflection => "deflection",
        }
    }
    pub fn short(self) -> &'static str {
        match self {
            CheckKind::BendingSaggingTop => "bending +M top (C)",
            CheckKind::BendingSaggingBottom => "bending +M bottom (T)",
            CheckKind::BendingHoggingTop => "bending −M top (T)",
            CheckKind::BendingHoggingBottom => "bending −M bottom (C)",
            CheckKind::Shear => "shear stress",
            CheckKind::Yielding => "yielding",
            CheckKind::FlangeLocalBuckling => "flange local buckling",
            CheckKind::WebLocalBuckling => "web local buckling",
            CheckKind::TensionFlangeYielding => "tension flange yielding",
            CheckKind::LateralTorsional => "lateral-torsional buckling",
            CheckKind::WebShear => "shear strength",
            CheckKind::Deflection => "deflection",
        }
    }
    pub fn group(self) -> Group {
        match self {
            CheckKind::Shear | CheckKind::WebShear => Group::Shear,
            CheckKind::FlangeLocalBuckling | CheckKind::WebLocalBuckling => Group::LocalBuckling,
            CheckKind::LateralTorsional => Group::LateralTorsional,
            CheckKind::Deflection => Group::Deflection,
            _ => Group::Bending,
        }
    }
    /// Is the demand a moment (N·mm), a stress (MPa), a force or a
    /// deflection (mm)?
    pub fn demand_is_moment(self) -> bool {
        matches!(
            self,
            CheckKind::Yielding
                | CheckKind::FlangeLocalBuckling
                | CheckKind::WebLocalBuckling
                | CheckKind::TensionFlangeYielding
                | CheckKind::LateralTorsional
        )
    }
}

/// One check line: demand against capacity.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Item {
    pub kind: CheckKind,
    /// Index of the combination in the beam's list.
    pub combo: usize,
    /// Stretch (span/overhang) index for deflection, segment index for
    /// lateral stability.
    pub part: usize,
    pub sense: Sense,
    /// Position along the beam, mm.
    pub x: f64,
    /// Action at x: moment (N·mm), shear (N) or deflection (mm).
    pub action: f64,
    /// Demand: stress (MPa), moment (N·mm), force (N) or deflection (mm).
    pub demand: f64,
    /// Capacity in the same unit as the demand (allowable: nominal/Ω).
    pub capacity: f64,
    pub utilisation: f64,
    /// Lateral stability: [effective length mm, C_b (steel) or C_L
    /// (timber)]; timber bending and shear: [C_D, 0].
    pub aux: [f64; 2],
}

/// A limit state that applies but could not be evaluated.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Gap {
    /// Bending: no allowable F_b and no method from the material.
    NoBendingMethod,
    /// Shear: no allowable F_v and no method from the material.
    NoShearMethod,
    /// Shear: the section's Q and t (or its web) are not known.
    ShearProperties,
    /// No serviceability combination: deflection not evaluated.
    NoDeflectionLimit,
    /// Steel without F_y: AISC 360-16 limit states cannot be evaluated.
    NoYieldStress,
    /// Steel: a table row lacks I_y, J, C_w or Z_x.
    SteelProperties,
    /// Steel: outside the range of the method (F13.2, F8, F7.3(c)).
    SteelRange,
    /// The shape is not known (table values only).
    ShapeUnknown,
    /// Lateral stability applies, but there is no method for this
    /// material (kind not stated) or shape.
    NoStabilityMethod,
    /// Local buckling applies, but there is no method for this material.
    NoLocalBucklingMethod,
    /// Timber stability needs E_min.
    NoEmin,
    /// Timber stability outside NDS 3.3.3 (R_B > 50).
    TimberSlenderness,
    /// Timber stability is implemented for rectangles only.
    TimberShape,
    /// No support or brace restrains the member laterally (springs and
    /// free ends do not).
    NoLateralRestraint,
}

impl Gap {
    const ALL: [Gap; 14] = [
        Gap::NoBendingMethod,
        Gap::NoShearMethod,
        Gap::ShearProperties,
        Gap::NoDeflectionLimit,
        Gap::NoYieldStress,
        Gap::SteelProperties,
        Gap::SteelRange,
        Gap::ShapeUnknown,
        Gap::NoStabilityMethod,
        Gap::NoLocalBucklingMethod,
        Gap::NoEmin,
        Gap::TimberSlenderness,
        Gap::TimberShape,
        Gap::NoLateralRestraint,
    ];
    fn bit(self) -> u16 {
        1 << (self as u16)
    }
    /// The reason in words.
    pub fn describe(self) -> &'static str {
        match self {
            Gap::NoBendingMethod => {
                "bending: no allowable bending stress Fb was given, and the material has no method of its own (steel with Fy uses AISC 360-16 Chapter F)"
            }
            Gap::NoShearMethod => {
                "shear: no allowable shear stress Fv was given, and the material has no method of its own (steel with Fy uses AISC 360-16 Chapter G)"
            }
            Gap::ShearProperties => {
                "shear: the section's first moment Q and width t at the neutral axis (or its web) are not known (table values)"
            }
            Gap::NoDeflectionLimit => {
                "deflection: the job has no serviceability combination with a limit (add one, a service preset, or exclude deflection)"
            }
            Gap::NoYieldStress => {
                "the steel limit states of AISC 360-16 (flexural yielding, local and lateral-torsional buckling, shear): no yield stress Fy was given"
            }
            Gap::SteelProperties => {
                "the steel limit states of AISC 360-16: the catalogue row lacks Iy, J, Cw or Zx"
            }
            Gap::SteelRange => {
                "the steel limit states of AISC 360-16: the section is outside the range of the method (F13.2 proportioning limits, F8 D/t < 0.45E/Fy, or a slender HSS web)"
            }
            Gap::ShapeUnknown => {
                "lateral-torsional and local buckling: the section's shape is not known (table values only)"
            }
            Gap::NoStabilityMethod => {
                "lateral stability of the unbraced compression flange: no method for this material (state kind = \"steel\" or \"timber\") or shape"
            }
            Gap::NoLocalBucklingMethod => {
                "local buckling of flanges, webs or walls: no method for this material (state kind = \"steel\", or exclude local_buckling)"
            }
            Gap::NoEmin => "timber lateral stability (NDS 3.3.3): no Emin was given",
            Gap::TimberSlenderness => {
                "timber lateral stability: the slenderness ratio R_B exceeds 50 (NDS 3.3.3.7)"
            }
            Gap::TimberShape => {
                "timber lateral stability (NDS 3.3.3) is implemented for rectangular sections only"
            }
            Gap::NoLateralRestraint => {
                "lateral stability: no support or brace restrains the member laterally (spring supports and free ends do not)"
            }
        }
    }
}

/// A set of gaps.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
pub struct Gaps(u16);

impl Gaps {
    #[inline]
    pub fn add(&mut self, g: Gap) {
        self.0 |= g.bit();
    }
    pub fn is_empty(&self) -> bool {
        self.0 == 0
    }
    pub fn contains(&self, g: Gap) -> bool {
        self.0 & g.bit() != 0
    }
    pub fn iter(&self) -> impl Iterator<Item = Gap> + '_ {
        Gap::ALL.into_iter().filter(|g| self.contains(*g))
    }
    /// The reasons in words.
    pub fn describe(&self) -> Vec<String> {
        self.iter().map(|g| g.describe().to_string()).collect()
    }
}

/// The three verdicts.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    /// Every applicable limit state evaluated and within its capacity.
    Passes,
    /// Some evaluated limit state exceeds its capacity.
    Fails,
    /// Nothing evaluated fails, but a limit state that applies could not be
    /// evaluated: not a pass.
    NotVerified,
}

impl Verdict {
    pub fn word(self) -> &'static str {
        match self {
            Verdict::Passes => "PASSES",
            Verdict::Fails => "FAILS",
            Verdict::NotVerified => "NOT VERIFIED",
        }
    }
}

/// The outcome for one section.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Summary {
    /// Largest utilisation of the evaluated checks.
    pub utilisation: f64,
    pub governing: Option<Item>,
    pub verdict: Verdict,
    pub gaps: Gaps,
    /// verdict == Passes.
    pub passes: bool,
}

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

/// An unbraced segment for lateral stability.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Segment {
    pub x1: f64,
    pub x2: f64,
    /// Mesh nodes at x1, the quarter points and x2.
    pub nodes: [usize; 5],
    /// Elements inside the segment.
    pub elems: (usize, usize),
    /// One end is a free (cantilever) tip: C_b = 1 (AISC 360-16 F1).
    pub free_end: bool,
    /// C_b is taken as 1.0: a free tip, or the bottom flange under hogging
    /// between supports with only the top flange braced (conservative:
    /// eq. F1-1 assumes both flanges restrained at the segment's ends and
    /// says nothing of the restraint the top-flange braces give).
    pub cb_unity: bool,
    /// Checked under sagging (top flange unbraced here) / hogging.
    pub sagging: bool,
    pub hogging: bool,
    /// Effective-length factor on x2 − x1.
    pub k: f64,
    /// Neither end is restrained laterally (no rigid support, no brace):
    /// lateral stability cannot be assessed.
    pub unrestrained: bool,
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
    stretch_elems: Vec<(usize, usize)>,
    strength: Vec<usize>,
    service: Vec<usize>,
}

/// Lateral restraint segments: (x1, x2, free end, sagging, hogging, k,
/// unrestrained at both ends).
type RawSegment = (f64, f64, bool, bool, bool, f64, bool);

/// The pieces of the beam between lateral restraints: rigid supports
/// (pinned, roller, fixed) restrain the member laterally and against
/// twist; a spring support does not (it may be another flexible member:
/// conservative), nor does a free end. (x1, x2, left end free, right end
/// free).
fn lateral_pieces(beam: &Beam) -> Vec<(f64, f64, bool, bool)> {
    use crate::beam::Support;
    let xs = beam.node_x();
    let rigid: Vec<f64> = beam
        .supports
        .iter()
        .zip(&xs)
        .filter(|(s, _)| matches!(s, Support::Pinned | Support::Roller | Support::Fixed))
        .map(|(_, x)| *x)
        .collect();
    let length = beam.length();
    let mut out = Vec::new();
    match (rigid.first(), rigid.last()) {
        (Some(&first), Some(&last)) => {
            if first > 0.0 {
                out.push((0.0, first, true, false));
            }
            for w in rigid.windows(2) {
                out.push((w[0], w[1], false, false));
            }
            if last < length {
                out.push((last, length, false, true));
            }
        }
        _ => out.push((0.0, length, true, true)),
    }
    out
}

fn segments_of(beam: &Beam, c: &Criteria) -> Vec<RawSegment> {
    let mut out = Vec::new();
    let both = c.braced_flange == BracedFlange::Both;
    for (x1, x2, free_l, free_r) in lateral_pieces(beam) {
        let len = x2 - x1;
        let from_right = free_l && !free_r;
        // A free end's segment rooted at a brace rather than at a support:
        // a brace on the top flange alone gives no torsional restraint.
        let k_of = |free: bool, brace_root: bool| {
            if free && brace_root && !both {
                c.brace_rooted_factor()
            } else if free {
                c.overhang_factor()
            } else {
                c.span_factor()
            }
        };
        // Split the piece at `spacing` from its restrained end.
        let mut split = |spacing: f64, sag: bool, hog: bool, braces: bool| {
            let n = (len / spacing - 1e-9).ceil().max(1.0) as usize;
            for k in 0..n {
                let (a, b) = if from_right {
                    let b = x2 - k as f64 * spacing;
                    ((b - spacing).max(x1), b)
                } else {
                    let a = x1 + k as f64 * spacing;
                    (a, (a + spacing).min(x2))
                };
                let at_left = if from_right { k == n - 1 } else { k == 0 };
                let at_right = if from_right { k == 0 } else { k == n - 1 };
                let free = (free_l && at_left) || (free_r && at_right);
                // Free at both ends and no brace in between: nothing holds
                // it laterally.
                let unrestrained = free_l && free_r && n == 1 && !braces;
                let brace_root = braces && (n > 1 || (free_l && free_r));
                out.push((a, b, free, sag, hog, k_of(free, brace_root), unrestrained));
            }
        };
        match c.bracing {
            Bracing::Continuous => {
                if !both {
                    split(len, false, true, false);
                }
            }
            Bracing::Supports | Bracing::NotGiven => split(len, true, true, false),
            Bracing::Spacing(sp) => {
                if both || sp >= len {
                    split(sp.min(len), true, true, sp < len);
                } else {
                    split(sp, true, false, true);
                    split(len, false, true, false);
                }
            }
        }
    }
    out
}

/// Apply the long-term creep factor to the service combinations that
/// include a dead case.
fn with_long_term(beam: &Beam, lt: &LongTerm) -> Beam {
    let mut b = beam.clone();
    for c in b.combinations.iter_mut() {
        if c.kind != ComboKind::Service
            || !c
                .factors
                .iter()
                .any(|(i, f)| *f != 0.0 && beam.cases[*i].category == Category::Dead)
        {
            continue;
        }
        for (i, f) in c.factors.iter_mut() {
            let psi = match beam.cases[*i].category {
                Category::Dead | Category::Other => 1.0,
                Category::Live => lt.sustained_live,
                _ => 0.0,
            };
            *f *= 1.0 + (lt.creep_factor - 1.0) * psi;
        }
        c.name = format!(
            "{} (long-term, K_cr = {})",
            c.name,
            crate::units::fmt_num(lt.creep_factor)
        );
    }
    b
}

impl Prepared {
    /// Analyse the beam once for these criteria.
    pub fn new(beam: &Beam, material: Material, criteria: Criteria) -> Result<Prepared> {
        material.validate()?;
        criteria.fit(material.kind, &format!("the material '{}'", material.name))?;
        if let Bracing::Spacing(s) = criteria.bracing
            && !(s.is_finite() && s >= 1e-3 * beam.length().max(1.0) && s > 0.0)
        {
            return Err(Error::msg(format!(
                "the brace spacing {} mm is not valid: expected at least 1/1000 of the beam's length",
                crate::units::fmt_num(s)
            ))
            .in_field("lateral_bracing"));
        }
        if let Some(k) = criteria.overhang_k
            && !(k.is_finite() && (0.5..=10.0).contains(&k))
        {
            return Err(Error::msg(
                "the overhang effective-length factor must be between 0.5 and 10",
            )
            .in_field("overhang_effective_length"));
        }
        let mut beam = match &criteria.long_term {
            Some(lt) => {
                if !(lt.creep_factor.is_finite() && (1.0..=5.0).contains(&lt.creep_factor)) {
                    return Err(Error::msg("the creep factor must be between 1 and 5")
                        .in_field("creep_factor"));
                }
                if !(0.0..=1.0).contains(&lt.sustained_live) {
                    return Err(Error::msg(
                        "the sustained fraction of live load must be between 0 and 1",
                    )
                    .in_field("sustained_live"));
                }
                with_long_term(beam, lt)
            }
            None => beam.clone(),
        };
        if !criteria.self_weight {
            beam.self_weight_case = None;
        }
        let segs = segments_of(&beam, &criteria);
        let mut extra = Vec::new();
        for &(a, b, ..) in &segs {
            for k in 0..=4 {
                extra.push(a + (b - a) * k as f64 / 4.0);
            }
        }
        let demand = Demand::build(&beam, &extra)?;
        let node_of = |x: f64| -> usize {
            match demand.mesh.x.binary_search_by(|p| p.total_cmp(&x)) {
                Ok(i) => i,
                Err(i) => {
                    let lo = i.saturating_sub(1);
                    let hi = i.min(demand.mesh.x.len() - 1);
                    if (demand.mesh.x[hi] - x).abs() < (x - demand.mesh.x[lo]).abs() {
                        hi
                    } else {
                        lo
                    }
                }
            }
        };
        let segments = segs
            .iter()
            .map(|&(a, b, free, sagging, hogging, k, unrestrained)| {
                let nodes = [0, 1, 2, 3, 4].map(|q| node_of(a + (b - a) * q as f64 / 4.0));
                let top_braced_between = criteria.braced_flange == BracedFlange::Top
                    && matches!(criteria.bracing, Bracing::Continuous | Bracing::Spacing(_));
                Segment {
                    x1: a,
                    x2: b,
                    nodes,
                    elems: (nodes[0], nodes[4]),
                    free_end: free,
                    cb_unity: free || (hogging && !sagging && top_braced_between),
                    sagging,
                    hogging,
                    k,
                    unrestrained,
                }
            })
            .collect();
        let stretch_elems = (0..demand.stretches.len())
            .map(|k| {
                let r = demand.stretch_elements(k);
                (r.start, r.end)
            })
            .collect();
        let strength = (0..demand.combos.len())
            .filter(|&i| demand.combos[i].kind == ComboKind::Strength)
            .collect();
        let service = (0..demand.combos.len())
            .filter(|&i| demand.combos[i].kind == ComboKind::Service)
            .collect();
        let duration = beam
            .combinations
            .iter()
            .map(|c| {
                timber::combination_cd(
                    c.factors
                        .iter()
                        .filter(|(_, f)| *f != 0.0)
                        .map(|(i, _)| beam.cases[*i].category),
                )
            })
            .collect();
        Ok(Prepared {
            demand,
            material,
            criteria,
            segments,
            duration,
            stretch_elems,
            strength,
            service,
        })
    }

    /// The same job with another material (the demand is reused: it does
    /// not depend on the material).
    pub fn new_from(prep: &Prepared, material: Material) -> Option<Prepared> {
        material.validate().ok()?;
        let mut p = prep.clone();
        p.material = material;
        Some(p)
    }

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
                let v = d.extremes(&a, Quantity::Shear, 0..ne);
                let (vv, x) = v.abs_max();
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
                    let exm = d.extremes(&a, Quantity::Deflection, e0..e1);
                    let (y, x) = exm.abs_max();
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

    /// What beamsift does not check for this section at all (outside its
    /// scope), in plain words.
    pub fn not_checked(&self, p: &Properties, m: Option<&Material>) -> Vec<String> {
        let m = m.unwrap_or(&self.material);
        let mut v = vec![
            "bearing and web crippling at supports and point loads, connections, vibration, fire resistance, durability, combined axial load and torsion".to_string(),
        ];
        if matches!(p.form, Form::WeldedI) {
            v.push("welds between the plates, and stiffeners (webs taken as unstiffened)".into());
        }
        if matches!(p.form, Form::Rhs { .. } | Form::Chs { .. }) && m.kind == MaterialKind::Steel {
            v.push("the design wall thickness: t is used as given (AISC 360-16 B4.2 takes 0.93 × the nominal thickness for electric-resistance-welded HSS: enter that as t)".into());
        }
        if m.kind == MaterialKind::Timber {
            v.push("notches, holes, and the volume factor C_V of glulam (enter it in the adjustment factors)".into());
        }
        if self.criteria.long_term.is_none() {
            v.push("long-term (creep) deflection: set checks.creep_factor to include it".into());
        }
        v
    }

    /// The assumptions a checker needs, for every output.
    pub fn assumptions(&self) -> Vec<String> {
        let c = &self.criteria;
        let mut v = Vec::new();
        match c.bracing {
            Bracing::NotGiven => v.push("lateral bracing not given: read as braced at the supports only (conservative)".to_string()),
            Bracing::Supports => v.push("laterally braced at the supports only".to_string()),
            Bracing::Continuous => v.push(match c.braced_flange {
                BracedFlange::Top => "top flange continuously braced; the bottom flange, in compression under hogging, is unbraced between supports".to_string(),
                BracedFlange::Both => "both flanges continuously braced: no lateral instability".to_string(),
            }),
            Bracing::Spacing(s) => v.push(match c.braced_flange {
                BracedFlange::Top => format!(
                    "braces every {} restrain the top flange only; under hogging the bottom flange is unbraced between supports",
                    crate::units::Show::Span.fmt(s, crate::units::System::Si)
                ),
                BracedFlange::Both => format!(
                    "braces every {} restrain both flanges (or twist)",
                    crate::units::Show::Span.fmt(s, crate::units::System::Si)
                ),
            }),
        }
        v.push("every pinned, roller or fixed support restrains the member laterally and against twist; spring supports and free ends do not (conservative)".into());
        if !c.self_weight {
            v.push("the section's self-weight is not included (by the user's choice)".into());
        }
        if c.braced_flange == BracedFlange::Top
            && matches!(c.bracing, Bracing::Continuous | Bracing::Spacing(_))
        {
            v.push("bottom flange in compression (hogging) between supports: the whole span is one unbraced length with C_b = 1.0 (conservative; AISC 360-16 Commentary F1 gives higher values for a braced top flange, to be applied by hand)".into());
        }
        v.push(match c.load_height {
            LoadHeight::ShearCentre => "load height not considered: loads taken at the shear centre (not destabilising), as AISC 360-16 F2–F5 assume; set load_height = \"top_flange\" for loads that move sideways with the top flange".into(),
            LoadHeight::TopFlange => "destabilising loads on the top flange: effective lengths 1.2 × the unbraced length between restraints (from memory of BS 5950-1:2000 Table 13)".into(),
        });
        if self.demand.stretches.iter().any(|s| s.cantilever) {
            v.push(format!(
                "overhangs: the free-tip segment's effective length is {} × its length ({}), C_b = 1.0 (AISC 360-16 F1)",
                crate::units::fmt_num(c.overhang_factor()),
                if c.overhang_k.is_some() {
                    "as given".to_string()
                } else {
                    "from memory of BS 5950-1:2000 Table 14, support continuous with lateral and torsional restraint, tip free".to_string()
                }
            ));
        }
        if self.segments.iter().any(|g| {
            g.free_end
                && (g.k - c.brace_rooted_factor()).abs() < 1e-12
                && c.braced_flange == BracedFlange::Top
        }) {
            v.push(format!(
                "a free end's segment whose other end is a top-flange brace (not a support): effective length {} × its length (from memory of BS 5950-1:2000 Table 14, continuous with lateral restraint to the top flange only, tip free)",
                crate::units::fmt_num(c.brace_rooted_factor())
            ));
        }
        if !self.demand.springs.is_empty() {
            v.push("spring supports: deflection limits measured from the chord of each span's displaced supports (the member's own deflection); the settlements are reported apart".into());
        }
        v
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
