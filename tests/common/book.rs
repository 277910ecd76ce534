//! Workbooks built in code: cells, sheets, `.xlsx` bytes, and tables (a header row, then rows)
//! saved into a fresh temporary folder.

pub use super::cell::Cell;
use super::cell::put;
use super::dirs::temp_dir;
use rust_xlsxwriter::{Format, Workbook};
use std::path::PathBuf;

/// Text cell.
pub fn s(t: &str) -> Cell {
    Cell::S(t.to_string())
}

/// Number cell.
pub fn n(x: f64) -> Cell {
    Cell::N(x)
}

/// A row of text cells, numbers where the text parses as one.
pub fn texts(row: &[&str]) -> Vec<Cell> {
    row.iter()
        .map(|t| t.parse::<f64>().map_or_else(|_| s(t), n))
        .collect()
}

/// One sheet: name, hidden flag, rows, merged ranges (r0, c0, r1, c1), and cells far from the
/// rows (row, column, cell), which would make the grid of rows too large.
#[derive(Clone, Debug)]
pub struct Sheet {
    pub name: String,
    pub hidden: bool,
    pub rows: Vec<Vec<Cell>>,
    pub merged: Vec<(u32, u16, u32, u16)>,
    pub far: Vec<(u32, u16, Cell)>,
}

impl Sheet {
    /// A visible sheet with no merges.
    pub fn new(name: &str, rows: Vec<Vec<Cell>>) -> Self {
        Sheet {
            name: name.to_string(),
            hidden: false,
            rows,
            merged: Vec::new(),
            far: Vec::new(),
        }
    }

    /// A sheet with `headers` in row 1 and `rows` below.
    pub fn table(name: &str, headers: &[&str], rows: Vec<Vec<Cell>>) -> Self {
        let mut all = vec![headers.iter().map(|h| s(h)).collect()];
        all.extend(rows);
        Sheet::new(name, all)
    }

    /// Put a cell anywhere, as far as `XFD1048576`, without growing the rows.
    pub fn put(&mut self, row: u32, col: u16, cell: Cell) {
        self.far.push((row, col, cell));
    }

    /// Set a cell by zero-based row and column, growing the grid as needed.
    pub fn set(&mut self, row: usize, col: usize, cell: Cell) {
        while self.rows.len() <= row {
            self.rows.push(Vec::new());
        }
        let r = &mut self.rows[row];
        while r.len() <= col {
            r.push(Cell::E);
        }
        r[col] = cell;
    }
}

/// Find a sheet by name among sheets.
pub fn sheet<'a>(sheets: &'a mut [Sheet], name: &str) -> &'a mut Sheet {
    sheets
        .iter_mut()
        .find(|s| s.name == name)
        .expect("test workbook has this sheet")
}

/// Write sheets into `.xlsx` bytes.
pub fn xlsx(sheets: &[Sheet]) -> Vec<u8> {
    let mut wb = Workbook::new();
    let date = Format::new().set_num_format("yyyy-mm-dd");
    for sh in sheets {
        let ws = wb.add_worksheet();
        ws.set_name(&sh.name).expect("valid test sheet name");
        for &(r0, c0, r1, c1) in &sh.merged {
            ws.merge_range(r0, c0, r1, c1, "", &Format::new())
                .expect("merge");
        }
        let rows = sh.rows.iter().enumerate().flat_map(|(r, row)| {
            row.iter()
                .enumerate()
                .map(move |(c, cell)| (r as u32, c as u16, cell))
        });
        let mut cells: Vec<(u32, u16, &Cell)> = rows.collect();
        cells.extend(sh.far.iter().map(|(r, c, cell)| (*r, *c, cell)));
        // Row order, as the constant-memory writers of spreadsheet files need it too.
        cells.sort_by_key(|(r, c, _)| (*r, *c));
        for (r, c, cell) in cells {
            put(ws, r, c, cell, &date).expect("test cell");
        }
        if sh.hidden {
            ws.set_hidden(true);
        }
    }
    wb.save_to_buffer().expect("test workbook")
}

/// Save sheets as `NAME.xlsx` in a fresh temporary folder; its path.
pub fn save(name: &str, sheets: &[Sheet]) -> PathBuf {
    let path = temp_dir(name).join(format!("{name}.xlsx"));
    std::fs::write(&path, xlsx(sheets)).expect("write test workbook");
    path
}

/// One table: sheet name, headers (row 1), rows.
pub type Table<'a> = (&'a str, &'a [&'a str], Vec<Vec<Cell>>);

/// Save tables (headers in row 1) as `NAME.xlsx` in a fresh temporary folder; its path.
pub fn book(name: &str, tables: &[Table<'_>]) -> PathBuf {
    let sheets: Vec<Sheet> = tables
        .iter()
        .map(|(sheet, headers, rows)| Sheet::table(sheet, headers, rows.clone()))
        .collect();
    save(name, &sheets)
}
