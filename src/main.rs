//! The `spinstate` binary: parse, run, print, exit.

mod cli;

use clap::error::ErrorKind;
use clap::Parser;
use std::io::Write;
use std::process::ExitCode;

fn main() -> ExitCode {
    let args = match cli::Cli::try_parse() {
        Ok(args) => args,
        Err(e) => return argument_error(e),
    };
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

/// Help and version go out as clap prints them; every other argument error becomes one line on
/// stderr (clap's message without its usage block) and exit code 2.
fn argument_error(e: clap::Error) -> ExitCode {
    match e.kind() {
        ErrorKind::DisplayHelp
        | ErrorKind::DisplayVersion
        | ErrorKind::DisplayHelpOnMissingArgumentOrSubcommand => e.exit(),
        _ => {
            let text = e.render().to_string();
            let message: Vec<String> = text
                .lines()
                .map(str::trim)
                .take_while(|l| !l.starts_with("Usage:"))
                .filter(|l| !l.is_empty())
                .map(|l| match l.strip_prefix("tip: ") {
                    Some(tip) => format!("({tip})"),
                    None => l.to_string(),
                })
                .collect();
            let line = message.join(" ");
            let line = line.strip_prefix("error: ").unwrap_or(&line);
            eprintln!("error: {} (see --help)", spinstate::error::one_line(line));
            ExitCode::from(2)
        }
    }
}
