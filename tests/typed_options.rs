//! The library's parsers of options as typed (what a front end hands
//! over as text): delimiters, row filters, span lists, worker counts,
//! optimiser bounds and plate prices. Each value names its source.

use beamsift::catalog::read::ReadOptions;
use beamsift::optimise::{Family, Objective, Options};
use beamsift::search::{Filters, check_workers};
use beamsift::sweep;

#[test]
fn delimiter_is_one_character_or_tab() {
    // ASCII: horizontal tab is 0x09, semicolon 0x3B (ISO/IEC 646).
    assert_eq!(ReadOptions::from_delimiter("tab").unwrap().delimiter, 0x09);
    assert_eq!(ReadOptions::from_delimiter("\\t").unwrap().delimiter, 0x09);
    assert_eq!(ReadOptions::from_delimiter(";").unwrap().delimiter, 0x3B);
    for bad in ["", "ab", "tabs"] {
        let e = ReadOptions::from_delimiter(bad).unwrap_err().to_string();
        assert!(e.contains("expected one character or 'tab'"), "{e}");
    }
}

#[test]
fn filters_take_lengths_with_units() {
    // 1 ft = 304.8 mm exactly (international foot, 1959 agreement).
    let f = Filters::parse(Some("1ft"), Some("0.2m"), None, None, true, None).unwrap();
    assert!((f.max_depth.unwrap() - 304.8).abs() < 1e-9);
    assert!((f.min_depth.unwrap() - 200.0).abs() < 1e-9);
    assert_eq!(f.max_width, None);
    assert!(f.in_stock_only);
    // A bare number has no unit: refused, naming the option.
    let e = Filters::parse(None, None, Some("35"), None, false, None)
        .unwrap_err()
        .to_string();
    assert!(e.contains("--max-width"), "{e}");
}

#[test]
fn spans_as_a_range_or_a_list_and_bounded() {
    // 3 m to 9 m by 0.5 m: (9 − 3) / 0.5 + 1 = 13 spans (arithmetic).
    let s = sweep::options::spans("3m..9m:0.5m", false).unwrap();
    assert_eq!(s.len(), 13);
    assert!((s[12] - 9000.0).abs() < 1e-6);
    // A list with one unit at the end: 4, 5, 6 m.
    assert_eq!(
        sweep::options::spans("4,5,6m", false).unwrap(),
        vec![4000.0, 5000.0, 6000.0]
    );
    // 1 m to 300 m by 1 m is 300 spans: within 1000, over the 200 taken
    // with an optimum at each (the documented bounds of a sweep).
    assert_eq!(
        sweep::options::spans("1m..300m:1m", false).unwrap().len(),
        300
    );
    assert!(sweep::options::spans("1m..300m:1m", true).is_err());
}

#[test]
fn worker_counts_are_bounded_by_the_cores() {
    // At most four workers per core and 256 (the documented bound).
    assert!(check_workers(0, 2).is_err());
    assert!(check_workers(8, 2).is_ok());
    assert!(check_workers(9, 2).is_err());
    assert!(check_workers(256, 128).is_ok());
    assert!(check_workers(257, 128).is_err());
}

fn options(family: Family) -> Options {
    Options {
        family,
        bounds: Vec::new(),
        max_depth: None,
        min_depth: None,
        aspect: None,
        lambda_f: None,
        lambda_w: None,
        compact: false,
        objective: Objective::Area,
        plates: None,
        plate_prices: None,
        step: None,
        b_sizes: None,
        d_sizes: None,
        starts: 6,
    }
}

#[test]
fn optimiser_options_refused_where_they_do_not_apply() {
    // A solid rectangle has no plate thickness (its variables are b, d).
    let mut o = options(Family::Rect);
    o.plates = Some("8,10mm".into());
    let e = o.refuse_inapplicable().unwrap_err().to_string();
    assert!(e.contains("--plates"), "{e}");
    // Plate prices only mean something when cost is minimised.
    let mut o = options(Family::WeldedI);
    o.plate_prices = Some("1.2".into());
    let e = o.refuse_inapplicable().unwrap_err().to_string();
    assert!(e.contains("--plate-prices"), "{e}");
    assert!(options(Family::WeldedI).refuse_inapplicable().is_ok());
}
