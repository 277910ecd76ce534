//! Rows of `Systems`: ordered lines forming a pumped system.

use super::Origin;
use super::cells::{Cells, Sink, for_each_row};
use crate::ingest::Input;
use crate::ingest::schema::TableKind;

/// A row of `Systems`.
#[derive(Clone, Debug, PartialEq)]
pub struct SystemRow {
    /// Source row.
    pub origin: Origin,
    /// System id.
    pub system: String,
    /// Ordered line ids (empty: taken from the `System` column of Lines).
    pub lines: Vec<String>,
    /// Static head, m.
    pub static_head_m: Option<f64>,
    /// Pump head at duty, m.
    pub pump_head_m: Option<f64>,
    /// NPSH required, m.
    pub npsh_required_m: Option<f64>,
    /// Absolute source pressure, Pa.
    pub source_pressure_pa: Option<f64>,
    /// Source level above the pump centreline, m.
    pub suction_level_m: Option<f64>,
    /// Site elevation above mean sea level, m (None: not given).
    pub site_elevation_m: Option<f64>,
    /// Wire-to-water efficiency.
    pub efficiency: Option<f64>,
}

pub(super) fn read_systems(input: &Input, sink: &mut Sink) -> Vec<SystemRow> {
    let mut systems = Vec::new();
    for_each_row(input, sink, TableKind::Systems, |c| {
        let Some(system) = c.text("system") else {
            c.error("system", "system id is blank".into(), None);
            return;
        };
        let lines = c
            .text("lines")
            .map(|t| {
                t.split([',', ';', '\n'])
                    .map(|s| s.trim().to_string())
                    .filter(|s| !s.is_empty())
                    .collect()
            })
            .unwrap_or_default();
        systems.push(SystemRow {
            origin: Origin {
                sheet: c.layout.sheet.clone(),
                row: c.row,
            },
            system,
            lines,
            static_head_m: c.number("static_head"),
            pump_head_m: c.positive("pump_head", true),
            npsh_required_m: c.positive("npsh_required", true),
            source_pressure_pa: c.positive("source_pressure", false),
            suction_level_m: c.number("suction_level"),
            site_elevation_m: site_elevation(c),
            efficiency: c.positive("efficiency", false),
        });
    });
    systems
}

/// Site elevations the standard atmosphere is used for, m (the Dead Sea shore to high mountain
/// sites).
pub const SITE_ELEVATION_RANGE_M: std::ops::RangeInclusive<f64> = -500.0..=6000.0;

fn site_elevation(c: &mut Cells<'_>) -> Option<f64> {
    let z = c.number("site_elevation")?;
    if SITE_ELEVATION_RANGE_M.contains(&z) {
        return Some(z);
    }
    c.error(
        "site_elevation",
        format!("site elevation {z} m is outside -500 to 6000 m"),
        Some("give the height of the site above mean sea level in m (or ft with a unit)".into()),
    );
    None
}
