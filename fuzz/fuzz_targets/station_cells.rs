//! Structure-aware: arbitrary strings and numbers placed in the cells of a small valid station,
//! written as a real workbook, then read, audited and reported. Reaches the audit and the report
//! far more often than raw bytes do. Nothing may panic.
#![no_main]

use libfuzzer_sys::fuzz_target;
use rust_xlsxwriter::Workbook;
use std::path::PathBuf;
use std::sync::OnceLock;

const SHEETS: [(&str, &[&str]); 3] = [
    (
        "Lines",
        &[
            "Line",
            "Service",
            "Flow [m3/h]",
            "Temperature [°C]",
            "Elevation change [m]",
            "Hours per year",
            "System",
        ],
    ),
    (
        "Pipes",
        &[
            "Line",
            "Seq",
            "Size",
            "Schedule",
            "Material",
            "Length [m]",
            "Inner diameter [mm]",
            "Roughness [mm]",
            "Age",
            "C factor",
        ],
    ),
    (
        "Fittings",
        &[
            "Tag",
            "Line",
            "Item",
            "Size",
            "Size out",
            "Qty",
            "Opening [%]",
            "K",
            "Kv",
            "Cv",
            "Le/D",
            "Bend radius/D",
            "Angle",
        ],
    ),
];

fn scratch() -> &'static PathBuf {
    static P: OnceLock<PathBuf> = OnceLock::new();
    P.get_or_init(|| {
        let base = if std::path::Path::new("/dev/shm").is_dir() {
            PathBuf::from("/dev/shm")
        } else {
            std::env::temp_dir()
        };
        base.join(format!(
            "lossledger-fuzz-station-{}.xlsx",
            std::process::id()
        ))
    })
}

fuzz_target!(|data: &[u8]| {
    // Fields separated by 0x1F; a field starting with '#' followed by 8 bytes is a number.
    let fields: Vec<&[u8]> = data.split(|b| *b == 0x1F).collect();
    let mut it = fields.into_iter();
    let mut wb = Workbook::new();
    for (name, headers) in SHEETS {
        let ws = wb.add_worksheet();
        if ws.set_name(name).is_err() {
            return;
        }
        for (c, h) in headers.iter().enumerate() {
            let _ = ws.write_string(0, c as u16, *h);
        }
        for r in 1..4u32 {
            for c in 0..headers.len() as u16 {
                let Some(f) = it.next() else { break };
                if f.len() == 9 && f[0] == b'#' {
                    let mut b = [0u8; 8];
                    b.copy_from_slice(&f[1..]);
                    let x = f64::from_le_bytes(b);
                    let _ = ws.write_number(r, c, x);
                } else if let Ok(t) = std::str::from_utf8(f) {
                    let _ = ws.write_string(r, c, t);
                }
            }
        }
    }
    let Ok(bytes) = wb.save_to_buffer() else {
        return;
    };
    let path = scratch();
    if std::fs::write(path, &bytes).is_err() {
        return;
    }
    let Ok(input) = lossledger::ingest::read_path(path) else {
        return;
    };
    let rules = lossledger::audit::Rules::default();
    if let Ok(audit) = lossledger::audit::run(&input, &rules) {
        let _ = lossledger::report::workbook::build(&input, &audit);
        let _ = lossledger::report::json::to_string(&input, &audit);
        let _ = lossledger::report::console::summary(&audit);
    }
});
