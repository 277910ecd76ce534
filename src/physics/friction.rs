//! Pipe friction: Reynolds number, Darcy friction factor (laminar, transition, Colebrook-White),
//! fully rough limit, Darcy-Weisbach and Hazen-Williams head loss.

use serde::Serialize;

/// Highest Reynolds number treated as laminar (common practice (no source) for the Moody-chart
/// critical zone boundary).
pub const RE_LAMINAR_MAX: f64 = 2000.0;
/// Lowest Reynolds number treated as fully turbulent (common practice (no source)).
pub const RE_TURBULENT_MIN: f64 = 4000.0;

/// Largest relative roughness for which the Colebrook-White equation has a root
/// (its logarithm argument must stay below 1 as 1/√f → 0: ε/D < 3.7).
const COLEBROOK_ED_LIMIT: f64 = 3.7;

/// Flow regime by Reynolds number.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Regime {
    /// Re ≤ [`RE_LAMINAR_MAX`] (including no flow).
    Laminar,
    /// [`RE_LAMINAR_MAX`] < Re < [`RE_TURBULENT_MIN`]: the factor is interpolated and uncertain.
    Transition,
    /// Re ≥ [`RE_TURBULENT_MIN`].
    Turbulent,
}

impl Regime {
    /// The regime as written in reports (as in JSON).
    pub fn name(self) -> &'static str {
        match self {
            Regime::Laminar => "laminar",
            Regime::Transition => "transition",
            Regime::Turbulent => "turbulent",
        }
    }
}

/// A Darcy friction factor and the regime it was computed in.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Friction {
    /// Darcy (Moody) friction factor, dimensionless (four times the Fanning factor).
    pub factor: f64,
    /// Regime that chose the correlation.
    pub regime: Regime,
}

/// Why a friction factor could not be computed (see [`try_darcy_friction`]).
#[derive(Clone, Copy, Debug, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum FrictionError {
    /// The Reynolds number is NaN or negative.
    #[error("Reynolds number {re} is not a non-negative number")]
    InvalidReynolds {
        /// The Reynolds number given.
        re: f64,
    },
    /// The relative roughness is NaN, negative, infinite or too large for Colebrook-White.
    #[error("relative roughness {relative_roughness} is outside 0 <= e/D < 3.7")]
    InvalidRoughness {
        /// The relative roughness ε/D given.
        relative_roughness: f64,
    },
}

/// Reynolds number of pipe flow.
///
/// # Formula
/// `Re = ρ v D / µ`
///
/// # Source
/// Reynolds, O. (1883), "An experimental investigation of the circumstances which determine
/// whether the motion of water shall be direct or sinuous", Phil. Trans. R. Soc. 174.
///
/// # Validity
/// Any Newtonian fluid in a full circular pipe; `velocity_m_s` is the mean velocity. The sign
/// of the velocity is kept (negative velocity gives negative Re, which [`darcy_friction`]
/// treats as no flow). A zero viscosity gives an infinite or NaN result.
pub fn reynolds(
    density_kg_m3: f64,
    velocity_m_s: f64,
    diameter_m: f64,
    viscosity_pa_s: f64,
) -> f64 {
    density_kg_m3 * velocity_m_s * diameter_m / viscosity_pa_s
}

/// Darcy friction factor of a circular pipe by regime.
///
/// # Formula
/// * Re ≤ 0 (or NaN): factor 0, [`Regime::Laminar`] (no flow);
/// * 0 < Re ≤ 2000: Hagen-Poiseuille `f = 64 / Re`, [`Regime::Laminar`];
/// * 2000 < Re < 4000: linear interpolation in Re between `64/2000` and
///   [`colebrook`]`(4000, ε/D)`, [`Regime::Transition`];
/// * Re ≥ 4000: [`colebrook`], [`Regime::Turbulent`] (Re = +∞ gives [`fully_turbulent`]).
///
/// # Source
/// Laminar: Hagen (1839) / Poiseuille (1840), as in White, F. M., *Fluid Mechanics*, ch. 6
/// (from memory). Turbulent: Colebrook, C. F. (1939), see [`colebrook`]. The linear bridge
/// across the critical zone is common practice (no source); it is continuous at both ends.
///
/// # Validity
/// Fully developed flow of a Newtonian fluid in a full circular pipe; 0 ≤ ε/D < 3.7
/// (physically ε/D ≤ 0.05). Factors in the transition zone are uncertain by tens of percent.
/// Invalid roughness gives a NaN factor; use [`try_darcy_friction`] to get an error instead.
pub fn darcy_friction(re: f64, relative_roughness: f64) -> Friction {
    if re.is_nan() || re <= 0.0 {
        return Friction {
            factor: 0.0,
            regime: Regime::Laminar,
        };
    }
    if re <= RE_LAMINAR_MAX {
        return Friction {
            factor: 64.0 / re,
            regime: Regime::Laminar,
        };
    }
    if re < RE_TURBULENT_MIN {
        let f_lam = 64.0 / RE_LAMINAR_MAX;
        let f_turb = colebrook(RE_TURBULENT_MIN, relative_roughness);
        let w = (re - RE_LAMINAR_MAX) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX);
        return Friction {
            factor: f_lam + w * (f_turb - f_lam),
            regime: Regime::Transition,
        };
    }
    Friction {
        factor: colebrook(re, relative_roughness),
        regime: Regime::Turbulent,
    }
}

/// [`darcy_friction`] with its inputs checked.
///
/// # Formula
/// As [`darcy_friction`].
///
/// # Source
/// As [`darcy_friction`].
///
/// # Validity
/// As [`darcy_friction`].
///
/// # Errors
/// [`FrictionError::InvalidReynolds`] for NaN or negative Re (zero is no flow, factor 0);
/// [`FrictionError::InvalidRoughness`] for ε/D that is NaN, infinite, negative or ≥ 3.7.
pub fn try_darcy_friction(re: f64, relative_roughness: f64) -> Result<Friction, FrictionError> {
    if re.is_nan() || re < 0.0 {
        return Err(FrictionError::InvalidReynolds { re });
    }
    if !(0.0..COLEBROOK_ED_LIMIT).contains(&relative_roughness) {
        return Err(FrictionError::InvalidRoughness { relative_roughness });
    }
    Ok(darcy_friction(re, relative_roughness))
}

/// Colebrook-White Darcy friction factor, solved to 1e-12 relative.
///
/// # Formula
/// `1/√f = -2 log10( (ε/D)/3.7 + 2.51/(Re √f) )`, solved for x = 1/√f by Newton's method on
/// `F(x) = x + 2 log10(a + b x)`, a = (ε/D)/3.7, b = 2.51/Re. F is increasing and concave, so
/// from a start below the root Newton's iterates rise monotonically to it without overshoot.
/// The start is the Swamee-Jain explicit approximation, moved below the root if needed (one
/// Newton step from above lands below the root; halving is the fallback). Iteration stops when
/// the step is below 1e-14·x (quadratic convergence makes the error then far below 1e-12) or
/// after 100 steps.
///
/// # Source
/// Colebrook, C. F. (1939), "Turbulent flow in pipes, with particular reference to the
/// transition region between the smooth and rough pipe laws", J. ICE 11(4), 133-156.
/// Start: Swamee, P. K. and Jain, A. K. (1976), "Explicit equations for pipe-flow problems",
/// J. Hydraulics Div. ASCE 102(5), 657-664.
///
/// # Validity
/// Turbulent flow, Re ≥ 4000 in practice (the equation is solved for any Re > 0);
/// 0 ≤ ε/D < 3.7 mathematically, ε/D ≤ 0.05 physically. ε/D = 0 is a hydraulically smooth
/// pipe. Re = +∞ gives [`fully_turbulent`]. The result satisfies the equation to 1e-12
/// relative for Re ≥ 1 and ε/D ≤ 3; for Re far below 1 the equation is ill-conditioned in
/// double precision (the result stays finite and positive, or +∞ below Re ≈ 1e-150).
/// Returns NaN only for inputs outside the domain (Re ≤ 0 or NaN, ε/D negative, NaN,
/// infinite or ≥ 3.7).
pub fn colebrook(re: f64, relative_roughness: f64) -> f64 {
    let ed = relative_roughness;
    if re.is_nan() || re <= 0.0 || !(0.0..COLEBROOK_ED_LIMIT).contains(&ed) {
        return f64::NAN;
    }
    if re == f64::INFINITY {
        return fully_turbulent(ed);
    }
    let a = ed / 3.7;
    let b = 2.51 / re;
    let g = |x: f64| x + 2.0 * (a + b * x).log10();
    let dg = |x: f64| 1.0 + 2.0 / std::f64::consts::LN_10 * b / (a + b * x);

    // Swamee-Jain start, x0 = 1/sqrt(f_SJ) = -2 log10(a + 5.74 / Re^0.9).
    let mut x = -2.0 * (a + 5.74 / re.powf(0.9)).log10();
    if !(x.is_finite() && x > 0.0) {
        x = 1.0;
    }
    // Move the start below the root (g(x) <= 0).
    if g(x) > 0.0 {
        let stepped = x - g(x) / dg(x);
        if stepped.is_finite() && stepped > 0.0 && g(stepped) <= 0.0 {
            x = stepped;
        } else {
            // g(0+) = 2 log10(a) < 0 (or -inf), so halving reaches g <= 0.
            for _ in 0..1100 {
                x *= 0.5;
                if g(x) <= 0.0 {
                    break;
                }
            }
        }
    }
    for _ in 0..100 {
        let step = -g(x) / dg(x);
        let next = x + step;
        if !(step.is_finite() && next.is_finite() && next > 0.0) {
            break;
        }
        x = next;
        if step.abs() <= 1e-14 * x {
            break;
        }
    }
    1.0 / (x * x)
}

/// Fully rough (Re → ∞) Darcy friction factor of a relative roughness.
///
/// # Formula
/// `1/√f = -2 log10( (ε/D)/3.7 )`, the limit of [`colebrook`] as Re → ∞.
///
/// # Source
/// von Kármán, T. (1930), "Mechanische Ähnlichkeit und Turbulenz", and Nikuradse, J. (1933),
/// "Strömungsgesetze in rauhen Rohren", VDI-Forschungsheft 361 (rough-pipe law
/// 1/√f = 1.14 − 2 log10(ε/D)); in the form above as the rough limit of Colebrook (1939).
///
/// # Validity
/// Fully rough turbulent flow; 0 < ε/D < 3.7. ε/D = 0 gives 0 (a smooth pipe has no rough
/// limit: f → 0 as Re → ∞). NaN, negative or ≥ 3.7 gives NaN.
pub fn fully_turbulent(relative_roughness: f64) -> f64 {
    let ed = relative_roughness;
    if !(0.0..COLEBROOK_ED_LIMIT).contains(&ed) {
        return f64::NAN;
    }
    if ed == 0.0 {
        return 0.0;
    }
    let x = -2.0 * (ed / 3.7).log10();
    1.0 / (x * x)
}

/// Darcy-Weisbach head loss of a straight pipe, m of the flowing fluid.
///
/// # Formula
/// `h = f (L/D) v² / (2 g)` with g = [`crate::physics::G`].
///
/// # Source
/// Darcy, H. (1857), *Recherches expérimentales relatives au mouvement de l'eau dans les
/// tuyaux*; Weisbach, J. (1845), *Lehrbuch der Ingenieur- und Maschinen-Mechanik*.
///
/// # Validity
/// Full circular pipe, any regime given the matching factor; `diameter_m` > 0 (zero gives an
/// infinite or NaN result). Direction-independent (uses v²).
pub fn darcy_weisbach_head(factor: f64, length_m: f64, diameter_m: f64, velocity_m_s: f64) -> f64 {
    factor * (length_m / diameter_m) * velocity_m_s * velocity_m_s / (2.0 * crate::physics::G)
}

/// Hazen-Williams head loss of a straight pipe (SI form, water only), m.
///
/// # Formula
/// `h = 10.67 L Q^1.852 / (C^1.852 D^4.8704)`, Q in m³/s, L and D in m.
///
/// This is the SI rearrangement of the velocity form `V = 0.849 C R^0.63 S^0.54`
/// (R = D/4 hydraulic radius, S = h/L); `|Q|` is used, so the loss is direction-independent.
///
/// # Source
/// Williams, G. S. and Hazen, A. (1920), *Hydraulic Tables*, 3rd ed., Wiley
/// (V = 1.318 C R^0.63 S^0.54 in feet and seconds); the SI coefficient 10.67 and exponents
/// 1.852 / 4.8704 as commonly tabulated in hydraulics texts (from memory).
///
/// # Validity
/// Water at ordinary temperatures (about 5-25 °C) in turbulent flow, D ≳ 50 mm,
/// velocity ≲ 3 m/s; empirical, C depends on material and age. `c_factor` and `diameter_m`
/// must be positive (otherwise the result is infinite or NaN).
pub fn hazen_williams_head(length_m: f64, flow_m3_s: f64, c_factor: f64, diameter_m: f64) -> f64 {
    10.67 * length_m * flow_m3_s.abs().powf(1.852)
        / (c_factor.powf(1.852) * diameter_m.powf(4.8704))
}
