//! The job file (TOML) and the presets of combinations: turns a user's
//! description of a member into a validated [`Beam`], [`Material`] and
//! [`Criteria`]. Pure: it takes text, not files.
//!
//! Every quantity is a string with its unit (`"5.4 m"`, `"2.5 kN/m"`).
//! Errors carry the file name, line and column of the offending value.
//!
//! Presets (from memory; verify against the edition in force):
//! * `asce7-16-asd` — ASCE/SEI 7-16 §2.4.1 basic allowable-stress
//!   combinations 1–7 (seismic omitted): D; D+L; D+(Lr|S); D+0.75L+0.75(Lr|S);
//!   D+0.6W; D+0.75L+0.45W+0.75(Lr|S); 0.6D+0.6W.
//! * service `floor` — IBC 2018 Table 1604.3 floor members: L/360 under
//!   live load, L/240 under dead + live.
//! * service `roof` — IBC 2018 Table 1604.3 roof members supporting a
//!   non-plaster ceiling: L/240 under roof live or snow, L/180 under dead
//!   plus that load.

use crate::beam::model::{
    Beam, Category, Combination, ComboKind, DeflectionLimit, Load, LoadKind, Pattern, Support,
};
use crate::beam::presets;
use crate::check::{
    BracedFlange, Bracing, Criteria, LoadHeight, Material, MaterialKind, ShearMethod, TimberFactors,
};
use crate::error::{Error, Location, Result};
use crate::units::{self, Dim};
use serde::Deserialize;
use std::collections::BTreeMap;
use toml::Spanned;

/// A job ready to analyse.
#[derive(Clone, Debug)]
pub struct Job {
    pub title: String,
    pub beam: Beam,
    pub material: Material,
    pub criteria: Criteria,
    /// Named material grades a catalogue row may refer to.
    pub grades: Vec<(String, Material)>,
    /// Currency of catalogue costs (for display).
    pub currency: Option<String>,
    /// Preset names used (strength, service), so a schedule can regenerate
    /// the combinations for its own cases.
    pub presets: (Option<String>, Option<String>),
    /// Notes on how the job was interpreted (defaults applied, ...).
    pub notes: Vec<String>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawJob {
    title: Option<String>,
    beam: RawBeam,
    material: RawMaterial,
    #[serde(default)]
    case: Vec<RawCase>,
    #[serde(default)]
    load: Vec<RawLoad>,
    #[serde(default)]
    combination: Vec<RawCombo>,
    presets: Option<RawPresets>,
    checks: Option<RawChecks>,
    materials: Option<BTreeMap<String, RawMaterial>>,
    currency: Option<String>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawBeam {
    spans: Spanned<Vec<Spanned<String>>>,
    supports: Spanned<Vec<Spanned<RawSupport>>>,
    cantilever_factor: Option<f64>,
}

#[derive(Deserialize)]
#[serde(untagged)]
enum RawSupport {
    Name(String),
    Spring { spring: String },
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawMaterial {
    name: Option<String>,
    kind: Option<Spanned<String>>,
    #[serde(rename = "Emin")]
    e_min: Option<Spanned<String>>,
    #[serde(rename = "CD")]
    cd: Option<Spanned<f64>>,
    #[serde(rename = "CM_Fb")]
    cm_fb: Option<Spanned<f64>>,
    #[serde(rename = "CM_Fv")]
    cm_fv: Option<Spanned<f64>>,
    #[serde(rename = "CM_E")]
    cm_e: Option<Spanned<f64>>,
    #[serde(rename = "Ct")]
    ct: Option<Spanned<f64>>,
    #[serde(rename = "Ci")]
    ci: Option<Spanned<f64>>,
    #[serde(rename = "Ct_E")]
    ct_e: Option<Spanned<f64>>,
    #[serde(rename = "Ci_E")]
    ci_e: Option<Spanned<f64>>,
    #[serde(rename = "CF")]
    cf: Option<Spanned<f64>>,
    #[serde(rename = "Cr")]
    cr: Option<Spanned<f64>>,
    #[serde(rename = "Cfu")]
    cfu: Option<Spanned<f64>>,
    #[serde(rename = "E")]
    e: Option<Spanned<String>>,
    #[serde(rename = "Fb")]
    fb: Option<Spanned<String>>,
    #[serde(rename = "Fbt")]
    fbt: Option<Spanned<String>>,
    #[serde(rename = "Fbc")]
    fbc: Option<Spanned<String>>,
    #[serde(rename = "Fv")]
    fv: Option<Spanned<String>>,
    #[serde(rename = "Fy")]
    fy: Option<Spanned<String>>,
    density: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCase {
    name: Spanned<String>,
    category: Spanned<String>,
    self_weight: Option<bool>,
    pattern: Option<Spanned<RawPattern>>,
}

#[derive(Deserialize)]
#[serde(untagged)]
enum RawPattern {
    On(bool),
    Name(String),
}

/// Snow cases without a pattern of their own get partial loading (full or
/// half by span) on a beam of more than one span, as the preset's standard
/// asks (ASCE 7-16 §7.5).
pub fn set_partial_snow(beam: &mut Beam, explicit: &[bool], notes: &mut Vec<String>) {
    if beam.stretches().len() < 2 {
        return;
    }
    let mut named = Vec::new();
    for (i, c) in beam.cases.iter_mut().enumerate() {
        if c.category == Category::Snow && !explicit.get(i).copied().unwrap_or(false) {
            c.pattern = Pattern::Partial;
            named.push(c.name.clone());
        }
    }
    if !named.is_empty() {
        notes.push(format!(
            "snow case(s) {} partially loaded: full on some spans, half on the others, the worst at every station (ASCE 7-16 §7.5; set pattern = false on the case to turn it off)",
            named.join(", ")
        ));
    }
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawLoad {
    case: Spanned<String>,
    uniform: Option<Spanned<String>>,
    area: Option<Spanned<String>>,
    width: Option<Spanned<String>>,
    linear: Option<Spanned<Vec<String>>>,
    point: Option<Spanned<String>>,
    moment: Option<Spanned<String>>,
    at: Option<Spanned<String>>,
    from: Option<Spanned<String>>,
    to: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCombo {
    name: Spanned<String>,
    kind: Option<Spanned<String>>,
    factors: Spanned<BTreeMap<String, f64>>,
    limit: Option<Spanned<String>>,
    max: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawPresets {
    strength: Option<Spanned<String>>,
    service: Option<Spanned<String>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawChecks {
    lateral_bracing: Option<Spanned<String>>,
    braced_flange: Option<Spanned<String>>,
    load_height: Option<Spanned<String>>,
    overhang_effective_length: Option<Spanned<f64>>,
    shear: Option<Spanned<String>>,
    self_weight: Option<bool>,
    exclude: Option<Spanned<Vec<Spanned<String>>>>,
    creep_factor: Option<Spanned<f64>>,
    sustained_live: Option<Spanned<f64>>,
}

/// Maps byte offsets to line:column for error messages.
struct Source<'a> {
    file: &'a str,
    text: &'a str,
}

impl Source<'_> {
    fn loc(&self, span: std::ops::Range<usize>, field: &str) -> Location {
        let upto = &self.text[..span.start.min(self.text.len())];
        let line = upto.matches('\n').count() as u64 + 1;
        let col = upto
            .rsplit('\n')
            .next()
            .map(|l| l.chars().count())
            .unwrap_or(0) as u64
            + 1;
        Location::in_file(self.file)
            .with_line(line)
            .with_column(col)
            .with_field(field)
    }
    /// The line of a table's header (`[material]`, `[materials.T1]`,
    /// `[materials."T 1"]`), for problems of a key the table lacks.
    fn table_loc(&self, table: &str, field: &str) -> Location {
        let (head, name) = table.split_once('.').unwrap_or((table, ""));
        let unquote = |t: &str| -> String {
            let t = t.trim();
            t.strip_prefix('"')
                .and_then(|r| r.strip_suffix('"'))
                .or_else(|| t.strip_prefix('\'').and_then(|r| r.strip_suffix('\'')))
                .unwrap_or(t)
                .to_string()
        };
        let line = self.text.lines().position(|l| {
            let Some(inner) = l
                .trim()
                .strip_prefix('[')
                .and_then(|r| r.split(']').next())
                .filter(|_| !l.trim().starts_with("[["))
            else {
                return false;
            };
            match inner.split_once('.') {
                None => name.is_empty() && inner.trim() == head,
                Some((h, n)) => h.trim() == head && !name.is_empty() && unquote(n) == name,
            }
        });
        let loc = Location::in_file(self.file).with_field(field);
        match line {
            Some(k) => loc.with_line(k as u64 + 1),
            None => loc,
        }
    }
    fn err<T>(
        &self,
        span: std::ops::Range<usize>,
        field: &str,
        msg: impl Into<String>,
    ) -> Result<T> {
        Err(Error::input(self.loc(span, field), msg))
    }
    fn q(&self, v: &Spanned<String>, dim: Dim, field: &str) -> Result<f64> {
        units::parse(v.get_ref(), dim).map_err(|e| e.at(&self.loc(v.span(), field)))
    }
}

/// Read a text file (a job file), reporting invalid UTF-8 as bad input at
/// its line and column rather than as an I/O failure.
pub fn read_text(path: &std::path::Path, shown: &str) -> Result<String> {
    // Read at most one byte past the limit (from_toml then refuses it).
    let mut bytes = Vec::new();
    std::fs::File::open(path)
        .and_then(|f| {
            use std::io::Read;
            f.take(MAX_JOB_BYTES as u64 + 1).read_to_end(&mut bytes)
        })
        .map_err(|e| Error::io(shown, e))?;
    if bytes.len() > MAX_JOB_BYTES {
        return Err(Error::input(
            Location::in_file(shown),
            format!(
                "the job file is more than {} bytes, the most a job may have: is it the right file?",
                units::count(MAX_JOB_BYTES as u64)
            ),
        ));
    }
    String::from_utf8(bytes).map_err(|e| {
        let good = &e.as_bytes()[..e.utf8_error().valid_up_to()];
        let line = good.iter().filter(|b| **b == b'\n').count() as u64 + 1;
        let col = good.iter().rev().take_while(|b| **b != b'\n').count() as u64 + 1;
        Error::input(
            Location::in_file(shown).with_line(line).with_column(col),
            "not valid UTF-8 text: save the file as UTF-8",
        )
    })
}

/// Parse a deflection limit like `L/360`.
pub fn parse_ratio(s: &str) -> Result<f64> {
    let t = s.trim().replace(' ', "");
    let n = t
        .strip_prefix("L/")
        .or_else(|| t.strip_prefix("l/"))
        .and_then(|n| n.parse::<f64>().ok())
        .filter(|n| n.is_finite() && *n > 0.0);
    let n = n.ok_or_else(|| {
        Error::msg(format!(
            "'{s}' is not a deflection limit: expected the form L/360 (and/or an absolute limit with a length unit)"
        ))
    })?;
    if !(RATIO_RANGE.0..=RATIO_RANGE.1).contains(&n) {
        return Err(Error::msg(format!(
            "'{s}' is outside the supported limits L/{} to L/{}: a typing error is likelier than such a limit",
            RATIO_RANGE.0, RATIO_RANGE.1
        )));
    }
    Ok(n)
}

/// Supported n of a deflection limit L/n (L/60 for a lenient cantilever
/// roof to L/10000 for a machine foundation cover the trade's usual range
/// with room to spare; common practice).
pub const RATIO_RANGE: (f64, f64) = (20.0, 20_000.0);

/// Parse a lateral bracing description.
pub fn parse_bracing(s: &str) -> Result<Bracing> {
    match s.trim().to_ascii_lowercase().as_str() {
        "continuous" => Ok(Bracing::Continuous),
        "supports" | "at supports" | "span" => Ok(Bracing::Supports),
        "none" | "not given" => Ok(Bracing::NotGiven),
        _ => units::parse(s, Dim::Length).map(Bracing::Spacing).map_err(|_| {
            Error::msg(format!(
                "'{s}' is not a lateral bracing: expected \"continuous\", \"supports\" or a brace spacing such as \"1.5 m\""
            ))
        }),
    }
}

/// Parse which flange the braces restrain.
pub fn parse_braced_flange(s: &str) -> Result<BracedFlange> {
    match s.trim().to_ascii_lowercase().as_str() {
        "top" => Ok(BracedFlange::Top),
        "both" => Ok(BracedFlange::Both),
        other => Err(Error::msg(format!(
            "unknown braced flange '{other}': expected top (braces restrain the top flange only) or both"
        ))),
    }
}

/// Parse where the loads act.
pub fn parse_load_height(s: &str) -> Result<LoadHeight> {
    match s
        .trim()
        .to_ascii_lowercase()
        .replace([' ', '-'], "_")
        .as_str()
    {
        "shear_centre" | "shear_center" => Ok(LoadHeight::ShearCentre),
        "top_flange" => Ok(LoadHeight::TopFlange),
        other => Err(Error::msg(format!(
            "unknown load height '{other}': expected shear_centre or top_flange"
        ))),
    }
}

/// Parse a material kind.
pub fn parse_kind(s: &str) -> Result<MaterialKind> {
    match s.trim().to_ascii_lowercase().as_str() {
        "steel" => Ok(MaterialKind::Steel),
        "timber" | "wood" => Ok(MaterialKind::Timber),
        "other" | "unspecified" => Ok(MaterialKind::Unspecified),
        other => Err(Error::msg(format!(
            "unknown material kind '{other}': expected steel, timber or other"
        ))),
    }
}

/// Parse a support name.
pub fn parse_support(s: &str) -> Result<Support> {
    match s.trim().to_ascii_lowercase().as_str() {
        "pinned" | "pin" => Ok(Support::Pinned),
        "roller" => Ok(Support::Roller),
        "fixed" => Ok(Support::Fixed),
        "free" | "none" => Ok(Support::Free),
        other => Err(Error::msg(format!(
            "unknown support '{other}': expected pinned, roller, fixed, free or {{ spring = \"5000 kN/m\" }}"
        ))),
    }
}

/// Read a job from TOML text; `file` names it in errors.
/// Largest job file read (a job with the most loads allowed is well under
/// 1 MB): a larger file is refused before it is parsed.
pub const MAX_JOB_BYTES: usize = 4 << 20;

/// Most spans, load cases, loads and combinations one job may hold.
pub const MAX_SPANS: usize = 100;
pub const MAX_CASES: usize = 200;
pub const MAX_LOADS: usize = 10_000;
pub const MAX_COMBINATIONS: usize = 2_000;

pub fn from_toml(text: &str, file: &str) -> Result<Job> {
    let src = Source { file, text };
    if text.len() > MAX_JOB_BYTES {
        return Err(Error::input(
            Location::in_file(file),
            format!(
                "the job file is {} bytes, more than the {} a job may have: is it the right file?",
                units::count(text.len() as u64),
                units::count(MAX_JOB_BYTES as u64)
            ),
        ));
    }
    let raw: RawJob = toml::from_str(text).map_err(|e| {
        let loc = match e.span() {
            Some(sp) => src.loc(sp, ""),
            None => Location::in_file(file),
        };
        let loc = Location { field: None, ..loc };
        Error::input(loc, e.message().to_string())
    })?;
    for (what, n, most, span) in [
        (
            "spans",
            raw.beam.spans.get_ref().len(),
            MAX_SPANS,
            raw.beam.spans.get_ref().get(MAX_SPANS).map(|s| s.span()),
        ),
        ("load cases", raw.case.len(), MAX_CASES, None),
        (
            "loads",
            raw.load.len(),
            MAX_LOADS,
            raw.load.get(MAX_LOADS).map(|l| l.case.span()),
        ),
        (
            "combinations",
            raw.combination.len(),
            MAX_COMBINATIONS,
            None,
        ),
    ] {
        if n > most {
            let loc = match span {
                Some(sp) => src.loc(sp, ""),
                None => Location::in_file(file),
            };
            return Err(Error::input(
                loc,
                format!(
                    "the job has {} {what}, more than the {} one job may have",
                    units::count(n as u64),
                    units::count(most as u64)
                ),
            ));
        }
    }
    let mut notes = Vec::new();
    // Beam.
    let mut spans = Vec::new();
    for (i, s) in raw.beam.spans.get_ref().iter().enumerate() {
        spans.push(src.q(s, Dim::Length, &format!("beam.spans[{}]", i + 1))?);
    }
    let mut supports = Vec::new();
    for (i, s) in raw.beam.supports.get_ref().iter().enumerate() {
        let field = format!("beam.supports[{}]", i + 1);
        let sup = match s.get_ref() {
            RawSupport::Name(n) => {
                parse_support(n).map_err(|e| e.at(&src.loc(s.span(), &field)))?
            }
            RawSupport::Spring { spring } => {
                let k = units::parse(spring, Dim::LineLoad)
                    .map_err(|e| e.at(&src.loc(s.span(), &field)))?;
                Support::Spring(k)
            }
        };
        supports.push(sup);
    }
    if supports.len() != spans.len() + 1 {
        return src.err(
            raw.beam.supports.span(),
            "beam.supports",
            format!(
                "{} span(s) need {} supports, one at each end of every span ('free' where there is none); {} given",
                spans.len(),
                spans.len() + 1,
                supports.len()
            ),
        );
    }
    let mut beam = Beam::new(spans, supports);
    if let Some(f) = raw.beam.cantilever_factor {
        beam.cantilever_factor = f;
    }
    // Material and grades.
    let material = parse_material(&src, &raw.material, "material", &mut notes)?;
    let mut grades = Vec::new();
    if let Some(ms) = &raw.materials {
        for (name, m) in ms {
            let mut sink = Vec::new();
            let mut mat = parse_material(&src, m, &format!("materials.{name}"), &mut sink)?;
            if m.density.is_none() {
                mat.density = material.density;
            }
            if mat.name == "material" {
                mat.name = name.clone();
            }
            grades.push((name.clone(), mat));
        }
    }
    // Cases.
    let mut sw_case = None;
    let mut explicit_pattern = vec![false; raw.case.len()];
    for (i, c) in raw.case.iter().enumerate() {
        let field = format!("case[{}]", i + 1);
        let name = c.name.get_ref().trim().to_string();
        if name.is_empty() {
            return src.err(c.name.span(), &field, "a load case needs a name");
        }
        if beam.cases.iter().any(|k| k.name == name) {
            return src.err(
                c.name.span(),
                &field,
                format!("load case '{name}' is defined twice"),
            );
        }
        let cat = Category::parse(c.category.get_ref())
            .map_err(|e| e.at(&src.loc(c.category.span(), &format!("{field}.category"))))?;
        let idx = beam.case(&name, cat);
        if let Some(p) = &c.pattern {
            beam.cases[idx].pattern = match p.get_ref() {
                RawPattern::On(true) => Pattern::Skip,
                RawPattern::On(false) => Pattern::None,
                RawPattern::Name(n) => match n.trim().to_ascii_lowercase().as_str() {
                    "skip" | "on" | "true" => Pattern::Skip,
                    "partial" | "half" => Pattern::Partial,
                    "none" | "off" | "false" => Pattern::None,
                    other => {
                        return src.err(
                            p.span(),
                            &format!("{field}.pattern"),
                            format!("unknown pattern '{other}': expected true (skip loading: on or off by span), \"partial\" (full or half by span) or false"),
                        );
                    }
                },
            };
            explicit_pattern[idx] = true;
        }
        if c.self_weight == Some(true) {
            sw_case = Some(idx);
        }
    }
    if beam.cases.is_empty() {
        return Err(Error::input(
            Location::in_file(file).with_field("case"),
            "the job has no load cases: add [[case]] tables with name and category",
        ));
    }
    let sw_case = sw_case.or_else(|| beam.cases.iter().position(|c| c.category == Category::Dead));
    beam.self_weight_case = sw_case;
    // Loads.
    let case_index = |name: &Spanned<String>, field: &str| -> Result<usize> {
        beam.cases
            .iter()
            .position(|c| c.name == name.get_ref().trim())
            .ok_or_else(|| {
                Error::input(
                    src.loc(name.span(), field),
                    format!(
                        "unknown load case '{}': expected one of {}",
                        name.get_ref(),
                        beam.cases
                            .iter()
                            .map(|c| c.name.as_str())
                            .collect::<Vec<_>>()
                            .join(", ")
                    ),
                )
            })
    };
    let length = beam.length();
    let mut loads = Vec::new();
    for (i, l) in raw.load.iter().enumerate() {
        let field = format!("load[{}]", i + 1);
        let case = case_index(&l.case, &format!("{field}.case"))?;
        let from = l
            .from
            .as_ref()
            .map(|v| src.q(v, Dim::Length, &format!("{field}.from")))
            .transpose()?;
        let to =
            l.to.as_ref()
                .map(|v| src.q(v, Dim::Length, &format!("{field}.to")))
                .transpose()?;
        let at =
            l.at.as_ref()
                .map(|v| src.q(v, Dim::Length, &format!("{field}.at")))
                .transpose()?;
        let kinds = [
            l.uniform.is_some(),
            l.area.is_some(),
            l.linear.is_some(),
            l.point.is_some(),
            l.moment.is_some(),
        ];
        let n_kinds = kinds.iter().filter(|k| **k).count();
        let span0 = l.case.span();
        if n_kinds != 1 {
            return src.err(
                span0,
                &field,
                "a load needs exactly one of uniform, area (with width), linear, point or moment",
            );
        }
        // Keys the load's kind does not use are refused, never ignored.
        let distributed = l.uniform.is_some() || l.area.is_some() || l.linear.is_some();
        let unused: [(&str, Option<std::ops::Range<usize>>, bool); 4] = [
            ("at", l.at.as_ref().map(|v| v.span()), distributed),
            ("from", l.from.as_ref().map(|v| v.span()), !distributed),
            ("to", l.to.as_ref().map(|v| v.span()), !distributed),
            (
                "width",
                l.width.as_ref().map(|v| v.span()),
                l.area.is_none(),
            ),
        ];
        for (key, sp, refused) in unused {
            if let (Some(sp), true) = (sp, refused) {
                let kind = ["uniform", "area", "linear", "point", "moment"]
                    [kinds.iter().position(|k| *k).unwrap_or(0)];
                let uses = match kind {
                    "uniform" | "linear" => "from and to",
                    "area" => "width, from and to",
                    _ => "at",
                };
                return src.err(
                    sp,
                    &format!("{field}.{key}"),
                    format!("a {kind} load does not use '{key}' (it takes {uses}): remove it, or give the load kind that uses it"),
                );
            }
        }
        let kind = if let Some(u) = &l.uniform {
            let w = src.q(u, Dim::LineLoad, &format!("{field}.uniform"))?;
            LoadKind::Distributed {
                x1: from.unwrap_or(0.0),
                x2: to.unwrap_or(length),
                w1: w,
                w2: w,
            }
        } else if let Some(a) = &l.area {
            let p = src.q(a, Dim::AreaLoad, &format!("{field}.area"))?;
            let Some(wd) = &l.width else {
                return src.err(a.span(), &field, "an area load needs width = \"...\" (the tributary width, e.g. the joist spacing)");
            };
            let b = src.q(wd, Dim::Length, &format!("{field}.width"))?;
            if b <= 0.0 {
                return src.err(
                    wd.span(),
                    &format!("{field}.width"),
                    "the tributary width must be greater than zero",
                );
            }
            LoadKind::Distributed {
                x1: from.unwrap_or(0.0),
                x2: to.unwrap_or(length),
                w1: p * b,
                w2: p * b,
            }
        } else if let Some(lin) = &l.linear {
            let v = lin.get_ref();
            if v.len() != 2 {
                return src.err(
                    lin.span(),
                    &format!("{field}.linear"),
                    "expected two intensities, [start, end], e.g. [\"0 kN/m\", \"6 kN/m\"]",
                );
            }
            let w1 = units::parse(&v[0], Dim::LineLoad)
                .map_err(|e| e.at(&src.loc(lin.span(), &format!("{field}.linear"))))?;
            let w2 = units::parse(&v[1], Dim::LineLoad)
                .map_err(|e| e.at(&src.loc(lin.span(), &format!("{field}.linear"))))?;
            LoadKind::Distributed {
                x1: from.unwrap_or(0.0),
                x2: to.unwrap_or(length),
                w1,
                w2,
            }
        } else if let Some(p) = &l.point {
            let pv = src.q(p, Dim::Force, &format!("{field}.point"))?;
            let Some(x) = at else {
                return src.err(
                    p.span(),
                    &field,
                    "a point load needs at = \"...\" (its distance from the left end)",
                );
            };
            LoadKind::Point { x, p: pv }
        } else if let Some(mo) = &l.moment {
            let mv = src.q(mo, Dim::Moment, &format!("{field}.moment"))?;
            let Some(x) = at else {
                return src.err(
                    mo.span(),
                    &field,
                    "a point moment needs at = \"...\" (its distance from the left end)",
                );
            };
            LoadKind::Moment { x, m: mv }
        } else {
            return Err(Error::Internal("load kind".into()));
        };
        let tributary = match (&l.area, &l.width) {
            (Some(a), Some(w)) => Some((
                src.q(a, Dim::AreaLoad, &format!("{field}.area"))?,
                src.q(w, Dim::Length, &format!("{field}.width"))?,
            )),
            _ => None,
        };
        loads.push((
            Load {
                case,
                kind,
                label: field.clone(),
                tributary,
            },
            // A load off the beam is reported where its position is given.
            [
                ("case", Some(span0)),
                ("at", l.at.as_ref().map(|v| v.span())),
                ("from", l.from.as_ref().map(|v| v.span())),
                ("to", l.to.as_ref().map(|v| v.span())),
            ],
        ));
    }
    for (l, _) in &loads {
        beam.loads.push(l.clone());
    }
    // Combinations.
    for (i, c) in raw.combination.iter().enumerate() {
        let field = format!("combination[{}]", i + 1);
        let kind = match c.kind.as_ref().map(|k| k.get_ref().to_ascii_lowercase()) {
            None => {
                if c.limit.is_some() || c.max.is_some() {
                    ComboKind::Service
                } else {
                    ComboKind::Strength
                }
            }
            Some(k) if k == "strength" => ComboKind::Strength,
            Some(k) if k == "service" || k == "serviceability" => ComboKind::Service,
            Some(k) => {
                let sp = c.kind.as_ref().map(|s| s.span()).unwrap_or(c.name.span());
                return src.err(
                    sp,
                    &format!("{field}.kind"),
                    format!("unknown combination kind '{k}': expected strength or service"),
                );
            }
        };
        let mut factors = Vec::new();
        for (name, f) in c.factors.get_ref() {
            let Some(ci) = beam.cases.iter().position(|k| &k.name == name) else {
                return src.err(
                    c.factors.span(),
                    &format!("{field}.factors"),
                    format!(
                        "combination '{}' names unknown load case '{name}': expected one of {}",
                        c.name.get_ref(),
                        beam.cases
                            .iter()
                            .map(|c| c.name.as_str())
                            .collect::<Vec<_>>()
                            .join(", ")
                    ),
                );
            };
            if !(f.is_finite() && f.abs() <= crate::beam::model::MAX_FACTOR) {
                return src.err(
                    c.factors.span(),
                    &format!("{field}.factors"),
                    format!(
                        "factor {} for case '{name}': expected a finite number between −{m} and {m}",
                        crate::units::fmt_num(*f),
                        m = crate::beam::model::MAX_FACTOR
                    ),
                );
            }
            factors.push((ci, *f));
        }
        let ratio = c
            .limit
            .as_ref()
            .map(|l| {
                parse_ratio(l.get_ref())
                    .map_err(|e| e.at(&src.loc(l.span(), &format!("{field}.limit"))))
            })
            .transpose()?;
        let absolute = c
            .max
            .as_ref()
            .map(|l| src.q(l, Dim::Length, &format!("{field}.max")))
            .transpose()?;
        if kind == ComboKind::Service && ratio.is_none() && absolute.is_none() {
            return src.err(
                c.name.span(),
                &field,
                "a service combination needs limit = \"L/360\" and/or max = \"20 mm\"",
            );
        }
        if kind == ComboKind::Strength
            && let Some(sp) = c
                .limit
                .as_ref()
                .map(|l| l.span())
                .or(c.max.as_ref().map(|m| m.span()))
        {
            return src.err(
                sp,
                &field,
                "a strength combination does not check deflection, so its limit would be ignored: give it kind = \"service\", or add a separate service combination with the limit",
            );
        }

        beam.combinations.push(Combination {
            name: c.name.get_ref().clone(),
            kind,
            factors,
            limit: (kind == ComboKind::Service).then_some(DeflectionLimit { ratio, absolute }),
            source: None,
        });
    }
    if let Some(p) = &raw.presets {
        if let Some(s) = &p.strength {
            let pr = presets::strength(&beam.cases, s.get_ref())
                .map_err(|e| e.at(&src.loc(s.span(), "presets.strength")))?;
            beam.combinations.extend(pr.combinations);
            notes.extend(pr.notes);
            if presets::partial_snow(Some(s.get_ref())) {
                set_partial_snow(&mut beam, &explicit_pattern, &mut notes);
            }
        }
        if let Some(s) = &p.service {
            let pr = presets::service(&beam.cases, s.get_ref())
                .map_err(|e| e.at(&src.loc(s.span(), "presets.service")))?;
            beam.combinations.extend(pr.combinations);
            notes.extend(pr.notes);
        }
    }
    if !beam
        .combinations
        .iter()
        .any(|c| c.kind == ComboKind::Strength)
    {
        return Err(Error::input(
            Location::in_file(file).with_field("combination"),
            "the job has no strength combination: add [[combination]] tables or [presets] strength = \"asce7-16-asd\"",
        ));
    }
    // Checks.
    let mut criteria = Criteria::default();
    if let Some(c) = &raw.checks {
        if let Some(b) = &c.lateral_bracing {
            criteria.bracing = parse_bracing(b.get_ref())
                .map_err(|e| e.at(&src.loc(b.span(), "checks.lateral_bracing")))?;
        }
        if let Some(s) = &c.shear {
            criteria.shear = match s.get_ref().as_str() {
                "auto" => ShearMethod::Auto,
                "peak_vq" => ShearMethod::PeakVq,
                other => {
                    return src.err(
                        s.span(),
                        "checks.shear",
                        format!("unknown shear method '{other}': expected auto or peak_vq"),
                    );
                }
            };
        }
        if let Some(f) = &c.braced_flange {
            criteria.braced_flange = parse_braced_flange(f.get_ref())
                .map_err(|e| e.at(&src.loc(f.span(), "checks.braced_flange")))?;
        }
        if let Some(h) = &c.load_height {
            criteria.load_height = parse_load_height(h.get_ref())
                .map_err(|e| e.at(&src.loc(h.span(), "checks.load_height")))?;
        }
        if let Some(k) = &c.overhang_effective_length {
            criteria.overhang_k = Some(*k.get_ref());
        }
        if let Some(sw) = c.self_weight {
            criteria.self_weight = sw;
        }
        if let Some(list) = &c.exclude {
            for name in list.get_ref() {
                criteria
                    .exclude
                    .add(name.get_ref())
                    .map_err(|e| e.at(&src.loc(name.span(), "checks.exclude")))?;
            }
        }
        match (&c.creep_factor, &c.sustained_live) {
            (Some(k), s) => {
                criteria.long_term = Some(crate::check::LongTerm {
                    creep_factor: *k.get_ref(),
                    sustained_live: s.as_ref().map(|s| *s.get_ref()).unwrap_or(0.0),
                })
            }
            (None, Some(s)) => {
                return src.err(
                    s.span(),
                    "checks.sustained_live",
                    "sustained_live needs creep_factor (the long-term deflection factor K_cr)",
                );
            }
            (None, None) => {}
        }
    }
    // Check settings that would change nothing are refused, not ignored.
    if let Some(c) = &raw.checks {
        if let Some(f) = &c.braced_flange
            && !matches!(criteria.bracing, Bracing::Continuous | Bracing::Spacing(_))
        {
            return src.err(
                f.span(),
                "checks.braced_flange",
                "braced_flange says which flange the braces between supports restrain, but lateral_bracing gives none (braced at the supports only): set lateral_bracing = \"continuous\" or a spacing, or leave braced_flange out",
            );
        }
        if let Some(sh) = &c.shear
            && criteria.shear == ShearMethod::PeakVq
            && material.fv.is_none()
            && grades.iter().all(|(_, g)| g.fv.is_none())
        {
            return src.err(
                sh.span(),
                "checks.shear",
                "shear = \"peak_vq\" chooses how the stress checked against the allowable Fv is found, but no material gives Fv (steel shear is checked by AISC 360-16 G): give Fv, or leave shear out",
            );
        }
    }
    for (name, m) in
        std::iter::once(("material", &material)).chain(grades.iter().map(|(n, m)| (n.as_str(), m)))
    {
        let what = if name == "material" {
            "the job's material".to_string()
        } else {
            format!("the grade '{name}'")
        };
        if let Err(e) = criteria.fit(m.kind, &what) {
            let key = match &raw.checks {
                Some(c) if criteria.load_height == LoadHeight::TopFlange => c
                    .load_height
                    .as_ref()
                    .map(|h| (h.span(), "checks.load_height")),
                Some(c) => c
                    .overhang_effective_length
                    .as_ref()
                    .map(|k| (k.span(), "checks.overhang_effective_length")),
                None => None,
            };
            return Err(match key {
                Some((span, f)) => e.at(&src.loc(span, f)),
                None => e.at(&Location::in_file(file)),
            });
        }
    }
    if criteria.self_weight && beam.self_weight_case.is_none() {
        notes.push("no dead load case: the section's self-weight is not included".into());
    }
    // Validate the beam with locations for load errors.
    if let Err(e) = beam.validate() {
        if let Error::Input { location, .. } = &e
            && let Some(field) = &location.field
            && let Some((l, keys)) = loads.iter().find(|(l, _)| {
                field == &l.label
                    || field
                        .strip_prefix(l.label.as_str())
                        .is_some_and(|r| r.starts_with('.'))
            })
        {
            let Error::Input { message, .. } = e else {
                return Err(e);
            };
            // The key whose value is off the beam: `at`, or the end of a
            // distributed load that lies outside (`from` before 0, else
            // `to`); the case line when the position was defaulted.
            let length = beam.length();
            let want = match l.kind {
                LoadKind::Distributed { x1, .. } if x1 < 0.0 || x1 > length => "from",
                LoadKind::Distributed { .. } => "to",
                _ => "at",
            };
            let (key, span) = keys
                .iter()
                .find(|(k, sp)| *k == want && sp.is_some())
                .or_else(|| keys.first())
                .map(|(k, sp)| (*k, sp.clone().unwrap_or_default()))
                .unwrap_or(("case", 0..0));
            return Err(Error::input(
                src.loc(span, &format!("{}.{key}", l.label)),
                message,
            ));
        }
        return Err(e.at(&Location::in_file(file)));
    }
    Ok(Job {
        title: raw.title.unwrap_or_else(|| "beam".into()),
        beam,
        material,
        criteria,
        grades,
        currency: raw.currency.clone(),
        presets: (
            raw.presets
                .as_ref()
                .and_then(|p| p.strength.as_ref().map(|s| s.get_ref().clone())),
            raw.presets
                .as_ref()
                .and_then(|p| p.service.as_ref().map(|s| s.get_ref().clone())),
        ),
        notes,
    })
}

fn parse_material(
    src: &Source<'_>,
    m: &RawMaterial,
    table: &str,
    notes: &mut Vec<String>,
) -> Result<Material> {
    let file = src.file;
    let opt = |v: &Option<Spanned<String>>, name: &str| -> Result<Option<f64>> {
        v.as_ref()
            .map(|v| src.q(v, Dim::Stress, &format!("{table}.{name}")))
            .transpose()
    };
    let e = match &m.e {
        Some(v) => src.q(v, Dim::Stress, &format!("{table}.E"))?,
        None => {
            return Err(Error::input(
                src.table_loc(table, &format!("{table}.E")),
                format!(
                    "missing the modulus of elasticity: add E = \"...\" with a stress unit to [{table}]"
                ),
            ));
        }
    };
    let fy = opt(&m.fy, "Fy")?;
    let factor = |v: &Option<Spanned<f64>>| v.as_ref().map(|x| *x.get_ref());
    let timber = TimberFactors {
        e_min: opt(&m.e_min, "Emin")?,
        cd: factor(&m.cd),
        cm_fb: factor(&m.cm_fb),
        cm_fv: factor(&m.cm_fv),
        cm_e: factor(&m.cm_e),
        ct: factor(&m.ct),
        ci: factor(&m.ci),
        ct_e: factor(&m.ct_e),
        ci_e: factor(&m.ci_e),
        cf: factor(&m.cf),
        cr: factor(&m.cr),
        cfu: factor(&m.cfu),
    };
    let timber_given = timber != TimberFactors::default();
    let kind = match &m.kind {
        Some(k) => parse_kind(k.get_ref())
            .map_err(|e| e.at(&src.loc(k.span(), &format!("{table}.kind"))))?,
        None if fy.is_some() && !timber_given => {
            notes.push(format!(
                "[{table}] has no kind: taken as steel because Fy is given (AISC 360-16 limit states apply)"
            ));
            MaterialKind::Steel
        }
        None if timber_given => {
            notes.push(format!(
                "[{table}] has no kind: taken as timber because timber values (Emin or adjustment factors) are given"
            ));
            MaterialKind::Timber
        }
        None => {
            notes.push(format!(
                "[{table}] has no kind (steel, timber or other): no stability or local buckling method applies, so those are not verified unless excluded or not applicable"
            ));
            MaterialKind::Unspecified
        }
    };
    if timber_given && kind != MaterialKind::Timber {
        return Err(Error::input(
            src.table_loc(table, &format!("{table}.kind")),
            format!(
                "[{table}] gives timber values (Emin or adjustment factors) but kind is {}: expected kind = \"timber\"",
                kind.name()
            ),
        ));
    }
    let (fb, fbt, fbc) = (opt(&m.fb, "Fb")?, opt(&m.fbt, "Fbt")?, opt(&m.fbc, "Fbc")?);
    let (fb_tension, fb_compression) = match (fb, fbt, fbc) {
        (_, Some(t), Some(c)) => (Some(t), Some(c)),
        (Some(b), t, c) => (Some(t.unwrap_or(b)), Some(c.unwrap_or(b))),
        (None, None, None) if kind == MaterialKind::Steel && fy.is_some() => (None, None),
        _ => {
            return Err(Error::input(
                src.table_loc(table, &format!("{table}.Fb")),
                format!(
                    "missing the allowable bending stress: add Fb = \"...\" (or both Fbt and Fbc) to [{table}] (steel with Fy may omit it: AISC 360-16 Chapter F then gives the bending strength)"
                ),
            ));
        }
    };
    let density = match &m.density {
        Some(v) => src.q(v, Dim::Density, &format!("{table}.density"))?,
        None => {
            notes.push("no density given: the section's self-weight is not included unless a catalogue row gives its mass".into());
            0.0
        }
    };
    let mat = Material {
        name: m.name.clone().unwrap_or_else(|| "material".into()),
        kind,
        e,
        fb_tension,
        fb_compression,
        fv: opt(&m.fv, "Fv")?,
        fy,
        density,
        timber,
    };
    mat.validate().map_err(|e| {
        // The problem is at the key it names ("material.Fb (tension)"),
        // in this table.
        let Error::Input { location, message } = e else {
            return e.at(&Location::in_file(file));
        };
        let key = location
            .field
            .as_deref()
            .and_then(|f| f.strip_prefix("material."))
            .unwrap_or("");
        let key = key.split(' ').next().unwrap_or("");
        let stress = |v: &Option<Spanned<String>>| v.as_ref().map(|v| v.span());
        let num = |v: &Option<Spanned<f64>>| v.as_ref().map(|v| v.span());
        let span = match key {
            "E" => stress(&m.e),
            "Fb" => stress(&m.fb).or(stress(&m.fbt)).or(stress(&m.fbc)),
            "Fv" => stress(&m.fv),
            "Fy" => stress(&m.fy),
            "Emin" => stress(&m.e_min),
            "density" => stress(&m.density),
            "CD" => num(&m.cd),
            "CM_Fb" => num(&m.cm_fb),
            "CM_Fv" => num(&m.cm_fv),
            "CM_E" => num(&m.cm_e),
            "Ct" => num(&m.ct),
            "Ci" => num(&m.ci),
            "Ct_E" => num(&m.ct_e),
            "Ci_E" => num(&m.ci_e),
            "CF" => num(&m.cf),
            "Cr" => num(&m.cr),
            "Cfu" => num(&m.cfu),
            _ => None,
        };
        let field = format!("{table}.{key}");
        let at = match span {
            Some(sp) => src.loc(sp, &field),
            None => src.table_loc(table, &field),
        };
        Error::input(at, message)
    })?;
    Ok(mat)
}

/// Combinations for a beam built from flags or a schedule row (see
/// [`crate::beam::presets::standard`]); the notes go with the job.
pub fn standard_combinations(
    beam: &mut Beam,
    strength: Option<&str>,
    service: Option<&str>,
    n_live: f64,
    n_total: f64,
) -> Result<Vec<String>> {
    presets::standard(beam, strength, service, n_live, n_total)
}
