use clap::Parser;
use std::process::ExitCode;
use tiltbook::cli::{Cli, run};

fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            // clap prints help and version on stdout with exit 0; mistakes on stderr with 2
            let _ = e.print();
            return if e.use_stderr() {
                ExitCode::from(2)
            } else {
                ExitCode::SUCCESS
            };
        }
    };
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    match run(cli, &mut out) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("tiltbook: {e}");
            ExitCode::from(e.code())
        }
    }
}
