//! Structure-aware, for the reader's layout: a small valid station (invented) plus cells at
//! arbitrary positions, biased to the sheet limits (`XFD1048576`, the last row, the last
//! column, far below a table), merged ranges there, extra sheets and random extra zip parts
//! (stored or deflated, some of them highly compressible). The bytes go through the whole reader
//! with arbitrary limits, then the audit and the annotated copy. Nothing may panic or abort, and
//! every number placed must be read back at its place when the file is read.
#![no_main]

use libfuzzer_sys::fuzz_target;
use lossledger::ingest::{self, InputSource, Limits, ReadOptions};
use rust_xlsxwriter::Workbook;
use std::collections::BTreeMap;
use std::io::{Read, Write};
use std::path::PathBuf;
use std::sync::OnceLock;

/// The valid station: sheet name, header, one data row.
const STATION: [(&str, &[&str], &[&str]); 3] = [
    (
        "Lines",
        &["Line", "Service", "Flow [m3/h]"],
        &["L1", "pump-discharge", "#50"],
    ),
    (
        "Pipes",
        &["Line", "Seq", "Size", "Schedule", "Material", "Length [m]"],
        &["L1", "#1", "DN100", "40", "carbon steel", "#20"],
    ),
    (
        "Fittings",
        &["Tag", "Line", "Item", "Size", "Qty"],
        &["F1", "L1", "elbow-90", "DN100", "#1"],
    ),
];

/// Rows and columns the positions are drawn from: the table, just past it, far away and the
/// sheet limits.
const ROWS: [u32; 10] = [0, 1, 2, 3, 30, 1_001, 65_535, 65_536, 1_048_574, 1_048_575];
const COLS: [u16; 9] = [0, 1, 5, 7, 255, 256, 16_382, 16_383, 12];

/// Reads the fuzz input as a stream of small numbers; zeros once it is used up.
struct Bytes<'a>(&'a [u8]);

impl Bytes<'_> {
    fn byte(&mut self) -> u8 {
        let (&b, rest) = self.0.split_first().unwrap_or((&0, &[]));
        self.0 = rest;
        b
    }
    fn u32(&mut self) -> u32 {
        u32::from_le_bytes([self.byte(), self.byte(), self.byte(), self.byte()])
    }
    fn row(&mut self) -> u32 {
        match self.byte() {
            b if (b as usize) < ROWS.len() * 20 => ROWS[b as usize % ROWS.len()],
            _ => self.u32() % 1_048_576,
        }
    }
    fn col(&mut self) -> u16 {
        match self.byte() {
            b if (b as usize) < COLS.len() * 20 => COLS[b as usize % COLS.len()],
            _ => (self.u32() % 16_384) as u16,
        }
    }
    fn text(&mut self) -> String {
        let n = self.byte() % 24;
        (0..n).map(|_| char::from(b' ' + self.byte() % 95)).collect()
    }
    fn done(&self) -> bool {
        self.0.is_empty()
    }
}

/// A cell placed by the fuzzer.
enum Put {
    Number(f64),
    Text(String),
}

/// What the fuzzer adds to the station.
#[derive(Default)]
struct Layout {
    /// (sheet, row, col) → cell; the last write to a position wins, as in the workbook.
    cells: BTreeMap<(usize, u32, u16), Put>,
    merges: Vec<(usize, u32, u16, u32, u16)>,
    extra_sheets: usize,
    parts: Vec<(String, Vec<u8>, bool)>,
}

fn layout(b: &mut Bytes<'_>) -> Layout {
    let mut l = Layout::default();
    while !b.done() && l.cells.len() + l.parts.len() < 64 {
        let sheets = STATION.len() + l.extra_sheets;
        match b.byte() % 8 {
            0..=3 => {
                let s = b.byte() as usize % sheets;
                let (r, c) = (b.row(), b.col());
                let put = if b.byte() % 2 == 0 {
                    Put::Number(f64::from(b.u32() as i32) / 8.0)
                } else {
                    Put::Text(b.text())
                };
                l.cells.insert((s, r, c), put);
            }
            4 => {
                let s = b.byte() as usize % sheets;
                let (r0, c0) = (b.row(), b.col());
                let (r1, c1) = (r0.saturating_add(b.byte() as u32 % 3), c0.saturating_add(u16::from(b.byte() % 3)));
                if r1 < 1_048_576 && c1 < 16_384 && (r1, c1) != (r0, c0) {
                    l.merges.push((s, r0, c0, r1, c1));
                }
            }
            5 => l.extra_sheets = (l.extra_sheets + 1).min(3),
            _ => {
                let name = format!("xl/extra/{}.{}", b.byte(), ["bin", "xml", "txt"][b.byte() as usize % 3]);
                let len = (b.u32() % (1 << 20)) as usize;
                let fill = b.byte();
                let data = if b.byte() % 2 == 0 {
                    vec![fill; len]
                } else {
                    (0..len.min(4096)).map(|i| fill.wrapping_add(i as u8)).collect()
                };
                l.parts.push((name, data, fill % 2 == 0));
            }
        }
    }
    l
}

/// The station with the fuzzer's cells and merges, as `.xlsx` bytes.
fn workbook(l: &Layout) -> Option<Vec<u8>> {
    let mut wb = Workbook::new();
    let names: Vec<String> = STATION
        .iter()
        .map(|s| s.0.to_string())
        .chain((0..l.extra_sheets).map(|i| format!("Notes {i}")))
        .collect();
    for (i, name) in names.iter().enumerate() {
        let ws = wb.add_worksheet();
        ws.set_name(name).ok()?;
        if let Some((_, header, row)) = STATION.get(i) {
            for (c, (h, v)) in header.iter().zip(row.iter()).enumerate() {
                ws.write_string(0, c as u16, *h).ok()?;
                match v.strip_prefix('#') {
                    Some(x) => ws.write_number(1, c as u16, x.parse::<f64>().ok()?).ok()?,
                    None => ws.write_string(1, c as u16, *v).ok()?,
                };
            }
        }
        for &(s, r0, c0, r1, c1) in &l.merges {
            if s == i {
                let _ = ws.merge_range(r0, c0, r1, c1, "", &Default::default());
            }
        }
        for ((s, r, c), put) in l.cells.range((i, 0, 0)..(i + 1, 0, 0)) {
            debug_assert_eq!(*s, i);
            let _ = match put {
                Put::Number(x) => ws.write_number(*r, *c, *x),
                Put::Text(t) => ws.write_string(*r, *c, t),
            };
        }
    }
    wb.save_to_buffer().ok()
}

/// The package with extra parts added (stored or deflated).
fn with_parts(bytes: Vec<u8>, parts: &[(String, Vec<u8>, bool)]) -> Option<Vec<u8>> {
    if parts.is_empty() {
        return Some(bytes);
    }
    let mut zin = zip::ZipArchive::new(std::io::Cursor::new(bytes)).ok()?;
    let mut zout = zip::ZipWriter::new(std::io::Cursor::new(Vec::new()));
    let deflated = zip::write::SimpleFileOptions::default();
    let stored = deflated.compression_method(zip::CompressionMethod::Stored);
    for i in 0..zin.len() {
        let mut f = zin.by_index(i).ok()?;
        let name = f.name().ok()?.to_string();
        let mut data = Vec::new();
        f.read_to_end(&mut data).ok()?;
        zout.start_file(name.as_str(), deflated).ok()?;
        zout.write_all(&data).ok()?;
    }
    for (name, data, store) in parts {
        if zout.start_file(name.as_str(), if *store { stored } else { deflated }).is_ok() {
            zout.write_all(data).ok()?;
        }
    }
    Some(zout.finish().ok()?.into_inner())
}

fn scratch() -> &'static PathBuf {
    static P: OnceLock<PathBuf> = OnceLock::new();
    P.get_or_init(|| {
        let base = if std::path::Path::new("/dev/shm").is_dir() {
            PathBuf::from("/dev/shm")
        } else {
            std::env::temp_dir()
        };
        base.join(format!("lossledger-fuzz-layout-{}.xlsx", std::process::id()))
    })
}

fuzz_target!(|data: &[u8]| {
    let mut b = Bytes(data);
    let limits = match b.byte() % 4 {
        0 => Limits {
            max_cells: u64::from(b.byte()) * 4,
            max_unzipped_mb: 1 + u64::from(b.byte() % 4),
            max_ratio: 1 + u64::from(b.byte()),
        },
        _ => Limits::default(),
    };
    let l = layout(&mut b);
    let Some(bytes) = workbook(&l).and_then(|w| with_parts(w, &l.parts)) else {
        return;
    };
    let path = scratch();
    if std::fs::write(path, &bytes).is_err() {
        return;
    }
    let options = ReadOptions {
        limits,
        ..ReadOptions::default()
    };
    let Ok(input) = ingest::read_inputs(&[InputSource::Path(path.clone())], &options) else {
        return;
    };
    // No cell lost in reading: every number placed is in its sheet at its place.
    for ((s, r, c), put) in &l.cells {
        if let Put::Number(x) = put {
            let got = input.sheets[*s].value(*r, u32::from(*c));
            assert!(
                matches!(got, calamine::Data::Float(y) if y == x),
                "sheet {s} ({r}, {c}): placed {x}, read {got:?}"
            );
        }
    }
    let rules = lossledger::audit::Rules::default();
    if let Ok(audit) = lossledger::audit::run(&input, &rules) {
        let _ = lossledger::report::workbook::build(&input, &audit);
        let _ = lossledger::report::json::to_string(&input, &audit);
        let _ = lossledger::report::console::summary(&audit);
    }
});
