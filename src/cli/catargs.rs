//! Catalogue options shared by select, shortlist and batch.

use super::progress;
use beamsift::catalog::Prices;
use beamsift::catalog::read::{Catalog, ReadOptions};
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::job::Job;
use beamsift::search::Filters;
use beamsift::search::{self, ScanOptions, Selection};
use std::path::PathBuf;

#[derive(clap::Args, Debug, Clone)]
pub struct CatalogArgs {
    /// Catalogue file(s): CSV, or a workbook (.xlsx, .xlsm, .xlsb, .xls,
    /// .ods: its first sheet, or FILE#SHEET); repeat for several.
    #[arg(long, short = 'c', value_name = "FILE", required = true)]
    pub catalog: Vec<PathBuf>,
    /// Field delimiter of a CSV catalogue (and of batch's schedule): a
    /// character, or 'tab' (refused for a workbook).
    #[arg(long, default_value = ",")]
    pub delimiter: String,
    /// Numbers in the catalogue (and schedule) use a decimal comma: 12,5 is
    /// 12.5 (a '.' in a number is refused). Needs --delimiter ';' or tab.
    #[arg(long = "decimal-comma")]
    pub decimal_comma: bool,
    /// Leave out bad rows (and report how many) instead of refusing the catalogue.
    #[arg(long = "skip-bad-rows")]
    pub skip_bad_rows: bool,
    /// Only sections at most this deep (e.g. 350mm).
    #[arg(long = "max-depth", value_name = "LENGTH")]
    pub max_depth: Option<String>,
    /// Only sections at least this deep.
    #[arg(long = "min-depth", value_name = "LENGTH")]
    pub min_depth: Option<String>,
    /// Only sections at most this wide.
    #[arg(long = "max-width", value_name = "LENGTH")]
    pub max_width: Option<String>,
    /// Only rows of this grade.
    #[arg(long)]
    pub grade: Option<String>,
    /// Only rows marked in stock.
    #[arg(long = "in-stock")]
    pub in_stock: bool,
    /// Only names matching this pattern (* and ? wildcards), e.g. 'NB*'.
    #[arg(long, value_name = "PATTERN")]
    pub name: Option<String>,
    /// Worker threads (default: all cores).
    #[arg(long)]
    pub jobs: Option<usize>,
    /// No progress bar.
    #[arg(long, short = 'q')]
    pub quiet: bool,
    /// The inputs, each read once: regular files are reopened, streams
    /// (pipes, FIFOs, standard input as '-') are kept in memory.
    #[arg(skip)]
    pub inputs: std::sync::Arc<std::sync::OnceLock<Vec<Input>>>,
}

pub use beamsift::catalog::input::Input;

impl CatalogArgs {
    pub fn options(&self) -> Result<ReadOptions> {
        ReadOptions::new(&self.delimiter, self.decimal_comma)
    }

    /// The filters, checked against the job (a grade it does not define
    /// is refused).
    pub fn filters_for(&self, job: &Job) -> Result<Filters> {
        Filters::check_grade(self.grade.as_deref(), job)?;
        self.filters()
    }

    pub fn filters(&self) -> Result<Filters> {
        Filters::parse(
            self.max_depth.as_deref(),
            self.min_depth.as_deref(),
            self.max_width.as_deref(),
            self.grade.clone(),
            self.in_stock,
            self.name.clone(),
        )
    }

    /// The inputs, named (and streams read) once per run.
    pub fn inputs(&self) -> Result<&[Input]> {
        if let Some(v) = self.inputs.get() {
            return Ok(v);
        }
        let v = self
            .catalog
            .iter()
            .map(|p| Input::new(p))
            .collect::<Result<Vec<_>>>()?;
        Ok(self.inputs.get_or_init(|| v))
    }

    /// Open every catalogue (all are checked before any work starts).
    #[allow(clippy::type_complexity)]
    pub fn open(&self) -> Result<(Vec<Catalog<Box<dyn std::io::Read + Send>>>, u64)> {
        let opts = self.options()?;
        let mut out = Vec::new();
        let mut bytes = 0;
        for i in self.inputs()? {
            bytes += i.len;
            out.push(i.open(&opts)?);
        }
        Ok((out, bytes))
    }

    pub fn setup_threads(&self) -> Result<()> {
        if let Some(n) = self.jobs {
            let cores = std::thread::available_parallelism().map_or(1, |c| c.get());
            search::check_workers(n, cores)?;
            if let Err(e) = rayon::ThreadPoolBuilder::new()
                .num_threads(n)
                .build_global()
            {
                // Already initialised (a run of several scans) is fine; a
                // pool that cannot start is not.
                let text = e.to_string();
                if !text.contains("already") {
                    return Err(Error::io(
                        "worker threads",
                        std::io::Error::other(format!("cannot start {n} worker threads: {text}")),
                    ));
                }
            }
        }
        Ok(())
    }
}

pub fn run_scan(
    job: &Job,
    prep: &Prepared,
    cat: &CatalogArgs,
    opts: &ScanOptions,
) -> Result<(Selection, Prices)> {
    cat.setup_threads()?;
    let (cats, bytes) = cat.open()?;
    let schemas: Vec<&beamsift::catalog::Schema> = cats.iter().map(|c| &c.schema).collect();
    let prices = Prices::of(job.currency.as_deref(), &schemas, None);
    drop(schemas);
    let mats = beamsift::catalog::Materials::of(job);
    drop(cats);
    let pb = progress::bytes_bar(bytes, cat.quiet);
    // The files are opened again for the exact duplicate confirmation.
    let open = || cat.open().map(|(c, _)| c);
    let sel = search::scan_checked(prep, &open, &mats, opts, &|_, b| pb.set_position(b))?;
    pb.finish_and_clear();
    // Judged by the rows checked, not the headers alone.
    let prices = search::scan_prices(prices, &sel.counts);
    Ok((sel, prices))
}

impl CatalogArgs {
    /// The catalogue options given (`section`: --section was given), by
    /// name: without a catalogue they have nothing to act on, so they are
    /// refused rather than ignored.
    pub fn given(&self, section: bool) -> Vec<&'static str> {
        [
            (section, "--section"),
            (!self.catalog.is_empty(), "--catalog"),
            (self.delimiter != ",", "--delimiter"),
            (self.decimal_comma, "--decimal-comma"),
            (self.skip_bad_rows, "--skip-bad-rows"),
            (self.max_depth.is_some(), "--max-depth"),
            (self.min_depth.is_some(), "--min-depth"),
            (self.max_width.is_some(), "--max-width"),
            (self.grade.is_some(), "--grade"),
            (self.in_stock, "--in-stock"),
            (self.name.is_some(), "--name"),
            (self.jobs.is_some(), "--jobs"),
        ]
        .into_iter()
        .filter_map(|(set, name)| set.then_some(name))
        .collect()
    }

    /// The rows of `catalog`, unfiltered, without a progress bar (one row
    /// looked up by name).
    pub fn rows_of(catalog: Vec<PathBuf>, delimiter: &str) -> Self {
        CatalogArgs {
            catalog,
            delimiter: delimiter.to_string(),
            skip_bad_rows: false,
            decimal_comma: false,
            max_depth: None,
            min_depth: None,
            max_width: None,
            grade: None,
            in_stock: false,
            name: None,
            jobs: None,
            quiet: true,
            inputs: Default::default(),
        }
    }

    /// A shape was given: every catalogue option is refused by name.
    pub fn refuse_idle(&self, section: bool) -> Result<()> {
        let idle = self.given(section);
        if idle.is_empty() {
            return Ok(());
        }
        Err(Error::msg(format!(
            "{} select(s) rows of a catalogue, and a shape was given instead: leave {} out, or give --catalog FILE without the shape",
            idle.join(", "),
            if idle.len() == 1 { "it" } else { "them" }
        )))
    }
}

/// A scan that keeps every row the filters let through, with the name
/// filter set to `name` when one is given (so the exact row is found
/// whatever its verdict), else the lightest few; with the note of how the
/// catalogue was read.
pub fn scan_for_sheet(
    job: &Job,
    prep: &Prepared,
    cat: &CatalogArgs,
    section: Option<&str>,
    sys: beamsift::units::System,
) -> Result<(Selection, String)> {
    if section.is_some() && cat.name.is_some() {
        return Err(
            Error::msg("give either --section NAME or --name PATTERN, not both").in_field("--name"),
        );
    }
    let keep = if section.is_some() { 10_000 } else { 6 };
    let mut filters = cat.filters_for(job)?;
    if let Some(n) = section {
        filters.name = Some(n.to_string());
    }
    let opts = ScanOptions {
        ranks: vec![(search::Rank::Mass, keep)],
        // The near misses a sheet lists are the failing rows lighter than
        // the section (at most five): keep enough to find them.
        near: if section.is_some() { keep } else { 20 },
        unverified: keep,
        filters,
        skip_bad_rows: cat.skip_bad_rows,
        ..ScanOptions::default()
    };
    let (sel, _) = run_scan(job, prep, cat, &opts)?;
    let note = beamsift::report::sheet::scan_note(&sel, &opts.filters, cat.skip_bad_rows, sys);
    let Some(n) = section else {
        return Ok((sel, note));
    };
    if let Err(e) = sel.named(n) {
        let f = opts.filters.describe(sys);
        // The name filter is the section itself.
        let others: Vec<&String> = f
            .iter()
            .filter(|d| !d.starts_with("names matching"))
            .collect();
        return Err(if others.is_empty() {
            e
        } else {
            Error::msg(format!(
                "{e}, among the rows the filters let through ({}): it may have been left out by them",
                others
                    .iter()
                    .map(|s| s.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            ))
        });
    }
    Ok((sel, note))
}
