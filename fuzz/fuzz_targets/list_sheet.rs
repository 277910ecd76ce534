//! Structure-aware: arbitrary strings and numbers in the cells of a mixed item list (with a
//! small Lines table), built in memory and read, audited and reported. Reaches the list reader,
//! heading and tag lines, skip reasons and the side-by-side computed columns. Nothing may
//! panic.
#![no_main]

use calamine::{Data, Range};
use libfuzzer_sys::fuzz_target;
use lossledger::ingest::{self, SheetGrid};

const HEADER_SETS: [&[&str]; 4] = [
    &["Item", "Line", "Description", "Size", "Qty", "Unit", "K"],
    &["Ref", "Description", "Qty", "Unit", "Rate", "Amount", "Schedule"],
    &["Asset no", "Description", "Status", "Functional location", "Size", "Material", "Opening [%]"],
    &["Tag", "Material description", "Quantity", "UOM", "Size out", "Length [m]", "Kv"],
];

fn lines() -> SheetGrid {
    let mut r = Range::new((0, 0), (2, 2));
    for (c, h) in ["Line", "Service", "Flow [m3/h]"].iter().enumerate() {
        r.set_value((0, c as u32), Data::String((*h).into()));
    }
    for (i, id) in ["L1", "TB-01"].iter().enumerate() {
        let row = i as u32 + 1;
        r.set_value((row, 0), Data::String((*id).into()));
        r.set_value((row, 1), Data::String("distribution".into()));
        r.set_value((row, 2), Data::Float(40.0));
    }
    SheetGrid::from_values("Lines", r)
}

fuzz_target!(|data: &[u8]| {
    let Some((&pick, rest)) = data.split_first() else {
        return;
    };
    let headers = HEADER_SETS[usize::from(pick) % HEADER_SETS.len()];
    // Fields separated by 0x1F; a field starting with '#' followed by 8 bytes is a number.
    let mut fields = rest.split(|b| *b == 0x1F);
    let rows = 8u32;
    let mut r = Range::new((0, 0), (rows, headers.len() as u32 - 1));
    for (c, h) in headers.iter().enumerate() {
        r.set_value((0, c as u32), Data::String((*h).into()));
    }
    'fill: for row in 1..=rows {
        for c in 0..headers.len() as u32 {
            let Some(f) = fields.next() else { break 'fill };
            let d = if f.len() == 9 && f[0] == b'#' {
                let mut b = [0u8; 8];
                b.copy_from_slice(&f[1..]);
                Data::Float(f64::from_le_bytes(b))
            } else if f.is_empty() {
                Data::Empty
            } else {
                match std::str::from_utf8(f) {
                    Ok(t) => Data::String(t.to_string()),
                    Err(_) => Data::Empty,
                }
            };
            r.set_value((row, c), d);
        }
    }
    let sheets = vec![lines(), SheetGrid::from_values("BoQ", r)];
    let input = ingest::from_sheets("fuzz.xlsx".into(), "fuzz.xlsx".into(), String::new(), sheets);
    let _ = ingest::describe(&input);
    if input.error_count() > 0 {
        return;
    }
    let rules = lossledger::audit::Rules::default();
    if let Ok(audit) = lossledger::audit::run(&input, &rules) {
        let _ = lossledger::report::workbook::build(&input, &audit);
        let _ = lossledger::report::json::to_string(&input, &audit);
    }
});
