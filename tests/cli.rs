//! End-to-end: the real binary, run as a user would, in a temporary folder.

mod common;

use common::{repo, run, text};

const IPE300: [&str; 6] = [
    "rolled-i",
    "d=300mm",
    "bf=150mm",
    "tf=10.7mm",
    "tw=7.1mm",
    "r=15mm",
];

#[test]
fn section_table_and_json() {
    let o = run(&[&["section"], &IPE300[..], &["--density", "7850kg/m3"]].concat());
    let (out, _) = text(&o);
    assert!(o.status.success());
    assert!(out.contains("83.56") && out.contains("10⁶ mm⁴") && out.contains("CAUTION"));
    let o = run(&[&["section"], &IPE300[..], &["--json", "--units", "us"]].concat());
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!((v["properties"]["ix"].as_f64().unwrap() - 83.56e6).abs() < 0.01e6);
    let o = run(&["section", "rect", "b=100", "d=200mm"]);
    let (_, err) = text(&o);
    assert_eq!(o.status.code(), Some(2));
    assert!(err.contains("has no unit") && err.contains("b"), "{err}");
}

#[test]
fn check_exit_codes_follow_the_verdict() {
    let job = repo("catalogs/demo-job.toml");
    let job = job.to_str().unwrap();
    // A deep section passes, a shallow one fails.
    let ok = run(&[
        "check", "--job", job, "welded-i", "bf=180mm", "tf=14mm", "hw=420mm", "tw=8mm",
    ]);
    let (out, err) = text(&ok);
    assert_eq!(ok.status.code(), Some(0), "{out}{err}");
    assert!(out.contains("PASSES"));
    let bad = run(&[&["check", "--job", job], &IPE300[..]].concat());
    assert_eq!(bad.status.code(), Some(1));
    assert!(text(&bad).0.contains("FAILS"));
    // The calculation sheet of a failing member is written, and the
    // command still exits 1 (from `report` and from `check --report`).
    let dir = tempfile::tempdir().unwrap();
    for (k, cmd) in [&["report", "--job", job][..], &["check", "--job", job]]
        .iter()
        .enumerate()
    {
        let to = dir.path().join(format!("fails-{k}"));
        let flag = if k == 0 { "--to" } else { "--report" };
        let o = run(&[*cmd, &[flag, to.to_str().unwrap()], &IPE300[..]].concat());
        assert_eq!(o.status.code(), Some(1), "{cmd:?}: {}", text(&o).1);
        let md = std::fs::read_to_string(to.with_extension("md")).unwrap();
        assert!(md.contains("FAILS"), "{cmd:?}");
    }
    // JSON for scripts.
    let o = run(&[&["check", "--job", job, "--json"], &IPE300[..]].concat());
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(v["passes"], false);
    assert!(v["utilisation"].as_f64().unwrap() > 1.0);
    // Flags for a simple span. Without Fv and without bracing, shear and
    // lateral stability apply but cannot be evaluated: NOT VERIFIED, exit 5.
    let flags = [
        "check",
        "--span",
        "4.8m",
        "--dead",
        "0.9kN/m",
        "--live",
        "1.8kN/m",
        "--E",
        "11GPa",
        "--Fb",
        "10MPa",
        "--density",
        "460kg/m3",
    ];
    let o = run(&[&flags[..], &["rect", "b=75mm", "d=300mm"]].concat());
    let (out, _) = text(&o);
    assert_eq!(o.status.code(), Some(5), "{out}");
    assert!(
        out.contains("NOT VERIFIED") && out.contains("no allowable shear stress"),
        "{out}"
    );
    // With Fv and a continuously braced top edge every check is evaluated.
    let o = run(&[
        &flags[..],
        &[
            "--Fv",
            "1MPa",
            "--bracing",
            "continuous",
            "rect",
            "b=75mm",
            "d=300mm",
        ],
    ]
    .concat());
    assert_eq!(o.status.code(), Some(0), "{}", text(&o).0);
    let o = run(&[
        "check", "--span", "4.8m", "--dead", "0.9", "--E", "11GPa", "--Fb", "10MPa", "rect",
        "b=75mm", "d=300mm",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o).1.contains("--dead"));
    let o = run(&[
        "check",
        "--job",
        "/nonexistent/job.toml",
        "rect",
        "b=75mm",
        "d=300mm",
    ]);
    assert_eq!(o.status.code(), Some(3));
}

#[test]
fn analyse_prints_reactions_and_extremes() {
    let o = run(&[
        "analyse",
        "--span",
        "4m,4m",
        "--dead",
        "2kN/m",
        "--live",
        "3kN/m",
        "--E",
        "200GPa",
        "--Ix",
        "8356cm4",
        "--stations",
        "--format",
        "csv",
    ]);
    let (out, err) = text(&o);
    assert!(o.status.success(), "{err}");
    // Two equal spans, full load 5 kN/m: centre reaction 10wL/8 = 25 kN
    // (AISC Manual Table 3-23 case 29, from memory).
    assert!(out.contains("D+L,pinned,4 m,10,25"), "{out}");
    let o = run(&[
        "analyse",
        "--job",
        repo("catalogs/demo-job.toml").to_str().unwrap(),
        "--json",
    ]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert!(v["extremes"].as_array().unwrap().len() >= 4);
    // An allowable stress means nothing to an analysis: refused, not ignored.
    let o = run(&[
        "analyse", "--span", "4m", "--dead", "2kN/m", "--E", "200GPa", "--Fb", "165MPa",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o).1.contains("--Fb only affect"), "{}", text(&o).1);
}

#[test]
fn output_file_is_written_whole() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("props.json");
    let o = run(&[
        &["section"],
        &IPE300[..],
        &["--json", "-o", path.to_str().unwrap()],
    ]
    .concat());
    assert!(o.status.success());
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    assert!(v["properties"]["area"].as_f64().unwrap() > 5000.0);
    let leftovers: Vec<_> = std::fs::read_dir(dir.path()).unwrap().collect();
    assert_eq!(leftovers.len(), 1, "no temporary file left behind");
}

#[test]
fn outputs_are_never_lost() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("result.json");
    std::fs::write(&out, "precious").unwrap();
    // An existing output is kept unless --force.
    let o = run(&[
        &["section"],
        &IPE300[..],
        &["--json", "-o", out.to_str().unwrap()],
    ]
    .concat());
    assert_eq!(o.status.code(), Some(3));
    assert!(text(&o).1.contains("--force"));
    assert_eq!(std::fs::read_to_string(&out).unwrap(), "precious");
    let o = run(&[
        &["section"],
        &IPE300[..],
        &["--json", "--force", "-o", out.to_str().unwrap()],
    ]
    .concat());
    assert!(o.status.success());
    assert!(
        std::fs::read_to_string(&out)
            .unwrap()
            .contains("properties")
    );
    // An output that is an input is refused, even with --force.
    let cat = dir.path().join("cat.csv");
    std::fs::copy(repo("catalogs/demo-steel.csv"), &cat).unwrap();
    let before = std::fs::read(&cat).unwrap();
    let job = repo("catalogs/demo-job.toml");
    let o = run(&[
        "select",
        "--job",
        job.to_str().unwrap(),
        "-c",
        cat.to_str().unwrap(),
        "--force",
        "-o",
        cat.to_str().unwrap(),
    ]);
    assert_eq!(o.status.code(), Some(3));
    assert!(text(&o).1.contains("input"));
    assert_eq!(std::fs::read(&cat).unwrap(), before);
    // A folder that does not exist is a clear error.
    let o = run(&[
        &["section"],
        &IPE300[..],
        &["-o", "/nonexistent-folder/x.txt"],
    ]
    .concat());
    assert_eq!(o.status.code(), Some(3));
    assert!(text(&o).1.contains("does not exist"));
}

/// Every command's JSON names its units and keeps internal units whatever
/// --units says: the demo catalogue prints NB 330 L at 56.2 kg/m and
/// 330 mm deep (catalogs/demo-steel.csv, line 21), and the JSON of a US
/// run carries those numbers, not 37.8 lb/ft and 13 in.
#[test]
fn json_names_its_units_whatever_the_display_units() {
    let job = repo("catalogs/demo-job.toml").to_string_lossy().to_string();
    let steel = repo("catalogs/demo-steel.csv")
        .to_string_lossy()
        .to_string();
    let sched = repo("catalogs/demo-schedule.csv")
        .to_string_lossy()
        .to_string();
    let joists = repo("catalogs/demo-joists.toml")
        .to_string_lossy()
        .to_string();
    let timber = repo("catalogs/demo-timber.csv")
        .to_string_lossy()
        .to_string();
    let dir = tempfile::tempdir().unwrap();
    let sheet = dir.path().join("sheet").to_string_lossy().to_string();
    let runs: Vec<Vec<&str>> = vec![
        vec!["select", "--job", &job, "-c", &steel],
        vec!["shortlist", "--job", &job, "-c", &steel],
        vec!["batch", "--schedule", &sched, "--job", &job, "-c", &steel],
        vec![
            "check",
            "--job",
            &job,
            "rolled-i",
            "d=330mm",
            "bf=175mm",
            "tf=12.7mm",
            "tw=8.1mm",
            "r=17mm",
        ],
        vec!["analyse", "--job", &job, "--Ix", "8356cm4"],
        vec!["optimise", "--job", &job, "welded-i"],
        vec![
            "sweep",
            "lightest",
            "--job",
            &job,
            "-c",
            &steel,
            "--spans",
            "4m..6m:1m",
        ],
        vec![
            "sweep",
            "table",
            "--job",
            &joists,
            "-c",
            &timber,
            "--spacings",
            "400,600mm",
        ],
        vec!["report", "--job", &job, "-c", &steel, "--to", &sheet],
        vec!["catalog", "validate", &steel],
        [&["section"], &IPE300[..]].concat(),
    ];
    for args in runs {
        let o = run(&[&args[..], &["--json", "--units", "us"]].concat());
        let (out, err) = text(&o);
        assert!(o.status.code().is_some_and(|c| c <= 1), "{args:?}: {err}");
        let v: serde_json::Value = serde_json::from_str(&out)
            .unwrap_or_else(|e| panic!("{args:?}: not JSON ({e}): {out}"));
        assert_eq!(v["units"]["length"], "mm", "{args:?}");
        assert_eq!(v["units"]["mass_per_length"], "kg/m", "{args:?}");
    }
    let o = run(&[
        "select", "--job", &job, "-c", &steel, "--json", "--units", "us",
    ]);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let best = &v["passing"][0];
    assert_eq!(best["name"], "NB 330 L");
    assert_eq!(best["mass"].as_f64(), Some(56.2));
    assert_eq!(best["depth"].as_f64(), Some(330.0));
}

/// The "Where" of a ranked row is a position like every other: metres in
/// SI, feet under --units us. The foot is 0.3048 m exactly (International
/// Yard and Pound Agreement, 1959); both are printed to four significant
/// figures, so they agree to 0.1 %.
#[test]
fn select_where_follows_the_units() {
    let job = repo("catalogs/demo-job.toml");
    let cat = repo("catalogs/demo-steel.csv");
    let (job, cat) = (job.to_str().unwrap(), cat.to_str().unwrap());
    let place = |units: &str| -> String {
        let o = run(&[
            "select", "--job", job, "-c", cat, "--json", "--units", units,
        ]);
        let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
        v["passing"][0]["governing_where"]
            .as_str()
            .unwrap()
            .to_string()
    };
    let number = |s: &str, unit: &str| -> f64 {
        let x = s.split("x = ").nth(1).unwrap();
        x.strip_suffix(unit).unwrap().trim().parse().unwrap()
    };
    let (si, us) = (place("si"), place("us"));
    assert!(si.ends_with(" m") && us.ends_with(" ft"), "{si} / {us}");
    let (m, ft) = (number(&si, "m"), number(&us, "ft"));
    assert!((ft * 0.3048 - m).abs() <= 1e-3 * m, "{m} m vs {ft} ft");
    let o = run(&["select", "--job", job, "-c", cat, "--units", "us"]);
    let (out, _) = text(&o);
    assert!(out.contains(&us), "{out}");
}

/// `select --format csv` on the demo job over a one-row catalogue of our
/// own (the row after the header line given); the CSV text.
fn select_csv_on(row: &str) -> String {
    let dir = tempfile::tempdir().unwrap();
    let cat = dir.path().join("stock.csv");
    std::fs::write(
        &cat,
        format!(
            "# invented test row (IPE 300 dimensions, from memory)\n\
             name,shape,d [mm],bf [mm],tf [mm],tw [mm],r [mm]\n{row}\n"
        ),
    )
    .unwrap();
    let job = repo("catalogs/demo-job.toml");
    let o = run(&[
        "select",
        "--job",
        job.to_str().unwrap(),
        "-c",
        cat.to_str().unwrap(),
        "--format",
        "csv",
    ]);
    let (out, err) = text(&o);
    assert!(o.status.code().is_some_and(|c| c <= 1), "{err}");
    out
}

/// A name that looks like a grouped number stays text in CSV output
/// (RFC 4180: a field with a comma is quoted, not altered); only numeric
/// columns lose their thousands separators.
#[test]
fn csv_keeps_names_that_look_like_numbers() {
    let out = select_csv_on("\"1,250\",rolled-i,300,150,10.7,7.1,15");
    // The ranked table: passing sections, or the nearest misses.
    let table: String = out
        .lines()
        .skip_while(|l| !(l.starts_with("# Passing") || l.starts_with("# Nearest")))
        .skip(1)
        .take_while(|l| !l.is_empty())
        .map(|l| format!("{l}\n"))
        .collect();
    let mut r = csv::ReaderBuilder::new()
        .flexible(true)
        .from_reader(table.as_bytes());
    let headers = r.headers().unwrap().clone();
    let col = headers.iter().position(|h| h == "Section").unwrap();
    let row = r.records().next().unwrap().unwrap();
    assert_eq!(&row[col], "1,250", "{out}");
}

/// US span tables label spacings as the trade writes them (common
/// practice): joists at "16 in" centres, beams at "6 ft" (72 in = 6 ft).
#[test]
fn us_spacings_read_in_inches_and_whole_feet() {
    let job = repo("catalogs/demo-joists.toml");
    let cat = repo("catalogs/demo-timber.csv");
    let o = run(&[
        "sweep",
        "table",
        "--job",
        job.to_str().unwrap(),
        "-c",
        cat.to_str().unwrap(),
        "--spacings",
        "16,72in",
        "--units",
        "us",
    ]);
    let (out, err) = text(&o);
    assert!(o.status.success(), "{err}");
    assert!(
        out.contains("16 in centres") && out.contains("6 ft centres"),
        "{out}"
    );
    assert!(!out.contains("72 in centres"), "{out}");
}

/// Buckling segments are positions too: the demo's 2 m bracing gives the
/// segment 0–2 m, which is 0–6.562 ft (2 m / 0.3048 m per ft, the 1959
/// international foot), not metres under --units us.
#[test]
fn segment_locations_follow_the_units() {
    let job = repo("catalogs/demo-job.toml");
    let args = |u: &'static str| {
        vec![
            "check".to_string(),
            "--job".into(),
            job.to_string_lossy().to_string(),
            "--units".into(),
            u.into(),
            "rolled-i".into(),
            "d=330mm".into(),
            "bf=175mm".into(),
            "tf=12.7mm".into(),
            "tw=8.1mm".into(),
            "r=17mm".into(),
        ]
    };
    let us = text(&run(&args("us"))).0;
    assert!(us.contains("segment 0.000–6.562 ft"), "{us}");
    assert!(!us.contains("segment 0.000–2.000 m"), "{us}");
    let si = text(&run(&args("si"))).0;
    assert!(si.contains("segment 0.000–2.000 m"), "{si}");
}

/// A shape given to `report` leaves the catalogue options nothing to act
/// on: each is refused by name, never ignored.
#[test]
fn report_with_a_shape_refuses_catalogue_options() {
    let job = repo("catalogs/demo-job.toml");
    let dir = tempfile::tempdir().unwrap();
    let to = dir.path().join("s");
    for opt in [
        &["--max-depth", "100mm"][..],
        &["--section", "NB 360 L"],
        &["--in-stock"],
        &["--skip-bad-rows"],
    ] {
        let o = run(&[
            &[
                "report",
                "--job",
                job.to_str().unwrap(),
                "--to",
                to.to_str().unwrap(),
            ][..],
            opt,
            &["rect", "b=100mm", "d=300mm"],
        ]
        .concat());
        let (_, err) = text(&o);
        assert_eq!(o.status.code(), Some(2), "{opt:?}: {err}");
        assert!(err.contains(opt[0]), "{opt:?}: {err}");
        assert!(std::fs::read_dir(dir.path()).unwrap().next().is_none());
    }
}

/// A name that a spreadsheet would run as a formula is written as text
/// (OWASP, "CSV Injection": prefix =, +, -, @ with an apostrophe).
#[test]
fn csv_defuses_formula_names() {
    let out = select_csv_on("\"=HYPERLINK(\"\"http://x\"\")\",rolled-i,300,150,10.7,7.1,15");
    assert!(out.contains("'=HYPERLINK"), "{out}");
    assert!(
        !out.lines()
            .any(|l| l.starts_with("=HYPERLINK") || l.contains(",=HYPERLINK")),
        "{out}"
    );
}

/// `batch --objective cost` sizes each member by price: with an invented
/// stock list where the heavier NB 200 L costs 20/m and the lighter
/// NB 160 L 99/m, the lintel L1 (2.4 m, both pass) takes NB 200 L by cost
/// and NB 160 L by mass; the bill totals follow the choice (2 × 2.4 m ×
/// 20/m = 96 for L1 alone).
#[test]
fn batch_by_cost_picks_the_cheapest_passing_section() {
    let dir = tempfile::tempdir().unwrap();
    let cat = dir.path().join("stock.csv");
    std::fs::write(
        &cat,
        "# invented prices for the test; dimensions as the demo list\n\
         name,shape,d [mm],bf [mm],tf [mm],tw [mm],r [mm],mass [kg/m],cost [EUR/m]\n\
         NB 160 L,rolled-i,160,90,8.0,5.1,10,17.7,99.0\n\
         NB 200 L,rolled-i,200,110,9.1,5.8,12,25.0,20.0\n",
    )
    .unwrap();
    let sched = dir.path().join("s.csv");
    std::fs::write(
        &sched,
        "# invented member for the test\nmark,count,spans [m],dead [kN/m],live [kN/m],bracing\nL1,2,2.4,6.5,2.4,continuous\n",
    )
    .unwrap();
    let job = repo("catalogs/demo-job.toml");
    let pick = |objective: &str| -> serde_json::Value {
        let o = run(&[
            "batch",
            "--schedule",
            sched.to_str().unwrap(),
            "--job",
            job.to_str().unwrap(),
            "-c",
            cat.to_str().unwrap(),
            "--objective",
            objective,
            "--json",
        ]);
        assert!(o.status.success(), "{}", text(&o).1);
        serde_json::from_slice(&o.stdout).unwrap()
    };
    let by_cost = pick("cost");
    assert_eq!(by_cost["members"][0]["section"], "NB 200 L");
    let total = by_cost["total_cost"].as_f64().unwrap();
    assert!((total - 96.0).abs() < 1e-6, "{total}");
    let by_mass = pick("mass");
    assert_eq!(by_mass["members"][0]["section"], "NB 160 L");
}

/// Fractional inches in a catalogue's `in` dimension cells read equal to
/// their decimals: a dressed 2x10 is 1-1/2 x 9-1/4 in (NDS Supplement
/// Table 1B, from memory), so its row equals the 1.5 x 9.25 in row; nonsense
/// is refused with the cell's line and column and the reason.
#[test]
fn catalogue_cells_read_fractional_inches() {
    let dir = tempfile::tempdir().unwrap();
    let ok = dir.path().join("ok.csv");
    std::fs::write(
        &ok,
        "name,shape,b [in],d [in]\nA,rect,1-1/2,9 1/4\nD,rect,1.5,9.25\n",
    )
    .unwrap();
    let o = common::run(&["catalog", "show", ok.to_str().unwrap(), "--format", "csv"]);
    let (out, err) = common::text(&o);
    assert!(o.status.success(), "{err}");
    let rows: Vec<&str> = out
        .lines()
        .filter(|l| l.starts_with('2') || l.starts_with('3'))
        .collect();
    assert_eq!(rows.len(), 2, "{out}");
    assert_eq!(
        rows[0].split_once(",A,").unwrap().1,
        rows[1].split_once(",D,").unwrap().1,
        "{out}"
    );
    assert!(rows[0].contains(",234.9,"), "9.25 in = 234.95 mm: {out}");
    let bad = dir.path().join("bad.csv");
    std::fs::write(
        &bad,
        "name,shape,b [in],d [in]\nB,rect,1/0,9\nC,rect,3//4,9\nE,rect,1-1/2/3,9\n",
    )
    .unwrap();
    let o = common::run(&["catalog", "validate", bad.to_str().unwrap()]);
    let (out, _) = common::text(&o);
    assert_eq!(o.status.code(), Some(2), "{out}");
    assert!(
        out.contains("bad.csv:2:3") && out.contains("denominator"),
        "{out}"
    );
    assert!(
        out.contains("bad.csv:3:3") && out.contains("bad.csv:4:3"),
        "{out}"
    );
}

/// `check --section NAME -c FILE` checks the catalogue row by name: the
/// same verdict and utilisation as `select` gives that row, and, within
/// the self-weight difference of the row's printed mass (65.5 kg/m) from
/// A × 7850 kg/m³, as `check` of the same rolled I by its dimensions
/// (whose properties are tested against handbook values in
/// tests/sections.rs). A wrong-case name is refused with the similar one.
#[test]
fn check_takes_a_catalogue_row_by_name() {
    let job = repo("catalogs/demo-job.toml");
    let cat = repo("catalogs/demo-steel.csv");
    let (job, cat) = (job.to_str().unwrap(), cat.to_str().unwrap());
    let json = |o: &std::process::Output| -> serde_json::Value {
        serde_json::from_slice(&o.stdout).unwrap_or_else(|e| panic!("{e}: {}", text(o).1))
    };
    let named = run(&[
        "check",
        "--job",
        job,
        "-c",
        cat,
        "--section",
        "NB 360 L",
        "--json",
    ]);
    assert_eq!(named.status.code(), Some(0), "{}", text(&named).1);
    let named = json(&named);
    assert_eq!(named["section"], "NB 360 L");
    let sel = json(&run(&[
        "select", "--job", job, "-c", cat, "--name", "NB 360 L", "--json", "-q",
    ]));
    let row = &sel["passing"][0];
    assert_eq!(row["name"], "NB 360 L", "{sel}");
    let u = named["utilisation"].as_f64().unwrap();
    assert!(
        (u - row["utilisation"].as_f64().unwrap()).abs() < 1e-12,
        "{u} vs {row}"
    );
    let dims = json(&run(&[
        "check",
        "--job",
        job,
        "rolled-i",
        "d=360mm",
        "bf=190mm",
        "tf=13.6mm",
        "tw=8.7mm",
        "r=18mm",
        "--json",
    ]));
    let ud = dims["utilisation"].as_f64().unwrap();
    assert!(
        (u - ud).abs() / ud < 2e-3,
        "by name {u}, by dimensions {ud}"
    );

    let wrong = run(&["check", "--job", job, "-c", cat, "--section", "nb 360 l"]);
    assert_eq!(wrong.status.code(), Some(2));
    assert!(
        text(&wrong).1.contains("similar: 'NB 360 L'"),
        "{}",
        text(&wrong).1
    );
    // A catalogue without a name, and a name with a shape, are refused.
    let o = run(&["check", "--job", job, "-c", cat]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o).1.contains("--section"), "{}", text(&o).1);
    let o = run(&[
        "check",
        "--job",
        job,
        "--section",
        "NB 360 L",
        "rect",
        "b=100mm",
        "d=300mm",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(text(&o).1.contains("--section"), "{}", text(&o).1);
}

/// `optimise ... -c FILE --section NAME` sets the catalogue row beside the
/// fabrication sizes: the row's utilisation is the one `check --section`
/// gives it, and the change is (optimum − row) / row of the numbers shown
/// (a hand calculation on the JSON fields). Half the pair is refused.
#[test]
fn optimise_sets_a_catalogue_row_beside_the_optimum() {
    let job = repo("catalogs/demo-job.toml");
    let cat = repo("catalogs/demo-steel.csv");
    let (job, cat) = (job.to_str().unwrap(), cat.to_str().unwrap());
    let base = ["optimise", "--job", job, "welded-i", "--max-depth", "450mm"];
    let o = run(&[&base[..], &["-c", cat, "--section", "NB 360 L", "--json"]].concat());
    assert_eq!(o.status.code(), Some(0), "{}", text(&o).1);
    let v: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let r = &v["reference"];
    assert_eq!(r["name"], "NB 360 L", "{v}");
    let checked: serde_json::Value = serde_json::from_slice(
        &run(&[
            "check",
            "--job",
            job,
            "-c",
            cat,
            "--section",
            "NB 360 L",
            "--json",
        ])
        .stdout,
    )
    .unwrap();
    assert_eq!(r["utilisation"], checked["utilisation"]);
    assert_eq!(r["verdict"], checked["verdict"]);
    let (m, rm) = (
        v["discrete"]["mass"].as_f64().unwrap(),
        r["mass"].as_f64().unwrap(),
    );
    assert_eq!(rm, 65.5, "the row's printed mass (catalogs/demo-steel.csv)");
    assert!((r["mass_change"].as_f64().unwrap() - (m - rm) / rm).abs() < 1e-12);
    let t = text(&run(
        &[&base[..], &["-c", cat, "--section", "NB 360 L"]].concat()
    ))
    .0;
    assert!(t.contains("Against the catalogue row NB 360 L"), "{t}");

    for (extra, named) in [
        (&["--section", "NB 360 L"][..], "--section"),
        (&["-c", cat], "--catalog"),
        (&["--delimiter", ";"], "--delimiter"),
    ] {
        let o = run(&[&base[..], extra].concat());
        assert_eq!(o.status.code(), Some(2), "{extra:?}");
        assert!(text(&o).1.contains(named), "{extra:?}: {}", text(&o).1);
    }
}

/// Problems are told in the units the user typed: a catalogue whose
/// headers are in inches and lb/ft hears about its rows in inches and
/// lb/ft, at the column of the dimension at fault; a shape typed in inches
/// hears in inches. (7 in flanges in a 12 in depth cannot fit: 2 × 7 > 12.
/// A·ρ of the valid row: A = 2·6·0.5 + 11·0.3 = 9.3 in² (no fillets),
/// × 490 lb/ft³ (steel, 7850 kg/m³; AISC Manual, from memory) / 144 =
/// 31.6 lb/ft, so 30 lb/ft is 5.2 % off, beyond the 5 % allowed.)
#[test]
fn problems_are_told_in_the_units_typed() {
    let dir = tempfile::tempdir().unwrap();
    let f = dir.path().join("us.csv");
    std::fs::write(
        &f,
        "name,shape,d [in],bf [in],tf [in],tw [in],mass [lb/ft]\n\
         W1,rolled-i,12,6,0.5,0.3,30\n\
         W2,rolled-i,12,6,7,0.3,30\n",
    )
    .unwrap();
    let job = repo("catalogs/demo-job.toml");
    let o = run(&[
        "catalog",
        "validate",
        f.to_str().unwrap(),
        "--job",
        job.to_str().unwrap(),
    ]);
    let out = text(&o).0;
    let flat = out.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(
        flat.contains(
            "us.csv:3:5: tf [in]: two flanges of tf = 7 in do not fit in the depth d = 12 in"
        ),
        "{out}"
    );
    assert!(
        flat.contains("us.csv:2:7: mass [lb/ft]: mass 30 lb/ft differs by 5.2 % from A·ρ = 31.6"),
        "{out}"
    );
    assert!(!flat.contains(" mm ") && !flat.contains("kg/m"), "{out}");
    let o = run(&[
        "section", "rolled-i", "d=12in", "bf=6in", "tf=7in", "tw=0.3in",
    ]);
    let err = text(&o).1;
    assert!(
        err.contains("tf = 7 in do not fit in the depth d = 12 in"),
        "{err}"
    );
    let o = run(&[
        "section", "rolled-i", "d=300mm", "bf=150mm", "tf=160mm", "tw=7mm",
    ]);
    let err = text(&o).1;
    assert!(
        err.contains("tf = 160 mm do not fit in the depth d = 300 mm"),
        "{err}"
    );
}

/// `--units us-ft-in` writes spans and positions in feet-inches: the demo's
/// 6 m + 1.2 m is 19'-8 1/4" + 3'-11 1/4" (6000/25.4 = 236.22 in; 1200/25.4
/// = 47.24 in = 3 ft 11.24 in, nearest 1/16 in), forces still in kip.
#[test]
fn feet_inches_on_the_member_table() {
    let job = repo("catalogs/demo-job.toml");
    let o = run(&[
        "check",
        "--job",
        job.to_str().unwrap(),
        "--units",
        "us-ft-in",
        "rect",
        "b=200mm",
        "d=600mm",
    ]);
    let out = text(&o).0;
    assert!(out.contains("19'-8 1/4\" + 3'-11 1/4\""), "{out}");
    assert!(out.contains("kip"), "{out}");
    // Buckling segments too: braces at 2.0 m (the demo job's) are 2000 /
    // 25.4 = 78.74 in = 6 ft 6.74 in, 6'-6 3/4" to the nearest 1/16 in.
    assert!(out.contains("segment 0'-0\" – 6'-6 3/4\""), "{out}");
    assert!(!out.contains(" ft "), "decimal feet left in {out}");
}

/// `analyse` writes deflection in the sheet's one convention, positive
/// downward: the unloaded span of a two-span continuous beam with live
/// load patterned on the other span lifts (a textbook result for
/// continuous beams, e.g. Roark, Table 8.2, from memory), so its "δ up"
/// cell is negative and its "δ down" cell positive.
#[test]
fn analyse_prints_upward_deflection_negative() {
    let o = run(&[
        "analyse", "--span", "4m,4m", "--dead", "2kN/m", "--live", "3kN/m", "--E", "200GPa",
        "--Ix", "8356cm4",
    ]);
    let out = text(&o).0;
    let row = out
        .lines()
        .find(|l| l.starts_with("L ") && l.contains("span 1"))
        .unwrap_or_else(|| panic!("{out}"));
    let cells: Vec<&str> = row.split_whitespace().collect();
    // ... δ down, at, δ up, at: the last four cells.
    let n = cells.len();
    let down: f64 = cells[n - 4].parse().unwrap();
    let up: f64 = cells[n - 2].parse().unwrap();
    assert!(down > 0.0 && up < 0.0, "{row}");
    assert!(
        out.contains("positive downward, so δ up is negative"),
        "{out}"
    );
}

/// Under `--units us` the words are in US units too: the demo job's braces
/// at 2.0 m are 2000 / 304.8 = 6.562 ft apart (in the assumptions of
/// select and batch), and stock bars of 6 m are 19'-8 1/4" under us-ft-in
/// (6000 / 25.4 = 236.22 in, nearest 1/16 in) with the kerf in inches
/// (3 mm = 0.1181 in).
#[test]
fn assumptions_and_stock_bars_in_the_display_units() {
    let job = repo("catalogs/demo-job.toml");
    let steel = repo("catalogs/demo-steel.csv");
    let o = run(&[
        "select",
        "--job",
        job.to_str().unwrap(),
        "-c",
        steel.to_str().unwrap(),
        "--units",
        "us",
    ]);
    let out = text(&o).0;
    assert!(out.contains("braces every 6.562 ft restrain"), "{out}");
    assert!(!out.contains("braces every 2 m"), "{out}");
    let o = run(&[
        "batch",
        "--schedule",
        repo("catalogs/demo-schedule.csv").to_str().unwrap(),
        "--job",
        repo("catalogs/demo-template.toml").to_str().unwrap(),
        "-c",
        steel.to_str().unwrap(),
        "--stock-lengths",
        "6m",
        "--kerf",
        "3mm",
        "--units",
        "us-ft-in",
    ]);
    let out = text(&o).0;
    assert!(out.contains("braces every 6'-6 3/4\" restrain"), "{out}");
    assert!(
        out.contains("Cutting from stock bars (19'-8 1/4\"; kerf 0.1181 in per piece"),
        "{out}"
    );
}
