//! The job from flag values, for the common single- and multi-span cases,
//! or a job file with the material and check values replaced: what a front
//! end gives as plain text (each value with its unit, as typed), built and
//! validated here. The option names (`--span`, ...) are the words every
//! message uses.
//!
//! One rule with a job file: the values that describe the beam, its loads
//! and its combinations (--span, --supports, --dead, --live, --snow,
//! --dead-point, --live-point, --preset, --limit-live, --limit-total) are
//! refused — the job file holds them; the values about the material and
//! the checks (--E, --Fb, --Fv, --Fy, --Emin, --kind, --density, --bracing,
//! --braced-flange, --load-height, --exclude, --no-self-weight) replace the
//! job's values, and the job's notes list what came from the command line.

use super::Job;
use crate::beam::model::{Beam, Category, LoadKind};
use crate::check::{Criteria, Material};
use crate::error::{Error, Result};
use crate::units::{self, Dim};
use std::path::PathBuf;

/// The flag values, each as typed with its unit (`None` or empty: not
/// given). Each field is the option named in its comment, and in every
/// message about it.
#[derive(Debug, Clone, Default)]
pub struct JobFlags {
    /// `--job`: the job file; the beam values below are then refused.
    pub job: Option<PathBuf>,
    /// `--span`: lengths, left to right, comma-separated.
    pub span: Option<String>,
    /// `--supports`: one per node, comma-separated (default: all pinned).
    pub supports: Option<String>,
    /// `--dead`, `--live`, `--snow`: uniform loads over the whole beam.
    pub dead: Option<String>,
    pub live: Option<String>,
    pub snow: Option<String>,
    /// `--dead-point`, `--live-point`: point loads as FORCE@X.
    pub dead_point: Vec<String>,
    pub live_point: Vec<String>,
    /// `--E`, `--Fb`, `--Fv`, `--Fy`: stresses.
    pub e: Option<String>,
    pub fb: Option<String>,
    pub fv: Option<String>,
    pub fy: Option<String>,
    /// `--density`: for the self-weight.
    pub density: Option<String>,
    /// `--Emin`: the stability modulus (timber only).
    pub e_min: Option<String>,
    /// `--kind`: steel, timber or other.
    pub kind: Option<String>,
    /// `--preset`: the strength combinations.
    pub preset: Option<String>,
    /// `--limit-live`, `--limit-total`: deflection limits as L/n.
    pub limit_live: Option<String>,
    pub limit_total: Option<String>,
    /// `--bracing`, `--braced-flange`, `--load-height`: lateral stability.
    pub bracing: Option<String>,
    pub braced_flange: Option<String>,
    pub load_height: Option<String>,
    /// `--exclude`: limit states checked by others, comma-separated.
    pub exclude: Option<String>,
    /// `--no-self-weight`: leave out the section's self-weight.
    pub no_self_weight: bool,
}

fn flag<T>(r: Result<T>, name: &str) -> Result<T> {
    r.map_err(|e| e.in_field(name))
}

/// A stress option, if given.
fn stress(v: &Option<String>, name: &str) -> Result<Option<f64>> {
    v.as_deref()
        .map(|t| flag(units::parse(t, Dim::Stress), name))
        .transpose()
}

/// The names of the options given, in order.
fn given<const N: usize>(options: [(bool, &'static str); N]) -> Vec<&'static str> {
    options.into_iter().filter(|o| o.0).map(|o| o.1).collect()
}

impl JobFlags {
    /// The system the material values were typed in (from --E, else SI),
    /// for the words of their problems.
    fn typed_system(&self) -> crate::units::System {
        self.e
            .as_deref()
            .map_or(crate::units::System::Si, crate::units::typed_stress_system)
    }

    /// The options that describe the beam, loads or combinations (refused
    /// with --job), by name.
    fn beam_flags(&self) -> Vec<&'static str> {
        given([
            (self.span.is_some(), "--span"),
            (self.supports.is_some(), "--supports"),
            (self.dead.is_some(), "--dead"),
            (self.live.is_some(), "--live"),
            (self.snow.is_some(), "--snow"),
            (!self.dead_point.is_empty(), "--dead-point"),
            (!self.live_point.is_empty(), "--live-point"),
            (self.preset.is_some(), "--preset"),
            (self.limit_live.is_some(), "--limit-live"),
            (self.limit_total.is_some(), "--limit-total"),
        ])
    }

    /// The options that only matter to section checks (refused by
    /// `analyse`, which checks no section).
    fn check_flags(&self) -> Vec<&'static str> {
        given([
            (self.fb.is_some(), "--Fb"),
            (self.fv.is_some(), "--Fv"),
            (self.fy.is_some(), "--Fy"),
            (self.e_min.is_some(), "--Emin"),
            (self.kind.is_some(), "--kind"),
            (self.bracing.is_some(), "--bracing"),
            (self.braced_flange.is_some(), "--braced-flange"),
            (self.load_height.is_some(), "--load-height"),
            (self.exclude.is_some(), "--exclude"),
        ])
    }

    /// Build the job for `analyse`: options that only affect section checks
    /// are refused, and the allowable bending stress is not needed.
    pub fn load_for_analysis(&self) -> Result<Job> {
        let refused = self.check_flags();
        if !refused.is_empty() {
            return Err(Error::msg(format!(
                "{} only affect(s) section checks: analyse checks no section (use `beamsift check`)",
                refused.join(", ")
            )));
        }
        if self.job.is_some() {
            return self.load();
        }
        // An allowable is needed to build a material; it is never used here.
        let mut me = self.clone();
        me.fb = Some("1MPa".into());
        let mut job = me.build_from_flags()?;
        job.material.fb_tension = None;
        job.material.fb_compression = None;
        job.material.name = "as given by flags (stiffness and density only)".into();
        job.notes.retain(|n| !n.contains("--kind"));
        Ok(job)
    }

    /// Whether the options ask for self-weight settings (which need a
    /// section's area to mean anything).
    pub fn self_weight_flags(&self) -> Vec<&'static str> {
        given([
            (self.density.is_some(), "--density"),
            (self.no_self_weight, "--no-self-weight"),
        ])
    }

    /// Build the job (reading the job file if one is named).
    pub fn load(&self) -> Result<Job> {
        if let Some(path) = &self.job {
            let refused = self.beam_flags();
            if !refused.is_empty() {
                return Err(Error::msg(format!(
                    "{} describe(s) the beam, its loads or its combinations, which the job file holds: edit the job file, or give the beam by flags without --job",
                    refused.join(", ")
                )));
            }
            let shown = path.display().to_string();
            let text = super::read_text(path, &shown)?;
            let mut job = super::from_toml(&text, &shown)?;
            let (material, checks) = self.apply_overrides(&mut job.material, &mut job.criteria)?;
            if !material.is_empty() {
                job.notes.push(format!(
                    "from the command line, replacing the job file's material values: {}{}",
                    material.join(", "),
                    if job.grades.is_empty() {
                        ""
                    } else {
                        " (rows without a grade only: catalogue rows with a grade keep their grade's values)"
                    }
                ));
            }
            if !checks.is_empty() {
                job.notes.push(format!(
                    "from the command line, replacing the job file's check settings: {}",
                    checks.join(", ")
                ));
            }
            for (name, g) in &job.grades {
                job.criteria
                    .fit(g.kind, &format!("the grade '{name}'"))
                    .map_err(|e| e.in_field("--load-height"))?;
            }
            self.refuse_idle_bracing(&job.criteria)?;
            return Ok(job);
        }
        let job = self.build_from_flags()?;
        self.refuse_idle_bracing(&job.criteria)?;
        Ok(job)
    }

    /// --braced-flange with no braces between supports would change nothing.
    fn refuse_idle_bracing(&self, c: &Criteria) -> Result<()> {
        if self.braced_flange.is_some()
            && !matches!(
                c.bracing,
                crate::check::Bracing::Continuous | crate::check::Bracing::Spacing(_)
            )
        {
            return Err(Error::msg(
                "--braced-flange says which flange the braces between supports restrain, but the bracing is at the supports only: give --bracing continuous or a spacing, or leave --braced-flange out",
            ));
        }
        Ok(())
    }

    /// Apply the material and check options; returns what was set, in
    /// words: (material options, check options).
    fn apply_overrides(
        &self,
        m: &mut Material,
        c: &mut Criteria,
    ) -> Result<(Vec<String>, Vec<String>)> {
        let mut set = Vec::new();
        let mut checks = Vec::new();
        if let Some(k) = &self.kind {
            m.kind = flag(super::parse_kind(k), "--kind")?;
            set.push(format!("--kind {k}"));
        }
        if let Some(v) = stress(&self.e, "--E")? {
            m.e = v;
            set.push(format!("--E {}", self.e.as_deref().unwrap_or("")));
        }
        if let Some(v) = stress(&self.fb, "--Fb")? {
            m.fb_tension = Some(v);
            m.fb_compression = Some(v);
            set.push(format!("--Fb {}", self.fb.as_deref().unwrap_or("")));
        }
        if let Some(v) = stress(&self.fv, "--Fv")? {
            m.fv = Some(v);
            set.push(format!("--Fv {}", self.fv.as_deref().unwrap_or("")));
        }
        if let Some(v) = stress(&self.fy, "--Fy")? {
            m.fy = Some(v);
            set.push(format!("--Fy {}", self.fy.as_deref().unwrap_or("")));
        }
        if let Some(v) = stress(&self.e_min, "--Emin")? {
            if m.kind != crate::check::MaterialKind::Timber {
                return Err(Error::msg(format!(
                    "--Emin is a timber value, but the material is {}: give --kind timber too, or leave --Emin out",
                    m.kind.name()
                )));
            }
            m.timber.e_min = Some(v);
            set.push(format!("--Emin {}", self.e_min.as_deref().unwrap_or("")));
        }
        if let Some(t) = &self.density {
            m.density = flag(units::parse(t, Dim::Density), "--density")?;
            set.push(format!("--density {t}"));
        }
        if let Some(b) = &self.bracing {
            c.bracing = flag(super::parse_bracing(b), "--bracing")?;
            checks.push(format!("--bracing {b}"));
        }
        if let Some(b) = &self.braced_flange {
            c.braced_flange = flag(super::parse_braced_flange(b), "--braced-flange")?;
            checks.push(format!("--braced-flange {b}"));
        }
        if let Some(h) = &self.load_height {
            c.load_height = flag(super::parse_load_height(h), "--load-height")?;
            checks.push(format!("--load-height {h}"));
        }
        if let Some(list) = &self.exclude {
            for name in list.split(',').filter(|n| !n.trim().is_empty()) {
                flag(c.exclude.add(name), "--exclude")?;
            }
            checks.push(format!("--exclude {list}"));
        }
        if self.no_self_weight {
            c.self_weight = false;
            checks.push("--no-self-weight".into());
        }
        m.validate_in(self.typed_system())?;
        Ok((set, checks))
    }

    fn build_from_flags(&self) -> Result<Job> {
        let span = self.span.as_deref().ok_or_else(|| {
            Error::msg("no beam given: use --job FILE, or --span with loads and material flags (see --help)")
        })?;
        let spans = span
            .split(',')
            .map(|s| units::parse(s, Dim::Length))
            .collect::<Result<Vec<_>>>()
            .map_err(|e| e.in_field("--span"))?;
        let supports = match &self.supports {
            Some(s) => s
                .split(',')
                .map(super::parse_support)
                .collect::<Result<Vec<_>>>()
                .map_err(|e| e.in_field("--supports"))?,
            None => vec![crate::beam::Support::Pinned; spans.len() + 1],
        };
        if supports.len() != spans.len() + 1 {
            return Err(Error::msg(format!(
                "{} span(s) need {} supports in --supports, one at each node; {} given",
                spans.len(),
                spans.len() + 1,
                supports.len()
            ))
            .in_field("--supports"));
        }
        let mut beam = Beam::new(spans, supports);
        let length = beam.length();
        let d = beam.case("D", Category::Dead);
        beam.self_weight_case = Some(d);
        let uniform = |beam: &mut Beam, case: usize, text: &str, name: &str| -> Result<()> {
            let w = flag(units::parse(text, Dim::LineLoad), name)?;
            beam.load(
                case,
                LoadKind::Distributed {
                    x1: 0.0,
                    x2: length,
                    w1: w,
                    w2: w,
                },
            );
            Ok(())
        };
        let point = |beam: &mut Beam, case: usize, text: &str, name: &str| -> Result<()> {
            let (p, x) = text.split_once('@').ok_or_else(|| {
                Error::msg(format!("'{text}' is not FORCE@X, e.g. 12kN@2.5m")).in_field(name)
            })?;
            let p = flag(units::parse(p, Dim::Force), name)?;
            let x = flag(units::parse(x, Dim::Length), name)?;
            beam.load(case, LoadKind::Point { x, p });
            Ok(())
        };
        if let Some(t) = &self.dead {
            uniform(&mut beam, d, t, "--dead")?;
        }
        for t in &self.dead_point {
            point(&mut beam, d, t, "--dead-point")?;
        }
        if self.live.is_some() || !self.live_point.is_empty() {
            let l = beam.case("L", Category::Live);
            if let Some(t) = &self.live {
                uniform(&mut beam, l, t, "--live")?;
            }
            for t in &self.live_point {
                point(&mut beam, l, t, "--live-point")?;
            }
        }
        if let Some(t) = &self.snow {
            let s = beam.case("S", Category::Snow);
            uniform(&mut beam, s, t, "--snow")?;
        }
        for (i, l) in beam.loads.iter_mut().enumerate() {
            l.label = format!("load {}", i + 1);
        }
        let n_live = flag(
            super::parse_ratio(self.limit_live.as_deref().unwrap_or("L/360")),
            "--limit-live",
        )?;
        let n_total = flag(
            super::parse_ratio(self.limit_total.as_deref().unwrap_or("L/240")),
            "--limit-total",
        )?;
        let mut notes = flag(
            super::standard_combinations(&mut beam, self.preset.as_deref(), None, n_live, n_total),
            "--preset",
        )?;
        if crate::beam::presets::partial_snow(self.preset.as_deref()) {
            super::set_partial_snow(&mut beam, &[], &mut notes);
        }
        let e = stress(&self.e, "--E")?.ok_or_else(|| {
            Error::msg("missing the modulus of elasticity: add --E (e.g. --E 200GPa)")
        })?;
        let fy = stress(&self.fy, "--Fy")?;
        let kind = match &self.kind {
            Some(k) => flag(super::parse_kind(k), "--kind")?,
            None if fy.is_some() => {
                notes.push("no --kind: taken as steel because --Fy is given (AISC 360-16 limit states apply)".to_string());
                crate::check::MaterialKind::Steel
            }
            None if self.e_min.is_some() => crate::check::MaterialKind::Timber,
            None => {
                notes.push("no --kind (steel, timber or other): no stability or local buckling method applies, so those are not verified unless excluded or not applicable".to_string());
                crate::check::MaterialKind::Unspecified
            }
        };
        let fb = stress(&self.fb, "--Fb")?;
        if fb.is_none() && !(kind == crate::check::MaterialKind::Steel && fy.is_some()) {
            return Err(Error::msg(
                "missing the allowable bending stress: add --Fb (e.g. --Fb 165MPa); steel with --Fy may omit it",
            ));
        }
        let density = match &self.density {
            Some(t) => flag(units::parse(t, Dim::Density), "--density")?,
            None => {
                notes.push(
                    "no --density given: the self-weight of the section is not included".into(),
                );
                0.0
            }
        };
        let mut material = Material {
            name: "as given by flags".into(),
            kind,
            e,
            fb_tension: fb,
            fb_compression: fb,
            fv: stress(&self.fv, "--Fv")?,
            fy,
            density,
            timber: Default::default(),
        };
        material.timber.e_min = stress(&self.e_min, "--Emin")?;
        if material.timber.e_min.is_some() && material.kind != crate::check::MaterialKind::Timber {
            return Err(Error::msg(format!(
                "--Emin is a timber value, but the material is {}: leave --kind out or give --kind timber",
                material.kind.name()
            )));
        }
        let mut criteria = Criteria::default();
        if let Some(b) = &self.bracing {
            criteria.bracing = flag(super::parse_bracing(b), "--bracing")?;
        }
        if let Some(b) = &self.braced_flange {
            criteria.braced_flange = flag(super::parse_braced_flange(b), "--braced-flange")?;
        }
        if let Some(h) = &self.load_height {
            criteria.load_height = flag(super::parse_load_height(h), "--load-height")?;
        }
        if let Some(list) = &self.exclude {
            for name in list.split(',').filter(|n| !n.trim().is_empty()) {
                flag(criteria.exclude.add(name), "--exclude")?;
            }
        }
        criteria.self_weight = !self.no_self_weight;
        material.validate_in(self.typed_system())?;
        beam.validate()?;
        Ok(Job {
            title: "beam from flags".into(),
            project: super::Project::default(),
            beam,
            material,
            criteria,
            grades: Vec::new(),
            currency: None,
            presets: (self.preset.clone(), None),
            notes,
        })
    }
}
