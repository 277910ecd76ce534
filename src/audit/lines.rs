//! Per-run, per-fitting and per-line hydraulics.

use std::collections::HashMap;

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
}

fn is_water(name: &str) -> bool {
    name.split(|c: char| !c.is_alphanumeric())
        .any(|w| w == "water")
}

/// Fluid state of every line: Lines rows, plus lines only Pipes names (with flow on their runs).
fn line_states(
    ctx: &mut Ctx<'_>,
    fluids_used: &mut Vec<FluidUsed>,
) -> (Vec<String>, HashMap<String, LineState>) {
    let input = ctx.input;
    let mut order = Vec::new();
    let mut states = HashMap::new();
    let mut run_flow: HashMap<&str, f64> = HashMap::new();
    for p in &input.pipes {
        if let Some(q) = p.flow_m3_s {
            run_flow.entry(p.line.as_str()).or_insert(q);
        }
    }
    let mut add = |ctx: &mut Ctx<'_>,
                   line: &str,
                   service,
                   row: Option<u32>,
                   sheet: &str,
                   flow: f64,
                   fluid_name: &str,
                   t: f64,
                   dz: f64| {
        let props = match input.fluids.iter().find(|f| f.fluid == fluid_name) {
            Some(f) => Ok((fluid::FluidProps {
                density_kg_m3: f.density_kg_m3,
                viscosity_pa_s: f.viscosity_pa_s,
                vapour_pressure_pa: f.vapour_pressure_pa.unwrap_or(f64::NAN),
            }, format!("Fluids sheet row {}", f.origin.row + 1))),
            None if is_water(fluid_name) => fluid::water(t).map(|p| (p, "IAPWS-IF97 (density, saturation pressure) and IAPWS 2008 viscosity via seuif97, at 101.325 kPa".to_string())).map_err(|e| (format!("{e}"), "temperature", Some(format!("the water model covers {}–{} °C", fluid::WATER_T_MIN_C, fluid::WATER_T_MAX_C)))),
            None => Err((format!("fluid '{fluid_name}' is not water and is not listed in a Fluids sheet"), "fluid", Some("add a Fluids sheet with Fluid, Density and Viscosity for it".to_string()))),
        };
        match props {
            Ok((props, basis)) => {
                if !fluids_used
                    .iter()
                    .any(|u| u.fluid == fluid_name && u.temperature_c == t)
                {
                    fluids_used.push(FluidUsed {
                        fluid: fluid_name.to_string(),
                        temperature_c: t,
                        props,
                        basis,
                    });
                }
                order.push(line.to_string());
                states.insert(
                    line.to_string(),
                    LineState {
                        service,
                        row,
                        sheet: sheet.to_string(),
                        flow_m3_s: flow,
                        fluid: fluid_name.to_string(),
                        temperature_c: t,
                        props,
                        elevation_change_m: dz,
                    },
                );
            }
            Err((message, key, hint)) => {
                let cell = ctx.cell(TableKind::Lines, sheet, row.unwrap_or(0), key);
                ctx.error(cell, message, hint);
            }
        }
    };
    for l in &input.lines {
        let Some(flow) = l
            .flow_m3_s
            .or_else(|| run_flow.get(l.line.as_str()).copied())
        else {
            continue;
        };
        add(
            ctx,
            &l.line,
            l.service,
            Some(l.origin.row),
            &l.origin.sheet,
            flow,
            &l.fluid,
            l.temperature_c,
            l.elevation_change_m.unwrap_or(0.0),
        );
    }
    let mut seen: std::collections::HashSet<&str> =
        input.lines.iter().map(|l| l.line.as_str()).collect();
    let mut implicit: Vec<&PipeRow> = Vec::new();
    for p in &input.pipes {
        if seen.insert(p.line.as_str()) {
            implicit.push(p);
        }
    }
    for p in implicit {
        if let Some(&flow) = run_flow.get(p.line.as_str()) {
            add(
                ctx,
                &p.line,
                Service::General,
                None,
                &p.origin.sheet,
                flow,
                "water",
                20.0,
                0.0,
            );
        }
    }
    (order, states)
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
    let nps = dn.and_then(pipe::dn_to_nps);
    let size_cell = ctx.cell(TableKind::Pipes, &p.origin.sheet, p.origin.row, "size");
    let mut wall = None;
    let (d_m, basis) = if let Some(d) = p.inner_diameter_m {
        (d, "Inner diameter given".to_string())
    } else {
        match p.size? {
            SizeSpec::InnerDiameter { id_m } => (id_m, "bore written in Size".to_string()),
            SizeSpec::OdWall { od_m, wall_m } => {
                if 2.0 * wall_m >= od_m {
                    ctx.error(
                        size_cell,
                        format!(
                            "wall {:.2} mm is too thick for OD {:.1} mm",
                            wall_m * 1e3,
                            od_m * 1e3
                        ),
                        None,
                    );
                    return None;
                }
                wall = Some(wall_m);
                (
                    od_m - 2.0 * wall_m,
                    "OD and wall written in Size".to_string(),
                )
            }
            SizeSpec::OuterDiameter { od_m } => {
                match pipe::bore_from_od(p.material, od_m, p.schedule) {
                    Ok(b) => {
                        wall = Some(b.wall_m);
                        (
                            b.inner_diameter_m,
                            format!(
                                "{} OD {:.1} mm {}",
                                b.standard,
                                od_m * 1e3,
                                p.schedule.map(|s| s.label()).unwrap_or_default()
                            ),
                        )
                    }
                    Err(e) => {
                        ctx.error(
                            size_cell,
                            e.to_string(),
                            Some("give the bore in an Inner diameter column".into()),
                        );
                        return None;
                    }
                }
            }
            SizeSpec::Dn(_) | SizeSpec::Nps(_) => {
                let Some(dn) = dn else {
                    ctx.error(
                        size_cell,
                        "size has no DN equivalent in ASME B36.10M".into(),
                        Some("give the bore in an Inner diameter column".into()),
                    );
                    return None;
                };
                match pipe::bore(p.material, dn, p.schedule) {
                    Ok(b) => {
                        wall = Some(b.wall_m);
                        let sch = p
                            .schedule
                            .or_else(|| pipe::default_schedule(p.material, dn))
                            .map(|s| s.label())
                            .unwrap_or_default();
                        (
                            b.inner_diameter_m,
                            format!("{} DN{dn} {sch}", b.standard)
                                .trim_end()
                                .to_string(),
                        )
                    }
                    Err(e) => {
                        ctx.error(size_cell, e.to_string(), Some("check the size and schedule, or give the bore in an Inner diameter column".into()));
                        return None;
                    }
                }
            }
        }
    };
    let (eps_m, eps_basis) = match p.roughness_m {
        Some(e) => (e, "Roughness given".to_string()),
        None => {
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
    };
    Some(ResolvedRun {
        dn,
        nps,
        key,
        d_m,
        wall_m: wall,
        basis,
        eps_m,
        eps_basis,
    })
}

/// Compute runs, fittings and line totals; also returns each fitting's model, in the order of
/// `Audit::fittings`.
pub fn compute(
    input: &Input,
    rules: &Rules,
) -> Result<(Audit, Vec<FittingModel>), Vec<Diagnostic>> {
    let mut ctx = Ctx {
        input,
        errors: Vec::new(),
    };
    let mut fluids_used = Vec::new();
    let (line_order, states) = line_states(&mut ctx, &mut fluids_used);

    // Runs of each line in sequence order (then row order).
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
    let resolved: Vec<Option<ResolvedRun>> =
        pipes.iter().map(|p| resolve_run(&mut ctx, p)).collect();
    if !ctx.errors.is_empty() {
        return Err(ctx.errors);
    }
    let resolved: Vec<ResolvedRun> = resolved.into_iter().flatten().collect();

    // Vectorised velocity and Reynolds number (polars), then friction per run.
    let records: Vec<table::RunRecord<'_>> = pipes
        .iter()
        .zip(&resolved)
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
    let internal = |e: polars::error::PolarsError| {
        vec![Diagnostic {
            severity: Severity::Error,
            file: input.file.clone(),
            cell: None,
            message: format!("internal table error: {e}"),
            hint: None,
        }]
    };
    let runs_df = table::runs_frame(&records)
        .and_then(|r| table::lines_frame(&line_records).and_then(|l| table::run_hydraulics(&r, &l)))
        .map_err(internal)?;
    let velocity: Vec<f64> = runs_df
        .column(table::col::VELOCITY)
        .and_then(|c| {
            c.f64()
                .map(|c| c.iter().map(|v| v.unwrap_or(0.0)).collect())
        })
        .map_err(internal)?;
    let reynolds: Vec<f64> = runs_df
        .column(table::col::REYNOLDS)
        .and_then(|c| {
            c.f64()
                .map(|c| c.iter().map(|v| v.unwrap_or(0.0)).collect())
        })
        .map_err(internal)?;

    let mut runs = Vec::with_capacity(pipes.len());
    for (i, (p, r)) in pipes.iter().zip(&resolved).enumerate() {
        let s = &states[&p.line];
        let (v, re) = (velocity[i], reynolds[i]);
        let RunFriction {
            factor,
            regime,
            method,
            head_m: head,
        } = run_friction(r.d_m, p.length_m, r.eps_m, p.c_factor, s.flow_m3_s, v, re);
        runs.push(RunResult {
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
        });
    }

    // Fittings on the run of their line with the same size.
    let mut fittings = Vec::with_capacity(input.fittings.len());
    let mut models = Vec::with_capacity(input.fittings.len());
    let mut kinds_used: Vec<&'static str> = Vec::new();
    let mut mismatches = Vec::new();
    let mut closed = Vec::new();
    // Runs of each line, in order, built once (a scan per fitting is quadratic on large registers).
    let mut runs_by_line: HashMap<&str, Vec<usize>> = HashMap::new();
    for (i, p) in pipes.iter().enumerate().take(runs.len()) {
        runs_by_line.entry(p.line.as_str()).or_default().push(i);
    }
    // Fittings of each line in list order (for placing fittings with no Size).
    let mut fits_by_line: HashMap<&str, Vec<usize>> = HashMap::new();
    for (i, f) in input.fittings.iter().enumerate() {
        fits_by_line.entry(f.line.as_str()).or_default().push(i);
    }
    let mut inferred = Vec::new();
    let mut same_cause = super::same_cause::SameCause::default();
    for (fi, f) in input.fittings.iter().enumerate() {
        let Some(state) = states.get(&f.line) else {
            continue;
        };
        let line_runs: Vec<usize> = runs_by_line
            .get(f.line.as_str())
            .cloned()
            .unwrap_or_default();
        let Some(&first) = line_runs.first() else {
            continue;
        };
        let key = f.size.as_ref().and_then(size_key);
        let siblings = fits_by_line
            .get(f.line.as_str())
            .map_or(&[][..], |v| &v[..]);
        let matched = match place(&ctx, &resolved, &line_runs, siblings, fi) {
            Placement::Run(i) => Some(i),
            Placement::Inferred(i, why) => {
                inferred.push((f, i, why));
                Some(i)
            }
            Placement::NoMatch => None,
            Placement::Ambiguous => {
                let cell = ctx.cell(TableKind::Fittings, &f.origin.sheet, f.origin.row, "size");
                let sizes = line_sizes(&ctx, &pipes, &resolved, &line_runs);
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
                continue;
            }
        };
        let run = match matched {
            Some(i) => i,
            None => {
                mismatches.push((f, first));
                first
            }
        };
        let r = &resolved[run];
        let d_in = match (matched, key) {
            (None, Some(k)) => bore_of_key(k, pipes[run], r).unwrap_or(r.d_m),
            _ => r.d_m,
        };
        // The wall of the run, when the fitting sits on it (a projecting entrance's t/d).
        let wall_m = matched.and(r.wall_m);
        let d_out = f.size_out.as_ref().and_then(|size| {
            let k = size_key(size)?;
            Some(
                run_of_size(&resolved, &line_runs, size)
                    .map(|i| resolved[i].d_m)
                    .or_else(|| bore_of_key(k, pipes[run], r)),
            )
        });
        let d_out = match d_out {
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
                    Some(
                        "list a run of that size on the line, or write the outlet as ID in mm"
                            .into(),
                    ),
                );
                continue;
            }
            None => None,
        };
        let nps_in = match (matched, key) {
            (None, Some(SizeKey::Dn(dn))) => pipe::dn_to_nps(dn),
            _ => r.nps,
        };
        let fin = FittingInput {
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
        let model = FittingModel {
            kind: f.kind,
            input: fin,
            qty: f.qty,
        };
        match fitting_at(
            &model,
            state.flow_m3_s,
            state.props.density_kg_m3,
            state.props.viscosity_pa_s,
        ) {
            Ok(FittingHeads {
                k,
                velocity_m_s: v,
                reynolds: re,
                head_m,
                head_low_m,
                head_high_m,
            }) => {
                if !kinds_used.contains(&f.kind.id) {
                    kinds_used.push(f.kind.id);
                }
                fittings.push(FittingResult {
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
                    velocity_m_s: v,
                    reynolds: re,
                    head_m,
                    head_low_m,
                    head_high_m,
                    dp_pa: head_m * state.props.density_kg_m3 * G,
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
                });
                models.push(model);
            }
            Err(fitting::FittingError::Closed { .. }) => closed.push(f),
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
    if !ctx.errors.is_empty() {
        return Err(ctx.errors);
    }

    // Line totals by polars group-by and join.
    let fit_df = table::heads_frame(
        fittings.iter().map(|f| f.line.as_str()).collect(),
        fittings.iter().map(|f| f.head_m).collect(),
        fittings.iter().map(|f| f.head_low_m).collect(),
        fittings.iter().map(|f| f.head_high_m).collect(),
    );
    let run_heads: Vec<f64> = runs.iter().map(|r| r.head_m).collect();
    let totals = fit_df
        .and_then(|fit| {
            let mut df = runs_df.clone();
            df.with_column(polars::prelude::Column::new(
                table::col::HEAD.into(),
                run_heads,
            ))?;
            table::line_totals(&df, &fit)
        })
        .map_err(internal)?;
    let totals: HashMap<String, table::LineTotals> = totals.into_iter().collect();

    let mut run_index: HashMap<&str, Vec<usize>> = HashMap::new();
    for (i, r) in runs.iter().enumerate() {
        run_index.entry(r.line.as_str()).or_default().push(i);
    }
    let mut lines = Vec::with_capacity(line_order.len());
    for l in &line_order {
        let s = &states[l];
        let t = totals.get(l).cloned().unwrap_or_default();
        let total = t.friction_head_m + t.fittings_head_m;
        lines.push(LineResult {
            line: l.clone(),
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
            runs: run_index.get(l.as_str()).cloned().unwrap_or_default(),
            fittings: Vec::new(),
            power_loss_w: None,
            annual_energy_kwh: None,
            annual_cost: None,
            annual_co2_kg: None,
            efficiency: None,
            efficiency_basis: "",
            hours_per_year: None,
        });
    }
    kinds_used.sort_unstable();

    let line_index: HashMap<String, usize> = lines
        .iter()
        .enumerate()
        .map(|(i, l)| (l.line.clone(), i))
        .collect();
    for (i, f) in fittings.iter().enumerate() {
        if let Some(&li) = line_index.get(&f.line) {
            lines[li].fittings.push(i);
        }
    }
    let mut audit = Audit {
        line_index,
        lines,
        runs,
        fittings,
        findings: Vec::new(),
        fluids: fluids_used,
        kinds_used,
        rules: rules.clone(),
        notes: Vec::new(),
        energy: Default::default(),
        systems: Vec::new(),
    };
    for (f, run) in mismatches {
        super::findings::size_mismatch(input, &mut audit, f, run);
    }
    for (f, run, why) in inferred {
        super::findings::size_inferred(input, &mut audit, f, run, &why);
    }
    for f in closed {
        super::findings::closed_valve(input, &mut audit, f);
    }
    Ok((audit, models))
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
        f.item.clone()
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
    models: &[FittingModel],
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
        .filter_map(|&i| fitting_at(models.get(i)?, flow_m3_s, rho, mu).ok())
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
