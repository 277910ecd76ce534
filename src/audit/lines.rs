//! Per-run, per-fitting and per-line hydraulics.

use std::collections::HashMap;

use polars::prelude::{Column, DataFrame, PolarsError, PolarsResult};

use super::models::Models;
use super::{Audit, FittingResult, FluidUsed, LineResult, Rules, RunResult};
use crate::error::{CellRef, Diagnostic, Severity};
use crate::ingest::parse::SizeSpec;
use crate::ingest::{FittingRow, Input, PipeRow, Service, TableKind};
use crate::physics::fitting::{self, FittingError, FittingInput, FittingK, Kind};
use crate::physics::friction::{self, Regime};
use crate::physics::{G, fluid, pipe};
use crate::table;

/// What a size names, for matching fittings to runs: a nominal DN, or a bore/OD in tenths of a mm.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum SizeKey {
    /// Nominal size.
    Dn(u16),
    /// Outside diameter, 0.1 mm.
    Od(u32),
    /// Bore, 0.1 mm.
    Bore(u32),
}

/// The key of a written size (NPS is converted to its DN).
pub fn size_key(size: &SizeSpec) -> Option<SizeKey> {
    let tenth = |m: f64| (m * 1e4).round() as u32;
    Some(match *size {
        SizeSpec::Dn(dn) => SizeKey::Dn(dn),
        SizeSpec::Nps(n) => SizeKey::Dn(pipe::nps_to_dn(n)?),
        SizeSpec::OuterDiameter { od_m } | SizeSpec::OdWall { od_m, .. } => {
            SizeKey::Od(tenth(od_m))
        }
        SizeSpec::InnerDiameter { id_m } => SizeKey::Bore(tenth(id_m)),
    })
}

struct LineState {
    service: Service,
    row: Option<u32>,
    sheet: String,
    flow_m3_s: f64,
    fluid: String,
    temperature_c: f64,
    props: fluid::FluidProps,
    elevation_change_m: f64,
}

struct Ctx<'a> {
    input: &'a Input,
    errors: Vec<Diagnostic>,
}

impl Ctx<'_> {
    fn cell(&self, table: TableKind, sheet: &str, row: u32, key: &str) -> CellRef {
        CellRef::new(sheet, row, self.input.column_of(table, sheet, key))
    }

    fn error(&mut self, cell: CellRef, message: String, hint: Option<String>) {
        self.errors.push(Diagnostic {
            severity: Severity::Error,
            file: self.input.file.clone(),
            cell: Some(cell),
            message,
            hint,
        });
    }

    /// The errors recorded so far, taken, when there are any.
    fn check(&mut self) -> Result<(), Vec<Diagnostic>> {
        if self.errors.is_empty() {
            Ok(())
        } else {
            Err(std::mem::take(&mut self.errors))
        }
    }

    /// An internal table error as the audit's one error.
    fn internal(&self, e: PolarsError) -> Vec<Diagnostic> {
        vec![Diagnostic {
            severity: Severity::Error,
            file: self.input.file.clone(),
            cell: None,
            message: format!("internal table error: {e}"),
            hint: None,
        }]
    }
}

fn is_water(name: &str) -> bool {
    name.split(|c: char| !c.is_alphanumeric())
        .any(|w| w == "water")
}

/// A line's flow and fluid as the input gives them, before the fluid's properties are found.
struct LineSpec<'a> {
    line: &'a str,
    service: Service,
    /// The Lines row (None when only Pipes names the line).
    row: Option<u32>,
    sheet: &'a str,
    flow_m3_s: f64,
    fluid: &'a str,
    temperature_c: f64,
    elevation_change_m: f64,
}

/// Why a fluid has no properties: message, the Lines column it is about, hint.
type NoFluid = (String, &'static str, Option<String>);

/// Fluid state of every line: Lines rows, plus lines only Pipes names (with flow on their runs).
fn line_states(
    ctx: &mut Ctx<'_>,
    fluids_used: &mut Vec<FluidUsed>,
) -> (Vec<String>, HashMap<String, LineState>) {
    let mut order = Vec::new();
    let mut states = HashMap::new();
    let input = ctx.input;
    for spec in line_specs(input) {
        match fluid_props(input, spec.fluid, spec.temperature_c) {
            Ok((props, basis)) => {
                let (fluid, t) = (spec.fluid, spec.temperature_c);
                if !fluids_used
                    .iter()
                    .any(|u| u.fluid == fluid && u.temperature_c == t)
                {
                    fluids_used.push(FluidUsed {
                        fluid: fluid.to_string(),
                        temperature_c: t,
                        props,
                        basis,
                    });
                }
                order.push(spec.line.to_string());
                states.insert(
                    spec.line.to_string(),
                    LineState {
                        service: spec.service,
                        row: spec.row,
                        sheet: spec.sheet.to_string(),
                        flow_m3_s: spec.flow_m3_s,
                        fluid: fluid.to_string(),
                        temperature_c: t,
                        props,
                        elevation_change_m: spec.elevation_change_m,
                    },
                );
            }
            Err((message, key, hint)) => {
                let cell = ctx.cell(TableKind::Lines, spec.sheet, spec.row.unwrap_or(0), key);
                ctx.error(cell, message, hint);
            }
        }
    }
    (order, states)
}

/// The lines with a flow: Lines rows in order (flow from the row, else from a run), then the
/// lines only Pipes names, in the order of their first run (water at 20 °C, flow from the run).
fn line_specs(input: &Input) -> Vec<LineSpec<'_>> {
    let mut run_flow: HashMap<&str, f64> = HashMap::new();
    for p in &input.pipes {
        if let Some(q) = p.flow_m3_s {
            run_flow.entry(p.line.as_str()).or_insert(q);
        }
    }
    let mut specs: Vec<LineSpec<'_>> = input
        .lines
        .iter()
        .filter_map(|l| {
            let flow = l
                .flow_m3_s
                .or_else(|| run_flow.get(l.line.as_str()).copied())?;
            Some(LineSpec {
                line: &l.line,
                service: l.service,
                row: Some(l.origin.row),
                sheet: &l.origin.sheet,
                flow_m3_s: flow,
                fluid: &l.fluid,
                temperature_c: l.temperature_c,
                elevation_change_m: l.elevation_change_m.unwrap_or(0.0),
            })
        })
        .collect();
    let mut seen: std::collections::HashSet<&str> =
        input.lines.iter().map(|l| l.line.as_str()).collect();
    for p in &input.pipes {
        if !seen.insert(p.line.as_str()) {
            continue;
        }
        if let Some(&flow) = run_flow.get(p.line.as_str()) {
            specs.push(LineSpec {
                line: &p.line,
                service: Service::General,
                row: None,
                sheet: &p.origin.sheet,
                flow_m3_s: flow,
                fluid: "water",
                temperature_c: 20.0,
                elevation_change_m: 0.0,
            });
        }
    }
    specs
}

/// A fluid's properties at a temperature and where they came from: a Fluids row, else the
/// water model for water.
fn fluid_props(
    input: &Input,
    fluid_name: &str,
    t: f64,
) -> Result<(fluid::FluidProps, String), NoFluid> {
    match input.fluids.iter().find(|f| f.fluid == fluid_name) {
        Some(f) => Ok((
            fluid::FluidProps {
                density_kg_m3: f.density_kg_m3,
                viscosity_pa_s: f.viscosity_pa_s,
                vapour_pressure_pa: f.vapour_pressure_pa.unwrap_or(f64::NAN),
            },
            format!("Fluids sheet row {}", f.origin.row + 1),
        )),
        None if is_water(fluid_name) => fluid::water(t)
            .map(|p| {
                (
                    p,
                    "IAPWS-IF97 (density, saturation pressure) and IAPWS 2008 viscosity via \
                     seuif97, at 101.325 kPa"
                        .to_string(),
                )
            })
            .map_err(|e| {
                (
                    format!("{e}"),
                    "temperature",
                    Some(format!(
                        "the water model covers {}–{} °C",
                        fluid::WATER_T_MIN_C,
                        fluid::WATER_T_MAX_C
                    )),
                )
            }),
        None => Err((
            format!("fluid '{fluid_name}' is not water and is not listed in a Fluids sheet"),
            "fluid",
            Some("add a Fluids sheet with Fluid, Density and Viscosity for it".to_string()),
        )),
    }
}

struct ResolvedRun {
    dn: Option<u16>,
    nps: Option<f64>,
    key: Option<SizeKey>,
    d_m: f64,
    /// Wall thickness where the bore table (or the Size cell) gives it.
    wall_m: Option<f64>,
    basis: String,
    eps_m: f64,
    eps_basis: String,
}

fn resolve_run(ctx: &mut Ctx<'_>, p: &PipeRow) -> Option<ResolvedRun> {
    let key = p.size.as_ref().and_then(size_key);
    let dn = match key {
        Some(SizeKey::Dn(dn)) => Some(dn),
        _ => None,
    };
    let (d_m, basis, wall_m) = run_bore(ctx, p, dn)?;
    let (eps_m, eps_basis) = run_roughness(p);
    Some(ResolvedRun {
        dn,
        nps: dn.and_then(pipe::dn_to_nps),
        key,
        d_m,
        wall_m,
        basis,
        eps_m,
        eps_basis,
    })
}

/// A run's bore, where it came from, and its wall where known: the Inner diameter cell, the
/// bore or OD and wall written in Size, or the bore tables for an OD or a DN/NPS. None when it
/// has none (an error is recorded unless the row has no size at all).
fn run_bore(ctx: &mut Ctx<'_>, p: &PipeRow, dn: Option<u16>) -> Option<(f64, String, Option<f64>)> {
    if let Some(d) = p.inner_diameter_m {
        return Some((d, "Inner diameter given".to_string(), None));
    }
    const BORE_HINT: &str = "give the bore in an Inner diameter column";
    let looked_up = match p.size? {
        SizeSpec::InnerDiameter { id_m } => {
            return Some((id_m, "bore written in Size".to_string(), None));
        }
        SizeSpec::OdWall { od_m, wall_m } if 2.0 * wall_m >= od_m => Err((
            format!(
                "wall {:.2} mm is too thick for OD {:.1} mm",
                wall_m * 1e3,
                od_m * 1e3
            ),
            None,
        )),
        SizeSpec::OdWall { od_m, wall_m } => {
            let basis = "OD and wall written in Size".to_string();
            return Some((od_m - 2.0 * wall_m, basis, Some(wall_m)));
        }
        SizeSpec::OuterDiameter { od_m } => pipe::bore_from_od(p.material, od_m, p.schedule)
            .map(|b| {
                let sch = p.schedule.map(|s| s.label()).unwrap_or_default();
                (b, format!("{} OD {:.1} mm {sch}", b.standard, od_m * 1e3))
            })
            .map_err(|e| (e.to_string(), Some(BORE_HINT))),
        SizeSpec::Dn(_) | SizeSpec::Nps(_) => match dn {
            None => Err((
                "size has no DN equivalent in ASME B36.10M".to_string(),
                Some(BORE_HINT),
            )),
            Some(dn) => pipe::bore(p.material, dn, p.schedule)
                .map(|b| {
                    let sch = p
                        .schedule
                        .or_else(|| pipe::default_schedule(p.material, dn))
                        .map(|s| s.label())
                        .unwrap_or_default();
                    let basis = format!("{} DN{dn} {sch}", b.standard);
                    (b, basis.trim_end().to_string())
                })
                .map_err(|e| {
                    (
                        e.to_string(),
                        Some(
                            "check the size and schedule, or give the bore in an Inner \
                             diameter column",
                        ),
                    )
                }),
        },
    };
    match looked_up {
        Ok((b, basis)) => Some((b.inner_diameter_m, basis, Some(b.wall_m))),
        Err((message, hint)) => {
            let cell = ctx.cell(TableKind::Pipes, &p.origin.sheet, p.origin.row, "size");
            ctx.error(cell, message, hint.map(str::to_string));
            None
        }
    }
}

/// A run's roughness and where it came from: given, else the material's new roughness, aged
/// when the run's age is given and the material has an ageing rate.
fn run_roughness(p: &PipeRow) -> (f64, String) {
    if let Some(e) = p.roughness_m {
        return (e, "Roughness given".to_string());
    }
    let r = pipe::roughness(p.material);
    match p
        .age_years
        .and_then(|a| pipe::aged_roughness(p.material, a).map(|e| (a, e)))
    {
        Some((a, e)) => (
            e,
            format!("{} new, aged {a} years (linear growth)", r.source),
        ),
        None => (r.epsilon_m, r.source.to_string()),
    }
}

/// What the placement findings need, gathered while the fittings are placed: indices into
/// `Input::fittings` and `Audit::runs`. `findings::placement` raises the findings from it, so
/// the line computation never depends on the findings.
#[derive(Debug, Default)]
pub struct Placements {
    /// Fittings whose size matches no run of their line, with the run they were computed on.
    pub mismatched: Vec<(usize, usize)>,
    /// Fittings with no size on a line of several bores, placed by their kind or the list
    /// order: the run and the reason in words.
    pub inferred: Vec<(usize, usize, String)>,
    /// Valves 0 % open on a line that carries flow (left out of the totals).
    pub closed: Vec<usize>,
}

/// What [`compute`] gives: the audit's lines, runs and fittings (no findings yet), each
/// fitting's model and what the placement findings need.
#[derive(Debug)]
pub struct Computed {
    /// Lines, runs, fittings, fluids and kinds used.
    pub audit: Audit,
    /// Each fitting's model, in the order of `Audit::fittings`.
    pub models: Models,
    /// Fittings placed off their size or by inference, and closed valves.
    pub placements: Placements,
}

/// Compute runs, fittings and line totals, in four stages: resolve fluids and bores
/// (`line_states`, `resolve_runs`), hydraulics per run (`hydraulics`), fittings on their runs
/// (`fittings`) and line totals (`line_totals`).
///
/// # Errors
///
/// The error diagnostics applying the physics reveals (a size with no bore, a fluid with no
/// properties, a fitting that cannot be placed or evaluated).
pub fn compute(input: &Input, rules: &Rules) -> Result<Computed, Vec<Diagnostic>> {
    let mut ctx = Ctx {
        input,
        errors: Vec::new(),
    };
    let mut fluids = Vec::new();
    let (line_order, states) = line_states(&mut ctx, &mut fluids);
    let (pipes, resolved) = resolve_runs(&mut ctx, &line_order, &states)?;
    let (runs_df, runs) = hydraulics(&ctx, &pipes, &resolved, &line_order, &states)?;
    let on_runs = RunsOfLines::new(input, &pipes, &resolved);
    let fitted = fittings(&mut ctx, &on_runs, &states)?;
    let mut lines = line_totals(&ctx, runs_df, &runs, &fitted.results, &line_order, &states)?;
    let line_index = index_fittings(&mut lines, &fitted.results);
    let audit = Audit {
        line_index,
        lines,
        runs,
        fittings: fitted.results,
        findings: Vec::new(),
        fluids,
        kinds_used: fitted.kinds_used,
        rules: rules.clone(),
        notes: Vec::new(),
        energy: Default::default(),
        systems: Vec::new(),
    };
    Ok(Computed {
        audit,
        models: fitted.models,
        placements: fitted.placements,
    })
}

/// The runs of the lines that have a fluid state, in sequence order (then row order) within
/// the lines' order, and their bores and roughness.
fn resolve_runs<'a>(
    ctx: &mut Ctx<'a>,
    line_order: &[String],
    states: &HashMap<String, LineState>,
) -> Result<(Vec<&'a PipeRow>, Vec<ResolvedRun>), Vec<Diagnostic>> {
    let input = ctx.input;
    let mut pipes: Vec<&PipeRow> = input
        .pipes
        .iter()
        .filter(|p| states.contains_key(&p.line))
        .collect();
    let pos: HashMap<&str, usize> = line_order
        .iter()
        .enumerate()
        .map(|(i, l)| (l.as_str(), i))
        .collect();
    pipes.sort_by(|a, b| {
        pos[a.line.as_str()]
            .cmp(&pos[b.line.as_str()])
            .then(
                a.seq
                    .unwrap_or(f64::INFINITY)
                    .total_cmp(&b.seq.unwrap_or(f64::INFINITY)),
            )
            .then(a.origin.row.cmp(&b.origin.row))
    });
    let resolved: Vec<Option<ResolvedRun>> = pipes.iter().map(|p| resolve_run(ctx, p)).collect();
    ctx.check()?;
    Ok((pipes, resolved.into_iter().flatten().collect()))
}

/// Velocity and Reynolds number of every run, vectorised in polars, then friction per run.
/// Also returns the runs frame, which the line totals group.
fn hydraulics(
    ctx: &Ctx<'_>,
    pipes: &[&PipeRow],
    resolved: &[ResolvedRun],
    line_order: &[String],
    states: &HashMap<String, LineState>,
) -> Result<(DataFrame, Vec<RunResult>), Vec<Diagnostic>> {
    let records: Vec<table::RunRecord<'_>> = pipes
        .iter()
        .zip(resolved)
        .map(|(p, r)| table::RunRecord {
            line: &p.line,
            sheet: &p.origin.sheet,
            row: p.origin.row,
            inner_diameter_m: r.d_m,
            length_m: p.length_m,
        })
        .collect();
    let line_records: Vec<table::LineRecord<'_>> = line_order
        .iter()
        .map(|l| {
            let s = &states[l];
            table::LineRecord {
                line: l,
                flow_m3_s: s.flow_m3_s,
                density_kg_m3: s.props.density_kg_m3,
                viscosity_pa_s: s.props.viscosity_pa_s,
            }
        })
        .collect();
    let runs_df = table::runs_frame(&records)
        .and_then(|r| table::lines_frame(&line_records).and_then(|l| table::run_hydraulics(&r, &l)))
        .map_err(|e| ctx.internal(e))?;
    let velocity = f64_column(&runs_df, table::col::VELOCITY).map_err(|e| ctx.internal(e))?;
    let reynolds = f64_column(&runs_df, table::col::REYNOLDS).map_err(|e| ctx.internal(e))?;
    let runs = pipes
        .iter()
        .zip(resolved)
        .enumerate()
        .map(|(i, (p, r))| run_result(ctx, p, r, &states[&p.line], velocity[i], reynolds[i]))
        .collect();
    Ok((runs_df, runs))
}

/// A column of f64 values, nulls as 0.
fn f64_column(df: &DataFrame, name: &str) -> PolarsResult<Vec<f64>> {
    df.column(name).and_then(|c| {
        c.f64()
            .map(|c| c.iter().map(|v| v.unwrap_or(0.0)).collect())
    })
}

/// One run's result at its line's flow, with velocity and Reynolds number from the frame.
fn run_result(
    ctx: &Ctx<'_>,
    p: &PipeRow,
    r: &ResolvedRun,
    s: &LineState,
    v: f64,
    re: f64,
) -> RunResult {
    let RunFriction {
        factor,
        regime,
        method,
        head_m: head,
    } = run_friction(r.d_m, p.length_m, r.eps_m, p.c_factor, s.flow_m3_s, v, re);
    RunResult {
        cell: ctx.cell(TableKind::Pipes, &p.origin.sheet, p.origin.row, "line"),
        line: p.line.clone(),
        row: p.origin.row,
        dn: r.dn,
        bore_basis: r.basis.clone(),
        inner_diameter_m: r.d_m,
        length_m: p.length_m,
        roughness_m: r.eps_m,
        roughness_basis: r.eps_basis.clone(),
        flow_m3_s: s.flow_m3_s,
        velocity_m_s: v,
        reynolds: re,
        friction_factor: factor,
        regime,
        method,
        head_m: head,
        dp_pa: head * s.props.density_kg_m3 * G,
        c_factor: p.c_factor,
    }
}

/// The runs and fittings of each line, indexed once (a scan per fitting is quadratic on large
/// registers).
struct RunsOfLines<'a> {
    /// Runs in line order, then sequence.
    pipes: &'a [&'a PipeRow],
    /// Their bores and roughness.
    resolved: &'a [ResolvedRun],
    /// Runs of each line, in order (indices into `pipes`).
    runs: HashMap<&'a str, Vec<usize>>,
    /// Fittings of each line in list order (indices into `Input::fittings`), for placing
    /// fittings with no Size.
    fittings: HashMap<&'a str, Vec<usize>>,
}

impl<'a> RunsOfLines<'a> {
    fn new(input: &'a Input, pipes: &'a [&'a PipeRow], resolved: &'a [ResolvedRun]) -> Self {
        let mut runs: HashMap<&str, Vec<usize>> = HashMap::new();
        for (i, p) in pipes.iter().enumerate().take(resolved.len()) {
            runs.entry(p.line.as_str()).or_default().push(i);
        }
        let mut fittings: HashMap<&str, Vec<usize>> = HashMap::new();
        for (i, f) in input.fittings.iter().enumerate() {
            fittings.entry(&*f.line).or_default().push(i);
        }
        RunsOfLines {
            pipes,
            resolved,
            runs,
            fittings,
        }
    }

    /// The runs of a line, in order.
    fn runs_of(&self, line: &str) -> &[usize] {
        self.runs.get(line).map_or(&[][..], Vec::as_slice)
    }

    /// The fittings of a line, in list order.
    fn fittings_of(&self, line: &str) -> &[usize] {
        self.fittings.get(line).map_or(&[][..], Vec::as_slice)
    }
}

/// The fittings computed, their models and kinds, and what the placement findings need.
struct Fitted {
    results: Vec<FittingResult>,
    models: Models,
    kinds_used: Vec<&'static str>,
    placements: Placements,
}

/// Each fitting on the run of its line with the same size, evaluated at the line's flow.
/// Fittings of lines with no fluid state or no runs are left out; closed valves are left out
/// of the totals and listed for their finding.
fn fittings(
    ctx: &mut Ctx<'_>,
    on_runs: &RunsOfLines<'_>,
    states: &HashMap<String, LineState>,
) -> Result<Fitted, Vec<Diagnostic>> {
    let input = ctx.input;
    let mut out = Fitted {
        results: Vec::with_capacity(input.fittings.len()),
        models: Models::with_capacity(input.fittings.len()),
        kinds_used: Vec::new(),
        placements: Placements::default(),
    };
    let mut same_cause = super::same_cause::SameCause::default();
    for (fi, f) in input.fittings.iter().enumerate() {
        let Some(state) = states.get(&*f.line) else {
            continue;
        };
        let Some((run, matched)) = place_fitting(ctx, on_runs, fi, &mut out.placements) else {
            continue;
        };
        let Some(model) = fitting_model(ctx, on_runs, f, run, matched) else {
            continue;
        };
        let (rho, mu) = (state.props.density_kg_m3, state.props.viscosity_pa_s);
        match fitting_at(&model, state.flow_m3_s, rho, mu) {
            Ok(heads) => {
                if !out.kinds_used.contains(&f.kind.id) {
                    out.kinds_used.push(f.kind.id);
                }
                out.results.push(fitting_result(ctx, f, heads, rho));
                out.models.push(model);
            }
            Err(FittingError::Closed { .. }) => out.placements.closed.push(fi),
            Err(e) => {
                let why = e.to_string();
                if same_cause.repeats(&f.line, &why, ctx.errors.len()) {
                    continue;
                }
                let cell = ctx.cell(TableKind::Fittings, &f.origin.sheet, f.origin.row, "item");
                ctx.error(cell, format!("{}: {why}", f.item), None);
            }
        }
    }
    same_cause.fold_into(&mut ctx.errors, "fitting");
    ctx.check()?;
    out.kinds_used.sort_unstable();
    Ok(out)
}

/// Place fitting `fi` (an index into `Input::fittings`) on a run of its line: the run and
/// whether its size matched it (a fitting whose size matches no run goes on the line's first
/// run). Records inferred and mismatched placements; None when the line has no runs or the
/// fitting cannot be placed (the error is recorded).
fn place_fitting(
    ctx: &mut Ctx<'_>,
    on_runs: &RunsOfLines<'_>,
    fi: usize,
    placements: &mut Placements,
) -> Option<(usize, bool)> {
    let input = ctx.input;
    let f = &input.fittings[fi];
    let line_runs = on_runs.runs_of(&f.line);
    let &first = line_runs.first()?;
    let siblings = on_runs.fittings_of(&f.line);
    match place(ctx, on_runs.resolved, line_runs, siblings, fi) {
        Placement::Run(i) => Some((i, true)),
        Placement::Inferred(i, why) => {
            placements.inferred.push((fi, i, why));
            Some((i, true))
        }
        Placement::NoMatch => {
            placements.mismatched.push((fi, first));
            Some((first, false))
        }
        Placement::Ambiguous => {
            let cell = ctx.cell(TableKind::Fittings, &f.origin.sheet, f.origin.row, "size");
            let sizes = line_sizes(ctx, on_runs.pipes, on_runs.resolved, line_runs);
            ctx.error(
                cell,
                format!(
                    "{} has no Size and line {} has runs of several sizes ({sizes}): it cannot \
                     be placed on one of them",
                    fitting_label(f),
                    f.line
                ),
                Some(
                    "write the fitting's Size (or list it after a fitting of known size, in \
                     flow order)"
                        .into(),
                ),
            );
            None
        }
    }
}

/// The model of a fitting placed on `run` (`matched`: its size is the run's): its inlet bore
/// (its own size looked up when it matched no run), outlet bore, and the run's wall and
/// roughness. None when the outlet has no bore (the error is recorded).
fn fitting_model(
    ctx: &mut Ctx<'_>,
    on_runs: &RunsOfLines<'_>,
    f: &FittingRow,
    run: usize,
    matched: bool,
) -> Option<FittingModel> {
    let (p, r) = (on_runs.pipes[run], &on_runs.resolved[run]);
    let key = f.size.as_ref().and_then(size_key).filter(|_| !matched);
    let d_in = key.map_or(r.d_m, |k| bore_of_key(k, p, r).unwrap_or(r.d_m));
    // The wall of the run, when the fitting sits on it (a projecting entrance's t/d).
    let wall_m = r.wall_m.filter(|_| matched);
    let d_out = match f
        .size_out
        .as_ref()
        .and_then(|size| outlet_bore(on_runs, f, size, p, r))
    {
        Some(Some(d)) => Some(d),
        Some(None) => {
            let cell = ctx.cell(
                TableKind::Fittings,
                &f.origin.sheet,
                f.origin.row,
                "size_out",
            );
            ctx.error(
                cell,
                "the outlet size has no bore on this line and none can be looked up".into(),
                Some("list a run of that size on the line, or write the outlet as ID in mm".into()),
            );
            return None;
        }
        None => None,
    };
    let nps_in = match key {
        Some(SizeKey::Dn(dn)) => pipe::dn_to_nps(dn),
        _ => r.nps,
    };
    let input = FittingInput {
        nps_in,
        d_in_m: d_in,
        d_out_m: d_out,
        re_in: 0.0,
        relative_roughness: r.eps_m / d_in,
        opening: f.opening,
        k_given: f.k,
        kv_given: f.kv,
        cv_given: f.cv,
        le_d: f.le_d,
        bend_radius_d: f.bend_radius_d,
        angle_deg: f.angle_deg,
        fouling: f.fouling,
        beta: f.beta,
        length_ratio: match f.kind.model {
            fitting::Model::EntranceProjecting { .. } => wall_m.map(|w| w / d_in),
            _ => None,
        },
        ..FittingInput::default()
    };
    Some(FittingModel {
        kind: f.kind,
        input,
        qty: f.qty,
    })
}

/// The bore of a fitting's written outlet size: `Some(None)` when the size has a key but no
/// run of the line has it and none can be looked up, `None` when the size has no key.
fn outlet_bore(
    on_runs: &RunsOfLines<'_>,
    f: &FittingRow,
    size: &SizeSpec,
    p: &PipeRow,
    r: &ResolvedRun,
) -> Option<Option<f64>> {
    let k = size_key(size)?;
    Some(
        run_of_size(on_runs.resolved, on_runs.runs_of(&f.line), size)
            .map(|i| on_runs.resolved[i].d_m)
            .or_else(|| bore_of_key(k, p, r)),
    )
}

/// One fitting's result from its heads at the line's flow (density `rho`, kg/m³).
fn fitting_result(ctx: &Ctx<'_>, f: &FittingRow, heads: FittingHeads, rho: f64) -> FittingResult {
    let FittingHeads {
        k,
        velocity_m_s,
        reynolds,
        head_m,
        head_low_m,
        head_high_m,
    } = heads;
    FittingResult {
        tag: f.tag.clone(),
        line: f.line.clone(),
        item: f.item.clone(),
        kind: f.kind.id,
        cell: ctx.cell(TableKind::Fittings, &f.origin.sheet, f.origin.row, "item"),
        row: f.origin.row,
        qty: f.qty,
        k: k.k,
        k_low: k.k_low,
        k_high: k.k_high,
        reference_diameter_m: k.reference_diameter_m,
        velocity_m_s,
        reynolds,
        head_m,
        head_low_m,
        head_high_m,
        dp_pa: head_m * rho * G,
        model: k.model,
        source: k.source,
        opening: f.opening,
        replacement_cost: f.replacement_cost,
        power_loss_w: None,
        annual_energy_kwh: None,
        annual_cost: None,
        annual_co2_kg: None,
        rank: None,
        rank_uncertain: None,
        suggestion: None,
        ranking: None,
        group: f.kind.group,
    }
}

/// Line totals by polars group-by and join: friction and length of the runs, the fittings'
/// heads, the highest velocity; one result per line in the lines' order.
fn line_totals(
    ctx: &Ctx<'_>,
    mut runs_df: DataFrame,
    runs: &[RunResult],
    fittings: &[FittingResult],
    line_order: &[String],
    states: &HashMap<String, LineState>,
) -> Result<Vec<LineResult>, Vec<Diagnostic>> {
    let totals = table::heads_frame(
        fittings.iter().map(|f| &*f.line).collect(),
        fittings.iter().map(|f| f.head_m).collect(),
        fittings.iter().map(|f| f.head_low_m).collect(),
        fittings.iter().map(|f| f.head_high_m).collect(),
    )
    .and_then(|fit| {
        let run_heads: Vec<f64> = runs.iter().map(|r| r.head_m).collect();
        runs_df.with_column(Column::new(table::col::HEAD.into(), run_heads))?;
        table::line_totals(&runs_df, &fit)
    })
    .map_err(|e| ctx.internal(e))?;
    drop(runs_df);
    let totals: HashMap<String, table::LineTotals> = totals.into_iter().collect();
    let mut run_index: HashMap<&str, Vec<usize>> = HashMap::new();
    for (i, r) in runs.iter().enumerate() {
        run_index.entry(r.line.as_str()).or_default().push(i);
    }
    Ok(line_order
        .iter()
        .map(|l| {
            let t = totals.get(l).cloned().unwrap_or_default();
            let line_runs = run_index.get(l.as_str()).cloned().unwrap_or_default();
            line_result(l, &states[l], &t, line_runs)
        })
        .collect())
}

/// One line's result from its fluid state and totals (no fittings indexed yet, no energy).
fn line_result(l: &str, s: &LineState, t: &table::LineTotals, runs: Vec<usize>) -> LineResult {
    let total = t.friction_head_m + t.fittings_head_m;
    LineResult {
        line: l.to_string(),
        service: s.service,
        row: s.row,
        sheet: s.row.map(|_| s.sheet.clone()),
        flow_m3_s: s.flow_m3_s,
        fluid: s.fluid.clone(),
        temperature_c: s.temperature_c,
        density_kg_m3: s.props.density_kg_m3,
        viscosity_pa_s: s.props.viscosity_pa_s,
        vapour_pressure_pa: s
            .props
            .vapour_pressure_pa
            .is_finite()
            .then_some(s.props.vapour_pressure_pa),
        elevation_change_m: s.elevation_change_m,
        length_m: t.length_m,
        friction_head_m: t.friction_head_m,
        fittings_head_m: t.fittings_head_m,
        total_head_m: total,
        total_head_low_m: t.friction_head_m + t.fittings_head_low_m,
        total_head_high_m: t.friction_head_m + t.fittings_head_high_m,
        total_dp_pa: total * s.props.density_kg_m3 * G,
        max_velocity_m_s: t.max_velocity_m_s,
        runs,
        fittings: Vec::new(),
        power_loss_w: None,
        annual_energy_kwh: None,
        annual_cost: None,
        annual_co2_kg: None,
        efficiency: None,
        efficiency_basis: "",
        hours_per_year: None,
    }
}

/// Index the lines by id and list each line's fittings (in input order) on it.
fn index_fittings(lines: &mut [LineResult], fittings: &[FittingResult]) -> HashMap<String, usize> {
    let line_index: HashMap<String, usize> = lines
        .iter()
        .enumerate()
        .map(|(i, l)| (l.line.clone(), i))
        .collect();
    for (i, f) in fittings.iter().enumerate() {
        if let Some(&li) = line_index.get(&*f.line) {
            lines[li].fittings.push(i);
        }
    }
    line_index
}

/// Where a fitting goes among its line's runs.
enum Placement {
    /// On this run (its size matches, or the line has one bore).
    Run(usize),
    /// On this run, placed by the list order or its kind (no Size given); the reason in words.
    Inferred(usize, String),
    /// Its size matches no run.
    NoMatch,
    /// No Size, several bores, and nothing places it.
    Ambiguous,
}

/// Relative difference within which a bore written on a fitting (`ID 400`) is the bore of a run:
/// 1 % (our own choice: adjacent nominal sizes differ by far more, rounding of a written bore by
/// less).
const BORE_MATCH_REL: f64 = 0.01;

/// The run of `line_runs` a written size names: same size key, or (for a bore) the same bore.
fn run_of_size(resolved: &[ResolvedRun], line_runs: &[usize], size: &SizeSpec) -> Option<usize> {
    let key = size_key(size)?;
    if let Some(&i) = line_runs.iter().find(|&&i| resolved[i].key == Some(key)) {
        return Some(i);
    }
    let SizeKey::Bore(tenths) = key else {
        return None;
    };
    let d = tenths as f64 * 1e-4;
    line_runs
        .iter()
        .copied()
        .filter(|&i| (resolved[i].d_m - d).abs() <= BORE_MATCH_REL * resolved[i].d_m)
        .min_by(|&a, &b| {
            (resolved[a].d_m - d)
                .abs()
                .total_cmp(&(resolved[b].d_m - d).abs())
        })
}

/// Whether two runs have the same bore (to 0.1 mm).
fn same_bore(resolved: &[ResolvedRun], a: usize, b: usize) -> bool {
    (resolved[a].d_m - resolved[b].d_m).abs() < 0.5e-4
}

/// Place fitting `fi` (an index into `input.fittings`) on one of its line's runs.
///
/// With a Size: the run of that size, else [`Placement::NoMatch`]. Without: the line's run when
/// all its runs share one bore; an entrance on the first run and an exit on the last (in
/// sequence); otherwise the bore the list order gives — the outlet of the nearest sized fitting
/// listed before it and the inlet of the nearest one listed after it, which must agree.
fn place(
    ctx: &Ctx<'_>,
    resolved: &[ResolvedRun],
    line_runs: &[usize],
    siblings: &[usize],
    fi: usize,
) -> Placement {
    let input = ctx.input;
    let f = &input.fittings[fi];
    if let Some(size) = &f.size {
        return run_of_size(resolved, line_runs, size).map_or(Placement::NoMatch, Placement::Run);
    }
    let (first, last) = (line_runs[0], line_runs[line_runs.len() - 1]);
    if line_runs.iter().all(|&i| same_bore(resolved, i, first)) {
        return Placement::Run(first);
    }
    match f.kind.group {
        fitting::Group::Entrance => {
            return Placement::Inferred(
                first,
                "an entrance is at the upstream end: the line's first run".into(),
            );
        }
        fitting::Group::Exit => {
            return Placement::Inferred(
                last,
                "an exit is at the downstream end: the line's last run".into(),
            );
        }
        _ => {}
    }
    let pos = siblings.iter().position(|&i| i == fi).unwrap_or(0);
    let before = siblings[..pos]
        .iter()
        .rev()
        .map(|&i| &input.fittings[i])
        .find_map(|g| g.size_out.as_ref().or(g.size.as_ref()).map(|s| (g, s)));
    let after = siblings[pos + 1..]
        .iter()
        .map(|&i| &input.fittings[i])
        .find_map(|g| g.size.as_ref().map(|s| (g, s)));
    let by_before = before.and_then(|(g, s)| Some((g, run_of_size(resolved, line_runs, s)?)));
    let by_after = after.and_then(|(g, s)| Some((g, run_of_size(resolved, line_runs, s)?)));
    let row = |g: &FittingRow| {
        let cell = ctx.cell(TableKind::Fittings, &g.origin.sheet, g.origin.row, "item");
        format!("{} at {cell}", fitting_label(g))
    };
    match (by_before, by_after) {
        (Some((g, a)), Some((h, b))) if same_bore(resolved, a, b) => Placement::Inferred(
            a,
            format!(
                "listed between {} and {}, both at this bore",
                row(g),
                row(h)
            ),
        ),
        (Some((g, a)), None) if after.is_none() => Placement::Inferred(
            a,
            format!("listed after {}, the last sized item before it", row(g)),
        ),
        (None, Some((h, b))) if before.is_none() => Placement::Inferred(
            b,
            format!("listed before {}, the first sized item after it", row(h)),
        ),
        _ => Placement::Ambiguous,
    }
}

/// The distinct sizes of a line's runs with their cells, for messages.
fn line_sizes(
    ctx: &Ctx<'_>,
    pipes: &[&PipeRow],
    resolved: &[ResolvedRun],
    line_runs: &[usize],
) -> String {
    let mut out: Vec<String> = Vec::new();
    for (n, &i) in line_runs.iter().enumerate() {
        if line_runs[..n].iter().any(|&j| same_bore(resolved, i, j)) {
            continue;
        }
        let r = &resolved[i];
        let size = match r.dn {
            Some(dn) => format!("DN{dn}, bore {:.1} mm", r.d_m * 1e3),
            None => format!("bore {:.1} mm", r.d_m * 1e3),
        };
        let p = pipes[i];
        let cell = ctx.cell(TableKind::Pipes, &p.origin.sheet, p.origin.row, "size");
        out.push(format!("{size} at {cell}"));
    }
    out.join("; ")
}

/// Bore of a size written on a fitting that matches no run: looked up with the run's material and schedule.
fn bore_of_key(key: SizeKey, p: &PipeRow, r: &ResolvedRun) -> Option<f64> {
    match key {
        SizeKey::Dn(dn) => pipe::bore(p.material, dn, p.schedule)
            .ok()
            .map(|b| b.inner_diameter_m),
        SizeKey::Od(od) => pipe::bore_from_od(p.material, od as f64 * 1e-4, p.schedule)
            .ok()
            .map(|b| b.inner_diameter_m),
        SizeKey::Bore(b) => Some(b as f64 * 1e-4).filter(|d| *d > 0.0 && r.d_m > 0.0),
    }
}

/// A fitting row's description for messages: tag, else item.
pub fn fitting_label(f: &FittingRow) -> String {
    if f.tag.is_empty() {
        f.item.to_string()
    } else {
        format!("{} ({})", f.tag, f.item)
    }
}

/// Whether a regime is the transition band.
pub fn is_transition(r: Regime) -> bool {
    r == Regime::Transition
}

/// Friction of one run at one flow.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RunFriction {
    /// Darcy factor (0 for Hazen–Williams runs).
    pub factor: f64,
    /// Regime at this flow.
    pub regime: Regime,
    /// Method used.
    pub method: &'static str,
    /// Friction head, m.
    pub head_m: f64,
}

/// Friction head of one run (bore `d_m`, length, roughness, optional Hazen–Williams C) at a flow
/// whose mean velocity and Reynolds number are given. The one place run friction is computed:
/// the audit at duty flow and the system curve at other flows both call it.
pub fn run_friction(
    d_m: f64,
    length_m: f64,
    eps_m: f64,
    c_factor: Option<f64>,
    flow_m3_s: f64,
    velocity_m_s: f64,
    reynolds: f64,
) -> RunFriction {
    let f = friction::darcy_friction(reynolds, eps_m / d_m);
    match c_factor {
        Some(c) => RunFriction {
            factor: 0.0,
            regime: f.regime,
            method: "Hazen–Williams",
            head_m: friction::hazen_williams_head(length_m, flow_m3_s, c, d_m),
        },
        None => RunFriction {
            factor: f.factor,
            regime: f.regime,
            method: "Darcy–Weisbach with Colebrook–White",
            head_m: friction::darcy_weisbach_head(f.factor, length_m, d_m, velocity_m_s),
        },
    }
}

/// What is needed to evaluate one fitting row at any flow: its kind, the model input (bores,
/// roughness, opening, given values; `re_in` is set per flow) and its quantity.
#[derive(Clone, Copy, Debug)]
pub struct FittingModel {
    /// Catalogue kind.
    pub kind: &'static Kind,
    /// Model input; `re_in` is overwritten by [`fitting_at`].
    pub input: FittingInput,
    /// Quantity.
    pub qty: f64,
}

/// One fitting row's K and heads at one flow.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FittingHeads {
    /// K per item with its band and reference bore.
    pub k: FittingK,
    /// Velocity in the reference bore, m/s.
    pub velocity_m_s: f64,
    /// Reynolds number in the reference bore.
    pub reynolds: f64,
    /// Head for the quantity, m.
    pub head_m: f64,
    /// Low end, m.
    pub head_low_m: f64,
    /// High end, m.
    pub head_high_m: f64,
}

/// Evaluate a fitting at a flow: Reynolds number at the inlet bore, K from its model (so
/// Re-dependent models such as Darby 3-K are re-evaluated), and h = K v²/2g × quantity with v in
/// the bore K refers to. The one place fitting heads are computed.
pub fn fitting_at(
    model: &FittingModel,
    flow_m3_s: f64,
    density_kg_m3: f64,
    viscosity_pa_s: f64,
) -> Result<FittingHeads, FittingError> {
    let area = |d: f64| std::f64::consts::PI * d * d / 4.0;
    let d_in = model.input.d_in_m;
    let v_in = flow_m3_s / area(d_in);
    let input = FittingInput {
        re_in: density_kg_m3 * v_in * d_in / viscosity_pa_s,
        ..model.input
    };
    let k = fitting::evaluate(model.kind, &input)?;
    let v = flow_m3_s / area(k.reference_diameter_m);
    let re = density_kg_m3 * v * k.reference_diameter_m / viscosity_pa_s;
    let dyn_head = v * v / (2.0 * G);
    Ok(FittingHeads {
        k,
        velocity_m_s: v,
        reynolds: re,
        head_m: k.k * dyn_head * model.qty,
        head_low_m: k.k_low * dyn_head * model.qty,
        head_high_m: k.k_high * dyn_head * model.qty,
    })
}

/// A line's losses re-evaluated at another flow.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LineHeads {
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Friction head, m.
    pub friction_head_m: f64,
    /// Fittings head, m.
    pub fittings_head_m: f64,
    /// Total, m.
    pub total_head_m: f64,
    /// Total with the fittings at the high end of their K bands, m.
    pub total_head_high_m: f64,
    /// Regime of the line's first run at this flow (None without runs).
    pub regime: Option<Regime>,
}

/// Re-run one line's runs and fittings at `flow_m3_s` (same fluid), recomputing Reynolds
/// numbers, friction factors and Re-dependent K values; zero flow gives zero loss.
///
/// Fittings whose K cannot be evaluated at the new flow are left out (none is expected: the same
/// inputs evaluated at duty flow).
/// `models` are the fittings' models from [`compute`].
pub fn line_heads_at(
    audit: &Audit,
    models: &Models,
    line: &LineResult,
    flow_m3_s: f64,
) -> LineHeads {
    let (rho, mu) = (line.density_kg_m3, line.viscosity_pa_s);
    let first_regime = line.runs.first().map(|&i| {
        let r = &audit.runs[i];
        let v = flow_m3_s / (std::f64::consts::PI * r.inner_diameter_m * r.inner_diameter_m / 4.0);
        friction::darcy_friction(
            rho * v * r.inner_diameter_m / mu,
            r.roughness_m / r.inner_diameter_m,
        )
        .regime
    });
    if flow_m3_s.is_nan() || flow_m3_s <= 0.0 {
        return LineHeads {
            flow_m3_s,
            friction_head_m: 0.0,
            fittings_head_m: 0.0,
            total_head_m: 0.0,
            total_head_high_m: 0.0,
            regime: first_regime,
        };
    }
    let mut friction_head_m = 0.0;
    for &i in &line.runs {
        let r = &audit.runs[i];
        let d = r.inner_diameter_m;
        let v = flow_m3_s / (std::f64::consts::PI * d * d / 4.0);
        let re = rho * v * d / mu;
        friction_head_m +=
            run_friction(d, r.length_m, r.roughness_m, r.c_factor, flow_m3_s, v, re).head_m;
    }
    let (fittings_head_m, fittings_head_high_m) = line
        .fittings
        .iter()
        .filter_map(|&i| fitting_at(&models.get(i)?, flow_m3_s, rho, mu).ok())
        .fold((0.0, 0.0), |(h, hi), f| (h + f.head_m, hi + f.head_high_m));
    LineHeads {
        flow_m3_s,
        friction_head_m,
        fittings_head_m,
        total_head_m: friction_head_m + fittings_head_m,
        total_head_high_m: friction_head_m + fittings_head_high_m,
        regime: first_regime,
    }
}
