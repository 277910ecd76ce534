//! Reading outputs back: every cell of a workbook (calamine's streaming reader), one sheet as a
//! range, and JSON files.

use calamine::{Data, Range, Reader, Xlsx, open_workbook};
use std::collections::HashMap;
use std::path::Path;

/// Every non-empty cell of every sheet of an `.xlsx`, by sheet and (row, column), read with
/// calamine's streaming reader (a dense range up to `XFD1048576` would not fit in memory).
pub fn read_cells(path: &Path) -> HashMap<String, HashMap<(u32, u32), Data>> {
    let mut wb: Xlsx<_> = open_workbook(path).expect("readable workbook");
    let mut out = HashMap::new();
    for name in wb.sheet_names() {
        let mut cells = HashMap::new();
        let mut reader = wb.worksheet_cells_reader(&name).expect("sheet");
        while let Some(cell) = reader.next_cell().expect("cell") {
            let d = Data::from(cell.get_value().clone());
            if d != Data::Empty {
                cells.insert(cell.get_position(), d);
            }
        }
        drop(reader);
        out.insert(name, cells);
    }
    out
}

/// An `.xlsx` opened for reading.
pub fn open(path: &Path) -> Xlsx<std::io::BufReader<std::fs::File>> {
    open_workbook(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// One sheet of an `.xlsx` as a range of values.
pub fn sheet_range(path: &Path, name: &str) -> Range<Data> {
    open(path)
        .worksheet_range(name)
        .unwrap_or_else(|e| panic!("{} sheet {name}: {e}", path.display()))
}

/// A JSON file, parsed.
pub fn read_json(path: &Path) -> serde_json::Value {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    serde_json::from_str(&text).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}
