//! The optimiser against closed-form optima, KKT conditions, random
//! sampling and exhaustive grids.

mod common;

use beamsift::beam::*;
use beamsift::check::*;
use beamsift::optimise::discrete::{self, Grid};
use beamsift::optimise::{self, Constraint, Family, Objective, Problem};

/// A simple span under dead load, D ≤ L/360 (self-weight set per test).
fn beam(l: f64, w: f64) -> Beam {
    common::dead_span(l, w, 360.0)
}

/// Allowable bending stress only (no Fv).
fn mat(e: f64, fb: f64) -> Material {
    common::allowable(e, fb, None, 0.0)
}

fn rect_problem(bounds: Vec<(f64, f64)>, aspect: Option<f64>) -> Problem {
    Problem {
        family: Family::Rect,
        bounds,
        max_depth: None,
        min_depth: None,
        aspect,
        lambda_f: None,
        lambda_w: None,
        objective: Objective::Area,
        plate_prices: vec![],
    }
}

/// No self-weight; shear and lateral stability excluded by the user (the
/// closed forms below are for bending and deflection only).
fn no_sw() -> Criteria {
    let mut c = Criteria {
        self_weight: false,
        ..common::allowable_only()
    };
    c.exclude.shear = true;
    c
}

/// Closed-form optima of a rectangle (mechanics of materials):
/// the area b·d is least, for a required section modulus S = b·d²/6 =
/// M/Fb, with d as large as allowed: at d = d_max, b = 6M/(Fb·d_max²).
/// With the aspect limit d = k·b active instead, S = d³/(6k) gives
/// d = (6·k·M/Fb)^(1/3). Deflection-governed analogues from I = b·d³/12 ≥
/// I_req = 5wL⁴·n/(384·E·L): b = 12·I_req/d_max³, or with d = k·b,
/// d = (12·k·I_req)^(1/4). Nelder–Mead converges to about 1e-5 in the
/// scaled variables: 1e-3 relative.
#[test]
fn rectangle_closed_form_optima() {
    let (l, w, fb) = (4000.0, 5.0, 10.0);
    let m = w * l * l / 8.0;
    // Stress governed (E = 1000 GPa: deflection far inside L/360), d at its
    // upper bound.
    let prep = Prepared::new(&beam(l, w), mat(1e6, fb), no_sw()).unwrap();
    let dmax = 250.0;
    let o = optimise::continuous(
        &rect_problem(vec![(10.0, 300.0), (50.0, dmax)], None),
        &prep,
        4,
    )
    .unwrap();
    let b_want = 6.0 * m / (fb * dmax * dmax);
    assert!((o.x[1] - dmax).abs() < 1e-3 * dmax, "d {}", o.x[1]);
    assert!(
        (o.x[0] - b_want).abs() < 1e-3 * b_want,
        "b {} vs {b_want}",
        o.x[0]
    );
    // Aspect ratio active.
    let k = 3.0;
    let o = optimise::continuous(
        &rect_problem(vec![(10.0, 300.0), (50.0, 1000.0)], Some(k)),
        &prep,
        4,
    )
    .unwrap();
    let d_want = (6.0 * k * m / fb).cbrt();
    assert!(
        (o.x[1] - d_want).abs() < 1e-3 * d_want,
        "d {} vs {d_want}",
        o.x[1]
    );
    assert!((o.x[1] / o.x[0] - k).abs() < 1e-3 * k);
    // Deflection governed (Fb = 200 MPa, 2 % of E: bending stress 8 MPa here).
    let e = 10_000.0;
    let prep = Prepared::new(&beam(l, w), mat(e, 200.0), no_sw()).unwrap();
    let i_req = 5.0 * w * l.powi(4) * 360.0 / (384.0 * e * l);
    let o = optimise::continuous(
        &rect_problem(vec![(10.0, 300.0), (50.0, dmax)], None),
        &prep,
        4,
    )
    .unwrap();
    let b_want = 12.0 * i_req / dmax.powi(3);
    assert!(
        (o.x[0] - b_want).abs() < 1e-3 * b_want,
        "b {} vs {b_want}",
        o.x[0]
    );
    let o = optimise::continuous(
        &rect_problem(vec![(10.0, 300.0), (50.0, 1000.0)], Some(k)),
        &prep,
        4,
    )
    .unwrap();
    let d_want = (12.0 * k * i_req).powf(0.25);
    assert!(
        (o.x[1] - d_want).abs() < 1e-3 * d_want,
        "d {} vs {d_want}",
        o.x[1]
    );
}

fn steel() -> Material {
    common::steel(345.0, Some(207.0), Some(138.0))
}

fn girder_problem(e: f64, fy: f64) -> Problem {
    let (lf, lw) = optimise::compact_slenderness(Family::WeldedI, e, fy);
    Problem {
        family: Family::WeldedI,
        bounds: vec![(80.0, 500.0), (5.0, 40.0), (200.0, 1200.0), (4.0, 25.0)],
        max_depth: Some(700.0),
        min_depth: None,
        aspect: None,
        lambda_f: lf,
        lambda_w: lw,
        objective: Objective::Area,
        plate_prices: vec![],
    }
}

/// All constraints of the problem in x-space, with the bounds.
fn g_all(prob: &Problem, prep: &Prepared, x: &[f64]) -> Vec<f64> {
    let e = prob.eval(prep, x).unwrap();
    let mut g: Vec<f64> = e.g.iter().map(|(_, v)| *v).collect();
    for (i, (lo, hi)) in prob.bounds.iter().enumerate() {
        g.push((lo - x[i]) / (hi - lo));
        g.push((x[i] - hi) / (hi - lo));
    }
    g
}

/// KKT at the welded-girder optimum (Nocedal & Wright Thm 12.1): feasible,
/// multipliers of the active constraints ≥ 0, and ∇f + Σλ∇g ≈ 0. Gradients
/// by central differences (h = 1e-4 mm... 1e-5 relative); the simplex
/// solution is accurate to about 1e-5, so stationarity is asked to 2 % of
/// |∇f|. And no point of a 20 000-point random sample of the box that is
/// feasible has a smaller area.
#[test]
fn girder_optimum_satisfies_kkt_and_beats_random_points() {
    let mut b = beam(9000.0, 25.0);
    b.self_weight_case = Some(0);
    let prep = Prepared::new(
        &b,
        steel(),
        Criteria {
            bracing: Bracing::Continuous,
            ..Criteria::default()
        },
    )
    .unwrap();
    let prob = girder_problem(200_000.0, 345.0);
    let o = optimise::continuous(&prob, &prep, 6).unwrap();
    let x = o.x.clone();
    let g0 = g_all(&prob, &prep, &x);
    assert!(g0.iter().all(|g| *g <= 1e-5), "infeasible: {g0:?}");
    let active: Vec<usize> = (0..g0.len()).filter(|&k| g0[k] > -1e-4).collect();
    assert!(!active.is_empty());
    let n = x.len();
    let grad = |f: &dyn Fn(&[f64]) -> f64| -> Vec<f64> {
        (0..n)
            .map(|i| {
                let h = 1e-5 * x[i].abs().max(1.0);
                let mut a = x.clone();
                let mut c = x.clone();
                a[i] += h;
                c[i] -= h;
                (f(&a) - f(&c)) / (2.0 * h)
            })
            .collect()
    };
    let gf = grad(&|y| prob.eval(&prep, y).unwrap().area);
    let gg: Vec<Vec<f64>> = active
        .iter()
        .map(|&k| grad(&|y| g_all(&prob, &prep, y)[k]))
        .collect();
    // Least squares for λ over every subset of the active set; keep the best
    // with λ ≥ 0 (the active set is small).
    let m = gg.len();
    let mut best = f64::INFINITY;
    for mask in 1u32..(1 << m) {
        let idx: Vec<usize> = (0..m).filter(|j| mask & (1 << j) != 0).collect();
        let k = idx.len();
        // Normal equations (G Gᵀ) λ = −G ∇f.
        let mut a = vec![vec![0.0; k + 1]; k];
        for (r, &i) in idx.iter().enumerate() {
            for (c, &j) in idx.iter().enumerate() {
                a[r][c] = (0..n).map(|t| gg[i][t] * gg[j][t]).sum();
            }
            a[r][k] = -(0..n).map(|t| gg[i][t] * gf[t]).sum::<f64>();
        }
        // Gaussian elimination with partial pivoting.
        let mut ok = true;
        for col in 0..k {
            let piv = (col..k)
                .max_by(|&p, &q| a[p][col].abs().total_cmp(&a[q][col].abs()))
                .unwrap();
            a.swap(col, piv);
            if a[col][col].abs() < 1e-14 {
                ok = false;
                break;
            }
            let pivot_row = a[col].clone();
            for (r, row) in a.iter_mut().enumerate() {
                if r != col {
                    let f = row[col] / pivot_row[col];
                    for (v, p) in row.iter_mut().zip(&pivot_row).skip(col) {
                        *v -= f * p;
                    }
                }
            }
        }
        if !ok {
            continue;
        }
        let lam: Vec<f64> = (0..k).map(|r| a[r][k] / a[r][r]).collect();
        if lam
            .iter()
            .any(|l| *l < -1e-6 * gf.iter().map(|v| v.abs()).sum::<f64>())
        {
            continue;
        }
        let res: f64 = (0..n)
            .map(|t| {
                gf[t]
                    + idx
                        .iter()
                        .zip(&lam)
                        .map(|(&i, l)| l * gg[i][t])
                        .sum::<f64>()
            })
            .map(|v| v * v)
            .sum::<f64>()
            .sqrt();
        best = best.min(res);
    }
    let norm = gf.iter().map(|v| v * v).sum::<f64>().sqrt();
    assert!(
        best <= 0.02 * norm,
        "stationarity residual {best} vs |∇f| {norm}"
    );
    // Random sample.
    let mut rng = 99u64;
    let mut next = move || {
        rng ^= rng << 13;
        rng ^= rng >> 7;
        rng ^= rng << 17;
        (rng % 1_000_000) as f64 / 1_000_000.0
    };
    let mut beaten = 0;
    for _ in 0..20_000 {
        let y: Vec<f64> = prob
            .bounds
            .iter()
            .map(|(lo, hi)| lo + (hi - lo) * next())
            .collect();
        if let Some(e) = prob.eval(&prep, &y)
            && e.g.iter().all(|(_, g)| *g <= 0.0)
            && e.area < o.area * (1.0 - 1e-4)
        {
            beaten += 1;
        }
    }
    assert_eq!(beaten, 0);
    // The continuous optimum passes the real check (within its tolerance).
    let p = prob.family.shape(&x).properties().unwrap();
    let s = prep.check(SectionInput::new(&p, p.mass_per_length(7850.0)));
    assert!(s.utilisation <= 1.0 + 1e-5);
}

/// The windowed grid search equals the exhaustive search of the whole grid,
/// and the result passes an independent check.
#[test]
fn discrete_equals_exhaustive() {
    let mut b = beam(7000.0, 18.0);
    b.self_weight_case = Some(0);
    let prep = Prepared::new(
        &b,
        steel(),
        Criteria {
            bracing: Bracing::Supports,
            ..Criteria::default()
        },
    )
    .unwrap();
    let prob = girder_problem(200_000.0, 345.0);
    let cont = optimise::continuous(&prob, &prep, 4).unwrap();
    let grid = Grid {
        values: vec![
            Grid::stepped(100.0, 300.0, 20.0),
            Grid::listed(5.0, 40.0, &[8.0, 10.0, 12.0, 15.0, 20.0, 25.0]),
            Grid::stepped(300.0, 650.0, 25.0),
            Grid::listed(4.0, 25.0, &[5.0, 6.0, 8.0, 10.0, 12.0]),
        ],
    };
    let whole = discrete::search(&prob, &prep, &grid, &cont.x, u128::MAX).unwrap();
    let window = discrete::search(&prob, &prep, &grid, &cont.x, 0).unwrap();
    assert!(whole.whole_grid && !window.whole_grid);
    // The windowed fallback is never better than the optimum, and its
    // stated bound covers its real gap.
    assert!(window.objective >= whole.objective * (1.0 - 1e-12));
    let gap = (window.objective - whole.objective) / whole.objective;
    assert!(window.gap_bound.unwrap() >= gap - 1e-12);
    // Independent exhaustive loop with the real check and the limits.
    let mut best: Option<(f64, Vec<f64>)> = None;
    for &bf in &grid.values[0] {
        for &tf in &grid.values[1] {
            for &hw in &grid.values[2] {
                for &tw in &grid.values[3] {
                    let shape = beamsift::section::Shape::WeldedI { bf, tf, hw, tw };
                    let Ok(p) = shape.properties() else { continue };
                    let s = prep.check(SectionInput::new(&p, p.mass_per_length(7850.0)));
                    let slender_ok = bf / (2.0 * tf) <= prob.lambda_f.unwrap()
                        && hw / tw <= prob.lambda_w.unwrap();
                    let depth_ok = hw + 2.0 * tf <= 700.0;
                    if s.passes
                        && slender_ok
                        && depth_ok
                        && best.as_ref().is_none_or(|(a, _)| p.area < *a)
                    {
                        best = Some((p.area, vec![bf, tf, hw, tw]));
                    }
                }
            }
        }
    }
    let (area, x) = best.unwrap();
    assert!((whole.area - area).abs() < 1e-9 * area);
    assert_eq!(whole.x, x);
}

/// An impossible problem names the constraint that cannot be met and what
/// would help.
#[test]
fn infeasible_problem_explains_itself() {
    let prep = Prepared::new(&beam(12_000.0, 40.0), mat(10_000.0, 10.0), no_sw()).unwrap();
    let prob = rect_problem(vec![(38.0, 75.0), (100.0, 200.0)], None);
    let e = optimise::continuous(&prob, &prep, 2)
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("not met even with every dimension at its upper bound"),
        "{e}"
    );
    assert!(
        e.contains("bending stress") || e.contains("deflection limit"),
        "{e}"
    );
    assert!(e.contains("raise the upper bounds"), "{e}");
}

/// The exhaustive grid search equals brute-force enumeration (every point
/// checked, independently of the search's ordering) on random girder
/// problems: random spans, loads, bracing, plate lists and bounds, including
/// ones whose optimum lies across a slenderness regime (compact, noncompact,
/// slender webs: no default web limit beyond F13.2 here) or in another
/// thickness family than the continuous optimum's neighbourhood.
#[test]
fn exhaustive_grid_equals_brute_force_on_random_problems() {
    let mut rng = 0x9e37_79b9_7f4a_7c15u64;
    let mut next = move || {
        rng ^= rng << 13;
        rng ^= rng >> 7;
        rng ^= rng << 17;
        (rng % 1_000_000) as f64 / 1_000_000.0
    };
    let mut branch_changes = 0;
    for case in 0..12 {
        let l = 5000.0 + 7000.0 * next();
        let w = 10.0 + 30.0 * next();
        let mut b = beam(l, w);
        b.self_weight_case = Some(0);
        let bracing = if next() < 0.5 {
            Bracing::Continuous
        } else {
            Bracing::Spacing(1500.0 + 2000.0 * next())
        };
        let prep = Prepared::new(
            &b,
            steel(),
            Criteria {
                bracing,
                braced_flange: BracedFlange::Both,
                ..Criteria::default()
            },
        )
        .unwrap();
        let (_, lw) = optimise::default_slenderness(Family::WeldedI, 200_000.0, 345.0);
        let prob = Problem {
            family: Family::WeldedI,
            bounds: vec![(100.0, 400.0), (6.0, 30.0), (300.0, 1000.0), (5.0, 16.0)],
            max_depth: if next() < 0.5 {
                Some(500.0 + 400.0 * next())
            } else {
                None
            },
            min_depth: None,
            aspect: None,
            lambda_f: None,
            lambda_w: lw,
            objective: Objective::Area,
            plate_prices: vec![],
        };
        let plates: Vec<f64> = [6.0, 8.0, 10.0, 12.0, 15.0, 20.0, 25.0, 30.0]
            .into_iter()
            .filter(|_| next() < 0.8)
            .collect();
        let webs: Vec<f64> = [5.0, 6.0, 8.0, 10.0, 12.0, 16.0]
            .into_iter()
            .filter(|_| next() < 0.8)
            .collect();
        let grid = Grid {
            values: vec![
                Grid::stepped(100.0, 400.0, 25.0),
                Grid::listed(6.0, 30.0, &plates),
                Grid::stepped(300.0, 1000.0, 50.0),
                Grid::listed(5.0, 16.0, &webs),
            ],
        };
        if grid.values.iter().any(|v| v.is_empty()) {
            continue;
        }
        // Brute force: every point, the real check and the limits.
        let mut best: Option<(f64, Vec<f64>)> = None;
        for &bf in &grid.values[0] {
            for &tf in &grid.values[1] {
                for &hw in &grid.values[2] {
                    for &tw in &grid.values[3] {
                        let shape = beamsift::section::Shape::WeldedI { bf, tf, hw, tw };
                        let Ok(p) = shape.properties() else { continue };
                        let s = prep.check(SectionInput::new(&p, p.mass_per_length(7850.0)));
                        let ok = s.passes
                            && prob
                                .max_depth
                                .is_none_or(|m| hw + 2.0 * tf <= m * (1.0 + 1e-12))
                            && hw / tw <= lw.unwrap() * (1.0 + 1e-12);
                        let better = best.as_ref().is_none_or(|(a, x)| {
                            p.area < *a || (p.area == *a && vec![bf, tf, hw, tw] < *x)
                        });
                        if ok && better {
                            best = Some((p.area, vec![bf, tf, hw, tw]));
                        }
                    }
                }
            }
        }
        let found = discrete::search(
            &prob,
            &prep,
            &grid,
            &[200.0, 10.0, 600.0, 8.0],
            discrete::EXHAUSTIVE_POINTS,
        );
        match best {
            None => assert!(
                found.is_err(),
                "case {case}: brute force finds nothing, search found {:?}",
                found.ok().map(|d| d.x)
            ),
            Some((area, x)) => {
                let d = found.unwrap_or_else(|e| panic!("case {case}: {e}"));
                assert!(d.whole_grid);
                assert_eq!(d.x, x, "case {case}");
                assert!((d.area - area).abs() <= 1e-9 * area);
                // Which web regime the optimum is in, against a neighbour.
                let sq = (200_000.0f64 / 345.0).sqrt();
                if x[2] / x[3] > 3.76 * sq {
                    branch_changes += 1;
                }
            }
        }
    }
    assert!(
        branch_changes > 0,
        "no random case reached a noncompact or slender web"
    );
}

/// Consistency check (structural, no outside source): every family's
/// implementation agrees with itself — as many default bounds and rounding
/// axes as variables, bounds 0 < lower < upper, a valid shape at the
/// middle of the bounds, a valid default problem, the geometric
/// constraints it adds exactly the limits it says apply (the command line
/// refuses the others on that word), a fabrication grid with a value on
/// every axis and thicknesses only from the plate list, and, at a price
/// of 1 per kg for every thickness, a cost equal to the mass of the whole
/// section (the plates priced make up the section; exact to 1e-12).
#[test]
fn every_family_is_consistent() {
    let mut names = Vec::new();
    for fam in Family::ALL {
        let k = fam.kind();
        let vars = k.variables();
        let what = format!("{fam:?}");
        assert_eq!(k.default_bounds().len(), vars.len(), "{what}: bounds");
        assert_eq!(k.axes().len(), vars.len(), "{what}: axes");
        assert_eq!(fam.default_bounds(), k.default_bounds().to_vec());
        assert!(
            k.default_bounds()
                .iter()
                .all(|(lo, hi)| 0.0 < *lo && lo < hi),
            "{what}: {:?}",
            k.default_bounds()
        );
        let mid: Vec<f64> = k
            .default_bounds()
            .iter()
            .map(|(lo, hi)| 0.5 * (lo + hi))
            .collect();
        let shape = fam.shape(&mid);
        shape
            .validate()
            .unwrap_or_else(|e| panic!("{what} at the mid-point: {e}"));
        let p = shape.properties().unwrap();
        assert!(p.area > 0.0);
        // The default problem of the family, and every limit set.
        let mat = steel();
        let base = Problem::least_area(fam, &mat);
        base.validate().unwrap();
        assert_eq!(base.bounds, fam.default_bounds());
        let prob = Problem {
            aspect: Some(3.0),
            lambda_f: Some(10.0),
            lambda_w: Some(100.0),
            ..base.clone()
        };
        let prep = Prepared::new(&beam(6000.0, 10.0), mat.clone(), Criteria::default()).unwrap();
        let e = prob.eval(&prep, &mid).unwrap();
        let has = |c: Constraint| e.g.iter().any(|(k, _)| *k == c);
        let lim = k.limits();
        assert_eq!(has(Constraint::Aspect), lim.aspect, "{what}: aspect");
        assert_eq!(
            has(Constraint::FlangeSlenderness),
            lim.flange,
            "{what}: flange"
        );
        assert_eq!(
            has(Constraint::WebSlenderness) || has(Constraint::WallSlenderness),
            lim.web,
            "{what}: web"
        );
        // Defaults only where the family has slender plates.
        let (df, dw) = k.default_slenderness(200_000.0, 345.0);
        assert!(df.is_none() || lim.flange, "{what}: default λf");
        assert!(dw.is_none() || lim.web, "{what}: default λw");
        // The fabrication grid.
        let plates = [6.0, 8.0, 10.0, 12.0, 15.0, 20.0, 25.0, 30.0];
        let grid = Grid::for_problem(
            &base,
            &discrete::GridOptions {
                plates: plates.to_vec(),
                step: 10.0,
                widths: None,
                depths: None,
            },
        )
        .unwrap();
        assert_eq!(grid.values.len(), vars.len());
        for (i, v) in grid.values.iter().enumerate() {
            assert!(!v.is_empty(), "{what}: {}", vars[i]);
            if fam.is_thickness(i) {
                assert!(v.iter().all(|t| plates.contains(t)), "{what}: {}", vars[i]);
            }
        }
        // Cost at 1 per kg = mass per mm.
        let priced = Problem {
            objective: Objective::Cost,
            plate_prices: plates.iter().map(|t| (*t, 1.0)).collect(),
            ..prob
        };
        let cost = priced.cost_of(&mid, mat.density);
        let mass = p.area * mat.density * 1e-9;
        assert!(
            (cost - mass).abs() <= 1e-12 * mass,
            "{what}: cost {cost} vs mass {mass}"
        );
        names.push(k.name());
    }
    names.sort();
    names.dedup();
    assert_eq!(names.len(), Family::ALL.len(), "family names are distinct");
}
