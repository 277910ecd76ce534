//! Audit rules: limits read from TOML (`--rules FILE`), every key optional, defaults built in.
//!
//! The defaults are common practice for water (no single published source) and the report says so.

use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;

use crate::ingest::Service;

/// The built-in rules as TOML, printed by `lossledger rules`.
pub const DEFAULT_RULES_TOML: &str = include_str!("default_rules.toml");

/// Velocity band of one service, m/s.
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct VelocityBand {
    /// Lower limit (self-cleansing, air clearing), when one applies.
    pub min_m_s: Option<f64>,
    /// Upper limit (erosion, noise, surge risk, suction conditions).
    pub max_m_s: Option<f64>,
}

/// Friction gradient rule.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct GradientRule {
    /// Warn when a run's friction loss exceeds this many metres per 100 m.
    pub max_m_per_100m: f64,
}

impl Default for GradientRule {
    fn default() -> Self {
        GradientRule {
            max_m_per_100m: 4.0,
        }
    }
}

/// High-loss fitting rule.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct FittingRule {
    /// Flag an item taking more than this share of its line's loss.
    pub max_share: f64,
    /// Flag an item whose K exceeds this.
    pub max_k: f64,
}

impl Default for FittingRule {
    fn default() -> Self {
        FittingRule {
            max_share: 0.25,
            max_k: 5.0,
        }
    }
}

/// Energy pricing.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct EnergyRule {
    /// Price of one kWh.
    pub tariff_per_kwh: f64,
    /// Currency label for costs.
    pub currency: String,
    /// Wire-to-water efficiency when a line or system gives none.
    pub efficiency: f64,
    /// Running hours per year when a line gives none.
    pub hours_per_year: f64,
    /// Emission factor, kg CO₂ per kWh (0: not reported).
    pub kg_co2_per_kwh: f64,
}

impl Default for EnergyRule {
    fn default() -> Self {
        EnergyRule {
            tariff_per_kwh: 0.15,
            currency: "EUR".into(),
            efficiency: 0.65,
            hours_per_year: 4000.0,
            kg_co2_per_kwh: 0.0,
        }
    }
}

/// Valve throttling rule.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct ValveRule {
    /// A valve on a pumped line open less than this fraction is flagged.
    pub min_opening: f64,
}

impl Default for ValveRule {
    fn default() -> Self {
        ValveRule { min_opening: 0.8 }
    }
}

/// NPSH margin rule.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct NpshRule {
    /// NPSHa must be at least this ratio times NPSHr ...
    pub margin_ratio: f64,
    /// ... and at least NPSHr plus this margin, m.
    pub margin_min_m: f64,
    /// Site elevation for the default source pressure where a system gives no `Site elevation`,
    /// m (0: sea level, then reported as assumed).
    pub site_elevation_m: f64,
}

impl Default for NpshRule {
    fn default() -> Self {
        NpshRule {
            margin_ratio: 1.1,
            margin_min_m: 0.6,
            site_elevation_m: 0.0,
        }
    }
}

/// Per-station checks on measured performance, the pump curve and the loss share.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct StationRule {
    /// `low-wire-to-water` below this measured wire-to-water efficiency (common practice).
    pub min_wire_to_water: f64,
    /// `loss-share-high` when the piping losses exceed this share of the required head
    /// (common practice).
    pub max_loss_share: f64,
    /// `measured-vs-computed` when a test head and the computed system head at the test flow
    /// differ by more than this fraction of the computed head (common practice).
    pub head_tolerance: f64,
    /// Preferred operating region, lower end, as a fraction of best-efficiency flow
    /// (ANSI/HI 9.6.3: 70 %).
    pub preferred_min: f64,
    /// Preferred operating region, upper end (ANSI/HI 9.6.3: 120 %).
    pub preferred_max: f64,
    /// Motor and drive efficiency that turns a pump curve's efficiency into wire-to-water
    /// (common practice).
    pub motor_efficiency: f64,
}

impl Default for StationRule {
    fn default() -> Self {
        StationRule {
            min_wire_to_water: 0.55,
            max_loss_share: 0.3,
            head_tolerance: 0.1,
            preferred_min: 0.7,
            preferred_max: 1.2,
            motor_efficiency: 0.92,
        }
    }
}

/// Life-cycle view of savings: the present value of a saving over the years, discounted.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct LifeCycleRule {
    /// Years a saving is counted over.
    pub years: f64,
    /// Discount rate per year, fraction.
    pub discount_rate: f64,
}

impl Default for LifeCycleRule {
    fn default() -> Self {
        LifeCycleRule {
            years: 15.0,
            discount_rate: 0.05,
        }
    }
}

/// All rules in force.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct Rules {
    /// Velocity bands by service id.
    pub velocity: BTreeMap<String, VelocityBand>,
    /// Friction gradient.
    pub gradient: GradientRule,
    /// High-loss fittings.
    pub fitting: FittingRule,
    /// Energy pricing.
    pub energy: EnergyRule,
    /// Valve throttling.
    pub valve: ValveRule,
    /// NPSH margin.
    pub npsh: NpshRule,
    /// Per-station checks.
    pub station: StationRule,
    /// Life-cycle view of savings.
    pub life_cycle: LifeCycleRule,
}

impl Default for Rules {
    fn default() -> Self {
        let band = |min: Option<f64>, max: Option<f64>| VelocityBand {
            min_m_s: min,
            max_m_s: max,
        };
        let velocity = BTreeMap::from([
            ("pump-suction".to_string(), band(Some(0.6), Some(1.5))),
            ("pump-discharge".to_string(), band(Some(1.0), Some(3.0))),
            ("distribution".to_string(), band(Some(0.5), Some(2.0))),
            ("gravity".to_string(), band(Some(0.6), Some(3.0))),
            ("general".to_string(), band(None, Some(3.0))),
        ]);
        Rules {
            velocity,
            gradient: GradientRule::default(),
            fitting: FittingRule::default(),
            energy: EnergyRule::default(),
            valve: ValveRule::default(),
            npsh: NpshRule::default(),
            station: StationRule::default(),
            life_cycle: LifeCycleRule::default(),
        }
    }
}

/// Errors in a rules file.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum RulesError {
    /// The file could not be read.
    #[error("{path}: {source}")]
    Io {
        /// Path.
        path: String,
        /// Cause.
        #[source]
        source: std::io::Error,
    },
    /// The TOML is malformed or has unknown keys.
    #[error("{path}: {message}")]
    Parse {
        /// Path.
        path: String,
        /// What the TOML reader said (with line and column).
        message: String,
    },
    /// A value is out of its sensible range.
    #[error("{path}: {key} = {value} is out of range: {why}")]
    Range {
        /// Path.
        path: String,
        /// Key.
        key: String,
        /// Value.
        value: f64,
        /// Why it is refused.
        why: &'static str,
    },
}

impl Rules {
    /// Parse rules from TOML text; keys not given keep their defaults. Velocity sections given
    /// replace the default band of that service only.
    pub fn from_toml(text: &str, path: &str) -> Result<Rules, RulesError> {
        #[derive(Deserialize)]
        #[serde(deny_unknown_fields)]
        struct Partial {
            #[serde(default)]
            velocity: BTreeMap<String, VelocityBand>,
            #[serde(default)]
            gradient: Option<GradientRule>,
            #[serde(default)]
            fitting: Option<FittingRule>,
            #[serde(default)]
            energy: Option<EnergyRule>,
            #[serde(default)]
            valve: Option<ValveRule>,
            #[serde(default)]
            npsh: Option<NpshRule>,
            #[serde(default)]
            station: Option<StationRule>,
            #[serde(default)]
            life_cycle: Option<LifeCycleRule>,
        }
        let p: Partial = toml::from_str(text).map_err(|e| RulesError::Parse {
            path: path.into(),
            message: e.to_string(),
        })?;
        let mut rules = Rules::default();
        for (service, band) in p.velocity {
            if Service::ALL.iter().all(|s| s.id() != service) {
                return Err(RulesError::Parse {
                    path: path.into(),
                    message: format!(
                        "[velocity.{service}]: unknown service (use {})",
                        Service::ALL.map(Service::id).join(", ")
                    ),
                });
            }
            rules.velocity.insert(service, band);
        }
        rules.gradient = p.gradient.unwrap_or(rules.gradient);
        rules.fitting = p.fitting.unwrap_or(rules.fitting);
        rules.energy = p.energy.unwrap_or(rules.energy);
        rules.valve = p.valve.unwrap_or(rules.valve);
        rules.npsh = p.npsh.unwrap_or(rules.npsh);
        rules.station = p.station.unwrap_or(rules.station);
        rules.life_cycle = p.life_cycle.unwrap_or(rules.life_cycle);
        rules.validate(path)?;
        Ok(rules)
    }

    /// Read a rules file.
    pub fn from_file(path: &std::path::Path) -> Result<Rules, RulesError> {
        let p = path.display().to_string();
        let text = std::fs::read_to_string(path).map_err(|source| RulesError::Io {
            path: p.clone(),
            source,
        })?;
        Rules::from_toml(&text, &p)
    }

    fn validate(&self, path: &str) -> Result<(), RulesError> {
        let check = |key: &str, value: f64, ok: bool, why: &'static str| {
            if ok && value.is_finite() {
                Ok(())
            } else {
                Err(RulesError::Range {
                    path: path.into(),
                    key: key.into(),
                    value,
                    why,
                })
            }
        };
        for (s, b) in &self.velocity {
            if let Some(v) = b.min_m_s {
                check(
                    &format!("velocity.{s}.min_m_s"),
                    v,
                    v >= 0.0,
                    "must be zero or more",
                )?;
            }
            if let Some(v) = b.max_m_s {
                check(
                    &format!("velocity.{s}.max_m_s"),
                    v,
                    v > 0.0,
                    "must be above zero",
                )?;
            }
        }
        check(
            "gradient.max_m_per_100m",
            self.gradient.max_m_per_100m,
            self.gradient.max_m_per_100m > 0.0,
            "must be above zero",
        )?;
        check(
            "fitting.max_share",
            self.fitting.max_share,
            (0.0..=1.0).contains(&self.fitting.max_share),
            "must be a fraction 0..1",
        )?;
        check(
            "fitting.max_k",
            self.fitting.max_k,
            self.fitting.max_k > 0.0,
            "must be above zero",
        )?;
        let e = &self.energy;
        check(
            "energy.tariff_per_kwh",
            e.tariff_per_kwh,
            e.tariff_per_kwh >= 0.0,
            "must be zero or more",
        )?;
        check(
            "energy.efficiency",
            e.efficiency,
            e.efficiency > 0.0 && e.efficiency <= 1.0,
            "must be a fraction in (0, 1]",
        )?;
        check(
            "energy.hours_per_year",
            e.hours_per_year,
            (0.0..=8784.0).contains(&e.hours_per_year),
            "must be 0..8784",
        )?;
        check(
            "energy.kg_co2_per_kwh",
            e.kg_co2_per_kwh,
            e.kg_co2_per_kwh >= 0.0,
            "must be zero or more",
        )?;
        check(
            "valve.min_opening",
            self.valve.min_opening,
            (0.0..=1.0).contains(&self.valve.min_opening),
            "must be a fraction 0..1",
        )?;
        check(
            "npsh.margin_ratio",
            self.npsh.margin_ratio,
            self.npsh.margin_ratio >= 1.0,
            "must be 1 or more",
        )?;
        check(
            "npsh.margin_min_m",
            self.npsh.margin_min_m,
            self.npsh.margin_min_m >= 0.0,
            "must be zero or more",
        )?;
        check(
            "npsh.site_elevation_m",
            self.npsh.site_elevation_m,
            (-500.0..=6000.0).contains(&self.npsh.site_elevation_m),
            "must be -500..6000 m",
        )?;
        self.validate_station(path)
    }

    fn validate_station(&self, path: &str) -> Result<(), RulesError> {
        let (st, lc) = (&self.station, &self.life_cycle);
        let fraction = |v: f64| v > 0.0 && v <= 1.0;
        for (key, value, ok, why) in [
            (
                "station.min_wire_to_water",
                st.min_wire_to_water,
                fraction(st.min_wire_to_water),
                "must be a fraction in (0, 1]",
            ),
            (
                "station.max_loss_share",
                st.max_loss_share,
                fraction(st.max_loss_share),
                "must be a fraction in (0, 1]",
            ),
            (
                "station.head_tolerance",
                st.head_tolerance,
                st.head_tolerance > 0.0,
                "must be above zero",
            ),
            (
                "station.preferred_min",
                st.preferred_min,
                st.preferred_min > 0.0 && st.preferred_min < 1.0,
                "must be a fraction in (0, 1)",
            ),
            (
                "station.preferred_max",
                st.preferred_max,
                st.preferred_max > 1.0,
                "must be above 1",
            ),
            (
                "station.motor_efficiency",
                st.motor_efficiency,
                fraction(st.motor_efficiency),
                "must be a fraction in (0, 1]",
            ),
            (
                "life_cycle.years",
                lc.years,
                lc.years > 0.0 && lc.years <= 100.0,
                "must be above 0 and at most 100",
            ),
            (
                "life_cycle.discount_rate",
                lc.discount_rate,
                (0.0..1.0).contains(&lc.discount_rate),
                "must be a fraction 0..1",
            ),
        ] {
            if !(ok && value.is_finite()) {
                return Err(RulesError::Range {
                    path: path.into(),
                    key: key.into(),
                    value,
                    why,
                });
            }
        }
        Ok(())
    }

    /// The velocity band of a service.
    pub fn band(&self, service: Service) -> VelocityBand {
        self.velocity.get(service.id()).copied().unwrap_or_default()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn printed_defaults_are_the_built_in_defaults() {
        assert_eq!(
            Rules::from_toml(DEFAULT_RULES_TOML, "defaults").unwrap(),
            Rules::default()
        );
    }

    #[test]
    fn a_partial_file_keeps_other_defaults() {
        let r = Rules::from_toml("[energy]\ntariff_per_kwh = 0.3\ncurrency = \"GBP\"\nefficiency = 0.65\nhours_per_year = 4000.0\nkg_co2_per_kwh = 0.0\n[velocity.general]\nmax_m_s = 2.5\n", "t").unwrap();
        assert_eq!(r.energy.tariff_per_kwh, 0.3);
        assert_eq!(r.band(Service::General).max_m_s, Some(2.5));
        assert_eq!(
            r.band(Service::PumpSuction),
            Rules::default().band(Service::PumpSuction)
        );
        assert_eq!(r.gradient, GradientRule::default());
    }

    #[test]
    fn unknown_keys_and_bad_values_are_refused() {
        assert!(Rules::from_toml("[gradient]\nmax_m_per_100 = 3\n", "t").is_err());
        assert!(Rules::from_toml("[velocity.sewer]\nmax_m_s = 3\n", "t").is_err());
        assert!(Rules::from_toml("[fitting]\nmax_share = 2.0\nmax_k = 5.0\n", "t").is_err());
    }
}
