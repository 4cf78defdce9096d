//! The `spinstate` binary: parse, run, print, exit.

mod cli;

use clap::Parser;
use std::io::Write;
use std::process::ExitCode;

fn main() -> ExitCode {
    let args = cli::Cli::parse();
    match cli::run(args) {
        Ok(out) => {
            for w in &out.warnings {
                eprintln!("{}", spinstate::error::one_line(w));
            }
            let mut stdout = std::io::stdout().lock();
            // A closed pipe (e.g. `| head`) is not an error.
            let _ = stdout.write_all(out.stdout.as_bytes());
            let _ = stdout.flush();
            ExitCode::from(out.code)
        }
        Err(f) => {
            eprintln!("error: {}", spinstate::error::one_line(&f.message));
            ExitCode::from(f.code)
        }
    }
}
