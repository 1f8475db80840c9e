//! Price columns: per length, per mass and per volume, each turned into a
//! cost per length; a catalogue without prices said as such; batch
//! wastage and allowances on the cost of each mark. Every expected figure
//! is worked by hand in the comment beside it (the catalogues are invented
//! for the tests).

mod common;

use common::{repo, run, text};
use serde_json::Value;
use std::path::Path;

fn write(dir: &Path, name: &str, body: &str) -> String {
    let p = dir.join(name);
    std::fs::write(&p, body).unwrap();
    p.to_str().unwrap().to_string()
}

/// `select --rank RANK --json` with `job` over `cat`: the JSON.
fn select_json(job: &str, cat: &str, rank: &str) -> Value {
    let o = run(&[
        "select",
        "--job",
        repo(job).to_str().unwrap(),
        "-c",
        cat,
        "--rank",
        rank,
        "--json",
    ]);
    let (out, err) = text(&o);
    // Exit 0 (a row passes) or 1 (none passes) both print the result.
    assert!(matches!(o.status.code(), Some(0 | 1)), "{err}");
    serde_json::from_str(&out).unwrap_or_else(|e| panic!("{e}: {out}"))
}

/// The JSON cost (currency per mm) of the row `name`, wherever it is
/// listed (passing, near misses or not verified).
fn cost_of(v: &Value, name: &str) -> f64 {
    for list in ["passing", "near_misses", "not_verified"] {
        for r in v[list].as_array().unwrap() {
            if r["name"] == name {
                return r["cost"].as_f64().unwrap_or_else(|| panic!("{r}"));
            }
        }
    }
    panic!("row {name} not listed: {v}");
}

#[test]
fn a_price_per_tonne_becomes_a_cost_per_metre_from_the_mass() {
    // By hand: 1000 EUR/t = 1 EUR/kg; × 30.7 kg/m = 30.70 EUR/m, i.e.
    // 0.0307 EUR per mm (the JSON's unit, "currency per mm of length").
    // The row's dimensions are those of the demo NB 180 H (A·ρ = 30.3 kg/m,
    // within the 5 % the reader allows of the 30.7 kg/m given).
    let dir = tempfile::tempdir().unwrap();
    let cat = write(
        dir.path(),
        "t.csv",
        "# invented prices for the test\n\
         name,shape,d [mm],bf [mm],tf [mm],tw [mm],r [mm],mass [kg/m],price [EUR/t]\n\
         X 180,rolled-i,180,120,11.2,6.8,11,30.7,1000\n",
    );
    let v = select_json("catalogs/demo-job.toml", &cat, "cost");
    let per_m = cost_of(&v, "X 180") * 1000.0;
    assert!((per_m - 30.70).abs() < 1e-9, "{per_m}");
    assert_eq!(v["prices"], "given");
    assert_eq!(v["currency"], "EUR");
    assert_eq!(v["price_basis"], serde_json::json!(["per_mass"]));
}

#[test]
fn a_price_per_cubic_metre_becomes_a_cost_per_metre_from_the_area() {
    // By hand: a 100 × 300 mm rectangle has A = 0.1 m × 0.3 m = 0.03 m²;
    // 2000 EUR/m³ × 0.03 m² = 60 EUR/m = 0.06 EUR per mm.
    let dir = tempfile::tempdir().unwrap();
    let cat = write(
        dir.path(),
        "v.csv",
        "# invented prices for the test\n\
         name,grade,shape,b [mm],d [mm],price [EUR/m3]\n\
         G100x300,G1,rect,100,300,2000\n",
    );
    let v = select_json("catalogs/demo-joists.toml", &cat, "cost");
    let per_m = cost_of(&v, "G100x300") * 1000.0;
    assert!((per_m - 60.0).abs() < 1e-9, "{per_m}");
    assert_eq!(v["price_basis"], serde_json::json!(["per_volume"]));
}

#[test]
fn two_price_columns_are_refused_with_the_place() {
    // A catalogue has one price column: cost [EUR/m] then price [EUR/t]
    // is refused at the second one (line 2, column 8), exit 2.
    let dir = tempfile::tempdir().unwrap();
    let cat = write(
        dir.path(),
        "two.csv",
        "name,shape,d [mm],bf [mm],tf [mm],tw [mm],r [mm],cost [EUR/m],price [EUR/t]\n\
         X 180,rolled-i,180,120,11.2,6.8,11,30,1000\n",
    );
    let o = run(&[
        "select",
        "--job",
        repo("catalogs/demo-job.toml").to_str().unwrap(),
        "-c",
        &cat,
    ]);
    let (_, err) = text(&o);
    assert_eq!(o.status.code(), Some(2), "{err}");
    assert!(err.contains("two.csv:1:9"), "{err}");
    assert!(err.contains("second price column"), "{err}");
}

#[test]
fn no_price_column_says_no_prices() {
    // The catalogue has no cost or price column: JSON says "prices":
    // "none" and names no currency (even though the job names EUR), the
    // table's cost column says "no prices" and shows no cost per length.
    let dir = tempfile::tempdir().unwrap();
    let cat = write(
        dir.path(),
        "n.csv",
        "# invented sizes for the test\n\
         name,grade,shape,b [mm],d [mm]\n\
         G100x300,G1,rect,100,300\n",
    );
    let v = select_json("catalogs/demo-joists.toml", &cat, "mass");
    assert_eq!(v["prices"], "none");
    assert!(v["currency"].is_null(), "{}", v["currency"]);
    assert_eq!(cost_of_opt(&v, "G100x300"), None);
    let o = run(&[
        "select",
        "--job",
        repo("catalogs/demo-joists.toml").to_str().unwrap(),
        "-c",
        &cat,
    ]);
    let (out, err) = text(&o);
    assert!(matches!(o.status.code(), Some(0 | 1)), "{err}");
    assert!(out.contains("no prices"), "{out}");
    assert!(!out.contains("EUR/m"), "{out}");
    assert!(!out.contains("cost/m"), "{out}");
    // Ranking by a cost no row has is refused (exit 2), not done by
    // something else under a "cheapest first" title.
    let o = run(&[
        "select",
        "--job",
        repo("catalogs/demo-joists.toml").to_str().unwrap(),
        "-c",
        &cat,
        "--rank",
        "cost",
    ]);
    let (out, err) = text(&o);
    assert_eq!(o.status.code(), Some(2), "{out}{err}");
    assert!(err.contains("--rank cost"), "{err}");
    assert!(err.contains("no prices"), "{err}");
}

fn cost_of_opt(v: &Value, name: &str) -> Option<f64> {
    for list in ["passing", "near_misses", "not_verified"] {
        for r in v[list].as_array().unwrap() {
            if r["name"] == name {
                return r["cost"].as_f64();
            }
        }
    }
    panic!("row {name} not listed: {v}");
}

/// The demo steel section NB 200 L at an invented 20 EUR/m, and one mark
/// (the demo lintel L1: 2 off, 2.4 m), for the batch cost tests.
fn batch(dir: &Path, cat_body: &str, extra: &[&str]) -> std::process::Output {
    let cat = write(dir, "stock.csv", cat_body);
    let sched = write(
        dir,
        "s.csv",
        "# invented member for the test\n\
         mark,count,spans [m],dead [kN/m],live [kN/m],bracing\n\
         L1,2,2.4,6.5,2.4,continuous\n",
    );
    let job = repo("catalogs/demo-job.toml");
    let mut args = vec![
        "batch",
        "--schedule",
        &sched,
        "--job",
        job.to_str().unwrap(),
        "-c",
        &cat,
    ];
    args.extend_from_slice(extra);
    run(&args)
}

const PRICED: &str = "# invented price for the test; dimensions as the demo list\n\
     name,shape,d [mm],bf [mm],tf [mm],tw [mm],r [mm],mass [kg/m],cost [EUR/m]\n\
     NB 200 L,rolled-i,200,110,9.1,5.8,12,25.0,20.0\n";

const UNPRICED: &str = "# invented section for the test; dimensions as the demo list\n\
     name,shape,d [mm],bf [mm],tf [mm],tw [mm],r [mm],mass [kg/m]\n\
     NB 200 L,rolled-i,200,110,9.1,5.8,12,25.0\n";

#[test]
fn batch_line_cost_carries_wastage_and_allowances() {
    // By hand: net = 2 × 2.4 m × 20 EUR/m = 96 EUR; factor (1 + 5 %) ×
    // (1 + 8 %) = 1.05 × 1.08 = 1.134; line cost = 96 × 1.134 = 108.864 EUR.
    let dir = tempfile::tempdir().unwrap();
    let o = batch(
        dir.path(),
        PRICED,
        &["--wastage", "5%", "--allowance", "connections=8%", "--json"],
    );
    let (out, err) = text(&o);
    assert!(o.status.success(), "{err}");
    let v: Value = serde_json::from_str(&out).unwrap();
    let c = &v["costs"];
    assert!((c["factor"].as_f64().unwrap() - 1.134).abs() < 1e-12, "{c}");
    let m = &c["marks"][0];
    assert_eq!(m["mark"], "L1");
    // The same formula from the JSON's own fields (count, length in mm,
    // unit cost per mm): 2 × 2400 mm × 0.02 EUR/mm × 1.05 × 1.08.
    let from_fields = m["count"].as_f64().unwrap()
        * m["length"].as_f64().unwrap()
        * m["unit_cost"].as_f64().unwrap()
        * 1.05
        * 1.08;
    let line = m["line_cost"].as_f64().unwrap();
    assert!((line - 108.864).abs() < 1e-9, "{line}");
    assert!((line - from_fields).abs() < 1e-9, "{line} vs {from_fields}");
    assert!((m["net_cost"].as_f64().unwrap() - 96.0).abs() < 1e-9, "{m}");
    assert!((c["total"].as_f64().unwrap() - 108.864).abs() < 1e-9, "{c}");
    // The table gives the formula and the percentages.
    let o = batch(
        dir.path(),
        PRICED,
        &["--wastage", "5%", "--allowance", "connections=8%"],
    );
    let (out, _) = text(&o);
    assert!(out.contains("108.86"), "{out}");
    assert!(out.contains("wastage 5 %"), "{out}");
    assert!(out.contains("connections 8 %"), "{out}");
}

#[test]
fn wastage_and_allowances_are_refused_without_prices() {
    // No price column: a wastage on a cost that does not exist is refused
    // (exit 2) with the option named, not ignored.
    let dir = tempfile::tempdir().unwrap();
    for extra in [
        &["--wastage", "5%"][..],
        &["--allowance", "connections=8%"][..],
    ] {
        let o = batch(dir.path(), UNPRICED, extra);
        let (_, err) = text(&o);
        assert_eq!(o.status.code(), Some(2), "{extra:?}: {err}");
        assert!(err.contains(extra[0]), "{err}");
        assert!(err.contains("no prices"), "{err}");
    }
}

#[test]
fn bad_percentages_are_refused() {
    // A percentage is 0 to 100 %; an allowance is NAME=PERCENT.
    let dir = tempfile::tempdir().unwrap();
    for (extra, says) in [
        (&["--wastage", "150%"][..], "--wastage"),
        (&["--allowance", "8%"][..], "NAME=PERCENT"),
        (
            &["--allowance", "paint=3%", "--allowance", "paint=4%"][..],
            "given twice",
        ),
    ] {
        let o = batch(dir.path(), PRICED, extra);
        let (_, err) = text(&o);
        assert_eq!(o.status.code(), Some(2), "{extra:?}: {err}");
        assert!(err.contains(says), "{err}");
    }
}

#[test]
fn an_empty_price_column_says_no_prices_and_a_partial_one_partly() {
    // The header has a price column but no row fills it: the prices are
    // judged by the rows checked, not by the header, so select and
    // shortlist say "none" as for a catalogue without the column, and
    // --rank cost is refused (exit 2).
    let dir = tempfile::tempdir().unwrap();
    let empty = write(
        dir.path(),
        "e.csv",
        "# invented sizes for the test\n\
         name,grade,shape,b [mm],d [mm],cost [EUR/m]\n\
         G100x300,G1,rect,100,300,\n\
         G100x350,G1,rect,100,350,\n",
    );
    let v = select_json("catalogs/demo-joists.toml", &empty, "mass");
    assert_eq!(v["prices"], "none", "{v}");
    assert!(v["currency"].is_null(), "{}", v["currency"]);
    let o = run(&[
        "shortlist",
        "--job",
        repo("catalogs/demo-joists.toml").to_str().unwrap(),
        "-c",
        &empty,
        "--json",
    ]);
    let (out, err) = text(&o);
    assert!(matches!(o.status.code(), Some(0 | 1)), "{err}");
    let s: Value = serde_json::from_str(&out).unwrap();
    assert_eq!(s["prices"], "none", "{s}");
    let o = run(&[
        "select",
        "--job",
        repo("catalogs/demo-joists.toml").to_str().unwrap(),
        "-c",
        &empty,
        "--rank",
        "cost",
    ]);
    let (out, err) = text(&o);
    assert_eq!(o.status.code(), Some(2), "{out}{err}");
    assert!(err.contains("no prices"), "{err}");
    // One of two rows priced: "partly given", the priced row ranks first
    // by cost even though it is the heavier (100 × 350 against 100 × 300:
    // both pass the demo joist job), and the note says how the unpriced
    // one ranks.
    let partly = write(
        dir.path(),
        "p.csv",
        "# invented sizes and price for the test\n\
         name,grade,shape,b [mm],d [mm],cost [EUR/m]\n\
         G100x300,G1,rect,100,300,\n\
         G100x350,G1,rect,100,350,25.00\n",
    );
    let v = select_json("catalogs/demo-joists.toml", &partly, "cost");
    assert_eq!(v["prices"], "partly given", "{v}");
    let passing = v["passing"].as_array().unwrap();
    assert_eq!(passing.len(), 2, "{v}");
    assert_eq!(passing[0]["name"], "G100x350", "{v}");
    assert_eq!(passing[1]["name"], "G100x300", "{v}");
    let o = run(&[
        "select",
        "--job",
        repo("catalogs/demo-joists.toml").to_str().unwrap(),
        "-c",
        &partly,
        "--rank",
        "cost",
    ]);
    let (out, _) = text(&o);
    assert!(out.contains("they rank after every priced row"), "{out}");
}
