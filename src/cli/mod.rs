//! Command-line front end. Two stages: clap reads raw values ([`args`]),
//! then [`run`] validates them into library objects and calls the library.
//! No physics lives here.

mod args;
mod run;

use clap::{CommandFactory, FromArgMatches};
use std::io::Write;

/// The whole command line, with `thermo --help` ending in the options of
/// `thermo SPECIES` (a species name is taken as an external subcommand,
/// which clap's help would not show).
pub fn command() -> clap::Command {
    let species = args::SpeciesThermo::command()
        .override_usage("zsum thermo SPECIES --T <T> [OPTIONS]")
        .render_long_help()
        .to_string();
    args::Cli::command().mut_subcommand("thermo", |t| {
        t.after_help(
            "A built-in species instead of a model: zsum thermo SPECIES --T <T> [--p P] \
             [--per mole|kg|particle] [--isomer STATE] [--model rovib|rrho] [--digits N] \
             (zsum species list names them; --help lists every option)",
        )
        .after_long_help(format!(
            "A built-in species instead of a model (zsum species list names them):\n\n{species}"
        ))
    })
}

/// Runs the command line and returns the process exit status.
pub fn main() -> i32 {
    let parsed = command()
        .try_get_matches()
        .and_then(|m| args::Cli::from_arg_matches(&m));
    let cli = match parsed {
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
