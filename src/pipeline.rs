//! The audit as library steps: read → audit → write.
//!
//! [`AuditJob`] says what to read (sources, header map, limits), which rules apply and where the
//! annotated workbook and the JSON go. Its steps are [`AuditJob::read`], [`AuditJob::audit`] and
//! [`AuditJob::write`] (itself [`AuditJob::prepare`] then [`Prepared::save`]); [`AuditJob::run`]
//! takes all three. Each step returns a typed error that carries its context (the file, every
//! diagnostic with its `Sheet!A1` cell, the underlying I/O or workbook error as its source) and
//! prints nothing: the command line decides what to print and which exit code follows.
//!
//! [`read_and_audit`] reads and audits without writing (`compare`, `review`); [`check`] reads
//! and validates only (`check`).

use std::path::{Path, PathBuf};

use crate::audit::{self, Audit, Rules};
use crate::error::{CellRef, Diagnostic, InputError, OutputError, Severity};
use crate::ingest::{self, Input, InputSource, ReadOptions};
use crate::report::workbook::BookOptions;

/// An input read and audited.
#[derive(Clone, Debug)]
pub struct Audited {
    /// The parsed input (every sheet and cell kept).
    pub input: Input,
    /// Its audit.
    pub audit: Audit,
}

/// Why an input could not be audited.
#[derive(Debug, thiserror::Error)]
pub enum AuditError {
    /// A file could not be read at all.
    #[error(transparent)]
    Read(#[from] InputError),
    /// The input was read but has errors (from reading or from applying the physics).
    #[error("{} error(s) in {file}; nothing was written", errors.len())]
    Invalid {
        /// The input's file name.
        file: String,
        /// Every error-level diagnostic, with its cell.
        errors: Vec<Diagnostic>,
        /// The input's SHA-256 (as [`Input::sha256`]).
        sha256: String,
        /// The cell marking the input's data as invented, if any ([`crate::report::invented`]).
        invented: Option<CellRef>,
    },
}

impl AuditError {
    fn invalid(input: &Input, errors: Vec<Diagnostic>) -> Self {
        AuditError::Invalid {
            invented: crate::report::invented::marker(input),
            file: input.file.clone(),
            sha256: input.sha256.clone(),
            errors,
        }
    }
}

/// Why the outputs of an audit could not be written. Nothing is left behind in any case, except
/// for [`WriteError::JsonNotCommitted`], where the workbook is in place and the JSON is not.
#[derive(Debug, thiserror::Error)]
pub enum WriteError {
    /// An output path is one of the inputs; nothing was written.
    #[error(transparent)]
    WouldOverwrite(OutputError),
    /// The workbook could not be assembled (an internal error).
    #[error("building the workbook failed: {source}")]
    Book {
        /// What the workbook writer said.
        #[source]
        source: rust_xlsxwriter::XlsxError,
    },
    /// The JSON could not be built (an internal error).
    #[error("building JSON failed: {source}")]
    Json {
        /// What the serialiser said.
        #[source]
        source: serde_json::Error,
    },
    /// An output could not be staged or renamed into place; nothing was written.
    #[error("{source}; nothing was written")]
    Output {
        /// The file and the I/O error.
        #[source]
        source: OutputError,
    },
    /// The workbook was renamed into place, the JSON beside it could not be.
    #[error("{source}; the workbook {} was written, the JSON was not", workbook.display())]
    JsonNotCommitted {
        /// The workbook written.
        workbook: PathBuf,
        /// The JSON's file and the I/O error.
        #[source]
        source: OutputError,
    },
}

impl WriteError {
    /// Whether the failure is the program's own (the workbook or JSON could not be built) rather
    /// than the disk's or the request's.
    pub fn is_internal(&self) -> bool {
        matches!(self, WriteError::Book { .. } | WriteError::Json { .. })
    }
}

/// Why [`AuditJob::run`] stopped.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// Reading or auditing failed.
    #[error(transparent)]
    Audit(#[from] AuditError),
    /// Writing failed.
    #[error(transparent)]
    Write(Box<WriteError>),
}

impl From<WriteError> for Error {
    fn from(e: WriteError) -> Self {
        Error::Write(Box::new(e))
    }
}

/// Where an audit's JSON goes.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum JsonOut {
    /// A file, staged and renamed into place with the workbook.
    File(PathBuf),
    /// Returned as text ([`Written::json`]) for the caller to print.
    Text,
}

impl JsonOut {
    /// The command line's spelling: `-` for [`JsonOut::Text`] (standard output), else a file.
    pub fn from_arg(arg: &str) -> Self {
        if arg == "-" {
            JsonOut::Text
        } else {
            JsonOut::File(PathBuf::from(arg))
        }
    }
}

/// One audit to run: what to read, the rules, and the outputs. Built with [`AuditJob::new`] and
/// the setters; the defaults are those of `lossledger audit` without options.
#[derive(Clone, Debug)]
pub struct AuditJob {
    sources: Vec<InputSource>,
    read: ReadOptions,
    rules: Rules,
    book: BookOptions,
    output: PathBuf,
    json: Option<JsonOut>,
}

/// What [`AuditJob::write`] produced besides the files.
#[derive(Debug, Default)]
pub struct Written {
    /// The JSON text when [`JsonOut::Text`] was asked.
    pub json: Option<String>,
}

/// Everything [`AuditJob::run`] produced.
#[derive(Debug)]
pub struct Done {
    /// The input and its audit.
    pub audited: Audited,
    /// The JSON text when [`JsonOut::Text`] was asked.
    pub json: Option<String>,
}

impl AuditJob {
    /// Audit `sources` into the workbook `output`, with the default reading options, rules and
    /// workbook options and no JSON.
    pub fn new(sources: Vec<InputSource>, output: impl Into<PathBuf>) -> Self {
        AuditJob {
            sources,
            read: ReadOptions::default(),
            rules: Rules::default(),
            book: BookOptions::default(),
            output: output.into(),
            json: None,
        }
    }

    /// Read with these options (header map, limits).
    pub fn read_options(mut self, read: ReadOptions) -> Self {
        self.read = read;
        self
    }

    /// Audit with these rules.
    pub fn rules(mut self, rules: Rules) -> Self {
        self.rules = rules;
        self
    }

    /// Shape the workbook so (units, ranking rows).
    pub fn book(mut self, book: BookOptions) -> Self {
        self.book = book;
        self
    }

    /// Also write the JSON there.
    pub fn json(mut self, json: Option<JsonOut>) -> Self {
        self.json = json;
        self
    }

    /// The annotated workbook's path.
    pub fn output(&self) -> &Path {
        &self.output
    }

    /// The JSON file's path, when one is written.
    pub fn json_file(&self) -> Option<&Path> {
        match &self.json {
            Some(JsonOut::File(p)) => Some(p),
            _ => None,
        }
    }

    /// Read, audit and write: [`AuditJob::read`], [`AuditJob::audit`], [`AuditJob::write`].
    ///
    /// # Errors
    /// [`Error::Audit`] when the input cannot be read or has errors, [`Error::Write`] when an
    /// output cannot be written; nothing is written in either case (but see
    /// [`WriteError::JsonNotCommitted`]).
    ///
    /// # Example
    /// ```
    /// use lossledger::pipeline::{AuditJob, JsonOut};
    /// use lossledger::ingest::InputSource;
    ///
    /// let dir = std::env::temp_dir().join(format!("lossledger-doc-run-{}", std::process::id()));
    /// std::fs::create_dir_all(&dir)?;
    /// let input = dir.join("station.xlsx");
    /// std::fs::write(&input, lossledger::demo::input_workbook()?)?;
    /// let job = AuditJob::new(vec![InputSource::Path(input)], dir.join("station.audit.xlsx"))
    ///     .json(Some(JsonOut::Text));
    /// let done = job.run()?;
    /// assert!(!done.audited.audit.lines.is_empty());
    /// assert!(done.json.is_some_and(|j| j.contains("\"lines\"")));
    /// assert!(job.output().is_file());
    /// std::fs::remove_dir_all(&dir)?;
    /// # Ok::<(), Box<dyn std::error::Error>>(())
    /// ```
    pub fn run(&self) -> Result<Done, Error> {
        let input = self.read()?;
        let audit = self.audit(&input)?;
        let written = self.write(&input, &audit)?;
        Ok(Done {
            audited: Audited { input, audit },
            json: written.json,
        })
    }

    /// Read every source into one input (every sheet and cell kept, diagnostics collected).
    ///
    /// # Errors
    /// [`AuditError::Read`] when a file cannot be read at all (missing, not a workbook, past a
    /// limit). Problems inside a readable file are diagnostics in [`Input::diagnostics`].
    ///
    /// # Example
    /// ```
    /// use lossledger::pipeline::AuditJob;
    /// use lossledger::ingest::InputSource;
    ///
    /// let dir = std::env::temp_dir().join(format!("lossledger-doc-read-{}", std::process::id()));
    /// std::fs::create_dir_all(&dir)?;
    /// let input = dir.join("blank.xlsx");
    /// lossledger::template::write(&input, Default::default(), Default::default())?;
    /// let read = AuditJob::new(vec![InputSource::Path(input)], dir.join("out.xlsx")).read()?;
    /// assert!(read.sheets.iter().any(|s| s.name == "Pipes"));
    /// std::fs::remove_dir_all(&dir)?;
    /// # Ok::<(), Box<dyn std::error::Error>>(())
    /// ```
    pub fn read(&self) -> Result<Input, AuditError> {
        Ok(ingest::read_inputs(&self.sources, &self.read)?)
    }

    /// Audit a read input with the job's rules (see [`audit()`]).
    ///
    /// # Errors
    /// [`AuditError::Invalid`] with every error diagnostic, each at its cell, when the input has
    /// errors or a result is not a finite number.
    ///
    /// # Example
    /// ```
    /// use lossledger::pipeline::{AuditError, AuditJob};
    /// use lossledger::ingest::InputSource;
    ///
    /// let dir = std::env::temp_dir().join(format!("lossledger-doc-audit-{}", std::process::id()));
    /// std::fs::create_dir_all(&dir)?;
    /// let input = dir.join("blank.xlsx");
    /// lossledger::template::write(&input, Default::default(), Default::default())?;
    /// let job = AuditJob::new(vec![InputSource::Path(input)], dir.join("out.xlsx"));
    /// let read = job.read()?;
    /// // The template's example rows audit cleanly.
    /// let audit = job.audit(&read)?;
    /// assert!(!audit.runs.is_empty());
    /// std::fs::remove_dir_all(&dir)?;
    /// # Ok::<(), Box<dyn std::error::Error>>(())
    /// ```
    pub fn audit(&self, input: &Input) -> Result<Audit, AuditError> {
        audit(input, &self.rules).map_err(|errors| AuditError::invalid(input, errors))
    }

    /// [`AuditJob::audit`], freeing the parsed fitting rows as soon as the audit no longer needs
    /// them ([`audit::run_releasing_rows`]): what `lossledger audit` does, for the memory of big
    /// registers. The audit and the workbook written from it are the same.
    ///
    /// # Errors
    /// As [`AuditJob::audit`].
    ///
    /// # Example
    /// ```
    /// use lossledger::pipeline::AuditJob;
    /// use lossledger::ingest::InputSource;
    ///
    /// let dir = std::env::temp_dir().join(format!("lossledger-doc-release-{}", std::process::id()));
    /// std::fs::create_dir_all(&dir)?;
    /// let input = dir.join("blank.xlsx");
    /// lossledger::template::write(&input, Default::default(), Default::default())?;
    /// let job = AuditJob::new(vec![InputSource::Path(input)], dir.join("out.xlsx"));
    /// let mut read = job.read()?;
    /// let audit = job.audit_releasing_rows(&mut read)?;
    /// assert!(!audit.fittings.is_empty() && read.fittings.is_empty());
    /// std::fs::remove_dir_all(&dir)?;
    /// # Ok::<(), Box<dyn std::error::Error>>(())
    /// ```
    pub fn audit_releasing_rows(&self, input: &mut Input) -> Result<Audit, AuditError> {
        audit::run_releasing_rows(input, &self.rules)
            .and_then(|done| finite(input, done))
            .map_err(|errors| AuditError::invalid(input, errors))
    }

    /// Write the annotated workbook and the JSON: [`AuditJob::prepare`], then [`Prepared::save`].
    ///
    /// # Errors
    /// As [`AuditJob::prepare`] and [`Prepared::save`].
    ///
    /// # Example
    /// ```
    /// use lossledger::pipeline::{AuditJob, JsonOut};
    /// use lossledger::ingest::InputSource;
    ///
    /// let dir = std::env::temp_dir().join(format!("lossledger-doc-write-{}", std::process::id()));
    /// std::fs::create_dir_all(&dir)?;
    /// let input = dir.join("station.xlsx");
    /// std::fs::write(&input, lossledger::demo::input_workbook()?)?;
    /// let json = dir.join("station.audit.json");
    /// let job = AuditJob::new(vec![InputSource::Path(input)], dir.join("station.audit.xlsx"))
    ///     .json(Some(JsonOut::File(json.clone())));
    /// let read = job.read()?;
    /// let audit = job.audit(&read)?;
    /// job.write(&read, &audit)?;
    /// assert!(job.output().is_file() && json.is_file());
    /// std::fs::remove_dir_all(&dir)?;
    /// # Ok::<(), Box<dyn std::error::Error>>(())
    /// ```
    pub fn write(&self, input: &Input, audit: &Audit) -> Result<Written, WriteError> {
        self.prepare(input, audit)?.save()
    }

    /// Refuse outputs that would land on an input, then build every sheet of the annotated
    /// workbook (the input copies wait in temporary files until [`Prepared::save`]) and the
    /// JSON when asked.
    ///
    /// # Errors
    /// [`WriteError::WouldOverwrite`] when the workbook or the JSON would overwrite an input;
    /// [`WriteError::Book`] when the workbook cannot be built; [`WriteError::Json`] when the JSON
    /// cannot.
    ///
    /// # Example
    /// ```
    /// use lossledger::pipeline::{AuditJob, WriteError};
    /// use lossledger::ingest::InputSource;
    ///
    /// let dir = std::env::temp_dir().join(format!("lossledger-doc-prep-{}", std::process::id()));
    /// std::fs::create_dir_all(&dir)?;
    /// let input = dir.join("station.xlsx");
    /// std::fs::write(&input, lossledger::demo::input_workbook()?)?;
    /// // Asked to write over its own input, the job refuses before building anything.
    /// let job = AuditJob::new(vec![InputSource::Path(input.clone())], &input);
    /// let read = job.read()?;
    /// let audit = job.audit(&read)?;
    /// assert!(matches!(job.prepare(&read, &audit), Err(WriteError::WouldOverwrite(_))));
    /// std::fs::remove_dir_all(&dir)?;
    /// # Ok::<(), Box<dyn std::error::Error>>(())
    /// ```
    pub fn prepare(&self, input: &Input, audit: &Audit) -> Result<Prepared<'_>, WriteError> {
        self.check_outputs(input)
            .map_err(WriteError::WouldOverwrite)?;
        crate::worker::enter(
            crate::worker::Phase::Write,
            &self.output.display().to_string(),
        );
        let book = crate::report::workbook::prepare(input, audit, &self.book)
            .map_err(|source| WriteError::Book { source })?;
        let json = self
            .json
            .as_ref()
            .map(|_| crate::report::json::to_string(input, audit))
            .transpose()
            .map_err(|source| WriteError::Json { source })?;
        Ok(Prepared {
            job: self,
            book,
            json,
        })
    }

    /// The paths given and the files read are never outputs.
    fn check_outputs(&self, input: &Input) -> Result<(), OutputError> {
        let mut inputs: Vec<PathBuf> = self
            .sources
            .iter()
            .map(|s| match s {
                InputSource::Path(p) | InputSource::Csv { path: p, .. } => p.clone(),
            })
            .collect();
        inputs.extend(input.sources.iter().map(|s| s.path.clone()));
        if let Some(j) = self.json_file() {
            crate::report::check_not_input(j, &inputs)?;
            inputs.push(j.to_path_buf());
        }
        crate::report::check_not_input(&self.output, &inputs)
    }
}

/// An annotated workbook built and waiting to be saved, with its JSON when asked
/// ([`AuditJob::prepare`]). It holds nothing of the input or the audit: a caller short of
/// memory may drop them before [`Prepared::save`].
pub struct Prepared<'a> {
    job: &'a AuditJob,
    book: rust_xlsxwriter::Workbook,
    json: Option<String>,
}

impl Prepared<'_> {
    /// Save the workbook straight into a temporary file beside its target, stage the JSON, then
    /// rename both into place: an error never leaves output.
    ///
    /// # Errors
    /// [`WriteError::Book`] when the workbook cannot be assembled (ours);
    /// [`WriteError::Output`] when it cannot be written (the disk's), nothing left behind;
    /// [`WriteError::JsonNotCommitted`] when the workbook was renamed into place and the JSON
    /// could not be.
    pub fn save(self) -> Result<Written, WriteError> {
        let Prepared {
            job,
            mut book,
            json,
        } = self;
        let staged_book =
            crate::report::stage_book(&job.output, &mut book).map_err(|e| match e {
                OutputError::Xlsx { source, .. } => WriteError::Book { source },
                source => WriteError::Output { source },
            })?;
        drop(book);
        let staged_json = match (job.json_file(), &json) {
            (Some(path), Some(text)) => Some(
                crate::report::stage(path, text.as_bytes())
                    .map_err(|source| WriteError::Output { source })?,
            ),
            _ => None,
        };
        staged_book
            .commit()
            .map_err(|source| WriteError::Output { source })?;
        if let Some(s) = staged_json {
            s.commit().map_err(|source| WriteError::JsonNotCommitted {
                workbook: job.output.clone(),
                source,
            })?;
        }
        Ok(Written {
            json: json.filter(|_| job.json == Some(JsonOut::Text)),
        })
    }
}

/// Read `sources` and audit them with `rules`, as `lossledger audit` does, writing nothing.
///
/// # Errors
/// [`AuditError::Read`] when a file cannot be read; [`AuditError::Invalid`] with every error
/// diagnostic when the input has errors or a result is not a finite number.
///
/// # Example
/// ```
/// use lossledger::audit::Rules;
/// use lossledger::ingest::{InputSource, ReadOptions};
/// use lossledger::pipeline::read_and_audit;
///
/// let dir = std::env::temp_dir().join(format!("lossledger-doc-rna-{}", std::process::id()));
/// std::fs::create_dir_all(&dir)?;
/// let input = dir.join("station.xlsx");
/// std::fs::write(&input, lossledger::demo::input_workbook()?)?;
/// let sources = [InputSource::Path(input)];
/// let audited = read_and_audit(&sources, &ReadOptions::default(), &Rules::default())?;
/// assert!(audited.audit.lines.iter().any(|l| l.line == "KR-S1"));
/// std::fs::remove_dir_all(&dir)?;
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn read_and_audit(
    sources: &[InputSource],
    options: &ReadOptions,
    rules: &Rules,
) -> Result<Audited, AuditError> {
    let input = ingest::read_inputs(sources, options)?;
    match audit(&input, rules) {
        Ok(audit) => Ok(Audited { input, audit }),
        Err(errors) => Err(AuditError::invalid(&input, errors)),
    }
}

/// An input read and validated by [`check`].
#[derive(Debug)]
pub struct Checked {
    /// The parsed input.
    pub input: Input,
    /// Every diagnostic: the reader's, then (when the reader found no error) those of applying
    /// the physics with the default rules.
    pub diagnostics: Vec<Diagnostic>,
}

impl Checked {
    /// Diagnostics of this severity.
    pub fn count(&self, severity: Severity) -> usize {
        self.diagnostics
            .iter()
            .filter(|d| d.severity == severity)
            .count()
    }
}

/// Read and validate `sources` without writing anything, as `lossledger check` does.
///
/// # Errors
/// The [`InputError`] when a file cannot be read at all; problems inside it are
/// [`Checked::diagnostics`].
///
/// # Example
/// ```
/// use lossledger::error::Severity;
/// use lossledger::ingest::{InputSource, ReadOptions};
///
/// let dir = std::env::temp_dir().join(format!("lossledger-doc-check-{}", std::process::id()));
/// std::fs::create_dir_all(&dir)?;
/// let input = dir.join("blank.xlsx");
/// lossledger::template::write(&input, Default::default(), Default::default())?;
/// let checked = lossledger::pipeline::check(&[InputSource::Path(input)], &ReadOptions::default())?;
/// assert_eq!(checked.count(Severity::Error), 0);
/// std::fs::remove_dir_all(&dir)?;
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn check(sources: &[InputSource], options: &ReadOptions) -> Result<Checked, InputError> {
    let input = ingest::read_inputs(sources, options)?;
    let mut diagnostics = input.diagnostics.clone();
    if input.error_count() == 0
        && let Err(errors) = audit::run(&input, &Rules::default())
    {
        diagnostics.extend(errors);
    }
    Ok(Checked { input, diagnostics })
}

/// Audit a parsed input: [`audit::run`], then refuse any result that came out infinite or NaN.
///
/// # Errors
/// The error diagnostics, each at its source cell.
pub fn audit(input: &Input, rules: &Rules) -> Result<Audit, Vec<Diagnostic>> {
    finite(input, audit::run(input, rules)?)
}

/// The audit when every result is a finite number; the errors at the items that are not.
fn finite(input: &Input, done: Audit) -> Result<Audit, Vec<Diagnostic>> {
    let overflow = non_finite_results(input, &done);
    if overflow.is_empty() {
        Ok(done)
    } else {
        Err(overflow)
    }
}

/// Results that came out infinite or NaN (inputs finite but far out of range, e.g. a length of
/// 1e308 m): one error per item at its source cell, so nothing non-finite reaches an output.
fn non_finite_results(input: &Input, audit: &Audit) -> Vec<Diagnostic> {
    let mut out = Vec::new();
    let push = |out: &mut Vec<Diagnostic>, cell: &CellRef, what: String| {
        out.push(Diagnostic {
            severity: Severity::Error,
            file: input.file_of(&cell.sheet).to_string(),
            cell: Some(cell.clone()),
            message: format!(
                "{what} is not a finite number: a value on this row is far out of range"
            ),
            hint: Some(
                "check the row's length, size, flow and K for a misplaced exponent or unit".into(),
            ),
        });
    };
    // One out-of-range flow makes every item of its line overflow: one error per line and figure.
    let mut same_runs = crate::audit::same_cause::SameCause::default();
    for r in &audit.runs {
        let figures = [
            ("velocity", r.velocity_m_s),
            ("Reynolds number", r.reynolds),
            ("friction head", r.head_m),
            ("friction loss", r.dp_pa),
        ];
        if let Some((what, _)) = figures.iter().find(|(_, v)| !v.is_finite())
            && !same_runs.repeats(&r.line, what, out.len())
        {
            push(&mut out, &r.cell, format!("line {}: {what}", r.line));
        }
    }
    same_runs.fold_into(&mut out, "run");
    let mut same_fittings = crate::audit::same_cause::SameCause::default();
    for f in audit.fittings.iter().filter(|f| f.opening != Some(0.0)) {
        let figures = [
            ("K", f.k),
            ("velocity", f.velocity_m_s),
            ("head", f.head_m),
            ("head high", f.head_high_m),
            ("loss", f.dp_pa),
        ];
        if let Some((what, _)) = figures.iter().find(|(_, v)| !v.is_finite())
            && !same_fittings.repeats(&f.line, what, out.len())
        {
            push(
                &mut out,
                &f.cell,
                format!("fitting {} on line {}: {what}", f.tag, f.line),
            );
        }
    }
    same_fittings.fold_into(&mut out, "fitting");
    if out.is_empty() {
        for l in &audit.lines {
            let figures = [
                ("total head", l.total_head_m),
                ("total head high", l.total_head_high_m),
                ("total loss", l.total_dp_pa),
            ];
            if let (Some((what, _)), Some(&i)) =
                (figures.iter().find(|(_, v)| !v.is_finite()), l.runs.first())
            {
                push(
                    &mut out,
                    &audit.runs[i].cell,
                    format!("line {}: {what}", l.line),
                );
            }
        }
    }
    out
}
