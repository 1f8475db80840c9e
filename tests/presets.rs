//! Combination presets as ASCE/SEI 7-16 §2.4.1 writes them (basic
//! allowable-stress combinations, from memory of the 2016 edition):
//!   (1) D; (2) D + L; (3) D + (Lr or S or R); (4) D + 0.75L + 0.75(Lr or S
//!   or R); (5) D + 0.6W; (6a) D + 0.75L + 0.75(0.6W) + 0.75(Lr or S or R);
//!   (7) 0.6D + 0.6W.
//! A missing case contributes zero and the combination stays; partial snow
//! loading per ASCE 7-16 §7.5 (from memory): balanced snow on some spans,
//! half of it on the others.

mod common;

use beamsift::beam::presets;
use beamsift::beam::*;

fn cases(cats: &[(&str, Category)]) -> Vec<LoadCase> {
    cats.iter()
        .map(|(n, c)| LoadCase {
            name: n.to_string(),
            category: *c,
            pattern: Pattern::None,
        })
        .collect()
}

/// Factors of a combination by case name, sorted.
fn factors(c: &Combination, cs: &[LoadCase]) -> Vec<(String, f64)> {
    let mut v: Vec<(String, f64)> = c
        .factors
        .iter()
        .map(|(i, f)| (cs[*i].name.clone(), *f))
        .collect();
    v.sort_by(|a, b| a.0.cmp(&b.0));
    v
}

fn find<'a>(p: &'a presets::Preset, name: &str) -> &'a Combination {
    p.combinations
        .iter()
        .find(|c| c.name == name)
        .unwrap_or_else(|| {
            panic!(
                "no combination {name} in {:?}",
                p.combinations.iter().map(|c| &c.name).collect::<Vec<_>>()
            )
        })
}

#[test]
fn an_absent_case_contributes_zero_and_the_combination_stays() {
    // Issue 13's example: no live case. (6a) D + 0.75L + 0.45W + 0.75S
    // becomes D + 0.45W + 0.75S (it used to vanish).
    let cs = cases(&[
        ("D", Category::Dead),
        ("W", Category::Wind),
        ("S", Category::Snow),
    ]);
    let p = presets::strength(&cs, "asce7-16-asd").unwrap();
    let c = find(&p, "D+0.45W+0.75S");
    assert_eq!(
        factors(c, &cs),
        vec![("D".into(), 1.0), ("S".into(), 0.75), ("W".into(), 0.45)]
    );
    assert!(
        c.source.as_deref().unwrap().contains("(6a)"),
        "{:?}",
        c.source
    );
    // (4) becomes D + 0.75S, distinct from (3) D + S.
    find(&p, "D+0.75S");
    find(&p, "D+S");
    // (2) D + L with no L equals (1) D: not repeated, and a note says so.
    assert_eq!(p.combinations.iter().filter(|c| c.name == "D").count(), 1);
    assert!(
        p.notes.iter().any(|n| n.contains("(2) equals (1)")),
        "{:?}",
        p.notes
    );
    // (7) 0.6D + 0.6W stays.
    find(&p, "0.6D+0.6W");
}

#[test]
fn every_category_present_gives_every_combination() {
    // D, L, Lr, S, R, W: (1) 1 + (2) 1 + (3) 3 + (4) 3 + (5) 1 + (6a) 3 +
    // (7) 1 = 13 combinations, rain among the "Lr or S or R" alternatives.
    let cs = cases(&[
        ("D", Category::Dead),
        ("L", Category::Live),
        ("Lr", Category::RoofLive),
        ("S", Category::Snow),
        ("R", Category::Rain),
        ("W", Category::Wind),
    ]);
    let p = presets::strength(&cs, "asce7-16-asd").unwrap();
    assert_eq!(
        p.combinations.len(),
        13,
        "{:?}",
        p.combinations.iter().map(|c| &c.name).collect::<Vec<_>>()
    );
    for name in [
        "D+R",
        "D+0.75L+0.75R",
        "D+0.75L+0.45W+0.75R",
        "D+0.75L+0.45W+0.75Lr",
    ] {
        find(&p, name);
    }
}

#[test]
fn other_loads_take_the_dead_load_factor() {
    // ASCE 7-16 §2.4.1 includes fluid loads F with the same factor as D
    // (from memory): 1.0 in (1)–(6a), 0.6 in (7).
    let cs = cases(&[
        ("D", Category::Dead),
        ("W", Category::Wind),
        ("H", Category::Other),
    ]);
    let p = presets::strength(&cs, "asce7-16-asd").unwrap();
    let c7 = find(&p, "0.6D+0.6W+0.6other");
    assert_eq!(
        factors(c7, &cs),
        vec![("D".into(), 0.6), ("H".into(), 0.6), ("W".into(), 0.6)]
    );
    let c1 = find(&p, "D+other");
    assert_eq!(factors(c1, &cs), vec![("D".into(), 1.0), ("H".into(), 1.0)]);
}

#[test]
fn wind_cases_are_alternatives() {
    // Two wind directions are never added together.
    let cs = cases(&[
        ("D", Category::Dead),
        ("Wp", Category::Wind),
        ("Ws", Category::Wind),
    ]);
    let p = presets::strength(&cs, "asce7-16-asd").unwrap();
    for c in &p.combinations {
        let w = c
            .factors
            .iter()
            .filter(|(i, _)| cs[*i].category == Category::Wind)
            .count();
        assert!(w <= 1, "{} adds both wind cases", c.name);
    }
    find(&p, "0.6D+0.6W(Wp)");
    find(&p, "0.6D+0.6W(Ws)");
}

#[test]
fn partial_snow_equals_brute_force_over_full_and_half() {
    // Three spans, snow 6 N/mm with partial loading: the envelope equals
    // the worst of the 2³ arrangements with each span at full or half
    // snow (ASCE 7-16 §7.5, from memory), each analysed as a fixed load.
    let spans = vec![5000.0, 6000.0, 4000.0];
    let sup = vec![Support::Pinned; 4];
    let mut b = Beam::new(spans.clone(), sup.clone());
    let d = b.case("D", Category::Dead);
    let s = b.case("S", Category::Snow);
    b.cases[s].pattern = Pattern::Partial;
    b.udl(d, 2.0);
    b.udl(s, 6.0);
    b.combo("D+S", ComboKind::Strength, &[(d, 1.0), (s, 1.0)]);
    let dm = Demand::build(&b, &[]).unwrap();
    let n = dm.len.len();
    let env = dm.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..n);
    let bounds = [(0.0, 5000.0), (5000.0, 11_000.0), (11_000.0, 15_000.0)];
    let (mut hi, mut lo) = (f64::NEG_INFINITY, f64::INFINITY);
    for mask in 0..8u32 {
        let mut bb = Beam::new(spans.clone(), sup.clone());
        let dd = bb.case("D", Category::Dead);
        bb.udl(dd, 2.0);
        for (k, &(x1, x2)) in bounds.iter().enumerate() {
            let w = if mask & (1 << k) != 0 { 6.0 } else { 3.0 };
            bb.load(
                dd,
                LoadKind::Distributed {
                    x1,
                    x2,
                    w1: w,
                    w2: w,
                },
            );
        }
        bb.combo("D", ComboKind::Strength, &[(dd, 1.0)]);
        let db = Demand::build(&bb, &[]).unwrap();
        let m = db.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..db.len.len());
        hi = hi.max(m.max);
        lo = lo.min(m.min);
    }
    common::close("largest sagging", env.max, hi, 1e-9);
    common::close("largest hogging", env.min, lo, 1e-9);
    // And it is worse than full snow everywhere (the unbalanced case
    // governs at least one extreme).
    let mut full = b.clone();
    full.cases[s].pattern = Pattern::None;
    let df = Demand::build(&full, &[]).unwrap();
    let mf = df.combo_extremes(0, 0.0, 1.0, Quantity::Moment, 0..df.len.len());
    assert!(env.max > mf.max * (1.0 + 1e-6), "{} vs {}", env.max, mf.max);
}

#[test]
fn the_asce_preset_turns_partial_snow_on_in_a_job() {
    let text = r#"
[beam]
spans = ["5 m", "5 m"]
supports = ["pinned", "pinned", "pinned"]
[material]
E = "200 GPa"
Fb = "165 MPa"
[[case]]
name = "D"
category = "dead"
[[case]]
name = "S"
category = "snow"
[[case]]
name = "S2"
category = "snow"
pattern = false
[presets]
strength = "asce7-16-asd"
"#;
    let job = beamsift::job::from_toml(text, "t.toml").unwrap();
    assert_eq!(job.beam.cases[1].pattern, Pattern::Partial);
    assert_eq!(
        job.beam.cases[2].pattern,
        Pattern::None,
        "an explicit choice stands"
    );
    assert!(
        job.notes.iter().any(|n| n.contains("§7.5")),
        "{:?}",
        job.notes
    );
}
