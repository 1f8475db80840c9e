//! Check lines and the verdict: the sense, the kinds of check, a line
//! (`Item`), what could not be evaluated (`Gap`, `Gaps`), the verdict and
//! the summary of a section.

use serde::{Deserialize, Serialize};

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
    #[inline]
    pub(super) fn index(self) -> usize {
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
    #[inline]
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
