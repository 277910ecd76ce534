//! Arbitrary strings into the description reader and the quantity reader of mixed item lists.
//! Nothing may panic.
#![no_main]

use libfuzzer_sys::fuzz_target;
use lossledger::ingest::{describe, quantity};

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let d = describe::describe(text);
    let _ = d.reasons();
    let _ = d.rating.map(|r| r.label());
    for dc in [false, true] {
        let _ = quantity::parse_quantity(text, dc);
    }
    let _ = quantity::unit_word(text);
});
