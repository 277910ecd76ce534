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
}

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
        ws.write_number(r, 3, 4000.0)?;
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
    wb.save(out)?;
    Ok((runs, fittings))
}

/// The label above every table of an estate station.
pub const ESTATE_LABEL: &str = "INVENTED DATA: a station of an invented estate for review tests and benchmarks; it does not exist.";

/// Write an invented estate into `dir`: `stations` workbooks `station-001.xlsx`, … each with a
/// number of lines in `lines.0..=lines.1` and a seed of its own, both drawn from a fixed-seed
/// generator; the stations numbered in `bad` (1-based) get a bad length cell (`Pipes!F4`).
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
        };
        let path = dir.join(format!("station-{n:03}.xlsx"));
        write(&station, &path.to_string_lossy())?;
        out.push((path, station.lines));
    }
    Ok(out)
}
