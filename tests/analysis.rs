//! Beam analysis against the standard beam formulas: AISC Steel
//! Construction Manual (15th ed.) Table 3-23 "Shears, Moments and
//! Deflections" and Roark's Formulas for Stress and Strain (7th ed.)
//! Table 8.1 (from memory). The analysis is exact for these load types,
//! so the tolerance is round-off: 1e-9 relative.

mod common;

use beamsift::beam::demand::element_extremes;
use beamsift::beam::solve::{self};
use beamsift::beam::*;
use proptest::prelude::*;

const TOL: f64 = 1e-9;

/// This file's round-off check: the shared one with TOL and a floor of
/// 1e-6 (values that vanish are held to 1e-15 absolute, not 1e-9).
#[track_caller]
fn close(what: &str, got: f64, want: f64) {
    common::close_floor(what, got, want, TOL, 1e-6);
}

/// Beam with one dead case and one strength combination (factor 1), no
/// loads yet: each test places its own (the common builders load the span).
fn single(spans: Vec<f64>, supports: Vec<Support>) -> (Beam, usize) {
    let mut b = Beam::new(spans, supports);
    let d = b.case("D", Category::Dead);
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    (b, d)
}

fn moments(b: &Beam) -> (Demand, Extremes, Extremes, f64) {
    let dm = Demand::build(b, &[]).unwrap();
    let n = dm.len.len();
    let m = dm.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..n);
    let v = dm.combo_extremes(0, 0.0, 1.0, Quantity::Shear, 0..n);
    let d = dm.combo_extremes(0, 0.0, 1.0, Quantity::Deflection, 0..n);
    let vmax = v.max.abs().max(v.min.abs());
    (dm, m, d, vmax)
}

use Support::*;

#[test]
fn simple_span_uniform_load() {
    // AISC Table 3-23 case 1: M = wL²/8 at midspan, V = wL/2,
    // Δ = 5wL⁴/(384EI).
    let (l, w) = (6000.0, 12.0);
    let (mut b, d) = single(vec![l], vec![Pinned, Roller]);
    b.udl(d, w);
    let (dm, m, y, v) = moments(&b);
    close("M", m.max, w * l * l / 8.0);
    close("x", m.x_max, l / 2.0);
    close("V", v, w * l / 2.0);
    close("Δ (EI=1)", y.max, 5.0 * w * l.powi(4) / 384.0);
    close("R", dm.cases[0].reaction[0], w * l / 2.0);
}

#[test]
fn central_and_off_centre_point_loads() {
    // AISC Table 3-23 cases 7 and 8: M = Pab/L under the load,
    // Δ under the load = P·a²·b²/(3·E·I·L); central: PL/4, PL³/(48EI).
    let (l, p) = (5000.0, 20_000.0);
    for a in [2500.0, 1500.0] {
        let bb = l - a;
        let (mut b, d) = single(vec![l], vec![Pinned, Pinned]);
        b.load(d, LoadKind::Point { x: a, p });
        let (dm, m, _, v) = moments(&b);
        close("M", m.max, p * a * bb / l);
        close("x", m.x_max, a);
        close("V", v, p * a.max(bb) / l);
        // deflection under the load
        let e = dm
            .mesh
            .x
            .iter()
            .position(|&x| (x - a).abs() < 1e-9)
            .unwrap();
        let under = solve::deflection(&dm.combos[0].fixed.elems[e], 0.0);
        close("Δ under load", under, p * a * a * bb * bb / (3.0 * l));
        if a == 2500.0 {
            close("Δ centre", under, p * l.powi(3) / 48.0);
        }
    }
}

#[test]
fn cantilevers() {
    // AISC Table 3-23 cases 19 and 22 (Roark 8.1 cases 1a, 2a):
    // uniform: M = wL²/2, Δ = wL⁴/(8EI); tip load: M = PL, Δ = PL³/(3EI).
    let (l, w, p) = (2000.0, 5.0, 8000.0);
    let (mut b, d) = single(vec![l], vec![Fixed, Free]);
    b.udl(d, w);
    let (_, m, y, v) = moments(&b);
    close("M", m.min, -w * l * l / 2.0);
    close("V", v, w * l);
    close("Δ", y.max, w * l.powi(4) / 8.0);
    let (mut b, d) = single(vec![l], vec![Free, Fixed]);
    b.load(d, LoadKind::Point { x: 0.0, p });
    let (_, m, y, _) = moments(&b);
    close("M tip load", m.min, -p * l);
    close("Δ tip", y.max, p * l.powi(3) / 3.0);
}

#[test]
fn fixed_fixed_and_propped_cantilever() {
    // AISC Table 3-23 case 15: fixed both ends, uniform: wL²/12 at the ends,
    // wL²/24 at midspan, Δ = wL⁴/(384EI).
    let (l, w) = (8000.0, 10.0);
    let (mut b, d) = single(vec![l], vec![Fixed, Fixed]);
    b.udl(d, w);
    let (_, m, y, _) = moments(&b);
    close("M end", m.min, -w * l * l / 12.0);
    close("M mid", m.max, w * l * l / 24.0);
    close("Δ", y.max, w * l.powi(4) / 384.0);
    // Case 12: fixed one end, supported the other, uniform: −wL²/8 at the
    // fixed end, 9wL²/128 at 3L/8 from the pinned end, Δmax = wL⁴/(185EI)
    // (the table rounds 184.6 to 185, so 0.3 %).
    let (mut b, d) = single(vec![l], vec![Fixed, Pinned]);
    b.udl(d, w);
    let (_, m, y, _) = moments(&b);
    close("M fixed", m.min, -w * l * l / 8.0);
    close("M +", m.max, 9.0 * w * l * l / 128.0);
    close("x of M+", m.x_max, l - 3.0 * l / 8.0);
    assert!(((y.max - w * l.powi(4) / 185.0) / y.max).abs() < 3e-3);
    // exact: 0.0054160 wL⁴ (Roark 8.1 case 2e, from memory)
    assert!(((y.max - 0.005416 * w * l.powi(4)) / y.max).abs() < 1e-4);
}

#[test]
fn continuous_equal_spans_uniform() {
    // AISC Table 3-23 cases 29 and 36 (from memory): two equal spans,
    // M_support = wL²/8, M+ = 9wL²/128, R_end = 3wL/8, R_mid = 10wL/8;
    // three equal spans: M_support = 0.100wL², M+ end span = 0.080wL².
    let (l, w) = (4000.0, 7.0);
    let (mut b, d) = single(vec![l, l], vec![Pinned, Pinned, Pinned]);
    b.cases[d].pattern = Pattern::None;
    b.udl(d, w);
    let (dm, m, _, _) = moments(&b);
    close("M support", m.min, -w * l * l / 8.0);
    close("M span", m.max, 9.0 * w * l * l / 128.0);
    close("R end", dm.cases[0].reaction[0], 3.0 * w * l / 8.0);
    close("R mid", dm.cases[0].reaction[1], 10.0 * w * l / 8.0);
    let (mut b, d) = single(vec![l, l, l], vec![Pinned, Pinned, Pinned, Pinned]);
    b.udl(d, w);
    let (_, m, _, _) = moments(&b);
    close("M support 3", m.min, -0.1 * w * l * l);
    close("M end span 3", m.max, 0.08 * w * l * l);
}

#[test]
fn overhang_and_triangular_load() {
    // AISC Table 3-23 case 24: beam overhanging one support, uniform load
    // over the whole length: R1 = w(L²−a²)/(2L), M at the support = wa²/2.
    let (l, a, w) = (6000.0, 1500.0, 4.0);
    let (mut b, d) = single(vec![l, a], vec![Pinned, Pinned, Free]);
    b.udl(d, w);
    let (dm, m, _, _) = moments(&b);
    close(
        "R1",
        dm.cases[0].reaction[0],
        w * (l * l - a * a) / (2.0 * l),
    );
    close("M support", m.min, -w * a * a / 2.0);
    let r1 = w * (l * l - a * a) / (2.0 * l);
    close("M+", m.max, r1 * r1 / (2.0 * w));
    // Case 2: load increasing uniformly to one end, total W:
    // M = 2WL/(9√3) at x = L/√3, Δ = 0.01304·W·L³/(EI).
    let (l, wmax) = (6000.0, 9.0);
    let (mut b, d) = single(vec![l], vec![Pinned, Roller]);
    b.load(
        d,
        LoadKind::Distributed {
            x1: 0.0,
            x2: l,
            w1: 0.0,
            w2: wmax,
        },
    );
    let tot = wmax * l / 2.0;
    let (_, m, y, _) = moments(&b);
    close("M tri", m.max, 2.0 * tot * l / (9.0 * 3f64.sqrt()));
    close("x tri", m.x_max, l / 3f64.sqrt());
    assert!(((y.max - 0.01304 * tot * l.powi(3)) / y.max).abs() < 1e-3);
}

#[test]
fn element_polynomials_meet_exact_nodal_values() {
    // The curvature integral across each element lands on the next node's
    // displacement, and at the unsupported interior beam node (x = 7.5 m)
    // on the stiffness solution's value: the two methods agree.
    let mut b = Beam::new(
        vec![3000.0, 4500.0, 2000.0, 1500.0],
        vec![Fixed, Pinned, Free, Spring(50.0), Free],
    );
    let d = b.case("D", Category::Dead);
    b.udl(d, 3.0)
        .load(
            d,
            LoadKind::Point {
                x: 1200.0,
                p: 5000.0,
            },
        )
        .load(
            d,
            LoadKind::Point {
                x: 8200.0,
                p: 3000.0,
            },
        )
        .load(d, LoadKind::Moment { x: 5000.0, m: 2e6 })
        .load(
            d,
            LoadKind::Distributed {
                x1: 6000.0,
                x2: 9500.0,
                w1: 2.0,
                w2: -1.0,
            },
        );
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    let dm = Demand::build(&b, &[]).unwrap();
    let r = &dm.cases[0];
    for e in 0..dm.len.len() - 1 {
        if dm.mesh.stretch_of[e] != dm.mesh.stretch_of[e + 1] {
            continue;
        }
        let l = dm.len[e];
        let end = solve::deflection(&r.elems[e], l);
        let next = r.elems[e + 1][4];
        assert!(
            (end - next).abs() <= 1e-7 * next.abs().max(1.0),
            "element {e}"
        );
        let slope_end = solve::slope(&r.elems[e], l);
        assert!((slope_end - r.elems[e + 1][5]).abs() <= 1e-7 * slope_end.abs().max(1e-3));
    }
    // Free end: moment and shear vanish.
    let last = dm.len.len() - 1;
    let c = &r.elems[last];
    assert!(solve::moment(c, dm.len[last]).abs() < 1e-3);
    assert!(solve::shear(c, dm.len[last]).abs() < 1e-6);
    let _ = element_extremes;
}

#[test]
fn mechanisms_and_bad_loads_are_refused() {
    let mut b = Beam::new(vec![3000.0], vec![Pinned, Free]);
    let d = b.case("D", Category::Dead);
    b.udl(d, 1.0);
    let e = Demand::build(&b, &[]).unwrap_err().to_string();
    assert!(e.contains("mechanism") && e.contains("fixed"), "{e}");
    let b = Beam::new(vec![3000.0], vec![Free, Free]);
    assert!(
        Demand::build(&b, &[])
            .unwrap_err()
            .to_string()
            .contains("mechanism")
    );
    let mut b = Beam::new(vec![3000.0], vec![Pinned, Pinned]);
    let d = b.case("D", Category::Dead);
    b.load(d, LoadKind::Point { x: 3500.0, p: 1.0 });
    assert!(
        Demand::build(&b, &[])
            .unwrap_err()
            .to_string()
            .contains("not on the beam")
    );
    let mut b = Beam::new(vec![3000.0], vec![Pinned, Pinned]);
    let d = b.case("D", Category::Dead);
    b.load(
        d,
        LoadKind::Distributed {
            x1: 2000.0,
            x2: 1000.0,
            w1: 1.0,
            w2: 1.0,
        },
    );
    assert!(
        Demand::build(&b, &[])
            .unwrap_err()
            .to_string()
            .contains("before it starts")
    );
    let b = Beam::new(vec![0.0], vec![Pinned, Pinned]);
    assert!(Demand::build(&b, &[]).is_err());
}

fn random_beam() -> impl Strategy<Value = Beam> {
    let spans = prop::collection::vec(1000.0..8000.0f64, 1..4);
    (spans, any::<u64>()).prop_map(|(spans, seed)| {
        let n = spans.len();
        let mut rng = seed;
        let mut next = move || {
            rng ^= rng << 13;
            rng ^= rng >> 7;
            rng ^= rng << 17;
            (rng % 10_000) as f64 / 10_000.0
        };
        let mut sup = vec![Pinned; n + 1];
        if next() < 0.3 {
            sup[0] = Fixed;
        }
        if next() < 0.3 {
            sup[n] = Fixed;
        }
        if n >= 2 && next() < 0.3 {
            sup[n] = Free;
        }
        if n >= 3 && next() < 0.3 {
            sup[0] = Free;
            sup[n] = Fixed;
        }
        let mut b = Beam::new(spans, sup);
        let l = b.length();
        let d = b.case("D", Category::Dead);
        for _ in 0..4 {
            let r = next();
            let x1 = next() * l * 0.9;
            let x2 = x1 + (l - x1) * (0.1 + 0.9 * next());
            if r < 0.4 {
                b.load(
                    d,
                    LoadKind::Distributed {
                        x1,
                        x2,
                        w1: 10.0 * next() - 2.0,
                        w2: 10.0 * next() - 2.0,
                    },
                );
            } else if r < 0.8 {
                b.load(
                    d,
                    LoadKind::Point {
                        x: x1,
                        p: 20_000.0 * next() - 5000.0,
                    },
                );
            } else {
                b.load(
                    d,
                    LoadKind::Moment {
                        x: x1,
                        m: 1e7 * (next() - 0.5),
                    },
                );
            }
        }
        b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
        b
    })
}

fn total_load(b: &Beam) -> (f64, f64) {
    // (ΣF downward, Σ moment about x = 0, clockwise positive)
    let (mut f, mut m) = (0.0, 0.0);
    for l in &b.loads {
        match l.kind {
            LoadKind::Distributed { x1, x2, w1, w2 } => {
                let len = x2 - x1;
                let tot = (w1 + w2) / 2.0 * len;
                let xc = if (w1 + w2).abs() > 0.0 {
                    x1 + len * (w1 + 2.0 * w2) / (3.0 * (w1 + w2))
                } else {
                    0.0
                };
                f += tot;
                // moment of a trapezoid computed from its two triangles
                m += w1 * len / 2.0 * (x1 + len / 3.0) + w2 * len / 2.0 * (x1 + 2.0 * len / 3.0);
                let _ = xc;
            }
            LoadKind::Point { x, p } => {
                f += p;
                m += p * x;
            }
            LoadKind::Moment { m: c, .. } => m += c,
        }
    }
    (f, m)
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, rng_seed: proptest::test_runner::RngSeed::Fixed(0x5eed_616e616c), ..ProptestConfig::default() })]

    /// Statics: the reactions balance the loads in force and in moment.
    #[test]
    fn reactions_balance_the_loads(b in random_beam()) {
        let dm = Demand::build(&b, &[]).unwrap();
        let r = &dm.cases[0];
        let (f, m) = total_load(&b);
        let xs = b.node_x();
        let rf: f64 = r.reaction.iter().sum();
        // Reaction moments: up-force at x gives anticlockwise moment about 0.
        let rm: f64 = r.reaction.iter().zip(&xs).map(|(r, x)| r * x).sum::<f64>()
            - r.reaction_moment.iter().sum::<f64>();
        let scale = f.abs().max(1.0) * b.length();
        prop_assert!((rf - f).abs() < 1e-8 * scale, "force {rf} vs {f}");
        prop_assert!((rm - m).abs() < 1e-8 * scale, "moment {rm} vs {m}");
    }

    /// Superposition: twice the loads give twice every response; the sum of
    /// two load sets gives the sum of responses. Zero load gives zero.
    #[test]
    fn superposition_and_zero_load(b in random_beam()) {
        let dm = Demand::build(&b, &[]).unwrap();
        let mut b2 = b.clone();
        let extra = b2.case("E", Category::Dead);
        let loads: Vec<_> = b.loads.iter().map(|l| l.kind.clone()).collect();
        for k in &loads { b2.load(extra, k.clone()); }
        b2.combinations.clear();
        b2.combo("2D", ComboKind::Strength, &[(0, 1.0), (extra, 1.0)]);
        let dm2 = Demand::build(&b2, &[]).unwrap();
        let n = dm.len.len();
        let a = dm.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..n);
        let a2 = dm2.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..n);
        let s = a.max.abs().max(a.min.abs()).max(1.0);
        prop_assert!((a2.max - 2.0 * a.max).abs() < 1e-8 * s);
        prop_assert!((a2.min - 2.0 * a.min).abs() < 1e-8 * s);
        let mut z = b.clone();
        z.loads.clear();
        let dz = Demand::build(&z, &[]).unwrap();
        let ez = dz.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..dz.len.len());
        prop_assert!(ez.max == 0.0 && ez.min == 0.0);
        let dz = dz.combo_extremes(0, 0.0, 1.0, Quantity::Deflection, 0..dz.len.len());
        prop_assert!(dz.max == 0.0 && dz.min == 0.0);
    }

    /// A mirrored beam gives mirrored results.
    #[test]
    fn mirror_symmetry(b in random_beam()) {
        let l = b.length();
        let mut m = Beam::new(b.spans.iter().rev().cloned().collect(), b.supports.iter().rev().cloned().collect());
        let d = m.case("D", Category::Dead);
        for ld in &b.loads {
            let k = match ld.kind {
                LoadKind::Distributed { x1, x2, w1, w2 } => LoadKind::Distributed { x1: l - x2, x2: l - x1, w1: w2, w2: w1 },
                LoadKind::Point { x, p } => LoadKind::Point { x: l - x, p },
                LoadKind::Moment { x, m } => LoadKind::Moment { x: l - x, m: -m },
            };
            m.load(d, k);
        }
        m.combo("D", ComboKind::Strength, &[(d, 1.0)]);
        let da = Demand::build(&b, &[]).unwrap();
        let db = Demand::build(&m, &[]).unwrap();
        let ea = da.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..da.len.len());
        let eb = db.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..db.len.len());
        let s = ea.max.abs().max(ea.min.abs()).max(1.0);
        prop_assert!((ea.max - eb.max).abs() < 1e-7 * s, "{} vs {}", ea.max, eb.max);
        prop_assert!((ea.min - eb.min).abs() < 1e-7 * s);
        let ra = &da.cases[0].reaction;
        let rb = &db.cases[0].reaction;
        for i in 0..ra.len() {
            prop_assert!((ra[i] - rb[ra.len() - 1 - i]).abs() < 1e-7 * s / 1000.0 + 1e-6);
        }
    }
}
