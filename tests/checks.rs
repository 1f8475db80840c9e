//! Section checks on a prepared demand: pattern envelopes against brute
//! force, the fast path against a full re-analysis, hand calculations from
//! the standard formulas, and AISC 360-16 F2 against the AISC Manual's
//! tabulated limiting lengths.

mod common;

use beamsift::beam::*;
use beamsift::check::steel::{Ltb, cb, strengths};
use beamsift::check::*;
use beamsift::section::Shape;
use proptest::prelude::*;

/// Steel with F_y = 275 MPa and allowables Fb = 165, Fv = 100 MPa.
fn steel() -> Material {
    common::steel(275.0, Some(165.0), Some(100.0))
}

/// Hand calculation (simply supported, uniform load, standard formulas):
/// M = wL²/8, f = M/S with S = b·d²/6, V = wL/2, fv = 1.5·V/(b·d),
/// δ = 5wL⁴/(384·E·I), with self-weight ρ·g·A added to the dead load.
#[test]
fn rectangle_simple_span_by_hand() {
    let (l, wd, wl) = (4800.0, 0.9, 1.8);
    let (b, d) = (63.0, 250.0);
    let mut beam = Beam::new(vec![l], vec![Support::Pinned, Support::Roller]);
    let dc = beam.case("D", Category::Dead);
    let lc = beam.case("L", Category::Live);
    beam.self_weight_case = Some(dc);
    beam.udl(dc, wd).udl(lc, wl);
    beam.combo("D+L", ComboKind::Strength, &[(dc, 1.0), (lc, 1.0)]);
    beam.service(
        "L",
        &[(lc, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    // Allowable stresses only, continuously braced top edge: every
    // applicable check is evaluated (a simple span never hogs).
    let mat = common::allowable(11_000.0, 10.0, Some(1.0), 460.0);
    let crit = Criteria {
        bracing: Bracing::Continuous,
        ..Criteria::default()
    };
    let prep = Prepared::new(&beam, mat, crit).unwrap();
    let p = Shape::Rect { b, d }.properties().unwrap();
    let mass = p.mass_per_length(460.0);
    let (items, gaps) = prep.check_all(SectionInput::new(&p, mass));
    assert!(gaps.is_empty(), "{:?}", gaps.describe());
    let sw = 460.0 * 9.80665 * (b * d) * 1e-9; // N/mm: ρ·g·A
    let w = wd + wl + sw;
    let m = w * l * l / 8.0;
    let f = m / (b * d * d / 6.0);
    let v = w * l / 2.0;
    let fv = 1.5 * v / (b * d);
    let i = b * d.powi(3) / 12.0;
    let delta_l = 5.0 * wl * l.powi(4) / (384.0 * 11_000.0 * i);
    let get = |k: CheckKind| items.iter().find(|it| it.kind == k).unwrap();
    let close = |a: f64, b: f64| (a - b).abs() < 1e-9 * b.abs();
    assert!(close(get(CheckKind::BendingSaggingBottom).demand, f));
    assert!(close(get(CheckKind::BendingSaggingTop).demand, f));
    assert!(
        close(get(CheckKind::Shear).demand, fv),
        "{} {}",
        get(CheckKind::Shear).demand,
        fv
    );
    assert!(close(get(CheckKind::Deflection).demand, delta_l));
    assert!(close(get(CheckKind::Deflection).capacity, l / 360.0));
    assert!(
        !items
            .iter()
            .any(|it| it.kind == CheckKind::BendingHoggingTop)
    );
}

/// AISC Steel Construction Manual, 15th ed., Table 3-2 (from memory),
/// W14×22, Fy = 50 ksi: Lp = 3.67 ft, Lr = 10.4 ft, Mp/Ωb = 82.8 kip-ft,
/// Mr/Ωb = 0.7·Fy·Sx/Ωb = 50.6 kip-ft. Properties here are computed from
/// the rounded table dimensions, hence 3 %.
#[test]
fn w14x22_limiting_lengths_aisc_table_3_2() {
    let i = 25.4;
    let p = Shape::RolledI {
        d: 13.7 * i,
        bf: 5.0 * i,
        tf: 0.335 * i,
        tw: 0.230 * i,
        r: 0.4 * i,
    }
    .properties()
    .unwrap();
    let ksi = 6.894_757;
    let e = 29_000.0 * ksi;
    let st = strengths(&p, 50.0 * ksi, e).unwrap();
    let f = &st.flexure[0];
    assert_eq!(
        f.provision,
        steel::Provision::F2,
        "W14x22 is compact in 50 ksi steel"
    );
    let Ltb::F2 { mp, mr, lp, lr, .. } = f.ltb else {
        panic!("expected F2 constants, got {:?}", f.ltb)
    };
    let ft = 304.8;
    let kipft = 4448.222 * 304.8;
    common::close("Lp [ft]", lp / ft, 3.67, 0.03);
    common::close("Lr [ft]", lr / ft, 10.4, 0.03);
    common::close("Mp/Ωb [kip-ft]", mp / 1.67 / kipft, 82.8, 0.03);
    common::close("Mr/Ωb [kip-ft]", mr / 1.67 / kipft, 50.6, 0.03);
    // The F2-2 line and the F2-3 curve meet at Lr (Cb = 1): a check that
    // F2-4 and F2-6 were typed in correctly.
    let below = f.ltb.nominal(e, lr * (1.0 - 1e-9), 1.0).mn;
    let above = f.ltb.nominal(e, lr * (1.0 + 1e-9), 1.0).mn;
    // F2-6 carries the rounded constants 1.95 and 6.76 (exact: 1.949 and
    // 6.748 from F2-4 with Fcr = 0.7Fy), so the two meet to about 0.2 %.
    common::close("Mn just below Lr = Mr", below, mr, 1e-9);
    common::close("Mn just above Lr", above, below, 2e-3);
    common::close(
        "Mn at Lp/2 = Mp",
        f.ltb.nominal(e, 0.5 * lp, 1.0).mn,
        mp,
        1e-12,
    );
    // Uniform moment gives Cb = 1; a uniform load on a simple span gives
    // 1.14 (AISC 360-16 Commentary Fig. C-F1.2, from memory).
    assert!((cb(1.0, 1.0, 1.0, 1.0) - 1.0).abs() < 1e-12);
    let (ma, mb, mc) = (0.75, 1.0, 0.75);
    assert!((cb(1.0, ma, mb, mc) - 1.136).abs() < 1e-3);
}

/// With bracing at the supports only, a simply supported steel beam under
/// uniform load gets Cb = 1.136 from the quarter-point moments (exact
/// stations), and the check uses Mn(Lb = span)/Ω.
#[test]
fn lateral_torsional_check_uses_the_moment_diagram() {
    let l = 6000.0;
    let mut beam = Beam::new(vec![l], vec![Support::Pinned, Support::Pinned]);
    let d = beam.case("D", Category::Dead);
    beam.udl(d, 20.0);
    beam.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    let crit = Criteria {
        bracing: Bracing::Supports,
        self_weight: false,
        ..Criteria::default()
    };
    let prep = Prepared::new(&beam, steel(), crit).unwrap();
    let p = Shape::RolledI {
        d: 300.0,
        bf: 150.0,
        tf: 10.7,
        tw: 7.1,
        r: 15.0,
    }
    .properties()
    .unwrap();
    let (items, _) = prep.check_all(SectionInput::new(&p, 0.0));
    let ltb = items
        .iter()
        .find(|i| i.kind == CheckKind::LateralTorsional)
        .unwrap();
    let st = strengths(&p, 275.0, 200_000.0).unwrap();
    let want = st.flexure[0]
        .ltb
        .nominal(200_000.0, l, 12.5 / (2.5 + 3.0 * 0.75 + 4.0 + 3.0 * 0.75))
        .mn
        / 1.67;
    assert!((ltb.capacity - want).abs() < 1e-9 * want);
    assert!((ltb.demand - 20.0 * l * l / 8.0).abs() < 1e-6 * ltb.demand);
    // Without bracing information the beam is read conservatively as
    // braced at the supports only: the same line, and the output says so.
    let prep2 = Prepared::new(
        &beam,
        steel(),
        Criteria {
            self_weight: false,
            ..Criteria::default()
        },
    )
    .unwrap();
    let (items2, _) = prep2.check_all(SectionInput::new(&p, 0.0));
    let ltb2 = items2
        .iter()
        .find(|i| i.kind == CheckKind::LateralTorsional)
        .unwrap();
    assert!((ltb2.capacity - want).abs() < 1e-9 * want);
    assert!(
        prep2
            .assumptions()
            .iter()
            .any(|s| s.contains("braced at the supports only"))
    );
}

fn continuous(spans: Vec<f64>, seed: u64) -> Beam {
    let n = spans.len();
    let mut rng = seed | 1;
    let mut next = move || {
        rng ^= rng << 13;
        rng ^= rng >> 7;
        rng ^= rng << 17;
        (rng % 10_000) as f64 / 10_000.0
    };
    let mut sup = vec![Support::Pinned; n + 1];
    if next() < 0.3 {
        sup[0] = Support::Fixed;
    }
    if n >= 2 && next() < 0.3 {
        sup[n] = Support::Free;
    }
    let mut b = Beam::new(spans, sup);
    let l = b.length();
    let d = b.case("D", Category::Dead);
    let lv = b.case("L", Category::Live);
    b.udl(d, 1.0 + 4.0 * next());
    b.udl(lv, 1.0 + 6.0 * next());
    b.load(
        lv,
        LoadKind::Point {
            x: next() * l,
            p: 10_000.0 * next(),
        },
    );
    b.self_weight_case = Some(d);
    b.combo("D+L", ComboKind::Strength, &[(d, 1.0), (lv, 1.0)]);
    b.service(
        "L",
        &[(lv, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    b
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 40, rng_seed: proptest::test_runner::RngSeed::Fixed(0x5eed_63686563), ..ProptestConfig::default() })]

    /// The pattern envelope equals the worst of all 2^n explicit patterns
    /// (each analysed as an ordinary beam with live load on the chosen
    /// spans only), for moment, shear and deflection.
    #[test]
    fn pattern_envelope_equals_brute_force(
        spans in prop::collection::vec(2000.0..7000.0f64, 2..5),
        seed in any::<u64>(),
    ) {
        let beam = continuous(spans, seed);
        let mut dm = Demand::build(&beam, &[]).unwrap();
        let st = beam.stretches();
        let ne = dm.len.len();
        // The lookups the checks use (by self-weight interval) answer the
        // queries below, as they do in a catalogue scan.
        dm.register(Quantity::Moment, 0..ne);
        dm.register(Quantity::Shear, 0..ne);
        dm.register(Quantity::Deflection, dm.stretch_elements(0));
        let w_sw = 0.3;
        let mut worst = [f64::NEG_INFINITY, f64::INFINITY, 0.0f64, 0.0f64];
        for mask in 0u32..(1 << st.len()) {
            let mut b = beam.clone();
            b.cases[1].pattern = Pattern::None;
            let live: Vec<_> = b.loads.iter().filter(|l| l.case == 1).cloned().collect();
            b.loads.retain(|l| l.case != 1);
            for ld in live {
                for (k, s) in st.iter().enumerate() {
                    if mask & (1 << k) == 0 { continue; }
                    let kind = match ld.kind {
                        LoadKind::Distributed { x1, x2, w1, w2 } => {
                            let (a, bb) = (x1.max(s.x1), x2.min(s.x2));
                            if bb <= a { continue; }
                            let at = |x: f64| w1 + (w2 - w1) * (x - x1) / (x2 - x1);
                            LoadKind::Distributed { x1: a, x2: bb, w1: at(a), w2: at(bb) }
                        }
                        LoadKind::Point { x, p } => {
                            let inside = if k == 0 { x >= s.x1 && x <= s.x2 } else { x > s.x1 && x <= s.x2 };
                            if !inside { continue; }
                            LoadKind::Point { x, p }
                        }
                        ref other => other.clone(),
                    };
                    b.load(1, kind);
                }
            }
            let d2 = Demand::build(&b, &[]).unwrap();
            let m = d2.combo_extremes(0, w_sw, 1.0, Quantity::Moment, 0..d2.len.len());
            let v = d2.combo_extremes(0, w_sw, 1.0, Quantity::Shear, 0..d2.len.len());
            worst[0] = worst[0].max(m.max);
            worst[1] = worst[1].min(m.min);
            worst[2] = worst[2].max(v.max.abs().max(v.min.abs()));
            let y = d2.combo_extremes(1, w_sw, 1.0, Quantity::Deflection, d2.stretch_elements(0));
            worst[3] = worst[3].max(y.max.abs().max(y.min.abs()));
        }
        let m = dm.combo_extremes(0, w_sw, 1.0, Quantity::Moment, 0..ne);
        let v = dm.combo_extremes(0, w_sw, 1.0, Quantity::Shear, 0..ne);
        let y = dm.combo_extremes(1, w_sw, 1.0, Quantity::Deflection, dm.stretch_elements(0));
        let scale = m.max.abs().max(m.min.abs());
        prop_assert!((m.max - worst[0]).abs() <= 1e-9 * scale, "M+ {} vs {}", m.max, worst[0]);
        prop_assert!((m.min - worst[1]).abs() <= 1e-9 * scale, "M- {} vs {}", m.min, worst[1]);
        prop_assert!((v.max.abs().max(v.min.abs()) - worst[2]).abs() <= 1e-9 * worst[2]);
        let yy = y.max.abs().max(y.min.abs());
        prop_assert!((yy - worst[3]).abs() <= 1e-9 * worst[3], "δ {} vs {}", yy, worst[3]);
    }

    /// Extremes looked up by self-weight interval (survivors only) equal
    /// the full search over every element and pattern — same values to
    /// round-off and the same positions — for self-weights spread over the
    /// whole grid and several in one interval, with two patterned cases,
    /// partial and point loads, fixed ends and overhangs.
    #[test]
    fn lookup_equals_full_search(
        spans in prop::collection::vec(1500.0..8000.0f64, 1..5),
        seed in any::<u64>(),
        weights in prop::collection::vec(-6.0..2.5f64, 12),
    ) {
        let mut beam = continuous(spans, seed);
        let l = beam.length();
        let sn = beam.case("S", Category::Snow);
        beam.load(sn, LoadKind::Distributed { x1: 0.2 * l, x2: 0.7 * l, w1: 2.0, w2: 5.0 });
        beam.load(0, LoadKind::Point { x: 0.45 * l, p: 7_000.0 });
        beam.combo("1.2D+1.6S+0.5L", ComboKind::Strength, &[(0, 1.2), (sn, 1.6), (1, 0.5)]);
        beam.combo("0.9D", ComboKind::Strength, &[(0, 0.9)]);
        let full = Demand::build(&beam, &[]).unwrap();
        let mut fast = full.clone();
        let ne = full.len.len();
        let mut ranges = vec![(Quantity::Moment, 0..ne), (Quantity::Shear, 0..ne)];
        for k in 0..full.stretches.len() {
            ranges.push((Quantity::Deflection, full.stretch_elements(k)));
            ranges.push((Quantity::Moment, full.stretch_elements(k)));
        }
        for (q, r) in &ranges {
            fast.register(*q, r.clone());
        }
        for &lw in &weights {
            // 10^lw N/mm, and a neighbour in the same grid interval.
            for w in [10f64.powf(lw), 10f64.powf(lw) * 1.01, 0.0] {
                for ci in 0..full.combos.len() {
                    for (q, r) in &ranges {
                        let a = full.combo_extremes(ci, w, 1.0, *q, r.clone());
                        let b = fast.combo_extremes(ci, w, 1.0, *q, r.clone());
                        let scale = a.max.abs().max(a.min.abs()).max(1e-300);
                        prop_assert!((a.max - b.max).abs() <= 1e-12 * scale, "{q:?} max {} vs {} (w {w})", a.max, b.max);
                        prop_assert!((a.min - b.min).abs() <= 1e-12 * scale, "{q:?} min {} vs {} (w {w})", a.min, b.min);
                        if a.max != 0.0 {
                            prop_assert!((a.x_max - b.x_max).abs() <= 1e-6 * l, "{q:?} x_max {} vs {}", a.x_max, b.x_max);
                        }
                        if a.min != 0.0 {
                            prop_assert!((a.x_min - b.x_min).abs() <= 1e-6 * l, "{q:?} x_min {} vs {}", a.x_min, b.x_min);
                        }
                        // The largest magnitude alone (shear, deflection).
                        let (va, xa) = a.abs_max();
                        let sl = fast.section(w, 1.0);
                        let (vb, xb) = fast.abs_extreme(&fast.apply(ci, &sl), *q, r.clone());
                        prop_assert!((va - vb).abs() <= 1e-12 * scale, "{q:?} abs {} vs {} (w {w})", va, vb);
                        if va != 0.0 {
                            prop_assert!((xa - xb).abs() <= 1e-6 * l, "{q:?} abs at {} vs {}", xa, xb);
                        }
                    }
                }
            }
        }
    }

    /// The fast check (demand + unit self-weight scaled by the section's
    /// mass) agrees with a full re-analysis in which the self-weight is an
    /// ordinary dead load.
    #[test]
    fn fast_check_equals_reanalysis_with_self_weight(
        spans in prop::collection::vec(2000.0..7000.0f64, 1..4),
        seed in any::<u64>(),
        depth in 200.0..600.0f64,
    ) {
        let mut beam = continuous(spans, seed);
        for c in beam.cases.iter_mut() { c.pattern = Pattern::None; }
        let shape = Shape::WeldedI { bf: 150.0, tf: 10.0, hw: depth, tw: 6.0 };
        let p = shape.properties().unwrap();
        let mass = p.mass_per_length(7850.0);
        let crit = Criteria { bracing: Bracing::Supports, ..Criteria::default() };
        let fast = Prepared::new(&beam, steel(), crit.clone()).unwrap()
            .check(SectionInput::new(&p, mass));
        let mut explicit = beam.clone();
        explicit.udl(0, mass * 9.80665 / 1000.0);
        let crit2 = Criteria { self_weight: false, ..crit };
        let slow = Prepared::new(&explicit, steel(), crit2).unwrap()
            .check(SectionInput::new(&p, mass));
        prop_assert!((fast.utilisation - slow.utilisation).abs() <= 1e-9 * slow.utilisation,
            "{} vs {}", fast.utilisation, slow.utilisation);
        prop_assert_eq!(fast.governing.map(|g| g.kind), slow.governing.map(|g| g.kind));
    }
}
