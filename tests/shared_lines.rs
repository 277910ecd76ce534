//! Shared lines (a common header listed by two systems): the hand-worked example "shared header
//! split between two systems" of docs/energy.md (§4a), by duty flows and by a `Share` column,
//! and the bad-input errors at the `Share` cells. All data is invented.

use lossledger::audit::Rules;
use lossledger::audit::energy::SHARED_BASIS;
use std::path::PathBuf;

mod common;
use common::book::{Cell, Table, book, n, s};
use common::library::audit;
use common::tol::rel;

/// Hand-worked figures of docs/energy.md, worked example 9 (Hazen–Williams SI form
/// h_f = 10.67 L Q^1.852 / (C^1.852 D^4.8704), ρ g = 998.2 × 9.80665).
const HEADER_HEAD_M: f64 = 0.594_753_080_629_420_4;
const REQUIRED_A_M: f64 = 12.938_520_146_670_639;
const REQUIRED_B_M: f64 = 11.700_850_643_980_747;
const HEADER_POWER_W: f64 = 291.101_836_730_891_4;

/// Tolerance of the reproduced figures against the hand-worked ones (relative).
const TOL: f64 = 1e-9;

/// The invented header station: header H (0.05 m³/s) feeding pump A's discharge DA (0.03 m³/s,
/// 6000 h, 70 %) and pump B's DB (0.02 m³/s, 3000 h, 50 %). `share` fills the Systems `Share`
/// column of A and B (None: no such column), under the header `share_header`.
fn header_book(name: &str, share_header: &'static str, share: Option<[Cell; 2]>) -> PathBuf {
    let mut headers = vec!["System", "Lines", "Static head [m]", "Efficiency [%]"];
    let mut a = vec![s("A"), s("H, DA"), n(10.0), n(70.0)];
    let mut b = vec![s("B"), s("H, DB"), n(10.0), n(50.0)];
    if let Some([sa, sb]) = share {
        headers.push(share_header);
        a.push(sa);
        b.push(sb);
    }
    let headers: &'static [&'static str] = Box::leak(headers.into_boxed_slice());
    let line = |id, service, q, hours: Option<f64>| {
        vec![
            s(id),
            s(service),
            n(q),
            s("water-20"),
            hours.map_or(Cell::E, n),
        ]
    };
    let run = |id, d, l| vec![s(id), n(d), n(l), n(120.0)];
    let sheets: Vec<Table<'_>> = vec![
        (
            "Notes",
            &["INVENTED DATA: a fictional header station for a test"],
            vec![],
        ),
        (
            "Lines",
            &["Line", "Service", "Flow [m3/s]", "Fluid", "Hours per year"],
            vec![
                line("H", "pump-suction", 0.05, None),
                line("DA", "pump-discharge", 0.03, Some(6000.0)),
                line("DB", "pump-discharge", 0.02, Some(3000.0)),
            ],
        ),
        (
            "Pipes",
            &["Line", "Inner diameter [mm]", "Length [m]", "C factor"],
            vec![
                run("H", 200.0, 40.0),
                run("DA", 150.0, 100.0),
                run("DB", 150.0, 100.0),
            ],
        ),
        (
            "Fluids",
            &["Fluid", "Density [kg/m3]", "Viscosity [Pa.s]"],
            vec![vec![s("water-20"), n(998.2), n(0.001)]],
        ),
        ("Systems", headers, vec![a, b]),
    ];
    book(name, &sheets)
}

/// Each share's energy and cost: s Δp Q t / (1000 η), at the rules' default tariff 0.15.
fn share_energy(share: f64, efficiency: f64, hours: f64) -> f64 {
    share * HEADER_POWER_W / efficiency * hours / 1000.0
}

// Source: docs/energy.md, worked example 9 (hand-worked, by duty flows: 0.6 and 0.4).
#[test]
fn shared_header_split_by_duty_flows_matches_the_hand_worked_example() {
    let a = audit(&header_book("by-duty", "Share", None), &Rules::default());
    let h = &a.lines[a.line_of("H").unwrap()];
    assert!(
        rel(h.total_head_m, HEADER_HEAD_M) < TOL,
        "{}",
        h.total_head_m
    );
    // Each system's required head takes the header at its total flow.
    let (sa, sb) = (&a.systems[0], &a.systems[1]);
    assert!(
        rel(sa.required_head_m, REQUIRED_A_M) < TOL,
        "{}",
        sa.required_head_m
    );
    assert!(
        rel(sb.required_head_m, REQUIRED_B_M) < TOL,
        "{}",
        sb.required_head_m
    );
    // The duty flow is the pump's own line, not the header.
    assert!(rel(sa.flow_m3_s, 0.03) < TOL && rel(sb.flow_m3_s, 0.02) < TOL);
    let (ha, hb) = (&sa.shared_lines[0], &sb.shared_lines[0]);
    assert_eq!((ha.line.as_str(), ha.share_basis), ("H", "duty flows"));
    assert!(rel(ha.share, 0.6) < TOL && rel(hb.share, 0.4) < TOL);
    assert_eq!(
        (ha.efficiency, ha.hours_per_year),
        (Some(0.7), Some(6000.0))
    );
    assert_eq!(
        (hb.efficiency, hb.hours_per_year),
        (Some(0.5), Some(3000.0))
    );
    let ea = ha.annual_energy_kwh.unwrap();
    let eb = hb.annual_energy_kwh.unwrap();
    assert!(rel(ea, 1_497.095_160_330_298_8) < TOL, "{ea}");
    assert!(rel(eb, 698.644_408_154_139_5) < TOL, "{eb}");
    assert!(rel(ea, share_energy(0.6, 0.7, 6000.0)) < TOL);
    assert!(rel(ha.annual_cost.unwrap(), 224.564_274_049_544_82) < TOL);
    assert!(rel(hb.annual_cost.unwrap(), 104.796_661_223_120_92) < TOL);
    // The line is costed as the sum of its shares: t = 4800 h, η = 7/11.
    assert_eq!(h.efficiency_basis, SHARED_BASIS);
    assert!(rel(h.annual_energy_kwh.unwrap(), 2_195.739_568_484_438) < TOL);
    assert!(rel(h.efficiency.unwrap(), 7.0 / 11.0) < TOL);
    assert!(rel(h.hours_per_year.unwrap(), 4800.0) < TOL);
    // Before shared lines, the whole header went at A's 70 % and the rules' 4000 h.
    assert!(rel(h.annual_energy_kwh.unwrap(), 1_663.439_067_033_665_4) > 0.3);
    // The unshared lines are costed as before, at their own rows.
    let da = &a.lines[a.line_of("DA").unwrap()];
    assert_eq!(
        (da.efficiency, da.hours_per_year),
        (Some(0.7), Some(6000.0))
    );
}

// Source: docs/energy.md, worked example 9, the Share column (0.75 and 25 %).
#[test]
fn shared_header_split_by_the_share_column_matches_the_hand_worked_example() {
    let shares = Some([s("0.75"), s("H: 25 %")]);
    let a = audit(&header_book("by-share", "Share", shares), &Rules::default());
    let (ha, hb) = (&a.systems[0].shared_lines[0], &a.systems[1].shared_lines[0]);
    assert_eq!(ha.share_basis, "Systems Share");
    assert!(rel(ha.share, 0.75) < TOL && rel(hb.share, 0.25) < TOL);
    assert!(rel(ha.annual_energy_kwh.unwrap(), 1_871.368_950_412_873_6) < TOL);
    assert!(rel(hb.annual_energy_kwh.unwrap(), 436.652_755_096_337_1) < TOL);
    let h = &a.lines[a.line_of("H").unwrap()];
    assert!(rel(h.annual_cost.unwrap(), 346.203_255_826_381_6) < TOL);
    assert!(rel(h.efficiency.unwrap(), 49.0 / 74.0) < TOL);
    // t̄ = 5250 h, η = 5250 / (0.75 × 6000/0.7 + 0.25 × 3000/0.5) = 49/74 (hand-worked).
    // The required heads do not depend on the split.
    assert!(rel(a.systems[0].required_head_m, REQUIRED_A_M) < TOL);
}

// The aliases of the Share column (src/ingest/schema.rs), read as the canonical header.
#[test]
fn share_column_aliases_read_as_share() {
    for header in ["Flow share", "Share of flow", "Split"] {
        let shares = Some([n(0.75), n(0.25)]);
        let name = format!("alias-{}", header.replace(' ', "-"));
        let a = audit(&header_book(&name, header, shares), &Rules::default());
        assert!(
            rel(a.systems[0].shared_lines[0].share, 0.75) < TOL,
            "{header}"
        );
    }
}

/// Read the book and return its error diagnostics as (cell, message, hint).
fn errors(path: &std::path::Path) -> Vec<(String, String, String)> {
    let input = lossledger::ingest::read_path(path).unwrap();
    assert!(lossledger::audit::run(&input, &Rules::default()).is_err());
    input
        .diagnostics
        .iter()
        .filter(|d| d.severity == lossledger::error::Severity::Error)
        .map(|d| {
            (
                d.cell.as_ref().map(|c| c.to_string()).unwrap_or_default(),
                d.message.clone(),
                d.hint.clone().unwrap_or_default(),
            )
        })
        .collect()
}

// Bad input (docs/energy.md §4a): each error at its Share cell with a hint, one per cause.
#[test]
fn bad_shares_are_errors_at_their_cells_with_a_hint() {
    let cases: [(&str, [Cell; 2], &str, &str); 5] = [
        ("outside", [n(1.2), n(0.25)], "Systems!E2", "outside 0 to 1"),
        (
            "percent",
            [s("120 %"), Cell::E],
            "Systems!E2",
            "outside 0 to 1",
        ),
        ("sum", [n(0.6), n(0.6)], "Systems!E3", "sum to 1.2"),
        ("missing", [n(0.6), Cell::E], "Systems!E2", "but not for B"),
        (
            "not-listed",
            [s("DB: 0.5"), n(0.5)],
            "Systems!E2",
            "does not list",
        ),
    ];
    for (name, shares, cell, words) in cases {
        let found = errors(&header_book(name, "Share", Some(shares)));
        assert_eq!(found.len(), 1, "{name}: {found:?}");
        let (at, message, hint) = &found[0];
        assert_eq!(at, cell, "{name}: {message}");
        assert!(message.contains(words), "{name}: {message}");
        assert!(!hint.is_empty(), "{name}");
    }
}

// Shares rounded to whole percentages pass within the stated tolerance (0.01) and are scaled
// to sum to 1.
#[test]
fn shares_within_the_tolerance_are_scaled_to_one() {
    let shares = Some([s("74.5 %"), s("25 %")]);
    let a = audit(&header_book("rounded", "Share", shares), &Rules::default());
    let s = a.systems[0].shared_lines[0].share + a.systems[1].shared_lines[0].share;
    assert!(rel(s, 1.0) < TOL);
    assert!(rel(a.systems[0].shared_lines[0].share, 0.745 / 0.995) < TOL);
}

// The Systems copy lists each system's share of the header with that share's energy, as number
// cells (worked example 9's figures).
#[test]
fn system_checks_sheet_lists_each_share_as_number_cells() {
    use calamine::{Data, Reader, Xlsx, open_workbook};
    let path = header_book("sheet", "Share", None);
    let out = path.with_file_name("sheet.audit.xlsx");
    let run = std::process::Command::new(env!("CARGO_BIN_EXE_lossledger"))
        .arg("audit")
        .arg(&path)
        .arg("-o")
        .arg(&out)
        .output()
        .unwrap();
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let mut book: Xlsx<_> = open_workbook(&out).unwrap();
    let ws = book.worksheet_range("System checks").unwrap();
    let rows: Vec<(String, f64)> = ws
        .rows()
        .filter_map(|r| match (r.first(), r.get(1)) {
            (Some(Data::String(l)), Some(Data::Float(x))) => Some((l.clone(), *x)),
            _ => None,
        })
        .collect();
    let of =
        |label: &str| -> Vec<f64> { rows.iter().filter(|r| r.0 == label).map(|r| r.1).collect() };
    let shares = of("Share of shared line H");
    assert_eq!(shares.len(), 2);
    assert!(rel(shares[0], 0.6) < 1e-6 && rel(shares[1], 0.4) < 1e-6);
    // Written to six significant figures (report::style::shown).
    let energy = of("Line H energy of this share [kWh/yr]");
    assert!(rel(energy[0], 1_497.095_160_330_298_8) < 1e-5, "{energy:?}");
    assert!(rel(energy[1], 698.644_408_154_139_5) < 1e-5, "{energy:?}");
}
