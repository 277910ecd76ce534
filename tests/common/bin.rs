//! The built `lossledger` binary: a command to add to, and a runner that returns the exit code
//! with standard output and error as text.

use std::ffi::OsStr;
use std::path::Path;
use std::process::{Command, Output};

/// A command for the built binary.
pub fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_lossledger"))
}

/// What one run gave: exit code (`None` when killed by a signal), standard output and error.
#[derive(Debug)]
pub struct Ran {
    pub code: Option<i32>,
    pub stdout: String,
    pub stderr: String,
}

impl From<Output> for Ran {
    fn from(o: Output) -> Self {
        Ran {
            code: o.status.code(),
            stdout: String::from_utf8_lossy(&o.stdout).into_owned(),
            stderr: String::from_utf8_lossy(&o.stderr).into_owned(),
        }
    }
}

impl Ran {
    /// Standard error then standard output, for messages that may go to either.
    pub fn both(&self) -> String {
        format!("{}{}", self.stderr, self.stdout)
    }
}

/// Run the built binary with `args`.
pub fn run<S: AsRef<OsStr>>(args: &[S]) -> Ran {
    bin().args(args).ran()
}

/// Running a prepared command (extra environment, working folder) to what it gave.
pub trait Runs {
    /// Run to completion; what it gave.
    fn ran(&mut self) -> Ran;
}

impl Runs for Command {
    fn ran(&mut self) -> Ran {
        self.output().expect("run lossledger").into()
    }
}

/// `p` as an argument.
pub fn os<P: AsRef<OsStr> + ?Sized>(p: &P) -> &OsStr {
    p.as_ref()
}

/// Write the invented demo station into `dir` (`lossledger demo --dir DIR`); it must succeed.
pub fn demo(dir: &Path) {
    let out = bin().arg("demo").arg("--dir").arg(dir).ran();
    assert_eq!(out.code, Some(0), "demo failed: {}", out.stderr);
    assert!(!out.stderr.contains("panicked"), "{}", out.stderr);
}
