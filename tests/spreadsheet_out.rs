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

#[test]
fn select_csv_numeric_has_numbers_and_units() {
    let d = tmp("csvnum");
    let (job, steel) = (cat("demo-job.toml"), cat("demo-steel.csv"));
    let (c, out, e) = run(
        &d,
        &[
            "select",
            "--job",
            &job,
            "-c",
            &steel,
            "--format",
            "csv-numeric",
        ],
    );
    assert!(c == 0 || c == 1, "exit {c}: {e}");
    // The '#' lines carry the title, the other tables and the caution.
    assert!(
        out.lines()
            .any(|l| l.starts_with('#') && l.contains("competent person")),
        "no caution:\n{out}"
    );
    let body: String = out
        .lines()
        .filter(|l| !l.starts_with('#'))
        .map(|l| format!("{l}\n"))
        .collect();
    let mut rdr = csv::ReaderBuilder::new().from_reader(body.as_bytes());
    let header: Vec<String> = rdr.headers().unwrap().iter().map(str::to_string).collect();
    // Columns of quantities: those with a unit in brackets, plus the
    // dimensionless rank and utilisation.
    let numeric: Vec<usize> = header
        .iter()
        .enumerate()
        .filter(|(_, h)| {
            (h.contains('[') && h.ends_with(']')) || *h == "Rank" || *h == "Utilisation"
        })
        .map(|(i, _)| i)
        .collect();
    for unit_col in ["Mass [kg/m]", "Depth [mm]"] {
        assert!(
            header.iter().any(|h| h == unit_col),
            "no '{unit_col}' in {header:?}"
        );
    }
    assert!(header.iter().any(|h| h == "Utilisation"), "{header:?}");
    let mut rows = 0;
    for rec in rdr.records() {
        let rec = rec.unwrap();
        let passes = rec.iter().any(|f| f == "PASSES");
        for &i in &numeric {
            let f = &rec[i];
            // A passing row has every quantity; other rows may leave
            // quantities that were not computed empty (never text).
            if f.is_empty() && !passes {
                continue;
            }
            assert!(
                f.parse::<f64>().is_ok(),
                "row {rows}: {} = '{f}' is not a number",
                header[i]
            );
        }
        rows += 1;
    }
    assert!(rows > 0, "no rows:\n{out}");
}

/// The demo catalogue rewritten with ';' between fields and decimal commas
/// reads to the same selection as the original.
#[test]
fn decimal_comma_catalogue_gives_the_same_selection() {
    let d = tmp("deccomma");
    let steel = cat("demo-steel.csv");
    let text = std::fs::read_to_string(&steel).unwrap();
    let mut out = String::new();
    for line in text.lines() {
        if line.starts_with('#') || line.trim().is_empty() {
            out.push_str(line);
            out.push('\n');
            continue;
        }
        let mut r = csv::ReaderBuilder::new()
            .has_headers(false)
            .from_reader(line.as_bytes());
        let rec = r.records().next().unwrap().unwrap();
        let mut w = csv::WriterBuilder::new()
            .delimiter(b';')
            .from_writer(vec![]);
        let fields: Vec<String> = rec
            .iter()
            .map(|f| {
                if f.parse::<f64>().is_ok() {
                    f.replace('.', ",")
                } else {
                    f.to_string()
                }
            })
            .collect();
        w.write_record(&fields).unwrap();
        out.push_str(&String::from_utf8(w.into_inner().unwrap()).unwrap());
    }
    assert!(
        out.contains("8,0;5,1"),
        "the rewrite made no decimal commas:\n{out}"
    );
    let dc = d.join("steel-dc.csv");
    std::fs::write(&dc, &out).unwrap();
    let dc = dc.to_string_lossy().into_owned();
    let job = cat("demo-job.toml");
    let (c1, j1, e1) = run(&d, &["select", "--job", &job, "-c", &steel, "--json"]);
    let (c2, j2, e2) = run(
        &d,
        &[
            "select",
            "--job",
            &job,
            "-c",
            &dc,
            "--delimiter",
            ";",
            "--decimal-comma",
            "--json",
        ],
    );
    assert_eq!(c1, c2, "{e1}\n{e2}");
    assert!(j1.len() > 100, "{e1}");
    let a = j1.replace(&steel, "CATALOGUE");
    let b = j2.replace(&dc, "CATALOGUE");
    assert_eq!(a, b);
}
