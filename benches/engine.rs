//! Benchmarks of what users wait for. Compare ratios within one run; the
//! machine is shared and absolute times are noisy (benches/README.md).

use beamsift::beam::*;
use beamsift::check::*;
use beamsift::optimise::{self, Family, Objective, Problem};
use beamsift::section::Shape;
use criterion::{Criterion, criterion_group, criterion_main};
use std::hint::black_box;

fn steel() -> Material {
    Material {
        name: "s".into(),
        e: 200_000.0,
        fb_tension: 207.0,
        fb_compression: 207.0,
        fv: Some(138.0),
        fy: Some(345.0),
        density: 7850.0,
    }
}

fn girder_job() -> Prepared {
    let mut b = Beam::new(vec![9000.0], vec![Support::Pinned, Support::Roller]);
    let d = b.case("D", Category::Dead);
    let l = b.case("L", Category::Live);
    b.self_weight_case = Some(d);
    b.udl(d, 10.0).udl(l, 15.0);
    b.combo("D+L", ComboKind::Strength, &[(d, 1.0), (l, 1.0)]);
    b.service(
        "L",
        &[(l, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    Prepared::new(
        &b,
        steel(),
        Criteria {
            bracing: Bracing::Spacing(3000.0),
            ..Criteria::default()
        },
    )
    .unwrap()
}

fn optimise_girder(c: &mut Criterion) {
    let prep = girder_job();
    let (lf, lw) = optimise::default_slenderness(Family::WeldedI, 200_000.0, 345.0);
    let prob = Problem {
        family: Family::WeldedI,
        bounds: vec![(100.0, 600.0), (6.0, 50.0), (150.0, 2000.0), (5.0, 30.0)],
        max_depth: Some(800.0),
        min_depth: None,
        aspect: None,
        lambda_f: lf,
        lambda_w: lw,
        objective: Objective::Area,
        plate_prices: vec![],
    };
    let plates = [
        6.0, 8.0, 10.0, 12.0, 15.0, 20.0, 25.0, 30.0, 35.0, 40.0, 45.0, 50.0,
    ];
    c.bench_function(
        "optimise welded I (continuous, 6 starts, + discrete)",
        |b| {
            b.iter(|| {
                let o = optimise::continuous(&prob, &prep, 6).unwrap();
                let grid = optimise::discrete::Grid {
                    values: prob
                        .bounds
                        .iter()
                        .enumerate()
                        .map(|(i, &(lo, hi))| {
                            if Family::WeldedI.is_thickness(i) {
                                optimise::discrete::Grid::listed(lo, hi, &plates)
                            } else {
                                optimise::discrete::Grid::stepped(lo, hi, 10.0)
                            }
                        })
                        .collect(),
                };
                black_box(optimise::discrete::search(&prob, &prep, &grid, &o.x, 20_000).unwrap())
            })
        },
    );
    let shape = Shape::WeldedI {
        bf: 250.0,
        tf: 16.0,
        hw: 600.0,
        tw: 8.0,
    };
    let p = shape.properties().unwrap();
    c.bench_function("section properties, welded I", |b| {
        b.iter(|| black_box(shape.properties().unwrap()))
    });
    c.bench_function("one check, simple span girder with bracing", |b| {
        b.iter(|| black_box(prep.check(SectionInput::new(&p, 50.0))))
    });
}

criterion_group!(benches, optimise_girder);
criterion_main!(benches);
