//! The command line's names for the library's choices (unit system,
//! output format, ranking, section family, objective): each enum's
//! `CHOICES` table of (value, name, help), turned into a clap value
//! parser. tests/choices.rs holds the tables to every variant and to the
//! serde names.

use beamsift::optimise::{Family, Objective};
use beamsift::report::Format;
use beamsift::search::Rank;
use beamsift::units::System;
use clap::builder::{PossibleValue, PossibleValuesParser, TypedValueParser};

/// A clap value parser for one table of choices.
pub fn parser<T: Copy + Send + Sync + 'static>(
    table: &'static [(T, &'static str, &'static str)],
) -> impl TypedValueParser<Value = T> {
    PossibleValuesParser::new(
        table
            .iter()
            .map(|(_, name, help)| PossibleValue::new(*name).help(*help)),
    )
    .map(move |s: String| {
        table
            .iter()
            .find(|(_, name, _)| *name == s)
            .map(|c| c.0)
            .expect("clap only lets a listed name through")
    })
}

pub fn system() -> impl TypedValueParser<Value = System> {
    parser(System::CHOICES)
}
pub fn format() -> impl TypedValueParser<Value = Format> {
    parser(Format::CHOICES)
}
pub fn rank() -> impl TypedValueParser<Value = Rank> {
    parser(Rank::CHOICES)
}
pub fn family() -> impl TypedValueParser<Value = Family> {
    parser(Family::CHOICES)
}
pub fn objective() -> impl TypedValueParser<Value = Objective> {
    parser(Objective::CHOICES)
}
pub fn nominal() -> impl TypedValueParser<Value = beamsift::catalog::generate::Nominal> {
    parser(beamsift::catalog::generate::Nominal::CHOICES)
}
