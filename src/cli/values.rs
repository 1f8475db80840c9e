//! The command line's names for the library's choices (unit system,
//! output format, ranking, section family, objective). The library knows
//! nothing of clap: each choice is a table of (value, name, help) here,
//! turned into a clap value parser, and the tests below hold every table
//! to the library's own serde names and to every variant.

use beamsift::optimise::{Family, Objective};
use beamsift::report::Format;
use beamsift::search::Rank;
use beamsift::units::System;
use clap::builder::{PossibleValue, PossibleValuesParser, TypedValueParser};

/// One choice: the value, the name typed on the command line, its help.
type Choice<T> = (T, &'static str, &'static str);

pub const SYSTEMS: &[Choice<System>] = &[
    (System::Si, "si", "SI: mm, m, kN, kN·m, MPa"),
    (System::Us, "us", "US customary: in, ft, kip, kip·ft, ksi"),
];

pub const FORMATS: &[Choice<Format>] = &[
    (Format::Table, "table", "Aligned tables for the terminal"),
    (
        Format::Json,
        "json",
        "JSON from the result model (for scripts)",
    ),
    (Format::Csv, "csv", "CSV of the main table(s)"),
    (Format::Markdown, "markdown", "Markdown"),
];

pub const RANKS: &[Choice<Rank>] = &[
    (Rank::Mass, "mass", "Lightest first (mass per length)"),
    (
        Rank::Cost,
        "cost",
        "Cheapest first (cost per length; rows without a cost last)",
    ),
    (Rank::Depth, "depth", "Shallowest first"),
    (
        Rank::Utilisation,
        "utilisation",
        "Most highly utilised first (the least spare capacity)",
    ),
];

pub const FAMILIES: &[Choice<Family>] = &[
    (Family::Rect, "rect", "Solid rectangle: b, d"),
    (
        Family::WeldedI,
        "welded-i",
        "Doubly symmetric welded I: bf, tf, hw, tw",
    ),
    (
        Family::MonoI,
        "mono-i",
        "Mono-symmetric welded I: bf_top, tf_top, bf_bot, tf_bot, hw, tw",
    ),
    (
        Family::Rhs,
        "rhs",
        "Rectangular hollow section (sharp corners): b, h, t",
    ),
];

pub const OBJECTIVES: &[Choice<Objective>] = &[
    (
        Objective::Area,
        "area",
        "Cross-sectional area (= mass per length)",
    ),
    (
        Objective::Cost,
        "cost",
        "Cost from plate prices (currency per kg by thickness)",
    ),
    (
        Objective::Depth,
        "depth",
        "Overall depth (area breaks ties)",
    ),
];

/// A clap value parser for one table of choices.
pub fn parser<T: Copy + Send + Sync + 'static>(
    table: &'static [Choice<T>],
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
    parser(SYSTEMS)
}
pub fn format() -> impl TypedValueParser<Value = Format> {
    parser(FORMATS)
}
pub fn rank() -> impl TypedValueParser<Value = Rank> {
    parser(RANKS)
}
pub fn family() -> impl TypedValueParser<Value = Family> {
    parser(FAMILIES)
}
pub fn objective() -> impl TypedValueParser<Value = Objective> {
    parser(OBJECTIVES)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every variant of a library choice is in its table, once (a new
    /// variant fails to compile here until the table lists it).
    fn listed<T: Copy + PartialEq>(table: &[Choice<T>], all: &[T]) {
        assert_eq!(table.len(), all.len());
        for v in all {
            assert_eq!(table.iter().filter(|c| c.0 == *v).count(), 1);
        }
    }

    #[test]
    fn every_variant_is_listed() {
        let all_systems = |s: System| match s {
            System::Si | System::Us => (),
        };
        let all_formats = |f: Format| match f {
            Format::Table | Format::Json | Format::Csv | Format::Markdown => (),
        };
        let all_ranks = |r: Rank| match r {
            Rank::Mass | Rank::Cost | Rank::Depth | Rank::Utilisation => (),
        };
        let all_families = |f: Family| match f {
            Family::Rect | Family::WeldedI | Family::MonoI | Family::Rhs => (),
        };
        let all_objectives = |o: Objective| match o {
            Objective::Area | Objective::Cost | Objective::Depth => (),
        };
        let _ = (
            all_systems,
            all_formats,
            all_ranks,
            all_families,
            all_objectives,
        );
        listed(SYSTEMS, &[System::Si, System::Us]);
        listed(
            FORMATS,
            &[Format::Table, Format::Json, Format::Csv, Format::Markdown],
        );
        listed(
            RANKS,
            &[Rank::Mass, Rank::Cost, Rank::Depth, Rank::Utilisation],
        );
        listed(
            FAMILIES,
            &[Family::Rect, Family::WeldedI, Family::MonoI, Family::Rhs],
        );
        listed(
            OBJECTIVES,
            &[Objective::Area, Objective::Cost, Objective::Depth],
        );
    }

    /// The command-line names are the names the JSON output uses.
    #[test]
    fn names_are_the_serde_names() {
        fn same<T: serde::Serialize>(table: &[Choice<T>]) {
            for (v, name, _) in table {
                assert_eq!(serde_json::to_value(v).unwrap(), *name);
            }
        }
        same(SYSTEMS);
        same(RANKS);
        same(FAMILIES);
        same(OBJECTIVES);
    }
}
