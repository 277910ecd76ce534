//! Write a synthetic station of invented lines for benchmarks and scale tests.
//!
//! `cargo run --release --example synth_station -- LINES OUT.xlsx`
//!
//! Every line gets 1–4 pipe runs and 10–20 fittings (elbows, tees, valves, checks, strainers,
//! entrances and exits) of its own size, a flow that gives a velocity between 0.4 and 3.2 m/s, and a
//! service. The data are invented and deterministic (a fixed-seed generator): the same LINES gives
//! the same workbook. At 20,000 lines that is about 50,000 runs and 300,000 fittings.

use rust_xlsxwriter::{Format, Workbook, XlsxError};
use std::process::ExitCode;

/// xorshift64*: a small deterministic generator, good enough for invented data.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform integer in `lo..=hi`.
    fn range(&mut self, lo: u64, hi: u64) -> u64 {
        lo + self.next() % (hi - lo + 1)
    }

    /// Uniform float in `lo..hi`.
    fn float(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (self.next() >> 11) as f64 / (1u64 << 53) as f64 * (hi - lo)
    }

    fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
        &items[self.range(0, items.len() as u64 - 1) as usize]
    }
}

const SIZES: [u16; 9] = [50, 65, 80, 100, 150, 200, 250, 300, 400];
const SERVICES: [&str; 4] = ["pump-suction", "pump-discharge", "distribution", "general"];
const ITEMS: [&str; 12] = [
    "elbow-90",
    "elbow-90-long",
    "elbow-45",
    "tee-run",
    "tee-branch",
    "valve-gate",
    "valve-butterfly",
    "valve-ball",
    "check-swing",
    "strainer-y",
    "bend-90-2d",
    "valve-globe",
];

/// The label above every table (the reader skips it as a note row; the audit carries it into
/// its outputs).
const INVENTED: &str =
    "INVENTED DATA: a synthetic station for benchmarks and scale tests; it does not exist.";
/// Header row of every sheet: under the label and a blank row.
const HEADER_ROW: u32 = 2;

fn write(lines: usize, out: &str) -> Result<(usize, usize), XlsxError> {
    let mut rng = Rng(0x9E37_79B9_7F4A_7C15);
    let bold = Format::new().set_bold();
    let mut wb = Workbook::new();

    // Decide every line first so the three sheets agree.
    struct Line {
        dn: u16,
        service: &'static str,
        flow_m3_h: f64,
        runs: u64,
        fittings: u64,
    }
    let plan: Vec<Line> = (0..lines)
        .map(|_| {
            let dn = *rng.pick(&SIZES);
            let d = f64::from(dn) / 1000.0;
            let v = rng.float(0.4, 3.2);
            Line {
                dn,
                service: rng.pick::<&str>(&SERVICES),
                flow_m3_h: (v * std::f64::consts::PI / 4.0 * d * d * 3600.0 * 10.0).round() / 10.0,
                runs: rng.range(1, 4),
                fittings: rng.range(10, 20),
            }
        })
        .collect();

    let ws = wb.add_worksheet();
    ws.set_name("Lines")?;
    ws.write_string(0, 0, INVENTED)?;
    for (c, h) in ["Line", "Service", "Flow [m3/h]", "Hours per year"]
        .iter()
        .enumerate()
    {
        ws.write_string_with_format(HEADER_ROW, c as u16, *h, &bold)?;
    }
    for (i, l) in plan.iter().enumerate() {
        let r = i as u32 + HEADER_ROW + 1;
        ws.write_string(r, 0, format!("SY-{i:06}"))?;
        ws.write_string(r, 1, l.service)?;
        ws.write_number(r, 2, l.flow_m3_h)?;
        ws.write_number(r, 3, 4000.0)?;
    }

    let ws = wb.add_worksheet();
    ws.set_name("Pipes")?;
    ws.write_string(0, 0, INVENTED)?;
    for (c, h) in ["Line", "Seq", "Size", "Schedule", "Material", "Length [m]"]
        .iter()
        .enumerate()
    {
        ws.write_string_with_format(HEADER_ROW, c as u16, *h, &bold)?;
    }
    let mut r = HEADER_ROW + 1;
    let mut runs = 0;
    for (i, l) in plan.iter().enumerate() {
        for seq in 1..=l.runs {
            ws.write_string(r, 0, format!("SY-{i:06}"))?;
            ws.write_number(r, 1, seq as f64)?;
            ws.write_string(r, 2, format!("DN{}", l.dn))?;
            ws.write_string(r, 3, "40")?;
            ws.write_string(r, 4, "carbon steel")?;
            ws.write_number(r, 5, (rng.float(1.0, 250.0) * 10.0).round() / 10.0)?;
            r += 1;
            runs += 1;
        }
    }

    let ws = wb.add_worksheet();
    ws.set_name("Fittings")?;
    ws.write_string(0, 0, INVENTED)?;
    for (c, h) in ["Tag", "Line", "Item", "Size", "Qty", "Opening [%]"]
        .iter()
        .enumerate()
    {
        ws.write_string_with_format(HEADER_ROW, c as u16, *h, &bold)?;
    }
    let mut r = HEADER_ROW + 1;
    let mut fittings = 0;
    for (i, l) in plan.iter().enumerate() {
        for j in 0..l.fittings {
            let item = rng.pick(&ITEMS);
            ws.write_string(r, 0, format!("SY-{i:06}-{j:02}"))?;
            ws.write_string(r, 1, format!("SY-{i:06}"))?;
            ws.write_string(r, 2, *item)?;
            ws.write_string(r, 3, format!("DN{}", l.dn))?;
            ws.write_number(r, 4, rng.range(1, 3) as f64)?;
            if item.starts_with("valve") {
                ws.write_number(r, 5, if rng.range(0, 9) == 0 { 60.0 } else { 100.0 })?;
            }
            r += 1;
            fittings += 1;
        }
    }
    wb.save(out)?;
    Ok((runs, fittings))
}

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
    match write(lines, out) {
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
