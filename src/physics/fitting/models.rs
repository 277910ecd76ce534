//! Loss-coefficient correlations (pure `f64`). Each returns K on the bore its doc states.

use super::{FittingError, FittingInput, IN_M, Kind, Model, nominal_inches};
use crate::physics::friction::{colebrook, fully_turbulent};
use std::f64::consts::PI;

/// Reynolds number below which the turbulent-only methods hold f at its Re = 4000 value.
pub const RE_TURBULENT_FLOOR: f64 = 4000.0;

/// Darcy factor used inside the Rennels & Hudson formulas: Colebrook-White at
/// max(Re, 4000) (the formulas are turbulent-flow fits).
fn f_turbulent(re: f64, rel_rough: f64) -> f64 {
    colebrook(re.max(RE_TURBULENT_FLOOR), rel_rough)
}

/// Darby 3-K loss coefficient.
///
/// # Formula
/// `K = K1/Re + Ki (1 + Kd / Dn^0.3)`, Dn nominal size in inches. Re ≤ 0 (no flow): the
/// K1/Re term is dropped (the head loss is zero anyway).
/// # Source
/// Darby, R., "Correlate pressure drops through fittings", Chemical Engineering 106(7),
/// 1999, Table 1; Darby, "Chemical Engineering Fluid Mechanics", 2nd ed., 2001, Table 7-3.
/// # Validity
/// All Re (laminar to fully turbulent), Dn about 1/2..24 in.; outside that the size term is
/// extrapolated.
pub fn darby_3k(k1: f64, ki: f64, kd: f64, re: f64, dn_in: f64) -> f64 {
    let lam = if re > 0.0 { k1 / re } else { 0.0 };
    lam + ki * (1.0 + kd / dn_in.powf(0.3))
}

/// Hooper 2-K loss coefficient.
///
/// # Formula
/// `K = K1/Re + K∞ (1 + 1/D)`, D inside diameter in inches. Re ≤ 0: K1/Re dropped.
/// # Source
/// Hooper, W. B., "The two-K method predicts head losses in pipe fittings", Chemical
/// Engineering 88(17), Aug. 24 1981, p. 96, Table 1.
/// # Validity
/// All Re; D about 1..24 in.
pub fn hooper_2k(k1: f64, kinf: f64, re: f64, d_in_inches: f64) -> f64 {
    let lam = if re > 0.0 { k1 / re } else { 0.0 };
    lam + kinf * (1.0 + 1.0 / d_in_inches)
}

/// Smooth pipe bend of any r/D and angle.
///
/// # Formula
/// `K = f α r/d + (0.10 + 2.4 f) sin(α/2) + 6.6 f (√sin(α/2) + sin(α/2)) / (r/d)^(4α/π)`,
/// α in radians, f the Darcy factor of the line (Colebrook-White with its eps/D, which is the
/// Re and roughness correction). K includes the wall friction of the bend's own length.
/// # Source
/// Rennels, D. C. & Hudson, H. M., "Pipe Flow: A Practical and Comprehensive Guide", Wiley
/// 2012, §15.1 (Eq. 15.1), fitted to Ito (1960) smooth-bend data.
/// # Validity
/// 0 < α ≤ 180°, r/d ≥ 0.5, turbulent Re (f held at its Re = 4000 value below that).
pub fn bend_k(angle_deg: f64, r_d: f64, f: f64) -> f64 {
    let a = angle_deg.to_radians();
    let s = (0.5 * a).sin();
    f * a * r_d + (0.10 + 2.4 * f) * s + 6.6 * f * (s.sqrt() + s) / r_d.powf(4.0 * a / PI)
}

/// Single-joint mitre bend.
///
/// # Formula
/// `K = 0.42 sin(α/2) + 2.56 sin³(α/2)`.
/// # Source
/// Rennels & Hudson, "Pipe Flow", 2012, §15.2 (Eq. 15.2).
/// # Validity
/// 0 < α ≤ 150°, turbulent flow; one joint (multi-joint mitres: use the mitre-90-*weld kinds).
pub fn mitre_k(angle_deg: f64) -> f64 {
    let s = (0.5 * angle_deg.to_radians()).sin();
    0.42 * s + 2.56 * s * s * s
}

/// Sudden expansion (Borda-Carnot), on the smaller (inlet) bore.
///
/// # Formula
/// `K₁ = (1 − β²)²`, β = d_small/d_large.
/// # Source
/// Borda-Carnot momentum balance; Rennels & Hudson 2012, §11.1 (Eq. 11.1).
/// # Validity
/// 0 < β ≤ 1, turbulent flow (laminar losses are higher).
pub fn borda_carnot(beta: f64) -> f64 {
    let r = 1.0 - beta * beta;
    r * r
}

/// Sudden (sharp-edged) contraction, on the smaller (outlet) bore.
///
/// # Formula
/// `λ = 1 + 0.622 (1 − 0.215β² − 0.785β⁵)`, `K₂ = 0.0696 (1 − β⁵) λ² + (λ − 1)²`, β = d₂/d₁.
/// # Source
/// Rennels & Hudson 2012, §12.1 (Eqs. 12.1-12.2).
/// # Validity
/// 0 < β ≤ 1, turbulent flow.
pub fn contraction_square_edged_k(beta: f64) -> f64 {
    let b2 = beta * beta;
    let b5 = b2 * b2 * beta;
    let lbd = 1.0 + 0.622 * (1.0 - 0.215 * b2 - 0.785 * b5);
    0.0696 * (1.0 - b5) * lbd * lbd + (lbd - 1.0) * (lbd - 1.0)
}

/// Rounded contraction, on the smaller (outlet) bore.
///
/// # Formula
/// `λ = 1 + 0.622 (1 − 0.30√(r/d₂) − 0.70 r/d₂)⁴ (1 − 0.215β² − 0.785β⁵)`,
/// `K₂ = 0.0696 (1 − 0.569 r/d₂)(1 − √(r/d₂) β)(1 − β⁵) λ² + (λ − 1)²`.
/// # Source
/// Rennels & Hudson 2012, §12.2 (Eqs. 12.3-12.4).
/// # Validity
/// 0 ≤ r/d₂ ≤ 1 (r/d₂ clamped to 1 above), 0 < β ≤ 1, turbulent flow.
pub fn contraction_radiused_k(beta: f64, r_d2: f64) -> f64 {
    let r = r_d2.clamp(0.0, 1.0);
    let sr = r.sqrt();
    let t = 1.0 - 0.30 * sr - 0.70 * r;
    let b2 = beta * beta;
    let b5 = b2 * b2 * beta;
    let lbd = 1.0 + 0.622 * t.powi(4) * (1.0 - 0.215 * b2 - 0.785 * b5);
    0.0696 * (1.0 - 0.569 * r) * (1.0 - sr * beta) * (1.0 - b5) * lbd * lbd
        + (lbd - 1.0) * (lbd - 1.0)
}

/// Conical contraction, on the smaller (outlet) bore.
///
/// # Formula
/// `K₂ = f(1 − β⁴)/(8 sin(α/2)) + 0.0696 sin(α/2)(1 − β⁵) λ² + (λ − 1)²`,
/// `λ = 1 + 0.622 (α/180°)^0.8 (1 − 0.215β² − 0.785β⁵)`, α the included angle, f at the
/// smaller bore.
/// # Source
/// Rennels & Hudson 2012, §12.3 (Eqs. 12.5-12.7, sharp cone corners).
/// # Validity
/// 0 < α ≤ 180°, 0 < β ≤ 1, turbulent flow.
pub fn contraction_tapered_k(beta: f64, angle_deg: f64, f: f64) -> f64 {
    let a = angle_deg.to_radians();
    let b2 = beta * beta;
    let b4 = b2 * b2;
    let b5 = b4 * beta;
    let lbd = 1.0 + 0.622 * (a / PI).powf(0.8) * (1.0 - 0.215 * b2 - 0.785 * b5);
    let s = (0.5 * a).sin();
    f * (1.0 - b4) / (8.0 * s) + 0.0696 * s * (1.0 - b5) * lbd * lbd + (lbd - 1.0) * (lbd - 1.0)
}

/// Conical diffuser, on the smaller (inlet) bore.
///
/// # Formula
/// With β = d₁/d₂, α the included angle and `F = f(1 − β⁴)/(8 sin(α/2))`:
/// - 0 < α ≤ 20°: `K₁ = 8.30 tan(α/2)^1.75 (1 − β²)² + F`
/// - 20° < α ≤ 60°: `K₁ = {1.366 √sin(2π(α − 15°)/180°) − 0.170 − c} (1 − β²)² + F`,
///   c = 3.28(0.0625 − β⁴)√((α − 20°)/40°) for β < 0.5, else 0
/// - 60° < α ≤ 180°: `K₁ = {1.205 − c} (1 − β²)²`, c = 3.28(0.0625 − β⁴) +
///   12.8β⁶√((α − 60°)/120°) for β < 0.5, else c = 0.20√((α − 60°)/120°)
/// # Source
/// Rennels & Hudson 2012, §11.2 (Eqs. 11.3-11.6).
/// # Validity
/// 0 < α ≤ 180°, 0 < β ≤ 1, turbulent flow, uniform inlet velocity profile.
pub fn expansion_tapered_k(beta: f64, angle_deg: f64, f: f64) -> f64 {
    let a = angle_deg.to_radians();
    let b2 = beta * beta;
    let b4 = b2 * b2;
    let area = (1.0 - b2) * (1.0 - b2);
    let fr = 0.125 * f * (1.0 - b4) / (0.5 * a).sin();
    if angle_deg <= 20.0 {
        8.30 * (0.5 * a).tan().powf(1.75) * area + fr
    } else if angle_deg <= 60.0 {
        let base = 1.366 * (2.0 * PI * (angle_deg - 15.0) / 180.0).sin().sqrt() - 0.170;
        let c = if beta < 0.5 {
            3.28 * (0.0625 - b4) * ((angle_deg - 20.0) / 40.0).sqrt()
        } else {
            0.0
        };
        (base - c) * area + fr
    } else {
        let c = if beta < 0.5 {
            3.28 * (0.0625 - b4) + 12.8 * b4 * b2 * ((angle_deg - 60.0) / 120.0).sqrt()
        } else {
            0.20 * ((angle_deg - 60.0) / 120.0).sqrt()
        };
        (1.205 - c) * area
    }
}

/// Sharp-edged flush entrance.
///
/// # Formula
/// `K = 0.57`.
/// # Source
/// Rennels & Hudson 2012, §9.1 (Fig. 9.1); the older handbook value is 0.5 (Idelchik,
/// "Handbook of Hydraulic Resistance", 3rd ed. 1994, Diagram 3-1).
/// # Validity
/// Turbulent flow, flush-mounted pipe.
pub const ENTRANCE_SHARP_K: f64 = 0.57;

/// Rounded flush entrance.
///
/// # Formula
/// `λ = 1 + 0.622 (1 − 0.30√(r/d) − 0.70 r/d)⁴`, `K = 0.0696 (1 − 0.569 r/d) λ² + (λ − 1)²`;
/// r/d > 1 → 0.03.
/// # Source
/// Rennels & Hudson 2012, §9.2 (Eqs. 9.1-9.2).
/// # Validity
/// 0 ≤ r/d; turbulent flow.
pub fn entrance_radiused_k(r_d: f64) -> f64 {
    if r_d > 1.0 {
        return 0.03;
    }
    let t = 1.0 - 0.30 * r_d.sqrt() - 0.70 * r_d;
    let lbd = 1.0 + 0.622 * t.powi(4);
    0.0696 * (1.0 - 0.569 * r_d) * lbd * lbd + (lbd - 1.0) * (lbd - 1.0)
}

/// Inward-projecting (re-entrant) entrance.
///
/// # Formula
/// `K = 1.12 − 22 (t/d) + 216 (t/d)² + 80 (t/d)³`, t/d clamped to ≤ 0.05 (K → 0.57).
/// # Source
/// Rennels & Hudson 2012, §9.4 (Eq. 9.5).
/// # Validity
/// Pipe projecting at least d/2 into the vessel; 0 ≤ t/d; turbulent flow.
pub fn entrance_projecting_k(t_d: f64) -> f64 {
    let x = t_d.clamp(0.0, 0.05);
    1.12 + x * (x * (80.0 * x + 216.0) - 22.0)
}

/// Roughness of clean commercial steel pipe, 0.0018 in (= 0.04572 m/1000), the roughness the
/// f_T of the foot-valve formulas is defined with.
pub const CLEAN_STEEL_ROUGHNESS_M: f64 = 0.0018 * IN_M;

/// Fully turbulent friction factor f_T of clean commercial steel pipe of bore `d_m`.
///
/// # Formula
/// `f_T = 0.25 / [log₁₀(ε / 3.7 d)]²` with ε = 0.0018 in (the rough limit of Colebrook-White,
/// [`fully_turbulent`]).
/// # Source
/// Flow of Fluids Through Valves, Fittings, and Pipe, Technical Paper No. 410 (a published
/// handbook), Appendix A: the f_T the handbook's K formulas use, defined for clean commercial
/// steel. The handbook also tabulates f_T by nominal size (rounded); the tests compare this
/// closed form with a reference library's fit to that table (within 2 %).
/// # Validity
/// d > 0.
pub fn f_t_clean_steel(d_m: f64) -> f64 {
    fully_turbulent(CLEAN_STEEL_ROUGHNESS_M / d_m)
}

/// Foot valve with strainer, by disc type.
///
/// # Formula
/// `K = n · f_T`, n = 420 for a poppet (lift) disc, 75 for a hinged (swing) disc, f_T from
/// [`f_t_clean_steel`] at the valve's bore; K includes the strainer.
/// # Source
/// Flow of Fluids Through Valves, Fittings, and Pipe, Technical Paper No. 410, foot valves with
/// strainer (poppet disc K = 420 f_T, hinged disc K = 75 f_T).
/// # Validity
/// Turbulent flow with the disc fully lifted: the handbook gives a minimum velocity for that;
/// below it K is higher (the kinds' bands reach 3× for that reason).
pub fn foot_valve_k(n: f64, d_m: f64) -> f64 {
    n * f_t_clean_steel(d_m)
}

/// Chamfered (bevelled) flush entrance.
///
/// # Formula
/// `C_b = (1 − θ/90)(θ/90)^(1/(1 + l/d))`,
/// `λ = 1 + 0.622 [1 − 1.5 C_b (l/d)^((1 − (l/d)^0.25)/2)]`,
/// `K = 0.0696 (1 − C_b l/d) λ² + (λ − 1)²`, θ the bevel angle to the pipe axis.
/// # Source
/// Rennels & Hudson 2012, §9.3 (Eqs. 9.3-9.4).
/// # Validity
/// 0 ≤ θ ≤ 90°, 0 ≤ l/d ≤ 1; turbulent flow.
pub fn entrance_chamfered_k(l_d: f64, angle_deg: f64) -> f64 {
    let cb = (1.0 - angle_deg / 90.0) * (angle_deg / 90.0).powf(1.0 / (1.0 + l_d));
    let lbd = 1.0 + 0.622 * (1.0 - 1.5 * cb * l_d.powf((1.0 - l_d.sqrt().sqrt()) / 2.0));
    0.0696 * (1.0 - cb * l_d) * lbd * lbd + (lbd - 1.0) * (lbd - 1.0)
}

/// Discharge coefficient of a square-edged orifice plate with flange tappings.
///
/// # Formula
/// Reader-Harris/Gallagher (flange tappings L₁ = L₂′ = 25.4 mm/D):
/// ```text
/// C = 0.5961 + 0.0261β² − 0.216β⁸ + 0.000521(10⁶β/Re_D)^0.7
///     + (0.0188 + 0.0063A)β^3.5 (10⁶/Re_D)^0.3
///     + (0.043 + 0.080e^(−10L₁) − 0.123e^(−7L₁))(1 − 0.11A) β⁴/(1 − β⁴)
///     − 0.031(M₂′ − 0.8M₂′^1.1)β^1.3
///     [+ 0.011(0.75 − β)(2.8 − D/25.4 mm) when D < 71.12 mm]
/// A = (19000β/Re_D)^0.8,  M₂′ = 2L₂′/(1 − β)
/// ```
/// # Source
/// ISO 5167-2:2003, §5.3.2.1, Eq. (4).
/// # Validity
/// ISO 5167-2 §5.3.1: 50 ≤ D ≤ 1000 mm, 0.1 ≤ β ≤ 0.75, Re_D ≥ 5000 (β ≤ 0.56) or
/// ≥ 16000β². Re_D below 5000 is raised to 5000; other values are extrapolated.
pub fn orifice_c_rhg_flange(beta: f64, d_m: f64, re_d: f64) -> f64 {
    let re = re_d.max(5000.0);
    let d_mm = d_m * 1000.0;
    let l = 25.4 / d_mm;
    let b2 = beta * beta;
    let b4 = b2 * b2;
    let b8 = b4 * b4;
    let a = (19000.0 * beta / re).powf(0.8);
    let m2 = 2.0 * l / (1.0 - beta);
    let mut c = 0.5961 + 0.0261 * b2 - 0.216 * b8
        + 0.000521 * (1e6 * beta / re).powf(0.7)
        + (0.0188 + 0.0063 * a) * beta.powf(3.5) * (1e6 / re).powf(0.3)
        + (0.043 + 0.080 * (-10.0 * l).exp() - 0.123 * (-7.0 * l).exp()) * (1.0 - 0.11 * a) * b4
            / (1.0 - b4)
        - 0.031 * (m2 - 0.8 * m2.powf(1.1)) * beta.powf(1.3);
    if d_mm < 71.12 {
        c += 0.011 * (0.75 - beta) * (2.8 - d_mm / 25.4);
    }
    c
}

/// Permanent pressure loss of a square-edged orifice plate as K on the pipe bore.
///
/// # Formula
/// Differential (incompressible, ε = 1): `Δp = (ρV²/2)(1 − β⁴)/(C²β⁴)`; loss ratio
/// `Δϖ/Δp = (√(1 − β⁴(1 − C²)) − Cβ²)/(√(1 − β⁴(1 − C²)) + Cβ²)`; `K = Δϖ/(ρV²/2)`, with C
/// from [`orifice_c_rhg_flange`].
/// # Source
/// ISO 5167-1:2003 Eq. (1) (flow equation); ISO 5167-2:2003 §5.4.1 Eq. (7) (pressure loss).
/// # Validity
/// As [`orifice_c_rhg_flange`]; liquids (ε = 1).
pub fn orifice_k_iso5167(beta: f64, d_m: f64, re_d: f64) -> f64 {
    let c = orifice_c_rhg_flange(beta, d_m, re_d);
    let b2 = beta * beta;
    let b4 = b2 * b2;
    let root = (1.0 - b4 * (1.0 - c * c)).sqrt();
    let ratio = (root - c * b2) / (root + c * b2);
    (1.0 - b4) / (c * c * b4) * ratio
}

fn angle_or(input: &FittingInput, default: f64) -> f64 {
    input.angle_deg.unwrap_or(default)
}

fn check_range(
    what: &'static str,
    v: f64,
    lo: f64,
    hi: f64,
    range: &'static str,
) -> Result<f64, FittingError> {
    if v.is_finite() && v >= lo && v <= hi {
        Ok(v)
    } else {
        Err(FittingError::OutOfRange {
            what,
            value: v,
            range,
        })
    }
}

/// Inlet/outlet bores of an area change: (d_small, d_large, expanding?).
fn area_change(kind: &Kind, input: &FittingInput) -> Result<(f64, f64, bool), FittingError> {
    let d_in = input.d_in_m;
    let d_out = input.d_out_m.ok_or(FittingError::Missing {
        id: kind.id,
        what: "the outlet bore (Size out)",
    })?;
    if !(d_out.is_finite() && d_out > 0.0) {
        return Err(FittingError::OutOfRange {
            what: "outlet diameter d_out_m",
            value: d_out,
            range: "finite and > 0",
        });
    }
    Ok((d_in.min(d_out), d_in.max(d_out), d_out > d_in))
}

/// Model K of a kind at full opening (no given values). Inputs are assumed checked by
/// `evaluate` (d_in > 0, Re ≥ 0, eps/D ≥ 0).
pub(super) fn model_k(kind: &Kind, input: &FittingInput) -> Result<f64, FittingError> {
    let re = input.re_in;
    let rr = input.relative_roughness;
    let k = match kind.model {
        Model::Darby3K { k1, ki, kd } => darby_3k(k1, ki, kd, re, nominal_inches(input)),
        Model::Hooper2K { k1, kinf } => hooper_2k(k1, kinf, re, input.d_in_m / IN_M),
        Model::Fixed { k } => k,
        Model::Bend {
            default_r_d,
            default_angle_deg,
        } => {
            let a = check_range(
                "bend angle",
                angle_or(input, default_angle_deg),
                0.0,
                180.0,
                "0..=180 deg",
            )?;
            let r = input.bend_radius_d.unwrap_or(default_r_d);
            let r = check_range("bend r/D", r, 0.5, 1e6, ">= 0.5")?;
            bend_k(a, r, f_turbulent(re, rr))
        }
        Model::Mitre { default_angle_deg } => {
            let a = check_range(
                "mitre angle",
                angle_or(input, default_angle_deg),
                0.0,
                150.0,
                "0..=150 deg",
            )?;
            mitre_k(a)
        }
        Model::SuddenExpansion
        | Model::SuddenContraction
        | Model::RoundedContraction { .. }
        | Model::ConicalDiffuser { .. }
        | Model::ConicalContraction { .. }
        | Model::Reducer { .. } => area_change_k(kind, input)?,
        Model::EntranceSharp => ENTRANCE_SHARP_K,
        Model::EntranceRounded { default_r_d } => {
            let r = input.bend_radius_d.unwrap_or(default_r_d);
            entrance_radiused_k(check_range("entrance r/d", r, 0.0, 1e6, ">= 0")?)
        }
        Model::EntranceProjecting { default_t_d } => {
            let t = input.length_ratio.unwrap_or(default_t_d);
            entrance_projecting_k(check_range("wall t/d", t, 0.0, 1.0, "0..=1")?)
        }
        Model::EntranceBeveled {
            default_l_d,
            default_angle_deg,
        } => {
            let l = check_range(
                "bevel l/d",
                input.length_ratio.unwrap_or(default_l_d),
                0.0,
                1.0,
                "0..=1",
            )?;
            let a = check_range(
                "bevel angle",
                angle_or(input, default_angle_deg),
                0.0,
                90.0,
                "0..=90 deg",
            )?;
            entrance_chamfered_k(l, a)
        }
        Model::Strainer { k_clean } => {
            let m = input.fouling.unwrap_or(1.0);
            k_clean * check_range("fouling multiplier", m, 1.0, 1e6, ">= 1 (1 = clean)")?
        }
        Model::FootValve { n } => {
            let m = input.fouling.unwrap_or(1.0);
            foot_valve_k(n, input.d_in_m)
                * check_range("fouling multiplier", m, 1.0, 1e6, ">= 1 (1 = clean)")?
        }
        Model::OrificePlate => {
            let b = input.beta.ok_or(FittingError::Missing {
                id: kind.id,
                what: "beta (orifice d/D)",
            })?;
            let b = check_range(
                "orifice beta",
                b,
                0.05,
                0.9,
                "0.05..=0.9 (ISO 5167-2: 0.1..0.75)",
            )?;
            orifice_k_iso5167(b, input.d_in_m, re)
        }
        Model::EquivalentLength => {
            return Err(FittingError::Missing {
                id: kind.id,
                what: "Le/D",
            });
        }
        Model::Given => {
            return Err(FittingError::Missing {
                id: kind.id,
                what: "K, Kv, Cv or Le/D",
            });
        }
    };
    Ok(k.max(0.0))
}

/// Area-change K on the smaller bore. Equal bores → 0.
fn area_change_k(kind: &Kind, input: &FittingInput) -> Result<f64, FittingError> {
    let (d_small, d_large, expanding) = area_change(kind, input)?;
    if d_large - d_small <= 1e-12 * d_large {
        return Ok(0.0);
    }
    let beta = d_small / d_large;
    // Reynolds number and eps/D at the smaller bore (same flow: Re ∝ 1/D).
    let re_small = input.re_in * input.d_in_m / d_small;
    let rr_small = input.relative_roughness * input.d_in_m / d_small;
    let d_out = if expanding { d_large } else { d_small };
    let wrong = || FittingError::WrongDirection {
        id: kind.id,
        d_in_m: input.d_in_m,
        d_out_m: d_out,
    };
    let cone = |default: f64| {
        check_range(
            "cone angle",
            angle_or(input, default),
            1e-3,
            180.0,
            "0..=180 deg",
        )
    };
    let k = match kind.model {
        Model::SuddenExpansion => {
            if !expanding {
                return Err(wrong());
            }
            borda_carnot(beta)
        }
        Model::SuddenContraction => {
            if expanding {
                return Err(wrong());
            }
            contraction_square_edged_k(beta)
        }
        Model::RoundedContraction { default_r_d } => {
            if expanding {
                return Err(wrong());
            }
            let r = check_range(
                "r/d2",
                input.bend_radius_d.unwrap_or(default_r_d),
                0.0,
                1e6,
                ">= 0",
            )?;
            contraction_radiused_k(beta, r)
        }
        Model::ConicalDiffuser { default_angle_deg } => {
            if !expanding {
                return Err(wrong());
            }
            expansion_tapered_k(
                beta,
                cone(default_angle_deg)?,
                f_turbulent(re_small, rr_small),
            )
        }
        Model::ConicalContraction { default_angle_deg } => {
            if expanding {
                return Err(wrong());
            }
            contraction_tapered_k(
                beta,
                cone(default_angle_deg)?,
                f_turbulent(re_small, rr_small),
            )
        }
        Model::Reducer { default_angle_deg } => {
            let a = cone(default_angle_deg)?;
            let f = f_turbulent(re_small, rr_small);
            if expanding {
                expansion_tapered_k(beta, a, f)
            } else {
                contraction_tapered_k(beta, a, f)
            }
        }
        _ => 0.0,
    };
    Ok(k)
}
