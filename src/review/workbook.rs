//! The review workbook: `Stations` (with a chart of annual loss cost by station), `Worst
//! fittings` (with a Pareto chart), `Findings` and `Basis`. Every fitting and finding links to
//! its cell in its station's audited copy, every station to its copy.

use rust_xlsxwriter::{
    Chart, ChartType, DocProperties, ExcelDateTime, Format, Workbook, Worksheet, XlsxError,
};

use super::Review;
use super::summary::{StationFinding, StationRow};
use super::worst::WorstFitting;
use crate::audit::energy::{OPERATING_POINT_CAUTION, RANK_SHIFT_LIMIT, RankBasis, SAVINGS_CAUTION};
use crate::error::{CellRef, quote_sheet};
use crate::report::ranking::{CHART_ITEMS, pareto_chart, suggestion_text};
use crate::report::style::{MAX_CELL_CHARS, Styles, truncate};
use crate::report::table::{Cell, Col, col, write_rows, write_table_at};
use crate::units::UnitSystem;

/// Sheet names.
const STATIONS: &str = "Stations";
const WORST: &str = "Worst fittings";
const FINDINGS: &str = "Findings";
const BASIS: &str = "Basis";

/// Header row of the sheets with a chart above their table (rows 3–22 hold the chart).
const CHARTED_HEADER: u32 = 24;

/// A link to `cell` in the audited copy `copy` (relative to the review workbook).
fn cell_in_copy(copy: &str, cell: &CellRef) -> Cell<'static> {
    Cell::External(
        Some(format!("{copy}#{}!{}", quote_sheet(&cell.sheet), cell.a1())),
        cell.to_string(),
    )
}

fn figures<T: Default + Copy>(
    r: &StationRow,
    get: fn(&super::summary::StationFigures) -> T,
) -> Option<T> {
    r.figures.as_ref().map(get)
}

/// The columns of `Stations`. Per-station figures added to `StationFigures` get their columns
/// here, after the worst fitting.
const STATION_COLS: &[Col<StationRow>] = &[
    col("Station", 22.0, |r| Cell::Text(&r.station)),
    col("Status", 12.0, |r| {
        Cell::Text(if r.audited { "audited" } else { "not audited" })
    }),
    col("Lines", 8.0, |r| Cell::Count(figures(r, |f| f.lines))),
    col("Runs", 8.0, |r| Cell::Count(figures(r, |f| f.runs))),
    col("Fittings", 9.0, |r| Cell::Count(figures(r, |f| f.fittings))),
    col("Annual loss energy [kWh]", 14.0, |r| {
        Cell::Money(figures(r, |f| f.annual_energy_kwh))
    }),
    col("Annual loss cost", 14.0, |r| {
        Cell::Money(figures(r, |f| f.annual_cost))
    }),
    col("Errors", 8.0, |r| {
        Cell::Count(figures(r, |f| f.findings.error))
    }),
    col("Warnings", 9.0, |r| {
        Cell::Count(figures(r, |f| f.findings.warning))
    }),
    col("Info", 8.0, |r| {
        Cell::Count(figures(r, |f| f.findings.info))
    }),
    col("Worst fitting", 18.0, |r| {
        worst_of(r, |w| Cell::Owned(w.fitting.clone()))
    }),
    col("Worst fitting line", 12.0, |r| {
        worst_of(r, |w| Cell::Owned(w.line.clone()))
    }),
    col("Worst fitting cost", 13.0, |r| {
        worst_of(r, |w| Cell::Money(w.annual_cost))
    }),
    col("Worst fitting head [m]", 12.0, |r| {
        worst_of(r, |w| Cell::Num(Some(w.head_m)))
    }),
    col("Metered energy [kWh]", 14.0, |r| {
        Cell::Money(measured(r, |m| m.energy_kwh))
    }),
    col("Metered volume [m3]", 14.0, |r| {
        Cell::Money(measured(r, |m| m.volume_m3))
    }),
    col("Specific energy [kWh/m3]", 12.0, |r| {
        Cell::Num(measured(r, |m| m.specific_energy_kwh_m3))
    }),
    col("Wire-to-water", 11.0, |r| {
        Cell::Pct(measured(r, |m| m.wire_to_water))
    }),
    col("Lowest wire-to-water system", 16.0, |r| {
        Cell::Owned(measured(r, |m| m.lowest_system.clone()).unwrap_or_default())
    }),
    col("Lowest wire-to-water", 11.0, |r| {
        Cell::Pct(measured(r, |m| m.lowest_wire_to_water))
    }),
    col("Systems outside preferred region", 12.0, |r| {
        Cell::Count(measured(r, |m| Some(m.outside_preferred)))
    }),
    col("Audited copy", 28.0, |r| match &r.copy {
        Some(c) => Cell::External(Some(c.clone()), c.clone()),
        None => Cell::Text(""),
    }),
    col("Problem (file and cell)", 70.0, |r| Cell::Owned(problem(r))),
    col("File", 36.0, |r| Cell::Text(&r.file)),
    col("Invented data", 20.0, |r| {
        Cell::Text(r.invented_data_note.as_deref().unwrap_or(""))
    }),
];

/// A measured figure of an audited station (None when it has no measured system).
fn measured<T>(
    r: &StationRow,
    get: impl Fn(&super::summary::StationMeasured) -> Option<T>,
) -> Option<T> {
    r.figures.as_ref()?.measured.as_ref().and_then(get)
}

/// The column of `Stations` headed `header`.
fn station_col(header: &str) -> u16 {
    STATION_COLS
        .iter()
        .position(|c| c.header == header)
        .unwrap_or(0) as u16
}

fn worst_of(
    r: &StationRow,
    f: fn(&super::summary::WorstOfStation) -> Cell<'static>,
) -> Cell<'static> {
    r.figures
        .as_ref()
        .and_then(|x| x.worst_fitting.as_ref())
        .map_or(Cell::Text(""), f)
}

/// The first problem of a station not audited (its file, cell and message) and how many more.
fn problem(r: &StationRow) -> String {
    let Some(first) = r.problems.first() else {
        return String::new();
    };
    let mut text = first.to_string();
    if r.problems.len() > 1 {
        text.push_str(&format!(
            " (and {} more: see the console or the JSON)",
            r.problems.len() - 1
        ));
    }
    text
}

const WORST_COLS: &[Col<WorstFitting>] = &[
    col("Rank", 7.0, |w| Cell::Count(Some(w.rank))),
    col("Rank range", 11.0, |w| {
        Cell::Owned(format!(
            "{}–{}{}",
            w.rank_best,
            w.rank_worst,
            if w.rank_worst_at_least { "+" } else { "" }
        ))
    }),
    col("Rank holds", 10.0, |w| {
        Cell::Text(if w.rank_uncertain {
            "uncertain"
        } else {
            "holds"
        })
    }),
    col("Station: fitting", 24.0, |w| {
        Cell::Owned(format!("{}: {}", w.station, fitting(w)))
    }),
    col("Station", 18.0, |w| Cell::Text(&w.station)),
    col("Tag", 14.0, |w| Cell::Text(&w.tag)),
    col("Line", 11.0, |w| Cell::Text(&w.line)),
    col("Item", 18.0, |w| Cell::Text(&w.item)),
    col("Kind", 18.0, |w| Cell::Text(w.kind)),
    col("Qty", 6.0, |w| Cell::Num(Some(w.qty))),
    col("K", 8.0, |w| Cell::Num(Some(w.k))),
    col("K low", 8.0, |w| Cell::Num(Some(w.k_low))),
    col("K high", 8.0, |w| Cell::Num(Some(w.k_high))),
    col("Head [m]", 10.0, |w| Cell::Num(Some(w.head_m))),
    col("Annual energy [kWh]", 12.0, |w| {
        Cell::Money(w.annual_energy_kwh)
    }),
    col("Annual cost", 12.0, |w| Cell::Money(w.annual_cost)),
    col("Share", 8.0, |w| Cell::Pct(Some(w.share))),
    col("Cumulative share", 11.0, |w| {
        Cell::Pct(Some(w.cumulative_share))
    }),
    col("Ranked by", 14.0, |w| {
        Cell::Text(match w.ranked_by {
            RankBasis::AnnualCost => "annual cost",
            RankBasis::HeadLoss => "head loss (no pump energy)",
        })
    }),
    col("Suggestion (estimate)", 48.0, |w| {
        Cell::Owned(
            w.suggestion
                .as_ref()
                .map(|s| suggestion_text(s, "*"))
                .unwrap_or_default(),
        )
    }),
    col("K after", 8.0, |w| {
        Cell::Num(w.suggestion.as_ref().map(|s| s.k_after))
    }),
    col("Annual saving", 12.0, |w| {
        Cell::Money(w.suggestion.as_ref().and_then(|s| s.annual_saving))
    }),
    col("Replacement cost", 12.0, |w| {
        Cell::Money(w.replacement_cost)
    }),
    col("Payback [years]", 10.0, |w| {
        Cell::Money(w.suggestion.as_ref().and_then(|s| s.payback_years))
    }),
    col("Station rank", 9.0, |w| Cell::Count(Some(w.station_rank))),
    col("Cell (audited copy)", 18.0, |w| {
        cell_in_copy(&w.copy, &w.cell)
    }),
];

/// Columns of `WORST_COLS` the Pareto chart reads: label, annual cost, head, cumulative share.
const WORST_LABEL_COL: u16 = 3;
const WORST_COST_COL: u16 = 15;
const WORST_HEAD_COL: u16 = 13;
const WORST_CUMULATIVE_COL: u16 = 17;

fn fitting(w: &WorstFitting) -> String {
    if w.tag.is_empty() {
        format!("{} ({})", w.item, w.line)
    } else {
        w.tag.clone()
    }
}

const FINDING_COLS: &[Col<StationFinding>] = &[
    col("Station", 18.0, |f| Cell::Text(&f.station)),
    col("Severity", 10.0, |f| Cell::Severity(f.severity)),
    col("Code", 18.0, |f| Cell::Text(&f.code)),
    col("Line", 12.0, |f| {
        Cell::Text(f.line.as_deref().unwrap_or(""))
    }),
    col("Tag", 12.0, |f| Cell::Text(f.tag.as_deref().unwrap_or(""))),
    col("Cell (audited copy)", 16.0, |f| match &f.cell {
        Some(c) => cell_in_copy(&f.copy, c),
        None => Cell::Text(""),
    }),
    col("Message", 80.0, |f| Cell::Text(&f.message)),
    col("Action", 60.0, |f| Cell::Text(&f.action)),
];

/// Build the review workbook.
///
/// # Errors
/// What the workbook writer reports.
pub fn build(review: &Review) -> Result<Workbook, XlsxError> {
    let mut wb = Workbook::new();
    // Fixed creation time: the same inputs give a byte-identical workbook.
    let created = ExcelDateTime::from_ymd(2000, 1, 1)?;
    wb.set_properties(
        &DocProperties::new()
            .set_creation_datetime(&created)
            .set_title("lossledger review")
            .set_comment("Screening estimate; see the Basis sheet"),
    );
    let mut st = Styles::new();
    st.units = if review.basis.units == "us" {
        UnitSystem::Us
    } else {
        UnitSystem::Si
    };
    wb.register_format(&Format::new());
    for f in st.all() {
        wb.register_format(f);
    }
    let sheet = |mut ws: Worksheet, name: &str| -> Result<Worksheet, XlsxError> {
        ws.set_name(name)?;
        Ok(ws)
    };
    // The sheets with a row per station, fitting or finding stream row by row (constant
    // memory, inline strings): an estate's findings are many.
    let mut stations = sheet(wb.new_worksheet_with_constant_memory()?, STATIONS)?;
    write_stations(&mut stations, review, &st)?;
    let mut worst = sheet(wb.new_worksheet_with_constant_memory()?, WORST)?;
    write_worst(&mut worst, review, &st)?;
    let mut findings = sheet(wb.new_worksheet_with_constant_memory()?, FINDINGS)?;
    if let Some(label) = &review.invented_data_note {
        findings.write_string_with_format(0, FINDING_COLS.len() as u16 + 1, label, &st.bold)?;
    }
    let rows = review
        .findings
        .iter()
        .map(|f| f.map_err(XlsxError::IoError));
    write_rows(&mut findings, 0, FINDING_COLS, rows, &st, true)?;
    let mut basis = sheet(Worksheet::new(), BASIS)?;
    write_basis(&mut basis, review, &st)?;
    for ws in [stations, worst, findings, basis] {
        wb.push_worksheet(ws);
    }
    Ok(wb)
}

/// Title, notes and the invented-data label above a charted table.
fn heading(
    ws: &mut Worksheet,
    review: &Review,
    title: &str,
    note: &str,
    st: &Styles,
) -> Result<(), XlsxError> {
    ws.write_string_with_format(0, 0, title, &st.title)?;
    ws.write_string(1, 0, note)?;
    if let Some(label) = &review.invented_data_note {
        ws.write_string_with_format(2, 0, label, &st.bold)?;
        ws.write_string_with_format(CHARTED_HEADER - 1, 0, label, &st.bold)?;
    }
    Ok(())
}

fn write_stations(ws: &mut Worksheet, review: &Review, st: &Styles) -> Result<(), XlsxError> {
    let t = &review.totals;
    heading(
        ws,
        review,
        "Stations: what each station's losses cost per year",
        &format!(
            "{} stations, {} audited, {} not audited (left out of every total). Costs in {} at {} per kWh; annual loss cost of the estate {:.2} {}, {:.0} kWh. Each station's audited copy is linked; screening estimates, see Basis.",
            t.stations,
            t.audited,
            t.not_audited,
            t.currency,
            t.tariff_per_kwh,
            t.annual_cost,
            t.currency,
            t.annual_energy_kwh
        ),
        st,
    )?;
    write_table_at(ws, CHARTED_HEADER, STATION_COLS, &review.stations, st, true)?;
    ws.set_freeze_panes(CHARTED_HEADER + 1, 1)?;
    if !review.stations.is_empty() {
        let (first, last) = (
            CHARTED_HEADER + 1,
            CHARTED_HEADER + review.stations.len() as u32,
        );
        let cost = station_col("Annual loss cost");
        let mut chart = Chart::new(ChartType::Column);
        chart
            .add_series()
            .set_categories((STATIONS, first, 0, last, 0))
            .set_values((STATIONS, first, cost, last, cost))
            .set_name(format!("Annual loss cost [{}]", t.currency).as_str());
        chart.title().set_name("Annual loss cost by station");
        chart
            .y_axis()
            .set_name(format!("Annual loss cost [{}]", t.currency).as_str());
        chart.set_width(900).set_height(380);
        ws.insert_chart(3, 1, &chart)?;
    }
    Ok(())
}

fn write_worst(ws: &mut Worksheet, review: &Review, st: &Styles) -> Result<(), XlsxError> {
    let cur = &review.totals.currency;
    heading(
        ws,
        review,
        "Worst fittings: every station's fittings ranked together by annual cost",
        &format!(
            "Ranked by annual cost at {cur} {} per kWh (head loss where no pump energy applies). Rank range: best and worst rank across the K bands of every fitting of the estate; more than {RANK_SHIFT_LIMIT} places either way is uncertain ('+': at least that far down). {SAVINGS_CAUTION} Suggestions marked * — {OPERATING_POINT_CAUTION}",
            review.totals.tariff_per_kwh
        ),
        st,
    )?;
    write_table_at(
        ws,
        CHARTED_HEADER,
        WORST_COLS,
        &review.worst_fittings,
        st,
        true,
    )?;
    ws.set_freeze_panes(CHARTED_HEADER + 1, 4)?;
    let items = &review.worst_fittings;
    if review.fittings_not_listed > 0 {
        ws.write_string_with_format(
            CHARTED_HEADER + 2 + items.len() as u32,
            0,
            format!(
                "{} more fittings are not listed here; every fitting's rank and cost within its station are in the station's audited copy. `lossledger review --ranking-rows all` lists them all.",
                review.fittings_not_listed
            ),
            &st.bold,
        )?;
    }
    let by_cost = items.iter().any(|w| w.ranked_by == RankBasis::AnnualCost);
    let want = if by_cost {
        RankBasis::AnnualCost
    } else {
        RankBasis::HeadLoss
    };
    let n = items
        .iter()
        .take(CHART_ITEMS)
        .take_while(|w| w.ranked_by == want)
        .count() as u32;
    if n > 0 {
        let value_name = if by_cost {
            format!("Annual cost [{cur}]")
        } else {
            "Head loss [m]".to_string()
        };
        let chart = pareto_chart(
            WORST,
            (CHARTED_HEADER + 1, CHARTED_HEADER + n),
            (
                WORST_LABEL_COL,
                if by_cost {
                    WORST_COST_COL
                } else {
                    WORST_HEAD_COL
                },
                WORST_CUMULATIVE_COL,
            ),
            &value_name,
            &format!("Worst {n} fittings of the estate"),
        );
        ws.insert_chart(3, 3, &chart)?;
    }
    Ok(())
}

fn write_basis(ws: &mut Worksheet, review: &Review, st: &Styles) -> Result<(), XlsxError> {
    let b = &review.basis;
    let mut rows: Vec<(String, String, bool)> = Vec::new();
    let mut push = |a: &str, v: &str| rows.push((a.to_string(), v.to_string(), false));
    if let Some(note) = &review.invented_data_note {
        push("Invented data", note);
    }
    push("Tool", &format!("lossledger {}", review.lossledger));
    push("Caution", b.caution);
    push("Caution on savings", b.savings_caution);
    push(
        "Caution on suggestions (marked *)",
        b.operating_point_caution,
    );
    push("Caution on systems", b.systems_caution);
    push(
        "Rules",
        b.rules_file
            .as_deref()
            .unwrap_or("built-in defaults (lossledger rules)"),
    );
    push("Header map", b.map_file.as_deref().unwrap_or("none"));
    push(
        "Units",
        if b.units == "us" {
            "US customary (JSON stays SI)"
        } else {
            "SI"
        },
    );
    push(
        "Audited copies",
        &format!(
            "{}/ beside this workbook (one per station audited)",
            b.copies
        ),
    );
    push(
        "Stations",
        "each input file is one station, audited as `lossledger audit` would audit it alone (line ids need only be unique within a file); a station that cannot be audited is listed in Stations with its problem and left out of every total, ranking and finding",
    );
    push("", "");
    rows.push((
        "Inputs (station, file, SHA-256)".into(),
        String::new(),
        true,
    ));
    for s in &review.stations {
        let status = if s.audited { "" } else { " (not audited)" };
        rows.push((
            format!("{}{status}", s.station),
            format!(
                "{} — SHA-256 {}",
                s.file,
                s.sha256.as_deref().unwrap_or("not read")
            ),
            false,
        ));
    }
    rows.push((String::new(), String::new(), false));
    rows.push(("Rules in force (every station)".into(), String::new(), true));
    for (k, v) in crate::report::rules_in_force(&b.rules) {
        rows.push((k, v, false));
    }
    for (r, (a, v, bold)) in rows.iter().enumerate() {
        let r = r as u32;
        if *bold {
            ws.write_string_with_format(r, 0, a, &st.bold)?;
        } else {
            ws.write_string(r, 0, truncate(a, MAX_CELL_CHARS))?;
        }
        if !v.is_empty() {
            ws.write_string(r, 1, truncate(v, MAX_CELL_CHARS))?;
        }
    }
    ws.set_column_width(0, 36)?;
    ws.set_column_width(1, 110)?;
    Ok(())
}
