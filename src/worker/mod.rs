//! A process that never aborts: the commands that read, audit and write run in a worker child
//! process (this same binary, started again with [`STATUS_ENV`] set), so an allocation failure,
//! which Rust answers by aborting the process, or any panic, ends the worker and not the
//! command.
//!
//! The worker inherits standard input, output and error, and reports its phase, the temporary
//! files it stages and the outputs it commits through [`status`]. The parent waits: a normal exit
//! (0, 1, 2, 3) is passed through unchanged; a worker that panicked, aborted or was killed
//! becomes exit 3 with one line naming the phase and its file, and every temporary file the
//! worker staged is removed.

pub mod fault;
pub mod status;

use std::path::Path;
use std::process::{Command, ExitStatus};

pub use status::{Phase, committed, enter, staged};

/// The private environment variable that makes a process a worker; its value is the status file.
pub const STATUS_ENV: &str = "LOSSLEDGER_WORKER_STATUS";

/// The exit code of a worker whose run panicked (the panic is caught at the top and recorded).
pub const PANICKED: u8 = 101;

/// Whether this process is a worker started by [`supervise`].
pub fn is_worker() -> bool {
    std::env::var_os(STATUS_ENV).is_some()
}

/// Set this process up as a worker: open the status channel, record panics there instead of
/// printing them, and stop (removing what was staged) if the parent goes away.
pub fn start() {
    let Some(path) = std::env::var_os(STATUS_ENV) else {
        return;
    };
    if status::open(Path::new(&path)) {
        std::panic::set_hook(Box::new(status::panicked));
    }
    watch_parent(path.into());
}

/// A worker whose parent was killed stops too, rather than writing outputs nobody waits for,
/// and removes what the parent would have: its staged files and the status file.
#[cfg(unix)]
fn watch_parent(status_path: std::path::PathBuf) {
    let parent = std::os::unix::process::parent_id();
    std::thread::spawn(move || {
        loop {
            std::thread::sleep(std::time::Duration::from_millis(200));
            if std::os::unix::process::parent_id() != parent {
                status::remove_staged();
                let _ = std::fs::remove_file(&status_path);
                std::process::exit(3);
            }
        }
    });
}

#[cfg(not(unix))]
fn watch_parent(_status_path: std::path::PathBuf) {}

/// Run this command in a worker and wait for it. `None` when no worker could be started (the
/// caller then runs the command in this process).
pub fn supervise() -> Option<u8> {
    let exe = std::env::current_exe().ok()?;
    let status_path = status_file()?;
    let child = Command::new(exe)
        .args(std::env::args_os().skip(1))
        .env(STATUS_ENV, &status_path)
        .spawn();
    let Ok(mut child) = child else {
        let _ = std::fs::remove_file(&status_path);
        return None;
    };
    let ended = child.wait();
    let report = status::Report::parse(&std::fs::read(&status_path).unwrap_or_default());
    let _ = std::fs::remove_file(&status_path);
    for tmp in &report.staged {
        let _ = std::fs::remove_file(tmp);
    }
    let Ok(ended) = ended else {
        eprintln!("{}", failure_line(&report, "it could not be waited for"));
        return Some(3);
    };
    match ended.code() {
        Some(code @ 0..=3) => Some(code as u8),
        _ => {
            eprintln!("{}", failure_line(&report, &cause(&report, ended)));
            Some(3)
        }
    }
}

/// A new, empty status file in the system's temporary folder.
fn status_file() -> Option<std::path::PathBuf> {
    let dir = std::env::temp_dir();
    (0..100).find_map(|i| {
        let path = dir.join(format!(
            "lossledger-worker-{}-{i}.status",
            std::process::id()
        ));
        std::fs::OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&path)
            .ok()
            .map(|_| path)
    })
}

/// How the worker ended, in words.
fn cause(report: &status::Report, ended: ExitStatus) -> String {
    if let Some(p) = &report.panic
        && ended.code() == Some(i32::from(PANICKED))
    {
        return p.clone();
    }
    #[cfg(unix)]
    {
        use std::os::unix::process::ExitStatusExt;
        if let Some(sig) = ended.signal() {
            return match sig {
                6 => "aborted (signal 6; an allocation failure aborts)".to_string(),
                9 => "killed (signal 9; the system may have run out of memory)".to_string(),
                _ => format!("stopped by signal {sig}"),
            };
        }
    }
    match ended.code() {
        Some(c) => format!("exit status {c}"),
        None => "ended abnormally".to_string(),
    }
}

/// The one line printed for a worker that died.
fn failure_line(report: &status::Report, cause: &str) -> String {
    let (doing, phase) = match &report.phase {
        Some((p, file)) => (format!("{} {file}", p.doing()), p.word()),
        None => ("starting".to_string(), "start"),
    };
    let written = if report.committed.is_empty() {
        "nothing was written".to_string()
    } else {
        let names: Vec<String> = report
            .committed
            .iter()
            .map(|p| p.display().to_string())
            .collect();
        format!("only {} was written", names.join(", "))
    };
    format!(
        "lossledger: internal failure while {doing} (phase: {phase}; {cause}); {written} — please report it"
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_line_names_the_phase_and_its_file() {
        let r = status::Report {
            phase: Some((Phase::Write, "out.xlsx".into())),
            ..Default::default()
        };
        assert_eq!(
            failure_line(&r, "aborted"),
            "lossledger: internal failure while writing out.xlsx (phase: write; aborted); \
             nothing was written — please report it"
        );
        let r = status::Report {
            committed: vec!["d/in.xlsx".into()],
            ..Default::default()
        };
        assert!(
            failure_line(&r, "x")
                .contains("while starting (phase: start; x); only d/in.xlsx was written")
        );
    }
}
