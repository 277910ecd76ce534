//! Pumped systems: required head against the pump, the system curve, the operating point on a
//! pump curve, NPSH available, and suction-side layout checks.
//!
//! A system is an ordered series of lines from the suction source to the delivery point, taken
//! from the `Systems` sheet (its `Lines` cell) or, failing that, from the `System` column of
//! `Lines` (input order, pump-suction lines first). See `docs/energy.md`.

use serde::Serialize;

use super::lines::{FittingModel, line_heads_at};
use super::{Audit, Finding, Rules};
use crate::error::{CellRef, Severity};
use crate::ingest::{Input, Service, SystemRow, TableKind};
use crate::physics::G;
use crate::physics::fitting::Group;
use crate::physics::fluid::atmospheric_pressure_pa;

/// Fractions of duty flow at which the system curve is computed: 0 to 130 % in 10 % steps.
pub const CURVE_FRACTIONS: [f64; 14] = [
    0.0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.3,
];

/// Straight run wanted before a pump suction, in diameters (common practice, no source).
pub const SUCTION_STRAIGHT_DIAMETERS: f64 = 5.0;

/// Bores closer than this are taken as equal in the suction-size check, m.
pub const BORE_TOLERANCE_M: f64 = 0.5e-3;

/// One point of a head-versus-flow curve.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct CurvePoint {
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Head, m.
    pub head_m: f64,
}

/// One system's results.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SystemResult {
    /// System id.
    pub system: String,
    /// Line ids in order, suction side first.
    pub lines: Vec<String>,
    /// Duty flow through the pump, m³/s.
    pub flow_m3_s: f64,
    /// Static head, m.
    pub static_head_m: f64,
    /// Sum of the lines' losses, each line at its own flow, m.
    pub losses_head_m: f64,
    /// Static head plus losses, m.
    pub required_head_m: f64,
    /// Pump head at duty flow, m (Systems sheet, else the pump curve at duty flow).
    pub pump_head_m: Option<f64>,
    /// Pump head minus required head, m.
    pub margin_m: Option<f64>,
    /// NPSH available at the pump suction, m.
    pub npsh_available_m: Option<f64>,
    /// NPSH required by the pump, m.
    pub npsh_required_m: Option<f64>,
    /// Required head from 0 to 130 % of duty flow, friction recomputed at each flow.
    pub curve: Vec<CurvePoint>,
    /// Where the pump curve crosses the system curve, when a pump curve is given.
    pub operating_point: Option<CurvePoint>,
    /// Where the static head came from.
    #[serde(skip)]
    pub static_head_basis: String,
    /// Where the pump head came from.
    #[serde(skip)]
    pub pump_head_basis: String,
    /// Pump curve points, by flow.
    #[serde(skip)]
    pub pump_curve: Vec<CurvePoint>,
    /// NPSH the margin rule asks for, m.
    #[serde(skip)]
    pub npsh_needed_m: Option<f64>,
    /// NPSH terms: source pressure, vapour pressure (Pa), density, suction level, suction losses (m).
    #[serde(skip)]
    pub npsh_terms: Option<NpshTerms>,
    /// True when the pump head is below the required head.
    #[serde(skip)]
    pub fails_duty: bool,
    /// True when NPSH available is below what the margin rule asks for.
    #[serde(skip)]
    pub fails_npsh: bool,
    /// What could not be checked, and why.
    #[serde(skip)]
    pub notes: Vec<String>,
}

/// The terms of an NPSH-available calculation.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct NpshTerms {
    /// Absolute pressure on the source surface, Pa.
    pub source_pressure_pa: f64,
    /// Where it came from ("Systems sheet" or "standard atmosphere at site elevation").
    pub source_pressure_basis: &'static str,
    /// Vapour pressure at the suction temperature, Pa.
    pub vapour_pressure_pa: f64,
    /// Density, kg/m³.
    pub density_kg_m3: f64,
    /// Source liquid level above the pump centreline, m.
    pub suction_level_m: f64,
    /// Losses of the suction line(s), m.
    pub suction_losses_m: f64,
}

/// NPSH available at the pump suction.
///
/// # Formula
/// `NPSHa = (p_source − p_vapour)/(ρ g) + z_s − h_L,s` with z_s the source level above the pump
/// centreline (negative for a suction lift) and h_L,s the suction-side losses.
///
/// # Source
/// ISO 17769-1:2012, Liquid pumps and installation — Part 1, definition of NPSH (net positive
/// suction head) and of NPSH available (from memory); the energy balance of the Bernoulli
/// equation from the source surface to the pump inlet.
///
/// # Validity
/// Steady flow, source velocity negligible, absolute pressures, one liquid of density ρ.
pub fn npsh_available(
    source_pressure_pa: f64,
    vapour_pressure_pa: f64,
    density_kg_m3: f64,
    suction_level_m: f64,
    suction_losses_m: f64,
) -> f64 {
    (source_pressure_pa - vapour_pressure_pa) / (density_kg_m3 * G) + suction_level_m
        - suction_losses_m
}

/// NPSH the margin rule asks for: `max(ratio × NPSHr, NPSHr + minimum margin)`
/// (rules `[npsh]`; defaults 1.1 and 0.6 m are common practice, no source).
pub fn npsh_needed(npsh_required_m: f64, margin_ratio: f64, margin_min_m: f64) -> f64 {
    (margin_ratio * npsh_required_m).max(npsh_required_m + margin_min_m)
}

/// Linear interpolation on curve points sorted by flow; None outside their flow range.
pub fn interpolate(points: &[CurvePoint], flow_m3_s: f64) -> Option<f64> {
    let first = points.first()?;
    if points.len() == 1 {
        return ((flow_m3_s - first.flow_m3_s).abs() <= 1e-12 * first.flow_m3_s.abs().max(1e-12))
            .then_some(first.head_m);
    }
    points
        .windows(2)
        .find(|w| flow_m3_s >= w[0].flow_m3_s && flow_m3_s <= w[1].flow_m3_s)
        .map(|w| {
            let span = w[1].flow_m3_s - w[0].flow_m3_s;
            if span > 0.0 {
                w[0].head_m + (w[1].head_m - w[0].head_m) * (flow_m3_s - w[0].flow_m3_s) / span
            } else {
                w[0].head_m
            }
        })
}

/// The flow where the pump curve (linear between its points) meets a system head function,
/// solved by bisection to 1e-10 relative in flow; None when they do not cross in the pump
/// curve's flow range.
pub fn operating_point(
    pump: &[CurvePoint],
    system_head: impl Fn(f64) -> f64,
) -> Option<CurvePoint> {
    let (lo, hi) = (pump.first()?.flow_m3_s, pump.last()?.flow_m3_s);
    let gap = |q: f64| interpolate(pump, q).map(|h| h - system_head(q));
    const STEPS: usize = 200;
    let mut a = lo;
    let mut ga = gap(a)?;
    if ga == 0.0 {
        return Some(CurvePoint {
            flow_m3_s: a,
            head_m: system_head(a),
        });
    }
    for i in 1..=STEPS {
        let b = lo + (hi - lo) * i as f64 / STEPS as f64;
        let gb = gap(b)?;
        if gb == 0.0 || ga.signum() != gb.signum() {
            let (mut x0, mut x1, mut g0) = (a, b, ga);
            for _ in 0..200 {
                let m = 0.5 * (x0 + x1);
                let gm = gap(m)?;
                if gm == 0.0 || (x1 - x0) <= 1e-10 * x1.abs().max(1e-12) {
                    x0 = m;
                    x1 = m;
                    break;
                }
                if gm.signum() == g0.signum() {
                    x0 = m;
                    g0 = gm;
                } else {
                    x1 = m;
                }
            }
            let q = 0.5 * (x0 + x1);
            return Some(CurvePoint {
                flow_m3_s: q,
                head_m: system_head(q),
            });
        }
        a = b;
        ga = gb;
    }
    None
}

/// Required head of a system when every line carries `fraction` of its own duty flow:
/// static head plus each line's losses recomputed at that flow (friction factors and Re-dependent
/// K re-evaluated; not a Q² scaling).
/// `models` are the fittings' models from [`super::lines::compute`].
pub fn required_head_at(
    audit: &Audit,
    models: &[FittingModel],
    lines: &[usize],
    static_head_m: f64,
    fraction: f64,
) -> f64 {
    static_head_m
        + lines
            .iter()
            .map(|&i| {
                line_heads_at(
                    audit,
                    models,
                    &audit.lines[i],
                    audit.lines[i].flow_m3_s * fraction,
                )
                .total_head_m
            })
            .sum::<f64>()
}

/// The systems named in the input: Systems rows, then ids only the Lines sheet names.
fn definitions(input: &Input) -> Vec<(String, Vec<String>, Option<&SystemRow>)> {
    let from_lines = |id: &str| -> Vec<String> {
        let mut ls: Vec<&crate::ingest::LineRow> = input
            .lines
            .iter()
            .filter(|l| l.system.as_deref() == Some(id))
            .collect();
        ls.sort_by_key(|l| l.service != Service::PumpSuction);
        ls.into_iter().map(|l| l.line.clone()).collect()
    };
    let mut defs: Vec<(String, Vec<String>, Option<&SystemRow>)> = Vec::new();
    for row in &input.systems {
        if defs.iter().any(|d| d.0 == row.system) {
            continue;
        }
        let lines = if row.lines.is_empty() {
            from_lines(&row.system)
        } else {
            row.lines.clone()
        };
        defs.push((row.system.clone(), lines, Some(row)));
    }
    for l in &input.lines {
        if let Some(id) = &l.system
            && !defs.iter().any(|d| d.0 == *id)
        {
            defs.push((id.clone(), from_lines(id), None));
        }
    }
    defs
}

/// Compute every system and raise `pump-head-short`, `npsh-margin` and `suction-layout`.
/// `models` are the fittings' models, in the order of `audit.fittings`.
pub fn apply(input: &Input, rules: &Rules, audit: &mut Audit, models: &[FittingModel]) {
    let mut results = Vec::new();
    let mut found: Vec<Finding> = Vec::new();
    for (id, names, row) in definitions(input) {
        let mut notes = Vec::new();
        let mut idx = Vec::new();
        for n in &names {
            match audit.line_of(n) {
                Some(i) => idx.push(i),
                None => notes.push(format!(
                    "line {n} is not among the audited lines: left out of the system's head"
                )),
            }
        }
        let sys_cell = |key: &str| -> Option<CellRef> {
            row.map(|r| {
                CellRef::new(
                    &r.origin.sheet,
                    r.origin.row,
                    input.column_of(TableKind::Systems, &r.origin.sheet, key),
                )
            })
        };
        let line_cell = || -> Option<CellRef> {
            let first = input
                .lines
                .iter()
                .find(|l| l.system.as_deref() == Some(id.as_str()))?;
            Some(CellRef::new(
                &first.origin.sheet,
                first.origin.row,
                input.column_of(TableKind::Lines, &first.origin.sheet, "system"),
            ))
        };
        let duty = idx
            .iter()
            .find(|&&i| {
                matches!(
                    audit.lines[i].service,
                    Service::PumpSuction | Service::PumpDischarge
                )
            })
            .or(idx.first())
            .map(|&i| audit.lines[i].flow_m3_s)
            .unwrap_or(0.0);
        let given_dz: Vec<f64> = names
            .iter()
            .filter_map(|n| {
                input
                    .lines
                    .iter()
                    .find(|l| l.line == *n)
                    .and_then(|l| l.elevation_change_m)
            })
            .collect();
        let (static_head_m, static_head_basis) = match row.and_then(|r| r.static_head_m) {
            Some(h) => (h, "Systems sheet".to_string()),
            None if !given_dz.is_empty() => (
                given_dz.iter().sum(),
                "sum of the lines' Elevation change (pipe ends, not liquid levels)".to_string(),
            ),
            None => {
                notes.push("no static head given (Static head in Systems, or Elevation change in Lines): taken as 0".into());
                (0.0, "none given: 0".to_string())
            }
        };
        let losses_head_m: f64 = idx.iter().map(|&i| audit.lines[i].total_head_m).sum();
        let required_head_m = static_head_m + losses_head_m;
        let curve: Vec<CurvePoint> = CURVE_FRACTIONS
            .iter()
            .map(|&x| CurvePoint {
                flow_m3_s: duty * x,
                head_m: required_head_at(audit, models, &idx, static_head_m, x),
            })
            .collect();
        let mut pump_curve: Vec<CurvePoint> = input
            .pump_curves
            .iter()
            .filter(|p| p.system == id)
            .map(|p| CurvePoint {
                flow_m3_s: p.flow_m3_s,
                head_m: p.head_m,
            })
            .collect();
        pump_curve.sort_by(|a, b| a.flow_m3_s.total_cmp(&b.flow_m3_s));
        let (pump_head_m, pump_head_basis) = match row.and_then(|r| r.pump_head_m) {
            Some(h) => (Some(h), "Systems sheet".to_string()),
            None => match interpolate(&pump_curve, duty) {
                Some(h) => (Some(h), "Pump curve at duty flow".to_string()),
                None => {
                    notes.push("no pump head at duty flow (Pump head in Systems, or a Pump curve spanning the duty flow): duty not checked".into());
                    (None, String::new())
                }
            },
        };
        let operating_point = if duty > 0.0 && pump_curve.len() >= 2 {
            let op = operating_point(&pump_curve, |q| {
                required_head_at(audit, models, &idx, static_head_m, q / duty)
            });
            if op.is_none() {
                notes.push(
                    "the pump curve does not cross the system curve within its flow range".into(),
                );
            }
            op
        } else {
            None
        };
        let margin_m = pump_head_m.map(|p| p - required_head_m);
        let fails_duty = margin_m.is_some_and(|m| m < 0.0);
        if let (Some(m), Some(p)) = (margin_m, pump_head_m)
            && fails_duty
        {
            found.push(Finding {
                severity: Severity::Error,
                code: "pump-head-short",
                line: None,
                tag: None,
                cell: sys_cell("pump_head").or_else(line_cell),
                message: format!(
                    "system {id}: the pump gives {p:.2} m at {:.1} m3/h but the system needs {required_head_m:.2} m (static {static_head_m:.2} m + losses {losses_head_m:.2} m): short by {:.2} m",
                    duty * 3600.0,
                    -m
                ),
                action: "the pump cannot deliver the duty flow: cut the losses (see Fitting ranking), check the static head, or re-rate the pump with its maker's curve".into(),
            });
        }

        // NPSH available on the suction side.
        let suction: Vec<usize> = idx
            .iter()
            .copied()
            .take_while(|&i| audit.lines[i].service == Service::PumpSuction)
            .collect();
        let npsh_required_m = row.and_then(|r| r.npsh_required_m);
        let mut npsh_terms = None;
        if suction.is_empty() {
            if npsh_required_m.is_some() {
                notes.push(
                    "no pump-suction line leads the system: NPSH available not computed".into(),
                );
            }
        } else if let Some(level) = row.and_then(|r| r.suction_level_m) {
            let first = &audit.lines[suction[0]];
            match first.vapour_pressure_pa {
                Some(pv) => {
                    let (ps, basis) = match row.and_then(|r| r.source_pressure_pa) {
                        Some(p) => (p, "Systems sheet"),
                        None => (
                            atmospheric_pressure_pa(rules.npsh.site_elevation_m),
                            "standard atmosphere at site elevation",
                        ),
                    };
                    npsh_terms = Some(NpshTerms {
                        source_pressure_pa: ps,
                        source_pressure_basis: basis,
                        vapour_pressure_pa: pv,
                        density_kg_m3: first.density_kg_m3,
                        suction_level_m: level,
                        suction_losses_m: suction
                            .iter()
                            .map(|&i| audit.lines[i].total_head_m)
                            .sum(),
                    });
                }
                None => notes.push(format!(
                    "fluid of line {} has no vapour pressure: NPSH available not computed",
                    first.line
                )),
            }
        } else {
            notes.push("no Suction level given: NPSH available not computed".into());
        }
        let npsh_available_m = npsh_terms.map(|t| {
            npsh_available(
                t.source_pressure_pa,
                t.vapour_pressure_pa,
                t.density_kg_m3,
                t.suction_level_m,
                t.suction_losses_m,
            )
        });
        let npsh_needed_m = npsh_required_m
            .map(|r| npsh_needed(r, rules.npsh.margin_ratio, rules.npsh.margin_min_m));
        let fails_npsh = matches!((npsh_available_m, npsh_needed_m), (Some(a), Some(n)) if a < n);
        if let (true, Some(a), Some(r), Some(n)) =
            (fails_npsh, npsh_available_m, npsh_required_m, npsh_needed_m)
        {
            found.push(Finding {
                severity: if a < r { Severity::Error } else { Severity::Warning },
                code: "npsh-margin",
                line: suction.first().map(|&i| audit.lines[i].line.clone()),
                tag: None,
                cell: sys_cell("npsh_required").or_else(line_cell),
                message: format!(
                    "system {id}: NPSH available {a:.2} m against NPSH required {r:.2} m; the margin rule asks for {n:.2} m (max of {:.2} × NPSHr and NPSHr + {:.2} m)",
                    rules.npsh.margin_ratio, rules.npsh.margin_min_m
                ),
                action: if a < r {
                    "the pump will cavitate at this duty: raise the suction level, cut the suction losses or choose a pump with lower NPSH required"
                } else {
                    "cavitation margin is thin: cut the suction losses or raise the suction level; confirm NPSHr with the pump maker's test curve"
                }
                .into(),
            });
        }
        suction_layout(input, audit, &idx, &suction, &mut found);
        results.push(SystemResult {
            system: id,
            lines: idx.iter().map(|&i| audit.lines[i].line.clone()).collect(),
            flow_m3_s: duty,
            static_head_m,
            losses_head_m,
            required_head_m,
            pump_head_m,
            margin_m,
            npsh_available_m,
            npsh_required_m,
            curve,
            operating_point,
            static_head_basis,
            pump_head_basis,
            pump_curve,
            npsh_needed_m,
            npsh_terms,
            fails_duty,
            fails_npsh,
            notes,
        });
    }
    for f in found {
        if !audit
            .findings
            .iter()
            .any(|g| g.code == f.code && g.cell == f.cell)
        {
            audit.findings.push(f);
        }
    }
    audit.systems = results;
}

/// `suction-layout`: an elbow or reducer listed last on the suction side (at the pump inlet), and
/// a suction bore smaller than the run after it.
fn suction_layout(
    input: &Input,
    audit: &Audit,
    idx: &[usize],
    suction: &[usize],
    found: &mut Vec<Finding>,
) {
    let Some(&last) = suction.last() else { return };
    let line = &audit.lines[last];
    let at_pump = line
        .fittings
        .iter()
        .map(|&i| &audit.fittings[i])
        .max_by_key(|f| (f.cell.sheet.clone(), f.row));
    if let Some(f) = at_pump {
        let group = f.group;
        let what = match group {
            Group::Elbow | Group::Bend => Some(("an elbow or bend at the pump inlet gives the impeller uneven flow", format!(
                "provide about {SUCTION_STRAIGHT_DIAMETERS:.0} pipe diameters of straight pipe before the pump (common practice, no source), or confirm the layout on the drawings"
            ))),
            Group::Tee => Some(("a tee at the pump inlet gives the impeller uneven flow", format!("provide about {SUCTION_STRAIGHT_DIAMETERS:.0} pipe diameters of straight pipe before the pump (common practice, no source)"))),
            Group::AreaChange => Some(("a reducer at the pump inlet can trap air if it is concentric", "use an eccentric reducer, flat side up (common practice, no source); confirm on the drawings".to_string())),
            _ => None,
        };
        if let Some((why, action)) = what {
            found.push(Finding {
                severity: Severity::Warning,
                code: "suction-layout",
                line: Some(line.line.clone()),
                tag: (!f.tag.is_empty()).then(|| f.tag.clone()),
                cell: Some(f.cell.clone()),
                message: format!("{} ({}) is the last item listed on suction line {}, i.e. at the pump inlet: {why}", if f.tag.is_empty() { &f.item } else { &f.tag }, f.kind, line.line),
                action,
            });
        }
    }
    // Bores along the suction side, then the first run after it.
    let mut runs: Vec<usize> = suction
        .iter()
        .flat_map(|&i| audit.lines[i].runs.iter().copied())
        .collect();
    if let Some(next) = idx
        .iter()
        .skip_while(|i| !suction.contains(i))
        .find(|i| !suction.contains(i))
        .and_then(|&i| audit.lines[i].runs.first().copied())
    {
        runs.push(next);
    }
    for w in runs.windows(2) {
        let (a, b) = (&audit.runs[w[0]], &audit.runs[w[1]]);
        let a_is_suction = suction.iter().any(|&i| audit.lines[i].line == a.line);
        if a_is_suction && a.inner_diameter_m + BORE_TOLERANCE_M < b.inner_diameter_m {
            found.push(Finding {
                severity: Severity::Warning,
                code: "suction-layout",
                line: Some(a.line.clone()),
                tag: None,
                cell: Some(CellRef::new(&a.cell.sheet, a.row, input.column_of(TableKind::Pipes, &a.cell.sheet, "size"))),
                message: format!(
                    "suction run of line {} has a bore of {:.1} mm, smaller than the {:.1} mm of the run after it (line {})",
                    a.line,
                    a.inner_diameter_m * 1e3,
                    b.inner_diameter_m * 1e3,
                    b.line
                ),
                action: "a suction line is normally at least the size of what follows it: check the size, the suction velocity and NPSH".into(),
            });
        }
    }
}
