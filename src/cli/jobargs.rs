//! The job, from a TOML file or from flags for the common single- and
//! multi-span cases.
//!
//! One rule with `--job`: the options that describe the beam, its loads and
//! its combinations (--span, --supports, --dead, --live, --snow,
//! --dead-point, --live-point, --preset, --limit-live, --limit-total) are
//! refused — the job file holds them; the options about the material and
//! the checks (--E, --Fb, --Fv, --Fy, --Emin, --kind, --density, --bracing,
//! --braced-flange, --load-height, --exclude, --no-self-weight) replace the
//! job's values, and every output lists what came from the command line.

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
    /// Stability modulus of timber, for the beam stability factor (e.g. 4.4GPa).
    #[arg(long = "Emin", value_name = "STRESS")]
    pub e_min: Option<String>,
    /// Kind of material: steel (AISC 360-16 limit states, needs --Fy), timber
    /// (NDS, needs --Emin for stability) or other (default: steel when --Fy is given).
    #[arg(long, value_name = "KIND")]
    pub kind: Option<String>,
    /// Strength combinations preset (asce7-16-asd); default D and D+L+S.
    #[arg(long, value_name = "NAME")]
    pub preset: Option<String>,
    /// Deflection limit under live (or snow) load alone [default: L/360].
    #[arg(long = "limit-live", value_name = "L/n")]
    pub limit_live: Option<String>,
    /// Deflection limit under the total load [default: L/240].
    #[arg(long = "limit-total", value_name = "L/n")]
    pub limit_total: Option<String>,
    /// Lateral bracing: continuous, supports, or a brace spacing (default: supports only).
    #[arg(long, value_name = "BRACING")]
    pub bracing: Option<String>,
    /// Which flange the braces restrain: top (default) or both.
    #[arg(long = "braced-flange", value_name = "FLANGE")]
    pub braced_flange: Option<String>,
    /// Where the loads act for lateral stability: shear_centre (default) or top_flange.
    #[arg(long = "load-height", value_name = "HEIGHT")]
    pub load_height: Option<String>,
    /// Limit states checked by others, comma-separated: shear, deflection,
    /// lateral_torsional_buckling, local_buckling (listed as excluded on every output).
    #[arg(long, value_name = "LIST")]
    pub exclude: Option<String>,
    /// Leave out the section's self-weight.
    #[arg(long = "no-self-weight")]
    pub no_self_weight: bool,
}

fn flag<T>(r: Result<T>, name: &str) -> Result<T> {
    r.map_err(|e| e.in_field(name))
}

impl JobArgs {
    /// The options that describe the beam, loads or combinations (refused
    /// with --job), by name.
    fn beam_flags(&self) -> Vec<&'static str> {
        let mut v = Vec::new();
        for (given, name) in [
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
        ] {
            if given {
                v.push(name);
            }
        }
        v
    }

    /// The options that only matter to section checks (refused by
    /// `analyse`, which checks no section).
    fn check_flags(&self) -> Vec<&'static str> {
        let mut v = Vec::new();
        for (given, name) in [
            (self.fb.is_some(), "--Fb"),
            (self.fv.is_some(), "--Fv"),
            (self.fy.is_some(), "--Fy"),
            (self.e_min.is_some(), "--Emin"),
            (self.kind.is_some(), "--kind"),
            (self.bracing.is_some(), "--bracing"),
            (self.braced_flange.is_some(), "--braced-flange"),
            (self.load_height.is_some(), "--load-height"),
            (self.exclude.is_some(), "--exclude"),
        ] {
            if given {
                v.push(name);
            }
        }
        v
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
        let mut v = Vec::new();
        if self.density.is_some() {
            v.push("--density");
        }
        if self.no_self_weight {
            v.push("--no-self-weight");
        }
        v
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
            let text = beamsift::job::read_text(path, &shown)?;
            let mut job = job::from_toml(&text, &shown)?;
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
                beamsift::check::Bracing::Continuous | beamsift::check::Bracing::Spacing(_)
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
        let stress = |v: &Option<String>, name: &str| -> Result<Option<f64>> {
            v.as_deref()
                .map(|t| flag(units::parse(t, Dim::Stress), name))
                .transpose()
        };
        if let Some(k) = &self.kind {
            m.kind = flag(job::parse_kind(k), "--kind")?;
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
            if m.kind != beamsift::check::MaterialKind::Timber {
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
            c.bracing = flag(job::parse_bracing(b), "--bracing")?;
            checks.push(format!("--bracing {b}"));
        }
        if let Some(b) = &self.braced_flange {
            c.braced_flange = flag(job::parse_braced_flange(b), "--braced-flange")?;
            checks.push(format!("--braced-flange {b}"));
        }
        if let Some(h) = &self.load_height {
            c.load_height = flag(job::parse_load_height(h), "--load-height")?;
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
        m.validate()?;
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
        let n_live = flag(
            job::parse_ratio(self.limit_live.as_deref().unwrap_or("L/360")),
            "--limit-live",
        )?;
        let n_total = flag(
            job::parse_ratio(self.limit_total.as_deref().unwrap_or("L/240")),
            "--limit-total",
        )?;
        let mut notes = flag(
            job::standard_combinations(&mut beam, self.preset.as_deref(), None, n_live, n_total),
            "--preset",
        )?;
        if beamsift::beam::presets::partial_snow(self.preset.as_deref()) {
            job::set_partial_snow(&mut beam, &[], &mut notes);
        }
        let stress = |v: &Option<String>, name: &str| -> Result<Option<f64>> {
            v.as_deref()
                .map(|t| flag(units::parse(t, Dim::Stress), name))
                .transpose()
        };
        let e = stress(&self.e, "--E")?.ok_or_else(|| {
            Error::msg("missing the modulus of elasticity: add --E (e.g. --E 200GPa)")
        })?;
        let fy = stress(&self.fy, "--Fy")?;
        let kind = match &self.kind {
            Some(k) => flag(job::parse_kind(k), "--kind")?,
            None if fy.is_some() => {
                notes.push("no --kind: taken as steel because --Fy is given (AISC 360-16 limit states apply)".to_string());
                beamsift::check::MaterialKind::Steel
            }
            None if self.e_min.is_some() => beamsift::check::MaterialKind::Timber,
            None => {
                notes.push("no --kind (steel, timber or other): no stability or local buckling method applies, so those are not verified unless excluded or not applicable".to_string());
                beamsift::check::MaterialKind::Unspecified
            }
        };
        let fb = stress(&self.fb, "--Fb")?;
        if fb.is_none() && !(kind == beamsift::check::MaterialKind::Steel && fy.is_some()) {
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
        if material.timber.e_min.is_some() && material.kind != beamsift::check::MaterialKind::Timber
        {
            return Err(Error::msg(format!(
                "--Emin is a timber value, but the material is {}: leave --kind out or give --kind timber",
                material.kind.name()
            )));
        }
        let mut criteria = Criteria::default();
        if let Some(b) = &self.bracing {
            criteria.bracing = flag(job::parse_bracing(b), "--bracing")?;
        }
        if let Some(b) = &self.braced_flange {
            criteria.braced_flange = flag(job::parse_braced_flange(b), "--braced-flange")?;
        }
        if let Some(h) = &self.load_height {
            criteria.load_height = flag(job::parse_load_height(h), "--load-height")?;
        }
        if let Some(list) = &self.exclude {
            for name in list.split(',').filter(|n| !n.trim().is_empty()) {
                flag(criteria.exclude.add(name), "--exclude")?;
            }
        }
        criteria.self_weight = !self.no_self_weight;
        material.validate()?;
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
