//! Command-line front end. Two stages: clap reads raw values ([`args`]),
//! then [`run`] validates them into library objects and calls the library.
//! No physics lives here.

mod args;
mod run;

use clap::Parser;
use std::io::Write;

/// Runs the command line and returns the process exit status.
pub fn main() -> i32 {
    let cli = match args::Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) if !e.use_stderr() => {
            // --help and --version: print and succeed.
            let _ = e.print();
            return 0;
        }
        Err(e) => {
            // Usage errors: clap's message (which starts "error: ") after our
            // prefix, status 2 like every other bad input.
            eprint!("zsum: {}", e.render());
            return 2;
        }
    };
    match run::run(cli) {
        Ok(output) => {
            if let Some(text) = output {
                let mut out = std::io::stdout().lock();
                if let Err(e) = out.write_all(text.as_bytes()).and_then(|_| out.flush()) {
                    if e.kind() != std::io::ErrorKind::BrokenPipe {
                        eprintln!("zsum: error: cannot write output: {e}");
                        return 2;
                    }
                }
            }
            0
        }
        Err(e) => {
            eprintln!("zsum: error: {e}");
            2
        }
    }
}
