//! Water properties and standard atmosphere against external references.
//!
//! Fixture: fixtures/reference/water_iapws.csv, written by scripts/reference/water.py with
//! iapws 1.5.5 (IAPWS97(T, P=0.101325).rho and .mu, IAPWS97(T, x=0).P, IAPWS95(T, P).rho).

use lossledger::physics::fluid::{
    FluidError, WATER_T_MAX_C, WATER_T_MIN_C, atmospheric_pressure_pa, water,
};

mod common;
use common::csv::numbers;
use common::tol::rel;

const WATER_CSV: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/fixtures/reference/water_iapws.csv"
));

struct Row {
    t_c: f64,
    density: f64,
    viscosity: f64,
    vapour_pressure: f64,
    density_iapws95: f64,
}

fn rows() -> Vec<Row> {
    numbers(
        WATER_CSV,
        "t_c,density_kg_m3,viscosity_pa_s,vapour_pressure_pa,density_iapws95_kg_m3",
    )
    .into_iter()
    .map(|v| Row {
        t_c: v[0],
        density: v[1],
        viscosity: v[2],
        vapour_pressure: v[3],
        density_iapws95: v[4],
    })
    .collect()
}

#[test]
fn fixture_covers_the_range() {
    let r = rows();
    assert!(r.len() >= 99, "{} rows", r.len());
    assert_eq!(r.first().map(|x| x.t_c), Some(WATER_T_MIN_C));
    assert_eq!(r.last().map(|x| x.t_c), Some(WATER_T_MAX_C));
}

/// Source: iapws 1.5.5, IAPWS97(T=t+273.15, P=0.101325).rho (IAPWS-IF97 region 1).
/// Tolerance 0.01 %.
#[test]
fn density_matches_iapws_if97() {
    let mut worst = 0.0_f64;
    for row in rows() {
        let p = water(row.t_c).expect("in range");
        let e = rel(p.density_kg_m3, row.density);
        worst = worst.max(e);
        assert!(
            e < 1e-4,
            "t={} rho={} ref={}",
            row.t_c,
            p.density_kg_m3,
            row.density
        );
    }
    eprintln!("density worst relative error vs iapws IAPWS97: {worst:e}");
}

/// Source: iapws 1.5.5, IAPWS95(T=t+273.15, P=0.101325).rho (IAPWS-95 scientific formulation;
/// IF97 is fitted to it, stated consistency well within 0.01 % in this region).
#[test]
fn density_matches_iapws95() {
    for row in rows() {
        let p = water(row.t_c).expect("in range");
        let e = rel(p.density_kg_m3, row.density_iapws95);
        assert!(
            e < 1e-4,
            "t={} rho={} ref={}",
            row.t_c,
            p.density_kg_m3,
            row.density_iapws95
        );
    }
}

/// Source: iapws 1.5.5, IAPWS97(T=t+273.15, P=0.101325).mu, i.e. iapws._iapws._Viscosity
/// (IAPWS 2008 viscosity formulation) at the IF97 density. Tolerance 0.1 %.
/// Also guards the unit: seuif97 must give Pa·s (water at 20 °C is about 1.0e-3 Pa·s).
#[test]
fn viscosity_matches_iapws_2008() {
    let mut worst = 0.0_f64;
    for row in rows() {
        let p = water(row.t_c).expect("in range");
        let e = rel(p.viscosity_pa_s, row.viscosity);
        worst = worst.max(e);
        assert!(
            e < 1e-3,
            "t={} mu={} ref={}",
            row.t_c,
            p.viscosity_pa_s,
            row.viscosity
        );
    }
    eprintln!("viscosity worst relative error vs iapws: {worst:e}");
}

/// Source: iapws 1.5.5, IAPWS97(T=t+273.15, x=0).P (IF97 region 4), MPa -> Pa.
/// Tolerance 0.05 %.
#[test]
fn vapour_pressure_matches_iapws_if97() {
    let mut worst = 0.0_f64;
    for row in rows() {
        let p = water(row.t_c).expect("in range");
        let e = rel(p.vapour_pressure_pa, row.vapour_pressure);
        worst = worst.max(e);
        assert!(
            e < 5e-4,
            "t={} psat={} ref={}",
            row.t_c,
            p.vapour_pressure_pa,
            row.vapour_pressure
        );
    }
    eprintln!("vapour pressure worst relative error vs iapws: {worst:e}");
}

/// Source: IAPWS R7-97(2012), Table 35 (verification values of the saturation-pressure
/// equation): T = 300 K -> p_s = 0.353658941e-2 MPa (the same value is in seuif97 2.3.8's own
/// test data, tests/common/mod.rs `r4_sat_Tp`).
#[test]
fn vapour_pressure_matches_if97_verification_table() {
    let p = water(300.0 - 273.15).expect("in range");
    assert!(
        rel(p.vapour_pressure_pa, 3536.58941) < 1e-8,
        "{}",
        p.vapour_pressure_pa
    );
}

/// Source: IAPWS R6-95 / R7-97: triple-point pressure 611.657 Pa at 273.16 K.
#[test]
fn vapour_pressure_at_triple_point() {
    let p = water(WATER_T_MIN_C).expect("in range");
    assert!(
        (p.vapour_pressure_pa - 611.657).abs() < 0.01,
        "{}",
        p.vapour_pressure_pa
    );
}

#[test]
fn out_of_range_is_an_error() {
    for t in [
        0.0,
        0.009,
        99.0001,
        100.0,
        -20.0,
        250.0,
        f64::INFINITY,
        f64::NEG_INFINITY,
    ] {
        match water(t) {
            Err(FluidError::OutOfRange { t_c }) => assert_eq!(t_c, t),
            other => panic!("t={t}: {other:?}"),
        }
    }
    assert!(matches!(
        water(f64::NAN),
        Err(FluidError::OutOfRange { t_c }) if t_c.is_nan()
    ));
    assert!(water(WATER_T_MIN_C).is_ok());
    assert!(water(WATER_T_MAX_C).is_ok());
}

#[test]
fn error_message_names_the_temperature() {
    let msg = water(120.0).unwrap_err().to_string();
    assert!(msg.contains("120"), "{msg}");
}

/// Source: U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562), Table I, pressure by geometric
/// altitude, printed to 5 significant figures (values from memory of the table). Tolerance is
/// half a unit in the fifth figure.
#[test]
fn atmosphere_matches_standard_table_by_geometric_altitude() {
    let table = [
        (0.0_f64, 1.01325e5_f64),
        (-500.0, 1.07478e5),
        (500.0, 9.5461e4),
        (1000.0, 8.9876e4),
        (2000.0, 7.9501e4),
        (3000.0, 7.0121e4),
        (5000.0, 5.4048e4),
        (11_000.0, 2.2700e4),
        (20_000.0, 5.5293e3),
    ];
    for (z, p_ref) in table {
        let p = atmospheric_pressure_pa(z);
        // Half a unit in the fifth significant figure.
        let tol = 0.5 * 10f64.powf(p_ref.log10().floor() - 4.0);
        assert!(
            (p - p_ref).abs() <= tol,
            "z={z} p={p} ref={p_ref} tol={tol}"
        );
    }
}

/// Source: ISO 2533:1975 / ICAO standard atmosphere, pressure by geopotential altitude H:
/// 1000 m -> 89 874.6 Pa, 2000 m -> 79 495.2 Pa, 5000 m -> 54 019.9 Pa, 11 000 m -> 22 632.1 Pa
/// (values from memory of the table). The geometric elevation giving geopotential H is
/// z = r H / (r - H), r = 6 356 766 m (ISO 2533 / US 1976 Eq. 18).
#[test]
fn atmosphere_matches_standard_table_by_geopotential_altitude() {
    let r = 6_356_766.0;
    for (h, p_ref) in [
        (1000.0, 89_874.6),
        (2000.0, 79_495.2),
        (5000.0, 54_019.9),
        (11_000.0, 22_632.1),
    ] {
        let z = r * h / (r - h);
        let p = atmospheric_pressure_pa(z);
        assert!((p - p_ref).abs() < 0.1, "H={h} p={p} ref={p_ref}");
    }
}

#[test]
fn atmosphere_decreases_with_elevation() {
    let mut last = f64::INFINITY;
    for i in -20..=200 {
        let p = atmospheric_pressure_pa(f64::from(i) * 100.0);
        assert!(p.is_finite() && p > 0.0 && p < last, "i={i} p={p}");
        last = p;
    }
}
