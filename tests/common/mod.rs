//! Helpers shared by the energy and systems tests: small workbooks built in code and audited
//! through the library.
#![allow(dead_code)]

use lossledger::audit::{Audit, Rules};
use rust_xlsxwriter::Workbook;
use std::path::{Path, PathBuf};

/// One test sheet: name, headers, rows.
pub type Sheet<'a> = (&'a str, &'a [&'a str], Vec<Vec<C>>);

/// A cell of a test sheet.
pub enum C {
    /// Text.
    S(&'static str),
    /// Number.
    N(f64),
    /// Nothing.
    E,
}

/// Write the sheets (headers in row 1) to a fresh temporary workbook `NAME.xlsx`.
pub fn book(name: &str, sheets: &[Sheet<'_>]) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("lossledger-it-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join(format!("{name}.xlsx"));
    let mut wb = Workbook::new();
    for (sheet, headers, rows) in sheets {
        let ws = wb.add_worksheet();
        ws.set_name(*sheet).unwrap();
        for (c, h) in headers.iter().enumerate() {
            ws.write_string(0, c as u16, *h).unwrap();
        }
        for (r, row) in rows.iter().enumerate() {
            for (c, v) in row.iter().enumerate() {
                match v {
                    C::S(s) => {
                        ws.write_string(r as u32 + 1, c as u16, *s).unwrap();
                    }
                    C::N(x) => {
                        ws.write_number(r as u32 + 1, c as u16, *x).unwrap();
                    }
                    C::E => {}
                }
            }
        }
    }
    wb.save(&path).unwrap();
    path
}

/// Read and audit a workbook that must have no input errors.
pub fn audit(path: &Path, rules: &Rules) -> Audit {
    let input = lossledger::ingest::read_path(path).unwrap();
    assert_eq!(input.error_count(), 0, "{:?}", input.diagnostics);
    lossledger::audit::run(&input, rules).unwrap()
}

/// Relative difference of `a` from `b`.
pub fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}
