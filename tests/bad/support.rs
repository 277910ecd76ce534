//! Shared helpers for the reliability tests: building workbooks in code, a minimal zip writer for
//! non-workbook archives, unique temporary folders, and running the built binary.
#![allow(dead_code)]

use rust_xlsxwriter::{ExcelDateTime, Format, Formula, Workbook};
use std::path::{Path, PathBuf};
use std::process::{Command, Output};
use std::sync::atomic::{AtomicUsize, Ordering};

/// A cell to write.
#[derive(Clone, Debug)]
pub enum Cell {
    /// Text.
    S(String),
    /// Number.
    N(f64),
    /// Formula with a cached result.
    F(String, String),
    /// Date and time (ISO text, written as an Excel date).
    D(&'static str),
    /// Boolean.
    B(bool),
    /// Nothing.
    E,
}

/// Text cell.
pub fn s(t: &str) -> Cell {
    Cell::S(t.to_string())
}

/// Number cell.
pub fn n(x: f64) -> Cell {
    Cell::N(x)
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

/// The smallest valid station: one line, one run, an elbow and a gate valve.
///
/// Lines: A Line, B Service, C Flow [m3/h]. Pipes: A Line, B Seq, C Size, D Schedule, E Material,
/// F Length [m]. Fittings: A Tag, B Line, C Item, D Size, E Size out, F Qty, G Opening [%], H K.
pub fn base_station() -> Vec<Sheet> {
    vec![
        Sheet::new(
            "Lines",
            vec![
                vec![s("Line"), s("Service"), s("Flow [m3/h]")],
                vec![s("L1"), s("pump-discharge"), n(50.0)],
            ],
        ),
        Sheet::new(
            "Pipes",
            vec![
                vec![
                    s("Line"),
                    s("Seq"),
                    s("Size"),
                    s("Schedule"),
                    s("Material"),
                    s("Length [m]"),
                ],
                vec![
                    s("L1"),
                    n(1.0),
                    s("DN100"),
                    s("40"),
                    s("carbon steel"),
                    n(20.0),
                ],
            ],
        ),
        Sheet::new(
            "Fittings",
            vec![
                vec![
                    s("Tag"),
                    s("Line"),
                    s("Item"),
                    s("Size"),
                    s("Size out"),
                    s("Qty"),
                    s("Opening [%]"),
                    s("K"),
                ],
                vec![s("F1"), s("L1"), s("elbow-90"), s("DN100"), Cell::E, n(1.0)],
                vec![
                    s("V1"),
                    s("L1"),
                    s("valve-gate"),
                    s("DN100"),
                    Cell::E,
                    n(1.0),
                ],
            ],
        ),
    ]
}

/// Find a sheet by name in a station.
pub fn sheet<'a>(sheets: &'a mut [Sheet], name: &str) -> &'a mut Sheet {
    sheets
        .iter_mut()
        .find(|s| s.name == name)
        .expect("test station has this sheet")
}

/// Write sheets into .xlsx bytes.
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
            match cell {
                Cell::S(t) => {
                    ws.write_string(r, c, t).expect("string");
                }
                Cell::N(x) => {
                    ws.write_number(r, c, *x).expect("number");
                }
                Cell::F(f, v) => {
                    ws.write_formula(r, c, Formula::new(f).set_result(v))
                        .expect("formula");
                }
                Cell::D(iso) => {
                    let dt = ExcelDateTime::parse_from_str(iso).expect("date");
                    ws.write_datetime_with_format(r, c, &dt, &date)
                        .expect("date");
                }
                Cell::B(b) => {
                    ws.write_boolean(r, c, *b).expect("bool");
                }
                Cell::E => {}
            }
        }
        if sh.hidden {
            ws.set_hidden(true);
        }
    }
    wb.save_to_buffer().expect("test workbook")
}

fn crc32(data: &[u8]) -> u32 {
    let mut crc = 0xFFFF_FFFFu32;
    for &b in data {
        crc ^= u32::from(b);
        for _ in 0..8 {
            crc = if crc & 1 != 0 {
                (crc >> 1) ^ 0xEDB8_8320
            } else {
                crc >> 1
            };
        }
    }
    !crc
}

/// A zip archive (stored, no compression) of the given entries, per the PKWARE APPNOTE layout.
pub fn zip(entries: &[(&str, &[u8])]) -> Vec<u8> {
    let mut out = Vec::new();
    let mut central = Vec::new();
    for (name, data) in entries {
        let offset = out.len() as u32;
        let crc = crc32(data);
        let head = |sig: u32, central: bool| {
            let mut h = Vec::new();
            h.extend_from_slice(&sig.to_le_bytes());
            if central {
                h.extend_from_slice(&20u16.to_le_bytes());
            }
            h.extend_from_slice(&20u16.to_le_bytes()); // version needed
            h.extend_from_slice(&0u16.to_le_bytes()); // flags
            h.extend_from_slice(&0u16.to_le_bytes()); // stored
            h.extend_from_slice(&0u32.to_le_bytes()); // time, date
            h.extend_from_slice(&crc.to_le_bytes());
            h.extend_from_slice(&(data.len() as u32).to_le_bytes());
            h.extend_from_slice(&(data.len() as u32).to_le_bytes());
            h.extend_from_slice(&(name.len() as u16).to_le_bytes());
            h.extend_from_slice(&0u16.to_le_bytes()); // extra
            if central {
                h.extend_from_slice(&0u16.to_le_bytes()); // comment
                h.extend_from_slice(&0u16.to_le_bytes()); // disk
                h.extend_from_slice(&0u16.to_le_bytes()); // internal attrs
                h.extend_from_slice(&0u32.to_le_bytes()); // external attrs
                h.extend_from_slice(&offset.to_le_bytes());
            }
            h.extend_from_slice(name.as_bytes());
            h
        };
        out.extend(head(0x0403_4b50, false));
        out.extend_from_slice(data);
        central.extend(head(0x0201_4b50, true));
    }
    let cd_offset = out.len() as u32;
    out.extend_from_slice(&central);
    out.extend_from_slice(&0x0605_4b50u32.to_le_bytes());
    out.extend_from_slice(&[0, 0, 0, 0]);
    out.extend_from_slice(&(entries.len() as u16).to_le_bytes());
    out.extend_from_slice(&(entries.len() as u16).to_le_bytes());
    out.extend_from_slice(&(central.len() as u32).to_le_bytes());
    out.extend_from_slice(&cd_offset.to_le_bytes());
    out.extend_from_slice(&0u16.to_le_bytes());
    out
}

static COUNTER: AtomicUsize = AtomicUsize::new(0);

/// A fresh, empty folder under the system temporary folder.
pub fn temp_dir(label: &str) -> PathBuf {
    let safe: String = label
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() { c } else { '-' })
        .collect();
    let dir = std::env::temp_dir().join(format!(
        "lossledger-test-{}-{}-{}",
        std::process::id(),
        COUNTER.fetch_add(1, Ordering::SeqCst),
        safe
    ));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).expect("temp dir");
    dir
}

/// Run the built `lossledger` binary.
pub fn run(args: &[&std::ffi::OsStr]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_lossledger"))
        .args(args)
        .output()
        .expect("run lossledger")
}

/// Names of the entries of a folder, sorted.
pub fn entries(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .map(|rd| {
            rd.filter_map(|e| e.ok())
                .map(|e| e.file_name().to_string_lossy().into_owned())
                .collect()
        })
        .unwrap_or_default();
    v.sort();
    v
}

/// A small valid station kept as one mixed item list (`BoQ`: Item, Line, Description, Size,
/// Qty, Unit) with its Lines sheet. Invented.
pub fn list_station() -> Vec<Sheet> {
    vec![
        Sheet::new(
            "Lines",
            vec![
                vec![s("Line"), s("Service"), s("Flow [m3/h]")],
                vec![s("L1"), s("pump-discharge"), n(50.0)],
            ],
        ),
        Sheet::new(
            "BoQ",
            vec![
                vec![
                    s("Item"),
                    s("Line"),
                    s("Description"),
                    s("Size"),
                    s("Qty"),
                    s("Unit"),
                ],
                vec![
                    s("1"),
                    s("L1"),
                    s("Pipe, CS, Sch 40"),
                    s("DN100"),
                    n(20.0),
                    s("m"),
                ],
                vec![
                    s("2"),
                    s("L1"),
                    s("Gate valve PN16"),
                    s("DN100"),
                    n(1.0),
                    s("No"),
                ],
                vec![
                    s("3"),
                    s("L1"),
                    s("90 LR elbow"),
                    s("DN100"),
                    n(2.0),
                    s("No"),
                ],
            ],
        ),
    ]
}

/// Every non-empty cell of every sheet of an `.xlsx`, by sheet and (row, column), read with
/// calamine's streaming reader (a dense range up to `XFD1048576` would not fit in memory).
pub fn read_cells(
    path: &Path,
) -> std::collections::HashMap<String, std::collections::HashMap<(u32, u32), calamine::Data>> {
    use calamine::{Reader, Xlsx, open_workbook};
    let mut wb: Xlsx<_> = open_workbook(path).expect("readable workbook");
    let mut out = std::collections::HashMap::new();
    for name in wb.sheet_names() {
        let mut cells = std::collections::HashMap::new();
        let mut reader = wb.worksheet_cells_reader(&name).expect("sheet");
        while let Some(cell) = reader.next_cell().expect("cell") {
            let d = calamine::Data::from(cell.get_value().clone());
            if d != calamine::Data::Empty {
                cells.insert(cell.get_position(), d);
            }
        }
        drop(reader);
        out.insert(name, cells);
    }
    out
}

/// An `.xlsx` with `pad` bytes of spaces put into part `part` right after the first `after`
/// (whitespace between elements is valid XML): a part that inflates far beyond its compressed
/// size, as a zip bomb does. The other parts are copied as they are.
pub fn padded(xlsx: &[u8], part: &str, after: &str, pad: usize) -> Vec<u8> {
    use std::io::{Read, Write};
    let mut zin = zip::ZipArchive::new(std::io::Cursor::new(xlsx)).expect("zip");
    let mut zout = zip::ZipWriter::new(std::io::Cursor::new(Vec::new()));
    let opts = zip::write::SimpleFileOptions::default()
        .compression_method(zip::CompressionMethod::Deflated)
        .large_file(true);
    for i in 0..zin.len() {
        let mut f = zin.by_index(i).expect("part");
        let name = f.name().expect("part name").to_string();
        let mut data = Vec::new();
        f.read_to_end(&mut data).expect("read part");
        zout.start_file(name.as_str(), opts).expect("start");
        if name == part {
            let text = String::from_utf8(data).expect("xml");
            let at = text.find(after).expect("marker") + after.len();
            zout.write_all(&text.as_bytes()[..at]).expect("write");
            let chunk = vec![b' '; 1 << 20];
            let mut left = pad;
            while left > 0 {
                let n = left.min(chunk.len());
                zout.write_all(&chunk[..n]).expect("pad");
                left -= n;
            }
            zout.write_all(&text.as_bytes()[at..]).expect("write");
        } else {
            zout.write_all(&data).expect("write");
        }
    }
    zout.finish().expect("zip").into_inner()
}
