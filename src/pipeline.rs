//! Read → audit as library steps, shared by `audit` and `compare`.
//!
//! [`read_and_audit`] reads a set of sources exactly as `lossledger audit` does and returns the
//! parsed input with its [`Audit`], or a typed error carrying every diagnostic that stopped it.

use crate::audit::{self, Audit, Rules};
use crate::error::{CellRef, Diagnostic, InputError, Severity};
use crate::ingest::{self, Input, InputSource, ReadOptions};

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

/// Read `sources` and audit them with `rules`.
///
/// # Errors
/// [`AuditError::Read`] when a file cannot be read; [`AuditError::Invalid`] with every error
/// diagnostic when the input has errors or a result is not a finite number.
pub fn read_and_audit(
    sources: &[InputSource],
    options: &ReadOptions,
    rules: &Rules,
) -> Result<Audited, AuditError> {
    let input = ingest::read_inputs(sources, options)?;
    match audit(&input, rules) {
        Ok(audit) => Ok(Audited { input, audit }),
        Err(errors) => Err(AuditError::Invalid {
            invented: crate::report::invented::marker(&input),
            file: input.file,
            sha256: input.sha256,
            errors,
        }),
    }
}

/// Audit a parsed input: [`audit::run`], then refuse any result that came out infinite or NaN.
///
/// # Errors
/// The error diagnostics, each at its source cell.
pub fn audit(input: &Input, rules: &Rules) -> Result<Audit, Vec<Diagnostic>> {
    let done = audit::run(input, rules)?;
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
