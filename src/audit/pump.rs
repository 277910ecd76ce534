//! Pump-set energy arithmetic: the theoretical minimum energy to lift water, specific energy and
//! wire-to-water efficiency, the best-efficiency point of a curve, the affinity laws against a
//! system curve with static head, the fixed-speed operating point with a loss removed, and the
//! present value of a saving.
//!
//! Pure functions, checked against the hand-worked examples 5 to 8 of `docs/energy.md`.

use serde::Serialize;

use super::system::{CurvePoint, interpolate, operating_point};
use crate::physics::G;

/// Joules in one kWh (1 kWh = 1000 W × 3600 s).
pub const J_PER_KWH: f64 = 3.6e6;

/// Theoretical minimum energy to lift one m³ of liquid by one metre, kWh/(m³·m).
///
/// # Formula
/// `e_min = ρ g / 3.6e6` (the potential energy ρ g H of one m³ raised H metres, in kWh).
///
/// # Source
/// ISO/ASME 14414:2019, pump system energy assessment, and ASME EA-2, which define wire-to-water
/// efficiency against this hydraulic minimum (from memory); the arithmetic is the definition of
/// potential energy. About 0.002 724 kWh/(m³·m) at 1000 kg/m³.
///
/// # Validity
/// Any liquid of density ρ; the head is the total head the pump adds.
pub fn minimum_specific_energy(density_kg_m3: f64) -> f64 {
    density_kg_m3 * G / J_PER_KWH
}

/// Specific energy from one period's meter readings, kWh/m³: `E / V`.
///
/// # Validity
/// Energy and volume of the same period; None unless the volume is above zero and the energy
/// zero or more.
pub fn specific_energy(energy_kwh: f64, volume_m3: f64) -> Option<f64> {
    (energy_kwh.is_finite() && energy_kwh >= 0.0 && volume_m3.is_finite() && volume_m3 > 0.0)
        .then(|| energy_kwh / volume_m3)
}

/// Specific energy at a test point, kWh/m³: electrical input power over flow,
/// `P / (Q · 3.6e6)` (W over m³/s is J/m³).
///
/// # Validity
/// Power and flow measured together; None unless both are above zero.
pub fn test_specific_energy(power_w: f64, flow_m3_s: f64) -> Option<f64> {
    (power_w.is_finite() && power_w > 0.0 && flow_m3_s.is_finite() && flow_m3_s > 0.0)
        .then(|| power_w / (flow_m3_s * J_PER_KWH))
}

/// Wire-to-water efficiency: the theoretical minimum energy over the measured specific energy.
///
/// # Formula
/// `η_ww = (ρ g / 3.6e6) · H / e`, with `e` in kWh/m³ and H the pump's total head in m; at a test
/// point this equals `ρ g Q H / P`.
///
/// # Source
/// ISO/ASME 14414 and ASME EA-2 (from memory).
///
/// # Validity
/// None unless the specific energy is above zero; a result above 1 means the figures cannot all
/// be right (the caller reports it as an input error).
pub fn wire_to_water(density_kg_m3: f64, head_m: f64, specific_energy_kwh_m3: f64) -> Option<f64> {
    (specific_energy_kwh_m3.is_finite() && specific_energy_kwh_m3 > 0.0)
        .then(|| minimum_specific_energy(density_kg_m3) * head_m / specific_energy_kwh_m3)
}

/// Present value of a saving received at the end of each year for `years` years.
///
/// # Formula
/// `PV = S · (1 − (1 + i)^−n) / i`, and `PV = S · n` when `i = 0` (the uniform-series present
/// worth factor).
///
/// # Source
/// Hydraulic Institute and Europump, *Pump Life Cycle Costs: A Guide to LCC Analysis for Pumping
/// Systems* (2001), which discounts each year's energy cost to its present value (from memory).
///
/// # Validity
/// A constant yearly saving; `years` may be fractional (the formula is used as is).
pub fn present_value(annual: f64, years: f64, rate: f64) -> f64 {
    if rate == 0.0 {
        annual * years
    } else {
        annual * (1.0 - (1.0 + rate).powf(-years)) / rate
    }
}

/// The best-efficiency point of a pump curve.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct BestEfficiency {
    /// Best-efficiency flow, m³/s.
    pub flow_m3_s: f64,
    /// Head at that flow (pump curve, linear between points), m.
    pub head_m: f64,
    /// Pump efficiency there, fraction.
    pub efficiency: f64,
    /// True when the highest efficiency is at an end of the points given (the true best may lie
    /// beyond them).
    pub at_end_of_points: bool,
}

/// Best-efficiency point from efficiency points sorted by flow and the head curve.
///
/// # Formula
/// The highest point; when it has a neighbour on each side, the vertex of the parabola through
/// the three: `Q* = Q2 − ½ [(Q2−Q1)²(η2−η3) − (Q2−Q3)²(η2−η1)] / [(Q2−Q1)(η2−η3) − (Q2−Q3)(η2−η1)]`,
/// `η*` the parabola's value there.
///
/// # Source
/// Three-point parabolic interpolation of an extremum (e.g. Press et al., *Numerical Recipes*,
/// 3rd ed., §10.3, from memory).
///
/// # Validity
/// At least one efficiency point; the head comes from the head curve at `Q*` (None outside it).
pub fn best_efficiency(eff: &[CurvePoint], head: &[CurvePoint]) -> Option<BestEfficiency> {
    let (i, top) = eff
        .iter()
        .enumerate()
        .max_by(|a, b| a.1.head_m.total_cmp(&b.1.head_m))?;
    let (mut q, mut e) = (top.flow_m3_s, top.head_m);
    let interior = i > 0 && i + 1 < eff.len();
    if interior {
        let (a, b, c) = (eff[i - 1], eff[i], eff[i + 1]);
        let (x1, y1, x2, y2, x3, y3) = (
            a.flow_m3_s,
            a.head_m,
            b.flow_m3_s,
            b.head_m,
            c.flow_m3_s,
            c.head_m,
        );
        let num = (x2 - x1).powi(2) * (y2 - y3) - (x2 - x3).powi(2) * (y2 - y1);
        let den = (x2 - x1) * (y2 - y3) - (x2 - x3) * (y2 - y1);
        if den != 0.0 {
            q = x2 - 0.5 * num / den;
            // Lagrange form of the parabola through the three points, at q.
            e = y1 * (q - x2) * (q - x3) / ((x1 - x2) * (x1 - x3))
                + y2 * (q - x1) * (q - x3) / ((x2 - x1) * (x2 - x3))
                + y3 * (q - x1) * (q - x2) / ((x3 - x1) * (x3 - x2));
        }
    }
    Some(BestEfficiency {
        flow_m3_s: q,
        head_m: interpolate(head, q)?,
        efficiency: e,
        at_end_of_points: !interior,
    })
}

/// Speed ratio at which a pump delivers `flow_m3_s` against `head_m`, by the affinity laws.
///
/// # Formula
/// The pump curve at speed ratio r is `H_r(Q) = r² H_1(Q / r)` (each point moves along
/// `Q ∝ r`, `H ∝ r²`); r solves `r² H_1(Q/r) = H` by bisection to 1e-12, for r with `Q/r` on the
/// given curve and r ≤ 1.5. Against a system curve with static head the head to meet is the
/// system's at the same flow, so r is not `Q'/Q` (that holds only with no static head).
///
/// # Source
/// The affinity laws for a change of speed (e.g. ANSI/HI 14.3 and the HI/Europump LCC guide, from
/// memory); their use against a system curve with static head as in ISO/ASME 14414 (from memory).
///
/// # Validity
/// Speed changes that keep the pump's flow in the range of its curve; efficiency is taken as
/// moving with the point (`η_r(Q) = η_1(Q/r)`), fair down to about 70 % speed.
pub fn speed_ratio(pump: &[CurvePoint], flow_m3_s: f64, head_m: f64) -> Option<f64> {
    let (lo, hi) = (pump.first()?.flow_m3_s, pump.last()?.flow_m3_s);
    if hi <= 0.0 || flow_m3_s <= 0.0 {
        return None;
    }
    let r_min = flow_m3_s / hi;
    let r_max = if lo > 0.0 {
        (flow_m3_s / lo).min(1.5)
    } else {
        1.5
    };
    let gap = |r: f64| interpolate(pump, flow_m3_s / r).map(|h| r * r * h - head_m);
    bisect(gap, r_min, r_max)
}

/// A root of `f` in `[lo, hi]`: the first sign change on a 200-step scan, then bisection to
/// 1e-12 relative.
fn bisect(f: impl Fn(f64) -> Option<f64>, lo: f64, hi: f64) -> Option<f64> {
    if hi.partial_cmp(&lo) != Some(std::cmp::Ordering::Greater) {
        return None;
    }
    const STEPS: usize = 200;
    let (mut a, mut fa) = (lo, f(lo)?);
    for i in 1..=STEPS {
        let b = lo + (hi - lo) * i as f64 / STEPS as f64;
        let Some(fb) = f(b) else { continue };
        if fa == 0.0 {
            return Some(a);
        }
        if fa.signum() != fb.signum() || fb == 0.0 {
            return refine(&f, a, fa, b, 1e-12);
        }
        (a, fa) = (b, fb);
    }
    None
}

/// Bisection of `f` on `[a, b]` where `f(a) = fa` and `f(b)` has the other sign (or is 0), to
/// `tol` relative.
fn refine(f: &impl Fn(f64) -> Option<f64>, a: f64, fa: f64, b: f64, tol: f64) -> Option<f64> {
    let (mut x0, mut x1, mut f0) = (a, b, fa);
    while (x1 - x0) > tol * x1.abs().max(1e-12) {
        let m = 0.5 * (x0 + x1);
        let fm = f(m)?;
        if fm == 0.0 {
            return Some(m);
        }
        if fm.signum() == f0.signum() {
            (x0, f0) = (m, fm);
        } else {
            x1 = m;
        }
    }
    Some(0.5 * (x0 + x1))
}

/// The system head at 201 flows spread over the pump curve's range, computed once per system so
/// that [`resolved_point_on`] can bracket each suggestion's operating point without
/// recomputing the whole curve.
pub fn scan_grid(pump: &[CurvePoint], system_head: impl Fn(f64) -> f64) -> Vec<CurvePoint> {
    let (Some(first), Some(last)) = (pump.first(), pump.last()) else {
        return Vec::new();
    };
    let (lo, hi) = (first.flow_m3_s, last.flow_m3_s);
    (0..=200)
        .map(|i| {
            let q = lo + (hi - lo) * i as f64 / 200.0;
            CurvePoint {
                flow_m3_s: q,
                head_m: system_head(q),
            }
        })
        .collect()
}

/// [`resolved_point`] bracketed on a precomputed [`scan_grid`] of the same system, then bisected
/// to 1e-10 relative in flow on the system head itself: the same point, some seven times fewer
/// system-curve evaluations.
pub fn resolved_point_on(
    pump: &[CurvePoint],
    grid: &[CurvePoint],
    system_head: impl Fn(f64) -> f64,
    removed_head_m: f64,
    duty_m3_s: f64,
) -> Option<CurvePoint> {
    if duty_m3_s <= 0.0 {
        return None;
    }
    let removed = |q: f64| removed_head_m * (q / duty_m3_s).powi(2);
    let gap_at = |p: &CurvePoint| {
        interpolate(pump, p.flow_m3_s).map(|h| h - p.head_m + removed(p.flow_m3_s))
    };
    let gap = |q: f64| interpolate(pump, q).map(|h| h - system_head(q) + removed(q));
    let mut prev: Option<(f64, f64)> = None;
    for p in grid {
        let g = gap_at(p)?;
        if let Some((a, ga)) = prev
            && (ga.signum() != g.signum() || g == 0.0)
        {
            let q = refine(&gap, a, ga, p.flow_m3_s, 1e-10)?;
            return Some(CurvePoint {
                flow_m3_s: q,
                head_m: system_head(q) - removed(q),
            });
        }
        if g == 0.0 {
            return Some(CurvePoint {
                flow_m3_s: p.flow_m3_s,
                head_m: p.head_m - removed(p.flow_m3_s),
            });
        }
        prev = Some((p.flow_m3_s, g));
    }
    None
}

/// Where a fixed-speed pump runs once a loss is removed.
///
/// # Formula
/// The pump curve meets `H_sys(Q) − Δh · (Q / Q_d)²`: the removed loss Δh (at duty flow Q_d) is
/// taken to scale with the square of the flow, as a fitting's K-type loss in turbulent flow does.
///
/// # Source
/// Velocity-head form of a fitting loss, h = K v²/2g (Crane TP-410, from memory); the operating
/// point as in [`operating_point`].
///
/// # Validity
/// Within the pump curve's flow range; the rest of the system curve is recomputed at each flow.
pub fn resolved_point(
    pump: &[CurvePoint],
    system_head: impl Fn(f64) -> f64,
    removed_head_m: f64,
    duty_m3_s: f64,
) -> Option<CurvePoint> {
    if duty_m3_s <= 0.0 {
        return None;
    }
    operating_point(pump, |q| {
        system_head(q) - removed_head_m * (q / duty_m3_s).powi(2)
    })
}

/// Hydraulic power over wire-to-water efficiency, W: `ρ g Q H / η`.
pub fn input_power_w(density_kg_m3: f64, flow_m3_s: f64, head_m: f64, efficiency: f64) -> f64 {
    density_kg_m3 * G * flow_m3_s * head_m / efficiency
}

#[cfg(test)]
mod tests {
    use super::*;

    // Uniform-series present worth with i = 10 %, n = 2: 1/1.1 + 1/1.21 = 1.735537190… (the
    // discounting definition, hand-worked).
    #[test]
    fn present_value_discounts_each_year() {
        let pv = present_value(100.0, 2.0, 0.1);
        assert!((pv - 100.0 * (1.0 / 1.1 + 1.0 / 1.21)).abs() < 1e-9, "{pv}");
        assert_eq!(present_value(100.0, 15.0, 0.0), 1500.0);
    }

    // The grid-bracketed re-solve finds the root of the same quadratic as worked example 8:
    // 2400 Q² + 200 Q − 20 = 0 (quadratic formula).
    #[test]
    fn grid_bracketed_re_solve_agrees_with_the_quadratic_root() {
        let pump = [
            CurvePoint {
                flow_m3_s: 0.0,
                head_m: 35.0,
            },
            CurvePoint {
                flow_m3_s: 0.1,
                head_m: 15.0,
            },
        ];
        let sys = |q: f64| 15.0 + 4000.0 * q * q;
        let grid = scan_grid(&pump, sys);
        let p = resolved_point_on(&pump, &grid, sys, 4.0, 0.05).unwrap();
        let q = (-200.0 + 232_000.0f64.sqrt()) / 4800.0;
        assert!((p.flow_m3_s / q - 1.0).abs() < 1e-9, "{p:?}");
        assert!((p.head_m / (35.0 - 200.0 * q) - 1.0).abs() < 1e-9);
    }

    #[test]
    fn refuses_impossible_meter_figures() {
        assert_eq!(specific_energy(-1.0, 10.0), None);
        assert_eq!(specific_energy(1.0, 0.0), None);
        assert_eq!(test_specific_energy(0.0, 0.01), None);
        assert_eq!(wire_to_water(1000.0, 10.0, 0.0), None);
    }

    // A parabola η = 0.8 − 20 (Q − 0.055)² sampled at 0.03, 0.05 and 0.09 has its vertex at
    // 0.055 m³/s, 0.8 (the parabola's own vertex).
    #[test]
    fn best_efficiency_is_the_vertex_through_three_points() {
        let eta = |q: f64| 0.8 - 20.0 * (q - 0.055f64).powi(2);
        let eff: Vec<CurvePoint> = [0.03, 0.05, 0.09]
            .iter()
            .map(|&q| CurvePoint {
                flow_m3_s: q,
                head_m: eta(q),
            })
            .collect();
        let head = [
            CurvePoint {
                flow_m3_s: 0.0,
                head_m: 30.0,
            },
            CurvePoint {
                flow_m3_s: 0.1,
                head_m: 10.0,
            },
        ];
        let b = best_efficiency(&eff, &head).unwrap();
        assert!((b.flow_m3_s - 0.055).abs() < 1e-12, "{b:?}");
        assert!((b.efficiency - 0.8).abs() < 1e-12);
        assert!((b.head_m - 19.0).abs() < 1e-9);
        assert!(!b.at_end_of_points);
    }
}
