//! Arbitrary bytes as an input workbook: read, audit and build the annotated copy. Nothing may
//! panic; every outcome must be an `Ok` or a typed error.
#![no_main]

use libfuzzer_sys::fuzz_target;
use std::path::PathBuf;
use std::sync::OnceLock;

fn scratch() -> &'static PathBuf {
    static P: OnceLock<PathBuf> = OnceLock::new();
    P.get_or_init(|| {
        let base = if std::path::Path::new("/dev/shm").is_dir() {
            PathBuf::from("/dev/shm")
        } else {
            std::env::temp_dir()
        };
        base.join(format!("lossledger-fuzz-{}.xlsx", std::process::id()))
    })
}

fuzz_target!(|data: &[u8]| {
    let path = scratch();
    if std::fs::write(path, data).is_err() {
        return;
    }
    let Ok(input) = lossledger::ingest::read_path(path) else {
        return;
    };
    let rules = lossledger::audit::Rules::default();
    if let Ok(audit) = lossledger::audit::run(&input, &rules) {
        let _ = lossledger::report::workbook::build(&input, &audit);
        let _ = lossledger::report::json::to_string(&input, &audit);
        let _ = lossledger::report::console::summary(&audit);
    }
});
