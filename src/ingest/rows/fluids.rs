//! Rows of `Fluids`: properties of liquids other than water.

use super::Origin;
use super::cells::{Sink, for_each_row};
use crate::ingest::Input;
use crate::ingest::schema::TableKind;

/// A row of `Fluids`.
#[derive(Clone, Debug, PartialEq)]
pub struct FluidRow {
    /// Source row.
    pub origin: Origin,
    /// Fluid name (lower case).
    pub fluid: String,
    /// kg/m³.
    pub density_kg_m3: f64,
    /// Pa·s.
    pub viscosity_pa_s: f64,
    /// Pa, absolute.
    pub vapour_pressure_pa: Option<f64>,
}

pub(super) fn read_fluids(input: &Input, sink: &mut Sink) -> Vec<FluidRow> {
    let mut fluids = Vec::new();
    for_each_row(input, sink, TableKind::Fluids, |c| {
        let Some(fluid) = c.text("fluid") else { return };
        let density = c.positive("density", false);
        let viscosity = c.positive("viscosity", false);
        let vapour = c.positive("vapour_pressure", true);
        match (density, viscosity) {
            (Some(d), Some(v)) => fluids.push(FluidRow {
                origin: Origin {
                    sheet: c.layout.sheet.clone(),
                    row: c.row,
                },
                fluid: fluid.to_lowercase(),
                density_kg_m3: d,
                viscosity_pa_s: v,
                vapour_pressure_pa: vapour,
            }),
            _ if c.errors == 0 => c.error(
                "density",
                format!("fluid '{fluid}' needs both density and viscosity"),
                None,
            ),
            _ => {}
        }
    });
    fluids
}
