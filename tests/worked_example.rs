//! Reproduces docs/worked-example.md (a hand calculation; properties from `iapws` 1.5.5 and
//! friction factors checked with `fluids` 1.3.1) through the library, to 0.1 %.

use lossledger::audit::{self, Rules};
use lossledger::ingest;
use rust_xlsxwriter::Workbook;

fn build(path: &std::path::Path) {
    let mut wb = Workbook::new();
    let ws = wb.add_worksheet();
    ws.set_name("Lines").unwrap();
    for (c, h) in ["Line", "Service", "Flow [m3/h]", "Temperature [°C]"]
        .iter()
        .enumerate()
    {
        ws.write_string(0, c as u16, *h).unwrap();
    }
    ws.write_string(1, 0, "WX-1").unwrap();
    ws.write_string(1, 1, "general").unwrap();
    ws.write_number(1, 2, 60.0).unwrap();
    ws.write_number(1, 3, 15.0).unwrap();
    let ws = wb.add_worksheet();
    ws.set_name("Pipes").unwrap();
    for (c, h) in [
        "Line",
        "Seq",
        "Size",
        "Schedule",
        "Material",
        "Length [m]",
        "Roughness [mm]",
    ]
    .iter()
    .enumerate()
    {
        ws.write_string(0, c as u16, *h).unwrap();
    }
    for (r, (size, len)) in [("DN100", 12.0), ("DN150", 30.0)].iter().enumerate() {
        let r = r as u32 + 1;
        ws.write_string(r, 0, "WX-1").unwrap();
        ws.write_number(r, 1, r as f64).unwrap();
        ws.write_string(r, 2, *size).unwrap();
        ws.write_string(r, 3, "40").unwrap();
        ws.write_string(r, 4, "carbon steel").unwrap();
        ws.write_number(r, 5, *len).unwrap();
        ws.write_number(r, 6, 0.045).unwrap();
    }
    let ws = wb.add_worksheet();
    ws.set_name("Fittings").unwrap();
    for (c, h) in ["Tag", "Line", "Item", "Size", "Size out"]
        .iter()
        .enumerate()
    {
        ws.write_string(0, c as u16, *h).unwrap();
    }
    for (c, v) in ["WX-1-X", "WX-1", "sudden expansion", "DN100", "DN150"]
        .iter()
        .enumerate()
    {
        ws.write_string(1, c as u16, *v).unwrap();
    }
    wb.save(path).unwrap();
}

fn close(actual: f64, expected: f64, what: &str) {
    let rel = (actual - expected).abs() / expected.abs();
    assert!(
        rel < 1e-3,
        "{what}: {actual} vs hand-worked {expected} (rel {rel:.2e})"
    );
}

#[test]
fn two_section_line_with_expansion_matches_the_hand_calculation() {
    let dir = std::env::temp_dir().join(format!("lossledger-we-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("wx1.xlsx");
    build(&path);
    let input = ingest::read_path(&path).unwrap();
    let a = audit::run(&input, &Rules::default()).unwrap();
    let line = &a.lines[0];
    let runs: Vec<_> = line.runs.iter().map(|&i| &a.runs[i]).collect();
    // Step 2: bores, ASME B36.10M.
    close(runs[0].inner_diameter_m, 0.10226, "DN100 bore");
    close(runs[1].inner_diameter_m, 0.15405, "DN150 bore");
    // Step 3 and 4.
    close(runs[0].velocity_m_s, 2.02930, "v1");
    close(runs[0].reynolds, 182_257.0, "Re1");
    close(runs[1].reynolds, 120_984.0, "Re2");
    close(runs[0].friction_factor, 0.018681, "f1");
    close(runs[1].friction_factor, 0.018885, "f2");
    // Step 5.
    close(runs[0].head_m, 0.460287, "h1");
    close(runs[1].head_m, 0.149931, "h2");
    // Step 6: expansion on the smaller bore.
    let x = &a.fittings[0];
    close(x.k, 0.312879, "K expansion");
    close(x.reference_diameter_m, 0.10226, "K reference bore");
    close(x.head_m, 0.065693, "h expansion");
    // Step 7.
    close(line.friction_head_m, 0.610218, "friction total");
    close(line.total_head_m, 0.675911, "line total");
    close(line.total_dp_pa, 6622.47, "line dp");
    std::fs::remove_dir_all(&dir).ok();
}
