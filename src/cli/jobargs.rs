//! The job, from a TOML file or from flags for the common single- and
//! multi-span cases.

use beamsift::beam::model::{Beam, Category, LoadKind};
use beamsift::check::{Criteria, Material};
use beamsift::error::{Error, Result};
use beamsift::job::{self, Job};
use beamsift::units::{self, Dim};
use std::path::PathBuf;

#[derive(clap::Args, Debug, Clone, Default)]
pub struct JobArgs {
    /// Job file (TOML) describing spans, supports, loads, combinations and material.
    #[arg(long, short = 'j', value_name = "FILE")]
    pub job: Option<PathBuf>,
    /// Span lengths, left to right, comma-separated (e.g. 6m or 4.2m,4.2m).
    #[arg(long, value_name = "LENGTHS")]
    pub span: Option<String>,
    /// Supports at every node, comma-separated: pinned, roller, fixed, free
    /// (default: pinned at every node; a cantilever is `fixed,free`).
    #[arg(long, value_name = "LIST")]
    pub supports: Option<String>,
    /// Uniform dead load over the whole beam (e.g. 1.2kN/m).
    #[arg(long, value_name = "LOAD")]
    pub dead: Option<String>,
    /// Uniform live load over the whole beam (patterned by span).
    #[arg(long, value_name = "LOAD")]
    pub live: Option<String>,
    /// Uniform snow load over the whole beam.
    #[arg(long, value_name = "LOAD")]
    pub snow: Option<String>,
    /// Point dead load as FORCE@X (e.g. 12kN@2.5m); repeatable.
    #[arg(long = "dead-point", value_name = "FORCE@X")]
    pub dead_point: Vec<String>,
    /// Point live load as FORCE@X; repeatable.
    #[arg(long = "live-point", value_name = "FORCE@X")]
    pub live_point: Vec<String>,
    /// Modulus of elasticity (e.g. 200GPa, 29000ksi, 11GPa).
    #[arg(long = "E", value_name = "STRESS")]
    pub e: Option<String>,
    /// Allowable bending stress (both fibres).
    #[arg(long = "Fb", value_name = "STRESS")]
    pub fb: Option<String>,
    /// Allowable shear stress.
    #[arg(long = "Fv", value_name = "STRESS")]
    pub fv: Option<String>,
    /// Yield stress (steel; enables lateral-torsional buckling with --bracing).
    #[arg(long = "Fy", value_name = "STRESS")]
    pub fy: Option<String>,
    /// Density of the material, for self-weight (e.g. 7850kg/m3, 500kg/m3).
    #[arg(long, value_name = "DENSITY")]
    pub density: Option<String>,
    /// Strength combinations preset (asce7-16-asd); default D and D+L+S.
    #[arg(long, value_name = "NAME")]
    pub preset: Option<String>,
    /// Deflection limit under live (or snow) load alone.
    #[arg(long = "limit-live", value_name = "L/n", default_value = "L/360")]
    pub limit_live: String,
    /// Deflection limit under the total load.
    #[arg(long = "limit-total", value_name = "L/n", default_value = "L/240")]
    pub limit_total: String,
    /// Lateral bracing of the compression flange: continuous, supports, or a brace spacing.
    #[arg(long, value_name = "BRACING")]
    pub bracing: Option<String>,
    /// Leave out the section's self-weight.
    #[arg(long = "no-self-weight")]
    pub no_self_weight: bool,
}

fn flag<T>(r: Result<T>, name: &str) -> Result<T> {
    r.map_err(|e| e.in_field(name))
}

impl JobArgs {
    fn any_beam_flag(&self) -> bool {
        self.span.is_some()
            || self.supports.is_some()
            || self.dead.is_some()
            || self.live.is_some()
            || self.snow.is_some()
            || !self.dead_point.is_empty()
            || !self.live_point.is_empty()
    }

    /// Build the job (reading the job file if one is named).
    pub fn load(&self) -> Result<Job> {
        if let Some(path) = &self.job {
            if self.any_beam_flag() {
                return Err(Error::msg(
                    "give the beam either in a job file (--job) or by flags (--span, --dead, ...), not both",
                ));
            }
            let shown = path.display().to_string();
            let text = beamsift::job::read_text(path, &shown)?;
            let mut job = job::from_toml(&text, &shown)?;
            if let Some(b) = &self.bracing {
                job.criteria.bracing = flag(job::parse_bracing(b), "--bracing")?;
            }
            if self.no_self_weight {
                job.criteria.self_weight = false;
            }
            return Ok(job);
        }
        self.build_from_flags()
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
                .map(job::parse_support)
                .collect::<Result<Vec<_>>>()
                .map_err(|e| e.in_field("--supports"))?,
            None => vec![beamsift::beam::Support::Pinned; spans.len() + 1],
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
        let n_live = flag(job::parse_ratio(&self.limit_live), "--limit-live")?;
        let n_total = flag(job::parse_ratio(&self.limit_total), "--limit-total")?;
        flag(
            job::standard_combinations(&mut beam, self.preset.as_deref(), None, n_live, n_total),
            "--preset",
        )?;
        let stress = |v: &Option<String>, name: &str| -> Result<Option<f64>> {
            v.as_deref()
                .map(|t| flag(units::parse(t, Dim::Stress), name))
                .transpose()
        };
        let e = stress(&self.e, "--E")?.ok_or_else(|| {
            Error::msg("missing the modulus of elasticity: add --E (e.g. --E 200GPa)")
        })?;
        let fb = stress(&self.fb, "--Fb")?.ok_or_else(|| {
            Error::msg("missing the allowable bending stress: add --Fb (e.g. --Fb 165MPa)")
        })?;
        let mut notes = Vec::new();
        let density = match &self.density {
            Some(t) => flag(units::parse(t, Dim::Density), "--density")?,
            None => {
                notes.push(
                    "no --density given: the self-weight of the section is not included".into(),
                );
                0.0
            }
        };
        let material = Material {
            name: "as given by flags".into(),
            e,
            fb_tension: fb,
            fb_compression: fb,
            fv: stress(&self.fv, "--Fv")?,
            fy: stress(&self.fy, "--Fy")?,
            density,
        };
        let mut criteria = Criteria::default();
        if let Some(b) = &self.bracing {
            criteria.bracing = flag(job::parse_bracing(b), "--bracing")?;
        }
        criteria.self_weight = !self.no_self_weight;
        beam.validate()?;
        Ok(Job {
            title: "beam from flags".into(),
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
