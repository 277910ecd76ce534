//! Friction factors and head losses against external references.
//!
//! Fixtures written by scripts/reference/friction.py with fluids 1.3.1:
//! * friction_colebrook.csv: fluids.friction.friction_factor(Re, eD, Method='Colebrook')
//!   (Lambert-W closed form) and fluids.friction.Colebrook(Re, eD, tol=1e-14) (secant solve);
//! * friction_rough.csv: fluids.friction.Colebrook(1e20, eD, tol=1e-14) and
//!   friction_factor(1e12, eD, Method='Colebrook');
//! * friction_head.csv: fluids.core.Reynolds and fluids.core.head_from_K(K_from_f(...)).

use lossledger::physics::friction::{
    Friction, FrictionError, RE_LAMINAR_MAX, RE_TURBULENT_MIN, Regime, colebrook, darcy_friction,
    darcy_weisbach_head, fully_turbulent, hazen_williams_head, reynolds, try_darcy_friction,
};
use proptest::prelude::*;

mod common;
use common::csv::numbers;
use common::facts::G;
use common::tol::{REL_TOL_SAME_ARITHMETIC, rel};

const COLEBROOK_CSV: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/fixtures/reference/friction_colebrook.csv"
));
const ROUGH_CSV: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/fixtures/reference/friction_rough.csv"
));
const HEAD_CSV: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/fixtures/reference/friction_head.csv"
));

/// Source: fluids 1.3.1 friction_factor(Re, eD, Method='Colebrook') and
/// Colebrook(Re, eD, tol=1e-14); 21 Re 4e3..1e8 x 7 eD 0..0.05. Tolerance 1e-9 relative
/// (the two fluids paths agree with each other to 3e-14).
#[test]
fn colebrook_matches_fluids_grid() {
    let rows = numbers(COLEBROOK_CSV, "re,relative_roughness,f_fluids,f_secant");
    assert_eq!(rows.len(), 21 * 7);
    let mut worst = 0.0_f64;
    for r in &rows {
        let (re, ed, f_lambert, f_secant) = (r[0], r[1], r[2], r[3]);
        let f = colebrook(re, ed);
        let e = rel(f, f_lambert).max(rel(f, f_secant));
        worst = worst.max(e);
        assert!(
            e < 1e-9,
            "Re={re} eD={ed} f={f} fluids={f_lambert} secant={f_secant}"
        );
        let by_regime = darcy_friction(re, ed);
        assert_eq!(by_regime.regime, Regime::Turbulent, "Re={re}");
        assert_eq!(by_regime.factor, f);
    }
    eprintln!("colebrook worst relative error vs fluids: {worst:e}");
}

/// Source: Hagen-Poiseuille laminar law f = 64/Re (e.g. White, Fluid Mechanics, ch. 6);
/// fluids 1.3.1 friction_laminar gives the same closed form.
#[test]
fn laminar_is_64_over_re() {
    for re in [1e-3, 1.0, 10.0, 500.0, 1234.5, 1999.9, RE_LAMINAR_MAX] {
        for ed in [0.0, 1e-4, 0.05] {
            let f = darcy_friction(re, ed);
            assert_eq!(f.regime, Regime::Laminar);
            assert!(rel(f.factor, 64.0 / re) < 1e-15, "Re={re}");
        }
    }
    assert_eq!(darcy_friction(2000.0, 0.0).factor, 0.032);
}

#[test]
fn no_flow_gives_zero_factor() {
    for re in [0.0, -0.0, -1.0, -5e5, f64::NAN, f64::NEG_INFINITY] {
        assert_eq!(
            darcy_friction(re, 1e-4),
            Friction {
                factor: 0.0,
                regime: Regime::Laminar
            },
            "Re={re}"
        );
    }
}

/// Transition endpoints: at 2000 the laminar value 64/2000 = 0.032; approaching 4000 from
/// below, the Colebrook value at Re = 4000 (fluids 1.3.1 friction_factor(4000, eD,
/// Method='Colebrook'), first grid row of friction_colebrook.csv); in between, between them.
#[test]
fn transition_interpolates_between_endpoints() {
    let rows = numbers(COLEBROOK_CSV, "re,relative_roughness,f_fluids,f_secant");
    let at_4000: Vec<(f64, f64)> = rows
        .iter()
        .filter(|r| (r[0] - 4000.0).abs() < 1e-6)
        .map(|r| (r[1], r[2]))
        .collect();
    assert_eq!(at_4000.len(), 7);
    for (ed, f4000) in at_4000 {
        let lo = darcy_friction(2000.0 + 1e-6, ed);
        assert_eq!(lo.regime, Regime::Transition);
        assert!(rel(lo.factor, 0.032) < 1e-8, "eD={ed} {lo:?}");
        let hi = darcy_friction(RE_TURBULENT_MIN - 1e-6, ed);
        assert_eq!(hi.regime, Regime::Transition);
        assert!(rel(hi.factor, f4000) < 1e-8, "eD={ed} {hi:?} ref={f4000}");
        let at = darcy_friction(RE_TURBULENT_MIN, ed);
        assert_eq!(at.regime, Regime::Turbulent);
        assert!(rel(at.factor, f4000) < REL_TOL_SAME_ARITHMETIC);
        // Linear in Re: the midpoint is the mean of the endpoint values.
        let mid = darcy_friction(3000.0, ed);
        assert!(
            rel(mid.factor, 0.5 * (0.032 + f4000)) < REL_TOL_SAME_ARITHMETIC,
            "eD={ed} {mid:?}"
        );
        let quarter = darcy_friction(2500.0, ed);
        assert!(rel(quarter.factor, 0.75 * 0.032 + 0.25 * f4000) < REL_TOL_SAME_ARITHMETIC);
    }
}

/// Source: fluids 1.3.1 Colebrook(1e20, eD, tol=1e-14) - Colebrook-White at Re = 1e20, the
/// fully rough limit to ~1e-12. Tolerance 1e-10 relative.
#[test]
fn fully_turbulent_matches_colebrook_at_huge_re() {
    let rows = numbers(ROUGH_CSV, "relative_roughness,f_re1e20,f_re1e12");
    assert_eq!(rows.len(), 7);
    for r in &rows {
        let (ed, f20) = (r[0], r[1]);
        let f = fully_turbulent(ed);
        assert!(rel(f, f20) < 1e-10, "eD={ed} f={f} ref={f20}");
    }
}

/// Source: fluids 1.3.1 friction_factor(1e12, eD, Method='Colebrook'). At Re = 1e12 the
/// viscous term still lifts f above the rough limit by up to ~1.6e-5 relative (eD = 1e-6),
/// so the tolerance is 2e-5 and the finite-Re value must not be below the limit.
#[test]
fn fully_turbulent_is_the_high_re_limit_of_fluids_colebrook() {
    for r in &numbers(ROUGH_CSV, "relative_roughness,f_re1e20,f_re1e12") {
        let (ed, f12) = (r[0], r[2]);
        let f = fully_turbulent(ed);
        assert!(rel(f, f12) < 2e-5, "eD={ed} f={f} ref={f12}");
        assert!(f <= f12 * (1.0 + 1e-12), "eD={ed}");
        // Our own Colebrook solve tends to the same limit.
        assert!(
            rel(colebrook(1e12, ed), f12) < REL_TOL_SAME_ARITHMETIC,
            "eD={ed}"
        );
        assert_eq!(colebrook(f64::INFINITY, ed), f);
    }
}

/// Source: Nikuradse (1933) rough-pipe law as given by von Karman / Prandtl,
/// 1/sqrt(f) = 1.14 - 2 log10(eD) (constant 1.14 vs 2 log10(3.7) = 1.1364 in Colebrook's form).
/// Tolerance 0.2 % (the rounding of that constant).
#[test]
fn fully_turbulent_matches_nikuradse_rough_law() {
    for ed in [1e-6, 1e-5, 1e-4, 4.6e-4, 1e-3, 1e-2, 0.033, 0.05] {
        let x: f64 = 1.14 - 2.0 * f64::log10(ed);
        let f_nik = 1.0 / (x * x);
        assert!(rel(fully_turbulent(ed), f_nik) < 2e-3, "eD={ed}");
    }
    assert_eq!(fully_turbulent(0.0), 0.0);
    assert!(fully_turbulent(-1e-3).is_nan());
    assert!(fully_turbulent(f64::NAN).is_nan());
}

#[test]
fn colebrook_smooth_and_extreme_inputs_are_finite() {
    for re in [1.0, 100.0, 4e3, 1e5, 1e9, 1e12, 1e15, 1e300] {
        for ed in [0.0, 1e-12, 1e-6, 0.01, 0.1, 0.5, 1.0, 3.0] {
            let f = colebrook(re, ed);
            assert!(f.is_finite() && f > 0.0, "Re={re} eD={ed} f={f}");
            // The returned f satisfies the Colebrook-White equation to 1e-12.
            let x = 1.0 / f.sqrt();
            let rhs = -2.0 * (ed / 3.7 + 2.51 / (re * f.sqrt())).log10();
            assert!(
                ((x - rhs) / x).abs() < 1e-12,
                "Re={re} eD={ed} x={x} rhs={rhs}"
            );
        }
    }
    for (re, ed) in [
        (0.0, 1e-4),
        (-1e5, 1e-4),
        (f64::NAN, 1e-4),
        (1e5, -1e-4),
        (1e5, f64::NAN),
        (1e5, 3.7),
        (1e5, f64::INFINITY),
    ] {
        assert!(colebrook(re, ed).is_nan(), "Re={re} eD={ed}");
    }
}

#[test]
fn try_darcy_friction_rejects_bad_inputs() {
    assert!(matches!(
        try_darcy_friction(f64::NAN, 1e-4),
        Err(FrictionError::InvalidReynolds { .. })
    ));
    assert!(matches!(
        try_darcy_friction(-10.0, 1e-4),
        Err(FrictionError::InvalidReynolds { re }) if re == -10.0
    ));
    assert!(matches!(
        try_darcy_friction(1e5, -1e-4),
        Err(FrictionError::InvalidRoughness { .. })
    ));
    assert!(matches!(
        try_darcy_friction(1e5, f64::NAN),
        Err(FrictionError::InvalidRoughness { .. })
    ));
    assert_eq!(try_darcy_friction(0.0, 1e-4).map(|f| f.factor), Ok(0.0));
    assert_eq!(try_darcy_friction(1e5, 1e-4), Ok(darcy_friction(1e5, 1e-4)));
}

/// Source: fluids 1.3.1 fluids.core.Reynolds(V, D, rho, mu) and
/// fluids.core.head_from_K(K_from_f(fd, L, D), V) (Darcy-Weisbach).
#[test]
fn reynolds_and_darcy_weisbach_match_fluids() {
    let rows = numbers(
        HEAD_CSV,
        "density_kg_m3,velocity_m_s,diameter_m,viscosity_pa_s,factor,length_m,re_fluids,head_fluids_m",
    );
    assert!(rows.len() >= 5);
    for r in &rows {
        let (rho, v, d, mu, f, len, re_ref, head_ref) =
            (r[0], r[1], r[2], r[3], r[4], r[5], r[6], r[7]);
        assert!(rel(reynolds(rho, v, d, mu), re_ref) < 1e-13, "{r:?}");
        assert!(
            rel(darcy_weisbach_head(f, len, d, v), head_ref) < 1e-13,
            "{r:?}"
        );
        assert!(
            rel(darcy_weisbach_head(f, len, d, -v), head_ref) < 1e-13,
            "{r:?}"
        );
    }
}

/// Independent form: Williams & Hazen (1920), Hydraulic Tables, velocity form in feet and
/// seconds, V = 1.318 C R^0.63 S^0.54 (R = D/4). Inverted for S and converted with
/// 1 ft = 0.3048 m (NIST SP 811). The SI head-loss form rounds the coefficient (10.67) and
/// exponents (1.852 for 1/0.54 = 1.85185), so agreement is to about 0.3 %; tolerance 0.5 %.
#[test]
fn hazen_williams_matches_original_velocity_form() {
    const FT: f64 = 0.3048;
    let mut worst = 0.0_f64;
    for c in [80.0_f64, 100.0, 120.0, 130.0, 150.0] {
        for d_m in [0.05, 0.1023, 0.2, 0.5, 1.0] {
            for v_m_s in [0.3, 1.0, 2.5] {
                let q_m3_s = v_m_s * std::f64::consts::PI * d_m * d_m / 4.0;
                let r_ft = d_m / 4.0 / FT;
                let v_ft_s = v_m_s / FT;
                let slope = (v_ft_s / (1.318 * c * r_ft.powf(0.63))).powf(1.0 / 0.54);
                let length_m = 250.0;
                let h = hazen_williams_head(length_m, q_m3_s, c, d_m);
                let e = rel(h, slope * length_m);
                worst = worst.max(e);
                assert!(
                    e < 5e-3,
                    "C={c} D={d_m} v={v_m_s} h={h} ref={}",
                    slope * length_m
                );
                assert_eq!(hazen_williams_head(length_m, -q_m3_s, c, d_m), h);
            }
        }
    }
    eprintln!("Hazen-Williams SI vs 1.318 velocity form worst: {worst:e}");
}

/// Independent form: US customary Hazen-Williams pressure-loss form used in sprinkler
/// standards (NFPA 13), p = 4.52 Q^1.85 / (C^1.85 d^4.87) psi per foot, Q in US gpm, d in
/// inches (from memory). Converted with 1 US gal = 3.785411784e-3 m3, 1 in = 0.0254 m,
/// 1 psi = 6894.757 Pa (NIST SP 811) and water at 999 kg/m3 (about 15 °C). Exponent rounding
/// (1.85 vs 1.852) makes the forms differ by about 0.5 % here; tolerance 1 %.
#[test]
fn hazen_williams_matches_us_psi_per_foot_form() {
    const GAL: f64 = 3.785411784e-3;
    const IN: f64 = 0.0254;
    const FT: f64 = 0.3048;
    const PSI: f64 = 6894.757293168361;
    let rho_g = 999.0 * G;
    let mut worst = 0.0_f64;
    for c in [100.0_f64, 120.0, 140.0] {
        for (d_in, q_gpm) in [
            (2.067_f64, 50.0_f64),
            (4.026, 250.0),
            (6.065, 500.0),
            (8.071, 1000.0),
            (10.02, 1500.0),
        ] {
            let psi_per_ft = 4.52 * q_gpm.powf(1.85) / (c.powf(1.85) * f64::powf(d_in, 4.87));
            let head_per_m_ref = psi_per_ft * PSI / FT / rho_g;
            let q_m3_s = q_gpm * GAL / 60.0;
            let h = hazen_williams_head(1.0, q_m3_s, c, d_in * IN);
            let e = rel(h, head_per_m_ref);
            worst = worst.max(e);
            assert!(
                e < 1e-2,
                "C={c} d={d_in} Q={q_gpm} h={h} ref={head_per_m_ref}"
            );
        }
    }
    eprintln!("Hazen-Williams SI vs US psi/ft form worst: {worst:e}");
}

proptest! {
    #[test]
    fn colebrook_is_finite_and_positive(log_re in 3.60206f64..9.0, ed in 0.0f64..=0.1) {
        let re = 10f64.powf(log_re);
        let f = colebrook(re, ed);
        prop_assert!(f.is_finite() && f > 0.0, "Re={} eD={} f={}", re, ed, f);
        let x = 1.0 / f.sqrt();
        let rhs = -2.0 * (ed / 3.7 + 2.51 / (re * f.sqrt())).log10();
        prop_assert!(((x - rhs) / x).abs() < 1e-12);
    }

    #[test]
    fn colebrook_decreases_with_re(log_re in 3.60206f64..9.0, step in 0.01f64..2.0, ed in 0.0f64..=0.1) {
        let re1 = 10f64.powf(log_re);
        let re2 = re1 * (1.0 + step);
        prop_assert!(colebrook(re2, ed) < colebrook(re1, ed), "Re {} -> {} eD={}", re1, re2, ed);
    }

    #[test]
    fn colebrook_increases_with_roughness(log_re in 3.60206f64..9.0, ed in 0.0f64..=0.1, step in 0.001f64..1.0) {
        let re = 10f64.powf(log_re);
        let ed2 = ed * (1.0 + step) + 1e-6;
        prop_assert!(colebrook(re, ed2) > colebrook(re, ed), "Re={} eD {} -> {}", re, ed, ed2);
    }

    #[test]
    fn darcy_friction_never_nan(re in -1e3f64..1e10, ed in 0.0f64..=0.1) {
        let f = darcy_friction(re, ed);
        prop_assert!(f.factor.is_finite() && f.factor >= 0.0);
    }
}
