//! Spreadsheet outputs read back with independent readers: `calamine`
//! (0.38, dev-dependency) for .xlsx and the `csv` crate for csv-numeric.
//! The check values are the numbers of the same run's JSON output (a
//! different renderer of the same data set), so the test fails if a cell
//! is written as text, rounded, moved to the wrong column or lost.

use calamine::{Data, Reader, Xlsx, open_workbook};
use std::path::{Path, PathBuf};
use std::process::Command;

fn bin() -> &'static str {
    env!("CARGO_BIN_EXE_beamsift")
}
fn cat(f: &str) -> String {
    format!("{}/catalogs/{f}", env!("CARGO_MANIFEST_DIR"))
}
fn tmp(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("beamsift-ss-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}
fn run(dir: &Path, args: &[&str]) -> (i32, String, String) {
    let o = Command::new(bin())
        .args(args)
        .current_dir(dir)
        .output()
        .unwrap();
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-9 * a.abs().max(b.abs()).max(1.0)
}

#[test]
fn batch_workbook_holds_numbers_equal_to_the_json() {
    let d = tmp("batch");
    let (sched, job, steel) = (
        cat("demo-schedule.csv"),
        cat("demo-job.toml"),
        cat("demo-steel.csv"),
    );
    let base = ["batch", "--schedule", &sched, "--job", &job, "-c", &steel];
    let mut a = base.to_vec();
    a.extend(["-o", "b.xlsx"]);
    let (c, _, e) = run(&d, &a);
    assert!(c == 0 || c == 1, "exit {c}: {e}");
    let mut j = base.to_vec();
    j.push("--json");
    let (_, js, e) = run(&d, &j);
    let json: serde_json::Value = serde_json::from_str(&js).unwrap_or_else(|x| panic!("{x}: {e}"));

    let mut wb: Xlsx<_> = open_workbook(d.join("b.xlsx")).unwrap();
    let names = wb.sheet_names().to_vec();
    eprintln!("sheets: {names:?}");
    // A sheet of caution and scope, and the caution under every table.
    assert!(
        names.iter().any(|n| n.to_lowercase().contains("caution")),
        "no caution sheet in {names:?}"
    );
    for n in &names {
        let r = wb.worksheet_range(n).unwrap();
        assert!(
            r.rows().any(|row| row
                .iter()
                .any(|c| c.to_string().contains("competent person"))),
            "sheet '{n}' lacks the caution"
        );
    }

    // The bill: per section, mass and length totals as numbers equal to the JSON.
    let bill_sheet = names
        .iter()
        .find(|n| n.to_lowercase() == "bill")
        .expect("a 'Bill' sheet");
    let r = wb.worksheet_range(bill_sheet).unwrap();
    let rows: Vec<Vec<Data>> = r.rows().map(|x| x.to_vec()).collect();
    let hrow = rows
        .iter()
        .position(|row| {
            row.iter()
                .any(|c| c.to_string().to_lowercase().starts_with("section"))
        })
        .expect("a header row");
    let header: Vec<String> = rows[hrow].iter().map(|c| c.to_string()).collect();
    eprintln!("bill header: {header:?}");
    let col = |word: &str| {
        header
            .iter()
            .position(|h| h.to_lowercase().contains(word))
            .unwrap_or_else(|| panic!("no '{word}' column in {header:?}"))
    };
    let (cs, cm, cl) = (col("section"), col("mass"), col("length"));
    for h in [&header[cm], &header[cl]] {
        assert!(
            h.contains('[') && h.ends_with(']'),
            "header without a unit: {h}"
        );
    }
    let bill = json["bill"].as_array().expect("bill in the JSON");
    assert!(!bill.is_empty());
    let mut matched = 0;
    for b in bill {
        let sec = b["section"].as_str().unwrap();
        let row = rows[hrow + 1..]
            .iter()
            .find(|row| row.get(cs).map(|c| c.to_string()) == Some(sec.to_string()))
            .unwrap_or_else(|| panic!("{sec} not in the bill sheet"));
        let num = |c: usize| match &row[c] {
            Data::Float(f) => *f,
            Data::Int(i) => *i as f64,
            other => panic!("{sec}: {} is not a number: {other:?}", header[c]),
        };
        let jm = b["total_mass"].as_f64().unwrap();
        let jl = b["total_length"].as_f64().unwrap();
        // The JSON is in SI base units of the library (kg, mm); the sheet in
        // the units its header names.
        let fm = if header[cm].contains("[t]") {
            1000.0
        } else {
            1.0
        };
        let fl = if header[cl].contains("[m]") {
            1000.0
        } else {
            1.0
        };
        assert!(
            close(num(cm) * fm, jm),
            "{sec}: mass {} vs JSON {jm}",
            num(cm)
        );
        assert!(
            close(num(cl) * fl, jl),
            "{sec}: length {} vs JSON {jl}",
            num(cl)
        );
        matched += 1;
    }
    assert_eq!(matched, bill.len());
}
