//! Workbooks (.xlsx, written with `rust_xlsxwriter`): one sheet per data
//! table, the header row (units in brackets) frozen, numbers as numbers;
//! under each table its title and the caution; a last sheet with the
//! title, what each sheet holds, the exclusions, assumptions, notes, what
//! was not checked and the caution. Text is written as text, never as a
//! formula, so names from user files cannot run in a spreadsheet.

use super::data::{DataSet, Value};
use rust_xlsxwriter::{Format, Workbook, XlsxError};

/// The name of the sheet of scope and caution.
pub const CAUTION_SHEET: &str = "Caution and scope";

/// The sheet name of a table key: `rationalised-bill` → `Rationalised bill`.
pub fn sheet_name(key: &str) -> String {
    let s = key.replace('-', " ");
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_uppercase().chain(c).collect(),
        None => String::new(),
    }
}

/// The workbook's bytes.
pub fn render(set: &DataSet) -> Result<Vec<u8>, XlsxError> {
    let mut wb = Workbook::new();
    let bold = Format::new().set_bold();
    let wrap = Format::new().set_text_wrap();
    let warn = Format::new().set_bold().set_text_wrap();
    for t in &set.tables {
        let ws = wb.add_worksheet();
        ws.set_name(sheet_name(t.key))?;
        let mut widths: Vec<usize> = t.headers.iter().map(|h| h.chars().count()).collect();
        for (c, h) in t.headers.iter().enumerate() {
            ws.write_string_with_format(0, c as u16, h, &bold)?;
        }
        for (r, row) in t.rows.iter().enumerate() {
            let r = r as u32 + 1;
            for (c, v) in row.iter().enumerate() {
                let col = c as u16;
                match v {
                    Value::Num(x) => {
                        ws.write_number(r, col, *x)?;
                        widths[c] = widths[c].max(12);
                    }
                    Value::Text(s) => {
                        ws.write_string(r, col, s)?;
                        widths[c] = widths[c].max(s.chars().count().min(60));
                    }
                    Value::Empty => {}
                }
            }
        }
        for (c, w) in widths.iter().enumerate() {
            ws.set_column_width(c as u16, (*w as f64 + 2.0).min(62.0))?;
        }
        ws.set_freeze_panes(1, 0)?;
        let below = t.rows.len() as u32 + 2;
        ws.write_string_with_format(below, 0, &t.title, &bold)?;
        ws.write_string_with_format(below + 1, 0, set.caution, &warn)?;
        ws.write_string(
            below + 2,
            0,
            format!("What was excluded, assumed and not checked: sheet '{CAUTION_SHEET}'."),
        )?;
    }
    let ws = wb.add_worksheet();
    ws.set_name(CAUTION_SHEET)?;
    ws.set_column_width(0, 120.0)?;
    let mut r = 0u32;
    ws.write_string_with_format(r, 0, &set.title, &bold)?;
    r += 2;
    for t in &set.tables {
        ws.write_string(r, 0, format!("Sheet '{}': {}", sheet_name(t.key), t.title))?;
        r += 1;
    }
    r += 1;
    for (lead, items) in &set.lists {
        ws.write_string_with_format(r, 0, lead, &bold)?;
        r += 1;
        for i in items {
            ws.write_string_with_format(r, 0, format!("  - {i}"), &wrap)?;
            r += 1;
        }
        r += 1;
    }
    ws.write_string_with_format(r, 0, set.caution, &warn)?;
    wb.save_to_buffer()
}
