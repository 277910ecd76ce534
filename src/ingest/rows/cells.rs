//! Reading the cells of one row of a located table: text, numbers with units, sizes; skipped
//! and blank rows; the visit over a table's rows.

use calamine::Data;
use std::collections::HashMap;

use super::Assumed;
use crate::error::{CellRef, Diagnostic, Severity};
use crate::ingest::grid::SheetGrid;
use crate::ingest::header::{Layout, MappedColumn};
use crate::ingest::parse::{self, CellNumber, SizeSpec, SizeUnit};
use crate::ingest::schema::{ColumnType, TableKind};
use crate::ingest::{Conversion, ErredRow, Input, Skipped};
use crate::sentence::Sentence;
use crate::units::{self, Quantity};

/// Reads cells of one row, pushing diagnostics.
pub(crate) struct Cells<'a> {
    pub(crate) file: &'a str,
    pub(crate) grid: &'a SheetGrid,
    pub(crate) layout: &'a Layout,
    pub(crate) decimal_comma: &'a HashMap<u32, bool>,
    pub(crate) row: u32,
    pub(crate) diags: &'a mut Vec<Diagnostic>,
    pub(crate) conversions: &'a mut Vec<Conversion>,
    pub(crate) errors: usize,
}

impl Cells<'_> {
    pub(crate) fn col(&self, key: &str) -> Option<&MappedColumn> {
        self.layout.column(key)
    }

    pub(crate) fn cell(&self, key: &str) -> CellRef {
        let col = self.col(key).map(|c| c.col).unwrap_or(0);
        CellRef::new(&self.layout.sheet, self.row, col)
    }

    pub(crate) fn error(&mut self, key: &str, message: String, hint: Option<String>) {
        let cell = self.cell(key);
        self.errors += 1;
        self.diags.push(Diagnostic {
            severity: Severity::Error,
            file: self.file.to_string(),
            cell: Some(cell),
            message,
            hint,
        });
    }

    pub(crate) fn assumed(&self, key: &'static str, what: impl Into<Sentence>) -> Assumed {
        Assumed {
            cell: self.cell(key),
            key,
            what: what.into(),
        }
    }

    /// Raw value, or None for a blank; a formula without cached value or an error value is reported.
    pub(crate) fn raw(&mut self, key: &str) -> Option<Data> {
        let col = self.col(key)?.col;
        let value = self.grid.merged_value(self.row, col).clone();
        match value {
            Data::Empty => {
                if let Some(f) = self.grid.formula(self.row, col) {
                    let f = f.to_string();
                    self.error(
                        key,
                        format!("formula ={f} has no cached value"),
                        Some(
                            "open the file in a spreadsheet application, recalculate and save it"
                                .into(),
                        ),
                    );
                }
                None
            }
            Data::Error(e) => {
                self.error(
                    key,
                    format!("cell holds the error value {e}"),
                    Some("fix the formula or enter the value".into()),
                );
                None
            }
            Data::String(s) if s.trim().is_empty() => None,
            other => Some(other),
        }
    }

    pub(crate) fn text(&mut self, key: &str) -> Option<String> {
        data_text(self.raw(key)?)
    }

    pub(crate) fn header(&self, key: &str) -> String {
        self.col(key)
            .map(|c| c.header.clone())
            .unwrap_or_else(|| key.to_string())
    }

    /// Schedule text `t` from the Schedule cell read as a schedule; None after an error at the
    /// cell when no schedule is spelled so.
    pub(crate) fn schedule_of(&mut self, t: &str) -> Option<crate::physics::pipe::Schedule> {
        crate::physics::pipe::parse_schedule(t).or_else(|| {
            self.error(
                "schedule",
                format!("schedule '{t}' is not known"),
                Some("write e.g. 40, STD, XS, 80, 10S, 40S or SDR11".into()),
            );
            None
        })
    }

    /// A number in SI units of the column's quantity (or plain), None for blank.
    pub(crate) fn number(&mut self, key: &str) -> Option<f64> {
        let mapped = self.col(key)?.clone();
        let raw = self.raw(key)?;
        let header = mapped.header.clone();
        let quantity = match mapped.spec.ty {
            ColumnType::Number(q) => Some(q),
            _ => None,
        };
        if quantity.is_some() && mapped.unit.is_none() {
            self.error(
                key,
                format!(
                    "unit '{}' of column '{header}' is not understood",
                    mapped.unit_label.clone().unwrap_or_default()
                ),
                Some(format!(
                    "write the unit in brackets, e.g. '{} [{}]'",
                    mapped.spec.header,
                    quantity.map(|q| units::default_unit(q).label).unwrap_or("")
                )),
            );
            return None;
        }
        let (value, cell_unit, percent) = self.cell_number(key, &mapped, raw)?;
        if !value.is_finite() {
            self.error(
                key,
                format!("{header}: value {value} is not a finite number"),
                None,
            );
            return None;
        }
        let Some(q) = quantity else {
            if let Some(u) = cell_unit {
                self.error(
                    key,
                    format!("{header}: unexpected unit '{u}' in a plain-number column"),
                    None,
                );
                return None;
            }
            return Some(if percent { value / 100.0 } else { value });
        };
        self.in_si(key, &mapped, q, value, cell_unit, percent)
    }

    /// The number a cell holds as written: (value, unit written in the cell, whether it was a
    /// percentage). Text is read by [`parse::parse_number_text`] and the conversion recorded.
    /// None for a blank or an error cell, and after an error (text that is no number, a date,
    /// TRUE/FALSE) at the cell.
    fn cell_number(
        &mut self,
        key: &str,
        mapped: &MappedColumn,
        raw: Data,
    ) -> Option<(f64, Option<String>, bool)> {
        let header = &mapped.header;
        Some(match raw {
            Data::Float(f) => (f, None, false),
            Data::Int(i) => (i as f64, None, false),
            Data::String(s) => {
                let dc = self
                    .decimal_comma
                    .get(&mapped.col)
                    .copied()
                    .unwrap_or(false);
                match parse::parse_number_text(&s, dc) {
                    Ok(CellNumber::Blank) => return None,
                    Ok(CellNumber::Value {
                        value,
                        unit,
                        percent,
                        ..
                    }) => {
                        self.conversions.push(Conversion {
                            cell: CellRef::new(&self.layout.sheet, self.row, mapped.col),
                            text: s.clone(),
                            value,
                            unit: if percent {
                                Some("%".into())
                            } else {
                                unit.clone()
                            },
                        });
                        (value, unit, percent)
                    }
                    Err(e) => {
                        self.error(
                            key,
                            format!("{header}: {e}"),
                            Some("enter a number, e.g. 12.5".into()),
                        );
                        return None;
                    }
                }
            }
            Data::DateTime(_) | Data::DateTimeIso(_) | Data::DurationIso(_) => {
                self.error(
                    key,
                    format!("{header}: a date or time where a number belongs"),
                    Some("format the cell as a number and re-enter the value".into()),
                );
                return None;
            }
            Data::Bool(b) => {
                self.error(
                    key,
                    format!("{header}: TRUE/FALSE ({b}) where a number belongs"),
                    None,
                );
                return None;
            }
            Data::Empty | Data::Error(_) => return None,
        })
    }

    /// A cell's `value` of quantity `q` in SI: a fraction by the percent rules, else converted
    /// from the cell's own unit (an error when it is no unit of `q`) or the column's.
    fn in_si(
        &mut self,
        key: &str,
        mapped: &MappedColumn,
        q: Quantity,
        value: f64,
        cell_unit: Option<String>,
        percent: bool,
    ) -> Option<f64> {
        let header = &mapped.header;
        if q == Quantity::Fraction {
            let label = mapped
                .unit_label
                .as_deref()
                .map(crate::ingest::schema::fold)
                .unwrap_or_default();
            let column_is_percent = label.contains("pct") || label.contains("percent");
            return Some(parse::parse_percent_or_fraction(
                value,
                percent,
                column_is_percent,
            ));
        }
        let unit = match cell_unit {
            Some(label) => match units::parse_unit(&label, q) {
                Some(u) => u,
                None => {
                    self.error(
                        key,
                        format!("{header}: unit '{label}' in the cell is not a unit of {q:?}"),
                        None,
                    );
                    return None;
                }
            },
            None => mapped.unit?,
        };
        let si = unit.to_si(value);
        si.is_finite().then_some(si).or_else(|| {
            self.error(
                key,
                format!("{header}: value {value} overflows in SI units"),
                None,
            );
            None
        })
    }

    pub(crate) fn positive(&mut self, key: &str, allow_zero: bool) -> Option<f64> {
        let v = self.number(key)?;
        if v < 0.0 || (!allow_zero && v == 0.0) {
            let header = self.header(key);
            let need = if allow_zero {
                "zero or more"
            } else {
                "greater than zero"
            };
            self.error(
                key,
                format!("{header} {} must be {need}", format_number(v)),
                None,
            );
            return None;
        }
        Some(v)
    }

    /// An efficiency: a fraction above zero (or zero, where `allow_zero`) and at most 1; above
    /// 100 % is an error with a hint.
    pub(crate) fn efficiency(&mut self, key: &str, allow_zero: bool) -> Option<f64> {
        let e = self.positive(key, allow_zero)?;
        if e <= 1.0 {
            return Some(e);
        }
        self.error(
            key,
            format!("efficiency {:.1} % is above 100 %", e * 100.0),
            Some("give the efficiency as a percentage or a fraction, e.g. 78 % or 0.78".into()),
        );
        None
    }

    pub(crate) fn size(&mut self, key: &str) -> Option<SizeSpec> {
        let mapped = self.col(key)?.clone();
        let unit = mapped.unit_label.as_deref().and_then(|l| {
            match crate::ingest::schema::fold(l).as_str() {
                "mm" | "dn" => Some(SizeUnit::Millimetre),
                "in" | "inch" | "inches" | "nps" => Some(SizeUnit::Inch),
                _ => None,
            }
        });
        let text = self.text(key)?;
        match parse::parse_size(&text, unit) {
            Ok(s) => Some(s),
            Err(e) => {
                let header = mapped.header.clone();
                self.error(
                    key,
                    format!("{header}: {e}"),
                    Some("write sizes like DN100, NPS 4, 4\", 110 OD or ID 102.3".into()),
                );
                None
            }
        }
    }
}

/// A cell's value as text, as [`Cells::text`] reads it (`None` for a blank or an error value).
pub(crate) fn data_text(value: Data) -> Option<String> {
    Some(match value {
        Data::String(s) => s.trim().to_string(),
        Data::Int(i) => i.to_string(),
        Data::Float(f) => format_number(f),
        Data::Bool(b) => b.to_string(),
        Data::DateTime(d) => d.as_f64().to_string(),
        Data::DateTimeIso(s) | Data::DurationIso(s) => s,
        Data::Empty | Data::Error(_) => return None,
    })
    .filter(|t| !t.is_empty())
}

/// The row's first error, with the line it names, when reading it found any.
pub(crate) fn erred_row(
    table: TableKind,
    grid: &SheetGrid,
    layout: &Layout,
    row: u32,
    diags: &[Diagnostic],
) -> Option<ErredRow> {
    let first = diags.iter().find(|d| d.severity == Severity::Error)?;
    let line = layout
        .column("line")
        .and_then(|c| data_text(grid.merged_value(row, c.col).clone()));
    Some(ErredRow {
        table,
        line,
        cell: first.cell.clone()?,
    })
}

/// Format a number without a trailing `.0` for integral values.
pub fn format_number(v: f64) -> String {
    if v.fract() == 0.0 && v.abs() < 1e15 {
        format!("{}", v as i64)
    } else {
        format!("{v}")
    }
}

pub(crate) fn decimal_comma_columns(grid: &SheetGrid, layout: &Layout) -> HashMap<u32, bool> {
    let cols: Vec<u32> = layout
        .columns
        .iter()
        .filter(|c| matches!(c.spec.ty, ColumnType::Number(_) | ColumnType::Plain))
        .map(|c| c.col)
        .collect();
    // Per column: texts with a comma that read as a decimal comma, and other texts with one.
    let mut counts: HashMap<u32, (usize, usize)> = cols.iter().map(|&c| (c, (0, 0))).collect();
    for row in grid.used_rows(layout.data_start..layout.end_row(grid)) {
        for &col in &cols {
            if let Data::String(s) = grid.value(row, col)
                && s.contains(',')
                && let Some(n) = counts.get_mut(&col)
            {
                if parse::looks_decimal_comma(s) {
                    n.0 += 1;
                } else {
                    n.1 += 1;
                }
            }
        }
    }
    counts
        .into_iter()
        .map(|(col, (decimal, other))| (col, decimal > 0 && other == 0))
        .collect()
}

/// Why a row inside a table is not data, when it is not: a header repeated (page breaks), a
/// totals row, or a note written across the row.
/// Why a data row is not read, if it is not: a repeated header, a totals row or a note.
/// `folded_headers` are the layout's headers folded, in column order. Runs on every row, so the
/// common case (a plain data row) allocates nothing.
pub(crate) fn skip_reason(
    grid: &SheetGrid,
    layout: &Layout,
    folded_headers: &[String],
    row: u32,
) -> Option<String> {
    let text = |col: u32| match grid.value(row, col) {
        Data::String(s) => Some(s.trim()),
        _ => None,
    };
    let repeated = layout
        .columns
        .iter()
        .zip(folded_headers)
        .filter(|(c, h)| text(c.col).is_some_and(|t| crate::ingest::schema::fold_eq(t, h)))
        .count();
    if repeated >= 2 {
        return Some("the header repeated".into());
    }
    let first = layout.columns.iter().map(|c| c.col).min()?;
    let mut filled = grid
        .row(row)
        .filter(|(_, d)| !matches!(d, Data::Empty))
        .map(|(c, _)| c);
    let first_filled = filled.next();
    let only_one_filled = first_filled.is_some() && filled.next().is_none();
    let leading = first_filled.and_then(text).unwrap_or_default();
    // The words below are at most 14 characters: fold no more of the text than that.
    let folded = crate::ingest::schema::fold_prefix(leading, 14);
    let line_text = layout
        .column("line")
        .and_then(|c| text(c.col))
        .unwrap_or_default();
    let line_folded = crate::ingest::schema::fold_prefix(line_text, 14);
    for word in [
        "total",
        "subtotal",
        "grandtotal",
        "carriedforward",
        "broughtforward",
    ] {
        if folded.starts_with(word) || line_folded.starts_with(word) {
            let t = if line_folded.starts_with(word) {
                line_text
            } else {
                leading
            };
            return Some(format!("a totals row ('{t}')"));
        }
    }
    let is_note = ["note", "notes", "remark", "remarks", "comment"]
        .iter()
        .any(|w| {
            folded.starts_with(w)
                && leading
                    .trim_start()
                    .get(w.len()..w.len() + 1)
                    .is_none_or(|c| !c.chars().all(char::is_alphanumeric))
        });
    if is_note && only_one_filled && first_filled.is_some_and(|c| c <= first + 1) {
        return Some(format!("a note ('{}')", truncate(leading, 40)));
    }
    None
}

pub(crate) fn truncate(s: &str, n: usize) -> String {
    if s.chars().count() <= n {
        s.to_string()
    } else {
        s.chars().take(n).chain(['…']).collect()
    }
}

/// Visit each non-blank data row of a table; skipped and blank rows go to the parse report.
pub(crate) fn for_each_row(
    input: &Input,
    sink: &mut Sink,
    table: TableKind,
    mut f: impl FnMut(&mut Cells<'_>),
) {
    let Some(layout) = input.layout(table).cloned() else {
        return;
    };
    let grid = &input.sheets[layout.sheet_index];
    let dc = decimal_comma_columns(grid, &layout);
    let folded_headers: Vec<String> = layout
        .columns
        .iter()
        .map(|c| crate::ingest::schema::fold(&c.header))
        .collect();
    let mut blanks = 0;
    let end = layout.end_row(grid);
    let is_blank = |row: u32| {
        layout
            .columns
            .iter()
            .all(|c| match grid.merged_value(row, c.col) {
                Data::Empty => true,
                Data::String(s) => s.trim().is_empty(),
                _ => false,
            })
            && layout
                .columns
                .iter()
                .all(|c| grid.formula(row, c.col).is_none())
    };
    // Only rows holding something are visited: a stray cell a million rows down costs nothing.
    let filled: Vec<u32> = grid
        .used_rows(layout.data_start..end)
        .filter(|&r| !is_blank(r))
        .collect();
    // Blank rows before the last data row (those after it are not worth counting).
    if let Some(&last_data) = filled.last() {
        blanks = (last_data - layout.data_start) as usize + 1 - filled.len();
    }
    for row in filled {
        if let Some(reason) = skip_reason(grid, &layout, &folded_headers, row) {
            let cell = CellRef::new(&layout.sheet, row, 0);
            sink.diagnostics.push(Diagnostic {
                severity: Severity::Warning,
                file: input.file.clone(),
                cell: Some(cell.clone()),
                message: format!("row skipped: {reason}"),
                hint: None,
            });
            sink.skipped.push(Skipped { cell, reason });
            continue;
        }
        let first_diag = sink.diagnostics.len();
        let mut cells = Cells {
            file: &input.file,
            grid,
            layout: &layout,
            decimal_comma: &dc,
            row,
            diags: &mut sink.diagnostics,
            conversions: &mut sink.conversions,
            errors: 0,
        };
        f(&mut cells);
        if cells.errors > 0
            && let Some(e) = erred_row(table, grid, &layout, row, &sink.diagnostics[first_diag..])
        {
            sink.erred.push(e);
        }
    }
    if blanks > 0 {
        sink.blank_rows.push((layout.sheet.clone(), blanks));
    }
}

/// What reading one table reports besides its rows; appended to the input in table order.
#[derive(Default)]
pub(crate) struct Sink {
    pub(crate) diagnostics: Vec<Diagnostic>,
    pub(crate) conversions: Vec<Conversion>,
    pub(crate) skipped: Vec<Skipped>,
    pub(crate) blank_rows: Vec<(String, usize)>,
    pub(crate) erred: Vec<ErredRow>,
}

impl Sink {
    pub(crate) fn append_to(self, input: &mut Input) {
        input.diagnostics.extend(self.diagnostics);
        input.report.conversions.extend(self.conversions);
        input.report.skipped.extend(self.skipped);
        input.report.blank_rows.extend(self.blank_rows);
        input.report.erred.extend(self.erred);
    }
}
