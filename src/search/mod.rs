//! Catalogue scans: check every row against a prepared job, in parallel,
//! keeping only what the ranking needs (the top rows by each requested
//! criterion, the mass–depth Pareto front, the nearest misses), so memory
//! does not grow with the catalogue.
//!
//! Determinism: rows are read in blocks of segments; each block is checked
//! in parallel, and its outcomes are merged in file order with a total order
//! (criterion, then mass, depth, name, file, line), so the result does not
//! depend on the number of threads.

pub mod batch;
pub mod cutting;
pub mod rationalise;
pub mod schedule;
pub mod spans;

mod duplicates;
mod filters;
mod load;
mod rank;
mod scan;

use duplicates::{Bloom, MAX_ROUNDS, SUSPECT_CAP};
pub use duplicates::{Repeat, Suspect, confirm_duplicates};
pub(crate) use duplicates::{find_repeats, refuse_repeats};
pub use filters::{Filters, glob};
pub use load::load_rows;
pub use rank::{Rank, TopList, compare};
pub(crate) use scan::map_block;
pub use scan::{check_workers, scan, scan_checked, scan_excluding};

use crate::catalog::{Materials, Row, RowMaterial};
use crate::check::{Item, Prepared, Verdict};
use crate::error::{Error, Result};
use crate::section::{Properties, Shape};
use serde::Serialize;

/// A section that was checked, with what a person needs to choose.
#[derive(Clone, Debug, Serialize)]
pub struct Candidate {
    pub name: String,
    pub series: String,
    pub grade: String,
    pub shape: Option<Shape>,
    /// Catalogue file index and line.
    pub file: usize,
    pub line: u64,
    /// kg/m.
    pub mass: f64,
    /// mm.
    pub depth: f64,
    pub width: f64,
    /// Currency per mm.
    pub cost: Option<f64>,
    pub stock: Option<bool>,
    pub utilisation: f64,
    pub governing: Option<Item>,
    pub verdict: Verdict,
    pub passes: bool,
    /// Why the verdict is not verified (empty otherwise).
    pub not_verified: Vec<String>,
    /// What beamsift does not check for this row (outside its scope).
    pub not_checked: Vec<String>,
    /// On the mass–depth Pareto front of the passing sections.
    pub pareto: bool,
    pub properties: Properties,
    #[serde(skip)]
    pub material: RowMaterial,
}

/// The candidate of a checked row.
pub(crate) fn to_candidate(
    prep: &Prepared,
    mats: &Materials<'_>,
    row: &Row<'_>,
    s: &crate::check::Summary,
    file: usize,
    line: u64,
) -> Candidate {
    to_candidate_unchecked(row, s, file, line).with_summary(prep, mats.get(&row.material), s)
}

/// A row read for later checking (schedules): no verdict yet.
pub(crate) fn to_candidate_unchecked(
    row: &Row<'_>,
    s: &crate::check::Summary,
    file: usize,
    line: u64,
) -> Candidate {
    Candidate {
        name: row.name.to_string(),
        series: row.series.to_string(),
        grade: row.grade.to_string(),
        shape: row.shape.clone(),
        file,
        line,
        mass: row.mass,
        depth: row.props.depth,
        width: row.props.width,
        cost: row.cost,
        stock: row.stock,
        utilisation: s.utilisation,
        governing: s.governing,
        verdict: s.verdict,
        passes: s.passes,
        not_verified: Vec::new(),
        not_checked: Vec::new(),
        pareto: false,
        properties: row.props.clone(),
        material: row.material.clone(),
    }
}

impl Candidate {
    /// Fill in the verdict of a check (for rows read before checking).
    pub fn with_summary(
        mut self,
        prep: &Prepared,
        mat: &crate::check::Material,
        s: &crate::check::Summary,
    ) -> Candidate {
        self.utilisation = s.utilisation;
        self.governing = s.governing;
        self.verdict = s.verdict;
        self.passes = s.passes;
        self.not_verified = s.gaps.describe();
        self.not_checked = prep.not_checked(&self.properties, Some(mat));
        self
    }
}

/// Scan options.
#[derive(Clone, Debug)]
pub struct ScanOptions {
    /// Rankings to keep, each with its length (usize::MAX = all).
    pub ranks: Vec<(Rank, usize)>,
    /// Nearest misses to keep.
    pub near: usize,
    pub filters: Filters,
    pub skip_bad_rows: bool,
    /// Bytes per parallel segment of a block (results never depend on it).
    pub chunk: usize,
    /// Keep the Pareto front.
    pub pareto: bool,
    /// Not-verified rows to keep (lightest first), listed apart.
    pub unverified: usize,
    /// Rank not-verified rows with the passing ones (marked on every line).
    pub include_unverified: bool,
}

impl Default for ScanOptions {
    fn default() -> Self {
        ScanOptions {
            ranks: vec![(Rank::Mass, 10)],
            near: 5,
            filters: Filters::default(),
            skip_bad_rows: false,
            chunk: crate::catalog::records::SEGMENT,
            pareto: true,
            unverified: 5,
            include_unverified: false,
        }
    }
}

/// Counts of a scan.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Counts {
    pub rows: u64,
    pub checked: u64,
    pub passing: u64,
    pub failing: u64,
    /// Checked, nothing failed, but a limit state could not be evaluated.
    pub not_verified: u64,
    pub filtered: u64,
    pub bad: u64,
    /// Checked rows with a price (what the prices of a scan are judged
    /// by: a price column whose cells are all empty gives no prices).
    pub priced: u64,
    /// Rows the duplicate filter flagged (possible repeats of an earlier
    /// name; only those of the reported names are confirmed).
    pub flagged: u64,
}

/// The prices of a scan from its catalogues' headers (`header`) and the
/// rows it checked: none when no checked row has a price, partly given
/// when some lack one (the headers alone when no row was checked).
pub fn scan_prices(header: crate::catalog::Prices, counts: &Counts) -> crate::catalog::Prices {
    if counts.checked == 0 {
        // Nothing checked: the headers are all there is to go by.
        return header;
    }
    header.with_rows(counts.checked as usize, counts.priced as usize)
}

/// What a scan keeps.
#[derive(Clone, Debug, Serialize)]
pub struct Selection {
    pub lists: Vec<TopList>,
    pub pareto: Vec<Candidate>,
    pub near_misses: TopList,
    /// The lightest not-verified rows.
    pub unverified: TopList,
    pub counts: Counts,
    /// Problems in skipped rows (the first 100).
    pub skipped: Vec<String>,
    pub files: Vec<String>,
    /// Reported rows whose name repeats another row's, found in the one
    /// reading (both lines known).
    #[serde(skip)]
    pub repeats: Vec<Repeat>,
    /// Reported rows the duplicate filter flagged that no kept row
    /// explains: they may repeat an earlier, unreported row (confirmed by
    /// `scan_checked` where the input can be read again).
    #[serde(skip)]
    pub doubt: Vec<Suspect>,
    /// Each file's place and name column (for the repeats' errors).
    #[serde(skip)]
    pub places: Vec<(crate::error::Location, usize)>,
}

impl Selection {
    /// The row with exactly this name among every row kept (ranked, near
    /// misses, not verified), whatever its verdict; the error names rows
    /// that differ only in case.
    pub fn named(&self, name: &str) -> Result<&Candidate> {
        let all = || {
            self.lists[0]
                .items
                .iter()
                .chain(self.near_misses.items.iter())
                .chain(self.unverified.items.iter())
        };
        if let Some(c) = all().find(|c| c.name == name) {
            return Ok(c);
        }
        let similar: Vec<String> = all()
            .filter(|c| c.name.eq_ignore_ascii_case(name))
            .map(|c| format!("'{}'", c.name))
            .collect();
        Err(if similar.is_empty() {
            Error::msg(format!("no section named '{name}' in the catalogue"))
        } else {
            Error::msg(format!(
                "no section named '{name}' in the catalogue (names are matched exactly, case included); similar: {}",
                similar.join(", ")
            ))
        })
    }
}

impl Candidate {
    /// Set this row (checked by the scan that found it, in its own grade)
    /// beside the fabrication sizes of an optimisation study.
    pub fn set_beside(&self, study: &mut crate::optimise::Study) {
        let (m, a) = (study.discrete.mass, study.discrete.area);
        study.reference = Some(crate::optimise::Reference {
            name: self.name.clone(),
            area: self.properties.area,
            mass: self.mass,
            depth: self.depth,
            utilisation: self.utilisation,
            verdict: self.verdict,
            governing: self.governing.map(|g| g.kind.label().to_string()),
            mass_change: (m - self.mass) / self.mass,
            area_change: (a - self.properties.area) / self.properties.area,
        });
    }
}
