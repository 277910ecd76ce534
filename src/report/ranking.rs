//! The `Fitting ranking` and `Systems` sheets, and the energy block of `Summary`.

use rust_xlsxwriter::{
    Chart, ChartMarker, ChartMarkerType, ChartType, Format, Url, Worksheet, XlsxError,
};

use super::style::{MAX_CELL_CHARS, Styles, shown, truncate};
use crate::audit::energy::{OPERATING_POINT_CAUTION, RankBasis, SAVINGS_CAUTION};
use crate::audit::system::{Outcome, SystemResult};
use crate::audit::{Audit, FittingResult};
use crate::error::quote_sheet;

/// What the columns of a systems checks table mean (console, Summary).
pub const CHECKS_KEY: &str = "Has: pump head, or NPSH available with the suction losses at the high end of their K band; Nominal: NPSH available with the nominal losses; Needs: required head, or the NPSH the margin rule asks for.";

/// The caution beside every systems verdict (console, Summary, Systems sheet).
pub const SYSTEMS_CAUTION: &str = "Screening checks, not a pump selection: confirm NPSH required, head and motor power with the pump maker's curves and site measurement, under local codes and licensed engineering practice. Line pressures are not computed: vacuum at high points and siphons are not checked.";

/// Number of items in the ranking chart.
pub const CHART_ITEMS: usize = 20;

fn opt(ws: &mut Worksheet, r: u32, c: u16, v: Option<f64>, f: &Format) -> Result<(), XlsxError> {
    match v.filter(|x| x.is_finite()) {
        Some(x) => ws.write_number_with_format(r, c, x, f).map(|_| ()),
        None => Ok(()),
    }
}

/// A number in a column whose format was set once with `set_column_format` (no per-cell format
/// lookup: the ranking sheet has a row per fitting), to six significant figures.
fn num(ws: &mut Worksheet, r: u32, c: u16, v: Option<f64>) -> Result<(), XlsxError> {
    match v.filter(|x| x.is_finite()) {
        Some(x) => ws.write_number(r, c, shown(x)).map(|_| ()),
        None => Ok(()),
    }
}

/// A fitting's name in a list: its tag, else its item and line.
pub(crate) fn label(f: &FittingResult) -> String {
    if f.tag.is_empty() {
        format!("{} ({})", f.item, f.line)
    } else {
        f.tag.clone()
    }
}

/// The first `n` fittings in rank order (ties in input order); all of them for `None`. Only the
/// first `n` are sorted: a huge register needs its worst few, not a full sort, several times.
pub fn ranked(audit: &Audit, n: Option<usize>) -> Vec<&FittingResult> {
    ranked_indices(audit, n)
        .into_iter()
        .map(|i| &audit.fittings[i])
        .collect()
}

/// [`ranked`] as indices into [`Audit::fittings`].
pub fn ranked_indices(audit: &Audit, n: Option<usize>) -> Vec<usize> {
    let mut v: Vec<(usize, usize)> = audit
        .fittings
        .iter()
        .enumerate()
        .map(|(i, f)| (f.rank.unwrap_or(usize::MAX), i))
        .collect();
    if let Some(n) = n.filter(|&n| n < v.len()) {
        if n == 0 {
            return Vec::new();
        }
        v.select_nth_unstable(n - 1);
        v.truncate(n);
    }
    v.sort_unstable();
    v.into_iter().map(|(_, i)| i).collect()
}

/// Worksheet rows (the format's limit).
const SHEET_ROWS: u32 = 1_048_576;

/// Write the `Fitting ranking` sheet, with a bar-and-line chart of the worst items: the worst
/// `rows` items (all when `None`, up to the sheet's row limit) and, when some are left out, a
/// closing line saying how many and what share of the cost they carry.
pub fn write_ranking(
    ws: &mut Worksheet,
    sheet: &str,
    audit: &Audit,
    rows: Option<usize>,
    invented: Option<&str>,
) -> Result<(), XlsxError> {
    let st = Styles::new();
    let cur = &audit.energy.currency;
    ws.write_string_with_format(
        0,
        0,
        "Fitting ranking: what each fitting's loss costs per year",
        &st.title,
    )?;
    ws.write_string(
        1,
        0,
        format!(
            "Ranked by annual cost at {cur} {} per kWh (head loss where no pump energy applies). Rank range: best and worst rank across the K bands; a rank that can move by more than {} places is marked uncertain.",
            audit.energy.tariff_per_kwh,
            crate::audit::energy::RANK_SHIFT_LIMIT
        ),
    )?;
    ws.write_string_with_format(
        2,
        0,
        format!("{SAVINGS_CAUTION} Suggestions marked * — {OPERATING_POINT_CAUTION}"),
        &st.bold,
    )?;
    let headers: Vec<String> = [
        "Rank",
        "Rank range",
        "Rank holds",
        "Tag",
        "Line",
        "Item",
        "Kind",
        "Qty",
        "K",
        "K low",
        "K high",
        "Head [m]",
        "Head low [m]",
        "Head high [m]",
        "Power lost [W]",
        "Annual energy [kWh]",
    ]
    .iter()
    .map(|s| s.to_string())
    .chain([
        format!("Annual cost [{cur}]"),
        format!("Cost low [{cur}]"),
        format!("Cost high [{cur}]"),
    ])
    .chain(
        [
            "Share",
            "Cumulative share",
            "Ranked by",
            "Suggestion (estimate)",
            "K after",
        ]
        .iter()
        .map(|s| s.to_string()),
    )
    .chain([
        format!("Annual saving [{cur}]"),
        format!("Replacement cost [{cur}]"),
    ])
    .chain(["Payback [years]", "Cell"].iter().map(|s| s.to_string()))
    .collect();
    // The chart of the worst items sits above the table (rows 3–22), where it is seen first.
    let hr = 24u32;
    // Just above the header row, below the chart.
    if let Some(label) = invented {
        ws.write_string_with_format(hr - 1, 0, label, &st.bold)?;
    }
    for (c, h) in headers.iter().enumerate() {
        ws.write_string_with_format(hr, c as u16, h, &st.header)?;
    }
    ws.set_row_height(hr, 45)?;
    for (cols, fmt) in [
        (&[0u16, 14, 15][..], &st.n0),
        (&[8, 9, 10, 11, 12, 13, 23][..], &st.n3),
        (&[16, 17, 18, 24, 25, 26][..], &st.n2),
        (&[19, 20][..], &st.pct),
    ] {
        for &c in cols {
            ws.set_column_format(c, fmt)?;
        }
    }
    let fits = (SHEET_ROWS - hr - 2) as usize;
    let items = ranked(audit, Some(rows.unwrap_or(usize::MAX).min(fits)));
    for (i, f) in items.iter().enumerate() {
        let r = hr + 1 + i as u32;
        let rk = f.ranking;
        num(ws, r, 0, f.rank.map(|x| x as f64))?;
        if let Some(k) = rk {
            ws.write_string(r, 1, format!("{}–{}", k.best, k.worst))?;
            ws.write_string_with_format(
                r,
                2,
                if k.uncertain { "uncertain" } else { "holds" },
                if k.uncertain { &st.bad } else { &st.good },
            )?;
        }
        ws.write_string(r, 3, &f.tag)?;
        ws.write_string(r, 4, &f.line)?;
        ws.write_string(r, 5, &f.item)?;
        ws.write_string(r, 6, f.kind)?;
        ws.write_number(r, 7, f.qty)?;
        for (c, v) in [
            (8, f.k),
            (9, f.k_low),
            (10, f.k_high),
            (11, f.head_m),
            (12, f.head_low_m),
            (13, f.head_high_m),
        ] {
            num(ws, r, c, Some(v))?;
        }
        num(ws, r, 14, f.power_loss_w)?;
        num(ws, r, 15, f.annual_energy_kwh)?;
        let scale = |h: f64| {
            if f.head_m > 0.0 {
                f.annual_cost.map(|c| c * h / f.head_m)
            } else {
                f.annual_cost
            }
        };
        num(ws, r, 16, f.annual_cost)?;
        num(ws, r, 17, scale(f.head_low_m))?;
        num(ws, r, 18, scale(f.head_high_m))?;
        if let Some(k) = rk {
            num(ws, r, 19, Some(k.share))?;
            num(ws, r, 20, Some(k.cumulative_share))?;
            ws.write_string(
                r,
                21,
                if k.basis == RankBasis::AnnualCost {
                    "annual cost"
                } else {
                    "head loss (no pump energy)"
                },
            )?;
        }
        if let Some(s) = &f.suggestion {
            ws.write_string(r, 22, suggestion_text(s, "*"))?;
            num(ws, r, 23, Some(s.k_after))?;
            num(ws, r, 24, s.annual_saving)?;
            num(ws, r, 26, s.payback_years)?;
        }
        num(ws, r, 25, f.replacement_cost)?;
        let target = format!("internal:{}!{}", quote_sheet(&f.cell.sheet), f.cell.a1());
        ws.write_url_with_text(r, 27, Url::new(target), f.cell.to_string())?;
    }
    let left = audit.fittings.len() - items.len();
    if left > 0 {
        let total: f64 = audit.fittings.iter().filter_map(|f| f.annual_cost).sum();
        let listed: f64 = items.iter().filter_map(|f| f.annual_cost).sum();
        let share = if total > 0.0 {
            format!(
                ", {:.1} % of the annual loss cost",
                100.0 * (total - listed) / total
            )
        } else {
            String::new()
        };
        ws.write_string_with_format(
            hr + 2 + items.len() as u32,
            0,
            format!(
                "{} more fittings are not listed here{share}. Every fitting's rank and annual cost are in the computed columns of its input sheet (sort or filter by Rank); `lossledger audit --ranking-rows all` lists them all.",
                left
            ),
            &st.bold,
        )?;
    }
    ws.set_column_width(0, 6)?;
    for c in 1..headers.len() as u16 {
        ws.set_column_width(c, 11)?;
    }
    ws.set_column_width(3, 14)?;
    ws.set_column_width(5, 18)?;
    ws.set_column_width(6, 18)?;
    ws.set_column_width(22, 48)?;
    ws.set_freeze_panes(hr + 1, 4)?;

    // Chart: the worst items by the first basis present (cost when any item has a cost).
    let by_cost = items
        .iter()
        .any(|f| f.ranking.is_some_and(|k| k.basis == RankBasis::AnnualCost));
    let n = items
        .iter()
        .take(CHART_ITEMS)
        .take_while(|f| {
            f.ranking
                .is_some_and(|k| (k.basis == RankBasis::AnnualCost) == by_cost)
        })
        .count() as u32;
    if n > 0 {
        let (first, last) = (hr + 1, hr + n);
        let value_col = if by_cost { 16 } else { 11 };
        let value_name = if by_cost {
            format!("Annual cost [{cur}]")
        } else {
            "Head loss [m]".to_string()
        };
        let bars = pareto_chart(
            sheet,
            (first, last),
            (3, value_col, 20),
            &value_name,
            &format!("Worst {n} fittings"),
        );
        ws.insert_chart(3, 3, &bars)?;
    }
    Ok(())
}

/// A Pareto chart: one column per item (`cols.1`, named `value_name`) with the cumulative share
/// (`cols.2`, a fraction) as a line on a second axis from 0 to 100 %, both over the rows
/// `rows.0..=rows.1` of `sheet`, categories from `cols.0`.
pub(crate) fn pareto_chart(
    sheet: &str,
    rows: (u32, u32),
    cols: (u16, u16, u16),
    value_name: &str,
    title: &str,
) -> Chart {
    let ((first, last), (cat, value, cumulative)) = (rows, cols);
    let mut bars = Chart::new(ChartType::Column);
    bars.add_series()
        .set_categories((sheet, first, cat, last, cat))
        .set_values((sheet, first, value, last, value))
        .set_name(value_name);
    let mut line = Chart::new(ChartType::Line);
    line.add_series()
        .set_categories((sheet, first, cat, last, cat))
        .set_values((sheet, first, cumulative, last, cumulative))
        .set_name("Cumulative share")
        .set_secondary_axis(true);
    bars.combine(&line);
    bars.title().set_name(title);
    bars.y_axis().set_name(value_name);
    bars.y2_axis()
        .set_name("Cumulative share")
        .set_num_format("0%")
        .set_max(1.0)
        .set_min(0.0);
    bars.set_width(900).set_height(380);
    bars
}

fn m3h(q: f64) -> f64 {
    q * 3600.0
}

/// Write the `Systems` sheet: one block per system with its figures, curve table and chart.
pub fn write_systems(ws: &mut Worksheet, sheet: &str, audit: &Audit) -> Result<(), XlsxError> {
    let st = Styles::new();
    ws.write_string_with_format(
        0,
        0,
        "Systems: required head against the pump, system curve and NPSH",
        &st.title,
    )?;
    ws.write_string(1, 0, "System curve: static head plus every line's losses recomputed at each flow (friction factor and Re-dependent K re-evaluated, not scaled by Q²).")?;
    let mut r = 3u32;
    for s in &audit.systems {
        r = write_system(ws, sheet, s, r, &st)? + 2;
    }
    if audit.systems.is_empty() {
        ws.write_string(
            r,
            0,
            "No systems given (a Systems sheet, or a System column in Lines).",
        )?;
    }
    ws.set_column_width(0, 30)?;
    ws.set_column_width(1, 40)?;
    for c in 2..8 {
        ws.set_column_width(c, 13)?;
    }
    Ok(())
}

fn write_system(
    ws: &mut Worksheet,
    sheet: &str,
    s: &SystemResult,
    start: u32,
    st: &Styles,
) -> Result<u32, XlsxError> {
    let mut r = start;
    let verdict = s.verdict.as_str();
    let failing = s.fails_duty || s.fails_npsh || !s.static_head_given;
    ws.write_string_with_format(r, 0, format!("System {}", s.system), &st.title)?;
    ws.write_string_with_format(r, 1, verdict, if failing { &st.bad } else { &st.good })?;
    r += 1;
    ws.write_string_with_format(r, 1, SYSTEMS_CAUTION, &st.wrap)?;
    ws.set_row_height(r, 45)?;
    r += 1;
    let num_row = |ws: &mut Worksheet,
                   r: &mut u32,
                   k: &str,
                   v: Option<f64>,
                   basis: &str|
     -> Result<(), XlsxError> {
        ws.write_string_with_format(*r, 0, k, &st.bold)?;
        match v.filter(|x| x.is_finite()) {
            Some(x) => ws.write_string(
                *r,
                1,
                format!(
                    "{x:.3}{}",
                    if basis.is_empty() {
                        String::new()
                    } else {
                        format!("  ({basis})")
                    }
                ),
            )?,
            None => ws.write_string(*r, 1, "—")?,
        };
        *r += 1;
        Ok(())
    };
    ws.write_string_with_format(r, 0, "Lines (suction first)", &st.bold)?;
    ws.write_string(r, 1, truncate(&s.lines.join(", "), MAX_CELL_CHARS))?;
    r += 1;
    num_row(ws, &mut r, "Duty flow [m3/h]", Some(m3h(s.flow_m3_s)), "")?;
    num_row(
        ws,
        &mut r,
        "Static head [m]",
        Some(s.static_head_m),
        &s.static_head_basis,
    )?;
    num_row(
        ws,
        &mut r,
        "Line losses [m]",
        Some(s.losses_head_m),
        "each line at its own flow",
    )?;
    num_row(ws, &mut r, "Required head [m]", Some(s.required_head_m), "")?;
    num_row(
        ws,
        &mut r,
        "Pump head at duty [m]",
        s.pump_head_m,
        &s.pump_head_basis,
    )?;
    num_row(ws, &mut r, "Margin [m]", s.margin_m, "pump minus required")?;
    if let Some(op) = s.operating_point {
        ws.write_string_with_format(r, 0, "Operating point", &st.bold)?;
        ws.write_string(
            r,
            1,
            format!(
                "{:.1} m3/h at {:.2} m (pump curve meets system curve)",
                m3h(op.flow_m3_s),
                op.head_m
            ),
        )?;
        r += 1;
    }
    if let Some(t) = s.npsh_terms {
        ws.write_string_with_format(r, 0, "NPSH available", &st.bold)?;
        ws.write_string(
            r,
            1,
            format!(
                "= ({:.0} Pa − {:.1} Pa)/({:.2} kg/m3 × g) + {:.3} m − suction losses; source pressure: {}; site elevation {} m ({}); water at {} °C on the suction line",
                t.source_pressure_pa,
                t.vapour_pressure_pa,
                t.density_kg_m3,
                t.suction_level_m,
                t.source_pressure_basis,
                s.site_elevation_m,
                s.site_elevation_basis,
                t.temperature_c
            ),
        )?;
        r += 1;
    }
    for (label, c) in [
        ("at duty", s.npsh_at_duty.as_ref()),
        ("at the operating point", s.npsh_at_operating_point.as_ref()),
    ] {
        let Some(c) = c else { continue };
        ws.write_string_with_format(r, 0, format!("NPSH {label}"), &st.bold)?;
        ws.write_string_with_format(
            r,
            1,
            format!(
                "{:.1} m3/h: available {:.3} m with the suction losses at the high end of their K band ({:.3} m), {:.3} m nominal ({:.3} m); required {}; the margin rule asks for {} — {}",
                m3h(c.flow_m3_s),
                c.available_m,
                c.suction_losses_high_m,
                c.available_nominal_m,
                c.suction_losses_m,
                c.required_m
                    .map(|x| format!("{x:.3} m ({})", c.required_basis))
                    .unwrap_or_else(|| "not given".into()),
                c.needed_m
                    .map(|x| format!("{x:.3} m"))
                    .unwrap_or_else(|| "—".into()),
                if c.fails {
                    "FAIL"
                } else if c.needed_m.is_some() {
                    "pass"
                } else {
                    "not checked"
                }
            ),
            if c.fails { &st.bad } else { &st.wrap },
        )?;
        r += 1;
    }
    if !s.defaults.is_empty() {
        ws.write_string_with_format(r, 0, "Defaults applied", &st.bold)?;
        ws.write_string_with_format(r, 1, s.defaults.join("; "), &st.wrap)?;
        r += 1;
    }
    for n in &s.notes {
        ws.write_string_with_format(r, 0, "Note", &st.bold)?;
        ws.write_string_with_format(r, 1, n, &st.wrap)?;
        r += 1;
    }
    r += 1;
    // Curve table.
    let hr = r;
    for (c, h) in [
        "Flow [m3/h]",
        "% of duty",
        "Required head [m]",
        "Pump curve flow [m3/h]",
        "Pump curve head [m]",
        "Duty flow [m3/h]",
        "Duty head [m]",
    ]
    .iter()
    .enumerate()
    {
        ws.write_string_with_format(hr, c as u16 + 1, *h, &st.header)?;
    }
    ws.set_row_height(hr, 30)?;
    for (i, p) in s.curve.iter().enumerate() {
        let rr = hr + 1 + i as u32;
        ws.write_number_with_format(rr, 1, m3h(p.flow_m3_s), &st.n2)?;
        if s.flow_m3_s > 0.0 {
            ws.write_number_with_format(rr, 2, p.flow_m3_s / s.flow_m3_s, &st.pct)?;
        }
        ws.write_number_with_format(rr, 3, p.head_m, &st.n3)?;
    }
    for (i, p) in s.pump_curve.iter().enumerate() {
        let rr = hr + 1 + i as u32;
        ws.write_number_with_format(rr, 4, m3h(p.flow_m3_s), &st.n2)?;
        ws.write_number_with_format(rr, 5, p.head_m, &st.n3)?;
    }
    ws.write_number_with_format(hr + 1, 6, m3h(s.flow_m3_s), &st.n2)?;
    ws.write_number_with_format(hr + 1, 7, s.required_head_m, &st.n3)?;
    let last = hr + s.curve.len().max(s.pump_curve.len()).max(1) as u32;

    let mut chart = Chart::new(ChartType::ScatterStraightWithMarkers);
    let n_curve = s.curve.len().max(1) as u32;
    chart
        .add_series()
        .set_categories((sheet, hr + 1, 1, hr + n_curve, 1))
        .set_values((sheet, hr + 1, 3, hr + n_curve, 3))
        .set_name("System curve");
    if !s.pump_curve.is_empty() {
        let n = s.pump_curve.len() as u32;
        chart
            .add_series()
            .set_categories((sheet, hr + 1, 4, hr + n, 4))
            .set_values((sheet, hr + 1, 5, hr + n, 5))
            .set_name("Pump curve");
    }
    chart
        .add_series()
        .set_categories((sheet, hr + 1, 6, hr + 1, 6))
        .set_values((sheet, hr + 1, 7, hr + 1, 7))
        .set_name("Duty point")
        .set_marker(
            ChartMarker::new()
                .set_type(ChartMarkerType::Diamond)
                .set_size(10),
        );
    chart
        .title()
        .set_name(format!("System {}: head against flow", s.system).as_str());
    chart.x_axis().set_name("Flow [m3/h]");
    chart.y_axis().set_name("Head [m]");
    chart.set_width(620).set_height(340);
    ws.insert_chart(start, 9, &chart)?;
    Ok(last.max(start + 18))
}

/// The energy block of `Summary`: total annual loss cost, systems that fail, the top five items.
/// Returns the next free row.
pub fn write_summary_block(
    ws: &mut Worksheet,
    audit: &Audit,
    start: u32,
) -> Result<u32, XlsxError> {
    let st = Styles::new();
    let cur = &audit.energy.currency;
    let mut r = start;
    ws.write_string_with_format(r, 0, format!("Annual cost of losses [{cur}]"), &st.bold)?;
    ws.write_number_with_format(r, 2, audit.energy.total_annual_cost, &st.n2)?;
    ws.write_string(
        r,
        3,
        format!(
            "at {cur} {} per kWh; estimate, see Basis",
            audit.energy.tariff_per_kwh
        ),
    )?;
    r += 1;
    ws.write_string_with_format(r, 0, "Annual energy of losses [kWh]", &st.bold)?;
    ws.write_number_with_format(r, 2, audit.energy.total_annual_energy_kwh, &st.n0)?;
    r += 1;
    if let Some(c) = audit.energy.total_annual_co2_kg {
        ws.write_string_with_format(r, 0, "Annual emissions of losses [kg CO2]", &st.bold)?;
        ws.write_number_with_format(r, 2, c, &st.n0)?;
        r += 1;
    }
    r += 1;
    r = write_summary_systems(ws, audit, r, &st)?;
    r += 1;
    ws.write_string_with_format(r, 0, "Top five items (see Fitting ranking)", &st.bold)?;
    r += 1;
    let h = ["Rank", "Item", "Line", "Kind", "Head [m]"]
        .iter()
        .map(|s| s.to_string())
        .chain([
            format!("Annual cost [{cur}]"),
            "Suggestion (estimate)".to_string(),
        ]);
    for (c, h) in h.enumerate() {
        ws.write_string_with_format(r, c as u16, &h, &st.header)?;
    }
    for f in ranked(audit, Some(5)) {
        r += 1;
        opt(ws, r, 0, f.rank.map(|x| x as f64), &st.n0)?;
        ws.write_string(r, 1, label(f))?;
        ws.write_string(r, 2, &f.line)?;
        ws.write_string(r, 3, f.kind)?;
        opt(ws, r, 4, Some(f.head_m), &st.n3)?;
        opt(ws, r, 5, f.annual_cost, &st.n2)?;
        if let Some(s) = &f.suggestion {
            ws.write_string(r, 6, suggestion_text(s, "*"))?;
        }
    }
    if ranked(audit, Some(5))
        .iter()
        .any(|f| f.suggestion.as_ref().is_some_and(|s| s.caution.is_some()))
    {
        r += 1;
        ws.write_string_with_format(r, 0, format!("* {OPERATING_POINT_CAUTION}"), &st.bold)?;
    }
    Ok(r + 2)
}

/// The systems table of `Summary`: every check of every system with its pass/fail, the
/// verdicts, the defaults that fed NPSH and the screening caution. Returns the next free row.
fn write_summary_systems(
    ws: &mut Worksheet,
    audit: &Audit,
    start: u32,
    st: &Styles,
) -> Result<u32, XlsxError> {
    let mut r = start;
    ws.write_string_with_format(r, 0, "Systems: every check and its result", &st.bold)?;
    r += 1;
    if audit.systems.is_empty() {
        ws.write_string(r, 0, "no systems given")?;
        return Ok(r + 1);
    }
    ws.write_string_with_format(r, 0, SYSTEMS_CAUTION, &st.bold)?;
    r += 1;
    for (c, h) in [
        "System",
        "Check",
        "At flow [m3/h]",
        "Has [m]",
        "Nominal [m]",
        "Needs [m]",
        "Result",
        "Note",
    ]
    .iter()
    .enumerate()
    {
        ws.write_string_with_format(r, c as u16, *h, &st.header)?;
    }
    for s in &audit.systems {
        for c in &s.checks {
            r += 1;
            ws.write_string(r, 0, &s.system)?;
            ws.write_string(r, 1, c.check)?;
            opt(ws, r, 2, Some(m3h(c.flow_m3_s)), &st.n2)?;
            opt(ws, r, 3, c.available_m, &st.n2)?;
            opt(ws, r, 4, c.nominal_m, &st.n2)?;
            opt(ws, r, 5, c.needed_m, &st.n2)?;
            let fmt = match c.outcome {
                Outcome::Pass => &st.good,
                Outcome::Fail => &st.bad,
                Outcome::NotChecked => &st.bold,
            };
            ws.write_string_with_format(r, 6, c.outcome.label(), fmt)?;
            ws.write_string(r, 7, &c.note)?;
        }
    }
    r += 1;
    ws.write_string(r, 0, CHECKS_KEY)?;
    for s in &audit.systems {
        r += 1;
        let failing = s.fails_duty || s.fails_npsh || !s.static_head_given;
        ws.write_string_with_format(
            r,
            0,
            format!("System {}: {}", s.system, s.verdict),
            if failing { &st.bad } else { &st.good },
        )?;
    }
    for line in defaults_applied(audit) {
        r += 1;
        ws.write_string(r, 0, line)?;
    }
    Ok(r + 1)
}

/// Console text: annual loss cost, the worst items by cost, and each system's figures, checks
/// and verdict, fitted to `width` (see [`super::text_table`]).
pub fn console_energy(audit: &Audit, width: Option<usize>) -> String {
    use super::console::fitted_text;
    use super::text_table::{Align::Left, Align::Right, TextTable};
    let cur = &audit.energy.currency;
    let mut out = fitted_text(
        &format!(
            "Annual cost of losses: {cur} {:.0} ({:.0} kWh at {cur} {} per kWh; estimates to confirm by field test)",
            audit.energy.total_annual_cost,
            audit.energy.total_annual_energy_kwh,
            audit.energy.tariff_per_kwh
        ),
        width,
    );
    let items = ranked(audit, Some(5));
    if !items.is_empty() {
        let per_year = format!("Cost\n{cur}/yr");
        let saving = format!("Saving\n{cur}/yr");
        let mut t = TextTable::new(&[
            ("Rank", Right),
            ("Fitting", Left),
            ("Line", Left),
            ("Head\nm", Right),
            (&per_year, Right),
            ("Rank\nholds", Left),
            ("Suggestion", Left),
            (&saving, Right),
            ("Payback\nyr", Right),
        ])
        .keyed_by(1);
        let mut marked = false;
        for f in &items {
            let s = f.suggestion.as_ref();
            marked |= s.is_some_and(|s| s.caution.is_some());
            t.row(vec![
                f.rank.map(|r| r.to_string()).unwrap_or_default(),
                label(f),
                f.line.clone(),
                format!("{:.3}", f.head_m),
                f.annual_cost
                    .map(|c| format!("{c:.0}"))
                    .unwrap_or_else(|| "—".into()),
                f.ranking
                    .map(|k| {
                        if k.uncertain {
                            format!("no ({}–{})", k.best, k.worst)
                        } else {
                            "yes".into()
                        }
                    })
                    .unwrap_or_default(),
                s.map(|s| suggestion_text(s, "*")).unwrap_or_default(),
                s.and_then(|s| s.annual_saving)
                    .map(|x| format!("{x:.0}"))
                    .unwrap_or_default(),
                s.and_then(|s| s.payback_years)
                    .map(|x| format!("{x:.1}"))
                    .unwrap_or_default(),
            ]);
        }
        out.push_str(&t.render(width));
        if marked {
            out.push_str(&fitted_text(&format!("* {OPERATING_POINT_CAUTION}"), width));
        }
        out.push('\n');
    }
    if !audit.systems.is_empty() {
        out.push_str(&console_systems(audit, width));
    }
    out
}

/// The defaults that fed NPSH available, one sentence per set of systems sharing them
/// ("Defaults applied to NPSH (Duty A, Duty B): …").
pub fn defaults_applied(audit: &Audit) -> Vec<String> {
    let mut groups: Vec<(Vec<&str>, &Vec<String>)> = Vec::new();
    for s in audit.systems.iter().filter(|s| !s.defaults.is_empty()) {
        match groups.iter_mut().find(|(_, d)| **d == s.defaults) {
            Some((names, _)) => names.push(&s.system),
            None => groups.push((vec![&s.system], &s.defaults)),
        }
    }
    groups
        .into_iter()
        .map(|(names, d)| {
            format!(
                "Defaults applied to NPSH ({}): {}.",
                names.join(", "),
                d.join("; ")
            )
        })
        .collect()
}

/// A suggestion's words, with `mark` after them when it carries the operating-point caution.
pub fn suggestion_text(s: &crate::audit::energy::Suggestion, mark: &str) -> String {
    match s.caution {
        Some(_) => format!("{} {mark}", s.replace_with),
        None => s.replace_with.clone(),
    }
}

/// Console systems block: figures, every check with its pass/fail, the verdicts, the defaults
/// that fed NPSH and the screening caution.
fn console_systems(audit: &Audit, width: Option<usize>) -> String {
    use super::console::fitted_text;
    use super::text_table::{Align::Left, Align::Right, TextTable};
    let f2 = |v: Option<f64>| v.map(|x| format!("{x:.2}")).unwrap_or_else(|| "—".into());
    let mut out = String::new();
    let mut t = TextTable::new(&[
        ("System", Left),
        ("Duty\nm³/h", Right),
        ("Static\nm", Right),
        ("Losses\nm", Right),
        ("Required\nm", Right),
        ("Pump\nm", Right),
        ("Margin\nm", Right),
        ("Operating\npoint", Left),
        ("Lines", Left),
    ]);
    for s in &audit.systems {
        t.row(vec![
            s.system.clone(),
            format!("{:.1}", m3h(s.flow_m3_s)),
            if s.static_head_given {
                format!("{:.2}", s.static_head_m)
            } else {
                "none".into()
            },
            format!("{:.2}", s.losses_head_m),
            format!("{:.2}", s.required_head_m),
            f2(s.pump_head_m),
            f2(s.margin_m),
            s.operating_point
                .map(|p| format!("{:.1} m³/h at {:.2} m", m3h(p.flow_m3_s), p.head_m))
                .unwrap_or_else(|| "—".into()),
            s.lines.join(", "),
        ]);
    }
    out.push_str(&t.render(width));
    out.push('\n');
    let mut t = TextTable::new(&[
        ("System", Left),
        ("Check", Left),
        ("At\nm³/h", Right),
        ("Has\nm", Right),
        ("Nominal\nm", Right),
        ("Needs\nm", Right),
        ("Result", Left),
        ("Note", Left),
    ]);
    for s in &audit.systems {
        for c in &s.checks {
            t.row(vec![
                s.system.clone(),
                c.check.to_string(),
                format!("{:.1}", m3h(c.flow_m3_s)),
                f2(c.available_m),
                c.nominal_m.map(|x| format!("{x:.2}")).unwrap_or_default(),
                f2(c.needed_m),
                c.outcome.label().to_string(),
                c.note.clone(),
            ]);
        }
    }
    if !t.is_empty() {
        out.push_str(&t.render(width));
        out.push_str(&fitted_text(CHECKS_KEY, width));
    }
    for s in &audit.systems {
        out.push_str(&fitted_text(
            &format!("System {}: {}", s.system, s.verdict),
            width,
        ));
    }
    for line in defaults_applied(audit) {
        out.push_str(&fitted_text(&line, width));
    }
    out.push_str(&fitted_text(SYSTEMS_CAUTION, width));
    out.push('\n');
    out
}
