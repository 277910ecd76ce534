//! Fluid properties: liquid water from IAPWS formulations, and the standard atmosphere.
//!
//! Water properties come from the pure-Rust `seuif97` crate (IAPWS-IF97 and the IAPWS 2008
//! viscosity formulation); nothing here re-implements those formulations.

use serde::Serialize;

/// Lowest water temperature accepted by [`water`], °C (the triple point, 273.16 K).
pub const WATER_T_MIN_C: f64 = 0.01;
/// Highest water temperature accepted by [`water`], °C (just below boiling at 101.325 kPa).
pub const WATER_T_MAX_C: f64 = 99.0;

/// Pressure at which [`water`] evaluates the liquid, Pa (one standard atmosphere).
pub const WATER_PRESSURE_PA: f64 = 101_325.0;

/// Properties of a liquid at one state, SI units.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct FluidProps {
    /// Density, kg/m³.
    pub density_kg_m3: f64,
    /// Dynamic viscosity, Pa·s.
    pub viscosity_pa_s: f64,
    /// Saturation (vapour) pressure at the liquid's temperature, Pa absolute.
    pub vapour_pressure_pa: f64,
}

/// Why water properties could not be given.
#[derive(Clone, Copy, Debug, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum FluidError {
    /// The temperature is NaN or outside [`WATER_T_MIN_C`]..=[`WATER_T_MAX_C`].
    #[error(
        "water temperature {t_c} °C is outside the supported range {WATER_T_MIN_C}..={WATER_T_MAX_C} °C (liquid at 101.325 kPa)"
    )]
    OutOfRange {
        /// The temperature asked for, °C.
        t_c: f64,
    },
    /// The property library returned a non-finite or non-positive value (not expected inside
    /// the supported range; kept so a library fault can never pass silently).
    #[error("water {property} at {t_c} °C could not be evaluated")]
    Property {
        /// The temperature asked for, °C.
        t_c: f64,
        /// Which property failed ("density", "viscosity", "vapour pressure").
        property: &'static str,
    },
}

/// Liquid water at 101.325 kPa and `t_c` °C.
///
/// # Formula
/// * density: IAPWS-IF97 region 1 basic equation at (p = 0.101325 MPa, T = t_c + 273.15 K),
///   `seuif97::pt(p, t, OD)`;
/// * dynamic viscosity: IAPWS 2008 viscosity formulation evaluated at the IF97 density,
///   `seuif97::pt(p, t, ODV)` (seuif97 returns Pa·s: it computes µPa·s and scales by 1e-6;
///   the critical enhancement factor is taken as 1, which is exact to far better than 0.1 %
///   at these temperatures);
/// * vapour pressure: IAPWS-IF97 region 4 saturation-pressure equation,
///   `seuif97::tx(t, 0, OP)`, converted from MPa to Pa.
///
/// # Source
/// IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
/// Thermodynamic Properties of Water and Steam, Eq. 7 (region 1) and Eq. 30 (saturation
/// pressure). IAPWS R12-08, Release on the IAPWS Formulation 2008 for the Viscosity of
/// Ordinary Water Substance, Eqs. 10-12 (equation numbers from memory). Implemented by the
/// `seuif97` crate, version 2.3.8.
///
/// # Validity
/// [`WATER_T_MIN_C`]..=[`WATER_T_MAX_C`] °C (0.01..=99 °C) at 101.325 kPa, where water is a
/// compressed liquid (IF97 region 1). Pressure dependence of density and viscosity in the
/// liquid is below 0.05 % per bar (from memory), so these values serve for ordinary line
/// pressures.
///
/// # Errors
/// [`FluidError::OutOfRange`] for NaN or a temperature outside the range;
/// [`FluidError::Property`] if the library returns a non-finite or non-positive value.
pub fn water(t_c: f64) -> Result<FluidProps, FluidError> {
    // The negated comparison also rejects NaN.
    if !(WATER_T_MIN_C..=WATER_T_MAX_C).contains(&t_c) {
        return Err(FluidError::OutOfRange { t_c });
    }
    let p_mpa = WATER_PRESSURE_PA * 1e-6;
    let check = |value: f64, property: &'static str| {
        if value.is_finite() && value > 0.0 {
            Ok(value)
        } else {
            Err(FluidError::Property { t_c, property })
        }
    };
    let density_kg_m3 = check(seuif97::pt(p_mpa, t_c, seuif97::OD), "density")?;
    let viscosity_pa_s = check(seuif97::pt(p_mpa, t_c, seuif97::ODV), "viscosity")?;
    let vapour_pressure_pa = check(seuif97::tx(t_c, 0.0, seuif97::OP), "vapour pressure")? * 1e6;
    Ok(FluidProps {
        density_kg_m3,
        viscosity_pa_s,
        vapour_pressure_pa,
    })
}

/// Sea-level pressure of the standard atmosphere, Pa (ISO 2533:1975).
pub const SEA_LEVEL_PRESSURE_PA: f64 = 101_325.0;

/// Atmospheric pressure of the standard atmosphere at a site elevation, Pa absolute.
///
/// `elevation_m` is the geometric height above mean sea level (what a site survey gives). It is
/// converted to geopotential height `H = r z / (r + z)` with r = 6 356 766 m, then
///
/// # Formula
/// * troposphere (H ≤ 11 000 m): `p = p0 (1 - L H / T0)^(g0 M / (R L))`
/// * lower stratosphere (H > 11 000 m, isothermal 216.65 K):
///   `p = p11 exp(-g0 M (H - 11 000) / (R T11))`
///
/// with p0 = 101 325 Pa, T0 = 288.15 K, L = 0.0065 K/m, g0 = 9.806 65 m/s²,
/// M = 0.028 964 4 kg/mol, R = 8.314 32 J/(mol·K) (exponent g0 M / (R L) = 5.255 88).
///
/// # Source
/// ISO 2533:1975, Standard Atmosphere, Eqs. for pressure in layers with non-zero and zero
/// temperature gradient, and the geopotential-height relation (identical to the U.S. Standard
/// Atmosphere 1976, NOAA-S/T 76-1562, Eqs. 18, 33a and 33b below 20 km).
///
/// # Validity
/// Standard (mean mid-latitude) day; −2 000 m to 20 000 m geopotential, the two layers above.
/// Actual barometric pressure varies with weather by a few percent. NaN in gives NaN out.
pub fn atmospheric_pressure_pa(elevation_m: f64) -> f64 {
    const EARTH_RADIUS_M: f64 = 6_356_766.0;
    const T0_K: f64 = 288.15;
    const LAPSE_K_M: f64 = 0.0065;
    const MOLAR_MASS_KG_MOL: f64 = 0.028_964_4;
    const GAS_CONSTANT: f64 = 8.314_32;
    const TROPOPAUSE_M: f64 = 11_000.0;
    const T11_K: f64 = 216.65;
    let g0 = crate::physics::G;
    let h = EARTH_RADIUS_M * elevation_m / (EARTH_RADIUS_M + elevation_m);
    let exponent = g0 * MOLAR_MASS_KG_MOL / (GAS_CONSTANT * LAPSE_K_M);
    let troposphere = |h: f64| SEA_LEVEL_PRESSURE_PA * (1.0 - LAPSE_K_M * h / T0_K).powf(exponent);
    if h <= TROPOPAUSE_M {
        troposphere(h)
    } else {
        troposphere(TROPOPAUSE_M)
            * (-g0 * MOLAR_MASS_KG_MOL * (h - TROPOPAUSE_M) / (GAS_CONSTANT * T11_K)).exp()
    }
}
