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

/// Run `base` once writing the workbook `file` (exit 0 or 1) and once
/// with --json; the JSON.
fn workbook_and_json(d: &Path, base: &[&str], file: &str) -> serde_json::Value {
    let mut a = base.to_vec();
    a.extend(["-o", file]);
    let (c, _, e) = run(d, &a);
    assert!(c == 0 || c == 1, "exit {c}: {e}");
    let mut j = base.to_vec();
    j.push("--json");
    let (_, js, e) = run(d, &j);
    serde_json::from_str(&js).unwrap_or_else(|x| panic!("{x}: {e}"))
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
    let json = workbook_and_json(&d, &base, "b.xlsx");

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

/// A comma-separated file rewritten as a spreadsheet in a decimal-comma
/// locale saves it: ';' between fields (fields holding one quoted by the
/// CSV writer) and a decimal comma in every number, including those in
/// ';'-lists and before a unit ("6,0;1,2", "2,0 m"). Comment lines stay.
fn decimal_comma_rewrite(text: &str) -> String {
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
                let b = f.as_bytes();
                f.char_indices()
                    .map(|(i, ch)| {
                        let digit = |j: usize| b.get(j).is_some_and(u8::is_ascii_digit);
                        if ch == '.' && i > 0 && digit(i - 1) && digit(i + 1) {
                            ','
                        } else {
                            ch
                        }
                    })
                    .collect()
            })
            .collect();
        w.write_record(&fields).unwrap();
        out.push_str(&String::from_utf8(w.into_inner().unwrap()).unwrap());
    }
    out
}

/// The demo catalogue rewritten with ';' between fields and decimal commas
/// reads to the same selection as the original.
#[test]
fn decimal_comma_catalogue_gives_the_same_selection() {
    let d = tmp("deccomma");
    let steel = cat("demo-steel.csv");
    let out = decimal_comma_rewrite(&std::fs::read_to_string(&steel).unwrap());
    assert!(
        out.contains("8,0;5,1"),
        "the rewrite made no decimal commas:\n{out}"
    );
    let dc = d.join("steel-dc.csv");
    std::fs::write(&dc, &out).unwrap();
    let dc = dc.to_string_lossy().into_owned();
    let job = cat("demo-job.toml");
    same_json(
        &d,
        &["select", "--job", &job, "-c", &steel],
        &["select", "--job", &job, "-c", &dc],
        &[(&steel, &dc)],
    );
}

/// `plain` and `comma` (the same run on the rewritten files, given
/// `--delimiter ';' --decimal-comma`) end alike and print the same JSON
/// once each pair of file names (plain, rewritten) is set aside.
fn same_json(d: &Path, plain: &[&str], comma: &[&str], names: &[(&str, &str)]) {
    let mut a = plain.to_vec();
    a.push("--json");
    let mut b = comma.to_vec();
    b.extend(["--delimiter", ";", "--decimal-comma", "--json"]);
    let (c1, mut j1, e1) = run(d, &a);
    let (c2, mut j2, e2) = run(d, &b);
    assert_eq!(c1, c2, "{e1}\n{e2}");
    assert!(j1.len() > 100, "{e1}");
    for (k, (p, c)) in names.iter().enumerate() {
        j1 = j1.replace(p, &format!("FILE{k}"));
        j2 = j2.replace(c, &format!("FILE{k}"));
    }
    assert_eq!(j1, j2);
}

/// A sheet of a workbook written by beamsift: its header (the frozen first
/// row) and the rows under it, up to the first empty row (the caution
/// follows the table).
fn sheet(path: &Path, name: &str) -> (Vec<String>, Vec<Vec<Data>>) {
    let mut wb: Xlsx<_> = open_workbook(path).unwrap();
    let r = wb
        .worksheet_range(name)
        .unwrap_or_else(|e| panic!("no sheet '{name}' in {path:?}: {e}"));
    let mut rows = r.rows();
    let header: Vec<String> = rows.next().unwrap().iter().map(|c| c.to_string()).collect();
    let body = rows
        .take_while(|row| row.iter().any(|c| !matches!(c, Data::Empty)))
        .map(|x| x.to_vec())
        .collect();
    (header, body)
}

/// The column whose header is exactly `h`.
fn col(header: &[String], h: &str) -> usize {
    header
        .iter()
        .position(|x| x == h)
        .unwrap_or_else(|| panic!("no column '{h}' in {header:?}"))
}

/// A cell that must hold a number (not text).
fn number(row: &[Data], c: usize, what: &str) -> f64 {
    match &row[c] {
        Data::Float(f) => *f,
        Data::Int(i) => *i as f64,
        other => panic!("{what}: not a number: {other:?}"),
    }
}

#[test]
fn shortlist_workbook_holds_numbers_equal_to_the_json() {
    let d = tmp("shortlist");
    let (job, steel) = (cat("demo-job.toml"), cat("demo-steel.csv"));
    let base = ["shortlist", "--job", &job, "-c", &steel];
    let json = workbook_and_json(&d, &base, "s.xlsx");
    for (name, list) in [("Cheapest", "by_cost"), ("Lightest", "by_mass")] {
        let (header, rows) = sheet(&d.join("s.xlsx"), name);
        let want = json[list].as_array().unwrap();
        assert_eq!(rows.len(), want.len(), "{name}: {header:?}");
        let (cs, cm, cu, cc) = (
            col(&header, "Section"),
            col(&header, "Mass [kg/m]"),
            col(&header, "Utilisation"),
            col(&header, "Unit cost [EUR/m]"),
        );
        for (row, w) in rows.iter().zip(want) {
            assert_eq!(row[cs].to_string(), w["name"].as_str().unwrap());
            assert!(close(number(row, cm, "mass"), w["mass"].as_f64().unwrap()));
            assert!(close(
                number(row, cu, "utilisation"),
                w["utilisation"].as_f64().unwrap()
            ));
            // JSON: currency per mm; the sheet: per metre.
            assert!(close(
                number(row, cc, "unit cost"),
                w["cost"].as_f64().unwrap() * 1000.0
            ));
        }
    }
}

#[test]
fn sweep_workbook_holds_numbers_equal_to_the_json() {
    let d = tmp("sweep");
    let (job, timber) = (cat("demo-joists.toml"), cat("demo-timber.csv"));
    let base = [
        "sweep",
        "lightest",
        "--job",
        &job,
        "-c",
        &timber,
        "--spans",
        "3m..5m:0.5m",
    ];
    let json = workbook_and_json(&d, &base, "w.xlsx");
    let want = json["rows"].as_array().unwrap();
    let (header, rows) = sheet(&d.join("w.xlsx"), "Lightest");
    assert_eq!(rows.len(), want.len(), "{header:?}");
    assert_eq!(rows.len(), 5);
    let (cspan, cs, cm, cu) = (
        col(&header, "Span [m]"),
        col(&header, "Lightest passing"),
        col(&header, "Mass [kg/m]"),
        col(&header, "Utilisation"),
    );
    for (row, w) in rows.iter().zip(want) {
        // JSON spans in mm; the sheet in metres, as its header says.
        assert!(close(
            number(row, cspan, "span") * 1000.0,
            w["span"].as_f64().unwrap()
        ));
        match w["section"].as_str() {
            Some(s) => {
                assert_eq!(row[cs].to_string(), s);
                assert!(close(number(row, cm, "mass"), w["mass"].as_f64().unwrap()));
                assert!(close(
                    number(row, cu, "utilisation"),
                    w["utilisation"].as_f64().unwrap()
                ));
            }
            None => assert!(!matches!(row[cm], Data::Float(_))),
        }
    }
}

#[test]
fn bom_and_decimal_comma_outputs_hold_the_same_numbers() {
    let d = tmp("bom");
    let (job, steel) = (cat("demo-job.toml"), cat("demo-steel.csv"));
    let base = ["select", "--job", &job, "-c", &steel];
    let with = |extra: &[&str]| {
        let mut a = base.to_vec();
        a.extend(extra);
        let (c, out, e) = run(&d, &a);
        assert_eq!(c, 0, "{e}");
        out
    };
    with(&["--format", "csv-numeric", "--bom", "-o", "bom.csv"]);
    with(&["--format", "csv-numeric", "-o", "plain.csv"]);
    let bom = std::fs::read(d.join("bom.csv")).unwrap();
    let plain = std::fs::read(d.join("plain.csv")).unwrap();
    // The UTF-8 byte-order mark, EF BB BF (Unicode §23.8), and nothing
    // else added.
    assert_eq!(&bom[..3], &[0xEF, 0xBB, 0xBF]);
    assert_ne!(&plain[..3], &[0xEF, 0xBB, 0xBF]);
    assert_eq!(&bom[3..], &plain[..]);
    // Decimal commas with ';' between fields: the same numbers as the
    // JSON's passing list.
    let dc = with(&["--format", "csv-numeric", "--out-decimal-comma"]);
    let json: serde_json::Value = serde_json::from_str(&with(&["--json"])).unwrap();
    let body: String = dc
        .lines()
        .filter(|l| !l.starts_with('#'))
        .map(|l| format!("{l}\n"))
        .collect();
    let mut rdr = csv::ReaderBuilder::new()
        .delimiter(b';')
        .from_reader(body.as_bytes());
    let header: Vec<String> = rdr.headers().unwrap().iter().map(str::to_string).collect();
    let (cs, cm, cu) = (
        col(&header, "Section"),
        col(&header, "Mass [kg/m]"),
        col(&header, "Utilisation"),
    );
    let want = json["passing"].as_array().unwrap();
    let mut n = 0;
    for (rec, w) in rdr.records().zip(want) {
        let rec = rec.unwrap();
        assert_eq!(&rec[cs], w["name"].as_str().unwrap());
        for (c, key) in [(cm, "mass"), (cu, "utilisation")] {
            assert!(!rec[c].contains('.'), "{}", &rec[c]);
            let v: f64 = rec[c].replace(',', ".").parse().unwrap();
            assert!(
                close(v, w[key].as_f64().unwrap()) || (v - w[key].as_f64().unwrap()).abs() < 1e-11,
                "{key}: {v} vs {}",
                w[key]
            );
        }
        n += 1;
    }
    assert!(n >= 5, "{dc}");
}

/// The demo schedule and catalogue rewritten with ';' between fields and
/// decimal commas (the schedule's ';'-lists quoted by the CSV writer) size
/// exactly as the originals.
#[test]
fn decimal_comma_schedule_sizes_as_the_original() {
    let d = tmp("dcsched");
    let (sched, steel) = (cat("demo-schedule.csv"), cat("demo-steel.csv"));
    let out = decimal_comma_rewrite(&std::fs::read_to_string(&sched).unwrap());
    assert!(
        out.contains("\"6,0;1,2\"") && out.contains("2,0 m"),
        "the rewrite made no decimal commas:\n{out}"
    );
    let dc = d.join("schedule-dc.csv");
    std::fs::write(&dc, &out).unwrap();
    let dc = dc.to_string_lossy().into_owned();
    let steel_dc = d.join("steel-dc.csv");
    std::fs::write(
        &steel_dc,
        decimal_comma_rewrite(&std::fs::read_to_string(&steel).unwrap()),
    )
    .unwrap();
    let steel_dc = steel_dc.to_string_lossy().into_owned();
    let job = cat("demo-template.toml");
    same_json(
        &d,
        &["batch", "--schedule", &sched, "--job", &job, "-c", &steel],
        &["batch", "--schedule", &dc, "--job", &job, "-c", &steel_dc],
        &[(&sched, &dc), (&steel, &steel_dc)],
    );
}
