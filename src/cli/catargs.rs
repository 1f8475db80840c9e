//! Catalogue options shared by select, shortlist and batch.

use beamsift::catalog::read::{self, Catalog, ReadOptions};
use beamsift::error::{Error, Result};
use beamsift::job::Job;
use beamsift::search::Filters;
use beamsift::units::{self, Dim};
use std::fs::File;
use std::io::BufReader;
use std::path::PathBuf;

#[derive(clap::Args, Debug, Clone)]
pub struct CatalogArgs {
    /// Catalogue CSV file(s); repeat for several.
    #[arg(long, short = 'c', value_name = "FILE", required = true)]
    pub catalog: Vec<PathBuf>,
    /// Field delimiter of the catalogue: a character, or 'tab'.
    #[arg(long, default_value = ",")]
    pub delimiter: String,
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
}

impl CatalogArgs {
    pub fn options(&self) -> Result<ReadOptions> {
        let d = match self.delimiter.as_str() {
            "tab" | "\\t" => b'\t',
            s if s.len() == 1 => s.as_bytes()[0],
            s => {
                return Err(Error::msg(format!(
                    "--delimiter '{s}': expected one character or 'tab'"
                )));
            }
        };
        Ok(ReadOptions { delimiter: d })
    }

    /// The filters, checked against the job: a grade the job does not
    /// define can match no row (rows naming it are refused), so it is
    /// refused here rather than filtering everything out silently.
    pub fn filters_for(&self, job: &beamsift::job::Job) -> Result<Filters> {
        if let Some(g) = &self.grade
            && !job.grades.iter().any(|(n, _)| n.eq_ignore_ascii_case(g))
        {
            let known: Vec<&str> = job.grades.iter().map(|(n, _)| n.as_str()).collect();
            return Err(Error::msg(format!(
                "--grade {g}: the job defines no such grade (expected one of [{}]; grades are [materials.NAME] tables)",
                known.join(", ")
            )));
        }
        self.filters()
    }

    pub fn filters(&self) -> Result<Filters> {
        let len = |v: &Option<String>, n: &str| -> Result<Option<f64>> {
            v.as_deref()
                .map(|t| units::parse(t, Dim::Length).map_err(|e| e.in_field(n)))
                .transpose()
        };
        Ok(Filters {
            max_depth: len(&self.max_depth, "--max-depth")?,
            min_depth: len(&self.min_depth, "--min-depth")?,
            max_width: len(&self.max_width, "--max-width")?,
            grade: self.grade.clone(),
            in_stock_only: self.in_stock,
            name: self.name.clone(),
        })
    }

    /// Open every catalogue (all are checked before any work starts).
    pub fn open(&self) -> Result<(Vec<Catalog<BufReader<File>>>, u64)> {
        let opts = self.options()?;
        let mut out = Vec::new();
        let mut bytes = 0;
        for p in &self.catalog {
            let shown = p.display().to_string();
            let f = File::open(p).map_err(|e| Error::io(&shown, e))?;
            bytes += f.metadata().map(|m| m.len()).unwrap_or(0);
            out.push(read::open(
                BufReader::with_capacity(1 << 16, f),
                &shown,
                &opts,
            )?);
        }
        Ok((out, bytes))
    }

    pub fn setup_threads(&self) -> Result<()> {
        if let Some(n) = self.jobs {
            if n == 0 {
                return Err(Error::msg("--jobs must be at least 1"));
            }
            // Ignore "already initialised" (tests run several commands).
            let _ = rayon::ThreadPoolBuilder::new()
                .num_threads(n)
                .build_global();
        }
        Ok(())
    }
}

/// The currency to print.
pub fn currency(job: &Job, cats: &[String]) -> String {
    job.currency
        .clone()
        .or_else(|| cats.first().cloned())
        .unwrap_or_else(|| "cost".into())
}
