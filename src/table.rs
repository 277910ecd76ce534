//! Columnar tables (polars): the normalised runs and fittings with SI columns and their source
//! rows, vectorised hydraulics, and the per-line totals by group-by and join.

use polars::prelude::*;

/// Column names used across the frames.
pub mod col {
    /// Line id (string).
    pub const LINE: &str = "line";
    /// Zero-based source row (u32).
    pub const SOURCE_ROW: &str = "source_row";
    /// Source sheet (string).
    pub const SOURCE_SHEET: &str = "source_sheet";
    /// Bore, m.
    pub const DIAMETER: &str = "inner_diameter_m";
    /// Run length, m.
    pub const LENGTH: &str = "length_m";
    /// Flow, m³/s.
    pub const FLOW: &str = "flow_m3_s";
    /// Density, kg/m³.
    pub const DENSITY: &str = "density_kg_m3";
    /// Viscosity, Pa·s.
    pub const VISCOSITY: &str = "viscosity_pa_s";
    /// Velocity, m/s.
    pub const VELOCITY: &str = "velocity_m_s";
    /// Reynolds number.
    pub const REYNOLDS: &str = "reynolds";
    /// Head loss, m.
    pub const HEAD: &str = "head_m";
    /// Low head loss, m.
    pub const HEAD_LOW: &str = "head_low_m";
    /// High head loss, m.
    pub const HEAD_HIGH: &str = "head_high_m";
}

/// One run as the table layer receives it: SI values and its source.
#[derive(Clone, Debug)]
pub struct RunRecord<'a> {
    /// Line id.
    pub line: &'a str,
    /// Source sheet.
    pub sheet: &'a str,
    /// Zero-based source row.
    pub row: u32,
    /// Bore, m.
    pub inner_diameter_m: f64,
    /// Length, m.
    pub length_m: f64,
}

/// One line's fluid state and flow.
#[derive(Clone, Debug)]
pub struct LineRecord<'a> {
    /// Line id.
    pub line: &'a str,
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Density, kg/m³.
    pub density_kg_m3: f64,
    /// Viscosity, Pa·s.
    pub viscosity_pa_s: f64,
}

/// Frame of runs (line, source, bore, length).
pub fn runs_frame(runs: &[RunRecord<'_>]) -> PolarsResult<DataFrame> {
    df!(
        col::LINE => runs.iter().map(|r| r.line).collect::<Vec<_>>(),
        col::SOURCE_SHEET => runs.iter().map(|r| r.sheet).collect::<Vec<_>>(),
        col::SOURCE_ROW => runs.iter().map(|r| r.row).collect::<Vec<_>>(),
        col::DIAMETER => runs.iter().map(|r| r.inner_diameter_m).collect::<Vec<_>>(),
        col::LENGTH => runs.iter().map(|r| r.length_m).collect::<Vec<_>>(),
    )
}

/// Frame of lines (line, flow, density, viscosity).
pub fn lines_frame(lines: &[LineRecord<'_>]) -> PolarsResult<DataFrame> {
    df!(
        col::LINE => lines.iter().map(|r| r.line).collect::<Vec<_>>(),
        col::FLOW => lines.iter().map(|r| r.flow_m3_s).collect::<Vec<_>>(),
        col::DENSITY => lines.iter().map(|r| r.density_kg_m3).collect::<Vec<_>>(),
        col::VISCOSITY => lines.iter().map(|r| r.viscosity_pa_s).collect::<Vec<_>>(),
    )
}

fn f64s<'a>(df: &'a DataFrame, name: &str) -> PolarsResult<&'a Float64Chunked> {
    df.column(name)?.f64()
}

/// Join each run to its line's flow and fluid, then add velocity v = Q/(πD²/4) and
/// Reynolds number Re = ρvD/μ as vectorised columns. Row order of `runs` is kept.
pub fn run_hydraulics(runs: &DataFrame, lines: &DataFrame) -> PolarsResult<DataFrame> {
    let mut df = runs.left_join(lines, [col::LINE], [col::LINE])?;
    let d = f64s(&df, col::DIAMETER)?;
    let q = f64s(&df, col::FLOW)?;
    let area = d * d * (std::f64::consts::PI / 4.0);
    let velocity = q / &area;
    let rho = f64s(&df, col::DENSITY)?;
    let mu = f64s(&df, col::VISCOSITY)?;
    let reynolds = &(&(rho * &velocity) * d) / mu;
    df.with_column(velocity.with_name(col::VELOCITY.into()).into_column())?;
    df.with_column(reynolds.with_name(col::REYNOLDS.into()).into_column())?;
    Ok(df)
}

/// A frame of per-item head losses (line, head, low, high).
pub fn heads_frame(
    lines: Vec<&str>,
    head: Vec<f64>,
    low: Vec<f64>,
    high: Vec<f64>,
) -> PolarsResult<DataFrame> {
    df!(col::LINE => lines, col::HEAD => head, col::HEAD_LOW => low, col::HEAD_HIGH => high)
}

/// Per-line totals: the sum of run friction head and run length, the maximum run velocity and
/// the sum of fitting heads (with their band ends), joined on line id. Lines with no fittings get
/// zero fitting head.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct LineTotals {
    /// Friction head, m.
    pub friction_head_m: f64,
    /// Total run length, m.
    pub length_m: f64,
    /// Maximum run velocity, m/s.
    pub max_velocity_m_s: f64,
    /// Fitting head, m.
    pub fittings_head_m: f64,
    /// Fitting head at the low ends, m.
    pub fittings_head_low_m: f64,
    /// Fitting head at the high ends, m.
    pub fittings_head_high_m: f64,
}

/// Compute [`LineTotals`] per line id with polars group-bys and a join.
///
/// The eager group-by aggregations are marked deprecated in favour of the lazy API; the lazy
/// engine would multiply build time on small machines for four sums, so the eager ones are kept.
#[allow(deprecated)]
pub fn line_totals(
    runs: &DataFrame,
    fittings: &DataFrame,
) -> PolarsResult<Vec<(String, LineTotals)>> {
    let gb = runs.group_by_stable([col::LINE])?;
    let sums = gb.select([col::HEAD, col::LENGTH]).sum()?;
    let maxes = runs
        .group_by_stable([col::LINE])?
        .select([col::VELOCITY])
        .max()?;
    let per_run = sums.left_join(&maxes, [col::LINE], [col::LINE])?;
    let fit = fittings
        .group_by_stable([col::LINE])?
        .select([col::HEAD, col::HEAD_LOW, col::HEAD_HIGH])
        .sum()?;
    // Name the fitting sums apart before the join.
    let mut fit = fit;
    fit.rename(&format!("{}_sum", col::HEAD), "fit_head".into())?;
    fit.rename(&format!("{}_sum", col::HEAD_LOW), "fit_low".into())?;
    fit.rename(&format!("{}_sum", col::HEAD_HIGH), "fit_high".into())?;
    let all = per_run.left_join(&fit, [col::LINE], [col::LINE])?;
    let line = all.column(col::LINE)?.str()?;
    let get = |name: &str| -> PolarsResult<Vec<f64>> {
        Ok(all
            .column(name)?
            .f64()?
            .iter()
            .map(|v| v.unwrap_or(0.0))
            .collect())
    };
    let head = get(&format!("{}_sum", col::HEAD))?;
    let length = get(&format!("{}_sum", col::LENGTH))?;
    let vmax = get(&format!("{}_max", col::VELOCITY))?;
    let (fh, fl, fhh) = (get("fit_head")?, get("fit_low")?, get("fit_high")?);
    Ok(line
        .iter()
        .enumerate()
        .map(|(i, l)| {
            (
                l.unwrap_or_default().to_string(),
                LineTotals {
                    friction_head_m: head[i],
                    length_m: length[i],
                    max_velocity_m_s: vmax[i],
                    fittings_head_m: fh[i],
                    fittings_head_low_m: fl[i],
                    fittings_head_high_m: fhh[i],
                },
            )
        })
        .collect())
}
