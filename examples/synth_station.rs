//! Write a synthetic station of invented lines for benchmarks and scale tests.
//!
//! `cargo run --release --example synth_station -- LINES OUT.xlsx`
//!
//! The generator is `examples/support/synth.rs`. The data are invented and deterministic (a
//! fixed-seed generator): the same LINES gives the same workbook. At 20,000 lines that is about
//! 50,000 runs and 300,000 fittings.

use std::process::ExitCode;

#[path = "support/synth.rs"]
#[allow(dead_code)] // each user takes a part of the shared generator
mod synth;

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().collect();
    let (Some(lines), Some(out)) = (
        args.get(1).and_then(|a| a.parse::<usize>().ok()),
        args.get(2),
    ) else {
        eprintln!("usage: synth_station LINES OUT.xlsx");
        return ExitCode::from(2);
    };
    if lines == 0 || lines > 1_000_000 {
        eprintln!("LINES must be between 1 and 1,000,000");
        return ExitCode::from(2);
    }
    let station = synth::Station {
        lines,
        seed: synth::SEED,
        label: synth::INVENTED,
        bad_length: false,
        pumped: false,
    };
    match synth::write(&station, out) {
        Ok((runs, fittings)) => {
            println!(
                "wrote {out}: {lines} lines, {runs} runs, {fittings} fittings (invented data)"
            );
            ExitCode::SUCCESS
        }
        Err(e) => {
            eprintln!("error: {out}: {e}");
            ExitCode::from(3)
        }
    }
}
