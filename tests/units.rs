//! Unit parsing: every listed unit, round trips and rejections. Factors
//! are checked against NIST SP 811 (2008), Appendix B.8 (from memory:
//! 1 lbf = 4.448 222 N, 1 ksi = 6.894 757 MPa, 1 psf = 47.880 26 Pa,
//! 1 kip·ft = 1.355 818 kN·m, 1 lb/ft³ = 16.018 46 kg/m³).

mod common;

use beamsift::units::{Dim, Show, System, fmt_num, parse};

#[track_caller]
fn check(text: &str, dim: Dim, want: f64) {
    let got = parse(text, dim).unwrap_or_else(|e| panic!("{text}: {e}"));
    common::close(text, got, want, 1e-6);
}

#[test]
fn lengths() {
    check("1 mm", Dim::Length, 1.0);
    check("2.5cm", Dim::Length, 25.0);
    check("6 m", Dim::Length, 6000.0);
    check("1 in", Dim::Length, 25.4);
    check("1 ft", Dim::Length, 304.8);
    check("12'-6\"", Dim::Length, 12.5 * 304.8);
    check("12' 6\"", Dim::Length, 12.5 * 304.8);
    check("10'", Dim::Length, 3048.0);
    check("9\"", Dim::Length, 9.0 * 25.4);
    check("3' 1 1/2\"", Dim::Length, 3.0 * 304.8 + 1.5 * 25.4);
    check("1.5e3 mm", Dim::Length, 1500.0);
}

#[test]
fn forces_loads_moments_stresses() {
    check("1 kN", Dim::Force, 1000.0);
    check("1 lbf", Dim::Force, 4.448222);
    check("1 kip", Dim::Force, 4448.222);
    check("1 kN/m", Dim::LineLoad, 1.0);
    check("1000 N/m", Dim::LineLoad, 1.0);
    check("1 klf", Dim::LineLoad, 4448.222 / 304.8);
    check("100 plf", Dim::LineLoad, 100.0 * 4.448222 / 304.8);
    check("1 kip/ft", Dim::LineLoad, 4448.222 / 304.8);
    check("1 psf", Dim::AreaLoad, 47.88026e-6);
    check("1 ksf", Dim::AreaLoad, 47.88026e-3);
    check("2.4 kPa", Dim::AreaLoad, 2.4e-3);
    check("2.4 kN/m²", Dim::AreaLoad, 2.4e-3);
    check("1 kN·m", Dim::Moment, 1e6);
    check("1 kN-m", Dim::Moment, 1e6);
    check("1 kNm", Dim::Moment, 1e6);
    check("1 kN*m", Dim::Moment, 1e6);
    check("1 kN m", Dim::Moment, 1e6);
    check("1 kip-ft", Dim::Moment, 1.355818e6);
    check("1 kip-in", Dim::Moment, 1.355818e6 / 12.0);
    check("1 lb-in", Dim::Moment, 112.9848);
    check("250 MPa", Dim::Stress, 250.0);
    check("250 N/mm²", Dim::Stress, 250.0);
    check("250 N/mm^2", Dim::Stress, 250.0);
    check("250 N/mm2", Dim::Stress, 250.0);
    check("200 GPa", Dim::Stress, 200_000.0);
    check("1 ksi", Dim::Stress, 6.894757);
    check("1 psi", Dim::Stress, 6.894757e-3);
    check("1 kPa", Dim::Stress, 1e-3);
}

#[test]
fn section_quantities_mass_density() {
    check("1 cm²", Dim::Area, 100.0);
    check("1 in^2", Dim::Area, 645.16);
    check("1 cm3", Dim::Modulus, 1000.0);
    check("1 in³", Dim::Modulus, 16387.064);
    check("8356 cm4", Dim::SecondMoment, 8356e4);
    check("83.56 10^6 mm^4", Dim::SecondMoment, 83.56e6);
    check("83.56 10⁶ mm⁴", Dim::SecondMoment, 83.56e6);
    check("83.56 x10^6 mm4", Dim::SecondMoment, 83.56e6);
    check("1 in4", Dim::SecondMoment, 416231.4256);
    check("1 cm6", Dim::Warping, 1e6);
    check("1 lb/ft", Dim::MassPerLength, 1.488164);
    check("42.2 kg/m", Dim::MassPerLength, 42.2);
    check("1 pcf", Dim::Density, 16.01846);
    check("1 lb/ft3", Dim::Density, 16.01846);
    check("7.85 t/m3", Dim::Density, 7850.0);
    check("5 kN/m3", Dim::Density, 5000.0 / 9.80665);
}

#[test]
fn round_trips_through_display_units() {
    let cases = [
        (Show::Span, Dim::Length, 7315.2),
        (Show::Dimension, Dim::Length, 203.2),
        (Show::Force, Dim::Force, 44482.0),
        (Show::LineLoad, Dim::LineLoad, 14.6),
        (Show::Moment, Dim::Moment, 1.234e8),
        (Show::Stress, Dim::Stress, 165.5),
        (Show::Area, Dim::Area, 5381.0),
        (Show::SectionModulus, Dim::Modulus, 557_100.0),
        (Show::SecondMoment, Dim::SecondMoment, 83.56e6),
        (Show::Mass, Dim::MassPerLength, 42.2),
    ];
    for sys in [System::Si, System::Us] {
        for (show, dim, v) in cases {
            let text = format!("{} {}", show.value(v, sys), show.label(sys));
            let back = parse(&text, dim).unwrap_or_else(|e| panic!("{text}: {e}"));
            common::close(&text, back, v, 1e-12);
        }
    }
}

#[test]
fn rejections_name_what_is_accepted() {
    for (text, dim) in [
        ("12", Dim::Length),
        ("12 furlongs", Dim::Length),
        ("NaN mm", Dim::Length),
        ("inf kN", Dim::Force),
        ("-inf MPa", Dim::Stress),
        ("", Dim::Stress),
        ("kN", Dim::Force),
        ("5 kg/m", Dim::LineLoad),
        ("1e400 mm", Dim::Length),
        ("12'-x\"", Dim::Length),
        // Found by tests/robust.rs (regressions): non-finite feet.
        ("inf'", Dim::Length),
        ("1.6401843562914612e308'", Dim::Length),
        // Found by cargo-fuzz (units target): a multi-byte character before
        // " /" once split the unit text inside a character.
        ("1\u{a032}\0 ( /", Dim::Length),
        ("1\u{a032} /m", Dim::LineLoad),
    ] {
        let e = parse(text, dim).expect_err(text).to_string();
        assert!(
            e.contains("expected") || e.contains("range") || e.contains("needs"),
            "'{text}': {e}"
        );
    }
    let e = parse("12", Dim::Stress).unwrap_err().to_string();
    assert!(e.contains("MPa") && e.contains("ksi"), "{e}");
}

#[test]
fn engineering_number_format() {
    assert_eq!(fmt_num(0.0), "0");
    assert_eq!(fmt_num(83.5612), "83.56");
    assert_eq!(fmt_num(5381.2), "5,381");
    // Rounding that carries into the thousands keeps the separator.
    assert_eq!(fmt_num(999.96), "1,000");
    assert_eq!(fmt_num(-999.97), "-1,000");
    assert_eq!(fmt_num(999.94), "999.9");
    assert_eq!(fmt_num(1234567.0), "1,234,567");
    assert_eq!(fmt_num(-0.012345), "-0.01235");
    assert_eq!(fmt_num(7.1), "7.1");
}

#[test]
fn capacities_are_shown_rounded_down() {
    // A longest passing span of 4.2369 m shown to 0.01 m must read 4.23,
    // never 4.24 (a span the section does not carry); 25.4·12·14.99 mm is
    // 14.99 ft exactly and stays 14.99 (NIST SP 811: 1 ft = 304.8 mm).
    assert_eq!(Show::Span.fixed_down(4236.9, System::Si, 2), "4.23");
    assert_eq!(Show::Span.fixed(4236.9, System::Si, 2), "4.24");
    assert_eq!(Show::Span.fixed_down(4200.0, System::Si, 2), "4.20");
    assert_eq!(Show::Span.fixed_down(304.8 * 14.99, System::Us, 2), "14.99");
    assert_eq!(
        Show::Span.fixed_down(304.8 * 14.999, System::Us, 2),
        "14.99"
    );
}

/// Fractional inches: 1 in = 25.4 mm exactly (NIST SP 811 (2008), B.8,
/// from memory); the fractions are plain arithmetic (3/16 = 0.1875).
#[test]
fn fractional_inches() {
    check("3/16 in", Dim::Length, 0.1875 * 25.4);
    check("1-1/2 in", Dim::Length, 1.5 * 25.4);
    check("1 1/2 in", Dim::Length, 1.5 * 25.4);
    check("1-1/2in", Dim::Length, 1.5 * 25.4);
    check("5/8\"", Dim::Length, 0.625 * 25.4);
    check("1-1/2\"", Dim::Length, 1.5 * 25.4);
    check("12'-1 1/4\"", Dim::Length, 12.0 * 304.8 + 1.25 * 25.4);
    let list = beamsift::units::parse_list("3/16,1/4,1-1/2 in", Dim::Length, "t").unwrap();
    let want = [0.1875 * 25.4, 0.25 * 25.4, 1.5 * 25.4];
    for (g, w) in list.iter().zip(want) {
        common::close("list", *g, w, 1e-9);
    }
    assert_eq!(list.len(), 3);
}

#[test]
fn fraction_nonsense_is_refused_with_the_reason() {
    for (text, says) in [
        ("1/0 in", "denominator"),
        ("3//4 in", "fraction"),
        ("1-1/2/3 in", "fraction"),
        ("-1/2 in", "negative"),
        ("1/2.5 in", "fraction"),
        ("1/2\"", ""),
    ] {
        match parse(text, Dim::Length) {
            Ok(v) if says.is_empty() => common::close(text, v, 12.7, 1e-9),
            Ok(v) => panic!("{text} read as {v}"),
            Err(e) => assert!(e.to_string().contains(says), "{text}: {e}"),
        }
    }
    let e = parse("1/2 kip", Dim::Force).unwrap_err().to_string();
    assert!(e.contains("only for lengths"), "{e}");
}

proptest::proptest! {
    /// A fraction parses equal to its decimal (w + n/d, plain arithmetic).
    #[test]
    fn a_fraction_equals_its_decimal(w in 0u32..100, n in 0u32..64, d in 1u32..65) {
        let v = w as f64 + n as f64 / d as f64;
        for text in [format!("{w}-{n}/{d} in"), format!("{w} {n}/{d} in")] {
            let got = parse(&text, Dim::Length).unwrap();
            proptest::prop_assert!((got - v * 25.4).abs() <= 1e-9 * (1.0 + v), "{text}: {got}");
        }
        let cell = format!("{w}-{n}/{d}");
        let got = beamsift::catalog::number(cell.as_bytes()).unwrap();
        proptest::prop_assert!((got - v).abs() <= 1e-12 * (1.0 + v), "{cell}: {got}");
    }
}

/// Feet-inches output (`--units us-ft-in`): spans and lengths to the
/// nearest 1/16 in, fractions reduced, as the trade writes them on drawings
/// (common practice). 1 ft = 304.8 mm and 1 in = 25.4 mm exactly (NIST SP
/// 811 (2008), B.8, from memory): 16 ft 1 in = 4,902.2 mm; 6 m = 236.22 in
/// = 19 ft 8.22 in, nearest 1/16 is 8 4/16 = 8 1/4 in.
#[test]
fn feet_inches_output() {
    let sys = System::UsFeetInches;
    assert_eq!(Show::Span.fmt(16.0 * 304.8 + 25.4, sys), "16'-1\"");
    assert_eq!(Show::Span.fmt(6000.0, sys), "19'-8 1/4\"");
    assert_eq!(Show::Span.fmt(25.4 * 3.0 / 8.0, sys), "0'-0 3/8\"");
    assert_eq!(Show::Span.fmt(-2.0 * 304.8, sys), "-2'-0\"");
    assert_eq!(Show::Span.fmt(0.0, sys), "0'-0\"");
    // 11 15/16 in and a little more rounds up to the next foot.
    assert_eq!(Show::Span.fmt(304.8 - 0.5, sys), "1'-0\"");
    // Capacities round down: 14 ft 11.999 in shows 14'-11 15/16".
    assert_eq!(
        Show::Span.fixed_down(304.8 * 15.0 - 0.025, sys, 2),
        "14'-11 15/16\""
    );
    assert_eq!(Show::Span.label(sys), "ft-in");
    // Other quantities read as in plain US units.
    assert_eq!(Show::Dimension.fmt(25.4 * 1.5, sys), "1.5 in");
    assert_eq!(Show::Force.fmt(4448.2216152605, sys), "1 kip");
}
