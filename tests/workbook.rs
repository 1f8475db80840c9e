//! Catalogues and schedules read from workbooks (.xlsx written here by
//! rust_xlsxwriter 0.102, .ods built here as a zip with its content.xml):
//! the same rows as the CSV files give the same results, and every problem
//! names its cell (Sheet1!C7).
//!
//! The reference for a workbook's result is the CSV reader on the same
//! rows (its results are checked against handbook values in
//! tests/select.rs and tests/steel.rs); one property is also checked here
//! against a published table value, from memory.

mod common;
use common::{repo, run, text};
use rust_xlsxwriter::{ExcelDateTime, Format, Workbook};
use std::io::Write;
use std::path::Path;

/// A cell as a CSV field of our demo files gives it: a number where the
/// whole field reads as one, text otherwise (None: empty).
enum Cell {
    Num(f64),
    Text(String),
}

fn cells(line: &str) -> Vec<Option<Cell>> {
    if line.starts_with('#') {
        return vec![Some(Cell::Text(line.to_string()))];
    }
    line.split(',')
        .map(|f| {
            if f.is_empty() {
                None
            } else if let Ok(v) = f.trim().parse::<f64>() {
                Some(Cell::Num(v))
            } else {
                Some(Cell::Text(f.to_string()))
            }
        })
        .collect()
}

/// The rows of a CSV file (no quoted fields) as cells, row by row.
fn rows_of(csv: &str) -> Vec<Vec<Option<Cell>>> {
    csv.lines().map(cells).collect()
}

/// Write sheets (name, rows) as an .xlsx file; rows start at A1.
fn xlsx(path: &Path, sheets: &[(&str, Vec<Vec<Option<Cell>>>)]) {
    let mut wb = Workbook::new();
    for (name, rows) in sheets {
        let ws = wb.add_worksheet();
        ws.set_name(*name).unwrap();
        for (r, row) in rows.iter().enumerate() {
            for (c, cell) in row.iter().enumerate() {
                match cell {
                    Some(Cell::Num(v)) => {
                        ws.write_number(r as u32, c as u16, *v).unwrap();
                    }
                    Some(Cell::Text(s)) => {
                        ws.write_string(r as u32, c as u16, s).unwrap();
                    }
                    None => {}
                }
            }
        }
    }
    wb.save(path).unwrap();
}

/// Write one sheet as an .ods file: the mimetype entry, then content.xml
/// with one table (OpenDocument 1.2, part 1, §9.1 tables, §19.385
/// office:value-type).
fn ods(path: &Path, sheet: &str, rows: &[Vec<Option<Cell>>]) {
    let esc = |s: &str| {
        s.replace('&', "&amp;")
            .replace('<', "&lt;")
            .replace('>', "&gt;")
            .replace('"', "&quot;")
    };
    let mut xml = String::from(
        r#"<?xml version="1.0" encoding="UTF-8"?>
<office:document-content xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0" office:version="1.2"><office:body><office:spreadsheet>"#,
    );
    xml.push_str(&format!(r#"<table:table table:name="{}">"#, esc(sheet)));
    for row in rows {
        xml.push_str("<table:table-row>");
        for cell in row {
            match cell {
                Some(Cell::Num(v)) => xml.push_str(&format!(
                    r#"<table:table-cell office:value-type="float" office:value="{v}"><text:p>{v}</text:p></table:table-cell>"#
                )),
                Some(Cell::Text(s)) => xml.push_str(&format!(
                    r#"<table:table-cell office:value-type="string"><text:p>{}</text:p></table:table-cell>"#,
                    esc(s)
                )),
                None => xml.push_str("<table:table-cell/>"),
            }
        }
        xml.push_str("</table:table-row>");
    }
    xml.push_str("</table:table></office:spreadsheet></office:body></office:document-content>");
    let f = std::fs::File::create(path).unwrap();
    let mut z = zip::ZipWriter::new(f);
    let stored =
        zip::write::SimpleFileOptions::default().compression_method(zip::CompressionMethod::Stored);
    z.start_file("mimetype", stored).unwrap();
    z.write_all(b"application/vnd.oasis.opendocument.spreadsheet")
        .unwrap();
    z.start_file(
        "META-INF/manifest.xml",
        zip::write::SimpleFileOptions::default(),
    )
    .unwrap();
    z.write_all(
        br#"<?xml version="1.0" encoding="UTF-8"?>
<manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0" manifest:version="1.2"><manifest:file-entry manifest:full-path="/" manifest:media-type="application/vnd.oasis.opendocument.spreadsheet"/><manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/></manifest:manifest>"#,
    )
    .unwrap();
    z.start_file("content.xml", zip::write::SimpleFileOptions::default())
        .unwrap();
    z.write_all(xml.as_bytes()).unwrap();
    z.finish().unwrap();
}

fn scratch() -> tempfile::TempDir {
    tempfile::tempdir().unwrap()
}

fn path_str(p: &Path) -> String {
    p.display().to_string()
}

/// Run and return (exit code, stdout, stderr).
fn go(args: &[&str]) -> (i32, String, String) {
    let o = run(args);
    let (out, err) = text(&o);
    (o.status.code().unwrap_or(-1), out, err)
}

/// A select run's JSON with the catalogue's name replaced (the only thing
/// that may differ between the CSV and the workbook).
fn select_json(job: &str, catalog: &str) -> String {
    let (code, out, err) = go(&[
        "select",
        "--job",
        job,
        "--catalog",
        catalog,
        "--top",
        "6",
        "--format",
        "json",
        "-q",
    ]);
    assert_eq!(code, 0, "{err}");
    // The file as shown: the path without its #SHEET.
    let file = catalog.rsplit_once('#').map_or(catalog, |(f, _)| f);
    out.replace(file, "CATALOGUE")
}

fn demo_steel() -> String {
    std::fs::read_to_string(repo("catalogs/demo-steel.csv")).unwrap()
}

#[test]
fn xlsx_catalogue_selects_exactly_as_its_csv() {
    let dir = scratch();
    let book = dir.path().join("stock.xlsx");
    xlsx(&book, &[("Stock", rows_of(&demo_steel()))]);
    let job = path_str(&repo("catalogs/demo-job.toml"));
    let csv = select_json(&job, &path_str(&repo("catalogs/demo-steel.csv")));
    let wb = select_json(&job, &path_str(&book));
    // Not an empty agreement: the demo job picks passing sections.
    assert!(csv.contains("\"passes\": true"), "{csv}");
    assert_eq!(csv, wb);
}

#[test]
fn ods_catalogue_selects_exactly_as_its_csv() {
    let dir = scratch();
    let book = dir.path().join("stock.ods");
    ods(&book, "Stock", &rows_of(&demo_steel()));
    let job = path_str(&repo("catalogs/demo-job.toml"));
    let csv = select_json(&job, &path_str(&repo("catalogs/demo-steel.csv")));
    let wb = select_json(&job, &path_str(&book));
    assert!(csv.contains("\"passes\": true"), "{csv}");
    assert_eq!(csv, wb);
}

/// The IPE list read from a workbook: the listing is the CSV's, and IPE 200
/// has Ix = 1943 cm⁴ and Wel,y = 194 cm³ as steel tables print them (from
/// memory of the EN 10365 / mill tables; 1 % for the tables' rounding of
/// the fillet geometry).
#[test]
fn ipe_listing_from_a_workbook_matches_the_csv_and_the_tables() {
    let dir = scratch();
    let csv_path = repo("catalogs/ipe-en10365-from-memory.csv");
    let csv = std::fs::read_to_string(&csv_path).unwrap();
    let book = dir.path().join("ipe.xlsx");
    xlsx(&book, &[("IPE", rows_of(&csv))]);
    let show = |p: &str| {
        let (code, out, err) = go(&["catalog", "show", p, "--format", "json"]);
        assert_eq!(code, 0, "{err}");
        out.replace(p, "CATALOGUE")
    };
    let from_csv = show(&path_str(&csv_path));
    let from_book = show(&path_str(&book));
    assert_eq!(from_csv, from_book);
    let v: serde_json::Value = serde_json::from_str(&from_book).unwrap();
    let ipe200 = v["rows"]
        .as_array()
        .unwrap()
        .iter()
        .find(|r| r["name"] == "IPE 200")
        .unwrap();
    // Same sheet row as the CSV line (comments are rows too).
    assert_eq!(ipe200["line"], 8);
    let ix_cm4 = ipe200["properties"]["ix"].as_f64().unwrap() / 1e4;
    let s_cm3 = ipe200["properties"]["s_top"].as_f64().unwrap() / 1e3;
    assert!((ix_cm4 / 1943.0 - 1.0).abs() < 0.01, "Ix {ix_cm4} cm4");
    assert!((s_cm3 / 194.3 - 1.0).abs() < 0.01, "S {s_cm3} cm3");
}

/// Header at row 6 after five comment rows (as demo-steel.csv has five
/// comment lines), a bad value in C7.
fn with_comments(data: Vec<Vec<Option<Cell>>>) -> Vec<Vec<Option<Cell>>> {
    let mut rows: Vec<Vec<Option<Cell>>> = (0..5)
        .map(|k| {
            vec![Some(Cell::Text(format!(
                "# DEMO DATA — INVENTED, line {k}"
            )))]
        })
        .collect();
    rows.push(cells("name,shape,b [mm],d [mm],cost [EUR/mm]"));
    rows.extend(data);
    rows
}

#[test]
fn a_bad_cell_is_named_by_its_reference() {
    let dir = scratch();
    let book = dir.path().join("stock.xlsx");
    let rows = with_comments(vec![
        vec![
            Some(Cell::Text("R1".into())),
            Some(Cell::Text("rect".into())),
            Some(Cell::Text("abc".into())),
            Some(Cell::Num(200.0)),
        ],
        cells("R2,rect,100,300,0.1"),
    ]);
    xlsx(&book, &[("Sheet1", rows)]);
    let (code, out, err) = go(&["catalog", "validate", &path_str(&book)]);
    let all = format!("{out}{err}");
    assert_eq!(code, 2, "{all}");
    // The same message the CSV reader gives at line 7, column 3.
    assert!(
        all.contains("stock.xlsx: Sheet1!C7") && all.contains("'abc' is not a finite"),
        "{all}"
    );
    assert!(!all.contains("stock.xlsx:7:3"), "{all}");
}

/// A one-sheet workbook ("Sheet1") filled by `fill`, saved in a scratch
/// folder as stock.xlsx.
fn book(fill: impl FnOnce(&mut rust_xlsxwriter::Worksheet)) -> (tempfile::TempDir, String) {
    let dir = scratch();
    let path = dir.path().join("stock.xlsx");
    let mut wb = Workbook::new();
    fill(wb.add_worksheet());
    wb.save(&path).unwrap();
    (dir, path_str(&path))
}

#[test]
fn true_false_and_date_cells_are_refused_at_their_cell() {
    let (_dir, path) = book(|ws| {
        for (c, h) in ["name", "shape", "b [mm]", "d [mm]", "stock"]
            .iter()
            .enumerate()
        {
            ws.write_string(0, c as u16, *h).unwrap();
        }
        ws.write_string(1, 0, "R1").unwrap();
        ws.write_string(1, 1, "rect").unwrap();
        ws.write_number(1, 2, 100.0).unwrap();
        ws.write_number(1, 3, 200.0).unwrap();
        ws.write_boolean(1, 4, true).unwrap();
        ws.write_string(2, 0, "R2").unwrap();
        ws.write_string(2, 1, "rect").unwrap();
        let date = ExcelDateTime::from_ymd(2024, 5, 1).unwrap();
        ws.write_datetime_with_format(2, 2, &date, &Format::new().set_num_format("yyyy-mm-dd"))
            .unwrap();
        ws.write_number(2, 3, 200.0).unwrap();
    });
    let all = refused(&path);
    assert!(all.contains("Sheet1!E2") && all.contains("TRUE"), "{all}");
    assert!(all.contains("Sheet1!C3") && all.contains("date"), "{all}");
}

/// `catalog validate` on a workbook that must be refused (exit 2): all it
/// printed.
fn refused(path: &str) -> String {
    let (code, out, err) = go(&["catalog", "validate", path]);
    let all = format!("{out}{err}");
    assert_eq!(code, 2, "{all}");
    all
}

#[test]
fn numbers_are_read_exactly_and_blank_rows_ignored() {
    let dir = scratch();
    let book = dir.path().join("stock.xlsx");
    let mut wb = Workbook::new();
    let ws = wb.add_worksheet();
    let rows = with_comments(vec![cells("R2,rect,100,250,0.1")]);
    for (r, row) in rows.iter().enumerate() {
        for (c, cell) in row.iter().enumerate() {
            match cell {
                Some(Cell::Num(v)) => ws.write_number(r as u32, c as u16, *v).map(|_| ()),
                Some(Cell::Text(s)) => ws.write_string(r as u32, c as u16, s).map(|_| ()),
                None => Ok(()),
            }
            .unwrap();
        }
    }
    // Formatted but empty cells below the data: blank trailing rows.
    for r in 10..14 {
        ws.write_blank(r, 0, &Format::new().set_bold()).unwrap();
        ws.write_blank(r, 4, &Format::new().set_bold()).unwrap();
    }
    wb.save(&book).unwrap();
    let (code, out, err) = go(&["catalog", "show", &path_str(&book), "--format", "json"]);
    assert_eq!(code, 0, "{out}{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let rows = v["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 1, "{out}");
    // cost [EUR/mm] is currency per mm as given: 0.1 exactly (no float
    // to text surprise); 250 read as the integer 250.
    assert_eq!(rows[0]["cost_per_mm"].as_f64(), Some(0.1));
    assert_eq!(rows[0]["properties"]["depth"].as_f64(), Some(250.0));
    assert_eq!(rows[0]["line"], 7);
}

#[test]
fn sheets_are_chosen_by_name_and_an_unknown_one_is_refused() {
    let dir = scratch();
    let book = dir.path().join("stock.xlsx");
    xlsx(
        &book,
        &[
            (
                "Notes",
                vec![vec![Some(Cell::Text("not a catalogue".into()))]],
            ),
            ("Stock", rows_of(&demo_steel())),
        ],
    );
    let job = path_str(&repo("catalogs/demo-job.toml"));
    let named = format!("{}#Stock", path_str(&book));
    let csv = select_json(&job, &path_str(&repo("catalogs/demo-steel.csv")));
    assert_eq!(select_json(&job, &named), csv);
    // The first sheet by default: here not a catalogue.
    let (code, _, err) = go(&["catalog", "validate", &path_str(&book)]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("stock.xlsx: Notes row 1"), "{err}");
    let (code, _, err) = go(&["catalog", "validate", &format!("{}#Stok", path_str(&book))]);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("no sheet named 'Stok'") && err.contains("'Notes', 'Stock'"),
        "{err}"
    );
    // A sheet of a CSV file, and a delimiter for a workbook, are refused.
    let (code, _, err) = go(&[
        "catalog",
        "validate",
        &format!("{}#Stock", path_str(&repo("catalogs/demo-steel.csv"))),
    ]);
    assert_ne!(code, 0, "{err}");
    let (code, _, err) = go(&["select", "--job", &job, "-c", &named, "--delimiter", ";"]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("--delimiter"), "{err}");
}

#[test]
fn schedule_workbook_sizes_exactly_as_its_csv() {
    let dir = scratch();
    let sched_csv = repo("catalogs/demo-schedule.csv");
    let book = dir.path().join("members.xlsx");
    xlsx(
        &book,
        &[(
            "Members",
            rows_of(&std::fs::read_to_string(&sched_csv).unwrap()),
        )],
    );
    let batch = |s: &str| {
        let (code, out, err) = go(&[
            "batch",
            "--schedule",
            s,
            "--job",
            &path_str(&repo("catalogs/demo-job.toml")),
            "-c",
            &path_str(&repo("catalogs/demo-steel.csv")),
            "--format",
            "json",
            "-q",
        ]);
        assert!(code == 0 || code == 1, "{err}");
        (code, out.replace(s, "SCHEDULE"))
    };
    let (c1, from_csv) = batch(&path_str(&sched_csv));
    let (c2, from_book) = batch(&path_str(&book));
    assert_eq!(c1, c2);
    assert!(from_csv.contains("B1"), "{from_csv}");
    assert_eq!(from_csv, from_book);
}

#[test]
fn a_bad_schedule_cell_is_named_by_its_reference() {
    let dir = scratch();
    let book = dir.path().join("members.xlsx");
    let csv = std::fs::read_to_string(repo("catalogs/demo-schedule.csv")).unwrap();
    let mut rows = rows_of(&csv);
    // The first member's dead load (column E) on sheet row 5.
    let header = rows
        .iter()
        .position(|r| matches!(&r[0], Some(Cell::Text(t)) if t == "mark"))
        .unwrap();
    rows[header + 1][4] = Some(Cell::Text("heavy".into()));
    xlsx(&book, &[("Members", rows)]);
    let (code, out, err) = go(&[
        "batch",
        "--schedule",
        &path_str(&book),
        "--job",
        &path_str(&repo("catalogs/demo-job.toml")),
        "-c",
        &path_str(&repo("catalogs/demo-steel.csv")),
        "-q",
    ]);
    assert_eq!(code, 2, "{out}{err}");
    let cell = format!("members.xlsx: Members!E{}", header + 2);
    assert!(err.contains(&cell), "{err}");
}

#[test]
fn an_empty_header_cell_is_named_by_its_reference() {
    // Header "name, shape, (empty), d [mm]" with a value under the empty
    // header: the reader cannot tell what the value is, so it refuses the
    // header at the empty cell (C1) rather than dropping the column.
    let (_dir, path) = book(|ws| {
        for (c, h) in [(0, "name"), (1, "shape"), (3, "d [mm]"), (4, "b [mm]")] {
            ws.write_string(0, c, h).unwrap();
        }
        ws.write_string(1, 0, "R1").unwrap();
        ws.write_string(1, 1, "rect").unwrap();
        ws.write_number(1, 2, 7.0).unwrap();
        ws.write_number(1, 3, 200.0).unwrap();
        ws.write_number(1, 4, 100.0).unwrap();
    });
    let all = refused(&path);
    assert!(all.contains("stock.xlsx: Sheet1!C1"), "{all}");
}

#[test]
fn a_formula_error_cell_is_refused_at_its_cell() {
    // A formula whose saved result is an error (#DIV/0!) in a number
    // column: refused at the cell, never read as zero or skipped. A
    // formula with a number as its saved result is read as that number.
    let (_dir, path) = book(|ws| {
        for (c, h) in ["name", "shape", "b [mm]", "d [mm]"].iter().enumerate() {
            ws.write_string(0, c as u16, *h).unwrap();
        }
        for (r, name, f, v) in [(1, "R1", "=50*2", "100"), (2, "R2", "=1/0", "#DIV/0!")] {
            ws.write_string(r, 0, name).unwrap();
            ws.write_string(r, 1, "rect").unwrap();
            ws.write_formula(r, 2, rust_xlsxwriter::Formula::new(f).set_result(v))
                .unwrap();
            ws.write_number(r, 3, 200.0).unwrap();
        }
    });
    let all = refused(&path);
    assert!(
        all.contains("Sheet1!C3") && all.contains("#DIV/0!"),
        "{all}"
    );
    assert!(!all.contains("Sheet1!C2"), "{all}");
}
