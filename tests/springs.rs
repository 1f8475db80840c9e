//! Spring supports: the per-section compatibility solution against closed
//! forms of the force method, an independent stiffness solution written
//! here (a fine mesh of Euler–Bernoulli elements with the springs in the
//! global matrix), the limits k → ∞ and k → 0, and conditioning.
//!
//! Closed forms (force method, e.g. Hibbeler, *Structural Analysis*,
//! ch. 10; Roark's *Formulas for Stress and Strain*, 7th ed., Table 8.1
//! for the simple-beam deflections, from memory): a simple beam of length
//! L under a uniform load w, with a spring k at distance a from the left
//! support (b = L − a), carries on the spring
//!   R = δ₀ / (1/k + f),  δ₀ = w·a·(L³ − 2·L·a² + a³)/(24·E·I),
//!   f = a²·b²/(3·E·I·L),
//! and the spring settles R/k. Both analyses are exact for these loads, so
//! the tolerance is round-off (1e-9 relative).

mod common;

use beamsift::beam::*;
use beamsift::check::{Bracing, Criteria, Material, Prepared, SectionInput};
use beamsift::section::Shape;

const TOL: f64 = 1e-9;

/// The shared check with this file's floor of 1e-9 (a value that should
/// vanish is held to tol·1e-9, not tol).
#[track_caller]
fn close(what: &str, got: f64, want: f64, tol: f64) {
    common::close_floor(what, got, want, tol, 1e-9);
}

/// A beam with one dead case, a uniform load `w` (N/mm) over its length
/// and one strength combination D: no service combination and no
/// self-weight case (common::dead_load adds both), so the demand holds the
/// strength combination alone.
fn beam(spans: Vec<f64>, supports: Vec<Support>, w: f64) -> Beam {
    let mut b = Beam::new(spans, supports);
    let d = b.case("D", Category::Dead);
    b.udl(d, w);
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    b
}

/// Reactions (min = max without patterns) and settlements for E·I.
fn solve(b: &Beam, ei: f64) -> (Vec<f64>, Vec<f64>, Demand) {
    let d = Demand::build(b, &[]).unwrap();
    let sl = d.section(0.0, ei);
    let a = d.apply(0, &sl);
    let r = d.reactions(&a).iter().map(|r| r.1).collect();
    let s = d.settlements(&a).iter().map(|s| s.2).collect();
    (r, s, d)
}

/// The force-method closed form for a simple beam on an interior spring.
fn closed_form(l: f64, a: f64, w: f64, k: f64, ei: f64) -> f64 {
    let b = l - a;
    let d0 = w * a * (l.powi(3) - 2.0 * l * a * a + a.powi(3)) / (24.0 * ei);
    let f = a * a * b * b / (3.0 * ei * l);
    d0 / (1.0 / k + f)
}

#[test]
fn two_equal_spans_on_a_central_spring() {
    // The example of issue 13: two 6 m spans, 10 kN/m, middle spring
    // 1000 kN/m, E = 200 GPa, I = 100×10⁶ mm⁴. Closed form above with
    // a = b = 6 m: R = 48.21 kN (the rigid support would carry 75 kN,
    // 1.25·w·L, AISC Manual Table 3-23 case 29, from memory).
    let (w, k, ei) = (10.0, 1000.0, 200e3 * 100e6);
    let b = beam(
        vec![6000.0, 6000.0],
        vec![Support::Pinned, Support::Spring(k), Support::Pinned],
        w,
    );
    let (r, s, d) = solve(&b, ei);
    let want = closed_form(12_000.0, 6000.0, w, k, ei);
    close("spring reaction", r[1], want, TOL);
    close(
        "issue's figure (about 48 kN)",
        r[1] / 1e3,
        48.214_285_714_285_7,
        1e-9,
    );
    close("end reactions", r[0], (w * 12_000.0 - want) / 2.0, TOL);
    close("settlement R/k", s[0], want / k, TOL);
    // Sagging moment: M(x) = R₀·x − w·x²/2, largest at x = R₀/w.
    let r0 = r[0];
    let m = d.combo_extremes(0, 0.0, ei, Quantity::Moment, 0..d.len.len());
    close("largest sagging moment", m.max, r0 * r0 / (2.0 * w), TOL);
    close("its position", m.x_max, r0 / w, 1e-9);
    // Hogging at the spring: R₀·6 m − w·(6 m)²/2.
    let m_spring = r0 * 6000.0 - w * 6000.0 * 6000.0 / 2.0;
    assert!(m_spring > 0.0, "this soft spring leaves the middle sagging");
}

#[test]
fn unequal_spans_on_an_interior_spring() {
    // Spans 4 m + 7 m, 8 kN/m, spring 2500 kN/m at the interior node.
    let (w, k, ei) = (8.0, 2500.0, 200e3 * 60e6);
    let b = beam(
        vec![4000.0, 7000.0],
        vec![Support::Pinned, Support::Spring(k), Support::Roller],
        w,
    );
    let (r, s, _) = solve(&b, ei);
    let want = closed_form(11_000.0, 4000.0, w, k, ei);
    close("spring reaction", r[1], want, TOL);
    close("settlement", s[0], want / k, TOL);
    // Equilibrium: the three reactions carry the whole load, and moments
    // about the left end balance.
    close("ΣR = wL", r[0] + r[1] + r[2], w * 11_000.0, TOL);
    close(
        "ΣM about 0",
        r[1] * 4000.0 + r[2] * 11_000.0,
        w * 11_000.0f64.powi(2) / 2.0,
        TOL,
    );
}

/// An independent stiffness solution: `per_span` Euler–Bernoulli elements
/// in each span, springs added to the global matrix, pinned DOFs removed,
/// dense Gaussian elimination with partial pivoting. Returns the nodal
/// displacements (v down, θ) and the node positions.
fn fine_fe(
    spans: &[f64],
    supports: &[Support],
    w: f64,
    ei: f64,
    per_span: usize,
) -> (Vec<f64>, Vec<f64>) {
    let mut xs = vec![0.0];
    let mut support_at = vec![Some(supports[0])];
    for (j, &l) in spans.iter().enumerate() {
        for k in 1..=per_span {
            xs.push(xs[xs.len() - 1] + l / per_span as f64);
            support_at.push(if k == per_span {
                Some(supports[j + 1])
            } else {
                None
            });
        }
    }
    let nn = xs.len();
    let n = 2 * nn;
    let mut kk = vec![0.0; n * n];
    let mut f = vec![0.0; n];
    for e in 0..nn - 1 {
        let l = xs[e + 1] - xs[e];
        let (l2, l3) = (l * l, l * l * l);
        let ke = [
            [12.0 / l3, 6.0 / l2, -12.0 / l3, 6.0 / l2],
            [6.0 / l2, 4.0 / l, -6.0 / l2, 2.0 / l],
            [-12.0 / l3, -6.0 / l2, 12.0 / l3, -6.0 / l2],
            [6.0 / l2, 2.0 / l, -6.0 / l2, 4.0 / l],
        ];
        let fe = [w * l / 2.0, w * l2 / 12.0, w * l / 2.0, -w * l2 / 12.0];
        for a in 0..4 {
            f[2 * e + a] += fe[a];
            for b in 0..4 {
                kk[(2 * e + a) * n + 2 * e + b] += ei * ke[a][b];
            }
        }
    }
    for (i, s) in support_at.iter().enumerate() {
        let fix = |kk: &mut Vec<f64>, f: &mut Vec<f64>, d: usize| {
            for j in 0..n {
                kk[d * n + j] = 0.0;
                kk[j * n + d] = 0.0;
            }
            kk[d * n + d] = 1.0;
            f[d] = 0.0;
        };
        match s {
            Some(Support::Pinned | Support::Roller) => fix(&mut kk, &mut f, 2 * i),
            Some(Support::Fixed) => {
                fix(&mut kk, &mut f, 2 * i);
                fix(&mut kk, &mut f, 2 * i + 1);
            }
            Some(Support::Spring(k)) => kk[2 * i * n + 2 * i] += k,
            _ => {}
        }
    }
    // Gaussian elimination with partial pivoting.
    for c in 0..n {
        let p = (c..n)
            .max_by(|&a, &b| kk[a * n + c].abs().total_cmp(&kk[b * n + c].abs()))
            .unwrap();
        if p != c {
            for j in 0..n {
                kk.swap(c * n + j, p * n + j);
            }
            f.swap(c, p);
        }
        for r in c + 1..n {
            let m = kk[r * n + c] / kk[c * n + c];
            if m != 0.0 {
                for j in c..n {
                    kk[r * n + j] -= m * kk[c * n + j];
                }
                f[r] -= m * f[c];
            }
        }
    }
    let mut d = vec![0.0; n];
    for i in (0..n).rev() {
        let mut s = f[i];
        for j in i + 1..n {
            s -= kk[i * n + j] * d[j];
        }
        d[i] = s / kk[i * n + i];
    }
    (d, xs)
}

#[test]
fn three_spans_on_two_springs_against_an_independent_stiffness_solution() {
    // Spans 5, 6, 4.5 m; pinned, spring 800 kN/m, spring 3000 kN/m, roller;
    // 12 kN/m; E·I = 200 GPa × 150×10⁶ mm⁴. The independent solution has
    // 40 elements per span with consistent loads (nodal values exact).
    let spans = vec![5000.0, 6000.0, 4500.0];
    let sup = vec![
        Support::Pinned,
        Support::Spring(800.0),
        Support::Spring(3000.0),
        Support::Roller,
    ];
    let (w, ei) = (12.0, 200e3 * 150e6);
    let b = beam(spans.clone(), sup.clone(), w);
    let (r, s, d) = solve(&b, ei);
    let (fe, xs) = fine_fe(&spans, &sup, w, ei, 40);
    let v = |x: f64| {
        let i = xs.iter().position(|&p| (p - x).abs() < 1e-6).unwrap();
        fe[2 * i]
    };
    close("settlement at spring 1", s[0], v(5000.0), 1e-9);
    close("settlement at spring 2", s[1], v(11_000.0), 1e-9);
    close("spring 1 force k·v", r[1], 800.0 * v(5000.0), 1e-9);
    close("spring 2 force k·v", r[2], 3000.0 * v(11_000.0), 1e-9);
    close("ΣR = wL", r.iter().sum::<f64>(), w * 15_500.0, TOL);
    // Deflection at mid-span 2 measured from the chord of its displaced
    // supports, as beamsift reports it.
    let xm = 8000.0;
    let dm = Demand::build(&b, &[xm]).unwrap();
    let sl = dm.section(0.0, ei);
    let a = dm.apply(0, &sl);
    let e = dm
        .mesh
        .x
        .iter()
        .position(|&x| (x - xm).abs() < 1e-9)
        .unwrap();
    let (_, y) = dm.envelope_at(&a, Quantity::Deflection, e, 0.0);
    let chord = v(5000.0) + (v(11_000.0) - v(5000.0)) * (xm - 5000.0) / 6000.0;
    close(
        "mid-span 2 deflection from the chord",
        y / ei,
        v(xm) - chord,
        1e-8,
    );
    // Moment at mid-span 2 by statics of the left free body.
    let m_statics = r[0] * xm + r[1] * (xm - 5000.0) - w * xm * xm / 2.0;
    let (_, m) = dm.envelope_at(&a, Quantity::Moment, e, 0.0);
    close("moment at mid-span 2", m, m_statics, 1e-9);
    let _ = d;
}

#[test]
fn stiff_and_soft_spring_limits() {
    // k → ∞ gives the rigid answer (two equal spans: the middle support
    // carries 1.25·w·L, AISC Table 3-23 case 29, from memory); k → 0
    // removes the support (a simple beam of 2L: ends carry w·L each).
    let (w, ei, l) = (10.0, 200e3 * 100e6, 6000.0);
    let rigid = beam(
        vec![l, l],
        vec![Support::Pinned, Support::Pinned, Support::Pinned],
        w,
    );
    let (rr, _, _) = solve(&rigid, ei);
    close("rigid middle", rr[1], 1.25 * w * l, TOL);
    // 1e10 kN/m = 1e10 N/mm: the stiff spring, once refused as a
    // mechanism.
    let stiff = beam(
        vec![l, l],
        vec![Support::Pinned, Support::Spring(1e10), Support::Pinned],
        w,
    );
    let (rs, ss, _) = solve(&stiff, ei);
    close("stiff spring → rigid", rs[1], 1.25 * w * l, 1e-6);
    assert!(ss[0].abs() < 1e-4, "settlement {} mm", ss[0]);
    let soft = beam(
        vec![l, l],
        vec![Support::Pinned, Support::Spring(1e-9), Support::Pinned],
        w,
    );
    let (r0, _, _) = solve(&soft, ei);
    close("soft spring → removed: end reaction", r0[0], w * l, 1e-6);
    assert!(r0[1].abs() < 1e-6 * w * l, "spring force {}", r0[1]);
}

#[test]
fn long_cantilever_is_not_a_mechanism() {
    // A 50 m fixed–free cantilever (inside the 1 km supported range) was
    // refused as "the supports form a mechanism". Tip deflection wL⁴/(8EI)
    // (AISC Table 3-23 case 22, from memory).
    let (w, ei, l) = (2.0, 200e3 * 5e9, 50_000.0);
    let b = beam(vec![l], vec![Support::Fixed, Support::Free], w);
    let d = Demand::build(&b, &[]).unwrap();
    let y = d.combo_extremes(0, 0.0, ei, Quantity::Deflection, 0..d.len.len());
    close(
        "tip deflection",
        y.max / ei,
        w * l.powi(4) / (8.0 * ei),
        1e-9,
    );
    // And a 1 mm one, the other end of the range.
    let b = beam(vec![1.0], vec![Support::Fixed, Support::Free], w);
    assert!(Demand::build(&b, &[]).is_ok());
}

#[test]
fn beam_on_springs_only() {
    // Two springs and no rigid support: stable; each spring carries wL/2
    // and the beam moves as a rigid body (no bending from the springs).
    let (w, ei, l, k) = (5.0, 200e3 * 20e6, 4000.0, 500.0);
    let b = beam(vec![l], vec![Support::Spring(k), Support::Spring(k)], w);
    let (r, s, d) = solve(&b, ei);
    close("each spring", r[0], w * l / 2.0, TOL);
    close("settlement", s[0], w * l / 2.0 / k, TOL);
    let m = d.combo_extremes(0, 0.0, ei, Quantity::Moment, 0..d.len.len());
    close("wL²/8", m.max, w * l * l / 8.0, TOL);
}

#[test]
fn patterned_live_load_on_springs_equals_brute_force() {
    // Live load patterned over two spans and an overhang, on a spring: the
    // per-section envelope equals the worst of all 2³ explicit patterns
    // analysed as fixed loads.
    let spans = vec![5000.0, 4000.0, 1500.0];
    let sup = vec![
        Support::Pinned,
        Support::Spring(1500.0),
        Support::Pinned,
        Support::Free,
    ];
    let ei = 200e3 * 80e6;
    let mut b = Beam::new(spans.clone(), sup.clone());
    let d = b.case("D", Category::Dead);
    let l = b.case("L", Category::Live);
    b.udl(d, 3.0);
    b.udl(l, 7.0);
    b.combo("D+L", ComboKind::Strength, &[(d, 1.0), (l, 1.0)]);
    let dm = Demand::build(&b, &[]).unwrap();
    let ne = dm.len.len();
    let env_m = dm.combo_extremes(0, 0.0, ei, Quantity::Moment, 0..ne);
    let env_v = dm.combo_extremes(0, 0.0, ei, Quantity::Shear, 0..ne);
    let bounds = [(0.0, 5000.0), (5000.0, 9000.0), (9000.0, 10_500.0)];
    let (mut best_max, mut best_min, mut best_v) = (f64::NEG_INFINITY, f64::INFINITY, 0.0f64);
    for mask in 0..8u32 {
        let mut bb = Beam::new(spans.clone(), sup.clone());
        let dd = bb.case("D", Category::Dead);
        bb.udl(dd, 3.0);
        for (k, &(x1, x2)) in bounds.iter().enumerate() {
            if mask & (1 << k) != 0 {
                bb.load(
                    dd,
                    LoadKind::Distributed {
                        x1,
                        x2,
                        w1: 7.0,
                        w2: 7.0,
                    },
                );
            }
        }
        bb.combo("D", ComboKind::Strength, &[(dd, 1.0)]);
        let db = Demand::build(&bb, &[]).unwrap();
        let n = db.len.len();
        let m = db.combo_extremes(0, 0.0, ei, Quantity::Moment, 0..n);
        let v = db.combo_extremes(0, 0.0, ei, Quantity::Shear, 0..n);
        best_max = best_max.max(m.max);
        best_min = best_min.min(m.min);
        best_v = best_v.max(v.max.abs()).max(v.min.abs());
    }
    close("largest sagging", env_m.max, best_max, 1e-9);
    close("largest hogging", env_m.min, best_min, 1e-9);
    close(
        "largest shear",
        env_v.max.abs().max(env_v.min.abs()),
        best_v,
        1e-9,
    );
}

#[test]
fn a_section_that_fails_on_the_spring_fails() {
    // The beam with a 100 × 228.9 mm rectangle (I ≈ 100×10⁶ mm⁴)
    // and Fb = 60 MPa: on a rigid middle support the hogging moment
    // w·L²/8 = 45 kN·m gives utilisation 0.86; on the 1000 kN/m spring the
    // sagging moment R₀²/(2w) = 64.41 kN·m (closed form above) fails.
    let (w, k) = (10.0, 1000.0);
    let shape = Shape::Rect {
        b: 100.0,
        d: (100e6f64 * 12.0 / 100.0).cbrt(),
    };
    let p = shape.properties().unwrap();
    let mat = Material::allowable("test", 200e3, 60.0, None, 0.0);
    // Bending only: shear excluded, both flanges braced.
    let mut crit = Criteria {
        bracing: Bracing::Continuous,
        braced_flange: beamsift::check::BracedFlange::Both,
        ..Criteria::default()
    };
    crit.exclude.shear = true;
    let check = |sup: Support| {
        let b = beam(
            vec![6000.0, 6000.0],
            vec![Support::Pinned, sup, Support::Pinned],
            w,
        );
        let prep = Prepared::new(&b, mat.clone(), crit.clone()).unwrap();
        prep.check(SectionInput::new(&p, 0.0))
    };
    let rigid = check(Support::Pinned);
    let sprung = check(Support::Spring(k));
    let r = closed_form(12_000.0, 6000.0, w, k, 200e3 * p.ix);
    let r0 = (w * 12_000.0 - r) / 2.0;
    close(
        "rigid utilisation",
        rigid.utilisation,
        45e6 / p.s_top / 60.0,
        1e-9,
    );
    close(
        "spring utilisation",
        sprung.utilisation,
        r0 * r0 / (2.0 * w) / p.s_top / 60.0,
        1e-9,
    );
    assert!(sprung.utilisation > 1.0, "{}", sprung.utilisation);
}
