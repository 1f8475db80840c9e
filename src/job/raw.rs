//! The job file as written: serde structures mirroring the TOML tables,
//! every value kept with its span so errors can point at it.

use serde::Deserialize;
use std::collections::BTreeMap;
use toml::Spanned;

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawJob {
    pub title: Option<String>,
    pub project: Option<RawProject>,
    pub beam: Option<RawBeam>,
    pub material: RawMaterial,
    #[serde(default)]
    pub case: Vec<RawCase>,
    #[serde(default)]
    pub load: Vec<RawLoad>,
    #[serde(default)]
    pub combination: Vec<RawCombo>,
    pub presets: Option<RawPresets>,
    pub checks: Option<RawChecks>,
    pub materials: Option<BTreeMap<String, RawMaterial>>,
    pub currency: Option<String>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawBeam {
    pub spans: Spanned<Vec<Spanned<String>>>,
    pub supports: Spanned<Vec<Spanned<RawSupport>>>,
    pub cantilever_factor: Option<f64>,
}

#[derive(Deserialize)]
#[serde(untagged)]
pub enum RawSupport {
    Name(String),
    Spring { spring: String },
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMaterial {
    pub name: Option<String>,
    pub kind: Option<Spanned<String>>,
    #[serde(rename = "Emin")]
    pub e_min: Option<Spanned<String>>,
    #[serde(rename = "CD")]
    pub cd: Option<Spanned<f64>>,
    #[serde(rename = "CM_Fb")]
    pub cm_fb: Option<Spanned<f64>>,
    #[serde(rename = "CM_Fv")]
    pub cm_fv: Option<Spanned<f64>>,
    #[serde(rename = "CM_E")]
    pub cm_e: Option<Spanned<f64>>,
    #[serde(rename = "Ct")]
    pub ct: Option<Spanned<f64>>,
    #[serde(rename = "Ci")]
    pub ci: Option<Spanned<f64>>,
    #[serde(rename = "Ct_E")]
    pub ct_e: Option<Spanned<f64>>,
    #[serde(rename = "Ci_E")]
    pub ci_e: Option<Spanned<f64>>,
    #[serde(rename = "CF")]
    pub cf: Option<Spanned<f64>>,
    #[serde(rename = "Cr")]
    pub cr: Option<Spanned<f64>>,
    #[serde(rename = "Cfu")]
    pub cfu: Option<Spanned<f64>>,
    #[serde(rename = "E")]
    pub e: Option<Spanned<String>>,
    #[serde(rename = "Fb")]
    pub fb: Option<Spanned<String>>,
    #[serde(rename = "Fbt")]
    pub fbt: Option<Spanned<String>>,
    #[serde(rename = "Fbc")]
    pub fbc: Option<Spanned<String>>,
    #[serde(rename = "Fv")]
    pub fv: Option<Spanned<String>>,
    #[serde(rename = "Fy")]
    pub fy: Option<Spanned<String>>,
    pub density: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCase {
    pub name: Spanned<String>,
    pub category: Spanned<String>,
    pub self_weight: Option<bool>,
    pub pattern: Option<Spanned<RawPattern>>,
}

#[derive(Deserialize)]
#[serde(untagged)]
pub enum RawPattern {
    On(bool),
    Name(String),
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawLoad {
    pub case: Spanned<String>,
    pub uniform: Option<Spanned<String>>,
    pub area: Option<Spanned<String>>,
    pub width: Option<Spanned<String>>,
    pub linear: Option<Spanned<Vec<String>>>,
    pub point: Option<Spanned<String>>,
    pub moment: Option<Spanned<String>>,
    pub at: Option<Spanned<String>>,
    pub from: Option<Spanned<String>>,
    pub to: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCombo {
    pub name: Spanned<String>,
    pub kind: Option<Spanned<String>>,
    pub factors: Spanned<BTreeMap<String, f64>>,
    pub limit: Option<Spanned<String>>,
    pub max: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawPresets {
    pub strength: Option<Spanned<String>>,
    pub service: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawChecks {
    pub lateral_bracing: Option<Spanned<String>>,
    pub braced_flange: Option<Spanned<String>>,
    pub load_height: Option<Spanned<String>>,
    pub overhang_effective_length: Option<Spanned<f64>>,
    pub shear: Option<Spanned<String>>,
    pub self_weight: Option<bool>,
    pub exclude: Option<Spanned<Vec<Spanned<String>>>>,
    pub creep_factor: Option<Spanned<f64>>,
    pub sustained_live: Option<Spanned<f64>>,
}

/// The `[project]` table: the title block of a calculation sheet, every
/// entry an optional string.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawProject {
    pub project: Option<String>,
    pub job_number: Option<String>,
    pub member: Option<String>,
    pub engineer: Option<String>,
    pub checker: Option<String>,
    pub date: Option<String>,
    pub revision: Option<String>,
}
