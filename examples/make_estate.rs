//! Write an invented estate of station workbooks for `lossledger review`.
//!
//! `cargo run --release --example make_estate -- STATIONS MIN_LINES MAX_LINES DIR [BAD...]`
//!
//! Writes `DIR/station-001.xlsx`… (the generator is `examples/support/synth.rs`): each station
//! has its own number of lines between MIN_LINES and MAX_LINES and its own data, all drawn from
//! fixed-seed generators, so the same arguments give the same estate. Every station reuses the
//! line ids `SY-000000`, `SY-000001`…, as real stations repeat `P1` or `L-01`, and has one pumped
//! system (`PS-1`, its first two lines) with a year's meter readings and a pump curve with
//! efficiency points, so the review shows measured figures. Stations numbered
//! in BAD (1-based) get a bad length cell (`Pipes!F4`). Every file is marked INVENTED DATA.

use std::process::ExitCode;

#[path = "support/synth.rs"]
#[allow(dead_code)] // each user takes a part of the shared generator
mod synth;

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let num = |i: usize| args.get(i).and_then(|a| a.parse::<usize>().ok());
    let (Some(stations), Some(min), Some(max), Some(dir)) = (num(0), num(1), num(2), args.get(3))
    else {
        eprintln!("usage: make_estate STATIONS MIN_LINES MAX_LINES DIR [BAD...]");
        return ExitCode::from(2);
    };
    let bad: Vec<usize> = args[4..].iter().filter_map(|a| a.parse().ok()).collect();
    if stations == 0 || min == 0 || min > max || max > 100_000 {
        eprintln!("need STATIONS >= 1 and 1 <= MIN_LINES <= MAX_LINES <= 100,000");
        return ExitCode::from(2);
    }
    let dir = std::path::Path::new(dir);
    if let Err(e) = std::fs::create_dir_all(dir) {
        eprintln!("error: {}: {e}", dir.display());
        return ExitCode::from(2);
    }
    match synth::write_estate(dir, stations, (min, max), &bad) {
        Ok(written) => {
            let lines: usize = written.iter().map(|(_, l)| l).sum();
            let largest = written.iter().map(|(_, l)| *l).max().unwrap_or(0);
            println!(
                "wrote {stations} stations into {}: {lines} lines in all, the largest {largest} lines (invented data)",
                dir.display()
            );
            ExitCode::SUCCESS
        }
        Err(e) => {
            eprintln!("error: {}: {e}", dir.display());
            ExitCode::from(3)
        }
    }
}
