//! Command line: argument parsing, exit codes, and the glue between layers.
//!
//! Exit codes (as in the README): 0 audit written; 1 findings at or above `--fail-on`; 2 input or
//! usage error (nothing written); 3 internal error. `review`'s are in `cli/review.rs`.

mod review;

use clap::{Args, Parser, Subcommand, ValueEnum};
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use crate::audit::{self, Rules};
use crate::error::Severity;
use crate::ingest;
use crate::physics::fitting;
use crate::pipeline::{AuditError, AuditJob, JsonOut, WriteError};
use crate::report;

/// Audit pipe runs and fittings from spreadsheet schedules: friction and fitting losses,
/// velocity limits, and an annotated workbook traced to the source cells.
#[derive(Parser, Debug)]
#[command(name = "lossledger", version, about, long_about = None)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// Severity threshold for a non-zero exit.
#[derive(Clone, Copy, Debug, ValueEnum)]
pub enum FailOn {
    /// Exit 1 when any warning or error finding is raised.
    Warning,
    /// Exit 1 when any error finding is raised.
    Error,
}

/// What one input file may cost to read; past a limit the file is refused (exit 2) instead of
/// exhausting memory. The defaults fit any real register (docs/reliability.md).
#[derive(Args, Debug, Clone, Copy)]
pub struct LimitArgs {
    /// Refuse a file holding more cells than this (values and formulas, all sheets).
    #[arg(long, value_name = "N", default_value_t = ingest::limits::DEFAULT_MAX_CELLS)]
    pub max_cells: u64,
    /// Refuse a workbook whose parts unzip to more than this many MB in total (for .xls and
    /// .csv: the file's size).
    #[arg(long, value_name = "MB", default_value_t = ingest::limits::DEFAULT_MAX_UNZIPPED_MB)]
    pub max_unzipped_mb: u64,
    /// Refuse a workbook part of 32 MB or more unzipped that is more than this many times its
    /// compressed size.
    #[arg(long, value_name = "N", default_value_t = ingest::limits::DEFAULT_MAX_RATIO)]
    pub max_ratio: u64,
}

impl LimitArgs {
    /// The limits as the reader takes them.
    pub fn limits(&self) -> ingest::Limits {
        ingest::Limits {
            max_cells: self.max_cells,
            max_unzipped_mb: self.max_unzipped_mb,
            max_ratio: self.max_ratio,
        }
    }
}

impl Default for LimitArgs {
    fn default() -> Self {
        let l = ingest::Limits::default();
        LimitArgs {
            max_cells: l.max_cells,
            max_unzipped_mb: l.max_unzipped_mb,
            max_ratio: l.max_ratio,
        }
    }
}

/// Where the input comes from: workbooks, CSV files or folders, plus CSV tables named by flag.
#[derive(Args, Debug, Clone, Default)]
pub struct InputArgs {
    /// Input workbooks (.xlsx), CSV files or folders of them; several are merged.
    #[arg(required_unless_present_any = ["pipes"], value_name = "INPUT")]
    pub input: Vec<PathBuf>,
    /// A CSV file holding the Pipes table.
    #[arg(long, value_name = "CSV")]
    pub pipes: Option<PathBuf>,
    /// A CSV file holding the Fittings table.
    #[arg(long, value_name = "CSV")]
    pub fittings: Option<PathBuf>,
    /// A CSV file holding the Lines table.
    #[arg(long, value_name = "CSV")]
    pub lines: Option<PathBuf>,
    /// Header map (TOML) for headers the aliases do not reach (`lossledger check` prints one).
    #[arg(long, value_name = "FILE")]
    pub map: Option<PathBuf>,
    /// Reading limits.
    #[command(flatten)]
    pub limits: LimitArgs,
}

impl InputArgs {
    /// The sources to read, in order.
    pub fn sources(&self) -> Vec<ingest::InputSource> {
        let mut out: Vec<ingest::InputSource> = self
            .input
            .iter()
            .cloned()
            .map(ingest::InputSource::Path)
            .collect();
        for (table, path) in [
            (ingest::TableKind::Lines, &self.lines),
            (ingest::TableKind::Pipes, &self.pipes),
            (ingest::TableKind::Fittings, &self.fittings),
        ] {
            if let Some(path) = path {
                out.push(ingest::InputSource::Csv {
                    table,
                    path: path.clone(),
                });
            }
        }
        out
    }

    /// The read options (the map file parsed).
    ///
    /// # Errors
    /// The map file's problem when it cannot be read or parsed.
    pub fn options(&self) -> Result<ingest::ReadOptions, ingest::map::MapError> {
        let map = self
            .map
            .as_deref()
            .map(ingest::HeaderMap::from_file)
            .transpose()?;
        Ok(ingest::ReadOptions {
            map,
            limits: self.limits.limits(),
        })
    }

    /// The paths given (for "do not overwrite an input" checks and the default output name).
    pub fn paths(&self) -> Vec<PathBuf> {
        let mut v = self.input.clone();
        v.extend(
            self.lines
                .iter()
                .chain(&self.pipes)
                .chain(&self.fittings)
                .cloned(),
        );
        v
    }
}

/// `lossledger compare OLD NEW`.
#[derive(Args, Debug)]
pub struct CompareArgs {
    /// The earlier revision: a workbook (.xlsx), a CSV file or a folder of them.
    pub old: PathBuf,
    /// The later revision, read the same way.
    pub new: PathBuf,
    /// Header map (TOML) applied to both revisions.
    #[arg(long, value_name = "FILE")]
    pub map: Option<PathBuf>,
    /// Comparison workbook [default: NEW.compare.xlsx beside the new revision].
    #[arg(short, long)]
    pub output: Option<PathBuf>,
    /// Also write the comparison as JSON to this path ("-" for standard output).
    #[arg(long, value_name = "PATH")]
    pub json: Option<String>,
    /// Rules file (TOML) applied to both revisions; keys not given keep their defaults.
    #[arg(long, value_name = "FILE")]
    pub rules: Option<PathBuf>,
    /// Exit with status 1 when a change reaches this severity (a system verdict that gets worse
    /// is an error; a new finding keeps its own severity).
    #[arg(long, value_enum)]
    pub fail_on: Option<FailOn>,
    /// Units of the console summary and the workbook (JSON stays SI).
    #[arg(long, value_enum, default_value = "si")]
    pub units: crate::units::UnitSystem,
    /// Reading limits, applied to each revision.
    #[command(flatten)]
    pub limits: LimitArgs,
}

/// `lossledger review INPUT...`.
#[derive(Args, Debug)]
pub struct ReviewArgs {
    /// Station workbooks, or folders of them: each file is one station.
    #[arg(required = true, value_name = "INPUT")]
    pub input: Vec<PathBuf>,
    /// Review workbook; each station's audited copy goes into the folder `<OUTPUT stem>-stations`
    /// beside it.
    #[arg(short, long, default_value = "review.xlsx")]
    pub output: PathBuf,
    /// Also write the review as JSON to this path ("-" for standard output).
    #[arg(long, value_name = "PATH")]
    pub json: Option<String>,
    /// Rules file (TOML) applied to every station; keys not given keep their defaults.
    #[arg(long, value_name = "FILE")]
    pub rules: Option<PathBuf>,
    /// Header map (TOML) applied to every station.
    #[arg(long, value_name = "FILE")]
    pub map: Option<PathBuf>,
    /// Units of the workbooks' figures (JSON stays SI).
    #[arg(long, value_enum, default_value = "si")]
    pub units: crate::units::UnitSystem,
    /// Rows of the Worst fittings sheet (the estate's worst N fittings, or "all"), and of each
    /// audited copy's Fitting ranking.
    #[arg(long, value_name = "N|all", default_value = "1000", value_parser = parse_rows)]
    pub ranking_rows: RankingRows,
    /// Stations audited at once [default: one per core].
    #[arg(long, value_name = "N", value_parser = clap::value_parser!(u16).range(1..))]
    pub jobs: Option<u16>,
    /// Exit 2 with nothing written when any station cannot be audited (by default it is
    /// reported, listed as not audited and left out of the review).
    #[arg(long)]
    pub strict: bool,
    /// Reading limits, applied to each station.
    #[command(flatten)]
    pub limits: LimitArgs,
}

impl ReviewArgs {
    fn request(&self) -> review::Request {
        review::Request {
            inputs: self.input.clone(),
            output: self.output.clone(),
            json: self.json.clone(),
            rules: self.rules.clone(),
            map: self.map.clone(),
            units: self.units,
            ranking_rows: self.ranking_rows.0,
            jobs: self.jobs.map(usize::from),
            strict: self.strict,
            limits: self.limits.limits(),
        }
    }
}

/// Subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Audit a workbook and write the annotated copy (and JSON if asked).
    Audit {
        /// Inputs.
        #[command(flatten)]
        inputs: InputArgs,
        /// Output workbook [default: INPUT.audit.xlsx beside the input].
        #[arg(short, long)]
        output: Option<PathBuf>,
        /// Also write JSON results to this path ("-" for standard output).
        #[arg(long, value_name = "PATH")]
        json: Option<String>,
        /// Rules file (TOML); keys not given keep their defaults (see `lossledger rules`).
        #[arg(long, value_name = "FILE")]
        rules: Option<PathBuf>,
        /// Exit with status 1 when findings reach this severity.
        #[arg(long, value_enum)]
        fail_on: Option<FailOn>,
        /// Units of the console summary and the workbook's computed columns (JSON stays SI).
        #[arg(long, value_enum, default_value = "si")]
        units: crate::units::UnitSystem,
        /// Rows of the Fitting ranking sheet: the worst N fittings, or "all". Every fitting's rank
        /// and cost are in its input sheet's computed columns either way.
        #[arg(long, value_name = "N|all", default_value = "1000", value_parser = parse_rows)]
        ranking_rows: RankingRows,
    },
    /// Compare two revisions of a takeoff: what changed, and what it does to the losses, the
    /// findings and the pumps. Writes a comparison workbook (and JSON if asked).
    Compare(CompareArgs),
    /// Review an estate: audit every station workbook as its own station, write each audited
    /// copy, and one review workbook ranking the whole estate (and JSON if asked).
    Review(ReviewArgs),
    /// Read and validate inputs only: print every diagnostic with its cell, the header mapping
    /// used (as a map file) and the defaults that would apply. Exit 0 when clean, 2 on errors.
    Check {
        /// Inputs.
        #[command(flatten)]
        inputs: InputArgs,
    },
    /// Write a blank input workbook: canonical sheets and headers, a units row, drop-down lists,
    /// an invented example row and a Read me sheet.
    Template {
        /// Workbook to write (.xlsx).
        out: PathBuf,
        /// Units written in the units row.
        #[arg(long, value_enum, default_value = "si")]
        units: crate::units::UnitSystem,
        /// `canonical`: one sheet per table; `list`: Lines plus one item list holding runs and
        /// fittings together (a Unit drop-down: m, No ...).
        #[arg(long, value_enum, default_value = "canonical")]
        layout: crate::template::Layout,
    },
    /// Print the default rules as TOML, ready to copy and edit.
    Rules,
    /// List the fitting kinds the Item column is matched to.
    Kinds {
        /// Print as JSON instead of a table.
        #[arg(long)]
        json: bool,
    },
    /// Write a fictional demo station and its audit into ./lossledger-demo/ and print the summary.
    Demo {
        /// Folder to write into.
        #[arg(long, default_value = "lossledger-demo")]
        dir: PathBuf,
    },
}

impl Command {
    /// Whether the command reads inputs, audits or writes outputs, and so runs in a worker
    /// process (`crate::worker`).
    pub fn reads_and_writes(&self) -> bool {
        matches!(
            self,
            Command::Audit { .. }
                | Command::Compare(_)
                | Command::Check { .. }
                | Command::Demo { .. }
                | Command::Review(_)
        )
    }
}

/// Run the CLI and return the process exit code. The commands that read, audit and write run in
/// a worker child process, so that even an allocation failure becomes exit 3 with one line
/// (`crate::worker`); when no worker can be started they run in this process.
pub fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return ExitCode::from(code);
        }
    };
    let worker = crate::worker::is_worker();
    if worker {
        crate::worker::start();
    } else if cli.command.reads_and_writes()
        && let Some(code) = crate::worker::supervise()
    {
        return ExitCode::from(code);
    }
    match std::panic::catch_unwind(|| run(cli)) {
        Ok(code) => ExitCode::from(code),
        // Recorded by the worker's panic hook; the parent prints the one line.
        Err(_) if worker => ExitCode::from(crate::worker::PANICKED),
        Err(_) => {
            eprintln!(
                "internal error: lossledger stopped unexpectedly; nothing further was written. Please report this with the input file."
            );
            ExitCode::from(3)
        }
    }
}

fn run(cli: Cli) -> u8 {
    match cli.command {
        Command::Audit {
            inputs,
            output,
            json,
            rules,
            fail_on,
            units,
            ranking_rows,
        } => {
            let book = report::workbook::BookOptions {
                units,
                ranking_rows: ranking_rows.0,
            };
            let Some(job) = audit_job(&inputs, output, json.as_deref(), rules.as_deref(), book)
            else {
                return 2;
            };
            match run_job(&job) {
                Ok(done) => {
                    let summary = report::console::summary_in(&done, units);
                    if json.as_deref() == Some("-") {
                        eprint!("{summary}");
                    } else {
                        print!("{summary}");
                        print_fitted(&format!("Wrote {}", job.output().display()));
                    }
                    exit_for(&done, fail_on)
                }
                Err(code) => code,
            }
        }
        Command::Rules => {
            print!("{}", audit::rules::DEFAULT_RULES_TOML);
            0
        }
        Command::Kinds { json } => {
            if json {
                println!("{}", kinds_json());
            } else {
                print!("{}", kinds_table());
            }
            0
        }
        Command::Compare(args) => compare(&args),
        Command::Review(args) => review::execute(&args.request()),
        Command::Demo { dir } => demo(&dir),
        Command::Check { inputs } => check(&inputs),
        Command::Template { out, units, layout } => template(&out, units, layout),
    }
}

/// Print `error: {e}` and return exit 2 (bad input or usage).
fn usage(e: &dyn std::fmt::Display) -> u8 {
    eprintln!("error: {e}");
    2
}

/// Print `internal error: {e}` and return exit 3.
fn internal(e: &dyn std::fmt::Display) -> u8 {
    eprintln!("internal error: {e}");
    3
}

/// Print a line fitted to the terminal width.
fn print_fitted(text: &str) {
    print!(
        "{}",
        report::console::fitted_text(text, report::text_table::console_width())
    );
}

/// The audit job of `lossledger audit`; `None` (the problem printed) when the rules file, the
/// header map or the inputs are unusable.
fn audit_job(
    inputs: &InputArgs,
    output: Option<PathBuf>,
    json: Option<&str>,
    rules: Option<&Path>,
    book: report::workbook::BookOptions,
) -> Option<AuditJob> {
    let rules = match rules.map(Rules::from_file).transpose() {
        Ok(r) => r.unwrap_or_default(),
        Err(e) => {
            usage(&e);
            return None;
        }
    };
    let options = match inputs.options() {
        Ok(o) => o,
        Err(e) => {
            usage(&e);
            return None;
        }
    };
    let Some(first) = inputs.paths().into_iter().next() else {
        usage(&"no input given");
        return None;
    };
    let out = output.unwrap_or_else(|| report::default_output(&first));
    Some(
        AuditJob::new(inputs.sources(), out)
            .read_options(options)
            .rules(rules)
            .book(book)
            .json(json.map(JsonOut::from_arg)),
    )
}

/// `lossledger demo`: write the demo input, audit it into the same folder, print the summary.
fn demo(dir: &Path) -> u8 {
    let demo = match crate::demo::write_input(dir) {
        Ok(d) => d,
        Err(e @ crate::demo::DemoError::Build(_)) => return internal(&e),
        Err(e) => return usage(&e),
    };
    match run_job(&demo.job) {
        Ok(audit) => {
            println!("{}", crate::demo::NOTE);
            print!("{}", report::console::summary(&audit));
            let json = demo.job.json_file().unwrap_or(Path::new(""));
            print_fitted(&format!(
                "Wrote {}, {} and {}",
                demo.input.display(),
                demo.job.output().display(),
                json.display()
            ));
            0
        }
        Err(code) => code,
    }
}

/// `lossledger template`: write the blank input workbook.
fn template(out: &Path, units: crate::units::UnitSystem, layout: crate::template::Layout) -> u8 {
    match crate::template::write(out, units, layout) {
        Ok(()) => {
            println!(
                "Wrote {} (example rows are invented; see its Read me sheet)",
                out.display()
            );
            0
        }
        Err(e @ crate::template::TemplateError::Build(_)) => internal(&e),
        Err(e) => usage(&e),
    }
}

/// `--ranking-rows`: a count, or `None` for all.
#[derive(Clone, Copy, Debug)]
pub struct RankingRows(Option<usize>);

fn parse_rows(s: &str) -> Result<RankingRows, String> {
    if s.eq_ignore_ascii_case("all") {
        return Ok(RankingRows(None));
    }
    s.parse()
        .map(|n| RankingRows(Some(n)))
        .map_err(|_| format!("'{s}' is not a number of rows or \"all\""))
}

fn exit_for(audit: &audit::Audit, fail_on: Option<FailOn>) -> u8 {
    let threshold = match fail_on {
        None => return 0,
        Some(FailOn::Warning) => Severity::Warning,
        Some(FailOn::Error) => Severity::Error,
    };
    u8::from(audit.findings.iter().any(|f| f.severity >= threshold))
}

/// `lossledger check`: read and validate, print what was found; 0 when clean, 2 on errors.
fn check(inputs: &InputArgs) -> u8 {
    let options = match inputs.options() {
        Ok(o) => o,
        Err(e) => return usage(&e),
    };
    let checked = match crate::pipeline::check(&inputs.sources(), &options) {
        Ok(c) => c,
        Err(e) => return usage(&e),
    };
    print!("{}", ingest::describe(&checked.input));
    let errors = checked.count(Severity::Error);
    let warnings = checked.count(Severity::Warning);
    if !checked.diagnostics.is_empty() {
        println!("\nDiagnostics:");
        for d in &checked.diagnostics {
            println!("{d}");
        }
    }
    println!(
        "\n{errors} error(s), {warnings} warning(s) in {}",
        checked.input.file
    );
    if errors > 0 { 2 } else { 0 }
}

/// Run an audit job, with a progress line on stderr and every diagnostic printed: the warnings
/// and notes after reading, every error and what it stopped. Returns the audit, or the exit code
/// (2 for bad input or a file that cannot be written, 3 for an internal error) with nothing
/// written; the JSON asked on standard output is printed here.
fn run_job(job: &AuditJob) -> Result<audit::Audit, u8> {
    let progress = progress("reading inputs");
    // Messages go around the progress line so they never garble it.
    let say = |text: &dyn std::fmt::Display| progress.suspend(|| eprintln!("{text}"));
    let mut input = job.read().map_err(|e| {
        say(&format_args!("error: {e}"));
        2
    })?;
    for d in input
        .diagnostics
        .iter()
        .filter(|d| d.severity != Severity::Error)
    {
        say(d);
    }
    progress.set_message("computing losses");
    // The parsed fitting rows are freed once placed and checked, before the audit's peak.
    let done = job.audit_releasing_rows(&mut input).map_err(|e| {
        if let AuditError::Invalid { errors, .. } = &e {
            errors.iter().for_each(|d| say(d));
        }
        say(&e);
        2
    })?;
    let written_or = |e: WriteError| {
        let kind = if e.is_internal() {
            "internal error"
        } else {
            "error"
        };
        say(&format_args!("{kind}: {e}"));
        if e.is_internal() { 3 } else { 2 }
    };
    progress.set_message("writing the annotated workbook");
    let prepared = job.prepare(&input, &done).map_err(written_or)?;
    // The input (every cell and row read) is not needed to save: free it before the save's
    // own peak (docs/reliability.md, memory).
    drop(input);
    progress.set_message("saving the workbook");
    let written = prepared.save().map_err(written_or)?;
    progress.finish_and_clear();
    if let Some(text) = written.json {
        println!("{text}");
    }
    Ok(done)
}

/// Read and audit one side of a comparison as `audit` would, printing its problems prefixed by
/// the side; `None` when it cannot be audited.
fn compare_side(
    side: crate::compare::Side,
    path: &Path,
    options: &ingest::ReadOptions,
    rules: &Rules,
) -> Option<crate::pipeline::Audited> {
    use crate::pipeline::read_and_audit;
    let label = side.label();
    let sources = [ingest::InputSource::Path(path.to_path_buf())];
    match read_and_audit(&sources, options, rules) {
        Ok(a) => {
            for d in a
                .audit
                .notes
                .iter()
                .filter(|d| d.severity != Severity::Error)
            {
                eprintln!("{label}: {d}");
            }
            Some(a)
        }
        Err(AuditError::Invalid { file, errors, .. }) => {
            for d in &errors {
                eprintln!("{label}: {d}");
            }
            eprintln!("{label} revision {file}: {} error(s)", errors.len());
            None
        }
        Err(e) => {
            eprintln!("error: {label} revision: {e}");
            None
        }
    }
}

/// `lossledger compare`: read and audit both sides, compare, write; 2 with nothing written when
/// either side is bad.
fn compare(args: &CompareArgs) -> u8 {
    use crate::compare::{self, Side, files};
    let rules = match args.rules.as_deref().map(Rules::from_file).transpose() {
        Ok(r) => r.unwrap_or_default(),
        Err(e) => {
            eprintln!("error: {e}");
            return 2;
        }
    };
    let map = match args
        .map
        .as_deref()
        .map(ingest::HeaderMap::from_file)
        .transpose()
    {
        Ok(m) => m,
        Err(e) => {
            eprintln!("error: {e}");
            return 2;
        }
    };
    let options = ingest::ReadOptions {
        map,
        limits: args.limits.limits(),
    };
    let old = compare_side(Side::Old, &args.old, &options, &rules);
    let new = compare_side(Side::New, &args.new, &options, &rules);
    let (Some(old), Some(new)) = (old, new) else {
        eprintln!("nothing was written");
        return 2;
    };
    let c = compare::compare(&old, &new);
    let out = args
        .output
        .clone()
        .unwrap_or_else(|| files::default_output(&args.new));
    let json = args.json.as_deref().filter(|j| *j != "-").map(Path::new);
    let inputs = files::input_paths(&[&args.old, &args.new], &[&old.input, &new.input]);
    let notes = compare::workbook::BasisNotes {
        rules_file: args.rules.as_ref().map(|p| p.display().to_string()),
        map_file: args.map.as_ref().map(|p| p.display().to_string()),
        units: args.units,
        rules,
    };
    if let Err(e) = files::write(&c, &new.input, &notes, &out, json, &inputs) {
        let internal = matches!(e, crate::error::OutputError::Xlsx { .. });
        eprintln!("error: {e}; nothing was written");
        return if internal { 3 } else { 2 };
    }
    let summary = compare::console::summary(&c, args.units);
    if args.json.as_deref() == Some("-") {
        eprint!("{summary}");
        match c.to_json() {
            Ok(text) => println!("{text}"),
            Err(e) => {
                eprintln!("internal error: building JSON failed: {e}");
                return 3;
            }
        }
    } else {
        print!("{summary}");
        print!(
            "{}",
            report::console::fitted_text(
                &format!("Wrote {}", out.display()),
                report::text_table::console_width(),
            )
        );
    }
    let threshold = match args.fail_on {
        None => return 0,
        Some(FailOn::Warning) => Severity::Warning,
        Some(FailOn::Error) => Severity::Error,
    };
    u8::from(c.worst().is_some_and(|w| w >= threshold))
}

fn kinds_table() -> String {
    use report::text_table::{Align::Left, TextTable, console_width};
    let mut t = TextTable::new(&[
        ("Kind", Left),
        ("Aliases", Left),
        ("Model", Left),
        ("Velocity", Left),
        ("Band", Left),
        ("Source", Left),
    ]);
    for k in fitting::catalogue() {
        t.row(vec![
            k.id.to_string(),
            k.aliases.join(", "),
            k.model_name().to_string(),
            match k.reference {
                fitting::VelocityRef::OwnBore => "own bore".to_string(),
                fitting::VelocityRef::SmallerBore => "smaller bore".to_string(),
            },
            format!("×{:.2}–×{:.2}", k.band_low, k.band_high),
            k.source.to_string(),
        ]);
    }
    format!(
        "{}{} kinds\n",
        t.render(console_width()),
        fitting::catalogue().len()
    )
}

fn kinds_json() -> String {
    let kinds: Vec<serde_json::Value> = fitting::catalogue()
        .iter()
        .map(|k| {
            serde_json::json!({
                "kind": k.id,
                "aliases": k.aliases,
                "model": k.model_name(),
                "source": k.source,
                "band_low": k.band_low,
                "band_high": k.band_high,
            })
        })
        .collect();
    serde_json::to_string_pretty(&serde_json::json!({ "kinds": kinds })).unwrap_or_default()
}

/// A spinner with the current phase on stderr, shown only when stderr is a terminal and only once
/// the run has taken more than a second (short runs print nothing extra). Cleared when dropped,
/// on every return path.
///
/// With the environment variable `LOSSLEDGER_TIMINGS` set, the wall time of each phase is printed
/// to stderr when the next one starts (for profiling; docs/reliability.md).
struct Progress {
    bar: indicatif::ProgressBar,
    phase: std::cell::RefCell<(&'static str, std::time::Instant)>,
    timings: bool,
}

impl Progress {
    fn set_message(&self, next: &'static str) {
        self.lap(next);
        self.bar.set_message(next);
    }

    fn lap(&self, next: &'static str) {
        let mut phase = self.phase.borrow_mut();
        if self.timings {
            let (name, start) = *phase;
            self.bar.suspend(|| {
                eprintln!("timing: {name}: {:.3} s", start.elapsed().as_secs_f64());
            });
        }
        *phase = (next, std::time::Instant::now());
    }

    fn suspend<R>(&self, f: impl FnOnce() -> R) -> R {
        self.bar.suspend(f)
    }

    fn finish_and_clear(&self) {
        if !self.bar.is_finished() {
            self.lap("");
        }
        self.bar.finish_and_clear();
    }
}

impl Drop for Progress {
    fn drop(&mut self) {
        self.finish_and_clear();
    }
}

fn progress(first: &'static str) -> Progress {
    let bar = indicatif::ProgressBar::hidden();
    if let Ok(style) = indicatif::ProgressStyle::with_template("{spinner} {elapsed} {msg}") {
        bar.set_style(style);
    }
    bar.set_message(first);
    report::console::show_after_a_second(&bar);
    Progress {
        bar,
        phase: std::cell::RefCell::new((first, std::time::Instant::now())),
        timings: std::env::var_os("LOSSLEDGER_TIMINGS").is_some(),
    }
}
