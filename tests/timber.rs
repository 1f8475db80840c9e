//! Timber by the ANSI/AWC National Design Specification (NDS) 2018 (from
//! memory; verify against the edition in force): the beam stability factor
//! C_L (§3.3.3, eq. 3.3-5 and 3.3-6, ℓe by Table 3.3.3), load duration C_D
//! per combination (Table 2.3.2), the adjustment factors of Table 4.3.1 and
//! long-term deflection with K_cr (§3.5.2). Values are worked by hand in the
//! tests from those equations (round-off tolerance).

mod common;

use beamsift::beam::*;
use beamsift::catalog::Materials;
use beamsift::check::timber::{effective_length, stability};
use beamsift::check::*;
use beamsift::search::{self, Rank, ScanOptions};
use beamsift::section::Shape;

/// Loads only (D 0.5, L 1.5 N/mm), no combinations: each test adds the
/// combinations whose load duration it checks, so common::simple_span's
/// fixed set does not fit.
fn span(l: f64) -> (Beam, usize, usize) {
    let mut b = Beam::new(vec![l], vec![Support::Pinned, Support::Roller]);
    let d = b.case("D", Category::Dead);
    let lv = b.case("L", Category::Live);
    b.udl(d, 0.5).udl(lv, 1.5);
    (b, d, lv)
}

#[test]
fn beam_stability_factor_by_hand() {
    // 38 × 286 (a 2×12 dressed), ℓu = 2.4 m: ℓu/d = 8.39, so Table 3.3.3
    // (single span or cantilever, any load) gives ℓe = 1.63ℓu + 3d =
    // 4770 mm; RB = √(ℓe·d/b²) = 30.74 (3.3-5); FbE = 1.20·Emin′/RB²;
    // CL by 3.3-6.
    let (b, d, lu) = (38.0, 286.0, 2400.0);
    let le = 1.63 * lu + 3.0 * d;
    assert!((effective_length(lu, d) - le).abs() < 1e-9);
    let rb2 = le * d / (b * b);
    let (fb_star, emin) = (10.0, 4400.0);
    let fbe = 1.20 * emin / rb2;
    let x = fbe / fb_star;
    let a = (1.0 + x) / 1.9;
    let cl = a - (a * a - x / 0.95).sqrt();
    let s = stability(lu, b, d, fb_star, emin).unwrap();
    common::close("RB", s.rb, rb2.sqrt(), 1e-12);
    common::close("CL", s.cl, cl, 1e-12);
    assert!((0.5..0.55).contains(&cl), "CL {cl}");
    // The other rows of the table's "any load" entry.
    common::close(
        "ℓu/d < 7",
        effective_length(1000.0, 286.0),
        2.06 * 1000.0,
        1e-12,
    );
    common::close(
        "ℓu/d > 14.3",
        effective_length(5000.0, 286.0),
        1.84 * 5000.0,
        1e-12,
    );
    // d ≤ b: CL = 1 (3.3.3.1); RB > 50 is outside the method (3.3.3.7).
    assert_eq!(
        stability(3000.0, 100.0, 100.0, 10.0, 4400.0).unwrap().cl,
        1.0
    );
    assert!(stability(20_000.0, 20.0, 400.0, 10.0, 4400.0).is_none());
}

#[test]
fn the_stability_line_in_a_member_check() {
    // Simply supported 2.4 m, braced at the supports only: one segment of
    // ℓu = 2.4 m; fb = M/S against Fb′ = Fb·CD·CL (CD = 1.0 fixed here).
    let (beam, d, lv) = span(2400.0);
    let mut beam = beam;
    beam.combo("D+L", ComboKind::Strength, &[(d, 1.0), (lv, 1.0)]);
    beam.service(
        "L",
        &[(lv, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    let m = common::timber(11_000.0, 10.0, 1.0, 4400.0, 1.0, 0.0);
    let prep = Prepared::new(
        &beam,
        m,
        Criteria {
            bracing: Bracing::Supports,
            self_weight: false,
            ..Criteria::default()
        },
    )
    .unwrap();
    let p = Shape::Rect { b: 38.0, d: 286.0 }.properties().unwrap();
    let (items, gaps) = prep.check_all(SectionInput::new(&p, 0.0));
    assert!(gaps.is_empty(), "{:?}", gaps.describe());
    let st = items
        .iter()
        .find(|i| i.kind == CheckKind::LateralTorsional)
        .unwrap();
    let cl = stability(2400.0, 38.0, 286.0, 10.0, 4400.0).unwrap().cl;
    common::close("Fb′ = Fb·CL", st.capacity, 10.0 * cl, 1e-12);
    let mmax = 2.0 * 2400.0f64.powi(2) / 8.0;
    common::close("fb", st.demand, mmax / p.s_top, 1e-9);
    // Continuously braced compression edge: CL = 1, no stability line.
    let prep = Prepared::new(
        &beam,
        common::timber(11_000.0, 10.0, 1.0, 4400.0, 1.0, 0.0),
        Criteria {
            bracing: Bracing::Continuous,
            self_weight: false,
            ..Criteria::default()
        },
    )
    .unwrap();
    let (items, gaps) = prep.check_all(SectionInput::new(&p, 0.0));
    assert!(gaps.is_empty());
    assert!(!items.iter().any(|i| i.kind == CheckKind::LateralTorsional));
}

#[test]
fn load_duration_per_combination_nds_table_2_3_2() {
    // Permanent (dead) 0.9, ten years (live) 1.0, two months (snow) 1.15,
    // ten minutes (wind) 1.6: the shortest-duration load in the combination
    // decides (from memory).
    let mut b = Beam::new(vec![3000.0], vec![Support::Pinned, Support::Roller]);
    let d = b.case("D", Category::Dead);
    let l = b.case("L", Category::Live);
    let s = b.case("S", Category::Snow);
    let w = b.case("W", Category::Wind);
    b.udl(d, 1.0);
    b.combo("D", ComboKind::Strength, &[(d, 1.0)]);
    b.combo("D+L", ComboKind::Strength, &[(d, 1.0), (l, 1.0)]);
    b.combo("D+S", ComboKind::Strength, &[(d, 1.0), (s, 1.0)]);
    b.combo(
        "D+0.75L+0.45W+0.75S",
        ComboKind::Strength,
        &[(d, 1.0), (l, 0.75), (w, 0.45), (s, 0.75)],
    );
    b.service(
        "L",
        &[(l, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    let mut m = common::timber(11_000.0, 10.0, 1.0, 4400.0, 1.0, 0.0);
    m.timber.cd = None;
    let prep = Prepared::new(
        &b,
        m.clone(),
        Criteria {
            bracing: Bracing::Continuous,
            self_weight: false,
            ..Criteria::default()
        },
    )
    .unwrap();
    assert_eq!(&prep.duration[..4], &[0.9, 1.0, 1.15, 1.6]);
    // The bending line of combination D carries Fb·0.9.
    let p = Shape::Rect { b: 50.0, d: 200.0 }.properties().unwrap();
    let (items, _) = prep.check_all(SectionInput::new(&p, 0.0));
    let bd = items
        .iter()
        .find(|i| i.kind == CheckKind::BendingSaggingBottom && i.combo == 0)
        .unwrap();
    common::close("Fb′ under D", bd.capacity, 10.0 * 0.9, 1e-12);
}

#[test]
fn adjustment_factors_multiply_the_reference_values() {
    // Fb′ = Fb·CD·CM·Ct·CF·Cfu·Ci·Cr and Fv′ = Fv·CD·CM·Ct·Ci (Table 4.3.1);
    // E′ = E·CM·Ct·Ci for deflection.
    let (mut beam, d, lv) = span(3000.0);
    beam.combo("D+L", ComboKind::Strength, &[(d, 1.0), (lv, 1.0)]);
    beam.service(
        "L",
        &[(lv, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    let mut m = common::timber(11_000.0, 10.0, 1.0, 4400.0, 1.0, 0.0);
    m.timber = TimberFactors {
        e_min: Some(4400.0),
        cd: Some(1.0),
        cm_fb: Some(0.85),
        cm_fv: Some(0.97),
        cm_e: Some(0.9),
        ct: None,
        ci: None,
        ct_e: None,
        ci_e: None,
        cf: Some(1.1),
        cr: Some(1.15),
        cfu: None,
    };
    let prep = Prepared::new(
        &beam,
        m,
        Criteria {
            bracing: Bracing::Continuous,
            self_weight: false,
            ..Criteria::default()
        },
    )
    .unwrap();
    let p = Shape::Rect { b: 50.0, d: 200.0 }.properties().unwrap();
    let (items, _) = prep.check_all(SectionInput::new(&p, 0.0));
    let get = |k: CheckKind| items.iter().find(|i| i.kind == k).unwrap();
    common::close(
        "Fb′",
        get(CheckKind::BendingSaggingBottom).capacity,
        10.0 * 0.85 * 1.1 * 1.15,
        1e-12,
    );
    common::close("Fv′", get(CheckKind::Shear).capacity, 1.0 * 0.97, 1e-12);
    // δ = 5wL⁴/(384E′I), E′ = 0.9E.
    let i = 50.0 * 200.0f64.powi(3) / 12.0;
    let want = 5.0 * 1.5 * 3000.0f64.powi(4) / (384.0 * 11_000.0 * 0.9 * i);
    common::close("δ with E′", get(CheckKind::Deflection).demand, want, 1e-9);
}

#[test]
fn long_term_deflection_with_the_creep_factor() {
    // NDS §3.5.2: ΔT = Kcr·ΔLT + ΔST; Kcr = 1.5 (seasoned lumber, dry), dead
    // load long-term, 30 % of live sustained: the D+L check carries
    // 1.5·δD + (1 + 0.5·0.3)·δL.
    let (mut beam, d, lv) = span(3000.0);
    beam.combo("D+L", ComboKind::Strength, &[(d, 1.0), (lv, 1.0)]);
    beam.service(
        "D+L",
        &[(d, 1.0), (lv, 1.0)],
        DeflectionLimit {
            ratio: Some(240.0),
            absolute: None,
        },
    );
    beam.service(
        "L",
        &[(lv, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    let crit = Criteria {
        bracing: Bracing::Continuous,
        self_weight: false,
        long_term: Some(LongTerm {
            creep_factor: 1.5,
            sustained_live: 0.3,
        }),
        ..Criteria::default()
    };
    let prep = Prepared::new(
        &beam,
        common::timber(11_000.0, 10.0, 1.0, 4400.0, 1.0, 0.0),
        crit,
    )
    .unwrap();
    let p = Shape::Rect { b: 50.0, d: 200.0 }.properties().unwrap();
    let (items, _) = prep.check_all(SectionInput::new(&p, 0.0));
    let i = 50.0 * 200.0f64.powi(3) / 12.0;
    let delta = |w: f64| 5.0 * w * 3000.0f64.powi(4) / (384.0 * 11_000.0 * i);
    let total = items
        .iter()
        .find(|it| {
            it.kind == CheckKind::Deflection && prep.demand.combos[it.combo].name.starts_with("D+L")
        })
        .unwrap();
    common::close(
        "long-term D+L",
        total.demand,
        1.5 * delta(0.5) + 1.15 * delta(1.5),
        1e-9,
    );
    assert!(prep.demand.combos[total.combo].name.contains("long-term"));
    // The live-only check is instantaneous.
    let live = items
        .iter()
        .find(|it| it.kind == CheckKind::Deflection && prep.demand.combos[it.combo].name == "L")
        .unwrap();
    common::close("L alone", live.demand, delta(1.5), 1e-9);
}

#[test]
fn catalogue_rows_bring_their_own_factors() {
    // A row's CF and Cr columns override its grade's: Fb′ = Fb·CF·Cr.
    let text = "name,shape,b [mm],d [mm],CF,Cr\nA,rect,50,200,1.2,1.15\nB,rect,50,200,,\n";
    let (mut beam, d, lv) = span(3000.0);
    beam.combo("D+L", ComboKind::Strength, &[(d, 1.0), (lv, 1.0)]);
    beam.service(
        "L",
        &[(lv, 1.0)],
        DeflectionLimit {
            ratio: Some(360.0),
            absolute: None,
        },
    );
    let m = common::timber(11_000.0, 10.0, 1.0, 4400.0, 1.0, 450.0);
    let prep = Prepared::new(
        &beam,
        m.clone(),
        Criteria {
            bracing: Bracing::Continuous,
            ..Criteria::default()
        },
    )
    .unwrap();
    let mats = Materials {
        base: &m,
        grades: &[],
    };
    let cat = beamsift::catalog::read::open(text.as_bytes(), "t.csv", &Default::default()).unwrap();
    let opts = ScanOptions {
        ranks: vec![(Rank::Mass, 10)],
        ..ScanOptions::default()
    };
    let sel = search::scan(&prep, vec![cat], &mats, &opts, &|_, _| {}).unwrap();
    let cap = |name: &str| {
        let c = sel.lists[0].items.iter().find(|c| c.name == name).unwrap();
        let mat = mats.get(&c.material);
        let (items, _) =
            prep.check_all(SectionInput::new(&c.properties, c.mass).with_material(mat));
        items
            .iter()
            .find(|i| i.kind == CheckKind::BendingSaggingBottom)
            .unwrap()
            .capacity
    };
    common::close("row A: Fb·CF·Cr", cap("A"), 10.0 * 1.2 * 1.15, 1e-12);
    common::close("row B: Fb", cap("B"), 10.0, 1e-12);
}

#[test]
fn steel_only_stability_options_are_refused_for_timber() {
    // NDS 3.3.3: timber beam stability takes its effective length from
    // Table 3.3.3, whatever the load position; the steel load-height and
    // overhang effective-length options would change nothing, so they are
    // refused rather than ignored (never ignored silently).
    let job = |extra: &str| {
        format!(
            "[beam]\nspans = [\"4 m\"]\nsupports = [\"pinned\", \"roller\"]\n\
             [material]\nkind = \"timber\"\nE = \"9 GPa\"\nEmin = \"3.3 GPa\"\nFb = \"8.5 MPa\"\n\
             Fv = \"0.9 MPa\"\ndensity = \"420 kg/m3\"\n\
             [[case]]\nname = \"dead\"\ncategory = \"dead\"\n\
             [[load]]\ncase = \"dead\"\nuniform = \"1 kN/m\"\n\
             [presets]\nstrength = \"asce7-16-asd\"\n\
             [checks]\nlateral_bracing = \"none\"\n{extra}"
        )
    };
    if let Err(e) = beamsift::job::from_toml(&job(""), "j.toml") {
        panic!("the plain timber job is valid: {e}");
    }
    for (extra, key) in [
        ("load_height = \"top_flange\"\n", "checks.load_height"),
        (
            "overhang_effective_length = 2.0\n",
            "checks.overhang_effective_length",
        ),
    ] {
        let e = beamsift::job::from_toml(&job(extra), "j.toml")
            .expect_err("a steel-only option with a timber material")
            .to_string();
        assert!(e.contains("j.toml:") && e.contains(key), "{e}");
        assert!(e.contains("NDS Table 3.3.3"), "{e}");
    }
}

#[test]
fn stiffness_takes_its_own_incising_and_temperature_factors() {
    // NDS Table 4.3.8 (from memory): incising factor C_i = 0.80 on F_b and
    // F_v, 0.95 on E and E_min. Without a stiffness value the strength
    // factor is used for E too (conservative: a smaller E).
    use beamsift::check::TimberFactors;
    let only = TimberFactors {
        ci: Some(0.80),
        ..TimberFactors::default()
    };
    assert_eq!(only.fv_factor(), 0.80);
    assert_eq!(only.e_factor(), 0.80);
    let both = TimberFactors {
        ci: Some(0.80),
        ci_e: Some(0.95),
        ct: Some(0.8),
        ct_e: Some(0.9),
        ..TimberFactors::default()
    };
    assert!((both.fb_factor() - 0.80 * 0.8).abs() < 1e-15);
    assert!((both.e_factor() - 0.95 * 0.9).abs() < 1e-15);
}

/// `catalog generate rect --nominal us-lumber`: rows named by nominal size,
/// written at the dressed size, whose properties match the NDS Supplement
/// (2018) Table 1B, "Section Properties of Standard Dressed (S4S) Sawn
/// Lumber" (from memory): 2x10 is 1.5 x 9.25 in, A = 13.88 in², Sxx =
/// 21.39 in³, Ixx = 98.93 in⁴; 4x12 is 3.5 x 11.25 in, Sxx = 73.83 in³;
/// 6x10 (a timber) is 5.5 x 9.5 in, Sxx = 82.73 in³. A size outside the
/// table and the option on another family are refused.
#[test]
fn nominal_lumber_sizes_are_generated_dressed() {
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("lumber.csv");
    let bin = env!("CARGO_BIN_EXE_beamsift");
    let run = |args: &[&str]| std::process::Command::new(bin).args(args).output().unwrap();
    let o = run(&[
        "catalog",
        "generate",
        "rect",
        "--nominal",
        "us-lumber",
        "--b",
        "2,4,6in",
        "--d",
        "10,12in",
        "-o",
        f.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let csv = std::fs::read_to_string(&f).unwrap();
    assert!(csv.contains("2x10,rect,,1.5,9.25"), "{csv}");
    assert!(csv.contains("6x10,rect,,5.5,9.5"), "{csv}");
    let o = run(&[
        "catalog",
        "show",
        f.to_str().unwrap(),
        "--units",
        "us",
        "--json",
    ]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout)
        .unwrap_or_else(|e| panic!("{e}: {}", String::from_utf8_lossy(&o.stderr)));
    let rows = v["rows"].as_array().unwrap_or_else(|| panic!("{v}"));
    let get = |name: &str| {
        rows.iter()
            .find(|r| r["name"] == name)
            .unwrap_or_else(|| panic!("{name} in {v}"))
    };
    let in3 = 25.4f64.powi(3);
    let in4 = 25.4f64.powi(4);
    let s = |r: &serde_json::Value| r["properties"]["s_top"].as_f64().unwrap() / in3;
    let r = get("2x10");
    common::close(
        "2x10 A",
        r["properties"]["area"].as_f64().unwrap() / 645.16,
        13.88,
        5e-4,
    );
    common::close("2x10 S", s(r), 21.39, 5e-4);
    common::close(
        "2x10 I",
        r["properties"]["ix"].as_f64().unwrap() / in4,
        98.93,
        5e-4,
    );
    common::close("4x12 S", s(get("4x12")), 73.83, 5e-4);
    common::close("6x10 S", s(get("6x10")), 82.73, 5e-4);

    let o = run(&[
        "catalog",
        "generate",
        "rect",
        "--nominal",
        "us-lumber",
        "--b",
        "2.5in",
        "--d",
        "4in",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&o.stderr).contains("--b"));
    let o = run(&[
        "catalog",
        "generate",
        "welded-i",
        "--nominal",
        "us-lumber",
        "--bf",
        "100mm",
        "--tf",
        "10mm",
        "--hw",
        "300mm",
        "--tw",
        "6mm",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&o.stderr).contains("--nominal"));
}
