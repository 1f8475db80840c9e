//! Span tables against the standard formulas, against `check` at the
//! found span, and for monotonicity.

mod common;

use beamsift::beam::*;
use beamsift::catalog::{Materials, RowMaterial};
use beamsift::check::*;
use beamsift::search::Candidate;
use beamsift::section::Shape;
use beamsift::sweep::{self, Method, TableOptions};

fn timber() -> Material {
    common::allowable(10_000.0, 10.0, None, 450.0)
}

/// Bending and deflection only: shear and lateral stability excluded by the
/// user (the closed forms below are for those two).
fn crit() -> Criteria {
    let mut c = common::allowable_only();
    c.exclude.shear = true;
    c
}

fn row(b: f64, d: f64, density: f64) -> Candidate {
    let shape = Shape::Rect { b, d };
    let p = shape.properties().unwrap();
    Candidate {
        name: format!("{b}x{d}"),
        series: String::new(),
        grade: String::new(),
        shape: Some(shape),
        file: 0,
        line: 0,
        mass: p.mass_per_length(density),
        depth: d,
        width: b,
        cost: None,
        stock: None,
        utilisation: 0.0,
        governing: None,
        verdict: beamsift::check::Verdict::NotVerified,
        passes: false,
        not_verified: Vec::new(),
        not_checked: Vec::new(),
        pareto: false,
        properties: p,
        material: RowMaterial::Job,
    }
}

/// Pinned at every support, dead load carrying the self-weight, D ≤ L/n.
fn job(spans: Vec<f64>, w: f64, n: f64) -> Beam {
    let k = spans.len();
    let mut b = common::dead_load(spans, vec![Support::Pinned; k + 1], w, n);
    b.self_weight_case = Some(0);
    b
}

fn cell(beam: &Beam, r: &Candidate, opts: &TableOptions) -> sweep::Cell {
    let m = timber();
    let mats = Materials {
        base: &m,
        grades: &[],
    };
    sweep::max_span(beam, &m, &crit(), r, &mats, opts).unwrap()
}

/// Simple span, uniform load w (self-weight ρ·g·A included): from M =
/// wL²/8 and δ = 5wL⁴/(384EI) (AISC Manual Table 3-23 case 1):
/// L_stress = √(8·Fb·S/w), L_deflection = (384·E·I/(5·n·w))^(1/3) for L/n.
/// Closed form: round-off only (1e-9). Bisection: within its 1 mm tolerance.
#[test]
fn simple_span_max_spans_match_the_formulas() {
    for (b, d, w, n) in [
        (50.0, 200.0, 2.0, 360.0),
        (75.0, 300.0, 6.0, 240.0),
        (45.0, 95.0, 0.5, 180.0),
    ] {
        let r = row(b, d, 450.0);
        let sw = 450.0 * 9.80665 * b * d * 1e-9;
        let wt = w + sw;
        let s = b * d * d / 6.0;
        let i = b * d.powi(3) / 12.0;
        let l_stress = (8.0 * 10.0 * s / wt).sqrt();
        let l_defl = (384.0 * 10_000.0 * i / (5.0 * n * wt)).cbrt();
        let want = l_stress.min(l_defl);
        let beam = job(vec![4000.0], w, n);
        let c = cell(&beam, &r, &TableOptions::default());
        assert_eq!(c.method, Method::ClosedForm);
        let got = c.span.unwrap();
        assert!((got - want).abs() < 1e-9 * want, "{b}x{d}: {got} vs {want}");
        let gov = c.governing.unwrap();
        assert_eq!(gov == CheckKind::Deflection, l_defl < l_stress);
        // A negligible point load forces bisection: same span within 1 mm.
        let mut b2 = beam.clone();
        b2.load(0, LoadKind::Point { x: 2000.0, p: 1e-9 });
        let c2 = cell(&b2, &r, &TableOptions::default());
        assert_eq!(c2.method, Method::Bisection);
        assert!(
            (c2.span.unwrap() - want).abs() <= 1.0,
            "{} vs {want}",
            c2.span.unwrap()
        );
    }
}

/// Two equal continuous spans under uniform load (AISC Table 3-23 case 29,
/// from memory): support moment wL²/8, so L_stress = √(8·Fb·S/w) as for a
/// simple span; Δmax = wL⁴/(185·E·I) (185 rounds 184.6), so
/// L_deflection = (185·E·I/(n·w))^(1/3) within 0.1 %.
#[test]
fn two_span_max_spans_match_the_coefficients() {
    let r = row(63.0, 225.0, 450.0);
    let sw = 450.0 * 9.80665 * 63.0 * 225.0 * 1e-9;
    for (w, n) in [(8.0, 360.0), (1.0, 360.0)] {
        let wt = w + sw;
        let p = &r.properties;
        let l_stress = (8.0 * 10.0 * p.s_top / wt).sqrt();
        let l_defl = (185.0 * 10_000.0 * p.ix / (n * wt)).cbrt();
        let beam = job(vec![4000.0, 4000.0], w, n);
        let c = cell(&beam, &r, &TableOptions::default());
        let got = c.span.unwrap();
        if l_stress < l_defl {
            assert!(
                (got - l_stress).abs() < 1e-9 * l_stress,
                "{got} vs {l_stress}"
            );
        } else {
            assert!((got - l_defl).abs() < 1e-3 * l_defl, "{got} vs {l_defl}");
        }
    }
}

/// Every cell agrees with `check` at that span: just under passes, just
/// over fails; rounding down keeps it passing.
#[test]
fn cells_agree_with_check() {
    let m = timber();
    for beam in [job(vec![4000.0], 3.0, 360.0), {
        let mut b = job(vec![4000.0, 3000.0], 3.0, 360.0);
        b.load(
            0,
            LoadKind::Point {
                x: 1500.0,
                p: 2000.0,
            },
        );
        b
    }] {
        for (b, d) in [(47.0, 150.0), (63.0, 250.0), (75.0, 300.0)] {
            let r = row(b, d, 450.0);
            for round in [None, Some(10.0)] {
                let opts = TableOptions {
                    round,
                    ..TableOptions::default()
                };
                let c = cell(&beam, &r, &opts);
                let l = c.span.unwrap();
                let exact = c.exact.unwrap();
                let check_at = |span: f64| {
                    let p = Prepared::new(&sweep::at_span(&beam, span), m.clone(), crit()).unwrap();
                    p.check(SectionInput::new(&r.properties, r.mass)).passes
                };
                assert!(check_at(l), "{b}x{d} passes at {l}");
                let over = if c.method == Method::ClosedForm {
                    exact * (1.0 + 1e-6)
                } else {
                    exact + opts.tolerance
                };
                assert!(!check_at(over), "{b}x{d} fails just over {exact}");
                if round.is_some() {
                    assert!((l / 10.0 - (l / 10.0).round()).abs() < 1e-9 && l <= exact);
                }
            }
        }
    }
}

/// Monotonicity: a heavier load or a wider spacing never gives a longer
/// span; a deeper section of the same width never a shorter one when
/// deflection governs.
#[test]
fn monotone_in_load_spacing_and_depth() {
    let mut beam = job(vec![4000.0], 0.0, 360.0);
    beam.loads.clear();
    let l = beam.case("L", Category::Live);
    beam.load(
        l,
        LoadKind::Distributed {
            x1: 0.0,
            x2: 4000.0,
            w1: 0.0,
            w2: 0.0,
        },
    );
    beam.loads[0].tributary = Some((2.0e-3, 400.0));
    beam.combinations.clear();
    beam.combo("D+L", ComboKind::Strength, &[(0, 1.0), (l, 1.0)]);
    beam.service(
        "L",
        &[(l, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    let r = row(63.0, 225.0, 450.0);
    let mut last = f64::INFINITY;
    for spacing in [300.0, 400.0, 450.0, 600.0, 800.0] {
        let b = beam.with_spacing(spacing).unwrap();
        let s = cell(&b, &r, &TableOptions::default()).span.unwrap();
        assert!(s <= last + 1e-9, "spacing {spacing}: {s} > {last}");
        last = s;
    }
    let mut last = f64::INFINITY;
    for p in [1.0e-3, 2.0e-3, 3.0e-3, 5.0e-3] {
        let b = beam.with_live_pressure(p).unwrap();
        let s = cell(&b, &r, &TableOptions::default()).span.unwrap();
        assert!(s <= last + 1e-9);
        last = s;
    }
    // Bending never governs: Fb at 2 % of E, the most the material
    // validation accepts.
    let stiff = Material {
        fb_tension: Some(200.0),
        fb_compression: Some(200.0),
        ..timber()
    };
    let mats = Materials {
        base: &stiff,
        grades: &[],
    };
    let b = beam.with_spacing(400.0).unwrap();
    let mut last = 0.0;
    for d in [150.0, 175.0, 200.0, 225.0, 250.0, 300.0] {
        let c = sweep::max_span(
            &b,
            &stiff,
            &crit(),
            &row(47.0, d, 450.0),
            &mats,
            &TableOptions::default(),
        )
        .unwrap();
        assert_eq!(c.governing, Some(CheckKind::Deflection));
        let s = c.span.unwrap();
        assert!(s >= last, "d {d}: {s} < {last}");
        last = s;
    }
}

/// `sweep lightest` reads the catalogue once (search::spans): its answer at
/// every span equals the reference of this test — every row sorted
/// lightest first (sweep::lightest over search::load_rows), each span
/// taking its first pass — on random steel catalogues that mix passing,
/// failing and not-verified rows (webs beyond the AISC 360-16 F13.2
/// proportion limits cannot be verified), with repeated masses, over any
/// thread count.
#[test]
fn one_reading_equals_the_sorted_reference() {
    use beamsift::catalog::read::{self, ReadOptions};
    use beamsift::search::{self, Filters};
    let m = common::steel(345.0, None, None);
    let mats = Materials {
        base: &m,
        grades: &[],
    };
    let crit = Criteria::default();
    let (mut total_nv, mut total_found) = (0, 0);
    for seed in 1..=12u64 {
        let mut rng = seed.wrapping_mul(0x9e37_79b9_7f4a_7c15) | 1;
        let mut next = move |n: u64| {
            rng ^= rng << 13;
            rng ^= rng >> 7;
            rng ^= rng << 17;
            rng % n
        };
        let mut csv =
            String::from("# invented test rows\nname,shape,bf [mm],tf [mm],hw [mm],tw [mm]\n");
        for i in 0..(200 + next(400)) {
            let bf = 100 + 10 * next(20);
            let tf = 6 + 2 * next(8);
            let hw = 200 + 25 * next(30);
            // Some webs far too thin for the F13.2 limits: not verified.
            let tw = if next(5) == 0 { 1 } else { 5 + next(6) };
            csv.push_str(&format!("W{i},welded-i,{bf},{tf},{hw},{tw}\n"));
        }
        let beam = common::simple_span(3000.0, 5.0, 8.0);
        let spans: Vec<f64> = (0..7).map(|k| 2000.0 + 1500.0 * k as f64).collect();
        let open = || read::open(csv.as_bytes(), "t.csv", &ReadOptions::default()).map(|c| vec![c]);
        let (rows, _, _) =
            search::load_rows(open().unwrap(), &mats, false, &Filters::default()).unwrap();
        let want = sweep::lightest(&beam, &m, &crit, &rows, &mats, &spans, &|| {}).unwrap();
        let preps: Vec<Prepared> = spans
            .iter()
            .map(|&s| Prepared::new(&sweep::at_span(&beam, s), m.clone(), crit.clone()).unwrap())
            .collect();
        // Small segments make many blocks, so the bound from earlier blocks
        // prunes checks; one block per file checks every row at every span.
        for (threads, segment) in [(1, 1 << 16), (3, 64), (2, 200)] {
            let open_small = || {
                read::open(csv.as_bytes(), "t.csv", &ReadOptions::default()).map(|mut c| {
                    c.set_segment(segment);
                    vec![c]
                })
            };
            let pool = rayon::ThreadPoolBuilder::new()
                .num_threads(threads)
                .build()
                .unwrap();
            let found = pool
                .install(|| {
                    search::spans::lightest_by_span(
                        &preps,
                        &open_small,
                        &mats,
                        &Filters::default(),
                        false,
                    )
                })
                .unwrap();
            let (got, counts) = (found.spans, found.counts);
            assert_eq!(counts.rows as usize, rows.len());
            for (w, g) in want.iter().zip(&got) {
                let w_name = w.row.map(|j| rows[j].name.clone());
                let g_name = g.best.as_ref().map(|b| b.name.clone());
                assert_eq!(w_name, g_name, "seed {seed}, span {}", w.span);
                assert_eq!(w.utilisation, g.utilisation, "seed {seed}, span {}", w.span);
                assert_eq!(
                    w.lighter_not_verified, g.lighter_not_verified,
                    "seed {seed}"
                );
                assert_eq!(
                    w.not_verified_reasons, g.not_verified_reasons,
                    "seed {seed}"
                );
                total_nv += g.lighter_not_verified;
                total_found += g.best.is_some() as u64;
            }
        }
    }
    // The random rows exercise both paths: spans with a lightest pass and
    // not-verified rows lighter than it.
    assert!(total_nv > 0 && total_found > 0, "{total_nv} {total_found}");
}

/// Repeated names in `sweep lightest`, as in `select` (README, "Repeated
/// names"): a repeat among rows no span reports is counted as flagged, and
/// the catalogue read once; a repeat of a row some span reports is refused
/// with both lines, after a second reading of that name. The rows are
/// invented welded I sections on the simple span of the test above (5 +
/// 8 kN/m, at 2 m and 4 m); which row is the lightest passing one at each
/// span comes from the clean run itself, and the test needs only that the
/// heaviest row (B4) is not one of them. The lines are known by
/// construction.
#[test]
fn repeated_names_in_a_sweep_are_found_among_the_reported_rows() {
    use beamsift::catalog::read::{self, ReadOptions};
    use beamsift::search::{self, Filters};
    let m = common::steel(345.0, None, None);
    let mats = Materials {
        base: &m,
        grades: &[],
    };
    let crit = Criteria::default();
    let beam = common::simple_span(3000.0, 5.0, 8.0);
    let preps: Vec<Prepared> = [2000.0, 4000.0]
        .iter()
        .map(|&s| Prepared::new(&sweep::at_span(&beam, s), m.clone(), crit.clone()).unwrap())
        .collect();
    let run = |csv: &str| {
        let opens = std::cell::Cell::new(0);
        let open = || {
            opens.set(opens.get() + 1);
            read::open(csv.as_bytes(), "t.csv", &ReadOptions::default()).map(|c| vec![c])
        };
        let r = search::spans::lightest_by_span(&preps, &open, &mats, &Filters::default(), false);
        (r.map_err(|e| e.to_string()), opens.get())
    };
    let head = "# invented test rows\nname,shape,bf [mm],tf [mm],hw [mm],tw [mm]\n";
    // Lines 3 to 7: light rows A0..A4; 8 to 12: heavier rows B0..B4.
    let mut base = String::from(head);
    for i in 0..5 {
        base.push_str(&format!("A{i},welded-i,100,6,{},5\n", 200 + 10 * i));
    }
    for i in 0..5 {
        base.push_str(&format!("B{i},welded-i,150,10,{},6\n", 400 + 50 * i));
    }
    let (r, n) = run(&base);
    let clean = r.unwrap();
    assert_eq!((n, clean.counts.flagged), (1, 0));
    let best: Vec<Option<String>> = clean
        .spans
        .iter()
        .map(|s| s.best.as_ref().map(|c| c.name.clone()))
        .collect();
    // A heavier row's name again, not the lightest at any span (B4 is the
    // heaviest): flagged, one reading.
    assert!(!best.contains(&Some("B4".into())), "{best:?}");
    let (r, n) = run(&format!("{base}B4,welded-i,150,10,600,6\n"));
    let l = r.unwrap();
    assert_eq!((n, l.counts.flagged), (1, 1));
    // The lightest row of a span, again on line 13: refused, naming both.
    let top = best.iter().flatten().next().unwrap().clone();
    let first = 3 + base
        .lines()
        .skip(2)
        .position(|l| l.starts_with(&format!("{top},")))
        .unwrap();
    let (r, n) = run(&format!("{base}{top},welded-i,150,10,600,6\n"));
    let Err(e) = r else {
        panic!("a repeat of {top} was not refused")
    };
    assert_eq!(n, 2, "{e}");
    assert!(
        e.contains(&format!(
            "t.csv:13:1: duplicate section name '{top}' (first on line {first})"
        )),
        "{e}"
    );
}
