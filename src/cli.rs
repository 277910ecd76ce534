//! Command line: argument parsing, exit codes, and the glue between layers.
//!
//! Exit codes (DESIGN.md §2): 0 audit written; 1 findings at or above `--fail-on`; 2 input or
//! usage error (nothing written); 3 internal error.

use clap::{Parser, Subcommand, ValueEnum};
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use crate::audit::{self, Rules};
use crate::error::Severity;
use crate::ingest;
use crate::physics::fitting;
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

/// Subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Audit a workbook and write the annotated copy (and JSON if asked).
    Audit {
        /// Input workbook (.xlsx).
        input: PathBuf,
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

/// Run the CLI and return the process exit code.
pub fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return ExitCode::from(code);
        }
    };
    match std::panic::catch_unwind(|| run(cli)) {
        Ok(code) => ExitCode::from(code),
        Err(_) => {
            eprintln!("internal error: lossledger stopped unexpectedly; nothing further was written. Please report this with the input file.");
            ExitCode::from(3)
        }
    }
}

fn run(cli: Cli) -> u8 {
    match cli.command {
        Command::Audit { input, output, json, rules, fail_on } => {
            let rules = match rules.as_deref().map(Rules::from_file).transpose() {
                Ok(r) => r.unwrap_or_default(),
                Err(e) => {
                    eprintln!("error: {e}");
                    return 2;
                }
            };
            let out = output.unwrap_or_else(|| report::default_output(&input));
            match audit_to_files(&input, &out, json.as_deref(), &rules) {
                Ok(done) => {
                    let summary = report::console::summary(&done);
                    if json.as_deref() == Some("-") {
                        eprint!("{summary}");
                    } else {
                        print!("{summary}");
                        println!("Wrote {}", out.display());
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
        Command::Demo { dir } => crate::demo::run(&dir),
    }
}

fn exit_for(audit: &audit::Audit, fail_on: Option<FailOn>) -> u8 {
    let threshold = match fail_on {
        None => return 0,
        Some(FailOn::Warning) => Severity::Warning,
        Some(FailOn::Error) => Severity::Error,
    };
    u8::from(audit.findings.iter().any(|f| f.severity >= threshold))
}

/// Read, audit and write. On any input error prints every diagnostic and returns `Err(2)` with
/// nothing written; on an output error returns `Err(2)` or `Err(3)`.
pub fn audit_to_files(input_path: &Path, out: &Path, json: Option<&str>, rules: &Rules) -> Result<audit::Audit, u8> {
    let input = match ingest::read_path(input_path) {
        Ok(i) => i,
        Err(e) => {
            eprintln!("error: {e}");
            return Err(2);
        }
    };
    for d in input.diagnostics.iter().filter(|d| d.severity != Severity::Error) {
        eprintln!("{d}");
    }
    let done = match audit::run(&input, rules) {
        Ok(a) => a,
        Err(errors) => {
            for d in &errors {
                eprintln!("{d}");
            }
            eprintln!("{} error(s) in {}; nothing was written", errors.len(), input.file);
            return Err(2);
        }
    };
    let mut inputs = vec![input_path.to_path_buf()];
    if let Some(j) = json.filter(|j| *j != "-") {
        inputs.push(PathBuf::from(j));
        if let Err(e) = report::check_not_input(Path::new(j), &[input_path.to_path_buf()]) {
            eprintln!("error: {e}");
            return Err(2);
        }
    }
    if let Err(e) = report::check_not_input(out, &inputs) {
        eprintln!("error: {e}");
        return Err(2);
    }
    let bytes = match report::workbook::build(&input, &done) {
        Ok(b) => b,
        Err(e) => {
            eprintln!("internal error: building the workbook failed: {e}");
            return Err(3);
        }
    };
    let json_text = match json.map(|_| report::json::to_string(&input, &done)).transpose() {
        Ok(t) => t,
        Err(e) => {
            eprintln!("internal error: building JSON failed: {e}");
            return Err(3);
        }
    };
    if let Err(e) = report::write_atomic(out, &bytes) {
        eprintln!("error: {e}; nothing was written");
        return Err(2);
    }
    if let (Some(path), Some(text)) = (json, json_text) {
        if path == "-" {
            println!("{text}");
        } else if let Err(e) = report::write_atomic(Path::new(path), text.as_bytes()) {
            eprintln!("error: {e}");
            return Err(2);
        }
    }
    Ok(done)
}

fn kinds_table() -> String {
    let mut t = comfy_table::Table::new();
    t.load_style(comfy_table::presets::UTF8_FULL_CONDENSED);
    t.set_header(["Kind", "Aliases", "Model", "Velocity", "Band", "Source"]);
    for k in fitting::catalogue() {
        t.add_row([
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
    format!("{t}\n{} kinds\n", fitting::catalogue().len())
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
