//! The worker's status channel: the phase it is in, the temporary files it stages and the outputs
//! it commits, appended one record a line to a file the parent names. The parent reads it once the
//! worker has ended, so it can say where a worker that died stopped and remove what it left.
//!
//! Each record is written with one unbuffered `write`, so it is in the file even when the process
//! aborts right after. Outside a worker every call here does nothing.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::{Mutex, OnceLock};

/// What the process is doing, for the message about an internal failure.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Phase {
    /// Reading an input file (opening, parsing, checking its rows).
    Read,
    /// Auditing the inputs read.
    Audit,
    /// Building or writing an output file.
    Write,
}

impl Phase {
    /// The word of the record and of the message: `read`, `audit`, `write`.
    pub fn word(self) -> &'static str {
        match self {
            Phase::Read => "read",
            Phase::Audit => "audit",
            Phase::Write => "write",
        }
    }

    /// What the process was doing, as a verb: `reading`, `auditing`, `writing`.
    pub fn doing(self) -> &'static str {
        match self {
            Phase::Read => "reading",
            Phase::Audit => "auditing",
            Phase::Write => "writing",
        }
    }

    fn from_word(word: &str) -> Option<Phase> {
        [Phase::Read, Phase::Audit, Phase::Write]
            .into_iter()
            .find(|p| p.word() == word)
    }
}

struct Channel {
    file: Mutex<std::fs::File>,
    staged: Mutex<Vec<PathBuf>>,
}

static CHANNEL: OnceLock<Channel> = OnceLock::new();

/// Open the channel onto `path` (the file the parent created). Returns whether it is open.
pub(super) fn open(path: &Path) -> bool {
    let Ok(file) = std::fs::OpenOptions::new().append(true).open(path) else {
        return false;
    };
    CHANNEL
        .set(Channel {
            file: Mutex::new(file),
            staged: Mutex::new(Vec::new()),
        })
        .is_ok()
}

fn record(kind: &str, text: &[u8]) {
    let Some(ch) = CHANNEL.get() else { return };
    let mut line = Vec::with_capacity(kind.len() + text.len() + 2);
    line.extend_from_slice(kind.as_bytes());
    line.push(b'\t');
    escape_into(text, &mut line);
    line.push(b'\n');
    // `try_lock`: a panic while a record is being written must not wait on itself.
    if let Ok(mut f) = ch.file.try_lock() {
        let _ = f.write_all(&line);
    }
}

/// The process enters `phase` on `file` (an input, or an output being built).
pub fn enter(phase: Phase, file: &str) {
    record(phase.word(), file.as_bytes());
}

/// A temporary file is about to be created at `tmp`; the parent removes it if the worker dies.
pub fn staged(tmp: &Path) {
    let Some(ch) = CHANNEL.get() else { return };
    record("stage", &path_bytes(tmp));
    if let Ok(mut v) = ch.staged.lock() {
        v.push(tmp.to_path_buf());
    }
}

/// An output was renamed into place.
pub fn committed(path: &Path) {
    record("commit", &path_bytes(path));
}

/// A panic, with its place and message (first line, at most 160 characters).
pub(super) fn panicked(info: &std::panic::PanicHookInfo<'_>) {
    let payload = info.payload();
    let message = payload
        .downcast_ref::<&str>()
        .copied()
        .or_else(|| payload.downcast_ref::<String>().map(String::as_str))
        .unwrap_or("");
    let first: String = message
        .lines()
        .next()
        .unwrap_or("")
        .chars()
        .take(160)
        .collect();
    let text = match info.location() {
        Some(l) => format!("panicked at {}:{}: {first}", l.file(), l.line()),
        None => format!("panicked: {first}"),
    };
    record("panic", text.as_bytes());
    // Asked for (RUST_BACKTRACE): a developer is debugging; the one line follows from the parent.
    let trace = std::backtrace::Backtrace::capture();
    if trace.status() == std::backtrace::BacktraceStatus::Captured {
        eprintln!("lossledger worker {text}\n{trace}");
    }
}

/// Remove every temporary file this worker staged (those already renamed are gone anyway).
pub(super) fn remove_staged() {
    if let Some(v) = CHANNEL.get().and_then(|ch| ch.staged.lock().ok()) {
        for tmp in v.iter() {
            let _ = std::fs::remove_file(tmp);
        }
    }
}

/// What a worker's status file says.
#[derive(Debug, Default, PartialEq)]
pub(super) struct Report {
    /// The last phase entered, with its file.
    pub phase: Option<(Phase, String)>,
    /// Temporary files staged.
    pub staged: Vec<PathBuf>,
    /// Outputs renamed into place.
    pub committed: Vec<PathBuf>,
    /// The first panic recorded.
    pub panic: Option<String>,
}

impl Report {
    /// Read the records of a status file's bytes; unknown or broken lines are ignored.
    pub fn parse(bytes: &[u8]) -> Report {
        let mut r = Report::default();
        for line in bytes.split(|&b| b == b'\n') {
            let Some(tab) = line.iter().position(|&b| b == b'\t') else {
                continue;
            };
            let kind = String::from_utf8_lossy(&line[..tab]);
            let text = unescape(&line[tab + 1..]);
            match (kind.as_ref(), Phase::from_word(&kind)) {
                (_, Some(p)) => r.phase = Some((p, String::from_utf8_lossy(&text).into_owned())),
                ("stage", _) => r.staged.push(bytes_path(text)),
                ("commit", _) => r.committed.push(bytes_path(text)),
                ("panic", _) if r.panic.is_none() => {
                    r.panic = Some(String::from_utf8_lossy(&text).into_owned());
                }
                _ => {}
            }
        }
        r
    }
}

fn escape_into(text: &[u8], out: &mut Vec<u8>) {
    for &b in text {
        match b {
            b'\\' => out.extend_from_slice(b"\\\\"),
            b'\n' => out.extend_from_slice(b"\\n"),
            _ => out.push(b),
        }
    }
}

fn unescape(text: &[u8]) -> Vec<u8> {
    let mut out = Vec::with_capacity(text.len());
    let mut it = text.iter();
    while let Some(&b) = it.next() {
        if b == b'\\' {
            match it.next() {
                Some(b'n') => out.push(b'\n'),
                Some(&other) => out.push(other),
                None => {}
            }
        } else {
            out.push(b);
        }
    }
    out
}

#[cfg(unix)]
fn path_bytes(p: &Path) -> Vec<u8> {
    use std::os::unix::ffi::OsStrExt;
    p.as_os_str().as_bytes().to_vec()
}

#[cfg(not(unix))]
fn path_bytes(p: &Path) -> Vec<u8> {
    p.to_string_lossy().into_owned().into_bytes()
}

#[cfg(unix)]
fn bytes_path(b: Vec<u8>) -> PathBuf {
    use std::os::unix::ffi::OsStringExt;
    PathBuf::from(std::ffi::OsString::from_vec(b))
}

#[cfg(not(unix))]
fn bytes_path(b: Vec<u8>) -> PathBuf {
    PathBuf::from(String::from_utf8_lossy(&b).into_owned())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn records_read_back_with_odd_paths() {
        let mut bytes = Vec::new();
        for (kind, text) in [
            ("read", &b"in.xlsx"[..]),
            ("stage", b"/t/.a\\b\nc.xlsx.7.tmp"),
            ("panic", b"panicked at src/x.rs:3: boom"),
            ("panic", b"panicked at src/y.rs:9: later"),
            ("write", b"out.xlsx"),
            ("commit", b"out.xlsx"),
        ] {
            bytes.extend_from_slice(kind.as_bytes());
            bytes.push(b'\t');
            escape_into(text, &mut bytes);
            bytes.push(b'\n');
        }
        bytes.extend_from_slice(b"garbage without tab\nwri"); // a record cut short by a crash
        let r = Report::parse(&bytes);
        assert_eq!(r.phase, Some((Phase::Write, "out.xlsx".into())));
        assert_eq!(r.staged, [PathBuf::from("/t/.a\\b\nc.xlsx.7.tmp")]);
        assert_eq!(r.committed, [PathBuf::from("out.xlsx")]);
        assert_eq!(r.panic.as_deref(), Some("panicked at src/x.rs:3: boom"));
    }
}
