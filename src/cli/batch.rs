//! `beamsift batch`: size a member schedule against a catalogue, with a
//! bill of quantities and optional rationalisation to k sizes.

use super::catargs::CatalogArgs;
use super::output::emit_data;
use super::{EXIT_FAILS, Out};
use beamsift::catalog::{Materials, Prices, Schema};
use beamsift::error::{Error, Result};
use beamsift::job;
use beamsift::report::{
    self,
    batch::{BatchView, document},
};
use beamsift::search::{self, batch};
use serde::Serialize;
use std::path::PathBuf;

pub const EXAMPLES: &str = "Examples:
  beamsift batch --schedule catalogs/demo-schedule.csv --job catalogs/demo-template.toml --catalog catalogs/demo-steel.csv
  beamsift batch --schedule catalogs/demo-schedule.csv --job catalogs/demo-template.toml -c catalogs/demo-steel.csv --max-sizes 3

The job file is a template: its material, grades, checks, load cases with their
combinations, and presets apply to every member. It need not hold a [beam] or
[[load]] tables; where it does they are not used (each member's spans, supports
and loads come from the schedule), and the output says so.";

#[derive(clap::Args, Debug)]
pub struct Args {
    /// Member schedule, CSV or a workbook (.xlsx, .ods, ...; first sheet, or FILE#SHEET): mark, count, spans [m], supports, dead/live/snow [kN/m], ...
    #[arg(long, value_name = "FILE")]
    pub schedule: PathBuf,
    /// Template job file: material, grades, bracing, presets.
    #[arg(long, short = 'j', value_name = "FILE")]
    pub job: PathBuf,
    #[command(flatten)]
    pub cat: CatalogArgs,
    /// Use at most this many distinct sections across the schedule (1–10,000).
    #[arg(long = "max-sizes", value_name = "K", value_parser = super::count_in::<1, 10_000>)]
    pub max_sizes: Option<usize>,
    /// Rationalise for least total mass or least total cost.
    #[arg(long, value_parser = ["mass", "cost"], default_value = "mass")]
    pub objective: String,
    /// Stock bar lengths to cut each section's members from, e.g. `6m,12m`:
    /// reports the bars bought, offcuts and waste, and members that need a splice.
    #[arg(long = "stock-lengths", value_name = "LIST")]
    pub stock_lengths: Option<String>,
    /// Saw kerf per piece when cutting from stock bars [default: 0 mm].
    #[arg(long, value_name = "LENGTH", requires = "stock_lengths")]
    pub kerf: Option<String>,
    /// Wastage on the cost of every mark, e.g. `5%` (needs prices).
    #[arg(long, value_name = "PERCENT")]
    pub wastage: Option<String>,
    /// An allowance on the cost, NAME=PERCENT, e.g. `connections=8%`;
    /// repeat for more (needs prices). Line cost = count × length × cost
    /// per length × (1 + wastage) × (1 + sum of allowances).
    #[arg(long, value_name = "NAME=PERCENT")]
    pub allowance: Vec<String>,
    /// Deflection limit under variable load, for members without a service
    /// preset (refused when the template has one) [default: L/360].
    #[arg(long = "limit-live")]
    pub limit_live: Option<String>,
    /// Deflection limit under total load, likewise [default: L/240].
    #[arg(long = "limit-total")]
    pub limit_total: Option<String>,
}

#[derive(Serialize)]
struct BatchResult {
    #[serde(flatten)]
    schedule: batch::Schedule,
    #[serde(flatten)]
    prices: Prices,
    #[serde(skip_serializing_if = "job::Project::is_empty")]
    project: job::Project,
    caution: &'static str,
}

pub fn run(a: Args, out: &Out) -> Result<i32> {
    let sys = out.units;
    let shown = a.job.display().to_string();
    let text = beamsift::job::read_text(&a.job, &shown)?;
    let template = job::template_from_toml(&text, &shown)?;
    if template.presets.1.is_some() && (a.limit_live.is_some() || a.limit_total.is_some()) {
        return Err(Error::msg(format!(
            "the template's [presets] service = \"{}\" sets the deflection limits: remove it from {shown}, or leave out --limit-live/--limit-total",
            template.presets.1.as_deref().unwrap_or("")
        )));
    }
    let own_service = template
        .beam
        .combinations
        .iter()
        .any(|c| c.source.is_none() && c.kind == beamsift::beam::ComboKind::Service);
    if own_service && (a.limit_live.is_some() || a.limit_total.is_some()) {
        return Err(Error::msg(format!(
            "the template {shown} has its own service combinations, which set the deflection limits: leave out --limit-live/--limit-total, or remove them from the template"
        )));
    }
    let n_live = job::parse_ratio(a.limit_live.as_deref().unwrap_or("L/360"))
        .map_err(|e| e.in_field("--limit-live"))?;
    let n_total = job::parse_ratio(a.limit_total.as_deref().unwrap_or("L/240"))
        .map_err(|e| e.in_field("--limit-total"))?;
    let opts = batch::Options::parse(&batch::Typed {
        by_cost: a.objective == "cost",
        max_sizes: a.max_sizes,
        stock_lengths: a.stock_lengths.as_deref(),
        kerf: a.kerf.as_deref(),
        wastage: a.wastage.as_deref(),
        allowances: &a.allowance,
        units: sys,
    })?;
    // A workbook's sheet is read as the same text (see Input).
    let sched = beamsift::catalog::input::Input::new(&a.schedule)?;
    let members = batch::read_schedule_at(
        sched.reader()?,
        &sched.at(),
        &a.cat.options()?,
        &template,
        n_live,
        n_total,
    )?;
    a.cat.setup_threads()?;
    let (cats, _) = a.cat.open()?;
    let schemas: Vec<&Schema> = cats.iter().map(|c| &c.schema).collect();
    let header_prices = Prices::of(template.currency.as_deref(), &schemas, None);
    drop(schemas);
    let mats = Materials::of(&template);
    let filters = a.cat.filters_for(&template)?;
    let (rows, counts, _skipped) = search::load_rows(cats, &mats, a.cat.skip_bad_rows, &filters)?;
    let prices = batch::prices(header_prices, &rows);
    opts.check_prices(&prices)?;
    batch::check_grades(&members, &rows, &sched.at())?;
    let schedule = batch::schedule(&members, &rows, &mats, &filters, &opts)?;
    let view = BatchView {
        sys,
        schedule: &sched.shown,
        template: &shown,
        material: &template.material.name,
        rows: rows.len(),
        counts: &counts,
        skip_bad_rows: a.cat.skip_bad_rows,
        by_cost: opts.by_cost,
        rationalising: a.max_sizes.is_some(),
        prices: &prices,
        excluded: template.criteria.exclude.list(),
        project: &template.project,
    };
    let doc = document(&schedule, &view);
    let data = report::batch::data(&schedule, &view, &doc);
    let splice = schedule
        .cutting
        .as_ref()
        .is_some_and(|c| c.sections.iter().any(|s| !s.too_long.is_empty()));
    let code = if schedule.not_sized.is_empty() && !splice {
        0
    } else {
        EXIT_FAILS
    };
    let result = BatchResult {
        schedule,
        prices,
        project: template.project.clone(),
        caution: report::CAUTION,
    };
    emit_data(out, &result, &doc, &data)?;
    Ok(code)
}
