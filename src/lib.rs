//! beamsift: size beams from a catalogue or by optimisation.
//!
//! The main job in a few lines: read a job (spans, supports, loads by case,
//! combinations, material, limits), analyse the beam once, scan a
//! catalogue in parallel, and take the lightest section that passes every
//! check that applies.
//!
//! ```
//! use beamsift::catalog::read::{self, ReadOptions};
//! use beamsift::search::{self, Rank, ScanOptions};
//!
//! // An invented job: 6 m simple span, 4 kN/m dead and 6 kN/m live, the
//! // ASCE 7-16 ASD combinations and the IBC floor deflection limits.
//! let job = beamsift::job::from_toml(r#"
//!     title = "Example beam (invented)"
//!     [beam]
//!     spans = ["6 m"]
//!     supports = ["pinned", "roller"]
//!     [material]
//!     name = "steel, allowables chosen for the example"
//!     kind = "steel"
//!     E = "200 GPa"
//!     Fy = "345 MPa"
//!     Fb = "165 MPa"
//!     Fv = "100 MPa"
//!     density = "7850 kg/m3"
//!     [[case]]
//!     name = "dead"
//!     category = "dead"
//!     [[case]]
//!     name = "live"
//!     category = "live"
//!     [[load]]
//!     case = "dead"
//!     uniform = "4 kN/m"
//!     [[load]]
//!     case = "live"
//!     uniform = "6 kN/m"
//!     [presets]
//!     strength = "asce7-16-asd"
//!     service = "floor"
//!     [checks]
//!     lateral_bracing = "continuous"
//! "#, "job.toml")?;
//! let prep = job.prepare()?; // the analysis, once
//!
//! // An invented stock list (rolled I dimensions; properties are computed).
//! let csv = "name,shape,d [mm],bf [mm],tf [mm],tw [mm],r [mm]\n\
//!            X 160,rolled-i,160,82,7.4,5.0,9\n\
//!            X 270,rolled-i,270,135,10.2,6.6,15\n\
//!            X 300,rolled-i,300,150,10.7,7.1,15\n";
//! let open = || Ok(vec![read::open(csv.as_bytes(), "stock.csv", &ReadOptions::default())?]);
//! let opts = ScanOptions { ranks: vec![(Rank::Mass, 3)], ..ScanOptions::default() };
//! let mats = beamsift::catalog::Materials::of(&job);
//! let sel = search::scan_checked(&prep, &open, &mats, &opts, &|_, _| {})?;
//!
//! // By hand: M = (4 + 6 + 0.354 self-weight) kN/m × (6 m)² / 8 = 46.6 kN·m;
//! // X 160 (IPE 160 dimensions, S ≈ 109 cm³ from memory) is stressed far
//! // beyond 165 MPa, X 270 (IPE 270 dimensions, S ≈ 429 cm³ from memory)
//! // to 46.6e6 / 429e3 = 109 MPa: utilisation 109 / 165 = 0.66.
//! let best = &sel.lists[0].items[0];
//! assert_eq!(best.name, "X 270");
//! assert!((best.utilisation - 0.658).abs() < 0.002);
//! assert_eq!(sel.counts.passing, 2);
//! # Ok::<(), beamsift::Error>(())
//! ```
//!
//! Layers, lowest first (no module imports upward):
//! - the core, which does no I/O: [`units`] (quantities with units),
//!   [`section`] (shapes and properties), [`beam`] (model, analysis, the
//!   demand), [`check`] (criteria, limit states, verdicts);
//! - [`member`] (the whole check of one member as one result),
//!   [`catalog`] (the catalogue format), [`job`] (the job format);
//! - the drivers: [`search`] (parallel scan, ranking, schedules),
//!   [`optimise`] (parametric sections), [`sweep`] (span tables);
//! - [`report`]: documents from results, and their writers (terminal text,
//!   CSV, Markdown, HTML; JSON from each result's `Serialize`).
//!
//! Internal units everywhere: mm, N, N·mm, MPa (N/mm²), kg/m for mass per
//! length, kg/m³ for density; every field of a result type names its
//! unit in its documentation, and JSON output carries the same values.
//! Display units (SI or US customary) apply only when a document is built.
//!
//! CAUTION: beamsift is an aid for a competent person, not a substitute
//! for one. Verify every result against the governing local code and
//! licensed practice; every document says what was not checked.

// No unsafe code, but for one allowed and justified site: the cache
// prefetch of the duplicate filter (`search::duplicates::prefetch`).
#![deny(unsafe_code)]

pub mod beam;
pub mod catalog;
pub mod check;
pub mod error;
pub mod files;
pub mod job;
pub mod member;
pub mod optimise;
pub mod report;
pub mod search;
pub mod section;
pub mod sweep;
pub mod units;

pub use error::{Error, Result};

/// The caution every human-readable result carries (and every JSON
/// result), defined once at the root so any module may attach it.
pub const CAUTION: &str = "CAUTION: beamsift is an aid for a competent person, not a substitute for one. \
Verify every result against the governing local code and licensed practice before it is used.";
