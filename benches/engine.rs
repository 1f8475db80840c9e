//! Benchmarks of what users wait for (see benches/README.md for figures).
//! Compare ratios within one run; absolute times on a shared machine are
//! noisy. `cargo bench --bench engine -- <filter>` runs a subset.

use beamsift::beam::*;
use beamsift::catalog::generate::{self, Spec};
use beamsift::catalog::read::{self, ReadOptions};
use beamsift::catalog::{Materials, parse_row};
use beamsift::check::*;
use beamsift::optimise::{self, Family, Objective, Problem};
use beamsift::search::{self, Filters, ScanOptions, batch};
use beamsift::section::Shape;
use criterion::{Criterion, criterion_group, criterion_main};
use std::hint::black_box;
use std::path::PathBuf;
use std::time::{Duration, Instant};

fn steel() -> Material {
    Material {
        name: "s".into(),
        kind: MaterialKind::Steel,
        e: 200_000.0,
        fb_tension: Some(207.0),
        fb_compression: Some(207.0),
        fv: Some(138.0),
        fy: Some(345.0),
        density: 7850.0,
        timber: TimberFactors::default(),
    }
}

/// Simple span, D and L, one strength and one serviceability combination.
fn simple_job() -> Beam {
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
    b
}

/// Three continuous spans, live load patterned by span, six combinations.
fn three_span_job() -> Beam {
    let mut b = Beam::new(vec![6000.0, 7500.0, 6000.0], vec![Support::Pinned; 4]);
    let d = b.case("D", Category::Dead);
    let l = b.case("L", Category::Live);
    let s = b.case("S", Category::Snow);
    b.self_weight_case = Some(d);
    b.udl(d, 8.0).udl(l, 12.0).udl(s, 3.0);
    b.load(
        l,
        LoadKind::Point {
            x: 9000.0,
            p: 20_000.0,
        },
    );
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    b.combo("D+L", ComboKind::Strength, &[(d, 1.0), (l, 1.0)]);
    b.combo("D+S", ComboKind::Strength, &[(d, 1.0), (s, 1.0)]);
    b.combo(
        "D+0.75L+0.75S",
        ComboKind::Strength,
        &[(d, 1.0), (l, 0.75), (s, 0.75)],
    );
    b.service(
        "L",
        &[(l, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    b.service(
        "D+L",
        &[(d, 1.0), (l, 1.0)],
        DeflectionLimit {
            ratio: Some(240.0),
            absolute: None,
        },
    );
    b
}

fn section_checks(c: &mut Criterion) {
    let shape = Shape::WeldedI {
        bf: 250.0,
        tf: 16.0,
        hw: 600.0,
        tw: 8.0,
    };
    let p = shape.properties().unwrap();
    // Both flanges continuously braced: bending (Fb and AISC F2 yielding),
    // shear (Fv and G2), deflection.
    let unbraced_free = Criteria {
        bracing: Bracing::Continuous,
        braced_flange: BracedFlange::Both,
        ..Criteria::default()
    };
    let simple = Prepared::new(&simple_job(), steel(), unbraced_free.clone()).unwrap();
    let three = Prepared::new(&three_span_job(), steel(), unbraced_free.clone()).unwrap();
    let mut sprung = three_span_job();
    sprung.supports[1] = Support::Spring(5000.0);
    sprung.supports[2] = Support::Spring(5000.0);
    let three_springs = Prepared::new(&sprung, steel(), unbraced_free.clone()).unwrap();
    let mut one_spring = simple_job();
    one_spring.spans = vec![4500.0, 4500.0];
    one_spring.supports = vec![Support::Pinned, Support::Spring(5000.0), Support::Pinned];
    for c in one_spring.cases.iter_mut() {
        c.pattern = Pattern::None;
    }
    let simple_spring = Prepared::new(&one_spring, steel(), unbraced_free.clone()).unwrap();
    let supports = Prepared::new(&simple_job(), steel(), Criteria::default()).unwrap();
    let braced = Prepared::new(
        &simple_job(),
        steel(),
        Criteria {
            bracing: Bracing::Spacing(3000.0),
            ..Criteria::default()
        },
    )
    .unwrap();
    c.bench_function("check/simple span, 2 combinations", |b| {
        b.iter(|| black_box(simple.check(SectionInput::new(black_box(&p), 60.0))))
    });
    c.bench_function("check/simple span braced at the supports (F2 LTB)", |b| {
        b.iter(|| black_box(supports.check(SectionInput::new(black_box(&p), 60.0))))
    });
    c.bench_function("check/two spans on a middle spring, 2 combinations", |b| {
        b.iter(|| black_box(simple_spring.check(SectionInput::new(black_box(&p), 60.0))))
    });
    c.bench_function("check/3 spans patterned, 6 combinations", |b| {
        b.iter(|| black_box(three.check(SectionInput::new(black_box(&p), 60.0))))
    });
    c.bench_function(
        "check/3 spans patterned on two springs, 6 combinations",
        |b| b.iter(|| black_box(three_springs.check(SectionInput::new(black_box(&p), 60.0)))),
    );
    c.bench_function("check/simple span with lateral buckling, 3 segments", |b| {
        b.iter(|| black_box(braced.check(SectionInput::new(black_box(&p), 60.0))))
    });
    c.bench_function("section/properties of a welded I", |b| {
        b.iter(|| black_box(black_box(&shape).properties().unwrap()))
    });
}

/// A generated welded-I catalogue of about `target` rows in a temp folder.
fn catalogue(target: usize) -> PathBuf {
    let dir = std::env::temp_dir().join("beamsift-bench");
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join(format!("welded-{target}.csv"));
    if path.exists() {
        return path;
    }
    let steps = |lo: f64, hi: f64, st: f64| -> Vec<f64> {
        (0..=((hi - lo) / st) as usize)
            .map(|k| lo + k as f64 * st)
            .collect()
    };
    let (bf_step, hw_step) = if target >= 1_000_000 {
        (2.0, 5.0)
    } else {
        (20.0, 25.0)
    };
    let spec = Spec::WeldedI {
        bf: steps(100.0, 600.0, bf_step),
        tf: vec![
            6.0, 8.0, 10.0, 12.0, 15.0, 18.0, 20.0, 22.0, 25.0, 28.0, 30.0, 35.0, 40.0,
        ],
        hw: steps(200.0, 1400.0, hw_step),
        tw: vec![5.0, 6.0, 8.0, 10.0, 12.0, 14.0],
        lambda_f: Some(9.15),
        lambda_w: Some(90.5),
        density: 7850.0,
        price_per_kg: Some(1.25),
    };
    let mut f = std::io::BufWriter::new(std::fs::File::create(&path).unwrap());
    generate::generate(&spec, "EUR", "bench.csv", &mut f).unwrap();
    path
}

fn open(path: &PathBuf) -> read::Catalog<std::io::BufReader<std::fs::File>> {
    let f = std::io::BufReader::with_capacity(1 << 16, std::fs::File::open(path).unwrap());
    let mut cat = read::open(f, "bench.csv", &ReadOptions::default()).unwrap();
    cat.size_hint = Some(std::fs::metadata(path).unwrap().len());
    cat
}

fn bare_read(path: &PathBuf) -> u64 {
    let f = std::io::BufReader::with_capacity(1 << 16, std::fs::File::open(path).unwrap());
    let mut rdr = csv::ReaderBuilder::new().comment(Some(b'#')).from_reader(f);
    let mut rec = csv::ByteRecord::new();
    let mut n = 0;
    while rdr.read_byte_record(&mut rec).unwrap() {
        n += 1;
    }
    n
}

fn select_once(prep: &Prepared, path: &PathBuf, m: &Material) -> u64 {
    let mats = Materials {
        base: m,
        grades: &[],
    };
    let o = || Ok(vec![open(path)]);
    let sel = search::scan_checked(prep, &o, &mats, &ScanOptions::default(), &|_, _| {}).unwrap();
    sel.counts.passing
}

fn best_of(n: usize, f: &mut dyn FnMut()) -> Duration {
    (0..n)
        .map(|_| {
            let t = Instant::now();
            f();
            t.elapsed()
        })
        .min()
        .unwrap()
}

fn select(c: &mut Criterion) {
    let m = steel();
    let prep = Prepared::new(&simple_job(), m.clone(), Criteria::default()).unwrap();
    for target in [10_000usize, 1_000_000] {
        let path = catalogue(target);
        let rows = bare_read(&path);
        // The ratio the targets are stated in, measured in this run.
        let bare = best_of(5, &mut || {
            black_box(bare_read(&path));
        });
        let sel = best_of(5, &mut || {
            black_box(select_once(&prep, &path, &m));
        });
        println!(
            "select/{rows} rows: bare ByteRecord read {:.1} ms, select {:.1} ms, ratio {:.2}",
            bare.as_secs_f64() * 1e3,
            sel.as_secs_f64() * 1e3,
            sel.as_secs_f64() / bare.as_secs_f64()
        );
        let mut g = c.benchmark_group(format!("select/{rows} rows"));
        g.sample_size(10);
        g.bench_function("bare ByteRecord read", |b| {
            b.iter(|| black_box(bare_read(&path)))
        });
        g.bench_function("select", |b| {
            b.iter(|| black_box(select_once(&prep, &path, &m)))
        });
        g.finish();
    }
    // Parse only, to see where a row's time goes.
    let path = catalogue(10_000);
    let mut cat = open(&path);
    let mut chunk = read::Chunk::default();
    cat.next_chunk(&mut chunk).unwrap();
    let mats = Materials {
        base: &m,
        grades: &[],
    };
    c.bench_function(
        &format!("catalogue/parse {} rows (no check)", chunk.records.len()),
        |b| {
            b.iter(|| {
                for r in chunk.records.iter() {
                    black_box(parse_row(&cat.schema, &r, &mats).ok());
                }
            })
        },
    );
}

fn drivers(c: &mut Criterion) {
    let m = steel();
    let path = catalogue(10_000);
    let mats = Materials {
        base: &m,
        grades: &[],
    };
    let (rows, _, _) =
        search::load_rows(vec![open(&path)], &mats, false, &Filters::default()).unwrap();
    let rows: Vec<_> = rows.into_iter().take(10_000).collect();
    let spans: Vec<f64> = (0..100).map(|k| 3000.0 + 100.0 * k as f64).collect();
    let beam = simple_job();
    let mut g = c.benchmark_group("drivers");
    g.sample_size(10);
    g.bench_function(format!("sweep 100 spans x {} sections", rows.len()), |b| {
        b.iter(|| {
            black_box(
                beamsift::sweep::lightest(
                    &beam,
                    &m,
                    &Criteria::default(),
                    &rows,
                    &mats,
                    &spans,
                    &|| {},
                )
                .unwrap(),
            )
        })
    });
    // A 200-member schedule (invented).
    let mut text = String::from("mark,count,spans [m],dead [kN/m],live [kN/m]\n");
    for i in 0..200 {
        text.push_str(&format!(
            "M{i},1,{},{},{}\n",
            3.0 + (i % 40) as f64 * 0.2,
            2.0 + (i % 7) as f64,
            4.0 + (i % 5) as f64
        ));
    }
    let tmpl = beamsift::job::Job {
        title: "bench".into(),
        project: beamsift::job::Project::default(),
        beam: simple_job(),
        material: m.clone(),
        criteria: Criteria::default(),
        grades: vec![],
        currency: None,
        presets: (None, None),
        notes: vec![],
    };
    let members = batch::read_schedule(
        text.as_bytes(),
        "s.csv",
        &Default::default(),
        &tmpl,
        360.0,
        240.0,
    )
    .unwrap();
    g.bench_function(
        format!("schedule of 200 members x {} sections", rows.len()),
        |b| {
            b.iter(|| {
                black_box(
                    batch::size(
                        &members,
                        &rows,
                        &mats,
                        &Filters::default(),
                        false,
                        beamsift::units::System::Si,
                    )
                    .unwrap(),
                )
            })
        },
    );
    g.finish();
}

fn optimise_girder(c: &mut Criterion) {
    let prep = Prepared::new(
        &simple_job(),
        steel(),
        Criteria {
            bracing: Bracing::Spacing(3000.0),
            ..Criteria::default()
        },
    )
    .unwrap();
    let (lf, lw) = optimise::compact_slenderness(Family::WeldedI, 200_000.0, 345.0);
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
    c.bench_function("optimise/welded I, continuous (6 starts) + discrete", |b| {
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
            black_box(
                optimise::discrete::search(
                    &prob,
                    &prep,
                    &grid,
                    &o.x,
                    optimise::discrete::EXHAUSTIVE_POINTS,
                )
                .unwrap(),
            )
        })
    });
}

criterion_group!(benches, section_checks, select, drivers, optimise_girder);
criterion_main!(benches);
