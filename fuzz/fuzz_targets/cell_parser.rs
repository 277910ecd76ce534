//! Arbitrary strings into every cell-text parser: numbers, sizes, units, schedules, materials,
//! services and fitting items. Nothing may panic.
#![no_main]

use libfuzzer_sys::fuzz_target;
use lossledger::ingest::parse::{self, SizeUnit};
use lossledger::units::{self, Quantity};

const QUANTITIES: [Quantity; 9] = [
    Quantity::Length,
    Quantity::Flow,
    Quantity::Pressure,
    Quantity::Head,
    Quantity::Temperature,
    Quantity::Velocity,
    Quantity::Density,
    Quantity::Viscosity,
    Quantity::Fraction,
];

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    for dc in [false, true] {
        let _ = parse::parse_number_text(text, dc);
    }
    let _ = parse::looks_decimal_comma(text);
    for u in [None, Some(SizeUnit::Millimetre), Some(SizeUnit::Inch)] {
        let _ = parse::parse_size(text, u);
    }
    for q in QUANTITIES {
        if let Some(u) = units::parse_unit(text, q) {
            let _ = u.to_si(1.0);
        }
    }
    let _ = lossledger::ingest::header::split_header(text);
    let _ = lossledger::ingest::schema::fold(text);
    let _ = lossledger::physics::pipe::parse_schedule(text);
    let _ = lossledger::physics::pipe::material_from_text(text);
    let _ = lossledger::ingest::Service::from_text(text);
    let _ = lossledger::physics::fitting::match_item(text);
});
