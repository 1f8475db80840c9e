//! The choice tables (`CHOICES`) a front end lists: every variant once,
//! and the names the JSON output uses (the serde names).

use beamsift::optimise::{Family, Objective};
use beamsift::report::Format;
use beamsift::search::Rank;
use beamsift::units::System;

type Choice<T> = (T, &'static str, &'static str);

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
        System::Si | System::Us | System::UsFeetInches => (),
    };
    let all_formats = |f: Format| match f {
        Format::Table
        | Format::Json
        | Format::Csv
        | Format::Markdown
        | Format::Xlsx
        | Format::CsvNumeric => (),
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
    listed(
        System::CHOICES,
        &[System::Si, System::Us, System::UsFeetInches],
    );
    listed(
        Format::CHOICES,
        &[
            Format::Table,
            Format::Json,
            Format::Csv,
            Format::Markdown,
            Format::Xlsx,
            Format::CsvNumeric,
        ],
    );
    listed(
        Rank::CHOICES,
        &[Rank::Mass, Rank::Cost, Rank::Depth, Rank::Utilisation],
    );
    listed(
        Family::CHOICES,
        &[Family::Rect, Family::WeldedI, Family::MonoI, Family::Rhs],
    );
    listed(
        Objective::CHOICES,
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
    same(System::CHOICES);
    same(Rank::CHOICES);
    same(Family::CHOICES);
    same(Objective::CHOICES);
}
