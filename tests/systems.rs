//! Systems: required head against the hand-worked two-line example of docs/energy.md, the
//! system curve recomputed per flow, the operating point, NPSH available at two temperatures
//! against the iapws fixtures, the NPSH margin rule and the suction-layout checks.

use lossledger::audit::Rules;
use lossledger::audit::system::{CurvePoint, npsh_available, npsh_needed, operating_point};
use lossledger::error::Severity;
use std::path::PathBuf;

mod common;
use common::book::{Cell, Table, book, n, s};
use common::facts::G;
use common::library::audit;
use common::tol::{REL_TOL_EXACT, REL_TOL_SAME_ARITHMETIC, rel};

fn two_line_book(name: &str) -> PathBuf {
    book(
        name,
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]", "Temperature [°C]"],
                vec![
                    vec![s("S1"), s("pump-suction"), n(144.0), n(20.0)],
                    vec![s("D1"), s("pump-discharge"), n(144.0), n(20.0)],
                ],
            ),
            (
                "Pipes",
                &["Line", "Inner diameter [mm]", "Length [m]", "C factor"],
                vec![
                    vec![s("S1"), n(200.0), n(10.0), n(120.0)],
                    vec![s("D1"), n(150.0), n(200.0), n(120.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item", "K"],
                vec![
                    vec![s("S1-K"), s("S1"), Cell::E, n(0.5)],
                    vec![s("D1-K"), s("D1"), Cell::E, n(5.0)],
                ],
            ),
            (
                "Systems",
                &["System", "Lines", "Static head [m]", "Pump head [m]"],
                vec![vec![s("Two"), s("S1, D1"), n(12.0), n(21.0)]],
            ),
        ],
    )
}

// Source: docs/energy.md, worked example 2 (hand-worked with Hazen–Williams and given K).
#[test]
fn two_line_system_matches_the_hand_worked_example() {
    let a = audit(&two_line_book("two-line"), &Rules::default());
    let line = |id: &str| a.lines.iter().find(|l| l.line == id).unwrap();
    assert!(rel(line("S1").friction_head_m, 0.098_355_661_767_8) < REL_TOL_SAME_ARITHMETIC);
    assert!(rel(line("S1").fittings_head_m, 0.041_327_541_471_3) < REL_TOL_SAME_ARITHMETIC);
    assert!(rel(line("D1").friction_head_m, 7.986_030_844_55) < REL_TOL_SAME_ARITHMETIC);
    assert!(rel(line("D1").fittings_head_m, 1.306_154_397_12) < REL_TOL_SAME_ARITHMETIC);
    let s = &a.systems[0];
    assert_eq!(s.lines, vec!["S1", "D1"]);
    assert!(
        rel(s.required_head_m, 21.431_868_444_9) < REL_TOL_SAME_ARITHMETIC,
        "{}",
        s.required_head_m
    );
    assert!(
        rel(s.margin_m.unwrap(), -0.431_868_444_9) < 1e-8,
        "{:?}",
        s.margin_m
    );
    assert!(s.fails_duty);
    let f = a
        .findings
        .iter()
        .find(|f| f.code == "pump-head-short")
        .expect("pump-head-short raised");
    assert_eq!(f.severity, Severity::Error);
    // The curve's duty point is the required head; zero flow is the static head.
    let duty = s
        .curve
        .iter()
        .find(|p| rel(p.flow_m3_s, s.flow_m3_s) < REL_TOL_EXACT)
        .unwrap();
    assert!(rel(duty.head_m, s.required_head_m) < REL_TOL_EXACT);
    assert_eq!(s.curve[0].head_m, 12.0);
    assert_eq!(s.curve.len(), 14);
    assert!(rel(s.curve[13].flow_m3_s, 1.3 * s.flow_m3_s) < REL_TOL_EXACT);
}

// A viscous liquid (Fluids sheet) turbulent at duty (Re 6000) and laminar at 10 % (Re 600).
// Expected laminar head: Hagen–Poiseuille h = 32 μ L v / (ρ g D²) (White, Fluid Mechanics,
// ch. 6, from memory), which no Q² scaling of the duty loss reproduces.
#[test]
fn system_curve_recomputes_friction_per_flow_across_a_regime_change() {
    let (rho, mu, d, l) = (900.0, 0.05, 0.1, 40.0);
    let v_duty = 6000.0 * mu / (rho * d);
    let q_duty = v_duty * std::f64::consts::PI * d * d / 4.0;
    let path = book(
        "regime",
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/s]", "Fluid"],
                vec![vec![
                    s("OIL"),
                    s("pump-discharge"),
                    n(q_duty),
                    s("light oil"),
                ]],
            ),
            (
                "Pipes",
                &[
                    "Line",
                    "Inner diameter [mm]",
                    "Length [m]",
                    "Roughness [mm]",
                ],
                vec![vec![s("OIL"), n(100.0), n(l), n(0.0)]],
            ),
            (
                "Fluids",
                &["Fluid", "Density [kg/m3]", "Viscosity [Pa.s]"],
                vec![vec![s("light oil"), n(rho), n(mu)]],
            ),
            (
                "Systems",
                &["System", "Lines", "Static head [m]"],
                vec![vec![s("OilSys"), s("OIL"), n(5.0)]],
            ),
        ],
    );
    let a = audit(&path, &Rules::default());
    let s = &a.systems[0];
    let duty_losses = s.losses_head_m;
    let p10 = s.curve[1];
    let v10 = 0.1 * v_duty;
    let hagen_poiseuille = 32.0 * mu * l * v10 / (rho * G * d * d);
    assert!(
        rel(p10.head_m - 5.0, hagen_poiseuille) < REL_TOL_SAME_ARITHMETIC,
        "{} vs {hagen_poiseuille}",
        p10.head_m - 5.0
    );
    let q2_scaled = 0.01 * duty_losses;
    assert!(
        (p10.head_m - 5.0) > 2.0 * q2_scaled,
        "laminar loss {} must differ from Q² scaling {}",
        p10.head_m - 5.0,
        q2_scaled
    );
    assert!(
        s.curve.windows(2).all(|w| w[1].head_m > w[0].head_m),
        "the curve rises with flow"
    );
}

// Analytic check: a straight pump curve H = 40 − 2000 Q against H = 10 + 5000 Q² meets at the
// positive root of 5000 Q² + 2000 Q − 30 = 0 (quadratic formula).
#[test]
fn operating_point_is_the_intersection() {
    let pump = [
        CurvePoint {
            flow_m3_s: 0.0,
            head_m: 40.0,
        },
        CurvePoint {
            flow_m3_s: 0.02,
            head_m: 0.0,
        },
    ];
    let op = operating_point(&pump, |q| 10.0 + 5000.0 * q * q).unwrap();
    let q = (-2000.0 + (2000.0f64 * 2000.0 + 4.0 * 5000.0 * 30.0).sqrt()) / (2.0 * 5000.0);
    assert!(
        rel(op.flow_m3_s, q) < REL_TOL_SAME_ARITHMETIC,
        "{} vs {q}",
        op.flow_m3_s
    );
    assert!(rel(op.head_m, 10.0 + 5000.0 * q * q) < REL_TOL_SAME_ARITHMETIC);
    assert!(
        operating_point(&pump, |_| 50.0).is_none(),
        "no crossing above the shut-off head"
    );
}

#[test]
fn a_pump_curve_sheet_gives_the_pump_head_and_the_operating_point() {
    let sheets: Vec<Table<'_>> = vec![
        (
            "Lines",
            &["Line", "Service", "Flow [m3/h]", "System"],
            vec![
                vec![s("D1"), s("pump-discharge"), n(144.0), s("Curve")],
                vec![s("S1"), s("pump-suction"), n(144.0), s("Curve")],
            ],
        ),
        (
            "Pipes",
            &["Line", "Inner diameter [mm]", "Length [m]", "C factor"],
            vec![
                vec![s("S1"), n(200.0), n(10.0), n(120.0)],
                vec![s("D1"), n(150.0), n(200.0), n(120.0)],
            ],
        ),
        (
            "Pump curve",
            &["System", "Flow [m3/h]", "Head [m]"],
            vec![
                vec![s("Curve"), n(0.0), n(30.0)],
                vec![s("Curve"), n(100.0), n(28.0)],
                vec![s("Curve"), n(200.0), n(20.0)],
                vec![s("Curve"), n(300.0), n(0.0)],
            ],
        ),
    ];
    let a = audit(&book("curve", &sheets), &Rules::default());
    let s = &a.systems[0];
    assert_eq!(
        s.lines,
        vec!["S1", "D1"],
        "suction lines come first when the order is taken from Lines"
    );
    // 144 m3/h lies 44 % of the way from 100 to 200 m3/h: 28 − 0.44 × 8 = 24.48 m (linear interpolation).
    assert!(rel(s.pump_head_m.unwrap(), 24.48) < REL_TOL_EXACT);
    let op = s.operating_point.expect("the curves cross");
    assert!(
        op.flow_m3_s > s.flow_m3_s,
        "the pump head exceeds the requirement at duty, so the pump runs out along its curve"
    );
    assert_eq!(s.static_head_m, 0.0, "no static head given anywhere");
    assert!(op.flow_m3_s > 200.0 / 3600.0 && op.flow_m3_s < 300.0 / 3600.0);
    // At the crossing, the pump curve's head (20 − 0.2 per m3/h above 200 m3/h) equals the system's.
    let pump_at = 20.0 - 0.2 * (op.flow_m3_s * 3600.0 - 200.0);
    assert!(rel(op.head_m, pump_at) < 1e-8, "{} vs {pump_at}", op.head_m);
}

fn fixture_water(t: f64) -> (f64, f64) {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/fixtures/reference/water_iapws.csv"
    ))
    .unwrap();
    for l in text.lines().skip(1) {
        let v: Vec<f64> = l.split(',').map(|x| x.parse().unwrap()).collect();
        if (v[0] - t).abs() < 1e-9 {
            return (v[1], v[3]);
        }
    }
    panic!("no fixture row at {t} °C");
}

// Source: fixtures/reference/water_iapws.csv (iapws 1.5.5, IAPWS97 density and saturation
// pressure) and docs/energy.md worked example 3 (hand-worked).
#[test]
fn npsh_available_at_two_temperatures_matches_the_worked_example() {
    let (rho20, pv20) = fixture_water(20.0);
    let (rho80, pv80) = fixture_water(80.0);
    assert!(
        rel(
            npsh_available(101_325.0, pv20, rho20, 2.0, 0.5),
            11.611_880_784_8
        ) < REL_TOL_SAME_ARITHMETIC
    );
    assert!(
        rel(
            npsh_available(101_325.0, pv80, rho80, 2.0, 0.5),
            7.156_824_718_51
        ) < REL_TOL_SAME_ARITHMETIC
    );
    // Margin rule: max(1.1 × 6.0, 6.0 + 0.6) = 6.6 m (docs/energy.md §5).
    assert!(rel(npsh_needed(6.0, 1.1, 0.6), 6.6) < REL_TOL_EXACT);
    assert!(rel(npsh_needed(10.0, 1.1, 0.6), 11.0) < REL_TOL_EXACT);
}

fn npsh_book(name: &str, t: f64, npshr: f64, level: f64) -> PathBuf {
    book(
        name,
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]", "Temperature [°C]"],
                vec![
                    vec![s("S"), s("pump-suction"), n(60.0), n(t)],
                    vec![s("D"), s("pump-discharge"), n(60.0), n(t)],
                ],
            ),
            (
                "Pipes",
                &["Line", "Size", "Schedule", "Length [m]"],
                vec![
                    vec![s("S"), s("DN150"), s("40"), n(6.0)],
                    vec![s("D"), s("DN100"), s("40"), n(30.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item"],
                vec![
                    vec![s("S-EN"), s("S"), s("entrance-square-edged")],
                    vec![s("S-V"), s("S"), s("valve-gate")],
                ],
            ),
            (
                "Systems",
                &[
                    "System",
                    "Lines",
                    "Static head [m]",
                    "NPSH required [m]",
                    "Suction level [m]",
                ],
                vec![vec![s("N"), s("S, D"), n(10.0), n(npshr), n(level)]],
            ),
        ],
    )
}

#[test]
fn npsh_available_through_an_audit_uses_the_water_model_at_each_temperature() {
    for t in [20.0, 80.0] {
        let a = audit(
            &npsh_book(&format!("npsh-{t}"), t, 2.0, 2.0),
            &Rules::default(),
        );
        let (rho, pv) = fixture_water(t);
        let s = &a.systems[0];
        let losses = a.lines.iter().find(|l| l.line == "S").unwrap().total_head_m;
        let expected = (101_325.0 - pv) / (rho * G) + 2.0 - losses;
        assert!(
            rel(s.npsh_available_m.unwrap(), expected) < 1e-6,
            "{t} °C: {:?} vs {expected}",
            s.npsh_available_m
        );
    }
}

#[test]
fn npsh_margin_is_a_warning_inside_the_margin_and_an_error_below_npshr() {
    let a = audit(&npsh_book("npsh-ok", 20.0, 2.0, 2.0), &Rules::default());
    let npsha = a.systems[0].npsh_available_m.unwrap();
    assert!(!a.findings.iter().any(|f| f.code == "npsh-margin"));
    // NPSHr just under NPSHa: inside the 0.6 m margin, still above NPSHr.
    let b = audit(
        &npsh_book("npsh-thin", 20.0, npsha - 0.3, 2.0),
        &Rules::default(),
    );
    let f = b
        .findings
        .iter()
        .find(|f| f.code == "npsh-margin")
        .expect("thin margin flagged");
    assert_eq!(f.severity, Severity::Warning);
    assert!(b.systems[0].fails_npsh);
    let c = audit(
        &npsh_book("npsh-short", 20.0, npsha + 0.5, 2.0),
        &Rules::default(),
    );
    assert_eq!(
        c.findings
            .iter()
            .find(|f| f.code == "npsh-margin")
            .unwrap()
            .severity,
        Severity::Error
    );
}

// ISO 2533 / US Standard Atmosphere 1976 at 1000 m geometric: about 89 876 Pa (from memory).
#[test]
fn a_site_elevation_lowers_npsh_available() {
    let sea = audit(&npsh_book("sea", 20.0, 2.0, 2.0), &Rules::default());
    let high = audit(
        &npsh_book("high", 20.0, 2.0, 2.0),
        &Rules::from_toml("[npsh]\nsite_elevation_m = 1000.0\n", "t").unwrap(),
    );
    let (rho, _) = fixture_water(20.0);
    let drop = sea.systems[0].npsh_available_m.unwrap() - high.systems[0].npsh_available_m.unwrap();
    let expected = (101_325.0 - 89_876.0) / (rho * G);
    assert!(
        (drop - expected).abs() < 10.0 / (rho * G),
        "{drop} vs {expected}"
    );
}

/// A suction line S (of `suction_size`, its fittings listed in `order`) feeding a DN100
/// discharge line D, as one system.
fn layout_book(
    name: &str,
    suction_size: &'static str,
    order: [(&'static str, &'static str); 2],
) -> PathBuf {
    book(
        name,
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]"],
                vec![
                    vec![s("S"), s("pump-suction"), n(40.0)],
                    vec![s("D"), s("pump-discharge"), n(40.0)],
                ],
            ),
            (
                "Pipes",
                &["Line", "Size", "Schedule", "Length [m]"],
                vec![
                    vec![s("S"), s(suction_size), s("40"), n(4.0)],
                    vec![s("D"), s("DN100"), s("40"), n(30.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item"],
                order
                    .iter()
                    .map(|&(tag, item)| vec![s(tag), s("S"), s(item)])
                    .collect(),
            ),
            (
                "Systems",
                &["System", "Lines", "Static head [m]"],
                vec![vec![s("L"), s("S, D"), n(5.0)]],
            ),
        ],
    )
}

#[test]
fn suction_layout_flags_an_elbow_at_the_pump_and_a_small_suction_bore() {
    let path = layout_book(
        "layout",
        "DN80",
        [("S-V", "valve-gate"), ("S-E", "elbow-90")],
    );
    let a = audit(&path, &Rules::default());
    let hits: Vec<_> = a
        .findings
        .iter()
        .filter(|f| f.code == "suction-layout")
        .collect();
    assert_eq!(hits.len(), 2, "{hits:?}");
    assert!(hits.iter().any(|f| f.tag.as_deref() == Some("S-E")));
    assert!(hits.iter().any(|f| f.message.contains("smaller")));
    // With the elbow first and the valve last, only the bore is flagged.
    let path = layout_book(
        "layout-ok",
        "DN100",
        [("S-E", "elbow-90"), ("S-V", "valve-gate")],
    );
    let b = audit(&path, &Rules::default());
    assert!(
        !b.findings.iter().any(|f| f.code == "suction-layout"),
        "{:?}",
        b.findings
    );
}

/// Worked example 4 of docs/energy.md: the two-line system of example 2 (duty 144 m3/h) on a
/// straight pump curve through 31.326937729133 m at zero flow and 21.326937729133 m at
/// 360 m3/h, which crosses the system curve at 180 m3/h; NPSH required 3.0 m at 144 m3/h and
/// `npshr_360` at 360 m3/h on the Pump curve; suction level 2.0 m; `elevation` in a Site
/// elevation column when given.
fn operating_book(name: &str, npshr_360: f64, elevation: Option<f64>) -> PathBuf {
    operating_book_in(name, npshr_360, elevation, ("NPSHr [m]", 1.0))
}

/// [`operating_book`] with the Pump curve's NPSH required column under `header`, its values
/// in metres divided by `m_per_unit`.
fn operating_book_in(
    name: &str,
    npshr_360: f64,
    elevation: Option<f64>,
    (header, m_per_unit): (&'static str, f64),
) -> PathBuf {
    let mut sys_headers = vec!["System", "Lines", "Static head [m]", "Suction level [m]"];
    let mut sys_row = vec![s("Two"), s("S1, D1"), n(12.0), n(2.0)];
    if let Some(z) = elevation {
        sys_headers.push("Site elevation [m]");
        sys_row.push(n(z));
    }
    let sys_headers: &'static [&'static str] = Box::leak(sys_headers.into_boxed_slice());
    book(
        name,
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]", "Temperature [°C]"],
                vec![
                    vec![s("S1"), s("pump-suction"), n(144.0), n(20.0)],
                    vec![s("D1"), s("pump-discharge"), n(144.0), n(20.0)],
                ],
            ),
            (
                "Pipes",
                &["Line", "Inner diameter [mm]", "Length [m]", "C factor"],
                vec![
                    vec![s("S1"), n(200.0), n(10.0), n(120.0)],
                    vec![s("D1"), n(150.0), n(200.0), n(120.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item", "K"],
                vec![
                    vec![s("S1-K"), s("S1"), Cell::E, n(0.5)],
                    vec![s("D1-K"), s("D1"), Cell::E, n(5.0)],
                ],
            ),
            ("Systems", sys_headers, vec![sys_row]),
            (
                "Pump curve",
                Box::leak(vec!["System", "Flow [m3/h]", "Head [m]", header].into_boxed_slice()),
                vec![
                    vec![s("Two"), n(0.0), n(31.326_937_729_133), Cell::E],
                    vec![
                        s("Two"),
                        n(144.0),
                        n(27.326_937_729_133),
                        n(3.0 / m_per_unit),
                    ],
                    vec![
                        s("Two"),
                        n(360.0),
                        n(21.326_937_729_133),
                        n(npshr_360 / m_per_unit),
                    ],
                ],
            ),
        ],
    )
}

// Source: docs/energy.md worked example 4 (hand-worked: Hazen–Williams SI form, given K with its
// ±10 % band, water at 20 °C from fixtures/reference/water_iapws.csv, iapws 1.5.5).
#[test]
fn npsh_at_the_operating_point_with_high_band_suction_losses_matches_worked_example_4() {
    const TOL: f64 = 1e-9;
    let a = audit(&operating_book("op-npsh", 6.0, None), &Rules::default());
    let s = &a.systems[0];
    let op = s.operating_point.expect("the curves cross");
    assert!(rel(op.flow_m3_s, 0.05) < TOL, "{}", op.flow_m3_s);
    assert!(rel(op.head_m, 26.326_937_729_133_4) < TOL, "{}", op.head_m);
    let duty = s.npsh_at_duty.as_ref().unwrap();
    assert!(rel(duty.suction_losses_m, 0.139_683_203_239_088) < TOL);
    assert!(rel(duty.suction_losses_high_m, 0.143_815_957_386_216) < TOL);
    assert!(rel(duty.available_nominal_m, 11.972_197_581_530_8) < TOL);
    assert!(rel(duty.available_m, 11.968_064_827_383_7) < TOL);
    assert_eq!(
        duty.required_m,
        Some(3.0),
        "NPSHr from the Pump curve at 144 m3/h"
    );
    assert!(rel(duty.needed_m.unwrap(), 3.6) < REL_TOL_EXACT);
    let at = s.npsh_at_operating_point.as_ref().unwrap();
    assert!(rel(at.flow_m3_s, 0.05) < TOL);
    assert!(rel(at.suction_losses_m, 0.213_262_553_706_234) < TOL);
    assert!(rel(at.suction_losses_high_m, 0.219_719_982_061_122) < TOL);
    assert!(
        rel(at.available_nominal_m, 11.898_618_231_063_7) < TOL,
        "{}",
        at.available_nominal_m
    );
    assert!(
        rel(at.available_m, 11.892_160_802_708_8) < TOL,
        "{}",
        at.available_m
    );
    // NPSHr on the curve: 3.0 + (180 − 144)/(360 − 144) × (6.0 − 3.0) = 3.5 m; margin rule
    // max(1.1 × 3.5, 3.5 + 0.6) = 4.1 m.
    assert!(rel(at.required_m.unwrap(), 3.5) < TOL);
    assert!(rel(at.needed_m.unwrap(), 4.1) < TOL);
    assert!(!s.fails_npsh);
    assert_eq!(s.verdict, "passes the checks made");
}

#[test]
fn npsh_can_fail_at_the_operating_point_alone() {
    // NPSHr 63 m at 360 m3/h: 3.0 + 36/216 × 60 = 13.0 m at 180 m3/h, more than the 11.89 m
    // available there, while the duty point (3.0 m against 11.97 m) passes.
    let a = audit(&operating_book("op-fail", 63.0, None), &Rules::default());
    let s = &a.systems[0];
    assert!(!s.npsh_at_duty.as_ref().unwrap().fails);
    assert!(s.npsh_at_operating_point.as_ref().unwrap().fails);
    assert_eq!(s.verdict, "FAILS NPSH margin at the operating point");
    let f: Vec<_> = a
        .findings
        .iter()
        .filter(|f| f.code == "npsh-margin")
        .collect();
    assert_eq!(f.len(), 1, "{f:?}");
    assert_eq!(f[0].severity, Severity::Error, "below NPSHr itself");
    assert!(f[0].message.contains("operating point"), "{}", f[0].message);
}

fn atmosphere_fixture(z: f64) -> f64 {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/fixtures/reference/atmosphere_1976.csv"
    ))
    .unwrap();
    text.lines()
        .skip(1)
        .map(|l| {
            let v: Vec<f64> = l.split(',').map(|x| x.parse().unwrap()).collect();
            (v[0], v[1])
        })
        .find(|(zz, _)| (zz - z).abs() < 1e-9)
        .map(|(_, p)| p)
        .unwrap_or_else(|| panic!("no fixture row at {z} m"))
}

// Sources: fixtures/reference/atmosphere_1976.csv (fluids 1.3.1 ATMOSPHERE_1976, the U.S.
// Standard Atmosphere 1976, identical to ISO 2533:1975 below 32 km): 101 325 Pa at 0 m and
// 84 559.68 Pa at 1 500 m geometric. ISO 2533 table, 1 500 m geopotential: 84 556 Pa (from
// memory); 1 500 m geometric is 1 499.65 m geopotential, hence the few pascals between them.
#[test]
fn site_elevation_column_at_0_and_1500_m_uses_the_standard_atmosphere() {
    let (rho, _) = fixture_water(20.0);
    let sea = audit(&operating_book("z0", 6.0, Some(0.0)), &Rules::default());
    let high = audit(
        &operating_book("z1500", 6.0, Some(1500.0)),
        &Rules::default(),
    );
    let p = |a: &lossledger::audit::Audit| a.systems[0].npsh_terms.unwrap().source_pressure_pa;
    assert_eq!(p(&sea), atmosphere_fixture(0.0));
    assert!(
        rel(p(&high), atmosphere_fixture(1500.0)) < REL_TOL_SAME_ARITHMETIC,
        "{}",
        p(&high)
    );
    assert!(
        (p(&high) - 84_556.0).abs() < 10.0,
        "ISO 2533 table, from memory"
    );
    assert_eq!(high.systems[0].site_elevation_basis, "Systems sheet");
    // The Control column is blank too: that mark is the only one (station energy, its own test).
    assert!(
        sea.systems[0]
            .assumed
            .iter()
            .all(|a| a.key == "system" && a.what.to_string().starts_with("control")),
        "0 m was given, not assumed"
    );
    // NPSH available drops by Δp/(ρg): about 1.7 m at 1 500 m, at duty and operating point.
    let drop = (atmosphere_fixture(0.0) - atmosphere_fixture(1500.0)) / (rho * G);
    assert!((drop - 1.71).abs() < 0.01, "{drop}");
    for (a, b) in [
        (
            sea.systems[0].npsh_at_duty.as_ref().unwrap().available_m,
            high.systems[0].npsh_at_duty.as_ref().unwrap().available_m,
        ),
        (
            sea.systems[0]
                .npsh_at_operating_point
                .as_ref()
                .unwrap()
                .available_m,
            high.systems[0]
                .npsh_at_operating_point
                .as_ref()
                .unwrap()
                .available_m,
        ),
    ] {
        assert!(
            rel(a - b, drop) < REL_TOL_SAME_ARITHMETIC,
            "{} vs {drop}",
            a - b
        );
    }
}

#[test]
fn a_blank_site_elevation_is_assumed_sea_level_and_listed_among_the_defaults() {
    let a = audit(&operating_book("z-none", 6.0, None), &Rules::default());
    let s = &a.systems[0];
    assert_eq!(s.site_elevation_m, 0.0);
    let site: Vec<_> = s
        .assumed
        .iter()
        .filter(|a| !a.what.to_string().starts_with("control"))
        .collect();
    assert_eq!(site.len(), 1, "the system's cell is marked assumed");
    assert!(site[0].what.contains("site elevation 0 m"));
    assert!(
        s.defaults.iter().any(|d| d.contains("site elevation 0 m"))
            && s.defaults.iter().any(|d| d.contains("101.325 kPa")),
        "{:?}",
        s.defaults
    );
}

#[test]
fn a_missing_static_head_is_a_warning_and_the_verdict_says_so() {
    let path = book(
        "no-static",
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]"],
                vec![vec![s("D1"), s("pump-discharge"), n(100.0)]],
            ),
            (
                "Pipes",
                &["Line", "Size", "Length [m]"],
                vec![vec![s("D1"), s("DN150"), n(50.0)]],
            ),
            (
                "Systems",
                &["System", "Lines", "Pump head [m]"],
                vec![vec![s("NoLift"), s("D1"), n(30.0)]],
            ),
        ],
    );
    let a = audit(&path, &Rules::default());
    let s = &a.systems[0];
    assert!(!s.static_head_given);
    assert_eq!(s.verdict, "static head not given");
    assert!(!s.verdict.contains("passes"));
    let f = a
        .findings
        .iter()
        .find(|f| f.code == "static-head-missing")
        .expect("static-head-missing raised");
    assert_eq!(f.severity, Severity::Warning);
    assert_eq!(f.cell.as_ref().unwrap().to_string(), "Systems!A2");
}

// The Pump curve's NPSH required column answers to its aliases and reads units: NPSH3 in ft
// (1 ft = 0.3048 m exactly, NIST SP 811 B.8) gives the metres of worked example 4.
#[test]
fn npsh_required_on_the_pump_curve_reads_aliases_and_units() {
    let a = audit(
        &operating_book_in("op-ft", 6.0, None, ("NPSH3 [ft]", 0.3048)),
        &Rules::default(),
    );
    let s = &a.systems[0];
    assert!(rel(s.npsh_required_m.unwrap(), 3.0) < REL_TOL_EXACT);
    let at = s.npsh_at_operating_point.as_ref().unwrap();
    assert!(
        rel(at.required_m.unwrap(), 3.5) < REL_TOL_SAME_ARITHMETIC,
        "{:?}",
        at.required_m
    );
    assert_eq!(at.required_basis, "Pump curve at the operating point");
}

#[test]
fn a_site_elevation_outside_the_atmosphere_range_is_an_error_at_its_cell() {
    let path = operating_book("z-bad", 6.0, Some(9000.0));
    let input = lossledger::ingest::read_path(&path).unwrap();
    let d = input
        .diagnostics
        .iter()
        .find(|d| d.severity == Severity::Error)
        .expect("an error");
    assert_eq!(d.cell.as_ref().unwrap().to_string(), "Systems!E2");
    assert!(d.message.contains("site elevation"), "{}", d.message);
    assert!(lossledger::audit::run(&input, &Rules::default()).is_err());
}
