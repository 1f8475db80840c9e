//! Catalogue options shared by select, shortlist and batch.

use super::progress;
use beamsift::catalog::read::{self, Catalog, ReadOptions};
use beamsift::check::Prepared;
use beamsift::error::{Error, Result};
use beamsift::job::Job;
use beamsift::search::Filters;
use beamsift::search::{self, ScanOptions, Selection};
use std::path::PathBuf;

#[derive(clap::Args, Debug, Clone)]
pub struct CatalogArgs {
    /// Catalogue CSV file(s); repeat for several.
    #[arg(long, short = 'c', value_name = "FILE", required = true)]
    pub catalog: Vec<PathBuf>,
    /// Field delimiter of the catalogue (and of batch's schedule): a
    /// character, or 'tab'.
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
            let mut cat = read::open(i.reader()?, &i.shown, &opts)?;
            cat.size_hint = Some(i.len);
            out.push(cat);
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
) -> Result<(Selection, String)> {
    cat.setup_threads()?;
    let (cats, bytes) = cat.open()?;
    let currencies: Vec<String> = cats
        .iter()
        .filter_map(|c| c.schema.currency.clone())
        .collect();
    let mats = beamsift::catalog::Materials::of(job);
    drop(cats);
    let pb = progress::bytes_bar(bytes, cat.quiet);
    // The files are opened again for the exact duplicate confirmation.
    let open = || cat.open().map(|(c, _)| c);
    let sel = search::scan_checked(prep, &open, &mats, opts, &|_, b| pb.set_position(b))?;
    pb.finish_and_clear();
    Ok((sel, job.currency_or(&currencies)))
}
