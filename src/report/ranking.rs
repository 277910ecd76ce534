//! The `Fitting ranking` and `Systems` sheets, and the energy block of `Summary`.

use rust_xlsxwriter::{
    Chart, ChartMarker, ChartMarkerType, ChartType, Format, Url, Worksheet, XlsxError,
};

use super::figures::{Figure, figure, write_figures};
use super::style::{MAX_CELL_CHARS, Styles, shown, truncate};
use crate::audit::energy::{OPERATING_POINT_CAUTION, RankBasis, SAVINGS_CAUTION};
use crate::audit::system::{CurvePoint, Outcome, SystemResult};
use crate::audit::{Audit, FittingResult};
use crate::error::quote_sheet;
use crate::sentence::{Sentence, join};
use crate::units::{UnitSystem, console_unit, header_in};

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
        f.tag.to_string()
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

/// How a ranking column's numbers are shown (set once per column).
#[derive(Clone, Copy)]
enum Fmt {
    N0,
    N2,
    N3,
    Pct,
    General,
}

/// One cell of the ranking table.
enum Cell<'a> {
    /// A number in the column's format, six significant figures; blank when None.
    Num(Option<f64>),
    /// A number as is.
    Plain(f64),
    Text(&'a str),
    Owned(String),
    /// Text marked good (true) or bad.
    Mark(&'static str, bool),
    /// A link to the fitting's input cell.
    Link,
    Blank,
}

/// One column of the `Fitting ranking` table: header (`{cur}` is the currency), format, value.
struct RankColumn {
    header: &'static str,
    fmt: Fmt,
    get: fn(&FittingResult) -> Cell<'_>,
}

const fn rc(header: &'static str, fmt: Fmt, get: fn(&FittingResult) -> Cell<'_>) -> RankColumn {
    RankColumn { header, fmt, get }
}

/// A fitting's cost at another head of its band (cost scales with head at one flow).
fn cost_at(f: &FittingResult, h: f64) -> Option<f64> {
    if f.head_m > 0.0 {
        f.annual_cost.map(|c| c * h / f.head_m)
    } else {
        f.annual_cost
    }
}

fn sugg(f: &FittingResult) -> Option<&crate::audit::energy::Suggestion> {
    f.suggestion.as_deref()
}

/// The columns of the `Fitting ranking` table, in order.
const RANKING_COLUMNS: &[RankColumn] = &[
    rc("Rank", Fmt::N0, |f| Cell::Num(f.rank.map(|x| x as f64))),
    rc("Rank range", Fmt::General, |f| match f.ranking {
        Some(k) => Cell::Owned(format!("{}–{}", k.best, k.worst)),
        None => Cell::Blank,
    }),
    rc("Rank holds", Fmt::General, |f| match f.ranking {
        Some(k) if k.uncertain => Cell::Mark("uncertain", false),
        Some(_) => Cell::Mark("holds", true),
        None => Cell::Blank,
    }),
    rc("Tag", Fmt::General, |f| Cell::Text(&f.tag)),
    rc("Line", Fmt::General, |f| Cell::Text(&f.line)),
    rc("Item", Fmt::General, |f| Cell::Text(&f.item)),
    rc("Kind", Fmt::General, |f| Cell::Text(f.kind)),
    rc("Qty", Fmt::General, |f| Cell::Plain(f.qty)),
    rc("K", Fmt::N3, |f| Cell::Num(Some(f.k))),
    rc("K low", Fmt::N3, |f| Cell::Num(Some(f.k_low))),
    rc("K high", Fmt::N3, |f| Cell::Num(Some(f.k_high))),
    rc("Head [m]", Fmt::N3, |f| Cell::Num(Some(f.head_m))),
    rc("Head low [m]", Fmt::N3, |f| Cell::Num(Some(f.head_low_m))),
    rc("Head high [m]", Fmt::N3, |f| Cell::Num(Some(f.head_high_m))),
    rc("Power lost [W]", Fmt::N0, |f| Cell::Num(f.power_loss_w)),
    rc("Annual energy [kWh]", Fmt::N0, |f| {
        Cell::Num(f.annual_energy_kwh)
    }),
    rc("Annual cost [{cur}]", Fmt::N2, |f| Cell::Num(f.annual_cost)),
    rc("Cost low [{cur}]", Fmt::N2, |f| {
        Cell::Num(cost_at(f, f.head_low_m))
    }),
    rc("Cost high [{cur}]", Fmt::N2, |f| {
        Cell::Num(cost_at(f, f.head_high_m))
    }),
    rc("Share", Fmt::Pct, |f| Cell::Num(f.ranking.map(|k| k.share))),
    rc("Cumulative share", Fmt::Pct, |f| {
        Cell::Num(f.ranking.map(|k| k.cumulative_share))
    }),
    rc("Ranked by", Fmt::General, |f| {
        match f.ranking.map(|k| k.basis) {
            Some(RankBasis::AnnualCost) => Cell::Text("annual cost"),
            Some(RankBasis::HeadLoss) => Cell::Text("head loss (no pump energy)"),
            None => Cell::Blank,
        }
    }),
    rc("Suggestion (estimate)", Fmt::General, |f| match sugg(f) {
        Some(s) => Cell::Owned(suggestion_text(s, "*")),
        None => Cell::Blank,
    }),
    rc("K after", Fmt::N3, |f| {
        Cell::Num(sugg(f).map(|s| s.k_after))
    }),
    rc("Annual saving [{cur}]", Fmt::N2, |f| {
        Cell::Num(sugg(f).and_then(|s| s.annual_saving))
    }),
    rc("Replacement cost [{cur}]", Fmt::N2, |f| {
        Cell::Num(f.replacement_cost)
    }),
    rc("Payback [years]", Fmt::N2, |f| {
        Cell::Num(sugg(f).and_then(|s| s.payback_years))
    }),
    rc("Present value [{cur}]", Fmt::N2, |f| {
        Cell::Num(sugg(f).and_then(|s| s.present_value))
    }),
    rc("Net present value [{cur}]", Fmt::N2, |f| {
        Cell::Num(sugg(f).and_then(|s| s.net_present_value))
    }),
    rc("Saving case", Fmt::General, |f| {
        match sugg(f).and_then(|s| s.saving_case) {
            Some(c) => Cell::Text(c.label()),
            None => Cell::Blank,
        }
    }),
    rc("Fixed speed runs out to [m3/h]", Fmt::N2, |f| {
        Cell::Num(sugg(f).and_then(|s| s.resolved_flow_m3_s).map(m3h))
    }),
    rc("Power there [kW]", Fmt::N2, |f| {
        Cell::Num(sugg(f).and_then(|s| s.resolved_power_w).map(|w| w / 1e3))
    }),
    rc("Cell", Fmt::General, |_| Cell::Link),
];

/// The index of a ranking column by its header (as written in [`RANKING_COLUMNS`]).
fn column(header: &str) -> u16 {
    RANKING_COLUMNS
        .iter()
        .position(|c| c.header == header)
        .unwrap_or(0) as u16
}

/// Worksheet rows (the format's limit).
const SHEET_ROWS: u32 = 1_048_576;

/// Write the `Fitting ranking` sheet, with a bar-and-line chart of the worst items: the worst
/// `rows` items (all when `None`, up to the sheet's row limit) and, when some are left out, a
/// closing line saying how many and what share of the cost they carry.
pub(crate) fn write_ranking(
    ws: &mut Worksheet,
    sheet: &str,
    audit: &Audit,
    rows: Option<usize>,
    invented: Option<&str>,
    st: &Styles,
) -> Result<(), XlsxError> {
    let cur = &audit.energy.currency;
    ranking_heading(ws, audit, st)?;
    let headers: Vec<String> = RANKING_COLUMNS
        .iter()
        .map(|c| c.header.replace("{cur}", cur))
        .collect();
    // Head columns in the report's units; the factor is 1 for every other column.
    let (headers, factor): (Vec<String>, Vec<f64>) =
        headers.iter().map(|h| header_in(h, st.units)).unzip();
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
    for (c, col) in RANKING_COLUMNS.iter().enumerate() {
        let fmt = match col.fmt {
            Fmt::N0 => &st.n0,
            Fmt::N2 => &st.n2,
            Fmt::N3 => &st.n3,
            Fmt::Pct => &st.pct,
            Fmt::General => continue,
        };
        ws.set_column_format(c as u16, fmt)?;
    }
    let fits = (SHEET_ROWS - hr - 2) as usize;
    let items = ranked(audit, Some(rows.unwrap_or(usize::MAX).min(fits)));
    ranking_items(ws, &items, hr, &factor, st)?;
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
    ws.set_column_width(column("Suggestion (estimate)"), 48)?;
    ws.set_column_width(column("Saving case"), 36)?;
    ws.set_freeze_panes(hr + 1, 4)?;
    // Printed landscape, one page wide: the chart alone on the first page, the table from the
    // second with its header repeated on every page.
    ws.set_landscape().set_print_fit_to_pages(1, 0);
    ws.set_repeat_rows(hr, hr)?;
    ws.set_page_breaks(&[hr])?;

    ranking_chart(ws, sheet, &items, hr, &headers)
}

/// The ranking sheet's title, its basis and the savings caution (rows 1–3).
fn ranking_heading(ws: &mut Worksheet, audit: &Audit, st: &Styles) -> Result<(), XlsxError> {
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
    Ok(())
}

/// One row per listed item below the header row `hr`, by [`RANKING_COLUMNS`]; head columns
/// scaled by `factor` into the report's units.
fn ranking_items(
    ws: &mut Worksheet,
    items: &[&FittingResult],
    hr: u32,
    factor: &[f64],
    st: &Styles,
) -> Result<(), XlsxError> {
    for (i, f) in items.iter().enumerate() {
        let r = hr + 1 + i as u32;
        for (c, col) in RANKING_COLUMNS.iter().enumerate() {
            let c = c as u16;
            match (col.get)(f) {
                Cell::Num(v) => num(ws, r, c, v.map(|x| x * factor[c as usize]))?,
                Cell::Plain(x) => ws.write_number(r, c, x).map(|_| ())?,
                Cell::Text(t) => ws.write_string(r, c, t).map(|_| ())?,
                Cell::Owned(t) => ws.write_string(r, c, t).map(|_| ())?,
                Cell::Mark(t, good) => ws
                    .write_string_with_format(r, c, t, if good { &st.good } else { &st.uncertain })
                    .map(|_| ())?,
                Cell::Link => {
                    let target = format!("internal:{}!{}", quote_sheet(&f.cell.sheet), f.cell.a1());
                    ws.write_url_with_text(r, c, Url::new(target), f.cell.to_string())
                        .map(|_| ())?
                }
                Cell::Blank => {}
            }
        }
    }
    Ok(())
}

/// The chart of the worst items above the table: by the first basis present (cost when any
/// item has a cost).
fn ranking_chart(
    ws: &mut Worksheet,
    sheet: &str,
    items: &[&FittingResult],
    hr: u32,
    headers: &[String],
) -> Result<(), XlsxError> {
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
        let value_col = column(if by_cost {
            "Annual cost [{cur}]"
        } else {
            "Head [m]"
        });
        let (tag, cumulative) = (column("Tag"), column("Cumulative share"));
        let value_name = headers[value_col as usize].clone();
        let bars = pareto_chart(
            sheet,
            (first, last),
            (tag, value_col, cumulative),
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
pub(crate) fn write_systems(
    ws: &mut Worksheet,
    sheet: &str,
    audit: &Audit,
    st: &Styles,
) -> Result<(), XlsxError> {
    ws.write_string_with_format(
        0,
        0,
        "Systems: required head against the pump, system curve and NPSH",
        &st.title,
    )?;
    ws.write_string(1, 0, "System curve: static head plus every line's losses recomputed at each flow (friction factor and Re-dependent K re-evaluated, not scaled by Q²).")?;
    let mut r = 3u32;
    // Printed landscape, one page wide, each system (figures, curve table and chart) starting
    // a page of its own.
    ws.set_landscape().set_print_fit_to_pages(1, 0);
    let mut breaks = Vec::new();
    for (i, s) in audit.systems.iter().enumerate() {
        if i > 0 {
            breaks.push(r);
        }
        r = write_system(ws, sheet, s, r, st, audit)? + 2;
    }
    ws.set_page_breaks(&breaks)?;
    if audit.systems.is_empty() {
        ws.write_string(
            r,
            0,
            "No systems given (a Systems sheet, or a System column in Lines).",
        )?;
    }
    ws.set_column_width(0, 30)?;
    ws.set_column_width(1, 40)?;
    for c in 2..=*CURVE_COLS.end() {
        ws.set_column_width(c, 13)?;
    }
    Ok(())
}

/// The duty, head and operating-point figures of a system.
fn duty_figures(s: &SystemResult) -> Vec<Figure> {
    let mut v = vec![
        figure("Duty flow [m3/h]", Some(m3h(s.flow_m3_s)), ""),
        figure(
            "Static head [m]",
            Some(s.static_head_m),
            &s.static_head_basis,
        ),
        figure(
            "Line losses [m]",
            Some(s.losses_head_m),
            "each line at its own flow",
        ),
        figure("Required head [m]", Some(s.required_head_m), ""),
        figure("Pump head at duty [m]", s.pump_head_m, &s.pump_head_basis),
        figure("Margin [m]", s.margin_m, "pump minus required"),
    ];
    if let Some(op) = s.operating_point {
        let basis = "pump curve meets system curve";
        v.push(figure(
            "Operating flow [m3/h]",
            Some(m3h(op.flow_m3_s)),
            basis,
        ));
        v.push(figure("Operating head [m]", Some(op.head_m), basis));
    }
    v
}

/// The figures of one NPSH check (`at` says where: at duty, at the operating point).
fn npsh_figures(at: &str, c: &crate::audit::system::NpshCheck) -> Vec<Figure> {
    vec![
        figure(
            format!("NPSH check {at}: flow [m3/h]"),
            Some(m3h(c.flow_m3_s)),
            "",
        ),
        figure(
            format!("Suction losses {at}, high end [m]"),
            Some(c.suction_losses_high_m),
            "suction fittings at the high end of their K band",
        ),
        figure(
            format!("Suction losses {at}, nominal [m]"),
            Some(c.suction_losses_m),
            "",
        ),
        figure(
            format!("NPSH available {at} [m]"),
            Some(c.available_m),
            "with the suction losses at the high end",
        ),
        figure(
            format!("NPSH available {at}, nominal [m]"),
            Some(c.available_nominal_m),
            "with the nominal suction losses",
        ),
        figure(
            format!("NPSH required {at} [m]"),
            c.required_m,
            if c.required_m.is_some() {
                c.required_basis.as_str()
            } else {
                "not given"
            },
        ),
        figure(
            format!("NPSH the margin rule asks for {at} [m]"),
            c.needed_m,
            "",
        ),
    ]
}

fn write_system(
    ws: &mut Worksheet,
    sheet: &str,
    s: &SystemResult,
    start: u32,
    st: &Styles,
    audit: &Audit,
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
    ws.write_string_with_format(r, 0, "Lines (suction first)", &st.bold)?;
    ws.write_string(r, 1, truncate(&s.lines.join(", "), MAX_CELL_CHARS))?;
    r += 1;
    r = write_figures(ws, r, &duty_figures(s), st)?;
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
        r = write_figures(ws, r, &npsh_figures(label, c), st)?;
        let (text, fmt) = if c.fails {
            ("FAIL", &st.bad)
        } else if c.needed_m.is_some() {
            ("pass", &st.good)
        } else {
            ("not checked", &st.bold)
        };
        ws.write_string_with_format(r, 0, format!("NPSH {label}: result"), &st.bold)?;
        ws.write_string_with_format(r, 1, text, fmt)?;
        r += 1;
    }
    let station =
        super::station::station_figures(s, &audit.rules, &audit.energy.currency, st.units);
    r = write_figures(ws, r, &station, st)?;
    if !s.defaults.is_empty() {
        ws.write_string_with_format(r, 0, "Defaults applied", &st.bold)?;
        ws.write_string_with_format(r, 1, join(&s.defaults, "; ", st.units), &st.wrap)?;
        r += 1;
    }
    for n in &s.notes {
        ws.write_string_with_format(r, 0, "Note", &st.bold)?;
        ws.write_string_with_format(r, 1, n.render(st.units), &st.wrap)?;
        r += 1;
    }
    r += 1;
    let last = write_curve_table(ws, s, r, st)?;
    ws.insert_chart(start, CHART_COL, &system_chart(sheet, s, r, st))?;
    Ok(last.max(start + 18))
}

/// Column of the Systems sheet the chart of each system is placed at (right of its curve table).
const CHART_COL: u16 = 13;

/// Columns of the curve table: flow, % of duty, required head, pump curve flow and head, duty
/// point, operating point, pump efficiency flow and efficiency.
const CURVE_COLS: std::ops::RangeInclusive<u16> = 1..=11;

/// Write the curve table of a system at header row `hr`, in the report's units: the system
/// curve, the pump curve, the duty and operating points and the pump efficiency points.
/// Returns its last row.
fn write_curve_table(
    ws: &mut Worksheet,
    s: &SystemResult,
    hr: u32,
    st: &Styles,
) -> Result<u32, XlsxError> {
    let (flow_label, fq) = header_in("Flow [m3/h]", st.units);
    let (head_label, fh) = header_in("Head [m]", st.units);
    let unit = |l: &str| l[l.find('[').unwrap_or(l.len())..].to_string();
    let (qu, hu) = (unit(&flow_label), unit(&head_label));
    let headers = [
        format!("Flow {qu}"),
        "% of duty".to_string(),
        format!("Required head {hu}"),
        format!("Pump curve flow {qu}"),
        format!("Pump curve head {hu}"),
        format!("Duty flow {qu}"),
        format!("Duty head {hu}"),
        format!("Operating flow {qu}"),
        format!("Operating head {hu}"),
        format!("Efficiency point flow {qu}"),
        "Pump efficiency [%]".to_string(),
    ];
    for (c, h) in CURVE_COLS.zip(headers.iter()) {
        ws.write_string_with_format(hr, c, h, &st.header)?;
    }
    ws.set_row_height(hr, 30)?;
    let mut pair = |rows: &[CurvePoint], col: u16, head_factor: f64, fmt: &Format| {
        for (i, p) in rows.iter().enumerate() {
            let rr = hr + 1 + i as u32;
            ws.write_number_with_format(rr, col, m3h(p.flow_m3_s) * fq, &st.n2)?;
            ws.write_number_with_format(rr, col + 1, p.head_m * head_factor, fmt)?;
        }
        Ok::<(), XlsxError>(())
    };
    pair(&s.pump_curve, 4, fh, &st.n3)?;
    let duty = CurvePoint {
        flow_m3_s: s.flow_m3_s,
        head_m: s.required_head_m,
    };
    pair(&[duty], 6, fh, &st.n3)?;
    pair(s.operating_point.as_slice(), 8, fh, &st.n3)?;
    pair(&s.efficiency_curve, 10, 1.0, &st.pct)?;
    for (i, p) in s.curve.iter().enumerate() {
        let rr = hr + 1 + i as u32;
        ws.write_number_with_format(rr, 1, m3h(p.flow_m3_s) * fq, &st.n2)?;
        if s.flow_m3_s > 0.0 {
            ws.write_number_with_format(rr, 2, p.flow_m3_s / s.flow_m3_s, &st.pct)?;
        }
        ws.write_number_with_format(rr, 3, p.head_m * fh, &st.n3)?;
    }
    let rows = s
        .curve
        .len()
        .max(s.pump_curve.len())
        .max(s.efficiency_curve.len())
        .max(1);
    Ok(hr + rows as u32)
}

/// The chart of a system from its curve table at header row `hr`: the system curve, the pump
/// curve, the duty and operating points against the head axis, and the pump efficiency curve
/// (when the pump curve gives efficiency or power points) against a secondary axis.
fn system_chart(sheet: &str, s: &SystemResult, hr: u32, st: &Styles) -> Chart {
    let (flow_label, _) = header_in("Flow [m3/h]", st.units);
    let (head_label, _) = header_in("Head [m]", st.units);
    let mut chart = Chart::new(ChartType::ScatterStraightWithMarkers);
    // One series: x in column `x`, y in column `y`, `n` rows; a point gets a diamond marker.
    let mut series = |name: &str, (x, y): (u16, u16), n: usize, point: bool, secondary: bool| {
        let last = hr + n.max(1) as u32;
        let added = chart
            .add_series()
            .set_categories((sheet, hr + 1, x, last, x))
            .set_values((sheet, hr + 1, y, last, y))
            .set_name(name)
            .set_secondary_axis(secondary);
        if point {
            added.set_marker(
                ChartMarker::new()
                    .set_type(ChartMarkerType::Diamond)
                    .set_size(10),
            );
        }
    };
    series("System curve", (1, 3), s.curve.len(), false, false);
    if !s.pump_curve.is_empty() {
        series("Pump curve", (4, 5), s.pump_curve.len(), false, false);
    }
    series("Duty point", (6, 7), 1, true, false);
    if s.operating_point.is_some() {
        series("Operating point", (8, 9), 1, true, false);
    }
    if !s.efficiency_curve.is_empty() {
        let n = s.efficiency_curve.len();
        series("Pump efficiency", (10, 11), n, false, true);
        chart
            .y2_axis()
            .set_name("Pump efficiency [%]")
            .set_num_format("0%");
    }
    chart
        .title()
        .set_name(format!("System {}: head against flow", s.system).as_str());
    chart.x_axis().set_name(&flow_label);
    chart.y_axis().set_name(&head_label);
    chart.set_width(620).set_height(340);
    chart
}

/// The energy block of `Summary`: total annual loss cost, systems that fail, the top five items.
/// Returns the next free row.
pub(crate) fn write_summary_block(
    ws: &mut Worksheet,
    audit: &Audit,
    start: u32,
    st: &Styles,
) -> Result<u32, XlsxError> {
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
    r = write_summary_systems(ws, audit, r, st)?;
    r += 1;
    ws.write_string_with_format(r, 0, "Top five items (see Fitting ranking)", &st.bold)?;
    r += 1;
    let (head_label, fh) = header_in("Head [m]", st.units);
    let h = ["Rank", "Item", "Line", "Kind"]
        .iter()
        .map(|s| s.to_string())
        .chain([
            head_label,
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
        ws.write_string(r, 2, &*f.line)?;
        ws.write_string(r, 3, f.kind)?;
        opt(ws, r, 4, Some(f.head_m * fh), &st.n3)?;
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
    let (flow_label, fq) = header_in("At flow [m3/h]", st.units);
    let (has, fh) = header_in("Has [m]", st.units);
    let (nominal, _) = header_in("Nominal [m]", st.units);
    let (needs, _) = header_in("Needs [m]", st.units);
    for (c, h) in [
        "System",
        "Check",
        &flow_label,
        &has,
        &nominal,
        &needs,
        "Result",
        "Note",
    ]
    .iter()
    .enumerate()
    {
        ws.write_string_with_format(r, c as u16, *h, &st.header)?;
    }
    let head = |v: Option<f64>| v.map(|x| x * fh);
    for s in &audit.systems {
        for c in &s.checks {
            r += 1;
            ws.write_string(r, 0, &s.system)?;
            ws.write_string(r, 1, c.check)?;
            opt(ws, r, 2, Some(m3h(c.flow_m3_s) * fq), &st.n2)?;
            opt(ws, r, 3, head(c.available_m), &st.n2)?;
            opt(ws, r, 4, head(c.nominal_m), &st.n2)?;
            opt(ws, r, 5, head(c.needed_m), &st.n2)?;
            let fmt = match c.outcome {
                Outcome::Pass => &st.good,
                Outcome::Fail => &st.bad,
                Outcome::NotChecked => &st.bold,
            };
            ws.write_string_with_format(r, 6, c.outcome.label(), fmt)?;
            ws.write_string(r, 7, c.note.render(st.units))?;
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
    for line in defaults_applied(audit, st.units) {
        r += 1;
        ws.write_string(r, 0, line)?;
    }
    Ok(r + 1)
}

/// Console text: annual loss cost, the worst items by cost, and each system's figures, checks
/// and verdict, fitted to `width` (see [`super::text_table`]).
pub fn console_energy(audit: &Audit, units: UnitSystem, width: Option<usize>) -> String {
    use super::console::fitted_text;
    use super::text_table::{Align::Left, Align::Right, TextTable};
    let cur = &audit.energy.currency;
    let (hu, fh) = console_unit("m", "m", 1.0, units);
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
        let head = format!("Head\n{hu}");
        let mut t = TextTable::new(&[
            ("Rank", Right),
            ("Fitting", Left),
            ("Line", Left),
            (&head, Right),
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
                f.line.to_string(),
                format!("{:.3}", f.head_m * fh),
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
        out.push_str(&console_systems(audit, units, width));
    }
    out
}

/// The defaults that fed NPSH available, one sentence per set of systems sharing them
/// ("Defaults applied to NPSH (Duty A, Duty B): …").
pub fn defaults_applied(audit: &Audit, units: UnitSystem) -> Vec<String> {
    let mut groups: Vec<(Vec<&str>, &Vec<Sentence>)> = Vec::new();
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
                join(d, "; ", units)
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
fn console_systems(audit: &Audit, units: UnitSystem, width: Option<usize>) -> String {
    use super::console::fitted_text;
    use super::text_table::{Align::Left, Align::Right, TextTable};
    let (qu, fq) = console_unit("m3/s", "m³/h", 3600.0, units);
    let (hu, fh) = console_unit("m", "m", 1.0, units);
    let f2 = |v: Option<f64>| {
        v.map(|x| format!("{:.2}", x * fh))
            .unwrap_or_else(|| "—".into())
    };
    let head = |name: &str| format!("{name}\n{hu}");
    let (flow, at) = (format!("Duty\n{qu}"), format!("At\n{qu}"));
    let mut out = String::new();
    let mut t = TextTable::new(&[
        ("System", Left),
        (&flow, Right),
        (&head("Static"), Right),
        (&head("Losses"), Right),
        (&head("Required"), Right),
        (&head("Pump"), Right),
        (&head("Margin"), Right),
        ("Operating\npoint", Left),
        ("Lines", Left),
    ]);
    for s in &audit.systems {
        t.row(vec![
            s.system.clone(),
            format!("{:.1}", s.flow_m3_s * fq),
            if s.static_head_given {
                format!("{:.2}", s.static_head_m * fh)
            } else {
                "none".into()
            },
            f2(Some(s.losses_head_m)),
            f2(Some(s.required_head_m)),
            f2(s.pump_head_m),
            f2(s.margin_m),
            s.operating_point
                .map(|p| format!("{:.1} {qu} at {:.2} {hu}", p.flow_m3_s * fq, p.head_m * fh))
                .unwrap_or_else(|| "—".into()),
            s.lines.join(", "),
        ]);
    }
    out.push_str(&t.render(width));
    out.push('\n');
    let mut t = TextTable::new(&[
        ("System", Left),
        ("Check", Left),
        (&at, Right),
        (&head("Has"), Right),
        (&head("Nominal"), Right),
        (&head("Needs"), Right),
        ("Result", Left),
        ("Note", Left),
    ]);
    for s in &audit.systems {
        for c in &s.checks {
            t.row(vec![
                s.system.clone(),
                c.check.to_string(),
                format!("{:.1}", c.flow_m3_s * fq),
                f2(c.available_m),
                c.nominal_m
                    .map(|x| format!("{:.2}", x * fh))
                    .unwrap_or_default(),
                f2(c.needed_m),
                c.outcome.label().to_string(),
                c.note.render(units).into_owned(),
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
    for line in defaults_applied(audit, units) {
        out.push_str(&fitted_text(&line, width));
    }
    for s in &audit.systems {
        let line = super::station::console_line(s, &audit.energy.currency, units);
        out.push_str(&fitted_text(&line, width));
    }
    out.push_str(&fitted_text(SYSTEMS_CAUTION, width));
    out.push_str(&fitted_text(crate::audit::station::STATION_CAUTION, width));
    out.push('\n');
    out
}
