//! Rows of `Pipes`: one per pipe run.

use super::cells::{Cells, Sink, for_each_row};
use super::{Assumed, Origin};
use crate::ingest::Input;
use crate::ingest::parse::SizeSpec;
use crate::ingest::schema::TableKind;
use crate::physics::pipe::{self, Material, Schedule};
use crate::sentence::fig;

/// A row of `Pipes`.
#[derive(Clone, Debug, PartialEq)]
pub struct PipeRow {
    /// Source row.
    pub origin: Origin,
    /// Line id.
    pub line: String,
    /// Order along the line.
    pub seq: Option<f64>,
    /// Nominal size as written.
    pub size: Option<SizeSpec>,
    /// Schedule as written.
    pub schedule: Option<Schedule>,
    /// Material.
    pub material: Material,
    /// Length, m.
    pub length_m: f64,
    /// Bore given, m.
    pub inner_diameter_m: Option<f64>,
    /// Roughness given, m.
    pub roughness_m: Option<f64>,
    /// Age, years.
    pub age_years: Option<f64>,
    /// Hazen–Williams C.
    pub c_factor: Option<f64>,
    /// Flow given on the run, m³/s.
    pub flow_m3_s: Option<f64>,
    /// Values assumed.
    pub assumed: Vec<Assumed>,
}

pub(super) fn read_pipes(input: &Input, sink: &mut Sink) -> Vec<PipeRow> {
    let mut pipes = Vec::new();
    for_each_row(input, sink, TableKind::Pipes, |c| {
        let Some(line) = c.text("line") else {
            c.error(
                "line",
                "line id is blank".into(),
                Some("every pipe run needs the id of its line".into()),
            );
            return;
        };
        let mut assumed = Vec::new();
        let size = c.size("size");
        let schedule = c.text("schedule").and_then(|t| c.schedule_of(&t));
        let material = match c.text("material") {
            Some(t) => match pipe::material_from_text(&t) {
                Some(m) => m,
                None => {
                    c.error("material", format!("material '{t}' is not known"), Some("use e.g. carbon steel, stainless, galvanised, cast iron, ductile iron, PVC, PE, copper, concrete".into()));
                    return;
                }
            },
            None => {
                assumed.push(c.assumed("material", "material carbon steel"));
                Material::CarbonSteel
            }
        };
        let length = c.positive("length", false);
        if c.col("length").is_some() && length.is_none() && c.errors == 0 {
            c.error(
                "length",
                "length is blank".into(),
                Some("every pipe run needs a length".into()),
            );
        }
        let inner = c.positive("inner_diameter", false);
        let roughness = c.positive("roughness", true);
        if size.is_none() && inner.is_none() && c.errors == 0 {
            c.error(
                "size",
                "neither Size nor Inner diameter is given".into(),
                Some("give a nominal size (DN100, 4\") or the bore".into()),
            );
        }
        let flow = c.positive("flow", true);
        let c_factor = c.positive("c_factor", false);
        let age = c.positive("age", true);
        let seq = c.number("seq");
        assumed.extend(run_assumptions(
            c, material, size, schedule, inner, roughness, c_factor, age,
        ));
        if let Some(length_m) = length
            && c.errors == 0
        {
            pipes.push(PipeRow {
                origin: Origin {
                    sheet: c.layout.sheet.clone(),
                    row: c.row,
                },
                line,
                seq,
                size,
                schedule,
                material,
                length_m,
                inner_diameter_m: inner,
                roughness_m: roughness,
                age_years: age,
                c_factor,
                flow_m3_s: flow,
                assumed,
            });
        }
    });
    pipes.shrink_to_fit();
    pipes
}

/// The values assumed for a run whose schedule, roughness (or C factor) is not given: the
/// material's default schedule for the size and its new-pipe (or aged) roughness.
#[allow(clippy::too_many_arguments)]
pub(crate) fn run_assumptions(
    c: &Cells<'_>,
    material: Material,
    size: Option<SizeSpec>,
    schedule: Option<Schedule>,
    inner: Option<f64>,
    roughness: Option<f64>,
    c_factor: Option<f64>,
    age: Option<f64>,
) -> Vec<Assumed> {
    let mut assumed = Vec::new();
    if schedule.is_none() && inner.is_none() {
        let dn = match size {
            Some(SizeSpec::Dn(dn)) => Some(dn),
            Some(SizeSpec::Nps(n)) => pipe::nps_to_dn(n),
            _ => None,
        };
        if let Some(s) = dn.and_then(|dn| pipe::default_schedule(material, dn)) {
            assumed.push(c.assumed(
                "schedule",
                format!("schedule {} (default for {})", s.label(), material.name()),
            ));
        } else if matches!(size, Some(SizeSpec::OuterDiameter { .. })) {
            assumed.push(c.assumed(
                "schedule",
                format!("the usual wall of {} for that OD", material.name()),
            ));
        }
    }
    if roughness.is_none() && c_factor.is_none() {
        let r = pipe::roughness(material);
        let what = match age.and_then(|a| pipe::aged_roughness(material, a).map(|e| (a, e))) {
            Some((a, e)) => format!(
                "roughness {} ({} aged {a} years)",
                fig(e * 1e3, "mm", 4),
                material.name()
            ),
            None => format!(
                "roughness {} (new {})",
                fig(r.epsilon_m * 1e3, "mm", 4),
                material.name()
            ),
        };
        assumed.push(c.assumed("roughness", what));
    }
    assumed
}
