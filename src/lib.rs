//! beamsift: size beams from a catalogue or by optimisation.
//!
//! The core — [`units`], [`section`], [`beam`], [`check`] — does no I/O.
//! Drivers compose it; renderers print results. See DEVELOPERS.md.

#![forbid(unsafe_code)]

pub mod beam;
pub mod catalog;
pub mod check;
pub mod error;
pub mod job;
pub mod member;
pub mod optimise;
pub mod report;
pub mod search;
pub mod section;
pub mod sweep;
pub mod units;

pub use error::{Error, Result};
