//! Catalogue validation and listing as serialised, and their documents
//! (the reading and checking happen in `catalog::read`).

use super::{Align, CAUTION, Document, Table};
use crate::catalog::read::{Listing, Validation};
use crate::units::{Show, System};
use serde::Serialize;

/// The validation of a catalogue as printed and serialised.
#[derive(Serialize)]
pub struct ValidateResult {
    pub file: String,
    pub rows: u64,
    pub good: u64,
    pub problems: Vec<String>,
    /// Problems beyond those listed.
    pub unlisted: u64,
    /// Every problem, listed or not.
    #[serde(skip)]
    pub total: u64,
    /// Rows read that have a problem.
    #[serde(skip)]
    pub bad_rows: u64,
    pub caution: &'static str,
}

impl ValidateResult {
    pub fn new(file: String, v: &Validation) -> ValidateResult {
        ValidateResult {
            file,
            rows: v.rows,
            good: v.good,
            problems: v.errors.iter().map(|e| e.to_string()).collect(),
            unlisted: v.unlisted,
            total: v.problems(),
            bad_rows: v.bad_rows(),
            caution: CAUTION,
        }
    }

    /// No problem was found.
    pub fn valid(&self) -> bool {
        self.problems.is_empty()
    }
}

/// The document of a validation (`have_job`: grades were looked up and
/// masses compared with A·ρ).
pub fn validate_document(r: &ValidateResult, have_job: bool) -> Document {
    let mut doc = Document::new(format!("Catalogue {}", r.file));
    if r.valid() {
        doc.para(format!("{} row(s), all valid.", r.rows));
    } else {
        let head = if r.unlisted > 0 {
            format!(
                "{} problem(s), the first {} listed:",
                r.total,
                r.problems.len()
            )
        } else {
            format!("{} problem(s):", r.total)
        };
        doc.list(head, r.problems.clone());
        doc.para(format!(
            "{} row(s) read, {} valid, {} with problems.",
            r.rows, r.good, r.bad_rows
        ));
    }
    if !have_job {
        doc.para(
            "No --job given: grades were not looked up and masses were not compared with A·ρ.",
        );
    }
    doc.para("A valid row is well-formed and self-consistent; whether its values are those of the real section is for the user to check.");
    doc.para(CAUTION);
    doc
}

/// The document of a catalogue listing: every row with its properties.
pub fn show_document(l: &Listing, sys: System) -> Document {
    let mut t = Table::new(
        "",
        &[
            ("Line", Align::Right),
            ("Name", Align::Left),
            ("Shape", Align::Left),
            ("Grade", Align::Left),
            (&format!("d [{}]", Show::Dimension.label(sys)), Align::Right),
            (&format!("A [{}]", Show::Area.label(sys)), Align::Right),
            (
                &format!("Ix [{}]", Show::SecondMoment.label(sys)),
                Align::Right,
            ),
            (
                &format!("S_top [{}]", Show::SectionModulus.label(sys)),
                Align::Right,
            ),
            (
                &format!("S_bot [{}]", Show::SectionModulus.label(sys)),
                Align::Right,
            ),
            (&format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
        ],
    );
    for r in &l.rows {
        let p = &r.properties;
        t.row(vec![
            r.line.to_string(),
            r.name.clone(),
            r.shape
                .as_ref()
                .map(|s| s.family().to_string())
                .unwrap_or_else(|| "given".into()),
            r.grade.clone(),
            Show::Dimension.num(p.depth, sys),
            Show::Area.num(p.area, sys),
            Show::SecondMoment.num(p.ix, sys),
            Show::SectionModulus.num(p.s_top, sys),
            Show::SectionModulus.num(p.s_bot, sys),
            if r.mass_per_length.is_finite() {
                Show::Mass.num(r.mass_per_length, sys)
            } else {
                "—".into()
            },
        ]);
    }
    let mut doc = Document::new(format!("Catalogue {}", l.file));
    doc.table(t);
    if !l.problems.is_empty() {
        doc.list("Rows with problems (not shown):", l.problems.clone());
    }
    doc.para("Properties computed from the dimensions unless the row gives them; check them before trusting a run.");
    doc.para(CAUTION);
    doc
}
