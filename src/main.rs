//! `lossledger` command-line entry point.

fn main() -> std::process::ExitCode {
    lossledger::cli::main()
}
