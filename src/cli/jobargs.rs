//! The job options, parsed: the values go to [`JobFlags`], which builds
//! the job (and states the rules with `--job`).

use beamsift::error::Result;
use beamsift::job::{Job, JobFlags};
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

impl JobArgs {
    /// The values as given, for the library.
    pub fn flags(&self) -> JobFlags {
        JobFlags {
            job: self.job.clone(),
            span: self.span.clone(),
            supports: self.supports.clone(),
            dead: self.dead.clone(),
            live: self.live.clone(),
            snow: self.snow.clone(),
            dead_point: self.dead_point.clone(),
            live_point: self.live_point.clone(),
            e: self.e.clone(),
            fb: self.fb.clone(),
            fv: self.fv.clone(),
            fy: self.fy.clone(),
            density: self.density.clone(),
            e_min: self.e_min.clone(),
            kind: self.kind.clone(),
            preset: self.preset.clone(),
            limit_live: self.limit_live.clone(),
            limit_total: self.limit_total.clone(),
            bracing: self.bracing.clone(),
            braced_flange: self.braced_flange.clone(),
            load_height: self.load_height.clone(),
            exclude: self.exclude.clone(),
            no_self_weight: self.no_self_weight,
        }
    }

    /// The job for `analyse` (see [`JobFlags::load_for_analysis`]).
    pub fn load_for_analysis(&self) -> Result<Job> {
        self.flags().load_for_analysis()
    }

    /// The self-weight options given (see [`JobFlags::self_weight_flags`]).
    pub fn self_weight_flags(&self) -> Vec<&'static str> {
        self.flags().self_weight_flags()
    }

    /// The job (see [`JobFlags::load`]).
    pub fn load(&self) -> Result<Job> {
        self.flags().load()
    }
}
