//! The I/O floor for the benchmark: read every cell of a workbook with calamine (values and
//! formulas) and write it back with rust_xlsxwriter, nothing else.
//!
//! `cargo run --release --example io_floor -- IN.xlsx OUT.xlsx`
//!
//! `lossledger audit` does at least this much work (it keeps every input cell in the annotated
//! copy), so the ratio of its time to this program's time says what the audit itself costs. Run
//! on the audit's own output workbook it gives the output floor: the least it can cost to write
//! that many cells. Sheets are written in constant-memory mode, as the audit writes its large
//! sheets, so the floor's memory is one sheet's cells plus the writer's buffers.
//!
//! It prints the cell count on stdout and, on stderr, the seconds spent reading (calamine) and
//! writing (queueing cells and saving), timed apart.

use calamine::{Data, Range, Reader, Xlsx, open_workbook};
use rust_xlsxwriter::{Formula, Workbook, Worksheet, XlsxError};
use std::process::ExitCode;
use std::time::{Duration, Instant};

/// Cells copied and the time spent in each phase.
#[derive(Default)]
struct Tally {
    cells: usize,
    read: Duration,
    write: Duration,
}

fn write_value(ws: &mut Worksheet, row: u32, col: u16, d: &Data) -> Result<(), XlsxError> {
    match d {
        Data::Int(i) => ws.write_number(row, col, *i as f64).map(|_| ()),
        Data::Float(x) => ws.write_number(row, col, *x).map(|_| ()),
        Data::String(s) | Data::DateTimeIso(s) | Data::DurationIso(s) => {
            ws.write_string(row, col, s).map(|_| ())
        }
        Data::Bool(b) => ws.write_boolean(row, col, *b).map(|_| ()),
        Data::DateTime(dt) => ws.write_number(row, col, dt.as_f64()).map(|_| ()),
        Data::Error(e) => ws.write_string(row, col, e.to_string()).map(|_| ()),
        Data::Empty => Ok(()),
    }
}

/// Write one sheet's values and formulas in row order (constant-memory sheets need it): each
/// row's values, then that row's formulas over them.
fn write_sheet(
    ws: &mut Worksheet,
    values: &Range<Data>,
    formulas: &Range<String>,
) -> Result<usize, XlsxError> {
    let (r0, c0) = values.start().unwrap_or((0, 0));
    let (f0, g0) = formulas.start().unwrap_or((0, 0));
    let mut fs = formulas
        .used_cells()
        .filter(|(_, _, f)| !f.is_empty())
        .map(|(r, c, f)| (f0 + r as u32, (g0 + c as u32) as u16, f))
        .peekable();
    let mut cells = 0;
    let mut flush_formulas = |ws: &mut Worksheet, upto: Option<u32>| -> Result<(), XlsxError> {
        while let Some(&(r, c, f)) = fs.peek() {
            if upto.is_some_and(|u| r >= u) {
                break;
            }
            ws.write_formula(r, c, Formula::new(f))?;
            fs.next();
        }
        Ok(())
    };
    let mut current = None;
    for (r, c, d) in values.used_cells() {
        let row = r0 + r as u32;
        if current != Some(row) {
            flush_formulas(ws, Some(row))?;
            current = Some(row);
        }
        write_value(ws, row, (c0 + c as u32) as u16, d)?;
        cells += 1;
    }
    flush_formulas(ws, None)?;
    Ok(cells)
}

fn copy(input: &str, output: &str) -> Result<Tally, String> {
    let mut src: Xlsx<_> = open_workbook(input).map_err(|e| format!("{input}: {e}"))?;
    let mut wb = Workbook::new();
    let mut tally = Tally::default();
    for name in src.sheet_names() {
        let reading = Instant::now();
        let values = src
            .worksheet_range(&name)
            .map_err(|e| format!("{input}: {name}: {e}"))?;
        let formulas = src.worksheet_formula(&name).unwrap_or_default();
        tally.read += reading.elapsed();
        let writing = Instant::now();
        let ws = wb
            .add_worksheet_with_constant_memory()
            .map_err(|e| e.to_string())?;
        ws.set_name(&name).map_err(|e| e.to_string())?;
        tally.cells += write_sheet(ws, &values, &formulas).map_err(|e| e.to_string())?;
        tally.write += writing.elapsed();
    }
    let saving = Instant::now();
    wb.save(output).map_err(|e| format!("{output}: {e}"))?;
    tally.write += saving.elapsed();
    Ok(tally)
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().collect();
    let (Some(input), Some(output)) = (args.get(1), args.get(2)) else {
        eprintln!("usage: io_floor IN.xlsx OUT.xlsx");
        return ExitCode::from(2);
    };
    match copy(input, output) {
        Ok(t) => {
            println!("copied {} cells", t.cells);
            eprintln!(
                "read: {:.3} s, write: {:.3} s",
                t.read.as_secs_f64(),
                t.write.as_secs_f64()
            );
            ExitCode::SUCCESS
        }
        Err(e) => {
            eprintln!("error: {e}");
            ExitCode::from(2)
        }
    }
}
