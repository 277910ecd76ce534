//! Outputs: the annotated workbook, JSON, and the console summary.

pub mod console;
pub mod json;
pub mod workbook;

use std::path::{Path, PathBuf};

use crate::error::OutputError;

/// The caution every output carries.
pub const CAUTION: &str = "Screening estimate only: steady, incompressible, single-phase flow from published correlations \
and the data in the input. It does not cover surge or water hammer, two-phase or compressible flow, slurries or \
non-Newtonian fluids, or structural and pressure-rating checks. Pump selection, cavitation (NPSH) and pressure \
decisions must rest on site measurement, manufacturer data, local codes and licensed engineering practice.";

/// Default output path: `INPUT.audit.xlsx` beside the input.
pub fn default_output(input: &Path) -> PathBuf {
    let stem = input.file_stem().and_then(|s| s.to_str()).unwrap_or("input");
    input.with_file_name(format!("{stem}.audit.xlsx"))
}

/// Refuse an output path that is one of the inputs (compared after resolving links).
pub fn check_not_input(out: &Path, inputs: &[PathBuf]) -> Result<(), OutputError> {
    let canon = |p: &Path| std::fs::canonicalize(p).ok();
    let out_c = canon(out);
    for i in inputs {
        if out == i || (out_c.is_some() && out_c == canon(i)) {
            return Err(OutputError::WouldOverwriteInput { path: out.display().to_string() });
        }
    }
    Ok(())
}

/// Write bytes to `path` through a temporary file in the same folder, renamed into place, so a
/// failure never leaves a partial file under the final name.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), OutputError> {
    use std::io::Write;
    let io = |source| OutputError::Io { path: path.display().to_string(), source };
    let dir = path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or(Path::new("."));
    let name = path.file_name().and_then(|n| n.to_str()).unwrap_or("output");
    let tmp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    let result = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    if let Err(e) = result {
        let _ = std::fs::remove_file(&tmp);
        return Err(io(e));
    }
    Ok(())
}
