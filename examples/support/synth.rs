//! The invented-station generator shared by `synth_station`, `make_estate` and the review
//! tests: a fixed-seed generator, so the same arguments give the same workbook.
//!
//! Every line gets 1–4 pipe runs and 10–20 fittings (elbows, tees, valves, checks, strainers,
//! entrances and exits) of its own size, a flow that gives a velocity between 0.4 and 3.2 m/s, and a
//! service. Line ids are `SY-000000`, `SY-000001`… in every station (ids repeat across stations,
//! as they do across real ones). The data are invented and labelled so above every table.

use rust_xlsxwriter::{Format, Workbook, XlsxError};

/// xorshift64*: a small deterministic generator, good enough for invented data.
pub struct Rng(pub u64);

impl Rng {
    pub fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform integer in `lo..=hi`.
    pub fn range(&mut self, lo: u64, hi: u64) -> u64 {
        lo + self.next() % (hi - lo + 1)
    }

    /// Uniform float in `lo..hi`.
    pub fn float(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (self.next() >> 11) as f64 / (1u64 << 53) as f64 * (hi - lo)
    }

    pub fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
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

/// The label of `synth_station`'s stations (the reader skips it as a note row above each table;
/// the audit carries it into its outputs).
pub const INVENTED: &str =
    "INVENTED DATA: a synthetic station for benchmarks and scale tests; it does not exist.";
/// Header row of every sheet: under the label and a blank row.
const HEADER_ROW: u32 = 2;

/// The seed of `synth_station`.
pub const SEED: u64 = 0x9E37_79B9_7F4A_7C15;

/// One invented station to write.
pub struct Station<'a> {
    /// Lines.
    pub lines: usize,
    /// Generator seed (the same seed and lines give the same workbook).
    pub seed: u64,
    /// The `INVENTED DATA …` label above every table.
    pub label: &'a str,
    /// Write text into the first run's length cell (`Pipes!F4`), a bad cell for error tests.
    pub bad_length: bool,
    /// Make the first two lines a pumped system (`PS-1`, DN200 at 1.5 m/s, suction then
    /// discharge) with meter readings and a pump curve with efficiency points (`write_system`).
    pub pumped: bool,
}

/// Line velocity of the pumped system's two lines, m/s: low enough that their losses stay under
/// the 20 m the pump head allows above the static head.
const PUMPED_VELOCITY_M_S: f64 = 1.5;
/// Bore of the pumped system's lines (DN).
const PUMPED_DN: u16 = 200;

/// Write `station` to `out`; returns (runs, fittings).
pub fn write(station: &Station, out: &str) -> Result<(usize, usize), XlsxError> {
    let (lines, label) = (station.lines, station.label);
    let mut rng = Rng(station.seed);
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
    let mut plan: Vec<Line> = (0..lines)
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
    if station.pumped {
        for (l, service) in plan.iter_mut().zip(["pump-suction", "pump-discharge"]) {
            let d = f64::from(PUMPED_DN) / 1000.0;
            l.dn = PUMPED_DN;
            l.service = service;
            l.flow_m3_h =
                (PUMPED_VELOCITY_M_S * std::f64::consts::PI / 4.0 * d * d * 3600.0 * 10.0).round()
                    / 10.0;
        }
    }

    let ws = wb.add_worksheet();
    ws.set_name("Lines")?;
    ws.write_string(0, 0, label)?;
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
        ws.write_number(r, 3, HOURS)?;
    }

    let ws = wb.add_worksheet();
    ws.set_name("Pipes")?;
    ws.write_string(0, 0, label)?;
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
            let length = (rng.float(1.0, 250.0) * 10.0).round() / 10.0;
            if station.bad_length && runs == 0 {
                ws.write_string(r, 5, "about twelve")?;
            } else {
                ws.write_number(r, 5, length)?;
            }
            r += 1;
            runs += 1;
        }
    }

    let ws = wb.add_worksheet();
    ws.set_name("Fittings")?;
    ws.write_string(0, 0, label)?;
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
    if station.pumped && lines >= 2 {
        write_system(&mut wb, station, plan[0].flow_m3_h)?;
    }
    wb.save(out)?;
    Ok((runs, fittings))
}

/// Hours a year every synthetic line runs.
const HOURS: f64 = 4000.0;

/// The `Systems` and `Pump curve` sheets of a pumped station: system `PS-1` over the first two
/// lines at `flow_m3_h`, with a static head, a pump head 20 m above it, a control mode, a year's
/// metered energy and volume (from an invented wire-to-water efficiency of 0.40–0.72 at the pump
/// head, so the computed wire-to-water stays below it), and six curve points: head
/// `H0 (1 - c (Q/Qd)^2)` with `H0 = 1.3 × pump head`, efficiency a parabola peaking at an invented
/// best-efficiency flow of 0.75–1.45 × duty (so some stations run outside the preferred region).
/// Its numbers come from a generator of their own, so the lines match a station without them.
fn write_system(wb: &mut Workbook, station: &Station, flow_m3_h: f64) -> Result<(), XlsxError> {
    let mut rng = Rng(station.seed ^ 0x5157_E4D5);
    let bold = Format::new().set_bold();
    let static_head = (rng.float(10.0, 40.0) * 10.0).round() / 10.0;
    let pump_head = static_head + 20.0;
    let control = *rng.pick(&["fixed", "throttled", "speed"]);
    let volume = (flow_m3_h * HOURS * rng.float(0.85, 1.0)).round();
    let wire_to_water = rng.float(0.40, 0.72);
    let energy = (1000.0 * 9.80665 * pump_head * volume / 3.6e6 / wire_to_water).round();
    let ws = wb.add_worksheet();
    ws.set_name("Systems")?;
    ws.write_string(0, 0, station.label)?;
    let headers = [
        "System",
        "Lines",
        "Static head [m]",
        "Pump head [m]",
        "Control",
        "Metered energy [kWh]",
        "Metered volume [m3]",
    ];
    for (c, h) in headers.iter().enumerate() {
        ws.write_string_with_format(HEADER_ROW, c as u16, *h, &bold)?;
    }
    let r = HEADER_ROW + 1;
    ws.write_string(r, 0, "PS-1")?;
    ws.write_string(r, 1, "SY-000000, SY-000001")?;
    ws.write_number(r, 2, static_head)?;
    ws.write_number(r, 3, pump_head)?;
    ws.write_string(r, 4, control)?;
    ws.write_number(r, 5, energy)?;
    ws.write_number(r, 6, volume)?;

    let ws = wb.add_worksheet();
    ws.set_name("Pump curve")?;
    ws.write_string(0, 0, station.label)?;
    for (c, h) in ["System", "Flow [m3/h]", "Head [m]", "Efficiency"]
        .iter()
        .enumerate()
    {
        ws.write_string_with_format(HEADER_ROW, c as u16, *h, &bold)?;
    }
    let best = rng.float(0.75, 1.45);
    let peak = rng.float(0.65, 0.85);
    let shutoff = 1.3 * pump_head;
    let c = 1.0 - pump_head / shutoff;
    for (i, x) in [0.0, 0.4, 0.8, 1.0, 1.2, 1.5].into_iter().enumerate() {
        let r = HEADER_ROW + 1 + i as u32;
        let eta = peak * (1.0 - ((x - best) / best).powi(2));
        ws.write_string(r, 0, "PS-1")?;
        ws.write_number(r, 1, (x * flow_m3_h * 10.0).round() / 10.0)?;
        ws.write_number(r, 2, (shutoff * (1.0 - c * x * x) * 100.0).round() / 100.0)?;
        ws.write_number(r, 3, (eta.max(0.02) * 1000.0).round() / 1000.0)?;
    }
    Ok(())
}

/// The label above every table of an estate station.
pub const ESTATE_LABEL: &str = "INVENTED DATA: a station of an invented estate for review tests and benchmarks; it does not exist.";

/// Write an invented estate into `dir`: `stations` workbooks `station-001.xlsx`, … each with a
/// number of lines in `lines.0..=lines.1` and a seed of its own, both drawn from a fixed-seed
/// generator, and a pumped system over its first two lines with meter readings and a pump curve
/// (`write_system`); the stations numbered in `bad` (1-based) get a bad length cell (`Pipes!F4`).
/// Returns each station's path and lines.
pub fn write_estate(
    dir: &std::path::Path,
    stations: usize,
    lines: (usize, usize),
    bad: &[usize],
) -> Result<Vec<(std::path::PathBuf, usize)>, XlsxError> {
    let mut rng = Rng(SEED ^ 0x00E5_7A7E);
    let mut out = Vec::with_capacity(stations);
    for n in 1..=stations {
        let station = Station {
            lines: rng.range(lines.0 as u64, lines.1 as u64) as usize,
            seed: rng.next() | 1,
            label: ESTATE_LABEL,
            bad_length: bad.contains(&n),
            pumped: true,
        };
        let path = dir.join(format!("station-{n:03}.xlsx"));
        write(&station, &path.to_string_lossy())?;
        out.push((path, station.lines));
    }
    Ok(out)
}
