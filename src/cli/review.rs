//! The `lossledger review` command: options in, messages and progress on stderr, the summary on
//! stdout, the exit code out.
//!
//! Exit codes: 0 review written (stations that could not be audited are reported and listed in
//! `Stations` as not audited); 2 input or usage error, or with `--strict` any station that could
//! not be audited (nothing written); 3 internal error.

use std::path::{Path, PathBuf};

use crate::audit::Rules;
use crate::error::OutputError;
use crate::ingest::{HeaderMap, ReadOptions};
use crate::report::console::{fitted_text, show_after_a_second};
use crate::report::text_table::{Align, TextTable, console_width};
use crate::report::workbook::BookOptions;
use crate::review::files::{self, CopiesDir};
use crate::review::run::{RunOptions, run};
use crate::review::stations::{Station, copies_dir, discover};
use crate::review::summary::StationRow;
use crate::review::{Asked, Review};
use crate::units::UnitSystem;

/// Everything `lossledger review` was asked.
#[derive(Clone, Debug)]
pub struct Request {
    /// Station workbooks and folders of them.
    pub inputs: Vec<PathBuf>,
    /// The review workbook.
    pub output: PathBuf,
    /// The JSON path ("-" for standard output).
    pub json: Option<String>,
    /// Rules file.
    pub rules: Option<PathBuf>,
    /// Header map file, applied to every station.
    pub map: Option<PathBuf>,
    /// Units of the workbooks.
    pub units: UnitSystem,
    /// Rows of `Worst fittings` (and of each copy's `Fitting ranking`); None for all.
    pub ranking_rows: Option<usize>,
    /// Stations audited at once (None: one per core).
    pub jobs: Option<usize>,
    /// Any station that cannot be audited stops the review with nothing written.
    pub strict: bool,
    /// What one station file may cost to read.
    pub limits: crate::ingest::Limits,
}

/// Run the review; returns the exit code.
pub fn execute(req: &Request) -> u8 {
    let rules = match req.rules.as_deref().map(Rules::from_file).transpose() {
        Ok(r) => r.unwrap_or_default(),
        Err(e) => return fail(&e.to_string()),
    };
    let map = match req.map.as_deref().map(HeaderMap::from_file).transpose() {
        Ok(m) => m,
        Err(e) => return fail(&e.to_string()),
    };
    let json = req.json.as_deref().filter(|j| *j != "-").map(Path::new);
    let copies_path = copies_dir(&req.output);
    let mut outputs = vec![req.output.clone()];
    outputs.extend(json.map(Path::to_path_buf));
    let stations = match discover(&req.inputs, &outputs) {
        Ok(s) => s,
        Err(e) => return fail(&e.to_string()),
    };
    if let Err(e) = check_outputs(&stations, &outputs, &copies_path) {
        return fail(&e.to_string());
    }
    let copies = match CopiesDir::prepare(&copies_path) {
        Ok(c) => c,
        Err(e) => return fail(&format!("{e}; nothing was written")),
    };
    let jobs = req
        .jobs
        .unwrap_or_else(|| std::thread::available_parallelism().map_or(1, std::num::NonZero::get));
    let copies_link = copies_path
        .file_name()
        .map_or_else(|| "stations".into(), |n| n.to_string_lossy().into_owned());
    let options = RunOptions {
        read: ReadOptions {
            map,
            limits: req.limits,
        },
        rules: rules.clone(),
        book: BookOptions {
            units: req.units,
            ranking_rows: req.ranking_rows,
        },
        jobs: jobs.max(1),
        strict: req.strict,
        copies_dir: copies.path.clone(),
        copies_link: copies_link.clone(),
        output: req.output.clone(),
    };
    let bar = indicatif::ProgressBar::hidden();
    bar.set_length(stations.len() as u64);
    if let Ok(style) =
        indicatif::ProgressStyle::with_template("{elapsed} stations {pos}/{len} {msg}")
    {
        bar.set_style(style);
    }
    show_after_a_second(&bar);
    let merged = run(&stations, &options, &mut |done, _, row| {
        bar.set_position(done as u64);
        bar.set_message(row.station.clone());
        if row.problems.iter().any(is_error) {
            bar.suspend(|| report_bad(row, req.strict));
        }
    });
    bar.finish_and_clear();
    let merged = match merged {
        Ok(m) => m,
        Err(e) => {
            copies.discard();
            return output_failed(&e);
        }
    };
    if req.strict && merged.any_bad {
        drop(merged);
        copies.discard();
        eprintln!("--strict: a station could not be audited; nothing was written");
        return 2;
    }
    let asked = Asked {
        rules_file: req.rules.as_ref().map(|p| p.display().to_string()),
        map_file: req.map.as_ref().map(|p| p.display().to_string()),
        units: req.units,
        rules,
        copies: copies_link,
    };
    let (review, staged) = split(merged, asked);
    if let Err(e) = files::write(&review, &req.output, json, staged) {
        copies.discard();
        return output_failed(&e);
    }
    finish(req, &review)
}

fn is_error(d: &crate::error::Diagnostic) -> bool {
    d.severity == crate::error::Severity::Error
}

/// The review and the staged copies, apart.
fn split(
    mut merged: crate::review::run::Merged,
    asked: Asked,
) -> (Review, Vec<crate::report::Staged>) {
    let staged = std::mem::take(&mut merged.staged);
    (Review::new(merged, asked), staged)
}

/// Refuse outputs that would land on a station's file (the review, its JSON, or a copy).
fn check_outputs(
    stations: &[Station],
    outputs: &[PathBuf],
    copies: &Path,
) -> Result<(), OutputError> {
    let inputs: Vec<PathBuf> = stations.iter().map(|s| s.path.clone()).collect();
    for o in outputs {
        crate::report::check_not_input(o, &inputs)?;
    }
    for s in stations {
        crate::report::check_not_input(&copies.join(&s.copy_name), &inputs)?;
    }
    Ok(())
}

fn fail(message: &str) -> u8 {
    eprintln!("error: {message}");
    2
}

fn output_failed(e: &OutputError) -> u8 {
    eprintln!("error: {e}; nothing was written");
    if matches!(e, OutputError::Xlsx { .. } | OutputError::Json { .. }) {
        3
    } else {
        2
    }
}

/// Every problem of a station that could not be audited, then what happens to it.
fn report_bad(row: &StationRow, strict: bool) {
    for d in &row.problems {
        eprintln!("{d}");
    }
    let errors = row.problems.iter().filter(|d| is_error(d)).count();
    if strict {
        eprintln!("station {} ({}): {errors} error(s)", row.station, row.file);
    } else {
        eprintln!(
            "station {} ({}): {errors} error(s); not audited, left out of the review",
            row.station, row.file
        );
    }
}

/// The console summary (or the JSON on stdout), and exit 0.
fn finish(req: &Request, review: &Review) -> u8 {
    let width = console_width();
    let text = summary(review, &req.output, req.units, width);
    if req.json.as_deref() == Some("-") {
        eprint!("{text}");
        let mut out = std::io::stdout().lock();
        let written = review.write_json(&mut out).and_then(|()| {
            use std::io::Write;
            writeln!(out).map_err(serde_json::Error::io)
        });
        if let Err(e) = written {
            eprintln!("error: writing the JSON to standard output failed: {e}");
            return 2;
        }
    } else {
        print!("{text}");
    }
    0
}

/// The five metered stations with the lowest wire-to-water, lowest first (empty when none is
/// metered).
fn lowest_wire_to_water(review: &Review, units: UnitSystem, width: Option<usize>) -> String {
    let mut metered: Vec<(&str, &crate::review::summary::StationMeasured)> = review
        .stations
        .iter()
        .filter_map(|r| Some((r.station.as_str(), r.figures.as_ref()?.measured.as_ref()?)))
        .filter(|(_, m)| m.wire_to_water.is_some())
        .collect();
    let w2w =
        |m: &crate::review::summary::StationMeasured| m.wire_to_water.unwrap_or(f64::INFINITY);
    metered.sort_by(|a, b| w2w(a.1).total_cmp(&w2w(b.1)));
    let (energy, factor) = crate::units::header_in("Specific energy [kWh/m3]", units);
    let mut table = TextTable::new(&[
        ("Station", Align::Left),
        (energy.as_str(), Align::Right),
        ("Wire-to-\nwater", Align::Right),
        ("Metered\nsystems", Align::Right),
    ]);
    for (station, m) in metered.iter().take(5) {
        table.row(vec![
            station.to_string(),
            m.specific_energy_kwh_m3
                .map_or_else(String::new, |e| format!("{:.3}", e * factor)),
            m.wire_to_water
                .map_or_else(String::new, |w| format!("{:.1} %", 100.0 * w)),
            m.metered_systems.to_string(),
        ]);
    }
    if table.is_empty() {
        return String::new();
    }
    let mut s = fitted_text(
        "Lowest wire-to-water (metered stations, lowest first):",
        width,
    );
    s.push_str(&table.render(width));
    s
}

/// Totals, the five worst fittings of the estate, the five metered stations with the lowest
/// wire-to-water, the cautions and what was written.
pub fn summary(review: &Review, out: &Path, units: UnitSystem, width: Option<usize>) -> String {
    let t = &review.totals;
    let mut s = String::new();
    if let Some(note) = &review.invented_data_note {
        s.push_str(&fitted_text(note, width));
    }
    s.push_str(&fitted_text(
        &format!(
            "Reviewed {} stations: {} audited, {} not audited. Annual cost of losses: {} {:.0} ({:.0} kWh at {} {} per kWh; estimates to confirm by field test)",
            t.stations, t.audited, t.not_audited, t.currency, t.annual_cost, t.annual_energy_kwh, t.currency, t.tariff_per_kwh
        ),
        width,
    ));
    let mut table = TextTable::new(&[
        ("Rank", Align::Right),
        ("Station", Align::Left),
        ("Fitting", Align::Left),
        ("Line", Align::Left),
        ("Cost/yr", Align::Right),
        ("Rank\nholds", Align::Left),
        ("Suggestion", Align::Left),
    ]);
    for w in review.worst_fittings.iter().take(5) {
        table.row(vec![
            w.rank.to_string(),
            w.station.clone(),
            if w.tag.is_empty() {
                w.item.clone()
            } else {
                w.tag.clone()
            },
            w.line.clone(),
            w.annual_cost
                .map_or_else(|| "—".into(), |c| format!("{c:.0}")),
            if w.rank_uncertain {
                "no".into()
            } else {
                "yes".into()
            },
            w.suggestion
                .as_ref()
                .map(|x| crate::report::ranking::suggestion_text(x, "*"))
                .unwrap_or_default(),
        ]);
    }
    if !table.is_empty() {
        s.push_str(&table.render(width));
    }
    s.push_str(&lowest_wire_to_water(review, units, width));
    s.push_str(&fitted_text(review.basis.caution, width));
    s.push_str(&fitted_text(
        &format!(
            "Wrote {} and {} audited copies in {}",
            out.display(),
            t.audited,
            copies_dir(out).display()
        ),
        width,
    ));
    s
}
