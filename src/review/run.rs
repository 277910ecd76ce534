//! Stations audited in parallel, one worker per job, each station reduced as soon as it is done.
//!
//! Workers take the next station from a shared counter, read and audit it
//! ([`crate::pipeline::read_and_audit`]), stage its audited copy, reduce it
//! ([`super::summary::reduce`]) and drop the audit before taking the next, so at most `jobs`
//! full audits are in memory at once. This thread merges what they send, in whatever order they
//! finish; everything merged is kept by station index and summed in station order, so the
//! review does not depend on which station finished first.

use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::mpsc;

use super::spill::FindingSpill;
use super::stations::Station;
use super::summary::{Reduced, StationRow, copy_link, not_audited, reduce};
use super::worst::{Leaderboard, WorstFitting};
use crate::audit::Rules;
use crate::error::{Diagnostic, OutputError, Severity};
use crate::ingest::{InputSource, ReadOptions};
use crate::pipeline::{AuditError, read_and_audit};
use crate::report::Staged;
use crate::report::workbook::BookOptions;

/// How to run a review.
#[derive(Clone, Debug)]
pub struct RunOptions {
    /// How to read each station.
    pub read: ReadOptions,
    /// The rules, the same for every station.
    pub rules: Rules,
    /// How each station's audited copy is written (its `Fitting ranking` rows are the review's).
    pub book: BookOptions,
    /// Stations audited at once (at least 1).
    pub jobs: usize,
    /// Stop taking stations after the first that cannot be audited.
    pub strict: bool,
    /// The folder the audited copies are staged in (it must exist).
    pub copies_dir: PathBuf,
    /// That folder as the review links to it (relative to the review workbook).
    pub copies_link: String,
    /// The review workbook: the findings are spilled to a temporary file beside it.
    pub output: PathBuf,
}

/// What the stations gave: every row in station order, the estate ranking, all findings, and
/// the audited copies staged (renamed into place by [`super::files::write`]).
#[derive(Debug)]
pub struct Merged {
    /// One row per station, in input order.
    pub rows: Vec<StationRow>,
    /// The worst fittings of the estate.
    pub worst: Vec<WorstFitting>,
    /// Fittings of the estate not listed in `worst`.
    pub not_listed: usize,
    /// Every audited station's findings, station by station, on disk.
    pub findings: FindingSpill,
    /// The audited copies, staged.
    pub staged: Vec<Staged>,
    /// True when some station could not be audited.
    pub any_bad: bool,
}

/// What a worker sends back for one station.
enum Outcome {
    Audited(Box<Reduced>, Staged),
    Bad(Box<StationRow>),
    Output(OutputError),
}

/// Audit every station with `options.jobs` workers; `on_done(done, total, row)` is called on
/// this thread as each station is merged (for progress and messages).
///
/// # Errors
/// An [`OutputError`] staging a copy (the disk, or a workbook that could not be assembled): the
/// run stops and what was staged is removed.
pub fn run(
    stations: &[Station],
    options: &RunOptions,
    on_done: &mut dyn FnMut(usize, usize, &StationRow),
) -> Result<Merged, OutputError> {
    let next = AtomicUsize::new(0);
    let stop = AtomicBool::new(false);
    let (tx, rx) = mpsc::channel::<(usize, Outcome)>();
    let n = options.book.ranking_rows;
    let mut rows: Vec<Option<StationRow>> = vec![None; stations.len()];
    let mut findings = FindingSpill::create(&options.output, stations.len())?;
    let mut totals: Vec<[f64; 2]> = vec![[0.0; 2]; stations.len()];
    let mut board = Leaderboard::new(n);
    let mut staged = Vec::new();
    let mut failed = None;
    let mut any_bad = false;
    std::thread::scope(|s| {
        for _ in 0..options.jobs.clamp(1, stations.len().max(1)) {
            let tx = tx.clone();
            let (next, stop) = (&next, &stop);
            s.spawn(move || {
                while !stop.load(Ordering::Relaxed) {
                    let i = next.fetch_add(1, Ordering::Relaxed);
                    let Some(station) = stations.get(i) else {
                        break;
                    };
                    if tx.send((i, one_station(station, options))).is_err() {
                        break;
                    }
                }
            });
        }
        drop(tx);
        for (done, (i, outcome)) in rx.into_iter().enumerate() {
            match outcome {
                Outcome::Audited(reduced, copy) => {
                    let Reduced {
                        row,
                        findings: f,
                        ranking,
                    } = *reduced;
                    totals[i] = ranking.totals;
                    board.merge(ranking);
                    if let Err(e) = findings.append(i, &f) {
                        stop.store(true, Ordering::Relaxed);
                        failed.get_or_insert(e);
                    }
                    staged.push(copy);
                    rows[i] = Some(row);
                }
                Outcome::Bad(row) => {
                    any_bad = true;
                    stop.store(options.strict, Ordering::Relaxed);
                    rows[i] = Some(*row);
                }
                Outcome::Output(e) => {
                    stop.store(true, Ordering::Relaxed);
                    failed.get_or_insert(e);
                    continue;
                }
            }
            if let Some(row) = &rows[i] {
                on_done(done + 1, stations.len(), row);
            }
        }
    });
    if let Some(e) = failed {
        return Err(e);
    }
    findings.close()?;
    let not_listed = board.count();
    let estate = totals
        .iter()
        .fold([0.0; 2], |a, t| [a[0] + t[0], a[1] + t[1]]);
    let worst = board.finish(estate);
    // Stations never taken (a strict run stopped early) are listed as not audited.
    let rows = rows
        .into_iter()
        .zip(stations)
        .map(|(r, s)| r.unwrap_or_else(|| skipped(s)))
        .collect();
    Ok(Merged {
        rows,
        not_listed: not_listed - worst.len(),
        worst,
        findings,
        staged,
        any_bad,
    })
}

/// Read, audit, stage the copy and reduce one station.
fn one_station(station: &Station, options: &RunOptions) -> Outcome {
    let sources = [InputSource::Path(station.path.clone())];
    let audited = match read_and_audit(&sources, &options.read, &options.rules) {
        Ok(a) => a,
        Err(AuditError::Invalid {
            errors,
            sha256,
            invented,
            ..
        }) => {
            let mut row = not_audited(station, Some(sha256), errors);
            row.invented_data_note = invented.as_ref().map(crate::report::invented::label);
            return Outcome::Bad(Box::new(row));
        }
        Err(AuditError::Read(e)) => {
            let problem = Diagnostic {
                severity: Severity::Error,
                file: station.path.display().to_string(),
                cell: None,
                message: e.to_string(),
                hint: Some(
                    "check that the file is a station workbook (.xlsx, .xlsm, .xls, .ods or .csv)"
                        .into(),
                ),
            };
            return Outcome::Bad(Box::new(not_audited(
                station,
                sha256_of(&station.path),
                vec![problem],
            )));
        }
    };
    let path = options.copies_dir.join(&station.copy_name);
    let copy = crate::report::workbook::prepare(&audited.input, &audited.audit, &options.book)
        .map_err(|source| OutputError::Xlsx {
            path: path.display().to_string(),
            source,
        })
        .and_then(|mut book| crate::report::stage_book(&path, &mut book));
    match copy {
        Ok(staged) => {
            let link = copy_link(&options.copies_link, station);
            let reduced = reduce(station, &audited, link, &options.book);
            Outcome::Audited(Box::new(reduced), staged)
        }
        Err(e) => Outcome::Output(e),
    }
}

/// A station a strict run stopped before reaching.
fn skipped(station: &Station) -> StationRow {
    let problem = Diagnostic {
        severity: Severity::Info,
        file: station.path.display().to_string(),
        cell: None,
        message: "not audited: the strict review stopped at an earlier bad station".into(),
        hint: None,
    };
    not_audited(station, sha256_of(&station.path), vec![problem])
}

/// SHA-256 of a file's bytes, hex, for the Basis of a station that could not be audited.
fn sha256_of(path: &Path) -> Option<String> {
    use sha2::{Digest, Sha256};
    let bytes = std::fs::read(path).ok()?;
    Some(crate::ingest::hex(&Sha256::digest(&bytes)))
}
