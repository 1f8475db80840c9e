//! Robustness: arbitrary input never panics; results keep the physical
//! invariants; numbers stay finite and right across the supported range.

mod common;

use beamsift::beam::*;
use beamsift::catalog::read::{self, ReadOptions};
use beamsift::catalog::{Materials, number};
use beamsift::check::*;
use beamsift::search::{self, Rank, ScanOptions};
use beamsift::section::Shape;
use beamsift::units::{self, Dim};
use proptest::prelude::*;

fn timber() -> Material {
    common::allowable(10_000.0, 10.0, Some(1.0), 450.0)
}

/// A simple span under dead load that carries the self-weight, D ≤ L/360.
fn job(l: f64, w: f64) -> Beam {
    let mut b = common::dead_span(l, w, 360.0);
    b.self_weight_case = Some(0);
    b
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, rng_seed: proptest::test_runner::RngSeed::Fixed(0x5eed_726f6275), ..ProptestConfig::default() })]

    /// The unit parser never panics, and what it accepts is finite.
    #[test]
    fn unit_parser_total(s in ".{0,40}", dim in 0usize..12) {
        let dims = [Dim::Length, Dim::Force, Dim::LineLoad, Dim::AreaLoad, Dim::Moment, Dim::Stress, Dim::Area,
                    Dim::Modulus, Dim::SecondMoment, Dim::Warping, Dim::MassPerLength, Dim::Density];
        if let Ok(v) = units::parse(&s, dims[dim]) {
            prop_assert!(v.is_finite());
        }
    }

    /// Structured near-misses of quantities never panic either.
    #[test]
    fn unit_parser_near_misses(n in prop::num::f64::ANY, u in "(mm|kN|kN/m|MPa|cm4|'|\"|10\\^6 mm\\^4|ft|in| |·|-|/|\\^|²){0,5}") {
        let s = format!("{n}{u}");
        if let Ok(v) = units::parse(&s, Dim::Length) {
            prop_assert!(v.is_finite());
        }
    }

    /// The catalogue fast number parser agrees exactly with the standard
    /// library on plain decimals.
    #[test]
    fn fast_number_parse_is_exact(int in 0u64..10_000_000_000, frac in 0u64..100_000_000, digits in 0usize..9, neg in any::<bool>()) {
        let f = format!("{frac:08}");
        let text = if digits == 0 { format!("{}{int}", if neg { "-" } else { "" }) } else { format!("{}{int}.{}", if neg { "-" } else { "" }, &f[..digits]) };
        let want: f64 = text.parse().unwrap();
        prop_assert_eq!(number(text.as_bytes()), Some(want));
    }

    /// Arbitrary bytes as a catalogue: an error or rows, never a panic.
    #[test]
    fn catalogue_reader_total(bytes in prop::collection::vec(any::<u8>(), 0..400)) {
        let mut text = b"name,shape,b [mm],d [mm],Ix [cm4],mass [kg/m]\n".to_vec();
        text.extend_from_slice(&bytes);
        if let Ok(cat) = read::open(text.as_slice(), "fuzz.csv", &ReadOptions::default()) {
            let _ = read::validate(cat, &timber(), &[], true);
        }
        let _ = read::open(bytes.as_slice(), "fuzz.csv", &ReadOptions::default());
    }

    /// Arbitrary text as a job file: an error or a job, never a panic.
    #[test]
    fn job_reader_total(s in "(\\[beam\\]|\\[material\\]|\\[\\[case\\]\\]|\\[\\[load\\]\\]|spans = \\[\"[0-9.]+ m\"\\]|supports = \\[\"pinned\", \"(pinned|free|fixed)\"\\]|E = \"[0-9]+ GPa\"|Fb = \"[0-9]+ MPa\"|name = \"D\"|category = \"dead\"|case = \"D\"|uniform = \"[-0-9.e]+ kN/m\"|point = \"[0-9]+ kN\"|at = \"[-0-9.]+ m\"|\n){0,30}") {
        let _ = beamsift::job::from_toml(&s, "fuzz.toml");
    }

    /// A section that passes still passes under less load or on a shorter span.
    #[test]
    fn less_load_or_shorter_span_still_passes(l in 1000.0..8000.0f64, w in 0.5..10.0f64, b in 40.0..120.0f64, d in 100.0..400.0f64, f in 0.1..1.0f64) {
        let p = Shape::Rect { b, d }.properties().unwrap();
        let mass = p.mass_per_length(450.0);
        let check = |beam: Beam| Prepared::new(&beam, timber(), common::allowable_only()).unwrap().check(SectionInput::new(&p, mass));
        let base = check(job(l, w));
        if base.passes {
            prop_assert!(check(job(l, w * f)).passes);
            prop_assert!(check(job(l * f, w)).passes);
        }
        prop_assert!(check(job(l, w * f)).utilisation <= base.utilisation * (1.0 + 1e-12));
    }

    /// Results do not depend on the order of the rows.
    #[test]
    fn selection_independent_of_row_order(seed in any::<u64>()) {
        let mut rows: Vec<String> = (0..120).map(|i| {
            let b = 30 + (i * 7919 + seed as usize) % 90;
            let d = 100 + (i * 104729 + (seed >> 8) as usize) % 300;
            format!("R{i:03},rect,{b},{d}")
        }).collect();
        let run = |rows: &[String]| {
            let text = format!("name,shape,b [mm],d [mm]\n{}\n", rows.join("\n"));
            let prep = Prepared::new(&job(4000.0, 2.0), timber(), common::allowable_only()).unwrap();
            let m = timber();
            let mats = Materials { base: &m, grades: &[] };
            let open = || read::open(text.as_bytes(), "t.csv", &ReadOptions::default()).map(|c| vec![c]);
            let opts = ScanOptions { ranks: vec![(Rank::Mass, 20), (Rank::Depth, 20)], ..ScanOptions::default() };
            let sel = search::scan_checked(&prep, &open, &mats, &opts, &|_, _| {}).unwrap();
            sel.lists.iter().map(|l| l.items.iter().map(|c| c.name.clone()).collect::<Vec<_>>()).collect::<Vec<_>>()
        };
        let a = run(&rows);
        rows.reverse();
        let mut k = seed as usize;
        for i in (1..rows.len()).rev() {
            k = k.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            rows.swap(i, (k >> 33) % (i + 1));
        }
        prop_assert_eq!(a, run(&rows));
    }
}

/// Across the supported range (spans 1 mm to 1 km, loads from 10⁻⁶ to
/// 10⁶ N/mm) a simple span stays finite and matches wL²/8 and
/// 5wL⁴/(384EI) (standard formulas) to round-off.
#[test]
fn scale_extremes_stay_finite_and_right() {
    for l in [1.0, 10.0, 1000.0, 1e5, 1e6] {
        for w in [1e-6, 1.0, 1e6] {
            let mut b = Beam::new(vec![l], vec![Support::Pinned, Support::Roller]);
            let d = b.case("D", Category::Dead);
            b.udl(d, w);
            b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
            let dm = Demand::build(&b, &[]).unwrap();
            let m = dm.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..dm.len.len());
            let y = dm.combo_extremes(0, 0.0, 1.0, Quantity::Deflection, 0..dm.len.len());
            assert!(m.max.is_finite() && y.max.is_finite());
            assert!(
                (m.max - w * l * l / 8.0).abs() <= 1e-9 * w * l * l,
                "L {l} w {w}"
            );
            assert!(
                (y.max - 5.0 * w * l.powi(4) / 384.0).abs() <= 1e-8 * w * l.powi(4),
                "L {l} w {w}"
            );
        }
    }
    // Out of range is refused with the range stated.
    let b = Beam::new(vec![2e6], vec![Support::Pinned, Support::Roller]);
    assert!(
        Demand::build(&b, &[])
            .unwrap_err()
            .to_string()
            .contains("1 km")
    );
    let mut b = Beam::new(vec![1000.0], vec![Support::Pinned, Support::Roller]);
    let d = b.case("D", Category::Dead);
    b.udl(d, 1e12);
    assert!(
        Demand::build(&b, &[])
            .unwrap_err()
            .to_string()
            .contains("supported range")
    );
    let e = Shape::Rect { b: 1e7, d: 100.0 }
        .properties()
        .unwrap_err()
        .to_string();
    assert!(e.contains("supported range"), "{e}");
}
