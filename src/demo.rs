//! The built-in demo: a fictional pumping station of our own invention, written as an input
//! workbook and then audited like any other input.
//!
//! Kestrel Ridge booster station does not exist; its tags, flows and lengths are invented to show
//! a realistic mix: two pump sets of different sizes, an expansion after a pump, a part-open valve
//! with a datasheet K, a formula cell, and one suction line above its velocity limit; two pump
//! systems (one on a pump curve with efficiency points, throttled by a control valve and with a
//! site test point; one whose pump falls short, at fixed speed with a year's meter readings), a
//! fouled strainer and replacement costs for the energy review.

use rust_xlsxwriter::{
    DocProperties, ExcelDateTime, Format, Formula, Workbook, Worksheet, XlsxError,
};
use std::path::{Path, PathBuf};

use crate::ingest::InputSource;
use crate::pipeline::{AuditJob, JsonOut};

/// The invented-data note on every demo sheet, printed above the demo's summary.
pub const NOTE: &str =
    "INVENTED DATA for demonstration: Kestrel Ridge booster station is fictional.";

/// One demo cell.
enum C {
    /// Text.
    S(&'static str),
    /// A number.
    N(f64),
    /// A formula with its cached result.
    F(&'static str, f64),
    /// Empty.
    E,
}
use C::{E, F, N, S};

/// One demo sheet: a title row, the invented-data note, a blank row, headers, then the rows.
struct DemoSheet {
    name: &'static str,
    title: &'static str,
    headers: &'static [&'static str],
    rows: &'static [&'static [C]],
}

fn sheet(ws: &mut Worksheet, s: &DemoSheet) -> Result<(), XlsxError> {
    ws.set_name(s.name)?;
    let bold = Format::new().set_bold();
    ws.write_string_with_format(0, 0, s.title, &bold)?;
    ws.write_string(1, 0, NOTE)?;
    for (c, h) in s.headers.iter().enumerate() {
        ws.write_string_with_format(3, c as u16, *h, &bold)?;
        ws.set_column_width(c as u16, 16)?;
    }
    for (r, row) in s.rows.iter().enumerate() {
        let r = r as u32 + 4;
        for (c, v) in row.iter().enumerate() {
            let c = c as u16;
            match v {
                C::S(s) => ws.write_string(r, c, *s).map(|_| ())?,
                C::N(x) => ws.write_number(r, c, *x).map(|_| ())?,
                C::F(f, cached) => ws
                    .write_formula(r, c, Formula::new(*f).set_result(cached.to_string()))
                    .map(|_| ())?,
                C::E => {}
            }
        }
    }
    Ok(())
}

/// The demo's sheets in workbook order: name, title, headers and rows (`E`: an empty cell).
#[rustfmt::skip]
const SHEETS: [DemoSheet; 5] = [
    DemoSheet {
        name: "Lines",
        title: "Kestrel Ridge booster station — line list",
        headers: &["Line", "Service", "Flow [m3/h]", "Temperature [°C]", "From", "To", "Hours per year", "System"],
        rows: &[
            &[S("KR-S1"), S("pump-suction"), N(180.0), N(12.0), S("Wet well A"), S("Pump P-101"), N(6000.0), S("Duty A")],
            &[S("KR-D1"), S("pump-discharge"), N(180.0), N(12.0), S("Pump P-101"), S("Header H-1"), N(6000.0), S("Duty A")],
            &[S("KR-S2"), S("pump-suction"), N(65.0), N(12.0), S("Wet well B"), S("Pump P-102"), N(2500.0), S("Duty B")],
            &[S("KR-D2"), S("pump-discharge"), N(65.0), N(12.0), S("Pump P-102"), S("Header H-1"), N(2500.0), S("Duty B")],
            &[S("KR-M1"), S("distribution"), N(245.0), N(12.0), S("Header H-1"), S("Reservoir R-7"), N(6000.0), E],
        ],
    },
    DemoSheet {
        name: "Pipes",
        title: "Kestrel Ridge booster station — pipe takeoff",
        headers: &["Line", "Seq", "Size", "Schedule", "Material", "Length [m]", "Inner diameter [mm]", "Remarks"],
        rows: &[
            &[S("KR-S1"), N(1.0), S("DN200"), S("40"), S("carbon steel"), N(8.5), E, S("wet well to pump")],
            &[S("KR-D1"), N(1.0), S("DN150"), S("40"), S("carbon steel"), N(4.0), E, S("pump to expansion")],
            &[S("KR-D1"), N(2.0), S("DN200"), S("40"), S("carbon steel"), F("=2*18.5", 37.0), E, S("length from two 18.5 m spools")],
            &[S("KR-S2"), N(1.0), S("NPS 4"), S("40"), S("carbon steel"), N(6.0), E, S("undersized suction")],
            &[S("KR-D2"), N(1.0), S("4\""), S("40"), S("carbon steel"), N(22.0), E, E],
            &[S("KR-M1"), N(1.0), S("DN300"), E, S("ductile iron"), N(1450.0), N(308.0), S("cement-lined, bore from as-built record")],
        ],
    },
    DemoSheet {
        name: "Fittings",
        title: "Kestrel Ridge booster station — fitting and valve schedule",
        headers: &["Tag", "Line", "Item", "Size", "Size out", "Qty", "Opening [%]", "K", "Remarks", "Fouling", "Replacement cost"],
        rows: &[
            &[S("KR-S1-EN"), S("KR-S1"), S("entrance-square-edged"), S("DN200"), E, N(1.0), E, E, S("bellmouth missing"), E, N(900.0)],
            &[S("KR-S1-V1"), S("KR-S1"), S("valve-gate"), S("DN200"), E, N(1.0), E, E, E],
            &[S("KR-S1-ST"), S("KR-S1"), S("strainer-y"), S("DN200"), E, N(1.0), E, E, S("basket half blocked at last inspection"), N(2.0), N(150.0)],
            &[S("KR-S1-E1"), S("KR-S1"), S("elbow-90"), S("DN200"), E, N(2.0), E, E, S("second elbow at the pump inlet"), E, N(1800.0)],
            &[S("KR-D1-NR"), S("KR-D1"), S("check-swing"), S("DN150"), E, N(1.0), E, E, E, E, N(2600.0)],
            &[S("KR-D1-X1"), S("KR-D1"), S("expansion"), S("DN150"), S("DN200"), N(1.0), E, E, S("concentric, abrupt")],
            &[S("KR-D1-E1"), S("KR-D1"), S("elbow-90-long"), S("DN200"), E, N(3.0), E, E, E],
            &[S("KR-D1-CV"), S("KR-D1"), S("valve-globe"), S("DN200"), E, N(1.0), N(40.0), N(22.0), S("flow control, K from datasheet at 40 % open; cost is a speed drive for P-101"), E, N(9500.0)],
            &[S("KR-S2-EN"), S("KR-S2"), S("entrance-projecting"), S("NPS 4"), E, N(1.0), E, E, E],
            &[S("KR-S2-E1"), S("KR-S2"), S("elbow-90"), S("NPS 4"), E, N(1.0), E, E, E],
            &[S("KR-D2-NR"), S("KR-D2"), S("check-swing"), S("4\""), E, N(1.0), E, E, E],
            &[S("KR-D2-BV"), S("KR-D2"), S("valve-butterfly"), S("4\""), E, N(1.0), E, E, E],
            &[S("KR-D2-T1"), S("KR-D2"), S("tee-branch"), S("4\""), E, N(1.0), E, E, S("into header")],
            &[S("KR-M1-V1"), S("KR-M1"), S("valve-butterfly"), S("DN300"), E, N(2.0), E, E, E],
            &[S("KR-M1-E1"), S("KR-M1"), S("elbow-45"), S("DN300"), E, N(6.0), E, E, E],
            &[S("KR-M1-EX"), S("KR-M1"), S("exit"), S("DN300"), E, N(1.0), E, E, S("into reservoir")],
        ],
    },
    DemoSheet {
        name: "Systems",
        title: "Kestrel Ridge booster station — pump systems (suction side first)",
        headers: &["System", "Lines", "Static head [m]", "Pump head [m]", "NPSH required [m]", "Suction level [m]", "Efficiency [%]", "Remarks", "Control", "Metered energy [kWh/yr]", "Metered volume [m3/yr]", "Test flow [m3/h]", "Test head [m]", "Test power [kW]"],
        rows: &[
            &[S("Duty A"), S("KR-S1, KR-D1, KR-M1"), N(18.0), E, N(4.5), N(1.5), N(68.0), S("pump head from the Pump curve sheet; flow set by KR-D1-CV; site test (invented)"), S("throttled"), E, E, N(185.0), N(27.2), N(22.0)],
            &[S("Duty B"), S("KR-S2, KR-D2, KR-M1"), N(18.0), N(22.5), N(3.8), N(-5.5), N(58.0), S("suction lift from wet well B; last year's meter readings (invented)"), S("fixed"), N(19_000.0), N(160_000.0), E, E, E],
        ],
    },
    DemoSheet {
        name: "Pump curve",
        title: "Kestrel Ridge booster station — pump P-101 test points (invented)",
        headers: &["System", "Flow [m3/h]", "Head [m]", "NPSH required [m]", "Efficiency [%]"],
        rows: &[
            &[S("Duty A"), N(0.0), N(34.0), E, E],
            &[S("Duty A"), N(100.0), N(32.5), N(3.0), N(62.0)],
            &[S("Duty A"), N(150.0), N(30.5), N(3.7), N(74.0)],
            &[S("Duty A"), N(180.0), N(28.8), N(4.5), N(79.0)],
            &[S("Duty A"), N(210.0), N(26.5), N(5.6), N(80.0)],
            &[S("Duty A"), N(240.0), N(23.5), N(7.2), N(77.0)],
        ],
    },
];

/// Build the demo input workbook.
///
/// # Errors
/// The workbook writer's error (an internal error: the demo is fixed data).
pub fn input_workbook() -> Result<Vec<u8>, XlsxError> {
    let mut wb = Workbook::new();
    wb.set_properties(
        &DocProperties::new()
            .set_creation_datetime(&ExcelDateTime::from_ymd(2000, 1, 1)?)
            .set_title("Kestrel Ridge booster station (fictional)"),
    );
    for s in &SHEETS {
        sheet(wb.add_worksheet(), s)?;
    }
    wb.save_to_buffer()
}

/// The demo as written: its input workbook and the audit job that reads it and writes its
/// annotated workbook and JSON beside it.
#[derive(Debug)]
pub struct Demo {
    /// The demo input workbook.
    pub input: PathBuf,
    /// The audit of it: `kestrel-ridge.audit.xlsx` and `kestrel-ridge.audit.json` in the folder.
    pub job: AuditJob,
}

/// Why the demo input could not be written.
#[derive(Debug, thiserror::Error)]
pub enum DemoError {
    /// The folder could not be created.
    #[error("{}: {source}", dir.display())]
    Folder {
        /// The folder.
        dir: PathBuf,
        /// What the file system said.
        #[source]
        source: std::io::Error,
    },
    /// The workbook could not be built (an internal error).
    #[error("building the demo workbook failed: {0}")]
    Build(#[source] XlsxError),
    /// The workbook could not be written.
    #[error(transparent)]
    Write(#[from] crate::error::OutputError),
}

/// `lossledger demo`, first step: write the demo input workbook into `dir` (created if need be)
/// and return the audit job that `lossledger demo` then runs ([`AuditJob::run`]).
///
/// # Errors
/// [`DemoError::Folder`] when `dir` cannot be created, [`DemoError::Build`] when the workbook
/// cannot be built, [`DemoError::Write`] when it cannot be written.
///
/// # Example
/// ```
/// let dir = std::env::temp_dir().join(format!("lossledger-doc-demo-{}", std::process::id()));
/// let demo = lossledger::demo::write_input(&dir)?;
/// let done = demo.job.run()?;
/// assert!(demo.input.is_file() && demo.job.output().is_file());
/// assert!(!done.audited.audit.findings.is_empty());
/// std::fs::remove_dir_all(&dir)?;
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn write_input(dir: &Path) -> Result<Demo, DemoError> {
    std::fs::create_dir_all(dir).map_err(|source| DemoError::Folder {
        dir: dir.to_path_buf(),
        source,
    })?;
    let input = dir.join("kestrel-ridge.xlsx");
    let bytes = input_workbook().map_err(DemoError::Build)?;
    crate::report::write_atomic(&input, &bytes)?;
    let job = AuditJob::new(
        vec![InputSource::Path(input.clone())],
        crate::report::default_output(&input),
    )
    .json(Some(JsonOut::File(dir.join("kestrel-ridge.audit.json"))));
    Ok(Demo { input, job })
}
