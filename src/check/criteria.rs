//! What the checks are asked to do: bracing, load height, the shear
//! method, exclusions, long-term deflection and the effective-length
//! factors (`Criteria`).

use super::MaterialKind;
use crate::error::{Error, Result};
use serde::{Deserialize, Serialize};

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
