//! The I/O floor for the benchmark: read every cell of a workbook with calamine (values and
//! formulas) and write it back with rust_xlsxwriter, nothing else.
//!
//! `cargo run --release --example io_floor -- IN.xlsx OUT.xlsx`
//!
//! `lossledger audit` does at least this much work (it keeps every input cell in the annotated
//! copy), so the ratio of its time to this program's time says what the audit itself costs.

use calamine::{Data, Reader, Xlsx, open_workbook};
use rust_xlsxwriter::{Formula, Workbook};
use std::process::ExitCode;

fn copy(input: &str, output: &str) -> Result<usize, String> {
    let start = std::time::Instant::now();
    let mut src: Xlsx<_> = open_workbook(input).map_err(|e| format!("{input}: {e}"))?;
    let mut wb = Workbook::new();
    let mut cells = 0;
    for name in src.sheet_names() {
        let values = src
            .worksheet_range(&name)
            .map_err(|e| format!("{input}: {name}: {e}"))?;
        let formulas = src.worksheet_formula(&name).unwrap_or_default();
        let ws = wb.add_worksheet();
        ws.set_name(&name).map_err(|e| e.to_string())?;
        let (r0, c0) = values.start().unwrap_or((0, 0));
        for (r, c, d) in values.used_cells() {
            let (row, col) = (r0 + r as u32, (c0 + c as u32) as u16);
            let res = match d {
                Data::Int(i) => ws.write_number(row, col, *i as f64).map(|_| ()),
                Data::Float(x) => ws.write_number(row, col, *x).map(|_| ()),
                Data::String(s) => ws.write_string(row, col, s).map(|_| ()),
                Data::Bool(b) => ws.write_boolean(row, col, *b).map(|_| ()),
                Data::DateTime(dt) => ws.write_number(row, col, dt.as_f64()).map(|_| ()),
                Data::DateTimeIso(s) | Data::DurationIso(s) => {
                    ws.write_string(row, col, s).map(|_| ())
                }
                Data::Error(e) => ws.write_string(row, col, e.to_string()).map(|_| ()),
                Data::Empty => Ok(()),
            };
            res.map_err(|e| e.to_string())?;
            cells += 1;
        }
        if let Some((f0, g0)) = formulas.start() {
            for (r, c, f) in formulas.used_cells() {
                if !f.is_empty() {
                    ws.write_formula(f0 + r as u32, (g0 + c as u32) as u16, Formula::new(f))
                        .map_err(|e| e.to_string())?;
                }
            }
        }
    }
    if std::env::var_os("LOSSLEDGER_TIMINGS").is_some() {
        eprintln!(
            "timing: read and queue cells: {:.3} s",
            start.elapsed().as_secs_f64()
        );
    }
    let saving = std::time::Instant::now();
    wb.save(output).map_err(|e| format!("{output}: {e}"))?;
    if std::env::var_os("LOSSLEDGER_TIMINGS").is_some() {
        eprintln!("timing: save: {:.3} s", saving.elapsed().as_secs_f64());
    }
    Ok(cells)
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().collect();
    let (Some(input), Some(output)) = (args.get(1), args.get(2)) else {
        eprintln!("usage: io_floor IN.xlsx OUT.xlsx");
        return ExitCode::from(2);
    };
    match copy(input, output) {
        Ok(cells) => {
            println!("copied {cells} cells");
            ExitCode::SUCCESS
        }
        Err(e) => {
            eprintln!("error: {e}");
            ExitCode::from(2)
        }
    }
}
